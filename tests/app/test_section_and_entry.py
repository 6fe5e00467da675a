"""Section view drags in true scale; exact coordinates typed for the selected point."""

import pytest
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QVBoxLayout, QWidget

from app import editing
from app.document import HullDocument
from app.editing import PointRef
from app.point_entry import PointEntry
from app.section_view import SectionView
from app.view_options import ViewOptions
from tests.app.helpers import data_per_pixel, drag, sample


@pytest.fixture
def section(qtbot):
    doc = HullDocument(sample("heron-punt"))
    options = ViewOptions(snap=False)
    view = SectionView(doc, options)
    entry = PointEntry(doc, options)
    window = QWidget()
    column = QVBoxLayout(window)
    column.addWidget(view, 1)
    column.addWidget(entry)
    qtbot.addWidget(window)
    window.resize(700, 600)
    window.show()
    qtbot.waitExposed(window)
    view.fit()
    doc.recompute_now()
    yield doc, view, entry, options
    window.close()


def test_drag_a_chine_in_true_scale(section, qtbot):
    doc, view, _entry, _ = section
    ref = PointRef("section", 1)
    y, z = editing.point_position(doc.committed.hull, ref)
    with qtbot.waitSignal(view.handles.dragFinished, timeout=3000):
        drag(qtbot, view.plot, (y, z), (y - 0.05, z + 0.04))
    new_y, new_z = editing.point_position(doc.committed.hull, ref)
    tolerance = 2 * data_per_pixel(view.plot)
    assert new_y == pytest.approx(y - 0.05, abs=tolerance)
    assert new_z == pytest.approx(z + 0.04, abs=tolerance)
    assert doc.undo_stack.count() == 1


def test_waterline_is_drawn_at_the_station(section):
    doc, view, _entry, _ = section
    hs = doc.analysis.hydrostatics
    x = doc.committed.hull.sections[0].x
    _ys, zs = view.waterline.getData()
    assert zs[0] == pytest.approx(hs.h + hs.tau * x)
    assert "1300" in view.station_box.text()


def test_typed_coordinates_move_the_selected_point(section, qtbot):
    doc, _view, entry, options = section
    doc.select(PointRef("section", 1))
    assert entry.first.isEnabled()
    entry.first.setValue(0.300)  # metres out from the centreline
    entry.first.editingFinished.emit()
    y, _z = editing.point_position(doc.committed.hull, PointRef("section", 1))
    assert y == pytest.approx(0.300)
    options.set_units("imperial")
    assert entry.first.text() == "11 13/16 in"  # 11.811 in to the nearest 1/16
    assert entry.first.metres() == pytest.approx(0.300)


def test_the_gunwale_point_cannot_be_dragged_but_says_why(section, qtbot):
    doc, view, _entry, _ = section
    start = doc.committed
    ref = PointRef("section", 2)
    y, z = editing.point_position(start.hull, ref)
    notices = []
    doc.notice.connect(notices.append)
    drag(qtbot, view.plot, (y, z), (y - 0.1, z - 0.1))
    assert doc.committed == start
    assert any("gunwale point follows" in n for n in notices)


def test_add_and_remove_section_shapes(section, qtbot):
    doc, view, _entry, _ = section
    view._add_shape()
    assert len(doc.committed.hull.sections) == 2
    assert view.shape_box.count() == 2 and view.shape_index == 1
    view._remove_shape()
    assert len(doc.committed.hull.sections) == 1
    view._remove_shape()
    assert len(doc.committed.hull.sections) == 1
    qtbot.keyClick(view.plot, Qt.Key.Key_Escape)


def test_the_outline_follows_a_plan_edit_and_a_shape_edit(section):
    """The shape's samples are kept between frames: a new half-breadth rescales them,
    a new shape replaces them."""
    from dataclasses import replace

    doc, view, _entry, _ = section
    hull = doc.committed.hull
    station = hull.sections[0].x

    def outline_half_width() -> float:
        return view.outline.path().boundingRect().width() / 2

    b, _k, _d = editing.section_frame(hull, 0)
    widest = max(u for u, _v in hull.sections[0].points)
    assert outline_half_width() == pytest.approx(b * widest)
    wider = [(x, value + 0.05) for x, value in hull.plan.points]
    hull = replace(hull, plan=replace(hull.plan, points=tuple(wider)))
    assert doc.edit(replace(doc.committed, hull=hull), "wider")
    b2, _k, _d = editing.section_frame(hull, 0)
    assert b2 > b and outline_half_width() == pytest.approx(b2 * widest)
    shape = hull.sections[0]
    (u, v) = shape.points[1]  # the chine, moved in
    points = shape.points[:1] + ((0.7 * u, v),) + shape.points[2:]
    hull = replace(hull, sections=(replace(shape, points=points),) + hull.sections[1:])
    assert doc.edit(replace(doc.committed, hull=hull), "chine in")
    path = view.outline.path()
    xs = [path.elementAt(i).x for i in range(path.elementCount())]
    assert any(abs(x - 0.7 * u * b2) < 1e-9 for x in xs)
    assert not any(abs(x - u * b2) < 1e-9 for x in xs)
    assert hull.sections[0].x == station
