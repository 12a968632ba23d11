"""Asynchronous channels: put channels with their own time stamps on one time grid."""

from __future__ import annotations

from collections.abc import Mapping

import numpy as np

from .._validation import as_float_array, check_names
from ..calculus.paths import Path

__all__ = ["align"]


def _series_parts(s, label):
    t = s.index.to_numpy()
    if t.dtype.kind in "mM":
        raise TypeError(f"channel {label!r} is indexed by datetimes; convert the index to "
                        "numbers first (e.g. seconds since the start)")
    return t, s.to_numpy()


def align(channels, *, times=None, names=None) -> Path:
    """Align channels sampled at different times onto the union of their time stamps.

    Each channel is a sampled curve of its own, piecewise linear in time (the
    library's linear curve model).  Every channel is linearly interpolated
    at every time stamp of every other channel, over the span all channels
    cover (from the latest first stamp to the earliest last stamp).  Between
    two consecutive union stamps every channel is then linear in time, so
    the aligned polyline *is* the joint curve of the linear model: areas of
    the aligned path are exact for that model, not an approximation.

    A NaN sample of a channel is a gap: union stamps whose interpolation
    would use it become NaN rows, which the area functions treat as gaps.

    Parameters
    ----------
    channels : sequence of 1-D arrays, or mapping name -> 1-D array / pandas Series
        The values of each channel.  A pandas Series carries its own time
        stamps in its (numeric) index.
    times : sequence of 1-D arrays, optional
        One strictly increasing time array per channel (required unless the
        channels are Series).
    names : sequence of str, optional
        Channel names (taken from the mapping keys or Series names otherwise).

    Returns
    -------
    Path
        Points (T, n) on the union time grid, with ``times`` and ``names``.

    Examples
    --------
    >>> import wedgepath as wp
    >>> p = wp.align([[0.0, 2.0, 4.0], [1.0, 3.0]], times=[[0, 2, 4], [1, 3]], names=["a", "b"])
    >>> p.times
    array([1., 2., 3.])
    >>> p.points
    array([[1., 1.],
           [2., 2.],
           [3., 3.]])
    """
    labels = None
    if isinstance(channels, Mapping):
        labels = [str(k) for k in channels.keys()]
        items = list(channels.values())
    elif isinstance(channels, (list, tuple)):
        items = list(channels)
    else:
        raise TypeError("channels must be a list of 1-D arrays or Series, or a mapping "
                        f"name -> channel; got {type(channels).__name__}")
    n = len(items)
    if n < 2:
        raise ValueError(f"align needs at least 2 channels, got {n}")
    if labels is None and all(hasattr(s, "index") and hasattr(s, "name") for s in items):
        if all(s.name is not None for s in items):
            labels = [str(s.name) for s in items]
    if names is not None:
        names = check_names(names, n)
        if labels is not None and list(names) != labels and isinstance(channels, Mapping):
            raise ValueError(f"names {list(names)} do not match the mapping keys {labels}")
        labels = list(names)
    ts, xs = [], []
    if times is None:
        for k, s in enumerate(items):
            if not (hasattr(s, "index") and hasattr(s, "to_numpy")):
                raise ValueError("times are needed: pass one time array per channel "
                                 "(times=[t0, t1, ...]) or pandas Series indexed by time")
            t, x = _series_parts(s, labels[k] if labels else k)
            ts.append(t)
            xs.append(x)
    else:
        if not isinstance(times, (list, tuple)) or len(times) != n:
            got = len(times) if isinstance(times, (list, tuple)) else type(times).__name__
            raise ValueError(f"times must be a list with one time array per channel "
                             f"({n} channels), got {got}")
        for s in items:
            xs.append(s.to_numpy() if hasattr(s, "to_numpy") and not isinstance(s, np.ndarray) else s)
        ts = list(times)
    T_list, X_list = [], []
    for k in range(n):
        label = labels[k] if labels else k
        x = as_float_array(xs[k], f"channel {label!r}", ndim=1, allow_nan=True)
        t = as_float_array(ts[k], f"times of channel {label!r}", ndim=1)
        if t.shape[0] != x.shape[0]:
            raise ValueError(f"channel {label!r} has {x.shape[0]} samples but {t.shape[0]} times")
        if x.shape[0] < 2:
            raise ValueError(f"channel {label!r} has {x.shape[0]} sample(s); at least 2 are needed")
        d = np.diff(t)
        if not np.all(d > 0):
            j = int(np.flatnonzero(~(d > 0))[0])
            raise ValueError(f"times of channel {label!r} must be strictly increasing; "
                             f"t[{j + 1}]={float(t[j + 1])!r} does not exceed t[{j}]={float(t[j])!r}")
        T_list.append(t)
        X_list.append(x)
    lo = max(t[0] for t in T_list)
    hi = min(t[-1] for t in T_list)
    if not lo < hi:
        raise ValueError(f"the channels do not overlap in time (common span [{lo:g}, {hi:g}] is empty)")
    grid = np.unique(np.concatenate(T_list))
    grid = grid[(grid >= lo) & (grid <= hi)]
    out = np.empty((grid.shape[0], n))
    for k in range(n):
        out[:, k] = _interp_with_gaps(grid, T_list[k], X_list[k])
    return Path(out, times=grid, names=labels)


def _interp_with_gaps(grid, t, x):
    """Linear interpolation; any result that would use a NaN sample is NaN."""
    y = np.interp(grid, t, x)
    bad = np.isnan(x)
    if bad.any():
        # index of the sample interval [t_k, t_{k+1}] holding each grid point
        k = np.clip(np.searchsorted(t, grid, side="right") - 1, 0, t.shape[0] - 1)
        k1 = np.minimum(k + 1, t.shape[0] - 1)
        on_left = grid == t[k]
        use_right = ~on_left
        y = np.where(bad[k] | (use_right & bad[k1]), np.nan, y)
    return y
