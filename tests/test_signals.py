"""The area matrix: exactness, closures, gaps, normalisations, alignment, bad input.

Reference values come from independent routes, never from the function under
test: a plain per-pair loop (``oracle_area``), exact rational arithmetic
(``fractions``), ``wp.integrate`` of the constant 2-form ``dx_i ^ dx_j``
(the calculus layer, a different code path), closed-form formulas derived in
the comments, scipy's Hilbert transform, and exact rational integrals of
piecewise-linear interpolants.
"""

from __future__ import annotations

import math
import warnings
from fractions import Fraction

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import signal as sps

import wedgepath as wp
from wedgepath.signals import _kernel

FAST = settings(max_examples=25, deadline=None)


# --------------------------------------------------------------------------- oracles
def pieces_of(X):
    bad = np.isnan(X).any(axis=1)
    out, k, T = [], 0, X.shape[0]
    while k < T:
        if bad[k]:
            k += 1
            continue
        s = k
        while k < T and not bad[k]:
            k += 1
        out.append((s, k))
    return out


def oracle_area(X):
    """Per-pair shoelace sum, a plain loop (chord closure, each piece on its own).

    Each segment adds (1/2)(x_k - x_s) ^ (x_{k+1} - x_k), x_s the piece's
    first sample (the chord back to x_s then adds nothing); math.fsum sums.
    """
    X = np.asarray(X, dtype=float)
    n = X.shape[1]
    A = np.zeros((n, n))
    pcs = pieces_of(X)
    for i in range(n):
        for j in range(i + 1, n):
            terms = []
            for s, e in pcs:
                for k in range(s, e - 1):
                    zi, zj = X[k, i] - X[s, i], X[k, j] - X[s, j]
                    di, dj = X[k + 1, i] - X[k, i], X[k + 1, j] - X[k, j]
                    terms.append(0.5 * (zi * dj - zj * di))
            A[i, j] = math.fsum(terms)
            A[j, i] = -A[i, j]
    return A


def exact_area(X, i, j):
    """Exact rational cyclic shoelace sum of float data (one piece)."""
    P = [(Fraction(float(r[i])), Fraction(float(r[j]))) for r in X]
    s = Fraction(0)
    for k in range(len(P)):
        (a, b), (c, d) = P[k], P[(k + 1) % len(P)]
        s += a * d - b * c
    return s / 2


def integrate_area(X, closure, times=None):
    """A[i, j] from the calculus layer: integral of dx_i ^ dx_j (a separate implementation)."""
    p = wp.Path(X, times=times)
    n = p.dim
    A = np.zeros((n, n))
    for i in range(n):
        for j in range(n):
            if i != j:
                A[i, j] = float(wp.integrate(wp.dx(i) ^ wp.dx(j), p, closure=closure))
    return A


def integrate_open(X):
    """Line integral of (1/2)(x_i dx_j - x_j dx_i) along the open path (closure 'none')."""
    p = wp.Path(X)
    n = p.dim
    A = np.zeros((n, n))
    zero = lambda c: np.zeros(len(c))  # noqa: E731
    for i in range(n):
        for j in range(n):
            if i == j:
                continue
            comps = [zero] * n
            comps = list(comps)
            comps[i] = lambda c, jj=j: -0.5 * c[:, jj]
            comps[j] = lambda c, ii=i: 0.5 * c[:, ii]
            A[i, j] = float(wp.integrate(wp.OneForm(comps), p, closure="none"))
    return A


def close(a, b, rtol):
    """Norm-wise relative agreement (entries near zero judged against the largest)."""
    a, b = np.asarray(a), np.asarray(b)
    scale = max(np.max(np.abs(b)), 1e-300)
    return np.max(np.abs(a - b)) <= rtol * scale


def random_walk(T, n, seed, offset=0.0):
    rng = np.random.default_rng(seed)
    return rng.standard_normal((T, n)).cumsum(axis=0) + offset


@pytest.fixture
def small_chunks(monkeypatch):
    """Force many chunks so that chunk borders are crossed in small tests."""
    monkeypatch.setattr(_kernel, "CHUNK_MAX_ROWS", 7)
    monkeypatch.setattr(_kernel, "CHUNK_ELEMENTS", 8)


