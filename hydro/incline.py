"""The inclining test: GM and KG measured from weights moved across the boat.

GM = w d / (Delta tan(theta)), with the wall-sided correction - BM tan^2(theta) / 2
(Barrass & Derrett, Ship Stability for Masters and Mates; IMO 2008 IS Code Part B ch. 8
and Annex 1).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Sequence

import numpy as np
from numpy.typing import NDArray

from hydro.design import Design, analyse_stations, check_context
from hydro.equilibrium import solve_equilibrium
from hydro.errors import HullwrightError, LoadError
from hydro.loads import Loads, MassItem, WeightSummary, weight_build_up
from hydro.sections import cut, heel_frame
from hydro.stability import Hydrostatics, hydrostatics_at, upright

__all__ = [
    "MAX_INCLINE_DEG",
    "InclineReading",
    "InclineResult",
    "apply_inclining",
    "inclining_test",
    "waterline_from_freeboards",
]

FloatArray = NDArray[np.float64]

#: Largest heel the inclining test should use: IS Code practice is 1-4 degrees per side.
MAX_INCLINE_DEG = 4.0


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
    stations, table, rho = check_context(design)
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
    exact for a wall-sided hull (Barrass & Derrett, "The inclining experiment"; Tupper,
    *Introduction to Naval Architecture* ch. 4, wall-sided formula).
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
        stations, table, rho = check_context(design)
        probe = Loads(items=(MassItem("as weighed", displacement, 0.5 * (table.x[0] + table.x[-1]), 0.0, table.keel_z),))
        weights = weight_build_up(probe, stations, rho)
        floating = upright(table, weights, rho, free_trim=True)
        if floating is None:
            raise LoadError("the hull cannot float that mass")
        hs = floating
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
    stations = design.stations()
    gunwale_kg = float(np.max(stations.gunwale[:, 1])) - stations.keel_z
    if not math.isfinite(kg):
        raise LoadError("the readings give no finite KG: check the weights, distances and heels")
    if kg < 0:
        warnings.append(
            f"the measured KG ({kg * 1000:.0f} mm) is below the keel, which cannot be: check the "
            "weighed mass, the weights' distances and the heel readings"
        )
    elif kg > gunwale_kg:
        warnings.append(
            f"the measured KG ({kg * 1000:.0f} mm) is above the gunwale ({gunwale_kg * 1000:.0f} mm): "
            "check the weighed mass, the weights' distances and the heel readings"
        )
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
