"""The ``hullwright`` command line: report, offsets, plate, check, incline, resize, pack, open.

Every length may be typed as in the app: a plain number is in metres, or give a unit
and fractions ("3.6 m", "360 cm", "141 3/4 in", "11' 9 3/4\"", "2-04-3").

Every bad input ends with a one-line message on stderr and exit code 2, and nothing is
written: output paths are checked before any work and written through a temporary file
(:mod:`hydro.outputs`), never over an input.  A reader that closes the pipe early
(``hullwright report boat.json | head``) ends the program quietly.  Anything unexpected is
still one line on stderr, with exit code 70.  Only ``plate``, ``pack -o`` and
``open`` load Qt.
"""

from __future__ import annotations

import argparse
from dataclasses import replace
import json
import math
import os
import sys
import typing
from pathlib import Path
from typing import TYPE_CHECKING, Sequence

import numpy as np

from hydro import (
    AnalysisSettings,
    HullwrightError,
    Loads,
    MassItem,
    analyse,
    analyse_stations,
    load_design,
    read_offsets,
    report_dict,
    save_design,
    write_offsets,
)
from hydro import incline
from hydro.assess import assess
from hydro.design import Design
from hydro.heel_checks import HeelCheck
from hydro import limits
from hydro.io import read_incline_readings
from hydro.outputs import check_output, write_via_temp
from hydro.loads import water_density
from hydro.builder_stations import builder_stations
from hydro.resize import resize_design
from hydro.runtime import keep_freed_memory
from hydro.units import METRIC, LengthError, parse_length, system
from hydro.stability import Analysis
from hydro.wording import list_text, status_sentence

if TYPE_CHECKING:
    from hydro.build_pack import PackSettings

EXIT_BAD_INPUT = 2
#: Something went wrong that is not the input's fault (still one line, nothing written).
EXIT_INTERNAL = 70


class BadInput(Exception):
    """A problem with what the user asked for (message shown as is)."""


class _Parser(argparse.ArgumentParser):
    """argparse with the program's convention: one line on stderr, exit code 2."""

    def error(self, message: str) -> typing.NoReturn:
        self.exit(EXIT_BAD_INPUT, f"hullwright: {message} (see {self.prog} --help)\n")


def _number(low: float, high: float, what: str) -> typing.Callable[[str], float]:
    """An argparse type: a finite number from low to high."""

    def convert(text: str) -> float:
        try:
            v = float(text)
        except ValueError:
            raise argparse.ArgumentTypeError(f"{what} must be a number, not '{text[:40]}'") from None
        if not (math.isfinite(v) and low <= v <= high):
            raise argparse.ArgumentTypeError(f"{what} must be from {low:g} to {high:g}")
        return v

    return convert


def _length(text: str | None, what: str, low: float, high: float) -> float | None:
    """A length as a builder types it (plain numbers in metres); None stays None."""
    if text is None:
        return None
    try:
        return parse_length(text, "m", low, high, what)
    except LengthError as e:
        raise BadInput(str(e)) from None


def _lengths(text: str, count: int, what: str) -> tuple[float, ...]:
    """``count`` comma-separated lengths (plain numbers in metres)."""
    parts = text.split(",")
    if len(parts) != count:
        names = "three numbers" if count == 3 else "two numbers"
        raise BadInput(f"{what.split()[0]} must be {names} {what.split()[-1]} (lengths: plain "
                       "numbers in metres, or with a unit)")
    try:
        return tuple(parse_length(v, "m", -100.0, 100.0, what) for v in parts)
    except LengthError as e:
        raise BadInput(str(e)) from None


