"""The engine against the same quantities computed another way by outside libraries.

shapely clips each section by the water, scipy finds the waterline (brentq) and integrates
(quad, trapezoid), trimesh slices a closed mesh of the hull.  None of them shares code
with the engine's section kernel or its equilibrium solver (see ``tests/hydro/reference.py``).
"""

import math

import numpy as np
import pytest
import shapely
from scipy.integrate import quad
from scipy.optimize import brentq

from hydro import analyse_stations, generate_stations, load_design
from hydro.analytic import box, v_prism
from hydro.hull import Stations
from tests.hydro.helpers import run
from tests.hydro.reference import (
    hull_float,
    hull_level,
    prism_deck_edge_angle,
    prism_gz,
    section_polygon,
)
from tests.paths import SAMPLES
from tests.sources import BURDEN, SCIPY, SHAPELY, TRIMESH, TUPPER

RHO = 1000.0
SAMPLE_NAMES = sorted(p.stem for p in SAMPLES.glob("*.json"))

#: Prism sections (half sections from the centreline at the keel to the gunwale), chosen
#: to cross every regime: bilge out, deck edge under, flare, tumblehome, a round bilge.
PRISMS = {
    "box": np.array([[0.0, 0.0], [0.55, 0.0], [0.55, 0.5]]),
    "V 45 deg": np.array([[0.0, 0.0], [0.5, 0.5]]),
    "flared chine": np.array([[0.0, 0.0], [0.35, 0.04], [0.45, 0.18], [0.62, 0.45]]),
    "tumblehome": np.array([[0.0, 0.0], [0.5, 0.1], [0.55, 0.3], [0.45, 0.55]]),
    "round bilge": np.column_stack(
        [0.4 * np.sin(np.linspace(0, np.pi / 2, 25)),
         0.4 - 0.4 * np.cos(np.linspace(0, np.pi / 2, 25))]
    ),
}


def _prism(half: np.ndarray, length: float = 3.0) -> Stations:
    return Stations(np.array([0.0, length / 2, length]), (half, half, half))


@pytest.mark.source(f"{SHAPELY}; {SCIPY}")
@pytest.mark.parametrize("name", list(PRISMS))
def test_prism_gz_over_the_whole_range_matches_shapely(name):
    """A prism floats level fore and aft, so shapely's clipped section with a
    root-found waterline gives GZ at any heel, past bilge emergence and deck immersion."""
    half = PRISMS[name]
    if name == "round bilge":  # close the round bilge with a vertical side to a deck
        half = np.vstack([half, [[0.4, 0.55]]])
    L, kg = 3.0, 0.18
    area = 0.35 * section_polygon(half).area
    heel = np.arange(0.0, 91.0, 7.5)
    r = run(_prism(half, L), RHO * L * area, L / 2, kg, heel)
    expected = [prism_gz(half, area, kg, math.radians(a)) for a in heel]
    np.testing.assert_allclose(r.curve.gz, expected, rtol=0, atol=1e-9)


@pytest.mark.source(f"{SHAPELY}; {SCIPY}")
@pytest.mark.parametrize("name", ["box", "flared chine", "tumblehome"])
def test_gunwale_immersion_angle_matches_shapely(name):
    """The heel at which the low gunwale meets the water, found by brentq on shapely's
    waterline; the engine interpolates it between heel steps of 0.25 deg."""
    half = PRISMS[name]
    L, kg = 3.0, 0.15
    area = 0.12
    r = run(_prism(half, L), RHO * L * area, L / 2, kg, np.arange(0.0, 60.0, 0.25))
    expected = prism_deck_edge_angle(half, area)
    assert r.curve.gunwale_immersion_deg == pytest.approx(expected, abs=2e-3)


@pytest.mark.source(f"{SHAPELY}; {SCIPY}")
@pytest.mark.parametrize("name", SAMPLE_NAMES)
def test_sample_upright_float_matches_shapely(name):
    """At the engine's upright waterline (free trim) of each sample, shapely's immersed
    sections displace Delta/rho, and their centroid lies under G (LCB = LCG corrected for
    trim, B and G on one normal to the water)."""
    from hydro import analyse

    design = load_design(SAMPLES / f"{name}.json")
    a = analyse(design)
    h, w = a.hydrostatics, a.weights
    st = design.stations()
    ref = hull_float(st.x, st.half_sections, 0.0, h.h, h.tau)
    assert ref.volume == pytest.approx(w.mass / h.water_density, rel=1e-9)
    assert ref.x_b == pytest.approx(h.lcb, abs=1e-9)
    assert h.kb == pytest.approx(ref.eta_b - st.keel_z, abs=1e-9)
    pitch = (ref.x_b - w.lcg) + h.tau * (ref.eta_b - w.vcg)
    assert abs(pitch) < 1e-6


