"""Selecting several points: a box, Shift/Ctrl-clicks; moving them together; the point menu."""

import pytest
from PySide6.QtCore import QPoint, Qt
from PySide6.QtTest import QTest
from PySide6.QtWidgets import QApplication

from app import editing
from app.document import HullDocument
from app.editing import PointRef
from app.plan_view import PlanView
from app.view_options import ViewOptions
from tests.app.helpers import sample, to_pixel


@pytest.fixture
def plan(qtbot):
    doc = HullDocument(sample("heron-punt"))
    view = PlanView(doc, ViewOptions(snap=False))
    qtbot.addWidget(view)
    view.resize(900, 420)
    view.show()
    qtbot.waitExposed(view)
    view.fit()
    doc.recompute_now()
    return doc, view


def _box(qtbot, view, a, b, modifier=Qt.KeyboardModifier.ShiftModifier):
    viewport = view.plot.viewport()
    pa, pb = to_pixel(view.plot, *a), to_pixel(view.plot, *b)
    qtbot.mousePress(viewport, Qt.MouseButton.LeftButton, modifier, pa)
    for i in range(1, 5):
        p = QPoint(pa.x() + (pb.x() - pa.x()) * i // 4, pa.y() + (pb.y() - pa.y()) * i // 4)
        QTest.mouseEvent(
            QTest.MouseAction.MouseMove, viewport, Qt.MouseButton.NoButton, modifier, p
        )
        QApplication.processEvents()
    qtbot.mouseRelease(viewport, Qt.MouseButton.LeftButton, modifier, pb)


def test_a_shift_drag_box_selects_the_points_inside(plan, qtbot):
    doc, view = plan
    before = view.view_box.viewRange()
    _box(qtbot, view, (0.3, 0.35), (2.3, 0.6))  # around plan points 2, 3, 4 (x 0.45..2.15)
    assert set(view.group) == {PointRef("plan", i) for i in (1, 2, 3)}
    assert doc.selection in view.group
    assert view.view_box.viewRange() == before  # a box, not a pan


def test_ctrl_click_adds_and_removes(plan, qtbot):
    doc, view = plan
    pts = doc.committed.hull.plan.points
    viewport = view.plot.viewport()
    qtbot.mouseClick(viewport, Qt.MouseButton.LeftButton, pos=to_pixel(view.plot, *pts[1]))
    ctrl = Qt.KeyboardModifier.ControlModifier
    qtbot.mouseClick(viewport, Qt.MouseButton.LeftButton, ctrl, to_pixel(view.plot, *pts[3]))
    assert set(view.group) == {PointRef("plan", 1), PointRef("plan", 3)}
    qtbot.mouseClick(viewport, Qt.MouseButton.LeftButton, ctrl, to_pixel(view.plot, *pts[3]))
    assert view.group == () and doc.selection == PointRef("plan", 1)


def test_a_group_drags_together_in_one_undo_step(plan, qtbot):
    doc, view = plan
    design = doc.committed
    pts = design.hull.plan.points
    view.set_group((PointRef("plan", 1), PointRef("plan", 2), PointRef("plan", 3)))
    handles = view.handles  # the handle item's gestures, as a drag of point 2 sends them
    for step in (1, 2, 3, 4):
        handles.pointDragged.emit(2, pts[2][0], pts[2][1] + 0.0125 * step)
        doc.recompute_now()
    handles.dragFinished.emit(2)
    new = doc.committed.hull.plan.points
    moved = [new[i][1] - pts[i][1] for i in (1, 2, 3)]
    assert moved == pytest.approx([0.05] * 3, abs=1e-12)  # the same for all three
    assert new[0] == pts[0] and new[4] == pts[4]
    assert doc.undo_stack.count() == 1 and doc.undo_stack.undoText() == "Drag 3 points"
    doc.undo_stack.undo()
    assert doc.committed == design


def test_a_group_nudges_together(plan, qtbot):
    doc, view = plan
    pts = doc.committed.hull.plan.points
    view.set_group((PointRef("plan", 1), PointRef("plan", 3)))
    view.plot.setFocus()
    qtbot.keyClick(view.plot, Qt.Key.Key_Right)
    qtbot.keyClick(view.plot, Qt.Key.Key_Right)
    new = doc.committed.hull.plan.points
    assert new[1][0] == pytest.approx(pts[1][0] + 0.002)
    assert new[3][0] == pytest.approx(pts[3][0] + 0.002)
    assert doc.undo_stack.count() == 1


def test_the_point_menu(plan, qtbot):
    doc, view = plan
    ref = PointRef("plan", 2)
    menu = view.point_menu(ref, QPoint(10, 10))
    texts = [a.text() for a in menu.actions()]
    assert texts == [
        "Delete point", "Make the plan line hard-chine (corners)", "Type coordinates…"
    ]
    menu.actions()[1].trigger()
    assert doc.committed.hull.plan.smooth is False
    menu.close()
    with qtbot.waitSignal(view.typeCoordinatesRequested):
        view.point_menu(ref, QPoint(10, 10)).actions()[2].trigger()
    n = len(doc.committed.hull.plan.points)
    view.point_menu(ref, QPoint(10, 10)).actions()[0].trigger()
    assert len(doc.committed.hull.plan.points) == n - 1


def test_refs_in_box_is_pure():
    hull = sample("heron-punt").hull
    refs = tuple(PointRef("plan", i) for i in range(5))
    inside = editing.refs_in_box(hull, refs, 2.7, 0.0, -1.0, 0.37)
    assert inside == (PointRef("plan", 0), PointRef("plan", 4))
