"""Tests for wedgepath.symbolic, the exact sympy layer.

Every reference value is either computed here by an independent route (a
different formula or a different code path) or taken from a named source,
given in a comment beside the check.
"""

from __future__ import annotations

import math
import sys
from fractions import Fraction
from pathlib import Path

import numpy as np
import pytest
import sympy
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

try:  # the package may not be installed in the dev venv yet
    from wedgepath import symbolic as sy
except ImportError:  # pragma: no cover - depends on the environment
    sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "src"))
    from wedgepath import symbolic as sy

X, Y, Z, W = sympy.symbols("x y z w")
ALL = (X, Y, Z, W)

FAST = settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
FEW = settings(max_examples=10, deadline=None, suppress_health_check=[HealthCheck.too_slow])


# ---------------------------------------------------------------------------
# strategies
# ---------------------------------------------------------------------------


@st.composite
def polynomials(draw, syms, max_terms=4, max_exp=3):
    terms = draw(
        st.lists(
            st.tuples(
                st.integers(-4, 4),
                st.tuples(*[st.integers(0, max_exp) for _ in syms]),
            ),
            min_size=1,
            max_size=max_terms,
        )
    )
    expr = sympy.Integer(0)
    for c, exps in terms:
        expr += c * sympy.Mul(*[s**e for s, e in zip(syms, exps)])
    return expr


@st.composite
def symbols_and_nvars(draw, lo=2, hi=4):
    n = draw(st.integers(lo, hi))
    return ALL[:n]


@st.composite
def one_forms(draw, syms, max_terms=3, max_exp=2):
    return {(i,): draw(polynomials(syms, max_terms, max_exp)) for i in range(len(syms))}


small_rationals = st.fractions(min_value=-5, max_value=5, max_denominator=7)


def rational_points(n, min_size, max_size):
    return st.lists(
        st.tuples(*[small_rationals for _ in range(n)]), min_size=min_size, max_size=max_size
    )


def _forms_equal(a, b):
    keys = set(a) | set(b)
    return all(sympy.expand(a.get(k, 0) - b.get(k, 0)) == 0 for k in keys)


def _scale(form, c):
    return {k: c * v for k, v in form.items()}


def _add(a, b):
    out = dict(a)
    for k, v in b.items():
        out[k] = out.get(k, 0) + v
    return {k: v for k, v in out.items() if sympy.expand(v) != 0}


def _shoelace(vertices):
    """Independent shoelace area with stdlib Fractions (common practice, no source)."""
    pts = [(Fraction(a), Fraction(b)) for a, b in vertices]
    T = len(pts)
    return sum(pts[k][0] * pts[(k + 1) % T][1] - pts[(k + 1) % T][0] * pts[k][1] for k in range(T)) / 2


# ---------------------------------------------------------------------------
# to_rational
# ---------------------------------------------------------------------------


@given(st.floats(allow_nan=False, allow_infinity=False))
@settings(max_examples=200, deadline=None)
def test_to_rational_is_the_exact_binary_value(v):
    # Fraction(float) is exact (Python standard library documentation); independent route.
    q = sy.to_rational(v)
    fr = Fraction(v)
    assert isinstance(q, sympy.Rational)
    assert (q.p, q.q) == (fr.numerator, fr.denominator)
    assert float(q) == v


def test_to_rational_types():
    assert sy.to_rational(3) == 3 and isinstance(sy.to_rational(3), sympy.Integer)
    assert sy.to_rational(np.int64(-7)) == -7
    assert sy.to_rational(Fraction(6, 4)) == sympy.Rational(3, 2)
    assert sy.to_rational(sympy.Rational(2, 9)) == sympy.Rational(2, 9)
    f32 = Fraction(float(np.float32(0.1)))
    assert sy.to_rational(np.float32(0.1)) == sympy.Rational(f32.numerator, f32.denominator)
    # 0.1 is not one tenth in binary
    assert sy.to_rational(0.1) != sympy.Rational(1, 10)
    assert sy.to_rational(sympy.Float(0.25)) == sympy.Rational(1, 4)


