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
``--out DIR`` it also writes the JSON result (with a schema version), CSV
tables, figures when matplotlib is installed, and ``manifest.json`` (every
file of the run with its size and SHA-256, written last); ``--help`` of each
subcommand names its files.  The work is done by :mod:`wedgepath.report`:
this module parses the options, calls it, prints and writes.  Errors in the
input are reported in one line on standard error with exit code 2
(``--debug`` shows the traceback).  The files a run will write are known
before it computes anything and checked then: an existing file of one of
those names is replaced only with ``--force``, no other file is ever removed,
and an output that is the input itself is refused (:mod:`wedgepath._outputs`).
"""

from __future__ import annotations

import argparse
import math
import os
import signal
import sys
import warnings

import numpy as np

from . import __version__
from ._outputs import OutputSet, json_text
from .io import TableError, read_table

#: the per-cycle integrals of ``loop --energy`` (as wedgepath.report.ENERGY_FORMS; listed
#: here so that building the parser imports nothing heavy)
ENERGY_FORMS = ("y_dx", "x_dy")
#: the loop families of ``loop --kind`` (as wedgepath.signals.LOOP_KINDS)
LOOP_KINDS = ("force-displacement", "stress-strain", "B-H", "p-V")

__all__ = ["main", "build_parser", "CLIError"]


class CLIError(Exception):
    """A problem with the user's input or options: one line, exit code 2."""


class _Parser(argparse.ArgumentParser):
    def error(self, message):  # one line, exit 2 (argparse's own convention for the code)
        # the same prefix as every other error of the command line
        self.exit(2, f"wedgepath: error: {message} (see {self.prog} --help)\n")


# --------------------------------------------------------------------------- shared options
def _files_help(names):
    return ("write " + ", ".join(names) + " and manifest.json here (the .png figures need "
            "matplotlib)")


def _add_common(p, files):
    p.add_argument("--out", metavar="DIR", help=_files_help(files))
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


def _bands(text):
    """``--bands``: edges ``0,3,10,50`` or named ranges ``slow=0:3,fast=10:50``."""
    items = [t.strip() for t in text.split(",") if t.strip()]
    if not items:
        raise argparse.ArgumentTypeError("expected band edges (0,3,10) or named ranges "
                                         "(slow=0:3,fast=3:10)")

    def num(t):
        try:
            v = float(t)
        except ValueError:
            raise argparse.ArgumentTypeError(f"expected a frequency, got {t!r}") from None
        if not math.isfinite(v):
            raise argparse.ArgumentTypeError(f"expected a finite frequency, got {t!r}")
        return v

    if any("=" in t for t in items):
        out = {}
        for t in items:
            name, sep, rng = t.partition("=")
            lo, sep2, hi = rng.partition(":")
            if not sep or not sep2 or not name.strip():
                raise argparse.ArgumentTypeError(f"expected NAME=LOW:HIGH, got {t!r}")
            if name.strip() in out:
                raise argparse.ArgumentTypeError(f"band {name.strip()!r} is named twice")
            out[name.strip()] = (num(lo), num(hi))
        return out
    edges = [num(t) for t in items]
    if len(edges) < 2:
        raise argparse.ArgumentTypeError("band edges need at least 2 frequencies")
    return edges


def _check_units(args, columns):
    unknown = [c for c in args.units if c not in columns]
    if unknown:
        raise CLIError(f"--units names column {unknown[0]!r}, which is not used; "
                       f"columns used: {', '.join(columns)}")


def _hysteresis_band(text):
    if text.strip().lower() == "auto":
        return "auto"
    return _nonnegative_float(text)


def _gap(text):
    t = text.strip().lower()
    if t in ("auto", "none"):
        return None if t == "none" else "auto"
    v = _finite_float(text)
    if v <= 0:
        raise argparse.ArgumentTypeError(f"expected a positive time step, 'auto' or 'none', "
                                         f"got {text!r}")
    return v


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


def _positive_float(text):
    v = _finite_float(text)
    if v <= 0:
        raise argparse.ArgumentTypeError(f"expected a positive number, got {text!r}")
    return v


def _period_band(text):
    parts = text.split(",")
    if len(parts) != 2:
        raise argparse.ArgumentTypeError(f"expected LOW,HIGH (two periods), got {text!r}")
    lo, hi = (_positive_float(p.strip()) for p in parts)
    if not lo < hi:
        raise argparse.ArgumentTypeError(f"expected LOW < HIGH, got {text!r}")
    return lo, hi


