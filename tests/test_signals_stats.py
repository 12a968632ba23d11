"""Cyclic order, significance (surrogates, FDR, bootstrap), per-cycle loops, progress.

Each reference is named beside its check: a published model or definition,
a closed form derived in the comment, or an independent library routine
(scipy.stats).
"""

from __future__ import annotations

import io
import sys

import numpy as np
import pandas as pd
import pytest
from scipy import stats

import wedgepath as wp
from wedgepath import _bars


def same_cycle(a, b):
    """True when sequence b is a rotation of sequence a."""
    a, b = list(a), list(b)
    if len(a) != len(b) or b[0] not in a:
        return False
    k = a.index(b[0])
    return a[k:] + a[:k] == b


def broadband(T, seed, smooth=8):
    rng = np.random.default_rng(seed)
    return np.convolve(rng.standard_normal(T + smooth), np.ones(smooth) / smooth, mode="valid")[:T]


# --------------------------------------------------------------------------- cyclic order
class TestCyclicOrder:
    @pytest.mark.parametrize("n", [3, 5, 8])
    def test_evenly_spaced_sinusoids_exact(self, n):
        # x_k = sin(t - alpha_k) over whole cycles gives A[i, j] = c sin(alpha_j - alpha_i)
        # (c = K (N/2) sin(2 pi/N), see test_sampled_ellipse_formula).  With
        # u_k = exp(i alpha_k), A = (c/2i)(conj(u) u^T - u u^H), so
        # A u = (c/2i)(conj(u) sum u_k^2 - n u) = i (c n/2) u when sum u_k^2 = 0,
        # true for n >= 3 evenly spaced alpha (derived here).  Hence in this special
        # case the positions (eigenvector arguments) are the delays exactly and the
        # fit is 1 (rank 2).
        rng = np.random.default_rng(n)
        alpha = rng.permutation(n) * 2 * np.pi / n
        t = 2 * np.pi * np.arange(3 * 40) / 40
        X = np.sin(t[:, None] - alpha[None, :])
        res = wp.cyclic_order(wp.area_matrix(X), start=0)
        want = np.mod(alpha - alpha[0], 2 * np.pi)
        assert np.allclose(np.exp(1j * res.positions), np.exp(1j * want), atol=1e-9)
        assert res.order.tolist() == np.argsort(want).tolist()
        assert res.fit == pytest.approx(1.0, abs=1e-12)
        assert np.allclose(res.moduli, 1.0)

    @pytest.mark.parametrize("seed", range(5))
    def test_chain_of_offsets_recovers_order_under_noise(self, seed):
        # Chain-of-offsets model of Baryshnikov & Schlafly, "Cyclicity in
        # multivariate time series and applications to functional MRI data",
        # IEEE CDC 2016: x_k(t) = a_k f(t - alpha_k) + noise, f periodic (here
        # a non-sinusoidal wave), delays in unknown order.  The leading
        # eigenvector of the area matrix must return the order of the delays
        # (up to where the cycle starts), with a high fit.
        rng = np.random.default_rng(seed)
        n, T = 8, 3000
        alpha = rng.permutation(n) * 2 * np.pi / n + rng.uniform(-0.1, 0.1, n)
        t = np.arange(T) * 2 * np.pi / 97
        f = lambda s: np.sign(np.sin(s)) * np.abs(np.sin(s)) ** 0.5 + 0.3 * np.sin(2 * s)  # noqa: E731
        amp = rng.uniform(0.5, 2.0, n)
        X = amp * f(t[:, None] - alpha[None, :]) + 0.7 * rng.standard_normal((T, n))
        res = wp.cyclic_order(wp.area_matrix(X))
        assert same_cycle(np.argsort(alpha).tolist(), res.order.tolist())
        assert res.fit > 0.9

    def test_fit_is_low_without_a_cycle(self):
        # independent white noise: no single cycle; for 16 channels the leading
        # pair explains well under half of ||A||^2 (the chain model above: > 0.9)
        X = np.random.default_rng(0).standard_normal((4000, 16))
        assert wp.cyclic_order(wp.area_matrix(X)).fit < 0.6

    def test_each_leads_the_next(self):
        rng = np.random.default_rng(3)
        alpha = rng.permutation(6) * 2 * np.pi / 6
        t = np.arange(2000) * 2 * np.pi / 50
        X = np.sin(t[:, None] - alpha[None, :]) + 0.2 * rng.standard_normal((2000, 6))
        A = wp.area_matrix(X)
        order = wp.cyclic_order(A).order
        for a, b in zip(order, np.roll(order, -1)):
            assert A[a, b] > 0                     # A[i, j] > 0: i leads j (DESIGN.md)

    def test_two_channels_and_names(self):
        t = np.arange(200) * 2 * np.pi / 50
        df = pd.DataFrame({"late": np.sin(t - 0.4), "early": np.sin(t)})
        res = wp.cyclic_order(wp.area_matrix(df), start="early")
        assert res.ordered_names == ("early", "late")
        assert res.names == ("late", "early") and res.closure == "chord"
        fr = res.to_frame()                 # one row per channel, in cycle order
        assert list(fr.columns) == ["rank", "channel", "position_rad", "modulus"]
        assert fr["channel"].tolist() == ["early", "late"] and fr["rank"].tolist() == [0, 1]
        assert fr["position_rad"].tolist() == [0.0, pytest.approx(np.pi / 2)]
        # a plain matrix gets the names "0", "1", ... (or the ones given)
        plain = wp.cyclic_order(wp.area_matrix(df).values)
        assert plain.names == ("0", "1") and plain.closure is None
        named = wp.cyclic_order(wp.area_matrix(df).values, names=["L", "E"], start="E")
        assert named.ordered_names == ("E", "L")
        assert res.fit == 1.0
        assert res.positions[0] == pytest.approx(np.pi / 2)   # two channels: always a quarter cycle

    def test_bad_input(self):
        with pytest.raises(ValueError, match="square"):
            wp.cyclic_order(np.zeros((2, 3)))
        with pytest.raises(ValueError, match="not skew-symmetric"):
            wp.cyclic_order(np.array([[0.0, 1.0], [1.0, 0.0]]))
        with pytest.raises(ValueError, match="zero"):
            wp.cyclic_order(np.zeros((3, 3)))
        with pytest.raises(ValueError, match="NaN"):
            wp.cyclic_order(np.array([[0.0, np.nan], [np.nan, 0.0]]))
        with pytest.raises(ValueError, match="at least 2"):
            wp.cyclic_order(np.zeros((1, 1)))
        with pytest.raises(ValueError, match="out of range"):
            wp.cyclic_order(np.array([[0.0, 1.0], [-1.0, 0.0]]), start=5)


