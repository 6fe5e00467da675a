"""The dimensions panel: set the hull's main dimensions directly, the shape is kept.

Length, beam, depth, rocker fore and aft; bottom width and flare for hard-chine
sections that start on the keel; spacing and width of the hulls for twin-hull
sections.  Each change rescales the sketch through :mod:`hydro.resize` and is one undo
step; the fields always show the committed design, so undo and redo update them.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Callable

from PySide6.QtCore import QSignalBlocker, Qt
from PySide6.QtWidgets import QDoubleSpinBox, QFormLayout, QLabel, QVBoxLayout, QWidget

from hydro import HullSketch, HullwrightError
from hydro import resize
from hydro.resize import Dimensions

from app import style
from app.document import HullDocument
from app.length_box import LengthBox
from app.view_options import ViewOptions

__all__ = ["DimensionsPanel"]

#: (key, label, low m, high m, tooltip) of the length fields.
_FIELDS = (
    ("length", "Length", 0.3, 40.0, "Overall length, aft end to bow; stretches the whole sketch"),
    ("beam", "Beam", 0.05, 20.0, "Widest breadth at the gunwale; scales every half-breadth"),
    ("depth", "Depth", 0.02, 5.0,
     "Gunwale above the keel at mid-length; scales every height, rocker included"),
    ("rocker_aft", "Rocker aft", 0.0, 2.0, "Keel at the aft end above its lowest point"),
    ("rocker_fore", "Rocker fore", 0.0, 2.0, "Keel at the bow above its lowest point"),
    ("bottom_width", "Bottom width", 0.01, 20.0,
     "Chine to chine where the hull is widest (hard-chine sections)"),
    ("hull_spacing", "Hull spacing", 0.05, 20.0, "Twin hulls: centre to centre"),
    ("hull_width", "Hull width", 0.01, 10.0, "Twin hulls: the width of one hull"),
)


def _resizer(key: str) -> Callable[[HullSketch, float], HullSketch]:
    """The :mod:`hydro.resize` function that sets dimension ``key``."""
    return {
        "length": resize.with_length,
        "beam": resize.with_beam,
        "depth": resize.with_depth,
        "rocker_aft": lambda s, v: resize.with_rocker(s, aft=v),
        "rocker_fore": lambda s, v: resize.with_rocker(s, fore=v),
        "bottom_width": resize.with_bottom_width,
        "flare_deg": resize.with_flare,
        "hull_spacing": lambda s, v: resize.with_twin_hulls(s, spacing=v),
        "hull_width": lambda s, v: resize.with_twin_hulls(s, width=v),
    }[key]


class DimensionsPanel(QWidget):
    """Fields for the main dimensions of the sketch (see the module docstring).

    Attributes
    ----------
    fields : dict of key -> LengthBox (and "flare_deg" -> a degree spin box)
    """

    def __init__(self, document: HullDocument, options: ViewOptions):
        super().__init__()
        self.document = document
        self.options = options
        self.fields: dict[str, QDoubleSpinBox] = {}
        self._rows: dict[str, tuple[QLabel, QWidget]] = {}
        form = QFormLayout()
        form.setFieldGrowthPolicy(QFormLayout.FieldGrowthPolicy.FieldsStayAtSizeHint)
        for key, label, low, high, tip in _FIELDS:
            box = LengthBox(low, high, label.lower(), options.units)
            box.setToolTip(f"{tip}. Type e.g. 2.4 m, 8 ft, 94 1/2 or 7' 10 1/2\"")
            box.refused.connect(document.notice.emit)
            self._add(form, key, label, box)
            if key == "bottom_width":
                self._add(form, "flare_deg", "Flare", self._flare_box())
        self.note = QLabel()
        self.note.setWordWrap(True)
        self.note.setStyleSheet(f"color: {style.INK_FAINT};")
        layout = QVBoxLayout(self)
        layout.setContentsMargins(8, 6, 8, 6)
        layout.addLayout(form)
        layout.addWidget(self.note)
        layout.addStretch(1)
        document.designChanged.connect(self.refresh)
        options.changed.connect(self.refresh)
        self.refresh()

    def _flare_box(self) -> QDoubleSpinBox:
        box = QDoubleSpinBox()
        box.setRange(0.0, 79.0)
        box.setDecimals(1)
        box.setSuffix("°")
        box.setKeyboardTracking(False)
        box.setToolTip("Side angle from the vertical, chine to gunwale, where the hull is widest")
        return box

    def _add(self, form: QFormLayout, key: str, label: str, box: QDoubleSpinBox) -> None:
        box.setMinimumWidth(150)
        box.valueChanged.connect(lambda _v, k=key: self._on_changed(k))
        name = QLabel(label)
        form.addRow(name, box)
        self.fields[key] = box
        self._rows[key] = (name, box)

    def dimensions(self) -> Dimensions | None:
        """The committed sketch's dimensions (None for a fixed table of offsets)."""
        hull = self.document.committed.hull
        return resize.measure(hull) if isinstance(hull, HullSketch) else None

    def refresh(self) -> None:
        """Show the committed design's dimensions in the current units."""
        dims = self.dimensions()
        units = self.options.units
        for key, box in self.fields.items():
            value = None if dims is None else getattr(dims, key)
            name, _ = self._rows[key]
            name.setVisible(value is not None)
            box.setVisible(value is not None)
            if isinstance(box, LengthBox):
                box.set_units(units)
            if value is None:
                continue
            if isinstance(box, LengthBox):
                box.set_metres(value)
            else:
                with QSignalBlocker(box):
                    box.setValue(value)
        if dims is None:
            self.note.setText("A fixed table of offsets has no sketch to resize.")
        elif dims.hull_spacing is not None:
            self.note.setText("Twin hulls: spacing and width move and size both hulls.")
        elif dims.bottom_width is not None:
            self.note.setText(
                "Hard chine: bottom width and flare move the chine; the gunwale stays."
            )
        else:
            self.note.setText("Round bilge: length, beam and depth keep the shape.")

    def _on_changed(self, key: str) -> None:
        hull = self.document.committed.hull
        if not isinstance(hull, HullSketch) or self.document.is_previewing:
            return
        box = self.fields[key]
        value = box.metres() if isinstance(box, LengthBox) else box.value()
        old = getattr(resize.measure(hull), key)
        if old is not None and abs(value - old) < 1e-6:  # the boxes hold micrometres
            return
        try:
            sketch = _resizer(key)(hull, value)
        except HullwrightError as e:
            self.document.notice.emit(f"Not changed: {e}")
            self.refresh()
            return
        label = self._rows[key][0].text().lower()
        design = self.document.committed
        fx = sketch.length / hull.length if key == "length" else 1.0
        fy = resize.measure(sketch).beam / resize.measure(hull).beam if key == "beam" else 1.0
        loads = resize.move_loads(design.loads, hull.x_range[0], fx, fy)  # crew keep their place
        if not self.document.edit(replace(design, hull=sketch, loads=loads), f"Set {label}"):
            self.refresh()
