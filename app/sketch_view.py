"""What the plan, profile and section editors share: a true-scale drawing board.

A :class:`SketchView` holds one pyqtgraph plot with its aspect ratio locked (one metre
is as long across as up), axes in the current display units, a title strip with a fit
button, and the editing gestures:

- drag a handle (one undo step per drag; Esc cancels it), snapping to the grid if on;
- click a handle to select it; arrow keys nudge it (Shift: ten times as far), merged
  into one undo step per point;
- double-click on or near a line to add a point there; Delete removes the selected one;
- the cursor position goes to ``cursorMoved`` in the current units.

Subclasses draw the geometry (:meth:`refresh`), the overlays from the analysis
(:meth:`show_analysis`), and say which handles belong to which curve.
"""

from __future__ import annotations

from dataclasses import replace

import pyqtgraph as pg
from PySide6.QtCore import QEvent, QObject, QPointF, QRectF, Qt, Signal
from PySide6.QtWidgets import QHBoxLayout, QLabel, QToolButton, QVBoxLayout, QWidget

from hydro import Analysis, HullSketch

from app import editing, style
from app.control_points import ControlPoints
from app.document import HullDocument
from app.drawing import set_length_axis, style_axes
from app.editing import PointRef
from app.view_options import ViewOptions

__all__ = ["SketchView"]

_ARROWS = {
    Qt.Key.Key_Left: (-1, 0),
    Qt.Key.Key_Right: (1, 0),
    Qt.Key.Key_Up: (0, 1),
    Qt.Key.Key_Down: (0, -1),
}


