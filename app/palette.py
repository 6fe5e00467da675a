"""Hullwright's colours: one meaning each, the same on screen and on the print plate.

Plain hex strings (no Qt here), so the views, the plate and the README legend all read
the same table.  The hues that carry meaning come from Okabe & Ito's colour-blind-safe
set ("Color Universal Design", 2008) where they can, and every one of them is paired with
a word, a label or a line style, so colour never carries meaning alone.

>>> len(set(MEANINGS)) == len(MEANINGS)  # no colour means two things
True
>>> HEELING_ARM != CREW and HANDLE != WALL_SIDED and SELECTED != CENTRE_OF_GRAVITY
True
"""

from __future__ import annotations

# -- what the colours mean (screen and plate) -------------------------------------------

#: The boat: hull lines, labels, the righting-arm (GZ) curve and the metacentre M.
INK = "#1f3a5f"
#: Water: the waterline, the water fill, the centre of buoyancy B, the gunwale-under angle.
WATER = "#0072b2"
#: Handles you can drag.
HANDLE = "#e69f00"
#: The selected handle.
SELECTED = "#5e3c99"
#: The centre of gravity G.
CENTRE_OF_GRAVITY = "#c2185b"
#: The heeling arm of the crew shift, and the heel where it meets GZ.
HEELING_ARM = "#009e73"
#: The wall-sided estimate of GZ (dashed), valid at small heel only.
WALL_SIDED = "#cc79a7"
#: Crew seats, and the seat positions for level trim.
CREW = "#7b4a2a"
#: Warnings: the safety cautions' bullets, a load the hull cannot carry, a panel strained
#: past the limit.
WARNING = "#8a1c14"
#: Build pack: where two sheets are joined (scarf or butt) on a panel.
JOINT = "#8c7a00"

#: (colour, what it means) for the README legend and the tests.
MEANINGS: dict[str, str] = {
    INK: "the boat: hull lines, labels, the GZ curve, M",
    WATER: "water: waterline, water, B, the angle where the gunwale goes under",
    HANDLE: "handles you can drag",
    SELECTED: "the selected handle",
    CENTRE_OF_GRAVITY: "G, the centre of gravity",
    HEELING_ARM: "the crew-shift heeling arm and the heel where it meets GZ",
    WALL_SIDED: "the wall-sided estimate of GZ (dashed)",
    CREW: "crew seats and the seat positions for level trim",
    WARNING: "safety cautions, loads the hull cannot carry, panels strained past the limit",
    JOINT: "build pack: joints between sheets on a panel",
}

# -- neutral tones (carry no meaning) -----------------------------------------------------

PAPER = "#fbf9f3"  #: screen background
GRID = "#e4dfd2"  #: grid and station lines on screen
INK_FAINT = "#9aa7b8"  #: axes, centreline, GZ past the gunwale (dotted)
STATION_MARK = "#b9a77a"  #: station positions on the plan and profile
HANDLE_EDGE = "#ffffff"
WATER_FILL = (0, 114, 178, 38)  #: WATER, mostly transparent
NOT_AVAILABLE_FILL = (120, 110, 100, 40)  #: the band past the gunwale on the GZ plot

PRINT_PAPER = "#ffffff"  #: plate background
PRINT_TEXT = "#181c22"  #: plate body text
PRINT_MUTED = "#5c636e"  #: plate notes, axis labels, secondary lines
PRINT_RULE = "#aab0ba"  #: plate rules and station lines
PRINT_BAND = "#eef1f5"  #: plate panel bands
PRINT_SHADE = "#e2e4e8"
PRINT_STRIPE = "#f6f7f9"
PRINT_STATION = "#78808c"  #: build pack: station and mark lines on the pieces
PRINT_FILL = "#dee8f4"  #: build pack: the pieces on the sheet layouts

#: GM state colours (background, text); the words and glyphs live in the views.
STATE_COLOURS = {
    "stable": ("#d9efe3", "#1d5e3b"),
    "marginal": ("#fbecc8", "#7a4e00"),
    "unstable": ("#f7d6d3", WARNING),
    "none": ("#e9e6df", "#4a4a4a"),
}
