"""Bad-input rows for area matrices, cyclic order, rolling, accumulator, significance, cycles, align."""

from __future__ import annotations

from ._table import *  # noqa: F403 - the shared inputs, row() and returns()


SIG = "wp.area_matrix(X)"
array_rows(SIG, wp.area_matrix, 3,
           ndim=(ValueError, "must be 2-dimensional (samples, channels)"),
           empty=(ValueError, "0 samples; at least 2"),
           single=(ValueError, "1 sample; at least 2"),
           allnan=(ValueError, "no complete sample"))
row(SIG, "ndim", "one channel (shape (8, 1))", lambda: wp.area_matrix(loop(1)), ValueError,
    "at least 2")
returns(SIG, "overflow", "int64 corners +-2**62 as two channels",
        lambda: wp.area_matrix(int64_triangle())[0, 1], "A[0, 1] == 2.0**123 (exact)",
        lambda r: r == 2.0 ** 123)
row(SIG, "overflow", "channels near 1e200 (areas beyond float64)",
    lambda: wp.area_matrix(loop(3) * 1e200), ValueError, "overflow float64")
row(SIG, "length", "3 times for 8 samples", lambda: wp.area_matrix(loop(3), times=T8[:3]),
    ValueError, "times has 3 entries but the data have 8 samples")
row(SIG, "times", "decreasing times", lambda: wp.area_matrix(loop(3), times=T8[::-1]), ValueError,
    "strictly increasing")
row(SIG, "times", "duplicate times", lambda: wp.area_matrix(loop(3), times=np.zeros(8)), ValueError,
    "strictly increasing")
row(SIG, "length", "1 name for 3 channels", lambda: wp.area_matrix(loop(3), names=["a"]), ValueError,
    "names has 1 entries but the data have 3 channels")
row(SIG, "length", "dict channels of lengths 3 and 2",
    lambda: wp.area_matrix({"a": [1, 2, 3], "b": [1, 2]}), ValueError, "different lengths")
row(SIG, "length", "asynchronous channel with 5 samples and 4 times",
    lambda: wp.area_matrix([loop(2)[:, 0], loop(2)[:5, 1]], times=[T8, T8[:4]]), ValueError,
    "has 5 samples but 4 times")
row(SIG, "option", "closure='circle'", lambda: wp.area_matrix(loop(3), closure="circle"), ValueError,
    "unknown closure 'circle'")
row(SIG, "option", "normalize='l2'", lambda: wp.area_matrix(loop(3), normalize="l2"), ValueError,
    "unknown normalize 'l2'")
row(SIG, "option", "unknown keyword foo=1", lambda: wp.area_matrix(loop(3), foo=1), TypeError,
    "unexpected keyword argument 'foo'")
row(SIG, "option", "times given by position", lambda: wp.area_matrix(loop(3), T8), TypeError,
    "positional argument")
row(SIG, "option", "tol=-1", lambda: wp.area_matrix(loop(3), closure="require", tol=-1), ValueError,
    "tol must be a finite number >= 0")
row(SIG, "option", "closure='require' on an open recording",
    lambda: wp.area_matrix(loop(3)[:5], closure="require"), ValueError, "not closed")
row("AreaMatrix[i, j]", "option", "an unknown channel name",
    lambda: wp.area_matrix(loop(3))["zz", "0"], KeyError, "unknown channel 'zz'")

ROLL = "wp.rolling_area_matrix(X, window, step)"
array_rows(ROLL, lambda X: wp.rolling_area_matrix(X, 2, 1), 3,
           ndim=(ValueError, "must be 2-dimensional"),
           empty=(ValueError, "0 samples"), single=(ValueError, "1 sample"),
           allnan=(None, "zero matrices (every window is a gap)",
                   lambda r: r.shape == (4, 3, 3) and not np.asarray(r).any()))
row(ROLL, "option", "window longer than the data", lambda: wp.rolling_area_matrix(loop(3), 100, 1),
    ValueError, "longer than the data")
row(ROLL, "option", "window=1", lambda: wp.rolling_area_matrix(loop(3), 1, 1), ValueError,
    "at least 2 samples")
row(ROLL, "option", "step=0", lambda: wp.rolling_area_matrix(loop(3), 4, 0), ValueError,
    "step must be at least 1")
row(ROLL, "option", "window=4.0", lambda: wp.rolling_area_matrix(loop(3), 4.0, 1), TypeError,
    "window must be an integer")