# --------------------------------------------------------------------------- exact cases
class TestExactCases:
    @pytest.mark.parametrize("N", [3, 4, 7, 64])
    @pytest.mark.parametrize("K", [1, 5])
    def test_sampled_ellipse_formula(self, N, K):
        # Points p_k = (a sin t_k, b sin(t_k - phi)), t_k = 2 pi k / N, k = 0..KN-1.
        # Shoelace term: a b [sin t_k sin(t_{k+1}-phi) - sin(t_k-phi) sin t_{k+1}].
        # With sin A sin B = (cos(A-B) - cos(A+B))/2 the cos(A+B) parts cancel and
        # the term is a b (cos(phi - d) - cos(phi + d))/2 = a b sin(phi) sin(d),
        # d = 2 pi / N, the same for every k.  Half the sum over KN terms:
        # A = K (N/2) sin(2 pi/N) a b sin(phi)   (derived here, common practice).
        rng = np.random.default_rng(N * 10 + K)
        a, b = rng.uniform(0.2, 5.0, size=2)
        phi = rng.uniform(0.1, 3.0)
        t = 2 * np.pi * np.arange(K * N) / N
        X = np.column_stack([a * np.sin(t), b * np.sin(t - phi)])
        expected = K * (N / 2) * np.sin(2 * np.pi / N) * a * b * np.sin(phi)
        A = wp.area_matrix(X)
        assert A[0, 1] == pytest.approx(expected, rel=1e-12)
        assert A[1, 0] == pytest.approx(-expected, rel=1e-12)
        assert A[0, 0] == 0 and A[1, 1] == 0

    def test_quarter_cycle_lead_sign(self):
        # x_i = sin t leads x_j = sin(t - pi/2): counter-clockwise, A[i, j] = pi per cycle
        # in the continuous limit (convention of DESIGN.md section 2).
        t = np.linspace(0, 2 * np.pi, 20001)[:-1]
        A = wp.area_matrix(np.column_stack([np.sin(t), np.sin(t - np.pi / 2)]))
        assert A[0, 1] == pytest.approx(np.pi, rel=1e-6)

    @pytest.mark.parametrize("T,n", [(2, 2), (3, 3), (10, 2), (257, 4), (2000, 5)])
    def test_random_walk_against_per_pair_loop(self, T, n):
        X = random_walk(T, n, seed=T + n)
        assert close(wp.area_matrix(X), oracle_area(X), 1e-12)

    def test_random_walk_many_chunks(self, small_chunks):
        X = random_walk(500, 3, seed=7)
        assert close(wp.area_matrix(X), oracle_area(X), 1e-12)

    def test_against_exact_rationals(self):
        X = random_walk(300, 3, seed=11)
        A = wp.area_matrix(X)
        for i, j in [(0, 1), (0, 2), (1, 2)]:
            assert A[i, j] == pytest.approx(float(exact_area(X, i, j)), rel=1e-13)

    @pytest.mark.parametrize("offset", [1e6, -3e9])
    def test_large_offsets_keep_precision(self, offset):
        # Rounded data far from the origin: the exact value is that of the
        # rounded floats (rational arithmetic).  An uncentred lagged product
        # would lose about |offset|^2 * eps * T here.
        t = 2 * np.pi * np.arange(400) / 50
        X = np.column_stack([np.sin(t), 0.5 * np.cos(t), np.sin(2 * t)]) + offset
        A = wp.area_matrix(X)
        for i, j in [(0, 1), (0, 2), (1, 2)]:
            ex = float(exact_area(X, i, j))
            assert abs(A[i, j] - ex) <= 1e-12 * max(abs(ex), 1.0)

    def test_chunked_with_offset(self, small_chunks):
        X = random_walk(300, 3, seed=5, offset=1e7)
        ex = float(exact_area(X, 0, 1))
        assert wp.area_matrix(X)[0, 1] == pytest.approx(ex, rel=1e-11)

    @FAST
    @given(st.integers(2, 60), st.integers(2, 4), st.integers(0, 10 ** 6))
    def test_skew_and_translation_invariant(self, T, n, seed):
        X = random_walk(T, n, seed)
        A = wp.area_matrix(X).values
        assert np.array_equal(A, -A.T)
        shift = np.random.default_rng(seed).uniform(-50, 50, size=n)
        # A closed curve's area does not depend on the origin (Green's theorem).  The
        # only change allowed is rounding: forming X + shift moves each coordinate by at
        # most eps*M, which moves each of the T segment terms by a few eps*M^2 (common
        # practice, no source); a closure or centring mistake moves A by ~|shift| * |X|.
        M = max(np.max(np.abs(X)), np.max(np.abs(X + shift)))
        err = np.max(np.abs(wp.area_matrix(X + shift).values - A))
        assert err <= 1e-9 * np.max(np.abs(A)) + 8 * T * np.finfo(float).eps * M ** 2

    def test_reversal_flips_sign(self):
        X = random_walk(100, 3, seed=2)
        assert close(wp.area_matrix(X[::-1]), -wp.area_matrix(X).values, 1e-12)


