"""Time axes: numbers or datetimes, held as float64 elapsed values.

Every computation in wedgepath works on float64 times.  A :class:`TimeAxis`
remembers what the times were before that conversion, so that results can
report times in the input's own form:

* **numbers** (``kind="number"``): the values as given, in the caller's unit
  (``unit`` is ``None`` unless it is known, e.g. ``"s"`` for durations);
* **datetimes** (``kind="datetime"``): numpy ``datetime64``, pandas
  ``Timestamp``/``DatetimeIndex`` (timezone-aware included), Python
  ``datetime`` objects, Parquet timestamp and date columns, or ISO-8601 text.
  ``values`` are the **elapsed seconds from the first sample** (``unit="s"``);
  ``origin`` is the first sample as ``numpy.datetime64`` (UTC for zoned input,
  wall-clock time for naive input) and ``tz`` the zone the input was given in
  (an IANA name such as ``"Europe/Berlin"``, a fixed offset such as
  ``"+01:00"``, ``"UTC"``, or ``None`` for naive times).
  :meth:`TimeAxis.format` turns elapsed seconds back into ISO-8601 strings in
  that zone.

Everything here is a pure function of its arguments.  pandas is never
imported (pandas objects are recognised by their type's module and read
through their own attributes); pyarrow is imported only to parse ISO-8601
text, with the same parser the table reader uses.

Accepted ISO-8601 text: ``YYYY-MM-DD``, optionally followed by ``T`` or a
space and ``hh``, ``hh:mm``, ``hh:mm:ss`` or ``hh:mm:ss.fff...`` (up to nine
decimals), optionally followed by a zone designator ``Z``, ``+hh``,
``+hh:mm`` or ``+hhmm``.  Either every time of an axis has a zone designator
or none has.  Zoned times are converted to UTC instants; the axis reports them
in the zone of the **first** time stamp.

Examples
--------
>>> from wedgepath._time import TimeAxis
>>> ax = TimeAxis.from_iso(["2021-03-01T10:00:00+01:00", "2021-03-01T10:00:30+01:00"])
>>> ax.kind, ax.unit, ax.tz, ax.values.tolist()
('datetime', 's', '+01:00', [0.0, 30.0])
>>> ax.format([15.0]).tolist()
['2021-03-01T10:00:15+01:00']
>>> TimeAxis.from_numbers([0, 0.5, 1.25]).format().tolist()
[0.0, 0.5, 1.25]
"""

from __future__ import annotations

import datetime as _dt
import numbers
import re

import numpy as np

__all__ = ["TimeAxis", "as_time_axis", "parse_iso", "first_non_increasing",
           "elapsed_seconds", "format_iso", "is_iso_datetime"]

_ISO_RE = re.compile(
    r"^\d{4}-\d{2}-\d{2}"
    r"(?:[T ]\d{2}(?::\d{2}(?::\d{2}(?:\.\d{1,9})?)?)?)?"
    r"(Z|[+-]\d{2}(?::?\d{2})?)?$")
_DATE_RE = re.compile(r"^\d{4}-\d{2}-\d{2}$")
_ZONE_RE = re.compile(r"(?:Z|[+-]\d{2}(?::?\d{2})?)$")
_FIXED_RE = re.compile(r"^[+-]\d{2}:\d{2}$")

#: display units, coarse to fine, with their length in seconds
_UNITS = (("D", 86400.0), ("s", 1.0), ("ms", 1e-3), ("us", 1e-6), ("ns", 1e-9))


def is_iso_datetime(text: str) -> bool:
    """True when ``text`` has the ISO-8601 shape this module reads (see module docstring)."""
    if not isinstance(text, str):
        return False
    m = _ISO_RE.match(text)
    # the time part is required before a zone designator: "2021-03-01Z" is not read
    return bool(m) and not (m.group(1) and len(text) - len(m.group(1)) == 10)


