"""Flat panels, ends and frames: the true shapes a build team cuts from sheet stock.

A hard-chine panel runs between two chine lines (rows of the half sections that stay
corners along the hull).  Each station's straight section segment between the two
chines is a ruling, so the panel is the station-paired ruled surface
x(x, v) = (1 - v) A(x) + v B(x).  It is unrolled exactly, triangle by triangle, from
its 3D edge lengths; the twist between the tangent planes at the two ends of each
ruling says how far the panel is from developable (0 = a sheet takes the shape
without stretching).

Coordinates of a flat piece: u along a straight baseline (bow to the right), v up
from it, metres.  A side panel is drawn as the port panel seen from outside; the
starboard panel is its mirror image.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace

import numpy as np
import shapely
from numpy.typing import NDArray

from hydro.errors import HullwrightError
from hydro.hull import HullSketch, Stations, generate_stations, half_sections_at

__all__ = [
    "PanelError",
    "Mark",
    "StationTick",
    "FlatPiece",
    "PanelSet",
    "ruling_twist",
    "twist_strain",
    "unroll_strip",
    "develop_strip",
    "develop_band",
    "unroll_onto",
    "true_end_shape",
    "chine_rows",
    "hull_panels",
    "end_pieces",
    "frame_pieces",
    "offset_rows",
    "half_outline",
]

FloatArray = NDArray[np.float64]

#: Interior points whose sections turn by less than this everywhere are not chines.
CORNER_DEG = 1.0
#: Fine stations between two station ticks when a panel is developed.
FINE_PER_TICK = 16


class PanelError(HullwrightError):
    """A build-pack request that cannot be met (message names the problem)."""


@dataclass(frozen=True, eq=False)
class Mark:
    """A line drawn on a piece: a station line, a named edge, a waterline, a seat.

    Attributes
    ----------
    label : text written beside it
    points : (k, 2) polyline in piece coordinates (m)
    role : "station", "edge", "line" (centreline, waterline, seat) or "joint"
    """

    label: str
    points: FloatArray
    role: str


@dataclass(frozen=True)
class StationTick:
    """Where a station crosses a panel: its two edge points on the flat piece.

    Attributes
    ----------
    label : "St 0" ... from aft
    x : station position along the hull (m)
    lower, upper : (u, v) of the station on the panel's lower and upper edge (m)
    twist_deg : twist of the ruling at this station (degrees)
    """

    label: str
    x: float
    lower: tuple[float, float]
    upper: tuple[float, float]
    twist_deg: float


@dataclass(frozen=True, eq=False)
class FlatPiece:
    """One shape to cut, in its own flat coordinates (u along the baseline, v up).

    Attributes
    ----------
    name : e.g. "bottom", "side", "transom (aft)", "frame 2"
    kind : "panel", "end", "frame" or "deck"
    surface : "bottom", "sides" or "ends": which materials cover it
    count : how many to cut per layer
    mirrored : the second of a pair is the mirror image
    outline : (N, 2) closed outline without the repeated first point (m)
    lower_edge, upper_edge : names of the panel's two long edges ("chine", "sheer" ...)
    ticks : the stations across the panel (panels only)
    marks : lines to draw on the piece
    max_twist_deg : largest twist over its rulings (0 for plane pieces)
    strain : edge strain estimate sec(tau/2) - 1 at the largest twist
    seam_m : length of its edges that join other pieces (ends: all but the top)
    face_note : which face the drawing shows
    notes : anything else to say about it
    position_m : where a frame or end stands along the hull (m from the aft end)
    """

    name: str
    kind: str
    surface: str
    count: int
    mirrored: bool
    outline: FloatArray
    lower_edge: str = ""
    upper_edge: str = ""
    ticks: tuple[StationTick, ...] = ()
    marks: tuple[Mark, ...] = ()
    max_twist_deg: float = 0.0
    strain: float = 0.0
    seam_m: float = 0.0
    face_note: str = ""
    notes: tuple[str, ...] = field(default=())
    position_m: float | None = None

    @property
    def polygon(self) -> shapely.Polygon:
        return shapely.Polygon(self.outline)

    @property
    def area_m2(self) -> float:
        return float(shapely.area(self.polygon))

    @property
    def length_m(self) -> float:
        return float(np.ptp(self.outline[:, 0]))

    @property
    def width_m(self) -> float:
        return float(np.ptp(self.outline[:, 1]))


# -- the mathematics -----------------------------------------------------------------


def ruling_twist(a: FloatArray, b: FloatArray, s: FloatArray) -> FloatArray:
    """(n,) twist of each ruling a[i]-b[i] of a ruled surface (radians, signed).

    tau = atan2(|r| det(A', B', r), (A' x r) . (B' x r)), r = B - A: the angle between
    the tangent planes at the two ends of the ruling; 0 where the surface is developable.
    ``a``, ``b`` are (n, 3) points of the two edge curves at the parameters ``s`` (n,);
    derivatives by second-order differences.  Zero-length rulings get 0.
    """
    da = np.gradient(a, s, axis=0)
    db = np.gradient(b, s, axis=0)
    r = b - a
    na, nb = np.cross(da, r), np.cross(db, r)
    det = np.einsum("ij,ij->i", da, np.cross(db, r))
    length = np.linalg.norm(r, axis=1)
    tau = np.arctan2(length * det, np.einsum("ij,ij->i", na, nb))
    return np.where(length > 1e-9, tau, 0.0)


def twist_strain(tau: FloatArray | float) -> FloatArray:
    """Edge strain of a strip twisted by ``tau`` (rad) across its width: sec(tau/2) - 1."""
    return 1.0 / np.cos(np.asarray(tau, dtype=float) / 2.0) - 1.0


def _place(p1: FloatArray, p2: FloatArray, d1: float, d2: float, forward: FloatArray) -> FloatArray:
    """The point at distances d1 from p1 and d2 from p2, right of p1 -> p2."""
    base = p2 - p1
    c = float(np.hypot(*base))
    if c < 1e-12:
        return p1 + d1 * forward
    e = base / c
    along = (d1 * d1 - d2 * d2 + c * c) / (2.0 * c)
    h = math.sqrt(max(d1 * d1 - along * along, 0.0))
    return p1 + along * e + h * np.array([e[1], -e[0]])


def unroll_strip(a: FloatArray, b: FloatArray) -> tuple[FloatArray, FloatArray]:
    """Unroll the triangle strip between two 3D polylines onto the plane.

    Each quad a[k], b[k], b[k+1], a[k+1] is split along its shorter diagonal and every
    new vertex is placed from its two 3D edge lengths, always forward of the last
    ruling, so the strip is an exact isometry of its triangles.  The first ruling lies
    on the +v axis from the origin, later rulings to the right.

    Returns (n, 2) images of ``a`` and ``b``.
    """
    n = len(a)
    pa = np.zeros((n, 2))
    pb = np.zeros((n, 2))
    pb[0] = [0.0, float(np.linalg.norm(b[0] - a[0]))]
    forward = np.array([1.0, 0.0])
    dist = lambda p, q: float(np.linalg.norm(p - q))  # noqa: E731
    for k in range(n - 1):
        a0, b0, a1, b1 = a[k], b[k], a[k + 1], b[k + 1]
        if dist(a0, b1) <= dist(b0, a1):
            pb[k + 1] = _place(pa[k], pb[k], dist(a0, b1), dist(b0, b1), forward)
            pa[k + 1] = _place(pa[k], pb[k + 1], dist(a0, a1), dist(b1, a1), forward)
        else:
            pa[k + 1] = _place(pa[k], pb[k], dist(a0, a1), dist(b0, a1), forward)
            pb[k + 1] = _place(pa[k + 1], pb[k], dist(a1, b1), dist(b0, b1), forward)
        step = 0.5 * (pa[k + 1] + pb[k + 1] - pa[k] - pb[k])
        if np.hypot(*step) > 1e-12:
            forward = step / np.hypot(*step)
    return pa, pb


def _to_baseline(pa: FloatArray, pb: FloatArray) -> tuple[FloatArray, FloatArray]:
    """Turn the flat strip so the chord between its end-ruling midpoints runs along +u,
    with the whole piece just above the baseline v = 0 and starting at u = 0."""
    start = 0.5 * (pa[0] + pb[0])
    chord = 0.5 * (pa[-1] + pb[-1]) - start
    angle = math.atan2(chord[1], chord[0])
    c, s = math.cos(-angle), math.sin(-angle)
    rot = np.array([[c, -s], [s, c]])
    qa, qb = pa @ rot.T, pb @ rot.T
    both = np.vstack([qa, qb])
    shift = both.min(axis=0)
    return qa - shift, qb - shift


@dataclass(frozen=True, eq=False)
class DevelopedStrip:
    """A strip unrolled onto its baseline.

    Attributes
    ----------
    lower, upper : (n, 2) flat images of the two edges (m)
    twist : (n,) twist of each ruling (rad)
    """

    lower: FloatArray
    upper: FloatArray
    twist: FloatArray

    @property
    def outline(self) -> FloatArray:
        ring = np.vstack([self.lower, self.upper[::-1]])
        keep = np.ones(len(ring), dtype=bool)
        keep[1:] = np.hypot(*np.diff(ring, axis=0).T) > 1e-9
        if np.hypot(*(ring[-1] - ring[0])) <= 1e-9:
            keep[-1] = False
        return ring[keep]


def develop_strip(a: FloatArray, b: FloatArray, s: FloatArray) -> DevelopedStrip:
    """Develop the ruled strip between edge curves ``a``, ``b`` (n, 3) paired at ``s``.

    Examples
    --------
    A flat 2 x 0.5 rectangle stays a 2 x 0.5 rectangle:

    >>> s = np.linspace(0.0, 2.0, 5)
    >>> a = np.column_stack([s, 0 * s, 0 * s]); b = a + [0.0, 0.0, 0.5]
    >>> d = develop_strip(a, b, s)
    >>> np.round(d.upper[-1], 9).tolist(), float(np.max(np.abs(d.twist)))
    ([2.0, 0.5], 0.0)
    """
    pa, pb = unroll_strip(a, b)
    la, lb = _to_baseline(pa, pb)
    return DevelopedStrip(la, lb, ruling_twist(a, b, s))


def unroll_onto(pa: FloatArray, a: FloatArray, b: FloatArray) -> FloatArray:
    """Images of the 3D row ``b`` beside a row ``a`` already flat at ``pa`` (n, 2).

    Each b[k] is placed from its 3D distances to a[k] and a[k+1] (a[k-1] for the last),
    on the left of the row's direction, so every triangle a[k], a[k+1], b[k] keeps its
    shape; the lengths along the new row are what a flat sheet cannot keep.
    """
    n = len(a)
    pb = np.zeros((n, 2))
    dist = lambda p, q: float(np.linalg.norm(p - q))  # noqa: E731
    up = np.array([0.0, 1.0])
    for k in range(n):
        j = k + 1 if k < n - 1 else k - 1
        if k < n - 1:
            pb[k] = _place(pa[j], pa[k], dist(a[j], b[k]), dist(a[k], b[k]), up)
        else:
            pb[k] = _place(pa[k], pa[j], dist(a[k], b[k]), dist(a[j], b[k]), up)
    return pb


@dataclass(frozen=True, eq=False)
class DevelopedBand:
    """A curved strip between two lines of a smooth hull, flattened row by row.

    Attributes
    ----------
    rows : (r, n, 2) flat images of the rows from the lower edge to the upper edge (m)
    twist : (n,) largest twist of the sub-rulings at each station (rad)
    stretch : largest relative change of a length along a row (the flat piece cannot
        keep every length of a doubly curved surface)
    """

    rows: FloatArray
    twist: FloatArray
    stretch: float


def develop_band(rows: FloatArray, s: FloatArray) -> DevelopedBand:
    """Flatten the strip through the 3D rows (r, n, 3) paired at ``s``: the first two
    rows unrolled exactly, each further row placed beside the one before (its chords
    across the strip keep the girth), then turned onto a baseline."""
    flat = list(unroll_strip(rows[0], rows[1]))
    for j in range(2, len(rows)):
        flat.append(unroll_onto(flat[-1], rows[j - 1], rows[j]))
    images = np.stack(flat)
    start = 0.5 * (images[0, 0] + images[-1, 0])
    chord = 0.5 * (images[0, -1] + images[-1, -1]) - start
    angle = -math.atan2(chord[1], chord[0])
    rot = np.array([[math.cos(angle), -math.sin(angle)], [math.sin(angle), math.cos(angle)]])
    images = images @ rot.T
    images -= images.reshape(-1, 2).min(axis=0)
    twist = np.max(
        np.abs([ruling_twist(rows[j], rows[j + 1], s) for j in range(len(rows) - 1)]), axis=0
    )
    true = np.linalg.norm(np.diff(rows, axis=1), axis=2)
    drawn = np.linalg.norm(np.diff(images, axis=1), axis=2)
    keep = true > 1e-9
    stretch = float(np.max(np.abs(drawn[keep] / true[keep] - 1.0))) if keep.any() else 0.0
    return DevelopedBand(images, twist, stretch)


def true_end_shape(section: FloatArray, rake_deg: float) -> FloatArray:
    """True shape of an end raked ``rake_deg`` from vertical: the section (y, z) outline
    stretched by 1 / cos(rake) in height (the flat end is longer along its slope)."""
    if not -80.0 <= rake_deg <= 80.0:
        raise PanelError("an end rake must be between -80 and 80 degrees")
    out = np.array(section, dtype=float)
    out[:, 1] = (out[:, 1] - out[:, 1].min()) / math.cos(math.radians(rake_deg))
    return out


# -- the hull's panels ----------------------------------------------------------------


def _turning_deg(halves: FloatArray) -> FloatArray:
    """(S, m) turning angle of each half section at each of its points (degrees)."""
    d = np.diff(halves, axis=1)
    ang = np.arctan2(d[..., 1], d[..., 0])
    turn = np.zeros(halves.shape[:2])
    valid = np.hypot(d[..., 0], d[..., 1]) > 1e-9
    inner = np.abs((ang[:, 1:] - ang[:, :-1] + np.pi) % (2 * np.pi) - np.pi)
    turn[:, 1:-1] = np.where(valid[:, 1:] & valid[:, :-1], np.degrees(inner), 0.0)
    # at the centreline: the angle between the first segment and its mirror image
    first = np.where(valid[:, 0], np.degrees(2 * np.abs(np.arctan2(d[:, 0, 1], d[:, 0, 0]))), 0.0)
    turn[:, 0] = first
    return turn


def chine_rows(sketch: HullSketch, halves: FloatArray) -> tuple[list[int], bool]:
    """Which section points stay corners all along the hull, and whether the centreline is
    a seam (a keel) rather than the middle of one flat piece across both sides.

    Returns the corner indices from the centreline to the gunwale (both ends included)
    and the keel flag.  A round-bilge (smooth) section has no corners: ``[]``.
    """
    if any(sec.smooth for sec in sketch.sections):
        return [], False
    turn = _turning_deg(halves)
    m = halves.shape[1]
    rows = [0] + [i for i in range(1, m - 1) if np.max(turn[:, i]) > CORNER_DEG] + [m - 1]
    keel_seam = bool(np.max(turn[:, 0]) > CORNER_DEG)
    return rows, keel_seam


def _edge_name(index: int, m: int, rows: list[int], raft: bool) -> str:
    if index == m - 1:
        return "sheer"
    if index == 0:
        return "deck centreline" if raft else "keel"
    number = rows.index(index)
    if raft:
        if number == 1:
            return "deck edge"
        inner = rows[2:-1]
        if len(inner) == 2:
            return "inner chine" if index == inner[0] else "outer chine"
        return f"chine {number - 1}"
    return "chine" if len(rows) == 3 else f"chine {number}"


def _panel_name(seg: FloatArray, position: str, raft: bool) -> tuple[str, str]:
    """(name, surface class) of a panel from its mean section segment (dy, dz)."""
    dy, dz = seg
    surface = "bottom" if abs(dy) >= abs(dz) else "sides"
    base = "bottom" if surface == "bottom" else "side"
    if raft:
        return f"pontoon {position}{base}".replace("  ", " "), surface
    return f"{position}{base}", surface


def _world(x: FloatArray, halves: FloatArray, row: int, side: float = 1.0) -> FloatArray:
    return np.column_stack([x, side * halves[:, row, 0], halves[:, row, 1]])


@dataclass(frozen=True, eq=False)
class PanelSet:
    """The hull's flat panels.

    Attributes
    ----------
    pieces : the panels, keel to sheer
    notes : for the builder (e.g. why there are none)
    seam_m : length of the seams between the panels, both sides: chines, a keel seam,
        stems where the two sides meet at a pointed end (not the transom edges)
    """

    pieces: tuple[FlatPiece, ...]
    notes: tuple[str, ...]
    seam_m: float


ROUND_BILGE_NOTE = (
    "Round-bilge (smooth) sections have no chines to cut flat panels along: the pack "
    "gives station moulds (frames) to build over, and the skin is laid on them in strips, "
    "planks or laminated layers."
)


def hull_panels(sketch: HullSketch, tick_count: int = 11, skin_strips: int = 0) -> PanelSet:
    """The hull's flat panels between chines, with station ticks and twist.

    Parameters
    ----------
    sketch : a hard-chine sketch (round-bilge sections give no panels)
    tick_count : stations marked across each panel, evenly spaced, both ends included
    skin_strips : a round-bilge hull's skin split into this many strips a side, between
        lines at equal fractions of the girth (0: frames only)

    Returns
    -------
    The panels, notes for the builder and the seam length.
    """
    if tick_count < 2:
        raise PanelError("a panel needs at least two station ticks")
    n_fine = (tick_count - 1) * FINE_PER_TICK + 1
    x = generate_stations(sketch, n_fine).x
    halves = half_sections_at(sketch, x)
    rows, keel_seam = chine_rows(sketch, halves)
    if not rows:
        if skin_strips < 1:
            return PanelSet((), (ROUND_BILGE_NOTE,), 0.0)
        return _skin_strips(x, halves, skin_strips, tick_count)
    m = halves.shape[1]
    raft = bool(np.all(halves[:, 0, 1] - halves[:, :, 1].min(axis=1) > 1e-6))
    tick_idx = np.arange(tick_count) * FINE_PER_TICK
    lowest_row = int(np.argmin(halves[n_fine // 2, rows, 1]))
    pieces: list[FlatPiece] = []
    for k in range(len(rows) - 1):
        i, j = rows[k], rows[k + 1]
        seg = np.mean(halves[:, j] - halves[:, i], axis=0)
        full_width = i == 0 and not keel_seam
        if full_width:
            a, b = _world(x, halves, j), _world(x, halves, j, -1.0)
            lower_name = upper_name = _edge_name(j, m, rows, raft)
        else:
            a, b = _world(x, halves, i), _world(x, halves, j)
            lower_name, upper_name = _edge_name(i, m, rows, raft), _edge_name(j, m, rows, raft)
        position = ""
        if raft and i != 0 and len(rows) > 3:
            below = rows.index(i) < lowest_row
            is_bottom = abs(seg[0]) >= abs(seg[1])
            position = "" if is_bottom else ("inner " if below else "outer ")
        if raft and i == 0:
            name, surface = "bridge deck", "bottom"
        else:
            name, surface = _panel_name(seg, position, raft)
        dev = develop_strip(a, b, x)
        pieces.append(_strip_piece(name, surface, dev, x, tick_idx, lower_name, upper_name,
                                   full_width, raft and i == 0, a, b))
    pieces = _unique_names(pieces)
    seam = sum(2 * _polyline_length(_world(x, halves, r)) for r in rows[1:-1])
    if keel_seam:
        seam += _polyline_length(_world(x, halves, 0))
    for end in (0, -1):
        if np.max(halves[end, :, 0]) <= 1e-6:  # a pointed end: the two sides meet
            seam += _polyline_length(halves[end])
    return PanelSet(tuple(pieces), (), float(seam))


#: Rows across each skin strip (its curvature across is followed row by row).
BAND_ROWS = 5


def _girth_rows(halves: FloatArray, fractions: FloatArray) -> FloatArray:
    """(len(fractions), S, 2) points at the given fractions of each half section's girth."""
    seg = np.hypot(*np.diff(halves, axis=1).transpose(2, 0, 1))
    s = np.concatenate([np.zeros((len(halves), 1)), np.cumsum(seg, axis=1)], axis=1)
    out = np.empty((len(fractions), len(halves), 2))
    for i, h in enumerate(halves):
        t = fractions * s[i, -1]
        out[:, i, 0] = np.interp(t, s[i], h[:, 0])
        out[:, i, 1] = np.interp(t, s[i], h[:, 1])
    return out


