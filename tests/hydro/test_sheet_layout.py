"""Sheet layout: counts against hand-worked cases, grain lock, joints, no overlaps."""

import itertools
import math

import numpy as np

import pytest
import shapely

from hydro.panels import PanelError
from hydro.sheet_layout import (
    JointSpec,
    LayoutPiece,
    butt_block,
    joint_positions,
    lay_out,
    lower_bound,
    split_piece,
)

SHEET = (1.22, 2.44)
HAND_COUNT = "sheet counts worked by hand from the piece and sheet sizes; derived"


def no_overlaps(layout, kerf=0.003, margin=0.002):
    for sheet in layout.sheets:
        for p in sheet.placements:
            minx, miny, maxx, maxy = p.polygon.bounds
            assert minx >= margin - 1e-9 and miny >= margin - 1e-9
            assert maxx <= sheet.length - margin + 1e-9 and maxy <= sheet.width - margin + 1e-9
        for p, q in itertools.combinations(sheet.placements, 2):
            assert shapely.distance(p.polygon, q.polygon) >= kerf - 1e-9


@pytest.mark.source(HAND_COUNT)
def test_four_strips_fill_two_sheets():
    pieces = [LayoutPiece(f"strip {k}", "strip", shapely.box(0, 0, 2.4, 0.6)) for k in range(4)]
    layout = lay_out(pieces, SHEET)
    assert len(layout.sheets) == 2 and layout.lower_bound == 2
    assert layout.utilisation == pytest.approx(4 * 2.4 * 0.6 / (2 * 1.22 * 2.44))
    no_overlaps(layout)
    assert all(p.turned in (0, 180) for s in layout.sheets for p in s.placements)


@pytest.mark.parametrize("length, sheets, joints", [(4.80, 2, 1), (4.90, 3, 2)])
@pytest.mark.source(HAND_COUNT + "; scarf 8:1 uses 8 x thickness (common practice)")
def test_scarfed_side_pair(length, sheets, joints):
    joint = JointSpec("scarf", 8.0, 0.006)
    cuts = joint_positions(length, SHEET[1] - 0.01, joint)
    assert len(cuts) == joints
    parts = split_piece(shapely.box(0, 0, length, 0.5), cuts, joint)
    stock = sum(p.bounds[2] - p.bounds[0] for p in parts)
    assert stock == pytest.approx(length + joints * 8 * 0.006)
    pieces = [
        LayoutPiece(f"side {side} {k}", "side", p, side == "starboard")
        for side in ("port", "starboard")
        for k, p in enumerate(parts)
    ]
    layout = lay_out(pieces, SHEET)
    assert len(layout.sheets) == sheets
    no_overlaps(layout)


def test_grain_lock_forbids_a_quarter_turn():
    piece = [LayoutPiece("wide", "wide", shapely.box(0, 0, 1.0, 1.5))]
    with pytest.raises(PanelError, match="'wide'.*1504 x 1004 mm"):
        lay_out(piece, SHEET)
    free = lay_out(piece, SHEET, grain_locked=False)
    assert free.sheets[0].placements[0].turned in (90, 270)


def test_irregular_pieces_nest_without_overlap_and_never_beat_the_bound():
    tri = shapely.Polygon([(0, 0), (1.2, 0), (0, 0.5)])
    pieces = [LayoutPiece(f"t{k}", "t", tri, k % 2 == 1) for k in range(10)]
    layout = lay_out(pieces, SHEET)
    no_overlaps(layout)
    assert len(layout.sheets) >= layout.lower_bound == lower_bound(10 * tri.area, 1.22 * 2.44)
    assert sum(len(s.placements) for s in layout.sheets) == 10


def test_joints_keep_clear_of_frames():
    joint = JointSpec("scarf", 8.0, 0.006)
    (cut,) = joint_positions(3.0, 2.43, joint, avoid=(1.5,))
    assert abs(cut - 1.5) >= 0.15 - 1e-9
    assert max(cut, 3.0 - cut) + 0.024 <= 2.43


def test_butt_block_stops_short_of_the_edges():
    block = butt_block(shapely.box(0, 0, 3.0, 0.5), 1.5, JointSpec("butt", 8.0, 0.006))
    assert block.bounds == pytest.approx((0.0, 0.0, 0.4, 0.072))


@pytest.mark.parametrize("kwargs", [{"kerf": 0.0}, {"margin": -0.01}])
def test_non_positive_allowances_are_refused(kwargs):
    with pytest.raises(PanelError, match="positive"):
        lay_out([LayoutPiece("a", "a", shapely.box(0, 0, 1, 1))], SHEET, **kwargs)


def test_lower_bound_is_a_ceiling():
    assert lower_bound(2.0, 1.0) == 2 and lower_bound(2.0001, 1.0) == 3
    assert math.isclose(lower_bound(0.0, 1.0), 0)


def test_marks_follow_their_piece_onto_the_sheet():
    tri = shapely.Polygon([(0, 0), (1.0, 0), (0, 0.4)])
    pieces = [LayoutPiece(f"t{k}", "t", tri, k % 2 == 1) for k in range(6)]
    for sheet in lay_out(pieces, SHEET, grain_locked=False).sheets:
        for p in sheet.placements:
            corners = p.to_sheet(np.asarray(tri.exterior.coords))
            assert shapely.Polygon(corners).symmetric_difference(p.polygon).area < 1e-9
