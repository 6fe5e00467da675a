"""A guard against a reference-counting fault of shiboken6 6.12 on Python 3.10 and 3.11.

With PySide6 / shiboken6 6.12.0 on Python 3.11 (measured here), every call of a Qt
method that returns nothing (``update()``, ``setText()``, ``QTimer.start()``...) drops
one reference to ``None`` it never took, and a signal ``emit`` drops one to ``True``;
that is harmless from Python 3.12 on, where these objects are immortal, but on 3.11
their counts run down and the interpreter aborts with "deallocating None" (a few
thousand drag frames, or a test run).  PySide6 6.11.3 does not have the fault.

:func:`protect_singletons` gives ``None``, ``True`` and ``False`` a count that cannot
run out (2**40 extra references; about five are lost per drag frame), only on the
affected combination.  Drop this module once the project requires PySide6 without
the fault or Python >= 3.12.
"""

from __future__ import annotations

import ctypes
import sys

import shiboken6

__all__ = ["affected", "protect_singletons"]

_EXTRA_REFERENCES = 1 << 40
_protected = False


def affected() -> bool:
    """True on Python < 3.12 with shiboken6 6.12 or later."""
    return sys.version_info < (3, 12) and tuple(shiboken6.__version_info__[:2]) >= (6, 12)


def protect_singletons() -> bool:
    """Apply the guard once, if needed; True if it is in place."""
    global _protected
    if not affected():
        return False
    if not _protected:
        for singleton in (None, True, False):
            ctypes.c_ssize_t.from_address(id(singleton)).value += _EXTRA_REFERENCES
        _protected = True
    return True