def _skin_strips(x: FloatArray, halves: FloatArray, count: int, tick_count: int) -> PanelSet:
    """A round-bilge skin in ``count`` strips a side, each flattened row by row; the
    larger of its twist strain and its row stretch is its strain."""
    tick_idx = np.arange(tick_count) * FINE_PER_TICK
    fractions = np.linspace(0.0, 1.0, count * (BAND_ROWS - 1) + 1)
    lines = _girth_rows(halves, fractions)
    world = np.concatenate([np.broadcast_to(x[None, :, None], (*lines.shape[:2], 1)), lines],
                           axis=2)
    names = ["keel"] + [f"seam {k}" for k in range(1, count)] + ["sheer"]
    pieces = []
    for k in range(count):
        rows = world[k * (BAND_ROWS - 1): (k + 1) * (BAND_ROWS - 1) + 1]
        band = develop_band(rows, x)
        dev = DevelopedStrip(band.rows[0], band.rows[-1], band.twist)
        seg = np.mean(lines[(k + 1) * (BAND_ROWS - 1)] - lines[k * (BAND_ROWS - 1)], axis=0)
        surface = "bottom" if abs(seg[0]) >= abs(seg[1]) else "sides"
        piece = _strip_piece(f"skin strip {k + 1}", surface, dev, x, tick_idx, names[k],
                             names[k + 1], False, False, rows[0], rows[-1])
        strain = max(piece.strain, band.stretch)
        pieces.append(replace(piece, strain=strain, notes=(
            f"flattened row by row: lengths along it change by up to {band.stretch * 100:.2f} %",
        )))
    seam = sum(2 * _polyline_length(world[k * (BAND_ROWS - 1)]) for k in range(1, count))
    seam += _polyline_length(world[0])
    for end in (0, -1):
        if np.max(halves[end, :, 0]) <= 1e-6:
            seam += _polyline_length(halves[end])
    note = (
        f"Round-bilge (smooth) sections have no chines: the skin is given as {count} strips "
        "a side between lines at equal fractions of the girth, flattened row by row, with "
        "their strain; build them over the station moulds (frames)."
    )
    return PanelSet(tuple(pieces), (note,), float(seam))


