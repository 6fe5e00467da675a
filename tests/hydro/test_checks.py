"""The builder's checks on a box barge, where each has an exact answer.

The expected values come from the box's dimensions and the loads, never from the
engine: box KB = T/2, BM = B^2/(12T) (Tupper, ch. 4); wall-sided formula (Tupper ch. 4
p. 49); heeling arm of a transverse shift w d cos(phi)/Delta meeting GZ (Britannica
"naval architecture - stability"; Barrass & Derrett "List"); inclining experiment and
its wall-sided correction (Barrass & Derrett "The inclining experiment"; IMO 2008 IS Code
Part B ch. 8 and Annex 1); trim from LCG - LCB (Barrass & Derrett "Trim").  Past the
wall-sided range the reference is shapely's clipped section with a root-found waterline
(tests/hydro/reference.py).
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
from tests.hydro.reference import prism_deck_edge_angle, prism_gz, static_heel
from tests.sources import (
    BARRASS,
    BRITANNICA,
    CFR_170_090,
    IMO_IS,
    ISO_12217_3,
    MGN_280,
    SCIPY,
    SHAPELY,
    TUPPER,
)

RHO = 1000.0


def box_closed(L, B, masses_z):
    """Draft, KG, KB, BM and GM of a box from its loads [(mass, z), ...] (Tupper ch. 4)."""
    delta = sum(m for m, _ in masses_z)
    T = delta / (RHO * L * B)
    kg = sum(m * z for m, z in masses_z) / delta
    bm = B**2 / (12 * T)
    return delta, T, kg, bm, T / 2 + bm - kg


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

    @pytest.mark.source(f"{BRITANNICA}; {TUPPER}, wall-sided formula p. 49; {BARRASS}, 'List'")
    def test_static_heel_meets_the_wall_sided_curve(self):
        d = self.design()
        delta, T, kg, bm, gm = box_closed(3.0, 1.2, [(400.0, 0.25), (80.0, 0.3)])
        check = crew_shift(d, distance=0.3)
        arm = 80.0 * 0.3 / delta
        assert check.arm0 == pytest.approx(arm, rel=1e-12)
        exact = wall_sided_heel(arm, gm, bm)
        assert exact < math.degrees(math.atan(2 * T / 1.2))  # still wall-sided
        assert check.static_heel_deg == pytest.approx(exact, abs=1e-6)
        # B&D "List": tan(list) = w d / (Delta GM) for small angles
        small = math.degrees(math.atan(arm / gm))
        assert check.small_angle_heel_deg == pytest.approx(small, rel=1e-9)
        assert check.small_angle_heel_deg > check.static_heel_deg  # BM tan^2 term rights
        assert check.verdict == "holds"
        arms = arm * np.cos(np.radians(check.heel_deg))
        np.testing.assert_allclose(check.heeling_arm, arms, rtol=1e-12)
        # the low gunwale's height above the water at that heel: (f - (B/2) tan) cos
        # (wall-sided: the waterline pivots on the centreline at height T)
        t = math.radians(exact)
        fb = (0.5 - T - 0.6 * math.tan(t)) * math.cos(t)
        assert check.low_freeboard == pytest.approx(fb, abs=1e-6)

    @pytest.mark.source(f"{BRITANNICA}; {SHAPELY}; {SCIPY}")
    def test_a_load_that_capsizes(self):
        """The heeling arm w d cos(phi)/Delta stays above shapely's GZ of the closed box
        at every heel to 60 deg: no equilibrium, so the verdict must be 'capsizes'."""
        d = box_design(items=(MassItem("load", 200.0, 1.5, 0.0, 0.45),),
                       crew=(CrewMember("crowd", 1.5, 300.0, 0.0, 0.0, 0.3),))
        delta, T, kg, bm, gm = box_closed(3.0, 1.2, [(200.0, 0.45), (300.0, 0.3)])
        half = np.array([[0.0, 0.0], [0.6, 0.0], [0.6, 0.5]])
        arm0 = 300.0 * 0.6 / delta
        area = delta / (RHO * 3.0)
        gz = lambda deg: prism_gz(half, area, kg, math.radians(deg))  # noqa: E731
        assert static_heel(gz, arm0, 60.0) is None
        check = crew_shift(d, distance=0.6)
        assert check.arm0 == pytest.approx(arm0, rel=1e-12)
        assert check.verdict == "capsizes" and check.static_heel_deg is None
        assert "capsizes" in check.message

    @pytest.mark.source(f"{BRITANNICA}; {SHAPELY}; {SCIPY}")
    def test_a_load_that_floods_first(self):
        """0.1 m freeboard on a 1.2 m beam: shapely puts the static heel past the angle at
        which the deck edge meets the water, so the verdict must be 'floods'."""
        d = box_design(D=0.3, items=(MassItem("load", 620.0, 1.5, 0.0, 0.15),),
                       crew=(CrewMember("sitter", 1.5, 150.0, 0.0, 0.0, 0.3),))
        delta, T, kg, bm, gm = box_closed(3.0, 1.2, [(620.0, 0.15), (150.0, 0.3)])
        half = np.array([[0.0, 0.0], [0.6, 0.0], [0.6, 0.3]])
        area = delta / (RHO * 3.0)
        gz = lambda deg: prism_gz(half, area, kg, math.radians(deg))  # noqa: E731
        heel = static_heel(gz, 150.0 * 0.6 / delta, 60.0)
        edge = prism_deck_edge_angle(half, area)
        assert heel is not None and heel > edge
        check = crew_shift(d, distance=0.6)
        assert check.static_heel_deg == pytest.approx(heel, abs=1e-6)
        assert analyse(d).curve.gunwale_immersion_deg == pytest.approx(edge, abs=0.02)
        assert check.verdict == "floods" and "gunwale goes under" in check.message

    def test_to_the_gunwale_raises_the_weight(self):
        d = self.design()
        on_rail = crew_shift(d, to_gunwale=True)
        side = crew_shift(d)
        assert on_rail.arm0 > side.arm0 > 0
        # the rise adds w h sin(phi)/Delta to the arm
        assert on_rail.heeling_arm[20] > on_rail.arm0 * math.cos(math.radians(on_rail.heel_deg[20]))

    @pytest.mark.source(
        f"{ISO_12217_3}, gunwale-load test (idea); {BRITANNICA}; {SHAPELY}; {SCIPY}"
    )
    def test_boarding_adds_a_person_at_the_gunwale(self):
        """60 kg added at the gunwale (y = B/2, z = D): the arm is m (B/2) cos/(Delta + m)
        against the GZ of the boat with that mass on the centreline at deck height.
        shapely's section and brentq give the static heel and the verdict."""
        d = self.design()
        loads = [(400.0, 0.25), (80.0, 0.3), (60.0, 0.5)]
        delta, T, kg, bm, gm = box_closed(3.0, 1.2, loads)
        half = np.array([[0.0, 0.0], [0.6, 0.0], [0.6, 0.5]])
        area = delta / (RHO * 3.0)
        gz = lambda deg: prism_gz(half, area, kg, math.radians(deg))  # noqa: E731
        heel = static_heel(gz, 60.0 * 0.6 / delta, 60.0)
        check = boarding(d, mass=60.0)
        assert check.moved_mass == 60.0
        assert check.arm0 == pytest.approx(60.0 * 0.6 / delta, rel=1e-12)
        assert check.static_heel_deg == pytest.approx(heel, abs=1e-6)
        assert heel < prism_deck_edge_angle(half, area)
        assert check.verdict == "holds"

    def test_bad_requests(self):
        with pytest.raises(LoadError, match="choose crew"):
            crew_shift(self.design(), members=[5])
        with pytest.raises(LoadError, match="at least one crew"):
            crew_shift(box_design(items=(MassItem("m", 100.0, 1.5, 0.0, 0.2),)))
        with pytest.raises(LoadError, match="between 0 and 300"):
            boarding(self.design(), mass=-3)