def _parser() -> argparse.ArgumentParser:
    p = _Parser(
        prog="hullwright",
        description="Hydrostatics and stability of small hand-built boats. "
        "A design aid, not a certification.",
    )
    sub = p.add_subparsers(dest="command", required=True)
    r = sub.add_parser("report", help="print the hydrostatics and righting-arm curve")
    r.add_argument("design", nargs="?", help="design file (.json)")
    r.add_argument("--offsets", help="analyse a table of offsets (.csv) instead of a design")
    r.add_argument("--mass", type=_number(0.001, limits.MAX_DISPLACEMENT_KG, "--mass"),
                   help="with --offsets: total mass in kg")
    r.add_argument("--cg", help="with --offsets: centre of gravity X,Y,Z in metres")
    r.add_argument("--water", default="fresh", help="fresh, sea or a density in kg/m3")
    r.add_argument("--heel-step", type=_number(0.1, 15.0, "--heel-step"),
                   help="heel step in degrees (default 1)")
    r.add_argument("--heel-max", type=_number(5.0, 180.0, "--heel-max"),
                   help="largest heel in degrees (default 90)")
    r.add_argument("--json", action="store_true", help="print SI values as JSON")
    r.add_argument("--units", choices=["si", "metric", "imperial"], default="si",
                   help="lengths in metres (si), millimetres (metric) or inches and fractions")
    o = sub.add_parser("offsets", help="write the table of offsets of a design as CSV")
    o.add_argument("design")
    o.add_argument("-o", "--output", required=True, help="CSV file to write")
    o.add_argument("--spacing", metavar="LENGTH", help="a station every LENGTH from the aft end (e.g. 300mm, 1ft)")
    o.add_argument("--stations", type=int, metavar="N", help="N evenly spaced stations")
    pl = sub.add_parser("plate", help="render the print plate (PNG or PDF)")
    pl.add_argument("design")
    pl.add_argument("-o", "--output", required=True, help="PLATE.png or PLATE.pdf")
    pl.add_argument("--paper", default="A3", help="A4, A3, Letter or Tabloid (landscape)")
    pl.add_argument("--dpi", type=int, default=300, help="PNG resolution (72 to 600)")
    pl.add_argument("--units", default="metric", choices=["metric", "imperial"])
    pl.add_argument("--spacing", metavar="LENGTH", help="offsets at a station every LENGTH (e.g. 1ft)")
    pl.add_argument("--stations", type=int, metavar="N", help="offsets at N evenly spaced stations")
    ck = sub.add_parser("check", help="the builder's checks: crew shift, boarding, trim, beam, sensitivity, swamping")
    ck.add_argument("design")
    ck.add_argument("--crew", help="crew to shift, by number from 1 (default: all), e.g. 1,2")
    group = ck.add_mutually_exclusive_group()
    group.add_argument("--distance", metavar="LENGTH",
                       help="shift each by this length (default: to the side at seat height)")
    group.add_argument("--gunwale", action="store_true", help="shift them onto the gunwale")
    ck.add_argument("--boarding-mass", type=_number(1.0, limits.MAX_CREW_KG, "--boarding-mass"),
                    default=None, help="person climbing aboard, kg (default: as saved, 75)")
    ck.add_argument("--target-gm", metavar="LENGTH", default=None,
                    help="target GM for the beam aid (default: as saved, 0.15 m)")
    ck.add_argument("--json", action="store_true")
    inc = sub.add_parser("incline", help="measured GM and KG from an inclining test of the built boat")
    inc.add_argument("design")
    inc.add_argument("readings", help="CSV: mass_kg,distance_m,heel_deg (or pendulum_length_m,deflection_m)")
    how = inc.add_mutually_exclusive_group(required=True)
    how.add_argument("--mass", type=_number(0.1, limits.MAX_DISPLACEMENT_KG, "--mass"),
                     help="weighed mass of the boat as tested, kg")
    how.add_argument("--freeboards", help="measured freeboards AFT,FORE in metres")
    inc.add_argument("--no-correction", action="store_true", help="skip the wall-sided correction")
    inc.add_argument("--json", action="store_true")
    rs = sub.add_parser("resize", help="a design rescaled to a new length, beam or depth, same shape")
    rs.add_argument("design")
    rs.add_argument("--length", metavar="LENGTH", help="overall length")
    rs.add_argument("--beam", metavar="LENGTH", help="beam at the gunwale")
    rs.add_argument("--depth", metavar="LENGTH", help="depth at mid-length")
    rs.add_argument("-o", "--output", required=True, help="NEW.json to write")
    pk = sub.add_parser("pack", help="the build pack: flat panels, frames, sheet layout, materials")
    pk.add_argument("design")
    pk.add_argument("-o", "--output", help="PACK.pdf to write")
    pk.add_argument("--paper", default="A4", help="A4, A3, Letter or Tabloid (default A4)")
    pk.add_argument("--units", default="metric", choices=["metric", "imperial"])
    pk.add_argument("--dxf", metavar="DIR", help="also write one DXF per sheet into DIR")
    pk.add_argument("--sheet", default="1220x2440",
                    help="stock sheet WxH: mm (1220x2440), m (1.22x2.44m), ft (4x8ft) or in")
    pk.add_argument("--grain", choices=["locked", "free"], default="locked",
                    help="locked: pieces turn 0 or 180 degrees only (default)")
    pk.add_argument("--kerf", type=float, default=3.0, help="saw kerf between pieces, mm (default 3)")
    pk.add_argument("--margin", type=float, default=2.0, help="clear sheet edge, mm (default 2)")
    pk.add_argument("--joint", choices=["auto", "scarf", "butt"], default="auto",
                    help="joints in long pieces (auto: scarf, or staggered butts in laminates)")
    pk.add_argument("--scarf-ratio", type=float, default=8.0, help="scarf length / thickness (default 8)")
    pk.add_argument("--strain-limit", type=float, default=0.05,
                    help="flag panels whose twist strain is above this, percent (default 0.05)")
    pk.add_argument("--frames", help="frame positions in metres from the aft end, e.g. 0.6,1.3,2.0")
    pk.add_argument("--skin-strips", type=int, default=4,
                    help="round-bilge hulls: skin strips a side (0: frames only; default 4)")
    pk.add_argument("--offset-spacing", metavar="LENGTH",
                    help="also tabulate panel offsets this far apart (mm unless a unit is "
                    "given: 100, 4in)")
    pk.add_argument("--tape-roll", type=float, default=55.0, help="tape roll length, m (default 55)")
    pk.add_argument("--paint-coverage", type=float, default=10.0,
                    help="paint coverage per coat, m2 per litre (default 10)")
    pk.add_argument("--coats", type=_number(0.0, 20.0, "--coats"), default=2.0,
                    help="coats of paint (default 2)")
    pk.add_argument("--sheet-price", type=float, help="price of one sheet (for the cost)")
    pk.add_argument("--tape-price", type=float, help="price of one roll of tape")
    pk.add_argument("--paint-price", type=float, help="price of one litre of paint")
    pk.add_argument("--json", action="store_true", help="print panels, sheets and materials as JSON")
    op = sub.add_parser("open", help="open the desktop app")
    op.add_argument("design", nargs="?")
    return p


