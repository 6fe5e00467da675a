"""Hydrostatics and GZ against published closed forms, with dimensions of our own.

Sources (each test names its own in its ``source`` marker):
- Tupper, *Introduction to Naval Architecture*, ch. 4: KB, BM = I/V, the wall-sided
  formula and when it holds (p. 49), GZ = GM sin(phi) at small angles and the range of
  stability (p. 60-61).
- Barrass & Derrett, *Ship Stability for Masters and Mates*, 6th ed. (2006): BM_L, TPC,
  MCT 1 cm, form coefficients (ch. 9 "Form coefficients"), the free-surface chapter,
  angle of loll, density change.
- Wigley (1934), Proc. R. Soc. Lond. A 144: the parabolic hull; its coefficients and KB,
  BM follow from its equation (used as an exact benchmark by Hally, DREA TC 89/308, 1989).
The box, V and tube results past the bilge's emergence are worked out here from those
formulas by plane geometry (right-triangle sections, a circle about its centre).
"""

import math

import numpy as np
import pytest

from hydro import AnalysisSettings, Loads, MassItem, analyse_stations
from hydro.analytic import box, cylinder, twin_tubes, v_prism, wigley
from tests.hydro.helpers import run
from tests.sources import BARRASS, CGPM, IMO_IS, TUPPER, WIGLEY

RHO = 1000.0


