"""Section view: one section shape at true scale at its station, both sides, afloat.

The shape is stored normalised (u, v) and drawn in true scale at its station, so a
handle dragged here moves in real millimetres or inches.  The upright waterline at the
station, and G, B and M, are drawn from the analysis, so GM can be seen as a distance.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QRectF, QSignalBlocker
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QCheckBox, QComboBox, QHBoxLayout, QLabel, QToolButton

from hydro import Analysis, HullSketch, Stations
from hydro.curves import sample_polyline
from hydro.hull import SMOOTH_SAMPLES_PER_SPAN

from app import editing, style
from app.control_points import ControlPoints
from app.document import HullDocument
from app.drawing import OutlineItem, PathCurve, StraightLine, show_label
from app.editing import EditRefused, PointRef
from app.length_box import LengthBox
from app.markers import Markers, marker_style
from app.sketch_view import SketchView
from app.view_options import ViewOptions

__all__ = ["SectionView"]


class SectionView(SketchView):
    """The chosen section shape, mirrored, with its station, waterline, G, B and M."""

    x_name = "y"
    y_name = "z"
    x_title = "to starboard"
    y_title = "height"

    def __init__(self, document: HullDocument, options: ViewOptions):
        super().__init__(document, options, "Section", "true scale, looking forward")
        self.shape_index = 0
        self._frame_cache: tuple = (None, -1, (0.0, 0.0, 0.0))
        self._samples_cache: tuple = (None, np.empty((0, 2)))
        self.shape_box = QComboBox()
        self.shape_box.setToolTip("Which section shape to edit")
        self.shape_box.currentIndexChanged.connect(self._on_shape_chosen)
        self.station_box = LengthBox(-5.0, 40.0, "station of this shape", options.units)
        self.station_box.setToolTip(
            "Station of this shape (length from the aft end); type e.g. 1.2 m or 47 1/4"
        )
        self.station_box.setPrefix("at x = ")
        self.station_box.setMinimumWidth(150)
        self.station_box.refused.connect(document.notice.emit)
        self.station_box.editingFinished.connect(self._on_station_typed)
        self.smooth_box = QCheckBox("smooth")
        self.smooth_box.setToolTip("Smooth curve through the points, or hard chines (straight panels)")
        self.smooth_box.toggled.connect(self._on_smooth_toggled)
        add = QToolButton()
        add.setText("+")
        add.setToolTip("Add a copy of this shape at another station")
        add.clicked.connect(self._add_shape)
        remove = QToolButton()
        remove.setText("−")
        remove.setToolTip("Remove this shape (one must remain)")
        remove.clicked.connect(self._remove_shape)
        controls = QHBoxLayout()
        controls.setContentsMargins(6, 0, 4, 2)
        for w in (self.shape_box, self.station_box, self.smooth_box, add, remove):
            controls.addWidget(w)
        controls.addStretch(1)
        self.layout().insertLayout(1, controls)

        self.water = OutlineItem(None, 0.0, style.WATER_FILL)
        self.water.setZValue(5)
        self.outline = OutlineItem(style.INK, 2.0, "#ffffff")
        self.body_plan = PathCurve(pen=pg.mkPen(style.INK_FAINT, width=1), connect="finite")
        self.waterline = PathCurve(pen=pg.mkPen(style.WATER_LINE, width=2))
        self.waterline.setZValue(6)
        self.centreline = StraightLine(pg.mkPen(style.INK_FAINT, width=1), vertical=True)
        self.centres = Markers()
        self.centres.setZValue(8)
        self._centre_styles = [  # G, B, M
            marker_style("o", 11, "w", style.CENTRE_OF_GRAVITY),
            marker_style("o", 9, {"color": style.WATER_LINE, "width": 2}, "w"),
            marker_style("t1", 11, "w", style.INK),
        ]
        self.labels = {name: pg.TextItem(name, color=c, anchor=(-0.4, 0.5)) for name, c in (
            ("G", style.CENTRE_OF_GRAVITY), ("B", style.WATER_LINE), ("M", style.INK))}
        for item in (self.water, self.outline, self.body_plan, self.waterline, self.centreline, self.centres):
            self.plot.addItem(item)
        for label in self.labels.values():
            label.setZValue(9)
            self.plot.addItem(label, ignoreBounds=True)
        # the boat heeled at an angle picked on the GZ curve: tilted waterline, righting arm
        self.heel_deg: float | None = None
        self.arm = pg.PlotCurveItem(pen=pg.mkPen(style.CENTRE_OF_GRAVITY, width=3))
        self.buoyancy_line = pg.PlotCurveItem(
            pen=pg.mkPen(style.WATER_LINE, width=1.5, style=Qt.PenStyle.DashLine)
        )
        for item in (self.arm, self.buoyancy_line):
            item.setZValue(7)
            self.plot.addItem(item, ignoreBounds=True)
        self.heel_text = QLabel()
        self.upright = QToolButton()
        self.upright.setText("Upright")
        self.upright.setToolTip("Back to the boat floating upright")
        self.upright.clicked.connect(lambda: self.show_heel(None))
        self.upright.hide()
        controls.insertWidget(controls.count() - 1, self.heel_text)
        controls.addWidget(self.upright)
        self.handles = ControlPoints()
        self.add_handles("section", self.handles)
        self.apply_options()

    def show_heel(self, heel_deg: float | None) -> None:
        """Draw the boat heeled at ``heel_deg`` (nearest computed angle), or upright (None)."""
        self.heel_deg = heel_deg
        self.upright.setVisible(heel_deg is not None)
        if self.document.analysis is not None:
            self.show_analysis(self.document.analysis)

    # ------------------------------------------------------------ which shape

    def ref_for(self, curve: str, index: int) -> PointRef:
        return PointRef("section", index, self.shape_index)

    def owns(self, ref: PointRef) -> bool:
        return ref.curve == "section" and ref.shape == self.shape_index

    def show_shape(self, index: int) -> None:
        """Edit section shape ``index``."""
        self.shape_index = index
        self.refresh()
        if self.document.analysis is not None:
            self.show_analysis(self.document.analysis)
        self.fit()

    def _on_shape_chosen(self, index: int) -> None:
        if index >= 0 and index != self.shape_index:
            self.document.select(None)
            self.show_shape(index)

    def _edit_sections(self, sections: tuple, text: str) -> bool:
        return self.commit_sketch(replace(self.sketch(), sections=sections), text)

    def _on_station_typed(self) -> None:
        sketch = self.sketch()
        if sketch is None:
            return
        x = self.station_box.metres()
        shape = sketch.sections[self.shape_index]
        if abs(x - shape.x) < 1e-6:  # the box holds micrometres
            return
        sections = list(sketch.sections)
        sections[self.shape_index] = replace(shape, x=x)
        if not self._edit_sections(tuple(sections), f"Move section {self.shape_index + 1}"):
            self.refresh()

    def _on_smooth_toggled(self, on: bool) -> None:
        sketch = self.sketch()
        if sketch is None or sketch.sections[self.shape_index].smooth == on:
            return
        sections = list(sketch.sections)
        sections[self.shape_index] = replace(sections[self.shape_index], smooth=on)
        if not self._edit_sections(tuple(sections), f"Section {self.shape_index + 1} {'smooth' if on else 'hard chine'}"):
            self.refresh()

    def _add_shape(self) -> None:
        sketch = self.sketch()
        if sketch is None or self.document.is_previewing:
            return
        shape = sketch.sections[self.shape_index]
        x0, x1 = sketch.x_range
        nxt = sketch.sections[self.shape_index + 1].x if self.shape_index + 1 < len(sketch.sections) else x1
        if nxt - shape.x < 2 * editing.MIN_GAP_M:
            prev = sketch.sections[self.shape_index - 1].x if self.shape_index > 0 else x0
            new_x, at = 0.5 * (prev + shape.x), self.shape_index
        else:
            new_x, at = 0.5 * (shape.x + nxt), self.shape_index + 1
        sections = list(sketch.sections)
        sections.insert(at, replace(shape, x=new_x))
        if self._edit_sections(tuple(sections), "Add section shape"):
            self.show_shape(at)

    def _remove_shape(self) -> None:
        sketch = self.sketch()
        if sketch is None or self.document.is_previewing:
            return
        if len(sketch.sections) < 2:
            self.document.notice.emit("Not removed: the hull needs at least one section shape")
            return
        sections = sketch.sections[: self.shape_index] + sketch.sections[self.shape_index + 1 :]
        if self._edit_sections(sections, f"Remove section {self.shape_index + 1}"):
            self.document.select(None)
            self.show_shape(max(0, self.shape_index - 1))

    # ------------------------------------------------------------ drawing

    def _update_header(self, sketch: HullSketch) -> None:
        units = self.options.units
        n = len(sketch.sections)
        with QSignalBlocker(self.shape_box):
            if self.shape_box.count() != n:
                self.shape_box.clear()
                self.shape_box.addItems([f"shape {i + 1} of {n}" for i in range(n)])
            self.shape_box.setCurrentIndex(self.shape_index)
        with QSignalBlocker(self.station_box):
            self.station_box.set_units(units)
            self.station_box.set_metres(sketch.sections[self.shape_index].x)
        with QSignalBlocker(self.smooth_box):
            self.smooth_box.setChecked(sketch.sections[self.shape_index].smooth)

    def _frame(self, hull: HullSketch, index: int) -> tuple[float, float, float]:
        """The shape's station frame (b, k, d), worked out once per design on screen."""
        cached_hull, cached_index, frame = self._frame_cache
        if cached_hull is not hull or cached_index != index:
            frame = editing.section_frame(hull, index)
            self._frame_cache = (hull, index, frame)
        return frame

    def _shape_samples(self, shape) -> np.ndarray:
        """The shape's outline (u, v), sampled once per shape (a plan or profile drag
        rescales it on every frame, but leaves the shape as it was)."""
        key = (shape.points, shape.smooth)
        if key != self._samples_cache[0]:
            points = np.asarray(shape.points, dtype=float)
            uv = sample_polyline(points, shape.smooth, SMOOTH_SAMPLES_PER_SPAN)
            self._samples_cache = (key, uv)
        return self._samples_cache[1]

    def drawing_key(self) -> tuple:
        hull = self.document.design.hull
        if isinstance(hull, Stations):
            return (id(hull),)
        index = min(self.shape_index, len(hull.sections) - 1)
        frame = self._frame(hull, index)
        return (index, hull.sections, frame, self.document.selection)

    def redraw(self) -> None:
        hull = self.document.design.hull
        if isinstance(hull, Stations):
            self._show_stations(hull)
            return
        self.shape_index = min(self.shape_index, len(hull.sections) - 1)
        self._update_header(hull)
        shape = hull.sections[self.shape_index]
        b, k, d = self._frame(hull, self.shape_index)
        uv = self._shape_samples(shape)
        y, z = uv[:, 0] * b, k + uv[:, 1] * d
        self.outline.set_polygon(np.concatenate([y, -y[::-1]]), np.concatenate([z, z[::-1]]))
        self.body_plan.setData([], [])
        pts = np.asarray(shape.points, dtype=float)
        self.handles.set_points(pts[:, 0] * b, k + pts[:, 1] * d, self.selected_index("section"))

    def _show_stations(self, stations: Stations) -> None:
        """A fixed table of offsets: every station, mirrored, nothing to drag."""
        ys, zs = [], []
        for h in stations.half_sections:
            ys += [h[:, 0], -h[::-1, 0], [np.nan]]
            zs += [h[:, 1], h[::-1, 1], [np.nan]]
        self.body_plan.setData(np.concatenate(ys), np.concatenate(zs))
        self.outline.set_polygon(np.array([0.0]), np.array([0.0]))
        self.handles.set_points(np.array([]), np.array([]), None)

    def _station_x(self) -> float | None:
        hull = self.document.design.hull
        if isinstance(hull, HullSketch):
            return hull.sections[min(self.shape_index, len(hull.sections) - 1)].x
        return None

    def show_analysis(self, analysis: Analysis) -> None:
        hs = analysis.hydrostatics
        if hs is None:
            self.water.clear()
            self.waterline.setData([], [])
            self.centres.set_markers([], [], [])
            for label in self.labels.values():
                show_label(label, "")
            return
        rect = self.extent()
        x = self._station_x()
        x = 0.5 * (hs.station_x[0] + hs.station_x[-1]) if x is None else x
        wl = hs.h + hs.tau * x
        reach = 0.7 * rect.width()
        ys = np.array([-reach, reach])
        self.waterline.setData(ys, np.array([wl, wl]))
        deep = rect.top() - 0.4 * rect.height()
        self.water.set_polygon(np.array([ys[0], ys[1], ys[1], ys[0]]), np.array([wl, wl, deep, deep]))
        w = analysis.weights
        if self._show_heeled(analysis, x, reach, rect.height()):
            return
        keel_z = w.vcg - w.kg
        points = {"G": (w.tcg, w.vcg), "B": (hs.tcb, keel_z + hs.kb), "M": (0.0, keel_z + hs.km)}
        xs, zs = zip(*(points[name] for name in ("G", "B", "M")))
        self.centres.set_markers(xs, zs, self._centre_styles)
        for name, label in self.labels.items():
            show_label(label, name, points[name])

    def _show_heeled(self, analysis: Analysis, x: float, reach: float, depth: float) -> bool:
        """The heeled waterline, G and the righting arm; False (nothing drawn) if upright."""
        curve = analysis.curve
        if self.heel_deg is None or curve is None or curve.waterlines is None:
            for line in (self.arm, self.buoyancy_line):
                if line.getData()[0] is not None and len(line.getData()[0]):
                    line.setData([], [])  # only once: pyqtgraph redoes its bounds each time
            self.heel_text.setText("")
            return False
        i = int(np.argmin(np.abs(curve.heel_deg - self.heel_deg)))
        phi = math.radians(float(curve.heel_deg[i]))
        level = float(curve.waterlines[0][i] + curve.waterlines[1][i] * x)
        across = np.array([math.cos(phi), math.sin(phi)])  # level, seen in the boat
        up = np.array([-math.sin(phi), math.cos(phi)])
        p0 = level * up  # on the water plane: z cos(phi) - y sin(phi) = level
        ends = np.array([p0 - reach * across, p0 + reach * across])
        below = ends - 2 * depth * up
        self.waterline.setData(ends[:, 0], ends[:, 1])
        self.water.set_polygon(
            np.array([ends[0, 0], ends[1, 0], below[1, 0], below[0, 0]]),
            np.array([ends[0, 1], ends[1, 1], below[1, 1], below[0, 1]]),
        )
        w = analysis.weights
        g = np.array([w.tcg, w.vcg])
        gz = float(curve.gz[i])
        z = g + gz * across if math.isfinite(gz) else g
        self.arm.setData([g[0], z[0]], [g[1], z[1]])
        line = np.array([z - reach * up, z + reach * up])
        self.buoyancy_line.setData(line[:, 0], line[:, 1])
        self.centres.set_markers([g[0]], [g[1]], self._centre_styles[:1])
        show_label(self.labels["G"], "G", g)
        show_label(self.labels["B"], "B acts along this line", z - 0.3 * reach * up)
        show_label(self.labels["M"], "")
        u = self.options.units
        deg = float(curve.heel_deg[i])
        side = "starboard" if deg >= 0 else "port"
        arm = "righting arm" if gz >= 0 else "capsizing arm"
        self.heel_text.setText(f"heeled {abs(deg):.0f}° to {side}: {arm} {u.length_text(abs(gz))}")
        return True

    def extent(self) -> QRectF:
        hull = self.document.design.hull
        if isinstance(hull, HullSketch):
            index = min(self.shape_index, len(hull.sections) - 1)
            b, k, d = self._frame(hull, index)
            b = max(b * max(1.0, max(p[0] for p in hull.sections[index].points)), 0.05)
            return QRectF(-b, k, 2 * b, max(d, 0.05))
        b = hull.max_half_breadth
        top = float(max(h[:, 1].max() for h in hull.half_sections))
        return QRectF(-b, hull.keel_z, 2 * b, max(top - hull.keel_z, 0.05))

    def insert_at(self, x: float, y: float) -> None:
        try:
            new, ref = editing.insert_section_point(self.sketch(), self.shape_index, x, y)
        except EditRefused as e:
            self.document.notice.emit(f"No point added: {e}")
            return
        if self.commit_sketch(new, f"Add {ref.label()}"):
            self.document.select(ref)
