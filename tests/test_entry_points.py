"""The stable public entry points, called as users call them, with each result checked
against a value computed here independently.

``ENTRY_POINTS`` below is the list (with the methods and attributes users rely on); a renamed
or removed entry point fails here first.  Expected values are closed forms (common practice,
no source) or exact rational arithmetic.
"""

import re
from fractions import Fraction
from pathlib import Path

import numpy as np
import pytest
import sympy as sp

import wedgepath as wp


#: name in ``wedgepath`` -> methods / attributes of it (or of what it returns) that users call
ENTRY_POINTS = {
    "Path": ("plane", "window", "pieces", "reversed", "close"),
    "Chain": ("coefficients", "boundary"),
    "dx": (),
    "OneForm": ("from_sympy",),
    "Form": ("from_sympy", "d"),
    "integrate": (),
    "signed_area": (),
    "winding_number": (),
    "region_integral": (),
    "decompose": (),
    "cone": (),
    "area_matrix": (),
    "cyclic_order": (),
    "rolling_area_matrix": (),
    "AreaAccumulator": ("update", "merge", "result"),
}


def test_entry_points_are_public_and_exercised_here():
    source = Path(__file__).read_text(encoding="utf-8")
    body = source[source.index("def square("):]       # the tests below, not the list above
    for name, members in ENTRY_POINTS.items():
        assert name in wp.__all__, f"wp.{name} is not in wedgepath.__all__"
        obj = getattr(wp, name)
        assert callable(obj), f"wp.{name} is not callable"
        assert re.search(rf"\bwp\.{name}\b", body), f"no test below calls wp.{name}"
        for member in members:
            assert re.search(rf"\.{member}\b", body), f"no test below uses .{member}"
    for member in ("plane", "window", "reversed", "close"):
        assert callable(getattr(wp.Path, member))
    assert isinstance(wp.Path.pieces, property)
    for member in ("update", "merge", "result"):
        assert callable(getattr(wp.AreaAccumulator, member))


def square(n_side=1):
    return np.array([[0, 0], [1, 0], [1, 1], [0, 1]], dtype=float) * n_side


def test_path_and_its_views():
    t = np.array([0.0, 0.5, 2.0, 2.5, 4.0])
    pts = np.array([[0, 0, 1], [1, 0, 2], [np.nan, np.nan, np.nan], [1, 1, 3], [0, 1, 4]])
    p = wp.Path(pts, times=t, names=["a", "b", "c"])
    assert p.plane("a", "b").points.shape == (5, 2)
    assert list(p.plane(0, 2).names) == ["a", "c"]
    w = p.window(0.4, 2.6)
    assert np.allclose(w.times, [0.5, 2.0, 2.5], equal_nan=True)
    assert [len(q.points) for q in p.pieces] == [2, 2]
    assert np.array_equal(p.reversed().points[0], pts[-1])
    closed = wp.Path(square()).close("chord")
    assert np.array_equal(closed.points[-1], closed.points[0])


def test_chain_boundary_and_linearity():
    p = wp.Path([[0, 0], [1, 0], [1, 1]])
    q = wp.Path([[0, 0], [0, 1], [1, 1]])
    c = wp.Chain([(p, 1), (q, -1)])
    assert list(c.coefficients) == [1, -1]
    # the two paths share both end points: the boundary cancels
    b = c.boundary()
    assert all(v == 0 for v in b.coefficients)
    # linearity: integral over the chain = difference of the two integrals
    w = wp.OneForm([lambda z: -z[:, 1], lambda z: z[:, 0]])
    assert float(wp.integrate(w, c)) == pytest.approx(
        float(wp.integrate(w, p)) - float(wp.integrate(w, q)), abs=1e-12)


def test_forms_wedge_from_sympy_and_d():
    assert (wp.dx(0) ^ wp.dx(0)).terms_as_dict() == {}
    assert (wp.dx(1) ^ wp.dx(0)).terms_as_dict() == {(0, 1): -1.0}
    x, y = sp.symbols("x y")
    w = wp.OneForm.from_sympy([-y, x], [x, y])
    assert w.d().terms_as_dict() == {(0, 1): 2.0}
    # d(d(f)) == 0 for a 0-form
    f = wp.Form.from_sympy(sp.sin(x) * y ** 3, [x, y])
    assert f.d().d().terms_as_dict() == {}