class TestBox:
    L, B, D, T, KG = 3.6, 1.1, 0.5, 0.15, 0.28

    @pytest.fixture(scope="class")
    @classmethod
    def result(cls):
        mass = RHO * cls.L * cls.B * cls.T
        return run(box(cls.L, cls.B, cls.D, stations=5), mass, cls.L / 2, cls.KG)

    @pytest.mark.source(f"{TUPPER}: KB of a rectangular section = T/2")
    def test_draft_and_kb(self, result):
        h = result.hydrostatics
        assert h.draft_mid == pytest.approx(self.T, rel=1e-10)
        assert h.kb == pytest.approx(self.T / 2, rel=1e-10)

    @pytest.mark.source(f"{TUPPER}: BM = I_T / V, box BM = B^2/(12T)")
    def test_bm(self, result):
        h = result.hydrostatics
        assert h.i_t == pytest.approx(self.L * self.B**3 / 12, rel=1e-10)
        assert h.bm == pytest.approx(self.B**2 / (12 * self.T), rel=1e-10)

    @pytest.mark.source(f"{BARRASS}, App. summary of stability formulae: BM_L = I_L / V")
    def test_bm_longitudinal(self, result):
        h = result.hydrostatics
        assert h.i_l == pytest.approx(self.B * self.L**3 / 12, rel=1e-10)
        assert h.bm_l == pytest.approx(self.L**2 / (12 * self.T), rel=1e-10)
        assert h.lcf == pytest.approx(self.L / 2, abs=1e-12)

    @pytest.mark.source(f"{BARRASS}, App. summary: KM = KB + BM, GM = KM - KG")
    def test_gm(self, result):
        h = result.hydrostatics
        gm = self.T / 2 + self.B**2 / (12 * self.T) - self.KG
        assert h.gm == pytest.approx(gm, rel=1e-10)

    @pytest.mark.source(f"{BARRASS}, ch. 9 'Form coefficients': C_B = C_WP = C_M = 1 for a box")
    def test_form_coefficients(self, result):
        h = result.hydrostatics
        for value in (h.cb, h.cwp, h.cm, h.cp):
            assert value == pytest.approx(1.0, rel=1e-12)

    @pytest.mark.source(f"{BARRASS}, 'TPC and displacement curves': mass per cm = rho A_w / 100")
    def test_immersion_per_cm(self, result):
        h = result.hydrostatics
        assert h.immersion_kg_per_cm == pytest.approx(RHO * self.L * self.B / 100, rel=1e-12)

    @pytest.mark.source(f"{BARRASS}, 'Trim': MCT 1 cm = Delta GM_L / (100 L)")
    def test_moment_to_change_trim_one_cm(self, result):
        """With the box's own closed forms: GM_L = T/2 + L^2/(12T) - KG."""
        delta = RHO * self.L * self.B * self.T
        gm_l = self.T / 2 + self.L**2 / (12 * self.T) - self.KG
        h = result.hydrostatics
        assert h.mct_1cm == pytest.approx(delta * gm_l / (100 * self.L), rel=1e-10)
        assert h.trim_deg == pytest.approx(0.0, abs=1e-9)

    @pytest.mark.source(f"{BARRASS}, App. summary: righting moment = W GZ; {CGPM}")
    def test_righting_moment_uses_standard_gravity(self, result):
        """Righting moment in N m = Delta g GZ with g = 9.80665 m/s^2; checked at 10 deg
        where the wall-sided formula (Tupper p. 49) gives GZ in closed form."""
        gm = self.T / 2 + self.B**2 / (12 * self.T) - self.KG
        bm = self.B**2 / (12 * self.T)
        t = math.radians(10.0)
        gz = math.sin(t) * (gm + 0.5 * bm * math.tan(t) ** 2)
        delta = RHO * self.L * self.B * self.T
        assert result.curve.righting_moment[10] == pytest.approx(delta * 9.80665 * gz, rel=1e-9)

    @pytest.mark.source(f"{TUPPER}, wall-sided formula p. 49")
    def test_wall_sided_formula_exact_until_the_bilge_emerges(self, result):
        # Tupper p. 49: GZ = sin(phi) (GM + BM tan^2(phi) / 2) while the sides are vertical
        # over the band the waterline sweeps.  Here the bilge emerges at tan = 2T/B.
        c = result.curve
        gm = self.T / 2 + self.B**2 / (12 * self.T) - self.KG
        bm = self.B**2 / (12 * self.T)
        limit = math.degrees(math.atan(2 * self.T / self.B))
        for phi in c.heel_deg[(c.heel_deg > 0) & (c.heel_deg < limit)]:
            t = math.radians(phi)
            expected = math.sin(t) * (gm + 0.5 * bm * math.tan(t) ** 2)
            assert c.gz[int(phi)] == pytest.approx(expected, rel=1e-9), phi

    @pytest.mark.source(f"{TUPPER}: B is the centroid of the immersed section (p. 60-61)")
    def test_after_the_bilge_emerges_the_section_is_a_right_triangle(self, result):
        # Plane geometry: legs q = sqrt(2BT/tan), p = sqrt(2BT tan);
        # GZ = (B/2 - q/3) cos + (p/3 - KG) sin, valid until tan = D^2 / (2BT).
        c = result.curve
        gunwale = math.degrees(math.atan(self.D**2 / (2 * self.B * self.T)))
        bilge = math.degrees(math.atan(2 * self.T / self.B))
        checked = 0
        for phi in c.heel_deg[(c.heel_deg > bilge + 0.5) & (c.heel_deg < gunwale)]:
            t = math.radians(phi)
            q = math.sqrt(2 * self.B * self.T / math.tan(t))
            p = math.sqrt(2 * self.B * self.T * math.tan(t))
            expected = (self.B / 2 - q / 3) * math.cos(t) + (p / 3 - self.KG) * math.sin(t)
            assert c.gz[int(phi)] == pytest.approx(expected, rel=1e-9), phi
            checked += 1
        assert checked > 5

    @pytest.mark.source(f"{TUPPER}, limits of the wall-sided formula p. 49")
    def test_gunwale_trap(self, result):
        # The gunwale meets the water at tan = D^2/(2BT) (the waterline no longer pivots on
        # the centreline), not at atan(2f/B) as a pivoting waterline would say.
        c = result.curve
        true_angle = math.degrees(math.atan(self.D**2 / (2 * self.B * self.T)))
        pivot_angle = math.degrees(math.atan(2 * (self.D - self.T) / self.B))
        assert c.gunwale_immersion_deg == pytest.approx(true_angle, abs=0.05)
        assert abs(c.gunwale_immersion_deg - pivot_angle) > 1.0

    @pytest.mark.source(f"{TUPPER}, wall-sided formula p. 49, integrated in closed form")
    def test_area_under_wall_sided_curve(self, result):
        """Integral of the wall-sided GZ: GM(1 - cos) + BM/2 (sec + cos - 2)."""
        from hydro.stability import curve_area

        gm = self.T / 2 + self.B**2 / (12 * self.T) - self.KG
        bm = self.B**2 / (12 * self.T)
        heel = np.linspace(0, 12, 241)  # bilge emerges at 15.3 deg
        mass = RHO * self.L * self.B * self.T
        r = run(box(self.L, self.B, self.D, stations=3), mass, self.L / 2, self.KG, heel)
        t = math.radians(12)
        closed = gm * (1 - math.cos(t)) + 0.5 * bm * (1 / math.cos(t) + math.cos(t) - 2)
        # trapezoid rule over 0.05 deg steps: leading error h^2/12 (GZ'(12) - GZ'(0)) ~ 2e-7
        assert curve_area(r.curve.heel_deg, r.curve.gz, 12.0) == pytest.approx(closed, rel=5e-7)


