"""Index algebra of exterior forms: permutation signs and the wedge of term tables.

A k-form is a table ``{I: coefficient}`` over increasing index tuples ``I``.
Everything here is about the indices only, so the same code serves the
numeric forms (:mod:`wedgepath.calculus.forms`), the exact oracle
(:mod:`wedgepath.symbolic`) and the simplicial code (orientation of
simplices).  This is a leaf module: it imports nothing from wedgepath, numpy
only for :func:`row_signs`.

* :func:`sort_with_sign` sorts an index tuple and returns the sign of the
  sorting permutation (0 when an index repeats: ``dx_i ^ dx_i = 0``);
* :func:`row_signs` is the same sign for every row of an integer array
  (vectorised; rows of distinct entries);
* :func:`wedge_terms` is the wedge product of two term tables,
  ``(Σ_I a_I dx_I) ^ (Σ_J b_J dx_J) = Σ_{I, J} sign(I J) a_I b_J dx_{sorted(I J)}``,
  with the coefficient arithmetic passed in.
"""

from __future__ import annotations

__all__ = ["sort_with_sign", "row_signs", "wedge_terms"]


def sort_with_sign(idx):
    """``(sorted tuple, sign)`` of an index sequence; ``(None, 0)`` if an index repeats.

    The sign is ``(-1)**inversions``, the sign of the permutation that sorts
    the sequence.

    Examples
    --------
    >>> from wedgepath._exterior import sort_with_sign
    >>> sort_with_sign((2, 0, 1)), sort_with_sign((1, 0)), sort_with_sign((1, 1))
    (((0, 1, 2), 1), ((0, 1), -1), (None, 0))
    """
    idx = tuple(idx)
    if len(set(idx)) != len(idx):
        return None, 0
    inversions = sum(1 for a in range(len(idx)) for b in range(a + 1, len(idx))
                     if idx[a] > idx[b])
    return tuple(sorted(idx)), (-1 if inversions % 2 else 1)


def row_signs(arr):
    """+1/-1 per row of an integer array: the sign of the permutation that sorts the row.

    Rows must hold distinct entries.  Vectorised over rows (``O(width²)``
    comparisons of columns).

    Examples
    --------
    >>> import numpy as np
    >>> from wedgepath._exterior import row_signs
    >>> row_signs(np.array([[0, 1, 2], [1, 0, 2], [2, 0, 1]])).tolist()
    [1, -1, 1]
    """
    import numpy as np

    w = arr.shape[1]
    inv = np.zeros(arr.shape[0], dtype=np.int64)
    for a in range(w):
        for b in range(a + 1, w):
            inv += arr[:, a] > arr[:, b]
    return 1 - 2 * (inv & 1)


def wedge_terms(a: dict, b: dict, product, add) -> dict:
    """The wedge product of two term tables ``{index tuple: coefficient}``.

    Parameters
    ----------
    a, b : dict
        Tables with increasing index tuples (a k-form and an l-form).
    product : callable
        ``product(a_I, b_J, sign) -> coefficient``: the product of two
        coefficients times ``sign`` (+1 or -1).
    add : callable
        ``add(c1, c2) -> coefficient`` for terms that land on the same index.

    Returns
    -------
    dict
        The (k + l)-form's table; index tuples sorted, insertion order of
        first appearance.  Zero coefficients are not removed (the caller's
        arithmetic decides what is zero).

    Examples
    --------
    >>> from wedgepath._exterior import wedge_terms
    >>> mul = lambda x, y, s: s * x * y
    >>> wedge_terms({(0,): 2}, {(1,): 3}, mul, lambda p, q: p + q)
    {(0, 1): 6}
    >>> wedge_terms({(1,): 2}, {(0,): 3}, mul, lambda p, q: p + q)
    {(0, 1): -6}
    >>> wedge_terms({(0,): 1, (1,): 1}, {(0,): 1, (1,): 1}, mul, lambda p, q: p + q)
    {(0, 1): 0}
    """
    out = {}
    for i, ca in a.items():
        for j, cb in b.items():
            idx, sign = sort_with_sign(i + j)
            if sign == 0:
                continue
            c = product(ca, cb, sign)
            out[idx] = add(out[idx], c) if idx in out else c
    return out
