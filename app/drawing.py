"""Small drawing helpers for the editors: filled outlines and segment sets."""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QLineF, QRectF, Qt
from PySide6.QtGui import QFontMetrics, QPainter, QPainterPath
from PySide6.QtWidgets import QGraphicsItem, QGraphicsLineItem, QGraphicsPathItem, QGraphicsRectItem

from hydro.units import UnitSystem, inches_text

from app import style

__all__ = [
    "OutlineItem",
    "PathCurve",
    "SteadyAxis",
    "steady_axes",
    "StraightLine",
    "follow_every_move",
    "VerticalBand",
    "segments",
    "polygon_path",
    "style_axes",
    "set_length_axis",
    "show_label",
]


def set_length_axis(axis: pg.AxisItem, units: UnitSystem) -> None:
    """Show an axis in metres as display lengths: mm, or inches with fractions (1 1/2).

    A vertical axis keeps room for a wide label in these units and never gives it back,
    so a label that changes during a drag never re-lays out the plot (which repaints
    every axis and grid, tens of milliseconds).
    """
    axis.setScale(units.length_factor)
    if units.imperial:
        axis.tickStrings = _inch_ticks  # type: ignore[method-assign]
    elif "tickStrings" in vars(axis):
        del axis.tickStrings
    if axis.orientation in ("left", "right"):
        font = axis.style["tickFont"] or axis.font()
        axis.textWidth = QFontMetrics(font).horizontalAdvance(_WIDE_LABEL[units.imperial])
        axis.setStyle(autoReduceTextSpace=False)  # resizes the axis to the room reserved


_WIDE_LABEL = {False: "-0000", True: "-00 00/00"}


def _inch_ticks(values, scale, spacing) -> list[str]:
    """Tick labels (values in metres) in inches with fractions to 1/16, never decimals."""
    return [inches_text(v) for v in values]


class SteadyAxis(pg.AxisItem):
    """An axis that works out its bounds once per change of layout, range or style.

    Its grid reaches across the plot, so pyqtgraph measures the view box too each time
    Qt asks for the axis's bounds, which it does a few dozen times per repaint of a plot
    in Python: about 0.4 ms in every frame of a drag, for bounds that do not change.
    """

    def __init__(self, orientation: str) -> None:
        self._bounds: QRectF | None = None
        super().__init__(orientation)
        self.geometryChanged.connect(self._forget_bounds)

    def _forget_bounds(self, *_args) -> None:
        self._bounds = None

    def boundingRect(self) -> QRectF:  # noqa: N802 - Qt's name
        if self._bounds is None:
            self._bounds = super().boundingRect()
        return self._bounds

    def prepareGeometryChange(self) -> None:  # noqa: N802
        self._bounds = None
        super().prepareGeometryChange()

    def setStyle(self, **kwargs) -> None:  # noqa: N802
        self.prepareGeometryChange()
        super().setStyle(**kwargs)

    def resizeEvent(self, ev=None) -> None:  # noqa: N802
        self._bounds = None
        super().resizeEvent(ev)

    def linkToView(self, view) -> None:  # noqa: N802
        super().linkToView(view)
        view.geometryChanged.connect(self._forget_bounds)

    def linkedViewChanged(self, view, newRange=None) -> None:  # noqa: N802, N803
        self.prepareGeometryChange()
        super().linkedViewChanged(view, newRange)


def steady_axes() -> dict[str, SteadyAxis]:
    """The ``axisItems`` of a plot with :class:`SteadyAxis` at the bottom and left."""
    return {"bottom": SteadyAxis("bottom"), "left": SteadyAxis("left")}


def style_axes(plot: pg.PlotWidget) -> None:
    """Our axis look, with each axis (and the grid it draws) kept as a cached pixmap.

    The plot paints its own background, so it is marked opaque: Qt then does not
    repaint the window behind it on every change.

    pyqtgraph's axes draw the grid across the whole plot, so without the cache every
    change of a curve repaints them, which costs more than everything else in a frame.
    The cache is redrawn when the visible range changes.
    """
    plot.viewport().setAttribute(Qt.WidgetAttribute.WA_OpaquePaintEvent)
    for side in ("bottom", "left"):
        axis = plot.getAxis(side)
        axis.setCacheMode(QGraphicsItem.CacheMode.DeviceCoordinateCache)
        axis.enableAutoSIPrefix(False)
        axis.setTextPen(style.INK)
        axis.setPen(style.INK_FAINT)


def follow_every_move(plot: pg.PlotWidget) -> None:
    """Let the plot's scene pass on every mouse move, and skip hover searches in a drag.

    pyqtgraph drops a mouse move that comes within 10 ms of the one before (its
    ``mouseRateLimit``): when frames are that fast, the last move of a drag could be
    dropped and the drawing and figures would stop short of the pointer.  The document
    already coalesces moves (newest wins), so nothing is lost by taking them all.
    While an item is being dragged no other item may take the hover, yet pyqtgraph
    still looks for the items under the pointer on every move (a scene search and a
    shape test per item, about 1.5 ms): that search is skipped until the release.
    """
    scene = plot.scene()
    scene._moveEventIsAllowed = lambda: True
    send_hover = scene.sendHoverEvents

    def hover_unless_dragging(ev, exitOnly: bool = False) -> None:  # noqa: N803 - pyqtgraph's
        if not exitOnly and scene.dragItem is not None and ev.buttons():
            return
        send_hover(ev, exitOnly)

    scene.sendHoverEvents = hover_unless_dragging


