"""The builder's units: the strict length parser and the fraction / offset formatter."""

import pytest

from hydro.units import (
    IMPERIAL,
    METRIC,
    LengthError,
    feet_inches_text,
    inches_text,
    offset_text,
    parse_length,
)

IN = 0.0254
FT = 0.3048

# (typed, unit of a plain number, metres) - unit factors by definition (1 in = 25.4 mm)
ACCEPTED = [
    ("141 3/4", "in", 141.75 * IN),
    ("141-3/4", "in", 141.75 * IN),
    ("141 3/4\"", "mm", 141.75 * IN),
    ("11' 9 3/4\"", "mm", 11 * FT + 9.75 * IN),
    ("11'-9 3/4\"", "mm", 11 * FT + 9.75 * IN),
    ("11 ft 9 in", "mm", 11 * FT + 9 * IN),
    ("1 ft", "mm", FT),
    ("11'", "mm", 11 * FT),
    ("3.6 m", "in", 3.6),
    ("360 cm", "in", 3.6),
    ("360cm", "in", 3.6),
    ("12 mm", "in", 0.012),
    ("12", "mm", 0.012),
    ("12", "in", 12 * IN),
    ("3/4", "in", 0.75 * IN),
    ("-1 1/2 in", "mm", -1.5 * IN),
    ("−250", "mm", -0.25),
    ("2-04-3", "mm", (24 + 4 + 3 / 8) * IN),
    ("0-07-7", "in", (7 + 7 / 8) * IN),
    ("2-04-3+", "mm", (24 + 4 + 3.5 / 8) * IN),
    (" 2.4 M ", "mm", 2.4),
    (".5 m", "mm", 0.5),
]

REFUSED = [
    ("", "nothing typed"),
    ("abc", "cannot read"),
    ("1,5", "comma"),
    ("1e3", "cannot read"),
    ("nan", "cannot read"),
    ("inf", "cannot read"),
    ("2-4", "cannot read"),
    ("2-12-0", "0-11"),
    ("1 5/4", "mixed number"),
    ("1 1/0", "divides by zero"),
    ("3 yd", "unknown unit"),
    ("11' 14\"", "inches after the feet"),
    ("3.6 m 2", "cannot read"),
    ("3.6.2", "cannot read"),
]


@pytest.mark.parametrize("text, unit, metres", ACCEPTED)
def test_accepted_lengths(text, unit, metres):
    assert parse_length(text, unit) == pytest.approx(metres, abs=1e-12)


@pytest.mark.parametrize("text, words", REFUSED)
def test_refused_lengths_say_why(text, words):
    with pytest.raises(LengthError, match=words):
        parse_length(text, "in")


def test_the_range_is_checked_and_said_in_the_fields_units():
    with pytest.raises(LengthError, match=r"hull length: 14134 in is more than the plausible"):
        IMPERIAL.parse_length("14134", 0.3, 30.0, "hull length")
    with pytest.raises(LengthError, match="less than the plausible 300 mm"):
        METRIC.parse_length("10 cm", 0.3, 30.0, "hull length")
    assert METRIC.parse_length("141 3/4 in", 0.3, 30.0) == pytest.approx(141.75 * IN)


def test_every_sixteenth_reads_back_exactly():
    for n in range(-40, 2000, 7):
        metres = n / 16 * IN
        text = IMPERIAL.length_text(metres)
        assert "." not in text
        assert parse_length(text, "mm") == pytest.approx(metres, abs=1e-12)
        assert parse_length(IMPERIAL.length_text(metres, unit=False), "in") == pytest.approx(
            metres, abs=1e-12
        )
        assert parse_length(feet_inches_text(metres), "mm") == pytest.approx(metres, abs=1e-12)


def test_every_eighth_reads_back_from_feet_inches_eighths():
    for n in range(0, 1500, 5):
        metres = n / 8 * IN
        assert parse_length(offset_text(metres), "mm") == pytest.approx(metres, abs=1e-12)


def test_builders_texts():
    assert inches_text(66.9375 * IN) == "66 15/16"
    assert inches_text(66.93 * IN) == "66 15/16"  # nearest sixteenth
    assert IMPERIAL.length_text(0.5 * IN) == "1/2 in"
    assert IMPERIAL.length_text(141.75 * IN, feet=True) == "11' 9 3/4\""
    assert IMPERIAL.offset_text((24 + 4.375) * IN) == "2-04-3"
    assert METRIC.offset_text(0.7207) == "721"
    assert METRIC.length_text(-0.0002) == "0 mm"
    assert IMPERIAL.mass_text(75.0) == "165 lb"
    assert IMPERIAL.length_text(None) == "—"