row(ROLL, "times", "duplicate times", lambda: wp.rolling_area_matrix(loop(3), 4, 1, times=np.zeros(8)),
    ValueError, "strictly increasing")
row(ROLL, "overflow", "channels near 1e200",
    lambda: wp.rolling_area_matrix(loop(3) * 1e200, 4, 2), ValueError, "overflow float64")
row("RollingAreas.pair(i, j)", "option", "an unknown channel name",
    lambda: wp.rolling_area_matrix(loop(3), 4, 2).pair("zz", "0"), KeyError,
    "unknown channel 'zz'")

SPEC = "wp.lead_spectrum(X, bands)"
array_rows(SPEC, lambda X: wp.lead_spectrum(X, bands=[0, 0.25, 0.5]), 3,
           ndim=(ValueError, "must be 2-dimensional"),
           empty=(ValueError, "0 samples"), single=(ValueError, "1 sample"),
           allnan=(ValueError, "no complete sample"))
row(SPEC, "option", "overlapping named bands",
    lambda: wp.lead_spectrum(loop(3), bands={"a": (0, 0.3), "b": (0.2, 0.5)}), ValueError,
    "overlap")
row(SPEC, "option", "decreasing band edges", lambda: wp.lead_spectrum(loop(3), bands=[0.3, 0.1]),
    ValueError, "strictly increasing")
row(SPEC, "option", "a negative band edge", lambda: wp.lead_spectrum(loop(3), bands=[-1, 0.5]),
    ValueError, ">= 0")
row(SPEC, "option", "bands given as text", lambda: wp.lead_spectrum(loop(3), bands="alpha"),
    TypeError, "bands must be None")
row(SPEC, "option", "irregular='spline'",
    lambda: wp.lead_spectrum(loop(3), irregular="spline"), ValueError, "irregular")
row(SPEC, "option", "closure='require' on an open recording",
    lambda: wp.lead_spectrum(loop(3)[:5], closure="require"), ValueError, "not closed")
row(SPEC, "times", "duplicate times",
    lambda: wp.lead_spectrum(loop(3), times=np.zeros(8)), ValueError, "strictly increasing")
row(SPEC, "overflow", "channels near 1e200 (areas beyond float64)",
    lambda: wp.lead_spectrum(loop(3) * 1e200, bands=[0, 0.5]), ValueError, "overflow float64")
row("LeadSpectrum.pair(i, j)", "option", "an unknown channel name",
    lambda: wp.lead_spectrum(loop(3)).pair("zz", "0"), KeyError, "unknown channel 'zz'")

BST = "wp.band_surrogate_test(X, bands)"
array_rows(BST, lambda X: wp.band_surrogate_test(X, bands=[0, 0.5], n_surrogates=3, seed=0), 3,
           ndim=(ValueError, "must be 2-dimensional"),
           empty=(ValueError, "0 samples"), single=(ValueError, "1 sample"),
           allnan=(ValueError, "no complete sample"), inf_match="an infinite value")
row(BST, "nan", "gaps leave no piece of 4 samples",
    lambda: wp.band_surrogate_test(np.r_[loop(3)[:2], [[nan] * 3], loop(3)[:2]], bands=[0, 0.5],
                                   n_surrogates=3, seed=0), ValueError,
    "no trial piece of at least 4")
row(BST, "option", "bands=None", lambda: wp.band_surrogate_test(loop(3), bands=None),
    ValueError, "needs bands")
row(BST, "option", "closure='none'",
    lambda: wp.band_surrogate_test(loop(3), bands=[0, 0.5], closure="none"), ValueError,
    "closure='chord' or 'detrend'")
row(BST, "option", "n_surrogates=0",
    lambda: wp.band_surrogate_test(loop(3), bands=[0, 0.5], n_surrogates=0), ValueError,
    "at least 1")
row(BST, "option", "method='bogus'",
    lambda: wp.band_surrogate_test(loop(3), bands=[0, 0.5], method="bogus"), ValueError,
    "method")

RSPEC = "wp.rolling_lead_spectrum(X, window, step, bands)"
array_rows(RSPEC, lambda X: wp.rolling_lead_spectrum(X, 4, 1, bands=[0, 0.5]), 3,
           ndim=(ValueError, "must be 2-dimensional"),
           empty=(ValueError, "0 samples"), single=(ValueError, "1 sample"),
           allnan=(ValueError, "gap-free data"), inf_match="an infinite value")
row(RSPEC, "option", "window=3", lambda: wp.rolling_lead_spectrum(loop(3), 3, 1, bands=[0, 0.5]),
    ValueError, "at least 4 samples")
