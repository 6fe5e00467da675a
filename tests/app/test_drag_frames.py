"""What a drag frame leaves alone: widgets showing what they showed, layouts and panels
behind a label whose text changed."""

import pyqtgraph as pg
from PySide6.QtCore import QEvent, QObject
from PySide6.QtWidgets import QApplication

from app.document import HullDocument
from app.drawing import show_label
from app.length_box import LengthBox
from app.load_editor import LoadEditor
from app.plan_view import PlanView
from app.results_panel import ResultsPanel
from app.view_options import ViewOptions
from tests.app.helpers import sample


class EventCounter(QObject):
    """Counts the events of one type a widget receives."""

    def __init__(self, widget, kind: QEvent.Type):
        super().__init__()
        self.kind = kind
        self.count = 0
        widget.installEventFilter(self)

    def eventFilter(self, watched, event) -> bool:
        if event.type() == self.kind:
            self.count += 1
        return False


def quiet(qtbot, counter: EventCounter) -> None:
    """Wait until the widget's first layouts and paints are over (a tenth of a second
    without the counted event), then count from zero."""
    for _ in range(50):
        counter.count = 0
        qtbot.wait(100)
        if counter.count == 0:
            return
    raise AssertionError("the widget never settled")


def shown(qtbot, widget, doc: HullDocument):
    """``widget`` on screen showing ``doc``'s figures."""
    qtbot.addWidget(widget)
    widget.show()
    qtbot.waitExposed(widget)
    doc.recompute_now()
    return widget


def test_a_box_with_a_prefix_is_not_reset_to_the_figure_it_shows(qtbot):
    box = LengthBox(-5.0, 40.0, "station")
    qtbot.addWidget(box)
    box.setPrefix("at x = ")
    box.set_metres(1.23456789)  # more digits than the box holds
    texts = []
    box.lineEdit().textChanged.connect(texts.append)
    box.set_metres(1.23456789)
    assert texts == []
    box.set_metres(1.5)
    assert texts == ["at x = 1500 mm"]


def test_a_new_total_does_not_ask_the_load_editor_for_a_new_layout(qtbot):
    doc = HullDocument(sample("heron-punt"))
    editor = shown(qtbot, LoadEditor(doc, ViewOptions()), doc)
    asked = EventCounter(editor, QEvent.Type.LayoutRequest)
    quiet(qtbot, asked)
    editor.totals.setText(editor.totals.text() + " and a much longer text than before")
    QApplication.processEvents()
    assert asked.count == 0
    assert editor.totals.isVisible() and editor.totals.width() > 100


def test_a_new_figure_repaints_its_label_not_the_panel_behind_it(qtbot):
    doc = HullDocument(sample("heron-punt"))
    panel = shown(qtbot, ResultsPanel(doc, ViewOptions()), doc)
    value = panel.values["gm"]
    behind = EventCounter(panel, QEvent.Type.Paint)
    quiet(qtbot, behind)
    painted = EventCounter(value, QEvent.Type.Paint)
    value.setText("-123")
    qtbot.waitUntil(lambda: painted.count > 0)
    assert behind.count == 0


def test_a_label_given_what_it_shows_is_not_laid_out_again():
    label = pg.TextItem("G")
    show_label(label, "G", (1.0, 2.0))
    changes = []
    label.textItem.document().contentsChanged.connect(lambda: changes.append(1))
    show_label(label, "G", (1.0, 2.0))
    assert changes == [] and (label.pos().x(), label.pos().y()) == (1.0, 2.0)
    show_label(label, "B")
    assert changes and label.textItem.toPlainText() == "B"
    assert (label.pos().x(), label.pos().y()) == (1.0, 2.0)


def test_steady_axes_keep_pyqtgraphs_bounds_through_resizes_zooms_and_units(qtbot):
    doc = HullDocument(sample("heron-punt"))
    options = ViewOptions()
    view = PlanView(doc, options)
    qtbot.addWidget(view)
    view.resize(700, 400)
    view.show()
    qtbot.waitExposed(view)
    axes = [view.plot.getAxis(side) for side in ("bottom", "left")]

    def bounds_are_pyqtgraphs() -> bool:
        return all(a.boundingRect() == pg.AxisItem.boundingRect(a) for a in axes)

    [a.boundingRect() for a in axes]  # cached
    assert bounds_are_pyqtgraphs()
    view.resize(900, 500)
    qtbot.waitUntil(lambda: view.plot.width() > 800)
    assert bounds_are_pyqtgraphs()
    view.view_box.scaleBy((0.5, 0.5))
    assert bounds_are_pyqtgraphs()
    options.set_units("imperial")  # wider tick labels: the left axis grows
    QApplication.processEvents()
    assert bounds_are_pyqtgraphs()


def test_the_gunwale_line_and_its_label_follow_the_curve(qtbot):
    doc = HullDocument(sample("paper-loon-canoe"))
    panel = ResultsPanel(doc, ViewOptions())
    qtbot.addWidget(panel)
    panel.show()
    doc.recompute_now()
    plot, curve = panel.gz_plot, doc.analysis.curve
    gunwale = curve.gunwale_immersion_deg
    assert plot.gunwale_line.value() == gunwale and plot.gunwale_line.isVisible()
    label = plot.gunwale_label
    assert label.isVisible() and label.text() == f"gunwale under {gunwale:.1f}°"
    (x0, x1), (y0, y1) = plot.viewRange()
    assert label.pos().x() == gunwale and y0 < label.pos().y() < y1
    plot.show_curve(None)
    assert not plot.gunwale_line.isVisible() and not label.isVisible()


def test_a_new_coordinate_repaints_the_point_row_not_the_window_behind_it(qtbot):
    from PySide6.QtWidgets import QVBoxLayout, QWidget

    from app.editing import PointRef
    from app.point_entry import PointEntry

    doc = HullDocument(sample("heron-punt"))
    window = QWidget()
    entry = PointEntry(doc, ViewOptions())
    QVBoxLayout(window).addWidget(entry)
    qtbot.addWidget(window)
    window.show()
    qtbot.waitExposed(window)
    doc.select(PointRef("plan", 2))
    behind = EventCounter(window, QEvent.Type.Paint)
    quiet(qtbot, behind)
    painted = EventCounter(entry.second, QEvent.Type.Paint)
    entry.second.set_metres(entry.second.metres() + 0.05)
    qtbot.waitUntil(lambda: painted.count > 0)
    assert behind.count == 0
