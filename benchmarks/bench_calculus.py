"""Benchmarks of the calculus layer (line integrals), each against its baseline in the same run.

Run: ``python benchmarks/bench_calculus.py`` (or ``make bench``).

* Constant 1-form over a 10^6 x 8 path vs one plain numpy pass
  (``np.diff`` + dot).  Target: within 3x.
* Adaptive Gauss-Legendre quadrature of a callable 1-form over 10^6 segments
  vs evaluating the same callables once on the same number of points as the
  quadrature uses.  Target: within 5x.  (The ratio against one evaluation per
  segment is printed for information.)
* Peak extra memory of both integrals.  Target: under 300 MB.
"""

from __future__ import annotations

import sys
from pathlib import Path as _P

import numpy as np

sys.path.insert(0, str(_P(__file__).resolve().parent))
from _harness import Table, best_time, peak_memory  # noqa: E402

import wedgepath as wp  # noqa: E402


def main(quick: bool = False) -> bool:
    T, n = (10**5, 8) if quick else (10**6, 8)
    rng = np.random.default_rng(0)
    X = rng.normal(size=(T, n)).cumsum(axis=0) * 0.01
    table = Table(f"calculus: line integrals (T={T:,}, n={n})")

    # 1. constant 1-form vs np.diff + dot
    c = rng.normal(size=n)
    form = sum((float(c[i]) * wp.dx(i) for i in range(1, n)), float(c[0]) * wp.dx(0))
    path = wp.Path(X)
    base = best_time(lambda: np.diff(X, axis=0).sum(axis=0) @ c)
    ours = best_time(lambda: wp.integrate(form, path))
    ours_build = best_time(lambda: wp.integrate(form, wp.Path(X)))
    ref = np.diff(X, axis=0).sum(axis=0) @ c
    got = float(wp.integrate(form, path))
    assert abs(got - ref) <= 1e-9 * (1 + abs(ref)), (got, ref)
    table.ratio("constant 1-form / (np.diff + dot)", ours, base, 3.0)
    table.ratio("  same, Path built from the array inside", ours_build, base, 3.0,
                note="includes the float64 copy and finiteness check")

    # 2. callable 1-form by adaptive Gauss-Legendre vs the callables alone
    def f0(cc):
        return np.sin(cc[:, 0]) * cc[:, 1]

    def f1(cc):
        return np.cos(cc[:, 1]) + cc[:, 0] ** 2

    Y = X[:, :2].copy()
    pth2 = wp.Path(Y)
    w = wp.OneForm([f0, f1])
    r = wp.integrate(w, pth2)
    n_pts = r.evaluations // 2  # each component evaluated at every point
    pts = rng.normal(size=(n_pts, 2))
    per_seg = rng.normal(size=(T - 1, 2))
    t_quad = best_time(lambda: wp.integrate(w, pth2), repeat=3)
    t_eval = best_time(lambda: (f0(pts), f1(pts)), repeat=3)
    t_once = best_time(lambda: (f0(per_seg), f1(per_seg)), repeat=3)
    table.ratio("callable 1-form quadrature / callables on same points", t_quad, t_eval, 5.0,
                note=f"{n_pts / (T - 1):.1f} points per segment, error {r.error:.1e}")
    table.info("  ratio to one evaluation per segment", f"{t_quad / t_once:.1f}x (information)")

    # 3. peak extra memory
    mem_const = peak_memory(lambda: wp.integrate(form, path)) / 2**20
    mem_quad = peak_memory(lambda: wp.integrate(w, wp.Path(X).plane(0, 1))) / 2**20
    table.value("peak extra memory, constant 1-form", mem_const, 300, unit=" MB")
    table.value("peak extra memory, callable quadrature (incl. Path copy)", mem_quad, 300, unit=" MB",
                note=f"input array itself {X.nbytes / 2**20:.0f} MB")
    return table.print()


if __name__ == "__main__":
    ok = main(quick="--quick" in sys.argv)
    sys.exit(0 if ok else 1)
