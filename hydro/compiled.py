"""Which hot path :mod:`hydro.sections` runs: numba-compiled kernels or the numpy reference.

The compiled kernels (:mod:`hydro.cut_kernels`) are optional: they need numba (the
``fast`` extra, ``pip install "hullwright[fast]"``).  The numpy code in
:mod:`hydro.sections` is the reference, always present, and the fallback whenever the
kernels cannot be used: numba missing, no writable cache directory, a compiler failure.

The choice comes from the environment variable ``HULLWRIGHT_ENGINE``, read on first use:

* ``auto`` (or unset): the kernels are loaded on a background thread that the first cut
  starts and that begins work ``LOAD_DELAY_S`` later (at once after :func:`warm_up`);
  until they are ready every cut runs on numpy, so the first start after installing
  numba (a few seconds of compiling) never holds up the caller, and a short command that
  is done within the delay never imports numba at all;
* ``compiled``: the first cut waits until the kernels are loaded (numpy if they cannot
  be);
* ``numpy``: the numpy reference only; numba is never imported.

The kernels are compiled once and cached on disk by numba (beside
``hydro/cut_kernels.py`` in ``__pycache__`` when that is writable, else numba's user cache
directory, or ``NUMBA_CACHE_DIR`` when set); later starts load them from the cache.
:func:`select` changes the choice at run time (benchmarks, tests).
"""

from __future__ import annotations

import importlib
import os
import threading
import time
from types import ModuleType

from hydro.errors import HullwrightError

__all__ = [
    "ENGINE_VARIABLE", "CHOICES", "LOAD_DELAY_S",
    "kernels", "warm_up", "select", "engine_name", "status",
]

ENGINE_VARIABLE = "HULLWRIGHT_ENGINE"
CHOICES = ("auto", "compiled", "numpy")
LOAD_DELAY_S = 0.5
"""Seconds between the first cut and the start of loading, in ``auto``."""

_lock = threading.Lock()
_go = threading.Event()  # set: load now, without waiting out the delay
_choice: str | None = None  # None: not decided yet (the variable is read on first use)
_loader: threading.Thread | None = None
_loaded: ModuleType | None = None  # the kernels once imported and compiled
_active: ModuleType | None = None  # the kernels in use now; None: numpy
_failure = ""  # why the kernels could not be loaded
_load_seconds = float("nan")


def kernels() -> ModuleType | None:
    """The compiled kernels when they are chosen and ready, else None (use numpy).

    The first call decides the engine and, unless it is ``numpy``, starts loading the
    kernels; later calls cost one global lookup.
    """
    if _active is not None or _choice is not None:
        return _active
    _decide(None)
    return _active


def warm_up(wait: bool = False) -> bool:
    """Start loading the kernels now (unless ``numpy`` is chosen); True if in use.

    An unknown ``HULLWRIGHT_ENGINE`` is not reported here but by the first cut, where
    the app and the command line show an analysis' errors.

    Parameters
    ----------
    wait : block until the kernels are loaded or have failed to load
    """
    _go.set()
    try:
        kernels()
    except HullwrightError:
        return False
    loader = _loader
    if wait and loader is not None:
        loader.join()
    return _active is not None


def select(choice: str) -> None:
    """Choose the engine at run time: ``auto``, ``compiled`` (waits) or ``numpy``."""
    global _active
    _check(choice, "engine")
    _decide(choice)
    if choice == "numpy":
        _active = None
    elif _loaded is not None:
        _active = _loaded


def engine_name() -> str:
    """``compiled`` when the kernels are in use now, else ``numpy``."""
    return "numpy" if _active is None else "compiled"


def status() -> str:
    """One line: the engine in use, and why not the compiled one or how long it took."""
    if _active is not None:
        return f"compiled (kernels loaded in {_load_seconds:.2f} s)"
    if _choice == "numpy":
        return "numpy (chosen)"
    if _failure:
        return f"numpy (compiled kernels unavailable: {_failure})"
    if _loader is not None and _loader.is_alive():
        return "numpy (compiled kernels still loading)"
    return "numpy"


def _check(choice: str, where: str) -> None:
    if choice not in CHOICES:
        raise HullwrightError(f"{where} {choice!r} is not one of {', '.join(CHOICES)}")


def _decide(choice: str | None) -> None:
    """Fix the choice (``choice`` or the variable's) and start the loader if needed."""
    global _choice, _loader
    with _lock:
        if choice is None:
            if _choice is not None:
                return
            choice = os.environ.get(ENGINE_VARIABLE, "").strip().lower() or "auto"
            _check(choice, f"{ENGINE_VARIABLE}:")
        _choice = choice
        if choice == "compiled":
            _go.set()
        if choice == "numpy" or _loader is not None:
            loader = _loader
        else:
            loader = _loader = threading.Thread(
                target=_load, name="hullwright-kernels", daemon=True
            )
            loader.start()
    if choice == "compiled" and loader is not None:
        loader.join()


def _load() -> None:
    """Import (compile, or load from numba's cache) the kernels; record any failure."""
    global _loaded, _active, _failure, _load_seconds
    _go.wait(LOAD_DELAY_S)
    start = time.perf_counter()
    try:
        module = importlib.import_module("hydro.cut_kernels")
    except Exception as exc:  # numba missing or broken, no writable cache: numpy stays
        _failure = f"{type(exc).__name__}: {exc}".splitlines()[0]
        return
    _load_seconds = time.perf_counter() - start
    _loaded = module
    if _choice != "numpy":
        _active = module