@pytest.mark.source(f"{TUPPER}, wall-sided formula and its limits p. 49")
def test_box_deck_edge_first():
    """A deep box: the deck edge immerses before the bilge emerges, at tan = 2f/B."""
    L, B, D, T, kg = 2.0, 0.9, 0.5, 0.38, 0.3
    r = run(box(L, B, D), RHO * L * B * T, L / 2, kg, np.arange(0, 20.0, 0.5))
    bm = B**2 / (12 * T)
    gm = T / 2 + bm - kg
    edge = math.degrees(math.atan(2 * (D - T) / B))
    # the low freeboard falls linearly between heel steps only approximately (it goes
    # as f - (B/2) tan): 0.5 deg steps place the crossing within 1e-3 deg
    assert r.curve.gunwale_immersion_deg == pytest.approx(edge, abs=1e-3)
    checked = 0
    for i, phi in enumerate(r.curve.heel_deg):
        if 0 < phi < edge:
            t = math.radians(phi)
            wall_sided = math.sin(t) * (gm + 0.5 * bm * math.tan(t) ** 2)
            assert r.curve.gz[i] == pytest.approx(wall_sided, rel=1e-9)
            checked += 1
    assert checked >= 20


@pytest.mark.source(f"{TUPPER}: KB and BM = I/V of a triangular section")
def test_v_prism_exact_gz():
    """90-degree V (half-angle 45): KB = 2T/3, BM = b^2/(6T), and at any heel before the
    deck edge goes under GZ = sin(phi)(KM / sqrt(1 - tan^2 phi) - KG) (the immersed
    section stays a right isosceles triangle; worked out from Tupper's KB and BM).
    """
    L, T, depth, kg = 2.5, 0.2, 0.6, 0.15
    b = 2 * T * math.tan(math.radians(45))
    mass = RHO * L * b * T / 2
    r = run(v_prism(L, 45.0, depth), mass, L / 2, kg, np.arange(0, 31.0))
    h = r.hydrostatics
    assert h.kb == pytest.approx(2 * T / 3, rel=1e-10)
    assert h.bm == pytest.approx(b**2 / (6 * T), rel=1e-10)
    km = (2 * T / 3) / math.cos(math.radians(45)) ** 2
    for phi in (3.0, 11.0, 24.0, 30.0):
        t = math.radians(phi)
        expected = math.sin(t) * (km / math.sqrt(1 - math.tan(t) ** 2) - kg)
        assert r.curve.gz[int(phi)] == pytest.approx(expected, rel=1e-9), phi


