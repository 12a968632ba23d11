"""One idiom for every value wedgepath returns: :class:`Result`.

Every public result is an immutable dataclass
(``@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)``)
deriving from :class:`Result`.  It carries

* ``names`` -- the channel names it was computed from, always a tuple of str
  (from DataFrame columns, ``Path.names``, or ``"0", "1", ...``);
* the conventions it was computed with, as fields (``closure``,
  ``normalize``, ...), where they apply;
* ``units`` -- a read-only mapping channel name -> unit text, or None when
  the input had none (:meth:`Result.with_units` attaches them);
* ``to_frame()`` -- a tidy pandas table (one row per natural unit: pair,
  window, cycle, face, ...), whose column names are part of the API;
* a one-line ``repr`` (never an array dump) and ``_repr_html_`` for
  notebooks.

Results that are arrays (:class:`ArrayResult`) also work with numpy:
``np.asarray(result)`` gives the array (read-only; ``np.array(result)`` a
writable copy), ``result[k]`` indexes it, ``len``/``shape``/``ndim`` describe it.

Arrays held by a result are read-only.  Results are built by the library;
their constructors take keyword arguments only.
"""

from __future__ import annotations

import dataclasses
import html
import math
import numbers
from collections.abc import Mapping
from types import MappingProxyType
from typing import ClassVar

import numpy as np

__all__ = ["Result", "ArrayResult", "default_names", "fmt_number", "fmt_names", "pair_index"]

#: longest repr line (characters) before trailing items are left out
REPR_WIDTH = 120
#: rows of ``to_frame()`` shown by ``_repr_html_``
HTML_ROWS = 8


def default_names(n: int) -> tuple:
    """``("0", "1", ..., str(n - 1))``: the names of unnamed channels."""
    return tuple(str(k) for k in range(int(n)))


def fmt_number(v, digits=6) -> str:
    """A number in a short form (``%.6g``), ``nan`` for NaN, ``None`` for None."""
    if v is None:
        return "None"
    if isinstance(v, (bool, np.bool_)):
        return str(bool(v))
    if isinstance(v, numbers.Integral):
        return str(int(v))
    v = float(v)
    if math.isnan(v):
        return "nan"
    return f"{v:.{digits}g}"


def fmt_names(names, limit=6) -> str:
    """A list of names for a repr, shortened to ``limit`` entries."""
    names = list(names)
    if len(names) <= limit:
        return repr(names)
    head = ", ".join(repr(n) for n in names[:limit - 1])
    return f"[{head}, ... {len(names) - limit + 1} more]"


def pair_index(n: int):
    """Row and column indices of the pairs ``i < j`` of ``n`` channels, row by row."""
    return np.triu_indices(int(n), 1)


def _frozen_array(v):
    a = np.asarray(v)
    if a.flags.writeable:
        a = a.view()
        a.flags.writeable = False
    return a


class Result:
    """Base of every public result (a mixin: the results are frozen dataclasses).

    Subclasses implement :meth:`to_frame` and :meth:`_summary_items`; the
    repr, the HTML repr and :meth:`with_units` come from here.
    """

    __slots__ = ()

    #: name of the field that ``__array__`` returns (array-like results only)
    _array_field: ClassVar = None

    # ------------------------------------------------------------ construction
    def __post_init__(self):
        for f in dataclasses.fields(self):
            v = getattr(self, f.name)
            if f.name == "names":
                if v is None or isinstance(v, str):
                    raise TypeError(f"{type(self).__name__}.names must be a sequence of str")
                v = tuple(str(x) for x in v)
            elif f.name == "units":
                v = _units(v)
            elif isinstance(v, np.ndarray):
                v = _frozen_array(v)
            else:
                continue
            object.__setattr__(self, f.name, v)

    def with_units(self, units) -> "Result":
        """A copy of this result with ``units`` (channel name -> unit text) attached.

        Names that are not channels of the result are refused.
        """
        units = _units(units)
        if units is not None:
            unknown = [k for k in units if k not in self.names]
            if unknown:
                raise ValueError(f"units names channel {unknown[0]!r}, which is not one of "
                                 f"{list(self.names)}")
        return dataclasses.replace(self, units=units)

    def _channel(self, k) -> int:
        """Index of channel ``k``, given by name or by index (KeyError for an unknown name)."""
        if isinstance(k, str):
            if k not in self.names:
                raise KeyError(f"unknown channel {k!r}; channels are {list(self.names)}")
            return self.names.index(k)
        return int(k)

    # ------------------------------------------------------------ abstract
    def to_frame(self):
        """The result as a tidy pandas DataFrame (columns: see the class docstring)."""
        raise NotImplementedError

    def _summary_items(self) -> list:
        """``[(key, text)]``: the short facts shown by the reprs."""
        raise NotImplementedError

    # ------------------------------------------------------------ reprs
    def __repr__(self):
        return one_line(type(self).__name__, self._summary_items())

    def _repr_html_(self):
        rows = "".join(f"<tr><th style='text-align:left'>{html.escape(str(k))}</th>"
                       f"<td style='text-align:left'>{html.escape(str(v))}</td></tr>"
                       for k, v in self._summary_items())
        out = [f"<div><strong>{html.escape(type(self).__name__)}</strong>",
               f"<table>{rows}</table>"]
        try:
            frame = self.to_frame()
        except ImportError:               # pandas missing: the summary alone
            frame = None
        if frame is not None and len(frame.columns):
            more = len(frame) - HTML_ROWS
            out.append(frame.head(HTML_ROWS).to_html(max_cols=12, border=0))
            if more > 0:
                out.append(f"<p>... {more} more row{'s' if more > 1 else ''} "
                           "(<code>.to_frame()</code> has them all)</p>")
        out.append("</div>")
        return "".join(out)


def one_line(name, items, width=REPR_WIDTH) -> str:
    """``name(k=v, k=v, ...)`` within ``width`` characters (trailing items left out)."""
    parts = []
    for k, v in items:
        candidate = ", ".join(parts + [f"{k}={v}"])
        if parts and len(name) + len(candidate) + 2 > width:
            parts.append("...")
            break
        parts.append(f"{k}={v}")
    return f"{name}({', '.join(parts)})"


def _units(units):
    if units is None:
        return None
    if not isinstance(units, Mapping):
        raise TypeError(f"units must be a mapping channel name -> unit text, got "
                        f"{type(units).__name__}")
    clean = {}
    for k, v in units.items():
        if not isinstance(k, str) or not isinstance(v, str):
            raise TypeError(f"units must map names (str) to unit text (str), got {k!r}: {v!r}")
        clean[k] = v
    return MappingProxyType(clean)


class ArrayResult(Result):
    """A result that is an array: ``np.asarray(r)`` gives ``getattr(r, r._array_field)``."""

    __slots__ = ()

    def _array(self) -> np.ndarray:
        return getattr(self, self._array_field)

    def __array__(self, dtype=None, copy=None):
        a = self._array()
        if dtype is not None and np.dtype(dtype) != a.dtype:
            if copy is False:
                raise ValueError(f"{type(self).__name__}: converting to {np.dtype(dtype)} needs "
                                 "a copy, and copy=False was asked for")
            return a.astype(dtype)
        if copy:
            return a.copy()
        return a

    def __len__(self):
        return self._array().shape[0]

    def __iter__(self):
        return iter(self._array())

    @property
    def shape(self) -> tuple:
        return self._array().shape

    @property
    def ndim(self) -> int:
        return self._array().ndim

    @property
    def dtype(self):
        return self._array().dtype

    def __getitem__(self, key):
        return self._array()[key]
