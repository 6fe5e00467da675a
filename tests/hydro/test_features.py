"""Features of a sampled curve refined on an exact evaluator, and their independence of
the heel grid (the figures shown during a drag come from a coarser grid)."""

import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from hydro import analyse, load_design
from hydro.features import Crossing, Peak, refine
from hydro.loads import MassItem
from tests.hydro.helpers import assert_same_figures

SAMPLES = Path(__file__).resolve().parents[2] / "sample_hulls"


def _start(f, grid, name):
    """The features of f on a grid, set up as the engine does (bracket and neighbours)."""
    v = f(grid)
    if name == "peak":
        i = int(np.argmax(v))
        near = slice(max(i - 2, 0), i + 3)
        return Peak(0, float(grid[0]), float(grid[-1]), grid[near], v[near])
    i = int(np.flatnonzero((v[:-1] > 0) & (v[1:] <= 0))[0])
    near = slice(max(i - 1, 0), i + 3)
    return Crossing(0, float(grid[i]), float(grid[i + 1]), grid[near], v[near], rising=False)


CURVES = {
    # name: (f, angle of the top, the top, where f falls through zero, tolerance on the
    # top's angle in degrees)
    # a smooth arm: A sin(2a) - c has its top at 45 degrees, value A - c
    "smooth": (lambda a: 0.3 * np.sin(np.radians(2 * a)) - 0.05, 45.0, 0.25,
               math.degrees(math.pi - math.asin(0.05 / 0.3)) / 2, 0.01),
    # a kink in the curvature at the top (as where a gunwale meets the water): two
    # parabolas of different curvature joined at 37.3 degrees with equal slope (zero);
    # the last parabola through samples 0.05 degree apart straddles the kink
    "kinked": (lambda a: np.where(a < 37.3, 0.2 - 1e-4 * (a - 37.3) ** 2,
                                  0.2 - 4e-4 * (a - 37.3) ** 2), 37.3, 0.2,
               37.3 + math.sqrt(0.2 / 4e-4), 0.02),
}


@pytest.mark.source("Press, Teukolsky, Vetterling & Flannery, Numerical Recipes, 3rd ed., "
                    "sections 9.2 and 10.3 (root bracketing; parabolic interpolation)")
@pytest.mark.parametrize("curve", CURVES, ids=list(CURVES))
@pytest.mark.parametrize("step", [1.0, 3.0, 5.0])
def test_a_crossing_and_a_top_are_found_to_hundredths_of_a_degree(curve, step):
    f, top_at, top, zero_at, tolerance = CURVES[curve]
    grid = np.arange(0.0, 90.0 + step / 2, step)
    calls = []

    def evaluate(a):
        calls.append(a.size)
        return (f(a),)

    found = refine(evaluate, {"top": _start(f, grid, "peak"), "zero": _start(f, grid, "zero")})
    assert found["top"][0] == pytest.approx(top_at, abs=tolerance)
    assert found["top"][1] == pytest.approx(top, abs=1e-7)
    assert found["zero"] == pytest.approx(zero_at, abs=0.001)
    assert len(calls) <= 4  # a few rounds, each one call of the solver


def _off_centre(design, mass, y):
    x = float(np.mean(design.stations().x))
    item = MassItem("gear", mass, x, y, 0.2)
    return replace(design, loads=replace(design.loads, items=design.loads.items + (item,)))


DESIGNS = {
    "canoe": load_design(SAMPLES / "paper-loon-canoe.json"),
    "raft": load_design(SAMPLES / "drift-lab-raft.json"),
    "punt": load_design(SAMPLES / "heron-punt.json"),
    "pram": load_design(SAMPLES / "tern-pram.json"),
}
DESIGNS["canoe, 20 kg to port"] = _off_centre(DESIGNS["canoe"], 20.0, -0.09)
DESIGNS["punt, 32 kg to starboard"] = _off_centre(DESIGNS["punt"], 32.0, 0.2)
DESIGNS["raft, 30 kg to starboard"] = _off_centre(DESIGNS["raft"], 30.0, 0.23)


@pytest.mark.parametrize("name", DESIGNS, ids=list(DESIGNS))
def test_the_figures_do_not_depend_on_the_heel_step(name):
    """The drag's coarse curve gives the full curve's figures (0.1 mm, 0.05 degree)."""
    design = DESIGNS[name]
    full = analyse(design)
    for step in (3.0, 5.0):
        coarse = analyse(design, heel_step_deg=step)
        assert coarse.curve.heel_deg.size < full.curve.heel_deg.size
        assert_same_figures(coarse, full)


def _widened(design, by):
    """The design with its widest plan point moved out by ``by`` (m), as a drag does."""
    hull = design.hull
    i = max(range(len(hull.plan.points)), key=lambda k: hull.plan.points[k][1])
    x, b = hull.plan.points[i]
    return replace(design, hull=replace(hull, plan=hull.plan.with_point(i, (x, b + by))))


@pytest.mark.parametrize("name", ["canoe", "raft", "canoe, 20 kg to port"])
def test_a_steady_drag_finds_its_features_already_bracketed(name, monkeypatch):
    """From the third frame on, the angles solved around where the features are expected
    bracket them: refinement needs no solve of its own, and the figures stay the full
    curve's."""
    import hydro.stability as stability

    solves = []
    real = stability.curve_points

    def counted(*args, **kwargs):
        solves.append(1)
        return real(*args, **kwargs)

    monkeypatch.setattr(stability, "curve_points", counted)
    design = DESIGNS[name]
    previous = analyse(design, heel_step_deg=3.0)
    for k in range(1, 6):
        frame = _widened(design, 0.002 * k)
        solves.clear()
        previous = analyse(frame, start=previous, heel_step_deg=3.0)
        if k >= 2:
            assert len(solves) == 1, f"frame {k}"
        assert_same_figures(previous, analyse(frame))


@pytest.mark.parametrize("name", ["canoe", "punt, 32 kg to starboard"])
def test_features_expected_in_the_wrong_place_are_still_found(name):
    """A drag that jumps (or a start from another design) expects the features where they
    are not: refinement goes on from the samples it has, to the same figures."""
    from hydro.stability import FeatureTrack

    design = DESIGNS[name]
    plain = analyse(design, heel_step_deg=3.0)
    curve = plain.curve
    side = curve.side
    now = {"peak": side * curve.max_gz_deg, "avs": side * curve.avs_deg,
           "gunwale": side * curve.gunwale_immersion_deg}
    if curve.list_deg not in (None, 0.0):
        now["list"] = side * curve.list_deg
    for shift in (0.03, -0.4, 2.5):
        wrong = FeatureTrack(side, {k: v + shift for k, v in now.items()}, {})
        moved = replace(curve, track=wrong)
        warm = analyse(design, start=replace(plain, curve=moved), heel_step_deg=3.0)
        assert_same_figures(warm, analyse(design))
        for key in ("max_gz_deg", "avs_deg", "gunwale_immersion_deg", "list_deg"):
            assert getattr(warm.curve, key) == pytest.approx(getattr(curve, key), abs=1e-3)
