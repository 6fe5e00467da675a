"""The build pack as a multi-page PDF the build team cuts from.

Pages, in order: the print plate; the cut list with warnings and notes; one page per
piece (panel, end, frame) at a stated scale with its offset table and marks; the sheet
layouts; the materials list; then every piece at full size (1:1), tiled over the paper
with overlap, cut and registration marks, row and column labels, a page map and a
100 mm (or 4 in) check square on every page.

Everything is painted in millimetres on a :class:`app.plate_draw.Canvas`; the page
plan (:func:`plan_pages`) is pure and tested without painting.
"""

from __future__ import annotations

import math
import string
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import shapely
from PySide6.QtCore import QMarginsF, QPointF, QRectF, Qt
from PySide6.QtGui import (
    QBrush,
    QColor,
    QPageLayout,
    QPageSize,
    QPainter,
    QPdfWriter,
    QPolygonF,
)

from app import palette
from app.plate import marks_from_assessment, paint_plate, paper_mm
from app.plate_content import IMPERIAL_SCALES, scale_label
from app.plate_draw import CENTRE, LEFT, RIGHT, Canvas
from hydro.build_pack import BuildPack, PieceJob
from hydro.assess import assess
from hydro.design import Design
from hydro.errors import HullwrightError
from hydro.outputs import write_via_temp
from hydro.panels import FlatPiece, offset_rows
from hydro.safety import SHORT_CAUTION
from hydro.sheet_layout import Placement, Sheet
from hydro.units import M_PER_IN, UnitSystem, system

__all__ = ["PageSpec", "TileGrid", "plan_pages", "tile_grid", "write_pack_pdf", "BY_HAND"]

# Colours from the palette the screen and the plate use (app/palette.py): the cut line is
# the boat's ink, registration marks are plain text colour (blue means water on the plate)
INK = QColor(palette.PRINT_TEXT)
MUTED = QColor(palette.PRINT_MUTED)
CUT = QColor(palette.INK)
STATION = QColor(palette.PRINT_STATION)
JOINT = QColor(palette.JOINT)
MARK = QColor(palette.PRINT_TEXT)
WARN = QColor(palette.WARNING)
FILL = QColor(palette.PRINT_FILL)
SHADE = QColor(palette.PRINT_SHADE)

MARGIN_MM = 10.0
HEADER_MM = 16.0
FOOTER_MM = 9.0
OVERLAP_MM = 10.0
BODY_PT, SMALL_PT, HEAD_PT, TITLE_PT = 8.0, 7.0, 9.5, 13.0

_PAGE_IDS = {
    "A4": QPageSize.PageSizeId.A4,
    "A3": QPageSize.PageSizeId.A3,
    "Letter": QPageSize.PageSizeId.Letter,
    "Tabloid": QPageSize.PageSizeId.Tabloid,
}
METRIC_DENS = (1, 2, 5, 10, 20, 25, 50, 100)
IMPERIAL_DENS = (1, 2, 4, 8, 12, 16, 24, 48, 96)

#: What the pack leaves to the builder (printed on the cut list page).
BY_HAND: tuple[str, ...] = (
    "Print the full-size pages at 100 % (no 'fit to page'); measure the check square on "
    "every page before cutting; trim and tape the pages edge to edge on the registration "
    "marks.",
    "Or loft each panel from its offset table: snap a straight baseline, mark the offsets "
    "at every station, and spring a batten through the points.",
    "Cut the starboard twin of every mirrored pair (turn the first one over as a pattern), "
    "and mark which face is outside.",
    "Scarf or butt-join the parts of long panels at the joint lines before fitting; "
    "stagger the joints of laminated layers as drawn.",
    "Bevel chine and keel edges and trim the panels to fit on the boat: the shapes have no "
    "allowance for the skin thickness at the edges.",
    "Fair the frames and fix them at their stations; cut limber holes and hand holes as "
    "needed.",
    "Add what the model does not hold: seats, gunwale strips, knees, decks, fastenings.",
)


@dataclass(frozen=True)
class TileGrid:
    """How one piece is cut into full-size pages.

    Attributes
    ----------
    rows, cols : grid size (row A at the top)
    window_mm : (w, h) of the printed window on each page
    step_mm : (x, y) advance between neighbouring pages (window less the overlap)
    origin_mm : (u, v) of the grid's top-left corner in piece millimetres
    used : (rows, cols) True where the piece outline passes through the page
    """

    rows: int
    cols: int
    window_mm: tuple[float, float]
    step_mm: tuple[float, float]
    origin_mm: tuple[float, float]
    used: tuple[tuple[bool, ...], ...]

    def window(self, row: int, col: int) -> tuple[float, float, float, float]:
        """(u0, v_top, u1, v_bottom) of a page's window in piece millimetres."""
        u0 = self.origin_mm[0] + col * self.step_mm[0]
        v_top = self.origin_mm[1] - row * self.step_mm[1]
        return u0, v_top, u0 + self.window_mm[0], v_top - self.window_mm[1]