def plane_positions(delays, amps):
    """Closed-form positions in the cycle of noise-free sines ``a_k sin(t - alpha_k)``.

    Derived here.  For ``x(t) = u sin t + w cos t`` (u, w in R^n), one cycle gives
    ``A[i, j] = pi (w_i u_j - u_i w_j)`` (integrate (1/2)(x_i x_j' - x_j x_i') over
    [0, 2 pi]).  With ``a_k sin(t - alpha_k)``: ``u = p = a cos(alpha)``,
    ``w = -q = -a sin(alpha)``, so ``A = pi (p q^T - q p^T)`` (sampled over whole
    cycles the factor changes, the matrix is proportional).  Gram-Schmidt gives an
    orthonormal basis ``e1 = p/|p|``, ``e2`` of span(p, q) with
    ``A e1 = -lambda e2``, ``A e2 = lambda e1``, hence
    ``A (e1 + i e2) = i lambda (e1 + i e2)``: the leading eigenvector, up to a
    complex factor, so the positions are the angles of the rows ``(e1_k, e2_k)``.
    Rows of ``[p q]`` are ``(e1_k, e2_k) R`` with R upper triangular, positive
    diagonal: an orientation-preserving linear map, which keeps the cyclic
    order of the directions ``alpha_k`` but not their angles.
    """
    p = amps * np.cos(delays)
    q = amps * np.sin(delays)
    e1 = p / np.linalg.norm(p)
    e2 = q - (q @ e1) * e1
    e2 /= np.linalg.norm(e2)
    return np.mod(np.arctan2(e2, e1) - np.arctan2(e2[0], e1[0]), 2 * np.pi)


def sines(delays, amps, N=64, cycles=3):
    t = 2 * np.pi * np.arange(N * cycles) / N
    return amps * np.sin(t[:, None] - np.asarray(delays)[None, :])


class TestWhatTheOrderSays:
    """What the cyclic order can and cannot say (issue 14, item 5), against closed forms."""

    def test_positions_are_not_delays(self):
        # delays 0, 0.3, 0.6 rad, equal amplitudes: positions 0, 0.894, 1.788 (closed
        # form plane_positions, derived in its docstring), not 0, 0.3, 0.6
        delays, amps = np.array([0.0, 0.3, 0.6]), np.ones(3)
        res = wp.cyclic_order(wp.area_matrix(sines(delays, amps)), start=0)
        want = plane_positions(delays, amps)
        np.testing.assert_allclose(res.positions, want, atol=1e-9)
        np.testing.assert_allclose(want, [0.0, 0.894, 1.788], atol=5e-4)
        assert res.order.tolist() == [0, 1, 2]
        assert np.max(np.abs(res.positions - delays)) > 1.0    # they are not the delays

    @pytest.mark.parametrize("n", [3, 4, 7, 12, 40])
    def test_order_right_positions_closed_form(self, n):
        # random delays and amplitudes, noise-free: the cyclic order is that of the
        # delays (an orientation-preserving map keeps it) and the positions are the
        # closed form of plane_positions, whatever n
        rng = np.random.default_rng(100 + n)
        delays = rng.uniform(0, 2 * np.pi, n)
        amps = rng.uniform(0.3, 2.0, n)
        res = wp.cyclic_order(wp.area_matrix(sines(delays, amps)), start=0)
        want = plane_positions(delays, amps)
        np.testing.assert_allclose(np.exp(1j * res.positions), np.exp(1j * want), atol=1e-8)
        assert same_cycle(np.argsort(np.mod(delays - delays[0], 2 * np.pi)).tolist(),
                          res.order.tolist())
        assert res.fit == pytest.approx(1.0, abs=1e-10)          # rank 2: one cycle

    def test_largest_position_error_shrinks_with_n(self):
        # the measured figures quoted in docs/signals.md (own simulation): equal
        # amplitudes, uniform random delays, the largest |position - delay| (on the
        # circle, both measured from channel 0) over 200 draws
        rng = np.random.default_rng(7)
        worst = {}
        for n in (3, 64):
            errs = []
            for _ in range(200):
                delays = rng.uniform(0, 2 * np.pi, n)
                res = wp.cyclic_order(wp.area_matrix(sines(delays, np.ones(n))), start=0)
                d = np.angle(np.exp(1j * (res.positions - (delays - delays[0]))))
                errs.append(np.max(np.abs(d)))
            worst[n] = float(np.median(errs))
        assert worst[3] > 0.2 and worst[64] < 0.2 and worst[64] < worst[3] / 2
        assert worst[3] == pytest.approx(0.46, abs=0.06)
        assert worst[64] == pytest.approx(0.097, abs=0.03)

    def test_fit_is_one_for_three_channels(self):
        # any nonzero 3x3 skew-symmetric matrix has rank 2 (its kernel contains the
        # axial vector), so one eigenvalue pair holds all of ||A||_F^2: fit = 1 for
        # every n = 3 input, signal or noise (linear algebra, no source needed)
        rng = np.random.default_rng(3)
        for _ in range(50):
            G = rng.standard_normal((3, 3))
            assert wp.cyclic_order(G - G.T).fit == pytest.approx(1.0, abs=1e-12)
        X = rng.standard_normal((500, 3))                        # pure noise
        assert wp.cyclic_order(wp.area_matrix(X)).fit == pytest.approx(1.0, abs=1e-12)
        assert wp.noise_fit_baseline(3) == 1.0 and wp.noise_fit_baseline(2) == 1.0


