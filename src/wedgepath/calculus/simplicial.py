"""Simplicial chains in R^n, the cone over a closed path, and integration over them.

A simplicial k-chain is an integer combination of oriented affine k-simplices
in R^n, stored as a vertex array ``(V, n)``, a simplex index array ``(S, k+1)``
and integer coefficients ``(S,)``.  The order of a simplex's vertices is its
orientation: an odd permutation of them flips the sign.  The simplex with
vertices ``v_0 .. v_k`` is parametrised over the standard simplex by
``phi(u) = v_0 + sum_j u_j (v_j - v_0)``, the same convention as
:func:`wedgepath.symbolic.form_on_simplex`.

Chains are geometric objects: two chains are equal when they are the same
integer combination of simplices identified by their vertex *coordinates*
(a simplex with a repeated vertex is zero).  The boundary is computed on the
index representation, exactly, and ``c.boundary().boundary()`` is zero.

:func:`cone` builds the 2-chain of triangles from an apex to each segment of a
closed path; its boundary is the closed path, so by Stokes's theorem
``integrate(w.d(), cone(p)) == integrate(w, cone(p).boundary())`` and, for the
constant 2-form ``dx_i ^ dx_j``, the integral over the cone is the oriented
area ``A[i, j] = (1/2) closed integral of (x_i dx_j - x_j dx_i)``.

Integration (``wp.integrate(form, chain)``):

==========================  ===============================================  =========
form                        method                                           error
==========================  ===============================================  =========
constant k-form             sum of determinants ``c_I det(J[I, :]) / k!``    exact
polynomial coefficients     Grundmann-Möller rule of degree >= the           exact
                            polynomial degree, a conical product rule for
                            high degrees (Gauss-Legendre for k = 1)
other coefficients          two rules of consecutive degree on every         estimate
                            simplex; simplices bisected at their longest
                            edge until the estimate meets the tolerance
0-form on a 0-chain         point evaluation                                 exact
==========================  ===============================================  =========
"""

from __future__ import annotations

import warnings
from itertools import combinations
from math import factorial

import numpy as np

from .._validation import (as_coefficients, as_float_array, as_int, check_choice, checked_sums,
                           scaled_coefficients)
from .chains import Chain, ZeroChain
from .forms import Form
from .integrate import _EPS, _NOISE, IntegrationWarning, _Acc, register_domain
from .paths import CLOSURES, Path, as_path
from .simplex_quadrature import rule_name, rule_pair, simplex_rule

__all__ = ["SimplicialChain", "cone"]

#: quadrature points evaluated per chunk (bounds the temporaries' memory)
_CHUNK_POINTS = 1 << 18
#: refinement stops (with an IntegrationWarning) after this many coefficient evaluations,
#: or 8 times those of the first pass: bounded time for integrands that never settle
_MAX_EVALUATIONS = 1 << 25


def _readonly(a):
    a.flags.writeable = False
    return a


def _as_index_array(simplices, n_vertices, name="simplices"):
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


def _as_coefficients(coefficients, S):
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
        if arr.size == 0:
            arr = arr.astype(np.int64)
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


def _network(width):
    """Compare-exchange pairs that sort ``width`` entries.

    Optimal networks for up to 4 entries; beyond, odd-even transposition
    sort: ``width`` rounds of exchanges between neighbours, alternately at
    even and odd positions, sort any input (D. E. Knuth, The Art of Computer
    Programming, vol. 3, 2nd ed., section 5.3.4, from memory).
    """
    if width in _NETWORKS:
        return _NETWORKS[width]
    return [(i, i + 1) for r in range(width) for i in range(r % 2, width - 1, 2)]


def _sort_columns(cols, *others):
    """Compare-exchange sort across a list of equal-length 1-D arrays (one per position).

    ``others`` are lists of arrays permuted alongside.  The arrays go through
    a sorting network (any length); they are modified only through rebinding
    (the inputs are not written to).
    """
    cols = list(cols)
    others = [list(o) for o in others]
    for a, b in _network(len(cols)):
        swap = cols[a] > cols[b]
        if not swap.any():
            continue
        cols[a], cols[b] = np.where(swap, cols[b], cols[a]), np.where(swap, cols[a], cols[b])
        for oc in others:
            oc[a], oc[b] = np.where(swap, oc[b], oc[a]), np.where(swap, oc[a], oc[b])
    return (cols, *others)


def _sort_rows(arr, *others):
    """Sort each (short) row of ``arr``; apply the same permutation to ``others``.

    Rows of up to 4 entries go through a compare-exchange network (linear
    time, much faster than a per-row sort); wider rows use argsort.
    Returns new arrays.
    """
    w = arr.shape[1]
    if w not in _NETWORKS or w == 0:
        order = np.argsort(arr, axis=1, kind="stable")
        return (np.take_along_axis(arr, order, axis=1),
                *(np.take_along_axis(o, order, axis=1) for o in others))
    res = _sort_columns([arr[:, j] for j in range(w)], *[[o[:, j] for j in range(w)]
                                                          for o in others])
    return tuple(np.column_stack(c) for c in res)


