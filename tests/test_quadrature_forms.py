"""Gauss-Legendre rules against printed tables; the algebra of forms."""

import numpy as np
import pytest
import sympy as sp

import wedgepath as wp
from wedgepath.calculus.quadrature import gauss_legendre, points_needed

X, Y, Z = sp.symbols("x y z", real=True)

# Abramowitz & Stegun, Handbook of Mathematical Functions (1964), Table 25.4,
# "Abscissas and weight factors for Gaussian integration" on [-1, 1], positive
# abscissas with their weights, 15 significant digits.  Typed from memory of the
# table; the n = 2 and n = 3 rows are also the closed forms 1/sqrt(3) and
# sqrt(3/5) with weights 1, 5/9 and 8/9, checked separately below.
AS_TABLE_25_4 = {
    2: [(0.577350269189626, 1.000000000000000)],
    3: [(0.000000000000000, 0.888888888888889), (0.774596669241483, 0.555555555555556)],
    4: [(0.339981043584856, 0.652145154862546), (0.861136311594053, 0.347854845137454)],
    5: [(0.000000000000000, 0.568888888888889), (0.538469310105683, 0.478628670499366),
        (0.906179845938664, 0.236926885056189)],
    6: [(0.238619186083197, 0.467913934572691), (0.661209386466265, 0.360761573048139),
        (0.932469514203152, 0.171324492379170)],
}


@pytest.mark.parametrize("n", sorted(AS_TABLE_25_4))
def test_gauss_legendre_against_abramowitz_stegun(n):
    x, w = gauss_legendre(n, (-1.0, 1.0))
    pos = x >= -1e-15
    got = sorted(zip(np.abs(x[pos]).round(15), w[pos]))
    want = sorted(AS_TABLE_25_4[n])
    assert len(got) == len(want)
    for (gx, gw), (tx, tw) in zip(got, want):
        assert gx == pytest.approx(tx, abs=1e-15)
        assert gw == pytest.approx(tw, abs=1e-15)


def test_gauss_legendre_closed_forms():
    # two- and three-point rules in closed form (common practice, no source)
    x, w = gauss_legendre(2, (-1, 1))
    np.testing.assert_allclose(np.sort(x), [-1 / np.sqrt(3), 1 / np.sqrt(3)], rtol=1e-15)
    x, w = gauss_legendre(3, (-1, 1))
    np.testing.assert_allclose(np.sort(x), [-np.sqrt(0.6), 0.0, np.sqrt(0.6)], atol=1e-15)
    np.testing.assert_allclose(w[np.argsort(x)], [5 / 9, 8 / 9, 5 / 9], rtol=1e-14)


@pytest.mark.parametrize("m", range(1, 12))
def test_degree_of_exactness(m):
    # an m-point rule integrates x^k exactly on [0, 1] for k <= 2m - 1
    # (A&S 25.4.29) and not for k = 2m
    x, w = gauss_legendre(m)
    for k in range(2 * m):
        assert w @ x**k == pytest.approx(1 / (k + 1), rel=1e-13)
    assert abs(w @ x ** (2 * m) - 1 / (2 * m + 1)) > 1e-16
    assert points_needed(2 * m - 1) == m


def test_gauss_legendre_bad_order():
    with pytest.raises(ValueError, match="positive integer"):
        gauss_legendre(0)


class TestForms:
    def test_wedge_antisymmetry_and_zero(self):
        assert (wp.dx(0) ^ wp.dx(0)) == 0
        assert (wp.dx(0) ^ wp.dx(1)) == -1.0 * (wp.dx(1) ^ wp.dx(0))
        w = (wp.dx(0) + wp.dx(1)) ^ (wp.dx(0) - wp.dx(1))
        assert w.terms_as_dict() == {(0, 1): -2.0}

    def test_triple_wedge_sign(self):
        w = wp.dx(2) ^ wp.dx(0) ^ wp.dx(1)  # cyclic: even permutation
        assert w.terms_as_dict() == {(0, 1, 2): 1.0}
        assert (wp.dx(1) ^ wp.dx(0) ^ wp.dx(2)).terms_as_dict() == {(0, 1, 2): -1.0}

    def test_sympy_d_matches_hand_computation(self):
        # d(P dx + Q dy) = (Q_x - P_y) dx^dy (Green's integrand; common practice, no source)
        P, Q = X**2 * Y, sp.sin(X) * Y
        w = wp.Form.from_sympy([P, Q], (X, Y))
        dw = w.d().terms_as_dict()
        assert sp.simplify(dw[(0, 1)] - (sp.cos(X) * Y - X**2)) == 0

    def test_mixed_kinds(self):
        f = wp.OneForm([lambda c: c[:, 0], 2.0])
        g = wp.Form.from_sympy([Y, X], (X, Y))
        h = f + g
        assert not h.is_symbolic
        vals = h.component_values(np.array([[1.0, 3.0]]))
        assert vals[(0,)].tolist() == [4.0] and vals[(1,)].tolist() == [3.0]

    def test_two_form_from_matrix(self):
        M = np.array([[0, 2, 0], [-2, 0, 1], [0, -1, 0]], float)
        assert wp.TwoForm(M).terms_as_dict() == {(0, 1): 2.0, (1, 2): 1.0}
        with pytest.raises(ValueError, match="skew-symmetric"):
            wp.TwoForm(np.ones((3, 3)))

    @pytest.mark.parametrize("bad, exc, words", [
        ("x", TypeError, "sequence"),
        ([], ValueError, "at least one"),
        ([object()], TypeError, "real number, a callable or a sympy"),
        ([np.inf], ValueError, "finite"),
        ([True], TypeError, "boolean"),
    ])
    def test_one_form_bad_components(self, bad, exc, words):
        with pytest.raises(exc, match=words):
            wp.OneForm(bad)

    def test_incompatible_forms(self):
        with pytest.raises(ValueError, match="R\\^2 and R\\^3"):
            wp.OneForm([1.0, 2.0]) + wp.OneForm([1.0, 2.0, 3.0])
        with pytest.raises(ValueError, match="1-form and a 2-form"):
            wp.dx(0) + (wp.dx(0) ^ wp.dx(1))
        with pytest.raises(ValueError, match="symbols"):
            wp.Form.from_sympy([X, Y], (X, Y)) + wp.Form.from_sympy([Y, Z], (Y, Z))
        with pytest.raises(ValueError, match="need their coordinate symbols"):
            wp.OneForm([X, Y])
        with pytest.raises(ValueError, match="dx index"):
            wp.dx(-1)
