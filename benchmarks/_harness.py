"""Tiny benchmark harness shared by the scripts in this folder.

Every benchmark measures the library call and its baseline in the same run,
on the same data, and reports their ratio against a target.  Times are the
best of several repeats (the least disturbed by other load on a shared
machine); memory is the peak of traced allocations (numpy reports its array
buffers to tracemalloc) above what was allocated before the call.
"""

from __future__ import annotations

import gc
import os
import platform
import time
import tracemalloc


def best_time(fn, repeat=5, min_total=0.0):
    """Best wall time of ``fn()`` over ``repeat`` runs (at least one)."""
    best = float("inf")
    t_start = time.perf_counter()
    k = 0
    while k < repeat or time.perf_counter() - t_start < min_total:
        gc.collect()
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
        k += 1
        if k >= 50:
            break
    return best


def interleaved_best(fns, repeat):
    """Best time of each function, runs interleaved so that load spikes hit all alike."""
    best = [float("inf")] * len(fns)
    for _ in range(repeat):
        for k, fn in enumerate(fns):
            best[k] = min(best[k], best_time(fn, repeat=1))
    return best


def peak_memory(fn):
    """Peak traced allocation in bytes while ``fn()`` runs, above the start level."""
    gc.collect()
    tracemalloc.start()
    base, _ = tracemalloc.get_traced_memory()
    try:
        fn()
        _, peak = tracemalloc.get_traced_memory()
    finally:
        tracemalloc.stop()
    return peak - base


def machine_line():
    """One line naming the machine, Python and BLAS the run used."""
    import numpy as np
    blas = "unknown BLAS"
    try:
        cfg = np.show_config(mode="dicts")
        b = cfg.get("Build Dependencies", {}).get("blas", {})
        blas = f"{b.get('name', '?')} {b.get('version', '')}".strip()
    except Exception:
        pass
    return (f"{platform.machine()} {os.cpu_count()} cores, Python {platform.python_version()}, "
            f"numpy {np.__version__} ({blas})")


class Table:
    """Collects rows and prints them aligned, with pass/miss against targets."""

    def __init__(self, title):
        self.title = title
        self.rows = []

    def ratio(self, name, measured, baseline, target, *, lower_is_better=True, unit="x", note=""):
        """Add a row comparing ``measured / baseline`` to ``target``."""
        r = measured / baseline if baseline > 0 else float("inf")
        ok = r <= target if lower_is_better else r >= target
        cmp = "<=" if lower_is_better else ">="
        self.rows.append((name, f"{r:.2f}{unit}", f"{cmp} {target:g}{unit}", "pass" if ok else "MISS", note))
        return ok

    def value(self, name, value, target, *, unit="", lower_is_better=True, note=""):
        """Add a row comparing an absolute value to ``target``."""
        ok = value <= target if lower_is_better else value >= target
        cmp = "<=" if lower_is_better else ">="
        self.rows.append((name, f"{value:.3g}{unit}", f"{cmp} {target:g}{unit}", "pass" if ok else "MISS", note))
        return ok

    def info(self, name, text):
        self.rows.append((name, text, "", "", ""))

    def print(self):
        head = ("benchmark", "measured", "target", "result", "note")
        widths = [max(len(str(r[k])) for r in self.rows + [head]) for k in range(5)]
        print(f"\n## {self.title}\n{machine_line()}\n")
        print(" | ".join(h.ljust(w) for h, w in zip(head, widths)))
        print("-+-".join("-" * w for w in widths))
        for r in self.rows:
            print(" | ".join(str(c).ljust(w) for c, w in zip(r, widths)))
        return all(r[3] != "MISS" for r in self.rows)
