"""Main dimensions of a sketch, and the sketch rescaled to new ones keeping its shape."""

import numpy as np
import pytest

from hydro import HullwrightError, generate_stations, load_design
from hydro.resize import (
    measure,
    resize_design,
    with_beam,
    with_bottom_width,
    with_depth,
    with_flare,
    with_length,
    with_rocker,
    with_twin_hulls,
)
from tests.paths import SAMPLES


def sample_design(name):
    return load_design(SAMPLES / f"{name}.json")


def test_beam_is_exact_and_only_breadths_change():
    hull = sample_design("heron-punt").hull
    new = with_beam(hull, 1.2)
    assert 2 * max(b for _x, b in new.plan.points) == 1.2
    assert 2 * generate_stations(new).max_half_breadth == pytest.approx(1.2, abs=1e-12)
    assert (new.keel, new.sheer, new.sections) == (hull.keel, hull.sheer, hull.sections)
    ratio = np.array(new.plan.points)[:, 1] / np.array(hull.plan.points)[:, 1]
    assert np.allclose(ratio, 1.2 / 0.96)  # the plan keeps its shape


def test_length_and_depth_stretch_about_the_aft_end_and_the_keel():
    hull = sample_design("paper-loon-canoe").hull
    longer = with_length(hull, 4.2)
    assert longer.length == 4.2
    assert longer.sections[0].x == pytest.approx(1.7 * 4.2 / 3.4)
    deeper = with_depth(hull, 0.42)
    assert measure(deeper).depth == pytest.approx(0.42, abs=1e-12)
    assert measure(deeper).rocker_fore == pytest.approx(0.14 * 0.42 / 0.34)
    assert deeper.plan == hull.plan


def test_rocker_ends_move_and_the_middle_stays():
    hull = sample_design("heron-punt").hull
    new = with_rocker(hull, aft=0.05, fore=0.2)
    dims = measure(new)
    assert (dims.rocker_aft, dims.rocker_fore) == pytest.approx((0.05, 0.2))
    assert new.keel.points[2] == hull.keel.points[2]  # the lowest point
    assert new.sheer == hull.sheer


def test_bottom_width_and_flare_of_a_hard_chine_hull():
    hull = sample_design("tern-pram").hull
    wider = with_bottom_width(hull, 0.9)
    assert measure(wider).bottom_width == pytest.approx(0.9, abs=1e-12)
    assert measure(wider).beam == measure(hull).beam
    flared = with_flare(hull, 25.0)
    assert measure(flared).flare_deg == pytest.approx(25.0, abs=1e-9)
    with pytest.raises(HullwrightError, match="bottom width or flare too large"):
        with_bottom_width(hull, 1.3)


def test_twin_hulls_move_apart_and_keep_their_width():
    hull = sample_design("drift-lab-raft").hull
    new = with_twin_hulls(hull, spacing=1.6)
    dims = measure(new)
    assert dims.hull_spacing == pytest.approx(1.6, abs=1e-12)
    assert dims.hull_width == pytest.approx(measure(hull).hull_width, abs=1e-12)
    assert dims.beam == pytest.approx(1.6 + dims.hull_width, abs=1e-12)
    with pytest.raises(HullwrightError, match="overlap"):
        with_twin_hulls(hull, spacing=0.3)
    with pytest.raises(HullwrightError, match="twin-hull"):
        with_twin_hulls(sample_design("heron-punt").hull, spacing=1.0)


def test_resize_moves_the_crew_with_the_boat():
    design = sample_design("heron-punt")
    new = resize_design(design, length=3.9, beam=1.44)
    x0 = design.hull.x_range[0]
    for before, after in zip(design.loads.crew, new.loads.crew):
        assert after.x - x0 == pytest.approx((before.x - x0) * 1.5)
        assert after.y == pytest.approx(before.y * 1.5)
    assert new.loads.materials == design.loads.materials


def test_a_fixed_table_of_offsets_scales_too():
    design = sample_design("heron-punt")
    table = type(design)(design.name, design.stations(), design.loads)
    new = resize_design(table, length=5.2, beam=0.48)
    assert new.hull.length == pytest.approx(5.2)
    assert 2 * new.hull.max_half_breadth == pytest.approx(0.48)


@pytest.mark.parametrize("value", [0.0, -1.0, float("nan"), float("inf")])
def test_impossible_sizes_are_refused(value):
    with pytest.raises(HullwrightError, match="positive length"):
        with_beam(sample_design("heron-punt").hull, value)
