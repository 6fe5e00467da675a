"""What to buy: sheets per material and layer, tape, paint, glue, and the cost.

Seam length comes from the real geometry (chines, keel, stems, transom edges); tape
covers each seam once per layer inside and once per layer outside; paint covers the
outside of the hull (and the inside if asked) at the coverage the user sets.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from hydro.panels import PanelError

__all__ = ["ShoppingSettings", "MaterialsList", "materials_list"]


@dataclass(frozen=True)
class ShoppingSettings:
    """Allowances and prices for the materials list.

    Attributes
    ----------
    tape_layers_inside, tape_layers_outside : layers of tape over every seam
    tape_roll_m : length of one roll (m; 55 m = 60 yd, a common roll: common practice)
    paint_coverage_m2_per_l : what one litre covers, one coat (about 10 m2/l for latex
        house paint: from memory; read the tin)
    paint_coats : coats
    paint_inside : paint the inside too
    sheet_price, tape_roll_price, paint_price_per_l : unit prices (None: not given)
    """

    tape_layers_inside: int = 1
    tape_layers_outside: int = 1
    tape_roll_m: float = 55.0
    paint_coverage_m2_per_l: float = 10.0
    paint_coats: float = 2.0
    paint_inside: bool = False
    sheet_price: float | None = None
    tape_roll_price: float | None = None
    paint_price_per_l: float | None = None

    def validate(self) -> None:
        """Raise :class:`PanelError` for a non-positive allowance."""
        if self.tape_layers_inside < 0 or self.tape_layers_outside < 0:
            raise PanelError("tape layers cannot be negative")
        for value, what in (
            (self.tape_roll_m, "the tape roll length"),
            (self.paint_coverage_m2_per_l, "the paint coverage"),
        ):
            if not (isinstance(value, (int, float)) and math.isfinite(value) and value > 0):
                raise PanelError(f"{what} must be a positive number")
        if not (math.isfinite(self.paint_coats) and self.paint_coats >= 0):
            raise PanelError("paint coats cannot be negative")
        for price in (self.sheet_price, self.tape_roll_price, self.paint_price_per_l):
            if price is not None and not (math.isfinite(price) and price >= 0):
                raise PanelError("a unit price must be a number of at least 0")


@dataclass(frozen=True)
class MaterialsList:
    """The shopping list.

    Attributes
    ----------
    sheets_by_material : sheets of each sheet material (all its layers)
    seam_m : length of all seams (m)
    tape_m, tape_rolls : tape over the seams, inside and outside
    paint_area_m2, paint_l : area painted (one coat) and litres for all coats
    fillet_m : glue fillet or glue line along the inside of the seams (m)
    cost : total of the given unit prices (None if no price was given)
    """

    sheets_by_material: dict[str, int]
    seam_m: float
    tape_m: float
    tape_rolls: int
    paint_area_m2: float
    paint_l: float
    fillet_m: float
    cost: float | None = None
    cost_lines: tuple[tuple[str, float], ...] = field(default=())


def materials_list(
    sheets_by_material: dict[str, int],
    seam_m: float,
    outside_area_m2: float,
    settings: ShoppingSettings = ShoppingSettings(),
) -> MaterialsList:
    """Tape, paint and glue from the seam length and hull area, and the cost.

    Examples
    --------
    >>> m = materials_list({"ply": 3}, 10.0, 5.0, ShoppingSettings(sheet_price=40.0))
    >>> m.tape_m, m.tape_rolls, m.paint_l, m.cost
    (20.0, 1, 1.0, 120.0)
    """
    settings.validate()
    tape_m = seam_m * (settings.tape_layers_inside + settings.tape_layers_outside)
    rolls = int(math.ceil(tape_m / settings.tape_roll_m - 1e-9)) if tape_m > 0 else 0
    area = outside_area_m2 * (2.0 if settings.paint_inside else 1.0)
    litres = area * settings.paint_coats / settings.paint_coverage_m2_per_l
    lines = []
    if settings.sheet_price is not None:
        lines.append(("sheets", settings.sheet_price * sum(sheets_by_material.values())))
    if settings.tape_roll_price is not None:
        lines.append(("tape", settings.tape_roll_price * rolls))
    if settings.paint_price_per_l is not None:
        lines.append(("paint", settings.paint_price_per_l * litres))
    cost = sum(v for _, v in lines) if lines else None
    return MaterialsList(
        dict(sheets_by_material), seam_m, tape_m, rolls, area, litres, seam_m, cost, tuple(lines)
    )
