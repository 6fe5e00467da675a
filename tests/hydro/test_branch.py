"""The free-trim solution follows one branch from upright, and a warm start changes nothing.

A raft with a heavy item high and far forward floats trimmed 7-10 degrees by the head;
solved all at once, some heels used to land on another equilibrium (the raft standing
on end) and the GZ curve jumped by a fifth of a metre between neighbouring degrees.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest

from hydro import Design, MassItem, analyse, load_design
from hydro.loads import weight_build_up
from hydro.sections import build_section_table, cut, heel_frame
from tests.paths import SAMPLES


def _raft_with(mass: float, z: float, along: float) -> Design:
    """The raft sample with an extra item of ``mass`` at height z, ``along`` of its length."""
    design = load_design(SAMPLES / "drift-lab-raft.json")
    x0, x1 = design.hull.x_range
    item = MassItem("spare buoyancy tank, full", mass, x0 + along * (x1 - x0), 0.0, z)
    return replace(design, loads=replace(design.loads, items=design.loads.items + (item,)))


TRIMMED = {
    "10 degrees by the head": (150.0, 0.2, 0.9),
    "7 degrees by the head, high load": (230.0, 0.8, 0.7),
}


@pytest.mark.parametrize("load", TRIMMED.values(), ids=TRIMMED.keys())
def test_a_trimmed_raft_has_a_continuous_gz_curve(load):
    a = analyse(_raft_with(*load))
    assert a.hydrostatics.trim_deg > 7.0  # bow down
    curve = a.curve
    assert np.all(np.isfinite(curve.gz)), "every heel has a floating position"
    step = np.abs(np.diff(curve.gz))
    # a smooth curve's change over one degree is close to its neighbours' changes;
    # a jump to another branch is many times larger than both
    before = np.r_[step[1], step[:-1]]
    after = np.r_[step[1:], step[-2]]
    limit = 2.0 * np.maximum(before, after) + 1e-3
    worst = int(np.argmax(step - limit))
    assert np.all(step <= limit), f"GZ jumps by {step[worst]:.3f} m between {worst} and {worst + 1} deg"
    assert np.all(np.abs(np.diff(curve.trim_deg)) < 2.0), "trim changes smoothly with heel"


@pytest.mark.parametrize("load", TRIMMED.values(), ids=TRIMMED.keys())
def test_every_heel_balances_volume_and_pitch(load):
    design = _raft_with(*load)
    a = analyse(design)
    stations = design.stations()
    table = build_section_table(stations)
    rho = design.water_density
    w = weight_build_up(design.loads, stations, rho)
    h, tau = a.curve.waterlines
    frame = heel_frame(table, np.radians(a.curve.heel_deg))
    c = cut(table, frame, h[:, None] + tau[:, None] * table.x[None, :])
    volume = c.area @ table.weights
    x_b = (c.area @ table.weights_x) / volume
    eta_b = (c.q_eta @ table.weights) / volume
    eta_g = frame.cos * w.vcg - frame.sin * w.tcg
    np.testing.assert_allclose(volume, w.mass / rho, rtol=1e-9)
    # B and G on one vertical in the fore-and-aft plane of the trimmed, heeled boat
    pitch = (x_b - w.lcg) + tau * (eta_b - eta_g)
    assert np.max(np.abs(pitch)) < 1e-9 * stations.length
    # and the curve's GZ is B's offset from G across the heel axis at that waterline
    xi_b = (c.q_xi @ table.weights) / volume
    xi_g = frame.cos * w.tcg + frame.sin * w.vcg
    np.testing.assert_allclose(a.curve.gz, xi_b - xi_g, rtol=0, atol=1e-9)


def _widened(design: Design, by: float) -> Design:
    hull = design.hull
    i = max(range(len(hull.plan.points)), key=lambda k: hull.plan.points[k][1])
    x, b = hull.plan.points[i]
    return replace(design, hull=replace(hull, plan=hull.plan.with_point(i, (x, b + by))))


@pytest.mark.parametrize(
    "design",
    [
        load_design(SAMPLES / "paper-loon-canoe.json"),
        load_design(SAMPLES / "heron-punt.json"),
        _raft_with(*TRIMMED["7 degrees by the head, high load"]),
    ],
    ids=["canoe", "punt", "trimmed raft"],
)
def test_a_warm_start_gives_the_same_figures(design):
    """The same solutions at every heel; the refined features agree to far below what is
    shown (a warm start also solves angles around where the features were, so the top
    and the crossings are refined from other samples: the same to 1e-3 and 1e-5 degree,
    the largest arm to 0.1 micrometre)."""
    previous = analyse(design)
    for by in (0.004, 0.012, -0.02):
        moved = _widened(design, by)
        warm, cold = analyse(moved, start=previous), analyse(moved)
        np.testing.assert_allclose(warm.curve.gz, cold.curve.gz, rtol=0, atol=1e-8)
        np.testing.assert_allclose(warm.curve.trim_deg, cold.curve.trim_deg, rtol=0, atol=1e-5)
        assert warm.hydrostatics.gm == pytest.approx(cold.hydrostatics.gm, abs=1e-9)
        assert warm.curve.max_gz == pytest.approx(cold.curve.max_gz, abs=1e-7)
        assert warm.curve.max_gz_deg == pytest.approx(cold.curve.max_gz_deg, abs=1e-3)
        for crossing in ("gunwale_immersion_deg", "avs_deg"):
            x, y = getattr(warm.curve, crossing), getattr(cold.curve, crossing)
            assert x == pytest.approx(y, abs=1e-5), crossing
        previous = warm


def test_a_start_from_another_design_is_harmless():
    canoe = load_design(SAMPLES / "paper-loon-canoe.json")
    raft = _raft_with(*TRIMMED["10 degrees by the head"])
    warm, cold = analyse(raft, start=analyse(canoe)), analyse(raft)
    np.testing.assert_allclose(warm.curve.gz, cold.curve.gz, rtol=0, atol=1e-8)
