"""The hot path of :mod:`hydro.sections` (and Newton's step of :mod:`hydro.equilibrium`)
compiled with numba (optional).

Import this module only through :mod:`hydro.compiled`, which decides whether the
compiled kernels are used at all.  Importing it compiles the kernels for their one
signature each, or loads them from numba's cache (``cache=True``: beside this file in
``__pycache__``, else numba's user cache, or ``NUMBA_CACHE_DIR`` when set).

Each kernel does the arithmetic of the numpy reference in :mod:`hydro.sections` (or
:mod:`hydro.equilibrium`) in the same order, term by term, so the two agree to rounding;
the difference is that the
rotated heights eta are made station by station as they are needed, the crossing edges
are found by a scan along each section, and the sums are accumulated on the way, with
no (angles x stations x vertices) temporaries.
"""

from __future__ import annotations

import numba as nb
import numpy as np
from numpy.typing import NDArray

__all__ = ["heel_extremes", "cut_sums", "residual_sums", "newton_update", "FIELDS"]

FloatArray = NDArray[np.float64]

FIELDS = 6
"""Rows of :func:`cut_sums`' output: area, q_xi, q_eta, breadth, breadth_m1, breadth_m2."""

_FEW_ANGLES = 12
"""Below this many angles :func:`heel_extremes` runs angle by angle, else vertex by vertex."""


@nb.njit(
    nb.void(nb.f8[:, ::1], nb.f8[:, ::1], nb.f8[::1], nb.f8[::1], nb.f8[::1], nb.f8[::1]),
    cache=True, nogil=True, boundscheck=False,
)
def heel_extremes(
    y: FloatArray, z: FloatArray, cos: FloatArray, sin: FloatArray,
    low: FloatArray, high: FloatArray,
) -> None:  # pragma: no cover - compiled
    """Lowest and highest eta = z cos - y sin of all vertices, per angle, into low/high (A,).

    For many angles the innermost loop runs over the angles (it vectorises); for a few,
    over the vertices with the extremes held in registers.
    """
    n_angles = cos.size
    n_st, n_vert = y.shape
    if n_angles < _FEW_ANGLES:
        for a in range(n_angles):
            c = cos[a]
            s = sin[a]
            lo = np.inf
            hi = -np.inf
            for i in range(n_st):
                for k in range(n_vert):
                    e = c * z[i, k] - s * y[i, k]
                    if e < lo:
                        lo = e
                    if e > hi:
                        hi = e
            low[a] = lo
            high[a] = hi
        return
    for a in range(n_angles):
        low[a] = np.inf
        high[a] = -np.inf
    for i in range(n_st):
        for k in range(n_vert):
            yk = y[i, k]
            zk = z[i, k]
            for a in range(n_angles):
                e = cos[a] * zk - sin[a] * yk
                if e < low[a]:
                    low[a] = e
                if e > high[a]:
                    high[a] = e


@nb.njit(
    nb.void(
        nb.f8[:, ::1], nb.f8[:, ::1], nb.f8[:, :, ::1], nb.f8[:, :, ::1],
        nb.f8[::1], nb.f8[::1], nb.f8[:, ::1], nb.boolean, nb.f8[:, :, ::1],
    ),
    cache=True, nogil=True, boundscheck=False,
)
def cut_sums(
    y: FloatArray, z: FloatArray, prefix: FloatArray, totals: FloatArray,
    cos: FloatArray, sin: FloatArray, h: FloatArray, full: bool, out: FloatArray,
) -> None:  # pragma: no cover - compiled
    """Immersed area, moments and waterline breadth of every station, into ``out``.

    Parameters
    ----------
    y, z : (S, V) closed, padded station polygons (``SectionTable.y``, ``.z``)
    prefix : (3, S, V) body-frame prefix sums (``SectionTable.prefix``)
    totals : (3, A, S) whole sections in the heeled frame (``HeelFrame.totals``)
    cos, sin : (A,) of the heel angles
    h : (A, S) waterline heights
    full : if False, rows 1, 4 and 5 are left as they are
    out : (6, A, S) area, q_xi, q_eta, breadth, breadth_m1, breadth_m2
    """
    n_angles = cos.size
    n_st, n_vert = y.shape
    below = np.empty(n_vert, dtype=np.bool_)
    edges = np.empty(n_vert, dtype=np.intp)
    for a in range(n_angles):
        c = cos[a]
        s = sin[a]
        for i in range(n_st):
            hq = h[a, i]
            # one scan along the section: the edges whose ends lie on both sides of the
            # water, in order, and for each whether its first vertex is under water
            was = c * z[i, 0] - s * y[i, 0] < hq
            below[0] = was
            n_cross = 0
            for k in range(1, n_vert):
                now = c * z[i, k] - s * y[i, k] < hq
                if now != was:
                    edges[n_cross] = k - 1
                    below[k - 1] = was
                    n_cross += 1
                    was = now
            area = 0.0
            q_xi = 0.0
            q_eta = 0.0
            breadth = 0.0
            m1 = 0.0
            m2 = 0.0
            for n in range(n_cross):
                k = edges[n]
                e0 = c * z[i, k] - s * y[i, k]
                e1 = c * z[i, k + 1] - s * y[i, k + 1]
                xi0 = c * y[i, k] + s * z[i, k]
                xi1 = c * y[i, k + 1] + s * z[i, k + 1]
                xq = xi0 + (hq - e0) / (e1 - e0) * (xi1 - xi0)
                if below[k]:  # vertex k under water: the edge leaves the water
                    sign = 1.0
                    v_xi = xi0
                    v_eta = e0
                    j = k
                else:
                    sign = -1.0
                    v_xi = xi1
                    v_eta = e1
                    j = k + 1
                crossp = sign * (v_xi * hq - xq * v_eta)
                pre0 = prefix[0, i, j] * sign
                pre1 = prefix[1, i, j] * sign
                pre2 = prefix[2, i, j] * sign
                hx = hq * xq
                sx = sign * xq
                area += crossp / 2 + pre0 + hx * sign / 2
                q_eta += (v_eta + hq) * crossp / 6 + (c * pre2 - s * pre1) + sign * hq * hx / 3
                breadth += sx
                if full:
                    q_xi += (v_xi + xq) * crossp / 6 + (c * pre1 + s * pre2) + sx * hx / 6
                    m1 += sx * xq / 2
                    m2 += sx * xq * xq / 3
            first = 1.0 if below[0] else 0.0
            out[0, a, i] = area + first * totals[0, a, i]
            out[2, a, i] = q_eta + first * totals[2, a, i]
            out[3, a, i] = breadth
            if full:
                out[1, a, i] = q_xi + first * totals[1, a, i]
                out[4, a, i] = m1
                out[5, a, i] = m2


