"""Hullwright's own look: colours, pens and fonts shared by every view.

A light "drafting table" palette: warm off-white paper, ink-blue lines, copper handles,
water in a pale blue-green.  The GM state colours are paired with words and glyphs so
they never carry meaning alone.
"""

from __future__ import annotations

from PySide6.QtGui import QColor, QFont, QFontDatabase

PAPER = "#fbf9f3"
GRID = "#e4dfd2"
INK = "#1f3a5f"
INK_FAINT = "#9aa7b8"
HANDLE = "#c8651b"
HANDLE_EDGE = "#ffffff"
SELECTED = "#7a1f5c"
WATER_LINE = "#2a7f9e"
WATER_FILL = (42, 127, 158, 38)
CREW = "#5b6b2f"
STATION_MARK = "#b9a77a"
NOT_AVAILABLE_FILL = (120, 110, 100, 40)
WALL_SIDED = "#c8651b"
GZ_LINE = "#1f3a5f"

#: GM state colours (background, text) and glyphs; the words live in results_panel.
STATE_COLOURS = {
    "stable": ("#d9efe3", "#1d5e3b"),
    "marginal": ("#fbecc8", "#7a4e00"),
    "unstable": ("#f7d6d3", "#8a1c14"),
    "none": ("#e9e6df", "#4a4a4a"),
}
STATE_GLYPHS = {"stable": "✔", "marginal": "▲", "unstable": "✖", "none": "…"}


def colour(name: str) -> QColor:
    """A QColor from a hex string."""
    return QColor(name)


def figure_font(point_size: float = 0) -> QFont:
    """Fixed-pitch font for figures, so digits line up and do not jitter."""
    font = QFontDatabase.systemFont(QFontDatabase.SystemFont.FixedFont)
    if point_size:
        font.setPointSizeF(point_size)
    return font
