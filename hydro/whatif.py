"""What if: the readout under heavier crew, soaked materials and bilge water, and the
reserve buoyancy and swamped state of the hull.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

from hydro.design import Design, analyse_stations, check_context
from hydro.loads import Material
from hydro.stability import Analysis, Status
from hydro.wording import swamp_text, whatif_case

__all__ = ["MATERIAL_SWAMPED_DENSITY", "SensitivityRow", "SwampResult", "sensitivity", "swamping"]

#: Effective density of shell materials once waterlogged (kg/m^3), for the swamped
#: check.  All from memory / common practice: soaked corrugated board and tape sink,
#: plywood and epoxy-sheathed plywood float slightly.
MATERIAL_SWAMPED_DENSITY: dict[str, float] = {
    "corrugated": 1100.0,
    "tape": 1150.0,
    "paint": 1400.0,
    "plywood": 600.0,
    "glass": 1800.0,
    "foam": 40.0,
}


@dataclass(frozen=True)
class SensitivityRow:
    """The readout under one variation of the load.

    ``kind`` is "as designed", "soaked", "heavier crew", "bilge water" or "all three";
    ``amount`` its size (the wet factor, the heaviest what-if crew mass in kg, or the
    bilge depth in m); :func:`hydro.wording.whatif_case` names the row in any units.
    """

    kind: str
    amount: float | None
    displacement: float | None
    gm: float | None
    min_freeboard: float | None
    gunwale_immersion_deg: float | None
    status: Status
    list_deg: float | None

    @property
    def case(self) -> str:
        """The row's name, metric."""
        return whatif_case(self)


def sensitivity(
    design: Design,
    wet_factor: float | None = None,
    heavy_crew: float | None = None,
    bilge_depth: float | None = None,
) -> tuple[SensitivityRow, ...]:
    """GM, least freeboard, gunwale-immersion angle, list and status as built, soaked,
    with heavier crew, with bilge water, and all three together.

    The cases come from ``design.checks`` (the wet factor, each crew member's what-if
    mass - by default at least 84 kg, 46 CFR 170.090 - and the bilge depth) unless given
    here; ``heavy_crew`` raises every crew member to at least that mass.
    """
    loads, cs = design.loads, design.checks
    wet = cs.whatif_wet_factor if wet_factor is None else wet_factor
    bilge = cs.whatif_bilge_m if bilge_depth is None else bilge_depth
    masses = (
        cs.heavier_crew_kg(tuple(c.mass for c in loads.crew)) if heavy_crew is None
        else tuple(max(c.mass, heavy_crew) for c in loads.crew)
    )
    heavier = tuple(replace(c, mass=m) for c, m in zip(loads.crew, masses))
    cases = [
        ("as designed", None, loads),
        ("soaked", wet, replace(loads, wet_factor=loads.wet_factor * wet)),
        ("heavier crew", max(masses, default=0.0), replace(loads, crew=heavier)),
        ("bilge water", bilge, replace(loads, bilge_water_depth=loads.bilge_water_depth + bilge)),
        ("all three", None, replace(loads, wet_factor=loads.wet_factor * wet, crew=heavier,
                                    bilge_water_depth=loads.bilge_water_depth + bilge)),
    ]
    stations, table, rho = check_context(design)
    rows = []
    for kind, amount, ld in cases:
        a = analyse_stations(stations, ld, rho, design.settings, table)
        h, c = a.hydrostatics, a.curve
        rows.append(SensitivityRow(
            kind, amount, a.weights.mass,
            h.gm if h else None,
            h.min_freeboard if h else None,
            c.gunwale_immersion_deg if c else None,
            a.status,
            a.list_deg,
        ))
    return tuple(rows)


@dataclass(frozen=True)
class SwampResult:
    """Reserve buoyancy and what happens when the hull fills.

    Attributes
    ----------
    reserve_volume : hull volume between the waterline and the gunwale (m^3) (for a
        decked hull the deck is at the sheer, so this is also the reserve to the deck)
    reserve_mass : rho x reserve volume (kg): how much more it could carry level
    reserve_fraction : reserve / whole hull volume
    swamped_net_buoyancy : buoyancy of the structure minus its weight when full of
        water (kg, > 0 floats); crew are taken as neutrally buoyant swimmers
    floats_swamped : bool, or None when the hull is closed (it cannot fill)
    message : plain words, pointing to life jackets
    """

    reserve_volume: float
    reserve_mass: float
    reserve_fraction: float
    swamped_net_buoyancy: float
    floats_swamped: bool | None

    @property
    def message(self) -> str:
        """Plain words, metric (see :func:`hydro.wording.swamp_text`)."""
        return swamp_text(self)


def _swamped_density(m: Material) -> float | None:
    name = m.name.lower()
    for key, rho in MATERIAL_SWAMPED_DENSITY.items():
        if key in name:
            return rho
    return None


def swamping(design: Design, analysis: Analysis | None = None) -> SwampResult:
    """Reserve buoyancy to the gunwale, and whether the open hull floats when full.

    Materials whose name says what they are (corrugated board, tape, paint, plywood,
    glass, foam) take a waterlogged density from ``MATERIAL_SWAMPED_DENSITY``; others
    and all items count as giving no buoyancy (the safe side).
    """
    stations, table, rho = check_context(design)
    analysis = analysis or analyse_stations(stations, design.loads, rho, design.settings, table)
    total = float(table.totals[0] @ table.weights)
    h = analysis.hydrostatics
    reserve = max(total - h.volume, 0.0) if h is not None else 0.0
    net = 0.0
    for line in analysis.weights.lines:
        if line.kind == "material":
            mat = next((m for m in design.loads.materials if m.name == line.name), None)
            dens = _swamped_density(mat) if mat else None
            net += line.mass * (rho / dens - 1.0) if dens else -line.mass
        elif line.kind == "item":
            net -= line.mass
    floats = None if not design.settings.open_boat else net > 0  # a closed hull cannot fill
    return SwampResult(reserve, rho * reserve, reserve / total if total else 0.0, net, floats)
