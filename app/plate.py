"""The print plate: one landscape sheet the build team works from, as PNG or PDF.

:func:`paint_plate` lays out and paints the whole sheet on any QPainter, in device
pixels, from a design and its analysis; the PNG and the PDF share it.  Sizes are set in
millimetres (lines, spacing) and points (text), converted with the device resolution, so
the sheet reads the same when printed at 100 %.  Only a QGuiApplication is needed
(:func:`render_plate_image` makes one when there is none), so the command line and the
tests render offscreen.

The panels: lines (profile, plan and sections at stated scales with main dimensions and
scale bars), table of offsets, load table, figures, righting-arm curve, safety cautions
and the title block.  The pieces live in ``plate_draw`` (drawing primitives),
``plate_content`` (what the plate says) and ``plate_sheet`` (layout and panels); this
module holds the entry points and is the plate's public API.
"""

from __future__ import annotations

import os
import secrets
from collections.abc import Mapping
from pathlib import Path

from PySide6.QtCore import QMarginsF, QRectF
from PySide6.QtGui import (
    QGuiApplication,
    QImage,
    QPageLayout,
    QPageSize,
    QPainter,
    QPdfWriter,
)

from app.plate_content import PAPER_SIZES, PlateMarks, listed_stations, marks_from_assessment
from app.plate_draw import FONT_FAMILY, MIN_TEXT_PT, PAPER, Canvas
from app.plate_sheet import PlateLayout, Sheet
from hydro.assess import Assessment, assess
from hydro.design import Design, analyse
from hydro.errors import HullwrightError
from hydro.stability import Analysis
from hydro.units import UnitSystem, system

__all__ = [
    "FONT_FAMILY",
    "MIN_TEXT_PT",
    "PAPER_SIZES",
    "paper_mm",
    "PlateLayout",
    "PlateMarks",
    "listed_stations",
    "marks_from_assessment",
    "paint_plate",
    "render_plate_file",
    "render_plate_image",
]

_PAGE_IDS = {
    "A4": QPageSize.PageSizeId.A4,
    "A3": QPageSize.PageSizeId.A3,
    "Letter": QPageSize.PageSizeId.Letter,
    "Tabloid": QPageSize.PageSizeId.Tabloid,
}

#: PDF coordinate resolution (device units per inch); the PDF itself is vector.
PDF_RESOLUTION = 600


def paint_plate(
    painter: QPainter,
    page_rect_px: QRectF,
    dpi: float,
    design: Design,
    analysis: Analysis,
    units: str | UnitSystem,
    source: str,
    extras: PlateMarks | Mapping[str, object] | None = None,
) -> PlateLayout:
    """Lay out and paint the whole plate on ``painter`` in device pixels.

    Parameters
    ----------
    page_rect_px : the full sheet in device pixels (the margins are inside it)
    dpi : device pixels per inch; millimetres and points are converted with it
    units : "metric", "imperial" or a UnitSystem
    source : the design's file name for the title block
    extras : optional marks from the builder's checks (see :class:`PlateMarks`)

    Returns
    -------
    PlateLayout
        The panel rectangles and the checks the tests use.
    """
    u = system(units) if isinstance(units, str) else units
    marks = PlateMarks.from_any(extras)
    page_mm = (page_rect_px.width() / dpi * 25.4, page_rect_px.height() / dpi * 25.4)
    painter.save()
    painter.setRenderHint(QPainter.RenderHint.Antialiasing, True)
    painter.setRenderHint(QPainter.RenderHint.TextAntialiasing, True)
    painter.fillRect(page_rect_px, PAPER)
    canvas = Canvas(painter, page_rect_px.topLeft(), dpi)
    layout = Sheet(canvas, page_mm, design, analysis, u, source, marks).paint()
    painter.restore()
    return layout


def _ensure_gui_app() -> QGuiApplication:
    app = QGuiApplication.instance()
    return app if app is not None else QGuiApplication([])  # type: ignore[return-value]


def paper_mm(paper: str) -> tuple[float, float]:
    """(width, height) in mm of a named paper, landscape; HullwrightError if unknown."""
    try:
        return PAPER_SIZES[paper]
    except KeyError:
        raise HullwrightError(
            f"unknown paper {paper!r}: use one of {', '.join(PAPER_SIZES)}"
        ) from None


