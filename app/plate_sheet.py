"""The print plate's layout: where each panel goes on the sheet and how it is painted
(lines, table of offsets, loads, figures, righting-arm curve, cautions, title block).
"""

from __future__ import annotations

import datetime as _dt
import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field

import numpy as np
from PySide6.QtCore import QRectF, Qt
from PySide6.QtGui import QColor

from app.plate_content import (
    Column,
    IMPERIAL_SCALES,
    LB_FT3_PER_KG_M3,
    METRIC_SCALES,
    OFFSET_ROW_CHOICES,
    PlateMarks,
    figure_rows,
    hull_lines,
    listed_stations,
    offset_columns,
    ordinal,
    paper_name,
    scale_label,
)
from app.plate_draw import (
    BAND,
    CENTRE,
    CENTRE_OF_GRAVITY,
    CREW,
    HEELING_ARM,
    Canvas,
    HULL,
    INK,
    LEFT,
    Labels,
    MUTED,
    PAPER,
    RIGHT,
    RULE,
    SHADE,
    STRIPE,
    WALL_SIDED,
    WARNING,
    WATER,
    dense,
    nice_step,
    type_sizes,
)
from hydro.design import Design
from hydro.safety import CAUTIONS
from hydro.stability import Analysis, Status
from hydro.wording import list_text, status_sentence
from hydro.builder_stations import builder_stations
from hydro.units import UnitSystem

__all__ = ["PlateLayout", "Sheet"]


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
class _LinesPlan:
    den: int  # lines scale 1:den
    den_b: int  # sections scale 1:den_b
    height: float  # mm the panel needs
    stacked: bool  # sections and dimensions below profile and plan (else beside them)


