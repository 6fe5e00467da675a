"""The readout: the plotted GZ is the engine's, GM reads in words, overloads show plainly."""

from dataclasses import replace

import numpy as np
import pytest

from hydro.units import parse_length

from hydro import MassItem, analyse

from app.document import HullDocument
from app.results_panel import ResultsPanel
from hydro.assess import gm_state
from app.view_options import ViewOptions
from tests.app.helpers import sample


def _panel(qtbot, design, options=None):
    doc = HullDocument(design)
    panel = ResultsPanel(doc, options or ViewOptions())
    qtbot.addWidget(panel)
    doc.recompute_now()
    return doc, panel


@pytest.mark.parametrize("name", ["paper-loon-canoe", "tern-pram"])
def test_plotted_gz_is_the_engines(qtbot, name):
    design = sample(name)
    _doc, panel = _panel(qtbot, design)
    curve = analyse(design).curve
    heel_a, gz_a = panel.gz_plot.open_part.getData()
    heel_b, gz_b = panel.gz_plot.beyond_part.getData()
    assert curve.gunwale_immersion_deg is not None
    assert heel_a[-1] <= curve.gunwale_immersion_deg <= heel_b[1]
    assert heel_a[-1] == heel_b[0]  # the two parts meet at a shared engine point
    np.testing.assert_array_equal(np.concatenate([heel_a, heel_b[1:]]), curve.heel_deg)
    np.testing.assert_array_equal(np.concatenate([gz_a, gz_b[1:]]), curve.gz)
    heel_w, wall = panel.gz_plot.wall_sided.getData()
    np.testing.assert_array_equal(wall, curve.wall_sided[: wall.size])  # cut where it leaves the plot
    np.testing.assert_array_equal(heel_w, curve.heel_deg[: wall.size])
    assert panel.gz_plot.gunwale_line.value() == curve.gunwale_immersion_deg
    assert panel.gz_plot.beyond_band.getRegion() == (curve.gunwale_immersion_deg, curve.heel_deg[-1])


def test_table_shows_fixed_digits_in_the_chosen_units(qtbot):
    design = sample("heron-punt")
    options = ViewOptions()
    doc, panel = _panel(qtbot, design, options)
    hs = analyse(design).hydrostatics
    assert panel.values["gm"].text() == f"{hs.gm * 1000:.0f}"
    assert panel.units["gm"].text() == "mm"
    assert panel.values["displacement"].text() == f"{hs.displacement:.1f}"
    options.set_units("imperial")
    sixteenths = round(hs.gm / 0.0254 * 16)  # tape-measure fractions, never decimals
    assert parse_length(panel.values["gm"].text(), "in") == pytest.approx(sixteenths / 16 * 0.0254)
    assert "." not in panel.values["gm"].text()
    assert panel.values["displacement"].text() == f"{hs.displacement / 0.45359237:.0f}"
    assert panel.units["gm"].text() == "in"
    assert panel.gz_plot.getAxis("left").labelText == "GZ (in)"
    assert doc.committed == design


def test_gm_state_thresholds():
    assert gm_state(-0.01, 0.8) == "unstable"
    assert gm_state(0.0, 0.8) == "unstable"
    assert gm_state(0.04, 0.5) == "marginal"  # below 50 mm
    assert gm_state(0.06, 2.0) == "marginal"  # below 4 % of a 2 m waterline beam
    assert gm_state(0.09, 2.0) == "stable"


def test_gm_state_reads_in_words(qtbot):
    _doc, panel = _panel(qtbot, sample("heron-punt"))
    assert panel.state.property("gm_state") == "stable"
    assert "STABLE" in panel.state.text()


def test_an_unstable_load_reads_unstable(qtbot):
    design = sample("paper-loon-canoe")
    high = MassItem("rack on a pole", 60.0, 1.7, 0.0, 1.5)
    design = replace(design, loads=replace(design.loads, items=design.loads.items + (high,)))
    _doc, panel = _panel(qtbot, design)
    result = analyse(design)
    assert result.hydrostatics.gm <= 0
    assert panel.state.property("gm_state") == "unstable"
    # the badge names the one status (no heel brings this one back: it capsizes)
    assert result.status in ("unstable", "capsizes")
    assert result.status.value.upper() in panel.state.text()
    assert panel.status.text().startswith(result.status.value.capitalize())


def test_a_load_the_hull_cannot_carry_says_how_much_too_heavy(qtbot):
    design = sample("heron-punt")
    anvil = MassItem("anvil", 2000.0, 1.3, 0.0, 0.1)
    design = replace(design, loads=replace(design.loads, items=(anvil,)))
    _doc, panel = _panel(qtbot, design)
    result = analyse(design)
    assert result.status == "sinks"
    assert "Too heavy by at least" in panel.status.text()
    assert panel.values["gm"].text() == "—"
    assert panel.state.property("gm_state") == "none"
    assert panel.gz_plot.open_part.getData()[0] is None or len(panel.gz_plot.open_part.getData()[0]) == 0


def test_flooding_load_is_reported_not_crashed(qtbot):
    design = sample("heron-punt")
    crowd = MassItem("crowd", 700.0, 1.3, 0.0, 0.3)
    design = replace(design, loads=replace(design.loads, items=(crowd,)))
    result = analyse(design)
    assert result.status == "floods"
    _doc, panel = _panel(qtbot, design)
    assert panel.status.text().startswith(result.message)
    assert panel.status.property("tone") == "unstable"


def test_safety_line_is_shown(qtbot):
    from hydro.safety import SHORT_CAUTION

    _doc, panel = _panel(qtbot, sample("heron-punt"))
    assert SHORT_CAUTION in panel.caution.text()
