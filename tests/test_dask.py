"""Area matrices on Dask (wedgepath.dask) and streamed from files, against the in-memory result.

The reference everywhere is :func:`wedgepath.area_matrix` of the whole array
in memory (itself tested against per-pair loops, exact rational arithmetic
and closed forms in test_signals.py).  The cluster is a
``dask.distributed.LocalCluster`` started here (two single-threaded worker
processes, so that every partial state is pickled and sent between processes)
and shut down at the end of the module.
"""

from __future__ import annotations

import os
import traceback

import numpy as np
import pytest

import dask
import dask.array as da
from dask.delayed import Delayed
from distributed import Client, LocalCluster

import wedgepath as wp
import wedgepath.dask as wdask
from wedgepath.io import TableError, stream_area_matrix

RTOL = 1e-10


@pytest.fixture(scope="module")
def client():
    # worker processes: every state crosses a process boundary (pickled), as on a real cluster
    cluster = LocalCluster(n_workers=2, threads_per_worker=1, processes=True,
                           dashboard_address=None)
    cl = Client(cluster)
    try:
        yield cl
    finally:
        cl.close()
        cluster.close()


def close(a, b, rtol=RTOL):
    a, b = np.asarray(a), np.asarray(b)
    assert a.shape == b.shape
    scale = max(float(np.max(np.abs(b))), 1e-300)
    err = float(np.max(np.abs(a - b))) / scale
    return err <= rtol


def walk(T, n, seed, offset=0.0, drift=0.0):
    rng = np.random.default_rng(seed)
    return (rng.standard_normal((T, n)) + drift).cumsum(axis=0) + offset


def readonly(a):
    a = np.array(a)
    a.setflags(write=False)
    return a


def one_line(excinfo):
    msg = str(excinfo.value)
    assert "\n" not in msg and msg
    return msg


