"""One assessment of a design: the status, the list, the builder's checks with their
margins, the what-if rows and the design aids, decided once here for every view.

The command line, the app's readout and checks panel, and the plate all show the one
:class:`Assessment` that :func:`assess` returns, so they cannot disagree; the words come
from :mod:`hydro.wording`.  The check cases (who leans, how far, the boarding mass, the
target GM, the what-if crew masses) are the design's own ``design.checks``.

GM state (common practice, no source): unstable GM <= 0; marginal ("tender")
0 < GM < max(50 mm, 4 % of the waterline beam), or a list beyond 5 degrees; stable
otherwise.  A status other than "ok" always wins over the GM state.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from enum import Enum
from typing import Callable

from hydro.aids import BeamResult, TrimResult, beam_for_gm, level_trim
from hydro.design import Design, analyse
from hydro.errors import HullwrightError
from hydro.heel_checks import HeelCheck, Verdict, boarding, crew_shift
from hydro.hull import HullSketch
from hydro.stability import Analysis, Status
from hydro.whatif import SensitivityRow, SwampResult, sensitivity, swamping

__all__ = [
    "LIST_MARGINAL_DEG",
    "MARGINAL_GM_BEAM_FRACTION",
    "MARGINAL_GM_M",
    "Assessment",
    "Cancelled",
    "GmState",
    "Status",
    "Verdict",
    "assess",
    "gm_state",
    "state_of",
]

#: Below this GM (m) a positive-GM boat is called marginal, whatever its beam.
MARGINAL_GM_M = 0.05
#: ... or below this fraction of the waterline beam, if that is larger.
MARGINAL_GM_BEAM_FRACTION = 0.04
#: A boat that lists more than this (degrees) as loaded is called marginal.
LIST_MARGINAL_DEG = 5.0


class GmState(str, Enum):
    """The readout's badge: the upright GM in words, overruled by a bad status."""

    STABLE = "stable"
    MARGINAL = "marginal"
    UNSTABLE = "unstable"
    NONE = "none"

    def __str__(self) -> str:
        return self.value


class Cancelled(Exception):
    """The assessment was no longer wanted (a newer edit, or a drag began)."""


def gm_state(gm: float, waterline_beam: float) -> GmState:
    """The state of an upright metacentric height (m), see the module notes."""
    if not math.isfinite(gm) or gm <= 0:
        return GmState.UNSTABLE
    if gm < max(MARGINAL_GM_M, MARGINAL_GM_BEAM_FRACTION * waterline_beam):
        return GmState.MARGINAL
    return GmState.STABLE


def state_of(analysis: Analysis) -> GmState:
    """The badge for an analysis: NONE when it sinks, UNSTABLE for any other status but
    "ok" (never a green badge beside a red status), else the GM state, marginal when
    the boat lists beyond ``LIST_MARGINAL_DEG``."""
    h = analysis.hydrostatics
    if h is None:
        return GmState.NONE
    if analysis.status is not Status.OK:
        return GmState.UNSTABLE
    state = gm_state(h.gm, h.bwl)
    listed = analysis.list_deg is not None and abs(analysis.list_deg) > LIST_MARGINAL_DEG
    return GmState.MARGINAL if state is GmState.STABLE and listed else state


@dataclass(frozen=True, eq=False)
class Assessment:
    """Everything every view shows about a design.

    Attributes
    ----------
    design : the design assessed (its ``checks`` chose the cases)
    analysis : hydrostatics and the GZ curve
    status, list_deg : the one status and the list (+ starboard; None: capsizes/sinks)
    state : the badge (see :func:`state_of`)
    shift, boarding : the heel checks with their margins (None when they cannot run)
    trims : the level-trim seat of each crew member
    beam : the beam aid (None for a fixed table of offsets)
    whatif : the what-if rows
    swamp : reserve buoyancy and the swamped hull
    problems : one message per check that could not run
    """

    design: Design
    analysis: Analysis
    status: Status
    list_deg: float | None
    state: GmState
    shift: HeelCheck | None = None
    boarding: HeelCheck | None = None
    trims: tuple[TrimResult, ...] = ()
    beam: BeamResult | None = None
    whatif: tuple[SensitivityRow, ...] = ()
    swamp: SwampResult | None = None
    problems: tuple[str, ...] = ()

    @property
    def floats(self) -> bool:
        """The boat has a waterline and a GZ curve (whatever its status)."""
        return self.analysis.hydrostatics is not None and self.analysis.curve is not None

    def best_trim(self) -> TrimResult | None:
        """The level-trim seat of the crew member who has to move least, when the boat
        does not float level already (0.05 degrees)."""
        h = self.analysis.hydrostatics
        movable = [t for t in self.trims if t.x_after is not None]
        if h is None or not movable or abs(h.trim_deg) <= 0.05:
            return None
        return min(movable, key=lambda t: abs((t.x_after or 0.0) - t.x_before))


def assess(
    design: Design,
    analysis: Analysis | None = None,
    checks: bool = True,
    cancelled: Callable[[], bool] = lambda: False,
) -> Assessment:
    """Analyse a design and run every builder's check on it (pure, no Qt).

    Parameters
    ----------
    analysis : the design's analysis, if already computed
    checks : run the builder's checks (else only the status and the list)
    cancelled : asked between checks; when it says so, :class:`Cancelled` is raised

    Raises
    ------
    HullwrightError
        For an impossible hull or load; a check that cannot run leaves a message in
        ``problems`` instead.
    """
    a = analysis if analysis is not None else analyse(design)
    head = Assessment(design, a, a.status, a.list_deg, state_of(a))
    if not checks:
        return head
    problems: list[str] = []

    def attempt(what: str, fn: Callable[[], object]) -> object | None:
        if cancelled():
            raise Cancelled
        try:
            return fn()
        except HullwrightError as e:
            problems.append(f"{what}: {e}")
            return None

    if not head.floats or a.list_deg is None:
        return Assessment(design, a, a.status, a.list_deg, head.state, problems=(a.message,))
    cs = design.checks
    crew = design.loads.crew
    movers = tuple(range(len(crew))) if cs.shift_crew is None else cs.shift_crew
    movers = tuple(i for i in movers if 0 <= i < len(crew))
    shift = None
    if crew and movers:
        shift = attempt("Crew shift", lambda: crew_shift(
            design, movers, cs.shift_distance_m, cs.shift_to_gunwale, a))
    board = attempt("Boarding", lambda: boarding(design, cs.boarding_mass_kg))
    def trim_of(i: int) -> object | None:
        return attempt("Level trim", lambda: level_trim(design, crew_index=i))

    trims = tuple(t for t in (trim_of(i) for i in range(len(crew))) if t is not None)
    beam = None
    if isinstance(design.hull, HullSketch):
        beam = attempt("Beam", lambda: beam_for_gm(design, cs.target_gm_m))
    rows = attempt("What if", lambda: sensitivity(design)) or ()
    swamp = attempt("Swamping", lambda: swamping(design, a))
    return Assessment(
        design, a, a.status, a.list_deg, head.state,
        shift,  # type: ignore[arg-type]
        board,  # type: ignore[arg-type]
        trims,  # type: ignore[arg-type]
        beam,  # type: ignore[arg-type]
        rows,  # type: ignore[arg-type]
        swamp,  # type: ignore[arg-type]
        tuple(problems),
    )
