"""The dimensions panel: typed main dimensions rescale the sketch, one undo step each."""

import pytest
from PySide6.QtCore import Qt

from app.dimensions_panel import DimensionsPanel
from app.document import HullDocument, starter_design
from app.view_options import ViewOptions
from hydro import generate_stations
from hydro.resize import measure
from tests.app.helpers import sample


def _panel(qtbot, design, units="metric"):
    doc = HullDocument(design)
    options = ViewOptions(units)
    panel = DimensionsPanel(doc, options)
    qtbot.addWidget(panel)
    panel.show()
    return doc, panel, options


def _type(qtbot, box, text):
    box.setFocus()
    box.lineEdit().selectAll()
    qtbot.keyClicks(box.lineEdit(), text)
    qtbot.keyClick(box.lineEdit(), Qt.Key.Key_Return)


def test_the_beam_field_sets_the_beam_exactly_and_undo_restores(qtbot):
    design = sample("heron-punt")
    doc, panel, _ = _panel(qtbot, design, "imperial")
    _type(qtbot, panel.fields["beam"], "3' 4 1/2\"")
    beam = panel.fields["beam"].metres()
    assert beam == pytest.approx(40.5 * 0.0254, abs=1e-12)
    assert 2 * max(b for _x, b in doc.committed.hull.plan.points) == beam  # exactly
    stations = generate_stations(doc.committed.hull)
    assert 2 * stations.max_half_breadth == pytest.approx(beam, abs=1e-12)
    assert doc.undo_stack.count() == 1
    assert panel.fields["beam"].text() == "40 1/2 in"
    doc.undo_stack.undo()
    assert doc.committed == design
    assert panel.fields["beam"].metres() == pytest.approx(0.96)


def test_the_teachers_punt_from_new(qtbot):
    doc, panel, _ = _panel(qtbot, starter_design())
    _type(qtbot, panel.fields["length"], "2.4 m")
    _type(qtbot, panel.fields["beam"], "0.9 m")
    _type(qtbot, panel.fields["depth"], "35 cm")
    dims = measure(doc.committed.hull)
    assert (dims.length, dims.beam, dims.depth) == pytest.approx((2.4, 0.9, 0.35), abs=1e-12)
    assert doc.undo_stack.count() == 2  # the length was already 2.4 m: no step
    assert panel.fields["bottom_width"].isVisible() and not panel.fields["hull_spacing"].isVisible()


def test_pontoons_move_apart_in_one_step(qtbot):
    doc, panel, _ = _panel(qtbot, sample("drift-lab-raft"))
    width = measure(doc.committed.hull).hull_width
    _type(qtbot, panel.fields["hull_spacing"], "1.6 m")
    dims = measure(doc.committed.hull)
    assert dims.hull_spacing == pytest.approx(1.6, abs=1e-12)
    assert dims.hull_width == pytest.approx(width, abs=1e-12)
    assert doc.undo_stack.count() == 1


def test_an_impossible_size_is_refused_and_loses_nothing(qtbot):
    design = sample("tern-pram")
    doc, panel, _ = _panel(qtbot, design)
    notices = []
    doc.notice.connect(notices.append)
    _type(qtbot, panel.fields["bottom_width"], "1.5 m")
    assert doc.committed == design
    assert any("too large" in n for n in notices)
    assert panel.fields["bottom_width"].metres() == pytest.approx(0.82)


def test_lengthening_keeps_the_crew_in_their_place(qtbot):
    design = sample("heron-punt")
    doc, panel, _ = _panel(qtbot, design)
    _type(qtbot, panel.fields["length"], "3900")
    for before, after in zip(design.loads.crew, doc.committed.loads.crew):
        assert after.x == pytest.approx(before.x * 1.5)
