"""Files: the design file (JSON), the table of offsets (CSV) and the report (JSON).

All values in files are SI (metres, kilograms, kg/m^3, degrees for angles) and every
key that carries a unit says so in its name.  Readers check everything and raise
:class:`~hydro.errors.DesignFileError` with the path of the bad value.
"""

from __future__ import annotations

import csv
import io
import json
import math
import os
import tempfile
from pathlib import Path
from typing import Any

import numpy as np

from hydro.design import AnalysisSettings, CheckSettings, Design
from hydro.errors import DesignFileError, HullwrightError
from hydro.hull import Curve, HullSketch, SectionShape, Stations
from hydro.loads import CrewMember, Loads, MassItem, Material, validate_loads
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
]

FORMAT = "hullwright.design"
VERSION = 2
#: Older versions this program still reads (1: no "checks" section).
READABLE_VERSIONS = (1, 2)
MAX_FILE_BYTES = 20 * 1024 * 1024


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


def atomic_write_text(path: str | os.PathLike[str], text: str) -> None:
    """Write ``text`` to a temporary file beside ``path``, then rename it into place."""
    target = Path(path)
    fd, tmp = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=target.parent or ".")
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="") as f:
            f.write(text)
            f.flush()
            os.fsync(f.fileno())
        os.replace(tmp, target)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise


def save_design(d: Design, path: str | os.PathLike[str]) -> None:
    """Save atomically (a crash never leaves half a file)."""
    atomic_write_text(path, dumps_design(d))


# ----------------------------------------------------------------------------- reading


class _Reader:
    """Typed access to nested JSON with error messages that name the bad key."""

    def __init__(self, data: Any, where: str):
        self.data = data
        self.where = where

    def _fail(self, msg: str) -> DesignFileError:
        return DesignFileError(f"{self.where}: {msg}")

    def obj(self, key: str, required: bool = True) -> _Reader | None:
        v = self.data.get(key) if isinstance(self.data, dict) else None
        if v is None:
            if required:
                raise self._fail(f"missing '{key}'")
            return None
        if not isinstance(v, dict):
            raise DesignFileError(f"{self.where}.{key}: expected an object")
        return _Reader(v, f"{self.where}.{key}")

    def items(self, key: str, required: bool = True) -> list[_Reader]:
        v = self.data.get(key)
        if v is None and not required:
            return []
        if not isinstance(v, list):
            raise self._fail(f"'{key}' must be a list")
        return [_Reader(x, f"{self.where}.{key}[{i}]") for i, x in enumerate(v)]

    def num(self, key: str, default: float | None = None) -> float:
        v = self.data.get(key, default)
        if v is None:
            raise self._fail(f"missing '{key}'")
        if isinstance(v, bool) or not isinstance(v, (int, float)) or not math.isfinite(v):
            raise self._fail(f"'{key}' must be a finite number")
        return float(v)

    def text(self, key: str, default: str | None = None) -> str:
        v = self.data.get(key, default)
        if not isinstance(v, str):
            raise self._fail(f"'{key}' must be text")
        return v

    def flag(self, key: str, default: bool) -> bool:
        v = self.data.get(key, default)
        if not isinstance(v, bool):
            raise self._fail(f"'{key}' must be true or false")
        return v

    def pairs(self, key: str) -> tuple[tuple[float, float], ...]:
        v = self.data.get(key)
        if not isinstance(v, list) or not v:
            raise self._fail(f"'{key}' must be a list of [a, b] pairs")
        out = []
        for i, p in enumerate(v):
            if (
                not isinstance(p, list)
                or len(p) != 2
                or not all(isinstance(t, (int, float)) and not isinstance(t, bool) for t in p)
                or not all(math.isfinite(t) for t in p)
            ):
                raise self._fail(f"'{key}[{i}]' must be a pair of finite numbers")
            out.append((float(p[0]), float(p[1])))
        return tuple(out)


def _read_curve(r: _Reader) -> Curve:
    return Curve(r.pairs("points_m"), r.flag("smooth", True))


def _read_hull(r: _Reader) -> HullSketch | Stations:
    sketch = r.obj("sketch", required=False)
    if sketch is not None:
        sections = tuple(
            SectionShape(s.num("x_m"), s.pairs("points_uv"), s.flag("smooth", False))
            for s in sketch.items("sections")
        )
        count = sketch.num("station_count", 41)
        if count != int(count):
            raise DesignFileError(f"{sketch.where}: 'station_count' must be a whole number")
        return HullSketch(
            plan=_read_curve(sketch.obj("plan_half_breadth")),  # type: ignore[arg-type]
            keel=_read_curve(sketch.obj("keel")),  # type: ignore[arg-type]
            sheer=_read_curve(sketch.obj("sheer")),  # type: ignore[arg-type]
            sections=sections,
            station_count=int(count),
        )
    rows = r.items("offsets", required=False)
    if not rows:
        raise DesignFileError(f"{r.where}: needs 'sketch' or 'offsets'")
    return Stations(
        np.array([row.num("x_m") for row in rows]),
        tuple(np.array(row.pairs("points_m")) for row in rows),
    )