# --------------------------------------------------------------------------- closures and gaps
class TestClosuresAndGaps:
    @pytest.mark.parametrize("closure", ["chord", "detrend"])
    def test_closures_match_calculus_layer(self, closure):
        X = random_walk(80, 3, seed=3, offset=10.0)
        assert close(wp.area_matrix(X, closure=closure), integrate_area(X, closure), 1e-11)

    def test_detrend_uses_times(self):
        X = random_walk(60, 3, seed=4)
        t = np.cumsum(np.random.default_rng(4).uniform(0.1, 2.0, 60))
        got = wp.area_matrix(X, times=t, closure="detrend")
        assert close(got, integrate_area(X, "detrend", times=t), 1e-11)
        # and differs from the index-based drift when the spacing is irregular
        assert not close(got, wp.area_matrix(X, closure="detrend"), 1e-6)

    def test_none_is_open_line_integral(self):
        X = random_walk(50, 3, seed=6, offset=2.0)
        assert close(wp.area_matrix(X, closure="none"), integrate_open(X), 1e-11)

    def test_require(self):
        t = 2 * np.pi * np.arange(41) / 40                      # last sample = first
        X = np.column_stack([np.cos(t), np.sin(t), np.cos(2 * t)])
        X[-1] = X[0]
        assert close(wp.area_matrix(X, closure="require"), integrate_area(X, "require"), 1e-12)
        with pytest.raises(ValueError, match="not closed"):
            wp.area_matrix(random_walk(30, 2, seed=1), closure="require")
        Y = X.copy()
        Y[-1, 0] += 1e-3
        # within tol the end is set exactly to the start (documented): the area is the
        # exact rational cyclic shoelace sum of the samples without the last one, and
        # not the chord closure of Y (which differs by ~1e-4 here)
        got = wp.area_matrix(Y, closure="require", tol=1e-2)
        want = [[float(exact_area(Y[:-1], i, j)) for j in range(3)] for i in range(3)]
        assert close(got, want, 1e-12)
        assert not close(got, wp.area_matrix(Y, closure="chord"), 1e-6)

    @pytest.mark.parametrize("closure", ["chord", "detrend", "require", "none"])
    def test_gaps_split_pieces_and_add(self, closure):
        # DESIGN.md: NaN rows split a path into pieces, each closed on its own;
        # the areas add.  Reference: each piece integrated by the calculus layer.
        pieces = [random_walk(L, 3, seed=L) for L in (30, 2, 1, 84)]
        if closure == "require":
            for pc in pieces:
                pc[-1] = pc[0]
        full_gap = np.full((1, 3), np.nan)
        part_gap = np.array([[1.0, np.nan, 2.0]])
        X = np.vstack([pieces[0], full_gap, pieces[1], part_gap, pieces[2], full_gap, pieces[3]])
        ref = integrate_open if closure == "none" else (lambda P: integrate_area(P, closure))
        want = sum(ref(pc) for pc in pieces if len(pc) > 1)
        assert close(wp.area_matrix(X, closure=closure), want, 1e-11)

    def test_gaps_against_loop_with_many_chunks(self, small_chunks):
        rng = np.random.default_rng(9)
        X = random_walk(400, 3, seed=9)
        X[rng.integers(0, 400, 40), rng.integers(0, 3, 40)] = np.nan
        X[0] = np.nan
        X[-1, 2] = np.nan
        assert close(wp.area_matrix(X), oracle_area(X), 1e-12)

    @FAST
    @given(st.integers(2, 80), st.integers(0, 10 ** 6), st.floats(0.0, 0.6))
    def test_random_gaps_against_loop(self, T, seed, frac):
        rng = np.random.default_rng(seed)
        X = random_walk(T, 3, seed)
        k = rng.random(T) < frac
        X[k, rng.integers(0, 3)] = np.nan
        if np.isnan(X).any(axis=1).all():
            return
        # reference: the plain per-pair loop (math.fsum).  Where every piece is too short
        # to enclose area the oracle is 0 and the kernel's rounding is judged against the
        # size of one term (at most M^2, M the largest |x|)
        want = oracle_area(X)
        M = float(np.nanmax(np.abs(X)))
        err = np.max(np.abs(wp.area_matrix(X).values - want))
        assert err <= 1e-12 * max(np.max(np.abs(want)), M ** 2)

    def test_all_gap_rows_refused(self):
        # as wp.Path does: no complete sample means there is no path at all
        with pytest.raises(ValueError, match="no complete sample"):
            wp.area_matrix(np.full((5, 2), np.nan))


