"""The area matrix of n signals and its normalisations.

Convention (shared by the whole package)::

    A[i, j] = (1/2) closed-integral (x_i dx_j - x_j dx_i)

the oriented area swept in the (x_i, x_j) plane, positive for
counter-clockwise travel.  ``A[i, j] > 0`` means channel i leads channel j:
two sinusoids ``x_i = sin t``, ``x_j = sin(t - phi)``, ``0 < phi < pi``, give
``A[i, j] = pi sin(phi)`` per cycle.  ``A`` is skew-symmetric.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from typing import ClassVar

import numpy as np

from .._results import ArrayResult, fmt_names, fmt_number, pair_index
from .._scaling import pow2_exponents, pow2_scale
from .._validation import as_float_array, as_int, check_choice
from ._kernel import (ConstantChannelWarning, channel_exponents, closed_area,  # noqa: F401
                      closed_piece_rows, overflow_error, scaled_data, signal_input,
                      check_closure, unscale_pairs, warn_constant)

__all__ = ["area_matrix", "AreaMatrix", "NORMALIZATIONS", "ConstantChannelWarning",
           "hilbert_energy"]

#: Accepted values of ``normalize=`` (``None`` means raw areas).
NORMALIZATIONS = ("hilbert", "zscore", "frobenius")

# raw areas below this may come from underflowing products: recheck the magnitudes
_TINY = 2.0 ** -800

# bytes of complex spectrum computed at once by the Hilbert normaliser
_FFT_BUDGET = 1 << 26


@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class AreaMatrix(ArrayResult):
    """An area matrix with its channel names and the conventions it was computed with.

    Returned by :func:`area_matrix`, :meth:`AreaAccumulator.result`,
    :func:`wedgepath.io.stream_area_matrix` and :mod:`wedgepath.dask`.
    Array-like: ``np.asarray(m)`` is ``m.values`` (read-only), ``m[i, j]``
    one entry by index or by name (``m["a", "b"]``), ``m[:, 0]`` any numpy
    index of the values.

    Attributes
    ----------
    values : ndarray, shape (n, n)
        The skew-symmetric matrix: raw areas ``A[i, j]``, or the normalised
        values when ``normalize`` is set.
    names : tuple of str
        Channel names (``"0", "1", ...`` when the input had none).
    closure : str
        How each piece was closed (see :func:`area_matrix`).
    normalize : str or None
        The normalisation of ``values`` (None: raw areas).
    raw : ndarray (n, n) or None
        The raw areas when ``values`` are normalised (None otherwise, and
        where the raw areas are not known).
    samples : int or None
        Number of samples (rows, gap rows included) the matrix was computed from.
    units : mapping or None
        Channel name -> unit text, where the input had units; a raw area of
        channels i and j has the unit of x_i times that of x_j.
    trials : tuple of str or None
        Trial labels when the matrix was computed with ``trials=`` (then
        ``values`` is the pooled matrix, the sum of the trials' raw areas,
        normalised as a whole).
    trial_values : ndarray (N, n, n) or None
        One matrix per trial (normalised each on its own when ``normalize``
        is set).
    trial_start, trial_stop : ndarray of int (N,) or None
        Trial t holds rows ``trial_start[t]:trial_stop[t]`` (0-based, stop
        excluded).

    ``to_frame()`` has one row per pair ``i < j``, columns ``i, j,
    channel_i, channel_j, area`` (plus ``normalized`` when ``normalize`` is
    set; ``area`` is then the raw area, NaN where it is not known).  With
    trials it also has a ``trial`` column: ``"pooled"`` for the pooled
    rows, then the rows of each trial under its label.

    Examples
    --------
    >>> import wedgepath as wp
    >>> m = wp.area_matrix({"a": [0.0, 1, 1, 0], "b": [0.0, 0, 1, 1]})
    >>> m
    AreaMatrix(names=['a', 'b'], closure='chord', normalize=None, max=1 (a leads b), samples=4)
    >>> m.to_frame()
       i  j channel_i channel_j  area
    0  0  1         a         b   1.0
    """

    _array_field: ClassVar[str] = "values"

    values: np.ndarray
    names: tuple
    closure: str = "chord"
    normalize: str | None = None
    raw: np.ndarray | None = None
    samples: int | None = None
    units: Mapping | None = None
    trials: tuple | None = None
    trial_values: np.ndarray | None = None
    trial_raw: np.ndarray | None = None
    trial_start: np.ndarray | None = None
    trial_stop: np.ndarray | None = None

    def index(self, key) -> int:
        """Position of a channel given by name or index."""
        if isinstance(key, str):
            try:
                return self.names.index(key)
            except ValueError:
                raise KeyError(f"unknown channel {key!r}; channels are {list(self.names)}") from None
        if isinstance(key, (bool, np.bool_)) or not isinstance(key, (int, np.integer)):
            raise KeyError(f"a channel is a name or an index, got {key!r}")
        n = len(self.names)
        k = int(key)
        if not -n <= k < n:
            raise KeyError(f"channel index {k} is out of range for {n} channels")
        return k % n

    def __getitem__(self, key):
        if isinstance(key, tuple) and len(key) == 2 and all(
                isinstance(k, (str, int, np.integer)) and not isinstance(k, (bool, np.bool_))
                for k in key):
            return self.values[self.index(key[0]), self.index(key[1])]
        if isinstance(key, str):
            raise KeyError("index an AreaMatrix with a pair of channel names or indices, "
                           "e.g. m['a', 'b']")
        return self.values[key]

    def to_frame(self):
        """One row per pair ``i < j``: ``i, j, channel_i, channel_j, area`` (+ ``normalized``).

        With trials, a first column ``trial`` ("pooled", then each trial's label).
        """
        import pandas as pd

        iu, ju = pair_index(len(self.names))
        nm = np.array(self.names, dtype=object)

        def rows(values, raw):
            cols = {"i": iu, "j": ju, "channel_i": nm[iu], "channel_j": nm[ju]}
            if self.normalize is None:
                cols["area"] = values[iu, ju]
            else:
                cols["area"] = raw[iu, ju] if raw is not None else np.full(iu.size, np.nan)
                cols["normalized"] = values[iu, ju]
            return cols

        if self.trials is None:
            return pd.DataFrame(rows(self.values, self.raw))
        parts = [pd.DataFrame({"trial": "pooled", **rows(self.values, self.raw)})]
        for t, label in enumerate(self.trials):
            raw = None if self.trial_raw is None else self.trial_raw[t]
            parts.append(pd.DataFrame({"trial": label, **rows(self.trial_values[t], raw)}))
        return pd.concat(parts, ignore_index=True)

    def _summary_items(self):
        items = [("names", fmt_names(self.names)), ("closure", repr(self.closure)),
                 ("normalize", repr(self.normalize))]
        v = np.where(np.isnan(self.values), 0.0, np.abs(self.values))
        if v.size and v.max() > 0:
            i, j = np.unravel_index(int(np.argmax(np.triu(v, 1))), v.shape)
            a = self.values[i, j]
            i, j = (i, j) if a >= 0 else (j, i)
            # the strongest lead: |A[i, j]| with i the leading channel
            items.append(("max", f"{fmt_number(abs(a), 4)} ({self.names[i]} leads {self.names[j]})"))
        if self.samples is not None:
            items.append(("samples", str(self.samples)))
        if self.trials is not None:
            items.append(("trials", str(len(self.trials))))
        if self.units:
            items.append(("units", repr(dict(self.units))))
        return items


def _pieces_for_norm(sc, closure):
    """Pieces that make a closed cycle of at least 2 distinct samples."""
    starts, stops = sc.starts, sc.stops
    min_len = 2 if closure in ("chord", "none") else 3
    keep = (stops - starts) >= min_len
    return starts[keep], stops[keep]


def _channel_blocks(n, rows):
    per = max(1, _FFT_BUDGET // max(16 * rows, 1))
    return [slice(k, min(n, k + per)) for k in range(0, n, per)]


def hilbert_energy(x, axis=0):
    """Discrete Hilbert energy: the area of the loop (x, Hx) of each channel.

    For a closed sample sequence ``x_0..x_{N-1}`` (the chord back to ``x_0``
    closes it) with discrete Fourier coefficients ``X_m``::

        E = (2/N) * sum_{0 < m < N/2} sin(2 pi m / N) |X_m|^2  >= 0

    which equals the polygon area ``(1/2) sum_k (x_k y_{k+1} - y_k x_{k+1})``
    of the loop traced by ``x`` against its discrete Hilbert transform ``y``
    (a quarter-period delay of every frequency).  It bounds the areas:
    ``|A[i, j]| <= sqrt(E_i E_j)`` (Cauchy-Schwarz over frequencies), with
    equality for a single frequency at a 90-degree lag.

    Parameters
    ----------
    x : array_like
        Samples along ``axis``.

    Returns
    -------
    ndarray
        One energy per channel (shape of ``x`` without ``axis``).

    Examples
    --------
    A sine sampled 8 times per cycle over 3 cycles: the area of the regular
    octagon of radius a, 3 times, ``3 * (8/2) sin(2 pi/8) a^2``:

    >>> import numpy as np
    >>> from wedgepath.signals import hilbert_energy
    >>> t = 2 * np.pi * np.arange(24) / 8
    >>> float(np.round(hilbert_energy(2.0 * np.sin(t)) / (3 * 4 * np.sin(np.pi / 4) * 4.0), 12))
    1.0
    """
    x = as_float_array(x, "x", copy=False)
    if x.ndim == 0:
        raise ValueError("x must have at least one dimension (the samples)")
    axis = as_int(axis, "axis")
    if not -x.ndim <= axis < x.ndim:
        raise ValueError(f"axis {axis} is out of range for x of shape {x.shape}")
    return _hilbert_energy(x, axis)


def _hilbert_energy(x, axis=0):
    N = x.shape[axis]
    if N < 3:
        return np.zeros(np.delete(x.shape, axis)) if x.ndim > 1 else np.float64(0.0)
    # Each lane is scaled by a power of two (exact) so that the squared Fourier
    # coefficients neither overflow nor underflow; the energy is scaled back.
    ex = pow2_exponents(x, axis=axis, keepdims=True)
    x = pow2_scale(x, -ex)
    xc = x - x.mean(axis=axis, keepdims=True)
    F = np.fft.rfft(xc, axis=axis)
    m = np.arange(F.shape[axis])
    w = np.sin(2.0 * np.pi * m / N)
    w[0] = 0.0
    if N % 2 == 0:
        w[-1] = 0.0
    shape = [1] * x.ndim
    shape[axis] = -1
    power = F.real ** 2 + F.imag ** 2
    energy = (2.0 / N) * np.sum(power * w.reshape(shape), axis=axis)
    energy = pow2_scale(energy, 2 * np.squeeze(ex, axis=axis))
    if not np.all(np.isfinite(energy)):
        raise ValueError("hilbert_energy: the energy overflows float64 for data this large; "
                         "rescale the data")
    return energy


def _normalise(A, data, sc, closure, normalize):
    n = A.shape[0]
    names = data.names
    if normalize == "frobenius":
        big = float(np.max(np.abs(A)))
        norm = big * float(np.sqrt(np.sum((A / big) ** 2))) if big > 0 else 0.0
        if norm == 0.0:
            import warnings
            warnings.warn("all areas are zero (no channel moves against another); the "
                          "'frobenius'-normalised matrix is NaN", ConstantChannelWarning, stacklevel=3)
            return np.full_like(A, np.nan)
        return A / norm
    starts, stops = _pieces_for_norm(sc, closure)
    denom = np.zeros(n)
    varies = np.zeros(n, dtype=bool)
    for s, e in zip(starts.tolist(), stops.tolist()):
        rows = e - s
        for cols in _channel_blocks(n, rows):
            x = closed_piece_rows(data, closure, s, e, cols)
            if x.shape[0] < 2:
                continue
            varies[cols] |= x.max(axis=0) > x.min(axis=0)
            if normalize == "hilbert":
                denom[cols] += _hilbert_energy(x)
            else:  # zscore
                d = x - x.mean(axis=0)
                denom[cols] += np.einsum("ij,ij->j", d, d)
    bad = np.flatnonzero(~varies | ~(denom > 0))
    if bad.size:
        why = ("is constant" if not varies[bad].any() else
               "has no variation the normaliser can see (constant, or only pieces too short)")
        warn_constant(bad.tolist(), names, why)
    scale = np.sqrt(np.where(denom > 0, denom, np.nan))
    out = A / np.outer(scale, scale)
    out[bad, :] = np.nan
    out[:, bad] = np.nan
    return out


def area_matrix(X, *, times=None, closure="chord", normalize=None, names=None,
                tol=None, trials=None) -> AreaMatrix:
    """Oriented areas between every pair of channels, ``A[i, j] = (1/2)∮(x_i dx_j - x_j dx_i)``.

    ``A[i, j] > 0`` means channel i leads channel j (the pair turns
    counter-clockwise in the (x_i, x_j) plane).  Two sinusoids
    ``x_i = sin t``, ``x_j = sin(t - phi)``, ``0 < phi < pi``, give
    ``A[i, j] = pi sin(phi)`` per cycle.  The matrix is skew-symmetric.

    Computed in one pass over the data with BLAS: a lagged cross-product
    ``Z[:-1].T @ Z[1:]`` of each chunk, centred on the chunk's first sample
    (so offsets of any size do not cost precision), combined by Chen's
    identity.  Equal to the per-pair shoelace sum within rounding.

    Parameters
    ----------
    X : array_like (T, n), pandas DataFrame, Path, or asynchronous channels
        Samples in rows, channels in columns.  A DataFrame's column labels
        and a Path's names become channel names; a Path's times are used.
        Asynchronous channels -- a list of 1-D arrays with ``times`` a list
        of per-channel time arrays, or a mapping/list of pandas Series
        indexed by time -- are aligned on the union of their time stamps by
        linear interpolation (:func:`align`; exact for the linear model).
        NaN rows are gaps: they split the data into pieces, each closed on
        its own, and the pieces' areas add.  The input is never modified.
    times : array_like (T,), optional
        Strictly increasing sample times.  Areas of the linear model do not
        depend on them; they matter for ``closure="detrend"`` (drift removed
        in proportion to time) and for aligning asynchronous channels.
    closure : {"chord", "none", "detrend", "require"}
        How each piece is closed, as in :meth:`Path.close`:

        ``"chord"`` (default)
            Join the last sample back to the first with a straight chord.
            The result is the Lévy area of each piece: translation
            invariant, and equal to the cyclic sum over samples.
        ``"none"``
            No closure: the line integral of the 1-form
            ``(1/2)(x_i dx_j - x_j dx_i)`` along the open polyline, in the
            caller's coordinates -- ``A_chord - (1/2)(x_last ^ x_first)``
            per piece.  It depends on where the origin is; use it only when
            the origin means something (deviations from a set point).
        ``"detrend"``
            Subtract the linear drift ``s_k (x_last - x_first)``, ``s_k``
            running from 0 to 1 in time (in sample index without times), so
            each piece ends where it began; then take the closed area.
        ``"require"``
            Refuse unless every piece ends within ``tol`` of its start
            (default ``1e-9`` times the piece's extent); the end is then set
            exactly to the start.
    normalize : {None, "hilbert", "zscore", "frobenius"}
        ``None``: raw areas (units of x_i times x_j).  Otherwise a
        dimensionless, scale-invariant value:

        ``"hilbert"``
            ``A[i, j] / sqrt(E_i E_j)`` with ``E_i`` the area of the loop
            of channel i against its own discrete Hilbert transform
            (:func:`hilbert_energy`).  Always in [-1, 1]; for two sinusoids
            of one frequency with any amplitudes, sampled regularly over
            whole cycles, it is exactly ``sin(phi)``, phi the phase lead of
            i over j.  For broadband signals it is a frequency-weighted
            average of the sines of the phase leads.
        ``"zscore"``
            ``A[i, j] / sqrt(S_i S_j)`` with ``S_i`` the sum of squared
            deviations of channel i from its (per-piece) mean: the area per
            sample of the standardised channels, in [-1, 1].  For a sinusoid
            pair sampled ``d`` radians apart it is ``sin(d) sin(phi)``: it
            grows with the frequency, so compare it only between recordings
            with similar rhythms and sampling.
        ``"frobenius"``
            ``A / ||A||_F``: the pattern of leads only (cyclic order,
            relative strengths), the overall strength divided out.

        The per-channel normalisers use the samples of each closed piece
        (for ``"none"``, those of the chord closure) and sample index as
        time.  A channel that does not vary gives NaN in its row and column,
        with a :class:`ConstantChannelWarning` naming it.
    names : sequence of str, optional
        Channel names for an array input (DataFrame/Path names are used
        otherwise; passing different ones is an error).  Default
        ``"0", "1", ...``.
    tol : float, optional
        Tolerance of ``closure="require"``.
    trials : str, array_like or None
        Repeated trials in one table: the name of a DataFrame column holding
        each row's trial (the column is not a channel), one label per row,
        or ``"gaps"`` (the pieces between NaN rows).  Each trial is closed
        on its own; the result holds one matrix per trial
        (``trial_values``) and the pooled matrix (``values``: the sum of
        the trials' raw areas; normalised over all trials' samples).

    Returns
    -------
    AreaMatrix
        The (n, n) matrix (``.values``, or ``np.asarray(result)``) with the
        channel ``names``, ``closure``, ``normalize`` (and the raw areas in
        ``.raw`` when normalised), ``samples`` and ``units`` (from a
        DataFrame's ``attrs["units"]``).  ``.to_frame()`` lists the pairs.

    Raises
    ------
    ValueError
        Fewer than 2 channels or 2 samples, infinite values, a bad closure or
        normalisation name, mismatched names or times.
    TypeError
        Non-numeric data (text, booleans, complex, datetimes).

    Examples
    --------
    Channel 0 leads channel 1 by a quarter cycle: the area is one unit disc
    per cycle (sampled here as a square, area 2):

    >>> import numpy as np
    >>> import wedgepath as wp
    >>> X = np.array([[1.0, 0.0], [0.0, 1.0], [-1.0, 0.0], [0.0, -1.0]])
    >>> A = wp.area_matrix(X)
    >>> A
    AreaMatrix(names=['0', '1'], closure='chord', normalize=None, max=2 (0 leads 1), samples=4)
    >>> A.values
    array([[ 0.,  2.],
           [-2.,  0.]])

    Two sinusoids 60 degrees apart, any amplitudes, whole cycles:

    >>> t = 2 * np.pi * np.arange(400) / 100
    >>> Y = np.column_stack([3 * np.sin(t), 0.5 * np.sin(t - np.pi / 3)])
    >>> round(float(wp.area_matrix(Y, normalize="hilbert")[0, 1]), 10), round(float(np.sin(np.pi / 3)), 10)
    (0.8660254038, 0.8660254038)

    Names travel with the result; NaN rows split the data into pieces:

    >>> m = wp.area_matrix({"strain": [0, 1, 1, np.nan, 0, 2], "stress": [0, 0, 1, np.nan, 0, 0]})
    >>> float(m["strain", "stress"])
    0.5
    """
    check_closure(closure)
    if normalize is not None:
        check_choice(normalize, "normalize", NORMALIZATIONS)
    if tol is not None:
        if isinstance(tol, (bool, np.bool_)) or not isinstance(tol, (int, float, np.integer,
                                                                     np.floating)):
            raise TypeError(f"tol must be a number, got {tol!r}")
        if not (np.isfinite(tol) and tol >= 0):
            raise ValueError(f"tol must be a finite number >= 0, got {tol!r}")
    if trials is not None:
        return _area_matrix_trials(X, times, closure, normalize, names, tol, trials)
    data = signal_input(X, times, names)
    A = raw = None
    if normalize is None and closure != "require":
        with np.errstate(invalid="ignore", over="ignore", under="ignore"):
            A, sc = closed_area(data, closure, tol)
        if not (np.isfinite(A).all() and np.max(np.abs(A)) >= _TINY):
            A = None  # overflow, or areas so small that products may have underflowed
    if A is None:
        # Channels far from unit magnitude are rescaled by powers of two (exact),
        # so that no product overflows or underflows; areas are scaled back.
        e, needed = channel_exponents(data)
        if closure == "require":
            e = np.full_like(e, e.max())   # keep the Euclidean gap test meaningful
            if tol is not None and needed:
                tol = float(pow2_scale(float(tol), -int(e.max())))
        work = scaled_data(data, e) if needed else data
        with np.errstate(invalid="ignore", over="ignore", under="ignore"):
            A, sc = closed_area(work, closure, tol)
        if normalize is None:
            A = unscale_pairs(A, e) if needed else A
            if not np.isfinite(A).all():
                raise overflow_error()
        else:
            raw = pow2_scale(A, e[:, None] + e[None, :]) if needed else A.copy()
            if not np.isfinite(raw).all():
                raw = None              # the raw areas overflow: the normalised ones do not
            if normalize == "frobenius" and needed:
                # the pattern only: a common power of two divides out
                A = pow2_scale(A, e[:, None] + e[None, :] - 2 * int(e.max()))
            # (per-channel normalisers are invariant to each channel's scale)
            A = _normalise(A, work, sc, closure, normalize)
    return AreaMatrix(values=A, names=data.labels, closure=closure, normalize=normalize, raw=raw,
                      samples=int(data.shape[0]), units=data.units)


def _area_matrix_trials(X, times, closure, normalize, names, tol, trials):
    """``area_matrix`` per trial and pooled (see its ``trials`` parameter)."""
    import warnings

    from ._kernel import ScanResult, ShapeWarning
    from .trials import resolve_trials, split_trial_column

    X, trials = split_trial_column(X, trials)
    data = signal_input(X, times, names)
    tr = resolve_trials(trials, data)
    N, n = len(tr), data.shape[1]
    vals = np.full((N, n, n), np.nan)
    raws = np.full((N, n, n), np.nan) if normalize is not None else None
    pooled_raw = np.zeros((n, n))
    for t, (a, b) in enumerate(zip(tr.start.tolist(), tr.stop.tolist())):
        rows = np.asarray(data.values[a:b], dtype=np.float64)
        if b - a < 2 or np.isnan(rows).any(axis=1).all():
            vals[t] = 0.0 if normalize is None else np.nan   # no segment: no area
            if raws is not None:
                raws[t] = 0.0
            continue
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", ShapeWarning)      # said once for the whole input
            sub = area_matrix(rows, times=None if data.times is None else data.times[a:b],
                              closure=closure, normalize=normalize, tol=tol)
        vals[t] = sub.values
        r = sub.values if normalize is None else sub.raw
        if raws is not None:
            raws[t] = np.nan if r is None else r
        if r is None:
            raise overflow_error()
        pooled_raw += r
    if normalize is None:
        pooled = pooled_raw
    elif normalize == "frobenius":
        pooled = _normalise(pooled_raw, data, None, closure, normalize)
    else:
        sc = ScanResult(None, tr.piece_start, tr.piece_stop)
        pooled = _normalise(pooled_raw, data, sc, closure, normalize)
    return AreaMatrix(values=pooled, names=data.labels, closure=closure, normalize=normalize,
                      raw=None if normalize is None else pooled_raw, samples=int(data.shape[0]),
                      units=data.units, trials=tr.labels, trial_values=vals, trial_raw=raws,
                      trial_start=tr.start, trial_stop=tr.stop)
