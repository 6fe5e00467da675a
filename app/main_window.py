"""The main window: the three editors, the stability readout, the loads, files and menus.

Layout: plan view across the top, profile and section side by side below it, the
selected point's exact coordinates underneath; the stability readout docked on the
right and the load editor docked at the bottom.  Further panels (builder's checks)
join the load editor as tabs through :meth:`MainWindow.add_panel`.

Questions that need an answer (save before closing? recover unsaved work?) go through
``self.ask``, which tests replace; every other message is non-blocking.
"""

from __future__ import annotations

import importlib
from dataclasses import replace
import re
from importlib import resources
from pathlib import Path
from typing import Callable

from shiboken6 import isValid
from PySide6.QtCore import QEvent, QObject, QSettings, Qt
from PySide6.QtGui import (
    QAction,
    QActionGroup,
    QCloseEvent,
    QIcon,
    QKeyEvent,
    QKeySequence,
    QTextDocumentFragment,
)
from PySide6.QtWidgets import (
    QAbstractSpinBox,
    QDockWidget,
    QDoubleSpinBox,
    QFileDialog,
    QLabel,
    QLineEdit,
    QMainWindow,
    QMessageBox,
    QPlainTextEdit,
    QSpinBox,
    QSplitter,
    QVBoxLayout,
    QWidget,
)

from hydro import HullwrightError, load_design
from hydro.assess import assess
from hydro.outputs import write_via_temp

from app import style
from app.document import HullDocument, starter_design
from app.build_view import BuildView
from app.checks_panel import ChecksPanel
from app.compare import difference_text
from app.design_header import DesignHeader
from app.dimensions_panel import DimensionsPanel
from app.length_box import LengthBox
from app.load_editor import LoadEditor
from app.pack_dialog import PackDialog
from app.plan_view import PlanView
from app.plate_dialog import PlateDialog
from app.point_entry import PointEntry
from app.profile_view import ProfileView
from app.results_panel import ResultsPanel
from app.safety_dialog import SafetyDialog
from app.section_view import SectionView
from app.recovery import Autosave, orphans
from app.settings import add_recent_file, recent_files, recovery_folder
from app.still_label import paint_own_background
from app.view_options import ViewOptions

__all__ = ["MainWindow", "sample_paths", "icon"]

FILE_FILTER = "Hullwright designs (*.json);;All files (*)"

Button = QMessageBox.StandardButton
Ask = Callable[[str, str, Button, Button], Button]

KEYS_HELP = """<table cellpadding='3'>
<tr><td><b>Drag an orange handle</b></td><td>move a point; the readout follows live</td></tr>
<tr><td><b>Esc</b> during a drag</td><td>put the point back</td></tr>
<tr><td><b>Click</b> a handle</td><td>select it; type exact figures below the drawings</td></tr>
<tr><td><b>Arrow keys</b></td><td>nudge the selected points, as on screen (1 mm or 1/16 in)</td></tr>
<tr><td><b>Shift + arrows</b></td><td>nudge ten times as far</td></tr>
<tr><td><b>Shift-drag</b> on paper</td><td>select the points in a box (Ctrl-drag adds)</td></tr>
<tr><td><b>Shift/Ctrl-click</b> a handle</td><td>add it to the selection or take it out</td></tr>
<tr><td><b>Right-click</b> a handle</td><td>delete, corners or smooth, type coordinates</td></tr>
<tr><td><b>Double-click</b> a line</td><td>add a point there</td></tr>
<tr><td><b>Delete</b></td><td>remove the selected point</td></tr>
<tr><td><b>Wheel / right-drag</b></td><td>zoom; left-drag on paper pans</td></tr>
<tr><td><b>Ctrl+0</b></td><td>fit every drawing to its view</td></tr>
</table>"""


def icon(name: str) -> QIcon:
    """One of the project's own SVG icons."""
    return QIcon(str(resources.files("icons") / f"{name}.svg"))


