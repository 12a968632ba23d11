"""Input checks shared by the whole package.

Every public entry point funnels its array arguments through these helpers so
that bad input fails early with a ``ValueError`` or ``TypeError`` that names the
argument and the problem, instead of surfacing later as a numpy traceback or a
silent NaN.  None of them modifies its argument: they either return the
caller's object untouched or a fresh float64 copy.
"""

from __future__ import annotations

import numbers
import operator
from collections.abc import Sequence

import numpy as np

__all__ = [
    "as_float_array",
    "check_choice",
    "as_int",
    "check_names",
    "check_times",
    "check_values",
    "as_real",
    "check_bool",
    "as_rng",
    "as_coefficients",
    "checked_sums",
    "scaled_coefficients",
]


def _describe_dtype(arr: np.ndarray) -> str:
    return f"dtype {arr.dtype}"


def as_float_array(value, name: str, *, ndim=None, allow_nan: bool = False,
                   copy: bool = True) -> np.ndarray:
    """Return ``value`` as a float64 array after checking it.

    Parameters
    ----------
    value : array_like
        Real numbers.  Integer, unsigned, float (any width or byte order)
        and object arrays holding real numbers are accepted; complex, boolean,
        string, datetime and other objects are refused with ``TypeError``.
    name : str
        Argument name used in error messages.
    ndim : int or tuple of int, optional
        Required number of dimensions.
    allow_nan : bool
        Whether NaN entries are allowed (they mark gaps in paths).  Infinite
        values are never allowed.
    copy : bool
        Always return a new array (the default) so that the caller's data can
        never be changed through the result.

    Notes
    -----
    A masked array (:class:`numpy.ma.MaskedArray`) is read with its mask:
    masked entries become NaN (gaps) in a fresh array when ``allow_nan``,
    and are refused with a ``ValueError`` naming the first one otherwise.
    The values hidden under the mask are never looked at.
    """
    if isinstance(value, np.ma.MaskedArray):
        value = _unmasked(value, name, allow_nan)
    elif hasattr(value, "to_numpy") and not isinstance(value, np.ndarray):
        # pandas objects and the like: look at their values, not their index.
        value = value.to_numpy()
    try:
        arr = np.asarray(value)
    except Exception as exc:  # ragged nested sequences, odd objects
        raise TypeError(f"{name} could not be read as an array of numbers: {exc}") from None
    kind = arr.dtype.kind
    if kind == "c":
        raise TypeError(f"{name} has complex values ({_describe_dtype(arr)}); "
                        "pass real coordinates (e.g. np.column_stack([z.real, z.imag]))")
    if kind == "b":
        raise TypeError(f"{name} is a boolean array; coordinates must be real numbers")
    if kind in "USV":
        raise TypeError(f"{name} holds text or raw bytes ({_describe_dtype(arr)}); "
                        "coordinates must be real numbers")
    if kind in "mM":
        raise TypeError(f"{name} holds datetimes/timedeltas; convert them to numbers "
                        "(e.g. seconds) first")
    if kind == "O":
        out = np.empty(arr.shape, dtype=np.float64)
        flat_in = arr.ravel()
        flat_out = out.ravel()
        for k, item in enumerate(flat_in):
            if isinstance(item, (bool, np.bool_)) or not isinstance(item, numbers.Real):
                raise TypeError(f"{name} contains a non-real entry {item!r} at flat index {k}")
            try:
                flat_out[k] = float(item)
            except OverflowError:  # a Python int (or Fraction) beyond float64
                raise ValueError(f"{name} has an entry too large for float64 at flat index {k}; "
                                 "rescale the data") from None
        arr = out
    elif kind not in "iuf":
        raise TypeError(f"{name} has unsupported {_describe_dtype(arr)}")
    else:
        if kind == "f" and arr.dtype.itemsize > 8 and arr.size:
            # long double: values beyond float64 would silently become inf
            big = np.isfinite(arr) & (np.abs(arr) > np.finfo(np.float64).max)
            if big.any():
                where = tuple(int(w) for w in np.argwhere(big)[0])
                raise ValueError(f"{name} has an entry too large for float64 at index {where}; "
                                 "rescale the data")
        if copy:
            arr = np.array(arr, dtype=np.float64, order="C")
        else:
            # Read-only use inside the library: avoid a copy when the input is
            # already native float64.  Callers must not write to the result.
            arr = np.asarray(arr, dtype=np.float64)
    if ndim is not None:
        allowed = (ndim,) if isinstance(ndim, int) else tuple(ndim)
        if arr.ndim not in allowed:
            want = " or ".join(str(a) for a in allowed)
            raise ValueError(f"{name} must be {want}-dimensional, got shape {arr.shape}")
    if arr.size:
        finite = np.isfinite(arr)
        if not finite.all():
            if np.isinf(arr).any():
                where = np.argwhere(np.isinf(arr))[0]
                raise ValueError(f"{name} contains an infinite value at index {tuple(int(w) for w in where)}")
            if not allow_nan:
                where = np.argwhere(np.isnan(arr))[0]
                raise ValueError(f"{name} contains NaN at index {tuple(int(w) for w in where)}")
    return arr


