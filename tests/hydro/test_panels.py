"""Flat panels against closed forms of developable and ruled surfaces.

Numbers marked "derived" follow from the formulas of the cited texts: a developable
surface unrolls isometrically (lengths and areas kept), a cylinder's generators and a
cone's generators are its rulings, and the twist of a ruling is the angle between the
tangent planes at its two ends.
"""

import math

import numpy as np
import pytest
import shapely

from hydro import Curve, HullSketch, SectionShape, load_design
from hydro.hull import generate_stations
from hydro.loads import shell_panels
from hydro.panels import (
    develop_strip,
    end_pieces,
    hull_panels,
    offset_rows,
    ruling_twist,
    true_end_shape,
    twist_strain,
)
from tests.paths import SAMPLES

DO_CARMO = (
    "do Carmo, Differential Geometry of Curves and Surfaces, sec. 3-5 ruled and developable "
    "surfaces (from memory); closed form derived"
)
FARIN = (
    "Farin, Curves and Surfaces for CAGD, ruled and developable surfaces (from memory); "
    "closed form derived"
)


def rigid_fit_residual(p: np.ndarray, q: np.ndarray) -> float:
    """Largest distance between q and p after the best rotation/reflection and shift."""
    pc, qc = p - p.mean(axis=0), q - q.mean(axis=0)
    u, _, vt = np.linalg.svd(pc.T @ qc)
    return float(np.max(np.linalg.norm(pc @ (u @ vt) - qc, axis=1)))


@pytest.mark.source(DO_CARMO)
def test_flat_panel_develops_to_its_own_plane_coordinates():
    s = np.linspace(0.0, 2.0, 41)
    lower = np.column_stack([s, 0.1 * np.sin(s)])  # curved edges in the plane
    upper = np.column_stack([s, 0.6 + 0.2 * s * (2.0 - s)])
    # put the plane in space: tilted about two axes and shifted
    e1 = np.array([math.cos(0.3), 0.2, math.sin(0.3)])
    e1 /= np.linalg.norm(e1)
    e2 = np.cross(e1, [0.1, -1.0, 0.4])
    e2 /= np.linalg.norm(e2)
    to3 = lambda p: p[:, :1] * e1 + p[:, 1:] * e2 + [1.0, 2.0, 3.0]  # noqa: E731
    dev = develop_strip(to3(lower), to3(upper), s)
    flat = np.vstack([lower, upper])
    assert rigid_fit_residual(flat, np.vstack([dev.lower, dev.upper])) < 1e-12
    assert np.max(np.abs(dev.twist)) < 1e-12
    ring = np.vstack([lower, upper[::-1]])
    assert shapely.Polygon(dev.outline).area == pytest.approx(shapely.Polygon(ring).area, rel=1e-12)


@pytest.mark.source(DO_CARMO)
def test_cylinder_chine_cut_by_a_plane_develops_to_the_sine_curve():
    # radius 0.5 along x; generators from x = 0 to the plane z = x tan(30 deg)
    r, alpha = 0.5, math.radians(30.0)
    theta = np.linspace(0.0, math.pi / 2, 2001)
    a = np.column_stack([0 * theta, r * np.cos(theta), r * np.sin(theta)])
    b = np.column_stack([r * np.sin(theta) / math.tan(alpha), a[:, 1], a[:, 2]])
    dev = develop_strip(a, b, theta)
    assert np.max(np.abs(dev.twist)) < 1e-9
    # the circle x = 0 is a geodesic: its image is straight; the chine's offset from it
    # at arc length s is x = (R sin(s/R) - c) / tan(alpha)
    direction = dev.lower[-1] - dev.lower[0]
    direction /= np.linalg.norm(direction)
    normal = np.array([-direction[1], direction[0]])
    rel = dev.lower - dev.lower[0]
    assert np.max(np.abs(rel @ normal)) < 1e-9
    expected = {0.0: 0.0, 0.196350: 0.331414, 0.392699: 0.612372, 0.589049: 0.800103,
                0.785398: 0.866025}
    along = (dev.upper - dev.lower[0]) @ direction
    offset = np.abs((dev.upper - dev.lower[0]) @ normal)
    for s, x in expected.items():
        i = int(np.argmin(np.abs(along - s)))
        assert offset[i] == pytest.approx(x, abs=1e-5)
    # the patch between two generators is a rectangle L x R(theta2 - theta1)
    assert along[-1] == pytest.approx(r * math.pi / 2, abs=1e-7)


