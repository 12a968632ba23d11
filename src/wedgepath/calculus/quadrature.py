"""Gauss-Legendre and Gauss-Kronrod rules and the curve models they are applied to.

An m-point Gauss-Legendre rule integrates polynomials of degree up to
``2m - 1`` exactly (Abramowitz & Stegun, Handbook of Mathematical Functions,
§25.4.29).  The Gauss-Kronrod rule of ``2n + 1`` points adds ``n + 1`` nodes to
the n-point Gauss rule and integrates polynomials of degree ``3n + 1``
exactly; the difference of the two rules on the same function values is the
raw material of the adaptive error estimates (R. Piessens, E. de
Doncker-Kapenga, C. W. Überhuber and D. K. Kahaner, QUADPACK, Springer 1983,
§2.2).  Its nodes and weights are computed for any n with Laurie's algorithm
(D. P. Laurie, "Calculation of Gauss-Kronrod quadrature rules", Math. Comp. 66
(1997) 1133-1145).  Rules here are mapped to [0, 1].

A *geometry* describes the segments of one piece of a path as functions of a
local parameter ``s`` in [0, 1]: ``evaluate(seg, s)`` returns the points and
the velocities ``d gamma / d s``.  The linear model is exact for polylines; the
spline model is a piecewise cubic through the samples, parametrised by time.
"""

from __future__ import annotations

from functools import lru_cache
from math import ceil

import numpy as np

__all__ = ["gauss_legendre", "gauss_kronrod", "LinearGeometry", "SplineGeometry", "points_needed"]


@lru_cache(maxsize=64)
def _gl(m: int):
    x, w = np.polynomial.legendre.leggauss(m)
    x = 0.5 * (x + 1.0)
    w = 0.5 * w
    x.flags.writeable = False
    w.flags.writeable = False
    return x, w


def gauss_legendre(m: int, interval=(0.0, 1.0)):
    """Nodes and weights of the m-point Gauss-Legendre rule on ``interval``.

    Exact for polynomials of degree ``2m - 1``.

    Examples
    --------
    >>> from wedgepath.calculus.quadrature import gauss_legendre
    >>> x, w = gauss_legendre(2, (-1, 1))
    >>> x.round(6).tolist(), w.tolist()
    ([-0.57735, 0.57735], [1.0, 1.0])
    """
    if isinstance(m, bool) or not isinstance(m, (int, np.integer)) or m < 1:
        raise ValueError(f"number of Gauss points must be a positive integer, got {m!r}")
    x, w = _gl(int(m))
    a, b = float(interval[0]), float(interval[1])
    return a + (b - a) * x, (b - a) * w


