"""The build view: the flat panels, the sheet layout and the warnings of the design.

It rebuilds the pack on a background thread after every committed edit (undo, redo,
open), never during a drag: a drag or a newer edit stops the rebuild in progress at
once (:mod:`app.interrupt`), and a result a newer edit made stale is dropped.  The sheet size
and strain limit are view settings kept in QSettings; File › Export build pack writes
the PDF (:mod:`app.pack_pages`) with the same settings.
"""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QObject, QRunnable, QSettings, QThreadPool, Signal
from PySide6.QtWidgets import (
    QComboBox,
    QDoubleSpinBox,
    QHBoxLayout,
    QLabel,
    QLineEdit,
    QPushButton,
    QSplitter,
    QVBoxLayout,
    QWidget,
)

from app.document import HullDocument
from app.interrupt import Interrupted, Interruptible
from app.view_options import ViewOptions
from hydro import Design, HullwrightError
from hydro.build_pack import BuildPack, PackSettings, build_pack
from hydro.sheet_layout import SHEET_PRESETS

__all__ = ["BuildView"]

CUT_PEN = pg.mkPen((20, 34, 56), width=1.5)
MARK_PEN = pg.mkPen((150, 156, 168), width=1)
WARN_PEN = pg.mkPen((176, 40, 30), width=2)
SHEET_PEN = pg.mkPen((60, 60, 60), width=1)
PIECE_BRUSH = pg.mkBrush(222, 232, 244)
GAP_M = 0.12


class _Relay(QObject):
    done = Signal(int, object)


class _PackJob(QRunnable):
    def __init__(self, generation: int, design: Design, settings: PackSettings, relay: _Relay):
        super().__init__()
        self.generation, self.design = generation, design
        self.settings, self.relay = settings, relay
        self.guard = Interruptible()

    def run(self) -> None:
        try:
            result: object = self.guard.run(lambda: build_pack(self.design, self.settings))
        except Interrupted:
            return
        except Exception as e:  # noqa: BLE001 - shown in the view, never lost on a thread
            result = e
        try:
            self.relay.done.emit(self.generation, result)
        except RuntimeError:  # the view closed meanwhile
            pass


