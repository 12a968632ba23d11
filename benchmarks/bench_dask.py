"""Benchmark of wedgepath.dask on a LocalCluster (a script, not a test).

Target (issue 7): on a ``dask.distributed`` LocalCluster of 2 workers, the
area matrix of a 10^7 x 64 array chunked along time equals the in-memory
result (1e-10 relative) and takes under 3x the in-memory time.

The data are invented (a random walk per chunk, seeded by the chunk's
number).  Each worker generates its own chunks, which are persisted in the
workers' memory before timing, so the timed run is the library's work --
per-chunk states on the workers, the merge tree, the scheduling -- and not
the generation or a copy over the network.  The in-memory baseline is
``wedgepath.area_matrix`` on the same values assembled in this process (all
of BLAS's threads).  Best of several interleaved runs.

Information rows: the threads scheduler on the in-memory array (no
cluster), and many recordings at once (``area_matrices``) against a loop of in-memory calls.

Run:  .venv/bin/python benchmarks/bench_dask.py  [--quick]
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent))
from _harness import Table, best_time, interleaved_best  # noqa: E402

import wedgepath as wp  # noqa: E402


def make_block(k, rows, n, seed=3):
    """Chunk ``k`` of the invented data: a random walk seeded by (seed, k)."""
    rng = np.random.default_rng([seed, k])
    block = rng.standard_normal((rows, n))
    np.cumsum(block, axis=0, out=block)
    block += 100.0 * k
    return block


def _block_for_dask(block_info=None, rows=0, n=0):
    k = block_info[None]["chunk-location"][0]
    return make_block(k, rows, n)



def rel_diff(a, b):
    return float(np.max(np.abs(np.asarray(a) - b)) / np.max(np.abs(b)))


def main(quick=False):
    table = Table("wedgepath.dask on a LocalCluster (issue 7)")
    try:
        import dask
        import dask.array as da
        from distributed import Client, LocalCluster, wait
    except ImportError:
        table.info("dask benchmarks", "skipped: dask[array,distributed] is not installed "
                   "(pip install 'wedgepath[dask]')")
        table.print()
        print("SKIPPED")
        return True
    import wedgepath.dask as wdask

    T, n = (1_000_000 if quick else 10_000_000), 64
    K = 40                                   # chunks along time
    rows = T // K
    repeat = 3 if quick else 4

    # the in-memory copy of the same values (assembled here, untimed)
    X = np.empty((T, n))
    for k in range(K):
        X[k * rows:(k + 1) * rows] = make_block(k, rows, n)

    t0 = time.perf_counter()
    cluster = LocalCluster(n_workers=2, threads_per_worker=1, processes=True,
                           dashboard_address=None, silence_logs=40)
    client = Client(cluster)
    t_start = time.perf_counter() - t0
    try:
        Xd = da.map_blocks(_block_for_dask, dtype=np.float64, chunks=((rows,) * K, (n,)),
                           rows=rows, n=n, meta=np.empty((0, 0)))
        Xd = Xd.persist()
        wait(Xd)

        A_mem = wp.area_matrix(X)
        A_dask = wdask.area_matrix(Xd, scheduler=client)
        t_mem, t_dask = interleaved_best(
            [lambda: wp.area_matrix(X), lambda: wdask.area_matrix(Xd, scheduler=client)], repeat)
        table.ratio(f"cluster (2 workers x 1 thread) / in-memory, T={T:.0e}, n={n}", t_dask, t_mem,
                    3.0, note=f"{t_dask:.2f} s vs {t_mem:.2f} s; {K} chunks of {rows} rows in "
                              f"workers' memory; cluster started in {t_start:.1f} s")
        table.value("  result vs in-memory (max rel. diff)", rel_diff(A_dask, A_mem), 1e-10)

        # threads scheduler on the in-memory array: no copies, no cluster (information)
        Xl = da.from_array(X, chunks=(rows, n))
        t_thr = best_time(lambda: wdask.area_matrix(Xl, scheduler="threads"), repeat=repeat)
        table.info("  threads scheduler on the same array (no cluster)",
                   f"{t_thr / t_mem:.2f}x ({t_thr:.2f} s); max rel. diff "
                   f"{rel_diff(wdask.area_matrix(Xl, scheduler='threads'), A_mem):.1e}")
        Xd = Xl = None
        X = None

        # many recordings at once (information)
        R, Tr = (16, 50_000) if quick else (64, 100_000)
        recs_mem = [make_block(1000 + r, Tr, n) for r in range(R)]
        # recording r is generated on a worker with the same seed as recs_mem[r]
        recs = [dask.delayed(make_block)(1000 + r, Tr, n) for r in range(R)]
        recs = client.persist(recs)
        wait(recs)
        ref = np.stack([wp.area_matrix(x) for x in recs_mem])
        t_loop, t_many = interleaved_best(
            [lambda: [wp.area_matrix(x) for x in recs_mem],
             lambda: wdask.area_matrices(recs, scheduler=client)], max(2, repeat - 1))
        got = wdask.area_matrices(recs, scheduler=client)
        table.info(f"  area_matrices, {R} recordings of {Tr} x {n} / in-memory loop",
                   f"{t_many / t_loop:.2f}x ({t_many:.2f} s vs {t_loop:.2f} s); max rel. diff "
                   f"{rel_diff(got, ref):.1e}")
        pooled = wdask.area_matrices(recs, pooled=True, scheduler=client)
        table.value("  pooled vs sum of in-memory matrices (max rel. diff)",
                    rel_diff(pooled, ref.sum(axis=0)), 1e-10)
    finally:
        client.close()
        cluster.close()
    return table.print()


if __name__ == "__main__":
    ok = main(quick="--quick" in sys.argv)
    sys.exit(0 if ok else 1)
