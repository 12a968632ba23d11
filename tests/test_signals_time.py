"""Areas over time: rolling windows and the streaming/merging accumulator.

References are independent: a plain per-window loop (each window's pieces
centred on their first sample, segments summed with math.fsum), exact
rational arithmetic, and the whole-array result the issue asks to match.
"""

from __future__ import annotations

import json
import math
import pickle
from fractions import Fraction

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import wedgepath as wp
from wedgepath.signals import rolling as rolling_mod

FAST = settings(max_examples=25, deadline=None)


def window_oracle(X):
    """Chord-closed areas of one window: a loop over pieces, pairs and segments.

    Segment k of a piece starting at s adds (1/2)(x_k - x_s) ^ (x_{k+1} - x_k);
    the increments are formed from the raw samples, so a drift does not
    inflate the products; math.fsum adds the terms exactly.
    """
    X = np.asarray(X, dtype=float)
    T, n = X.shape
    bad = np.isnan(X).any(axis=1)
    pcs, k = [], 0
    while k < T:
        if bad[k]:
            k += 1
            continue
        s = k
        while k < T and not bad[k]:
            k += 1
        pcs.append((s, k))
    A = np.zeros((n, n))
    for i in range(n):
        for j in range(i + 1, n):
            terms = []
            for s, e in pcs:
                zi = X[s:e - 1, i] - X[s, i]
                zj = X[s:e - 1, j] - X[s, j]
                di = np.diff(X[s:e, i])
                dj = np.diff(X[s:e, j])
                terms.extend((0.5 * (zi * dj - zj * di)).tolist())
            A[i, j] = math.fsum(terms)
            A[j, i] = -A[i, j]
    return A


def close(a, b, rtol, floor=0.0):
    a, b = np.asarray(a), np.asarray(b)
    return np.max(np.abs(a - b)) <= rtol * max(np.max(np.abs(b)), floor)


def walk(T, n, seed, drift=0.0):
    rng = np.random.default_rng(seed)
    return (rng.standard_normal((T, n)) + drift).cumsum(axis=0)