row(RSPEC, "option", "window longer than the data",
    lambda: wp.rolling_lead_spectrum(loop(3), 100, 1, bands=[0, 0.5]), ValueError,
    "longer than the data")
row(RSPEC, "option", "bands=None", lambda: wp.rolling_lead_spectrum(loop(3), 4, 1, bands=None),
    ValueError, "needs bands")

ACC = "AreaAccumulator.update(chunk)"
array_rows(ACC, lambda X: wp.AreaAccumulator(3).update(X), 3,
           ndim=(ValueError, "must be 2-dimensional"),
           empty=(ValueError, "chunk has 0 samples"),
           single=(None, "count 1 (a chunk may be one row)", lambda r: r.count == 1),
           allnan=(None, "count 5, all gap", lambda r: r.count == 5 and r.gapped))
row(ACC, "dim", "a chunk with 2 channels for n=3", lambda: wp.AreaAccumulator(3).update(loop(2)),
    ValueError, "chunk has 2 channels but the accumulator was made for 3")
row("wp.AreaAccumulator(n)", "option", "n = 1", lambda: wp.AreaAccumulator(1), ValueError,
    "at least 2 channels")
row("wp.AreaAccumulator(n)", "option", "n = 2.0", lambda: wp.AreaAccumulator(2.0), TypeError,
    "n must be an integer")
row("wp.AreaAccumulator(n)", "length", "1 name for 3 channels",
    lambda: wp.AreaAccumulator(3, names=["a"]), ValueError, "names has 1 entries")
row("AreaAccumulator.merge(other)", "dim", "accumulators of 3 and 2 channels",
    lambda: wp.AreaAccumulator(3).merge(wp.AreaAccumulator(2)), ValueError, "cannot merge")
row("AreaAccumulator.merge(other)", "text", "an array", lambda: wp.AreaAccumulator(3).merge(loop(3)),
    TypeError, "needs an AreaAccumulator")
row("AreaAccumulator.result()", "empty", "nothing fed", lambda: wp.AreaAccumulator(3).result(),
    ValueError, "has seen 0 sample(s)")
row("AreaAccumulator.result()", "overflow", "chunks near 1e200 (areas beyond float64)",
    lambda: wp.AreaAccumulator(2).update(loop(2) * 1e200).result(), ValueError, "overflow float64")


def _state(**change):
    st = wp.AreaAccumulator(2).update(loop(2)).state()
    st.update(change)
    return st


row("AreaAccumulator.from_state(state)", "text", "a list instead of a dict",
    lambda: wp.AreaAccumulator.from_state([1]), TypeError, "state must be a dict")
row("AreaAccumulator.from_state(state)", "empty", "an empty dict",
    lambda: wp.AreaAccumulator.from_state({}), ValueError, "state is missing")
row("AreaAccumulator.from_state(state)", "text", "area = 'x'",
    lambda: wp.AreaAccumulator.from_state(_state(area="x")), TypeError, "state['area'] holds text")
row("AreaAccumulator.from_state(state)", "inf", "an infinite area",
    lambda: wp.AreaAccumulator.from_state(_state(area=[[0, inf], [-inf, 0]])), ValueError,
    "state['area'] contains an infinite")
row("AreaAccumulator.from_state(state)", "ndim", "first of shape (1, 2)",
    lambda: wp.AreaAccumulator.from_state(_state(first=[[1, 2]])), ValueError,
    "state['first'] must have 2 entries")
row("AreaAccumulator.from_state(state)", "option", "gapped = 'no'",
    lambda: wp.AreaAccumulator.from_state(_state(gapped="no")), TypeError,
    "state['gapped'] must be True or False")
row("AreaAccumulator.from_state(state)", "option", "count = 2.5",
    lambda: wp.AreaAccumulator.from_state(_state(count=2.5)), TypeError, "count must be an integer")

CO = "wp.cyclic_order(A)"
row(CO, "ndim", "a 2x3 matrix", lambda: wp.cyclic_order(np.zeros((2, 3))), ValueError,
    "must be a square matrix")
row(CO, "ndim", "a 1-D array", lambda: wp.cyclic_order(np.zeros(3)), ValueError,
    "A must be 2-dimensional")
row(CO, "empty", "a 0x0 matrix", lambda: wp.cyclic_order(np.zeros((0, 0))), ValueError,
    "at least 2")
row(CO, "single", "a 1x1 matrix", lambda: wp.cyclic_order(np.zeros((1, 1))), ValueError,
    "at least 2")
