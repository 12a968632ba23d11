"""Chains: integer combinations of oriented paths (1-chains) and points (0-chains).

Integration is linear over chains: ``integrate(w, 2*p - q) ==
2*integrate(w, p) - integrate(w, q)``.  The boundary of a 1-chain is the
0-chain of its pieces' end points minus their start points, so the gradient
theorem reads ``integrate(f.d(), c) == integrate(f, c.boundary())``.
"""

from __future__ import annotations

import numpy as np

from .._validation import (COEF_LIMIT, as_coefficients, as_float_array, as_int, checked_sums,
                           scaled_coefficients)
from .paths import Path

__all__ = ["Chain", "ZeroChain"]


class ZeroChain:
    """An integer combination of points in R^n.

    Equal points are merged (coefficients added) and zero coefficients are
    dropped, so two 0-chains that are equal as chains compare equal.

    Parameters
    ----------
    points : array_like, shape (m, n)
    coefficients : sequence of int, length m

    Examples
    --------
    >>> import wedgepath as wp
    >>> c = wp.ZeroChain([[1, 0], [0, 0], [1, 0]], [1, -1, 1])
    >>> c.points.tolist(), c.coefficients.tolist()
    ([[0.0, 0.0], [1.0, 0.0]], [-1, 2])
    """

    degree = 0

    def __init__(self, points, coefficients, *, dim=None):
        pts = as_float_array(points, "points", ndim=(1, 2))
        if pts.ndim == 1:
            if pts.size == 0 and dim is not None:
                pts = pts.reshape(0, as_int(dim, "dim"))
            else:
                raise ValueError(f"points must be 2-dimensional (m, n), got shape {pts.shape}")
        coef = [as_int(c, "coefficient") for c in coefficients]
        if len(coef) != pts.shape[0]:
            raise ValueError(f"{len(coef)} coefficients for {pts.shape[0]} points")
        carr = as_coefficients(coef)
        if pts.shape[0]:
            uniq, inv = np.unique(pts, axis=0, return_inverse=True)
            inv = inv.ravel()
            order = np.argsort(inv, kind="stable")
            first = np.flatnonzero(np.concatenate(([True], np.diff(inv[order]) != 0)))
            summed = checked_sums(carr[order], first)
            keep = summed != 0
            pts, coef_arr = uniq[keep], summed[keep]
        else:
            coef_arr = np.zeros(0, dtype=np.int64)
        pts.flags.writeable = False
        coef_arr.flags.writeable = False
        self._points = pts
        self._coef = coef_arr

    @property
    def points(self) -> np.ndarray:
        return self._points

    @property
    def coefficients(self) -> np.ndarray:
        """Integer coefficients, one per point."""
        return self._coef

    @property
    def dim(self) -> int:
        return self._points.shape[1]

    def boundary(self) -> int:
        """The boundary of a 0-chain is zero (returned as the integer 0)."""
        return 0

    def is_zero(self) -> bool:
        return self._coef.size == 0

    def __len__(self):
        return self._coef.size

    def __eq__(self, other):
        if isinstance(other, (int, np.integer)) and not isinstance(other, bool) and other == 0:
            return self.is_zero()
        if not isinstance(other, ZeroChain):
            return NotImplemented
        return (self._points.shape == other._points.shape
                and np.array_equal(self._points, other._points)
                and np.array_equal(self._coef, other._coef))

    __hash__ = None

    def __add__(self, other):
        if not isinstance(other, ZeroChain):
            return NotImplemented
        if self.dim != other.dim:
            raise ValueError(f"cannot add 0-chains in R^{self.dim} and R^{other.dim}")
        return ZeroChain(np.vstack([self._points, other._points]),
                         np.concatenate([self._coef, other._coef]).tolist(), dim=self.dim)

    def __neg__(self):
        return ZeroChain(self._points, (-self._coef).tolist(), dim=self.dim)

    def __sub__(self, other):
        if not isinstance(other, ZeroChain):
            return NotImplemented
        return self + (-other)

    def __mul__(self, k):
        k = as_int(k, "chain multiplier")
        return ZeroChain(self._points, scaled_coefficients(self._coef, k).tolist(), dim=self.dim)

    __rmul__ = __mul__

    def __repr__(self):
        return f"ZeroChain({len(self)} points in R^{self.dim})"


