"""Hydrostatics and GZ against published closed forms, with dimensions of our own.

Sources (named beside each check):
- Tupper, *Introduction to Naval Architecture*, ch. 4: KB, BM = I/V, wall-sided formula
  (p. 49), GZ = GM sin(phi) at small angles, range of stability (p. 60-61).
- Barrass & Derrett, *Ship Stability for Masters and Mates*, 6th ed.: BM_L, TPC, MCT 1 cm,
  form coefficients (ch. 9), free-surface correction (FSE chapter).
- Wigley (1934), Proc. R. Soc. A 144: the parabolic hull; coefficients and KB/BM follow
  from its equation (used as an exact benchmark by Hally 1989).
The box, V and tube results after the bilge emerges are derived from those formulas by
plane geometry (right-triangle sections, circle about its centre).
"""

import math

import numpy as np
import pytest

from hydro import Loads, MassItem, analyse_stations, AnalysisSettings
from hydro.analytic import box, cylinder, twin_tubes, v_prism, wigley
from tests.hydro.helpers import run

RHO = 1000.0


class TestBox:
    L, B, D, T, KG = 3.6, 1.1, 0.5, 0.15, 0.28

    @pytest.fixture(scope="class")
    @classmethod
    def result(cls):
        mass = RHO * cls.L * cls.B * cls.T
        return run(box(cls.L, cls.B, cls.D, stations=5), mass, cls.L / 2, cls.KG)

    def test_upright_hydrostatics(self, result):
        h = result.hydrostatics
        assert h.draft_mid == pytest.approx(self.T, rel=1e-10)
        assert h.kb == pytest.approx(self.T / 2, rel=1e-10)  # Tupper ch. 4: KB = T/2 for a box
        assert h.bm == pytest.approx(self.B**2 / (12 * self.T), rel=1e-10)  # Tupper: BM = I/V
        assert h.bm_l == pytest.approx(self.L**2 / (12 * self.T), rel=1e-10)  # B&D: BM_L = I_L/V
        assert h.gm == pytest.approx(self.T / 2 + self.B**2 / (12 * self.T) - self.KG, rel=1e-10)
        assert h.cb == pytest.approx(1.0) and h.cwp == pytest.approx(1.0)  # B&D ch. 9
        # B&D "TPC": immersion per cm = rho * A_w / 100
        assert h.immersion_kg_per_cm == pytest.approx(RHO * self.L * self.B / 100)
        # B&D "Trim": MCT 1 cm = Delta * GM_L / (100 L)
        assert h.mct_1cm == pytest.approx(h.displacement * h.gm_l / (100 * self.L))
        assert h.trim_deg == pytest.approx(0.0, abs=1e-9)

    def test_wall_sided_formula_exact_until_the_bilge_emerges(self, result):
        # Tupper p. 49: GZ = sin(phi) (GM + BM tan^2(phi) / 2) while the sides are vertical
        # over the band the waterline sweeps.  Here the bilge emerges at tan = 2T/B.
        c = result.curve
        h = result.hydrostatics
        limit = math.degrees(math.atan(2 * self.T / self.B))
        for phi in c.heel_deg[(c.heel_deg > 0) & (c.heel_deg < limit)]:
            t = math.radians(phi)
            expected = math.sin(t) * (h.gm + 0.5 * h.bm * math.tan(t) ** 2)
            assert c.gz[int(phi)] == pytest.approx(expected, rel=1e-9), phi

    def test_after_the_bilge_emerges_the_section_is_a_right_triangle(self, result):
        # Derived from F1/F9: legs q = sqrt(2BT/tan), p = sqrt(2BT tan);
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

    def test_gunwale_trap(self, result):
        # The gunwale meets the water at tan = D^2/(2BT) (the waterline no longer pivots on
        # the centreline), not at atan(2f/B) as a pivoting waterline would say.
        c = result.curve
        true_angle = math.degrees(math.atan(self.D**2 / (2 * self.B * self.T)))
        pivot_angle = math.degrees(math.atan(2 * (self.D - self.T) / self.B))
        assert c.gunwale_immersion_deg == pytest.approx(true_angle, abs=0.05)
        assert abs(c.gunwale_immersion_deg - pivot_angle) > 1.0

    def test_area_under_wall_sided_curve(self, result):
        # Derived (REFERENCES F25): integral of F7 = GM(1 - cos) + BM/2 (sec + cos - 2)
        h = result.hydrostatics
        heel = np.linspace(0, 12, 241)  # bilge emerges at 15.3 deg
        r = run(box(self.L, self.B, self.D, stations=3), h.displacement, self.L / 2, self.KG, heel)
        t = math.radians(12)
        closed = h.gm * (1 - math.cos(t)) + 0.5 * h.bm * (1 / math.cos(t) + math.cos(t) - 2)
        from hydro.stability import curve_area

        assert curve_area(r.curve.heel_deg, r.curve.gz, 12.0) == pytest.approx(closed, rel=1e-5)


