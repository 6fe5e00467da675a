"""A design: hull, loads, water and analysis settings, and the one call that analyses it."""

from __future__ import annotations

from dataclasses import dataclass, field, replace

import numpy as np

from hydro.errors import HullwrightError, ShapeError
from hydro.limits import check_work
from hydro.hull import HullSketch, Stations, generate_stations
from hydro.loads import (
    CREW_MASS_KG,
    HEAVY_CREW_MASS_KG,
    WATER_PRESETS,
    Loads,
    shell_panels,
    water_density,
    weight_build_up,
)
from hydro.sections import SectionTable, build_section_table
from hydro.stability import Analysis, analyse_table

__all__ = [
    "AnalysisSettings",
    "CheckSettings",
    "Design",
    "TARGET_GM_M",
    "analyse",
    "analyse_stations",
    "check_context",
]

#: Default target GM for the beam aid: IMO 2008 IS Code Part A 2.2.4, GM0 >= 0.15 m (a
#: ship criterion, used here as a plain benchmark; numbering from memory).
TARGET_GM_M = 0.15


@dataclass(frozen=True)
class AnalysisSettings:
    """How the righting-arm curve is computed.

    Attributes
    ----------
    heel_step_deg : step between heel angles (0.1 to 15)
    heel_max_deg : last heel angle (5 to 180)
    free_trim : let the boat trim freely at every heel (else trim stays as upright)
    open_boat : an open boat floods when the gunwale goes under, so its curve ends
        there; a closed (decked, sealed) hull keeps its curve beyond
    """

    heel_step_deg: float = 1.0
    heel_max_deg: float = 90.0
    free_trim: bool = True
    open_boat: bool = True

    def heel_angles(self) -> np.ndarray:
        """(A,) heel angles in degrees, 0 to heel_max_deg inclusive."""
        if not 0.1 <= self.heel_step_deg <= 15.0:
            raise HullwrightError("the heel step must be between 0.1 and 15 degrees")
        if not 5.0 <= self.heel_max_deg <= 180.0:
            raise HullwrightError("the largest heel must be between 5 and 180 degrees")
        n = int(round(self.heel_max_deg / self.heel_step_deg))
        angles = np.arange(n + 1) * self.heel_step_deg
        if angles[-1] < self.heel_max_deg - 1e-9:
            angles = np.append(angles, self.heel_max_deg)
        return np.minimum(angles, self.heel_max_deg)


@dataclass(frozen=True)
class CheckSettings:
    """The builder's check choices, saved with the design so that the app, the command
    line and the plate all show the same cases.

    Attributes
    ----------
    shift_crew : indices into the crew list of those who move across (None: everyone)
    shift_distance_m : how far each moves sideways (None: to the hull side at seat height)
    shift_to_gunwale : each sits on the gunwale instead (overrides the distance)
    boarding_mass_kg : the person climbing in over the gunwale
    target_gm_m : the GM the beam aid aims for
    whatif_crew_kg : per crew member, the mass used by the what-if "heavier crew" case
        (None: each at least HEAVY_CREW_MASS_KG); lets a children's crew stay light
    whatif_wet_factor : multiplier on material mass for the what-if "soaked" case
    whatif_bilge_m : extra bilge water depth for the what-if "bilge water" case
    """

    shift_crew: tuple[int, ...] | None = None
    shift_distance_m: float | None = None
    shift_to_gunwale: bool = False
    boarding_mass_kg: float = CREW_MASS_KG
    target_gm_m: float = TARGET_GM_M
    whatif_crew_kg: tuple[float, ...] | None = None
    whatif_wet_factor: float = 1.5
    whatif_bilge_m: float = 0.03

    def heavier_crew_kg(self, crew_masses: tuple[float, ...]) -> tuple[float, ...]:
        """The what-if crew masses for a crew of the given masses."""
        if self.whatif_crew_kg is not None and len(self.whatif_crew_kg) == len(crew_masses):
            return self.whatif_crew_kg
        return tuple(max(m, HEAVY_CREW_MASS_KG) for m in crew_masses)


