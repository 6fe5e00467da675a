"""Choices for exporting the build pack: the PDF file and the paper its pages print on."""

from __future__ import annotations

from pathlib import Path

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

__all__ = ["PackDialog", "PAPERS"]

PAPERS = ("A4", "A3", "Letter", "Tabloid")


class PackDialog(QDialog):
    """Asks where to write the build pack (.pdf) and on which paper (A4 by default:
    the full-size pages are meant for an ordinary printer)."""

    def __init__(self, parent: QWidget | None, suggested: Path):
        super().__init__(parent)
        self.setWindowTitle("Export build pack")
        self.path_edit = QLineEdit(str(suggested))
        browse = QPushButton("Choose…")
        browse.clicked.connect(self._browse)
        row = QHBoxLayout()
        row.addWidget(self.path_edit, 1)
        row.addWidget(browse)
        self.paper_box = QComboBox()
        self.paper_box.addItems(PAPERS)
        buttons = QDialogButtonBox(
            QDialogButtonBox.StandardButton.Save | QDialogButtonBox.StandardButton.Cancel
        )
        buttons.accepted.connect(self.accept)
        buttons.rejected.connect(self.reject)
        form = QFormLayout(self)
        form.addRow("File", row)
        form.addRow("Paper (landscape)", self.paper_box)
        form.addRow(buttons)

    def _browse(self) -> None:
        path, _ = QFileDialog.getSaveFileName(
            self, "Export build pack", self.path_edit.text(), "Build pack PDF (*.pdf)"
        )
        if path:
            self.path_edit.setText(path)

    def choice(self) -> tuple[Path, str]:
        """(file, paper) as chosen."""
        return Path(self.path_edit.text()).expanduser(), self.paper_box.currentText()
