"""Desktop behaviour: arrows follow the screen, undo from any field, a steady toolbar,
plain status messages, the name and notes header, trim in words."""

import pytest
from PySide6.QtCore import Qt
from PySide6.QtGui import QKeySequence, QTextCursor
from PySide6.QtWidgets import QMessageBox

from app.document import HullDocument
from app.editing import PointRef
from app.main_window import MainWindow
from app.settings import open_settings
from tests.app.helpers import sample, to_pixel


@pytest.fixture
def window(qtbot):
    w = MainWindow(HullDocument(sample("heron-punt")), open_settings())
    w.ask = lambda *a: QMessageBox.StandardButton.Discard
    qtbot.addWidget(w)
    w.show()
    qtbot.waitExposed(w)
    w.document.recompute_now()
    yield w
    w.close()


def _screen_y(view, ref):
    x, y = view.document.committed.hull.plan.points[ref.index]
    return to_pixel(view.plot, x, y).y()


def test_up_arrow_moves_a_plan_point_up_the_screen(window, qtbot):
    view = window.plan_view
    ref = PointRef("plan", 2)
    window.document.select(ref)
    before = window.document.committed.hull.plan.points[2][1]
    top = _screen_y(view, ref)
    view.plot.setFocus()
    qtbot.keyClick(view.plot, Qt.Key.Key_Up, Qt.KeyboardModifier.ShiftModifier)
    assert _screen_y(view, ref) < top  # up on the screen: towards port, the half-breadth shrinks
    assert window.document.committed.hull.plan.points[2][1] == pytest.approx(before - 0.010)
    profile = window.profile_view
    window.document.select(PointRef("sheer", 1))
    height = window.document.committed.hull.sheer.points[1][1]
    qtbot.keyClick(profile.plot, Qt.Key.Key_Up)
    assert window.document.committed.hull.sheer.points[1][1] == pytest.approx(height + 0.001)


def test_ctrl_z_in_a_field_undoes_the_design_unless_text_is_being_typed(window, qtbot):
    doc = window.document
    design = doc.committed
    box = window.dimensions.fields["beam"]
    window.dimensions_dock.raise_()
    box.setFocus()
    box.lineEdit().selectAll()
    qtbot.keyClicks(box.lineEdit(), "1.1 m")
    qtbot.keyClick(box.lineEdit(), Qt.Key.Key_Return)
    assert doc.undo_stack.count() == 1
    qtbot.keyClicks(box.lineEdit(), "5")  # typed, not entered: Ctrl+Z is the field's own
    assert box.has_unsaved_text()
    qtbot.keySequence(box.lineEdit(), QKeySequence.StandardKey.Undo)
    assert doc.committed != design
    box.set_metres(box.metres())  # nothing typed any more: Ctrl+Z undoes the design
    qtbot.keySequence(box.lineEdit(), QKeySequence.StandardKey.Undo)
    assert doc.committed == design
    assert box.text() == "960 mm"


def test_the_toolbar_keeps_its_layout_as_the_undo_text_changes(window):
    assert window.undo_action.text() == "&Undo"
    assert "nothing" in window.undo_action.toolTip()
    window.dimensions.fields["depth"].setValue(0.45)
    assert window.undo_action.text() == "&Undo" and window.undo_action.isEnabled()
    assert window.undo_action.toolTip() == "Undo set depth"


def test_status_messages_are_plain_text(window):
    window.show_keys_help()
    assert "<" not in window.statusBar().currentMessage()
    window.document.notice.emit("<b>Held</b>: the point stays")
    assert window.statusBar().currentMessage() == "Held: the point stays"


def test_name_and_notes_in_the_header_are_one_undo_step_each(window, qtbot):
    header = window.header
    assert header.name_edit.text() == window.document.committed.name
    header.name_edit.setFocus()
    header.name_edit.selectAll()
    qtbot.keyClicks(header.name_edit, "Heron II")
    qtbot.keyClick(header.name_edit, Qt.Key.Key_Return)
    assert window.document.committed.name == "Heron II"
    header.notes_edit.setFocus()
    header.notes_edit.moveCursor(QTextCursor.MoveOperation.End)
    qtbot.keyClicks(header.notes_edit, " Bottom glassed 12 May.")
    header.name_edit.setFocus()  # leaving the notes commits them
    assert window.document.committed.notes.endswith(" Bottom glassed 12 May.")
    assert window.document.undo_stack.count() == 2
    window.document.undo_stack.undo()
    assert "12 May" not in header.notes_edit.toPlainText()


