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

The exact stage assumes no overflow or underflow in the products: coordinates
of magnitude between about 1e-140 and 1e140 (or exactly 0) are safe.
"""

from __future__ import annotations

import numpy as np

__all__ = ["orient_sign"]

_EPS = 2.0 ** -53
_CCW_ERRBOUND_A = (3.0 + 16.0 * _EPS) * _EPS
_SPLITTER = 134217729.0  # 2**27 + 1


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
    acx, bcx = ax - cx, bx - cx
    acy, bcy = ay - cy, by - cy
    left = acx * bcy
    right = acy * bcx
    det = left - right
    sign = np.sign(det).astype(np.int8)
    # Certain when the two products differ in sign (or one is exactly zero),
    # or when |det| clears the error bound.
    same = (left > 0) & (right > 0) | (left < 0) & (right < 0)
    unsure = same & (np.abs(det) < _CCW_ERRBOUND_A * np.abs(left + right))
    if unsure.any():
        idx = np.flatnonzero(unsure)
        sign[idx] = _exact_orient(ax[idx], ay[idx], bx[idx], by[idx], cx[idx], cy[idx])
    return sign