row(CO, "nan", "a NaN entry (a constant channel after normalising)",
    lambda: wp.cyclic_order(np.array([[0, nan], [nan, 0]])), ValueError, "A contains NaN")
row(CO, "inf", "an infinite entry", lambda: wp.cyclic_order(np.array([[0, inf], [-inf, 0]])),
    ValueError, "infinite")
row(CO, "text", "text", lambda: wp.cyclic_order([["a", "b"], ["c", "d"]]), TypeError, "text")
row(CO, "complex", "complex entries", lambda: wp.cyclic_order(np.array([[0, 1j], [-1j, 0]])),
    TypeError, "complex")
row(CO, "option", "a matrix that is not skew-symmetric", lambda: wp.cyclic_order(np.ones((3, 3))),
    ValueError, "not skew-symmetric")
row(CO, "option", "the zero matrix", lambda: wp.cyclic_order(np.zeros((3, 3))), ValueError,
    "A is zero")
row(CO, "option", "start=7 of 3", lambda: wp.cyclic_order(wp.area_matrix(loop(3)), start=7),
    ValueError, "out of range")
row(CO, "option", "start=1.0", lambda: wp.cyclic_order(wp.area_matrix(loop(3)), start=1.0),
    TypeError, "channel index or name")
row(CO, "option", "start by name without names",
    lambda: wp.cyclic_order(wp.area_matrix(loop(3)).values, start="a"), ValueError,
    "has no channel names")
row(CO, "length", "names=['a'] for 3 channels",
    lambda: wp.cyclic_order(wp.area_matrix(loop(3)).values, names=["a"]), ValueError,
    "names has 1 entries")

PT = "wp.pair_table(A)"
row(PT, "ndim", "a (3, 2) matrix", lambda: wp.pair_table(np.zeros((3, 2))), ValueError,
    "must be a square matrix")
row(PT, "text", "significance=an area matrix",
    lambda: wp.pair_table(wp.area_matrix(loop(3)), significance=wp.area_matrix(loop(3))),
    TypeError, "significance must be a SurrogateResult")
row(PT, "length", "a bootstrap of 2 channels for 3",
    lambda: wp.pair_table(wp.area_matrix(loop(3)),
                          bootstrap=wp.bootstrap_area(loop(2), n_boot=5, seed=0)),
    ValueError, "bootstrap is for channels ['0', '1']")
row(PT, "option", "significance with a detrended matrix",
    lambda: wp.pair_table(wp.area_matrix(loop(3), closure="detrend"),
                          significance=wp.surrogate_test(loop(3), n_surrogates=5, seed=0)),
    ValueError, "closure='detrend'")

HE = "wp.hilbert_energy(x)"
row(HE, "ndim", "a scalar", lambda: wp.hilbert_energy(3.0), ValueError, "at least one dimension")
row(HE, "option", "axis=5 for a 2-D x", lambda: wp.hilbert_energy(loop(2), axis=5), ValueError,
    "axis 5 is out of range")
returns(HE, "empty", "no samples (shape (0, 2))", lambda: wp.hilbert_energy(np.zeros((0, 2))),
        "zeros (no oscillation)", lambda r: r.tolist() == [0.0, 0.0])
returns(HE, "single", "one sample", lambda: wp.hilbert_energy(np.ones((1, 2))), "zeros",
        lambda r: r.tolist() == [0.0, 0.0])
row(HE, "nan", "NaN samples", lambda: wp.hilbert_energy(np.full(5, nan)), ValueError, "x contains NaN")
row(HE, "inf", "an infinite sample", lambda: wp.hilbert_energy(with_inf(2)), ValueError, "infinite")
row(HE, "text", "text", lambda: wp.hilbert_energy(["a", "b"]), TypeError, "x holds text")
row(HE, "object", "object array holding None", lambda: wp.hilbert_energy(objects(2)), TypeError,
    "non-real entry None")
row(HE, "complex", "complex samples", lambda: wp.hilbert_energy(loop(2) + 1j), TypeError, "complex")
row(HE, "overflow", "a Python int 10**400", lambda: wp.hilbert_energy(huge_int(2)), ValueError,
    "too large for float64")

