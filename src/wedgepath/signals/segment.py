"""Cutting a recording into cycles that survive real data: gaps, noise, drift.

A recording is first split into gap-free pieces: a gap is a row with a
missing value (NaN) in a channel that is used, or -- when the rows have
times -- a time step longer than ``gap``.  By default (``gap="auto"``), for
regular sampling (the 10% and 90% quantiles of the steps within 25% of each
other) that is 1.5 times the median step, so one missing weekly row in a
weekly series is a gap; for irregular logging it is 5 times the 99% quantile
of the steps, so that only real outages count.  A cycle never spans a gap.

Within a piece, cycle boundaries come from the reference channel, in one of
two ways (``cut=``):

``"reversal"``
    Reversal points (peaks and valleys) confirmed with a hysteresis band: a
    peak counts only once the channel has fallen from it by at least the
    band, a valley once it has risen by the band.  Cycles run from valley to
    valley.  Insensitive to drift (no level is involved).
``"crossing"``
    Upward crossings of a level (the channel's mean by default) with a
    dead band of half-width ``hysteresis`` around it (a Schmitt trigger).

``hysteresis="auto"`` chooses the band from the data's own noise: the noise
standard deviation sigma is estimated from the differences of order k = 1..6
of the reference channel, ``sigma_k = 1.4826 * MAD(d_k) / sqrt(C(2k, k))``
(with times, also from each sample's residual from the line through its two
neighbours in time, which unevenly spaced samples of a smooth signal do not
inflate)
(the k-th difference of white noise has variance ``C(2k, k) sigma^2``;
1.4826 turns a median absolute deviation into a standard deviation for
normal data), taking the smallest: the signal itself adds to every
``sigma_k``, least at the order that suits its sampling (low orders for
densely sampled data, higher ones for a few samples per cycle); the band is
``8 sigma`` (reversal: full band) or ``4 sigma`` (crossing: half-width).
The factor 8 is a choice (common practice, no source): for normal noise a
retreat of 8 sigma from a running extreme essentially never happens by
chance, while real cycles are usually far larger.  A smooth recording has
sigma near 0 and so a band near 0.

Pieces of signal before the first and after the last boundary of a piece
are reported as *partial* cycles (status ``"partial-start"``,
``"partial-end"`` at the ends of the record, ``"partial-gap"`` next to a
gap); their loop integral is NaN and they are left out of every mean.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .._validation import as_real
from .._warn import warn

__all__ = ["CUTS", "noise_level", "turning_points", "zigzag", "Segmentation", "segment",
           "CycleLengthWarning"]

#: ways of cutting cycles
CUTS = ("reversal", "crossing")
#: default band = this many noise standard deviations (reversal: full band)
AUTO_BAND_SIGMAS = 8.0
#: differences of order 1..NOISE_ORDERS estimate the noise
NOISE_ORDERS = 6
#: a time step longer than this many median steps is a gap (gap="auto")
AUTO_GAP_FACTOR = 1.5
#: irregular sampling (10% and 90% quantiles of the steps more than 25% apart): a step
#: longer than this many times the 99% quantile of the steps is a gap
IRREGULAR_GAP_FACTOR = 5.0
#: complete cycles longer than this many times the median length (or shorter than
#: its inverse) trigger a CycleLengthWarning
LENGTH_SPREAD = 1.8

STATUSES = ("complete", "partial-start", "partial-end", "partial-gap")


class CycleLengthWarning(UserWarning):
    """Complete cycles differ in length more than one steady process explains."""


def noise_level(r) -> float:
    """Robust estimate of the white-noise standard deviation of a series.

    The smallest over k = 1..6 of ``1.4826 * MAD(d_k) / sqrt(C(2k, k))``,
    ``d_k`` the k-th differences of runs of finite samples (see the module
    docstring).  0 for a smooth or short series.

    Examples
    --------
    >>> import numpy as np
    >>> from wedgepath.signals.segment import noise_level
    >>> rng = np.random.default_rng(0)
    >>> t = np.linspace(0, 20 * np.pi, 20000)
    >>> round(noise_level(np.sin(t) + 0.1 * rng.standard_normal(t.size)), 2)
    0.1
    """
    r = np.asarray(r, dtype=np.float64)
    return _noise([r])


def _noise(runs, time_runs=None) -> float:
    best = math.inf
    if time_runs is not None:
        # irregular sampling: the residual of each sample from the straight line through its
        # two neighbours in time, e = r_k - (a r_{k-1} + b r_{k+1}), has variance
        # (1 + a^2 + b^2) sigma^2 for white noise (a + b = 1); it reduces to the second
        # difference for equal steps, while index differences would mistake the uneven
        # steps of a smooth signal for noise
        es = []
        for x, t in zip(runs, time_runs):
            if x.size < 3:
                continue
            h0, h1 = t[1:-1] - t[:-2], t[2:] - t[1:-1]
            a_, b_ = h1 / (h0 + h1), h0 / (h0 + h1)
            e = (x[1:-1] - (a_ * x[:-2] + b_ * x[2:])) / np.sqrt(1 + a_ ** 2 + b_ ** 2)
            es.append(e)
        e = np.concatenate(es) if es else np.empty(0)
        e = e[np.isfinite(e)]
        if e.size >= 2:
            best = 1.4826 * float(np.median(np.abs(e - np.median(e))))
    for k in range(1, NOISE_ORDERS + 1):
        d = [np.diff(x, k) for x in runs if x.size > k]
        d = np.concatenate(d) if d else np.empty(0)
        d = d[np.isfinite(d)]
        if d.size < 2:
            break
        mad = float(np.median(np.abs(d - np.median(d))))
        best = min(best, 1.4826 * mad / math.sqrt(math.comb(2 * k, k)))
    return 0.0 if best == math.inf else best


def turning_points(v) -> np.ndarray:
    """Indices of the first sample, every strict turning point and the last sample.

    Plateaus count once (their first sample).  ``v`` must be finite.
    """
    v = np.asarray(v, dtype=np.float64)
    m = v.size
    if m <= 2:
        return np.arange(m)
    keep = np.concatenate([[True], v[1:] != v[:-1]])
    idx = np.flatnonzero(keep)
    w = v[idx]
    if w.size <= 2:
        return np.unique(np.array([0, m - 1]))
    d = np.sign(np.diff(w))
    turn = np.flatnonzero(d[1:] != d[:-1]) + 1
    out = np.concatenate([[idx[0]], idx[turn], [m - 1]])
    return np.unique(out)


def zigzag(v, band):
    """Reversals of ``v`` confirmed by a retreat of at least ``band``.

    Returns ``(index, kind)``: the sample index of each confirmed extremum and
    its kind (+1 peak, -1 valley), alternating.  The extremum still being
    tracked when the data end is not confirmed and not returned.  With
    ``band == 0`` every strict turning point (except the first and last
    sample) is a reversal.
    """
    v = np.asarray(v, dtype=np.float64)
    cand = turning_points(v)
    if band <= 0:
        inner = cand[1:-1] if cand.size > 2 else cand[:0]
        if inner.size == 0:
            return np.empty(0, dtype=np.int64), np.empty(0, dtype=np.int64)
        kind = np.where(v[inner] > v[inner - 1], 1, -1)
        return inner.astype(np.int64), kind.astype(np.int64)
    w = v[cand]
    idx, kinds = [], []
    direction = 0
    hi = lo = 0
    for k in range(1, w.size):
        x = w[k]
        if direction == 0:
            if x > w[hi]:
                hi = k
            if x < w[lo]:
                lo = k
            # an extreme at the first sample is the edge of the record, not a reversal
            if lo < k and x - w[lo] >= band:
                if lo > 0:
                    idx.append(lo), kinds.append(-1)
                direction, hi = 1, k
            elif hi < k and w[hi] - x >= band:
                if hi > 0:
                    idx.append(hi), kinds.append(1)
                direction, lo = -1, k
        elif direction > 0:
            if x > w[hi]:
                hi = k
            elif w[hi] - x >= band:
                idx.append(hi), kinds.append(1)
                direction, lo = -1, k
        else:
            if x < w[lo]:
                lo = k
            elif x - w[lo] >= band:
                idx.append(lo), kinds.append(-1)
                direction, hi = 1, k
    return cand[np.asarray(idx, dtype=np.int64)], np.asarray(kinds, dtype=np.int64)


def _upward_crossings(r, level, half):
    """Upward crossings of ``level`` as fractional positions, with a dead band ``half``."""
    with np.errstate(invalid="ignore"):
        below = r < level
        seg = np.flatnonzero(below[:-1] & (r[1:] >= level))
    if seg.size == 0:
        return np.empty(0)
    if half > 0:
        with np.errstate(invalid="ignore"):
            low = r < level - half
            high = r >= level + half
        ev = np.flatnonzero(low | high)
        if ev.size == 0:
            return np.empty(0)
        kind = high[ev]
        fire = np.flatnonzero(kind[1:] & ~kind[:-1]) + 1
        q = ev[fire]
        k = np.searchsorted(seg, q, side="left") - 1
        seg = np.unique(seg[k[k >= 0]])
    frac = (level - r[seg]) / (r[seg + 1] - r[seg])
    return seg + frac


@dataclass(frozen=True)
class Segmentation:
    """Cycles of a recording: boundaries, status and the choices that made them (internal)."""

    start: np.ndarray        # (C,) fractional sample positions
    stop: np.ndarray
    status: np.ndarray       # (C,) str, one of STATUSES
    cut: str
    band: float              # reversal band or crossing half-width used
    noise: float             # estimated noise standard deviation of the reference
    level: float | None
    n_gaps: int              # gaps found (NaN runs and long time steps)

    @property
    def complete(self):
        return self.status == "complete"


def gap_mask(valid, times, gap):
    """``breaks[k]`` True when rows k and k + 1 are not joined (a NaN or a long step)."""
    T = valid.size
    brk = ~(valid[:-1] & valid[1:])
    if times is not None and T > 1 and gap is not None and gap is not False:
        dt = np.diff(times)
        if isinstance(gap, str):
            if gap != "auto":
                raise TypeError(f"gap must be a real number > 0, 'auto' or None, got {gap!r}")
            limit = auto_gap(dt)
        else:
            limit = as_real(gap, "gap")
            if not limit > 0:
                raise ValueError(f"gap must be a positive time step, got {limit}")
            if dt.size and np.all(dt > limit):
                raise ValueError(f"gap={limit:g} is shorter than every time step (the shortest "
                                 f"is {float(np.min(dt)):g}), so every step would be a gap and "
                                 "no cycle could be measured; give a gap longer than the "
                                 "sampling step")
        brk |= dt > limit
    return brk


def auto_gap(dt) -> float:
    """The longest time step that is not a gap, by default (see the module docstring)."""
    q10, q50, q90, q99 = np.quantile(dt, [0.1, 0.5, 0.9, 0.99])
    if q90 <= 1.25 * q10:                    # regular sampling: one missing row is a gap
        return AUTO_GAP_FACTOR * float(q50)
    return IRREGULAR_GAP_FACTOR * float(q99)  # irregular logging: only real outages


def _pieces(valid, breaks):
    """(start, stop) inclusive row ranges of the gap-free pieces with at least 2 rows."""
    T = valid.size
    out = []
    k = 0
    while k < T:
        if not valid[k]:
            k += 1
            continue
        a = k
        while k < T - 1 and not breaks[k]:
            k += 1
        if k > a:
            out.append((a, k))
        k += 1
    return out


def segment(r, valid, times=None, *, cut="reversal", level=None, hysteresis="auto",
            gap="auto", warn_lengths=True) -> Segmentation:
    """Cut the reference series ``r`` into cycles (see the module docstring).

    ``valid[k]`` says whether row k can be used (all its channels finite).
    """
    if cut not in CUTS:
        raise ValueError(f"unknown cut {cut!r}; choose one of {', '.join(map(repr, CUTS))}")
    from .._scaling import pow2_exponent, pow2_scale

    r = np.asarray(r, dtype=np.float64)
    T = r.size
    valid = np.asarray(valid, dtype=bool) & np.isfinite(r)
    # the cut is scale-free: work on r scaled by a power of two (exact), so that noise
    # estimates, means and bands of data near the float64 limit cannot overflow
    e_r = pow2_exponent(r[valid]) if valid.any() else 0
    r = pow2_scale(r, -e_r)
    breaks = gap_mask(valid, times, gap) if T > 1 else np.zeros(0, dtype=bool)
    pieces = _pieces(valid, breaks)
    # noise from the joined pieces only (never across a gap)
    noise = _noise([r[a:b + 1] for a, b in pieces],
                   None if times is None else [times[a:b + 1] for a, b in pieces])
    if isinstance(hysteresis, str):
        if hysteresis != "auto":
            raise TypeError(f"hysteresis must be a real number >= 0 or 'auto', got {hysteresis!r}")
        band = AUTO_BAND_SIGMAS * noise if cut == "reversal" else 0.5 * AUTO_BAND_SIGMAS * noise
    else:
        band = as_real(hysteresis, "hysteresis")
        if not band >= 0:
            raise ValueError(f"hysteresis must be a finite number >= 0, got {band}")
        band = float(pow2_scale(band, -e_r))
    lev = None
    if cut == "crossing":
        finite = r[valid]
        lev = float(finite.mean()) if level is None else \
            float(pow2_scale(as_real(level, "level"), -e_r))
    elif level is not None:
        raise ValueError("level applies to cut='crossing' only (reversals need no level)")
    n_gaps = max(len(pieces) - 1, 0)      # interruptions between usable pieces
    starts, stops, status = [], [], []
    for a, b in pieces:
        x = r[a:b + 1]
        if cut == "reversal":
            pos, kind = zigzag(x, band)
            bnd = pos[kind < 0].astype(np.float64)
        else:
            bnd = _upward_crossings(x, lev, band)
        bnd = bnd + a
        first = "partial-start" if a == 0 else "partial-gap"
        last = "partial-end" if b == T - 1 else "partial-gap"
        if bnd.size == 0:
            starts.append(float(a)), stops.append(float(b))
            status.append(first if a == 0 else last)
            continue
        if bnd[0] > a:
            starts.append(float(a)), stops.append(float(bnd[0])), status.append(first)
        for s, e in zip(bnd[:-1], bnd[1:]):
            starts.append(float(s)), stops.append(float(e)), status.append("complete")
        if bnd[-1] < b:
            starts.append(float(bnd[-1])), stops.append(float(b)), status.append(last)
    seg = Segmentation(start=np.asarray(starts, dtype=np.float64),
                       stop=np.asarray(stops, dtype=np.float64),
                       status=np.asarray(status, dtype=object), cut=cut,
                       band=float(pow2_scale(band, e_r)), noise=float(pow2_scale(noise, e_r)),
                       level=None if lev is None else float(pow2_scale(lev, e_r)),
                       n_gaps=n_gaps)
    if warn_lengths:
        check_lengths(seg, times)
    return seg


def check_lengths(seg: Segmentation, times=None):
    """Warn when complete cycles differ in length by more than a factor LENGTH_SPREAD."""
    ok = seg.complete
    if np.count_nonzero(ok) < 3:
        return
    if times is not None:
        idx = np.arange(times.size, dtype=np.float64)
        L = np.interp(seg.stop[ok], idx, times) - np.interp(seg.start[ok], idx, times)
    else:
        L = seg.stop[ok] - seg.start[ok]
    med = float(np.median(L))
    if med <= 0:
        return
    hi, lo = float(L.max()) / med, float(L.min()) / med
    if hi > LENGTH_SPREAD or lo < 1.0 / LENGTH_SPREAD:
        warn(f"complete cycles range from {lo:.2g} to {hi:.2g} times the median cycle length; "
             "one steady process rarely varies this much: cycles may be merged (band too wide) "
             f"or split (band too narrow; band used {seg.band:.4g}, estimated noise "
             f"{seg.noise:.3g}); set hysteresis (--hysteresis) to decide", CycleLengthWarning)
