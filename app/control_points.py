"""Draggable control-point handles for one curve.

The item never moves itself: it reports where the user wants a point to go
(``pointDragged``) and the document decides; the view then redraws from the model.
"""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QPointF, Qt, Signal

from app import style

__all__ = ["ControlPoints"]

HANDLE_SIZE = 11
SELECTED_SIZE = 15


class ControlPoints(pg.ScatterPlotItem):
    """Handles for the control points of one curve, in data coordinates.

    Signals
    -------
    pointSelected(int) : a point was clicked or a drag on it started
    pointDragged(int, float, float) : the user drags point i towards (x, y)
    dragFinished(int) : the drag of point i ended with the button released
    """

    pointSelected = Signal(int)
    pointDragged = Signal(int, float, float)
    dragFinished = Signal(int)

    def __init__(self, brush: str = style.HANDLE):
        super().__init__(
            pxMode=True,
            size=HANDLE_SIZE,
            symbol="o",
            pen=pg.mkPen(style.HANDLE_EDGE, width=1.5),
            brush=pg.mkBrush(brush),
            hoverable=True,
            hoverSize=SELECTED_SIZE,
            hoverBrush=pg.mkBrush(style.SELECTED),
            tip=None,
        )
        self._brush = pg.mkBrush(brush)
        self._selected_brush = pg.mkBrush(style.SELECTED)
        self._drag_index: int | None = None
        self._offset = QPointF()
        self.setZValue(10)

    @property
    def dragging(self) -> bool:
        return self._drag_index is not None

    def set_points(self, x: np.ndarray, y: np.ndarray, selected: int | None) -> None:
        """Show handles at (x, y), the ``selected`` one larger and in the selection colour."""
        n = len(x)
        sizes = np.full(n, HANDLE_SIZE, dtype=float)
        brushes = [self._brush] * n
        if selected is not None and 0 <= selected < n:
            sizes[selected] = SELECTED_SIZE
            brushes[selected] = self._selected_brush
        self.setData(x=np.asarray(x, dtype=float), y=np.asarray(y, dtype=float), size=sizes, brush=brushes)

    def cancel_drag(self) -> bool:
        """Stop listening to the drag in progress (Esc); True if there was one."""
        was = self._drag_index is not None
        self._drag_index = None
        self.setAcceptHoverEvents(True)
        return was

    def mouseClickEvent(self, ev) -> None:
        if ev.button() != Qt.MouseButton.LeftButton:
            ev.ignore()
            return
        spots = self.pointsAt(ev.pos())
        if len(spots) == 0:
            ev.ignore()
            return
        ev.accept()
        self.pointSelected.emit(int(spots[0].index()))

    def mouseDragEvent(self, ev) -> None:
        if ev.button() != Qt.MouseButton.LeftButton:
            ev.ignore()
            return
        if ev.isStart():
            spots = self.pointsAt(ev.buttonDownPos())
            if len(spots) == 0:
                ev.ignore()
                return
            spot = spots[0]
            self._drag_index = int(spot.index())
            self._offset = spot.pos() - ev.buttonDownPos()
            self.setAcceptHoverEvents(False)  # no hover repaints while the point follows
            self.pointSelected.emit(self._drag_index)
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
