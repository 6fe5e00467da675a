"""The compiled kernels (numba, optional) against the numpy reference in hydro.sections.

The numpy cut is the reference (itself checked against shapely in test_sections.py);
the compiled one must give the same fields to 1e-9 of each field's size on the samples,
a Wigley form and the awkward cases, and a whole analysis the same GZ to 1e-9 m.
Without numba these tests skip; the engine switch is checked either way.
"""

from __future__ import annotations

import importlib
import os
import shutil
import subprocess
import sys
import zlib

import numpy as np
import pytest

from hydro import compiled, load_design
from hydro.analytic import twin_tubes, wigley
from hydro.design import analyse
from hydro.hull import Stations
from hydro.sections import (
    Cut, SectionTable, build_section_table, cut_compiled, cut_numpy, heel_frame,
)
from tests.hydro.helpers import run
from tests.paths import ROOT, SAMPLES

try:
    import numba  # noqa: F401
except ImportError:
    HAVE_NUMBA = False
else:
    HAVE_NUMBA = True
needs_numba = pytest.mark.skipif(
    not HAVE_NUMBA, reason="numba is not installed (the optional 'fast' extra)"
)
FIELDS = ("area", "q_xi", "q_eta", "breadth", "breadth_m1", "breadth_m2")
SAMPLE_NAMES = sorted(p.stem for p in SAMPLES.glob("*.json"))
# half sections of different point counts: padded to one vertex count
PADDED = (
    np.array([[0, 0], [0.5, 0], [0.5, 0.4]]),
    np.array([[0, 0], [0.3, 0.02], [0.45, 0.1], [0.5, 0.25], [0.52, 0.4]]),
    np.array([[0, 0.5], [0.3, 0.5], [0.3, 0.1], [0.45, 0], [0.6, 0.1], [0.6, 0.6]]),
    np.array([[0, 0.05], [0.2, 0.0], [0.4, 0.1], [0.45, 0.3], [0.4, 0.45], [0.42, 0.5],
              [0.44, 0.55], [0.46, 0.6]]),
)


@pytest.fixture(scope="module")
def kernels():
    if not HAVE_NUMBA:
        pytest.skip("numba is not installed (the optional 'fast' extra)")
    return importlib.import_module("hydro.cut_kernels")


@pytest.fixture
def restore_engine():
    before = compiled.engine_name()
    yield
    compiled.select(before)


def _tables() -> dict[str, SectionTable]:
    tables = {
        name: build_section_table(load_design(SAMPLES / f"{name}.json").stations())
        for name in SAMPLE_NAMES
    }
    tables["wigley"] = build_section_table(wigley(4.0, 0.5, 0.2, 0.4, stations=41, points=33))
    tables["twin tubes"] = build_section_table(twin_tubes(3.0, 0.2, 1.2, points=41, stations=5))
    tables["padded"] = build_section_table(Stations(np.arange(4.0), PADDED))
    return tables


TABLES = _tables()


def _assert_same(got: Cut, want: Cut, full: bool = True) -> None:
    for name in FIELDS if full else ("area", "q_eta", "breadth"):
        a, b = getattr(got, name), getattr(want, name)
        scale = max(1.0, float(np.max(np.abs(b), initial=0.0)))
        np.testing.assert_allclose(a, b, rtol=0, atol=1e-9 * scale, err_msg=name)


def _levels(table: SectionTable, phi: np.ndarray, rng: np.random.Generator) -> np.ndarray:
    """(A, S) random waterlines: from below the lowest to above the highest vertex."""
    frame = heel_frame(table, phi)
    low = frame.eta.min(axis=2)
    high = frame.eta.max(axis=2)
    span = high - low + 1e-3
    return low - 0.1 * span + 1.2 * span * rng.random(low.shape)


@needs_numba
@pytest.mark.parametrize("name", list(TABLES))
def test_random_heels_and_waterlines_agree(kernels, name):
    table = TABLES[name]
    rng = np.random.default_rng(zlib.crc32(name.encode()))
    phi = np.radians(np.concatenate([[0.0, 90.0, -90.0, 180.0], rng.uniform(-180, 180, 40)]))
    h = _levels(table, phi, rng)
    frame = heel_frame(table, phi)
    for full in (True, False):
        _assert_same(cut_compiled(kernels, table, frame, h, full),
                     cut_numpy(table, frame, h, full), full)


