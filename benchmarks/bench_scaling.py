"""Scaling of the area matrix in T (samples) and n (channels) (a script, not a test).

Issue 7 asks for a table of time and peak memory for T in {10^5, 10^6, 10^7}
and n in {8, 64, 256}, showing time growing like T n^2 and memory flat in T
when streaming.  Every cell is measured twice:

``in memory``
    ``wedgepath.area_matrix(X)`` on the whole (T, n) array; memory is the peak
    of traced allocations *above* the input array (whose size is shown).
    The cell T = 10^7, n = 256 would need a 20 GB array on a 24 GB machine:
    it is not run in memory, and the table says so.
``streamed``
    ``AreaAccumulator.update`` fed chunks of 10^5 rows, each a new array
    (a pre-generated block plus an offset, as a reader would hand over);
    memory is the peak of everything allocated while streaming, the chunk
    in flight included.

Checks (pass/MISS): the exponent of time in T (10^5 -> 10^7, streamed, per n)
is at most 1.15; the exponent in n (64 -> 256, T = 10^6, in memory) is at
most 2.2 (BLAS gets more efficient as n grows, so it is often below 2; the
column "ns per T n^2" shows the constant); streamed peak memory at T = 10^7
is at most 1.5x that at T = 10^5 (same chunk size).

Run:  .venv/bin/python benchmarks/bench_scaling.py  [--quick]
"""

from __future__ import annotations

import math
import sys
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent))
from _harness import Table, best_time, machine_line, peak_memory  # noqa: E402

import wedgepath as wp  # noqa: E402

CHUNK = 100_000
IN_MEMORY_LIMIT = 6 * 2 ** 30          # bytes: larger arrays are only streamed


def base_block(n, rows=CHUNK, seed=0):
    """An invented random walk of ``rows`` samples (the material every cell is built from)."""
    rng = np.random.default_rng([seed, n])
    return rng.standard_normal((rows, n)).cumsum(axis=0)


def build_array(T, n):
    """The (T, n) array: copies of the base block, each shifted to continue the walk."""
    B = base_block(n, min(T, CHUNK))
    X = np.empty((T, n))
    shift = B[-1] - B[0]
    for k, a in enumerate(range(0, T, B.shape[0])):
        m = min(B.shape[0], T - a)
        np.add(B[:m], k * shift, out=X[a:a + m])
    return X


def stream(T, n, B):
    """Feed T samples in chunks made from B; return the accumulator."""
    acc = wp.AreaAccumulator(n)
    shift = B[-1] - B[0]
    rows = B.shape[0]
    for k, a in enumerate(range(0, T, rows)):
        m = min(rows, T - a)
        acc.update(B[:m] + k * shift)           # a new chunk, as a reader would deliver
    return acc


def fmt_bytes(b):
    return f"{b / 2 ** 20:,.1f} MB" if b < 2 ** 30 else f"{b / 2 ** 30:,.2f} GB"