def _read_loads(r: _Reader | None) -> Loads:
    if r is None:
        return Loads()
    crew = tuple(
        CrewMember(
            name=c.text("name", "crew"),
            x=c.num("x_m"),
            mass=c.num("mass_kg", 75.0),
            y=c.num("side_m", 0.0),
            seat_height=c.num("seat_height_m", 0.05),
            cg_above_seat=c.num("cg_above_seat_m", 0.30),
        )
        for c in r.items("crew", required=False)
    )
    items = tuple(
        MassItem(i.text("name", "item"), i.num("mass_kg"), i.num("x_m"), i.num("y_m", 0.0), i.num("z_m"))
        for i in r.items("items", required=False)
    )
    materials = []
    for m in r.items("materials", required=False):
        surfaces = m.data.get("surfaces", ["bottom", "sides", "ends"])
        if not isinstance(surfaces, list) or not all(isinstance(s, str) for s in surfaces):
            raise DesignFileError(f"{m.where}: 'surfaces' must be a list of names")
        materials.append(
            Material(
                m.text("name", "material"),
                m.num("areal_density_kg_m2"),
                m.num("layers", 1.0),
                tuple(surfaces),
                m.num("thickness_m", 0.0),
            )
        )
    return Loads(
        crew=crew,
        items=items,
        materials=tuple(materials),
        bottom_thickness=r.num("bottom_thickness_m", 0.0),
        bilge_water_depth=r.num("bilge_water_depth_m", 0.0),
        wet_factor=r.num("wet_factor", 1.0),
    )


def _read_checks(r: _Reader | None) -> CheckSettings:
    if r is None:
        return CheckSettings()
    d = CheckSettings()

    def optional_list(key: str, kind: type) -> tuple | None:
        v = r.data.get(key)
        if v is None:
            return None
        if not isinstance(v, list) or not all(
            isinstance(e, kind) and not isinstance(e, bool) and math.isfinite(e) for e in v
        ):
            raise DesignFileError(f"{r.where}.{key}: expected a list of numbers or null")
        return tuple(v)

    distance = r.data.get("shift_distance_m")
    return CheckSettings(
        shift_crew=optional_list("shift_crew", int),
        shift_distance_m=None if distance is None else r.num("shift_distance_m"),
        shift_to_gunwale=r.flag("shift_to_gunwale", d.shift_to_gunwale),
        boarding_mass_kg=r.num("boarding_mass_kg", d.boarding_mass_kg),
        target_gm_m=r.num("target_gm_m", d.target_gm_m),
        whatif_crew_kg=optional_list("whatif_crew_kg", (int, float)),  # type: ignore[arg-type]
        whatif_wet_factor=r.num("whatif_wet_factor", d.whatif_wet_factor),
        whatif_bilge_m=r.num("whatif_bilge_m", d.whatif_bilge_m),
    )


def design_from_dict(data: Any) -> Design:
    """Build a design from parsed JSON; raises DesignFileError naming the problem."""
    if not isinstance(data, dict) or data.get("format") != FORMAT:
        raise DesignFileError("not a Hullwright design file (no 'format': 'hullwright.design')")
    version = data.get("version")
    if type(version) is not int or version not in READABLE_VERSIONS:
        raise DesignFileError(
            f"design file version {version!r} is not supported (this program reads "
            f"{', '.join(map(str, READABLE_VERSIONS))})"
        )
    r = _Reader(data, "design")
    water_r = r.obj("water", required=False)
    water: str | float = "fresh"
    if water_r is not None:
        if "preset" in water_r.data:
            water = water_r.text("preset")
        else:
            water = water_r.num("density_kg_m3")
    settings_r = r.obj("analysis", required=False)
    settings = AnalysisSettings()
    if settings_r is not None:
        settings = AnalysisSettings(
            settings_r.num("heel_step_deg", 1.0),
            settings_r.num("heel_max_deg", 90.0),
            settings_r.flag("free_trim", True),
            settings_r.flag("open_boat", True),
        )
    try:
        design = Design(
            name=r.text("name", "Untitled"),
            hull=_read_hull(r.obj("hull")),  # type: ignore[arg-type]
            loads=_read_loads(r.obj("loads", required=False)),
            water=water,
            notes=r.text("notes", ""),
            settings=settings,
            checks=_read_checks(r.obj("checks", required=False)),
        )
        design.water_density  # noqa: B018 - validates the water entry
        settings.heel_angles()
        validate_loads(design.loads, design.stations())
    except DesignFileError:
        raise
    except HullwrightError as e:
        raise DesignFileError(str(e)) from None
    return design