def _settings(args: argparse.Namespace, base: AnalysisSettings) -> AnalysisSettings:
    return AnalysisSettings(
        args.heel_step if args.heel_step is not None else base.heel_step_deg,
        args.heel_max if args.heel_max is not None else base.heel_max_deg,
        base.free_trim,
        base.open_boat,
    )


def _lumped_load(args: argparse.Namespace) -> Loads:
    if args.mass is None or args.cg is None:
        raise BadInput("--offsets needs --mass KG and --cg X,Y,Z")
    x, y, z = _lengths(args.cg, 3, "--cg X,Y,Z")
    return Loads(items=(MassItem("lumped load", args.mass, x, y, z),))


def _report(args: argparse.Namespace) -> tuple[Analysis, str]:
    if args.offsets:
        if args.design:
            raise BadInput("give either a design file or --offsets, not both")
        loads = _lumped_load(args)
        rho = water_density(args.water)
        if not limits.MIN_WATER_DENSITY <= rho <= limits.MAX_WATER_DENSITY:
            raise BadInput(
                f"--water {rho:g} kg/m3 is not water (from {limits.MIN_WATER_DENSITY:g} "
                f"to {limits.MAX_WATER_DENSITY:g} kg/m3)"
            )
        settings = _settings(args, AnalysisSettings())
        stations = read_offsets(args.offsets)
        return analyse_stations(stations, loads, rho, settings), Path(args.offsets).stem
    if not args.design:
        raise BadInput("give a design file, or --offsets HULL.csv --mass KG --cg X,Y,Z")
    design = load_design(args.design)
    if args.heel_step is not None or args.heel_max is not None:
        design = replace(design, settings=_settings(args, design.settings))
        design.settings.heel_angles()
    return analyse(design), design.name


def _fmt(v: float | None, digits: int = 3, unit: str = "") -> str:
    if v is None or not math.isfinite(v):
        return "-"
    return f"{v:.{digits}f}{(' ' + unit) if unit else ''}"


