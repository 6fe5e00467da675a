"""The document: one undo step per drag, refusals that change nothing, files, recomputation."""

import json
from dataclasses import replace

import numpy as np
import pytest

from hydro import DesignFileError, analyse, load_design

from app import editing
from app.document import HullDocument
from app.editing import PointRef
from tests.app.helpers import sample
from tests.hydro.helpers import assert_same_figures


@pytest.fixture
def doc(qtbot):
    document = HullDocument(sample("heron-punt"))
    document.recompute_now()
    return document


def _with_plan_point(design, index, point):
    hull = design.hull
    return replace(design, hull=replace(hull, plan=hull.plan.with_point(index, point)))


def test_a_drag_is_one_undo_step_with_exact_figures_in_every_frame(doc, qtbot):
    start = doc.committed
    x, b = start.hull.plan.points[2]
    for db in (0.02, 0.04, 0.06):
        moved = _with_plan_point(start, 2, (x, b + db))
        doc.preview(moved)
        doc.recompute_now()
        assert doc.analysis_is_live
        exact = analyse(moved)  # from scratch: same stations, the design's own heel step
        live = doc.analysis.curve
        assert live.heel_deg.size < exact.curve.heel_deg.size  # a coarser drawn curve
        on_grid = np.isin(exact.curve.heel_deg, live.heel_deg)
        np.testing.assert_allclose(live.gz, exact.curve.gz[on_grid], rtol=0, atol=1e-9)
        assert_same_figures(doc.analysis, exact)
    assert doc.undo_stack.count() == 0
    assert doc.committed is start
    doc.finish_preview("Drag plan point 3")
    assert doc.undo_stack.count() == 1
    assert doc.committed.hull.plan.points[2] == (x, b + 0.06)
    doc.recompute_now()
    assert not doc.analysis_is_live
    full = analyse(doc.committed)  # on release: the full curve, as the command line has it
    np.testing.assert_array_equal(doc.analysis.curve.heel_deg, full.curve.heel_deg)
    np.testing.assert_allclose(doc.analysis.curve.gz, full.curve.gz, rtol=0, atol=1e-12)
    doc.undo_stack.undo()
    assert doc.committed == start


def test_cancel_restores_the_committed_design(doc):
    start = doc.committed
    x, b = start.hull.plan.points[2]
    doc.preview(_with_plan_point(start, 2, (x, b + 0.1)))
    doc.recompute_now()
    assert doc.design != start
    doc.cancel_preview()
    assert doc.design is start
    assert doc.undo_stack.count() == 0


def test_an_impossible_shape_is_refused_with_a_message(doc, qtbot):
    start = doc.committed
    x, _ = start.hull.plan.points[2]
    bad = _with_plan_point(start, 2, (x, -0.2))
    with qtbot.waitSignal(doc.notice) as notice:
        doc.preview(bad)
        doc.recompute_now()
    assert "negative half-breadth" in notice.args[0]
    assert not doc.edit(bad, "bad")
    assert doc.design is start
    assert doc.undo_stack.count() == 0


def test_a_load_outside_the_hull_is_refused(doc):
    start = doc.committed
    crew = (replace(start.loads.crew[0], x=9.0),) + start.loads.crew[1:]
    assert not doc.edit(replace(start, loads=replace(start.loads, crew=crew)), "move crew")
    assert doc.committed is start


def test_nudges_of_one_point_merge_into_one_undo_step(doc):
    start = doc.committed
    ref = PointRef("plan", 1)
    for _ in range(3):
        sketch = editing.nudge_point(doc.committed.hull, ref, 0.0, 0.001).sketch
        doc.edit(replace(doc.committed, hull=sketch), "Nudge", merge_key=("nudge", ref))
    assert doc.undo_stack.count() == 1
    assert doc.committed.hull.plan.points[1][1] == pytest.approx(start.hull.plan.points[1][1] + 0.003)
    other = editing.nudge_point(doc.committed.hull, PointRef("plan", 3), 0.0, 0.001).sketch
    doc.edit(replace(doc.committed, hull=other), "Nudge", merge_key=("nudge", PointRef("plan", 3)))
    assert doc.undo_stack.count() == 2
    doc.undo_stack.undo()
    doc.undo_stack.undo()
    assert doc.committed == start


def test_the_newest_edit_wins(doc, qtbot):
    start = doc.committed
    x, b = start.hull.plan.points[2]
    results, shown = [], []
    doc.analysisReady.connect(results.append)
    doc.designChanging.connect(lambda: shown.append(doc.design))
    for db in (0.01, 0.02, 0.03):
        doc.preview(_with_plan_point(start, 2, (x, b + db)))
    qtbot.waitUntil(lambda: len(results) == 1)
    assert len(shown) == 1 and shown[0].hull.plan.points[2] == (x, b + 0.03)
    expected = analyse(_with_plan_point(start, 2, (x, b + 0.03)))
    assert results[0].hydrostatics.gm == pytest.approx(expected.hydrostatics.gm, abs=1e-9)


def test_full_analysis_equals_the_engine(doc):
    assert doc.analysis.hydrostatics.gm == analyse(doc.design).hydrostatics.gm


def test_open_broken_file_changes_nothing(doc, tmp_path):
    start = doc.committed
    broken = tmp_path / "broken.json"
    broken.write_text('{"format": "hullwright.design", "version": 1, "hull": ')
    with pytest.raises(DesignFileError):
        doc.open(broken)
    foreign = tmp_path / "foreign.json"
    foreign.write_text(json.dumps({"type": "spreadsheet"}))
    with pytest.raises(DesignFileError):
        doc.open(foreign)
    assert doc.committed is start
    assert doc.path is None


def test_save_is_clean_and_reloads_the_same(doc, tmp_path):
    x, b = doc.committed.hull.plan.points[2]
    doc.edit(_with_plan_point(doc.committed, 2, (x, b + 0.05)), "wider")
    assert doc.is_modified
    path = doc.save(tmp_path / "wider.json")
    assert not doc.is_modified
    assert load_design(path) == doc.committed
    assert not list(tmp_path.glob("*.tmp"))
