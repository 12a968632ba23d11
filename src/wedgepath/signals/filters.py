"""Zero-phase preprocessing: detrend, difference, band-pass, high-pass, invert.

Filtering is usually the first thing done to recorded signals, and a causal
filter delays every frequency by its group delay: applied to some channels
and not others (or with different settings), it manufactures lead and lag.
The filters here run forward and backward over the data
(:func:`scipy.signal.sosfiltfilt`, second-order sections of a Butterworth
design), so their phase response is exactly zero and no channel is shifted
against another.  ``tests/test_filters.py`` shows the difference on data.

Band edges are given as *periods* in the units of the time axis (e.g.
quarters for quarterly data, seconds for a time column in seconds): a
band-pass from 6 to 32 quarters keeps the business-cycle band of quarterly
data.  Without a time axis the unit is one sample.
"""

from __future__ import annotations

import numpy as np

from .._validation import as_real, check_bool

__all__ = ["detrend", "difference", "bandpass", "highpass", "invert", "preprocess",
           "sample_spacing"]

#: order of the Butterworth design (each pass; forward-backward doubles it)
FILTER_ORDER = 4


def _input(X, times, names, what="X"):
    from ._kernel import signal_input

    data = signal_input(X, times, names, what=what, min_channels=1)
    return np.array(data.values, dtype=np.float64), data


def _scaled(Y):
    """Y with each channel scaled by a power of two (exact) to magnitudes below 1, and the
    exponents: the filters are linear, so they run on the scaled channels and nothing
    overflows on the way."""
    from .._scaling import pow2_exponents, pow2_scale

    ex = pow2_exponents(Y, axis=0)
    return pow2_scale(Y, -ex), ex


def _back(Z, ex, what):
    """Undo :func:`_scaled`; a result beyond float64 is refused."""
    from .._scaling import pow2_scale

    out = pow2_scale(Z, ex)
    if not np.isfinite(out).all():
        raise ValueError(f"{what}: the result overflows float64 for data this large; rescale "
                         "the data (e.g. divide each channel by its largest value)")
    return out


def _like(X, values, data, rows=slice(None)):
    """Return ``values`` shaped like the input: a DataFrame for a DataFrame, else an array."""
    from ._kernel import _is_dataframe

    if _is_dataframe(X):
        import pandas as pd

        return pd.DataFrame(values, columns=list(X.columns), index=X.index[rows])
    return values


def sample_spacing(times, T=None) -> float:
    """The sample spacing of regular ``times`` (1.0 without times).

    Raises ValueError when the spacing varies by more than 1 % (the filters
    need a regular axis).
    """
    if times is None:
        return 1.0
    t = np.asarray(times, dtype=np.float64)
    if t.size < 2:
        raise ValueError("times: at least 2 samples are needed to know the sample spacing")
    d = np.diff(t)
    h = float(np.median(d))
    if not h > 0 or float(np.max(np.abs(d - h))) > 0.01 * h:
        raise ValueError("times are not regularly spaced (spacing varies by more than 1 %); "
                         "the filters need a regular time axis (resample first, or for "
                         "monthly or quarterly dates give the time as numbers, e.g. years)")
    return h


def _no_gaps(Y, what):
    if not np.isfinite(Y).all():
        r, c = (int(v) for v in np.argwhere(~np.isfinite(Y))[0])
        raise ValueError(f"{what} has a gap or a non-finite value at row {r + 1}, channel {c}; "
                         "filters need gap-free data (split the recording at its gaps)")


def detrend(X, *, times=None, names=None):
    """Remove each channel's least-squares straight line (in time, or sample index).

    Parameters
    ----------
    X : array_like (T, n) or DataFrame
        Gap-free samples; never modified.
    times : array_like (T,), optional
        Sample times (the line is fitted against them).
    names : sequence of str, optional

    Returns
    -------
    ndarray or DataFrame
        Same shape (a DataFrame for a DataFrame input).

    Examples
    --------
    >>> import numpy as np
    >>> from wedgepath.signals.filters import detrend
    >>> X = np.column_stack([np.arange(5.0), 2 + 3 * np.arange(5.0)])
    >>> bool(np.abs(detrend(X)).max() < 1e-12)
    True
    """
    Y, data = _input(X, times, names)
    _no_gaps(Y, "X")
    return _like(X, detrended_array(Y, data.times), data)


def detrended_array(Y, times=None):
    """:func:`detrend` of a checked, gap-free float array (no input checks, no warnings)."""
    Y, ex = _scaled(Y)
    T = Y.shape[0]
    t = np.arange(T, dtype=np.float64) if times is None else np.asarray(times, float)
    t = t - t.mean()
    big = float(np.max(np.abs(t))) if T else 0.0
    t = t / big if big > 0 else t          # the fit does not depend on the time unit
    Yc = Y - Y.mean(axis=0)
    tt = float(t @ t)
    slope = (t @ Yc) / tt if tt > 0 else np.zeros(Y.shape[1])
    return _back(Yc - t[:, None] * slope[None, :], ex, "detrend")


