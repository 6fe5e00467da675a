"""The open design: one model that every view observes and every edit goes through.

:class:`HullDocument` owns the committed :class:`hydro.Design`, the preview shown during
a drag, the file path, the undo stack and the latest analysis.

Edits
    ``preview`` (during a drag: no undo entry), then ``finish_preview``
    (one undo step) or ``cancel_preview``; ``edit`` for everything else (numeric entry,
    nudges, loads, add/delete).  Each is checked first; an impossible design is refused
    (or, during a drag, held at the last good one) with a message on ``notice``.

Frames
    Every change restarts one single-shot zero-delay timer.  When the event loop comes
    round, the newest preview is checked and shown (``designChanging``) and the design
    on screen is analysed once, so the views and the readout repaint together and older
    requests are simply dropped (newest edit wins).  Every frame of a drag is the exact
    analysis on the design's own stations, started from the previous frame's floating
    positions, so it takes a few Newton steps; its curve is drawn from heels
    ``DRAG_HEEL_STEP_DEG`` apart, while every figure (list, largest arm, vanishing and
    gunwale angles) is refined on the exact solver, so it agrees with the full analysis
    to well within 0.01 degree and 0.01 mm.  On release the committed design is
    analysed from scratch at its own heel step, as the command line does.  Analyses of
    committed designs are cached, so undo and redo show at once.
"""

from __future__ import annotations

from collections import OrderedDict
from dataclasses import replace
from pathlib import Path

from PySide6.QtCore import QObject, QTimer, Signal
from PySide6.QtGui import QUndoCommand, QUndoStack

from hydro import (
    MATERIAL_PRESETS,
    MATERIAL_THICKNESS_M,
    Analysis,
    CrewMember,
    Curve,
    Design,
    HullSketch,
    Loads,
    Material,
    SectionShape,
    HullwrightError,
    analyse,
    generate_stations,
    load_design,
    save_design,
)
from hydro import limits
from hydro.loads import validate_loads

from app.editing import EditRefused, PointRef, delete_point

__all__ = [
    "HullDocument",
    "SnapshotCommand",
    "check_design",
    "starter_design",
]

_CACHE_SIZE = 16
#: Heel step (degrees) of the curve solved during a drag (the design's own step, if
#: coarser).  The figures do not depend on it (see the module's docstring); the drawn
#: curve's chords stray from the full one by well under a pixel.
DRAG_HEEL_STEP_DEG = 3.0


def check_design(design: Design) -> None:
    """Raise :class:`hydro.HullwrightError` if the design cannot be analysed, or is beyond
    the budgets and small-craft limits of :mod:`hydro.limits` (as a file would be)."""
    limits.check_design(design)
    if isinstance(design.hull, HullSketch):
        stations = generate_stations(design.hull, count=3)
    else:
        stations = design.hull
    validate_loads(design.loads, stations)
    design.water_density  # noqa: B018 - raises for a bad water entry
    design.settings.heel_angles()


def starter_design() -> Design:
    """What File > New opens: a plain 2.4 m flat-bottomed punt for one adult."""
    board = "double-wall corrugated board"
    hull = HullSketch(
        plan=Curve(((0.0, 0.34), (0.5, 0.42), (1.2, 0.44), (1.9, 0.42), (2.4, 0.32))),
        keel=Curve(((0.0, 0.10), (0.5, 0.01), (1.2, 0.0), (1.9, 0.01), (2.4, 0.12))),
        sheer=Curve(((0.0, 0.42), (1.2, 0.38), (2.4, 0.43))),
        sections=(SectionShape(1.2, ((0.0, 0.0), (0.85, 0.0), (1.0, 1.0))),),
    )
    loads = Loads(
        crew=(CrewMember("paddler", x=1.2),),
        materials=(
            Material(
                board, MATERIAL_PRESETS[board][0], layers=2.0,
                thickness_m=MATERIAL_THICKNESS_M[board],
            ),
        ),
        bottom_thickness=0.014,
    )
    return Design(name="New hull", hull=hull, loads=loads)


class SnapshotCommand(QUndoCommand):
    """One undoable edit: the whole design before and after.

    Commands with the same ``merge_key`` (keyboard nudges of one point) merge into one.
    """

    MERGE_ID = 7301

    def __init__(
        self,
        document: HullDocument,
        before: Design,
        after: Design,
        text: str,
        merge_key: object | None = None,
    ):
        super().__init__(text)
        self._document = document
        self.before = before
        self.after = after
        self.merge_key = merge_key

    def id(self) -> int:
        return self.MERGE_ID if self.merge_key is not None else -1

    def mergeWith(self, other: QUndoCommand) -> bool:
        if not isinstance(other, SnapshotCommand) or other.merge_key != self.merge_key:
            return False
        self.after = other.after
        return True

    def redo(self) -> None:
        self._document._show_committed(self.after)

    def undo(self) -> None:
        self._document._show_committed(self.before)


