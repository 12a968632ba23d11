"""Area matrices over sliding windows at a cost independent of the window length."""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from typing import ClassVar

import numpy as np

from .._results import ArrayResult, fmt_names, fmt_number, pair_index
from .._validation import as_int
from ._kernel import (channel_exponents, overflow_error, scaled_data, signal_input, skew_half,
                      unscale_pairs, wedge)

__all__ = ["rolling_area_matrix", "RollingAreas"]

#: doubles held at once by the block products (bounds the working memory)
_BATCH_ELEMENTS = 1 << 22


@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class RollingAreas(ArrayResult):
    """Area matrices of sliding windows, with their windows: :func:`rolling_area_matrix`.

    Array-like: ``np.asarray(r)`` (or ``r.areas``) is the (K, n, n) array,
    ``r[k]`` the matrix of window ``k``, ``len(r)`` the number of windows.

    Attributes
    ----------
    areas : ndarray, shape (K, n, n)
        One chord-closed area matrix per window.
    start, stop : ndarray of int, shape (K,)
        Window ``k`` holds samples ``start[k]:stop[k]`` (``stop`` excluded).
    start_time, stop_time : ndarray, shape (K,)
        Time of the first and of the last sample of each window, in the
        input's form: ISO-8601 text for datetime times, the numbers for
        numeric times, sample positions when the input had no times.
    time_unit : str or None
        What ``start_time``/``stop_time`` are: ``"ISO-8601"``, ``"sample"``
        (no times given), ``"s"`` (timedeltas), or None (numbers given
        without a unit).
    window, step : int
        Samples per window and between window starts.
    names : tuple of str
    closure : str
        ``"chord"``: each window is closed by its chord.
    units : mapping or None

    ``to_frame()`` has one row per window and pair ``i < j``, columns
    ``window`` (0-based), ``start, stop, start_time, stop_time, i, j,
    channel_i, channel_j, area``.
    """

    _array_field: ClassVar[str] = "areas"

    areas: np.ndarray
    start: np.ndarray
    stop: np.ndarray
    start_time: np.ndarray
    stop_time: np.ndarray
    window: int
    step: int
    names: tuple
    closure: str = "chord"
    units: Mapping | None = None
    time_unit: str | None = "sample"

    def pair(self, i, j) -> np.ndarray:
        """The series ``A[i, j]`` over windows, channels by index or name."""
        return self.areas[:, self._channel(i), self._channel(j)]

    def to_frame(self):
        """One row per window and pair: ``window, start, stop, start_time, stop_time, i, j, ...``."""
        import pandas as pd

        K, n = self.areas.shape[0], len(self.names)
        iu, ju = pair_index(n)
        P = iu.size
        k = np.repeat(np.arange(K), P)
        nm = np.array(self.names, dtype=object)
        return pd.DataFrame({
            "window": k, "start": self.start[k], "stop": self.stop[k],
            "start_time": self.start_time[k], "stop_time": self.stop_time[k],
            "i": np.tile(iu, K), "j": np.tile(ju, K),
            "channel_i": np.tile(nm[iu], K), "channel_j": np.tile(nm[ju], K),
            "area": self.areas[:, iu, ju].reshape(-1)})

    def _summary_items(self):
        items = [("windows", str(len(self))), ("window", str(self.window)),
                 ("step", str(self.step)), ("names", fmt_names(self.names))]
        if len(self):
            a, b = self.start_time[0], self.stop_time[-1]
            span = (f"{a} to {b}" if isinstance(a, str) else
                    f"{fmt_number(a)} to {fmt_number(b)}")
            if self.time_unit not in (None, "ISO-8601"):
                span += f" ({self.time_unit})"
            items.append(("span", span))
        return items


