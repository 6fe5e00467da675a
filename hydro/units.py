"""Builder's units: one formatter and one strict parser for every length shown or typed.

The design is stored in SI; only what is shown is converted.  Two systems:

- metric: lengths in whole millimetres, masses in kg to 0.1;
- imperial: lengths in inches to the nearest 1/16 (``66 15/16"``), offsets in
  feet-inches-eighths (``2-04-3`` is 2 ft 4 3/8 in, the usual form of a table of
  offsets), masses in whole pounds.

Every quantity kind has a fixed precision so numbers do not jitter while dragging.

:func:`parse_length` reads what a builder types: a number in the field's unit, a number
with a unit (``3.6 m``, ``360 cm``, ``141.75 in``), fractions (``141 3/4``), feet and
inches (``11' 9 3/4"``, ``1 ft``) and feet-inches-eighths (``2-04-3``).  Anything else is
refused with a message that says why; nothing is guessed.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from fractions import Fraction

from hydro.errors import HullwrightError

__all__ = [
    "UnitSystem",
    "METRIC",
    "IMPERIAL",
    "SYSTEMS",
    "system",
    "LengthError",
    "parse_length",
    "inches_text",
    "feet_inches_text",
    "offset_text",
]

M_PER_IN = 0.0254
M_PER_FT = 0.3048
KG_PER_LB = 0.45359237
#: Imperial lengths are shown to the nearest 1/16 inch.
INCH_DENOMINATOR = 16


class LengthError(HullwrightError):
    """A typed length that cannot be read, or lies outside the field's plausible range."""


def _fraction_text(n16: int, denominator: int) -> str:
    """Whole and fraction of ``n16`` / ``denominator`` in lowest terms ("66 15/16")."""
    whole, rest = divmod(n16, denominator)
    if rest == 0:
        return str(whole)
    f = Fraction(rest, denominator)
    return f"{whole} {f.numerator}/{f.denominator}" if whole else f"{f.numerator}/{f.denominator}"


def inches_text(metres: float, denominator: int = INCH_DENOMINATOR) -> str:
    """A length in inches and fractions, rounded to 1/``denominator`` inch, no unit.

    >>> inches_text(1.7018)
    '67'
    >>> inches_text(0.0254 * 66.9375), inches_text(-0.0254 * 1.5), inches_text(0.0001)
    ('66 15/16', '-1 1/2', '0')
    """
    n = round(abs(metres) / M_PER_IN * denominator)
    text = _fraction_text(n, denominator)
    return f"-{text}" if metres < 0 and n else text


def feet_inches_text(metres: float, denominator: int = INCH_DENOMINATOR) -> str:
    """A length in feet and inches to 1/``denominator`` inch: ``11' 9 3/4"``.

    >>> feet_inches_text(0.0254 * 141.75), feet_inches_text(0.3048 * 2), feet_inches_text(0.2)
    ('11\\' 9 3/4"', '2\\' 0"', '7 7/8"')
    """
    n = round(abs(metres) / M_PER_IN * denominator)
    feet, rest = divmod(n, 12 * denominator)
    sign = "-" if metres < 0 and n else ""
    if feet == 0:
        return f'{sign}{_fraction_text(rest, denominator)}"'
    return f"{sign}{feet}' {_fraction_text(rest, denominator)}\""


def offset_text(metres: float) -> str:
    """Feet-inches-eighths as written in a table of offsets: 2-04-3 = 2 ft 4 3/8 in.

    >>> offset_text(0.0254 * (24 + 4.375)), offset_text(0.0254 * 7.9), offset_text(-0.0254)
    ('2-04-3', '0-07-7', '-0-01-0')
    """
    n = round(abs(metres) / M_PER_IN * 8)
    feet, rest = divmod(n, 96)
    inches, eighths = divmod(rest, 8)
    sign = "-" if metres < 0 and n else ""
    return f"{sign}{feet}-{inches:02d}-{eighths}"