@pytest.mark.parametrize(
    "bad, word",
    [
        (float("nan"), "nan"),
        (np.float64("nan"), "nan"),
        (float("inf"), "infinite"),
        (-np.inf, "infinite"),
        (sympy.oo, "infinite"),
        (sympy.nan, "nan"),
        (1 + 2j, "complex"),
        (np.complex128(1), "complex"),
        (sympy.I, "complex"),
        (sympy.sqrt(2), "not a rational"),
    ],
)
def test_to_rational_rejects(bad, word):
    with pytest.raises(ValueError, match=word):
        sy.to_rational(bad)


def test_to_rational_rejects_non_numbers():
    for bad in ["0.5", None, [1, 2], X]:
        with pytest.raises(TypeError):
            sy.to_rational(bad)


# ---------------------------------------------------------------------------
# exterior derivative and wedge
# ---------------------------------------------------------------------------


def test_d_of_zero_form_is_gradient():
    f = X**2 * Y + sympy.sin(Z)
    assert sy.exterior_derivative({(): f}, [X, Y, Z]) == {
        (0,): 2 * X * Y,
        (1,): X**2,
        (2,): sympy.cos(Z),
    }


def test_d_of_one_form_in_plane_is_curl():
    # d(P dx + Q dy) = (Q_x - P_y) dx^dy  (common practice, no source)
    P = X * Y**2
    Q = X**3 + Y
    assert sy.exterior_derivative({(0,): P, (1,): Q}, [X, Y]) == {(0, 1): 3 * X**2 - 2 * X * Y}


def test_d_accepts_unsorted_keys_with_sign():
    a = sy.exterior_derivative({(1, 0): X * Z}, [X, Y, Z])
    b = sy.exterior_derivative({(0, 1): -X * Z}, [X, Y, Z])
    assert a == b == {(0, 1, 2): -X}


def test_d_detects_trigonometric_zero():
    # d(sin^2 + cos^2) = 0 needs more than expand to recognise
    f = sympy.sin(X * Y) ** 2 + sympy.cos(X * Y) ** 2
    assert sy.exterior_derivative({(): f}, [X, Y]) == {}


@given(st.data())
@FAST
def test_dd_zero_on_zero_forms(data):
    syms = data.draw(symbols_and_nvars())
    f = data.draw(polynomials(syms))
    df = sy.exterior_derivative({(): f}, syms)
    assert sy.exterior_derivative(df, syms) == {}


@given(st.data())
@FAST
def test_dd_zero_on_one_forms(data):
    syms = data.draw(symbols_and_nvars())
    omega = data.draw(one_forms(syms))
    d_omega = sy.exterior_derivative(omega, syms)
    assert sy.exterior_derivative(d_omega, syms) == {}


@given(st.data())
@FAST
def test_d_is_not_trivially_zero(data):
    # guard for the two tests above: d(c x_0 dx_1) = c dx_0 ^ dx_1 is not dropped
    syms = data.draw(symbols_and_nvars())
    c = data.draw(st.integers(1, 5))
    omega = {(1,): c * syms[0]}
    assert sy.exterior_derivative(omega, syms) == {(0, 1): c}


@given(st.data())
@FAST
def test_leibniz_rule(data):
    # d(a ^ b) = da ^ b + (-1)^k a ^ db for a a k-form (common practice, no source)
    syms = data.draw(symbols_and_nvars(2, 3))
    k = data.draw(st.integers(0, 1))
    a = {(): data.draw(polynomials(syms, 2, 2))} if k == 0 else data.draw(one_forms(syms, 2, 2))
    b = data.draw(one_forms(syms, 2, 2))
    lhs = sy.exterior_derivative(sy.wedge(a, b), syms)
    rhs = _add(
        sy.wedge(sy.exterior_derivative(a, syms), b),
        _scale(sy.wedge(a, sy.exterior_derivative(b, syms)), (-1) ** k),
    )
    assert _forms_equal(lhs, rhs)


def test_wedge_basis():
    assert sy.wedge({(0,): 1}, {(1,): 1}) == {(0, 1): 1}
    assert sy.wedge({(1,): 1}, {(0,): 1}) == {(0, 1): -1}
    assert sy.wedge({(0, 2): 1}, {(1,): 1}) == {(0, 1, 2): -1}
    assert sy.wedge({(2,): 1}, {(0, 1): 1}) == {(0, 1, 2): 1}
    assert sy.wedge({(0,): X}, {(0,): Y}) == {}
    assert sy.wedge({}, {(0,): X}) == {}