def sample_paths() -> list[Path]:
    """The demo designs shipped with the app, by file name."""
    folder = resources.files("sample_hulls")
    return sorted(Path(str(p)) for p in folder.iterdir() if p.name.endswith(".json"))


def _ask_with_dialog(parent: QWidget) -> Ask:
    def ask(title: str, text: str, buttons: Button, default: Button) -> Button:
        return QMessageBox.question(parent, title, text, buttons, default)

    return ask


class MainWindow(QMainWindow):
    """Hullwright's window around one :class:`HullDocument`.

    Attributes
    ----------
    document, options : the model and the display choices every part shares
    plan_view, profile_view, section_view, point_entry, results, loads : the parts
    ask : callable(title, text, buttons, default) -> button; the one blocking question
    message_box : the non-blocking message box, once a message has been shown
    """

    def __init__(self, document: HullDocument, settings: QSettings):
        super().__init__()
        self.document = document
        self.settings = settings
        self.options = ViewOptions(
            str(settings.value("units", "metric")), _flag(settings.value("snap", True))
        )
        self.ask: Ask = _ask_with_dialog(self)
        self.message_box: QMessageBox | None = None
        self.setWindowIcon(icon("hullwright"))

        self.plan_view = PlanView(document, self.options)
        self.profile_view = ProfileView(document, self.options)
        self.section_view = SectionView(document, self.options)
        self.point_entry = PointEntry(document, self.options)
        self.views = (self.plan_view, self.profile_view, self.section_view)
        lengthwise = QSplitter(Qt.Orientation.Vertical)
        lengthwise.addWidget(self.plan_view)
        lengthwise.addWidget(self.profile_view)
        drawings = QSplitter(Qt.Orientation.Horizontal)
        drawings.addWidget(lengthwise)
        drawings.addWidget(self.section_view)
        drawings.setSizes([700, 340])
        central = QWidget()
        column = QVBoxLayout(central)
        column.setContentsMargins(0, 0, 0, 0)
        column.setSpacing(0)
        self.header = DesignHeader(document)
        column.addWidget(self.header)
        column.addWidget(drawings, 1)
        column.addWidget(self.point_entry)
        self.setCentralWidget(central)

        self.setCorner(Qt.Corner.BottomRightCorner, Qt.DockWidgetArea.RightDockWidgetArea)
        self.results = ResultsPanel(document, self.options)
        self.results.helpRequested.connect(self.show_safety_notes)
        self.results.gz_plot.heelPicked.connect(self.section_view.show_heel)
        self.results_dock = self._dock(self.results, "Stability", Qt.DockWidgetArea.RightDockWidgetArea)
        self.loads = LoadEditor(document, self.options)
        self.loads_dock = self._dock(self.loads, "Loads", Qt.DockWidgetArea.BottomDockWidgetArea)

        self.cursor_label = QLabel()
        self.cursor_label.setFont(style.figure_font())
        self.cursor_label.setFixedSize(300, self.cursor_label.fontMetrics().height())  # no relayout per move
        paint_own_background(self.cursor_label)  # nor a repaint of the status bar and window
        self.statusBar().addPermanentWidget(self.cursor_label)
        for view in self.views:
            view.cursorMoved.connect(self.cursor_label.setText)
            view.typeCoordinatesRequested.connect(self._type_coordinates)

        self._build_actions()
        self._build_menus()
        self._build_toolbar()
        self.checks = ChecksPanel(document, self.options, self.results.gz_plot)
        self.checks_dock = self.add_panel(self.checks, "Checks")
        self.dimensions = DimensionsPanel(document, self.options)
        self.dimensions_dock = self.add_panel(self.dimensions, "Dimensions")
        self.build_view = BuildView(document, self.options, settings)
        self.build_view.exportRequested.connect(self.export_pack)
        self.build_dock = self.add_panel(self.build_view, "Build")
        self.loads_dock.raise_()

        document.notice.connect(self._on_notice)
        document.fileChanged.connect(self._update_title)
        document.designChanged.connect(self._update_title)
        self.options.changed.connect(self._on_options_changed)
        self.pinned: tuple | None = None
        document.analysisReady.connect(self._show_comparison)
        self.options.changed.connect(self._show_comparison)
        self._update_title()

        self.recovery = Autosave(document, recovery_folder(settings), self)

        self._route_undo_from_fields()
        self.resize(1440, 900)
        geometry = settings.value("window/geometry")
        if geometry is not None:
            self.restoreGeometry(geometry)
        state = settings.value("window/state")
        self._default_docks = state is None or not self.restoreState(state)

    # ------------------------------------------------------------ construction

    def _dock(self, widget: QWidget, title: str, area: Qt.DockWidgetArea) -> QDockWidget:
        dock = QDockWidget(title, self)
        dock.setObjectName(f"dock-{title.lower()}")
        dock.setWidget(widget)
        dock.setFeatures(
            QDockWidget.DockWidgetFeature.DockWidgetMovable | QDockWidget.DockWidgetFeature.DockWidgetFloatable
            | QDockWidget.DockWidgetFeature.DockWidgetClosable
        )
        self.addDockWidget(area, dock)
        return dock

    def showEvent(self, event) -> None:
        super().showEvent(event)
        if self._default_docks:  # first start: give the drawings most of the room
            self._default_docks = False
            self.resizeDocks([self.loads_dock], [190], Qt.Orientation.Vertical)
            self.resizeDocks([self.results_dock], [400], Qt.Orientation.Horizontal)

    def add_panel(self, widget: QWidget, title: str) -> QDockWidget:
        """Dock another panel (e.g. builder's checks) as a tab beside the loads."""
        dock = self._dock(widget, title, Qt.DockWidgetArea.BottomDockWidgetArea)
        self.tabifyDockWidget(self.loads_dock, dock)
        self.view_menu.addAction(dock.toggleViewAction())
        return dock

    def _action(self, text: str, slot, shortcut=None, icon_name: str | None = None, tip: str = "") -> QAction:
        action = QAction(text, self)
        if icon_name:
            action.setIcon(icon(icon_name))
        if shortcut is not None:
            action.setShortcut(QKeySequence(shortcut))
        if tip:
            action.setToolTip(tip)
            action.setStatusTip(tip)
        action.triggered.connect(slot)
        return action

    def _build_actions(self) -> None:
        keys = QKeySequence.StandardKey
        self.new_action = self._action("&New", self.new_design, keys.New, "new", "Start a new hull")
        self.open_action = self._action("&Open…", self.open_dialog, keys.Open, "open", "Open a design file")
        self.save_action = self._action("&Save", self.save, keys.Save, "save", "Save the design")
        self.save_as_action = self._action("Save &as…", self.save_as, keys.SaveAs)
        self.plate_action = self._action(
            "Export &plate…", self.export_plate, "Ctrl+E", "plate", "Write the print plate for the build team"
        )
        self.pack_action = self._action(
            "Export &build pack…", self.export_pack, tip="Flat panels, frames, sheet layout, "
            "materials list and full-size templates as a PDF"
        )
        self.quit_action = self._action("&Quit", self.close, keys.Quit)
        # fixed texts, so the toolbar never shifts; what would be undone is in the tooltip
        stack = self.document.undo_stack
        self.undo_action = self._action("&Undo", stack.undo, keys.Undo, "undo")
        self.redo_action = self._action("&Redo", stack.redo, keys.Redo, "redo")
        self.redo_action.setShortcuts([QKeySequence(keys.Redo), QKeySequence("Ctrl+Y")])
        stack.canUndoChanged.connect(self.undo_action.setEnabled)
        stack.canRedoChanged.connect(self.redo_action.setEnabled)
        stack.undoTextChanged.connect(self._show_undo_text)
        stack.redoTextChanged.connect(self._show_undo_text)
        self._show_undo_text()
        self.remove_point_action = self._action(
            "Remove selected point", self.document.remove_selected_point, tip="Remove the selected control point"
        )
        self.fit_action = self._action("&Fit all drawings", self.fit_all, "Ctrl+0", "fit", "Fit every drawing to its view")
        self.snap_action = self._action("S&nap to grid", self.options.set_snap, icon_name="snap",
                                        tip="Round dragged points to a 5 mm (1/8 in) grid")
        self.snap_action.setCheckable(True)
        self.snap_action.setChecked(self.options.snap)
        self.units_group = QActionGroup(self)
        self.unit_actions: dict[str, QAction] = {}
        for name, text in (("metric", "&Metric (mm, kg)"), ("imperial", "&Imperial (in, lb)")):
            action = QAction(text, self, checkable=True)
            action.setChecked(self.options.units.name == name)
            action.triggered.connect(lambda _checked, n=name: self.options.set_units(n))
            self.units_group.addAction(action)
            self.unit_actions[name] = action
        self.safety_action = self._action("&Safety notes…", self.show_safety_notes)
        self.keys_action = self._action("Mouse and &keys…", self.show_keys_help)
        self.about_action = self._action("&About Hullwright…", self.show_about)

    def _build_menus(self) -> None:
        bar = self.menuBar()
        file_menu = bar.addMenu("&File")
        file_menu.addActions([self.new_action, self.open_action])
        self.recent_menu = file_menu.addMenu("Open &recent")
        self.recent_menu.aboutToShow.connect(self._fill_recent_menu)
        self.samples_menu = file_menu.addMenu("Open sa&mple")
        for path in sample_paths():
            label = path.stem.replace("-", " ").capitalize()
            self.samples_menu.addAction(label, lambda p=path: self.open_sample(p))
        file_menu.addSeparator()
        file_menu.addActions(
            [self.save_action, self.save_as_action, self.plate_action, self.pack_action]
        )
        file_menu.addSeparator()
        file_menu.addAction(self.quit_action)
        edit_menu = bar.addMenu("&Edit")
        edit_menu.addActions([self.undo_action, self.redo_action])
        edit_menu.addSeparator()
        edit_menu.addActions([self.remove_point_action, self.snap_action])
        self.view_menu = bar.addMenu("&View")
        self.view_menu.addAction(self.fit_action)
        self.shift_heel_action = self._action(
            "Section heeled by the crew &shift", self.show_crew_shift_heel, "Ctrl+H",
            tip="Show the section at the heel the crew-shift check finds (righting arm = heeling arm)",
        )
        self.view_menu.addAction(self.shift_heel_action)
        self.pin_action = self._action(
            "&Pin this version", self.pin_version, "Ctrl+P",
            tip="Keep this version faintly behind the drawings and the GZ curve, to compare",
        )
        self.unpin_action = self._action("&Unpin", lambda: self.pin_version(False))
        self.view_menu.addActions([self.pin_action, self.unpin_action])
        units_menu = self.view_menu.addMenu("&Units")
        units_menu.addActions(list(self.unit_actions.values()))
        self.view_menu.addSeparator()
        self.view_menu.addActions([self.results_dock.toggleViewAction(), self.loads_dock.toggleViewAction()])
        help_menu = bar.addMenu("&Help")
        help_menu.addActions([self.safety_action, self.keys_action, self.about_action])

    def _build_toolbar(self) -> None:
        bar = self.addToolBar("Main")
        bar.setObjectName("toolbar-main")
        bar.setMovable(False)
        bar.setToolButtonStyle(Qt.ToolButtonStyle.ToolButtonTextBesideIcon)
        bar.addActions([self.new_action, self.open_action, self.save_action])
        bar.addSeparator()
        bar.addActions([self.undo_action, self.redo_action])
        bar.addSeparator()
        bar.addActions([self.fit_action, self.snap_action])
        bar.addSeparator()
        for action in self.unit_actions.values():
            bar.addAction(action)
        bar.addSeparator()
        bar.addAction(self.plate_action)

    def pin_version(self, pin: bool = True) -> None:
        """Pin the design as it stands (or unpin): faint lines and curve, a difference table."""
        analysis = self.document.analysis
        self.pinned = (self.document.committed, analysis) if pin and analysis is not None else None
        design = None if self.pinned is None else self.pinned[0]
        for view in self.views:
            view.set_pinned(design)
        self.results.gz_plot.show_pinned(None if self.pinned is None else self.pinned[1].curve)
        self._show_comparison()

    def _show_comparison(self, _analysis: object = None) -> None:
        label = self.results.compare
        analysis = self.document.analysis
        if self.pinned is None or analysis is None:
            label.hide()
            return
        label.setText(difference_text(self.pinned, (self.document.design, analysis), self.options.units))
        label.show()

    def show_crew_shift_heel(self) -> None:
        """The section view at the crew-shift check's static heel (where GZ meets the arm)."""
        results = self.checks.results
        shift = results.shift if results is not None else None
        if shift is None or shift.static_heel_deg is None:
            self.statusBar().showMessage(
                "No crew-shift heel to show: the check has not run, or the boat capsizes", 8000
            )
            return
        self.section_view.show_heel(shift.static_heel_deg)

    def _type_coordinates(self) -> None:
        box = self.point_entry.first
        box.setFocus()
        box.selectAll()

    def _show_undo_text(self, _text: str = "") -> None:
        """What Undo and Redo would do, in their tooltips (their labels stay put)."""
        stack = self.document.undo_stack
        if not isValid(stack) or not isValid(self.undo_action):
            return  # the window is closing
        for action, verb, can, text in (
            (self.undo_action, "Undo", stack.canUndo(), stack.undoText()),
            (self.redo_action, "Redo", stack.canRedo(), stack.redoText()),
        ):
            action.setEnabled(can)
            _set_tip(action, f"{verb} {text.lower()}" if can else f"{verb}: nothing to {verb.lower()}")

    def _route_undo_from_fields(self) -> None:
        """Ctrl+Z / Ctrl+Y in a field undo the design unless the field holds unentered text."""
        for kind in (QLineEdit, QAbstractSpinBox, QPlainTextEdit):
            for field in self.findChildren(kind):
                field.installEventFilter(self)

    def eventFilter(self, watched: QObject, event: QEvent) -> bool:
        if event.type() == QEvent.Type.ShortcutOverride and _is_undo_key(event):
            field = watched.parent() if isinstance(watched.parent(), QAbstractSpinBox) else watched
            if not has_unsaved_text(field):
                event.ignore()  # not the field's: the window's Undo / Redo shortcut runs
                return True
        return super().eventFilter(watched, event)

    # ------------------------------------------------------------ small slots

    def _on_notice(self, text: str) -> None:
        if text:
            self.statusBar().showMessage(plain_text(text), 8000)
        else:
            self.statusBar().clearMessage()

    def _on_options_changed(self) -> None:
        self.settings.setValue("units", self.options.units.name)
        self.settings.setValue("snap", self.options.snap)
        self.unit_actions[self.options.units.name].setChecked(True)
        self.snap_action.setChecked(self.options.snap)

    def _update_title(self) -> None:
        path = self.document.path
        where = path.name if path is not None else "not saved yet"
        self.setWindowTitle(f"{self.document.committed.name} — {where}[*] · Hullwright")
        self.setWindowModified(self.document.is_modified)

    def fit_all(self) -> None:
        for view in self.views:
            view.fit()

    def show_message(self, title: str, text: str, icon_kind=QMessageBox.Icon.Warning) -> QMessageBox:
        """A non-blocking message (one box, reused), echoed in the status bar."""
        box = self.message_box
        if box is None:
            box = self.message_box = QMessageBox(self)
            box.setWindowModality(Qt.WindowModality.WindowModal)
        box.setIcon(icon_kind)
        box.setWindowTitle(title)
        box.setText(text)
        box.open()
        first = plain_text(text).strip().splitlines()
        self.statusBar().showMessage(f"{title}: {first[0]}" if first else title, 10000)
        return box

    # ------------------------------------------------------------ files

    def confirm_discard(self) -> bool:
        """True if it is fine to drop the current design (saved, or the user said so)."""
        if not self.document.is_modified:
            return True
        answer = self.ask(
            "Unsaved changes",
            f"Save the changes to “{self.document.committed.name}” first?",
            Button.Save | Button.Discard | Button.Cancel,
            Button.Save,
        )
        if answer == Button.Save:
            return self.save()
        return answer == Button.Discard

    def new_design(self) -> None:
        if self.confirm_discard():
            self.document.replace_design(starter_design(), None)
            self.fit_all()

    def open_dialog(self) -> None:
        if not self.confirm_discard():
            return
        start = str(self.settings.value("last_folder", str(Path.home())))
        path, _ = QFileDialog.getOpenFileName(self, "Open design", start, FILE_FILTER)
        if path:
            self.open_path(path, confirmed=True)

    def open_path(self, path: str | Path, confirmed: bool = False) -> bool:
        """Open a design file; on any problem show why and keep the current design."""
        if not confirmed and not self.confirm_discard():
            return False
        try:
            self.document.open(path)
        except Exception as e:  # the boundary: any failure is shown, the design kept
            self.show_message("Could not open the file", f"{_words(e)}\n\nThe design on screen is unchanged.")
            return False
        path = Path(path).resolve()
        add_recent_file(self.settings, str(path))
        self.settings.setValue("last_folder", str(path.parent))
        self.fit_all()
        self.statusBar().showMessage(f"Opened {path.name}", 5000)
        return True

    def open_sample(self, path: Path) -> bool:
        """Open a demo design as a new, unsaved copy (the sample itself stays as it is)."""
        if not self.confirm_discard():
            return False
        try:
            design = load_design(path)
        except Exception as e:  # the boundary
            self.show_message("Could not open the sample", _words(e))
            return False
        self.document.replace_design(design, None)
        self.fit_all()
        self.statusBar().showMessage(f"Sample “{design.name}”: save it under a new name to keep changes", 8000)
        return True

    def _fill_recent_menu(self) -> None:
        self.recent_menu.clear()
        files = recent_files(self.settings)
        if not files:
            self.recent_menu.addAction("(none yet)").setEnabled(False)
        for name in files:
            self.recent_menu.addAction(name, lambda p=name: self.open_path(p))

    def save(self) -> bool:
        """Save to the current file (asks for a name the first time)."""
        if self.document.path is None:
            return self.save_as()
        return self.save_to(self.document.path)

    def save_as(self) -> bool:
        start = self.document.path or Path(str(self.settings.value("last_folder", str(Path.home())))) / (
            _file_stem(self.document.committed.name) + ".json"
        )
        path, _ = QFileDialog.getSaveFileName(self, "Save design as", str(start), FILE_FILTER)
        if not path:
            return False
        if not path.lower().endswith(".json"):
            path += ".json"
        return self.save_to(Path(path))

    def save_to(self, path: Path) -> bool:
        """Save atomically to ``path``; on failure say why and keep everything as it was."""
        try:
            saved = self.document.save(path)
        except Exception as e:  # the boundary: a refused path, a full disk, anything
            self.show_message("Could not save", f"{path}: {_words(e)}\n\nNothing was overwritten.")
            return False
        add_recent_file(self.settings, str(saved.resolve()))
        self.settings.setValue("last_folder", str(saved.resolve().parent))
        self.recovery.discard()
        self.statusBar().showMessage(f"Saved {saved.name}", 5000)
        return True

    def export_plate(self) -> None:
        """Write the print plate (the plate module is loaded only when asked for)."""
        try:
            plate = importlib.import_module("app.plate")
        except ImportError as e:
            self.show_message(
                "Plate export not available",
                f"The print plate is not part of this build yet ({e}).",
                QMessageBox.Icon.Information,
            )
            return
        folder = self.document.path.parent if self.document.path else Path.home()
        suggested = folder / f"{_file_stem(self.document.committed.name)}-plate.png"
        dialog = PlateDialog(self, list(plate.PAPER_SIZES), suggested)
        dialog.accepted.connect(
            lambda: self._write_plate(plate, *dialog.choice(), stations=dialog.stations())
        )
        dialog.open()

    def _write_plate(
        self, plate, path: Path, paper: str, dpi: int,
        stations: tuple[float | None, int | None] = (None, None),
    ) -> None:
        if path.suffix.lower() not in (".png", ".pdf"):
            path = path.with_suffix(".png")
        source = self.document.path.name if self.document.path else "not saved"
        design, units = self.document.committed, self.options.units.name
        shown = self.checks.results  # the assessment on screen, when it is this design's
        assessment = shown.assessment if shown is not None and shown.design == design else None
        marks = None  # the plate works out the checks' marks itself
        try:
            if stations != (None, None):  # the builder's stations for the offsets
                assessment = assessment or assess(design)
                marks = replace(
                    plate.marks_from_assessment(assessment, self.options.units),
                    station_spacing_m=stations[0],
                    station_count=stations[1],
                )
            write_via_temp(
                path,
                lambda tmp: plate.render_plate_file(
                    design, tmp, paper=paper, dpi=dpi, units=units, source=source,
                    assessment=assessment, extras=marks,
                ),
                [self.document.path] if self.document.path else [],
            )
        except Exception as e:  # the boundary: a refused path, the engine, the disk
            self.show_message("Could not write the plate", _words(e))
            return
        self.statusBar().showMessage(f"Plate written to {path}", 8000)

    def export_pack(self) -> None:
        """Ask for a file and paper, then write the build pack PDF."""
        folder = self.document.path.parent if self.document.path else Path.home()
        suggested = folder / f"{_file_stem(self.document.committed.name)}-build-pack.pdf"
        dialog = PackDialog(self, suggested)
        dialog.accepted.connect(lambda: self.write_pack(*dialog.choice()))
        dialog.open()

    def write_pack(self, path: Path, paper: str) -> bool:
        """Write the build pack of the committed design with the build view's settings."""
        from app.pack_pages import write_pack_pdf
        from hydro.build_pack import build_pack

        if path.suffix.lower() != ".pdf":
            path = path.with_suffix(".pdf")
        source = self.document.path.name if self.document.path else "not saved"
        design = self.document.committed
        inputs = [str(self.document.path)] if self.document.path else []
        try:
            pack = build_pack(design, self.build_view.pack_settings())
            write_pack_pdf(path, design, pack, paper, self.options.units.name, source, inputs)
        except Exception as e:  # the boundary: the engine, a refused path, the disk
            self.show_message("Could not write the build pack", _words(e))
            return False
        self.statusBar().showMessage(f"Build pack written to {path}", 8000)
        return True

    # ------------------------------------------------------------ recovery

    def autosave(self) -> None:
        """Write unsaved work to this window's recovery file now (normally the
        :class:`~app.recovery.Autosave` timer does it about 1.5 s after an edit)."""
        if not self.recovery.write_now():
            self.statusBar().showMessage(f"Autosave failed: {self.recovery.error}", 8000)

    def offer_recovery(self) -> bool:
        """List the work of windows that did not close normally and offer the newest.

        Yes opens the newest here (as unsaved work); No deletes them all; Cancel keeps
        them for next time.  True if a design was recovered.
        """
        found = orphans(self.recovery.folder)
        if not found:
            return False
        answer = self.ask(
            "Recover unsaved work?",
            "Hullwright did not close normally and autosaved this unsaved work:\n\n"
            + "\n".join(f"• {w.label()}" for w in found)
            + "\n\nYes opens the newest here (any others are offered again next time); "
            "No deletes them; Cancel keeps them for next time.",
            Button.Yes | Button.No | Button.Cancel,
            Button.Yes,
        )
        if answer == Button.No:
            for work in found:
                work.discard()
            return False
        if answer != Button.Yes:
            return False
        work = found[0]
        if work.design is None:
            self.show_message("Could not recover", f"The autosaved copy is damaged: {work.problem}")
            work.discard()
            return False
        self.document.replace_design(work.design, Path(work.source) if work.source else None)
        self.document.mark_unsaved()
        if self.recovery.write_now():  # this window's own copy first, then the orphan goes
            work.discard()
        self.fit_all()
        return True

    # ------------------------------------------------------------ help

    def show_first_run_notice(self) -> SafetyDialog | None:
        """Show the safety notes once, at the first start (non-blocking)."""
        if _flag(self.settings.value("first_run_done", False)):
            return None
        dialog = SafetyDialog(self, first_run=True)
        dialog.finished.connect(lambda _result: self.settings.setValue("first_run_done", True))
        dialog.open()
        return dialog

    def show_safety_notes(self) -> None:
        SafetyDialog(self).open()

    def show_keys_help(self) -> None:
        self.show_message("Mouse and keys", KEYS_HELP, QMessageBox.Icon.NoIcon)

    def show_about(self) -> None:
        self.show_message(
            "About Hullwright",
            "Hullwright 0.1: sketch a small boat's hull, load it, and see how it floats "
            "and how far it can heel.\n\nA design aid, not a certification.",
            QMessageBox.Icon.Information,
        )

    # ------------------------------------------------------------ closing

    def closeEvent(self, event: QCloseEvent) -> None:
        if not self.confirm_discard():
            event.ignore()
            return
        self.settings.setValue("window/geometry", self.saveGeometry())
        self.settings.setValue("window/state", self.saveState())
        self.recovery.close()
        self.checks.shutdown()
        event.accept()