# --------------------------------------------------------------------------- normalisation
class TestNormalisation:
    @FAST
    @given(st.sampled_from([3, 5, 8, 50, 101]), st.integers(1, 4),
           st.floats(0.05, 2 * np.pi - 0.05), st.floats(0.01, 100), st.floats(0.01, 100),
           st.floats(-1e3, 1e3))
    def test_hilbert_is_sin_phi_exactly(self, N, K, phi, a, b, offset):
        # Sampled sinusoids of one frequency: A = K (N/2) sin(2pi/N) a b sin(phi)
        # (see test_sampled_ellipse_formula) and the Hilbert energy of a sine
        # of amplitude a is the area of its regular N-gon loop traced K times,
        # K (N/2) sin(2pi/N) a^2; the ratio is sin(phi) whatever a, b.
        t = 2 * np.pi * np.arange(K * N) / N + 0.3
        X = np.column_stack([a * np.sin(t) + offset, b * np.sin(t - phi)])
        got = wp.area_matrix(X, normalize="hilbert")[0, 1]
        assert got == pytest.approx(np.sin(phi), abs=1e-10)

    def test_hilbert_energy_is_area_of_hilbert_loop(self):
        # scipy.signal.hilbert returns the analytic signal x + i H(x); the
        # area of the closed loop (x, Hx) must equal hilbert_energy.
        x = np.random.default_rng(1).standard_normal(257)
        h = np.imag(sps.hilbert(x - x.mean()))
        loop = np.column_stack([x, h])
        assert wp.hilbert_energy(x) == pytest.approx(float(exact_area(loop, 0, 1)), rel=1e-10)

    @FAST
    @given(st.integers(3, 200), st.integers(2, 5), st.integers(0, 10 ** 6))
    def test_normalised_values_are_bounded(self, T, n, seed):
        # |A_ij| <= sqrt(E_i E_j) (Cauchy-Schwarz over frequencies) and
        # |A_ij| <= sqrt(S_i S_j) (Cauchy-Schwarz over samples).
        X = np.random.default_rng(seed).standard_normal((T, n))
        for norm in ("hilbert", "zscore"):
            V = wp.area_matrix(X, normalize=norm)
            assert np.all(np.abs(V) <= 1 + 1e-12)

    def test_zscore_formula(self):
        # S_i = sum (a sin t_k)^2 = KN a^2/2 over whole cycles (N >= 3), so
        # A / sqrt(S_i S_j) = sin(2pi/N) sin(phi) (derived here).
        N, K, phi = 12, 3, 0.7
        t = 2 * np.pi * np.arange(K * N) / N
        X = np.column_stack([4 * np.sin(t), 0.1 * np.sin(t - phi)])
        got = wp.area_matrix(X, normalize="zscore")[0, 1]
        assert got == pytest.approx(np.sin(2 * np.pi / N) * np.sin(phi), rel=1e-12)

    def test_scale_invariance_and_frobenius(self):
        X = random_walk(300, 4, seed=12)
        scale = np.array([1e-3, 2.0, 7.0, 1e4])
        for norm in ("hilbert", "zscore"):
            assert close(wp.area_matrix(X * scale, normalize=norm), wp.area_matrix(X, normalize=norm),
                         1e-10)
        F = wp.area_matrix(X, normalize="frobenius").values
        assert np.sqrt(np.sum(F * F)) == pytest.approx(1.0, rel=1e-12)
        raw = wp.area_matrix(X).values
        assert close(F * np.sqrt(np.sum(raw * raw)), raw, 1e-12)

    @pytest.mark.parametrize("norm", ["hilbert", "zscore"])
    def test_constant_channel_warns_with_name(self, norm):
        X = pd.DataFrame({"a": np.sin(np.arange(50.0)), "flat": np.full(50, 3.0),
                          "b": np.cos(np.arange(50.0))})
        with pytest.warns(wp.ConstantChannelWarning, match="'flat'"):
            V = wp.area_matrix(X, normalize=norm)
        assert np.isnan(V[1]).all() and np.isnan(V[:, 1]).all()
        # the other pair keeps the value it has without the flat channel: the raw area over
        # sqrt of its channels' own normalisers (hilbert_energy, or the sums of squared
        # deviations from the mean; the definitions in area_matrix's docstring)
        a, b = X["a"].to_numpy(), X["b"].to_numpy()
        raw = float(exact_area(np.column_stack([a, b]), 0, 1))
        if norm == "hilbert":
            scale = np.sqrt(wp.hilbert_energy(a) * wp.hilbert_energy(b))
        else:
            scale = np.sqrt(np.sum((a - a.mean()) ** 2) * np.sum((b - b.mean()) ** 2))
        assert V[0, 2] == pytest.approx(raw / scale, rel=1e-12)
        assert V[0, 2] == pytest.approx(wp.area_matrix(X[["a", "b"]], normalize=norm)[0, 1],
                                        rel=1e-14)
        with warnings.catch_warnings():
            warnings.simplefilter("error")
            raw = wp.area_matrix(X)                      # raw areas: exactly 0, no warning
        assert np.all(raw[1] == 0)

    def test_all_zero_frobenius_warns(self):
        with pytest.warns(wp.ConstantChannelWarning, match="all areas are zero"):
            V = wp.area_matrix(np.ones((10, 3)), normalize="frobenius")
        assert np.isnan(V).all()