def _name_list(text):
    names = [p.strip() for p in text.split(",")]
    if not all(names):
        raise argparse.ArgumentTypeError(f"expected COL,COL,... (no empty names), got {text!r}")
    return names


def _fraction(text):
    v = _finite_float(text)
    if not 0 < v < 1:
        raise argparse.ArgumentTypeError(f"expected a number between 0 and 1, got {text!r}")
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
    ll.add_argument("--columns", metavar="A,B,...",
                    help="channels to use (default: all but --time and --trial)")
    ll.add_argument("--trial", metavar="COL",
                    help="column naming each row's trial (repeated trials, epochs): per-trial "
                    "area matrices (trials.csv), surrogates and bootstrap within trials")
    ll.add_argument("--closure", default="chord", choices=["chord", "none", "detrend", "require"],
                    help="how each gap-free piece is closed (default: chord)")
    _add_tol(ll)
    ll.add_argument("--normalize", default=None, choices=["hilbert", "zscore", "frobenius"],
                    help="report a normalised lead strength instead of raw areas")
    ll.add_argument("--window", type=_positive_int, metavar="N",
                    help="also compute rolling matrices over windows of N samples "
                    "(rolling.csv, rolling.png)")
    ll.add_argument("--step", type=_positive_int, metavar="M",
                    help="window step in samples (default: N // 4)")
    ll.add_argument("--surrogates", type=_positive_int, metavar="K",
                    help="test every pair against K surrogates (p-values, FDR-adjusted; "
                    "pvalues.csv, qvalues.csv)")
    ll.add_argument("--surrogate-method", default="shift", choices=["shift", "phase"],
                    help="circular time shift (default) or Fourier phase randomisation")
    ll.add_argument("--seed", type=int, default=0,
                    help="random seed for surrogates and the bootstrap (default 0)")
    ll.add_argument("--stream", action="store_true",
                    help="read the table in chunks (memory independent of its length); "
                    "computes the area matrix and cyclic order only")
    ll.add_argument("--chunk-rows", type=_positive_int, default=50_000, metavar="N",
                    help="rows per chunk with --stream (default 50000)")
    ll.add_argument("--top", type=_positive_int, default=3,
                    help="how many leaders and laggers to list (default 3)")
    ll.add_argument("--bootstrap", type=_positive_int, metavar="B",
                    help="block-bootstrap the area matrix B times: an interval for each "
                    "channel's position in the cycle and for every pair's area (JSON, "
                    "pairs.csv, positions.png)")
    ll.add_argument("--confidence", type=_fraction, default=0.95, metavar="C",
                    help="confidence level of the bootstrap intervals (default 0.95)")
    ll.add_argument("--invert", type=_name_list, metavar="COL,...",
                    help="negate these channels first (anti-phase channels, e.g. "
                    "unemployment against output; the summary names candidates)")
    ll.add_argument("--detrend", action="store_true",
                    help="remove each channel's least-squares straight line first")
    ll.add_argument("--difference", action="store_true",
                    help="take first differences of every channel first")
    ll.add_argument("--bandpass", type=_period_band, metavar="LOW,HIGH",
                    help="keep periods from LOW to HIGH, in the time column's units "
                    "(samples without --time; seconds for a date/time column, or the unit "
                    "given by --units TIME=day), by a zero-phase filter (e.g. 6,32 quarters)")
    ll.add_argument("--highpass", type=_positive_float, metavar="P",
                    help="remove periods longer than P time units (zero-phase filter; "
                    "units as for --bandpass)")
    ll.add_argument("--reference", metavar="COL",
                    help="each channel's lag behind COL in time units (as for --bandpass), "
                    "with an interval (oscillatory data only; broad-band data are said to be "
                    "so)")
    ll.add_argument("--bands", type=_bands, metavar="EDGES|NAME=LO:HI,...",
                    help="also split the area matrix by frequency band: edges such as "
                    "0,3,10,50 or named ranges such as slow=0:3,fast=10:50, in cycles per "
                    "unit of --time (per sample without it; per second for a date/time column, "
                    "or per the unit given by --units TIME=day); with --surrogates every band "
                    "and pair is tested (bands.csv, bands.png)")
    _add_common(ll, ["result.json", "area_matrix.csv", "pairs.csv", "rolling.csv (--window)",
                     "pvalues.csv and qvalues.csv (--surrogates)", "trials.csv (--trial)",
                     "bands.csv (--bands)", "positions.png", "pairs.png",
                     "rolling.png (--window)", "bands.png (--bands)"])
    ll.set_defaults(func=_cmd_leadlag)

    lp = sub.add_parser("loop", help="areas of a loop in one plane (energy per cycle, lobes)",
                        description="Region quantities of the loop traced by two columns, and "
                        "per cycle its energy, peaks, effective stiffness and damping. These "
                        "numbers describe the measurement: acceptance of dampers, bearings or "
                        "joints and fatigue life are governed by the applicable codes and "
                        "decided by qualified (licensed) engineers.")
    _add_table(lp)
    lp.add_argument("--x", required=True, metavar="COL", help="horizontal channel (e.g. strain)")
    lp.add_argument("--y", required=True, metavar="COL", help="vertical channel (e.g. stress)")
    lp.add_argument("--closure", default="chord", choices=["chord", "detrend", "require", "none"],
                    help="how each gap-free piece is closed (default: chord)")
    _add_tol(lp)
    lp.add_argument("--kind", choices=list(LOOP_KINDS),
                    help="loop family: fixes the per-cycle integral and its sign "
                    "(force-displacement, stress-strain, p-V: ∮ y dx, clockwise positive; B-H: "
                    "∮ H dB with H on --x, counter-clockwise positive), the units of the "
                    "results and whether stiffness and damping are reported")
    lp.add_argument("--cycles-by", metavar="COL",
                    help="the column that cuts cycles (default: --x): at its valleys, or with "
                    "--cut crossing at its upward crossings of --level")
    lp.add_argument("--cut", choices=["reversal", "crossing"], default=None,
                    help="cycles from valley to valley of --cycles-by (reversal; the default) or "
                    "between its upward crossings of --level (crossing; the default when "
                    "--level is given)")
    lp.add_argument("--level", type=_finite_float, help="crossing level (default: the mean)")
    lp.add_argument("--hysteresis", type=_hysteresis_band, default="auto", metavar="BAND",
                    help="band against noise: a valley counts once the column has risen from "
                    "it by BAND (with --cut crossing: half-width of a dead band); 'auto' "
                    "(default): 8 (crossing: 4) times the noise level estimated from the data")
    lp.add_argument("--gap", type=_gap, default="auto", metavar="STEP",
                    help="with --time: a time step longer than STEP is a gap, which no cycle "
                    "spans ('auto', default: 1.5 times the median step; 'none': only empty "
                    "cells are gaps)")
    lp.add_argument("--rainflow", action="store_true",
                    help="also count the rainflow cycles of --x (ASTM E1049-85 5.4.4) with the "
                    "energy ∮ y dx of each closed cycle's sub-loop; writes rainflow.csv")
    lp.add_argument("--energy", default=None, choices=list(ENERGY_FORMS),
                    help="per-cycle quantity: y_dx = ∮ y dx (stress over strain, p over V; "
                    "default) or x_dy = ∮ x dy (H dB with H horizontal; the default of "
                    "--kind B-H)")
    lp.add_argument("--weight", metavar="FORMULA",
                    help="also integrate this weight over the region, in x and y, e.g. 'x**2*y'")
    lp.add_argument("--max-crossings", type=_positive_int, default=None, metavar="N",
                    help="refuse a loop that crosses itself more than N times before splitting "
                    "it into faces (default 500000: about 1.7 GB and half a minute)")
    _add_common(lp, ["result.json", "cycles.csv", "rainflow.csv (--rainflow)", "loop.png",
                     "cycles.png"])
    lp.set_defaults(func=_cmd_loop)

    dm = sub.add_parser("demo", help="run both jobs on bundled invented data",
                        description="Lead-lag of a ring of sensors and the loop of a cyclic "
                        "load test, both invented, with known answers.")
    from .demo import planned_files as demo_files
    dm.add_argument("--out", metavar="DIR", default=None,
                    help="write " + ", ".join(demo_files(True)) + " and manifest.json here "
                    "(the figures need matplotlib)")
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


