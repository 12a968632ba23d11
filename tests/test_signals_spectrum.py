"""lead_spectrum and its companions: the exact split of the area matrix over frequency."""

import numpy as np
import pytest

import wedgepath as wp
from wedgepath.signals.spectrum import ResamplingWarning

RNG = np.random.default_rng(20261203)


def _walk(T=1500, n=5, seed=0, offset=50.0):
    rng = np.random.default_rng(seed)
    return rng.standard_normal((T, n)).cumsum(axis=0) + offset


def _with_gaps(X):
    X = X.copy()
    X[300:304] = np.nan          # a gap of 4 rows
    X[900, 2] = np.nan           # one incomplete row
    X[901:903] = np.nan
    X[1400] = np.nan             # a short last piece
    return X


def _rel(a, b):
    return float(np.max(np.abs(a - b)) / np.max(np.abs(b)))


BANDS = [None, [0, 0.01, 0.05, 0.2, 0.5], {"slow": (0, 0.02), "mid": (0.02, 0.1),
                                         "fast": (0.1, 0.5)}]


# --------------------------------------------------------------------------- the identity
@pytest.mark.parametrize("closure", ["chord", "none", "detrend"])
@pytest.mark.parametrize("bands", BANDS, ids=["bins", "edges", "named"])
@pytest.mark.parametrize("gaps", [False, True], ids=["whole", "gaps"])
def test_bands_add_up_to_the_area_matrix(closure, bands, gaps):
    X = _walk()
    X = _with_gaps(X) if gaps else X
    s = wp.lead_spectrum(X, bands=bands, closure=closure)
    A = wp.area_matrix(X, closure=closure).values
    assert np.all(s.rest == 0.0)            # these bands cover 0 .. Nyquist
    assert _rel(s.areas.sum(axis=0), A) < 1e-12
    assert np.allclose(s.areas, -np.swapaxes(s.areas, 1, 2), rtol=0, atol=0)


@pytest.mark.parametrize("gaps", [False, True], ids=["whole", "gaps"])
def test_bands_add_up_for_closure_require_and_with_times(gaps):
    base = _walk(T=400, n=4, seed=3)
    pieces = [np.vstack([base[:150], base[:1]]), np.vstack([base[200:380], base[200:201]])]
    X = np.vstack([pieces[0], np.full((2, 4), np.nan), pieces[1]]) if gaps else pieces[0]
    t = 0.004 * np.arange(X.shape[0]) + 7.0
    for closure in ("require", "detrend", "chord"):
        s = wp.lead_spectrum(X, times=t, bands=[0, 5, 20, 125], closure=closure)
        A = wp.area_matrix(X, times=t, closure=closure).values
        assert _rel(s.total(), A) < 1e-12 and np.all(s.rest == 0)
        assert s.frequency_unit == "cycles per time unit" and s.irregular is None


def test_bands_that_leave_frequencies_out_put_them_in_rest():
    X = _walk(seed=4)
    s = wp.lead_spectrum(X, bands={"alpha": (0.08, 0.12), "beta": (0.15, 0.3)})
    A = wp.area_matrix(X).values
    assert _rel(s.areas.sum(axis=0) + s.rest, A) < 1e-12
    assert np.max(np.abs(s.rest)) > 0.1 * np.max(np.abs(A))
    # the open path's end term has frequency 0: outside these bands it lands in rest
    so = wp.lead_spectrum(X, bands={"alpha": (0.08, 0.12)}, closure="none")
    assert _rel(so.total(), wp.area_matrix(X, closure="none").values) < 1e-12


def test_extreme_magnitudes_are_rescaled_exactly():
    X = _walk(T=300, n=3, seed=5)
    X[:, 0] *= 1e300
    X[:, 1] *= 1e-300
    s = wp.lead_spectrum(X, bands=[0, 0.1, 0.5])
    A = wp.area_matrix(X).values
    assert np.isfinite(s.areas).all()
    ok = np.abs(A) > 0
    assert np.max(np.abs((s.total() - A)[ok] / A[ok])) < 1e-9


