"""The ``hullwright`` command line: report, offsets, plate, open.

Every bad input ends with a one-line message on stderr and exit code 2, and nothing is
written.  Only ``plate`` and ``open`` load Qt.
"""

from __future__ import annotations

import argparse
import json
import math
import sys
from pathlib import Path
from typing import Sequence

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
    write_offsets,
)
from hydro.loads import water_density
from hydro.runtime import keep_freed_memory
from hydro.stability import Analysis

EXIT_BAD_INPUT = 2


class BadInput(Exception):
    """A problem with what the user asked for (message shown as is)."""


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="hullwright",
        description="Hydrostatics and stability of small hand-built boats. "
        "A design aid, not a certification.",
    )
    sub = p.add_subparsers(dest="command", required=True)
    r = sub.add_parser("report", help="print the hydrostatics and righting-arm curve")
    r.add_argument("design", nargs="?", help="design file (.json)")
    r.add_argument("--offsets", help="analyse a table of offsets (.csv) instead of a design")
    r.add_argument("--mass", type=float, help="with --offsets: total mass in kg")
    r.add_argument("--cg", help="with --offsets: centre of gravity X,Y,Z in metres")
    r.add_argument("--water", default="fresh", help="fresh, sea or a density in kg/m3")
    r.add_argument("--heel-step", type=float, help="heel step in degrees (default 1)")
    r.add_argument("--heel-max", type=float, help="largest heel in degrees (default 90)")
    r.add_argument("--json", action="store_true", help="print SI values as JSON")
    o = sub.add_parser("offsets", help="write the table of offsets of a design as CSV")
    o.add_argument("design")
    o.add_argument("-o", "--output", required=True, help="CSV file to write")
    pl = sub.add_parser("plate", help="render the print plate (PNG or PDF)")
    pl.add_argument("design")
    pl.add_argument("-o", "--output", required=True, help="PLATE.png or PLATE.pdf")
    pl.add_argument("--paper", default="A3", help="A4, A3, Letter or Tabloid (landscape)")
    pl.add_argument("--dpi", type=int, default=300, help="PNG resolution (72 to 600)")
    pl.add_argument("--units", default="metric", choices=["metric", "imperial"])
    op = sub.add_parser("open", help="open the desktop app")
    op.add_argument("design", nargs="?")
    return p


def _settings(args: argparse.Namespace, base: AnalysisSettings) -> AnalysisSettings:
    return AnalysisSettings(
        args.heel_step if args.heel_step is not None else base.heel_step_deg,
        args.heel_max if args.heel_max is not None else base.heel_max_deg,
        base.free_trim,
    )


def _lumped_load(args: argparse.Namespace) -> Loads:
    if args.mass is None or args.cg is None:
        raise BadInput("--offsets needs --mass KG and --cg X,Y,Z")
    if not math.isfinite(args.mass) or args.mass <= 0:
        raise BadInput("--mass must be a positive number of kilograms")
    try:
        x, y, z = (float(v) for v in args.cg.split(","))
    except ValueError:
        raise BadInput("--cg must be three numbers X,Y,Z in metres, e.g. 1.2,0,0.3") from None
    if not all(math.isfinite(v) for v in (x, y, z)):
        raise BadInput("--cg must be finite numbers")
    return Loads(items=(MassItem("lumped load", args.mass, x, y, z),))


def _report(args: argparse.Namespace) -> tuple[Analysis, str]:
    if args.offsets:
        if args.design:
            raise BadInput("give either a design file or --offsets, not both")
        loads = _lumped_load(args)
        rho = water_density(args.water)
        settings = _settings(args, AnalysisSettings())
        stations = read_offsets(args.offsets)
        return analyse_stations(stations, loads, rho, settings), Path(args.offsets).stem
    if not args.design:
        raise BadInput("give a design file, or --offsets HULL.csv --mass KG --cg X,Y,Z")
    design = load_design(args.design)
    if args.heel_step is not None or args.heel_max is not None:
        from dataclasses import replace

        design = replace(design, settings=_settings(args, design.settings))
        design.settings.heel_angles()
    return analyse(design), design.name


def _fmt(v: float | None, digits: int = 3, unit: str = "") -> str:
    if v is None or not math.isfinite(v):
        return "-"
    return f"{v:.{digits}f}{(' ' + unit) if unit else ''}"


