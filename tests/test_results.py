"""Every public result is a labelled, self-describing value (issue 15, item 1).

``test_every_public_callable_is_classified`` walks ``wedgepath.__all__`` and the
``__all__`` of the public submodules (calculus, planar, signals, io, dask): every
public callable must appear in ``CALLS`` (a function, with a call on a small input
and what it returns) or ``CLASSES`` (a class, with what kind of class it is), so a new
public name cannot slip past the contract.  ``test_call_returns_a_labelled_value``
then calls each function and checks its result against its documented return type
(the numpydoc "Returns" section) and, for every result type, the contract of
``wedgepath._results.Result``: a frozen dataclass, ``names`` a tuple of str, the
conventions and ``units`` fields, read-only arrays, ``to_frame()`` with the
documented columns, a one-line repr without an array dump, and ``_repr_html_``.
"""

from __future__ import annotations

import dataclasses
import inspect
import io
import re

import numpy as np
import pandas as pd
import pytest

import wedgepath as wp
import wedgepath.calculus as wcalc
import wedgepath.io as wio
import wedgepath.planar as wplanar
import wedgepath.signals as wsig
from wedgepath._results import REPR_WIDTH, Result

dask = pytest.importorskip("dask")
import wedgepath.dask as wdask  # noqa: E402  (after the importorskip)

MODULES = [wp, wcalc, wplanar, wsig, wio, wdask]

# --------------------------------------------------------------------------- small inputs
T = np.arange(64)
WAVES = pd.DataFrame({"a": np.sin(2 * np.pi * T / 16), "b": np.sin(2 * np.pi * T / 16 - 1.0),
                      "c": np.sin(2 * np.pi * T / 16 - 2.0) + 0.1 * np.cos(T)})
SQUARE = wp.Path([[0, 0], [2, 0], [2, 1], [0, 1]], names=["strain", "stress"])


def _csv():
    return io.StringIO("t,a,b\n0,0,0\n1,1,0\n2,1,1\n3,0,1\n")


def _labels():
    import tempfile

    folder = tempfile.mkdtemp()
    path = f"{folder}/trials.csv"
    with open(path, "w") as fh:
        fh.write("a,b,run\n0,0,r1\n1,1,r1\n2,1,r2\n")
    return wio.read_labels(path, "run")


def _surrogates():
    return wp.surrogate_test(WAVES, n_surrogates=9, seed=0, progress=False)


def _bootstrap():
    return wp.bootstrap_area(WAVES, n_boot=9, seed=0, progress=False)


#: the tidy columns of every result type (W2_DESIGN.md section 1: a contract)
FRAME_COLUMNS = {
    "AreaMatrix": ["i", "j", "channel_i", "channel_j", "area"],
    "CyclicOrder": ["rank", "channel", "position_rad", "modulus"],
    "RollingAreas": ["window", "start", "stop", "start_time", "stop_time", "i", "j",
                     "channel_i", "channel_j", "area"],
    "CycleAreas": ["cycle", "start", "stop", "start_time", "stop_time", "value", "complete",
                   "status"],
    "LoopCycles": ["cycle", "start", "stop", "start_time", "stop_time", "status", "complete",
                   "energy", "x_min", "x_max", "y_min", "y_max", "y_at_x_min", "y_at_x_max",
                   "stiffness", "strain_energy", "damping_ratio", "loss_factor"],
    "RainflowCycles": ["range", "mean", "count", "start", "end", "close", "energy"],
    "SurrogateResult": ["i", "j", "channel_i", "channel_j", "area", "p", "q", "null_mean",
                        "null_std"],
    "BootstrapResult": ["i", "j", "channel_i", "channel_j", "area", "low", "high", "std"],
    "Decomposition": ["face", "winding", "area", "lobe"],
    "Lobe": ["sign", "signed_area", "area", "absolute_area", "faces"],
    "RegionMoments": ["area", "int_x", "int_y", "int_xx", "int_xy", "int_yy", "centroid_x",
                      "centroid_y", "I_x", "I_y", "I_xy"],
    "Integral": ["value", "error", "exact", "method", "rounding", "evaluations"],
    "Table": ["a", "b"],                       # the table itself: its channels
    "FitTest": ["strength", "null_median", "null_q95", "pvalue", "fit", "n_surrogates"],
    "DriftCheck": ["i", "j", "channel_i", "channel_j", "drift_share"],
    "ReferenceLags": ["channel", "lag", "low", "high", "coherence"],
    "LeadSpectrum": ["band", "band_name", "low", "high", "i", "j", "channel_i", "channel_j",
                     "area", "normalized"],
    "BandSignificance": ["band", "band_name", "low", "high", "i", "j", "channel_i",
                         "channel_j", "area", "p", "q", "null_mean", "null_std"],
    "RollingSpectrum": ["window", "start", "stop", "start_time", "stop_time", "band",
                        "band_name", "low", "high", "i", "j", "channel_i", "channel_j", "area"],
}

