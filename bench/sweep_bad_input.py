"""Hostile-input sweep: the command line and File > Open against careless or unlucky input.

Every case runs in its own process (10 s timeout, address space capped at 3 GB so a
runaway read cannot take the machine down) and is classed:

- traceback: a Python traceback, or an exit code other than 0 and 2
- hang: no answer within 10 s;  slow: over 2 s of processor time (start-up included);
  memory: over 500 MB resident
- wrong_silent: bad input accepted (exit 0), a non-finite number printed, a warning missing
- lost_file: an input changed, a read-only file replaced, a file's mode, symlink or hard
  link not kept, temporary files left behind
- not_one_line: refused, but not with exactly one line on stderr

Usage: ``python bench/sweep_bad_input.py [--tree SOURCE_TREE]`` (default: this checkout),
so the same cases can be run against an older tree.  Prints ``name: value`` lines.
"""

from __future__ import annotations

import argparse
import hashlib
import json
import os
import resource
import shutil
import signal
import stat
import subprocess
import sys
import tempfile
import threading
import time
from pathlib import Path

HERE = Path(__file__).resolve().parents[1]
TIMEOUT_S = 10.0
SLOW_S = 2.0
MEMORY_MB = 500.0
CATEGORIES = ("traceback", "hang", "slow", "memory", "wrong_silent", "lost_file", "not_one_line")


def _limit_memory() -> None:
    resource.setrlimit(resource.RLIMIT_AS, (3 << 30, 3 << 30))


def run(tree: Path, cwd: Path, argv: list[str], shell_tail: str = "") -> dict:
    """Run ``python -m app.cli argv`` from ``tree``; exit code, outputs, time, memory."""
    env = dict(os.environ, PYTHONPATH=str(tree), QT_QPA_PLATFORM="offscreen", PYTHONHASHSEED="0")
    out, err = cwd / ".out", cwd / ".err"
    cmd = [sys.executable, "-m", "app.cli", *argv]
    if shell_tail:
        cmd = ["/bin/sh", "-c", " ".join(_quote(c) for c in cmd) + " " + shell_tail]
    t0 = time.perf_counter()
    with open(out, "wb") as fo, open(err, "wb") as fe:
        p = subprocess.Popen(cmd, cwd=cwd, env=env, stdout=fo, stderr=fe, stdin=subprocess.DEVNULL,
                             preexec_fn=_limit_memory, start_new_session=True)
        timer = threading.Timer(TIMEOUT_S, lambda: os.killpg(p.pid, signal.SIGKILL))
        timer.start()
        _, status, usage = os.wait4(p.pid, 0)
        timer.cancel()
        p.returncode = os.waitstatus_to_exitcode(status)
    elapsed = time.perf_counter() - t0
    return {
        "rc": p.returncode,
        "out": out.read_text(errors="replace"),
        "err": err.read_text(errors="replace"),
        "time": elapsed,
        "hung": elapsed >= TIMEOUT_S - 0.05,
        "mb": usage.ru_maxrss / 1024.0,
        "cpu": usage.ru_utime + usage.ru_stime,
    }


def _quote(text: str) -> str:
    return "'" + text.replace("'", "'\\''") + "'"


