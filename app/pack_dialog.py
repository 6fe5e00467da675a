"""Choices for exporting the build pack: the PDF file and the paper its pages print on."""

from __future__ import annotations

from pathlib import Path

from PySide6.QtWidgets import QWidget

from app.export_dialog import ExportDialog

__all__ = ["PackDialog", "PAPERS"]

PAPERS = ("A4", "A3", "Letter", "Tabloid")


class PackDialog(ExportDialog):
    """Asks where to write the build pack (.pdf) and on which paper (A4 by default:
    the full-size pages are meant for an ordinary printer)."""

    def __init__(self, parent: QWidget | None, suggested: Path):
        super().__init__(parent, "Export build pack", "Build pack PDF (*.pdf)", PAPERS, "A4",
                         suggested)

    def choice(self) -> tuple[Path, str]:
        """(file, paper) as chosen."""
        return self.path(), self.paper_box.currentText()