def _permutation_parity(arr):
    """+1/-1 per row: the sign of the permutation that sorts the row (distinct entries)."""
    w = arr.shape[1]
    inv = np.zeros(arr.shape[0], dtype=np.int64)
    for a in range(w):
        for b in range(a + 1, w):
            inv += arr[:, a] > arr[:, b]
    return 1 - 2 * (inv & 1)


def _row_keys(sorted_rows, n_vertices):
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


def _group_keys(sorted_rows, n_vertices):
    """Order-preserving int64 keys of rows, for grouping and sorting within one call.

    Like :func:`_row_keys`, but when the packed key would overflow, the prefix
    is first replaced by its dense rank (which preserves lexicographic order),
    so the keys always exist.  Keys from different calls are not comparable.
    """
    keys = _row_keys(sorted_rows, n_vertices)
    if keys is not None:
        return keys
    base = max(int(n_vertices), 1)
    key = sorted_rows[:, 0].astype(np.int64)
    for j in range(1, sorted_rows.shape[1]):
        if key.size and (int(key.max()) + 1) * base >= 2 ** 62:
            key = np.unique(key, return_inverse=True)[1].ravel().astype(np.int64)
        key = key * base + sorted_rows[:, j]
    return key


def _group(sorted_rows, n_vertices):
    """(order, starts): stable sort order of the rows and the start of each group of equal rows."""
    keys = _group_keys(sorted_rows, n_vertices)
    order = np.argsort(keys, kind="stable")
    srt = keys[order]
    new = np.ones(len(order), dtype=bool)
    new[1:] = srt[1:] != srt[:-1]
    starts = np.flatnonzero(new)
    return order, starts


def _reduce(simplices, coef, n_vertices):
    """Merge equal simplices (up to orientation), drop zeros and repeated-vertex simplices.

    Keeps the orientation and order of each simplex's first occurrence.
    """
    S, w = simplices.shape
    if S == 0:
        return simplices, coef
    srt = _sort_rows(simplices)[0]
    if w > 1:
        ok = (srt[:, 1:] != srt[:, :-1]).all(axis=1)
        if not ok.all():
            simplices, coef, srt = simplices[ok], coef[ok], srt[ok]
        sign = _permutation_parity(simplices)
    else:
        sign = np.ones(simplices.shape[0], dtype=np.int64)
    if simplices.shape[0] == 0:
        return simplices, coef
    order, starts = _group(srt, n_vertices)
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