@pytest.mark.source(f"{TUPPER}: B moves on a circle about the centre, so M is at the centre")
def test_cylinder_metacentre_at_centre():
    """Floating circular cylinder: KM = r at every draft, GZ = (r - KG) sin(phi).

    Derived from Tupper ch. 4 (B moves on a circle about the centre).  The section is a
    polygon of 720 sides; angles chosen so they are not symmetric for it.
    """
    L, r_, kg = 2.0, 0.3, 0.12
    st = cylinder(L, r_, points=721)
    mass = RHO * L * math.pi * r_**2 * 0.37
    res = run(st, mass, L / 2, kg, np.array([0.0, 13.7, 41.3, 77.9, 133.1]))
    assert res.hydrostatics.km == pytest.approx(r_, rel=2e-5)
    for i, phi in enumerate(res.curve.heel_deg):
        expected = (r_ - kg) * math.sin(math.radians(phi))
        assert res.curve.gz[i] == pytest.approx(expected, abs=2e-6), phi


@pytest.mark.source(f"{TUPPER}: BM = I_T/V with I_T by the parallel-axis theorem")
def test_twin_tube_raft():
    """Two round tubes: upright I_T by the parallel-axis theorem (Tupper ch. 4); once one
    tube is clear of the water the other carries everything, and its B lies on the
    vertical through that tube's centre (circle about its centre), so
    GZ = (s/2) cos(phi) - (KG - r) sin(phi)."""
    L, r_, s, kg = 3.0, 0.15, 1.2, 0.45
    st = twin_tubes(L, r_, s, points=1441)
    T = 0.1  # draft of each tube upright
    seg = r_**2 * math.acos((r_ - T) / r_) - (r_ - T) * math.sqrt(2 * r_ * T - T**2)
    mass = RHO * L * 2 * seg
    res = run(st, mass, L / 2, kg, np.array([0.0, 25.0, 35.0, 45.0]))
    h = res.hydrostatics
    assert h.draft_mid == pytest.approx(T, rel=1e-4)
    a = math.sqrt(r_**2 - (r_ - T) ** 2)  # half-chord of one tube's waterplane
    i_t = L * 2 * ((2 * a) ** 3 / 12 + 2 * a * (s / 2) ** 2)
    assert h.i_t == pytest.approx(i_t, rel=1e-4)
    assert h.bm == pytest.approx(i_t / (L * 2 * seg), rel=1e-4)
    for i, phi in enumerate(res.curve.heel_deg[1:], start=1):
        t = math.radians(phi)
        expected = (s / 2) * math.cos(t) - (kg - r_) * math.sin(t)
        assert res.curve.gz[i] == pytest.approx(expected, abs=2e-5), phi


