"""Plan view: the hull seen from above, bow to the right, with the half-breadth handles.

The handles sit on the starboard side (y > 0), which, seen from above with the bow to
the right, is the lower half of the drawing.
"""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QRectF, Qt

from hydro import HullSketch, Stations

from app import editing, style
from app.control_points import ControlPoints
from app.document import HullDocument
from app.drawing import OutlineItem, PathCurve, segments
from app.editing import EditRefused
from app.markers import Markers, marker_style
from app.sketch_view import SketchView
from app.view_options import ViewOptions

__all__ = ["PlanView"]

_SAMPLES = 161


class PlanView(SketchView):
    """The gunwale outline b(x), mirrored, with stations, section marks and crew seats."""

    x_name = "x"
    y_name = "y"
    x_title = "length from the aft end"
    y_title = "to starboard"

    def __init__(self, document: HullDocument, options: ViewOptions):
        super().__init__(
            document,
            options,
            "Plan",
            "half-breadth at the gunwale",
        )
        self.outline = OutlineItem(style.INK, 2.0, "#ffffff")
        self.stations = PathCurve(pen=pg.mkPen(style.GRID, width=1), connect="pairs")
        self.section_marks = PathCurve(
            pen=pg.mkPen(style.STATION_MARK, width=1.5, style=Qt.PenStyle.DashLine), connect="pairs"
        )
        self.centreline = pg.InfiniteLine(
            pos=0.0, angle=0, pen=pg.mkPen(style.INK_FAINT, width=1, style=Qt.PenStyle.DashDotLine)
        )
        self.crew = Markers()
        self._seat_style = marker_style("o", 10, "#ffffff", style.CREW)
        for item in (self.outline, self.stations, self.section_marks, self.centreline, self.crew):
            self.plot.addItem(item)
        self.crew.setToolTip("crew seats")
        self.handles = ControlPoints()
        self.add_handles("plan", self.handles)
        # seen from above with the bow to the right: port up, starboard (+y) down
        self.view_box.invertY(True)
        self.apply_options()

    def drawing_key(self) -> tuple:
        design = self.document.design
        hull = design.hull
        if isinstance(hull, Stations):
            return (id(hull),)
        marks = tuple(s.x for s in hull.sections)
        return (hull.plan, hull.station_count, marks, design.loads.crew, self.document.selection)

    def redraw(self) -> None:
        hull = self.document.design.hull
        if isinstance(hull, Stations):
            self._show_stations(hull)
            return
        x0, x1 = hull.x_range
        xs = np.linspace(x0, x1, _SAMPLES)
        b = np.maximum(hull.plan(xs), 0.0)
        self.outline.set_polygon(np.concatenate([xs, xs[::-1]]), np.concatenate([b, -b[::-1]]))
        sx = np.linspace(x0, x1, hull.station_count)
        sb = np.maximum(hull.plan(sx), 0.0)
        self.stations.setData(*segments(sx, -sb, sx, sb))
        reach = 1.12 * float(b.max())
        marks = np.array([s.x for s in hull.sections])
        self.section_marks.setData(*segments(marks, -np.full(marks.size, reach), marks, np.full(marks.size, reach)))
        crew = self.document.design.loads.crew
        seats = [self._seat_style] * len(crew)
        self.crew.set_markers([c.x for c in crew], [c.y for c in crew], seats)
        pts = np.asarray(hull.plan.points, dtype=float)
        self.handles.set_points(pts[:, 0], pts[:, 1], self.selected_index("plan"))

    def _show_stations(self, stations: Stations) -> None:
        """A fixed table of offsets: outline only, nothing to drag."""
        b = stations.gunwale[:, 0]
        xs = stations.x
        self.outline.set_polygon(np.concatenate([xs, xs[::-1]]), np.concatenate([b, -b[::-1]]))
        self.stations.setData(*segments(xs, -b, xs, b))
        self.section_marks.setData([], [])
        self.crew.set_markers([], [], [])
        self.handles.set_points(np.array([]), np.array([]), None)

    def pinned_lines(self, hull: HullSketch) -> tuple[np.ndarray, np.ndarray]:
        x0, x1 = hull.x_range
        xs = np.linspace(x0, x1, _SAMPLES)
        b = np.maximum(hull.plan(xs), 0.0)
        return np.concatenate([xs, xs[::-1], xs[:1]]), np.concatenate([b, -b[::-1], b[:1]])

    def extent(self) -> QRectF:
        hull = self.document.design.hull
        if isinstance(hull, HullSketch):
            x0, x1 = hull.x_range
            b = float(np.max(hull.plan(np.linspace(x0, x1, _SAMPLES))))
        else:
            x0, x1 = float(hull.x[0]), float(hull.x[-1])
            b = hull.max_half_breadth
        b = max(b, 0.05)
        return QRectF(x0, -1.15 * b, x1 - x0, 2.3 * b)

    def insert_at(self, x: float, y: float) -> None:
        sketch = self.sketch()
        try:
            new, ref = editing.insert_point(sketch, "plan", x)
        except EditRefused as e:
            self.document.notice.emit(f"No point added: {e}")
            return
        if self.commit_sketch(new, f"Add {ref.label()}"):
            self.document.select(ref)