class SimplicialChain:
    """An integer combination of oriented affine k-simplices in R^n.

    Parameters
    ----------
    vertices : array_like, shape (V, n)
        Vertex coordinates (finite; copied to read-only float64).
    simplices : array_like of int, shape (S, k + 1)
        Vertex indices of each simplex; the order is the orientation.  A
        simplex may repeat a vertex or have zero volume: it then integrates
        to 0 (no warning).
    coefficients : array_like of int, shape (S,), optional
        Integer coefficients (default all 1).  Floats are refused.

    Attributes
    ----------
    vertices, simplices, coefficients : read-only arrays
    degree : int
        k.
    dim : int
        n.

    Notes
    -----
    The arrays are kept as given (no merging): ``cone(p).simplices`` shows
    the documented triangles.  :meth:`reduced` merges equal simplices.
    ``==`` compares chains geometrically (by vertex coordinates, up to
    orientation and merging), and also accepts a :class:`Path`,
    :class:`Chain` or :class:`ZeroChain`.

    Examples
    --------
    >>> import wedgepath as wp
    >>> tri = wp.SimplicialChain([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
    >>> tri.degree, tri.dim, len(tri)
    (2, 2, 1)
    >>> tri.boundary().simplices.tolist(), tri.boundary().coefficients.tolist()
    ([[1, 2], [0, 2], [0, 1]], [1, -1, 1])
    >>> tri.boundary().boundary().is_zero()
    True
    >>> float(wp.integrate(wp.dx(0) ^ wp.dx(1), tri))
    0.5
    >>> tri.boundary() == wp.Path([[0, 0], [1, 0], [0, 1], [0, 0]])
    True
    """

    __slots__ = ("_vertices", "_simplices", "_coef")

    def __init__(self, vertices, simplices, coefficients=None):
        verts = as_float_array(vertices, "vertices", ndim=2)
        if verts.shape[1] == 0:
            raise ValueError("vertices has no coordinates (shape has 0 columns)")
        simp = _as_index_array(simplices, verts.shape[0])
        k = simp.shape[1] - 1
        if k > verts.shape[1]:
            raise ValueError(f"a {k}-simplex ({k + 1} vertices per row) does not fit in "
                             f"R^{verts.shape[1]}")
        coef = _as_coefficients(coefficients, simp.shape[0])
        self._vertices = _readonly(verts)
        self._simplices = _readonly(simp)
        self._coef = _readonly(coef)

    @classmethod
    def _trusted(cls, vertices, simplices, coefficients):
        self = object.__new__(cls)
        for a in (vertices, simplices, coefficients):
            if a.flags.writeable:
                a.flags.writeable = False
        self._vertices = vertices
        self._simplices = simplices
        self._coef = coefficients
        return self

    # ---------------------------------------------------------------- views
    @property
    def vertices(self) -> np.ndarray:
        """Vertex coordinates, shape (V, n), read-only."""
        return self._vertices

    @property
    def simplices(self) -> np.ndarray:
        """Vertex indices, shape (S, k + 1), read-only int64."""
        return self._simplices

    @property
    def coefficients(self) -> np.ndarray:
        """Integer coefficients, shape (S,), read-only int64."""
        return self._coef

    @property
    def degree(self) -> int:
        """k, the dimension of the simplices."""
        return self._simplices.shape[1] - 1

    @property
    def dim(self) -> int:
        """n, the dimension of the ambient space."""
        return self._vertices.shape[1]

    def __len__(self) -> int:
        return self._simplices.shape[0]

    def __repr__(self) -> str:
        return (f"SimplicialChain(degree={self.degree}, {len(self)} simplices, "
                f"{self._vertices.shape[0]} vertices in R^{self.dim})")

    def simplex_vertices(self) -> np.ndarray:
        """Coordinates of every simplex's vertices, shape (S, k + 1, n) (a new array)."""
        return self._vertices[self._simplices]

    # ------------------------------------------------------------- algebra
    def reduced(self, merge_vertices: bool = False) -> "SimplicialChain":
        """The same chain with equal simplices merged and zero terms dropped.

        Simplices with a repeated vertex index are zero and dropped.  The
        first occurrence of each simplex keeps its orientation and position.
        With ``merge_vertices`` vertices of equal coordinates are identified
        first (the vertex array is then reduced to its distinct rows).

        Examples
        --------
        >>> import wedgepath as wp
        >>> c = wp.SimplicialChain([[0.0], [1.0]], [[0, 1], [1, 0], [0, 1], [1, 1]], [1, 1, 1, 5])
        >>> r = c.reduced()
        >>> r.simplices.tolist(), r.coefficients.tolist()
        ([[0, 1]], [1])
        """
        verts, simp = self._vertices, self._simplices
        if merge_vertices and verts.shape[0]:
            uniq, first, inv = np.unique(verts, axis=0, return_index=True, return_inverse=True)
            inv = inv.ravel()
            # number the distinct vertices in order of first appearance
            rank = np.empty(len(first), dtype=np.int64)
            rank[np.argsort(first, kind="stable")] = np.arange(len(first))
            verts = np.array(uniq[np.argsort(rank)])
            simp = rank[inv][simp]
        s, c = _reduce(simp, self._coef, verts.shape[0])
        return SimplicialChain._trusted(verts if verts is self._vertices else _readonly(verts),
                                        np.ascontiguousarray(s), np.array(c, dtype=np.int64))

    def is_zero(self) -> bool:
        """True when the chain is zero (geometrically: after merging equal vertices)."""
        if self._coef.size == 0 or not self._coef.any():
            return True
        return len(self.reduced(merge_vertices=True)) == 0

    def boundary(self):
        """The boundary (k-1)-chain, exact; for a 0-chain the integer 0.

        ``∂[v_0, ..., v_k] = sum_i (-1)^i [v_0, ..., v_i omitted, ..., v_k]``,
        summed with the coefficients and reduced (equal faces merged).  Faces
        are listed in order of first appearance (all faces opposite vertex 0
        first), so the boundary of a :func:`cone` lists the path's segments
        first, in order.  The result shares this chain's vertex array.
        """
        k = self.degree
        if k == 0:
            return 0
        S = len(self)
        faces, coefs = [], []
        for i in range(k + 1):
            cols = [j for j in range(k + 1) if j != i]
            faces.append(self._simplices[:, cols])
            coefs.append(self._coef if i % 2 == 0 else -self._coef)
        if S:
            F = np.concatenate(faces)
            C = np.concatenate(coefs)
        else:
            F = np.zeros((0, k), dtype=np.int64)
            C = np.zeros(0, dtype=np.int64)
        s, c = _reduce(F, C, self._vertices.shape[0])
        return SimplicialChain._trusted(self._vertices, np.ascontiguousarray(s),
                                        np.array(c, dtype=np.int64))

    def _combine(self, other, sign):
        o = _coerce_chain(other)
        if o is None:
            return NotImplemented
        if o.degree != self.degree:
            raise ValueError(f"cannot add a {self.degree}-chain and a {o.degree}-chain")
        if o.dim != self.dim:
            raise ValueError(f"cannot add chains in R^{self.dim} and R^{o.dim}")
        if o._vertices is self._vertices:
            verts, osimp = self._vertices, o._simplices
        else:
            verts = np.concatenate([self._vertices, o._vertices])
            osimp = o._simplices + self._vertices.shape[0]
        simp = np.concatenate([self._simplices, osimp])
        coef = np.concatenate([self._coef, sign * o._coef])
        return SimplicialChain._trusted(verts, simp, coef)

    def __add__(self, other):
        return self._combine(other, 1)

    def __radd__(self, other):
        if isinstance(other, (int, np.integer)) and not isinstance(other, bool) and other == 0:
            return self
        o = _coerce_chain(other)
        if o is None:
            return NotImplemented
        return o._combine(self, 1)

    def __sub__(self, other):
        return self._combine(other, -1)

    def __rsub__(self, other):
        o = _coerce_chain(other)
        if o is None:
            return NotImplemented
        return o._combine(self, -1)

    def __neg__(self):
        return SimplicialChain._trusted(self._vertices, self._simplices, -self._coef)

    def __mul__(self, k):
        k = as_int(k, "chain multiplier")
        return SimplicialChain._trusted(self._vertices, self._simplices,
                                        scaled_coefficients(self._coef, k))

    __rmul__ = __mul__

    def __eq__(self, other):
        if isinstance(other, (int, np.integer)) and not isinstance(other, bool) and other == 0:
            return self.is_zero()
        o = _coerce_chain(other)
        if o is None:
            return NotImplemented
        if o.degree != self.degree or o.dim != self.dim:
            return False
        return self._combine(o, -1).is_zero()

    __hash__ = None

    # ---------------------------------------------------------- conversions
    @classmethod
    def from_chain(cls, chain, closure="none") -> "SimplicialChain":
        """The simplicial chain of a :class:`Path`, :class:`Chain` or :class:`ZeroChain`.

        A path becomes the 1-chain of its segments (each gap-free piece on its
        own; ``closure`` closes each piece first, see :meth:`Path.close`).  A
        chain of paths adds those with its coefficients; a 0-chain becomes a
        0-chain of its points.

        Examples
        --------
        >>> import wedgepath as wp
        >>> c = wp.SimplicialChain.from_chain(wp.Path([[0, 0], [1, 0], [1, 1]]), closure="chord")
        >>> c.simplices.tolist(), c.coefficients.tolist()
        ([[0, 1], [1, 2], [2, 0]], [1, 1, 1])
        """
        if isinstance(chain, SimplicialChain):
            return chain
        if closure is not None:
            check_choice(closure, "closure", CLOSURES)
        if isinstance(chain, ZeroChain):
            pts = np.array(chain.points)
            return cls._trusted(pts, np.arange(len(chain), dtype=np.int64).reshape(-1, 1),
                                np.array(chain.coefficients, dtype=np.int64))
        if isinstance(chain, Path):
            terms = [(chain, 1)]
        elif isinstance(chain, Chain):
            terms = chain.terms
            if not terms:
                raise ValueError("the chain is empty, so its dimension is unknown")
        else:
            raise TypeError(f"from_chain needs a Path, Chain, ZeroChain or SimplicialChain, "
                            f"got {type(chain).__name__}")
        verts, simps, coefs = [], [], []
        offset = 0
        for path, c in terms:
            v, s = _path_segments(path, closure or "none")
            verts.append(v)
            simps.append(s + offset)
            coefs.append(np.full(s.shape[0], c, dtype=np.int64))
            offset += v.shape[0]
        return cls._trusted(np.concatenate(verts), np.concatenate(simps), np.concatenate(coefs))

    def to_chain(self):
        """The equivalent :class:`Chain` (k = 1) or :class:`ZeroChain` (k = 0).

        For a 1-chain, consecutive simplices that join end to start and have
        the same coefficient become one path (so the boundary of a
        :func:`cone` becomes one closed path per piece); others become
        two-point paths.

        Examples
        --------
        >>> import wedgepath as wp
        >>> loop = wp.cone([[0, 0], [1, 0], [0, 1]]).boundary().to_chain()
        >>> len(loop), loop.paths[0].points.tolist()
        (1, [[0.0, 0.0], [1.0, 0.0], [0.0, 1.0], [0.0, 0.0]])
        """
        k = self.degree
        if k == 0:
            return ZeroChain(self._vertices[self._simplices[:, 0]], self._coef.tolist(),
                             dim=self.dim)
        if k != 1:
            raise ValueError(f"only 0- and 1-chains convert to Chain/ZeroChain; this is a "
                             f"{k}-chain")
        r = self.reduced()
        s, c = r.simplices, r.coefficients
        if len(s) == 0:
            return Chain([])
        brk = np.ones(len(s), dtype=bool)
        brk[1:] = (s[1:, 0] != s[:-1, 1]) | (c[1:] != c[:-1])
        starts = np.flatnonzero(brk)
        stops = np.append(starts[1:], len(s))
        terms = []
        for a, b in zip(starts, stops):
            idx = np.append(s[a:b, 0], s[b - 1, 1])
            terms.append((Path._trusted(self._vertices[idx], None, None, gap_rows=None), int(c[a])))
        return Chain(terms)