class BuildView(QWidget):
    """Flat panels and sheets of the committed design, with the warnings.

    Signals
    -------
    packReady(BuildPack) : a new pack of the current design is shown
    exportRequested : the user asked for the build pack PDF
    """

    packReady = Signal(object)
    exportRequested = Signal()

    def __init__(
        self, document: HullDocument, options: ViewOptions, settings: QSettings | None = None
    ):
        super().__init__()
        self.document, self.options = document, options
        self.settings = settings if settings is not None else QSettings()
        self.pack: BuildPack | None = None
        self.error = ""
        self.rebuilds = 0
        self._generation = 0
        self._relay = _Relay(self)
        self._relay.done.connect(self._on_done)
        self._pool = QThreadPool(self)
        self._pool.setMaxThreadCount(1)
        self._guard: Interruptible | None = None  # stops the newest rebuild started
        self._stale = True

        self.sheet_box = QComboBox()
        for name, (w, h) in SHEET_PRESETS.items():
            self.sheet_box.addItem(name, (w, h))
        saved = str(self.settings.value("pack/sheet", "1220x2440 mm"))
        self.sheet_box.setCurrentIndex(max(0, self.sheet_box.findText(saved)))
        self.sheet_box.setToolTip("Stock sheet size; the grain or flute runs along its length")
        self.strain_box = QDoubleSpinBox()
        self.strain_box.setRange(0.001, 5.0)
        self.strain_box.setDecimals(3)
        self.strain_box.setSingleStep(0.01)
        self.strain_box.setSuffix(" %")
        self.strain_box.setValue(float(self.settings.value("pack/strain_limit_pct", 0.05)))
        self.strain_box.setToolTip(
            "Warn when a panel's twist strain is above this (no published limit was found "
            "for plywood or board)"
        )
        self.frames_edit = QLineEdit()
        self.frames_edit.setPlaceholderText("automatic")
        self.frames_edit.setToolTip(
            "Frame positions from the aft end, separated by commas (in the display units "
            "unless a unit is typed); empty: a few evenly spaced"
        )
        self.frames_edit.editingFinished.connect(self._on_frames_edited)
        self._frames: tuple[float, ...] | None = None
        self.frames_error = ""
        export = QPushButton("Export build pack…")
        export.clicked.connect(self.exportRequested.emit)
        controls = QHBoxLayout()
        controls.addWidget(QLabel("Sheet"))
        controls.addWidget(self.sheet_box)
        controls.addWidget(QLabel("Strain limit"))
        controls.addWidget(self.strain_box)
        controls.addWidget(QLabel("Frames at"))
        controls.addWidget(self.frames_edit, 1)
        controls.addStretch(1)
        controls.addWidget(export)

        self.summary = QLabel()
        self.summary.setWordWrap(True)
        self.warnings = QLabel()
        self.warnings.setWordWrap(True)
        self.warnings.setStyleSheet("color: rgb(176, 40, 30);")
        self.panels_plot = self._plot("Flat panels (port, outside face)")
        self.sheets_plot = self._plot("Sheet layout")
        for plot in (self.panels_plot, self.sheets_plot):
            plot.setMinimumHeight(170)
        plots = QSplitter()
        plots.addWidget(self.panels_plot)
        plots.addWidget(self.sheets_plot)
        column = QVBoxLayout(self)
        column.setContentsMargins(4, 4, 4, 4)
        column.addLayout(controls)
        column.addWidget(self.summary)
        column.addWidget(self.warnings)
        column.addWidget(plots, 1)

        self.sheet_box.currentIndexChanged.connect(self._on_settings_changed)
        self.strain_box.valueChanged.connect(self._on_settings_changed)
        document.designChanged.connect(self.refresh)
        document.dragStarted.connect(self._on_drag)
        document.designChanging.connect(self._on_drag)
        options.changed.connect(self._show_summary)
        self.refresh()

    @staticmethod
    def _plot(title: str) -> pg.PlotWidget:
        plot = pg.PlotWidget(title=title)
        plot.setBackground("w")
        plot.setAspectLocked(True)
        plot.hideAxis("left")
        plot.hideAxis("bottom")
        plot.setMenuEnabled(False)
        return plot

    def pack_settings(self) -> PackSettings:
        """The settings the view (and File › Export build pack) use."""
        width, length = self.sheet_box.currentData()
        return PackSettings(
            sheet_m=(width, length),
            strain_limit=self.strain_box.value() / 100,
            frame_x=self._frames,
        )

    def _on_frames_edited(self) -> None:
        """Read the frame positions typed; a bad one is named and nothing changes."""
        text = self.frames_edit.text().strip()
        x0, x1 = self.document.committed.stations().x[[0, -1]]
        try:
            frames = tuple(
                self.options.units.parse_length(t, float(x0), float(x1), "a frame position")
                for t in text.replace(";", ",").split(",") if t.strip()
            ) or None
        except HullwrightError as e:
            self.frames_error = str(e)
            self._show_summary()
            return
        self.frames_error = ""
        if frames != self._frames:
            self._frames = frames
            self.refresh()
        else:
            self._show_summary()

    def _on_settings_changed(self) -> None:
        self.settings.setValue("pack/sheet", self.sheet_box.currentText())
        self.settings.setValue("pack/strain_limit_pct", self.strain_box.value())
        self.refresh()

    def _on_drag(self) -> None:
        """A drag began or moved: whatever is running is stale; wait for the release."""
        self._generation += 1
        self._interrupt()

    def _interrupt(self) -> None:
        if self._guard is not None:
            self._guard.interrupt()
            self._guard = None

    def refresh(self) -> None:
        """Rebuild the pack of the committed design on the background thread (at once if
        the view is showing, else when it is next shown)."""
        self._generation += 1
        if not self.isVisible():
            self._stale = True
            return
        self._stale = False
        self._interrupt()
        job = _PackJob(self._generation, self.document.committed, self.pack_settings(), self._relay)
        self._guard = job.guard
        self._pool.start(job)

    def wait(self, msecs: int = 10000) -> bool:
        """Block until the background rebuild is done (tests, export)."""
        return self._pool.waitForDone(msecs)

    def _on_done(self, generation: int, result: object) -> None:
        if generation != self._generation:
            return
        self.rebuilds += 1
        if isinstance(result, BuildPack):
            self.pack, self.error = result, ""
        else:
            self.pack, self.error = None, str(result)
        self._draw()
        self._show_summary()
        if self.pack is not None:
            self.packReady.emit(self.pack)

    def _show_summary(self) -> None:
        pack, u = self.pack, self.options.units
        if pack is None:
            self.summary.setText(f"No build pack: {self.error}" if self.error else "")
            self.warnings.setText("")
            return
        m = pack.materials
        seams = u.length_text(m.seam_m, feet=True) if u.imperial else f"{m.seam_m:.1f} m"
        bound = sum(lay.lower_bound for _, lay in pack.layouts)
        lines = [
            f"{len(pack.jobs)} pieces, {pack.sheet_count} sheets (at least {bound}); "
            f"seams {seams}, tape {m.tape_rolls} roll(s), "
            f"paint {m.paint_l:.1f} L"
        ]
        joined = [n.split(":")[0] for n in pack.notes if "longer than the sheet" in n]
        if joined:
            lines.append("Joined (longer than a sheet): " + ", ".join(joined))
        lines += [n for n in pack.notes if "longer than the sheet" not in n]
        self.summary.setText("\n".join(lines))
        self.warnings.setText("\n".join(
            ([f"Frames: {self.frames_error}"] if self.frames_error else []) + list(pack.warnings)
        ))

    def _draw(self) -> None:
        self.panels_plot.clear()
        self.sheets_plot.clear()
        pack = self.pack
        if pack is None:
            return
        self._draw_pieces(pack)
        self._draw_sheets(pack)
        self.panels_plot.autoRange()
        self.sheets_plot.autoRange()

    def _draw_pieces(self, pack: BuildPack) -> None:
        """The pieces in two columns, each named inside its outline."""
        column_w = max(j.piece.length_m for j in pack.jobs) + 2 * GAP_M
        rows = (len(pack.jobs) + 1) // 2
        y = 0.0
        for r in range(rows):
            row = pack.jobs[2 * r : 2 * r + 2]
            height = max(j.piece.width_m for j in row)
            for k, job in enumerate(row):
                p = job.piece
                dx, dy = k * column_w - p.outline[:, 0].min(), y - p.outline[:, 1].min()
                ring = np.vstack([p.outline, p.outline[:1]])
                pen = WARN_PEN if p.strain > pack.settings.strain_limit else CUT_PEN
                self.panels_plot.plot(ring[:, 0] + dx, ring[:, 1] + dy, pen=pen)
                for mk in p.marks:
                    if mk.role == "station":
                        self.panels_plot.plot(mk.points[:, 0] + dx, mk.points[:, 1] + dy,
                                              pen=MARK_PEN)
                label = pg.TextItem(f"{p.name} ×{job.total_count}", color=(24, 28, 34),
                                    anchor=(0.5, 0.5))
                label.setPos(dx + p.outline[:, 0].mean(), dy + p.outline[:, 1].mean())
                self.panels_plot.addItem(label)
            y -= height + GAP_M

    def _draw_sheets(self, pack: BuildPack) -> None:
        """The sheets side by side, numbered."""
        x, number = 0.0, 1
        for _, layout in pack.layouts:
            for sheet in layout.sheets:
                box = np.array([[0, 0], [sheet.length, 0], [sheet.length, sheet.width],
                                [0, sheet.width], [0, 0]])
                self.sheets_plot.plot(box[:, 0] + x, box[:, 1], pen=SHEET_PEN)
                for pl in sheet.placements:
                    ring = np.asarray(pl.polygon.exterior.coords)
                    item = pg.PlotDataItem(ring[:, 0] + x, ring[:, 1], pen=CUT_PEN,
                                           fillLevel=None, brush=PIECE_BRUSH)
                    self.sheets_plot.addItem(item)
                label = pg.TextItem(f"{number}", color=(24, 28, 34), anchor=(0.5, 0))
                label.setPos(x + sheet.length / 2, 0.0)
                self.sheets_plot.addItem(label)
                x += sheet.length + GAP_M
                number += 1

    def showEvent(self, event) -> None:  # noqa: N802 - Qt's name
        super().showEvent(event)
        if self._stale:
            self.refresh()

    def closeEvent(self, event) -> None:  # noqa: N802 - Qt's name
        self._generation += 1
        self._interrupt()
        self._pool.waitForDone(5000)
        super().closeEvent(event)