def format_report(a: Analysis, name: str, units: str = "si") -> str:
    """Readable text table of an analysis.

    ``units``: "si" (metres, kilograms), "metric" (millimetres, kilograms) or
    "imperial" (inches to 1/16, pounds); angles are always in degrees.
    """
    u = None if units == "si" else system(units)

    def L(v: float | None, digits: int = 3) -> str:  # a length
        if v is None or not math.isfinite(v):
            return "-"
        return f"{v:.{digits}f} m" if u is None else u.length_text(v)

    def M(v: float) -> str:  # a mass
        if not math.isfinite(v):
            return "-"
        return f"{v:.1f} kg" if u is None else u.mass_text(v)

    lines = [f"Hullwright report: {name}", f"Status: {status_sentence(a, u or METRIC)}"]
    if a.curve is not None:
        lines.append(f"{'Floating position':<28}{list_text(a.list_deg)}")
    lines.append("")
    w = a.weights
    lines.append(f"{'Displacement':<28}{M(w.mass)}")
    lines.append(f"{'LCG / TCG':<28}{L(w.lcg)} / {L(w.tcg)}")
    h = a.hydrostatics
    rows: list[tuple[str, str]] = []
    if h is not None:
        trim_words = "level" if abs(h.trim_deg) < 0.005 else (
            f"{abs(h.trim_deg):.2f} deg by the {'bow' if h.trim_deg > 0 else 'stern'}"
        )
        rows += [
            ("Water density", f"{h.water_density:.1f} kg/m3" if u is None else
             f"{h.water_density * u.density_factor:.1f} {u.density}"),
            ("Volume", f"{h.volume:.4f} m3" if u is None else
             f"{u.to_volume(h.volume):.2f} {'L' if u.name == 'metric' else 'ft3'}"),
            ("Draft aft / mid / fore", f"{L(h.draft_aft)} / {L(h.draft_mid)} / {L(h.draft_fore)}"),
            ("Trim", f"{trim_words} ({L(abs(h.trim), 3)} over the length)"),
            ("Least freeboard", f"{L(h.min_freeboard)} at x = {L(h.min_freeboard_x, 2)}"),
            ("KB", L(h.kb)),
            ("BM", L(h.bm)),
            ("KM", L(h.km)),
            ("KG", L(h.kg)),
            ("GM (solid)", L(h.gm_solid)),
            ("Free-surface correction", L(h.fsc)),
            ("GM (upright)", L(h.gm)),
            ("BM_L / GM_L", f"{L(h.bm_l, 2)} / {L(h.gm_l, 2)}"),
            ("LCB / LCF", f"{L(h.lcb)} / {L(h.lcf)}"),
            ("Waterplane area", _fmt(h.waterplane_area, 3, "m2") if u is None else
             f"{u.to_area(h.waterplane_area):.2f} {u.area}"),
            ("LWL x BWL", f"{L(h.lwl)} x {L(h.bwl)}"),
            ("Cb / Cp / Cm / Cwp", f"{_fmt(h.cb)} / {_fmt(h.cp)} / {_fmt(h.cm)} / {_fmt(h.cwp)}"),
            ("Immersion", f"{h.immersion_kg_per_cm:.1f} kg/cm" if u is None or not u.imperial else
             f"{h.immersion_kg_per_cm * 2.54 / 0.45359237:.0f} lb/in"),
            ("Moment to trim 1 cm", f"{h.mct_1cm:.2f} kg m/cm"),
        ]
        if u is not None and u.imperial:
            rows.pop()  # no metric moment unit in an imperial report
    c = a.curve
    if c is not None:
        rows += [
            ("Gunwale under at", _fmt(c.gunwale_immersion_deg, 1, "deg")),
            ("Max GZ", f"{L(c.max_gz)} at {c.max_gz_deg:.1f} deg"),
            (
                "Vanishing stability",
                _fmt(c.avs_deg, 1, "deg") if c.avs_deg is not None
                else f"beyond {c.side * c.last_deg:.0f} deg" if c.list_deg is not None else "-",
            ),
            ("Range from the list", f"{'at least ' if c.range_open else ''}{c.range_deg:.1f} deg"),
        ]
        if u is None:
            rows += [
                ("Area to 30 / 40 deg", f"{_fmt(c.area_30, 4)} / {_fmt(c.area_40, 4)} m rad"),
                ("Area to gunwale", _fmt(c.area_to_gunwale, 4, "m rad")),
            ]
        if c.loll_deg is not None:
            rows.append(("Angle of loll", _fmt(c.loll_deg, 1, "deg")))
    lines += [f"{k:<28}{v}" for k, v in rows]
    if c is not None:
        unit = "m" if u is None else u.length
        lines += ["", f"  heel   {'GZ (' + unit + ')':>10}  {'wall-sided (' + unit + ')':>16}   trim (deg)"]
        step = max(1, int(round(5.0 / max(float(np.diff(c.heel_deg[:2])[0]), 1e-9)))) if c.heel_deg.size > 1 else 1
        for i in range(0, c.heel_deg.size, step):
            gz, ws = (
                (_fmt(c.gz[i], 4), _fmt(c.wall_sided[i], 4)) if u is None
                else (u.length_text(c.gz[i], unit=False), u.length_text(c.wall_sided[i], unit=False))
            )
            lines.append(f"  {c.heel_deg[i]:5.1f}  {gz:>10}  {ws:>16}  {_fmt(c.trim_deg[i], 2):>11}")
    lines += ["", "A design aid, not a certification: wear life jackets, test in shallow water",
              "with helpers, follow the event's rules and local regulations."]
    return "\n".join(lines)


