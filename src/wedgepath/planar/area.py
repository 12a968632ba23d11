"""Signed area and region moments of closed planar curves.

Both are winding-weighted integrals over the plane, evaluated on the boundary
by Green's theorem with the vertex formulas of a polygon (common practice, no
source): with ``c_k = x_k y_{k+1} - x_{k+1} y_k``,

* ``area   = (1/2)  sum c_k``
* ``int_x  = (1/6)  sum (x_k + x_{k+1}) c_k``
* ``int_xx = (1/12) sum (x_k^2 + x_k x_{k+1} + x_{k+1}^2) c_k``
* ``int_xy = (1/24) sum (x_k y_{k+1} + 2 x_k y_k + 2 x_{k+1} y_{k+1} + x_{k+1} y_k) c_k``

and the same with x and y swapped.  Coordinates are taken relative to a
reference point near the curve (the mean vertex), so a loop far from the
origin keeps full relative precision; moments about the origin are then
recovered with the parallel-axis shifts.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from .._results import Result, fmt_number
from .._scaling import pow2_exponent, pow2_scale
from ..calculus.green import bounds_nothing as _too_few_points
from ._input import closed_pieces, finite_result, planar_path, plane_names

__all__ = ["signed_area", "region_moments", "RegionMoments"]


def signed_area(path2d, closure="chord") -> float:
    """Oriented area of a closed planar curve, ``(1/2) closed-integral (x dy - y dx)``.

    Equal to the integral of the winding number over the plane: positive
    for counter-clockwise travel, negative for clockwise, and lobes of a
    self-crossing curve count with their winding number (a figure-eight
    nets about zero; see :func:`decompose` to see its lobes).

    Parameters
    ----------
    path2d : Path or array_like, shape (T, 2)
        A planar curve; for an n-channel path pass ``path.plane(i, j)``.
        NaN rows split it into pieces, each closed on its own; their areas
        add up.
    closure : {"chord", "detrend", "require", "none"}
        How open pieces are closed.  The default ``"chord"`` appends the
        straight segment back to the first sample (the result is then the
        Lévy area of an open path).  ``"none"`` refuses open pieces.

    Returns
    -------
    float
        The shoelace sum, computed relative to the mean vertex of each piece.
        A curve with fewer than 3 distinct points has area 0.0.

    Examples
    --------
    >>> import wedgepath as wp
    >>> wp.signed_area([[0, 0], [2, 0], [2, 1], [0, 1]])
    2.0
    >>> wp.signed_area([[0, 0], [0, 1], [2, 1], [2, 0]])     # clockwise
    -2.0
    >>> wp.signed_area([[1e9, 1e9], [1e9 + 2, 1e9], [1e9 + 2, 1e9 + 1], [1e9, 1e9 + 1]])
    2.0
    >>> wp.signed_area([[0, 0], [1, 1]])                    # too few points
    0.0

    An open path needs a closure; ``closure="none"`` says which exist:

    >>> wp.signed_area([[0, 0], [1, 0], [1, 1]], closure="none")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    ValueError: signed_area needs a closed curve, ... 'detrend' or 'require' (options: ...)
    """
    path = planar_path(path2d, "signed_area")
    total = 0.0
    with np.errstate(over="ignore", invalid="ignore"):
        for pts in closed_pieces(path, closure, "signed_area"):
            total += _piece_area(pts)
    return float(finite_result(total, "signed_area"))


def _piece_area(pts: np.ndarray) -> float:
    if _too_few_points(pts):
        return 0.0
    c = pts - pts[:-1].mean(axis=0)
    return 0.5 * _cross_sum(c[:, 0], c[:, 1])


def _cross_sum(x, y, step=1 << 16):
    """``sum_k (x_k y_{k+1} - x_{k+1} y_k)`` with controlled summation error.

    numpy's pairwise summation within chunks of ``step`` terms, and the
    chunk sums added exactly (``math.fsum``): the rounding error stays a few
    units of ``eps * sum |terms|`` however long the curve, and memory stays
    bounded by the chunk.
    """
    parts = []
    for a in range(0, x.shape[0] - 1, step):
        b = min(a + step, x.shape[0] - 1)
        parts.append(float(np.sum(x[a:b] * y[a + 1:b + 1] - x[a + 1:b + 1] * y[a:b])))
    return math.fsum(parts)


def _raw_moments(pts: np.ndarray, ref: np.ndarray) -> np.ndarray:
    """[A, Sx, Sy, Sxx, Sxy, Syy] of one closed piece about ``ref``."""
    if _too_few_points(pts):
        return np.zeros(6)
    c = pts - ref
    x0, y0 = c[:-1, 0], c[:-1, 1]
    x1, y1 = c[1:, 0], c[1:, 1]
    cr = x0 * y1 - x1 * y0
    return np.array([
        cr.sum() / 2.0,
        ((x0 + x1) * cr).sum() / 6.0,
        ((y0 + y1) * cr).sum() / 6.0,
        ((x0 * x0 + x0 * x1 + x1 * x1) * cr).sum() / 12.0,
        ((x0 * y1 + 2.0 * x0 * y0 + 2.0 * x1 * y1 + x1 * y0) * cr).sum() / 24.0,
        ((y0 * y0 + y0 * y1 + y1 * y1) * cr).sum() / 12.0,
    ])


@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class RegionMoments(Result):
    """Winding-weighted area moments of a closed planar curve.

    Every quantity is an integral over the plane weighted by the winding
    number ``w(x, y)``, so a clockwise loop has negative area and negative
    moments while its centroid and its central moments *divided by the
    area* match the counter-clockwise loop.

    Attributes
    ----------
    area : float
        ``∬ w dA`` (the signed area).
    int_x, int_y : float
        First moments ``∬ w x dA``, ``∬ w y dA``.
    int_xx, int_xy, int_yy : float
        Second moments about the origin ``∬ w x^2 dA``, ``∬ w x y dA``,
        ``∬ w y^2 dA``.
    centroid : tuple of float or None
        ``(int_x / area, int_y / area)``; None when the area is 0 (for
        example a balanced figure-eight), where no centroid exists.
    central : tuple of float or None
        Second moments about the centroid ``(∬ w (x-cx)^2, ∬ w (x-cx)(y-cy),
        ∬ w (y-cy)^2)``; None when the area is 0.
    I_x, I_y, I_xy : float or None
        Engineering names for the centroidal second moments of area:
        ``I_x = ∬ w (y-cy)^2 dA`` (about the horizontal axis through the
        centroid), ``I_y = ∬ w (x-cx)^2 dA`` and the product
        ``I_xy = ∬ w (x-cx)(y-cy) dA``.
    names : tuple of str
        The two channels (x, y): the path's names, or ``("0", "1")``.
    closure : str
        How open pieces were closed.
    units : mapping or None

    ``to_frame()`` is one row: ``area, int_x, int_y, int_xx, int_xy, int_yy,
    centroid_x, centroid_y, I_x, I_y, I_xy`` (NaN where there is no centroid).
    """

    area: float
    int_x: float
    int_y: float
    int_xx: float
    int_xy: float
    int_yy: float
    centroid: tuple | None
    central: tuple | None
    names: tuple = ("0", "1")
    closure: str = "chord"
    units: Mapping | None = None

    def to_frame(self):
        """One row: the moments, the centroid and the centroidal moments."""
        import pandas as pd

        nan = float("nan")
        cx, cy = self.centroid if self.centroid is not None else (nan, nan)
        row = {"area": self.area, "int_x": self.int_x, "int_y": self.int_y,
               "int_xx": self.int_xx, "int_xy": self.int_xy, "int_yy": self.int_yy,
               "centroid_x": cx, "centroid_y": cy,
               "I_x": nan if self.I_x is None else self.I_x,
               "I_y": nan if self.I_y is None else self.I_y,
               "I_xy": nan if self.I_xy is None else self.I_xy}
        return pd.DataFrame({k: [v] for k, v in row.items()})

    def _summary_items(self):
        c = "None" if self.centroid is None else \
            "(" + ", ".join(fmt_number(v) for v in self.centroid) + ")"
        return [("area", fmt_number(self.area)), ("centroid", c),
                ("names", repr(list(self.names)))]

    @property
    def I_x(self):  # noqa: N802 - engineering notation
        """Second moment of area about the horizontal centroidal axis, ``∬ w (y-cy)^2 dA``."""
        return None if self.central is None else self.central[2]

    @property
    def I_y(self):  # noqa: N802
        """Second moment of area about the vertical centroidal axis, ``∬ w (x-cx)^2 dA``."""
        return None if self.central is None else self.central[0]

    @property
    def I_xy(self):  # noqa: N802
        """Product moment of area about the centroid, ``∬ w (x-cx)(y-cy) dA``."""
        return None if self.central is None else self.central[1]


def region_moments(path2d, closure="chord") -> RegionMoments:
    """Area, centroid and second moments of the winding-weighted region of a loop.

    Parameters
    ----------
    path2d : Path or array_like, shape (T, 2)
        A planar curve; for an n-channel path pass ``path.plane(i, j)``.
        NaN rows split it into pieces; each is closed on its own and the
        moments add up.
    closure : {"chord", "detrend", "require", "none"}
        How open pieces are closed (default ``"chord"``).

    Returns
    -------
    RegionMoments
        With ``area``, first and second moments about the origin,
        ``centroid`` and centroidal moments (``central``, ``I_x``, ``I_y``,
        ``I_xy``).

    Notes
    -----
    Each piece is integrated relative to one common reference point (the
    mean of all vertices); the centroidal moments are formed in that frame,
    so they keep full precision for loops far from the origin.

    Examples
    --------
    A 4 x 2 rectangle: ``I_x = b h^3 / 12 = 4 * 8 / 12``:

    >>> import wedgepath as wp
    >>> m = wp.region_moments([[0, 0], [4, 0], [4, 2], [0, 2]])
    >>> m.area, m.centroid
    (8.0, (2.0, 1.0))
    >>> round(m.I_x, 12), round(m.I_y, 12), round(m.I_xy, 12)
    (2.666666666667, 10.666666666667, 0.0)

    A figure-eight has no centroid:

    >>> eight = [[0, 0], [1, 1], [1, 0], [0, 1]]
    >>> print(wp.region_moments(eight).centroid)
    None
    """
    path = planar_path(path2d, "region_moments")
    pieces = closed_pieces(path, closure, "region_moments")
    # A curve of extreme magnitude is scaled by a power of two (exact) so that
    # third and fourth powers of its coordinates neither overflow nor
    # underflow; each moment is scaled back by its own power.
    k = pow2_exponent(pieces, safe=64)
    if k:
        pieces = [pow2_scale(p, -k) for p in pieces]
    raw = np.zeros(6)
    with np.errstate(over="ignore", invalid="ignore"):
        ref = np.concatenate([p[:-1] for p in pieces]).mean(axis=0) if pieces else np.zeros(2)
        for pts in pieces:
            raw += _raw_moments(pts, ref)
        a, sx, sy, sxx, sxy, syy = raw
        rx, ry = ref
        about_origin = np.array([
            sx + rx * a,                                  # int_x
            sy + ry * a,                                  # int_y
            sxx + 2.0 * rx * sx + rx * rx * a,            # int_xx
            sxy + rx * sy + ry * sx + rx * ry * a,        # int_xy
            syy + 2.0 * ry * sy + ry * ry * a,            # int_yy
        ])
    finite_result(raw, "region_moments")
    finite_result(about_origin, "region_moments")
    a, sx, sy, sxx, sxy, syy = (float(v) for v in raw)
    rx, ry = float(ref[0]), float(ref[1])
    if a == 0.0:
        centroid = central = None
    else:
        cx, cy = sx / a, sy / a
        centroid = (cx + rx, cy + ry)
        central = (sxx - cx * sx, sxy - cx * sy, syy - cy * sy)
    powers = np.array([2, 3, 3, 4, 4, 4])
    raw = pow2_scale(raw, k * powers)
    about_origin = pow2_scale(about_origin, k * powers[1:])
    if centroid is not None:
        centroid = tuple(float(v) for v in pow2_scale(np.array(centroid), k))
        central = tuple(float(v) for v in pow2_scale(np.array(central), 4 * k))
    finite_result(raw, "region_moments")
    finite_result(about_origin, "region_moments")
    if central is not None:
        finite_result(central, "region_moments")
    a = float(raw[0])
    int_x, int_y, int_xx, int_xy, int_yy = (float(v) for v in about_origin)
    return RegionMoments(area=a, int_x=int_x, int_y=int_y, int_xx=int_xx, int_xy=int_xy,
                         int_yy=int_yy, centroid=centroid, central=central,
                         names=plane_names(path), closure=closure)
