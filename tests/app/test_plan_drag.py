"""Dragging a plan handle with real mouse events: the readout follows, undo and redo are exact."""

import numpy as np
import pytest
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QApplication, QHBoxLayout, QWidget

from app.document import HullDocument
from app.plan_view import PlanView
from app.results_panel import ResultsPanel
from app.view_options import ViewOptions
from tests.app.helpers import data_per_pixel, drag, sample, to_pixel


@pytest.fixture
def setup(qtbot):
    """A document, its plan view and its readout side by side in one window."""
    doc = HullDocument(sample("heron-punt"))
    options = ViewOptions(snap=False)
    plan = PlanView(doc, options)
    panel = ResultsPanel(doc, options)
    window = QWidget()
    row = QHBoxLayout(window)
    row.addWidget(plan, 2)
    row.addWidget(panel, 1)
    qtbot.addWidget(window)
    window.resize(1200, 600)
    window.show()
    qtbot.waitExposed(window)
    plan.fit()
    doc.recompute_now()
    yield doc, plan, panel
    window.close()


def _figures(doc, panel):
    hs = doc.analysis.hydrostatics
    return (
        hs.bwl,
        hs.gm,
        panel.values["gm"].text(),
        panel.values["bm"].text(),
        np.array(panel.gz_plot.open_part.getData()[1]).copy(),
    )


def test_drag_outward_raises_beam_and_gm_and_undo_redo_are_exact(setup, qtbot):
    doc, plan, panel = setup
    bwl0, gm0, gm_text0, bm_text0, gz0 = _figures(doc, panel)
    x, b = doc.committed.hull.plan.points[2]
    seen = []
    doc.analysisReady.connect(lambda a: seen.append(doc.analysis_is_live))
    with qtbot.waitSignal(plan.handles.dragFinished, timeout=3000) as finished:
        drag(qtbot, plan.plot, (x, b), (x, b + 0.12))
    assert finished.args == [2]
    qtbot.waitUntil(lambda: not doc.analysis_pending and not doc.analysis_is_live)
    assert True in seen, "the readout did not update during the drag"
    assert doc.undo_stack.count() == 1
    new_b = doc.committed.hull.plan.points[2][1]
    assert new_b == pytest.approx(b + 0.12, abs=2 * data_per_pixel(plan.plot))
    bwl1, gm1, gm_text1, bm_text1, gz1 = _figures(doc, panel)
    assert bwl1 > bwl0 and gm1 > gm0
    assert gm_text1 != gm_text0 and bm_text1 != bm_text0
    assert not np.array_equal(gz1, gz0)
    assert plan.handles.getData()[1][2] == pytest.approx(new_b)

    doc.undo_stack.undo()
    qtbot.waitUntil(lambda: not doc.analysis_pending)
    assert doc.analysis.hydrostatics.gm == gm0
    assert doc.analysis.hydrostatics.bwl == bwl0
    assert panel.values["gm"].text() == gm_text0 and panel.values["bm"].text() == bm_text0
    assert np.array_equal(panel.gz_plot.open_part.getData()[1], gz0)
    assert plan.handles.getData()[1][2] == pytest.approx(b)

    doc.undo_stack.redo()
    qtbot.waitUntil(lambda: not doc.analysis_pending)
    assert doc.analysis.hydrostatics.gm == gm1
    assert panel.values["gm"].text() == gm_text1


def test_escape_cancels_a_drag_in_progress(setup, qtbot):
    doc, plan, _panel = setup
    start = doc.committed
    x, b = start.hull.plan.points[2]
    drag(qtbot, plan.plot, (x, b), (x, b + 0.1), release=False)
    assert doc.is_previewing
    qtbot.keyClick(plan.plot, Qt.Key.Key_Escape)
    assert not doc.is_previewing
    qtbot.mouseRelease(plan.plot.viewport(), Qt.MouseButton.LeftButton, pos=to_pixel(plan.plot, x, b + 0.1))
    assert doc.committed is start
    assert doc.undo_stack.count() == 0