for name, fn in (("wp.surrogate_test(X)", lambda X, **k: wp.surrogate_test(X, n_surrogates=3,
                                                                             seed=0, **k)),
                 ("wp.bootstrap_area(X)", lambda X, **k: wp.bootstrap_area(X, n_boot=3, seed=0,
                                                                           **k))):
    array_rows(name, fn, 3, ndim=(ValueError, "must be 2-dimensional"),
               empty=(ValueError, "0 samples"), single=(ValueError, "1 sample"),
               allnan=(ValueError, "no complete sample"))
    # gaps separate trials (pooled); pieces of fewer than 3 samples have no area
    row(name, "nan", "gaps leave no piece of 3 samples",
        lambda fn=fn: fn(np.r_[loop(3)[:2], [[nan] * 3], loop(3)[:2]]),
        ValueError, "no trial piece of at least 3")
    row(name, "option", "seed='abc'", lambda name=name: (
        wp.surrogate_test(loop(3), n_surrogates=3, seed="abc") if "surrogate" in name else
        wp.bootstrap_area(loop(3), n_boot=3, seed="abc")), TypeError,
        "seed must be None, an integer >= 0")
    row(name, "option", "seed=-1", lambda name=name: (
        wp.surrogate_test(loop(3), n_surrogates=3, seed=-1) if "surrogate" in name else
        wp.bootstrap_area(loop(3), n_boot=3, seed=-1)), ValueError, "seed must be >= 0")
    row(name, "times", "duplicate times", lambda fn=fn: fn(loop(3), times=np.zeros(8)), ValueError,
        "strictly increasing")
    row(name, "option", "progress='yes'", lambda fn=fn: fn(loop(3), progress="yes"), TypeError,
        "True, False or None")
row("wp.surrogate_test(X)", "option", "method='bogus'",
    lambda: wp.surrogate_test(loop(3), method="bogus"), ValueError, "unknown method 'bogus'")
row("wp.surrogate_test(X)", "option", "n_surrogates=0", lambda: wp.surrogate_test(loop(3),
                                                                                 n_surrogates=0),
    ValueError, "at least 1")
row("wp.surrogate_test(X)", "option", "n_surrogates=2.5",
    lambda: wp.surrogate_test(loop(3), n_surrogates=2.5), TypeError, "must be an integer")
row("wp.surrogate_test(X)", "overflow", "channels near 1e200 (areas beyond float64)",
    lambda: wp.surrogate_test(loop(3) * 1e200, n_surrogates=3, seed=0), ValueError,
    "overflow float64")
row("wp.bootstrap_area(X)", "option", "block=0", lambda: wp.bootstrap_area(loop(3), block=0),
    ValueError, "block must be between 2 and")
row("wp.bootstrap_area(X)", "option", "confidence=2",
    lambda: wp.bootstrap_area(loop(3), confidence=2), ValueError, "strictly between 0 and 1")
row("wp.bootstrap_area(X)", "option", "confidence='a'",
    lambda: wp.bootstrap_area(loop(3), confidence="a"), TypeError,
    "confidence must be a real number")
row("wp.bootstrap_area(X)", "option", "progress='yes'",
    lambda: wp.bootstrap_area(loop(3), progress="yes"), TypeError,
    "progress must be True, False or None")
row("wp.bootstrap_area(X)", "option", "keep='a'", lambda: wp.bootstrap_area(loop(3), keep="a"),
    TypeError, "keep must be True or False")
row("wp.bootstrap_area(X)", "option", "n_boot=1", lambda: wp.bootstrap_area(loop(3), n_boot=1),
    ValueError, "n_boot must be at least 2")

row("wp.bootstrap_area(X)", "option", "block='long'",
    lambda: wp.bootstrap_area(loop(3), block="long"), ValueError, "'auto' or a number of samples")
row("wp.bootstrap_area(X)", "single", "7 samples (fewer than 8)",
    lambda: wp.bootstrap_area(loop(3)[:7]), ValueError, "at least 8 samples")
row("wp.surrogate_test(X)", "option", "min_shift beyond a quarter of the samples",
    lambda: wp.surrogate_test(loop(3), min_shift=5), ValueError, "min_shift must be between 0")
row("wp.surrogate_test(X)", "option", "min_shift=1.5",
    lambda: wp.surrogate_test(loop(3), min_shift=1.5), TypeError, "min_shift must be an integer")
row("wp.surrogate_test(X)", "option", "min_shift with method='phase'",
    lambda: wp.surrogate_test(loop(3), method="phase", min_shift=1), ValueError,
    "applies to method='shift' only")

DL = "wp.decorrelation_lag(X)"
array_rows(DL, lambda X: wp.decorrelation_lag(X), 3, ndim=(ValueError, "must be 2-dimensional"),
           empty=(ValueError, "0 samples"), single=(ValueError, "1 sample"),
           allnan=(ValueError, "contains NaN (a gap)"))

