"""Interpolation of the sketch curves: polylines and shape-preserving cubics.

Smooth curves use the monotone piecewise cubic of Fritsch & Carlson (1980): it never
overshoots its control points, so a non-negative half-breadth stays non-negative and a
section never bulges past its neighbouring points.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike, NDArray

__all__ = ["pchip_slopes", "interpolate", "sample_polyline"]

FloatArray = NDArray[np.float64]


def pchip_slopes(t: FloatArray, v: FloatArray) -> FloatArray:
    """Fritsch-Carlson slopes at the knots ``t`` (strictly increasing) of values ``v``.

    A curve has a handful of control points, so the slopes are worked out on plain
    floats (numpy's per-call overhead would be most of the cost).

    Parameters
    ----------
    t, v : (n,) arrays

    Returns
    -------
    (n,) array of derivatives dv/dt at the knots.
    """
    n = len(t)
    if n < 2:
        return np.zeros(n)
    tl, vl = np.asarray(t, dtype=float).tolist(), np.asarray(v, dtype=float).tolist()
    h = [b - a for a, b in zip(tl, tl[1:])]
    delta = [(b - a) / hk for a, b, hk in zip(vl, vl[1:], h)]
    if n == 2:
        return np.array([delta[0], delta[0]])
    d = [0.0] * n
    for k in range(1, n - 1):
        m0, m1 = delta[k - 1], delta[k]
        if m0 * m1 > 0:  # same sign: the weighted harmonic mean
            w1 = 2 * h[k] + h[k - 1]
            w2 = h[k] + 2 * h[k - 1]
            d[k] = (w1 + w2) / (w1 / m0 + w2 / m1)
    d[0] = _end_slope(h[0], h[1], delta[0], delta[1])
    d[-1] = _end_slope(h[-1], h[-2], delta[-1], delta[-2])
    return np.array(d)


def _sign(value: float) -> int:
    return (value > 0) - (value < 0)


def _end_slope(h0: float, h1: float, m0: float, m1: float) -> float:
    d = ((2 * h0 + h1) * m0 - h0 * m1) / (h0 + h1)
    if _sign(d) != _sign(m0):
        return 0.0
    if _sign(m0) != _sign(m1) and abs(d) > abs(3 * m0):
        return 3 * m0
    return float(d)


def interpolate(knots: ArrayLike, values: ArrayLike, where: ArrayLike, smooth: bool) -> FloatArray:
    """Evaluate the curve through ``knots`` (with ``values``) at ``where``; linear or
    monotone cubic.

    Outside the knot range the end values are held.

    Examples
    --------
    >>> interpolate([0.0, 1.0, 2.0], [0.0, 1.0, 1.0], [0.5, 1.5], smooth=False)
    array([0.5, 1. ])
    """
    t = np.asarray(knots, dtype=float)
    v = np.asarray(values, dtype=float)
    at = np.minimum(np.maximum(np.asarray(where, dtype=float), t[0]), t[-1])
    if not smooth or t.size < 3:
        return np.interp(at, t, v)
    d = pchip_slopes(t, v)
    i = np.searchsorted(t, at, side="right") - 1
    np.minimum(np.maximum(i, 0, out=i), t.size - 2, out=i)
    t0 = t[i]
    h = t[i + 1] - t0
    s = (at - t0) / h
    r = 1 - s
    h00 = (1 + 2 * s) * r**2
    h10 = s * r**2
    h01 = s * s * (3 - 2 * s)
    h11 = s * s * (s - 1)
    return h00 * v[i] + h10 * h * d[i] + h01 * v[i + 1] + h11 * h * d[i + 1]


def sample_polyline(points: FloatArray, smooth: bool, per_segment: int) -> FloatArray:
    """Sample a parametric curve through ``points`` ((n, 2) array).

    A polyline (``smooth=False``) returns its own vertices, so hard chines stay exact.
    A smooth curve is a monotone cubic in each coordinate over the chord-length
    parameter, sampled ``per_segment`` times per span; control points are kept.

    Returns
    -------
    (k, 2) array, first and last rows equal to the first and last control points.
    """
    pts = np.asarray(points, dtype=float)
    if not smooth or len(pts) < 3:
        return pts.copy()
    seg = np.hypot(*np.diff(pts, axis=0).T)
    t = np.concatenate([[0.0], np.cumsum(np.maximum(seg, 1e-12))])
    frac = np.linspace(0.0, 1.0, per_segment + 1)[:-1]
    at = np.concatenate([t[:-1, None] + frac[None, :] * np.diff(t)[:, None]]).ravel()
    at = np.append(at, t[-1])
    return np.column_stack(
        [interpolate(t, pts[:, 0], at, True), interpolate(t, pts[:, 1], at, True)]
    )