def test_drag_past_the_centreline_is_held_with_a_message(setup, qtbot):
    doc, plan, _panel = setup
    x, b = doc.committed.hull.plan.points[2]
    notices = []
    doc.notice.connect(notices.append)
    drag(qtbot, plan.plot, (x, b), (x, -0.2))
    assert doc.committed.hull.plan.points[2][1] == 0.0
    assert any("centreline" in n for n in notices)


def test_arrow_keys_nudge_the_selected_point_and_merge(setup, qtbot):
    doc, plan, _panel = setup
    x, b = doc.committed.hull.plan.points[1]
    p = to_pixel(plan.plot, x, b)
    qtbot.mouseClick(plan.plot.viewport(), Qt.MouseButton.LeftButton, pos=p)
    assert doc.selection is not None and doc.selection.index == 1
    plan.plot.setFocus()
    # the plan is seen from above, port up: Down moves the starboard handle outwards (+y)
    qtbot.keyClick(plan.plot, Qt.Key.Key_Down)
    qtbot.keyClick(plan.plot, Qt.Key.Key_Down, Qt.KeyboardModifier.ShiftModifier)
    qtbot.keyClick(plan.plot, Qt.Key.Key_Right)
    assert doc.committed.hull.plan.points[1] == pytest.approx((x + 0.001, b + 0.011))
    assert doc.undo_stack.count() == 1
    doc.undo_stack.undo()
    assert doc.committed.hull.plan.points[1] == (x, b)


def test_delete_key_removes_the_selected_point(setup, qtbot):
    doc, plan, _panel = setup
    n = len(doc.committed.hull.plan.points)
    x, b = doc.committed.hull.plan.points[1]
    qtbot.mouseClick(plan.plot.viewport(), Qt.MouseButton.LeftButton, pos=to_pixel(plan.plot, x, b))
    qtbot.keyClick(plan.plot, Qt.Key.Key_Delete)
    assert len(doc.committed.hull.plan.points) == n - 1
    assert doc.selection is None


def test_mid_drag_the_readout_is_exact_for_the_pointer_position(setup, qtbot):
    from hydro import analyse

    doc, plan, panel = setup
    x, b = doc.committed.hull.plan.points[2]
    viewport = plan.plot.viewport()
    a, end = to_pixel(plan.plot, x, b), to_pixel(plan.plot, x, b + 0.1)
    qtbot.mousePress(viewport, Qt.MouseButton.LeftButton, pos=a)
    for i in range(1, 5):
        QApplication.processEvents()  # as between real mouse moves: recompute, repaint
        qtbot.mouseMove(viewport, a + (end - a) * i / 5)
    qtbot.mouseMove(viewport, end)  # right after the one before: it must not be dropped
    qtbot.waitUntil(lambda: not doc.analysis_pending)
    assert doc.is_previewing and doc.analysis_is_live
    shown_b = doc.design.hull.plan.points[2][1]
    assert shown_b == pytest.approx(b + 0.1, abs=2 * data_per_pixel(plan.plot))
    fresh = analyse(doc.design)
    units = plan.options.units
    assert panel.values["gm"].text() == units.length_text(fresh.hydrostatics.gm, unit=False)
    heel, gz = panel.gz_plot.open_part.getData()
    common = np.isin(heel, fresh.curve.heel_deg)  # a drag may sample fewer heels
    assert common.sum() >= 5
    expected = fresh.curve.gz[np.searchsorted(fresh.curve.heel_deg, heel[common])]
    assert np.allclose(gz[common], expected, atol=1e-6)
    qtbot.mouseRelease(viewport, Qt.MouseButton.LeftButton, pos=end)
    qtbot.waitUntil(lambda: not doc.analysis_pending and not doc.analysis_is_live)
    assert doc.committed.hull.plan.points[2][1] == shown_b
    assert panel.values["gm"].text() == units.length_text(fresh.hydrostatics.gm, unit=False)