# --------------------------------------------------------------------------- input kinds
class TestInputs:
    def test_dataframe_names_and_labels(self):
        df = pd.DataFrame(random_walk(40, 3, seed=1), columns=["x", "y", "z"])
        m = wp.area_matrix(df)
        assert isinstance(m, wp.AreaMatrix) and m.names == ("x", "y", "z")
        ref = oracle_area(df.to_numpy())
        assert m["x", "z"] == pytest.approx(ref[0, 2], rel=1e-12)
        fr = m.to_frame()                    # tidy: one row per pair i < j
        assert list(fr.columns) == ["i", "j", "channel_i", "channel_j", "area"]
        assert fr[["channel_i", "channel_j"]].values.tolist() == [["x", "y"], ["x", "z"],
                                                                  ["y", "z"]]
        assert np.allclose(fr["area"], ref[[0, 0, 1], [1, 2, 2]], rtol=1e-12)
        assert np.array_equal(np.asarray(m), m.values) and m.shape == (3, 3)
        assert m.samples == 40 and m.closure == "chord" and m.normalize is None

    def test_path_input_uses_times_and_names(self):
        X = random_walk(30, 2, seed=2)
        t = np.cumsum(np.random.default_rng(2).uniform(0.5, 1.5, 30))
        p = wp.Path(X, times=t, names=["u", "v"])
        m = wp.area_matrix(p, closure="detrend")
        assert m.names == ("u", "v")
        assert close(m.values, integrate_area(X, "detrend", times=t), 1e-11)

    def test_integer_and_float32_input(self):
        rng = np.random.default_rng(3)
        Xi = rng.integers(-5, 6, size=(50, 3)).cumsum(axis=0)
        assert close(wp.area_matrix(Xi), oracle_area(Xi.astype(float)), 1e-13)
        Xf = Xi.astype(np.float32)
        assert close(wp.area_matrix(Xf), oracle_area(Xf.astype(float)), 1e-13)

    def test_mapping_input(self):
        m = wp.area_matrix({"p": [0.0, 1, 1, 0], "q": [0.0, 0, 1, 1]})
        assert m["p", "q"] == 1.0 and m.names == ("p", "q")

    def test_inputs_never_modified(self):
        X = random_walk(200, 3, seed=4)
        X[[10, 50], 1] = np.nan
        before = X.copy()
        X.flags.writeable = False
        for closure in ("chord", "none", "detrend"):
            for norm in (None, "hilbert", "zscore", "frobenius"):
                wp.area_matrix(X, closure=closure, normalize=norm)
        assert np.array_equal(X, before, equal_nan=True)
        df = pd.DataFrame(before.copy(), columns=list("abc"))
        df_before = df.copy()
        wp.area_matrix(df, normalize="hilbert", closure="detrend")
        pd.testing.assert_frame_equal(df, df_before)