class TestInclining:
    """A box of 360 kg with KG 0.32 m: Delta, GM and BM from its dimensions, readings made
    with the wall-sided relation w d = Delta tan (GM + BM tan^2 / 2) (Tupper p. 49)."""

    design = box_design(items=(MassItem("boat", 360.0, 1.5, 0.0, 0.32),))
    delta, T, kg, bm, gm = box_closed(3.0, 1.2, [(360.0, 0.32)])
    MOVES = ((5, 0.4), (5, -0.4), (10, 0.4), (10, -0.4), (10, 0.5), (10, -0.5))

    def readings(self, moves=MOVES):
        out = []
        for w, d in moves:
            heel = wall_sided_heel(abs(w * d) / self.delta, self.gm, self.bm) * np.sign(d)
            out.append(InclineReading(w, d, heel_deg=heel))
        return out

    @pytest.mark.source(
        f"{BARRASS}, 'The inclining experiment'; {TUPPER}, wall-sided formula p. 49"
    )
    def test_recovers_gm_exactly_with_the_wall_sided_correction(self):
        res = inclining_test(self.design, self.readings(), displacement=self.delta)
        assert res.gm == pytest.approx(self.gm, rel=1e-9)
        assert res.kg == pytest.approx(0.32, rel=1e-9)
        assert res.km == pytest.approx(self.T / 2 + self.bm, rel=1e-9)
        assert res.warnings == ()

    @pytest.mark.source(f"{BARRASS}, 'The inclining experiment': GM = w d / (Delta tan)")
    def test_plain_formula_is_the_least_squares_slope(self):
        """Without the correction: GM = sum(w d tan) / (Delta sum(tan^2)), the slope of
        w d against Delta tan through the origin; it overstates GM on a wall-sided hull."""
        readings = self.readings()
        moments = np.array([r.mass * r.distance for r in readings])
        tans = np.tan(np.radians([r.heel_deg for r in readings]))
        plain = inclining_test(self.design, readings, displacement=self.delta,
                               wall_sided_correction=False)
        assert plain.gm == pytest.approx(moments @ tans / (self.delta * tans @ tans), rel=1e-12)
        assert plain.gm > self.gm
        np.testing.assert_allclose(plain.per_reading_gm, moments / (self.delta * tans), rtol=1e-12)

    @pytest.mark.source(
        f"{BARRASS}, 'The inclining experiment'; pendulum tan = deflection / length"
    )
    def test_pendulum_readings_and_freeboards(self):
        pend = [InclineReading(r.mass, r.distance, pendulum_length=1.5,
                               deflection=1.5 * math.tan(math.radians(r.heel_deg)))
                for r in self.readings()]
        fb = 0.5 - self.T
        res = inclining_test(self.design, pend, freeboards=(fb, fb))
        assert res.displacement == pytest.approx(self.delta, rel=1e-9)
        assert res.gm == pytest.approx(self.gm, rel=1e-9)

    @pytest.mark.source(f"{BARRASS}, 'Flotation': Delta = rho V")
    def test_freeboards_give_displacement(self):
        """Freeboards 0.4 m aft and 0.3 m forward on a 0.5 m deep box: drafts 0.1 and
        0.2 m, mean 0.15 m, so Delta = rho L B 0.15 and the trim is 0.1 m by the head."""
        hs = waterline_from_freeboards(self.design, 0.4, 0.3)
        assert hs.displacement == pytest.approx(RHO * 3.0 * 1.2 * 0.15, rel=1e-12)
        assert hs.trim == pytest.approx(0.1, rel=1e-12)

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

    @pytest.mark.source(
        f"{IMO_IS}, Part B ch. 8 and Annex 1: several moves to both sides, small heels"
    )
    def test_warnings(self):
        few = self.readings(moves=((5, 0.4), (5, 0.5)))
        res = inclining_test(self.design, few, displacement=self.delta)
        assert any("use at least 4" in w for w in res.warnings)
        assert any("both sides" in w for w in res.warnings)
        big = self.readings(moves=((60, 0.5), (60, -0.5), (5, 0.4), (5, -0.4)))
        warned = inclining_test(self.design, big, displacement=self.delta).warnings
        assert any("beyond 4 deg" in w for w in warned)
        odd = list(self.readings())
        odd[0] = InclineReading(odd[0].mass, odd[0].distance, heel_deg=odd[0].heel_deg * 1.5)
        warned = inclining_test(self.design, odd, displacement=self.delta).warnings
        assert any("disagree" in w for w in warned)


