"""An editable table of load items (crew, materials, ballast) in display units.

Each row is one frozen dataclass from :mod:`hydro.loads`; each column one of its fields,
converted to the current units.  A typed value becomes a new tuple of items, announced
with ``rowsEdited``; the table never changes the design itself.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Any

from PySide6.QtCore import QSignalBlocker, Qt, Signal
from PySide6.QtWidgets import QAbstractItemView, QHeaderView, QTableWidget, QTableWidgetItem

from hydro.units import LengthError, UnitSystem

__all__ = ["Column", "LoadTable", "areal_factor"]

#: A load's position or height beyond this (m) is a typing slip, not a boat.
PLAUSIBLE_M = 30.0


def areal_factor(units: UnitSystem) -> float:
    """Display units of areal density per kg/m^2 (1 in metric, oz/yd^2 in imperial)."""
    return units.areal_factor


@dataclass(frozen=True)
class Column:
    """One column: a dataclass field shown as ``kind``.

    kind : "text", "mass", "length", "number" (plain), "areal" (mass per area) or
        "surface" (a check box: is ``attr`` in the item's ``surfaces``)
    """

    header: str
    attr: str
    kind: str
    tip: str = ""

    def unit(self, units: UnitSystem) -> str:
        if self.kind == "mass":
            return units.mass
        if self.kind == "length":
            return units.length
        if self.kind == "areal":
            return units.areal
        return ""


class LoadTable(QTableWidget):
    """Rows of load items; typing in a cell emits the edited tuple.

    Signals
    -------
    rowsEdited(tuple, str) : the items after the edit, and a name for the undo list
    invalidEntry(str) : what was wrong with a typed value (the table shows the old one)
    """

    rowsEdited = Signal(object, str)
    invalidEntry = Signal(str)

    def __init__(self, columns: tuple[Column, ...], noun: str):
        super().__init__(0, len(columns))
        self.columns = columns
        self.noun = noun
        self._items: tuple[Any, ...] = ()
        self._units: UnitSystem | None = None
        self.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
        self.setAlternatingRowColors(True)
        self.verticalHeader().setVisible(False)
        header = self.horizontalHeader()
        header.setSectionResizeMode(QHeaderView.ResizeMode.ResizeToContents)
        header.setSectionResizeMode(0, QHeaderView.ResizeMode.Stretch)
        self.itemChanged.connect(self._on_item_changed)

    def show_items(self, items: tuple[Any, ...], units: UnitSystem) -> None:
        """Fill the table with ``items`` in ``units``."""
        self._items = tuple(items)
        self._units = units
        with QSignalBlocker(self):
            labels = []
            for col in self.columns:
                unit = col.unit(units)
                labels.append(f"{col.header} ({unit})" if unit else col.header)
            self.setHorizontalHeaderLabels(labels)
            for c, col in enumerate(self.columns):
                self.horizontalHeaderItem(c).setToolTip(col.tip)
            self.setRowCount(len(items))
            for r, obj in enumerate(items):
                for c, col in enumerate(self.columns):
                    self.setItem(r, c, self._cell(obj, col, units))

    def _cell(self, obj: Any, col: Column, units: UnitSystem) -> QTableWidgetItem:
        item = QTableWidgetItem()
        item.setToolTip(col.tip)
        if col.kind == "surface":
            item.setFlags(Qt.ItemFlag.ItemIsEnabled | Qt.ItemFlag.ItemIsUserCheckable)
            checked = col.attr in obj.surfaces
            item.setCheckState(Qt.CheckState.Checked if checked else Qt.CheckState.Unchecked)
            return item
        value = getattr(obj, col.attr)
        if col.kind == "text":
            item.setText(str(value))
            return item
        item.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        if col.kind == "mass":
            item.setText(units.mass_text(value, unit=False))
        elif col.kind == "length":
            item.setText(units.length_text(value, unit=False))
        elif col.kind == "areal":
            item.setText(units.areal_text(value, unit=False))
        else:
            item.setText(f"{value:g}")
        return item

    def _parse(self, col: Column, text: str) -> Any:
        units = self._units
        if col.kind == "text":
            return text.strip() or self.noun
        if col.kind == "length":
            return units.parse_length(text, -PLAUSIBLE_M, PLAUSIBLE_M, col.header)
        value = float(text.strip().replace(",", "."))
        if not math.isfinite(value):
            raise ValueError
        if col.kind == "mass":
            return units.from_mass(value)
        if col.kind == "areal":
            return value / areal_factor(units)
        return value

    def _on_item_changed(self, item: QTableWidgetItem) -> None:
        row, col = item.row(), self.columns[item.column()]
        if not 0 <= row < len(self._items):
            return
        obj = self._items[row]
        if col.kind == "surface":
            surfaces = set(obj.surfaces)
            if item.checkState() == Qt.CheckState.Checked:
                surfaces.add(col.attr)
            else:
                surfaces.discard(col.attr)
            order = ("bottom", "sides", "ends")
            new = replace(obj, surfaces=tuple(s for s in order if s in surfaces))
        else:
            try:
                new = replace(obj, **{col.attr: self._parse(col, item.text())})
            except LengthError as e:
                self.invalidEntry.emit(f"Not changed: {e}")
                self.show_items(self._items, self._units)
                return
            except ValueError:
                self.invalidEntry.emit(f"'{item.text()}' is not a number: {col.header.lower()} not changed")
                self.show_items(self._items, self._units)
                return
        items = self._items[:row] + (new,) + self._items[row + 1 :]
        self.rowsEdited.emit(items, f"Edit {self.noun} {col.header.lower()}")

    def selected_row(self) -> int | None:
        rows = self.selectionModel().selectedRows()
        return rows[0].row() if rows else None