@pytest.mark.source(FARIN)
def test_cone_band_develops_to_an_annular_sector():
    tan_b = 0.25
    theta = np.linspace(0.0, math.radians(40.0), 2001)

    def circle(radius: float) -> np.ndarray:
        return np.column_stack(
            [radius * np.cos(theta), radius * np.sin(theta), np.full_like(theta, radius / tan_b)]
        )

    dev = develop_strip(circle(4.0), circle(4.075), theta)
    assert np.max(np.abs(dev.twist)) < 1e-9
    arc = lambda p: float(np.sum(np.linalg.norm(np.diff(p, axis=0), axis=1)))  # noqa: E731
    assert arc(dev.lower) == pytest.approx(2.792527, abs=2e-6)
    assert arc(dev.upper) == pytest.approx(2.844887, abs=2e-6)
    assert np.linalg.norm(dev.upper[0] - dev.lower[0]) == pytest.approx(0.309233, abs=1e-6)
    assert shapely.Polygon(dev.outline).area == pytest.approx(0.871637, abs=2e-6)
    first, last = dev.upper[0] - dev.lower[0], dev.upper[-1] - dev.lower[-1]
    cos = first @ last / np.linalg.norm(first) / np.linalg.norm(last)
    assert math.degrees(math.acos(cos)) == pytest.approx(9.701425, abs=1e-5)
    # the slant radii: the rulings meet at the apex
    apex_offset = 16.492423 / 0.309233
    assert apex_offset * np.linalg.norm(first) == pytest.approx(16.492423, rel=1e-6)


@pytest.mark.source(DO_CARMO)
def test_twisted_quad_is_not_developable():
    a = np.array([[0.0, 0.0, 0.0], [2.4, 0.0, 0.0]])
    b = np.array([[0.0, 0.6, 0.0], [2.4, 0.6, 0.1]])
    da, db, r = a[1] - a[0], b[1] - b[0], b[0] - a[0]
    assert np.linalg.det(np.array([da, db, r])) == pytest.approx(-0.144)
    tau = np.degrees(np.abs(ruling_twist(a, b, np.array([0.0, 1.0]))))
    assert tau[0] == pytest.approx(2.386, abs=5e-4)
    assert tau[1] == pytest.approx(2.354, abs=5e-4)


@pytest.mark.source(DO_CARMO)
def test_helicoid_strip_twist_and_strain():
    # x(u, v) = (u, v cos(a u / L), v sin(a u / L)), the strip centred on its axis
    length, width, angle = 2.4, 0.6, math.radians(20.0)
    u = np.linspace(0.0, length, 241)
    turn = angle * u / length

    def edge(v: float) -> np.ndarray:
        return np.column_stack([u, v * np.cos(turn), v * np.sin(turn)])

    tau = np.abs(ruling_twist(edge(-width / 2), edge(width / 2), u))
    expected = 2 * math.atan(angle * width / (2 * length))
    assert math.degrees(expected) == pytest.approx(4.997, abs=5e-4)
    assert np.max(np.abs(tau - expected)) < 1e-6
    assert float(twist_strain(expected)) == pytest.approx(9.515e-4, abs=1e-6)


def box_sketch(length=3.0, half_breadth=0.5, depth=0.4, flare_u=1.0, keel=None):
    """A prismatic hull: constant plan and sheer, chine at (flare_u, 0)."""
    keel_curve = keel or Curve(((0.0, 0.0), (length, 0.0)), smooth=False)
    sheer_pts = tuple((x, y + depth) for x, y in keel_curve.points)
    return HullSketch(
        plan=Curve(((0.0, half_breadth), (length, half_breadth)), smooth=False),
        keel=keel_curve,
        sheer=Curve(sheer_pts, smooth=keel_curve.smooth),
        sections=(SectionShape(length / 2, ((0.0, 0.0), (flare_u, 0.0), (1.0, 1.0))),),
    )


def is_rectangle(outline: np.ndarray, length: float, width: float) -> bool:
    poly = shapely.Polygon(outline)
    return (
        abs(poly.area - length * width) < 1e-9
        and poly.symmetric_difference(shapely.box(*poly.bounds)).area < 1e-9
        and abs(np.ptp(outline[:, 0]) - length) < 1e-9
        and abs(np.ptp(outline[:, 1]) - width) < 1e-9
    )


@pytest.mark.source("common practice, no source: a box punt's panels are rectangles")
def test_box_punt_panels_are_exact_rectangles():
    sketch = box_sketch()
    panels = hull_panels(sketch)
    by_name = {p.name: p for p in panels.pieces}
    assert set(by_name) == {"bottom", "side"}
    assert is_rectangle(by_name["bottom"].outline, 3.0, 1.0)
    assert by_name["bottom"].count == 1 and not by_name["bottom"].mirrored
    assert is_rectangle(by_name["side"].outline, 3.0, 0.4)
    assert by_name["side"].count == 2 and by_name["side"].mirrored
    ends = end_pieces(generate_stations(sketch))
    assert len(ends) == 2 and all(is_rectangle(e.outline, 1.0, 0.4) for e in ends)
    # chines twice, the transom edges (bottom and both sides) twice
    assert panels.seam_m + sum(e.seam_m for e in ends) == pytest.approx(2 * 3.0 + 2 * 1.8)


@pytest.mark.source("flared prismatic side: width = side height / cos(flare); derived")
def test_flared_prismatic_side_width():
    sketch = box_sketch(flare_u=0.7)
    flare = math.atan((0.5 - 0.35) / 0.4)
    side = next(p for p in hull_panels(sketch).pieces if p.name == "side")
    assert is_rectangle(side.outline, 3.0, 0.4 / math.cos(flare))
    assert side.max_twist_deg < 1e-9