#: the convention fields each result type carries (beyond names and units)
CONVENTIONS = {
    "AreaMatrix": ["closure", "normalize"],
    "CyclicOrder": ["closure", "normalize"],
    "RollingAreas": ["closure", "window", "step"],
    "CycleAreas": ["closure", "quantity", "reference", "level"],
    "LoopCycles": ["kind", "quantity", "sign", "cut", "hysteresis", "level", "curve"],
    "RainflowCycles": ["hysteresis"],
    "SurrogateResult": ["closure", "method", "n_surrogates", "seed", "min_shift"],
    "BootstrapResult": ["closure", "confidence", "block", "n_boot", "seed"],
    "Decomposition": ["closure"],
    "Lobe": [],
    "RegionMoments": ["closure"],
    "Table": ["source", "time_axis"],
    "FitTest": ["closure", "method", "n_surrogates", "seed"],
    "DriftCheck": [],
    "ReferenceLags": ["reference", "confidence", "n_boot", "seed"],
    "LeadSpectrum": ["closure", "frequency_unit", "irregular"],
    "BandSignificance": ["closure", "method", "n_surrogates", "seed", "min_shift"],
    "RollingSpectrum": ["closure", "window", "step"],
}

#: public functions: (what they return, a call on a small input)
#:   result  -- a Result (the full contract)
#:   results -- a list of Results, each under the contract
#:   integral -- an Integral (float with .error; to_frame and repr)
#:   float   -- a plain float: the natural answer
#:   array   -- an array mirroring the input's shape: the natural answer of an array utility
#:   value   -- a calculus value object (a form, a path, a chain), not a result
#:   names   -- the column names of a file (a list of str)
CALLS = {
    "wedgepath.dx": ("value", lambda: wp.dx(0)),
    "wedgepath.integrate": ("integral", lambda: wp.integrate(wp.dx(0) ^ wp.dx(1), SQUARE)),
    "wedgepath.cone": ("value", lambda: wp.cone(SQUARE)),
    "wedgepath.calculus.as_path": ("value", lambda: wcalc.as_path([[0, 0], [1, 1]])),
    "wedgepath.calculus.grundmann_moller": ("value", lambda: wcalc.grundmann_moller(2, 1)),
    "wedgepath.signed_area": ("float", lambda: wp.signed_area(SQUARE)),
    "wedgepath.winding_number": ("array", lambda: wp.winding_number(SQUARE, [[1, 0.5], [5, 5]])),
    "wedgepath.region_integral": ("integral", lambda: wp.region_integral("x*y", SQUARE)),
    "wedgepath.region_moments": ("result", lambda: wp.region_moments(SQUARE)),
    "wedgepath.decompose": ("result", lambda: wp.decompose(
        [[0, 0], [2, 2], [2, 0], [0, 2]])),
    "wedgepath.area_matrix": ("result", lambda: wp.area_matrix(WAVES)),
    "wedgepath.hilbert_energy": ("array", lambda: wp.hilbert_energy(WAVES.to_numpy())),
    "wedgepath.align": ("value", lambda: wp.align([[0.0, 1, 2], [1.0, 0]], times=[[0, 1, 2],
                                                                                   [0.5, 1.5]])),
    "wedgepath.cyclic_order": ("result", lambda: wp.cyclic_order(wp.area_matrix(WAVES))),
    "wedgepath.noise_fit_baseline": ("float", lambda: wp.noise_fit_baseline(3)),
    "wedgepath.rolling_area_matrix": ("result", lambda: wp.rolling_area_matrix(WAVES, 16, 8)),
    "wedgepath.surrogate_test": ("result", _surrogates),
    "wedgepath.bootstrap_area": ("result", _bootstrap),
    "wedgepath.benjamini_hochberg": ("array", lambda: wp.benjamini_hochberg([0.01, 0.2])),
    "wedgepath.decorrelation_lag": ("array", lambda: wp.decorrelation_lag(WAVES)),
    "wedgepath.cycle_areas": ("result", lambda: wp.cycle_areas(WAVES, "a", "b")),
    "wedgepath.lead_spectrum": ("result", lambda: wp.lead_spectrum(WAVES, bands=[0, 0.1, 0.5])),
    "wedgepath.band_surrogate_test": ("result", lambda: wp.band_surrogate_test(
        WAVES, bands=[0, 0.1, 0.5], n_surrogates=9, seed=0, progress=False)),
    "wedgepath.rolling_lead_spectrum": ("result", lambda: wp.rolling_lead_spectrum(
        WAVES, 32, 16, bands=[0, 0.1, 0.5])),
    "wedgepath.loop_cycles": ("result", lambda: wp.loop_cycles(WAVES, "a", "b")),
    "wedgepath.rainflow": ("result", lambda: wp.rainflow(WAVES, x="a", y="b")),
    "wedgepath.pair_table": ("frame", lambda: wp.pair_table(wp.area_matrix(WAVES))),
    "wedgepath.io.read_table": ("result", lambda: wio.read_table(_csv(), time_column="t")),
    "wedgepath.io.iter_table_chunks": ("results", lambda: list(wio.iter_table_chunks(
        _csv(), time_column="t", chunk_rows=3))),
    "wedgepath.io.table_columns": ("names", lambda: wio.table_columns(_csv())),
    "wedgepath.io.read_labels": ("array", _labels),
    "wedgepath.io.stream_area_matrix": ("result", lambda: wio.stream_area_matrix(
        _csv(), time_column="t", chunk_rows=2, progress=False)),
    "wedgepath.dask.area_matrix": ("result", lambda: wdask.area_matrix(
        WAVES.to_numpy(), chunk_rows=16, scheduler="sync")),
    "wedgepath.dask.area_matrices": ("results", lambda: wdask.area_matrices(
        [WAVES.to_numpy(), WAVES.to_numpy()[:20]], scheduler="sync")),
    "wedgepath.dask.file_area_matrices": ("results", None),      # files: see its own test
    "wedgepath.fit_test": ("result", lambda: wp.fit_test(WAVES, n_surrogates=9)),
    "wedgepath.drift_check": ("result", lambda: wp.drift_check(WAVES, warn=False)),
    "wedgepath.reference_lags": ("result", lambda: wp.reference_lags(WAVES, "a", n_boot=9)),
    # methods that return results
    "AreaAccumulator.result": ("result", lambda: wp.AreaAccumulator(3, names=list("abc"))
                               .update(WAVES.to_numpy()).result()),
}

