"""Drawing helpers: axes that never re-lay out the plot during a drag; Qt-drawn curves."""

import numpy as np

from hydro.units import system

from app.drawing import PathCurve, set_length_axis, style_axes
import pyqtgraph as pg


def test_a_vertical_axis_keeps_its_width_as_its_labels_change(qtbot):
    plot = pg.PlotWidget()
    qtbot.addWidget(plot)
    style_axes(plot)
    axis = plot.getAxis("left")
    set_length_axis(axis, system("metric"))
    plot.resize(500, 400)
    plot.show()
    widths = []
    for low, high in ((0.0, 0.002), (-1.5, 1.5), (0.0, 0.2), (-0.05, 0.005)):
        plot.setRange(yRange=(low, high), padding=0)
        plot.grab()  # paint: the labels are measured as they are drawn
        widths.append(axis.width())
    assert len(set(widths)) == 1, widths


def test_path_curve_takes_and_gives_back_its_data_with_gaps():
    curve = PathCurve(pen=pg.mkPen("k"), connect="finite")
    x, y = np.array([0.0, 1.0, 2.0, 3.0]), np.array([0.0, 1.0, np.nan, 2.0])
    curve.setData(x, y)
    got_x, got_y = curve.getData()
    assert np.array_equal(got_x, x) and np.array_equal(got_y, y, equal_nan=True)
    assert curve.path().boundingRect().width() == 3.0  # across the gap, one path
    curve.setData([], [])
    assert curve.path().isEmpty()
