"""Per-cycle loop areas: split a recording into cycles and measure each loop."""

from __future__ import annotations

import numpy as np

from .._validation import as_float_array, as_real
from ._kernel import signal_input

__all__ = ["cycle_areas", "CycleAreas"]


class CycleAreas:
    """Result of :func:`cycle_areas`.

    Attributes
    ----------
    areas : ndarray (C,)
        Oriented area ``A[i, j]`` of each cycle's loop (closed by its chord),
        NaN for a cycle that contains a gap.
    starts, stops : ndarray (C,)
        Cycle boundaries as fractional sample positions (``12.25`` is a
        quarter of the way from sample 12 to sample 13).
    start_times, stop_times : ndarray (C,) or None
        The boundaries in time (linear interpolation), when times were given.
    mean, std : float
        Mean and sample standard deviation (ddof=1) of the complete cycles'
        areas (NaN when there are too few).
    count : int
        Number of complete cycles.
    pair : tuple of str
        Channel names (or indices as strings) of ``(i, j)``.
    """

    __slots__ = ("areas", "starts", "stops", "start_times", "stop_times", "mean", "std", "count",
                 "pair")

    def __init__(self, **kw):
        for k in self.__slots__:
            setattr(self, k, kw[k])

    def __len__(self):
        return self.areas.shape[0]

    def __repr__(self):
        return (f"CycleAreas(pair={self.pair}, cycles={len(self)}, complete={self.count}, "
                f"mean={self.mean:.6g}, std={self.std:.6g})")


def _channel(key, names, n, what):
    if isinstance(key, str):
        if names is None or key not in names:
            raise ValueError(f"unknown {what} channel {key!r}"
                             + (f"; channels are {list(names)}" if names else " (the data have no names)"))
        return names.index(key)
    if isinstance(key, (bool, np.bool_)) or not isinstance(key, (int, np.integer)):
        raise TypeError(f"{what} must be a channel index or name, got {key!r}")
    k = int(key)
    if not -n <= k < n:
        raise ValueError(f"{what} channel {k} is out of range for {n} channels")
    return k % n


def _crossings(r, level, hysteresis):
    """Upward crossings of ``level`` as fractional positions (Schmitt trigger with a band)."""
    lo_thr, hi_thr = level - hysteresis, level + hysteresis
    with np.errstate(invalid="ignore"):
        below = r < level
        seg = np.flatnonzero(below[:-1] & (r[1:] >= level))     # plain level crossings
    if seg.size == 0:
        return np.empty(0)
    if hysteresis > 0:
        with np.errstate(invalid="ignore"):
            low = r < lo_thr
            high = r >= hi_thr
        ev = np.flatnonzero(low | high)
        if ev.size == 0:
            return np.empty(0)
        kind = high[ev]                              # True: high event, False: low event
        fire = np.flatnonzero(kind[1:] & ~kind[:-1]) + 1
        q = ev[fire]                                 # first high sample after a low one
        # the last plain crossing before q
        idx = np.searchsorted(seg, q, side="left") - 1
        seg = np.unique(seg[idx[idx >= 0]])
    k = seg
    frac = (level - r[k]) / (r[k + 1] - r[k])
    return k + frac