def _zone_of(text: str):
    """The zone designator of an ISO string as ``"UTC"`` or ``"+hh:mm"``; None when naive."""
    if len(text) <= 10:
        return None
    m = _ZONE_RE.search(text[10:])
    if not m:
        return None
    z = m.group(0)
    if z == "Z":
        return "UTC"
    sign, digits = z[0], z[1:].replace(":", "")
    hh, mm = digits[:2], digits[2:] or "00"
    return f"{sign}{hh}:{mm}"


def _fractional_digits(text: str) -> int:
    m = re.search(r"\.(\d+)", text[10:]) if len(text) > 10 else None
    return len(m.group(1)) if m else 0


def parse_iso(strings, *, name="times"):
    """Parse ISO-8601 text into ``datetime64`` instants.

    Parameters
    ----------
    strings : sequence of str
        Time stamps; all naive or all with a zone designator.
    name : str
        Used in error messages.

    Returns
    -------
    instants : numpy.ndarray of datetime64[us] (or [ns] when a stamp has more
        than six decimals)
        UTC instants for zoned input, wall-clock times for naive input.
    tz : str or None
        The zone of the first stamp (``"UTC"`` or ``"+hh:mm"``), None when naive.
    dates : bool
        True when the first stamp is a calendar date without a time of day.

    Raises
    ------
    ValueError
        A stamp that is not ISO-8601 (its position and text are named), or a
        mix of naive and zoned stamps.
    """
    items = list(strings)
    if not items:
        raise ValueError(f"{name} is empty")
    for k, s in enumerate(items):
        if not isinstance(s, str):
            raise TypeError(f"{name}[{k}] is {type(s).__name__}, not ISO-8601 text")
        if not is_iso_datetime(s):
            raise ValueError(f"{name}[{k}] = {_show(s)} is not an ISO-8601 date/time "
                             "(YYYY-MM-DD, optionally with a time and a zone)")
    tz = _zone_of(items[0])
    for k, s in enumerate(items):
        if (_zone_of(s) is None) != (tz is None):
            raise ValueError(f"{name}[{k}] = {_show(s)} " + (
                "has no zone designator but the first time stamp has one" if tz is not None
                else "has a zone designator but the first time stamp has none"))
    unit = "ns" if max(_fractional_digits(s) for s in items) > 6 else "us"
    import pyarrow as pa

    typ = pa.timestamp(unit, tz="UTC" if tz is not None else None)
    try:
        arr = pa.array(items, type=pa.string()).cast(typ)
    except (pa.ArrowInvalid, pa.ArrowNotImplementedError):
        for k, s in enumerate(items):      # name the first stamp arrow refuses
            try:
                pa.array([s], type=pa.string()).cast(typ)
            except (pa.ArrowInvalid, pa.ArrowNotImplementedError):
                raise ValueError(f"{name}[{k}] = {_show(s)} is not a valid date/time "
                                 "(out of range or not on the calendar)") from None
        raise
    instants = arr.to_numpy(zero_copy_only=False)
    if tz is not None:     # arrow gives zoned instants as UTC datetime64 already
        instants = instants.astype(f"datetime64[{unit}]")
    return instants, tz, bool(_DATE_RE.match(items[0]))


def _show(text, limit=40):
    text = str(text)
    return repr(text if len(text) <= limit else text[:limit - 3] + "...")


def first_non_increasing(values):
    """Index ``k >= 1`` of the first value not above its predecessor, or None.

    NaN compares as not increasing (a missing time is an error too).

    >>> first_non_increasing([0.0, 1.0, 1.0, 2.0])
    2
    >>> first_non_increasing([0.0, 1.0, 2.0]) is None
    True
    """
    v = np.asarray(values)
    if v.shape[0] < 2:
        return None
    ok = v[1:] > v[:-1]
    if v.dtype.kind == "M":
        ok &= ~np.isnat(v[1:])
    if ok.all():
        return None
    return int(np.argmin(ok)) + 1


