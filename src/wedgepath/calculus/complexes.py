"""Simplicial complexes, cochains, the de Rham map, Whitney forms and a Hodge star.

A :class:`SimplicialComplex` holds a vertex array in R^n and, for each degree
``k = 0 .. K``, its k-simplices: the top simplices (degree K) as given, with
their orientation; the lower faces with increasing vertex indices (their
canonical orientation), sorted.  The 0-simplices are all the vertices.

* Chains and cochains are plain arrays aligned with ``cx.simplices(k)``.
* ``cx.boundary_matrix(k)`` is the sparse ``(n_{k-1}, n_k)`` matrix of ∂_k;
  ``cx.coboundary(k)`` is d_k = ∂_{k+1}^T, so ``<d c, σ> = <c, ∂σ>`` and
  ``d d = 0``.
* ``cx.de_rham(form)`` integrates a form over every k-simplex (the de Rham
  map); Stokes's theorem reads ``de_rham(w.d()) == coboundary(k) @ de_rham(w)``.
* ``cx.whitney(c)`` interpolates a k-cochain by Whitney forms (H. Whitney,
  *Geometric Integration Theory*, Princeton 1957, ch. IV §27; J. Dodziuk,
  "Finite-difference approach to the Hodge theory of harmonic forms",
  Amer. J. Math. 98 (1976) 79-104): a form with affine coefficients on each
  top simplex whose de Rham map is ``c`` again.
* On a 1-dimensional complex (a sampled curve) :meth:`SimplicialComplex.hodge_star`
  gives the diagonal Hodge star of discrete exterior calculus for a metric
  from time or arc length (A. N. Hirani, *Discrete Exterior Calculus*, PhD
  thesis, Caltech 2003, ch. 4; M. Desbrun, A. N. Hirani, M. Leok and
  J. E. Marsden, "Discrete exterior calculus", arXiv:math/0508341, 2005):
  the dual of an edge is its midpoint, the dual of a vertex the half-edges
  around it.  From it come a derivative and a Laplacian along irregularly
  sampled curves.
"""

from __future__ import annotations

from itertools import combinations
from math import factorial

import numpy as np
import scipy.sparse as sps

from .._validation import COEF_LIMIT, as_float_array, as_int, check_choice
from ._indexing import (as_chain_coefficients, as_index_array, group_keys, readonly, row_keys,
                        row_signs, sort_columns, sort_rows)
from .adaptive import options
from .forms import Form
from .integral import EPS, Integral
from .paths import CLOSURES, as_path
from .simplex_integration import check_form_on, integrate_simplices, minors
from .simplicial import SimplicialChain

__all__ = ["SimplicialComplex", "WhitneyForm"]

METRICS = ("time", "arclength")


def _lookup(table_keys, rows, n_vertices, table_rows=None):
    """Positions of sorted ``rows`` in a lexicographically sorted table (keys or rows)."""
    keys = row_keys(rows, n_vertices)
    if keys is not None and table_keys is not None:
        return np.searchsorted(table_keys, keys)
    # wide rows: order-preserving keys computed jointly for the table and the queries
    joint = group_keys(np.concatenate([table_rows, rows]), n_vertices)
    m = table_rows.shape[0]
    return np.searchsorted(joint[:m], joint[m:])


