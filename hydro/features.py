"""Crossings and the maximum of a sampled curve, refined on an exact evaluator.

The righting-arm curve is solved at a grid of heel angles; its features (where GZ or
the low-side freeboard crosses zero, where GZ is largest) lie between grid angles.
Each feature starts from the grid samples around it.  A round proposes one to three
angles per unfinished feature, the caller's evaluator solves all of them in one call
(so the solver runs vectorised) and the new samples join that feature's own:

* a crossing: the polynomial through the bracket's ends and their outer neighbours
  (a cubic from four samples) estimates it; the evaluator is asked at the estimate
  +/- ``ROOT_TOL_DEG``, so a good estimate shrinks the bracket to twice that in one
  round (a kink in the curve, where a chine or the gunwale meets the water, may take a
  few more).  The crossing is then interpolated linearly in the bracket: over 0.02
  degrees the error is far below the solver's own.
* a maximum: the cubic through the grid samples nearest the best one estimates it,
  and the evaluator is asked at points around the estimate (``PEAK_PATTERN``); then
  successive parabolic interpolation (a parabola through the best sample and its
  neighbours, points around its vertex) until the best sample's neighbours are that
  close: the vertex of their parabola is the answer (angle and value).  A maximum at an end of its
  range (the curve still rising at the last angle) is that end's sample.

The answer depends on the grid only through the starting estimates, so a coarse grid
(during a drag) and the fine one give the same features to well within 0.01 degree.
"""

from __future__ import annotations

import bisect
import math
from dataclasses import dataclass, field
from typing import Callable

import numpy as np
from numpy.typing import NDArray

__all__ = ["Crossing", "Peak", "refine"]

FloatArray = NDArray[np.float64]

#: Half-width (degrees) of the points placed around a crossing's estimate.
ROOT_TOL_DEG = 0.01
#: Spacing (degrees) of the points placed around a maximum's estimate.
PEAK_TOL_DEG = 0.05
#: Where a round asks about a maximum, in steps of PEAK_TOL_DEG around the estimate:
#: close by (a good estimate ends there), and further out in doubling steps, so a poor
#: estimate (a kink in the curve near the top) is bracketed closely in the next round.
PEAK_PATTERN = (0, -1, 1, -2, 2, -4, 4, -8, 8, -16, 16)
#: Rounds of evaluation at most (each is one call of the evaluator).
MAX_ROUNDS = 8


@dataclass
class _Samples:
    """Angles (ascending) and values of one feature's function."""

    angle: list[float] = field(default_factory=list)
    value: list[float] = field(default_factory=list)

    def add(self, angles: FloatArray, values: FloatArray) -> None:
        """Insert the samples in order, skipping any within 1e-9 degree of one held."""
        for a, v in zip(angles.tolist(), values.tolist()):
            k = bisect.bisect(self.angle, a)
            if (k > 0 and a - self.angle[k - 1] <= 1e-9) or (
                k < len(self.angle) and self.angle[k] - a <= 1e-9
            ):
                continue
            self.angle.insert(k, a)
            self.value.insert(k, v)

    def finite(self) -> tuple[list[float], list[float]]:
        """The samples with a finite value (the evaluator gives NaN where unsolved)."""
        pairs = [(a, v) for a, v in zip(self.angle, self.value) if math.isfinite(v)]
        return [a for a, _ in pairs], [v for _, v in pairs]


@dataclass
class _Feature:
    """One feature of the ``series``-th output of the evaluator, between ``lo`` and
    ``hi``, starting from the grid samples ``angles``, ``values``."""

    series: int
    lo: float
    hi: float
    angles: FloatArray
    values: FloatArray
    samples: _Samples = field(default_factory=_Samples, init=False)
    done: bool = field(default=False, init=False)

    def __post_init__(self) -> None:
        self.samples.add(self.angles, self.values)