class TestLargeN:
    """Bounded time and memory for many channels (issue 13, item 11)."""

    @pytest.mark.parametrize("kind", ["cycle", "noise"])
    def test_lanczos_path_matches_dense_solver(self, kind):
        # n > DENSE_MAX takes the Lanczos path; compare with numpy's dense Hermitian
        # solver on i*A (independent computation)
        from wedgepath.signals.order import DENSE_MAX, N_LEADING
        rng = np.random.default_rng(1)
        n = DENSE_MAX + 44
        if kind == "cycle":
            X = sines(rng.uniform(0, 2 * np.pi, n), rng.uniform(0.5, 1.5, n), N=50, cycles=8)
            X = X + 0.5 * rng.standard_normal(X.shape)
            A = np.asarray(wp.area_matrix(X))
        else:
            G = np.triu(rng.standard_normal((n, n)), 1)
            A = G - G.T
        res = wp.cyclic_order(A, start=0)
        w, V = np.linalg.eigh(1j * A)
        lam = -w[:N_LEADING]
        np.testing.assert_allclose(res.eigenvalues, lam, rtol=1e-9)
        assert res.fit == pytest.approx(lam[0] ** 2 / (np.sum(A * A) / 2), rel=1e-9)
        v = V[:, 0]
        ref = np.mod(np.angle(v) - np.angle(v[0]), 2 * np.pi)
        np.testing.assert_allclose(np.exp(1j * res.positions), np.exp(1j * ref), atol=1e-6)
        np.testing.assert_allclose(res.moduli, np.abs(v) / np.abs(v).max(), atol=1e-6)

    def test_noise_baseline_formula_against_simulation(self):
        # beyond 64 channels the baseline is a large-n formula (semicircle edge plus
        # the Tracy-Widom median, from memory); check it against a direct simulation
        # of the same random matrices at n = 80 (own simulation, 60 draws)
        n = 80
        rng = np.random.default_rng(5)
        G = np.triu(rng.standard_normal((60, n, n)), 1)
        lam = np.linalg.eigvalsh(1j * (G - np.swapaxes(G, 1, 2)))
        sim = float(np.median(2 * lam[:, -1] ** 2 / (lam ** 2).sum(axis=1)))
        assert wp.noise_fit_baseline(n) == pytest.approx(sim, rel=0.03)
        # continuity where the simulation hands over to the formula
        assert wp.noise_fit_baseline(64) == pytest.approx(wp.noise_fit_baseline(65), rel=0.03)

    def test_noise_baseline_any_n_and_errors(self):
        # bounded at any n: no (draws, n, n) array beyond 64 channels
        for n in (65, 1500, 10 ** 6):
            b = wp.noise_fit_baseline(n)
            assert 0.0 < b < 8.0 / (n - 1)
        with pytest.raises(ValueError, match="at least 2"):
            wp.noise_fit_baseline(1)
        with pytest.raises(TypeError, match="integer"):
            wp.noise_fit_baseline(4.5)
        with pytest.raises(ValueError, match="n_draws"):
            wp.noise_fit_baseline(5, n_draws=0)

    def test_noise_baseline_memory_is_bounded(self):
        # 1500 channels: the baseline used to allocate (200, 1500, 1500) complex
        # numbers (3.35 GiB) and fail with MemoryError (issue 13, item 11)
        import tracemalloc
        tracemalloc.start()
        try:
            for n in (1500, 5000):
                wp.noise_fit_baseline(n)
            peak = tracemalloc.get_traced_memory()[1]
        finally:
            tracemalloc.stop()
        assert peak < 2 ** 20


