"""Upright hydrostatics and the righting-arm (GZ) curve by exact heeled equilibrium.

Sign conventions: heel positive = starboard down; trim positive = bow down; GZ positive
= righting.  GZ at heel phi is the horizontal distance between B and G measured across
the heel axis:  GZ = (y_B - y_G) cos(phi) + (z_B - z_G) sin(phi)  (Tupper ch. 4), which
stays exact with free trim for the water plane used in :mod:`hydro.equilibrium`.
Integration along the hull is the trapezoid rule over stations (error O(h^2) in the
station spacing h).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np
from numpy.typing import NDArray

from hydro.equilibrium import Equilibrium, level_waterline, solve_equilibrium
from hydro.loads import WeightSummary
from hydro.sections import HeelFrame, SectionTable, heel_frame

__all__ = [
    "G_STANDARD",
    "Hydrostatics",
    "StabilityCurve",
    "Analysis",
    "upright",
    "righting_curve",
    "analyse_table",
    "curve_area",
    "flooding_mass",
    "hydrostatics_at",
]

FloatArray = NDArray[np.float64]

#: Standard gravity (m/s^2), 3rd CGPM 1901.
G_STANDARD = 9.80665


@dataclass(frozen=True, eq=False)
class Hydrostatics:
    """Upright equilibrium at free trim and the figures derived from it (SI units).

    Heights (KB, KG, KM, drafts) are above K, the lowest point of the hull.
    ``trim_deg`` is positive bow down; drafts are measured from K at the aft end (x0),
    amidships and the forward end (x1).  Waterplane quantities are taken on the body
    x-y plane (they differ from the inclined plane by cos(trim), negligible here).
    """

    displacement: float
    volume: float
    water_density: float
    draft_mid: float
    draft_fore: float
    draft_aft: float
    trim: float
    trim_deg: float
    lcb: float
    tcb: float
    kb: float
    waterplane_area: float
    lcf: float
    i_t: float
    i_l: float
    bm: float
    bm_l: float
    km: float
    kg: float
    gm_solid: float
    fsc: float
    gm: float
    gm_l: float
    lwl: float
    bwl: float
    t_mid_section: float
    midship_area: float
    cb: float
    cm: float
    cp: float
    cwp: float
    immersion_kg_per_cm: float
    mct_1cm: float
    min_freeboard: float
    min_freeboard_x: float
    station_x: FloatArray
    freeboard: FloatArray
    h: float
    tau: float


@dataclass(frozen=True, eq=False)
class StabilityCurve:
    """The righting-arm curve.

    Attributes
    ----------
    heel_deg : (A,) heel angles
    gz : (A,) righting arm (m), corrected for free surface; NaN where unsolved
    wall_sided : (A,) wall-sided estimate sin(phi)(GM + BM tan^2(phi)/2) (Tupper ch. 4),
        NaN at and beyond 90 degrees
    righting_moment : (A,) Delta g GZ (N m)
    trim_deg : (A,) free trim at each heel
    low_freeboard : (A,) least height of the low-side gunwale above the water (m)
    converged : (A,) bool
    gunwale_immersion_deg : first heel at which the gunwale meets the water, or None
    max_gz, max_gz_deg : largest GZ and where (over the whole curve)
    avs_deg : angle of vanishing stability, or None if GZ stays positive to the end
    loll_deg : heel where a negative-GM boat comes to rest, or None
    area_30, area_40, area_to_gunwale : area under GZ (m rad) to 30, 40 degrees and to
        gunwale immersion (None where the curve does not reach that far)
    """

    heel_deg: FloatArray
    gz: FloatArray
    wall_sided: FloatArray
    righting_moment: FloatArray
    trim_deg: FloatArray
    low_freeboard: FloatArray
    converged: NDArray[np.bool_]
    gunwale_immersion_deg: float | None
    max_gz: float
    max_gz_deg: float
    avs_deg: float | None
    loll_deg: float | None
    area_30: float | None
    area_40: float | None
    area_to_gunwale: float | None


@dataclass(frozen=True, eq=False)
class Analysis:
    """Everything the readout shows, or a plain message when the hull cannot float.

    Attributes
    ----------
    status : "ok"; "floods" (the gunwale is under water upright: an open boat swamps);
        "unstable" (GM <= 0: the boat lolls or capsizes); or "sinks" (even the whole
        closed hull cannot carry the load)
    message : one line for the user
    weights : the weight build-up
    hydrostatics, curve : None when status is "sinks"
    """

    status: str
    message: str
    weights: WeightSummary
    hydrostatics: Hydrostatics | None
    curve: StabilityCurve | None


def _drafts(table: SectionTable, h: float, tau: float) -> tuple[float, float, float]:
    x0, x1 = table.x[0], table.x[-1]
    k = table.keel_z
    return (h + tau * 0.5 * (x0 + x1) - k, h + tau * x1 - k, h + tau * x0 - k)


def upright(
    table: SectionTable, weights: WeightSummary, rho: float, free_trim: bool = True
) -> Hydrostatics | None:
    """Upright (zero heel) equilibrium at free trim and its hydrostatics.

    Returns None when the whole closed hull displaces less than the load (or just as
    much: then it hangs wholly under water with no waterplane).
    """
    volume = weights.mass / rho
    frame = heel_frame(table, np.zeros(1))
    h0 = level_waterline(table, frame, volume)
    if not np.isfinite(h0[0]):
        return None
    eq = solve_equilibrium(
        table, frame, volume, weights.lcg, np.array([weights.vcg]), h0, np.zeros(1), free_trim
    )
    if not (eq.waterplane[0] > 0 and eq.converged[0]):  # no floating position
        return None
    return hydrostatics_at(table, weights, rho, eq)


def _waterline_length(table: SectionTable, h: float, tau: float) -> float:
    """Length over which the keel is under water; ends found by linear interpolation."""
    depth = h + tau * table.x - table.z.min(axis=1)
    wet = depth > 0
    if not wet.any():
        return 0.0
    i0, i1 = int(np.argmax(wet)), int(wet.size - 1 - np.argmax(wet[::-1]))
    x, d = table.x, depth
    start = x[i0] if i0 == 0 else x[i0] - (x[i0] - x[i0 - 1]) * d[i0] / (d[i0] - d[i0 - 1])
    end = x[i1] if i1 == x.size - 1 else x[i1] + (x[i1 + 1] - x[i1]) * d[i1] / (d[i1] - d[i1 + 1])
    return float(end - start)


def hydrostatics_at(
    table: SectionTable, weights: WeightSummary, rho: float, eq: Equilibrium
) -> Hydrostatics:
    """Hydrostatics of the first waterline in ``eq`` (upright) for the given weights."""
    x, w = table.x, table.weights
    c = eq.cut
    h, tau = float(eq.h[0]), float(eq.tau[0])
    vol = float(eq.volume[0])
    breadth = c.breadth[0]
    aw = float(breadth @ w)
    lcf = float(breadth @ table.weights_x / aw)
    tcf = float(c.breadth_m1[0] @ w / aw)
    i_t = float(c.breadth_m2[0] @ w) - aw * tcf**2
    i_l = float(breadth @ table.weights_xx) - aw * lcf**2
    kb = float(eq.eta_b[0]) - table.keel_z
    bm = i_t / vol
    bm_l = i_l / vol
    km = kb + bm
    gm_solid = km - weights.kg
    gm = gm_solid - weights.fsc
    gm_l = kb + bm_l - weights.kg - weights.fsc
    lwl = _waterline_length(table, h, tau)
    bwl = float(breadth.max())
    mid = int(np.argmax(c.area[0]))
    low = table.z[mid].min()
    t_mid = h + tau * x[mid] - low
    a_mid = float(c.area[0, mid])
    cb = vol / (lwl * bwl * t_mid) if lwl * bwl * t_mid > 0 else math.nan
    cm = a_mid / (bwl * t_mid) if bwl * t_mid > 0 else math.nan
    cp = vol / (a_mid * lwl) if a_mid * lwl > 0 else math.nan
    cwp = aw / (lwl * bwl) if lwl * bwl > 0 else math.nan
    length = float(x[-1] - x[0])
    freeboard = table.gunwale_z - (h + tau * x)
    i_min = int(np.argmin(freeboard))
    mid_d, fore_d, aft_d = _drafts(table, h, tau)
    return Hydrostatics(
        displacement=weights.mass,
        volume=vol,
        water_density=rho,
        draft_mid=mid_d,
        draft_fore=fore_d,
        draft_aft=aft_d,
        trim=fore_d - aft_d,
        trim_deg=math.degrees(math.atan(tau)),
        lcb=float(eq.x_b[0]),
        tcb=float(eq.xi_b[0]),
        kb=kb,
        waterplane_area=aw,
        lcf=lcf,
        i_t=i_t,
        i_l=i_l,
        bm=bm,
        bm_l=bm_l,
        km=km,
        kg=weights.kg,
        gm_solid=gm_solid,
        fsc=weights.fsc,
        gm=gm,
        gm_l=gm_l,
        lwl=lwl,
        bwl=bwl,
        t_mid_section=t_mid,
        midship_area=a_mid,
        cb=cb,
        cm=cm,
        cp=cp,
        cwp=cwp,
        immersion_kg_per_cm=rho * aw / 100.0,
        mct_1cm=weights.mass * gm_l / (100.0 * length),
        min_freeboard=float(freeboard[i_min]),
        min_freeboard_x=float(x[i_min]),
        station_x=x.copy(),
        freeboard=freeboard,
        h=h,
        tau=tau,
    )


def curve_area(heel_deg: FloatArray, gz: FloatArray, upto_deg: float) -> float | None:
    """Area under GZ from the first angle to ``upto_deg`` (m rad), trapezoid rule.

    None when the curve stops short of ``upto_deg`` or has gaps before it.
    """
    if upto_deg > heel_deg[-1] + 1e-9 or upto_deg < heel_deg[0]:
        return None
    keep = heel_deg <= upto_deg
    a = np.radians(heel_deg[keep])
    g = gz[keep]
    if a[-1] < math.radians(upto_deg):
        nxt = int(np.count_nonzero(keep))
        g_end = np.interp(upto_deg, heel_deg[nxt - 1 : nxt + 1], gz[nxt - 1 : nxt + 1])
        a = np.append(a, math.radians(upto_deg))
        g = np.append(g, g_end)
    if not np.all(np.isfinite(g)):
        return None
    return float(np.sum(np.diff(a) * (g[1:] + g[:-1]) / 2))


def _crossings(heel: FloatArray, f: FloatArray, rising: bool) -> list[float]:
    """Angles where f crosses zero going up (rising) or down, by linear interpolation."""
    a, b = f[:-1], f[1:]
    with np.errstate(invalid="ignore"):
        hit = (a < 0) & (b >= 0) if rising else (a > 0) & (b <= 0)
    i = np.flatnonzero(hit)
    return (heel[i] + (heel[i + 1] - heel[i]) * a[i] / (a[i] - b[i])).tolist()


def _loose_water_shift(
    table: SectionTable, frame: HeelFrame, weights: WeightSummary, rho: float, tau: FloatArray
) -> FloatArray:
    """(A,) loss of GZ from loose water flowing to the low side (m).

    One pool: solved as a moving weight.  Several separate pools (twin pontoons): the
    free-surface correction FSC sin(phi), with each pool about its own centre.
    """
    water = [line for line in weights.lines if line.kind == "water"]
    if not water:
        return np.zeros(frame.phi.size)
    if weights.loose_water_pools > 1:
        return weights.fsc * frame.sin
    w = water[0]
    volume = w.mass / rho
    h0 = np.nan_to_num(level_waterline(table, frame, volume))
    inside = solve_equilibrium(table, frame, volume, w.x, np.zeros_like(h0), h0, tau, free_trim=False)
    fixed = frame.cos * w.y + frame.sin * w.z
    return w.mass / weights.mass * (inside.xi_b - fixed)


def righting_curve(
    table: SectionTable,
    weights: WeightSummary,
    rho: float,
    base: Hydrostatics,
    heel_deg: FloatArray,
    free_trim: bool = True,
) -> StabilityCurve:
    """GZ at every angle in ``heel_deg`` from exact heeled equilibrium.

    All angles are solved together by Newton's method, starting from the upright
    waterline turned with the boat.  Loose (bilge) water is a weight that moves: at each
    heel its surface is found inside the hull, parallel to the sea's, and the shift of its
    centre reduces GZ (thin-shell approximation; its fore-and-aft shift is ignored).  At
    small angles this is the free-surface correction FSC sin(phi); it also holds when the
    water reaches the floor's edge, where the FSC formula does not.
    """
    heel_deg = np.asarray(heel_deg, dtype=float)
    phi = np.radians(heel_deg)
    frame = heel_frame(table, phi)
    c, s = frame.cos, frame.sin
    xi_g = c * weights.tcg + s * weights.vcg
    eta_g = c * weights.vcg - s * weights.tcg
    volume = weights.mass / rho
    eq = solve_equilibrium(
        table, frame, volume, weights.lcg, eta_g, base.h * c, base.tau * c, free_trim
    )
    bad = ~eq.converged
    if bad.any():  # restart the stragglers from a level waterline
        idx = np.flatnonzero(bad)
        sub = heel_frame(table, phi[idx])
        h_level = level_waterline(table, sub, volume)
        retry = solve_equilibrium(
            table, sub, volume, weights.lcg, eta_g[idx], np.nan_to_num(h_level), np.zeros(idx.size), free_trim
        )
        xi_b = eq.xi_b.copy()
        tau = eq.tau.copy()
        h = eq.h.copy()
        conv = eq.converged.copy()
        xi_b[idx], tau[idx], h[idx], conv[idx] = retry.xi_b, retry.tau, retry.h, retry.converged
    else:
        xi_b, tau, h, conv = eq.xi_b, eq.tau, eq.h, eq.converged
    gz = xi_b - xi_g - _loose_water_shift(table, frame, weights, rho, tau)
    gz = np.where(conv, gz, np.nan)
    with np.errstate(invalid="ignore", divide="ignore"):
        tan = np.tan(phi)
        wall = np.where(np.abs(heel_deg) < 89.999, s * (base.gm + 0.5 * base.bm * tan**2), np.nan)
    # low (starboard) gunwale height above the heeled waterline at every station
    eta_gw = c[:, None] * table.gunwale_z[None] - s[:, None] * table.gunwale_y[None]
    low_fb = (eta_gw - (h[:, None] + tau[:, None] * table.x[None])).min(axis=1)
    low_fb = np.where(conv, low_fb, np.nan)
    under = _crossings(heel_deg, low_fb, rising=False)
    gunwale = under[0] if base.min_freeboard > 0 and under else None
    if base.min_freeboard <= 0:
        gunwale = float(heel_deg[0])
    finite = np.isfinite(gz)
    i_max = int(np.nanargmax(np.where(finite, gz, -np.inf))) if finite.any() else 0
    up = _crossings(heel_deg, gz, rising=True)
    down = _crossings(heel_deg, gz, rising=False)
    loll = up[0] if base.gm < 0 and up else None
    start = loll if loll is not None else heel_deg[0]
    avs_list = [a for a in down if a > start + 1e-9]
    avs: float | None
    if base.gm < 0 and loll is None:
        avs = float(heel_deg[0])
    else:
        avs = avs_list[0] if avs_list else None
    return StabilityCurve(
        heel_deg=heel_deg,
        gz=gz,
        wall_sided=wall,
        righting_moment=weights.mass * G_STANDARD * gz,
        trim_deg=np.degrees(np.arctan(tau)),
        low_freeboard=low_fb,
        converged=conv,
        gunwale_immersion_deg=gunwale,
        max_gz=float(gz[i_max]) if finite.any() else math.nan,
        max_gz_deg=float(heel_deg[i_max]),
        avs_deg=avs,
        loll_deg=loll,
        area_30=curve_area(heel_deg, gz, 30.0),
        area_40=curve_area(heel_deg, gz, 40.0),
        area_to_gunwale=curve_area(heel_deg, gz, gunwale) if gunwale is not None else None,
    )


def flooding_mass(table: SectionTable, weights: WeightSummary, rho: float) -> float | None:
    """Largest mass, with G where it is, that floats upright with the gunwale clear (kg).

    Found by bisection on the mass (to 0.1 kg) with free trim; None if even a tiny load
    puts the gunwale under (the sheer dips below the keel's waterline).
    """

    def freeboard(mass: float) -> float:
        hs = upright(table, replace(weights, mass=mass, lines=()), rho)
        return -1.0 if hs is None else hs.min_freeboard

    lo = 1e-3 * weights.mass
    hi = float(table.totals[0] @ table.weights) * rho
    if freeboard(lo) <= 0:
        return None
    while hi - lo > 0.1:
        mid = 0.5 * (lo + hi)
        if freeboard(mid) > 0:
            lo = mid
        else:
            hi = mid
    return lo


def analyse_table(
    table: SectionTable,
    weights: WeightSummary,
    rho: float,
    heel_deg: FloatArray,
    free_trim: bool = True,
) -> Analysis:
    """Upright hydrostatics plus the GZ curve, with a plain status message."""
    base = upright(table, weights, rho, free_trim)
    if base is None:
        full = float(table.totals[0] @ table.weights) * rho
        if weights.mass < full:
            text = (
                f"Sinks: no floating position with the centre of gravity at x = "
                f"{weights.lcg:.2f} m; the hull would stand on end and go under."
            )
        else:
            text = (
                f"Sinks: the load is {weights.mass:.0f} kg but the whole closed hull "
                f"displaces only {full:.0f} kg."
            )
        return Analysis("sinks", text, weights, None, None)
    curve = righting_curve(table, weights, rho, base, heel_deg, free_trim)
    if base.min_freeboard <= 0:
        limit = flooding_mass(table, weights, rho)
        over = f"; it floods at {limit:.0f} kg, {weights.mass - limit:.0f} kg too heavy" if limit else ""
        return Analysis(
            "floods",
            f"Floods: the gunwale is {-base.min_freeboard * 1000:.0f} mm under water at "
            f"x = {base.min_freeboard_x:.2f} m with {weights.mass:.0f} kg aboard{over}.",
            weights,
            base,
            curve,
        )
    if base.gm <= 0:
        if curve.loll_deg is not None:
            text = f"lolls over to about {curve.loll_deg:.0f} degrees"
            if curve.gunwale_immersion_deg is not None and curve.gunwale_immersion_deg <= curve.loll_deg:
                text += ", past the point where the gunwale goes under"
        else:
            text = "finds no upright position and capsizes"
        return Analysis(
            "unstable",
            f"Unstable: GM is {base.gm * 1000:.0f} mm, so the boat {text}.",
            weights,
            base,
            curve,
        )
    return Analysis("ok", "Floats upright with the gunwale clear.", weights, base, curve)