def _unmasked(value, name: str, allow_nan: bool):
    """A masked array's data with masked entries as NaN (a new array), or a refusal."""
    mask = np.ma.getmaskarray(value)
    data = np.ma.getdata(value)
    if not mask.any():
        return data
    where = tuple(int(w) for w in np.argwhere(mask)[0])
    count = int(mask.sum())
    if not allow_nan:
        raise ValueError(f"{name} is a masked array with {count} masked "
                         f"entr{'y' if count == 1 else 'ies'} (the first at index {where}); "
                         f"{name} cannot have gaps: fill them (e.g. {name}.filled(...)) or "
                         "drop them")
    kind = data.dtype.kind
    if kind in "iuf":
        if kind == "f" and data.dtype.itemsize > 8:
            # long double: an unmasked value beyond float64 must not become inf silently
            big = ~mask & np.isfinite(data) & (np.abs(data) > np.finfo(np.float64).max)
            if big.any():
                at = tuple(int(w) for w in np.argwhere(big)[0])
                raise ValueError(f"{name} has an entry too large for float64 at index {at}; "
                                 "rescale the data")
        with np.errstate(over="ignore", invalid="ignore"):
            out = np.array(data, dtype=np.float64, order="C")   # a copy: never the caller's
    elif kind == "O":
        out = np.array(data, dtype=object)
    else:
        return data                     # complex, bool, text...: refused by the caller's checks
    out[mask] = np.nan
    return out


def check_choice(value, name: str, choices) -> str:
    """Check that ``value`` is one of the strings in ``choices``."""
    if not isinstance(value, str) or value not in choices:
        opts = ", ".join(repr(c) for c in choices)
        raise ValueError(f"unknown {name} {value!r}; choose one of {opts}")
    return value


def as_int(value, name: str) -> int:
    """Return ``value`` as a Python int; refuse floats, bools and others."""
    if isinstance(value, (bool, np.bool_)):
        raise TypeError(f"{name} must be an integer, got a boolean")
    try:
        return operator.index(value)
    except TypeError:
        raise TypeError(f"{name} must be an integer, got {type(value).__name__} {value!r}") from None


def check_names(names, n: int, what: str = "names") -> tuple:
    """``names`` as a tuple of ``n`` distinct strings (one per channel)."""
    if isinstance(names, str) or not isinstance(names, (Sequence, np.ndarray)):
        raise TypeError(f"{what} must be a sequence of strings, one per channel")
    names = tuple(names)
    if len(names) != n:
        raise ValueError(f"{what} has {len(names)} entries but the data have {n} channels")
    for nm in names:
        if not isinstance(nm, str):
            raise TypeError(f"channel names must be strings, got {nm!r}")
    if len(set(names)) != n:
        dup = sorted({nm for nm in names if names.count(nm) > 1})
        raise ValueError(f"channel names must be distinct; repeated: {dup}")
    return names


