"""Resource budgets and plausibility limits: what the program agrees to work on.

Every file the project reads, every design the app accepts and every analysis goes
through these caps, so that no accepted input takes more than about 2 s or 500 MB for
one analysis (measured by ``bench/limits.py``), and sizes or masses beyond small-craft
reality get a plain message instead of a silent absurd answer.  Each refusal raises
:class:`LimitError` naming the limit.

Measured cost of one analysis (``bench/limits.py`` on the shared two-core build
machine): 4e-8 to 1e-7 s and about 16 bytes per unit of work, a unit being one station x
one outline vertex (mirrored section, 2 n - 1 vertices) x one heel angle.  So
:data:`MAX_WORK` = 1.5e7 units is 0.5 to 1.5 s and about 300 MB; the samples need 1e5 to
4e5.  A sketch's exact crossing check has its own budget, :data:`MAX_OUTLINE_CHECK`.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

import numpy as np

from hydro.errors import HullwrightError
from hydro.hull import SMOOTH_SAMPLES_PER_SPAN, HullSketch, Stations

if TYPE_CHECKING:
    from hydro.design import Design

__all__ = [
    "LimitError",
    "MAX_FILE_BYTES",
    "MAX_READINGS_BYTES",
    "MAX_JSON_DEPTH",
    "MAX_NUMBER_CHARS",
    "MAX_NAME_CHARS",
    "MAX_NOTES_CHARS",
    "MAX_STATIONS",
    "MAX_POINTS_PER_SECTION",
    "MAX_CURVE_POINTS",
    "MAX_SECTION_SHAPES",
    "MAX_SHAPE_POINTS",
    "MAX_HEEL_ANGLES",
    "MAX_WORK",
    "MAX_OUTLINE_CHECK",
    "MAX_CHECK_WORK",
    "MAX_CREW",
    "MAX_ITEMS",
    "MAX_MATERIALS",
    "MAX_READINGS",
    "MAX_LENGTH_M",
    "MAX_BEAM_M",
    "MAX_DEPTH_M",
    "MAX_COORDINATE_M",
    "MAX_CREW_KG",
    "MAX_ITEM_KG",
    "MAX_DISPLACEMENT_KG",
    "MIN_WATER_DENSITY",
    "MAX_WATER_DENSITY",
    "check_count",
    "check_work",
    "check_hull_size",
    "check_finite",
    "check_stations",
    "check_sketch",
    "check_design",
]

# ----------------------------------------------------------------------------- files

#: Largest design or offsets file (bytes), enforced while reading: the biggest table the
#: budgets allow (401 stations x 200 points, ~30 bytes a point) is about 2.4 MB.
MAX_FILE_BYTES = 8 * 1024 * 1024
#: Largest inclining readings file (bytes): 200 readings need a few kilobytes.
MAX_READINGS_BYTES = 256 * 1024
#: Deepest nesting of arrays and objects in a design file (a design uses 5).
MAX_JSON_DEPTH = 32
#: Longest number in a file, in characters (a double needs at most 24).
MAX_NUMBER_CHARS = 40
#: Longest name (crew, item, material, design) and notes, in characters.
MAX_NAME_CHARS = 200
MAX_NOTES_CHARS = 20_000

# ----------------------------------------------------------------------------- work

#: Stations of a table of offsets or a sketch (the sketch's own limit, 401).
MAX_STATIONS = 401
#: Points of one half section (centreline to gunwale); a smooth one needs 20-50.
MAX_POINTS_PER_SECTION = 200
#: Control points of one sketch curve (plan, keel, sheer).
MAX_CURVE_POINTS = 200
#: Section shapes of a sketch, and points of one shape (a smooth shape is sampled six
#: times per span: 33 points make 193, within MAX_POINTS_PER_SECTION).
MAX_SECTION_SHAPES = 50
MAX_SHAPE_POINTS = 33

#: Heel angles of one curve: 0.1 degree steps to 180 degrees.
MAX_HEEL_ANGLES = 1801
#: Stations x outline vertices x heel angles of one analysis (see the module note).
MAX_WORK = 15_000_000
#: A sketch's stations are each checked exactly for crossing edges, every pair of edges
#: of the mirrored outline: stations x vertices^2, about 1.5e-7 s and 35 bytes a unit
#: (measured by bench/limits.py), so 6.5e6 is about 1 s and 250 MB.  The default 41
#: stations take shapes up to 33 points; 401 stations, smooth shapes up to 11 points.
MAX_OUTLINE_CHECK = 6_500_000
#: The builder's checks (``hullwright check``) analyse a design about a dozen times, so
#: their work per analysis is capped lower: 2.5e6 keeps the whole run near 2 s.
MAX_CHECK_WORK = 2_500_000
MAX_CREW = 50
MAX_ITEMS = 500
MAX_MATERIALS = 50
MAX_READINGS = 200

# ----------------------------------------------------------------------------- reality

#: Small craft: hand-built boats, rafts and pontoons (common practice, no source).
MAX_LENGTH_M = 30.0
MAX_BEAM_M = 15.0
MAX_DEPTH_M = 10.0
#: Any coordinate of any point or load, metres from the origin.
MAX_COORDINATE_M = 100.0
#: One person (the heaviest adults are well under this).
MAX_CREW_KG = 300.0
#: One lumped item (ballast, engine, gear).
MAX_ITEM_KG = 5000.0
#: Everything aboard together (a big raft with its crew is a few tonnes).
MAX_DISPLACEMENT_KG = 20_000.0
#: Water: fresh ~998, sea ~1025, the saltiest lakes ~1250 (common practice, no source).
MIN_WATER_DENSITY = 950.0
MAX_WATER_DENSITY = 1300.0


class LimitError(HullwrightError):
    """An input beyond a resource budget or beyond small-craft reality."""


def check_count(what: str, count: int, limit: int, name: str) -> None:
    """Raise :class:`LimitError` if ``count`` exceeds ``limit`` (``name`` is the limit's
    constant, shown so the message says which budget refused it).

    >>> check_count("stations", 402, MAX_STATIONS, "MAX_STATIONS")
    Traceback (most recent call last):
    ...
    hydro.limits.LimitError: 402 stations is more than this program handles (at most 401, MAX_STATIONS)
    """
    if count > limit:
        raise LimitError(f"{count} {what} is more than this program handles (at most {limit}, {name})")


def check_work(
    stations: int, vertices: int, angles: int, limit: int = MAX_WORK, name: str = "MAX_WORK"
) -> None:
    """Refuse an analysis whose work (stations x outline vertices x heel angles) is
    beyond ``limit`` (:data:`MAX_WORK`), naming the budget and what to reduce."""
    check_count("stations", stations, MAX_STATIONS, "MAX_STATIONS")
    check_count("heel angles", angles, MAX_HEEL_ANGLES, "MAX_HEEL_ANGLES")
    work = stations * vertices * angles
    if work > limit:
        raise LimitError(
            f"too much work for one analysis: {stations} stations x {vertices} outline points "
            f"x {angles} heel angles = {work:.3g} (at most {limit:.3g}, {name}); "
            "use fewer stations or points, or a larger heel step"
        )


def check_hull_size(length: float, beam: float, depth: float) -> None:
    """Refuse a hull beyond small-craft reality (metres)."""
    check_finite("hull length (m)", length)
    check_finite("hull beam (m)", beam)
    check_finite("hull depth (m)", depth)
    for what, value, limit in (
        ("length", length, MAX_LENGTH_M),
        ("beam", beam, MAX_BEAM_M),
        ("depth", depth, MAX_DEPTH_M),
    ):
        if value > limit:
            raise LimitError(
                f"hull {what} {value:.4g} m is beyond small craft (at most {limit:g} m); "
                "check the units of the file"
            )


def check_finite(what: str, value: float) -> None:
    """Refuse a value that is not a finite number (a result that overflowed)."""
    if not math.isfinite(value):
        raise LimitError(f"{what} is not a finite number: check the sizes and masses")


def check_stations(stations: Stations) -> None:
    """Refuse a table of offsets beyond the budgets or beyond small craft."""
    check_count("stations", int(stations.x.size), MAX_STATIONS, "MAX_STATIONS")
    most = max(len(h) for h in stations.half_sections)
    check_count("points in one half section", most, MAX_POINTS_PER_SECTION, "MAX_POINTS_PER_SECTION")
    _check_coordinates(
        max(float(np.max(np.abs(stations.x))), max(float(np.max(np.abs(h))) for h in stations.half_sections))
    )
    low = min(float(np.min(h[:, 1])) for h in stations.half_sections)
    high = max(float(np.max(h[:, 1])) for h in stations.half_sections)
    check_hull_size(stations.length, 2.0 * stations.max_half_breadth, high - low)


def check_sketch(sketch: HullSketch) -> None:
    """Refuse a sketch beyond the budgets or beyond small craft (its curves never
    overshoot their control points, so the points bound the hull)."""
    for curve, what in ((sketch.plan, "plan"), (sketch.keel, "keel"), (sketch.sheer, "sheer")):
        check_count(f"{what} points", len(curve.points), MAX_CURVE_POINTS, "MAX_CURVE_POINTS")
    check_count("section shapes", len(sketch.sections), MAX_SECTION_SHAPES, "MAX_SECTION_SHAPES")
    for s in sketch.sections:
        check_count("points in a section shape", len(s.points), MAX_SHAPE_POINTS, "MAX_SHAPE_POINTS")
    check_count("stations", sketch.station_count, MAX_STATIONS, "MAX_STATIONS")
    pts = [p for c in (sketch.plan, sketch.keel, sketch.sheer) for p in c.points]
    pts += [(s.x, 0.0) for s in sketch.sections]
    if not pts or not all(math.isfinite(v) for p in pts for v in p):
        raise LimitError("a sketch point is not a finite number")
    _check_coordinates(max(abs(v) for p in pts for v in p))
    xs = [p[0] for p in sketch.plan.points]
    keel = [p[1] for p in sketch.keel.points]
    sheer = [p[1] for p in sketch.sheer.points]
    check_hull_size(max(xs) - min(xs), 2.0 * max(p[1] for p in sketch.plan.points), max(sheer) - min(keel))


def _outline_vertices(design: Design) -> tuple[int, int]:
    """(stations, outline vertices of the widest mirrored section) of a design."""
    hull = design.hull
    if isinstance(hull, Stations):
        return int(hull.x.size), 2 * max(len(h) for h in hull.half_sections) - 1
    n = max(len(s.points) for s in hull.sections)
    if any(s.smooth for s in hull.sections):
        n = (n - 1) * SMOOTH_SAMPLES_PER_SPAN + 1
    return hull.station_count, 2 * n - 1


def check_design(design: Design, work: int = MAX_WORK, work_name: str = "MAX_WORK") -> None:
    """Every limit of this module for a whole design: hull size and budget, crew and
    item masses and counts, the work of one analysis (at most ``work``, whose constant
    is ``work_name``).  Quick (no analysis)."""
    if isinstance(design.hull, Stations):
        check_stations(design.hull)
    elif isinstance(design.hull, HullSketch):
        check_sketch(design.hull)
    loads = design.loads
    check_count("crew", len(loads.crew), MAX_CREW, "MAX_CREW")
    check_count("items", len(loads.items), MAX_ITEMS, "MAX_ITEMS")
    check_count("materials", len(loads.materials), MAX_MATERIALS, "MAX_MATERIALS")
    for c in loads.crew:
        if not c.mass <= MAX_CREW_KG:
            raise LimitError(
                f"crew '{c.name}' weighs {c.mass:g} kg, more than one person "
                f"(at most {MAX_CREW_KG:g} kg); enter each person separately"
            )
    for it in loads.items:
        if not it.mass <= MAX_ITEM_KG:
            raise LimitError(f"item '{it.name}' weighs {it.mass:g} kg (at most {MAX_ITEM_KG:g} kg)")
    total = sum(c.mass for c in loads.crew) + sum(it.mass for it in loads.items)
    if not total <= MAX_DISPLACEMENT_KG:
        raise LimitError(
            f"crew and items weigh {total:g} kg together (at most {MAX_DISPLACEMENT_KG:g} kg)"
        )
    if not isinstance(design.water, str):
        rho = float(design.water)
        if not MIN_WATER_DENSITY <= rho <= MAX_WATER_DENSITY:
            raise LimitError(
                f"water density {rho:g} kg/m3 is not water "
                f"({MIN_WATER_DENSITY:g} to {MAX_WATER_DENSITY:g} kg/m3)"
            )
    stations, vertices = _outline_vertices(design)
    if isinstance(design.hull, HullSketch) and stations * vertices**2 > MAX_OUTLINE_CHECK:
        raise LimitError(
            f"too many stations for shapes this detailed: {stations} stations x "
            f"({vertices} outline points)^2 = {stations * vertices**2:.3g} to check "
            f"(at most {MAX_OUTLINE_CHECK:.3g}, MAX_OUTLINE_CHECK); use fewer stations "
            "or fewer points in the section shapes"
        )
    check_work(stations, vertices, int(design.settings.heel_angles().size), work, work_name)


def _check_coordinates(largest: float) -> None:
    if not largest <= MAX_COORDINATE_M:
        raise LimitError(
            f"a point lies {largest:.4g} m from the origin (at most {MAX_COORDINATE_M:g} m); "
            "check the units of the file"
        )
