"""Laying flat pieces out on stock sheets: joints, first-fit decreasing, bottom-left fill.

Sheet coordinates: X along the sheet's length (the grain or flute direction), Y across
it, metres, origin at a corner.  A piece's u axis (its length) runs along X; with the
grain locked a piece may only turn by 180 degrees, otherwise also by 90.  Pieces keep
``kerf`` apart and ``margin`` from the sheet edges.

Pieces longer than a sheet are cut into parts joined by a scarf (each joint uses
ratio x thickness of extra length, the overlap of the two bevels) or a butt block (a
strip of the same stock, 12 x thickness wide, stopped 50 mm short of the edges: common
practice, no source).  Joints keep away from frames and from the joints of the other
panels and layers (staggered).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import shapely
from numpy.typing import NDArray
from shapely import affinity

from hydro.panels import PanelError

__all__ = [
    "SHEET_PRESETS",
    "LayoutPiece",
    "Placement",
    "Sheet",
    "Layout",
    "JointSpec",
    "split_piece",
    "joint_positions",
    "lay_out",
    "lower_bound",
]

FloatArray = NDArray[np.float64]

#: Stock sheet sizes (width, length) in metres, as plywood and board are sold (common
#: practice).
SHEET_PRESETS: dict[str, tuple[float, float]] = {
    "1220x2440 mm": (1.22, 2.44),
    "1250x2500 mm": (1.25, 2.50),
    "1500x3000 mm": (1.50, 3.00),
    "4x8 ft": (1.2192, 2.4384),
    "5x8 ft": (1.524, 2.4384),
}

#: A butt block is this many thicknesses wide in total and stops this far from the
#: panel edges (common practice, no source).
BUTT_BLOCK_THICKNESSES = 12.0
BUTT_BLOCK_EDGE_GAP_M = 0.05
#: Joints keep at least this far from a piece's ends where they can.
END_CLEARANCE_M = 0.4


@dataclass(frozen=True, eq=False)
class LayoutPiece:
    """One shape to place (one copy).

    Attributes
    ----------
    label : what is written on it ("side, port, layer 1, part 1 of 2")
    name : the flat piece it comes from
    polygon : its outline in its own coordinates (u along its length)
    mirrored : draw as the mirror image (a port/starboard twin)
    material : the stock it is cut from
    in_piece_frame : the polygon is in the flat piece's own (u, v) coordinates, so the
        piece's marks belong on it (False for a butt block)
    """

    label: str
    name: str
    polygon: shapely.Polygon
    mirrored: bool = False
    material: str = ""
    in_piece_frame: bool = True


@dataclass(frozen=True, eq=False)
class Placement:
    """A piece on a sheet.

    Attributes
    ----------
    piece : what is placed
    polygon : its outline in sheet coordinates (m)
    turned : degrees it was turned: 0, 90, 180 or 270 (after mirroring)
    offset : shift after turning (m)
    """

    piece: LayoutPiece
    polygon: shapely.Polygon
    turned: int
    offset: tuple[float, float] = (0.0, 0.0)

    def to_sheet(self, points: FloatArray) -> FloatArray:
        """(k, 2) piece coordinates -> sheet coordinates, as the outline was moved."""
        p = np.asarray(points, dtype=float) * ([1.0, -1.0] if self.piece.mirrored else 1.0)
        a = np.radians(self.turned)
        rot = np.array([[np.cos(a), -np.sin(a)], [np.sin(a), np.cos(a)]])
        return p @ rot.T + self.offset


@dataclass(frozen=True, eq=False)
class Sheet:
    """One stock sheet with its pieces.  ``length`` along X, ``width`` along Y (m)."""

    width: float
    length: float
    material: str
    placements: tuple[Placement, ...]

    @property
    def used_area(self) -> float:
        return float(sum(p.polygon.area for p in self.placements))


@dataclass(frozen=True, eq=False)
class Layout:
    """All sheets of one material.

    Attributes
    ----------
    sheets : the sheets in order
    lower_bound : ceil(sum of piece areas / sheet area)
    utilisation : piece area / sheet area over all sheets (0-1)
    """

    sheets: tuple[Sheet, ...]
    lower_bound: int
    utilisation: float


@dataclass(frozen=True)
class JointSpec:
    """How long pieces are joined.

    Attributes
    ----------
    kind : "scarf" or "butt"
    scarf_ratio : scarf length / thickness (8 usual, 12 for highly stressed parts)
    thickness_m : thickness of the stock (one layer)
    """

    kind: str = "scarf"
    scarf_ratio: float = 8.0
    thickness_m: float = 0.006

    @property
    def overlap_m(self) -> float:
        """Extra length each scarf joint uses."""
        return self.scarf_ratio * self.thickness_m if self.kind == "scarf" else 0.0


def lower_bound(piece_area: float, sheet_area: float) -> int:
    """ceil(total piece area / sheet area): no layout can use fewer sheets.

    >>> lower_bound(4 * 0.6 * 2.4, 1.22 * 2.44)
    2
    """
    return int(math.ceil(piece_area / sheet_area - 1e-9))


def joint_positions(
    length: float,
    usable: float,
    joint: JointSpec,
    avoid: tuple[float, ...] = (),
    clearance: float = 0.15,
    prefer: int = 0,
) -> tuple[float, ...]:
    """Where to cut a piece of ``length`` (m, along u) so every part fits ``usable``.

    The fewest parts; the joints start evenly spaced and slide, as far as the parts
    still fit, to keep ``clearance`` away from the positions in ``avoid`` (frames, the
    joints of other panels and layers).  ``prefer`` +1 slides them forward (the first
    part as long as a sheet, so the short offcut parts nest together), -1 aft, 0 keeps
    them central.  No part is shorter than END_CLEARANCE_M where the sheet allows.
    Returns the joint positions along u.
    """
    if length <= usable + 1e-9:
        return ()
    overlap = joint.overlap_m
    if usable <= overlap + 1e-6:
        raise PanelError(
            f"a sheet {usable:.3f} m long is too short for a {overlap:.3f} m scarf joint"
        )
    parts = max(2, int(math.ceil((length - overlap) / (usable - overlap) - 1e-9)))
    each = (length + (parts - 1) * overlap) / parts  # equal stock length per part
    base = [each - overlap / 2 + k * (each - overlap) for k in range(parts - 1)]
    slack = max(usable - each, 0.0)
    # one shift for all joints keeps every part within the usable length; no part
    # shorter than END_CLEARANCE_M where the slack allows
    lo = max(-slack, min(0.0, END_CLEARANCE_M - base[0]))
    hi = min(slack, max(0.0, length - END_CLEARANCE_M - base[-1]))
    candidates = np.linspace(lo, hi, 81) if hi > lo else np.zeros(1)

    def score(shift: float) -> float:
        lean = 0.05 * (prefer * shift if prefer else -abs(shift))
        if not avoid:
            return lean
        gaps = [min(abs(b + shift - a) for a in avoid) for b in base]
        return min(min(gaps), clearance) + lean

    best = max(candidates, key=score)
    return tuple(float(b + best) for b in base)


def split_piece(
    polygon: shapely.Polygon, cuts: tuple[float, ...], joint: JointSpec
) -> list[shapely.Polygon]:
    """Cut a piece across its length at ``cuts`` (u positions).  With a scarf, each part
    runs half the scarf length past the cut so that the two bevels overlap there."""
    minx, miny, maxx, maxy = polygon.bounds
    half = joint.overlap_m / 2.0
    edges = [minx - 1.0, *cuts, maxx + 1.0]
    parts = []
    for k in range(len(edges) - 1):
        lo = edges[k] - (half if k > 0 else 0.0)
        hi = edges[k + 1] + (half if k < len(edges) - 2 else 0.0)
        part = shapely.intersection(polygon, shapely.box(lo, miny - 1.0, hi, maxy + 1.0))
        pieces = [g for g in shapely.get_parts(part) if g.area > 1e-8]
        if pieces:
            parts.append(max(pieces, key=lambda g: g.area))
    return parts


def butt_block(polygon: shapely.Polygon, cut: float, joint: JointSpec) -> shapely.Polygon | None:
    """The butt block over a joint at u = ``cut``: 12 x thickness wide, as long as the
    panel is wide there less 50 mm at each edge."""
    line = shapely.LineString([(cut, -100.0), (cut, 100.0)])
    chord = shapely.intersection(polygon, line)
    if chord.is_empty:
        return None
    _, y0, _, y1 = chord.bounds
    length = (y1 - y0) - 2 * BUTT_BLOCK_EDGE_GAP_M
    width = BUTT_BLOCK_THICKNESSES * joint.thickness_m
    if length <= 0.02 or width <= 0:
        return None
    return shapely.box(0.0, 0.0, length, width)


_Shape = tuple[int, shapely.Polygon, tuple[float, float]]


def _orientations(piece: LayoutPiece, grain_locked: bool) -> list[_Shape]:
    """(turn, outline moved to the origin, the shift that moved it) per allowed turn."""
    base = piece.polygon
    if piece.mirrored:
        base = affinity.scale(base, 1.0, -1.0, origin=(0, 0))
    turns = (0, 180) if grain_locked else (0, 90, 180, 270)
    out = []
    for t in turns:
        turned = affinity.rotate(base, t, origin=(0, 0))
        minx, miny, _, _ = turned.bounds
        out.append((t, affinity.translate(turned, -minx, -miny), (-minx, -miny)))
    return out


class _SheetFill:
    """Bottom-left fill of one sheet."""

    def __init__(self, width: float, length: float, margin: float, kerf: float):
        self.width, self.length, self.margin, self.kerf = width, length, margin, kerf
        self.placed: list[shapely.Polygon] = []
        self.placements: list[Placement] = []

    def _fits(self, poly: shapely.Polygon) -> bool:
        minx, miny, maxx, maxy = poly.bounds
        m = self.margin
        if minx < m - 1e-9 or miny < m - 1e-9:
            return False
        if maxx > self.length - m + 1e-9 or maxy > self.width - m + 1e-9:
            return False
        for q in self.placed:
            qx0, qy0, qx1, qy1 = q.bounds
            if minx >= qx1 + self.kerf or maxx <= qx0 - self.kerf:
                continue
            if miny >= qy1 + self.kerf or maxy <= qy0 - self.kerf:
                continue
            if shapely.distance(poly, q) < self.kerf - 1e-9:
                return False
        return True

    def best_spot(self, shape: shapely.Polygon) -> tuple[float, float] | None:
        """Lowest, then leftmost, free position for ``shape`` (normalised), or None."""
        xs = {self.margin} | {q.bounds[2] + self.kerf for q in self.placed}
        ys = {self.margin} | {q.bounds[3] + self.kerf for q in self.placed}
        for y in sorted(ys):
            for x in sorted(xs):
                moved = affinity.translate(shape, x, y)
                if self._fits(moved):
                    return self._settle(shape, x, y)
        return None

    def _settle(self, shape: shapely.Polygon, x: float, y: float) -> tuple[float, float]:
        """Slide down, then left, into hollows of irregular neighbours (bisection)."""
        for axis in (1, 0):
            lo = self.margin
            hi = (x, y)[axis]
            at = (lambda v: (x, v)) if axis == 1 else (lambda v: (v, y))
            if hi - lo < 1e-4:
                continue
            if self._fits(affinity.translate(shape, *at(lo))):
                hi = lo
            else:
                for _ in range(14):
                    mid = 0.5 * (lo + hi)
                    if self._fits(affinity.translate(shape, *at(mid))):
                        hi = mid
                    else:
                        lo = mid
            x, y = at(hi)
        return x, y

    def place(self, piece: LayoutPiece, shape: _Shape, spot: tuple[float, float]) -> None:
        turned, outline, shift = shape
        moved = affinity.translate(outline, *spot)
        self.placed.append(moved)
        offset = (shift[0] + spot[0], shift[1] + spot[1])
        self.placements.append(Placement(piece, moved, turned, offset))


def lay_out(
    pieces: list[LayoutPiece],
    sheet_wl: tuple[float, float],
    margin: float = 0.002,
    kerf: float = 0.003,
    grain_locked: bool = True,
    material: str = "",
) -> Layout:
    """Place every piece on sheets of (width, length) ``sheet_wl``: first-fit decreasing
    (by area, by length, by width: the fewest sheets wins), each piece at the lowest then
    leftmost free spot of the first sheet it fits.

    Raises
    ------
    PanelError
        If a piece fits no empty sheet (the message names it and the sheet it needs).
    """
    width, length = sheet_wl
    if not (width > 0 and length > 0):
        raise PanelError("the sheet size must be positive")
    if not (margin > 0 and kerf > 0):
        raise PanelError("the kerf and margin allowances must be positive")
    if 2 * margin >= min(width, length):
        raise PanelError("the sheet margin leaves no room on the sheet")
    fills: list[_SheetFill] | None = None
    for key in _ORDERS:
        trial = _fill_sheets(sorted(pieces, key=key), width, length, margin, kerf, grain_locked)
        if fills is None or len(trial) < len(fills):
            fills = trial
        if len(fills) <= lower_bound(sum(p.polygon.area for p in pieces), width * length):
            break
    assert fills is not None
    sheets = tuple(
        Sheet(width, length, material, tuple(f.placements)) for f in fills
    )
    area = float(sum(p.polygon.area for p in pieces))
    sheet_area = width * length
    util = area / (len(sheets) * sheet_area) if sheets else 0.0
    return Layout(sheets, lower_bound(area, sheet_area) if pieces else 0, util)


def _extent(p: LayoutPiece) -> tuple[float, float]:
    minx, miny, maxx, maxy = p.polygon.bounds
    return maxx - minx, maxy - miny


#: Piece orders tried (first-fit decreasing by each); the layout with fewest sheets wins.
_ORDERS = (
    lambda p: -p.polygon.area,
    lambda p: (-_extent(p)[0], -_extent(p)[1]),
    lambda p: (-_extent(p)[1], -_extent(p)[0]),
)


def _fill_sheets(
    order: list[LayoutPiece], width: float, length: float, margin: float, kerf: float,
    grain_locked: bool,
) -> list[_SheetFill]:
    """First fit of ``order`` over the sheets, each at its lowest, leftmost spot."""
    fills: list[_SheetFill] = []
    for piece in order:
        shapes = _orientations(piece, grain_locked)
        for fill in fills:
            if _try_place(fill, piece, shapes):
                break
        else:
            fill = _SheetFill(width, length, margin, kerf)
            if not _try_place(fill, piece, shapes):
                _, _, w_need, l_need = _need(piece, margin, grain_locked)
                raise PanelError(
                    f"'{piece.label}' does not fit a {width * 1000:.0f} x {length * 1000:.0f}"
                    f" mm sheet: it needs a sheet of at least {w_need * 1000:.0f} x "
                    f"{l_need * 1000:.0f} mm"
                )
            fills.append(fill)
    return fills


def _try_place(fill: _SheetFill, piece: LayoutPiece, shapes: list[_Shape]) -> bool:
    """Place the piece at the lowest, then leftmost, spot over its orientations."""
    best: tuple[tuple[float, float], _Shape] | None = None
    for shape in shapes:
        spot = fill.best_spot(shape[1])
        if spot is not None and (best is None or (spot[1], spot[0]) < (best[0][1], best[0][0])):
            best = (spot, shape)
    if best is None:
        return False
    fill.place(piece, best[1], best[0])
    return True


def _need(
    piece: LayoutPiece, margin: float, grain_locked: bool
) -> tuple[float, float, float, float]:
    """(u, v) extent of the piece and the (width, length) of the smallest sheet for it."""
    minx, miny, maxx, maxy = piece.polygon.bounds
    along, across = maxx - minx, maxy - miny
    w, ln = across + 2 * margin, along + 2 * margin
    if not grain_locked and w > ln:
        w, ln = ln, w
    return along, across, math.ceil(w * 1000 - 1e-6) / 1000, math.ceil(ln * 1000 - 1e-6) / 1000
