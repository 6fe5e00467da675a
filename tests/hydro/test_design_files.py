"""Design files: round trip, and broken or foreign files refused with a clear message."""

import json
import re

import pytest

from hydro import DesignFileError, analyse, load_design, save_design
from hydro.io import design_to_dict
from tests.paths import SAMPLES


@pytest.mark.parametrize("name", sorted(p.name for p in SAMPLES.glob("*.json")))
def test_samples_round_trip_exactly(tmp_path, name):
    design = load_design(SAMPLES / name)
    path = tmp_path / name
    save_design(design, path)
    again = load_design(path)
    assert design_to_dict(again) == design_to_dict(design)
    a, b = analyse(design), analyse(again)
    assert a.hydrostatics.gm == b.hydrostatics.gm
    assert list(a.curve.gz) == list(b.curve.gz)


def _sample_dict():
    return json.loads((SAMPLES / "heron-punt.json").read_text())


def _mutate(path, change):
    data = _sample_dict()
    change(data)
    path.write_text(json.dumps(data))


@pytest.mark.parametrize(
    "change,message",
    [
        (lambda d: d.update(format="something-else"), "not a Hullwright design file"),
        (lambda d: d.update(version=99), "version 99 is not supported"),
        (lambda d: d["loads"]["crew"][0].update(mass_kg="heavy"), "design.loads.crew[0].mass_kg must be a number"),
        (lambda d: d["loads"]["crew"][0].update(mass_kg=-5), "design.loads.crew[0].mass_kg is too small (at least 0"),
        (lambda d: d["hull"].pop("sketch"), "needs either 'sketch' or 'offsets'"),
        (lambda d: d["hull"]["sketch"]["plan_half_breadth"].update(points_m=[[0, 0.3], [1, "x"]]), "design.hull.sketch.plan_half_breadth.points_m[1][1] must be a number"),
        (lambda d: d["water"].update(preset="lemonade"), "design.water.preset must be one of"),
        (lambda d: d.update(water={"density_kg_m3": 5000}), "density_kg_m3 is too large"),
        (lambda d: d["analysis"].update(heel_step_deg=0), "design.analysis.heel_step_deg is too small"),
    ],
)
def test_bad_values_are_named(tmp_path, change, message):
    path = tmp_path / "bad.json"
    _mutate(path, change)
    with pytest.raises(DesignFileError, match=re.escape(message)):
        design = load_design(path)
        analyse(design)


@pytest.mark.parametrize(
    "content,message",
    [
        (b"{ not json", "not valid JSON"),
        (b"\xff\xfe\x00binary", "not a UTF-8 text file"),
        (b"[1, 2, 3]", "not a Hullwright design file"),
        (b"", "not valid JSON"),
    ],
)
def test_broken_or_foreign_files(tmp_path, content, message):
    path = tmp_path / "broken.json"
    path.write_bytes(content)
    with pytest.raises(DesignFileError, match=re.escape(message)):
        load_design(path)


def test_missing_file(tmp_path):
    with pytest.raises(DesignFileError, match="no such file"):
        load_design(tmp_path / "nothing.json")


def test_save_is_atomic_and_leaves_no_temporary_files(tmp_path):
    design = load_design(SAMPLES / "tern-pram.json")
    path = tmp_path / "pram.json"
    save_design(design, path)
    save_design(design, path)
    assert [p.name for p in tmp_path.iterdir()] == ["pram.json"]
