"""Build the seeded battery of adaptive integrals and their independent references.

Run from the repository root (takes a few minutes; it rewrites only its own output file):

    .venv/bin/python tests/data/make_quadrature_battery.py

It writes ``tests/data/quadrature_battery.json``, read by
``tests/test_quadrature_battery.py``.  Every case is a random curve or loop, an integrand
drawn from one of the families below, a tolerance, and a reference value computed here,
independently of wedgepath's quadrature:

* line integrals of 1-forms ``f dx + g dy``: the pulled-back integrand on every segment
  integrated by ``mpmath.quad`` (tanh-sinh) at 24 or more significant digits, with break points at
  the integrand's features (closest approach to a bump, the zero of a front, ...);
* region integrals ``∬ w f dx dy`` of closed loops (self-crossing ones included): Green's
  theorem ``∮ F dy`` with ``F`` a closed-form x-primitive of ``f`` (each family below
  states it; checked here against ``mpmath.diff``), the boundary integral again by
  ``mpmath.quad`` per segment.  This is independent of wedgepath's engine, which integrates
  ``f`` itself numerically in two dimensions.  (Green's theorem: G. Green, An Essay on the
  Application of Mathematical Analysis to the Theories of Electricity and Magnetism, 1828;
  the same loop integral gives the winding-weighted region integral for self-crossing
  curves.)

Segments are taken exactly as the floats of the samples define them (their increments
computed in mpmath, not rounded).  Each reference is computed twice by mpmath's tanh-sinh
rule (on the break points, and on every piece halved) at 24 significant digits, or with as
many more digits (up to 100) as the value cancels below the scale of its boundary integral
(``digits`` in the data); a case is kept only when the two agree, and the data give the
reference's ``uncertainty`` (their difference plus the last digits of the scale).  The
families:

========  ====================================================  ==================================
family    f(x, y)                                               x-primitive F (∂F/∂x = f)
========  ====================================================  ==================================
bump      exp(-((x-a)^2 + (y-b)^2) / s^2), s narrower than a    s √π/2 erf((x-a)/s) exp(-(y-b)^2/s^2)
          segment (0.01 .. 0.15 on curves of diameter ~2.8)
front     atan(u), u = k((x-c) + m(y-d)), k up to 2000          (u atan u - ln(1+u^2)/2) / k
peak      1 / ((x-c)^2 + (y-d)^2 + e^2) (near-singular)         atan((x-c)/q) / q, q^2 = (y-d)^2+e^2
log       ln((x-c)^2 + (y-d)^2 + e^2) (near-singular)           (x-c) ln(r2) - 2(x-c) + 2q atan((x-c)/q)
wave      sin(αx + βy + φ), |(α, β)| up to 60 (oscillatory)     -cos(αx + βy + φ) / α
rational  1 / (1 + a x^2 + b y^2), a, b up to 300               atan(x √(a/p)) / √(a p), p = 1+b y^2
sqrt      √(c + x^2 + y^2), c down to 1e-3                      x r/2 + (c+y^2)/2 asinh(x/√(c+y^2))
smooth    exp(a x + b y)                                        exp(a x + b y) / a
========  ====================================================  ==================================

(The primitives are standard antiderivatives, common practice, no source; each is checked
numerically against ``mpmath.diff`` before it is used.)
"""

from __future__ import annotations

import json
import math
import sys
from pathlib import Path

import mpmath as mp
import numpy as np

OUT = Path(__file__).resolve().with_name("quadrature_battery.json")
SEED = 20261204
N_LINE = 360
N_REGION = 360
RTOLS = (1e-6, 1e-8, 1e-10)
FAMILIES = ("bump", "front", "peak", "log", "wave", "rational", "sqrt", "smooth")
DPS = 24
#: more digits than this are not spent on values that cancel far below their scale: the
#: reference's uncertainty (stored with it) then says how little it pins down
MAX_DPS = 100


