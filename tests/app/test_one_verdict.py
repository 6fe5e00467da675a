"""One verdict everywhere: the app's readout and checks panel, the command line and the
plate show the same status, list and checks, taken from the same assessment."""

import json
from dataclasses import replace

import pytest

from app import plate_draw
from app.checks_panel import ChecksPanel
from app.cli import main as cli_main
from app.document import HullDocument
from app.gz_plot import GzPlot
from app.plate import marks_from_assessment, render_plate_image
from app.results_panel import ResultsPanel
from app.view_options import ViewOptions
from hydro import save_design
from hydro.assess import assess
from hydro.stability import Status
from hydro.wording import heel_verdict_text, status_sentence
from tests.app.helpers import sample

SAMPLE_NAMES = ["heron-punt", "paper-loon-canoe", "drift-lab-raft", "tern-pram"]


def _off_centre_punt():
    """The two-seat punt with its 58 kg paddler sitting 0.3 m to starboard."""
    punt = sample("heron-punt")
    crew = list(punt.loads.crew)
    who = next(i for i, c in enumerate(crew) if c.mass == 58.0)
    crew[who] = replace(crew[who], y=0.3)
    return replace(punt, loads=replace(punt.loads, crew=tuple(crew)))


def _leaning_punt():
    """The punt with its bow paddler leaning 120 mm to starboard: it lists, and holds."""
    punt = sample("heron-punt")
    crew = (replace(punt.loads.crew[0], y=0.12),) + punt.loads.crew[1:]
    return replace(punt, loads=replace(punt.loads, crew=crew))


def _plate_texts(design, monkeypatch, assessment=None):
    """Every string the plate paints (recorded from the canvas)."""
    drawn: list[str] = []
    real = plate_draw.Canvas.text

    def record(self, x, y, w, h, s, *args, **kwargs):
        drawn.append(s)
        return real(self, x, y, w, h, s, *args, **kwargs)

    monkeypatch.setattr(plate_draw.Canvas, "text", record)
    result = assessment or assess(design)
    render_plate_image(design, "A3", 40, "metric", "t.json",
                       marks_from_assessment(result, ViewOptions().units), result.analysis)
    return drawn


def _readout(qtbot, design):
    doc = HullDocument(design)
    panel = ResultsPanel(doc, ViewOptions())
    qtbot.addWidget(panel)
    doc.recompute_now()
    return panel


@pytest.mark.parametrize("make", [_off_centre_punt, _leaning_punt] + [
    (lambda n=n: sample(n)) for n in SAMPLE_NAMES
])
def test_app_report_check_and_plate_agree(make, qtbot, tmp_path, capsys, monkeypatch):
    design = make()
    path = tmp_path / "d.json"
    save_design(design, path)
    result = assess(design)
    sentence = status_sentence(result.analysis, ViewOptions().units)
    assert cli_main(["report", str(path), "--json"]) == 0
    report = json.loads(capsys.readouterr().out)
    assert report["status"] == result.status.value
    assert report["list_deg"] == (None if result.list_deg is None else pytest.approx(result.list_deg))
    if result.floats and result.list_deg is not None:
        assert cli_main(["check", str(path), "--json"]) == 0
        check = json.loads(capsys.readouterr().out)
        assert check["status"] == report["status"]
        assert check["crew_shift"]["margins"]["share_of_max_righting_arm"] == pytest.approx(
            result.shift.arm_share)
    panel = _readout(qtbot, design)
    assert panel.status.text() == sentence
    texts = _plate_texts(design, monkeypatch, result)
    assert " ".join(sentence.split()) in " ".join(" ".join(texts).split())
    badge = panel.state.text()
    if result.status is not Status.OK:  # never a green verdict beside a red one
        assert "STABLE" not in badge.replace("UNSTABLE", "")
        assert panel.state.property("gm_state") == "unstable"
        assert not any("Floats upright" in t for t in texts)


def test_the_off_centre_paddler_is_not_ok_anywhere(qtbot, tmp_path, capsys, monkeypatch):
    design = _off_centre_punt()
    path = tmp_path / "punt.json"
    save_design(design, path)
    assert cli_main(["report", str(path)]) == 0
    out = capsys.readouterr().out
    assert "Capsizes" in out and "Floats upright" not in out
    assert cli_main(["check", str(path)]) == 0  # a result, not bad input
    out = capsys.readouterr().out
    assert "Status: Capsizes" in out and "holds" not in out
    panel = _readout(qtbot, design)
    assert panel.status.text().startswith("Capsizes")
    assert "CAPSIZES" in panel.state.text() and "STABLE" not in panel.state.text()
    texts = " ".join(_plate_texts(design, monkeypatch))
    assert "Capsizes" in texts and "capsizes" in texts  # status line and floating position
    assert "to beyond" not in texts  # no "range of positive GZ 0° to beyond 90°"