class TestAlignment:
    def test_union_grid_by_hand(self):
        # channel a: t = 0, 2, 4 values 0, 2, 0; channel b: t = 1, 3 values 1, -1
        # union within [1, 3]: 1, 2, 3; a(1) = 1, a(3) = 1; b(2) = 0 (by hand)
        p = wp.align([[0.0, 2.0, 0.0], [1.0, -1.0]], times=[[0, 2, 4], [1, 3]])
        assert p.times.tolist() == [1.0, 2.0, 3.0]
        assert p.points.tolist() == [[1.0, 1.0], [2.0, 0.0], [1.0, -1.0]]

    def test_exact_for_the_linear_model(self):
        # Each channel is piecewise linear in time between its own stamps.  The
        # area of the joint curve over the common span, closed by its chord, is
        # (1/2) int (f g' - g f') dt + (1/2)(f(hi) g(lo) - g(hi) f(lo)),
        # computed here in exact rational arithmetic (fractions) from the
        # piecewise-linear interpolants: between consecutive knots of the union
        # of both stamp sets f and g are linear, so the integrand is linear in t
        # and the midpoint rule integrates it exactly (common practice, no source).
        rng = np.random.default_rng(5)
        ta = np.array([0, 1, 3, 4, 7, 9]) / 2
        tb = np.array([0.25, 2, 2.5, 5, 8.5]) / 2
        fa = rng.integers(-4, 5, ta.size) / 2
        fb = rng.integers(-4, 5, tb.size) / 2

        def interpolant(tt, vv):
            tt = [Fraction(float(v)) for v in tt]
            vv = [Fraction(float(v)) for v in vv]

            def at(s):
                """Value and slope of the interpolant at s (s inside one segment, or a stamp)."""
                k = max(m for m in range(len(tt) - 1) if tt[m] <= s)
                slope = (vv[k + 1] - vv[k]) / (tt[k + 1] - tt[k])
                return vv[k] + slope * (s - tt[k]), slope
            return at

        f, g = interpolant(ta, fa), interpolant(tb, fb)
        lo, hi = Fraction(max(ta[0], tb[0])), Fraction(min(ta[-1], tb[-1]))
        knots = sorted({lo, hi} | {Fraction(float(v)) for v in np.concatenate([ta, tb])
                                   if lo < v < hi})
        integral = Fraction(0)
        for a, b in zip(knots[:-1], knots[1:]):
            (fm, df), (gm, dg) = f((a + b) / 2), g((a + b) / 2)
            integral += (b - a) * (fm * dg - gm * df) / 2
        chord = (f(hi)[0] * g(lo)[0] - g(hi)[0] * f(lo)[0]) / 2
        exact = integral + chord
        assert len(knots) == 9 and exact != 0           # the case is not degenerate
        got = wp.area_matrix([fa, fb], times=[ta, tb])[0, 1]
        assert got == pytest.approx(float(exact), rel=1e-12, abs=1e-12)

    def test_dense_asynchronous_sinusoids(self):
        # x_i = sin t leads x_j = sin(t - phi): pi sin(phi) per cycle in the limit
        # (DESIGN.md convention); 3 cycles, irregular stamps of their own.
        rng = np.random.default_rng(6)
        phi = 1.1
        ta = np.sort(rng.uniform(0, 6 * np.pi, 4000))
        tb = np.sort(rng.uniform(0, 6 * np.pi, 3000))
        m = wp.area_matrix({"i": pd.Series(np.sin(ta), index=ta),
                            "j": pd.Series(np.sin(tb - phi), index=tb)})
        span = min(ta[-1], tb[-1]) - max(ta[0], tb[0])
        assert m["i", "j"] / (span / (2 * np.pi)) == pytest.approx(np.pi * np.sin(phi), rel=2e-3)

    def test_gap_in_one_channel(self):
        p = wp.align([[0.0, 1.0, np.nan, 3.0, 4.0], [0.0, 1.0]], times=[[0, 1, 2, 3, 4], [0.5, 3.5]])
        # stamps 0.5..3.5: 1, 2, 3 touch the NaN sample at t = 2 on channel 0
        assert p.times.tolist() == [0.5, 1.0, 2.0, 3.0, 3.5]
        assert np.isnan(p.points[2, 0]) and not np.isnan(p.points[1, 0])

    def test_align_errors(self):
        with pytest.raises(ValueError, match="do not overlap"):
            wp.align([[1.0, 2.0], [1.0, 2.0]], times=[[0, 1], [2, 3]])
        with pytest.raises(ValueError, match="strictly increasing"):
            wp.align([[1.0, 2.0], [1.0, 2.0]], times=[[0, 0], [0, 1]])
        with pytest.raises(ValueError, match="one time array per channel"):
            wp.align([[1.0, 2.0], [1.0, 2.0]], times=[[0, 1]])
        with pytest.raises(ValueError, match="times are needed"):
            wp.align([[1.0, 2.0], [1.0, 2.0]])
        with pytest.raises(ValueError, match="samples but"):
            wp.align([[1.0, 2.0, 3.0], [1.0, 2.0]], times=[[0, 1], [0, 1]])