# --------------------------------------------------------------------------- significance
class TestSurrogates:
    @pytest.mark.parametrize("method", ["shift", "phase"])
    def test_pvalues_uniform_under_independence(self, method):
        # Under a null of independent signals the Monte Carlo p-value
        # (1 + #{|A*| >= |A|}) / (1 + B) is uniform on {1/(B+1), ..., 1}
        # (North, Curtis & Sham, Am. J. Hum. Genet. 71, 2002, from memory);
        # with i.i.d. Gaussian channels both surrogates are exact nulls.
        # Kolmogorov-Smirnov against U(0, 1) with scipy.stats.kstest.
        rng = np.random.default_rng(123)
        pv = []
        for _ in range(150):
            X = rng.standard_normal((96, 2))
            res = wp.surrogate_test(X, method=method, n_surrogates=59, seed=rng, progress=False)
            pv.append(res.pvalues[0, 1])
        assert stats.kstest(pv, "uniform").pvalue > 0.01

    @pytest.mark.parametrize("method", ["shift", "phase"])
    def test_power_for_a_delayed_copy(self, method):
        d = broadband(1003, seed=1)
        rng = np.random.default_rng(2)
        X = np.column_stack([d[3:], d[:-3], rng.standard_normal(1000)])
        X += 0.05 * rng.standard_normal(X.shape)
        res = wp.surrogate_test(X, method=method, n_surrogates=99, seed=0, progress=False)
        assert res.pvalues[0, 1] == pytest.approx(0.01)
        assert res.pvalues[0, 2] > 0.05
        assert res.significant(0.05)[0, 1] and not res.significant(0.05)[0, 2]
        # two-sided: a lag (negative area) is detected as well
        rev = wp.surrogate_test(X[:, [1, 0, 2]], method=method, n_surrogates=99, seed=0,
                                progress=False)
        assert rev.observed[0, 1] < 0 and rev.pvalues[0, 1] == pytest.approx(0.01)
        assert np.isnan(res.pvalues[0, 0]) and np.array_equal(res.pvalues, res.pvalues.T,
                                                             equal_nan=True)

    def test_seeded_and_reproducible(self):
        X = np.random.default_rng(5).standard_normal((200, 3))
        a = wp.surrogate_test(X, n_surrogates=30, seed=42, progress=False)
        b = wp.surrogate_test(X, n_surrogates=30, seed=42, progress=False)
        c = wp.surrogate_test(X, n_surrogates=30, seed=43, progress=False)
        assert np.array_equal(a.pvalues, b.pvalues, equal_nan=True)
        assert not np.array_equal(a.null_std, c.null_std)

    def test_normalisation_free_statistic(self):
        # both surrogate kinds keep each channel's spectrum, so scaling a
        # channel changes nothing in the p-values
        X = np.random.default_rng(6).standard_normal((300, 3))
        a = wp.surrogate_test(X, n_surrogates=40, seed=1, progress=False)
        b = wp.surrogate_test(X * [1.0, 1e3, 1e-2], n_surrogates=40, seed=1, progress=False)
        assert np.array_equal(a.pvalues, b.pvalues, equal_nan=True)

    def test_errors(self):
        X = np.random.default_rng(0).standard_normal((50, 2))
        with pytest.raises(ValueError, match="unknown method 'boot'"):
            wp.surrogate_test(X, method="boot")
        with pytest.raises(ValueError, match="n_surrogates must be at least 1"):
            wp.surrogate_test(X, n_surrogates=0)
        Y = X.copy()
        Y[4, 1] = np.nan          # a gap: the pieces before and after it are two trials
        assert wp.surrogate_test(Y, n_surrogates=5, seed=0).trials == 2
        Y[4, 1] = np.inf
        with pytest.raises(ValueError, match="infinite value at row 4, channel 1"):
            wp.surrogate_test(Y)
        before = X.copy()
        X.flags.writeable = False
        wp.surrogate_test(X, n_surrogates=5, seed=0, progress=False)
        assert np.array_equal(X, before)

    def test_progress_indicator(self, capsys):
        X = np.random.default_rng(0).standard_normal((50, 2))
        wp.surrogate_test(X, n_surrogates=5, seed=0, progress=True)
        err = capsys.readouterr().err
        assert "surrogates" in err and "5/5" in err
        wp.surrogate_test(X, n_surrogates=5, seed=0, progress=False)
        wp.surrogate_test(X, n_surrogates=5, seed=0)          # short run: silent
        assert capsys.readouterr().err == ""


