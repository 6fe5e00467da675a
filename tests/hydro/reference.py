"""Independent reference computations for the tests, built on general-purpose libraries.

Nothing here imports the engine's section kernel or solver: the sections are clipped by
shapely (GEOS), waterlines are root-found by scipy's brentq and integrals along the hull
use scipy.integrate.  The tests compare the engine against these.

Conventions as in the engine: x forward, y to starboard, z up; heel phi positive
starboard down; in the heeled frame xi = y cos(phi) + z sin(phi) (across the heel axis)
and eta = z cos(phi) - y sin(phi) (normal to the water); GZ = xi_B - xi_G.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import shapely
from scipy.integrate import trapezoid
from scipy.optimize import brentq
from shapely import affinity


def section_polygon(half: np.ndarray) -> shapely.Polygon:
    """The whole section (mirrored half section, closed across the gunwales)."""
    ring = np.vstack([half, half[::-1][:-1] * [-1.0, 1.0]])
    return shapely.Polygon(ring)


def heeled(poly: shapely.Polygon, phi: float) -> shapely.Polygon:
    """The section in the heeled frame (xi, eta)."""
    c, s = math.cos(phi), math.sin(phi)
    return affinity.affine_transform(poly, [c, s, -s, c, 0.0, 0.0])


def wet_part(poly: shapely.Polygon, level: float) -> shapely.Geometry:
    """The part of a heeled section below the waterline eta = level."""
    lo_x, lo_y, hi_x, hi_y = poly.bounds
    return poly.intersection(shapely.box(lo_x - 1, lo_y - 1, hi_x + 1, level))


@dataclass(frozen=True)
class PrismFloat:
    """A prism (one section all along) floating freely at heel phi, by shapely."""

    level: float  #: waterline height eta in the heeled frame
    area: float  #: immersed section area (m^2)
    xi_b: float  #: centre of buoyancy across the heel axis (m)
    eta_b: float  #: centre of buoyancy normal to the water (m)


def prism_float(half: np.ndarray, area: float, phi: float) -> PrismFloat:
    """Waterline of a prism section heeled to phi that immerses ``area`` (m^2).

    A prism with G at mid-length floats without trim, so one section says everything.
    """
    poly = heeled(section_polygon(half), phi)
    lo, hi = poly.bounds[1], poly.bounds[3]
    level = brentq(lambda h: wet_part(poly, h).area - area, lo, hi, xtol=1e-14, rtol=1e-15)
    wet = wet_part(poly, level)
    return PrismFloat(level, wet.area, wet.centroid.x, wet.centroid.y)


def prism_gz(half: np.ndarray, area: float, kg: float, phi: float, tcg: float = 0.0) -> float:
    """GZ (m) of a prism with G at (tcg, kg) in the section, K at z = 0."""
    f = prism_float(half, area, phi)
    xi_g = tcg * math.cos(phi) + kg * math.sin(phi)
    return f.xi_b - xi_g


def prism_deck_edge_angle(half: np.ndarray, area: float, upto_deg: float = 89.0) -> float:
    """First heel (deg) at which the low gunwale (the starboard end of the half section)
    reaches the water, by brentq on its height above the waterline."""
    gy, gz = half[-1]

    def clearance(deg: float) -> float:
        phi = math.radians(deg)
        eta = gz * math.cos(phi) - gy * math.sin(phi)
        return eta - prism_float(half, area, phi).level

    grid = np.linspace(0.0, upto_deg, 179)
    values = [clearance(a) for a in grid]
    for a, b, fa, fb in zip(grid[:-1], grid[1:], values[:-1], values[1:]):
        if fa > 0 >= fb:
            return brentq(clearance, a, b, xtol=1e-10)
    raise ValueError("the gunwale stays clear")


def static_heel(gz_of_deg, arm0: float, upto_deg: float) -> float | None:
    """First heel (deg) where GZ meets the heeling arm arm0 cos(phi), or None."""
    def diff(deg: float) -> float:
        return gz_of_deg(deg) - arm0 * math.cos(math.radians(deg))

    grid = np.linspace(0.0, upto_deg, 361)
    values = [diff(a) for a in grid]
    for a, b, fa, fb in zip(grid[:-1], grid[1:], values[:-1], values[1:]):
        if fa < 0 <= fb:
            return brentq(diff, a, b, xtol=1e-10)
    return None


@dataclass(frozen=True)
class HullFloat:
    """Volume and centre of buoyancy of a station table under a heeled, trimmed plane."""

    volume: float
    x_b: float
    xi_b: float
    eta_b: float


def hull_float(x: np.ndarray, halves, phi: float, h: float, tau: float) -> HullFloat:
    """Immersed volume and centroid below eta = h + tau x, sections by shapely and the
    integrals along x for section quantities linear between stations, as a table of
    offsets is read (scipy's trapezoid rule; Simpson's rule for the x moment)."""
    areas, m_xi, m_eta = [], [], []
    for xi, half in zip(x, halves):
        poly = section_polygon(half) if np.ptp(half[:, 0]) > 0 else shapely.Polygon()
        if poly.is_empty:
            areas.append(0.0)
            m_xi.append(0.0)
            m_eta.append(0.0)
            continue
        wet = wet_part(heeled(poly, phi), h + tau * xi)
        a = wet.area
        areas.append(a)
        m_xi.append(a * wet.centroid.x if a > 0 else 0.0)
        m_eta.append(a * wet.centroid.y if a > 0 else 0.0)
    areas, m_xi, m_eta = map(np.asarray, (areas, m_xi, m_eta))
    vol = trapezoid(areas, x)
    if vol <= 0:
        return HullFloat(0.0, math.nan, math.nan, math.nan)
    return HullFloat(vol, _x_moment(x, areas) / vol, trapezoid(m_xi, x) / vol,
                     trapezoid(m_eta, x) / vol)


def _x_moment(x: np.ndarray, f: np.ndarray) -> float:
    """Integral of x f(x) for f linear between stations: Simpson's rule on each interval,
    exact because x f(x) is quadratic there."""
    mid_x, mid_f = 0.5 * (x[1:] + x[:-1]), 0.5 * (f[1:] + f[:-1])
    return float(np.sum(np.diff(x) / 6 * (x[:-1] * f[:-1] + 4 * mid_x * mid_f + x[1:] * f[1:])))


def hull_level(x: np.ndarray, halves, phi: float, tau: float, volume: float) -> float:
    """The waterline h (eta = h + tau x) at which the hull displaces ``volume``."""
    polys = [heeled(section_polygon(half), phi) for half in halves if np.ptp(half[:, 0]) > 0]
    lo = min(p.bounds[1] for p in polys) - abs(tau) * float(np.ptp(x)) - 1e-6
    hi = max(p.bounds[3] for p in polys) + abs(tau) * float(np.ptp(x)) + 1e-6
    return brentq(lambda h: hull_float(x, halves, phi, h, tau).volume - volume, lo, hi,
                  xtol=1e-13, rtol=1e-15)
