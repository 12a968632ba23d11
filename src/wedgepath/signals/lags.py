"""Lags behind a reference channel, in time units, for narrow-band (oscillatory) data.

The area matrix cannot give delays: it fixes the plane of the leading cycle
only up to an area-preserving linear map, which keeps the cyclic order but not
the spacing.  For data that oscillate at one dominant frequency ``f0`` a delay
is identified by the phase difference at that frequency divided by the
angular frequency ``2 pi f0`` -- the phase of the cross-spectrum, or of the
product of analytic signals, turned into time (J. S. Bendat and A. G.
Piersol, *Random Data: Analysis and Measurement Procedures*, Wiley, the
time-delay interpretation of the cross-spectral phase angle,
``theta(f) = 2 pi f tau``, from memory; analytic signal: D. Gabor, "Theory of
communication", J. IEE 93, 1946).

For broad-band data a single lag is not defined (each frequency has its own
phase difference); :func:`reference_lags` then says so and gives no number.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from .._results import Result, fmt_names, fmt_number
from .._validation import as_int, as_real, as_rng

__all__ = ["reference_lags", "ReferenceLags", "NARROW_BAND_SHARE"]

#: the reference is narrow-band when at least this share of its power lies
#: within a factor ``_BAND`` of its peak frequency
NARROW_BAND_SHARE = 0.5
_BAND = 1.25


@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class ReferenceLags(Result):
    """Result of :func:`reference_lags`.

    Attributes
    ----------
    reference : str
        The reference channel.
    lags : ndarray (n,)
        Each channel's lag behind the reference, in time units (positive:
        the channel lags; the reference's own is 0), in
        ``(-period/2, period/2]``; all NaN when the data are broad-band.
    low, high : ndarray (n,)
        Block-bootstrap percentile interval at level ``confidence``.
    coherence : ndarray (n,)
        ``|mean(z_k conj(z_ref))| / mean(|z_k| |z_ref|)`` of the analytic
        signals: 1 for a constant phase difference, near 0 when the phases
        drift (the lag then means little).
    period : float
        ``1 / f0``, the reference's dominant period, in time units.
    band_share : float
        Share of the reference's power within a factor 1.25 of ``f0``.
    narrowband : bool
        ``band_share >= NARROW_BAND_SHARE`` (0.5): a lag is defined.
    confidence : float
    n_boot : int
    block : int
        Bootstrap block length (samples).
    resampled : bool
        The times were irregular (spacing varying by more than 1 %), and the
        channels were resampled linearly onto a regular grid of as many points.
    names : tuple of str
    units : mapping or None

    ``to_frame()``: one row per channel: ``channel, lag, low, high, coherence``.
    """

    reference: str
    lags: np.ndarray
    low: np.ndarray
    high: np.ndarray
    coherence: np.ndarray
    period: float
    band_share: float
    confidence: float
    n_boot: int
    block: int
    names: tuple
    seed: object = None
    resampled: bool = False
    units: Mapping | None = None

    @property
    def narrowband(self) -> bool:
        """A single lag is defined (the reference oscillates at one frequency)."""
        return bool(self.band_share >= NARROW_BAND_SHARE)

    def as_dict(self) -> dict:
        """``{channel: lag}`` (NaN entries for broad-band data)."""
        return {nm: float(v) for nm, v in zip(self.names, self.lags)}

    def to_frame(self):
        """One row per channel: ``channel, lag, low, high, coherence``."""
        import pandas as pd

        return pd.DataFrame({"channel": list(self.names), "lag": self.lags, "low": self.low,
                             "high": self.high, "coherence": self.coherence})

    def _summary_items(self):
        return [("reference", repr(self.reference)), ("period", fmt_number(self.period, 4)),
                ("narrowband", str(self.narrowband)), ("names", fmt_names(self.names))]


def _wrap(a):
    return np.mod(a + np.pi, 2 * np.pi) - np.pi


def reference_lags(X, reference, *, times=None, names=None, n_boot=199, confidence=0.95,
                   seed=0) -> ReferenceLags:
    """Each channel's lag behind ``reference`` in time units, with a bootstrap interval.

    Method: each channel is detrended (least-squares line) and turned into
    its analytic signal ``z_k`` (:func:`scipy.signal.hilbert`); the dominant
    frequency ``f0`` is the peak of the reference's periodogram (refined by
    the power-weighted mean over the neighbouring frequencies); the lag of
    channel k is ``-arg(mean(z_k conj(z_ref))) / (2 pi f0)``.  A channel
    ``x_k(t) = x_ref(t - d)`` gets lag ``d`` (for ``|d| < period / 2``).
    The interval is a circular block bootstrap of the products
    ``z_k conj(z_ref)`` (blocks of at least two periods and ``sqrt(T)``
    samples), percentile limits of the replicate lags.

    Parameters
    ----------
    X : array_like (T, n), DataFrame or Path
        Gap-free data; irregularly sampled data are resampled linearly onto a
        regular grid first (``resampled`` says so).
    reference : str or int
        The reference channel.
    times, names
        As for :func:`area_matrix`; lags are in the units of ``times``
        (samples without).
    n_boot : int
    confidence : float
    seed : int, Generator or None

    Returns
    -------
    ReferenceLags
        ``lags`` NaN (and ``narrowband`` False) when the reference is
        broad-band: less than half its power within a factor 1.25 of its
        peak frequency.

    Examples
    --------
    >>> import numpy as np
    >>> import wedgepath as wp
    >>> t = np.arange(0, 200, 0.1)                     # seconds
    >>> X = np.column_stack([np.sin(2 * np.pi * t / 8), np.sin(2 * np.pi * (t - 1.5) / 8)])
    >>> res = wp.reference_lags(X, 0, times=t)
    >>> round(float(res.lags[1]), 3), round(res.period, 3)
    (1.5, 8.0)
    """
    from scipy.signal import hilbert

    from .filters import channel_indices, detrended_array, sample_spacing
    from .significance import _gap_free

    R = as_int(n_boot, "n_boot")
    if R < 2:
        raise ValueError(f"n_boot must be at least 2, got {R}")
    level = as_real(confidence, "confidence")
    if not 0.0 < level < 1.0:
        raise ValueError(f"confidence must lie strictly between 0 and 1, got {level}")
    rng = as_rng(seed)
    Y, data, _ = _gap_free(X, times, names, min_channels=1,
                             needs="reference_lags needs")
    labels = data.labels
    ref = channel_indices([reference], labels, "reference")[0]
    T, n = Y.shape
    resampled = False
    try:
        h = sample_spacing(data.times)
    except ValueError:
        # irregular times: resample every channel linearly onto a regular grid of T points
        t = np.asarray(data.times, dtype=np.float64)
        grid = np.linspace(t[0], t[-1], T)
        Y = np.column_stack([np.interp(grid, t, Y[:, k]) for k in range(n)])
        h = (t[-1] - t[0]) / (T - 1)
        resampled = True
    if T < 16:
        raise ValueError(f"reference_lags needs at least 16 samples, got {T}")
    Y = detrended_array(Y)      # Y is checked already: no second round of input warnings
    P = np.abs(np.fft.rfft(Y[:, ref])) ** 2
    f = np.fft.rfftfreq(T, d=h)
    P[0] = 0.0
    total = float(P.sum())
    nan = np.full(n, np.nan)
    if total == 0:
        raise ValueError(f"the reference channel {labels[ref]!r} is constant")
    k0 = int(np.argmax(P))
    nb = slice(max(k0 - 2, 1), k0 + 3)
    f0 = float(np.sum(f[nb] * P[nb]) / np.sum(P[nb]))
    band = (f >= f0 / _BAND) & (f <= f0 * _BAND)
    band[k0] = True         # the peak bin itself, which a few-cycle record can leave outside
    share = float(P[band].sum() / total)
    period = 1.0 / f0
    block = int(min(max(np.ceil(2 * period / h), np.ceil(np.sqrt(T)), 2), max(T // 4, 2)))
    common = dict(reference=labels[ref], period=period, band_share=share, confidence=level,
                  n_boot=R, block=block, names=labels, seed=seed, units=data.units,
                  resampled=resampled)
    if share < NARROW_BAND_SHARE:
        return ReferenceLags(lags=nan, low=nan.copy(), high=nan.copy(), coherence=nan.copy(),
                             **common)
    Zs = hilbert(Y, axis=0)
    prod = Zs * np.conj(Zs[:, ref])[:, None]                      # (T, n)
    m = prod.mean(axis=0)
    coh = np.abs(m) / np.maximum(np.mean(np.abs(prod), axis=0), np.finfo(float).tiny)
    theta = np.angle(m)
    omega = 2 * np.pi * f0
    lags = -theta / omega
    # circular block bootstrap of the mean product
    nblocks = int(np.ceil(T / block))
    csum = np.concatenate((np.zeros((1, n), complex), np.cumsum(np.concatenate((prod, prod)),
                                                                axis=0)))
    reps = np.empty((R, n))
    for r in range(R):
        st = rng.integers(0, T, size=nblocks)
        s = (csum[st + block] - csum[st]).sum(axis=0)
        reps[r] = theta + _wrap(np.angle(s) - theta)
    a = (1 - level) / 2
    lo_t, hi_t = np.quantile(reps, [a, 1 - a], axis=0)
    low, high = -hi_t / omega, -lo_t / omega
    lags[ref] = low[ref] = high[ref] = 0.0
    return ReferenceLags(lags=lags, low=low, high=high, coherence=coh, **common)