class TestSurrogateTiesAndShifts:
    """Ties and the minimum shift of shift surrogates (issue 14, item 4)."""

    def test_ties_with_the_data_count_as_extreme(self):
        # Data of period 6 repeated 170 times: a relative shift d with d = 0 or
        # d = 4 (mod 6) reproduces |A| exactly in exact arithmetic (closed form
        # below), while other shifts give |A| far smaller.  So the Monte Carlo
        # p-value (1 + #{|A*| >= |A|}) / (1 + B) counts exactly the surrogates
        # with such a shift, a Binomial(B, f) number, f their share among the
        # allowed shifts (the definition of the test; North, Curtis & Sham,
        # Am. J. Hum. Genet. 71, 2002, from memory).  Before: recomputed ties
        # fell below |A| by rounding about half the time, p ~ 0.17 for f = 1/3.
        P, K, B = 6, 170, 1999
        rng = np.random.default_rng(4)
        base = rng.standard_normal(P) * 0.1 + rng.uniform(1, 3)
        x = np.tile(base, K)
        y = np.roll(x, 1) * 0.37
        T = x.size
        res = wp.surrogate_test(np.column_stack([x, y]), n_surrogates=B, seed=0, progress=False)
        m = res.min_shift
        # reference: |A(d)| for every relative shift d, by area_matrix of the
        # shifted pair (a circular shift of one channel against the other)
        A = np.array([wp.area_matrix(np.column_stack([x, np.roll(y, d)]))[0, 1]
                      for d in range(P)])
        tie = np.abs(np.abs(A) - abs(A[0])) < 1e-9 * abs(A[0])
        assert tie.sum() == 2 and np.max(np.abs(A[~tie])) < 0.2 * abs(A[0])
        allowed = [d for d in range(T) if min(d, T - d) >= m]
        f = np.mean([tie[d % P] for d in allowed])
        count = res.pvalues[0, 1] * (B + 1) - 1
        assert abs(count - B * f) < 4.5 * np.sqrt(B * f * (1 - f))

    def test_min_shift_option_and_errors(self):
        X = np.random.default_rng(0).standard_normal((400, 3))
        res = wp.surrogate_test(X, n_surrogates=20, seed=0, progress=False)
        assert res.min_shift == int(wp.decorrelation_lag(X).max())
        assert wp.surrogate_test(X, n_surrogates=20, seed=0, min_shift=100,
                                 progress=False).min_shift == 100
        assert wp.surrogate_test(X, method="phase", n_surrogates=20, seed=0,
                                 progress=False).min_shift is None
        with pytest.raises(ValueError, match=r"min_shift must be between 0 and .*\(100\)"):
            wp.surrogate_test(X, min_shift=101)
        with pytest.raises(ValueError, match="min_shift must be between"):
            wp.surrogate_test(X, min_shift=-1)
        with pytest.raises(TypeError, match="min_shift must be an integer"):
            wp.surrogate_test(X, min_shift=2.5)
        with pytest.raises(ValueError, match="'auto' or a number"):
            wp.surrogate_test(X, min_shift="long")
        with pytest.raises(ValueError, match="method='shift' only"):
            wp.surrogate_test(X, method="phase", min_shift=5)

    def test_min_shift_removes_the_small_shifts(self):
        # a lead of 2 samples in a smooth broadband signal.  The relative shifts d
        # for which |A(d)| >= |A(0)| (computed here for every d with area_matrix)
        # are all short: with every shift allowed (min_shift=0) the p-value is
        # floored at their share f0; with the default minimum shift none is drawn
        d = broadband(520, seed=3)
        rng = np.random.default_rng(3)
        X = np.column_stack([d[2:514], d[:512]]) + 0.3 * rng.standard_normal((512, 2))
        T, B = 512, 999
        A = np.array([wp.area_matrix(np.column_stack([X[:, 0], np.roll(X[:, 1], k)]))[0, 1]
                      for k in range(T)])
        strong = np.flatnonzero(np.abs(A) >= abs(A[0]))
        f0 = strong.size / T
        every = wp.surrogate_test(X, n_surrogates=B, seed=1, min_shift=0, progress=False)
        auto = wp.surrogate_test(X, n_surrogates=B, seed=1, progress=False)
        assert f0 > 0.01
        assert abs(every.pvalues[0, 1] * (B + 1) - 1 - B * f0) < 4.5 * np.sqrt(B * f0)
        assert np.all(np.minimum(strong, T - strong) < auto.min_shift)
        assert auto.pvalues[0, 1] == pytest.approx(1 / (B + 1))

    def test_decorrelation_lag_follows_the_published_rule(self):
        # Politis, J. Nonparametric Statistics 15 (2003) / Politis & White,
        # Econometric Reviews 23 (2004): m_hat is the smallest m >= 0 such that
        # |rho(m + k)| < 2 sqrt(log10(T) / T) for k = 1..K_T, K_T =
        # max(5, sqrt(log10 T)); the lag returned is 2 max(m_hat, 1).  Here
        # the sample autocorrelations are computed directly (dot products).
        from scipy.signal import lfilter
        rng = np.random.default_rng(9)
        T = 3000
        Z = np.column_stack([rng.standard_normal(T),
                             lfilter([1.0], [1.0, -0.8], rng.standard_normal(T)),
                             lfilter(np.ones(7) / 7, [1.0], rng.standard_normal(T))])
        got = wp.decorrelation_lag(Z)
        c = 2 * np.sqrt(np.log10(T) / T)
        K = max(5, int(np.sqrt(np.log10(T))))
        for col, lag in zip(Z.T, got):
            z = col - col.mean()
            rho = np.array([z[:T - h] @ z[h:] for h in range(80)]) / (z @ z)
            mhat = next(m for m in range(80 - K) if np.all(np.abs(rho[m + 1:m + K + 1]) < c))
            assert lag == 2 * max(mhat, 1)
        assert got[0] == 2                      # white noise
        # AR(1), phi = 0.8: rho(h) = 0.8^h falls below c = 0.077 at h = 12
        assert 16 <= got[1] <= 34


class TestBenjaminiHochberg:
    def test_by_hand(self):
        # Definition (Benjamini & Hochberg, J. R. Statist. Soc. B 57, 1995):
        # sorted p = 0.005, 0.01, 0.03, 0.04, 0.2 with m = 5 give m p/k =
        # 0.025, 0.025, 0.05, 0.05, 0.2, already non-decreasing (by hand).
        p = [0.04, 0.005, 0.2, 0.01, 0.03]
        assert np.allclose(wp.benjamini_hochberg(p), [0.05, 0.025, 0.2, 0.025, 0.05])

    def test_against_scipy(self):
        # scipy.stats.false_discovery_control implements the same procedure
        p = np.random.default_rng(1).uniform(0, 1, 40) ** 3
        assert np.allclose(wp.benjamini_hochberg(p), stats.false_discovery_control(p, method="bh"))

    def test_nan_and_range(self):
        q = wp.benjamini_hochberg([[np.nan, 0.01], [0.01, np.nan]])
        assert np.isnan(q[0, 0]) and q[0, 1] == pytest.approx(0.01)
        with pytest.raises(ValueError, match=r"\[0, 1\]"):
            wp.benjamini_hochberg([0.5, 1.5])