def _runs(valid):
    """Per row: first and last row of its run of valid rows (garbage on gap rows)."""
    T = valid.shape[0]
    idx = np.arange(T)
    prev = np.concatenate(([False], valid[:-1]))
    nxt = np.concatenate((valid[1:], [False]))
    s = np.maximum.accumulate(np.where(valid & ~prev, idx, 0))
    e = np.minimum.accumulate(np.where(valid & ~nxt, idx, T - 1)[::-1])[::-1]
    return s, e


def rolling_area_matrix(X, window, step, *, times=None, names=None) -> RollingAreas:
    """Area matrices of sliding windows, ``(K, n, n)``, at a cost independent of the window.

    Window ``k`` holds samples ``k*step : k*step + window``; each window is a
    path of its own, closed by its chord (its pieces, if it holds NaN gaps,
    each closed on their own), exactly as :func:`area_matrix` would compute
    it on that slice (a window made only of gap rows gives zeros).
    ``K = (T - window) // step + 1``.  Only the chord closure is offered.

    How: the series is cut into blocks of ``b = gcd(window, step)`` samples,
    and into groups of ``window`` samples.  One batched BLAS product gives
    every block's area referenced to the start of its group; prefix and
    suffix sums *within* each group (a vectorised form of the two-stack
    sliding-window aggregation) give any window as one suffix plus one prefix
    joined by Chen's identity.  Nothing is ever subtracted from a running
    total, so long drifting series lose no precision (differences of global
    prefix sums would cancel catastrophically there), and the work is
    ``O(T n^2)`` plus ``O(K n^2)``, whatever the window length.  Best when
    ``step`` divides ``window`` (then ``b = step``).

    Parameters
    ----------
    X : array_like (T, n), DataFrame or Path
        As for :func:`area_matrix` (NaN rows are gaps).
    window : int
        Samples per window (at least 2, at most T).
    step : int
        Samples between window starts (at least 1).
    times : array_like (T,), optional
        Sample times, used only to report the windows' start and stop times.
    names : sequence of str, optional
        Channel names for an array input (default ``"0", "1", ...``).

    Returns
    -------
    RollingAreas
        The (K, n, n) areas (``np.asarray(result)``) with each window's
        ``start``/``stop`` sample and ``start_time``/``stop_time``.

    Examples
    --------
    >>> import numpy as np
    >>> import wedgepath as wp
    >>> X = np.random.default_rng(1).standard_normal((1000, 2)).cumsum(axis=0)
    >>> R = wp.rolling_area_matrix(X, window=200, step=50)
    >>> R.shape
    (17, 2, 2)
    >>> bool(np.allclose(R[3], wp.area_matrix(X[150:350]), rtol=1e-10, atol=0))
    True
    >>> r = wp.rolling_area_matrix(X, 200, 50, times=np.arange(1000) * 0.01)
    >>> float(r.start_time[1]), float(r.stop_time[1])
    (0.5, 2.49)
    """
    data = signal_input(X, times, names)
    w = as_int(window, "window")
    s = as_int(step, "step")
    T, n = data.shape
    if w < 2:
        raise ValueError(f"window must hold at least 2 samples, got {w}")
    if w > T:
        raise ValueError(f"window={w} is longer than the data ({T} samples)")
    if s < 1:
        raise ValueError(f"step must be at least 1, got {s}")
    with np.errstate(over="ignore", invalid="ignore", under="ignore"):
        areas = _rolling(data, w, s)
    if areas.size and not (np.isfinite(areas).all() and np.max(np.abs(areas)) >= 2.0 ** -800):
        # overflow, or products that may have underflowed: rescale each channel
        # by a power of two (exact) and scale the areas back
        e, needed = channel_exponents(data)
        if needed:
            with np.errstate(over="ignore", invalid="ignore", under="ignore"):
                areas = unscale_pairs(_rolling(scaled_data(data, e), w, s), e,
                                      "rolling_area_matrix")
        if not np.isfinite(areas).all():
            raise overflow_error("rolling_area_matrix")
    K = areas.shape[0]
    u = np.arange(K, dtype=np.int64) * s
    t01, unit = data.report_times(np.concatenate([u, u + w - 1]))   # one precision for both
    t0, t1 = t01[:u.size], t01[u.size:]
    return RollingAreas(areas=areas, start=u, stop=u + w, start_time=t0, stop_time=t1,
                        window=w, step=s, names=data.labels, units=data.units, time_unit=unit)


