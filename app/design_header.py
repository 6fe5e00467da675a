"""The header above the drawings: the design's name and the builder's notes, always in view.

Each is committed as one undo step when the field is left (or Enter in the name); the
fields follow the committed design, so undo and redo update them.
"""

from __future__ import annotations

from dataclasses import replace

from PySide6.QtCore import QEvent, QObject, QSignalBlocker
from PySide6.QtWidgets import QHBoxLayout, QLabel, QLineEdit, QPlainTextEdit, QWidget

from app import style
from app.document import HullDocument

__all__ = ["DesignHeader"]

NOTES_LINES = 2


class DesignHeader(QWidget):
    """Name and notes of the design (see the module docstring)."""

    def __init__(self, document: HullDocument):
        super().__init__()
        self.document = document
        self.name_edit = QLineEdit()
        self.name_edit.setPlaceholderText("name of the boat or the team")
        self.name_edit.setToolTip("The design's name: shown on the plate and in the title bar")
        self.name_edit.setMinimumWidth(260)
        self.name_edit.editingFinished.connect(self._on_name_typed)
        self.notes_edit = QPlainTextEdit()
        self.notes_edit.setPlaceholderText(
            "notes: materials bought, test dates, who paddles where…"
        )
        self.notes_edit.setToolTip("Free notes saved with the design")
        self.notes_edit.setTabChangesFocus(True)
        line = self.notes_edit.fontMetrics().lineSpacing()
        self.notes_edit.setFixedHeight(NOTES_LINES * line + 12)
        self.notes_edit.installEventFilter(self)
        name_label, notes_label = QLabel("<b>Design</b>"), QLabel("Notes")
        notes_label.setStyleSheet(f"color: {style.INK_FAINT};")
        layout = QHBoxLayout(self)
        layout.setContentsMargins(6, 4, 6, 2)
        layout.addWidget(name_label)
        layout.addWidget(self.name_edit, 2)
        layout.addSpacing(12)
        layout.addWidget(notes_label)
        layout.addWidget(self.notes_edit, 3)
        document.designChanged.connect(self.refresh)
        self.refresh()

    def refresh(self) -> None:
        """Show the committed design's name and notes (unless one is being typed)."""
        design = self.document.committed
        if not self.name_edit.isModified() or not self.name_edit.hasFocus():
            with QSignalBlocker(self.name_edit):
                self.name_edit.setText(design.name)
                self.name_edit.setCursorPosition(0)  # a long name shows its start
                self.name_edit.setModified(False)
        if not self.notes_edit.hasFocus() and self.notes_edit.toPlainText() != design.notes:
            with QSignalBlocker(self.notes_edit):
                self.notes_edit.setPlainText(design.notes)
                self.notes_edit.document().setModified(False)

    def _on_name_typed(self) -> None:
        name = self.name_edit.text().strip()
        design = self.document.committed
        self.name_edit.setModified(False)
        if not name:
            self.document.notice.emit("Not changed: a design needs a name")
            self.refresh()
        elif name != design.name:
            self.document.edit(replace(design, name=name), "Rename design")

    def commit_notes(self) -> None:
        """Save the typed notes into the design (one undo step)."""
        notes = self.notes_edit.toPlainText()
        self.notes_edit.document().setModified(False)
        design = self.document.committed
        if notes != design.notes:
            self.document.edit(replace(design, notes=notes), "Edit notes")

    def eventFilter(self, watched: QObject, event: QEvent) -> bool:
        if watched is self.notes_edit and event.type() == QEvent.Type.FocusOut:
            self.commit_notes()
        return super().eventFilter(watched, event)
