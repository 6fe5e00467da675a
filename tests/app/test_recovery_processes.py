"""Process level: two windows in two processes autosave to their own files; the one
that is killed leaves an orphan, the one that closes normally leaves nothing."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

from app.recovery import orphans
from app.settings import SETTINGS_ENV, open_settings, recovery_folder

ROOT = Path(__file__).resolve().parents[2]

WINDOW = """
import os, sys, time
from dataclasses import replace
from PySide6.QtWidgets import QApplication, QMessageBox
app = QApplication([])
from app.document import HullDocument, starter_design
from app.main_window import MainWindow
from app.settings import open_settings
design = starter_design()
window = MainWindow(HullDocument(replace(design, name=sys.argv[1])), open_settings())
window.ask = lambda *a: QMessageBox.StandardButton.Discard
hull = design.hull
x, b = hull.plan.points[2]
window.document.edit(replace(window.document.committed,
                             hull=replace(hull, plan=hull.plan.with_point(2, (x, b + 0.02)))), "wider")
deadline = time.monotonic() + 10
while not window.recovery.path.exists() and time.monotonic() < deadline:
    app.processEvents()
    time.sleep(0.02)
print(window.recovery.path, flush=True)
sys.stdin.readline()  # wait for the test
if sys.argv[2] == "close":
    window.close()
    sys.exit(0)
os._exit(9)  # a crash: no clean-up at all
"""


def _start(name: str, how: str, env: dict) -> subprocess.Popen:
    return subprocess.Popen([sys.executable, "-c", WINDOW, name, how], cwd=ROOT, env=env, text=True,
                            stdin=subprocess.PIPE, stdout=subprocess.PIPE, stderr=subprocess.PIPE)


def test_two_windows_autosave_apart_and_only_the_crashed_one_is_offered():
    env = dict(os.environ, QT_QPA_PLATFORM="offscreen")
    folder = recovery_folder(open_settings())
    env[SETTINGS_ENV] = os.environ[SETTINGS_ENV]
    crashing, closing = _start("Crashing punt", "crash", env), _start("Closing punt", "close", env)
    paths = [Path(p.stdout.readline().strip()) for p in (crashing, closing)]
    assert paths[0] != paths[1] and all(p.exists() for p in paths)
    assert orphans(folder) == []  # both windows alive: nothing to offer
    for p in (crashing, closing):
        p.stdin.write("\n")
        p.stdin.flush()
        p.wait(timeout=30)
    assert not paths[1].exists()  # closed normally: its own file gone
    found = orphans(folder)
    assert [w.path for w in found] == [paths[0]] and found[0].name == "Crashing punt"
    assert "Crashing punt" in found[0].label() and "autosaved" in found[0].label()
