"""The pack command: JSON keys, and one-line refusals with exit code 2."""

import json

import pytest

from app.cli import main, parse_sheet
from tests.paths import SAMPLES

PUNT = str(SAMPLES / "heron-punt.json")


def test_pack_json_keys(capsys):
    assert main(["pack", PUNT, "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert set(data) >= {"panels", "sheets", "materials"}
    assert set(data["sheets"]) == {"size_m", "count", "lower_bound", "utilisation"}
    assert data["sheets"]["size_m"] == [1.22, 2.44]
    assert {"seam_m", "tape_m", "paint_l", "sheets_by_material"} <= set(data["materials"])
    kinds = {p["kind"] for p in data["panels"]}
    assert {"panel", "end", "frame"} <= kinds


def test_pack_sheet_option(capsys):
    assert main(["pack", PUNT, "--json", "--sheet", "5x8ft"]) == 0
    assert json.loads(capsys.readouterr().out)["sheets"]["size_m"] == [1.524, 2.4384]


@pytest.mark.parametrize(
    "extra, message",
    [
        (["--kerf", "0"], "saw kerf must be a positive number"),
        (["--margin", "-2"], "sheet margin must be a positive number"),
        (["--scarf-ratio", "0"], "scarf ratio must be a positive number"),
        (["--tape-roll", "-1"], "tape roll length must be a positive number"),
        (["--sheet", "0x2440"], "must be positive"),
        (["--sheet", "big"], "give WxH"),
        (["--sheet", "300x2440"], "'bottom' is 806 mm wide: it needs a sheet at least 811 mm"),
    ],
)
def test_pack_bad_input_is_one_line_and_exit_2(capsys, extra, message):
    assert main(["pack", PUNT, "--json", *extra]) == 2
    err = capsys.readouterr().err
    assert message in err and err.count("\n") == 1


def test_parse_sheet_units():
    assert parse_sheet("1.25x2.5m") == (1.25, 2.5)
    assert parse_sheet("2440 x 1220") == (1.22, 2.44)


def test_pack_pdf_and_dxf(qapp, tmp_path, capsys):
    import ezdxf

    out = tmp_path / "punt-pack.pdf"
    assert main(["pack", PUNT, "-o", str(out), "--dxf", str(tmp_path), "--paper", "Letter"]) == 0
    assert out.read_bytes().startswith(b"%PDF")
    sheets = sorted(tmp_path.glob("*.dxf"))
    assert sheets
    doc = ezdxf.readfile(sheets[0])
    assert doc.units == ezdxf.units.MM
    layers = {e.dxf.layer for e in doc.modelspace()}
    assert {"CUT", "MARK", "TEXT"} <= layers


@pytest.mark.parametrize(
    "extra, message",
    [
        (["-o", "pack.png"], "must end in .pdf"),
        (["--paper", "B5", "--json"], "--paper must be one of"),
        (["--dxf", "/no/such/folder"], "does not exist"),
        ([], "give -o PACK.pdf, --dxf DIR or --json"),
    ],
)
def test_pack_output_refusals(tmp_path, capsys, extra, message):
    assert main(["pack", PUNT, *extra]) == 2
    assert message in capsys.readouterr().err


def test_round_bilge_pack_says_frames_only(tmp_path, capsys, qapp):
    canoe = str(SAMPLES / "paper-loon-canoe.json")
    assert main(["pack", canoe, "-o", str(tmp_path / "canoe.pdf")]) == 0
    out = capsys.readouterr().out
    assert "note: Round-bilge (smooth) sections have no chines" in out
    assert "pages on A4" in out


def test_pack_cost_from_unit_prices(capsys):
    args = ["--sheet-price", "80", "--tape-price", "9.5", "--paint-price", "20"]
    assert main(["pack", PUNT, "--json", "--offset-spacing", "4in", *args]) == 0
    m = json.loads(capsys.readouterr().out)["materials"]
    sheets = sum(m["sheets_by_material"].values())
    assert m["cost"] == pytest.approx(80 * sheets + 9.5 * m["tape_rolls"] + 20 * m["paint_l"])
