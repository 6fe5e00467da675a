"""App speed: real mouse drags offscreen; prints ``name: value`` lines (milliseconds).

    python bench/drag.py                      # the paper canoe and the raft samples
    python bench/drag.py DESIGN.json ...      # other designs
    python bench/drag.py --all                # every sample
    python bench/drag.py --breakdown          # also: each frame split (analysis, app, paint)

``drag_frame_ms``: median over the mouse moves of a drag of a plan handle on each design
(the frames of all the drags together), from sending the mouse-move event to the end of
the repaint that shows the recomputed readout (event handling, document preview, the
exact analysis, table and plot update, painting of every view that changed).
``drag_frame_p90_ms`` is the 90th percentile.  One line per design gives its own figures.
``release_ms``: from the button release to the repainted figures (the first design).
``startup_ms``: from the first line of this script (before Qt is imported) to the
window shown with its first figures painted; the interpreter's own start is not in it.
``load_average``: the machine's 1-minute load when the script ends (shared machines
give slower, noisier figures under load).

With ``--breakdown`` each design also gets its frames split in three (medians, and the
frames slower than 16 ms one by one): ``analysis`` (time inside the engine's ``analyse``,
with the number of analyses in the frame), ``paint`` (the runs of paint events: Qt's
drawing and pyqtgraph's paint code) and ``app`` (the rest: mouse and scene handling,
signals, views and readout updates); ``gc`` is the time the garbage collector ran in the
frame (already inside the three) and ``cpu`` the CPU time of the whole process (every
thread) in it: above the frame's wall time, a background thread was busy too.
The drag starts once the builder's checks (run in the background after loading) are
done and, as the app starts loading the optional compiled engine when it opens, once
that has loaded (``engine`` says which engine ran and how long the kernels took).
A press that misses the handle (the drag never starts) is retried, and said so.
The button is held for pyqtgraph's ``minDragTime`` before the first move, so that move
(not counted) starts the drag; a counted move whose repaint does not come within 5 s
is still counted and named on a ``stalled_frames`` line (before, the first moves of a
drag waited out that timeout when they fell short of the 5 px drag threshold).
"""

from __future__ import annotations

import time

T0 = time.perf_counter()

import gc  # noqa: E402
import os  # noqa: E402
import statistics  # noqa: E402
import sys  # noqa: E402
import tempfile  # noqa: E402
from pathlib import Path  # noqa: E402

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))
os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
_settings_dir = tempfile.mkdtemp(prefix="hullwright-bench-")
os.environ["HULLWRIGHT_SETTINGS"] = str(Path(_settings_dir) / "settings.ini")
if "XDG_RUNTIME_DIR" not in os.environ:
    os.environ["XDG_RUNTIME_DIR"] = _settings_dir

from PySide6.QtCore import QEvent, QObject, QPoint, QPointF, Qt  # noqa: E402
from PySide6.QtTest import QTest  # noqa: E402
from PySide6.QtWidgets import QApplication  # noqa: E402

import pyqtgraph as pg  # noqa: E402

from hydro.runtime import keep_freed_memory  # noqa: E402

import app.document  # noqa: E402
from app.main import create_window  # noqa: E402
from hydro import compiled  # noqa: E402

SAMPLES = Path(__file__).resolve().parents[1] / "sample_hulls"
DEFAULT = (SAMPLES / "paper-loon-canoe.json", SAMPLES / "drift-lab-raft.json")
MOVES = 59
SKIP = 1  # frames not counted: the first move starts the drag


class PaintCounter(QObject):
    """Counts paint events of the widgets it watches."""

    def __init__(self) -> None:
        super().__init__()
        self.count = 0

    def eventFilter(self, watched, event) -> bool:
        if event.type() == QEvent.Type.Paint:
            self.count += 1
        return False


