"""The print plate: one landscape sheet the build team works from, as PNG or PDF.

:func:`paint_plate` lays out and paints the whole sheet on any QPainter, in device
pixels, from a design and its analysis; the PNG and the PDF share it.  Sizes are set in
millimetres (lines, spacing) and points (text), converted with the device resolution, so
the sheet reads the same when printed at 100 %.  Only a QGuiApplication is needed
(:func:`render_plate_image` makes one when there is none), so the command line and the
tests render offscreen.

The panels: lines (profile, plan and sections at stated scales with main dimensions and
scale bars), table of offsets, load table, figures, righting-arm curve, safety cautions
and the title block.
"""

from __future__ import annotations

import datetime as _dt
import math
import os
import secrets
from collections.abc import Callable, Iterable, Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np
from PySide6.QtCore import QMarginsF, QPointF, QRectF, Qt
from PySide6.QtGui import (
    QBrush,
    QColor,
    QFont,
    QFontMetricsF,
    QGuiApplication,
    QImage,
    QPageLayout,
    QPageSize,
    QPainter,
    QPainterPath,
    QPdfWriter,
    QPen,
    QPolygonF,
)

from hydro.units import UnitSystem, system
from hydro import aids, heel_checks
from hydro.design import Design, analyse
from hydro.errors import HullwrightError
from hydro.hull import Stations
from hydro.safety import CAUTIONS
from hydro.stability import Analysis

__all__ = [
    "FONT_FAMILY",
    "MIN_TEXT_PT",
    "PAPER_SIZES",
    "PlateLayout",
    "PlateMarks",
    "listed_stations",
    "paint_plate",
    "render_plate_file",
    "render_plate_image",
]

#: Landscape paper sizes (width, height) in millimetres.
PAPER_SIZES: dict[str, tuple[float, float]] = {
    "A4": (297.0, 210.0),
    "A3": (420.0, 297.0),
    "Letter": (279.4, 215.9),
    "Tabloid": (431.8, 279.4),
}
_PAGE_IDS = {
    "A4": QPageSize.PageSizeId.A4,
    "A3": QPageSize.PageSizeId.A3,
    "Letter": QPageSize.PageSizeId.Letter,
    "Tabloid": QPageSize.PageSizeId.Tabloid,
}

FONT_FAMILY = "DejaVu Sans"
#: No text on the plate is smaller than this (points).
MIN_TEXT_PT = 7.0
#: PDF coordinate resolution (device units per inch); the PDF itself is vector.
PDF_RESOLUTION = 600

MM_PER_PT = 25.4 / 72.0
#: 1 kg/m^3 in lb/ft^3.
LB_FT3_PER_KG_M3 = 0.0624279606

INK = QColor(24, 28, 34)
MUTED = QColor(92, 99, 110)
RULE = QColor(170, 176, 186)
HULL = QColor(20, 34, 56)
WATER = QColor(24, 110, 178)
MARK = QColor(186, 64, 24)
BAND = QColor(238, 241, 245)
SHADE = QColor(226, 228, 232)
STRIPE = QColor(246, 247, 249)
PAPER = QColor(255, 255, 255)

#: Largest number of rows in the table of offsets (stations listed).
MAX_OFFSET_ROWS = 21
#: Row limits tried for the table of offsets, most rows first (9 rows at the least).
_OFFSET_ROW_CHOICES = (21, 13, 9)

_METRIC_SCALES = (2, 5, 10, 20, 25, 30, 40, 50, 100, 200)
_IMPERIAL_SCALES = {
    2: "6 in = 1 ft",
    4: "3 in = 1 ft",
    8: "1½ in = 1 ft",
    12: "1 in = 1 ft",
    16: "¾ in = 1 ft",
    24: "½ in = 1 ft",
    32: "⅜ in = 1 ft",
    48: "¼ in = 1 ft",
    96: "⅛ in = 1 ft",
    192: "1/16 in = 1 ft",
}

_Align = Qt.AlignmentFlag
_LEFT = _Align.AlignLeft | _Align.AlignVCenter
_RIGHT = _Align.AlignRight | _Align.AlignVCenter
_CENTRE = _Align.AlignCenter


@dataclass(frozen=True)
class PlateMarks:
    """Optional results of the builder's checks, drawn when present.

    Attributes
    ----------
    crew_shift_heel_deg : static heel when the crew moves to one side (degrees)
    crew_shift_verdict : one line for the reader ("gunwale stays 60 mm clear")
    crew_shift_arm : heeling arm at zero heel (m); the arm curve arm * cos(heel) is drawn
    level_trim_seats : (crew name, seat x in metres) pairs that trim the boat level
    """

    crew_shift_heel_deg: float | None = None
    crew_shift_verdict: str = ""
    crew_shift_arm: float | None = None
    level_trim_seats: tuple[tuple[str, float], ...] = ()

    @classmethod
    def from_any(cls, extras: PlateMarks | Mapping[str, object] | None) -> PlateMarks:
        """Accept a PlateMarks, a mapping of its field names, or None (no marks)."""
        if extras is None:
            return cls()
        if isinstance(extras, PlateMarks):
            return extras
        data = dict(extras)
        if "level_trim_seats" in data and data["level_trim_seats"] is not None:
            data["level_trim_seats"] = tuple(
                (str(n), float(x))
                for n, x in data["level_trim_seats"]  # type: ignore[union-attr]
            )
        return cls(**data)  # type: ignore[arg-type]


@dataclass
class PlateLayout:
    """What :func:`paint_plate` drew: panel rectangles (device pixels) and checks.

    Attributes
    ----------
    panels : name -> rectangle of each panel ("lines", "offsets", "loads", "figures",
        "gz", "cautions", "title")
    smallest_text_pt : the smallest text size used
    ink : union of everything drawn (device pixels)
    scales : "lines" and "sections" -> scale denominator (1:N)
    """

    panels: dict[str, QRectF] = field(default_factory=dict)
    smallest_text_pt: float = math.inf
    ink: QRectF = field(default_factory=QRectF)
    scales: dict[str, int] = field(default_factory=dict)


@dataclass(frozen=True)
class _TypeSizes:
    title: float
    heading: float
    body: float
    small: float
    margin: float  # mm
    gap: float  # mm


_LARGE_SHEET = _TypeSizes(title=15.0, heading=9.5, body=8.5, small=7.5, margin=10.0, gap=5.0)
_SMALL_SHEET = _TypeSizes(title=12.0, heading=8.0, body=7.2, small=7.0, margin=8.0, gap=3.5)


def _type_sizes(page_w_mm: float) -> _TypeSizes:
    return _LARGE_SHEET if page_w_mm > 350.0 else _SMALL_SHEET


# ----------------------------------------------------------------------------- canvas