def show_label(label: pg.TextItem, text: str, pos: tuple[float, float] | None = None) -> None:
    """Give a text item ``text`` at ``pos`` (data coordinates; None: where it is), doing
    nothing it already shows: pyqtgraph lays the text out anew, and places it, on every
    call, in every frame of a drag."""
    if label.textItem.toPlainText() != text:
        label.setText(text)
    if pos is not None:
        x, y = float(pos[0]), float(pos[1])
        if label.pos().x() != x or label.pos().y() != y:
            label.setPos(x, y)


def polygon_path(x: np.ndarray, y: np.ndarray) -> QPainterPath:
    """A closed path through the points (x, y)."""
    path = pg.arrayToQPath(np.asarray(x, dtype=float), np.asarray(y, dtype=float), connect="all")
    path.closeSubpath()
    return path


def segments(x0, y0, x1, y1) -> tuple[np.ndarray, np.ndarray]:
    """Coordinates for a ``connect="pairs"`` curve: one segment per (x0, y0)-(x1, y1)."""
    x = np.column_stack([np.asarray(x0, float), np.asarray(x1, float)]).ravel()
    y = np.column_stack([np.asarray(y0, float), np.asarray(y1, float)]).ravel()
    return x, y


class OutlineItem(QGraphicsPathItem):
    """A filled, outlined polygon in data coordinates (cosmetic pen)."""

    def __init__(self, pen: str | None, width: float, fill: str | tuple):
        super().__init__()
        self.setPen(pg.mkPen(pen, width=width) if pen else pg.mkPen(None))
        self.setBrush(pg.mkBrush(fill))

    def set_polygon(self, x: np.ndarray, y: np.ndarray) -> None:
        self.setPath(polygon_path(x, y))

    def clear(self) -> None:
        self.setPath(QPainterPath())


class PathCurve(QGraphicsPathItem):
    """A polyline in data coordinates drawn by Qt alone, for lines that change every
    frame of a drag.

    It takes the ``setData(x, y)`` / ``getData()`` of pyqtgraph's PlotCurveItem and
    its ``connect`` modes ("all", "pairs", "finite"), but its bounds, hit tests and
    painting are Qt's C++ (PlotCurveItem measures its bounds in Python, with a
    fresh pixel size, dozens of times a frame).  No fill, no shadow, no clicks.
    """

    def __init__(self, pen, connect: str = "all"):
        super().__init__()
        self.setPen(pen)
        self._connect = connect
        self._x = self._y = np.empty(0)

    def setData(self, x, y) -> None:  # noqa: N802 - PlotCurveItem's name
        self._x, self._y = np.asarray(x, dtype=float), np.asarray(y, dtype=float)
        if self._x.size == 0:
            self.setPath(QPainterPath())
        else:
            self.setPath(pg.arrayToQPath(self._x, self._y, connect=self._connect))

    def getData(self) -> tuple[np.ndarray, np.ndarray]:  # noqa: N802
        return self._x, self._y

    def paint(self, painter: QPainter, option, widget=None) -> None:
        """Qt's drawing, smoothed as pyqtgraph's curves are (its ``antialias`` option)."""
        painter.setRenderHint(QPainter.RenderHint.Antialiasing, _ANTIALIAS())
        super().paint(painter, option, widget)


def _ANTIALIAS() -> bool:  # noqa: N802 - read when painting, as pyqtgraph does
    return bool(pg.getConfigOption("antialias"))


class VerticalBand(QGraphicsRectItem):
    """A shaded band between two x values, reaching far past any plotted y (no outline).

    A filled rectangle drawn by Qt alone: unlike pyqtgraph's LinearRegionItem it runs
    no Python when it is moved or painted.
    """

    REACH = 1e3

    def __init__(self, fill: str | tuple):
        super().__init__()
        self.setPen(pg.mkPen(None))
        self.setBrush(pg.mkBrush(fill))
        self._region = (0.0, 0.0)

    def setRegion(self, region: tuple[float, float]) -> None:
        x0, x1 = self._region = (float(region[0]), float(region[1]))
        self.setRect(QRectF(x0, -self.REACH, x1 - x0, 2 * self.REACH))

    def getRegion(self) -> tuple[float, float]:
        return self._region


class StraightLine(QGraphicsLineItem):
    """A vertical or horizontal line across the whole plot at one value, drawn by Qt alone.

    pyqtgraph's InfiniteLine works out its ends, bounds and label in Python whenever it
    moves, is painted or the view changes: a few tenths of a millisecond in every frame
    of a drag for a line that only needs two far-apart ends.  Solid pens only: dashes
    would be laid out along the whole length.
    """

    REACH = 1e3

    def __init__(self, pen, vertical: bool, value: float = 0.0):
        super().__init__()
        self.setPen(pen)
        self._vertical = vertical
        self._value = float("nan")
        self.setValue(value)

    def setValue(self, value: float) -> None:  # noqa: N802 - InfiniteLine's name
        value = float(value)
        if value == self._value:
            return
        self._value = value
        r = self.REACH
        self.setLine(QLineF(value, -r, value, r) if self._vertical else QLineF(-r, value, r, value))

    def value(self) -> float:
        return self._value
