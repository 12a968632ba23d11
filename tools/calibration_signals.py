"""Calibration tables of the significance tools (the figures quoted in docs/signals.md).

Run:  .venv/bin/python tools/calibration_signals.py [coverage|size|power] [reps]

Models and the exact expected areas are defined (and derived) in
tests/test_signals_calibration.py, which runs smaller, seeded versions.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "tests"))
import test_signals_calibration as cal  # noqa: E402

import wedgepath as wp  # noqa: E402


def coverage_table(reps):
    cells = [("sine + AR(1) 0.6, sd 0.7", cal.sine_ar_model, dict(ar=0.6, sigma=0.7)),
             ("sine + AR(1) 0.9, sd 0.3", cal.sine_ar_model, dict(ar=0.9, sigma=0.3)),
             ("VAR(1), eigenvalues 0.92 exp(+-0.29i)", cal.var_model, {}),
             ("VAR(1), eigenvalues 0.94 exp(+-0.29i)", cal.var_model,
              dict(Phi=np.array([[0.95, -0.27], [0.27, 0.86]])))]
    print(f"nominal 95 % intervals, {reps} repetitions per cell, n_boot = 499")
    print("| model | T | coverage | binomial s.e. |")
    print("| --- | --- | --- | --- |")
    for name, model, kw in cells:
        for T in (520, 2000):
            t0 = time.time()
            c = cal.coverage(model, T, reps, seed=T, **kw)
            se = np.sqrt(c * (1 - c) / reps)
            print(f"| {name} | {T} | {c:.3f} | {se:.3f} |  ({time.time() - t0:.0f} s)", flush=True)


def size_table(reps):
    print(f"rejection rate at p <= 0.05 (199 surrogates), {3 * reps} independent tests per cell")
    for method in ("shift", "phase"):
        for kind in ("ar0.9", "ma8"):
            rng = np.random.default_rng(100)
            rej = 0
            for _ in range(reps):
                res = wp.surrogate_test(cal.null_channels(rng, kind), method=method,
                                        n_surrogates=199, seed=rng, progress=False)
                rej += sum(res.pvalues[i, i + 1] <= 0.05 for i in (0, 2, 4))
            rate = rej / (3 * reps)
            print(f"| {method} | {kind} | {rate:.4f} | {np.sqrt(0.0475 / (3 * reps)):.4f} |",
                  flush=True)


def power_table(reps):
    print(f"share of the 3 true pairs found (BH 5 % over 15 pairs), {reps} data sets")
    for method in ("shift", "phase"):
        rng = np.random.default_rng(7)
        found = 0
        for _ in range(reps):
            res = wp.surrogate_test(cal.six_channels(rng), method=method, n_surrogates=199,
                                    seed=rng, progress=False)
            sig = res.significant(0.05)
            found += sum(bool(sig[i, j]) for i, j in cal.TRUE_PAIRS)
        print(f"| {method} | {found / (3 * reps):.3f} |", flush=True)


if __name__ == "__main__":
    what = sys.argv[1] if len(sys.argv) > 1 else "coverage"
    reps = int(sys.argv[2]) if len(sys.argv) > 2 else 1000
    {"coverage": coverage_table, "size": size_table, "power": power_table}[what](reps)