def difference(X, *, times=None, names=None):
    """First differences ``x[k] - x[k-1]`` of each channel (one row shorter).

    With ``times``, the steps must be regular (to 1 %) and hold no gap.

    Differencing is exactly zero-phase only up to half a sample: every
    channel gets the same half-sample delay, so no channel moves against
    another.

    Examples
    --------
    >>> import numpy as np
    >>> from wedgepath.signals.filters import difference
    >>> difference(np.array([[0.0, 1.0], [1.0, 3.0], [3.0, 6.0]])).tolist()
    [[1.0, 2.0], [2.0, 3.0]]
    """
    Y, data = _input(X, times, names)
    _no_gaps(Y, "X")
    if Y.shape[0] < 2:
        raise ValueError("difference needs at least 2 samples")
    _no_time_gaps(data)
    if data.times is not None:
        try:
            sample_spacing(data.times)
        except ValueError:
            raise ValueError("difference: the times are not regularly spaced (the steps vary "
                             "by more than 1 %, e.g. business days or months); a difference "
                             "over uneven steps is not a change per step, and lags read from "
                             "it are biased: resample to a regular grid first, or difference "
                             "without times (per row)") from None
    Y, ex = _scaled(Y)
    return _like(X, _back(np.diff(Y, axis=0), ex, "difference"), data, rows=slice(1, None))


def _no_time_gaps(data):
    """Refuse a time step that is a gap (the rule of ``gap="auto"`` in the cycle cutting):
    a difference across it is the change over the whole outage, not over one step."""
    if data.times is None or data.times.shape[0] < 3:
        return
    from .segment import auto_gap

    t = np.asarray(data.times, dtype=np.float64)
    dt = np.diff(t)
    limit = auto_gap(dt)
    if np.any(dt > limit):
        k = int(np.argmax(dt))
        raise ValueError(f"difference: the time step between rows {k + 1} and {k + 2} "
                         f"({dt[k]:.4g}) is a gap (the median step is "
                         f"{float(np.median(dt)):.4g}); a difference across it is the change "
                         "over the whole gap, not over one step: analyse the gap-free parts "
                         "separately, or do not difference")


def _check_period(p, name):
    v = as_real(p, name)
    if not np.isfinite(v) or v <= 0:
        raise ValueError(f"{name} must be a positive period in time units, got {p!r}")
    return v


def _design(btype, periods, h, T):
    from scipy.signal import butter

    fs = 1.0 / h
    nyq = 0.5 * fs
    freqs = [1.0 / p for p in periods]
    for p, f in zip(periods, freqs):
        if f >= nyq:
            raise ValueError(f"period {p:g} is not longer than two samples ({2 * h:g} time "
                             "units): it cannot be resolved")
    longest = max(periods)
    if longest > T * h:
        raise ValueError(f"period {longest:g} is longer than the recording ({T * h:g} time "
                         "units)")
    wn = sorted(freqs) if btype == "bandpass" else freqs[0]
    return butter(FILTER_ORDER, wn, btype=btype, fs=fs, output="sos")


def _filtfilt(X, times, names, btype, periods):
    from scipy.signal import sosfiltfilt

    Y, data = _input(X, times, names)
    _no_gaps(Y, "X")
    h = sample_spacing(data.times)
    sos = _design(btype, periods, h, Y.shape[0])
    Y, ex = _scaled(Y)
    mean = Y.mean(axis=0)
    out = sosfiltfilt(sos, Y - mean, axis=0)
    if btype == "lowpass":
        out = out + mean
    return _like(X, _back(out, ex, btype), data)


def bandpass(X, shortest, longest, *, times=None, names=None):
    """Keep periods between ``shortest`` and ``longest`` (time units), zero phase.

    A Butterworth band-pass of order 4 in second-order sections, run
    forward and backward (:func:`scipy.signal.sosfiltfilt`): zero phase,
    squared magnitude response.

    Parameters
    ----------
    X : array_like (T, n) or DataFrame
        Gap-free, regularly sampled data; never modified.
    shortest, longest : float
        Shortest and longest period kept, in the units of ``times`` (samples
        without times), ``2 spacing < shortest < longest``.
    times, names
        As for :func:`~wedgepath.area_matrix`.

    Returns
    -------
    ndarray or DataFrame

    Examples
    --------
    >>> import numpy as np
    >>> from wedgepath.signals.filters import bandpass
    >>> t = np.arange(400.0)
    >>> X = np.column_stack([np.sin(2 * np.pi * t / 20) + 0.01 * t])
    >>> Y = bandpass(X, 10, 40)
    >>> bool(np.abs(Y[100:300, 0] - np.sin(2 * np.pi * t[100:300] / 20)).max() < 0.1)
    True
    """
    lo = _check_period(shortest, "shortest")
    hi = _check_period(longest, "longest")
    if not lo < hi:
        raise ValueError(f"the band needs shortest < longest, got {lo:g} and {hi:g}")
    return _filtfilt(X, times, names, "bandpass", [lo, hi])


