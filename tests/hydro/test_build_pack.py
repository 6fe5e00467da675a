"""The build pack of the samples and of hand-checkable hulls."""

import dataclasses
import json
import math

import numpy as np
import pytest

from hydro import Design, Loads, Material, load_design
from hydro.build_pack import PackSettings, build_pack, pack_dict, strain_warnings
from hydro.loads import shell_panels
from hydro.materials_list import ShoppingSettings
from hydro.panels import FlatPiece, PanelError, develop_strip
from tests.hydro.test_panels import box_sketch
from tests.paths import SAMPLES

ALL = ["heron-punt", "tern-pram", "drift-lab-raft", "paper-loon-canoe"]


def box_design(**material):
    ply = Material("plywood 6 mm", 2.7, 1.0, thickness_m=0.006, **material)
    return Design("box punt", box_sketch(), Loads(materials=(ply,)))


@pytest.mark.parametrize("name", ALL)
def test_every_sample_packs_and_every_piece_is_on_a_sheet(name):
    design = load_design(SAMPLES / f"{name}.json")
    pack = build_pack(design)
    data = json.loads(json.dumps(pack_dict(pack), allow_nan=False))
    assert data["panels"] and data["sheets"]["count"] >= data["sheets"]["lower_bound"] >= 1
    for p in data["panels"]:
        assert set(p) >= {"name", "kind", "count", "mirrored", "outline_m", "area_m2",
                          "length_m", "width_m", "max_twist_deg", "strain"}
        assert p["kind"] in ("panel", "end", "frame", "deck")
    placed = [pl.piece.name for _, lay in pack.layouts for s in lay.sheets for pl in s.placements]
    for job in pack.jobs:
        copies = placed.count(job.piece.name)
        parts = [len(c) + 1 for c in job.joints_u]
        assert copies >= job.piece.count * sum(parts)
    m = data["materials"]
    assert sum(m["sheets_by_material"].values()) == data["sheets"]["count"]
    assert m["paint_l"] > 0


@pytest.mark.source("common practice, no source: a box punt's panels are rectangles")
def test_box_punt_pack_json():
    data = pack_dict(build_pack(box_design()))
    by_name = {p["name"]: p for p in data["panels"]}
    assert by_name["bottom"]["length_m"] == pytest.approx(3.0)
    assert by_name["bottom"]["width_m"] == pytest.approx(1.0)
    assert by_name["side"]["count"] == 2 and by_name["side"]["mirrored"]
    assert by_name["side"]["area_m2"] == pytest.approx(1.2)
    # a 3 m piece needs one joint on a 2.44 m sheet
    assert len(by_name["bottom"]["joints_u_m"][0]) == 1
    # seams: two chines and three edges of each transom; tape inside and out
    seam = 2 * 3.0 + 2 * (1.0 + 2 * 0.4)
    assert data["materials"]["seam_m"] == pytest.approx(seam)
    assert data["materials"]["tape_m"] == pytest.approx(2 * seam)
    area = 3.0 * 1.0 + 2 * 3.0 * 0.4 + 2 * 1.0 * 0.4
    assert data["materials"]["paint_l"] == pytest.approx(area * 2 / 10.0)
    assert [p["kind"] for p in data["panels"]].count("frame") == 3


def test_frames_are_inset_by_the_skin():
    pack = build_pack(box_design())
    frame = next(j.piece for j in pack.jobs if j.piece.kind == "frame")
    assert frame.width_m == pytest.approx(0.4 - 0.006)
    assert frame.length_m == pytest.approx(1.0 - 2 * 0.006)
    labels = {m.label for m in frame.marks}
    assert {"centreline", "sheer"} <= labels


def test_pack_area_matches_the_material_weight_surface():
    design = load_design(SAMPLES / "tern-pram.json")
    pack = build_pack(design)
    shell = sum(
        j.piece.area_m2 * j.piece.count
        for j in pack.jobs
        if j.piece.kind in ("panel", "end", "deck")
    )
    assert shell == pytest.approx(float(shell_panels(design.stations()).area.sum()), rel=1e-3)


@pytest.mark.source(
    "do Carmo, Differential Geometry of Curves and Surfaces, sec. 3-5 (from memory); "
    "helicoid twist and strain derived"
)
def test_helicoid_panel_is_flagged():
    u = np.linspace(0.0, 2.4, 121)
    turn = math.radians(20.0) * u / 2.4
    edge = lambda v: np.column_stack([u, v * np.cos(turn), v * np.sin(turn)])  # noqa: E731
    dev = develop_strip(edge(-0.3), edge(0.3), u)
    tau = float(np.max(np.abs(dev.twist)))
    piece = FlatPiece("helicoid", "panel", "sides", 2, True, dev.outline,
                      max_twist_deg=math.degrees(tau), strain=1 / math.cos(tau / 2) - 1)
    flat = dataclasses.replace(piece, name="flat", max_twist_deg=0.0, strain=0.0)
    warnings = strain_warnings((piece, flat), PackSettings().strain_limit)
    assert len(warnings) == 1 and warnings[0].startswith("helicoid: twist 5.00 deg")


def test_sheet_too_narrow_names_the_piece_and_the_size_it_needs():
    settings = PackSettings(sheet_m=(0.9, 2.44))
    with pytest.raises(PanelError, match=r"'bottom' is 1000 mm wide: .* at least 1004 mm wide"):
        build_pack(box_design(), settings)


@pytest.mark.parametrize(
    "settings",
    [
        PackSettings(kerf_m=0.0),
        PackSettings(margin_m=-0.001),
        PackSettings(scarf_ratio=0.0),
        PackSettings(strain_limit=float("nan")),
        PackSettings(shopping=ShoppingSettings(tape_roll_m=0.0)),
        PackSettings(shopping=ShoppingSettings(paint_coverage_m2_per_l=-1.0)),
    ],
)
def test_non_positive_allowances_and_ratios_are_refused(settings):
    with pytest.raises(PanelError, match="positive"):
        build_pack(box_design(), settings)


def test_round_bilge_pack_is_frames_only_with_a_note():
    design = load_design(SAMPLES / "paper-loon-canoe.json")
    pack = build_pack(design, PackSettings(skin_strips=0))
    assert {j.piece.kind for j in pack.jobs} == {"frame"}
    assert any("Round-bilge" in n for n in pack.notes)


def test_round_bilge_skin_strips_cover_the_hull_and_say_their_strain():
    design = load_design(SAMPLES / "paper-loon-canoe.json")
    pack = build_pack(design, PackSettings(skin_strips=4))
    strips = [j.piece for j in pack.jobs if j.piece.name.startswith("skin strip")]
    assert len(strips) == 4 and all(p.mirrored and p.count == 2 for p in strips)
    area = sum(p.area_m2 * p.count for p in strips)
    assert area == pytest.approx(float(shell_panels(design.stations()).area.sum()), rel=2e-3)
    assert any(w.startswith("skin strip 1:") for w in pack.warnings)
    assert pack.materials.seam_m > 0


def test_laminate_joints_are_staggered_between_layers():
    pack = build_pack(load_design(SAMPLES / "heron-punt.json"))
    for job in pack.jobs:
        if job.layers > 1 and any(job.joints_u):
            first, second = job.joints_u[0], job.joints_u[1]
            assert min(abs(a - b) for a in first for b in second) >= 0.15 - 1e-9
