"""Writing files without losing one: checks before work, atomic replacement, temp files.

:func:`check_output` refuses, with one sentence, an output that is empty, a folder, in a
missing or read-only folder, read-only itself, or the same file as an input (so
``offsets boat.json -o boat.json`` cannot replace the design).  :func:`write_via_temp`
writes into a temporary file beside the target and moves it over the target:

- a symlink is followed: its target file is replaced, the link stays a link;
- the target's permission bits (and owner, where allowed) are kept; a new file gets the
  usual permissions (the umask applies), never 0600;
- a file with other hard links is written in place (the new content is complete on
  disk beside it first), so every name keeps seeing the same, new file; only this case
  is not atomic;
- a read-only file is never replaced.

Temporary files are named ``.hullwright-<pid>-<token>-<name>``; ones left by a process
that is no longer running (a killed save) are removed by the next write in that folder.
"""

from __future__ import annotations

import os
import re
import secrets
import stat
from pathlib import Path
from typing import Callable, Iterable

from hydro.errors import OutputError

__all__ = ["TEMP_PREFIX", "check_output", "write_via_temp", "write_bytes", "remove_stale_temps"]

TEMP_PREFIX = ".hullwright-"
_TEMP_NAME = re.compile(r"^\.hullwright-(\d+)-[0-9a-f]+-")


def _same_file(a: Path, b: Path) -> bool:
    try:
        return os.path.samefile(a, b)
    except OSError:
        return os.path.realpath(a) == os.path.realpath(b)


def _read_only(path: Path, st: os.stat_result) -> bool:
    """No write permission, by the access check or by the mode bits (so that even an
    administrator does not replace a file its owner marked read-only)."""
    return not os.access(path, os.W_OK) or not st.st_mode & 0o222


def check_output(
    path: str | os.PathLike[str], inputs: Iterable[str | os.PathLike[str]] = ()
) -> Path:
    """The real file an output path will write (symlinks followed), or OutputError.

    Call it before any work, so a bad output path costs nothing.
    """
    text = os.fspath(path)
    if not text.strip():
        raise OutputError("no output file given")
    if "\0" in text:
        raise OutputError("the output file name is not valid")
    real = Path(os.path.realpath(text))
    if text.endswith(os.sep) or real.is_dir():
        raise OutputError(f"{text}: is a folder; give a file name")
    folder = real.parent
    if not folder.exists():
        raise OutputError(f"{text}: folder {folder} does not exist")
    if not folder.is_dir():
        raise OutputError(f"{text}: {folder} is a file, not a folder")
    for source in inputs:
        if os.fspath(source) and _same_file(real, Path(source)):
            raise OutputError(
                f"{text}: is the input file {Path(source).name}; choose another output name"
            )
    if real.exists():
        st = os.stat(real)
        if not stat.S_ISREG(st.st_mode):
            raise OutputError(f"{text}: not a regular file (a device, pipe or socket)")
        if _read_only(real, st):
            raise OutputError(f"{text}: is read-only; not replaced")
    if _read_only(folder, os.stat(folder)):
        raise OutputError(f"{text}: cannot write in folder {folder} (read-only)")
    return real


def remove_stale_temps(folder: Path) -> int:
    """Remove temporary files of saves killed half way (their process is gone).

    Returns how many were removed.
    """
    removed = 0
    try:
        names = os.listdir(folder)
    except OSError:
        return 0
    for name in names:
        m = _TEMP_NAME.match(name)
        if m is None or _alive(int(m.group(1))):
            continue
        try:
            os.unlink(folder / name)
            removed += 1
        except OSError:
            pass
    return removed


def _alive(pid: int) -> bool:
    if pid == os.getpid():
        return True
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except (PermissionError, OverflowError):
        return True
    return True


def _fsync(path: Path) -> None:
    fd = os.open(path, os.O_RDONLY)
    try:
        os.fsync(fd)
    finally:
        os.close(fd)


def write_via_temp(
    path: str | os.PathLike[str],
    write: Callable[[Path], object],
    inputs: Iterable[str | os.PathLike[str]] = (),
) -> Path:
    """Call ``write(temp)`` to fill a temporary file beside the target, then put it in
    place (see the module note).  Returns the real path written.

    Raises OutputError for a refused path, OSError if the disk refuses; either way the
    target is as it was and no temporary file stays behind.
    """
    target = check_output(path, inputs)
    folder = target.parent
    remove_stale_temps(folder)
    old = os.stat(target) if target.exists() else None
    tmp = folder / f"{TEMP_PREFIX}{os.getpid()}-{secrets.token_hex(6)}-{target.name}"[:255]
    # created here with 0666 so the umask applies, as for any new file
    os.close(os.open(tmp, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o666))
    try:
        write(tmp)
        _fsync(tmp)
        if old is not None and old.st_nlink > 1:
            _copy_in_place(tmp, target)
            tmp.unlink()
            return target
        if old is not None:
            os.chmod(tmp, stat.S_IMODE(old.st_mode))
            try:
                os.chown(tmp, old.st_uid, old.st_gid)
            except OSError:
                pass
        os.replace(tmp, target)
    except BaseException:
        tmp.unlink(missing_ok=True)
        raise
    return target


def _copy_in_place(source: Path, target: Path) -> None:
    data = source.read_bytes()
    with open(target, "r+b") as f:
        f.write(data)
        f.truncate()
        f.flush()
        os.fsync(f.fileno())


def write_bytes(
    path: str | os.PathLike[str], data: bytes, inputs: Iterable[str | os.PathLike[str]] = ()
) -> Path:
    """Write ``data`` safely (see :func:`write_via_temp`)."""
    return write_via_temp(path, lambda tmp: tmp.write_bytes(data), inputs)
