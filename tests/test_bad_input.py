"""Hostile input: the command line keeps its promise (exit 2, one line on stderr, nothing
written) for random bytes, random JSON trees and random CSV rows, and files survive."""

from __future__ import annotations

import csv
import io
import json
import os
import stat
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from app.cli import EXIT_BAD_INPUT, main
from hydro import DesignFileError, load_design, read_offsets
from hydro.errors import OutputError
from hydro.io import read_text
from hydro.limits import LimitError
from hydro.outputs import TEMP_PREFIX, check_output, remove_stale_temps, write_bytes
from tests.paths import SAMPLES

ROOT = Path(__file__).resolve().parents[1]
PUNT = SAMPLES / "heron-punt.json"
FUZZ = settings(max_examples=40, deadline=None,
                suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow])


def _cli(capsys, argv: list[str]) -> tuple[int, str, str]:
    code = main(argv)
    out, err = capsys.readouterr()
    return code, out, err


def _kept_promise(code: int, err: str, folder: Path, before: set[str]) -> None:
    """Refused with exactly one line, and nothing new in the folder."""
    assert code == EXIT_BAD_INPUT, err
    lines = err.splitlines()
    assert len(lines) == 1 and lines[0].startswith("hullwright: "), err
    assert {p.name for p in folder.iterdir()} == before


# ----------------------------------------------------------------------------- fuzz


@FUZZ
@given(data=st.binary(max_size=2000))
def test_random_bytes_are_refused_and_nothing_written(capsys, data):
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        (folder / "design.json").write_bytes(data)
        code, _, err = _cli(capsys, ["offsets", str(folder / "design.json"), "-o", str(folder / "out.csv")])
        _kept_promise(code, err, folder, {"design.json"})


_LEAVES = (
    st.none() | st.booleans() | st.integers() | st.floats(allow_nan=False) | st.text(max_size=8)
    | st.sampled_from([1e308, -1e308, 10**400, "\ud800", "", 0, -1, 2.5])
)
_TREES = st.recursive(_LEAVES, lambda c: st.lists(c, max_size=4) | st.dictionaries(st.text(max_size=6), c, max_size=4),
                      max_leaves=12)


def _paths(node, prefix=()):
    """Every key/index path in a JSON tree."""
    yield prefix
    if isinstance(node, dict):
        for k, v in node.items():
            yield from _paths(v, (*prefix, k))
    elif isinstance(node, list):
        for i, v in enumerate(node[:3]):
            yield from _paths(v, (*prefix, i))


_SAMPLE = json.loads(PUNT.read_text())
_SAMPLE_PATHS = [p for p in _paths(_SAMPLE) if p]


@FUZZ
@given(where=st.sampled_from(_SAMPLE_PATHS), value=_TREES, extra_key=st.booleans())
def test_random_json_in_a_design_is_refused_or_read_whole(capsys, where, value, extra_key):
    design = json.loads(json.dumps(_SAMPLE))
    node = design
    for part in where[:-1]:
        node = node[part]
    if extra_key and isinstance(node, dict):
        node[f"{where[-1]}_x"] = value
    else:
        node[where[-1]] = value
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        src = folder / "design.json"
        src.write_text(json.dumps(design), encoding="utf-8", errors="surrogatepass")
        code, _, err = _cli(capsys, ["offsets", str(src), "-o", str(folder / "out.csv")])
        if code == 0:  # the change happened to be a valid design
            assert err == "" and read_offsets(folder / "out.csv").x.size >= 2
        else:
            _kept_promise(code, err, folder, {"design.json"})


@FUZZ
@given(tree=_TREES)
def test_random_json_trees_are_refused(capsys, tree):
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        (folder / "t.json").write_text(json.dumps(tree), encoding="utf-8", errors="surrogatepass")
        code, _, err = _cli(capsys, ["offsets", str(folder / "t.json"), "-o", str(folder / "out.csv")])
        _kept_promise(code, err, folder, {"t.json"})


_CELLS = st.one_of(
    st.floats(-2.0, 2.0).map(lambda v: f"{v:.3f}"),
    st.floats(allow_nan=True, allow_infinity=True).map(repr),
    st.sampled_from(["x_m", "nan", "inf", "1e308", "-0", "", " ", "#", "1" * 60, "0.5\x00"]),
    st.text(max_size=4),
)
_ROWS = st.lists(st.lists(_CELLS, min_size=0, max_size=4), max_size=25)


def _csv_text(rows) -> str:
    out = io.StringIO()
    csv.writer(out).writerows(rows)
    return out.getvalue()