class _Canvas:
    """A painter that takes millimetres and points, tracks text sizes and ink bounds."""

    def __init__(self, painter: QPainter, origin: QPointF, dpi: float):
        self.painter = painter
        self.origin = origin
        self.k = dpi / 25.4  # device pixels per millimetre
        self.smallest_pt = math.inf
        self.ink = QRectF()
        self._fonts: dict[tuple[float, bool], tuple[QFont, QFontMetricsF]] = {}

    # geometry
    def pt(self, x: float, y: float) -> QPointF:
        return QPointF(self.origin.x() + x * self.k, self.origin.y() + y * self.k)

    def rect(self, x: float, y: float, w: float, h: float) -> QRectF:
        return QRectF(
            self.origin.x() + x * self.k, self.origin.y() + y * self.k, w * self.k, h * self.k
        )

    def _grow(self, r: QRectF) -> None:
        self.ink = r if self.ink.isNull() else self.ink.united(r)

    # fonts
    def font(self, size_pt: float, bold: bool = False) -> tuple[QFont, QFontMetricsF]:
        key = (size_pt, bold)
        if key not in self._fonts:
            f = QFont(FONT_FAMILY)
            f.setPointSizeF(size_pt)
            f.setBold(bold)
            f.setHintingPreference(QFont.HintingPreference.PreferNoHinting)
            f.setKerning(True)
            self._fonts[key] = (f, QFontMetricsF(f, self.painter.device()))
        return self._fonts[key]

    def text_width(self, s: str, size_pt: float, bold: bool = False) -> float:
        """Advance width of ``s`` in millimetres."""
        return self.font(size_pt, bold)[1].horizontalAdvance(s) / self.k

    @staticmethod
    def line_height(size_pt: float) -> float:
        """Line pitch in millimetres for text of ``size_pt``."""
        return size_pt * MM_PER_PT * 1.32

    def elide(self, s: str, size_pt: float, width_mm: float, bold: bool = False) -> str:
        fm = self.font(size_pt, bold)[1]
        return fm.elidedText(s, Qt.TextElideMode.ElideRight, width_mm * self.k)

    def wrap(self, s: str, size_pt: float, width_mm: float, bold: bool = False) -> list[str]:
        """Greedy word wrap of ``s`` to ``width_mm``."""
        lines: list[str] = []
        for para in s.splitlines() or [""]:
            words = para.split()
            line = ""
            for w in words:
                trial = f"{line} {w}" if line else w
                if self.text_width(trial, size_pt, bold) <= width_mm or not line:
                    line = trial
                else:
                    lines.append(line)
                    line = w
            lines.append(line)
        return [self.elide(ln, size_pt, width_mm, bold) for ln in lines]

    def text(
        self,
        x: float,
        y: float,
        w: float,
        h: float,
        s: str,
        size_pt: float,
        align: Qt.AlignmentFlag = _LEFT,
        bold: bool = False,
        color: QColor = INK,
    ) -> None:
        """Draw ``s`` in the box (mm); ink bounds grow by the text's real extent."""
        if not s:
            return
        font = self.font(size_pt, bold)[0]
        self.smallest_pt = min(self.smallest_pt, size_pt)
        p = self.painter
        p.setFont(font)
        p.setPen(color)
        r = self.rect(x, y, w, h)
        p.drawText(r, int(align), s)
        self._grow(p.boundingRect(r, int(align), s))

    def pen(
        self, width_mm: float, color: QColor = INK, style: Qt.PenStyle = Qt.PenStyle.SolidLine
    ) -> QPen:
        pen = QPen(color, max(width_mm * self.k, 0.5))
        pen.setStyle(style)
        pen.setCapStyle(
            Qt.PenCapStyle.FlatCap if style != Qt.PenStyle.SolidLine else Qt.PenCapStyle.RoundCap
        )
        pen.setJoinStyle(Qt.PenJoinStyle.RoundJoin)
        return pen

    def polyline(
        self,
        xs: Iterable[float],
        ys: Iterable[float],
        width_mm: float,
        color: QColor = INK,
        style: Qt.PenStyle = Qt.PenStyle.SolidLine,
    ) -> None:
        poly = QPolygonF([self.pt(x, y) for x, y in zip(xs, ys)])
        if poly.size() < 2:
            return
        self.painter.setPen(self.pen(width_mm, color, style))
        self.painter.setBrush(Qt.BrushStyle.NoBrush)
        self.painter.drawPolyline(poly)
        self._grow(poly.boundingRect())

    def segment(
        self,
        x0: float,
        y0: float,
        x1: float,
        y1: float,
        width_mm: float,
        color: QColor = INK,
        style: Qt.PenStyle = Qt.PenStyle.SolidLine,
    ) -> None:
        self.polyline((x0, x1), (y0, y1), width_mm, color, style)

    def box(
        self,
        x: float,
        y: float,
        w: float,
        h: float,
        width_mm: float = 0.0,
        color: QColor = INK,
        fill: QColor | None = None,
    ) -> None:
        p = self.painter
        p.setPen(self.pen(width_mm, color) if width_mm > 0 else Qt.PenStyle.NoPen)
        p.setBrush(QBrush(fill) if fill is not None else Qt.BrushStyle.NoBrush)
        r = self.rect(x, y, w, h)
        p.drawRect(r)
        self._grow(r)

    def dot(self, x: float, y: float, r_mm: float, color: QColor, hollow: bool = False) -> None:
        p = self.painter
        p.setPen(self.pen(0.3, color))
        p.setBrush(Qt.BrushStyle.NoBrush if hollow else QBrush(color))
        p.drawEllipse(self.pt(x, y), r_mm * self.k, r_mm * self.k)
        self._grow(self.rect(x - r_mm, y - r_mm, 2 * r_mm, 2 * r_mm))

    def arrow_head(
        self, x: float, y: float, dx: float, dy: float, size: float, color: QColor = INK
    ) -> None:
        """A filled arrow head with its tip at (x, y) pointing along (dx, dy)."""
        n = math.hypot(dx, dy) or 1.0
        ux, uy = dx / n, dy / n
        bx, by = x - ux * size, y - uy * size
        w = size * 0.35
        path = QPainterPath(self.pt(x, y))
        path.lineTo(self.pt(bx - uy * w, by + ux * w))
        path.lineTo(self.pt(bx + uy * w, by - ux * w))
        path.closeSubpath()
        self.painter.setPen(Qt.PenStyle.NoPen)
        self.painter.setBrush(QBrush(color))
        self.painter.drawPath(path)


# ----------------------------------------------------------------------------- data


@dataclass(frozen=True)
class _HullLines:
    """Per-station lines of the hull (metres, heights above the base line)."""

    x: np.ndarray
    keel: np.ndarray  # lowest point of each section
    centre: np.ndarray  # height of the first point, on the centreline
    sheer_y: np.ndarray
    sheer_z: np.ndarray
    max_y: np.ndarray
    chines: tuple[tuple[np.ndarray, np.ndarray], ...]  # (y, z) per interior point
    halves: tuple[np.ndarray, ...]  # (y, z above base) per station
    base: float

    @property
    def length(self) -> float:
        return float(self.x[-1] - self.x[0])

    @property
    def beam(self) -> float:
        return 2.0 * float(self.max_y.max())

    @property
    def height(self) -> float:
        return float(max(h[:, 1].max() for h in self.halves))

    @property
    def mid_index(self) -> int:
        return int(np.argmin(np.abs(self.x - (self.x[0] + self.x[-1]) / 2)))


def _hull_lines(stations: Stations) -> _HullLines:
    base = stations.keel_z
    halves = tuple(np.column_stack([h[:, 0], h[:, 1] - base]) for h in stations.half_sections)
    counts = {len(h) for h in halves}
    hard = len(counts) == 1 and counts.pop() <= 6
    chines: tuple[tuple[np.ndarray, np.ndarray], ...] = ()
    if hard:
        n = len(halves[0])
        chines = tuple(
            (np.array([h[j, 0] for h in halves]), np.array([h[j, 1] for h in halves]))
            for j in range(1, n - 1)
        )
    return _HullLines(
        x=stations.x.copy(),
        keel=np.array([h[:, 1].min() for h in halves]),
        centre=np.array([h[0, 1] for h in halves]),
        sheer_y=np.array([h[-1, 0] for h in halves]),
        sheer_z=np.array([h[-1, 1] for h in halves]),
        max_y=np.array([h[:, 0].max() for h in halves]),
        chines=chines,
        halves=halves,
        base=base,
    )


def listed_stations(count: int, max_rows: int = MAX_OFFSET_ROWS) -> list[int]:
    """Indices of the stations listed on the plate: every k-th, first and last always.

    Prefers a step that divides the station count evenly (equal spacing to the end).

    >>> listed_stations(41, 13)
    [0, 4, 8, 12, 16, 20, 24, 28, 32, 36, 40]
    >>> listed_stations(5)
    [0, 1, 2, 3, 4]
    """
    if count <= max_rows:
        return list(range(count))
    spans = count - 1
    step = math.ceil(spans / (max_rows - 1))
    for s in range(step, 2 * step + 1):
        if spans % s == 0:
            return list(range(0, count, s))
    picked = list(range(0, count, step))
    if picked[-1] != spans:
        picked.append(spans)
    return picked


def _waterline_heights(top: float, u: UnitSystem) -> list[float]:
    """Three to five round waterline heights (m) below ``top`` for the offsets table."""
    steps = (
        (10, 20, 25, 50, 75, 100, 150, 200, 250, 500)
        if u.name == "metric"
        else (0.5, 1, 2, 3, 4, 6, 8, 12, 18, 24)
    )
    top_d = u.to_length(top)
    for step in steps:
        n = math.ceil(top_d / step - 1e-9) - 1
        if n <= 5:
            return [u.from_length(step * i) for i in range(1, n + 1)]
    return [u.from_length(steps[-1])]


def _half_breadth_at(half: np.ndarray, z: float) -> float | None:
    """Outermost half-breadth where the half section crosses height ``z``."""
    y, h = half[:, 0], half[:, 1]
    best: float | None = None
    for i in range(len(half) - 1):
        z0, z1 = h[i], h[i + 1]
        if (z0 - z) * (z1 - z) > 0 or z0 == z1:
            continue
        t = (z - z0) / (z1 - z0)
        yi = float(y[i] + t * (y[i + 1] - y[i]))
        best = yi if best is None else max(best, yi)
    return best


@dataclass(frozen=True)
class _Column:
    group: str
    label: str
    values: tuple[float | None, ...]


def _offset_columns(lines: _HullLines, rows: Sequence[int], u: UnitSystem) -> list[_Column]:
    """Columns of the table of offsets, in metres (None where the line does not exist)."""

    def pick(values: np.ndarray) -> tuple[float, ...]:
        return tuple(float(values[i]) for i in rows)

    above_keel = bool(np.any(lines.centre - lines.keel > 1e-6))
    cols = [_Column("CL" if above_keel else "Keel", "height", pick(lines.centre))]
    if lines.chines:
        for j, (cy, cz) in enumerate(lines.chines, start=1):
            name = "Chine" if len(lines.chines) == 1 else f"Chine {j}"
            cols += [_Column(name, "half-br.", pick(cy)), _Column(name, "height", pick(cz))]
    cols += [
        _Column("Sheer", "half-br.", pick(lines.sheer_y)),
        _Column("Sheer", "height", pick(lines.sheer_z)),
    ]
    if not lines.chines:
        for wl in _waterline_heights(float(lines.sheer_z.min()), u):
            label = f"WL {round(u.to_length(wl), 2):g}"
            vals = tuple(_half_breadth_at(lines.halves[i], wl) for i in rows)
            cols.append(_Column("Half-breadth at waterline", label, vals))
    return cols


def _deg(v: float | None, digits: int = 1) -> str:
    return "—" if v is None or not math.isfinite(v) else f"{v:.{digits}f}°"


