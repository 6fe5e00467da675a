"""Floating equilibrium: waterline height and trim for a set of heel angles at once.

The water plane in the body frame is ``eta - tau * x = h``, so at station x_s the
section is cut at ``h_s = h + tau * x_s``.  ``tau`` is the trim slope (positive = bow
down).  Two conditions fix (h, tau) at each heel angle:

* volume:  V(h, tau) = Delta / rho
* no pitch moment: B and G on one vertical in the longitudinal plane, which for this
  plane reads  F(h, tau) = (x_B - x_G) V + tau (eta_B - eta_G) V = 0.

Fast path: Newton's method on both unknowns with the exact Jacobian from the waterline
breadths (d area / dh = breadth), vectorised over all angles.  Angles where it has not
converged after a few steps are solved by a safeguarded path: trim is bracketed and
found by Newton-or-bisection, and for every trial trim the waterline height is solved
exactly (volume is monotone in h), so the volume condition always holds.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

from hydro import compiled
from hydro.sections import Cut, HeelFrame, SectionTable, cut

__all__ = ["Equilibrium", "solve_equilibrium", "level_waterline", "follow_branch", "heel_neighbours"]

FloatArray = NDArray[np.float64]

#: Relative tolerance on volume and on the pitch-moment balance.
TOLERANCE = 1e-10
#: Joint Newton steps before the safeguarded path takes over.
FAST_ITERATIONS = 8
MAX_ITERATIONS = 60
#: A Newton step smaller than this fraction of the hull's size ends the fast path.
STEP_DONE = 1e-6
#: A heel's solution continues its neighbour's when one Newton step from the neighbour
#: lands nearer to it than this fraction of the step (Newton converges there).
CONTINUITY = 0.5


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
    converged : (A,) bool; False where no floating position was found
    """

    h: FloatArray
    tau: FloatArray
    volume: FloatArray
    x_b: FloatArray
    xi_b: FloatArray
    eta_b: FloatArray
    waterplane: FloatArray
    cut: Cut
    converged: NDArray[np.bool_]


def _levels(table: SectionTable, h: FloatArray, tau: FloatArray) -> FloatArray:
    return h[:, None] + tau[:, None] * table.x[None, :]


def waterline_for_trim(
    table: SectionTable, frame: HeelFrame, volume: float, tau: FloatArray, h_start: FloatArray
) -> tuple[FloatArray, NDArray[np.bool_]]:
    """Waterline height h giving ``volume`` at the trim slopes ``tau``, for each angle.

    Newton's method on the monotone volume curve, falling back to bisection whenever a
    step would leave the bracket.  Returns (h, converged); not converged where even the
    whole closed hull displaces less than ``volume``.
    """
    x = table.x
    lo = frame.eta_low - np.maximum(tau * x[0], tau * x[-1])
    hi = frame.eta_high - np.minimum(tau * x[0], tau * x[-1])
    h = np.where((h_start > lo) & (h_start < hi), h_start, 0.5 * (lo + hi))
    tol = TOLERANCE * volume
    full = table.totals[0] @ table.weights
    ok = np.zeros(h.size, dtype=bool)
    for _ in range(MAX_ITERATIONS):
        c = cut(table, frame, _levels(table, h, tau), full=False)
        f = c.area @ table.weights - volume
        ok = np.abs(f) <= tol
        if ok.all():
            break
        hi = np.where(f > 0, h, hi)
        lo = np.where(f > 0, lo, h)
        slope = c.breadth @ table.weights
        step = h - f / np.where(slope > 0, slope, 1.0)
        inside = (slope > 0) & (step > lo) & (step < hi)
        h = np.where(ok, h, np.where(inside, step, 0.5 * (lo + hi)))
    return h, ok & (full >= volume)


def level_waterline(table: SectionTable, frame: HeelFrame, volume: float) -> FloatArray:
    """Waterline height at zero trim giving ``volume`` (NaN where the hull cannot)."""
    zero = np.zeros(frame.phi.size)
    h, ok = waterline_for_trim(table, frame, volume, zero, 0.5 * (frame.eta_low + frame.eta_high))
    return np.where(ok, h, np.nan)


@dataclass(frozen=True, eq=False)
class _Residual:
    """Volume and pitch residuals with their Jacobian at (h, tau)."""

    f1: FloatArray
    f2: FloatArray
    j11: FloatArray
    j12: FloatArray
    j21: FloatArray
    j22: FloatArray
    cut: Cut


#: The fields of a :class:`Cut`.
CUT_FIELDS = ("area", "q_xi", "q_eta", "breadth", "breadth_m1", "breadth_m2")