def _heel_dict(c: HeelCheck) -> dict:
    return {
        "title": c.title, "verdict": c.verdict.value, "message": c.message, "moved_mass_kg": c.moved_mass,
        "heeling_arm_at_0_m": c.arm0, "start_heel_deg": c.start_deg, "static_heel_deg": c.static_heel_deg,
        "small_angle_heel_deg": c.small_angle_heel_deg, "low_side_freeboard_m": c.low_freeboard,
        "margins": {
            "share_of_max_righting_arm": c.arm_share,
            "heel_left_before_gunwale_deg": c.heel_left_deg,
            "freeboard_left_m": c.low_freeboard,
            "gunwale_under_at_deg": c.gunwale_deg,
        },
    }


def _crew_numbers(text: str, crew: int) -> list[int]:
    """Indices from "--crew 1,3" (numbered from 1), each once and each aboard."""
    try:
        numbers = [int(v) for v in text.split(",")]
    except ValueError:
        raise BadInput("--crew takes crew numbers from 1, e.g. 1,2") from None
    if len(set(numbers)) != len(numbers):
        raise BadInput("--crew names the same person twice")
    wrong = [n for n in numbers if not 1 <= n <= crew]
    if wrong:
        raise BadInput(f"--crew {wrong[0]}: the design has {crew} crew, numbered from 1")
    return [n - 1 for n in numbers]


def _check_settings(args: argparse.Namespace, design: Design) -> Design:
    """The design with its saved check cases, overridden by the command's options."""
    cs = design.checks
    if args.crew is not None:
        cs = replace(cs, shift_crew=tuple(_crew_numbers(args.crew, len(design.loads.crew))))
    distance = _length(args.distance, "--distance", 0.0, 20.0)
    if distance is not None:
        cs = replace(cs, shift_distance_m=distance, shift_to_gunwale=False)
    if args.gunwale:
        cs = replace(cs, shift_to_gunwale=True)
    if args.boarding_mass is not None:
        cs = replace(cs, boarding_mass_kg=args.boarding_mass)
    target = _length(args.target_gm, "--target-gm", 0.001, 5.0)
    if target is not None:
        cs = replace(cs, target_gm_m=target)
    return replace(design, checks=cs)


def _check(args: argparse.Namespace) -> None:
    design = _check_settings(args, load_design(args.design))
    limits.check_design(design, limits.MAX_CHECK_WORK, "MAX_CHECK_WORK")
    result = assess(design)
    if not result.floats:
        raise BadInput(result.analysis.message)
    shift, board, trims, beam = result.shift, result.boarding, result.trims, result.beam
    rows, swamp = result.whatif, result.swamp
    if args.json:
        out = {
            "status": result.status.value,
            "list_deg": result.list_deg,
            "message": result.analysis.message,
            "crew_shift": None if shift is None else _heel_dict(shift),
            "boarding": None if board is None else _heel_dict(board),
            "level_trim": [
                {"who": t.what, "x_now_m": t.x_before, "x_level_m": t.x_after, "trim_now_deg": t.trim_before_deg,
                 "trim_after_deg": t.trim_after_deg, "freeboard_aft_m": t.freeboard_aft,
                 "freeboard_fore_m": t.freeboard_fore, "message": t.message}
                for t in trims
            ],
            "beam_for_gm": None if beam is None else {
                "target_gm_m": beam.target_gm, "factor": beam.factor, "beam_now_m": beam.beam_before,
                "beam_needed_m": beam.beam_after, "gm_now_m": beam.gm_before, "gm_after_m": beam.gm_after,
                "message": beam.message,
            },
            "sensitivity": [
                {"case": r.case, "displacement_kg": r.displacement, "GM_m": r.gm, "min_freeboard_m": r.min_freeboard,
                 "gunwale_immersion_deg": r.gunwale_immersion_deg, "status": r.status.value,
                 "list_deg": r.list_deg}
                for r in rows
            ],
            "swamping": None if swamp is None else {
                "reserve_buoyancy_kg": swamp.reserve_mass, "reserve_fraction": swamp.reserve_fraction,
                "swamped_net_buoyancy_kg": swamp.swamped_net_buoyancy, "floats_swamped": swamp.floats_swamped,
                "message": swamp.message,
            },
            "problems": list(result.problems),
        }
        print(_json(out))
        return
    lines = [f"Builder's checks: {design.name}", "", f"Status: {result.analysis.message}", ""]
    lines += [c.message for c in (shift, board) if c is not None]
    lines += [t.message for t in trims]
    if beam is not None:
        lines.append(beam.message)
    if rows:
        lines += ["", f"{'case':<28}{'mass kg':>9}{'GM mm':>9}{'freeboard mm':>14}{'gunwale deg':>13}  status"]
    for r in rows:
        lines.append(
            f"{r.case:<28}{_fmt(r.displacement, 1):>9}{_fmt(r.gm and r.gm * 1000, 0):>9}"
            f"{_fmt(r.min_freeboard and r.min_freeboard * 1000, 0):>14}{_fmt(r.gunwale_immersion_deg, 1):>13}"
            f"  {r.status.value}"
        )
    if swamp is not None:
        lines += ["", swamp.message]
    lines += [f"Could not run: {p}" for p in result.problems if p != result.analysis.message]
    print("\n".join(lines))


