"""Per-cycle loop areas: split a recording into cycles and measure each loop."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from typing import ClassVar

import numpy as np

from .._results import ArrayResult, fmt_number
from .._scaling import pow2_exponents, pow2_scale
from .._validation import as_float_array
from ._kernel import signal_input
from .segment import segment

__all__ = ["cycle_areas", "CycleAreas"]


@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class CycleAreas(ArrayResult):
    """Per-cycle loop integrals of one pair of channels: :func:`cycle_areas`.

    Array-like: ``np.asarray(c)`` (or ``c.values``) holds one value per cycle.

    Attributes
    ----------
    values : ndarray (C,)
        ``∮ x_i dx_j`` over each cycle's loop (closed by its chord), which is
        ``A[i, j]`` of the cycle: the signed area of the loop drawn with
        channel i horizontal and j vertical (counter-clockwise positive).
        NaN for a cycle that contains a gap.
    quantity : str
        Which integral ``values`` hold, in the channels' names, e.g.
        ``"∮ stress d(strain)"``.
    names : tuple of str
        The two channels ``(i, j)``, in that order.
    start, stop : ndarray (C,)
        Cycle boundaries as fractional sample positions (``12.25`` is a
        quarter of the way from sample 12 to sample 13).
    start_time, stop_time : ndarray (C,)
        The boundaries in time (linear interpolation of the times; the
        sample positions when the input had no times), in the input's form:
        ISO-8601 text for datetime times.
    time_unit : str or None
        What the boundary times are: ``"ISO-8601"``, ``"sample"`` (no
        times), ``"s"`` (timedeltas) or None (numbers without a unit).
    complete : ndarray of bool (C,)
        False for a partial cycle (its value is NaN).
    status : ndarray of str (C,)
        ``"complete"``; ``"partial-start"`` / ``"partial-end"`` for the
        pieces before the first and after the last boundary of the record;
        ``"partial-gap"`` for a piece cut by a gap (a cycle never spans one).
    mean, std : float
        Mean and sample standard deviation (ddof=1) of the complete cycles'
        values (NaN when there are too few).
    count : int
        Number of complete cycles.
    reference : str
        The channel whose upward crossings cut the cycles (None when the
        boundaries were given).
    cut : str or None
        ``"crossing"`` or ``"reversal"`` (None when the boundaries were given).
    level : float or None
        The crossing level used (None for reversals and given boundaries).
    hysteresis : float or None
        The band used (crossing: half-width; reversal: full band).
    noise : float or None
        Noise standard deviation estimated from the reference channel
        (what ``hysteresis="auto"`` scales).
    gaps : int
        Number of gaps (missing rows or long time steps) in the record.
    closure : str
        ``"chord"``: each cycle's loop is closed by its chord.
    units : mapping or None
        Units of the two channels, when the input had them (the values have
        the unit of x_i times that of x_j).

    ``to_frame()`` has one row per cycle, columns ``cycle`` (0-based),
    ``start, stop, start_time, stop_time, value, complete, status``.
    """

    _array_field: ClassVar[str] = "values"

    values: np.ndarray
    quantity: str
    names: tuple
    start: np.ndarray
    stop: np.ndarray
    start_time: np.ndarray
    stop_time: np.ndarray
    complete: np.ndarray
    status: np.ndarray
    mean: float
    std: float
    count: int
    reference: str | None = None
    cut: str | None = None
    level: float | None = None
    hysteresis: float | None = None
    noise: float | None = None
    gaps: int = 0
    closure: str = "chord"
    units: Mapping | None = None
    time_unit: str | None = "sample"

    def to_frame(self):
        """One row per cycle: ``cycle, start, stop, start_time, stop_time, value, complete, status``."""
        import pandas as pd

        return pd.DataFrame({"cycle": np.arange(self.values.shape[0]), "start": self.start,
                             "stop": self.stop, "start_time": self.start_time,
                             "stop_time": self.stop_time, "value": self.values,
                             "complete": self.complete, "status": self.status})

    def _summary_items(self):
        return [("quantity", repr(self.quantity)), ("complete", str(self.count)),
                ("partial", str(len(self) - self.count)), ("mean", fmt_number(self.mean)),
                ("std", fmt_number(self.std, 4))]


def quantity_text(x_i, x_j) -> str:
    """The integral that :func:`cycle_areas` reports for channels ``(i, j)``: ``∮ x_i d(x_j)``."""
    return f"∮ {x_i} d({x_j})"


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


def cycle_areas(X, i=0, j=1, *, reference=None, cut="crossing", level=None, hysteresis=0.0,
                gap="auto", boundaries=None, times=None, names=None) -> CycleAreas:
    """``∮ x_i dx_j`` over each cycle's loop, for one pair of channels.

    The recording is cut at cycle boundaries -- the upward crossings of a
    reference channel through ``level`` (its mean by default), located by
    linear interpolation between samples (``cut="crossing"``), its valleys
    confirmed by a hysteresis band (``cut="reversal"``), or boundaries you
    give -- and each cycle's loop in the (x_i, x_j) plane is closed by its
    chord and measured.  A cycle never spans a gap (a missing value, or a
    time step longer than ``gap``).  The pieces before the first boundary,
    after the last and next to a gap are listed as partial cycles (value
    NaN, ``complete`` False, ``status`` says why) and left out of the mean.
    See the module ``wedgepath.signals.segment`` for the rules.

    The value of a cycle is ``∮ x_i dx_j`` = ``A[i, j]`` of that cycle (as
    in :func:`area_matrix`): the signed area of the loop drawn with channel
    i on the horizontal axis and j on the vertical one, counter-clockwise
    positive.  The result says so in ``.quantity``.  Swapping ``i`` and
    ``j`` flips the sign (``∮ x_j dx_i = -∮ x_i dx_j`` on a closed loop).

    For a hysteresis loop with ``i = stress`` and ``j = strain`` the value
    ``∮ stress d(strain)`` is the energy dissipated per cycle (per unit
    volume): positive when stress leads strain, as for any lossy material.
    ``wedgepath loop --x strain --y stress`` reports the same number
    (``--energy y_dx``, its default: ``∮ y dx``, cycles cut by ``--x``), that
    is ``cycle_areas(X, "stress", "strain", reference="strain", cut="reversal",
    hysteresis="auto")`` and ``loop_cycles(X, "strain", "stress").energy``; see
    ``docs/conventions.md``.

    Parameters
    ----------
    X : array_like (T, n), DataFrame or Path
        The recording (NaN rows are gaps).
    i, j : int or str
        The pair of channels (index or name); the result is ``∮ x_i dx_j``.
    reference : int or str, optional
        Channel whose upward crossings delimit the cycles; default ``i``.
    cut : {"crossing", "reversal"}
        How cycles are cut: upward level crossings of the reference (the
        default here) or its valleys (drift-proof; the default of
        :func:`loop_cycles`).
    level : float, optional
        Crossing level (``cut="crossing"``); default the reference
        channel's mean.
    hysteresis : float or "auto"
        Band against noise.  Crossing: half-width of a dead band (a
        crossing counts only after the reference has been below
        ``level - hysteresis``, and only the last crossing before it reaches
        ``level + hysteresis``).  Reversal: a valley counts once the
        reference has risen from it by this much.  ``"auto"``: from the
        noise level of the reference (8 noise standard deviations for
        reversals, 4 for the crossing half-width).
    gap : "auto", None or float
        A time step longer than this is a gap (``"auto"``: 1.5 times the
        median step for regular sampling, 5 times the 99% quantile of the
        steps for irregular logging; None: only missing values are gaps).
        Used only when the rows have times.
    boundaries : array_like of float, optional
        Cycle boundaries as (fractional) sample positions, increasing,
        within ``[0, T - 1]``; replaces the crossing detection.  To use
        times, convert: ``np.interp(t_bounds, times, np.arange(T))``.
    times : array_like (T,), optional
        Sample times, used to report the boundaries in time.
    names : sequence of str, optional
        Channel names for an array input (default ``"0", "1", ...``).

    Returns
    -------
    CycleAreas
        ``.values`` per cycle, ``.quantity``, ``.mean``, ``.std`` (ddof=1),
        ``.count``, the boundaries (``.start``, ``.stop``, ``.start_time``,
        ``.stop_time``) and ``.to_frame()``.

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
    >>> len(res), res.count, res.quantity
    (6, 4, '∮ 0 d(1)')
    >>> list(res.status[[0, -1]])
    ['partial-start', 'partial-end']
    >>> exact = 10 * np.sin(2 * np.pi / 20) * 2.0 * 0.5 * np.sin(np.pi / 6)
    >>> bool(np.allclose(res.values[res.complete], exact, rtol=1e-12))
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
    valid = ~np.isnan(P).any(axis=1)
    if boundaries is not None:
        if reference is not None or level is not None:
            raise ValueError("give either boundaries or reference/level, not both")
        pos = as_float_array(boundaries, "boundaries", ndim=1)
        ref_name, lev, band, noise = None, None, None, None
        if pos.size and (pos[0] < 0 or pos[-1] > T - 1):
            raise ValueError(f"boundaries must lie within [0, {T - 1}] (sample positions)")
        if pos.size > 1 and not np.all(np.diff(pos) > 0):
            raise ValueError("boundaries must be strictly increasing")
        st, sp = pos[:-1], pos[1:]
        status = np.array(["complete"] * st.size, dtype=object)
        n_gaps = 0
    else:
        ref = a if reference is None else _channel(reference, nm, n, "reference")
        r = np.asarray(data.values[:, ref], dtype=np.float64)
        if np.isinf(r).any():
            raise ValueError("the reference channel contains an infinite value")
        finite = r[~np.isnan(r)]
        if finite.size == 0:
            raise ValueError("the reference channel has no samples (all NaN)")
        if finite.max() == finite.min():
            raise ValueError("the reference channel is constant, so it has no crossings; "
                             "choose another reference or give boundaries")
        seg = segment(r, valid, data.times, cut=cut, level=level, hysteresis=hysteresis,
                      gap=gap)
        st, sp, status = seg.start, seg.stop, seg.status
        lev, band, noise, n_gaps = seg.level, seg.band, seg.noise, seg.n_gaps
        ref_name = data.labels[ref]
    pair = (data.labels[a], data.labels[b])
    C = st.size
    if C == 0:
        areas = np.empty(0)
        good = np.zeros(0, dtype=bool)
        mean = std = float("nan")
    else:
        # Each channel is scaled by a power of two (exact) so that no product,
        # square or sum overflows or underflows; results are scaled back.
        ex = pow2_exponents(P, axis=0)
        areas = interval_areas(pow2_scale(P, -ex), st, sp)
        areas[status != "complete"] = np.nan
        good = ~np.isnan(areas)
        cnt = int(good.sum())
        mean = areas[good].mean() if cnt else np.nan
        std = areas[good].std(ddof=1) if cnt > 1 else np.nan
        k = int(ex.sum())
        areas, mean, std = pow2_scale(areas, k), float(pow2_scale(mean, k)), \
            float(pow2_scale(std, k))
        if not (np.isfinite(areas[good]).all() and np.isfinite(std if cnt > 1 else 0.0)):
            raise ValueError("cycle_areas: the areas overflow float64 for data this large; "
                             "rescale the data (e.g. divide each channel by its largest value)")
        status = np.where(good | (status != "complete"), status, "partial-gap").astype(object)
    # in the input's form (ISO text for datetimes), starts and stops at one precision
    t_both, time_unit = data.report_times(np.concatenate([st, sp]))
    t_st, t_sp = t_both[:st.size], t_both[st.size:]
    return CycleAreas(values=areas, quantity=quantity_text(*pair), names=pair, start=st, stop=sp,
                      start_time=t_st, stop_time=t_sp, complete=good, status=status,
                      mean=mean, std=std, count=int(good.sum()), reference=ref_name, level=lev,
                      cut=None if boundaries is not None else cut, hysteresis=band, noise=noise,
                      gaps=n_gaps, units=data.units_of(pair), time_unit=time_unit)


def interval_areas(P, start, stop):
    """``∮ x_0 dx_1`` of the polyline between each fractional ``start`` and ``stop``, chord-closed.

    NaN for an interval that contains a missing sample.
    """
    T = P.shape[0]
    out = np.empty(start.size)
    for c, (s, e) in enumerate(zip(start, stop)):
        ks = min(int(np.floor(s)), T - 2)
        ke = min(int(np.floor(e)), T - 2)
        fs, fe = s - ks, e - ke
        qs = P[ks] + fs * (P[ks + 1] - P[ks]) if fs else P[ks]
        qe = P[ke + 1] if fe == 1 else (P[ke] + fe * (P[ke + 1] - P[ke]) if fe else P[ke])
        inner = P[ks + 1:int(np.ceil(e))] if e > ks + 1 else P[:0]
        Q = np.vstack([qs[None, :], inner, qe[None, :]]) - qs
        out[c] = 0.5 * float(np.sum(Q[:-1, 0] * Q[1:, 1] - Q[:-1, 1] * Q[1:, 0]))
    return out