class TestBootstrap:
    def test_white_noise_standard_error(self):
        # i.i.d. standard normal x_i, x_j: the terms u_k = (x_ik x_j,k+1 - x_jk x_i,k+1)/2
        # have variance (1 + 1)/4 = 1/2 and are uncorrelated (every cross moment
        # has an unpaired factor), so sd(A_ij) = sqrt(T/2) (derived here).
        T = 4000
        X = np.random.default_rng(7).standard_normal((T, 2))
        res = wp.bootstrap_area(X, block=20, n_boot=2000, seed=1, progress=False)
        # the studentized interval is close to +-1.96 sd for i.i.d. terms
        assert res.std[0, 1] == pytest.approx(np.sqrt(T / 2), rel=0.1)
        assert res.low[0, 1] < res.estimate[0, 1] < res.high[0, 1]

    def test_estimate_and_interval_shape(self):
        t = np.arange(3000) * 2 * np.pi / 60
        rng = np.random.default_rng(8)
        X = np.column_stack([np.sin(t), np.sin(t - 0.6), rng.standard_normal(3000)])
        X[:, :2] += 0.3 * rng.standard_normal((3000, 2))
        res = wp.bootstrap_area(X, block=120, n_boot=500, seed=3, keep=True, progress=False)
        assert np.allclose(res.estimate, wp.area_matrix(X), rtol=1e-10, atol=1e-8)
        assert res.replicates.shape == (500, 3, 3)
        assert res.low[0, 1] > 0                     # the lead is clearly positive
        assert res.low[0, 2] < 0 < res.high[0, 2]    # no lead with the noise channel
        again = wp.bootstrap_area(X, block=120, n_boot=500, seed=3, progress=False)
        assert np.array_equal(again.low, res.low)

    def test_errors(self):
        X = np.random.default_rng(0).standard_normal((50, 2))
        with pytest.raises(ValueError, match=r"block must be between 2 and .*\(12\), got 13"):
            wp.bootstrap_area(X, block=13)
        with pytest.raises(ValueError, match="block must be between 2"):
            wp.bootstrap_area(X, block=1)
        with pytest.raises(ValueError, match="'auto' or a number"):
            wp.bootstrap_area(X, block="long")
        with pytest.raises(ValueError, match="at least 8 samples"):
            wp.bootstrap_area(X[:7])
        with pytest.raises(ValueError, match="confidence must lie strictly between 0 and 1"):
            wp.bootstrap_area(X, confidence=1.5)
        with pytest.raises(ValueError, match="n_boot"):
            wp.bootstrap_area(X, n_boot=1)

    def test_intervals_mirror_and_block_rule(self):
        X = np.random.default_rng(4).standard_normal((900, 3))
        res = wp.bootstrap_area(X, n_boot=200, seed=0, progress=False)
        np.testing.assert_array_equal(res.low, -res.high.T)     # A[j, i] = -A[i, j]
        assert np.all(res.low <= res.estimate) and np.all(res.estimate <= res.high)
        assert res.block == 60                                  # max(b_PW, 2 sqrt(900)) = 60

    def test_politis_white_block_ar1_closed_form(self):
        # Politis & White (Econometric Reviews 23, 2004; correction Patton, Politis &
        # White, Econometric Reviews 28, 2009): b = (2 G^2 / D)^(1/3) T^(1/3), D =
        # (4/3) g^2 for the circular bootstrap.  For AR(1), gamma(k) = s^2 phi^|k|,
        # so G = sum |k| gamma(k) = 2 s^2 phi / (1 - phi)^2 and g = sum gamma(k) =
        # s^2 (1 + phi) / (1 - phi) (geometric series), hence
        # b = (6 phi^2 / (1 - phi^2)^2)^(1/3) T^(1/3) (derived here).  The
        # estimate converges to it; at T = 2e5 within 15 % here.
        from scipy.signal import lfilter
        from wedgepath.signals.significance import politis_white_block
        rng = np.random.default_rng(8)
        T = 200_000
        for phi in (0.5, 0.8):
            u = lfilter([1.0], [1.0, -phi], rng.standard_normal(T))
            want = (6 * phi ** 2 / (1 - phi ** 2) ** 2) ** (1 / 3) * T ** (1 / 3)
            assert politis_white_block(u[:, None])[0] == pytest.approx(want, rel=0.15)

    def test_merged_moments_are_stable(self):
        # batches of values 1e9 + N(0, 1): the running variance must match numpy's
        # two-pass np.var to about u * mean/sd = 1e-7 (the error of the running means;
        # Chan, Golub & LeVeque, Am. Stat. 37, 1983), while the old s2/B - mean^2
        # loses every digit here (the squares are 1e18, float64 keeps 16 digits)
        from wedgepath.signals.significance import _merge_moments
        rng = np.random.default_rng(2)
        vals = 1e9 + rng.standard_normal((300, 2, 2))
        use = rng.uniform(size=vals.shape) < 0.8
        count = mean = m2 = np.zeros((2, 2))
        for b0 in range(0, 300, 37):
            count, mean, m2 = _merge_moments(count, mean, m2, vals[b0:b0 + 37], use[b0:b0 + 37])
        for i in range(2):
            for j in range(2):
                x = vals[:, i, j][use[:, i, j]]
                assert count[i, j] == x.size
                assert mean[i, j] == pytest.approx(x.mean(), rel=1e-15)
                assert m2[i, j] / (x.size - 1) == pytest.approx(np.var(x, ddof=1), rel=1e-6)
                naive = (np.sum(x * x) / x.size - x.mean() ** 2) * x.size / (x.size - 1)
                assert abs(naive / np.var(x, ddof=1) - 1) > 1e-3     # the old formula


