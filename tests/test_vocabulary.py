"""One vocabulary across the public API (issue 15, item 1; W2_DESIGN.md section 2).

Each rule is a test that inspects the signatures (and, where a name alone cannot say
it, the behaviour) of every public function, class and public method of the walked
modules, so that the vocabulary cannot drift: a new function with ``how=``, a
positional ``times``, a ``labels=`` switch or a ``level=`` that means a confidence
fails here.  The walk covers ``wedgepath``, ``calculus``, ``planar``, ``signals``,
``io`` and ``dask``.
"""

from __future__ import annotations

import ast
import dataclasses
import inspect
import io
from pathlib import Path as FsPath

import numpy as np
import pandas as pd
import pytest

import wedgepath as wp
import wedgepath.calculus as wcalc
import wedgepath.io as wio
import wedgepath.planar as wplanar
import wedgepath.signals as wsig
from wedgepath._results import Result

wdask = pytest.importorskip("wedgepath.dask")

SRC = FsPath(__file__).resolve().parents[1] / "src" / "wedgepath"
MODULES = [wp, wcalc, wplanar, wsig, wio, wdask]


def public_signatures():
    """``{qualified name: inspect.Signature}`` of public functions, classes and methods."""
    out = {}
    for mod in MODULES:
        for name in mod.__all__:
            obj = getattr(mod, name)
            if not callable(obj) or (inspect.isclass(obj) and issubclass(obj, Exception)):
                continue
            qual = f"{mod.__name__}.{name}"
            built_by_library = inspect.isclass(obj) and issubclass(obj, Result)
            try:
                if not built_by_library:      # results are built by the library, not by users
                    out[qual] = inspect.signature(obj)
            except (TypeError, ValueError):
                pass
            if inspect.isclass(obj):
                for mname, member in vars(obj).items():
                    if mname.startswith("_"):
                        continue
                    fn = member.__func__ if isinstance(member, (classmethod, staticmethod)) \
                        else member
                    if inspect.isfunction(fn):
                        out[f"{qual}.{mname}"] = inspect.signature(fn)
    return out


SIGS = public_signatures()


def params(name):
    return [(q, s.parameters[name]) for q, s in SIGS.items() if name in s.parameters]


def test_the_walk_sees_the_api():
    assert len(SIGS) > 60
    assert "wedgepath.signals.area_matrix" in SIGS and "wedgepath.calculus.Path.close" in SIGS
    assert "wedgepath.signals.AreaAccumulator.result" in SIGS


# --------------------------------------------------------------------------- closure
def test_closure_is_called_closure_everywhere():
    for bad in ("how", "close", "closing", "closed"):
        assert not params(bad), f"{bad}= found: {[q for q, _ in params(bad)]}"
    assert list(SIGS["wedgepath.calculus.Path.close"].parameters)[1:] == ["closure", "tol"]
    assert SIGS["wedgepath.calculus.Path.close"].parameters["tol"].kind == \
        inspect.Parameter.KEYWORD_ONLY
    for fn in ("area_matrix", "signed_area", "region_integral", "decompose", "integrate"):
        assert any(q.endswith("." + fn) for q, _ in params("closure")), fn
    p = wp.Path([[0, 0], [1, 0], [1, 1]])
    assert p.close(closure="chord") == p.close("chord")


# --------------------------------------------------------------------------- times and names
def test_times_is_keyword_only_everywhere():
    found = params("times")
    assert len(found) >= 8
    positional = [q for q, p in found if p.kind != inspect.Parameter.KEYWORD_ONLY]
    assert not positional, f"times= is positional in {positional}"
    with pytest.raises(TypeError):
        wp.Path([[0, 0], [1, 1]], [0.0, 1.0])
    with pytest.raises(TypeError):
        wp.rolling_area_matrix(np.zeros((10, 2)), 4, 2, np.arange(10.0))