def _payload(rep, args):
    """The report's JSON with its notes in the command line's words (flags, not arguments)."""
    payload = rep.to_dict()
    payload["notes"] = [cli_words(n) for n in payload["notes"]]
    return payload


def _emit(args, rep, plan: OutputSet, figures):
    """Print the summary (or the JSON) and write the report's files through the plan."""
    payload = _payload(rep, args)
    files = {}
    if args.out is not None:
        files = {name: data for name, data in rep.files(figures).items()}
        files[rep.planned_files(False)[0]] = json_text(payload)
    written = plan.commit(files)
    if args.json:
        sys.stdout.write(json_text(payload))
    else:
        lines = rep.summary()
        notes = {"note: " + n for n in rep.notes}
        print(printable("\n".join(cli_words(line) if line in notes else line
                                  for line in lines)))
        if written:
            print(f"\nwrote {len(written)} files to {args.out}: "
                  + ", ".join(os.path.basename(w) for w in written))
    return 0


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


def _table_label(path):
    """The input as recorded in the JSON: an absolute path, or "-" for standard input."""
    return "-" if path == "-" else os.path.abspath(path)


# --------------------------------------------------------------------------- leadlag
def _trial_labels(args):
    """``(channel columns, trial labels)`` for ``--trial COL``: the column is not a channel."""
    from .io import read_labels, table_columns

    if args.trial == args.time:
        raise CLIError("--trial and --time name the same column")
    if args.columns is None:
        header = table_columns(args.table, args.delimiter)
        if args.trial not in header:
            raise CLIError(f"{args.table}: no column {args.trial!r} (--trial)")
        columns = [c for c in header if c not in (args.trial, args.time)]
    else:
        columns = [c.strip() for c in args.columns.split(",")] \
            if isinstance(args.columns, str) else list(args.columns)
        if args.trial in columns:
            raise CLIError(f"--trial column {args.trial!r} is also listed in --columns")
    return columns, read_labels(args.table, args.trial, delimiter=args.delimiter)