@dataclass(frozen=True)
class UnitSystem:
    """How to show lengths, masses and derived quantities.

    Attributes
    ----------
    name : "metric" or "imperial"
    length, mass, area, volume : unit labels
    length_factor : display units per metre
    mass_factor : display units per kilogram
    length_decimals : decimals of a decimal length (metric); imperial uses fractions
    mass_decimals : decimals of a mass
    """

    name: str
    length: str
    mass: str
    area: str
    volume: str
    length_factor: float
    mass_factor: float
    length_decimals: int
    mass_decimals: int
    areal: str = "kg/m²"
    areal_factor: float = 1.0  # display units of mass per area per kg/m²
    areal_decimals: int = 3
    density: str = "kg/m³"
    density_factor: float = 1.0  # display units of density per kg/m³

    @property
    def imperial(self) -> bool:
        return self.name == "imperial"

    @property
    def nudge_m(self) -> float:
        """The smallest step a builder marks: 1 mm or 1/16 inch (m)."""
        return M_PER_IN / INCH_DENOMINATOR if self.imperial else 0.001

    def to_length(self, metres: float) -> float:
        return metres * self.length_factor

    def from_length(self, value: float) -> float:
        return value / self.length_factor

    def to_mass(self, kg: float) -> float:
        return kg * self.mass_factor

    def from_mass(self, value: float) -> float:
        return value / self.mass_factor

    def to_area(self, m2: float) -> float:
        return m2 * (1.0 if self.name == "metric" else 1 / 0.09290304)

    def to_volume(self, m3: float) -> float:
        return m3 * (1000.0 if self.name == "metric" else 1 / 0.028316846592)

    def length_text(self, metres: float | None, unit: bool = True, feet: bool = False) -> str:
        """A length as a builder reads it: ``1234 mm`` or ``66 15/16 in``.

        ``unit=False`` leaves the unit off (the text still reads back through
        :func:`parse_length` in this system); ``feet=True`` writes imperial lengths in
        feet and inches (``11' 9 3/4"``).  None or NaN gives a dash.
        """
        if metres is None or metres != metres:
            return "—"
        if self.imperial:
            if feet:
                return feet_inches_text(metres)
            text = inches_text(metres)
        else:
            text = f"{self.to_length(metres):.{self.length_decimals}f}"
            if text.startswith("-") and not text.strip("-0."):
                text = text[1:]  # no "-0 mm"
        return f"{text} {self.length}" if unit else text

    def offset_text(self, metres: float) -> str:
        """An offset for the table of offsets: whole mm, or feet-inches-eighths."""
        return offset_text(metres) if self.imperial else f"{metres * 1000:.0f}"

    @property
    def offset_unit(self) -> str:
        """How :meth:`offset_text` is written, for a column heading."""
        return "ft-in-eighths" if self.imperial else "mm"

    def mass_text(self, kg: float | None, unit: bool = True) -> str:
        if kg is None or kg != kg:
            return "—"
        text = f"{self.to_mass(kg):.{self.mass_decimals}f}"
        return f"{text} {self.mass}" if unit else text

    def areal_text(self, kg_per_m2: float, unit: bool = True) -> str:
        """Mass per area: kg/m² in metric, oz/yd² (the cloth weight) in imperial."""
        text = f"{kg_per_m2 * self.areal_factor:.{self.areal_decimals}f}"
        return f"{text} {self.areal}" if unit else text

    def parse_length(
        self, text: str, low: float = -math.inf, high: float = math.inf, what: str = "length"
    ) -> float:
        """Read a typed length (see :func:`parse_length`); plain numbers are in this system."""
        return parse_length(text, self.length, low, high, what, self)