@FUZZ
@given(rows=_ROWS)
def test_random_offsets_rows_never_crash_or_print_non_finite(capsys, rows):
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        (folder / "hull.csv").write_text(_csv_text(rows), encoding="utf-8", errors="surrogatepass")
        code, out, err = _cli(capsys, ["report", "--offsets", str(folder / "hull.csv"),
                                       "--mass", "80", "--cg", "0.5,0,0.1"])
        if code == 0:
            assert "nan" not in out.lower() and " inf" not in out.lower()
        else:
            _kept_promise(code, err, folder, {"hull.csv"})


@FUZZ
@given(rows=_ROWS)
def test_random_readings_rows_never_crash(capsys, rows):
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        text = "mass_kg,distance_m,heel_deg\n" + _csv_text(rows)
        (folder / "r.csv").write_text(text, encoding="utf-8", errors="surrogatepass")
        code, out, err = _cli(capsys, ["incline", str(PUNT), str(folder / "r.csv"), "--mass", "60"])
        if code == 0:
            assert "nan" not in out.lower()
        else:
            _kept_promise(code, err, folder, {"r.csv"})


# ----------------------------------------------------------------------------- reading


def test_devices_pipes_and_folders_are_refused_without_reading(tmp_path):
    fifo = tmp_path / "pipe.json"
    os.mkfifo(fifo)
    for path, words in ((fifo, "not a regular file"), ("/dev/zero", "not a regular file"),
                        (tmp_path, "is a folder"), ("", "no file name")):
        with pytest.raises(DesignFileError, match=words):
            read_text(path)


def test_the_byte_cap_holds_while_reading(tmp_path):
    big = tmp_path / "big.json"
    big.write_bytes(b" " * 101)
    assert read_text(big, cap=101) == " " * 101
    with pytest.raises(DesignFileError, match="too large"):
        read_text(big, cap=100)


@pytest.mark.parametrize(
    "change, words",
    [
        (lambda d: d["loads"]["crew"][0].update(mas_kg=120), "unknown key 'mas_kg' (did you mean 'mass_kg'?)"),
        (lambda d: d.update(chekcs={}), "unknown key 'chekcs' (did you mean 'checks'?)"),
        (lambda d: d.update(version=True), "version true is not supported"),
        (lambda d: d["loads"].update(crew=[5]), "design.loads.crew[0] must be an object"),
        (lambda d: d["loads"]["crew"][0].update(mass_kg=400), "mass_kg is too large (at most 300"),
        (lambda d: d.update(checks={"shift_crew": [0, 0]}), "names the same person twice"),
        (lambda d: d.update(name="\ud800"), "lone UTF-16 surrogate"),
    ],
)
def test_design_keys_are_checked_strictly(tmp_path, change, words):
    design = json.loads(PUNT.read_text())
    change(design)
    path = tmp_path / "d.json"
    path.write_text(json.dumps(design), encoding="utf-8", errors="surrogatepass")
    with pytest.raises(DesignFileError) as e:
        load_design(path)
    assert words in str(e.value)


@pytest.mark.parametrize(
    "text, words",
    [
        ("[" * 100_000 + "]" * 100_000, "nested 100000 levels deep"),
        ('{"a": ' + "9" * 5000 + "}", "5000 digits is too long"),
        ('{"a": NaN}', "NaN is not a number"),
        ('{"a": 1e999}', "is too large"),
        ('{"a": 1, "a": 2}', "appears twice"),
    ],
)
def test_hostile_json_is_refused_before_it_costs_anything(tmp_path, text, words):
    path = tmp_path / "h.json"
    path.write_text(text)
    with pytest.raises(DesignFileError, match=words):
        load_design(path)


def test_reversed_offsets_are_read_in_order(tmp_path):
    rows = ["x_m,y_m,z_m"]
    for x in (2.0, 1.0, 0.0):  # bow first, each section from the top down
        rows += [f"{x},0,0.4", f"{x},0.5,0.4", f"{x},0.5,0", f"{x},0,0"]
    (tmp_path / "r.csv").write_text("\n".join(rows) + "\n")
    stations = read_offsets(tmp_path / "r.csv")
    assert list(stations.x) == [0.0, 1.0, 2.0]
    assert [tuple(p) for p in stations.half_sections[0]] == [(0, 0), (0.5, 0), (0.5, 0.4), (0, 0.4)]


def test_budgets_name_the_limit(tmp_path):
    rows = ["x_m,y_m,z_m"] + [f"{i},{y},{z}" for i in range(500) for y, z in ((0, 0), (0.5, 0), (0.5, 0.4))]
    (tmp_path / "long.csv").write_text("\n".join(rows) + "\n")
    with pytest.raises(LimitError, match="MAX_STATIONS"):
        read_offsets(tmp_path / "long.csv")