def _cmd_leadlag(args):
    from . import report

    _check_tol(args)
    if args.step is not None and args.window is None:
        raise CLIError("--step needs --window")
    if args.stream:
        clash = [flag for flag, val in (("--window", args.window),
                                         ("--trial", args.trial),
                                         ("--surrogates", args.surrogates),
                                         ("--bootstrap", args.bootstrap),
                                         ("--normalize", args.normalize),
                                         ("--invert", args.invert),
                                         ("--detrend", args.detrend),
                                         ("--difference", args.difference),
                                         ("--bandpass", args.bandpass),
                                         ("--highpass", args.highpass),
                                         ("--reference", args.reference),
                                         ("--bands", args.bands)) if val]
        if clash:
            raise CLIError(f"--stream computes the area matrix only; drop {', '.join(clash)}")
        if args.closure != "chord":
            raise CLIError("--stream supports --closure chord only")
    figures = _want_figures(args)
    plan = _plan(args, report.leadlag_files(figures, window=bool(args.window),
                                            significance=bool(args.surrogates),
                                            trials=bool(args.trial),
                                            bands=args.bands is not None), "leadlag")
    source = {"table": _table_label(args.table), "time_column": args.time}
    if args.stream:
        rep = report.leadlag_stream(args.table, columns=args.columns, time_column=args.time,
                                    delimiter=args.delimiter, chunk_rows=args.chunk_rows,
                                    top=args.top, progress=_progress_flag(args),
                                    units=args.units, table_label=source["table"])
        _check_units(args, list(rep.names) + ([args.time] if args.time else []))
        return _emit(args, rep, plan, figures)
    columns, labels = args.columns, None
    if args.trial is not None:
        columns, labels = _trial_labels(args)
    tab = _load(args, columns)
    _check_units(args, list(tab.names) + ([args.time] if args.time else []))
    _check_complete_rows(args.table, tab.values, tab.names)
    if labels is not None and labels.shape[0] != tab.values.shape[0]:
        raise CLIError(f"{args.table}: the trial column has {labels.shape[0]} rows but the "
                       f"table {tab.values.shape[0]}")
    if labels is not None:
        source["trial_column"] = args.trial
    rep = report.leadlag(tab, closure=args.closure, normalize=args.normalize, trials=labels,
                         window=args.window, step=args.step, n_surrogates=args.surrogates,
                         surrogate_method=args.surrogate_method, seed=args.seed,
                         n_boot=args.bootstrap, confidence=args.confidence, top=args.top,
                         progress=_progress_flag(args), tol=args.tol, time_name=args.time,
                         units=args.units, source=source, invert=args.invert,
                         detrend=args.detrend, difference=args.difference,
                         bandpass=args.bandpass, highpass=args.highpass,
                         reference=args.reference, bands=args.bands)
    return _emit(args, rep, plan, figures)


