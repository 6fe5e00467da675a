"""One verdict: the list from an off-centre G, capsizing, the one status, the beam aid
for heavily loaded boats and the exact check of every generated station.

Expected values come from the box's dimensions and loads, never from the engine: for a
wall-sided box with G off the centreline, GZ(phi) = sin(phi) (GM + BM tan^2(phi) / 2) -
TCG cos(phi) (Tupper ch. 4, the wall-sided formula; Barrass & Derrett, "List"), so the
list solves tan(phi) (GM + BM tan^2(phi) / 2) = TCG while the bilge stays immersed and
the deck edge dry; box KB = T/2, BM = B^2/(12 T).
"""

from dataclasses import replace

import numpy as np
import pytest
import shapely
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from hydro import AnalysisSettings, Curve, HullSketch, MassItem, SectionShape, ShapeError, load_design
from hydro.aids import beam_for_gm
from hydro.assess import GmState, assess
from hydro.design import analyse, check_context
from hydro.hull import first_crossed_outline, generate_stations
from hydro.stability import Status, curve_points
from tests.hydro.test_checks import box_design
from tests.paths import SAMPLES
from tests.sources import BARRASS, SHAPELY, TUPPER

L, B, D = 3.0, 1.2, 0.5


def loaded_box(draft: float, kg: float, tcg: float, heel_step_deg: float = 0.5):
    """A 3 m x 1.2 m x 0.5 m box floating at ``draft`` with G at (L/2, tcg, kg)."""
    mass = 1000.0 * L * B * draft
    design = box_design(L, B, D, items=(MassItem("load", mass, L / 2, tcg, kg),))
    return replace(design, settings=AnalysisSettings(heel_step_deg, 90.0))


def wall_sided_list(gm: float, bm: float, tcg: float) -> float:
    """Root of BM/2 t^3 + GM t - TCG = 0 (degrees, signed like TCG)."""
    roots = np.roots([0.5 * bm, 0.0, gm, -abs(tcg)])
    t = min(r.real for r in roots if abs(r.imag) < 1e-12 and r.real > 0)
    return float(np.sign(tcg) * np.degrees(np.arctan(t)))


@pytest.mark.source(f"{TUPPER}, wall-sided formula; {BARRASS}, 'List'")
@pytest.mark.parametrize("tcg", [0.01, 0.05, -0.08, 0.12])
def test_list_of_a_box_with_g_off_the_centreline(tcg):
    draft, kg = 0.15, 0.2
    gm = draft / 2 + B**2 / (12 * draft) - kg
    bm = B**2 / (12 * draft)
    expected = wall_sided_list(gm, bm, tcg)
    # valid while the bilge stays immersed and the deck edge dry
    assert np.tan(np.radians(abs(expected))) < min(draft, D - draft) / (B / 2)
    a = analyse(loaded_box(draft, kg, tcg))
    assert a.status is Status.OK
    assert a.list_deg == pytest.approx(expected, abs=0.01)
    assert a.hydrostatics.gm == pytest.approx(gm, abs=1e-9)  # GM stays upright GM
    # both sides are computed, negative heel to port, and GZ(0) = -TCG
    c = a.curve
    assert c.heel_deg[0] < 0 < c.heel_deg[-1] and c.side == np.sign(tcg)
    assert c.gz[np.argmin(np.abs(c.heel_deg))] == pytest.approx(-tcg, abs=1e-9)


def test_features_are_refined_on_the_solver_not_read_off_the_grid():
    """The list, the largest righting arm and the vanishing angle lie between the grid
    angles (5 degree steps) and GZ there is zero / largest on the exact solver."""
    design = loaded_box(0.15, 0.3, 0.05, heel_step_deg=5.0)
    a = analyse(design)
    c = a.curve
    stations, table, rho = check_context(design)
    at = np.array([c.list_deg, c.avs_deg])
    gz = curve_points(table, a.weights, rho, a.hydrostatics, at).gz
    assert np.abs(gz).max() < 2e-5
    assert c.list_deg % 5.0 > 1e-3 and c.avs_deg % 5.0 > 1e-3
    near = c.max_gz_deg + np.array([-0.5, 0.5])
    around = curve_points(table, a.weights, rho, a.hydrostatics, near).gz
    assert c.max_gz >= around.max() - 1e-9
    assert c.range_deg == pytest.approx(c.avs_deg - c.list_deg)


@pytest.mark.source(f"{BARRASS}, 'List': GZ with G off the centreline = GZ - TCG cos(phi)")
def test_capsizes_when_tcg_exceeds_what_the_symmetric_curve_can_right():
    """GZ with TCG is GZ_sym(phi) - TCG cos(phi): below the symmetric curve's largest arm
    the boat lists; above GZ_sym / cos at every heel no heel brings it back."""
    draft, kg = 0.15, 0.35
    sym = analyse(loaded_box(draft, kg, 0.0)).curve
    upto = sym.heel_deg < 89.0
    most = float(np.nanmax(sym.gz[upto] / np.cos(np.radians(sym.heel_deg[upto]))))
    lists = analyse(loaded_box(draft, kg, 0.98 * sym.max_gz))
    assert lists.status is not Status.CAPSIZES and lists.list_deg is not None
    rolls = analyse(loaded_box(draft, kg, 1.02 * most))
    assert rolls.status is Status.CAPSIZES and rolls.list_deg is None
    assert "rolls over" in rolls.message
    port = analyse(loaded_box(draft, kg, -1.02 * most))
    assert port.status is Status.CAPSIZES and port.curve.side == -1
    assert "to port" in port.message


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(
    draft=st.floats(0.05, 0.3),
    kg=st.floats(0.05, 0.7),
    tcg=st.floats(-0.4, 0.4),
)
def test_no_ok_status_when_gz_is_negative_towards_the_listing_side(draft, kg, tcg):
    a = analyse(loaded_box(draft, kg, tcg, heel_step_deg=3.0))
    c = a.curve
    if c is None:
        return
    towards = c.side * c.heel_deg > 0
    arm = c.side * c.gz[towards]
    if np.all(arm[np.isfinite(arm)] < 0):
        assert a.status is not Status.OK
        assert assess(loaded_box(draft, kg, tcg, 3.0), a, checks=False).state is not GmState.STABLE
    if a.status is Status.OK:  # then there is a steady heel, and GZ is zero there
        assert a.list_deg is not None and c.side * a.list_deg >= 0


