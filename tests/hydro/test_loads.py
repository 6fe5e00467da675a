"""Weight build-up: crew heights, shell materials on the real surface, bilge water."""

import math
import re

import numpy as np

import pytest

from hydro import CrewMember, LoadError, Loads, MassItem, Material, weight_build_up
from hydro.analytic import box
from hydro.loads import shell_panels, water_density
from tests.sources import CFR_170_090, CGPM, IMO_A749, IMO_IS, ISO_14946, ITTC, BARRASS


@pytest.mark.source(IMO_A749 + ": seated passenger's centre of gravity 0.30 m above the seat")
def test_crew_cg_stands_on_the_inner_bottom():
    st = box(3.0, 1.0, 0.5)
    loads = Loads(crew=(CrewMember("a", 1.0, 80.0, 0.1, 0.05, 0.30),), bottom_thickness=0.01)
    w = weight_build_up(loads, st, 1000.0)
    # IMO A.749(18) 3.5.2.7: seated CG 0.30 m above the seat; the seat stands on the
    # inside of the bottom (common practice, no source)
    assert w.lines[0].z == pytest.approx(0.01 + 0.05 + 0.30)
    assert (w.mass, w.lcg, w.tcg) == pytest.approx((80.0, 1.0, 0.1))


def test_material_mass_and_centroid_from_the_surface():
    L, B, D = 3.0, 1.0, 0.5
    st = box(L, B, D, stations=7)
    panels = shell_panels(st)
    area = {k: panels.area[panels.surface == k].sum() for k in ("bottom", "sides", "ends")}
    assert area["bottom"] == pytest.approx(L * B)
    assert area["sides"] == pytest.approx(2 * L * D)
    assert area["ends"] == pytest.approx(2 * B * D)
    loads = Loads(materials=(Material("board", 0.9, 2, ("bottom", "sides")),), wet_factor=1.5)
    w = weight_build_up(loads, st, 1000.0)
    mass = 0.9 * 2 * 1.5 * (L * B + 2 * L * D)
    zc = (2 * L * D * D / 2) / (L * B + 2 * L * D)
    assert (w.mass, w.lcg, w.kg) == pytest.approx((mass, L / 2, zc))


def test_bilge_water_volume():
    st = box(3.0, 1.0, 0.5)
    w = weight_build_up(Loads(items=(MassItem("m", 50.0, 1.5, 0.0, 0.3),), bilge_water_depth=0.04), st, 1000.0)
    water = [line for line in w.lines if line.kind == "water"][0]
    assert water.mass == pytest.approx(1000.0 * 3.0 * 1.0 * 0.04)
    assert water.z == pytest.approx(0.02)


@pytest.mark.source(f"{ITTC}, fresh water at 20 degC: 998.2072 kg/m3")
def test_fresh_water_density():
    assert water_density("fresh") == pytest.approx(998.2072, abs=0.01)


@pytest.mark.source(f"{BARRASS}: sea water 1.025 t/m3; {ITTC}, seawater at 20 degC: 1024.81 kg/m3")
def test_sea_water_density():
    assert water_density("sea") == pytest.approx(1025.0, abs=1e-9)
    assert water_density("sea") == pytest.approx(1024.81, abs=0.25)


def test_typed_density():
    assert water_density("1010") == 1010.0
    with pytest.raises(LoadError, match="unknown water"):
        water_density("swamp")
    with pytest.raises(LoadError, match="out of range"):
        water_density(math.nan)


@pytest.mark.parametrize(
    "loads,message",
    [
        (Loads(), "nothing is aboard"),
        (Loads(crew=(CrewMember("a", 9.0),)), "seat position (m) = 9 is out of range"),
        (Loads(items=(MassItem("m", -1.0, 1.0),)), "mass (kg) = -1 is out of range"),
        (Loads(items=(MassItem("m", 1.0, 1.0, z=float("inf")),)), "is not a number"),
        (Loads(materials=(Material("m", 1.0, 1, ("deck",)),)), "unknown surface 'deck'"),
        (Loads(items=(MassItem("m", 1.0, 1.0),), wet_factor=0.0), "wet mass factor"),
    ],
)
def test_impossible_loads_are_refused(loads, message):
    import re

    with pytest.raises(LoadError, match=re.escape(message)):
        weight_build_up(loads, box(3.0, 1.0, 0.5), 1000.0)


def test_load_too_heavy_is_a_result_not_an_error():
    from hydro import analyse_stations

    st = box(3.0, 1.0, 0.5)

    def status(mass):
        return analyse_stations(st, Loads(items=(MassItem("m", mass, 1.3, 0.0, 0.2),)), 1000.0)

    a = status(1200.0)  # load well aft: the stern goes under before the box is full
    assert a.status == "floods"
    assert f"floods at {a.flood_limit_kg:.1f} kg" in a.message
    limit = round(a.flood_limit_kg)
    assert status(limit - 1).status == "ok"
    assert status(limit + 1).status == "floods"
    a = analyse_stations(st, Loads(items=(MassItem("m", 2000.0, 1.5, 0.0, 0.2),)), 1000.0)
    assert a.status == "sinks" and a.hydrostatics is None and "displaces only 1500.0 kg" in a.message
    a = analyse_stations(st, Loads(items=(MassItem("m", 1200.0, 0.2, 0.0, 0.2),)), 1000.0)
    assert a.status == "sinks" and "stand on end" in a.message
    a = analyse_stations(st, Loads(items=(MassItem("m", 300.0, 1.5, 0.0, 0.9),)), 1000.0)
    # G above the deck: GM < 0 and no heel where the righting arm comes back
    assert a.status == "capsizes" and a.hydrostatics.gm < 0 and a.list_deg is None
    assert np.nanmax(a.curve.gz[1:]) < 0 and "rolls over" in a.message


@pytest.mark.source(f"{ISO_14946}; {IMO_IS}: 75 kg per person")
def test_design_crew_mass():
    from hydro import CREW_MASS_KG

    assert CREW_MASS_KG == 75.0
    assert CrewMember("a", 1.0).mass == 75.0


@pytest.mark.source(CFR_170_090 + "; 1 lb = 0.45359237 kg exactly")
def test_heavier_crew_option():
    from hydro import HEAVY_CREW_MASS_KG

    assert HEAVY_CREW_MASS_KG == pytest.approx(185 * 0.45359237, abs=0.1)


@pytest.mark.source(CGPM)
def test_standard_gravity():
    from hydro import G_STANDARD

    assert G_STANDARD == 9.80665


@pytest.mark.source(
    "International yard and pound agreement (1959): 1 in = 25.4 mm, 1 lb = 0.45359237 kg"
)
def test_imperial_unit_factors():
    from hydro.units import KG_PER_LB, M_PER_IN

    assert M_PER_IN == 0.0254
    assert KG_PER_LB == 0.45359237


def test_a_surface_named_twice_counts_once():
    st = box(3.0, 1.0, 0.5, stations=7)
    once = weight_build_up(Loads(materials=(Material("board", 0.9, 1, ("sides",)),)), st, 1000.0)
    twice = weight_build_up(
        Loads(materials=(Material("board", 0.9, 1, ("sides", "sides")),)), st, 1000.0
    )
    assert twice.mass == pytest.approx(0.9 * 2 * 3.0 * 0.5)
    assert (twice.mass, twice.kg) == pytest.approx((once.mass, once.kg))