def elapsed_seconds(instants, origin):
    """Seconds from ``origin`` to each of ``instants`` (datetime64), as float64."""
    inst = np.asarray(instants)
    unit = np.datetime_data(inst.dtype)[0]
    oo = np.datetime64(origin).astype(inst.dtype)
    ticks = (inst - oo).astype(np.int64)                 # exact integer ticks
    per_second = {"D": 1 / 86400.0, "h": 1 / 3600.0, "m": 1 / 60.0, "s": 1.0, "ms": 1e3,
                  "us": 1e6, "ns": 1e9}
    if unit not in per_second:
        raise ValueError(f"unsupported datetime unit {unit!r}")
    f = per_second[unit]
    return ticks.astype(np.float64) / f if f >= 1 else ticks.astype(np.float64) * (1 / f)


def _display_unit(elapsed, origin, dates):
    """Coarsest unit in which every instant ``origin + elapsed`` is exact (to float precision)."""
    e = np.asarray(elapsed, dtype=np.float64)
    scale = float(np.max(np.abs(e))) if e.size else 0.0
    tol = 8.0 * np.spacing(scale) if scale > 0 else 0.0
    for unit, sec in _UNITS:
        if unit == "D" and not dates:
            continue
        if unit == "D" and np.datetime_data(origin.dtype)[0] not in ("D",):
            if origin.astype("datetime64[D]").astype(origin.dtype) != origin:
                continue
        elif unit != "D" and origin.astype(f"datetime64[{unit}]").astype(origin.dtype) != origin:
            continue
        k = np.rint(e / sec)
        if np.all(np.abs(e - k * sec) <= tol + 1e-12 * sec):
            return unit, k.astype(np.int64)
    return "ns", np.rint(e * 1e9).astype(np.int64)


def _offset_text(seconds: int) -> str:
    sign = "+" if seconds >= 0 else "-"
    seconds = abs(int(seconds))
    return f"{sign}{seconds // 3600:02d}:{seconds % 3600 // 60:02d}"


def _zone_offsets(instants_s, tz):
    """UTC offsets in seconds of each instant (int64 seconds since the epoch) in zone ``tz``."""
    if tz == "UTC":
        return np.zeros(len(instants_s), dtype=np.int64)
    if _FIXED_RE.match(tz):
        sign = -1 if tz[0] == "-" else 1
        return np.full(len(instants_s), sign * (int(tz[1:3]) * 3600 + int(tz[4:6]) * 60),
                       dtype=np.int64)
    from zoneinfo import ZoneInfo

    zone = ZoneInfo(tz)
    utc = _dt.timezone.utc
    epoch = _dt.datetime(1970, 1, 1, tzinfo=utc)
    out = np.empty(len(instants_s), dtype=np.int64)
    for i, s in enumerate(instants_s):
        moment = epoch + _dt.timedelta(seconds=int(s))
        out[i] = int(moment.astimezone(zone).utcoffset().total_seconds())
    return out


def format_iso(elapsed, origin, tz=None, dates=False):
    """ISO-8601 strings of ``origin + elapsed`` seconds, in zone ``tz``.

    The precision is the coarsest of days (only when ``dates``), seconds,
    milli-, micro- and nanoseconds that shows every value exactly (up to the
    rounding of float64 elapsed seconds).  Zoned axes append the offset
    (``Z`` for UTC, ``+hh:mm`` otherwise).
    """
    e = np.asarray(elapsed, dtype=np.float64)
    if e.ndim != 1:
        e = e.reshape(-1)
    if not np.all(np.isfinite(e)):
        raise ValueError("elapsed times to format must be finite")
    origin = np.datetime64(origin)
    unit, k = _display_unit(e, origin, dates and tz is None)
    base = origin.astype(f"datetime64[{unit}]") if unit != "D" else origin.astype("datetime64[D]")
    inst = base + k.astype(f"timedelta64[{unit}]")
    if tz is None:
        return np.datetime_as_string(inst, unit=unit)
    secs = inst.astype("datetime64[s]").astype(np.int64)
    offs = _zone_offsets(secs, tz)
    local = inst + offs.astype("timedelta64[s]").astype(f"timedelta64[{unit}]")
    text = np.datetime_as_string(local, unit=unit)
    suffix = np.array(["Z" if tz == "UTC" else _offset_text(o) for o in offs], dtype=object)
    return np.array([t + s for t, s in zip(text.tolist(), suffix)], dtype=str) \
        if len(text) else text