NB = "wp.noise_fit_baseline(n)"
row(NB, "option", "n=1", lambda: wp.noise_fit_baseline(1), ValueError, "at least 2 channels")
row(NB, "option", "n=4.5", lambda: wp.noise_fit_baseline(4.5), TypeError, "n must be an integer")
row(NB, "option", "n_draws=0", lambda: wp.noise_fit_baseline(5, n_draws=0), ValueError,
    "n_draws must be at least 1")

BH = "wp.benjamini_hochberg(pvalues)"
row(BH, "option", "a p-value of 2", lambda: wp.benjamini_hochberg([0.5, 2]), ValueError,
    "must lie in [0, 1]")
row(BH, "text", "text", lambda: wp.benjamini_hochberg(["a"]), TypeError, "pvalues holds text")
row(BH, "complex", "a complex p-value", lambda: wp.benjamini_hochberg([0.5 + 1j]), TypeError,
    "complex")
row(BH, "object", "None", lambda: wp.benjamini_hochberg([None]), TypeError, "non-real entry None")
row(BH, "inf", "an infinite p-value", lambda: wp.benjamini_hochberg([0.1, inf]), ValueError,
    "infinite")
returns(BH, "nan", "all NaN", lambda: wp.benjamini_hochberg([nan, nan]),
        "all NaN (NaN entries are ignored and stay NaN)", lambda r: bool(np.isnan(r).all()))
returns(BH, "empty", "no p-values", lambda: wp.benjamini_hochberg([]), "an empty array",
        lambda r: r.shape == (0,))

CY = "wp.cycle_areas(X, i, j)"
array_rows(CY, wp.cycle_areas, 2, ndim=(ValueError, "must be 2-dimensional"),
           empty=(ValueError, "0 samples"), single=(ValueError, "1 sample"),
           allnan=(ValueError, "reference channel has no samples (all NaN)"))
row(CY, "option", "i == j", lambda: wp.cycle_areas(loop(3), 0, 0), ValueError,
    "must be different channels")
row(CY, "option", "j = 5 of 3", lambda: wp.cycle_areas(loop(3), 0, 5), ValueError, "out of range")
row(CY, "option", "i = 0.0", lambda: wp.cycle_areas(loop(3), 0.0, 1), TypeError,
    "channel index or name")
row(CY, "option", "hysteresis='a'", lambda: wp.cycle_areas(loop(3), hysteresis="a"), TypeError,
    "hysteresis must be a real number")
row(CY, "option", "hysteresis=-1", lambda: wp.cycle_areas(loop(3), hysteresis=-1), ValueError,
    "hysteresis must be a finite number >= 0")
row(CY, "option", "level='a'", lambda: wp.cycle_areas(loop(3), level="a"), TypeError,
    "level must be a real number")
row(CY, "inf", "level=inf", lambda: wp.cycle_areas(loop(3), level=inf), ValueError,
    "level must be finite")
row(CY, "times", "decreasing boundaries", lambda: wp.cycle_areas(loop(3), boundaries=[5, 3]),
    ValueError, "strictly increasing")
row(CY, "times", "repeated boundaries", lambda: wp.cycle_areas(loop(3), boundaries=[3, 3]),
    ValueError, "strictly increasing")
row(CY, "option", "a boundary beyond the last sample",
    lambda: wp.cycle_areas(loop(3), boundaries=[5, 300]), ValueError, "must lie within [0, 7]")
row(CY, "nan", "a NaN boundary", lambda: wp.cycle_areas(loop(3), boundaries=[nan, 3]), ValueError,
    "boundaries contains NaN")
row(CY, "option", "a constant reference channel",
    lambda: wp.cycle_areas(np.c_[np.ones(8), loop(2)]), ValueError, "reference channel is constant")
row(CY, "overflow", "channels near 1e200 (areas beyond float64)",
    lambda: wp.cycle_areas(np.tile(loop(2), (3, 1)) * 1e200), ValueError, "overflow float64")

LC = "wp.loop_cycles(X, x, y)"
array_rows(LC, wp.loop_cycles, 2, ndim=(ValueError, "must be 2-dimensional"),
           empty=(ValueError, "0 samples"), single=(ValueError, "1 sample"),
           allnan=(ValueError, "reference channel has no samples (all NaN)"))
row(LC, "option", "x == y", lambda: wp.loop_cycles(loop(3), 0, 0), ValueError,
    "must be different channels")
row(LC, "option", "kind='torque'", lambda: wp.loop_cycles(loop(2), kind="torque"), ValueError,
    "unknown kind 'torque'")
