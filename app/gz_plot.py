"""The righting-arm curve: GZ against heel, with the wall-sided estimate beside it.

Past the heel at which the gunwale meets the water an open boat fills, so that part of
the curve is drawn faint and dashed over a shaded band, with the angle marked.
"""

from __future__ import annotations

import math

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt, Signal
from PySide6.QtGui import QTransform
from PySide6.QtWidgets import QGraphicsItem, QGraphicsSimpleTextItem

from hydro import StabilityCurve

from app import style
from app.drawing import (
    PathCurve,
    StraightLine,
    VerticalBand,
    set_length_axis,
    steady_axes,
    style_axes,
)
from app.markers import Markers, marker_style
from hydro.units import UnitSystem

__all__ = ["GzPlot", "nice_ceiling", "LEGEND_HTML"]

#: A key to the curves, shown under the plot (a legend inside it would hide the data).
LEGEND_HTML = (
    f"<span style='color:{style.GZ_LINE}'>━━</span> righting arm GZ &nbsp; "
    f"<span style='color:{style.INK_FAINT}'>┅┅</span> past the gunwale (open boat fills) &nbsp; "
    f"<span style='color:{style.WALL_SIDED}'>╍╍</span> wall-sided estimate &nbsp; "
    f"<span style='color:{style.HEELING_ARM}'>━·━</span> crew-shift heeling arm"
)


#: Pixels between the gunwale line and its label.
_LABEL_MARGIN = 4


def nice_ceiling(value: float) -> float:
    """Smallest of 1, 2, 2.5, 5 x 10^n that is >= value (value > 0).

    >>> nice_ceiling(0.13)
    0.2
    """
    exponent = math.floor(math.log10(value))
    for step in (1.0, 2.0, 2.5, 5.0, 10.0):
        top = step * 10**exponent
        if top >= value * (1 - 1e-12):
            return top
    return 10.0 ** (exponent + 1)


def _within(x: np.ndarray, y: np.ndarray, low: float, high: float) -> tuple[np.ndarray, np.ndarray]:
    """The curve up to and including its first point outside [low, high].

    Dashed lines far outside the plot are slow to draw (the dashes are laid out along
    the whole length), and nothing past that point is visible anyway.
    """
    with np.errstate(invalid="ignore"):
        out = np.flatnonzero((y < low) | (y > high))
    end = int(out[0]) + 1 if out.size else y.size
    return x[:end], y[:end]