def main(quick=False):
    Ts = (10_000, 100_000, 1_000_000) if quick else (100_000, 1_000_000, 10_000_000)
    ns = (8, 64, 256)
    cells = {}          # (T, n, mode) -> (seconds, extra peak bytes)
    streamed_only = []
    for n in ns:
        B = base_block(n)
        for T in Ts:
            big = T >= 10_000_000
            Bt = B[:min(T, CHUNK)]
            # streamed
            t_s = best_time(lambda: stream(T, n, Bt), repeat=1 if big else 3)
            m_s = peak_memory(lambda: stream(T, n, Bt))
            cells[T, n, "streamed"] = (t_s, m_s)
            # in memory
            if T * n * 8 > IN_MEMORY_LIMIT:
                streamed_only.append((T, n))
                continue
            X = build_array(T, n)
            t_m = best_time(lambda: wp.area_matrix(X), repeat=2 if big else 5)
            m_m = peak_memory(lambda: wp.area_matrix(X))
            cells[T, n, "in memory"] = (t_m, m_m)
            if T == Ts[-1] and n == 64:
                # the two ways agree (the accumulator is tested elsewhere; this guards the data)
                A1, A2 = wp.area_matrix(X).values, stream(T, n, Bt).result().values
                agree = float(np.max(np.abs(A1 - A2)) / np.max(np.abs(A1)))
            X = None

    # ---------------------------------------------------------------- the grid
    print(f"\n## area_matrix scaling: time and peak memory (issue 7)\n{machine_line()}\n")
    head = ("T", "n", "mode", "time", "ns per T n^2", "input array", "peak extra memory")
    rows = []
    for n in ns:
        for T in Ts:
            for mode in ("in memory", "streamed"):
                key = (T, n, mode)
                if key not in cells:
                    rows.append((f"{T:.0e}", str(n), mode, "not run", "",
                                 fmt_bytes(T * n * 8), "does not fit: streamed instead"))
                    continue
                t, m = cells[key]
                rows.append((f"{T:.0e}", str(n), mode, f"{t:.3f} s", f"{t / (T * n * n) * 1e9:.3f}",
                             fmt_bytes(T * n * 8) if mode == "in memory" else
                             f"chunks of {min(T, CHUNK)} rows",
                             fmt_bytes(m)))
    widths = [max(len(r[k]) for r in rows + [head]) for k in range(len(head))]
    print(" | ".join(h.ljust(w) for h, w in zip(head, widths)))
    print("-+-".join("-" * w for w in widths))
    for r in rows:
        print(" | ".join(c.ljust(w) for c, w in zip(r, widths)))
    if streamed_only:
        print("\nStreamed only (the array would not fit in memory): "
              + ", ".join(f"T={T:.0e} x n={n}" for T, n in streamed_only))

    # ---------------------------------------------------------------- checks
    table = Table("area_matrix scaling checks")
    lo, hi = Ts[0], Ts[-1]
    for n in ns:
        t_lo, t_hi = cells[lo, n, "streamed"][0], cells[hi, n, "streamed"][0]
        slope = math.log(t_hi / t_lo) / math.log(hi / lo)
        table.value(f"time exponent in T ({lo:.0e} -> {hi:.0e}), n={n}, streamed", slope, 1.15,
                    note=f"{t_lo:.3f} s -> {t_hi:.3f} s (1 = linear)")
    Tm = Ts[1]
    for n_lo, n_hi in ((8, 64), (64, 256)):
        t_lo, t_hi = cells[Tm, n_lo, "in memory"][0], cells[Tm, n_hi, "in memory"][0]
        slope = math.log(t_hi / t_lo) / math.log(n_hi / n_lo)
        if n_lo == 64:
            table.value(f"time exponent in n ({n_lo} -> {n_hi}), T={Tm:.0e}, in memory", slope, 2.2,
                        note=f"{t_lo:.3f} s -> {t_hi:.3f} s (2 = quadratic)")
        else:
            table.info(f"time exponent in n ({n_lo} -> {n_hi}), T={Tm:.0e}, in memory",
                       f"{slope:.2f} (small n: per-sample costs, not n^2 flops, dominate)")
    lo_m = min(T for T in Ts if T >= CHUNK)      # smaller T would mean smaller chunks
    for n in ns:
        m_lo, m_hi = cells[lo_m, n, "streamed"][1], cells[hi, n, "streamed"][1]
        table.ratio(f"streamed peak memory T={hi:.0e} / T={lo_m:.0e}, n={n}", m_hi, m_lo, 1.5,
                    note=f"{fmt_bytes(m_lo)} -> {fmt_bytes(m_hi)}; one chunk is "
                         f"{fmt_bytes(CHUNK * n * 8)}")
    for n in ns:
        if (hi, n, "in memory") in cells:
            m = cells[hi, n, "in memory"][1]
            table.info(f"in-memory extra memory at T={hi:.0e}, n={n}",
                       f"{fmt_bytes(m)} above the {fmt_bytes(hi * n * 8)} input")
    table.value(f"streamed vs in memory, T={Ts[-1]:.0e}, n=64 (max rel. diff)", agree, 1e-10)
    return table.print()


if __name__ == "__main__":
    ok = main(quick="--quick" in sys.argv)
    sys.exit(0 if ok else 1)