class TestWigley:
    """Wigley (1934): y = (B/2)(1 - (2x/L)^2)(1 - (z'/T)^2).  Coefficients and KB/BM at
    the design draft and at lower drafts d, integrated from the hull's equation:
    V(d) = 2BL d^2 (3T - d)/(9T^2), A_w(d) = 2BL d (2T - d)/(3T^2),
    KB(d) = d (8T - 3d)/(4 (3T - d)), BM(d) = 6 B^2 d (2T - d)^3 / (35 T^4 (3T - d)).
    The hull is read from 81 stations of 65 points: tolerances are its O(h^2) error."""

    L, B, T = 5.0, 0.6, 0.25

    def stations(self, n=81, points=65):
        return wigley(self.L, self.B, self.T, depth=0.5, stations=n, points=points)

    @pytest.fixture(scope="class")
    @classmethod
    def design_draft(cls):
        vol = 4 / 9 * cls.L * cls.B * cls.T
        return run(cls.stations(cls), RHO * vol, cls.L / 2, 0.1, np.array([0.0])).hydrostatics

    # Measured errors with 81 stations: 1.6e-4 on the coefficients, KB and draft, 2.6e-4
    # on BM_L; the tolerances below are twice that or less.
    @pytest.mark.source(f"{WIGLEY}; {BARRASS}, ch. 9 'Form coefficients'")
    @pytest.mark.parametrize(
        "name,expected", [("cb", 4 / 9), ("cwp", 2 / 3), ("cm", 2 / 3), ("cp", 2 / 3)]
    )
    def test_form_coefficient(self, design_draft, name, expected):
        assert getattr(design_draft, name) == pytest.approx(expected, rel=3e-4)

    @pytest.mark.source(f"{WIGLEY}: V = 4/9 L B T, so the design draft is T")
    def test_draft(self, design_draft):
        assert design_draft.draft_mid == pytest.approx(self.T, rel=3e-4)

    @pytest.mark.source(f"{WIGLEY}: KB = 5T/8; {TUPPER} (KB = centroid of the volume)")
    def test_kb(self, design_draft):
        assert design_draft.kb == pytest.approx(5 * self.T / 8, rel=3e-4)

    @pytest.mark.source(f"{WIGLEY}: BM = 3B^2/(35T); {TUPPER} (BM = I_T / V)")
    def test_bm(self, design_draft):
        assert design_draft.bm == pytest.approx(3 * self.B**2 / (35 * self.T), rel=1e-4)

    @pytest.mark.source(f"{WIGLEY}: BM_L = 3L^2/(40T); {BARRASS} (BM_L = I_L / V)")
    def test_bm_longitudinal(self, design_draft):
        assert design_draft.bm_l == pytest.approx(3 * self.L**2 / (40 * self.T), rel=4e-4)

    @pytest.mark.source(f"{WIGLEY}: fore-and-aft symmetric, LCB = LCF = midships")
    def test_centres_amidships(self, design_draft):
        assert design_draft.lcb == pytest.approx(self.L / 2, abs=1e-12)
        assert design_draft.lcf == pytest.approx(self.L / 2, abs=1e-12)

    @pytest.mark.source(f"{WIGLEY}, integrated to a lower draft; {BARRASS}, 'TPC'")
    @pytest.mark.parametrize("fraction", [0.4, 0.6, 0.8])
    def test_lower_draft(self, fraction):
        d, T, B, L = fraction * self.T, self.T, self.B, self.L
        vol = 2 * B * L * d**2 * (3 * T - d) / (9 * T**2)
        h = run(self.stations(), RHO * vol, L / 2, 0.1, np.array([0.0])).hydrostatics
        a_w = 2 * B * L * d * (2 * T - d) / (3 * T**2)
        assert h.draft_mid == pytest.approx(d, rel=3e-4)
        assert h.waterplane_area == pytest.approx(a_w, rel=4e-4)
        assert h.immersion_kg_per_cm == pytest.approx(RHO * a_w / 100, rel=4e-4)
        assert h.kb == pytest.approx(d * (8 * T - 3 * d) / (4 * (3 * T - d)), rel=3e-4)
        bm = 6 * B**2 * d * (2 * T - d) ** 3 / (35 * T**4 * (3 * T - d))
        assert h.bm == pytest.approx(bm, rel=4e-4)


