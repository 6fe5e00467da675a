"""Editing rules for the hull sketch: moving, nudging, snapping, adding and removing points.

Pure functions on :class:`hydro.HullSketch`, no Qt, so every rule is tested without a
window.  A move never produces an impossible shape on its own account: the point is
held at the nearest allowed position and the returned :class:`Move` says why.  (A shape
can still be rejected afterwards by :func:`hydro.hull.validate_sketch`, for example a
section outline that crosses itself; the document then refuses the edit.)

Coordinates are metres.  Plan, keel and sheer points are (x, value); section points are
worked in true scale (y out from the centreline, z above the baseline) at the section
shape's station and stored normalised (u, v) as the engine expects.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from hydro import Curve, HullSketch

__all__ = [
    "CURVES",
    "MIN_GAP_M",
    "MIN_DEPTH_M",
    "EditRefused",
    "PointRef",
    "Move",
    "point_position",
    "section_frame",
    "move_point",
    "nudge_point",
    "snap",
    "grid_step",
    "nudge_step",
    "nearest_curve",
    "insert_point",
    "insert_section_point",
    "delete_point",
    "refs_in_box",
    "move_points",
    "toggle_smooth",
]

#: The curves along the hull, by the name a PointRef uses.
CURVES = ("plan", "keel", "sheer")
#: Least spacing along x between neighbouring control points (m).
MIN_GAP_M = 0.01
#: Least depth of the sheer above the keel at a control point (m).
MIN_DEPTH_M = 0.01
#: Section points other than the first keep at least this u = y / b(x) off the centreline.
MIN_U = 0.005
#: Section points may lie a little outside the gunwale breadth (tumblehome), no further.
MAX_U = 1.25

#: Snap grid and nudge steps per unit system: (grid, nudge, nudge with modifier), metres.
_STEPS = {
    "metric": (0.005, 0.001, 0.010),
    "imperial": (0.0254 / 8, 0.0254 / 16, 0.0254 * 10 / 16),
}


class EditRefused(ValueError):
    """An add or delete that would break the sketch; the message says why."""


@dataclass(frozen=True)
class PointRef:
    """Which control point: a point of the plan, keel or sheer curve, or of a section shape.

    Attributes
    ----------
    curve : "plan", "keel", "sheer" or "section"
    index : position of the point in its curve or shape
    shape : which section shape (only for curve == "section")
    """

    curve: str
    index: int
    shape: int = 0

    def label(self) -> str:
        """Short name for menus and the undo list."""
        if self.curve == "section":
            return f"section {self.shape + 1} point {self.index + 1}"
        return f"{self.curve} point {self.index + 1}"


@dataclass(frozen=True)
class Move:
    """The result of a move: the new sketch and, if the point was held, why."""

    sketch: HullSketch
    note: str = ""


def _curve(sketch: HullSketch, name: str) -> Curve:
    return getattr(sketch, name)


def section_frame(sketch: HullSketch, shape: int) -> tuple[float, float, float]:
    """Half-breadth b, keel height k and depth d (m) at a section shape's station."""
    x = np.array([sketch.sections[shape].x])
    b = float(sketch.plan(x)[0])
    k = float(sketch.keel(x)[0])
    d = float(sketch.sheer(x)[0]) - k
    return b, k, d


def point_position(sketch: HullSketch, ref: PointRef) -> tuple[float, float]:
    """Where a control point is drawn: (x, value) or, for a section, true (y, z)."""
    if ref.curve == "section":
        u, v = sketch.sections[ref.shape].points[ref.index]
        b, k, d = section_frame(sketch, ref.shape)
        return u * b, k + v * d
    x, value = _curve(sketch, ref.curve).points[ref.index]
    return x, value


def _clamp(value: float, low: float, high: float) -> tuple[float, bool]:
    held = min(max(value, low), high)
    return held, held != value


def move_point(sketch: HullSketch, ref: PointRef, x: float, y: float) -> Move:
    """Move a control point to (x, y), held at the nearest allowed position.

    Plan, keel and sheer points keep their order along the hull; the half-breadth stays
    >= 0; the keel stays below the sheer.  The aft end stays put and the forward end
    moves the forward end of all three curves (the hull's length).  Section points keep
    u within (0, 1.25] and v within [0, 1]; the first stays on the centreline and the
    last (the gunwale) follows the plan and sheer.
    """
    if not (math.isfinite(x) and math.isfinite(y)):
        return Move(sketch, "not a number")
    if ref.curve == "section":
        return _move_section_point(sketch, ref, x, y)
    return _move_curve_point(sketch, ref, x, y)