def _is_datetime_like(times) -> bool:
    """True when ``times`` holds datetimes, timedeltas or text (not plain numbers)."""
    from ._time import TimeAxis

    if isinstance(times, TimeAxis):
        return True
    kind = getattr(getattr(times, "dtype", None), "kind", None)
    if kind is not None:
        if kind in "mMUS":
            return True
        if kind != "O":
            return False
    if isinstance(times, (str, bytes)):
        return False
    mod = type(times).__module__.split(".")[0]
    if mod == "pandas" and type(times).__name__ in ("DatetimeIndex", "TimedeltaIndex",
                                                    "Timestamp"):
        return True
    try:
        first = next(iter(times))
    except (TypeError, StopIteration):
        return False
    import datetime as _dt

    return isinstance(first, (str, np.datetime64, np.timedelta64, _dt.date, _dt.timedelta)) \
        or type(first).__name__ in ("Timestamp", "Timedelta")


def check_time_axis(times, T: int, what: str = "times"):
    """``times`` as a :class:`~wedgepath._time.TimeAxis` of ``T`` strictly increasing values.

    Numbers (kept as given), ``datetime64``/pandas/Python datetimes and ISO
    text (elapsed seconds from the first sample), timedeltas (seconds).  A
    missing, repeated or decreasing time is an error naming its position.
    """
    from ._time import TimeAxis, as_time_axis

    if isinstance(times, TimeAxis):
        ax = times
    elif _is_datetime_like(times):
        if isinstance(times, list) and times and isinstance(times[0], _timedelta_type()):
            times = np.array(times, dtype="timedelta64[us]")
        elif type(times).__name__ == "Series" and getattr(times.dtype, "kind", "") == "m":
            times = times.to_numpy()
        try:
            ax = as_time_axis(times, name=what)
        except ValueError as exc:
            msg = str(exc)
            raise ValueError(msg if msg.startswith(what) else f"{what}: {msg}") from None
    else:
        if hasattr(times, "to_numpy") and not isinstance(times, np.ndarray):
            times = times.to_numpy(dtype=np.float64, na_value=np.nan) \
                if getattr(times.dtype, "kind", "f") in "iufb" or \
                str(times.dtype) in ("Int64", "Float64") else times.to_numpy()
        # a masked entry is refused by as_float_array itself (naming its index)
        t = as_float_array(times, what, ndim=1,
                           allow_nan=not isinstance(times, np.ma.MaskedArray))
        if np.isnan(t).any():
            k = int(np.flatnonzero(np.isnan(t))[0])
            raise ValueError(f"{what}[{k}] is missing (NaN); every sample needs a time")
        ax = TimeAxis(t, "number", None)
    t = ax.values
    if t.shape[0] != T:
        raise ValueError(f"{what} has {t.shape[0]} entries but the data have {T} samples")
    if T > 1:
        d = np.diff(t)
        if not np.all(d > 0):
            k = int(np.flatnonzero(~(d > 0))[0])
            shown = ax.format(t[k:k + 2]).tolist()
            how = "repeats" if d[k] == 0 else "comes before"
            raise ValueError(f"{what} must be strictly increasing; {what}[{k + 1}]="
                             f"{shown[1]!r} {how} {what}[{k}]={shown[0]!r} (sort the rows by "
                             "time, or drop the duplicated ones, first)")
    return ax


def _timedelta_type():
    import datetime as _dt

    return _dt.timedelta


def check_times(times, T: int, what: str = "times") -> np.ndarray:
    """``times`` as a fresh float64 array of ``T`` finite, strictly increasing values.

    Datetimes become elapsed seconds from the first sample (see
    :func:`check_time_axis`, which keeps what they were).
    """
    return np.array(check_time_axis(times, T, what).values, dtype=np.float64)


def check_values(vals, m: int, label: str, where) -> np.ndarray:
    """Check what a user's callable returned for ``m`` points: real, shape (m,), finite.

    A scalar (or shape (1,)) is broadcast.  ``where(k)`` describes point ``k``
    for the error message.
    """
    vals = np.asarray(vals)
    if vals.dtype.kind == "c":
        raise ValueError(f"{label} returned complex values")
    if vals.dtype.kind not in "iufb":
        raise TypeError(f"{label} returned {vals.dtype} values; it must return real numbers")
    if vals.shape == () or vals.shape == (1,):
        vals = np.full(m, float(vals.reshape(())))
    elif vals.shape != (m,):
        raise ValueError(f"{label} returned shape {vals.shape} for {m} points; "
                         "it must return one value per point, shape (m,)")
    vals = vals.astype(np.float64, copy=False)
    bad = ~np.isfinite(vals)
    if bad.any():
        k = int(np.flatnonzero(bad)[0])
        raise ValueError(f"{label} is not finite at {where(k)} ({int(bad.sum())} bad points in all)")
    return vals


