"""Engine speed: prints ``name: value`` lines (milliseconds, medians of many runs).

    python bench/engine.py            # the figures, with the app's allocator setting
    python bench/engine.py --default  # the same with glibc's default allocator settings
    python bench/engine.py --numpy    # the numpy reference even when numba is installed

The figures are for the engine in use, printed first (``engine: compiled`` when numba's
kernels are loaded, see hydro/compiled.py; ``engine: numpy`` otherwise), measured after
the kernels have finished loading; ``kernel_load_s`` is how long that took (compiling on
the first run after installing numba, loading from numba's cache later).

Hull: a 41-station Wigley form (33 points per half section, wall-sided above the design
waterline), L 4.0 m, B 0.5 m, T 0.2 m, D 0.4 m, loaded to its design draft, G 0.15 m
above K.  ``full_analysis_ms`` = section table + free-trim upright equilibrium and
hydrostatics + GZ curve 0-90 degrees at 1 degree with free trim at every angle;
``heel_frame_ms`` and ``cut_ms`` = one rotation of the hull for the 91 angles and one
cut of it at the curve's waterlines (every field), the engine's hot path.
"""

from __future__ import annotations

import subprocess
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

import numpy as np  # noqa: E402

from hydro import compiled  # noqa: E402
from hydro.analytic import wigley  # noqa: E402
from hydro.loads import WeightSummary  # noqa: E402
from hydro.runtime import keep_freed_memory  # noqa: E402

import timing  # noqa: E402 - bench/timing.py, beside this script
from hydro.sections import build_section_table, cut, heel_frame  # noqa: E402
from hydro.stability import righting_curve, upright  # noqa: E402

L, B, T, D = 4.0, 0.5, 0.2, 0.4
RHO = 1000.0
HEEL = np.arange(0.0, 91.0, 1.0)


def median_ms(fn) -> float:
    return timing.median_ms(fn, repeat=60, warmup=5)


def main() -> None:
    default = "--default" in sys.argv
    numpy_only = "--numpy" in sys.argv
    if not default:
        keep_freed_memory()
    start = time.perf_counter()
    compiled.select("numpy" if numpy_only else "compiled")
    load_s = time.perf_counter() - start
    if not default:
        print(f"engine: {compiled.engine_name()}")
        if compiled.engine_name() == "compiled":
            print(f"kernel_load_s: {load_s:.2f}")
        else:
            print(f"engine_status: {compiled.status()}")
    stations = wigley(L, B, T, D, stations=41, points=33)
    weights = WeightSummary((), RHO * 4 / 9 * L * B * T, L / 2, 0.0, 0.15, 0.15)
    table = build_section_table(stations)
    base = upright(table, weights, RHO)

    def full(free_trim: bool = True) -> None:
        t = build_section_table(stations)
        b = upright(t, weights, RHO, free_trim)
        righting_curve(t, weights, RHO, b, HEEL, free_trim)

    curve = righting_curve(table, weights, RHO, base, HEEL)
    assert curve.converged.all()
    prefix = "default_allocator_" if default else ""
    print(f"{prefix}full_analysis_ms: {median_ms(full):.2f}")
    print(f"{prefix}full_analysis_fixed_trim_ms: {median_ms(lambda: full(False)):.2f}")
    print(f"{prefix}upright_ms: {median_ms(lambda: upright(table, weights, RHO)):.3f}")
    print(f"{prefix}curve_ms: {median_ms(lambda: righting_curve(table, weights, RHO, base, HEEL)):.2f}")
    print(f"{prefix}table_build_ms: {median_ms(lambda: build_section_table(stations)):.3f}")
    phi = np.radians(HEEL)
    frame = heel_frame(table, phi)
    h, tau = curve.waterlines if curve.waterlines is not None else (np.zeros(HEEL.size),) * 2
    levels = h[:, None] + tau[:, None] * table.x[None, :]
    print(f"{prefix}heel_frame_ms: {median_ms(lambda: heel_frame(table, phi)):.3f}")
    print(f"{prefix}cut_ms: {median_ms(lambda: cut(table, frame, levels)):.3f}")
    if not default:
        print(f"stations: {stations.x.size}")
        print(f"points_per_half_section: {stations.half_sections[0].shape[0]}")
        print(f"heel_angles: {HEEL.size}")
        print(f"gz_at_30_deg_m: {curve.gz[30]:.6f}")
        flags = ["--default"] + (["--numpy"] if numpy_only else [])
        out = subprocess.run([sys.executable, __file__, *flags], capture_output=True, text=True)
        print(out.stdout, end="")


if __name__ == "__main__":
    main()