def format_report(a: Analysis, name: str) -> str:
    """Readable text table of an analysis (metres, kilograms, degrees)."""
    lines = [f"Hullwright report: {name}", f"Status: {a.message}", ""]
    w = a.weights
    lines.append(f"{'Displacement':<28}{w.mass:.1f} kg")
    lines.append(f"{'LCG / TCG':<28}{w.lcg:.3f} / {w.tcg:.3f} m")
    h = a.hydrostatics
    rows: list[tuple[str, str]] = []
    if h is not None:
        rows += [
            ("Water density", f"{h.water_density:.1f} kg/m3"),
            ("Volume", f"{h.volume:.4f} m3"),
            ("Draft aft / mid / fore", f"{h.draft_aft:.3f} / {h.draft_mid:.3f} / {h.draft_fore:.3f} m"),
            ("Trim (+ bow down)", f"{h.trim_deg:.2f} deg ({h.trim * 1000:.0f} mm)"),
            ("Least freeboard", f"{h.min_freeboard:.3f} m at x = {h.min_freeboard_x:.2f} m"),
            ("KB", _fmt(h.kb, 3, "m")),
            ("BM", _fmt(h.bm, 3, "m")),
            ("KM", _fmt(h.km, 3, "m")),
            ("KG", _fmt(h.kg, 3, "m")),
            ("GM (solid)", _fmt(h.gm_solid, 3, "m")),
            ("Free-surface correction", _fmt(h.fsc, 3, "m")),
            ("GM", _fmt(h.gm, 3, "m")),
            ("BM_L / GM_L", f"{h.bm_l:.2f} / {h.gm_l:.2f} m"),
            ("LCB / LCF", f"{h.lcb:.3f} / {h.lcf:.3f} m"),
            ("Waterplane area", _fmt(h.waterplane_area, 3, "m2")),
            ("LWL x BWL", f"{h.lwl:.3f} x {h.bwl:.3f} m"),
            ("Cb / Cp / Cm / Cwp", f"{_fmt(h.cb)} / {_fmt(h.cp)} / {_fmt(h.cm)} / {_fmt(h.cwp)}"),
            ("Immersion", f"{h.immersion_kg_per_cm:.1f} kg/cm"),
            ("Moment to trim 1 cm", f"{h.mct_1cm:.2f} kg m/cm"),
        ]
    c = a.curve
    if c is not None:
        rows += [
            ("Gunwale under at", _fmt(c.gunwale_immersion_deg, 1, "deg")),
            ("Max GZ", f"{_fmt(c.max_gz, 3, 'm')} at {c.max_gz_deg:.0f} deg"),
            ("Vanishing stability", _fmt(c.avs_deg, 1, "deg") if c.avs_deg is not None else f"beyond {c.heel_deg[-1]:.0f} deg"),
            ("Area to 30 / 40 deg", f"{_fmt(c.area_30, 4)} / {_fmt(c.area_40, 4)} m rad"),
            ("Area to gunwale", _fmt(c.area_to_gunwale, 4, "m rad")),
        ]
        if c.loll_deg is not None:
            rows.append(("Angle of loll", _fmt(c.loll_deg, 1, "deg")))
    lines += [f"{k:<28}{v}" for k, v in rows]
    if c is not None:
        lines += ["", "  heel   GZ (m)  wall-sided (m)   trim (deg)"]
        step = max(1, int(round(5.0 / max(float(np.diff(c.heel_deg[:2])[0]), 1e-9)))) if c.heel_deg.size > 1 else 1
        for i in range(0, c.heel_deg.size, step):
            lines.append(
                f"  {c.heel_deg[i]:5.1f}  {_fmt(c.gz[i], 4):>7}  {_fmt(c.wall_sided[i], 4):>14}  {_fmt(c.trim_deg[i], 2):>11}"
            )
    lines += ["", "A design aid, not a certification: wear life jackets, test in shallow water",
              "with helpers, follow the event's rules and local regulations."]
    return "\n".join(lines)


def _offsets(args: argparse.Namespace) -> None:
    out = Path(args.output)
    if not out.parent.exists():
        raise BadInput(f"folder {out.parent} does not exist")
    stations = load_design(args.design).stations()
    write_offsets(stations, out)


def _plate(args: argparse.Namespace) -> None:
    out = Path(args.output)
    if out.suffix.lower() not in (".png", ".pdf"):
        raise BadInput("the plate file must end in .png or .pdf")
    if not out.parent.exists():
        raise BadInput(f"folder {out.parent} does not exist")
    if not 72 <= args.dpi <= 600:
        raise BadInput("--dpi must be between 72 and 600")
    design = load_design(args.design)
    from app.plate import PAPER_SIZES, render_plate_file

    if args.paper.upper() not in {k.upper() for k in PAPER_SIZES}:
        raise BadInput(f"--paper must be one of {', '.join(PAPER_SIZES)}")
    paper = next(k for k in PAPER_SIZES if k.upper() == args.paper.upper())
    render_plate_file(design, out, paper=paper, dpi=args.dpi, units=args.units, source=Path(args.design).name)


def main(argv: Sequence[str] | None = None) -> int:
    args = _parser().parse_args(argv)
    keep_freed_memory()
    try:
        if args.command == "report":
            analysis, name = _report(args)
            if args.json:
                print(json.dumps(report_dict(analysis, name), indent=2, allow_nan=False))
            else:
                print(format_report(analysis, name))
        elif args.command == "offsets":
            _offsets(args)
        elif args.command == "plate":
            _plate(args)
        elif args.command == "open":
            from app.main import main as gui_main

            return gui_main([args.design] if args.design else [])
    except (HullwrightError, BadInput) as e:
        print(f"hullwright: {e}", file=sys.stderr)
        return EXIT_BAD_INPUT
    return 0


if __name__ == "__main__":
    sys.exit(main())
