"""Files: the design file (JSON), the table of offsets (CSV) and the report (JSON).

All values in files are SI (metres, kilograms, kg/m^3, degrees for angles) and every
key that carries a unit says so in its name.  Readers check everything and raise
:class:`~hydro.errors.DesignFileError` with the path of the bad value.
"""

from __future__ import annotations

import csv
import difflib
import io
import json
import math
import os
import re
import stat
from pathlib import Path
from typing import Any, Iterable, Iterator

import numpy as np

from hydro import limits, schema
from hydro.design import AnalysisSettings, CheckSettings, Design
from hydro.errors import DesignFileError, HullwrightError
from hydro.hull import Curve, HullSketch, SectionShape, Stations
from hydro.loads import CrewMember, Loads, MassItem, Material, validate_loads
from hydro.outputs import write_bytes
from hydro.stability import Analysis

__all__ = [
    "FORMAT",
    "VERSION",
    "design_to_dict",
    "design_from_dict",
    "load_design",
    "save_design",
    "dumps_design",
    "read_offsets",
    "write_offsets",
    "offsets_to_csv",
    "report_dict",
    "atomic_write_text",
    "read_text",
    "parse_json",
    "json_depth",
    "stations_in_order",
]

FORMAT = "hullwright.design"
VERSION = 2
#: Older versions this program still reads (1: no "checks" section).
READABLE_VERSIONS = (1, 2)


# ----------------------------------------------------------------------------- writing


def _curve(c: Curve) -> dict[str, Any]:
    return {"points_m": [list(p) for p in c.points], "smooth": c.smooth}


def design_to_dict(d: Design) -> dict[str, Any]:
    """Plain-JSON form of a design."""
    if isinstance(d.hull, HullSketch):
        s = d.hull
        hull: dict[str, Any] = {
            "sketch": {
                "plan_half_breadth": _curve(s.plan),
                "keel": _curve(s.keel),
                "sheer": _curve(s.sheer),
                "sections": [
                    {"x_m": sec.x, "points_uv": [list(p) for p in sec.points], "smooth": sec.smooth}
                    for sec in s.sections
                ],
                "station_count": s.station_count,
            }
        }
    else:
        hull = {
            "offsets": [
                {"x_m": float(x), "points_m": h.tolist()}
                for x, h in zip(d.hull.x, d.hull.half_sections)
            ]
        }
    water: dict[str, Any] = (
        {"preset": d.water} if isinstance(d.water, str) else {"density_kg_m3": float(d.water)}
    )
    ld = d.loads
    return {
        "format": FORMAT,
        "version": VERSION,
        "name": d.name,
        "notes": d.notes,
        "water": water,
        "hull": hull,
        "loads": {
            "crew": [
                {
                    "name": c.name,
                    "mass_kg": c.mass,
                    "x_m": c.x,
                    "side_m": c.y,
                    "seat_height_m": c.seat_height,
                    "cg_above_seat_m": c.cg_above_seat,
                }
                for c in ld.crew
            ],
            "items": [
                {"name": i.name, "mass_kg": i.mass, "x_m": i.x, "y_m": i.y, "z_m": i.z}
                for i in ld.items
            ],
            "materials": [
                {
                    "name": m.name,
                    "areal_density_kg_m2": m.areal_density,
                    "layers": m.layers,
                    "surfaces": list(m.surfaces),
                    "thickness_m": m.thickness_m,
                }
                for m in ld.materials
            ],
            "bottom_thickness_m": ld.bottom_thickness,
            "bilge_water_depth_m": ld.bilge_water_depth,
            "wet_factor": ld.wet_factor,
        },
        "analysis": {
            "heel_step_deg": d.settings.heel_step_deg,
            "heel_max_deg": d.settings.heel_max_deg,
            "free_trim": d.settings.free_trim,
            "open_boat": d.settings.open_boat,
        },
        "checks": _checks_dict(d.checks),
    }


def _checks_dict(c: CheckSettings) -> dict[str, Any]:
    return {
        "shift_crew": None if c.shift_crew is None else list(c.shift_crew),
        "shift_distance_m": c.shift_distance_m,
        "shift_to_gunwale": c.shift_to_gunwale,
        "boarding_mass_kg": c.boarding_mass_kg,
        "target_gm_m": c.target_gm_m,
        "whatif_crew_kg": None if c.whatif_crew_kg is None else list(c.whatif_crew_kg),
        "whatif_wet_factor": c.whatif_wet_factor,
        "whatif_bilge_m": c.whatif_bilge_m,
    }