#: public classes: what kind of class each is
CLASSES = {
    # the result types (built by the library; the contract is checked on them)
    **{n: "result" for n in ("AreaMatrix", "CyclicOrder", "RollingAreas", "CycleAreas",
                             "LoopCycles", "RainflowCycles",
                             "SurrogateResult", "BootstrapResult", "Decomposition", "Lobe",
                             "RegionMoments", "Table", "Integral", "FitTest", "DriftCheck",
                             "ReferenceLags", "LeadSpectrum", "BandSignificance",
                             "RollingSpectrum")},
    # values the user builds and computes with
    **{n: "value" for n in ("Path", "Chain", "ZeroChain", "Form", "ZeroForm", "OneForm",
                            "TwoForm", "SimplicialChain", "SimplicialComplex", "WhitneyForm")},
    "AreaAccumulator": "state",            # a running state; its .result() is an AreaMatrix
    **{n: "exception" for n in ("IntegrationWarning", "DecompositionWarning",
                                "ConstantChannelWarning", "SurrogateWarning", "ShapeWarning",
                                "DriftWarning", "ResamplingWarning",
                                "CycleLengthWarning",
                                "TableError", "ChunkError", "ArrangementTooLarge")},
}


def public_callables():
    found = {}
    for mod in MODULES:
        for name in mod.__all__:
            obj = getattr(mod, name)
            if callable(obj):
                key = name if inspect.isclass(obj) else f"{_home(mod, name)}.{name}"
                found[key] = obj
    return found