def _residual(
    table: SectionTable, frame: HeelFrame, volume: float, x_g: float, eta_g: FloatArray,
    h: FloatArray, tau: FloatArray, full: bool = False,
) -> _Residual:
    """The residuals and their Jacobian, with the cut they come from (every field if
    ``full``)."""
    hs = _levels(table, h, tau)
    c = cut(table, frame, hs, full=full)
    kernels = compiled.kernels()
    if kernels is not None:  # the same sums, station by station
        out = np.empty((6, h.size))
        kernels.residual_sums(
            c.area, c.q_eta, c.breadth, hs, table.x, table.weight_pair, eta_g, tau, volume,
            x_g, out,
        )
        f1, f2, j11, j12, j21, j22 = out
        return _Residual(f1, f2, j11, j12, j21, j22, c)
    # every integral along the hull in one product: of the area, q_eta, breadth,
    # breadth x, breadth hs and breadth hs x, against the weights of f and of x f
    parts = np.empty((6,) + hs.shape)
    parts[0], parts[1], parts[2] = c.area, c.q_eta, c.breadth
    np.multiply(c.breadth, table.x, out=parts[3])
    np.multiply(c.breadth, hs, out=parts[4])
    np.multiply(parts[4], table.x, out=parts[5])
    sums = np.matmul(parts, table.weight_pair).transpose(0, 2, 1)
    (vol, vol_x), (q_eta, _), (aw, aw_x), (sx, bx_x), (bh, _), (bhx, _) = sums
    moment = q_eta - eta_g * vol
    return _Residual(
        f1=vol - volume,
        f2=vol_x - x_g * vol + tau * moment,
        j11=aw,
        j12=sx,
        j21=aw_x - x_g * aw + tau * (bh - eta_g * aw),
        j22=bx_x - x_g * sx + moment + tau * (bhx - eta_g * sx),
        cut=c,
    )


def _joint_newton(
    table: SectionTable, frame: HeelFrame, volume: float, x_g: float, eta_g: FloatArray,
    h: FloatArray, tau: FloatArray, iterations: int,
) -> tuple[FloatArray, FloatArray, Cut]:
    """Newton steps on (h, tau) for every angle still moving; the set shrinks as they settle.

    An angle leaves when its residual is within tolerance, when its last step was tiny
    (quadratic convergence puts it far inside; the caller verifies), or when its
    Jacobian is singular (the waterline left the hull; the caller's safe path takes it).
    Returns h, tau and the cut there (every field): an angle that did not move after its
    last evaluation keeps that evaluation's cut, the others are cut again.
    """
    h, tau = h.copy(), tau.copy()
    length = float(table.x[-1] - table.x[0])
    span = float(np.max(frame.eta_high - frame.eta_low))
    max_dh, max_dtau = 0.25 * span, 0.25 * span / length
    tol_v, tol_m = TOLERANCE * volume, TOLERANCE * volume * length
    limits = (tol_v, tol_m, max_dh, max_dtau, STEP_DONE * span, length)
    active: NDArray[np.intp] | slice = slice(None)  # every angle, until the set shrinks
    sub = frame
    at: Cut | None = None  # the cut of every angle at its last evaluation
    current = np.zeros(h.size, dtype=bool)  # not moved since
    for _ in range(iterations):
        ha, ta = h[active], tau[active]
        r = _residual(table, sub, volume, x_g, eta_g[active], ha, ta, full=True)
        h[active], tau[active], move, keep = _newton_update(r, ha, ta, limits)
        if at is None or isinstance(active, slice):  # every angle evaluated
            at, current = r.cut, ~move
        else:
            _put(at, active, r.cut)
            current[active] = ~move
        if not keep.any():
            break
        if keep.sum() <= 0.5 * keep.size:  # copying the rotated vertices pays off
            active = np.flatnonzero(keep) if isinstance(active, slice) else active[keep]
            sub = frame.take(active)
    if at is None:  # no iteration at all
        return h, tau, cut(table, frame, _levels(table, h, tau))
    stale = np.flatnonzero(~current)
    if stale.size:
        _put(at, stale, cut(table, frame.take(stale), _levels(table, h[stale], tau[stale])))
    return h, tau, at