def _strip_piece(
    name: str,
    surface: str,
    dev: DevelopedStrip,
    x: FloatArray,
    tick_idx: NDArray[np.int_],
    lower_name: str,
    upper_name: str,
    full_width: bool,
    deck: bool,
    a: FloatArray,
    b: FloatArray,
) -> FlatPiece:
    twist_deg = np.degrees(dev.twist)
    ticks = tuple(
        StationTick(
            f"St {n}",
            float(x[t]),
            (float(dev.lower[t, 0]), float(dev.lower[t, 1])),
            (float(dev.upper[t, 0]), float(dev.upper[t, 1])),
            float(twist_deg[t]),
        )
        for n, t in enumerate(tick_idx)
    )
    marks = [
        Mark(tk.label, np.array([tk.lower, tk.upper]), "station") for tk in ticks
    ]
    marks.append(Mark(lower_name + (" (starboard)" if full_width else ""), dev.lower, "edge"))
    marks.append(Mark(upper_name + (" (port)" if full_width else ""), dev.upper, "edge"))
    tau = float(np.max(np.abs(dev.twist)))
    if full_width:
        face = "outside (underside) shown; one piece across both sides"
    else:
        face = "port panel, outside face shown; starboard is its mirror image"
    return FlatPiece(
        name=name,
        kind="deck" if deck else "panel",
        surface=surface,
        count=1 if full_width else 2,
        mirrored=not full_width,
        outline=dev.outline,
        lower_edge=lower_name,
        upper_edge=upper_name,
        ticks=ticks,
        marks=tuple(marks),
        max_twist_deg=math.degrees(tau),
        strain=float(twist_strain(tau)),
        face_note=face,
    )


