"""Formulas cannot make the work run away (issue 13, item 10; messages of item 16).

The degree of a sympy coefficient is found without expanding, constants are evaluated in
float64 in bounded time, and the command line bounds the evaluations a --weight may cost
before it integrates: exact integration is refused beyond the work limit, adaptive
refinement is capped so that it stays within it.  The checks here count work
(evaluation points); the wall-clock alarm is only a hang detector, far above the
times expected (benchmarks/bench_formulas.py measures those).
"""

from __future__ import annotations

import contextlib
import io
import signal

import numpy as np
import pytest
import sympy as sp
from hypothesis import example, given, settings
from hypothesis import strategies as st

import wedgepath as wp
from wedgepath import cli, report
from wedgepath.calculus.forms import Coefficient
from wedgepath.formula import (POINT_OVERHEAD, degree_bound, evaluation_cost, float_value,
                               parse_formula)

x, y = sp.symbols("x y", real=True)
XY = {"x": x, "y": y}


@contextlib.contextmanager
def hang_alarm(seconds):
    """Fail instead of hanging (a detector of runaway work, not a speed target)."""
    def boom(signum, frame):
        raise TimeoutError(f"still running after {seconds} s")
    old = signal.signal(signal.SIGALRM, boom)
    signal.setitimer(signal.ITIMER_REAL, seconds)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, old)


@pytest.fixture
def no_expansion(monkeypatch):
    """Make sympy's expanding calls fail: the code under test must not use them."""
    def refuse(*a, **k):
        raise AssertionError("expanded")
    monkeypatch.setattr(sp, "Poly", refuse)
    monkeypatch.setattr(sp, "expand", refuse)
    monkeypatch.setattr(sp.Expr, "expand", refuse)


# --------------------------------------------------------------------------- degree
@pytest.mark.parametrize("expr, deg", [
    (((x + y + 1) ** 64) ** 4, 256),
    ((x + y + 1) ** 64 * (x - y + 2) ** 64 * (x + 2 * y + 3) ** 64 * (2 * x + y + 1) ** 64, 256),
    (x ** 3 * y + y, 4),
    (sp.Integer(5), 0),
])
def test_degree_without_expanding(expr, deg, no_expansion):
    c = Coefficient.from_sympy(expr, (x, y))
    assert c.poly_degree == deg


def test_degree_bound_is_an_upper_bound_of_the_expanded_degree():
    # checked against sympy's own expansion on small cases (sympy.Poly.total_degree)
    rng = np.random.default_rng(3)
    for _ in range(40):
        e = sp.Integer(0)
        for _ in range(rng.integers(1, 4)):
            t = sp.Integer(int(rng.integers(-3, 4)))
            for _ in range(rng.integers(0, 3)):
                t *= (x + int(rng.integers(-2, 3)) * y + int(rng.integers(-2, 3))) ** int(
                    rng.integers(1, 4))
            e += t
        true = sp.Poly(sp.expand(e), x, y).total_degree() if e.free_symbols else 0
        assert degree_bound(e, [x, y]) >= max(true, 0)


def test_degree_bound_of_a_shared_tree_is_linear():
    e = x
    for _ in range(200):     # a DAG of 200 levels: its tree has 2**200 leaves
        e = sp.Mul(e, e + 1, evaluate=False)
    with hang_alarm(10):
        assert degree_bound(e, [x]) == 2 ** 200


# --------------------------------------------------------------------------- constants
@pytest.mark.parametrize("expr, expect", [
    (sp.exp(sp.exp(10 ** 60)), "inf"),
    (sp.exp(-sp.exp(10 ** 60)), 0.0),
    (sp.sin(sp.exp(sp.exp(50))), "nan"),
    (sp.Rational(1, 3), 1 / 3),
    (sp.Integer(10) ** 400, "inf"),
])
def test_constants_are_evaluated_in_float64_in_bounded_time(expr, expect):
    with hang_alarm(10):
        v = float_value(expr)
    if expect == "inf":
        assert v == np.inf
    elif expect == "nan":
        assert np.isnan(v)
    else:
        assert v == expect


def test_region_integral_of_a_runaway_constant_is_refused_not_hung():
    sq = [[0, 0], [1, 0], [1, 1], [0, 1]]
    with hang_alarm(10), pytest.raises(ValueError, match="not a finite float64"):
        wp.region_integral(sp.exp(sp.exp(10 ** 60)), sq)
    with hang_alarm(10):
        assert float(wp.region_integral(sp.exp(-sp.exp(10 ** 60)) + 2, sq)) == 2.0


