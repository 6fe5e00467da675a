"""Small builders shared by the engine tests (invented dimensions, SI units)."""

from __future__ import annotations

import numpy as np

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