# --------------------------------------------------------------------------- rolling
class TestRolling:
    @pytest.mark.parametrize("window,step", [(50, 10), (50, 50), (37, 5), (20, 30), (2, 1),
                                             (64, 24), (300, 300)])
    def test_matches_per_window_loop(self, window, step):
        X = walk(300, 3, seed=window + step)
        R = wp.rolling_area_matrix(X, window, step)
        K = (300 - window) // step + 1
        assert R.shape == (K, 3, 3)
        for k in range(K):
            assert close(R[k], window_oracle(X[k * step:k * step + window]), 1e-10, floor=1e-2)

    @FAST
    @given(st.integers(2, 120), st.integers(0, 10 ** 6), st.data())
    def test_random_shapes_with_gaps(self, T, seed, data):
        rng = np.random.default_rng(seed)
        n = int(rng.integers(2, 4))
        X = walk(T, n, seed) + rng.uniform(-1e3, 1e3)
        if rng.random() < 0.6:
            rows = rng.integers(0, T, size=int(rng.integers(1, max(2, T // 4))))
            X[rows, int(rng.integers(0, n))] = np.nan
        w = data.draw(st.integers(2, T))
        s = data.draw(st.integers(1, T))
        R = wp.rolling_area_matrix(X, w, s)
        scale = max(1.0, float(np.nanmax(np.abs(X))) ** 2) * 1e-3
        for k in range(R.shape[0]):
            assert close(R[k], window_oracle(X[k * s:k * s + w]), 1e-10, floor=scale)

    def test_long_drifting_series(self):
        # A strong drift plus a small random walk: window areas are small next
        # to the running sum of area terms, so the textbook shortcut -- a prefix
        # sum of (1/2) x_k ^ x_{k+1} and one difference per window -- cancels
        # catastrophically (checked below, so the data are known to be hard);
        # the rolling result must still match the per-window loop to 1e-10.
        T, w, step = 60_000, 3_000, 1_500
        rng = np.random.default_rng(1)
        X = np.column_stack([np.arange(T) * 5.0, np.arange(T) * -3.0, np.arange(T) * 1.0])
        X += rng.standard_normal((T, 3)).cumsum(axis=0) * 0.005
        R = wp.rolling_area_matrix(X, w, step)
        seg = 0.5 * (X[:-1, 0] * X[1:, 1] - X[:-1, 1] * X[1:, 0])
        C = np.concatenate(([0.0], np.cumsum(seg)))
        worst_naive = 0.0
        for k, u in enumerate(range(0, T - w + 1, step)):
            want = window_oracle(X[u:u + w])
            assert close(R[k], want, 1e-10)
            e = u + w - 1
            naive = C[e] - C[u] + 0.5 * (X[e, 0] * X[u, 1] - X[e, 1] * X[u, 0])
            worst_naive = max(worst_naive, abs(naive - want[0, 1]) / abs(want[0, 1]))
        assert worst_naive > 1e-8

    def test_exact_rationals_small(self):
        X = walk(40, 2, seed=3)
        R = wp.rolling_area_matrix(X, 12, 4)
        for k in range(R.shape[0]):
            W = X[4 * k:4 * k + 12]
            ex = Fraction(0)
            P = [(Fraction(a), Fraction(b)) for a, b in W]
            for m in range(len(P)):
                (a, b), (c, d) = P[m], P[(m + 1) % len(P)]
                ex += (a * d - b * c) / 2
            assert R[k, 0, 1] == pytest.approx(float(ex), rel=1e-12)

    def test_whole_window_equals_area_matrix(self):
        X = walk(500, 4, seed=4)
        R = wp.rolling_area_matrix(X, 500, 7)
        assert R.shape == (1, 4, 4)
        assert close(R[0], wp.area_matrix(X), 1e-12)

    def test_small_batches(self, monkeypatch):
        monkeypatch.setattr(rolling_mod, "_BATCH_ELEMENTS", 10)
        X = walk(400, 3, seed=5)
        X[[40, 41, 200], 1] = np.nan
        R = wp.rolling_area_matrix(X, 60, 20)
        for k in range(R.shape[0]):
            assert close(R[k], window_oracle(X[20 * k:20 * k + 60]), 1e-10, floor=1e-2)

    def test_labels_and_times(self):
        X = pd.DataFrame(walk(100, 2, seed=6), columns=["a", "b"])
        t = 10.0 + 0.5 * np.arange(100)
        r = wp.rolling_area_matrix(X, 20, 10, times=t)
        assert isinstance(r, wp.RollingAreas) and r.names == ("a", "b")
        assert len(r) == 9 and r.shape == (9, 2, 2) and (r.window, r.step) == (20, 10)
        assert r.start.tolist() == list(range(0, 81, 10))
        assert r.stop.tolist() == list(range(20, 101, 10))
        assert r.start_time[2] == 20.0 and r.stop_time[2] == 10.0 + 0.5 * 39
        assert np.array_equal(r.pair("a", "b"), r.areas[:, 0, 1])
        assert np.array_equal(np.asarray(r), r.areas)
        # tidy: one row per window and pair, each equal to the area of that window's slice
        fr = r.to_frame()
        assert list(fr.columns) == ["window", "start", "stop", "start_time", "stop_time", "i",
                                    "j", "channel_i", "channel_j", "area"]
        assert len(fr) == 9 and fr["window"].tolist() == list(range(9))
        for k in (0, 4, 8):
            ref = wp.area_matrix(X.iloc[10 * k:10 * k + 20])
            assert fr["area"][k] == pytest.approx(ref["a", "b"], rel=1e-12)
        # without times, the windows' times are their sample positions
        plain = wp.rolling_area_matrix(X, 20, 10)
        assert plain.start_time.tolist() == list(range(0, 81, 10))
        assert plain.stop_time.tolist() == list(range(19, 100, 10))

    def test_input_not_modified(self):
        X = walk(100, 3, seed=7)
        X[5, 0] = np.nan
        before = X.copy()
        X.flags.writeable = False
        wp.rolling_area_matrix(X, 30, 7)
        assert np.array_equal(X, before, equal_nan=True)

    def test_bad_arguments(self):
        X = walk(50, 2, seed=1)
        with pytest.raises(ValueError, match="at least 2 samples"):
            wp.rolling_area_matrix(X, 1, 1)
        with pytest.raises(ValueError, match="longer than the data"):
            wp.rolling_area_matrix(X, 51, 1)
        with pytest.raises(ValueError, match="step must be at least 1"):
            wp.rolling_area_matrix(X, 10, 0)
        with pytest.raises(TypeError, match="window must be an integer"):
            wp.rolling_area_matrix(X, 10.5, 1)
        X[3, 1] = np.inf
        with pytest.raises(ValueError, match="infinite value at row 3"):
            wp.rolling_area_matrix(X, 10, 5)


# --------------------------------------------------------------------------- accumulator
def feed(X, cuts, n):
    parts = np.split(X, cuts)
    return [wp.AreaAccumulator(n).update(p) if len(p) else wp.AreaAccumulator(n) for p in parts]


class TestAccumulator:
    @FAST
    @given(st.integers(2, 150), st.integers(0, 10 ** 6), st.lists(st.integers(0, 150), max_size=8),
           st.booleans())
    def test_any_chunking_any_tree(self, T, seed, cuts, gaps):
        rng = np.random.default_rng(seed)
        X = walk(T, 3, seed) + rng.uniform(-1e4, 1e4)
        if gaps:
            X[rng.integers(0, T, size=max(1, T // 6)), int(rng.integers(0, 3))] = np.nan
        accs = feed(X, sorted(c for c in cuts if c <= T), 3)
        while len(accs) > 1:                       # merge neighbours in a random tree
            i = int(rng.integers(0, len(accs) - 1))
            accs[i] = accs[i].merge(accs[i + 1])
            del accs[i + 1]
        acc = accs[0]
        assert acc.count == T
        want = window_oracle(X)
        scale = float(np.nanmax(np.abs(X - np.nanmean(X, axis=0)))) ** 2 * 1e-3 + 1e-9
        assert close(acc.result(), want, 1e-10, floor=scale)

    def test_equals_whole_array_result(self):
        X = walk(5000, 4, seed=2)
        X[[100, 2000, 2001], 2] = np.nan
        acc = wp.AreaAccumulator(4)
        for chunk in np.array_split(X, 37):
            acc.update(chunk)
        assert close(acc.result(), wp.area_matrix(X), 1e-12)
        assert close(acc.result(), window_oracle(X), 1e-12)

    def test_one_sample_at_a_time(self):
        X = walk(60, 2, seed=3)
        X[20] = np.nan
        acc = wp.AreaAccumulator(2)
        for row in X:
            acc.update(row)
        assert close(acc.result(), window_oracle(X), 1e-12)

    def test_merge_is_associative(self):
        X = walk(900, 3, seed=4)
        a, b, c = feed(X, [250, 700], 3)
        left = a.copy().merge(b).merge(c)
        right = a.copy().merge(b.copy().merge(c))
        assert close(left.result(), right.result(), 1e-12)
        assert close(left.result(), window_oracle(X), 1e-12)
        # merging leaves the argument untouched
        assert b.count == 450

    def test_state_is_small_and_serialisable(self):
        X = walk(1000, 3, seed=5)
        X[500] = np.nan
        acc = wp.AreaAccumulator(3, names=["a", "b", "c"]).update(X)
        st_ = acc.state()
        back = wp.AreaAccumulator.from_state(json.loads(json.dumps(st_)))
        assert np.array_equal(back.result(), acc.result())
        assert back.names == ("a", "b", "c") and back.count == 1000 and back.gapped
        pk = pickle.loads(pickle.dumps(acc))
        assert np.array_equal(pk.result(), acc.result())
        np.testing.assert_array_equal(acc.increment, X[-1] - X[0])
        # continuing after a round trip is the same as continuing the original
        more = walk(100, 3, seed=6) + X[-1]
        assert np.array_equal(back.update(more).result(), acc.update(more).result())

    def test_labels(self):
        acc = wp.AreaAccumulator(2, names=["strain", "stress"]).update([[0, 0], [1, 0], [1, 1]])
        m = acc.result()
        assert isinstance(m, wp.AreaMatrix) and m.samples == 3
        assert m.names == ("strain", "stress") and m["strain", "stress"] == 0.5
        # without names: "0", "1", ... (always a tuple of str)
        assert wp.AreaAccumulator(2).update([[0, 0], [1, 0], [1, 1]]).result().names == ("0", "1")

    def test_memory_stays_flat(self):
        # state size does not depend on the number of samples fed
        acc = wp.AreaAccumulator(3)
        for k in range(5):
            acc.update(walk(1000, 3, seed=k))
        sizes = [np.asarray(v).nbytes for v in acc.state().values() if isinstance(v, list)]
        assert sum(sizes) < 1000

    def test_errors(self):
        acc = wp.AreaAccumulator(3, names=["a", "b", "c"])
        with pytest.raises(ValueError, match="at least 2 channels"):
            wp.AreaAccumulator(1)
        with pytest.raises(TypeError, match="n must be an integer"):
            wp.AreaAccumulator(2.0)
        with pytest.raises(ValueError, match="chunk has 2 channels"):
            acc.update(np.zeros((4, 2)))
        with pytest.raises(ValueError, match="do not match"):
            acc.update(pd.DataFrame(np.zeros((3, 3)), columns=["a", "b", "x"]))
        with pytest.raises(ValueError, match="names differ"):
            acc.merge(wp.AreaAccumulator(3, names=["x", "y", "z"]))
        with pytest.raises(ValueError, match="3 channels into one of 2"):
            wp.AreaAccumulator(2).merge(acc)
        with pytest.raises(TypeError, match="merge needs an AreaAccumulator"):
            acc.merge(np.zeros((3, 3)))
        with pytest.raises(ValueError, match="seen 0 sample"):
            acc.result()
        with pytest.raises(ValueError, match="infinite"):
            acc.update(np.array([[1.0, np.inf, 0.0], [0.0, 0.0, 0.0]]))
        with pytest.raises(TypeError):
            acc.update([["a", "b", "c"]])
        with pytest.raises(ValueError, match="missing"):
            wp.AreaAccumulator.from_state({"n": 2})

    def test_chunk_not_modified(self):
        X = walk(50, 2, seed=8)
        before = X.copy()
        X.flags.writeable = False
        wp.AreaAccumulator(2).update(X)
        assert np.array_equal(X, before)
