"""Invariants that must hold for any hull and load (hypothesis property tests)."""

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from hydro.hull import Curve, HullSketch, SectionShape, generate_stations
from hydro.sections import build_section_table, cut, heel_frame
from tests.hydro.helpers import run
from tests.sources import SCIPY, SHAPELY

SETTINGS = settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])


@st.composite
def sketches(draw):
    """Random but plausible small hulls: length 2-5 m, beam 0.5-1.6 m, chine or round."""
    length = draw(st.floats(2.0, 5.0))
    beam = draw(st.floats(0.5, 1.6))
    depth = draw(st.floats(0.25, 0.6))
    end = draw(st.floats(0.0, 0.8))  # 0 = pointed ends, else transom fraction
    rocker = draw(st.floats(0.0, 0.1))
    chine_u = draw(st.floats(0.3, 0.9))
    chine_v = draw(st.floats(0.0, 0.5))
    smooth = draw(st.booleans())
    b = beam / 2
    return HullSketch(
        plan=Curve(((0.0, end * b), (length / 2, b), (length, end * b * 0.7)), True),
        keel=Curve(((0.0, rocker), (length / 2, 0.0), (length, rocker * 1.3)), True),
        sheer=Curve(((0.0, depth + 0.05), (length / 2, depth), (length, depth + 0.08)), True),
        sections=(SectionShape(length / 2, ((0.0, 0.0), (chine_u, chine_v), (1.0, 1.0)), smooth),),
        station_count=21,
    )


@SETTINGS
@given(sketches(), st.floats(0.0, 60.0))
def test_volume_grows_with_draft(sketch, heel):
    table = build_section_table(generate_stations(sketch))
    frame = heel_frame(table, np.radians([heel]))
    levels = np.linspace(frame.eta_low[0], frame.eta_high[0], 25)
    vols = [cut(table, frame, np.full((1, table.x.size), h)).area[0] @ table.weights for h in levels]
    assert np.all(np.diff(vols) >= -1e-12)
    assert vols[0] == pytest.approx(0.0, abs=1e-12)
    assert vols[-1] == pytest.approx(table.totals[0] @ table.weights, rel=1e-9)


def _light_load(sketch):
    stations = generate_stations(sketch)
    table = build_section_table(stations)
    full = table.totals[0] @ table.weights
    return stations, 1000.0 * 0.3 * full, sketch.length * 0.5


@SETTINGS
@given(sketches())
def test_symmetric_load_gz_zero_upright_and_mirror_symmetric(sketch):
    stations, mass, x = _light_load(sketch)
    heel = np.array([-40.0, -15.0, 0.0, 15.0, 40.0])
    r = run(stations, mass, x, 0.2, heel)
    gz = r.curve.gz
    assert gz[2] == pytest.approx(0.0, abs=1e-9)
    np.testing.assert_allclose(gz[:2], -gz[[4, 3]], atol=1e-8)


@SETTINGS
@given(sketches(), st.floats(0.5, 3.0))
def test_scaling_laws(sketch, k):
    """All lengths x k: volume x k^3, KB and BM x k, GZ x k (mass x k^3, same shape)."""
    stations, mass, x = _light_load(sketch)
    scaled = type(stations)(stations.x * k, tuple(h * k for h in stations.half_sections))
    heel = np.array([0.0, 20.0])
    a = run(stations, mass, x, 0.2, heel)
    b = run(scaled, mass * k**3, x * k, 0.2 * k, heel)
    ha, hb = a.hydrostatics, b.hydrostatics
    assert hb.volume == pytest.approx(ha.volume * k**3, rel=1e-8)
    assert hb.kb == pytest.approx(ha.kb * k, rel=1e-8)
    assert hb.bm == pytest.approx(ha.bm * k, rel=1e-8)
    assert b.curve.gz[1] == pytest.approx(a.curve.gz[1] * k, rel=1e-6, abs=1e-9)


@pytest.mark.source(f"{SHAPELY}; {SCIPY}")
@settings(SETTINGS, max_examples=12)  # each example root-finds a shapely waterline
@given(sketches(), st.floats(5.0, 70.0))
def test_free_trim_balances_volume_and_pitch(sketch, heel):
    """At the engine's heel and trim, shapely's sections with a waterline root-found by
    brentq displace Delta/rho; there B lies on the normal to the water through G (no
    pitching moment) and gives the engine's GZ."""
    import math

    from tests.hydro.reference import hull_float, hull_level

    stations, mass, x = _light_load(sketch)
    kg = 0.2
    r = run(stations, mass, x * 0.9, kg, np.array([heel]))
    assert r.curve.converged.all()
    phi = math.radians(heel)
    tau = math.tan(math.radians(r.curve.trim_deg[0]))
    volume = mass / 1000.0
    level = hull_level(stations.x, stations.half_sections, phi, tau, volume)
    ref = hull_float(stations.x, stations.half_sections, phi, level, tau)
    xi_g, eta_g = kg * math.sin(phi), kg * math.cos(phi)
    length = float(stations.x[-1] - stations.x[0])
    pitch = (ref.x_b - x * 0.9) + tau * (ref.eta_b - eta_g)
    assert abs(pitch) < 1e-7 * length
    assert r.curve.gz[0] == pytest.approx(ref.xi_b - xi_g, abs=1e-7 * length)
