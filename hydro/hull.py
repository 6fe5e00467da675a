"""The hull: sketch curves a builder drags, and the stations the engine works on.

Coordinates: x forward from the aft end, y to starboard, z up. Lengths in metres.

A :class:`HullSketch` holds the plan half-breadth b(x), the keel line k(x), the sheer
line s(x) and one or more normalised half-section shapes (u, v) with u = y / b(x) and
v = (z - k(x)) / (s(x) - k(x)).  :func:`generate_stations` turns it into
:class:`Stations`, a table of offsets: one half section (y, z) per station, from the
centreline to the gunwale.  The engine only ever sees stations, so a sketched hull, an
imported offsets table and an analytic test hull are all the same to it.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from functools import lru_cache
from typing import Any

import numpy as np
import shapely
from numpy.typing import NDArray

from hydro.curves import interpolate, sample_polyline
from hydro.errors import ShapeError

__all__ = [
    "Curve",
    "SectionShape",
    "HullSketch",
    "Stations",
    "generate_stations",
    "validate_sketch",
    "validate_half_section",
    "scale_breadth",
    "half_sections_at",
]

FloatArray = NDArray[np.float64]

#: Samples per span of a smooth section curve.
SMOOTH_SAMPLES_PER_SPAN = 6


@dataclass(frozen=True)
class Curve:
    """A curve along the hull through control points (x, value), x increasing.

    Attributes
    ----------
    points : tuple of (x, value) pairs, metres
    smooth : bool
        Monotone cubic through the points if True, straight segments if False.
    """

    points: tuple[tuple[float, float], ...]
    smooth: bool = True

    def __call__(self, x: FloatArray) -> FloatArray:
        p = np.asarray(self.points, dtype=float)
        return interpolate(p[:, 0], p[:, 1], x, self.smooth)

    def with_point(self, index: int, point: tuple[float, float]) -> Curve:
        """Copy with one control point replaced."""
        pts = list(self.points)
        pts[index] = (float(point[0]), float(point[1]))
        return replace(self, points=tuple(pts))


@dataclass(frozen=True)
class SectionShape:
    """A normalised half-section shape placed at station position ``x``.

    Attributes
    ----------
    x : float
        Where along the hull this shape is exact (m); shapes are blended linearly
        between neighbouring positions and held beyond the first and last.
    points : tuple of (u, v) pairs
        From the centreline (u = 0) to the gunwale (1, 1).  u = y / b(x) and
        v = (z - k(x)) / d(x).  The first point is usually the keel (0, 0); a raft's
        section starts at the underside of its bridge deck (0, v > 0).
    smooth : bool
        Smooth curve through the points, or a hard-chine polyline.
    """

    x: float
    points: tuple[tuple[float, float], ...]
    smooth: bool = False

    def with_point(self, index: int, point: tuple[float, float]) -> SectionShape:
        """Copy with one control point replaced."""
        pts = list(self.points)
        pts[index] = (float(point[0]), float(point[1]))
        return replace(self, points=tuple(pts))


@dataclass(frozen=True)
class HullSketch:
    """The editable curves of a hull.

    Attributes
    ----------
    plan : Curve
        Half-breadth at the gunwale b(x) >= 0 (0 at a pointed end, > 0 at a transom).
    keel : Curve
        Keel (rocker) line k(x), height of the centreline bottom above the baseline.
    sheer : Curve
        Gunwale height s(x); the local depth is d(x) = s(x) - k(x) > 0.
    sections : tuple of SectionShape, sorted by x, all with the same number of points
        (so chines run continuously from one shape to the next).
    station_count : int
        How many stations :func:`generate_stations` makes, evenly spaced over the length.
    """

    plan: Curve
    keel: Curve
    sheer: Curve
    sections: tuple[SectionShape, ...]
    station_count: int = 41

    @property
    def length(self) -> float:
        xs = [p[0] for p in self.plan.points]
        return float(xs[-1] - xs[0])

    @property
    def x_range(self) -> tuple[float, float]:
        xs = [p[0] for p in self.plan.points]
        return float(xs[0]), float(xs[-1])


@dataclass(frozen=True, eq=False)
class Stations:
    """A table of offsets: half sections from the centreline to the gunwale.

    Attributes
    ----------
    x : (S,) array
        Station positions, strictly increasing (m).
    half_sections : tuple of (n_i, 2) arrays
        Points (y, z) of each half section from the centreline (y = 0) to the
        gunwale, the last point being the gunwale.
    check_sections : check every outline for self-crossing (shapely); the generator
        turns it off after checking the shapes it scales
    stack : (S, n, 2) the half sections as one array when they all have n points
        (generated stations do), else None; lets the engine work on all at once
    """

    x: FloatArray
    half_sections: tuple[FloatArray, ...]
    check_sections: bool = field(default=True, repr=False)
    stack: FloatArray | None = field(init=False, repr=False)

    def __post_init__(self) -> None:
        x = np.asarray(self.x, dtype=float)
        object.__setattr__(self, "x", x)
        halves = tuple(np.asarray(h, dtype=float) for h in self.half_sections)
        object.__setattr__(self, "half_sections", halves)
        if x.ndim != 1 or x.size < 2:
            raise ShapeError("a hull needs at least two stations")
        if len(halves) != x.size:
            raise ShapeError("each station needs exactly one half section")
        if not np.all(np.isfinite(x)) or np.any(np.diff(x) <= 0):
            raise ShapeError("station positions must be finite and strictly increasing")
        shapes = {h.shape for h in halves}
        stack = None
        if len(shapes) == 1 and len(next(iter(shapes))) == 2 and next(iter(shapes))[1] == 2:
            stack = np.stack(halves)
            stack.flags.writeable = False
        object.__setattr__(self, "stack", stack)
        if stack is not None and not self.check_sections:
            if not np.all(np.isfinite(stack)):
                bad = int(np.flatnonzero(~np.isfinite(stack).all(axis=(1, 2)))[0])
                raise ShapeError(f"station at x = {x[bad]:.3f} m: points are not finite (y, z) pairs")
        else:
            for xi, h in zip(x, halves):
                if self.check_sections:
                    validate_half_section(h, f"station at x = {xi:.3f} m")
                elif h.ndim != 2 or h.shape[1] != 2 or not np.all(np.isfinite(h)):
                    raise ShapeError(f"station at x = {xi:.3f} m: points are not finite (y, z) pairs")
        if self.max_half_breadth <= 0:
            raise ShapeError("the hull has no breadth at any station")

    @property
    def gunwale(self) -> FloatArray:
        """(S, 2) starboard gunwale points (y, z)."""
        if self.stack is not None:
            return self.stack[:, -1].copy()
        return np.array([h[-1] for h in self.half_sections])

    @property
    def keel_z(self) -> float:
        """Height of K, the lowest point of the hull (m)."""
        if self.stack is not None:
            return float(self.stack[:, :, 1].min())
        return float(min(np.min(h[:, 1]) for h in self.half_sections))

    @property
    def length(self) -> float:
        return float(self.x[-1] - self.x[0])

    @property
    def max_half_breadth(self) -> float:
        if self.stack is not None:
            return float(self.stack[:, :, 0].max())
        return float(max(np.max(h[:, 0]) for h in self.half_sections))


def validate_half_section(h: FloatArray, where: str) -> None:
    """Raise :class:`ShapeError` unless ``h`` is a usable half section.

    It must be an (n >= 2, 2) array of finite numbers, start on the centreline, stay on
    the starboard side, and its mirrored, closed outline must not cross itself.
    """
    if h.ndim != 2 or h.shape[1] != 2 or h.shape[0] < 2:
        raise ShapeError(f"{where}: a half section needs at least two (y, z) points")
    if not np.all(np.isfinite(h)):
        raise ShapeError(f"{where}: a point is not a finite number")
    if abs(h[0, 0]) > 1e-9:
        raise ShapeError(f"{where}: the half section must start on the centreline (y = 0)")
    if np.any(h[:, 0] < -1e-9):
        raise ShapeError(f"{where}: negative half-breadth (y < 0)")
    if np.max(h[:, 0]) <= 1e-12:
        return  # a pointed end: no area, nothing to cross
    ring = _drop_repeats(np.vstack([h, h[::-1][:-1] * [-1.0, 1.0]]))
    if len(ring) >= 3 and not shapely.is_valid(shapely.Polygon(ring)):
        raise ShapeError(f"{where}: the section outline crosses itself")


def _drop_repeats(ring: FloatArray) -> FloatArray:
    keep = np.ones(len(ring), dtype=bool)
    keep[1:] = np.any(np.abs(np.diff(ring, axis=0)) > 1e-12, axis=1)
    return ring[keep]


@lru_cache(maxsize=64)
def _check_curve(curve: Curve, name: str, min_points: int = 2) -> FloatArray:
    """The curve's points (read-only) once checked (raises ShapeError).

    Cached on the curve itself: a drag moves one curve, the others are checked once."""
    p = np.asarray(curve.points, dtype=float)
    if p.ndim != 2 or p.shape[1] != 2 or len(p) < min_points:
        raise ShapeError(f"the {name} needs at least {min_points} points")
    if not np.all(np.isfinite(p)):
        raise ShapeError(f"the {name} has a point that is not a finite number")
    if np.any(np.diff(p[:, 0]) <= 0):
        raise ShapeError(f"the {name} points must run from aft to forward without going back")
    p.flags.writeable = False
    return p


def validate_sketch(sketch: HullSketch) -> None:
    """Raise :class:`ShapeError` with a plain message if the sketch is impossible."""
    plan = _cached(_check_curve, sketch.plan, "plan outline")
    keel = _cached(_check_curve, sketch.keel, "keel line")
    sheer = _cached(_check_curve, sketch.sheer, "sheer line")
    if np.any(plan[:, 1] < 0):
        raise ShapeError("the plan outline has a negative half-breadth")
    if np.max(plan[:, 1]) <= 0:
        raise ShapeError("the plan outline has no breadth anywhere")
    x0, x1 = plan[0, 0], plan[-1, 0]
    for name, c in (("keel line", keel), ("sheer line", sheer)):
        if abs(c[0, 0] - x0) > 1e-6 or abs(c[-1, 0] - x1) > 1e-6:
            raise ShapeError(f"the {name} must span the same length as the plan outline")
    if not 3 <= sketch.station_count <= 401:
        raise ShapeError("the station count must be between 3 and 401")
    _cached(_check_depth, sketch.keel, sketch.sheer, float(x0), float(x1))
    _cached(_checked_shapes, sketch.sections)


@lru_cache(maxsize=16)
def _check_depth(keel: Curve, sheer: Curve, x0: float, x1: float) -> None:
    """Raise ShapeError unless the sheer is above the keel from x0 to x1 (cached on the
    two curves: a drag of the plan leaves them as they were)."""
    xs = np.linspace(x0, x1, 201)
    depth = sheer(xs) - keel(xs)
    if np.any(depth <= 0):
        bad = xs[np.argmin(depth)]
        raise ShapeError(f"the sheer is not above the keel near x = {bad:.3f} m")


def _cached(function: Any, *key: Any) -> Any:
    """``function(*key)`` through its cache; straight through if the key is not hashable
    (points given as lists)."""
    try:
        return function(*key)
    except TypeError:
        return function.__wrapped__(*key)


@lru_cache(maxsize=16)
def _checked_shapes(sections: tuple[SectionShape, ...]) -> tuple[FloatArray, FloatArray]:
    """Check the section shapes (raises ShapeError) and sample them for blending.

    Cached on the shapes themselves: a drag of the plan, keel or sheer leaves them as
    they were, so they are checked and sampled once, not in every frame.

    Returns
    -------
    at : (K,) positions of the shapes along the hull
    shapes : (K, m, 2) the shapes sampled at the same parameters (see _sampled_shapes)
    """
    if not sections:
        raise ShapeError("the hull needs at least one section shape")
    counts = {len(s.points) for s in sections}
    if len(counts) != 1:
        raise ShapeError("all section shapes must have the same number of points")
    if any(np.diff([s.x for s in sections]) <= 0):
        raise ShapeError("section shapes must be placed at different, increasing positions")
    for s in sections:
        p = np.asarray(s.points, dtype=float)
        where = f"section shape at x = {s.x:.3f} m"
        if len(p) < 2:
            raise ShapeError(f"{where}: needs at least two points")
        if not np.all(np.isfinite(p)):
            raise ShapeError(f"{where}: a point is not a finite number")
        if abs(p[0, 0]) > 1e-9:
            raise ShapeError(f"{where}: the first point must be on the centreline (u = 0)")
        if np.any(p[1:, 0] <= 0):
            raise ShapeError(f"{where}: only the first point may sit on the centreline")
        if np.any(np.abs(p[-1] - 1.0) > 1e-9):
            raise ShapeError(f"{where}: the last point must be the gunwale (1, 1)")
        if np.any(p[:, 1] < -1e-9):
            raise ShapeError(f"{where}: a point lies below the keel line (v < 0)")
        validate_half_section(
            sample_polyline(p, s.smooth, SMOOTH_SAMPLES_PER_SPAN), where
        )
    shapes = _shape_samples(sections)
    at = np.array([sec.x for sec in sections])
    for mid in 0.5 * (at[:-1] + at[1:]):
        validate_half_section(_blend(shapes, at, np.array([mid]))[0], f"the blend at x = {mid:.3f} m")
    at.flags.writeable = False
    shapes.flags.writeable = False
    return at, shapes


@lru_cache(maxsize=16)
def _station_shapes(
    sections: tuple[SectionShape, ...], x0: float, x1: float, count: int
) -> tuple[FloatArray, FloatArray]:
    """(xs, uv): ``count`` stations from x0 to x1 and the blended shape (n, m, 2) at each,
    every one checked exactly for crossing edges (raises ShapeError).

    Cached: they depend on the shapes and the ends alone, not on the plan, keel or sheer
    a drag moves.
    """
    at, shapes = _cached(_checked_shapes, sections)
    xs = np.linspace(x0, x1, count)
    uv = np.array(_blend(shapes, at, xs))
    # every station's blended shape, exactly: the placing is an affine map with
    # positive scales, which keeps a shape free of crossings
    bad = first_crossed_outline(uv)
    if bad is not None:
        raise ShapeError(
            f"station {bad} at x = {xs[bad]:.3f} m: the section outline crosses itself "
            "(the blend of the section shapes there)"
        )
    xs.flags.writeable = False
    uv.flags.writeable = False
    return xs, uv


def _subdivide(points: FloatArray, per_segment: int) -> FloatArray:
    """A polyline with ``per_segment`` evenly spaced points per span (corners kept)."""
    frac = np.linspace(0.0, 1.0, per_segment + 1)[:-1]
    inner = points[:-1, None, :] + frac[None, :, None] * np.diff(points, axis=0)[:, None, :]
    return np.vstack([inner.reshape(-1, 2), points[-1:]])


def _sampled_shapes(sketch: HullSketch) -> FloatArray:
    """(K, m, 2) every section shape of the sketch sampled at the same parameters."""
    return _shape_samples(sketch.sections)


def _shape_samples(sections: tuple[SectionShape, ...]) -> FloatArray:
    """(K, m, 2) every section shape sampled at the same parameters.

    Hard-chine shapes keep their own points when no shape is smooth; otherwise every
    shape is sampled ``SMOOTH_SAMPLES_PER_SPAN`` times per span (straight spans stay
    straight), so corresponding samples can be blended.
    """
    shapes = [np.asarray(sec.points, dtype=float) for sec in sections]
    if not any(sec.smooth for sec in sections):
        return np.stack(shapes)
    return np.stack(
        [
            sample_polyline(p, True, SMOOTH_SAMPLES_PER_SPAN)
            if sec.smooth
            else _subdivide(p, SMOOTH_SAMPLES_PER_SPAN)
            for sec, p in zip(sections, shapes)
        ]
    )


def _blend(shapes: FloatArray, at: FloatArray, x: FloatArray) -> FloatArray:
    """(n, m, 2) shapes at stations x, linear between positions ``at``, held beyond."""
    if len(at) == 1:
        return np.broadcast_to(shapes[0], (x.size, *shapes.shape[1:]))
    i = np.clip(np.searchsorted(at, x, side="right") - 1, 0, len(at) - 2)
    w = np.clip((x - at[i]) / (at[i + 1] - at[i]), 0.0, 1.0)[:, None, None]
    return (1 - w) * shapes[i] + w * shapes[i + 1]


def generate_stations(sketch: HullSketch, count: int | None = None) -> Stations:
    """Turn the sketch into ``count`` evenly spaced stations (default: its own count).

    Section shapes are sampled once and blended linearly between their positions.

    Raises
    ------
    ShapeError
        If the sketch is impossible (see :func:`validate_sketch`), including a blend of
        two shapes that crosses itself, halfway between them or at any station.
    """
    validate_sketch(sketch)
    n = sketch.station_count if count is None else count
    if not 2 <= n <= 1001:
        raise ShapeError("the station count must be between 2 and 1001")
    x0, x1 = sketch.x_range
    xs, uv = _cached(_station_shapes, sketch.sections, x0, x1, n)
    b, k, s = (
        _cached(_at_stations, c, x0, x1, n) for c in (sketch.plan, sketch.keel, sketch.sheer)
    )
    return Stations(xs.copy(), tuple(_place(uv, b, k, s)), check_sections=False)


@lru_cache(maxsize=16)
def _at_stations(curve: Curve, x0: float, x1: float, count: int) -> FloatArray:
    """(count,) the curve at ``count`` stations from x0 to x1 (read-only; cached on the
    curve: a drag moves one curve, the others keep their values)."""
    values = curve(np.linspace(x0, x1, count))
    values.flags.writeable = False
    return values


def first_crossed_outline(halves: FloatArray) -> int | None:
    """Index of the first half section whose mirrored, closed outline crosses itself.

    ``halves`` is (n, m, 2): n half sections of m points (y, z) from the centreline to
    the gunwale.  Every pair of non-adjacent edges of each outline is tested exactly
    (orientation signs: the edges cross when each one's ends lie strictly on opposite
    sides of the other), vectorised over the sections.

    >>> square = np.array([[[0.0, 0.0], [1.0, 0.0], [1.0, 1.0]]])
    >>> bow_tie = np.array([[[0.0, 0.0], [1.0, 1.0], [1.0, 0.0], [0.5, 1.0]]])
    >>> first_crossed_outline(square), first_crossed_outline(bow_tie)
    (None, 0)
    """
    ring = np.concatenate([halves, halves[:, -1::-1][:, :-1] * np.array([-1.0, 1.0])], axis=1)
    start = ring
    end = np.roll(ring, -1, axis=1)  # the last edge closes the outline
    count = ring.shape[1]

    def orient(p: FloatArray, q: FloatArray, r: FloatArray) -> FloatArray:
        return np.sign(
            (q[..., 0] - p[..., 0]) * (r[..., 1] - p[..., 1])
            - (q[..., 1] - p[..., 1]) * (r[..., 0] - p[..., 0])
        )

    a0, a1 = start[:, :, None], end[:, :, None]
    b0, b1 = start[:, None, :], end[:, None, :]
    crosses = (orient(a0, a1, b0) * orient(a0, a1, b1) < 0) & (
        orient(b0, b1, a0) * orient(b0, b1, a1) < 0
    )
    i, j = np.indices((count, count))
    apart = (j > i + 1) & ~((i == 0) & (j == count - 1))
    hit = np.flatnonzero((crosses & apart).any(axis=(1, 2)))
    return int(hit[0]) if hit.size else None


def _place_shapes(sketch: HullSketch, shapes: FloatArray, at: FloatArray, xs: FloatArray) -> FloatArray:
    return _placed(sketch, _blend(shapes, at, xs), xs)


def _placed(sketch: HullSketch, uv: FloatArray, xs: FloatArray) -> FloatArray:
    """(n, m, 2) half sections (y, z): blended shapes ``uv`` scaled to the sketch at xs."""
    return _place(uv, sketch.plan(xs), sketch.keel(xs), sketch.sheer(xs))


def _place(uv: FloatArray, plan: FloatArray, keel: FloatArray, sheer: FloatArray) -> FloatArray:
    """(n, m, 2) half sections (y, z): shapes ``uv`` scaled to the half-breadth ``plan``
    and placed between the ``keel`` and ``sheer`` heights, (n,) each."""
    b = np.maximum(plan, 0.0)[:, None]
    d = sheer - keel
    halves = np.empty(uv.shape)
    np.multiply(uv[:, :, 0], b, out=halves[:, :, 0])
    np.multiply(uv[:, :, 1], d[:, None], out=halves[:, :, 1])
    halves[:, :, 1] += keel[:, None]
    return halves


def half_sections_at(sketch: HullSketch, xs: FloatArray) -> FloatArray:
    """(n, m, 2) half sections (y, z) of a valid sketch at any positions ``xs`` (m).

    The same construction as :func:`generate_stations`, at chosen places (frames,
    station ticks); every section has the same m points, so chines are rows.
    """
    shapes = _sampled_shapes(sketch)
    at = np.array([sec.x for sec in sketch.sections])
    return _place_shapes(sketch, shapes, at, np.asarray(xs, dtype=float))


def scale_breadth(sketch: HullSketch, factor: float) -> HullSketch:
    """Copy of the sketch with every half-breadth multiplied by ``factor`` (> 0)."""
    if not factor > 0:
        raise ShapeError("the breadth scale must be positive")
    pts = tuple((x, b * factor) for x, b in sketch.plan.points)
    return replace(sketch, plan=replace(sketch.plan, points=pts))