def _tz_name(tzinfo):
    """A zone name string for a tzinfo object (IANA key, "UTC" or "+hh:mm")."""
    if tzinfo is None:
        return None
    key = getattr(tzinfo, "key", None) or getattr(tzinfo, "zone", None)   # zoneinfo / pytz
    if isinstance(key, str) and key:
        return "UTC" if key in ("UTC", "Etc/UTC", "Z") else key
    if tzinfo is _dt.timezone.utc:
        return "UTC"
    off = tzinfo.utcoffset(None) if isinstance(tzinfo, _dt.timezone) else None
    if off is not None:
        sec = int(off.total_seconds())
        return "UTC" if sec == 0 else _offset_text(sec)
    name = str(tzinfo)
    if name in ("UTC", "tzutc()"):
        return "UTC"
    # dateutil and others: usable only if zoneinfo knows the name
    from zoneinfo import ZoneInfo
    try:
        ZoneInfo(name)
    except Exception:  # noqa: BLE001 -- any failure means: not a name we can use
        raise ValueError(f"timezone {tzinfo!r} has no IANA name; use a zoneinfo zone or a "
                         "fixed offset") from None
    return name


def _arrow_tz_name(tz: str):
    """Normalise a timezone string as stored by Arrow/Parquet."""
    if tz in ("UTC", "Etc/UTC", "Z", "+00:00", "utc"):
        return "UTC"
    if re.fullmatch(r"[+-]\d{2}:\d{2}", tz):
        return tz
    from zoneinfo import ZoneInfo
    try:
        ZoneInfo(tz)
    except Exception:  # noqa: BLE001
        raise ValueError(f"unknown timezone {tz!r}") from None
    return tz