def _newton_update(
    r: _Residual, h: FloatArray, tau: FloatArray, limits: tuple[float, ...]
) -> tuple[FloatArray, FloatArray, NDArray[np.bool_], NDArray[np.bool_]]:
    """One Newton step on (h, tau) for every angle, each component clipped.

    ``limits``: the tolerances on volume and pitch (an angle within both stays), the
    largest steps in h and tau, the step that counts as tiny, the hull's length.  Returns
    the new h and tau (unchanged where settled or the Jacobian is singular), which angles
    moved, and which moved by more than a tiny step (in h, and in tau times the length).
    Runs the compiled kernel when :mod:`hydro.compiled` has it ready (the same arithmetic).
    """
    kernels = compiled.kernels()
    if kernels is not None:
        out = np.empty((2, h.size))
        move, keep = np.empty(h.size, dtype=bool), np.empty(h.size, dtype=bool)
        kernels.newton_update(
            r.f1, r.f2, r.j11, r.j12, r.j21, r.j22, h, tau, *limits, out[0], out[1], move, keep
        )
        return out[0], out[1], move, keep
    tol_v, tol_m, max_dh, max_dtau, small, length = limits
    settled = (np.abs(r.f1) <= tol_v) & (np.abs(r.f2) <= tol_m)
    det = r.j11 * r.j22 - r.j12 * r.j21
    good = (r.j11 > 0) & (np.abs(det) > 1e-14 * np.abs(r.j11 * r.j22))
    safe = np.where(good, det, 1.0)
    dh = np.minimum(np.maximum((-r.f1 * r.j22 + r.f2 * r.j12) / safe, -max_dh), max_dh)
    dtau = np.minimum(np.maximum((r.f1 * r.j21 - r.f2 * r.j11) / safe, -max_dtau), max_dtau)
    move = good & ~settled
    tiny = (np.abs(dh) <= small) & (np.abs(dtau) * length <= small)
    return np.where(move, h + dh, h), np.where(move, tau + dtau, tau), move, move & ~tiny


def _put(into: Cut, idx: NDArray[np.intp], part: Cut) -> None:
    """Write the cut of some angles into the cut of all of them."""
    for name in CUT_FIELDS:
        getattr(into, name)[idx] = getattr(part, name)


def _bracketed_trim(
    table: SectionTable, frame: HeelFrame, volume: float, x_g: float, eta_g: FloatArray,
    tau_start: FloatArray, h_start: FloatArray,
) -> tuple[FloatArray, FloatArray, NDArray[np.bool_]]:
    """Safeguarded free-trim solve: exact volume at every trial trim, trim bracketed.

    The bracket grows from the starting trim outwards (doubling), so the root found is
    the one nearest the start: the boat's own trim, not an equilibrium standing on end.
    """
    length = float(table.x[-1] - table.x[0])
    ratio = float(np.max(frame.eta_high - frame.eta_low)) / length
    tol_m = TOLERANCE * volume * length

    def pitch(tau: FloatArray, h_guess: FloatArray) -> tuple[FloatArray, FloatArray, _Residual]:
        h, ok = waterline_for_trim(table, frame, volume, tau, h_guess)
        r = _residual(table, frame, volume, x_g, eta_g, h, tau)
        return h, np.where(ok, r.f2, np.nan), r

    h, f_start, _ = pitch(tau_start, h_start)
    lo, hi = tau_start.copy(), tau_start.copy()
    f_lo = f_start.copy()
    found = np.abs(f_start) <= tol_m
    step = 0.02 * ratio
    while step <= 20.0 * ratio and not found.all():
        for sign in (-1.0, 1.0):
            trial = tau_start + sign * step
            _, f, _ = pitch(trial, h)
            change = ~found & np.isfinite(f) & np.isfinite(f_start) & (np.sign(f) != np.sign(f_start))
            lo = np.where(change, np.minimum(trial, tau_start), lo)
            hi = np.where(change, np.maximum(trial, tau_start), hi)
            f_lo = np.where(change, np.where(trial < tau_start, f, f_start), f_lo)
            found |= change
        step *= 2.0
    tau = np.where(found, 0.5 * (lo + hi), tau_start)
    done = np.zeros(tau.size, dtype=bool)
    for _ in range(MAX_ITERATIONS):
        h, f, r = pitch(tau, h)
        done = found & (np.abs(f) <= tol_m)
        if (done | ~found).all():
            break
        same = np.sign(f) == np.sign(f_lo)
        lo = np.where(same, tau, lo)
        f_lo = np.where(same, f, f_lo)
        hi = np.where(same, hi, tau)
        slope = r.j22 - r.j21 * r.j12 / np.where(r.j11 > 0, r.j11, 1.0)
        step_to = tau - f / np.where(slope != 0, slope, 1.0)
        inside = (step_to > lo) & (step_to < hi) & (slope != 0)
        tau = np.where(done | ~found, tau, np.where(inside, step_to, 0.5 * (lo + hi)))
    return h, tau, done


