"""The safety notes: the full cautions, shown from Help and once at first start."""

from __future__ import annotations

from html import escape

from PySide6.QtCore import Qt
from PySide6.QtWidgets import QDialog, QDialogButtonBox, QLabel, QVBoxLayout, QWidget

from hydro.safety import CAUTIONS

__all__ = ["SafetyDialog"]


class SafetyDialog(QDialog):
    """A window listing every caution.  ``first_run`` adds a welcome line above them."""

    def __init__(self, parent: QWidget | None = None, first_run: bool = False):
        super().__init__(parent)
        self.setWindowTitle("Before you build — safety notes")
        self.setMinimumWidth(520)
        intro = (
            "<p><b>Welcome to Hullwright.</b> It estimates how a hand-built boat floats "
            "and how far it can heel. Please read these notes once; they stay under "
            "Help &gt; Safety notes.</p>"
            if first_run
            else ""
        )
        items = "".join(f"<li style='margin-bottom: 6px'>{escape(c)}</li>" for c in CAUTIONS)
        text = QLabel(f"{intro}<ul>{items}</ul>")
        text.setWordWrap(True)
        text.setTextFormat(Qt.TextFormat.RichText)
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Ok)
        buttons.button(QDialogButtonBox.StandardButton.Ok).setText("I have read this" if first_run else "Close")
        buttons.accepted.connect(self.accept)
        layout = QVBoxLayout(self)
        layout.addWidget(text)
        layout.addWidget(buttons)