def _rolling(data, w, step):
    vals = data.values
    T, n = vals.shape
    K = (T - w) // step + 1
    b = math.gcd(w, step)
    m = w // b                      # blocks per group (a group spans w segments)
    u = np.arange(K, dtype=np.int64) * step
    q = u // w                      # group of each window start
    o = (u - q * w) // b            # block offset within the group

    # run structure (pieces between NaN rows)
    if _all_finite_fast(vals):
        valid = np.ones(T, dtype=bool)
    else:
        v64 = np.asarray(vals, dtype=np.float64)
        if np.isinf(v64).any():
            where = np.argwhere(np.isinf(v64))[0]
            raise ValueError(f"X contains an infinite value at row {int(where[0])}, "
                             f"channel {int(where[1])}")
        valid = ~np.isnan(v64).any(axis=1)
        del v64
    has_gaps = not valid.all()
    if has_gaps:
        rs, re = _runs(valid)
    out = np.zeros((K, n, n))

    # per-window correction terms (Chen joins); vectors taken as float64 rows
    def rows(idx):
        return np.asarray(vals[np.asarray(idx, dtype=np.int64)], dtype=np.float64)

    split = o > 0
    if split.any():
        ks = np.flatnonzero(split)
        uu = u[ks]
        E = (q[ks] + 1) * w                     # first row of the next group (< T)
        last = uu + w - 1
        if has_gaps:
            # fix: the run through u is referenced at the group start in the suffix sums
            ok_u = valid[uu]
            ref_u = np.maximum(rs[uu], q[ks] * w)
            end_u = np.minimum(re[uu], E)
            # cross: the run through E joins the two halves
            ok_E = valid[E]
            left = np.maximum(rs[E], uu)
            right = np.minimum(re[E], last)
        else:
            ok_u = ok_E = np.ones(ks.size, dtype=bool)
            ref_u = q[ks] * w
            end_u = E
            left = uu
            right = last
        xu, xE = rows(uu), rows(E)
        a1 = np.where(ok_u[:, None], xu - rows(np.where(ok_u, ref_u, uu)), 0.0)
        b1 = np.where(ok_u[:, None], rows(np.where(ok_u, end_u, uu)) - xu, 0.0)
        a2 = np.where(ok_E[:, None], xE - rows(np.where(ok_E, left, E)), 0.0)
        b2 = np.where(ok_E[:, None], rows(np.where(ok_E, right, E)) - xE, 0.0)
        out[ks] += 0.5 * (wedge(a2, b2) - wedge(a1, b1))

    # which groups are needed: the start group of every window, and the next
    # group of windows that do not start at a group boundary
    need = np.zeros((T - 1) // w + 2, dtype=bool)
    need[q] = True
    need[q[split] + 1] = True
    groups = np.flatnonzero(need)
    per = max(1, _BATCH_ELEMENTS // max((w + 1) * n + 6 * m * n * n, 1))
    for g0 in range(0, groups.size, per):
        gs = groups[g0:g0 + per]
        Sfull, Pint = _group_sums(vals, gs, w, b, m, valid if has_gaps else None,
                                  rs if has_gaps else None, T, n)
        # windows starting in these groups
        sel = np.flatnonzero((q >= gs[0]) & (q <= gs[-1]))
        if sel.size:
            gi = np.searchsorted(gs, q[sel])
            whole = o[sel] == 0
            if whole.any():
                out[sel[whole]] += Pint[gi[whole], m - 1]
            part = ~whole
            if part.any():
                out[sel[part]] += Sfull[gi[part], o[sel[part]]]
        # windows whose second half lies in these groups
        sel = np.flatnonzero(split & (q + 1 >= gs[0]) & (q + 1 <= gs[-1]))
        if sel.size:
            gi = np.searchsorted(gs, q[sel] + 1)
            out[sel] += Pint[gi, o[sel] - 1]
    return out


def _all_finite_fast(vals) -> bool:
    """Cheap check on the column sums: finite sums mean no NaN and no inf."""
    with np.errstate(over="ignore", invalid="ignore"):
        return bool(np.isfinite(np.sum(vals, axis=0, dtype=np.float64)).all())


def _group_sums(vals, gs, w, b, m, valid, rs, T, n):
    """Block areas of the given groups, referenced at each group's start.

    Returns ``Sfull[g, i]`` (sum of full blocks i..m-1: the suffix from
    block i to the group end) and ``Pint[g, j]`` (full blocks 0..j-1 plus
    the internal segments of block j: the prefix ending one sample before
    block j+1 starts), both (G, m, n, n) antisymmetric.
    """
    G = gs.size
    starts = gs.astype(np.int64) * w
    Gint = np.empty((G, m, n, n))
    Gfull = np.empty((G, m, n, n))
    # blocks per pass, so that the centred rows stay within the memory budget
    bpp = max(1, _BATCH_ELEMENTS // max(G * b * n, 1))
    for i0 in range(0, m, bpp):
        i1 = min(m, i0 + bpp)
        nb = i1 - i0
        ridx = starts[:, None] + (i0 * b + np.arange(nb * b + 1))[None, :]   # (G, nb*b+1)
        inside = ridx < T
        r_c = np.minimum(ridx, T - 1)
        if valid is None:
            ref = np.broadcast_to(starts[:, None], ridx.shape)
            ok = inside
        else:
            ok = inside & valid[r_c]
            ref = np.where(ok, np.maximum(rs[r_c], starts[:, None]), r_c)
        L = ridx.shape[1]
        Z = np.asarray(vals[r_c.ravel()], dtype=np.float64).reshape(G, L, n)
        Z -= np.asarray(vals[ref.ravel()], dtype=np.float64).reshape(G, L, n)
        if not ok.all():
            Z[~ok] = 0.0
        # block i: rows i*b .. i*b + b (b + 1 rows, sharing the border row)
        st = Z.strides
        blocks = np.lib.stride_tricks.as_strided(Z, shape=(G, nb, b + 1, n),
                                                 strides=(st[0], b * st[1], st[1], st[2]),
                                                 writeable=False)
        # internal segments of a block: rows 0..b-1, taken in pairs as in the
        # whole-array scan (z_{2j+1} ^ (z_{2j+2} - z_{2j})): half the flops,
        # and the second factor is a small two-step increment
        h = (b - 1) // 2
        if h:
            U = blocks[:, :, 1:2 * h:2, :]
            V = blocks[:, :, 2:2 * h + 1:2, :] - blocks[:, :, 0:2 * h - 1:2, :]
            gi = np.matmul(np.swapaxes(U, -1, -2), V)
        else:
            gi = np.zeros((G, nb, n, n))
        if (b - 1) % 2:
            gi += blocks[:, :, b - 2, :, None] * blocks[:, :, b - 1, None, :]
        Gint[:, i0:i1] = gi
        Gfull[:, i0:i1] = gi + blocks[:, :, b - 1, :, None] * blocks[:, :, b, None, :]
    Bint = skew_half(Gint)
    Bfull = skew_half(Gfull)
    del Gint, Gfull
    # suffix sums of full blocks (reverse cumulative sum, no subtraction)
    Sfull = np.cumsum(Bfull[:, ::-1], axis=1)[:, ::-1]
    # prefix: exclusive cumsum of full blocks + internal part of block j
    Pint = np.cumsum(Bfull, axis=1)
    Pint[:, 1:] = Pint[:, :-1] + Bint[:, 1:]
    Pint[:, 0] = Bint[:, 0]
    return Sfull, Pint
