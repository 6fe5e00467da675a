"""The section kernel against shapely polygon clipping (an outside reference).

shapely 2 (GEOS) clips the same polygon by the same half-plane; its area, centroid and
the waterline's length must equal ours to rounding.
"""

import numpy as np
import pytest
import shapely
from shapely import affinity

from hydro.hull import Stations
from hydro.sections import build_section_table, cut, heel_frame
from tests.sources import SHAPELY

HALVES = {
    "twin pontoon": np.array([[0, 0.5], [0.3, 0.5], [0.3, 0.1], [0.45, 0], [0.6, 0.1], [0.6, 0.6]]),
    "box": np.array([[0, 0], [1, 0], [1, 1]]),
    "tumblehome": np.array([[0, 0], [0.7, 0.7], [0.6, 1.0]]),
    "flared chine": np.array([[0, 0], [0.4, 0.05], [0.5, 0.25], [0.8, 0.6]]),
    "pointed end": np.array([[0, 0], [0, 0.5]]),
}


def _shapely_cut(half: np.ndarray, phi: float, h: float) -> tuple[float, float, float, float]:
    ring = np.vstack([half, half[::-1][:-1] * [-1, 1]])
    poly = shapely.Polygon(ring) if np.ptp(ring[:, 0]) > 0 else shapely.Polygon()
    c, s = np.cos(phi), np.sin(phi)
    rotated = affinity.affine_transform(poly, [c, s, -s, c, 0, 0])  # (xi, eta)
    wet = rotated.intersection(shapely.box(-10, -10, 10, h))
    line = rotated.intersection(shapely.LineString([(-10, h), (10, h)]))
    if wet.area == 0:
        return 0.0, 0.0, 0.0, 0.0
    return wet.area, wet.area * wet.centroid.x, wet.area * wet.centroid.y, line.length


@pytest.mark.source(SHAPELY)
@pytest.mark.parametrize("heel", [0.0, 7.0, 33.0, 80.0, 125.0, -20.0])
def test_cut_matches_shapely_clipping(heel):
    names = list(HALVES)
    stations = Stations(np.arange(len(names), dtype=float), tuple(HALVES[n] for n in names))
    table = build_section_table(stations)
    phi = np.radians(heel)
    frame = heel_frame(table, np.array([phi]))
    rng = np.random.default_rng(7)
    for _ in range(12):
        h = rng.uniform(frame.eta_low[0] - 0.05, frame.eta_high[0] + 0.05, size=len(names))
        got = cut(table, frame, h[None, :])
        for i, name in enumerate(names):
            expected = _shapely_cut(HALVES[name], phi, h[i])
            actual = (got.area[0, i], got.q_xi[0, i], got.q_eta[0, i], got.breadth[0, i])
            np.testing.assert_allclose(actual, expected, atol=1e-12, err_msg=name)


def test_partial_cut_is_consistent_with_its_derivative():
    """d(area)/dh equals the waterline breadth (checked by central differences)."""
    stations = Stations(np.array([0.0, 1.0]), (HALVES["twin pontoon"], HALVES["flared chine"]))
    table = build_section_table(stations)
    frame = heel_frame(table, np.radians([0.0, 15.0, 40.0]))
    h = np.full((3, 2), 0.2)
    eps = 1e-6
    up = cut(table, frame, h + eps)
    down = cut(table, frame, h - eps)
    mid = cut(table, frame, h)
    np.testing.assert_allclose((up.area - down.area) / (2 * eps), mid.breadth, rtol=1e-6, atol=1e-9)
    np.testing.assert_allclose((up.q_xi - down.q_xi) / (2 * eps), mid.breadth_m1, rtol=1e-6, atol=1e-9)