def _balanced(
    table: SectionTable, c: Cut, volume: float, x_g: float, eta_g: FloatArray, tau: FloatArray
) -> NDArray[np.bool_]:
    """Volume and pitch balance within tolerance, judged on an evaluated cut."""
    w = table.weights
    vol = c.area @ w
    pitch = c.area @ table.weights_x - x_g * vol + tau * (c.q_eta @ w - eta_g * vol)
    length = float(table.x[-1] - table.x[0])
    return (np.abs(vol - volume) <= TOLERANCE * volume) & (np.abs(pitch) <= TOLERANCE * volume * length)


def _accepted(
    table: SectionTable, frame: HeelFrame, c: Cut, volume: float, x_g: float,
    eta_g: FloatArray, tau: FloatArray, tau_start: FloatArray,
) -> NDArray[np.bool_]:
    """Balanced, and not a far jump in trim (Newton finding the boat standing on end)."""
    ratio = float(np.max(frame.eta_high - frame.eta_low)) / float(table.x[-1] - table.x[0])
    near = np.abs(tau - tau_start) <= 2.0 * ratio
    return _balanced(table, c, volume, x_g, eta_g, tau) & near


def _settle(
    table: SectionTable, frame: HeelFrame, volume: float, x_g: float, eta_g: FloatArray,
    h_start: FloatArray, tau_start: FloatArray,
) -> tuple[FloatArray, FloatArray, NDArray[np.bool_], Cut]:
    """The angles the fast pass left: restart from a waterline of the right volume at the
    starting trim (a safe 1-D solve), Newton again, then trim bracketing for the rest."""
    h, _ = waterline_for_trim(table, frame, volume, tau_start, h_start)
    h, tau, c = _joint_newton(table, frame, volume, x_g, eta_g, h, tau_start, MAX_ITERATIONS)
    ok = _accepted(table, frame, c, volume, x_g, eta_g, tau, tau_start)
    if not ok.all():
        j = np.flatnonzero(~ok)
        h[j], tau[j], ok[j] = _bracketed_trim(
            table, frame.take(j), volume, x_g, eta_g[j], tau_start[j], h[j]
        )
    return h, tau, ok, cut(table, frame, _levels(table, h, tau))