class TimeAxis:
    """Sample times as float64 values plus what they were: numbers or datetimes.

    Immutable.  Build one with a ``from_...`` constructor or
    :func:`as_time_axis`; ``values`` (read-only float64) is what computations
    use.

    Attributes
    ----------
    values : numpy.ndarray (T,)
        Numbers as given (``kind="number"``) or seconds elapsed since
        ``origin`` (``kind="datetime"``).
    kind : {"number", "datetime"}
    unit : str or None
        ``"s"`` for datetimes (and durations); None for plain numbers.
    origin : numpy.datetime64 or None
        The first sample of a datetime axis (UTC for zoned input).
    tz : str or None
        Zone the input was given in; None for naive datetimes and numbers.
    dates : bool
        The input held calendar dates only (formatted back as ``YYYY-MM-DD``).
    """

    __slots__ = ("_values", "_kind", "_unit", "_origin", "_tz", "_dates")

    def __init__(self, values, kind="number", unit=None, origin=None, tz=None, dates=False):
        if kind not in ("number", "datetime"):
            raise ValueError(f"kind must be 'number' or 'datetime', got {kind!r}")
        v = np.array(values, dtype=np.float64, copy=True).reshape(-1)
        if not np.all(np.isfinite(v)):
            k = int(np.flatnonzero(~np.isfinite(v))[0])
            raise ValueError(f"times[{k}] is not finite ({v[k]})")
        v.flags.writeable = False
        if kind == "datetime":
            if origin is None:
                raise ValueError("a datetime axis needs its origin")
            origin = np.datetime64(origin)
            if np.isnat(origin):
                raise ValueError("the origin of a datetime axis is NaT")
            unit = "s"
        else:
            origin, tz, dates = None, None, False
        object.__setattr__(self, "_values", v)
        object.__setattr__(self, "_kind", kind)
        object.__setattr__(self, "_unit", unit)
        object.__setattr__(self, "_origin", origin)
        object.__setattr__(self, "_tz", tz)
        object.__setattr__(self, "_dates", bool(dates))

    def __setattr__(self, name, value):
        raise AttributeError("TimeAxis is immutable")

    values = property(lambda self: self._values)
    kind = property(lambda self: self._kind)
    unit = property(lambda self: self._unit)
    origin = property(lambda self: self._origin)
    tz = property(lambda self: self._tz)
    dates = property(lambda self: self._dates)

    def __len__(self):
        return self._values.shape[0]

    def __repr__(self):
        n = len(self)
        if self._kind == "number":
            return f"TimeAxis(number, {n} samples" + (f", unit {self._unit!r})" if self._unit
                                                        else ")")
        first = self.format(self._values[:1])[0] if n else str(self._origin)
        return (f"TimeAxis(datetime, {n} samples from {first}, elapsed seconds"
                + (f", tz {self._tz!r})" if self._tz else ")"))

    def __eq__(self, other):
        if not isinstance(other, TimeAxis):
            return NotImplemented
        return (self._kind == other._kind and self._unit == other._unit
                and self._tz == other._tz and self._dates == other._dates
                and (self._origin == other._origin if self._origin is not None
                     else other._origin is None)
                and np.array_equal(self._values, other._values))

    __hash__ = None

    # ------------------------------------------------------------------ constructors
    @classmethod
    def from_numbers(cls, values, unit=None):
        """Numeric times, kept as given (float64).

        >>> TimeAxis.from_numbers([1, 2, 4]).values.tolist()
        [1.0, 2.0, 4.0]
        """
        arr = np.asarray(values)
        if arr.dtype.kind not in "iuf":
            raise TypeError(f"times must be numbers, got dtype {arr.dtype}")
        if arr.dtype.kind in "iu" and arr.size and \
                int(np.max(np.abs(arr.astype(np.float64)))) > 2 ** 53:
            raise ValueError("integer times beyond 2**53 cannot be held exactly as float64; "
                             "subtract an offset (or convert to float) first")
        return cls(arr, "number", unit)

    @classmethod
    def from_datetime64(cls, instants, tz=None, dates=None):
        """Times from a ``datetime64`` array (wall-clock times; UTC instants when ``tz`` is given).

        >>> import numpy as np
        >>> ax = TimeAxis.from_datetime64(np.array(["2020-01-01", "2020-01-02"], "M8[D]"))
        >>> ax.values.tolist(), ax.format().tolist()
        ([0.0, 86400.0], ['2020-01-01', '2020-01-02'])
        """
        arr = np.asarray(instants)
        if arr.dtype.kind != "M":
            raise TypeError(f"expected datetime64 values, got dtype {arr.dtype}")
        arr = arr.reshape(-1)
        if arr.size == 0:
            raise ValueError("times is empty")
        if np.isnat(arr).any():
            k = int(np.flatnonzero(np.isnat(arr))[0])
            raise ValueError(f"times[{k}] is missing (NaT)")
        unit = np.datetime_data(arr.dtype)[0]
        if unit in ("Y", "M", "W", "h", "m"):     # calendar or coarse units: exact in seconds
            arr = arr.astype("datetime64[s]")
            unit = "s"
        if dates is None:
            dates = unit == "D"
        origin = arr[0]
        zone = None if tz is None else _arrow_tz_name(tz) if isinstance(tz, str) else _tz_name(tz)
        return cls(elapsed_seconds(arr, origin), "datetime", "s", origin, zone, dates)

    @classmethod
    def from_iso(cls, strings):
        """Times from ISO-8601 text (see the module docstring for the accepted forms)."""
        instants, tz, dates = parse_iso(strings)
        return cls.from_datetime64(instants, tz=tz, dates=dates)

    @classmethod
    def from_pandas(cls, obj):
        """Times from a pandas ``Timestamp``, ``DatetimeIndex``, ``TimedeltaIndex`` or Series.

        Timezone-aware values keep their zone (``tz``).  pandas is not
        imported here: the object's own attributes are used.
        """
        if type(obj).__name__ == "Timestamp":
            return _from_timestamps([obj], "times")
        tzinfo = getattr(obj, "tz", None)
        if tzinfo is None and hasattr(obj, "dt"):           # a Series of datetimes
            try:
                tzinfo = obj.dt.tz
            except AttributeError:
                tzinfo = None
        kind = getattr(getattr(obj, "dtype", None), "kind", None)
        if kind == "m":                                      # TimedeltaIndex / timedelta Series
            return as_time_axis(np.asarray(obj.to_numpy()))
        if tzinfo is not None:
            # zoned values: int64 ticks since the epoch (UTC) in the dtype's unit (ns before
            # pandas 2, any of s/ms/us/ns since), NaT as the minimum int64
            nat = np.asarray(obj.isna())
            if nat.any():
                raise ValueError(f"times[{int(np.flatnonzero(nat)[0])}] is missing (NaT)")
            ints = obj.asi8 if hasattr(obj, "asi8") else obj.array.asi8
            unit = getattr(obj.dtype, "unit", "ns")
            arr = np.asarray(ints, dtype=np.int64).astype(f"datetime64[{unit}]")
            return cls.from_datetime64(arr, tz=tzinfo, dates=False)
        if kind == "M":
            return cls.from_datetime64(np.asarray(obj.to_numpy()), dates=False)
        values = obj.to_numpy() if hasattr(obj, "to_numpy") else np.asarray(obj)
        return as_time_axis(values)

    # ------------------------------------------------------------------ views
    def with_values(self, values):
        """The same kind of axis (same origin and zone) holding other elapsed ``values``."""
        return TimeAxis(values, self._kind, self._unit, self._origin, self._tz, self._dates)

    def format(self, elapsed=None):
        """Elapsed values in the input's form: ISO strings (datetimes) or the numbers.

        Parameters
        ----------
        elapsed : array_like of float, optional
            Values on this axis (default: ``values``), e.g. window start times.

        Returns
        -------
        numpy.ndarray
            str for datetime axes (in the input's zone), float64 for numbers.
        """
        e = self._values if elapsed is None else np.asarray(elapsed, dtype=np.float64)
        if self._kind == "number":
            return np.array(e, dtype=np.float64)
        return format_iso(e, self._origin, self._tz, self._dates)

    def elapsed_of(self, when, name="time"):
        """Elapsed seconds of one instant on a datetime axis (a number is returned as is).

        ``when`` is a datetime (numpy, pandas, Python) or ISO-8601 text, in
        the same zoned/naive form as the axis.

        >>> ax = TimeAxis.from_iso(["2020-01-01T00:00", "2020-01-01T01:00"])
        >>> ax.elapsed_of("2020-01-01T00:30")
        1800.0
        """
        if isinstance(when, numbers.Real) and not isinstance(when, bool):
            return float(when)
        if self._kind != "datetime":
            raise TypeError(f"{name} must be a number on a numeric time axis, got {_show(when)}")
        other = as_time_axis([when], name=name)
        if other.kind != "datetime":
            raise TypeError(f"{name} must be a datetime or ISO-8601 text, got {_show(when)}")
        if (other.tz is None) != (self._tz is None):
            raise ValueError(f"{name} = {_show(when)} is " + (
                "naive but the times have a zone" if other.tz is None else
                "zoned but the times are naive"))
        return float(elapsed_seconds(np.array([other.origin]).astype("datetime64[ns]"),
                                     self._origin.astype("datetime64[ns]"))[0])

    def to_datetime64(self, elapsed=None):
        """Instants ``origin + elapsed`` as datetime64[ns] (UTC for zoned axes)."""
        if self._kind != "datetime":
            raise ValueError("a numeric time axis has no datetimes")
        e = self._values if elapsed is None else np.asarray(elapsed, dtype=np.float64)
        base = self._origin.astype("datetime64[ns]")
        return base + np.rint(e * 1e9).astype(np.int64).astype("timedelta64[ns]")