def _coerce_chain(other):
    if isinstance(other, SimplicialChain):
        return other
    if isinstance(other, (Path, Chain, ZeroChain)):
        if isinstance(other, Chain) and not other.terms:
            return None
        return SimplicialChain.from_chain(other)
    return None


def _path_segments(path: Path, closure: str):
    """(vertices, segments) of a path's pieces (gap rows dropped), closed by ``closure``."""
    if closure not in ("none", "chord"):
        path = path.close(closure)
    pts = path.points
    starts, stops = path.piece_bounds()
    lengths = stops - starts
    keep = lengths >= 2
    starts, stops, lengths = starts[keep], stops[keep], lengths[keep]
    if starts.size == 0:
        return np.zeros((0, path.dim)), np.zeros((0, 2), dtype=np.int64)
    rows = np.concatenate([np.arange(a, b) for a, b in zip(starts, stops)]) \
        if len(starts) > 1 else np.arange(starts[0], stops[0])
    verts = pts[rows]
    new_start = np.concatenate([[0], np.cumsum(lengths)[:-1]])
    n = rows.size
    a = np.arange(n - 1)
    last_in_piece = np.zeros(n, dtype=bool)
    last_in_piece[new_start + lengths - 1] = True
    a = a[~last_in_piece[:-1]]
    segs = np.column_stack([a, a + 1])
    if closure == "chord":
        ends = new_start + lengths - 1
        open_ = ~np.all(verts[ends] == verts[new_start], axis=1)
        chords = np.column_stack([ends[open_], new_start[open_]])
        # insert each chord after its piece's segments
        piece_of_seg = np.searchsorted(new_start, segs[:, 0], side="right") - 1
        piece_of_chord = np.flatnonzero(open_)
        order = np.argsort(np.concatenate([piece_of_seg * 2, piece_of_chord * 2 + 1]),
                           kind="stable")
        segs = np.concatenate([segs, chords])[order]
    return verts, segs


