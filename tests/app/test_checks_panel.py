"""The builder's checks panel: shows the hydro checks' own results, applies them as undo
steps, and handles the inclining test's readings (bad ones get a message)."""

import threading

import numpy as np
import pytest
from PySide6.QtWidgets import QTableWidgetItem

from hydro import aids, analyse, heel_checks

from app.checks_panel import ChecksPanel
from app.document import HullDocument
from app.gz_plot import GzPlot
from app.view_options import ViewOptions
from tests.app.helpers import sample, slow_first_call


@pytest.fixture
def panel(qtbot):
    made = []

    def make(name: str):
        doc = HullDocument(sample(name))
        options = ViewOptions()
        plot = GzPlot()
        widget = ChecksPanel(doc, options, plot)
        qtbot.addWidget(widget)
        qtbot.addWidget(plot)
        with qtbot.waitSignal(widget.checksReady, timeout=30000):
            widget.recompute()
        made.append(widget)
        return doc, widget, options

    yield make
    for widget in made:  # no background checks may outlive the widgets
        widget.shutdown()


def test_crew_shift_shown_is_the_engines(panel):
    doc, widget, _ = panel("drift-lab-raft")
    expected = heel_checks.crew_shift(doc.committed)
    shown = widget.results.shift
    assert shown.verdict == "holds" and "HOLDS" in widget.shift_verdict.text()
    assert shown.static_heel_deg == pytest.approx(expected.static_heel_deg, abs=1e-9)
    x, y = widget.arm_curve.getData()
    assert widget.arm_curve.isVisible()
    np.testing.assert_allclose(y, expected.heeling_arm)
    (heel,), _ = widget.static_mark.getData()
    assert heel == pytest.approx(expected.static_heel_deg)


def test_capsize_reads_in_words(panel):
    """The punt's crew shift finds no equilibrium; the panel says so in words.  (Whether
    a load capsizes is tested on boxes against shapely in tests/hydro/test_checks.py.)"""
    doc, widget, _ = panel("heron-punt")
    assert heel_checks.crew_shift(doc.committed).static_heel_deg is None
    assert widget.results.shift.verdict == "capsizes"
    assert "CAPSIZES" in widget.shift_verdict.text()


def test_only_ticked_crew_move(panel, qtbot):
    doc, widget, _ = panel("heron-punt")
    from PySide6.QtCore import Qt

    with qtbot.waitSignal(widget.checksReady, timeout=30000):
        widget.movers.item(1).setCheckState(Qt.CheckState.Unchecked)
    assert doc.committed.checks.shift_crew == (0,)
    one = heel_checks.crew_shift(doc.committed, members=[0])
    assert widget.results.shift.arm0 == pytest.approx(one.arm0)


def test_level_trim_applies_as_one_undo_step(panel, qtbot):
    doc, widget, _ = panel("tern-pram")
    trim = widget.results.trim
    assert trim.x_after is not None and abs(trim.trim_after_deg) <= 0.01
    widget.trim_apply.click()
    assert doc.undo_stack.count() == 1
    assert doc.committed.loads.crew[0].x == pytest.approx(trim.x_after)
    assert abs(analyse(doc.committed).hydrostatics.trim_deg) <= 0.01
    doc.undo_stack.undo()
    assert doc.committed.loads.crew[0].x == pytest.approx(trim.x_before)


def test_beam_for_target_gm_applies(panel, qtbot):
    doc, widget, options = panel("paper-loon-canoe")
    widget.target_box.setValue(0.25)  # metres: a length box shows and reads builder's units
    widget.target_box.editingFinished.emit()
    # the first run (for the default target) may still report before the new one
    qtbot.waitUntil(
        lambda: widget.results is not None
        and widget.results.beam is not None
        and abs(widget.results.beam.target_gm - 0.25) < 1e-9,
        timeout=30000,
    )
    widget.beam_apply.click()
    # aids.beam_for_gm stops within 0.1 mm of the target
    assert analyse(doc.committed).hydrostatics.gm == pytest.approx(0.25, abs=1e-4)


def test_whatif_table_and_swamping(panel):
    _, widget, _ = panel("heron-punt")
    rows = [widget.whatif.item(i, 0).text() for i in range(widget.whatif.rowCount())]
    assert rows[0] == "as designed" and len(rows) == 5
    assert "life jackets" in widget.swamp_text.text()


