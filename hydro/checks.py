"""The builder's checks: crew shift, boarding, inclining test, beam for a target GM,
level trim, sensitivity, reserve buoyancy and swamping.

Each check returns a frozen dataclass with its numbers and a one-line ``message`` in
plain words.  Formulas (REFERENCES §1): heeling arm of a transverse weight shift
HA = (w d cos(phi) + w h sin(phi)) / Delta (Britannica "naval architecture - stability";
Barrass & Derrett "List"); inclining experiment GM = w d / (Delta tan(theta)), with the
wall-sided correction - BM tan^2(theta) / 2 (Barrass & Derrett; IMO 2008 IS Code Part B
ch. 8 and Annex 1); trim from a weight build-up (Barrass & Derrett "Trim").
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Sequence

import numpy as np
from numpy.typing import NDArray

from hydro.design import TARGET_GM_M, Design, analyse_stations
from hydro.equilibrium import solve_equilibrium
from hydro.errors import HullwrightError, LoadError
from hydro.hull import HullSketch, Stations, scale_breadth
from hydro.loads import (
    CREW_MASS_KG,
    HEAVY_CREW_MASS_KG,
    Loads,
    MassItem,
    Material,
    WeightSummary,
    shell_panels,
    weight_build_up,
)
from hydro.sections import SectionTable, build_section_table, cut, heel_frame
from hydro.stability import Analysis, Hydrostatics, StabilityCurve, hydrostatics_at, righting_curve, upright

__all__ = [
    "BODY_HALF_WIDTH_M",
    "MIN_SHIFTED_FREEBOARD_M",
    "TARGET_GM_M",
    "HeelCheck",
    "crew_shift",
    "boarding",
    "InclineReading",
    "InclineResult",
    "inclining_test",
    "waterline_from_freeboards",
    "apply_inclining",
    "apply_level_trim",
    "BeamResult",
    "beam_for_gm",
    "TrimResult",
    "level_trim",
    "SensitivityRow",
    "sensitivity",
    "SwampResult",
    "swamping",
    "MATERIAL_SWAMPED_DENSITY",
]

FloatArray = NDArray[np.float64]

#: Low-side freeboard to keep with the crew shifted: MCA MGN 280 §11.4 asks 75 mm to a
#: watertight deck in its heeling test; used here for open boats (common practice).
MIN_SHIFTED_FREEBOARD_M = 0.075
#: A seated person's CG stays this far inboard of the hull side (common practice, no
#: source: about half a body width).
BODY_HALF_WIDTH_M = 0.15
#: Largest heel the inclining test should use: IS Code practice is 1-4 degrees per side.
MAX_INCLINE_DEG = 4.0

#: Effective density of shell materials once waterlogged (kg/m^3), for the swamped
#: check.  All from memory / common practice: soaked corrugated board and tape sink,
#: plywood and epoxy-sheathed plywood float slightly.
MATERIAL_SWAMPED_DENSITY: dict[str, float] = {
    "corrugated": 1100.0,
    "tape": 1150.0,
    "paint": 1400.0,
    "plywood": 600.0,
    "glass": 1800.0,
    "foam": 40.0,
}


def _context(design: Design) -> tuple[Stations, SectionTable, float]:
    stations = design.stations()
    return stations, build_section_table(stations), design.water_density


# ----------------------------------------------------------------------------- heel


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
        offset-load test of ISO 12217-3 / MCA MGN 280 §11.4
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
    stations, table, rho = _context(design)
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
    stations, table, rho = _context(design)
    x = 0.5 * (stations.x[0] + stations.x[-1]) if x is None else x
    if not stations.x[0] <= x <= stations.x[-1]:
        raise LoadError("the boarding position must lie along the hull")
    b, sheer = _seat_gunwale(stations, x)
    loads = replace(design.loads, items=design.loads.items + (MassItem("person boarding", mass, x, 0.0, sheer),))
    analysis = analyse_stations(stations, loads, rho, design.settings, table)
    if analysis.hydrostatics is None:
        raise LoadError(analysis.message)
    return _heel_check(f"Boarding ({mass:.0f} kg on the gunwale)", table, analysis, rho, mass, mass * b, 0.0)


# ----------------------------------------------------------------------------- incline


@dataclass(frozen=True)
class InclineReading:
    """One weight movement of an inclining test.

    ``distance`` is signed: positive moves the weight to starboard (heel to starboard
    positive).  Give the heel in degrees, or the pendulum length and its deflection
    (same units, deflection positive to starboard).
    """

    mass: float
    distance: float
    heel_deg: float | None = None
    pendulum_length: float | None = None
    deflection: float | None = None

    def tan_heel(self) -> float:
        if self.heel_deg is not None:
            return math.tan(math.radians(self.heel_deg))
        if self.pendulum_length and self.deflection is not None:
            return self.deflection / self.pendulum_length
        raise LoadError("each reading needs a heel angle or a pendulum length and deflection")


@dataclass(frozen=True, eq=False)
class InclineResult:
    """Measured GM and KG from an inclining test.

    Attributes
    ----------
    gm : fitted GM (m)
    km : KM at the measured waterline (m)
    kg : measured KG = KM - GM (m above K)
    displacement : Delta during the test (kg)
    lcb : LCB at the test waterline (m): the boat's LCG when it floats freely
    per_reading_gm : (N,) GM implied by each reading alone
    tan_heel : (N,)
    corrected : whether the wall-sided correction was applied
    predicted_kg : KG from the weight build-up, for comparison (None if not given)
    warnings : plain-word warnings (too few, too large, inconsistent readings)
    message : one line
    """

    gm: float
    km: float
    kg: float
    displacement: float
    lcb: float
    per_reading_gm: FloatArray
    tan_heel: FloatArray
    corrected: bool
    predicted_kg: float | None
    warnings: tuple[str, ...]
    message: str


def waterline_from_freeboards(
    design: Design, freeboard_aft: float, freeboard_fore: float
) -> Hydrostatics:
    """Hydrostatics of the boat floating upright with measured freeboards at its ends.

    The water is at the sheer height minus the freeboard at the aft and forward
    stations; the displacement follows from the immersed volume (Archimedes).
    """
    stations, table, rho = _context(design)
    for fb in (freeboard_aft, freeboard_fore):
        if not math.isfinite(fb):
            raise LoadError("freeboards must be numbers")
    x0, x1 = table.x[0], table.x[-1]
    z_aft = table.gunwale_z[0] - freeboard_aft
    z_fore = table.gunwale_z[-1] - freeboard_fore
    tau = (z_fore - z_aft) / (x1 - x0)
    h = z_aft - tau * x0
    frame = heel_frame(table, np.zeros(1))
    c = cut(table, frame, (h + tau * table.x)[None, :])
    vol = float(c.area[0] @ table.weights)
    if vol <= 0 or not float(c.breadth[0] @ table.weights) > 0:
        raise LoadError("with those freeboards the boat would not touch the water, or would be under it")
    x_b = float(c.area[0] @ table.weights_x) / vol
    weights = WeightSummary((), rho * vol, x_b, 0.0, table.keel_z, 0.0)  # G unknown: KG 0
    eq = solve_equilibrium(table, frame, vol, x_b, np.array([table.keel_z]), np.array([h]), np.array([tau]), free_trim=False)
    return hydrostatics_at(table, weights, rho, eq)


def inclining_test(
    design: Design,
    readings: Sequence[InclineReading],
    displacement: float | None = None,
    freeboards: tuple[float, float] | None = None,
    wall_sided_correction: bool = True,
) -> InclineResult:
    """Fit GM from all readings (least squares through the origin) and KG = KM - GM.

    The displacement comes from the weighed mass (``displacement``, kg, with the boat
    level) or from freeboards measured at the aft and forward ends.  With the
    correction, each reading obeys  w d = Delta tan(theta) (GM + BM tan^2(theta) / 2),
    exact for a wall-sided hull (Barrass & Derrett; REFERENCES §2).
    """
    if (displacement is None) == (freeboards is None):
        raise LoadError("give either the weighed mass or the two measured freeboards")
    if not readings:
        raise LoadError("enter at least one reading")
    moments = np.array([r.mass * r.distance for r in readings], dtype=float)
    tans = np.array([r.tan_heel() for r in readings], dtype=float)
    if not np.all(np.isfinite(moments)) or not np.all(np.isfinite(tans)):
        raise LoadError("a reading is not a number")
    if np.any(np.array([r.mass for r in readings]) <= 0):
        raise LoadError("each test weight must have a positive mass")
    if np.any(tans == 0) or np.any(moments == 0):
        raise LoadError("a reading has no heel or no moment: every reading must move a weight and heel the boat")
    if np.any(np.sign(tans) != np.sign(moments)):
        raise LoadError("a reading heels the boat against the weight's move: check the signs")
    if freeboards is not None:
        hs = waterline_from_freeboards(design, *freeboards)
    else:
        assert displacement is not None
        if not (math.isfinite(displacement) and displacement > 0):
            raise LoadError("the weighed mass must be positive")
        stations, table, rho = _context(design)
        probe = Loads(items=(MassItem("as weighed", displacement, 0.5 * (table.x[0] + table.x[-1]), 0.0, table.keel_z),))
        weights = weight_build_up(probe, stations, rho)
        hs = upright(table, weights, rho, free_trim=True)
        if hs is None:
            raise LoadError("the hull cannot float that mass")
    delta = hs.displacement
    bm = hs.bm if wall_sided_correction else 0.0
    target = moments - 0.5 * delta * bm * tans**3
    gm = float(target @ tans / (delta * tans @ tans))
    per = moments / (delta * tans) - 0.5 * bm * tans**2
    warnings = []
    if len(readings) < 4:
        warnings.append(f"only {len(readings)} reading(s): use at least 4, to both sides (IMO IS Code practice uses 8 moves)")
    if np.all(tans > 0) or np.all(tans < 0):
        warnings.append("all readings heel to one side: move the weights to both sides")
    big = np.degrees(np.arctan(np.abs(tans))) > MAX_INCLINE_DEG
    if big.any():
        warnings.append(f"{int(big.sum())} reading(s) heel beyond {MAX_INCLINE_DEG:.0f} deg: keep heels small")
    if len(readings) >= 2 and gm > 0:
        spread = np.max(np.abs(per - gm)) / gm
        if spread > 0.10:
            warnings.append(f"readings disagree by up to {spread * 100:.0f} % of GM: check for wind, water aboard or moving people")
    if gm <= 0:
        warnings.append("the fitted GM is not positive: the boat is unstable or the readings are wrong")
    predicted = None
    try:
        predicted = analyse_stations(design.stations(), design.loads, design.water_density, design.settings).weights.kg
    except HullwrightError:
        predicted = None
    kg = hs.km - gm
    msg = f"Measured GM {gm * 1000:.0f} mm, KG {kg * 1000:.0f} mm at {delta:.1f} kg"
    if predicted is not None:
        msg += f" (design estimate KG {predicted * 1000:.0f} mm)"
    msg += "." if not warnings else f"; {len(warnings)} warning(s)."
    return InclineResult(gm, hs.km, kg, delta, hs.lcb, per, tans, wall_sided_correction, predicted, tuple(warnings), msg)


def apply_inclining(design: Design, result: InclineResult) -> Design:
    """The design with its boat weight replaced by the inclined boat.

    Materials and items (the boat as built) give way to one item: the test
    displacement at the measured KG and the test LCB.  Crew stay as they are.
    """
    stations = design.stations()
    item = MassItem("boat as inclined (measured)", result.displacement, result.lcb, 0.0, stations.keel_z + result.kg)
    return replace(design, loads=replace(design.loads, items=(item,), materials=(), wet_factor=1.0))


# ----------------------------------------------------------------------------- beam


@dataclass(frozen=True)
class BeamResult:
    """The uniform breadth scale that gives a target GM."""

    target_gm: float
    factor: float | None
    beam_before: float
    beam_after: float | None
    gm_before: float
    gm_after: float | None
    message: str


def _upright_gm(design: Design) -> tuple[float, float] | None:
    stations = design.stations()
    table = build_section_table(stations)
    rho = design.water_density
    weights = weight_build_up(design.loads, stations, rho)
    hs = upright(table, weights, rho)
    if hs is None:
        return None
    return hs.gm, 2 * stations.max_half_breadth


def beam_for_gm(design: Design, target: float = TARGET_GM_M, tolerance: float = 1e-4) -> BeamResult:
    """Scale every half-breadth by one factor (0.3 to 3) so that GM = target (+- tolerance m).

    Materials follow the new surface, crew stay where they sit.  Solved by bisection
    with secant steps on the factor.
    """
    if not isinstance(design.hull, HullSketch):
        raise LoadError("the beam aid works on a sketched hull, not on a fixed table of offsets")
    if not (math.isfinite(target) and -1 < target < 5):
        raise LoadError("the target GM must be between -1 and 5 m")

    def gm_at(k: float) -> float | None:
        try:
            r = _upright_gm(replace(design, hull=scale_breadth(design.hull, k)))
        except HullwrightError:
            return None
        return None if r is None else r[0]

    now = _upright_gm(design)
    if now is None:
        raise LoadError("the design does not float upright as it is")
    gm0, beam0 = now
    lo, hi = 0.3, 3.0
    f_lo, f_hi = gm_at(lo), gm_at(hi)
    if f_lo is None or f_hi is None or (f_lo - target) * (f_hi - target) > 0:
        return BeamResult(target, None, beam0, None, gm0, None,
                          f"No beam between 0.3x and 3x the present one gives GM = {target * 1000:.0f} mm.")
    k = 1.0
    f_k = gm0
    for _ in range(60):
        if abs(f_k - target) <= tolerance:
            break
        if (f_k - target) * (f_lo - target) > 0:
            lo, f_lo = k, f_k
        else:
            hi, f_hi = k, f_k
        k_new = lo + (target - f_lo) * (hi - lo) / (f_hi - f_lo)
        k = k_new if lo < k_new < hi else 0.5 * (lo + hi)
        got = gm_at(k)
        f_k = got if got is not None else f_lo
    beam = beam0 * k
    return BeamResult(target, k, beam0, beam, gm0, f_k,
                      f"GM reaches {f_k * 1000:.0f} mm at a beam of {beam * 1000:.0f} mm (x{k:.3f}); "
                      f"the present {beam0 * 1000:.0f} mm gives {gm0 * 1000:.0f} mm.")


# ----------------------------------------------------------------------------- trim


@dataclass(frozen=True)
class TrimResult:
    """Where to put a crew member or an item so the boat floats level."""

    what: str
    index: int
    x_before: float
    x_after: float | None
    trim_before_deg: float
    trim_after_deg: float | None
    freeboard_aft: float | None
    freeboard_fore: float | None
    message: str


def level_trim(design: Design, crew_index: int | None = 0, item_index: int | None = None,
               tolerance_deg: float = 0.01) -> TrimResult:
    """Seat position of one crew member (or position of one item) for zero trim.

    Solved by bisection with secant steps on x over the hull's length; the trim is
    from the free-trim upright equilibrium, so LCB moves with the draft.
    """
    loads = design.loads
    if item_index is not None:
        if not 0 <= item_index < len(loads.items):
            raise LoadError("choose an item from the load list")
        what, idx, x_now = loads.items[item_index].name, item_index, loads.items[item_index].x
    else:
        if crew_index is None or not 0 <= crew_index < len(loads.crew):
            raise LoadError("choose a crew member from the load list")
        what, idx, x_now = loads.crew[crew_index].name, crew_index, loads.crew[crew_index].x
    stations, table, rho = _context(design)
    panels = shell_panels(stations) if loads.materials else None

    def moved(x: float) -> Loads:
        if item_index is not None:
            items = list(loads.items)
            items[idx] = replace(items[idx], x=x)
            return replace(loads, items=tuple(items))
        crew = list(loads.crew)
        crew[idx] = replace(crew[idx], x=x)
        return replace(loads, crew=tuple(crew))

    def trim(x: float) -> Hydrostatics | None:
        return upright(table, weight_build_up(moved(x), stations, rho, panels), rho)

    here = trim(x_now)
    if here is None:
        raise LoadError("the design does not float upright as it is")
    x0, x1 = float(stations.x[0]), float(stations.x[-1])
    # grow a bracket outwards from where it sits now, staying where the boat floats
    lo = hi = x_now
    f_lo = f_hi = here.trim_deg
    step = 0.02 * (x1 - x0)
    found = abs(here.trim_deg) <= tolerance_deg
    while not found and step < (x1 - x0):
        for trial in (x_now - step, x_now + step):
            if not x0 <= trial <= x1:
                continue
            got = trim(trial)
            if got is None or np.sign(got.trim_deg) == np.sign(here.trim_deg):
                continue
            lo, f_lo, hi, f_hi = (trial, got.trim_deg, x_now, here.trim_deg) if trial < x_now else (x_now, here.trim_deg, trial, got.trim_deg)
            found = True
            break
        step *= 1.6
    if not found:
        return TrimResult(what, idx, x_now, None, here.trim_deg, None, None, None,
                          f"Moving {what} alone cannot level the boat.")
    x, hs = x_now, here
    for _ in range(60):
        if abs(hs.trim_deg) <= tolerance_deg:
            break
        x_new = lo - f_lo * (hi - lo) / (f_hi - f_lo)
        x = x_new if lo < x_new < hi else 0.5 * (lo + hi)
        got = trim(x)
        if got is None:
            break
        hs = got
        if (hs.trim_deg > 0) == (f_lo > 0):
            lo, f_lo = x, hs.trim_deg
        else:
            hi, f_hi = x, hs.trim_deg
    fb = hs.freeboard
    return TrimResult(what, idx, x_now, x, here.trim_deg, hs.trim_deg, float(fb[0]), float(fb[-1]),
                      f"Put {what} at x = {x:.2f} m (now {x_now:.2f} m): trim {hs.trim_deg:+.2f} deg, "
                      f"freeboard aft {fb[0] * 1000:.0f} mm, fore {fb[-1] * 1000:.0f} mm.")


def apply_level_trim(design: Design, result: TrimResult, is_item: bool = False) -> Design:
    """The design with the crew member (or item) moved to the level-trim position."""
    if result.x_after is None:
        raise LoadError(result.message)
    loads = design.loads
    if is_item:
        items = list(loads.items)
        items[result.index] = replace(items[result.index], x=result.x_after)
        return replace(design, loads=replace(loads, items=tuple(items)))
    crew = list(loads.crew)
    crew[result.index] = replace(crew[result.index], x=result.x_after)
    return replace(design, loads=replace(loads, crew=tuple(crew)))


# ----------------------------------------------------------------------------- sensitivity


@dataclass(frozen=True)
class SensitivityRow:
    """The readout under one variation of the load."""

    case: str
    displacement: float | None
    gm: float | None
    min_freeboard: float | None
    gunwale_immersion_deg: float | None
    status: str


def sensitivity(design: Design, wet_factor: float = 1.5, heavy_crew: float = HEAVY_CREW_MASS_KG,
                bilge_depth: float = 0.03) -> tuple[SensitivityRow, ...]:
    """GM, least freeboard and gunwale-immersion angle as built, soaked, with heavier
    crew (46 CFR 170.090: 84 kg), with bilge water, and all three together."""
    loads = design.loads
    heavier = tuple(replace(c, mass=max(c.mass, heavy_crew)) for c in loads.crew)
    cases = [
        ("as designed", loads),
        (f"soaked materials (x{wet_factor:g})", replace(loads, wet_factor=loads.wet_factor * wet_factor)),
        (f"crew at {heavy_crew:g} kg each", replace(loads, crew=heavier)),
        (f"{bilge_depth * 1000:.0f} mm bilge water", replace(loads, bilge_water_depth=loads.bilge_water_depth + bilge_depth)),
        ("all three", replace(loads, wet_factor=loads.wet_factor * wet_factor, crew=heavier,
                              bilge_water_depth=loads.bilge_water_depth + bilge_depth)),
    ]
    stations, table, rho = _context(design)
    rows = []
    for name, ld in cases:
        a = analyse_stations(stations, ld, rho, design.settings, table)
        h, c = a.hydrostatics, a.curve
        rows.append(SensitivityRow(
            name, a.weights.mass,
            h.gm if h else None,
            h.min_freeboard if h else None,
            c.gunwale_immersion_deg if c else None,
            a.status,
        ))
    return tuple(rows)


# ----------------------------------------------------------------------------- swamping


@dataclass(frozen=True)
class SwampResult:
    """Reserve buoyancy and what happens when the hull fills.

    Attributes
    ----------
    reserve_volume : hull volume between the waterline and the gunwale (m^3) (for a
        decked hull the deck is at the sheer, so this is also the reserve to the deck)
    reserve_mass : rho x reserve volume (kg): how much more it could carry level
    reserve_fraction : reserve / whole hull volume
    swamped_net_buoyancy : buoyancy of the structure minus its weight when full of
        water (kg, > 0 floats); crew are taken as neutrally buoyant swimmers
    floats_swamped : bool, or None when the hull is closed (it cannot fill)
    message : plain words, pointing to life jackets
    """

    reserve_volume: float
    reserve_mass: float
    reserve_fraction: float
    swamped_net_buoyancy: float
    floats_swamped: bool | None
    message: str


def _swamped_density(m: Material) -> float | None:
    name = m.name.lower()
    for key, rho in MATERIAL_SWAMPED_DENSITY.items():
        if key in name:
            return rho
    return None


def swamping(design: Design, analysis: Analysis | None = None) -> SwampResult:
    """Reserve buoyancy to the gunwale, and whether the open hull floats when full.

    Materials whose name says what they are (corrugated board, tape, paint, plywood,
    glass, foam) take a waterlogged density from ``MATERIAL_SWAMPED_DENSITY``; others
    and all items count as giving no buoyancy (the safe side).
    """
    stations, table, rho = _context(design)
    analysis = analysis or analyse_stations(stations, design.loads, rho, design.settings, table)
    total = float(table.totals[0] @ table.weights)
    h = analysis.hydrostatics
    reserve = max(total - h.volume, 0.0) if h is not None else 0.0
    net = 0.0
    for line in analysis.weights.lines:
        if line.kind == "material":
            mat = next((m for m in design.loads.materials if m.name == line.name), None)
            dens = _swamped_density(mat) if mat else None
            net += line.mass * (rho / dens - 1.0) if dens else -line.mass
        elif line.kind == "item":
            net -= line.mass
    closed = not design.settings.open_boat
    if closed:
        floats = None
        msg = (f"Reserve buoyancy {rho * reserve:.0f} kg ({100 * reserve / total:.0f} % of the hull). "
               "Closed hull: it cannot fill while its deck and seams hold; still wear life jackets.")
    else:
        floats = net > 0
        msg = f"Reserve buoyancy to the gunwale {rho * reserve:.0f} kg ({100 * reserve / total:.0f} % of the hull). "
        msg += ("Swamped, the hull still floats itself and its fittings, but not the crew: wear life jackets."
                if floats else
                "Swamped, the hull sinks: there is no flotation but the crew's life jackets - wear them.")
    return SwampResult(reserve, rho * reserve, reserve / total if total else 0.0, net, floats, msg)