@pytest.mark.source(f"{TUPPER}: box KB = T/2, BM = B^2/(12T)")
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


@pytest.mark.source(f"{BARRASS}, 'Trim': level when LCG = LCB")
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


@pytest.mark.source(CFR_170_090)
def test_sensitivity_rows():
    """The heavier-crew row puts everyone at 84 kg (185 lb), the default."""
    d = box_design(crew=(CrewMember("a", 1.5, 70.0),),
                   materials=(Material("double-wall corrugated board", 0.9, 2),))
    rows = sensitivity(d, wet_factor=1.5, bilge_depth=0.02)
    base = rows[0]
    assert [r.case.split()[0] for r in rows] == ["as", "soaked", "crew", "20", "all"]
    assert rows[2].displacement == pytest.approx(base.displacement + 14.0, rel=1e-12)
    board = 0.9 * 2 * (3.0 * 1.2 + 2 * 3.0 * 0.5 + 2 * 1.2 * 0.5)
    assert rows[1].displacement == pytest.approx(base.displacement + 0.5 * board, rel=1e-12)
    assert rows[3].gm < base.gm  # free surface of bilge water


@pytest.mark.source(f"{BARRASS}, reserve buoyancy: the hull's volume above the waterline")
def test_swamping_and_reserve():
    board = Material("double-wall corrugated board", 0.9, 2)
    d = box_design(crew=(CrewMember("a", 1.5, 70.0),), materials=(board,))
    mass = 70.0 + 0.9 * 2 * (3.0 * 1.2 + 2 * 3.0 * 0.5 + 2 * 1.2 * 0.5)
    draft = mass / (RHO * 3.0 * 1.2)
    res = swamping(d)
    assert res.reserve_volume == pytest.approx(3.0 * 1.2 * (0.5 - draft), rel=1e-9)
    assert res.reserve_fraction == pytest.approx((0.5 - draft) / 0.5, rel=1e-9)
    assert res.floats_swamped is False and "life jackets" in res.message
    foam_blocks = Material("closed-cell foam blocks", 4.0, 1)
    foam = box_design(crew=(CrewMember("a", 1.5, 70.0),), materials=(foam_blocks,))
    assert swamping(foam).floats_swamped is True
    closed = box_design(crew=(CrewMember("a", 1.5, 70.0),), materials=(board,), open_boat=False)
    assert swamping(closed).floats_swamped is None


