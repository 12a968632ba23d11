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
