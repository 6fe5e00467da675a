"""What the print plate says: the hull's lines and table of offsets, the figures, the
marks from the builder's checks, scales and paper names (no painting here).
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass

import numpy as np

from hydro.assess import Assessment
from hydro.hull import Stations
from hydro.stability import Analysis
from hydro.units import UnitSystem
from hydro.wording import heel_title, heel_verdict_text, list_text

__all__ = [
    "PAPER_SIZES",
    "PlateMarks",
    "figure_rows",
    "listed_stations",
    "marks_from_assessment",
    "offset_columns",
]

#: Landscape paper sizes (width, height) in millimetres.
PAPER_SIZES: dict[str, tuple[float, float]] = {
    "A4": (297.0, 210.0),
    "A3": (420.0, 297.0),
    "Letter": (279.4, 215.9),
    "Tabloid": (431.8, 279.4),
}

#: 1 kg/m^3 in lb/ft^3.
LB_FT3_PER_KG_M3 = 0.0624279606

#: Largest number of rows in the table of offsets (stations listed).
MAX_OFFSET_ROWS = 21
#: Row limits tried for the table of offsets, most rows first (9 rows at the least).
OFFSET_ROW_CHOICES = (21, 13, 9)

METRIC_SCALES = (2, 5, 10, 20, 25, 30, 40, 50, 100, 200)
IMPERIAL_SCALES = {
    2: "6 in = 1 ft",
    4: "3 in = 1 ft",
    8: "1½ in = 1 ft",
    12: "1 in = 1 ft",
    16: "¾ in = 1 ft",
    24: "½ in = 1 ft",
    32: "⅜ in = 1 ft",
    48: "¼ in = 1 ft",
    96: "⅛ in = 1 ft",
    192: "1/16 in = 1 ft",
}


@dataclass(frozen=True)
class PlateMarks:
    """Optional results of the builder's checks, drawn when present.

    Attributes
    ----------
    crew_shift_heel_deg : static heel when the crew moves to one side (degrees)
    crew_shift_verdict : what happens, with its margins, as the checks panel words it
    crew_shift_arm : heeling arm at zero heel (m); the arm curve arm * cos(heel) is drawn
    level_trim_seats : (crew name, seat x in metres) pairs that trim the boat level
    crew_shift_title, boarding_title, boarding_verdict : the cases as the panel words them
    station_spacing_m, station_count : the builder's stations for the lines and the table
        of offsets (every so many metres, or so many stations); None: the design's own
    """

    crew_shift_heel_deg: float | None = None
    crew_shift_verdict: str = ""
    crew_shift_arm: float | None = None
    level_trim_seats: tuple[tuple[str, float], ...] = ()
    crew_shift_title: str = ""
    boarding_title: str = ""
    boarding_verdict: str = ""
    station_spacing_m: float | None = None
    station_count: int | None = None

    @classmethod
    def from_any(cls, extras: PlateMarks | Mapping[str, object] | None) -> PlateMarks:
        """Accept a PlateMarks, a mapping of its field names, or None (no marks)."""
        if extras is None:
            return cls()
        if isinstance(extras, PlateMarks):
            return extras
        data = dict(extras)
        if "level_trim_seats" in data and data["level_trim_seats"] is not None:
            data["level_trim_seats"] = tuple(
                (str(n), float(x))
                for n, x in data["level_trim_seats"]  # type: ignore[union-attr]
            )
        return cls(**data)  # type: ignore[arg-type]


@dataclass(frozen=True)
class HullLines:
    """Per-station lines of the hull (metres, heights above the base line)."""

    x: np.ndarray
    keel: np.ndarray  # lowest point of each section
    centre: np.ndarray  # height of the first point, on the centreline
    sheer_y: np.ndarray
    sheer_z: np.ndarray
    max_y: np.ndarray
    chines: tuple[tuple[np.ndarray, np.ndarray], ...]  # (y, z) per interior point
    halves: tuple[np.ndarray, ...]  # (y, z above base) per station
    base: float

    @property
    def length(self) -> float:
        return float(self.x[-1] - self.x[0])

    @property
    def beam(self) -> float:
        return 2.0 * float(self.max_y.max())

    @property
    def height(self) -> float:
        return float(max(h[:, 1].max() for h in self.halves))

    @property
    def mid_index(self) -> int:
        return int(np.argmin(np.abs(self.x - (self.x[0] + self.x[-1]) / 2)))


def hull_lines(stations: Stations) -> HullLines:
    base = stations.keel_z
    halves = tuple(np.column_stack([h[:, 0], h[:, 1] - base]) for h in stations.half_sections)
    counts = {len(h) for h in halves}
    hard = len(counts) == 1 and counts.pop() <= 6
    chines: tuple[tuple[np.ndarray, np.ndarray], ...] = ()
    if hard:
        n = len(halves[0])
        chines = tuple(
            (np.array([h[j, 0] for h in halves]), np.array([h[j, 1] for h in halves]))
            for j in range(1, n - 1)
        )
    return HullLines(
        x=stations.x.copy(),
        keel=np.array([h[:, 1].min() for h in halves]),
        centre=np.array([h[0, 1] for h in halves]),
        sheer_y=np.array([h[-1, 0] for h in halves]),
        sheer_z=np.array([h[-1, 1] for h in halves]),
        max_y=np.array([h[:, 0].max() for h in halves]),
        chines=chines,
        halves=halves,
        base=base,
    )


def listed_stations(count: int, max_rows: int = MAX_OFFSET_ROWS) -> list[int]:
    """Indices of the stations listed on the plate: every k-th, first and last always.

    Prefers a step that divides the station count evenly (equal spacing to the end).

    >>> listed_stations(41, 13)
    [0, 4, 8, 12, 16, 20, 24, 28, 32, 36, 40]
    >>> listed_stations(5)
    [0, 1, 2, 3, 4]
    """
    if count <= max_rows:
        return list(range(count))
    spans = count - 1
    step = math.ceil(spans / (max_rows - 1))
    for s in range(step, 2 * step + 1):
        if spans % s == 0:
            return list(range(0, count, s))
    picked = list(range(0, count, step))
    if picked[-1] != spans:
        picked.append(spans)
    return picked


def waterline_heights(top: float, u: UnitSystem) -> list[float]:
    """Three to five round waterline heights (m) below ``top`` for the offsets table."""
    steps = (
        (10, 20, 25, 50, 75, 100, 150, 200, 250, 500)
        if u.name == "metric"
        else (0.5, 1, 2, 3, 4, 6, 8, 12, 18, 24)
    )
    top_d = u.to_length(top)
    for step in steps:
        n = math.ceil(top_d / step - 1e-9) - 1
        if n <= 5:
            return [u.from_length(step * i) for i in range(1, n + 1)]
    return [u.from_length(steps[-1])]


def half_breadth_at(half: np.ndarray, z: float) -> float | None:
    """Outermost half-breadth where the half section crosses height ``z``."""
    y, h = half[:, 0], half[:, 1]
    best: float | None = None
    for i in range(len(half) - 1):
        z0, z1 = h[i], h[i + 1]
        if (z0 - z) * (z1 - z) > 0 or z0 == z1:
            continue
        t = (z - z0) / (z1 - z0)
        yi = float(y[i] + t * (y[i + 1] - y[i]))
        best = yi if best is None else max(best, yi)
    return best


@dataclass(frozen=True)
class Column:
    group: str
    label: str
    values: tuple[float | None, ...]


def offset_columns(lines: HullLines, rows: Sequence[int], u: UnitSystem) -> list[Column]:
    """Columns of the table of offsets, in metres (None where the line does not exist)."""

    def pick(values: np.ndarray) -> tuple[float, ...]:
        return tuple(float(values[i]) for i in rows)

    above_keel = bool(np.any(lines.centre - lines.keel > 1e-6))
    cols = [Column("CL" if above_keel else "Keel", "height", pick(lines.centre))]
    if lines.chines:
        for j, (cy, cz) in enumerate(lines.chines, start=1):
            name = "Chine" if len(lines.chines) == 1 else f"Chine {j}"
            cols += [Column(name, "half-br.", pick(cy)), Column(name, "height", pick(cz))]
    cols += [
        Column("Sheer", "half-br.", pick(lines.sheer_y)),
        Column("Sheer", "height", pick(lines.sheer_z)),
    ]
    if not lines.chines:
        for wl in waterline_heights(float(lines.sheer_z.min()), u):
            label = f"WL {u.length_text(wl, unit=False)}"
            vals = tuple(half_breadth_at(lines.halves[i], wl) for i in rows)
            cols.append(Column("Half-breadth at waterline", label, vals))
    return cols


def deg_text(v: float | None, digits: int = 1) -> str:
    return "—" if v is None or not math.isfinite(v) else f"{v:.{digits}f}°"


def figure_rows(a: Analysis, u: UnitSystem, marks: PlateMarks) -> list[tuple[str, str]]:
    """(label, value) rows of the figures panel."""
    L = u.length_text
    h, c = a.hydrostatics, a.curve
    rows: list[tuple[str, str]] = [("Displacement", u.mass_text(a.weights.mass))]
    if h is None:
        return rows + [("Hydrostatics", "none: the hull cannot carry the load")]
    trim_len = L(abs(h.trim))
    if abs(h.trim_deg) < 0.05:
        trim = "level"
    else:
        trim = f"{abs(h.trim_deg):.2f}° by the {'bow' if h.trim_deg > 0 else 'stern'} ({trim_len})"
    gm_word = "positive" if h.gm > 0 else "NEGATIVE: will not stay upright"
    rows += [
        (
            "Draft aft / mid / fore",
            f"{L(h.draft_aft, False)} / {L(h.draft_mid, False)} / {L(h.draft_fore)}",
        ),
        ("Trim", trim),
        ("Least freeboard", f"{L(h.min_freeboard)} at x {L(h.min_freeboard_x)}"),
        ("KB / BM", f"{L(h.kb, False)} / {L(h.bm)}"),
        ("KM / KG", f"{L(h.km, False)} / {L(h.kg)}"),
        ("GM (upright)", f"{L(h.gm)}  ({gm_word})"),
    ]
    if h.fsc > 0:
        rows.append(("GM solid / free-surface corr.", f"{L(h.gm_solid, False)} / {L(h.fsc)}"))
    if c is not None:
        last = c.last_deg
        gw = c.gunwale_immersion_deg
        rows.insert(1, ("Floating position", list_text(c.list_deg)))
        rows.append(
            (
                "Heel at gunwale immersion",
                f"not reached by {last:.0f}°"
                if gw is None
                else ("upright: floods" if abs(gw) <= 0 else deg_text(abs(gw))),
            )
        )
        rows.append(("Max GZ", f"{L(c.max_gz)} at {abs(c.max_gz_deg):.0f}°"))
        if c.loll_deg is not None:
            rows.append(("Angle of loll", deg_text(abs(c.loll_deg))))
        if c.list_deg is None:
            rng = "none: it capsizes"
        else:
            start = abs(c.list_deg)
            rng = (
                f"{start:.0f}° to beyond {last:.0f}°"
                if c.range_open
                else f"{start:.0f}° to {start + c.range_deg:.1f}° ({c.range_deg:.1f}°)"
            )
        rows.append(("Range of positive GZ", rng))
    if marks.crew_shift_verdict:
        rows.append((marks.crew_shift_title or "Crew shift", marks.crew_shift_verdict))
    if marks.boarding_verdict:
        rows.append((marks.boarding_title or "Boarding", marks.boarding_verdict))
    for name, x in marks.level_trim_seats:
        rows.append((f"Level trim: {name}", f"seat at x {L(x)}"))
    return rows


def ordinal(n: int) -> str:
    """1st, 2nd, 3rd, 4th ... 11th, 12th, 13th, 21st ..."""
    if 10 <= n % 100 <= 20:
        return f"{n}th"
    suffix = {1: "st", 2: "nd", 3: "rd"}.get(n % 10, "th")
    return f"{n}{suffix}"


def scale_label(den: int, u: UnitSystem) -> str:
    if u.name == "imperial" and den in IMPERIAL_SCALES:
        return f"1:{den} ({IMPERIAL_SCALES[den]})"
    return f"1:{den}"


def paper_name(w_mm: float, h_mm: float) -> str:
    for name, (pw, ph) in PAPER_SIZES.items():
        if abs(pw - w_mm) < 1.0 and abs(ph - h_mm) < 1.0:
            return name
    return f"{w_mm:.0f} × {h_mm:.0f} mm"


def marks_from_assessment(assessment: Assessment, u: UnitSystem) -> PlateMarks:
    """The builder's checks the plate carries, worded as the checks panel words them:
    the saved crew-shift and boarding cases with their margins, and the seat that trims
    the boat level for the crew member who has to move least.  Nothing when the boat
    does not float or capsizes as loaded."""
    shift, board = assessment.shift, assessment.boarding
    best = assessment.best_trim()
    seats = () if best is None or best.x_after is None else ((best.what, float(best.x_after)),)
    return PlateMarks(
        None if shift is None else shift.static_heel_deg,
        "" if shift is None else heel_verdict_text(shift, u),
        None if shift is None else shift.arm0,
        seats,
        "" if shift is None else heel_title(shift, u),
        "" if board is None else heel_title(board, u),
        "" if board is None else heel_verdict_text(board, u),
    )
