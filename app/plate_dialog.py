"""Choices for exporting the print plate: file, paper size and resolution."""

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
    QSpinBox,
    QWidget,
)

__all__ = ["PlateDialog"]


class PlateDialog(QDialog):
    """Asks where to write the plate (.png or .pdf), on which paper, at what dpi."""

    def __init__(self, parent: QWidget | None, papers: list[str], suggested: Path):
        super().__init__(parent)
        self.setWindowTitle("Export plate")
        self.path_edit = QLineEdit(str(suggested))
        browse = QPushButton("Choose…")
        browse.clicked.connect(self._browse)
        row = QHBoxLayout()
        row.addWidget(self.path_edit, 1)
        row.addWidget(browse)
        self.paper_box = QComboBox()
        self.paper_box.addItems(papers)
        if "A3" in papers:
            self.paper_box.setCurrentText("A3")
        self.dpi_box = QSpinBox()
        self.dpi_box.setRange(72, 600)
        self.dpi_box.setValue(300)
        self.dpi_box.setSuffix(" dpi")
        self.dpi_box.setToolTip("Resolution of a PNG plate (a PDF is drawn as lines)")
        self.stations_box = QComboBox()
        for text, choice in (
            ("the design's own (every few)", (None, None)),
            ("a station every 300 mm", (0.3, None)),
            ("a station every 1 ft", (0.3048, None)),
            ("11 evenly spaced stations", (None, 11)),
            ("21 evenly spaced stations", (None, 21)),
        ):
            self.stations_box.addItem(text, choice)
        self.stations_box.setToolTip(
            "Where the table of offsets and the drawn stations fall; the figures are always "
            "worked out on the design's own fine stations"
        )
        buttons = QDialogButtonBox(
            QDialogButtonBox.StandardButton.Save | QDialogButtonBox.StandardButton.Cancel
        )
        buttons.accepted.connect(self.accept)
        buttons.rejected.connect(self.reject)
        form = QFormLayout(self)
        form.addRow("File", row)
        form.addRow("Paper (landscape)", self.paper_box)
        form.addRow("Resolution", self.dpi_box)
        form.addRow("Stations", self.stations_box)
        form.addRow(buttons)

    def _browse(self) -> None:
        path, _ = QFileDialog.getSaveFileName(
            self, "Export plate", self.path_edit.text(), "Plate image (*.png);;Plate PDF (*.pdf)"
        )
        if path:
            self.path_edit.setText(path)

    def stations(self) -> tuple[float | None, int | None]:
        """(spacing in metres, count) of the builder's stations; (None, None): the design's."""
        spacing, count = self.stations_box.currentData()
        return spacing, count

    def choice(self) -> tuple[Path, str, int]:
        """(file, paper, dpi) as chosen."""
        return Path(self.path_edit.text().strip()), self.paper_box.currentText(), self.dpi_box.value()
