"""Main dimensions of a sketched hull, and the sketch rescaled to new ones, keeping its shape.

Definitions (metres):

- length: from the aft end to the forward end of the curves;
- beam: twice the largest half-breadth at the gunwale (the plan curve is a monotone
  cubic or a polyline through its points, so its largest value is its largest point);
- depth: sheer above keel at mid-length;
- rocker aft / fore: keel height at each end above the lowest keel point;
- bottom width (hard-chine shapes starting on the keel): twice the chine's half-breadth
  at the section shape where the hull is widest; flare: the side's angle from the
  vertical there, chine to gunwale;
- hull spacing and hull width (twin-hull sections, which start under a bridge deck):
  centre to centre of the two hulls, and the width of one, at the widest point.

Each ``with_*`` function returns a new sketch in which that dimension is exactly the value
asked for; lengths scale x about the aft end, the beam scales every half-breadth, the
depth scales every height about the lowest keel point, so the shape is kept.
:func:`resize_design` also moves the loads with the hull (x with the length, y with the
beam), so the crew stay at the same place in the boat.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from hydro.design import Design
from hydro.errors import ShapeError
from hydro.loads import Loads
from hydro.hull import Curve, HullSketch, Stations, validate_sketch

__all__ = [
    "Dimensions",
    "measure",
    "with_length",
    "with_beam",
    "with_depth",
    "with_rocker",
    "with_bottom_width",
    "with_flare",
    "with_twin_hulls",
    "resize_design",
    "move_loads",
]

#: Chine points stay at least this far off the centreline, as a fraction of the breadth.
MIN_U = 0.005


@dataclass(frozen=True)
class Dimensions:
    """The main dimensions of a sketch (m; flare in degrees).

    Attributes
    ----------
    length, beam, depth, rocker_aft, rocker_fore : see the module docstring
    bottom_width, flare_deg : hard-chine shapes on the keel only, else None
    hull_spacing, hull_width : twin-hull sections only, else None
    """

    length: float
    beam: float
    depth: float
    rocker_aft: float
    rocker_fore: float
    bottom_width: float | None = None
    flare_deg: float | None = None
    hull_spacing: float | None = None
    hull_width: float | None = None


def _points(curve: Curve) -> np.ndarray:
    return np.asarray(curve.points, dtype=float)


def _scaled(curve: Curve, x0: float, fx: float, v0: float = 0.0, fv: float = 1.0) -> Curve:
    p = _points(curve)
    pts = zip(x0 + (p[:, 0] - x0) * fx, v0 + (p[:, 1] - v0) * fv)
    return replace(curve, points=tuple((float(x), float(v)) for x, v in pts))


def _positive(value: float, what: str) -> float:
    if not (math.isfinite(value) and value > 0):
        raise ShapeError(f"the {what} must be a positive length")
    return float(value)


def _checked(sketch: HullSketch) -> HullSketch:
    validate_sketch(sketch)
    return sketch


def _is_twin(sketch: HullSketch) -> bool:
    return all(s.points[0][1] > 0 for s in sketch.sections)


def _has_chine(sketch: HullSketch) -> bool:
    return not _is_twin(sketch) and all(
        not s.smooth and len(s.points) >= 3 and s.points[0][1] == 0 for s in sketch.sections
    )


def _widest_shape(sketch: HullSketch) -> int:
    b = sketch.plan(np.array([s.x for s in sketch.sections]))
    return int(np.argmax(b))


def _frame(sketch: HullSketch, x: float) -> tuple[float, float]:
    """Half-breadth and depth at x."""
    at = np.array([x])
    return float(sketch.plan(at)[0]), float(sketch.sheer(at)[0] - sketch.keel(at)[0])


def _keel_low(sketch: HullSketch) -> tuple[int, float]:
    k = _points(sketch.keel)[:, 1]
    i = int(np.argmin(k))
    return i, float(k[i])


def measure(sketch: HullSketch) -> Dimensions:
    """The main dimensions of ``sketch`` (see the module docstring)."""
    x0, x1 = sketch.x_range
    beam = 2.0 * float(np.max(_points(sketch.plan)[:, 1]))
    mid = np.array([0.5 * (x0 + x1)])
    depth = float(sketch.sheer(mid)[0] - sketch.keel(mid)[0])
    keel = _points(sketch.keel)
    _i, low = _keel_low(sketch)
    dims = Dimensions(x1 - x0, beam, depth, float(keel[0, 1] - low), float(keel[-1, 1] - low))
    if _has_chine(sketch):
        i = _widest_shape(sketch)
        shape = sketch.sections[i]
        b, d = _frame(sketch, shape.x)
        u1, v1 = shape.points[1]
        flare = math.degrees(math.atan2((1.0 - u1) * b, (1.0 - v1) * d))
        dims = replace(dims, bottom_width=2.0 * u1 * b, flare_deg=flare)
    elif _is_twin(sketch):
        u_in = min(s.points[1][0] for s in sketch.sections)
        half = beam / 2.0
        dims = replace(dims, hull_spacing=(1.0 + u_in) * half, hull_width=(1.0 - u_in) * half)
    return dims


def with_length(sketch: HullSketch, length: float) -> HullSketch:
    """The sketch stretched along x about its aft end to ``length``."""
    x0, _x1 = sketch.x_range
    f = _positive(length, "length") / sketch.length
    sections = tuple(replace(s, x=x0 + (s.x - x0) * f) for s in sketch.sections)
    out = replace(
        sketch,
        plan=_scaled(sketch.plan, x0, f),
        keel=_scaled(sketch.keel, x0, f),
        sheer=_scaled(sketch.sheer, x0, f),
        sections=sections,
    )
    # the far end exactly where asked (x0 + L, not x0 + (x1 - x0) * f)
    def ended(curve: Curve) -> Curve:
        last = len(curve.points) - 1
        return curve.with_point(last, (x0 + length, curve.points[last][1]))

    return _checked(
        replace(out, plan=ended(out.plan), keel=ended(out.keel), sheer=ended(out.sheer))
    )


def with_beam(sketch: HullSketch, beam: float) -> HullSketch:
    """Every half-breadth scaled so that the beam is ``beam``."""
    half = _positive(beam, "beam") / 2.0
    p = _points(sketch.plan)
    top = float(np.max(p[:, 1]))
    f = half / top
    pts = tuple((float(x), half if v == top else float(v * f)) for x, v in p)
    return _checked(replace(sketch, plan=replace(sketch.plan, points=pts)))


def with_depth(sketch: HullSketch, depth: float) -> HullSketch:
    """Keel and sheer heights scaled about the lowest keel point to make ``depth``."""
    now = measure(sketch).depth
    f = _positive(depth, "depth") / now
    x0, _x1 = sketch.x_range
    _i, low = _keel_low(sketch)
    return _checked(
        replace(
            sketch,
            keel=_scaled(sketch.keel, x0, 1.0, low, f),
            sheer=_scaled(sketch.sheer, x0, 1.0, low, f),
        )
    )


def _ramp(values: np.ndarray, xs: np.ndarray, end: int, low_i: int, low: float, new: float) -> None:
    """Set the rocker at keel point ``end`` to ``new``, points towards ``low_i`` in step."""
    side = slice(0, low_i) if end == 0 else slice(low_i + 1, len(values))
    now = values[end] - low
    if now > 1e-12:
        values[side] = low + (values[side] - low) * (new / now)
    else:  # a flat run: lift linearly from the lowest point
        span = xs[end] - xs[low_i]
        values[side] = values[side] + new * (xs[side] - xs[low_i]) / span
    values[end] = low + new


def with_rocker(
    sketch: HullSketch, aft: float | None = None, fore: float | None = None
) -> HullSketch:
    """Keel ends lifted (or lowered) to the given rocker above the lowest keel point.

    The keel points between an end and the lowest point keep their proportion of the
    rise; the sheer stays where it is.
    """
    p = _points(sketch.keel)
    xs, values = p[:, 0], p[:, 1].copy()
    low_i, low = _keel_low(sketch)
    for end, new in ((0, aft), (len(values) - 1, fore)):
        if new is None:
            continue
        if not (math.isfinite(new) and new >= 0):
            raise ShapeError("the rocker must be zero or a positive length")
        if end == low_i:
            if new > 0:  # the end is the lowest point: lift it and the next ones level
                values[end] = low + new
            continue
        _ramp(values, xs, end, low_i, low, new)
    pts = tuple((float(x), float(v)) for x, v in zip(xs, values))
    return _checked(replace(sketch, keel=replace(sketch.keel, points=pts)))


def _chine_scaled(sketch: HullSketch, f: float) -> HullSketch:
    sections = []
    for s in sketch.sections:
        u1, v1 = s.points[1]
        u = u1 * f
        if not MIN_U <= u < 1.0:
            raise ShapeError("the chine would leave the bottom: bottom width or flare too large")
        sections.append(s.with_point(1, (u, v1)))
    return _checked(replace(sketch, sections=tuple(sections)))


def with_bottom_width(sketch: HullSketch, width: float) -> HullSketch:
    """Hard-chine shapes with the chine moved out or in to make the bottom ``width``."""
    if not _has_chine(sketch):
        raise ShapeError("the bottom width is for hard-chine sections that start on the keel")
    now = measure(sketch).bottom_width
    assert now is not None
    return _chine_scaled(sketch, _positive(width, "bottom width") / now)


def with_flare(sketch: HullSketch, flare_deg: float) -> HullSketch:
    """Hard-chine shapes with the chine moved so the widest section's side leans ``flare_deg``.

    The gunwale stays; 0 is a vertical side, larger values lean the side outwards.
    """
    if not _has_chine(sketch):
        raise ShapeError("the flare is for hard-chine sections that start on the keel")
    if not (math.isfinite(flare_deg) and 0.0 <= flare_deg < 80.0):
        raise ShapeError("the flare must be between 0 and 80 degrees")
    shape = sketch.sections[_widest_shape(sketch)]
    b, d = _frame(sketch, shape.x)
    u1, v1 = shape.points[1]
    target = 1.0 - math.tan(math.radians(flare_deg)) * (1.0 - v1) * d / b
    return _chine_scaled(sketch, target / u1)


def with_twin_hulls(
    sketch: HullSketch, spacing: float | None = None, width: float | None = None
) -> HullSketch:
    """Twin hulls moved apart (centre to centre ``spacing``) and/or made ``width`` wide.

    The outer sides set the beam; every section point off the centreline is mapped
    linearly from the old hull's inner-to-outer span to the new one.
    """
    if not _is_twin(sketch):
        raise ShapeError("hull spacing and width are for twin-hull sections")
    dims = measure(sketch)
    assert dims.hull_spacing is not None and dims.hull_width is not None
    s = dims.hull_spacing if spacing is None else _positive(spacing, "hull spacing")
    w = dims.hull_width if width is None else _positive(width, "hull width")
    if w >= s:
        raise ShapeError("the hulls would overlap: make the spacing larger than the width")
    u_in = min(sec.points[1][0] for sec in sketch.sections)
    u_new = (s - w) / (s + w)
    g = (1.0 - u_new) / (1.0 - u_in)
    sections = tuple(
        replace(
            sec,
            points=(sec.points[0],)
            + tuple((float(1.0 - (1.0 - u) * g), float(v)) for u, v in sec.points[1:-1])
            + (sec.points[-1],),
        )
        for sec in sketch.sections
    )
    return with_beam(replace(sketch, sections=sections), s + w)


def _scale_stations(stations: Stations, fx: float, fy: float, fz: float) -> Stations:
    x0 = float(stations.x[0])
    k = stations.keel_z
    return Stations(
        x0 + (stations.x - x0) * fx,
        tuple(
            np.column_stack([h[:, 0] * fy, k + (h[:, 1] - k) * fz])
            for h in stations.half_sections
        ),
    )


def resize_design(
    design: Design,
    length: float | None = None,
    beam: float | None = None,
    depth: float | None = None,
) -> Design:
    """The design with its hull at the given main dimensions; the loads move with it.

    Loads keep their place in the boat: x scales with the length about the aft end, y
    with the beam.  A fixed table of offsets is scaled the same way (its depth is
    from K to the highest gunwale).
    """
    hull = design.hull
    if isinstance(hull, HullSketch):
        before = measure(hull)
        if length is not None:
            hull = with_length(hull, length)
        if beam is not None:
            hull = with_beam(hull, beam)
        if depth is not None:
            hull = with_depth(hull, depth)
        fx, fy = hull.length / before.length, measure(hull).beam / before.beam
        x0 = hull.x_range[0]
    else:
        top = float(np.max(hull.gunwale[:, 1])) - hull.keel_z
        fx = 1.0 if length is None else _positive(length, "length") / hull.length
        fy = 1.0 if beam is None else _positive(beam, "beam") / (2 * hull.max_half_breadth)
        fz = 1.0 if depth is None else _positive(depth, "depth") / top
        x0 = float(hull.x[0])
        hull = _scale_stations(hull, fx, fy, fz)

    return replace(design, hull=hull, loads=move_loads(design.loads, x0, fx, fy))


def move_loads(loads: Loads, x0: float, fx: float, fy: float) -> Loads:
    """Crew and items at the same place in a hull stretched by ``fx`` about x0, ``fy`` across."""
    return replace(
        loads,
        crew=tuple(replace(c, x=x0 + (c.x - x0) * fx, y=c.y * fy) for c in loads.crew),
        items=tuple(replace(i, x=x0 + (i.x - x0) * fx, y=i.y * fy) for i in loads.items),
    )
