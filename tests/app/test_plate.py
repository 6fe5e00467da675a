"""The print plate: paper and dpi, legible text, margins, samples, marks, PDF, command line."""

from __future__ import annotations

import dataclasses
import re
import struct
import zlib
from pathlib import Path

import numpy as np
import pytest
from PySide6.QtCore import QRectF
from PySide6.QtGui import QFont, QFontDatabase, QFontInfo, QGuiApplication, QImage, QPainter

from app import plate, plate_content, plate_draw
from app.cli import main as cli_main
from app.plate import (
    FONT_FAMILY,
    MIN_TEXT_PT,
    PAPER_SIZES,
    PlateMarks,
    listed_stations,
    paint_plate,
    render_plate_file,
    render_plate_image,
)
from hydro import MassItem, analyse, load_design
from hydro.errors import HullwrightError
from tests.paths import SAMPLES

SAMPLE_FILES = sorted(SAMPLES.glob("*.json"))
LOW_DPI = 60
MARKS = PlateMarks(
    crew_shift_heel_deg=8.0,
    crew_shift_verdict="low gunwale stays 190 mm clear",
    crew_shift_arm=0.05,
    level_trim_seats=(("bow paddler (junior)", 1.0),),
)


@pytest.fixture(scope="module")
def gui_app() -> QGuiApplication:
    app = QGuiApplication.instance() or QGuiApplication([])
    return app  # type: ignore[return-value]


@pytest.fixture
def out_dir(tmp_path: Path) -> Path:
    """An empty folder for plates (tmp_path also holds the app tests' settings)."""
    folder = tmp_path / "plates"
    folder.mkdir()
    return folder


@pytest.fixture(scope="module")
def punt():
    design = load_design(SAMPLES / "heron-punt.json")
    return design, analyse(design)