def test_names_is_keyword_only_with_default_none():
    found = params("names")
    assert len(found) >= 10
    bad = [q for q, p in found if p.kind != inspect.Parameter.KEYWORD_ONLY or p.default is not None]
    assert not bad, f"names= not keyword-only with default None in {bad}"
    # default: from the input, else "0", "1", ... -- always a tuple of str
    X = np.random.default_rng(0).standard_normal((50, 2)).cumsum(axis=0)
    for r in (wp.area_matrix(X), wp.rolling_area_matrix(X, 10, 5), wp.cycle_areas(X),
              wp.cyclic_order(wp.area_matrix(X).values), wp.AreaAccumulator(2).update(X).result(),
              wp.surrogate_test(X, method="phase", n_surrogates=3, seed=0),
              wp.bootstrap_area(X, n_boot=3, seed=0),
              wp.region_moments(X), wp.decompose(X)):
        assert isinstance(r.names, tuple) and all(isinstance(n, str) for n in r.names), r
        assert r.names[:2] == ("0", "1"), r


# --------------------------------------------------------------------------- labels
def test_labels_is_gone():
    assert not params("labels"), [q for q, _ in params("labels")]
    df = pd.DataFrame({"x": [0.0, 1, 1, 0], "y": [0.0, 0, 1, 1]})
    m = wp.area_matrix(df)
    assert isinstance(m, wp.AreaMatrix) and m.names == ("x", "y")
    assert isinstance(wp.rolling_area_matrix(df, 3, 1), wp.RollingAreas)
    acc = wp.AreaAccumulator(3, names=["a", "b", "c"]).update(np.eye(3))
    assert acc.result().names == ("a", "b", "c")


# --------------------------------------------------------------------------- progress
def test_progress_is_bool_or_none_everywhere():
    found = params("progress")
    assert {q.rsplit(".", 1)[1] for q, _ in found} >= {"surrogate_test", "bootstrap_area",
                                                       "decompose", "stream_area_matrix"}
    bad = [q for q, p in found if p.kind != inspect.Parameter.KEYWORD_ONLY or p.default is not None]
    assert not bad, bad
    X = np.random.default_rng(0).standard_normal((40, 2))
    calls = {"surrogate_test": lambda v: wp.surrogate_test(X, n_surrogates=3, progress=v),
             "bootstrap_area": lambda v: wp.bootstrap_area(X, n_boot=3, progress=v),
             "decompose": lambda v: wp.decompose(X, progress=v),
             "stream_area_matrix": lambda v: wio.stream_area_matrix(
                 io.StringIO("a,b\n0,0\n1,0\n1,1\n"), progress=v),
             "band_surrogate_test": lambda v: wp.band_surrogate_test(
                 X, bands=[0, 0.1, 0.5], n_surrogates=3, progress=v),
             "rolling_lead_spectrum": lambda v: wp.rolling_lead_spectrum(
                 X, 10, 5, bands=[0, 0.1, 0.5], progress=v)}
    assert set(calls) == {q.rsplit(".", 1)[1] for q, _ in found}
    for name, call in calls.items():
        for ok in (None, False):
            call(ok)
        for bad_value in ("yes", 1, print):       # one type: a callable is no longer a progress
            with pytest.raises(TypeError, match="progress must be True, False or None"):
                call(bad_value)


def test_the_home_made_progress_and_lazy_proxy_are_gone():
    with pytest.raises(ModuleNotFoundError):
        __import__("wedgepath._progress")
    import wedgepath._lazy as lazy
    assert not hasattr(lazy, "LazyModule") and not hasattr(lazy, "sympy")
    # that tqdm is imported only when a bar is made: test_import_cost.py (HEAVY)
    text = (SRC / "_bars.py").read_text()
    assert "from tqdm import tqdm" in text


# --------------------------------------------------------------------------- counts
def test_counts_are_named_n_something():
    for bad in ("draws", "surrogates", "boot", "nboot", "n_bootstrap", "replicates", "B", "R",
                "num_surrogates", "n_samples"):
        assert not params(bad), f"{bad}= found: {[q for q, _ in params(bad)]}"
    assert "n_surrogates" in SIGS["wedgepath.signals.surrogate_test"].parameters
    assert "n_boot" in SIGS["wedgepath.signals.bootstrap_area"].parameters
    assert "n_draws" in SIGS["wedgepath.signals.noise_fit_baseline"].parameters
    fields = {f.name for f in dataclasses.fields(wp.SurrogateResult)}
    assert "n_surrogates" in fields and "n_boot" in {f.name for f in
                                                      dataclasses.fields(wp.BootstrapResult)}


