"""One DXF file per stock sheet for CNC routers and laser cutters (ezdxf).

Coordinates in millimetres ($INSUNITS = mm), origin at a sheet corner, X along the
sheet's length.  Layers: CUT (piece outlines), MARK (station lines, waterlines and seats
to scribe or pen), TEXT (piece labels), SHEET (the stock sheet's edge, for reference).
"""

from __future__ import annotations

import re
from pathlib import Path

import ezdxf
import numpy as np
import shapely
from ezdxf import units

from hydro.build_pack import BuildPack
from hydro.errors import HullwrightError
from hydro.outputs import write_via_temp

__all__ = ["write_sheet_dxfs", "LAYERS"]

#: Layer name -> DXF colour index (7 white/black, 1 red, 5 blue).
LAYERS = {"CUT": 7, "MARK": 1, "TEXT": 5, "SHEET": 8}


def _slug(text: str) -> str:
    return re.sub(r"[^a-z0-9]+", "-", text.lower()).strip("-")[:40] or "sheet"


def _sheet_document(pack: BuildPack, layout_name: str, sheet_index: int) -> ezdxf.document.Drawing:
    layout = dict(pack.layouts)[layout_name]
    sheet = layout.sheets[sheet_index]
    doc = ezdxf.new("R2010", setup=True, units=units.MM)
    for name, colour in LAYERS.items():
        doc.layers.add(name, color=colour)
    msp = doc.modelspace()
    mm = 1000.0
    msp.add_lwpolyline(
        [(0, 0), (sheet.length * mm, 0), (sheet.length * mm, sheet.width * mm),
         (0, sheet.width * mm)],
        close=True,
        dxfattribs={"layer": "SHEET"},
    )
    jobs = {j.piece.name: j for j in pack.jobs}
    for pl in sheet.placements:
        ring = np.asarray(pl.polygon.exterior.coords)[:-1] * mm
        msp.add_lwpolyline([tuple(p) for p in ring], close=True, dxfattribs={"layer": "CUT"})
        job = jobs.get(pl.piece.name)
        if job is not None and pl.piece.in_piece_frame:
            for mark in job.piece.marks:
                if mark.role not in ("station", "line"):
                    continue
                drawn = shapely.LineString(pl.to_sheet(mark.points))
                line = shapely.intersection(drawn, pl.polygon)
                for seg in shapely.get_parts(line):
                    if seg.geom_type == "LineString" and seg.length > 1e-4:
                        pts = [tuple(p) for p in np.asarray(seg.coords) * mm]
                        msp.add_lwpolyline(pts, dxfattribs={"layer": "MARK"})
        c = pl.polygon.centroid
        text = msp.add_text(pl.piece.label, height=12.0, dxfattribs={"layer": "TEXT"})
        middle = ezdxf.enums.TextEntityAlignment.MIDDLE_CENTER
        text.set_placement((c.x * mm, c.y * mm), align=middle)
    return doc


def write_sheet_dxfs(pack: BuildPack, folder: str | Path, stem: str) -> list[Path]:
    """Write ``<stem>-sheet-NN-<material>.dxf`` for every sheet into ``folder``.

    Raises
    ------
    HullwrightError
        If the folder does not exist or a file cannot be written.
    """
    out = Path(folder)
    if not out.is_dir():
        raise HullwrightError(f"--dxf: folder {out} does not exist")
    written = []
    number = 1
    for name, layout in pack.layouts:
        for k in range(len(layout.sheets)):
            doc = _sheet_document(pack, name, k)
            path = out / f"{_slug(stem)}-sheet-{number:02d}-{_slug(name)}.dxf"
            write_via_temp(path, lambda tmp, d=doc: d.saveas(tmp))
            written.append(path)
            number += 1
    return written
