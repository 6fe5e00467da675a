"""The window's file handling: save and reopen, broken files, close prompts, recovery, units."""

import sys
from dataclasses import replace

import pytest

from hydro.units import parse_length
from PySide6.QtWidgets import QMessageBox

from hydro import load_design

from app.document import HullDocument
from app.main_window import MainWindow, sample_paths
from app.safety_dialog import SafetyDialog
from app.settings import open_settings, recent_files
from tests.app.helpers import sample

Button = QMessageBox.StandardButton


def _window(qtbot, design=None, answer=Button.Discard):
    window = MainWindow(HullDocument(design or sample("heron-punt")), open_settings())
    window.ask = lambda *args: answer
    qtbot.addWidget(window)
    window.document.recompute_now()
    return window


def _widen(window, amount=0.05):
    doc = window.document
    hull = doc.committed.hull
    x, b = hull.plan.points[2]
    doc.edit(replace(doc.committed, hull=replace(hull, plan=hull.plan.with_point(2, (x, b + amount)))), "wider")
    doc.recompute_now()


def _readout(window):
    return {key: label.text() for key, label in window.results.values.items()}


def test_save_close_reopen_gives_the_same_figures(qtbot, tmp_path):
    window = _window(qtbot)
    _widen(window)
    assert window.isWindowModified() or window.document.is_modified
    path = tmp_path / "wide punt.json"
    assert window.save_to(path)
    assert not window.document.is_modified
    figures, gm = _readout(window), window.document.analysis.hydrostatics.gm
    assert window.close()
    again = _window(qtbot, design=sample("tern-pram"))
    assert again.open_path(path)
    again.document.recompute_now()
    assert _readout(again) == figures
    assert again.document.analysis.hydrostatics.gm == gm
    assert again.document.path == path.resolve()
    assert recent_files(again.settings)[0] == str(path.resolve())


def test_broken_file_shows_a_message_and_loses_nothing(qtbot, tmp_path):
    window = _window(qtbot)
    _widen(window)
    before, undo_count = window.document.committed, window.document.undo_stack.count()
    broken = tmp_path / "broken.json"
    broken.write_text("{ this is not json")
    assert not window.open_path(broken, confirmed=True)
    box = window.message_box
    assert box is not None and box.isVisible()
    assert "not valid JSON" in box.text() and "unchanged" in box.text()
    foreign = tmp_path / "foreign.json"
    foreign.write_text('{"format": "someone-else", "version": 3}')
    assert not window.open_path(foreign, confirmed=True)
    assert "not a Hullwright design" in window.message_box.text()
    assert window.document.committed is before
    assert window.document.undo_stack.count() == undo_count
    assert window.document.is_modified


def test_close_with_unsaved_changes_asks_first(qtbot, tmp_path):
    window = _window(qtbot, answer=Button.Cancel)
    _widen(window)
    window.show()
    assert not window.close()
    assert window.isVisible()
    window.ask = lambda *args: Button.Discard
    assert window.close()


def test_autosave_and_recovery_after_a_crash(qtbot):
    window = _window(qtbot)
    _widen(window, 0.07)
    window.autosave()
    recovery = window.recovery.path
    assert recovery.exists()
    edited = window.document.committed
    # a live window's file is not an orphan
    assert not _window(qtbot, answer=Button.Yes).offer_recovery()
    window.recovery.abandon()  # a crash: the lock goes with the process, the file stays
    survivor = _window(qtbot, answer=Button.Yes)
    assert survivor.offer_recovery()
    assert survivor.document.committed == edited
    assert survivor.document.is_modified
    assert not recovery.exists() and survivor.recovery.path.exists()
    survivor.ask = lambda *args: Button.Discard
    assert survivor.close()
    assert not survivor.recovery.path.exists()


def test_declining_recovery_deletes_the_copy(qtbot):
    window = _window(qtbot)
    _widen(window)
    window.autosave()
    window.recovery.abandon()
    other = _window(qtbot, answer=Button.No)
    assert not other.offer_recovery()
    assert not window.recovery.path.exists()