# --------------------------------------------------------------------------- confidence / level
def test_confidence_is_a_confidence_and_level_a_crossing_level():
    assert {q.rsplit(".", 1)[1] for q, _ in params("level")} == {"cycle_areas", "loop_cycles"}
    assert {q.rsplit(".", 1)[1] for q, _ in params("confidence")} == {"bootstrap_area",
                                                                      "reference_lags"}
    assert "level" in {f.name for f in dataclasses.fields(wp.CycleAreas)}   # the crossing level
    boot = {f.name for f in dataclasses.fields(wp.BootstrapResult)}
    assert "confidence" in boot and "level" not in boot
    # interval fields are low/high wherever there is an interval
    for cls in result_classes():
        names = {f.name for f in dataclasses.fields(cls)}
        assert not names & {"lower", "upper", "ci_low", "ci_high", "lo", "hi"}, cls


def result_classes():
    return [c for c in (getattr(m, n) for m in MODULES for n in m.__all__)
            if inspect.isclass(c) and issubclass(c, Result) and dataclasses.is_dataclass(c)]


# --------------------------------------------------------------------------- degree
def test_degree_is_the_form_degree_and_poly_degree_the_polynomial_one():
    form_degree = {"wedgepath.calculus.Form", "wedgepath.calculus.WhitneyForm",
                   "wedgepath.Form", "wedgepath.WhitneyForm"}
    assert {q for q, _ in params("degree")} <= form_degree
    want = {"ZeroForm", "OneForm", "TwoForm", "region_integral"}
    have = {q.rsplit(".", 1)[1] for q, _ in params("poly_degree")}
    assert want <= have, want - have
    from wedgepath.calculus.forms import Coefficient
    assert "poly_degree" in inspect.signature(Coefficient.from_callable).parameters
    w = wp.OneForm([lambda c: c[:, 1] ** 2, lambda c: c[:, 0]], poly_degree=2)
    assert w.degree == 1 and w.poly_degree == 2
    r = wp.region_integral(lambda x, y: x * y, [[0, 0], [1, 0], [1, 1], [0, 1]], poly_degree=2)
    assert r.exact and float(r) == pytest.approx(0.25, rel=1e-15)


# --------------------------------------------------------------------------- form types
def test_zero_one_two_form_are_real_types():
    import sympy as sp

    x, y = sp.symbols("x y")
    one = [wp.dx(0), wp.OneForm([1.0, 2.0]), wp.dx(0) + wp.dx(1), 2 * wp.dx(1),
           wp.ZeroForm(x * y, symbols=(x, y)).d(), wp.Form.from_sympy([-y, x], [x, y]),
           wp.OneForm.from_sympy([-y, x], [x, y])]
    two = [wp.dx(0) ^ wp.dx(1), wp.TwoForm({(0, 1): 1.0}), one[-1].d(),
           wp.TwoForm.from_sympy({(0, 1): x}, [x, y])]
    zero = [wp.ZeroForm(3.0), wp.ZeroForm(x, symbols=(x, y)), wp.Form({(): 1.0}, 0)]
    for k, (cls, forms) in enumerate(((wp.ZeroForm, zero), (wp.OneForm, one),
                                      (wp.TwoForm, two))):
        assert inspect.isclass(cls) and issubclass(cls, wp.Form)
        for w in forms:
            assert isinstance(w, cls) and isinstance(w, wp.Form) and w.degree == k
            others = [c for c in (wp.ZeroForm, wp.OneForm, wp.TwoForm) if c is not cls]
            assert not any(isinstance(w, c) for c in others)
    assert not isinstance(3.0, wp.OneForm) and not isinstance("dx", wp.TwoForm)
    assert type(wp.OneForm([1.0])) is wp.OneForm


# --------------------------------------------------------------------------- radians
def test_positions_in_the_cycle_are_radians_and_say_so():
    t = 2 * np.pi * np.arange(300) / 100
    X = np.column_stack([np.sin(t - 2 * np.pi / 3), np.sin(t), np.sin(t - 4 * np.pi / 3)])
    co = wp.cyclic_order(wp.area_matrix(X), start=1)
    assert np.allclose(co.positions, [2 * np.pi / 3, 0, 4 * np.pi / 3])   # radians, [0, 2 pi)
    assert co.to_frame()["position_rad"].tolist() == pytest.approx([0, 2 * np.pi / 3,
                                                                    4 * np.pi / 3])
    for cls in result_classes():
        for f in dataclasses.fields(cls):
            assert "deg" not in f.name and "phase" not in f.name, (cls, f.name)
    assert not params("degrees") and not params("phases")