@dataclass(frozen=True)
class PageSpec:
    """One page of the pack.

    Attributes
    ----------
    kind : "plate", "cutlist", "piece", "sheets", "materials" or "tile"
    title : the page heading
    job : index into the pack's jobs (piece and tile pages)
    sheets : (layout index, sheet index) pairs on a sheet-layout page
    tile : (row, col) of a full-size page
    """

    kind: str
    title: str
    job: int | None = None
    sheets: tuple[tuple[int, int], ...] = ()
    tile: tuple[int, int] | None = None



def _window_mm(page_mm: tuple[float, float]) -> tuple[float, float]:
    w, h = page_mm
    return w - 2 * MARGIN_MM, h - 2 * MARGIN_MM - HEADER_MM - FOOTER_MM


def tile_grid(piece: FlatPiece, page_mm: tuple[float, float]) -> TileGrid:
    """The full-size page grid of a piece: pages overlap by OVERLAP_MM, 5 mm clear all
    round the piece."""
    ww, wh = _window_mm(page_mm)
    sx, sy = ww - OVERLAP_MM, wh - OVERLAP_MM
    pad = 5.0
    minu, minv = piece.outline.min(axis=0) * 1000 - pad
    maxu, maxv = piece.outline.max(axis=0) * 1000 + pad
    cols = max(1, math.ceil((maxu - minu - OVERLAP_MM) / sx))
    rows = max(1, math.ceil((maxv - minv - OVERLAP_MM) / sy))
    origin = (float(minu), float(maxv))
    poly = shapely.Polygon(piece.outline * 1000)
    used = []
    for r in range(rows):
        row = []
        for c in range(cols):
            u0 = origin[0] + c * sx
            vt = origin[1] - r * sy
            row.append(bool(poly.intersects(shapely.box(u0, vt - wh, u0 + ww, vt))))
        used.append(tuple(row))
    return TileGrid(rows, cols, (ww, wh), (sx, sy), origin, tuple(used))


def _sheets_per_page() -> int:
    return 2


def plan_pages(pack: BuildPack, paper: str) -> list[PageSpec]:
    """The pages of the pack in order (the plate first)."""
    page = paper_mm(paper)
    pages = [PageSpec("plate", "Print plate"), PageSpec("cutlist", "Cut list")]
    for i, job in enumerate(pack.jobs):
        pages.append(PageSpec("piece", job.piece.name, job=i))
    refs = [(li, si) for li, (_, lay) in enumerate(pack.layouts) for si in range(len(lay.sheets))]
    per = _sheets_per_page()
    for k in range(0, len(refs), per):
        pages.append(PageSpec("sheets", "Sheet layout", sheets=tuple(refs[k : k + per])))
    pages.append(PageSpec("materials", "Materials list"))
    for i, job in enumerate(pack.jobs):
        grid = tile_grid(job.piece, page)
        for r in range(grid.rows):
            for c in range(grid.cols):
                if grid.used[r][c]:
                    pages.append(PageSpec("tile", job.piece.name, job=i, tile=(r, c)))
    return pages