def _words(error: BaseException) -> str:
    """An exception in words: our own messages as they are, anything else with its kind."""
    if isinstance(error, HullwrightError):
        return str(error)
    if isinstance(error, OSError) and error.strerror:
        return error.strerror
    if isinstance(error, MemoryError):
        return "not enough memory for this design"
    return f"unexpected problem ({type(error).__name__}: {error})"


def _is_undo_key(event: QKeyEvent) -> bool:
    keys = QKeySequence.StandardKey
    combo = event.keyCombination()
    return (
        event.matches(keys.Undo)
        or event.matches(keys.Redo)
        or QKeySequence(combo) == QKeySequence("Ctrl+Y")
    )


def has_unsaved_text(field: QObject) -> bool:
    """True if ``field`` holds typed text not yet entered (its own undo then applies).

    A length box or spin box whose text differs from its value, a line edit changed since
    it was last entered, notes typed and not yet saved into the design.
    """
    if isinstance(field, LengthBox):
        return field.has_unsaved_text()
    if isinstance(field, (QSpinBox, QDoubleSpinBox)):
        return field.cleanText() != field.textFromValue(field.value())
    if isinstance(field, QLineEdit):
        return field.isModified()
    if isinstance(field, QPlainTextEdit):
        return field.document().isModified()
    return True


def plain_text(text: str) -> str:
    """``text`` without markup, for the status bar (which shows tags as they are)."""
    if not re.search(r"<[a-zA-Z/]", text):
        return text
    return QTextDocumentFragment.fromHtml(text).toPlainText()


def _set_tip(action: QAction, tip: str) -> None:
    action.setToolTip(tip)
    action.setStatusTip(tip)


def _flag(value: object) -> bool:
    """A boolean from QSettings (INI files give back the text 'true'/'false')."""
    if isinstance(value, str):
        return value.lower() in ("true", "1", "yes")
    return bool(value)


def _file_stem(name: str) -> str:
    keep = "".join(c if c.isalnum() or c in "-_ " else " " for c in name)
    return "-".join(keep.lower().split())[:60] or "design"