@given(st.data())
@FAST
def test_wedge_graded_antisymmetry(data):
    syms = ALL[:4]
    a = data.draw(one_forms(syms, 2, 2))
    b = data.draw(one_forms(syms, 2, 2))
    c = sy.wedge(data.draw(one_forms(syms, 1, 1)), data.draw(one_forms(syms, 1, 1)))  # a 2-form
    assert _forms_equal(sy.wedge(a, b), _scale(sy.wedge(b, a), -1))
    assert sy.wedge(a, a) == {}
    # 1-form ^ 2-form commutes: (-1)^(1*2) = +1
    assert _forms_equal(sy.wedge(a, c), sy.wedge(c, a))
    # associativity
    assert _forms_equal(sy.wedge(sy.wedge(a, b), c), sy.wedge(a, sy.wedge(b, c)))


# ---------------------------------------------------------------------------
# line integrals
# ---------------------------------------------------------------------------


def test_unit_circle_area_form_is_pi():
    t = sympy.Symbol("t")
    value = sy.line_integral(
        [-Y / 2, X / 2], [X, Y], [sympy.cos(t), sympy.sin(t)], t, (0, 2 * sympy.pi)
    )
    assert value == sympy.pi
    # clockwise traversal gives -pi
    value_cw = sy.line_integral(
        {(0,): -Y / 2, (1,): X / 2}, [X, Y], [sympy.cos(t), -sympy.sin(t)], t, (0, 2 * sympy.pi)
    )
    assert value_cw == -sympy.pi


def test_gradient_theorem_on_a_trig_curve():
    # Fundamental theorem for line integrals (Stewart, Calculus, section
    # "The Fundamental Theorem for Line Integrals"; from memory).
    t = sympy.Symbol("t")
    phi = X**2 * Y + sympy.exp(X)
    grad = [sympy.diff(phi, s) for s in (X, Y)]
    curve = [sympy.cos(t), sympy.sin(t)]
    a, b = 0, sympy.pi / 3
    expected = phi.subs({X: sympy.cos(b), Y: sympy.sin(b)}) - phi.subs({X: 1, Y: 0})
    value = sy.line_integral(grad, [X, Y], curve, t, (a, b))
    assert sympy.simplify(value - expected) == 0


@given(st.data())
@FAST
def test_gradient_theorem_polynomial(data):
    # same theorem as above, random polynomial potentials along polynomial curves
    syms = data.draw(symbols_and_nvars(2, 3))
    t = sympy.Symbol("t")
    phi = data.draw(polynomials(syms, 3, 3))
    curve = [data.draw(polynomials((t,), 3, 2)) for _ in syms]
    lo, hi = data.draw(small_rationals), data.draw(small_rationals)
    grad = [sympy.diff(phi, s) for s in syms]
    value = sy.line_integral(grad, syms, curve, t, (lo, hi))
    expected = phi.subs({s: c.subs(t, hi) for s, c in zip(syms, curve)}) - phi.subs(
        {s: c.subs(t, lo) for s, c in zip(syms, curve)}
    )
    assert value == expected


def test_line_integral_accepts_callables_for_the_curve():
    t = sympy.Symbol("t")
    v = sy.line_integral([Y, 0], [X, Y], [lambda s: s, lambda s: s**2], t, (0, 1))
    assert v == sympy.Rational(1, 3)  # int_0^1 t^2 dt


def test_green_textbook_example():
    # Stewart, Calculus, section "Green's Theorem", Example 1 (from memory):
    # closed integral of x^4 dx + x y dy over the triangle (0,0) -> (1,0) -> (0,1)
    # is 1/6 (= double integral of y over the triangle).
    tri = [(0, 0), (1, 0), (0, 1)]
    assert sy.polyline_integral([X**4, X * Y], [X, Y], tri, closed=True) == sympy.Rational(1, 6)
    assert sy.polygon_region_integral(Y, [X, Y], tri) == sympy.Rational(1, 6)


