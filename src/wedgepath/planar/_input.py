"""Input handling shared by the planar functions.

Every planar entry point accepts a 2-channel :class:`~wedgepath.Path` or a
``(T, 2)`` array.  :func:`planar_path` and :func:`closed_pieces` turn either
into a list of closed pieces (one float64 array per gap-free run, last row
equal to the first), applying the ``closure=`` convention and refusing input
that is not planar with a message that points at ``path.plane(i, j)``.  They
live in the calculus layer (:mod:`wedgepath.calculus.green`, whose region
integrals need them too) and are re-exported here for the planar modules.
"""

from __future__ import annotations

import numpy as np

from .._results import default_names
from ..calculus.green import closed_pieces, finite_result, planar_path
from ..calculus.paths import CLOSURES

__all__ = ["planar_path", "closed_pieces", "drop_repeats", "finite_result", "REGION_CLOSURES",
           "plane_names"]

#: Closure conventions accepted by region quantities (the same as everywhere).
REGION_CLOSURES = CLOSURES


def plane_names(path) -> tuple:
    """The channel names of a planar path (from :func:`planar_path`), ``("0", "1")`` without."""
    if path is None or path.names is None:
        return default_names(2)
    return tuple(path.names)


def drop_repeats(pts: np.ndarray) -> np.ndarray:
    """Remove consecutive repeated rows (zero-length segments) of a closed piece."""
    if pts.shape[0] < 2:
        return pts
    keep = np.ones(pts.shape[0], dtype=bool)
    keep[1:] = np.any(pts[1:] != pts[:-1], axis=1)
    if keep.all():
        return pts
    return pts[keep]