class HullDocument(QObject):
    """The open design, its file, its undo history and its latest analysis.

    Signals
    -------
    dragStarted : a drag's first preview was asked for (before its first analysis)
    designChanging : the preview changed during a drag (no undo entry yet)
    designChanged : the committed design changed (edit, undo, redo, new, open)
    analysisReady(Analysis) : a new analysis of the current design
    analysisFailed(str) : the current design could not be analysed (message)
    notice(str) : a short message for the status bar (an edit held or refused)
    selectionChanged : the selected control point changed
    fileChanged : the file path or the saved/unsaved state changed
    """

    dragStarted = Signal()
    designChanging = Signal()
    designChanged = Signal()
    analysisReady = Signal(object)
    analysisFailed = Signal(str)
    notice = Signal(str)
    selectionChanged = Signal()
    fileChanged = Signal()

    def __init__(self, design: Design, path: Path | None = None, parent: QObject | None = None):
        super().__init__(parent)
        self._committed = design
        self._preview: Design | None = None
        self._path: Path | None = path
        self._selection: PointRef | None = None
        self._analysis: Analysis | None = None
        self._analysed: Design | None = None
        self._analysis_live = False
        self._analysis_error = ""
        self._cache: OrderedDict[Design, Analysis] = OrderedDict()
        self.undo_stack = QUndoStack(self)
        self.undo_stack.cleanChanged.connect(self._on_clean_changed)
        self._timer = QTimer(self)
        self._timer.setSingleShot(True)
        self._timer.setInterval(0)
        self._timer.timeout.connect(self._on_frame)
        self._pending: tuple[Design, str] | None = None
        self._last_drag_notice = ""
        self._schedule()

    def _on_clean_changed(self, _clean: bool) -> None:
        self.fileChanged.emit()

    # ------------------------------------------------------------------ state

    @property
    def design(self) -> Design:
        """The design on screen: the preview during a drag, else the committed one."""
        return self._preview if self._preview is not None else self._committed

    @property
    def committed(self) -> Design:
        return self._committed

    @property
    def is_previewing(self) -> bool:
        return self._preview is not None or self._pending is not None

    @property
    def path(self) -> Path | None:
        return self._path

    @property
    def is_modified(self) -> bool:
        return not self.undo_stack.isClean()

    @property
    def analysis(self) -> Analysis | None:
        """The newest analysis (None before the first one, or if it failed)."""
        return self._analysis

    @property
    def analysis_is_live(self) -> bool:
        """True while the shown analysis is of a drag in progress (exact all the same)."""
        return self._analysis_live

    @property
    def analysis_error(self) -> str:
        return self._analysis_error

    @property
    def analysis_pending(self) -> bool:
        return self._timer.isActive()

    @property
    def selection(self) -> PointRef | None:
        return self._selection

    def select(self, ref: PointRef | None) -> None:
        """Select a control point (None, or a point the design does not have: no selection)."""
        if ref is not None and not self._exists(ref):
            ref = None
        if ref != self._selection:
            self._selection = ref
            self.selectionChanged.emit()

    def _exists(self, ref: PointRef) -> bool:
        hull = self._committed.hull
        if not isinstance(hull, HullSketch) or ref.index < 0:
            return False
        if ref.curve == "section":
            return ref.shape < len(hull.sections) and ref.index < len(hull.sections[ref.shape].points)
        return ref.index < len(getattr(hull, ref.curve).points)

    # ------------------------------------------------------------------ edits

    def _refuse(self, design: Design) -> str:
        try:
            check_design(design)
        except HullwrightError as e:
            return str(e)
        return ""

    def preview(self, design: Design, note: str = "") -> None:
        """Show ``design`` while a drag is in progress (no undo entry).

        Nothing happens at once: the newest preview is checked, shown and analysed
        when the event loop comes round, so a burst of mouse moves costs one frame.
        An impossible design is held back with a notice; the last good one stays.
        The first preview of a drag emits ``dragStarted`` at once, so background work
        stops before the first frame is analysed.
        """
        if not self.is_previewing:
            self.dragStarted.emit()
        self._pending = (design, note)
        self._timer.start()

    def _show_pending(self) -> None:
        """Show the newest preview with its analysis (which is also its check).

        The solver starts from the previous frame's floating positions: the figures
        are the exact ones, in a few Newton steps.
        """
        (design, note), self._pending = self._pending, None
        if design == self.design:
            self._say(f"Held: {note}" if note else "")
            return
        try:
            result = analyse(design, self._analysis, DRAG_HEEL_STEP_DEG)
        except HullwrightError as e:
            self._say(f"Held: {e}")
            return
        self._say(f"Held: {note}" if note else "")
        self._preview = design
        self.designChanging.emit()
        self._publish(result, design, live=True)

    def _say(self, text: str) -> None:
        """A drag notice, sent only when it changes (the status bar is slow to repaint)."""
        if text != self._last_drag_notice:
            self._last_drag_notice = text
            self.notice.emit(text)

    def finish_preview(self, text: str) -> None:
        """End a drag: the preview becomes one undo step."""
        if self._pending is not None:
            design = self._pending[0]
            self._pending = None
            if not self._refuse(design):
                self._preview = design
        if self._preview is None:
            return
        after, self._preview = self._preview, None
        if after == self._committed:
            self.designChanged.emit()
            self._schedule()
            return
        self.undo_stack.push(SnapshotCommand(self, self._committed, after, text))

    def cancel_preview(self) -> None:
        """Abandon a drag: back to the committed design."""
        self._pending = None
        if self._preview is None:
            return
        self._preview = None
        self.notice.emit("Drag cancelled")
        self.designChanged.emit()
        self._schedule()

    def edit(self, design: Design, text: str, merge_key: object | None = None) -> bool:
        """Commit ``design`` as one undo step; False (and a notice) if impossible."""
        problem = self._refuse(design)
        if problem:
            self.notice.emit(f"Not changed: {problem}")
            return False
        if design != self._committed:
            self.undo_stack.push(SnapshotCommand(self, self._committed, design, text, merge_key))
        return True

    def remove_selected_point(self) -> bool:
        """Remove the selected control point (one undo step); False if refused."""
        ref = self._selection
        hull = self._committed.hull
        if ref is None or not isinstance(hull, HullSketch) or self._preview is not None:
            return False
        try:
            sketch = delete_point(hull, ref)
        except EditRefused as e:
            self.notice.emit(f"Not removed: {e}")
            return False
        if not self.edit(replace(self._committed, hull=sketch), f"Remove {ref.label()}"):
            return False
        self.select(None)
        return True

    def _show_committed(self, design: Design) -> None:
        self._committed = design
        self._preview = None
        self._drop_stale_selection()
        self.designChanged.emit()
        self._schedule()

    def _drop_stale_selection(self) -> None:
        if self._selection is not None and not self._exists(self._selection):
            self.select(None)

    # ------------------------------------------------------------------ files

    def replace_design(self, design: Design, path: Path | None) -> None:
        """Start over with ``design`` (new, open): the undo history is cleared."""
        self._preview = None
        self._committed = design
        self._path = path
        self.undo_stack.clear()
        self.undo_stack.setClean()
        self.select(None)
        self.designChanged.emit()
        self.fileChanged.emit()
        self._schedule()

    def open(self, path: str | Path) -> None:
        """Open a design file; raises :class:`hydro.DesignFileError` and changes nothing."""
        design = load_design(path)
        self.replace_design(design, Path(path))

    def save(self, path: str | Path | None = None) -> Path:
        """Save (atomically) to ``path`` or the current file; returns the path used."""
        target = Path(path) if path is not None else self._path
        if target is None:
            raise ValueError("no file name given")
        save_design(self._committed, target)
        self._path = target
        self.undo_stack.setClean()
        self.fileChanged.emit()
        return target

    def mark_unsaved(self) -> None:
        """Show the design as not saved (a recovered design)."""
        self.undo_stack.resetClean()
        self.fileChanged.emit()

    # ------------------------------------------------------------------ analysis

    def _schedule(self) -> None:
        self._timer.start()

    def recompute_now(self) -> None:
        """Do the pending work (show the newest preview, analyse) at once."""
        if self._timer.isActive():
            self._timer.stop()
            self._on_frame()

    def _on_frame(self) -> None:
        if self._pending is not None:
            self._show_pending()
        else:
            self._run_analysis()

    def _run_analysis(self) -> None:
        design = self.design
        live = self._preview is not None
        if design is self._analysed and live == self._analysis_live:
            return  # nothing new
        try:
            result = self._cache.get(design)
            if result is None and live:  # a drag frame: from the latest floating positions
                result = analyse(design, self._analysis, DRAG_HEEL_STEP_DEG)
            elif result is None:  # a committed design: from scratch, as the command line does
                result = analyse(design)
                self._cache[design] = result
            if design in self._cache:
                self._cache.move_to_end(design)
            while len(self._cache) > _CACHE_SIZE:
                self._cache.popitem(last=False)
        except Exception as e:  # the boundary: any failure is shown in words
            self._analysis = None
            self._analysed = None
            self._analysis_error = str(e) if isinstance(e, HullwrightError) else (
                f"the analysis failed ({type(e).__name__}: {e})"
            )
            self.analysisFailed.emit(self._analysis_error)
            return
        self._publish(result, design, live)

    def _publish(self, result: Analysis, design: Design, live: bool) -> None:
        self._analysis = result
        self._analysed = design
        self._analysis_live = live
        self._analysis_error = ""
        self.analysisReady.emit(result)
