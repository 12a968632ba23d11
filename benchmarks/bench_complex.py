"""Benchmarks of surfaces and complexes, each against its baseline in the same run.

Run: ``python benchmarks/bench_complex.py`` (``--quick`` for a smaller run).

* A callable 2-form integrated over the cone of a 10^5-sample path in R^8
  (adaptive Grundmann-Möller 7/9 with longest-edge bisection) vs evaluating the
  same callables once on the same number of points as the quadrature used.
  Target: within 3x.
* Building the 2-dimensional complex of the cone of a 10^6-sample path in R^3
  (cone, faces, the sparse boundary matrices ∂_1 and ∂_2), and the same for
  2 x 10^6 samples, measured alternately (best of 5 each) so both sizes see the
  same load.  Target: linear growth, i.e. doubling the samples costs at most
  2.3x the time.  (The 1-dimensional complex of the path itself is shown
  for information.)
"""

from __future__ import annotations

import sys
from pathlib import Path as _P

import numpy as np

sys.path.insert(0, str(_P(__file__).resolve().parent))
from _harness import Table, best_time  # noqa: E402
import gc  # noqa: E402
import time  # noqa: E402

import wedgepath as wp  # noqa: E402

CHUNK = 1 << 18  # rows per callable call, as inside the library


def paired_best(fa, fb, repeat=5):
    """Best times of two calls measured alternately, so that both see the same load drift."""
    ta = tb = float("inf")
    for _ in range(repeat):
        for fn, which in ((fa, "a"), (fb, "b")):
            gc.collect()
            t0 = time.perf_counter()
            fn()
            dt = time.perf_counter() - t0
            if which == "a":
                ta = min(ta, dt)
            else:
                tb = min(tb, dt)
    return ta, tb


def gait_like(T, n, rng):
    """An invented smooth loop in R^n: phase-shifted harmonics plus a little noise."""
    t = np.linspace(0.0, 2 * np.pi, T, endpoint=False)
    phases = rng.uniform(0, 2 * np.pi, n)
    X = np.sin(t[:, None] + phases) + 0.3 * np.sin(2 * t[:, None] - phases)
    return X + 0.01 * rng.normal(size=(T, n))


def main(quick: bool = False) -> bool:
    rng = np.random.default_rng(0)
    T, n = (2 * 10**4, 8) if quick else (10**5, 8)
    N = 2 * 10**5 if quick else 10**6
    table = Table(f"surfaces and complexes (cone of T={T:,} in R^{n}; complex of N={N:,})")

    # 1. callable 2-form over a cone vs the callables alone
    def curvature(c):  # a "curvature field" over the shape space
        return np.sin(c[:, 0]) * np.cos(c[:, 1]) + c[:, 2] * c[:, 3]

    def weight(c):
        return np.exp(-0.5 * (c[:, 4] ** 2 + c[:, 5] ** 2))

    X = gait_like(T, n, rng)
    S = wp.cone(X)
    w = wp.TwoForm({(0, 1): curvature, (2, 5): weight}, dim=n)
    r = wp.integrate(w, S)
    n_pts = r.evaluations // 2  # each callable at every point
    # the baseline evaluates the callables on the library's own quadrature points: the first
    # CHUNK of them, recorded here, cycled until as many points as the integral used (all
    # of them would need n_pts x n doubles, 2 GB)
    seen = []

    def record(c):
        if sum(len(a) for a in seen) < CHUNK:
            seen.append(np.array(c[:CHUNK]))
        return curvature(c)
    wp.integrate(wp.TwoForm({(0, 1): record, (2, 5): weight}, dim=n), S)
    P = np.concatenate(seen)[:CHUNK]
    P = np.concatenate([P] * int(np.ceil(CHUNK / len(P))))[:CHUNK]

    def callables_alone():
        done = 0
        while done < n_pts:
            m = min(CHUNK, n_pts - done)
            curvature(P[:m])
            weight(P[:m])
            done += m

    t_int = best_time(lambda: wp.integrate(w, S), repeat=3)
    t_eval = best_time(callables_alone, repeat=3)
    table.ratio("callable 2-form over cone / callables on its quadrature points", t_int, t_eval,
                3.0,
                note=f"{n_pts / len(S):.0f} points per triangle, error {r.error:.1e}")
    t_cone = best_time(lambda: wp.cone(X), repeat=3)
    table.info("  building the cone itself", f"{t_cone * 1e3:.1f} ms (information)")

    # 2. complex + sparse boundary matrices, linear growth
    def build(Y):
        cx = wp.SimplicialComplex.from_chain(wp.cone(Y))
        cx.boundary_matrix(1)
        cx.boundary_matrix(2)
        return cx

    Y1 = rng.normal(size=(N, 3)).cumsum(axis=0)
    Y2 = rng.normal(size=(2 * N, 3)).cumsum(axis=0)
    t1, t2 = paired_best(lambda: build(Y1), lambda: build(Y2))
    cx = build(Y1)
    table.ratio(f"cone complex + ∂1, ∂2: time({2 * N:,}) / time({N:,})", t2, t1, 2.3,
                note=f"{t1:.2f} s for N, shape {cx.shape}")

    def build_path(Y):
        cx = wp.SimplicialComplex.from_path(Y)
        cx.boundary_matrix(1)
        cx.laplacian(metric="arclength")

    p1, p2 = paired_best(lambda: build_path(Y1), lambda: build_path(Y2))
    table.info("  path complex + ∂1 + Laplacian, doubling",
               f"{p2 / p1:.2f}x ({p1:.2f} s for N; information)")
    return table.print()


if __name__ == "__main__":
    ok = main(quick="--quick" in sys.argv)
    sys.exit(0 if ok else 1)