@needs_numba
@pytest.mark.parametrize("name", list(TABLES))
def test_waterline_exactly_through_vertices(kernels, name):
    table = TABLES[name]
    rng = np.random.default_rng(7)
    phi = np.radians([0.0, 12.0, 45.0, -30.0])
    frame = heel_frame(table, phi)
    eta = frame.eta
    pick = rng.integers(0, eta.shape[2], size=eta.shape[:2])
    on_vertex = np.take_along_axis(eta, pick[:, :, None], axis=2)[:, :, 0]
    for h in (on_vertex, eta.min(axis=2), eta.max(axis=2)):
        _assert_same(cut_compiled(kernels, table, frame, h), cut_numpy(table, frame, h))


@needs_numba
def test_fully_dry_and_fully_immersed_stations(kernels):
    table = TABLES["wigley"]
    phi = np.radians([0.0, 25.0, 70.0])
    frame = heel_frame(table, phi)
    high = np.tile(frame.eta_high[:, None] + 1.0, (1, table.x.size))
    low = np.tile(frame.eta_low[:, None] - 1.0, (1, table.x.size))
    mixed = np.where(np.arange(table.x.size) % 2 == 0, high, low)
    wet = cut_compiled(kernels, table, frame, high)
    np.testing.assert_allclose(wet.area, np.broadcast_to(table.totals[0], wet.area.shape),
                               rtol=0, atol=1e-12)
    assert not np.any(cut_compiled(kernels, table, frame, low).area)
    for h in (high, low, mixed):
        _assert_same(cut_compiled(kernels, table, frame, h), cut_numpy(table, frame, h))


@needs_numba
def test_twin_hull_sections_cut_in_two_pieces(kernels):
    table = TABLES["twin tubes"]
    frame = heel_frame(table, np.radians([0.0, 3.0]))
    h = np.full((2, table.x.size), 0.2)  # through both tubes' centres
    below = frame.eta < h[:, :, None]
    crossings = np.count_nonzero(below[:, :, 1:] != below[:, :, :-1], axis=2)
    assert np.all(crossings == 4)  # two crossing pairs: two pieces per section
    _assert_same(cut_compiled(kernels, table, frame, h), cut_numpy(table, frame, h))


@needs_numba
def test_padded_sections_of_different_vertex_counts(kernels):
    table = TABLES["padded"]
    assert table.y.shape[1] > min(2 * len(h) for h in PADDED)  # padding is present
    rng = np.random.default_rng(3)
    phi = np.radians(rng.uniform(-60, 60, 25))
    h = _levels(table, phi, rng)
    frame = heel_frame(table, phi)
    _assert_same(cut_compiled(kernels, table, frame, h), cut_numpy(table, frame, h))


@needs_numba
def test_extremes_and_lazy_eta_of_a_compiled_frame(kernels, restore_engine):
    table = TABLES["paper-loon-canoe"]
    phi = np.radians(np.arange(-20.0, 91.0, 7.0))
    compiled.select("numpy")
    reference = heel_frame(table, phi)
    compiled.select("compiled")
    frame = heel_frame(table, phi)
    assert "eta" not in vars(frame)  # the compiled path does without
    np.testing.assert_allclose(frame.eta_low, reference.eta_low, rtol=0, atol=1e-12)
    np.testing.assert_allclose(frame.eta_high, reference.eta_high, rtol=0, atol=1e-12)
    np.testing.assert_allclose(frame.eta, reference.eta, rtol=0, atol=1e-12)
    idx = np.array([0, 3, 5])
    h = _levels(table, phi, np.random.default_rng(5))[idx]
    sub = frame.take(idx)  # its eta is made on first use by the numpy cut
    _assert_same(cut_compiled(kernels, table, sub, h), cut_numpy(table, sub, h))


@needs_numba
def test_wrong_waterline_shape_is_refused(kernels):
    table = TABLES["wigley"]
    frame = heel_frame(table, np.radians([0.0, 10.0]))
    with pytest.raises(ValueError, match="waterline heights of shape"):
        cut_compiled(kernels, table, frame, np.zeros((2, 3)))