def as_real(value, name: str) -> float:
    """``value`` as a finite Python float; TypeError for non-numbers, ValueError for inf/NaN."""
    if isinstance(value, (bool, np.bool_)) or not isinstance(value, (numbers.Real, np.ndarray)):
        raise TypeError(f"{name} must be a real number, got {type(value).__name__} {value!r}")
    if isinstance(value, np.ndarray) and (value.ndim != 0 or value.dtype.kind not in "iuf"):
        raise TypeError(f"{name} must be a real number, got an array of shape {value.shape}")
    try:
        v = float(value)
    except OverflowError:
        raise ValueError(f"{name} is too large for float64") from None
    if not np.isfinite(v):
        raise ValueError(f"{name} must be finite, got {v}")
    return v


def check_bool(value, name: str) -> bool:
    """Refuse anything but True or False (a string such as "no" is not a flag)."""
    if not isinstance(value, (bool, np.bool_)):
        raise TypeError(f"{name} must be True or False, got {value!r}")
    return bool(value)


def as_rng(seed, name: str = "seed") -> np.random.Generator:
    """A numpy Generator from ``seed``: None, an int >= 0, a SeedSequence or a Generator."""
    if isinstance(seed, np.random.Generator):
        return seed
    if seed is None or isinstance(seed, np.random.SeedSequence):
        return np.random.default_rng(seed)
    if isinstance(seed, (bool, np.bool_)) or not isinstance(seed, (numbers.Integral, np.integer)):
        raise TypeError(f"{name} must be None, an integer >= 0 or a numpy Generator, "
                        f"got {type(seed).__name__} {seed!r}")
    if int(seed) < 0:
        raise ValueError(f"{name} must be >= 0, got {int(seed)}")
    return np.random.default_rng(int(seed))


#: integer chain coefficients are kept within +-COEF_LIMIT, so that sums and
#: products of them are checked before they could wrap around in int64
COEF_LIMIT = 2 ** 62


def _coef_overflow(what):
    return ValueError(f"{what} exceed the supported range +-2**62 of chain coefficients "
                      "(int64 arithmetic would wrap around)")


def as_coefficients(values, what: str = "coefficients") -> np.ndarray:
    """Python ints (or an integer array) as int64, refusing magnitudes above 2**62."""
    vals = [int(v) for v in values] if not isinstance(values, np.ndarray) else values
    if isinstance(vals, list):
        if any(v > COEF_LIMIT or v < -COEF_LIMIT for v in vals):
            raise _coef_overflow(what)
        return np.array(vals, dtype=np.int64)
    arr = np.asarray(vals)
    if arr.size and (int(arr.max()) > COEF_LIMIT or int(arr.min()) < -COEF_LIMIT):
        raise _coef_overflow(what)
    return arr.astype(np.int64)


def checked_sums(terms, starts, what: str = "coefficients") -> np.ndarray:
    """``np.add.reduceat(terms, starts)`` for int64 ``terms``, refusing sums beyond 2**62.

    The sums are also formed in float64; any true sum of magnitude 2**63 or
    more shows there as more than 2**62, so a wrapped int64 result never
    escapes.
    """
    approx = np.add.reduceat(terms.astype(np.float64), starts)
    if approx.size and float(np.max(np.abs(approx))) > COEF_LIMIT:
        raise _coef_overflow(what)
    return np.add.reduceat(terms, starts)


def scaled_coefficients(coef: np.ndarray, k: int, what: str = "coefficients") -> np.ndarray:
    """``k * coef`` for int64 ``coef``, refusing results beyond 2**62."""
    if not coef.any():
        return np.zeros_like(coef)
    if abs(k) * max(abs(int(coef.max())), abs(int(coef.min()))) > COEF_LIMIT:
        raise _coef_overflow(what)
    return np.int64(k) * coef