@pytest.mark.source(f"{SHAPELY}; {SCIPY}")
@pytest.mark.parametrize("name", SAMPLE_NAMES)
def test_sample_heeled_gz_matches_shapely(name):
    """At 20 deg heel and the engine's free trim, shapely and brentq find the waterline
    that displaces Delta/rho; the centre of buoyancy there gives the engine's GZ, and B
    lies on the normal to the water through G (no pitching moment)."""
    from hydro import analyse

    design = load_design(SAMPLES / f"{name}.json")
    a = analyse(design)
    w = a.weights
    i = int(np.flatnonzero(a.curve.heel_deg == 20.0)[0])
    tau = math.tan(math.radians(a.curve.trim_deg[i]))
    phi = math.radians(20.0)
    st = design.stations()
    volume = w.mass / a.hydrostatics.water_density
    level = hull_level(st.x, st.half_sections, phi, tau, volume)
    ref = hull_float(st.x, st.half_sections, phi, level, tau)
    xi_g = w.tcg * math.cos(phi) + w.vcg * math.sin(phi)
    eta_g = w.vcg * math.cos(phi) - w.tcg * math.sin(phi)
    loose = a.weights.fsc * math.sin(phi)  # samples carry no loose water
    assert loose == 0.0
    assert a.curve.gz[i] == pytest.approx(ref.xi_b - xi_g, abs=1e-7)
    assert abs((ref.x_b - w.lcg) + tau * (ref.eta_b - eta_g)) < 1e-6


def _shell(stations):
    """The hull's shell as a triangle mesh: ruled strips between stations (no end caps)."""
    import trimesh

    rings = [np.vstack([h, (h[::-1] * [-1, 1])[:-1]]) for h in stations.half_sections]
    n = len(rings[0])
    verts = np.vstack([np.column_stack([np.full(n, x), r]) for x, r in zip(stations.x, rings)])
    faces = []
    for i in range(len(rings) - 1):
        for j in range(n):
            a, b = i * n + j, i * n + (j + 1) % n
            faces += [[a, a + n, b], [b, a + n, b + n]]
    return trimesh.Trimesh(verts, np.array(faces), process=False)


def _waterplane_outlines(stations, h, tau):
    """trimesh cuts the shell by the plane z = h + tau x; the cut seen from above, closed
    straight across each transom, polygonized by shapely."""
    import trimesh

    normal = np.array([-tau, 0.0, 1.0])
    segments = trimesh.intersections.mesh_plane(
        _shell(stations), normal, normal * h / normal.dot(normal)
    )
    lines = [np.round(s[:, :2], 10) for s in segments]
    for end in (stations.x[0], stations.x[-1]):
        points = sorted({tuple(p) for s in lines for p in s if abs(p[0] - end) < 1e-9},
                        key=lambda p: p[1])
        lines += [np.array([a, b]) for a, b in zip(points[::2], points[1::2]) if a != b]
    merged = shapely.line_merge(shapely.MultiLineString(lines))
    return list(shapely.polygonize(shapely.get_parts(merged)).geoms)


def _polygon_moments(xy: np.ndarray) -> tuple[float, float, float, float, float]:
    """Area, centroid and second moments (about the centroid, axes parallel to x and y)
    of a simple polygon, by Green's theorem (Steger 1996, 'On the calculation of
    arbitrary moments of polygons')."""
    x, y = xy[:, 0], xy[:, 1]
    x1, y1 = np.roll(x, -1), np.roll(y, -1)
    cross = x * y1 - x1 * y
    a = cross.sum() / 2
    cx = ((x + x1) * cross).sum() / (6 * a)
    cy = ((y + y1) * cross).sum() / (6 * a)
    ixx = ((y * y + y * y1 + y1 * y1) * cross).sum() / 12 - a * cy**2  # about the x axis
    iyy = ((x * x + x * x1 + x1 * x1) * cross).sum() / 12 - a * cx**2
    return abs(a), cx, cy, abs(ixx), abs(iyy)


@pytest.mark.source(TRIMESH)
@pytest.mark.parametrize("name", SAMPLE_NAMES)
def test_sample_waterplane_matches_trimesh_section(name):
    """trimesh cuts the hull mesh by the engine's upright water plane; the cut's outline,
    seen from above, is the waterplane: its area, centre of flotation and second moments
    I_T (about the centreline) and I_L (about F) match the engine's.  The mesh is ruled
    between stations, the engine linear in breadth: they differ where the waterline
    crosses an edge between stations."""
    design = load_design(SAMPLES / f"{name}.json")
    stations = generate_stations(design.hull, 161)
    h = analyse_stations(stations, design.loads, design.water_density, design.settings).hydrostatics
    outlines = _waterplane_outlines(stations, h.h, h.tau)
    moments = [_polygon_moments(np.asarray(p.exterior.coords)[:-1]) for p in outlines]
    area = sum(m[0] for m in moments)
    lcf = sum(m[0] * m[1] for m in moments) / area
    tcf = sum(m[0] * m[2] for m in moments) / area
    i_t = sum(m[3] + m[0] * (m[2] - tcf) ** 2 for m in moments)
    i_l = sum(m[4] + m[0] * (m[1] - lcf) ** 2 for m in moments)
    # Largest differences seen (161 stations): area 0.06 %, LCF 1.2 mm, I_T 0.04 %,
    # I_L 0.19 %, all on the punt, whose raked ends cross the water between stations
    # (both readings are O(h^2) in the spacing; the raft's straight tubes agree to 1e-6).
    assert area == pytest.approx(h.waterplane_area, rel=1e-3)
    assert lcf == pytest.approx(h.lcf, abs=2e-3)
    assert i_t == pytest.approx(h.i_t, rel=1e-3)
    assert i_l == pytest.approx(h.i_l, rel=3e-3)


