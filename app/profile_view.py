"""Profile view: the hull seen from the side, with keel and sheer handles and the waterline."""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QRectF, Qt

from hydro import Analysis, HullSketch, Stations

from app import editing, style
from app.control_points import ControlPoints
from app.document import HullDocument
from app.drawing import OutlineItem, PathCurve, segments, show_label
from app.editing import EditRefused
from app.markers import Markers, marker_style
from app.sketch_view import SketchView
from app.view_options import ViewOptions

__all__ = ["ProfileView"]

_SAMPLES = 161


class ProfileView(SketchView):
    """Keel line k(x) and sheer line s(x), the upright waterline, G and B."""

    x_name = "x"
    y_name = "z"
    x_title = "length from the aft end"
    y_title = "height"

    def __init__(self, document: HullDocument, options: ViewOptions):
        super().__init__(
            document,
            options,
            "Profile",
            "keel and sheer lines",
        )
        self._extent_cache: tuple = (None, QRectF())
        self.water = OutlineItem(None, 0.0, style.WATER_FILL)
        self.water.setZValue(-5)
        self.outline = OutlineItem(style.INK, 2.0, "#ffffff")
        self.stations = PathCurve(pen=pg.mkPen(style.GRID, width=1), connect="pairs")
        self.section_marks = PathCurve(
            pen=pg.mkPen(style.STATION_MARK, width=1.5, style=Qt.PenStyle.DashLine), connect="pairs"
        )
        self.waterline = PathCurve(pen=pg.mkPen(style.WATER_LINE, width=2))
        self.centres = Markers()
        self.centres.setZValue(8)
        self._centre_styles = [  # G, B
            marker_style("o", 11, "w", style.CENTRE_OF_GRAVITY),
            marker_style("o", 9, {"color": style.WATER_LINE, "width": 2}, "w"),
        ]
        self.g_label = pg.TextItem("G", color=style.CENTRE_OF_GRAVITY, anchor=(-0.3, 1.0))
        self.b_label = pg.TextItem("B", color=style.WATER_LINE, anchor=(-0.3, 0.0))
        for label in (self.g_label, self.b_label):
            self.plot.addItem(label, ignoreBounds=True)
        for item in (self.water, self.outline, self.stations, self.section_marks, self.waterline, self.centres):
            self.plot.addItem(item)
        self.keel_handles = ControlPoints()
        self.sheer_handles = ControlPoints()
        self.add_handles("keel", self.keel_handles)
        self.add_handles("sheer", self.sheer_handles)
        self.apply_options()

    def drawing_key(self) -> tuple:
        hull = self.document.design.hull
        if isinstance(hull, Stations):
            return (id(hull),)
        marks = tuple(s.x for s in hull.sections)
        return (hull.keel, hull.sheer, hull.station_count, marks, self.document.selection)

    def pinned_lines(self, hull: HullSketch) -> tuple[np.ndarray, np.ndarray]:
        x0, x1 = hull.x_range
        xs = np.linspace(x0, x1, 161)
        gap = np.array([np.nan])
        return (np.concatenate([xs, gap, xs]),
                np.concatenate([hull.keel(xs), gap, hull.sheer(xs)]))

    def redraw(self) -> None:
        hull = self.document.design.hull
        if isinstance(hull, Stations):
            self._show_stations(hull)
        else:
            x0, x1 = hull.x_range
            xs = np.linspace(x0, x1, _SAMPLES)
            k, s = hull.keel(xs), hull.sheer(xs)
            self.outline.set_polygon(np.concatenate([xs, xs[::-1]]), np.concatenate([k, s[::-1]]))
            sx = np.linspace(x0, x1, hull.station_count)
            self.stations.setData(*segments(sx, hull.keel(sx), sx, hull.sheer(sx)))
            marks = np.array([sec.x for sec in hull.sections])
            self.section_marks.setData(*segments(marks, hull.keel(marks), marks, hull.sheer(marks)))
            for name, item in (("keel", self.keel_handles), ("sheer", self.sheer_handles)):
                pts = np.asarray(getattr(hull, name).points, dtype=float)
                item.set_points(pts[:, 0], pts[:, 1], self.selected_index(name))

    def _show_stations(self, stations: Stations) -> None:
        low = np.array([h[:, 1].min() for h in stations.half_sections])
        top = stations.gunwale[:, 1]
        xs = stations.x
        self.outline.set_polygon(np.concatenate([xs, xs[::-1]]), np.concatenate([low, top[::-1]]))
        self.stations.setData(*segments(xs, low, xs, top))
        self.section_marks.setData([], [])
        for item in (self.keel_handles, self.sheer_handles):
            item.set_points(np.array([]), np.array([]), None)

    def show_analysis(self, analysis: Analysis) -> None:
        hs = analysis.hydrostatics
        rect = self.extent()
        if hs is None:
            self.water.clear()
            self.waterline.setData([], [])
            self.centres.set_markers([], [], [])
            show_label(self.g_label, "")
            show_label(self.b_label, "")
            return
        pad = 0.08 * rect.width()
        xs = np.array([rect.left() - pad, rect.right() + pad])
        zs = hs.h + hs.tau * xs
        self.waterline.setData(xs, zs)
        deep = rect.top() - 0.3 * rect.height()
        self.water.set_polygon(np.array([xs[0], xs[1], xs[1], xs[0]]), np.array([zs[0], zs[1], deep, deep]))
        w = analysis.weights
        g = (w.lcg, w.vcg)
        b = (hs.lcb, w.vcg - w.kg + hs.kb)
        self.centres.set_markers([g[0], b[0]], [g[1], b[1]], self._centre_styles)
        show_label(self.g_label, "G", g)
        show_label(self.b_label, "B", b)

    def extent(self) -> QRectF:
        hull = self.document.design.hull
        if isinstance(hull, Stations):
            x0, x1 = float(hull.x[0]), float(hull.x[-1])
            low, top = hull.keel_z, float(hull.gunwale[:, 1].max())
            return QRectF(x0, low, x1 - x0, max(top - low, 0.05))
        key = (hull.x_range, hull.keel, hull.sheer)  # a plan drag leaves these as they were
        if key != self._extent_cache[0]:
            x0, x1 = hull.x_range
            xs = np.linspace(x0, x1, _SAMPLES)
            low, top = float(hull.keel(xs).min()), float(hull.sheer(xs).max())
            self._extent_cache = (key, QRectF(x0, low, x1 - x0, max(top - low, 0.05)))
        return QRectF(self._extent_cache[1])

    def insert_at(self, x: float, y: float) -> None:
        sketch = self.sketch()
        name = editing.nearest_curve(sketch, ("keel", "sheer"), x, y)
        try:
            new, ref = editing.insert_point(sketch, name, x)
        except EditRefused as e:
            self.document.notice.emit(f"No point added: {e}")
            return
        if self.commit_sketch(new, f"Add {ref.label()}"):
            self.document.select(ref)