def _incline(args: argparse.Namespace) -> None:
    design = load_design(args.design)
    readings = read_incline_readings(args.readings)
    freeboards = None
    if args.freeboards:
        aft, fore = _lengths(args.freeboards, 2, "--freeboards AFT,FORE")
        freeboards = (aft, fore)
    res = incline.inclining_test(design, readings, args.mass, freeboards, not args.no_correction)
    if args.json:
        print(_json({
            "GM_m": res.gm, "KM_m": res.km, "KG_m": res.kg, "displacement_kg": res.displacement,
            "predicted_KG_m": res.predicted_kg, "wall_sided_correction": res.corrected,
            "per_reading_GM_m": res.per_reading_gm.tolist(), "warnings": list(res.warnings), "message": res.message,
        }))
        return
    lines = [res.message, "", "  reading   tan(heel)   GM from it (mm)"]
    for i, (t, g) in enumerate(zip(res.tan_heel, res.per_reading_gm), start=1):
        lines.append(f"  {i:7d}   {_fmt(t, 5):>9}   {_fmt(g * 1000, 1):>15}")
    lines += [""] + [f"Warning: {w}" for w in res.warnings]
    print("\n".join(lines).rstrip())


def _offsets(args: argparse.Namespace) -> None:
    check_output(args.output, [args.design])
    design = load_design(args.design)
    spacing, count = _station_choice(args)
    stations = (
        design.stations() if spacing is None and count is None
        else builder_stations(design, spacing, count)
    )
    write_offsets(stations, args.output, [args.design])


def _station_choice(args: argparse.Namespace) -> tuple[float | None, int | None]:
    """--spacing LENGTH or --stations N (the builder's stations), not both."""
    if args.spacing is not None and args.stations is not None:
        raise BadInput("give --spacing or --stations, not both")
    return _length(args.spacing, "--spacing", 0.01, 40.0), args.stations


def _plate(args: argparse.Namespace) -> None:
    out = check_output(args.output, [args.design])
    if out.suffix.lower() not in (".png", ".pdf"):
        raise BadInput("the plate file must end in .png or .pdf")
    if not 72 <= args.dpi <= 600:
        raise BadInput("--dpi must be between 72 and 600")
    design = load_design(args.design)
    limits.check_design(design, limits.MAX_CHECK_WORK, "MAX_CHECK_WORK")  # it shows the checks
    if sys.platform.startswith("linux") and not (
        os.environ.get("DISPLAY") or os.environ.get("WAYLAND_DISPLAY")
    ):
        os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")  # no screen: Qt would abort
    from app.plate import PAPER_SIZES, render_plate_file

    if args.paper.upper() not in {k.upper() for k in PAPER_SIZES}:
        raise BadInput(f"--paper must be one of {', '.join(PAPER_SIZES)}")
    paper = next(k for k in PAPER_SIZES if k.upper() == args.paper.upper())
    spacing, count = _station_choice(args)
    marks = None  # the plate works out the checks' marks itself
    if spacing is not None or count is not None:
        builder_stations(design, spacing, count)  # a bad choice: one line, nothing written
        from dataclasses import replace

        from app.plate import marks_from_assessment
        from hydro.assess import assess

        marks = replace(
            marks_from_assessment(assess(design), system(args.units)),
            station_spacing_m=spacing,
            station_count=count,
        )
    write_via_temp(
        args.output,
        lambda tmp: render_plate_file(
            design, tmp, paper=paper, dpi=args.dpi, units=args.units, source=Path(args.design).name,
            extras=marks,
        ),
        [args.design],
    )


