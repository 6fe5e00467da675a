"""The builder's checks on a box barge, where each has an exact answer.

Sources: wall-sided formula (Tupper ch. 4 p. 49); heeling arm of a transverse shift
w d cos(phi)/Delta meeting GZ (Britannica "naval architecture - stability"; Barrass &
Derrett "List"); inclining experiment and its wall-sided correction (Barrass & Derrett
"The inclining experiment"; REFERENCES §2); trim from LCG - LCB (Barrass & Derrett
"Trim"); box KB = T/2, BM = B^2/(12T).
"""

import math
import re

import numpy as np
import pytest

from hydro import (
    AnalysisSettings,
    CrewMember,
    Curve,
    Design,
    HullSketch,
    LoadError,
    Loads,
    MassItem,
    Material,
    SectionShape,
)
from hydro.aids import apply_level_trim, beam_for_gm, level_trim
from hydro.heel_checks import boarding, crew_shift
from hydro.incline import InclineReading, inclining_test, waterline_from_freeboards
from hydro.whatif import sensitivity, swamping
from hydro.design import analyse

RHO = 1000.0


def box_design(L=3.0, B=1.2, D=0.5, items=(), crew=(), materials=(), **settings) -> Design:
    sketch = HullSketch(
        plan=Curve(((0.0, B / 2), (L, B / 2)), False),
        keel=Curve(((0.0, 0.0), (L, 0.0)), False),
        sheer=Curve(((0.0, D), (L, D)), False),
        sections=(SectionShape(L / 2, ((0.0, 0.0), (1.0, 0.0), (1.0, 1.0)), False),),
        station_count=5,
    )
    loads = Loads(crew=tuple(crew), items=tuple(items), materials=tuple(materials))
    return Design("box", sketch, loads, water=RHO, settings=AnalysisSettings(0.5, 60.0, **settings))


def wall_sided_heel(a: float, gm: float, bm: float) -> float:
    """Root of BM/2 t^3 + GM t - a = 0 (wall-sided GZ meets the arm a cos), degrees."""
    roots = np.roots([0.5 * bm, 0.0, gm, -a])
    t = min(r.real for r in roots if abs(r.imag) < 1e-12 and r.real > 0)
    return math.degrees(math.atan(t))


class TestCrewShift:
    def design(self, d_mass=80.0):
        return box_design(items=(MassItem("ballast", 400.0, 1.5, 0.0, 0.25),),
                          crew=(CrewMember("sitter", 1.5, d_mass, 0.0, 0.0, 0.3),))

    def test_static_heel_meets_the_wall_sided_curve(self):
        d = self.design()
        a = analyse(d)
        h = a.hydrostatics
        check = crew_shift(d, distance=0.3)
        arm = 80.0 * 0.3 / a.weights.mass
        assert check.arm0 == pytest.approx(arm)
        exact = wall_sided_heel(arm, h.gm, h.bm)
        assert exact < math.degrees(math.atan(2 * h.draft_mid / 1.2))  # still wall-sided
        assert check.static_heel_deg == pytest.approx(exact, abs=1e-3)
        assert check.small_angle_heel_deg == pytest.approx(math.degrees(math.atan(arm / h.gm)))
        assert check.small_angle_heel_deg > check.static_heel_deg  # BM tan^2 term rights
        assert check.verdict == "holds"
        np.testing.assert_allclose(check.heeling_arm, arm * np.cos(np.radians(check.heel_deg)))

    def test_a_load_that_capsizes(self):
        d = box_design(items=(MassItem("load", 200.0, 1.5, 0.0, 0.45),),
                       crew=(CrewMember("crowd", 1.5, 300.0, 0.0, 0.0, 0.3),))
        check = crew_shift(d, distance=0.6)
        assert check.verdict == "capsizes" and check.static_heel_deg is None
        assert "capsizes" in check.message

    def test_a_load_that_floods_first(self):
        # 0.1 m freeboard on a 1.2 m beam: the deck edge goes under at 9.5 deg
        d = box_design(D=0.3, items=(MassItem("load", 620.0, 1.5, 0.0, 0.15),),
                       crew=(CrewMember("sitter", 1.5, 150.0, 0.0, 0.0, 0.3),))
        a = analyse(d)
        check = crew_shift(d, distance=0.6)
        assert check.static_heel_deg is not None
        assert check.static_heel_deg > a.curve.gunwale_immersion_deg
        assert check.verdict == "floods" and "gunwale goes under" in check.message

    def test_to_the_gunwale_raises_the_weight(self):
        d = self.design()
        on_rail = crew_shift(d, to_gunwale=True)
        side = crew_shift(d)
        assert on_rail.arm0 > side.arm0 > 0
        # the rise adds w h sin(phi)/Delta to the arm
        assert on_rail.heeling_arm[20] > on_rail.arm0 * math.cos(math.radians(on_rail.heel_deg[20]))

    def test_boarding_adds_a_person_at_the_gunwale(self):
        d = self.design()
        check = boarding(d, mass=60.0)
        assert check.moved_mass == 60.0 and check.verdict in ("holds", "floods", "capsizes")
        assert check.arm0 == pytest.approx(60.0 * 0.6 / (analyse(d).weights.mass + 60.0))

    def test_bad_requests(self):
        with pytest.raises(LoadError, match="choose crew"):
            crew_shift(self.design(), members=[5])
        with pytest.raises(LoadError, match="at least one crew"):
            crew_shift(box_design(items=(MassItem("m", 100.0, 1.5, 0.0, 0.2),)))
        with pytest.raises(LoadError, match="between 0 and 300"):
            boarding(self.design(), mass=-3)