def cycle_areas(X, i=0, j=1, *, reference=None, level=None, hysteresis=0.0, boundaries=None,
                times=None, names=None) -> CycleAreas:
    """Oriented area of each cycle's loop for one pair of channels.

    The recording is cut at cycle boundaries -- the upward crossings of a
    reference channel through ``level`` (its mean by default), located by
    linear interpolation between samples, or boundaries you give -- and each
    cycle's loop in the (x_i, x_j) plane is closed by its chord and
    measured.  Cycles share their boundary points, so the loops tile the
    recording between the first and last boundary; samples before the
    first and after the last boundary are not used.

    For a hysteresis loop with ``i = stress`` and ``j = strain`` the cycle
    area ``A[stress, strain] = ∮ stress d(strain)`` is the energy dissipated
    per cycle (per unit volume): positive when stress leads strain, as for
    any lossy material.

    Parameters
    ----------
    X : array_like (T, n), DataFrame or Path
        The recording (NaN rows are gaps; a cycle containing one is reported
        as NaN and left out of the mean).
    i, j : int or str
        The pair of channels (index or name); the result is ``A[i, j]``.
    reference : int or str, optional
        Channel whose upward crossings delimit the cycles; default ``i``.
    level : float, optional
        Crossing level; default the reference channel's mean.
    hysteresis : float
        Half-width of a dead band against noise: a crossing counts only
        after the reference has been below ``level - hysteresis``, and only
        the last crossing before it reaches ``level + hysteresis``.
    boundaries : array_like of float, optional
        Cycle boundaries as (fractional) sample positions, increasing,
        within ``[0, T - 1]``; replaces the crossing detection.  To use
        times, convert: ``np.interp(t_bounds, times, np.arange(T))``.
    times : array_like (T,), optional
        Sample times, used to report the boundaries in time.
    names : sequence of str, optional
        Channel names for an array input.

    Returns
    -------
    CycleAreas
        ``.areas`` per cycle, ``.mean``, ``.std``, ``.count``, boundaries.

    Examples
    --------
    A stress loop leading strain by 30 degrees, 20 samples per cycle: every
    cycle is the same regular 20-gon-like ellipse, of area
    ``(N/2) sin(2 pi/N) a b sin(phi)``:

    >>> import numpy as np
    >>> import wedgepath as wp
    >>> t = 2 * np.pi * np.arange(101) / 20 + 0.3
    >>> X = np.column_stack([2.0 * np.sin(t + np.pi / 6), 0.5 * np.sin(t)])
    >>> res = wp.cycle_areas(X, 0, 1, reference=1)
    >>> len(res), res.count
    (4, 4)
    >>> exact = 10 * np.sin(2 * np.pi / 20) * 2.0 * 0.5 * np.sin(np.pi / 6)
    >>> bool(np.allclose(res.areas, exact, rtol=1e-12))
    True
    """
    data = signal_input(X, times, names)
    T, n = data.shape
    nm = data.names
    a = _channel(i, nm, n, "i")
    b = _channel(j, nm, n, "j")
    if a == b:
        raise ValueError(f"i and j must be different channels, got {i!r} twice")
    P = np.asarray(data.values[:, [a, b]], dtype=np.float64)
    if np.isinf(P).any():
        r = int(np.argwhere(np.isinf(P))[0][0])
        raise ValueError(f"X contains an infinite value at row {r}")
    hysteresis = as_real(hysteresis, "hysteresis")
    if not hysteresis >= 0:
        raise ValueError(f"hysteresis must be a finite number >= 0, got {hysteresis}")
    if boundaries is not None:
        if reference is not None or level is not None:
            raise ValueError("give either boundaries or reference/level, not both")
        pos = as_float_array(boundaries, "boundaries", ndim=1)
        if pos.size and (pos[0] < 0 or pos[-1] > T - 1):
            raise ValueError(f"boundaries must lie within [0, {T - 1}] (sample positions)")
        if pos.size > 1 and not np.all(np.diff(pos) > 0):
            raise ValueError("boundaries must be strictly increasing")
    else:
        ref = a if reference is None else _channel(reference, nm, n, "reference")
        r = np.asarray(data.values[:, ref], dtype=np.float64)
        if np.isinf(r).any():
            raise ValueError("the reference channel contains an infinite value")
        finite = r[~np.isnan(r)]
        if finite.size == 0:
            raise ValueError("the reference channel has no samples (all NaN)")
        if level is None:
            lev = float(finite.mean())
        else:
            lev = as_real(level, "level")
        if finite.max() == finite.min():
            raise ValueError("the reference channel is constant, so it has no crossings; "
                             "choose another reference or give boundaries")
        pos = _crossings(r, lev, hysteresis)
    pair = tuple(nm[k] if nm is not None else str(k) for k in (a, b))
    C = max(pos.size - 1, 0)
    if C == 0:
        empty = np.empty(0)
        return CycleAreas(areas=empty, starts=empty, stops=empty,
                          start_times=None if data.times is None else empty,
                          stop_times=None if data.times is None else empty,
                          mean=np.nan, std=np.nan, count=0, pair=pair)
    # Each channel is scaled by a power of two (exact) so that no product,
    # square or sum overflows or underflows; results are scaled back.
    big = np.fmax.reduce(np.abs(P), axis=0)
    ex = np.where(big > 0, np.frexp(np.nan_to_num(big))[1], 0)
    areas = _loop_areas(np.ldexp(P, -ex), pos)
    good = ~np.isnan(areas)
    cnt = int(good.sum())
    mean = areas[good].mean() if cnt else np.nan
    std = areas[good].std(ddof=1) if cnt > 1 else np.nan
    k = int(ex.sum())
    with np.errstate(over="ignore", under="ignore"):
        areas, mean, std = np.ldexp(areas, k), float(np.ldexp(mean, k)), float(np.ldexp(std, k))
    if not (np.isfinite(areas[good]).all() and np.isfinite(std if cnt > 1 else 0.0)):
        raise ValueError("cycle_areas: the areas overflow float64 for data this large; "
                         "rescale the data (e.g. divide each channel by its largest value)")
    st, sp = pos[:-1], pos[1:]
    if data.times is not None:
        idx = np.arange(T, dtype=np.float64)
        t_st, t_sp = np.interp(st, idx, data.times), np.interp(sp, idx, data.times)
    else:
        t_st = t_sp = None
    return CycleAreas(areas=areas, starts=st, stops=sp, start_times=t_st, stop_times=t_sp,
                      mean=mean, std=std, count=cnt, pair=pair)


def _loop_areas(P, pos):
    """Chord-closed area of the polyline between consecutive boundary positions."""
    T = P.shape[0]
    k = np.minimum(np.floor(pos).astype(np.int64), T - 2)
    f = (pos - k)[:, None]
    Q = P[k] + f * (P[k + 1] - P[k])                      # boundary points
    # augmented sequence: samples with the boundary points inserted after row k
    S = np.insert(P, k + 1, Q, axis=0)
    at = k + 1 + np.arange(pos.size)                      # index of each boundary point in S
    lo, hi = at[0], at[-1]
    seg = np.arange(lo, hi)                               # segments S[t] -> S[t+1]
    cyc = np.searchsorted(at, seg, side="right") - 1      # cycle of each segment
    R = Q[cyc]
    u = S[seg] - R
    v = S[seg + 1] - R
    term = 0.5 * (u[:, 0] * v[:, 1] - u[:, 1] * v[:, 0])
    starts = at[:-1] - lo
    return np.add.reduceat(term, starts)
