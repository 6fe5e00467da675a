"""Immersed area and moments of every station, for many heeled waterlines at once.

The hot path of the engine.  Each station is a closed section polygon (the half section
mirrored to port and closed across the gunwales).  For a heel angle phi the coordinates
are rotated once into the heeled frame

    xi  =  y cos(phi) + z sin(phi)     (horizontal, to the low side)
    eta =  z cos(phi) - y sin(phi)     (vertical)

and the water is ``eta < h_s`` at station s.  Area and first moments of the immersed
part come from Green's theorem over the polygon's edges (the usual polygon formulas,
which are exact for straight edges):

* whole edges below the water: their contributions do not depend on the waterline, so
  they are summed cumulatively along each section once per hull (in the body frame,
  then rotated; the forms are rotation-covariant).  A submerged run of edges between two
  crossings is a difference of two prefix sums;
* the few edges that cross the water are clipped where they cross;
* the closing chords along the waterline are summed from the crossing points alone,
  with signs (a chord runs from an up-crossing to a down-crossing), so sections cut in
  several pieces (twin pontoons) need no pairing of crossings.

The same crossing points give the waterline breadth at each station (the exact
derivative dA/dh used by Newton's method) and its first and second moments.

This numpy code is the reference.  When numba is installed, :func:`heel_frame` and
:func:`cut` run the same arithmetic compiled (:mod:`hydro.cut_kernels`, chosen by
:mod:`hydro.compiled`), station by station with no (angles x stations x vertices)
temporaries; the rotated heights ``HeelFrame.eta`` are then made only if asked for.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property, lru_cache
from types import ModuleType

import numpy as np
from numpy.typing import NDArray

from hydro import compiled
from hydro.hull import Stations

__all__ = ["SectionTable", "HeelFrame", "Cut", "build_section_table", "heel_frame", "cut"]

FloatArray = NDArray[np.float64]


@dataclass(frozen=True, eq=False)
class SectionTable:
    """Closed station polygons padded to one vertex count, with prefix sums.

    Attributes
    ----------
    x : (S,) station positions (m)
    weights, weights_x, weights_xx : (S,) integration weights: with f interpolated
        linearly between stations, the integrals of f, x f and x^2 f along the hull are
        exactly ``f @ weights``, ``f @ weights_x`` and ``f @ weights_xx`` (the first is
        the trapezoid rule; the error against a smooth f is O(h^2) in the spacing h)
    y, z : (S, V) polygon vertices, closed (column ``n_s`` repeats column 0) and padded
        by repeating the first vertex, so padding edges have zero length
    prefix : (3, S, V) cumulative body-frame contributions of edges 0 .. k-1 to
        (area, first moment about y = 0 i.e. integral of y dA, integral of z dA)
    gunwale_y, gunwale_z : (S,) starboard gunwale point of each station
    keel_z : float, height of the lowest point of the hull
    """

    x: FloatArray
    weights: FloatArray
    weights_x: FloatArray
    weights_xx: FloatArray
    y: FloatArray
    z: FloatArray
    prefix: FloatArray
    gunwale_y: FloatArray
    gunwale_z: FloatArray
    keel_z: float

    @property
    def totals(self) -> FloatArray:
        """(3, S) area, integral of y dA and of z dA of each whole section."""
        return self.prefix[:, :, -1]

    @cached_property
    def prefix_flat(self) -> FloatArray:
        """(S * V, 3) ``prefix`` with one row per vertex, for gathering (numpy's cut)."""
        return np.ascontiguousarray(self.prefix.reshape(3, -1).T)

    @cached_property
    def weight_pair(self) -> FloatArray:
        """(S, 2) ``weights`` and ``weights_x`` side by side: both integrals in one product."""
        return np.column_stack([self.weights, self.weights_x])


@dataclass(frozen=True, eq=False)
class HeelFrame:
    """Station vertices rotated for a set of A heel angles.

    Attributes
    ----------
    phi : (A,) heel angles (rad), positive = starboard down
    cos, sin : (A,)
    eta_low, eta_high : (A,) lowest and highest vertex of the whole hull
    totals : (3, A, S) whole-section area, integral of xi dA, integral of eta dA
    y, z : (S, V) the table's vertices (not copied)
    eta : (A, S, V) vertical coordinate of every vertex in the heeled frame, made on
        first use (the numpy path of :func:`cut`; the compiled one does without)
    """

    phi: FloatArray
    cos: FloatArray
    sin: FloatArray
    eta_low: FloatArray
    eta_high: FloatArray
    totals: FloatArray
    y: FloatArray
    z: FloatArray

    @cached_property
    def eta(self) -> FloatArray:
        """(A, S, V) eta = z cos(phi) - y sin(phi) of every vertex."""
        return _rotated_eta(self.y, self.z, self.cos, self.sin)

    def take(self, idx: NDArray[np.intp]) -> HeelFrame:
        """The frame for a subset of its angles."""
        sub = HeelFrame(
            self.phi[idx], self.cos[idx], self.sin[idx], self.eta_low[idx],
            self.eta_high[idx], np.ascontiguousarray(self.totals[:, idx]), self.y, self.z,
        )
        if "eta" in self.__dict__:  # made already: a subset, not a new rotation
            sub.__dict__["eta"] = self.eta[idx]
        return sub


@dataclass(frozen=True, eq=False)
class Cut:
    """Immersed part of every station for waterlines ``eta = h`` (arrays (A, S)).

    Attributes
    ----------
    area : immersed area (m^2)
    q_xi, q_eta : integrals of xi dA and eta dA over the immersed area (m^3)
    breadth : total waterline breadth (m), equal to d(area)/dh
    breadth_m1 : integral of xi along the waterline (m^2), equal to d(q_xi)/dh
    breadth_m2 : integral of xi^2 along the waterline (m^3)
    """

    area: FloatArray
    q_xi: FloatArray
    q_eta: FloatArray
    breadth: FloatArray
    breadth_m1: FloatArray
    breadth_m2: FloatArray


def linear_weights(x: FloatArray) -> tuple[FloatArray, FloatArray, FloatArray]:
    """Weights for the exact integrals of f, x f, x^2 f with f linear between points x."""
    x0, x1 = x[:-1], x[1:]
    dx = x1 - x0
    w = np.zeros((3, x.size))
    w[0, :-1] += dx / 2
    w[0, 1:] += dx / 2
    w[1, :-1] += dx * (2 * x0 + x1) / 6
    w[1, 1:] += dx * (x0 + 2 * x1) / 6
    w[2, :-1] += dx * (3 * x0**2 + 2 * x0 * x1 + x1**2) / 12
    w[2, 1:] += dx * (x0**2 + 2 * x0 * x1 + 3 * x1**2) / 12
    return w[0], w[1], w[2]


@lru_cache(maxsize=16)
def _station_weights(x: bytes) -> tuple[FloatArray, FloatArray, FloatArray]:
    """:func:`linear_weights` (read-only) of the stations at ``x`` (their float64 bytes):
    a drag that keeps the stations in place reuses them."""
    w = linear_weights(np.frombuffer(x))
    for part in w:
        part.flags.writeable = False
    return w


def _closed_rings(stack: FloatArray) -> tuple[FloatArray, FloatArray]:
    """(S, 2n) y and z of the closed polygons of S half sections of n points each.

    Starboard half, then port mirrored (the keel point once), then the first vertex again.
    """
    s_count, n, _ = stack.shape
    y = np.empty((s_count, 2 * n))
    z = np.empty((s_count, 2 * n))
    y[:, :n] = stack[:, :, 0]
    z[:, :n] = stack[:, :, 1]
    y[:, n : 2 * n - 1] = -stack[:, -1::-1, 0][:, : n - 1]
    z[:, n : 2 * n - 1] = stack[:, -1::-1, 1][:, : n - 1]
    y[:, -1] = y[:, 0]
    z[:, -1] = z[:, 0]
    return y, z


def _padded_rings(halves: tuple[FloatArray, ...]) -> tuple[FloatArray, FloatArray]:
    """Closed polygons of half sections with different point counts, padded to one."""
    rings = []
    for h in halves:
        mirrored = h[::-1] * [-1.0, 1.0]
        rings.append(np.vstack([h, mirrored[:-1]]))  # keel point appears once
    n_vertices = max(len(r) for r in rings) + 1
    y = np.empty((len(rings), n_vertices))
    z = np.empty((len(rings), n_vertices))
    for i, ring in enumerate(rings):
        y[i, : len(ring)] = ring[:, 0]
        z[i, : len(ring)] = ring[:, 1]
        y[i, len(ring) :] = ring[0, 0]
        z[i, len(ring) :] = ring[0, 1]
    return y, z


def build_section_table(stations: Stations) -> SectionTable:
    """Close, mirror and pad the half sections; precompute the edge prefix sums.

    Examples
    --------
    A box section 2 m wide, 1 m deep has area 2 and its centroid at z = 0.5:

    >>> import numpy as np
    >>> from hydro.hull import Stations
    >>> half = np.array([[0, 0], [1, 0], [1, 1]], float)
    >>> t = build_section_table(Stations(np.array([0.0, 1.0]), (half, half)))
    >>> t.totals[:, 0].round(6).tolist()
    [2.0, 0.0, 1.0]
    """
    if stations.stack is not None:
        y, z = _closed_rings(stations.stack)
    else:
        y, z = _padded_rings(stations.half_sections)
    s_count, n_vertices = y.shape
    y0, y1, z0, z1 = y[:, :-1], y[:, 1:], z[:, :-1], z[:, 1:]
    crossp = y0 * z1 - y1 * z0
    edge = np.stack([crossp / 2, (y0 + y1) * crossp / 6, (z0 + z1) * crossp / 6])
    prefix = np.zeros((3, s_count, n_vertices))
    np.cumsum(edge, axis=2, out=prefix[:, :, 1:])
    gunwale = stations.gunwale
    w0, w1, w2 = _station_weights(stations.x.tobytes())
    return SectionTable(
        x=stations.x.copy(),
        weights=w0,
        weights_x=w1,
        weights_xx=w2,
        y=y,
        z=z,
        prefix=prefix,
        gunwale_y=gunwale[:, 0].copy(),
        gunwale_z=gunwale[:, 1].copy(),
        keel_z=stations.keel_z,
    )


def _rotated_eta(y: FloatArray, z: FloatArray, c: FloatArray, s: FloatArray) -> FloatArray:
    eta = c[:, None, None] * z[None]
    eta -= s[:, None, None] * y[None]
    return eta


def heel_frame(table: SectionTable, phi: FloatArray) -> HeelFrame:
    """Rotate every station vertex once for the heel angles ``phi`` (rad, (A,))."""
    phi = np.atleast_1d(np.asarray(phi, dtype=float))
    c, s = np.cos(phi), np.sin(phi)
    area, qy, qz = table.totals
    cc, ss = c[:, None], s[:, None]
    totals = np.empty((3, phi.size, area.size))
    totals[0] = area
    np.multiply(cc, qy, out=totals[1])
    totals[1] += ss * qz
    np.multiply(cc, qz, out=totals[2])
    totals[2] -= ss * qy
    kernels = compiled.kernels()
    if kernels is not None:
        low, high = np.empty(phi.size), np.empty(phi.size)
        kernels.heel_extremes(table.y, table.z, c, s, low, high)
        return HeelFrame(phi, c, s, low, high, totals, table.y, table.z)
    eta = _rotated_eta(table.y, table.z, c, s)
    flat = eta.reshape(phi.size, -1)
    frame = HeelFrame(phi, c, s, flat.min(axis=1), flat.max(axis=1), totals, table.y, table.z)
    frame.__dict__["eta"] = eta  # cached_property's slot: made already
    return frame


def cut(table: SectionTable, frame: HeelFrame, h: FloatArray, full: bool = True) -> Cut:
    """Immersed area, moments and waterline breadth of every station.

    Parameters
    ----------
    table : the hull's stations
    frame : the rotated vertices for A heel angles
    h : (A, S) waterline height in the heeled frame at each station (m)
    full : if False, only ``area``, ``q_eta`` and ``breadth`` are computed (what a
        Newton step needs); the other fields are None

    Returns
    -------
    Cut with (A, S) arrays; moments are in the heeled frame (xi, eta).

    Runs the compiled kernel when :mod:`hydro.compiled` has it ready, else the numpy
    reference (:func:`cut_numpy`); the two agree to rounding.
    """
    kernels = compiled.kernels()
    if kernels is None:
        return cut_numpy(table, frame, h, full)
    return cut_compiled(kernels, table, frame, h, full)


def cut_compiled(
    kernels: ModuleType, table: SectionTable, frame: HeelFrame, h: FloatArray, full: bool = True
) -> Cut:
    """:func:`cut` on the compiled kernels (``kernels``: :mod:`hydro.cut_kernels`)."""
    shape = (frame.phi.size, table.x.size)
    h = np.ascontiguousarray(h, dtype=np.float64)
    if h.shape != shape:
        raise ValueError(f"waterline heights of shape {h.shape}, expected {shape}")
    if frame.totals.shape != (3,) + shape or frame.y.shape != table.y.shape:
        raise ValueError("the heel frame was made for another section table")
    out = np.empty((kernels.FIELDS,) + shape)
    kernels.cut_sums(
        table.y, table.z, table.prefix, np.ascontiguousarray(frame.totals),
        np.ascontiguousarray(frame.cos), np.ascontiguousarray(frame.sin), h, full, out,
    )
    if not full:
        return Cut(out[0], None, out[2], out[3], None, None)  # type: ignore[arg-type]
    return Cut(*out)


def cut_numpy(table: SectionTable, frame: HeelFrame, h: FloatArray, full: bool = True) -> Cut:
    """:func:`cut` on numpy alone: the reference."""
    n_angles, n_st, n_vert = frame.eta.shape
    n_edges = n_vert - 1
    below = frame.eta < h[:, :, None]
    crossing = below[:, :, :-1] != below[:, :, 1:]
    idx = np.flatnonzero(crossing)
    cell = idx // n_edges  # flat (angle, station)
    vtx = idx + cell  # vertex k of the edge: cell * n_vert + k
    ang = cell // n_st
    body = vtx - ang * (n_st * n_vert)  # the same vertex in the table: station * n_vert + k
    eta_flat = frame.eta.reshape(-1)
    e0 = eta_flat[vtx]
    e1 = eta_flat[vtx + 1]
    hq = h.reshape(-1)[cell]
    up = e0 < hq  # vertex k is under water: the edge leaves the water
    y, z = table.y.reshape(-1), table.z.reshape(-1)
    c = frame.cos[ang]
    s = frame.sin[ang]
    xi0 = c * y[body] + s * z[body]
    body1 = body + 1
    xi1 = c * y[body1] + s * z[body1]
    xq = xi0 + (hq - e0) / (e1 - e0) * (xi1 - xi0)
    sign = np.where(up, 1.0, -1.0)
    # clipped part of the crossing edge, from its underwater vertex v to the crossing
    # point q, kept in polygon order (v -> q when leaving the water, q -> v entering)
    v_xi = np.where(up, xi0, xi1)
    v_eta = np.where(up, e0, e1)
    crossp = sign * (v_xi * hq - xq * v_eta)
    sum_xi = v_xi + xq
    sum_eta = v_eta + hq
    # whole edges under water: +prefix at an up-crossing, -prefix after a down-crossing
    pre = table.prefix_flat[body + (~up)]
    pre *= sign[:, None]
    hx = hq * xq
    sx = sign * xq
    size = n_angles * n_st
    first_below = below[:, :, 0]
    tot = frame.totals

    def gather(values: FloatArray) -> FloatArray:
        summed: FloatArray = np.bincount(cell, weights=values, minlength=size)  # type: ignore[assignment]
        return summed.reshape(n_angles, n_st)

    area = gather(crossp / 2 + pre[:, 0] + hx * sign / 2) + first_below * tot[0]
    q_eta = gather(
        sum_eta * crossp / 6 + (c * pre[:, 2] - s * pre[:, 1]) + sign * hq * hx / 3
    ) + first_below * tot[2]
    breadth = gather(sx)
    if not full:
        return Cut(area, None, q_eta, breadth, None, None)  # type: ignore[arg-type]
    q_xi = gather(
        sum_xi * crossp / 6 + (c * pre[:, 1] + s * pre[:, 2]) + sx * hx / 6
    ) + first_below * tot[1]
    return Cut(
        area=area,
        q_xi=q_xi,
        q_eta=q_eta,
        breadth=breadth,
        breadth_m1=gather(sx * xq / 2),
        breadth_m2=gather(sx * xq * xq / 3),
    )
