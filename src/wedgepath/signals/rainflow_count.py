"""Rainflow cycle counting (ASTM E1049-85, section 5.4.4), with the energy of each sub-loop.

The history (one channel, or channel ``x`` of a loop) is reduced to its
peaks and valleys, then read point by point with the rules of ASTM E1049-85
§5.4.4 ("Rainflow Counting"): with X the range being considered and Y the
previous range next to it, a range Y with X >= Y is counted -- as one cycle,
its two points discarded, or, when Y contains the starting point, as half a
cycle, its first point discarded; at the end every range not yet counted is
half a cycle.

Given a second channel ``y`` the energy ``∮ y dx`` of each closed cycle's own
hysteresis sub-loop is measured: the path from the cycle's first point
through its second and back to the first point's level of x (where the
history closes the loop), less the sub-loops nested inside it (counted as
cycles of their own).  The chord that closes a sub-loop is vertical
(dx = 0), so it adds nothing, and the closed cycles and the half cycles of the
residue split the whole record's ``∫ y dx`` exactly:
``sum(energy of cycles) + residue_energy == total_energy`` up to rounding.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from typing import ClassVar

import numpy as np

from .._results import ArrayResult, fmt_number
from .._validation import as_float_array, as_real
from .cycles import _channel
from .segment import gap_mask, turning_points, zigzag

__all__ = ["rainflow", "RainflowCycles"]


@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class RainflowCycles(ArrayResult):
    """Rainflow cycles of a history: :func:`rainflow`.

    Array-like: ``np.asarray(r)`` is the range of each counted cycle.

    Attributes
    ----------
    range, mean : ndarray (C,)
        ``|x_end - x_start|`` and ``(x_start + x_end) / 2`` of each cycle.
    count : ndarray (C,)
        1.0 for a closed cycle, 0.5 for a half cycle (residue).
    start, end : ndarray of int (C,)
        Sample indices of the cycle's two reversal points, in time order.
    close : ndarray (C,)
        Fractional sample position where a closed cycle's sub-loop closes
        (x back at its starting level); NaN for half cycles.
    energy : ndarray (C,) or None
        ``∮ y dx`` of each cycle's own sub-loop (closed cycles) or ``∫ y dx``
        of the residue path from start to end (half cycles); None without
        ``y``.
    total_energy, residue_energy : float or None
        ``∫ y dx`` along the whole record (each gap-free piece) and the part
        carried by the half cycles.
    hysteresis : float
        Band below which reversals were ignored (0: every reversal).
    names : tuple of str
        ``(x,)`` or ``(x, y)``.
    units : mapping or None

    ``to_frame()``: one row per cycle, columns ``range, mean, count, start,
    end, close`` (+ ``start_time, end_time`` with times, + ``energy`` with y).
    """

    _array_field: ClassVar[str] = "range"

    range: np.ndarray
    mean: np.ndarray
    count: np.ndarray
    start: np.ndarray
    end: np.ndarray
    close: np.ndarray
    start_time: np.ndarray | None
    end_time: np.ndarray | None
    energy: np.ndarray | None
    total_energy: float | None
    residue_energy: float | None
    hysteresis: float
    names: tuple
    units: Mapping | None = None

    @property
    def cycles(self) -> float:
        """The number of cycles, half cycles counting 0.5."""
        return float(self.count.sum())

    def to_frame(self):
        """One row per cycle: ``range, mean, count, start, end, close`` (+ times, + energy)."""
        import pandas as pd

        d = {"range": self.range, "mean": self.mean, "count": self.count, "start": self.start,
             "end": self.end, "close": self.close}
        if self.start_time is not None:
            d["start_time"], d["end_time"] = self.start_time, self.end_time
        if self.energy is not None:
            d["energy"] = self.energy
        return pd.DataFrame(d)

    def _summary_items(self):
        items = [("closed", str(int(np.count_nonzero(self.count == 1.0)))),
                 ("half", str(int(np.count_nonzero(self.count == 0.5)))),
                 ("cycles", fmt_number(self.cycles)),
                 ("max_range", fmt_number(self.range.max() if self.range.size else math.nan))]
        if self.energy is not None:
            items += [("total_energy", fmt_number(self.total_energy)),
                      ("residue_energy", fmt_number(self.residue_energy))]
        return items


def _alternate(idx, v):
    """Keep a strictly alternating sequence of extremes from candidate indices (in order)."""
    out = []
    for k in idx:
        if out and v[k] == v[out[-1]]:
            continue
        if len(out) >= 2 and (v[k] - v[out[-1]]) * (v[out[-1]] - v[out[-2]]) > 0:
            out[-1] = k                       # same direction: the new point is more extreme
            continue
        out.append(k)
    return out


def _reversals(v, band):
    """Sample indices of the history's points for counting: start, reversals, end."""
    m = v.size
    if band <= 0:
        return list(turning_points(v))
    zi, zk = zigzag(v, band)
    last = int(zi[-1]) if zi.size else 0
    tail = v[last + 1:] if last + 1 < m else v[:0]
    extra = []
    if tail.size:
        extra = sorted({last + 1 + int(np.argmax(tail)), last + 1 + int(np.argmin(tail))})
    cand = sorted(set([0] + [int(i) for i in zi] + extra + [m - 1]))
    return _alternate(cand, v)


