"""Words for the builder: the one unit-aware formatter of verdicts and margins.

The command line, the app and the plate all take their sentences from here, with the
lengths and masses written by :class:`hydro.units.UnitSystem` (``length_text`` and
``mass_text``), so a verdict reads the same wherever it is shown.  Nothing here decides
anything: the verdicts come from :mod:`hydro.stability` and :mod:`hydro.assess`.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from hydro.units import METRIC, UnitSystem

if TYPE_CHECKING:  # pragma: no cover - types only, no import cycle at run time
    from hydro.heel_checks import HeelCheck
    from hydro.aids import BeamResult, TrimResult
    from hydro.stability import Analysis
    from hydro.whatif import SensitivityRow, SwampResult

__all__ = [
    "angle_text",
    "beam_text",
    "swamp_text",
    "trim_text",
    "trim_words",
    "badge_words",
    "list_cell",
    "heel_margins",
    "heel_sentence",
    "heel_title",
    "heel_verdict_text",
    "list_text",
    "share_text",
    "side_word",
    "status_headline",
    "status_sentence",
    "whatif_case",
]

#: A list smaller than this (degrees) is called upright.
UPRIGHT_DEG = 0.05


def side_word(heel_deg: float) -> str:
    """"starboard" for a positive heel, "port" for a negative one."""
    return "starboard" if heel_deg >= 0 else "port"


def angle_text(deg: float | None, digits: int = 0) -> str:
    """An unsigned angle, ``12°``; a dash for None or NaN."""
    if deg is None or not math.isfinite(deg):
        return "—"
    return f"{abs(deg):.{digits}f}°"


def list_text(list_deg: float | None) -> str:
    """``upright``, ``lists 4° to starboard`` or ``capsizes`` (None)."""
    if list_deg is None:
        return "capsizes"
    if abs(list_deg) < UPRIGHT_DEG:
        return "upright"
    digits = 0 if abs(list_deg) >= 2 else 1
    return f"lists {angle_text(list_deg, digits)} to {side_word(list_deg)}"


def status_headline(a: Analysis) -> str:
    """The status in capitals, with the list: ``OK - LISTS 4° TO STARBOARD``."""
    word = a.status.value.upper()
    c = a.curve
    if c is None or c.list_deg is None or abs(c.list_deg) < UPRIGHT_DEG:
        return word
    return f"{word} - {list_text(c.list_deg).upper()}"


def status_sentence(a: Analysis, u: UnitSystem = METRIC) -> str:
    """One sentence on how the boat floats, lengths and masses in ``u``."""
    from hydro.stability import Status  # run-time import: stability imports this module

    w, h, c = a.weights, a.hydrostatics, a.curve
    if a.status is Status.SINKS or h is None or c is None:
        if a.capacity_kg is not None and w.mass >= a.capacity_kg:
            return (
                f"Sinks: the load is {u.mass_text(w.mass)} but the whole closed hull "
                f"displaces only {u.mass_text(a.capacity_kg)}."
            )
        return (
            f"Sinks: no floating position with the centre of gravity "
            f"{u.length_text(w.lcg)} from the aft end; the hull would stand on end and go under."
        )
    if a.status is Status.CAPSIZES:
        upto = f"up to {angle_text(c.last_deg)}"
        if abs(w.tcg) < 1e-6:
            return (
                f"Capsizes: upright GM is {u.length_text(h.gm)} and the righting arm stays "
                f"below zero at every heel {upto}: the boat rolls over."
            )
        side = side_word(c.side)
        return (
            f"Capsizes: the centre of gravity is {u.length_text(abs(w.tcg))} to {side} of "
            f"the centreline and the righting arm stays below zero at every heel to {side} "
            f"{upto}: the boat rolls over."
        )
    if a.status is Status.FLOODS and h.min_freeboard <= 0:
        over = ""
        if a.flood_limit_kg:
            over = (
                f"; it floods at {u.mass_text(a.flood_limit_kg)}, "
                f"{u.mass_text(w.mass - a.flood_limit_kg)} too heavy"
            )
        return (
            f"Floods: the gunwale is {u.length_text(-h.min_freeboard)} under water "
            f"{u.length_text(h.min_freeboard_x)} from the aft end with "
            f"{u.mass_text(w.mass)} aboard{over}."
        )
    assert c.list_deg is not None
    if a.status is Status.FLOODS:
        return (
            f"Floods: it {list_text(c.list_deg)} and the gunwale goes under at "
            f"{angle_text(c.gunwale_immersion_deg, 1)}: an open boat fills."
        )
    if a.status is Status.UNSTABLE:
        lolls = f"lolls over to about {angle_text(c.list_deg)}"
        if abs(w.tcg) > 0:
            lolls += f" to {side_word(c.list_deg)}"
        else:
            lolls += " to either side"
        gw = c.gunwale_immersion_deg
        if gw is not None and abs(gw) <= abs(c.list_deg):
            lolls += ", past the point where the gunwale goes under"
        return f"Unstable: upright GM is {u.length_text(h.gm)}, so the boat {lolls}."
    if abs(c.list_deg) < UPRIGHT_DEG:
        return "Floats upright with the gunwale clear."
    return f"Floats but {list_text(c.list_deg)}, the gunwale clear."


def heel_title(check: HeelCheck, u: UnitSystem = METRIC) -> str:
    """``Crew shift (all crew 300 mm to the side)``, ``Boarding (75 kg on the gunwale)``."""
    if check.kind == "boarding":
        return f"Boarding ({u.mass_text(check.moved_mass)} on the gunwale)"
    where = (
        "onto the gunwale" if check.to_gunwale
        else "to the side" if check.distance is None
        else f"{u.length_text(check.distance)} to the side"
    )
    return f"Crew shift ({check.who} {where})"


def share_text(share: float | None) -> str:
    """``uses 87 % of the boat's best righting arm``."""
    if share is None or not math.isfinite(share):
        return "the boat has no righting arm to spare on that side"
    return f"uses {100 * share:.0f} % of the boat's best righting arm"


