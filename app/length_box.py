"""A spin box for one length, shown and typed in the builder's units.

The value is kept in metres.  The text is the units' formatter (``1234 mm``,
``66 15/16 in``); what is typed is read by :func:`hydro.units.parse_length`, so
``3.6 m``, ``141 3/4``, ``11' 9 3/4"`` and ``2-04-3`` all work in every length field.
Text that cannot be read, or lies outside the field's plausible range, is refused with
a message on ``refused`` and the field goes back to its value.
"""

from __future__ import annotations

from PySide6.QtCore import QSignalBlocker, Signal
from PySide6.QtGui import QValidator
from PySide6.QtWidgets import QDoubleSpinBox, QWidget

from hydro.units import METRIC, LengthError, UnitSystem

__all__ = ["LengthBox"]


class LengthBox(QDoubleSpinBox):
    """A length field in metres with the builder's text (see the module docstring).

    Parameters
    ----------
    low, high : plausible range (m)
    what : the field's name, used in refusals
    feet : show imperial lengths in feet and inches (``11' 9 3/4"``)

    Signals
    -------
    refused(str) : typed text was refused; the message says why
    """

    refused = Signal(str)

    def __init__(
        self,
        low: float,
        high: float,
        what: str,
        units: UnitSystem = METRIC,
        feet: bool = False,
        parent: QWidget | None = None,
    ):
        super().__init__(parent)
        self._units = units
        self._what = what
        self._feet = feet
        self._last_refusal = ""
        self.setDecimals(6)
        self.setRange(low, high)
        self.setKeyboardTracking(False)
        self.setSingleStep(units.nudge_m)
        self.setAccelerated(True)
        self.setToolTip(f"{what}: type e.g. 3.6 m, 360 cm, 141 3/4, 11' 9 3/4\" or 2-04-3")

    @property
    def units(self) -> UnitSystem:
        return self._units

    def set_units(self, units: UnitSystem) -> None:
        """Show the value in ``units`` (the value itself stays)."""
        if units is self._units:
            return
        self._units = units
        self.setSingleStep(units.nudge_m)
        self.lineEdit().setText(self.textFromValue(self.value()))

    def metres(self) -> float:
        return self.value()

    def set_metres(self, metres: float) -> None:
        """Show ``metres`` without emitting ``valueChanged`` (nothing to do if shown)."""
        shown = self.prefix() + self.textFromValue(metres) + self.suffix()
        half_step = 0.5 * 10.0 ** -self.decimals()
        if self.lineEdit().text() == shown and abs(self.value() - metres) < half_step:
            # views refresh on every drag frame: no repaint for the same figure (the line
            # holds the prefix too, and the value is rounded to the box's decimals)
            return
        with QSignalBlocker(self):
            self.setValue(metres)
            self.lineEdit().setText(self.textFromValue(self.value()))

    def has_unsaved_text(self) -> bool:
        """True while the text typed differs from the value (not yet entered)."""
        return self._typed(self.text()) != self.textFromValue(self.value())

    # ------------------------------------------------------------ QDoubleSpinBox

    def textFromValue(self, value: float) -> str:
        return self._units.length_text(value, feet=self._feet)

    def _typed(self, text: str) -> str:
        """The text without the box's prefix."""
        prefix = self.prefix()
        return text[len(prefix):] if prefix and text.startswith(prefix) else text

    def _parse(self, text: str) -> float:
        text = self._typed(text)
        return self._units.parse_length(text, self.minimum(), self.maximum(), self._what)

    def valueFromText(self, text: str) -> float:
        if self._typed(text).strip() == self.textFromValue(self.value()):
            return self.value()  # untouched text keeps the exact value, not its rounding
        try:
            return self._parse(text)
        except LengthError:
            return self.value()

    def validate(self, text: str, pos: int) -> object:
        try:
            self._parse(text)
        except LengthError:
            return QValidator.State.Intermediate, text, pos
        return QValidator.State.Acceptable, text, pos

    def fixup(self, text: str) -> str:
        try:
            self._parse(text)
        except LengthError as e:
            message = str(e)
            if message != self._last_refusal:  # Qt may ask twice for one refusal
                self._last_refusal = message
                self.refused.emit(f"Not changed: {message}")
        return text

    def focusInEvent(self, event) -> None:
        self._last_refusal = ""
        super().focusInEvent(event)