# --------------------------------------------------------------------------- families
def f_numpy(fam, p, x, y):
    """The integrand with numpy (what wedgepath is given)."""
    if fam == "bump":
        return np.exp(-((x - p["a"]) ** 2 + (y - p["b"]) ** 2) / p["s"] ** 2)
    if fam == "front":
        return np.arctan(p["k"] * ((x - p["c"]) + p["m"] * (y - p["d"])))
    if fam == "peak":
        return 1.0 / ((x - p["c"]) ** 2 + (y - p["d"]) ** 2 + p["e"] ** 2)
    if fam == "log":
        return np.log((x - p["c"]) ** 2 + (y - p["d"]) ** 2 + p["e"] ** 2)
    if fam == "wave":
        return np.sin(p["alpha"] * x + p["beta"] * y + p["phi"])
    if fam == "rational":
        return 1.0 / (1.0 + p["a"] * x ** 2 + p["b"] * y ** 2)
    if fam == "sqrt":
        return np.sqrt(p["c"] + x ** 2 + y ** 2)
    if fam == "smooth":
        return np.exp(p["a"] * x + p["b"] * y)
    raise ValueError(fam)


def f_mp(fam, p, x, y):
    """The same integrand in mpmath (the reference side)."""
    P = {k: mp.mpf(v) for k, v in p.items()}
    if fam == "bump":
        return mp.exp(-((x - P["a"]) ** 2 + (y - P["b"]) ** 2) / P["s"] ** 2)
    if fam == "front":
        return mp.atan(P["k"] * ((x - P["c"]) + P["m"] * (y - P["d"])))
    if fam == "peak":
        return 1 / ((x - P["c"]) ** 2 + (y - P["d"]) ** 2 + P["e"] ** 2)
    if fam == "log":
        return mp.log((x - P["c"]) ** 2 + (y - P["d"]) ** 2 + P["e"] ** 2)
    if fam == "wave":
        return mp.sin(P["alpha"] * x + P["beta"] * y + P["phi"])
    if fam == "rational":
        return 1 / (1 + P["a"] * x ** 2 + P["b"] * y ** 2)
    if fam == "sqrt":
        return mp.sqrt(P["c"] + x ** 2 + y ** 2)
    if fam == "smooth":
        return mp.exp(P["a"] * x + P["b"] * y)
    raise ValueError(fam)


def F_mp(fam, p, x, y):
    """A closed-form x-primitive of the integrand (module table), in mpmath."""
    P = {k: mp.mpf(v) for k, v in p.items()}
    if fam == "bump":
        s = P["s"]
        return s * mp.sqrt(mp.pi) / 2 * mp.erf((x - P["a"]) / s) * mp.exp(-(y - P["b"]) ** 2 / s ** 2)
    if fam == "front":
        u = P["k"] * ((x - P["c"]) + P["m"] * (y - P["d"]))
        return (u * mp.atan(u) - mp.log(1 + u * u) / 2) / P["k"]
    if fam == "peak":
        q = mp.sqrt((y - P["d"]) ** 2 + P["e"] ** 2)
        return mp.atan((x - P["c"]) / q) / q
    if fam == "log":
        q = mp.sqrt((y - P["d"]) ** 2 + P["e"] ** 2)
        t = x - P["c"]
        return t * mp.log(t * t + q * q) - 2 * t + 2 * q * mp.atan(t / q)
    if fam == "wave":
        return -mp.cos(P["alpha"] * x + P["beta"] * y + P["phi"]) / P["alpha"]
    if fam == "rational":
        pp = 1 + P["b"] * y * y
        return mp.atan(x * mp.sqrt(P["a"] / pp)) / mp.sqrt(P["a"] * pp)
    if fam == "sqrt":
        c = P["c"] + y * y
        return x * mp.sqrt(c + x * x) / 2 + c / 2 * mp.asinh(x / mp.sqrt(c))
    if fam == "smooth":
        return mp.exp(P["a"] * x + P["b"] * y) / P["a"]
    raise ValueError(fam)