def test_trim_is_said_in_words(window):
    hs = window.document.analysis.hydrostatics
    words = window.results.units["trim"].text()
    assert words in ("° by the bow", "° by the stern", "° level")
    assert (hs.trim_deg > 0) == (words == "° by the bow") or words == "° level"
    assert "-" not in window.results.values["trim"].text()


def test_a_click_on_the_gz_curve_heels_the_section(window, qtbot):
    import math

    import numpy as np

    plot = window.results.gz_plot
    window.section_view.show_heel(None)
    with qtbot.waitSignal(plot.heelPicked) as picked:
        point = plot.getViewBox().mapViewToScene(pg_point(20.0, 0.0))
        qtbot.mouseClick(plot.viewport(), Qt.MouseButton.LeftButton, pos=plot.mapFromScene(point))
    assert picked.args[0] == pytest.approx(20.0, abs=1.0)
    view = window.section_view
    ys, zs = view.waterline.getData()
    tilt = math.degrees(math.atan2(zs[1] - zs[0], ys[1] - ys[0]))
    curve = window.document.analysis.curve
    shown = curve.heel_deg[np.argmin(np.abs(curve.heel_deg - picked.args[0]))]
    assert tilt == pytest.approx(shown, abs=1e-6)  # the water plane turned by the heel
    (gx, gy), (zx, zy) = zip(*view.arm.getData())
    i = int(np.argmin(np.abs(curve.heel_deg - shown)))
    assert math.hypot(zx - gx, zy - gy) == pytest.approx(abs(curve.gz[i]), abs=1e-9)
    assert "heeled" in view.heel_text.text() and view.upright.isVisible()
    view.upright.click()
    _ys, zs = view.waterline.getData()
    assert zs[0] == zs[1] and view.heel_text.text() == ""
    assert len(view.arm.getData()[0]) == 0 and len(view.buoyancy_line.getData()[0]) == 0


def pg_point(x, y):
    from PySide6.QtCore import QPointF

    return QPointF(x, y)


@pytest.mark.parametrize("name", ["drift-lab-raft", "paper-loon-canoe"])  # holds, capsizes
def test_the_crew_shift_heel_is_shown_in_the_section(qtbot, name):
    w = MainWindow(HullDocument(sample(name)), open_settings())
    w.ask = lambda *a: QMessageBox.StandardButton.Discard
    qtbot.addWidget(w)
    with qtbot.waitSignal(w.checks.checksReady, timeout=30000):
        w.document.recompute_now()
    shift = w.checks.results.shift
    w.show_crew_shift_heel()
    if shift.static_heel_deg is None:  # capsizes: nothing to show, and it says so
        assert "capsizes" in w.statusBar().currentMessage()
        assert w.section_view.heel_deg is None
    else:
        assert w.section_view.heel_deg == shift.static_heel_deg
        assert "heeled" in w.section_view.heel_text.text()


def test_pin_a_version_and_compare(window, qtbot):
    doc = window.document
    window.pin_version()
    box = window.dimensions.fields["beam"]
    box.setValue(1.2)
    doc.recompute_now()
    text = window.results.compare.text()
    assert window.results.compare.isVisible() or not window.isVisible()
    beam = next(line for line in text.splitlines() if line.startswith("Beam"))
    assert beam.split()[1:] == ["960", "mm", "1200", "mm"]
    x, _y = window.results.gz_plot.pinned_curve.getData()
    assert len(x) == len(doc.analysis.curve.heel_deg)
    px, _py = window.plan_view.pinned_item.getData()
    assert len(px) > 0
    window.pin_version(False)
    assert len(window.plan_view.pinned_item.getData()[0]) == 0
    assert not window.results.compare.isVisible()


def test_the_plate_at_the_builders_stations(window, tmp_path):
    import app.plate as plate

    out = tmp_path / "plate.png"
    window._write_plate(plate, out, "A4", 72, stations=(0.3, None))
    assert out.exists() and "Plate written" in window.statusBar().currentMessage()
