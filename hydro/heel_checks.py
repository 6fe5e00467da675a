"""Heel checks: a heeling moment (crew moving across, a person boarding over the
gunwale) against the exact righting-arm curve.

Heeling arm of a transverse weight shift HA = (w d cos(phi) + w h sin(phi)) / Delta
(Barrass & Derrett, Ship Stability for Masters and Mates, "List").
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from enum import Enum
from typing import Sequence

import numpy as np
from numpy.typing import NDArray

from hydro.design import Design, analyse_stations, check_context
from hydro.errors import LoadError
from hydro.loads import CREW_MASS_KG, MassItem
from hydro.hull import Stations
from hydro.sections import SectionTable
from hydro.stability import Analysis, StabilityCurve, righting_curve
from hydro.wording import heel_sentence, heel_title

__all__ = [
    "BODY_HALF_WIDTH_M",
    "MIN_SHIFTED_FREEBOARD_M",
    "HeelCheck",
    "Verdict",
    "boarding",
    "crew_shift",
]

FloatArray = NDArray[np.float64]

#: Low-side freeboard to keep with the crew shifted: MCA MGN 280 section 11.4 asks 75 mm to a
#: watertight deck in its heeling test; used here for open boats (common practice).
MIN_SHIFTED_FREEBOARD_M = 0.075
#: A seated person's CG stays this far inboard of the hull side (common practice, no
#: source: about half a body width).
BODY_HALF_WIDTH_M = 0.15


class Verdict(str, Enum):
    """What a heeling moment does: the boat holds at a heel, the gunwale goes under
    first (an open boat floods), or no heel balances it (capsizes)."""

    HOLDS = "holds"
    FLOODS = "floods"
    CAPSIZES = "capsizes"

    def __str__(self) -> str:
        return self.value


@dataclass(frozen=True, eq=False)
class HeelCheck:
    """A heeling moment against the righting arm, with its margins.

    Attributes
    ----------
    kind : "crew shift" or "boarding"
    who : "all crew", names, or the boarding mass in words
    distance : metres each person moves (None: to the hull side, or onto the gunwale)
    to_gunwale : they sit on the gunwale
    moved_mass : kg moved (or added) to the side
    arm0 : heeling arm at zero heel, w d / Delta (m)
    heel_deg : (A,) angles of the curve used
    heeling_arm : (A,) heeling arm HA(phi) (m), to draw on the GZ plot
    start_deg : the boat's list before the moment (degrees, + starboard)
    static_heel_deg : where GZ = HA, None if they never meet (capsize)
    small_angle_heel_deg : tan(theta) = w d / (Delta GM), for comparison
    low_freeboard : low-side freeboard at the static heel (m), None if it capsizes: the
        freeboard left
    gunwale_deg : heel at which the low gunwale goes under, beyond the start (or None)
    heel_left_deg : heel left from the static heel to the gunwale (None: not reached)
    arm_share : the heeling arm as a share of the largest righting arm on that side
        (1.0 = all of it; above 1 it capsizes)
    verdict : see :class:`Verdict`
    """

    kind: str
    who: str
    distance: float | None
    to_gunwale: bool
    moved_mass: float
    arm0: float
    heel_deg: FloatArray
    heeling_arm: FloatArray
    start_deg: float
    static_heel_deg: float | None
    small_angle_heel_deg: float | None
    low_freeboard: float | None
    gunwale_deg: float | None
    heel_left_deg: float | None
    arm_share: float | None
    verdict: Verdict

    @property
    def title(self) -> str:
        """What was checked, in metric words (see :func:`hydro.wording.heel_title`)."""
        return heel_title(self)

    @property
    def message(self) -> str:
        """One line for the builder, metric (see :func:`hydro.wording.heel_sentence`)."""
        return heel_sentence(self)


def _first_rising(heel: FloatArray, f: FloatArray, after: float) -> int | None:
    """First i with a rising zero crossing of f in [heel[i], heel[i+1]], heel[i+1] > after."""
    ok = np.isfinite(f)
    with np.errstate(invalid="ignore"):
        hit = (f[:-1] < 0) & (f[1:] >= 0) & ok[:-1] & ok[1:] & (heel[1:] > after)
    idx = np.flatnonzero(hit)
    return int(idx[0]) if idx.size else None


def _heel_check(
    what: tuple[str, str, float | None, bool],
    table: SectionTable,
    analysis: Analysis,
    rho: float,
    moved: float,
    moment: float,
    rise_moment: float,
) -> HeelCheck:
    """Static heel where GZ(phi) = (moment cos + rise_moment sin) / Delta, rolling from
    the boat's list towards starboard (the moment's side)."""
    base, curve, weights = analysis.hydrostatics, analysis.curve, analysis.weights
    assert base is not None and curve is not None
    if curve.list_deg is None:
        raise LoadError(analysis.message)
    delta = weights.mass
    heel = curve.heel_deg
    phi = np.radians(heel)
    arm = (moment * np.cos(phi) + rise_moment * np.sin(phi)) / delta
    small = math.degrees(math.atan(moment / (delta * base.gm))) if base.gm > 0 else None
    start = float(curve.list_deg)
    diff = curve.gz - arm  # > 0 where the boat rights itself against the moment
    static: float | None
    if moment <= 0 and rise_moment <= 0:
        static = start
    else:
        i = _first_rising(heel, diff, start)
        static = (
            None if i is None
            else _refine_heel(table, analysis, rho, moment, rise_moment, heel[i], heel[i + 1])
        )
    beyond = heel >= start - 1e-9
    best = float(np.nanmax(np.where(beyond, curve.gz, np.nan))) if beyond.any() else math.nan
    share = moment / delta / best if best > 0 else None
    fb = np.where(beyond, curve.low_freeboard, np.nan)
    under = [
        float(heel[j] + (heel[j + 1] - heel[j]) * fb[j] / (fb[j] - fb[j + 1]))
        for j in np.flatnonzero((fb[:-1] > 0) & (fb[1:] <= 0))
    ]
    gunwale = under[0] if under else None
    if base.min_freeboard <= 0:
        gunwale = start
    if static is None:
        return HeelCheck(*what, moved, moment / delta, heel, arm, start, None, small, None,
                         gunwale, None, share, Verdict.CAPSIZES)
    low_fb = _low_freeboard(table, analysis, rho, static)
    floods = low_fb <= 0 or (gunwale is not None and gunwale <= static)
    left = None if gunwale is None else max(gunwale - static, 0.0)
    verdict = Verdict.FLOODS if floods else Verdict.HOLDS
    return HeelCheck(*what, moved, moment / delta, heel, arm, start, static, small, low_fb,
                     gunwale, left, share, verdict)


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
    who = "all crew" if len(chosen) == len(crew) else ", ".join(crew[i].name for i in chosen)
    what = ("crew shift", who, None if to_gunwale else distance, to_gunwale)
    return _heel_check(what, table, analysis, rho, moved, moment, rise)


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
    what = ("boarding", "one person", None, True)
    return _heel_check(what, table, analysis, rho, mass, mass * b, 0.0)