def test_each_window_has_its_own_recovery_file(qtbot):
    """Closing the second window leaves the first one's autosave alone."""
    first, second = _window(qtbot), _window(qtbot)
    _widen(first, 0.03)
    _widen(second, 0.06)
    first.autosave()
    second.autosave()
    assert first.recovery.path != second.recovery.path
    assert first.recovery.path.exists() and second.recovery.path.exists()
    assert second.close()
    assert first.recovery.path.exists() and not second.recovery.path.exists()
    assert not _window(qtbot).offer_recovery()  # first is alive: nothing to recover


def test_autosave_follows_an_edit_within_two_seconds_and_goes_on_save(qtbot, tmp_path):
    window = _window(qtbot)
    assert window.recovery.timer.interval() <= 2000 and window.recovery.timer.isSingleShot()
    _widen(window)
    qtbot.waitUntil(window.recovery.path.exists, timeout=3000)
    assert window.save_to(tmp_path / "punt.json")
    assert not window.recovery.path.exists()


def test_first_run_notice_once_and_never_blocking(qtbot):
    window = _window(qtbot)
    window.show()
    dialog = window.show_first_run_notice()
    assert isinstance(dialog, SafetyDialog) and dialog.isVisible()
    dialog.accept()
    assert window.show_first_run_notice() is None


def test_units_switch_changes_no_value_and_is_remembered(qtbot):
    window = _window(qtbot)
    design = window.document.committed
    metric = _readout(window)["draft"]
    window.unit_actions["imperial"].trigger()
    assert window.document.committed is design
    assert not window.document.is_modified
    assert window.results.units["draft"].text() == "in"
    shown = parse_length(_readout(window)["draft"], "in")  # fractions to 1/16 inch
    assert shown == pytest.approx(float(metric) / 1000, abs=0.0254 / 32)
    assert window.settings.value("units") == "imperial"
    window.unit_actions["metric"].trigger()
    assert _readout(window)["draft"] == metric


def test_samples_open_as_unsaved_copies(qtbot):
    window = _window(qtbot)
    paths = sample_paths()
    assert len(paths) >= 4
    assert len(window.samples_menu.actions()) == len(paths)
    assert window.open_sample(paths[-1])
    assert window.document.committed == load_design(paths[-1])
    assert window.document.path is None and not window.document.is_modified


def test_plate_export_without_the_plate_module_says_so(qtbot, monkeypatch):
    monkeypatch.setitem(sys.modules, "app.plate", None)
    window = _window(qtbot)
    window.export_plate()
    assert "not part of this build" in window.message_box.text()


def test_title_marks_unsaved_changes(qtbot):
    window = _window(qtbot)
    assert not window.isWindowModified()
    assert "[*]" in window.windowTitle()
    _widen(window)
    assert window.isWindowModified()
    window.document.undo_stack.undo()
    assert not window.isWindowModified()


def test_plate_export_writes_the_file(qtbot, tmp_path):
    plate = pytest.importorskip("app.plate")
    window = _window(qtbot)
    target = tmp_path / "punt-plate.png"
    window._write_plate(plate, target, "A4", 72)
    assert target.exists() and target.stat().st_size > 0
    assert window.message_box is None


def test_new_design_starts_clean(qtbot):
    window = _window(qtbot)
    window.new_design()
    assert window.document.committed.name == "New hull"
    assert window.document.path is None and not window.document.is_modified
    window.document.recompute_now()
    assert window.document.analysis.status == "ok"


def test_a_bad_file_on_the_command_line_starts_a_new_design(tmp_path):
    from app.main import create_window

    bad = tmp_path / "bad.json"
    bad.write_text('{"format": "hullwright.design", "version": 2, "hull": {"offsets": [5]}}')
    window, error = create_window([str(bad)])
    try:
        assert "design.hull.offsets[0] must be an object" in error
        assert window.document.committed.name == "New hull" and window.document.path is None
    finally:
        window.recovery.close()
        window.deleteLater()


def test_edits_beyond_the_limits_are_refused(qtbot):
    window = _window(qtbot)
    doc = window.document
    crew = doc.committed.loads.crew
    heavy = replace(doc.committed.loads, crew=(replace(crew[0], mass=400.0), *crew[1:]))
    notices = []
    doc.notice.connect(notices.append)
    assert not doc.edit(replace(doc.committed, loads=heavy), "heavy")
    assert "more than one person" in notices[-1]
