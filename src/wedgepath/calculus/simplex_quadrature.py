"""Quadrature rules on simplices.

Rules are given in barycentric coordinates on the standard k-simplex
``{u_j >= 0, sum u_j <= 1}`` (volume ``1/k!``): a rule is a pair ``(bary,
weights)`` with ``bary`` of shape ``(q, k + 1)`` (each row sums to 1) and
``weights`` of shape ``(q,)`` summing to ``1/k!``.  On an affine simplex with
vertices ``v_0 .. v_k`` the nodes are ``bary @ V`` and the weights are scaled
by ``k!`` times the simplex's k-volume (or, for forms, by the determinant of
the pull-back, see :mod:`wedgepath.calculus.simplicial`).

``grundmann_moller(k, s)``
    The Grundmann-Möller rule of index ``s``, exact for polynomials of total
    degree ``2 s + 1`` on a k-simplex of any dimension (A. Grundmann and
    H. M. Möller, "Invariant integration formulas for the n-simplex by
    combinatorial methods", SIAM J. Numer. Anal. 15 (1978) 282-290).  Its
    weights alternate in sign for ``s >= 1``: ``sum |w| / sum w`` is 18 at
    ``s = 4`` and 2e5 at ``s = 17`` on triangles, and rounding in the integrand
    is amplified by that factor.
``simplex_rule(k, degree)``
    The rule used by the library to integrate a polynomial of ``degree``
    exactly: a single point for k = 0, Gauss-Legendre for k = 1 (positive
    weights, fewest points), Grundmann-Möller for k >= 2 while its
    alternating weights amplify rounding little, a conical product rule
    (positive weights) beyond.

Examples
--------
>>> from wedgepath.calculus.simplex_quadrature import grundmann_moller
>>> bary, w = grundmann_moller(2, 1)          # degree 3 on a triangle
>>> bary.shape, float(w.sum())                # weights sum to the area 1/2
((4, 3), 0.5)
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from math import ceil, comb, factorial

import numpy as np

from .quadrature import gauss_legendre, points_needed

__all__ = ["grundmann_moller", "simplex_rule", "gm_index_for_degree", "rule_name"]


def _compositions(total: int, parts: int):
    """All tuples of ``parts`` non-negative integers summing to ``total``."""
    if parts == 1:
        yield (total,)
        return
    for first in range(total, -1, -1):
        for rest in _compositions(total - first, parts - 1):
            yield (first,) + rest


def _check_nonneg_int(value, name):
    if isinstance(value, (bool, np.bool_)) or not isinstance(value, (int, np.integer)):
        raise TypeError(f"{name} must be an integer, got {value!r}")
    if value < 0:
        raise ValueError(f"{name} must be >= 0, got {value}")
    return int(value)


@lru_cache(maxsize=128)
def _gm(k: int, s: int):
    d = 2 * s + 1
    rows, weights = [], []
    for i in range(s + 1):
        denom = d + k - 2 * i
        w = Fraction((-1) ** i * denom ** d, 2 ** (2 * s) * factorial(i) * factorial(d + k - i))
        for beta in _compositions(s - i, k + 1):
            rows.append([Fraction(2 * b + 1, denom) for b in beta])
            weights.append(w)
    bary = np.array([[float(x) for x in r] for r in rows], dtype=np.float64)
    wts = np.array([float(w) for w in weights], dtype=np.float64)
    bary.flags.writeable = False
    wts.flags.writeable = False
    return bary, wts


def grundmann_moller(k, s):
    """The Grundmann-Möller rule of index ``s`` on the standard k-simplex.

    Exact for polynomials of total degree ``2 s + 1``.  Weights are computed
    in exact rational arithmetic and rounded once to float64.

    Parameters
    ----------
    k : int
        Dimension of the simplex (k >= 1; k = 0 gives the single point).
    s : int
        Index of the rule (s >= 0); degree ``2 s + 1``.

    Returns
    -------
    bary : ndarray, shape (q, k + 1)
        Barycentric coordinates of the nodes (read-only).
    weights : ndarray, shape (q,)
        Weights for the standard simplex (sum ``1/k!``; read-only).

    Examples
    --------
    >>> from wedgepath.calculus.simplex_quadrature import grundmann_moller
    >>> bary, w = grundmann_moller(2, 0)          # the centroid rule
    >>> bary.round(4).tolist(), w.tolist()
    ([[0.3333, 0.3333, 0.3333]], [0.5])
    >>> grundmann_moller(3, 2)[0].shape           # degree 5 on a tetrahedron
    (15, 4)
    """
    k = _check_nonneg_int(k, "simplex dimension k")
    s = _check_nonneg_int(s, "rule index s")
    if k == 0:
        return _point_rule()
    return _gm(k, s)


#: Grundmann-Moller weights alternate in sign and sum |w| / sum w, the factor by which they
#: amplify rounding in the integrand, grows about two-fold per index (18 at s = 4, 81 at
#: s = 6, 2e5 at s = 17 on triangles).  A Grundmann-Moller rule is used only while that factor
#: stays at or below this bound and the rule has fewer nodes than the conical product rule of
#: the same degree (whose weights are positive); otherwise the conical rule is used.
_GM_MAX_AMPLIFICATION = 64.0


@lru_cache(maxsize=128)
def _prefer_gm(k: int, s: int) -> bool:
    """Whether the Grundmann-Moller rule of index ``s`` is the better rule on a k-simplex.

    Decided from the closed form of the weights, without building the rule: the weight of
    the nodes of level i is ``(-1)^i (d + k - 2i)^d / (2^(2s) i! (d + k - i)!)`` (d = 2s + 1),
    shared by the ``C(s - i + k, k)`` nodes of that level (Grundmann and Möller 1978).
    """
    if s == 0:
        return True                                   # the centroid rule: one positive weight
    d = 2 * s + 1
    total_abs, nodes = Fraction(0), 0
    for i in range(s + 1):
        count = comb(s - i + k, k)
        nodes += count
        total_abs += count * Fraction((d + k - 2 * i) ** d,
                                      2 ** (2 * s) * factorial(i) * factorial(d + k - i))
    amplification = float(total_abs * factorial(k))   # the weights sum to 1 / k!
    n_conical = 1
    for i in range(1, k + 1):
        n_conical *= points_needed(2 * s + 1 + k - i)
    return amplification <= _GM_MAX_AMPLIFICATION and nodes < n_conical


def _rule_for_index(k: int, s: int):
    return _gm(k, s) if _prefer_gm(k, s) else _conical(k, 2 * s + 1)


def rule_name(k: int, degree: int) -> str:
    """Name of the rule :func:`simplex_rule` uses for ``(k, degree)`` (for result labels)."""
    if k == 0:
        return "point evaluation"
    if k == 1:
        return "Gauss-Legendre"
    return "Grundmann-Möller" if _prefer_gm(k, gm_index_for_degree(degree)) else "conical product"


@lru_cache(maxsize=32)
def _conical(k: int, degree: int):
    """Conical product rule on the standard k-simplex, exact for ``degree``, positive weights.

    Collapsed (Duffy) coordinates ``x_1 = t_1``, ``x_i = t_i prod_{j<i} (1 - t_j)`` map the
    unit cube onto the simplex with Jacobian ``prod_i (1 - t_i)^(k - i)``; a polynomial of
    degree d becomes one of degree ``d + k - i`` in ``t_i``, integrated exactly by
    Gauss-Legendre in each coordinate (A. H. Stroud, Approximate Calculation of Multiple
    Integrals, Prentice-Hall 1971, section 2.6, from memory).
    """
    grids, wts = [], []
    for i in range(1, k + 1):
        t, w = gauss_legendre(points_needed(degree + k - i))
        grids.append(t)
        wts.append(w * (1.0 - t) ** (k - i))
    T = np.stack(np.meshgrid(*grids, indexing="ij"), axis=-1).reshape(-1, k)
    W = np.prod(np.stack(np.meshgrid(*wts, indexing="ij"), axis=-1).reshape(-1, k), axis=1)
    X = np.empty_like(T)
    rest = np.ones(T.shape[0])
    for i in range(k):
        X[:, i] = T[:, i] * rest
        rest = rest * (1.0 - T[:, i])
    bary = np.column_stack([rest, X])
    bary.flags.writeable = False
    W.flags.writeable = False
    return bary, W


@lru_cache(maxsize=1)
def _point_rule():
    bary = np.ones((1, 1))
    w = np.ones(1)
    bary.flags.writeable = False
    w.flags.writeable = False
    return bary, w


@lru_cache(maxsize=128)
def _gl_bary(m: int):
    x, w = gauss_legendre(m)
    bary = np.column_stack([1.0 - x, x])
    bary.flags.writeable = False
    w = np.array(w)
    w.flags.writeable = False
    return bary, w


def gm_index_for_degree(degree: int) -> int:
    """Smallest Grundmann-Möller index ``s`` with ``2 s + 1 >= degree``.

    Examples
    --------
    >>> from wedgepath.calculus.simplex_quadrature import gm_index_for_degree
    >>> [gm_index_for_degree(d) for d in range(6)]
    [0, 0, 1, 1, 2, 2]
    """
    degree = _check_nonneg_int(degree, "degree")
    return max(0, ceil((degree - 1) / 2))


def simplex_rule(k, degree):
    """A rule on the standard k-simplex exact for polynomials of ``degree``.

    k = 0: the point itself; k = 1: Gauss-Legendre with ``ceil((degree+1)/2)``
    points; k >= 2: Grundmann-Möller of index ``s = ceil((degree-1)/2)`` while
    its alternating weights amplify rounding by at most 64 (``sum |w| / sum w``)
    and it has fewer nodes than the conical product rule of degree ``2 s + 1``;
    that positive-weight rule otherwise (on triangles from degree 7 on, on
    tetrahedra from degree 13 on).

    Returns
    -------
    bary : ndarray, shape (q, k + 1)
    weights : ndarray, shape (q,), summing to ``1/k!``

    Examples
    --------
    >>> from wedgepath.calculus.simplex_quadrature import simplex_rule
    >>> simplex_rule(1, 3)[0].shape, simplex_rule(2, 3)[0].shape
    ((2, 2), (4, 3))
    """
    k = _check_nonneg_int(k, "simplex dimension k")
    degree = _check_nonneg_int(degree, "degree")
    if k == 0:
        return _point_rule()
    if k == 1:
        return _gl_bary(points_needed(degree))
    return _rule_for_index(k, gm_index_for_degree(degree))