# --------------------------------------------------------------------------- cycles
class TestCycleAreas:
    @pytest.mark.parametrize("N", [8, 20, 33])
    def test_each_cycle_is_the_sampled_ellipse(self, N):
        # N samples per cycle, exactly periodic: every crossing-to-crossing loop
        # retraces the same polygon, of area (N/2) sin(2pi/N) a b sin(phi)
        # (derived in test_signals.py::test_sampled_ellipse_formula).
        a, b, phi = 1.5, 0.4, 0.9
        t = 2 * np.pi * np.arange(6 * N + 1) / N + 0.2
        X = np.column_stack([a * np.sin(t + phi), b * np.sin(t), np.cos(3 * t)])
        res = wp.cycle_areas(X, 0, 1, reference=1)
        exact = (N / 2) * np.sin(2 * np.pi / N) * a * b * np.sin(phi)
        assert res.count >= 5
        assert np.allclose(res.values[res.complete], exact, rtol=1e-12)
        # the pieces before the first and after the last crossing are flagged, not measured
        assert res.status[0] == "partial-start" and res.status[-1] == "partial-end"
        assert np.isnan(res.values[~res.complete]).all() and len(res) == res.count + 2
        assert res.mean == pytest.approx(exact, rel=1e-12)
        assert res.std < 1e-10 * exact

    def test_given_boundaries(self):
        N = 16
        t = 2 * np.pi * np.arange(4 * N + 1) / N
        X = np.column_stack([np.cos(t), np.sin(t)])
        res = wp.cycle_areas(X, 0, 1, boundaries=[0, N, 2 * N, 3.5 * N])
        exact = (N / 2) * np.sin(2 * np.pi / N)        # unit circle, phi = pi/2
        assert np.allclose(res.values[:2], exact, rtol=1e-12)
        assert res.start.tolist() == [0, N, 2 * N] and res.stop.tolist() == [N, 2 * N, 3.5 * N]
        # without times the boundaries "in time" are the sample positions
        assert res.start_time.tolist() == res.start.tolist()
        assert res.reference is None and res.level is None

    def test_hysteresis_energy_kelvin_voigt(self):
        # Kelvin-Voigt solid: stress = E strain + eta d(strain)/dt.  For
        # strain = e0 sin(w t) the energy dissipated per cycle is
        # int stress d(strain) = pi eta w e0^2 (standard result, e.g. Lakes,
        # "Viscoelastic Materials", 2009, from memory).  Sampled with N points
        # per cycle the loop is the sampled ellipse: (N/2) sin(2pi/N) e0^2 eta w.
        E, eta, w, e0, N = 3.0, 0.2, 2.0, 0.01, 400
        t = np.arange(10 * N + 1) * (2 * np.pi / w) / N + 0.05
        strain = e0 * np.sin(w * t)
        stress = E * strain + eta * e0 * w * np.cos(w * t)
        df = pd.DataFrame({"strain": strain, "stress": stress})
        res = wp.cycle_areas(df, "stress", "strain", reference="strain", times=t)
        assert res.names == ("stress", "strain") and res.quantity == "∮ stress d(strain)"
        assert res.reference == "strain" and res.level == pytest.approx(strain.mean())
        # strain crosses zero upwards at w t = 2 pi m, m = 1..10 within the
        # record (it starts just after m = 0): 10 crossings, 9 whole loops
        assert res.count == 9
        assert res.mean == pytest.approx((N / 2) * np.sin(2 * np.pi / N) * e0 ** 2 * eta * w,
                                         rel=1e-10)
        assert res.mean == pytest.approx(np.pi * eta * w * e0 ** 2, rel=1e-4)
        assert np.allclose(np.diff(res.start_time[res.complete]), 2 * np.pi / w)
        fr = res.to_frame()                  # one row per cycle
        assert list(fr.columns) == ["cycle", "start", "stop", "start_time", "stop_time", "value",
                                    "complete", "status"]
        assert len(fr) == len(res) and np.array_equal(fr["value"], res.values, equal_nan=True)
        assert fr["complete"].sum() == 9 and len(fr) == 11
        assert fr["status"].tolist() == ["partial-start"] + ["complete"] * 9 + ["partial-end"]

    def test_hysteresis_band_ignores_noise(self):
        rng = np.random.default_rng(4)
        t = np.arange(4000) * 2 * np.pi / 200
        r = np.sin(t) + 0.05 * rng.standard_normal(4000)
        X = np.column_stack([r, np.cos(t)])
        # without a band, noise near the level makes 'cycles' of a few samples next to
        # whole ones: the lengths vary more than one steady process explains
        from wedgepath.signals.segment import CycleLengthWarning
        with pytest.warns(CycleLengthWarning, match="median cycle length"):
            chatter = wp.cycle_areas(X, 0, 1)
        clean = wp.cycle_areas(X, 0, 1, hysteresis=0.3)
        # sin t starts exactly at its crossing (no earlier sample): the upward
        # crossings inside the record are at samples 200, 400, ..., 3800, 19 of
        # them, giving 18 whole loops
        assert clean.count == 18
        assert chatter.count > clean.count

    def test_gap_marks_cycle_incomplete(self):
        N = 20
        t = 2 * np.pi * np.arange(5 * N + 1) / N + 0.3
        X = np.column_stack([np.sin(t), np.cos(t)])
        X[45] = np.nan
        res = wp.cycle_areas(X, 0, 1)
        # the cycle holding the gap is cut in two partial pieces, flagged "partial-gap"
        assert (res.status == "partial-gap").sum() == 2
        assert res.count == len(res) - 4
        # (sin t, cos t) sampled 20 times a cycle is the regular 20-gon of circumradius 1
        # traced clockwise: each complete cycle has area -(N/2) sin(2 pi / N) (common
        # practice, no source); the mean is over the complete cycles only
        complete = res.values[res.complete]
        np.testing.assert_allclose(complete, -(N / 2) * np.sin(2 * np.pi / N), rtol=1e-9)
        assert res.mean == pytest.approx(complete.mean(), rel=1e-12)
        assert res.complete.tolist() == (~np.isnan(res.values)).tolist()
        gap_rows = np.flatnonzero(res.status == "partial-gap")
        assert res.stop[gap_rows[0]] == 44 and res.start[gap_rows[1]] == 46

    def test_errors(self):
        X = np.column_stack([np.sin(np.arange(50.0)), np.cos(np.arange(50.0))])
        with pytest.raises(ValueError, match="different channels"):
            wp.cycle_areas(X, 0, 0)
        with pytest.raises(ValueError, match="either boundaries or reference"):
            wp.cycle_areas(X, 0, 1, boundaries=[0, 10], level=0.0)
        with pytest.raises(ValueError, match="strictly increasing"):
            wp.cycle_areas(X, 0, 1, boundaries=[10, 5])
        with pytest.raises(ValueError, match="within"):
            wp.cycle_areas(X, 0, 1, boundaries=[0, 60])
        with pytest.raises(ValueError, match="constant"):
            wp.cycle_areas(np.column_stack([np.ones(10), np.arange(10.0)]), 0, 1)
        with pytest.raises(ValueError, match="unknown i channel 'x'"):
            wp.cycle_areas(X, "x", 1)
        res = wp.cycle_areas(X[:3], 0, 1)
        assert res.count == 0 and np.isnan(res.mean) and not res.complete.any()


