"""Compare with a pinned version: the few figures a builder weighs, then and now.

Pure text (no Qt), so it is tested without a window; the main window shows it under
the readout and draws the pinned lines and GZ curve faintly behind the current ones.
"""

from __future__ import annotations

from hydro import Analysis, Design
from hydro.units import UnitSystem

__all__ = ["beam_of", "difference_rows", "difference_text"]


def beam_of(design: Design) -> float:
    """Beam at the gunwale (m): twice the largest half-breadth of the stations."""
    return 2.0 * design.stations().max_half_breadth


def difference_rows(
    pinned: tuple[Design, Analysis], now: tuple[Design, Analysis], u: UnitSystem
) -> list[tuple[str, str, str]]:
    """(figure, pinned, now) for beam, GM, max GZ and the gunwale angle."""

    def figures(design: Design, a: Analysis) -> list[str]:
        hs, c = a.hydrostatics, a.curve
        gw = None if c is None else c.gunwale_immersion_deg
        return [
            u.length_text(beam_of(design)),
            u.length_text(None if hs is None else hs.gm),
            u.length_text(None if c is None else c.max_gz),
            "—" if gw is None else f"{abs(gw):.1f}°",
        ]

    names = ["Beam", "GM", "Max GZ", "Gunwale under at"]
    return list(zip(names, figures(*pinned), figures(*now)))


def difference_text(
    pinned: tuple[Design, Analysis], now: tuple[Design, Analysis], u: UnitSystem
) -> str:
    """The rows as a small fixed-pitch table with a heading."""
    rows = difference_rows(pinned, now, u)
    lines = [f"{'':<17}{'pinned':>12}{'now':>12}"]
    lines += [f"{name:<17}{was:>12}{then:>12}" for name, was, then in rows]
    return "\n".join(lines)