def _kronrod_recurrence(n: int, a0: np.ndarray, b0: np.ndarray):
    """Recurrence coefficients of the Jacobi-Kronrod matrix of order 2n + 1 (Laurie 1997).

    ``a0, b0``: the first ``ceil(3n/2) + 1`` recurrence coefficients of the
    monic orthogonal polynomials of the weight (``b0[0]`` its total mass).
    """
    a = np.zeros(2 * n + 1)
    b = np.zeros(2 * n + 1)
    a[:n * 3 // 2 + 1] = a0[:n * 3 // 2 + 1]
    b[:ceil(3 * n / 2) + 1] = b0[:ceil(3 * n / 2) + 1]
    s = np.zeros(n // 2 + 2)
    t = np.zeros(n // 2 + 2)
    t[1] = b[n + 1]
    for m in range(n - 1):
        k = np.arange((m + 1) // 2, -1, -1)
        el = m - k
        s[k + 1] = np.cumsum((a[k + n + 1] - a[el]) * t[k + 1] + b[k + n + 1] * s[k]
                             - b[el] * s[k + 1])
        s, t = t, s
    j = np.arange(n // 2, -1, -1)
    s[j + 1] = s[j]
    for m in range(n - 1, 2 * n - 2):
        k = np.arange(m + 1 - n, (m - 1) // 2 + 1)
        el = m - k
        j = n - 1 - el
        s[j + 1] = np.cumsum(-(a[k + n + 1] - a[el]) * t[j + 1] - b[k + n + 1] * s[j + 1]
                             + b[el] * s[j + 2])
        jj = int(j[-1])
        kk = (m + 1) // 2
        if m % 2 == 0:
            a[kk + n + 1] = a[kk] + (s[jj + 1] - b[kk + n + 1] * s[jj + 2]) / t[jj + 2]
        else:
            b[kk + n + 1] = s[jj + 1] / s[jj + 2]
        s, t = t, s
    a[2 * n] = a[n - 1] - b[2 * n] * s[1] / t[1]
    return a, b


@lru_cache(maxsize=16)
def _gk(n: int):
    m = ceil(3 * n / 2) + 1
    k = np.arange(m, dtype=np.float64)
    a0 = np.zeros(m)
    b0 = np.where(k == 0, 2.0, k * k / np.maximum(4.0 * k * k - 1.0, 1.0))  # monic Legendre
    a, b = _kronrod_recurrence(n, a0, b0)
    J = np.diag(a) + np.diag(np.sqrt(b[1:]), 1) + np.diag(np.sqrt(b[1:]), -1)
    x = np.linalg.eigvalsh(J)             # Golub-Welsch: the nodes are the eigenvalues
    x = 0.5 * (x - x[::-1])               # exact symmetry
    xg, wg = np.polynomial.legendre.leggauss(n)
    x[1::2] = xg                          # the Gauss nodes are every other Kronrod node
    # interpolatory weights: exact for the Legendre polynomials P_0 .. P_2n at these nodes
    # (a well-conditioned system: condition number below 15 for n <= 30)
    rhs = np.zeros(2 * n + 1)
    rhs[0] = 2.0
    w = np.linalg.solve(np.polynomial.legendre.legvander(x, 2 * n).T, rhs)
    w = 0.5 * (w + w[::-1])
    wgk = np.zeros_like(w)
    wgk[1::2] = wg
    out = (0.5 * (x + 1.0), 0.5 * w, 0.5 * wgk)
    for arr in out:
        arr.flags.writeable = False
    return out


def gauss_kronrod(n: int):
    """The (2n+1)-point Gauss-Kronrod rule on [0, 1] and its embedded n-point Gauss rule.

    Returns ``(x, wk, wg)``: the 2n + 1 nodes in increasing order, the
    Kronrod weights (exact for degree ``3n + 1``) and the Gauss weights on
    the same nodes (zero at the n + 1 Kronrod-only nodes; exact for degree
    ``2n - 1``).  All read-only.

    Examples
    --------
    >>> from wedgepath.calculus.quadrature import gauss_kronrod
    >>> x, wk, wg = gauss_kronrod(7)            # G7/K15, as in QUADPACK's QK15
    >>> x.shape, round(float(wk.sum()), 15), round(float(wg.sum()), 15)
    ((15,), 1.0, 1.0)
    >>> round(float(2 * x[-1] - 1), 12)          # largest node on [-1, 1]
    0.991455371121
    """
    if isinstance(n, bool) or not isinstance(n, (int, np.integer)) or n < 1:
        raise ValueError(f"number of Gauss points must be a positive integer, got {n!r}")
    return _gk(int(n))


def points_needed(poly_degree: int) -> int:
    """Gauss points that integrate a polynomial of ``poly_degree`` exactly."""
    return max(1, ceil((poly_degree + 1) / 2))


class LinearGeometry:
    """Straight segments between consecutive rows of ``points`` (K+1, n)."""

    #: the pulled-back integrand of a degree-d polynomial 1-form has degree d
    degree_factor, degree_offset = 1, 0

    def __init__(self, points: np.ndarray):
        self._set(points[:-1], np.diff(points, axis=0))

    @classmethod
    def from_segments(cls, start: np.ndarray, delta: np.ndarray) -> "LinearGeometry":
        """Segments given directly by start points and increments, shape (K, n) each."""
        self = object.__new__(cls)
        self._set(start, delta)
        return self

    def _set(self, start, delta):
        self.start = start
        self.delta = delta
        self.n_segments = delta.shape[0]
        self.dim = delta.shape[1]

    def lengths(self) -> np.ndarray:
        return np.sqrt(np.einsum("ij,ij->i", self.delta, self.delta))

    def bounds(self):
        """Lower and upper corner of the bounding box of the segments."""
        if self.n_segments == 0:
            return np.zeros(self.dim), np.zeros(self.dim)
        end = self.start + self.delta
        return (np.minimum(self.start.min(axis=0), end.min(axis=0)),
                np.maximum(self.start.max(axis=0), end.max(axis=0)))

    def evaluate(self, seg: np.ndarray, s: np.ndarray):
        """Points and velocities at local parameters ``s`` of segments ``seg`` (same shape)."""
        d = self.delta[seg]
        return self.start[seg] + s[:, None] * d, d

    def evaluate_cells(self, seg: np.ndarray, s: np.ndarray):
        """Points (B, m, n) and velocities (B, 1, n) at parameters ``s`` (B, m) of segments ``seg`` (B,)."""
        d = self.delta[seg][:, None, :]
        return self.start[seg][:, None, :] + s[:, :, None] * d, d


class SplineGeometry:
    """Cubic spline through the samples, parametrised by ``times``.

    ``periodic`` selects periodic end conditions (for a piece whose last
    sample equals its first), otherwise not-a-knot.
    """

    #: x(t) cubic, x'(t) quadratic: a degree-d form pulls back to degree 3d + 2
    degree_factor, degree_offset = 3, 2

    def __init__(self, points: np.ndarray, times: np.ndarray, periodic: bool):
        T = points.shape[0]
        if T == 2:
            bc = "not-a-knot"
            periodic = False
        else:
            bc = "periodic" if periodic else "not-a-knot"
        if periodic and T == 3:
            # two distinct samples: a periodic cubic is ill-posed, use the closed polyline
            bc = "not-a-knot"
        from scipy.interpolate import CubicSpline   # on first use: scipy.interpolate is heavy

        cs = CubicSpline(times, points, axis=0, bc_type=bc)
        self.c = cs.c  # (4, K, n), local variable u = t - t_k
        self.h = np.diff(times)
        self.n_segments = self.h.shape[0]
        self.dim = points.shape[1]
        self._delta = np.diff(points, axis=0)
        self._corners = (points.min(axis=0), points.max(axis=0))

    def lengths(self) -> np.ndarray:
        # chord lengths: a scale for distributing error tolerance, not the arc length
        return np.sqrt(np.einsum("ij,ij->i", self._delta, self._delta))

    def bounds(self):
        """Lower and upper corner of the bounding box of the samples."""
        return self._corners

    def evaluate(self, seg: np.ndarray, s: np.ndarray):
        h = self.h[seg][:, None]
        u = s[:, None] * h
        c0, c1, c2, c3 = (self.c[k][seg] for k in range(4))
        x = ((c0 * u + c1) * u + c2) * u + c3
        v = ((3.0 * c0 * u + 2.0 * c1) * u + c2) * h
        return x, v

    def evaluate_cells(self, seg: np.ndarray, s: np.ndarray):
        """Points and velocities (B, m, n) at parameters ``s`` (B, m) of segments ``seg`` (B,)."""
        h = self.h[seg][:, None, None]
        u = s[:, :, None] * h
        c0, c1, c2, c3 = (self.c[k][seg][:, None, :] for k in range(4))
        x = ((c0 * u + c1) * u + c2) * u + c3
        v = ((3.0 * c0 * u + 2.0 * c1) * u + c2) * h
        return x, v
