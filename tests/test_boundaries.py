"""House rule: the engine never loads Qt (it must run headless and be testable alone).

Checked twice: at run time (importing hydro pulls in no Qt) and statically by
import-linter's contract in pyproject.toml (no module of hydro imports app, PySide6 or
pyqtgraph, directly or through another module).
"""

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


def test_import_contract_is_kept():
    code = "from importlinter.cli import lint_imports_command; lint_imports_command()"
    out = subprocess.run(
        [sys.executable, "-c", code, "--no-cache"], cwd=ROOT, capture_output=True, text=True
    )
    assert out.returncode == 0, out.stdout + out.stderr
    assert "1 kept, 0 broken" in out.stdout


def test_engine_type_checks():
    """mypy over hydro with the settings in pyproject.toml (its cache in .mypy_cache)."""
    out = subprocess.run(
        [sys.executable, "-m", "mypy", "--no-error-summary", "hydro"],
        cwd=ROOT, capture_output=True, text=True,
    )
    assert out.returncode == 0, out.stdout + out.stderr