def _home(mod, name):
    """The name users see: top-level names as ``wedgepath.x``, others by their module."""
    return "wedgepath" if name in wp.__all__ and mod.__name__ != "wedgepath.dask" else \
        mod.__name__


def documented_return(fn) -> str:
    """First line of the numpydoc "Returns" section."""
    doc = inspect.getdoc(fn) or ""
    m = re.search(r"^(?:Returns|Yields)\n-+\n(.+)$", doc, re.M)
    return m.group(1).strip() if m else ""


# --------------------------------------------------------------------------- the walk
def test_every_public_callable_is_classified():
    found = public_callables()
    functions = {k for k, v in found.items() if not inspect.isclass(v)}
    classes = {k for k, v in found.items() if inspect.isclass(v)}
    assert functions == {k for k in CALLS if "." in k and not k.startswith("AreaAccumulator")}
    assert classes == set(CLASSES)
    for name, kind in CLASSES.items():
        cls = getattr(wp, name, None) or getattr(wio, name, None) or getattr(wdask, name)
        if kind == "result":
            assert issubclass(cls, Result), name
        if kind == "exception":
            assert issubclass(cls, Exception), name


@pytest.mark.parametrize("name", sorted(k for k, (_, call) in CALLS.items() if call))
def test_call_returns_a_labelled_value(name):
    kind, call = CALLS[name]
    out = call()
    if "." in name and not name.startswith("AreaAccumulator"):
        fn = public_callables()[name]
        doc = documented_return(fn)
        assert doc, f"{name} documents no return type"
        shown = type(out[0] if kind == "results" else out).__name__
        if kind in ("result", "results", "integral"):
            assert shown in doc, f"{name} returns {shown} but documents {doc!r}"
    if kind == "result":
        check_result(out)
    elif kind == "results":
        assert isinstance(out, list) and out
        for r in out:
            check_result(r)
    elif kind == "integral":
        assert isinstance(out, wp.Integral) and isinstance(out, float)
        check_frame_and_reprs(out)
    elif kind == "float":
        assert type(out) is float
    elif kind == "array":
        assert isinstance(out, np.ndarray)
    elif kind == "frame":
        assert isinstance(out, pd.DataFrame)
    elif kind == "names":
        assert isinstance(out, list) and all(isinstance(n, str) for n in out)
    else:
        assert kind == "value" and not isinstance(out, Result)


def test_file_area_matrices_returns_labelled_results(tmp_path):
    paths = []
    for k in range(2):
        p = tmp_path / f"r{k}.csv"
        p.write_text("a,b\n0,0\n1,0\n1,1\n0,1\n")
        paths.append(p)
    out = wdask.file_area_matrices(paths, scheduler="sync")
    assert "list of AreaMatrix" in documented_return(wdask.file_area_matrices)
    for r in out:
        check_result(r)
    check_result(wdask.file_area_matrices(paths, pooled=True, scheduler="sync"))


# --------------------------------------------------------------------------- the contract
def check_result(r):
    cls = type(r).__name__
    assert isinstance(r, Result), cls
    assert dataclasses.is_dataclass(r) and r.__dataclass_params__.frozen, cls
    assert not hasattr(r, "__dict__"), f"{cls} has no slots"
    first = dataclasses.fields(r)[0].name
    with pytest.raises(dataclasses.FrozenInstanceError):
        setattr(r, first, None)
    # names: always a tuple of str; conventions and units as fields
    assert isinstance(r.names, tuple) and r.names and all(isinstance(n, str) for n in r.names)
    fields = {f.name for f in dataclasses.fields(r)}
    assert "units" in fields and (r.units is None or dict(r.units) is not None)
    for conv in CONVENTIONS[cls]:
        assert conv in fields, f"{cls} lacks the convention field {conv!r}"
    # arrays stored read-only
    for f in dataclasses.fields(r):
        v = getattr(r, f.name)
        if isinstance(v, np.ndarray):
            assert not v.flags.writeable, f"{cls}.{f.name} is writable"
    # array-like results: np.asarray gives the array read-only, np.array a copy to keep
    if r._array_field is not None:
        a = np.asarray(r)
        assert a is getattr(r, r._array_field) and not a.flags.writeable
        b = np.array(r)
        assert b.flags.writeable and np.array_equal(b, a, equal_nan=True)
        assert len(r) == a.shape[0] and r.shape == a.shape
    check_frame_and_reprs(r)


