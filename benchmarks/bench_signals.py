"""Benchmark of the signals layer (a script, not a test): ratios against baselines run here.

Rows:

* ``area_matrix`` on T = 10^6 samples of n = 64 channels against one
  ``X.T @ X`` of the same array (BLAS-bound; target within 2x) and against a
  per-pair Python loop of vectorised shoelace sums (target over 50x faster);
* ``rolling_area_matrix`` with a 10,000-sample window against a 500-sample
  window at the same step (cost must not grow with the window; target a
  time ratio under 1.5);
* peak traced memory of ``AreaAccumulator`` fed 10^7 samples of 16 channels
  in chunks (target under 100 MB; the whole array would be 1.28 GB);
* ``cyclic_order`` of n = 2000 channels against ``numpy.linalg.eigh(1j * A)``
  of the same matrix (the full eigensolver it used before; target a quarter
  of its time for an area matrix with one cycle in noise, half for a
  patternless skew-symmetric matrix, Lanczos's worst case);
* peak traced memory of ``noise_fit_baseline(1500)`` (target under 1 MB; it
  used to allocate (200, 1500, 1500) complex numbers, 3.35 GiB).

Run:  .venv/bin/python benchmarks/bench_signals.py  [--quick]
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent))
from _harness import Table, best_time, interleaved_best, peak_memory  # noqa: E402

import wedgepath as wp  # noqa: E402


def per_pair_loop(X, pairs):
    """Baseline: a Python loop over pairs, each a vectorised chord-closed shoelace sum."""
    out = {}
    for i, j in pairs:
        x = X[:, i] - X[0, i]
        y = X[:, j] - X[0, j]
        out[i, j] = 0.5 * (np.dot(x[:-1], y[1:]) - np.dot(y[:-1], x[1:]))
    return out



def main(quick=False):
    rng = np.random.default_rng(0)
    table = Table("wedgepath.signals")

    # ---------------------------------------------------------------- area_matrix
    T, n = (200_000 if quick else 1_000_000), 64
    X = rng.standard_normal((T, n)).cumsum(axis=0) + 1e3
    t_gram, t_area = interleaved_best([lambda: X.T @ X, lambda: wp.area_matrix(X)],
                                      repeat=3 if quick else 7)
    table.ratio(f"area_matrix vs X.T @ X (T={T:.0e}, n={n})", t_area, t_gram, 2.0,
                note=f"{t_area * 1e3:.0f} ms vs {t_gram * 1e3:.0f} ms")
    pairs = [(i, j) for i in range(n) for j in range(i + 1, n)]
    sample = pairs[:: max(1, len(pairs) // (64 if quick else 256))]
    t_loop_sample = best_time(lambda: per_pair_loop(X, sample), repeat=1)
    t_loop = t_loop_sample * len(pairs) / len(sample)
    # check the loop agrees, so that the comparison is between equal results
    A = wp.area_matrix(X)
    ref = per_pair_loop(X, sample[:8])
    agree = max(abs(A[i, j] - v) / max(abs(v), 1.0) for (i, j), v in ref.items())
    table.ratio("area_matrix vs per-pair Python loop", t_loop, t_area, 50.0, lower_is_better=False,
                note=f"loop timed on {len(sample)} of {len(pairs)} pairs and scaled; "
                     f"max rel. diff {agree:.1e} (the loop's own rounding)")
    X = None  # free the 512 MB before the next benchmark

    # ---------------------------------------------------------------- rolling windows
    T, n, step = (200_000 if quick else 1_000_000), 8, 100
    Y = rng.standard_normal((T, n)).cumsum(axis=0)
    t_short, t_long = interleaved_best([lambda: wp.rolling_area_matrix(Y, 500, step),
                                        lambda: wp.rolling_area_matrix(Y, 10_000, step)],
                                       repeat=3 if quick else 5)
    table.ratio(f"rolling window 10000 vs 500 (T={T:.0e}, n={n}, step={step})", t_long, t_short,
                1.5, note=f"{t_long * 1e3:.0f} ms vs {t_short * 1e3:.0f} ms")
    Y = None

    # ---------------------------------------------------------------- streaming memory
    total, n, chunk = (2_000_000 if quick else 10_000_000), 16, 100_000

    def stream():
        r = np.random.default_rng(1)
        acc = wp.AreaAccumulator(n)
        last = np.zeros(n)
        for _ in range(total // chunk):
            block = r.standard_normal((chunk, n))
            np.cumsum(block, axis=0, out=block)
            block += last
            last = block[-1].copy()
            acc.update(block)
        return acc

    t0 = time.perf_counter()
    peak = peak_memory(stream)
    elapsed = time.perf_counter() - t0
    table.value(f"AreaAccumulator peak memory ({total:.0e} x {n}, chunks of {chunk})",
                peak / 2 ** 20, 100.0, unit=" MB",
                note=f"whole array would be {total * n * 8 / 2 ** 20:.0f} MB; {elapsed:.1f} s "
                     "incl. generating the data")
    # ---------------------------------------------------------------- cyclic order, many channels
    n = 1000 if quick else 2000
    T = 3000
    tt = np.arange(T) * 2 * np.pi / 50
    Xc = np.sin(tt[:, None] - rng.uniform(0, 2 * np.pi, n)) + rng.standard_normal((T, n))
    A_cycle = np.asarray(wp.area_matrix(Xc))
    Xc = None
    G = np.triu(rng.standard_normal((n, n)), 1)
    A_noise = G - G.T
    G = None
    for label, A, target in (("one cycle in noise", A_cycle, 0.25),
                             ("patternless skew matrix", A_noise, 0.5)):
        t_eigh, t_co = interleaved_best([lambda: np.linalg.eigh(1j * A),
                                         lambda: wp.cyclic_order(A)], repeat=1 if quick else 2)
        w, V = np.linalg.eigh(1j * A)
        fit_ref = w[0] ** 2 / (np.sum(A * A) / 2)
        co = wp.cyclic_order(A)
        table.ratio(f"cyclic_order vs numpy.linalg.eigh(1j*A) (n={n}, {label})", t_co, t_eigh,
                    target, note=f"{t_co:.2f} s vs {t_eigh:.2f} s; fit {co.fit:.4f} "
                                 f"(full solver {fit_ref:.4f})")
    A_cycle = A_noise = None
    peak = peak_memory(lambda: wp.noise_fit_baseline(1500))
    table.value("noise_fit_baseline(1500) peak memory", peak / 2 ** 20, 1.0, unit=" MB",
                note="was (200, 1500, 1500) complex, 3.35 GiB")
    ok = table.print()
    return ok


if __name__ == "__main__":
    sys.exit(0 if main(quick="--quick" in sys.argv) else 1)
