"""Draggable control-point handles for one curve.

The item never moves itself: it reports where the user wants a point to go
(``pointDragged``) and the document decides; the view then redraws from the model.
"""

from __future__ import annotations

import numpy as np
from PySide6.QtCore import QPointF, Qt, Signal

from app import style
from app.markers import Markers, marker_style

__all__ = ["ControlPoints"]

HANDLE_SIZE = 11
SELECTED_SIZE = 15


class ControlPoints(Markers):
    """Handles for the control points of one curve, in data coordinates.

    The handle under the mouse, and the selected one, are drawn larger in the
    selection colour.

    Signals
    -------
    pointSelected(int) : a point was clicked or a drag on it started
    pointToggled(int) : a point was Shift- or Ctrl-clicked (add to or take from the group)
    menuRequested(int, QPoint) : a point was right-clicked (screen position)
    pointDragged(int, float, float) : the user drags point i towards (x, y)
    dragFinished(int) : the drag of point i ended with the button released
    """

    pointSelected = Signal(int)
    pointToggled = Signal(int)
    menuRequested = Signal(int, object)
    pointDragged = Signal(int, float, float)
    dragFinished = Signal(int)

    def __init__(self, brush: str = style.HANDLE):
        super().__init__()
        edge = {"color": style.HANDLE_EDGE, "width": 1.5}
        self._plain = marker_style("o", HANDLE_SIZE, edge, brush)
        self._marked = marker_style("o", SELECTED_SIZE, edge, style.SELECTED)
        self._selected: int | None = None
        self._group: frozenset[int] = frozenset()
        self._hovered: int | None = None
        self._drag_index: int | None = None
        self._offset = QPointF()
        self.setAcceptHoverEvents(True)
        self.setZValue(10)

    @property
    def dragging(self) -> bool:
        return self._drag_index is not None

    def set_points(self, x: np.ndarray, y: np.ndarray, selected: int | None) -> None:
        """Show handles at (x, y), the ``selected`` one larger and in the selection colour."""
        self._selected = selected
        if self._hovered is not None and self._hovered >= len(x):
            self._hovered = None
        self._show(x, y)

    def set_group(self, indices: frozenset[int]) -> None:
        """Mark these points too (a group selected together)."""
        if indices != self._group:
            self._group = indices
            self._show(*self.getData())

    def _show(self, x, y) -> None:
        marked = {self._selected, self._hovered} | self._group
        styles = [self._marked if i in marked else self._plain for i in range(len(x))]
        self.set_markers(x, y, styles)

    def cancel_drag(self) -> bool:
        """Stop listening to the drag in progress (Esc); True if there was one."""
        was = self._drag_index is not None
        self._drag_index = None
        self.setAcceptHoverEvents(True)
        return was

    def hoverEvent(self, ev) -> None:
        if self._drag_index is not None:
            return
        hovered = None if ev.isExit() else self.index_at(ev.pos())
        if hovered != self._hovered:
            self._hovered = hovered
            self._show(*self.getData())

    def mouseClickEvent(self, ev) -> None:
        index = self.index_at(ev.pos())
        buttons = (Qt.MouseButton.LeftButton, Qt.MouseButton.RightButton)
        if index is None or ev.button() not in buttons:
            ev.ignore()
            return
        ev.accept()
        if ev.button() == Qt.MouseButton.RightButton:
            self.menuRequested.emit(index, ev.screenPos().toPoint())
        elif ev.modifiers() & (
            Qt.KeyboardModifier.ShiftModifier | Qt.KeyboardModifier.ControlModifier
        ):
            self.pointToggled.emit(index)
        else:
            self.pointSelected.emit(index)

    def mouseDragEvent(self, ev) -> None:
        if ev.button() != Qt.MouseButton.LeftButton:
            ev.ignore()
            return
        if ev.isStart():
            index = self.index_at(ev.buttonDownPos())
            if index is None:
                ev.ignore()
                return
            x, y = self.getData()
            self._drag_index = index
            self._offset = QPointF(x[index], y[index]) - ev.buttonDownPos()
            self.setAcceptHoverEvents(False)  # no hover repaints while the point follows
            self.pointSelected.emit(index)
        ev.accept()
        index = self._drag_index
        if index is None:  # cancelled with Esc: swallow the rest of this drag
            return
        target = ev.pos() + self._offset
        self.pointDragged.emit(index, float(target.x()), float(target.y()))
        if ev.isFinish():
            self._drag_index = None
            self.setAcceptHoverEvents(True)
            self.dragFinished.emit(index)
