"""The builder's checks off the GUI thread: what the builder asked for, everything the
checks found, and the background job that runs them after every committed edit.

``run_checks`` is pure (no Qt); the job relays its result, or the error it met, to the
GUI thread through a signal and drops it once a newer edit or a drag made it stale.
"""

from __future__ import annotations

import threading
from dataclasses import dataclass
from typing import Callable

from PySide6.QtCore import QObject, QRunnable, Signal

from hydro import CREW_MASS_KG, Design, HullSketch, HullwrightError, analyse
from hydro import aids, heel_checks, whatif
from hydro.aids import BeamResult, TrimResult
from hydro.heel_checks import HeelCheck
from hydro.whatif import SensitivityRow, SwampResult

__all__ = ["CheckInputs", "CheckResults", "Cancelled", "ChecksJob", "Relay", "run_checks"]


@dataclass(frozen=True)
class CheckInputs:
    """What the builder asked for (panel state, not part of the design).

    Attributes
    ----------
    movers : crew indices that shift (None = everyone)
    mode : "side" (to the hull side at seat height), "gunwale" or "distance"
    distance : metres each moves in "distance" mode
    boarding_mass : kg of the person climbing aboard
    target_gm : metres, for the beam aid
    trim_subject : ("crew" | "item", index) that moves for level trim
    """

    movers: tuple[int, ...] | None = None
    mode: str = "side"
    distance: float = 0.3
    boarding_mass: float = CREW_MASS_KG
    target_gm: float = aids.TARGET_GM_M
    trim_subject: tuple[str, int] = ("crew", 0)


@dataclass(frozen=True)
class CheckResults:
    """Everything the panel shows; ``problems`` holds one message per check that failed."""

    design: Design
    shift: HeelCheck | None
    boarding: HeelCheck | None
    trim: TrimResult | None
    beam: BeamResult | None
    sensitivity: tuple[SensitivityRow, ...]
    swamp: SwampResult | None
    problems: tuple[str, ...]


class Cancelled(Exception):
    """The checks were no longer wanted (a newer edit, or a drag began)."""


def run_checks(design: Design, inputs: CheckInputs, cancelled: Callable[[], bool] = lambda: False) -> CheckResults:
    """Run every check (pure: no Qt); a check that cannot run leaves a message.

    ``cancelled`` is asked between checks; when it says so, :class:`Cancelled` is raised.
    """
    problems: list[str] = []

    def attempt(what: str, fn: Callable[[], object]) -> object | None:
        if cancelled():
            raise Cancelled
        try:
            return fn()
        except HullwrightError as e:
            problems.append(f"{what}: {e}")
            return None

    analysis = analyse(design)
    floats = analysis.hydrostatics is not None and analysis.curve is not None
    if not floats:
        problems.append(analysis.message)
    crew = design.loads.crew
    movers = inputs.movers if inputs.movers is not None else tuple(range(len(crew)))
    movers = tuple(i for i in movers if 0 <= i < len(crew))
    shift = boarding = trim = beam = swamp = None
    rows: tuple[SensitivityRow, ...] = ()
    if floats:
        if crew and movers:
            shift = attempt("Crew shift", lambda: heel_checks.crew_shift(
                design, movers,
                inputs.distance if inputs.mode == "distance" else None,
                inputs.mode == "gunwale", analysis,
            ))
        boarding = attempt("Boarding", lambda: heel_checks.boarding(design, inputs.boarding_mass))
        kind, index = inputs.trim_subject
        if (kind == "crew" and index < len(crew)) or (kind == "item" and index < len(design.loads.items)):
            trim = attempt("Level trim", lambda: aids.level_trim(
                design, crew_index=index if kind == "crew" else None,
                item_index=index if kind == "item" else None,
            ))
        if isinstance(design.hull, HullSketch):
            beam = attempt("Beam", lambda: aids.beam_for_gm(design, inputs.target_gm))
        rows = attempt("What if", lambda: whatif.sensitivity(design)) or ()  # type: ignore[assignment]
        swamp = attempt("Swamping", lambda: whatif.swamping(design, analysis))
    return CheckResults(design, shift, boarding, trim, beam, rows, swamp, tuple(problems))  # type: ignore[arg-type]


class Relay(QObject):
    done = Signal(int, object)


class ChecksJob(QRunnable):
    def __init__(self, generation: int, design: Design, inputs: CheckInputs, relay: Relay,
                 stop: threading.Event):
        super().__init__()
        self.generation, self.design, self.inputs, self.relay = generation, design, inputs, relay
        self.stop = stop

    def run(self) -> None:
        try:
            result: object = run_checks(self.design, self.inputs, self.stop.is_set)
        except Cancelled:
            return
        except Exception as e:  # noqa: BLE001 - shown in the panel, never lost on a thread
            result = e
        try:
            self.relay.done.emit(self.generation, result)
        except RuntimeError:  # the panel (and its relay) closed meanwhile: nobody waits
            pass
