"""The unit switch reaches every text: walk the window's widgets for unit words."""

import re

import pytest
from PySide6.QtWidgets import (
    QAbstractButton,
    QAbstractSpinBox,
    QComboBox,
    QLabel,
    QLineEdit,
    QMessageBox,
    QTableWidget,
    QTabWidget,
)

from hydro import MATERIAL_PRESETS
from hydro.sheet_layout import SHEET_PRESETS

from app.document import HullDocument
from app.main_window import MainWindow, plain_text
from app.settings import open_settings
from tests.app.helpers import sample

METRIC_WORDS = re.compile(r"(?:\d|\()\s*(?:mm|cm|kg|m²|m³|kg/m²|kg/m³)(?![a-z])")
IMPERIAL_WORDS = re.compile(r"(?:\d|\()\s*(?:in|lb|ft|ft²|ft³|oz/yd²|lb/ft³)(?![a-z])|\d[\"']")


def texts(window):
    """(where, text) of every text a user can read in the window."""
    for w in window.findChildren(QLabel):
        yield w, w.text()
    for w in window.findChildren(QAbstractButton):
        yield w, w.text()
    for w in window.findChildren(QLineEdit):
        yield w, w.text()
    for w in window.findChildren(QAbstractSpinBox):
        yield w, w.text()
    for w in window.findChildren(QComboBox):
        for i in range(w.count()):
            yield w, w.itemText(i)
    for w in window.findChildren(QTabWidget):
        for i in range(w.count()):
            yield w, w.tabText(i)
    for w in window.findChildren(QTableWidget):
        for c in range(w.columnCount()):
            yield w, w.horizontalHeaderItem(c).text() if w.horizontalHeaderItem(c) else ""
            for r in range(w.rowCount()):
                item = w.item(r, c)
                yield w, item.text() if item is not None else ""
    for view in (window.plan_view, window.profile_view, window.section_view):
        for side in ("bottom", "left"):
            yield view, view.plot.getAxis(side).labelText
    yield window.results.gz_plot, window.results.gz_plot.getAxis("left").labelText


def _without_names(text, window):
    """The text with names taken out: a product's or a person's name is not a unit text
    ("okoume plywood 4 mm", a 1220x2440 mm sheet, a crew member called "crew 1")."""
    loads = window.document.committed.loads
    names = set(MATERIAL_PRESETS) | set(SHEET_PRESETS)
    names |= {x.name for x in (*loads.crew, *loads.items, *loads.materials)}
    for name in sorted(names, key=len, reverse=True):
        text = text.replace(name, "")
    return text


@pytest.mark.parametrize("name", ["heron-punt", "drift-lab-raft"])
def test_no_unit_word_of_the_other_system_remains(qtbot, name):
    window = MainWindow(HullDocument(sample(name)), open_settings())
    window.ask = lambda *a: QMessageBox.StandardButton.Discard
    qtbot.addWidget(window)
    with qtbot.waitSignal(window.checks.checksReady, timeout=30000):  # verdicts shown too
        window.document.recompute_now()
    # the unit switch itself names both systems
    switches = {a.text().replace("&", "") for a in window.unit_actions.values()}
    for units, wrong in (("imperial", METRIC_WORDS), ("metric", IMPERIAL_WORDS)):
        window.options.set_units(units)
        left = [
            (type(w).__name__, t)
            for w, t in texts(window)
            if wrong.search(_without_names(plain_text(t or ""), window)) and t not in switches
        ]
        assert not left, f"{units}: {left}"
