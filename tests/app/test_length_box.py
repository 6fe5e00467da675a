"""Length fields: what a builder types is read strictly, in the field's current units."""

import pytest
from PySide6.QtCore import Qt

from app.length_box import LengthBox
from hydro.units import IMPERIAL, METRIC

IN = 0.0254

TYPED = [
    ("141 3/4", IMPERIAL, 141.75 * IN),
    ("11' 9 3/4\"", METRIC, 141.75 * IN),
    ("3.6 m", IMPERIAL, 3.6),
    ("360 cm", IMPERIAL, 3.6),
    ("2-04-3", METRIC, 28.375 * IN),
    ("1 ft", METRIC, 0.3048),
    ("2400", METRIC, 2.4),
]
REFUSED = ["141,75", "fourteen feet", "2-4", "1e3", "14134", "-3 m"]


def _box(qtbot, units):
    box = LengthBox(0.0, 30.0, "hull length", units)
    qtbot.addWidget(box)
    box.set_metres(1.0)
    box.show()
    box.setFocus()
    return box


def _type(qtbot, box, text):
    box.lineEdit().selectAll()
    qtbot.keyClicks(box.lineEdit(), text)
    qtbot.keyClick(box.lineEdit(), Qt.Key.Key_Return)


@pytest.mark.parametrize("text, units, metres", TYPED)
def test_typed_lengths_are_accepted(qtbot, text, units, metres):
    box = _box(qtbot, units)
    _type(qtbot, box, text)
    assert box.metres() == pytest.approx(metres, abs=1e-6)
    assert box.text() == units.length_text(box.metres())


@pytest.mark.parametrize("text", REFUSED)
def test_other_text_is_refused_with_a_message_and_loses_nothing(qtbot, text):
    box = _box(qtbot, IMPERIAL)
    messages = []
    box.refused.connect(messages.append)
    _type(qtbot, box, text)
    box.clearFocus()
    assert box.metres() == pytest.approx(1.0)
    assert messages and messages[0].startswith("Not changed: hull length")
    assert box.text() == IMPERIAL.length_text(1.0)


def test_a_unit_switch_reshows_the_same_length(qtbot):
    box = _box(qtbot, METRIC)
    box.set_metres(141.75 * IN)
    assert box.text() == "3600 mm"
    box.set_units(IMPERIAL)
    assert box.text() == "141 3/4 in"
    assert not box.has_unsaved_text()
    box.lineEdit().setText("12")
    assert box.has_unsaved_text()
