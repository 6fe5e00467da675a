"""The builder's stations for the table of offsets: every so often from the aft end, or N."""

import numpy as np
import pytest

from hydro import HullwrightError, load_design
from hydro.builder_stations import builder_stations, station_positions
from tests.paths import SAMPLES


def test_every_foot_from_the_aft_end_and_the_bow_last():
    xs = station_positions(0.0, 3.4, spacing=0.3048)
    assert np.allclose(np.diff(xs[:-1]), 0.3048) and xs[-1] == 3.4 and len(xs) == 13


def test_the_builders_stations_lie_on_the_sketch():
    design = load_design(SAMPLES / "paper-loon-canoe.json")
    stations = builder_stations(design, spacing=0.3)
    hull = design.hull
    assert stations.x[1] == pytest.approx(0.3)
    sheer_y = np.array([h[-1, 0] for h in stations.half_sections])
    sheer_z = np.array([h[-1, 1] for h in stations.half_sections])
    assert np.allclose(sheer_y, hull.plan(stations.x))  # the gunwale is the plan line
    assert np.allclose(sheer_z, hull.sheer(stations.x))
    assert len(builder_stations(design, count=7).x) == 7


@pytest.mark.parametrize("kw, words", [
    ({"spacing": 0.0}, "positive length"),
    ({"spacing": 0.001}, "more than"),
    ({"count": 1}, "between 2"),
    ({}, "either"),
])
def test_impossible_choices_are_refused(kw, words):
    with pytest.raises(HullwrightError, match=words):
        builder_stations(load_design(SAMPLES / "heron-punt.json"), **kw)