def test_polyline_matches_line_integral_on_a_segment():
    t = sympy.Symbol("t")
    p, q = (sympy.Rational(1, 3), -2, 5), (4, sympy.Rational(7, 2), -1)
    comps = [X * Y * Z, Y**2 + Z, X**3]
    seg = [a + t * (b - a) for a, b in zip(p, q)]
    expected = sy.line_integral(comps, [X, Y, Z], seg, t, (0, 1))
    assert sy.polyline_integral(comps, [X, Y, Z], [p, q]) == expected
    # a non-linear monotone reparametrisation of the same segment gives the same value
    seg2 = [a + t**3 * (b - a) for a, b in zip(p, q)]
    assert sy.line_integral(comps, [X, Y, Z], seg2, t, (0, 1)) == expected


def _segment_integral_exact(comps, syms, p, q):
    """Exact line integral of a polynomial 1-form along the segment p -> q (fractions).

    The pullback along x(t) = p + t (q - p), t in [0, 1], is a polynomial in t: each
    monomial is expanded as a product of the linear factors p_k + t (q_k - p_k) with
    exact rational coefficients c_m, and integrated term by term (int_0^1 t^m = 1/(m+1)).
    Independent of sympy's integrate and of the library's polyline formula.
    """
    def mul(a, b):
        out = [Fraction(0)] * (len(a) + len(b) - 1)
        for i, u in enumerate(a):
            for j, v in enumerate(b):
                out[i + j] += u * v
        return out

    p = [Fraction(v) for v in p]
    q = [Fraction(v) for v in q]
    total = Fraction(0)
    for i, c in enumerate(comps):
        if q[i] == p[i]:
            continue
        for exps, coef in sympy.Poly(c, *syms).terms():
            poly = [Fraction(int(coef.p), int(coef.q))]
            for k, e in enumerate(exps):
                for _ in range(e):
                    poly = mul(poly, [p[k], q[k] - p[k]])
            total += (q[i] - p[i]) * sum(cm / (m + 1) for m, cm in enumerate(poly))
    return sympy.Rational(total.numerator, total.denominator)


def test_segment_reference_against_sympy_integrate():
    # the fraction reference above, checked once against sympy's integrate (slow)
    t = sympy.Symbol("t")
    comps = [X**2 * Y - 3, Y**3 + sympy.Rational(1, 2) * X * Y]
    p, q = (Fraction(1, 3), Fraction(-2)), (Fraction(5, 7), Fraction(3, 2))
    seg = [sympy.Rational(a) + t * (sympy.Rational(b) - sympy.Rational(a)) for a, b in zip(p, q)]
    assert _segment_integral_exact(comps, [X, Y], p, q) == sy.line_integral(comps, [X, Y], seg,
                                                                             t, (0, 1))


@given(st.data())
@FEW
def test_polyline_fast_path_matches_segmentwise_line_integral(data):
    syms = data.draw(symbols_and_nvars(2, 3))
    n = len(syms)
    omega = data.draw(one_forms(syms, 3, 3))
    pts = data.draw(rational_points(n, 2, 5))
    closed = data.draw(st.booleans())
    value = sy.polyline_integral(omega, syms, pts, closed=closed)
    loop = pts + [pts[0]] if closed else pts
    comps = [omega[(i,)] for i in range(n)]
    expected = sum(_segment_integral_exact(comps, syms, p, q)
                   for p, q in zip(loop[:-1], loop[1:]))
    assert value == expected


def test_polyline_generic_path_with_irrational_and_symbolic_vertices():
    a = sympy.Symbol("a")
    pts = [(0, 0), (sympy.sqrt(2), 1), (a, 3)]
    comps = [Y, X**2]
    t = sympy.Symbol("t")
    expected = sum(
        sy.line_integral(comps, [X, Y], [p[0] + t * (q[0] - p[0]), p[1] + t * (q[1] - p[1])], t, (0, 1))
        for p, q in zip(pts[:-1], pts[1:])
    )
    value = sy.polyline_integral(comps, [X, Y], pts)
    assert sympy.simplify(value - expected) == 0
    assert value.has(a)


def test_polyline_float_vertices_are_converted_exactly():
    # int of x dy from (0,0) to (0.1, 0.1) is v^2/2 with v the binary value of 0.1
    v = sympy.Rational(*Fraction(0.1).as_integer_ratio())
    value = sy.polyline_integral([0, X], [X, Y], np.array([[0.0, 0.0], [0.1, 0.1]]))
    assert value == v**2 / 2
    assert value != sympy.Rational(1, 200)