def centre(fam, p):
    """The point where the family's feature sits (None for spread-out families)."""
    if fam == "bump":
        return (p["a"], p["b"])
    if fam in ("front", "peak", "log"):
        return (p["c"], p["d"])
    if fam in ("rational", "sqrt"):
        return (0.0, 0.0)
    return None


def draw_params(fam, rng, near):
    """Random parameters; ``near`` is a point the feature is placed close to."""
    lu = lambda lo, hi: float(math.exp(rng.uniform(math.log(lo), math.log(hi))))  # noqa: E731
    if fam == "bump":
        s = lu(0.01, 0.15)
        return {"a": near[0] + rng.uniform(-1, 1) * s, "b": near[1] + rng.uniform(-1, 1) * s,
                "s": s}
    if fam == "front":
        return {"k": lu(5, 2000), "m": rng.uniform(-1, 1), "c": near[0], "d": near[1]}
    if fam == "peak":
        e = lu(0.01, 0.2)
        return {"c": near[0] + rng.uniform(-1, 1) * e, "d": near[1] + rng.uniform(-1, 1) * e,
                "e": e}
    if fam == "log":
        e = lu(1e-3, 0.1)
        return {"c": near[0] + rng.uniform(-1, 1) * e, "d": near[1] + rng.uniform(-1, 1) * e,
                "e": e}
    if fam == "wave":
        r, th = lu(1, 60), rng.uniform(0, 2 * math.pi)
        alpha = r * math.cos(th)
        if abs(alpha) < 0.2 * r:
            alpha = math.copysign(0.2 * r, alpha if alpha else 1.0)
        return {"alpha": alpha, "beta": r * math.sin(th), "phi": rng.uniform(0, 2 * math.pi)}
    if fam == "rational":
        return {"a": lu(0.1, 300), "b": lu(0.1, 300)}
    if fam == "sqrt":
        return {"c": lu(1e-3, 1.0)}
    if fam == "smooth":
        return {"a": float(rng.choice([-1, 1])) * rng.uniform(0.3, 3), "b": rng.uniform(-3, 3)}
    raise ValueError(fam)


# --------------------------------------------------------------------------- curves
def random_curve(rng):
    """An open polyline, a closed random loop or a regular polygon in [-1, 1]^2."""
    kind = rng.choice(["open", "loop", "polygon"], p=[0.45, 0.35, 0.2])
    if kind == "open":
        return rng.uniform(-1, 1, size=(int(rng.integers(3, 10)), 2))
    if kind == "loop":
        pts = rng.uniform(-1, 1, size=(int(rng.integers(4, 12)), 2))
        return np.vstack([pts, pts[:1]])
    n = int(rng.integers(3, 41))
    t = np.linspace(0, 2 * np.pi, n + 1) + rng.uniform(0, 2 * np.pi)
    return np.column_stack([np.cos(t), np.sin(t)]) * rng.uniform(0.5, 1)


def random_loop(rng):
    """A closed loop: self-crossing random polygon, star-shaped polygon or a regular 40-gon."""
    kind = rng.choice(["crossing", "star", "ngon"], p=[0.45, 0.35, 0.2])
    if kind == "crossing":
        return rng.uniform(-1, 1, size=(int(rng.integers(4, 15)), 2))
    if kind == "star":
        n = int(rng.integers(5, 21))
        t = np.sort(rng.uniform(0, 2 * np.pi, n))
        r = rng.uniform(0.3, 1.0, n)
        return np.column_stack([r * np.cos(t), r * np.sin(t)])
    t = np.linspace(0, 2 * np.pi, 41)[:-1]
    return np.column_stack([np.cos(t) * rng.uniform(0.5, 1), np.sin(t) * rng.uniform(0.5, 1)])


def point_on(pts, rng):
    i = int(rng.integers(0, len(pts) - 1)) if len(pts) > 1 else 0
    a, b = pts[i], pts[(i + 1) % len(pts)]
    return a + rng.uniform(0, 1) * (b - a)