# --------------------------------------------------------------------------- cone
def cone(path, apex=None, closure="chord"):
    """The 2-chain of triangles from an apex to each segment of a closed path.

    Each gap-free piece of the path is closed by ``closure`` and coned
    separately: with the piece's distinct samples ``s_0 .. s_{m-1}`` (a
    closed piece's repeated end sample is identified with its start) the
    triangles are ``(apex, s_k, s_{k+1 mod m})``.  Their boundary is exactly
    the closed piece (the spokes cancel), so the cone is a surface spanning
    the curve in R^n, and for the constant 2-form ``dx_i ^ dx_j`` its integral
    is the oriented area ``A[i, j]``.

    Parameters
    ----------
    path : Path or array_like (T, n)
        The curve.  NaN rows are gaps: one cone per piece.
    apex : array_like, shape (n,) or (pieces, n), optional
        The apex, or one per piece.  Default: the mean of each piece's
        distinct samples (its centroid as a point set).  The apex may lie on
        the curve (even at a sample): the triangles through it are then
        degenerate and contribute zero, and every integral over the cone is
        unchanged -- the boundary is still the closed path.
    closure : {"chord", "detrend", "require", "none"}
        How each piece is closed (see :meth:`Path.close`).  ``"none"``
        refuses open pieces.

    Returns
    -------
    SimplicialChain
        Degree 2.  Vertices: the apexes first (one per piece with at least
        two samples), then the distinct samples of each piece in order.

    Examples
    --------
    >>> import wedgepath as wp
    >>> S = wp.cone([[0, 0], [2, 0], [2, 1], [0, 1]])
    >>> S.vertices[0].tolist(), S.simplices.tolist()
    ([1.0, 0.5], [[0, 1, 2], [0, 2, 3], [0, 3, 4], [0, 4, 1]])
    >>> float(wp.integrate(wp.dx(0) ^ wp.dx(1), S))     # oriented area
    2.0
    >>> S.boundary() == wp.Path([[0, 0], [2, 0], [2, 1], [0, 1]]).close("chord")
    True
    """
    check_choice(closure, "closure", CLOSURES)
    p = as_path(path, "path")
    if closure in ("detrend", "require"):
        p = p.close(closure)
    pts = p.points
    starts, stops = p.piece_bounds()
    lengths = stops - starts
    keep = lengths >= 2
    starts, stops = starts[keep], stops[keep]
    n = p.dim
    if starts.size == 0:
        raise ValueError("the path has no piece with two or more samples; nothing to cone")
    # drop the repeated end sample of already-closed pieces
    closed = np.all(pts[stops - 1] == pts[starts], axis=1)
    if closure == "none" and not closed.all():
        k = int(np.flatnonzero(~closed)[0])
        raise ValueError(f"piece {k} of the path is open and closure='none'; a cone needs a "
                         "closed curve: choose closure='chord', 'detrend' or 'require'")
    stops = stops - closed.astype(np.int64)
    lengths = stops - starts
    P = starts.size
    if P == 1:
        rows = np.arange(starts[0], stops[0])
    else:
        rows = np.concatenate([np.arange(a, b) for a, b in zip(starts, stops)])
    samples = pts[rows]
    piece_id = np.repeat(np.arange(P), lengths)
    new_start = np.concatenate([[0], np.cumsum(lengths)[:-1]])
    if apex is None:
        # the mean of each piece, summing samples already divided by the count so that
        # coordinates near the float64 limit do not overflow the sum
        apexes = np.add.reduceat(samples / lengths[piece_id][:, None], new_start, axis=0)
    else:
        a = as_float_array(apex, "apex", ndim=(1, 2))
        if a.ndim == 1:
            if a.shape[0] != n:
                raise ValueError(f"apex has {a.shape[0]} coordinates but the path has {n} channels")
            apexes = np.broadcast_to(a, (P, n))
        else:
            if a.shape != (P, n):
                raise ValueError(f"apex must have shape ({n},) or ({P}, {n}) (one per piece), "
                                 f"got {a.shape}")
            apexes = a
    verts = np.concatenate([apexes, samples])
    m = rows.size
    local = np.arange(m) - new_start[piece_id]
    nxt = np.arange(m) + 1
    wrap = local == lengths[piece_id] - 1
    nxt[wrap] = new_start[piece_id[wrap]]
    tris = np.column_stack([piece_id, np.arange(m) + P, nxt + P]).astype(np.int64)
    return SimplicialChain._trusted(verts, tris, np.ones(m, dtype=np.int64))