@nb.njit(
    nb.void(
        nb.f8[:, ::1], nb.f8[:, ::1], nb.f8[:, ::1], nb.f8[:, ::1], nb.f8[::1], nb.f8[:, ::1],
        nb.f8[:], nb.f8[:], nb.f8, nb.f8, nb.f8[:, ::1],
    ),
    cache=True, nogil=True, boundscheck=False,
)
def residual_sums(
    area: FloatArray, q_eta: FloatArray, breadth: FloatArray, hs: FloatArray, x: FloatArray,
    weights: FloatArray, eta_g: FloatArray, tau: FloatArray, volume: float, x_g: float,
    out: FloatArray,
) -> None:  # pragma: no cover - compiled
    """Volume and pitch residuals and their Jacobian per angle, as
    ``hydro.equilibrium._residual`` (the integrals along the hull summed station by
    station, so they agree with its matrix products to rounding), into ``out`` (6, A):
    f1, f2, j11, j12, j21, j22.

    ``area``, ``q_eta``, ``breadth``: the cut at waterline heights ``hs`` (A, S);
    ``weights`` (S, 2): those of f and of x f along the hull at stations ``x``."""
    n_angles, n_st = area.shape
    for a in range(n_angles):
        vol = 0.0
        vol_x = 0.0
        q = 0.0
        aw = 0.0
        aw_x = 0.0
        sx = 0.0
        bx_x = 0.0
        bh = 0.0
        bhx = 0.0
        for i in range(n_st):
            w = weights[i, 0]
            wx = weights[i, 1]
            b = breadth[a, i]
            bx = b * x[i]
            bhi = b * hs[a, i]
            vol += area[a, i] * w
            vol_x += area[a, i] * wx
            q += q_eta[a, i] * w
            aw += b * w
            aw_x += b * wx
            sx += bx * w
            bx_x += bx * wx
            bh += bhi * w
            bhx += bhi * x[i] * w
        moment = q - eta_g[a] * vol
        out[0, a] = vol - volume
        out[1, a] = vol_x - x_g * vol + tau[a] * moment
        out[2, a] = aw
        out[3, a] = sx
        out[4, a] = aw_x - x_g * aw + tau[a] * (bh - eta_g[a] * aw)
        out[5, a] = bx_x - x_g * sx + moment + tau[a] * (bhx - eta_g[a] * sx)


@nb.njit(
    nb.void(
        nb.f8[:], nb.f8[:], nb.f8[:], nb.f8[:], nb.f8[:], nb.f8[:], nb.f8[:], nb.f8[:],
        nb.f8, nb.f8, nb.f8, nb.f8, nb.f8, nb.f8,
        nb.f8[::1], nb.f8[::1], nb.boolean[::1], nb.boolean[::1],
    ),
    cache=True, nogil=True, boundscheck=False, error_model="numpy",
)
def newton_update(
    f1: FloatArray, f2: FloatArray, j11: FloatArray, j12: FloatArray, j21: FloatArray,
    j22: FloatArray, h: FloatArray, tau: FloatArray,
    tol_v: float, tol_m: float, max_dh: float, max_dtau: float, small: float, length: float,
    h_out: FloatArray, tau_out: FloatArray, move: NDArray[np.bool_], keep: NDArray[np.bool_],
) -> None:  # pragma: no cover - compiled
    """One Newton step on (h, tau) per angle, as ``hydro.equilibrium._newton_update``:
    residuals f1, f2 and their Jacobian j at (h, tau); into h_out, tau_out the new point,
    into ``move`` whether the angle moved, into ``keep`` whether it moved by more than
    ``small`` (in h, and in tau times ``length``)."""
    for i in range(f1.size):
        settled = abs(f1[i]) <= tol_v and abs(f2[i]) <= tol_m
        det = j11[i] * j22[i] - j12[i] * j21[i]
        good = j11[i] > 0 and abs(det) > 1e-14 * abs(j11[i] * j22[i])
        safe = det if good else 1.0
        dh = (-f1[i] * j22[i] + f2[i] * j12[i]) / safe
        dh = -max_dh if dh < -max_dh else dh
        dh = max_dh if dh > max_dh else dh
        dtau = (f1[i] * j21[i] - f2[i] * j11[i]) / safe
        dtau = -max_dtau if dtau < -max_dtau else dtau
        dtau = max_dtau if dtau > max_dtau else dtau
        moves = good and not settled
        h_out[i] = h[i] + dh if moves else h[i]
        tau_out[i] = tau[i] + dtau if moves else tau[i]
        move[i] = moves
        keep[i] = moves and not (abs(dh) <= small and abs(dtau) * length <= small)