class SimplicialComplex:
    """A simplicial complex in R^n: simplices of every degree up to its top degree.

    Parameters
    ----------
    vertices : array_like, shape (V, n)
        Vertex coordinates (finite).
    simplices : array_like of int, shape (S, K + 1)
        The top simplices, each with K + 1 distinct vertex indices; their
        order is kept and is their orientation.  All their faces are added.
        A repeated simplex (same vertex set) is refused.

    Attributes
    ----------
    vertices : ndarray (V, n), read-only
    dim : int
        n.
    top_degree : int
        K.
    shape : tuple of int
        ``(n_0, ..., n_K)``, the number of simplices of each degree.

    See Also
    --------
    from_chain, from_path

    Examples
    --------
    Two triangles sharing an edge:

    >>> import numpy as np, wedgepath as wp
    >>> cx = wp.SimplicialComplex([[0, 0], [1, 0], [1, 1], [0, 1]], [[0, 1, 2], [0, 2, 3]])
    >>> cx.shape
    (4, 5, 2)
    >>> cx.simplices(1).tolist()
    [[0, 1], [0, 2], [0, 3], [1, 2], [2, 3]]
    >>> d0, d1 = cx.coboundary(0), cx.coboundary(1)
    >>> int((d1 @ d0).count_nonzero())
    0
    >>> cx.de_rham(wp.dx(0) ^ wp.dx(1)).tolist()     # areas of the triangles
    [0.5, 0.5]
    """

    def __init__(self, vertices, simplices):
        verts = as_float_array(vertices, "vertices", ndim=2)
        if verts.shape[1] == 0:
            raise ValueError("vertices has no coordinates (shape has 0 columns)")
        top = as_index_array(simplices, verts.shape[0])
        self._build(readonly(verts), top)

    # ------------------------------------------------------------ building
    def _build(self, verts, top, edge_times=None, vertex_rows=None):
        V = verts.shape[0]
        K = top.shape[1] - 1
        if K > verts.shape[1]:
            raise ValueError(f"a {K}-simplex ({K + 1} vertices per row) does not fit in "
                             f"R^{verts.shape[1]}")
        srt = sort_rows(top)[0]
        if K >= 1 and top.shape[0]:
            rep = (srt[:, 1:] == srt[:, :-1]).any(axis=1)
            if rep.any():
                j = int(np.flatnonzero(rep)[0])
                raise ValueError(f"simplex {j} {top[j].tolist()} repeats a vertex; a complex "
                                 "needs distinct vertices in each simplex")
        perm = top_keys = None
        if K >= 1:
            gk = group_keys(srt, V)
            perm = np.argsort(gk, kind="stable")
            sk = gk[perm]
            dup = np.flatnonzero(sk[1:] == sk[:-1])
            # keys comparable across calls exist only when the packed key fits
            top_keys = sk if row_keys(srt[:1], V) is not None else None
            if dup.size:
                a, b = sorted((int(perm[dup[0]]), int(perm[dup[0] + 1])))
                raise ValueError(f"simplices {a} and {b} have the same vertices "
                                 f"{srt[a].tolist()}; each simplex may appear once (merge a "
                                 "chain's repeated simplices with chain.reduced() first)")
        self._vertices = verts
        self._K = K
        simp = [None] * (K + 1)
        keys = [None] * (K + 1)
        simp[0] = np.arange(V, dtype=np.int64).reshape(-1, 1)
        keys[0] = np.arange(V, dtype=np.int64)
        self._top_face_ids = None
        for k in range(1, K):
            if k == K - 1:
                # faces of the top simplices, "drop vertex i" for i = 0..K, as given
                faces = np.concatenate([sort_rows(top[:, [j for j in range(K + 1) if j != i]])[0]
                                        for i in range(K + 1)])
            else:
                cols = list(combinations(range(K + 1), k + 1))
                faces = np.concatenate([srt[:, list(c)] for c in cols])
            fk = group_keys(faces, V)
            uk, first, inv = np.unique(fk, return_index=True, return_inverse=True)
            simp[k] = np.ascontiguousarray(faces[first])  # lexicographic order
            keys[k] = uk if row_keys(faces[:1], V) is not None else None
            if k == K - 1:
                self._top_face_ids = inv.reshape(K + 1, top.shape[0])
        self._top_perm = None
        if K >= 1:
            simp[K] = np.ascontiguousarray(top)
            keys[K] = top_keys
            self._top_perm = perm
        self._simplices = [readonly(s) for s in simp]
        self._keys = keys
        self._boundary = {}
        self._edge_times = edge_times
        self._vertex_rows = vertex_rows
        self._top_faces = {}

    @classmethod
    def from_chain(cls, chain):
        """The complex of a :class:`SimplicialChain`'s simplices and all their faces.

        The chain's vertex array becomes the complex's vertices (indices are
        kept; equal coordinates are not merged); its coefficients are not
        used (see :meth:`chain_vector`).  A chain that uses one simplex twice
        (for instance the cone of a loop through only two distinct samples,
        whose two triangles cancel) is refused: pass ``chain.reduced()``.

        Examples
        --------
        >>> import wedgepath as wp
        >>> cx = wp.SimplicialComplex.from_chain(wp.cone([[0, 0], [1, 0], [0, 1]]))
        >>> cx.shape
        (4, 6, 3)
        """
        if not isinstance(chain, SimplicialChain):
            chain = SimplicialChain.from_chain(chain)
        self = object.__new__(cls)
        self._build(chain.vertices, chain.simplices)
        return self

    @classmethod
    def from_path(cls, path, closure="none"):
        """The 1-dimensional complex of a sampled curve.

        Vertices are the samples (gap rows and one-sample pieces dropped;
        :attr:`vertex_rows` gives their rows in the path), edges join
        consecutive samples of each piece in path order and orientation.
        With ``closure="chord"`` (or ``"detrend"``/``"require"``) each piece
        gets a closing edge from its last sample to its first (a piece whose
        end sample equals its start has that sample identified with the
        start instead; a piece of two samples gets no second edge).  The
        complex remembers the time step of every edge (time stamps, or 1 per
        sample without them; a chord takes the path's closing step, see
        :meth:`Path.close`) for ``metric="time"``.

        Examples
        --------
        >>> import wedgepath as wp
        >>> p = wp.Path([[0, 0], [1, 0], [1, 1]], times=[0.0, 0.5, 2.0])
        >>> cx = wp.SimplicialComplex.from_path(p, closure="chord")
        >>> cx.simplices(1).tolist(), cx.edge_times.tolist()
        ([[0, 1], [1, 2], [2, 0]], [0.5, 1.5, 1.0])
        """
        check_choice(closure, "closure", CLOSURES)
        p = as_path(path, "path")
        if closure in ("detrend", "require"):
            p = p.close(closure)
        t = p.times if p.times is not None else np.arange(p.n_samples, dtype=np.float64)
        starts, stops = p.piece_bounds()
        keep = (stops - starts) >= 2
        starts, stops = starts[keep], stops[keep]
        if starts.size == 0:
            raise ValueError("the path has no piece with two or more samples")
        pts = p.points
        verts_rows, edges, times = [], [], []
        offset = 0
        for a, b in zip(starts, stops):
            rows = np.arange(a, b)
            dt = np.diff(t[a:b])
            closed = closure != "none" and bool(np.array_equal(pts[a], pts[b - 1]))
            m = b - a
            if closed and m >= 3:
                rows = rows[:-1]
                e = np.column_stack([np.arange(m - 1), np.arange(1, m)])
                e[-1, 1] = 0
                et = dt
            else:
                e = np.column_stack([np.arange(m - 1), np.arange(1, m)])
                et = dt
                if closure != "none" and m >= 3:
                    e = np.vstack([e, [m - 1, 0]])
                    et = np.append(dt, np.median(dt))
            verts_rows.append(rows)
            edges.append(e + offset)
            times.append(et)
            offset += rows.size
        vrows = np.concatenate(verts_rows)
        verts = readonly(np.array(pts[vrows]))
        self = object.__new__(cls)
        self._build(verts, np.concatenate(edges).astype(np.int64),
                    edge_times=readonly(np.concatenate(times).astype(np.float64)),
                    vertex_rows=readonly(vrows.astype(np.int64)))
        return self

    # ---------------------------------------------------------------- views
    @property
    def vertices(self) -> np.ndarray:
        """Vertex coordinates (V, n), read-only."""
        return self._vertices

    @property
    def dim(self) -> int:
        """n, the ambient dimension."""
        return self._vertices.shape[1]

    @property
    def top_degree(self) -> int:
        """K, the largest degree of a simplex in the complex."""
        return self._K

    @property
    def shape(self) -> tuple:
        """Number of simplices of each degree, ``(n_0, ..., n_K)``."""
        return tuple(s.shape[0] for s in self._simplices)

    @property
    def edge_times(self):
        """Time step of every edge for a complex from :meth:`from_path`, else None."""
        return self._edge_times

    @property
    def vertex_rows(self):
        """Rows of the path that the vertices came from (:meth:`from_path`), else None."""
        return self._vertex_rows

    def __repr__(self):
        return f"SimplicialComplex(shape={self.shape}, R^{self.dim})"

    def _check_k(self, k, lo=0, hi=None, what="k"):
        hi = self._K if hi is None else hi
        if isinstance(k, (bool, np.bool_)) or not isinstance(k, (int, np.integer)):
            raise TypeError(f"{what} must be an integer, got {k!r}")
        if not lo <= k <= hi:
            raise ValueError(f"{what}={k} is out of range: this complex has degrees 0..{self._K}"
                             + (f" and {what} must be in {lo}..{hi}" if (lo, hi) != (0, self._K)
                                else ""))
        return int(k)

    def simplices(self, k) -> np.ndarray:
        """The k-simplices as vertex indices, shape (n_k, k + 1), read-only."""
        k = self._check_k(k)
        return self._simplices[k]

    # ------------------------------------------------------------- matrices
    def _face_ids(self, k):
        """For every k-simplex: ids of its k+1 faces (drop vertex i) and signs, lists of (n_k,)."""
        S = self._simplices[k]
        ids, signs = [], []
        for i in range(k + 1):
            cols = [j for j in range(k + 1) if j != i]
            sgn = 1 if i % 2 == 0 else -1
            if k == 1:
                ids.append(S[:, cols[0]])  # the faces of edges are vertices: ids are indices
            elif k == self._K and self._top_face_ids is not None:
                ids.append(self._top_face_ids[i])
            else:
                f = S[:, cols]
                ids.append(_lookup(self._keys[k - 1], f if k < self._K else sort_rows(f)[0],
                                   self._vertices.shape[0], self._simplices[k - 1]))
            if k == self._K and k > 1:
                # the top keeps its given vertex order
                signs.append(sgn * row_signs(S[:, cols]).astype(np.int8))
            else:
                signs.append(np.full(S.shape[0], sgn, dtype=np.int8))
        return ids, signs

    def boundary_matrix(self, k):
        """∂_k as a sparse matrix of shape (n_{k-1}, n_k), integer entries ±1 (CSC format).

        Column j is the boundary of the k-simplex j:
        ``∂[v_0..v_k] = sum_i (-1)^i [.. v_i omitted ..]`` in terms of the
        stored (k-1)-simplices.  ``k`` runs over 1..K.

        Examples
        --------
        >>> import wedgepath as wp
        >>> cx = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        >>> cx.boundary_matrix(2).toarray().ravel().tolist()   # edges 01, 02, 12
        [1, -1, 1]
        """
        k = self._check_k(k, 1, self._K)
        if k not in self._boundary:
            ids, signs = self._face_ids(k)  # k+1 entries in every column
            ids, signs = sort_columns(ids, signs)  # sorted row indices within each column
            n_k = self._simplices[k].shape[0]
            n_rows = self._simplices[k - 1].shape[0]
            nnz = (k + 1) * n_k
            itype = np.int32 if max(n_rows, nnz) < 2 ** 31 - 1 else np.int64
            indices = np.empty((n_k, k + 1), dtype=itype)
            data = np.empty((n_k, k + 1), dtype=np.int64)
            for j in range(k + 1):
                indices[:, j] = ids[j]
                data[:, j] = signs[j]
            indptr = np.arange(0, nnz + 1, k + 1, dtype=itype)
            M = sps.csc_matrix((data.ravel(), indices.ravel(), indptr), shape=(n_rows, n_k))
            M.has_sorted_indices = True
            self._boundary[k] = M
        return self._boundary[k].copy()

    def coboundary(self, k):
        """d_k = ∂_{k+1}^T, the sparse (n_{k+1}, n_k) matrix acting on k-cochains.

        ``k`` runs over 0..K-1.  ``coboundary(k+1) @ coboundary(k)`` is zero.

        Examples
        --------
        >>> import numpy as np, wedgepath as wp
        >>> cx = wp.SimplicialComplex.from_path([[0.0], [1.0], [3.0]])
        >>> (cx.coboundary(0) @ np.array([1.0, 4.0, 9.0])).tolist()   # differences
        [3.0, 5.0]
        """
        k = self._check_k(k, 0, self._K - 1)
        return self.boundary_matrix(k + 1).T  # CSC transposed: CSR, no copy of the data

    # --------------------------------------------------------------- chains
    def chain_vector(self, chain, k=None):
        """Coefficients of a :class:`SimplicialChain` on this complex's k-simplices.

        Each simplex of the chain must be a simplex of the complex (matched by
        vertex indices when the chain shares this complex's vertex array, by
        coordinates otherwise); an odd permutation of its vertices counts
        negatively.  Returns an int64 array of length n_k.

        Examples
        --------
        >>> import wedgepath as wp
        >>> S = wp.cone([[0, 0], [1, 0], [0, 1]])
        >>> cx = wp.SimplicialComplex.from_chain(S)
        >>> cx.chain_vector(S).tolist()
        [1, 1, 1]
        >>> cx.chain_vector(S.boundary()).tolist()   # edges 01 02 03 12 13 23
        [0, 0, 0, 1, -1, 1]
        """
        if not isinstance(chain, SimplicialChain):
            chain = SimplicialChain.from_chain(chain)
        if chain.dim != self.dim:
            raise ValueError(f"the chain is in R^{chain.dim} but the complex in R^{self.dim}")
        kk = chain.degree if k is None else self._check_k(k)
        if kk != chain.degree:
            raise ValueError(f"k={kk} but the chain has degree {chain.degree}")
        self._check_k(kk)
        S = chain.simplices
        if chain.vertices is self._vertices or (
                chain.vertices.shape == self._vertices.shape
                and np.array_equal(chain.vertices, self._vertices)):
            idx = S
        else:
            idx = self._match_vertices(chain.vertices)[S]
        out = np.zeros(self._simplices[kk].shape[0], dtype=np.int64)
        if S.shape[0] == 0:
            return out
        srt = np.sort(idx, axis=1)
        nondeg = (srt[:, 1:] != srt[:, :-1]).all(axis=1) if kk else np.ones(len(S), bool)
        idx, srt, coef = idx[nondeg], srt[nondeg], chain.coefficients[nondeg]
        if kk == self._K and kk >= 1:
            top_sorted = None if self._keys[kk] is not None else \
                sort_rows(self._simplices[kk])[0][self._top_perm]
            pos = _lookup(self._keys[kk], srt, self._vertices.shape[0], top_sorted)
            pos = self._top_perm[np.minimum(pos, out.size - 1)]
            stored_sorted = np.sort(self._simplices[kk][pos], axis=1)
        else:
            pos = _lookup(self._keys[kk], srt, self._vertices.shape[0], self._simplices[kk])
            pos = np.minimum(pos, out.size - 1)
            stored_sorted = self._simplices[kk][pos]
        found = (stored_sorted == srt).all(axis=1)
        if not found.all():
            j = int(np.flatnonzero(nondeg)[np.flatnonzero(~found)[0]])
            raise ValueError(f"simplex {j} of the chain is not a {kk}-simplex of the complex")
        if kk >= 1:
            sign = row_signs(idx)
            if kk == self._K:
                sign = sign * row_signs(self._simplices[kk][pos])
        else:
            sign = np.ones(idx.shape[0], dtype=np.int64)
        terms = sign * coef
        approx = np.zeros(out.size)
        np.add.at(approx, pos, terms.astype(np.float64))   # int64 sums must not wrap
        if approx.size and float(np.max(np.abs(approx))) > COEF_LIMIT:
            raise ValueError("the chain's coefficients on a simplex sum beyond the supported "
                             "range +-2**62")
        np.add.at(out, pos, terms)
        return out

    def chain(self, coefficients, k):
        """The :class:`SimplicialChain` with these coefficients on the k-simplices.

        Examples
        --------
        >>> import wedgepath as wp
        >>> cx = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        >>> cx.chain([1], 2).boundary() == cx.chain([1, -1, 1], 1)
        True
        """
        k = self._check_k(k)
        return SimplicialChain._trusted(self._vertices, self._simplices[k],
                                        _coef_array(coefficients, self._simplices[k].shape[0]))

    def _match_vertices(self, pts):
        """Index in this complex of each row of pts (exact coordinate match)."""
        V = self._vertices
        allv = np.concatenate([V, pts])
        _, inv = np.unique(allv, axis=0, return_inverse=True)
        inv = inv.ravel()
        own, other = inv[:V.shape[0]], inv[V.shape[0]:]
        counts = np.bincount(own, minlength=inv.max() + 1)
        lookup = np.full(inv.max() + 1, -1, dtype=np.int64)
        lookup[own] = np.arange(V.shape[0])
        res = lookup[other]
        if (res < 0).any():
            j = int(np.flatnonzero(res < 0)[0])
            raise ValueError(f"chain vertex {j} {pts[j].tolist()} is not a vertex of the complex")
        if (counts[other] > 1).any():
            j = int(np.flatnonzero(counts[other] > 1)[0])
            raise ValueError(f"chain vertex {j} {pts[j].tolist()} matches several vertices of "
                             "the complex; build the chain on the complex's vertex array")
        return res

    # ------------------------------------------------------------- de Rham
    def de_rham(self, form, k=None, *, rtol=1e-10, atol=0.0, order=None, max_levels=30,
                resolution=32, max_evaluations=None, return_error=False):
        """The de Rham map: the k-cochain of the form's integrals over the k-simplices.

        Parameters
        ----------
        form : Form or WhitneyForm
            A k-form on R^n.  Constant forms are integrated exactly with
            determinants, polynomial ones exactly by quadrature, callables
            adaptively (see :func:`wedgepath.integrate`).  A
            :class:`WhitneyForm` of this complex is integrated exactly.
        k : int, optional
            The degree (default ``form.degree``; must match it).
        rtol, atol, order, max_levels, resolution, max_evaluations
            Tolerance, rules, minimum subdivision and work bound of the adaptive method, as
            in :func:`wedgepath.integrate` (the tolerance applies to the whole
            cochain: ``rtol`` times the sum over the simplices).
        return_error : bool
            Also return the per-simplex error estimates.

        Warns
        -----
        IntegrationWarning
            When the adaptive estimate did not reach the tolerance.

        Returns
        -------
        ndarray (n_k,) [, ndarray (n_k,)]

        Examples
        --------
        >>> import wedgepath as wp
        >>> cx = wp.SimplicialComplex.from_path([[0, 0], [1, 0], [1, 2]])
        >>> cx.de_rham(wp.dx(0) + wp.dx(1)).tolist()
        [1.0, 2.0]
        """
        if isinstance(form, WhitneyForm):
            if form.complex is not self:
                raise ValueError("the Whitney form belongs to another complex")
            kk = form.degree if k is None else self._check_k(k)
            if kk != form.degree:
                raise ValueError(f"k={kk} but the Whitney form has degree {form.degree}")
            vals = form._de_rham()
            return (vals, np.zeros_like(vals)) if return_error else vals
        if not isinstance(form, Form):
            raise TypeError(f"de_rham needs a Form or WhitneyForm, got {type(form).__name__}")
        kk = form.degree if k is None else self._check_k(k)
        self._check_k(kk)
        check_form_on(form, kk, self.dim, what="simplex")
        opts = options(rtol, atol, order, max_levels, resolution, max_evaluations)
        S = self._simplices[kk]
        with np.errstate(over="ignore", invalid="ignore"):
            acc, values, errors = integrate_simplices(form, self._vertices, S,
                                                      np.ones(S.shape[0], dtype=np.int64), opts)
        acc.warn("de Rham map")
        return (values, errors) if return_error else values

    # ------------------------------------------------------------- Whitney
    def whitney(self, cochain, k=None):
        """Whitney interpolation of a k-cochain: a piecewise-affine k-form.

        On each top simplex with barycentric coordinates λ, the Whitney form
        of a k-face ``[v_0 .. v_k]`` is
        ``k! Σ_i (-1)^i λ_{v_i} dλ_{v_0} ∧ .. (dλ_{v_i} omitted) .. ∧ dλ_{v_k}``
        (Whitney 1957, ch. IV §27); the interpolant is their sum weighted by
        the cochain.  Its integral over every k-simplex gives the cochain
        back (``cx.de_rham(cx.whitney(c)) == c``), and it commutes with d.

        In R^n with n > K the barycentric coordinates are extended off each
        top simplex by orthogonal projection onto its affine hull.

        Parameters
        ----------
        cochain : array_like, shape (n_k,)
        k : int, optional
            Degree; default: the one whose simplex count matches the length
            (an error when several do).

        Raises
        ------
        ValueError
            When a top simplex is degenerate (zero volume): its barycentric
            coordinates, and so its Whitney forms, do not exist.

        Examples
        --------
        >>> import numpy as np, wedgepath as wp
        >>> cx = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        >>> W = cx.whitney(np.array([1.0, 0.0, 0.0]), 1)   # the edge [0, 1]
        >>> cx.de_rham(W).round(12).tolist()
        [1.0, 0.0, 0.0]
        """
        c = as_float_array(cochain, "cochain", ndim=1)
        if k is None:
            matches = [j for j, s in enumerate(self._simplices) if s.shape[0] == c.shape[0]]
            if not matches:
                raise ValueError(f"cochain has {c.shape[0]} values but the complex has "
                                 f"{self.shape} simplices per degree")
            if len(matches) > 1:
                raise ValueError(f"cochain length {c.shape[0]} fits degrees {matches}; pass k=")
            k = matches[0]
        k = self._check_k(k)
        if c.shape[0] != self._simplices[k].shape[0]:
            raise ValueError(f"a {k}-cochain needs {self._simplices[k].shape[0]} values, "
                             f"got {c.shape[0]}")
        return WhitneyForm(self, readonly(c), k)

    def _top_face_table(self, k):
        """For each top simplex and each local k-face: global id and orientation sign."""
        if k in self._top_faces:
            return self._top_faces[k]
        K = self._K
        top = self._simplices[K]
        local = list(combinations(range(K + 1), k + 1))
        ids = np.empty((len(local), top.shape[0]), dtype=np.int64)
        signs = np.empty((len(local), top.shape[0]), dtype=np.int64)
        for f, cols in enumerate(local):
            g = top[:, list(cols)]
            if k == K:
                ids[f] = np.arange(top.shape[0])
                signs[f] = 1
                continue
            signs[f] = row_signs(g) if k >= 1 else 1
            ids[f] = _lookup(self._keys[k], np.sort(g, axis=1), self._vertices.shape[0],
                             self._simplices[k])
        self._top_faces[k] = (local, ids, signs)
        return self._top_faces[k]

    def _barycentric(self):
        """Per top simplex: v0 (S, n) and P (S, K, n) with u = P (x - v0); gradients."""
        if "bary" in self._top_faces:
            return self._top_faces["bary"]
        K = self._K
        top = self._simplices[K]
        V = self._vertices[top.T]  # (K+1, S, n)
        E = np.transpose(V[1:] - V[0], (1, 0, 2))  # (S, K, n)
        G = E @ np.transpose(E, (0, 2, 1))  # (S, K, K)
        with np.errstate(all="ignore"):
            det = np.linalg.det(G) if K else np.ones(top.shape[0])
        scale = np.prod(np.einsum("skn,skn->sk", E, E), axis=1) if K else np.ones(top.shape[0])
        bad = ~(det > 1e-24 * scale) if K else np.zeros(top.shape[0], bool)
        if bad.any():
            j = int(np.flatnonzero(bad)[0])
            raise ValueError(f"top simplex {j} {top[j].tolist()} is degenerate (zero volume); "
                             "Whitney forms need non-degenerate simplices")
        P = np.linalg.solve(G, E) if K else np.zeros((top.shape[0], 0, self.dim))
        grads = np.concatenate([-P.sum(axis=1, keepdims=True), P], axis=1)  # (S, K+1, n)
        self._top_faces["bary"] = (V[0], P, grads)
        return self._top_faces["bary"]

    # --------------------------------------------------------------- Hodge
    def _edge_lengths(self, metric):
        if self._K != 1:
            raise ValueError(f"the diagonal Hodge star here is for 1-dimensional complexes "
                             f"(sampled curves); this complex has top degree {self._K}")
        E = self._simplices[1]
        if isinstance(metric, str):
            check_choice(metric, "metric", METRICS)
            if metric == "time":
                if self._edge_times is None:
                    raise ValueError("metric='time' needs a complex built with from_path; use "
                                     "metric='arclength' or pass edge lengths")
                h = self._edge_times
            else:
                d = self._vertices[E[:, 1]] - self._vertices[E[:, 0]]
                h = np.sqrt(np.einsum("sn,sn->s", d, d))
        else:
            h = as_float_array(metric, "metric (edge lengths)", ndim=1)
            if h.shape[0] != E.shape[0]:
                raise ValueError(f"metric has {h.shape[0]} edge lengths for {E.shape[0]} edges")
        if h.size and not (h > 0).all():
            j = int(np.flatnonzero(~(h > 0))[0])
            raise ValueError(f"edge {j} {E[j].tolist()} has length {h[j]!r} under this metric; "
                             "the Hodge star needs positive edge lengths (remove repeated "
                             "samples or use metric='time')")
        return h

    def hodge_star(self, k, metric="time", inverse=False):
        """The diagonal Hodge star ⋆_k of a 1-dimensional complex, as a sparse matrix.

        With edge lengths ``h`` (the metric), the dual of an edge is its
        midpoint and the dual of a vertex is the half of each edge around
        it, so ``⋆_1 = diag(1 / h)`` and ``⋆_0 = diag(ℓ)`` with
        ``ℓ_v = (1/2) Σ_{edges e at v} h_e`` (Hirani 2003, §4.1; the ratio of
        dual to primal volumes).

        Parameters
        ----------
        k : {0, 1}
        metric : {"time", "arclength"} or array_like (n_1,)
            ``"time"``: edge lengths are time steps (sample steps without
            times), for a complex from :meth:`from_path`; ``"arclength"``:
            Euclidean edge lengths in R^n; or positive edge lengths.
        inverse : bool
            Return ⋆_k^{-1} instead.

        Examples
        --------
        >>> import wedgepath as wp
        >>> cx = wp.SimplicialComplex.from_path(wp.Path([[0.0], [1.0], [5.0]], times=[0, 1, 3]))
        >>> cx.hodge_star(0).diagonal().tolist(), cx.hodge_star(1).diagonal().tolist()
        ([0.5, 1.5, 1.0], [1.0, 0.5])
        """
        k = self._check_k(k, 0, 1)
        h = self._edge_lengths(metric)
        if k == 1:
            diag = h if inverse else 1.0 / h
        else:
            B = abs(self.boundary_matrix(1)).astype(np.float64)
            dual = 0.5 * (B @ h)
            if inverse:
                if not (dual > 0).all():
                    j = int(np.flatnonzero(~(dual > 0))[0])
                    raise ValueError(f"vertex {j} has no edge, so its dual cell is empty")
                diag = 1.0 / dual
            else:
                diag = dual
        return sps.diags(diag, format="csr")

    def derivative(self, values=None, metric="time"):
        """Discrete derivative along a curve: ``⋆_1 d_0 f``, one value per edge.

        ``(f_{b} - f_{a}) / h_e`` for each edge ``e = [a, b]``: the derivative
        at the edge's midpoint (its dual vertex).  It is exact for functions
        that are linear in the metric's parameter and second-order accurate at
        the midpoints for smooth ones, on irregular samples too.

        Parameters
        ----------
        values : array_like, shape (n_0,) or (n_0, m), optional
            A function at the vertices (default: the vertex coordinates, which
            gives the velocity ``dx/dt``).
        metric : see :meth:`hodge_star`

        Examples
        --------
        >>> import wedgepath as wp
        >>> p = wp.Path([[0.0], [1.0], [4.0]], times=[0.0, 1.0, 2.0])
        >>> cx = wp.SimplicialComplex.from_path(p)
        >>> cx.derivative().ravel().tolist()
        [1.0, 3.0]
        """
        h = self._edge_lengths(metric)
        f = self._vertex_values(values)
        E = self._simplices[1]
        df = f[E[:, 1]] - f[E[:, 0]]
        return df / (h if df.ndim == 1 else h[:, None])

    def laplacian(self, metric="time"):
        """The discrete second derivative along a curve, a sparse (n_0, n_0) matrix.

        ``L = -⋆_0^{-1} d_0^T ⋆_1 d_0``: at an interior sample with edge
        lengths ``h_-`` and ``h_+`` on either side,
        ``(L f) = ((f_+ - f)/h_+ - (f - f_-)/h_-) / ((h_- + h_+)/2)``, the
        second derivative (exact for quadratics, on irregular samples too).
        Sign convention: ``L`` approximates ``+d²/ds²`` (negative
        semi-definite); ``-L`` is the Laplace-de Rham operator ``δd``.  At the
        ends of an open curve the dual cell is half an edge and ``L`` is the
        natural (zero-slope, Neumann) one.

        Examples
        --------
        >>> import numpy as np, wedgepath as wp
        >>> t = np.array([0.0, 0.5, 2.0, 2.5])
        >>> cx = wp.SimplicialComplex.from_path(wp.Path(t[:, None], times=t))
        >>> (cx.laplacian() @ t**2)[1:-1].round(12).tolist()     # (t^2)'' = 2
        [2.0, 2.0]
        """
        d0 = self.coboundary(0).astype(np.float64)
        s1 = self.hodge_star(1, metric)
        s0inv = self.hodge_star(0, metric, inverse=True)
        return (-(s0inv @ (d0.T @ (s1 @ d0)))).tocsr()

    def _vertex_values(self, values):
        if values is None:
            return self._vertices
        f = as_float_array(values, "values", ndim=(1, 2))
        if f.shape[0] != self._vertices.shape[0]:
            extra = (" (the complex dropped gap rows; select path rows with cx.vertex_rows)"
                     if self._vertex_rows is not None else "")
            raise ValueError(f"values has {f.shape[0]} rows but the complex has "
                             f"{self._vertices.shape[0]} vertices{extra}")
        return f