class GzPlot(pg.PlotWidget):
    """GZ(heel) from the engine, split at gunwale immersion, plus the wall-sided estimate.

    ``open_part`` holds the curve up to the gunwale angle and ``beyond_part`` the rest
    (the two share the point where they meet); together they are the engine's data.
    The wall-sided estimate is drawn up to where it leaves the plot.
    """

    #: heelPicked(float): the user clicked the plot at this heel (degrees)
    heelPicked = Signal(float)

    def __init__(self) -> None:
        super().__init__(background=style.PAPER, axisItems=steady_axes())
        self.scene().sigMouseClicked.connect(self._on_clicked)
        self.setToolTip("Click the curve to see the boat heeled at that angle in the section view")
        self.setMenuEnabled(False)
        self.hideButtons()
        self.setMouseEnabled(x=False, y=False)
        self.showGrid(x=True, y=True, alpha=0.25)
        self.setMinimumHeight(200)
        style_axes(self)
        self.setLabel("bottom", "heel (°)", color=style.INK)
        self.beyond_band = VerticalBand(style.NOT_AVAILABLE_FILL)
        self.beyond_band.setZValue(-10)
        self.addItem(self.beyond_band, ignoreBounds=True)
        self.zero = StraightLine(pg.mkPen(style.INK_FAINT, width=1), vertical=False)
        self.addItem(self.zero, ignoreBounds=True)
        self.wall_sided = PathCurve(
            pen=pg.mkPen(style.WALL_SIDED, width=1.5, style=Qt.PenStyle.DashLine), connect="finite"
        )
        self.beyond_part = PathCurve(
            pen=pg.mkPen(style.INK_FAINT, width=2, style=Qt.PenStyle.DotLine), connect="finite"
        )
        self.open_part = PathCurve(pen=pg.mkPen(style.GZ_LINE, width=2.5), connect="finite")
        for item in (self.wall_sided, self.beyond_part, self.open_part):
            self.addItem(item)
        self.gunwale_line = StraightLine(pg.mkPen(style.WATER_LINE, width=1.5), vertical=True)
        self.addItem(self.gunwale_line, ignoreBounds=True)
        # its label, a fixed size on screen, low down beside the line
        self._label_left = False  # left of the line (the gunwale far to the right)
        self.gunwale_label = QGraphicsSimpleTextItem()
        self.gunwale_label.setBrush(pg.mkBrush(style.WATER_LINE))
        self.gunwale_label.setFlag(QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations)
        self.addItem(self.gunwale_label, ignoreBounds=True)
        self.getViewBox().sigRangeChanged.connect(self._place_gunwale_label)
        self.peak = Markers()
        self._peak_style = marker_style("d", 9, "w", style.GZ_LINE)
        self.addItem(self.peak)
        self._units: UnitSystem | None = None
        self._span: tuple[float, float, float] | None = None  # heel range end, GZ bottom and top

    def _place_gunwale_label(self) -> None:
        """The label 12 % of the way up the plot, beside the line, clear of it by the
        margin pyqtgraph's text items keep."""
        (_x0, _x1), (y0, y1) = self.viewRange()
        label = self.gunwale_label
        shift = -label.boundingRect().width() - _LABEL_MARGIN if self._label_left else _LABEL_MARGIN
        label.setTransform(QTransform.fromTranslate(shift, _LABEL_MARGIN))
        label.setPos(self.gunwale_line.value(), y0 + 0.12 * (y1 - y0))

    def show_pinned(self, curve: StabilityCurve | None) -> None:
        """A pinned version's GZ curve, faint behind the current one (None: none)."""
        if not hasattr(self, "pinned_curve"):
            self.pinned_curve = pg.PlotCurveItem(
                pen=pg.mkPen(style.INK_FAINT, width=2, style=Qt.PenStyle.DashLine)
            )
            self.pinned_curve.setZValue(-5)
            self.addItem(self.pinned_curve)
        if curve is None:
            self.pinned_curve.setData([], [])
        else:
            self.pinned_curve.setData(curve.heel_deg, np.nan_to_num(curve.gz, nan=np.nan))

    def _on_clicked(self, ev) -> None:
        if ev.button() != Qt.MouseButton.LeftButton:
            return
        box = self.getViewBox()
        if box.sceneBoundingRect().contains(ev.scenePos()):
            self.heelPicked.emit(float(box.mapSceneToView(ev.scenePos()).x()))

    def set_units(self, units: UnitSystem) -> None:
        self._units = units
        axis = self.getAxis("left")
        set_length_axis(axis, units)
        self.setLabel("left", f"GZ ({units.length})", color=style.INK)

    def show_curve(self, curve: StabilityCurve | None, steady: bool = False, open_boat: bool = True) -> None:
        """Draw ``curve`` (None clears the plot).

        With ``steady`` (live previews during a drag) the GZ range only grows, so the
        axes and grid are redrawn only when the curve would leave the plot.  A closed
        (decked, sealed) hull keeps its whole curve: no band past the gunwale.
        """
        if curve is None:
            for item in (self.open_part, self.beyond_part, self.wall_sided):
                item.setData([], [])
            self.peak.set_markers([], [], [])
            self.gunwale_line.hide()
            self.gunwale_label.hide()
            self.beyond_band.hide()
            return
        heel, gz = curve.heel_deg, curve.gz
        first, last = min(float(heel[0]), 0.0), float(heel[-1])
        gunwale = curve.gunwale_immersion_deg
        to_port = gunwale is not None and gunwale < 0  # a boat listing to port
        if gunwale is None or not open_boat:
            split = heel.size
        elif to_port:
            split = int(np.searchsorted(heel, gunwale, side="left"))
        else:
            split = int(np.searchsorted(heel, gunwale, side="right"))
        finite = gz[np.isfinite(gz)]
        top = nice_ceiling(max(float(finite.max()) if finite.size else 0.0, 0.01) * 1.15)
        low = min(float(finite.min()) if finite.size else 0.0, 0.0)
        # deep negative arms (far past the gunwale) may leave the plot: keep the top readable
        bottom = -min(nice_ceiling(-low * 1.15), top) if low < 0 else -0.08 * top
        if steady and self._span is not None and self._span[0] == last:
            bottom, top = min(bottom, self._span[1]), max(top, self._span[2])
        if to_port and split < heel.size:  # the gunwale goes under on the port side
            self.open_part.setData(heel[split:], gz[split:])
            self.beyond_part.setData(heel[: split + 1], gz[: split + 1])
        else:
            self.open_part.setData(heel[:split], gz[:split])
            start = max(split - 1, 0)
            self.beyond_part.setData(heel[start:], gz[start:])
        if first < 0:  # both sides: hide what leaves the plot (dashes far out are slow)
            with np.errstate(invalid="ignore"):
                ws = curve.wall_sided
                self.wall_sided.setData(heel, np.where((ws >= bottom) & (ws <= top), ws, np.nan))
        else:
            self.wall_sided.setData(*_within(heel, curve.wall_sided, bottom, top))
        if gunwale is None:
            self.gunwale_line.hide()
            self.gunwale_label.hide()
            self.beyond_band.hide()
        else:
            self.gunwale_line.setValue(gunwale)
            self.gunwale_line.show()
            text = f"gunwale under {gunwale:.1f}°"
            if text != self.gunwale_label.text():
                self.gunwale_label.setText(text)
            # on whichever side of the line has room
            self._label_left = gunwale - first > 0.6 * (last - first)
            self._place_gunwale_label()
            self.gunwale_label.show()
            self.beyond_band.setRegion((first, gunwale) if to_port else (gunwale, last))
            self.beyond_band.setVisible(open_boat)
        if math.isfinite(curve.max_gz):
            peak = curve.side * curve.max_gz  # the righting arm towards the listing side
            self.peak.set_markers([curve.max_gz_deg], [peak], [self._peak_style])
        else:
            self.peak.set_markers([], [], [])
        span = (last, bottom, top)
        if not (steady and span == self._span):
            self._span = span
            self.setRange(xRange=(first, last), yRange=(bottom, top), padding=0.02)