def _row_name(r: int) -> str:
    letters = string.ascii_uppercase
    return letters[r] if r < 26 else letters[r // 26 - 1] + letters[r % 26]


def _cut_text(job: PieceJob) -> str:
    p = job.piece
    total = job.total_count
    bits = [f"cut {total}"]
    if job.layers > 1:
        bits.append(f"({p.count} per layer x {job.layers} layers)")
    if p.mirrored:
        bits.append("mirrored pairs: port as drawn, starboard mirrored")
    return ", ".join(bits)


# -- painting helpers ---------------------------------------------------------------


def _polygon(canvas: Canvas, pts: Sequence[tuple[float, float]], width: float, color: QColor,
             fill: QColor | None = None) -> None:
    poly = QPolygonF([canvas.pt(x, y) for x, y in pts])
    p = canvas.painter
    p.setPen(canvas.pen(width, color) if width > 0 else Qt.PenStyle.NoPen)
    p.setBrush(QBrush(fill) if fill is not None else Qt.BrushStyle.NoBrush)
    p.drawPolygon(poly)


class _Page:
    """Shared page furniture: heading, footer, tables."""

    def __init__(self, canvas: Canvas, page_mm: tuple[float, float], u: UnitSystem,
                 design: Design, number: int, total: int):
        self.c, self.page, self.u = canvas, page_mm, u
        self.design, self.number, self.total = design, number, total

    def heading(self, title: str, aside: str = "") -> float:
        c, (w, _) = self.c, self.page
        c.text(MARGIN_MM, MARGIN_MM, w - 2 * MARGIN_MM, 7, title, TITLE_PT, LEFT, bold=True)
        if aside:
            c.text(MARGIN_MM, MARGIN_MM + 7, w - 2 * MARGIN_MM, 5, aside, BODY_PT, LEFT,
                   color=MUTED)
        c.segment(MARGIN_MM, MARGIN_MM + HEADER_MM - 2, w - MARGIN_MM, MARGIN_MM + HEADER_MM - 2,
                  0.25, MUTED)
        return MARGIN_MM + HEADER_MM

    def footer(self, note: str = "") -> None:
        c, (w, h) = self.c, self.page
        y = h - MARGIN_MM - FOOTER_MM + 4.5
        c.text(MARGIN_MM, y, w * 0.6, 4, f"{self.design.name} - build pack", SMALL_PT, LEFT,
               color=MUTED)
        c.text(MARGIN_MM, y + 3.0, w * 0.75, 4, note or SHORT_CAUTION, SMALL_PT, LEFT,
               color=MUTED)
        c.text(w - MARGIN_MM - 40, y, 40, 4, f"page {self.number} of {self.total}", SMALL_PT,
               RIGHT, color=MUTED)

    def table(self, x: float, y: float, widths: Sequence[float], head: Sequence[str],
              rows: Sequence[Sequence[str]], size: float = SMALL_PT,
              colors: Sequence[QColor | None] | None = None) -> float:
        """Draw a table; returns the y below it."""
        c = self.c
        lh = c.line_height(size) + 0.6
        c.box(x, y, sum(widths), lh, fill=SHADE)
        xx = x
        for wdt, text in zip(widths, head):
            c.text(xx + 1, y, wdt - 2, lh, text, size, LEFT if xx == x else RIGHT, bold=True)
            xx += wdt
        y += lh
        for n, row in enumerate(rows):
            color = (colors[n] if colors else None) or INK
            xx = x
            for k, (wdt, text) in enumerate(zip(widths, row)):
                shown = c.elide(text, size, wdt - 2)
                c.text(xx + 1, y, wdt - 2, lh, shown, size, LEFT if k == 0 else RIGHT,
                       color=color)
                xx += wdt
            y += lh
        c.segment(x, y, x + sum(widths), y, 0.2, MUTED)
        return y + 2

    def paragraph(self, x: float, y: float, w: float, text: str, size: float = BODY_PT,
                  color: QColor = INK, bold: bool = False) -> float:
        c = self.c
        for line in c.wrap(text, size, w, bold):
            c.text(x, y, w, c.line_height(size), line, size, LEFT, bold=bold, color=color)
            y += c.line_height(size)
        return y

    def check_square(self, x: float, y: float) -> None:
        """The 100 mm (or 4 in) square a builder measures to check the print scale."""
        side = 4 * M_PER_IN * 1000 if self.u.imperial else 100.0
        c = self.c
        c.box(x, y, side, side, 0.35, MARK)
        label = "4 in check square" if self.u.imperial else "100 mm check square"
        c.text(x + 1.5, y + 1.5, side - 3, 4, label, SMALL_PT, LEFT, color=MARK)
        c.text(x + 1.5, y + side - 5.5, side - 3, 4, "measure before cutting", SMALL_PT, LEFT,
               color=MARK)


def _dens(u: UnitSystem) -> tuple[int, ...]:
    return IMPERIAL_DENS if u.imperial else METRIC_DENS


def _scale_text(den: int, u: UnitSystem) -> str:
    if den == 1:
        return "1:1 (full size)"
    if u.imperial and den in IMPERIAL_SCALES:
        return scale_label(den, u)
    return f"1:{den}"


def _fit_den(size_mm: tuple[float, float], room: tuple[float, float], u: UnitSystem) -> int:
    for den in _dens(u):
        if size_mm[0] / den <= room[0] and size_mm[1] / den <= room[1]:
            return den
    return _dens(u)[-1]


def _scale_bar(page: _Page, x: float, y: float, den: int) -> None:
    """A bar of a round length at the drawing's scale."""
    u, c = page.u, page.c
    if u.imperial:
        length_m = 12 * M_PER_IN if den >= 8 else 2 * M_PER_IN
        label = "1 ft" if den >= 8 else "2 in"
    else:
        length_m = 0.5 if den >= 10 else 0.1
        label = f"{length_m * 1000:.0f} mm"
    w = length_m * 1000 / den
    c.segment(x, y, x + w, y, 0.5, INK)
    c.segment(x, y - 1.2, x, y + 1.2, 0.3, INK)
    c.segment(x + w, y - 1.2, x + w, y + 1.2, 0.3, INK)
    c.text(x + w + 2, y - 2, 40, 4, f"{label} at {_scale_text(den, u)}", SMALL_PT, LEFT)


# -- the piece drawing (shared by the piece pages and the full-size tiles) -----------


def _draw_piece(page: _Page, job: PieceJob, to_page, full_size: bool) -> None:
    """Outline, marks, joints and labels of a piece; ``to_page`` maps (u, v) m -> mm."""
    c, p = page.c, job.piece
    size = BODY_PT if full_size else SMALL_PT
    ring = np.vstack([p.outline, p.outline[:1]])
    xs, ys = to_page(ring)
    c.polyline(xs, ys, 0.5 if full_size else 0.45, CUT)
    for m in p.marks:
        mx, my = to_page(m.points)
        if m.role == "station":
            c.polyline(mx, my, 0.2, STATION, Qt.PenStyle.DashLine)
            c.text(mx[-1] - 10, my[-1] - 4.5, 20, 4, m.label, size, CENTRE, color=STATION)
            if full_size:
                c.text(mx[0] - 10, my[0] + 0.5, 20, 4, m.label, size, CENTRE, color=STATION)
        elif m.role == "line":
            c.polyline(mx, my, 0.3, MARK, Qt.PenStyle.DashDotLine)
            c.text(mx[-1] + 1, my[-1] - 2, 45, 4, m.label, size, LEFT, color=MARK)
        elif m.role == "edge":
            k = int(len(mx) * 0.28)
            above = m is [mk for mk in p.marks if mk.role == "edge"][-1]
            dy = -9.0 if above else (5.0 if not full_size else 4.5)
            c.text(mx[k] - 25, my[k] + dy, 50, 4, f"{m.label} edge", size, CENTRE, color=MUTED)
    base_x, base_y = to_page(np.array([[p.outline[:, 0].min(), 0.0], [p.outline[:, 0].max(), 0.0]]))
    if p.ticks:
        c.polyline(base_x, base_y, 0.25, MUTED, Qt.PenStyle.DashDotDotLine)
        c.text(base_x[1] - 80, base_y[1] + 0.5, 80, 4, "baseline (offsets measured from here)",
               size, RIGHT, color=MUTED)
    poly = shapely.Polygon(p.outline)
    for layer, cuts in enumerate(job.joints_u, start=1):
        for u_cut in cuts:
            chord = shapely.intersection(poly, shapely.LineString([(u_cut, -99), (u_cut, 99)]))
            if chord.is_empty:
                continue
            _, v0, _, v1 = chord.bounds
            jx, jy = to_page(np.array([[u_cut, v0], [u_cut, v1]]))
            c.polyline(jx, jy, 0.45, JOINT, Qt.PenStyle.DashLine)
            what = f"{job.joint.kind} joint"
            if job.joint.kind == "scarf":
                what += f", {job.joint.overlap_m * 1000:.0f} mm long"
            if job.layers > 1:
                what = f"layer {layer}: {what}"
            top = min(jy[0], jy[1])
            c.text(jx[0] + 1, top + 1 + 4 * (layer - 1), 60, 4, what, size, LEFT, color=JOINT)
    # the grain arrow along the piece, in its middle
    cx, cy = poly.centroid.x, poly.centroid.y
    span = 0.25 * (p.outline[:, 0].max() - p.outline[:, 0].min())
    ax, ay = to_page(np.array([[cx - span / 2, cy], [cx + span / 2, cy]]))
    c.segment(ax[0], ay[0], ax[1], ay[1], 0.35, MUTED)
    c.arrow_head(ax[1], ay[1], 1, 0, 2.5, MUTED)
    c.arrow_head(ax[0], ay[0], -1, 0, 2.5, MUTED)
    c.text(ax[0], ay[0] + 0.8, ax[1] - ax[0], 4, "grain / flute", size, CENTRE, color=MUTED)
    c.text(ax[0] - 40, ay[0] - 9, ax[1] - ax[0] + 80, 4.5, p.name, size + 1, CENTRE, bold=True)
    c.text(ax[0] - 50, ay[0] - 5, ax[1] - ax[0] + 100, 4, _cut_text(job), size, CENTRE)


# -- the pages --------------------------------------------------------------------


def _paint_cutlist(page: _Page, pack: BuildPack) -> None:
    y = page.heading("Cut list", f"{pack.name}  -  what to cut, from what, and what to watch")
    w = page.page[0] - 2 * MARGIN_MM
    u = page.u
    widths = [w * 0.2, w * 0.07, w * 0.08, w * 0.22, w * 0.12, w * 0.1, w * 0.09, w * 0.12]
    head = ["piece", "kind", "cut", "material", "length", "width", "twist", "joints"]
    rows, colors = [], []
    for job in pack.jobs:
        p = job.piece
        joints = max((len(c) for c in job.joints_u), default=0)
        rows.append([
            p.name, p.kind, f"{job.total_count}{' (pairs)' if p.mirrored else ''}",
            job.material, u.length_text(p.length_m), u.length_text(p.width_m),
            f"{p.max_twist_deg:.2f} deg" if p.kind in ("panel", "deck") else "-",
            f"{joints} {job.joint.kind}" if joints else "-",
        ])
        colors.append(WARN if p.strain > pack.settings.strain_limit else None)
    y = page.table(MARGIN_MM, y, widths, head, rows, BODY_PT, colors)
    y += 2
    if pack.warnings:
        y = page.paragraph(MARGIN_MM, y, w, "Warnings", HEAD_PT, WARN, bold=True)
        for text in pack.warnings:
            y = page.paragraph(MARGIN_MM + 3, y, w - 3, "- " + text, BODY_PT, WARN)
        y += 2
    y = page.paragraph(MARGIN_MM, y, w, "Notes", HEAD_PT, bold=True)
    notes = list(pack.notes) or ["All panels develop within the strain limit."]
    notes.append(
        "Panels are the station-paired ruled surfaces of the sketch, unrolled exactly "
        f"(twist per station in each offset table; strain limit "
        f"{pack.settings.strain_limit * 100:.3f} %)."
    )
    for text in notes:
        y = page.paragraph(MARGIN_MM + 3, y, w - 3, "- " + text, BODY_PT)
    y += 2
    y = page.paragraph(MARGIN_MM, y, w, "Still done by hand", HEAD_PT, bold=True)
    for text in BY_HAND:
        y = page.paragraph(MARGIN_MM + 3, y, w - 3, "- " + text, BODY_PT)
    page.footer()


def _offset_table_rows(
    job: PieceJob, u: UnitSystem, spacing: float | None
) -> tuple[list[str], list[list[str]]]:
    p = job.piece
    o = u.offset_text
    if p.ticks:
        head = ["station", "along", "up", "along", "up", "twist°"]
        rows = []
        twist = {t.label: t.twist_deg for t in p.ticks}
        for label, vals in offset_rows(p, spacing):
            if label not in twist and vals[0] is not None:
                label = o(vals[0])  # a row every so far along the baseline
            cells = [label] + ["-" if v is None else o(v) for v in vals]
            cells.append(f"{twist[label]:.2f}" if label in twist else "")
            rows.append(cells)
        return head, rows
    head = ["point", "out from CL", "up from base"]
    rows = [[label, o(float(vals[0] or 0.0)), o(float(vals[1] or 0.0))]
            for label, vals in offset_rows(p)]
    return head, rows


def _paint_piece(page: _Page, pack: BuildPack, job: PieceJob) -> None:
    p, u = job.piece, page.u
    aside = f"{_cut_text(job)}  -  {job.material}"
    if p.position_m is not None:
        aside = f"at {u.length_text(p.position_m)} from the aft end  -  " + aside
    y0 = page.heading(p.name[:1].upper() + p.name[1:], aside)
    w, h = page.page
    head, rows = _offset_table_rows(job, u, pack.settings.offset_spacing_m)
    table_w = 92.0 if p.ticks else 66.0
    lh = page.c.line_height(SMALL_PT) + 0.6
    room_rows = int((h - y0 - MARGIN_MM - FOOTER_MM - 16) / lh) - 1
    columns = [rows[k : k + room_rows] for k in range(0, len(rows), max(room_rows, 1))][:2]
    table_total = table_w * len(columns) + 4 * (len(columns) - 1)
    draw_w = w - 2 * MARGIN_MM - table_total - 8
    draw_h = h - y0 - MARGIN_MM - FOOTER_MM - 22
    size_mm = (p.length_m * 1000, p.width_m * 1000)
    den = _fit_den((size_mm[0] + 30, size_mm[1] + 25), (draw_w, draw_h), u)
    minu, minv = p.outline.min(axis=0)
    maxv = p.outline[:, 1].max()
    ox = MARGIN_MM + 10
    oy = y0 + 12 + (draw_h - (maxv - minv) * 1000 / den) / 2

    def to_page(pts):
        pts = np.asarray(pts, dtype=float)
        return (ox + (pts[:, 0] - minu) * 1000 / den, oy + (maxv - pts[:, 1]) * 1000 / den)

    _draw_piece(page, job, to_page, full_size=False)
    facts = [f"scale {_scale_text(den, u)}", p.face_note]
    if p.kind in ("panel", "deck"):
        warn = p.strain > pack.settings.strain_limit
        facts.append(
            f"largest twist {p.max_twist_deg:.2f} deg, strain {p.strain * 100:.3f} %"
            + ("  -  ABOVE THE LIMIT: will not lie flat without stretching" if warn else "")
        )
    page.c.text(MARGIN_MM, y0, draw_w, 4, "   |   ".join(facts), SMALL_PT, LEFT,
                color=WARN if p.strain > pack.settings.strain_limit else MUTED)
    _scale_bar(page, MARGIN_MM + 2, h - MARGIN_MM - FOOTER_MM - 5, den)
    x = w - MARGIN_MM - table_total
    what = "Offsets from the baseline" if p.ticks else "Starboard half outline"
    page.c.text(x, y0, table_total, 5, f"{what} ({u.offset_unit})", BODY_PT, LEFT, bold=True)
    if p.ticks:
        page.c.text(x, y0 + 4.5, table_total, 4,
                    f"first pair: {p.lower_edge} edge; second pair: {p.upper_edge} edge",
                    SMALL_PT, LEFT, color=MUTED)
    n = len(head)
    widths = [table_w * 0.2] + [table_w * 0.8 / (n - 1)] * (n - 1)
    if not p.ticks:
        widths = [table_w * 0.24, table_w * 0.38, table_w * 0.38]
    for k, col in enumerate(columns):
        page.table(x + k * (table_w + 4), y0 + 9, widths, head, col, SMALL_PT)
    if len(rows) > sum(len(c) for c in columns):
        page.c.text(x, h - MARGIN_MM - FOOTER_MM - 6, table_total, 4,
                    "more rows than fit: see the full-size pages", SMALL_PT, LEFT, color=WARN)
    page.footer()


def _paint_sheets(
    page: _Page, pack: BuildPack, refs: Sequence[tuple[int, int]], first: int
) -> None:
    w, h = page.page
    y0 = page.heading("Sheet layout",
                      f"{pack.sheet_count} sheets of {page.u.length_text(pack.settings.sheet_m[0])}"
                      f" x {page.u.length_text(pack.settings.sheet_m[1])}; grain / flute along "
                      "the length; kerf and edge margin allowed")
    per = _sheets_per_page()
    room = (w - 2 * MARGIN_MM - 4, (h - y0 - MARGIN_MM - FOOTER_MM) / per - 12)
    width, length = pack.settings.sheet_m
    den = _fit_den((length * 1000, width * 1000), room, page.u)
    y = y0 + 2
    for k, (li, si) in enumerate(refs):
        name, layout = pack.layouts[li]
        sheet = layout.sheets[si]
        used = sheet.used_area / (sheet.width * sheet.length) * 100
        page.c.text(MARGIN_MM, y, w - 2 * MARGIN_MM, 5,
                    f"Sheet {first + k} of {pack.sheet_count}  -  {name}  -  {used:.0f} % used",
                    BODY_PT, LEFT, bold=True)
        _draw_sheet(page, pack, sheet, MARGIN_MM + 2, y + 6, den)
        y += sheet.width * 1000 / den + 14
    _scale_bar(page, MARGIN_MM + 2, h - MARGIN_MM - FOOTER_MM - 4, den)
    page.footer()


def _draw_sheet(page: _Page, pack: BuildPack, sheet: Sheet, x: float, y: float, den: int) -> None:
    c = page.c
    k = 1000 / den

    def to_page(pts):
        pts = np.asarray(pts, dtype=float)
        return x + pts[:, 0] * k, y + (sheet.width - pts[:, 1]) * k

    c.box(x, y, sheet.length * k, sheet.width * k, 0.35, INK)
    jobs = {j.piece.name: j for j in pack.jobs}
    for pl in sheet.placements:
        ring = np.asarray(pl.polygon.exterior.coords)
        px, py = to_page(ring)
        _polygon(c, list(zip(px, py)), 0.3, CUT, FILL)
        job = jobs.get(pl.piece.name)
        if job is not None and pl.piece.in_piece_frame:
            _marks_on_sheet(page, job, pl, to_page)
        cx, cy = pl.polygon.centroid.x, pl.polygon.centroid.y
        tx, ty = to_page(np.array([[cx, cy]]))
        minx, miny, maxx, maxy = pl.polygon.bounds
        box_w = (maxx - minx) * k
        for n, line in enumerate(c.wrap(pl.piece.label, SMALL_PT, max(box_w - 2, 10))[:3]):
            c.text(tx[0] - box_w / 2, ty[0] - 3 + n * 3.2, box_w, 3.2, line, SMALL_PT, CENTRE)
    ax, ay = x + sheet.length * k - 34, y + sheet.width * k + 1
    c.segment(ax, ay + 2, ax + 30, ay + 2, 0.3, MUTED)
    c.arrow_head(ax + 30, ay + 2, 1, 0, 2.0, MUTED)
    c.text(ax - 40, ay, 38, 4, "grain / flute", SMALL_PT, RIGHT, color=MUTED)


def _marks_on_sheet(page: _Page, job: PieceJob, pl: Placement, to_page) -> None:
    for m in job.piece.marks:
        if m.role not in ("station", "line"):
            continue
        line = shapely.LineString(pl.to_sheet(m.points))
        part = shapely.intersection(line, pl.polygon)
        for seg in shapely.get_parts(part):
            if seg.geom_type != "LineString" or seg.length < 1e-4:
                continue
            sx, sy = to_page(np.asarray(seg.coords))
            page.c.polyline(sx, sy, 0.15, STATION, Qt.PenStyle.DashLine)


def _paint_materials(page: _Page, pack: BuildPack) -> None:
    u, m, s = page.u, pack.materials, pack.settings
    y = page.heading("Materials list", "what to buy; allowances and prices are settings")
    w = page.page[0] - 2 * MARGIN_MM
    rows = []
    for name, layout in pack.layouts:
        layers = sorted({j.layers for j in pack.jobs if j.material == name})
        rows.append([f"{name} sheets ({'/'.join(map(str, layers))} layer)",
                     f"{len(layout.sheets)}",
                     f"lower bound {layout.lower_bound}, {layout.utilisation * 100:.0f} % used"])
    sh = s.shopping
    tape_len = u.length_text(m.tape_m, feet=True) if u.imperial else f"{m.tape_m:.1f} m"
    rows += [
        ["seams (chines, keel, stems, transom edges)",
         u.length_text(m.seam_m, feet=True) if u.imperial else f"{m.seam_m:.2f} m", ""],
        ["tape", f"{m.tape_rolls} roll(s)",
         f"{tape_len}: {sh.tape_layers_inside} inside + {sh.tape_layers_outside} outside "
         f"per seam, rolls of {sh.tape_roll_m:g} m"],
        ["paint", f"{m.paint_l:.2f} L",
         f"{m.paint_area_m2:.2f} m2 x {sh.paint_coats:g} coats at "
         f"{sh.paint_coverage_m2_per_l:g} m2/L"],
        ["glue fillet / glue line", f"{m.fillet_m:.2f} m", "along the inside of every seam"],
    ]
    if m.cost is not None:
        for what, value in m.cost_lines:
            rows.append([f"cost: {what}", f"{value:.2f}", ""])
        rows.append(["total cost", f"{m.cost:.2f}", "from the unit prices given"])
    y = page.table(MARGIN_MM, y, [w * 0.36, w * 0.14, w * 0.5], ["item", "amount", "how"], rows,
                   BODY_PT)
    y += 4
    y = page.paragraph(MARGIN_MM, y, w, "Settings used", HEAD_PT, bold=True)
    joint = s.joint if s.joint != "auto" else "auto (scarf; staggered butts between layers)"
    lines = [
        f"stock sheet {u.length_text(s.sheet_m[0])} x {u.length_text(s.sheet_m[1])}, edge "
        f"margin {u.length_text(s.margin_m)}, saw kerf {u.length_text(s.kerf_m)}, grain "
        f"{'locked (pieces turn 0 or 180 degrees only)' if s.grain_locked else 'free'}",
        f"joints: {joint}, scarf ratio {s.scarf_ratio:g}:1",
        f"strain limit {s.strain_limit * 100:.3f} % (no published limit for plywood or board: "
        "a setting)",
    ]
    for text in lines:
        y = page.paragraph(MARGIN_MM + 3, y, w - 3, "- " + text, BODY_PT)
    page.footer()


def _paint_tile(page: _Page, pack: BuildPack, job: PieceJob, tile: tuple[int, int]) -> None:
    w, h = page.page
    grid = tile_grid(job.piece, page.page)
    r, col = tile
    name = f"{_row_name(r)}{col + 1}"
    y0 = page.heading(
        f"{job.piece.name} - full size, page {name}",
        f"row {_row_name(r)} of {grid.rows}, column {col + 1} of {grid.cols}; overlap "
        f"{OVERLAP_MM:.0f} mm: trim on the cut marks, lay over the next page on the "
        "registration marks",
    )
    u0, vt, u1, vb = grid.window(r, col)
    wx, wy = MARGIN_MM, y0
    ww, wh = grid.window_mm

    def to_page(pts):
        pts = np.asarray(pts, dtype=float) * 1000
        return wx + (pts[:, 0] - u0), wy + (vt - pts[:, 1])

    c = page.c
    painter = c.painter
    painter.save()
    painter.setClipRect(c.rect(wx, wy, ww, wh))
    # overlap strips (shared with the next page) shaded
    if col < grid.cols - 1:
        c.box(wx + ww - OVERLAP_MM, wy, OVERLAP_MM, wh, fill=SHADE)
    if r < grid.rows - 1:
        c.box(wx, wy + wh - OVERLAP_MM, ww, OVERLAP_MM, fill=SHADE)
    _draw_piece(page, job, to_page, full_size=True)
    _registration(page, grid, tile, to_page)
    painter.restore()
    _cut_marks(page, wx, wy, ww, wh)
    _neighbours(page, grid, tile, (wx, wy, ww, wh))
    _page_map(page, grid, tile)
    _place_check_square(page, job, to_page, (wx, wy, ww, wh))
    page.footer("Print at 100 % (no fit to page). " + SHORT_CAUTION)


def _neighbours(page: _Page, grid: TileGrid, tile: tuple[int, int], window) -> None:
    """Row and column labels on the window edges and the names of the next pages."""
    c = page.c
    wx, wy, ww, wh = window
    r, col = tile
    c.text(wx + ww / 2 - 20, wy + 1, 40, 4, f"column {col + 1}", SMALL_PT, CENTRE, bold=True)
    c.text(wx + 1.5, wy + wh / 2 - 8, 20, 4, f"row {_row_name(r)}", SMALL_PT, LEFT, bold=True)
    if col < grid.cols - 1:
        c.text(wx + ww - 34, wy + wh / 2 - 8, 32, 4, f"next: {_row_name(r)}{col + 2} ->",
               SMALL_PT, RIGHT, color=MUTED)
    if r < grid.rows - 1:
        c.text(wx + ww / 2 - 20, wy + wh - OVERLAP_MM - 5, 40, 4,
               f"below: {_row_name(r + 1)}{col + 1}", SMALL_PT, CENTRE, color=MUTED)


def _registration(page: _Page, grid: TileGrid, tile: tuple[int, int], to_page) -> None:
    """Cross-in-circle marks in the middle of every overlap, on both pages that share it."""
    u0, vt, u1, vb = grid.window(*tile)
    sx, sy = grid.step_mm
    ou, ov = grid.origin_mm
    us = [ou + k * sx + OVERLAP_MM / 2 for k in range(1, grid.cols)]
    vs = [ov - k * sy - OVERLAP_MM / 2 for k in range(1, grid.rows)]
    mid_u = [ou + k * sx + grid.window_mm[0] / 2 for k in range(grid.cols)]
    mid_v = [ov - k * sy - grid.window_mm[1] / 2 for k in range(grid.rows)]
    points = [(a, b) for a in us for b in mid_v + vs] + [(a, b) for a in mid_u for b in vs]
    for a, b in points:
        if not (u0 - 5 <= a <= u1 + 5 and vb - 5 <= b <= vt + 5):
            continue
        px, py = to_page(np.array([[a, b]]) / 1000)
        c = page.c
        c.dot(px[0], py[0], 2.2, MARK, hollow=True)
        c.segment(px[0] - 3.5, py[0], px[0] + 3.5, py[0], 0.2, MARK)
        c.segment(px[0], py[0] - 3.5, px[0], py[0] + 3.5, 0.2, MARK)


def _cut_marks(page: _Page, x: float, y: float, w: float, h: float) -> None:
    """Corner marks just outside the printed window: trim the page along them."""
    c, n = page.c, 4.0
    for cx, sx in ((x, -1), (x + w, 1)):
        for cy, sy in ((y, -1), (y + h, 1)):
            c.segment(cx + sx * 1, cy, cx + sx * n, cy, 0.25, INK)
            c.segment(cx, cy + sy * 1, cx, cy + sy * n, 0.25, INK)
    c.box(x, y, w, h, 0.12, MUTED)


def _page_map(page: _Page, grid: TileGrid, tile: tuple[int, int]) -> None:
    """A small grid in the heading: this page filled, pages not printed crossed."""
    c = page.c
    cell = min(4.0, 11.0 / grid.rows, 60.0 / grid.cols)
    x0 = page.page[0] - MARGIN_MM - grid.cols * cell
    y0 = MARGIN_MM + 1
    for r in range(grid.rows):
        for col in range(grid.cols):
            x, y = x0 + col * cell, y0 + r * cell
            here = (r, col) == tile
            fill = INK if here else (SHADE if grid.used[r][col] else None)
            c.box(x, y, cell, cell, 0.15, MUTED, fill)
            if not grid.used[r][col]:
                c.segment(x, y, x + cell, y + cell, 0.1, MUTED)
    c.text(x0 - 30, y0, 28, 4, "page map", SMALL_PT, RIGHT, color=MUTED)


def _place_check_square(page: _Page, job: PieceJob, to_page, window) -> None:
    """The check square in the window corner that covers least of the piece."""
    side = 4 * M_PER_IN * 1000 if page.u.imperial else 100.0
    wx, wy, ww, wh = window
    px, py = to_page(job.piece.outline)
    poly = shapely.Polygon(np.column_stack([px, py]))
    corners = [(wx + 3, wy + wh - side - 3), (wx + ww - side - 3, wy + wh - side - 3),
               (wx + 3, wy + 3), (wx + ww - side - 3, wy + 3)]
    if side + 6 > min(ww, wh):
        corners = [(wx + 3, wy + 3)]
    best = min(corners, key=lambda p: poly.intersection(shapely.box(p[0], p[1], p[0] + side,
                                                                    p[1] + side)).area)
    page.check_square(*best)


# -- the writer -------------------------------------------------------------------


class _Writer:
    def __init__(self, design: Design, pack: BuildPack, paper: str, units: str, source: str):
        self.design, self.pack, self.paper, self.source = design, pack, paper, source
        self.u = system(units)
        self.pages = plan_pages(pack, paper)

    def write(self, path: Path) -> None:
        writer = QPdfWriter(str(path))
        writer.setResolution(600)
        writer.setTitle(f"{self.design.name} - build pack")
        writer.setCreator("Hullwright")
        layout = QPageLayout(QPageSize(_PAGE_IDS[self.paper]), QPageLayout.Orientation.Landscape,
                             QMarginsF(0, 0, 0, 0))
        if not writer.setPageLayout(layout):
            raise HullwrightError(f"could not set the PDF page to {self.paper} landscape")
        painter = QPainter()
        if not painter.begin(writer):
            raise HullwrightError(f"cannot write {path.name}")
        try:
            rect = QRectF(0, 0, writer.width(), writer.height())
            first_sheet = 1
            for n, spec in enumerate(self.pages, start=1):
                if n > 1:
                    writer.newPage()
                first_sheet = self._page(painter, rect, writer.resolution(), spec, n, first_sheet)
        finally:
            painter.end()

    def _page(self, painter: QPainter, rect: QRectF, dpi: float, spec: PageSpec, n: int,
              first_sheet: int) -> int:
        if spec.kind == "plate":
            result = assess(self.design)
            paint_plate(painter, rect, dpi, self.design, result.analysis, self.u, self.source,
                        marks_from_assessment(result, self.u))
            return first_sheet
        painter.save()
        painter.setRenderHint(QPainter.RenderHint.Antialiasing, True)
        painter.fillRect(rect, QColor(255, 255, 255))
        canvas = Canvas(painter, QPointF(0, 0), dpi)
        page = _Page(canvas, paper_mm(self.paper), self.u, self.design, n, len(self.pages))
        if spec.kind == "cutlist":
            _paint_cutlist(page, self.pack)
        elif spec.kind == "piece" and spec.job is not None:
            _paint_piece(page, self.pack, self.pack.jobs[spec.job])
        elif spec.kind == "sheets":
            _paint_sheets(page, self.pack, spec.sheets, first_sheet)
            first_sheet += len(spec.sheets)
        elif spec.kind == "materials":
            _paint_materials(page, self.pack)
        elif spec.kind == "tile" and spec.job is not None and spec.tile is not None:
            _paint_tile(page, self.pack, self.pack.jobs[spec.job], spec.tile)
        painter.restore()
        return first_sheet


def write_pack_pdf(
    path: str | Path,
    design: Design,
    pack: BuildPack,
    paper: str = "A4",
    units: str = "metric",
    source: str = "",
    inputs: Sequence[str] = (),
) -> int:
    """Write the build pack PDF to ``path`` safely; returns the number of pages.

    Raises
    ------
    HullwrightError
        For an unknown paper or a file that cannot be written.
    """
    from app.plate import _ensure_gui_app

    _ensure_gui_app()
    paper_mm(paper)
    writer = _Writer(design, pack, paper, units, source)
    write_via_temp(path, writer.write, inputs)
    return len(writer.pages)
