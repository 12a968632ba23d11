"""Input handling shared by the planar functions.

Every planar entry point accepts a 2-channel :class:`~wedgepath.Path` or a
``(T, 2)`` array.  These helpers turn either into a list of closed pieces
(one float64 array per gap-free run, last row equal to the first), applying
the ``closure=`` convention and refusing input that is not planar with a
message that points at ``path.plane(i, j)``.
"""

from __future__ import annotations

import numpy as np

from .._validation import as_float_array, check_choice
from ..calculus.paths import CLOSURES, Path

__all__ = ["planar_path", "closed_pieces", "drop_repeats", "finite_result", "REGION_CLOSURES"]

#: Closure conventions accepted by region quantities (the same as everywhere).
REGION_CLOSURES = CLOSURES


def _not_planar(fname: str, n: int) -> ValueError:
    return ValueError(
        f"{fname} needs a planar path with 2 channels, got {n}; select a coordinate "
        f"plane first, e.g. path.plane(0, 1)")


def planar_path(obj, fname: str):
    """Return ``obj`` as a 2-channel :class:`Path`, or None when it has < 2 samples.

    A ``(0, 2)`` or ``(1, 2)`` array has no segment: callers treat it as an
    empty curve (area 0) rather than an error.
    """
    if isinstance(obj, Path):
        if obj.dim != 2:
            raise _not_planar(fname, obj.dim)
        return obj
    names = None
    if hasattr(obj, "columns") and not isinstance(obj, np.ndarray):
        names = [str(c) for c in obj.columns]
    arr = as_float_array(obj, "path", ndim=(1, 2), allow_nan=True, copy=False)
    if arr.ndim == 1:
        raise ValueError(f"{fname} needs points of shape (T, 2), got shape {arr.shape}; "
                         "a single channel has no area")
    if arr.shape[1] != 2:
        raise _not_planar(fname, arr.shape[1])
    if arr.shape[0] < 2:
        return None
    if np.isnan(arr).all():
        return None
    # Path copies the data, so the caller's array is never touched.
    return Path(arr, names=names)


def closed_pieces(path, closure: str, fname: str) -> list:
    """Closed gap-free pieces of a planar path as float64 arrays (K+1, 2).

    Each returned array ends with its first row.  Pieces with a single sample
    are dropped (they bound nothing).  ``closure="none"`` refuses a piece that
    does not end where it starts, naming the other options.
    """
    check_choice(closure, "closure", REGION_CLOSURES)
    if path is None:
        return []
    out = []
    for k, pc in enumerate(path.pieces):
        if pc.n_samples < 2:
            continue
        pts = pc.points
        if closure == "none":
            if not np.array_equal(pts[0], pts[-1]):
                gap = float(np.hypot(*(pts[-1] - pts[0])))
                where = f"piece {k} of the path" if len(path.pieces) > 1 else "the path"
                raise ValueError(
                    f"{fname} needs a closed curve, but {where} ends {gap:.6g} away from its "
                    "start and closure='none'; choose closure='chord' (the default), "
                    "'detrend' or 'require' (options: 'none', 'chord', 'detrend', 'require')")
        else:
            pts = pc.close(closure).points
        out.append(pts)
    return out


def drop_repeats(pts: np.ndarray) -> np.ndarray:
    """Remove consecutive repeated rows (zero-length segments) of a closed piece."""
    if pts.shape[0] < 2:
        return pts
    keep = np.ones(pts.shape[0], dtype=bool)
    keep[1:] = np.any(pts[1:] != pts[:-1], axis=1)
    if keep.all():
        return pts
    return pts[keep]


def finite_result(value, fname: str):
    """Return ``value`` if finite, else refuse: the coordinates overflowed float64."""
    if not np.all(np.isfinite(value)):
        raise ValueError(f"{fname}: the result overflows float64 for coordinates this large; "
                         "rescale the path (e.g. divide it by its largest value)")
    return value