def _move_curve_point(sketch: HullSketch, ref: PointRef, x: float, y: float) -> Move:
    curve = _curve(sketch, ref.curve)
    pts = curve.points
    last = len(pts) - 1
    notes: list[str] = []
    if ref.index == 0:
        if abs(x - pts[0][0]) > 1e-12:
            notes.append("the aft end stays at its station; drag the forward end to change the length")
        x = pts[0][0]
    elif ref.index == last:
        low = max(_curve(sketch, name).points[-2][0] for name in CURVES) + MIN_GAP_M
        x, held = _clamp(x, low, math.inf)
        if held:
            notes.append("the forward end cannot pass the points behind it")
    else:
        x, held = _clamp(x, pts[ref.index - 1][0] + MIN_GAP_M, pts[ref.index + 1][0] - MIN_GAP_M)
        if held:
            notes.append("points keep their order along the hull")
    if ref.index == last:
        sketch = _with_forward_end(sketch, x)
    if ref.curve == "plan":
        y, held = _clamp(y, 0.0, math.inf)
        if held:
            notes.append("the half-breadth cannot go below the centreline")
    elif ref.curve == "keel":
        top = float(sketch.sheer(np.array([x]))[0]) - MIN_DEPTH_M
        y, held = _clamp(y, -math.inf, top)
        if held:
            notes.append("the keel stays below the sheer")
    else:
        bottom = float(sketch.keel(np.array([x]))[0]) + MIN_DEPTH_M
        y, held = _clamp(y, bottom, math.inf)
        if held:
            notes.append("the sheer stays above the keel")
    moved = _curve(sketch, ref.curve).with_point(ref.index, (x, y))
    return Move(replace(sketch, **{ref.curve: moved}), "; ".join(notes))


def _with_forward_end(sketch: HullSketch, x_end: float) -> HullSketch:
    changes = {}
    for name in CURVES:
        curve = _curve(sketch, name)
        changes[name] = curve.with_point(len(curve.points) - 1, (x_end, curve.points[-1][1]))
    return replace(sketch, **changes)


def _move_section_point(sketch: HullSketch, ref: PointRef, y: float, z: float) -> Move:
    shape = sketch.sections[ref.shape]
    last = len(shape.points) - 1
    if ref.index == last:
        return Move(sketch, "the gunwale point follows the plan and sheer lines; drag it there")
    b, k, d = section_frame(sketch, ref.shape)
    if b <= 1e-9 or d <= 1e-9:
        return Move(sketch, "this section's station has no breadth or depth to draw on")
    u, v = y / b, (z - k) / d
    notes = []
    if ref.index == 0:
        if abs(u) > 1e-9:
            notes.append("the first point stays on the centreline")
        u = 0.0
        v, held = _clamp(v, 0.0, 0.999)
    else:
        u, held_u = _clamp(u, MIN_U, MAX_U)
        if held_u:
            notes.append("section points stay between the centreline and a little past the gunwale")
        v, held = _clamp(v, 0.0, 1.0)
    if held:
        notes.append("section points stay between the keel and the gunwale heights")
    new_shape = shape.with_point(ref.index, (u, v))
    sections = tuple(new_shape if i == ref.shape else s for i, s in enumerate(sketch.sections))
    return Move(replace(sketch, sections=sections), "; ".join(notes))


def nudge_point(sketch: HullSketch, ref: PointRef, dx: float, dy: float) -> Move:
    """Move a point by (dx, dy) from where it is now (same rules as :func:`move_point`)."""
    x, y = point_position(sketch, ref)
    return move_point(sketch, ref, x + dx, y + dy)


def snap(value: float, step: float) -> float:
    """``value`` rounded to the nearest multiple of ``step`` (unchanged if step <= 0).

    >>> snap(0.1234, 0.005)
    0.125
    """
    if step <= 0:
        return value
    return round(round(value / step) * step, 9)


def grid_step(units: str) -> float:
    """Snap grid (m): 5 mm in metric, 1/8 inch in imperial."""
    return _STEPS[units][0]


def nudge_step(units: str, coarse: bool) -> float:
    """Arrow-key step (m): 1 mm or 1/16 inch; ten times that with the modifier."""
    return _STEPS[units][2 if coarse else 1]


def nearest_curve(sketch: HullSketch, names: tuple[str, ...], x: float, value: float) -> str:
    """Which of the named curves passes closest (vertically) to (x, value)."""
    at = np.array([x])
    return min(names, key=lambda n: abs(float(_curve(sketch, n)(at)[0]) - value))


def insert_point(sketch: HullSketch, name: str, x: float) -> tuple[HullSketch, PointRef]:
    """Add a point to a plan, keel or sheer curve at ``x``, on the curve as it is now."""
    curve = _curve(sketch, name)
    xs = [p[0] for p in curve.points]
    if not xs[0] + MIN_GAP_M <= x <= xs[-1] - MIN_GAP_M:
        raise EditRefused("new points go between the two ends of the hull")
    i = int(np.searchsorted(xs, x))
    if min(abs(x - xs[i - 1]), abs(xs[i] - x)) < MIN_GAP_M:
        raise EditRefused("too close to an existing point")
    value = float(curve(np.array([x]))[0])
    pts = curve.points[:i] + ((float(x), value),) + curve.points[i:]
    return replace(sketch, **{name: replace(curve, points=pts)}), PointRef(name, i)


