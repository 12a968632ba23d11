"""Benchmark of --weight formulas (a script, not a test): the work model against the clock.

The command line bounds the work of a ``--weight`` region integral before it runs
(``report.WEIGHT_WORK_LIMIT`` units; a unit is meant to be about a nanosecond of numpy
on one core).  This script checks that model on the machine it runs on:

* for each formula, the region integral over a circle (200 samples for the
  formulas that once ran away, up to 200,000 for everyday ones, so that each
  row does enough work to be timed) with the levels the command line allows:
  evaluation points (counted), predicted units (points x
  (``formula.POINT_OVERHEAD`` + ``formula.evaluation_cost``, plus
  ``report.ADAPTIVE_OVERHEAD`` for adaptive integration)) and the measured time;
  the row is the measured nanoseconds per predicted unit, after the part that
  does not depend on the formula (the per-segment time of the weight ``x``,
  measured in the same run, which grows with the data only) (target: at most
  3, i.e. the model underestimates the formula's time by at most 3x, so the
  limit of 1e9 units means at most about 3 s of it);
* preparing the formulas that once ran for minutes (issue 13: ``((x+y+1)**64)**4``
  46 s, a product of four powers killed at 300 s): parse and build the
  coefficient (degree found without expanding), as a ratio to preparing
  ``x*y`` in the same run (target at most 50x).

Run:  .venv/bin/python benchmarks/bench_formulas.py
"""

from __future__ import annotations

import sys
import time
import warnings
from pathlib import Path

import numpy as np
import sympy as sp

sys.path.insert(0, str(Path(__file__).resolve().parent))
from _harness import Table, best_time, machine_line  # noqa: E402

import wedgepath as wp  # noqa: E402
from wedgepath import report  # noqa: E402
from wedgepath.calculus.forms import Coefficient  # noqa: E402
from wedgepath.formula import POINT_OVERHEAD, evaluation_cost, parse_formula  # noqa: E402

#: (formula, samples of the circle): the old runaways on a small loop, everyday formulas
#: on a long one, so that every row does enough work to be timed
CASES = [("((x+y+1)**64)**4", 200),
         ("(x+y+1)**64*(x-y+2)**64*(x+2*y+3)**64*(2*x+y+1)**64", 200),
         ("sqrt(abs(x*y))", 200), ("sin(x*10**64)", 200), ("abs(x)", 20_000),
         ("x*y", 200_000), ("x**2*y + 3*y", 200_000), ("exp(x)*cos(y)", 100_000),
         ("log(2+x)*atan(y)", 100_000), ("+".join(f"sin(x*y+{k})" for k in range(60)), 10_000)]


def main():
    x, y = sp.symbols("x y", real=True)
    table = Table("--weight work model (circles of 200 to 200,000 samples)")
    ok = True
    # the part of the time that does not depend on the formula (segment geometry, one
    # Gauss point per segment): the weight "x" over 200,000 segments, measured here
    s = np.linspace(0, 2 * np.pi, 200_001)
    xy = np.c_[np.cos(s), np.sin(s)]
    base = best_time(lambda: wp.region_integral(x + 0 * y, xy, symbols=(x, y)), repeat=3)
    per_segment = base / 200_001
    table.info("per-segment time (weight x, n=200000)", f"{per_segment * 1e9:.0f} ns")
    for text, n in CASES:
        s = np.linspace(0, 2 * np.pi, n + 1)
        xy = np.c_[np.cos(s), np.sin(s)]
        expr = parse_formula(text, {"x": x, "y": y})
        levels = report.weight_levels(expr, (x, y), n + 1)
        points = [0]
        real = Coefficient.evaluate

        def counting(coef, coords, label="coefficient", **kw):
            points[0] += coords.shape[0]
            return real(coef, coords, label, **kw)

        def integral():
            with warnings.catch_warnings():
                warnings.simplefilter("ignore")
                return wp.region_integral(expr, xy, symbols=(x, y), max_levels=levels)
        Coefficient.evaluate = counting
        try:
            integral()
        finally:
            Coefficient.evaluate = real
        adaptive = Coefficient.from_sympy(expr, (x, y)).poly_degree is None
        units = points[0] * (POINT_OVERHEAD + evaluation_cost(expr)
                             + (report.ADAPTIVE_OVERHEAD if adaptive else 0))
        t = best_time(integral, repeat=3)
        formula_part = max(t - (n + 1) * per_segment, 0.0)
        ok &= table.value(f"{text[:40]}, n={n} ({points[0]:.3g} pts, {units:.3g} units, "
                          f"{t:.2f} s)", formula_part * 1e9 / units, 3.0, unit=" ns/unit")

    def prepare(text):
        expr = parse_formula(text, {"x": x, "y": y})
        return Coefficient.from_sympy(expr, (x, y))
    base = best_time(lambda: prepare("x*y"), repeat=5)
    for text, _ in CASES[:2]:
        t0 = time.perf_counter()
        prepare(text)
        first = time.perf_counter() - t0
        ok &= table.ratio(f"prepare {text[:40]} ({first * 1e3:.1f} ms)", first, base, 50.0)
    print(machine_line())
    table.print()
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