# --------------------------------------------------------------------------- one big array
class TestOneArray:
    @pytest.mark.parametrize("chunks", [(1000,), (777,), ((1, 2, 3, 3994, 1000),), (5000,), (2,),
                                        (1,)])
    def test_matches_in_memory_on_cluster(self, client, chunks):
        T = 5000 if chunks not in ((1,), (2,)) else 400
        X = readonly(walk(T, 5, seed=len(str(chunks)), offset=1e6, drift=0.3))
        before = X.copy()
        Xd = da.from_array(X, chunks=(chunks[0], 5))
        A = wdask.area_matrix(Xd, scheduler=client)
        assert close(A, wp.area_matrix(X))
        assert np.array_equal(X, before)
        # skew-symmetric like the in-memory result
        assert np.array_equal(A.values, -A.values.T)

    @pytest.mark.parametrize("split_every", [2, 3, 8, 1000])
    def test_any_tree_shape(self, split_every):
        X = walk(3000, 4, seed=split_every)
        Xd = da.from_array(X, chunks=(97, 4))
        A = wdask.area_matrix(Xd, split_every=split_every, scheduler="sync")
        assert close(A, wp.area_matrix(X))

    def test_random_chunkings(self):
        rng = np.random.default_rng(5)
        for trial in range(12):
            T = int(rng.integers(2, 600))
            X = walk(T, 3, seed=trial, offset=rng.uniform(-1e4, 1e4))
            cuts = np.sort(rng.choice(np.arange(1, T), size=min(T - 1, int(rng.integers(0, 12))),
                                      replace=False))
            sizes = tuple(int(s) for s in np.diff(np.concatenate(([0], cuts, [T]))))
            Xd = da.from_array(X, chunks=(sizes, (3,)))
            assert close(wdask.area_matrix(Xd, scheduler="sync"), wp.area_matrix(X)), sizes

    def test_gaps_across_chunk_borders(self, client):
        X = walk(2000, 4, seed=3, offset=50.0)
        X[0] = np.nan                     # gap in the first row
        X[99:101] = np.nan                # a gap straddling the border at 100
        X[300:500] = np.nan               # two whole chunks of gap
        X[650, 2] = np.nan                # one missing cell
        X[799] = np.nan                   # last row of a chunk
        X[800] = np.nan                   # and first row of the next
        X[-1] = np.nan                    # last row
        Xd = da.from_array(X, chunks=(100, 4))
        assert close(wdask.area_matrix(Xd, scheduler=client), wp.area_matrix(X))

    def test_integer_and_float32_chunks(self):
        rng = np.random.default_rng(8)
        Xi = rng.integers(-50, 50, size=(1000, 3)).cumsum(axis=0)
        Ai = wdask.area_matrix(da.from_array(Xi, chunks=(128, 3)), scheduler="sync")
        assert close(Ai, wp.area_matrix(Xi), rtol=1e-13)
        Xf = walk(1000, 3, seed=9).astype(np.float32)
        Af = wdask.area_matrix(da.from_array(Xf, chunks=(128, 3)), scheduler="sync")
        assert close(Af, wp.area_matrix(Xf))

    def test_numpy_input_and_labels(self):
        X = walk(1500, 3, seed=11)
        m = wdask.area_matrix(X, chunk_rows=200, names=["a", "b", "c"], scheduler="sync")
        assert isinstance(m, wp.AreaMatrix)
        assert m.names == ("a", "b", "c") and m.samples == 1500 and m.closure == "chord"
        assert wdask.area_matrix(X, chunk_rows=500, scheduler="sync").names == ("0", "1", "2")
        ref = wp.area_matrix(X)
        assert close(m.values, ref)
        assert m["a", "c"] == pytest.approx(ref[0, 2], rel=RTOL)

    def test_unknown_chunk_sizes(self, client):
        X = walk(3000, 3, seed=12)
        keep = np.ones(3000, dtype=bool)
        keep[::7] = False
        Xd = da.from_array(X, chunks=(250, 3))[da.from_array(keep, chunks=250)]
        assert np.isnan(Xd.shape[0])
        assert close(wdask.area_matrix(Xd, scheduler=client), wp.area_matrix(X[keep]))

    def test_lazy_graph_is_a_tree_of_merges(self):
        X = walk(6400, 3, seed=13)
        Xd = da.from_array(X, chunks=(100, 3))          # 64 chunks
        lazy = wdask.area_matrix(Xd, split_every=4, compute=False)
        assert isinstance(lazy, Delayed)
        keys = [str(k[0] if isinstance(k, tuple) else k) for k in dict(lazy.__dask_graph__())]
        merges = [k for k in keys if k.startswith("_merge_lists")]
        states = [k for k in keys if k.startswith("_block_states")]
        assert len(states) == 64
        assert len(merges) == 16 + 4 + 1               # a tree of fan-in 4, not a chain
        assert close(lazy.compute(scheduler="sync"), wp.area_matrix(X))

    def test_result_is_a_copy_the_caller_owns(self):
        X = walk(500, 3, seed=14)
        A = np.array(wdask.area_matrix(da.from_array(X, chunks=(100, 3)), scheduler="sync"))
        A[0, 1] = 123.0                                   # a writable copy; X is untouched
        assert close(wdask.area_matrix(da.from_array(X, chunks=(100, 3)), scheduler="sync"),
                     wp.area_matrix(X))


