"""The ``wedgepath`` command line (also ``python -m wedgepath``).

Subcommands:

``wedgepath leadlag TABLE``
    Which signal leads which: area matrix, cyclic order with phases and fit,
    strongest leaders and laggers, optional rolling windows and surrogate
    significance.
``wedgepath loop TABLE --x COL --y COL``
    A loop in one plane: signed and absolute area, area by winding number,
    lobes, per-cycle areas (energy per cycle), optional region integral of a
    weight formula.
``wedgepath demo``
    Both jobs on bundled, invented data; reports whether the known answers
    were recovered.

Every subcommand prints a summary for people on standard output; with
``--out DIR`` it also writes ``result.json`` (with a schema version) and CSV
tables for programs, figures when matplotlib is installed, and
``manifest.json`` (every file of the run with its size and SHA-256, written
last).  Errors in the input are reported in one line on standard error with
exit code 2 (``--debug`` shows the traceback).  The files a run will write
are known before it computes anything and checked then: an existing file of
one of those names is replaced only with ``--force``, no other file is ever
removed, and an output that is the input itself is refused
(:mod:`wedgepath._outputs`).
"""

from __future__ import annotations

import argparse
import json
import math
import os
import signal
import stat
import sys
import warnings

import numpy as np

from . import __version__
from ._outputs import Interrupted, OutputSet, csv_text
from .io import TableError, read_table

SCHEMA_VERSION = 2

__all__ = ["main", "build_parser", "CLIError"]


class CLIError(Exception):
    """A problem with the user's input or options: one line, exit code 2."""


class _Parser(argparse.ArgumentParser):
    def error(self, message):  # one line, exit 2 (argparse's own convention for the code)
        self.exit(2, f"{self.prog}: error: {message} (see --help)\n")


# --------------------------------------------------------------------------- output
def leadlag_files(*, window=False, surrogates=False, figures=False):
    """The files ``leadlag`` writes with these options (``manifest.json`` comes on top)."""
    names = ["result.json", "area_matrix.csv"]
    if window:
        names.append("rolling.csv")
    if surrogates:
        names += ["pvalues.csv", "qvalues.csv"]
    if figures:
        names += ["lead_matrix.png", "phases.png"] + (["rolling_lead.png"] if window else [])
    return names


def loop_files(*, figures=False):
    """The files ``loop`` writes (``manifest.json`` comes on top)."""
    return ["result.json", "cycles.csv"] + (["loop.png", "cycles.png"] if figures else [])


def leadlag_tables(rep):
    """CSV files (name -> text) of a lead-lag report."""
    names = rep["channels"]
    files = {"area_matrix.csv": _matrix_csv(rep["area_matrix"], names)}
    if "rolling" in rep:
        files["rolling.csv"] = _rolling_csv(rep["rolling"], names)
    if "significance" in rep:
        files["pvalues.csv"] = _matrix_csv(rep["significance"]["pvalues"], names)
        files["qvalues.csv"] = _matrix_csv(rep["significance"]["qvalues"], names)
    return files


def loop_tables(rep):
    """CSV files (name -> text) of a loop report."""
    c = rep["cycles"]
    rows = [["cycle", "start", "stop", "value"]]
    rows += [[k + 1, a, b, v] for k, (a, b, v) in enumerate(zip(c["start"], c["stop"],
                                                                 c["values"]))]
    return {"cycles.csv": csv_text(rows)}


def _matrix_csv(M, names):
    rows = [["channel", *names]]
    rows += [[name, *(float(v) for v in row)] for name, row in zip(names, M)]
    return csv_text(rows)