# --------------------------------------------------------------------------- loop
def _cmd_loop(args):
    from . import report

    _check_tol(args)
    cols = [args.x, args.y]
    if args.x == args.y:
        raise CLIError("--x and --y name the same column")
    if args.weight is not None:
        import sympy as sp
        report.parse_weight(args.weight, sp.symbols("x y", real=True))  # a bad formula fails first
    figures = _want_figures(args)
    plan = _plan(args, report.loop_files(figures, rainflow=args.rainflow), "loop")
    extra = args.cycles_by if args.cycles_by not in (None, args.x, args.y) else None
    tab = _load(args, cols + ([extra] if extra else []))
    # --units x=mm,y=kN: "x" and "y" name the roles unless they are columns
    for role, col in (("x", args.x), ("y", args.y)):
        if role in args.units and role not in tab.names and role != args.time:
            unit = args.units.pop(role)
            if col in args.units and args.units[col] != unit:
                raise CLIError(f"--units gives {col!r} two units: {args.units[col]!r} and "
                               f"{unit!r} (as {role})")
            args.units[col] = unit
    _check_units(args, list(tab.names) + ([args.time] if args.time else []))
    _check_complete_rows(args.table, tab.values[:, :2], cols)
    rep = report.loop(tab, x=args.x, y=args.y, closure=args.closure, cycles_by=args.cycles_by,
                      cut=args.cut, level=args.level, hysteresis=args.hysteresis, gap=args.gap,
                      energy=args.energy, kind=args.kind, rainflow=args.rainflow,
                      weight=args.weight, max_crossings=args.max_crossings,
                      progress=False if args.quiet else None, tol=args.tol,
                      time_name=args.time, units=args.units,
                      source={"table": _table_label(args.table), "time_column": args.time})
    return _emit(args, rep, plan, figures)


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
    (r"differencing \(difference=True\)", "differencing (--difference)"),
    (r"\(bandpass=\(LOW, HIGH\) / highpass=P\)", "(--bandpass LOW,HIGH / --highpass P)"),
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
    (r"\benergy='(\w+)'", r"--energy \1"),
    (r"\bcut='(\w+)'", r"--cut \1"),
    (r"^level applies to", "--level applies to"),
    (r"\bn_surrogates\b", "--surrogates"),
    (r"\bn_boot\b", "--bootstrap"),
    (r"^window=(\d+)", r"--window \1"),
    (r"^(window|step|hysteresis|level|tol) must", r"--\1 must"),
    (r"^weight: ", "--weight: "),
    (r"^weight '", "--weight '"),
    (r"of weight '", "of --weight '"),
    (r"\bpass max_crossings=(\d+)", r"pass --max-crossings \1"),
    (r"^cycles_by: ", ""),
    (r"\(choose another cycles_by\)", "(choose another --cycles-by)"),
    (r"\bchoose another$", "choose another --cycles-by"),
    (r"the weight's integral", "--weight"),
    (r"rescale the path \(e\.g\. divide it by its largest value\)",
     "rescale the data (e.g. divide each column by its largest value)"),
]


def cli_words(msg):
    """A library error message in the command line's words (flags, not argument names)."""
    import re
    for pattern, repl in _WORDS:
        msg = re.sub(pattern, repl, msg)
    return msg


_SAID = set()      # warnings already printed in this run: each is said once


def _one_line_warning(message, category, filename, lineno, file=None, line=None):
    text = str(message).strip().splitlines()
    out = f"wedgepath: warning: {cli_words(text[0]) if text else category.__name__}"
    if out not in _SAID:
        _SAID.add(out)
        print(out, file=sys.stderr)


def main(argv=None) -> int:
    """Run the command line; returns the exit code."""
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:  # --help, --version, or a usage error already printed
        return int(exc.code or 0)
    try:
        with warnings.catch_warnings():
            _SAID.clear()
            warnings.showwarning = _one_line_warning
            # the report states a dominating drift among its notes, which the summary and
            # the JSON both carry: the warning would say it a second time
            from .signals.verdicts import DriftWarning
            warnings.filterwarnings("ignore", category=DriftWarning)
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