row(LC, "option", "cut='zero'", lambda: wp.loop_cycles(loop(2), cut="zero"), ValueError,
    "unknown cut 'zero'")
row(LC, "option", "level with cut='reversal'", lambda: wp.loop_cycles(loop(2), level=0.0),
    ValueError, "level applies to cut='crossing' only")
row(LC, "option", "hysteresis='a'", lambda: wp.loop_cycles(loop(2), hysteresis="a"), TypeError,
    "hysteresis must be a real number")
row(LC, "text", "an unknown unit", lambda: wp.loop_cycles(loop(2), units={"x": "furlongz",
                                                                         "y": "N"}),
    ValueError, "unknown unit 'furlongz' for x")
row(LC, "text", "unit text that is code", lambda: wp.loop_cycles(
    loop(2), units={"x": "__import__('os')", "y": "N"}), ValueError, "unknown unit")
row(LC, "option", "units that do not make an energy", lambda: wp.loop_cycles(
    loop(2), kind="force-displacement", units={"x": "s", "y": "N"}), ValueError,
    "do not give J as a force-displacement loop needs")
row(LC, "option", "the unit of one channel only", lambda: wp.loop_cycles(
    loop(2), units={"x": "mm"}), ValueError, "give the unit of both channels")
row(LC, "option", "a constant reference channel",
    lambda: wp.loop_cycles(np.c_[np.ones(8), loop(1)]), ValueError, "reference channel is constant")

RF = "wp.rainflow(X)"
array_rows(RF, wp.rainflow, 1, ndim=(ValueError, "must be 2-dimensional"),
           empty=(ValueError, "0 samples"), single=(ValueError, "1 sample"),
           allnan=(None, "no cycles (every row is a gap)", lambda r: len(r) == 0))
row(RF, "option", "x of a 1-D history", lambda: wp.rainflow(T8, x=0), ValueError,
    "this history is 1-D")
row(RF, "option", "x == y", lambda: wp.rainflow(loop(2), x=0, y=0), ValueError,
    "must be different channels")
row(RF, "option", "hysteresis=-1", lambda: wp.rainflow(T8, hysteresis=-1), ValueError,
    "hysteresis must be a finite number >= 0")
returns(RF, "empty", "a monotone history", lambda: wp.rainflow(np.arange(5.0)),
        "one half cycle: the whole range", lambda r: r.count.tolist() == [0.5]
        and r.range.tolist() == [4.0])

AL = "wp.align(channels, times)"
row(AL, "length", "5 samples, 4 times", lambda: wp.align([T8[:5], T8], times=[T8[:4], T8]),
    ValueError, "has 5 samples but 4 times")
row(AL, "option", "no times and no Series", lambda: wp.align([T8, T8]), ValueError,
    "times are needed")
row(AL, "times", "duplicate times", lambda: wp.align([T8, T8], times=[T8, np.zeros(8)]), ValueError,
    "strictly increasing")
row(AL, "option", "channels that do not overlap in time",
    lambda: wp.align([T8, T8], times=[T8, T8 + 100]), ValueError, "do not overlap in time")
row(AL, "ndim", "times as one 2-D array", lambda: wp.align([T8, T8], times=np.c_[T8, T8]),
    ValueError, "one time array per channel")
row(AL, "single", "one channel", lambda: wp.align([T8], times=[T8]), ValueError,
    "at least 2 channels")
row(AL, "single", "a channel of 1 sample", lambda: wp.align([T8[:1], T8], times=[T8[:1], T8]),
    ValueError, "1 sample(s); at least 2")
row(AL, "text", "a string", lambda: wp.align("abc"), TypeError, "channels must be a list")
row(AL, "length", "1 name for 2 channels", lambda: wp.align([T8, T8], times=[T8, T8], names=["a"]),
    ValueError, "names has 1 entries")
row(AL, "complex", "complex samples", lambda: wp.align([T8 + 1j, T8], times=[T8, T8]), TypeError,
    "complex")
row(AL, "inf", "an infinite time", lambda: wp.align([T8, T8], times=[np.r_[T8[:-1], inf], T8]),
    ValueError, "infinite")