class Breakdown(QObject):
    """Splits each frame into engine analysis, painting and the rest (``--breakdown``).

    Wraps the document's ``analyse``, watches every paint event of the application and
    times the garbage collector.  :meth:`start` before a frame, :meth:`stop` after it.
    """

    def __init__(self) -> None:
        super().__init__()
        self.frames: list[dict[str, float]] = []
        self._analyse = app.document.analyse
        app.document.analyse = self._timed_analyse
        QApplication.instance().installEventFilter(self)
        gc.callbacks.append(self._on_gc)
        self._gc_start = 0.0
        self.start()

    def start(self) -> None:
        self._start = time.perf_counter()
        self._cpu = time.process_time()
        self._analysis = self._gc = self._paint = 0.0
        self._analyses = 0
        self._paint_start: float | None = None

    def _timed_analyse(self, *args, **kwargs):
        t = time.perf_counter()
        try:
            return self._analyse(*args, **kwargs)
        finally:
            self._analysis += time.perf_counter() - t
            self._analyses += 1

    def _on_gc(self, phase: str, info: dict) -> None:
        if phase == "start":
            self._gc_start = time.perf_counter()
        else:
            self._gc += time.perf_counter() - self._gc_start

    def eventFilter(self, watched, event) -> bool:
        """Paint events come in runs (one repaint of the window): each run is timed up
        to the next event of another kind."""
        if event.type() == QEvent.Type.Paint:
            if self._paint_start is None:
                self._paint_start = time.perf_counter()
        elif self._paint_start is not None:
            self._paint += time.perf_counter() - self._paint_start
            self._paint_start = None
        return False

    def stop(self) -> None:
        end = time.perf_counter()
        if self._paint_start is not None:
            self._paint += end - self._paint_start
        total = end - self._start
        self.frames.append({
            "total": 1000 * total,
            "analysis": 1000 * self._analysis,
            "paint": 1000 * self._paint,
            "app": 1000 * (total - self._analysis - self._paint),
            "gc": 1000 * self._gc,
            "cpu": 1000 * (time.process_time() - self._cpu),
            "analyses": self._analyses,
        })

    def close(self) -> None:
        app.document.analyse = self._analyse
        QApplication.instance().removeEventFilter(self)
        gc.callbacks.remove(self._on_gc)

    def report(self, name: str, skip: int) -> list[str]:
        """Lines for one design: the medians, then each frame slower than 16 ms."""
        frames = self.frames[skip:]
        med = {k: statistics.median(f[k] for f in frames) for k in frames[0]}
        lines = [
            f"breakdown[{name}]: analysis {med['analysis']:.1f}  app {med['app']:.1f}  "
            f"paint {med['paint']:.1f}  (gc {med['gc']:.1f}, cpu {med['cpu']:.1f}; medians, ms)"
        ]
        for i, f in enumerate(frames, start=skip):
            if f["total"] > 16.0:
                lines.append(
                    f"  slow frame {i}: {f['total']:.1f} = analysis {f['analysis']:.1f} "
                    f"({f['analyses']:.0f} analyses) + app {f['app']:.1f} + paint {f['paint']:.1f}"
                    f"  (gc {f['gc']:.1f}, cpu {f['cpu']:.1f})"
                )
        return lines


def settle(window, painted: PaintCounter, before: int, limit_s: float = 5.0) -> bool:
    """Run the event loop until the analysis is in and the readout plot has repainted;
    False if that did not happen within ``limit_s``."""
    doc = window.document
    end = time.perf_counter() + limit_s
    while doc.analysis_pending or painted.count == before:
        if time.perf_counter() >= end:
            return False
        QApplication.processEvents()
    return True


def pixel(plot, x: float, y: float) -> QPoint:
    return plot.mapFromScene(plot.getViewBox().mapViewToScene(QPointF(x, y)))


