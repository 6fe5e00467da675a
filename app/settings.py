"""Where the app remembers things: QSettings, the recovery folder.

Set the environment variable ``HULLWRIGHT_SETTINGS`` to an INI file path to keep the
settings (and the recovery folder beside them) somewhere else; the tests do this so they
never touch a user's real settings.
"""

from __future__ import annotations

import os
from pathlib import Path

from PySide6.QtCore import QSettings

__all__ = ["SETTINGS_ENV", "open_settings", "recovery_folder", "recent_files", "add_recent_file"]

SETTINGS_ENV = "HULLWRIGHT_SETTINGS"
MAX_RECENT = 8


def open_settings() -> QSettings:
    """The app's settings store (INI format, per user)."""
    path = os.environ.get(SETTINGS_ENV)
    if path:
        return QSettings(path, QSettings.Format.IniFormat)
    return QSettings(QSettings.Format.IniFormat, QSettings.Scope.UserScope, "Hullwright", "Hullwright")


def recovery_folder(settings: QSettings) -> Path:
    """The folder of the windows' recovery files (beside the settings file)."""
    return Path(settings.fileName()).with_name("hullwright-recovery")


def recent_files(settings: QSettings) -> list[str]:
    value = settings.value("recent_files", [])
    if isinstance(value, str):
        value = [value]
    return [str(v) for v in value or []]


def add_recent_file(settings: QSettings, path: str) -> list[str]:
    """Put ``path`` first in the recent-files list and return the new list."""
    files = [path] + [p for p in recent_files(settings) if p != path]
    files = files[:MAX_RECENT]
    settings.setValue("recent_files", files)
    return files