def test_inclining_kg_below_the_keel_is_flagged(capsys, tmp_path):
    readings = tmp_path / "r.csv"
    readings.write_text("mass_kg,distance_m,heel_deg\n10,0.4,0.01\n10,-0.4,-0.01\n10,0.5,0.012\n10,-0.5,-0.012\n")
    code, out, _ = _cli(capsys, ["incline", str(PUNT), str(readings), "--mass", "60"])
    assert code == 0 and "below the keel" in out


def test_the_same_person_twice_is_refused(capsys):
    code, _, err = _cli(capsys, ["check", str(PUNT), "--crew", "1,1"])
    assert code == 2 and "same person twice" in err


# ----------------------------------------------------------------------------- writing


def test_outputs_never_replace_an_input_or_a_read_only_file(capsys, tmp_path):
    design = tmp_path / "boat.json"
    design.write_bytes(PUNT.read_bytes())
    (tmp_path / "link.json").symlink_to(design)
    for out in (design, tmp_path / "link.json"):
        code, _, err = _cli(capsys, ["offsets", str(design), "-o", str(out)])
        assert code == 2 and "is the input file" in err
    assert design.read_bytes() == PUNT.read_bytes()
    locked = tmp_path / "locked.csv"
    locked.write_text("keep\n")
    locked.chmod(0o444)
    code, _, err = _cli(capsys, ["offsets", str(design), "-o", str(locked)])
    assert code == 2 and "read-only" in err and locked.read_text() == "keep\n"
    for bad, words in (("", "no output file"), (str(tmp_path), "is a folder"),
                       (str(design / "x.csv"), "is a file, not a folder"),
                       (str(tmp_path / "no" / "x.csv"), "does not exist")):
        with pytest.raises(OutputError, match=words):
            check_output(bad)


def test_writes_keep_mode_symlinks_and_hard_links(tmp_path):
    old = os.umask(0o022)
    try:
        write_bytes(tmp_path / "new.txt", b"new")
    finally:
        os.umask(old)
    assert stat.S_IMODE((tmp_path / "new.txt").stat().st_mode) == 0o644
    kept = tmp_path / "kept.txt"
    kept.write_text("old")
    kept.chmod(0o640)
    write_bytes(kept, b"new")
    assert stat.S_IMODE(kept.stat().st_mode) == 0o640 and kept.read_text() == "new"
    (tmp_path / "link.txt").symlink_to(kept)
    write_bytes(tmp_path / "link.txt", b"through the link")
    assert (tmp_path / "link.txt").is_symlink() and kept.read_text() == "through the link"
    os.link(kept, tmp_path / "hard.txt")
    write_bytes(kept, b"both names")
    assert os.path.samefile(kept, tmp_path / "hard.txt")
    assert (tmp_path / "hard.txt").read_text() == "both names"
    assert not [p for p in tmp_path.iterdir() if p.name.startswith(TEMP_PREFIX)]


def test_a_save_killed_half_way_loses_nothing_and_its_temp_file_is_cleaned(tmp_path):
    """Process level: the save is killed after its temporary file is written."""
    target = tmp_path / "boat.csv"
    target.write_text("the old table\n")
    code = ("import os, sys, time; os.fsync = lambda fd: time.sleep(30); "
            "from hydro.io import atomic_write_text; atomic_write_text(sys.argv[1], 'x' * 100000)")
    p = subprocess.Popen([sys.executable, "-c", code, str(target)], cwd=ROOT)
    deadline = time.monotonic() + 20
    while not [n for n in tmp_path.iterdir() if n.name.startswith(TEMP_PREFIX)]:
        assert time.monotonic() < deadline and p.poll() is None
        time.sleep(0.05)
    time.sleep(0.2)
    p.kill()
    p.wait()
    assert target.read_text() == "the old table\n"
    assert remove_stale_temps(tmp_path) == 1
    assert [n.name for n in tmp_path.iterdir()] == ["boat.csv"]


def test_a_closed_pipe_ends_quietly():
    """Process level: ``hullwright report ... | head -1``."""
    r = subprocess.run(f"{sys.executable} -m app.cli report {PUNT} | head -1", shell=True, cwd=ROOT,
                       capture_output=True, text=True, timeout=60)
    assert r.stdout.startswith("Hullwright report") and r.stderr == ""


def test_the_builders_checks_have_their_own_smaller_budget(capsys, tmp_path):
    design = json.loads(PUNT.read_text())
    design["hull"]["sketch"]["station_count"] = 401
    design["analysis"].update(heel_step_deg=0.1, heel_max_deg=180.0)
    path = tmp_path / "fine.json"
    path.write_text(json.dumps(design))
    load_design(path)  # one analysis is within MAX_WORK
    code, _, err = _cli(capsys, ["check", str(path)])
    assert code == 2 and "MAX_CHECK_WORK" in err
