"""The build pack's page plan: order, full-size tiles that cover every piece."""

import numpy as np
import pytest
import shapely

from app.pack_pages import OVERLAP_MM, plan_pages, tile_grid
from hydro import load_design
from hydro.build_pack import build_pack
from tests.paths import SAMPLES


@pytest.fixture(scope="module")
def punt_pack():
    return build_pack(load_design(SAMPLES / "heron-punt.json"))


def test_pages_in_the_order_the_issue_lists(punt_pack):
    kinds = [p.kind for p in plan_pages(punt_pack, "A4")]
    assert kinds[:2] == ["plate", "cutlist"]
    order = ["plate", "cutlist", "piece", "sheets", "materials", "tile"]
    assert [k for i, k in enumerate(kinds) if i == 0 or kinds[i - 1] != k] == order
    assert kinds.count("piece") == len(punt_pack.jobs)
    assert kinds.count("sheets") == -(-punt_pack.sheet_count // 2)


@pytest.mark.parametrize("paper, size", [("A4", (297.0, 210.0)), ("Letter", (279.4, 215.9))])
def test_full_size_tiles_cover_every_piece_with_overlap(punt_pack, paper, size):
    tiles = [p for p in plan_pages(punt_pack, paper) if p.kind == "tile"]
    for n, job in enumerate(punt_pack.jobs):
        grid = tile_grid(job.piece, size)
        mine = [t.tile for t in tiles if t.job == n]
        windows = [shapely.box(*np.array(grid.window(r, c))[[0, 3, 2, 1]]) for r, c in mine]
        piece = shapely.Polygon(job.piece.outline * 1000)
        assert piece.difference(shapely.union_all(windows)).area < 1e-6
        if grid.cols > 1:
            u0 = grid.window(0, 0)
            u1 = grid.window(0, 1)
            assert u0[2] - u1[0] == pytest.approx(OVERLAP_MM)