METRIC = UnitSystem("metric", "mm", "kg", "m²", "L", 1000.0, 1.0, 0, 1)
#: lb/ft³ per kg/m³
LB_FT3_PER_KG_M3 = 0.028316846592 / KG_PER_LB
#: oz/yd² per kg/m²
OZ_YD2_PER_KG_M2 = 0.83612736 / 0.028349523125
IMPERIAL = UnitSystem(
    "imperial", "in", "lb", "ft²", "ft³", 1 / M_PER_IN, 1 / KG_PER_LB, 2, 0,
    "oz/yd²", OZ_YD2_PER_KG_M2, 0, "lb/ft³", LB_FT3_PER_KG_M3,
)
SYSTEMS = {"metric": METRIC, "imperial": IMPERIAL}


def system(name: str) -> UnitSystem:
    """The unit system called ``name`` ("metric" or "imperial")."""
    try:
        return SYSTEMS[name]
    except KeyError:
        raise ValueError(f"unknown unit system {name!r}") from None


# ---------------------------------------------------------------------------- parsing

#: Metres per unit, by every spelling the parser accepts (lower case).
_UNITS = {
    "mm": 0.001, "millimetre": 0.001, "millimetres": 0.001, "millimeter": 0.001,
    "millimeters": 0.001,
    "cm": 0.01, "centimetre": 0.01, "centimetres": 0.01, "centimeter": 0.01,
    "centimeters": 0.01,
    "m": 1.0, "metre": 1.0, "metres": 1.0, "meter": 1.0, "meters": 1.0,
    "in": M_PER_IN, "inch": M_PER_IN, "inches": M_PER_IN, '"': M_PER_IN, "″": M_PER_IN,
    "ft": M_PER_FT, "foot": M_PER_FT, "feet": M_PER_FT, "'": M_PER_FT, "′": M_PER_FT,
}
_NUMBER = r"(?:\d+(?:\.\d*)?|\.\d+)"
#: A number, a mixed number (141 3/4, 141-3/4) or a plain fraction (3/4).
_AMOUNT = (
    rf"(?:(?P<{{w}}>{_NUMBER})(?:(?:\s+|-)(?P<{{n}}>\d+)/(?P<{{d}}>\d+))?"
    rf"|(?P<{{n2}}>\d+)/(?P<{{d2}}>\d+))"
)
_UNIT = r"(?P<{u}>[a-z]+|\"|″|'|′)"


def _amount(tag: str) -> str:
    return _AMOUNT.format(w=f"w{tag}", n=f"n{tag}", d=f"d{tag}", n2=f"m{tag}", d2=f"e{tag}")


_SIMPLE = re.compile(rf"^{_amount('a')}\s*(?:{_UNIT.format(u='ua')})?$")
_FEET_INCHES = re.compile(
    rf"^{_amount('a')}\s*(?P<ft>ft|foot|feet|'|′)\s*-?\s*{_amount('b')}"
    rf"\s*(?P<inch>in|inch|inches|\"|″)?$"
)
_FIE = re.compile(r"^(?P<f>\d+)-(?P<i>\d{1,2})-(?P<e>[0-7])(?P<plus>\+?)$")


def _value(m: re.Match[str], tag: str, what: str, text: str) -> float:
    """The number matched by :func:`_amount` ``tag``, fractions checked."""
    whole, num, den = m.group(f"w{tag}"), m.group(f"n{tag}"), m.group(f"d{tag}")
    if whole is None:
        num, den = m.group(f"m{tag}"), m.group(f"e{tag}")
    value = float(whole) if whole is not None else 0.0
    if num is not None:
        n, d = int(num), int(den)
        if d == 0:
            raise LengthError(f"{what}: '{text}' divides by zero")
        if whole is not None and (n >= d or "." in whole):
            raise LengthError(
                f"{what}: '{text}' is not a usual mixed number (write e.g. 141 3/4)"
            )
        value += n / d
    return value