def _unique_names(pieces: list[FlatPiece]) -> list[FlatPiece]:
    seen: dict[str, int] = {}
    for p in pieces:
        seen[p.name] = seen.get(p.name, 0) + 1
    out: list[FlatPiece] = []
    counter: dict[str, int] = {}
    for p in pieces:
        if seen[p.name] > 1:
            counter[p.name] = counter.get(p.name, 0) + 1
            p = replace(p, name=f"{p.name} {counter[p.name]}")
        out.append(p)
    return out


def _polyline_length(p: FloatArray) -> float:
    return float(np.sum(np.hypot(*np.diff(p, axis=0).T)))


# -- ends and frames ------------------------------------------------------------------


def _closed_section(half: FloatArray) -> FloatArray:
    """The mirrored section ring (y, z) from the starboard half, port side reversed."""
    ring = np.vstack([half[::-1] * [-1.0, 1.0], half[1:]])
    keep = np.ones(len(ring), dtype=bool)
    keep[1:] = np.hypot(*np.diff(ring, axis=0).T) > 1e-9
    return ring[keep]


def end_pieces(stations: Stations, min_area_m2: float = 1e-4) -> tuple[FlatPiece, ...]:
    """The blunt ends (transoms) at the first and last station, at their true shape.

    The station model ends in vertical planes, so the rake is 0 and the true shape is
    the end section itself; it is drawn from aft (the aft end) or from forward.
    """
    out = []
    for which, label in ((0, "aft"), (-1, "fore")):
        half = stations.half_sections[which]
        if np.max(half[:, 0]) <= 1e-6:
            continue
        ring = true_end_shape(_closed_section(half), 0.0)
        poly = shapely.Polygon(ring)
        if not poly.is_valid or poly.area < min_area_m2:
            continue
        ring = ring - [ring[:, 0].min(), 0.0]
        centre = -float(np.min(_closed_section(half)[:, 0]))
        seam = float(shapely.length(poly.exterior)) - 2 * float(half[-1, 0])
        marks = (Mark("centreline", np.array([[centre, 0.0], [centre, ring[:, 1].max()]]), "line"),)
        out.append(
            FlatPiece(
                name=f"transom ({label})",
                kind="end",
                surface="ends",
                count=1,
                mirrored=False,
                outline=ring,
                marks=marks,
                seam_m=seam,
                face_note="outside face shown (seen from " + ("aft)" if which == 0 else "forward)"),
                position_m=float(stations.x[which]),
            )
        )
    return tuple(out)