class _Fenwick:
    """Prefix sums over positions 0..n-1 with point updates (for nested sub-loop energies)."""

    def __init__(self, n):
        self.t = np.zeros(n + 1)

    def add(self, i, val):
        i += 1
        while i < self.t.size:
            self.t[i] += val
            i += i & -i

    def prefix(self, i):                      # sum over positions < i
        s = 0.0
        while i > 0:
            s += self.t[i]
            i -= i & -i
        return s


def rainflow(X, x=None, y=None, *, hysteresis=0.0, gap="auto", times=None,
             names=None) -> RainflowCycles:
    """Rainflow cycles of an irregular history (ASTM E1049-85 §5.4.4).

    Parameters
    ----------
    X : array_like (T,) or (T, n), DataFrame or Path
        The history (one column), or a recording of which channel ``x`` is
        counted.  NaN rows (and, with times, steps longer than ``gap``) split
        it into pieces counted separately.
    x : int or str, optional
        The channel to count (default: the only or the first column).
    y : int or str, optional
        A second channel: each cycle's sub-loop energy ``∮ y dx`` is then
        reported (``energy``), e.g. force for a displacement history.
    hysteresis : float
        Reversals smaller than this are ignored (0, the default, counts
        every reversal, as the standard does).
    gap : "auto", None or float
        Longest time step that is not a gap (with ``times`` only).
    times : array_like (T,), optional
        Sample times (reported as ``start_time``/``end_time``).
    names : sequence of str, optional
        Channel names for an array input.

    Returns
    -------
    RainflowCycles
        ``to_frame()`` with ``range, mean, count, start, end, close`` (and
        ``energy``).

    Examples
    --------
    The history of the standard's rainflow example (-2, 1, -3, 5, -1, 3, -4,
    4, -2): one closed cycle of range 4 and six half cycles.

    >>> import wedgepath as wp
    >>> r = wp.rainflow([-2, 1, -3, 5, -1, 3, -4, 4, -2])
    >>> r.to_frame()[["range", "mean", "count", "start", "end"]]
       range  mean  count  start  end
    0    3.0  -0.5    0.5      0    1
    1    4.0  -1.0    0.5      1    2
    2    4.0   1.0    1.0      4    5
    3    8.0   1.0    0.5      2    3
    4    9.0   0.5    0.5      3    6
    5    8.0   0.0    0.5      6    7
    6    6.0   1.0    0.5      7    8
    >>> r.cycles
    4.0
    """
    arr = X
    if not hasattr(X, "columns") and not hasattr(X, "points"):
        a0 = np.asarray(X)
        if a0.ndim == 1:
            if x is not None or y is not None:
                raise ValueError("x and y select channels of a 2-D input; this history is 1-D")
            arr = as_float_array(a0, "X", ndim=1, allow_nan=True)[:, None]
            if names is None:
                names = ["0"]
    from ._kernel import signal_input

    data = signal_input(arr, times, names, min_channels=1)
    T, n = data.shape
    nm = data.names
    ix = 0 if x is None else _channel(x, nm, n, "x")
    iy = None if y is None else _channel(y, nm, n, "y")
    if iy is not None and iy == ix:
        raise ValueError(f"x and y must be different channels, got {x!r} twice")
    band = as_real(hysteresis, "hysteresis")
    if not band >= 0:
        raise ValueError(f"hysteresis must be a finite number >= 0, got {band}")
    cols = [ix] if iy is None else [ix, iy]
    P = np.asarray(data.values[:, cols], dtype=np.float64)
    if np.isinf(P).any():
        raise ValueError(f"X contains an infinite value at row {int(np.argwhere(np.isinf(P))[0][0])}")
    # counting is scale-free: work on channels scaled by powers of two (exact), so that
    # ranges, products and energies of data near the float64 limit cannot overflow
    from .._scaling import pow2_exponents, pow2_scale

    ex = pow2_exponents(P, axis=0)
    P = pow2_scale(P, -ex)
    band_s = float(pow2_scale(band, -ex[0]))
    xv = P[:, 0]
    valid = ~np.isnan(P).any(axis=1)
    breaks = gap_mask(valid, data.times, gap) if T > 1 else np.zeros(0, dtype=bool)
    # gap-free pieces (single rows count too: they carry no range)
    pieces, k = [], 0
    while k < T:
        if not valid[k]:
            k += 1
            continue
        a = k
        while k < T - 1 and not breaks[k]:
            k += 1
        pieces.append((a, k))
        k += 1

    rows = []        # (start, end, count, close)
    for a, b in pieces:
        v = xv[a:b + 1]
        pts = [a + int(i) for i in _reversals(v, band_s)]
        stack = []
        for p in pts:
            stack.append(p)
            while len(stack) >= 3:
                Xr = abs(xv[stack[-1]] - xv[stack[-2]])
                Yr = abs(xv[stack[-2]] - xv[stack[-3]])
                if Xr < Yr:
                    break
                if len(stack) == 3:              # Y contains the starting point
                    rows.append((stack[0], stack[1], 0.5, math.nan))
                    stack.pop(0)
                else:
                    p1, p2, p3 = stack[-3], stack[-2], stack[-1]
                    rows.append((p1, p2, 1.0, _closing(xv, p2, p3, xv[p1])))
                    del stack[-3:-1]
        for s, e in zip(stack[:-1], stack[1:]):
            rows.append((s, e, 0.5, math.nan))

    st = np.array([r[0] for r in rows], dtype=np.int64)
    en = np.array([r[1] for r in rows], dtype=np.int64)
    cnt = np.array([r[2] for r in rows], dtype=np.float64)
    cl = np.array([r[3] for r in rows], dtype=np.float64)
    rng = np.abs(xv[en] - xv[st]) if rows else np.empty(0)
    mean = 0.5 * (xv[en] + xv[st]) if rows else np.empty(0)

    def back(v, k):
        out = pow2_scale(v, k)
        if not np.all(np.isfinite(out)):
            raise ValueError("rainflow: the ranges or energies overflow float64 for data this "
                             "large; rescale the data (e.g. divide by the largest value)")
        return out

    rng, mean = back(rng, ex[0]), back(mean, ex[0])
    energy = total = residue = None
    if iy is not None:
        energy, total = _energies(P, pieces, st, en, cnt, cl)
        energy, total = back(energy, ex[0] + ex[1]), float(back(total, ex[0] + ex[1]))
        residue = float(energy[cnt == 0.5].sum())
    tt = data.times
    st_t = en_t = None
    if tt is not None:
        st_t, en_t = tt[st], tt[en]
    used = tuple(data.labels[c] for c in cols)
    return RainflowCycles(range=rng, mean=mean, count=cnt, start=st, end=en, close=cl,
                          start_time=st_t, end_time=en_t, energy=energy, total_energy=total,
                          residue_energy=residue, hysteresis=band, names=used,
                          units=data.units_of(used))