class TestBilgeWaterAcrossTheFloor:
    """A box with loose water over its whole flat floor.  The water's free surface is as
    wide and long as the waterplane, so FSC = rho L B^3/(12 Delta) = B^2/(12T) = BM: the
    free surface cancels the whole metacentric radius (the warning in Barrass & Derrett's
    free-surface chapter, in its starkest form)."""

    L, B, D, depth, load, z_load = 4.0, 1.2, 0.6, 0.05, 900.0, 0.3

    @pytest.fixture(scope="class")
    @classmethod
    def closed(cls):
        water = RHO * cls.L * cls.B * cls.depth
        delta = cls.load + water
        T = delta / (RHO * cls.L * cls.B)
        kg = (cls.load * cls.z_load + water * cls.depth / 2) / delta
        return delta, T, kg

    def analysis(self, heel_step=0.5, heel_max=5.0):
        loads = Loads(items=(MassItem("load", self.load, self.L / 2, 0.0, self.z_load),),
                      bilge_water_depth=self.depth)
        settings = AnalysisSettings(heel_step, heel_max)
        return analyse_stations(box(self.L, self.B, self.D), loads, RHO, settings)

    @pytest.mark.source(f"{BARRASS}, free-surface chapter: FSC = rho_l i / Delta, i = l b^3/12")
    def test_free_surface_correction(self, closed):
        delta, T, kg = closed
        a = self.analysis()
        assert a.weights.mass == pytest.approx(delta, rel=1e-12)
        assert a.weights.fsc == pytest.approx(RHO * self.L * self.B**3 / (12 * delta), rel=1e-12)

    @pytest.mark.source(
        f"{BARRASS}, free-surface chapter; {IMO_IS}, Part A: GM corrected for free surface"
    )
    def test_fluid_gm(self, closed):
        """GM = KB + BM - KG - FSC = T/2 - KG here, every term from the box's closed forms."""
        delta, T, kg = closed
        assert self.analysis().hydrostatics.gm == pytest.approx(T / 2 - kg, rel=1e-9)

    @pytest.mark.source(f"{TUPPER}, wall-sided formula p. 49; {BARRASS}, free-surface chapter")
    def test_gz_while_the_floor_stays_covered(self, closed):
        """Wall-sided hull, rectangular tank: GZ = sin(GM_solid + BM tan^2/2) minus the
        tank's exact loss FSC sin(1 + tan^2/2); with FSC = BM this leaves (T/2 - KG) sin.
        The water's surface reaches the floor's edge at tan = 2 depth/B (4.76 deg)."""
        delta, T, kg = closed
        a = self.analysis()
        checked = 0
        for phi, gz in zip(a.curve.heel_deg, a.curve.gz):
            if phi < 4.7:
                assert gz == pytest.approx((T / 2 - kg) * math.sin(math.radians(phi)), abs=1e-12)
                checked += 1
        assert checked == 10


@pytest.mark.source(f"{BARRASS}, free-surface chapter: separate tanks, FSC/n^2 when divided")
def test_separate_pools_each_about_their_own_centre():
    """Twin rectangular pontoons (0.3 m wide, 0.65 m between centres) with loose water in
    each: each pool's free surface counts about its own centre line, i = l b^3/12 per pool,
    not about the centreline.  Upright GM from closed forms: KB = T/2, I_T by the
    parallel-axis theorem (Tupper ch. 4), FSC = rho L 2 b^3/(12 Delta); and at small heels
    the wall-sided formula (both pontoons wall-sided, the waterplane pivots on the
    centreline) less FSC sin(phi), the engine's small-angle reading of separate pools,
    which leaves out the tank's FSC sin tan^2/2 (bounded below)."""
    from hydro import Stations

    L, depth, b, centre = 3.0, 0.05, 0.3, 0.65
    half = np.array([[0.0, 0.4], [0.5, 0.4], [0.5, 0.0], [0.8, 0.0], [0.8, 0.45]])
    st = Stations(np.array([0.0, L]), (half, half))
    loads = Loads(items=(MassItem("deck load", 150.0, L / 2, 0.0, 0.5),), bilge_water_depth=depth)
    a = analyse_stations(st, loads, RHO, AnalysisSettings(1.0, 8.0))
    water = RHO * L * 2 * b * depth
    delta = 150.0 + water
    T = delta / (RHO * L * 2 * b)
    kg = (150.0 * 0.5 + water * depth / 2) / delta
    bm = L * 2 * (b**3 / 12 + b * centre**2) / (delta / RHO)
    fsc = RHO * L * 2 * b**3 / 12 / delta
    assert a.weights.loose_water_pools == 2
    assert a.weights.fsc == pytest.approx(fsc, rel=1e-12)
    gm_solid = T / 2 + bm - kg
    assert a.hydrostatics.gm == pytest.approx(gm_solid - fsc, rel=1e-9)
    for phi, gz in zip(a.curve.heel_deg[1:], a.curve.gz[1:]):  # bottom emerges at 9.5 deg
        t = math.radians(phi)
        solid = math.sin(t) * (gm_solid + 0.5 * bm * math.tan(t) ** 2)
        left_out = fsc * math.sin(t) * 0.5 * math.tan(t) ** 2
        assert abs(gz - (solid - fsc * math.sin(t))) <= left_out + 1e-12