def run(path: Path, breakdown: bool = False) -> dict | None:
    # a fresh settings file per window, so no run inherits another's layout
    os.environ["HULLWRIGHT_SETTINGS"] = tempfile.mkstemp(prefix="hullwright-bench-", suffix=".ini")[1]
    window, error = create_window([str(path)])
    if error:
        raise SystemExit(f"drag.py: {error}")
    window.show()
    gz_painted = PaintCounter()
    window.results.gz_plot.viewport().installEventFilter(gz_painted)
    settle(window, gz_painted, 0)
    shown = time.perf_counter()
    window.checks.wait()  # the builder's checks run in the background after loading
    window.build_view.wait()  # and the build pack, when its tab is the one showing
    compiled.warm_up(wait=True)  # steady state: the kernels the app loads as it opens
    window.fit_all()
    QApplication.processEvents()

    plot = window.plan_view.plot
    viewport = plot.viewport()
    hull = window.document.committed.hull
    index = max(range(len(hull.plan.points)), key=lambda i: hull.plan.points[i][1])
    x, b = hull.plan.points[index]
    start = pixel(plot, x, b)
    QTest.mousePress(viewport, Qt.MouseButton.LeftButton, Qt.KeyboardModifier.NoModifier, start)
    # pyqtgraph starts a drag after 5 px, or on any move once the button has been held
    # for its minDragTime: hold it that long, so the first move (not counted) starts it
    held = time.perf_counter() + plot.scene().minDragTime + 0.05
    while time.perf_counter() < held:
        QApplication.processEvents()
    frames, stalled = [], []
    split = Breakdown() if breakdown else None
    for i in range(1, MOVES + 1):
        offset = 30 - abs(30 - i)  # one pixel a move: out 30 px, then back to 0 and out again
        before = gz_painted.count
        if split:
            split.start()
        t = time.perf_counter()
        end = QPoint(start.x(), start.y() - offset)
        QTest.mouseMove(viewport, end)
        if not settle(window, gz_painted, before):
            stalled.append(i - 1)
        frames.append(time.perf_counter() - t)
        if split:
            split.stop()
        if i == 8 and not window.document.is_previewing:  # the press missed the handle
            QTest.mouseRelease(viewport, Qt.MouseButton.LeftButton, Qt.KeyboardModifier.NoModifier, end)
            window.close()
            return None
    if split:
        split.close()
    before = gz_painted.count
    t = time.perf_counter()
    QTest.mouseRelease(viewport, Qt.MouseButton.LeftButton, Qt.KeyboardModifier.NoModifier, end)
    settle(window, gz_painted, before)
    release = time.perf_counter() - t
    assert window.document.undo_stack.count() == 1, "the drag did not register"
    frames = frames[SKIP:]  # the first move starts the drag
    stalled = [i for i in stalled if i >= SKIP]
    window.document.undo_stack.setClean()
    window.checks.wait()  # the release restarted the background jobs: let them end
    window.build_view.wait()  # before the next design's drag
    window.close()
    return {
        "shown": shown,
        "frames": frames,
        "drag_frame_ms": 1000 * statistics.median(frames),
        "drag_frame_p90_ms": 1000 * statistics.quantiles(frames, n=10)[-1],
        "release_ms": 1000 * release,
        "stalled": stalled,
        "breakdown": split.report(path.stem, SKIP) if split else [],
    }


def main() -> None:
    args = [a for a in sys.argv[1:] if not a.startswith("--")]
    qt_app = QApplication.instance() or QApplication([sys.argv[0]])
    qt_app.setStyle("Fusion")
    pg.setConfigOptions(antialias=True)  # as the app
    keep_freed_memory()
    compiled.warm_up()  # as the app does when it opens
    if "--all" in sys.argv:
        paths = sorted(SAMPLES.glob("*.json"))
    else:
        paths = [Path(a) for a in args] if args else list(DEFAULT)
    results, retries = [], 0
    for path in paths:
        for _ in range(3):
            result = run(path, "--breakdown" in sys.argv)
            if result is not None:
                break
            retries += 1
        if result is None:
            raise SystemExit(f"drag.py: the press never caught the handle on {path.name}")
        results.append(result)
    startup_ms = 1000 * (results[0]["shown"] - T0)
    frames = [f for r in results for f in r["frames"]]
    for path, r in zip(paths, results):
        print(
            f"drag_frame_ms[{path.stem}]: {r['drag_frame_ms']:.1f}  "
            f"(p90 {r['drag_frame_p90_ms']:.1f}, release {r['release_ms']:.1f})"
        )
    for r in results:
        for line in r["breakdown"]:
            print(line)
    for path, r in zip(paths, results):
        if r["stalled"]:  # counted as they came: a stall is a fault to find, not to hide
            print(
                f"stalled_frames[{path.stem}]: {', '.join(map(str, r['stalled']))} "
                "(no repaint within 5 s of the move; counted as measured)"
            )
    print(f"designs: {', '.join(p.name for p in paths)}")
    print(f"drag_frame_ms: {1000 * statistics.median(frames):.1f}")
    print(f"drag_frame_p90_ms: {1000 * statistics.quantiles(frames, n=10)[-1]:.1f}")
    print(f"release_ms: {results[0]['release_ms']:.1f}")
    print(f"startup_ms: {startup_ms:.0f}")
    print(f"engine: {compiled.status()}")
    if retries:
        print(f"missed_presses_retried: {retries}")
    print(f"load_average: {os.getloadavg()[0]:.2f}")


if __name__ == "__main__":
    main()
