"""The sketch model: generation, blending, and clear refusals of impossible shapes."""

import re

import numpy as np
import pytest

from hydro import Curve, HullSketch, SectionShape, ShapeError, Stations, generate_stations
from hydro.hull import scale_breadth
from hydro.io import offsets_to_csv, read_offsets, write_offsets


def sketch(**changes) -> HullSketch:
    base = dict(
        plan=Curve(((0.0, 0.0), (1.0, 0.4), (2.0, 0.0)), True),
        keel=Curve(((0.0, 0.05), (1.0, 0.0), (2.0, 0.05)), True),
        sheer=Curve(((0.0, 0.4), (2.0, 0.4)), True),
        sections=(SectionShape(1.0, ((0.0, 0.0), (0.8, 0.1), (1.0, 1.0)), False),),
        station_count=11,
    )
    base.update(changes)
    return HullSketch(**base)


def test_generated_stations_follow_the_curves():
    st = generate_stations(sketch())
    assert st.x.tolist() == pytest.approx(np.linspace(0, 2, 11).tolist())
    mid = st.half_sections[5]
    assert mid[-1].tolist() == pytest.approx([0.4, 0.4])  # gunwale = (b, sheer)
    assert mid[1].tolist() == pytest.approx([0.32, 0.04])  # chine = (0.8 b, k + 0.1 d)
    assert st.half_sections[0][:, 0].max() == pytest.approx(0.0)  # pointed end


def test_sections_blend_linearly_between_positions():
    a = SectionShape(0.0, ((0.0, 0.0), (0.6, 0.0), (1.0, 1.0)), False)
    b = SectionShape(2.0, ((0.0, 0.0), (1.0, 0.4), (1.0, 1.0)), False)
    st = generate_stations(sketch(sections=(a, b), plan=Curve(((0.0, 0.5), (2.0, 0.5)), False),
                                  keel=Curve(((0.0, 0.0), (2.0, 0.0)), False)))
    chine = st.half_sections[5][1]  # x = 1.0, halfway
    assert chine.tolist() == pytest.approx([0.5 * 0.8, 0.4 * 0.2])


def test_breadth_scale_multiplies_every_half_breadth():
    st = generate_stations(scale_breadth(sketch(), 1.5))
    ref = generate_stations(sketch())
    for a, b in zip(st.half_sections, ref.half_sections):
        assert a[:, 0] == pytest.approx(1.5 * b[:, 0])


@pytest.mark.parametrize(
    "changes,message",
    [
        (dict(plan=Curve(((0.0, 0.0), (1.0, -0.1), (2.0, 0.0)))), "negative half-breadth"),
        (dict(plan=Curve(((0.0, 0.0), (1.5, 0.4), (1.0, 0.3), (2.0, 0.0)))), "without going back"),
        (dict(sheer=Curve(((0.0, 0.4), (1.0, -0.2), (2.0, 0.4)))), "sheer is not above the keel"),
        (dict(keel=Curve(((0.0, 0.0),))), "at least 2 points"),
        (dict(keel=Curve(((0.0, 0.0), (1.8, 0.0)))), "same length"),
        (dict(sections=(SectionShape(1.0, ((0.0, 0.0), (0.9, 0.6), (0.3, 0.1), (1.0, 1.0))),)), "crosses itself"),
        (dict(sections=(SectionShape(1.0, ((0.2, 0.0), (1.0, 1.0))),)), "centreline"),
        (dict(sections=(SectionShape(1.0, ((0.0, 0.0), (0.9, 0.9))),)), "gunwale (1, 1)"),
        (dict(sections=(SectionShape(1.0, ((0.0, 0.0), (0.5, -0.2), (1.0, 1.0))),)), "below the keel"),
        (dict(sections=()), "at least one section"),
        (dict(sections=(SectionShape(0.0, ((0.0, 0.0), (1.0, 1.0))),
                        SectionShape(2.0, ((0.0, 0.0), (0.5, 0.1), (1.0, 1.0))))), "same number of points"),
        (dict(plan=Curve(((0.0, 0.0), (1.0, float("nan")), (2.0, 0.0)))), "finite"),
        (dict(station_count=2), "station count"),
    ],
)
def test_impossible_shapes_are_refused_with_a_plain_message(changes, message):
    with pytest.raises(ShapeError, match=re.escape(message)):
        generate_stations(sketch(**changes))


def test_offsets_table_round_trip(tmp_path):
    st = generate_stations(sketch())
    path = tmp_path / "hull.csv"
    write_offsets(st, path)
    back = read_offsets(path)
    assert back.x == pytest.approx(st.x, abs=1e-6)
    for a, b in zip(back.half_sections, st.half_sections):
        np.testing.assert_allclose(a, b, atol=1e-6)
    assert offsets_to_csv(back).splitlines()[1] == "x_m,y_m,z_m"


def test_raft_section_may_start_above_the_baseline():
    half = np.array([[0.0, 0.4], [0.5, 0.4], [0.5, 0.0], [0.8, 0.0], [0.8, 0.45]])
    st = Stations(np.array([0.0, 2.0]), (half, half))
    assert st.keel_z == 0.0


@pytest.mark.parametrize(
    "text,message",
    [
        ("x_m,y_m,z_m\n0,0,0\n0,0.5,0.3\n", "at least two stations"),
        ("x_m,y_m,z_m\n0,0,0\n0,0.5,abc\n", "line 3: 'z' is not a number"),
        ("x_m,y_m\n0,0\n", "three columns"),
        ("0,0,0\n0,0.5,0.3\n1,0,0\n1,0.5,0.3\n0.5,0,0\n0.5,0.4,0.3\n", "stations must run one way along the hull"),
        ("0,0.1,0\n0,0.5,0.3\n1,0.1,0\n1,0.5,0.3\n", "start on the centreline"),
        ("0,0,0\n0,0.5,inf\n1,0,0\n1,0.5,0.3\n", "finite"),
    ],
)
def test_broken_offsets_files_are_refused(tmp_path, text, message):
    from hydro import DesignFileError

    path = tmp_path / "bad.csv"
    path.write_text(text)
    with pytest.raises(DesignFileError, match=re.escape(message)):
        read_offsets(path)


def test_each_curve_moved_in_turn_places_the_stations_afresh():
    """The curves a drag leaves alone keep their checked values; the one it moves is taken
    anew: every station is what the curves give, whichever of them moved."""
    from dataclasses import replace as changed

    from hydro import load_design
    from tests.paths import SAMPLES

    sketch = load_design(SAMPLES / "paper-loon-canoe.json").hull
    generate_stations(sketch)
    for name, dz in (("plan", 0.02), ("keel", -0.01), ("sheer", 0.03), ("plan", -0.02)):
        curve = getattr(sketch, name)
        points = tuple((x, v + dz) for x, v in curve.points)
        sketch = changed(sketch, **{name: changed(curve, points=points)})
        st = generate_stations(sketch)
        x = st.x
        assert st.stack[:, -1, 0] == pytest.approx(np.maximum(sketch.plan(x), 0.0))
        assert st.stack[:, 0, 1] == pytest.approx(sketch.keel(x))  # the shapes start at the keel
        assert st.stack[:, -1, 1] == pytest.approx(sketch.sheer(x))
    low = tuple((x, -1.0) for x, _ in sketch.sheer.points)
    for _ in range(2):  # an impossible sheer is refused every time, not once
        with pytest.raises(ShapeError, match="sheer is not above the keel"):
            generate_stations(changed(sketch, sheer=changed(sketch.sheer, points=low)))
