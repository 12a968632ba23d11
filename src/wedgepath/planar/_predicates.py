"""Exact orientation test for many point triples at once.

``orient_sign(ax, ay, bx, by, cx, cy)`` returns the exact sign of the
determinant ``(a - c) x (b - c)``: +1 when ``c`` lies to the left of the
directed line ``a -> b`` (the triple is counter-clockwise), -1 to the right and
0 when the three points are collinear.

Method: the floating-point determinant is accepted when it clears the static
error bound of Shewchuk's ``orient2d`` filter (J. R. Shewchuk, "Adaptive
Precision Floating-Point Arithmetic and Fast Robust Geometric Predicates",
Discrete & Computational Geometry 18 (1997), bound ``ccwerrboundA``, from
memory).  The few uncertain triples are decided exactly: the determinant is
written as six products of input coordinates, each product is split exactly
into two doubles (Dekker's TwoProduct with Veltkamp splitting) and the twelve
doubles are summed into a non-overlapping expansion with Knuth's TwoSum
(Shewchuk's Grow-Expansion); the sign of the largest non-zero component is the
exact sign.  All of it is vectorised over the uncertain triples.

Both stages assume that no product overflows or loses bits to underflow.
Triples where that could happen (a coordinate difference product below
2**-900 or not finite) skip the filter, and triples with a non-zero
coordinate outside [2**-460, 2**460] in magnitude are decided in exact
rational arithmetic (``fractions.Fraction``, one triple at a time; such
triples are rare: a curve that is thin to the last bits of a double next to
coordinates of order one).  So the sign is exact for every finite input.
"""

from __future__ import annotations

from fractions import Fraction

import numpy as np

__all__ = ["orient_sign"]

_EPS = 2.0 ** -53
_CCW_ERRBOUND_A = (3.0 + 16.0 * _EPS) * _EPS
_SPLITTER = 134217729.0  # 2**27 + 1
_TINY = 2.0 ** -900      # products below this may have lost bits to underflow
_SAFE_LO, _SAFE_HI = 2.0 ** -460, 2.0 ** 460   # coordinates the expansion handles exactly


def _two_sum(a, b):
    x = a + b
    bv = x - a
    av = x - bv
    return x, (a - av) + (b - bv)


def _split(a):
    c = _SPLITTER * a
    hi = c - (c - a)
    return hi, a - hi


def _two_prod(a, b):
    x = a * b
    ahi, alo = _split(a)
    bhi, blo = _split(b)
    err = ((x - ahi * bhi) - alo * bhi) - ahi * blo
    return x, alo * blo - err


def _exact_sign(terms) -> np.ndarray:
    """Exact sign of a sum of equally long float arrays (Grow-Expansion)."""
    expansion = [terms[0]]
    for t in terms[1:]:
        q = t
        grown = []
        for comp in expansion:
            q, h = _two_sum(q, comp)
            grown.append(h)
        grown.append(q)
        expansion = grown
    sign = np.zeros(terms[0].shape, dtype=np.int8)
    for comp in reversed(expansion):
        undecided = sign == 0
        if not undecided.any():
            break
        sign[undecided] = np.sign(comp[undecided]).astype(np.int8)
    return sign


def _exact_orient(ax, ay, bx, by, cx, cy) -> np.ndarray:
    # (a - c) x (b - c) = ax*by - ax*cy - cx*by - ay*bx + ay*cx + cy*bx
    terms = []
    for u, v, sgn in ((ax, by, 1.0), (ax, cy, -1.0), (cx, by, -1.0),
                      (ay, bx, -1.0), (ay, cx, 1.0), (cy, bx, 1.0)):
        p, e = _two_prod(u, v)
        terms.append(sgn * p)
        terms.append(sgn * e)
    return _exact_sign(terms)


def _rational_orient(ax, ay, bx, by, cx, cy) -> np.ndarray:
    out = np.zeros(ax.shape, dtype=np.int8)
    for k in range(ax.size):
        fa = [Fraction(float(v[k])) for v in (ax, ay, bx, by, cx, cy)]
        d = (fa[0] - fa[4]) * (fa[3] - fa[5]) - (fa[1] - fa[5]) * (fa[2] - fa[4])
        out[k] = (d > 0) - (d < 0)
    return out


def _in_safe_range(*vs) -> np.ndarray:
    ok = np.ones(vs[0].shape, dtype=bool)
    for v in vs:
        a = np.abs(v)
        ok &= (a == 0) | ((a >= _SAFE_LO) & (a <= _SAFE_HI))
    return ok


def orient_sign(ax, ay, bx, by, cx, cy) -> np.ndarray:
    """Exact sign (int8 array) of the orientation of the triples (a, b, c).

    Examples
    --------
    >>> import numpy as np
    >>> from wedgepath.planar._predicates import orient_sign
    >>> z = np.zeros(3)
    >>> orient_sign(z, z, np.ones(3), np.ones(3), np.array([0.0, 1.0, 2.0]),
    ...             np.array([1.0, 0.0, 2.0])).tolist()
    [1, -1, 0]

    A point one rounding unit off a line far from the origin:

    >>> a = np.array([1e8]); b = np.array([1e8 + 3.0]); c = np.array([1e8 + 1.0])
    >>> orient_sign(a, a, b, b, c, c + 2.0 ** -26).tolist()
    [1]
    """
    ax, ay, bx, by, cx, cy = (np.asarray(v, dtype=np.float64) for v in (ax, ay, bx, by, cx, cy))
    # overflow (to inf, or inf - inf) is possible for huge inputs: such triples go
    # to the exact stage below
    with np.errstate(over="ignore", invalid="ignore"):
        acx, bcx = ax - cx, bx - cx
        acy, bcy = ay - cy, by - cy
        left = acx * bcy
        right = acy * bcx
        det = left - right
        bound = _CCW_ERRBOUND_A * np.abs(left + right)
    finite = np.isfinite(det) & np.isfinite(bound)
    sign = np.sign(np.where(finite, det, 0.0)).astype(np.int8)
    # Certain when the two products differ in sign (or one is exactly zero),
    # or when |det| clears the error bound -- provided no product over- or
    # underflowed (a rounded difference is zero only when the coordinates are
    # equal, so a zero factor is a true zero).
    same = (left > 0) & (right > 0) | (left < 0) & (right < 0)
    unsure = same & (np.abs(det) < bound)
    unsure |= ~finite
    unsure |= (np.abs(left) < _TINY) & (acx != 0) & (bcy != 0)
    unsure |= (np.abs(right) < _TINY) & (acy != 0) & (bcx != 0)
    if unsure.any():
        idx = np.flatnonzero(unsure)
        sub = [v[idx] for v in (ax, ay, bx, by, cx, cy)]
        safe = _in_safe_range(*sub)
        res = np.empty(idx.size, dtype=np.int8)
        if safe.any():
            res[safe] = _exact_orient(*(v[safe] for v in sub))
        if not safe.all():
            res[~safe] = _rational_orient(*(v[~safe] for v in sub))
        sign[idx] = res
    return sign