def heel_margins(check: HeelCheck, u: UnitSystem = METRIC) -> str:
    """The margins of a heel check: arm used, heel and freeboard left."""
    from hydro.heel_checks import MIN_SHIFTED_FREEBOARD_M, Verdict

    parts = [share_text(check.arm_share)]
    if check.verdict is Verdict.HOLDS:
        if check.heel_left_deg is not None:
            parts.append(f"{angle_text(check.heel_left_deg, 1)} of heel left before the gunwale")
        else:
            parts.append("the gunwale stays clear at every heel computed")
        fb = f"{u.length_text(check.low_freeboard)} freeboard left on the low side"
        if check.low_freeboard is not None and check.low_freeboard < MIN_SHIFTED_FREEBOARD_M:
            fb += f", less than the {u.length_text(MIN_SHIFTED_FREEBOARD_M)} suggested"
        parts.append(fb)
    return "; ".join(parts)


def heel_verdict_text(check: HeelCheck, u: UnitSystem = METRIC) -> str:
    """What happens, without the title: ``heels to 8.3° to starboard ...``."""
    from hydro.heel_checks import Verdict

    if check.verdict is Verdict.CAPSIZES or check.static_heel_deg is None:
        if check.arm_share is None or not math.isfinite(check.arm_share):
            return "capsizes: no heel balances the heeling arm."
        return (
            f"capsizes: the heeling arm is {100 * check.arm_share:.0f} % of the boat's best "
            "righting arm."
        )
    heel = f"heels to {angle_text(check.static_heel_deg, 1)} to {side_word(check.static_heel_deg)}"
    if check.verdict is Verdict.FLOODS:
        at = (
            f" at {angle_text(check.gunwale_deg, 1)}" if check.gunwale_deg is not None else ""
        )
        return f"{heel}, but the gunwale goes under{at} first: an open boat swamps."
    return f"{heel}: {heel_margins(check, u)}."


def heel_sentence(check: HeelCheck, u: UnitSystem = METRIC) -> str:
    """One line: the case and what happens, with its margins."""
    return f"{heel_title(check, u)}: {heel_verdict_text(check, u)}"


def whatif_case(row: SensitivityRow, u: UnitSystem = METRIC) -> str:
    """The name of a what-if row: ``soaked materials (x1.5)``, ``30 mm bilge water``."""
    if row.kind == "soaked" and row.amount is not None:
        return f"soaked materials (x{row.amount:g})"
    if row.kind == "heavier crew" and row.amount is not None:
        return f"crew up to {u.mass_text(row.amount)} each"
    if row.kind == "bilge water" and row.amount is not None:
        return f"{u.length_text(row.amount)} bilge water"
    return row.kind


