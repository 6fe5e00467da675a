"""One palette for the screen and the plate: each colour means one thing, the README's
legend lists them, and the views and the plate draw each meaning in its colour."""

import pytest
from PySide6.QtGui import QColor

from app import palette, plate_draw
from app.control_points import ControlPoints
from app.gz_plot import GzPlot
from tests.paths import ROOT


def test_each_colour_means_one_thing():
    colours = list(palette.MEANINGS)
    assert len(colours) == len(set(c.lower() for c in colours))
    neutral = {palette.PAPER, palette.GRID, palette.INK_FAINT, palette.STATION_MARK,
               palette.PRINT_TEXT, palette.PRINT_MUTED, palette.PRINT_RULE}
    assert not neutral & set(colours)


def test_readme_legend_lists_every_colour():
    readme = (ROOT / "README.md").read_text()
    for colour, meaning in palette.MEANINGS.items():
        assert f"`{colour}`" in readme and meaning in readme


@pytest.mark.parametrize("name", ["INK", "WATER", "CENTRE_OF_GRAVITY", "HEELING_ARM",
                                  "WALL_SIDED", "CREW", "WARNING"])
def test_plate_uses_the_palette(name):
    plate_colour = getattr(plate_draw, "HULL" if name == "INK" else name)
    assert plate_colour == QColor(getattr(palette, name))


def test_screen_draws_each_meaning_in_its_colour(qtbot):
    plot = GzPlot()
    qtbot.addWidget(plot)
    assert plot.wall_sided.pen().color() == QColor(palette.WALL_SIDED)
    handles = ControlPoints()
    plain_brush = handles._plain.brush.color()
    selected_brush = handles._marked.brush.color()
    assert plain_brush == QColor(palette.HANDLE) != QColor(palette.WALL_SIDED)
    assert selected_brush == QColor(palette.SELECTED) != QColor(palette.CENTRE_OF_GRAVITY)


def test_heeling_arm_is_the_same_colour_on_screen_and_plate(qtbot):
    from app.checks_panel import ChecksPanel
    from app.document import HullDocument
    from app.view_options import ViewOptions
    from tests.app.helpers import sample

    plot = GzPlot()
    qtbot.addWidget(plot)
    panel = ChecksPanel(HullDocument(sample("drift-lab-raft")), ViewOptions(), plot)
    qtbot.addWidget(panel)
    try:
        assert panel.arm_curve.opts["pen"].color() == plate_draw.HEELING_ARM
    finally:
        panel.shutdown()