def test_polyline_many_segments_is_fast_enough():
    import time

    rng = np.random.default_rng(1)
    pts = rng.normal(size=(300, 3))
    comps = [X**3 * Y + Z**2, X * Y * Z + Y**4, X**2 - 3 * Z * Y**2]
    start = time.perf_counter()
    value = sy.polyline_integral(comps, [X, Y, Z], pts, closed=True)
    elapsed = time.perf_counter() - start
    assert isinstance(value, sympy.Rational)
    assert elapsed < 5.0
    # cross-check with numpy: 3-point Gauss-Legendre is exact up to degree 5 and the
    # pulled-back integrand has degree 4 (common practice, no source)
    loop = np.vstack([pts, pts[:1]])
    nodes, weights = np.polynomial.legendre.leggauss(3)
    s = (nodes + 1) / 2
    total = 0.0
    for p, q in zip(loop[:-1], loop[1:]):
        d = q - p
        x, y, z = (p[:, None] + d[:, None] * s).tolist()
        x, y, z = map(np.array, (x, y, z))
        g = (x**3 * y + z**2) * d[0] + (x * y * z + y**4) * d[1] + (x**2 - 3 * z * y**2) * d[2]
        total += 0.5 * np.dot(weights, g)
    assert float(value) == pytest.approx(total, rel=1e-9, abs=1e-9)


def test_zero_chain_boundary_of_polyline():
    # Stokes for a 1-chain: integral of df along a path = f(end) - f(start)
    f = X**2 * Y - Y**3 + 2
    df = sy.exterior_derivative({(): f}, [X, Y])
    pts = [(0, 1), (Fraction(1, 2), 3), (-2, Fraction(5, 3))]
    lhs = sy.polyline_integral(df, [X, Y], pts)
    rhs = sy.zero_chain_value(f, [X, Y], [pts[-1], pts[0]], [1, -1])
    assert lhs == rhs
    assert rhs != 0
    assert sy.zero_chain_value(f, [X, Y], [], []) == 0


# ---------------------------------------------------------------------------
# planar regions
# ---------------------------------------------------------------------------


@pytest.mark.parametrize("a, b", [(0, 0), (1, 0), (0, 2), (2, 3), (5, 1)])
def test_unit_square_monomials(a, b):
    # int_0^1 int_0^1 x^a y^b = 1/((a+1)(b+1))  (common practice, no source)
    square = [(0, 0), (1, 0), (1, 1), (0, 1)]
    assert sy.polygon_region_integral(X**a * Y**b, [X, Y], square) == sympy.Rational(
        1, (a + 1) * (b + 1)
    )


@pytest.mark.parametrize("a, b", [(0, 0), (1, 0), (1, 1), (2, 3), (4, 0)])
def test_unit_triangle_dirichlet(a, b):
    # Dirichlet's integral over the unit simplex: int x^a y^b = a! b! / (a+b+2)!
    # (common practice; found in any text on integration over simplices; from memory)
    expected = sympy.Rational(math.factorial(a) * math.factorial(b), math.factorial(a + b + 2))
    tri = [(0, 0), (1, 0), (0, 1)]
    assert sy.polygon_region_integral(X**a * Y**b, [X, Y], tri) == expected
    assert sy.simplex_integral(X**a * Y**b, [X, Y], tri) == expected


@given(rational_points(2, 3, 8))
@FAST
def test_region_integral_of_one_is_shoelace_area(pts):
    area = sy.polygon_region_integral(1, [X, Y], pts)
    expected = _shoelace(pts)
    assert area == sympy.Rational(expected.numerator, expected.denominator)
    assert sy.polygon_moments(pts)["area"] == area


@given(rational_points(2, 3, 7))
@FAST
def test_moment_formulas_match_green_route(pts):
    m = sy.polygon_moments(pts)
    for key, f in [("int_x", X), ("int_y", Y), ("int_xx", X**2), ("int_xy", X * Y), ("int_yy", Y**2)]:
        assert m[key] == sy.polygon_region_integral(f, [X, Y], pts), key


def test_moments_of_a_triangle_against_simplex_integral():
    tri = [(0, 0), (3, 1), (1, 2)]  # counter-clockwise
    m = sy.polygon_moments(tri)
    for key, f in [("area", 1), ("int_x", X), ("int_xx", X**2), ("int_xy", X * Y), ("int_yy", Y**2)]:
        assert m[key] == sy.simplex_integral(f, [X, Y], tri), key
    assert m["centroid"] == (sympy.Rational(4, 3), 1)  # vertex average


