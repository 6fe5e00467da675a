"""The part every export dialog shares: a file row with a browse button, a paper choice and
Save/Cancel.  Subclasses add their own rows before the buttons."""

from __future__ import annotations

from pathlib import Path
from typing import Sequence

from PySide6.QtWidgets import (
    QComboBox,
    QDialog,
    QDialogButtonBox,
    QFileDialog,
    QFormLayout,
    QHBoxLayout,
    QLineEdit,
    QPushButton,
    QWidget,
)

__all__ = ["ExportDialog"]


class ExportDialog(QDialog):
    """Asks for a file and a paper; ``add_row`` puts further choices above the buttons."""

    def __init__(self, parent: QWidget | None, title: str, file_filter: str,
                 papers: Sequence[str], paper: str, suggested: Path):
        super().__init__(parent)
        self.setWindowTitle(title)
        self._file_filter = file_filter
        self.path_edit = QLineEdit(str(suggested))
        browse = QPushButton("Choose…")
        browse.clicked.connect(self._browse)
        row = QHBoxLayout()
        row.addWidget(self.path_edit, 1)
        row.addWidget(browse)
        self.paper_box = QComboBox()
        self.paper_box.addItems(list(papers))
        if paper in papers:
            self.paper_box.setCurrentText(paper)
        buttons = QDialogButtonBox(
            QDialogButtonBox.StandardButton.Save | QDialogButtonBox.StandardButton.Cancel
        )
        buttons.accepted.connect(self.accept)
        buttons.rejected.connect(self.reject)
        self._form = QFormLayout(self)
        self._form.addRow("File", row)
        self._form.addRow("Paper (landscape)", self.paper_box)
        self._form.addRow(buttons)

    def add_row(self, label: str, widget: QWidget) -> None:
        """A further choice, placed above the Save/Cancel buttons."""
        self._form.insertRow(self._form.rowCount() - 1, label, widget)

    def path(self) -> Path:
        """The chosen file."""
        return Path(self.path_edit.text().strip()).expanduser()

    def _browse(self) -> None:
        path, _ = QFileDialog.getSaveFileName(
            self, self.windowTitle(), self.path_edit.text(), self._file_filter
        )
        if path:
            self.path_edit.setText(path)