@dataclass(frozen=True)
class FrameMarks:
    """Heights to mark on the frames (m, hull coordinates).

    Attributes
    ----------
    waterline : (h, tau): the design waterline z = h + tau x, or None
    seats : (label, x, z) seat tops
    """

    waterline: tuple[float, float] | None = None
    seats: tuple[tuple[str, float, float], ...] = ()


def frame_pieces(
    sketch: HullSketch | Stations,
    xs: FloatArray,
    skin_m: float,
    marks: FrameMarks = FrameMarks(),
) -> tuple[FlatPiece, ...]:
    """Frames (bulkheads or moulds) at positions ``xs``: the section inset by the skin.

    The outline is the section less ``skin_m`` all round the hull (mitred corners) and
    cut straight across at the sheer.  Marked: centreline, sheer, design waterline and
    the seat tops of crew within half a frame spacing.
    """
    xs = np.asarray(xs, dtype=float)
    if isinstance(sketch, Stations):
        idx = [int(np.argmin(np.abs(sketch.x - x))) for x in xs]
        halves = [sketch.half_sections[i] for i in idx]
        xs = sketch.x[idx]
    else:
        halves = list(half_sections_at(sketch, xs))
    spacing = float(np.min(np.diff(xs))) if xs.size > 1 else math.inf
    out: list[FlatPiece] = []
    for x, half in zip(xs, halves):
        piece = _frame(float(x), half, skin_m, marks, spacing, len(out) + 1)
        if piece is not None:
            out.append(piece)
    return tuple(out)


