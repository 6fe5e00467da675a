"""App tests: private settings per test, Fusion style, one shared QApplication."""

import pytest

from app.settings import SETTINGS_ENV


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
