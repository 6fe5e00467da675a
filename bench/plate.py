"""Print plate speed: prints ``name: value`` lines (milliseconds, medians of several runs).

    python bench/plate.py

Design: sample_hulls/heron-punt.json (41 stations).  ``plate_a3_300dpi_ms`` is the whole
``render_plate_file`` call for a PNG: analysis, layout, painting 4961 x 3508 pixels and
writing the file.  The other lines split it up and time the PDF.
"""

from __future__ import annotations

import os
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))
os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

from PySide6.QtGui import QGuiApplication  # noqa: E402

from app.plate import render_plate_file, render_plate_image  # noqa: E402
from hydro import analyse, load_design  # noqa: E402
from hydro.runtime import keep_freed_memory  # noqa: E402

import timing  # noqa: E402 - bench/timing.py, beside this script


def median_ms(fn) -> float:
    return timing.median_ms(fn, repeat=5, warmup=1)


def main() -> None:
    keep_freed_memory()
    app = QGuiApplication.instance() or QGuiApplication([])  # noqa: F841 (kept alive)
    design = load_design(ROOT / "sample_hulls" / "heron-punt.json")
    analysis = analyse(design)
    with tempfile.TemporaryDirectory() as folder:
        png = Path(folder) / "plate.png"
        pdf = Path(folder) / "plate.pdf"
        results = {
            "plate_a3_300dpi_ms": median_ms(lambda: render_plate_file(design, png, "A3", 300)),
            "plate_a3_300dpi_paint_only_ms": median_ms(
                lambda: render_plate_image(design, "A3", 300, analysis=analysis)
            ),
            "plate_a4_150dpi_ms": median_ms(lambda: render_plate_file(design, png, "A4", 150)),
            "plate_a3_pdf_ms": median_ms(lambda: render_plate_file(design, pdf, "A3")),
        }
        render_plate_file(design, png, "A3", 300)
        results["plate_a3_300dpi_png_kb"] = png.stat().st_size / 1024
    for name, value in results.items():
        print(f"{name}: {value:.0f}")


if __name__ == "__main__":
    main()