# --------------------------------------------------------------------------- one sign
def test_one_sign_convention_for_per_cycle_integrals(tmp_path, capsys):
    """``cycle_areas(X, i, j)`` is ``∮ x_i dx_j``; the command line's ``--energy y_dx``
    (``∮ y dx``) is ``cycle_areas(X, y, x, reference=x)`` and ``x_dy`` is
    ``cycle_areas(X, x, y)`` (with the command line's cut: valleys, band from the noise),
    and ``loop_cycles(X, x, y).energy``: the same numbers for the same integral."""
    import json

    from wedgepath import cli

    t = np.arange(1201) * 2 * np.pi / 100 + 0.1
    df = pd.DataFrame({"ssn": 50 + 40 * np.sin(t), "ssn_rate": 40 * np.cos(t - 0.3)})
    f = tmp_path / "s.csv"
    df.to_csv(f, index=False)
    # the command line cuts cycles at the valleys of --x, with the band from the noise level
    xdy = wp.cycle_areas(df, "ssn", "ssn_rate", cut="reversal", hysteresis="auto")
    ydx = wp.cycle_areas(df, "ssn_rate", "ssn", reference="ssn", cut="reversal",
                         hysteresis="auto")
    assert xdy.quantity == "∮ ssn d(ssn_rate)" and ydx.quantity == "∮ ssn_rate d(ssn)"
    # swapping i and j flips the sign (partial cycles are NaN in both)
    assert np.allclose(ydx.values, -xdy.values, rtol=1e-12, equal_nan=True)
    # ssn_rate = 40 sin(t + 1.27) leads ssn = 50 + 40 sin t: the loop in the (ssn, ssn_rate)
    # plane turns clockwise, so x dy (the signed area, counter-clockwise positive) is negative
    assert xdy.mean < 0 and wp.signed_area(df.to_numpy()) < 0
    assert xdy.mean == pytest.approx(-np.pi * 40 * 40 * np.sin(np.pi / 2 - 0.3), rel=2e-3)
    for energy, lib in (("x_dy", xdy), ("y_dx", ydx)):
        code = cli.main(["loop", str(f), "--x", "ssn", "--y", "ssn_rate", "--energy", energy,
                         "--json", "--quiet"])
        out = json.loads(capsys.readouterr().out)
        assert code == 0
        got = np.array([np.nan if v is None else v for v in out["cycles"]["values"]])
        assert np.allclose(got, lib.values, rtol=1e-12, atol=0, equal_nan=True)
        assert out["cycles"]["mean"] == pytest.approx(lib.mean, rel=1e-12)
    # and loop_cycles reports ∮ y dx of the same cycles as its energy
    eng = wp.loop_cycles(df, "ssn", "ssn_rate")
    assert np.allclose(eng.energy, ydx.values, rtol=1e-12, equal_nan=True)


# --------------------------------------------------------------------------- one rescaling
def test_power_of_two_rescaling_lives_in_one_helper():
    users = []
    for path in SRC.rglob("*.py"):
        if path.name == "_scaling.py":
            continue
        tree = ast.parse(path.read_text(encoding="utf-8"))
        for node in ast.walk(tree):
            if isinstance(node, ast.Attribute) and node.attr in ("frexp", "ldexp"):
                users.append(f"{path.relative_to(SRC)}:{node.lineno}")
    assert not users, f"frexp/ldexp outside _scaling.py: {users}"


def test_rescaling_helper_is_exact():
    from wedgepath._scaling import pow2_exponent, pow2_exponents, pow2_scale

    x = np.array([[3e300, -1e-300], [0.0, 2e-300]])
    e = pow2_exponents(x, axis=0)
    y = pow2_scale(x, -e)
    assert np.all((np.abs(y).max(axis=0) >= 0.5) & (np.abs(y).max(axis=0) < 1))
    assert np.array_equal(pow2_scale(y, e), x)                   # exact round trip
    assert pow2_exponents(np.array([[np.nan, 0.0]]), axis=0).tolist() == [0, 0]
    assert pow2_exponent([np.array([4.0]), np.array([-8.0, np.nan])]) == 4
    assert pow2_exponent(np.array([1e10]), safe=64) == 0         # within the safe range
