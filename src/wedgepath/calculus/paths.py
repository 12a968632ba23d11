"""Sampled curves.

A :class:`Path` is a polyline through samples ``p_0, ..., p_{T-1}`` in R^n,
with optional sample times.  It is the basic 1-chain of the library: line
integrals, oriented areas and region integrals are all evaluated on paths.

Conventions (see the user guide for figures):

* Shape is ``(samples, channels)``; values are copied to float64 and the
  stored arrays are read-only, so a path never changes and never changes the
  caller's data.
* A row containing NaN is a *gap*.  Gaps split the path into
  :attr:`Path.pieces`; every quantity is computed piece by piece (each piece
  closed by the same convention) and the results add up.  A piece made of a
  single sample has no segments and contributes nothing.
* Between samples the curve is a straight segment (the *linear model*), so
  time stamps do not change any linear-model integral; they matter for
  ``curve="spline"`` and for :meth:`Path.window`.
"""

from __future__ import annotations

import numpy as np

from .._validation import as_float_array, check_choice, check_names, check_time_axis

__all__ = ["Path", "CLOSURES", "as_path"]

#: Closure conventions understood by :meth:`Path.close` and by every function
#: taking a ``closure=`` argument.
CLOSURES = ("none", "chord", "detrend", "require")


def _readonly(arr: np.ndarray) -> np.ndarray:
    arr.flags.writeable = False
    return arr


class Path:
    """A sampled curve in R^n: the polyline through ``points``.

    Parameters
    ----------
    points : array_like, shape (T, n)
        Samples, one row per time step, one column per channel.  Any real
        dtype; copied to float64.  Rows containing NaN mark gaps.  A pandas
        DataFrame is accepted and its column labels become ``names``.
    times : array_like, shape (T,), optional
        Strictly increasing, finite sample times.  Irregular spacing is fine.
    names : sequence of str, optional
        One distinct name per channel.

    Examples
    --------
    >>> import numpy as np
    >>> import wedgepath as wp
    >>> p = wp.Path([[0, 0], [1, 0], [1, 1], [0, 1]], names=["strain", "stress"])
    >>> p.n_samples, p.dim
    (4, 2)
    >>> p.is_closed
    False
    >>> p.close("chord").points[-1]
    array([0., 0.])
    >>> q = wp.Path([[0.0, 1.0], [np.nan, np.nan], [2.0, 3.0], [4.0, 5.0]])
    >>> [piece.n_samples for piece in q.pieces]
    [1, 2]
    """

    __slots__ = ("_points", "_times", "_names", "_gap_rows", "_pieces", "_time_axis")

    def __init__(self, points, *, times=None, names=None):
        if names is None and hasattr(points, "columns") and not isinstance(points, np.ndarray):
            names = [str(c) for c in points.columns]
        pts = as_float_array(points, "points", ndim=(1, 2), allow_nan=True)
        if pts.ndim == 1:
            raise ValueError(
                f"points must be 2-dimensional (samples, channels), got shape {pts.shape}; "
                "for a single channel use points.reshape(-1, 1)")
        T, n = pts.shape
        if n == 0:
            raise ValueError("points has no channels (shape has 0 columns)")
        if T < 2:
            raise ValueError(f"a path needs at least 2 samples, got {T}")
        gap_rows = np.isnan(pts).any(axis=1)
        if gap_rows.all():
            raise ValueError("points has no complete sample: every row contains NaN")
        self._points = _readonly(pts)
        self._gap_rows = _readonly(gap_rows) if gap_rows.any() else None
        if times is None:
            self._times = self._time_axis = None
        else:
            ax = check_time_axis(times, T)
            self._times = _readonly(np.array(ax.values))
            self._time_axis = ax if ax.kind == "datetime" or ax.unit else None
        self._names = None if names is None else check_names(names, n)
        self._pieces = None

    # ------------------------------------------------------------------ views
    @property
    def points(self) -> np.ndarray:
        """The samples, shape (T, n), read-only float64."""
        return self._points

    @property
    def times(self):
        """Sample times, shape (T,), read-only float64, or None.

        Datetime times (``datetime64``, pandas, ISO text) are held as seconds
        elapsed since the first sample of the input; :attr:`time_axis` keeps
        what they were.
        """
        return self._times

    @property
    def time_axis(self):
        """The times with what they were (a ``TimeAxis``), or None.

        Its ``format`` method gives times back in the
        input's form (ISO-8601 text for datetimes, numbers otherwise).
        """
        if self._times is None:
            return None
        from .._time import TimeAxis

        if self._time_axis is None:
            return TimeAxis(self._times, "number", None)
        return self._time_axis.with_values(self._times)

    @property
    def names(self):
        """Channel names (tuple of str) or None."""
        return self._names

    @property
    def n_samples(self) -> int:
        """Number of samples T (gap rows included)."""
        return self._points.shape[0]

    @property
    def dim(self) -> int:
        """Number of channels n (dimension of the ambient space)."""
        return self._points.shape[1]

    def __len__(self) -> int:
        return self.n_samples

    @property
    def has_gaps(self) -> bool:
        """True when some rows are NaN gaps."""
        return self._gap_rows is not None

    @property
    def pieces(self) -> tuple:
        """The gap-free runs of samples, as a tuple of paths.

        A path without gaps is its own single piece.  Pieces keep their times
        and names.  A run of one sample is kept (it has no segments, so it
        contributes nothing to an integral).
        """
        if self._pieces is None:
            if self._gap_rows is None:
                self._pieces = (self,)
            else:
                starts, stops = self.piece_bounds()
                self._pieces = tuple(self._slice(a, b) for a, b in zip(starts, stops))
        return self._pieces

    def piece_bounds(self):
        """Row ranges of the pieces: arrays ``starts``, ``stops`` (``points[a:b]``)."""
        if self._gap_rows is None:
            return np.array([0]), np.array([self.n_samples])
        good = ~self._gap_rows
        edges = np.flatnonzero(np.diff(np.concatenate(([0], good.view(np.int8), [0]))))
        return edges[0::2], edges[1::2]

    def _slice(self, a: int, b: int) -> "Path":
        return Path._trusted(self._points[a:b],
                             None if self._times is None else self._times[a:b],
                             self._names, time_axis=self._time_axis)

    @classmethod
    def _trusted(cls, points, times, names, gap_rows="compute", time_axis=None) -> "Path":
        """Build a path from arrays that are already checked (no copy)."""
        self = object.__new__(cls)
        pts = np.asarray(points, dtype=np.float64)
        if pts.flags.writeable:
            pts = _readonly(pts)
        self._points = pts
        if isinstance(gap_rows, str):
            g = np.isnan(pts).any(axis=1)
            gap_rows = _readonly(g) if g.any() else None
        self._gap_rows = gap_rows
        if times is not None:
            times = np.asarray(times, dtype=np.float64)
            if times.flags.writeable:
                times = _readonly(times)
        self._times = times
        self._time_axis = time_axis if times is not None else None
        self._names = names
        self._pieces = None
        return self

    @property
    def is_closed(self) -> bool:
        """True when every piece ends exactly where it starts."""
        return all(bool(np.array_equal(pc._points[0], pc._points[-1])) for pc in self.pieces)

    @property
    def increments(self) -> np.ndarray:
        """Segment vectors ``p_{k+1} - p_k``, shape (T-1, n); NaN across gaps."""
        return np.diff(self._points, axis=0)

    def __repr__(self) -> str:
        extra = []
        if self._times is not None:
            extra.append(f"t=[{self._times[0]:g}, {self._times[-1]:g}]")
        if self._names is not None:
            extra.append("names=" + ",".join(self._names))
        if self.has_gaps:
            extra.append(f"pieces={len(self.pieces)}")
        tail = (", " + ", ".join(extra)) if extra else ""
        return f"Path(T={self.n_samples}, n={self.dim}{tail})"

    def __eq__(self, other):
        if not isinstance(other, Path):
            return NotImplemented
        return (self._points.shape == other._points.shape
                and np.array_equal(self._points, other._points, equal_nan=True)
                and ((self._times is None and other._times is None)
                     or (self._times is not None and other._times is not None
                         and np.array_equal(self._times, other._times)))
                and self._names == other._names)

    __hash__ = None

    # ------------------------------------------------------------ selection
    def channel_index(self, key) -> int:
        """Index of a channel given by position or by name."""
        if isinstance(key, str):
            if self._names is None:
                raise ValueError(f"channel {key!r} given by name but the path has no names")
            try:
                return self._names.index(key)
            except ValueError:
                raise ValueError(f"unknown channel {key!r}; channels are {list(self._names)}") from None
        if isinstance(key, (bool, np.bool_)) or not isinstance(key, (int, np.integer)):
            raise TypeError(f"channel must be an int or a name, got {type(key).__name__}")
        k = int(key)
        if not -self.dim <= k < self.dim:
            raise ValueError(f"channel index {k} out of range for a path with {self.dim} channels")
        return k % self.dim

    def channels(self, keys) -> "Path":
        """The path of the selected channels (by index or name), in that order."""
        idx = [self.channel_index(k) for k in keys]
        if not idx:
            raise ValueError("select at least one channel")
        if len(set(idx)) != len(idx):
            raise ValueError(f"channels selected twice: {list(keys)}")
        names = None if self._names is None else tuple(self._names[i] for i in idx)
        return Path._trusted(self._points[:, idx].copy(), self._times, names,
                             time_axis=self._time_axis)

    def plane(self, i, j) -> "Path":
        """The planar path of channels ``i`` and ``j`` (index or name).

        The orientation of the (i, j) plane is fixed: channel ``i`` is the
        horizontal axis, so a counter-clockwise loop in it has positive area.
        """
        a, b = self.channel_index(i), self.channel_index(j)
        if a == b:
            raise ValueError(f"plane needs two different channels, got {i!r} twice")
        return self.channels([a, b])

    def window(self, start=None, stop=None) -> "Path":
        """The samples with ``start <= t < stop``.

        With times, ``start``/``stop`` are times; without, they are sample
        indices (like slicing).  Either bound may be None.  Half-open windows
        tile a path: ``p.window(a, b).then(p.window(b, c))`` is
        ``p.window(a, c)``.
        """
        T = self.n_samples
        if self._times is None:
            lo = 0 if start is None else _index_bound(start, "start", T)
            hi = T if stop is None else _index_bound(stop, "stop", T)
        else:
            t = self._times
            ax = self._time_axis
            if ax is not None and ax.kind == "datetime":   # datetimes or ISO text
                start = None if start is None else ax.elapsed_of(start, "start")
                stop = None if stop is None else ax.elapsed_of(stop, "stop")
            lo = 0 if start is None else int(np.searchsorted(t, _real(start, "start"), "left"))
            hi = T if stop is None else int(np.searchsorted(t, _real(stop, "stop"), "left"))
        if hi - lo < 2:
            raise ValueError(f"window [{start}, {stop}) holds {max(hi - lo, 0)} samples; "
                             "a path needs at least 2")
        return Path._trusted(self._points[lo:hi], None if self._times is None else self._times[lo:hi],
                             self._names, time_axis=self._time_axis)

    # ----------------------------------------------------------- operations
    def reversed(self) -> "Path":
        """The same curve traversed backwards (times mirrored to stay increasing)."""
        times = None if self._times is None else (self._times[0] + self._times[-1]) - self._times[::-1]
        return Path._trusted(self._points[::-1].copy(), times, self._names)

    def then(self, other: "Path") -> "Path":
        """Concatenation: this path, a segment to ``other``'s first sample, then ``other``.

        Both paths need the same number of channels (and the same names when
        both have names).  When both have times and ``other`` starts after
        this path ends the times are kept; otherwise ``other``'s times are
        shifted to start one of its median sample intervals after this path
        ends.  When only one of them has times the result has none.
        """
        if not isinstance(other, Path):
            raise TypeError(f"then() needs a Path, got {type(other).__name__}")
        if other.dim != self.dim:
            raise ValueError(f"cannot join a path with {self.dim} channels to one with {other.dim}")
        if self._names is not None and other._names is not None and self._names != other._names:
            raise ValueError(f"channel names differ: {list(self._names)} vs {list(other._names)}")
        names = self._names if self._names is not None else other._names
        times = None
        if self._times is not None and other._times is not None:
            t2 = other._times
            if t2[0] <= self._times[-1]:
                step = float(np.median(np.diff(t2)))
                t2 = t2 + (self._times[-1] + step - t2[0])
            times = np.concatenate([self._times, t2])
        pts = np.concatenate([self._points, other._points])
        return Path._trusted(pts, times, names)

    def close(self, closure: str = "chord", *, tol=None) -> "Path":
        """Return the path closed by the convention ``closure`` (each piece on its own).

        ``"none"``
            Unchanged.
        ``"chord"``
            Append the first sample of each piece to its end (the straight
            chord back to the start), unless it is already there.  The
            oriented area of the result is the Lévy area of the open piece.
        ``"detrend"``
            Subtract the linear drift ``s_k (p_last - p_first)`` with ``s_k``
            running from 0 to 1 in time (or index without times), so each
            piece ends exactly where it began.
        ``"require"``
            Refuse with ``ValueError`` unless each piece's end lies within
            ``tol`` of its start (default ``1e-9`` times the piece's extent,
            Euclidean); then the end sample is set exactly to the start.
        """
        how = check_choice(closure, "closure", CLOSURES)
        if how == "none":
            return self
        if tol is not None:
            tol = _real(tol, "tol")
            if tol < 0:
                raise ValueError(f"tol must be >= 0, got {tol}")
        closed = [_close_piece(pc, how, tol) for pc in self.pieces]
        if len(closed) == 1:
            return closed[0]
        return _join_with_gaps(closed, self._names)