# --------------------------------------------------------------------------- integration
def _minors(E, terms):
    """det(J[I, :]) for each index tuple I; E has shape (k, S, n) (rows v_j - v_0)."""
    k = E.shape[0]
    out = []
    for idx in terms:
        if k == 0:
            out.append(np.ones(E.shape[1] if E.ndim > 1 else 0))
        elif k == 1:
            out.append(E[0, :, idx[0]])
        elif k == 2:
            i, j = idx
            out.append(E[0, :, i] * E[1, :, j] - E[0, :, j] * E[1, :, i])
        else:
            M = np.stack([E[:, :, i] for i in idx], axis=-1)  # (k, S, k): M[a, s, b] = E[a, s, I_b]
            out.append(np.linalg.det(np.transpose(M, (1, 2, 0))))
    return out


def _volumes(E):
    """k-volumes (Gram determinant roots / k!) of simplices with edge rows E (k, S, n)."""
    k = E.shape[0]
    if k == 0:
        return np.ones(E.shape[1])
    if k == 1:
        return np.sqrt(np.einsum("sn,sn->s", E[0], E[0]))
    G = np.einsum("asn,bsn->sab", E, E)
    if k == 2:
        det = G[:, 0, 0] * G[:, 1, 1] - G[:, 0, 1] ** 2
    else:
        det = np.linalg.det(G)
    return np.sqrt(np.maximum(det, 0.0)) / factorial(k)


class _Terms:
    """The form's terms split into constant and varying parts."""

    def __init__(self, form):
        self.const = [(I, c.value) for I, c in form.terms.items() if c.kind == "constant"]
        self.vary = [(I, c) for I, c in form.terms.items() if c.kind != "constant"]
        degs = [c.poly_degree for _, c in self.vary]
        self.poly = None if any(d is None for d in degs) else max(degs, default=0)


def _const_part(V, terms: _Terms, k):
    """Per-simplex exact integrals of the constant terms; V (k+1, S, n)."""
    E = V[1:] - V[0]
    vals = np.zeros(V.shape[1])
    mag = np.zeros(V.shape[1])
    if k == 0:
        c = sum(v for _, v in terms.const)
        vals += c
        mag += abs(c)
        return vals, mag
    for (I, c), mnr in zip(terms.const, _minors(E, [I for I, _ in terms.const])):
        t = c * mnr
        vals += t
        mag += np.abs(t)
    return vals / factorial(k), mag / factorial(k)


def _rule_values(V, vary, bary, w, with_abs=False):
    """Quadrature of the varying terms on explicit simplices V (k+1, S, n).

    Returns per-simplex values (S,) and, with ``with_abs``, also the rule
    applied to |integrand| (an estimate of the integral of |integrand|, the
    scale of the tolerance) and with |weights| (the scale of rounding noise:
    Grundmann-Möller weights alternate in sign).
    """
    k = V.shape[0] - 1
    S = V.shape[1]
    q = bary.shape[0]
    E = V[1:] - V[0]
    minors = _minors(E, [I for I, _ in vary]) if k else [None] * len(vary)
    # nodes, q-major: (q, S, n) -> (q*S, n) without a transpose copy
    X = np.einsum("qj,jsn->qsn", bary, V, optimize=False).reshape(q * S, -1)
    g = np.zeros((q, S))
    for (I, coef), mnr in zip(vary, minors):
        f = coef.evaluate(X, _coef_label(I)).reshape(q, S)
        if mnr is None:
            g += f
        else:
            g += f * mnr
    vals = w @ g
    if with_abs:
        ag = np.abs(g)
        return vals, np.abs(w @ ag), np.abs(w) @ ag
    return vals


def _coef_label(I):
    return "coefficient of " + ("^".join(f"dx{i}" for i in I) if I else "the 0-form")


