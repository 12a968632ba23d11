"""Quadrature rules on simplices: exactness against closed-form monomial integrals."""

import itertools
import math
from fractions import Fraction

import numpy as np
import pytest

from wedgepath.calculus.simplex_quadrature import (gm_index_for_degree, grundmann_moller,
                                                   simplex_rule)


def dirichlet(a):
    """Exact integral of prod u_j^{a_j} over the unit k-simplex {u >= 0, sum u <= 1}.

    Dirichlet's integral formula: prod(a_j!) / (sum(a) + k)!.  For the triangle
    this is the familiar a! b! / (a + b + 2)!.  (Classical; stated e.g. in
    A. H. Stroud, "Approximate Calculation of Multiple Integrals", Prentice-Hall
    1971, in the chapter on simplex integration -- formula typed from memory.)
    """
    k = len(a)
    return Fraction(math.prod(math.factorial(x) for x in a), math.factorial(sum(a) + k))


def rule_value(bary, w, a):
    u = bary[:, 1:]
    return float(w @ np.prod(u ** np.array(a, dtype=float), axis=1))


def monomials(k, max_degree):
    for a in itertools.product(range(max_degree + 1), repeat=k):
        if sum(a) <= max_degree:
            yield a


@pytest.mark.parametrize("k", [2, 3])
@pytest.mark.parametrize("s", [0, 1, 2, 3, 4, 5])
def test_grundmann_moller_exact_for_all_monomials_up_to_its_degree(k, s):
    # external check: Dirichlet's formula (see `dirichlet`), triangle k=2, tetrahedron k=3
    bary, w = grundmann_moller(k, s)
    for a in monomials(k, 2 * s + 1):
        exact = float(dirichlet(a))
        assert rule_value(bary, w, a) == pytest.approx(exact, rel=2e-13, abs=1e-16), a


@pytest.mark.parametrize("k", [2, 3])
@pytest.mark.parametrize("s", [0, 1, 2, 3])
def test_grundmann_moller_degree_is_sharp(k, s):
    # The rule is not exact one degree higher for some monomial: its stated degree is
    # 2s+1 and no more (Grundmann & Möller 1978: degree 2s+1 rules).
    bary, w = grundmann_moller(k, s)
    errs = [abs(rule_value(bary, w, a) - float(dirichlet(a)))
            for a in monomials(k, 2 * s + 2) if sum(a) == 2 * s + 2]
    assert max(errs) > 1e-6 * float(dirichlet((2 * s + 2,) + (0,) * (k - 1)))


def test_weights_sum_to_simplex_volume_and_nodes_are_barycentric():
    for k in (1, 2, 3, 4):
        for s in range(4):
            bary, w = grundmann_moller(k, s)
            assert w.sum() == pytest.approx(1 / math.factorial(k), rel=1e-14)
            assert np.allclose(bary.sum(axis=1), 1.0, rtol=0, atol=1e-15)
            assert (bary > 0).all()


def test_degree_three_triangle_rule_matches_the_classical_four_point_rule():
    # The classical degree-3 triangle rule: weight -27/48 (of the area) at the centroid and
    # 25/48 at (3/5, 1/5, 1/5) and its permutations (Hammer, Marlowe & Stroud, "Numerical
    # integration over simplexes and cones", Math. Tables Aids Comput. 10 (1956); values
    # typed from memory).  On the unit triangle (area 1/2) the weights are -27/96, 25/96.
    bary, w = grundmann_moller(2, 1)
    rows = {tuple(np.round(r, 12)): x for r, x in zip(bary, w)}
    assert rows[(round(1 / 3, 12),) * 3] == pytest.approx(-27 / 96, rel=1e-15)
    for perm in set(itertools.permutations((0.6, 0.2, 0.2))):
        assert rows[perm] == pytest.approx(25 / 96, rel=1e-15)
    assert len(rows) == 4


def test_tetrahedron_rule_on_a_physical_tetrahedron():
    # Volume of the tetrahedron with vertices 0, e1, e2, e3 scaled by (2, 3, 5) is 30/6 = 5;
    # the integral of x*y*z over it is 2*3*5 * (2*3*5) * 1!1!1!/6! = 900/720
    # (Dirichlet's formula after the linear change of variables; common practice, no source).
    bary, w = grundmann_moller(3, 1)
    V = np.array([[0, 0, 0], [2, 0, 0], [0, 3, 0], [0, 0, 5]], dtype=float)
    X = bary @ V
    jac = 30.0
    assert jac * w.sum() == pytest.approx(5.0, rel=1e-14)
    assert jac * (w @ (X[:, 0] * X[:, 1] * X[:, 2])) == pytest.approx(900 / 720, rel=1e-13)


