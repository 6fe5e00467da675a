"""The builder's checks panel: crew shift and boarding, level trim, beam for a target GM,
what-if sensitivity, swamping, and the inclining test of the built boat.

The checks run on a background thread after every committed edit (they take a few
hundred milliseconds, too long for every frame of a drag); while a drag is in progress
the panel says its figures are from before the drag.  The crew-shift heeling arm is
drawn on the stability panel's GZ plot.  "Apply" buttons change the design through the
document, so each is one undo step.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt, QThreadPool, QTimer, Signal
from PySide6.QtWidgets import (
    QAbstractItemView,
    QButtonGroup,
    QCheckBox,
    QComboBox,
    QDoubleSpinBox,
    QFormLayout,
    QGridLayout,
    QGroupBox,
    QHBoxLayout,
    QHeaderView,
    QLabel,
    QLineEdit,
    QListWidget,
    QListWidgetItem,
    QPushButton,
    QRadioButton,
    QTableWidget,
    QTableWidgetItem,
    QTabWidget,
    QVBoxLayout,
    QWidget,
)

from hydro import HEAVY_CREW_MASS_KG, Design, HullSketch, HullwrightError, scale_breadth
from hydro.limits import MAX_CREW_KG
from hydro import aids, incline
from hydro.heel_checks import HeelCheck
from hydro.incline import InclineReading, InclineResult
from hydro.whatif import SensitivityRow

from app import style
from app.checks_runner import CheckResults, ChecksJob, Relay
from app.interrupt import Interruptible
from app.document import HullDocument
from app.length_box import LengthBox
from app.markers import Markers, marker_style
from hydro.units import UnitSystem
from hydro.wording import (
    beam_text,
    heel_title,
    heel_verdict_text,
    swamp_text,
    trim_text,
    whatif_case,
)
from app.view_options import ViewOptions

__all__ = ["ChecksPanel"]

#: Columns of the readings table that hold lengths (moved, pendulum, deflection).
_LENGTH_COLUMNS = (1, 3, 4)
_VERDICT_STATE = {"holds": "stable", "floods": "marginal", "capsizes": "unstable"}
_VERDICT_WORDS = {"holds": "HOLDS", "floods": "FLOODS FIRST", "capsizes": "CAPSIZES"}


def _verdict_label() -> QLabel:
    label = QLabel()
    label.setWordWrap(True)
    label.setTextFormat(Qt.TextFormat.RichText)
    label.setMargin(4)
    return label


def _show_verdict(label: QLabel, check: HeelCheck | None, u: UnitSystem, waiting: str = "") -> None:
    if check is None:
        label.setText(waiting or "—")
        label.setStyleSheet("")
        return
    state = _VERDICT_STATE[check.verdict]
    back, ink = style.STATE_COLOURS[state]
    glyph = style.STATE_GLYPHS[state]
    label.setStyleSheet(f"background:{back}; color:{ink}; border-radius:4px;")
    label.setText(f"<b>{glyph} {_VERDICT_WORDS[check.verdict]}</b> - {heel_title(check, u)}:<br>{heel_verdict_text(check, u)}")


class ChecksPanel(QWidget):
    """The builder's checks for the open design, kept up to date in the background."""

    checksReady = Signal(object)

    def __init__(self, document: HullDocument, options: ViewOptions, gz_plot: pg.PlotWidget | None = None):
        super().__init__()
        self.document = document
        self.options = options
        self.trim_choice: tuple[str, int] = ("crew", 0)
        self._distance = 0.3  # shown in the distance box while another mode is chosen
        self._units = options.units  # what the spin boxes show now
        self.results: CheckResults | None = None
        self.incline: InclineResult | None = None
        self._generation = 0
        self._guard: Interruptible | None = None  # stops the newest run started
        self._stopped = False
        self._relay = Relay(self)  # deleted with the panel, so late results go nowhere
        self._relay.done.connect(self._on_done)
        self._pool = QThreadPool(self)
        self._pool.setMaxThreadCount(1)
        self._timer = QTimer(self)
        self._timer.setSingleShot(True)
        self._timer.setInterval(150)
        self._timer.timeout.connect(self.recompute)

        self.tabs = QTabWidget()
        self.tabs.addTab(self._heel_tab(), "Crew shift && boarding")
        self.tabs.addTab(self._trim_tab(), "Level trim && beam")
        self.tabs.addTab(self._whatif_tab(), "What if && swamping")
        self.tabs.addTab(self._incline_tab(), "Inclining test")
        self.state = QLabel()
        self.state.setStyleSheet(f"color:{style.INK_FAINT};")
        layout = QVBoxLayout(self)
        layout.setContentsMargins(4, 4, 4, 4)
        layout.addWidget(self.tabs, 1)
        layout.addWidget(self.state)

        self.gz_plot = gz_plot
        self.arm_curve = self.static_mark = None
        if gz_plot is not None:
            self.arm_curve = pg.PlotCurveItem(
                pen=pg.mkPen(style.HEELING_ARM, width=2, style=Qt.PenStyle.DashDotLine)
            )
            self.static_mark = Markers()
            self._mark_style = marker_style("o", 9, pen="w", brush=style.HEELING_ARM)
            for item in (self.arm_curve, self.static_mark):
                gz_plot.addItem(item, ignoreBounds=True)

        document.designChanged.connect(self._on_design_changed)
        document.dragStarted.connect(self._on_drag)
        document.designChanging.connect(self._on_drag)
        options.changed.connect(self._refresh_units)
        self._refresh_units()
        self._on_design_changed()

    # ------------------------------------------------------------ tabs

    def _heel_tab(self) -> QWidget:
        self.movers = QListWidget()
        self.movers.setMaximumWidth(220)
        self.movers.setToolTip("Tick the crew who move to the starboard side")
        self.movers.itemChanged.connect(self._on_inputs)
        self.mode_side = QRadioButton("to the hull side at seat height")
        self.mode_side.setToolTip(
            "Each person moves out to the hull side at seat height, less half a body width "
            "(the offset-load test of ISO 12217-3 and MCA MGN 280)"
        )
        self.mode_gunwale = QRadioButton("up onto the gunwale")
        self.mode_distance = QRadioButton("by")
        self.mode_side.setChecked(True)
        self.mode_group = QButtonGroup(self)
        for button in (self.mode_side, self.mode_gunwale, self.mode_distance):
            self.mode_group.addButton(button)
        self.mode_group.buttonToggled.connect(self._on_inputs)
        self.distance_box = self._length(0.0, 20.0, "shift distance")
        self.distance_box.editingFinished.connect(self._on_inputs)
        self.boarding_box = self._spin(1.0, 1000.0)
        self.boarding_box.editingFinished.connect(self._on_inputs)
        self.shift_verdict = _verdict_label()
        self.boarding_verdict = _verdict_label()
        self.shift_detail = QLabel()
        self.shift_detail.setFont(style.figure_font())

        how = QVBoxLayout()
        how.addWidget(QLabel("Who moves (to starboard):"))
        note = QLabel("Heeling arm: green dash-dot line on the GZ plot")
        note.setStyleSheet(f"color:{style.HEELING_ARM};")
        how.addWidget(self.movers, 1)
        where = QGroupBox("How far")
        where_layout = QVBoxLayout(where)
        where_layout.addWidget(self.mode_side)
        where_layout.addWidget(self.mode_gunwale)
        by = QHBoxLayout()
        by.addWidget(self.mode_distance)
        by.addWidget(self.distance_box)
        by.addStretch(1)
        where_layout.addLayout(by)
        board = QHBoxLayout()
        board.addWidget(QLabel("Boarding: one person of"))
        board.addWidget(self.boarding_box)
        board.addWidget(QLabel("on the gunwale amidships"))
        board.addStretch(1)
        out = QVBoxLayout()
        out.addWidget(note)
        out.addWidget(self.shift_verdict)
        out.addWidget(self.shift_detail)
        out.addLayout(board)
        out.addWidget(self.boarding_verdict)
        out.addStretch(1)
        tab = QWidget()
        row = QHBoxLayout(tab)
        row.addLayout(how)
        row.addWidget(where)
        row.addLayout(out, 1)
        return tab

    def _trim_tab(self) -> QWidget:
        self.trim_subject = QComboBox()
        self.trim_subject.setToolTip("Who or what moves fore or aft to float the boat level")
        self.trim_subject.currentIndexChanged.connect(self._on_inputs)
        self.trim_text = QLabel()
        self.trim_text.setWordWrap(True)
        self.trim_apply = QPushButton("Move it there")
        self.trim_apply.clicked.connect(self._apply_trim)
        self.target_box = self._length(0.001, 5.0, "target GM")
        self.target_box.setToolTip(
            "Default 150 mm: IMO 2008 Intact Stability Code, GM0 at least 0.15 m - a ship "
            "criterion, used here as a plain benchmark"
        )
        self.target_box.editingFinished.connect(self._on_inputs)
        self.beam_text = QLabel()
        self.beam_text.setWordWrap(True)
        self.beam_apply = QPushButton("Scale the beam")
        self.beam_apply.clicked.connect(self._apply_beam)

        trim = QGroupBox("Level trim")
        form = QFormLayout(trim)
        form.addRow("Move", self.trim_subject)
        form.addRow(self.trim_text)
        form.addRow(self.trim_apply)
        beam = QGroupBox("Beam for a target GM")
        form_b = QFormLayout(beam)
        form_b.addRow("Target GM", self.target_box)
        form_b.addRow(self.beam_text)
        form_b.addRow(self.beam_apply)
        tab = QWidget()
        row = QHBoxLayout(tab)
        row.addWidget(trim, 1)
        row.addWidget(beam, 1)
        return tab

    def _whatif_tab(self) -> QWidget:
        self.whatif = QTableWidget(0, 5)
        self.whatif.setEditTriggers(QAbstractItemView.EditTrigger.NoEditTriggers)
        self.whatif.verticalHeader().hide()
        self.whatif.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.ResizeToContents)
        self.whatif.setFont(style.figure_font())
        self.swamp_text = QLabel()
        self.swamp_text.setWordWrap(True)
        self.whatif_crew = QLineEdit()
        self.whatif_crew.setToolTip(
            "The mass of each crew member in the heavier-crew case, in the load list's order, "
            "separated by commas. Empty: each at least 84 kg (46 CFR 170.090); children are "
            "lighter."
        )
        self.whatif_crew.editingFinished.connect(self._on_whatif_inputs)
        self.wet_box = QDoubleSpinBox()
        self.wet_box.setRange(0.5, 5.0)
        self.wet_box.setSingleStep(0.1)
        self.wet_box.setPrefix("× ")
        self.wet_box.setKeyboardTracking(False)
        self.wet_box.editingFinished.connect(self._on_whatif_inputs)
        self.bilge_box = self._length(0.0, 1.0, "extra bilge water")
        self.bilge_box.editingFinished.connect(self._on_whatif_inputs)
        cases = QFormLayout()
        cases.addRow("Heavier crew", self.whatif_crew)
        cases.addRow("Soaked materials", self.wet_box)
        cases.addRow("Bilge water", self.bilge_box)
        side = QVBoxLayout()
        side.addLayout(cases)
        side.addWidget(self.swamp_text, 1)
        tab = QWidget()
        row = QHBoxLayout(tab)
        row.addWidget(self.whatif, 3)
        row.addLayout(side, 2)
        return tab

    def _incline_tab(self) -> QWidget:
        self.readings = QTableWidget(0, 5)
        self.readings.setToolTip(
            "One row per weight move. Distance and heel or deflection are signed: + to starboard. "
            "Give the heel, or the pendulum length and its deflection."
        )
        self.readings.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Stretch)
        add = QPushButton("Add reading")
        add.clicked.connect(lambda: self.readings.insertRow(self.readings.rowCount()))
        remove = QPushButton("Remove reading")
        remove.clicked.connect(lambda: self.readings.removeRow(max(self.readings.currentRow(), 0))
                               if self.readings.rowCount() else None)
        self.weighed = QRadioButton("boat weighed at")
        self.by_freeboard = QRadioButton("freeboards aft / fore")
        self.weighed.setChecked(True)
        self.weighed_box = self._spin(0.1, 1e5)
        self.fb_aft_box = self._length(-1.0, 5.0, "measured freeboard aft")
        self.fb_fore_box = self._length(-1.0, 5.0, "measured freeboard fore")
        self.correction = QCheckBox("wall-sided correction")
        self.correction.setChecked(True)
        self.correction.setToolTip("Subtract BM tan²(heel)/2 from each reading (exact for vertical sides)")
        work = QPushButton("Work out GM and KG")
        work.clicked.connect(self.compute_incline)
        self.incline_text = QLabel()
        self.incline_text.setWordWrap(True)
        self.incline_apply = QPushButton("Use the measured boat")
        self.incline_apply.setToolTip(
            "Replace the estimated hull materials and fittings by the inclined boat: its mass "
            "at the measured KG (crew stay as they are)"
        )
        self.incline_apply.clicked.connect(self._apply_incline)
        self.incline_apply.setEnabled(False)

        side = QGridLayout()
        side.addWidget(self.weighed, 0, 0)
        side.addWidget(self.weighed_box, 0, 1, 1, 2)
        side.addWidget(self.by_freeboard, 1, 0)
        side.addWidget(self.fb_aft_box, 1, 1)
        side.addWidget(self.fb_fore_box, 1, 2)
        side.addWidget(self.correction, 2, 0, 1, 3)
        side.addWidget(work, 3, 0, 1, 3)
        side.addWidget(self.incline_text, 4, 0, 1, 3)
        side.addWidget(self.incline_apply, 5, 0, 1, 3)
        side.setRowStretch(6, 1)
        table = QVBoxLayout()
        table.addWidget(self.readings, 1)
        buttons = QHBoxLayout()
        buttons.addWidget(add)
        buttons.addWidget(remove)
        buttons.addStretch(1)
        table.addLayout(buttons)
        tab = QWidget()
        row = QHBoxLayout(tab)
        row.addLayout(table, 3)
        row.addLayout(side, 2)
        return tab

    def _length(self, low: float, high: float, what: str) -> LengthBox:
        """A length field (m) that reads what a builder types (3.6 m, 11 3/4, 2-04-3)."""
        box = LengthBox(low, high, what, self.options.units)
        box.refused.connect(self.document.notice.emit)
        return box

    @staticmethod
    def _spin(low: float, high: float) -> QDoubleSpinBox:
        box = QDoubleSpinBox()
        box.setRange(low, high)
        box.setKeyboardTracking(False)
        return box

    # ------------------------------------------------------------ units and inputs

    def _refresh_units(self) -> None:
        u = self.options.units
        cs = self.document.committed.checks
        distance = cs.shift_distance_m if cs.shift_distance_m is not None else self._distance
        for box, metres in ((self.distance_box, distance), (self.target_box, cs.target_gm_m)):
            box.set_units(u)
            box.set_metres(metres)
        old = self._units
        for box in (self.fb_aft_box, self.fb_fore_box, self.bilge_box):
            box.set_units(u)
        weighed = old.from_mass(self.weighed_box.value())
        for box, kg in ((self.boarding_box, cs.boarding_mass_kg), (self.weighed_box, weighed)):
            box.blockSignals(True)
            box.setDecimals(u.mass_decimals)
            box.setSuffix(f" {u.mass}")
            box.setValue(u.to_mass(kg))
            box.blockSignals(False)
        self._convert_readings(old, u)
        self._units = u
        self.readings.setHorizontalHeaderLabels(
            [f"weight ({u.mass})", f"moved ({u.length}, + stbd)", "heel (°)",
             f"pendulum ({u.length})", f"deflection ({u.length})"]
        )
        self._show_cases(self.document.committed)
        self._show(self.results)

    def _convert_readings(self, old: UnitSystem, new: UnitSystem) -> None:
        """Re-express typed readings in the new units (heel angles stay)."""
        if old is new:
            return
        for row in range(self.readings.rowCount()):
            for col, to_si, from_si in (
                (0, old.from_mass, new.to_mass),
                (1, old.from_length, new.to_length),
                (3, old.from_length, new.to_length),
                (4, old.from_length, new.to_length),
            ):
                item = self.readings.item(row, col)
                if item is None or not item.text().strip():
                    continue
                try:
                    if col == 0:
                        item.setText(f"{from_si(to_si(float(item.text()))):.6g}")
                    else:  # a length as typed (141 3/4, 3.6 m) in the new units' words
                        item.setText(new.length_text(old.parse_length(item.text()), unit=False))
                except ValueError:
                    continue

    def _fill_choices(self, design: Design) -> None:
        """Crew list and level-trim subjects for the committed design."""
        crew = design.loads.crew
        self.movers.blockSignals(True)
        cs = design.checks
        ticked = cs.shift_crew
        self.movers.clear()
        for i, person in enumerate(crew):
            item = QListWidgetItem(f"{i + 1}. {person.name}")
            item.setFlags(item.flags() | Qt.ItemFlag.ItemIsUserCheckable)
            on = ticked is None or i in ticked
            item.setCheckState(Qt.CheckState.Checked if on else Qt.CheckState.Unchecked)
            self.movers.addItem(item)
        self.movers.blockSignals(False)
        self.trim_subject.blockSignals(True)
        current = self.trim_choice
        self.trim_subject.clear()
        for i, person in enumerate(crew):
            self.trim_subject.addItem(f"crew: {person.name}", ("crew", i))
        for i, item in enumerate(design.loads.items):
            self.trim_subject.addItem(f"item: {item.name}", ("item", i))
        index = self.trim_subject.findData(current)
        self.trim_subject.setCurrentIndex(max(index, 0))
        self.trim_subject.blockSignals(False)

    def _show_cases(self, design: Design) -> None:
        """Set the case widgets from the design's saved check cases."""
        cs = design.checks
        if cs.shift_distance_m is not None:
            self._distance = cs.shift_distance_m
        self.mode_group.blockSignals(True)
        button = (
            self.mode_gunwale if cs.shift_to_gunwale
            else self.mode_side if cs.shift_distance_m is None
            else self.mode_distance
        )
        button.setChecked(True)
        self.mode_group.blockSignals(False)
        u = self.options.units
        for box, metres in (
            (self.distance_box, self._distance),
            (self.target_box, cs.target_gm_m),
            (self.bilge_box, cs.whatif_bilge_m),
        ):
            box.set_units(u)
            box.set_metres(metres)
        for box, value in (
            (self.boarding_box, u.to_mass(cs.boarding_mass_kg)),
            (self.wet_box, cs.whatif_wet_factor),
        ):
            box.blockSignals(True)
            box.setValue(value)
            box.blockSignals(False)
        masses = cs.whatif_crew_kg
        self.whatif_crew.setPlaceholderText(f"each at least {u.mass_text(HEAVY_CREW_MASS_KG)}")
        self.whatif_crew.setText(
            "" if masses is None else ", ".join(u.mass_text(m, unit=False) for m in masses)
        )

    def _on_inputs(self, *_args: object) -> None:
        """The builder changed a case: save it in the design (one undo step)."""
        u = self.options.units
        design = self.document.committed
        ticked = tuple(
            i for i in range(self.movers.count())
            if self.movers.item(i).checkState() == Qt.CheckState.Checked
        )
        self._distance = _kept(self.distance_box, self._distance)
        cases = replace(
            design.checks,
            shift_crew=None if len(ticked) == self.movers.count() else ticked,
            shift_distance_m=self._distance if self.mode_distance.isChecked() else None,
            shift_to_gunwale=self.mode_gunwale.isChecked(),
            boarding_mass_kg=u.from_mass(self.boarding_box.value()),
            target_gm_m=_kept(self.target_box, design.checks.target_gm_m),
        )
        subject = tuple(self.trim_subject.currentData() or ("crew", 0))
        if cases != design.checks:
            if not self.document.edit(replace(design, checks=cases), "Change the check cases"):
                self._show_cases(design)  # refused: show what is saved
            return  # the edit brings the new results
        if subject != self.trim_choice:
            self.trim_choice = subject  # type: ignore[assignment]
            self._timer.start()

    def _on_whatif_inputs(self) -> None:
        """The builder changed a what-if case: save it in the design (one undo step)."""
        u = self.options.units
        design = self.document.committed
        text = self.whatif_crew.text().strip()
        masses: tuple[float, ...] | None = None
        if text:
            try:
                masses = tuple(u.from_mass(float(v)) for v in text.replace(";", ",").split(","))
            except ValueError:
                masses = ()
            crew = len(design.loads.crew)
            if len(masses) != crew or not all(0 < m <= MAX_CREW_KG for m in masses):
                self.state.setText(
                    f"Heavier crew: give {crew} mass(es), one per crew member, each up to "
                    f"{u.mass_text(MAX_CREW_KG)}, separated by commas (or leave it empty)."
                )
                self._show_cases(design)
                return
        cases = replace(
            design.checks,
            whatif_crew_kg=masses,
            whatif_wet_factor=self.wet_box.value(),
            whatif_bilge_m=_kept(self.bilge_box, design.checks.whatif_bilge_m),
        )
        if cases != design.checks and not self.document.edit(
            replace(design, checks=cases), "Change the what-if cases"
        ):
            self._show_cases(design)

    # ------------------------------------------------------------ background runs

    def _on_design_changed(self) -> None:
        self._fill_choices(self.document.committed)
        self._show_cases(self.document.committed)
        self._hide_arm()  # stale until the checks come back
        self._timer.start()

    def _on_drag(self) -> None:
        self._timer.stop()
        if self._interrupt():  # a run in progress would only slow the drag down
            self.state.setText("The checks wait for the end of the drag.")
        if self.document.is_previewing and self.arm_curve is not None and self.arm_curve.isVisible():
            self.state.setText("Figures from before the drag; they update when you let go.")
            self._hide_arm()

    def _hide_arm(self) -> None:
        if self.arm_curve is not None:
            self.arm_curve.hide()
            self.static_mark.hide()

    def recompute(self) -> None:
        """Start the checks for the committed design (newest request wins)."""
        if self._stopped:
            return
        self._generation += 1
        self._interrupt()
        self.state.setText("Working out the checks…")
        job = ChecksJob(self._generation, self.document.committed, self.trim_choice, self._relay)
        self._guard = job.guard
        self._pool.start(job)

    def _interrupt(self) -> bool:
        """Stop the newest run at once if it has not finished (its result would be
        stale); True if one was stopped."""
        guard, self._guard = self._guard, None
        return guard is not None and guard.interrupt()

    def _on_done(self, generation: int, result: object) -> None:
        if generation != self._generation:
            return  # a newer edit is on its way
        if isinstance(result, Exception):
            self.state.setText(f"The checks could not run: {result}")
            return
        assert isinstance(result, CheckResults)
        self.results = result
        self.state.setText("; ".join(result.problems) if result.problems else
                           "Checks up to date. A design aid, not a certification: life jackets on.")
        self._show(result)
        self.checksReady.emit(result)

    def wait(self, msecs: int = 30000) -> bool:
        """Block until the background checks are done (for tests and scripts)."""
        return self._pool.waitForDone(msecs)

    def shutdown(self) -> None:
        """Stop: no more runs, and results still on their way are dropped."""
        self._timer.stop()
        self._generation += 1
        self._interrupt()
        if not self._stopped:
            self._stopped = True
            self._relay.done.disconnect(self._on_done)
        self.wait()

    # ------------------------------------------------------------ show

    def _show(self, r: CheckResults | None) -> None:
        u = self.options.units
        if r is None:
            return
        _show_verdict(self.shift_verdict, r.shift, u, "No crew to move." if not r.design.loads.crew else "")
        _show_verdict(self.boarding_verdict, r.boarding, u)
        self.shift_detail.setText(self._shift_detail(r.shift, u))
        self._show_arm(r.shift)
        self.trim_text.setText(trim_text(r.trim, u) if r.trim else "Add crew or an item to move.")
        self.trim_apply.setEnabled(bool(r.trim and r.trim.x_after is not None))
        self.beam_text.setText(beam_text(r.beam, u) if r.beam else "Only for a sketched hull.")
        self.beam_apply.setEnabled(bool(r.beam and r.beam.factor is not None))
        self._show_whatif(r.sensitivity, u)
        self.swamp_text.setText(swamp_text(r.swamp, u) if r.swamp else "")

    @staticmethod
    def _shift_detail(check: HeelCheck | None, u: UnitSystem) -> str:
        if check is None:
            return ""
        small = "—" if check.small_angle_heel_deg is None else f"{check.small_angle_heel_deg:5.1f}°"
        exact = "none" if check.static_heel_deg is None else f"{check.static_heel_deg:5.1f}°"
        return (
            f"moved {u.mass_text(check.moved_mass)}, heeling arm {u.length_text(check.arm0)}\n"
            f"heel on the exact GZ curve {exact}; small-angle formula {small}"
        )

    def _show_arm(self, check: HeelCheck | None) -> None:
        if self.arm_curve is None:
            return
        if check is None or self.document.is_previewing:
            self._hide_arm()
            return
        self.arm_curve.setData(check.heel_deg, check.heeling_arm)
        self.arm_curve.show()
        (x0, x1), (y0, y1) = self.gz_plot.viewRange()
        top = float(np.max(check.heeling_arm)) * 1.1
        if top > y1:  # show the whole heeling arm: it may stand above the GZ curve
            self.gz_plot.setRange(xRange=(x0, x1), yRange=(y0, top), padding=0)
        if check.static_heel_deg is not None:
            arm = np.interp(check.static_heel_deg, check.heel_deg, check.heeling_arm)
            self.static_mark.set_markers([check.static_heel_deg], [arm], [self._mark_style])
            self.static_mark.show()
        else:
            self.static_mark.hide()

    def _show_whatif(self, rows: tuple[SensitivityRow, ...], u: UnitSystem) -> None:
        self.whatif.setHorizontalHeaderLabels(
            ["case", f"mass ({u.mass})", f"GM ({u.length})", f"least freeboard ({u.length})", "gunwale under at"]
        )
        self.whatif.setRowCount(len(rows))
        for i, row in enumerate(rows):
            cells = [
                whatif_case(row, u),
                u.mass_text(row.displacement, unit=False),
                u.length_text(row.gm, unit=False),
                u.length_text(row.min_freeboard, unit=False),
                "—" if row.gunwale_immersion_deg is None else f"{row.gunwale_immersion_deg:.1f}°",
            ]
            for j, text in enumerate(cells):
                item = QTableWidgetItem(text)
                if j:
                    item.setTextAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
                if j == 2 and row.gm is not None and row.gm <= 0:
                    item.setForeground(style.colour(style.STATE_COLOURS["unstable"][1]))
                    item.setToolTip("GM at or below zero: unstable")
                self.whatif.setItem(i, j, item)

    # ------------------------------------------------------------ apply

    def _apply_trim(self) -> None:
        r = self.results
        if r is None or r.trim is None or r.trim.x_after is None:
            return
        kind, _ = self.trim_choice
        design = aids.apply_level_trim(self.document.committed, r.trim, is_item=kind == "item")
        self.document.edit(design, f"Level trim: move {r.trim.what}")

    def _apply_beam(self) -> None:
        r = self.results
        hull = self.document.committed.hull
        if r is None or r.beam is None or r.beam.factor is None or not isinstance(hull, HullSketch):
            return
        design = replace(self.document.committed, hull=scale_breadth(hull, r.beam.factor))
        gm = self.options.units.length_text(r.beam.target_gm)
        self.document.edit(design, f"Beam ×{r.beam.factor:.3f} for GM {gm}")

    # ------------------------------------------------------------ inclining test

    def _cell(self, row: int, col: int) -> float | None:
        item = self.readings.item(row, col)
        text = item.text().strip().replace(",", ".") if item else ""
        if not text:
            return None
        if col in _LENGTH_COLUMNS:  # lengths as a builder types them, in the display units
            u = self.options.units
            return u.to_length(u.parse_length(item.text(), -100.0, 100.0, f"reading {row + 1}"))
        try:
            value = float(text)
        except ValueError:
            raise HullwrightError(f"reading {row + 1}: '{text}' is not a number") from None
        if not math.isfinite(value):
            raise HullwrightError(f"reading {row + 1}: '{text}' is not a number")
        return value

    def incline_readings(self) -> list[InclineReading]:
        """The readings typed in the table, in SI (raises HullwrightError with the row)."""
        u = self.options.units
        out = []
        for row in range(self.readings.rowCount()):
            values = [self._cell(row, col) for col in range(5)]
            if all(v is None for v in values):
                continue
            mass, moved, heel, pend, defl = values
            if mass is None or moved is None:
                raise HullwrightError(f"reading {row + 1}: give the weight and how far it moved")
            out.append(InclineReading(
                u.from_mass(mass), u.from_length(moved), heel,
                None if pend is None else u.from_length(pend),
                None if defl is None else u.from_length(defl),
            ))
        return out

    def compute_incline(self) -> None:
        """Fit GM and KG from the readings; a clear message for anything wrong."""
        u = self.options.units
        self.incline = None
        self.incline_apply.setEnabled(False)
        try:
            readings = self.incline_readings()
            if self.weighed.isChecked():
                result = incline.inclining_test(
                    self.document.committed, readings, displacement=u.from_mass(self.weighed_box.value()),
                    wall_sided_correction=self.correction.isChecked(),
                )
            else:
                fb = (self.fb_aft_box.metres(), self.fb_fore_box.metres())
                result = incline.inclining_test(
                    self.document.committed, readings, freeboards=fb,
                    wall_sided_correction=self.correction.isChecked(),
                )
        except HullwrightError as e:
            self.incline_text.setText(f"<b>Cannot work it out:</b> {e}")
            return
        self.incline = result
        lines = [
            f"<b>GM {u.length_text(result.gm)}</b>, KG {u.length_text(result.kg)} "
            f"(KM {u.length_text(result.km)}) at {u.mass_text(result.displacement)}",
        ]
        if result.predicted_kg is not None:
            lines.append(f"The design's estimate of KG: {u.length_text(result.predicted_kg)}")
        lines += [f"⚠ {w}" for w in result.warnings]
        self.incline_text.setText("<br>".join(lines))
        self.incline_apply.setEnabled(result.gm > 0)

    def _apply_incline(self) -> None:
        if self.incline is None:
            return
        design = incline.apply_inclining(self.document.committed, self.incline)
        self.document.edit(design, "Use the inclined boat's mass and KG")


def _kept(box: LengthBox, metres: float) -> float:
    """The box's length, or ``metres`` if the box still shows it (it holds micrometres)."""
    return metres if abs(box.metres() - metres) < 1e-6 else box.metres()