def _punt_with_paddler_off_centre():
    punt = load_design(SAMPLES / "heron-punt.json")
    crew = list(punt.loads.crew)
    who = next(i for i, c in enumerate(crew) if c.mass == 58.0)
    crew[who] = replace(crew[who], y=0.3)
    return replace(punt, loads=replace(punt.loads, crew=tuple(crew)))


def test_the_punt_with_one_paddler_off_centre_is_not_ok():
    """The two-seat punt, its 58 kg paddler sitting 0.3 m to starboard: GZ is below zero
    at every heel to starboard, so it capsizes - in the status and in the assessment."""
    design = _punt_with_paddler_off_centre()
    result = assess(design)
    c = result.analysis.curve
    assert np.nanmax(c.gz[c.heel_deg > 0]) < 0
    assert result.status is Status.CAPSIZES and result.list_deg is None
    assert result.state is GmState.UNSTABLE
    assert result.shift is None and result.problems  # no checks on a boat that capsizes


@pytest.mark.source(f"{TUPPER}: box KB = T/2, BM = B^2/(12 T)")
@pytest.mark.parametrize("depth_share", [0.4, 0.6])
def test_beam_aid_answers_for_a_heavily_loaded_box(depth_share):
    """A box loaded deeper than 30 % of its depth sinks at 0.3x its beam: the aid first
    finds the narrowest beam that floats the load, then solves GM = target."""
    draft, kg, target = depth_share * D, 0.2, 0.15
    design = loaded_box(draft, kg, 0.0)
    result = beam_for_gm(design, target)
    assert result.factor is not None and result.narrowest > 0.3
    b = B * result.factor
    t = draft / result.factor  # same mass on a narrower box
    assert t / 2 + b**2 / (12 * t) - kg == pytest.approx(target, abs=2e-4)
    assert result.beam_after == pytest.approx(b)


def _crossing_sketch(count: int) -> HullSketch:
    """Two valid section shapes whose blend crosses itself for 0.675 < w < 0.825 only:
    not halfway between them, but at a station there when ``count`` puts one at w = 0.75."""
    a = ((0.0, 0.94), (0.42, 0.51), (0.43, 0.92), (1.0, 1.0))
    b = ((0.0, 0.79), (0.16, 0.42), (0.1, 0.31), (1.0, 1.0))
    return HullSketch(
        plan=Curve(((0.0, B / 2), (L, B / 2)), False),
        keel=Curve(((0.0, 0.0), (L, 0.0)), False),
        sheer=Curve(((0.0, D), (L, D)), False),
        sections=(SectionShape(0.5, a, False), SectionShape(2.5, b, False)),
        station_count=count,
    )


@pytest.mark.source(SHAPELY)
def test_a_crossed_station_anywhere_is_a_shape_error():
    with pytest.raises(ShapeError, match=r"station 4 at x = 2\.000 m: the section outline crosses"):
        generate_stations(_crossing_sketch(7))  # x = 2.0 is w = 0.75 between the shapes
    ok = generate_stations(_crossing_sketch(6))  # stations at 0, 0.6, ... 3.0 miss it
    for h in ok.half_sections:  # shapely agrees every station it kept is sound
        ring = np.vstack([h, h[::-1][:-1] * [-1.0, 1.0]])
        assert shapely.is_valid(shapely.Polygon(ring))
    h = np.array([[0.0, 0.94], [0.42, 0.51], [0.43, 0.92], [1.0, 1.0]]) * 0.25 + np.array(
        [[0.0, 0.79], [0.16, 0.42], [0.1, 0.31], [1.0, 1.0]]
    ) * 0.75
    ring = np.vstack([h, h[::-1][:-1] * [-1.0, 1.0]])
    assert not shapely.is_valid(shapely.Polygon(ring))
    assert first_crossed_outline(h[None]) == 0


@pytest.mark.source(SHAPELY)
@settings(max_examples=60, deadline=None)
@given(st.lists(st.tuples(st.floats(0.01, 1.0), st.floats(0.0, 1.3)), min_size=1, max_size=4),
       st.floats(0.0, 1.0))
def test_segment_crossing_test_agrees_with_shapely(inner, keel):
    h = np.array([(0.0, keel), *inner, (1.0, 1.0)])
    ring = np.vstack([h, h[::-1][:-1] * [-1.0, 1.0]])
    poly = shapely.Polygon(ring)
    crossed = first_crossed_outline(h[None]) is not None
    if crossed:  # a proper crossing of two edges: shapely calls the ring invalid too
        assert not shapely.is_valid(poly)
    elif not shapely.is_valid(poly):  # shapely also rejects touching, not only crossing
        reason = shapely.is_valid_reason(poly)
        assert "Self-intersection" in reason or "Ring Self-intersection" in reason or "Too few" in reason
