"""
Area matrices of recordings larger than memory, with Dask
=========================================================

Invented scenario: a made-up wind-tunnel campaign stores each run of sixteen
pressure taps as its own array; together they are larger than one machine's
memory.  :mod:`wedgepath.dask` computes the area matrix of a chunked dask
array (chunks along time, any number of them) and one matrix per recording or
the pooled matrix of many recordings, by merging per-chunk states in a tree
(Chen's identity: the signature of a concatenated path is the product of the
pieces' signatures, so the area of the whole is the sum of the pieces' areas
plus the cross terms of their increments).

The check: every number equals the in-memory :func:`wedgepath.area_matrix`
to rounding.  Here the arrays are small so that the example runs in seconds;
the code is the same for an array built with ``dask.array.from_zarr`` on a
cluster.

Run it as a script: ``python examples/dask_recordings.py``.
"""

import numpy as np

import wedgepath as wp

try:
    import dask
    import dask.array as da
    from wedgepath import dask as wdask
except ImportError:                      # the dask extra is not installed
    dask = None


def run(seed, T=60_000, n=16):
    """One invented run: a pressure wave passing the taps in turn, plus noise.

    It takes a seed, not a random generator: a generator is stateful, and a
    delayed task computed twice would draw different data the second time.
    """
    rng = np.random.default_rng(seed)
    t = np.arange(T) * 1e-3
    phase = np.linspace(0.0, 1.5 * np.pi, n)
    X = np.sin(2 * np.pi * 3.0 * t[:, None] - phase[None, :])
    return X + 0.3 * rng.normal(size=X.shape)


names = [f"tap_{k:02d}" for k in range(16)]
if dask is None:
    print("dask is not installed (pip install 'wedgepath[dask]'): nothing to show")
else:
    # %%
    # One long recording as a chunked array
    # -------------------------------------
    data = run(11)
    X = da.from_array(data, chunks=(7_000, 16))          # 9 chunks along time
    A = wdask.area_matrix(X, names=names, scheduler="synchronous")
    ref = wp.area_matrix(data, names=names)
    err = np.max(np.abs(A.values - ref.values)) / np.max(np.abs(ref.values))
    print(f"{X.numblocks[0]} chunks: max relative difference to the in-memory matrix {err:.1e}")
    assert err < 1e-10 and A.names == ref.names

    # %%
    # Many recordings: one matrix each, and the pooled matrix
    # -------------------------------------------------------
    # Each recording is loaded lazily (here from an invented generator; on a
    # cluster, ``dask.delayed(np.load)(path)``).
    runs = [dask.delayed(run)(100 + r, T=20_000) for r in range(4)]
    per_run = wdask.area_matrices(runs, names=names, scheduler="synchronous")
    pooled = wdask.area_matrices(runs, names=names, pooled=True, scheduler="synchronous")
    direct = [wp.area_matrix(run(100 + r, T=20_000)).values
              for r in range(4)]
    assert all(np.allclose(m.values, d, rtol=1e-10, atol=1e-9) for m, d in zip(per_run, direct))
    assert np.allclose(pooled.values, np.sum(direct, axis=0), rtol=1e-10, atol=1e-9)
    order = wp.cyclic_order(pooled)
    print(f"{len(per_run)} recordings; pooled cyclic order starts "
          + " -> ".join(pooled.names[k] for k in order.order[:5]) + " ...")
    print(pooled.to_frame().sort_values("area", key=np.abs, ascending=False).head(3)
          .to_string(index=False, float_format=lambda v: f"{v:.4g}"))