@pytest.mark.source(f"{BARRASS}, App. summary: same mass, volume x rho1/rho2")
def test_density_change_sinks_deeper():
    """A box keeps its waterplane, so the draft grows by Delta (1/rho2 - 1/rho1) / A_w."""
    L, B = 3.0, 1.0
    st = box(L, B, 0.5)
    fresh = run(st, 300.0, 1.5, 0.2, np.array([0.0]), rho=998.2).hydrostatics
    sea = run(st, 300.0, 1.5, 0.2, np.array([0.0]), rho=1025.0).hydrostatics
    assert fresh.volume / sea.volume == pytest.approx(1025.0 / 998.2, rel=1e-12)
    rise = 300.0 * (1 / 998.2 - 1 / 1025.0) / (L * B)
    assert fresh.draft_mid - sea.draft_mid == pytest.approx(rise, rel=1e-9)


@pytest.mark.source(f"{BARRASS}, 'Angle of loll': tan = sqrt(-2 GM / BM) for a wall-sided hull")
def test_angle_of_loll():
    """A box loaded with G above M (GM = -22 mm) comes to rest where the wall-sided GZ
    returns to zero; the bilge and deck edge stay clear up to that angle."""
    L, B, D, T, kg = 3.0, 1.0, 0.8, 0.3, 0.45
    bm = B**2 / (12 * T)
    gm = T / 2 + bm - kg
    assert gm < 0
    loll = math.degrees(math.atan(math.sqrt(-2 * gm / bm)))
    r = run(box(L, B, D), RHO * L * B * T, L / 2, kg, np.arange(0.0, 40.0, 0.1))
    assert r.hydrostatics.gm == pytest.approx(gm, rel=1e-9)
    # the engine places the zero crossing by linear interpolation over 0.1 deg steps
    assert r.curve.loll_deg == pytest.approx(loll, abs=1e-3)


@pytest.mark.source(f"{TUPPER}, p. 61: the slope of the GZ curve at the origin is GM")
@pytest.mark.parametrize("name", [
    "drift-lab-raft",
    "heron-punt",
    "paper-loon-canoe",
    pytest.param("tern-pram", marks=pytest.mark.xfail(strict=True, reason=(
        "on the pram's 41 stations GM from I_T/V is 9e-5 (60 um) below the slope of GZ "
        "(shapely's heeled float agrees with the GZ); the gap depends on the station set "
        "(6e-6 with 81 or 161 stations, 5e-7 with 321): the flat, rockered bottom meets "
        "the water between stations, where the linear reading of a station's wet area "
        "and of its waterline's y^3 part ways"))),
])
def test_gz_slope_at_the_origin_is_gm(name):
    """On every sample (none wall-sided), held level fore and aft, GZ / phi at 0.05 deg
    equals the GM found from the waterplane's second moment: two independent routes
    through the engine (heeled equilibrium versus I_T / V) must meet at the published
    limit.  (With free trim they differ by a term of order trim^2: the heel axis then lies
    out of the waterplane.)"""
    from hydro import analyse, load_design
    from tests.paths import SAMPLES

    design = load_design(SAMPLES / f"{name}.json")
    a = analyse(design)
    w = a.weights
    r = run(design.stations(), w.mass, w.lcg, w.kg, np.array([0.0, 0.05]),
            rho=a.hydrostatics.water_density, free_trim=False)
    assert r.hydrostatics.trim_deg == 0.0
    slope = r.curve.gz[1] / math.radians(0.05)
    assert slope == pytest.approx(r.hydrostatics.gm, rel=2e-6)