class TestInclining:
    design = box_design(items=(MassItem("boat", 360.0, 1.5, 0.0, 0.32),))

    def readings(self, gm, bm, delta, moves=((5, 0.4), (5, -0.4), (10, 0.4), (10, -0.4), (10, 0.5), (10, -0.5))):
        out = []
        for w, d in moves:
            heel = wall_sided_heel(abs(w * d) / delta, gm, bm) * np.sign(d)
            out.append(InclineReading(w, d, heel_deg=heel))
        return out

    def test_recovers_gm_exactly_with_the_wall_sided_correction(self):
        a = analyse(self.design)
        h = a.hydrostatics
        readings = self.readings(h.gm, h.bm, h.displacement)
        res = inclining_test(self.design, readings, displacement=h.displacement)
        assert res.gm == pytest.approx(h.gm, rel=1e-9)
        assert res.kg == pytest.approx(0.32, rel=1e-9)
        assert res.km == pytest.approx(h.km)
        assert res.warnings == ()
        plain = inclining_test(self.design, readings, displacement=h.displacement, wall_sided_correction=False)
        assert plain.gm > res.gm  # the plain formula overstates GM by BM tan^2/2

    def test_pendulum_readings_and_freeboards(self):
        a = analyse(self.design)
        h = a.hydrostatics
        heel_readings = self.readings(h.gm, h.bm, h.displacement)
        pend = [InclineReading(r.mass, r.distance, pendulum_length=1.5,
                               deflection=1.5 * math.tan(math.radians(r.heel_deg))) for r in heel_readings]
        fb = 0.5 - h.draft_mid
        res = inclining_test(self.design, pend, freeboards=(fb, fb))
        assert res.displacement == pytest.approx(h.displacement, rel=1e-9)
        assert res.gm == pytest.approx(h.gm, rel=1e-9)

    def test_freeboards_give_displacement(self):
        hs = waterline_from_freeboards(self.design, 0.4, 0.3)  # aft 0.4, fore 0.3 m
        assert hs.displacement == pytest.approx(RHO * 3.0 * 1.2 * 0.15, rel=1e-12)
        assert hs.trim == pytest.approx(0.1)

    @pytest.mark.parametrize(
        "readings,kwargs,message",
        [
            ([InclineReading(5, 0.4)], dict(displacement=400.0), "needs a heel angle"),
            ([InclineReading(5, 0.4, heel_deg=1.0)], {}, "either the weighed mass"),
            ([], dict(displacement=400.0), "at least one reading"),
            ([InclineReading(5, 0.4, heel_deg=-1.0)], dict(displacement=400.0), "against the weight"),
            ([InclineReading(5, 0.4, heel_deg=0.0)], dict(displacement=400.0), "no heel"),
            ([InclineReading(-5, 0.4, heel_deg=1.0)], dict(displacement=400.0), "positive mass"),
        ],
    )
    def test_bad_readings(self, readings, kwargs, message):
        with pytest.raises(LoadError, match=re.escape(message)):
            inclining_test(self.design, readings, **kwargs)

    def test_warnings(self):
        h = analyse(self.design).hydrostatics
        few = self.readings(h.gm, h.bm, h.displacement, moves=((5, 0.4), (5, 0.5)))
        res = inclining_test(self.design, few, displacement=h.displacement)
        assert any("use at least 4" in w for w in res.warnings)
        assert any("both sides" in w for w in res.warnings)
        big = self.readings(h.gm, h.bm, h.displacement, moves=((60, 0.5), (60, -0.5), (5, 0.4), (5, -0.4)))
        assert any("beyond 4 deg" in w for w in inclining_test(self.design, big, displacement=h.displacement).warnings)
        odd = list(self.readings(h.gm, h.bm, h.displacement))
        odd[0] = InclineReading(odd[0].mass, odd[0].distance, heel_deg=odd[0].heel_deg * 1.5)
        assert any("disagree" in w for w in inclining_test(self.design, odd, displacement=h.displacement).warnings)


