"""Timing helper shared by the benchmarks (run them as ``python bench/NAME.py``)."""

from __future__ import annotations

import statistics
import time
from typing import Callable


def median_ms(fn: Callable[[], object], repeat: int, warmup: int) -> float:
    """Median wall time of ``fn`` in milliseconds over ``repeat`` runs after ``warmup``."""
    for _ in range(warmup):
        fn()
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return 1000.0 * statistics.median(times)
