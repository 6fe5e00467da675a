"""Process-level tuning for programs that run the engine many times (app, CLI, bench).

glibc gives freed memory back to the operating system as soon as a few hundred
kilobytes are free at the top of the heap.  The engine frees and re-allocates arrays of
that size on every Newton step, so on machines where page faults are expensive (virtual
machines) most of its time went into the kernel.  :func:`keep_freed_memory` asks glibc to
keep up to 256 MB of freed memory for reuse instead.  It is an explicit opt-in for the
entry points; importing hydro changes nothing.
"""

from __future__ import annotations

import ctypes
import ctypes.util

__all__ = ["keep_freed_memory"]

_M_TRIM_THRESHOLD = -1
_M_MMAP_THRESHOLD = -3


def keep_freed_memory(limit_bytes: int = 256 * 1024 * 1024) -> bool:
    """Raise glibc's trim and mmap thresholds; True if it took effect (glibc only)."""
    name = ctypes.util.find_library("c")
    if not name:
        return False
    try:
        libc = ctypes.CDLL(name)
        mallopt = libc.mallopt
    except (OSError, AttributeError):
        return False
    ok_trim = mallopt(_M_TRIM_THRESHOLD, limit_bytes)
    ok_mmap = mallopt(_M_MMAP_THRESHOLD, min(limit_bytes, 32 * 1024 * 1024))
    return bool(ok_trim and ok_mmap)
