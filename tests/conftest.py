"""Shared test setup: Qt offscreen unless told otherwise, a private runtime dir."""

import os
import tempfile

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
if "XDG_RUNTIME_DIR" not in os.environ:
    _runtime = tempfile.mkdtemp(prefix="hullwright-xdg-")
    os.chmod(_runtime, 0o700)
    os.environ["XDG_RUNTIME_DIR"] = _runtime
