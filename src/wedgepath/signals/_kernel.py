"""Shared machinery of the signals layer: reading input, the one-pass area scan.

The central routine is :func:`scan`, which walks once over a (T, n) array in
row chunks and returns everything the area functions need:

* ``M`` (n, n): the sum over all segments ``(k, k+1)`` inside pieces of
  ``(x_k - g) (x) (x_{k+1} - g)``, where ``g`` is the first sample of the
  segment's piece (only its antisymmetric part is used:
  ``(M - M.T) / 2`` is the sum over pieces of their chord-closed areas);
* the start and stop row of every piece (maximal run of complete rows).

Precision.  Each chunk is centred on its own first sample before the BLAS
product ``Z[:-1].T @ Z[1:]``, so an offset common to the data never enters a
product; the chunk is then moved to its piece's reference ``g`` by Chen's
identity (area of a concatenation = sum of areas + half the wedge of the two
increments), which only involves differences of samples.

Speed.  A chunk without gaps costs one subtraction and one GEMM; NaN rows are
detected from the GEMM result itself (NaN propagates), so gap-free data pay
nothing for the gap logic.
"""

from __future__ import annotations

import math
import warnings
from collections.abc import Mapping

import numpy as np

from .._scaling import pow2_exponents, pow2_scale
from .._results import default_names
from .._validation import (as_float_array, check_choice, check_names, check_time_axis,  # noqa: F401
                           check_times)
from ..calculus.paths import CLOSURES, Path

__all__ = []  # internal module

#: doubles per chunk of the scan (2**20 doubles = 8 MiB).  Chunks this large keep
#: the GEMM of each chunk efficient (1-2x the time of ``X.T @ X``; with 1 MiB
#: chunks n = 256 took 6x, from BLAS start-up per small product) while the
#: scan's extra memory stays bounded (about two chunks).
CHUNK_ELEMENTS = 1 << 20
#: at most this many rows per chunk (shorter chunks keep the centred values small)
CHUNK_MAX_ROWS = 16384


class ConstantChannelWarning(UserWarning):
    """A normalised value could not be formed because a channel does not vary."""


