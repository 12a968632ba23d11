"""Reports: the library's results on one recording, gathered for people and programs.

Two jobs, one function and one report type each:

:func:`leadlag` -> :class:`LeadLagReport`
    Which channel leads which: the area matrix, the cyclic order with each
    channel's position in the cycle (radians) and the fit, leaders and
    laggers, and optionally rolling windows, surrogate significance and a
    block bootstrap of the positions.
:func:`loop` -> :class:`LoopReport`
    A loop in one plane: signed and absolute area, faces and lobes, the
    per-cycle integral (energy per cycle) and optionally a region integral of
    a weight formula.

A report holds the library's own result objects (``report.areas`` is the
:class:`~wedgepath.AreaMatrix`, ``report.order`` the
:class:`~wedgepath.CyclicOrder`, ...) and renders them four ways:

``to_dict()``
    The JSON result (``schema`` names the format and its version).
``tables()``
    File name -> pandas DataFrame (the CSV tables of the command line).
``summary()``
    Text lines for people.
``figures()``
    File name -> matplotlib Figure (needs the ``plot`` extra).

The names of the files a report will give are known before computing it:
:func:`leadlag_files` and :func:`loop_files` (and ``report.planned_files``,
which agrees with them).  The command line (``wedgepath leadlag``,
``wedgepath loop``) and the demo are thin layers over this module.

Row numbers: wherever a report names a row of the data (a gap-free stretch,
a window, a cycle's start without times), it counts data rows from 1, the
first row after the header, in the text and in the JSON alike.
"""

from __future__ import annotations

import dataclasses
import math
import warnings
from dataclasses import dataclass, field
from typing import Mapping

import numpy as np

__all__ = ["leadlag", "loop", "leadlag_stream", "LeadLagReport", "LoopReport", "leadlag_files",
           "loop_files", "SCHEMA_VERSION", "ENERGY_FORMS", "WEIGHT_WORK_LIMIT", "weight_levels",
           "parse_weight"]

#: version of the JSON results (``wedgepath.leadlag/N``, ``wedgepath.loop/N``): it changes
#: when a key changes meaning or disappears.  3: row numbers (``significance.rows``, the
#: rows of windows, cycle bounds without times) count from 1, as in the text.
SCHEMA_VERSION = 3

#: the per-cycle integrals a loop report can give
ENERGY_FORMS = ("y_dx", "x_dy")
#: what the command line and the loop report say about engineering decisions
LOOP_CAUTION = ("these numbers describe the measured loop only; acceptance of dampers, "
                "bearings or joints and fatigue life are governed by the applicable codes "
                "and decided by qualified (licensed) engineers")

ZERO_MATRIX_NOTE = ("the area matrix is zero: no channel leads another (constant or "
                    "proportional channels, or no closed stretch); there is no cyclic order")

#: how many pairs the summary lists by name
LISTED_PAIRS = 10


# =========================================================================== file names
def leadlag_files(figures: bool = False, *, window: bool = False, significance: bool = False,
                  json_name: str = "result.json", trials: bool = False,
                  bands: bool = False) -> list:
    """The files a lead-lag report gives with these options (``manifest.json`` not included).

    Examples
    --------
    >>> from wedgepath import report
    >>> report.leadlag_files(figures=True, window=True)
    ['result.json', 'area_matrix.csv', 'pairs.csv', 'rolling.csv', 'positions.png', \
'pairs.png', 'rolling.png']
    """
    names = [json_name, "area_matrix.csv", "pairs.csv"]
    if window:
        names.append("rolling.csv")
    if significance:
        names += ["pvalues.csv", "qvalues.csv"]
    if trials:
        names.append("trials.csv")
    if bands:
        names.append("bands.csv")
    if figures:
        names += ["positions.png", "pairs.png"] + (["rolling.png"] if window else [])
        if bands:
            names.append("bands.png")
    return names


def loop_files(figures: bool = False, *, json_name: str = "result.json",
               rainflow: bool = False) -> list:
    """The files a loop report gives (``manifest.json`` not included).

    Examples
    --------
    >>> from wedgepath import report
    >>> report.loop_files(figures=True)
    ['result.json', 'cycles.csv', 'loop.png', 'cycles.png']
    """
    return ([json_name, "cycles.csv"] + (["rainflow.csv"] if rainflow else [])
            + (["loop.png", "cycles.png"] if figures else []))


# =========================================================================== fields
def _time_values(t):
    """Times as reported: ISO-8601 text stays text, numbers become float."""
    t = np.asarray(t)
    return t if t.dtype.kind in "UO" else t.astype(float)


def _rolling_parts(r):
    """(areas, first row, last row, start time, stop time) of a RollingAreas (rows from 1).

    The times are in the input's form: ISO-8601 text for datetimes, numbers otherwise.
    """
    return (np.asarray(r.areas, dtype=float), np.asarray(r.start, dtype=np.int64) + 1,
            np.asarray(r.stop, dtype=np.int64), _time_values(r.start_time),
            _time_values(r.stop_time))


def _cycle_parts(c):
    """(values, start, stop, start time, stop time) of a CycleAreas."""
    return (np.asarray(c.values, dtype=float), np.asarray(c.start, dtype=float),
            np.asarray(c.stop, dtype=float), c.start_time, c.stop_time)


# =========================================================================== input
def _unpack(data, times, names, what="data"):
    """``(values (T, n) float, times (a TimeAxis) or None, names tuple of str)`` of an input.

    ``data``: an :class:`~wedgepath.io.Table` (its times and names are used), a pandas
    DataFrame (its columns name the channels; a DatetimeIndex, TimedeltaIndex or numeric
    index other than the row numbers is its time axis), a :class:`~wedgepath.Path`, or an
    array (T, n).  Times may be numbers, datetimes (numpy, pandas, ISO text) or
    timedeltas; they are kept as a ``TimeAxis``, so that results
    report them in the input's form.  The caller's arrays are never changed.
    """
    from .calculus import Path
    from .io import Table
    from ._validation import check_time_axis
    from .signals._kernel import index_time_axis

    if isinstance(data, Table):
        values, nm = data.values, data.names
        t = data.time_axis if data.time_axis is not None else data.times
    elif isinstance(data, Path):
        values, t, nm = data.points, data.time_axis, data.names
    elif hasattr(data, "columns") and hasattr(data, "to_numpy"):   # a pandas DataFrame
        from .signals._kernel import _frame_values
        values, nm = _frame_values(data, what)
        t = index_time_axis(data, what) if times is None else None
    else:
        values, t, nm = data, None, None
    from ._validation import as_float_array
    values = as_float_array(values, what, ndim=2, allow_nan=True)
    if times is not None:
        t = times
    if t is not None:
        nt = len(t)
        if nt != values.shape[0]:
            raise ValueError(f"times has {nt} entries for {values.shape[0]} samples")
        t = check_time_axis(t, values.shape[0])
    if names is not None:
        nm = names
    if nm is None:
        nm = [str(k) for k in range(values.shape[1])]
    if isinstance(nm, str) or len(nm) != values.shape[1]:
        raise ValueError(f"names must name the {values.shape[1]} channels, got {nm!r}")
    nm = tuple(str(n) for n in nm)
    if len(set(nm)) != len(nm):
        raise ValueError(f"names repeat: {list(nm)}")
    return values, t, nm


def _seconds(times):
    """Sample times as float numbers (elapsed seconds for date/times) for slicing."""
    return np.asarray(getattr(times, "values", times), dtype=float)


def _longest_gap_free(values):
    """Row range [a, b) (from 0) of the longest run without NaN."""
    good = ~np.isnan(values).any(axis=1)
    edges = np.flatnonzero(np.diff(np.concatenate(([0], good.view(np.int8), [0]))))
    if edges.size == 0:
        return 0, 0
    starts, stops = edges[0::2], edges[1::2]
    k = int(np.argmax(stops - starts))
    return int(starts[k]), int(stops[k])


