"""Benchmark of the planar layer (a script, not a test): ratios against baselines run here.

Rows:

* ``decompose`` of a 10,000-vertex noisy loop that circles about ten times
  (hundreds of thousands of faces) against shapely's ``node`` + ``polygonize``
  alone on the same closed linework (the two geometry steps ``decompose``
  builds on; target at most 1.5x);
* ``winding_number`` for 10^6 query points against a 10^4-vertex loop, and
  the same with both sizes doubled (target: time ratio under 2.6, i.e. cost
  growing like (vertices + queries) x log, not vertices x queries).  The
  loop is one fixed curve (ten turns with a wobble and fine ripples) sampled
  at 10^4 or 2x10^4 points;
* information only: the same doubling for a loop of white noise around ten
  turns, whose segments nearly cross each other everywhere (the number of
  query/segment near-pairs then grows faster than vertices + queries), and
  the peak traced memory of the 10^6-query call;
* ``region_integral`` of a callable over a 10^4-vertex loop (adaptive Green
  cells) against evaluating the same callable on as many points as the
  integral used (target: within 5x, as for line integrals in
  bench_calculus.py), with the evaluations per vertex for information.

* the size estimate of issue 13: ``count_crossings`` on the same noisy loop
  against the two geometry steps (target at most 0.1x: counting first costs
  little), on a smooth 10^6-sample loop (three turns, few crossings: the case
  where counting weighs most) against the whole decompose of it (target at
  most 0.25x), and the time ``decompose`` takes to refuse
  3,000 uniform-noise points and a 2,001-point star polygon (target at most
  5 s each; before the estimate they ran 58 s with 3.4 GB, and past 200 s).

Run:  .venv/bin/python benchmarks/bench_planar.py  [--quick]
"""

from __future__ import annotations

import sys
from pathlib import Path

import numpy as np
import shapely

sys.path.insert(0, str(Path(__file__).resolve().parent))
from _harness import Table, best_time, interleaved_best, peak_memory  # noqa: E402

import wedgepath as wp  # noqa: E402
from wedgepath.planar.arrangement import count_crossings  # noqa: E402



def noisy_loop(n, turns=10, noise=0.07, seed=1):
    """Invented demo data: a unit circle traversed ``turns`` times plus white noise."""
    rng = np.random.default_rng(seed)
    t = np.linspace(0, 2 * np.pi * turns, n, endpoint=False)
    return np.column_stack([np.cos(t), np.sin(t)]) + noise * rng.standard_normal((n, 2))


def rippled_loop(n, turns=10):
    """Invented demo data: one fixed curve (wobble and ripples), sampled at n points."""
    t = np.linspace(0, 2 * np.pi * turns, n, endpoint=False)
    r = 1 + 0.3 * np.sin(0.7 * t) + 0.02 * np.sin(37.3 * t) + 0.01 * np.cos(101.9 * t)
    return np.column_stack([r * np.cos(t), r * np.sin(t)])