def _type_readings(widget, rows):
    widget.readings.setRowCount(0)
    for r, values in enumerate(rows):
        widget.readings.insertRow(r)
        for c, v in enumerate(values):
            widget.readings.setItem(r, c, QTableWidgetItem("" if v is None else str(v)))


def test_inclining_readings_typed_in_reach_the_engine(panel):
    """Readings typed into the table (in display units) and the weighed mass give the
    engine's inclining result, and applying it replaces the weights by one item at the
    measured KG.  (The inclining arithmetic itself is tested against closed forms in
    tests/hydro/test_checks.py.)"""
    from hydro.incline import InclineReading, inclining_test

    doc, widget, options = panel("heron-punt")
    u = options.units
    sheet = ((5.0, 0.3, 1.1), (5.0, -0.3, -1.15), (10.0, 0.3, 2.2), (10.0, -0.3, -2.25))
    _type_readings(widget, [(w, u.to_length(d), heel, None, None) for w, d, heel in sheet])
    widget.weighed.setChecked(True)
    widget.weighed_box.setValue(u.to_mass(110.0))
    widget.compute_incline()
    expected = inclining_test(doc.committed, [InclineReading(w, d, heel_deg=h) for w, d, h in sheet],
                              displacement=110.0)
    assert widget.incline is not None
    assert widget.incline.gm == pytest.approx(expected.gm, rel=1e-9)
    assert widget.incline.kg == pytest.approx(expected.kg, rel=1e-9)
    assert widget.incline_apply.isEnabled()
    widget.incline_apply.click()
    items = doc.committed.loads.items
    assert len(items) == 1 and items[0].z == pytest.approx(widget.incline.kg + doc.committed.stations().keel_z)
    assert items[0].mass == pytest.approx(110.0)
    assert doc.committed.loads.materials == ()


def test_bad_readings_get_a_message_and_change_nothing(panel):
    doc, widget, _ = panel("heron-punt")
    before = doc.committed
    _type_readings(widget, [(5, 300, None, None, None)])
    widget.compute_incline()
    assert "Cannot work it out" in widget.incline_text.text()
    assert "needs a heel angle" in widget.incline_text.text()
    _type_readings(widget, [(5, "abc", 1.0, None, None)])
    widget.compute_incline()
    assert "cannot read 'abc' as a length" in widget.incline_text.text()
    _type_readings(widget, [("abc", 300, 1.0, None, None)])
    widget.compute_incline()
    assert "'abc' is not a number" in widget.incline_text.text()
    assert not widget.incline_apply.isEnabled() and doc.committed is before


def test_texts_follow_the_display_units(panel):
    _, widget, options = panel("drift-lab-raft")
    assert " mm freeboard" in widget.shift_verdict.text()
    options.set_units("imperial")
    assert " in freeboard" in widget.shift_verdict.text() and " mm" not in widget.shift_verdict.text()
    assert " in from the aft end" in widget.trim_text.text()
    assert widget.distance_box.text().endswith(" in") and "." not in widget.distance_box.text()


def test_reading_lengths_are_typed_as_a_builder_writes_them(panel):
    _, widget, _ = panel("heron-punt")
    _type_readings(widget, [(5, "30 cm", 1.0, None, None), (5, "-11 13/16 in", -1.0, None, None)])
    plain = widget.incline_readings()
    assert [r.distance for r in plain] == pytest.approx([0.30, -11.8125 * 0.0254])


def test_checks_stop_when_a_drag_begins_and_run_again_after_the_release(qtbot, monkeypatch):
    import app.checks_runner as runner
    from tests.app.test_build_view import _wider

    started = threading.Event()
    slow_first_then_real, calls = slow_first_call(runner.assess, started)
    monkeypatch.setattr(runner, "assess", slow_first_then_real)
    doc = HullDocument(sample("heron-punt"))
    widget = ChecksPanel(doc, ViewOptions(), GzPlot())
    qtbot.addWidget(widget)
    ready = []
    widget.checksReady.connect(ready.append)
    widget.recompute()
    assert started.wait(20)
    doc.preview(_wider(doc), "drag")  # the drag's first move: the run stops at once,
    assert widget.wait(20000)  # long before its minute was up and before any analysis
    doc.recompute_now()  # the drag frame: shown and analysed
    assert ready == [] and "end of the drag" in widget.state.text()
    doc.finish_preview("wider")
    qtbot.waitUntil(lambda: len(ready) == 1, timeout=30000)
    assert ready[0].design == doc.committed and len(calls) == 2
    widget.shutdown()
