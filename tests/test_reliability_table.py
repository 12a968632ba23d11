"""The bad-input table of docs/reliability.md: one test per row, and completeness.

The rows live by feature in ``reliability/`` (``ROWS``, ``CLASSES``); ``test_row`` runs every
row, ``test_every_public_call_has_rows`` fails when a public function, class or subcommand
has no row, so the table cannot silently fall behind the API, and
``test_doc_table_is_current`` fails when the table in docs/reliability.md differs from what
``docs/reliability_table.py`` renders.  Regenerate it with ``make reliability-table``.
"""

from __future__ import annotations

import importlib.util
import inspect
import warnings
from pathlib import Path as FsPath

import pytest

import wedgepath as wp
from wedgepath import symbolic

from reliability import ROWS, Row, wdask

ROOT = FsPath(__file__).resolve().parents[1]


def outcome(r: Row):
    """Run a row; return a description of what happened (for assertion messages)."""
    with warnings.catch_warnings():
        warnings.simplefilter("error", RuntimeWarning)
        try:
            res = r.call()
        except Exception as exc:  # noqa: BLE001 - reported below
            return "raised", exc
    return "returned", res


@pytest.mark.parametrize("r", ROWS, ids=[f"{r.api} | {r.given}" for r in ROWS])
def test_row(r: Row):
    kind, value = outcome(r)
    if r.raises == "exit 2":
        assert kind == "returned", f"the command line raised {value!r}"
        code, stdout, stderr, written = value
        lines = stderr.strip().splitlines()
        assert code == 2, f"exit code {code}, stderr {stderr!r}"
        assert len(lines) == 1, f"not one line on stderr: {stderr!r}"
        assert lines[0].startswith("wedgepath"), lines[0]
        assert r.match in lines[0], f"{r.match!r} not in {lines[0]!r}"
        assert written == [], f"files left behind: {written}"
        return
    if r.raises is None:
        assert kind == "returned", f"raised {value!r}; documented: {r.match}"
        assert r.check(value), f"returned {value!r}; documented: {r.match}"
        return
    assert kind == "raised", f"returned {value!r}; expected {r.raises.__name__}"
    assert type(value) is r.raises or (r.raises is ValueError and isinstance(value, ValueError)
                                       and type(value).__name__ in ("TableError", "ChunkError",
                                                                   "ArrangementTooLarge")), \
        f"raised {type(value).__name__}: {value}; expected {r.raises.__name__}"
    msg = str(value)
    if isinstance(value, KeyError):
        msg = value.args[0]
    assert "\n" not in msg.strip(), f"multi-line message: {msg!r}"
    assert r.match in msg, f"{r.match!r} not in {msg!r}"


# --------------------------------------------------------------------------- completeness
def public_calls():
    """Names of the public functions, classes and subcommands that need rows."""
    names = set()
    for name in wp.__all__:
        obj = getattr(wp, name)
        if name.startswith("__") or isinstance(obj, (tuple, str, dict)):
            continue
        if inspect.isclass(obj) and issubclass(obj, (Warning, Exception)):
            continue  # warning and error classes are raised by the library, not called
        if name in ("RegionMoments", "Decomposition", "Lobe", "CyclicOrder", "SurrogateResult",
                    "BootstrapResult", "CycleAreas", "RollingAreas", "FitTest", "DriftCheck",
                    "ReferenceLags", "LeadSpectrum", "BandSignificance", "RollingSpectrum",
                    "LoopCycles", "RainflowCycles"):
            continue  # result objects: built by the library, not by users
        names.add(f"wp.{name}")
    names |= {f"wp.io.{n}" for n in ("read_table", "iter_table_chunks", "table_columns",
                                     "stream_area_matrix")}
    names |= {f"wp.symbolic.{n}" for n in symbolic.__all__}
    names |= {"wp.formula.parse_formula", "wp.calculus.as_path", "wp.calculus.grundmann_moller"}
    names |= {f"wp.plotting.{n}" for n in ("cycle_positions", "pair_chart", "rolling_pairs",
                                           "loop_faces", "loop_path", "cycle_values")}
    names |= {"wedgepath leadlag", "wedgepath loop", "wedgepath demo"}
    if wdask is not None:
        names |= {"wp.dask.area_matrix", "wp.dask.area_matrices", "wp.dask.file_area_matrices"}
    return names


def _covered(name):
    return any(r.api == name or r.api.startswith(name + "(") or r.api.startswith(name + ".")
               or (name.startswith("wp.") and r.api.startswith(name[3:].split(".")[-1] + "."))
               or (name.startswith("wp.") and r.api.startswith(name[3:].split(".")[-1] + " "))
               or (name.startswith("wp.") and r.api.startswith(name[3:].split(".")[-1] + "["))
               for r in ROWS)


def test_every_public_call_has_rows():
    missing = sorted(n for n in public_calls() if not _covered(n))
    assert not missing, f"public calls without a row in the reliability table: {missing}"


def test_array_functions_cover_the_core_classes():
    core = {"ndim", "empty", "single", "nan", "inf", "text", "object", "complex", "overflow"}
    for api in ("wp.Path(points)", "wp.area_matrix(X)", "wp.signed_area(path2d)",
                "wp.winding_number(path2d, points)", "wp.region_moments(path2d)",
                "wp.region_integral(f, path2d)", "wp.decompose(path2d)",
                "wp.rolling_area_matrix(X, window, step)", "AreaAccumulator.update(chunk)",
                "wp.surrogate_test(X)", "wp.bootstrap_area(X)", "wp.cycle_areas(X, i, j)",
                "wp.integrate(form, path)", "wp.cone(path, apex)", "wp.hilbert_energy(x)",
                "wp.SimplicialChain(vertices, simplices)", "wp.ZeroChain(points, coefficients)"):
        have = {r.cls for r in ROWS if r.api == api}
        assert core <= have, f"{api} lacks rows for {sorted(core - have)}"


# --------------------------------------------------------------------------- the document
def _table_script():
    spec = importlib.util.spec_from_file_location("reliability_table",
                                                  ROOT / "docs" / "reliability_table.py")
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)
    return mod


def test_doc_table_is_current():
    script = _table_script()
    assert script.current_doc_table() == script.render(), \
        "docs/reliability.md is out of date: run make reliability-table"


def test_render_lists_every_row():
    table = _table_script().render()
    every = table[table.index("### Every row"):]
    assert every.count("\n| `") == len(ROWS)
    assert f"{len(ROWS)} rows, " in table
