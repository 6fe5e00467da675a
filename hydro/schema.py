"""The design file's schema: every key, its type, its range and its default, in one place.

The models are pydantic v2 models in strict mode: numbers must be JSON numbers (never
true/false or text), finite and inside their range; text must be text; lists have a
largest size (:mod:`hydro.limits`); a key the schema does not know is an error.
:func:`validate_design_data` turns the first problem into one plain sentence that names
the key, e.g. ``loads.crew[0]: unknown key 'mas_kg' (did you mean 'mass_kg'?)``.

To add a key to the design file: add one field to the model below (with its range),
write it in :func:`hydro.io.design_to_dict` and use it in :func:`hydro.io.design_from_dict`.
"""

from __future__ import annotations

import difflib
import types
import typing
from typing import Annotated, Any, Literal

from pydantic import (
    AfterValidator,
    BaseModel,
    ConfigDict,
    Field,
    StringConstraints,
    ValidationError,
    model_validator,
)

from hydro import limits as L
from hydro.errors import DesignFileError

__all__ = ["DesignModel", "validate_design_data", "known_keys"]


def _no_lone_surrogates(text: str) -> str:
    try:
        text.encode("utf-8")
    except UnicodeEncodeError:
        raise ValueError("contains a broken character (a lone UTF-16 surrogate)") from None
    return text


Name = Annotated[
    str, StringConstraints(max_length=L.MAX_NAME_CHARS), AfterValidator(_no_lone_surrogates)
]
Notes = Annotated[
    str, StringConstraints(max_length=L.MAX_NOTES_CHARS), AfterValidator(_no_lone_surrogates)
]
Coordinate = Annotated[float, Field(ge=-L.MAX_COORDINATE_M, le=L.MAX_COORDINATE_M)]
#: Section shape coordinates (u, v) as fractions of half-breadth and depth (tumblehome
#: sections bulge past u = 1).
Fraction = Annotated[float, Field(ge=-1e-9, le=4.0)]
PersonKg = Annotated[float, Field(ge=0.0, le=L.MAX_CREW_KG)]
Pair = Annotated[list[Coordinate], Field(min_length=2, max_length=2)]
UnitPair = Annotated[list[Fraction], Field(min_length=2, max_length=2)]
Surface = Literal["bottom", "sides", "ends"]


class _Model(BaseModel):
    model_config = ConfigDict(
        extra="forbid", strict=True, allow_inf_nan=False, frozen=True, hide_input_in_errors=True
    )


class CurveModel(_Model):
    points_m: Annotated[list[Pair], Field(min_length=2, max_length=L.MAX_CURVE_POINTS)]
    smooth: bool = True


class SectionShapeModel(_Model):
    x_m: float = Field(ge=-L.MAX_COORDINATE_M, le=L.MAX_COORDINATE_M)
    points_uv: Annotated[list[UnitPair], Field(min_length=2, max_length=L.MAX_SHAPE_POINTS)]
    smooth: bool = False


class SketchModel(_Model):
    plan_half_breadth: CurveModel
    keel: CurveModel
    sheer: CurveModel
    sections: Annotated[
        list[SectionShapeModel], Field(min_length=1, max_length=L.MAX_SECTION_SHAPES)
    ]
    station_count: Annotated[int, Field(ge=3, le=L.MAX_STATIONS)] = 41


class OffsetStationModel(_Model):
    x_m: float = Field(ge=-L.MAX_COORDINATE_M, le=L.MAX_COORDINATE_M)
    points_m: Annotated[list[Pair], Field(min_length=2, max_length=L.MAX_POINTS_PER_SECTION)]


class HullModel(_Model):
    sketch: SketchModel | None = None
    offsets: Annotated[
        list[OffsetStationModel], Field(min_length=2, max_length=L.MAX_STATIONS)
    ] | None = None

    @model_validator(mode="after")
    def _one_kind(self) -> HullModel:
        if (self.sketch is None) == (self.offsets is None):
            raise ValueError("needs either 'sketch' or 'offsets' (exactly one)")
        return self


class WaterModel(_Model):
    preset: Literal["fresh", "sea"] | None = None
    density_kg_m3: float | None = Field(None, ge=L.MIN_WATER_DENSITY, le=L.MAX_WATER_DENSITY)

    @model_validator(mode="after")
    def _one_kind(self) -> WaterModel:
        if (self.preset is None) == (self.density_kg_m3 is None):
            raise ValueError("needs either 'preset' or 'density_kg_m3' (exactly one)")
        return self


class CrewModel(_Model):
    name: Name = "crew"
    mass_kg: float = Field(75.0, ge=0.0, le=L.MAX_CREW_KG)
    x_m: float = Field(ge=-L.MAX_COORDINATE_M, le=L.MAX_COORDINATE_M)
    side_m: float = Field(0.0, ge=-L.MAX_BEAM_M, le=L.MAX_BEAM_M)
    seat_height_m: float = Field(0.05, ge=0.0, le=3.0)
    cg_above_seat_m: float = Field(0.30, ge=0.0, le=2.0)


class ItemModel(_Model):
    name: Name = "item"
    mass_kg: float = Field(ge=0.0, le=L.MAX_ITEM_KG)
    x_m: float = Field(ge=-L.MAX_COORDINATE_M, le=L.MAX_COORDINATE_M)
    y_m: float = Field(0.0, ge=-L.MAX_COORDINATE_M, le=L.MAX_COORDINATE_M)
    z_m: float = Field(ge=-L.MAX_COORDINATE_M, le=L.MAX_COORDINATE_M)


class MaterialModel(_Model):
    name: Name = "material"
    areal_density_kg_m2: float = Field(ge=0.0, le=100.0)
    layers: float = Field(1.0, ge=0.0, le=50.0)
    surfaces: Annotated[list[Surface], Field(max_length=3)] = ["bottom", "sides", "ends"]
    thickness_m: float = Field(0.0, ge=0.0, le=0.2)


class LoadsModel(_Model):
    crew: Annotated[list[CrewModel], Field(max_length=L.MAX_CREW)] = []
    items: Annotated[list[ItemModel], Field(max_length=L.MAX_ITEMS)] = []
    materials: Annotated[list[MaterialModel], Field(max_length=L.MAX_MATERIALS)] = []
    bottom_thickness_m: float = Field(0.0, ge=0.0, le=0.5)
    bilge_water_depth_m: float = Field(0.0, ge=0.0, le=5.0)
    wet_factor: float = Field(1.0, ge=0.5, le=5.0)


class AnalysisModel(_Model):
    heel_step_deg: float = Field(1.0, ge=0.1, le=15.0)
    heel_max_deg: float = Field(90.0, ge=5.0, le=180.0)
    free_trim: bool = True
    open_boat: bool = True


class ChecksModel(_Model):
    shift_crew: Annotated[
        list[Annotated[int, Field(ge=0, lt=L.MAX_CREW)]], Field(max_length=L.MAX_CREW)
    ] | None = None
    shift_distance_m: float | None = Field(None, ge=-L.MAX_BEAM_M, le=L.MAX_BEAM_M)
    shift_to_gunwale: bool = False
    boarding_mass_kg: float = Field(75.0, ge=0.0, le=L.MAX_CREW_KG)
    target_gm_m: float = Field(0.15, ge=0.0, le=5.0)
    whatif_crew_kg: Annotated[
        list[PersonKg], Field(max_length=L.MAX_CREW)
    ] | None = None
    whatif_wet_factor: float = Field(1.5, ge=0.5, le=5.0)
    whatif_bilge_m: float = Field(0.03, ge=0.0, le=5.0)

    @model_validator(mode="after")
    def _each_once(self) -> ChecksModel:
        if self.shift_crew is not None and len(set(self.shift_crew)) != len(self.shift_crew):
            raise ValueError("'shift_crew' names the same person twice")
        return self


class DesignModel(_Model):
    format: Literal["hullwright.design"]
    version: int
    name: Name = "Untitled"
    notes: Notes = ""
    water: WaterModel | None = None
    hull: HullModel
    loads: LoadsModel | None = None
    analysis: AnalysisModel | None = None
    checks: ChecksModel | None = None

    @model_validator(mode="after")
    def _crew_indices(self) -> DesignModel:
        crew = len(self.loads.crew) if self.loads is not None else 0
        shift = self.checks.shift_crew if self.checks is not None else None
        if shift and max(shift) >= crew:
            raise ValueError(
                f"checks.shift_crew: crew number {max(shift)} does not exist "
                f"(the design has {crew} crew, numbered from 0)"
            )
        return self