def highpass(X, longest, *, times=None, names=None):
    """Remove periods longer than ``longest`` (time units), zero phase.

    A Butterworth high-pass of order 4 in second-order sections, run forward
    and backward (:func:`scipy.signal.sosfiltfilt`).

    Examples
    --------
    >>> import numpy as np
    >>> from wedgepath.signals.filters import highpass
    >>> t = np.arange(400.0)
    >>> Y = highpass(np.column_stack([np.sin(2 * np.pi * t / 10) + 0.05 * t]), 50)
    >>> bool(np.abs(Y[50:350, 0] - np.sin(2 * np.pi * t[50:350] / 10)).max() < 0.05)
    True
    """
    hi = _check_period(longest, "longest")
    return _filtfilt(X, times, names, "highpass", [hi])


def invert(X, channels, *, names=None):
    """Negate the named (or numbered) channels: anti-phase channels read the right way round.

    A channel that moves opposite to the others (unemployment against
    output, a pressure against the volume it compresses) has areas of the
    opposite sign; negating it turns "leads the downturn" back into "lags the
    cycle" (or the other way round) and makes its lead read like the others'.

    Parameters
    ----------
    X : array_like (T, n) or DataFrame
        Never modified.
    channels : sequence of str or int
        Channel names (DataFrame columns or ``names``) or indices.
    names : sequence of str, optional

    Returns
    -------
    ndarray or DataFrame

    Examples
    --------
    >>> import numpy as np
    >>> from wedgepath.signals.filters import invert
    >>> invert(np.array([[1.0, 2.0], [3.0, 4.0]]), ["1"]).tolist()
    [[1.0, -2.0], [3.0, -4.0]]
    """
    Y, data = _input(X, None, names)
    idx = channel_indices(channels, data.labels, "invert")
    Y[:, idx] = -Y[:, idx]
    return _like(X, Y, data)


def channel_indices(channels, labels, what):
    """Indices of ``channels`` (names or ints) among ``labels``; clear errors otherwise."""
    if isinstance(channels, (str, int, np.integer)):
        channels = [channels]
    out = []
    for c in channels:
        if isinstance(c, str):
            if c not in labels:
                raise ValueError(f"{what}: unknown channel {c!r}; channels are {list(labels)}")
            out.append(labels.index(c))
        elif isinstance(c, (int, np.integer)) and not isinstance(c, bool):
            if not -len(labels) <= c < len(labels):
                raise ValueError(f"{what}: channel index {c} is out of range for "
                                 f"{len(labels)} channels")
            out.append(int(c) % len(labels))
        else:
            raise TypeError(f"{what}: channels are names or indices, got {c!r}")
    return sorted(set(out))


def preprocess(X, *, times=None, names=None, invert=None, detrend=False, difference=False,
               bandpass=None, highpass=None):
    """Apply the zero-phase steps in a fixed order: invert, detrend, difference, filter.

    Returns ``(values, times, names)``: an array, the matching times (one
    shorter after differencing) or None, and the channel names.

    Examples
    --------
    >>> import numpy as np
    >>> from wedgepath.signals.filters import preprocess
    >>> v, t, nm = preprocess(np.array([[0.0, 0], [1, 2], [3, 3]]), difference=True,
    ...                       invert=["0"])
    >>> v.tolist(), t, nm
    ([[-1.0, 2.0], [-2.0, 1.0]], None, ('0', '1'))
    """
    Y, data = _input(X, times, names)
    t = None if data.times is None else np.asarray(data.times, dtype=np.float64)
    labels = data.labels
    if invert:
        idx = channel_indices(invert, labels, "invert")
        Y[:, idx] = -Y[:, idx]
    if check_bool(detrend, "detrend"):
        Y = globals()["detrend"](Y, times=t)
    if check_bool(difference, "difference"):
        Y = globals()["difference"](Y, times=t)
        t = None if t is None else t[1:]
    if bandpass is not None:
        try:
            lo, hi = bandpass
        except (TypeError, ValueError):
            raise TypeError("bandpass must be a pair (shortest, longest) of periods") from None
        Y = globals()["bandpass"](Y, lo, hi, times=t)
    if highpass is not None:
        Y = globals()["highpass"](Y, highpass, times=t)
    return Y, t, labels
