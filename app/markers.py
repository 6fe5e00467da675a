"""A few symbols of fixed screen size at data positions, drawn straight with QPainter.

pyqtgraph's ScatterPlotItem is built for thousands of points: every ``setData`` rebuilds
spot tables and symbol pixmaps, and its bounds and hit tests are padded with freshly
measured pixel sizes on every call.  For the handful of handles and centre marks in a
drawing that bookkeeping costs far more than the drawing itself, and it runs in every
frame of a drag.  :class:`Markers` keeps the points and one style per point, caches its
bounds until the points or the view change, and does nothing when given what it shows.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pyqtgraph as pg
from pyqtgraph.graphicsItems.ScatterPlotItem import Symbols
from PySide6.QtCore import QPointF, QRectF
from PySide6.QtGui import QBrush, QPainterPath, QPen, QTransform

__all__ = ["Markers", "MarkerStyle", "marker_style"]


@dataclass(frozen=True, eq=False)
class MarkerStyle:
    """How one marker looks: a symbol path already scaled to ``size`` pixels."""

    path: QPainterPath
    size: float
    pen: QPen
    brush: QBrush


def marker_style(symbol: str = "o", size: float = 10, pen=None, brush=None) -> MarkerStyle:
    """A style from pyqtgraph's symbol names ("o", "d", "t1", ...) and mkPen/mkBrush arguments."""
    path = QTransform.fromScale(size, size).map(Symbols[symbol])
    return MarkerStyle(path, float(size), pg.mkPen(pen), pg.mkBrush(brush))


class Markers(pg.GraphicsObject):
    """Symbols at (x, y) in data coordinates, each ``style.size`` pixels across."""

    def __init__(self) -> None:
        super().__init__()
        self._x = np.empty(0)
        self._y = np.empty(0)
        self._styles: list[MarkerStyle] = []
        self._bounds: QRectF | None = None

    def set_markers(self, x, y, styles: list[MarkerStyle]) -> None:
        """Show a marker in ``styles[i]`` at (x[i], y[i]); nothing to do if already shown."""
        x = np.asarray(x, dtype=float)
        y = np.asarray(y, dtype=float)
        if (
            np.array_equal(x, self._x)
            and np.array_equal(y, self._y)
            and len(styles) == len(self._styles)
            and all(a is b for a, b in zip(styles, self._styles))
        ):
            return
        self.prepareGeometryChange()
        self._bounds = None
        self._x, self._y, self._styles = x, y, list(styles)
        self.update()

    def getData(self) -> tuple[np.ndarray, np.ndarray]:
        """The marker positions (x, y), as pyqtgraph's data items return them."""
        return self._x, self._y

    def viewTransformChanged(self) -> None:
        """Zoom or pan: the pixel-sized margin around the points changes."""
        self.prepareGeometryChange()
        self._bounds = None
        super().viewTransformChanged()

    def _pixel_size(self) -> tuple[float, float]:
        """Length of one screen pixel along x and y, in data units (0 before the item is shown)."""
        px, py = self.pixelVectors()
        return (0.0 if px is None else px.length()), (0.0 if py is None else py.length())

    def boundingRect(self) -> QRectF:
        if self._bounds is None:
            if self._x.size == 0:
                self._bounds = QRectF()
            else:
                pw, ph = self._pixel_size()
                reach = max(s.size / 2 + s.pen.widthF() + 1 for s in self._styles)
                x0, x1 = float(self._x.min()), float(self._x.max())
                y0, y1 = float(self._y.min()), float(self._y.max())
                self._bounds = QRectF(x0, y0, x1 - x0, y1 - y0).adjusted(
                    -reach * pw, -reach * ph, reach * pw, reach * ph
                )
        return self._bounds

    def index_at(self, pos: QPointF) -> int | None:
        """The topmost marker drawn over ``pos`` (item coordinates), or None."""
        if self._x.size == 0:
            return None
        pw, ph = self._pixel_size()
        half = np.array([s.size / 2 + s.pen.widthF() / 2 for s in self._styles])
        hit = (np.abs(self._x - pos.x()) < half * pw) & (np.abs(self._y - pos.y()) < half * ph)
        found = np.flatnonzero(hit)
        return int(found[-1]) if found.size else None

    def paint(self, painter, *_args) -> None:
        """Each symbol at its point's pixel, unscaled (pen and brush set once per run of
        markers of one style)."""
        if self._x.size == 0:
            return
        t = painter.transform()  # data to pixels: affine in a graphics view
        px = t.m11() * self._x + t.m21() * self._y + t.dx()
        py = t.m12() * self._x + t.m22() * self._y + t.dy()
        painter.resetTransform()
        last = None
        for x, y, style in zip(px.tolist(), py.tolist(), self._styles):
            if style is not last:
                last = style
                painter.setPen(style.pen)
                painter.setBrush(style.brush)
            painter.drawPath(style.path.translated(x, y))
