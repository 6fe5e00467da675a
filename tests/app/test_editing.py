"""Editing rules (pure functions, no Qt): limits, snapping, nudges, adding and removing."""

import numpy as np
import pytest

from hydro.hull import validate_sketch

from app import editing
from app.editing import EditRefused, PointRef
from tests.app.helpers import sample


@pytest.fixture
def punt():
    return sample("heron-punt").hull


def test_plan_point_moves_where_asked_when_allowed(punt):
    move = editing.move_point(punt, PointRef("plan", 2), 1.25, 0.55)
    assert move.note == ""
    assert move.sketch.plan.points[2] == (1.25, 0.55)
    assert move.sketch.keel == punt.keel


def test_plan_point_is_held_at_the_centreline_and_between_neighbours(punt):
    move = editing.move_point(punt, PointRef("plan", 2), 9.0, -0.3)
    x, b = move.sketch.plan.points[2]
    assert b == 0.0
    assert x == pytest.approx(punt.plan.points[3][0] - editing.MIN_GAP_M)
    assert "centreline" in move.note and "order" in move.note
    validate_sketch(move.sketch)


def test_keel_stays_below_the_sheer(punt):
    x = punt.keel.points[2][0]
    move = editing.move_point(punt, PointRef("keel", 2), x, 5.0)
    sheer_here = float(punt.sheer(np.array([x]))[0])
    assert move.sketch.keel.points[2][1] == pytest.approx(sheer_here - editing.MIN_DEPTH_M)
    assert "below the sheer" in move.note


def test_aft_end_stays_and_forward_end_changes_the_length_of_all_curves(punt):
    aft = editing.move_point(punt, PointRef("plan", 0), 0.3, 0.4)
    assert aft.sketch.plan.points[0] == (0.0, 0.4)
    assert "aft end" in aft.note
    last = len(punt.sheer.points) - 1
    longer = editing.move_point(punt, PointRef("sheer", last), 3.0, 0.5).sketch
    assert longer.x_range == (0.0, 3.0)
    assert longer.plan.points[-1][0] == longer.keel.points[-1][0] == 3.0
    validate_sketch(longer)


def test_section_points_stay_in_range_and_the_gunwale_point_is_fixed(punt):
    b, k, d = editing.section_frame(punt, 0)
    chine = editing.move_point(punt, PointRef("section", 1), -1.0, k - 1.0)
    u, v = chine.sketch.sections[0].points[1]
    assert u == pytest.approx(editing.MIN_U) and v == 0.0
    assert chine.note
    gunwale = editing.move_point(punt, PointRef("section", 2), 0.1, 0.1)
    assert gunwale.sketch is punt and "gunwale" in gunwale.note


def test_section_point_position_round_trips(punt):
    ref = PointRef("section", 1)
    y, z = editing.point_position(punt, ref)
    moved = editing.move_point(punt, ref, y - 0.02, z + 0.03).sketch
    assert editing.point_position(moved, ref) == pytest.approx((y - 0.02, z + 0.03))


def test_nudge_and_snap():
    assert editing.snap(0.1234, 0.005) == 0.125
    assert editing.snap(0.1234, 0.0) == 0.1234
    assert editing.nudge_step("metric", coarse=True) == pytest.approx(10 * editing.nudge_step("metric", False))
    assert editing.nudge_step("imperial", False) == pytest.approx(0.0254 / 16)


def test_nudge_moves_by_the_step(punt):
    ref = PointRef("plan", 1)
    x, b = punt.plan.points[1]
    moved = editing.nudge_point(punt, ref, 0.0, 0.001).sketch
    assert moved.plan.points[1] == pytest.approx((x, b + 0.001))


def test_insert_keeps_the_curve_and_refuses_outside_the_hull(punt):
    new, ref = editing.insert_point(punt, "plan", 0.9)
    assert ref == PointRef("plan", 2)
    assert len(new.plan.points) == len(punt.plan.points) + 1
    assert new.plan.points[2][1] == pytest.approx(float(punt.plan(np.array([0.9]))[0]))
    with pytest.raises(EditRefused):
        editing.insert_point(punt, "plan", 5.0)
    with pytest.raises(EditRefused):
        editing.insert_point(punt, "plan", punt.plan.points[1][0] + 0.001)


def test_section_insert_adds_to_every_shape_and_keeps_hard_chines():
    pram = sample("tern-pram").hull
    b, k, d = editing.section_frame(pram, 0)
    new, ref = editing.insert_section_point(pram, 0, 0.5 * b, k)
    assert ref.index == 1
    assert {len(s.points) for s in new.sections} == {len(pram.sections[0].points) + 1}
    validate_sketch(new)


def test_delete_refuses_ends_and_removes_inner_points(punt):
    with pytest.raises(EditRefused):
        editing.delete_point(punt, PointRef("plan", 0))
    with pytest.raises(EditRefused):
        editing.delete_point(punt, PointRef("section", 0))
    fewer = editing.delete_point(punt, PointRef("keel", 1))
    assert len(fewer.keel.points) == len(punt.keel.points) - 1


def test_nearest_curve(punt):
    assert editing.nearest_curve(punt, ("keel", "sheer"), 1.3, 0.05) == "keel"
    assert editing.nearest_curve(punt, ("keel", "sheer"), 1.3, 0.35) == "sheer"
