"""Display units.  The design is stored in SI; only what is shown is converted.

Two systems: metric (lengths in mm, masses in kg) and imperial (inches, pounds).  Each
quantity kind has a fixed number of decimals so numbers do not jitter while dragging.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["UnitSystem", "METRIC", "IMPERIAL", "SYSTEMS", "system"]

M_PER_IN = 0.0254
KG_PER_LB = 0.45359237


@dataclass(frozen=True)
class UnitSystem:
    """How to show lengths, masses and derived quantities.

    Attributes
    ----------
    name : "metric" or "imperial"
    length, mass, area, volume, moment : unit labels
    """

    name: str
    length: str
    mass: str
    area: str
    volume: str
    length_factor: float  # display units per metre
    mass_factor: float  # display units per kilogram
    length_decimals: int
    mass_decimals: int

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

    def length_text(self, metres: float | None, unit: bool = True) -> str:
        if metres is None or metres != metres:
            return "—"
        text = f"{self.to_length(metres):.{self.length_decimals}f}"
        return f"{text} {self.length}" if unit else text

    def mass_text(self, kg: float | None, unit: bool = True) -> str:
        if kg is None or kg != kg:
            return "—"
        text = f"{self.to_mass(kg):.{self.mass_decimals}f}"
        return f"{text} {self.mass}" if unit else text


METRIC = UnitSystem("metric", "mm", "kg", "m²", "L", 1000.0, 1.0, 0, 1)
IMPERIAL = UnitSystem("imperial", "in", "lb", "ft²", "ft³", 1 / M_PER_IN, 1 / KG_PER_LB, 2, 1)
SYSTEMS = {"metric": METRIC, "imperial": IMPERIAL}


def system(name: str) -> UnitSystem:
    """The unit system called ``name`` ("metric" or "imperial")."""
    try:
        return SYSTEMS[name]
    except KeyError:
        raise ValueError(f"unknown unit system {name!r}") from None