def _frame(
    x: float, half: FloatArray, skin_m: float, marks: FrameMarks, spacing: float, number: int
) -> FlatPiece | None:
    if np.max(half[:, 0]) <= 1e-6:
        return None
    top = float(half[-1, 1])
    tall = half.copy()
    tall = np.vstack([tall, [[half[-1, 0], top + 1.0 + skin_m]]])
    poly = shapely.Polygon(_closed_section(tall))
    if not poly.is_valid:
        poly = poly.buffer(0)
    inset = poly.buffer(-skin_m, join_style="mitre") if skin_m > 0 else poly
    width = float(np.ptp(half[:, 0])) * 2
    inset = shapely.intersection(inset, shapely.box(-width - 1, -10.0, width + 1, top))
    parts = [g for g in shapely.get_parts(inset) if g.area > 1e-5]
    if not parts:
        return None
    shape = max(parts, key=lambda g: g.area)
    ring = np.asarray(shape.exterior.coords)[:-1]
    base = float(np.min(half[:, 1]))
    ring = ring - [0.0, base]
    line_marks = [Mark("centreline", np.array([[0.0, 0.0], [0.0, top - base]]), "line")]
    y_sheer = float(half[-1, 0])
    line_marks.append(
        Mark("sheer", np.array([[-y_sheer, top - base], [y_sheer, top - base]]), "line")
    )
    if marks.waterline is not None:
        z = marks.waterline[0] + marks.waterline[1] * x - base
        if 0.0 < z < top - base:
            y = _half_breadth_at(half, z + base)
            line_marks.append(Mark("DWL", np.array([[-y, z], [y, z]]), "line"))
    for label, sx, sz in marks.seats:
        if abs(sx - x) <= spacing / 2 and 0.0 < sz - base < top - base:
            y = _half_breadth_at(half, sz) - skin_m
            seat = np.array([[-y, sz - base], [y, sz - base]])
            line_marks.append(Mark(f"seat: {label}", seat, "line"))
    ring = ring + [float(np.max(half[:, 0])), 0.0]
    shift = [float(np.max(half[:, 0])), 0.0]
    line_marks = [Mark(mk.label, mk.points + shift, mk.role) for mk in line_marks]
    return FlatPiece(
        name=f"frame {number}",
        kind="frame",
        surface="frames",
        count=1,
        mirrored=False,
        outline=ring,
        marks=tuple(line_marks),
        face_note=f"seen from aft; inset {skin_m * 1000:.0f} mm for the skin",
        position_m=x,
    )


