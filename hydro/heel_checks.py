"""Heel checks: a heeling moment (crew moving across, a person boarding over the
gunwale) against the exact righting-arm curve.

Heeling arm of a transverse weight shift HA = (w d cos(phi) + w h sin(phi)) / Delta
(Barrass & Derrett, Ship Stability for Masters and Mates, "List").
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Sequence

import numpy as np
from numpy.typing import NDArray

from hydro.design import Design, analyse_stations, check_context
from hydro.errors import LoadError
from hydro.loads import CREW_MASS_KG, MassItem
from hydro.hull import Stations
from hydro.sections import SectionTable
from hydro.stability import Analysis, StabilityCurve, righting_curve

__all__ = ["BODY_HALF_WIDTH_M", "MIN_SHIFTED_FREEBOARD_M", "HeelCheck", "boarding", "crew_shift"]

FloatArray = NDArray[np.float64]

#: Low-side freeboard to keep with the crew shifted: MCA MGN 280 section 11.4 asks 75 mm to a
#: watertight deck in its heeling test; used here for open boats (common practice).
MIN_SHIFTED_FREEBOARD_M = 0.075
#: A seated person's CG stays this far inboard of the hull side (common practice, no
#: source: about half a body width).
BODY_HALF_WIDTH_M = 0.15


@dataclass(frozen=True, eq=False)
class HeelCheck:
    """A heeling moment against the righting arm.

    Attributes
    ----------
    title : what was checked
    moved_mass : kg moved (or added) to the side
    arm0 : heeling arm at zero heel, w d / Delta (m)
    heel_deg : (A,) angles of the curve used
    heeling_arm : (A,) heeling arm HA(phi) (m), to draw on the GZ plot
    static_heel_deg : where GZ = HA, None if they never meet (capsize)
    small_angle_heel_deg : tan(theta) = w d / (Delta GM), for comparison
    low_freeboard : low-side freeboard at the static heel (m), None if it capsizes
    verdict : "holds", "floods" (the gunwale goes under first) or "capsizes"
    message : one line for the builder
    """

    title: str
    moved_mass: float
    arm0: float
    heel_deg: FloatArray
    heeling_arm: FloatArray
    static_heel_deg: float | None
    small_angle_heel_deg: float | None
    low_freeboard: float | None
    verdict: str
    message: str


def _heel_check(
    title: str,
    table: SectionTable,
    analysis: Analysis,
    rho: float,
    moved: float,
    moment: float,
    rise_moment: float,
) -> HeelCheck:
    """Static heel where GZ(phi) = (moment cos + rise_moment sin) / Delta."""
    base, curve, weights = analysis.hydrostatics, analysis.curve, analysis.weights
    assert base is not None and curve is not None
    delta = weights.mass
    phi = np.radians(curve.heel_deg)
    arm = (moment * np.cos(phi) + rise_moment * np.sin(phi)) / delta
    small = math.degrees(math.atan(moment / (delta * base.gm))) if base.gm > 0 else None
    diff = curve.gz - arm  # > 0 where the boat rights itself against the moment
    if diff[0] >= 0:
        static: float | None = float(curve.heel_deg[0])
    else:
        ok = np.isfinite(diff)
        ups = np.flatnonzero((diff[:-1] < 0) & (diff[1:] >= 0) & ok[:-1] & ok[1:])
        static = (
            _refine_heel(table, analysis, rho, moment, rise_moment, curve.heel_deg[ups[0]], curve.heel_deg[ups[0] + 1])
            if ups.size
            else None
        )
    if static is None:
        return HeelCheck(
            title, moved, moment / delta, curve.heel_deg, arm, None, small, None, "capsizes",
            f"{title}: the heeling arm exceeds the largest righting arm "
            f"({curve.max_gz * 1000:.0f} mm) - no equilibrium, the boat capsizes.",
        )
    low_fb = _low_freeboard(table, analysis, rho, static)
    gunwale = curve.gunwale_immersion_deg
    if low_fb <= 0 or (gunwale is not None and gunwale <= static):
        verdict = "floods"
        text = (
            f"{title}: heels to {static:.1f} deg, but the gunwale goes under at "
            f"{gunwale:.1f} deg first - an open boat swamps."
            if gunwale is not None
            else f"{title}: heels to {static:.1f} deg with the gunwale under water."
        )
    else:
        verdict = "holds"
        text = f"{title}: heels to {static:.1f} deg with {low_fb * 1000:.0f} mm freeboard left on the low side"
        if low_fb < MIN_SHIFTED_FREEBOARD_M:
            text += f" - less than the {MIN_SHIFTED_FREEBOARD_M * 1000:.0f} mm suggested"
        text += "."
    return HeelCheck(title, moved, moment / delta, curve.heel_deg, arm, static, small, low_fb, verdict, text)


def _single_angle(table: SectionTable, analysis: Analysis, rho: float, heel: float) -> StabilityCurve:
    base = analysis.hydrostatics
    assert base is not None
    return righting_curve(table, analysis.weights, rho, base, np.array([heel]))


def _refine_heel(
    table: SectionTable, analysis: Analysis, rho: float, moment: float, rise: float, lo: float, hi: float
) -> float:
    """Secant/bisection on GZ - HA between two curve angles (to 0.001 deg)."""
    delta = analysis.weights.mass

    def f(heel: float) -> float:
        gz = float(_single_angle(table, analysis, rho, heel).gz[0])
        t = math.radians(heel)
        return gz - (moment * math.cos(t) + rise * math.sin(t)) / delta

    f_lo, f_hi = f(lo), f(hi)
    for _ in range(40):
        if hi - lo < 1e-3 or not (math.isfinite(f_lo) and math.isfinite(f_hi)):
            break
        mid = lo - f_lo * (hi - lo) / (f_hi - f_lo) if f_hi != f_lo else 0.5 * (lo + hi)
        if not lo < mid < hi:
            mid = 0.5 * (lo + hi)
        f_mid = f(mid)
        if (f_mid > 0) == (f_hi > 0):
            hi, f_hi = mid, f_mid
        else:
            lo, f_lo = mid, f_mid
        if abs(f_mid) < 1e-9:
            return mid
    return 0.5 * (lo + hi)


def _low_freeboard(table: SectionTable, analysis: Analysis, rho: float, heel: float) -> float:
    return float(_single_angle(table, analysis, rho, heel).low_freeboard[0])


def _seat_gunwale(stations: Stations, x: float) -> tuple[float, float]:
    """Half-breadth and height of the gunwale at x (interpolated between stations)."""
    g = stations.gunwale
    return float(np.interp(x, stations.x, g[:, 0])), float(np.interp(x, stations.x, g[:, 1]))


def _side_at_height(stations: Stations, x: float, z: float) -> float:
    """Half-breadth of the hull's inside at height z, at x (outermost, interpolated)."""
    widths = []
    for h in stations.half_sections:
        y, zz = h[:, 0], h[:, 1]
        best = 0.0
        for i in range(len(h) - 1):
            z0, z1 = zz[i], zz[i + 1]
            if min(z0, z1) <= z <= max(z0, z1) and z0 != z1:
                best = max(best, y[i] + (z - z0) / (z1 - z0) * (y[i + 1] - y[i]))
            elif z0 == z1 == z:
                best = max(best, y[i], y[i + 1])
        widths.append(best if z <= zz.max() else y[-1])
    return float(np.interp(x, stations.x, widths))


