"""Asynchronous channels: put channels with their own time stamps on one time grid."""

from __future__ import annotations

from collections.abc import Mapping

import numpy as np

from .._validation import as_float_array, check_names, check_time_axis
from ..calculus.paths import Path

__all__ = ["align"]


def _series_parts(s, label):
    idx = s.index
    t = idx if getattr(idx.dtype, "kind", "") in "mM" else idx.to_numpy()
    return t, s.to_numpy(dtype=np.float64, na_value=np.nan) \
        if getattr(s.dtype, "kind", "") in "iuf" else s.to_numpy()


def _common_axis(axes, labels):
    """Put per-channel time axes on one clock: elapsed seconds from the earliest first time.

    Returns the per-channel float arrays and a template axis (None for numbers).
    """
    from .._time import TimeAxis, elapsed_seconds

    kinds = {a.kind for a in axes}
    if len(kinds) > 1:
        k = next(i for i, a in enumerate(axes) if a.kind != axes[0].kind)
        raise ValueError(f"times of channel {labels[k]!r} are {axes[k].kind}s but those of "
                         f"channel {labels[0]!r} are {axes[0].kind}s; give all channels the "
                         "same kind of time")
    if axes[0].kind == "number":
        units = {a.unit for a in axes}
        unit = units.pop() if len(units) == 1 else None
        if unit is None and any(a.unit for a in axes):
            raise ValueError("some channels have timedelta times and others plain numbers")
        return [a.values for a in axes], (TimeAxis([0.0], "number", unit) if unit else None)
    zoned = [a.tz is not None for a in axes]
    if any(zoned) and not all(zoned):
        k = zoned.index(not zoned[0])
        raise ValueError(f"times of channel {labels[k]!r} are " + (
            "naive but those of the first channel have a zone" if zoned[0] else
            "zoned but those of the first channel are naive"))
    inst = [a.to_datetime64() for a in axes]
    origin = min(i[0] for i in inst)
    vals = [elapsed_seconds(i, origin) for i in inst]
    return vals, TimeAxis([0.0], "datetime", "s", origin, axes[0].tz,
                          all(a.dates for a in axes))


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
        stamps in its index (numbers, a DatetimeIndex or a TimedeltaIndex).
    times : sequence of 1-D arrays, optional
        One strictly increasing time array per channel (required unless the
        channels are Series): numbers, or datetimes (``datetime64``, pandas,
        ISO text), which are put on one clock in seconds from the earliest
        first time; the result's ``time_axis`` reports them as datetimes.
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
    A_list, X_list = [], []
    shown = []
    for k in range(n):
        label = labels[k] if labels else k
        shown.append(label)
        x = as_float_array(xs[k], f"channel {label!r}", ndim=1, allow_nan=True)
        if x.shape[0] < 2:
            raise ValueError(f"channel {label!r} has {x.shape[0]} sample(s); at least 2 are needed")
        nt = len(ts[k]) if hasattr(ts[k], "__len__") else -1
        if nt >= 0 and nt != x.shape[0]:
            raise ValueError(f"channel {label!r} has {x.shape[0]} samples but {nt} times")
        A_list.append(check_time_axis(ts[k], x.shape[0], f"times of channel {label!r}"))
        X_list.append(x)
    T_list, template = _common_axis(A_list, shown)
    lo = max(t[0] for t in T_list)
    hi = min(t[-1] for t in T_list)
    if not lo < hi:
        raise ValueError(f"the channels do not overlap in time (common span [{lo:g}, {hi:g}] is empty)")
    grid = np.unique(np.concatenate(T_list))
    grid = grid[(grid >= lo) & (grid <= hi)]
    out = np.empty((grid.shape[0], n))
    for k in range(n):
        out[:, k] = _interp_with_gaps(grid, T_list[k], X_list[k])
    if template is not None:
        grid = template.with_values(grid)
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
