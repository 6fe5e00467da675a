"""Floating equilibrium: waterline height and trim for a set of heel angles at once.

The water plane in the body frame is ``eta - tau * x = h``, so at station x_s the
section is cut at ``h_s = h + tau * x_s``.  ``tau`` is the trim slope (positive = bow
down).  Two conditions fix (h, tau) at each heel angle:

* volume:  V(h, tau) = Delta / rho
* no pitch moment: B and G on one vertical in the longitudinal plane, which for this
  plane reads  (x_B - x_G) + tau * (eta_B - eta_G) = 0.

Both are solved by Newton's method with the exact Jacobian from the waterline breadths
(d area / dh = breadth), vectorised over all angles; steps are limited so the waterline
never leaves the hull.  At fixed trim only the volume condition is used.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

from hydro.sections import Cut, HeelFrame, SectionTable, cut

__all__ = ["Equilibrium", "solve_equilibrium", "level_waterline"]

FloatArray = NDArray[np.float64]

#: Relative tolerance on volume and on the pitch-moment balance.
TOLERANCE = 1e-10
MAX_ITERATIONS = 60


@dataclass(frozen=True, eq=False)
class Equilibrium:
    """Solved waterlines for A heel angles.

    Attributes
    ----------
    h : (A,) waterline height at x = 0 in the heeled frame (m)
    tau : (A,) trim slope (dimensionless, positive = bow down)
    volume : (A,) immersed volume (m^3)
    x_b, xi_b, eta_b : (A,) centre of buoyancy (m): along x, and in the heeled frame
    waterplane : (A,) waterplane area projected on the body x-y plane (m^2)
    cut : Cut at the solution, per station
    converged : (A,) bool
    """

    h: FloatArray
    tau: FloatArray
    volume: FloatArray
    x_b: FloatArray
    xi_b: FloatArray
    eta_b: FloatArray
    waterplane: FloatArray
    cut: Cut
    converged: FloatArray


def level_waterline(table: SectionTable, frame: HeelFrame, volume: float) -> FloatArray:
    """Waterline height h at zero trim giving ``volume``, for each angle.

    Newton's method on the monotone volume curve, falling back to bisection whenever a
    step would leave the bracket.  Returns (A,) heights, NaN where even the whole closed
    hull displaces less than ``volume``.
    """
    lo = frame.eta_low.copy()
    hi = frame.eta_high.copy()
    n_st = table.x.size
    full = table.totals[0] @ table.weights
    h = lo + (hi - lo) * 0.5
    tol = TOLERANCE * volume
    for _ in range(MAX_ITERATIONS):
        c = cut(table, frame, np.repeat(h[:, None], n_st, axis=1), full=False)
        f = c.area @ table.weights - volume
        if np.all(np.abs(f) <= tol):
            break
        hi = np.where(f > 0, h, hi)
        lo = np.where(f > 0, lo, h)
        slope = c.breadth @ table.weights
        step = h - f / np.where(slope > 0, slope, 1.0)
        inside = (slope > 0) & (step > lo) & (step < hi)
        h = np.where(inside, step, 0.5 * (lo + hi))
    return np.where(full >= volume, h, np.nan)


def solve_equilibrium(
    table: SectionTable,
    frame: HeelFrame,
    volume: float,
    x_g: float,
    eta_g: FloatArray,
    h0: FloatArray,
    tau0: FloatArray,
    free_trim: bool = True,
) -> Equilibrium:
    """Solve volume (and, with ``free_trim``, pitch) equilibrium at every heel angle.

    Parameters
    ----------
    table, frame : the hull and its rotated vertices for A angles
    volume : displaced volume wanted (m^3)
    x_g : longitudinal centre of gravity (m)
    eta_g : (A,) height of G in each heeled frame (m)
    h0, tau0 : (A,) starting waterline height and trim slope
    free_trim : solve for trim as well; otherwise keep ``tau0``
    """
    x = table.x
    w = table.weights
    wx = table.weights_x
    h = np.array(h0, dtype=float)
    tau = np.array(tau0, dtype=float)
    span = float(np.max(frame.eta_high - frame.eta_low))
    length = float(x[-1] - x[0])
    max_dh = 0.25 * span
    max_dtau = 0.25 * span / length
    tol_v = TOLERANCE * volume
    tol_m = TOLERANCE * volume * length
    converged = np.zeros(h.size, dtype=bool)
    for _ in range(MAX_ITERATIONS):
        hs = h[:, None] + tau[:, None] * x[None, :]
        c = cut(table, frame, hs, full=False)
        vol = c.area @ w
        aw = c.breadth @ w
        f1 = vol - volume
        if free_trim:
            q_eta = c.q_eta @ w
            m_x = c.area @ wx
            f2 = m_x - x_g * vol + tau * (q_eta - eta_g * vol)
            converged = (np.abs(f1) <= tol_v) & (np.abs(f2) <= tol_m)
        else:
            converged = np.abs(f1) <= tol_v
        if converged.all():
            break
        dry = aw <= 1e-12 * length  # waterline outside the hull: walk back in
        if free_trim:
            bx = c.breadth * x
            sx = bx @ w
            bh = c.breadth * hs
            j11, j12 = aw, sx
            j21 = c.breadth @ wx - x_g * aw + tau * (bh @ w - eta_g * aw)
            j22 = (
                bx @ wx
                - x_g * sx
                + (q_eta - eta_g * vol)
                + tau * ((bh * x) @ w - eta_g * sx)
            )
            det = j11 * j22 - j12 * j21
            ok = np.abs(det) > 1e-14 * np.maximum(np.abs(j11 * j22), 1e-300)
            safe = np.where(ok, det, 1.0)
            dh = np.where(ok, (-f1 * j22 + f2 * j12) / safe, -f1 / np.where(dry, 1.0, aw))
            dtau = np.where(ok, (f1 * j21 - f2 * j11) / safe, 0.0)
        else:
            dh = -f1 / np.where(dry, 1.0, aw)
            dtau = np.zeros_like(dh)
        dh = np.where(dry, np.where(f1 < 0, max_dh, -max_dh), dh)
        dtau = np.where(dry, 0.0, dtau)
        dh = np.clip(dh, -max_dh, max_dh)
        dtau = np.clip(dtau, -max_dtau, max_dtau)
        h = np.where(converged, h, h + dh)
        tau = np.where(converged, tau, tau + dtau)
    hs = h[:, None] + tau[:, None] * x[None, :]
    c = cut(table, frame, hs)
    vol = c.area @ w
    if not converged.all():  # the loop ran out: judge the final point itself
        f1 = np.abs(vol - volume) <= tol_v
        if free_trim:
            f2 = c.area @ wx - x_g * vol + tau * (c.q_eta @ w - eta_g * vol)
            converged = f1 & (np.abs(f2) <= tol_m)
        else:
            converged = f1
    safe_vol = np.where(vol > 0, vol, 1.0)
    return Equilibrium(
        h=h,
        tau=tau,
        volume=vol,
        x_b=(c.area @ wx) / safe_vol,
        xi_b=(c.q_xi @ w) / safe_vol,
        eta_b=(c.q_eta @ w) / safe_vol,
        waterplane=c.breadth @ w,
        cut=c,
        converged=converged,
    )
