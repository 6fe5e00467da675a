"""What the plan, profile and section editors share: a true-scale drawing board.

A :class:`SketchView` holds one pyqtgraph plot with its aspect ratio locked (one metre
is as long across as up), axes in the current display units, a title strip with a fit
button, and the editing gestures:

- drag a handle (one undo step per drag; Esc cancels it), snapping to the grid if on;
- click a handle to select it; arrow keys nudge it (Shift: ten times as far), merged
  into one undo step per point;
- Shift- or Ctrl-drag on the paper draws a box that selects the points inside it;
  Shift- or Ctrl-click adds or takes a point; a group drags and nudges together (one
  undo step); right-click on a point: delete, corners or smooth, type coordinates;
- double-click on or near a line to add a point there; Delete removes the selected one;
- the cursor position goes to ``cursorMoved`` in the current units.

Subclasses draw the geometry (:meth:`refresh`), the overlays from the analysis
(:meth:`show_analysis`), and say which handles belong to which curve.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QEvent, QObject, QPointF, QRectF, Qt, Signal
from PySide6.QtWidgets import QHBoxLayout, QLabel, QMenu, QToolButton, QVBoxLayout, QWidget

from hydro import Analysis, HullSketch

from app import editing, style
from app.control_points import ControlPoints
from app.document import HullDocument
from app.drawing import follow_every_move, set_length_axis, steady_axes, style_axes
from app.editing import PointRef
from app.view_options import ViewOptions

__all__ = ["SketchView"]

_ARROWS = {
    Qt.Key.Key_Left: (-1, 0),
    Qt.Key.Key_Right: (1, 0),
    Qt.Key.Key_Up: (0, 1),
    Qt.Key.Key_Down: (0, -1),
}


class SelectBox(pg.ViewBox):
    """A view box where Shift- or Ctrl-drag with the left button draws a selection box.

    Signals
    -------
    boxSelected(QRectF, bool) : the box in data coordinates; True if Ctrl was held
        (add to the group) rather than Shift (a new group)
    """

    boxSelected = Signal(object, bool)

    def mouseDragEvent(self, ev, axis=None) -> None:
        mods = ev.modifiers()
        boxing = Qt.KeyboardModifier.ShiftModifier | Qt.KeyboardModifier.ControlModifier
        if ev.button() != Qt.MouseButton.LeftButton or not mods & boxing:
            super().mouseDragEvent(ev, axis)
            return
        ev.accept()
        if ev.isFinish():
            self.rbScaleBox.hide()
            a = self.mapToView(ev.buttonDownPos())
            b = self.mapToView(ev.pos())
            add = bool(mods & Qt.KeyboardModifier.ControlModifier)
            self.boxSelected.emit(QRectF(a, b).normalized(), add)
        else:
            self.updateScaleBox(ev.buttonDownPos(), ev.pos())


class SketchView(QWidget):
    """Base class of the three editors (see the module docstring).

    Signals
    -------
    cursorMoved(str) : cursor position as text in the current units ("" when it leaves)
    typeCoordinatesRequested : the user asked (point menu) to type the point's coordinates
    """

    cursorMoved = Signal(str)
    typeCoordinatesRequested = Signal()

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
        self.group: tuple[PointRef, ...] = ()  # points selected together (two or more)

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

        self.select_box = SelectBox()
        self.select_box.boxSelected.connect(self._on_box_selected)
        self.plot = pg.PlotWidget(
            background=style.PAPER, viewBox=self.select_box, axisItems=steady_axes()
        )
        self.plot.setMenuEnabled(False)
        self.plot.hideButtons()
        self.plot.setFocusPolicy(Qt.FocusPolicy.StrongFocus)
        self.plot.showGrid(x=True, y=True, alpha=0.25)
        self.view_box = self.plot.getViewBox()
        self.view_box.setAspectLocked(True, ratio=1.0)
        self.view_box.disableAutoRange()
        style_axes(self.plot)
        follow_every_move(self.plot)
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
        document.selectionChanged.connect(self._on_selection_changed)
        document.designChanged.connect(self._drop_stale_group)
        document.analysisReady.connect(self.show_analysis)
        options.changed.connect(self.apply_options)

    # ------------------------------------------------------------ for subclasses

    def add_handles(self, curve: str, item: ControlPoints) -> None:
        """Put a handle item on the plot and route its gestures to the document."""
        self._handles[curve] = item
        self.plot.addItem(item)
        item.pointSelected.connect(lambda i, c=curve: self._select_one(self.ref_for(c, i)))
        item.pointToggled.connect(lambda i, c=curve: self._toggle(self.ref_for(c, i)))
        item.menuRequested.connect(lambda i, pos, c=curve: self.point_menu(self.ref_for(c, i), pos))
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

    # ------------------------------------------------------------ pinned version

    def set_pinned(self, design) -> None:
        """Draw ``design``'s lines faintly behind the current ones (None: no pinned version)."""
        if not hasattr(self, "pinned_item"):
            self.pinned_item = pg.PlotCurveItem(
                pen=pg.mkPen(style.INK_FAINT, width=1.5, style=Qt.PenStyle.DashLine),
                connect="finite",
            )
            self.pinned_item.setZValue(3)  # over the hull's white fill, under the handles
            self.plot.addItem(self.pinned_item, ignoreBounds=True)
        hull = None if design is None else design.hull
        if not isinstance(hull, HullSketch):
            self.pinned_item.setData([], [])
            return
        x, y = self.pinned_lines(hull)
        self.pinned_item.setData(x, y)

    def pinned_lines(self, hull: HullSketch) -> tuple[np.ndarray, np.ndarray]:
        """Polylines of a pinned hull in this view, separated by NaN."""
        return np.array([]), np.array([])

    # ------------------------------------------------------------ selection

    def all_refs(self) -> tuple[PointRef, ...]:
        """Every control point drawn in this view."""
        refs = []
        for curve, item in self._handles.items():
            refs += [self.ref_for(curve, i) for i in range(len(item.getData()[0]))]
        return tuple(refs)

    def set_group(self, refs: tuple[PointRef, ...]) -> None:
        """Select these points together (the first becomes the document's selection)."""
        self.group = tuple(dict.fromkeys(refs)) if len(refs) > 1 else ()
        self.document.select(refs[0] if refs else None)
        self._show_group()

    def _select_one(self, ref: PointRef) -> None:
        if ref in self.group and self._handles[ref.curve].dragging:
            return  # a drag on one of the group starts: keep the group
        self.group = ()
        self.document.select(ref)
        self._show_group()

    def _toggle(self, ref: PointRef) -> None:
        current = self.group or ((self.document.selection,) if self.document.selection else ())
        current = tuple(r for r in current if self.owns(r))
        refs = tuple(r for r in current if r != ref) if ref in current else current + (ref,)
        self.set_group(refs)

    def _on_box_selected(self, rect: QRectF, add: bool) -> None:
        sketch = self.sketch()
        if sketch is None:
            return
        inside = editing.refs_in_box(
            sketch, self.all_refs(), rect.left(), rect.top(), rect.right(), rect.bottom()
        )
        self.set_group((self.group if add else ()) + inside)

    def _on_selection_changed(self) -> None:
        if self.group and self.document.selection not in self.group:
            self.group = ()
            self._show_group()
        self.refresh()

    def _drop_stale_group(self) -> None:
        if self.group and set(self.group) - set(self.all_refs()):
            self.group = ()
            self._show_group()

    def _show_group(self) -> None:
        for curve, item in self._handles.items():
            item.set_group(frozenset(r.index for r in self.group if r.curve == curve))

    def point_menu(self, ref: PointRef, pos) -> QMenu:
        """The right-click menu of a point: delete, corners or smooth, type coordinates."""
        sketch = self.sketch()
        menu = QMenu(self)
        if sketch is None:
            return menu
        self._select_one(ref)
        menu.addAction("Delete point", self.document.remove_selected_point)
        smooth = (
            sketch.sections[ref.shape].smooth if ref.curve == "section"
            else getattr(sketch, ref.curve).smooth
        )
        what = "section shape" if ref.curve == "section" else f"{ref.curve} line"
        menu.addAction(
            f"Make the {what} {'hard-chine (corners)' if smooth else 'smooth'}",
            lambda: self.commit_sketch(editing.toggle_smooth(sketch, ref), f"{what.capitalize()} "
                                       f"{'corners' if smooth else 'smooth'}"),
        )
        menu.addAction("Type coordinates…", self.typeCoordinatesRequested.emit)
        menu.popup(pos)
        return menu

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
        ref = self.ref_for(curve, index)
        if ref in self.group:  # the group follows the point, by the same amount
            x0, y0 = editing.point_position(sketch, ref)
            move = editing.move_points(sketch, self.group, x - x0, y - y0)
        else:
            move = editing.move_point(sketch, ref, x, y)
        self.document.preview(replace(self.document.design, hull=move.sketch), move.note)

    def _on_drag_finished(self, curve: str, index: int) -> None:
        ref = self.ref_for(curve, index)
        text = f"Drag {len(self.group)} points" if ref in self.group else f"Drag {ref.label()}"
        self.document.finish_preview(text)

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
        if self.group:
            move = editing.move_points(sketch, self.group, dx * step, dy * step)
            text, key = f"Nudge {len(self.group)} points", ("nudge", self.group)
        else:
            move = editing.nudge_point(sketch, ref, dx * step, dy * step)
            text, key = f"Nudge {ref.label()}", ("nudge", ref)
        if move.note:
            self.document.notice.emit(f"Held: {move.note}")
        self.commit_sketch(move.sketch, text, merge_key=key)

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
