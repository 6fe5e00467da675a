"""Choices for exporting the print plate: file, paper size, resolution and stations."""

from __future__ import annotations

from pathlib import Path

from PySide6.QtWidgets import QComboBox, QSpinBox, QWidget

from app.export_dialog import ExportDialog

__all__ = ["PlateDialog"]


class PlateDialog(ExportDialog):
    """Asks where to write the plate (.png or .pdf), on which paper, at what dpi."""

    def __init__(self, parent: QWidget | None, papers: list[str], suggested: Path):
        super().__init__(parent, "Export plate", "Plate image (*.png);;Plate PDF (*.pdf)",
                         papers, "A3", suggested)
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
        self.add_row("Resolution", self.dpi_box)
        self.add_row("Stations", self.stations_box)

    def stations(self) -> tuple[float | None, int | None]:
        """(spacing in metres, count) of the builder's stations; (None, None): the design's."""
        spacing, count = self.stations_box.currentData()
        return spacing, count

    def choice(self) -> tuple[Path, str, int]:
        """(file, paper, dpi) as chosen."""
        return self.path(), self.paper_box.currentText(), self.dpi_box.value()
