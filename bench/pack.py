"""Build pack speed: prints ``name: value`` lines (milliseconds, medians of several runs).

    python bench/pack.py

Design: sample_hulls/heron-punt.json.  ``pack_json_ms`` is what ``hullwright pack
--json`` does after reading the file: develop the panels, ends and frames, plan the
joints, lay out the sheets, list the materials and build the JSON text.
``pack_pdf_ms`` is the same plus writing the whole PDF (plate page, cut list, piece
pages, sheet layouts, materials list and every full-size page) on A4.  Targets:
1500 ms and 5000 ms.
"""

from __future__ import annotations

import json
import os
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))
os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

from PySide6.QtGui import QGuiApplication  # noqa: E402

from app.pack_pages import write_pack_pdf  # noqa: E402
from hydro import load_design  # noqa: E402
from hydro.build_pack import build_pack, pack_dict  # noqa: E402
from hydro.runtime import keep_freed_memory  # noqa: E402

import timing  # noqa: E402 - bench/timing.py, beside this script


def main() -> None:
    keep_freed_memory()
    app = QGuiApplication.instance() or QGuiApplication([])  # noqa: F841 (kept alive)
    design = load_design(ROOT / "sample_hulls" / "heron-punt.json")

    def pack_json() -> str:
        return json.dumps(pack_dict(build_pack(design)))

    print(f"pack_json_ms: {timing.median_ms(pack_json, repeat=5, warmup=1):.0f}")
    with tempfile.TemporaryDirectory() as folder:
        out = Path(folder) / "pack.pdf"
        pages = write_pack_pdf(out, design, build_pack(design), "A4")

        def pack_pdf() -> None:
            write_pack_pdf(out, design, build_pack(design), "A4")

        print(f"pack_pdf_ms: {timing.median_ms(pack_pdf, repeat=3, warmup=1):.0f}")
        print(f"pack_pdf_pages: {pages}")
        print(f"pack_pdf_kb: {out.stat().st_size / 1024:.0f}")


if __name__ == "__main__":
    main()
