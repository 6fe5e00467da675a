"""How the error shrinks with the number of stations.

Along the hull, section quantities are taken as linear between stations and integrated
exactly: the trapezoid rule for volume, error O(h^2) in the station spacing h (any
numerical-analysis text, e.g. Burden & Faires "Numerical Analysis", composite trapezoid
error -(b-a) h^2 f''/12).  So doubling the stations should cut the error about four times.
Reference values: Wigley (1934) closed forms (C_B = 4/9, BM_L = 3L^2/(40T)).
"""

import numpy as np
import pytest

from hydro.analytic import wigley
from hydro.sections import build_section_table, cut, heel_frame
from tests.sources import BURDEN, WIGLEY

L, B, T = 4.0, 0.5, 0.2


def _errors(n: int) -> tuple[float, float]:
    table = build_section_table(wigley(L, B, T, depth=0.4, stations=n, points=257))
    frame = heel_frame(table, np.zeros(1))
    c = cut(table, frame, np.full((1, n), T))
    vol = c.area[0] @ table.weights
    aw = c.breadth[0] @ table.weights
    lcf = (c.breadth[0] @ table.weights_x) / aw
    i_l = c.breadth[0] @ table.weights_xx - aw * lcf**2
    return abs(vol / (4 / 9 * L * B * T) - 1), abs(i_l / vol / (3 * L**2 / (40 * T)) - 1)


@pytest.mark.source(f"{BURDEN}; {WIGLEY}: C_B = 4/9, BM_L = 3L^2/(40T)")
def test_error_is_second_order_in_station_spacing():
    e = {n: _errors(n) for n in (11, 21, 41, 81)}
    for coarse, fine in ((11, 21), (21, 41), (41, 81)):
        ratio_vol = e[coarse][0] / e[fine][0]
        ratio_bml = e[coarse][1] / e[fine][1]
        assert 3.3 < ratio_vol < 4.5, (coarse, ratio_vol)
        assert 3.0 < ratio_bml < 5.0, (coarse, ratio_bml)
    assert e[41][0] < 1e-3  # 41 stations: volume within 0.1 %
