"""Benchmark of streaming a table from a file (a script, not a test).

Targets: a 10^7 x 16 CSV streamed through the command line,
``python -m wedgepath leadlag FILE --stream --quiet --json``, with peak
resident memory under 300 MB (issue 7), in at most 2x the time of reading the
whole file with ``pyarrow.csv.read_csv`` and computing ``area_matrix`` of the
loaded array (issue 16).

The CSV (invented lead-lag data: 16 phase-shifted sinusoids plus noise,
fixed-point text, 1.4 GB) is written into a temporary folder and deleted at
the end.  Every program runs in its own subprocess, started by a fresh
runner process whose only child it is, so ``getrusage(RUSAGE_CHILDREN)``
reports that program's peak RSS alone.  Rows:

* peak RSS of the streamed command line (target < 300 MB), its time, and
  the result against ``area_matrix`` of the same values in memory;
* baselines in the same run: the peak RSS and time of ``pyarrow.csv.read_csv``
  of the whole file plus ``area_matrix`` of the loaded array (the parser the
  reader uses, without streaming) and of Python importing the command line
  (the fixed cost);
* the same CSV piped into ``--stream`` through standard input (``-``): read
  once, the same memory;
* the library call ``wedgepath.io.stream_area_matrix`` in a subprocess;
* the same data as Parquet through ``--stream`` (record batches through a
  buffered stream without pre-buffering: memory of about one chunk, whatever
  the row-group size; target < 300 MB too).

Run:  .venv/bin/python benchmarks/bench_streaming.py  [--quick]
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
from _harness import Table  # noqa: E402

import wedgepath as wp  # noqa: E402

# A runner that starts one program, waits, and reports its wall time and peak RSS.  With
# --pipe FILE first, the program reads FILE from a pipe on its standard input (fed by cat,
# whose own RSS is a few MB: ru_maxrss of the children is the largest of them).
_RUNNER = r"""
import json, resource, subprocess, sys, time
argv = sys.argv[1:]
t0 = time.perf_counter()
if argv[0] == "--pipe":
    cat = subprocess.Popen(["cat", argv[1]], stdout=subprocess.PIPE)
    p = subprocess.run(argv[2:], stdin=cat.stdout, stdout=subprocess.PIPE,
                       stderr=subprocess.PIPE)
    cat.stdout.close()
    cat.wait()
else:
    p = subprocess.run(argv, stdout=subprocess.PIPE, stderr=subprocess.PIPE)
dt = time.perf_counter() - t0
ru = resource.getrusage(resource.RUSAGE_CHILDREN)
json.dump({"rc": p.returncode, "time": dt, "maxrss_kb": ru.ru_maxrss,
           "stdout": p.stdout.decode("utf-8", "replace"),
           "stderr": p.stderr.decode("utf-8", "replace")[-2000:]}, sys.stdout)