def _trapezoid_error(f, a: float, b: float, step: float) -> float:
    """Leading error of the composite trapezoid rule, step^2/12 (f'(b) - f'(a))
    (Euler-Maclaurin; Burden & Faires, Numerical Analysis, composite trapezoidal rule)."""
    d = 1e-6
    slope = lambda x: (f(x + d) - f(x - d)) / (2 * d)  # noqa: E731
    return step**2 / 12 * (slope(b) - slope(a))


@pytest.mark.source(f"{TUPPER}, wall-sided formula p. 49; {SCIPY}; {BURDEN}")
def test_area_under_gz_to_30_deg_matches_quad_of_the_wall_sided_curve():
    """A box that stays wall-sided to 30 deg (2T/B and 2f/B both above tan 30): the
    engine's area to 30 deg (trapezoid rule over 0.5 deg steps) against scipy's adaptive
    quadrature of Tupper's wall-sided GZ with the box's closed-form GM and BM, plus the
    trapezoid rule's known leading error."""
    L, B, D, T, kg = 3.0, 1.0, 0.6, 0.3, 0.35
    kb, bm = T / 2, B**2 / (12 * T)
    gm = kb + bm - kg
    r = run(box(L, B, D), RHO * L * B * T, L / 2, kg, np.arange(0.0, 40.5, 0.5))

    def gz(phi):
        return math.sin(phi) * (gm + 0.5 * bm * math.tan(phi) ** 2)

    end = math.radians(30.0)
    area, _ = quad(gz, 0.0, end, epsabs=1e-15)
    expected = area + _trapezoid_error(gz, 0.0, end, math.radians(0.5))
    assert r.curve.area_30 == pytest.approx(expected, rel=1e-7)


@pytest.mark.source(f"{TUPPER}, KB and BM of a V section; {SCIPY}; {BURDEN}")
def test_area_under_gz_of_a_v_prism_matches_quad():
    """90-deg V prism: GZ = sin(phi)(KM / sqrt(1 - tan^2 phi) - KG) until the deck edge
    goes under, with KB = 2T/3 and BM = b^2/(6T) (Tupper's KB and BM of a triangle);
    area to 30 deg by scipy.quad plus the trapezoid rule's leading error."""
    L, T, kg = 2.5, 0.2, 0.15
    b = 2 * T
    km = 2 * T / 3 + b**2 / (6 * T)
    r = run(v_prism(L, 45.0, 0.6), RHO * L * b * T / 2, L / 2, kg, np.arange(0.0, 30.5, 0.5))

    def gz(phi):
        return math.sin(phi) * (km / math.sqrt(1 - math.tan(phi) ** 2) - kg)

    end = math.radians(30.0)
    area, _ = quad(gz, 0.0, end, epsabs=1e-15)
    expected = area + _trapezoid_error(gz, 0.0, end, math.radians(0.5))
    assert r.curve.area_30 == pytest.approx(expected, rel=1e-6)


@pytest.mark.source(f"{TUPPER}, range of stability p. 60; {SHAPELY}; {SCIPY}")
def test_max_gz_and_vanishing_angle_match_shapely():
    """A decked box with a high G: scipy's bounded minimiser on shapely's GZ gives the
    largest GZ and its angle, brentq its return to zero (the angle of vanishing
    stability).  The engine reads them off its curve at 0.25 deg steps: the maximum to
    the grid's O(h^2), the zero by linear interpolation."""
    from scipy.optimize import minimize_scalar

    half = PRISMS["box"]
    L, kg = 3.0, 0.42
    area = 0.2 * section_polygon(half).area
    r = run(_prism(half, L), RHO * L * area, L / 2, kg, np.arange(0.0, 120.25, 0.25))
    gz = lambda deg: prism_gz(half, area, kg, math.radians(deg))  # noqa: E731
    best = minimize_scalar(lambda d: -gz(d), bounds=(5.0, 60.0), method="bounded",
                           options={"xatol": 1e-6})
    avs = brentq(gz, best.x, 119.0, xtol=1e-10)
    assert r.curve.max_gz == pytest.approx(-best.fun, abs=2e-6)
    assert r.curve.max_gz_deg == pytest.approx(best.x, abs=0.125)
    assert r.curve.avs_deg == pytest.approx(avs, abs=2e-3)