@dataclass
class Crossing(_Feature):
    """A zero crossing: ``lo``, ``hi`` is the grid bracket; ``rising``: the function
    goes from < 0 to >= 0 (else from > 0 to <= 0)."""

    rising: bool

    def _bracket(self) -> tuple[int, list[float], list[float]] | None:
        """Index i of the first crossing between samples i and i + 1 inside the grid
        bracket, with the finite samples."""
        a, v = self.samples.finite()
        for i in range(len(a) - 1):
            if a[i] < self.lo - 1e-12 or a[i + 1] > self.hi + 1e-12:
                continue
            if (v[i] < 0 <= v[i + 1]) if self.rising else (v[i] > 0 >= v[i + 1]):
                return i, a, v
        return None

    def propose(self) -> list[float]:
        found = self._bracket()
        if found is None:
            self.done = True
            return []
        i, a, v = found
        lo, hi = a[i], a[i + 1]
        if hi - lo <= 2 * ROOT_TOL_DEG + 1e-9:
            self.done = True
            return []
        near = slice(max(i - 1, 0), min(i + 3, len(a)))
        guess = _poly_root(a[near], v[near], lo, hi)
        wanted = [g for g in (guess - ROOT_TOL_DEG, guess + ROOT_TOL_DEG) if lo < g < hi]
        new = [g for g in wanted if all(abs(g - b) > 1e-9 for b in self.samples.angle)]
        if not new:
            self.done = True
        return new

    def answer(self) -> float:
        found = self._bracket()
        if found is None:  # unsolved samples inside: the grid bracket's middle
            return 0.5 * (self.lo + self.hi)
        i, a, v = found
        return a[i] + (a[i + 1] - a[i]) * v[i] / (v[i] - v[i + 1])


@dataclass
class Peak(_Feature):
    """The largest value between ``lo`` and ``hi`` (a local maximum); ``angles``,
    ``values``: the grid samples around the grid's best one."""

    def _around_best(self) -> tuple[list[float], list[float]] | None:
        """The best sample in the range with its two neighbours (alone at an end)."""
        a, v = self.samples.finite()
        inside = [k for k in range(len(a)) if self.lo - 1e-12 <= a[k] <= self.hi + 1e-12]
        if not inside:
            return None
        a, v = [a[k] for k in inside], [v[k] for k in inside]
        b = max(range(len(v)), key=v.__getitem__)
        if b == 0 or b == len(a) - 1:  # largest at an end of the range
            return a[b : b + 1], v[b : b + 1]
        return a[b - 1 : b + 2], v[b - 1 : b + 2]

    def propose(self) -> list[float]:
        three = self._around_best()
        if three is None or len(three[0]) == 1:
            self.done = True
            return []
        a, _ = three
        if a[2] - a[0] <= 2 * PEAK_TOL_DEG + 1e-9:
            self.done = True
            return []
        if len(self.samples.angle) == len(self.angles):  # the first round: the grid only
            vertex = _poly_top(*self.samples.finite(), a[0], a[2])
        else:
            vertex = _parabola_top(*three)[0]
        step = min(PEAK_TOL_DEG, (a[2] - a[0]) / 4)
        wanted = [vertex + k * step for k in PEAK_PATTERN]
        new = [
            g for g in wanted
            if a[0] < g < a[2] and all(abs(g - b) > 1e-9 for b in self.samples.angle)
        ]
        if not new:
            self.done = True
        return new

    def answer(self) -> tuple[float, float] | None:
        three = self._around_best()
        if three is None:
            return None
        if len(three[0]) == 1:
            return three[0][0], three[1][0]
        return _parabola_top(*three)


def _interpolant(xs: list[float], values: list[float]) -> Callable[[float], float]:
    """The polynomial through the samples (Newton's divided differences), as a function."""
    c = list(values)
    n = len(xs)
    for j in range(1, n):
        for i in range(n - 1, j - 1, -1):
            c[i] = (c[i] - c[i - 1]) / (xs[i] - xs[i - j])

    def p(x: float) -> float:
        y = c[-1]
        for i in range(n - 2, -1, -1):
            y = y * (x - xs[i]) + c[i]
        return y

    return p


