"""The command line: report (text and JSON), offsets, and exit code 2 on bad input."""

import json

import numpy as np
import pytest

from app.cli import main
from hydro import analyse, load_design
from tests.paths import SAMPLES

PUNT = str(SAMPLES / "heron-punt.json")
REQUIRED = [
    "displacement_kg", "volume_m3", "draft_m", "trim_deg", "KB_m", "BM_m", "KM_m", "KG_m",
    "GM_m", "gunwale_immersion_deg", "gz",
]


@pytest.mark.parametrize("name", sorted(p.name for p in SAMPLES.glob("*.json")))
def test_report_json_on_every_sample(capsys, name):
    assert main(["report", str(SAMPLES / name), "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    for key in REQUIRED:
        assert key in data, key
    expected = analyse(load_design(SAMPLES / name))
    assert data["GM_m"] == pytest.approx(expected.hydrostatics.gm)
    assert [p["heel_deg"] for p in data["gz"]] == list(expected.curve.heel_deg)
    assert data["status"] == "ok" and data["GM_m"] > 0


def test_report_text(capsys):
    assert main(["report", PUNT]) == 0
    out = capsys.readouterr().out
    assert "GM" in out and "not a certification" in out


def test_offsets_then_report_on_the_table(tmp_path, capsys):
    csv_path = tmp_path / "punt.csv"
    assert main(["offsets", PUNT, "-o", str(csv_path)]) == 0
    design = load_design(PUNT)
    result = analyse(design)
    w = result.weights
    cg = f"{w.lcg},{w.tcg},{w.vcg}"
    args = ["report", "--offsets", str(csv_path), "--mass", str(w.mass), "--cg", cg, "--json"]
    assert main(args) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["draft_m"] == pytest.approx(result.hydrostatics.draft_mid, abs=1e-6)
    assert data["GM_m"] == pytest.approx(result.hydrostatics.gm, abs=1e-5)
    assert main(args[:-1] + ["--water", "sea", "--heel-step", "5", "--json"]) == 0
    sea = json.loads(capsys.readouterr().out)
    assert sea["draft_m"] < data["draft_m"]
    assert [p["heel_deg"] for p in sea["gz"]][:3] == [0.0, 5.0, 10.0]


@pytest.mark.parametrize(
    "args,message",
    [
        (["report", "nope.json"], "no such file"),
        (["report"], "give a design file"),
        (["report", "--offsets", "x.csv"], "needs --mass"),
        (["report", PUNT, "--heel-step", "0"], "--heel-step must be from 0.1 to 15"),
        (["report", PUNT, "--heel-max", "500"], "--heel-max must be from 5 to 180"),
        (["offsets", PUNT, "-o", "/no/such/folder/x.csv"], "does not exist"),
    ],
)
def test_bad_input_exits_2_with_one_line(capsys, args, message):
    assert main(args) == 2
    err = capsys.readouterr().err.strip()
    assert message in err and "\n" not in err


def test_bad_offsets_options(tmp_path, capsys):
    csv_path = tmp_path / "hull.csv"
    assert main(["offsets", PUNT, "-o", str(csv_path)]) == 0
    for extra, message in (
        (["--mass", "-3", "--cg", "1,0,0.2"], "--mass must be from"),
        (["--mass", "100", "--cg", "1,0"], "--cg must be three numbers"),
        (["--mass", "100", "--cg", "1,0,0.2", "--water", "mud"], "unknown water"),
    ):
        capsys.readouterr()
        assert main(["report", "--offsets", str(csv_path), *extra]) == 2
        assert message in capsys.readouterr().err


def test_nothing_written_on_bad_input(tmp_path, capsys):
    bad = tmp_path / "bad.json"
    bad.write_text("{")
    out = tmp_path / "out.csv"
    assert main(["offsets", str(bad), "-o", str(out)]) == 2
    assert not out.exists()


def test_check_command_json(capsys):
    assert main(["check", str(SAMPLES / "drift-lab-raft.json"), "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    from hydro.heel_checks import crew_shift

    shift = crew_shift(load_design(SAMPLES / "drift-lab-raft.json"))
    assert data["crew_shift"]["verdict"] == shift.verdict  # what the engine found, printed
    assert data["crew_shift"]["static_heel_deg"] == pytest.approx(shift.static_heel_deg)
    assert len(data["level_trim"]) == 2 and data["level_trim"][0]["trim_after_deg"] == pytest.approx(0, abs=0.01)
    assert data["beam_for_gm"]["gm_after_m"] == pytest.approx(0.15, abs=1e-3)
    assert [r["case"] for r in data["sensitivity"]][0] == "as designed"
    assert data["swamping"]["floats_swamped"] is None  # sealed pontoons: a closed hull


def test_check_command_text_and_bad_crew(capsys):
    assert main(["check", PUNT, "--crew", "1", "--distance", "0.1"]) == 0
    out = capsys.readouterr().out
    assert "Crew shift (bow paddler (junior) 100 mm to the side)" in out
    assert main(["check", PUNT, "--crew", "x"]) == 2
    assert "crew numbers" in capsys.readouterr().err
    assert main(["check", PUNT, "--crew", "7"]) == 2
    assert "the design has 2 crew" in capsys.readouterr().err


def test_incline_command(tmp_path, capsys):
    readings = tmp_path / "readings.csv"
    readings.write_text("mass_kg,distance_m,heel_deg\n10,0.4,1.2\n10,-0.4,-1.25\n10,0.5,1.5\n10,-0.5,-1.52\n")
    assert main(["incline", PUNT, str(readings), "--mass", "60", "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["displacement_kg"] == pytest.approx(60.0)
    assert data["KG_m"] == pytest.approx(data["KM_m"] - data["GM_m"])
    readings.write_text("mass_kg,distance_m,heel_deg\n10,0.4,abc\n")
    assert main(["incline", PUNT, str(readings), "--mass", "60"]) == 2
    assert "'heel_deg' is not a number" in capsys.readouterr().err
    readings.write_text("weight,where\n1,2\n")
    assert main(["incline", PUNT, str(readings), "--mass", "60"]) == 2
    assert "unknown column 'weight'" in capsys.readouterr().err


def test_resize_round_trips(tmp_path):
    src = SAMPLES / "heron-punt.json"
    bigger, back = tmp_path / "bigger.json", tmp_path / "back.json"
    assert main(["resize", str(src), "--length", "12 ft", "--beam", "3' 6\"", "--depth", "45 cm",
                 "-o", str(bigger)]) == 0
    design = load_design(bigger)
    assert design.hull.length == pytest.approx(12 * 0.3048, abs=1e-12)
    assert 2 * max(b for _x, b in design.hull.plan.points) == pytest.approx(42 * 0.0254, abs=1e-12)
    original = load_design(src)
    assert main(["resize", str(bigger), "--length", "2.6", "--beam", "960 mm", "--depth", "0.4",
                 "-o", str(back)]) == 0
    again = load_design(back)
    for name in ("plan", "keel", "sheer"):
        assert np.allclose(getattr(again.hull, name).points, getattr(original.hull, name).points,
                           atol=1e-12)
    for a, b in zip(again.hull.sections, original.hull.sections):
        assert np.allclose(a.points, b.points, atol=1e-12) and a.x == pytest.approx(b.x)
    assert [c.x for c in again.loads.crew] == pytest.approx([c.x for c in original.loads.crew])


@pytest.mark.parametrize(
    "extra, words",
    [
        (["--beam", "3,5"], "comma"),
        (["--beam", "wide"], "cannot read"),
        (["--length", "14134 in"], "more than the plausible"),
        ([], "at least one of"),
    ],
)
def test_resize_refuses_bad_lengths(tmp_path, capsys, extra, words):
    out = tmp_path / "new.json"
    assert main(["resize", str(SAMPLES / "heron-punt.json"), *extra, "-o", str(out)]) == 2
    assert words in capsys.readouterr().err
    assert not out.exists()


def test_resize_will_not_overwrite_its_source(tmp_path, capsys):
    src = tmp_path / "punt.json"
    src.write_bytes((SAMPLES / "heron-punt.json").read_bytes())
    before = src.read_bytes()
    assert main(["resize", str(src), "--beam", "1 m", "-o", str(src)]) == 2
    assert "new file" in capsys.readouterr().err
    assert src.read_bytes() == before


def test_report_in_feet_and_inches_has_no_decimal_lengths(capsys):
    assert main(["report", str(SAMPLES / "paper-loon-canoe.json"), "--units", "imperial"]) == 0
    out = capsys.readouterr().out
    gm = next(line for line in out.splitlines() if line.startswith("GM "))
    assert gm.rstrip().endswith(" in") and "." not in gm
    assert " mm" not in out and " kg" not in out


def test_offsets_at_the_builders_stations(tmp_path, capsys):
    out = tmp_path / "offsets.csv"
    assert main(["offsets", str(SAMPLES / "paper-loon-canoe.json"), "--spacing", "1 ft",
                 "-o", str(out)]) == 0
    xs = sorted({float(line.split(",")[0]) for line in out.read_text().splitlines()[2:]})
    assert xs[:3] == pytest.approx([0.0, 0.3048, 0.6096], abs=1e-6) and xs[-1] == pytest.approx(3.4)
    assert main(["offsets", str(SAMPLES / "paper-loon-canoe.json"), "--spacing", "1 ft",
                 "--stations", "9", "-o", str(out)]) == 2
    assert "not both" in capsys.readouterr().err
