"""Helpers for driving the editors with real mouse events."""

from __future__ import annotations

from PySide6.QtCore import QPoint, QPointF, Qt
from PySide6.QtWidgets import QApplication

from hydro import load_design
from tests.paths import SAMPLES


def sample(name: str):
    """A demo design by file stem, e.g. ``sample("heron-punt")``."""
    return load_design(SAMPLES / f"{name}.json")


def to_pixel(plot, x: float, y: float) -> QPoint:
    """Viewport pixel of the data point (x, y) on a pyqtgraph PlotWidget."""
    scene = plot.getViewBox().mapViewToScene(QPointF(x, y))
    return plot.mapFromScene(scene)


def drag(qtbot, plot, start: tuple[float, float], end: tuple[float, float], steps: int = 4, release: bool = True):
    """Press at ``start``, move in ``steps`` to ``end`` and (optionally) release, in data units."""
    viewport = plot.viewport()
    a, b = to_pixel(plot, *start), to_pixel(plot, *end)
    qtbot.mousePress(viewport, Qt.MouseButton.LeftButton, pos=a)
    for i in range(1, steps + 1):
        p = QPoint(a.x() + (b.x() - a.x()) * i // steps, a.y() + (b.y() - a.y()) * i // steps)
        qtbot.mouseMove(viewport, p)
        QApplication.processEvents()  # as between real mouse moves: recompute, repaint
    if release:
        qtbot.mouseRelease(viewport, Qt.MouseButton.LeftButton, pos=b)


def data_per_pixel(plot) -> float:
    """Size of one screen pixel in data units (aspect locked: the same on both axes)."""
    w, h = plot.getViewBox().viewPixelSize()
    return max(w, h)


def slow_first_call(real, started):
    """``real`` with its first call made to spin for a minute (setting ``started`` as it
    begins), so a test can interrupt it; returns (the wrapper, the list of designs called)."""
    import time

    calls = []

    def wrapper(design, *args, **kwargs):
        calls.append(design)
        if len(calls) == 1:  # the run the test interrupts: would take a minute
            started.set()
            end = time.monotonic() + 60
            while time.monotonic() < end:
                sum(range(100))
        return real(design, *args, **kwargs)

    return wrapper, calls