def _figures(a: Analysis, u: UnitSystem, marks: PlateMarks) -> list[tuple[str, str]]:
    """(label, value) rows of the figures panel."""
    L = u.length_text
    h, c = a.hydrostatics, a.curve
    rows: list[tuple[str, str]] = [("Displacement", u.mass_text(a.weights.mass))]
    if h is None:
        return rows + [("Hydrostatics", "none: the hull cannot carry the load")]
    trim_len = L(abs(h.trim))
    if abs(h.trim_deg) < 0.05:
        trim = "level"
    else:
        trim = f"{abs(h.trim_deg):.2f}° {'bow' if h.trim_deg > 0 else 'stern'} down ({trim_len})"
    gm_word = "positive" if h.gm > 0 else "NEGATIVE: will not stay upright"
    rows += [
        (
            "Draft aft / mid / fore",
            f"{L(h.draft_aft, False)} / {L(h.draft_mid, False)} / {L(h.draft_fore)}",
        ),
        ("Trim", trim),
        ("Least freeboard", f"{L(h.min_freeboard)} at x {L(h.min_freeboard_x)}"),
        ("KB / BM", f"{L(h.kb, False)} / {L(h.bm)}"),
        ("KM / KG", f"{L(h.km, False)} / {L(h.kg)}"),
        ("GM", f"{L(h.gm)}  ({gm_word})"),
    ]
    if h.fsc > 0:
        rows.append(("GM solid / free-surface corr.", f"{L(h.gm_solid, False)} / {L(h.fsc)}"))
    if c is not None:
        last = float(c.heel_deg[-1])
        gw = c.gunwale_immersion_deg
        rows.append(
            (
                "Heel at gunwale immersion",
                f"not reached by {last:.0f}°"
                if gw is None
                else ("upright: floods" if gw <= 0 else _deg(gw)),
            )
        )
        rows.append(("Max GZ", f"{L(c.max_gz)} at {c.max_gz_deg:.0f}°"))
        if c.loll_deg is not None:
            rows.append(("Angle of loll", _deg(c.loll_deg)))
        start = c.loll_deg or 0.0
        rng = (
            f"{start:.0f}° to beyond {last:.0f}°"
            if c.avs_deg is None
            else ("none" if c.avs_deg <= start else f"{start:.0f}° to {c.avs_deg:.1f}°")
        )
        rows.append(("Range of positive GZ", rng))
    if marks.crew_shift_heel_deg is not None:
        verdict = f" - {marks.crew_shift_verdict}" if marks.crew_shift_verdict else ""
        rows.append(("Crew shift heel", f"{_deg(marks.crew_shift_heel_deg)}{verdict}"))
    elif marks.crew_shift_verdict:
        rows.append(("Crew shift", marks.crew_shift_verdict))
    for name, x in marks.level_trim_seats:
        rows.append((f"Level trim: {name}", f"seat at x {L(x)}"))
    return rows


def _ordinal(n: int) -> str:
    """1st, 2nd, 3rd, 4th ... 11th, 12th, 13th, 21st ..."""
    if 10 <= n % 100 <= 20:
        return f"{n}th"
    suffix = {1: "st", 2: "nd", 3: "rd"}.get(n % 10, "th")
    return f"{n}{suffix}"


def _nice_step(span: float, target: int) -> float:
    """A 1-2-2.5-5 step that cuts ``span`` into about ``target`` parts."""
    raw = span / max(target, 1)
    if raw <= 0:
        return 1.0
    mag = 10 ** math.floor(math.log10(raw))
    for m in (1, 2, 2.5, 5, 10):
        if m * mag >= raw:
            return m * mag
    return 10 * mag


def _scale_label(den: int, u: UnitSystem) -> str:
    if u.name == "imperial" and den in _IMPERIAL_SCALES:
        return f"1:{den} ({_IMPERIAL_SCALES[den]})"
    return f"1:{den}"


def _paper_name(w_mm: float, h_mm: float) -> str:
    for name, (pw, ph) in PAPER_SIZES.items():
        if abs(pw - w_mm) < 1.0 and abs(ph - h_mm) < 1.0:
            return name
    return f"{w_mm:.0f} × {h_mm:.0f} mm"


# ----------------------------------------------------------------------------- panels


def _dense(
    xs: Sequence[float], ys: Sequence[float], step: float = 0.8
) -> list[tuple[float, float]]:
    """Points along a polyline no more than ``step`` mm apart (for label collisions)."""
    out: list[tuple[float, float]] = []
    for (xa, ya), (xb, yb) in zip(zip(xs, ys), list(zip(xs, ys))[1:]):
        n = max(1, int(math.hypot(xb - xa, yb - ya) / step))
        out += [(xa + (xb - xa) * k / n, ya + (yb - ya) * k / n) for k in range(n)]
    if len(xs):
        out.append((xs[-1], ys[-1]))
    return out


class _Labels:
    """Puts small labels (mm rectangles) where they overlap no other label or line."""

    def __init__(self) -> None:
        self.taken: list[QRectF] = []
        self.points: list[tuple[float, float]] = []

    def avoid(self, rect: QRectF | None = None, points: Iterable[tuple[float, float]] = ()) -> None:
        if rect is not None:
            self.taken.append(rect)
        self.points += list(points)

    def free(self, r: QRectF) -> bool:
        if any(r.intersects(o) for o in self.taken):
            return False
        return not any(r.contains(QPointF(px, py)) for px, py in self.points)

    def place(self, candidates: Sequence[QRectF]) -> QRectF:
        """The first free candidate (or the first one when none is free), now taken."""
        pick = next((r for r in candidates if self.free(r)), candidates[0])
        self.taken.append(pick)
        return pick


@dataclass(frozen=True)
class _LinesPlan:
    den: int  # lines scale 1:den
    den_b: int  # sections scale 1:den_b
    height: float  # mm the panel needs
    stacked: bool  # sections and dimensions below profile and plan (else beside them)