def test_huge_integers_in_a_coefficient_evaluate_as_floats():
    c = Coefficient.from_sympy(x * sp.Integer(10) ** 300 + y, (x, y))
    np.testing.assert_allclose(c.evaluate(np.array([[1.0, 2.0]])), [1e300])
    c = Coefficient.from_sympy(x * sp.Integer(10) ** 400, (x, y))
    with pytest.raises(ValueError, match="not finite"):
        c.evaluate(np.array([[1.0, 2.0]]))


# --------------------------------------------------------------------------- parser messages
@pytest.mark.parametrize("text, words", [
    ("1e999", "more than 400 digits"),
    ("x*1e-999", "more than 400 digits"),
    ("exp(10**60)", "constant beyond float64"),
    ("x**exp(exp(10**60))", "exponent ('exp(exp(10**60))') is not a finite real number"),
    ("sqrt(-1)", "not a real number"),
    ("x.real", "Attribute is not allowed ('x.real')"),
    ("x if y else 1", "IfExp is not allowed"),
])
def test_parser_messages(text, words):
    with hang_alarm(10), pytest.raises(ValueError) as info:
        parse_formula(text, XY)
    assert words in str(info.value)


def test_cost_model_counts_nodes():
    assert evaluation_cost(x * y) == 4
    assert evaluation_cost(sp.sin(x)) == 20
    assert evaluation_cost(sp.sin(10 ** 9 * x)) > evaluation_cost(sp.sin(9 * x))


# --------------------------------------------------------------------------- the CLI's bound
def write_loop(path, n):
    s = np.linspace(0, 2 * np.pi, n + 1)
    with open(path, "w") as fh:
        fh.write("x,y\n")
        for a, b in zip(np.cos(s), np.sin(s)):
            fh.write(f"{float(a)!r},{float(b)!r}\n")
    return path


def run(argv):
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = cli.main([str(a) for a in argv])
    return code, out.getvalue(), err.getvalue()


class Counter:
    """Counts the points at which coefficients are evaluated (the work of an integral)."""

    def __init__(self, monkeypatch):
        self.points = 0
        real = Coefficient.evaluate

        def counting(coef, coords, label="coefficient", **kw):
            self.points += coords.shape[0]
            return real(coef, coords, label, **kw)
        monkeypatch.setattr(Coefficient, "evaluate", counting)


def test_exact_weight_beyond_the_limit_is_refused_before_integrating(tmp_path, monkeypatch):
    f = write_loop(tmp_path / "c.csv", 5000)
    count = Counter(monkeypatch)
    code, _, err = run(["loop", f, "--x", "x", "--y", "y", "--weight", "((x+y+1)**64)**4",
                        "--quiet"])
    assert code == 2 and "--weight: exact integration of this degree-256" in err
    assert len(err.strip().splitlines()) == 1
    assert count.points == 0


def test_exact_weight_within_the_limit(tmp_path, monkeypatch):
    f = write_loop(tmp_path / "c.csv", 40)
    count = Counter(monkeypatch)
    code, out, err = run(["loop", f, "--x", "x", "--y", "y", "--weight", "((x+y+1)**64)**4",
                          "--quiet", "--json"])
    assert code == 0, err
    assert '"exact": true' in out
    expr = ((x + y + 1) ** 64) ** 4
    assert count.points * (POINT_OVERHEAD + evaluation_cost(expr)) <= report.WEIGHT_WORK_LIMIT


@pytest.mark.parametrize("text", ["sin(x*10**64)", "abs(x)", "sqrt(abs(x*y))"])
def test_adaptive_refinement_stays_within_the_limit(text, tmp_path, monkeypatch):
    f = write_loop(tmp_path / "c.csv", 200)
    count = Counter(monkeypatch)
    code, out, err = run(["loop", f, "--x", "x", "--y", "y", "--weight", text, "--quiet"])
    assert code == 0, err
    cost = POINT_OVERHEAD + evaluation_cost(parse_formula(text, XY)) + report.ADAPTIVE_OVERHEAD
    assert count.points * cost <= report.WEIGHT_WORK_LIMIT
    # a capped refinement that misses the tolerance says so (error estimate and note)
    if "not reached" in out:
        assert "capped" in out