# --------------------------------------------------------------------------- many recordings
class TestManyRecordings:
    def recordings(self):
        return [walk(T, 4, seed=T, offset=10.0 * T) for T in (300, 1200, 50, 2000, 2)]

    def stacked(self, recs):
        """The recordings one after another with a NaN row between them (in memory)."""
        n = recs[0].shape[1]
        parts = []
        for k, r in enumerate(recs):
            if k:
                parts.append(np.full((1, n), np.nan))
            parts.append(r)
        return np.concatenate(parts)

    def test_list_of_dask_arrays_on_cluster(self, client):
        recs = self.recordings()
        dk = [da.from_array(r, chunks=(max(1, r.shape[0] // 3), 4)) for r in recs]
        A = wdask.area_matrices(dk, scheduler=client)
        assert len(A) == len(recs) and np.stack(A).shape == (len(recs), 4, 4)
        assert [m.samples for m in A] == [r.shape[0] for r in recs]
        for k, r in enumerate(recs):
            assert close(A[k], wp.area_matrix(r))
        P = wdask.area_matrices(dk, pooled=True, scheduler=client)
        assert close(P, wp.area_matrix(self.stacked(recs)))

    def test_delayed_loaders_and_numpy(self, client):
        recs = self.recordings()
        loaders = [dask.delayed(np.array)(r) for r in recs[:3]] + [recs[3], recs[4]]
        A = wdask.area_matrices(loaders, scheduler=client)
        for k, r in enumerate(recs):
            assert close(A[k], wp.area_matrix(r))

    def test_delayed_dataframe_loader(self):
        pd = pytest.importorskip("pandas")
        r = walk(400, 3, seed=21)
        frame = dask.delayed(pd.DataFrame)(r, columns=["x", "y", "z"])
        A = wdask.area_matrices([frame], names=["x", "y", "z"], scheduler="sync")
        assert A[0].names == ("x", "y", "z")
        assert close(A[0].values, wp.area_matrix(r))

    def test_three_d_array_chunked_along_recordings_and_time(self, client):
        R, T, n = 7, 900, 3
        stack = np.stack([walk(T, n, seed=s, offset=s) for s in range(R)])
        Xd = da.from_array(stack, chunks=(3, 200, n))
        A = wdask.area_matrices(Xd, scheduler=client)
        assert np.stack(A).shape == (R, n, n)
        for k in range(R):
            assert close(A[k], wp.area_matrix(stack[k]))
        P = wdask.area_matrices(stack, pooled=True, chunk_rows=128, scheduler="sync")
        assert close(P, wp.area_matrix(self.stacked(list(stack))))

    def test_labels(self):
        recs = self.recordings()[:2]
        out = wdask.area_matrices(recs, names=list("abcd"), scheduler="sync")
        assert [m.names for m in out] == [tuple("abcd")] * 2
        pooled = wdask.area_matrices(recs, pooled=True, scheduler="sync")
        assert isinstance(pooled, wp.AreaMatrix) and pooled.names == ("0", "1", "2", "3")
        assert pooled.samples == sum(r.shape[0] for r in recs)


# --------------------------------------------------------------------------- files
def write_csv(path, X, names, extra_lines=()):
    with open(path, "w") as fh:
        fh.write(",".join(names) + "\n")
        for row in X:
            fh.write(",".join(repr(float(v)) for v in row) + "\n")
        for line in extra_lines:
            fh.write(line + "\n")


class TestFiles:
    def test_files_per_recording_and_pooled(self, client, tmp_path):
        recs = [walk(T, 3, seed=T) for T in (250, 1000, 40)]
        paths = []
        for k, r in enumerate(recs):
            p = tmp_path / f"rec{k}.csv"
            write_csv(p, r, ["a", "b", "c"])
            paths.append(p)
        A = wdask.file_area_matrices(paths, chunk_rows=64, scheduler=client)
        for k, r in enumerate(recs):
            assert close(A[k], wp.area_matrix(r))
        assert [m.names for m in A] == [("a", "b", "c")] * 3
        P = wdask.file_area_matrices(paths, pooled=True, scheduler=client)
        assert P.names == ("a", "b", "c") and P.samples == 1290
        assert close(P.values, sum(wp.area_matrix(r).values for r in recs))

    def test_bad_file_names_file_and_line(self, client, tmp_path):
        good = tmp_path / "good.csv"
        bad = tmp_path / "bad.csv"
        write_csv(good, walk(20, 2, seed=1), ["a", "b"])
        write_csv(bad, walk(20, 2, seed=2), ["a", "b"], extra_lines=["a,b,c"])
        with pytest.raises(TableError) as e:
            wdask.file_area_matrices([good, bad], scheduler=client)
        msg = one_line(e)
        assert "bad.csv" in msg and "line 22" in msg

    def test_files_with_different_channels(self, tmp_path):
        p1, p2 = tmp_path / "one.csv", tmp_path / "two.csv"
        write_csv(p1, walk(20, 2, seed=1), ["a", "b"])
        write_csv(p2, walk(20, 2, seed=2), ["a", "c"])
        with pytest.raises(TableError) as e:
            wdask.file_area_matrices([p1, p2], scheduler="sync")
        assert "two.csv" in one_line(e)


class TestStreamFromFile:
    def test_header_change_mid_file_names_the_line(self, tmp_path):
        X = walk(3000, 2, seed=4)
        p = tmp_path / "changes.csv"
        with open(p, "w") as fh:
            fh.write("a,b\n")
            for row in X[:2500]:
                fh.write(f"{float(row[0])!r},{float(row[1])!r}\n")
            fh.write("c,d\n")                      # line 2502: a new header
            for row in X[2500:]:
                fh.write(f"{float(row[0])!r},{float(row[1])!r}\n")
        with pytest.raises(TableError) as e:
            stream_area_matrix(p, chunk_rows=1000)
        msg = one_line(e)
        assert "line 2502" in msg and "header changes" in msg

    def test_streamed_equals_in_memory(self, tmp_path):
        X = walk(5000, 3, seed=6, offset=1e3)
        p = tmp_path / "long.csv"
        write_csv(p, X, ["u", "v", "w"])
        m = stream_area_matrix(p, chunk_rows=333)
        assert close(m.values, wp.area_matrix(X))


# --------------------------------------------------------------------------- bad input
class TestBadInput:
    def test_chunked_along_channels(self):
        Xd = da.from_array(walk(100, 4, seed=1), chunks=(50, 2))
        with pytest.raises(ValueError) as e:
            wdask.area_matrix(Xd)
        msg = one_line(e)
        assert "chunked along channels" in msg and "rechunk" in msg
        stack = da.from_array(np.zeros((2, 10, 4)), chunks=(1, 5, 2))
        with pytest.raises(ValueError, match="chunked along channels"):
            wdask.area_matrices(stack)

    def test_inconsistent_width_names_the_chunk(self, client):
        def block(k):
            return walk(10, 3 if k != 2 else 4, seed=k)
        parts = [da.from_delayed(dask.delayed(block)(k), shape=(10, 3), dtype=float)
                 for k in range(4)]
        with pytest.raises(wdask.ChunkError) as e:
            wdask.area_matrix(da.concatenate(parts), scheduler=client)
        msg = one_line(e)
        assert "chunk 2" in msg and "rows 20..29" in msg and "4 channels" in msg
        # the error reaches the caller without the worker's traceback
        assert e.value.__cause__ is None
        assert len(traceback.extract_tb(e.value.__traceback__)) <= 4

    def test_empty_chunk(self, client):
        X = walk(500, 3, seed=2)
        Xd = da.from_array(X, chunks=((200, 0, 300), (3,)))
        with pytest.raises(wdask.ChunkError) as e:
            wdask.area_matrix(Xd, scheduler=client)
        msg = one_line(e)
        assert "chunk 1" in msg and "empty" in msg
        assert close(wdask.area_matrix(Xd, skip_empty=True, scheduler=client), wp.area_matrix(X))

    def test_infinite_value_names_chunk_and_row(self, client):
        X = walk(1000, 3, seed=3)
        X[437, 1] = np.inf
        with pytest.raises(wdask.ChunkError) as e:
            wdask.area_matrix(da.from_array(X, chunks=(100, 3)), scheduler=client)
        msg = one_line(e)
        assert "chunk 4 (rows 400..499)" in msg and "row 437 of the array" in msg

    @pytest.mark.parametrize("arr,exc,words", [
        (np.zeros((10, 3), dtype=bool), TypeError, "dtype bool"),
        (np.zeros((10, 3), dtype=complex), TypeError, "complex"),
        (np.array([["a", "b"], ["c", "d"]]), TypeError, "real numbers"),
        (np.zeros(10), ValueError, "2-dimensional"),
        (np.zeros((10, 1)), ValueError, "at least 2"),
    ])
    def test_bad_arrays(self, arr, exc, words):
        for X in (arr, da.from_array(arr)):
            with pytest.raises(exc) as e:
                wdask.area_matrix(X, scheduler="sync")
            assert words in one_line(e)

    def test_too_few_samples_and_all_gaps(self):
        with pytest.raises(ValueError) as e:
            wdask.area_matrix(da.from_array(np.ones((1, 3))), scheduler="sync")
        assert "at least 2" in one_line(e)
        with pytest.raises(ValueError) as e:
            wdask.area_matrix(da.from_array(np.full((20, 3), np.nan), chunks=(5, 3)),
                              scheduler="sync")
        assert "no complete sample" in one_line(e)

    @pytest.mark.parametrize("kwargs,exc,words", [
        ({"closure": "detrend"}, ValueError, "only 'chord'"),
        ({"split_every": 1}, ValueError, "split_every"),
        ({"split_every": 2.5}, TypeError, "split_every"),
        ({"labels": True}, TypeError, "labels"),        # gone: always labelled
        ({"chunk_rows": 0}, ValueError, "chunk_rows"),
        ({"names": ["a", "b"]}, ValueError, "names"),
    ])
    def test_bad_options(self, kwargs, exc, words):
        with pytest.raises(exc) as e:
            wdask.area_matrix(walk(30, 3, seed=0), scheduler="sync", **kwargs)
        assert words in one_line(e)

    def test_recordings_of_different_widths(self, client):
        with pytest.raises(ValueError) as e:
            wdask.area_matrices([walk(10, 3, seed=0), walk(10, 4, seed=1)])
        assert "recordings[1]" in one_line(e)
        lazy = [dask.delayed(walk)(10, 3, 0), dask.delayed(walk)(10, 4, 1)]
        with pytest.raises(wdask.ChunkError) as e:
            wdask.area_matrices(lazy, scheduler=client)
        assert "recording 1" in one_line(e)

    def test_recording_too_short_is_named(self):
        recs = [walk(10, 3, seed=0), walk(1, 3, seed=1)]
        with pytest.raises(wdask.ChunkError) as e:
            wdask.area_matrices(recs, scheduler="sync")
        assert "recording 1" in one_line(e)

    def test_empty_or_wrong_containers(self):
        with pytest.raises(ValueError, match="0 recordings"):
            wdask.area_matrices([])
        with pytest.raises(TypeError, match="recordings"):
            wdask.area_matrices("file.csv")
        with pytest.raises(TypeError, match="paths"):
            wdask.file_area_matrices("file.csv")
        with pytest.raises(ValueError, match="0 files"):
            wdask.file_area_matrices([])
        with pytest.raises(ValueError, match=r"paths\[1\] is '-'.*standard input"):
            wdask.file_area_matrices(["a.csv", "-"])

    def test_accumulator_chunks_of_inconsistent_width(self):
        acc = wp.AreaAccumulator(3).update(walk(10, 3, seed=0))
        with pytest.raises(ValueError) as e:
            acc.update(walk(10, 4, seed=1))
        assert "4 channels" in one_line(e)


def test_module_import_does_not_start_anything():
    # importing wedgepath.dask must not import distributed or start a client
    import subprocess
    import sys
    code = ("import sys, wedgepath.dask; "
            "print('distributed' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         env={**os.environ, "PYTHONWARNINGS": "ignore"}, timeout=120)
    assert out.returncode == 0, out.stderr
    assert out.stdout.strip() == "False"