def test_orientation_and_winding_weights():
    square = [(0, 0), (2, 0), (2, 2), (0, 2)]
    f = X * Y**2 + 1
    ccw = sy.polygon_region_integral(f, [X, Y], square)
    assert sy.polygon_region_integral(f, [X, Y], square[::-1]) == -ccw
    assert sy.polygon_region_integral(f, [X, Y], square + square) == 2 * ccw
    # translation of the vertex list start does not matter
    assert sy.polygon_region_integral(f, [X, Y], square[2:] + square[:2]) == ccw
    # degenerate inputs
    assert sy.polygon_region_integral(f, [X, Y], square[:2]) == 0
    assert sy.polygon_region_integral(f, [X, Y], []) == 0


def test_figure_eight_has_zero_net_area():
    # bow-tie: right lobe clockwise, left lobe counter-clockwise
    eight = [(0, 0), (1, 1), (1, 0), (0, 1)]
    assert sy.polygon_region_integral(1, [X, Y], eight) == 0
    m = sy.polygon_moments(eight)
    assert m["area"] == 0 and m["centroid"] is None
    # int of x is not zero: left lobe (winding +1) minus right lobe (winding -1)
    half = sympy.Rational(1, 2)
    left = sy.simplex_integral(X, [X, Y], [(half, half), (0, 1), (0, 0)])
    right = sy.simplex_integral(X, [X, Y], [(half, half), (1, 1), (1, 0)])
    value = sy.polygon_region_integral(X, [X, Y], eight)
    assert value == left - right == sympy.Rational(-1, 6)


def test_rectangle_second_moment_symbolic_and_numeric():
    # I = b h^3 / 12 about the centroidal axis parallel to the base: Gere & Goodno,
    # Mechanics of Materials, appendix "Properties of Plane Areas", case 1
    # (rectangle); from memory, the appendix letter differs between editions.
    b, h = sympy.symbols("b h", positive=True)
    rect = [(-b / 2, -h / 2), (b / 2, -h / 2), (b / 2, h / 2), (-b / 2, h / 2)]
    m = sy.polygon_moments(rect)
    assert sympy.simplify(m["int_yy"] - b * h**3 / 12) == 0
    assert sympy.simplify(m["int_xx"] - h * b**3 / 12) == 0
    assert m["int_xy"] == 0
    assert sympy.simplify(sy.polygon_region_integral(Y**2, [X, Y], rect) - b * h**3 / 12) == 0
    # numeric, about the base (same appendix: I_base = b h^3 / 3)
    base = [(0, 0), (3, 0), (3, 2), (0, 2)]
    assert sy.polygon_moments(base)["int_yy"] == sympy.Rational(3 * 2**3, 3)
    assert sy.polygon_region_integral(Y**2, [X, Y], base) == 8


@pytest.mark.parametrize("N", [3, 4, 6, 8, 12])
def test_regular_polygon_area(N):
    # area of the regular N-gon inscribed in radius r: (N/2) r^2 sin(2 pi / N)
    # (common practice, no source).  Vertices are exact: for N in (4, 6, 8, 12)
    # sympy evaluates cos/sin to rationals and square roots.
    r = sympy.Symbol("r", positive=True)
    verts = [
        (r * sympy.cos(2 * sympy.pi * k / N), r * sympy.sin(2 * sympy.pi * k / N)) for k in range(N)
    ]
    expected = sympy.Rational(N, 2) * r**2 * sympy.sin(2 * sympy.pi / N)
    assert sympy.simplify(sy.polygon_moments(verts)["area"] - expected) == 0
    assert sympy.simplify(sy.polygon_region_integral(1, [X, Y], verts) - expected) == 0


def test_regular_hexagon_with_explicit_sqrt3():
    s3 = sympy.sqrt(3)
    half = sympy.Rational(1, 2)
    hexagon = [(1, 0), (half, s3 / 2), (-half, s3 / 2), (-1, 0), (-half, -s3 / 2), (half, -s3 / 2)]
    area = sy.polygon_region_integral(1, [X, Y], hexagon)
    assert area == 3 * s3 / 2
    assert sy.polygon_moments(hexagon)["centroid"] == (0, 0)