def _read_text(p: Path) -> str:
    """A file's text, or DesignFileError saying plainly why not."""
    try:
        if p.stat().st_size > MAX_FILE_BYTES:
            raise DesignFileError(f"{p.name}: too large for this kind of file")
        return p.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise DesignFileError(f"{p}: no such file") from None
    except IsADirectoryError:
        raise DesignFileError(f"{p}: is a folder, not a file") from None
    except UnicodeDecodeError:
        raise DesignFileError(f"{p.name}: not a text file") from None
    except OSError as e:
        raise DesignFileError(f"{p}: cannot read ({e.strerror})") from None


def load_design(path: str | os.PathLike[str]) -> Design:
    """Read and check a design file."""
    p = Path(path)
    text = _read_text(p)
    try:
        data = json.loads(text)
    except json.JSONDecodeError as e:
        raise DesignFileError(f"{p.name}: not valid JSON (line {e.lineno}: {e.msg})") from None
    try:
        return design_from_dict(data)
    except DesignFileError as e:
        raise DesignFileError(f"{p.name}: {e}") from None


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


def write_offsets(stations: Stations, path: str | os.PathLike[str]) -> None:
    atomic_write_text(path, offsets_to_csv(stations))


def read_offsets(path: str | os.PathLike[str]) -> Stations:
    """Read a table of offsets (CSV with columns x, y, z in metres).

    Rows with the same x, one after another, form one half section from the centreline
    to the gunwale.  Lines starting with '#' and one header row are skipped.
    """
    p = Path(path)
    text = _read_text(p)
    groups: list[tuple[float, list[tuple[float, float]]]] = []
    for n, row in enumerate(csv.reader(io.StringIO(text)), start=1):
        if not row or not "".join(row).strip() or row[0].lstrip().startswith("#"):
            continue
        if len(row) < 3:
            raise DesignFileError(f"{p.name} line {n}: expected three columns x, y, z")
        try:
            x, y, z = (float(v) for v in row[:3])
        except ValueError:
            if n == 1 or not groups:
                continue  # header
            raise DesignFileError(f"{p.name} line {n}: not a number") from None
        if not all(math.isfinite(v) for v in (x, y, z)):
            raise DesignFileError(f"{p.name} line {n}: not a finite number")
        if groups and abs(groups[-1][0] - x) <= 1e-9:
            groups[-1][1].append((y, z))
        else:
            groups.append((x, [(y, z)]))
    if len(groups) < 2:
        raise DesignFileError(f"{p.name}: needs at least two stations of offsets")
    try:
        return Stations(np.array([g[0] for g in groups]), tuple(np.array(g[1]) for g in groups))
    except HullwrightError as e:
        raise DesignFileError(f"{p.name}: {e}") from None


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
        "status": a.status,
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

    p = Path(path)
    text = _read_text(p)
    rows = [r for r in csv.reader(io.StringIO(text)) if r and not r[0].lstrip().startswith("#")]
    if not rows:
        raise DesignFileError(f"{p.name}: no readings")
    header = [h.strip().lower() for h in rows[0]]
    need = {"mass_kg", "distance_m"}
    if not need <= set(header):
        raise DesignFileError(f"{p.name}: the first row must name the columns mass_kg, distance_m and heel_deg (or pendulum_length_m, deflection_m)")
    col = {name: header.index(name) for name in header}
    out = []
    for n, row in enumerate(rows[1:], start=2):
        def get(name: str) -> float | None:
            if name not in col or col[name] >= len(row) or not row[col[name]].strip():
                return None
            try:
                v = float(row[col[name]])
            except ValueError:
                raise DesignFileError(f"{p.name} row {n}: '{name}' is not a number") from None
            if not math.isfinite(v):
                raise DesignFileError(f"{p.name} row {n}: '{name}' is not a finite number")
            return v

        mass, dist = get("mass_kg"), get("distance_m")
        if mass is None or dist is None:
            raise DesignFileError(f"{p.name} row {n}: needs mass_kg and distance_m")
        out.append(InclineReading(mass, dist, get("heel_deg"), get("pendulum_length_m"), get("deflection_m")))
    return out