# --------------------------------------------------------------------------- closed forms
def _tone_area(N, m, a, b, delta):
    """Chord-closed area of a cos(th k + alpha), b cos(th k + beta), k = 0..N-1, th = 2 pi m/N.

    Each shoelace term cos(u) cos(v + th) - cos(v) cos(u + th), u - v = delta, equals
    sin(th) sin(delta) by the product-to-sum formula cos x cos y = (cos(x-y) + cos(x+y))/2
    (Abramowitz & Stegun, Handbook of Mathematical Functions, 4.3.32); there are N of them
    on a whole period, halved: (N/2) a b sin(th) sin(delta).
    """
    return 0.5 * N * a * b * np.sin(2 * np.pi * m / N) * np.sin(delta)


def test_two_tones_lead_at_one_frequency_and_lag_at_another():
    N, m1, m2 = 400, 3, 40
    k = np.arange(N)
    th1, th2 = 2 * np.pi * m1 * k / N, 2 * np.pi * m2 * k / N
    d1, d2 = np.pi / 3, -np.pi / 2                     # a leads at m1, lags at m2
    b2 = -_tone_area(N, m1, 1.0, 1.0, d1) / _tone_area(N, m2, 1.0, 1.0, d2)  # cancel
    a = 2.0 * np.cos(th1 + 0.3) + np.cos(th2)
    b = 0.5 * np.cos(th1 + 0.3 - d1) + b2 * np.cos(th2 - d2)
    X = np.column_stack([a, b])
    edges = [0, (m1 + m2) / 2 / N, 0.5]
    s = wp.lead_spectrum(X, bands=edges)
    want = [_tone_area(N, m1, 2.0, 0.5, d1), _tone_area(N, m2, 1.0, b2, d2)]
    assert want[0] > 0 > want[1]
    assert np.allclose(s.pair(0, 1), want, rtol=1e-12, atol=1e-12 * abs(want[0]))
    A = wp.area_matrix(X).values[0, 1]
    assert abs(A) < 1e-10 * abs(want[0])              # broadband: the leads cancel
    # normalised: sin(delta) in each band whatever the amplitudes
    assert np.allclose(s.normalized[:, 0, 1], [np.sin(d1), np.sin(d2)], rtol=0, atol=1e-12)
    # per bin: the two bins hold the two areas, nothing else does
    sb = wp.lead_spectrum(X)
    assert sb.areas.shape == (N // 2 + 1, 2, 2)
    assert np.allclose(sb.pair(0, 1)[[m1, m2]], want, rtol=1e-12)
    others = np.delete(sb.pair(0, 1), [m1, m2])
    assert np.max(np.abs(others)) < 1e-12 * abs(want[0])
    assert np.allclose(sb.bands[m1], [(m1 - 0.5) / N, (m1 + 0.5) / N])


def test_continuous_limit_is_pi_m_sin_delta():
    # A continuous closed curve a cos(2 pi m s + alpha), b cos(2 pi m s + beta), s in [0, 1):
    # (1/2) closed-integral (x dy - y dx) = pi m a b sin(alpha - beta) (Green's theorem; the
    # ellipse traced m times).  The discrete band area (N/2) a b sin(2 pi m/N) sin(delta)
    # approaches it as N grows, with relative error (2 pi m/N)^2 / 6 (Taylor series of sin).
    m, delta = 2, 0.7
    for N in (50, 200, 800):
        s = np.arange(N) / N
        X = np.column_stack([np.cos(2 * np.pi * m * s), np.cos(2 * np.pi * m * s - delta)])
        val = wp.lead_spectrum(X, times=s, bands=[0, 1.5 * m, N / 2]).areas[0, 0, 1]
        cont = np.pi * m * np.sin(delta)
        assert abs(val / cont - 1) == pytest.approx((2 * np.pi * m / N) ** 2 / 6, rel=0.02)


# --------------------------------------------------------------------------- independent checks
def test_agrees_with_scipy_cross_spectral_density():
    from scipy.signal import csd

    X = _walk(T=1024, n=3, seed=6)
    N = X.shape[0]
    s = wp.lead_spectrum(X)                     # one band per DFT bin
    for i, j in [(0, 1), (1, 2), (2, 0)]:
        # scipy.signal.csd (one segment, boxcar window, no detrending, scaling="spectrum")
        # returns P[m] = 2 conj(X_i[m]) X_j[m] / N^2 for 0 < m < N/2 (scipy documentation,
        # csd/welch one-sided spectrum); the identity then reads a_m = -N sin(2 pi m/N) Im P[m]
        f, P = csd(X[:, i], X[:, j], fs=1.0, window="boxcar", nperseg=N, noverlap=0,
                   detrend=False, scaling="spectrum", return_onesided=True)
        m = np.arange(f.size)
        ref = -N * np.sin(2 * np.pi * m / N) * P.imag
        ref[0] = 0.0
        ref[-1] = 0.0
        assert np.allclose(f, s.bands.mean(axis=1)[: f.size] * 0 + m / N)
        got = s.pair(i, j)
        assert np.max(np.abs(got - ref)) < 1e-10 * np.max(np.abs(ref))


def test_band_equals_area_matrix_of_band_filtered_signals():
    # An ideal band-pass (DFT bins outside the band zeroed) followed by the time-domain
    # area_matrix gives the band area: the bins are orthogonal.  A zero-phase Butterworth
    # band-pass (scipy.signal.sosfiltfilt) approaches it as the filter sharpens.
    from scipy.signal import butter, sosfiltfilt

    rng = np.random.default_rng(7)
    base = np.convolve(rng.standard_normal(8003), np.ones(5) / 5, mode="same")
    X = np.column_stack([base[3:], base[:-3], rng.standard_normal(8000)])
    X += 0.5 * rng.standard_normal((8000, 3))
    lo, hi = 0.05, 0.15
    s = wp.lead_spectrum(X, bands={"b": (lo, hi)})
    F = np.fft.rfft(X - X.mean(axis=0), axis=0)
    f = np.fft.rfftfreq(X.shape[0])
    F[(f < lo) | (f >= hi)] = 0
    Y = np.fft.irfft(F, n=X.shape[0], axis=0)
    assert _rel(s.areas[0], wp.area_matrix(Y).values) < 1e-10
    errs = []
    for order in (1, 2, 4, 8):
        sos = butter(order, [lo, hi], btype="bandpass", fs=1.0, output="sos")
        Z = sosfiltfilt(sos, X, axis=0, padlen=1000)
        errs.append(_rel(wp.area_matrix(Z).values, s.areas[0]))
    assert all(e1 < e0 for e0, e1 in zip(errs, errs[1:])) and errs[-1] < 0.05


# --------------------------------------------------------------------------- irregular times
def test_irregular_times_index_is_exact_resample_reports_its_error():
    rng = np.random.default_rng(8)
    T = 3000
    t = np.cumsum(rng.uniform(0.5, 1.5, T))
    f0 = 0.02                                        # a slow tone, a lead of 0.6 rad
    X = np.column_stack([np.sin(2 * np.pi * f0 * t), np.sin(2 * np.pi * f0 * t - 0.6)])
    X += 0.01 * rng.standard_normal((T, 2))
    A = wp.area_matrix(X, times=t).values
    bands = {"slow": (0, 0.05), "fast": (0.05, 1.0)}
    si = wp.lead_spectrum(X, times=t, bands=bands, irregular="index")
    assert si.irregular == "index" and si.resampling_error is None
    assert _rel(si.total(), A) < 1e-12
    sr = wp.lead_spectrum(X, times=t, bands=bands)
    assert sr.irregular == "resample"
    assert _rel(sr.total() + sr.resampling_error, A) < 1e-12
    assert np.max(np.abs(sr.resampling_error)) < 0.01 * np.max(np.abs(A))
    # resampled at the true times, the tone's lead sits in its band
    assert sr.pair(0, 1)[0] > 0.98 * A[0, 1] and abs(sr.pair(0, 1)[1]) < 0.02 * A[0, 1]


def test_resampling_warns_when_it_changes_the_areas():
    rng = np.random.default_rng(9)
    t = np.cumsum(rng.uniform(0.2, 3.0, 500))
    X = rng.standard_normal((500, 2))
    with pytest.warns(ResamplingWarning, match="irregular='index'"):
        s = wp.lead_spectrum(X, times=t, bands=[0, 0.5])
    A = wp.area_matrix(X).values
    assert _rel(s.total() + s.resampling_error, A) < 1e-12


# --------------------------------------------------------------------------- normalised
def test_normalised_band_values_lie_in_minus_one_one():
    X = _walk(T=2000, n=4, seed=10)
    s = wp.lead_spectrum(X, bands=[0, 0.005, 0.02, 0.1, 0.5])
    v = s.normalized[~np.isnan(s.normalized)]
    assert v.size and np.all(np.abs(v) <= 1 + 1e-12)
    # the band energy is the Hilbert energy restricted to the band: summed, the full one
    E = wp.hilbert_energy(X)
    assert np.allclose(s.energy.sum(axis=0), E, rtol=1e-10)


def test_empty_band_gives_nan_normalised_and_zero_area():
    X = _walk(T=100, n=2, seed=11)
    s = wp.lead_spectrum(X, bands={"between bins": (0.101, 0.109), "rest": (0.2, 0.5)})
    assert np.all(s.areas[0] == 0) and np.isnan(s.normalized[0, 0, 1])


# --------------------------------------------------------------------------- significance
def test_band_significance_finds_the_band_that_carries_the_lead():
    rng = np.random.default_rng(12)
    T = 3000
    # slow motion: noise low-passed at 0.03 cycles per sample (DFT bins above zeroed)
    F = np.fft.rfft(rng.standard_normal(T + 40))
    F[np.fft.rfftfreq(T + 40) >= 0.03] = 0
    slow = np.fft.irfft(F, n=T + 40)
    slow /= slow.std()
    # a leads b in the slow band (b is a's slow part 6 samples later); fast parts unrelated
    a = slow[6:T + 6] + 0.5 * rng.standard_normal(T)
    b = slow[:T] + 0.5 * rng.standard_normal(T)
    c = rng.standard_normal(T)
    X = np.column_stack([a, b, c])
    bands = {"slow": (0, 0.03), "fast": (0.1, 0.5)}
    for method in ("shift", "phase"):
        r = wp.band_surrogate_test(X, bands=bands, method=method, n_surrogates=299, seed=1,
                                   progress=False)
        sig = r.significant(0.05)
        assert sig[0, 0, 1] and not sig[1, 0, 1]
        assert not sig[:, 0, 2].any() and not sig[:, 1, 2].any()
        s = wp.lead_spectrum(X, bands=bands)
        assert _rel(r.observed, s.areas) < 1e-10
        # q-values: Benjamini-Hochberg over all pairs and bands together (scipy's
        # false_discovery_control, Benjamini & Hochberg 1995)
        from scipy.stats import false_discovery_control
        iu = np.triu_indices(3, 1)
        p = r.pvalues[:, iu[0], iu[1]].reshape(-1)
        assert np.allclose(r.qvalues[:, iu[0], iu[1]].reshape(-1),
                           false_discovery_control(p, method="bh"))
        assert np.allclose(r.qvalues, np.swapaxes(r.qvalues, 1, 2), equal_nan=True)


def test_spectral_shift_surrogate_is_a_circular_shift():
    # a shift of channel 1 by s samples, done on the spectrum, equals the time-domain
    # circular shift: band areas of np.roll agree
    from wedgepath.signals.spectrum import _band_matrix_batch, _sqrt_weights, _assign

    X = _walk(T=256, n=2, seed=13)
    X = X - X.mean(axis=0)
    s_shift = 37
    Y = X.copy()
    Y[:, 1] = np.roll(X[:, 1], s_shift)
    want = wp.lead_spectrum(Y, bands=[0, 0.1, 0.5]).areas
    F = np.fft.rfft(X, axis=0)
    N = 256
    m = np.arange(F.shape[0])
    F[:, 1] *= np.exp(-2j * np.pi * m * s_shift / N)
    sw = _sqrt_weights(N)[:, None]
    got = _band_matrix_batch((F.real * sw)[None], (F.imag * sw)[None],
                             _assign(m / N, np.array([[0, 0.1], [0.1, 0.5]]), True), 2)[0]
    assert _rel(got, want) < 1e-12


def test_band_surrogates_are_calibrated_under_the_null():
    # independent AR(1) channels: band p-values are (discretely) uniform; seeded
    rng = np.random.default_rng(14)
    ps = []
    for rep in range(30):
        e = rng.standard_normal((600, 2))
        X = np.empty_like(e)
        X[0] = e[0]
        for k in range(1, 600):
            X[k] = 0.6 * X[k - 1] + e[k]
        r = wp.band_surrogate_test(X, bands=[0, 0.1, 0.5], method="phase", n_surrogates=19,
                                   seed=rep, progress=False)
        ps.extend(r.pvalues[:, 0, 1].tolist())
    ps = np.array(ps)
    # P(p <= 0.1) = 2/20 exactly for a valid test with 19 surrogates; 60 draws
    assert 0 <= np.mean(ps <= 0.1) <= 0.25 and 0.3 < np.mean(ps) < 0.7


# --------------------------------------------------------------------------- rolling
def test_rolling_band_areas_add_up_to_rolling_areas_and_match_windows():
    X = _walk(T=1200, n=3, seed=15)
    r = wp.rolling_lead_spectrum(X, 300, 100, bands=[0, 0.02, 0.1])    # leaves 0.1..0.5 out
    R = wp.rolling_area_matrix(X, 300, 100).areas
    assert r.shape == (R.shape[0], 2, 3, 3)
    assert _rel(r.areas.sum(axis=1) + r.rest, R) < 1e-11
    k = 4
    one = wp.lead_spectrum(X[100 * k:100 * k + 300], bands=[0, 0.02, 0.1])
    assert _rel(r.areas[k], one.areas) < 1e-11 and _rel(r.rest[k], one.rest) < 1e-10
    df = r.to_frame()
    assert len(df) == r.shape[0] * 2 * 3
    assert np.allclose(r.pair(0, 1), r.areas[:, :, 0, 1])


# --------------------------------------------------------------------------- results
def test_result_labels_frame_and_repr():
    import pandas as pd

    X = pd.DataFrame(_walk(T=500, n=3, seed=16), columns=["x", "y", "z"])
    X.attrs["units"] = {"x": "mV", "y": "mV"}
    s = wp.lead_spectrum(X, times=np.arange(500) / 250.0, bands={"delta": (0, 4), "theta": (4, 8)})
    assert s.names == ("x", "y", "z") and s.band_names == ("delta", "theta")
    assert np.allclose(s.bands, [[0, 4], [4, 8]])
    assert dict(s.units) == {"x": "mV", "y": "mV"}
    assert s.areas.flags.writeable is False
    df = s.to_frame()
    assert len(df) == 2 * 3 and list(df["band_name"].unique()) == ["delta", "theta"]
    assert np.allclose(df["area"], s.areas[:, [0, 0, 1], [1, 2, 2]].reshape(-1))
    text = repr(s)
    assert "\n" not in text and len(text) <= 120 and "leads" in text
    assert np.asarray(s).shape == (2, 3, 3) and np.allclose(s.pair("x", "y"), s.areas[:, 0, 1])


def test_input_is_not_modified():
    X = _with_gaps(_walk(T=1500, n=3, seed=17))
    before = X.copy()
    wp.lead_spectrum(X, bands=[0, 0.1, 0.5], closure="detrend")
    assert np.array_equal(X, before, equal_nan=True)


@pytest.mark.parametrize("bands, err, match", [
    ({"a": (0, 0.2), "b": (0.1, 0.3)}, ValueError, "overlap"),
    ([0.2, 0.1], ValueError, "increasing"),
    ([-0.1, 0.2], ValueError, ">= 0"),
    ([0.1], ValueError, "at least 2"),
    ("alpha", TypeError, "bands must be"),
    ({"a": "low"}, TypeError, "pair"),
    ({"a": (0.3, 0.1)}, ValueError, "upper edge"),
    ([0, np.inf], ValueError, "finite"),
])
def test_bad_bands_are_refused_clearly(bands, err, match):
    with pytest.raises(err, match=match):
        wp.lead_spectrum(_walk(T=50, n=2), bands=bands)


def test_bad_arguments_are_refused_clearly():
    X = _walk(T=50, n=2)
    with pytest.raises(ValueError, match="irregular"):
        wp.lead_spectrum(X, irregular="spline")
    with pytest.raises(ValueError, match="closure"):
        wp.lead_spectrum(X, closure="loop")
    with pytest.raises(ValueError, match="not closed"):
        wp.lead_spectrum(X, closure="require", bands=[0, 0.5])
    with pytest.raises(ValueError, match="bands=None asks for"):
        wp.lead_spectrum(np.zeros((300000, 16)))
    with pytest.raises(ValueError, match="needs bands"):
        wp.band_surrogate_test(X, bands=None)
    with pytest.raises(ValueError, match="closure='chord' or 'detrend'"):
        wp.band_surrogate_test(X, bands=[0, 0.5], closure="none")
    Xg = X.copy()
    Xg[5] = np.nan
    with pytest.raises(ValueError, match="gap"):
        wp.rolling_lead_spectrum(Xg, 10, 5, bands=[0, 0.5])
    with pytest.raises(ValueError, match="window"):
        wp.rolling_lead_spectrum(X, 3, 1, bands=[0, 0.5])


def test_per_bin_values_are_the_continuous_polyline_spectrum_summed_over_aliases():
    # The continuous analogue: a closed curve of period P with Fourier coefficients c_k has
    # (1/2) closed-integral (x_i dx_j - x_j dx_i) = 4 pi sum_{k>0} k Im(c_ik conj(c_jk))
    # (Parseval's theorem for Fourier series).  The polyline through N samples at unit steps
    # has c_k = X[k mod N] sinc^2(k/N) / N (the hat function's transform); checked below by
    # quadrature (scipy.integrate.quad).  Grouping k = +-m (mod N) gives lead_spectrum's bin m.
    from scipy.integrate import quad

    rng = np.random.default_rng(21)
    N = 8
    X = rng.standard_normal((N, 2))
    F = np.fft.fft(X, axis=0)
    tt = np.arange(N + 1.0)
    loop = np.vstack([X, X[:1]])
    for k in (1, 3, 11):
        re = quad(lambda t: np.interp(t, tt, loop[:, 0]) * np.cos(2 * np.pi * k * t / N), 0, N,
                  points=tt[1:-1], limit=200)[0] / N
        im = -quad(lambda t: np.interp(t, tt, loop[:, 0]) * np.sin(2 * np.pi * k * t / N), 0, N,
                   points=tt[1:-1], limit=200)[0] / N
        want = F[k % N, 0] * np.sinc(k / N) ** 2 / N
        assert abs(complex(re, im) - want) < 1e-10
    s = wp.lead_spectrum(X)
    cross = np.imag(F[:, 0] * np.conj(F[:, 1])) / N ** 2
    kk = np.arange(1, 4000 * N + 1)
    terms = 4 * np.pi * kk * np.sinc(kk / N) ** 4 * cross[kk % N]
    for m in range(1, N // 2):
        alias = terms[(kk % N) == m].sum() + terms[(kk % N) == N - m].sum()
        assert alias == pytest.approx(s.pair(0, 1)[m], rel=1e-9, abs=1e-12)


def test_named_bands_keep_the_callers_order():
    X = _walk(T=800, n=3, seed=22)
    up = wp.lead_spectrum(X, bands={"slow": (0, 0.02), "mid": (0.05, 0.1), "fast": (0.1, 0.5)})
    down = wp.lead_spectrum(X, bands={"fast": (0.1, 0.5), "mid": (0.05, 0.1), "slow": (0, 0.02)})
    assert down.band_names == ("fast", "mid", "slow")
    assert np.array_equal(down.areas, up.areas[::-1]) and np.array_equal(down.rest, up.rest)
    assert np.allclose(down.bands, up.bands[::-1])


@pytest.mark.parametrize("closure", ["chord", "detrend", "none"])
def test_irregular_times_with_gaps_account_for_every_area(closure):
    rng = np.random.default_rng(23)
    X = _with_gaps(_walk(seed=24))
    t = np.cumsum(rng.uniform(0.5, 1.5, X.shape[0]))
    A = wp.area_matrix(X, times=t, closure=closure).values
    import warnings
    with warnings.catch_warnings():
        # for closure="none" the origin-dependent end term dominates and no warning is due
        warnings.simplefilter("ignore", ResamplingWarning)
        sr = wp.lead_spectrum(X, times=t, bands=[0, 0.05, 1.0], closure=closure)
    assert sr.irregular == "resample"
    assert _rel(sr.total() + sr.resampling_error, A) < 1e-12
    si = wp.lead_spectrum(X, times=t, bands=[0, 0.05, 1.0], closure=closure, irregular="index")
    assert _rel(si.total(), A) < 1e-12


# --------------------------------------------------------------------------- trials (issue 16)
def _band_trials(seed, lead=True, L=60, k=10):
    """k trials of L rows separated by NaN rows; with ``lead`` a smoothed drive seen by two
    sensors 3 samples apart (channel 0 first), else independent noise."""
    rng = np.random.default_rng(seed)
    rows = []
    for _ in range(k):
        d = np.convolve(rng.standard_normal(L + 30), np.ones(8) / 8, mode="same")
        Y = np.column_stack([d[10:10 + L], d[7:7 + L]]) if lead else np.zeros((L, 2))
        rows += [Y + 0.3 * rng.standard_normal((L, 2)), np.full((1, 2), np.nan)]
    return np.vstack(rows[:-1]), rows[0]


BANDS2 = {"slow": (0, 0.05), "fast": (0.05, 0.5)}


@pytest.mark.parametrize("method", ["shift", "phase"])
def test_band_significance_of_one_piece_is_the_same_through_trials(method):
    # the pooled code path with a single trial reproduces the single-piece test exactly
    rng = np.random.default_rng(3)
    drive = np.convolve(rng.standard_normal(2100), np.ones(20) / 20, mode="same")
    X = np.column_stack([drive[5:2005], drive[:2000]]) + 0.1 * rng.standard_normal((2000, 2))
    a = wp.band_surrogate_test(X, bands=BANDS2, n_surrogates=49, seed=0, method=method)
    b = wp.band_surrogate_test(X, bands=BANDS2, n_surrogates=49, seed=0, method=method,
                               trials=np.zeros(2000))
    np.testing.assert_array_equal(a.pvalues, b.pvalues)
    np.testing.assert_allclose(b.observed, a.observed, rtol=1e-12, atol=0)


def test_band_significance_pools_trials_where_one_piece_cannot():
    found_pooled = found_single = 0
    for s in range(8):
        X, first = _band_trials(s)
        pooled = wp.band_surrogate_test(X, bands=BANDS2, n_surrogates=99, seed=s)
        # the statistic is the pooled band area that lead_spectrum gives for the same gaps
        np.testing.assert_allclose(pooled.observed, np.asarray(
            wp.lead_spectrum(X, bands=BANDS2).areas), rtol=1e-10, atol=1e-12)
        found_pooled += bool(pooled.pvalues[1, 0, 1] <= 0.05)
        found_single += bool(wp.band_surrogate_test(first, bands=BANDS2, n_surrogates=99,
                                                    seed=s).pvalues[1, 0, 1] <= 0.05)
    assert found_pooled >= 6 and found_single <= 3, (found_pooled, found_single)


def test_pooled_band_significance_is_calibrated_under_the_null():
    # 40 null data sets of 10 independent-noise trials, two bands: each band's p <= 0.05
    # in about 5% (binomial: more than 7 of 40 has probability below 1% at a 5% rate)
    hits = np.zeros(2)
    for s in range(40):
        X, _ = _band_trials(500 + s, lead=False)
        hits += wp.band_surrogate_test(X, bands=BANDS2, n_surrogates=99,
                                       seed=s).pvalues[:, 0, 1] <= 0.05
    assert (hits <= 7).all(), hits