def _half_breadth_at(half: FloatArray, z: float) -> float:
    """Largest half-breadth where the section crosses height z (outer skin)."""
    y0, z0, y1, z1 = half[:-1, 0], half[:-1, 1], half[1:, 0], half[1:, 1]
    cross = (z0 - z) * (z1 - z) <= 0
    with np.errstate(divide="ignore", invalid="ignore"):
        t = np.where(np.abs(z1 - z0) > 1e-12, (z - z0) / (z1 - z0), 0.0)
    ys = (y0 + t * (y1 - y0))[cross]
    return float(ys.max()) if ys.size else 0.0


# -- offset tables --------------------------------------------------------------------


def _edge_at(edge: FloatArray, u: float) -> float | None:
    order = np.argsort(edge[:, 0])
    e = edge[order]
    if u < e[0, 0] - 1e-9 or u > e[-1, 0] + 1e-9:
        return None
    return float(np.interp(u, e[:, 0], e[:, 1]))


def half_outline(outline: FloatArray, centre: float) -> FloatArray:
    """The starboard half of a symmetric outline, from where it crosses the centreline at
    the bottom round to where it crosses it at the top: the points a builder marks."""
    poly = shapely.Polygon(outline)
    _, miny, maxx, maxy = poly.bounds
    right = shapely.intersection(poly, shapely.box(centre, miny - 1.0, maxx + 1.0, maxy + 1.0))
    parts = [g for g in shapely.get_parts(right) if g.area > 0]
    if not parts:
        return outline[:1]
    ring = np.asarray(max(parts, key=lambda g: g.area).exterior.coords)[:-1]
    on_cl = np.abs(ring[:, 0] - centre) < 1e-9
    if not on_cl.any():
        return ring
    start = int(np.argmin(np.where(on_cl, ring[:, 1], np.inf)))
    ring = np.roll(ring, -start, axis=0)
    if abs(ring[1, 0] - centre) < 1e-9:  # walk away from the centreline, not along it
        ring = np.roll(ring[::-1], 1, axis=0)
    out = [ring[0]]
    for p in ring[1:]:
        out.append(p)
        if abs(p[0] - centre) < 1e-9:
            break
    return np.array(out)