class _Sheet:
    """Lays out and paints every panel of one plate on a canvas (all sizes in mm)."""

    def __init__(
        self,
        canvas: _Canvas,
        page_mm: tuple[float, float],
        design: Design,
        analysis: Analysis,
        units: UnitSystem,
        source: str,
        marks: PlateMarks,
    ):
        self.c = canvas
        self.w, self.h = page_mm
        self.t = _type_sizes(self.w)
        self.design = design
        self.a = analysis
        self.u = units
        self.source = source
        self.marks = marks
        self.lines = _hull_lines(design.stations())
        self.layout = PlateLayout()
        self.lh_small = canvas.line_height(self.t.small)
        self.lh_body = canvas.line_height(self.t.body)
        self.head_h = canvas.line_height(self.t.heading) + 2.0

    # shared pieces --------------------------------------------------------------------
    def heading(self, x: float, y: float, w: float, title: str, aside: str = "") -> float:
        """Panel heading with a rule under it; returns the y where content starts."""
        c, t = self.c, self.t
        lh = c.line_height(t.heading)
        c.text(x, y, w, lh, title.upper(), t.heading, bold=True, color=HULL)
        if aside:
            tw = c.text_width(title.upper(), t.heading, True) + 4.0
            c.text(
                x + tw,
                y,
                w - tw,
                lh,
                c.elide(aside, t.small, w - tw),
                t.small,
                align=_RIGHT,
                color=MUTED,
            )
        c.segment(x, y + lh + 0.6, x + w, y + lh + 0.6, 0.35, HULL)
        return y + self.head_h

    def panel(self, name: str, x: float, y: float, w: float, h: float) -> None:
        self.layout.panels[name] = self.c.rect(x, y, w, h)

    # layout ---------------------------------------------------------------------------
    def paint(self) -> PlateLayout:
        t = self.t
        m, g = t.margin, t.gap
        cw, ch = self.w - 2 * m, self.h - 2 * m
        self.c.box(m - 2.0, m - 2.0, cw + 4.0, ch + 4.0, 0.5, HULL)
        columns, size = self._caution_columns(cw)
        strip_h = self.head_h + max(self._caution_height(col, size) for col in columns)
        body_h = ch - strip_h - g
        left_w = cw * 0.60
        self._paint_left(m, m, left_w, body_h)
        self._paint_right(m + left_w + g, m, cw - left_w - g, body_h)
        self.paint_cautions(m, m + body_h + g, cw, strip_h, columns, size)
        self.layout.smallest_text_pt = self.c.smallest_pt
        self.layout.ink = self.c.ink
        return self.layout

    def _paint_left(self, x: float, y: float, w: float, h: float) -> None:
        """Lines, offsets and loads.  Every load item is listed; the lines get the
        largest scale that leaves room, and the offsets table as many stations as fit."""
        g = self.t.gap
        loads_need = self._loads_height(len(self.a.weights.lines))
        best: tuple[tuple[bool, bool, int, int], list[int], _LinesPlan] | None = None
        for max_rows in _OFFSET_ROW_CHOICES:
            rows = listed_stations(self.lines.x.size, max_rows)
            off_h = self._offsets_height(len(rows))
            budget = min(max(h - off_h - loads_need - 2 * g, h * 0.3), h * 0.65)
            plan = self._plan_lines(w, budget)
            overflow = plan.height + off_h + loads_need + 2 * g > h + 1e-6
            # everything fits; 11 stations or more; the largest scale; the most stations
            key = (overflow, len(rows) < 11, plan.den, -len(rows))
            if best is None or key < best[0]:
                best = (key, rows, plan)
        assert best is not None
        _, rows, plan = best
        off_h = self._offsets_height(len(rows))
        lines_h = max(plan.height, h - off_h - loads_need - 2 * g)
        self.paint_lines(x, y, w, lines_h, plan, rows)
        self.paint_offsets(x, y + lines_h + g, w, off_h, rows)
        self.paint_loads(x, y + lines_h + off_h + 2 * g, w, h - lines_h - off_h - 2 * g)

    def _paint_right(self, x: float, y: float, w: float, h: float) -> None:
        g = self.t.gap
        title_h = self._title_height(w)
        fig_size = self.t.body
        fig_h = self._figures_height(w, fig_size)
        if h - title_h - fig_h - 2 * g < h * 0.36:
            fig_size = self.t.small
            fig_h = self._figures_height(w, fig_size)
        gz_h = h - title_h - fig_h - 2 * g
        self.paint_gz(x, y, w, gz_h)
        self.paint_figures(x, y + gz_h + g, w, fig_h, fig_size)
        self.paint_title(x, y + gz_h + fig_h + 2 * g, w, title_h)

    # lines ----------------------------------------------------------------------------
    def _profile_top(self) -> float:
        """Highest point the profile must show: sheer, crew and G (m above base)."""
        w = self.a.weights
        crew = [ln.z - self.lines.base for ln in w.lines if ln.kind == "crew"]
        return max([self.lines.height, w.vcg - self.lines.base] + crew) + 0.02

    def _dim_width(self) -> float:
        c, t, u = self.c, self.t, self.u
        texts = [f"D {u.length_text(self.lines.height)}", f"B {u.length_text(self.lines.beam)}"]
        return max(c.text_width(s, t.small) for s in texts) + 14.0

    def _info_height(self, two_bars: bool) -> float:
        return self.lh_body * 5.6 + self.lh_small * (6.4 if two_bars else 3.2)

    def _plan_lines(self, w: float, budget: float) -> _LinesPlan:
        """Largest standard scales at which the views fit ``w`` x ``budget``: sections
        and main dimensions beside profile and plan, or below them when that gives a
        larger scale."""
        hl, lh = self.lines, self.lh_small
        scales = _METRIC_SCALES if self.u.name == "metric" else tuple(_IMPERIAL_SCALES)
        L, B, Dp, D = hl.length, hl.beam, self._profile_top(), hl.height
        fixed = self.head_h + 3.3 * lh + 6.5
        dim_w = self._dim_width()
        sec_fixed = 4.0 * lh

        def views_h(d: int) -> float:
            return (Dp + B) * 1000 / d + fixed

        def sections(width: float, room: float, den: int) -> int | None:
            return next(
                (
                    d
                    for d in scales
                    if B * 1000 / d + 12.0 <= width
                    and D * 1000 / d + sec_fixed + self._info_height(d != den) <= room
                ),
                None,
            )

        # beside: a column of at least 52 mm right of the views
        side_min = max(52.0, w * 0.22)
        beside = scales[-1], scales[-1]
        for d in scales:
            room = budget - self.head_h
            if views_h(d) <= budget and L * 1000 / d + dim_w + side_min <= w:
                db = sections(w - L * 1000 / d - dim_w, room, d)
                if db is not None:
                    beside = d, db
                    break
        # stacked: sections (left half) and dimensions (right half) below the views
        stacked: tuple[int, int] | None = None
        for d in scales:
            room = budget - views_h(d) - 2.0
            if d >= beside[0] or L * 1000 / d + dim_w > w:
                continue
            db = next(
                (
                    db
                    for db in scales
                    if B * 1000 / db + 12.0 <= w * 0.45
                    and D * 1000 / db + sec_fixed <= room
                    and self._info_height(db != d) <= room
                ),
                None,
            )
            if db is not None:
                stacked = d, db
                break
        if stacked is not None:
            d, db = stacked
            lower = max(D * 1000 / db + sec_fixed, self._info_height(db != d))
            return _LinesPlan(d, db, views_h(d) + 2.0 + lower, True)
        d, db = beside
        side_h = self.head_h + D * 1000 / db + sec_fixed + self._info_height(db != d)
        return _LinesPlan(d, db, max(views_h(d), side_h), False)

    def paint_lines(
        self, x: float, y: float, w: float, h: float, plan: _LinesPlan, rows: Sequence[int]
    ) -> None:
        self.panel("lines", x, y, w, h)
        c, t, u, hl = self.c, self.t, self.u, self.lines
        lh = self.lh_small
        den, den_b = plan.den, plan.den_b
        self.layout.scales = {"lines": den, "sections": den_b}
        sheet = f"on {_paper_name(self.w, self.h)} at 100 %"
        if den == den_b:
            aside = f"scale {_scale_label(den, u)} {sheet}"
        else:
            aside = f"profile and plan {_scale_label(den, u)}, sections {_scale_label(den_b, u)} {sheet}"
        top = self.heading(x, y, w, "Lines", aside)
        top += max(0.0, (h - plan.height) / 2)  # centre the drawing in spare room
        s = 1000.0 / den
        L, B, Dp = hl.length, hl.beam, self._profile_top()
        x_left = x + 1.0

        def X(xm: float) -> float:
            return x_left + (xm - hl.x[0]) * s

        labels = _Labels()
        caption = "PROFILE above, PLAN below, bow to the right"
        cap_w = L * s + self._dim_width() - 2.0
        c.text(
            x_left,
            top,
            cap_w,
            lh,
            c.elide(caption, t.small, cap_w, True),
            t.small,
            bold=True,
            color=MUTED,
        )
        prof_base = top + lh * 1.8 + 0.8 + Dp * s  # a free line above for labels
        num_y = prof_base + 0.8

        def Zp(zm: float) -> float:
            return prof_base - zm * s

        # station numbers, thinned out where they would touch
        gap_mm = float(np.min(np.diff(hl.x[list(rows)]))) * s if len(rows) > 1 else w
        every = 1 if gap_mm >= c.text_width(str(len(rows) - 1), t.small) + 1.5 else 2
        for n, i in enumerate(rows):
            c.segment(X(hl.x[i]), Zp(hl.keel[i]), X(hl.x[i]), Zp(hl.sheer_z[i]), 0.18, RULE)
            if n % every == 0 or n == len(rows) - 1 and every == 1:
                c.text(X(hl.x[i]) - 5, num_y, 10, lh, str(n), t.small, align=_CENTRE, color=MUTED)
        c.segment(
            X(hl.x[0]) - 2, prof_base, X(hl.x[-1]) + 2, prof_base, 0.18, MUTED, Qt.PenStyle.DashLine
        )
        xs = [X(v) for v in hl.x]
        for _, cz in hl.chines:
            c.polyline(xs, [Zp(v) for v in cz], 0.25, HULL)
        for line in (hl.keel, hl.sheer_z):
            zs = [Zp(v) for v in line]
            c.polyline(xs, zs, 0.5, HULL)
            labels.avoid(points=_dense(xs, zs))
        for i in (0, -1):
            c.segment(xs[i], Zp(hl.keel[i]), xs[i], Zp(hl.sheer_z[i]), 0.5, HULL)
        hs = self.a.hydrostatics
        x_end = X(hl.x[-1])
        if hs is not None:

            def wl(xm: float) -> float:
                return hs.h + hs.tau * xm - hl.base

            run = 2.0 / s
            c.segment(
                X(hl.x[0]) - 2,
                Zp(wl(hl.x[0] - run)),
                x_end + 2,
                Zp(wl(hl.x[-1] + run)),
                0.35,
                WATER,
            )
            c.text(x_end + 2.5, Zp(wl(hl.x[-1])) - lh / 2, 9, lh, "DWL", t.small, color=WATER)
        self._mark_loads(X, Zp, labels)
        mid = hl.mid_index
        self._dim_vertical(
            x_end + 11.0,
            Zp(hl.keel[mid]),
            Zp(hl.sheer_z[mid]),
            f"D {u.length_text(hl.sheer_z[mid] - hl.keel[mid])}",
            "amidships",
        )
        # plan
        plan_mid = num_y + lh + 0.8 + B / 2 * s

        def Yp(ym: float) -> float:
            return plan_mid + ym * s

        for i in rows:
            c.segment(X(hl.x[i]), Yp(-hl.max_y[i]), X(hl.x[i]), Yp(hl.max_y[i]), 0.18, RULE)
        c.segment(
            X(hl.x[0]) - 3, plan_mid, x_end + 3, plan_mid, 0.18, MUTED, Qt.PenStyle.DashDotLine
        )
        for side in (-1.0, 1.0):
            for cy, _ in hl.chines:
                c.polyline(xs, [Yp(side * v) for v in cy], 0.25, HULL)
            c.polyline(xs, [Yp(side * v) for v in hl.sheer_y], 0.5, HULL)
            if np.any(hl.max_y - hl.sheer_y > 1e-4):
                c.polyline(xs, [Yp(side * v) for v in hl.max_y], 0.3, HULL, Qt.PenStyle.DashLine)
        for i in (0, -1):
            c.segment(xs[i], Yp(-hl.sheer_y[i]), xs[i], Yp(hl.sheer_y[i]), 0.5, HULL)
        self._dim_vertical(x_end + 11.0, Yp(-B / 2), Yp(B / 2), f"B {u.length_text(B)}")
        self._dim_horizontal(X(hl.x[0]), x_end, Yp(B / 2) + 3.0, f"L {u.length_text(L)}")
        # sections and main dimensions: below the views, or to their right
        if plan.stacked:
            low = Yp(B / 2) + 3.0 + lh * 0.5 + 2.0
            self._paint_body_plan(x, low, w * 0.45, 1000.0 / den_b, rows)
            self._paint_main_dims(x + w * 0.5, low, w * 0.5, rows, den, den_b)
        else:
            bx = x + L * s + self._dim_width() + 2.0
            bw = x + w - bx
            sec_bottom = self._paint_body_plan(bx, top, bw, 1000.0 / den_b, rows)
            self._paint_main_dims(bx, sec_bottom + lh, bw, rows, den, den_b)

    def _mark_loads(
        self, X: Callable[[float], float], Zp: Callable[[float], float], labels: _Labels
    ) -> None:
        """Crew (numbered as in the load table), G, and level-trim seats on the profile."""
        c, t = self.c, self.t
        lh = self.lh_small
        base = self.lines.base
        w = self.a.weights
        gx, gz = X(w.lcg), Zp(w.vcg - base)
        marks: list[tuple[float, float, str, QColor]] = []
        seats: dict[str, tuple[float, float, str]] = {}
        for n, ln in enumerate(w.lines, start=1):
            if ln.kind == "crew":
                marks.append((X(ln.x), Zp(ln.z - base), str(n), HULL))
                seats[ln.name] = (X(ln.x), Zp(ln.z - base), str(n))
        for name, sx in self.marks.level_trim_seats:
            px, pz, number = seats.get(name, (X(w.lcg), Zp(w.vcg - base), ""))
            lx = X(sx)
            if abs(lx - px) > 2.5:  # show the move from the present seat
                c.segment(
                    px, pz, lx - math.copysign(1.6, lx - px), pz, 0.25, MARK, Qt.PenStyle.DashLine
                )
                c.arrow_head(lx - math.copysign(1.3, lx - px), pz, lx - px, 0.0, 1.4, MARK)
                labels.avoid(QRectF(min(px, lx), pz - 0.5, abs(lx - px), 1.0))
            marks.append((lx, pz, f"{number} level".strip(), MARK))
        below_first = {text for _, _, text, color in marks if color == MARK}
        for px, pz, _, _ in marks:
            labels.avoid(QRectF(px - 1.3, pz - 1.3, 2.6, 2.6))
        labels.avoid(QRectF(gx - 2.0, gz - 2.0, 4.0, 4.0))
        for px, pz, text, color in marks:
            c.dot(px, pz, 1.1, color, hollow=color == MARK)
        c.dot(gx, gz, 1.3, PAPER)
        c.dot(gx, gz, 1.3, MARK, hollow=True)
        c.segment(gx - 1.9, gz, gx + 1.9, gz, 0.25, MARK)
        c.segment(gx, gz - 1.9, gx, gz + 1.9, 0.25, MARK)
        for px, pz, text, color in [*marks, (gx, gz, "G", MARK)]:
            tw = c.text_width(text, t.small, True) + 0.6
            spots = [
                QRectF(px + 1.8, pz - lh / 2, tw, lh),
                QRectF(px - 1.8 - tw, pz - lh / 2, tw, lh),
                QRectF(px - tw / 2, pz - 1.6 - lh, tw, lh),
                QRectF(px - tw / 2, pz + 1.6, tw, lh),
                QRectF(px + 1.4, pz - 1.2 - lh, tw, lh),
                QRectF(px + 1.4, pz + 1.2, tw, lh),
            ]
            if text in below_first:
                spots.insert(0, spots.pop(3))
            r = labels.place(spots)
            c.text(
                r.x(), r.y(), r.width(), lh, text, t.small, align=_CENTRE, bold=True, color=color
            )

    def _dim_vertical(
        self, x: float, y_top: float, y_bot: float, label: str, note: str = ""
    ) -> None:
        c, t = self.c, self.t
        lo, hi = max(y_top, y_bot), min(y_top, y_bot)
        c.segment(x, hi, x, lo, 0.2)
        c.arrow_head(x, hi, 0, -1, 1.6)
        c.arrow_head(x, lo, 0, 1, 1.6)
        c.segment(x - 1.5, hi, x + 1.5, hi, 0.2)
        c.segment(x - 1.5, lo, x + 1.5, lo, 0.2)
        lh = self.lh_small
        top = (hi + lo) / 2 - (lh if note else lh / 2)
        c.text(x + 1.5, top, 40, lh, label, t.small)
        c.text(x + 1.5, top + lh, 40, lh, note, t.small, color=MUTED)

    def _dim_horizontal(self, x_a: float, x_b: float, y: float, label: str) -> None:
        c, t = self.c, self.t
        lh = self.lh_small
        c.segment(x_a, y - 2.0, x_a, y + 1.2, 0.2)
        c.segment(x_b, y - 2.0, x_b, y + 1.2, 0.2)
        c.segment(x_a, y, x_b, y, 0.2)
        c.arrow_head(x_a, y, -1, 0, 1.6)
        c.arrow_head(x_b, y, 1, 0, 1.6)
        tw = c.text_width(label, t.small) + 3.0
        cx = (x_a + x_b) / 2
        c.box(cx - tw / 2, y - lh / 2, tw, lh, fill=PAPER)
        c.text(cx - tw / 2, y - lh / 2, tw, lh, label, t.small, align=_CENTRE)

    def _paint_body_plan(
        self, x: float, y: float, w: float, s_body: float, rows: Sequence[int]
    ) -> float:
        """Sections: aft half on the left, fore half on the right.  Returns the bottom y."""
        c, t, hl = self.c, self.t, self.lines
        lh = self.lh_small
        labels = _Labels()
        for k, (text, bold) in enumerate(
            (
                ("SECTIONS  (looking forward)", True),
                ("aft stations left, fore stations right", False),
            )
        ):
            c.text(x, y + k * lh, w, lh, text, t.small, bold=bold, color=MUTED)
            labels.avoid(QRectF(x, y + k * lh, c.text_width(text, t.small, bold), lh))
        half_w = hl.beam / 2 * s_body
        cx = x + max(half_w + 6.0, min(w / 2, half_w + 20.0))
        base_y = y + lh * 3 + hl.height * s_body
        c.segment(
            cx - half_w - 2, base_y, cx + half_w + 2, base_y, 0.18, MUTED, Qt.PenStyle.DashLine
        )
        c.segment(
            cx,
            base_y + 1.5,
            cx,
            base_y - hl.height * s_body - 1.5,
            0.18,
            MUTED,
            Qt.PenStyle.DashDotLine,
        )
        hs = self.a.hydrostatics
        if hs is not None:
            wy = base_y - (hs.h + hs.tau * hl.x[hl.mid_index] - hl.base) * s_body
            c.segment(cx - half_w - 2, wy, cx + half_w + 2, wy, 0.3, WATER)
        mid_x = (hl.x[0] + hl.x[-1]) / 2
        ends: list[tuple[float, float, float, str]] = []
        thin = 2 if len(rows) > 13 else 1  # keep the sections view readable
        for n, i in enumerate(rows):
            if n % thin and n != len(rows) - 1:
                continue
            half = hl.halves[i]
            for side in (-1.0, 1.0):
                if (side < 0 and hl.x[i] > mid_x + 1e-9) or (side > 0 and hl.x[i] < mid_x - 1e-9):
                    continue
                px = [cx + side * v * s_body for v in half[:, 0]]
                py = [base_y - v * s_body for v in half[:, 1]]
                c.polyline(px, py, 0.3, HULL)
                labels.avoid(points=_dense(px, py))
                if half[-1, 0] > 1e-6:
                    ends.append((px[-1], py[-1], side, str(n)))
        for gx, gy, side, text in ends:
            tw = c.text_width(text, t.small) + 0.6
            lx = gx + 0.8 if side > 0 else gx - 0.8 - tw
            cands = [
                QRectF(lx, gy - lh, tw, lh),
                QRectF(lx, gy - lh * 2, tw, lh),
                QRectF(lx + side * tw, gy - lh, tw, lh),
            ]
            free = [r for r in cands if labels.free(r)]
            if free:
                r = labels.place(free)
                c.text(r.x(), r.y(), r.width(), lh, text, t.small, align=_CENTRE, color=MUTED)
        return base_y

    def _paint_main_dims(
        self, x: float, y: float, w: float, rows: Sequence[int], den: int, den_b: int
    ) -> None:
        c, t, u, hl = self.c, self.t, self.u, self.lines
        lh = self.lh_body
        mid = hl.mid_index
        gaps = np.diff(hl.x[list(rows)])
        spacing = (
            u.length_text(float(gaps[0]))
            if np.ptp(gaps) < 1e-6
            else f"{u.length_text(float(gaps.min()))} to {u.length_text(float(gaps.max()))}"
        )
        keel_low = float(hl.keel.min())
        depth = u.length_text(float(hl.sheer_z[mid] - hl.keel[mid]))
        items = [
            (
                "L × B × D",
                f"{u.length_text(hl.length, False)} × {u.length_text(hl.beam, False)} × {depth}",
            ),
            ("Station spacing", spacing),
            (
                "Keel rocker",
                (
                    f"aft {u.length_text(float(hl.keel[0]) - keel_low, unit=False)}, "
                    f"fore {u.length_text(float(hl.keel[-1]) - keel_low)}"
                ),
            ),
        ]
        hs = self.a.hydrostatics
        if hs is not None:
            items.append(("DWL draft", f"{u.length_text(hs.draft_mid)} amidships"))
        label_w = max(c.text_width(k, t.body, True) for k, _ in items) + 2.5
        for k, v in items:
            c.text(x, y, label_w, lh, k, t.body, bold=True)
            for ln in c.wrap(v, t.body, w - label_w)[:2]:
                c.text(x + label_w, y, w - label_w, lh, ln, t.body)
                y += lh
        y += lh * 0.6
        self._scale_bar(x, y, w, den, "profile and plan" if den != den_b else "all views")
        if den_b != den:
            self._scale_bar(x, y + self.lh_small * 3.2, w, den_b, "sections")

    def _scale_bar(self, x: float, y: float, w: float, den: int, what: str) -> None:
        """Alternate dark and light blocks of a round length, labelled in display units."""
        c, t, u = self.c, self.t, self.u
        lh = self.lh_small
        per_mm = den / 1000.0 * u.length_factor  # display units per paper millimetre
        bar_len = min(w - 14.0, 70.0)
        steps = (
            (1, 2, 3, 6, 12, 24, 36, 60, 120, 240)
            if u.name == "imperial"
            else (10, 20, 50, 100, 200, 250, 500, 1000, 2000, 5000, 10000)
        )
        step = next((float(v) for v in steps if bar_len * per_mm / v <= 4.0), float(steps[-1]))
        n = max(1, int(bar_len * per_mm // step))
        seg = step / per_mm
        c.text(x, y, w, lh, f"{what} 1:{den}", t.small, color=MUTED)
        by = y + lh + 0.3
        for i in range(n):
            c.box(x + i * seg, by, seg, 1.4, 0.2, INK, INK if i % 2 == 0 else PAPER)
        for i in range(n + 1):
            label = f"{step * i:g}" + (f" {u.length}" if i == n else "")
            tw = c.text_width(label, t.small) + 0.5
            lx = x if i == 0 else x + i * seg - (c.text_width(f"{step * i:g}", t.small) / 2)
            c.text(lx, by + 1.6, tw, lh, label, t.small)

    # offsets --------------------------------------------------------------------------
    def _offsets_height(self, rows: int) -> float:
        return self.head_h + self.lh_body * (rows + 2) + 1.0

    def paint_offsets(self, x: float, y: float, w: float, h: float, rows: Sequence[int]) -> None:
        self.panel("offsets", x, y, w, h)
        c, t, u, hl = self.c, self.t, self.u, self.lines
        step = rows[1] - rows[0] if len(rows) > 1 else 1
        which = (
            f"all {hl.x.size} stations"
            if step == 1
            else f"every {_ordinal(step)} of {hl.x.size} stations"
        )
        aside = (
            f"{u.length}; half-breadths from the centreline, heights above the base line; {which}"
        )
        top = self.heading(x, y, w, "Table of offsets", aside)
        cols = [
            _Column("Station", "no.", tuple(float(n) for n in range(len(rows)))),
            _Column("Station", "x from aft", tuple(float(hl.x[i] - hl.x[0]) for i in rows)),
        ]
        cols += _offset_columns(hl, rows, u)
        size, lh = t.body, self.lh_body
        col_w = w / len(cols)
        groups: list[tuple[str, int, int]] = []
        for j, col in enumerate(cols):
            if groups and groups[-1][0] == col.group:
                groups[-1] = (col.group, groups[-1][1], j)
            else:
                groups.append((col.group, j, j))
        c.box(x, top, w, lh * 2, fill=BAND)
        for name, j0, j1 in groups:
            gx, gw = x + j0 * col_w, (j1 - j0 + 1) * col_w
            c.text(
                gx, top, gw, lh, c.elide(name, size, gw - 1, True), size, align=_CENTRE, bold=True
            )
            if j0:
                c.segment(gx, top, gx, top + lh * (2 + len(rows)), 0.2, RULE)
        for j, col in enumerate(cols):
            c.text(
                x + j * col_w,
                top + lh,
                col_w,
                lh,
                c.elide(col.label, size, col_w - 1),
                size,
                align=_CENTRE,
                color=MUTED,
            )
        yy = top + lh * 2
        for r in range(len(rows)):
            if r % 2 == 1:
                c.box(x, yy, w, lh, fill=STRIPE)
            for j, col in enumerate(cols):
                v = col.values[r]
                text = (
                    "—" if v is None else (str(int(v)) if j == 0 else u.length_text(v, unit=False))
                )
                c.text(x + j * col_w, yy, col_w - 2.5, lh, text, size, align=_RIGHT, bold=(j == 0))
            yy += lh
        c.segment(x, yy, x + w, yy, 0.3, HULL)

    # loads ----------------------------------------------------------------------------
    def _loads_height(self, items: int) -> float:
        return self.head_h + self.lh_body * (items + 2.2)

    def paint_loads(self, x: float, y: float, w: float, h: float) -> None:
        self.panel("loads", x, y, w, h)
        c, t, u = self.c, self.t, self.u
        wt = self.a.weights
        base = self.lines.base
        aside = (
            f"mass in {u.mass}; x from aft, y to starboard, z above the base line, in {u.length}"
        )
        top = self.heading(x, y, w, "Load table", aside)
        size, lh = t.body, self.lh_body
        num_w = c.text_width("99", size, True) + 3.0
        val_w = c.text_width("-00000.00", size) + 3.0
        kind_w = c.text_width("material", size) + 4.0
        name_w = w - num_w - kind_w - 4 * val_w
        widths = [num_w, name_w, kind_w, val_w, val_w, val_w, val_w]
        aligns = [_RIGHT, _LEFT, _LEFT, _RIGHT, _RIGHT, _RIGHT, _RIGHT]
        room = int((y + h - top) / lh - 2.2 + 1e-6)
        lines = list(wt.lines)
        shown = lines if len(lines) <= room else lines[: max(room - 1, 0)]

        def row(yy: float, cells: Sequence[str], bold: bool = False, color: QColor = INK) -> None:
            xx = x
            for cell, cw_, al in zip(cells, widths, aligns):
                c.text(
                    xx + 1.5,
                    yy,
                    cw_ - 3.0,
                    lh,
                    c.elide(cell, size, cw_ - 3.0, bold),
                    size,
                    align=al,
                    bold=bold,
                    color=color,
                )
                xx += cw_

        c.box(x, top, w, lh, fill=BAND)
        row(top, ["#", "item", "kind", "mass", "x", "y", "z"], bold=True)
        yy = top + lh
        for n, ln in enumerate(shown, start=1):
            if n % 2 == 0:
                c.box(x, yy, w, lh, fill=STRIPE)
            row(
                yy,
                [
                    str(n),
                    ln.name,
                    ln.kind,
                    u.mass_text(ln.mass, False),
                    u.length_text(ln.x, False),
                    u.length_text(ln.y, False),
                    u.length_text(ln.z - base, False),
                ],
            )
            yy += lh
        if len(shown) < len(lines):
            rest = lines[len(shown) :]
            row(
                yy,
                [
                    "",
                    f"… and {len(rest)} more (included in the total)",
                    "",
                    u.mass_text(sum(r.mass for r in rest), False),
                    "",
                    "",
                    "",
                ],
                color=MUTED,
            )
            yy += lh
        c.segment(x, yy, x + w, yy, 0.3, HULL)
        row(
            yy,
            [
                "",
                "Total, and the centre of gravity: LCG, TCG, KG",
                "",
                u.mass_text(wt.mass, False),
                u.length_text(wt.lcg, False),
                u.length_text(wt.tcg, False),
                u.length_text(wt.kg, False),
            ],
            bold=True,
        )

    # figures --------------------------------------------------------------------------
    def _figures_height(self, w: float, size: float) -> float:
        lh = self.c.line_height(size)
        msg = self.c.wrap(self.a.message, size, w, bold=True)
        return self.head_h + lh * (len(msg) + 0.3 + len(_figures(self.a, self.u, self.marks)))

    def paint_figures(self, x: float, y: float, w: float, h: float, size: float) -> None:
        self.panel("figures", x, y, w, h)
        c = self.c
        top = self.heading(x, y, w, "Figures", "loaded, upright, free to trim")
        lh = c.line_height(size)
        color = HULL if self.a.status == "ok" else MARK
        for ln in c.wrap(self.a.message, size, w, bold=True):
            c.text(x, top, w, lh, ln, size, bold=True, color=color)
            top += lh
        top += lh * 0.3
        rows = _figures(self.a, self.u, self.marks)
        label_w = min(max(c.text_width(k, size) for k, _ in rows) + 3.0, w * 0.5)
        for r, (k, v) in enumerate(rows):
            if r % 2 == 0:
                c.box(x, top, w, lh, fill=STRIPE)
            c.text(x + 1.0, top, label_w, lh, c.elide(k, size, label_w - 1.0), size, color=MUTED)
            c.text(
                x + label_w,
                top,
                w - label_w - 1.0,
                lh,
                c.elide(v, size, w - label_w - 1.0, True),
                size,
                bold=True,
            )
            top += lh

    # GZ curve -------------------------------------------------------------------------
    def paint_gz(self, x: float, y: float, w: float, h: float) -> None:
        self.panel("gz", x, y, w, h)
        c, t, u = self.c, self.t, self.u
        top = self.heading(x, y, w, "Righting arm GZ", f"GZ in {u.length}, heel in degrees")
        curve = self.a.curve
        lh = self.lh_small
        if curve is None:
            c.text(
                x, top, w, lh * 2, "No curve: the hull cannot carry the load.", t.body, color=MARK
            )
            return
        m = self.marks
        heel = curve.heel_deg
        gz = u.to_length(1.0) * curve.gz
        finite = np.isfinite(gz)
        hmax = float(heel[-1])
        ymax = float(np.nanmax(gz)) if finite.any() else 1.0
        ymin = float(np.nanmin(gz)) if finite.any() else 0.0
        if m.crew_shift_arm is not None:  # show the whole heeling-arm curve
            ymax = max(ymax, u.to_length(m.crew_shift_arm))
        ystep = _nice_step(max(ymax - min(ymin, 0.0), 1e-6), 5)
        y_hi = math.ceil((ymax + 0.12 * (ymax - min(ymin, 0.0))) / ystep) * ystep
        y_lo = min(0.0, math.floor(ymin / ystep) * ystep)
        if y_hi <= y_lo:
            y_hi = y_lo + ystep
        ticks = [y_lo + k * ystep for k in range(round((y_hi - y_lo) / ystep) + 1)]
        ylabel_w = max(c.text_width(f"{v:g}", t.small) for v in ticks) + 1.5
        legend = [
            (HULL, Qt.PenStyle.SolidLine, 0.55, "GZ from heeled equilibrium, free to trim"),
            (MUTED, Qt.PenStyle.DashLine, 0.25, "wall-sided estimate (holds at small heel only)"),
        ]
        if m.crew_shift_heel_deg is not None or m.crew_shift_arm is not None:
            txt = (
                f"crew shift: heel {m.crew_shift_heel_deg:.1f}°"
                if m.crew_shift_heel_deg is not None
                else "crew-shift heeling arm"
            )
            legend.append(
                (
                    MARK,
                    Qt.PenStyle.DashDotLine,
                    0.35,
                    (
                        f"{txt}, {m.crew_shift_verdict}"
                        if m.crew_shift_heel_deg is not None
                        else f"{txt} ({m.crew_shift_verdict})"
                    )
                    if m.crew_shift_verdict
                    else txt,
                )
            )
        px0, px1 = x + ylabel_w + 1.5, x + w - 1.0
        py0, py1 = top + 1.0, y + h - lh * (2.1 + len(legend))

        def PX(a: float) -> float:
            return px0 + a / hmax * (px1 - px0)

        def PY(v: float) -> float:
            return py1 - (v - y_lo) / (y_hi - y_lo) * (py1 - py0)

        labels = _Labels()
        gw = curve.gunwale_immersion_deg
        if gw is not None and gw < hmax:
            c.box(PX(gw), py0, px1 - PX(gw), py1 - py0, fill=SHADE)
        a = 0.0
        while a <= hmax + 1e-9:
            c.segment(PX(a), py0, PX(a), py1, 0.12, RULE)
            c.text(PX(a) - 6, py1 + 0.6, 12, lh, f"{a:g}", t.small, align=_CENTRE)
            a += 10.0 if hmax <= 90 else 20.0
        for v in ticks:
            zero = abs(v) < 1e-12
            c.segment(px0, PY(v), px1, PY(v), 0.3 if zero else 0.12, INK if zero else RULE)
            c.text(x, PY(v) - lh / 2, ylabel_w, lh, f"{v:g}", t.small, align=_RIGHT)
        c.segment(px0, py0, px0, py1, 0.3)
        c.text(px1 - 40, py1 + 0.6 + lh, 40, lh, "heel (°)", t.small, align=_RIGHT, color=MUTED)
        c.text(px0 + 1.0, py0, 30, lh, f"GZ ({u.length})", t.small, color=MUTED)
        labels.avoid(QRectF(px0 + 1.0, py0, c.text_width(f"GZ ({u.length})", t.small), lh))
        ws = u.to_length(1.0) * curve.wall_sided
        keep = np.isfinite(ws) & (ws <= y_hi) & (ws >= y_lo)
        if keep.any():
            last = int(np.flatnonzero(keep)[-1]) + 1
            wx, wy = [PX(v) for v in heel[:last]], [PY(v) for v in ws[:last]]
            c.polyline(wx, wy, 0.25, MUTED, Qt.PenStyle.DashLine)
            labels.avoid(points=_dense(wx, wy))
        idx = np.flatnonzero(finite)
        if idx.size:
            for run in np.split(idx, np.flatnonzero(np.diff(idx) > 1) + 1):
                gx_, gy_ = [PX(v) for v in heel[run]], [PY(v) for v in gz[run]]
                c.polyline(gx_, gy_, 0.55, HULL)
                labels.avoid(points=_dense(gx_, gy_))
        if m.crew_shift_arm is not None:
            arm = u.to_length(m.crew_shift_arm) * np.cos(np.radians(heel))
            ax_, ay_ = [PX(v) for v in heel], [PY(v) for v in arm]
            c.polyline(ax_, ay_, 0.35, MARK)
            labels.avoid(points=_dense(ax_, ay_))
        if m.crew_shift_heel_deg is not None and 0 <= m.crew_shift_heel_deg <= hmax:
            hx = PX(m.crew_shift_heel_deg)
            c.segment(hx, py0, hx, py1, 0.35, MARK, Qt.PenStyle.DashDotLine)
            labels.avoid(points=[(hx, py0 + k) for k in np.arange(0.0, py1 - py0, 0.8)])

        def label(text: str, ax: float, ay: float, color: QColor, spots: Sequence[str]) -> None:
            tw = c.text_width(text, t.small) + 0.6
            where = {
                "above-right": QRectF(ax + 1.0, ay - lh - 0.8, tw, lh),
                "above-left": QRectF(ax - 1.0 - tw, ay - lh - 0.8, tw, lh),
                "above": QRectF(ax - tw / 2, ay - lh - 1.0, tw, lh),
                "below-right": QRectF(ax + 1.0, ay + 0.8, tw, lh),
                "below-left": QRectF(ax - 1.0 - tw, ay + 0.8, tw, lh),
                "top-left": QRectF(ax - 1.0 - tw, py0 + 0.5, tw, lh),
                "top-right": QRectF(ax + 1.0, py0 + 0.5, tw, lh),
                "bottom-left": QRectF(ax - 1.0 - tw, py1 - lh - 0.5, tw, lh),
                "bottom-right": QRectF(ax + 1.0, py1 - lh - 0.5, tw, lh),
            }
            inside = [
                where[s]
                for s in spots
                if where[s].left() >= px0
                and where[s].right() <= px1
                and where[s].top() >= py0
                and where[s].bottom() <= py1
            ]
            r = labels.place(inside or [where[spots[0]]])
            c.text(r.x(), r.y(), r.width(), lh, text, t.small, align=_CENTRE, color=color)

        if gw is not None:
            c.segment(PX(gw), py0, PX(gw), py1, 0.35, WATER, Qt.PenStyle.DashLine)
            labels.avoid(points=[(PX(gw), py0 + k) for k in np.arange(0.0, py1 - py0, 0.8)])
        if finite.any():
            mx, my = PX(curve.max_gz_deg), PY(u.to_length(curve.max_gz))
            c.dot(mx, my, 0.9, HULL)
            labels.avoid(QRectF(mx - 1, my - 1, 2, 2))
            label(
                f"max {u.length_text(curve.max_gz)} at {curve.max_gz_deg:.0f}°",
                mx,
                my,
                HULL,
                ["above-right", "above", "above-left", "below-right"],
            )
        if curve.avs_deg is not None and 0 < curve.avs_deg <= hmax:
            c.dot(PX(curve.avs_deg), PY(0.0), 0.9, MARK)
            label(
                f"GZ = 0 at {curve.avs_deg:.0f}°",
                PX(curve.avs_deg),
                PY(0.0),
                MARK,
                ["below-left", "below-right", "above-right", "above-left"],
            )
        if gw is not None:
            label(
                f"gunwale under at {gw:.1f}°",
                PX(gw),
                0.0,
                WATER,
                ["top-left", "bottom-left", "top-right", "bottom-right"],
            )
            if gw < hmax:
                note = "open boat floods beyond"
                label(note, PX(gw), 0.0, MUTED, ["top-right", "bottom-right"])
        ly = y + h - lh * len(legend)
        for k, (col, style, lw, text) in enumerate(legend):
            yy = ly + k * lh + lh / 2
            c.segment(x + 1.0, yy, x + 9.0, yy, lw, col, style)
            c.text(x + 11.0, ly + k * lh, w - 11.0, lh, c.elide(text, t.small, w - 11.0), t.small)

    # cautions -------------------------------------------------------------------------
    def _caution_columns(self, w: float) -> tuple[list[list[list[str]]], float]:
        """CAUTIONS wrapped and dealt into columns of similar length, and the text size."""
        c, t = self.c, self.t
        n_cols = 3 if w / 3 >= 85.0 else 2
        col_w = (w - 6.0 - (n_cols - 1) * t.gap) / n_cols
        size = t.body
        wrapped = [
            c.wrap(s, size, col_w - 3.5, bold=(k == len(CAUTIONS) - 1))
            for k, s in enumerate(CAUTIONS)
        ]
        total = sum(len(ws) for ws in wrapped)
        columns: list[list[list[str]]] = [[] for _ in range(n_cols)]
        filled = 0
        col = 0
        for ws in wrapped:
            if (
                col < n_cols - 1
                and columns[col]
                and filled + len(ws) / 2 > total * (col + 1) / n_cols
            ):
                col += 1
            columns[col].append(ws)
            filled += len(ws)
        return columns, size

    def _caution_height(self, column: list[list[str]], size: float) -> float:
        lh = self.c.line_height(size)
        return sum(len(ws) for ws in column) * lh + max(len(column) - 1, 0) * lh * 0.3

    def paint_cautions(
        self, x: float, y: float, w: float, h: float, columns: list[list[list[str]]], size: float
    ) -> None:
        self.panel("cautions", x, y, w, h)
        c, t = self.c, self.t
        top = self.heading(x, y, w, "Safety", "read before the first launch and keep with the boat")
        lh = c.line_height(size)
        c.box(x, top - 1.0, 1.2, y + h - top + 1.0, fill=MARK)
        col_w = (w - 6.0 - (len(columns) - 1) * t.gap) / len(columns)
        item = 0
        for k, column in enumerate(columns):
            cx = x + 4.0 + k * (col_w + t.gap)
            yy = top
            for ws in column:
                item += 1
                disclaimer = item == len(CAUTIONS)  # the last caution, set in bold
                if not disclaimer:
                    c.text(cx - 0.5, yy, 3.0, lh, "•", size, bold=True, color=MARK)
                for ln in ws:
                    c.text(cx + 2.5, yy, col_w - 2.5, lh, ln, size, bold=disclaimer)
                    yy += lh
                yy += lh * 0.3

    # title block ----------------------------------------------------------------------
    def _title_fields(self) -> list[tuple[str, str]]:
        u, d = self.u, self.design
        rho = self.a.hydrostatics.water_density if self.a.hydrostatics else d.water_density
        water = (
            f"{rho:.1f} kg/m³"
            if u.name == "metric"
            else f"{rho * LB_FT3_PER_KG_M3:.2f} lb/ft³ ({rho:.1f} kg/m³)"
        )
        if isinstance(d.water, str) and d.water.strip().lower() in ("fresh", "sea"):
            water += f", {d.water.strip().lower()} water"
        units = "millimetres and kilograms" if u.name == "metric" else "inches and pounds"
        return [
            ("File", self.source or "not saved"),
            ("Date", _dt.date.today().isoformat()),
            ("Units", f"{units}; angles in degrees"),
            ("Water", water),
        ]

    def _title_lines(self, w: float) -> tuple[list[str], list[str]]:
        c, t = self.c, self.t
        name = c.wrap(self.design.name or "Untitled design", t.title, w - 4.0, bold=True)[:2]
        notes = c.wrap(self.design.notes, t.body, w - 4.0)[:4] if self.design.notes.strip() else []
        return name, notes

    def _title_height(self, w: float) -> float:
        name, notes = self._title_lines(w)
        lh = self.lh_body
        return (
            4.0
            + len(name) * self.c.line_height(self.t.title)
            + 2.4
            + lh * (len(self._title_fields()) + 1)
            + lh * len(notes)
            + lh * 1.6 * 2
            + self.lh_small
            + 1.5
        )

    def paint_title(self, x: float, y: float, w: float, h: float) -> None:
        self.panel("title", x, y, w, h)
        c, t = self.c, self.t
        c.box(x, y, w, h, 0.5, HULL)
        pad = 2.0
        lh_t = c.line_height(t.title)
        name, notes = self._title_lines(w)
        yy = y + pad
        for ln in name:
            c.text(x + pad, yy, w - 2 * pad, lh_t, ln, t.title, bold=True, color=HULL)
            yy += lh_t
        yy += 0.8
        c.segment(x, yy, x + w, yy, 0.3, HULL)
        yy += 0.8
        size, lh = t.body, self.lh_body
        fields = self._title_fields()
        label_w = max(c.text_width(k, size, True) for k, _ in fields) + 3.0
        for k, v in fields:
            c.text(x + pad, yy, label_w, lh, k, size, bold=True, color=MUTED)
            c.text(
                x + pad + label_w,
                yy,
                w - 2 * pad - label_w,
                lh,
                c.elide(v, size, w - 2 * pad - label_w),
                size,
            )
            yy += lh
        yy += 0.4
        c.segment(x, yy, x + w, yy, 0.2, RULE)
        yy += 0.4
        c.text(x + pad, yy, w, lh, "Notes", size, bold=True, color=MUTED)
        yy += lh
        for ln in notes:
            c.text(x + pad, yy, w - 2 * pad, lh, ln, size)
            yy += lh
        bottom = y + h - pad - self.lh_small
        yy += lh * 1.6
        while yy <= bottom:
            c.segment(x + pad, yy, x + w - pad, yy, 0.15, RULE)
            yy += lh * 1.6
        c.text(
            x + pad,
            y + h - pad - self.lh_small,
            w - 2 * pad,
            self.lh_small,
            "Hullwright print plate",
            t.small,
            align=_RIGHT,
            color=MUTED,
        )


# ----------------------------------------------------------------------------- entry points


def paint_plate(
    painter: QPainter,
    page_rect_px: QRectF,
    dpi: float,
    design: Design,
    analysis: Analysis,
    units: str | UnitSystem,
    source: str,
    extras: PlateMarks | Mapping[str, object] | None = None,
) -> PlateLayout:
    """Lay out and paint the whole plate on ``painter`` in device pixels.

    Parameters
    ----------
    page_rect_px : the full sheet in device pixels (the margins are inside it)
    dpi : device pixels per inch; millimetres and points are converted with it
    units : "metric", "imperial" or a UnitSystem
    source : the design's file name for the title block
    extras : optional marks from the builder's checks (see :class:`PlateMarks`)

    Returns
    -------
    PlateLayout
        The panel rectangles and the checks the tests use.
    """
    u = system(units) if isinstance(units, str) else units
    marks = PlateMarks.from_any(extras)
    page_mm = (page_rect_px.width() / dpi * 25.4, page_rect_px.height() / dpi * 25.4)
    painter.save()
    painter.setRenderHint(QPainter.RenderHint.Antialiasing, True)
    painter.setRenderHint(QPainter.RenderHint.TextAntialiasing, True)
    painter.fillRect(page_rect_px, PAPER)
    canvas = _Canvas(painter, page_rect_px.topLeft(), dpi)
    layout = _Sheet(canvas, page_mm, design, analysis, u, source, marks).paint()
    painter.restore()
    return layout


def marks_from_checks(design: Design, analysis: Analysis) -> PlateMarks:
    """The builder's checks the plate carries: all crew to the side at seat height
    (offset-load test) and the seat that trims the boat level, for the crew member who
    has to move least.  Nothing when the boat does not float or has no crew."""
    if analysis.hydrostatics is None or analysis.curve is None or not design.loads.crew:
        return PlateMarks()
    try:
        shift = heel_checks.crew_shift(design, analysis=analysis)
        trims = [aids.level_trim(design, crew_index=i) for i in range(len(design.loads.crew))]
    except HullwrightError:
        return PlateMarks()
    verdict = {
        "holds": "holds",
        "floods": "the gunwale goes under first",
        "capsizes": "capsizes",
    }[shift.verdict]
    movable = [t for t in trims if t.x_after is not None]
    seats: tuple[tuple[str, float], ...] = ()
    if movable and abs(analysis.hydrostatics.trim_deg) > 0.05:
        best = min(movable, key=lambda t: abs(t.x_after - t.x_before))  # type: ignore[operator]
        seats = ((best.what, float(best.x_after)),)  # type: ignore[arg-type]
    return PlateMarks(shift.static_heel_deg, f"all crew to the side: {verdict}", shift.arm0, seats)


def _ensure_gui_app() -> QGuiApplication:
    app = QGuiApplication.instance()
    return app if app is not None else QGuiApplication([])  # type: ignore[return-value]


def _paper(paper: str) -> tuple[float, float]:
    try:
        return PAPER_SIZES[paper]
    except KeyError:
        raise HullwrightError(
            f"unknown paper {paper!r}: use one of {', '.join(PAPER_SIZES)}"
        ) from None


def render_plate_image(
    design: Design,
    paper: str = "A3",
    dpi: float = 300,
    units: str = "metric",
    source: str = "",
    extras: PlateMarks | Mapping[str, object] | None = None,
    analysis: Analysis | None = None,
) -> QImage:
    """The plate as a white QImage of the paper's size at ``dpi``, dpi stored in it."""
    _ensure_gui_app()
    w_mm, h_mm = _paper(paper)
    if not 20 <= dpi <= 1200:
        raise HullwrightError("the plate resolution must be between 20 and 1200 dpi")
    analysis = analysis or analyse(design)
    w_px, h_px = round(w_mm / 25.4 * dpi), round(h_mm / 25.4 * dpi)
    image = QImage(w_px, h_px, QImage.Format.Format_RGB32)
    dots_per_metre = round(dpi / 0.0254)
    image.setDotsPerMeterX(dots_per_metre)
    image.setDotsPerMeterY(dots_per_metre)
    image.fill(PAPER)
    painter = QPainter(image)
    try:
        paint_plate(painter, QRectF(0, 0, w_px, h_px), dpi, design, analysis, units, source, extras)
    finally:
        painter.end()
    return image


def _write_pdf(
    path: str,
    design: Design,
    analysis: Analysis,
    paper: str,
    units: str,
    source: str,
    extras: PlateMarks | Mapping[str, object] | None,
) -> None:
    writer = QPdfWriter(path)
    writer.setResolution(PDF_RESOLUTION)
    writer.setTitle(f"{design.name} - print plate")
    writer.setCreator("Hullwright")
    layout = QPageLayout(
        QPageSize(_PAGE_IDS[paper]), QPageLayout.Orientation.Landscape, QMarginsF(0, 0, 0, 0)
    )
    if not writer.setPageLayout(layout):
        raise HullwrightError(f"could not set the PDF page to {paper} landscape")
    painter = QPainter()
    if not painter.begin(writer):
        raise HullwrightError(f"cannot write {Path(path).name}")
    try:
        rect = QRectF(0, 0, writer.width(), writer.height())
        paint_plate(painter, rect, writer.resolution(), design, analysis, units, source, extras)
    finally:
        painter.end()


def render_plate_file(
    design: Design,
    path: str | os.PathLike[str],
    paper: str = "A3",
    dpi: float = 300,
    units: str = "metric",
    source: str = "",
    extras: PlateMarks | Mapping[str, object] | None = None,
) -> None:
    """Write the plate to ``path`` (.png at ``dpi`` or vector .pdf), atomically.

    The plate is rendered to a temporary file in the same folder, then moved over
    ``path``; a failed render leaves no file behind.  Without ``extras`` the plate
    carries the builder's checks from :func:`marks_from_checks`.

    Raises
    ------
    HullwrightError
        For an unknown paper or extension, a design the engine rejects, or a file that
        cannot be written.
    """
    _ensure_gui_app()
    target = Path(path)
    suffix = target.suffix.lower()
    if suffix not in (".png", ".pdf"):
        raise HullwrightError("the plate file must end in .png or .pdf")
    _paper(paper)
    analysis = analyse(design)
    if not target.parent.is_dir():
        raise HullwrightError(f"folder {target.parent} does not exist")
    if extras is None:
        extras = marks_from_checks(design, analysis)
    # Qt creates the file itself, so it gets the usual permissions (umask applied)
    tmp = str(target.parent / f".{target.stem}-{secrets.token_hex(6)}{suffix}")
    try:
        if suffix == ".png":
            image = render_plate_image(design, paper, dpi, units, source, extras, analysis)
            if not image.save(tmp, "PNG", 50):
                raise HullwrightError(f"cannot write {target.name}")
        else:
            _write_pdf(tmp, design, analysis, paper, units, source, extras)
        os.replace(tmp, target)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise
