"""Streaming and mergeable area matrices: :class:`AreaAccumulator`."""

from __future__ import annotations

import numpy as np

from .._results import default_names
from .._validation import as_float_array, as_int, check_bool
from ._kernel import check_names, scan, skew_half, wedge
from .areas import AreaMatrix

__all__ = ["AreaAccumulator"]

_STATE_KEYS = ("n", "names", "count", "first", "last", "area", "head_end", "tail_start", "gapped")


class AreaAccumulator:
    """The area matrix of a sample sequence fed in chunks, mergeable in any grouping.

    The state summarises the samples seen so far in a few vectors, whatever
    their number:

    ``first``, ``last``
        The first and last sample (rows; NaN marks a gap row).
    ``count``
        Number of samples (rows) fed.
    ``area``
        The sum over pieces (runs of complete rows) of their chord-closed
        areas -- what :func:`area_matrix` returns for the whole sequence.
    ``head_end``, ``tail_start``
        The last sample of the leading piece and the first sample of the
        trailing piece; with no gaps these are ``last`` and ``first``, so
        ``increment = last - first`` is the piece's increment.
    ``gapped``
        Whether a gap row has been seen.

    Joining two states is Chen's identity: the area of a concatenation is
    the sum of the areas plus half the wedge of the increments, with the
    segment between the last sample of the first part and the first sample
    of the second part included.  Hence ``update`` can be fed any chunking
    (the last sample is carried across chunk borders) and ``merge`` is
    associative: chunks may be reduced in any tree, on any machines.

    Parameters
    ----------
    n : int
        Number of channels (at least 2).
    names : sequence of str, optional
        Channel names; chunks given as DataFrames must match them.

    Examples
    --------
    >>> import numpy as np
    >>> import wedgepath as wp
    >>> X = np.random.default_rng(0).standard_normal((1000, 3)).cumsum(axis=0)
    >>> acc = wp.AreaAccumulator(3)
    >>> for chunk in np.array_split(X, 7):
    ...     _ = acc.update(chunk)
    >>> np.allclose(acc.result(), wp.area_matrix(X), rtol=1e-12, atol=0)
    True

    Two halves processed separately, then merged (order matters, grouping
    does not):

    >>> left, right = wp.AreaAccumulator(3).update(X[:400]), wp.AreaAccumulator(3).update(X[400:])
    >>> np.allclose(left.merge(right).result(), wp.area_matrix(X), rtol=1e-12, atol=0)
    True
    """

    __slots__ = tuple(k for k in _STATE_KEYS if k != "area") + ("_area", "_comp")

    def __init__(self, n, *, names=None):
        n = as_int(n, "n")
        if n < 2:
            raise ValueError(f"n={n}: lead-lag needs at least 2 channels")
        self.n = n
        self.names = None if names is None else check_names(names, n)
        self.count = 0
        self.first = np.full(n, np.nan)
        self.last = np.full(n, np.nan)
        self.area = np.zeros((n, n))
        self.head_end = np.full(n, np.nan)
        self.tail_start = np.full(n, np.nan)
        self.gapped = False

    # ------------------------------------------------------------ views
    @property
    def area(self) -> np.ndarray:
        """The chord-closed area matrix of the pieces seen so far (see the class notes)."""
        return self._area + self._comp

    @area.setter
    def area(self, value):
        self._area = np.array(value, dtype=np.float64)
        self._comp = np.zeros_like(self._area)

    def _add(self, x):
        """``area += x`` with Neumaier's compensation: the rounding error of many
        updates or merges stays at the last bit instead of growing with their number."""
        t = self._area + x
        big = np.abs(self._area) >= np.abs(x)
        self._comp = self._comp + np.where(big, (self._area - t) + x, (x - t) + self._area)
        self._area = t

    @property
    def increment(self) -> np.ndarray:
        """``last - first`` (NaN where either is a gap row)."""
        return self.last - self.first

    def result(self) -> AreaMatrix:
        """The area matrix of everything fed so far (chord closure).

        An :class:`AreaMatrix` with the accumulator's names (``"0", "1", ...``
        when it has none) and ``samples`` = the rows fed.
        """
        if self.count < 2:
            raise ValueError(f"the accumulator has seen {self.count} sample(s); at least 2 are needed")
        if not np.isfinite(self.area).all():
            raise ValueError("AreaAccumulator: the areas overflow float64 for data this large; "
                             "rescale the data (e.g. divide each channel by its largest value)")
        nm = self.names if self.names is not None else default_names(self.n)
        return AreaMatrix(values=self.area.copy(), names=nm, closure="chord", normalize=None,
                          samples=int(self.count))

    def copy(self) -> "AreaAccumulator":
        """An independent copy of the state."""
        return AreaAccumulator.from_state(self.state())

    def state(self) -> dict:
        """The state as a dict of plain Python values (JSON/pickle friendly).

        Arrays become nested lists; NaN stays ``float('nan')``.
        """
        return {"n": self.n, "names": None if self.names is None else list(self.names),
                "count": int(self.count), "first": self.first.tolist(), "last": self.last.tolist(),
                "area": self.area.tolist(), "head_end": self.head_end.tolist(),
                "tail_start": self.tail_start.tolist(), "gapped": bool(self.gapped)}

    @classmethod
    def from_state(cls, state) -> "AreaAccumulator":
        """Rebuild an accumulator from :meth:`state` output (checked)."""
        if not isinstance(state, dict):
            raise TypeError(f"state must be a dict from AreaAccumulator.state(), got {type(state).__name__}")
        missing = [k for k in _STATE_KEYS if k not in state]
        if missing:
            raise ValueError(f"state is missing {missing}")
        self = cls(state["n"], names=state["names"])
        n = self.n
        count = as_int(state["count"], "count")
        if count < 0:
            raise ValueError(f"count must be >= 0, got {count}")
        self.count = count
        for key in ("first", "last", "head_end", "tail_start"):
            v = as_float_array(state[key], f"state[{key!r}]", allow_nan=True)
            if v.shape != (n,):
                raise ValueError(f"state[{key!r}] must have {n} entries, got shape {v.shape}")
            setattr(self, key, v)
        area = as_float_array(state["area"], "state['area']")
        if area.shape != (n, n):
            raise ValueError(f"state['area'] must be {n}x{n}, got shape {area.shape}")
        self.area = area
        self.gapped = check_bool(state["gapped"], "state['gapped']")
        return self

    def __repr__(self):
        return f"AreaAccumulator(n={self.n}, count={self.count}, gapped={self.gapped})"

    def __getstate__(self):
        return self.state()

    def __setstate__(self, state):
        other = AreaAccumulator.from_state(state)
        for k in _STATE_KEYS:
            setattr(self, k, getattr(other, k))

    # ------------------------------------------------------------ feeding
    def _chunk_state(self, chunk) -> "AreaAccumulator":
        names = None
        if hasattr(chunk, "columns") and not isinstance(chunk, np.ndarray):
            names = tuple(str(c) for c in chunk.columns)
            if self.names is not None and names != self.names:
                raise ValueError(f"chunk columns {list(names)} do not match the accumulator's "
                                 f"names {list(self.names)}")
        from ._kernel import signal_input
        arr = chunk
        if isinstance(chunk, np.ndarray) and chunk.ndim == 1:
            arr = chunk.reshape(1, -1)
        elif isinstance(chunk, (list, tuple)) and chunk and np.ndim(chunk) == 1:
            arr = np.asarray(chunk).reshape(1, -1)
        data = signal_input(arr, None, None, what="chunk", min_channels=1, min_samples=1,
                                warn_shape=False)
        T, n = data.shape
        if n != self.n:
            raise ValueError(f"chunk has {n} channels but the accumulator was made for {self.n}")
        st = AreaAccumulator.__new__(AreaAccumulator)
        st.n, st.names, st.count = n, self.names, T
        st.first = np.array(data.values[0], dtype=np.float64)
        st.last = np.array(data.values[-1], dtype=np.float64)
        if np.isinf(st.first).any() or np.isinf(st.last).any():
            raise ValueError("chunk contains an infinite value")
        if T == 1:
            st.area = np.zeros((n, n))
            ok = not np.isnan(st.first).any()
            st.head_end = st.first.copy()
            st.tail_start = st.first.copy()
            st.gapped = not ok
            return st
        sc = scan(data, "chunk")
        with np.errstate(over="ignore", invalid="ignore"):  # result() reports overflow
            st.area = skew_half(sc.M)
        starts, stops = sc.starts, sc.stops
        if starts.size == 0:
            st.head_end = np.full(n, np.nan)
            st.tail_start = np.full(n, np.nan)
            st.gapped = True
            return st
        st.gapped = not (starts.size == 1 and starts[0] == 0 and stops[0] == T)
        st.head_end = np.array(data.values[stops[0] - 1], dtype=np.float64)
        st.tail_start = np.array(data.values[starts[-1]], dtype=np.float64)
        return st

    def update(self, chunk) -> "AreaAccumulator":
        """Append the samples of ``chunk`` ((m, n) array-like or DataFrame, or one (n,) row).

        The segment from the previous last sample to the chunk's first sample
        is included.  Returns ``self`` (updated in place).
        """
        return self._absorb(self._chunk_state(chunk))

    def merge(self, other: "AreaAccumulator") -> "AreaAccumulator":
        """Append the sequence summarised by ``other`` after this one.

        The result is the state of the concatenated samples, the segment
        joining the two included; ``other`` is not changed.  Associative:
        ``a.merge(b).merge(c)`` equals ``a.merge(b.copy().merge(c))``.
        Returns ``self`` (updated in place).
        """
        if not isinstance(other, AreaAccumulator):
            raise TypeError(f"merge needs an AreaAccumulator, got {type(other).__name__}")
        if other.n != self.n:
            raise ValueError(f"cannot merge an accumulator of {other.n} channels into one of {self.n}")
        if self.names is not None and other.names is not None and self.names != other.names:
            raise ValueError(f"channel names differ: {list(self.names)} vs {list(other.names)}")
        if self.names is None:
            self.names = other.names
        return self._absorb(other)

    def _absorb(self, y) -> "AreaAccumulator":
        if y.count == 0:
            return self
        if self.count == 0:
            for k in ("count", "gapped"):
                setattr(self, k, getattr(y, k))
            for k in ("first", "last", "area", "head_end", "tail_start"):
                setattr(self, k, np.array(getattr(y, k), dtype=np.float64))
            return self
        joinable = not (np.isnan(self.last).any() or np.isnan(y.first).any())
        if joinable:
            ts = self.tail_start
            d1 = self.last - ts
            j = y.first - self.last
            d2 = y.first - ts
            d3 = y.head_end - y.first
            with np.errstate(over="ignore", invalid="ignore"):  # result() reports overflow
                self._add(y.area)
                self._add(0.5 * (wedge(d1, j) + wedge(d2, d3)))
            head_end = self.head_end if self.gapped else y.head_end
            tail_start = y.tail_start if y.gapped else self.tail_start
            self.head_end = np.array(head_end, dtype=np.float64)
            self.tail_start = np.array(tail_start, dtype=np.float64)
            self.gapped = self.gapped or y.gapped
        else:
            with np.errstate(over="ignore", invalid="ignore"):
                self._add(y.area)
            self.tail_start = np.array(y.tail_start, dtype=np.float64)
            self.gapped = True
        self.last = np.array(y.last, dtype=np.float64)
        self.count = self.count + y.count
        return self
