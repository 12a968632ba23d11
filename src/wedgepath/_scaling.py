"""Exact rescaling by powers of two: the one place that uses ``frexp``/``ldexp``.

Data of extreme magnitude (values near 1e300 or 1e-300) make products,
squares and sums overflow or underflow although the answer is representable.
Multiplying a channel by a power of two is exact in floating point (the
mantissa is unchanged), so every such computation works on data scaled to
unit size and scales the result back by the right power:

* :func:`pow2_exponents` -- the exponent ``e`` with ``max|x| * 2**-e`` in
  ``[0.5, 1)`` (per lane along an axis, or for the whole array), 0 for an
  all-zero (or all-NaN) lane; with ``safe=s`` only lanes outside
  ``[2**-s, 2**s]`` get an exponent, the others 0 (left alone);
* :func:`pow2_scale` -- ``x * 2**k`` (``k`` broadcast against ``x``), exact
  unless it overflows to inf or falls below the normal range; floating-point
  warnings of that step are silenced (callers check the result).

``tests/test_vocabulary.py`` checks that no other module calls ``frexp`` or
``ldexp``.
"""

from __future__ import annotations

import numpy as np

__all__ = ["pow2_exponents", "pow2_exponent", "pow2_scale"]


def pow2_exponents(x, axis=None, *, safe=None, keepdims=False):
    """Exponents ``e`` (int64) with ``max|x| * 2**-e`` in [0.5, 1), per lane along ``axis``.

    NaN entries are ignored; a lane with no nonzero finite entry gets 0.
    ``safe``: lanes whose largest magnitude lies within ``[2**-safe, 2**safe]``
    get 0 (no rescaling needed).

    Examples
    --------
    >>> import numpy as np
    >>> pow2_exponents(np.array([[1e300, 3.0], [-2e300, 0.0]]), axis=0).tolist()
    [998, 2]
    >>> pow2_exponents(np.array([[1e300, 3.0]]), axis=0, safe=64).tolist()
    [997, 0]
    """
    a = np.abs(np.asarray(x, dtype=np.float64))
    if a.size == 0:
        shape = () if axis is None else np.delete(a.shape, axis)
        return np.zeros(shape, dtype=np.int64)
    with np.errstate(invalid="ignore"):
        big = np.fmax.reduce(a, axis=axis, keepdims=keepdims) if axis is not None else \
            np.fmax.reduce(a.ravel())
    big = np.nan_to_num(big, nan=0.0, posinf=0.0)
    e = np.where(big > 0, np.frexp(big)[1], 0).astype(np.int64)
    if safe is not None:
        inside = (big >= 2.0 ** -safe) & (big <= 2.0 ** safe)
        e = np.where(inside, 0, e)
    return e


def pow2_exponent(x, *, safe=None) -> int:
    """:func:`pow2_exponents` of the whole of ``x`` (or of a list of arrays), as an int."""
    if isinstance(x, (list, tuple)):
        big = max((float(np.nan_to_num(np.fmax.reduce(np.abs(np.ravel(a))), nan=0.0))
                   for a in x if np.size(a)), default=0.0)
        x = np.array([big])
    return int(pow2_exponents(x, safe=safe))


def pow2_scale(x, k):
    """``x * 2**k``, exact unless it overflows or leaves the normal range (no warnings)."""
    with np.errstate(over="ignore", under="ignore", invalid="ignore"):
        return np.ldexp(x, np.asarray(k, dtype=np.int64))