def _close_piece(pc: Path, how: str, tol) -> Path:
    pts, t = pc._points, pc._times
    if pc.n_samples < 2:
        return pc
    first, last = pts[0], pts[-1]
    if how == "chord":
        if np.array_equal(first, last):
            return pc
        new_t = None
        if t is not None:
            step = float(np.median(np.diff(t)))
            new_t = np.append(t, t[-1] + step)
            if not np.isfinite(new_t[-1]):
                raise ValueError("closure='chord': the time of the closing sample overflows "
                                 "float64; shift the times (e.g. start them at 0)")
        return Path._trusted(np.vstack([pts, first]), new_t, pc._names, gap_rows=None)
    if how == "detrend":
        if t is None:
            s = np.linspace(0.0, 1.0, pc.n_samples)
        else:
            s = (t - t[0]) / (t[-1] - t[0])
        with np.errstate(over="ignore", invalid="ignore"):
            out = pts - s[:, None] * (last - first)
        if not np.isfinite(out).all():
            raise ValueError("closure='detrend' overflows float64 for coordinates this large; "
                             "rescale the path")
        out[-1] = first  # exact closure despite rounding
        return Path._trusted(out, t, pc._names, gap_rows=None)
    # require
    gap = _norm(last, first)
    if tol is None:
        extent = _norm(pts.max(axis=0), pts.min(axis=0))
        tol_eff = 1e-9 * extent
    else:
        tol_eff = tol
    if gap > tol_eff:
        raise ValueError(
            f"path is not closed: its end is {gap:.6g} from its start (tolerance {tol_eff:.3g}); "
            "use closure='chord' or 'detrend', or pass a larger tol")
    out = pts.copy()
    out[-1] = first
    return Path._trusted(out, t, pc._names, gap_rows=None)