def test_non_polynomial_region_integral():
    # int_0^1 int_0^1 exp(x) y dy dx = (e - 1)/2 (common practice, no source)
    square = [(0, 0), (1, 0), (1, 1), (0, 1)]
    assert sympy.simplify(
        sy.polygon_region_integral(sympy.exp(X) * Y, [X, Y], square) - (sympy.E - 1) / 2
    ) == 0


# ---------------------------------------------------------------------------
# simplices
# ---------------------------------------------------------------------------


@pytest.mark.parametrize("a, b, c", [(0, 0, 0), (1, 0, 0), (1, 1, 1), (2, 0, 3), (3, 2, 1)])
def test_unit_tetrahedron_dirichlet(a, b, c):
    # Dirichlet's integral, 3-d case: a! b! c! / (a+b+c+3)!  (common practice; from memory)
    tet = [(0, 0, 0), (1, 0, 0), (0, 1, 0), (0, 0, 1)]
    expected = sympy.Rational(
        math.factorial(a) * math.factorial(b) * math.factorial(c), math.factorial(a + b + c + 3)
    )
    assert sy.simplex_integral(X**a * Y**b * Z**c, [X, Y, Z], tet) == expected


def test_simplex_measures_in_higher_dimension():
    # segment length in R^3: |(2, 3, 6)| = 7
    assert sy.simplex_integral(1, [X, Y, Z], [(1, 1, 1), (3, 4, 7)]) == 7
    # mean of x along a segment is the midpoint value
    assert sy.simplex_integral(X, [X, Y, Z], [(1, 1, 1), (3, 4, 7)]) == 7 * 2
    # triangle in R^3: area = |cross product| / 2 (common practice, no source)
    tri = [(1, 0, 2), (3, 1, 0), (0, 4, 1)]
    u = np.array(tri[1]) - np.array(tri[0])
    v = np.array(tri[2]) - np.array(tri[0])
    cross_sq = int(np.dot(np.cross(u, v), np.cross(u, v)))
    area = sy.simplex_integral(1, [X, Y, Z], tri)
    assert area == sympy.sqrt(cross_sq) / 2
    # vertex order does not change an unsigned integral
    assert sy.simplex_integral(X * Z, [X, Y, Z], tri[::-1]) == sy.simplex_integral(X * Z, [X, Y, Z], tri)
    # tetrahedron embedded in R^4 with last coordinate constant: same as in R^3
    tet4 = [(0, 0, 0, 5), (1, 0, 0, 5), (0, 1, 0, 5), (0, 0, 1, 5)]
    assert sy.simplex_integral(X * W, ALL, tet4) == 5 * sympy.Rational(1, 24)
    # degenerate simplex
    assert sy.simplex_integral(X, [X, Y], [(0, 0), (1, 1), (2, 2)]) == 0


def test_form_on_simplex_orientation_and_pullback():
    tri = [(0, 0), (2, 0), (0, 3)]
    assert sy.form_on_simplex({(0, 1): 1}, [X, Y], tri) == 3
    assert sy.form_on_simplex({(0, 1): 1}, [X, Y], [tri[0], tri[2], tri[1]]) == -3
    assert sy.form_on_simplex({(1, 0): 1}, [X, Y], tri) == -3
    # 2-form dx^dy with a function: equals the signed region integral
    f = X**2 + Y
    assert sy.form_on_simplex({(0, 1): f}, [X, Y], tri) == sy.polygon_region_integral(f, [X, Y], tri)
    # 1-simplex: same as the polyline integral
    seg = [(1, 2, 3), (-1, 0, 4)]
    omega = {(0,): Y * Z, (2,): X**2}
    assert sy.form_on_simplex(omega, [X, Y, Z], seg) == sy.polyline_integral(omega, [X, Y, Z], seg)
    # 0-simplex: evaluation
    assert sy.form_on_simplex({(): X * Y}, [X, Y], [(2, 5)]) == 10


@given(st.data())
@FAST
def test_stokes_on_a_triangle_in_3d(data):
    # Stokes: int over the oriented triangle of d(omega) = closed integral of omega
    # over its boundary v0 -> v1 -> v2 -> v0 (common practice, no source)
    syms = (X, Y, Z)
    omega = data.draw(one_forms(syms, 2, 2))
    tri = data.draw(rational_points(3, 3, 3))
    d_omega = sy.exterior_derivative(omega, syms)
    lhs = sy.form_on_simplex(d_omega, syms, tri)
    rhs = sy.polyline_integral(omega, syms, tri, closed=True)
    assert lhs == rhs