class SketchView(QWidget):
    """Base class of the three editors (see the module docstring).

    Signals
    -------
    cursorMoved(str) : cursor position as text in the current units ("" when it leaves)
    """

    cursorMoved = Signal(str)

    #: Short names of the two plotted coordinates (cursor readout) and axis titles.
    x_name = "x"
    y_name = "y"
    x_title = "x"
    y_title = "y"

    def __init__(self, document: HullDocument, options: ViewOptions, title: str, hint: str):
        super().__init__()
        self.document = document
        self.options = options
        self._handles: dict[str, ControlPoints] = {}
        self._fitted = False
        self._drawn: tuple | None = None

        self.title = QLabel(f"<b>{title}</b>")
        self.hint = QLabel(hint)
        self.hint.setStyleSheet(f"color: {style.INK_FAINT};")
        fit = QToolButton()
        fit.setText("Fit")
        fit.setToolTip("Fit the drawing to this view (Ctrl+0 fits all views)")
        fit.clicked.connect(self.fit)
        self.header = QHBoxLayout()
        self.header.setContentsMargins(6, 2, 4, 0)
        self.header.setSpacing(8)
        self.header.addWidget(self.title)
        self.header.addWidget(self.hint, 1)
        self.header.addWidget(fit)

        self.plot = pg.PlotWidget(background=style.PAPER)
        self.plot.setMenuEnabled(False)
        self.plot.hideButtons()
        self.plot.setFocusPolicy(Qt.FocusPolicy.StrongFocus)
        self.plot.showGrid(x=True, y=True, alpha=0.25)
        self.view_box = self.plot.getViewBox()
        self.view_box.setAspectLocked(True, ratio=1.0)
        self.view_box.disableAutoRange()
        style_axes(self.plot)
        self.plot.installEventFilter(self)
        self.plot.scene().sigMouseMoved.connect(self._on_mouse_moved)
        self.plot.scene().sigMouseClicked.connect(self._on_mouse_clicked)

        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.setSpacing(0)
        layout.addLayout(self.header)
        layout.addWidget(self.plot, 1)

        document.designChanging.connect(self.refresh)
        document.designChanged.connect(self.refresh)
        document.selectionChanged.connect(self.refresh)
        document.analysisReady.connect(self.show_analysis)
        options.changed.connect(self.apply_options)

    # ------------------------------------------------------------ for subclasses

    def add_handles(self, curve: str, item: ControlPoints) -> None:
        """Put a handle item on the plot and route its gestures to the document."""
        self._handles[curve] = item
        self.plot.addItem(item)
        item.pointSelected.connect(lambda i, c=curve: self.document.select(self.ref_for(c, i)))
        item.pointDragged.connect(lambda i, x, y, c=curve: self._on_dragged(c, i, x, y))
        item.dragFinished.connect(lambda i, c=curve: self._on_drag_finished(c, i))

    def ref_for(self, curve: str, index: int) -> PointRef:
        """The PointRef of handle ``index`` of ``curve`` (sections add the shape)."""
        return PointRef(curve, index)

    def owns(self, ref: PointRef) -> bool:
        """True if the point is drawn (and so nudged and deleted) in this view."""
        return ref.curve in self._handles

    def sketch(self) -> HullSketch | None:
        hull = self.document.design.hull
        return hull if isinstance(hull, HullSketch) else None

    def selected_index(self, curve: str) -> int | None:
        ref = self.document.selection
        return ref.index if ref is not None and self.owns(ref) and ref.curve == curve else None

    def refresh(self) -> None:
        """Redraw the geometry from the document's design, if what it shows changed."""
        key = self.drawing_key()
        if key != self._drawn:
            self._drawn = key
            self.redraw()

    def drawing_key(self) -> tuple:
        """Everything the drawing depends on (compared by value to skip redraws)."""
        raise NotImplementedError

    def redraw(self) -> None:
        """Draw the geometry from the document's design."""
        raise NotImplementedError

    def show_analysis(self, analysis: Analysis) -> None:
        """Redraw what depends on the analysis (waterline, G, B, M)."""

    def extent(self) -> QRectF:
        """The region (data coordinates) that fit-to-view shows."""
        raise NotImplementedError

    def insert_at(self, x: float, y: float) -> None:
        """Add a point near (x, y) (double-click)."""

    # ------------------------------------------------------------ view

    def fit(self) -> None:
        """Show the whole drawing."""
        rect = self.extent()
        if rect.width() > 0 and rect.height() > 0:
            self.view_box.setRange(rect, padding=0.06)

    def showEvent(self, event) -> None:
        super().showEvent(event)
        if not self._fitted:
            self._fitted = True
            self.fit()

    def apply_options(self) -> None:
        """Axis labels and scales in the current units, then redraw."""
        units = self.options.units
        for side, name in (("bottom", self.x_title), ("left", self.y_title)):
            axis = self.plot.getAxis(side)
            set_length_axis(axis, units)
            axis.setLabel(f"{name} ({units.length})", color=style.INK)
        self._drawn = None
        self.refresh()

    def _on_mouse_moved(self, scene_pos: QPointF) -> None:
        if not self.view_box.sceneBoundingRect().contains(scene_pos):
            self.cursorMoved.emit("")
            return
        p = self.view_box.mapSceneToView(scene_pos)
        u = self.options.units
        self.cursorMoved.emit(
            f"{self.x_name} {u.length_text(p.x())}   {self.y_name} {u.length_text(p.y())}"
        )

    def _on_mouse_clicked(self, ev) -> None:
        if (
            ev.double()
            and ev.button() == Qt.MouseButton.LeftButton
            and self.sketch() is not None
            and not self.document.is_previewing
        ):
            p = self.view_box.mapSceneToView(ev.scenePos())
            self.insert_at(p.x(), p.y())

    # ------------------------------------------------------------ editing

    def _on_dragged(self, curve: str, index: int, x: float, y: float) -> None:
        sketch = self.document.committed.hull  # a drag moves one point from where it was
        if not isinstance(sketch, HullSketch):
            return
        if self.options.snap:
            step = editing.grid_step(self.options.units.name)
            x, y = editing.snap(x, step), editing.snap(y, step)
        move = editing.move_point(sketch, self.ref_for(curve, index), x, y)
        self.document.preview(replace(self.document.design, hull=move.sketch), move.note)

    def _on_drag_finished(self, curve: str, index: int) -> None:
        self.document.finish_preview(f"Drag {self.ref_for(curve, index).label()}")

    def cancel_drag(self) -> bool:
        """Esc: abandon a drag in progress; True if there was one."""
        cancelled = False
        for item in self._handles.values():
            cancelled = item.cancel_drag() or cancelled
        if cancelled:
            self.document.cancel_preview()
        return cancelled

    def nudge(self, dx: int, dy: int, coarse: bool) -> None:
        """Move the selected point one step (ten with ``coarse``) in the given direction."""
        ref = self.document.selection
        sketch = self.sketch()
        if ref is None or sketch is None or not self.owns(ref) or self.document.is_previewing:
            return
        step = editing.nudge_step(self.options.units.name, coarse)
        move = editing.nudge_point(sketch, ref, dx * step, dy * step)
        if move.note:
            self.document.notice.emit(f"Held: {move.note}")
        self.commit_sketch(move.sketch, f"Nudge {ref.label()}", merge_key=("nudge", ref))

    def commit_sketch(self, sketch: HullSketch, text: str, merge_key: object | None = None) -> bool:
        """Commit a new hull sketch as one undo step (False if the document refused it)."""
        return self.document.edit(replace(self.document.committed, hull=sketch), text, merge_key)

    def delete_selected(self) -> None:
        """Remove the selected point, if it is drawn here."""
        ref = self.document.selection
        if ref is not None and self.owns(ref):
            self.document.remove_selected_point()

    def eventFilter(self, watched: QObject, event: QEvent) -> bool:
        if watched is self.plot and event.type() == QEvent.Type.KeyPress:
            key = event.key()
            if key == Qt.Key.Key_Escape:
                return self.cancel_drag()
            if key in _ARROWS:
                coarse = bool(event.modifiers() & Qt.KeyboardModifier.ShiftModifier)
                dx, dy = _ARROWS[key]
                if self.view_box.yInverted():  # the plan: port up, so "up" is towards -y
                    dy = -dy
                self.nudge(dx, dy, coarse)
                return True
            if key in (Qt.Key.Key_Delete, Qt.Key.Key_Backspace):
                self.delete_selected()
                return True
        return super().eventFilter(watched, event)
