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
from dataclasses import dataclass, field, replace
from enum import Enum
from typing import TypeVar

import numpy as np
from numpy.typing import NDArray

from hydro.equilibrium import Equilibrium, follow_branch, level_waterline, solve_equilibrium
from hydro.features import PEAK_TOL_DEG, ROOT_TOL_DEG, Crossing, Peak
from hydro.features import refine as refine_features
from hydro.loads import WeightSummary
from hydro.sections import HeelFrame, SectionTable, heel_frame
from hydro.wording import status_sentence

__all__ = [
    "G_STANDARD",
    "Hydrostatics",
    "StabilityCurve",
    "Analysis",
    "Status",
    "both_sides",
    "curve_points",
    "is_asymmetric",
    "upright",
    "righting_curve",
    "analyse_table",
    "curve_area",
    "flooding_mass",
    "hydrostatics_at",
]

FloatArray = NDArray[np.float64]

_Feature = TypeVar("_Feature", Crossing, Peak)

#: (h, tau) at each heel: where to start the solver, or where it found the boat.
Waterlines = tuple[FloatArray, FloatArray]

#: Standard gravity (m/s^2), 3rd CGPM 1901.
G_STANDARD = 9.80665
#: G nearer the centreline than this (m) counts as on it.
ASYMMETRY_M = 1e-6


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


#: Where a drag frame solves extra angles around each feature's expected place (degrees
#: from the expected angle): what refinement would ask for, so that it need not.
TRACK_PATTERN = {
    "list": (-ROOT_TOL_DEG, ROOT_TOL_DEG),
    "peak": (-PEAK_TOL_DEG, 0.0, PEAK_TOL_DEG),
    "avs": (-ROOT_TOL_DEG, ROOT_TOL_DEG),
    "gunwale": (-ROOT_TOL_DEG, ROOT_TOL_DEG),
}


@dataclass(frozen=True, eq=False)
class FeatureTrack:
    """Where a curve's refined features lie, and where they lay on the curve its solve
    started from (a drag's previous frame), to place the next frame's extra angles.

    Attributes
    ----------
    side : the listing side the angles are measured towards (+1 starboard, -1 port)
    now, before : refined angle (degrees, towards ``side``) of each feature, by name
        ("list", "peak", "avs", "gunwale"); ``before`` is empty without a previous frame
    heel_deg, h, tau : (E,) the extra angles solved beside the curve's (signed heel) and
        their waterlines (as ``StabilityCurve.waterlines``), to start the next frame's
    grid_before : the waterlines the previous frame found at this curve's angles, and
    upright_before : its upright (h, tau); with this frame's they give the next frame's
        starts, carried on at the same pace (None: no previous frame)
    """

    side: int
    now: dict[str, float]
    before: dict[str, float]
    heel_deg: FloatArray = field(default_factory=lambda: np.empty(0))
    h: FloatArray = field(default_factory=lambda: np.empty(0))
    tau: FloatArray = field(default_factory=lambda: np.empty(0))
    grid_before: Waterlines | None = None
    upright_before: tuple[float, float] | None = None

    def expected(self) -> dict[str, float]:
        """Each feature's angle on the next frame: carried on at the pace of the last
        two frames (a drag moves steadily), else where it is now."""
        return {k: 2 * v - self.before[k] if k in self.before else v for k, v in self.now.items()}


