"""House rule: the engine never loads Qt (it must run headless and be testable alone)."""

import subprocess
import sys

from tests.paths import ROOT


def test_hydro_imports_no_qt():
    code = (
        "import sys, hydro, hydro.io, hydro.design, hydro.analytic, hydro.runtime;"
        "bad=[m for m in sys.modules if m.split('.')[0] in ('PySide6','pyqtgraph','app')];"
        "print(','.join(bad))"
    )
    out = subprocess.run([sys.executable, "-c", code], cwd=ROOT, capture_output=True, text=True, check=True)
    assert out.stdout.strip() == ""


def test_report_command_imports_no_qt(tmp_path):
    code = (
        "import sys; from app.cli import main; main(['report', 'sample_hulls/heron-punt.json', '--json']);"
        "print('QT' if any(m.startswith('PySide6') for m in sys.modules) else 'clean', file=sys.stderr)"
    )
    out = subprocess.run([sys.executable, "-c", code], cwd=ROOT, capture_output=True, text=True, check=True)
    assert out.stderr.strip().endswith("clean")