def crew_shift(
    design: Design,
    members: Sequence[int] | None = None,
    distance: float | None = None,
    to_gunwale: bool = False,
    analysis: Analysis | None = None,
) -> HeelCheck:
    """Move crew to starboard and find the static heel on the exact GZ curve.

    Parameters
    ----------
    members : indices into ``design.loads.crew`` (default: everyone)
    distance : how far each moves sideways (m).  If None, each person moves to the
        hull side at seat height (less half a body width, BODY_HALF_WIDTH_M): the
        offset-load test of ISO 12217-3 / MCA MGN 280 section 11.4
    to_gunwale : instead, each sits on the gunwale, which also raises them to the sheer
    analysis : the design's analysis, if already computed
    """
    crew = design.loads.crew
    if not crew:
        raise LoadError("the crew shift needs at least one crew member")
    chosen = list(range(len(crew))) if members is None else list(members)
    if not chosen or any(not 0 <= i < len(crew) for i in chosen):
        raise LoadError("choose crew members from the load list")
    if distance is not None and not (math.isfinite(distance) and 0 <= distance <= 10):
        raise LoadError("the shift distance must be between 0 and 10 m")
    stations, table, rho = check_context(design)
    analysis = analysis or analyse_stations(stations, design.loads, rho, design.settings, table)
    if analysis.hydrostatics is None:
        raise LoadError(analysis.message)
    lines = {id(c): line for c, line in zip(crew, analysis.weights.lines)}
    moved = moment = rise = 0.0
    for i in chosen:
        c = crew[i]
        z_now = lines[id(c)].z
        if to_gunwale:
            b, sheer = _seat_gunwale(stations, c.x)
            d, h = b - c.y, sheer + c.cg_above_seat - z_now
        elif distance is None:
            side = _side_at_height(stations, c.x, z_now - c.cg_above_seat)
            d, h = max(side - BODY_HALF_WIDTH_M - c.y, 0.0), 0.0
        else:
            d, h = distance, 0.0
        moved += c.mass
        moment += c.mass * d
        rise += c.mass * h
    where = (
        "onto the gunwale" if to_gunwale
        else "to the side" if distance is None
        else f"{distance:.2f} m to the side"
    )
    who = "all crew" if len(chosen) == len(crew) else ", ".join(crew[i].name for i in chosen)
    return _heel_check(f"Crew shift ({who} {where})", table, analysis, rho, moved, moment, rise)


def boarding(design: Design, mass: float = CREW_MASS_KG, x: float | None = None) -> HeelCheck:
    """One person's weight on the gunwale (climbing in), at x (default amidships).

    The person's mass is added at the gunwale; the curve is that of the boat with the
    mass on the centreline at gunwale height, and the heeling arm w b cos(phi)/Delta
    (light-craft gunwale-load idea, ISO 12217-3 and 33 CFR 183).
    """
    if not (math.isfinite(mass) and 0 < mass <= 300):
        raise LoadError("the boarding mass must be between 0 and 300 kg")
    stations, table, rho = check_context(design)
    x = 0.5 * (stations.x[0] + stations.x[-1]) if x is None else x
    if not stations.x[0] <= x <= stations.x[-1]:
        raise LoadError("the boarding position must lie along the hull")
    b, sheer = _seat_gunwale(stations, x)
    loads = replace(design.loads, items=design.loads.items + (MassItem("person boarding", mass, x, 0.0, sheer),))
    analysis = analyse_stations(stations, loads, rho, design.settings, table)
    if analysis.hydrostatics is None:
        raise LoadError(analysis.message)
    return _heel_check(f"Boarding ({mass:.0f} kg on the gunwale)", table, analysis, rho, mass, mass * b, 0.0)
