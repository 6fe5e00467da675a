"""The builder's checks off the GUI thread: the one assessment of the committed design,
plus the level-trim aid for whoever the panel chose to move.

``run_checks`` is pure (no Qt); the job relays its result, or the error it met, to the
GUI thread through a signal.  A newer edit or a drag stops it at once, wherever it is
(:mod:`app.interrupt`), so it never slows a drag down.  The
check cases themselves are the design's own ``design.checks`` (edited through the
document), so the panel, the command line and the plate show the same cases.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable

from PySide6.QtCore import QObject, QRunnable, Signal

from hydro import Design, HullwrightError
from hydro.aids import BeamResult, TrimResult, level_trim
from hydro.assess import Assessment, Cancelled, assess
from hydro.heel_checks import HeelCheck
from hydro.whatif import SensitivityRow, SwampResult

from app.interrupt import Interrupted, Interruptible

__all__ = ["CheckResults", "Cancelled", "ChecksJob", "Relay", "run_checks"]


@dataclass(frozen=True)
class CheckResults:
    """The assessment the panel shows, and the level trim of the chosen subject."""

    assessment: Assessment
    trim: TrimResult | None
    problems: tuple[str, ...]

    @property
    def design(self) -> Design:
        return self.assessment.design

    @property
    def shift(self) -> HeelCheck | None:
        return self.assessment.shift

    @property
    def boarding(self) -> HeelCheck | None:
        return self.assessment.boarding

    @property
    def beam(self) -> BeamResult | None:
        return self.assessment.beam

    @property
    def sensitivity(self) -> tuple[SensitivityRow, ...]:
        return self.assessment.whatif

    @property
    def swamp(self) -> SwampResult | None:
        return self.assessment.swamp


def run_checks(
    design: Design,
    trim_subject: tuple[str, int] = ("crew", 0),
    cancelled: Callable[[], bool] = lambda: False,
) -> CheckResults:
    """Assess the design (pure: no Qt) and find the level-trim seat of ``trim_subject``
    (("crew" | "item", index)); a check that cannot run leaves a message.

    ``cancelled`` is asked between checks; when it says so, :class:`Cancelled` is raised.
    """
    result = assess(design, cancelled=cancelled)
    problems = list(result.problems)
    kind, index = trim_subject
    trim = None
    if result.floats and result.list_deg is not None:
        if kind == "crew":
            trim = next((t for t in result.trims if t.index == index), None)
        elif 0 <= index < len(design.loads.items):
            if cancelled():
                raise Cancelled
            try:
                trim = level_trim(design, crew_index=None, item_index=index)
            except HullwrightError as e:
                problems.append(f"Level trim: {e}")
    return CheckResults(result, trim, tuple(problems))


class Relay(QObject):
    done = Signal(int, object)


class ChecksJob(QRunnable):
    """One run of the checks; ``guard.interrupt()`` stops it (see :mod:`app.interrupt`)."""

    def __init__(self, generation: int, design: Design, trim_subject: tuple[str, int],
                 relay: Relay):
        super().__init__()
        self.generation, self.design, self.relay = generation, design, relay
        self.trim_subject = trim_subject
        self.guard = Interruptible()

    def run(self) -> None:
        guard = self.guard
        try:
            result: object = guard.run(
                lambda: run_checks(self.design, self.trim_subject, lambda: guard.interrupted)
            )
        except (Cancelled, Interrupted):
            return
        except Exception as e:  # noqa: BLE001 - shown in the panel, never lost on a thread
            result = e
        try:
            self.relay.done.emit(self.generation, result)
        except RuntimeError:  # the panel (and its relay) closed meanwhile: nobody waits
            pass