def test_weight_levels_bound():
    # L levels cost at most (2**(L+1) - 1) first passes: the chosen L is the largest within
    expr = sp.sin(x * y)
    cost = POINT_OVERHEAD + evaluation_cost(expr) + report.ADAPTIVE_OVERHEAD
    for segments in (10, 1000, 10 ** 5):
        L = report.weight_levels(expr, (x, y), segments)
        first = segments * 41 * cost
        assert L == 30 or first * (2 ** (L + 2) - 1) > report.WEIGHT_WORK_LIMIT
        assert first * (2 ** (L + 1) - 1) <= report.WEIGHT_WORK_LIMIT
    with pytest.raises(ValueError, match="^weight: one pass of adaptive integration"):
        report.weight_levels(expr, (x, y), 10 ** 8)


@pytest.mark.parametrize("text, words", [
    ("1e999", "--weight: the number ('1e999') has more than 400 digits"),
    ("exp(10**60)", "--weight: 'exp(10**60)' is a constant beyond float64"),
    ("exp(exp(10**60))*x", "--weight 'exp(exp(10**60))*x' is not finite at (x, y) = ("),
    ("exp(800*x)", "--weight 'exp(800*x)' is not finite at (x, y) = ("),
])
def test_weight_messages_speak_the_command_line(text, words, tmp_path):
    f = write_loop(tmp_path / "c.csv", 40)
    with hang_alarm(20):
        code, _, err = run(["loop", f, "--x", "x", "--y", "y", "--weight", text, "--quiet"])
    assert code == 2
    assert words in err and len(err.strip().splitlines()) == 1
    assert "rescale the path" not in err and "invalid input" not in err


# --------------------------------------------------------------------------- nasty formulas
ATOMS = ["x", "y", "1", "2", "0.5", "pi", "e", "10**64", "9**64", "1e300", "1e-300", "1e999",
         "(x+y+1)", "(x-y+2)"]
FUNCS = ["sin", "cos", "tan", "exp", "log", "sqrt", "abs", "asin", "atan", "sinh", "tanh"]


@st.composite
def nasty(draw, depth=0):
    kind = draw(st.sampled_from(["atom", "atom", "pow", "op", "call"] if depth < 4
                                else ["atom"]))
    if kind == "atom":
        return draw(st.sampled_from(ATOMS))
    if kind == "pow":
        return f"({draw(nasty(depth + 1))})**{draw(st.sampled_from(['2', '64', '-1', '0.5']))}"
    if kind == "op":
        op = draw(st.sampled_from(["+", "-", "*", "/"]))
        return f"({draw(nasty(depth + 1))}){op}({draw(nasty(depth + 1))})"
    return f"{draw(st.sampled_from(FUNCS))}({draw(nasty(depth + 1))})"


SEEDS = ["((x+y+1)**64)**4", "(x+y+1)**64*(x-y+2)**64*(x+2*y+3)**64*(2*x+y+1)**64",
         "exp(10**60)", "exp(exp(10**60))", "1e999", "sin(x*10**64)", "sqrt(abs(x*y))",
         "x**exp(exp(10**60))", "exp(x**64)*exp(y**64)", "(((9**64)**64)**64)**64",
         "+".join(f"(x+{k}*y)**64" for k in range(30))]


def with_seeds(test):
    for seed in SEEDS:
        test = example(seed)(test)
    return test


@settings(max_examples=40, deadline=None, derandomize=True)
@given(nasty())
@with_seeds
def test_nasty_formulas_are_bounded(text):
    # a small loop (12 samples): work counted, one line on refusal, never a hang
    s = np.linspace(0, 2 * np.pi, 13)
    xy = np.c_[np.cos(s), np.sin(s) * 0.7]
    points = [0]
    real = Coefficient.evaluate

    def counting(coef, coords, label="coefficient", **kw):
        points[0] += coords.shape[0]
        return real(coef, coords, label, **kw)
    Coefficient.evaluate = counting
    try:
        with hang_alarm(30):
            try:
                rep = report.loop(xy, names=["x", "y"], weight=text)
            except ValueError as exc:
                msg = str(exc)
                assert msg.strip() and "\n" not in msg.strip(), msg
                return
    finally:
        Coefficient.evaluate = real
    expr = parse_formula(text, XY)
    adaptive = Coefficient.from_sympy(expr, (x, y)).poly_degree is None
    cost = POINT_OVERHEAD + evaluation_cost(expr) + (report.ADAPTIVE_OVERHEAD if adaptive else 0)
    assert points[0] * cost <= report.WEIGHT_WORK_LIMIT
    assert np.isfinite(rep.to_dict()["weighted_integral"]["value"])