def offset_rows(
    piece: FlatPiece, spacing_m: float | None = None
) -> list[tuple[str, list[float | None]]]:
    """The offset table of a piece, measured from its straight baseline (v = 0).

    Panels: at every station tick, (along, up) of the lower edge and of the upper edge;
    with ``spacing_m``, also every ``spacing_m`` along the baseline: the height of each
    edge there.  Ends and frames: the outline's points on the starboard half, (across
    from the centreline, up from the base), from the bottom round to the top.
    Returns rows of (label, values in metres; None where the edge does not reach).
    """
    if spacing_m is not None and not spacing_m > 0:
        raise PanelError("the offset spacing must be positive")
    if not piece.ticks:
        centre = next((float(m.points[0, 0]) for m in piece.marks if m.label == "centreline"), 0.0)
        half = half_outline(piece.outline, centre)
        return [(f"{n + 1}", [float(p[0] - centre), float(p[1])]) for n, p in enumerate(half)]
    rows: list[tuple[str, list[float | None]]] = [
        (t.label, [t.lower[0], t.lower[1], t.upper[0], t.upper[1]]) for t in piece.ticks
    ]
    if spacing_m:
        lower = next(m.points for m in piece.marks if m.role == "edge")
        upper = [m.points for m in piece.marks if m.role == "edge"][1]
        n = int(piece.length_m / spacing_m)
        for k in range(n + 1):
            u = k * spacing_m
            rows.append((f"{u:.3f}", [u, _edge_at(lower, u), u, _edge_at(upper, u)]))
    return rows