def _jsonable(obj):
    if isinstance(obj, dict):
        return {str(k): _jsonable(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [_jsonable(v) for v in obj]
    if isinstance(obj, np.ndarray):
        return _jsonable(obj.tolist())
    if isinstance(obj, (np.integer,)):
        return int(obj)
    if isinstance(obj, (float, np.floating)):
        v = float(obj)
        return None if not math.isfinite(v) else v
    return obj


def _dump_json(payload):
    return json.dumps(_jsonable(payload), indent=2, allow_nan=False) + "\n"


# --------------------------------------------------------------------------- shared options
def _add_common(p):
    p.add_argument("--out", metavar="DIR", help="write result.json, CSV tables and figures here")
    p.add_argument("--force", action="store_true", help="overwrite existing output files")
    p.add_argument("--json", action="store_true",
                   help="print the JSON result on standard output instead of the summary")
    p.add_argument("--no-figures", action="store_true", help="do not draw figures into --out")
    p.add_argument("--quiet", action="store_true", help="no progress indicator on standard error")
    p.add_argument("--debug", action="store_true", help="show the full traceback on errors")


def _add_table(p):
    p.add_argument("table", help="CSV, TSV or Parquet file with a header row "
                   "('-' reads CSV/TSV from standard input)")
    p.add_argument("--time", metavar="COL", help="column holding the sample times")
    p.add_argument("--delimiter", metavar="CHAR", help="force the field delimiter (default: sniffed)")
    p.add_argument("--units", type=_units, default={}, metavar="COL=UNIT,...",
                   help="units of columns, for figure labels and the JSON result "
                        "(e.g. 'strain=mm/mm,stress=MPa,t=s')")


def _units(text):
    units = {}
    for item in text.split(","):
        if not item.strip():
            continue
        col, sep, unit = item.partition("=")
        if not sep or not col.strip() or not unit.strip():
            raise argparse.ArgumentTypeError(f"expected COL=UNIT, got {item.strip()!r}")
        units[col.strip()] = unit.strip()
    return units


def _check_units(args, columns):
    unknown = [c for c in args.units if c not in columns]
    if unknown:
        raise CLIError(f"--units names column {unknown[0]!r}, which is not used; "
                       f"columns used: {', '.join(columns)}")


def _positive_int(text):
    try:
        v = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a whole number, got {text!r}") from None
    if v < 1:
        raise argparse.ArgumentTypeError(f"expected a positive whole number, got {v}")
    return v


def _finite_float(text):
    try:
        v = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a number, got {text!r}") from None
    if not math.isfinite(v):
        raise argparse.ArgumentTypeError(f"expected a finite number, got {text!r}")
    return v


def _nonnegative_float(text):
    v = _finite_float(text)
    if v < 0:
        raise argparse.ArgumentTypeError(f"expected a number >= 0, got {text!r}")
    return v


def _add_tol(p):
    p.add_argument("--tol", type=_nonnegative_float, default=None, metavar="D",
                   help="with --closure require: the largest distance allowed between the end "
                   "and the start of each gap-free piece (default 1e-9 times its extent)")


def build_parser():
    parser = _Parser(prog="wedgepath",
                     description="Lead-lag structure and loop areas of recorded signals.")
    parser.add_argument("--version", action="version", version=f"wedgepath {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    sub.required = True

    ll = sub.add_parser("leadlag", help="which signal leads which (area matrix, cyclic order)",
                        description="Area matrix A[i, j] = (1/2)∮(x_i dx_j - x_j dx_i) of the "
                        "channels of a table: A[i, j] > 0 means channel i leads channel j.")
    _add_table(ll)
    ll.add_argument("--columns", metavar="A,B,...", help="channels to use (default: all but --time)")
    ll.add_argument("--closure", default="chord", choices=["chord", "none", "detrend", "require"],
                    help="how each gap-free piece is closed (default: chord)")
    _add_tol(ll)
    ll.add_argument("--normalize", default=None, choices=["hilbert", "zscore", "frobenius"],
                    help="report a normalised lead strength instead of raw areas")
    ll.add_argument("--window", type=_positive_int, metavar="N",
                    help="also compute rolling matrices over windows of N samples")
    ll.add_argument("--step", type=_positive_int, metavar="M",
                    help="window step in samples (default: N // 4)")
    ll.add_argument("--surrogates", type=_positive_int, metavar="K",
                    help="test every pair against K surrogates (p-values, FDR-adjusted)")
    ll.add_argument("--surrogate-method", default="shift", choices=["shift", "phase"],
                    help="circular time shift (default) or Fourier phase randomisation")
    ll.add_argument("--seed", type=int, default=0, help="random seed for surrogates (default 0)")
    ll.add_argument("--stream", action="store_true",
                    help="read the table in chunks (memory independent of its length); "
                    "computes the area matrix and cyclic order only")
    ll.add_argument("--chunk-rows", type=_positive_int, default=50_000, metavar="N",
                    help="rows per chunk with --stream (default 50000)")
    ll.add_argument("--top", type=_positive_int, default=3,
                    help="how many leaders and laggers to list (default 3)")
    _add_common(ll)
    ll.set_defaults(func=_cmd_leadlag)

    lp = sub.add_parser("loop", help="areas of a loop in one plane (energy per cycle, lobes)",
                        description="Region quantities of the loop traced by two columns.")
    _add_table(lp)
    lp.add_argument("--x", required=True, metavar="COL", help="horizontal channel (e.g. strain)")
    lp.add_argument("--y", required=True, metavar="COL", help="vertical channel (e.g. stress)")
    lp.add_argument("--closure", default="chord", choices=["chord", "detrend", "require", "none"],
                    help="how each gap-free piece is closed (default: chord)")
    _add_tol(lp)
    lp.add_argument("--cycles-by", metavar="COL",
                    help="split into cycles at upward mean crossings of this column (default: --x)")
    lp.add_argument("--level", type=_finite_float, help="crossing level (default: the mean)")
    lp.add_argument("--hysteresis", type=_finite_float, default=0.0,
                    help="dead band against noisy crossings (default 0)")
    lp.add_argument("--energy", default="y_dx", choices=list(ENERGY_FORMS),
                    help="per-cycle quantity: y_dx = ∮ y dx (stress over strain, p over V; "
                    "default) or x_dy = ∮ x dy (H dB with H horizontal)")
    lp.add_argument("--weight", metavar="FORMULA",
                    help="also integrate this weight over the region, in x and y, e.g. 'x**2*y'")
    lp.add_argument("--max-crossings", type=_positive_int, default=None, metavar="N",
                    help="refuse a loop that crosses itself more than N times before splitting "
                    "it into faces (default 500000: about 1.7 GB and half a minute)")
    _add_common(lp)
    lp.set_defaults(func=_cmd_loop)

    dm = sub.add_parser("demo", help="run both jobs on bundled invented data",
                        description="Lead-lag of a ring of sensors and the loop of a cyclic "
                        "load test, both invented, with known answers.")
    dm.add_argument("--out", metavar="DIR", default=None,
                    help="write the results and figures here")
    dm.add_argument("--force", action="store_true", help="overwrite existing output files")
    dm.add_argument("--no-figures", action="store_true", help="do not draw figures")
    dm.add_argument("--quiet", action="store_true", help="no progress indicator")
    dm.add_argument("--debug", action="store_true", help="show the full traceback on errors")
    dm.set_defaults(func=_cmd_demo, json=False)
    return parser


# --------------------------------------------------------------------------- helpers
def _load(args, columns=None):
    return read_table(args.table, columns=columns, time_column=args.time, delimiter=args.delimiter)


def _progress_flag(args):
    return False if args.quiet else None


def _want_figures(args):
    if args.out is None or args.no_figures:
        return False
    try:
        import matplotlib  # noqa: F401
    except ImportError:
        print("wedgepath: note: matplotlib is not installed; no figures drawn "
              "(pip install 'wedgepath[plot]')", file=sys.stderr)
        return False
    return True


def _plan(args, names, command):
    """The run's output files, checked against the folder before any work is done."""
    plan = OutputSet(args.out, names, force=args.force, inputs=[args.table], command=command)
    plan.check()
    return plan


def printable(text):
    """``text`` safe for a terminal: control characters (escape sequences, carriage
    returns, tabs) and bidirectional overrides shown as ``\\x1b``-style escapes, so a
    column name cannot recolour, move the cursor or reorder what the summary shows."""
    import unicodedata
    out = []
    for ch in str(text):
        if ch != "\n" and (unicodedata.category(ch) == "Cc" or "\u202a" <= ch <= "\u202e"
                           or "\u2066" <= ch <= "\u2069"):
            out.append(ch.encode("unicode_escape").decode("ascii"))
        else:
            out.append(ch)
    return "".join(out)


def _emit(args, payload, summary_lines, plan: OutputSet, files):
    files = dict(files)
    files["result.json"] = _dump_json(payload)
    written = plan.commit(files)
    if args.json:
        sys.stdout.write(_dump_json(payload))
    else:
        print(printable("\n".join(summary_lines)))
        if written:
            print(f"\nwrote {len(written)} file(s) to {args.out}: "
                  + ", ".join(os.path.basename(w) for w in written))
    return 0


def _fmt(v, width=10):
    if v is None or (isinstance(v, float) and math.isnan(v)):
        return "nan".rjust(width)
    return f"{v: .4g}".rjust(width)


def _matrix_lines(M, names, indent="  "):
    w = max(10, max(len(n) for n in names) + 1)
    lines = [indent + " " * w + "".join(n[:w - 1].rjust(w) for n in names)]
    for name, row in zip(names, M):
        lines.append(indent + name[:w - 1].ljust(w) + "".join(_fmt(float(v), w) for v in row))
    return lines


# --------------------------------------------------------------------------- leadlag
ZERO_MATRIX_NOTE = ("the area matrix is zero: no channel leads another (constant or "
                    "proportional channels, or no closed stretch); there is no cyclic order")


def _order_section(A, names, top):
    """Cyclic order, net lead and leaders/laggers of a matrix, as report entries."""
    from .signals import cyclic_order

    n = len(names)
    Afin = np.nan_to_num(np.asarray(A, dtype=float), nan=0.0)
    if not np.any(Afin):
        # a valid answer (constant or proportional channels): reported, with a note
        return {"cyclic_order": None, "net_lead": {nm: 0.0 for nm in names},
                "leaders": [], "laggers": [],
                "notes": [ZERO_MATRIX_NOTE]}
    order = cyclic_order(Afin)
    lead = Afin.sum(axis=1)
    rank = np.argsort(-lead, kind="stable")
    k = min(top, n)
    return {
        "cyclic_order": {
            "order": [names[i] for i in order.order],
            "positions_rad": {names[i]: float(order.positions[i]) for i in range(n)},
            "fit": float(order.fit),
            "moduli": {names[i]: float(order.moduli[i]) for i in range(n)},
        },
        "net_lead": {names[i]: float(lead[i]) for i in range(n)},
        "leaders": [names[i] for i in rank[:k]],
        "laggers": [names[i] for i in rank[::-1][:k]],
    }


def leadlag_report(values, times, names, *, closure="chord", normalize=None, window=None,
                   step=None, surrogates=None, surrogate_method="shift", seed=0, top=3,
                   progress=None, tol=None):
    """Compute the lead-lag report as a JSON-ready dict (used by the CLI and the demo).

    A zero area matrix (constant or proportional channels) is a result: its
    ``cyclic_order`` is None and a note says why.  ``tol`` is the gap allowed
    by ``closure="require"``.
    """
    from .signals import area_matrix, rolling_area_matrix, surrogate_test

    n = values.shape[1]
    if n < 2:
        raise CLIError(f"lead-lag needs at least 2 channels, got {n}")
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        A = area_matrix(values, times=times, closure=closure, normalize=normalize,
                        names=list(names), tol=tol)
        raw = A if normalize is None else area_matrix(values, times=times, closure=closure,
                                                      names=list(names), tol=tol)
    A, raw = np.asarray(A), np.asarray(raw)
    notes = [str(w.message) for w in caught]
    order = _order_section(A, names, top)
    notes += order.pop("notes", [])
    report = {
        "schema": f"wedgepath.leadlag/{SCHEMA_VERSION}",
        "wedgepath_version": __version__,
        "channels": list(names),
        "samples": int(values.shape[0]),
        "closure": closure,
        "normalize": normalize,
        "area_matrix": A,
        "raw_area_matrix": raw,
        **order,
        "notes": notes,
    }
    if window is not None:
        st = step if step is not None else max(1, window // 4)
        if window > values.shape[0]:
            raise CLIError(f"--window {window} is longer than the {values.shape[0]} samples")
        roll = rolling_area_matrix(values, window, st, times=times)
        if normalize is not None:
            report["notes"].append("rolling windows hold raw areas A[i, j]; --normalize "
                                   "applies to the whole-recording matrix only")
        report["rolling"] = {
            "window": window, "step": st,
            "start_time": roll.start_time, "end_time": roll.stop_time,
            "areas": roll.areas,
        }
    if surrogates is not None:
        a, b = _longest_gap_free(values)
        if b - a < 4:
            raise CLIError("significance needs a gap-free stretch of at least 4 samples")
        if (a, b) != (0, values.shape[0]):
            report["notes"].append(
                f"surrogate significance uses the longest gap-free stretch, rows {a + 1}-{b} "
                f"of {values.shape[0]}")
        res = surrogate_test(values[a:b], method=surrogate_method, n_surrogates=surrogates,
                             seed=seed, times=None if times is None else times[a:b],
                             progress=progress)
        report["significance"] = {
            "rows": [a, b],
            "method": surrogate_method, "n_surrogates": surrogates, "seed": seed,
            "pvalues": res.pvalues, "qvalues": res.qvalues,
            "significant_pairs": [[names[i], names[j]] for i in range(n) for j in range(n)
                                  if i < j and res.significant()[i, j]],
        }
    return report


def _longest_gap_free(values):
    """Row range [a, b) of the longest run without NaN."""
    good = ~np.isnan(values).any(axis=1)
    edges = np.flatnonzero(np.diff(np.concatenate(([0], good.view(np.int8), [0]))))
    if edges.size == 0:
        return 0, 0
    starts, stops = edges[0::2], edges[1::2]
    k = int(np.argmax(stops - starts))
    return int(starts[k]), int(stops[k])


def leadlag_summary(rep):
    from .signals.order import noise_fit_baseline

    names = rep["channels"]
    what = "lead strength (" + rep["normalize"] + ")" if rep["normalize"] else "area matrix"
    lines = [f"{len(names)} channels, {rep['samples']} samples, closure={rep['closure']}",
             f"\n{what}: A[i, j] > 0 means row i leads column j"]
    lines += _matrix_lines(np.asarray(rep["area_matrix"], dtype=float), names)
    co = rep["cyclic_order"]
    if co is None:
        lines.append("\nno channel leads another: the area matrix is zero")
    elif len(names) == 2:
        A = np.asarray(rep["area_matrix"], dtype=float)
        a, b = (0, 1) if A[0, 1] >= 0 else (1, 0)
        lines.append(f"\n{names[a]} leads {names[b]} (A = {abs(A[0, 1]):.6g})")
    else:
        lines.append("\ncyclic order (each leads the next): " + " -> ".join(co["order"])
                     + f" -> {co['order'][0]}")
        lines.append("positions in the cycle after " + co["order"][0] + " (deg; not delays): "
                     + ", ".join(f"{nm} {math.degrees(co['positions_rad'][nm]):.0f}"
                                 for nm in co["order"]))
        fit = co["fit"]
        base = noise_fit_baseline(len(names))
        verdict = ("well above" if fit >= base + 0.5 * (1 - base) else
                   "above" if fit > base + 0.1 * (1 - base) else "not above")
        lines.append(f"fit {fit:.3f}: {verdict} the {base:.2f} that independent noise gives for "
                     f"{len(names)} channels" + ("" if verdict != "not above" else
                                                 " (treat the order with caution)"))
        lines.append("strongest leaders: " + ", ".join(rep["leaders"]))
        lines.append("strongest laggers: " + ", ".join(rep["laggers"]))
    if "rolling" in rep:
        r = rep["rolling"]
        lines.append(f"\nrolling windows: {len(r['start_time'])} windows of {r['window']} samples, "
                     f"step {r['step']}")
    if "significance" in rep:
        s = rep["significance"]
        pairs = s["significant_pairs"]
        lines.append(f"\nsignificance ({s['method']} surrogates, {s['n_surrogates']}, seed "
                     f"{s['seed']}): {len(pairs)} pair(s) at 5% false discovery rate")
        for a, b in pairs[:10]:
            i, j = names.index(a), names.index(b)
            lines.append(f"  {a} / {b}: q = {s['qvalues'][i][j]:.3g}")
    for note in rep["notes"]:
        lines.append("note: " + note)
    return lines


def _check_tol(args):
    if args.tol is not None and args.closure != "require":
        raise CLIError("--tol applies to --closure require only")


def _check_complete_rows(table, values, names):
    """Refuse a table without one complete row, naming the empty columns (if any)."""
    if values.size and (~np.isnan(values).any(axis=1)).any():
        return
    empty = [nm for k, nm in enumerate(names) if np.isnan(values[:, k]).all()]
    if empty:
        raise CLIError(f"{table}: column{'s' if len(empty) > 1 else ''} "
                       f"{', '.join(repr(e) for e in empty)} "
                       f"{'have' if len(empty) > 1 else 'has'} no values (every cell is empty "
                       "or not a number)")
    raise CLIError(f"{table}: no row has a value in every column used "
                   f"({', '.join(repr(n) for n in names)}): every row has a gap")


def _cmd_leadlag(args):
    _check_tol(args)
    if args.step is not None and args.window is None:
        raise CLIError("--step needs --window")
    if args.stream:
        clash = [flag for flag, val in (("--window", args.window),
                                         ("--surrogates", args.surrogates),
                                         ("--normalize", args.normalize)) if val]
        if clash:
            raise CLIError(f"--stream computes the area matrix only; drop {', '.join(clash)}")
        if args.closure != "chord":
            raise CLIError("--stream supports --closure chord only")
    figures = _want_figures(args)
    plan = _plan(args, leadlag_files(window=bool(args.window), surrogates=bool(args.surrogates),
                                     figures=figures), "leadlag")
    if args.stream:
        return _cmd_leadlag_stream(args, plan, figures)
    tab = _load(args, args.columns)
    _check_units(args, list(tab.names) + ([args.time] if args.time else []))
    _check_complete_rows(args.table, tab.values, tab.names)
    rep = leadlag_report(tab.values, tab.times, tab.names, closure=args.closure,
                         normalize=args.normalize, window=args.window, step=args.step,
                         surrogates=args.surrogates, surrogate_method=args.surrogate_method,
                         seed=args.seed, top=args.top, progress=_progress_flag(args),
                         tol=args.tol)
    rep["input"] = {"table": _table_label(args.table), "time_column": args.time}
    rep["units"] = dict(args.units)
    files = leadlag_tables(rep)
    if figures:
        from . import plotting
        files.update(plotting.leadlag_figures(rep, units=args.units))
    return _emit(args, rep, leadlag_summary(rep), plan, files)


def _table_label(path):
    """The input as recorded in the JSON: an absolute path, or "-" for standard input."""
    return "-" if path == "-" else os.path.abspath(path)


def _estimated_rows(path):
    """Rough row count of a text table from its size and its first lines (for progress).

    Only for regular files: standard input, pipes and FIFOs are read once, by the reader.
    """
    try:
        if path == "-" or not stat.S_ISREG(os.stat(path).st_mode):
            return None
        size = os.path.getsize(path)
        with open(path, "rb") as fh:
            head = fh.read(1 << 20)
    except OSError:
        return None
    lines = head.count(b"\n")
    if lines < 2:
        return None
    return max(1, int(size / (len(head) / lines)))


def _cmd_leadlag_stream(args, plan, figures):
    from .io import stream_area_matrix

    A = stream_area_matrix(args.table, columns=args.columns, time_column=args.time,
                           delimiter=args.delimiter, chunk_rows=args.chunk_rows,
                           progress=_progress_flag(args))
    names = list(A.names)
    M = A.values
    order = _order_section(M, names, args.top)
    order_notes = order.pop("notes", [])
    rep = {
        "schema": f"wedgepath.leadlag/{SCHEMA_VERSION}",
        "wedgepath_version": __version__,
        "channels": names, "samples": int(A.samples), "closure": "chord", "normalize": None,
        "streamed": True, "chunk_rows": args.chunk_rows,
        "area_matrix": M, "raw_area_matrix": M,
        **order,
        "notes": order_notes,
        "input": {"table": _table_label(args.table), "time_column": args.time},
    }
    _check_units(args, names + ([args.time] if args.time else []))
    rep["units"] = dict(args.units)
    files = leadlag_tables(rep)
    if figures:
        from . import plotting
        files.update(plotting.leadlag_figures(rep, units=args.units))
    return _emit(args, rep, leadlag_summary(rep), plan, files)


def _rolling_csv(r, names):
    pairs = [(i, j) for i in range(len(names)) for j in range(len(names)) if i < j]
    rows = [["start_time", "end_time", *(f"{names[i]}|{names[j]}" for i, j in pairs)]]
    areas = np.asarray(r["areas"])
    for k in range(areas.shape[0]):
        rows.append([r["start_time"][k], r["end_time"][k], *(areas[k, i, j] for i, j in pairs)])
    return csv_text(rows)


# --------------------------------------------------------------------------- loop
ENERGY_FORMS = ("y_dx", "x_dy")


def loop_report(xy, times, names, *, closure="chord", reference=None, reference_name=None,
                level=None, hysteresis=0.0, energy="y_dx", weight=None, stages=None,
                max_crossings=None, progress=False, return_decomposition=False, tol=None):
    """Compute the loop report of the planar curve ``xy`` (T, 2) as a JSON-ready dict.

    ``energy`` chooses the per-cycle quantity: ``"y_dx"`` is ∮ y dx (work of
    stress over strain with x = strain, y = stress; of pressure over volume
    with x = V, y = p), ``"x_dy"`` is ∮ x dy (e.g. H dB with x = H, y = B).
    They differ only in sign: ∮ x dy = -∮ y dx = the signed area.
    ``reference`` (T,) is the channel whose upward crossings cut cycles
    (default: x).  ``max_crossings`` (default: the library's) and
    ``progress`` go to :func:`~wedgepath.decompose`; a curve beyond the limit
    is refused with a message naming ``--max-crossings``.  With
    ``return_decomposition`` the result is ``(report, decomposition)``.
    """
    import sympy as sp

    from .calculus import Path
    from .planar import decompose, region_integral, region_moments, signed_area
    from .signals import cycle_areas

    if energy not in ENERGY_FORMS:
        raise CLIError(f"unknown energy form {energy!r}; choose one of {', '.join(ENERGY_FORMS)}")
    stage = stages.start if stages is not None else (lambda name: None)
    if weight is not None:
        # parsed and its work bounded before anything is computed (a refusal comes at once)
        x, y = sp.symbols("x y", real=True)
        expr = parse_weight(weight, (x, y))
        weight_levels(expr, (x, y), _segments(xy))
    path = Path(xy, times=times, names=names)
    if closure == "require" and tol is not None:
        path = path.close("require", tol=tol)     # closed within tol: exactly closed after
    stage("areas and faces")
    sa = signed_area(path, closure=closure)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        dec = _decompose(path, closure, max_crossings, progress)
        stage("moments and cycles")
        mom = region_moments(path, closure=closure)
    centroid = getattr(mom, "centroid", None)
    rep = {
        "schema": f"wedgepath.loop/{SCHEMA_VERSION}",
        "wedgepath_version": __version__,
        "x": names[0], "y": names[1],
        "samples": int(xy.shape[0]),
        "closure": closure,
        "signed_area": float(sa),
        "absolute_area": float(dec.absolute_area),
        "area_by_winding": {str(k): float(v) for k, v in sorted(dec.area_by_winding.items())},
        "faces": int(len(dec.faces)),
        "lobes": [{"sign": lb.sign, "signed_area": lb.signed_area, "area": lb.area,
                   "faces": lb.n_faces} for lb in dec.lobes],
        "mixed_signs": bool(dec.mixed_signs),
        "cancellation": float(dec.cancellation),
        "centroid": None if centroid is None else [float(c) for c in centroid],
        "notes": [str(w.message) for w in caught],
    }
    data = xy if reference is None else np.column_stack([xy, reference])
    ref_col = 0 if reference is None else 2
    # A[i, j] = ∮ x_i dx_j on each closed cycle: y dx is A[1, 0], x dy is A[0, 1]
    i, j = (1, 0) if energy == "y_dx" else (0, 1)
    ref_name = reference_name or names[0]
    try:
        cyc = cycle_areas(data, i, j, reference=ref_col, level=level, hysteresis=hysteresis,
                          times=times)
    except ValueError as exc:
        if "is constant, so it has no crossings" in str(exc):
            cyc = None          # a valid answer: no cycle at all, said in a note
            rep["notes"].append(f"no cycles: the column {ref_name!r} is constant, so it never "
                                "crosses a level (choose another --cycles-by)")
        elif "has no samples" in str(exc):
            raise CLIError(f"the column {ref_name!r} that cuts cycles has no values (every "
                           "cell is empty); choose another --cycles-by") from None
        else:
            raise
    empty = np.zeros(0)
    rep["cycles"] = {
        "reference": ref_name,
        "quantity": "integral of y dx per cycle" if energy == "y_dx" else "integral of x dy per cycle",
        "count": 0 if cyc is None else int(cyc.count),
        "values": empty if cyc is None else cyc.values,
        "start": empty if cyc is None else cyc.start_time,
        "stop": empty if cyc is None else cyc.stop_time,
        "mean": math.nan if cyc is None else float(cyc.mean),
        "std": math.nan if cyc is None else float(cyc.std),
    }
    if weight is not None:
        stage("weight")
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always")
            try:
                r = region_integral(expr, path, closure=closure, symbols=(x, y),
                                    max_evaluations=_weight_evaluations(expr, (x, y)))
            except ValueError as exc:
                raise CLIError(_weight_message(str(exc), weight)) from None
        notes = [str(w.message) for w in caught]
        if any("limit of" in n for n in notes):
            notes.append(f"the refinement of --weight was capped by the work limit "
                         f"({WEIGHT_WORK_LIMIT:.0e} units, docs/cli.md)")
        rep["notes"] += notes
        rep["weighted_integral"] = {"formula": weight, "value": float(r), "error": r.error,
                                    "exact": r.exact, "method": r.method}
    return (rep, dec) if return_decomposition else rep


def _decompose(path, closure, max_crossings, progress):
    """decompose, with a refusal for size in the command line's words."""
    from .planar import decompose
    from .planar.arrangement import MAX_CROSSINGS, ArrangementTooLarge

    limit = MAX_CROSSINGS if max_crossings is None else max_crossings
    try:
        return decompose(path, closure=closure, max_crossings=limit, progress=progress)
    except ArrangementTooLarge as exc:
        msg = str(exc).removeprefix("decompose: ")
        if exc.cause == "memory":
            raise CLIError("the loop's arrangement does not fit in memory: " + msg) from None
        msg = msg.split(": pass max_crossings=")[0]
        # the count is an estimate: suggest half as much again, rounded up to 2 digits
        want = 1.5 * exc.crossings
        step = 10 ** max(0, int(math.log10(want)) - 1)
        need = int(math.ceil(want / step) * step)
        raise CLIError(f"the loop is too tangled to split into faces: {msg}; to build it anyway "
                       f"pass --max-crossings {need} or more") from None


#: work units (about nanoseconds of numpy on one core) that integrating a --weight may take:
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
    """The --weight formula as sympy (the safe parser), messages in the CLI's words."""
    from .formula import parse_formula
    try:
        return parse_formula(text, {s.name: s for s in symbols})
    except ValueError as exc:
        raise CLIError("--weight: " + str(exc).removeprefix("formula: ")) from None


def _segments(xy):
    """Segments of the closed loop (an upper bound): one per complete sample."""
    return int((~np.isnan(xy).any(axis=1)).sum())


def weight_levels(expr, symbols, segments, limit=None):
    """Refinement levels that keep integrating ``expr`` over ``segments`` within the work limit.

    A polynomial weight is integrated exactly with a fixed number of points per
    segment: refused (CLIError) when they cost more than the limit.  Any other
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
        raise CLIError("--weight: " + str(exc).replace("form coefficient", "the formula")) \
            from None
    if coef.kind == "constant" or segments == 0:
        return _ADAPTIVE_LEVELS
    per_point = POINT_OVERHEAD + evaluation_cost(expr)
    if coef.poly_degree is not None:
        d = coef.poly_degree
        points = segments * points_needed(d + 1) * points_needed(d)
        if points * per_point > limit:
            raise CLIError(f"--weight: exact integration of this degree-{d} polynomial over "
                           f"{segments} segments takes {points:.3g} evaluations of "
                           f"{per_point} work units each, above the limit of {limit:.0e} "
                           "units; use a formula of lower degree or fewer samples")
        return _ADAPTIVE_LEVELS
    per_point += ADAPTIVE_OVERHEAD
    first = segments * _ADAPTIVE_POINTS * per_point
    if first > limit:
        raise CLIError(f"--weight: one pass of adaptive integration over {segments} segments "
                       f"takes {segments * _ADAPTIVE_POINTS:.3g} evaluations of {per_point} "
                       f"work units each, above the limit of {limit:.0e} units; use a simpler "
                       "formula or fewer samples")
    return int(min(_ADAPTIVE_LEVELS, math.floor(math.log2(limit / first + 1)) - 1))


def _weight_evaluations(expr, symbols):
    """Evaluations of the --weight formula that fit within the work limit."""
    from .formula import POINT_OVERHEAD, evaluation_cost
    return max(1, int(WEIGHT_WORK_LIMIT // (POINT_OVERHEAD + evaluation_cost(expr)
                                            + ADAPTIVE_OVERHEAD)))


def _weight_message(msg, weight):
    """A library error of the weight's integral, in the command line's words."""
    import re
    m = re.match(r"f is not finite at the point \[(.*?)\](.*)$", msg)
    if m:
        return f"--weight {weight!r} is not finite at (x, y) = ({m.group(1)}){m.group(2)}"
    if "overflows float64" in msg:
        return (f"the region integral of --weight {weight!r} overflows float64: the weight's "
                "values or the coordinates are too large (rescale the data or the formula)")
    return msg


def loop_summary(rep):
    lines = [f"loop of {rep['y']} (vertical) against {rep['x']} (horizontal), "
             f"{rep['samples']} samples, closure={rep['closure']}",
             f"\nsigned area (counter-clockwise > 0): {rep['signed_area']:.6g}",
             f"absolute area (|winding| weighted):  {rep['absolute_area']:.6g}",
             f"faces: {rep['faces']}, lobes: {len(rep['lobes'])}"]
    if rep["area_by_winding"]:
        items = list(rep["area_by_winding"].items())
        shown = items if len(items) <= 10 else \
            sorted(sorted(items, key=lambda kv: -abs(kv[1]))[:8], key=lambda kv: int(kv[0]))
        more = f" (the {len(shown)} largest of {len(items)}; all in the JSON result)" \
            if len(shown) < len(items) else ""
        lines.append("area by winding number" + more + ": " + ", ".join(
            f"{k}: {v:.4g}" for k, v in shown))
    for k, lb in enumerate(rep["lobes"][:6]):
        lines.append(f"  lobe {k + 1}: {'counter-clockwise' if lb['sign'] > 0 else 'clockwise'}, "
                     f"signed area {lb['signed_area']:.4g} over {lb['faces']} face(s)")
    if rep["mixed_signs"] and rep["cancellation"] >= 0.01:
        lines.append(f"warning: lobes of opposite sign cancel ({100 * rep['cancellation']:.0f}% of "
                     "the absolute area); the net area alone hides them")
    elif rep["mixed_signs"]:
        lines.append(f"note: small lobes of opposite sign ({100 * rep['cancellation']:.2g}% of the "
                     "absolute area), typically made by noise where the curve crosses itself")
    c = rep["cycles"]
    lines.append(f"\ncycles (upward crossings of {c['reference']}): {c['count']} complete")
    if c["count"]:
        lines.append(f"{c['quantity']}: mean {c['mean']:.6g}, spread (std) {c['std']:.3g}")
    if "weighted_integral" in rep:
        w = rep["weighted_integral"]
        how = "exact" if w["exact"] else f"error estimate {w['error']:.2g}"
        lines.append(f"\nregion integral of {w['formula']}: {w['value']:.8g} ({how})")
    for note in rep["notes"]:
        lines.append("note: " + note)
    return lines


def _cmd_loop(args):
    from ._bars import Stages

    _check_tol(args)
    cols = [args.x, args.y]
    if args.x == args.y:
        raise CLIError("--x and --y name the same column")
    if args.weight is not None:
        import sympy as sp
        parse_weight(args.weight, sp.symbols("x y", real=True))   # a bad formula fails first
    figures = _want_figures(args)
    plan = _plan(args, loop_files(figures=figures), "loop")
    extra = args.cycles_by if args.cycles_by not in (None, args.x, args.y) else None
    tab = _load(args, cols + ([extra] if extra else []))
    _check_units(args, list(tab.names) + ([args.time] if args.time else []))
    xy = tab.values[:, :2]
    _check_complete_rows(args.table, xy, cols)
    if args.cycles_by == args.y:
        reference = tab.values[:, 1]
    elif extra:
        reference = tab.values[:, 2]
    else:
        reference = None
    steps = ["areas and faces", "moments and cycles"] + (["weight"] if args.weight else []) \
        + (["figures"] if figures else [])
    # shown for long inputs only (decomposing a noisy loop of 10^4+ samples takes a while)
    with Stages("loop", steps, enabled=False if args.quiet else xy.shape[0] >= 20_000) as stages:
        rep = loop_report(xy, tab.times, cols, closure=args.closure, reference=reference,
                          reference_name=args.cycles_by, level=args.level,
                          hysteresis=args.hysteresis, energy=args.energy, weight=args.weight,
                          stages=stages, max_crossings=args.max_crossings,
                          progress=False if (args.quiet or stages.enabled) else None,
                          return_decomposition=True, tol=args.tol)
        rep, dec = rep
        rep["input"] = {"table": _table_label(args.table), "time_column": args.time}
        rep["units"] = dict(args.units)
        files = loop_tables(rep)
        if figures:
            stages.start("figures")
            from . import plotting
            files.update(plotting.loop_figures(xy, cols, rep, closure=args.closure,
                                               units=args.units, decomposition=dec))
    return _emit(args, rep, loop_summary(rep), plan, files)


# --------------------------------------------------------------------------- demo
def _cmd_demo(args):
    from . import demo
    return demo.run(out=args.out, force=args.force, figures=not args.no_figures,
                    quiet=args.quiet)


# --------------------------------------------------------------------------- main
#: library wording -> the command line's (argument names become flags)
_WORDS = [
    (r"^(?:signed_area|decompose|region_integral|region_moments|winding_number|cycle_areas|"
     r"area_matrix|rolling_area_matrix|hilbert_energy|surrogate_test): ", ""),
    (r"^(?:signed_area|decompose|region_integral|region_moments|winding_number) needs a "
     r"closed curve", "--closure none needs a closed loop"),
    (r" \(options: 'none', 'chord', 'detrend', 'require'\)", ""),
    (r" and closure='none';", ";"),
    (r"closure='(\w+)'", r"--closure \1"),
    (r"(--closure \w+(?: \(the default\))?),? '(\w+)'(,)? or '(\w+)'", r"\1, \2\3 or \4"),
    (r"(--closure \w+) or '(\w+)'", r"\1 or \2"),
    (r"pass a larger tol\b", "pass a larger --tol (the distance allowed between the end and "
     "the start)"),
    (r"times must be strictly increasing; times\[(\d+)\]=(\S+) does not exceed "
     r"times\[(\d+)\]=(\S+)", lambda m: (
         f"the --time column must be strictly increasing; data row {int(m[1]) + 1} ({m[2]}) "
         f"does not exceed data row {int(m[3]) + 1} ({m[4]})")),
    (r"^(?:X|points|path) has no complete sample: every row contains NaN",
     "no row has a value in every column used: every row has a gap"),
    (r"^(?:X|points) contains", "the table contains"),
    (r"\bn_surrogates\b", "--surrogates"),
    (r"^window=(\d+)", r"--window \1"),
    (r"^(window|step|hysteresis|level|tol) must", r"--\1 must"),
    (r"rescale the path \(e\.g\. divide it by its largest value\)",
     "rescale the data (e.g. divide each column by its largest value)"),
]


def cli_words(msg):
    """A library error message in the command line's words (flags, not argument names)."""
    import re
    for pattern, repl in _WORDS:
        msg = re.sub(pattern, repl, msg)
    return msg


def _one_line_warning(message, category, filename, lineno, file=None, line=None):
    text = str(message).strip().splitlines()
    print(f"wedgepath: warning: {text[0] if text else category.__name__}", file=sys.stderr)


def main(argv=None) -> int:
    """Run the command line; returns the exit code."""
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:  # --help, --version, or a usage error already printed
        return int(exc.code or 0)
    try:
        with warnings.catch_warnings():
            warnings.showwarning = _one_line_warning
            return int(args.func(args) or 0)
    except KeyboardInterrupt as exc:
        signum = getattr(exc, "signum", signal.SIGINT)
        where = getattr(exc, "folder", None)
        name = signal.Signals(signum).name
        print(f"wedgepath: interrupted ({name})" + (
            f" while writing to {where}: it holds no manifest.json, so its files are not one "
            "complete run; temporary files were removed" if where else ""), file=sys.stderr)
        return 128 + int(signum)
    except (CLIError, TableError, ValueError, TypeError, KeyError) as exc:
        if args.debug:
            raise
        msg = str(exc).strip().splitlines()[0] if str(exc).strip() else type(exc).__name__
        if not isinstance(exc, (CLIError, TableError)):
            msg = cli_words(msg)
        print(f"wedgepath: error: {msg}", file=sys.stderr)
        return 2
    except OSError as exc:
        if args.debug:
            raise
        print(f"wedgepath: error: {exc.strerror or exc}"
              + (f": {exc.filename}" if exc.filename else ""), file=sys.stderr)
        return 2
    except Exception as exc:  # a bug, not bad input: say so in one line
        if args.debug:
            raise
        print(f"wedgepath: internal error: {type(exc).__name__}: {exc} "
              "(rerun with --debug and report it)", file=sys.stderr)
        return 1


if __name__ == "__main__":
    sys.exit(main())
