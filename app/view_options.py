"""Display choices shared by every view: the unit system and grid snapping.

They change how the design is shown and how drags are rounded, never the design itself.
"""

from __future__ import annotations

from PySide6.QtCore import QObject, Signal

from hydro.units import METRIC, UnitSystem, system

__all__ = ["ViewOptions"]


class ViewOptions(QObject):
    """Units and snapping; ``changed`` is emitted after either changes."""

    changed = Signal()

    def __init__(self, units: str = "metric", snap: bool = True, parent: QObject | None = None):
        super().__init__(parent)
        self._units: UnitSystem = METRIC
        self._units = system(units) if units in ("metric", "imperial") else METRIC
        self._snap = bool(snap)

    @property
    def units(self) -> UnitSystem:
        return self._units

    @property
    def snap(self) -> bool:
        return self._snap

    def set_units(self, name: str) -> None:
        units = system(name)
        if units is not self._units:
            self._units = units
            self.changed.emit()

    def set_snap(self, on: bool) -> None:
        if bool(on) != self._snap:
            self._snap = bool(on)
            self.changed.emit()