"""


def run_measured(argv):
    """Run ``argv`` as the only child of a fresh runner; (seconds, peak RSS MB, stdout)."""
    out = subprocess.run([sys.executable, "-c", _RUNNER, *argv], capture_output=True, text=True,
                         check=True)
    rep = json.loads(out.stdout)
    if rep["rc"] != 0:
        raise RuntimeError(f"{' '.join(argv[:4])} ... failed (exit {rep['rc']}): {rep['stderr']}")
    return rep["time"], rep["maxrss_kb"] / 1024.0, rep["stdout"]


def block_values(start, rows, n, seed=7):
    """Quantised (to 1/1000) invented samples of rows ``start .. start+rows-1`` as int64."""
    t = np.arange(start, start + rows, dtype=np.float64)[:, None]
    phase = np.arange(n) * (np.pi / (2 * n))
    noise = np.random.default_rng([seed, start]).standard_normal((rows, n))
    x = 5000.0 + 2000.0 * np.sin(2 * np.pi * t / 997.0 - phase) + 30.0 * noise
    return np.rint(x * 1000.0).astype(np.int64)          # 2,800,000 .. 7,200,000


def write_csv(path, T, n, block=1_000_000):
    """Write the table as fixed-point text 'dddd.ddd', built with vectorised digit arithmetic."""
    with open(path, "wb") as fh:
        fh.write((",".join(f"c{k:02d}" for k in range(n)) + "\n").encode())
        for start in range(0, T, block):
            rows = min(block, T - start)
            q = block_values(start, rows, n)
            buf = np.empty((rows, n, 9), dtype=np.uint8)
            for p in range(7):                              # 7 digits, '.' after the 4th
                col = p if p < 4 else p + 1
                buf[:, :, col] = ord("0") + (q // 10 ** (6 - p)) % 10
            buf[:, :, 4] = ord(".")
            buf[:, :, 8] = ord(",")
            buf[:, -1, 8] = ord("\n")
            fh.write(buf.tobytes())


def reference_matrix(T, n, block=1_000_000):
    X = np.empty((T, n))
    for start in range(0, T, block):
        rows = min(block, T - start)
        X[start:start + rows] = block_values(start, rows, n) / 1000.0
    return X


def rel_diff(a, b):
    a, b = np.asarray(a, dtype=float), np.asarray(b, dtype=float)
    return float(np.max(np.abs(a - b)) / np.max(np.abs(b)))


def main(quick=False):
    T, n = (1_000_000 if quick else 10_000_000), 16
    from wedgepath.cli import build_parser
    # the command line's own default chunk size: the target is about what users get
    chunk_rows = build_parser().parse_args(["leadlag", "x.csv"]).chunk_rows
    table = Table("streaming from files (issue 7)")
    py = sys.executable
    with tempfile.TemporaryDirectory(prefix="wedgepath-bench-") as tmp:
        csv_path = os.path.join(tmp, f"signals_{T}x{n}.csv")
        t0 = time.perf_counter()
        write_csv(csv_path, T, n)
        size_mb = os.path.getsize(csv_path) / 2 ** 20
        t_write = time.perf_counter() - t0
        X = reference_matrix(T, n)
        A_ref = wp.area_matrix(X)

        # ---------------------------------------------------------- the command line
        cli = [py, "-m", "wedgepath", "leadlag", csv_path, "--stream", "--quiet", "--json"]
        runs = [run_measured(cli) for _ in range(1 if quick else 2)]
        t_cli = min(r[0] for r in runs)
        rss_cli = max(r[1] for r in runs)
        A_cli = np.array(json.loads(runs[0][2])["raw_area_matrix"])
        table.value(f"CLI leadlag --stream peak RSS ({T:.0e} x {n} CSV, {size_mb:.0f} MB)",
                    rss_cli, 300.0, unit=" MB",
                    note=f"default chunks of {chunk_rows} rows; best time {t_cli:.1f} s "
                         f"({size_mb / t_cli:.0f} MB/s); file written in {t_write:.0f} s")
        table.value("  CLI result vs area_matrix in memory (max rel. diff)", rel_diff(A_cli, A_ref),
                    1e-10, note="same values parsed from the text")
        small = 25_000
        t_small, rss_small, _ = run_measured(cli + ["--chunk-rows", str(small)])
        table.info(f"  same with --chunk-rows {small}",
                   f"{rss_small:.0f} MB RSS, {t_small:.1f} s (the chunk's share of the peak)")

        # ---------------------------------------------------------- standard input (a pipe)
        t_pipe, rss_pipe, out = run_measured(["--pipe", csv_path, py, "-m", "wedgepath",
                                              "leadlag", "-", "--stream", "--quiet", "--json"])
        table.value("CLI leadlag - --stream, the CSV piped to standard input, peak RSS",
                    rss_pipe, 300.0, unit=" MB",
                    note=f"{t_pipe:.1f} s; max rel. diff "
                         f"{rel_diff(json.loads(out)['raw_area_matrix'], A_ref):.1e}")

        # ---------------------------------------------------------- baselines, same run
        t_imp, rss_imp, _ = run_measured([py, "-c", "import wedgepath.cli"])
        t_pa, rss_pa, _ = run_measured([py, "-c", "import sys, numpy as np, pyarrow.csv as c, "
                                        "wedgepath as wp; t = c.read_csv(sys.argv[1]); "
                                        "X = np.column_stack([k.to_numpy() for k in t.columns]); "
                                        "del t; wp.area_matrix(X)", csv_path])
        table.info("  baseline: import wedgepath.cli", f"{rss_imp:.0f} MB RSS, {t_imp:.1f} s")
        table.info("  baseline: pyarrow.csv.read_csv + area_matrix of the whole file",
                   f"{rss_pa:.0f} MB RSS, {t_pa:.1f} s")
        table.ratio("  streamed CLI time / whole-file read_csv + area_matrix", t_cli, t_pa, 2.0,
                    note=f"memory {rss_cli / rss_pa:.2f}x")

        # ---------------------------------------------------------- the library call
        lib = [py, "-c", "import sys, json; from wedgepath.io import stream_area_matrix; "
               "m = stream_area_matrix(sys.argv[1], chunk_rows=int(sys.argv[2])); "
               "print(json.dumps(m.values.tolist()))", csv_path, str(chunk_rows)]
        t_lib, rss_lib, out = run_measured(lib)
        A_lib = np.array(json.loads(out))
        table.value("wedgepath.io.stream_area_matrix peak RSS (same CSV)", rss_lib, 300.0,
                    unit=" MB", note=f"{t_lib:.1f} s; max rel. diff to in-memory "
                                     f"{rel_diff(A_lib, A_ref):.1e}")
        os.remove(csv_path)

        # ---------------------------------------------------------- Parquet
        try:
            import pyarrow as pa
            import pyarrow.parquet as pq
        except ImportError:
            table.info("Parquet --stream", "skipped (pyarrow not installed)")
        else:
            pq_path = os.path.join(tmp, f"signals_{T}x{n}.parquet")
            group = 1_000_000               # pyarrow's default largest row group (2**20 rows)
            names = [f"c{k:02d}" for k in range(n)]
            with pq.ParquetWriter(pq_path, pa.schema([(c, pa.float64()) for c in names])) as w:
                for a in range(0, T, group):
                    w.write_table(pa.Table.from_arrays(list(X[a:a + group].T), names=names),
                                  row_group_size=group)
            pq_mb = os.path.getsize(pq_path) / 2 ** 20
            X = None
            t_pq, rss_pq, out = run_measured([py, "-m", "wedgepath", "leadlag", pq_path,
                                              "--stream", "--quiet", "--json"])
            A_pq = np.array(json.loads(out)["raw_area_matrix"])
            table.value(f"Parquet --stream peak RSS (same data, {pq_mb:.0f} MB file)", rss_pq,
                        300.0, unit=" MB",
                        note=f"row groups of {group} rows; {t_pq:.1f} s; max rel. diff "
                             f"{rel_diff(A_pq, A_ref):.1e}")
    return table.print()


if __name__ == "__main__":
    ok = main(quick="--quick" in sys.argv)
    sys.exit(0 if ok else 1)
