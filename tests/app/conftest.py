"""App tests: private settings per test, Fusion style, one shared QApplication."""

import pytest

from app.qt_compat import protect_singletons
from app.settings import SETTINGS_ENV

protect_singletons()  # see app/qt_compat.py: shiboken6 6.12 on Python 3.11


@pytest.fixture(autouse=True)
def private_settings(tmp_path, monkeypatch):
    """Every test gets its own settings file, so no real user settings are touched."""
    path = tmp_path / "settings" / "hullwright.ini"
    path.parent.mkdir()
    monkeypatch.setenv(SETTINGS_ENV, str(path))
    return path


@pytest.fixture(autouse=True)
def fusion_style(qapp):
    qapp.setStyle("Fusion")
