"""Design aids: the beam that gives a target GM, and where to seat a person (or put an
item) so the boat floats level (trim from a weight build-up: Barrass & Derrett, Ship
Stability for Masters and Mates, "Trim").
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from hydro.design import TARGET_GM_M, Design, check_context
from hydro.errors import HullwrightError, LoadError
from hydro.hull import HullSketch, scale_breadth
from hydro.loads import Loads, shell_panels, weight_build_up
from hydro.sections import build_section_table
from hydro.stability import Hydrostatics, upright
from hydro.wording import beam_text, trim_text

#: Narrowest and widest beam the aid tries, as factors on the present beam.
BEAM_FACTORS_LOW = 0.3
BEAM_FACTORS = (BEAM_FACTORS_LOW, 3.0)

__all__ = [
    "TARGET_GM_M",
    "BeamResult",
    "TrimResult",
    "apply_level_trim",
    "beam_for_gm",
    "level_trim",
]


@dataclass(frozen=True)
class BeamResult:
    """The uniform breadth scale that gives a target GM.

    ``narrowest`` is the smallest factor tried: 0.3, or the narrowest beam that still
    floats the load with the gunwale clear.  ``factor`` is None when no beam from there
    to 3x gives the target.
    """

    target_gm: float
    factor: float | None
    beam_before: float
    beam_after: float | None
    gm_before: float
    gm_after: float | None
    narrowest: float = BEAM_FACTORS_LOW

    @property
    def message(self) -> str:
        """One line, metric (see :func:`hydro.wording.beam_text`)."""
        return beam_text(self)


def _upright_gm(design: Design) -> tuple[float, float] | None:
    """Upright GM and beam, or None when the load does not float with the gunwale clear."""
    stations = design.stations()
    table = build_section_table(stations)
    rho = design.water_density
    weights = weight_build_up(design.loads, stations, rho)
    hs = upright(table, weights, rho)
    if hs is None or hs.min_freeboard <= 0:
        return None
    return hs.gm, 2 * stations.max_half_breadth


def beam_for_gm(design: Design, target: float = TARGET_GM_M, tolerance: float = 1e-4) -> BeamResult:
    """Scale every half-breadth by one factor (0.3 to 3) so that GM = target (+- tolerance m).

    Materials follow the new surface, crew stay where they sit.  A narrow trial beam may
    not float the load at all (a heavily loaded box goes under at 0.3x), so the aid
    first finds the narrowest factor that floats the load with the gunwale clear
    (bisection between 0.3 and the present beam, which floats), then solves GM = target
    between that and 3x by bisection with secant steps.
    """
    sketch = design.hull
    if not isinstance(sketch, HullSketch):
        raise LoadError("the beam aid works on a sketched hull, not on a fixed table of offsets")
    if not (math.isfinite(target) and -1 < target < 5):
        raise LoadError("the target GM must be between -1 and 5 m")

    def gm_at(k: float) -> float | None:
        try:
            r = _upright_gm(replace(design, hull=scale_breadth(sketch, k)))
        except HullwrightError:
            return None
        return None if r is None else r[0]

    now = _upright_gm(design)
    if now is None:
        raise LoadError("the design does not float upright with the gunwale clear as it is")
    gm0, beam0 = now
    lo, hi = BEAM_FACTORS
    f_lo = gm_at(lo)
    if f_lo is None:  # the narrowest trial sinks: find where the load starts to float
        sinks, floats, f_floats = lo, 1.0, gm0
        while floats - sinks > 1e-3:
            mid = 0.5 * (sinks + floats)
            got = gm_at(mid)
            if got is None:
                sinks = mid
            else:
                floats, f_floats = mid, got
        lo, f_lo = floats, f_floats
    f_hi = gm_at(hi)
    if f_hi is None or (f_lo - target) * (f_hi - target) > 0:
        return BeamResult(target, None, beam0, None, gm0, None, lo)
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
    return BeamResult(target, k, beam0, beam0 * k, gm0, f_k, lo)


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

    @property
    def message(self) -> str:
        """One line, metric (see :func:`hydro.wording.trim_text`)."""
        return trim_text(self)


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
    stations, table, rho = check_context(design)
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
        return TrimResult(what, idx, x_now, None, here.trim_deg, None, None, None)
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
    return TrimResult(what, idx, x_now, x, here.trim_deg, hs.trim_deg, float(fb[0]), float(fb[-1]))


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