def render_plate_image(
    design: Design,
    paper: str = "A3",
    dpi: float = 300,
    units: str = "metric",
    source: str = "",
    extras: PlateMarks | Mapping[str, object] | None = None,
    analysis: Analysis | None = None,
) -> QImage:
    """The plate as a white QImage of the paper's size at ``dpi``, dpi stored in it."""
    _ensure_gui_app()
    w_mm, h_mm = paper_mm(paper)
    if not 20 <= dpi <= 1200:
        raise HullwrightError("the plate resolution must be between 20 and 1200 dpi")
    analysis = analysis or analyse(design)
    w_px, h_px = round(w_mm / 25.4 * dpi), round(h_mm / 25.4 * dpi)
    image = QImage(w_px, h_px, QImage.Format.Format_RGB32)
    dots_per_metre = round(dpi / 0.0254)
    image.setDotsPerMeterX(dots_per_metre)
    image.setDotsPerMeterY(dots_per_metre)
    image.fill(PAPER)
    painter = QPainter(image)
    try:
        paint_plate(painter, QRectF(0, 0, w_px, h_px), dpi, design, analysis, units, source, extras)
    finally:
        painter.end()
    return image


def _write_pdf(
    path: str,
    design: Design,
    analysis: Analysis,
    paper: str,
    units: str,
    source: str,
    extras: PlateMarks | Mapping[str, object] | None,
) -> None:
    writer = QPdfWriter(path)
    writer.setResolution(PDF_RESOLUTION)
    writer.setTitle(f"{design.name} - print plate")
    writer.setCreator("Hullwright")
    layout = QPageLayout(
        QPageSize(_PAGE_IDS[paper]), QPageLayout.Orientation.Landscape, QMarginsF(0, 0, 0, 0)
    )
    if not writer.setPageLayout(layout):
        raise HullwrightError(f"could not set the PDF page to {paper} landscape")
    painter = QPainter()
    if not painter.begin(writer):
        raise HullwrightError(f"cannot write {Path(path).name}")
    try:
        rect = QRectF(0, 0, writer.width(), writer.height())
        paint_plate(painter, rect, writer.resolution(), design, analysis, units, source, extras)
    finally:
        painter.end()


def render_plate_file(
    design: Design,
    path: str | os.PathLike[str],
    paper: str = "A3",
    dpi: float = 300,
    units: str = "metric",
    source: str = "",
    extras: PlateMarks | Mapping[str, object] | None = None,
    assessment: Assessment | None = None,
) -> None:
    """Write the plate to ``path`` (.png at ``dpi`` or vector .pdf), atomically.

    The plate is rendered to a temporary file in the same folder, then moved over
    ``path``; a failed render leaves no file behind.  Without ``extras`` the plate
    carries the builder's checks of ``assessment`` (the design's one assessment, made
    here when not given: the cases saved in ``design.checks``), worded as the app's
    checks panel words them (:func:`marks_from_assessment`).

    Raises
    ------
    HullwrightError
        For an unknown paper or extension, a design the engine rejects, or a file that
        cannot be written.
    """
    _ensure_gui_app()
    target = Path(path)
    suffix = target.suffix.lower()
    if suffix not in (".png", ".pdf"):
        raise HullwrightError("the plate file must end in .png or .pdf")
    paper_mm(paper)
    if assessment is None or assessment.design != design:
        assessment = assess(design, checks=extras is None)
    analysis = assessment.analysis
    if not target.parent.is_dir():
        raise HullwrightError(f"folder {target.parent} does not exist")
    if extras is None:
        extras = marks_from_assessment(assessment, system(units))
    # Qt creates the file itself, so it gets the usual permissions (umask applied)
    tmp = str(target.parent / f".{target.stem}-{secrets.token_hex(6)}{suffix}")
    try:
        if suffix == ".png":
            image = render_plate_image(design, paper, dpi, units, source, extras, analysis)
            if not image.save(tmp, "PNG", 50):
                raise HullwrightError(f"cannot write {target.name}")
        else:
            _write_pdf(tmp, design, analysis, paper, units, source, extras)
        os.replace(tmp, target)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise
