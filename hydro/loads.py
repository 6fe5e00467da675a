"""What goes into the boat: crew, items, shell materials, bilge water; the weight build-up.

Positions are in hull coordinates (m): x forward from the aft end, y to starboard, z up.
Masses in kg.  Defaults come from published sources (named beside each) or are marked
as common practice; every one of them is editable.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from functools import cached_property

import numpy as np
import shapely
from numpy.typing import NDArray

from hydro.errors import LoadError
from hydro.hull import Stations
from hydro.sections import build_section_table, cut, heel_frame

__all__ = [
    "CrewMember",
    "MassItem",
    "Material",
    "Loads",
    "WeightLine",
    "WeightSummary",
    "MATERIAL_PRESETS",
    "MATERIAL_THICKNESS_M",
    "SHEET_MIN_THICKNESS_M",
    "WATER_PRESETS",
    "CREW_MASS_KG",
    "HEAVY_CREW_MASS_KG",
    "SEATED_CG_ABOVE_SEAT_M",
    "shell_panels",
    "validate_loads",
    "weight_build_up",
    "water_density",
]

FloatArray = NDArray[np.float64]

#: Design crew mass per adult: ISO 14946:2021 and the IMO IS Code (75 kg per person).
CREW_MASS_KG = 75.0
#: Heavier crew option: US Coast Guard assumed average weight per person,
#: 46 CFR 170.090 (185 lb).
HEAVY_CREW_MASS_KG = 84.0
#: Seated person's centre of gravity above the seat: IMO A.749(18) 3.5.2.7, HSC Code 2.10.
SEATED_CG_ABOVE_SEAT_M = 0.30

#: Water densities (kg/m^3).  fresh: ITTC 7.5-02-01-03 Table 1 at 20 degC (998.2072);
#: sea: ship practice 1.025 t/m^3 (Barrass & Derrett), ITTC Table 3 gives 1024.8 at 20 degC.
WATER_PRESETS: dict[str, float] = {"fresh": 998.2, "sea": 1025.0}

#: Areal densities of shell materials (kg/m^2 per layer) and where each comes from.
MATERIAL_PRESETS: dict[str, tuple[float, str]] = {
    "single-wall corrugated board": (
        0.55, "derived from liner and medium grammages (Kirwan, Paper and Paperboard "
        "Packaging Technology, 2005, ch. 11)"),
    "double-wall corrugated board": (
        0.90, "derived from liner and medium grammages (Kirwan, Paper and Paperboard "
        "Packaging Technology, 2005, ch. 11)"),
    "triple-wall corrugated board": (1.4, "from memory"),
    "duct tape": (
        0.25, "common practice: tape about 0.25 mm thick; density ~1.1 g/cm3 from memory"),
    "latex paint, one coat": (
        0.04, "common practice: about 16 m2 per litre, ~25 um dry film per coat; "
        "film density from memory"),
    "okoume plywood 4 mm": (1.8, "common practice: okoume ~450 kg/m3"),
    "okoume plywood 6 mm": (2.7, "common practice: okoume ~450 kg/m3"),
    "glass/epoxy sheathing": (0.4, "from memory, ~200 g/m2 cloth hand lay-up"),
}

#: Thickness of one layer of each preset (m); sheet stock as sold (common practice), the
#: thin coatings from memory.  A material at least SHEET_MIN_THICKNESS_M thick is cut
#: from sheets (the build pack lays it out); thinner ones are coatings.
MATERIAL_THICKNESS_M: dict[str, float] = {
    "single-wall corrugated board": 0.004,
    "double-wall corrugated board": 0.007,
    "triple-wall corrugated board": 0.015,
    "duct tape": 0.00025,
    "latex paint, one coat": 0.00005,
    "okoume plywood 4 mm": 0.004,
    "okoume plywood 6 mm": 0.006,
    "glass/epoxy sheathing": 0.0005,
}
#: Thinner materials are coatings (tape, paint, sheathing), not cut from sheets.
SHEET_MIN_THICKNESS_M = 0.001

SURFACES = ("bottom", "sides", "ends")


@dataclass(frozen=True)
class CrewMember:
    """A seated person.

    Attributes
    ----------
    name : str
    mass : kg (default 75, ISO 14946 / IMO IS Code)
    x : seat position along the hull (m)
    y : side offset of the seat from the centreline (m, + starboard)
    seat_height : seat surface above the inside of the bottom at x (m); the inside of
        the bottom is the lowest hull point at x plus the bottom thickness (common
        practice, no source)
    cg_above_seat : centre of gravity above the seat (m, default 0.30, IMO A.749(18))
    """

    name: str
    x: float
    mass: float = CREW_MASS_KG
    y: float = 0.0
    seat_height: float = 0.05
    cg_above_seat: float = SEATED_CG_ABOVE_SEAT_M


@dataclass(frozen=True)
class MassItem:
    """A lumped mass (ballast, fitting, gear) at (x, y, z) in hull coordinates."""

    name: str
    mass: float
    x: float
    y: float = 0.0
    z: float = 0.0


@dataclass(frozen=True)
class Material:
    """A shell material applied over whole hull surfaces.

    Attributes
    ----------
    name : str
    areal_density : kg/m^2 per layer
    layers : how many layers (>= 0)
    surfaces : which of "bottom", "sides", "ends" it covers
    thickness_m : thickness of one layer (m); 0 when unknown.  Sheet stock (at least
        SHEET_MIN_THICKNESS_M) insets the frames and is laid out on sheets.
    """

    name: str
    areal_density: float
    layers: float = 1.0
    surfaces: tuple[str, ...] = SURFACES
    thickness_m: float = 0.0

    @property
    def is_sheet(self) -> bool:
        """Cut from sheet stock (not a tape, paint or sheathing)."""
        return self.thickness_m >= SHEET_MIN_THICKNESS_M


@dataclass(frozen=True)
class Loads:
    """Everything the boat carries.

    Attributes
    ----------
    crew, items, materials : the load items
    bottom_thickness : hull bottom thickness (m); seats stand on its inside
    bilge_water_depth : depth of loose water above the inside of the lowest point (m)
    wet_factor : multiplies every material mass (1.0 dry; soaked cardboard 1.5 or more)
    """

    crew: tuple[CrewMember, ...] = ()
    items: tuple[MassItem, ...] = ()
    materials: tuple[Material, ...] = ()
    bottom_thickness: float = 0.0
    bilge_water_depth: float = 0.0
    wet_factor: float = 1.0


@dataclass(frozen=True)
class WeightLine:
    """One row of the weight schedule (kg, m)."""

    name: str
    kind: str
    mass: float
    x: float
    y: float
    z: float


@dataclass(frozen=True)
class WeightSummary:
    """The weight build-up.

    Attributes
    ----------
    lines : every item with its mass and centre
    mass : total displacement mass Delta (kg)
    lcg, tcg, vcg : centre of gravity (m, hull coordinates)
    kg : height of G above K, the lowest point of the hull (m)
    free_surface_moment : rho_l * i of loose water (kg m), so FSC = this / Delta (m);
        i is taken about each separate pool's own centre line (water in twin pontoons
        cannot run from one to the other)
    loose_water_pools : how many separate pools the loose water's surface forms at a
        station (0: none; 1: one pool that runs to the low side as the boat heels)
    """

    lines: tuple[WeightLine, ...]
    mass: float
    lcg: float
    tcg: float
    vcg: float
    kg: float
    free_surface_moment: float = 0.0
    loose_water_pools: int = 0

    @property
    def fsc(self) -> float:
        """Free-surface correction to GM (m): rho i / Delta (Barrass & Derrett, free surface)."""
        return self.free_surface_moment / self.mass if self.mass > 0 else 0.0


@dataclass(frozen=True, eq=False)
class ShellPanels:
    """Hull surface split into panels, both sides included.

    Attributes
    ----------
    area : (P,) m^2
    centroid : (P, 3) m (y = 0 for mirrored pairs)
    kind : (P,) index into SURFACES of each panel's surface
    surface_area : area of each surface (m^2), by name
    surface_moment : (3,) each surface's area times its centroid (m^3), by name
    """

    area: FloatArray
    centroid: FloatArray
    kind: NDArray[np.intp] = field(repr=False)
    surface_area: dict[str, float] = field(repr=False)
    surface_moment: dict[str, FloatArray] = field(repr=False)

    @cached_property
    def surface(self) -> NDArray[np.str_]:
        """(P,) each panel's surface by name: "bottom", "sides" or "ends"."""
        return np.array(SURFACES)[self.kind]

    def covering(self, surfaces: tuple[str, ...]) -> tuple[float, FloatArray]:
        """Area (m^2) and centroid (3,) of the named surfaces (zeros when no area)."""
        chosen = [k for k in SURFACES if k in surfaces]
        area = float(sum(self.surface_area[k] for k in chosen))
        if not area > 0:
            return 0.0, np.zeros(3)
        moment = np.sum([self.surface_moment[k] for k in chosen], axis=0)
        return area, moment / area


def water_density(value: str | float) -> float:
    """Density from a preset name ("fresh", "sea") or a number in kg/m^3 (500-1500)."""
    if isinstance(value, str):
        key = value.strip().lower()
        if key in WATER_PRESETS:
            return WATER_PRESETS[key]
        try:
            value = float(key)
        except ValueError:
            raise LoadError(f"unknown water '{value}': use fresh, sea or a density in kg/m3") from None
    rho = float(value)
    if not math.isfinite(rho) or not 500.0 <= rho <= 1500.0:
        raise LoadError(f"water density {rho} kg/m3 is out of range (500 to 1500)")
    return rho


def _resample_girth(h: FloatArray, n: int) -> FloatArray:
    seg = np.hypot(*np.diff(h, axis=0).T)
    s = np.concatenate([[0.0], np.cumsum(seg)])
    if s[-1] <= 0:
        return np.repeat(h[:1], n, axis=0)
    t = np.linspace(0.0, s[-1], n)
    return np.column_stack([np.interp(t, s, h[:, 0]), np.interp(t, s, h[:, 1])])


def shell_panels(stations: Stations) -> ShellPanels:
    """Split the hull surface (both sides, plus transoms) into flat triangles.

    Panels between stations are classed "bottom" when their normal is nearer vertical
    than horizontal, otherwise "sides" (common practice, no source); the end sections
    of a blunt hull (transoms) are "ends".
    """
    halves = stations.half_sections
    stack = stations.stack
    if stack is None:
        n = len(halves[0])
        if any(len(h) != n for h in halves):
            n = 48
            halves = tuple(_resample_girth(h, n) for h in halves)
        stack = np.stack(halves)
    x = stations.x
    n_st, n = stack.shape[:2]
    pts = np.empty((n_st, n, 3))
    pts[:, :, 0] = x[:, None]
    pts[:, :, 1:] = stack
    # every quad between stations i, i + 1 and points j, j + 1 as two triangles
    # (a, b, c) and (a, c, d): a = (i, j), b = (i + 1, j), c = (i + 1, j + 1), d = (i, j + 1);
    # both at once: (a, q, r) with q = (b, c) and r = (c, d)
    a = pts[:-1, :-1]
    c = pts[1:, 1:]
    q = np.stack([pts[1:, :-1], c])
    r = np.stack([c, pts[:-1, 1:]])
    u, v = q - a, r - a
    ux, uy, uz = u[..., 0], u[..., 1], u[..., 2]
    vx, vy, vz = v[..., 0], v[..., 1], v[..., 2]
    nx, ny, nz = uy * vz - uz * vy, uz * vx - ux * vz, ux * vy - uy * vx
    triangles = np.sqrt(nx * nx + ny * ny + nz * nz).ravel()  # twice the area: both sides
    centroid = ((a + q + r) / 3.0).reshape(-1, 3)
    centroid[:, 1] = 0.0
    kind = np.where((np.abs(nz) >= np.abs(ny)).ravel(), 0, 1)
    # the end sections, closed polygons (ending where they began): transoms if they
    # have area
    h = stack[[0, -1]]
    ring = np.concatenate([h, h[:, ::-1] * [-1.0, 1.0]], axis=1)
    y0, z0, y1, z1 = ring[:, :-1, 0], ring[:, :-1, 1], ring[:, 1:, 0], ring[:, 1:, 1]
    crossp = y0 * z1 - y1 * z0
    end_area = 0.5 * crossp.sum(axis=1)
    blunt = end_area > 1e-12
    end_z = ((z0 + z1) * crossp).sum(axis=1)[blunt] / (6 * end_area[blunt])
    ends = np.column_stack([x[[0, -1]][blunt], np.zeros(end_z.size), end_z])
    area = np.concatenate([triangles, end_area[blunt]])
    centroid = np.vstack([centroid, ends])
    kind = np.concatenate([kind, np.full(end_z.size, 2)])
    # each surface's area and moment in one product: its panels' areas, zeros elsewhere
    on = np.where(kind == np.arange(len(SURFACES))[:, None], area, 0.0)
    totals, moments = on.sum(axis=1), on @ centroid
    return ShellPanels(
        area, centroid, kind,
        {name: float(totals[k]) for k, name in enumerate(SURFACES)},
        {name: moments[k] for k, name in enumerate(SURFACES)},
    )


def _free_surface(stations: Stations, level: float) -> tuple[FloatArray, int]:
    """(S,) second moment of the water surface at ``level`` about each pool's own centre
    (sum of L^3/12 over the pieces of the waterline at each station), and the largest
    number of pieces at any station."""
    own = np.zeros(stations.x.size)
    most = 0
    line = shapely.LineString([(-1e4, level), (1e4, level)])
    for i, h in enumerate(stations.half_sections):
        if np.max(h[:, 0]) <= 0:
            continue
        ring = np.vstack([h, h[::-1] * [-1.0, 1.0]])
        surface = shapely.intersection(shapely.Polygon(ring), line)
        lengths = shapely.length(shapely.get_parts(surface))
        lengths = lengths[lengths > 1e-12]
        own[i] = float(np.sum(lengths**3) / 12.0)
        most = max(most, int(lengths.size))
    return own, most


def _keel_heights(stations: Stations) -> FloatArray:
    """(S,) the lowest point of each station."""
    if stations.stack is not None:
        return stations.stack[:, :, 1].min(axis=1)
    return np.array([np.min(h[:, 1]) for h in stations.half_sections])


def _check_number(value: float, what: str, low: float = -math.inf, high: float = math.inf) -> None:
    if not isinstance(value, (int, float)) or not math.isfinite(value):
        raise LoadError(f"{what} is not a number")
    if not low <= value <= high:
        raise LoadError(f"{what} = {value:g} is out of range ({low:g} to {high:g})")


def validate_loads(loads: Loads, stations: Stations) -> None:
    """Raise :class:`LoadError` for impossible load values."""
    x0, x1 = float(stations.x[0]), float(stations.x[-1])
    reach = 5.0 * max(stations.length, 1.0)
    for c in loads.crew:
        _check_number(c.mass, f"crew '{c.name}' mass (kg)", 0.0, 500.0)
        _check_number(c.x, f"crew '{c.name}' seat position (m)", x0, x1)
        _check_number(c.y, f"crew '{c.name}' side offset (m)", -reach, reach)
        _check_number(c.seat_height, f"crew '{c.name}' seat height (m)", 0.0, 3.0)
        _check_number(c.cg_above_seat, f"crew '{c.name}' CG above seat (m)", 0.0, 2.0)
    for it in loads.items:
        _check_number(it.mass, f"item '{it.name}' mass (kg)", 0.0, 1e5)
        for v, axis in ((it.x, "x"), (it.y, "y"), (it.z, "z")):
            _check_number(v, f"item '{it.name}' {axis} (m)", -reach, reach)
    for m in loads.materials:
        _check_number(m.areal_density, f"material '{m.name}' areal density (kg/m2)", 0.0, 100.0)
        _check_number(m.layers, f"material '{m.name}' layers", 0.0, 50.0)
        _check_number(m.thickness_m, f"material '{m.name}' thickness (m)", 0.0, 0.2)
        unknown = set(m.surfaces) - set(SURFACES)
        if unknown:
            raise LoadError(f"material '{m.name}': unknown surface {sorted(unknown)[0]!r}")
    _check_number(loads.bottom_thickness, "bottom thickness (m)", 0.0, 0.5)
    _check_number(loads.bilge_water_depth, "bilge water depth (m)", 0.0, 5.0)
    _check_number(loads.wet_factor, "wet mass factor", 0.5, 5.0)


def weight_build_up(
    loads: Loads, stations: Stations, rho: float, panels: ShellPanels | None = None
) -> WeightSummary:
    """Total mass and centre of gravity of everything in ``loads``.

    Crew CG height = inside of the bottom at the seat + seat height + CG above seat.
    Materials: areal density x layers x wet factor over the chosen surfaces, centred on
    the real surface.  Bilge water: the hull volume up to the water level (thin-shell
    approximation: the outside of the hull stands for the inside), with its free-surface
    moment rho * i (Barrass & Derrett, *Ship Stability for Masters and Mates*, free
    surface chapter).

    Raises
    ------
    LoadError
        For impossible values, or when nothing at all is aboard.
    """
    validate_loads(loads, stations)
    lines: list[WeightLine] = []
    keel = _keel_heights(stations)
    for c in loads.crew:
        z = (
            float(np.interp(c.x, stations.x, keel))
            + loads.bottom_thickness
            + c.seat_height
            + c.cg_above_seat
        )
        lines.append(WeightLine(c.name, "crew", c.mass, c.x, c.y, z))
    for it in loads.items:
        lines.append(WeightLine(it.name, "item", it.mass, it.x, it.y, it.z))
    if loads.materials:
        panels = panels or shell_panels(stations)
        for m in loads.materials:
            area, cen = panels.covering(m.surfaces)
            mass = m.areal_density * m.layers * loads.wet_factor * area
            lines.append(WeightLine(m.name, "material", mass, *map(float, cen)))
    fs_moment = 0.0
    pieces = 0
    if loads.bilge_water_depth > 0:
        level = stations.keel_z + loads.bottom_thickness + loads.bilge_water_depth
        table = build_section_table(stations)
        frame = heel_frame(table, np.zeros(1))
        wet = cut(table, frame, np.full((1, table.x.size), level))
        vol = float(wet.area[0] @ table.weights)
        if vol > 0:
            lines.append(
                WeightLine(
                    "bilge water",
                    "water",
                    rho * vol,
                    float(wet.area[0] @ table.weights_x / vol),
                    float(wet.q_xi[0] @ table.weights / vol),
                    float(wet.q_eta[0] @ table.weights / vol),
                )
            )
            own, pieces = _free_surface(stations, level)
            fs_moment = rho * float(own @ table.weights)
    mass = sum(line.mass for line in lines)
    if not mass > 0:
        raise LoadError("nothing is aboard: add crew, materials or items with mass")
    lcg = sum(line.mass * line.x for line in lines) / mass
    tcg = sum(line.mass * line.y for line in lines) / mass
    vcg = sum(line.mass * line.z for line in lines) / mass
    return WeightSummary(tuple(lines), mass, lcg, tcg, vcg, vcg - stations.keel_z, fs_moment, pieces)