@pytest.mark.source(f"{MGN_280}: 75 mm freeboard with the crew to one side")
def test_shifted_freeboard_below_75_mm_is_flagged():
    """A box with 0.12 m freeboard: a 0.5 m crew shift leaves the low gunwale 75 mm or
    less above the water (closed form (f - (B/2) tan) cos), and the message says so."""
    from hydro.heel_checks import MIN_SHIFTED_FREEBOARD_M

    assert MIN_SHIFTED_FREEBOARD_M == 0.075
    d = box_design(D=0.25, items=(MassItem("load", 380.0, 1.5, 0.0, 0.15),),
                   crew=(CrewMember("sitter", 1.5, 80.0, 0.0, 0.0, 0.3),))
    delta, T, kg, bm, gm = box_closed(3.0, 1.2, [(380.0, 0.15), (80.0, 0.3)])
    check = crew_shift(d, distance=0.5)
    heel = wall_sided_heel(80.0 * 0.5 / delta, gm, bm)
    t = math.radians(heel)
    fb = (0.25 - T - 0.6 * math.tan(t)) * math.cos(t)
    assert 0 < fb < 0.075
    assert check.low_freeboard == pytest.approx(fb, abs=1e-6)
    assert check.verdict == "holds" and "less than the 75 mm suggested" in check.message


@pytest.mark.source(
    f"{IMO_IS}, Part A general criteria: GM0 at least 0.15 m (section number from memory)"
)
def test_default_target_gm():
    from hydro.design import TARGET_GM_M

    assert TARGET_GM_M == 0.15
