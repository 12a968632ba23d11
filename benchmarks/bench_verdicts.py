"""Benchmark: what the calibrated verdict and the honest-reading checks cost (issue 17).

Target: ``wedgepath leadlag`` -- which now also runs the phase-surrogate verdict on
the leading cycle (199 surrogates), the drift check and the anti-phase check --
within 3x of the same command at the tag ``w2-base`` (the code before issue 17),

* on the bundled demo table (``ring_sensors.csv``, 3000 x 8, ``--time time_s``), and
* on a 1,000,000 x 16 CSV (invented lead-lag data, ``bench_streaming.write_csv``),

and ``wedgepath demo --no-figures`` within 3x as well.  The old code is the
``src`` tree of ``w2-base`` extracted by ``git archive`` into a temporary folder
and put first on ``PYTHONPATH``; the new code is this checkout's ``src``.  Both
run as fresh processes with the same interpreter, interleaved, best of
``--repeat`` (default 3).  In-process rows show what the verdict itself costs.

Run:  .venv/bin/python benchmarks/bench_verdicts.py  [--quick] [--repeat N]
"""

from __future__ import annotations

import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent
sys.path.insert(0, str(HERE))
from _harness import Table, best_time  # noqa: E402
from bench_streaming import reference_matrix, write_csv  # noqa: E402

BASE_TAG = "w2-base"


def extract_base(dest):
    """The ``src`` tree of the baseline tag, extracted into ``dest``; returns its path."""
    arch = subprocess.run(["git", "-C", str(ROOT), "archive", BASE_TAG, "src"],
                          capture_output=True, check=True).stdout
    subprocess.run(["tar", "-x", "-C", dest], input=arch, check=True)
    return os.path.join(dest, "src")


def timed(argv, src):
    env = dict(os.environ, PYTHONPATH=src, WEDGEPATH_PROGRESS="0")
    t0 = time.perf_counter()
    p = subprocess.run(argv, capture_output=True, text=True, env=env, cwd=tempfile.gettempdir())
    dt = time.perf_counter() - t0
    if p.returncode != 0:
        raise RuntimeError(f"{' '.join(argv[:6])} ... exit {p.returncode}: {p.stderr[-800:]}")
    return dt


def which(src):
    env = dict(os.environ, PYTHONPATH=src)
    return subprocess.run([sys.executable, "-c", "import wedgepath; print(wedgepath.__file__)"],
                          capture_output=True, text=True, env=env).stdout.strip()


def compare(table, label, argv, old_src, new_src, repeat, target=3.0):
    old, new = [], []
    for _ in range(repeat):
        old.append(timed(argv, old_src))
        new.append(timed(argv, new_src))
    to, tn = min(old), min(new)
    table.ratio(f"{label}: now / {BASE_TAG}", tn, to, target,
                note=f"{tn:.2f} s vs {to:.2f} s (best of {repeat})")


def main(quick=False, repeat=3):
    py = sys.executable
    T, n = (200_000 if quick else 1_000_000), 16
    table = Table(f"lead-lag with calibrated verdicts vs {BASE_TAG} (issue 17)")
    new_src = str(ROOT / "src")
    demo = str(ROOT / "src" / "wedgepath" / "data" / "ring_sensors.csv")
    with tempfile.TemporaryDirectory(prefix="wedgepath-bench-verd-") as tmp:
        old_src = extract_base(tmp)
        assert which(old_src).startswith(old_src), which(old_src)
        assert which(new_src).startswith(new_src), which(new_src)
        compare(table, "leadlag demo table (3000 x 8)",
                [py, "-m", "wedgepath", "leadlag", demo, "--time", "time_s", "--json",
                 "--quiet"], old_src, new_src, repeat)
        compare(table, "wedgepath demo --no-figures",
                [py, "-m", "wedgepath", "demo", "--no-figures", "--quiet"], old_src, new_src,
                repeat)
        path = os.path.join(tmp, f"signals_{T}x{n}.csv")
        write_csv(path, T, n)
        compare(table, f"leadlag {T:,} x {n} CSV",
                [py, "-m", "wedgepath", "leadlag", path, "--json", "--quiet"], old_src,
                new_src, repeat)

    # ------------------------------------------------------------ in process
    import wedgepath as wp

    X = reference_matrix(T, n)
    t_area = best_time(lambda: wp.area_matrix(X), repeat=3)
    t_fit = best_time(lambda: wp.fit_test(X, seed=0), repeat=3)
    t_drift = best_time(lambda: wp.drift_check(X, warn=False), repeat=3)
    table.info(f"  in process ({T:,} x {n}): area_matrix / fit_test / drift_check",
               f"{t_area:.2f} s / {t_fit:.2f} s / {t_drift:.2f} s")
    return table.print()


if __name__ == "__main__":
    import argparse

    ap = argparse.ArgumentParser()
    ap.add_argument("--quick", action="store_true")
    ap.add_argument("--repeat", type=int, default=3)
    a = ap.parse_args()
    sys.exit(0 if main(a.quick, a.repeat) else 1)
