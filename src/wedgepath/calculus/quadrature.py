"""Gauss-Legendre rules and the curve models they are applied to.

An m-point Gauss-Legendre rule integrates polynomials of degree up to
``2m - 1`` exactly (Abramowitz & Stegun, Handbook of Mathematical Functions,
§25.4.29).  Rules here are mapped to [0, 1].

A *geometry* describes the segments of one piece of a path as functions of a
local parameter ``s`` in [0, 1]: ``evaluate(seg, s)`` returns the points and
the velocities ``d gamma / d s``.  The linear model is exact for polylines; the
spline model is a piecewise cubic through the samples, parametrised by time.
"""

from __future__ import annotations

from functools import lru_cache
from math import ceil

import numpy as np

__all__ = ["gauss_legendre", "LinearGeometry", "SplineGeometry", "points_needed"]


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

    def evaluate(self, seg: np.ndarray, s: np.ndarray):
        """Points and velocities at local parameters ``s`` of segments ``seg`` (same shape)."""
        d = self.delta[seg]
        return self.start[seg] + s[:, None] * d, d


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

    def lengths(self) -> np.ndarray:
        # chord lengths: a scale for distributing error tolerance, not the arc length
        return np.sqrt(np.einsum("ij,ij->i", self._delta, self._delta))

    def evaluate(self, seg: np.ndarray, s: np.ndarray):
        h = self.h[seg][:, None]
        u = s[:, None] * h
        c0, c1, c2, c3 = (self.c[k][seg] for k in range(4))
        x = ((c0 * u + c1) * u + c2) * u + c3
        v = ((3.0 * c0 * u + 2.0 * c1) * u + c2) * h
        return x, v