@given(st.data())
@FEW
def test_stokes_on_a_tetrahedron(data):
    # k = 3 as well: int over the tetrahedron of d(eta) = sum of faces with the
    # boundary orientation [v1 v2 v3] - [v0 v2 v3] + [v0 v1 v3] - [v0 v1 v2]
    syms = (X, Y, Z)
    eta = {key: data.draw(polynomials(syms, 2, 2)) for key in [(0, 1), (0, 2), (1, 2)]}
    tet = data.draw(rational_points(3, 4, 4))
    lhs = sy.form_on_simplex(sy.exterior_derivative(eta, syms), syms, tet)
    faces = [([1, 2, 3], 1), ([0, 2, 3], -1), ([0, 1, 3], 1), ([0, 1, 2], -1)]
    rhs = sum(sign * sy.form_on_simplex(eta, syms, [tet[i] for i in face]) for face, sign in faces)
    assert lhs == rhs


# ---------------------------------------------------------------------------
# input validation
# ---------------------------------------------------------------------------


def test_validation_errors():
    with pytest.raises(ValueError, match="outside"):
        sy.exterior_derivative({(2,): X}, [X, Y])
    with pytest.raises(ValueError, match="mixed degrees"):
        sy.exterior_derivative({(0,): X, (0, 1): Y}, [X, Y])
    with pytest.raises(TypeError):
        sy.exterior_derivative({(0,): lambda v: v}, [X, Y])
    with pytest.raises(TypeError):
        sy.exterior_derivative({(): X}, ["x", "y"])
    with pytest.raises(ValueError, match="3 entries but there are 2 symbols"):
        sy.line_integral([X, Y, 1], [X, Y], [0, 0], sympy.Symbol("t"), (0, 1))
    with pytest.raises(ValueError, match="curve has 3 coordinates"):
        sy.line_integral([X, Y], [X, Y], [0, 0, 0], sympy.Symbol("t"), (0, 1))
    with pytest.raises(ValueError, match="3 coordinates per point but there are 2 symbols"):
        sy.polyline_integral([X, Y], [X, Y], [(0, 0, 0), (1, 1, 1)])
    with pytest.raises(TypeError):
        sy.polyline_integral([np.sin, Y], [X, Y], [(0, 0), (1, 1)])
    with pytest.raises(TypeError):
        sy.polyline_integral(["x", Y], [X, Y], [(0, 0), (1, 1)])
    with pytest.raises(ValueError, match="nan"):
        sy.polyline_integral([X, Y], [X, Y], [(0, 0), (np.nan, 1)])
    with pytest.raises(ValueError, match="nan"):
        sy.polyline_integral([X, sympy.nan], [X, Y], [(0, 0), (1, 1)])
    with pytest.raises(ValueError, match="coefficients has 1 entries but there are 2 points"):
        sy.zero_chain_value(X, [X, Y], [(0, 0), (1, 1)], [1])
    with pytest.raises(ValueError, match="exactly 2 symbols"):
        sy.polygon_region_integral(1, [X, Y, Z], [(0, 0, 0), (1, 0, 0), (0, 1, 0)])
    with pytest.raises(ValueError, match="2-form cannot be integrated over a 1-simplex"):
        sy.form_on_simplex({(0, 1): 1}, [X, Y], [(0, 0), (1, 1)])
    with pytest.raises(ValueError, match="does not fit"):
        sy.simplex_integral(1, [X], [(0,), (1,), (2,)])
    with pytest.raises(ValueError, match="complex"):
        sy.polyline_integral([X, Y], [X, Y], [(0, 0), (sympy.I, 1)])


def test_inputs_are_not_modified():
    pts = np.array([[0.5, 0.0], [1.0, 2.0], [0.0, 1.0]])
    before = pts.copy()
    sy.polygon_region_integral(X, [X, Y], pts)
    sy.polygon_moments(pts)
    assert np.array_equal(pts, before) and pts.dtype == np.float64
    form = {(1, 0): X}
    sy.exterior_derivative(form, [X, Y])
    assert form == {(1, 0): X}
