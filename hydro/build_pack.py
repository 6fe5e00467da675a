"""The build pack: every flat piece, how it lies on the stock sheets, and what to buy.

:func:`build_pack` gathers the hull's flat panels, its ends and frames, splits pieces
longer than a sheet at staggered joints, lays every layer out on sheets per material
and works out the materials list.  :func:`pack_dict` is the JSON the command line
prints.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace
from typing import Any

import numpy as np
import shapely

from hydro.design import Design
from hydro.hull import HullSketch, Stations
from hydro.loads import SURFACES, Material, shell_panels, weight_build_up
from hydro.materials_list import MaterialsList, ShoppingSettings, materials_list
from hydro.panels import (
    FlatPiece,
    FrameMarks,
    PanelError,
    PanelSet,
    end_pieces,
    frame_pieces,
    hull_panels,
)
from hydro.sections import build_section_table
from hydro.sheet_layout import (
    JointSpec,
    Layout,
    LayoutPiece,
    butt_block,
    joint_positions,
    lay_out,
    split_piece,
)
from hydro.stability import upright

__all__ = [
    "PackSettings",
    "PieceJob",
    "BuildPack",
    "build_pack",
    "pack_dict",
    "strain_warnings",
    "with_sheet",
]

#: Strain above which a panel is flagged: no published limit for plywood or board was
#: found, so this is a setting (0.05 %; common practice, no source).
DEFAULT_STRAIN_LIMIT = 5e-4
#: Station mould spacing for round-bilge hulls (common practice, no source).
MOULD_SPACING_M = 0.30


@dataclass(frozen=True)
class PackSettings:
    """Choices for the build pack.

    Attributes
    ----------
    sheet_m : stock sheet (width, length) in metres; the grain runs along the length
    margin_m, kerf_m : clear edge of the sheet and saw cut between pieces (m)
    grain_locked : pieces turn only 0 or 180 degrees on the sheet (else also 90)
    joint : "auto" (scarf for one layer, staggered butt joints between laminate
        layers), "scarf" or "butt" (with a butt block)
    scarf_ratio : scarf length / thickness (8 usual, 12 for stressed parts)
    strain_limit : flag panels whose twist strain is above this
    frame_x : frame positions (m from the aft end); None: a few evenly spaced
    tick_count : stations marked across each panel
    skin_strips : a round-bilge hull's skin in this many strips a side (0: frames only)
    offset_spacing_m : also tabulate the offsets every this many metres (None: no)
    shopping : tape, paint and price settings
    """

    sheet_m: tuple[float, float] = (1.22, 2.44)
    margin_m: float = 0.002
    kerf_m: float = 0.003
    grain_locked: bool = True
    joint: str = "auto"
    scarf_ratio: float = 8.0
    strain_limit: float = DEFAULT_STRAIN_LIMIT
    frame_x: tuple[float, ...] | None = None
    tick_count: int = 11
    skin_strips: int = 4
    offset_spacing_m: float | None = None
    shopping: ShoppingSettings = field(default_factory=ShoppingSettings)

    def validate(self) -> None:
        """Raise :class:`PanelError` for a non-positive allowance or ratio."""
        checks = (
            (self.sheet_m[0], "the sheet width"),
            (self.sheet_m[1], "the sheet length"),
            (self.margin_m, "the sheet margin"),
            (self.kerf_m, "the saw kerf"),
            (self.scarf_ratio, "the scarf ratio"),
            (self.strain_limit, "the strain limit"),
        )
        for value, what in checks:
            if not (isinstance(value, (int, float)) and math.isfinite(value) and value > 0):
                raise PanelError(f"{what} must be a positive number")
        if self.joint not in ("auto", "scarf", "butt"):
            raise PanelError("the joint must be auto, scarf or butt")
        if self.offset_spacing_m is not None and not self.offset_spacing_m > 0:
            raise PanelError("the offset spacing must be a positive number")
        if not 0 <= self.skin_strips <= 20:
            raise PanelError("the skin strips must number between 0 and 20 a side")
        if not 2 <= self.tick_count <= 101:
            raise PanelError("the station ticks must number between 2 and 101")
        self.shopping.validate()


@dataclass(frozen=True)
class PieceJob:
    """A flat piece with the stock it is cut from.

    Attributes
    ----------
    piece : the shape
    material : the sheet material's name
    layers : layers of that material (each layer is cut separately)
    joints_u : where each layer's copy is joined (u positions), layer by layer
    joint : how it is joined
    """

    piece: FlatPiece
    material: str
    layers: int
    joints_u: tuple[tuple[float, ...], ...]
    joint: JointSpec

    @property
    def total_count(self) -> int:
        return self.piece.count * self.layers


@dataclass(frozen=True, eq=False)
class BuildPack:
    """Everything the build team cuts from.

    Attributes
    ----------
    name : the design's name
    jobs : every piece with its material, layers and joints
    layouts : (material name, layout) per sheet material
    materials : the shopping list
    warnings : panels above the strain limit and other cautions
    notes : what the builder should know (round bilge, missing thickness ...)
    settings : the choices used
    """

    name: str
    jobs: tuple[PieceJob, ...]
    layouts: tuple[tuple[str, Layout], ...]
    materials: MaterialsList
    warnings: tuple[str, ...]
    notes: tuple[str, ...]
    settings: PackSettings

    @property
    def pieces(self) -> tuple[FlatPiece, ...]:
        return tuple(j.piece for j in self.jobs)

    @property
    def sheet_count(self) -> int:
        return sum(len(lay.sheets) for _, lay in self.layouts)


def _sheet_materials(design: Design) -> tuple[list[Material], list[str]]:
    sheets = [m for m in design.loads.materials if m.is_sheet]
    if sheets:
        return sheets, []
    stock = Material("sheet stock", 0.0, 1.0, SURFACES, 0.0)
    return [stock], [
        "No material has a thickness of 1 mm or more: the pieces are laid out on plain "
        "'sheet stock' and the frames are not inset for the skin. Set each material's "
        "thickness in the loads."
    ]


def _material_for(surface: str, materials: list[Material]) -> Material:
    if surface == "frames":
        return max(materials, key=lambda m: m.thickness_m)
    for m in materials:
        if surface in m.surfaces:
            return m
    return materials[0]


def _frame_positions(stations: Stations, smooth: bool, settings: PackSettings) -> np.ndarray:
    x0, x1 = float(stations.x[0]), float(stations.x[-1])
    if settings.frame_x is not None:
        xs = np.array(sorted(settings.frame_x), dtype=float)
        if xs.size and (xs[0] < x0 or xs[-1] > x1):
            raise PanelError(f"frame positions must lie between {x0:.3f} and {x1:.3f} m")
        return xs
    length = x1 - x0
    count = max(3, int(round(length / MOULD_SPACING_M)) - 1) if smooth else 3
    return x0 + length * np.arange(1, count + 1) / (count + 1)


def _frame_marks(design: Design, stations: Stations) -> FrameMarks:
    loads = design.loads
    seats = []
    low = np.array([np.min(h[:, 1]) for h in stations.half_sections])
    for c in loads.crew:
        z = float(np.interp(c.x, stations.x, low)) + loads.bottom_thickness + c.seat_height
        seats.append((c.name, c.x, z))
    waterline = None
    try:
        weights = weight_build_up(loads, stations, design.water_density)
        hs = upright(build_section_table(stations), weights, design.water_density)
        if hs is not None:
            waterline = (hs.h, hs.tau)
    except (ValueError, ArithmeticError):
        waterline = None
    return FrameMarks(waterline, tuple(seats))


def _x_of_u(piece: FlatPiece, u: float) -> float:
    us = np.array([t.lower[0] for t in piece.ticks])
    xs = np.array([t.x for t in piece.ticks])
    order = np.argsort(us)
    return float(np.interp(u, us[order], xs[order]))


def _u_of_x(piece: FlatPiece, x: float) -> float:
    us = np.array([t.lower[0] for t in piece.ticks])
    xs = np.array([t.x for t in piece.ticks])
    return float(np.interp(x, xs, us))


def _plan_joints(
    piece: FlatPiece, layers: int, joint: JointSpec, usable: float, frames_x: np.ndarray,
    taken_x: list[float],
) -> tuple[tuple[float, ...], ...]:
    """Joint positions (u) per layer, clear of frames and of joints already placed."""
    out = []
    for layer in range(layers):
        if piece.ticks:
            avoid = tuple(_u_of_x(piece, x) for x in [*frames_x, *taken_x])
        else:
            avoid = ()
        # long parts as long as a sheet, at alternate ends layer by layer
        prefer = 1 if layer % 2 == 0 else -1
        cuts = joint_positions(piece.length_m, usable, joint, avoid, prefer=prefer)
        out.append(cuts)
        if piece.ticks:
            taken_x.extend(_x_of_u(piece, u) for u in cuts)
    return tuple(out)


def _layout_pieces(job: PieceJob) -> list[LayoutPiece]:
    piece = job.piece
    base = shapely.Polygon(piece.outline)
    out = []
    for layer, cuts in enumerate(job.joints_u, start=1):
        parts = split_piece(base, cuts, job.joint) if cuts else [base]
        for copy in range(piece.count):
            side = ""
            if piece.mirrored:
                side = "port" if copy == 0 else "starboard"
            for k, part in enumerate(parts):
                bits = [piece.name]
                if side:
                    bits.append(side)
                if job.layers > 1:
                    bits.append(f"layer {layer}")
                if len(parts) > 1:
                    bits.append(f"part {k + 1}/{len(parts)}")
                out.append(
                    LayoutPiece(
                        ", ".join(bits), piece.name, part, side == "starboard", job.material
                    )
                )
            if cuts and job.joint.kind == "butt" and job.layers == 1:
                for n, u in enumerate(cuts):
                    block = butt_block(base, u, job.joint)
                    if block is not None:
                        label = f"butt block {n + 1}, {piece.name}" + (f", {side}" if side else "")
                        out.append(
                            LayoutPiece(label, piece.name, block, False, job.material, False)
                        )
    return out


def strain_warnings(pieces: tuple[FlatPiece, ...], limit: float) -> tuple[str, ...]:
    """A warning for every piece whose twist strain is above ``limit``."""
    return tuple(
        f"{p.name}: twist {p.max_twist_deg:.2f} deg, strain {p.strain * 100:.3f} % "
        f"(limit {limit * 100:.3f} %): the sheet will not take this shape without "
        "stretching, and frames cut to the model will leave gaps"
        for p in pieces
        if p.strain > limit
    )


def _check_width(piece: FlatPiece, settings: PackSettings) -> None:
    """A piece can be joined along its length but never across: it must fit the width."""
    width, length = settings.sheet_m
    across = piece.width_m
    if not settings.grain_locked:
        across = min(piece.width_m, piece.length_m)
    need = across + 2 * settings.margin_m
    if need > width + 1e-9:
        raise PanelError(
            f"'{piece.name}' is {across * 1000:.0f} mm wide: it needs a sheet at least "
            f"{math.ceil(need * 1000 - 1e-6):.0f} mm wide (the sheet is {width * 1000:.0f} x "
            f"{length * 1000:.0f} mm)"
        )


def build_pack(design: Design, settings: PackSettings = PackSettings()) -> BuildPack:
    """Develop, lay out and list everything needed to build ``design``.

    Raises
    ------
    PanelError
        For a non-positive allowance, or a piece wider than the sheet (the message
        names the piece and the sheet size it needs).
    HullwrightError
        For an impossible hull.
    """
    settings.validate()
    stations = design.stations()
    notes: list[str] = []
    if isinstance(design.hull, HullSketch):
        panel_set = hull_panels(design.hull, settings.tick_count, settings.skin_strips)
        smooth = any(s.smooth for s in design.hull.sections)
    else:
        panel_set = PanelSet((), (
            "A table of offsets has no chine information: the pack gives frames and ends "
            "only. Draw the hull as a sketch for flat panels.",
        ), 0.0)
        smooth = True
    notes.extend(panel_set.notes)
    materials, more = _sheet_materials(design)
    notes.extend(more)
    ends = end_pieces(stations)
    frames_x = _frame_positions(stations, smooth or not panel_set.pieces, settings)
    skin = max(
        (m.thickness_m * max(m.layers, 1.0) for m in materials if "sides" in m.surfaces),
        default=0.0,
    )
    frames = frame_pieces(design.hull, frames_x, skin, _frame_marks(design, stations))
    width, length = settings.sheet_m
    usable = length - 2 * settings.margin_m
    if not settings.grain_locked:
        usable = max(width, length) - 2 * settings.margin_m
    jobs: list[PieceJob] = []
    taken_x: list[float] = []
    for piece in (*panel_set.pieces, *ends, *frames):
        _check_width(piece, settings)
        material = _material_for(piece.surface, materials)
        layers = 1 if piece.kind == "frame" else max(1, int(round(material.layers)))
        kind = settings.joint
        if kind == "auto":
            kind = "butt" if layers > 1 else "scarf"
        spec = JointSpec(kind, settings.scarf_ratio, material.thickness_m)
        joints = _plan_joints(piece, layers, spec, usable, frames_x, taken_x)
        jobs.append(PieceJob(piece, material.name, layers, joints, spec))
    layouts = []
    for material in materials:
        pieces = [lp for job in jobs if job.material == material.name for lp in _layout_pieces(job)]
        if pieces:
            layouts.append(
                (material.name, lay_out(pieces, (width, length), settings.margin_m,
                                        settings.kerf_m, settings.grain_locked, material.name))
            )
    warnings = strain_warnings(tuple(j.piece for j in jobs), settings.strain_limit)
    for job in jobs:
        p = job.piece
        if any(job.joints_u):
            n = max(len(c) for c in job.joints_u)
            notes.append(
                f"{p.name}: longer than the sheet, {n} joint(s) per piece "
                f"({job.joint.kind}{', staggered between layers' if job.layers > 1 else ''})"
            )
    seam = panel_set.seam_m + sum(e.seam_m for e in ends)
    if not panel_set.pieces:
        notes.append("Seam tape and glue are not counted: the hull has no panel seams.")
    outside = float(shell_panels(stations).area.sum())
    by_material = {name: len(lay.sheets) for name, lay in layouts}
    shopping = materials_list(by_material, seam, outside, settings.shopping)
    return BuildPack(
        design.name, tuple(jobs), tuple(layouts), shopping, tuple(warnings), tuple(notes), settings
    )


def pack_dict(pack: BuildPack) -> dict[str, Any]:
    """The JSON form: panels, sheets and materials (SI units)."""
    panels = []
    for job in pack.jobs:
        p = job.piece
        panels.append(
            {
                "name": p.name,
                "kind": p.kind,
                "count": job.total_count,
                "mirrored": p.mirrored,
                "layers": job.layers,
                "material": job.material,
                "outline_m": [[round(float(u), 6), round(float(v), 6)] for u, v in p.outline],
                "area_m2": p.area_m2,
                "length_m": p.length_m,
                "width_m": p.width_m,
                "max_twist_deg": p.max_twist_deg,
                "strain": p.strain,
                "joints_u_m": [list(c) for c in job.joints_u],
            }
        )
    width, length = pack.settings.sheet_m
    count = pack.sheet_count
    area = sum(s.used_area for _, lay in pack.layouts for s in lay.sheets)
    m = pack.materials
    return {
        "name": pack.name,
        "panels": panels,
        "sheets": {
            "size_m": [width, length],
            "count": count,
            "lower_bound": sum(lay.lower_bound for _, lay in pack.layouts),
            "utilisation": area / (count * width * length) if count else 0.0,
        },
        "materials": {
            "seam_m": m.seam_m,
            "tape_m": m.tape_m,
            "tape_rolls": m.tape_rolls,
            "paint_area_m2": m.paint_area_m2,
            "paint_l": m.paint_l,
            "fillet_m": m.fillet_m,
            "sheets_by_material": dict(m.sheets_by_material),
            "cost": m.cost,
        },
        "warnings": list(pack.warnings),
        "notes": list(pack.notes),
    }


def with_sheet(settings: PackSettings, width: float, length: float) -> PackSettings:
    """Copy of ``settings`` with another stock sheet (width, length) in metres."""
    return replace(settings, sheet_m=(float(width), float(length)))