@dataclass(frozen=True, eq=False)
class StabilityCurve:
    """The righting-arm curve.

    Attributes
    ----------
    heel_deg : (A,) heel angles, ascending; negative = port down.  Both sides when G
        is off the centreline, else 0 to the largest heel
    gz : (A,) righting arm (m), corrected for free surface; NaN where unsolved; with an
        off-centre G, GZ(0) = -TCG
    wall_sided : (A,) wall-sided estimate sin(phi)(GM + BM tan^2(phi)/2) - TCG cos(phi)
        (Tupper ch. 4), NaN at and beyond 90 degrees
    righting_moment : (A,) Delta g GZ (N m)
    trim_deg : (A,) free trim at each heel
    low_freeboard : (A,) least height of the low-side gunwale above the water (m)
    converged : (A,) bool
    The features below are on the listing side (``side``), angles signed like heel:

    gunwale_immersion_deg : first heel at which the low gunwale meets the water, or None
    max_gz, max_gz_deg : largest righting arm back towards upright beyond the list, and
        its heel (refined on the exact solver)
    avs_deg : angle of vanishing stability beyond the list, or None if the righting arm
        stays positive to the end (refined)
    loll_deg : heel where a negative-GM boat comes to rest, or None
    area_30, area_40, area_to_gunwale : area under the righting arm (m rad) from upright
        to 30, 40 degrees and to gunwale immersion towards the listing side (None where
        the curve does not reach that far)
    list_deg : static heel of the boat as loaded (GZ = 0, stable), + starboard; None
        when there is none on the listing side: the boat capsizes (refined)
    side : +1 starboard, -1 port: the side G pulls the boat towards
    waterlines : (h, tau), each (A,): the water plane eta - tau x = h found at each heel
        (body frame, port heels as their mirror image), to start the solver of a later
        analysis of a nearby design
    track : where the refined features lie, to place a later analysis' extra angles
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
    list_deg: float | None = 0.0
    side: int = 1
    waterlines: tuple[FloatArray, FloatArray] | None = None
    track: FeatureTrack | None = None

    @property
    def capsizes(self) -> bool:
        """No equilibrium on the side G pulls the boat towards: it rolls over."""
        return self.list_deg is None

    @property
    def range_deg(self) -> float:
        """Span of positive righting arm from the list to the vanishing angle (degrees);
        to the last angle computed when the arm stays positive (see ``range_open``)."""
        if self.list_deg is None:
            return 0.0
        end = self.avs_deg if self.avs_deg is not None else self.side * self.last_deg
        return max(abs(end - self.list_deg), 0.0)

    @property
    def range_open(self) -> bool:
        """The righting arm is still positive at the last angle computed."""
        return self.list_deg is not None and self.avs_deg is None

    @property
    def last_deg(self) -> float:
        """The largest heel computed towards the listing side (degrees, unsigned)."""
        return float(np.max(self.side * self.heel_deg))


class Status(str, Enum):
    """How the loaded boat floats, decided once here for every view.

    ok: floats, with G where it is, at a stable heel (upright or listed) with the gunwale
    clear; floods: the gunwale is under water upright, or (an open boat) at the list;
    unstable: upright GM <= 0, the boat lolls over to an angle; capsizes: no heel towards
    the side G pulls the boat brings the righting arm back to zero; sinks: no floating
    position at all.
    """

    OK = "ok"
    FLOODS = "floods"
    UNSTABLE = "unstable"
    CAPSIZES = "capsizes"
    SINKS = "sinks"

    def __str__(self) -> str:
        return self.value


@dataclass(frozen=True, eq=False)
class Analysis:
    """Everything the readout shows, or a plain message when the hull cannot float.

    Attributes
    ----------
    status : see :class:`Status`
    weights : the weight build-up
    hydrostatics, curve : None when status is "sinks"
    flood_limit_kg : when the gunwale is under upright, the mass that just floods it
    capacity_kg : the mass the whole closed hull displaces (for "sinks")
    """

    status: Status
    weights: WeightSummary
    hydrostatics: Hydrostatics | None
    curve: StabilityCurve | None
    flood_limit_kg: float | None = None
    capacity_kg: float | None = None

    @property
    def list_deg(self) -> float | None:
        """Static heel as loaded, + starboard; None when the boat capsizes or sinks."""
        return None if self.curve is None else self.curve.list_deg

    @property
    def message(self) -> str:
        """One sentence for the user (metric); other units through :mod:`hydro.wording`."""
        return status_sentence(self)


def _drafts(table: SectionTable, h: float, tau: float) -> tuple[float, float, float]:
    x0, x1 = table.x[0], table.x[-1]
    k = table.keel_z
    return (h + tau * 0.5 * (x0 + x1) - k, h + tau * x1 - k, h + tau * x0 - k)


def upright(
    table: SectionTable,
    weights: WeightSummary,
    rho: float,
    free_trim: bool = True,
    start: tuple[float, float] | None = None,
) -> Hydrostatics | None:
    """Upright (zero heel) equilibrium at free trim and its hydrostatics.

    ``start`` (h, tau) is where a nearby design floated: the solver starts there and
    falls back to a level waterline if it does not settle.  Returns None when the whole
    closed hull displaces less than the load (or just as much: then it hangs wholly
    under water with no waterplane).
    """
    volume = weights.mass / rho
    frame = heel_frame(table, np.zeros(1))
    vcg = np.array([weights.vcg])
    if start is not None:
        h_start, tau_start = np.array([start[0]]), np.array([start[1] if free_trim else 0.0])
        eq = solve_equilibrium(
            table, frame, volume, weights.lcg, vcg, h_start, tau_start, free_trim
        )
        if eq.waterplane[0] > 0 and eq.converged[0]:
            return hydrostatics_at(table, weights, rho, eq)
    h0 = level_waterline(table, frame, volume)
    if not np.isfinite(h0[0]):
        return None
    eq = solve_equilibrium(table, frame, volume, weights.lcg, vcg, h0, np.zeros(1), free_trim)
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
    return curve_areas(heel_deg, gz, (upto_deg,))[0]


def curve_areas(
    heel_deg: FloatArray, gz: FloatArray, upto_deg: tuple[float, ...]
) -> list[float | None]:
    """:func:`curve_area` to each angle of ``upto_deg``, sharing the trapezoids
    (``heel_deg`` ascending)."""
    a = np.radians(heel_deg)
    strips = np.diff(a) * (gz[1:] + gz[:-1]) / 2
    bad = np.flatnonzero(~np.isfinite(gz))
    first_bad = int(bad[0]) if bad.size else heel_deg.size
    areas: list[float | None] = []
    for upto in upto_deg:
        if upto > heel_deg[-1] + 1e-9 or upto < heel_deg[0]:
            areas.append(None)
            continue
        n = int(np.searchsorted(heel_deg, upto, side="right"))  # angles up to it
        end = math.radians(upto)
        part = strips[: n - 1]
        if a[n - 1] < end:  # the last strip ends between two angles
            g_end = np.interp(upto, heel_deg[n - 1 : n + 1], gz[n - 1 : n + 1])
            last = (end - a[n - 1]) * (g_end + gz[n - 1]) / 2
            part = np.append(part, last)
            n = min(n + 1, heel_deg.size)  # the next angle's arm is used
        areas.append(None if first_bad < n else float(np.sum(part)))
    return areas


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


def _mirrored(weights: WeightSummary) -> WeightSummary:
    """The same weights reflected in the centreline (y -> -y)."""
    lines = tuple(replace(line, y=-line.y) for line in weights.lines)
    return replace(weights, tcg=-weights.tcg, lines=lines)


def is_asymmetric(weights: WeightSummary) -> bool:
    """Whether G lies off the centreline (the hull itself is always symmetric)."""
    return abs(weights.tcg) > ASYMMETRY_M


@dataclass(frozen=True, eq=False)
class _Points:
    """Raw righting-arm values at some heel angles (no features)."""

    gz: FloatArray
    trim_deg: FloatArray
    low_freeboard: FloatArray
    converged: NDArray[np.bool_]
    h: FloatArray
    tau: FloatArray

    def part(self, index: slice) -> _Points:
        """The values at some of the angles."""
        return _Points(
            self.gz[index], self.trim_deg[index], self.low_freeboard[index],
            self.converged[index], self.h[index], self.tau[index],
        )


#: A point started between two solved heels must end this near its start, as a fraction
#: of the hull's depth (h, plus the trim's change over the length): else it jumped.
NEAR_START = 0.1



def _starboard_points(
    table: SectionTable,
    weights: WeightSummary,
    rho: float,
    base: Hydrostatics,
    heel_deg: FloatArray,
    free_trim: bool,
    start: Waterlines | None = None,
    chain: bool = True,
) -> _Points:
    """GZ, trim and low-side freeboard at heels >= 0 (starboard down).

    Newton's method starts from the upright waterline turned with the boat, or from
    ``start``.  With free trim the solutions are then followed heel by heel from
    upright (``chain``), so every heel stays on the boat's own branch; without
    ``chain`` (points between angles already solved, ``start`` interpolated from them)
    each one is followed from its own start.
    """
    phi = np.radians(heel_deg)
    frame = heel_frame(table, phi)
    c, s = frame.cos, frame.sin
    xi_g = c * weights.tcg + s * weights.vcg
    eta_g = c * weights.vcg - s * weights.tcg
    volume = weights.mass / rho
    turned = (base.h * c, base.tau * c)  # the upright waterline turned with the boat
    anchor = turned if chain or start is None else start
    solved = None
    if start is not None:
        solved = _solve_heels(table, frame, weights, volume, eta_g, start, anchor, free_trim, chain)
        if solved[4] and chain:  # the previous solutions branched off somewhere: afresh
            solved = None
    if solved is None:
        solved = _solve_heels(table, frame, weights, volume, eta_g, turned, turned, free_trim, True)
    h, tau, xi_b, conv, _ = solved
    gz = xi_b - xi_g - _loose_water_shift(table, frame, weights, rho, tau)
    gz = np.where(conv, gz, np.nan)
    # low (starboard) gunwale height above the heeled waterline at every station
    eta_gw = c[:, None] * table.gunwale_z[None] - s[:, None] * table.gunwale_y[None]
    low_fb = (eta_gw - (h[:, None] + tau[:, None] * table.x[None])).min(axis=1)
    low_fb = np.where(conv, low_fb, np.nan)
    return _Points(gz, np.degrees(np.arctan(tau)), low_fb, conv, h, tau)


def _solve_heels(
    table: SectionTable,
    frame: HeelFrame,
    weights: WeightSummary,
    volume: float,
    eta_g: FloatArray,
    start: Waterlines,
    anchor: Waterlines,
    free_trim: bool,
    chain: bool,
) -> tuple[FloatArray, FloatArray, FloatArray, NDArray[np.bool_], bool]:
    """(h, tau, xi_b, converged, repaired) at every heel, from ``start``.

    With free trim, Newton's method from ``start`` first; then the solutions are followed
    heel by heel from ``anchor`` (``chain``), which also settles most angles Newton left;
    without ``chain`` a solution must stay within ``NEAR_START`` of the hull's depth of
    its start.  Angles still without a floating position take the safeguarded path from the
    anchor, and then a restart from a level waterline.
    """
    eq = solve_equilibrium(
        table, frame, volume, weights.lcg, eta_g, start[0], start[1], free_trim, safeguard=False
    )
    repaired = False
    if free_trim and chain:
        eq, repaired = follow_branch(table, frame, volume, weights.lcg, eta_g, eq, *anchor)
    elif free_trim:  # started between solved neighbours: the solution stays near its start
        length = float(table.x[-1] - table.x[0])
        reach = NEAR_START * (frame.eta_high - frame.eta_low)
        near = np.abs(eq.h - start[0]) + length * np.abs(eq.tau - start[1]) <= reach
        eq = replace(eq, converged=eq.converged & near)
    for retry_start in ("anchor", "level"):
        bad = ~eq.converged
        if not bad.any():
            break
        idx = np.flatnonzero(bad)
        sub = frame.take(idx)
        if retry_start == "anchor":
            h0, tau0 = anchor[0][idx], anchor[1][idx]
        else:
            h0, tau0 = np.nan_to_num(level_waterline(table, sub, volume)), np.zeros(idx.size)
        retry = solve_equilibrium(table, sub, volume, weights.lcg, eta_g[idx], h0, tau0, free_trim)
        xi_b, tau, h, conv = eq.xi_b.copy(), eq.tau.copy(), eq.h.copy(), eq.converged.copy()
        xi_b[idx], tau[idx], h[idx], conv[idx] = retry.xi_b, retry.tau, retry.h, retry.converged
        eq = replace(eq, xi_b=xi_b, tau=tau, h=h, converged=conv)
    return eq.h, eq.tau, eq.xi_b, eq.converged, repaired


def curve_points(
    table: SectionTable,
    weights: WeightSummary,
    rho: float,
    base: Hydrostatics,
    heel_deg: FloatArray,
    free_trim: bool = True,
    start: Waterlines | None = None,
    chain: bool = True,
) -> _Points:
    """GZ, trim and low-side freeboard at signed heels (negative = port down).

    Port heels are solved as the mirror image: the boat with G reflected in the
    centreline heeled to starboard, GZ changing sign.  ``start`` and ``chain``: see
    :func:`_starboard_points`.
    """
    heel_deg = np.asarray(heel_deg, dtype=float)
    port = heel_deg < 0
    if not port.any():
        return _starboard_points(table, weights, rho, base, heel_deg, free_trim, start, chain)
    gz = np.full(heel_deg.size, np.nan)
    trim = np.full(heel_deg.size, np.nan)
    low = np.full(heel_deg.size, np.nan)
    conv = np.zeros(heel_deg.size, dtype=bool)
    h = np.full(heel_deg.size, np.nan)
    tau = np.full(heel_deg.size, np.nan)
    for mask, w, sign in ((~port, weights, 1.0), (port, _mirrored(weights), -1.0)):
        if mask.any():
            part = None if start is None else (start[0][mask], start[1][mask])
            p = _starboard_points(
                table, w, rho, base, np.abs(heel_deg[mask]), free_trim, part, chain
            )
            gz[mask], trim[mask] = sign * p.gz, p.trim_deg
            low[mask], conv[mask] = p.low_freeboard, p.converged
            h[mask], tau[mask] = p.h, p.tau
    return _Points(gz, trim, low, conv, h, tau)


def both_sides(heel_deg: FloatArray) -> FloatArray:
    """Heel angles mirrored to port: -max ... 0 ... max (ascending)."""
    pos = np.asarray(heel_deg, dtype=float)
    pos = pos[pos > 0]
    return np.concatenate([-pos[::-1], [0.0], pos])


def _first_crossing(a: FloatArray, f: FloatArray, rising: bool, after: float) -> int | None:
    """Index i of the first crossing of zero between a[i] and a[i+1] with a[i] >= after."""
    lo, hi = f[:-1], f[1:]
    with np.errstate(invalid="ignore"):
        hit = ((lo < 0) & (hi >= 0)) if rising else ((lo > 0) & (hi <= 0))
    hit &= a[:-1] >= after - 1e-12
    idx = np.flatnonzero(hit)
    return int(idx[0]) if idx.size else None


def _extra_angles(heel_deg: FloatArray, side: int, previous: FeatureTrack | None) -> FloatArray:
    """Angles (towards ``side``, ascending) to solve beside the grid ``heel_deg`` around
    the places ``previous`` expects the features: strictly inside the grid's range
    towards ``side`` and off its angles; none without three grid angles there."""
    towards = side * heel_deg
    if previous is None or previous.side != side or np.count_nonzero(towards >= 0) < 3:
        return np.empty(0)
    expected = previous.expected()
    wanted = np.unique([e + d for k, e in expected.items() for d in TRACK_PATTERN.get(k, ())])
    if not wanted.size:
        return wanted
    off_grid = np.abs(wanted[:, None] - towards[None, :]).min(axis=1) > 1e-9
    keep = (wanted > 0) & (wanted < towards.max()) & off_grid
    return np.asarray(wanted[keep], dtype=float)


def _with_starts(
    heel_deg: FloatArray, waterlines: Waterlines, angles: FloatArray, previous: FeatureTrack | None
) -> Waterlines:
    """``waterlines`` (at ``heel_deg``, ascending) followed by starts at ``angles``,
    interpolated between the solved ones and the extra angles of ``previous`` (NaN if
    fewer than two are solved)."""
    h, tau = waterlines
    at, h_at, tau_at = heel_deg, h, tau
    if previous is not None and previous.heel_deg.size:
        at = np.concatenate([heel_deg, previous.heel_deg])
        h_at, tau_at = np.concatenate([h, previous.h]), np.concatenate([tau, previous.tau])
        order = np.argsort(at, kind="stable")
        at, h_at, tau_at = at[order], h_at[order], tau_at[order]
    ok = np.isfinite(h_at) & np.isfinite(tau_at)
    if np.count_nonzero(ok) < 2:
        more = np.full(angles.size, np.nan)
        return np.concatenate([h, more]), np.concatenate([tau, more])
    at = at[ok]
    return (
        np.concatenate([h, np.interp(angles, at, h_at[ok])]),
        np.concatenate([tau, np.interp(angles, at, tau_at[ok])]),
    )


def righting_curve(
    table: SectionTable,
    weights: WeightSummary,
    rho: float,
    base: Hydrostatics,
    heel_deg: FloatArray,
    free_trim: bool = True,
    waterlines: Waterlines | None = None,
    previous: FeatureTrack | None = None,
) -> StabilityCurve:
    """GZ at every angle in ``heel_deg`` from exact heeled equilibrium, and its features.

    All angles are solved together by Newton's method, starting from the upright
    waterline turned with the boat, or from ``waterlines`` ((h, tau) at the same angles,
    from a nearby design's curve: the same solution in fewer steps).
    With free trim the solutions are then followed heel by heel from upright, so the
    curve stays on the boat's own branch (:func:`hydro.equilibrium.follow_branch`).
    Loose (bilge) water is a weight that moves: at each
    heel its surface is found inside the hull, parallel to the sea's, and the shift of its
    centre reduces GZ (thin-shell approximation; its fore-and-aft shift is ignored).  At
    small angles this is the free-surface correction FSC sin(phi); it also holds when the
    water reaches the floor's edge, where the FSC formula does not.

    Angles may be signed (negative = port down).  The features are taken on the side the
    boat lists towards, from the list: the list is where GZ comes back to zero rising
    (a stable equilibrium) going from upright in the direction G pulls it; max GZ, the
    vanishing angle and the range are measured from there.  The list, the largest
    righting arm and the vanishing angle are refined on the exact solver (not read off
    the grid) when the curve has three or more angles.

    ``previous``: where a nearby design's features lay (the previous frame of a drag);
    the angles refinement would ask about around each feature's expected place are
    solved with the curve's own (:data:`TRACK_PATTERN`), so that in a steady drag the
    refinement finds its features bracketed and needs no further solve.  Where a
    feature has moved elsewhere, refinement goes on as without them: the figures are
    the same either way, to well within 0.01 degree and 0.01 mm.
    """
    heel_deg = np.asarray(heel_deg, dtype=float)
    if waterlines is not None and waterlines[0].shape != heel_deg.shape:
        waterlines = None
    # the side G pulls the boat towards; upright symmetric boats count as starboard
    side = -1 if weights.tcg < -ASYMMETRY_M else 1
    extra = _extra_angles(heel_deg, side, previous)
    n_grid = heel_deg.size
    if extra.size:
        if waterlines is not None:
            waterlines = _with_starts(heel_deg, waterlines, side * extra, previous)
        both = curve_points(
            table, weights, rho, base, np.concatenate([heel_deg, side * extra]), free_trim,
            waterlines,
        )
        pts, more = both.part(slice(0, n_grid)), both.part(slice(n_grid, None))
    else:
        pts = curve_points(table, weights, rho, base, heel_deg, free_trim, waterlines)
        more = pts.part(slice(n_grid, None))
    extra_values = (side * more.gz, more.low_freeboard)
    gz, conv = pts.gz, pts.converged
    phi = np.radians(heel_deg)
    c, s = np.cos(phi), np.sin(phi)
    with np.errstate(invalid="ignore", divide="ignore"):
        tan = np.tan(phi)
        wall = np.where(
            np.abs(heel_deg) < 89.999,
            s * (base.gm + 0.5 * base.bm * tan**2) - weights.tcg * c,
            np.nan,
        )
    keep = side * heel_deg >= 0
    order = np.argsort(side * heel_deg[keep])
    a = (side * heel_deg[keep])[order]  # angles towards the listing side, ascending
    g = (side * gz[keep])[order]  # righting arm back towards upright
    fb = pts.low_freeboard[keep][order]
    refine = a.size >= 3

    h_side, tau_side = pts.h[keep][order], pts.tau[keep][order]
    solved = np.isfinite(h_side)

    def evaluate(angles: FloatArray) -> tuple[FloatArray, FloatArray]:
        """GZ and low-side freeboard between solved angles, each started from its
        neighbours' solutions."""
        guess = None
        if solved.sum() >= 2:
            at = a[solved]
            guess = (np.interp(angles, at, h_side[solved]), np.interp(angles, at, tau_side[solved]))
        p = curve_points(table, weights, rho, base, side * angles, free_trim, guess, chain=False)
        return side * p.gz, p.low_freeboard

    def with_extra(feature: _Feature, lo: float, hi: float) -> _Feature:
        """The feature with the extra angles solved strictly between lo and hi."""
        inside = (extra > lo) & (extra < hi)
        if inside.any():
            feature.samples.add(extra[inside], extra_values[feature.series][inside])
        return feature

    def crossing_at(i: int, series: int, f: FloatArray, rising: bool) -> Crossing:
        """A crossing of f between a[i] and a[i + 1], from the samples around it."""
        near = slice(max(i - 1, 0), min(i + 3, a.size))
        lo, hi = float(a[i]), float(a[i + 1])
        return with_extra(Crossing(series, lo, hi, a[near], f[near], rising=rising), lo, hi)

    features: dict[str, Crossing | Peak] = {}
    if not is_asymmetric(weights) and base.gm > 0:
        list_i: int | None = -1  # upright
    else:
        list_i = _first_crossing(a, g, rising=True, after=0.0)
    if list_i is not None and list_i >= 0 and refine:
        features["list"] = crossing_at(list_i, 0, g, rising=True)
    start = 0.0 if list_i is None or list_i < 0 else float(a[list_i + 1])
    finite = np.isfinite(g) & (a >= start - 1e-12)
    i_max = int(np.nanargmax(np.where(finite, g, -np.inf))) if finite.any() else 0
    if refine and finite.any():
        near = slice(max(i_max - 2, 0), i_max + 3)
        peak = Peak(0, start, float(a[-1]), a[near], g[near])
        # extra angles only around the grid's best sample: the same top is refined
        lo, hi = float(a[max(i_max - 1, 0)]), float(a[min(i_max + 1, a.size - 1)])
        features["peak"] = with_extra(peak, max(lo, start), hi)
    avs_i = _first_crossing(a, g, rising=False, after=start) if list_i is not None else None
    if avs_i is not None and refine:
        features["avs"] = crossing_at(avs_i, 0, g, rising=False)
    gunwale_i = _first_crossing(a, fb, rising=False, after=0.0) if base.min_freeboard > 0 else None
    if gunwale_i is not None and refine:
        features["gunwale"] = crossing_at(gunwale_i, 1, fb, rising=False)
    found = refine_features(evaluate, features) if features else {}

    def crossing(i: int, f: FloatArray, rising: bool) -> float:
        return _crossings(a[i : i + 2], f[i : i + 2], rising)[0]

    def refined(name: str, i: int, f: FloatArray, rising: bool) -> float:
        value = found.get(name)
        return value if isinstance(value, float) else crossing(i, f, rising)

    if list_i is None:
        list_a: float | None = None
    elif list_i < 0:
        list_a = 0.0
    else:
        list_a = refined("list", list_i, g, True)
    if avs_i is None:
        avs_a = None if list_a is not None else 0.0
    else:
        avs_a = refined("avs", avs_i, g, False)
    max_a, max_g = (float(a[i_max]), float(g[i_max])) if finite.any() else (0.0, math.nan)
    best = found.get("peak")
    if isinstance(best, tuple) and best[1] >= max_g:
        max_a, max_g = best
    if base.min_freeboard <= 0:
        gunwale: float | None = 0.0
    else:
        gunwale = None if gunwale_i is None else refined("gunwale", gunwale_i, fb, False)

    def signed(v: float | None) -> float | None:
        return None if v is None else side * v + 0.0

    now = {k: v if isinstance(v, float) else v[0] for k, v in found.items() if v is not None}
    same_side = previous is not None and previous.side == side
    before = previous.now if previous is not None and same_side else {}
    track = FeatureTrack(side, now, before, side * extra, more.h, more.tau)

    list_deg = signed(list_a)
    uptos = (30.0, 40.0) if gunwale is None else (30.0, 40.0, gunwale)
    area_30, area_40, *more_areas = curve_areas(a, g, uptos)
    area_to_gunwale = more_areas[0] if more_areas else None
    return StabilityCurve(
        heel_deg=heel_deg,
        gz=gz,
        wall_sided=wall,
        righting_moment=weights.mass * G_STANDARD * gz,
        trim_deg=pts.trim_deg,
        low_freeboard=pts.low_freeboard,
        converged=conv,
        gunwale_immersion_deg=signed(gunwale),
        max_gz=max_g,
        max_gz_deg=side * max_a + 0.0,
        avs_deg=signed(avs_a),
        loll_deg=list_deg if base.gm <= 0 else None,
        area_30=area_30,
        area_40=area_40,
        area_to_gunwale=area_to_gunwale,
        list_deg=list_deg,
        side=side,
        waterlines=(pts.h, pts.tau),
        track=track,
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
    for _ in range(200):  # halving a finite range to 0.1 kg never needs more
        if not hi - lo > 0.1:
            break
        mid = 0.5 * (lo + hi)
        if freeboard(mid) > 0:
            lo = mid
        else:
            hi = mid
    return lo


def _resampled(curve: StabilityCurve, angles: FloatArray) -> Waterlines | None:
    """The curve's waterlines at other heel angles (a drag's coarser grid, or the full
    one after it), interpolated between its solved angles; None when it does not span
    them."""
    if curve.waterlines is None:
        return None
    if np.array_equal(curve.heel_deg, angles):
        return curve.waterlines
    h, tau = curve.waterlines
    ok = np.isfinite(h) & np.isfinite(tau)
    at = curve.heel_deg[ok]
    if at.size < 2 or angles.min() < at[0] - 1e-9 or angles.max() > at[-1] + 1e-9:
        return None
    return np.interp(angles, at, h[ok]), np.interp(angles, at, tau[ok])


def _carried_on(now: Waterlines, before: Waterlines) -> Waterlines:
    """Waterlines one more frame on at the pace from ``before`` to ``now`` (a drag moves
    steadily): the next frame's starts; ``now`` where ``before`` does not match."""
    if before[0].shape != now[0].shape:
        return now
    with np.errstate(invalid="ignore"):
        h, tau = 2 * now[0] - before[0], 2 * now[1] - before[1]
    ok = np.isfinite(h) & np.isfinite(tau)
    return np.where(ok, h, now[0]), np.where(ok, tau, now[1])


def analyse_table(
    table: SectionTable,
    weights: WeightSummary,
    rho: float,
    heel_deg: FloatArray,
    free_trim: bool = True,
    open_boat: bool = True,
    start: Analysis | None = None,
) -> Analysis:
    """Upright hydrostatics, the GZ curve (both sides when G is off the centreline) and
    the one status of the loaded boat (see :class:`Status`).

    ``start``: an analysis of a nearby design (the previous frame of a drag); the solver
    starts from its floating positions (carried on at the drag's pace when ``start``
    itself followed a frame) and reaches the same figures in fewer steps.
    """
    capacity = float(table.totals[0] @ table.weights) * rho
    near = start.hydrostatics if start is not None else None
    previous = start.curve if start is not None else None
    track = None if previous is None else previous.track
    here = None if near is None else (near.h, near.tau)
    before = None if track is None else track.upright_before
    ahead = None
    if here is not None and before is not None:
        ahead = (2 * here[0] - before[0], 2 * here[1] - before[1])
    base = upright(table, weights, rho, free_trim, ahead or here)
    if base is None:
        return Analysis(Status.SINKS, weights, None, None, capacity_kg=capacity)
    angles = both_sides(heel_deg) if is_asymmetric(weights) else np.asarray(heel_deg, float)
    warm = None if previous is None else _resampled(previous, angles)
    starts = warm
    if warm is not None and track is not None and track.grid_before is not None:
        starts = _carried_on(warm, track.grid_before)
    curve = righting_curve(table, weights, rho, base, angles, free_trim, starts, track)
    if curve.track is not None:
        curve = replace(curve, track=replace(curve.track, grid_before=warm, upright_before=here))
    if curve.list_deg is None:
        status = Status.CAPSIZES
    elif base.min_freeboard <= 0:
        limit = flooding_mass(table, weights, rho)
        return Analysis(Status.FLOODS, weights, base, curve, limit, capacity)
    elif base.gm <= 0:
        status = Status.UNSTABLE
    elif (
        open_boat
        and curve.gunwale_immersion_deg is not None
        and abs(curve.gunwale_immersion_deg) <= abs(curve.list_deg)
    ):
        status = Status.FLOODS
    else:
        status = Status.OK
    return Analysis(status, weights, base, curve, capacity_kg=capacity)