def _chunks(S, q):
    step = max(1, _CHUNK_POINTS // max(q, 1))
    for a in range(0, S, step):
        yield a, min(S, a + step)


def _gather(vertices, simplices, a, b):
    """Vertex coordinates (k+1, b-a, n) of simplices a..b."""
    return vertices[simplices[a:b].T]


def _bisect(V):
    """Split each simplex (k+1, B, n) at the midpoint of its longest edge; orientation kept."""
    k1, B, n = V.shape
    best = np.full(B, -1.0)
    ia = np.zeros(B, dtype=np.int64)
    ib = np.zeros(B, dtype=np.int64)
    for a, b in combinations(range(k1), 2):
        d = V[a] - V[b]
        L = np.einsum("sn,sn->s", d, d)
        better = L > best
        best = np.where(better, L, best)
        ia = np.where(better, a, ia)
        ib = np.where(better, b, ib)
    cols = np.arange(B)
    mid = 0.5 * (V[ia, cols] + V[ib, cols])
    A = V.copy()
    Bv = V.copy()
    A[ib, cols] = mid
    Bv[ia, cols] = mid
    return np.concatenate([A, Bv], axis=1)


def _integrate_simplices(form, vertices, simplices, coefs, opts):
    """Core: integrals of ``form`` over simplices.

    Returns ``(acc, values, errors)``: the accumulated sum weighted by ``coefs``
    and the per-simplex values and error estimates (unweighted).
    """
    k = simplices.shape[1] - 1
    S = simplices.shape[0]
    terms = _Terms(form)
    acc = _Acc()
    values = np.zeros(S)
    errors = np.zeros(S)
    cw = coefs.astype(np.float64)
    if S == 0:
        acc.add(0.0, method="empty chain")
        return acc, values, errors
    # constant terms: determinants, exact
    if terms.const:
        csum = 0.0
        cmag = 0.0
        for a, b in _chunks(S, 1):
            V = _gather(vertices, simplices, a, b)
            v, m = _const_part(V, terms, k)
            values[a:b] += v
            csum += float(cw[a:b] @ v)
            cmag += float(np.abs(cw[a:b]) @ m)
        acc.add(csum, method="determinants (exact)" if k else "point evaluation",
                rounding=_EPS * cmag * 4)
    if not terms.vary:
        return acc, values, errors
    if k == 0:
        tot, mag = 0.0, 0.0
        for a, b in _chunks(S, 1):
            V = _gather(vertices, simplices, a, b)
            v, _, mg = _rule_values(V, terms.vary, np.ones((1, 1)), np.ones(1), with_abs=True)
            values[a:b] += v
            tot += float(cw[a:b] @ v)
            mag += float(np.abs(cw[a:b]) @ mg)
        acc.add(tot, method="point evaluation", rounding=_EPS * mag,
                evaluations=S * len(terms.vary))
        return acc, values, errors
    if terms.poly is not None:
        bary, w = simplex_rule(k, terms.poly)
        q = bary.shape[0]
        tot, mag = 0.0, 0.0
        for a, b in _chunks(S, q):
            V = _gather(vertices, simplices, a, b)
            v, _, mg = _rule_values(V, terms.vary, bary, w, with_abs=True)
            values[a:b] += v
            tot += float(cw[a:b] @ v)
            mag += float(np.abs(cw[a:b]) @ mg)
        name = rule_name(k, terms.poly)
        acc.add(tot, 0.0, True, f"{name}, {q} points per simplex (exact for degree {terms.poly})",
                _EPS * mag * 8 * factorial(k), S * q * len(terms.vary))
        return acc, values, errors
    _adaptive(vertices, simplices, cw, terms, k, opts, acc, values, errors)
    return acc, values, errors


def _two_rules(V, vary, rules):
    """Lower and higher rule on explicit simplices V, chunked: lo, hi, mag, noise."""
    (b_lo, w_lo), (b_hi, w_hi) = rules
    q = b_lo.shape[0] + b_hi.shape[0]
    B = V.shape[1]
    lo, hi, mag, noise = (np.empty(B) for _ in range(4))
    for a, b in _chunks(B, q):
        Vc = V[:, a:b]
        lo[a:b] = _rule_values(Vc, vary, b_lo, w_lo)
        hi[a:b], mag[a:b], noise[a:b] = _rule_values(Vc, vary, b_hi, w_hi, with_abs=True)
    return lo, hi, mag, noise


def _adaptive(vertices, simplices, cw, terms, k, opts, acc, values, errors):
    """Adaptive quadrature: two rules per simplex, longest-edge bisection where they differ.

    The first pass runs over all simplices in chunks.  Simplices that fail
    the test are refined depth-first in batches of bounded size, so memory
    stays bounded however many levels are needed.
    """
    rules = rule_pair(k, opts["order"])
    q = rules[0][0].shape[0] + rules[1][0].shape[0]
    nvar = len(terms.vary)
    S = simplices.shape[0]
    lo, hi, mag, noise = (np.empty(S) for _ in range(4))
    vol = np.empty(S)
    for a, b in _chunks(S, q):
        V = _gather(vertices, simplices, a, b)
        lo[a:b], hi[a:b], mag[a:b], noise[a:b] = _two_rules(V, terms.vary, rules)
        vol[a:b] = _volumes(V[1:] - V[0])
    weight = np.abs(cw)
    total_scale = float(weight @ mag)
    total_noise = float(weight @ noise)
    total_vol = float(weight @ vol)
    tol = max(opts["atol"], opts["rtol"] * total_scale)
    state = {"value": 0.0, "error": 0.0, "unmet": False, "evaluations": S * q * nvar}
    budget = max(_MAX_EVALUATIONS, 8 * state["evaluations"])
    pending = []  # accepted (owner, value, estimate) arrays not yet added per simplex

    def flush():
        if pending:
            own = np.concatenate([p[0] for p in pending])
            values[:] += np.bincount(own, np.concatenate([p[1] for p in pending]), minlength=S)
            errors[:] += np.bincount(own, np.concatenate([p[2] for p in pending]), minlength=S)
            pending.clear()

    def settle(owner, fraction, lo, hi, noise, level):
        """Accept the simplices that pass; return the mask of those to refine."""
        est = np.abs(hi - lo)
        bad = est > np.maximum(tol * fraction, _NOISE * noise)
        if (level == opts["max_levels"] or state["evaluations"] > budget) and bad.any():
            # out of levels, or an integrand that does not settle: stop (bounded time)
            state["unmet"] = True
            bad[:] = False
        good = ~bad
        og, hg, eg = owner[good], hi[good], est[good]
        state["value"] += float(cw[og] @ hg)
        state["error"] += float(weight[og] @ eg)
        pending.append((og, hg, eg))
        if sum(p[0].size for p in pending) > (1 << 20):
            flush()
        return bad

    owner = np.arange(S)
    fraction = vol / total_vol if total_vol > 0 else np.full(S, 1.0 / S)
    bad = settle(owner, fraction, lo, hi, noise, 0)
    batch = 4 * max(1, _CHUNK_POINTS // q)  # parent simplices refined at once
    stack = [(None, owner[bad], fraction[bad], 0)] if bad.any() else []
    while stack:
        V, own, frac, level = stack.pop()
        if own.size > batch:
            for a in range(0, own.size, batch)[::-1]:
                b = min(own.size, a + batch)
                stack.append((None if V is None else V[:, a:b], own[a:b], frac[a:b], level))
            continue
        if V is None:
            V = vertices[simplices[own].T]
        V = _bisect(V)
        own = np.tile(own, 2)
        frac = np.tile(frac, 2) * 0.5
        level += 1
        lo, hi, _, noise = _two_rules(V, terms.vary, rules)
        state["evaluations"] += V.shape[1] * q * nvar
        bad = settle(own, frac, lo, hi, noise, level)
        if bad.any():
            stack.append((V[:, bad], own[bad], frac[bad], level))
    flush()
    if state["unmet"] and state["error"] > tol:
        warnings.warn(f"integration tolerance {tol:.3g} not reached (bisection stopped); "
                      f"estimated error {state['error']:.3g}", IntegrationWarning,
                      stacklevel=6)
    m = opts["order"]
    name = rule_name(k, 2 * m + 1)
    method = (f"adaptive {name} {m}/{m + 1} points" if k == 1 else
              f"adaptive {name} degree {2 * m - 1}/{2 * m + 1}")
    acc.add(state["value"], state["error"], False, method, _EPS * total_noise * 4,
            state["evaluations"])


def _check_form_on(form, degree, dim, what="chain"):
    if not isinstance(form, Form):
        raise TypeError(f"expected a Form, got {type(form).__name__}")
    if form.degree != degree:
        raise ValueError(f"a {form.degree}-form cannot be integrated over a {degree}-{what}; "
                         f"the degrees must match")
    if form.dim is not None and form.dim != dim:
        raise ValueError(f"the form lives on R^{form.dim} but the {what} is in R^{dim}")
    if form.min_dim > dim:
        raise ValueError(f"the form uses dx{form.min_dim - 1} but the {what} is in R^{dim}")


def _is_simplicial(form, domain) -> bool:
    return isinstance(domain, SimplicialChain)


def _integrate_simplicial(form, chain, closure=None, curve="linear", **opts):
    if closure is not None:
        raise ValueError(f"closure={closure!r} applies to paths; a simplicial chain is "
                         "integrated as it is (pass closure=None)")
    if curve != "linear":
        raise ValueError(f"curve={curve!r} applies to paths; simplices are affine "
                         "(use curve='linear')")
    _check_form_on(form, chain.degree, chain.dim)
    acc, _, _ = _integrate_simplices(form, chain.vertices, chain.simplices, chain.coefficients,
                                     opts)
    return acc.result()


def _is_complex(form, domain) -> bool:
    from .complexes import SimplicialComplex
    return isinstance(domain, SimplicialComplex)


def _refuse_complex(form, domain, **_):
    raise TypeError("integrate needs a chain, not a SimplicialComplex: use cx.de_rham(form) for "
                    "the integrals over every simplex, or integrate over cx.chain(coefficients, k)")


register_domain(_is_simplicial, _integrate_simplicial)
register_domain(_is_complex, _refuse_complex)