def parse_length(
    text: str,
    default_unit: str = "mm",
    low: float = -math.inf,
    high: float = math.inf,
    what: str = "length",
    shown_in: UnitSystem | None = None,
) -> float:
    """Read a typed length and return metres.

    Accepted: a plain number in ``default_unit`` ("mm", "cm", "m", "in" or "ft"), a number
    with a unit (``3.6 m``, ``360 cm``, ``12 mm``, ``141.75 in``, ``1 ft``), fractions
    (``141 3/4``, ``141-3/4``, ``3/4"``), feet and inches (``11' 9 3/4"``,
    ``11 ft 9 in``) and feet-inches-eighths (``2-04-3``, with ``+`` for a sixteenth
    more).  A leading minus is allowed except in feet-inches-eighths.

    Parameters
    ----------
    text : what was typed
    default_unit : the unit of a plain number (the field's current unit)
    low, high : the plausible range (m); a value outside is refused
    what : the field's name, for the message
    shown_in : the unit system the range is said in (default: the default unit's)

    Raises
    ------
    LengthError
        If the text is not one of the forms above, or the value is out of range.

    Examples
    --------
    >>> round(parse_length("141 3/4", "in") / 0.0254, 6)
    141.75
    >>> parse_length("2-04-3", "mm") == 0.0254 * (24 + 4.375)
    True
    >>> parse_length("3.6 m"), parse_length("360 cm"), parse_length("12")
    (3.6, 3.6, 0.012)
    """
    if default_unit not in _UNITS:
        raise ValueError(f"unknown unit {default_unit!r}")
    raw = text
    s = text.strip().replace("−", "-").replace("’", "'").replace("”", '"')
    s = re.sub(r"\s+", " ", s)
    if not s:
        raise LengthError(f"{what}: nothing typed")
    if re.search(r"\d,\d", s):
        raise LengthError(f"{what}: '{raw}' has a comma; use a point for decimals (3.6 m)")
    metres = round(_read(s.lower(), default_unit, what, raw), 12)  # no 1.0287000000000002
    if not math.isfinite(metres):
        raise LengthError(f"{what}: '{raw}' is not a finite length")
    units = shown_in or (IMPERIAL if default_unit in ("in", "ft") else METRIC)
    if metres > high:
        raise LengthError(
            f"{what}: {units.length_text(metres)} is more than the plausible "
            f"{units.length_text(high)}"
        )
    if metres < low:
        raise LengthError(
            f"{what}: {units.length_text(metres)} is less than the plausible "
            f"{units.length_text(low)}"
        )
    return metres


def _read(s: str, default_unit: str, what: str, raw: str) -> float:
    sign = 1.0
    m = _FIE.match(s)
    if m:
        whole_inches = int(m["i"])
        if whole_inches >= 12:
            raise LengthError(
                f"{what}: '{raw}' has {whole_inches} inches; feet-inches-eighths need 0-11"
            )
        eighths = int(m["e"]) + (0.5 if m["plus"] else 0.0)
        return (int(m["f"]) * 12 + whole_inches + eighths / 8) * M_PER_IN
    if s.startswith("-"):
        sign, s = -1.0, s[1:].lstrip()
    elif s.startswith("+"):
        s = s[1:].lstrip()
    m = _FEET_INCHES.match(s)
    if m:
        feet = _value(m, "a", what, raw)
        inches = _value(m, "b", what, raw)
        if inches >= 12:
            raise LengthError(f"{what}: '{raw}' has {inches:g} inches after the feet (0 to 12)")
        return sign * (feet * M_PER_FT + inches * M_PER_IN)
    m = _SIMPLE.match(s)
    if not m:
        raise LengthError(
            f"{what}: cannot read '{raw}' as a length (e.g. 3.6 m, 360 cm, 141 3/4 in, "
            "11' 9 3/4\", 2-04-3)"
        )
    unit = m["ua"] or default_unit
    if unit not in _UNITS:
        raise LengthError(f"{what}: '{raw}': unknown unit '{unit}' (mm, cm, m, in, ft)")
    return sign * _value(m, "a", what, raw) * _UNITS[unit]