class Chain:
    """An integer combination of oriented paths (a 1-chain).

    Parameters
    ----------
    terms : iterable of (Path or array_like, int), or a single Path
        Paths with integer coefficients.  Arrays are turned into paths.  Terms
        holding the same Path object are merged (coefficients added) and zero
        coefficients dropped.

    Examples
    --------
    >>> import wedgepath as wp
    >>> p = wp.Path([[0, 0], [1, 0], [1, 1]])
    >>> q = wp.Path([[1, 1], [0, 1], [0, 0]])
    >>> c = wp.Chain([(p, 1), (q, 1)])
    >>> c.boundary().is_zero()          # p then q is a closed loop
    True
    >>> (2 * c - c).coefficients
    (1, 1)
    """

    degree = 1

    def __init__(self, terms=()):
        if isinstance(terms, Path):
            terms = [(terms, 1)]
        paths, coefs, slot = [], [], {}
        for item in terms:
            try:
                path, c = item
            except (TypeError, ValueError):
                raise TypeError("Chain terms must be (path, integer coefficient) pairs") from None
            if not isinstance(path, Path):
                path = Path(path)
            c = as_int(c, "chain coefficient")
            k = slot.get(id(path))
            if k is not None:  # the same Path object: add coefficients
                coefs[k] += c
            else:
                slot[id(path)] = len(paths)
                paths.append(path)
                coefs.append(c)
        if any(abs(c) > COEF_LIMIT for c in coefs):
            raise ValueError("chain coefficients exceed the supported range +-2**62")
        keep = [k for k, c in enumerate(coefs) if c != 0]
        paths = [paths[k] for k in keep]
        coefs = [coefs[k] for k in keep]
        dims = {p.dim for p in paths}
        if len(dims) > 1:
            raise ValueError(f"all paths of a chain must have the same number of channels, got {sorted(dims)}")
        self._paths = tuple(paths)
        self._coef = tuple(coefs)

    @property
    def paths(self) -> tuple:
        return self._paths

    @property
    def coefficients(self) -> tuple:
        """Integer coefficients, one per path."""
        return self._coef

    @property
    def terms(self):
        return tuple(zip(self._paths, self._coef))

    @property
    def dim(self):
        return self._paths[0].dim if self._paths else None

    def boundary(self) -> ZeroChain:
        """The 0-chain sum_k c_k (end_k - start_k), piece by piece across gaps."""
        pts, coef = [], []
        for path, c in self.terms:
            for pc in path.pieces:
                if pc.n_samples < 2:
                    continue
                pts.extend([pc.points[-1], pc.points[0]])
                coef.extend([c, -c])
        dim = self.dim if self.dim is not None else 0
        if not pts:
            return ZeroChain(np.zeros((0, dim)), [], dim=dim)
        return ZeroChain(np.array(pts), coef, dim=dim)

    def __len__(self):
        return len(self._paths)

    def __iter__(self):
        return iter(self.terms)

    def _coerce(self, other):
        if isinstance(other, Chain):
            return other
        if isinstance(other, Path):
            return Chain([(other, 1)])
        return None

    def __add__(self, other):
        o = self._coerce(other)
        if o is None:
            return NotImplemented
        return Chain(self.terms + o.terms)

    __radd__ = __add__

    def __neg__(self):
        return Chain([(p, -c) for p, c in self.terms])

    def __sub__(self, other):
        o = self._coerce(other)
        if o is None:
            return NotImplemented
        return self + (-o)

    def __rsub__(self, other):
        o = self._coerce(other)
        if o is None:
            return NotImplemented
        return o + (-self)

    def __mul__(self, k):
        k = as_int(k, "chain multiplier")
        return Chain([(p, k * c) for p, c in self.terms])

    __rmul__ = __mul__

    def __repr__(self):
        body = " ".join(f"{'+' if c > 0 else '-'} {abs(c)}*{p!r}" for p, c in self.terms)
        return f"Chain({body.lstrip('+ ') if body else '0'})"
