"""Cost of one analysis against its work (stations x outline vertices x heel angles).

Each size runs in a fresh process so its peak memory is its own.  Prints ``name: value``
lines: seconds and peak MB per size, and the cost per unit of work that sets
``hydro.limits.MAX_WORK``.  Run: ``python bench/limits.py``.
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]

ONE = """
import json, resource, sys, time
import numpy as np
from hydro.design import AnalysisSettings, analyse_stations
from hydro.hull import Stations
from hydro.loads import Loads, MassItem
from hydro.runtime import keep_freed_memory
keep_freed_memory()
S, n, step, top = int(sys.argv[1]), int(sys.argv[2]), float(sys.argv[3]), float(sys.argv[4])
t = np.linspace(0.0, np.pi / 2, n)
half = np.column_stack([0.5 * np.sin(t), 0.3 * (1 - np.cos(t))])
stations = Stations(np.linspace(0.0, 4.0, S), tuple(half for _ in range(S)), check_sections=False)
loads = Loads(items=(MassItem("load", 120.0, 2.0, 0.0, 0.15),))
t0 = time.perf_counter()
a = analyse_stations(stations, loads, 1000.0, AnalysisSettings(step, top))
dt = time.perf_counter() - t0
angles = a.curve.heel_deg.size
mb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
print(json.dumps({"work": S * (2 * n - 1) * angles, "s": dt, "mb": mb}))
"""

#: (stations, points per half section, heel step, largest heel)
SIZES = [(41, 12, 1.0, 90.0), (201, 50, 1.0, 90.0), (401, 100, 1.0, 90.0), (401, 100, 0.5, 90.0)]


def main() -> None:
    per_unit_s, per_unit_b = [], []
    base_mb = None
    for s, n, step, top in SIZES:
        r = subprocess.run([sys.executable, "-c", ONE, str(s), str(n), str(step), str(top)],
                           cwd=ROOT, capture_output=True, text=True, check=True)
        d = json.loads(r.stdout)
        name = f"analysis_{s}st_{n}pt_{step:g}deg"
        print(f"{name}_work: {d['work']:.3g}")
        print(f"{name}_s: {d['s']:.2f}")
        print(f"{name}_peak_mb: {d['mb']:.0f}")
        if base_mb is None:
            base_mb = d["mb"]  # the smallest run: the interpreter and libraries
        elif d["work"] > 1e6:
            per_unit_s.append(d["s"] / d["work"])
            per_unit_b.append((d["mb"] - base_mb) * 1024 * 1024 / d["work"])
    print(f"seconds_per_unit_of_work: {max(per_unit_s):.2g}")
    print(f"bytes_per_unit_of_work: {max(per_unit_b):.2g}")
    print(f"base_mb: {base_mb:.0f}")


CROSSING = """
import json, resource, sys, time
import numpy as np
from hydro.hull import first_crossed_outline
S, m = int(sys.argv[1]), int(sys.argv[2])
t = np.linspace(0.0, np.pi / 2, m)
h = np.column_stack([0.5 * np.sin(t), 0.3 * (1 - np.cos(t))])
h[0, 0] = 0.0
halves = np.broadcast_to(h, (S, m, 2)).copy()
t0 = time.perf_counter()
first_crossed_outline(halves)
dt = time.perf_counter() - t0
mb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
print(json.dumps({"work": S * (2 * m - 1) ** 2, "s": dt, "mb": mb}))
"""


def crossing_check() -> None:
    """The sketch's exact crossing check: stations x outline vertices^2."""
    for s, m in ((41, 49), (41, 193), (401, 61)):
        r = subprocess.run([sys.executable, "-c", CROSSING, str(s), str(m)],
                           cwd=ROOT, capture_output=True, text=True, check=True)
        d = json.loads(r.stdout)
        name = f"crossing_check_{s}st_{m}pt"
        print(f"{name}_work: {d['work']:.3g}")
        print(f"{name}_s: {d['s']:.2f}")
        print(f"{name}_peak_mb: {d['mb']:.0f}")


if __name__ == "__main__":
    main()
    crossing_check()