# --------------------------------------------------------------------------- references
def breakpoints(p0, d, fams):
    """Parameters in (0, 1) where a segment p0 + t d meets the integrands' features."""
    ts = set()
    L = math.hypot(*d)
    for fam, p in fams:
        c = centre(fam, p)
        if c is not None:
            if d[0] != 0:
                ts.add((c[0] - p0[0]) / d[0])
            if d[1] != 0:
                ts.add((c[1] - p0[1]) / d[1])
            if L > 0:
                ts.add(((c[0] - p0[0]) * d[0] + (c[1] - p0[1]) * d[1]) / (L * L))
        if fam == "front":
            g = d[0] + p["m"] * d[1]
            if g != 0:
                ts.add(-((p0[0] - p["c"]) + p["m"] * (p0[1] - p["d"])) / g)
        if fam == "wave":
            n = int(math.ceil(abs(p["alpha"] * d[0] + p["beta"] * d[1]) / math.pi)) + 1
            ts.update(j / n for j in range(1, n))
    pts = sorted(t for t in ts if 1e-9 < t < 1 - 1e-9)
    # split the stretches between features into halves as well (long tails of sharp peaks)
    out = [0.0]
    for t in pts + [1.0]:
        out.extend([(out[-1] + t) / 2, t])
    return [mp.mpf(t) for t in out]


def _abs_scale(g, n=64):
    """A rough integral of |g| over [0, 1] (midpoint rule): the scale of the agreement check."""
    return sum(abs(g(mp.mpf(j + 0.5) / n)) for j in range(n)) / n


def segment_integral(g, p0, d, fams):
    """∫_0^1 g(t) dt twice: on the break points, and again with every piece halved."""
    pts = breakpoints(p0, d, fams)
    finer = [pts[0]]
    for t in pts[1:]:
        finer.extend([(finer[-1] + t) / 2, t])
    a = mp.quad(g, pts, method="tanh-sinh", maxdegree=8)
    b = mp.quad(g, finer, method="tanh-sinh", maxdegree=8)
    return a, b


def _segment(p0, p1):
    """Start and increment of a segment in mpmath, exactly (the floats' own values)."""
    X0, Y0 = mp.mpf(float(p0[0])), mp.mpf(float(p0[1]))
    return X0, Y0, mp.mpf(float(p1[0])) - X0, mp.mpf(float(p1[1])) - Y0


def line_reference(pts, f1, f2):
    tot_a = tot_b = scale = mp.mpf(0)
    fams = [f for f in (f1, f2) if f is not None]
    for p0, p1 in zip(pts[:-1], pts[1:]):
        X0, Y0, DX, DY = _segment(p0, p1)

        def g(t):
            x, y = X0 + t * DX, Y0 + t * DY
            out = 0
            if f1 is not None:
                out += f_mp(*f1, x, y) * DX
            if f2 is not None:
                out += f_mp(*f2, x, y) * DY
            return out
        a, b = segment_integral(g, p0, p1 - p0, fams)
        tot_a += a
        tot_b += b
        scale += _abs_scale(g)
    return tot_a, tot_b, scale


def region_reference(loop, fam, p):
    P = np.vstack([loop, loop[:1]])
    tot_a = tot_b = scale = mp.mpf(0)
    for p0, p1 in zip(P[:-1], P[1:]):
        X0, Y0, DX, DY = _segment(p0, p1)
        if DY == 0:
            continue

        def g(t):
            return F_mp(fam, p, X0 + t * DX, Y0 + t * DY) * DY
        a, b = segment_integral(g, p0, p1 - p0, [(fam, p)])
        tot_a += a
        tot_b += b
        scale += _abs_scale(g)
    return tot_a, tot_b, scale


