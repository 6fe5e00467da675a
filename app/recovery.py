"""Autosave and recovery: one recovery file per open window, found again after a crash.

Each window's :class:`Autosave` writes the unsaved design to its own file in the
recovery folder, about :data:`AUTOSAVE_DELAY_MS` after the last committed edit (one
single-shot timer, restarted by every edit, so a burst of edits costs one write, and
never while a drag is in progress).  The window holds an exclusive lock on a companion
``.lock`` file for its whole life; the operating system drops the lock when the process
ends, however it ends.  A recovery file whose lock nobody holds is an orphan: the
window that wrote it is gone without closing (:func:`orphans`).  A window removes only
its own file: when its design is saved, when the changes are discarded, when it closes.
"""

from __future__ import annotations

import datetime as _dt
import json
import os
import secrets
from dataclasses import dataclass
from pathlib import Path

from PySide6.QtCore import QObject, QTimer

from hydro import Design, HullwrightError
from hydro.io import atomic_write_text, design_from_dict, design_to_dict, parse_json, read_text

from app.document import HullDocument

try:
    import fcntl
except ImportError:  # not POSIX: fall back on the process id
    fcntl = None  # type: ignore[assignment]

__all__ = ["AUTOSAVE_DELAY_MS", "Autosave", "RecoveredWork", "orphans"]

#: Autosave this long after the last edit (the promise is "within about 2 s").
AUTOSAVE_DELAY_MS = 1500
FORMAT = "hullwright.recovery"
_PREFIX = "window-"


@dataclass(frozen=True)
class RecoveredWork:
    """An orphaned recovery file.

    Attributes
    ----------
    path : the recovery file
    saved_at : when it was written (local time)
    name : the design's name ("" if the file is damaged)
    source : the design file it came from ("" if never saved)
    design : the design, or None if the file is damaged
    problem : why it cannot be read ("" if it can)
    """

    path: Path
    saved_at: _dt.datetime
    name: str
    source: str
    design: Design | None
    problem: str = ""

    def label(self) -> str:
        """One line for the list: name, time and where it came from."""
        when = self.saved_at.strftime("%d %b %Y %H:%M:%S")
        what = f"“{self.name}”" if self.design is not None else f"a damaged copy ({self.problem})"
        return f"{what}, autosaved {when}" + (f", from {Path(self.source).name}" if self.source else "")

    def discard(self) -> None:
        """Delete the recovery file and its lock file."""
        self.path.unlink(missing_ok=True)
        self.path.with_suffix(".lock").unlink(missing_ok=True)


def _locked(lock_path: Path) -> bool:
    """True if a live window holds the lock (its owner is running)."""
    if fcntl is None:
        pid = lock_path.stem.removeprefix(_PREFIX).split("-")[0]
        try:
            os.kill(int(pid), 0)
        except (ValueError, OSError):
            return False
        return True
    try:
        fd = os.open(lock_path, os.O_RDWR)
    except FileNotFoundError:
        return False
    try:
        fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
    except BlockingIOError:
        return True
    finally:
        os.close(fd)  # closing drops a lock we took
    return False


def _read(path: Path) -> RecoveredWork:
    saved_at = _dt.datetime.fromtimestamp(path.stat().st_mtime)
    try:
        data = parse_json(read_text(path), path.name)
        if not isinstance(data, dict) or data.get("format") != FORMAT:
            raise HullwrightError("not a recovery file")
        source = data.get("source")
        design = design_from_dict(data.get("design"))
    except HullwrightError as e:
        return RecoveredWork(path, saved_at, "", "", None, str(e))
    return RecoveredWork(path, saved_at, design.name, source if isinstance(source, str) else "", design)


def orphans(folder: Path) -> list[RecoveredWork]:
    """Recovery files in ``folder`` whose window is gone, newest first."""
    try:
        paths = sorted(folder.glob(f"{_PREFIX}*.json"))
    except OSError:
        return []
    found = []
    for path in paths:
        if _locked(path.with_suffix(".lock")):
            continue
        try:
            found.append(_read(path))
        except OSError:
            continue
    return sorted(found, key=lambda w: w.saved_at, reverse=True)


class Autosave(QObject):
    """One window's recovery file (see the module note).

    Attributes
    ----------
    path : this window's recovery file (unique per window: process id and a token)
    timer : the single-shot debounce timer
    """

    def __init__(self, document: HullDocument, folder: Path, parent: QObject | None = None):
        super().__init__(parent)
        self.document = document
        self.folder = folder
        self.path = folder / f"{_PREFIX}{os.getpid()}-{secrets.token_hex(4)}.json"
        self._lock_fd: int | None = None
        self._written: Design | None = None
        self.error = ""
        self.timer = QTimer(self)
        self.timer.setSingleShot(True)
        self.timer.setInterval(AUTOSAVE_DELAY_MS)
        self.timer.timeout.connect(self._on_timer)
        document.designChanged.connect(self.timer.start)
        document.fileChanged.connect(self.timer.start)

    def _on_timer(self) -> None:
        if self.document.is_previewing:  # never on the drag path: try again after it
            self.timer.start()
            return
        self.write_now()

    def _hold_lock(self) -> None:
        if self._lock_fd is not None:
            return
        self.folder.mkdir(parents=True, exist_ok=True)
        fd = os.open(self.path.with_suffix(".lock"), os.O_RDWR | os.O_CREAT, 0o644)
        if fcntl is not None:
            fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
        self._lock_fd = fd

    def write_now(self) -> bool:
        """Write the unsaved design now (or remove the file if nothing is unsaved).

        Returns False, with the reason in :attr:`error`, if the disk refused.
        """
        self.timer.stop()
        design = self.document.committed
        if not self.document.is_modified:
            self.discard()
            return True
        if design is self._written and self.path.exists():
            return True
        data = {
            "format": FORMAT,
            "version": 1,
            "saved_at": _dt.datetime.now().isoformat(timespec="seconds"),
            "source": str(self.document.path or ""),
            "design": design_to_dict(design),
        }
        try:
            self._hold_lock()
            atomic_write_text(self.path, json.dumps(data) + "\n")
        except (OSError, HullwrightError) as e:
            self.error = getattr(e, "strerror", None) or str(e)
            return False
        self._written = design
        self.error = ""
        return True

    def discard(self) -> None:
        """Remove this window's recovery file (the design is saved or given up)."""
        self.timer.stop()
        self.path.unlink(missing_ok=True)
        self._written = None

    def close(self) -> None:
        """The window closes normally: no recovery file, no lock."""
        self.discard()
        self._release(remove=True)

    def abandon(self) -> None:
        """Let go of the lock and leave the file, as a crashed process would (tests)."""
        self.timer.stop()
        self._release(remove=False)

    def _release(self, remove: bool) -> None:
        if self._lock_fd is not None:
            os.close(self._lock_fd)
            self._lock_fd = None
        if remove:
            self.path.with_suffix(".lock").unlink(missing_ok=True)