# --------------------------------------------------------------------------- bad input
def one_line(excinfo):
    msg = str(excinfo.value)
    assert "\n" not in msg and len(msg) > 10
    return msg


class TestBadInput:
    def test_too_few_channels_or_samples(self):
        with pytest.raises(ValueError, match="1 channel; lead-lag needs at least 2") as e:
            wp.area_matrix(np.zeros((10, 1)))
        one_line(e)
        with pytest.raises(ValueError, match="1 sample"):
            wp.area_matrix(np.zeros((1, 3)))
        with pytest.raises(ValueError, match="2-dimensional"):
            wp.area_matrix(np.zeros(10))

    def test_non_finite(self):
        X = random_walk(20, 2, seed=1)
        X[7, 1] = np.inf
        with pytest.raises(ValueError, match="infinite value at row 7") as e:
            wp.area_matrix(X)
        one_line(e)

    @pytest.mark.parametrize("bad", [
        np.array([["a", "b"], ["c", "d"]]),
        np.ones((3, 2), dtype=complex),
        np.ones((3, 2), dtype=bool),
        [[1.0, 2.0], [3.0]],
    ])
    def test_non_numeric(self, bad):
        with pytest.raises(TypeError) as e:
            wp.area_matrix(bad)
        one_line(e)

    def test_non_numeric_column_named(self):
        df = pd.DataFrame({"a": [1.0, 2.0, 3.0], "label": ["x", "y", "z"]})
        with pytest.raises(TypeError, match="'label' is not numeric"):
            wp.area_matrix(df)
        df2 = pd.DataFrame({"a": [1.0, 2.0, 3.0], "flag": [True, False, True]})
        with pytest.raises(TypeError, match="'flag'"):
            wp.area_matrix(df2)

    def test_names_mismatch(self):
        X = random_walk(10, 3, seed=1)
        with pytest.raises(ValueError, match="names has 2 entries"):
            wp.area_matrix(X, names=["a", "b"])
        with pytest.raises(ValueError, match="distinct"):
            wp.area_matrix(X, names=["a", "b", "a"])
        with pytest.raises(ValueError, match="do not match the DataFrame"):
            wp.area_matrix(pd.DataFrame(X, columns=list("abc")), names=["a", "b", "d"])
        with pytest.raises(TypeError, match="names must be a sequence"):
            wp.area_matrix(X, names="abc")

    def test_bad_options(self):
        X = random_walk(10, 2, seed=1)
        with pytest.raises(ValueError, match="unknown closure 'close'"):
            wp.area_matrix(X, closure="close")
        with pytest.raises(ValueError, match="unknown normalize 'std'"):
            wp.area_matrix(X, normalize="std")
        with pytest.raises(ValueError, match="times has 3 entries"):
            wp.area_matrix(X, times=[0, 1, 2])
        with pytest.raises(ValueError, match="strictly increasing"):
            wp.area_matrix(X, times=np.r_[0:9, 8.0])
        with pytest.raises(TypeError, match="unexpected keyword argument 'labels'"):
            wp.area_matrix(X, labels=True)          # gone: the result always has its labels
        with pytest.raises(TypeError, match="positional argument"):
            wp.area_matrix(X, np.arange(10.0))      # times= is keyword-only