def badge_words(a: Analysis, state: str) -> tuple[str, str]:
    """The readout's badge: a word and what it means, for the status and GM state
    (``state`` from :func:`hydro.assess.state_of`: stable, marginal, unstable, none)."""
    from hydro.stability import Status

    c = a.curve
    listed = c is not None and c.list_deg is not None and abs(c.list_deg) >= UPRIGHT_DEG
    if a.status is Status.SINKS or state == "none":
        return "SINKS", "the boat does not float with this load"
    if a.status is Status.CAPSIZES:
        return "CAPSIZES", "the righting arm never brings it back: it rolls over"
    if a.status is Status.FLOODS:
        return "FLOODS", "the gunwale is under water as it floats"
    if a.status is Status.UNSTABLE:
        return "UNSTABLE", "upright GM at or below zero: it lolls over or capsizes"
    if state == "marginal":
        if listed:
            assert c is not None and c.list_deg is not None
            other = side_word(-c.list_deg)
            return "TENDER", f"{list_text(c.list_deg)} as loaded: move weight to {other}"
        return "TENDER", "positive but small GM: feels tippy, keep weight low and central"
    if listed:
        assert c is not None and c.list_deg is not None
        return "STABLE", f"comes back to its list ({list_text(c.list_deg)})"
    return "STABLE", "comes back upright"


def list_cell(list_deg: float | None) -> str:
    """A short list for a table cell: ``0.0``, ``4.2 stbd``, ``3.0 port``, ``capsizes``."""
    if list_deg is None:
        return "capsizes"
    if abs(list_deg) < UPRIGHT_DEG:
        return "0.0"
    return f"{abs(list_deg):.1f} {'stbd' if list_deg > 0 else 'port'}"


def trim_words(trim_deg: float) -> str:
    """A trim in words, no sign: ``level``, ``0.74° by the bow``, ``1.3° by the stern``.

    >>> trim_words(0.74), trim_words(-1.3), trim_words(-0.001)
    ('0.74° by the bow', '1.30° by the stern', 'level')
    """
    if abs(trim_deg) < 0.005:  # shows as 0.00
        return "level"
    return f"{abs(trim_deg):.2f}° by the {'bow' if trim_deg > 0 else 'stern'}"


def trim_text(t: TrimResult, u: UnitSystem = METRIC) -> str:
    """Where to seat someone (or put an item) so the boat floats level."""
    after = t.trim_after_deg
    if t.x_after is None or after is None:
        return (
            f"Moving {t.what} alone cannot float the boat level "
            f"(trim now {trim_words(t.trim_before_deg)})."
        )
    return (
        f"Put {t.what} at {u.length_text(t.x_after)} from the aft end "
        f"(now {u.length_text(t.x_before)}): "
        f"trim {trim_words(after)} (now {trim_words(t.trim_before_deg)}), freeboard aft "
        f"{u.length_text(t.freeboard_aft)}, fore {u.length_text(t.freeboard_fore)}."
    )


def beam_text(b: BeamResult, u: UnitSystem = METRIC) -> str:
    """The beam aid's answer."""
    if b.factor is None:
        low = f"{b.narrowest:.2f}" if b.narrowest > 0.3 + 1e-9 else "0.3"
        why = " (the narrowest that floats the load)" if b.narrowest > 0.3 + 1e-9 else ""
        return (
            f"No beam between {low}{why} and 3 times the present one gives GM "
            f"{u.length_text(b.target_gm)}."
        )
    return (
        f"GM reaches {u.length_text(b.gm_after)} at a beam of {u.length_text(b.beam_after)} "
        f"(×{b.factor:.3f}); the present {u.length_text(b.beam_before)} gives "
        f"{u.length_text(b.gm_before)}."
    )


def swamp_text(r: SwampResult, u: UnitSystem = METRIC) -> str:
    """Reserve buoyancy and the swamped hull, pointing to life jackets."""
    head = (
        f"Reserve buoyancy {u.mass_text(r.reserve_mass)} "
        f"({100 * r.reserve_fraction:.0f} % of the hull)."
    )
    if r.floats_swamped is None:
        return head + (
            " Closed hull: it cannot fill while its deck and seams hold. Still wear life jackets."
        )
    if r.floats_swamped:
        return head + (
            " Swamped, the hull still floats itself and its fittings, but not the crew: "
            "wear life jackets."
        )
    return head + (
        " Swamped, the hull sinks: the crew's life jackets are the only flotation - wear them."
    )