def _pixels(image: QImage) -> np.ndarray:
    """(h, w) array of the darkest channel of an RGB32 image."""
    image = image.convertToFormat(QImage.Format.Format_RGB32)
    h, w = image.height(), image.width()
    raw = np.frombuffer(image.constBits(), dtype=np.uint8, count=image.sizeInBytes())
    bgra = raw.reshape(h, image.bytesPerLine() // 4, 4)[:, :w, :3]
    return bgra.min(axis=2)


def _paint(design, analysis, paper="A3", dpi=LOW_DPI, units="metric", extras=None):
    w_mm, h_mm = PAPER_SIZES[paper]
    image = QImage(round(w_mm / 25.4 * dpi), round(h_mm / 25.4 * dpi), QImage.Format.Format_RGB32)
    image.setDotsPerMeterX(round(dpi / 0.0254))
    image.setDotsPerMeterY(round(dpi / 0.0254))
    painter = QPainter(image)
    layout = paint_plate(
        painter,
        QRectF(0, 0, image.width(), image.height()),
        dpi,
        design,
        analysis,
        units,
        "sample.json",
        extras,
    )
    painter.end()
    return image, layout


def _png_dpi(path: Path) -> tuple[int, int]:
    """Pixels per metre (x, y) from the PNG's pHYs chunk, read without Qt."""
    data = path.read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    pos = 8
    while pos < len(data):
        length, kind = struct.unpack(">I4s", data[pos : pos + 8])
        body = data[pos + 8 : pos + 8 + length]
        assert (
            zlib.crc32(kind + body)
            == struct.unpack(">I", data[pos + 8 + length : pos + 12 + length])[0]
        )
        if kind == b"pHYs":
            x, y, unit = struct.unpack(">IIB", body)
            assert unit == 1  # metres
            return x, y
        pos += 12 + length
    raise AssertionError("no pHYs chunk")


# ----------------------------------------------------------------------------- fonts


def test_the_plate_font_is_installed(gui_app):
    assert FONT_FAMILY == "DejaVu Sans"
    assert FONT_FAMILY in QFontDatabase.families()
    assert QFontInfo(QFont(FONT_FAMILY)).family() == FONT_FAMILY


# ----------------------------------------------------------------------------- PNG


def test_a4_png_at_300_dpi_has_the_paper_size_and_true_dpi(out_dir, gui_app):
    out = out_dir / "plate.png"
    render_plate_file(load_design(SAMPLES / "tern-pram.json"), out, paper="A4", dpi=300)
    image = QImage(str(out))
    assert (image.width(), image.height()) == (3508, 2480)
    assert image.dotsPerMeterX() == image.dotsPerMeterY() == round(300 / 0.0254)
    assert _png_dpi(out) == (11811, 11811)
    assert [p.name for p in out_dir.iterdir()] == ["plate.png"]  # no temporary left


@pytest.mark.parametrize("paper", sorted(PAPER_SIZES))
def test_image_size_matches_the_paper(paper, punt, gui_app):
    design, analysis = punt
    image = render_plate_image(design, paper, 72, "metric", "x.json", analysis=analysis)
    w_mm, h_mm = PAPER_SIZES[paper]
    assert w_mm > h_mm  # landscape
    assert (image.width(), image.height()) == (round(w_mm / 25.4 * 72), round(h_mm / 25.4 * 72))
    assert image.dotsPerMeterX() == round(72 / 0.0254)


@pytest.mark.parametrize("sample", SAMPLE_FILES, ids=lambda p: p.stem)
def test_each_sample_fills_every_panel_inside_the_margins(sample, gui_app):
    design = load_design(sample)
    units = "imperial" if sample.stem in ("drift-lab-raft", "paper-loon-canoe") else "metric"
    image, layout = _paint(design, analyse(design), units=units)
    ink = _pixels(image) < 160
    assert set(layout.panels) == {"lines", "offsets", "loads", "figures", "gz", "cautions", "title"}
    for name, r in layout.panels.items():
        box = ink[int(r.top()) : int(r.bottom()), int(r.left()) : int(r.right())]
        assert box.mean() > 0.01, f"{name} panel looks blank"
    # white paper outside the sheet border, drawn 2 mm outside the panels' margin
    margin = plate_draw.type_sizes(PAPER_SIZES["A3"][0]).margin
    band = round((margin - 2.0 - 0.5) / 25.4 * LOW_DPI)
    dark = _pixels(image) < 250
    assert not dark[:band].any() and not dark[-band:].any()
    assert not dark[:, :band].any() and not dark[:, -band:].any()
    page = QRectF(0, 0, image.width(), image.height())
    assert page.contains(layout.ink)
    assert layout.smallest_text_pt >= MIN_TEXT_PT


@pytest.mark.parametrize("paper", ["A4", "Letter"])
def test_small_sheets_keep_text_legible(paper, gui_app):
    design = load_design(SAMPLES / "tern-pram.json")
    image, layout = _paint(design, analyse(design), paper=paper, dpi=100)
    assert layout.smallest_text_pt >= MIN_TEXT_PT
    assert QRectF(0, 0, image.width(), image.height()).contains(layout.ink)


def test_background_is_white_and_opaque(punt, gui_app):
    design, analysis = punt
    image = render_plate_image(design, "A4", LOW_DPI, "metric", "", analysis=analysis)
    assert not image.hasAlphaChannel()
    corners = [
        image.pixelColor(x, y) for x in (0, image.width() - 1) for y in (0, image.height() - 1)
    ]
    assert all(c.name() == "#ffffff" for c in corners)


def test_rendering_is_repeatable(punt, gui_app):
    design, analysis = punt
    a, _ = _paint(design, analysis)
    b, _ = _paint(design, analysis)
    assert a == b


def test_metric_and_imperial_plates_differ(punt, gui_app):
    design, analysis = punt
    metric, lm = _paint(design, analysis, units="metric")
    imperial, li = _paint(design, analysis, units="imperial")
    assert metric != imperial
    assert lm.panels.keys() == li.panels.keys()


def test_a3_lines_use_a_standard_scale(punt, gui_app):
    design, analysis = punt
    _, layout = _paint(design, analysis)
    assert layout.scales["lines"] in plate_content.METRIC_SCALES
    assert layout.scales["lines"] <= 25  # a 2.6 m punt fits A3 at 1:20 or larger
    _, imperial = _paint(design, analysis, units="imperial")
    assert imperial.scales["lines"] in plate_content.IMPERIAL_SCALES


# ----------------------------------------------------------------------------- marks


def test_marks_are_drawn_only_when_given(punt, gui_app):
    design, analysis = punt
    plain, layout = _paint(design, analysis)
    empty, _ = _paint(design, analysis, extras={})
    marked, _ = _paint(design, analysis, extras=MARKS)
    as_mapping, _ = _paint(design, analysis, extras=dataclasses.asdict(MARKS))
    assert plain == empty
    assert marked == as_mapping
    gz = layout.panels["gz"].toRect()
    assert plain.copy(gz) != marked.copy(gz)
    lines = layout.panels["lines"].toRect()
    assert plain.copy(lines) != marked.copy(lines)


def test_marks_accept_a_mapping():
    marks = PlateMarks.from_any({"crew_shift_heel_deg": 5, "level_trim_seats": [["bow", "1.5"]]})
    assert marks.crew_shift_heel_deg == 5
    assert marks.level_trim_seats == (("bow", 1.5),)
    assert PlateMarks.from_any(None) == PlateMarks()


def test_a_boat_that_sinks_still_gets_a_plate(punt, gui_app):
    design, _ = punt
    anvil = MassItem("anvil", 4000.0, 1.3, 0.0, 0.2)
    heavy = dataclasses.replace(design, loads=dataclasses.replace(design.loads, items=(anvil,)))
    analysis = analyse(heavy)
    assert analysis.status == "sinks"
    image, layout = _paint(heavy, analysis)
    assert layout.smallest_text_pt >= MIN_TEXT_PT
    assert (_pixels(image.copy(layout.panels["gz"].toRect())) < 160).any()


# ----------------------------------------------------------------------------- helpers


def test_listed_stations_keep_both_ends_and_even_steps():
    assert listed_stations(41, 13) == list(range(0, 41, 4))
    assert listed_stations(41, 21) == list(range(0, 41, 2))
    assert listed_stations(5) == [0, 1, 2, 3, 4]
    odd = listed_stations(38, 9)  # 37 spans: no even step
    assert odd[0] == 0 and odd[-1] == 37 and len(odd) <= 9


# ----------------------------------------------------------------------------- PDF and files


@pytest.mark.parametrize("paper", sorted(PAPER_SIZES))
def test_pdf_page_size_matches_the_paper(paper, out_dir, gui_app):
    out = out_dir / "plate.pdf"
    render_plate_file(load_design(SAMPLES / "heron-punt.json"), out, paper=paper, units="imperial")
    data = out.read_bytes()
    assert data.startswith(b"%PDF")
    boxes = re.findall(rb"/MediaBox\s*\[\s*0 0 ([\d.]+) ([\d.]+)\s*\]", data)
    assert len(boxes) == 1
    w_mm, h_mm = PAPER_SIZES[paper]
    w_pt, h_pt = (float(v) for v in boxes[0])
    assert abs(w_pt - w_mm / 25.4 * 72) <= 1.0 and abs(h_pt - h_mm / 25.4 * 72) <= 1.0


def test_a_failed_render_leaves_no_file(out_dir, monkeypatch, gui_app):
    def broken(*args, **kwargs):
        raise RuntimeError("paint failed")

    monkeypatch.setattr(plate, "paint_plate", broken)
    design = load_design(SAMPLES / "heron-punt.json")
    for name in ("plate.png", "plate.pdf"):
        with pytest.raises(RuntimeError):
            render_plate_file(design, out_dir / name, paper="A4", dpi=LOW_DPI)
    assert list(out_dir.iterdir()) == []


def test_an_existing_plate_is_replaced(out_dir, gui_app):
    out = out_dir / "plate.png"
    out.write_bytes(b"old")
    render_plate_file(load_design(SAMPLES / "heron-punt.json"), out, paper="A4", dpi=LOW_DPI)
    assert QImage(str(out)).width() == round(297 / 25.4 * LOW_DPI)


@pytest.mark.parametrize(
    ("kwargs", "message"),
    [
        ({"paper": "B5"}, "unknown paper"),
        ({"dpi": 5}, "dpi"),
        ({"path_name": "plate.jpg"}, ".png or .pdf"),
    ],
)
def test_render_plate_file_rejects_bad_arguments(kwargs, message, out_dir, gui_app):
    name = kwargs.pop("path_name", "plate.png")
    with pytest.raises(HullwrightError, match=message):
        render_plate_file(load_design(SAMPLES / "heron-punt.json"), out_dir / name, **kwargs)
    assert list(out_dir.iterdir()) == []


# ----------------------------------------------------------------------------- command line


def test_cli_writes_a_plate(out_dir, gui_app):
    out = out_dir / "punt.png"
    code = cli_main(
        [
            "plate",
            str(SAMPLES / "heron-punt.json"),
            "-o",
            str(out),
            "--paper",
            "a4",
            "--dpi",
            "72",
            "--units",
            "imperial",
        ]
    )
    assert code == 0
    image = QImage(str(out))
    assert (image.width(), image.height()) == (842, 595)


def _bad_design_files(folder: Path) -> dict[str, Path]:
    broken = folder / "broken.json"
    broken.write_text("{ this is not json", encoding="utf-8")
    return {"missing": folder / "nowhere.json", "broken": broken}


@pytest.mark.parametrize(
    ("case", "message"),
    [
        ("missing file", "no such file"),
        ("broken JSON", "not valid JSON"),
        ("bad paper", "--paper"),
        ("bad dpi", "--dpi"),
        ("wrong extension", ".png or .pdf"),
        ("missing folder", "does not exist"),
    ],
)
def test_cli_bad_input_exits_2_and_writes_nothing(case, message, out_dir, capsys, gui_app):
    files = _bad_design_files(out_dir)
    sample = str(SAMPLES / "heron-punt.json")
    out = out_dir / "out" / "plate.png"
    out.parent.mkdir()
    args = {
        "missing file": [str(files["missing"]), "-o", str(out)],
        "broken JSON": [str(files["broken"]), "-o", str(out)],
        "bad paper": [sample, "-o", str(out), "--paper", "B5"],
        "bad dpi": [sample, "-o", str(out), "--dpi", "5000"],
        "wrong extension": [sample, "-o", str(out.with_suffix(".jpg"))],
        "missing folder": [sample, "-o", str(out_dir / "no-such-folder" / "plate.png")],
    }[case]
    code = cli_main(["plate", *args])
    err = capsys.readouterr().err
    assert code == 2
    assert message in err and err.startswith("hullwright:")
    assert list(out.parent.iterdir()) == []
    assert not (out_dir / "no-such-folder").exists()


@pytest.mark.parametrize("args", [["--units", "furlongs"], ["--dpi", "high"]])
def test_cli_rejects_bad_options_with_usage(args, out_dir, capsys):
    out = out_dir / "plate.png"
    assert cli_main(["plate", str(SAMPLES / "heron-punt.json"), "-o", str(out), *args]) == 2
    err = capsys.readouterr().err
    assert err.startswith("hullwright: argument") and err.count("\n") == 1
    assert not out.exists()


def test_plate_marks_come_from_the_builders_checks():
    """The plate's crew-shift and level-trim marks are the assessment's own results,
    worded by the same formatter as the checks panel."""
    from app.plate import marks_from_assessment
    from hydro import load_design
    from hydro.aids import level_trim
    from hydro.assess import assess
    from hydro.heel_checks import crew_shift
    from hydro.units import METRIC
    from hydro.wording import heel_verdict_text

    raft = load_design(SAMPLES / "drift-lab-raft.json")
    result = assess(raft)
    marks = marks_from_assessment(result, METRIC)
    shift = crew_shift(raft, analysis=result.analysis)
    assert marks.crew_shift_heel_deg == pytest.approx(shift.static_heel_deg)
    assert marks.crew_shift_arm == pytest.approx(shift.arm0)
    assert marks.crew_shift_verdict == heel_verdict_text(result.shift, METRIC)
    assert "% of the boat's best righting arm" in marks.crew_shift_verdict
    (name, x), = marks.level_trim_seats
    assert x == pytest.approx(next(t.x_after for t in (level_trim(raft, i) for i in range(2)) if t.what == name))
    punt = load_design(SAMPLES / "heron-punt.json")
    capsize = marks_from_assessment(assess(punt), METRIC)
    punt_shift = crew_shift(punt)
    assert punt_shift.static_heel_deg is None  # the case the plate must word without a heel
    assert capsize.crew_shift_heel_deg is None and "capsizes" in capsize.crew_shift_verdict

