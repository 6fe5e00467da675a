"""The load editor: who and what goes into the boat, and the water it floats in.

Tabs for crew, hull material, ballast and fittings, and water and bilge; running totals
underneath from the latest weight build-up.  Every change is one undo step through the
document and recomputes at once.
"""

from __future__ import annotations

from dataclasses import replace

from PySide6.QtCore import QSignalBlocker, Qt
from PySide6.QtWidgets import (
    QCheckBox,
    QComboBox,
    QDoubleSpinBox,
    QFormLayout,
    QHBoxLayout,
    QLabel,
    QPushButton,
    QTabWidget,
    QVBoxLayout,
    QWidget,
)

from hydro import (
    CREW_MASS_KG,
    HEAVY_CREW_MASS_KG,
    MATERIAL_PRESETS,
    MATERIAL_THICKNESS_M,
    WATER_PRESETS,
    Analysis,
    CrewMember,
    Design,
    MassItem,
    Material,
)

from hydro.units import UnitSystem

from app import style
from app.document import HullDocument
from app.length_box import LengthBox
from app.still_label import LabelSlot
from app.load_table import Column, LoadTable
from app.view_options import ViewOptions

__all__ = ["LoadEditor"]


def _density_text(rho: float, units: UnitSystem) -> str:
    """A water density in the display units (kg/m³ or lb/ft³)."""
    decimals = 0 if units.name == "metric" else 1
    return f"{rho * units.density_factor:.{decimals}f} {units.density}"

CREW_COLUMNS = (
    Column("Name", "name", "text"),
    Column("Mass", "mass", "mass", "Body mass (use the design figure for an adult if unsure)"),
    Column("Seat at", "x", "length", "Seat position, measured forward from the aft end"),
    Column("Seat height", "seat_height", "length", "Seat surface above the inside of the bottom"),
    Column("CG above seat", "cg_above_seat", "length",
           "Seated centre of gravity above the seat (a seated adult's is about a foot up)"),
    Column("Side offset", "y", "length", "Seat offset from the centreline, + to starboard"),
)
MATERIAL_COLUMNS = (
    Column("Material", "name", "text"),
    Column("Per layer", "areal_density", "areal", "Mass per area of one layer"),
    Column("Layers", "layers", "number", "How many layers (fractions allowed, e.g. 0.4 for seam tape)"),
    Column("Bottom", "bottom", "surface", "Covers the bottom"),
    Column("Sides", "sides", "surface", "Covers the sides"),
    Column("Ends", "ends", "surface", "Covers the transoms (blunt ends)"),
)
ITEM_COLUMNS = (
    Column("Name", "name", "text"),
    Column("Mass", "mass", "mass"),
    Column("x", "x", "length", "Forward from the aft end"),
    Column("y", "y", "length", "Out from the centreline, + to starboard"),
    Column("z", "z", "length", "Height above the baseline (lowest point of the keel)"),
)
_CUSTOM_WATER = "other density"


