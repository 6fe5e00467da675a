"""Start the desktop app: ``main(argv)`` opens the given design or the first sample."""

from __future__ import annotations

import gc

import sys
from pathlib import Path
from typing import Sequence

from PySide6.QtWidgets import QApplication

import pyqtgraph as pg  # noqa: E402 - PySide6 first, so pyqtgraph binds to it

from hydro import HullwrightError, load_design
from hydro import compiled
from hydro.runtime import keep_freed_memory

from app.document import HullDocument, starter_design
from app.main_window import MainWindow, icon, sample_paths
from app.settings import open_settings

__all__ = ["main", "create_window"]


def create_window(argv: Sequence[str]) -> tuple[MainWindow, str]:
    """The main window on the design named in ``argv`` (or the first sample).

    A file that cannot be opened, for whatever reason, gives a new design and the
    message.  Returns the window and an error message ("" if the file opened).
    """
    error = ""
    design, path = None, None
    if argv:
        try:
            design, path = load_design(argv[0]), Path(argv[0]).resolve()
        except Exception as e:  # the boundary: start anyway, say why
            error = str(e) if isinstance(e, HullwrightError) else f"{type(e).__name__}: {e}"
            design = starter_design()
    if design is None:
        samples = sample_paths()
        try:
            design = load_design(samples[0]) if samples else starter_design()
        except HullwrightError:
            design = starter_design()
    window = MainWindow(HullDocument(design, path), open_settings())
    # everything built so far lives as long as the window: keep it out of the collector's
    # full passes, which otherwise scan it all (about 0.1 s) in the middle of a drag
    gc.freeze()
    return window, error


def _shown_in_words(window: MainWindow):
    """The last boundary: an exception that escapes a slot is shown in a message (and one
    line on stderr); the window and its design stay as they are."""

    def hook(kind, error, _traceback) -> None:
        if issubclass(kind, KeyboardInterrupt):
            QApplication.quit()
            return
        words = str(error) if isinstance(error, HullwrightError) else f"{kind.__name__}: {error}"
        print(f"hullwright: unexpected problem: {words}", file=sys.stderr)
        window.show_message("Something went wrong", f"{words}\n\nThe design on screen is kept; save it.")

    return hook


def main(argv: Sequence[str] | None = None) -> int:
    """Run Hullwright; returns the exit code."""
    args = list(sys.argv[1:] if argv is None else argv)
    app = QApplication.instance() or QApplication([sys.argv[0], *args])
    app.setStyle("Fusion")
    app.setApplicationName("Hullwright")
    app.setWindowIcon(icon("hullwright"))
    pg.setConfigOptions(antialias=True)
    keep_freed_memory()
    compiled.warm_up()  # the optional compiled engine loads while the window opens
    window, error = create_window(args)
    window.show()
    sys.excepthook = _shown_in_words(window)
    if error:
        window.show_message("Could not open the file", f"{error}\n\nStarting with a new design instead.")
    window.offer_recovery()
    window.show_first_run_notice()
    return app.exec()


if __name__ == "__main__":
    sys.exit(main())
