"""Hullwright's hydrostatics and stability engine: pure numpy, no Qt.

Typical use::

    from hydro import load_design, analyse
    result = analyse(load_design("sample_hulls/heron-punt.json"))
    print(result.hydrostatics.gm, result.curve.gunwale_immersion_deg)
"""

from hydro.design import AnalysisSettings, CheckSettings, Design, analyse, analyse_stations
from hydro.errors import DesignFileError, HullwrightError, LoadError, ShapeError
from hydro.hull import Curve, HullSketch, SectionShape, Stations, generate_stations, scale_breadth
from hydro.io import (
    design_from_dict,
    design_to_dict,
    load_design,
    read_offsets,
    report_dict,
    save_design,
    write_offsets,
)
from hydro.loads import (
    CREW_MASS_KG,
    HEAVY_CREW_MASS_KG,
    MATERIAL_PRESETS,
    MATERIAL_THICKNESS_M,
    SEATED_CG_ABOVE_SEAT_M,
    WATER_PRESETS,
    CrewMember,
    Loads,
    MassItem,
    Material,
    WeightSummary,
    weight_build_up,
)
from hydro.stability import G_STANDARD, Analysis, Hydrostatics, StabilityCurve

__all__ = [
    "AnalysisSettings",
    "Analysis",
    "CheckSettings",
    "CREW_MASS_KG",
    "CrewMember",
    "Curve",
    "Design",
    "DesignFileError",
    "G_STANDARD",
    "HEAVY_CREW_MASS_KG",
    "HullSketch",
    "HullwrightError",
    "Hydrostatics",
    "LoadError",
    "Loads",
    "MATERIAL_PRESETS",
    "MATERIAL_THICKNESS_M",
    "MassItem",
    "Material",
    "SEATED_CG_ABOVE_SEAT_M",
    "SectionShape",
    "ShapeError",
    "StabilityCurve",
    "Stations",
    "WATER_PRESETS",
    "WeightSummary",
    "analyse",
    "analyse_stations",
    "design_from_dict",
    "design_to_dict",
    "generate_stations",
    "load_design",
    "read_offsets",
    "report_dict",
    "save_design",
    "scale_breadth",
    "weight_build_up",
    "write_offsets",
]