def test_integrate_and_signed_area_of_a_polygon():
    # the square traced counter-clockwise: area 1, exactly
    r = wp.integrate(wp.dx(0) ^ wp.dx(1), square())
    assert float(r) == 1.0 and r.error == 0.0 and r.exact
    assert wp.signed_area(square(), closure="chord") == 1.0
    assert wp.signed_area(square()[::-1]) == -1.0


def test_winding_region_integral_and_decompose():
    sq = square(2)
    w = wp.winding_number(np.r_[sq, sq], [[1.0, 1.0], [3.0, 3.0]])
    assert w.dtype.kind == "i" and w.tolist() == [2, 0]
    x, y = sp.symbols("x y")
    # ∬ x y over [0, 2]^2 = (2^2 / 2)^2 = 4
    assert float(wp.region_integral(x * y, sq, symbols=(x, y))) == pytest.approx(4.0, abs=1e-13)
    assert float(wp.region_integral(lambda a, b: a * b, sq)) == pytest.approx(4.0, rel=1e-10)
    eight = np.array([[0, 0], [1, 1], [2, 0], [1, -1], [0, 0], [-1, 1], [-2, 0], [-1, -1]],
                     dtype=float)
    d = wp.decompose(eight)
    assert d.signed_area == pytest.approx(0.0, abs=1e-12)
    assert d.absolute_area == pytest.approx(4.0)
    assert sorted(lb.signed_area for lb in d.lobes) == pytest.approx([-2.0, 2.0])
    assert sum(d.area_by_winding.values()) == pytest.approx(4.0)


def test_cone_boundary_is_the_closed_path():
    P = np.array([[0, 0, 0], [1, 0, 0], [1, 1, 1], [0, 1, 0]], dtype=float)
    S = wp.cone(P)
    # the boundary of the cone is the closed path: its integral of x0 dx1 equals the path's
    x0dx1 = wp.OneForm([lambda z: np.zeros(len(z)), lambda z: z[:, 0], lambda z: np.zeros(len(z))])
    along = wp.integrate(x0dx1, wp.Path(np.r_[P, P[:1]]))
    assert float(wp.integrate(wp.dx(0) ^ wp.dx(1), S)) == pytest.approx(float(along), abs=1e-12)


def test_area_matrix_cyclic_order_rolling_and_accumulator():
    # x_i = sin(t - i phi) over whole cycles: A[i, i+1] = (N/2) sin(2 pi / N) sin(phi) per cycle
    N, cycles, phi = 400, 3, 0.7
    t = 2 * np.pi * np.arange(N * cycles) / N
    X = np.column_stack([np.sin(t - k * phi) for k in range(4)])
    A = wp.area_matrix(X)
    expected = cycles * (N / 2) * np.sin(2 * np.pi / N) * np.sin(phi)
    assert A[0, 1] == pytest.approx(expected, rel=1e-9)
    assert np.allclose(A, -A.values.T)
    co = wp.cyclic_order(A)
    k = list(co.order).index(0)
    assert list(co.order[k:]) + list(co.order[:k]) == [0, 1, 2, 3]
    R = wp.rolling_area_matrix(X, 400, 200)
    assert np.asarray(R).shape == (5, 4, 4)
    assert np.asarray(R)[0][0, 1] == pytest.approx(wp.area_matrix(X[:400])[0, 1], rel=1e-10)
    left, right = wp.AreaAccumulator(4), wp.AreaAccumulator(4)
    left.update(X[:700])
    right.update(X[700:])
    assert np.allclose(left.merge(right).result(), A, rtol=1e-12, atol=1e-12)


def test_exact_reference_by_rational_shoelace():
    rng = np.random.default_rng(5)
    P = rng.integers(-1000, 1000, size=(50, 2)).astype(float) / 64.0
    F = [(Fraction(a), Fraction(b)) for a, b in P]
    exact = sum(F[k][0] * F[(k + 1) % 50][1] - F[(k + 1) % 50][0] * F[k][1]
                for k in range(50)) / 2
    # rounding: within a few eps of the sum of the shoelace terms' magnitudes
    S = sum(abs(F[k][0] * F[(k + 1) % 50][1]) + abs(F[(k + 1) % 50][0] * F[k][1])
            for k in range(50))
    assert abs(Fraction(wp.signed_area(P)) - exact) <= 4 * Fraction(2.0 ** -52) * S