@pytest.mark.source(f"{BARRASS}, 'Trim': trim = w d / MCT 1 cm; {TUPPER}, wall-sided formula p. 49")
def test_trim_from_a_weight_moved_forward():
    """A box with G 0.2 m forward of midships.  Its ends are vertical, so the wall-sided
    relation holds fore and aft: w d = Delta tan(t) (GM_L + BM_L tan^2(t) / 2), and the
    trim L tan(t) is close to Barrass & Derrett's w d / MCT 1 cm (cm)."""
    L, B, D, T, kg, shift = 3.0, 1.2, 0.5, 0.15, 0.25, 0.2
    delta = RHO * L * B * T
    bm_l = L**2 / (12 * T)
    gm_l = T / 2 + bm_l - kg
    roots = np.roots([0.5 * bm_l, 0.0, gm_l, -shift])
    tan = min(r.real for r in roots if abs(r.imag) < 1e-12 and r.real > 0)
    # Trimmed, a section's moment B d(x)^2 / 2 is quadratic in x, read as linear between
    # stations: the rise of B carries the trapezoid rule's O(h^2) error (0.3 % of the trim
    # with 3 stations, 1e-5 with 61)
    h = run(box(L, B, D, stations=61), delta, L / 2 + shift, kg, np.array([0.0])).hydrostatics
    assert h.trim == pytest.approx(L * tan, rel=2e-5)
    assert h.draft_fore == pytest.approx(T + L / 2 * tan, rel=2e-5)
    assert h.lcb - L / 2 == pytest.approx(bm_l * h.tau, rel=1e-9)  # B moves by BM_L tan
    assert h.min_freeboard == pytest.approx(D - h.draft_fore, rel=1e-12)  # lowest at the bow
    assert h.min_freeboard_x == L
    mct = delta * gm_l / (100 * L)
    assert h.trim * 100 == pytest.approx(delta * shift / mct, rel=1e-3)  # small-angle form


@pytest.mark.source(f"{BARRASS}, 'Trim'; {TUPPER}, wall-sided formula p. 49 (applied fore and aft)")
def test_flooding_mass_of_a_box_loaded_aft():
    """A box loaded 0.2 m aft of midships floods when its stern draft reaches the depth.
    For a box the longitudinal wall-sided relation gives the trim at any mass exactly,
    tan(t) (GM_L + BM_L tan^2(t)/2) = offset, so brentq on the stern draft
    T + (L/2) tan(t) = D gives the mass at which the transom goes under."""
    from scipy.optimize import brentq

    from hydro.sections import build_section_table
    from hydro.stability import flooding_mass
    from tests.hydro.helpers import lumped

    L, B, D, kg, offset = 3.0, 1.0, 0.5, 0.2, 0.2

    def stern_draft(mass: float) -> float:
        T = mass / (RHO * L * B)
        bm_l = L**2 / (12 * T)
        roots = np.roots([0.5 * bm_l, 0.0, T / 2 + bm_l - kg, -offset])
        tan = min(r.real for r in roots if abs(r.imag) < 1e-12 and r.real > 0)
        assert tan < 2 * T / L  # the bow's bottom edge stays wet: still wall-sided
        return T + L / 2 * tan

    expected = brentq(lambda m: stern_draft(m) - D, 600.0, 1500.0, xtol=1e-9)
    table = build_section_table(box(L, B, D, stations=61))
    found = flooding_mass(table, lumped(1000.0, L / 2 - offset, kg), RHO)
    # bisection to 0.1 kg; the trimmed waterline's O(h^2) error over 61 stations adds
    # about 0.01 kg
    assert found == pytest.approx(expected, abs=0.15)