def _norm(a, b) -> float:
    """Euclidean ``|a - b|`` without overflow or underflow in the squares (inf if it overflows)."""
    big = float(max(np.max(np.abs(a)), np.max(np.abs(b))))
    if big == 0.0:
        return 0.0
    with np.errstate(over="ignore"):
        return big * float(np.linalg.norm(a / big - b / big))


def _join_with_gaps(pieces, names) -> Path:
    n = pieces[0].dim
    gap = np.full((1, n), np.nan)
    arrays, times = [], []
    have_times = all(pc._times is not None for pc in pieces)
    for k, pc in enumerate(pieces):
        if k:
            arrays.append(gap)
            if have_times:
                prev, cur = times[-1][-1], pc._times[0]
                times.append(np.array([0.5 * (prev + cur) if cur > prev else prev]))
        arrays.append(pc._points)
        if have_times:
            times.append(pc._times)
    tt = None
    if have_times:
        tt = np.concatenate(times)
        if not np.all(np.diff(tt) > 0):  # closure chords may run past the next piece's start
            tt = None
    return Path._trusted(np.vstack(arrays), tt, names)


def _real(x, name: str) -> float:
    if isinstance(x, (bool, np.bool_)):
        raise TypeError(f"{name} must be a real number, got a boolean")
    try:
        v = float(x)
    except (TypeError, ValueError):
        raise TypeError(f"{name} must be a real number, got {x!r}") from None
    if not np.isfinite(v):
        raise ValueError(f"{name} must be finite, got {v}")
    return v


def _index_bound(x, name: str, T: int) -> int:
    if isinstance(x, (bool, np.bool_)) or not isinstance(x, (int, np.integer)):
        raise TypeError(f"{name} must be a sample index (int) for a path without times, got {x!r}")
    x = int(x)
    if x < 0:
        x += T
    return min(max(x, 0), T)


def as_path(obj, name: str = "path") -> Path:
    """Return ``obj`` if it is a :class:`Path`, else ``Path(obj)``.

    Returns
    -------
    Path
    """
    if isinstance(obj, Path):
        return obj
    try:
        return Path(obj)
    except (TypeError, ValueError) as exc:
        raise type(exc)(f"{name}: {exc}") from None