def _poly_root(a: list[float], v: list[float], lo: float, hi: float) -> float:
    """Zero in [lo, hi] of the polynomial through the samples (lo and hi among them,
    with values of opposite sign), by the Illinois method."""
    p = _interpolant(a, v)
    f_lo, f_hi = p(lo), p(hi)
    x = lo
    for _ in range(60):
        last, x = x, hi - f_hi * (hi - lo) / (f_hi - f_lo)
        f = p(x)
        if f == 0.0 or abs(x - last) < 1e-9:
            break
        if (f > 0) == (f_hi > 0):
            hi, f_hi = x, f
            f_lo *= 0.5
        else:
            lo, f_lo = x, f
            f_hi *= 0.5
    return x


def _poly_top(a: list[float], v: list[float], lo: float, hi: float) -> float:
    """Angle of the largest value in [lo, hi] of the cubic through the four samples
    nearest its middle, by golden-section search."""
    mid = 0.5 * (lo + hi)
    near = sorted(sorted(range(len(a)), key=lambda k: abs(a[k] - mid))[:4])
    p = _interpolant([a[k] for k in near], [v[k] for k in near])
    ratio = 0.5 * (math.sqrt(5.0) - 1.0)
    x1, x2 = hi - ratio * (hi - lo), lo + ratio * (hi - lo)
    f1, f2 = p(x1), p(x2)
    while hi - lo > 1e-6:
        if f1 < f2:
            lo, x1, f1 = x1, x2, f2
            x2 = lo + ratio * (hi - lo)
            f2 = p(x2)
        else:
            hi, x2, f2 = x2, x1, f1
            x1 = hi - ratio * (hi - lo)
            f1 = p(x1)
    return 0.5 * (lo + hi)


def _parabola_top(a: list[float], v: list[float]) -> tuple[float, float]:
    """Vertex (angle, value) of the parabola through three samples, kept between the
    outer two; the middle sample when the three are not concave."""
    (a0, a1, a2), (v0, v1, v2) = a, v
    d0, d2 = a1 - a0, a1 - a2
    den = d0 * (v1 - v2) - d2 * (v1 - v0)
    if not den > 0 and not den < 0:
        return a1, v1
    x = a1 - 0.5 * (d0 * d0 * (v1 - v2) - d2 * d2 * (v1 - v0)) / den
    curvature = 2 * ((v2 - v1) / (a2 - a1) - (v1 - v0) / (a1 - a0)) / (a2 - a0)
    if not curvature < 0 or not a0 < x < a2:
        return a1, v1
    slope = (v2 - v0) / (a2 - a0) - 0.5 * curvature * (a0 + a2 - 2 * a1)
    top = v1 + slope * (x - a1) + 0.5 * curvature * (x - a1) ** 2
    return float(x), float(max(top, v1))


def refine(
    evaluate: Callable[[FloatArray], tuple[FloatArray, ...]],
    features: dict[str, Crossing | Peak],
) -> dict[str, float | tuple[float, float] | None]:
    """Refine every feature; ``evaluate(angles)`` returns one array per series.

    Returns each crossing's angle and each maximum's (angle, value) (None when the
    maximum has no finite sample).

    >>> f = lambda a: (np.sin(np.radians(2 * a)) - 0.6,)
    >>> grid = np.arange(0.0, 91.0, 5.0)
    >>> g = f(grid)[0]
    >>> x = refine(f, {"up": Crossing(0, 15.0, 20.0, grid[2:6], g[2:6], rising=True),
    ...                "top": Peak(0, 0.0, 90.0, grid[8:11], g[8:11])})
    >>> round(x["up"], 5), round(float(np.degrees(np.arcsin(0.6))) / 2, 5)
    (18.43495, 18.43495)
    >>> [round(t, 6) for t in x["top"]]
    [45.0, 0.4]
    """
    for _ in range(MAX_ROUNDS):
        wanted = {k: f.propose() for k, f in features.items() if not f.done}
        wanted = {k: w for k, w in wanted.items() if w}
        if not wanted:
            break
        angles = np.array([g for w in wanted.values() for g in w])
        outputs = evaluate(angles)
        at = 0
        for k, w in wanted.items():
            f = features[k]
            f.samples.add(angles[at : at + len(w)], outputs[f.series][at : at + len(w)])
            at += len(w)
    return {k: f.answer() for k, f in features.items()}