def _is_pandas(obj) -> bool:
    return type(obj).__module__.split(".")[0] == "pandas"


def as_time_axis(times, *, name="times"):
    """A :class:`TimeAxis` from numbers, datetime64, pandas times, datetimes or ISO text.

    >>> as_time_axis(["2020-01-01", "2020-01-03"]).values.tolist()
    [0.0, 172800.0]
    >>> as_time_axis([0.0, 2.5]).kind
    'number'
    """
    if isinstance(times, TimeAxis):
        return times
    if _is_pandas(times):
        return TimeAxis.from_pandas(times)
    if isinstance(times, np.datetime64):
        times = np.array([times])
    if isinstance(times, np.ndarray):
        if times.dtype.kind == "M":
            return TimeAxis.from_datetime64(times)
        if times.dtype.kind == "m":
            if np.isnat(times).any():
                raise ValueError(f"{name}[{int(np.flatnonzero(np.isnat(times))[0])}] is "
                                 "missing (NaT)")
            return TimeAxis(times.reshape(-1) / np.timedelta64(1, "s"), "number", "s")
        if times.dtype.kind in "US":
            return TimeAxis.from_iso([str(s) for s in times.reshape(-1)])
        if times.dtype.kind != "O":
            return TimeAxis.from_numbers(times)
    items = list(times) if not isinstance(times, np.ndarray) else times.reshape(-1).tolist()
    if not items:
        raise ValueError(f"{name} is empty")
    first = items[0]
    if isinstance(first, str):
        instants, tz, dates = parse_iso(items, name=name)
        return TimeAxis.from_datetime64(instants, tz=tz, dates=dates)
    if _is_pandas(first):                          # a list of pandas Timestamps
        return _from_timestamps(items, name)
    if isinstance(first, (_dt.datetime, _dt.date)):
        return _from_datetimes(items, name)
    if isinstance(first, np.datetime64):
        return TimeAxis.from_datetime64(np.array(items))
    if all(isinstance(x, numbers.Real) and not isinstance(x, bool) for x in items):
        return TimeAxis.from_numbers(np.array(items, dtype=np.float64))
    bad = next(x for x in items if not (isinstance(x, numbers.Real) and not isinstance(x, bool)))
    raise TypeError(f"{name} must be numbers or datetimes, found {type(bad).__name__} "
                    f"{_show(bad)}")