def test_simplex_rule_uses_enough_precision():
    for k in (1, 2, 3):
        for deg in range(0, 9):
            bary, w = simplex_rule(k, deg)
            for a in monomials(k, deg):
                assert rule_value(bary, w, a) == pytest.approx(float(dirichlet(a)), rel=1e-12), (k, a)
    assert simplex_rule(1, 3)[0].shape == (2, 2)  # Gauss-Legendre, 2 points for degree 3
    assert gm_index_for_degree(7) == 3


def test_rules_are_read_only():
    bary, w = grundmann_moller(2, 2)
    with pytest.raises(ValueError):
        w[0] = 1.0
    with pytest.raises(ValueError):
        bary[0, 0] = 1.0


@pytest.mark.parametrize("bad, exc", [(-1, ValueError), (1.5, TypeError), (True, TypeError),
                                      ("2", TypeError)])
def test_bad_rule_arguments(bad, exc):
    with pytest.raises(exc):
        grundmann_moller(2, bad)
    with pytest.raises(exc):
        grundmann_moller(bad, 1)


@pytest.mark.parametrize("k, max_degree", [(2, 21), (3, 15), (4, 9)])
def test_simplex_rule_exact_beyond_the_grundmann_moller_switch(k, max_degree):
    # Dirichlet's formula (see `dirichlet`) for every monomial up to degrees where
    # simplex_rule has switched to the conical product rule.  Tolerance: each integrand
    # value is off by about (k degree + 4) eps relative (a node coordinate is a product of
    # up to k rounded factors, raised to the degree), and the rule amplifies that by
    # sum |w| / sum w (1 for positive weights)
    for deg in range(0, max_degree + 1, 2):
        bary, w = simplex_rule(k, deg)
        amp = np.abs(w).sum() / w.sum()
        assert np.allclose(bary.sum(axis=1), 1.0, rtol=0, atol=4e-16)
        assert w.sum() == pytest.approx(1 / math.factorial(k), rel=1e-14)
        for a in monomials(k, deg):
            exact = float(dirichlet(a))
            tol = 2 * (k * deg + 4) * amp * 2.3e-16
            assert rule_value(bary, w, a) == pytest.approx(exact, rel=tol, abs=0), (k, deg, a)


def test_simplex_rule_keeps_rounding_amplification_bounded():
    # sum |w| / sum w is the factor by which a rule amplifies rounding in the integrand;
    # Grundmann-Moller's grows without bound (81 at index 6 on a triangle), simplex_rule
    # keeps it at most 64 (common practice, no source: positive-weight rules have factor 1)
    from wedgepath.calculus.simplex_quadrature import rule_name
    for k in (2, 3, 4):
        for deg in range(0, 40, 3):
            bary, w = simplex_rule(k, deg)
            assert np.abs(w).sum() / w.sum() <= 64.0, (k, deg)
            name = rule_name(k, deg)
            assert name in ("Grundmann-Möller", "conical product")
            if name == "conical product":
                assert (w > 0).all()
    assert grundmann_moller(2, 6)[1].min() < 0          # the factor the switch avoids
    assert np.abs(grundmann_moller(2, 6)[1]).sum() / 0.5 > 64
    assert rule_name(2, 5) == "Grundmann-Möller" and rule_name(2, 13) == "conical product"


@pytest.mark.parametrize("k", [2, 3, 4])
def test_rule_choice_from_closed_form_weights_matches_the_built_rules(k):
    # the choice between Grundmann-Moller and the conical rule is made from the closed form
    # of the weights (no rule built); it must agree with the rules themselves
    from math import factorial
    from wedgepath.calculus import simplex_quadrature as sq
    for s in range(0, 7):
        bary, w = grundmann_moller(k, s)
        amplification = float(np.abs(w).sum() * factorial(k))
        n_conical = 1
        for i in range(1, k + 1):
            n_conical *= sq.points_needed(2 * s + 1 + k - i)
        expect = s == 0 or (amplification <= 64 and bary.shape[0] < n_conical)
        assert sq._prefer_gm(k, s) == expect, (k, s)
