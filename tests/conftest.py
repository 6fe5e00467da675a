"""Shared test setup: Qt offscreen unless told otherwise, a private runtime dir, the engine.

The engine's hot path is chosen once, before the first test: the compiled kernels when
numba is installed (numpy otherwise), or what ``HULLWRIGHT_ENGINE`` says, so every test
runs on one known engine; ``HULLWRIGHT_ENGINE=numpy pytest`` runs the suite on the numpy
reference.  Subprocesses keep the user's default (``auto``).
"""

import os
import tempfile

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
if "XDG_RUNTIME_DIR" not in os.environ:
    _runtime = tempfile.mkdtemp(prefix="hullwright-xdg-")
    os.chmod(_runtime, 0o700)
    os.environ["XDG_RUNTIME_DIR"] = _runtime


def pytest_configure(config):
    from hydro import compiled

    compiled.select(os.environ.get(compiled.ENGINE_VARIABLE) or "compiled")