def _analysis_figures(analysis) -> np.ndarray:
    hs = analysis.hydrostatics
    curve = analysis.curve
    return np.array([hs.draft_mid, hs.trim, hs.bm, hs.gm, curve.max_gz, curve.max_gz_deg,
                     np.nan if curve.avs_deg is None else curve.avs_deg])


@needs_numba
@pytest.mark.parametrize("name", SAMPLE_NAMES)
def test_whole_analysis_of_a_sample_agrees_in_gz(kernels, restore_engine, name):
    design = load_design(SAMPLES / f"{name}.json")
    compiled.select("numpy")
    want = analyse(design)
    compiled.select("compiled")
    got = analyse(design)
    np.testing.assert_allclose(got.curve.gz, want.curve.gz, rtol=0, atol=1e-9)
    np.testing.assert_allclose(_analysis_figures(got), _analysis_figures(want), rtol=0, atol=1e-9)
    assert got.status == want.status


@needs_numba
def test_whole_analysis_of_a_wigley_form_agrees_in_gz(kernels, restore_engine):
    stations = wigley(4.0, 0.5, 0.2, 0.4, stations=41, points=33)
    mass = 1000.0 * 4 / 9 * 4.0 * 0.5 * 0.2
    compiled.select("numpy")
    want = run(stations, mass, 2.0, 0.15, y=0.01)
    compiled.select("compiled")
    got = run(stations, mass, 2.0, 0.15, y=0.01)
    np.testing.assert_allclose(got.curve.gz, want.curve.gz, rtol=0, atol=1e-9)


def _run_engine_script(code: str, engine: str | None) -> str:
    env = {k: v for k, v in os.environ.items() if k != compiled.ENGINE_VARIABLE}
    if engine is not None:
        env[compiled.ENGINE_VARIABLE] = engine
    out = subprocess.run([sys.executable, "-c", code], cwd=ROOT, env=env,
                         capture_output=True, text=True, check=True)
    return out.stdout.strip()


ONE_CUT = (
    "import sys, numpy as np; from hydro import compiled; from hydro.analytic import box;"
    "from hydro.sections import build_section_table, heel_frame, cut;"
    "t = build_section_table(box(2.0, 1.0, 0.5)); f = heel_frame(t, np.zeros(1));"
    "a = cut(t, f, np.full((1, 3), 0.25)).area;"
)


def test_numpy_choice_never_imports_numba():
    out = _run_engine_script(
        ONE_CUT + "print(compiled.engine_name(), 'numba' in sys.modules, a.round(9).tolist())",
        "numpy",
    )
    assert out == "numpy False [[0.25, 0.25, 0.25]]"


def test_missing_numba_falls_back_to_numpy():
    out = _run_engine_script(
        "import sys; sys.modules['numba'] = None;" + ONE_CUT
        + "print(compiled.engine_name(), a.round(9).tolist()); print(compiled.status())",
        "compiled",
    )
    first, second = out.splitlines()
    assert first == "numpy [[0.25, 0.25, 0.25]]"
    assert second.startswith("numpy (compiled kernels unavailable: ") and "numba" in second


def test_unknown_engine_choice_is_refused_with_a_message():
    out = _run_engine_script(
        "from hydro import compiled; from hydro.errors import HullwrightError\n"
        "print(compiled.warm_up())\ntry:\n" + "    " + ONE_CUT
        + "\nexcept HullwrightError as e: print(e)",
        "fastest",
    )
    assert out.splitlines() == [
        "False", "HULLWRIGHT_ENGINE: 'fastest' is not one of auto, compiled, numpy"
    ]


@needs_numba
def test_auto_runs_numpy_until_the_kernels_are_loaded():
    out = _run_engine_script(
        ONE_CUT + "print(compiled.engine_name(), 'hydro.cut_kernels' in sys.modules);"
        "print(compiled.warm_up(wait=True), compiled.engine_name(),"
        " cut(t, f, np.full((1, 3), 0.25)).area.round(9).tolist())",
        None,
    )
    assert out.splitlines() == ["numpy False", "True compiled [[0.25, 0.25, 0.25]]"]


@needs_numba
def test_a_frame_of_another_table_is_refused(kernels):
    frame = heel_frame(TABLES["wigley"], np.radians([0.0, 10.0]))
    other = TABLES["padded"]
    with pytest.raises(ValueError, match="another section table"):
        cut_compiled(kernels, other, frame, np.zeros((2, other.x.size)))


