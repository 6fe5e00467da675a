"""Small drawing helpers for the editors: filled outlines and segment sets."""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtGui import QPainterPath
from PySide6.QtWidgets import QGraphicsPathItem

__all__ = ["OutlineItem", "segments", "polygon_path"]


def polygon_path(x: np.ndarray, y: np.ndarray) -> QPainterPath:
    """A closed path through the points (x, y)."""
    path = pg.arrayToQPath(np.asarray(x, dtype=float), np.asarray(y, dtype=float), connect="all")
    path.closeSubpath()
    return path


def segments(x0, y0, x1, y1) -> tuple[np.ndarray, np.ndarray]:
    """Coordinates for a ``connect="pairs"`` curve: one segment per (x0, y0)-(x1, y1)."""
    x = np.column_stack([np.asarray(x0, float), np.asarray(x1, float)]).ravel()
    y = np.column_stack([np.asarray(y0, float), np.asarray(y1, float)]).ravel()
    return x, y


class OutlineItem(QGraphicsPathItem):
    """A filled, outlined polygon in data coordinates (cosmetic pen)."""

    def __init__(self, pen: str, width: float, fill: str | tuple):
        super().__init__()
        self.setPen(pg.mkPen(pen, width=width))
        self.setBrush(pg.mkBrush(fill))

    def set_polygon(self, x: np.ndarray, y: np.ndarray) -> None:
        self.setPath(polygon_path(x, y))
