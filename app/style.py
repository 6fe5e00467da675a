"""Hullwright's own look on screen: the palette's colours, pens and fonts for the views.

A light "drafting table" look: warm off-white paper and navy ink.  Every colour comes
from :mod:`app.palette` (shared with the print plate) and means one thing there.  The GM
state colours are paired with words and glyphs so they never carry meaning alone.
"""

from __future__ import annotations

from PySide6.QtGui import QColor, QFont, QFontDatabase

from app.palette import (
    CENTRE_OF_GRAVITY,
    CREW,
    GRID,
    HANDLE,
    HANDLE_EDGE,
    HEELING_ARM,
    INK,
    INK_FAINT,
    NOT_AVAILABLE_FILL,
    PAPER,
    SELECTED,
    STATE_COLOURS,
    STATION_MARK,
    WALL_SIDED,
    WARNING,
    WATER,
    WATER_FILL,
)

__all__ = [
    "CENTRE_OF_GRAVITY", "CREW", "GRID", "GZ_LINE", "HANDLE", "HANDLE_EDGE", "HEELING_ARM",
    "INK", "INK_FAINT", "NOT_AVAILABLE_FILL", "PAPER", "SELECTED", "STATE_COLOURS",
    "STATE_GLYPHS", "STATION_MARK", "WALL_SIDED", "WARNING", "WATER_FILL", "WATER_LINE",
    "colour", "figure_font",
]

WATER_LINE = WATER
GZ_LINE = INK
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