def _resize(args: argparse.Namespace) -> None:
    if args.length is None and args.beam is None and args.depth is None:
        raise BadInput("give at least one of --length, --beam, --depth")
    length = _length(args.length, "--length", 0.3, 40.0)
    beam = _length(args.beam, "--beam", 0.05, 20.0)
    depth = _length(args.depth, "--depth", 0.02, 5.0)
    out = Path(args.output)
    if out.suffix.lower() != ".json":
        raise BadInput("the new design file must end in .json")
    if not out.parent.exists():
        raise BadInput(f"folder {out.parent} does not exist")
    if out.exists() and out.resolve() == Path(args.design).resolve():
        raise BadInput("write the resized design to a new file, not over the original")
    check_output(out, [args.design])
    design = load_design(args.design)
    save_design(resize_design(design, length, beam, depth), out)


_SHEET_UNITS = {"mm": 0.001, "cm": 0.01, "m": 1.0, "in": 0.0254, "ft": 0.3048}


def parse_sheet(text: str) -> tuple[float, float]:
    """Sheet size 'WxH' (mm unless a unit follows: m, cm, in, ft) -> (width, length) m.

    >>> parse_sheet("1220x2440"), parse_sheet("4x8ft")
    ((1.22, 2.44), (1.2192, 2.4384))
    """
    t = text.strip().lower().replace(" ", "").replace("×", "x")
    unit = next((u for u in ("mm", "cm", "in", "ft", "m") if t.endswith(u)), "mm")
    body = t[: len(t) - len(unit)] if t.endswith(unit) else t
    try:
        w, h = (float(v) for v in body.split("x"))
    except ValueError:
        raise BadInput(f"--sheet '{text}': give WxH, e.g. 1220x2440 (mm) or 4x8ft") from None
    if not (math.isfinite(w) and math.isfinite(h) and w > 0 and h > 0):
        raise BadInput(f"--sheet '{text}': the sheet sides must be positive numbers")
    k = _SHEET_UNITS[unit]
    w, h = round(w * k, 6), round(h * k, 6)
    return (min(w, h), max(w, h))


def _pack_settings(args: argparse.Namespace) -> "PackSettings":
    from hydro.build_pack import PackSettings
    from hydro.materials_list import ShoppingSettings

    frames = None
    if args.frames:
        try:
            frames = tuple(float(v) for v in args.frames.split(","))
        except ValueError:
            raise BadInput("--frames must be positions in metres, e.g. 0.6,1.3,2.0") from None
        if not all(math.isfinite(v) for v in frames):
            raise BadInput("--frames must be finite numbers")
    spacing = None
    if args.offset_spacing is not None:
        try:
            spacing = parse_length(args.offset_spacing, "mm", 0.001, 10.0, "--offset-spacing")
        except LengthError as e:
            raise BadInput(str(e)) from None
    return PackSettings(
        sheet_m=parse_sheet(args.sheet),
        margin_m=args.margin / 1000.0,
        kerf_m=args.kerf / 1000.0,
        grain_locked=args.grain == "locked",
        joint=args.joint,
        scarf_ratio=args.scarf_ratio,
        strain_limit=args.strain_limit / 100.0,
        frame_x=frames,
        skin_strips=args.skin_strips,
        offset_spacing_m=spacing,
        shopping=ShoppingSettings(
            tape_roll_m=args.tape_roll,
            paint_coverage_m2_per_l=args.paint_coverage,
            paint_coats=args.coats,
            sheet_price=args.sheet_price,
            tape_roll_price=args.tape_price,
            paint_price_per_l=args.paint_price,
        ),
    )


def _headless_qt() -> None:
    """Paint offscreen when there is no display (a server, a terminal session)."""
    import os

    if not (os.environ.get("DISPLAY") or os.environ.get("WAYLAND_DISPLAY")):
        os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")


