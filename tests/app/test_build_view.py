"""The build view: rebuilt after committed edits only, warnings shown, File › Export."""

from dataclasses import replace

import pytest

from app.build_view import BuildView
from app.document import HullDocument
from app.main_window import MainWindow
from app.settings import open_settings
from app.view_options import ViewOptions
from hydro.build_pack import build_pack
from tests.app.helpers import sample, slow_first_call


@pytest.fixture
def view(qtbot):
    def make(name: str):
        doc = HullDocument(sample(name))
        widget = BuildView(doc, ViewOptions(), open_settings())
        qtbot.addWidget(widget)
        widget.show()
        qtbot.waitUntil(lambda: widget.pack is not None, timeout=20000)
        return doc, widget

    return make


def _wider(doc, amount=0.06):
    hull = doc.committed.hull
    x, b = hull.plan.points[2]
    return replace(doc.committed, hull=replace(hull, plan=hull.plan.with_point(2, (x, b + amount))))


def test_shows_the_engines_pack(view):
    doc, widget = view("heron-punt")
    expected = build_pack(doc.committed, widget.pack_settings())
    assert [j.piece.name for j in widget.pack.jobs] == [j.piece.name for j in expected.jobs]
    assert f"{expected.sheet_count} sheets" in widget.summary.text()
    assert widget.panels_plot.listDataItems() and widget.sheets_plot.listDataItems()


def test_rebuilt_after_the_drag_is_released_not_during_it(view, qtbot):
    doc, widget = view("heron-punt")
    before = widget.rebuilds
    bottom = widget.pack.jobs[0].piece.width_m
    doc.preview(_wider(doc), "drag")
    doc.preview(_wider(doc, 0.08), "drag")
    qtbot.wait(300)
    widget.wait()
    assert widget.rebuilds == before
    doc.finish_preview("wider")
    qtbot.waitUntil(lambda: widget.rebuilds == before + 1, timeout=20000)
    assert widget.pack.jobs[0].piece.width_m > bottom


def test_warnings_follow_the_strain_limit(view, qtbot):
    doc, widget = view("tern-pram")
    assert widget.warnings.text() == ""
    widget.strain_box.setValue(0.01)
    qtbot.waitUntil(lambda: "strain" in widget.warnings.text(), timeout=20000)


def test_file_export_build_pack_writes_the_pdf(qtbot, tmp_path):
    window = MainWindow(HullDocument(sample("paper-loon-canoe")), open_settings())
    qtbot.addWidget(window)
    assert window.pack_action in window.menuBar().actions()[0].menu().actions()
    out = tmp_path / "canoe-pack.pdf"
    assert window.write_pack(out, "A4")
    assert out.read_bytes().startswith(b"%PDF")
    assert not window.write_pack(tmp_path / "missing" / "x.pdf", "A4")


def test_frames_typed_in_display_units(view, qtbot):
    doc, widget = view("heron-punt")
    widget.frames_edit.setText("800, 1600")
    widget.frames_edit.editingFinished.emit()
    qtbot.waitUntil(lambda: sum(j.piece.kind == "frame" for j in widget.pack.jobs) == 2,
                    timeout=20000)
    frames = [j.piece.position_m for j in widget.pack.jobs if j.piece.kind == "frame"]
    assert frames == pytest.approx([0.8, 1.6])
    widget.frames_edit.setText("800, 9000")
    widget.frames_edit.editingFinished.emit()
    assert "Frames:" in widget.warnings.text()
    assert sum(j.piece.kind == "frame" for j in widget.pack.jobs) == 2


def test_a_drag_stops_the_rebuild_in_progress_at_once(qtbot, monkeypatch):
    import threading

    import app.build_view as build_view

    started = threading.Event()
    slow_first_then_real, calls = slow_first_call(build_pack, started)
    monkeypatch.setattr(build_view, "build_pack", slow_first_then_real)
    doc = HullDocument(sample("heron-punt"))
    widget = BuildView(doc, ViewOptions(), open_settings())
    qtbot.addWidget(widget)
    widget.show()
    assert started.wait(20)
    doc.preview(_wider(doc), "drag")  # the drag's first move: the rebuild stops at once
    assert widget.wait(20000)  # long before its minute was up
    doc.recompute_now()
    assert widget.rebuilds == 0
    doc.finish_preview("wider")
    qtbot.waitUntil(lambda: widget.rebuilds == 1, timeout=20000)
    assert widget.pack is not None and len(calls) == 2