def test_box_deck_edge_first():
    """A deep box: the deck edge immerses before the bilge emerges, at tan = 2f/B."""
    L, B, D, T, kg = 2.0, 0.9, 0.5, 0.38, 0.3
    r = run(box(L, B, D), RHO * L * B * T, L / 2, kg, np.arange(0, 20.0, 0.5))
    h = r.hydrostatics
    edge = math.degrees(math.atan(2 * (D - T) / B))  # Tupper p. 49 validity limit
    assert r.curve.gunwale_immersion_deg == pytest.approx(edge, abs=1e-3)
    for i, phi in enumerate(r.curve.heel_deg):
        if 0 < phi < edge:
            t = math.radians(phi)
            assert r.curve.gz[i] == pytest.approx(math.sin(t) * (h.gm + 0.5 * h.bm * math.tan(t) ** 2), rel=1e-9)


def test_v_prism_exact_gz():
    """90-degree V (half-angle 45): GZ = sin(phi)(KM / sqrt(1 - tan^2 phi) - KG).

    REFERENCES §2 closed form, derived from KB = 2T/3 and BM = b^2/(6T) (Tupper ch. 4).
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
        assert res.curve.gz[i] == pytest.approx((r_ - kg) * math.sin(math.radians(phi)), abs=2e-6), phi


def test_twin_tube_raft():
    """Two round tubes: upright I_T by the parallel-axis theorem (Tupper ch. 4); after one
    tube leaves the water, GZ = (s/2) cos(phi) - (KG - r) sin(phi) (REFERENCES §2)."""
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
    the design draft and at a lower draft d (REFERENCES §2, derived from the equation)."""

    L, B, T = 5.0, 0.6, 0.25

    def stations(self, n=81, points=65):
        return wigley(self.L, self.B, self.T, depth=0.5, stations=n, points=points)

    def test_design_draft(self):
        vol = 4 / 9 * self.L * self.B * self.T
        r = run(self.stations(), RHO * vol, self.L / 2, 0.1, np.array([0.0]))
        h = r.hydrostatics
        assert h.draft_mid == pytest.approx(self.T, rel=2e-4)
        assert h.cb == pytest.approx(4 / 9, rel=1e-3)  # B&D ch. 9 definitions
        assert h.cwp == pytest.approx(2 / 3, rel=1e-3)
        assert h.cm == pytest.approx(2 / 3, rel=1e-3)
        assert h.cp == pytest.approx(2 / 3, rel=1e-3)
        assert h.kb == pytest.approx(5 * self.T / 8, rel=1e-3)
        assert h.bm == pytest.approx(3 * self.B**2 / (35 * self.T), rel=1e-3)
        assert h.bm_l == pytest.approx(3 * self.L**2 / (40 * self.T), rel=1e-3)
        assert h.lcb == pytest.approx(self.L / 2, abs=1e-9)
        assert h.lcf == pytest.approx(self.L / 2, abs=1e-9)

    def test_lower_draft(self):
        d, T, B, L = 0.6 * self.T, self.T, self.B, self.L
        vol = 2 * B * L * d**2 * (3 * T - d) / (9 * T**2)
        r = run(self.stations(), RHO * vol, L / 2, 0.1, np.array([0.0]))
        h = r.hydrostatics
        assert h.draft_mid == pytest.approx(d, rel=3e-4)
        assert h.waterplane_area == pytest.approx(2 * B * L * d * (2 * T - d) / (3 * T**2), rel=1e-3)
        assert h.kb == pytest.approx(d * (8 * T - 3 * d) / (4 * (3 * T - d)), rel=1e-3)
        bm = 6 * B**2 * d * (2 * T - d) ** 3 / (35 * T**4 * (3 * T - d))
        assert h.bm == pytest.approx(bm, rel=2e-3)