# ----------------------------------------------------------------------------- messages


def _models_in(annotation: Any) -> list[type[BaseModel]]:
    """The models an annotation refers to (through Optional, list, Annotated)."""
    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
        return [annotation]
    found: list[type[BaseModel]] = []
    for arg in typing.get_args(annotation):
        found += _models_in(arg)
    return found


def _model_at(loc: tuple[Any, ...]) -> type[BaseModel] | None:
    """The model that describes the object at ``loc`` (None if not an object)."""
    model: type[BaseModel] = DesignModel
    for part in loc:
        if isinstance(part, int):
            continue
        field = model.model_fields.get(part)
        if field is None:
            return None
        inner = _models_in(field.annotation)
        if not inner:
            return None
        model = inner[0]
    return model


def known_keys(loc: tuple[Any, ...] = ()) -> list[str]:
    """Keys the object at ``loc`` may have (``()`` for the top level)."""
    model = _model_at(loc)
    return list(model.model_fields) if model is not None else []


def _path(loc: tuple[Any, ...]) -> str:
    out = "design"
    for part in loc:
        out += f"[{part}]" if isinstance(part, int) else f".{part}"
    return out


def _printable(text: str) -> str:
    return text.encode("utf-8", "backslashreplace").decode("utf-8")[:60]


def _sentence(error: Any) -> str:
    loc = tuple(error["loc"])
    kind = error["type"]
    ctx = error.get("ctx") or {}
    where = _path(loc)
    if kind == "extra_forbidden":
        key = str(loc[-1])
        near = difflib.get_close_matches(key, known_keys(loc[:-1]), n=1, cutoff=0.6)
        hint = f" (did you mean '{near[0]}'?)" if near else ""
        return f"{_path(loc[:-1])}: unknown key '{_printable(key)}'{hint}"
    if kind == "missing":
        return f"{_path(loc[:-1])}: missing '{loc[-1]}'"
    if kind in ("float_type", "int_type", "int_from_float", "float_parsing", "int_parsing"):
        whole = kind.startswith("int")
        return f"{where} must be {'a whole number' if whole else 'a number'}"
    if kind == "finite_number":
        return f"{where} must be a finite number"
    if kind in ("greater_than_equal", "greater_than"):
        return f"{where} is too small (at least {ctx.get('ge', ctx.get('gt'))})"
    if kind in ("less_than_equal", "less_than"):
        return f"{where} is too large (at most {ctx.get('le', ctx.get('lt'))})"
    if kind == "bool_type":
        return f"{where} must be true or false"
    if kind == "string_type":
        return f"{where} must be text"
    if kind == "string_unicode":
        return f"{where} contains a broken character (a lone UTF-16 surrogate)"
    if kind == "string_too_long":
        return f"{where} is too long (at most {ctx.get('max_length')} characters)"
    if kind == "list_type":
        return f"{where} must be a list"
    if kind == "too_long":
        return (
            f"{where} has {ctx.get('actual_length')} entries, more than this program handles "
            f"(at most {ctx.get('max_length')})"
        )
    if kind == "too_short":
        return f"{where} needs at least {ctx.get('min_length')} entries"
    if kind in ("model_type", "dict_type", "model_attributes_type"):
        return f"{where} must be an object {{...}}"
    if kind == "literal_error":
        return f"{where} must be one of {ctx.get('expected')}"
    if kind == "value_error":
        msg = str(error["msg"]).removeprefix("Value error, ")
        return f"{where}: {msg}" if loc else msg
    return f"{where}: {error['msg']}"


def validate_design_data(data: Any) -> DesignModel:
    """Check parsed JSON against the schema; raise DesignFileError with one sentence."""
    try:
        return DesignModel.model_validate(data)
    except ValidationError as e:
        errors = e.errors(include_url=False)
        more = f" (and {len(errors) - 1} more problems)" if len(errors) > 1 else ""
        raise DesignFileError(_sentence(errors[0]) + more) from None
