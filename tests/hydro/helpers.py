"""Small builders shared by the engine tests (invented dimensions, SI units)."""

from __future__ import annotations

import numpy as np
import pytest

from hydro.hull import Stations
from hydro.loads import WeightSummary
from hydro.sections import build_section_table
from hydro.stability import Analysis, analyse_table


def lumped(mass: float, x: float, kg: float, y: float = 0.0) -> WeightSummary:
    """A single point load with K at z = 0."""
    return WeightSummary((), mass, x, y, kg, kg)


def run(
    stations: Stations,
    mass: float,
    x: float,
    kg: float,
    heel_deg: np.ndarray | None = None,
    rho: float = 1000.0,
    free_trim: bool = True,
    y: float = 0.0,
) -> Analysis:
    heel = np.arange(0.0, 91.0) if heel_deg is None else np.asarray(heel_deg, dtype=float)
    return analyse_table(build_section_table(stations), lumped(mass, x, kg, y), rho, heel, free_trim)


def assert_same_figures(coarse: Analysis, full: Analysis) -> None:
    """A coarse-grid analysis shows the full one's figures: status, GM, and every curve
    feature within 0.1 mm of arm and 0.05 degree of angle (the bar for a drag frame)."""
    assert coarse.status == full.status
    assert coarse.hydrostatics.gm == pytest.approx(full.hydrostatics.gm, abs=1e-9)
    a, b = coarse.curve, full.curve
    assert a.max_gz == pytest.approx(b.max_gz, abs=1e-4)
    for name in ("max_gz_deg", "list_deg", "avs_deg", "gunwale_immersion_deg"):
        x, y = getattr(a, name), getattr(b, name)
        assert (x is None) == (y is None), name
        if x is not None:
            assert x == pytest.approx(y, abs=0.05), name