def _coef_array(coefficients, n):
    return as_chain_coefficients(coefficients, n)


class WhitneyForm:
    """The Whitney interpolant of a cochain: a k-form, affine on each top simplex.

    Made by :meth:`SimplicialComplex.whitney`.  Integrate it over any chain of
    the complex's k-simplices with ``wp.integrate(W, chain)`` (exact; for
    instance ``wp.integrate(W.d(), S)`` against ``wp.integrate(W,
    S.boundary())``), over every simplex at once with ``cx.de_rham(W)``,
    evaluate it with :meth:`evaluate`, or get it on one top simplex as a sympy
    :class:`Form` with :meth:`form_on`.

    Attributes
    ----------
    complex : SimplicialComplex
    degree : int
    cochain : ndarray (n_k,), read-only
    indices : list of tuple
        The basis k-forms ``dx_I`` (increasing index tuples) of the
        coefficient arrays returned by :meth:`evaluate`.

    Examples
    --------
    >>> import numpy as np, wedgepath as wp
    >>> cx = wp.SimplicialComplex([[0, 0], [2, 0], [0, 2]], [[0, 1, 2]])
    >>> W = cx.whitney(np.array([0.0, 1.0, 1.0]), 0)   # the function x + y over 2
    >>> W.evaluate([[1.0, 0.5]], [0]).ravel().tolist()
    [0.75]
    """

    def __init__(self, complex_, cochain, degree):
        self.complex = complex_
        self.cochain = cochain
        self.degree = degree
        n = complex_.dim
        self.indices = list(combinations(range(n), degree))
        self._gamma = None

    def __repr__(self):
        return f"WhitneyForm(degree={self.degree}, on {self.complex!r})"

    def d(self) -> "WhitneyForm":
        """Exterior derivative: the Whitney form of the coboundary, ``W(d c)``.

        Exact: Whitney interpolation commutes with d (Whitney 1957, ch. IV
        §27), so this equals the derivative of the piecewise-affine form on
        every top simplex.

        Examples
        --------
        >>> import numpy as np, wedgepath as wp
        >>> cx = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        >>> W = cx.whitney(np.array([0.0, 1.0, 3.0]), 0)
        >>> cx.de_rham(W.d()).tolist()          # differences along the edges 01, 02, 12
        [1.0, 3.0, 2.0]
        """
        cx = self.complex
        if self.degree >= cx.top_degree:
            raise ValueError(f"d of a {self.degree}-form on a complex of top degree "
                             f"{cx.top_degree} is zero there; there are no "
                             f"{self.degree + 1}-simplices to carry it")
        return cx.whitney(cx.coboundary(self.degree) @ self.cochain, self.degree + 1)

    def _coefficients(self):
        """Γ (S, K+1, nI): coefficient of dx_I is Σ_j λ_j Γ[s, j, I] on top simplex s."""
        if self._gamma is not None:
            return self._gamma
        cx, k = self.complex, self.degree
        K = cx.top_degree
        _, _, grads = cx._barycentric()  # (S, K+1, n)
        S = grads.shape[0]
        local, ids, signs = cx._top_face_table(k)
        nI = len(self.indices)
        gamma = np.zeros((S, K + 1, nI))
        kf = factorial(k)
        for f, cols in enumerate(local):
            c = self.cochain[ids[f]] * signs[f]  # (S,)
            if not c.any():
                continue
            for i, j in enumerate(cols):
                rest = [cols[a] for a in range(len(cols)) if a != i]
                if k == 0:
                    mnr = np.ones((S, 1))
                else:
                    Gr = np.transpose(grads[:, rest, :], (1, 0, 2))  # (k, S, n)
                    mnr = np.column_stack(minors(Gr, self.indices))
                gamma[:, j, :] += (kf * (-1) ** i) * c[:, None] * mnr
        self._gamma = gamma
        return gamma

    def _lambda(self, points, simplex):
        v0, P, _ = self.complex._barycentric()
        u = np.einsum("mkn,mn->mk", P[simplex], points - v0[simplex])
        return np.column_stack([1.0 - u.sum(axis=1), u])

    def evaluate(self, points, simplex):
        """Coefficients at points, each on a given top simplex.

        Parameters
        ----------
        points : array_like (m, n)
        simplex : array_like of int (m,)
            Index of the top simplex each point is taken on (the form is
            discontinuous across simplices in its normal components).

        Returns
        -------
        ndarray (m, len(indices))
            Coefficient of ``dx_I`` for each ``I`` in :attr:`indices`.
        """
        cx = self.complex
        pts = as_float_array(points, "points", ndim=2)
        if pts.shape[1] != cx.dim:
            raise ValueError(f"points have {pts.shape[1]} coordinates but the complex is in "
                             f"R^{cx.dim}")
        s = np.asarray(simplex)
        if s.dtype.kind not in "iu":
            raise TypeError(f"simplex must hold integer indices of top simplices, got {s.dtype}")
        s = s.astype(np.int64).ravel()
        if s.size and (s.min() < 0 or s.max() >= cx.shape[-1]):
            raise ValueError(f"simplex index out of range: the complex has {cx.shape[-1]} top "
                             "simplices")
        if s.shape[0] != pts.shape[0]:
            raise ValueError(f"{s.shape[0]} simplex indices for {pts.shape[0]} points")
        lam = self._lambda(pts, s)
        return np.einsum("mj,mji->mi", lam, self._coefficients()[s])

    def form_on(self, simplex):
        """The form on one top simplex as a sympy :class:`Form` (affine coefficients).

        Coordinates are the symbols ``x0 .. x{n-1}``; the values are the
        floating-point coefficients converted exactly.

        Examples
        --------
        >>> import numpy as np, wedgepath as wp
        >>> cx = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        >>> cx.whitney(np.array([1.0]), 2).form_on(0).terms_as_dict()
        {(0, 1): 2.0}
        """
        import sympy
        from ..symbolic import to_rational
        cx = self.complex
        s = as_int(simplex, "simplex")
        if not 0 <= s < cx.shape[-1]:
            raise ValueError(f"simplex {s} out of range 0..{cx.shape[-1] - 1}")
        xs = sympy.symbols(f"x0:{cx.dim}")
        v0, P, _ = cx._barycentric()
        u = [sum((to_rational(P[s, a, i]) * (xs[i] - to_rational(v0[s, i]))
                  for i in range(cx.dim)), sympy.Integer(0)) for a in range(cx.top_degree)]
        lam = [1 - sum(u, sympy.Integer(0))] + u
        G = self._coefficients()[s]
        comps = {}
        for col, I in enumerate(self.indices):
            e = sympy.expand(sum((to_rational(G[j, col]) * lam[j] for j in range(len(lam))),
                                 sympy.Integer(0)))
            if e != 0:
                comps[I] = e
        if not comps:
            return Form({}, self.degree, cx.dim, xs)
        return Form(comps, self.degree, cx.dim, xs)

    def integrate_over(self, chain, closure=None, curve="linear"):
        """``integrate(W, chain)``: the chain's coefficients on the complex against ``_de_rham``."""
        if closure is not None or curve != "linear":
            raise ValueError("closure= and curve= apply to paths; a Whitney form is integrated "
                             "over a chain of its complex's simplices as it is")
        cx, k = self.complex, self.degree
        where = (f"a Whitney {k}-form integrates over chains of its complex's {k}-simplices "
                 f"(e.g. cx.chain(coefficients, {k}) or the boundary of such a chain)")
        try:
            if not isinstance(chain, SimplicialChain):
                chain = SimplicialChain.from_chain(chain)
            if chain.degree != k:
                raise ValueError(f"got a {chain.degree}-chain")
            vec = cx.chain_vector(chain)
        except (ValueError, TypeError) as exc:
            raise type(exc)(f"{where}: {exc}") from None
        vals = self._de_rham()
        terms = vec.astype(np.float64) * vals
        value = float(np.sum(terms))
        return Integral(value, error=0.0, exact=True,
                        method="Whitney form over the complex's simplices (exact)",
                        # pairwise summation: about log2(n) roundings of the term sizes
                        rounding=float(EPS * np.abs(terms).sum()
                                       * max(1, int(np.log2(terms.size + 1)))),
                        evaluations=0)

    def _de_rham(self):
        """Exact integrals over the complex's k-simplices (affine: barycentre rule)."""
        cx, k = self.complex, self.degree
        local, ids, _ = cx._top_face_table(k)
        n_k = cx.shape[k]
        # one containing top simplex (and local face) for every k-simplex
        owner = np.full(n_k, -1, dtype=np.int64)
        face = np.zeros(n_k, dtype=np.int64)
        for f in range(len(local) - 1, -1, -1):
            owner[ids[f]] = np.arange(ids.shape[1])
            face[ids[f]] = f
        has = owner >= 0
        out = np.zeros(n_k)
        if not has.any():
            return out
        G = self._coefficients()
        S = cx.simplices(k)[has]
        own, fc = owner[has], face[has]
        loc = np.array(local)[fc]  # (m, k+1) local positions of the face's vertices
        coef = G[own[:, None], loc, :].sum(axis=1) / (k + 1)  # value at the barycentre
        if k == 0:
            out[has] = coef[:, 0]
            return out
        V = cx.vertices[S.T]
        E = V[1:] - V[0]
        mnr = np.column_stack(minors(E, self.indices))
        out[has] = (coef * mnr).sum(axis=1) / factorial(k)
        return out