def _digest(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest() if path.is_file() else ""


# ----------------------------------------------------------------------------- cases


def _sample(name: str = "heron-punt") -> dict:
    return json.loads((HERE / "sample_hulls" / f"{name}.json").read_text())


def _design_cases() -> list[tuple[str, object, str]]:
    """(name, file content (dict, str or bytes), expectation) for ``report``."""
    cases: list[tuple[str, object, str]] = []

    def mutate(name: str, change, expect: str = "refuse") -> None:
        d = _sample()
        change(d)
        cases.append((name, d, expect))

    crew = lambda d: d["loads"]["crew"]  # noqa: E731
    sketch = lambda d: d["hull"]["sketch"]  # noqa: E731
    mutate("crew entry is a number", lambda d: d["loads"].update(crew=[5]))
    mutate("crew entry is null", lambda d: d["loads"].update(crew=[None]))
    mutate("crew entry is text", lambda d: d["loads"].update(crew=["Ann"]))
    mutate("crew is an object", lambda d: d["loads"].update(crew={"a": 1}))
    mutate("item entry is a list", lambda d: d["loads"].update(items=[[1, 2]]))
    mutate("misspelt mass_kg", lambda d: crew(d)[0].update(mas_kg=120))
    mutate("misspelt top-level checks", lambda d: d.update(chekcs={}))
    mutate("misspelt smooth", lambda d: sketch(d)["keel"].update(smoth=True))
    mutate("unknown key in analysis", lambda d: d["analysis"].update(heel_stepdeg=2))
    mutate("version true", lambda d: d.update(version=True))
    mutate("version text", lambda d: d.update(version="2"))
    mutate("version 2.0", lambda d: d.update(version=2.0))
    mutate("version 99", lambda d: d.update(version=99))
    mutate("no format", lambda d: d.pop("format"))
    mutate("mass is true", lambda d: crew(d)[0].update(mass_kg=True))
    mutate("mass negative", lambda d: crew(d)[0].update(mass_kg=-5))
    mutate("crew member 400 kg", lambda d: crew(d)[0].update(mass_kg=400))
    mutate("name with lone surrogate", lambda d: d.update(name="\ud800 boat"))
    mutate("crew name lone surrogate", lambda d: crew(d)[0].update(name="\udfff"))
    mutate("plan breadth 1e308", lambda d: sketch(d)["plan_half_breadth"].update(
        points_m=[[p[0], 1e308] for p in sketch(d)["plan_half_breadth"]["points_m"]]))
    mutate("sheer at 1e308", lambda d: sketch(d)["sheer"].update(
        points_m=[[p[0], 1e308] for p in sketch(d)["sheer"]["points_m"]]))
    mutate("length 359 m", lambda d: [c.update(points_m=[[p[0] * 138, p[1]] for p in c["points_m"]])
                                      for c in (sketch(d)["plan_half_breadth"], sketch(d)["keel"],
                                                sketch(d)["sheer"])])
    mutate("beam 40 m", lambda d: sketch(d)["plan_half_breadth"].update(
        points_m=[[p[0], 20.0] for p in sketch(d)["plan_half_breadth"]["points_m"]]))
    mutate("station count 1e9", lambda d: sketch(d).update(station_count=10**9))
    mutate("station count 2.5", lambda d: sketch(d).update(station_count=2.5))
    mutate("heel step 1e-9", lambda d: d["analysis"].update(heel_step_deg=1e-9))
    mutate("heel max 1e9", lambda d: d["analysis"].update(heel_max_deg=1e9))
    mutate("areal density 1e308", lambda d: d["loads"]["materials"][0].update(areal_density_kg_m2=1e308))
    mutate("water density 1e308", lambda d: d.update(water={"density_kg_m3": 1e308}))
    mutate("water lemonade", lambda d: d.update(water={"preset": "lemonade"}))
    mutate("shift crew twice", lambda d: d.update(checks={"shift_crew": [0, 0]}))
    mutate("shift crew 99", lambda d: d.update(checks={"shift_crew": [99]}))
    mutate("item 1e6 kg", lambda d: d["loads"].update(items=[{"mass_kg": 1e6, "x_m": 1, "z_m": 0.2}]))
    mutate("points_m pair of three", lambda d: sketch(d)["keel"].update(points_m=[[0, 0, 0], [1, 0, 0]]))
    mutate("section of 10,000 points", lambda d: sketch(d)["sections"][0].update(
        points_uv=[[0, 0]] + [[i / 10000, 0.0] for i in range(1, 9999)] + [[1, 1]]))
    base = json.dumps(_sample())
    cases += [
        ("integer of 400 digits", base.replace('"version": 2', '"version": ' + "9" * 400), "refuse"),
        ("integer of 5000 digits", base.replace('"version": 2', '"version": ' + "9" * 5000), "refuse"),
        ("mass 5000 digits", base.replace('"mass_kg": 52.0', '"mass_kg": 1' + "0" * 5000, 1), "refuse"),
        ("NaN literal", base.replace('"bottom_thickness_m": ', '"bottom_thickness_m": NaN, "x": '), "refuse"),
        ("Infinity literal", base.replace('"wet_factor": 1.0', '"wet_factor": Infinity'), "refuse"),
        ("1e999", base.replace('"wet_factor": 1.0', '"wet_factor": 1e999'), "refuse"),
        ("duplicate key", base.replace('"name": ', '"name": "a", "name": ', 1), "refuse"),
        ("nested 100,000 deep", "[" * 100_000 + "]" * 100_000, "refuse"),
        ("notes nested 5,000 deep", base.replace('"notes": ', '"notes": ' + "[" * 5000 + "]" * 5000
                                                 + ', "n2": '), "refuse"),
        ("empty file", b"", "refuse"),
        ("binary junk", bytes(range(256)) * 10, "refuse"),
        ("UTF-16 file", base.encode("utf-16"), "refuse"),
        ("BOM then a good design", b"\xef\xbb\xbf" + base.encode(), "ok"),
        ("30 MB of spaces", b" " * (30 << 20), "refuse"),
        ("a JSON list", b"[1, 2, 3]", "refuse"),
        ("a good design", base, "ok"),
    ]
    return cases


def _offsets_csv(stations: int, points: int, reverse_x: bool = False, top_down: bool = False,
                 scale: float = 1.0) -> str:
    rows = ["x_m,y_m,z_m"]
    xs = [4.0 * i / (stations - 1) for i in range(stations)]
    for x in reversed(xs) if reverse_x else xs:
        pts = [(0.5 * j / (points - 1), 0.0 if j < points - 1 else 0.4) for j in range(points)]
        pts = [(0.0, 0.0)] + [(0.5 * scale, 0.0)] + [(0.5 * scale, 0.4)] if points == 3 else pts
        if top_down:
            pts = [(0.0, 0.4)] + [(0.5 * scale, 0.4), (0.5 * scale, 0.0), (0.0, 0.0)]
        rows += [f"{x},{y},{z}" for y, z in pts]
    return "\n".join(rows) + "\n"


def _offsets_cases() -> list[tuple[str, str, list[str], str]]:
    """(name, CSV text, extra args, expectation) for ``report --offsets``."""
    lumped = ["--mass", "150", "--cg", "2,0,0.15"]
    return [
        ("100,000 stations", _offsets_csv(100_000, 3), lumped, "refuse"),
        ("1,000-point section at max settings",
         _offsets_csv(100, 3).replace("x_m,y_m,z_m\n", "x_m,y_m,z_m\n"
                                      + "".join(f"-1,{j / 2000},{0.0 if j < 999 else 0.4}\n"
                                                for j in range(1000))),
         lumped + ["--heel-step", "0.1", "--heel-max", "180"], "refuse"),
        ("401 stations at max settings", _offsets_csv(401, 60), lumped + ["--heel-step", "0.1",
                                                                          "--heel-max", "180"], "refuse"),
        ("stations in reverse", _offsets_csv(9, 3, reverse_x=True), lumped, "positive"),
        ("sections top down", _offsets_csv(9, 3, top_down=True), lumped, "positive"),
        ("breadth 1e308", _offsets_csv(9, 3, scale=2e307), lumped, "refuse"),
        ("NaN offset", _offsets_csv(9, 3).replace("0.4\n", "nan\n", 1), lumped, "refuse"),
        ("inf offset", _offsets_csv(9, 3).replace("0.4\n", "inf\n", 1), lumped, "refuse"),
        ("NUL bytes", _offsets_csv(9, 3).replace("0.4\n", "0.\x004\n", 1), lumped, "refuse"),
        ("one station", _offsets_csv(2, 3).split("\n4.0")[0], lumped, "refuse"),
        ("text cell", _offsets_csv(9, 3).replace("0.4\n", "deep\n", 1), lumped, "refuse"),
        ("--mass nan", _offsets_csv(9, 3), ["--mass", "nan", "--cg", "2,0,0.15"], "refuse"),
        ("--mass inf", _offsets_csv(9, 3), ["--mass", "inf", "--cg", "2,0,0.15"], "refuse"),
        ("--mass 1e308", _offsets_csv(9, 3), ["--mass", "1e308", "--cg", "2,0,0.15"], "refuse"),
        ("--cg nan", _offsets_csv(9, 3), ["--mass", "150", "--cg", "nan,0,0"], "refuse"),
        ("--water 1e308", _offsets_csv(9, 3), lumped + ["--water", "1e308"], "refuse"),
        ("--water 600", _offsets_csv(9, 3), lumped + ["--water", "600"], "refuse"),
        ("--heel-step nan", _offsets_csv(9, 3), lumped + ["--heel-step", "nan"], "refuse"),
        ("good table", _offsets_csv(9, 3), lumped, "positive"),
    ]


def _readings_cases() -> list[tuple[str, str, list[str], str]]:
    ok = "mass_kg,distance_m,heel_deg\n10,0.4,1.2\n10,-0.4,-1.25\n10,0.5,1.5\n10,-0.5,-1.52\n"
    tiny = "mass_kg,distance_m,heel_deg\n10,0.4,0.01\n10,-0.4,-0.01\n10,0.5,0.012\n10,-0.5,-0.012\n"
    huge = "mass_kg,distance_m,heel_deg\n10,0.4,20\n10,-0.4,-20\n10,0.5,25\n10,-0.5,-25\n"
    return [
        ("KG below the keel", tiny, ["--mass", "60"], "warn"),
        ("KG above the gunwale", huge, ["--mass", "60"], "warn"),
        ("distance 1e308", ok.replace("0.4,1.2", "1e308,1.2"), ["--mass", "60"], "refuse"),
        ("heel nan", ok.replace("1.2\n", "nan\n"), ["--mass", "60"], "refuse"),
        ("heel 1e308", ok.replace("1.2\n", "1e308\n"), ["--mass", "60"], "refuse"),
        ("10,000 readings", "mass_kg,distance_m,heel_deg\n" + "10,0.4,1.2\n" * 10_000,
         ["--mass", "60"], "refuse"),
        ("junk header", "weight,where\n1,2\n", ["--mass", "60"], "refuse"),
        ("--mass nan", ok, ["--mass", "nan"], "refuse"),
        ("--mass -60", ok, ["--mass", "-60"], "refuse"),
        ("good readings", ok, ["--mass", "60"], "ok"),
    ]


# ----------------------------------------------------------------------------- judging


def judge(r: dict, expect: str) -> list[str]:
    """Categories a result falls in (empty: kept its promise)."""
    found = []
    if r["hung"]:
        return ["hang"]
    if "Traceback" in r["err"] or r["rc"] not in (0, 2):
        found.append("traceback")
    if r["cpu"] > SLOW_S:  # processor time: the machine may be shared
        found.append("slow")
    if r["mb"] > MEMORY_MB or "MemoryError" in r["err"]:
        found.append("memory")
    lowered = r["out"].lower()
    if r["rc"] == 0 and any(w in lowered for w in (" inf", "nan", "-inf", "infinity")):
        found.append("wrong_silent")
    if expect == "refuse" and r["rc"] == 0:
        found.append("wrong_silent")
    if expect == "positive" and r["rc"] == 0 and "Displacement" in r["out"]:
        line = next(l for l in r["out"].splitlines() if l.startswith("Displacement"))
        if "-" in line.split()[-2]:
            found.append("wrong_silent")
    if expect == "warn" and r["rc"] == 0 and "keel" not in lowered and "gunwale" not in lowered:
        found.append("wrong_silent")
    if r["rc"] == 2 and len([l for l in r["err"].splitlines() if l.strip()]) != 1:
        found.append("not_one_line")
    return found


def sweep(tree: Path, work: Path, verbose: bool) -> tuple[dict[str, int], int]:
    counts = dict.fromkeys((*CATEGORIES, "kept_promise"), 0)
    total = 0

    def record(name: str, problems: list[str]) -> None:
        nonlocal total
        total += 1
        counts["kept_promise"] += not problems
        for p in set(problems):
            counts[p] += 1
        if verbose and problems:
            print(f"  {name}: {', '.join(sorted(set(problems)))}", file=sys.stderr)

    # designs through report
    for name, content, expect in _design_cases():
        f = work / "design.json"
        data = content if isinstance(content, bytes) else (
            content if isinstance(content, str) else json.dumps(content)).encode("utf-8", "surrogatepass")
        f.write_bytes(data)
        record(f"report: {name}", judge(run(tree, work, ["report", str(f)]), expect))
    for name, path in (("/dev/zero", "/dev/zero"), ("/dev/urandom", "/dev/urandom"),
                       ("a folder", str(work)), ("missing file", str(work / "nope.json")), ("empty name", "")):
        record(f"report: {name}", judge(run(tree, work, ["report", path]), "refuse"))
    fifo = work / "pipe.json"
    fifo.unlink(missing_ok=True)
    os.mkfifo(fifo)
    record("report: named pipe", judge(run(tree, work, ["report", str(fifo)]), "refuse"))
    record("report --offsets: named pipe", judge(run(tree, work, ["report", "--offsets", str(fifo),
                                                                   "--mass", "100", "--cg", "1,0,0"]), "refuse"))
    # offsets tables and readings
    for name, text, extra, expect in _offsets_cases():
        f = work / "hull.csv"
        f.write_text(text)
        record(f"offsets table: {name}", judge(run(tree, work, ["report", "--offsets", str(f), *extra]), expect))
    good = work / "good.json"
    good.write_text(json.dumps(_sample()))
    for name, text, extra, expect in _readings_cases():
        f = work / "readings.csv"
        f.write_text(text)
        record(f"incline: {name}", judge(run(tree, work, ["incline", str(good), str(f), *extra]), expect))
    # command-line options
    for name, argv in (
        ("check --crew 1,1", ["check", str(good), "--crew", "1,1"]),
        ("check --crew 0", ["check", str(good), "--crew", "0"]),
        ("check --boarding-mass nan", ["check", str(good), "--boarding-mass", "nan"]),
        ("check --boarding-mass 1e308", ["check", str(good), "--boarding-mass", "1e308"]),
        ("report --heel-step nan", ["report", str(good), "--heel-step", "nan"]),
        ("report --bogus", ["report", str(good), "--bogus"]),
    ):
        record(name, judge(run(tree, work, argv), "refuse"))
    r = run(tree, work, ["report", str(good)], shell_tail="| head -1")
    record("report | head", ["traceback"] if "Traceback" in r["err"] or "Error" in r["err"] else [])
    # output paths
    for name, problems in _output_cases(tree, work):
        record(name, problems)
    return counts, total


def _output_cases(tree: Path, work: Path):
    design = work / "boat.json"
    text = json.dumps(_sample())

    def fresh() -> None:
        for p in list(work.iterdir()):
            if p.is_dir() and not p.is_symlink():
                p.chmod(0o755)
                shutil.rmtree(p)
            else:
                p.unlink()
        design.write_text(text)

    def refuse(name: str, argv: list[str], watched: list[Path] = ()) -> tuple[str, list[str]]:
        before = {p: _digest(p) for p in [design, *watched]}
        r = run(tree, work, argv)
        problems = judge(r, "refuse")
        if any(_digest(p) != d for p, d in before.items()):
            problems.append("lost_file")
        return name, problems

    fresh()
    yield refuse("offsets -o the design itself", ["offsets", str(design), "-o", str(design)])
    fresh()
    pdf = work / "boat.pdf"
    pdf.write_text(text)
    yield refuse("plate -o the design itself", ["plate", str(pdf), "-o", str(pdf)], [pdf])
    fresh()
    (work / "link.json").symlink_to(design)
    yield refuse("offsets -o a symlink to the design", ["offsets", str(design), "-o", str(work / "link.json")])
    fresh()
    yield refuse("offsets -o ''", ["offsets", str(design), "-o", ""])
    fresh()
    (work / "folder").mkdir()
    yield refuse("offsets -o a folder", ["offsets", str(design), "-o", str(work / "folder")])
    fresh()
    yield refuse("offsets -o under a file", ["offsets", str(design), "-o", str(design / "x.csv")])
    fresh()
    yield refuse("offsets -o missing folder", ["offsets", str(design), "-o", str(work / "no" / "x.csv")])
    fresh()
    ro = work / "ro"
    ro.mkdir()
    ro.chmod(0o555)
    yield refuse("offsets -o in a read-only folder", ["offsets", str(design), "-o", str(ro / "x.csv")])
    fresh()
    target = work / "old.csv"
    target.write_text("keep me\n")
    target.chmod(0o444)
    yield refuse("offsets -o a read-only file", ["offsets", str(design), "-o", str(target)], [target])
    # writes that must keep the file's identity
    fresh()
    target = work / "t.csv"
    target.write_text("old\n")
    target.chmod(0o640)
    r = run(tree, work, ["offsets", str(design), "-o", str(target)])
    yield "offsets keeps the mode", judge(r, "ok") + (
        [] if stat.S_IMODE(target.stat().st_mode) == 0o640 else ["lost_file"])
    fresh()
    r = run(tree, work, ["offsets", str(design), "-o", str(work / "new.csv")])
    mode = stat.S_IMODE((work / "new.csv").stat().st_mode) if (work / "new.csv").exists() else 0
    yield "offsets gives a new file the usual mode", judge(r, "ok") + ([] if mode & 0o044 else ["lost_file"])
    fresh()
    real = work / "real.csv"
    real.write_text("old\n")
    (work / "via-link.csv").symlink_to(real)
    r = run(tree, work, ["offsets", str(design), "-o", str(work / "via-link.csv")])
    kept = (work / "via-link.csv").is_symlink() and real.read_text() != "old\n"
    yield "offsets through a symlink keeps the link", judge(r, "ok") + ([] if kept else ["lost_file"])
    fresh()
    a, b = work / "a.csv", work / "b.csv"
    a.write_text("old\n")
    os.link(a, b)
    r = run(tree, work, ["offsets", str(design), "-o", str(a)])
    shared = os.path.samefile(a, b) and b.read_text() == a.read_text() != "old\n"
    yield "offsets to a hard link keeps the link", judge(r, "ok") + ([] if shared else ["lost_file"])
    fresh()
    yield "killed save leaves no temp files behind", _killed_save(tree, work, design)


def _killed_save(tree: Path, work: Path, design: Path) -> list[str]:
    """Kill a save half way (after the temporary file is written), save again: only the
    target may be left in the folder."""
    out = work / "kill.csv"
    code = (
        "import os, time, sys; os.fsync = lambda fd: time.sleep(60); "
        "from app.cli import main; main(['offsets', sys.argv[1], '-o', sys.argv[2]])"
    )
    env = dict(os.environ, PYTHONPATH=str(tree))
    p = subprocess.Popen([sys.executable, "-c", code, str(design), str(out)], env=env, cwd=work)
    time.sleep(1.5)
    p.kill()
    p.wait()
    run(tree, work, ["offsets", str(design), "-o", str(out)])
    left = sorted(n.name for n in work.iterdir() if n.name not in {"boat.json", "kill.csv", ".out", ".err"})
    return ["lost_file"] if left else []


def app_sweep(tree: Path, work: Path, verbose: bool) -> tuple[int, int, int]:
    """File > Open on every hostile design file: (escaped, hung, opened)."""
    files = []
    for i, (name, content, expect) in enumerate(_design_cases()):
        if expect != "refuse":
            continue
        f = work / f"app-{i}.json"
        data = content if isinstance(content, bytes) else (
            content if isinstance(content, str) else json.dumps(content)).encode("utf-8", "surrogatepass")
        f.write_bytes(data)
        files.append(str(f))
    fifo = work / "app-pipe.json"
    fifo.unlink(missing_ok=True)
    os.mkfifo(fifo)
    code = """
import json, os, sys, signal
os.environ["HULLWRIGHT_SETTINGS"] = sys.argv[1]
from PySide6.QtWidgets import QApplication, QMessageBox
app = QApplication([])
from app.document import HullDocument, starter_design
from app.main_window import MainWindow
from app.settings import open_settings
w = MainWindow(HullDocument(starter_design()), open_settings())
w.ask = lambda *a: QMessageBox.StandardButton.Discard
for f in sys.argv[2:]:
    signal.alarm(5)
    try:
        ok = w.open_path(f, confirmed=True)
        print(json.dumps({"file": f, "result": "opened" if ok else "refused"}), flush=True)
    except BaseException as e:
        print(json.dumps({"file": f, "result": "escaped", "error": type(e).__name__}), flush=True)
"""
    env = dict(os.environ, PYTHONPATH=str(tree), QT_QPA_PLATFORM="offscreen")
    escaped = hung = opened = 0
    for batch in (files, ["/dev/zero", str(work)], [str(fifo)]):
        try:
            r = subprocess.run([sys.executable, "-c", code, str(work / "settings.ini"), *batch], env=env, cwd=work,
                               capture_output=True, text=True, timeout=60, preexec_fn=_limit_memory)
            lines = [json.loads(l) for l in r.stdout.splitlines() if l.startswith("{")]
        except subprocess.TimeoutExpired:
            lines = []
        else:
            if verbose and not lines:
                print(f"  app open: no output; stderr: {r.stderr[-300:]}", file=sys.stderr)
        seen = {d["file"] for d in lines}
        for d in lines:
            escaped += d["result"] == "escaped"
            opened += d["result"] == "opened"
            if verbose and d["result"] != "refused":
                print(f"  app open: {Path(d['file']).name}: {d['result']}", file=sys.stderr)
        missing = [f for f in batch if f not in seen]
        hung += len(missing)
        if verbose and missing:
            print(f"  app open: no answer for {len(missing)} file(s), e.g. {Path(missing[0]).name}",
                  file=sys.stderr)
    return escaped, hung, opened


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--tree", type=Path, default=HERE, help="source tree to run (default: this one)")
    ap.add_argument("--no-app", action="store_true", help="skip File > Open")
    ap.add_argument("-v", "--verbose", action="store_true", help="name each failing case on stderr")
    args = ap.parse_args()
    with tempfile.TemporaryDirectory(prefix="hw-sweep-") as tmp:
        work = Path(tmp)
        counts, total = sweep(args.tree.resolve(), work, args.verbose)
        print(f"cases: {total}")
        for name in CATEGORIES:
            print(f"{name}: {counts[name]}")
        print(f"kept_promise: {counts['kept_promise']}")
        if not args.no_app:
            for p in work.iterdir():
                if p.is_dir():
                    p.chmod(0o755)
            escaped, hung, opened = app_sweep(args.tree.resolve(), work, args.verbose)
            print(f"app_open_escaped: {escaped}")
            print(f"app_open_hung: {hung}")
            print(f"app_open_accepted_bad: {opened}")


if __name__ == "__main__":
    main()
