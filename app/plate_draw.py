"""Drawing primitives of the print plate: type sizes, colours, a canvas that takes
millimetres and points, and label placement that avoids lines and other labels.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence
from dataclasses import dataclass

from PySide6.QtCore import QPointF, QRectF, Qt
from PySide6.QtGui import (
    QBrush,
    QColor,
    QFont,
    QFontMetricsF,
    QPainter,
    QPainterPath,
    QPen,
    QPolygonF,
)

from app import palette

__all__ = [
    "FONT_FAMILY",
    "MIN_TEXT_PT",
    "Canvas",
    "Labels",
    "TypeSizes",
    "dense",
    "nice_step",
    "type_sizes",
]

FONT_FAMILY = "DejaVu Sans"
#: No text on the plate is smaller than this (points).
MIN_TEXT_PT = 7.0

MM_PER_PT = 25.4 / 72.0

# Colours from the one palette the screen uses too (app/palette.py), one meaning each.
INK = QColor(palette.PRINT_TEXT)
MUTED = QColor(palette.PRINT_MUTED)
RULE = QColor(palette.PRINT_RULE)
HULL = QColor(palette.INK)
WATER = QColor(palette.WATER)
CENTRE_OF_GRAVITY = QColor(palette.CENTRE_OF_GRAVITY)
HEELING_ARM = QColor(palette.HEELING_ARM)
WALL_SIDED = QColor(palette.WALL_SIDED)
CREW = QColor(palette.CREW)
WARNING = QColor(palette.WARNING)
BAND = QColor(palette.PRINT_BAND)
SHADE = QColor(palette.PRINT_SHADE)
STRIPE = QColor(palette.PRINT_STRIPE)
PAPER = QColor(palette.PRINT_PAPER)

_Align = Qt.AlignmentFlag
LEFT = _Align.AlignLeft | _Align.AlignVCenter
RIGHT = _Align.AlignRight | _Align.AlignVCenter
CENTRE = _Align.AlignCenter


@dataclass(frozen=True)
class TypeSizes:
    title: float
    heading: float
    body: float
    small: float
    margin: float  # mm
    gap: float  # mm


_LARGE_SHEET = TypeSizes(title=15.0, heading=9.5, body=8.5, small=7.5, margin=10.0, gap=5.0)
_SMALL_SHEET = TypeSizes(title=12.0, heading=8.0, body=7.2, small=7.0, margin=8.0, gap=3.5)


def type_sizes(page_w_mm: float) -> TypeSizes:
    return _LARGE_SHEET if page_w_mm > 350.0 else _SMALL_SHEET


class Canvas:
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
        align: Qt.AlignmentFlag = LEFT,
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


def nice_step(span: float, target: int) -> float:
    """A 1-2-2.5-5 step that cuts ``span`` into about ``target`` parts."""
    raw = span / max(target, 1)
    if raw <= 0:
        return 1.0
    mag = 10 ** math.floor(math.log10(raw))
    for m in (1, 2, 2.5, 5, 10):
        if m * mag >= raw:
            return m * mag
    return 10 * mag


def dense(
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


class Labels:
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
