"""Exact coordinates for the selected control point, typed in the current units."""

from __future__ import annotations

from dataclasses import replace

from PySide6.QtCore import Qt
from PySide6.QtWidgets import QHBoxLayout, QLabel, QPushButton, QWidget

from hydro import HullSketch

from app import editing, style
from app.document import HullDocument
from app.length_box import LengthBox
from app.still_label import paint_own_background
from app.view_options import ViewOptions

__all__ = ["PointEntry"]

_AXES = {
    "plan": ("x", "half-breadth"),
    "keel": ("x", "keel height"),
    "sheer": ("x", "sheer height"),
    "section": ("out", "height"),
}
#: Plausible coordinates of a control point (m): along the hull, and across or up.
_ALONG = (-5.0, 40.0)
_ACROSS = (-5.0, 10.0)


class PointEntry(QWidget):
    """Two boxes for the selected point's coordinates, and a button to remove it."""

    def __init__(self, document: HullDocument, options: ViewOptions):
        super().__init__()
        self.document = document
        self.options = options
        # fixed widths: changing texts must never re-lay out the drawings above
        self.title = QLabel()
        self.title.setFixedWidth(230)
        self.first_label, self.second_label = QLabel(), QLabel()
        for label in (self.first_label, self.second_label):
            label.setFixedWidth(self.fontMetrics().horizontalAdvance("half-breadth") + 8)
            label.setAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        self.first = self._box(_ALONG, "first coordinate")
        self.second = self._box(_ACROSS, "second coordinate")
        self.remove = QPushButton("Remove point")
        self.remove.setToolTip("Remove the selected point (Delete)")
        self.remove.clicked.connect(self.document.remove_selected_point)
        hint = QLabel("arrows nudge, Shift ×10")
        hint.setToolTip("Arrow keys nudge the selected point, Shift ten times as far; Esc cancels a drag")
        hint.setStyleSheet(f"color: {style.INK_FAINT};")
        paint_own_background(self)  # a new coordinate repaints this row, not the window
        layout = QHBoxLayout(self)
        layout.setContentsMargins(6, 2, 6, 2)
        for w in (self.title, self.first_label, self.first, self.second_label, self.second, self.remove):
            layout.addWidget(w)
        layout.addWidget(hint, 1)
        for signal in (document.selectionChanged, document.designChanged, document.designChanging, options.changed):
            signal.connect(self.refresh)
        self.refresh()

    def _box(self, span: tuple[float, float], what: str) -> LengthBox:
        box = LengthBox(*span, what, self.options.units)
        box.setMinimumWidth(130)
        box.editingFinished.connect(self._apply)
        box.refused.connect(self.document.notice.emit)
        return box

    def refresh(self) -> None:
        """Show the selected point's coordinates (or disable the boxes)."""
        ref = self.document.selection
        hull = self.document.design.hull
        enabled = ref is not None and isinstance(hull, HullSketch)
        for w in (self.first, self.second, self.remove):
            w.setEnabled(enabled)
        for box in (self.first, self.second):
            box.set_units(self.options.units)
        if not enabled:
            self.title.setText("No point selected: click a handle")
            self.first_label.setText("")
            self.second_label.setText("")
            return
        units = self.options.units
        self.title.setText(f"<b>{ref.label().capitalize()}</b>")
        first, second = _AXES[ref.curve]
        self.first_label.setText(first)
        self.second_label.setText(second)
        a, b = editing.point_position(hull, ref)
        for box, metres in ((self.first, a), (self.second, b)):
            box.set_units(units)
            box.set_metres(metres)

    def _apply(self) -> None:
        ref = self.document.selection
        hull = self.document.committed.hull
        if ref is None or not isinstance(hull, HullSketch) or self.document.is_previewing:
            return
        old = editing.point_position(hull, ref)
        # the boxes hold micrometres: a box left alone keeps the exact coordinate
        typed = [
            was if abs(box.metres() - was) < 1e-6 else box.metres()
            for box, was in ((self.first, old[0]), (self.second, old[1]))
        ]
        if typed[0] == old[0] and typed[1] == old[1]:
            return
        move = editing.move_point(hull, ref, *typed)
        if move.note:
            self.document.notice.emit(f"Held: {move.note}")
        if not self.document.edit(replace(self.document.committed, hull=move.sketch), f"Type {ref.label()}"):
            self.refresh()