class LoadEditor(QWidget):
    """Crew, materials, ballast and fittings, water and bilge, with totals."""

    def __init__(self, document: HullDocument, options: ViewOptions):
        super().__init__()
        self.document = document
        self.options = options

        self.crew = LoadTable(CREW_COLUMNS, "crew")
        self.materials = LoadTable(MATERIAL_COLUMNS, "material")
        self.items = LoadTable(ITEM_COLUMNS, "item")
        for table, field in ((self.crew, "crew"), (self.materials, "materials"), (self.items, "items")):
            table.rowsEdited.connect(lambda rows, text, f=field: self._edit_loads(text, **{f: rows}))
            table.invalidEntry.connect(self.document.notice.emit)

        self.add_adult = QPushButton()
        self.add_adult.clicked.connect(lambda: self._add_crew(CREW_MASS_KG))
        self.add_heavy = QPushButton()
        self.add_heavy.clicked.connect(lambda: self._add_crew(HEAVY_CREW_MASS_KG))
        crew_tab = self._table_tab(self.crew, [self.add_adult, self.add_heavy], "crew")

        self.preset_box = QComboBox()
        for name, (_density, source) in MATERIAL_PRESETS.items():
            self.preset_box.addItem(name, name)
            self.preset_box.setItemData(
                self.preset_box.count() - 1, f"Source: {source}", Qt.ItemDataRole.ToolTipRole
            )
        add_material = QPushButton("Add material")
        add_material.clicked.connect(self._add_material)
        material_tab = self._table_tab(self.materials, [self.preset_box, add_material], "materials")

        add_item = QPushButton("Add ballast or fitting")
        add_item.clicked.connect(self._add_item)
        item_tab = self._table_tab(self.items, [add_item], "items")

        self.tabs = QTabWidget()
        self.tabs.addTab(crew_tab, "Crew")
        self.tabs.addTab(material_tab, "Hull material")
        self.tabs.addTab(item_tab, "Ballast && fittings")
        self.tabs.addTab(self._water_tab(), "Water && bilge")
        self.totals = QLabel()
        self.totals.setFont(style.figure_font())

        layout = QVBoxLayout(self)
        layout.setContentsMargins(4, 4, 4, 4)
        layout.addWidget(self.tabs, 1)
        layout.addWidget(LabelSlot(self.totals))  # a new total never re-lays out the window

        document.designChanged.connect(self.refresh)
        document.analysisReady.connect(self.show_totals)
        options.changed.connect(self.refresh)
        self.refresh()

    # ------------------------------------------------------------ layout

    def _table_tab(self, table: LoadTable, buttons: list[QWidget], field: str) -> QWidget:
        remove = QPushButton("Remove selected")
        remove.clicked.connect(lambda: self._remove_row(table, field))
        row = QHBoxLayout()
        for b in buttons:
            row.addWidget(b)
        row.addStretch(1)
        row.addWidget(remove)
        tab = QWidget()
        layout = QVBoxLayout(tab)
        layout.setContentsMargins(4, 4, 4, 4)
        layout.addWidget(table, 1)
        layout.addLayout(row)
        return tab

    def _water_tab(self) -> QWidget:
        self.water_box = QComboBox()
        for name in WATER_PRESETS:
            self.water_box.addItem(f"{name} water", name)
        self.water_box.addItem(_CUSTOM_WATER, _CUSTOM_WATER)
        self.water_box.currentIndexChanged.connect(self._on_water_chosen)
        self.density_box = self._spin(500.0, 1500.0, 1, " kg/m³")
        self.density_box.editingFinished.connect(self._on_water_chosen)
        self.bottom_box = LengthBox(0.0, 0.2, "bottom thickness")
        self.bottom_box.setToolTip("Thickness of the hull bottom; seats stand on its inside")
        self.bottom_box.editingFinished.connect(lambda: self._on_length_typed("bottom_thickness", self.bottom_box))
        self.bilge_box = LengthBox(0.0, 1.0, "bilge water depth")
        self.bilge_box.setToolTip("Depth of loose water lying in the bottom (it slops to the low side)")
        self.bilge_box.editingFinished.connect(lambda: self._on_length_typed("bilge_water_depth", self.bilge_box))
        for box in (self.bottom_box, self.bilge_box):
            box.refused.connect(self.document.notice.emit)
        self.wet_box = self._spin(0.5, 5.0, 2, " ×")
        self.wet_box.setSingleStep(0.1)
        self.wet_box.setToolTip("Multiplies every material mass: 1.0 dry; soaked cardboard 1.5 or more")
        self.wet_box.editingFinished.connect(self._on_wet_typed)
        self.open_box = QCheckBox("open boat: it floods when the gunwale goes under")
        self.open_box.setToolTip(
            "Untick for a closed hull (decked, or sealed pontoons): its righting-arm curve "
            "then goes on past the gunwale"
        )
        self.open_box.toggled.connect(self._on_open_toggled)
        tab = QWidget()
        form = QFormLayout(tab)
        form.addRow("Hull", self.open_box)
        form.addRow("Water", self.water_box)
        form.addRow("Density", self.density_box)
        form.addRow("Bottom thickness", self.bottom_box)
        form.addRow("Bilge water depth", self.bilge_box)
        form.addRow("Wet material factor", self.wet_box)
        return tab

    @staticmethod
    def _spin(low: float, high: float, decimals: int, suffix: str) -> QDoubleSpinBox:
        box = QDoubleSpinBox()
        box.setRange(low, high)
        box.setDecimals(decimals)
        box.setSuffix(suffix)
        box.setKeyboardTracking(False)
        return box

    # ------------------------------------------------------------ model -> widgets

    def refresh(self) -> None:
        """Show the committed design's loads in the current units."""
        design = self.document.committed
        units = self.options.units
        loads = design.loads
        self.crew.show_items(loads.crew, units)
        self.materials.show_items(loads.materials, units)
        self.items.show_items(loads.items, units)
        self.add_adult.setText(f"Add adult ({units.mass_text(CREW_MASS_KG)})")
        self.add_heavy.setText(f"Add heavier adult ({units.mass_text(HEAVY_CREW_MASS_KG)})")
        for i, (density, _source) in enumerate(MATERIAL_PRESETS.values()):
            name = self.preset_box.itemData(i)
            self.preset_box.setItemText(i, f"{name} ({units.areal_text(density)} per layer)")
        for i, rho in enumerate(WATER_PRESETS.values()):
            name = self.water_box.itemData(i)
            self.water_box.setItemText(i, f"{name} water ({_density_text(rho, units)})")
        with QSignalBlocker(self.water_box), QSignalBlocker(self.density_box):
            preset = design.water.lower() if isinstance(design.water, str) else None
            index = self.water_box.findData(preset if preset in WATER_PRESETS else _CUSTOM_WATER)
            self.water_box.setCurrentIndex(index)
            self.density_box.setEnabled(preset not in WATER_PRESETS)
            self.density_box.setSuffix(f" {units.density}")
            f = units.density_factor
            self.density_box.setRange(500.0 * f, 1500.0 * f)
            self.density_box.setDecimals(1 if units.name == "metric" else 2)
            try:
                self.density_box.setValue(design.water_density * f)
            except ValueError:
                pass
        for box, metres in ((self.bottom_box, loads.bottom_thickness), (self.bilge_box, loads.bilge_water_depth)):
            box.set_units(units)
            box.set_metres(metres)
        with QSignalBlocker(self.wet_box):
            self.wet_box.setValue(loads.wet_factor)
        with QSignalBlocker(self.open_box):
            self.open_box.setChecked(design.settings.open_boat)
        if self.document.analysis is not None:
            self.show_totals(self.document.analysis)

    def show_totals(self, analysis: Analysis) -> None:
        """Mass by kind from the weight build-up."""
        units = self.options.units
        sums = {"crew": 0.0, "material": 0.0, "item": 0.0, "water": 0.0}
        for line in analysis.weights.lines:
            sums[line.kind] = sums.get(line.kind, 0.0) + line.mass
        self.totals.setText(
            f"Crew {units.mass_text(sums['crew'])} · Hull material {units.mass_text(sums['material'])} · "
            f"Ballast & fittings {units.mass_text(sums['item'])} · Bilge water {units.mass_text(sums['water'])}"
            f"  =  Total {units.mass_text(analysis.weights.mass)}"
        )

    # ------------------------------------------------------------ widgets -> model

    def _edit(self, design: Design, text: str) -> None:
        if not self.document.edit(design, text):
            self.refresh()

    def _edit_loads(self, text: str, **changes) -> None:
        design = self.document.committed
        self._edit(replace(design, loads=replace(design.loads, **changes)), text)

    def _mid_length(self) -> float:
        stations = self.document.committed.stations()
        return float(0.5 * (stations.x[0] + stations.x[-1]))

    def _add_crew(self, mass: float) -> None:
        loads = self.document.committed.loads
        person = CrewMember(f"crew {len(loads.crew) + 1}", x=self._mid_length(), mass=mass)
        self._edit_loads("Add crew", crew=loads.crew + (person,))

    def _add_material(self) -> None:
        name = self.preset_box.currentData()
        density, _source = MATERIAL_PRESETS[name]
        loads = self.document.committed.loads
        thickness = MATERIAL_THICKNESS_M.get(name, 0.0)
        material = Material(name, density, thickness_m=thickness)
        self._edit_loads("Add material", materials=loads.materials + (material,))

    def _add_item(self) -> None:
        loads = self.document.committed.loads
        item = MassItem(f"item {len(loads.items) + 1}", 5.0, self._mid_length())
        self._edit_loads("Add ballast or fitting", items=loads.items + (item,))

    def _remove_row(self, table: LoadTable, field: str) -> None:
        row = table.selected_row()
        if row is None:
            self.document.notice.emit("Select a row to remove first")
            return
        rows = getattr(self.document.committed.loads, field)
        self._edit_loads(f"Remove {table.noun}", **{field: rows[:row] + rows[row + 1 :]})

    def _on_water_chosen(self) -> None:
        choice = self.water_box.currentData()
        self.density_box.setEnabled(choice == _CUSTOM_WATER)
        typed = self.density_box.value() / self.options.units.density_factor
        water = round(typed, 1) if choice == _CUSTOM_WATER else choice
        design = self.document.committed
        if water != design.water:
            self._edit(replace(design, water=water), "Change water")

    def _on_length_typed(self, field: str, box: LengthBox) -> None:
        if abs(box.metres() - getattr(self.document.committed.loads, field)) > 1e-6:
            self._edit_loads(f"Edit {field.replace('_', ' ')}", **{field: box.metres()})

    def _on_open_toggled(self, on: bool) -> None:
        design = self.document.committed
        if design.settings.open_boat != on:
            self._edit(
                replace(design, settings=replace(design.settings, open_boat=on)),
                "Open boat" if on else "Closed hull",
            )

    def _on_wet_typed(self) -> None:
        if self.wet_box.value() != round(self.document.committed.loads.wet_factor, self.wet_box.decimals()):
            self._edit_loads("Edit wet material factor", wet_factor=self.wet_box.value())