@pytest.mark.source(DO_CARMO)
def test_rockered_flat_bottom_develops_to_the_keel_arc_length():
    keel = Curve(((0.0, 0.12), (0.8, 0.01), (1.6, 0.0), (2.4, 0.02), (3.0, 0.15)), smooth=True)
    sketch = box_sketch(keel=keel)
    bottom = next(p for p in hull_panels(sketch).pieces if p.name == "bottom")
    x = np.linspace(0.0, 3.0, 200001)
    arc = float(np.sum(np.hypot(np.diff(x), np.diff(keel(x)))))
    assert bottom.length_m == pytest.approx(arc, rel=2e-4)
    assert bottom.width_m == pytest.approx(1.0, abs=1e-9)
    assert bottom.max_twist_deg < 1e-6


@pytest.mark.parametrize("name", ["heron-punt", "tern-pram", "drift-lab-raft"])
@pytest.mark.source("shapely (GEOS) polygon area against the hull's triangulated surface area")
def test_panel_areas_equal_the_hull_surface_area(name):
    design = load_design(SAMPLES / f"{name}.json")
    panels = hull_panels(design.hull)
    ends = end_pieces(design.stations())
    for p in (*panels.pieces, *ends):
        poly = shapely.Polygon(p.outline)
        assert poly.is_valid and poly.area > 0.05
    total = sum(shapely.Polygon(p.outline).area * p.count for p in (*panels.pieces, *ends))
    surface = float(shell_panels(design.stations()).area.sum())
    assert total == pytest.approx(surface, rel=1e-3)


def test_round_bilge_hull_gives_no_panels_and_says_why():
    panels = hull_panels(load_design(SAMPLES / "paper-loon-canoe.json").hull)
    assert panels.pieces == () and "frames" in panels.notes[0]


def test_raft_panels_are_named_for_the_builder():
    names = [p.name for p in hull_panels(load_design(SAMPLES / "drift-lab-raft.json").hull).pieces]
    assert names == ["bridge deck", "pontoon inner side", "pontoon bottom", "pontoon outer side"]


@pytest.mark.source("raked flat end: true height = section height / cos(rake); derived")
def test_raked_transom_true_shape():
    ring = np.array([[-0.5, 0.0], [0.5, 0.0], [0.6, 0.4], [-0.6, 0.4]])
    shape = true_end_shape(ring, 30.0)
    assert np.ptp(shape[:, 1]) == pytest.approx(0.4 / math.cos(math.radians(30.0)))
    assert np.ptp(shape[:, 0]) == pytest.approx(1.2)


def test_offset_rows_follow_the_station_ticks_and_spacing():
    side = next(p for p in hull_panels(box_sketch(flare_u=0.7)).pieces if p.name == "side")
    rows = offset_rows(side)
    assert [r[0] for r in rows] == [f"St {n}" for n in range(11)]
    assert rows[5][1][0] == pytest.approx(1.5) and rows[5][1][3] == pytest.approx(side.width_m)
    spaced = offset_rows(side, 0.1)
    assert len(spaced) == 11 + 31 and spaced[-1][0] == "3.000"


def test_raft_edges_and_frame_points_read_as_a_builder_names_them():
    design = load_design(SAMPLES / "drift-lab-raft.json")
    pieces = hull_panels(design.hull).pieces
    assert [(p.lower_edge, p.upper_edge) for p in pieces] == [
        ("deck edge", "deck edge"),
        ("deck edge", "inner chine"),
        ("inner chine", "outer chine"),
        ("outer chine", "sheer"),
    ]
    end = end_pieces(design.stations())[0]
    rows = offset_rows(end)
    assert rows[0][1][0] == pytest.approx(0.0)  # starts on the centreline at the bottom
    assert max(r[1][0] for r in rows) == pytest.approx(0.78)  # out to the gunwale


@pytest.mark.source(DO_CARMO)
def test_cylinder_band_flattens_row_by_row_to_a_rectangle():
    # rows along the generators of a cylinder, R = 0.5, a quarter turn in four steps:
    # the flat band is L wide x the sum of the chords, and no length changes
    from hydro.panels import develop_band

    r, x = 0.5, np.linspace(0.0, 2.0, 41)
    theta = np.linspace(0.0, math.pi / 2, 5)
    rows = np.stack([np.column_stack([x, r * np.cos(t) + 0 * x, r * np.sin(t) + 0 * x])
                     for t in theta])
    band = develop_band(rows, x)
    chords = 4 * 2 * r * math.sin(math.pi / 16)
    outline = np.vstack([band.rows[0], band.rows[-1][::-1]])
    assert is_rectangle(outline, 2.0, chords)
    assert band.stretch < 1e-12 and np.max(band.twist) < 1e-12


def test_doubly_curved_band_shows_its_stretch():
    from hydro.panels import develop_band

    x = np.linspace(-1.0, 1.0, 81)
    rows = np.stack([np.column_stack([x, 0 * x + y, (x**2 + y**2) / 2.0])
                     for y in np.linspace(0.0, 0.4, 5)])
    assert develop_band(rows, x).stretch > 1e-3