# =========================================================================== text helpers
def _jsonable(obj):
    if isinstance(obj, Mapping):
        return {str(k): _jsonable(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [_jsonable(v) for v in obj]
    if isinstance(obj, np.ndarray):
        return _jsonable(obj.tolist())
    if isinstance(obj, (bool, np.bool_)):
        return bool(obj)
    if isinstance(obj, np.integer):
        return int(obj)
    if isinstance(obj, (float, np.floating)):
        v = float(obj)
        return None if not math.isfinite(v) else v
    return obj


def sig3(v) -> str:
    """A number to 3 significant digits (``0.028000000000000004`` -> ``0.028``)."""
    v = float(v)
    return "nan" if math.isnan(v) else f"{v:.3g}"


def _plural(k, word, plural=None):
    return f"{k} {word if k == 1 else (plural or word + 's')}"


def matrix_lines(M, names, indent="  ", digits=4, max_name=16):
    """A matrix as text with a name column and columns always at least two spaces apart.

    Examples
    --------
    >>> from wedgepath.report import matrix_lines
    >>> print("\\n".join(matrix_lines([[0, -8.122e-05], [8.122e-05, 0]], ["a", "b"])))
                  a           b
      a           0  -8.122e-05
      b   8.122e-05           0
    """
    M = np.asarray(M, dtype=float)
    cells = [[("nan" if math.isnan(v) else f"{v:.{digits}g}") for v in row] for row in M]
    shown = [n if len(n) <= max_name else n[:max_name - 1] + "…" for n in names]
    w = max([len(c) for row in cells for c in row] + [len(n) for n in shown] + [1])
    first = max(len(n) for n in shown)
    lines = [indent + " " * first + "".join("  " + n.rjust(w) for n in shown)]
    for n, row in zip(shown, cells):
        lines.append(indent + n.ljust(first) + "".join("  " + c.rjust(w) for c in row))
    return lines


# =========================================================================== the result mixin
class _Report:
    """What every report shares: a short repr, an HTML table for notebooks, file names."""

    __slots__ = ()

    def _summary_items(self):  # pragma: no cover - each report defines it
        raise NotImplementedError

    def __repr__(self):
        items = ", ".join(f"{k}={v}" for k, v in self._summary_items())
        text = f"{type(self).__name__}({items})"
        return text if len(text) <= 120 else text[:116] + "...)"

    def _repr_html_(self):
        import html
        rows = "".join(f"<tr><th style='text-align:left'>{html.escape(k)}</th>"
                       f"<td>{html.escape(str(v))}</td></tr>" for k, v in self._summary_items())
        head = f"<b>{html.escape(type(self).__name__)}</b>"
        try:
            frame = self.to_frame().head(10)._repr_html_()
        except ImportError:
            frame = ""
        return f"<div>{head}<table>{rows}</table>{frame}</div>"

    def text(self) -> str:
        """The summary as one string."""
        return "\n".join(self.summary())

    def files(self, figures: bool = False) -> dict:
        """Every file of the report (name -> str, bytes, DataFrame or Figure) by its plan.

        The JSON result is text; tables are DataFrames; figures are matplotlib Figures
        (``wedgepath._outputs.encode`` turns each into bytes).
        """
        from ._outputs import json_text
        out = {self.planned_files(False)[0]: json_text(self.to_dict())}
        out.update(self.tables())
        if figures:
            out.update(self.figures())
        return out


# =========================================================================== lead-lag
@dataclass(frozen=True, slots=True, repr=False, eq=False)
class LeadLagReport(_Report):
    """Which channel leads which, for one recording: the result of :func:`leadlag`.

    Attributes
    ----------
    names : tuple of str
        The channels.
    samples : int
        Rows of the recording.
    closure, normalize : str, str or None
        The conventions of the area matrix.
    areas : AreaMatrix
        The matrix as reported (normalised when ``normalize`` is set).
    raw : AreaMatrix
        The oriented areas (the same object as ``areas`` without ``normalize``).
    order : CyclicOrder or None
        The cyclic order; None when the area matrix is zero (a note says so).
    fit_baseline : float or None
        The fit that independent noise gives for this many channels
        (:func:`~wedgepath.noise_fit_baseline`).
    net_lead : numpy.ndarray (n,)
        Row sums of the matrix: how much each channel leads all the others.
    top : int
        How many leaders and laggers the summary lists.
    rolling : RollingAreas or None
        Raw areas over sliding windows (``window``, ``step`` samples).
    significance : SurrogateResult or None
        Surrogate test of every pair, pooled over the trials (the pieces
        between gaps, or ``trials``): its ``design`` says how.
        ``significance_rows`` is the first and last data row used (from 1).
    bootstrap : BootstrapResult or None
        Bootstrap of the area matrix over the same trials (replicates kept;
        blocks or whole trials, its ``resample`` says which), which gives
        the intervals of the positions.
    trials : AreaMatrix or None
        With a trial column: the raw area matrix of every trial and pooled
        (``trials.csv``, the JSON's ``trials``).
    position_low, position_high : numpy.ndarray (n,) or None
        Percentile interval (radians, at the bootstrap's confidence) of each
        channel's position in the cycle, from the cyclic orders of the
        bootstrap replicates; ``position_low`` may exceed ``position_high``
        where the interval wraps past 2π.
    notes : tuple of str
        Warnings of the library and remarks; the summary prints them.
    times_given : bool
        Whether the rows had sample times (else windows are placed by row).
    time_name : str or None
        Name of the time column, for labels.
    units : dict
        Channel or time column name -> unit text (labels only).
    source : dict
        Where the data came from (``table``, ``time_column``), recorded in the JSON.
    streamed, chunk_rows
        Whether the table was read in chunks (:func:`leadlag_stream`).
    verdict : FitTest or None
        Calibrated test of the leading cycle against phase surrogates
        (:func:`~wedgepath.fit_test`); its p-value is also ``order.fit_pvalue``.
    drift : DriftCheck or None
        The drift's share of the areas (:func:`~wedgepath.drift_check`).
    antiphase : tuple of (str, float)
        Channels that load negatively on a dominant leading principal component
        (possibly anti-phase), with their loadings.
    structure : str or None
        ``"chain"`` (leaders and laggers mean something) or ``"ring"`` (channels
        go round the whole cycle); None for two channels or a zero matrix.
    lags : ReferenceLags or None
        Lags behind ``reference`` in time units (:func:`~wedgepath.reference_lags`).
    preprocessing : dict
        The steps applied before everything else (``invert``, ``detrend``,
        ``difference``, and the zero-phase ``bandpass`` and ``highpass``).
    spectrum : LeadSpectrum or None
        The area matrix split by frequency band (``bands=``), same closure.
    band_significance : BandSignificance or None
        Surrogate test of every band and pair (``bands=`` with
        ``n_surrogates``), on the same gap-free stretch as ``significance``.
    row_offset : int
        Added to the rows of the analysed series to give the table's data
        rows: 1 after ``difference`` (differenced row k is the change into
        data row k + 1), else 0.
    """

    names: tuple
    samples: int
    closure: str
    normalize: str | None
    areas: object
    raw: object
    order: object
    fit_baseline: float | None
    net_lead: np.ndarray
    top: int = 3
    rolling: object = None
    window: int | None = None
    step: int | None = None
    significance: object = None
    significance_rows: tuple | None = None
    bootstrap: object = None
    position_low: np.ndarray | None = None
    position_high: np.ndarray | None = None
    notes: tuple = ()
    trials: object = None
    time_unit: str | None = None
    times_given: bool = False
    time_name: str | None = None
    units: Mapping = field(default_factory=dict)
    source: Mapping = field(default_factory=dict)
    streamed: bool = False
    chunk_rows: int | None = None
    json_name: str = "result.json"
    verdict: object = None
    drift: object = None
    antiphase: tuple = ()
    structure: str | None = None
    lags: object = None
    preprocessing: Mapping = field(default_factory=dict)
    spectrum: object = None
    band_significance: object = None
    band_significance_rows: tuple | None = None
    row_offset: int = 0

    # ------------------------------------------------------------------ views
    @property
    def matrix(self) -> np.ndarray:
        """The reported matrix as an array (n, n)."""
        return np.asarray(self.areas, dtype=float)

    @property
    def raw_matrix(self) -> np.ndarray:
        return np.asarray(self.raw, dtype=float)

    def leaders(self):
        """The ``top`` channels of largest net lead (none for a zero matrix or a ring)."""
        if self.order is None or self.structure == "ring":
            return []
        rank = np.argsort(-self.net_lead, kind="stable")
        return [self.names[i] for i in rank[:min(self.top, len(self.names))]]

    def laggers(self):
        if self.order is None or self.structure == "ring":
            return []
        rank = np.argsort(-self.net_lead, kind="stable")
        return [self.names[i] for i in rank[::-1][:min(self.top, len(self.names))]]

    def significant_pairs(self, alpha=0.05):
        """``[(i, j), ...]`` (i < j) with q <= alpha, strongest first."""
        if self.significance is None:
            return []
        q = np.asarray(self.significance.qvalues, dtype=float)
        M = self.matrix
        n = len(self.names)
        pairs = [(i, j) for i in range(n) for j in range(i + 1, n)
                 if np.isfinite(q[i, j]) and q[i, j] <= alpha]
        return sorted(pairs, key=lambda ij: (-abs(M[ij]), q[ij]))

    def to_frame(self):
        """One row per pair i < j, strongest first: ``channel_i, channel_j, area, normalized,
        direction, p, q, low, high`` (NaN where not computed; ``low``/``high`` the
        bootstrap interval of the raw area)."""
        import pandas as pd
        n = len(self.names)
        raw, M = self.raw_matrix, self.matrix
        p = q = lo = hi = None
        if self.significance is not None:
            p = np.asarray(self.significance.pvalues, dtype=float)
            q = np.asarray(self.significance.qvalues, dtype=float)
        if self.bootstrap is not None:
            lo = np.asarray(self.bootstrap.low, dtype=float)
            hi = np.asarray(self.bootstrap.high, dtype=float)
        rows = []
        for i in range(n):
            for j in range(i + 1, n):
                v = M[i, j]
                direction = "none" if v == 0 or not np.isfinite(v) else \
                    ("i leads j" if v > 0 else "j leads i")
                rows.append({
                    "i": i, "j": j, "channel_i": self.names[i], "channel_j": self.names[j],
                    "area": raw[i, j],
                    "normalized": v if self.normalize else math.nan,
                    "direction": direction,
                    "p": p[i, j] if p is not None else math.nan,
                    "q": q[i, j] if q is not None else math.nan,
                    "low": lo[i, j] if lo is not None else math.nan,
                    "high": hi[i, j] if hi is not None else math.nan,
                })
        frame = pd.DataFrame(rows, columns=["i", "j", "channel_i", "channel_j", "area",
                                            "normalized", "direction", "p", "q", "low", "high"])
        key = frame["normalized"].abs() if self.normalize else frame["area"].abs()
        return frame.iloc[np.argsort(-key.to_numpy(), kind="stable")].reset_index(drop=True)

    def _summary_items(self):
        items = [("channels", len(self.names)), ("samples", self.samples),
                 ("closure", repr(self.closure))]
        if self.normalize:
            items.append(("normalize", repr(self.normalize)))
        if self.order is not None:
            items.append(("order", "->".join(self.names[k] for k in self.order.order)))
            items.append(("fit", f"{self.order.fit:.3f}"))
        if self.significance is not None:
            items.append(("significant_pairs", len(self.significant_pairs())))
        return items

    def planned_files(self, figures: bool = False) -> list:
        """The names of the files of this report (as :func:`leadlag_files` gives them)."""
        return leadlag_files(figures, window=self.rolling is not None,
                             significance=self.significance is not None,
                             json_name=self.json_name, trials=self.trials is not None,
                             bands=self.spectrum is not None)

    # ------------------------------------------------------------------ the JSON
    def to_dict(self) -> dict:
        """The JSON result (plain Python: dicts, lists, numbers, None for non-finite)."""
        from . import __version__
        names = list(self.names)
        n = len(names)
        d = {
            "schema": f"wedgepath.leadlag/{SCHEMA_VERSION}",
            "wedgepath_version": __version__,
            "channels": names,
            "samples": int(self.samples),
            "closure": self.closure,
            "normalize": self.normalize,
            "area_matrix": self.matrix,
            "raw_area_matrix": self.raw_matrix,
        }
        co = self.order
        if co is None:
            d["cyclic_order"] = None
        else:
            pos = np.asarray(co.positions, dtype=float)
            mod = np.asarray(co.moduli, dtype=float)
            d["cyclic_order"] = {
                "order": [names[i] for i in co.order],
                "positions_rad": {names[i]: float(pos[i]) for i in range(n)},
                "fit": float(co.fit),
                "fit_pvalue": co.fit_pvalue,
                "noise_fit": self.fit_baseline,
                "moduli": {names[i]: float(mod[i]) for i in range(n)},
            }
            if self.position_low is not None:
                d["cyclic_order"]["positions_low_rad"] = dict(zip(names, self.position_low))
                d["cyclic_order"]["positions_high_rad"] = dict(zip(names, self.position_high))
                d["cyclic_order"]["confidence"] = float(self.bootstrap.confidence)
        d["net_lead"] = {names[i]: float(self.net_lead[i]) for i in range(n)}
        d["structure"] = self.structure
        d["leaders"] = self.leaders()
        d["laggers"] = self.laggers()
        d["preprocessing"] = dict(self.preprocessing)
        if self.verdict is not None:
            v = self.verdict
            d["verdict"] = {"above_noise": v.above, "pvalue": v.pvalue, "level": 0.05,
                            "statistic": "leading eigenvalue of the standardised area matrix",
                            "strength": v.strength, "null_median": v.null_median,
                            "null_q95": v.null_q95, "method": "phase surrogates",
                            "n_surrogates": v.n_surrogates, "seed": v.seed,
                            "drift_removed": v.closure == "detrend"}
        if self.drift is not None:
            d["drift"] = {"share": float(self.drift.overall), "dominated": self.drift.dominated,
                          "worst_pair": list(self.drift.worst),
                          "pair_share": np.asarray(self.drift.share, dtype=float)}
        d["antiphase"] = {nm: float(v) for nm, v in self.antiphase}
        if self.lags is not None:
            lg = self.lags
            d["lags"] = ({nm: float(v) for nm, v in zip(names, lg.lags)}
                         if lg.narrowband else None)
            d["lags_info"] = {"reference": lg.reference, "narrowband": lg.narrowband,
                              "period": float(lg.period), "band_share": float(lg.band_share),
                              "time_unit": self._duration_unit(),
                              "low": dict(zip(names, np.asarray(lg.low, dtype=float))),
                              "high": dict(zip(names, np.asarray(lg.high, dtype=float))),
                              "coherence": dict(zip(names, np.asarray(lg.coherence, float))),
                              "confidence": float(lg.confidence), "n_boot": int(lg.n_boot),
                              "resampled": bool(lg.resampled),
                              "sign": "positive when the channel lags the reference"}
        d["notes"] = list(self.notes)
        if self.rolling is not None:
            areas, r0, r1, t0, t1 = _rolling_parts(self.rolling)
            r0, r1 = r0 + self.row_offset, r1 + self.row_offset
            d["rolling"] = {"window": self.window, "step": self.step,
                            "first_row": r0, "last_row": r1,
                            "start_time": t0 if self.times_given else r0.astype(float),
                            "end_time": t1 if self.times_given else r1.astype(float),
                            "time_unit": self.rolling.time_unit if self.times_given
                            else "row",
                            "areas": areas}
        if self.significance is not None:
            s = self.significance
            d["significance"] = {
                "rows": list(self.significance_rows),
                "method": s.method, "n_surrogates": int(s.n_surrogates),
                "seed": s.seed, "pieces": int(s.trials), "design": s.design,
                "pvalues": np.asarray(s.pvalues, dtype=float),
                "qvalues": np.asarray(s.qvalues, dtype=float),
                "significant_pairs": [[names[i], names[j]] for i, j in self.significant_pairs()],
            }
        if self.bootstrap is not None:
            b = self.bootstrap
            d["bootstrap"] = {"rows": list(self.significance_rows),
                              "n_boot": int(b.n_boot),
                              "block": None if b.block is None else int(b.block),
                              "resample": b.resample, "units_resampled": int(b.trials),
                              "confidence": float(b.confidence),
                              "low": np.asarray(b.low, dtype=float),
                              "high": np.asarray(b.high, dtype=float)}
        if self.trials is not None:
            tr = self.trials
            d["trials"] = {
                "labels": list(tr.trials),
                "first_row": np.asarray(tr.trial_start, dtype=np.int64) + 1,
                "last_row": np.asarray(tr.trial_stop, dtype=np.int64),
                "raw_area_matrices": {lab: np.asarray(tr.trial_values[k], dtype=float)
                                      for k, lab in enumerate(tr.trials)},
                "pooled_raw_area_matrix": np.asarray(tr.values, dtype=float)}
        if self.times_given:
            d["time_unit"] = self.time_unit
        if self.spectrum is not None:
            sp = self.spectrum
            d["bands"] = {"names": list(sp.band_names),
                          "low": np.asarray(sp.bands, dtype=float)[:, 0],
                          "high": np.asarray(sp.bands, dtype=float)[:, 1],
                          "frequency_unit": self._frequency_unit(),
                          "closure": sp.closure,
                          "irregular_times": sp.irregular,
                          "areas": np.asarray(sp.areas, dtype=float),
                          "normalized": np.asarray(sp.normalized, dtype=float),
                          "outside_bands": np.asarray(sp.rest, dtype=float)}
            if sp.resampling_error is not None:
                d["bands"]["resampling_error"] = np.asarray(sp.resampling_error, dtype=float)
            if self.band_significance is not None:
                bs = self.band_significance
                d["bands"]["significance"] = {
                    "rows": list(self.band_significance_rows or ()), "method": bs.method,
                    "n_surrogates": int(bs.n_surrogates), "seed": bs.seed,
                    "pvalues": np.asarray(bs.pvalues, dtype=float),
                    "qvalues": np.asarray(bs.qvalues, dtype=float),
                    "adjusted_over": "all pairs and bands"}
        if self.streamed:
            d["streamed"] = True
            d["chunk_rows"] = self.chunk_rows
        d["input"] = dict(self.source)
        d["units"] = dict(self.units)
        return _jsonable(d)

    # ------------------------------------------------------------------ tables
    def tables(self) -> dict:
        """CSV tables, file name -> pandas DataFrame.

        ``area_matrix.csv`` (the matrix shown, rows and columns by channel),
        ``pairs.csv`` (:meth:`to_frame`), ``rolling.csv`` (one row per window:
        rows, times and the raw ``A[i, j]`` of every pair ``i|j``),
        ``pvalues.csv``/``qvalues.csv`` (matrix layout).
        """
        import pandas as pd
        names = list(self.names)

        def matrix(M):
            f = pd.DataFrame(np.asarray(M, dtype=float), index=names, columns=names)
            f.index.name = "channel"
            return f
        out = {"area_matrix.csv": matrix(self.matrix), "pairs.csv": self.to_frame()}
        if self.rolling is not None:
            areas, r0, r1, t0, t1 = _rolling_parts(self.rolling)
            n = len(names)
            cols = {"first_row": r0 + self.row_offset, "last_row": r1 + self.row_offset}
            if self.times_given:
                cols["start_time"], cols["end_time"] = t0, t1
            for i in range(n):
                for j in range(i + 1, n):
                    cols[f"{names[i]}|{names[j]}"] = areas[:, i, j]
            out["rolling.csv"] = pd.DataFrame(cols)
        if self.significance is not None:
            out["pvalues.csv"] = matrix(self.significance.pvalues)
            out["qvalues.csv"] = matrix(self.significance.qvalues)
        if self.trials is not None:
            out["trials.csv"] = self.trials.to_frame()
        if self.spectrum is not None:
            f = self.spectrum.to_frame()
            if self.band_significance is not None:
                g = self.band_significance.to_frame()
                f["p"] = g["p"].to_numpy()
                f["q"] = g["q"].to_numpy()
            out["bands.csv"] = f
        return out

    # ------------------------------------------------------------------ text
    def summary(self) -> list:
        """The report for people, as text lines."""
        names = list(self.names)
        n = len(names)
        what = f"lead strength ({self.normalize})" if self.normalize else "area matrix"
        lines = [f"{n} channels, {self.samples} samples, closure={self.closure}"
                 + (f", read in chunks of {self.chunk_rows} rows" if self.streamed else ""),
                 f"\n{what}: A[i, j] > 0 means row i leads column j"]
        lines += matrix_lines(self.matrix, names)
        co = self.order
        if co is None:
            lines.append("\nno channel leads another: the area matrix is zero")
        elif n == 2:
            M = self.matrix
            a, b = (0, 1) if M[0, 1] >= 0 else (1, 0)
            lines.append(f"\n{names[a]} leads {names[b]} (A = {abs(M[0, 1]):.6g})")
        else:
            seq = [names[i] for i in co.order]
            lines.append("\ncyclic order (each leads the next): " + " -> ".join(seq)
                         + f" -> {seq[0]}")
            pos = np.asarray(co.positions, dtype=float)
            ref = int(co.order[0])
            if self.position_low is None:
                shown = ", ".join(f"{names[i]} {pos[i]:.2f}" for i in co.order[1:])
            else:
                shown = ", ".join(f"{names[i]} {pos[i]:.2f} [{self.position_low[i]:.2f}, "
                                  f"{self.position_high[i]:.2f}]" for i in co.order[1:])
            lines.append(f"positions in the cycle after {names[ref]} (rad, 0 to 2π; they keep "
                         "the order, not the delays): " + shown)
            if self.position_low is not None:
                wraps = bool(np.any(self.position_low > self.position_high))
                b = self.bootstrap
                how = (f"resampling {b.trials} whole trials" if b.resample == "trials" else
                       f"blocks of {b.block} samples" + (f" within {b.trials} trial pieces"
                                                         if b.trials > 1 else ""))
                lines.append(f"  [low, high]: {100 * float(b.confidence):.0f}% "
                             f"interval from {b.n_boot} bootstrap replicates ({how})"
                             + ("; low > high: the interval wraps past 2π" if wraps else ""))
            fit = float(co.fit)
            if n <= 3:
                lines.append(f"fit {fit:.3f}: always 1 for {n} channels (it says nothing here)")
            else:
                lines.append(f"fit {fit:.3f}: share of the lead-lag pattern in the leading "
                             "cycle")
            lines += self._verdict_lines()
            if self.structure == "ring":
                lines.append("ring: the channels go round the whole cycle, so no channel "
                             "comes first; read the positions" +
                             (" and the lags below" if self.lags is not None else
                              " (and --reference COL for lags in time units)") +
                             ", not leaders and laggers")
            else:
                lines.append(("chain: the channels sit on one side of the cycle; "
                              if self.structure == "chain" else "") +
                             "strongest leaders: " + ", ".join(self.leaders()))
                lines.append("strongest laggers: " + ", ".join(self.laggers()))
        if n == 2 and co is not None:
            lines += self._verdict_lines()
        lines += self._lag_lines()
        if self.rolling is not None:
            K = len(np.asarray(self.rolling))
            lines.append(f"\nrolling windows: {_plural(K, 'window')} of {self.window} samples, "
                         f"step {self.step} (raw areas)")
        if self.significance is not None:
            s = self.significance
            pairs = self.significant_pairs()
            q = np.asarray(s.qvalues, dtype=float)
            M = self.matrix
            head = (f"\nsignificance ({s.method} surrogates, {s.n_surrogates}, seed "
                    f"{s.seed}): {_plural(len(pairs), 'pair')} at 5% false "
                    "discovery rate")
            if len(pairs) > LISTED_PAIRS:
                head += f"; the {LISTED_PAIRS} strongest:"
            elif pairs:
                head += ":"
            lines.append(head)
            if getattr(s, "trials", 1) > 1:
                lines.append(f"  surrogates: {s.design}")
            for i, j in pairs[:LISTED_PAIRS]:
                a, b = (i, j) if M[i, j] > 0 else (j, i)
                lines.append(f"  {names[a]} leads {names[b]}: A = {abs(M[i, j]):.4g}, "
                             f"q = {sig3(q[i, j])}")
        if self.antiphase:
            who = ", ".join(f"{nm} ({v:+.2f})" for nm, v in self.antiphase)
            flip = ",".join(nm for nm, _ in self.antiphase)
            lines.append(f"note: {who} load{'s' if len(self.antiphase) == 1 else ''} "
                         "negatively on the leading principal component: "
                         f"{'it' if len(self.antiphase) == 1 else 'they'} may move in "
                         "anti-phase (countercyclical), which turns lag into lead; if so, "
                         f"flip with --invert {flip} (invert=[...] in the API)")
        if self.preprocessing:
            du = self._duration_unit()          # periods of the filters, in their unit
            steps = ", ".join(k if v is True else
                              f"{k} {v} {du}" if du and k in ("bandpass", "highpass") else
                              f"{k} {v}" for k, v in self.preprocessing.items())
            if "bandpass" in self.preprocessing or "highpass" in self.preprocessing:
                steps += " (zero-phase filters)"
            if "difference" in self.preprocessing:
                # a first difference is not zero phase: it moves every channel by half a
                # sample, the same for all, so relative leads and lags are unchanged
                steps += " (half a sample later for every channel; relative lags unchanged)"
            lines.append(f"preprocessing: {steps}")
        if self.spectrum is not None:
            lines += self._band_lines()
        for note in self.notes:
            lines.append("note: " + note)
        return lines

    def _verdict_lines(self):
        v = self.verdict
        if v is None:
            return []
        word = "above noise" if v.above else "not above noise"
        return [f"leading cycle: {word} at 5% (p = {sig3(v.pvalue)}; null: each channel keeps "
                f"its spectrum, no timing between channels; {v.n_surrogates} phase "
                "surrogates" + (", drift removed" if v.closure == "detrend" else "") + ")"
                + ("" if v.above else "; treat the order with caution")] + \
            self._narrowband_hint()

    def _narrowband_hint(self):
        """Why a clean oscillation can fail the verdict: one frequency, one phase difference."""
        v, lg = self.verdict, self.lags
        if v is None or v.above or lg is None or not lg.narrowband:
            return []
        return [f"  the data are narrow-band ({100 * lg.band_share:.0f}% of {lg.reference}'s "
                "power near its peak period): one frequency carries one phase difference, "
                "which chance makes as easily as timing, so this test has little power here; "
                f"the lags behind {lg.reference} and their intervals say more"]

    def _lag_lines(self):
        lg = self.lags
        if lg is None:
            return []
        given = self.units.get(self.time_name) if self.time_name else None
        unit = self._duration_unit()
        u = f" {unit}" if unit else (" samples" if not self.times_given else " time units")
        scale = 1.0
        if not given and _in_seconds(self.time_unit):
            # datetimes: lags in seconds, shown in the largest unit the period spans twice
            # (days for daily data, not 3.4e+05 s); the JSON keeps seconds
            for name, sec in (("d", 86400.0), ("h", 3600.0), ("min", 60.0)):
                if np.isfinite(lg.period) and lg.period >= 2 * sec:
                    u, scale = f" {name}", sec
                    break
        if not lg.narrowband:
            return [f"\nlags behind {lg.reference}: not given -- the data are broad-band "
                    f"(only {100 * lg.band_share:.0f}% of {lg.reference}'s power lies near its "
                    "peak period), so no single lag is defined; band-pass first "
                    "(--bandpass LOW,HIGH) to ask about one band"]
        out = [f"\nlags behind {lg.reference} (period {lg.period / scale:.4g}{u}; positive: lags; "
               f"{100 * lg.confidence:.0f}% block-bootstrap interval"
               + ("; irregular times resampled linearly" if lg.resampled else "") + "):"]
        for k, nm in enumerate(self.names):
            if nm == lg.reference:
                continue
            out.append(f"  {nm}: {lg.lags[k] / scale:+.4g}{u} [{lg.low[k] / scale:+.4g}, "
                       f"{lg.high[k] / scale:+.4g}]"
                       + (f"  (coherence {lg.coherence[k]:.2f}: weak)" if lg.coherence[k] < 0.5
                          else ""))
        return out

    def _duration_unit(self):
        """The unit of lags and periods: the time column's, seconds on a datetime axis."""
        return _duration_unit(self.time_unit, self.time_name, self.units)

    def _frequency_unit(self) -> str:
        """What band edges are measured in, named after the time column when there is one."""
        sp = self.spectrum
        if self.times_given:
            unit = self._duration_unit()
            if unit:
                return f"cycles per {unit}"
            if self.time_name:
                return f"cycles per unit of {self.time_name}"
        return sp.frequency_unit

    def _band_lines(self) -> list:
        sp = self.spectrum
        names = list(self.names)
        S = np.asarray(sp.areas, dtype=float)
        B, n = S.shape[0], len(names)
        total = S.sum(axis=0) + np.asarray(sp.rest, dtype=float)
        edges = np.asarray(sp.bands, dtype=float)
        lines = [f"\nby frequency band ({_plural(B, 'band')}, {self._frequency_unit()}; raw "
                 "areas, +: the first-named channel leads in that band):"]
        strength = np.max(np.abs(S), axis=0) if B else np.zeros((n, n))
        cand = sorted(((strength[i, j], i, j) for i in range(n) for j in range(i + 1, n)),
                      reverse=True)
        shown = [c for c in cand if c[0] > 0][:self.top]
        if not shown:
            lines.append("  no band holds any area")
        q = None if self.band_significance is None else \
            np.asarray(self.band_significance.qvalues, dtype=float)
        for _, i, j in shown:
            b = int(np.argmax(np.abs(S[:, i, j])))
            a, c = (i, j) if S[b, i, j] >= 0 else (j, i)
            parts = []
            for k in np.argsort(edges[:, 0], kind="stable"):
                txt = f"{sp.band_names[k]} {S[k, a, c]:+.4g}"
                if q is not None:
                    txt += f" (q {sig3(q[k, a, c])})"
                parts.append(txt)
            lines.append(f"  {names[a]} vs {names[c]}: " + ", ".join(parts)
                         + f"; all frequencies {total[a, c]:+.4g}")
            opposite = np.any(S[:, a, c] > 0) and np.any(S[:, a, c] < 0)
            if opposite and abs(total[a, c]) < 0.5 * float(np.max(np.abs(S[:, a, c]))):
                lines.append("    opposite leads in different bands partly cancel in the "
                             "all-frequency area")
        if np.any(np.asarray(sp.rest) != 0):
            lines.append("  (area at frequencies outside the bands: bands.csv and the JSON "
                         "'outside_bands')")
        if self.band_significance is not None:
            bs = self.band_significance
            k = int(np.sum(np.triu(bs.significant(), 1) if B else 0))
            lines.append(f"  band significance ({bs.method} surrogates, {bs.n_surrogates}): "
                         f"{k} of {B * n * (n - 1) // 2} band-pairs at 5% false discovery rate "
                         "(adjusted over all pairs and bands)")
        return lines

    # ------------------------------------------------------------------ figures
    def figures(self) -> dict:
        """Figures, file name -> matplotlib Figure (needs matplotlib).

        ``positions.png``: each channel's position in the cycle on a line from 0 to
        2π rad, one row per channel in cyclic order, with its bootstrap interval and
        its share in the cycle; ``pairs.png``: every pair's lead with its direction
        and significance; ``rolling.png`` (with windows): small multiples of the
        strongest pairs' raw areas over the windows.
        """
        from . import plotting
        with plotting.literal_text():
            out = {"positions.png": plotting.cycle_positions(
                       self.order, names=self.names, low=self.position_low,
                       high=self.position_high, rolling=self.rolling,
                       fit_baseline=self.fit_baseline,
                       confidence=None if self.bootstrap is None else
                       float(self.bootstrap.confidence)).figure,
                   "pairs.png": plotting.pair_chart(
                       self.areas, raw=self.raw, significance=self.significance,
                       bootstrap=self.bootstrap).figure}
            if self.rolling is not None:
                tcol = self.time_name
                xlabel = (f"window centre, {plotting.with_unit(tcol, self.units)}"
                          if self.times_given and tcol else
                          "window centre, time" if self.times_given else
                          "window centre (data row)")
                if self.time_unit == "ISO-8601" and self.rolling.start_time.size and \
                        not str(self.rolling.start_time[0]).endswith("Z") and \
                        ("+" in str(self.rolling.start_time[0])[10:]
                         or "-" in str(self.rolling.start_time[0])[10:]):
                    xlabel += " (UTC)"       # zoned times are drawn as UTC instants
                out["rolling.png"] = plotting.rolling_pairs(
                    self.rolling, names=self.names, xlabel=xlabel,
                    rows=not self.times_given,
                    title=f"Rolling lead: raw areas A[i, j] in windows of {self.window} "
                          f"samples, step {self.step}")
            if self.spectrum is not None:
                out["bands.png"] = plotting.band_leads(
                    self.spectrum, significance=self.band_significance, top=self.top,
                    frequency_unit=self._frequency_unit())
        return out


def _order_of(A, names):
    """(CyclicOrder or None, fit baseline or None, notes) of a matrix."""
    from .signals import cyclic_order
    from .signals.order import noise_fit_baseline
    Afin = np.nan_to_num(np.asarray(A, dtype=float), nan=0.0)
    if not np.any(Afin):
        return None, None, [ZERO_MATRIX_NOTE]
    co = cyclic_order(Afin)
    return co, float(noise_fit_baseline(len(names))), []


def _position_intervals(order, boot, confidence):
    """Percentile intervals of each channel's position from the bootstrap replicates.

    Each replicate's cyclic order is taken from the same reference channel; the
    deviations from the estimate's positions are wrapped into (-π, π] so that an
    interval may cross 0 = 2π.
    """
    from .signals import cyclic_order
    reps = np.asarray(boot.replicates, dtype=float)
    ref = int(order.order[0])
    est = np.asarray(cyclic_order(np.asarray(boot.estimate, dtype=float), start=ref).positions)
    devs = []
    for R in reps:
        if not np.any(R):
            continue
        p = np.asarray(cyclic_order(R, start=ref).positions)
        devs.append(np.angle(np.exp(1j * (p - est))))
    devs = np.asarray(devs)
    a = (1 - confidence) / 2
    lo = np.quantile(devs, a, axis=0)
    hi = np.quantile(devs, 1 - a, axis=0)
    base = np.asarray(order.positions, dtype=float)
    two_pi = 2 * np.pi
    return np.mod(base + lo, two_pi), np.mod(base + hi, two_pi)


def _in_seconds(time_unit) -> bool:
    """The time axis is held in seconds: datetimes (elapsed seconds) and durations."""
    return time_unit in ("ISO-8601", "s")


def _seconds_per_unit(time_unit, time_name, units) -> float:
    """Seconds per duration unit: the unit given for a date/time or duration time column
    (held in seconds), else 1 (a plain number column's unit is only a label)."""
    given = dict(units or {}).get(time_name) if time_name else None
    if not _in_seconds(time_unit) or not given:
        return 1.0
    from .signals import _units
    try:
        u = _units.parse_unit(given, f"the time column {time_name!r}")
        ok = _units.has_dimension(u, "s")
    except ValueError:
        ok = False
    if not ok:
        raise ValueError(f"the time column {time_name!r} holds dates, times or durations, so "
                         f"its unit "
                         f"{given!r} must be a unit of time (s, min, h, day, week): it sets "
                         "the unit of lags, periods and band edges")
    return _units.factor(u, _units.parse_unit("s", "seconds"))


def _duration_unit(time_unit, time_name, units):
    """The unit of durations (lags, periods, band-pass periods): the one given for the time
    column, seconds on a datetime axis without one, else None (the unit is the caller's)."""
    given = dict(units or {}).get(time_name) if time_name else None
    return given or ("s" if _in_seconds(time_unit) else None)


def _bands_per_second(bands, per):
    """Band edges given in cycles per duration unit, in cycles per second."""
    if bands is None:
        return None
    if isinstance(bands, Mapping):
        return {k: tuple(float(e) / per for e in v) for k, v in bands.items()}
    return np.asarray(bands, dtype=float) / per


def _empty_band_notes(sp, times, per, unit) -> list:
    """Notes for bands above the Nyquist frequency (they can hold no frequency of the data)."""
    t = None if times is None else np.asarray(getattr(times, "values", times), dtype=float)
    if t is None or t.size < 2:
        step = 1.0
    else:
        step = float(np.median(np.diff(t))) / per
    if not step > 0:
        return []
    nyq = 0.5 / step
    out = []
    for name, (lo, _) in zip(sp.band_names, np.asarray(sp.bands, dtype=float)):
        if lo > nyq * (1 + 1e-9):
            out.append(f"band {name} lies above the Nyquist frequency {nyq:.4g} cycles per "
                       f"{unit} (half the sampling rate): it holds no frequency of these data")
    return out


def leadlag(data, *, times=None, names=None, closure="chord", normalize=None, window=None,
            step=None, n_surrogates=None, surrogate_method="shift", seed=0, n_boot=None,
            confidence=0.95, top=3, progress=None, tol=None, time_name=None, units=None,
            source=None, trials=None, invert=None, detrend=False, difference=False,
            bandpass=None, highpass=None, reference=None, verdict_surrogates=199,
            bands=None) -> LeadLagReport:
    """The lead-lag report of a recording.

    Parameters
    ----------
    data : io.Table, pandas DataFrame, Path or array_like (T, n)
        The channels (NaN rows are gaps).
    times : array_like (T,), optional
        Sample times (default: those of ``data``, if any).
    names : sequence of str, optional
        Channel names (default: from ``data``, else ``"0", "1", ...``).
    closure, normalize, tol
        As for :func:`~wedgepath.area_matrix`.
    window, step : int, optional
        Also compute raw area matrices over sliding windows of ``window``
        samples (``step`` defaults to ``window // 4``).
    n_surrogates : int, optional
        Test every pair against this many surrogates
        (:func:`~wedgepath.surrogate_test`, ``surrogate_method``, ``seed``),
        pooled over the trials: the pieces between gaps, or ``trials``.
    n_boot : int, optional
        Bootstrap the area matrix this many times
        (:func:`~wedgepath.bootstrap_area`, ``confidence``, ``seed``; whole
        trials when there are at least 10, blocks otherwise) and give each
        channel's position in the cycle an interval.
    trials : array_like (T,) or str, optional
        The trial of each row, or the name of a DataFrame column holding it
        (that column is then not a channel): the report then holds
        the area matrix of every trial (``.trials``, ``trials.csv``), and
        the surrogates and the bootstrap stay within trials.
    top : int
        Leaders and laggers listed (for chain-like structure only: for a ring
        there is no first channel; also the pairs shown by band).
    invert : sequence of str, optional
        Channels to negate first (anti-phase channels; the summary names
        candidates).
    detrend, difference : bool
        Remove each channel's least-squares line / take first differences
        first (:mod:`wedgepath.filters`).
    bandpass : (float, float), optional
        Keep periods from ``bandpass[0]`` to ``bandpass[1]`` time units
        (zero-phase Butterworth, forward-backward).
    highpass : float, optional
        Remove periods longer than this many time units (zero phase).
    reference : str, optional
        Give each channel's lag behind this channel in time units
        (:func:`~wedgepath.reference_lags`), or say that the data are
        broad-band and no single lag is defined.
    verdict_surrogates : int or None
        Phase surrogates of the calibrated verdict on the leading cycle
        (:func:`~wedgepath.fit_test`; sets ``order.fit_pvalue``); None skips
        it.
    progress : bool or None
        Progress indicator for the surrogates and the bootstrap.
    bands : sequence of edges or mapping name -> (low, high), optional
        Also split the area matrix by frequency band
        (:func:`~wedgepath.lead_spectrum`, same closure; frequencies in
        cycles per unit of the times, per sample without them); with
        ``n_surrogates``, every band and pair is tested too
        (:func:`~wedgepath.band_surrogate_test`).
    time_name, units, source
        Labels: the time column's name, units of columns, where the data came from.

    Returns
    -------
    LeadLagReport

    Examples
    --------
    >>> import numpy as np
    >>> from wedgepath import report
    >>> t = np.linspace(0, 6 * np.pi, 600)
    >>> X = np.column_stack([np.sin(t), np.sin(t - 1), np.sin(t - 2)])
    >>> r = report.leadlag(X, names=["a", "b", "c"])
    >>> [line for line in r.summary() if "cyclic order" in line]
    ['\\ncyclic order (each leads the next): c -> a -> b -> c']
    >>> r.to_dict()["schema"], r.planned_files()
    ('wedgepath.leadlag/3', ['result.json', 'area_matrix.csv', 'pairs.csv'])
    """
    from .signals import area_matrix, bootstrap_area, rolling_area_matrix

    if isinstance(trials, str) and trials != "gaps":      # a DataFrame's trial column
        from .signals.trials import split_trial_column
        data, (_, trials) = split_trial_column(data, trials)
    values, times, names = _unpack(data, times, names)
    # the time axis's kind and unit, kept through preprocessing (which returns plain
    # elapsed times: seconds from the first sample for datetimes)
    time_unit = None if times is None else (
        "ISO-8601" if getattr(times, "kind", None) == "datetime" else
        getattr(times, "unit", None))
    n = values.shape[1]
    if n < 2:
        raise ValueError(f"lead-lag needs at least 2 channels, got {n}")
    # durations on a datetime axis are seconds inside the library; the time column's entry
    # in ``units`` (a unit of time) is the unit in which they are given and reported
    per = _seconds_per_unit(time_unit, time_name, units)
    # rows are the table's data rows: a differenced row k is the change into data row k + 1
    row_offset = 1 if difference else 0
    user_bands = bands
    if per != 1.0:
        bandpass = None if bandpass is None else (bandpass[0] * per, bandpass[1] * per)
        highpass = None if highpass is None else highpass * per
        bands = _bands_per_second(bands, per)
    if window is None and step is not None:
        raise ValueError("step needs window")
    if bands is not None:
        from .signals.spectrum import _resolve_bands
        _resolve_bands(bands)               # a bad band fails before any work
    pre = {}
    if invert:
        from .signals.filters import channel_indices
        idx = channel_indices(list(invert), names, "invert")
        values = np.array(values, dtype=float)
        values[:, idx] = -values[:, idx]
        pre["invert"] = ",".join(names[k] for k in idx)
    if detrend or difference or bandpass is not None or highpass is not None:
        from .signals.filters import preprocess
        if np.isnan(values).any():
            raise ValueError("detrend, difference and filters need gap-free data; the data "
                             "have gaps (NaN rows): split the recording at its gaps")
        axis = times
        try:
            values, times, _ = preprocess(values, times=times, names=list(names),
                                          detrend=detrend, difference=difference,
                                          bandpass=bandpass, highpass=highpass)
        except ValueError as exc:
            if not _in_seconds(time_unit):
                raise
            # on a datetime axis the filters saw seconds: say so in the caller's unit
            du = _duration_unit(time_unit, time_name, units)
            msg = str(exc).replace(" time units", " s")
            if per != 1.0:
                msg += f" (on this date/time axis 1 {du} = {per:g} s)"
            raise ValueError(msg) from None
        if times is not None and hasattr(axis, "with_values"):
            times = axis.with_values(times)     # datetimes stay datetimes in the outputs
        pre.update({k: v for k, v in (("detrend", bool(detrend)),
                                      ("difference", bool(difference))) if v})
        if bandpass is not None:
            pre["bandpass"] = f"{bandpass[0] / per:g} to {bandpass[1] / per:g}"
        if highpass is not None:
            pre["highpass"] = f"{highpass / per:g}"
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        A = area_matrix(values, times=times, closure=closure, normalize=normalize,
                        names=list(names), tol=tol)
        raw = A if normalize is None else area_matrix(values, times=times, closure=closure,
                                                      names=list(names), tol=tol)
    notes = [str(w.message) for w in caught]
    order, base, more = _order_of(A, names)
    notes += more
    M = np.nan_to_num(np.asarray(A, dtype=float), nan=0.0)
    kw = dict(names=names, samples=int(values.shape[0]), closure=closure, normalize=normalize,
              areas=A, raw=raw, order=order, fit_baseline=base, net_lead=M.sum(axis=1),
              top=int(top), times_given=times is not None, time_name=time_name,
              units=dict(units or {}), source=dict(source or {}), preprocessing=pre,
              row_offset=row_offset)
    kw.update(_honest_reading(values, times, names, order, closure, verdict_surrogates, seed,
                              reference, notes, trials=trials))
    if per != 1.0 and kw.get("lags") is not None:
        lg = kw["lags"]
        kw["lags"] = dataclasses.replace(lg, lags=lg.lags / per, low=lg.low / per,
                                         high=lg.high / per, period=lg.period / per)
    if kw.get("verdict") is not None and order is not None:
        kw["order"] = dataclasses.replace(order, fit_pvalue=kw["verdict"].pvalue)
    if window is not None:
        st = step if step is not None else max(1, window // 4)
        if window > values.shape[0]:
            raise ValueError(f"window={window} is longer than the {values.shape[0]} samples")
        kw["rolling"] = rolling_area_matrix(values, window, st, times=times, names=list(names))
        kw["window"], kw["step"] = int(window), int(st)
        if normalize is not None:
            notes.append("rolling windows hold raw areas A[i, j]; the normalisation applies "
                         "to the whole-recording matrix only")
    if trials is not None:
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always")
            kw["trials"] = area_matrix(values, times=times, closure=closure, names=list(names),
                                       tol=tol, trials=trials)
        notes += [str(w.message) for w in caught if str(w.message) not in notes]
    kw["time_unit"] = time_unit
    if bands is not None:
        from .signals import lead_spectrum
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always")
            kw["spectrum"] = lead_spectrum(values, times=times, bands=bands, closure=closure,
                                           names=list(names), tol=tol)
        notes += [str(w.message) for w in caught]
        if per != 1.0:
            from .signals.spectrum import _resolve_bands
            sp = kw["spectrum"]
            edges, bnames, _ = _resolve_bands(user_bands)      # the caller's exact edges
            kw["spectrum"] = dataclasses.replace(sp, bands=edges, band_names=bnames)
        empty = _empty_band_notes(kw["spectrum"], times, per,
                                  _duration_unit(time_unit, time_name, units) or (
                                      f"unit of {time_name}" if time_name else
                                      "unit of time" if times is not None else "sample"))
        if empty and _in_seconds(time_unit) and per == 1.0 and time_name:
            empty[-1] += (f"; band edges on this time axis are cycles per second unless the "
                          f"time column has a unit (--units {time_name}=day, or "
                          f"units={{{time_name!r}: 'day'}})")
        notes += empty
    if n_surrogates is not None or n_boot is not None:
        # every gap-free piece of every trial counts (the pieces between gaps are trials
        # when no trial column is given); the statistics are pooled over them
        from .signals._kernel import SignalData
        from .signals.trials import resolve_trials
        tr = resolve_trials(trials, SignalData(values, None, None), default_gaps=True)
        usable = (tr.piece_stop - tr.piece_start) >= 3
        if not usable.any():
            raise ValueError("significance needs a gap-free stretch of at least 3 samples")
        a, b = int(tr.piece_start[usable][0]), int(tr.piece_stop[usable][-1])
        kw["significance_rows"] = (a + 1 + row_offset, b + row_offset)
        if int(usable.sum()) > 1:
            notes.append(f"surrogates and the bootstrap pool {int(usable.sum())} gap-free "
                         f"pieces ({tr.describe()}); nothing is shuffled across a trial or a "
                         "gap")
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always")
            if n_surrogates is not None:
                from .signals import surrogate_test
                kw["significance"] = surrogate_test(values, method=surrogate_method,
                                                    n_surrogates=n_surrogates, seed=seed,
                                                    progress=progress, names=list(names),
                                                    trials=trials)
            if n_boot is not None:
                boot = bootstrap_area(values, n_boot=n_boot, confidence=confidence,
                                      seed=seed, keep=True, progress=progress,
                                      names=list(names), trials=trials)
        for w in caught:      # said once (the shape checks repeat what area_matrix said)
            if str(w.message) not in notes:
                notes.append(str(w.message))
        if n_surrogates is not None and bands is not None:
            from .signals import band_surrogate_test
            bclosure = closure if closure in ("chord", "detrend") else "chord"
            if bclosure != closure:
                notes.append(f"band significance tests chord-closed band areas (surrogates "
                             f"are closed loops; closure={closure!r} is not tested)")
            # pooled over the same trials / gap-free pieces as the pair significance
            kw["band_significance_rows"] = kw["significance_rows"]
            kw["band_significance"] = band_surrogate_test(
                values, bands=bands, method=surrogate_method, n_surrogates=n_surrogates,
                seed=seed, times=None if times is None else _seconds(times),
                names=list(names), closure=bclosure, progress=progress, trials=trials)
        if n_boot is not None:
            kw["bootstrap"] = boot
            if order is not None:
                kw["position_low"], kw["position_high"] = _position_intervals(order, boot,
                                                                              confidence)
    kw["notes"] = tuple(notes)
    return LeadLagReport(**kw)


#: rows beyond which the verdict, drift and lag checks of :func:`leadlag` use block means
#: (see docs/performance.md, bench_verdicts.py)
CHECK_ROWS = 1 << 18


def _honest_reading(values, times, names, order, closure, verdict_surrogates, seed, reference,
                    notes, trials=None):
    """Verdict, drift, anti-phase candidates, chain or ring, reference lags (issue 17).

    Computed on the longest gap-free stretch; adds to ``notes`` what a reader must know.
    """
    from .signals import FitTest, reference_lags
    from .signals.verdicts import (FIT_TEST_MAX_CHANNELS, DriftWarning, _antiphase_core, _base,
                                   _detrended, _drift_core, _fit_core, _line_removed,
                                   structure_kind)
    from ._validation import as_rng
    out = {}
    n = values.shape[1]
    a, b = _longest_gap_free(values)
    part = values[a:b]
    tpart = None if times is None else _seconds(times)[a:b]
    if reference is not None and reference not in names:
        raise ValueError(f"reference: unknown channel {reference!r}; channels are {list(names)}")
    pooled = None
    if (verdict_surrogates is not None and n <= FIT_TEST_MAX_CHANNELS
            and values.shape[0] <= CHECK_ROWS and (trials is not None
                                                   or (a, b) != (0, values.shape[0]))):
        # trials, or gap-free pieces: the verdict pools them (each piece detrended alone)
        from .signals.verdicts import _trial_base
        try:
            pooled, _ = _trial_base(values, None if times is None else _seconds(times),
                                    list(names), trials, detrend=True)
        except ValueError:
            pooled = None
        if pooled is not None and len(pooled) > 1:
            core = _fit_core(pooled, int(verdict_surrogates), 512, as_rng(seed))
            out["verdict"] = FitTest(**core, seed=seed, names=names, closure="detrend")
            notes.append(f"the calibrated verdict pools {len(pooled)} gap-free pieces (trials "
                         "of at least 8 rows, each detrended on its own)")
        else:
            pooled = None
    if b - a < 16:
        notes.append("no calibrated verdict, drift check or lags: fewer than 16 gap-free rows"
                     if pooled is None else "no drift check or lags: the longest gap-free "
                     "stretch has fewer than 16 rows")
        return out
    if (a, b) != (0, values.shape[0]):
        which = "the verdict, the drift check" if pooled is None else "the drift check"
        notes.append(f"{which} and the lags use the longest gap-free "
                     f"stretch, rows {a + 1}-{b} of {values.shape[0]}")
    if part.shape[0] > CHECK_ROWS:
        # long tables: the checks use means of blocks of m consecutive rows (the same
        # linear filter on every channel: independent channels stay independent, so the
        # verdict stays calibrated; leads faster than m samples are not seen by it)
        m = -(-part.shape[0] // CHECK_ROWS)
        k = part.shape[0] // m
        part = part[:k * m].reshape(k, m, n).mean(axis=1)
        tpart = None if tpart is None else tpart[:k * m].reshape(k, m).mean(axis=1)
        notes.append(f"the verdict, the drift check and the lags use means of blocks of {m} "
                     f"rows ({k} blocks): leads shorter than {m} samples are not seen by them")
    Y, data, ramp = _base(part, tpart, list(names))      # one prepared copy for all checks
    if verdict_surrogates is not None and pooled is None:
        if n > FIT_TEST_MAX_CHANNELS:
            notes.append(f"no calibrated verdict for more than {FIT_TEST_MAX_CHANNELS} channels")
        else:
            core = _fit_core(_detrended(Y, ramp), int(verdict_surrogates), 512, as_rng(seed))
            out["verdict"] = FitTest(**core, seed=seed, names=names, closure="detrend")
    chk = _drift_core(Y, ramp, names)
    out["drift"] = chk
    if chk.dominated and closure not in ("detrend",):
        import warnings as _w
        _w.warn(chk.message(), DriftWarning, stacklevel=3)
        notes.append(chk.message())
    # on the drift-free data: opposite trends are not opposite phases
    out["antiphase"] = tuple(_antiphase_core(_line_removed(Y, ramp), names))
    del Y
    if order is not None and n >= 3:
        out["structure"] = structure_kind(order)
    if reference is not None:
        out["lags"] = reference_lags(part, reference, times=tpart, names=list(names), seed=seed)
    return out


def leadlag_stream(source, *, columns=None, time_column=None, delimiter=None,
                   chunk_rows=50_000, top=3, progress=None, units=None,
                   table_label=None) -> LeadLagReport:
    """The lead-lag report of a table read in chunks (area matrix and cyclic order only).

    Memory stays about one chunk whatever the file's length
    (:func:`wedgepath.io.stream_area_matrix`).  ``progress`` shows the rows read
    (None: for files, estimated from their size).
    """
    from .io import stream_area_matrix

    A = stream_area_matrix(source, columns=columns, time_column=time_column,
                           delimiter=delimiter, chunk_rows=chunk_rows, progress=progress)
    names = tuple(A.names)
    order, base, notes = _order_of(A, names)
    M = np.nan_to_num(np.asarray(A, dtype=float), nan=0.0)
    return LeadLagReport(names=names, samples=int(A.samples), closure="chord", normalize=None,
                         areas=A, raw=A, order=order, fit_baseline=base,
                         net_lead=M.sum(axis=1), top=int(top), notes=tuple(notes),
                         times_given=time_column is not None, time_name=time_column,
                         units=dict(units or {}),
                         source={"table": table_label if table_label is not None else
                                 str(source), "time_column": time_column},
                         streamed=True, chunk_rows=int(chunk_rows))


# =========================================================================== weights
#: work units (about nanoseconds of numpy on one core) that integrating a weight may take:
#: evaluation points x (formula.POINT_OVERHEAD + formula.evaluation_cost(formula)); see
#: docs/cli.md and benchmarks/bench_formulas.py
WEIGHT_WORK_LIMIT = 1e9
#: the library's default refinement depth of adaptive region integrals
_ADAPTIVE_LEVELS = 30
#: points of the first adaptive pass per segment (4x4 and 5x5 Gauss rules)
_ADAPTIVE_POINTS = 41
#: work units per point of adaptive integration on top of the formula (the bookkeeping of
#: the cells; measured by benchmarks/bench_formulas.py)
ADAPTIVE_OVERHEAD = 40


def parse_weight(text, symbols):
    """A weight formula as sympy (the safe parser); errors start ``weight:``."""
    from .formula import parse_formula
    try:
        return parse_formula(text, {s.name: s for s in symbols})
    except ValueError as exc:
        raise ValueError("weight: " + str(exc).removeprefix("formula: ")) from None


def _segments(xy):
    """Segments of the closed loop (an upper bound): one per complete sample."""
    return int((~np.isnan(xy).any(axis=1)).sum())


def weight_levels(expr, symbols, segments, limit=None):
    """Refinement levels that keep integrating ``expr`` over ``segments`` within the work limit.

    A polynomial weight is integrated exactly with a fixed number of points per
    segment: refused (ValueError) when they cost more than the limit.  Any other
    weight is integrated adaptively; each level of refinement at most doubles
    the cells, so ``L`` levels cost at most ``(2**(L+1) - 1)`` times the first
    pass, and ``L`` is the largest that stays within the limit (at most the
    library's 30).
    """
    from .calculus.forms import Coefficient
    from .calculus.quadrature import points_needed
    from .formula import POINT_OVERHEAD, evaluation_cost

    limit = WEIGHT_WORK_LIMIT if limit is None else limit
    try:
        coef = Coefficient.from_sympy(expr, symbols)
    except ValueError as exc:
        raise ValueError("weight: " + str(exc).replace("form coefficient", "the formula")) \
            from None
    if coef.kind == "constant" or segments == 0:
        return _ADAPTIVE_LEVELS
    per_point = POINT_OVERHEAD + evaluation_cost(expr)
    if coef.poly_degree is not None:
        d = coef.poly_degree
        points = segments * points_needed(d + 1) * points_needed(d)
        if points * per_point > limit:
            raise ValueError(f"weight: exact integration of this degree-{d} polynomial over "
                             f"{segments} segments takes {points:.3g} evaluations of "
                             f"{per_point} work units each, above the limit of {limit:.0e} "
                             "units; use a formula of lower degree or fewer samples")
        return _ADAPTIVE_LEVELS
    per_point += ADAPTIVE_OVERHEAD
    first = segments * _ADAPTIVE_POINTS * per_point
    if first > limit:
        raise ValueError(f"weight: one pass of adaptive integration over {segments} segments "
                         f"takes {segments * _ADAPTIVE_POINTS:.3g} evaluations of {per_point} "
                         f"work units each, above the limit of {limit:.0e} units; use a "
                         "simpler formula or fewer samples")
    return int(min(_ADAPTIVE_LEVELS, math.floor(math.log2(limit / first + 1)) - 1))


def _weight_evaluations(expr):
    """Evaluations of the weight formula that fit within the work limit."""
    from .formula import POINT_OVERHEAD, evaluation_cost
    return max(1, int(WEIGHT_WORK_LIMIT // (POINT_OVERHEAD + evaluation_cost(expr)
                                            + ADAPTIVE_OVERHEAD)))


def _weight_message(msg, weight):
    """A library error of the weight's integral, in the report's words."""
    import re
    m = re.match(r"f is not finite at the point \[(.*?)\](.*)$", msg)
    if m:
        return f"weight {weight!r} is not finite at (x, y) = ({m.group(1)}){m.group(2)}"
    if "overflows float64" in msg:
        return (f"the region integral of weight {weight!r} overflows float64: the weight's "
                "values or the coordinates are too large (rescale the data or the formula)")
    return msg


# =========================================================================== loop
@dataclass(frozen=True, slots=True, repr=False, eq=False)
class LoopReport(_Report):
    """A loop in one plane: the result of :func:`loop`.

    Attributes
    ----------
    names : tuple of str
        ``(x, y)``: the horizontal and the vertical channel.
    path : Path
        The recorded curve (as given: never the detrended or closed one).
    closure : str
        How each gap-free piece was closed.
    signed_area : float
        ½∮(x dy − y dx), counter-clockwise positive.
    decomposition : Decomposition
        Faces, winding numbers and lobes of the closed curve.
    moments : RegionMoments
    cycles : CycleAreas or None
        The per-cycle integral ``quantity`` of each cycle cut by
        ``cycles_by`` (its valleys, or its upward crossings of ``level``);
        complete cycles plus the partial ones flagged; None when that
        channel is constant.
    engineering : LoopCycles or None
        The same cycles' engineering quantities (:func:`~wedgepath.loop_cycles`):
        energy, peaks, stiffness, damping, in ``units`` when given.
    kind : str or None
        The loop family (:data:`~wedgepath.LOOP_KINDS`).
    energy : str
        ``"y_dx"`` (∮ y dx per cycle) or ``"x_dy"`` (∮ x dy).
    weight, weighted : str, Integral or None
        The weight formula and its region integral.
    notes, times_given, time_name, units, source
        As in :class:`LeadLagReport`.
    """

    names: tuple
    path: object
    closure: str
    signed_area: float
    decomposition: object
    moments: object
    cycles: object
    cycles_by: str
    energy: str = "y_dx"
    level: float | None = None
    hysteresis: object = "auto"
    engineering: object = None
    kind: str | None = None
    cut: str = "reversal"
    rainflow: object = None
    weight: str | None = None
    weighted: object = None
    notes: tuple = ()
    times_given: bool = False
    time_name: str | None = None
    units: Mapping = field(default_factory=dict)
    source: Mapping = field(default_factory=dict)
    json_name: str = "result.json"

    @property
    def x(self):
        return self.names[0]

    @property
    def y(self):
        return self.names[1]

    @property
    def samples(self) -> int:
        return int(np.asarray(self.path.points).shape[0])

    @property
    def quantity(self) -> str:
        """Which integral the per-cycle values are, in the channels' names."""
        x, y = self.names
        return f"∮ {y} d({x})" if self.energy == "y_dx" else f"∮ {x} d({y})"

    def cycle_stats(self):
        """(values, count, mean, std with ddof=1) of the per-cycle integral."""
        if self.cycles is None:
            return np.zeros(0), 0, math.nan, math.nan
        values = _cycle_parts(self.cycles)[0]
        return values, int(self.cycles.count), float(self.cycles.mean), float(self.cycles.std)

    def _bounds(self):
        """(start, stop) of each cycle: times, or data rows from 1 without times."""
        if self.cycles is None:
            return np.zeros(0), np.zeros(0)
        _, s0, s1, t0, t1 = _cycle_parts(self.cycles)
        if self.times_given and t0 is not None:
            return _time_values(t0), _time_values(t1)     # ISO text for datetimes
        return s0 + 1.0, s1 + 1.0

    def to_frame(self):
        """One row per cycle: ``cycle, start, stop, value, complete, status`` (start and stop
        as times, or as data rows counted from 1 -- fractional between rows -- without
        times), then the engineering quantities of ``engineering`` (``energy, x_min,
        x_max, y_min, y_max, y_at_x_min, y_at_x_max`` and, where they apply,
        ``stiffness, strain_energy, damping_ratio, loss_factor``)."""
        import pandas as pd
        values = self.cycle_stats()[0]
        start, stop = self._bounds()
        d = {"cycle": np.arange(1, values.size + 1), "start": start, "stop": stop,
             "value": values, "complete": np.isfinite(values)}
        if self.cycles is not None:
            d["status"] = np.asarray(self.cycles.status, dtype=object)
        eng = self.engineering
        if eng is not None and len(eng) == values.size:
            for c in eng.columns:
                d[c] = np.asarray(getattr(eng, c))
        return pd.DataFrame(d)

    def _summary_items(self):
        values, count, mean, std = self.cycle_stats()
        items = [("x", self.x), ("y", self.y), ("samples", self.samples),
                 ("closure", repr(self.closure)), ("signed_area", f"{self.signed_area:.6g}"),
                 ("cycles", count)]
        if count:
            items.append(("mean", f"{mean:.6g}"))
        return items

    def planned_files(self, figures: bool = False) -> list:
        return loop_files(figures, json_name=self.json_name, rainflow=self.rainflow is not None)

    def faces_informative(self) -> bool:
        """Whether a picture of the faces tells something the curve does not.

        True when the curve has lobes of opposite sign (a figure-eight, a
        twisted loop) and is traced about once (no winding number beyond
        ±2); a loop traced many times gives nested faces that only repeat its
        outline.
        """
        dec = self.decomposition
        w = np.asarray(dec.winding)
        return bool(dec.mixed_signs and w.size and np.abs(w).max() <= 2
                    and dec.cancellation >= 0.01)

    # ------------------------------------------------------------------ the JSON
    def to_dict(self) -> dict:
        from . import __version__
        dec = self.decomposition
        values, count, mean, std = self.cycle_stats()
        start, stop = self._bounds()
        centroid = getattr(self.moments, "centroid", None)
        d = {
            "schema": f"wedgepath.loop/{SCHEMA_VERSION}",
            "wedgepath_version": __version__,
            "x": self.x, "y": self.y,
            "samples": self.samples,
            "closure": self.closure,
            "signed_area": float(self.signed_area),
            "absolute_area": float(dec.absolute_area),
            "area_by_winding": {str(k): float(v)
                                for k, v in sorted(dec.area_by_winding.items())},
            "faces": int(len(dec.faces)),
            "lobes": [{"sign": int(lb.sign), "signed_area": float(lb.signed_area),
                       "area": float(lb.area), "faces": int(lb.n_faces)} for lb in dec.lobes],
            "mixed_signs": bool(dec.mixed_signs),
            "cancellation": float(dec.cancellation),
            "centroid": None if centroid is None else [float(c) for c in centroid],
            "notes": list(self.notes),
            "cycles": {"reference": self.cycles_by, "quantity": self.quantity,
                       "energy": self.energy, "count": count, "values": values,
                       "start": start, "stop": stop,
                       "bounds": "time" if self.times_given else "row",
                       "time_unit": (self.cycles.time_unit if self.cycles is not None
                                     else None) if self.times_given else "row",
                       "mean": mean, "std": std, "ddof": 1,
                       "status": [] if self.cycles is None else list(self.cycles.status),
                       "cut": self.cut,
                       "band": None if self.cycles is None else self.cycles.hysteresis,
                       "noise": None if self.cycles is None else self.cycles.noise,
                       "gaps": 0 if self.cycles is None else int(self.cycles.gaps)},
        }
        eng = self.engineering
        if eng is not None:
            desc = eng.describe()
            d["engineering"] = {
                "kind": eng.kind, "quantity": eng.quantity, "sign": eng.sign,
                "column_units": dict(eng.column_units or {}),
                "per_cycle": {c: np.asarray(getattr(eng, c)) for c in eng.columns},
                "complete_cycles": {row["quantity"]: {k: row[k] for k in
                                                      ("mean", "std", "min", "max", "cycles")}
                                    for row in desc.to_dict("records")},
                "ddof": 1, "caution": LOOP_CAUTION}
        rf = self.rainflow
        if rf is not None:
            d["rainflow"] = {
                "channel": self.x, "method": "ASTM E1049-85 section 5.4.4",
                "energy": f"∮ {self.y} d({self.x}) of each closed cycle's own sub-loop; "
                          "∫ y dx along the residue for half cycles",
                "energy_unit": (dict(eng.column_units or {}).get("energy") if eng is not None
                                else None),
                "rows": "data rows from 1",
                "range": rf.range, "mean": rf.mean, "count": rf.count,
                "start": np.asarray(rf.start) + 1, "end": np.asarray(rf.end) + 1,
                "cycles": rf.cycles, "energy_per_cycle": rf.energy,
                "total_energy": rf.total_energy, "residue_energy": rf.residue_energy}
        if self.weighted is not None:
            r = self.weighted
            d["weighted_integral"] = {"formula": self.weight, "value": float(r),
                                      "error": r.error, "exact": r.exact, "method": r.method}
        d["input"] = dict(self.source)
        d["units"] = dict(self.units)
        return _jsonable(d)

    def tables(self) -> dict:
        """``cycles.csv``: :meth:`to_frame` (one row per cycle); ``rainflow.csv``: the
        rainflow cycles of x (``RainflowCycles.to_frame()``, start and end as data rows from
        1) when they were asked for."""
        out = {"cycles.csv": self.to_frame()}
        if self.rainflow is not None:
            fr = self.rainflow.to_frame()
            fr["start"] = fr["start"] + 1
            fr["end"] = fr["end"] + 1
            fr["close"] = fr["close"] + 1
            out["rainflow.csv"] = fr
        return out

    # ------------------------------------------------------------------ text
    def summary(self) -> list:
        dec = self.decomposition
        lines = [f"loop of {self.y} (vertical) against {self.x} (horizontal), "
                 f"{self.samples} samples, closure={self.closure}",
                 f"\nsigned area (counter-clockwise > 0): {self.signed_area:.6g}",
                 f"absolute area (|winding| weighted):  {dec.absolute_area:.6g}",
                 f"faces: {len(dec.faces)}, lobes: {len(dec.lobes)}"]
        items = sorted(dec.area_by_winding.items())
        if items:
            shown = items if len(items) <= 10 else \
                sorted(sorted(items, key=lambda kv: -abs(kv[1]))[:8])
            more = f" (the {len(shown)} largest of {len(items)}; all in the JSON result)" \
                if len(shown) < len(items) else ""
            lines.append("area by winding number" + more + ": " + ", ".join(
                f"{k}: {v:.4g}" for k, v in shown))
        for k, lb in enumerate(dec.lobes[:6]):
            lines.append(f"  lobe {k + 1}: {'counter-clockwise' if lb.sign > 0 else 'clockwise'}, "
                         f"signed area {lb.signed_area:.4g} over {_plural(lb.n_faces, 'face')}")
        if dec.mixed_signs and dec.cancellation >= 0.01:
            lines.append(f"warning: lobes of opposite sign cancel {100 * dec.cancellation:.0f}% "
                         "of the absolute area; the net area alone hides them")
        elif dec.mixed_signs:
            lines.append(f"note: small lobes of opposite sign ({100 * dec.cancellation:.2g}% of "
                         "the absolute area), typically made by noise where the curve crosses "
                         "itself")
        values, count, mean, std = self.cycle_stats()
        lines += self._cycle_lines(values, count, mean, std)
        rf = self.rainflow
        if rf is not None:
            closed = rf.count == 1.0
            lines.append(f"\nrainflow cycles of {self.x} (ASTM E1049-85 5.4.4): "
                         f"{int(closed.sum())} closed, {int((~closed).sum())} half; "
                         f"largest range {rf.range.max() if rf.range.size else float('nan'):.4g}")
            u = ""
            eng = self.engineering
            if eng is not None and eng.column_units:
                u = " " + eng.column_units.get("energy", "")
            lines.append(f"  ∮ {self.y} d({self.x}): closed sub-loops {rf.energy[closed].sum():.6g}"
                         f"{u} + residue {rf.residue_energy:.6g}{u} = total "
                         f"{rf.total_energy:.6g}{u}")
        if self.weighted is not None:
            r = self.weighted
            how = "exact" if r.exact else f"error estimate {r.error:.2g}"
            lines.append(f"\nregion integral of {self.weight}: {float(r):.8g} ({how})")
        for note in self.notes:
            lines.append("note: " + note)
        return lines

    def _cycle_lines(self, values, count, mean, std):
        cyc = self.cycles
        if cyc is None:
            return [f"\ncycles (cut by {self.cycles_by}): none"]
        how = (f"valleys of {self.cycles_by}" if self.cut == "reversal"
               else f"upward crossings of {self.cycles_by} through {cyc.level:.6g}")
        band = cyc.hysteresis
        band_txt = "" if band is None else (
            f", band {band:.4g}" + (f" = 8 x noise {cyc.noise:.3g}"
                                    if self.hysteresis == "auto" and self.cut == "reversal"
                                    else f" = 4 x noise {cyc.noise:.3g}"
                                    if self.hysteresis == "auto" else ""))
        status = np.asarray(cyc.status, dtype=object)
        parts = []
        for key, word in (("partial-start", "at the start"), ("partial-end", "at the end"),
                          ("partial-gap", "next to a gap")):
            k = int(np.count_nonzero(status == key))
            if k:
                parts.append(f"{k} {word}")
        lines = [f"\ncycles ({how}{band_txt}): {count} complete"
                 + (f"; partial (not measured): {', '.join(parts)}" if parts else "")
                 + (f"; {_plural(cyc.gaps, 'gap')} in the record" if cyc.gaps else "")]
        if count:
            lines.append(f"{self.quantity} per cycle: mean {mean:.6g}, "
                         + (f"std {std:.3g} (ddof=1)" if count > 1 else "no spread (one cycle)"))
        eng = self.engineering
        if eng is not None and eng.count:
            cu = dict(eng.column_units or {})
            desc = eng.describe().set_index("quantity")
            labels = {"energy": "energy per cycle" + (f" ({eng.quantity})" if eng.kind else ""),
                      "stiffness": "effective stiffness k_eff", "strain_energy":
                      "strain energy at peak E_S0", "damping_ratio":
                      "equivalent viscous damping ratio zeta_eq", "loss_factor": "loss factor eta"}
            lines.append(f"engineering quantities over the {_plural(eng.count, 'complete cycle')}"
                         f" (mean, std with ddof=1); energy {eng.sign}:")
            for key, label in labels.items():
                if key not in desc.index:
                    continue
                row = desc.loc[key]
                unit = cu.get(key, "")
                unit = "" if unit in ("", "1") else f" {unit}"
                sd = f"{row['std']:.3g}" if np.isfinite(row["std"]) else "n/a"
                lines.append(f"  {label}: {row['mean']:.6g}{unit} (std {sd})")
            lines.append("caution: " + LOOP_CAUTION)
        return lines

    # ------------------------------------------------------------------ figures
    def figures(self, reference=None, reference_label="expected") -> dict:
        """Figures, file name -> matplotlib Figure (needs matplotlib).

        ``loop.png``: the recorded curve in its own units, one shade per cycle,
        with arrows for its direction; beside it the faces by winding number
        when they tell something (:meth:`faces_informative`; drawn on their own
        axes, of the closed curve that was measured), else the per-cycle values.
        ``cycles.png``: the per-cycle values with their mean and ±1 standard
        deviation (ddof=1, as in the text); ``reference`` draws a known value.
        """
        from . import plotting
        with plotting.literal_text():
            return {"loop.png": plotting.loop_overview(self, reference=reference,
                                                       reference_label=reference_label),
                    "cycles.png": plotting.cycle_values(
                        self.cycles, ax=None, title=f"{self.quantity} per cycle",
                        ylabel=self._value_label(), reference=reference,
                        reference_label=reference_label).figure}

    def _value_label(self):
        ux, uy = (self.units.get(n) for n in self.names)
        unit = " x ".join(u for u in ((uy, ux) if self.energy == "y_dx" else (ux, uy)) if u)
        return "value per cycle" + (f" [{unit}]" if unit else "")


def _decompose(path, closure, max_crossings, progress):
    """decompose, with a refusal for size that says what to pass."""
    from .planar import decompose
    from .planar.arrangement import MAX_CROSSINGS, ArrangementTooLarge

    limit = MAX_CROSSINGS if max_crossings is None else max_crossings
    try:
        return decompose(path, closure=closure, max_crossings=limit, progress=progress)
    except ArrangementTooLarge as exc:
        msg = str(exc).removeprefix("decompose: ")
        if exc.cause == "memory":
            raise ValueError("the loop's arrangement does not fit in memory: " + msg) from None
        msg = msg.split(": pass max_crossings=")[0]
        # the count is an estimate: suggest half as much again, rounded up to 2 digits
        want = 1.5 * exc.crossings
        step = 10 ** max(0, int(math.log10(want)) - 1)
        need = int(math.ceil(want / step) * step)
        raise ValueError(f"the loop is too tangled to split into faces: {msg}; to build it "
                         f"anyway pass max_crossings={need} or more") from None


def _scaled_rainflow(rf, k):
    """A RainflowCycles with its energies multiplied by ``k`` (a unit conversion)."""
    import dataclasses
    if k == 1.0 or rf.energy is None:
        return rf
    return dataclasses.replace(rf, energy=rf.energy * k, total_energy=rf.total_energy * k,
                               residue_energy=rf.residue_energy * k)


def _loop_units(units, pair):
    """The units of the loop's two channels (by name or by the roles "x"/"y"), or None.

    Only when both channels have one are the engineering quantities converted (and the
    units then checked); a unit of one channel alone labels the figures only.
    """
    if not units:
        return None
    got = {}
    for role, name in zip(("x", "y"), pair):
        u = units.get(name, units.get(role))
        if u is not None:
            got[role] = u
    return got if len(got) == 2 else None


#: loops of at least this many samples show their stages on standard error (progress=None)
STAGES_FROM = 20_000


def loop(data, *, x=None, y=None, times=None, names=None, closure="chord", cycles_by=None,
         cut=None, level=None, hysteresis="auto", gap="auto", energy=None, kind=None,
         rainflow=False, weight=None, max_crossings=None, progress=None, tol=None, time_name=None,
         units=None, source=None) -> LoopReport:
    """The loop report of two channels.

    Parameters
    ----------
    data : io.Table, pandas DataFrame, Path or array_like (T, k)
        The recording.  ``x`` and ``y`` name (or index) the horizontal and the
        vertical channel (default: the first two).
    cycles_by : str or int, optional
        The channel that cuts cycles (default: ``x``): at its valleys
        confirmed by a band of ``hysteresis`` (``cut="reversal"``, the
        default; ``"auto"``: from the noise level) or at its upward crossings
        of ``level`` (``cut="crossing"``, the default when ``level`` is
        given).  A cycle never spans a gap (``gap``: see
        :func:`~wedgepath.loop_cycles`); partial cycles are flagged.
    energy : {"y_dx", "x_dy"}, optional
        The per-cycle integral: ∮ y dx (the work of stress over strain with x =
        strain, of pressure over volume with x = V) or ∮ x dy (e.g. H dB with
        x = H).  They differ only in sign.  Default: the kind's, else y_dx.
    kind : {"force-displacement", "stress-strain", "B-H", "p-V"}, optional
        The loop family: its integral and sign, its output units and which
        engineering quantities are reported (:data:`~wedgepath.LOOP_KINDS`).
    units : mapping, optional
        Units of the channels (channel name -> unit text; ``"x"``/``"y"``
        name the roles): the engineering quantities are converted (pint).
    rainflow : bool
        Also count the rainflow cycles of ``x`` (:func:`~wedgepath.rainflow`,
        ASTM E1049-85 §5.4.4) with each closed cycle's sub-loop ``∮ y dx``
        (in the engineering energy unit when units are known).
    weight : str, optional
        A formula in x and y (parsed safely) integrated over the region, its
        work bounded by :data:`WEIGHT_WORK_LIMIT` before it starts.
    max_crossings : int, optional
        Refuse a loop that crosses itself more often before splitting it into faces.
    progress : bool or None
        Stages on standard error (None: for loops of 20,000 samples or more).

    Returns
    -------
    LoopReport

    Examples
    --------
    >>> import numpy as np
    >>> from wedgepath import report
    >>> t = np.linspace(0, 4 * np.pi, 401)
    >>> r = report.loop(np.column_stack([np.cos(t), np.sin(t)]), names=["u", "v"])
    >>> r.quantity, r.cycles.count, round(r.cycle_stats()[2], 3)
    ('∮ v d(u)', 1, -3.141)
    >>> list(r.cycles.status)
    ['partial-start', 'complete', 'partial-end']
    """
    import sympy as sp

    from ._bars import Stages
    from .calculus import Path
    from .planar import region_integral, region_moments, signed_area
    from .signals import LOOP_KINDS, cycle_areas, loop_cycles
    from .signals import rainflow as count_rainflow

    values, times, all_names = _unpack(data, times, names)
    if kind is not None and kind not in LOOP_KINDS:
        raise ValueError(f"unknown kind {kind!r}; choose one of {', '.join(LOOP_KINDS)}")
    if energy is None:
        energy = LOOP_KINDS[kind].energy if kind is not None else "y_dx"
    if energy not in ENERGY_FORMS:
        raise ValueError(f"energy must be one of {', '.join(ENERGY_FORMS)}, got {energy!r}")
    if kind is not None and energy != LOOP_KINDS[kind].energy:
        raise ValueError(f"a {kind} loop reports {LOOP_KINDS[kind].energy} "
                         f"({LOOP_KINDS[kind].label}); energy={energy!r} contradicts it")
    if cut is None:
        cut = "crossing" if level is not None else "reversal"

    def col(key, what):
        if key is None:
            return None
        if isinstance(key, str):
            if key not in all_names:
                raise ValueError(f"{what} names no channel: {key!r}; channels are "
                                 f"{', '.join(all_names)}")
            return all_names.index(key)
        k = int(key)
        if not 0 <= k < len(all_names):
            raise ValueError(f"{what}={k} is out of range for {len(all_names)} channels")
        return k
    if values.shape[1] < 2:
        raise ValueError(f"a loop needs 2 channels, got {values.shape[1]}")
    ix = col(x, "x") if x is not None else 0
    iy = col(y, "y") if y is not None else 1
    if ix == iy:
        raise ValueError("x and y name the same channel")
    ir = col(cycles_by, "cycles_by")
    xy = values[:, [ix, iy]]
    pair = (all_names[ix], all_names[iy])
    expr = None
    if weight is not None:
        # parsed and its work bounded before anything is computed (a refusal comes at once)
        sx, sy = sp.symbols("x y", real=True)
        expr = parse_weight(weight, (sx, sy))
        weight_levels(expr, (sx, sy), _segments(xy))
    path = Path(xy, times=times, names=list(pair))
    measured = path.close("require", tol=tol) if closure == "require" and tol is not None \
        else path          # closed within tol: exactly closed after
    steps = ["areas and faces", "moments and cycles"] + (["weight"] if weight else [])
    show = (xy.shape[0] >= STAGES_FROM) if progress is None else bool(progress)
    notes = []
    with Stages("loop", steps, enabled=show) as stages:
        stages.start("areas and faces")
        sa = signed_area(measured, closure=closure)
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always")
            dec = _decompose(measured, closure, max_crossings,
                             False if (show or progress is False) else None)
            stages.start("moments and cycles")
            mom = region_moments(measured, closure=closure)
        notes += [str(w.message) for w in caught]
        ref_col = ix if ir is None else ir
        ref_name = all_names[ref_col]
        data3 = np.column_stack([xy, values[:, ref_col]])
        # A[i, j] = ∮ x_i dx_j on each closed cycle: y dx is A[1, 0], x dy is A[0, 1]
        i, j = (1, 0) if energy == "y_dx" else (0, 1)
        eng = None
        try:
            with warnings.catch_warnings(record=True) as caught:
                warnings.simplefilter("always")
                cyc = cycle_areas(data3, i, j, reference=2, cut=cut, level=level,
                                  hysteresis=hysteresis, gap=gap, times=times)
                eng_units = _loop_units(units, pair)
                try:
                    eng = loop_cycles(data3, 0, 1, reference=2, kind=kind, units=eng_units,
                                      cut=cut, level=level, hysteresis=hysteresis, gap=gap,
                                      times=times, names=[pair[0], pair[1], "_reference"])
                except ValueError as exc:
                    # without a kind, units pint does not know (currencies, counts) label the
                    # figures only; with a kind they must be physical units
                    if kind is not None or eng_units is None or "unknown unit" not in str(exc):
                        raise
                    notes.append(f"{exc}; without a kind the units only label the output, and "
                                 "the engineering quantities are in the data's own units")
                    eng = loop_cycles(data3, 0, 1, reference=2, cut=cut, level=level,
                                      hysteresis=hysteresis, gap=gap, times=times,
                                      names=[pair[0], pair[1], "_reference"])
            for w in caught:                  # the same segmentation warns twice: once here
                if str(w.message) not in notes:
                    notes.append(str(w.message))
        except ValueError as exc:
            if "is constant, so it has no crossings" in str(exc):
                cyc = None          # a valid answer: no cycle at all, said in a note
                notes.append(f"no cycles: the column {ref_name!r} is constant, so it never "
                             "crosses a level (choose another cycles_by)")
            elif "has no samples" in str(exc):
                raise ValueError(f"cycles_by: the column {ref_name!r} that cuts cycles has no "
                                 "values (every cell is empty); choose another") from None
            else:
                raise
        weighted = None
        if weight is not None:
            stages.start("weight")
            sx, sy = sp.symbols("x y", real=True)
            with warnings.catch_warnings(record=True) as caught:
                warnings.simplefilter("always")
                try:
                    weighted = region_integral(expr, measured, closure=closure,
                                               symbols=(sx, sy),
                                               max_evaluations=_weight_evaluations(expr))
                except ValueError as exc:
                    raise ValueError(_weight_message(str(exc), weight)) from None
            wn = [str(w.message) for w in caught]
            if any("limit of" in n for n in wn):
                wn.append(f"the refinement of the weight's integral was capped by the work "
                          f"limit ({WEIGHT_WORK_LIMIT:.0e} units, docs/cli.md)")
            notes += wn
    rf = None
    if rainflow:
        rf = count_rainflow(xy, x=0, y=1, gap=gap, times=times, names=list(pair))
        eng_u = dict(eng.column_units or {}) if eng is not None else {}
        pu = _loop_units(units, pair)
        if pu is not None and "energy" in eng_u:
            from .signals.loops import energy_factor
            k = energy_factor(pu["x"], pu["y"], eng_u["energy"])
            rf = _scaled_rainflow(rf, k)
    return LoopReport(names=pair, path=path, closure=closure, signed_area=float(sa),
                      decomposition=dec, moments=mom, cycles=cyc, cycles_by=ref_name,
                      energy=energy, level=level, hysteresis=hysteresis, engineering=eng,
                      kind=kind, cut=cut, rainflow=rf, weight=weight,
                      weighted=weighted, notes=tuple(notes), times_given=times is not None,
                      time_name=time_name, units=dict(units or {}), source=dict(source or {}))
