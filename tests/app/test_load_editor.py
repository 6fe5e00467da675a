"""The load editor: typed values become one undo step each and recompute; bad input is refused."""

import pytest
from PySide6.QtCore import Qt

from hydro import analyse

from app.document import HullDocument
from app.load_editor import LoadEditor
from app.view_options import ViewOptions
from tests.app.helpers import sample


@pytest.fixture
def editor(qtbot):
    doc = HullDocument(sample("heron-punt"))
    options = ViewOptions()
    widget = LoadEditor(doc, options)
    qtbot.addWidget(widget)
    doc.recompute_now()
    return doc, widget, options


def _type(table, row, column, text):
    table.item(row, column).setText(text)


def test_typing_a_crew_mass_recomputes(editor, qtbot):
    doc, widget, _ = editor
    before = doc.analysis.weights.mass
    _type(widget.crew, 0, 1, "70.0")
    assert doc.committed.loads.crew[0].mass == 70.0
    assert doc.undo_stack.count() == 1
    qtbot.waitUntil(lambda: not doc.analysis_pending)
    assert doc.analysis.weights.mass == pytest.approx(before + 70.0 - 52.0)
    assert doc.analysis.hydrostatics.gm == analyse(doc.committed).hydrostatics.gm
    assert "Total" in widget.totals.text() and f"{doc.analysis.weights.mass:.1f}" in widget.totals.text()


def test_lengths_are_typed_in_display_units(editor):
    doc, widget, options = editor
    options.set_units("imperial")
    _type(widget.crew, 1, 2, "60")  # seat at 60 in
    assert doc.committed.loads.crew[1].x == pytest.approx(60 * 0.0254)
    assert widget.crew.horizontalHeaderItem(2).text() == "Seat at (in)"


def test_text_that_is_not_a_number_is_refused(editor, qtbot):
    doc, widget, _ = editor
    before = doc.committed
    with qtbot.waitSignal(doc.notice) as notice:
        _type(widget.crew, 0, 1, "heavy")
    assert "not a number" in notice.args[0]
    assert doc.committed is before
    assert widget.crew.item(0, 1).text() == "52.0"


def test_an_impossible_value_is_refused_and_shown_back(editor, qtbot):
    doc, widget, _ = editor
    before = doc.committed
    with qtbot.waitSignal(doc.notice) as notice:
        _type(widget.crew, 0, 1, "-5")
    assert "out of range" in notice.args[0]
    assert doc.committed is before
    assert widget.crew.item(0, 1).text() == "52.0"


def test_add_and_remove_crew_materials_and_items(editor):
    doc, widget, _ = editor
    crew = len(doc.committed.loads.crew)
    widget._add_crew(75.0)
    assert len(doc.committed.loads.crew) == crew + 1
    widget.crew.selectRow(crew)
    widget._remove_row(widget.crew, "crew")
    assert len(doc.committed.loads.crew) == crew
    widget._add_item()
    assert len(doc.committed.loads.items) == 2
    widget._add_material()
    assert len(doc.committed.loads.materials) == 4
    assert doc.undo_stack.count() == 4


def test_surface_check_boxes_edit_the_material(editor):
    doc, widget, _ = editor
    widget.materials.item(0, 5).setCheckState(Qt.CheckState.Unchecked)  # ends
    assert doc.committed.loads.materials[0].surfaces == ("bottom", "sides")


def test_water_choice(editor):
    doc, widget, _ = editor
    widget.water_box.setCurrentIndex(widget.water_box.findData("sea"))
    assert doc.committed.water == "sea"
    widget.water_box.setCurrentIndex(widget.water_box.findData("other density"))
    assert widget.density_box.isEnabled()
    assert doc.committed.water == pytest.approx(1025.0)


def test_closed_hull_switch_is_one_undo_step_and_keeps_the_curve(qtbot):
    from app.gz_plot import GzPlot

    doc = HullDocument(sample("drift-lab-raft"))
    widget = LoadEditor(doc, ViewOptions())
    qtbot.addWidget(widget)
    assert not widget.open_box.isChecked()  # the raft's pontoons are sealed
    widget.open_box.setChecked(True)
    assert doc.committed.settings.open_boat and doc.undo_stack.count() == 1
    doc.undo_stack.undo()
    assert not doc.committed.settings.open_boat and not widget.open_box.isChecked()
    plot = GzPlot()
    qtbot.addWidget(plot)
    curve = analyse(doc.committed).curve
    plot.show_curve(curve, open_boat=False)
    x, _ = plot.open_part.getData()
    assert len(x) == curve.heel_deg.size and not plot.beyond_band.isVisible()
    plot.show_curve(curve, open_boat=True)
    x, _ = plot.open_part.getData()
    assert x[-1] <= curve.gunwale_immersion_deg + 1.0 and plot.beyond_band.isVisible()