def test_beam_for_target_gm_reaches_it():
    L, B, kg, mass = 3.0, 1.2, 0.35, 450.0
    d = box_design(L=L, B=B, items=(MassItem("load", mass, L / 2, 0.0, kg),))
    res = beam_for_gm(d, target=0.30, tolerance=1e-5)
    assert res.gm_after == pytest.approx(0.30, abs=1e-5)
    # closed form for the box: T = m/(rho L B k), GM(k) = T/2 + (B k)^2/(12 T) - KG
    t0 = mass / (RHO * L * B)
    gm = lambda k: t0 / (2 * k) + (B * k) ** 2 * k / (12 * t0) - kg  # noqa: E731
    lo, hi = 0.3, 3.0
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        lo, hi = (mid, hi) if gm(mid) < 0.30 else (lo, mid)
    assert res.factor == pytest.approx(lo, rel=1e-4)
    assert res.beam_after == pytest.approx(B * lo, rel=1e-4)


def test_level_trim_puts_lcg_over_lcb():
    L = 3.0
    d = box_design(L=L, items=(MassItem("cooler", 60.0, 2.6, 0.0, 0.2),),
                   crew=(CrewMember("skipper", 1.9, 80.0, 0.0, 0.05, 0.3),))
    res = level_trim(d, crew_index=0, tolerance_deg=1e-4)
    # box at zero trim: LCB = L/2, so 80 x + 60 * 2.6 = 140 * 1.5 (B&D "Trim")
    assert res.x_after == pytest.approx((140 * 1.5 - 60 * 2.6) / 80, abs=1e-4)
    assert abs(res.trim_after_deg) <= 1e-4
    assert res.freeboard_aft == pytest.approx(res.freeboard_fore, abs=1e-5)
    fixed = apply_level_trim(d, res)
    assert abs(analyse(fixed).hydrostatics.trim_deg) <= 1e-4


def test_sensitivity_rows():
    d = box_design(crew=(CrewMember("a", 1.5, 70.0),),
                   materials=(Material("double-wall corrugated board", 0.9, 2),))
    rows = sensitivity(d, wet_factor=1.5, heavy_crew=84.0, bilge_depth=0.02)
    base = rows[0]
    assert [r.case.split()[0] for r in rows] == ["as", "soaked", "crew", "20", "all"]
    assert rows[2].displacement == pytest.approx(base.displacement + 14.0)
    board = 0.9 * 2 * (3.0 * 1.2 + 2 * 3.0 * 0.5 + 2 * 1.2 * 0.5)
    assert rows[1].displacement == pytest.approx(base.displacement + 0.5 * board)
    assert rows[3].gm < base.gm  # free surface of bilge water


def test_swamping_and_reserve():
    board = Material("double-wall corrugated board", 0.9, 2)
    d = box_design(crew=(CrewMember("a", 1.5, 70.0),), materials=(board,))
    a = analyse(d)
    res = swamping(d)
    assert res.reserve_volume == pytest.approx(3.0 * 1.2 * (0.5 - a.hydrostatics.draft_mid))
    assert res.floats_swamped is False and "life jackets" in res.message
    foam = box_design(crew=(CrewMember("a", 1.5, 70.0),), materials=(Material("closed-cell foam blocks", 4.0, 1),))
    assert swamping(foam).floats_swamped is True
    closed = box_design(crew=(CrewMember("a", 1.5, 70.0),), materials=(board,), open_boat=False)
    assert swamping(closed).floats_swamped is None