def check_frame_and_reprs(r):
    cls = type(r).__name__
    frame = r.to_frame()
    assert isinstance(frame, pd.DataFrame) and len(frame) >= 1, cls
    want = list(FRAME_COLUMNS[cls])
    if cls == "AreaMatrix" and r.normalize is not None:
        want.append("normalized")
    assert list(frame.columns) == want, cls
    text = repr(r)
    assert text.startswith(f"{cls}(") and text.endswith(")"), text
    assert "\n" not in text and len(text) <= REPR_WIDTH and "array(" not in text, text
    html = r._repr_html_()
    assert html.startswith("<div>") and f"<strong>{cls}</strong>" in html and "<table" in html


# --------------------------------------------------------------------------- frames vs values
def test_area_matrix_frame_lists_every_pair_once():
    m = wp.area_matrix(WAVES, normalize="hilbert")
    fr = m.to_frame()
    assert list(fr.columns) == ["i", "j", "channel_i", "channel_j", "area", "normalized"]
    raw = wp.area_matrix(WAVES).values
    for _, row in fr.iterrows():
        assert row["channel_i"] == WAVES.columns[row["i"]] and row["i"] < row["j"]
        assert row["area"] == pytest.approx(raw[row["i"], row["j"]], rel=1e-12)
        assert row["normalized"] == m.values[row["i"], row["j"]]
    np.testing.assert_allclose(m.raw, raw, rtol=1e-12, atol=0)


def test_surrogate_and_bootstrap_frames_match_their_matrices():
    s, b = _surrogates(), _bootstrap()
    for res, cols in ((s, {"area": s.observed, "p": s.pvalues, "q": s.qvalues,
                           "null_mean": s.null_mean, "null_std": s.null_std}),
                      (b, {"area": b.estimate, "low": b.low, "high": b.high, "std": b.std})):
        fr = res.to_frame()
        assert len(fr) == 3 and fr[["i", "j"]].values.tolist() == [[0, 1], [0, 2], [1, 2]]
        for col, M in cols.items():
            assert fr[col].tolist() == [M[0, 1], M[0, 2], M[1, 2]], col


def test_decomposition_frames():
    d = wp.decompose([[0, 0], [2, 2], [2, 0], [0, 2]])
    fr = d.to_frame()
    assert fr["winding"].tolist() == d.winding.tolist() and fr["area"].sum() == 2.0
    for k, lobe in enumerate(d.lobes):
        assert fr.loc[fr["lobe"] == k, "face"].tolist() == lobe.face_indices.tolist()
    lf = d.lobes_frame()
    assert lf["signed_area"].tolist() == [lb.signed_area for lb in d.lobes]
    assert d.names == ("0", "1") and wp.decompose(SQUARE).names == ("strain", "stress")


def test_table_frame_is_the_table_with_time_as_index():
    tab = wio.read_table(_csv(), time_column="t")
    fr = tab.to_frame()
    assert fr.index.name == "time" and fr.index.tolist() == [0, 1, 2, 3]
    assert fr.to_numpy().tolist() == tab.values.tolist()
    dated = wio.read_table(io.StringIO("t,a\n2021-03-01T00:00:00,1\n2021-03-01T00:00:30,2\n"),
                           time_column="t")
    idx = dated.to_frame().index
    assert isinstance(idx, pd.DatetimeIndex) and str(idx[1]) == "2021-03-01 00:00:30"
    untimed = wio.read_table(io.StringIO("a,b\n1,2\n3,4\n"))
    assert untimed.to_frame().index.name == "row"