@needs_numba
def test_no_writable_cache_directory_falls_back_to_numpy(tmp_path):
    """A read-only install: numba finds nowhere to cache the kernels, numpy serves."""
    shutil.copytree(ROOT / "hydro", tmp_path / "hydro",
                    ignore=shutil.ignore_patterns("__pycache__"))
    (tmp_path / "hydro" / "__pycache__").touch()  # a file: no cache beside the source
    blocked = tmp_path / "not-a-folder"
    blocked.touch()
    env = {k: v for k, v in os.environ.items() if k not in ("NUMBA_CACHE_DIR", "PYTHONPATH")}
    env.update(HOME=str(blocked), XDG_CACHE_HOME=str(blocked / "cache"),
               NUMBA_CACHE_DIR=str(blocked / "numba"), PYTHONDONTWRITEBYTECODE="1")
    env[compiled.ENGINE_VARIABLE] = "compiled"
    code = ONE_CUT + "print(compiled.engine_name(), a.round(9).tolist()); print(compiled.status())"
    out = subprocess.run([sys.executable, "-c", code], cwd=tmp_path, env=env,
                         capture_output=True, text=True, check=True).stdout.splitlines()
    assert out[0] == "numpy [[0.25, 0.25, 0.25]]"
    assert out[1].startswith("numpy (compiled kernels unavailable: ")


def test_newtons_step_agrees_exactly(kernels, restore_engine):
    """The compiled Newton step against the numpy one: settled angles, singular and
    ill-conditioned Jacobians, clipped and tiny steps, unsolved (NaN) angles."""
    from hydro.equilibrium import _newton_update, _Residual

    rng = np.random.default_rng(12)
    n = 400
    f1, f2 = rng.normal(size=n) * 10.0 ** rng.integers(-14, 1, n), rng.normal(size=n)
    f2[::7] = 1e-16  # within tolerance (with f1 small)
    j11, j12, j21, j22 = (rng.normal(size=n) for _ in range(4))
    j11[::5] = -abs(j11[::5])  # no waterplane: singular
    j21[::11], j22[::11] = 0.0, 0.0  # det 0
    f1[::13] = np.nan
    sums = np.stack([j11, j12, j21, j22]).T.copy().T  # strided rows, as the residual's
    r = _Residual(f1, f2, sums[0], sums[1], sums[2], sums[3], cut=None)  # type: ignore[arg-type]
    h, tau = rng.normal(size=n), rng.normal(size=n) * 0.1
    limits = (1e-6, 1e-6, 0.5, 0.05, 1e-3, 4.0)
    compiled.select("numpy")
    want = _newton_update(r, h, tau, limits)
    compiled.select("compiled")
    got = _newton_update(r, h, tau, limits)
    for g, w in zip(got, want):
        np.testing.assert_array_equal(g, w)
    assert want[2].any() and not want[2].all() and want[3].any() and not want[3].all()


@pytest.mark.parametrize("name", ["paper-loon-canoe", "drift-lab-raft", "twin tubes"])
def test_residuals_and_their_jacobian_agree(kernels, restore_engine, name):
    """The equilibrium residuals summed station by station (compiled) and by matrix
    products (numpy), at waterlines around the floating one and at heels to 90 degrees."""
    from hydro.equilibrium import _residual

    table = TABLES[name]
    rng = np.random.default_rng(3)
    phi = np.radians(np.linspace(0.0, 90.0, 19))
    frame = heel_frame(table, phi)
    h = frame.eta_low + (frame.eta_high - frame.eta_low) * rng.uniform(0.1, 0.6, phi.size)
    tau = rng.normal(size=phi.size) * 0.02
    eta_g = np.linspace(0.1, 0.3, phi.size)
    volume = 0.5 * float(table.totals[0] @ table.weights)
    x_g = float(table.x.mean())
    compiled.select("numpy")
    want = _residual(table, frame, volume, x_g, eta_g, h, tau)
    compiled.select("compiled")
    got = _residual(table, frame, volume, x_g, eta_g, h, tau)
    for key in ("f1", "f2", "j11", "j12", "j21", "j22"):
        g, w = getattr(got, key), getattr(want, key)
        scale = np.max(np.abs(w)) + 1e-300
        np.testing.assert_allclose(g, w, rtol=0, atol=1e-12 * scale, err_msg=key)
