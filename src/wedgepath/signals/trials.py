"""Trials: repeated recordings (strides, stimulus epochs, separate load tests) in one table.

A *trial* is a run of consecutive rows that belong together.  Trials come
from

* a trial column (``trials="subject_run"`` for a DataFrame column, or one
  label per row, ``trials=labels``): consecutive rows with the same label
  form a trial; a label may not come back after another one (that is an
  error naming the row, because the rows of a trial must be contiguous);
* gaps (``trials="gaps"``; the default of the significance functions): the
  pieces between NaN rows.

Inside a trial, NaN rows are still gaps: the trial's area is the sum of its
pieces' areas.  Trials are closed on their own: no area is counted across a
trial boundary.
"""

from __future__ import annotations

import numpy as np

__all__ = []   # internal module; the public entry points take ``trials=``


class Trials:
    """Trial boundaries of a (T, n) recording and the gap-free pieces inside them.

    ``start``/``stop`` (int arrays, N): rows ``start[t]:stop[t]`` of trial t;
    ``labels`` (tuple of str, N); ``source``: ``"column"``, ``"labels"`` or
    ``"gaps"``; ``piece_start``/``piece_stop``/``piece_trial``: the gap-free
    runs of rows inside the trials with the trial each belongs to.
    """

    __slots__ = ("start", "stop", "labels", "source", "piece_start", "piece_stop",
                 "piece_trial")

    def __init__(self, start, stop, labels, source, valid):
        self.start = np.asarray(start, dtype=np.int64)
        self.stop = np.asarray(stop, dtype=np.int64)
        self.labels = tuple(labels)
        self.source = source
        ps, pe, pt = [], [], []
        for t, (a, b) in enumerate(zip(self.start.tolist(), self.stop.tolist())):
            s, e = gap_free_runs(valid[a:b])
            ps.extend((s + a).tolist())
            pe.extend((e + a).tolist())
            pt.extend([t] * s.size)
        self.piece_start = np.asarray(ps, dtype=np.int64)
        self.piece_stop = np.asarray(pe, dtype=np.int64)
        self.piece_trial = np.asarray(pt, dtype=np.int64)

    def __len__(self):
        return self.start.shape[0]

    def describe(self) -> str:
        how = {"column": "a trial column", "labels": "trial labels",
               "gaps": "the NaN rows between them"}[self.source]
        return f"{len(self)} trial{'s' if len(self) != 1 else ''} (from {how})"


def gap_free_runs(valid):
    """Start and stop (exclusive) of each run of True in ``valid``."""
    edges = np.diff(np.concatenate(([0], np.asarray(valid, dtype=np.int8), [0])))
    return np.flatnonzero(edges == 1), np.flatnonzero(edges == -1)


def split_trial_column(X, trials):
    """Take a trial column out of a DataFrame: ``(X without it, its labels)``.

    Anything else is returned unchanged.
    """
    if isinstance(trials, str) and trials != "gaps":
        if not (hasattr(X, "columns") and hasattr(X, "drop")):
            raise ValueError(f"trials={trials!r} names a column, but X is not a DataFrame; "
                             "pass one trial label per row instead")
        if trials not in X.columns:
            raise ValueError(f"trials={trials!r} is not a column of X; columns are "
                             f"{[str(c) for c in X.columns]}")
        return X.drop(columns=[trials]), ("column", _labels_of(X[trials].to_numpy(),
                                                               f"column {trials!r}"))
    return X, trials


def _labels_of(values, what):
    arr = np.asarray(values)
    if arr.ndim != 1:
        raise ValueError(f"trials must be one label per row (1-D), got shape {arr.shape}")
    missing = np.array([v is None or (isinstance(v, float) and np.isnan(v))
                        or type(v).__name__ in ("NAType", "NaTType") for v in arr.tolist()])
    if missing.any():
        k = int(np.flatnonzero(missing)[0])
        raise ValueError(f"trials ({what}) has no label at row {k + 1}; every row needs its "
                         "trial (drop the row, or mark a gap with NaN in the data instead)")
    return arr


def resolve_trials(trials, data, *, default_gaps=False):
    """The :class:`Trials` of ``data`` for a ``trials=`` argument, or None.

    ``trials`` is None (no trials; with ``default_gaps`` the NaN-separated
    pieces), ``"gaps"``, or one label per row (already taken out of a
    DataFrame by :func:`split_trial_column`, or given by the caller).
    """
    T = data.shape[0]
    valid = ~np.isnan(np.asarray(data.values, dtype=np.float64)).any(axis=1)
    if trials is None and not default_gaps:
        return None
    if trials is None or (isinstance(trials, str) and trials == "gaps"):
        s, e = gap_free_runs(valid)
        if s.size == 0:
            raise ValueError("X has no complete sample: every row contains NaN")
        return Trials(s, e, [str(k + 1) for k in range(s.size)], "gaps", valid)
    source = "labels"
    if isinstance(trials, tuple) and len(trials) == 2 and trials[0] == "column":
        source, trials = "column", trials[1]
    lab = _labels_of(trials if not hasattr(trials, "to_numpy") else trials.to_numpy(),
                     "the labels" if source == "labels" else "the trial column")
    if lab.shape[0] != T:
        raise ValueError(f"trials has {lab.shape[0]} labels but the data have {T} rows")
    text = np.array([str(v) for v in lab.tolist()], dtype=object)
    change = np.flatnonzero(text[1:] != text[:-1]) + 1
    start = np.concatenate(([0], change))
    stop = np.concatenate((change, [T]))
    labels = text[start]
    seen = {}
    for k, lb in enumerate(labels.tolist()):
        if lb in seen:
            raise ValueError(f"trial {lb!r} comes back at row {int(start[k]) + 1} after other "
                             f"trials (it started at row {int(start[seen[lb]]) + 1}); the rows "
                             "of a trial must be contiguous (sort the table by trial first)")
        seen[lb] = k
    return Trials(start, stop, labels.tolist(), source, valid)