# --------------------------------------------------------------------------- progress
class _Terminal(io.StringIO):
    """A text stream that says it is a terminal (tqdm's ``disable=None`` looks at isatty)."""

    def isatty(self):
        return True


class TestProgress:
    """progress= means one thing everywhere: True, False, None (automatic), tqdm underneath."""

    def _run(self, monkeypatch, stream, progress, steps=4):
        monkeypatch.setattr(sys, "stderr", stream)
        with _bars.progress_bar(steps, "work", progress) as bar:
            for _ in range(steps):
                bar.update()
        return stream.getvalue()

    def test_modes(self, monkeypatch):
        monkeypatch.delenv("WEDGEPATH_PROGRESS", raising=False)
        text = self._run(monkeypatch, io.StringIO(), True)
        assert "work" in text and "4/4" in text and text.endswith("\n")
        assert self._run(monkeypatch, _Terminal(), False) == ""
        # automatic: not on a pipe or file, and on a terminal not before the delay
        assert self._run(monkeypatch, io.StringIO(), None) == ""
        assert self._run(monkeypatch, _Terminal(), None) == ""
        monkeypatch.setattr(_bars, "DELAY", 0.0)
        assert "4/4" in self._run(monkeypatch, _Terminal(), None)
        monkeypatch.setenv("WEDGEPATH_PROGRESS", "0")
        assert self._run(monkeypatch, _Terminal(), None) == ""
        assert "4/4" in self._run(monkeypatch, io.StringIO(), True)   # asked for: shown

    def test_stages(self, monkeypatch):
        out = io.StringIO()
        monkeypatch.setattr(sys, "stderr", out)
        with _bars.Stages("loop", ["faces", "cycles"], enabled=True) as st:
            st.start("faces")
            st.start("cycles")
        parts = [p.split(" (")[0] for p in out.getvalue().split("\r") if p.strip()]
        assert parts[:2] == ["loop: faces", "loop: cycles"]
        assert parts[-1].startswith("loop: done in")
        quiet = io.StringIO()
        monkeypatch.setattr(sys, "stderr", quiet)
        with _bars.Stages("loop", ["faces"], enabled=False) as st:
            st.start("faces")
        assert quiet.getvalue() == ""

    @pytest.mark.parametrize("bad", ["yes", 1, 0, print])
    def test_bad_arguments(self, bad):
        with pytest.raises(TypeError, match="progress must be True, False or None"):
            _bars.progress_bar(3, "work", bad)
        X = np.random.default_rng(0).standard_normal((40, 2))
        for call in (lambda: wp.surrogate_test(X, n_surrogates=5, progress=bad),
                     lambda: wp.bootstrap_area(X, n_boot=5, progress=bad),
                     lambda: wp.decompose([[0, 0], [1, 0], [1, 1]], progress=bad)):
            with pytest.raises(TypeError, match="progress must be True, False or None"):
                call()