class Sheet:
    """Lays out and paints every panel of one plate on a canvas (all sizes in mm)."""

    def __init__(
        self,
        canvas: Canvas,
        page_mm: tuple[float, float],
        design: Design,
        analysis: Analysis,
        units: UnitSystem,
        source: str,
        marks: PlateMarks,
    ):
        self.c = canvas
        self.w, self.h = page_mm
        self.t = type_sizes(self.w)
        self.design = design
        self.a = analysis
        self.u = units
        self.source = source
        self.marks = marks
        chosen = marks.station_spacing_m is not None or marks.station_count is not None
        self.lines = hull_lines(
            builder_stations(design, marks.station_spacing_m, marks.station_count)
            if chosen
            else design.stations()
        )
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
                align=RIGHT,
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
        for max_rows in OFFSET_ROW_CHOICES:
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
        scales = METRIC_SCALES if self.u.name == "metric" else tuple(IMPERIAL_SCALES)
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
        sheet = f"on {paper_name(self.w, self.h)} at 100 %"
        if den == den_b:
            aside = f"scale {scale_label(den, u)} {sheet}"
        else:
            aside = (
                f"profile and plan {scale_label(den, u)}, "
                f"sections {scale_label(den_b, u)} {sheet}"
            )
        top = self.heading(x, y, w, "Lines", aside)
        top += max(0.0, (h - plan.height) / 2)  # centre the drawing in spare room
        s = 1000.0 / den
        L, B, Dp = hl.length, hl.beam, self._profile_top()
        x_left = x + 1.0

        def X(xm: float) -> float:
            return x_left + (xm - hl.x[0]) * s

        labels = Labels()
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
                c.text(X(hl.x[i]) - 5, num_y, 10, lh, str(n), t.small, align=CENTRE, color=MUTED)
        c.segment(
            X(hl.x[0]) - 2, prof_base, X(hl.x[-1]) + 2, prof_base, 0.18, MUTED, Qt.PenStyle.DashLine
        )
        xs = [X(v) for v in hl.x]
        for _, cz in hl.chines:
            c.polyline(xs, [Zp(v) for v in cz], 0.25, HULL)
        for line in (hl.keel, hl.sheer_z):
            zs = [Zp(v) for v in line]
            c.polyline(xs, zs, 0.5, HULL)
            labels.avoid(points=dense(xs, zs))
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
        self, X: Callable[[float], float], Zp: Callable[[float], float], labels: Labels
    ) -> None:
        """Crew (numbered as in the load table), G, and level-trim seats on the profile."""
        c, t = self.c, self.t
        lh = self.lh_small
        base = self.lines.base
        w = self.a.weights
        gx, gz = X(w.lcg), Zp(w.vcg - base)
        marks: list[tuple[float, float, str, QColor]] = []
        seats: dict[str, tuple[float, float, str]] = {}
        level: set[str] = set()  # labels of the level-trim seats (drawn hollow)
        for n, ln in enumerate(w.lines, start=1):
            if ln.kind == "crew":
                marks.append((X(ln.x), Zp(ln.z - base), str(n), CREW))
                seats[ln.name] = (X(ln.x), Zp(ln.z - base), str(n))
        for name, sx in self.marks.level_trim_seats:
            px, pz, number = seats.get(name, (X(w.lcg), Zp(w.vcg - base), ""))
            lx = X(sx)
            if abs(lx - px) > 2.5:  # show the move from the present seat
                c.segment(
                    px, pz, lx - math.copysign(1.6, lx - px), pz, 0.25, CREW, Qt.PenStyle.DashLine
                )
                c.arrow_head(lx - math.copysign(1.3, lx - px), pz, lx - px, 0.0, 1.4, CREW)
                labels.avoid(QRectF(min(px, lx), pz - 0.5, abs(lx - px), 1.0))
            marks.append((lx, pz, f"{number} level".strip(), CREW))
            level.add(f"{number} level".strip())
        below_first = level
        for px, pz, _, _ in marks:
            labels.avoid(QRectF(px - 1.3, pz - 1.3, 2.6, 2.6))
        labels.avoid(QRectF(gx - 2.0, gz - 2.0, 4.0, 4.0))
        for px, pz, text, color in marks:
            c.dot(px, pz, 1.1, color, hollow=text in level)
        c.dot(gx, gz, 1.3, PAPER)
        c.dot(gx, gz, 1.3, CENTRE_OF_GRAVITY, hollow=True)
        c.segment(gx - 1.9, gz, gx + 1.9, gz, 0.25, CENTRE_OF_GRAVITY)
        c.segment(gx, gz - 1.9, gx, gz + 1.9, 0.25, CENTRE_OF_GRAVITY)
        for px, pz, text, color in [*marks, (gx, gz, "G", CENTRE_OF_GRAVITY)]:
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
                r.x(), r.y(), r.width(), lh, text, t.small, align=CENTRE, bold=True, color=color
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
        c.text(cx - tw / 2, y - lh / 2, tw, lh, label, t.small, align=CENTRE)

    def _paint_body_plan(
        self, x: float, y: float, w: float, s_body: float, rows: Sequence[int]
    ) -> float:
        """Sections: aft half on the left, fore half on the right.  Returns the bottom y."""
        c, t, hl = self.c, self.t, self.lines
        lh = self.lh_small
        labels = Labels()
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
                labels.avoid(points=dense(px, py))
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
                c.text(r.x(), r.y(), r.width(), lh, text, t.small, align=CENTRE, color=MUTED)
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
            else f"every {ordinal(step)} of {hl.x.size} stations"
        )
        aside = (
            f"ft-in-eighths (2-04-3 = 2' 4 3/8\"), from centreline and base; {which}"
            if u.imperial
            else f"{u.length}; half-breadths from the centreline, heights above the base line; "
            f"{which}"
        )
        top = self.heading(x, y, w, "Table of offsets", aside)
        cols = [
            Column("Station", "no.", tuple(float(n) for n in range(len(rows)))),
            Column("Station", "x from aft", tuple(float(hl.x[i] - hl.x[0]) for i in rows)),
        ]
        cols += offset_columns(hl, rows, u)
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
                gx, top, gw, lh, c.elide(name, size, gw - 1, True), size, align=CENTRE, bold=True
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
                align=CENTRE,
                color=MUTED,
            )
        yy = top + lh * 2
        for r in range(len(rows)):
            if r % 2 == 1:
                c.box(x, yy, w, lh, fill=STRIPE)
            for j, col in enumerate(cols):
                v = col.values[r]
                text = (
                    "—"
                    if v is None
                    else (str(int(v)) if j == 0 else u.offset_text(v))
                )
                c.text(x + j * col_w, yy, col_w - 2.5, lh, text, size, align=RIGHT, bold=(j == 0))
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
        aligns = [RIGHT, LEFT, LEFT, RIGHT, RIGHT, RIGHT, RIGHT]
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
        msg = self.c.wrap(status_sentence(self.a, self.u), size, w, bold=True)
        return self.head_h + lh * (len(msg) + 0.3 + len(figure_rows(self.a, self.u, self.marks)))

    def paint_figures(self, x: float, y: float, w: float, h: float, size: float) -> None:
        self.panel("figures", x, y, w, h)
        c = self.c
        top = self.heading(x, y, w, "Figures", "loaded, free to trim; GM upright")
        lh = c.line_height(size)
        color = HULL if self.a.status is Status.OK else WARNING
        for ln in c.wrap(status_sentence(self.a, self.u), size, w, bold=True):
            c.text(x, top, w, lh, ln, size, bold=True, color=color)
            top += lh
        top += lh * 0.3
        rows = figure_rows(self.a, self.u, self.marks)
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
                x, top, w, lh * 2, "No curve: the hull cannot carry the load.", t.body, color=WARNING
            )
            return
        m = self.marks
        heel = curve.heel_deg
        gz = u.to_length(1.0) * curve.gz
        finite = np.isfinite(gz)
        hmax = float(heel[-1])
        hmin = min(float(heel[0]), 0.0)  # both sides when G is off the centreline
        open_boat = self.design.settings.open_boat
        ymax = float(np.nanmax(gz)) if finite.any() else 1.0
        ymin = float(np.nanmin(gz)) if finite.any() else 0.0
        if m.crew_shift_arm is not None:  # show the whole heeling-arm curve
            ymax = max(ymax, u.to_length(m.crew_shift_arm))
        ystep = nice_step(max(ymax - min(ymin, 0.0), 1e-6), 5)
        y_hi = math.ceil((ymax + 0.12 * (ymax - min(ymin, 0.0))) / ystep) * ystep
        y_lo = min(0.0, math.floor(ymin / ystep) * ystep)
        if y_hi <= y_lo:
            y_hi = y_lo + ystep
        ticks = [y_lo + k * ystep for k in range(round((y_hi - y_lo) / ystep) + 1)]
        def tick_text(v: float) -> str:  # inches with fractions, never decimals
            return u.length_text(u.from_length(v), unit=False) if u.imperial else f"{v:g}"

        ylabel_w = max(c.text_width(tick_text(v), t.small) for v in ticks) + 1.5
        legend = [
            (HULL, Qt.PenStyle.SolidLine, 0.55, "GZ from heeled equilibrium, free to trim"),
            (WALL_SIDED, Qt.PenStyle.DashLine, 0.25, "wall-sided estimate (holds at small heel only)"),
        ]
        if m.crew_shift_heel_deg is not None or m.crew_shift_arm is not None:
            txt = (
                f"crew shift: heel {m.crew_shift_heel_deg:.1f}°"
                if m.crew_shift_heel_deg is not None
                else "crew-shift heeling arm"
            )
            legend.append(
                (
                    HEELING_ARM,
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
            return px0 + (a - hmin) / (hmax - hmin) * (px1 - px0)

        def PY(v: float) -> float:
            return py1 - (v - y_lo) / (y_hi - y_lo) * (py1 - py0)

        labels = Labels()
        gw = curve.gunwale_immersion_deg
        beyond = gw is not None and hmin < gw < hmax and open_boat
        if beyond and gw is not None:  # an open boat fills past the gunwale (a sealed one not)
            if gw > 0:
                c.box(PX(gw), py0, px1 - PX(gw), py1 - py0, fill=SHADE)
            else:
                c.box(px0, py0, PX(gw) - px0, py1 - py0, fill=SHADE)
        tick = 10.0 if hmax - hmin <= 90 else 20.0 if hmax - hmin <= 180 else 30.0
        a = math.ceil(hmin / tick) * tick
        while a <= hmax + 1e-9:
            c.segment(PX(a), py0, PX(a), py1, 0.12, RULE)
            c.text(PX(a) - 6, py1 + 0.6, 12, lh, f"{a:g}", t.small, align=CENTRE)
            a += tick
        if hmin < 0:
            c.segment(PX(0.0), py0, PX(0.0), py1, 0.3, INK)
        for v in ticks:
            zero = abs(v) < 1e-12
            c.segment(px0, PY(v), px1, PY(v), 0.3 if zero else 0.12, INK if zero else RULE)
            c.text(x, PY(v) - lh / 2, ylabel_w, lh, tick_text(v), t.small, align=RIGHT)
        c.segment(px0, py0, px0, py1, 0.3)
        axis = "heel (°, + to starboard)" if hmin < 0 else "heel (°)"
        c.text(px1 - 50, py1 + 0.6 + lh, 50, lh, axis, t.small, align=RIGHT, color=MUTED)
        c.text(px0 + 1.0, py0, 30, lh, f"GZ ({u.length})", t.small, color=MUTED)
        labels.avoid(QRectF(px0 + 1.0, py0, c.text_width(f"GZ ({u.length})", t.small), lh))
        ws = u.to_length(1.0) * curve.wall_sided
        keep = np.isfinite(ws) & (ws <= y_hi) & (ws >= y_lo)
        shown = np.flatnonzero(keep)
        for run in np.split(shown, np.flatnonzero(np.diff(shown) > 1) + 1) if shown.size else ():
            wx, wy = [PX(v) for v in heel[run]], [PY(v) for v in ws[run]]
            c.polyline(wx, wy, 0.25, WALL_SIDED, Qt.PenStyle.DashLine)
            labels.avoid(points=dense(wx, wy))
        idx = np.flatnonzero(finite)
        if idx.size:
            for run in np.split(idx, np.flatnonzero(np.diff(idx) > 1) + 1):
                gx_, gy_ = [PX(v) for v in heel[run]], [PY(v) for v in gz[run]]
                c.polyline(gx_, gy_, 0.55, HULL)
                labels.avoid(points=dense(gx_, gy_))
        if m.crew_shift_arm is not None:
            arm = u.to_length(m.crew_shift_arm) * np.cos(np.radians(heel))
            ax_, ay_ = [PX(v) for v in heel], [PY(v) for v in arm]
            c.polyline(ax_, ay_, 0.35, HEELING_ARM)
            labels.avoid(points=dense(ax_, ay_))
        if m.crew_shift_heel_deg is not None and hmin <= m.crew_shift_heel_deg <= hmax:
            hx = PX(m.crew_shift_heel_deg)
            c.segment(hx, py0, hx, py1, 0.35, HEELING_ARM, Qt.PenStyle.DashDotLine)
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
            c.text(r.x(), r.y(), r.width(), lh, text, t.small, align=CENTRE, color=color)

        if gw is not None:
            c.segment(PX(gw), py0, PX(gw), py1, 0.35, WATER, Qt.PenStyle.DashLine)
            labels.avoid(points=[(PX(gw), py0 + k) for k in np.arange(0.0, py1 - py0, 0.8)])
        if finite.any():
            mx, my = PX(curve.max_gz_deg), PY(u.to_length(curve.side * curve.max_gz))
            c.dot(mx, my, 0.9, HULL)
            labels.avoid(QRectF(mx - 1, my - 1, 2, 2))
            label(
                f"max {u.length_text(curve.max_gz)} at {abs(curve.max_gz_deg):.0f}°",
                mx,
                my,
                HULL,
                ["above-right", "above", "above-left", "below-right"],
            )
        if curve.list_deg is not None and abs(curve.list_deg) >= 0.05:
            c.dot(PX(curve.list_deg), PY(0.0), 0.9, HULL)
            label(
                list_text(curve.list_deg),
                PX(curve.list_deg),
                PY(0.0),
                HULL,
                ["above-right", "above-left", "below-right", "below-left"],
            )
        if curve.avs_deg is not None and hmin <= curve.avs_deg <= hmax and curve.avs_deg != 0:
            c.dot(PX(curve.avs_deg), PY(0.0), 0.9, HULL)
            label(
                f"GZ = 0 at {abs(curve.avs_deg):.0f}°",
                PX(curve.avs_deg),
                PY(0.0),
                HULL,
                ["below-left", "below-right", "above-right", "above-left"],
            )
        if gw is not None:
            label(
                f"{'gunwale' if open_boat else 'deck edge'} under at {abs(gw):.1f}°",
                PX(gw),
                0.0,
                WATER,
                ["top-left", "bottom-left", "top-right", "bottom-right"],
            )
            if beyond:
                spots = ["top-right", "bottom-right"] if gw > 0 else ["top-left", "bottom-left"]
                label("open boat floods beyond", PX(gw), 0.0, MUTED, spots)
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
        c.box(x, top - 1.0, 1.2, y + h - top + 1.0, fill=WARNING)
        col_w = (w - 6.0 - (len(columns) - 1) * t.gap) / len(columns)
        item = 0
        for k, column in enumerate(columns):
            cx = x + 4.0 + k * (col_w + t.gap)
            yy = top
            for ws in column:
                item += 1
                disclaimer = item == len(CAUTIONS)  # the last caution, set in bold
                if not disclaimer:
                    c.text(cx - 0.5, yy, 3.0, lh, "•", size, bold=True, color=WARNING)
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
            else f"{rho * LB_FT3_PER_KG_M3:.1f} lb/ft³"
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
            align=RIGHT,
            color=MUTED,
        )
