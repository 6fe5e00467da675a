"""Stations chosen by the builder for the table of offsets: every so often, or so many.

The engine keeps its own fine, evenly spaced stations; a builder marks the hull out at
round intervals from the aft end (every 300 mm, every foot) or at a chosen number of
evenly spaced stations.  The last station is always the forward end.
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import NDArray

from hydro.design import Design
from hydro.errors import ShapeError
from hydro.hull import HullSketch, Stations, half_sections_at

__all__ = ["station_positions", "builder_stations", "MAX_STATIONS"]

#: More stations than this would not be read off a printed table.
MAX_STATIONS = 101


def station_positions(
    x0: float, x1: float, spacing: float | None = None, count: int | None = None
) -> NDArray[np.float64]:
    """Station positions from x0 to x1: every ``spacing`` metres, or ``count`` of them.

    With a spacing, the stations run x0, x0 + s, ... and the forward end is added when
    the last round station falls short of it by more than a millimetre.

    >>> station_positions(0.0, 2.4, spacing=0.3048).round(4).tolist()
    [0.0, 0.3048, 0.6096, 0.9144, 1.2192, 1.524, 1.8288, 2.1336, 2.4]
    >>> station_positions(0.0, 2.4, count=5).round(6).tolist()
    [0.0, 0.6, 1.2, 1.8, 2.4]
    """
    if (spacing is None) == (count is None):
        raise ShapeError("give either a station spacing or a number of stations")
    if count is not None:
        if not 2 <= count <= MAX_STATIONS:
            raise ShapeError(f"the number of stations must be between 2 and {MAX_STATIONS}")
        return np.linspace(x0, x1, count, dtype=np.float64)
    assert spacing is not None
    if not (math.isfinite(spacing) and spacing > 0):
        raise ShapeError("the station spacing must be a positive length")
    n = int(math.floor((x1 - x0) / spacing + 1e-9))
    if n + 1 > MAX_STATIONS:
        raise ShapeError(f"that spacing gives more than {MAX_STATIONS} stations")
    xs: NDArray[np.float64] = x0 + spacing * np.arange(n + 1, dtype=np.float64)
    if x1 - xs[-1] > 1e-3:
        xs = np.append(xs, x1)
    else:
        xs[-1] = x1
    return xs


def builder_stations(
    design: Design, spacing: float | None = None, count: int | None = None
) -> Stations:
    """The design's half sections at the builder's stations (see :func:`station_positions`).

    A fixed table of offsets has no sketch to cut elsewhere: its own stations are kept.
    """
    hull = design.hull
    if not isinstance(hull, HullSketch):
        return design.stations()
    design.stations()  # raises ShapeError for an impossible sketch
    x0, x1 = hull.x_range
    xs = station_positions(x0, x1, spacing, count)
    return Stations(xs, tuple(half_sections_at(hull, xs)), check_sections=False)