def test_units_travel_from_dataframe_attrs_and_with_units():
    df = WAVES.copy()
    df.attrs["units"] = {"a": "mV", "b": "mV", "zz": "s"}
    m = wp.area_matrix(df)
    assert dict(m.units) == {"a": "mV", "b": "mV"}          # only the channels used
    assert dict(wp.cycle_areas(df, "a", "b").units) == {"a": "mV", "b": "mV"}
    assert dict(wp.rolling_area_matrix(df, 16, 8).units) == {"a": "mV", "b": "mV"}
    assert wp.area_matrix(WAVES).units is None
    tagged = wp.area_matrix(WAVES).with_units({"c": "Pa"})
    assert dict(tagged.units) == {"c": "Pa"} and tagged.names == m.names
    with pytest.raises(ValueError, match="units names channel 'zz'"):
        m.with_units({"zz": "s"})
    with pytest.raises(TypeError, match="unit text"):
        m.with_units({"a": 3})
    with pytest.raises(TypeError):
        m.units["a"] = "V"                                    # read-only mapping


def test_results_pickle():
    import pickle

    for r in (wp.area_matrix(WAVES), wp.cycle_areas(WAVES, "a", "b"),
              wp.loop_cycles(WAVES, "a", "b"), wp.rainflow(WAVES, x="a", y="b"),
              wp.cyclic_order(wp.area_matrix(WAVES)), wp.rolling_area_matrix(WAVES, 16, 8)):
        back = pickle.loads(pickle.dumps(r))
        assert type(back) is type(r) and back.names == r.names
        assert np.array_equal(np.asarray(back), np.asarray(r), equal_nan=True) \
            if r._array_field else True


# --------------------------------------------------------------------------- the pair table
def test_pair_table_combines_its_results():
    A = wp.area_matrix(WAVES, names=None, normalize="zscore")
    s, b = _surrogates(), _bootstrap()
    table = wp.pair_table(A, significance=s, bootstrap=b)
    assert list(table.columns) == ["channel_i", "channel_j", "area", "normalized", "direction",
                                   "p", "q", "low", "high"]
    assert len(table) == 3
    # ordered by |normalized|, largest first
    assert table["normalized"].abs().tolist() == sorted(table["normalized"].abs(), reverse=True)
    raw = wp.area_matrix(WAVES).values
    for _, row in table.iterrows():
        i, j = WAVES.columns.get_loc(row["channel_i"]), WAVES.columns.get_loc(row["channel_j"])
        assert i < j
        assert row["area"] == pytest.approx(raw[i, j], rel=1e-12)
        assert row["normalized"] == A.values[i, j]
        assert row["direction"] == ("i leads j" if A.values[i, j] > 0 else "j leads i")
        assert (row["p"], row["q"]) == (s.pvalues[i, j], s.qvalues[i, j])
        assert (row["low"], row["high"]) == (b.low[i, j], b.high[i, j])
        assert row["area"] == pytest.approx(s.observed[i, j], rel=1e-9)


def test_pair_table_without_partners_and_raw():
    A = wp.area_matrix(WAVES)
    table = wp.pair_table(A)
    assert table[["p", "q", "low", "high", "normalized"]].isna().all().all()
    assert table["area"].abs().tolist() == sorted(np.abs(A.values[np.triu_indices(3, 1)]),
                                                  reverse=True)
    # a plain array gets the names "0", "1", ...; a zero pair has no direction
    M = np.array([[0.0, 2.0, 0.0], [-2.0, 0.0, -1.0], [0.0, 1.0, 0.0]])
    t = wp.pair_table(M)
    assert t[["channel_i", "channel_j", "direction"]].values.tolist() == [
        ["0", "1", "i leads j"], ["1", "2", "j leads i"], ["0", "2", "none"]]


def test_pair_table_refuses_results_of_other_channels():
    A = wp.area_matrix(WAVES)
    other = wp.surrogate_test(WAVES[["a", "b"]], n_surrogates=5, seed=0, progress=False)
    with pytest.raises(ValueError, match="significance is for channels"):
        wp.pair_table(A, significance=other)
    renamed = wp.surrogate_test(WAVES.set_axis(["x", "y", "z"], axis=1), n_surrogates=5, seed=0,
                                progress=False)
    with pytest.raises(ValueError, match=r"\['x', 'y', 'z'\]"):
        wp.pair_table(A, significance=renamed)
    with pytest.raises(TypeError, match="bootstrap must be a BootstrapResult"):
        wp.pair_table(A, bootstrap=_surrogates())
    # unnamed results (channels "0", "1", ...) match the names of the same number of channels
    unnamed = wp.surrogate_test(WAVES.to_numpy(), n_surrogates=5, seed=0, progress=False)
    assert len(wp.pair_table(A, significance=unnamed)) == 3