def _nearest_segment(pts: np.ndarray, p: np.ndarray) -> tuple[int, float]:
    a, b = pts[:-1], pts[1:]
    ab = b - a
    length2 = np.maximum((ab**2).sum(axis=1), 1e-18)
    t = np.clip(((p - a) * ab).sum(axis=1) / length2, 0.0, 1.0)
    dist = np.hypot(*(a + t[:, None] * ab - p).T)
    i = int(np.argmin(dist))
    return i, float(t[i])


def insert_section_point(
    sketch: HullSketch, shape: int, y: float, z: float
) -> tuple[HullSketch, PointRef]:
    """Add a point to every section shape on the segment nearest to (y, z) of ``shape``.

    All shapes must keep the same number of points, so each gets a point at the same
    fraction along the same segment; for hard-chine shapes nothing else changes.
    """
    b, k, d = section_frame(sketch, shape)
    if b <= 1e-9 or d <= 1e-9:
        raise EditRefused("this section's station has no breadth or depth to draw on")
    uv = np.asarray(sketch.sections[shape].points, dtype=float)
    i, t = _nearest_segment(uv * [b, d] + [0.0, k], np.array([y, z]))
    t = min(max(t, 0.1), 0.9)
    sections = []
    for s in sketch.sections:
        p = np.asarray(s.points, dtype=float)
        new = tuple(map(float, p[i] + t * (p[i + 1] - p[i])))
        sections.append(replace(s, points=s.points[: i + 1] + (new,) + s.points[i + 1 :]))
    return replace(sketch, sections=tuple(sections)), PointRef("section", i + 1, shape)


def delete_point(sketch: HullSketch, ref: PointRef) -> HullSketch:
    """Remove a control point (from every section shape, for a section point)."""
    if ref.curve == "section":
        n = len(sketch.sections[ref.shape].points)
        if ref.index in (0, n - 1):
            raise EditRefused("the centreline and gunwale points of a section cannot be removed")
        sections = tuple(
            replace(s, points=s.points[: ref.index] + s.points[ref.index + 1 :])
            for s in sketch.sections
        )
        return replace(sketch, sections=sections)
    curve = _curve(sketch, ref.curve)
    if ref.index in (0, len(curve.points) - 1):
        raise EditRefused("the ends of the hull cannot be removed")
    pts = curve.points[: ref.index] + curve.points[ref.index + 1 :]
    return replace(sketch, **{ref.curve: replace(curve, points=pts)})



def refs_in_box(
    sketch: HullSketch, refs: tuple[PointRef, ...], x0: float, y0: float, x1: float, y1: float
) -> tuple[PointRef, ...]:
    """The points among ``refs`` drawn inside the box (corners in any order)."""
    lo_x, hi_x = min(x0, x1), max(x0, x1)
    lo_y, hi_y = min(y0, y1), max(y0, y1)
    inside = []
    for ref in refs:
        x, y = point_position(sketch, ref)
        if lo_x <= x <= hi_x and lo_y <= y <= hi_y:
            inside.append(ref)
    return tuple(inside)


def move_points(sketch: HullSketch, refs: tuple[PointRef, ...], dx: float, dy: float) -> Move:
    """Move several points together by (dx, dy), each held by the rules of :func:`move_point`.

    Points are moved leading edge first (the one furthest in the direction of travel),
    so a group keeps its order along the hull instead of being stopped by itself.

    >>> from hydro import Curve, HullSketch, SectionShape
    >>> s = HullSketch(Curve(((0, .3), (1, .4), (2, .4), (3, .3))), Curve(((0, 0), (3, 0))),
    ...                Curve(((0, .4), (3, .4))), (SectionShape(1.5, ((0, 0), (1, 1))),))
    >>> moved = move_points(s, (PointRef("plan", 1), PointRef("plan", 2)), 0.5, 0.05).sketch
    >>> [(round(x, 3), round(b, 3)) for x, b in moved.plan.points]
    [(0, 0.3), (1.5, 0.45), (2.5, 0.45), (3, 0.3)]
    """
    if not refs:
        return Move(sketch)
    start = {ref: point_position(sketch, ref) for ref in refs}
    order = sorted(refs, key=lambda r: start[r][0], reverse=dx > 0)
    notes: list[str] = []
    for ref in order:
        x, y = start[ref]
        move = move_point(sketch, ref, x + dx, y + dy)
        sketch = move.sketch
        if move.note and move.note not in notes:
            notes.append(move.note)
    return Move(sketch, "; ".join(notes))


def toggle_smooth(sketch: HullSketch, ref: PointRef) -> HullSketch:
    """The point's curve (or section shape) switched between smooth and corners."""
    if ref.curve == "section":
        shapes = list(sketch.sections)
        shapes[ref.shape] = replace(shapes[ref.shape], smooth=not shapes[ref.shape].smooth)
        return replace(sketch, sections=tuple(shapes))
    curve = _curve(sketch, ref.curve)
    return replace(sketch, **{ref.curve: replace(curve, smooth=not curve.smooth)})