def chunk_rows(n: int) -> int:
    return max(256, min(CHUNK_MAX_ROWS, CHUNK_ELEMENTS // max(n, 1)))


def wedge(a, b):
    """``a ^ b`` as a matrix: ``outer(a, b) - outer(b, a)`` (batched over leading axes)."""
    a = np.asarray(a)
    b = np.asarray(b)
    ab = a[..., :, None] * b[..., None, :]
    return ab - np.swapaxes(ab, -1, -2)


def skew_half(M):
    """``(M - M^T) / 2`` over the last two axes."""
    return 0.5 * (M - np.swapaxes(M, -1, -2))


# --------------------------------------------------------------------------- input
class SignalData:
    """Checked input: a (T, n) real array (not necessarily float64) plus times and names.

    ``values`` is never written to.  It may be the caller's own array (no
    copy) when that is already a real numeric ndarray; chunks are converted
    to float64 as they are read.  ``units`` (channel name -> unit text) comes
    from a DataFrame's ``attrs["units"]`` when it has one.
    """

    __slots__ = ("values", "times", "names", "units", "time_axis")

    def __init__(self, values, times, names, units=None, time_axis=None):
        self.values = values
        self.times = times
        self.names = names
        self.units = units
        self.time_axis = time_axis

    def report_times(self, positions):
        """Times of (fractional) sample ``positions`` in the input's form, and their unit.

        Returns ``(times, unit)``: ISO-8601 text with ``unit="ISO-8601"`` for
        datetime input; numbers with the input's unit (``"s"`` for
        timedeltas, None when the numbers came without one) otherwise; the
        positions themselves with ``unit="sample"`` when there were no times.
        """
        pos = np.asarray(positions, dtype=np.float64)
        if self.times is None:
            return pos.copy(), "sample"
        idx = np.arange(self.times.shape[0], dtype=np.float64)
        t = np.interp(pos, idx, self.times) if pos.size else pos.copy()
        ax = self.time_axis
        if ax is None or ax.kind != "datetime":
            return t, (None if ax is None else ax.unit)
        return ax.format(t), "ISO-8601"

    @property
    def shape(self):
        return self.values.shape

    @property
    def labels(self) -> tuple:
        """The channel names, ``"0", "1", ...`` when the input had none."""
        return self.names if self.names is not None else default_names(self.values.shape[1])

    def units_of(self, names=None):
        """The units of the channels ``names`` (default: all) that have one, or None."""
        if not self.units:
            return None
        keep = {k: v for k, v in self.units.items() if names is None or k in names}
        return keep or None

    def rows(self, a, b):
        """Rows ``a:b`` as float64 (a view when the input already is float64)."""
        return np.asarray(self.values[a:b], dtype=np.float64)


def _is_dataframe(obj) -> bool:
    return (hasattr(obj, "columns") and hasattr(obj, "dtypes") and hasattr(obj, "to_numpy")
            and not isinstance(obj, np.ndarray))


def _is_series(obj) -> bool:
    return (hasattr(obj, "index") and hasattr(obj, "to_numpy") and hasattr(obj, "dtype")
            and not hasattr(obj, "columns") and not isinstance(obj, np.ndarray))


def _frame_units(df, names):
    """``df.attrs["units"]`` restricted to the channels, when it maps names to unit text."""
    attrs = getattr(df, "attrs", None)
    units = attrs.get("units") if isinstance(attrs, Mapping) else None
    if not isinstance(units, Mapping):
        return None
    keep = {str(k): v for k, v in units.items() if str(k) in names and isinstance(v, str)}
    return keep or None


def _frame_values(df, what):
    cols = list(df.columns)
    names = []
    for c in cols:
        dt = df[c].dtype if not isinstance(df[c], type(df)) else None
        if dt is None:
            raise ValueError(f"{what} has repeated column label {c!r}")
        kind = getattr(dt, "kind", "O")
        if kind == "b":
            raise TypeError(f"{what} column {c!r} is boolean (dtype {dt}); wedgepath does not "
                            "guess whether True/False mean 1/0: convert it (e.g. "
                            ".astype(float)) or drop it")
        if kind not in "iuf":
            raise TypeError(f"{what} column {c!r} is not numeric (dtype {dt}); "
                            "drop it or convert it to numbers")
        names.append(str(c))
    values = df.to_numpy(dtype=np.float64, na_value=np.nan, copy=True)
    return values, names


def is_async_times(times) -> bool:
    """True when ``times`` is one time array per channel (asynchronous channels)."""
    if times is None or isinstance(times, np.ndarray) or _is_series(times):
        return False
    if isinstance(times, (list, tuple)) and times:
        return all(np.ndim(t) == 1 for t in times)
    return False


def signal_input(X, times=None, names=None, *, what="X", min_channels=2, min_samples=2,
                 warn_shape=True):
    """Check and unpack the data argument of a signals function.

    Accepts a (T, n) array-like, a pandas DataFrame (column labels become
    names), a :class:`~wedgepath.Path` (its times and names are used), a
    mapping ``name -> 1-D array`` of equal lengths, or -- with ``times`` a
    list of per-channel time arrays, or a mapping/sequence of pandas Series --
    asynchronous channels, which are aligned by :func:`align`.
    """
    from .alignment import align  # local import: alignment builds on this module

    if isinstance(X, Mapping) or is_async_times(times) or (
            isinstance(X, (list, tuple)) and X and all(_is_series(s) for s in X)):
        async_needed = is_async_times(times) or (
            isinstance(X, Mapping) and any(_is_series(v) for v in X.values())) or (
            isinstance(X, (list, tuple)) and all(_is_series(s) for s in X))
        if async_needed:
            X = align(X, times=times if is_async_times(times) else None, names=names)
            times = None
            names = None
        elif isinstance(X, Mapping):
            keys = list(X.keys())
            cols = [as_float_array(X[k], f"{what}[{k!r}]", ndim=1, allow_nan=True) for k in keys]
            lengths = {c.shape[0] for c in cols}
            if len(lengths) > 1:
                raise ValueError(f"{what} channels have different lengths {sorted(lengths)}; "
                                 "pass one time array per channel (times=[t0, t1, ...]) to align them")
            if names is not None:
                raise ValueError("names given twice: the mapping's keys already name the channels")
            names = [str(k) for k in keys]
            X = np.column_stack(cols) if cols else np.empty((0, 0))

    units = None
    if isinstance(X, Path):
        if times is not None and X.times is not None:
            raise ValueError("times given twice: the Path already has times")
        if names is not None and X.names is not None and tuple(names) != X.names:
            raise ValueError(f"names {list(names)} do not match the Path's names {list(X.names)}")
        values = X.points
        times = X.time_axis if times is None else times
        names = X.names if names is None else names
    elif _is_dataframe(X):
        values, df_names = _frame_values(X, what)
        if names is not None and tuple(names) != tuple(df_names):
            raise ValueError(f"names {list(names)} do not match the DataFrame columns {df_names}")
        names = df_names
        units = _frame_units(X, df_names)
        if times is None:
            times = index_time_axis(X, what)
    else:
        if isinstance(X, np.ma.MaskedArray):
            # masked entries are gaps: a NaN copy (np.asarray would drop the mask)
            values = as_float_array(X, what, allow_nan=True)
        elif isinstance(X, np.ndarray) and X.dtype.kind in "iuf":
            values = X
        else:
            try:
                arr = np.asarray(X)
            except Exception as exc:
                raise TypeError(f"{what} could not be read as an array of numbers: {exc}") from None
            if arr.dtype.kind in "iuf":
                values = arr
            else:
                values = as_float_array(arr, what, allow_nan=True)

    if values.dtype.kind not in "iuf":
        raise TypeError(f"{what} has unsupported dtype {values.dtype}")
    if values.ndim != 2:
        if values.ndim == 1:
            raise ValueError(f"{what} must be 2-dimensional (samples, channels), got shape "
                             f"{values.shape}; stack the channels as columns")
        raise ValueError(f"{what} must be 2-dimensional (samples, channels), got shape {values.shape}")
    T, n = values.shape
    if n < min_channels:
        raise ValueError(f"{what} has {n} channel{'s' if n != 1 else ''}; lead-lag needs at least "
                         f"{min_channels}")
    if T < min_samples:
        raise ValueError(f"{what} has {T} sample{'s' if T != 1 else ''}; at least {min_samples} are needed")
    axis = None
    if times is not None:
        axis = check_time_axis(times, T)
        times = np.array(axis.values)
    if names is not None:
        names = check_names(names, n)
    if T < n and warn_shape:
        warnings.warn(f"{what} has {T} samples (rows) and {n} channels (columns): it looks "
                      "transposed; samples go in rows, channels in columns (pass X.T if the "
                      "rows are the channels)", ShapeWarning, stacklevel=3)
    if times is None and warn_shape:
        _warn_clock_columns(values, names, what)
    return SignalData(values, times, names, units, axis)


class ShapeWarning(UserWarning):
    """The input looks transposed, or a column looks like a clock used as a channel."""


def _looks_like_clock(col) -> bool:
    """Strictly increasing with near-constant steps (within 1 % of the median step)."""
    if col.size < 4 or not np.isfinite(col).all():
        return False          # gaps and infinities are judged (and refused) elsewhere
    with np.errstate(over="ignore", invalid="ignore"):
        d = np.diff(col)      # steps between values near the float64 limit may overflow
    if not np.isfinite(d).all():
        return False
    if d.size < 3 or not np.all(d > 0):
        return False
    med = float(np.median(d))
    return bool(np.all(np.abs(d - med) <= 0.01 * med))


def _warn_clock_columns(values, names, what):
    T, n = values.shape
    if T < 8:
        return
    head = np.asarray(values[:min(T, 256)], dtype=np.float64)
    for c in range(n):
        # cheap test on the first rows; the whole column only for a candidate
        if _looks_like_clock(head[:, c]) and _looks_like_clock(
                np.asarray(values[:, c], dtype=np.float64)):
            label = names[c] if names is not None else str(c)
            warnings.warn(f"{what} column {label!r} increases in near-constant steps, like a "
                          "clock, and is used as a channel because no times were given; pass "
                          "it as times= (or --time on the command line) if it is the time",
                          ShapeWarning, stacklevel=4)


def index_time_axis(df, what="X"):
    """A DataFrame's index as its time axis, or None when the index is not a time.

    DatetimeIndex (zoned or naive), TimedeltaIndex and numeric indexes other
    than the row numbers ``0..T-1`` (any RangeIndex counts as row numbers)
    are times; anything else is not.
    """
    idx = getattr(df, "index", None)
    if idx is None:
        return None
    kind = getattr(getattr(idx, "dtype", None), "kind", None)
    name = type(idx).__name__
    if name in ("DatetimeIndex", "TimedeltaIndex") or kind in ("M", "m"):
        return check_time_axis(idx, len(idx), f"{what}.index")
    if name == "RangeIndex" or kind not in ("i", "u", "f"):
        return None
    v = np.asarray(idx.to_numpy(), dtype=np.float64)
    if np.array_equal(v, np.arange(v.shape[0], dtype=np.float64)):
        return None
    return check_time_axis(v, v.shape[0], f"{what}.index")


def check_closure(closure):
    return check_choice(closure, "closure", CLOSURES)


# --------------------------------------------------------------------------- scan
class ScanResult:
    """Output of :func:`scan` (see the module docstring)."""

    __slots__ = ("M", "starts", "stops")

    def __init__(self, M, starts, stops):
        self.M = M
        self.starts = starts
        self.stops = stops

    @property
    def area(self):
        return skew_half(self.M)


def _raise_inf(blk, a, what):
    where = np.argwhere(np.isinf(blk))[0]
    raise ValueError(f"{what} contains an infinite value at row {a + int(where[0])}, "
                     f"channel {int(where[1])}")


def _paired_product(blk, r, work=None):
    """A matrix whose antisymmetric part is ``sum_k z_k ^ z_{k+1}``, ``z = blk - r``.

    Segments are taken in pairs: ``z_{2j} ^ z_{2j+1} + z_{2j+1} ^ z_{2j+2}
    = z_{2j+1} ^ (z_{2j+2} - z_{2j})``, so one GEMM over half the rows does
    the work (the cost of one ``X.T @ X``), and its second factor is a
    two-step increment -- small for slowly moving data, which keeps the
    rounding small as well.

    ``work``, an array of shape ``(2, >= h, n)``, holds the two factors, so a
    scan reuses one buffer instead of allocating (and page-faulting) two
    megabyte-sized temporaries per chunk.
    """
    m = blk.shape[0] - 1               # segments
    h = m // 2
    if work is None or work.shape[1] < h:
        work = np.empty((2, h, blk.shape[1]))
    U, V = work[0, :h], work[1, :h]
    np.subtract(blk[1:2 * h:2], r, out=U)
    np.subtract(blk[2:2 * h + 1:2], blk[0:2 * h - 1:2], out=V)
    G = U.T @ V
    if m % 2:
        G += np.outer(blk[m - 1] - r, blk[m] - r)
    return G


def scan(data: SignalData, what="X") -> ScanResult:
    """One pass over the data: lagged cross-products per piece (see module doc).

    Floating-point warnings are silenced: an infinite input is reported as a
    ValueError, and an overflow leaves non-finite entries in ``M`` for the
    caller to handle (see :func:`channel_exponents`).
    """
    with np.errstate(invalid="ignore", over="ignore"):
        return _scan(data, what)


class _CompensatedSum:
    """Running sum of arrays with Neumaier's compensation (Kahan-Babuska summation).

    The chunks' products are added one after another; without compensation
    the rounding error of that sum grows with the number of chunks (about
    T / 16384 of them).  Carrying the lost low-order parts keeps it at a few
    units in the last place of the sum of magnitudes, however long the
    series (A. Neumaier, "Rundungsfehleranalyse einiger Verfahren zur
    Summation endlicher Summen", ZAMM 54 (1974) 39-51, from memory).
    """

    __slots__ = ("s", "c")

    def __init__(self, shape):
        self.s = np.zeros(shape)
        self.c = np.zeros(shape)

    def add(self, x):
        t = self.s + x
        big = np.abs(self.s) >= np.abs(x)
        self.c += np.where(big, (self.s - t) + x, (x - t) + self.s)
        self.s = t

    def value(self):
        return self.s + self.c


def _scan(data: SignalData, what="X") -> ScanResult:
    values = data.values
    T, n = values.shape
    c = chunk_rows(n)
    M = _CompensatedSum((n, n))
    # the GEMM factors of every chunk (see _paired_product): a chunk has at most c
    # segments, a short series fewer, so a small input does not allocate 8 MB
    work = np.empty((2, min(c, max(T - 1, 0)) // 2, n))
    starts, stops = [], []
    g = None            # first sample of the open piece (the one holding the last row read)
    a = 0
    while True:
        b = min(a + c, T - 1)
        blk = np.asarray(values[a:b + 1], dtype=np.float64)
        r = blk[0]
        G = _paired_product(blk, r, work)
        if np.isfinite(G).all():
            # gap-free chunk (NaN or inf anywhere would have reached G)
            if a == 0:
                starts.append(0)
                g = r.copy()
            else:
                e = r - g
                if e.any():
                    M.add(np.outer(e, blk[-1] - r))
            M.add(G)
        else:
            if np.isinf(blk).any():
                _raise_inf(blk, a, what)
            valid = ~np.isnan(blk).any(axis=1)
            m = valid.shape[0]
            edges = np.diff(np.concatenate(([0], valid.view(np.int8), [0])))
            rs = np.flatnonzero(edges == 1)
            re = np.flatnonzero(edges == -1)
            if rs.size:
                is_start = np.zeros(m, dtype=bool)
                is_start[rs] = True
                ref = np.maximum.accumulate(np.where(is_start, np.arange(m), 0))
                Z = blk - blk[ref]
                Z[~valid] = 0.0
                M.add(_paired_product(Z, 0.0, work))
                first_new = 0
                if rs[0] == 0 and a > 0:
                    # the first run continues the piece that was open
                    e = blk[0] - g
                    if e.any():
                        M.add(np.outer(e, blk[re[0] - 1] - blk[0]))
                    first_new = 1
                    if re[0] < m:
                        stops.append(a + int(re[0]))
                new_starts = rs[first_new:]
                starts.extend((a + new_starts).tolist())
                closing = re[first_new:]
                closing = closing[closing < m]
                stops.extend((a + closing).tolist())
                if valid[-1]:
                    if rs[-1] > 0 or a == 0:
                        g = blk[rs[-1]].copy()
                else:
                    g = None
            else:
                g = None
        if b >= T - 1:
            break
        a = b
    if len(stops) < len(starts):
        stops.append(T)
    return ScanResult(M.value(), np.asarray(starts, dtype=np.int64),
                      np.asarray(stops, dtype=np.int64))


# --------------------------------------------------------------------------- magnitudes
#: a channel whose largest magnitude lies outside [2**-SAFE_EXP, 2**SAFE_EXP] is
#: rescaled by a power of two before products are formed: products and sums of
#: up to 2**40 of them then neither overflow nor fall into the subnormal range.
SAFE_EXP = 400


def channel_exponents(data: SignalData):
    """Per channel, ``e`` with ``max|x| * 2**-e`` in [0.5, 1) (0 for an all-zero channel).

    Returns ``(e, needed)``: ``needed`` is True when some channel's magnitude
    is outside the safe range, so that products of raw samples could
    overflow or underflow.  NaN gap rows are ignored.
    """
    values = data.values
    T, n = values.shape
    m = np.zeros(n)
    step = max(1, CHUNK_ELEMENTS // max(n, 1))
    for a in range(0, T, step):
        blk = np.abs(np.asarray(values[a:a + step], dtype=np.float64))
        m = np.fmax(m, np.fmax.reduce(blk, axis=0))
    m = np.nan_to_num(m, nan=0.0)
    e = pow2_exponents(m[None, :], axis=0)
    nz = m > 0
    needed = bool(np.any(nz & ((m < 2.0 ** -SAFE_EXP) | (m > 2.0 ** SAFE_EXP))))
    return e, needed


def scaled_data(data: SignalData, e) -> SignalData:
    """``data`` with channel k multiplied by ``2**-e[k]`` (exact; a float64 copy)."""
    values = pow2_scale(np.asarray(data.values, dtype=np.float64), -np.asarray(e)[None, :])
    return SignalData(values, data.times, data.names, data.units, data.time_axis)


def unscale_pairs(A, e, what="area_matrix"):
    """``A[..., i, j] * 2**(e[i] + e[j])``; ValueError when that overflows float64."""
    e = np.asarray(e, dtype=np.int64)
    out = pow2_scale(A, e[:, None] + e[None, :])
    if not np.isfinite(out[np.isfinite(A)]).all():
        raise ValueError(f"{what}: the areas overflow float64 for data this large; rescale the "
                         "data (e.g. divide each channel by its largest value)")
    return out


def overflow_error(what="area_matrix"):
    return ValueError(f"{what}: the areas overflow float64 for data this large; rescale the "
                      "data (e.g. divide each channel by its largest value)")


# --------------------------------------------------------------------------- closures
def piece_rows(data: SignalData, idx) -> np.ndarray:
    """Rows at integer positions ``idx`` as float64."""
    return np.asarray(data.values[np.asarray(idx, dtype=np.int64)], dtype=np.float64)


def time_areas(data: SignalData, tau: np.ndarray, starts, stops) -> np.ndarray:
    """Per piece, the chord-closed areas between ``tau`` and every channel, (P, n).

    ``a[p, i] = (1/2) sum_k [(tau_k - tau_s)(x_{k+1} - x_s) - (tau_{k+1} - tau_s)(x_k - x_s)]``
    over the segments of piece ``p`` (``s`` its first row).
    """
    values = data.values
    T, n = values.shape
    P = starts.shape[0]
    out = np.zeros((P, n))
    c = chunk_rows(n)
    a = 0
    while a < T - 1:
        b = min(a + c, T - 1)
        rows = np.arange(a, b + 1)
        pid = np.searchsorted(starts, rows, side="right") - 1
        inside = (pid >= 0) & (rows < stops[np.maximum(pid, 0)])
        seg_ok = inside[:-1] & inside[1:] & (pid[:-1] == pid[1:])
        if seg_ok.any():
            blk = np.asarray(values[a:b + 1], dtype=np.float64)
            k = np.flatnonzero(seg_ok)
            p = pid[k]
            s = starts[p]
            xs = piece_rows(data, s)
            z0 = blk[k] - xs
            z1 = blk[k + 1] - xs
            u0 = (tau[a + k] - tau[s])[:, None]
            u1 = (tau[a + k + 1] - tau[s])[:, None]
            term = 0.5 * (u0 * z1 - u1 * z0)
            cut = np.flatnonzero(np.diff(p)) + 1
            sums = np.add.reduceat(term, np.concatenate(([0], cut)), axis=0)
            out[p[np.concatenate(([0], cut))]] += sums
        a = b
    return out


def piece_extent(data: SignalData, starts, stops) -> np.ndarray:
    """Euclidean length of each piece's bounding-box diagonal, (P,)."""
    values = data.values
    T = values.shape[0]
    idx = np.empty(2 * starts.shape[0], dtype=np.int64)
    idx[0::2] = starts
    idx[1::2] = stops
    keep = idx < T
    idx_k = idx[keep]
    lo = np.minimum.reduceat(values, idx_k, axis=0)
    hi = np.maximum.reduceat(values, idx_k, axis=0)
    # reduceat rows 0, 2, 4, ... are the pieces (odd ones are the gaps between)
    lo = np.asarray(lo[0::2], dtype=np.float64)
    hi = np.asarray(hi[0::2], dtype=np.float64)
    return robust_norm(hi - lo)


def robust_norm(D):
    """Row norms of D without underflow or overflow (rows scaled by their largest entry)."""
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        m = np.max(np.abs(D), axis=1)
        safe = np.where(m > 0, m, 1.0)
        return m * np.linalg.norm(D / safe[:, None], axis=1)


def closed_area(data: SignalData, closure: str, tol=None, what="X"):
    """Area matrix of ``data`` under ``closure``; also returns the scan."""
    sc = scan(data, what)
    if sc.starts.size == 0:
        raise ValueError(f"{what} has no complete sample: every row contains NaN")
    A = sc.area
    starts, stops = sc.starts, sc.stops
    counts = stops - starts
    if closure == "chord":
        return A, sc
    F = piece_rows(data, starts)
    L = piece_rows(data, stops - 1)
    if closure == "none":
        A = A - 0.5 * (L.T @ F - F.T @ L)
    elif closure == "detrend":
        tau = data.times if data.times is not None else np.arange(data.shape[0], dtype=np.float64)
        long = counts >= 2
        if long.any():
            ta = time_areas(data, tau, starts, stops)[long]
            span = (tau[stops[long] - 1] - tau[starts[long]])[:, None]
            D = (L - F)[long]
            At = ta / span
            A = A + (At.T @ D - D.T @ At)
    elif closure == "require":
        gap = np.linalg.norm(L - F, axis=1)
        if tol is None:
            tol_eff = 1e-9 * piece_extent(data, starts, stops)
        else:
            tol_eff = np.full(gap.shape, float(tol))
        bad = np.flatnonzero(gap > tol_eff)
        if bad.size:
            p = int(bad[0])
            where = f" (piece starting at row {int(starts[p])})" if starts.size > 1 else ""
            raise ValueError(
                f"path is not closed{where}: its end is {gap[p]:.6g} from its start (tolerance "
                f"{tol_eff[p]:.3g}); use closure='chord' or 'detrend', or pass a larger tol")
        long = counts >= 3
        if long.any():
            Pn = piece_rows(data, stops[long] - 2) - F[long]
            Ln = L[long] - F[long]
            A = A - 0.5 * (Pn.T @ Ln - Ln.T @ Pn)
    return A, sc


def closed_piece_rows(data: SignalData, closure: str, s: int, e: int, cols=slice(None)):
    """The samples of piece [s, e) that form its closed cycle under ``closure``.

    chord/none: all samples (the chord is the wrap-around); require: all but
    the last (which equals the first); detrend: the drift-free samples but the
    last.  Returned as a fresh float64 array (rows, channels in ``cols``).
    """
    x = np.array(data.values[s:e, cols], dtype=np.float64)
    if closure in ("chord", "none") or e - s < 2:
        return x
    if closure == "require":
        return x[:-1]
    tau = data.times[s:e] if data.times is not None else np.arange(e - s, dtype=np.float64)
    frac = (tau - tau[0]) / (tau[-1] - tau[0])
    x -= frac[:, None] * (x[-1] - x[0])
    return x[:-1]


def warn_constant(bad, names, why):
    labels = [names[k] if names is not None else str(k) for k in bad]
    warnings.warn(f"channel{'s' if len(labels) > 1 else ''} {', '.join(repr(s) for s in labels)} "
                  f"{why}; the normalised values in {'their' if len(labels) > 1 else 'its'} "
                  "row and column are NaN", ConstantChannelWarning, stacklevel=4)


def gcd(a: int, b: int) -> int:
    return math.gcd(a, b)