def reference(compute):
    """``compute()`` at DPS digits, and again with more when the value cancels far below
    its scale (so that the reference is accurate relative to the value itself).

    Returns (value, uncertainty, scale, digits) as floats and an int, or None when the two
    mpmath methods disagree.
    """
    digits = DPS
    while True:
        mp.mp.dps = digits
        a, b, scale = compute()
        need = DPS
        if a != 0 and scale > 0:
            # digits lost to cancellation beyond the four that DPS leaves to spare
            need = DPS + max(0, int(mp.ceil(mp.log10(scale / abs(a)))) - 4)
        if need <= digits or digits >= MAX_DPS:
            break
        digits = min(MAX_DPS, need + 2)
    unc = abs(a - b) + mp.mpf(10) ** (2 - digits) * scale
    mp.mp.dps = DPS
    if abs(a - b) > mp.mpf(10) ** (4 - digits) * (scale + abs(a)):
        return None
    return float(a), float(unc), float(scale), digits


def check_family(fam, p, rng):
    """numpy and mpmath integrands agree, and dF/dx = f, at random points."""
    for _ in range(3):
        x, y = rng.uniform(-1.2, 1.2, 2)
        fn = float(f_numpy(fam, p, np.array([x]), np.array([y]))[0])
        fm = f_mp(fam, p, mp.mpf(x), mp.mpf(y))
        assert abs(fn - float(fm)) <= 1e-12 * (1 + abs(fn)), (fam, p, fn, fm)
        dF = mp.diff(lambda t: F_mp(fam, p, t, mp.mpf(y)), mp.mpf(x))
        assert abs(dF - fm) <= mp.mpf(10) ** (-15) * (1 + abs(fm)), (fam, p, dF, fm)


# --------------------------------------------------------------------------- main
def main():
    mp.mp.dps = DPS
    rng = np.random.default_rng(SEED)
    cases = []
    rejected = 0
    while sum(c["kind"] == "line" for c in cases) < N_LINE:
        pts = random_curve(rng)
        fam1 = FAMILIES[len(cases) % len(FAMILIES)]
        p1 = draw_params(fam1, rng, point_on(pts, rng))
        check_family(fam1, p1, rng)
        f2 = None
        if rng.uniform() < 0.5:
            fam2 = str(rng.choice(FAMILIES))
            p2 = draw_params(fam2, rng, point_on(pts, rng))
            check_family(fam2, p2, rng)
            f2 = (fam2, p2)
        # which of dx, dy carries the family under test
        first, second = ((fam1, p1), f2) if rng.uniform() < 0.5 else (f2, (fam1, p1))
        ref = reference(lambda: line_reference(pts, first, second))
        if ref is None:
            rejected += 1
            continue
        value, unc, scale, digits = ref
        cases.append({"kind": "line", "points": pts.tolist(), "dx": first, "dy": second,
                      "rtol": float(rng.choice(RTOLS)), "reference": value,
                      "uncertainty": unc, "digits": digits, "scale": scale, "family": fam1})
        if len(cases) % 40 == 0:
            print(f"{len(cases)} cases", file=sys.stderr)
    n_region = 0
    while n_region < N_REGION:
        loop = random_loop(rng)
        fam = FAMILIES[n_region % len(FAMILIES)]
        lo, hi = loop.min(axis=0), loop.max(axis=0)
        p = draw_params(fam, rng, rng.uniform(lo, hi))
        check_family(fam, p, rng)
        ref = reference(lambda: region_reference(loop, fam, p))
        if ref is None:
            rejected += 1
            continue
        value, unc, scale, digits = ref
        cases.append({"kind": "region", "points": loop.tolist(), "f": (fam, p),
                      "rtol": float(rng.choice(RTOLS)), "reference": value,
                      "uncertainty": unc, "digits": digits, "scale": scale, "family": fam})
        n_region += 1
        if n_region % 40 == 0:
            print(f"{n_region} region cases", file=sys.stderr)
    OUT.write_text(json.dumps({"seed": SEED, "dps": DPS, "rejected": rejected,
                               "cases": cases}, indent=0) + "\n", encoding="utf-8")
    print(f"wrote {OUT} ({len(cases)} cases, {rejected} rejected)", file=sys.stderr)


if __name__ == "__main__":
    main()