def star(n):
    """A star polygon {n/((n-1)/2)}: nearly every edge crosses every other."""
    k = np.arange(n)
    ang = 2 * np.pi * (k * ((n - 1) // 2) % n) / n
    return np.c_[np.cos(ang), np.sin(ang)]


def baseline_faces(pts):
    """shapely alone: node the closed linework and polygonize it into faces."""
    line = shapely.linestrings(np.vstack([pts, pts[:1]]))
    return shapely.get_parts(shapely.polygonize([shapely.node(line)]))


def main(quick=False):
    rng = np.random.default_rng(0)
    table = Table("wedgepath.planar")

    # ---------------------------------------------------------------- decompose
    n = 2_000 if quick else 10_000
    pts = noisy_loop(n)
    d = wp.decompose(pts, progress=False)
    t_base, t_dec = interleaved_best([lambda: baseline_faces(pts),
                                      lambda: wp.decompose(pts, progress=False)],
                                     repeat=2 if quick else 3)
    table.ratio(f"decompose vs shapely node+polygonize ({n} vertices)", t_dec, t_base, 1.5,
                note=f"{t_dec:.2f} s vs {t_base:.2f} s, {d.n_faces} faces")
    table.info("  decompose check", f"sum w*area - shoelace = {d.residual:.2g}; "
               f"{d.diagnostics['inconsistent_adjacencies']} inconsistent adjacencies")

    # ---------------------------------------------------------------- size estimate (issue 13)
    closed = [np.vstack([pts, pts[:1]])]
    t_count = best_time(lambda: count_crossings(closed), repeat=2 if quick else 3)
    table.ratio(f"  count_crossings vs shapely node+polygonize ({n} vertices)", t_count, t_base,
                0.1, note=f"{t_count:.2f} s, {count_crossings(closed).crossings} crossings")
    m = 200_000 if quick else 1_000_000
    s_ = np.linspace(0, 2 * np.pi * 3, m + 1)
    smooth = [np.c_[np.cos(s_) * (1 + 0.2 * np.cos(s_ / 3)), np.sin(s_)]]
    t_full = best_time(lambda: wp.decompose(smooth[0], progress=False), repeat=2)
    t_smooth = best_time(lambda: count_crossings(smooth), repeat=3)
    table.ratio(f"  count_crossings of a smooth {m}-sample loop vs decompose of it",
                t_smooth, t_full, 0.25, note=f"{t_smooth:.2f} s vs {t_full:.2f} s")
    for name, curve, old in (("3,000 uniform-noise points", rng.uniform(0, 1, (3000, 2)),
                              "58 s and 3.4 GB before"),
                             ("a 2,001-point star polygon", star(2001), "past 200 s before")):
        def refused(curve=curve):
            try:
                wp.decompose(curve, progress=False)
            except ValueError:
                return
            raise AssertionError("not refused")
        t_ref = best_time(refused, repeat=2)
        table.value(f"  decompose refuses {name} (about 1e6 or more crossings)", t_ref, 5.0,
                    unit=" s", note=old)

    # ---------------------------------------------------------------- winding_number
    v, q = (2_000, 200_000) if quick else (10_000, 1_000_000)
    loops = {k: rippled_loop(k * v) for k in (1, 2)}
    queries = {k: rng.uniform(-1.45, 1.45, size=(k * q, 2)) for k in (1, 2)}
    t1, t2 = interleaved_best([lambda: wp.winding_number(loops[1], queries[1]),
                               lambda: wp.winding_number(loops[2], queries[2])],
                              repeat=2 if quick else 4)
    table.ratio(f"winding_number, sizes doubled ({v} x {q:.0e} -> x2)", t2, t1, 2.6,
                note=f"{t2:.2f} s vs {t1:.2f} s")

    mem = peak_memory(lambda: wp.winding_number(loops[1], queries[1]))
    table.info(f"  winding_number peak memory ({q:.0e} queries)", f"{mem / 2**20:.0f} MB")

    noisy = {k: noisy_loop(k * v, noise=0.07, seed=k) for k in (1, 2)}
    s1, s2 = interleaved_best([lambda: wp.winding_number(noisy[1], queries[1]),
                               lambda: wp.winding_number(noisy[2], queries[2])],
                              repeat=1 if quick else 2)
    table.info("  same, white-noise loop (info)",
               f"ratio {s2 / s1:.2f} ({s2:.2f} s vs {s1:.2f} s)")

    # ---------------------------------------------------------------- region_integral
    nv = 2_000 if quick else 10_000
    t = np.linspace(0, 2 * np.pi, nv, endpoint=False)
    rad = 1 + 0.3 * np.sin(3 * t) + 0.02 * np.sin(37.3 * t)
    loop = np.column_stack([rad * np.cos(t), rad * np.sin(t)])

    def field(x, y):  # invented demo field
        return np.exp(-(x * x + y * y)) * np.cos(3 * x)
    res = wp.region_integral(field, loop)
    n_pts = res.evaluations
    chunk = 1 << 18
    pts = rng.normal(size=(chunk, 2))

    def field_alone():
        done = 0
        while done < n_pts:
            m = min(chunk, n_pts - done)
            field(pts[:m, 0], pts[:m, 1])
            done += m
    t_int, t_alone = interleaved_best([lambda: wp.region_integral(field, loop), field_alone],
                                      repeat=2 if quick else 3)
    table.ratio(f"region_integral of a callable ({nv} vertices) / the callable on same points",
                t_int, t_alone, 5.0,
                note=f"{n_pts / nv:.0f} evaluations per vertex, error {res.error:.1e}")

    ok = table.print()
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main(quick="--quick" in sys.argv[1:]))