def test_rectangular_tank_free_surface():
    """Bilge water over a flat floor: FSC = rho l b^3 / (12 Delta) (B&D FSE chapter), and
    while its surface meets neither floor edge nor top, the exact loss of GZ is
    FSC sin(phi) (1 + tan^2(phi)/2) (REFERENCES §2)."""
    L, B, D, depth = 4.0, 1.2, 0.6, 0.05
    st = box(L, B, D)
    dry = Loads(items=(MassItem("load", 900.0, L / 2, 0.0, 0.3),))
    wet = Loads(items=dry.items, bilge_water_depth=depth)
    heel = np.array([0.0, 1.0, 2.0, 3.5, 4.5])  # the floor edge emerges at 4.76 deg
    a_wet = analyse_stations(st, wet, RHO, AnalysisSettings(0.5, 5.0))
    w = a_wet.weights
    assert w.fsc == pytest.approx(RHO * L * B**3 / (12 * w.mass), rel=1e-12)
    assert a_wet.hydrostatics.gm == pytest.approx(a_wet.hydrostatics.gm_solid - w.fsc)
    # same total weight and G but the water frozen: the difference is the free surface
    from dataclasses import replace

    from hydro.sections import build_section_table
    from hydro.stability import analyse_table

    frozen = replace(w, lines=tuple(line for line in w.lines if line.kind != "water"))
    a_frozen = analyse_table(build_section_table(st), frozen, RHO, heel)
    a_wet = analyse_table(build_section_table(st), w, RHO, heel)
    for i, phi in enumerate(heel):
        t = math.radians(phi)
        loss = w.fsc * math.sin(t) * (1 + 0.5 * math.tan(t) ** 2)
        assert a_frozen.curve.gz[i] - a_wet.curve.gz[i] == pytest.approx(loss, rel=1e-7, abs=1e-12)


def test_density_change_sinks_deeper():
    """B&D F26: same mass, volume scales with rho1/rho2."""
    st = box(3.0, 1.0, 0.5)
    fresh = run(st, 300.0, 1.5, 0.2, np.array([0.0]), rho=998.2)
    sea = run(st, 300.0, 1.5, 0.2, np.array([0.0]), rho=1025.0)
    assert fresh.hydrostatics.volume / sea.hydrostatics.volume == pytest.approx(1025.0 / 998.2)


def test_separate_pools_each_about_their_own_centre():
    """Water in two pontoons cannot flow across: each pool's free surface counts about
    its own centre line, i = l b^3 / 12 per pool (B&D FSE chapter: separate tanks; a
    tank split lengthwise into n loses FSC/n^2).  Here: two pools 0.3 m wide."""
    from hydro import Stations

    L, depth = 3.0, 0.05
    half = np.array([[0.0, 0.4], [0.5, 0.4], [0.5, 0.0], [0.8, 0.0], [0.8, 0.45]])
    st = Stations(np.array([0.0, L]), (half, half))
    loads = Loads(items=(MassItem("deck load", 150.0, L / 2, 0.0, 0.5),), bilge_water_depth=depth)
    a = analyse_stations(st, loads, RHO, AnalysisSettings(1.0, 10.0))
    w = a.weights
    assert w.loose_water_pools == 2
    assert w.fsc == pytest.approx(RHO * L * 2 * 0.3**3 / 12 / w.mass, rel=1e-9)
    assert a.curve.gz[5] == pytest.approx(
        analyse_stations(st, Loads(items=loads.items + (MassItem("water", RHO * L * 0.6 * depth, L / 2, 0.0, depth / 2),)),
                         RHO, AnalysisSettings(1.0, 10.0)).curve.gz[5] - w.fsc * math.sin(math.radians(5)),
        abs=1e-9,
    )
