"""Stop a background job at once, wherever it is, when a drag begins.

The builder's checks and the build pack run on worker threads.  Python lets only one
thread run at a time, so a job still going during a drag roughly halves the frame
rate, and the engine's long computations (a sheet layout, a what-if table) have no
place to ask whether they are still wanted.  :class:`Interruptible` wraps the job's
work: :meth:`Interruptible.interrupt` (from the GUI thread) raises :class:`Interrupted`
inside the worker at its next Python instruction, through CPython's
``PyThreadState_SetAsyncExc``.  It is sent at most once per job, only while the worker
is inside :meth:`Interruptible.run`, and one not yet raised when the work ends is
cleared under the same lock, so it never reaches the worker's next job.  It can still
arrive as ``run`` returns: whoever calls ``run`` catches :class:`Interrupted`.
"""

from __future__ import annotations

import ctypes
import threading
from typing import Callable, TypeVar

__all__ = ["Interrupted", "Interruptible"]

T = TypeVar("T")

_set_async_exc = ctypes.pythonapi.PyThreadState_SetAsyncExc


class Interrupted(BaseException):
    """The job was stopped from outside (a BaseException, so no ``except Exception``
    in the job's code can swallow it)."""


class Interruptible:
    """One job's work, which another thread may stop at any instruction.

    >>> job = Interruptible()
    >>> job.run(lambda: 6 * 7)
    42
    >>> job.interrupt()  # already done: nothing to stop
    False
    """

    def __init__(self) -> None:
        self._lock = threading.Lock()
        self._thread: int | None = None  # the worker while it is inside run()
        self.interrupted = False
        self.finished = False

    def run(self, work: Callable[[], T]) -> T:
        """``work()`` in the calling thread; raises :class:`Interrupted` if stopped."""
        with self._lock:
            if self.interrupted:
                raise Interrupted
            self._thread = threading.get_ident()
        try:
            return work()
        finally:
            self._leave()

    def _leave(self) -> None:
        """Mark the worker out of reach and drop an exception sent but not yet raised."""
        with self._lock:
            self.finished = True
            if self._thread is not None:
                _set_async_exc(ctypes.c_ulong(self._thread), None)
                self._thread = None

    def interrupt(self) -> bool:
        """Stop the job: at once if it is running, else before it starts (the first
        call only; later ones change nothing).  True if the job had not finished."""
        with self._lock:
            if self.interrupted or self.finished:
                return False
            self.interrupted = True
            if self._thread is not None:
                _set_async_exc(ctypes.c_ulong(self._thread), ctypes.py_object(Interrupted))
            return True
