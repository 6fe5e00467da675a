"""The safety cautions shown by the app, the print plate, the report and the README.

Drawn from published cardboard-boat regatta rules and boating-safety guidance (wear a
fastened life jacket, stay with a capsized boat, beware of cold-water shock); one wording
everywhere.
"""

__all__ = ["CAUTIONS", "SHORT_CAUTION", "DISCLAIMER"]

SHORT_CAUTION = (
    "Design aid, not a certification. Life jackets on; first float in shallow water "
    "with helpers."
)

DISCLAIMER = (
    "These figures are a design aid, not a certification of safety. Follow local codes, "
    "your event's rules and licensed professional practice; they take precedence."
)

CAUTIONS: tuple[str, ...] = (
    "Everyone aboard wears a properly fitted, fastened life jacket (PFD) and shoes - "
    "you cannot put one on in the water.",
    "First float the boat in calm, shallow water, close to shore, with helpers standing "
    "by and a rescue boat or throw line at hand.",
    "A cardboard or open hull may have no buoyancy once swamped: the life jacket is the "
    "flotation. If the boat capsizes, stay with it; do not swim for shore.",
    "Nobody is enclosed or taped in; children paddle with an adult aboard. Watch for "
    "cold water - cold shock makes strong swimmers gasp and fail.",
    "Follow the event's rules (materials, crew, ballast) and local boating regulations.",
    DISCLAIMER,
)