def test_plate_and_screen_text_come_from_the_same_result(qtbot, monkeypatch):
    doc = HullDocument(_leaning_punt())
    options = ViewOptions()
    plot = GzPlot()
    widget = ChecksPanel(doc, options, plot)
    qtbot.addWidget(widget)
    qtbot.addWidget(plot)
    try:
        with qtbot.waitSignal(widget.checksReady, timeout=30000):
            widget.recompute()
        shown = widget.results.assessment
        marks = marks_from_assessment(shown, options.units)
        assert marks.crew_shift_verdict == heel_verdict_text(shown.shift, options.units)
        assert marks.crew_shift_verdict in widget.shift_verdict.text()
        assert marks.boarding_verdict in widget.boarding_verdict.text()
        texts = _plate_texts(doc.committed, monkeypatch, shown)
        assert any(t.startswith(marks.crew_shift_title) for t in texts)
    finally:
        widget.shutdown()


def test_check_cases_are_saved_in_the_design_one_undo_step_each(qtbot):
    doc = HullDocument(sample("drift-lab-raft"))
    options = ViewOptions()
    widget = ChecksPanel(doc, options, None)
    qtbot.addWidget(widget)
    try:
        widget.mode_gunwale.setChecked(True)
        assert doc.committed.checks.shift_to_gunwale and doc.undo_stack.count() == 1
        widget.boarding_box.setValue(options.units.to_mass(60.0))
        widget.boarding_box.editingFinished.emit()
        assert doc.committed.checks.boarding_mass_kg == pytest.approx(60.0)
        assert doc.undo_stack.count() == 2
        doc.undo_stack.undo()
        assert doc.committed.checks.boarding_mass_kg == pytest.approx(75.0)
        assert widget.boarding_box.value() == pytest.approx(options.units.to_mass(75.0))
    finally:
        widget.shutdown()


def test_an_unexpected_failure_reads_no_result(qtbot, monkeypatch):
    import app.document as document

    doc = HullDocument(sample("heron-punt"))
    panel = ResultsPanel(doc, ViewOptions())
    qtbot.addWidget(panel)
    doc.recompute_now()
    assert panel.values["gm"].text() != "—"

    def broken(design):
        raise ValueError("a geometry library failed")

    monkeypatch.setattr(document, "analyse", broken)
    doc.edit(replace(doc.committed, name="changed"), "rename")
    doc.recompute_now()
    assert panel.status.text().startswith("No result")
    assert "geometry library failed" in panel.status.text()
    assert all(v.text() == "—" for v in panel.values.values())


@pytest.mark.parametrize("open_boat", [True, False])
def test_plate_honours_the_open_or_closed_hull(open_boat, monkeypatch):
    design = sample("tern-pram")
    design = replace(design, settings=replace(design.settings, open_boat=open_boat))
    assert assess(design, checks=False).analysis.curve.gunwale_immersion_deg < 90
    texts = _plate_texts(design, monkeypatch)
    assert any("open boat floods beyond" in t for t in texts) == open_boat
    assert any(t.startswith("deck edge under") for t in texts) == (not open_boat)


def test_what_if_crew_masses_are_saved_with_the_design(qtbot):
    """Children are not 84 kg adults: the what-if crew masses are the builder's, saved
    in the design (one undo step), and the what-if row uses them."""
    doc = HullDocument(sample("heron-punt"))
    options = ViewOptions()
    widget = ChecksPanel(doc, options, None)
    qtbot.addWidget(widget)
    try:
        widget.whatif_crew.setText("40, 45")
        with qtbot.waitSignal(widget.checksReady, timeout=30000):
            widget.whatif_crew.editingFinished.emit()
        assert doc.committed.checks.whatif_crew_kg == pytest.approx((40.0, 45.0))
        assert doc.undo_stack.count() == 1
        row = next(r for r in widget.results.sensitivity if r.kind == "heavier crew")
        assert row.amount == pytest.approx(45.0)
        widget.whatif_crew.setText("40")  # one mass for two paddlers: refused in words
        widget.whatif_crew.editingFinished.emit()
        assert doc.undo_stack.count() == 1 and "give 2 mass" in widget.state.text()
        assert widget.whatif_crew.text() == "40.0, 45.0"
    finally:
        widget.shutdown()
