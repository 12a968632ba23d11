"""Simplicial chains in R^n and the cone over a closed path.

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

Integration over simplicial chains (``wp.integrate(form, chain)``) is in
:mod:`~wedgepath.calculus.simplex_integration`; index helpers in
:mod:`~wedgepath.calculus._indexing`.
"""

from __future__ import annotations

import numpy as np

from .._validation import as_float_array, as_int, check_choice, scaled_coefficients
from ._indexing import as_chain_coefficients, as_index_array, readonly, reduce_simplices
from .chains import Chain, ZeroChain
from .paths import CLOSURES, Path, as_path

__all__ = ["SimplicialChain", "cone"]


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
        simp = as_index_array(simplices, verts.shape[0])
        k = simp.shape[1] - 1
        if k > verts.shape[1]:
            raise ValueError(f"a {k}-simplex ({k + 1} vertices per row) does not fit in "
                             f"R^{verts.shape[1]}")
        coef = as_chain_coefficients(coefficients, simp.shape[0])
        self._vertices = readonly(verts)
        self._simplices = readonly(simp)
        self._coef = readonly(coef)

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
        s, c = reduce_simplices(simp, self._coef, verts.shape[0])
        return SimplicialChain._trusted(verts if verts is self._vertices else readonly(verts),
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
        s, c = reduce_simplices(F, C, self._vertices.shape[0])
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