# --------------------------------------------------------------------------- verdicts (issue 17)
for name, fn in (("wp.fit_test(X)", lambda X, **k: wp.fit_test(X, n_surrogates=3, **k)),
                 ("wp.drift_check(X)", lambda X, **k: wp.drift_check(X, warn=False, **k))):
    array_rows(name, fn, 3, ndim=(ValueError, "must be 2-dimensional"),
               empty=(ValueError, "0 samples"), single=(ValueError, "1 sample"),
               allnan=(ValueError, "contains NaN (a gap)"))
    row(name, "nan", "one NaN row (a gap)", lambda fn=fn: fn(np.r_[loop(3), [[nan] * 3]]),
        ValueError, "need gap-free data")
    row(name, "times", "duplicate times", lambda fn=fn: fn(loop(3), times=np.zeros(8)),
        ValueError, "strictly increasing")
    row(name, "length", "3 names for 2 channels", lambda fn=fn: fn(loop(2), names=list("abc")),
        ValueError, "names")
row("wp.fit_test(X)", "option", "n_surrogates=0", lambda: wp.fit_test(loop(3), n_surrogates=0),
    ValueError, "at least 1")
row("wp.fit_test(X)", "option", "closure='none'", lambda: wp.fit_test(loop(3), closure="none"),
    ValueError, "closure")
row("wp.fit_test(X)", "option", "seed='abc'", lambda: wp.fit_test(loop(3), seed="abc"),
    TypeError, "seed must be None, an integer >= 0")
row("wp.drift_check(X)", "option", "warn='yes'", lambda: wp.drift_check(loop(3), warn="yes"),
    TypeError, "warn must be True or False")
RL = "wp.reference_lags(X, ref)"
array_rows(RL, lambda X, **k: wp.reference_lags(X, 0, n_boot=3, **k), 2,
           ndim=(ValueError, "must be 2-dimensional"), empty=(ValueError, "0 samples"),
           single=(ValueError, "1 sample"), allnan=(ValueError, "contains NaN (a gap)"))
row(RL, "single", "15 samples", lambda: wp.reference_lags(loop(2, T=15), 0), ValueError,
    "at least 16 samples")
row(RL, "option", "reference='zz'", lambda: wp.reference_lags(loop(2, T=32), "zz"), ValueError,
    "unknown channel 'zz'")
row(RL, "option", "confidence=2", lambda: wp.reference_lags(loop(2, T=32), 0, confidence=2),
    ValueError, "strictly between 0 and 1")
row(RL, "option", "n_boot=1", lambda: wp.reference_lags(loop(2, T=32), 0, n_boot=1),
    ValueError, "at least 2")
row(RL, "nan", "constant reference", lambda: wp.reference_lags(
    np.c_[np.ones(32), loop(1, T=32)], 0), ValueError, "is constant")
row("filters.bandpass(X, lo, hi)", "option", "shortest >= longest",
    lambda: wp.filters.bandpass(loop(2, T=64), 10, 5), ValueError, "shortest < longest")
row("filters.bandpass(X, lo, hi)", "option", "a period of 1.5 samples",
    lambda: wp.filters.bandpass(loop(2, T=64), 1.5, 10), ValueError, "two samples")
row("filters.bandpass(X, lo, hi)", "times", "irregular times",
    lambda: wp.filters.bandpass(loop(2, T=64), 4, 10, times=np.arange(64.0) ** 1.5), ValueError,
    "not regularly spaced")
row("filters.bandpass(X, lo, hi)", "nan", "one NaN row",
    lambda: wp.filters.bandpass(np.r_[loop(2, T=64), [[nan, nan]]], 4, 10), ValueError,
    "gap-free data")
row("filters.highpass(X, longest)", "option", "longest=-1",
    lambda: wp.filters.highpass(loop(2, T=64), -1), ValueError, "positive period")
row("filters.highpass(X, longest)", "option", "longest beyond the recording",
    lambda: wp.filters.highpass(loop(2, T=64), 1000), ValueError, "longer than the recording")
row("filters.invert(X, channels)", "option", "an unknown channel",
    lambda: wp.filters.invert(loop(2), ["z"]), ValueError, "unknown channel 'z'")
row("filters.invert(X, channels)", "option", "a channel index out of range",
    lambda: wp.filters.invert(loop(2), [5]), ValueError, "out of range")
row("filters.difference(X)", "single", "shape (1, 2)", lambda: wp.filters.difference(
    np.ones((1, 2))), ValueError, "1 sample")
row("filters.detrend(X)", "nan", "one NaN row",
    lambda: wp.filters.detrend(np.r_[loop(2), [[nan, nan]]]), ValueError, "gap-free data")
row("filters.preprocess(X, ...)", "option", "bandpass=5 (not a pair)",
    lambda: wp.filters.preprocess(loop(2, T=64), bandpass=5), TypeError, "pair")
