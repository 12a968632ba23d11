"""Calibration of the significance tools: power, size (issue 14, item 4).

Deliberate statistical batteries: seeded, marked slow, each well under a
minute on one core.  Monte Carlo error bars are binomial standard errors,
``sqrt(p (1 - p) / N)``, N the number of independent tests.  The larger runs
quoted in docs/signals.md come from ``tools/calibration_signals.py``.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy.signal import lfilter

import wedgepath as wp

pytestmark = pytest.mark.slow


def moving_average(rng, T, width=8):
    return lfilter(np.ones(width) / width, [1.0], rng.standard_normal(T + 4 * width))[4 * width:]


def six_channels(rng, T=512, lag=2, noise=0.7):
    """Channels 0 -> 1 -> 2 a lagged broadband drive (each ``lag`` samples behind the
    previous) plus independent noise; channels 3, 4, 5 independent broadband noise."""
    d = moving_average(rng, T + 2 * lag)
    lead = np.column_stack([d[2 * lag:2 * lag + T], d[lag:lag + T], d[:T]])
    lead += noise * lead.std() * rng.standard_normal((T, 3))
    return np.column_stack([lead] + [moving_average(rng, T) for _ in range(3)])


TRUE_PAIRS = [(0, 1), (1, 2), (0, 2)]


@pytest.mark.parametrize("method", ["shift", "phase"])
def test_power_on_lagged_broadband_channels(method):
    # 6 channels, 3 of them lagged copies of one broadband drive, T = 512,
    # Benjamini-Hochberg over the 15 pairs at 5 %.  Before the minimum shift,
    # shift surrogates found 10 % of the true pairs (phase: 81 %): shifts
    # shorter than the decorrelation time keep the lead and floor the p-values.
    rng = np.random.default_rng(2024)
    N = 40
    found = false = 0
    for _ in range(N):
        res = wp.surrogate_test(six_channels(rng), method=method, n_surrogates=199, seed=rng,
                                progress=False)
        sig = res.significant(0.05)
        found += sum(bool(sig[i, j]) for i, j in TRUE_PAIRS)
        false += int(np.triu(sig, 1).sum()) - sum(bool(sig[i, j]) for i, j in TRUE_PAIRS)
    power = found / (3 * N)
    # measured 0.97 (shift; 0.10 before the minimum shift) and 0.80 (phase) with
    # this seed; 0.7 is about 2.7 standard errors below the lower of the two
    assert power >= 0.7, f"power {power:.3f}"
    # false discoveries among the 12 null pairs stay rare (FDR control)
    assert false / (12 * N) < 0.02


def null_channels(rng, kind, T=512, n=6):
    z = rng.standard_normal((T + 300, n))
    if kind == "ar0.9":
        X = lfilter([1.0], [1.0, -0.9], z, axis=0)[300:]
    else:                                       # moving average of 8 samples
        X = lfilter(np.ones(8) / 8, [1.0], z, axis=0)[300:]
    return X * np.array([1.0, 30.0, 0.01, 5.0, 1e3, 0.2])[:n]   # unequal scales


@pytest.mark.parametrize("method,kind", [("shift", "ar0.9"), ("shift", "ma8"),
                                         ("phase", "ma8")])
def test_size_under_independent_channels(method, kind):
    # Null: independent, autocorrelated channels.  The disjoint pairs (0, 1),
    # (2, 3), (4, 5) of each data set are independent tests (their channels and
    # their shifts or phases are independent).  Rejection rate at p <= 0.05 with
    # 199 surrogates: exactly 10/200 = 0.05 for an exact null.
    rng = np.random.default_rng({"ar0.9": 11, "ma8": 12}[kind] + (method == "phase"))
    N = 250
    rejected = 0
    for _ in range(N):
        res = wp.surrogate_test(null_channels(rng, kind), method=method, n_surrogates=199,
                                seed=rng, progress=False)
        rejected += sum(res.pvalues[i, i + 1] <= 0.05 for i in (0, 2, 4))
    rate = rejected / (3 * N)
    se = np.sqrt(0.05 * 0.95 / (3 * N))
    assert abs(rate - 0.05) < 3.0 * se, f"size {rate:.4f} (se {se:.4f})"


# --------------------------------------------------------------------------- bootstrap coverage
def sine_ar_model(rng, T, ar, sigma, period=40, phi=0.7):
    """``x_i = sin t``, ``x_j = sin(t - phi)`` plus independent AR(1) noise.

    Expected area, derived here: over whole cycles the sampled sinusoid pair
    is the sampled ellipse, area ``(N/2) sin(2 pi/N) sin(phi)`` per cycle
    (N = ``period`` samples per cycle; ``pi sin(phi)`` in the continuous limit,
    common practice, no source); the noise is independent of the sines and
    between channels, so every term that involves it has mean zero (the chord
    closure and the centring change nothing: the chord-closed area is
    translation invariant).
    """
    t = 2 * np.pi * np.arange(T) / period
    noise = lfilter([1.0], [1.0, -ar], sigma * rng.standard_normal((T + 300, 2)), axis=0)[300:]
    X = np.column_stack([np.sin(t), np.sin(t - phi)]) + noise
    truth = (T / period) * (period / 2) * np.sin(2 * np.pi / period) * np.sin(phi)
    return X, truth


VAR_PHI = 0.9 * np.array([[np.cos(0.3), -np.sin(0.3)], [np.sin(0.3), np.cos(0.3)]]) + [[0.05, 0], [0, 0]]


def var_model(rng, T, Phi=VAR_PHI):
    """Stationary VAR(1) ``y_{k+1} = Phi y_k + e_k``, ``e_k ~ N(0, I)``, started in equilibrium.

    Expected area, derived here.  The stationary covariance solves
    ``S = Phi S Phi^T + I`` (discrete Lyapunov equation, solved by
    scipy.linalg.solve_discrete_lyapunov), and ``E[y_k y_{k+h}^T] = S (Phi^h)^T``.
    The chord-closed area is translation invariant, so centring does not matter,
    and equals ``(1/2) sum_{k=0}^{T-1} y_k ^ y_{k+1}`` with ``y_T = y_0``.  Hence
    ``E[A] = (T - 1)/2 (S Phi^T - Phi S) + (1/2) (Phi^(T-1) S - S (Phi^(T-1))^T)``
    (the second term from the closing pair (y_{T-1}, y_0), whose covariance is
    ``Phi^(T-1) S``).
    """
    import scipy.linalg
    S = scipy.linalg.solve_discrete_lyapunov(Phi, np.eye(2))
    y = np.empty((T, 2))
    y[0] = np.linalg.cholesky(S) @ rng.standard_normal(2)
    e = rng.standard_normal((T, 2))
    for k in range(1, T):
        y[k] = Phi @ y[k - 1] + e[k]
    C = S @ Phi.T
    P = np.linalg.matrix_power(Phi, T - 1) @ S
    E = 0.5 * (T - 1) * (C - C.T) + 0.5 * (P - P.T)
    return y, E[0, 1]


def coverage(model, T, reps, seed, **kw):
    rng = np.random.default_rng(seed)
    hit = 0
    for _ in range(reps):
        X, truth = model(rng, T, **kw) if kw else model(rng, T)
        ci = wp.bootstrap_area(X, n_boot=499, seed=rng, progress=False)
        hit += ci.low[0, 1] <= truth <= ci.high[0, 1]
    return hit / reps


def test_bootstrap_coverage():
    # Nominal 95 % studentized circular-block intervals on models with a known
    # expected area (derived in sine_ar_model and var_model).  1000 intervals
    # pooled over two cells: binomial standard error 0.0069 at 0.95, so the
    # bounds below tell 0.95 from 0.92 (a true 0.92 passes the lower bound with
    # probability about 3 %).  Before (non-overlapping blocks of T^(1/3),
    # percentile interval) the same cells and seeds gave 0.911.
    cells = [(sine_ar_model, dict(ar=0.6, sigma=0.7), 520, 1),
             (sine_ar_model, dict(ar=0.9, sigma=0.3), 520, 2)]
    reps = 500
    hits = [coverage(model, T, reps, seed, **kw) * reps for model, kw, T, seed in cells]
    cov = sum(hits) / (reps * len(cells))
    se = np.sqrt(0.95 * 0.05 / (reps * len(cells)))
    assert 0.95 - 2 * se <= cov <= 0.95 + 3 * se, f"coverage {cov:.3f}"