def solve_equilibrium(
    table: SectionTable,
    frame: HeelFrame,
    volume: float,
    x_g: float,
    eta_g: FloatArray,
    h0: FloatArray,
    tau0: FloatArray,
    free_trim: bool = True,
    safeguard: bool = True,
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
    safeguard : with free trim, take the angles Newton's method does not settle to the
        safeguarded path (slow but sure); if False they are left not converged
    """
    h = np.array(h0, dtype=float)
    tau = np.array(tau0, dtype=float)
    tau_start = np.asarray(tau0, dtype=float)
    w, wx = table.weights, table.weights_x
    if free_trim:
        h, tau, c = _joint_newton(table, frame, volume, x_g, eta_g, h, tau, FAST_ITERATIONS)
        ok = _accepted(table, frame, c, volume, x_g, eta_g, tau, tau_start)
        if safeguard and not ok.all():
            idx = np.flatnonzero(~ok)
            h_s, t_s, ok_s, c_s = _settle(
                table, frame.take(idx), volume, x_g, eta_g[idx],
                np.asarray(h0, dtype=float)[idx], tau_start[idx],
            )
            h[idx], tau[idx], ok[idx] = h_s, t_s, ok_s
            _put(c, idx, c_s)
    else:
        h, ok = waterline_for_trim(table, frame, volume, tau, h)
        c = cut(table, frame, _levels(table, h, tau))
    vol = c.area @ w
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
        converged=ok,
    )


def heel_neighbours(phi: FloatArray) -> NDArray[np.intp]:
    """For each heel angle, the index of the next angle towards the one nearest upright.

    The angle nearest zero (the anchor) gets -1.  Following the neighbours outwards
    from the anchor visits every angle in order of heel, on both sides.

    >>> heel_neighbours(np.radians([0.0, 10.0, 20.0, -10.0])).tolist()
    [-1, 0, 1, 0]
    """
    order = np.argsort(phi, kind="stable")
    a = int(np.argmin(np.abs(phi[order])))
    nb = np.empty(phi.size, dtype=np.intp)
    nb[order[a]] = -1
    nb[order[a + 1 :]] = order[a:-1]
    nb[order[:a]] = order[1 : a + 1]
    return nb


def _newton_from(
    table: SectionTable, frame: HeelFrame, volume: float, x_g: float, eta_g: FloatArray,
    h: FloatArray, tau: FloatArray,
) -> tuple[FloatArray, FloatArray]:
    """One joint Newton step from (h, tau) at every angle (NaN where the Jacobian is singular)."""
    r = _residual(table, frame, volume, x_g, eta_g, h, tau)
    det = r.j11 * r.j22 - r.j12 * r.j21
    good = (r.j11 > 0) & (np.abs(det) > 1e-14 * np.abs(r.j11 * r.j22))
    safe = np.where(good, det, 1.0)
    dh = (-r.f1 * r.j22 + r.f2 * r.j12) / safe
    dtau = (r.f1 * r.j21 - r.f2 * r.j11) / safe
    return np.where(good, h + dh, np.nan), np.where(good, tau + dtau, np.nan)


def _with(eq: Equilibrium, i: int, one: Equilibrium) -> Equilibrium:
    """``eq`` with angle ``i`` replaced by the single-angle solution ``one``."""
    fields = {}
    for name in ("h", "tau", "volume", "x_b", "xi_b", "eta_b", "waterplane", "converged"):
        values = getattr(eq, name).copy()
        values[i] = getattr(one, name)[0]
        fields[name] = values
    parts = {}
    for name in CUT_FIELDS:
        values = getattr(eq.cut, name).copy()
        values[i] = getattr(one.cut, name)[0]
        parts[name] = values
    return Equilibrium(cut=Cut(**parts), **fields)


def follow_branch(
    table: SectionTable, frame: HeelFrame, volume: float, x_g: float, eta_g: FloatArray,
    eq: Equilibrium, h_anchor: FloatArray, tau_anchor: FloatArray,
    neighbours: NDArray[np.intp] | None = None,
) -> tuple[Equilibrium, bool]:
    """Make the free-trim solutions one branch, continued heel by heel from upright.

    Solved all at once, a heel angle can land on another equilibrium than its
    neighbour's (a strongly trimmed boat found standing on end), and the GZ curve
    jumps.  Each angle is checked against its neighbour towards upright (the anchor
    angle against ``h_anchor``, ``tau_anchor``): one Newton step from the neighbour's
    solution must land near it.  From the first angle that fails, the angles are
    solved one at a time, each from its neighbour's solution, until they rejoin the
    solutions already found.  Where even that does not converge (the branch ends: the
    boat would dive or roll over), the solution found at once is kept.

    ``neighbours`` replaces :func:`heel_neighbours` (-1: follow from the anchor values
    of that angle itself).  Returns the repaired solutions and whether any angle had to
    be re-solved.
    """
    nb = heel_neighbours(frame.phi) if neighbours is None else neighbours
    has_nb = nb >= 0
    j = np.where(has_nb, nb, 0)
    h_nb = np.where(has_nb, eq.h[j], h_anchor)
    tau_nb = np.where(has_nb, eq.tau[j], tau_anchor)
    ok_nb = np.where(has_nb, eq.converged[j], True)
    h1, tau1 = _newton_from(table, frame, volume, x_g, eta_g, h_nb, tau_nb)
    length = float(table.x[-1] - table.x[0])
    span = float(np.max(frame.eta_high - frame.eta_low))
    with np.errstate(invalid="ignore"):
        miss = np.abs(h1 - eq.h) + length * np.abs(tau1 - eq.tau)
        step = np.abs(h1 - h_nb) + length * np.abs(tau1 - tau_nb)
        reached = eq.converged & (miss <= CONTINUITY * step + 1e-9 * span)
    suspect = ok_nb & ~reached
    if not suspect.any():
        return eq, False
    order = np.argsort(frame.phi, kind="stable")
    a = int(np.argmin(np.abs(frame.phi[order])))
    for sweep in (order[a:], order[a::-1]):
        moved = False
        for i in sweep.tolist():
            if not (suspect[i] or (moved and neighbours is None)):
                continue
            k = int(nb[i])
            if k >= 0 and not eq.converged[k]:
                moved = False
                continue
            h0 = np.array([eq.h[k] if k >= 0 else h_anchor[i]])
            t0 = np.array([eq.tau[k] if k >= 0 else tau_anchor[i]])
            one = solve_equilibrium(
                table, frame.take(np.array([i])), volume, x_g, eta_g[i : i + 1], h0, t0,
                safeguard=False,
            )
            if not one.converged[0]:
                moved = False  # the branch ends here: keep what was found at once
                continue
            same = eq.converged[i] and (
                abs(one.h[0] - eq.h[i]) + length * abs(one.tau[0] - eq.tau[i]) <= 1e-7 * span
            )
            moved = not same
            if moved:
                eq = _with(eq, i, one)
    return eq, True