def _from_datetimes(items, name):
    """Python datetimes/dates (all naive or all aware; aware ones keep the first one's zone)."""
    if all(isinstance(x, _dt.date) and not isinstance(x, _dt.datetime) for x in items):
        return TimeAxis.from_datetime64(np.array(items, dtype="datetime64[D]"), dates=True)
    if not all(isinstance(x, _dt.datetime) for x in items):
        bad = next(x for x in items if not isinstance(x, _dt.datetime))
        raise TypeError(f"{name} mixes datetimes with {type(bad).__name__}")
    aware = [x.tzinfo is not None and x.utcoffset() is not None for x in items]
    if any(aware) and not all(aware):
        k = aware.index(not aware[0])
        raise ValueError(f"{name}[{k}] " + ("has no timezone but the first time has one"
                                             if aware[0] else
                                             "has a timezone but the first time has none"))
    if aware[0]:
        utc = [x.astimezone(_dt.timezone.utc).replace(tzinfo=None) for x in items]
        arr = np.array(utc, dtype="datetime64[us]")
        return TimeAxis.from_datetime64(arr, tz=_tz_name(items[0].tzinfo), dates=False)
    return TimeAxis.from_datetime64(np.array(items, dtype="datetime64[us]"), dates=False)


def _from_timestamps(items, name):
    """pandas Timestamps (all naive or all aware), read through ``.value`` (int64 ns)."""
    if not all(type(x).__name__ == "Timestamp" for x in items):
        bad = next(x for x in items if type(x).__name__ != "Timestamp")
        raise TypeError(f"{name} mixes pandas Timestamps with {type(bad).__name__}")
    aware = [x.tzinfo is not None for x in items]
    if any(aware) and not all(aware):
        k = aware.index(not aware[0])
        raise ValueError(f"{name}[{k}] " + ("has no timezone but the first time has one"
                                             if aware[0] else
                                             "has a timezone but the first time has none"))
    # .value: nanoseconds since the epoch, of the UTC instant (aware) or the wall time (naive)
    arr = np.array([x.value for x in items], dtype=np.int64).astype("datetime64[ns]")
    return TimeAxis.from_datetime64(arr, tz=items[0].tzinfo if aware[0] else None, dates=False)
