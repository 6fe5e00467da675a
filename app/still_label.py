"""Labels whose text changes on every drag frame without costing the window a relayout.

A QLabel that gets a new text asks its parent's layout for a new geometry unless its
size is fixed both ways; the request climbs to the main window, which lays out every
dock again (and starts a dock animation for each), about a millisecond a frame.  And a
label that does not paint its own background makes every widget behind it repaint
with it, up to the window.  :func:`paint_own_background` stops the second;
:class:`LabelSlot` stops the first for a one-line label that must follow its panel's
width.
"""

from __future__ import annotations

from PySide6.QtWidgets import QLabel, QSizePolicy, QWidget

__all__ = ["LabelSlot", "paint_own_background"]


def paint_own_background(widget: QWidget) -> None:
    """Let ``widget`` fill its own background (the same colour as its parent's), so Qt
    repaints it alone when it changes."""
    widget.setAutoFillBackground(True)


class LabelSlot(QWidget):
    """A one-line row holding ``label`` outside any layout: as wide as the layout makes
    the row, as high as one line of the label's font, whatever the text.

    >>> from PySide6.QtWidgets import QApplication
    >>> app = QApplication.instance() or QApplication([])
    >>> slot = LabelSlot(QLabel("Total 80 kg"))
    >>> slot.label.parent() is slot
    True
    """

    def __init__(self, label: QLabel) -> None:
        super().__init__()
        self.label = label
        label.setParent(self)
        paint_own_background(label)
        probe = QLabel("Ag")  # one line's height, as the layout gave the label
        probe.setFont(label.font())
        self.setFixedHeight(probe.sizeHint().height())
        self.setSizePolicy(QSizePolicy.Policy.Ignored, QSizePolicy.Policy.Fixed)
        self.setMinimumWidth(0)

    def resizeEvent(self, event) -> None:
        super().resizeEvent(event)
        self.label.setGeometry(self.rect())