def _closing(xv, p2, p3, level):
    """First fractional position after sample p2 (up to p3) where x reaches ``level``."""
    seg = xv[p2:p3 + 1]
    up = xv[p3] > xv[p2]
    with np.errstate(invalid="ignore"):
        hit = np.flatnonzero(seg >= level) if up else np.flatnonzero(seg <= level)
    if hit.size == 0:
        # |x(p3) - x(p2)| >= |x(p2) - level| held only after rounding (a range that
        # differs from the level by less than the spacing of doubles): it closes at p3
        return float(p3)
    k = int(hit[0])                   # |x(p3) - x(p2)| >= |x(p2) - level|
    if k == 0:
        return float(p2)
    x0, x1 = seg[k - 1], seg[k]
    f = (level - x0) / (x1 - x0) if x1 != x0 else 1.0
    return float(p2 + k - 1 + f)


def _energies(P, pieces, st, en, cnt, cl):
    """Own sub-loop energy ∮ y dx of every cycle and ∫ y dx of every half cycle."""
    T = P.shape[0]
    x, y = P[:, 0], P[:, 1]
    dx = np.diff(x)
    seg = 0.5 * (y[:-1] + y[1:]) * dx            # ∫ y dx on each straight segment
    seg = np.where(np.isnan(seg), 0.0, seg)
    W = np.concatenate([[0.0], np.cumsum(seg)])  # W[k] = ∫ from row 0 to row k

    def w_at(pos):
        k = min(int(math.floor(pos)), T - 2)
        f = pos - k
        if f == 0:
            return W[k]
        return W[k] + dx[k] * (y[k] * f + 0.5 * (y[k + 1] - y[k]) * f * f)

    E = np.empty(st.size)
    fen = _Fenwick(T)
    # closed cycles in the order they were counted: nested ones come first
    for c in np.flatnonzero(cnt == 1.0):
        s = int(st[c])
        raw = w_at(cl[c]) - W[s]
        inner = fen.prefix(T) - fen.prefix(s)     # every sub-loop counted so far starting after s
        E[c] = raw - inner
        fen.add(s, E[c])
    for c in np.flatnonzero(cnt == 0.5):
        s, e = int(st[c]), int(en[c])
        E[c] = (W[e] - W[s]) - (fen.prefix(e) - fen.prefix(s))
    total = float(sum(W[b] - W[a] for a, b in pieces))
    return E, total
