"""Analytic hulls with known hydrostatics, as tables of offsets.

Used by the tests (closed forms in Tupper ch. 4, Barrass & Derrett, Wigley 1934) and the
benchmark.  Each returns :class:`~hydro.hull.Stations` with K at z = 0.
"""

from __future__ import annotations

import numpy as np

from hydro.hull import Stations

__all__ = ["box", "v_prism", "cylinder", "twin_tubes", "wigley"]


def _prism(length: float, half: np.ndarray, stations: int) -> Stations:
    x = np.linspace(0.0, length, stations)
    return Stations(x, tuple(half.copy() for _ in x))


def box(length: float, breadth: float, depth: float, stations: int = 3) -> Stations:
    """Rectangular barge, L x B x D, flat bottom at z = 0.

    >>> box(4.0, 1.0, 0.5).half_sections[0].tolist()
    [[0.0, 0.0], [0.5, 0.0], [0.5, 0.5]]
    """
    half = np.array([[0.0, 0.0], [breadth / 2, 0.0], [breadth / 2, depth]])
    return _prism(length, half, stations)


def v_prism(length: float, half_angle_deg: float, depth: float, stations: int = 3) -> Stations:
    """V-section prism with its keel at z = 0 and half-angle alpha at the keel."""
    b = depth * np.tan(np.radians(half_angle_deg))
    return _prism(length, np.array([[0.0, 0.0], [b, depth]]), stations)


def cylinder(length: float, radius: float, points: int = 721, stations: int = 3) -> Stations:
    """Circular cylinder, axis along x at z = radius (a closed round tube).

    The half section runs from the bottom round the starboard side to the top.
    """
    t = np.linspace(-np.pi / 2, np.pi / 2, points)
    half = np.column_stack([radius * np.cos(t), radius + radius * np.sin(t)])
    half[0, 0] = half[-1, 0] = 0.0
    return _prism(length, half, stations)


def twin_tubes(
    length: float,
    radius: float,
    spacing: float,
    deck_thickness: float = 0.02,
    points: int = 721,
    stations: int = 3,
) -> Stations:
    """Two round tubes, centres ``spacing`` apart at z = radius, under a flat deck.

    The deck's underside sits 1 % of the radius below the tube tops, so each tube is a
    whole circle inside the outline; the deck spans the tubes' top chords and is
    ``deck_thickness`` thick.  The half section starts on the centreline at the deck's
    underside, runs round the tube (inboard side, bottom, outboard side) and ends at
    the deck edge above the tube (the gunwale).
    """
    c = spacing / 2
    if c <= radius:
        raise ValueError("the tubes overlap: spacing must exceed the diameter")
    under = 1.99 * radius
    beta = np.arcsin((under - radius) / radius)
    w = radius * np.cos(beta)
    t = np.linspace(np.pi - beta, 2 * np.pi + beta, points)
    arc = np.column_stack([c + radius * np.cos(t), radius + radius * np.sin(t)])
    half = np.vstack([[[0.0, under]], arc, [[c + w, under + deck_thickness]]])
    return _prism(length, half, stations)


def wigley(
    length: float, breadth: float, draft: float, depth: float, stations: int = 41,
    points: int = 33,
) -> Stations:
    """Wigley hull y = (B/2)(1 - (2x'/L)^2)(1 - (z'/T)^2), wall-sided above the waterline.

    x' is measured from midships and z' is depth below the design waterline z = T;
    below it the form is Wigley's (1934), above it the sides stand vertical up to
    ``depth``.  ``points`` is the number of points per half section (of which the
    last is the gunwale).
    """
    x = np.linspace(0.0, length, stations)
    xp = x - length / 2
    z = draft * (1 - np.cos(np.linspace(0, np.pi / 2, points - 1)))  # finer near the keel
    halves = []
    for xi in xp:
        f = 1 - (2 * xi / length) ** 2
        y = (breadth / 2) * f * (1 - ((draft - z) / draft) ** 2)
        h = np.column_stack([y, z])
        h = np.vstack([h, [y[-1], depth]])
        halves.append(h)
    return Stations(x, tuple(halves))
