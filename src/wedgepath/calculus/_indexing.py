"""Index helpers for simplices: checked index arrays, sorting rows, keys, merging.

Simplices are rows of vertex indices; their order is their orientation.  The
helpers here sort short rows with sorting networks (vectorised over rows),
pack sorted rows into order-preserving integer keys for grouping and lookup,
and merge equal simplices up to orientation.  They serve
:mod:`~wedgepath.calculus.simplicial` (chains) and
:mod:`~wedgepath.calculus.complexes` (complexes).
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np

from .._exterior import row_signs
from .._validation import as_coefficients, as_int, checked_sums

__all__ = ["readonly", "as_index_array", "as_chain_coefficients", "sorting_network",
           "sort_columns", "sort_rows", "row_signs", "row_keys", "group_keys", "group_rows",
           "reduce_simplices"]


def readonly(a):
    a.flags.writeable = False
    return a


def as_index_array(simplices, n_vertices, name="simplices"):
    """Checked (S, k+1) int64 copy of a simplex index array."""
    if hasattr(simplices, "to_numpy") and not isinstance(simplices, np.ndarray):
        simplices = simplices.to_numpy()
    try:
        arr = np.asarray(simplices)
    except Exception as exc:
        raise TypeError(f"{name} could not be read as an integer array: {exc}") from None
    if arr.dtype.kind == "b":
        raise TypeError(f"{name} is a boolean array; give vertex indices (integers)")
    if arr.dtype.kind == "O" and arr.size:
        try:
            arr = np.array([as_int(v, f"{name} entry") for v in arr.ravel()],
                           dtype=np.int64).reshape(arr.shape)
        except TypeError as exc:
            raise TypeError(str(exc)) from None
        except OverflowError:
            raise ValueError(f"{name} holds a vertex index beyond int64, but there are "
                             f"{n_vertices} vertices") from None
    elif arr.size == 0 and arr.dtype.kind == "f":
        arr = arr.astype(np.int64)
    elif arr.dtype.kind not in "iu":
        raise TypeError(f"{name} must hold integer vertex indices, got dtype {arr.dtype}")
    if arr.ndim != 2:
        raise ValueError(f"{name} must be 2-dimensional (simplices, k+1), got shape {arr.shape}")
    if arr.shape[1] < 1:
        raise ValueError(f"{name} has 0 columns; a k-simplex has k+1 vertices")
    out = np.array(arr, dtype=np.int64)
    if out.size:
        lo, hi = int(out.min()), int(out.max())
        if lo < 0 or hi >= n_vertices:
            bad = lo if lo < 0 else hi
            raise ValueError(f"{name} refers to vertex {bad} but there are {n_vertices} "
                             f"vertices (valid indices 0..{n_vertices - 1})")
    return out


def as_chain_coefficients(coefficients, S):
    if coefficients is None:
        return np.ones(S, dtype=np.int64)
    if hasattr(coefficients, "to_numpy") and not isinstance(coefficients, np.ndarray):
        coefficients = coefficients.to_numpy()
    if isinstance(coefficients, (bool, np.bool_)):
        raise TypeError("coefficients must be integers, got a boolean")
    if isinstance(coefficients, (int, np.integer)):
        coefficients = [coefficients]
    try:
        arr = np.asarray(coefficients)
    except Exception as exc:
        raise TypeError(f"coefficients could not be read as integers: {exc}") from None
    if arr.dtype.kind == "O":
        arr = as_coefficients([as_int(c, "coefficient") for c in arr.ravel()])
    elif arr.dtype.kind == "b":
        raise TypeError("coefficients must be integers, got booleans")
    elif arr.dtype.kind not in "iu":
        if arr.size == 0 and arr.dtype.kind in "f":
            arr = arr.astype(np.int64)        # an empty float list: no coefficient at all
        else:
            raise TypeError(f"coefficients must be integers (chains have integer "
                            f"coefficients), got dtype {arr.dtype}")
    if arr.ndim != 1:
        raise ValueError(f"coefficients must be 1-dimensional, got shape {arr.shape}")
    if arr.shape[0] != S:
        raise ValueError(f"{arr.shape[0]} coefficients for {S} simplices")
    return as_coefficients(np.array(arr))


_NETWORKS = {1: [], 2: [(0, 1)], 3: [(0, 1), (1, 2), (0, 1)],
             4: [(0, 1), (2, 3), (0, 2), (1, 3), (1, 2)]}


@lru_cache(maxsize=32)
def sorting_network(width):
    """Compare-exchange pairs that sort ``width`` entries.

    Optimal networks for up to 4 entries; beyond, odd-even transposition
    sort: ``width`` rounds of exchanges between neighbours, alternately at
    even and odd positions, sort any input (D. E. Knuth, The Art of Computer
    Programming, vol. 3, 2nd ed., section 5.3.4, from memory).
    """
    if width in _NETWORKS:
        return tuple(_NETWORKS[width])
    return tuple((i, i + 1) for r in range(width) for i in range(r % 2, width - 1, 2))


def sort_columns(cols, *others):
    """Compare-exchange sort across a list of equal-length 1-D arrays (one per position).

    ``others`` are lists of arrays permuted alongside.  The arrays go through
    a sorting network (any length); they are modified only through rebinding
    (the inputs are not written to).
    """
    cols = list(cols)
    others = [list(o) for o in others]
    for a, b in sorting_network(len(cols)):
        swap = cols[a] > cols[b]
        if not swap.any():
            continue
        cols[a], cols[b] = np.where(swap, cols[b], cols[a]), np.where(swap, cols[a], cols[b])
        for oc in others:
            oc[a], oc[b] = np.where(swap, oc[b], oc[a]), np.where(swap, oc[a], oc[b])
    return (cols, *others)


def sort_rows(arr, *others):
    """Sort each (short) row of ``arr``; apply the same permutation to ``others``.

    Rows of up to 4 entries go through a compare-exchange network (linear
    time, much faster than a per-row sort); wider rows use argsort.
    Returns new arrays.
    """
    w = arr.shape[1]
    if w > 4 or w == 0:
        order = np.argsort(arr, axis=1, kind="stable")
        return (np.take_along_axis(arr, order, axis=1),
                *(np.take_along_axis(o, order, axis=1) for o in others))
    res = sort_columns([arr[:, j] for j in range(w)], *[[o[:, j] for j in range(w)]
                                                          for o in others])
    return tuple(np.column_stack(c) for c in res)


def row_keys(sorted_rows, n_vertices):
    """One int64 key per row (rows of vertex indices), or None when they do not fit."""
    w = sorted_rows.shape[1]
    base = max(int(n_vertices), 1)
    if w == 0:
        return np.zeros(sorted_rows.shape[0], dtype=np.int64)
    if base ** w >= 2 ** 62:
        return None
    key = sorted_rows[:, 0].astype(np.int64)
    for j in range(1, w):
        key = key * base + sorted_rows[:, j]
    return key


def group_keys(sorted_rows, n_vertices):
    """Order-preserving int64 keys of rows, for grouping and sorting within one call.

    Like :func:`row_keys`, but when the packed key would overflow, the prefix
    is first replaced by its dense rank (which preserves lexicographic order),
    so the keys always exist.  Keys from different calls are not comparable.
    """
    keys = row_keys(sorted_rows, n_vertices)
    if keys is not None:
        return keys
    base = max(int(n_vertices), 1)
    key = sorted_rows[:, 0].astype(np.int64)
    for j in range(1, sorted_rows.shape[1]):
        if key.size and (int(key.max()) + 1) * base >= 2 ** 62:
            key = np.unique(key, return_inverse=True)[1].ravel().astype(np.int64)
        key = key * base + sorted_rows[:, j]
    return key


def group_rows(sorted_rows, n_vertices):
    """(order, starts): stable sort order of the rows and the start of each group of equal rows."""
    keys = group_keys(sorted_rows, n_vertices)
    order = np.argsort(keys, kind="stable")
    srt = keys[order]
    new = np.ones(len(order), dtype=bool)
    new[1:] = srt[1:] != srt[:-1]
    starts = np.flatnonzero(new)
    return order, starts


def reduce_simplices(simplices, coef, n_vertices):
    """Merge equal simplices (up to orientation), drop zeros and repeated-vertex simplices.

    Keeps the orientation and order of each simplex's first occurrence.
    """
    S, w = simplices.shape
    if S == 0:
        return simplices, coef
    srt = sort_rows(simplices)[0]
    if w > 1:
        ok = (srt[:, 1:] != srt[:, :-1]).all(axis=1)
        if not ok.all():
            simplices, coef, srt = simplices[ok], coef[ok], srt[ok]
        sign = row_signs(simplices)
    else:
        sign = np.ones(simplices.shape[0], dtype=np.int64)
    if simplices.shape[0] == 0:
        return simplices, coef
    order, starts = group_rows(srt, n_vertices)
    signed = (sign * coef)[order]
    sums = checked_sums(signed, starts)
    first = order[starts]  # stable sort: the first occurrence of each group
    # value relative to the first occurrence's orientation
    sums = sums * sign[first]
    keep = sums != 0
    first, sums = first[keep], sums[keep]
    pos = np.argsort(first, kind="stable")
    first, sums = first[pos], sums[pos]
    return simplices[first], sums