def dumps_design(d: Design) -> str:
    return json.dumps(design_to_dict(d), indent=2) + "\n"


def atomic_write_text(
    path: str | os.PathLike[str], text: str, inputs: Iterable[str | os.PathLike[str]] = ()
) -> Path:
    """Write ``text`` (UTF-8) safely: checked path, temporary file, then moved into place
    (:func:`hydro.outputs.write_via_temp`).  Returns the real path written."""
    return write_bytes(path, text.encode("utf-8"), inputs)


def save_design(d: Design, path: str | os.PathLike[str]) -> Path:
    """Save atomically (a crash never leaves half a file); returns the real path."""
    return atomic_write_text(path, dumps_design(d))


# ----------------------------------------------------------------------------- reading


class _JsonProblem(Exception):
    """Raised from inside the JSON parser's hooks (message shown as is)."""


# a JSON string (escapes included), so brackets inside names do not count as nesting
_JSON_STRING = re.compile(r'"[^"\\]*(?:\\.[^"\\]*)*"')
_OPEN = np.zeros(256, dtype=np.int8)
_OPEN[[ord("["), ord("{")]] = 1
_OPEN[[ord("]"), ord("}")]] = -1


def read_text(path: str | os.PathLike[str], cap: int = limits.MAX_FILE_BYTES) -> str:
    """A file's text, read with a byte cap; :class:`DesignFileError` saying why not.

    Only regular files are read (a device, a named pipe or a socket is refused before
    it is opened, so nothing blocks), at most ``cap`` + 1 bytes are read whatever size
    the file claims, and the text must be UTF-8 (a byte-order mark is dropped).
    """
    p = os.fspath(path)
    if not p:
        raise DesignFileError("no file name given")
    if "\0" in p:
        raise DesignFileError("the file name is not valid")
    name = Path(p).name or p
    try:
        st = os.stat(p)
        if stat.S_ISDIR(st.st_mode):
            raise DesignFileError(f"{p}: is a folder, not a file")
        if not stat.S_ISREG(st.st_mode):
            raise DesignFileError(f"{p}: not a regular file (a device, pipe or socket)")
        if st.st_size > cap:
            raise DesignFileError(f"{name}: too large ({st.st_size} bytes, at most {cap})")
        fd = os.open(p, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_CLOEXEC", 0))
        with os.fdopen(fd, "rb") as f:
            if not stat.S_ISREG(os.fstat(f.fileno()).st_mode):
                raise DesignFileError(f"{p}: not a regular file (a device, pipe or socket)")
            data = f.read(cap + 1)
    except (FileNotFoundError, NotADirectoryError):
        raise DesignFileError(f"{p}: no such file") from None
    except PermissionError:
        raise DesignFileError(f"{p}: cannot read (permission denied)") from None
    except OSError as e:
        raise DesignFileError(f"{p}: cannot read ({e.strerror or e})") from None
    if len(data) > cap:
        raise DesignFileError(f"{name}: too large (more than {cap} bytes)")
    try:
        return data.decode("utf-8-sig")
    except UnicodeDecodeError as e:
        raise DesignFileError(f"{name}: not a UTF-8 text file (bad byte at {e.start})") from None


def json_depth(text: str) -> int:
    """Deepest nesting of arrays and objects in JSON text (strings skipped), found
    without recursion, so a hostile file cannot exhaust the parser's stack.

    >>> json_depth('{"a": [[1], {"b": "[[["}]}')
    3
    """
    bare = _JSON_STRING.sub("", text).encode("utf-8", "surrogatepass")
    if not bare:
        return 0
    steps = _OPEN[np.frombuffer(bare, dtype=np.uint8)]
    return int(np.max(np.cumsum(steps, dtype=np.int64), initial=0))


def _json_int(text: str) -> int:
    if len(text) > limits.MAX_NUMBER_CHARS:
        raise _JsonProblem(f"a number with {len(text)} digits is too long")
    return int(text)


def _json_float(text: str) -> float:
    if len(text) > limits.MAX_NUMBER_CHARS:
        raise _JsonProblem(f"a number with {len(text)} characters is too long")
    value = float(text)
    if not math.isfinite(value):
        raise _JsonProblem(f"the number {text} is too large")
    return value


def _json_constant(text: str) -> float:
    raise _JsonProblem(f"{text} is not a number")


def _json_object(pairs: list[tuple[str, Any]]) -> dict[str, Any]:
    out = dict(pairs)
    if len(out) != len(pairs):
        seen: set[str] = set()
        twice = next(k for k, _ in pairs if k in seen or seen.add(k))  # type: ignore[func-returns-value]
        raise _JsonProblem(f"the key '{twice.encode('utf-8', 'backslashreplace').decode()}' appears twice")
    return out


def parse_json(text: str, name: str) -> Any:
    """Parse JSON text strictly: bounded nesting and number size, no NaN or Infinity,
    no repeated keys.  Raises :class:`DesignFileError` naming the file."""
    depth = json_depth(text)
    if depth > limits.MAX_JSON_DEPTH:
        raise DesignFileError(
            f"{name}: nested {depth} levels deep (at most {limits.MAX_JSON_DEPTH}, MAX_JSON_DEPTH)"
        )
    try:
        return json.loads(
            text,
            parse_int=_json_int,
            parse_float=_json_float,
            parse_constant=_json_constant,
            object_pairs_hook=_json_object,
        )
    except json.JSONDecodeError as e:
        raise DesignFileError(f"{name}: not valid JSON (line {e.lineno}: {e.msg})") from None
    except _JsonProblem as e:
        raise DesignFileError(f"{name}: {e}") from None
    except RecursionError:
        raise DesignFileError(f"{name}: nested too deeply") from None


def _curve_of(c: schema.CurveModel) -> Curve:
    return Curve(tuple((p[0], p[1]) for p in c.points_m), c.smooth)


def _hull_of(h: schema.HullModel) -> HullSketch | Stations:
    if h.sketch is not None:
        s = h.sketch
        return HullSketch(
            plan=_curve_of(s.plan_half_breadth),
            keel=_curve_of(s.keel),
            sheer=_curve_of(s.sheer),
            sections=tuple(
                SectionShape(sec.x_m, tuple((p[0], p[1]) for p in sec.points_uv), sec.smooth)
                for sec in s.sections
            ),
            station_count=s.station_count,
        )
    rows = h.offsets or []
    return stations_in_order(
        [row.x_m for row in rows], [row.points_m for row in rows], "design.hull.offsets"
    )


def _loads_of(ld: schema.LoadsModel | None) -> Loads:
    if ld is None:
        return Loads()
    return Loads(
        crew=tuple(
            CrewMember(c.name, c.x_m, c.mass_kg, c.side_m, c.seat_height_m, c.cg_above_seat_m)
            for c in ld.crew
        ),
        items=tuple(MassItem(i.name, i.mass_kg, i.x_m, i.y_m, i.z_m) for i in ld.items),
        materials=tuple(
            Material(m.name, m.areal_density_kg_m2, m.layers, tuple(m.surfaces), m.thickness_m)
            for m in ld.materials
        ),
        bottom_thickness=ld.bottom_thickness_m,
        bilge_water_depth=ld.bilge_water_depth_m,
        wet_factor=ld.wet_factor,
    )


def _checks_of(c: schema.ChecksModel | None) -> CheckSettings:
    if c is None:
        return CheckSettings()
    return CheckSettings(
        shift_crew=None if c.shift_crew is None else tuple(c.shift_crew),
        shift_distance_m=c.shift_distance_m,
        shift_to_gunwale=c.shift_to_gunwale,
        boarding_mass_kg=c.boarding_mass_kg,
        target_gm_m=c.target_gm_m,
        whatif_crew_kg=None if c.whatif_crew_kg is None else tuple(c.whatif_crew_kg),
        whatif_wet_factor=c.whatif_wet_factor,
        whatif_bilge_m=c.whatif_bilge_m,
    )


def design_from_dict(data: Any) -> Design:
    """Build a design from parsed JSON; raises DesignFileError naming the problem.

    Every key is checked against :mod:`hydro.schema` (types, ranges, unknown keys),
    then the design against :mod:`hydro.limits` (sizes, budgets) and the engine's own
    shape and load checks.
    """
    if not isinstance(data, dict) or data.get("format") != FORMAT:
        raise DesignFileError("not a Hullwright design file (no 'format': 'hullwright.design')")
    version = data.get("version")
    if type(version) is not int or version not in READABLE_VERSIONS:
        shown = json.dumps(version, ensure_ascii=True, default=str)[:20]
        raise DesignFileError(
            f"design file version {shown} is not supported (this program reads "
            f"{', '.join(map(str, READABLE_VERSIONS))})"
        )
    model = schema.validate_design_data(data)
    w = model.water
    a = model.analysis
    try:
        design = Design(
            name=model.name,
            hull=_hull_of(model.hull),
            loads=_loads_of(model.loads),
            water="fresh" if w is None else (w.preset or w.density_kg_m3 or "fresh"),
            notes=model.notes,
            settings=AnalysisSettings()
            if a is None
            else AnalysisSettings(a.heel_step_deg, a.heel_max_deg, a.free_trim, a.open_boat),
            checks=_checks_of(model.checks),
        )
        limits.check_design(design)
        validate_loads(design.loads, design.stations())
    except DesignFileError:
        raise
    except HullwrightError as e:
        raise DesignFileError(str(e)) from None
    return design


def load_design(path: str | os.PathLike[str]) -> Design:
    """Read and check a design file (see :func:`read_text` and :func:`design_from_dict`)."""
    name = Path(path).name
    data = parse_json(read_text(path), name)
    try:
        return design_from_dict(data)
    except DesignFileError as e:
        raise DesignFileError(f"{name}: {e}") from None


def stations_in_order(
    xs: list[float], halves: list[Any], where: str
) -> Stations:
    """Stations from offsets as read: stations listed from the bow aft are turned round,
    and a half section listed from the top down to the keel is read upwards; any other
    order is refused.  Checked against :mod:`hydro.limits` (counts, sizes)."""
    limits.check_count("stations", len(xs), limits.MAX_STATIONS, "MAX_STATIONS")
    x = np.asarray(xs, dtype=float)
    hs = [np.asarray(h, dtype=float).reshape(-1, 2) for h in halves]
    if x.size >= 2 and np.all(np.diff(x) < 0):
        x, hs = x[::-1], hs[::-1]
    if x.size >= 2 and not np.all(np.diff(x) > 0):
        i = int(np.argmax(np.diff(x) <= 0))
        raise DesignFileError(
            f"{where}: stations must run one way along the hull "
            f"(x = {x[i]:.4g} m is followed by x = {x[i + 1]:.4g} m)"
        )
    for i, h in enumerate(hs):
        if len(h) >= 3 and _signed_area(h) < 0:
            if abs(h[-1, 0]) <= 1e-9 and abs(h[0, 0]) <= 1e-9:
                hs[i] = h[::-1]
            else:
                raise DesignFileError(
                    f"{where}: the half section at x = {x[i]:.4g} m runs the wrong way round; "
                    "list its points from the keel up to the gunwale"
                )
    stations = Stations(x, tuple(hs))
    limits.check_stations(stations)
    return stations


def _signed_area(h: np.ndarray) -> float:
    """Area of the mirrored, closed section (positive for points listed keel upwards)."""
    ring = np.vstack([h, h[::-1] * [-1.0, 1.0]])
    y, z = ring[:, 0], ring[:, 1]
    return 0.5 * float(np.sum(y[:-1] * z[1:] - y[1:] * z[:-1]))


# ----------------------------------------------------------------------------- offsets


def offsets_to_csv(stations: Stations) -> str:
    """Table of offsets as CSV: header, then one row per point, grouped by station."""
    out = io.StringIO()
    out.write("# Hullwright table of offsets: half sections, centreline to gunwale, metres\n")
    w = csv.writer(out, lineterminator="\n")
    w.writerow(["x_m", "y_m", "z_m"])
    for x, h in zip(stations.x, stations.half_sections):
        for y, z in h:
            w.writerow([f"{x:.6f}", f"{y:.6f}", f"{z:.6f}"])
    return out.getvalue()


def write_offsets(
    stations: Stations, path: str | os.PathLike[str], inputs: Iterable[str | os.PathLike[str]] = ()
) -> Path:
    """Write the table of offsets as CSV, refusing to overwrite any of ``inputs``."""
    return atomic_write_text(path, offsets_to_csv(stations), inputs)


def _csv_number(text: str, where: str, what: str) -> float:
    """One CSV cell as a finite number of sensible length (DesignFileError if not)."""
    text = text.strip()
    if len(text) > limits.MAX_NUMBER_CHARS:
        raise DesignFileError(f"{where}: '{what}' is too long to be a number")
    try:
        v = float(text)
    except ValueError:
        raise DesignFileError(f"{where}: '{what}' is not a number") from None
    if not math.isfinite(v):
        raise DesignFileError(f"{where}: '{what}' is not a finite number")
    return v


def _is_number(text: str) -> bool:
    try:
        float(text)
    except ValueError:
        return False
    return True


def _csv_rows(text: str, name: str) -> Iterator[tuple[int, list[str]]]:
    """(line number, cells) of the rows that are not blank or '#' comments, one at a
    time (so a reader can stop at a limit without parsing the rest)."""
    rows = csv.reader(io.StringIO(text))
    n = 0
    while True:
        try:
            row = next(rows)
        except StopIteration:
            return
        except csv.Error as e:
            raise DesignFileError(f"{name}: not a readable CSV file ({e})") from None
        n += 1
        if row and "".join(row).strip() and not row[0].lstrip().startswith("#"):
            yield n, row


def read_offsets(path: str | os.PathLike[str]) -> Stations:
    """Read a table of offsets (CSV with columns x, y, z in metres).

    Rows with the same x, one after another, form one half section from the centreline
    to the gunwale.  Lines starting with '#' and one header row are skipped.  Stations
    may run either way along the hull (see :func:`stations_in_order`); counts and sizes
    are checked against :mod:`hydro.limits` while reading.
    """
    name = Path(path).name
    groups: list[tuple[float, list[tuple[float, float]]]] = []
    for n, row in _csv_rows(read_text(path), name):
        if not groups and not _is_number(row[0]):
            continue  # the header
        where = f"{name} line {n}"
        if len(row) < 3:
            raise DesignFileError(f"{where}: expected three columns x, y, z")
        x, y, z = (_csv_number(v, where, c) for v, c in zip(row[:3], "xyz"))
        if groups and abs(groups[-1][0] - x) <= 1e-9:
            groups[-1][1].append((y, z))
            limits.check_count(
                f"points at station x = {x:.4g} m", len(groups[-1][1]),
                limits.MAX_POINTS_PER_SECTION, "MAX_POINTS_PER_SECTION",
            )
        else:
            groups.append((x, [(y, z)]))
            limits.check_count("stations", len(groups), limits.MAX_STATIONS, "MAX_STATIONS")
    if len(groups) < 2:
        raise DesignFileError(f"{name}: needs at least two stations of offsets")
    try:
        return stations_in_order([g[0] for g in groups], [g[1] for g in groups], name)
    except DesignFileError:
        raise
    except HullwrightError as e:
        raise DesignFileError(f"{name}: {e}") from None


# ----------------------------------------------------------------------------- report


def _f(v: float | None) -> float | None:
    if v is None or not math.isfinite(v):
        return None
    return float(v)


def report_dict(a: Analysis, name: str = "") -> dict[str, Any]:
    """The analysis as plain SI values (the command line's ``--json``; keys in README)."""
    w = a.weights
    out: dict[str, Any] = {
        "name": name,
        "status": a.status.value,
        "list_deg": _f(a.list_deg),
        "message": a.message,
        "displacement_kg": w.mass,
        "LCG_m": w.lcg,
        "TCG_m": w.tcg,
        "KG_m": w.kg,
        "FSC_m": w.fsc,
        "weights": [
            {"name": l.name, "kind": l.kind, "mass_kg": l.mass, "x_m": l.x, "y_m": l.y, "z_m": l.z}
            for l in w.lines
        ],
    }
    h = a.hydrostatics
    if h is not None:
        out.update(
            {
                "water_density_kg_m3": h.water_density,
                "volume_m3": h.volume,
                "draft_m": h.draft_mid,
                "draft_fore_m": h.draft_fore,
                "draft_aft_m": h.draft_aft,
                "trim_deg": h.trim_deg,
                "trim_m": h.trim,
                "LCB_m": h.lcb,
                "KB_m": h.kb,
                "BM_m": h.bm,
                "BM_L_m": h.bm_l,
                "KM_m": h.km,
                "GM_solid_m": h.gm_solid,
                "GM_m": h.gm,
                "GM_L_m": h.gm_l,
                "waterplane_area_m2": h.waterplane_area,
                "LCF_m": h.lcf,
                "I_T_m4": h.i_t,
                "I_L_m4": h.i_l,
                "LWL_m": h.lwl,
                "BWL_m": h.bwl,
                "Cb": _f(h.cb),
                "Cm": _f(h.cm),
                "Cp": _f(h.cp),
                "Cwp": _f(h.cwp),
                "immersion_kg_per_cm": h.immersion_kg_per_cm,
                "MCT_1cm_kg_m_per_cm": h.mct_1cm,
                "min_freeboard_m": h.min_freeboard,
                "min_freeboard_x_m": h.min_freeboard_x,
            }
        )
    c = a.curve
    if c is not None:
        out.update(
            {
                "gunwale_immersion_deg": _f(c.gunwale_immersion_deg),
                "max_gz_m": _f(c.max_gz),
                "max_gz_deg": c.max_gz_deg,
                "vanishing_stability_deg": _f(c.avs_deg),
                "loll_deg": _f(c.loll_deg),
                "range_deg": c.range_deg,
                "range_open": c.range_open,
                "listing_side": "starboard" if c.side > 0 else "port",
                "area_to_30_m_rad": _f(c.area_30),
                "area_to_40_m_rad": _f(c.area_40),
                "area_to_gunwale_m_rad": _f(c.area_to_gunwale),
                "gz": [
                    {
                        "heel_deg": float(phi),
                        "gz_m": _f(g),
                        "wall_sided_m": _f(ws),
                        "righting_moment_N_m": _f(rm),
                        "trim_deg": _f(t),
                    }
                    for phi, g, ws, rm, t in zip(c.heel_deg, c.gz, c.wall_sided, c.righting_moment, c.trim_deg)
                ],
            }
        )
    return out


# ----------------------------------------------------------------------------- inclining


def read_incline_readings(path: str | os.PathLike[str]) -> list[Any]:
    """Inclining-test readings from CSV.

    Header row with ``mass_kg,distance_m`` and either ``heel_deg`` or
    ``pendulum_length_m,deflection_m``; distance and heel or deflection are signed,
    positive to starboard.  Lines starting with '#' are comments.
    """
    from hydro.incline import InclineReading

    name = Path(path).name
    rows = [r for _, r in _csv_rows(read_text(path, limits.MAX_READINGS_BYTES), name)]
    if not rows:
        raise DesignFileError(f"{name}: no readings")
    limits.check_count("readings", len(rows) - 1, limits.MAX_READINGS, "MAX_READINGS")
    header = [h.strip().lower() for h in rows[0]]
    known = ("mass_kg", "distance_m", "heel_deg", "pendulum_length_m", "deflection_m")
    for h in header:
        if h not in known:
            near = difflib.get_close_matches(h, known, n=1, cutoff=0.6)
            hint = f" (did you mean '{near[0]}'?)" if near else ""
            raise DesignFileError(f"{name}: unknown column '{h[:40]}'{hint}")
    if len(set(header)) != len(header):
        raise DesignFileError(f"{name}: a column is named twice")
    if not {"mass_kg", "distance_m"} <= set(header):
        raise DesignFileError(
            f"{name}: the first row must name the columns mass_kg, distance_m and heel_deg "
            "(or pendulum_length_m, deflection_m)"
        )
    col = {h: i for i, h in enumerate(header)}
    out = []
    for n, row in enumerate(rows[1:], start=2):
        where = f"{name} row {n}"

        def get(key: str) -> float | None:
            if key not in col or col[key] >= len(row) or not row[col[key]].strip():
                return None
            return _csv_number(row[col[key]], where, key)

        mass, dist = get("mass_kg"), get("distance_m")
        if mass is None or dist is None:
            raise DesignFileError(f"{where}: needs mass_kg and distance_m")
        if not 0.0 < mass <= limits.MAX_ITEM_KG:
            raise DesignFileError(f"{where}: mass_kg must be above 0 and at most {limits.MAX_ITEM_KG:g}")
        if abs(dist) > limits.MAX_BEAM_M:
            raise DesignFileError(f"{where}: distance_m is beyond the boat (at most {limits.MAX_BEAM_M:g} m)")
        heel = get("heel_deg")
        if heel is not None and abs(heel) >= 90.0:
            raise DesignFileError(f"{where}: heel_deg must be less than 90 degrees")
        out.append(InclineReading(mass, dist, heel, get("pendulum_length_m"), get("deflection_m")))
    return out