@dataclass(frozen=True)
class Design:
    """Everything a design file holds.

    Attributes
    ----------
    name, notes : free text
    hull : a sketch (curves a builder drags) or a fixed table of offsets
    loads : crew, items, materials, bilge water
    water : preset name ("fresh", "sea") or a density in kg/m^3
    settings : how the GZ curve is computed
    checks : the builder's check choices (who leans and how far, boarding mass, ...)
    """

    name: str
    hull: HullSketch | Stations
    loads: Loads = field(default_factory=Loads)
    water: str | float = "fresh"
    notes: str = ""
    settings: AnalysisSettings = field(default_factory=AnalysisSettings)
    checks: CheckSettings = field(default_factory=CheckSettings)

    @property
    def water_density(self) -> float:
        """Water density in kg/m^3 (raises LoadError for a bad value)."""
        return water_density(self.water)

    @property
    def water_label(self) -> str:
        if isinstance(self.water, str) and self.water.lower() in WATER_PRESETS:
            return f"{self.water.lower()} water, {WATER_PRESETS[self.water.lower()]:g} kg/m3"
        return f"water {self.water_density:g} kg/m3"

    def stations(self) -> Stations:
        """The table of offsets the engine works on (raises ShapeError)."""
        if isinstance(self.hull, Stations):
            return self.hull
        if isinstance(self.hull, HullSketch):
            return generate_stations(self.hull)
        raise ShapeError("the design has no hull")


def analyse_stations(
    stations: Stations,
    loads: Loads,
    rho: float,
    settings: AnalysisSettings = AnalysisSettings(),
    table: SectionTable | None = None,
    start: Analysis | None = None,
) -> Analysis:
    """Weight build-up, upright hydrostatics and the GZ curve for a table of offsets.

    ``start``: an analysis of a nearby design (the previous frame of a drag), whose
    floating positions start the solver: the same figures in fewer steps.

    Examples
    --------
    A 4 m x 1 m box barge carrying 400 kg floats at T = 0.1 m with BM = B^2/(12 T):

    >>> from hydro.analytic import box
    >>> from hydro.loads import MassItem
    >>> load = Loads(items=(MassItem("load", 400.0, 2.0, 0.0, 0.2),))
    >>> a = analyse_stations(box(4.0, 1.0, 0.5), load, 1000.0)
    >>> round(float(a.hydrostatics.draft_mid), 6), round(a.hydrostatics.bm, 6), str(a.status)
    (0.1, 0.833333, 'ok')
    """
    angles = settings.heel_angles()
    check_work(
        int(stations.x.size), 2 * _most_points(stations) - 1, int(angles.size)
    )
    table = table or build_section_table(stations)
    panels = shell_panels(stations) if loads.materials else None
    weights = weight_build_up(loads, stations, rho, panels)
    return analyse_table(
        table, weights, rho, angles, settings.free_trim, settings.open_boat, start
    )


def _most_points(stations: Stations) -> int:
    """The largest number of points in a half section."""
    if stations.stack is not None:
        return int(stations.stack.shape[1])
    return max(len(h) for h in stations.half_sections)


def analyse(
    design: Design, start: Analysis | None = None, heel_step_deg: float | None = None
) -> Analysis:
    """Analyse a design (``start``: an analysis of a nearby design, see analyse_stations).

    ``heel_step_deg``: solve the curve at this step instead of the design's own when it
    is coarser (during a drag).  Every figure is the same to well within 0.01 degree
    and 0.01 mm, as the list, the largest arm, the vanishing and gunwale angles are
    refined on the exact solver whatever the step; only the drawn curve has fewer
    points, and the areas under it (trapezoid rule) follow the step.

    Raises
    ------
    HullwrightError
        For an impossible hull or load (message names the problem).  A load the hull
        cannot carry is not an error: it is reported in ``Analysis.status``.
    """
    settings = design.settings
    if heel_step_deg is not None and heel_step_deg > settings.heel_step_deg:
        settings = replace(settings, heel_step_deg=heel_step_deg)
    return analyse_stations(
        design.stations(), design.loads, design.water_density, settings, start=start
    )


def check_context(design: Design) -> tuple[Stations, SectionTable, float]:
    """The design's stations, their section table and the water density (kg/m^3)."""
    stations = design.stations()
    return stations, build_section_table(stations), design.water_density
