"""Seeded statistical battery: adaptive error estimates against independent references.

The cases and their references live in ``tests/data/quadrature_battery.json``, written by
``tests/data/make_quadrature_battery.py`` (mpmath at 24 digits per segment for line
integrals; Green's theorem with closed-form x-primitives and mpmath for region integrals;
see that script's docstring for the families and how each reference is checked).

For every case the estimate must hold, ``|value - reference| <= error + rounding`` (plus
the reference's own uncertainty, stored with it, and two units in the last place of the
stored float), in at least 99.5% of the cases of each kind, and every case where it does not hold must have
issued an IntegrationWarning.  Run this file as a script to print the figures reported in
docs/integration.md:

    .venv/bin/python tests/test_quadrature_battery.py
"""

from __future__ import annotations

import importlib.util
import json
import sys
import warnings
from pathlib import Path

import numpy as np
import pytest

import wedgepath as wp

HERE = Path(__file__).resolve().parent
DATA = HERE / "data" / "quadrature_battery.json"
_spec = importlib.util.spec_from_file_location("make_quadrature_battery",
                                               HERE / "data" / "make_quadrature_battery.py")
gen = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(gen)

EPS = np.finfo(np.float64).eps
MIN_SHARE = 0.995


def _coef(spec):
    if spec is None:
        return 0.0
    fam, p = spec
    return lambda c: gen.f_numpy(fam, p, c[:, 0], c[:, 1])


def _run(fn):
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        r = fn()
    warned = any(issubclass(w.category, wp.IntegrationWarning) for w in caught)
    return r, warned


def run_case(case, kind):
    pts = np.array(case["points"])
    rtol = case["rtol"]
    if kind == "line":
        w = wp.OneForm([_coef(case["dx"]), _coef(case["dy"])])
        return _run(lambda: wp.integrate(w, pts, rtol=rtol))
    fam, p = case["f"]
    if kind == "region":
        return _run(lambda: wp.region_integral(lambda x, y: gen.f_numpy(fam, p, x, y), pts,
                                               rtol=rtol))
    # the cone over the loop: a 2-chain of triangles whose boundary is the closed loop, so
    # the integral of f dx0^dx1 over it is the same winding-weighted region integral
    form = wp.TwoForm({(0, 1): lambda c: gen.f_numpy(fam, p, c[:, 0], c[:, 1])})
    return _run(lambda: wp.integrate(form, wp.cone(pts), rtol=rtol))


def figures(kind, cases):
    """Run the cases of one kind; return the summary and the offending cases.

    A case is *informative* when the reference's own uncertainty is below a tenth of the
    engine's ``error + rounding``, so that the check really tests the estimate; the worst
    and median ratios ``|actual| / (error + rounding)`` are over those cases.
    """
    rows = []
    for i, case in enumerate(cases):
        r, warned = run_case(case, kind)
        ref = case["reference"]
        actual = abs(float(r) - ref)
        own = r.error + r.rounding
        allowed = own + case["uncertainty"] + 2 * EPS * abs(ref)
        informative = case["uncertainty"] + 2 * EPS * abs(ref) < 0.1 * own
        rows.append((i, actual, own, allowed, warned, r.evaluations, informative))
    within = [row for row in rows if row[1] <= row[3]]
    outside = [row for row in rows if row[1] > row[3]]
    ratios = [row[1] / row[2] for row in rows if row[6] and row[2] > 0]
    return {
        "kind": kind, "cases": len(rows), "within": len(within),
        "share": len(within) / len(rows), "warned": sum(row[4] for row in rows),
        "outside_unwarned": [row[0] for row in outside if not row[4]],
        "informative": sum(row[6] for row in rows),
        "worst_ratio": max(ratios) if ratios else 0.0,
        "median_ratio": float(np.median(ratios)) if ratios else 0.0,
        "evaluations": int(np.median([row[5] for row in rows])),
    }


def _cases(kind):
    data = json.loads(DATA.read_text(encoding="utf-8"))
    src = "line" if kind == "line" else "region"
    return [c for c in data["cases"] if c["kind"] == src]


@pytest.mark.slow
@pytest.mark.parametrize("kind", ["line", "region", "cone"])
def test_error_estimates_hold(kind):
    cases = _cases(kind)
    if kind == "cone":
        cases = cases[::3]          # the same loops and integrands as "region", fewer of them
    assert len(cases) >= (100 if kind == "cone" else 300)
    fig = figures(kind, cases)
    assert fig["share"] >= MIN_SHARE, fig
    assert not fig["outside_unwarned"], fig


def test_battery_families_are_all_present():
    # every family of the generator appears among the line and the region cases
    for kind in ("line", "region"):
        fams = {c["family"] for c in _cases(kind)}
        assert fams == set(gen.FAMILIES), (kind, fams)


def test_estimates_are_not_vacuous():
    # a line integral without warning meets its tolerance: the reported error is at most
    # rtol times the integral of |integrand| (the reference's scale, with a margin for the
    # difference between that rough scale and the engine's own), so the battery cannot pass
    # by reporting huge errors
    for case in _cases("line")[:60]:
        r, warned = run_case(case, "line")
        if not warned:
            assert r.error <= 2 * case["rtol"] * case["scale"] + 1e-15, (case, r.error)


if __name__ == "__main__":
    print("| kind | cases | within the estimate | warned | outside and unwarned | informative "
          "| worst \\|actual\\| / estimate | median | median evaluations |")
    print("| --- | --- | --- | --- | --- | --- | --- | --- | --- |")
    for kind in ("line", "region", "cone"):
        cs = _cases(kind)
        cs = cs[::3] if kind == "cone" else cs
        f = figures(kind, cs)
        print(f"| {kind} | {f['cases']} | {f['within']} ({100 * f['share']:.1f}%) | {f['warned']} "
              f"| {len(f['outside_unwarned'])} | {f['informative']} | {f['worst_ratio']:.2g} "
              f"| {f['median_ratio']:.2g} | {f['evaluations']} |", file=sys.stdout)