def _pack(args: argparse.Namespace) -> None:
    from hydro.build_pack import build_pack, pack_dict
    from hydro.outputs import check_output

    if not (args.output or args.json or args.dxf):
        raise BadInput("pack: give -o PACK.pdf, --dxf DIR or --json")
    papers = ("A4", "A3", "Letter", "Tabloid")
    paper = next((k for k in papers if k.upper() == args.paper.upper()), None)
    if paper is None:
        raise BadInput(f"--paper must be one of {', '.join(papers)}")
    if args.output:
        if Path(args.output).suffix.lower() != ".pdf":
            raise BadInput("the build pack file must end in .pdf")
        check_output(args.output, [args.design])
    if args.dxf and not Path(args.dxf).is_dir():
        raise BadInput(f"--dxf: folder {args.dxf} does not exist")
    settings = _pack_settings(args)
    design = load_design(args.design)
    pack = build_pack(design, settings)
    said: list[str] = []
    if args.output:
        _headless_qt()
        from app.pack_pages import write_pack_pdf

        pages = write_pack_pdf(args.output, design, pack, paper, args.units,
                               Path(args.design).name, [args.design])
        said.append(f"{args.output}: {pages} pages on {paper}")
    if args.dxf:
        from app.pack_dxf import write_sheet_dxfs

        files = write_sheet_dxfs(pack, args.dxf, Path(args.design).stem)
        said.append(f"{args.dxf}: {len(files)} DXF files, one per sheet")
    if args.json:
        print(_json(pack_dict(pack)))
    else:
        bound = sum(lay.lower_bound for _, lay in pack.layouts)
        said.append(f"{len(pack.jobs)} pieces on {pack.sheet_count} sheets (at least {bound})")
        said += [f"warning: {w}" for w in pack.warnings]
        said += [f"note: {n}" for n in pack.notes]
        print("\n".join(said))


def _run(args: argparse.Namespace) -> int:
    if args.command == "report":
        analysis, name = _report(args)
        _refuse_non_finite(analysis)
        if args.json:
            print(_json(report_dict(analysis, name)))
        else:
            print(format_report(analysis, name, args.units))
    elif args.command == "offsets":
        _offsets(args)
    elif args.command == "check":
        _check(args)
    elif args.command == "incline":
        _incline(args)
    elif args.command == "plate":
        _plate(args)
    elif args.command == "resize":
        _resize(args)
    elif args.command == "pack":
        _pack(args)
    elif args.command == "open":
        from app.main import main as gui_main

        return gui_main([args.design] if args.design else [])
    sys.stdout.flush()
    return 0


def _refuse_non_finite(a: Analysis) -> None:
    """A result that overflowed is refused, never printed as a number."""
    limits.check_finite("the displacement", a.weights.mass)
    limits.check_finite("the centre of gravity", a.weights.lcg + a.weights.tcg + a.weights.kg)
    h = a.hydrostatics
    if h is not None:
        limits.check_finite("the draft", h.draft_mid)
        limits.check_finite("the volume", h.volume)


def _json(data: object) -> str:
    """JSON text with any non-finite number written as null (never NaN or Infinity)."""

    def clean(v: object) -> object:
        if isinstance(v, float):
            return v if math.isfinite(v) else None
        if isinstance(v, dict):
            return {k: clean(x) for k, x in v.items()}
        if isinstance(v, (list, tuple)):
            return [clean(x) for x in v]
        if isinstance(v, np.ndarray):
            return clean(v.tolist())
        if isinstance(v, np.floating):
            return clean(float(v))
        return v

    return json.dumps(clean(data), indent=2, allow_nan=False)


def _say(message: str) -> None:
    """One line on stderr, whatever the message holds."""
    line = " ".join(str(message).split()) or "unknown problem"
    try:
        print(f"hullwright: {line}", file=sys.stderr)
    except (OSError, ValueError):
        pass


def _quiet_stdout() -> None:
    """After a closed pipe: point stdout at /dev/null so the exit flush cannot fail."""
    try:
        fd = sys.stdout.fileno()
    except (AttributeError, OSError, ValueError):
        return
    devnull = os.open(os.devnull, os.O_WRONLY)
    os.dup2(devnull, fd)
    os.close(devnull)


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; returns the exit code (0, 2 bad input, 70 unexpected)."""
    try:
        args = _parser().parse_args(argv)
    except SystemExit as e:  # --help (0) or a usage error (2, already said)
        return e.code if isinstance(e.code, int) else EXIT_BAD_INPUT
    keep_freed_memory()
    try:
        return _run(args)
    except BrokenPipeError:
        _quiet_stdout()
        return 0
    except (HullwrightError, BadInput) as e:
        _say(str(e))
    except MemoryError:
        _say("not enough memory for this input; nothing was written")
    except RecursionError:
        _say("the input is nested too deeply; nothing was written")
    except KeyboardInterrupt:
        _say("interrupted; nothing was written")
        return 130
    except Exception as e:  # the boundary: never a traceback
        _say(f"unexpected problem ({type(e).__name__}: {e}); nothing was written - please report it")
        return EXIT_INTERNAL
    return EXIT_BAD_INPUT


if __name__ == "__main__":
    sys.exit(main())
