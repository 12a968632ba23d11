"""Benchmark of reading a table file: the command line at the speed of the parser (a script).

Target (issue 16): on a 1,000,000 x 16 CSV (139 MB of fixed-point text, invented
lead-lag data written by ``bench_streaming.write_csv``),

* ``wedgepath leadlag FILE --json --quiet`` (no figures) within 1.5x, and
* ``wedgepath leadlag FILE --stream --json --quiet`` within 2x

of the baseline ``pyarrow.csv.read_csv(FILE)`` + ``numpy.column_stack`` +
``wedgepath.area_matrix`` on the loaded array.  Every side runs as its own
Python process (interpreter start and imports included on both sides), the
runs are interleaved and the best of ``--repeat`` (default 3) is kept, so
load from other programs on the machine hits both sides alike.

In-process rows break the time down (best of 3 in this process):
``wedgepath.io.read_table`` against ``read_csv`` + ``column_stack`` (the
reading alone), ``report.leadlag`` against ``area_matrix`` (the non-reading
work of the command: cyclic order, summary), and an ISO-8601 date/time column
against a numeric one.

Run:  .venv/bin/python benchmarks/bench_io.py  [--quick] [--repeat N]
"""

from __future__ import annotations

import json
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent))
from _harness import Table, best_time  # noqa: E402
from bench_streaming import reference_matrix, rel_diff, write_csv  # noqa: E402

_BASELINE = r"""
import json, sys
import numpy as np, pyarrow.csv as pcsv, wedgepath as wp
tab = pcsv.read_csv(sys.argv[1])
X = np.column_stack([c.to_numpy() for c in tab.columns])
A = wp.area_matrix(X)
print(json.dumps(A.values.tolist()))
"""


def timed(argv):
    """Wall time of a fresh process running ``argv``, and its standard output."""
    t0 = time.perf_counter()
    p = subprocess.run(argv, capture_output=True, text=True)
    dt = time.perf_counter() - t0
    if p.returncode != 0:
        raise RuntimeError(f"{' '.join(argv[:5])} ... exit {p.returncode}: {p.stderr[-1000:]}")
    return dt, p.stdout


def main(quick=False, repeat=3):
    T, n = (200_000 if quick else 1_000_000), 16
    py = sys.executable
    table = Table(f"reading a {T:,} x {n} CSV (issue 16)")
    with tempfile.TemporaryDirectory(prefix="wedgepath-bench-io-") as tmp:
        path = os.path.join(tmp, f"signals_{T}x{n}.csv")
        write_csv(path, T, n)
        size_mb = os.path.getsize(path) / 2 ** 20
        X_ref = reference_matrix(T, n)

        base = [py, "-c", _BASELINE, path]
        cli = [py, "-m", "wedgepath", "leadlag", path, "--json", "--quiet"]
        stream = cli + ["--stream"]
        times = {"base": [], "cli": [], "stream": []}
        outs = {}
        for _ in range(repeat):                      # interleaved: the same load for all
            for key, argv in (("base", base), ("cli", cli), ("stream", stream)):
                dt, out = timed(argv)
                times[key].append(dt)
                outs[key] = out
        tb, tc, ts = (min(times[k]) for k in ("base", "cli", "stream"))
        A_base = np.array(json.loads(outs["base"]))
        A_cli = np.array(json.loads(outs["cli"])["raw_area_matrix"])
        A_st = np.array(json.loads(outs["stream"])["raw_area_matrix"])
        A_ref = A_base
        table.info("baseline: read_csv + column_stack + area_matrix (process)",
                   f"{tb:.2f} s ({size_mb:.0f} MB file; runs {', '.join(f'{t:.2f}' for t in times['base'])})")
        table.ratio("wedgepath leadlag (no figures) / baseline", tc, tb, 1.5,
                    note=f"{tc:.2f} s; runs {', '.join(f'{t:.2f}' for t in times['cli'])}")
        table.ratio("wedgepath leadlag --stream / baseline", ts, tb, 2.0,
                    note=f"{ts:.2f} s; runs {', '.join(f'{t:.2f}' for t in times['stream'])}")
        table.value("  results vs baseline's area_matrix (max rel. diff)",
                    max(rel_diff(A_cli, A_ref), rel_diff(A_st, A_ref)), 1e-10)

        # ------------------------------------------------------------ in-process breakdown
        import pyarrow.csv as pcsv

        import wedgepath as wp
        import wedgepath.io as wio
        from wedgepath import report

        def arrow_read():
            tab = pcsv.read_csv(path)
            return np.column_stack([c.to_numpy() for c in tab.columns])

        t_arrow = best_time(arrow_read, repeat=3)
        t_read = best_time(lambda: wio.read_table(path), repeat=3)
        table.ratio("  in process: read_table / (read_csv + column_stack)", t_read, t_arrow, 1.5,
                    note=f"{t_read:.2f} s vs {t_arrow:.2f} s")
        X = wio.read_table(path).values
        assert np.array_equal(X, X_ref)
        names = [f"c{k:02d}" for k in range(n)]
        t_area = best_time(lambda: wp.area_matrix(X), repeat=3)
        t_rep = best_time(lambda: report.leadlag(X, names=names, progress=False), repeat=3)
        table.info("  in process: area_matrix / report.leadlag (non-reading work)",
                   f"{t_area:.2f} s / {t_rep:.2f} s ({t_rep / t_area:.2f}x)")

        # an ISO-8601 time column: 2022-01-01T00:00:00.000 + k ms
        tpath = os.path.join(tmp, "timed.csv")
        stamps = np.datetime64("2022-01-01T00:00:00.000") + np.arange(T).astype("m8[ms]")
        with open(tpath, "w") as fh, open(path) as src:
            fh.write("time," + src.readline())
            for s, line in zip(np.datetime_as_string(stamps), src):
                fh.write(s + "," + line)
        t_iso = best_time(lambda: wio.read_table(tpath, time_column="time"), repeat=3)
        tab = wio.read_table(tpath, time_column="time")
        assert np.array_equal(tab.times, np.arange(T) / 1000.0)
        table.info("  in process: read_table with an ISO time column / without",
                   f"{t_iso:.2f} s / {t_read:.2f} s ({t_iso / t_read:.2f}x)")
    return table.print()


if __name__ == "__main__":
    args = sys.argv[1:]
    rep = int(args[args.index("--repeat") + 1]) if "--repeat" in args else 3
    ok = main(quick="--quick" in args, repeat=rep)
    sys.exit(0 if ok else 1)
