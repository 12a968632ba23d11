"""Area matrices of arrays larger than memory, on Dask (optional extra ``wedgepath[dask]``).

Every entry point here builds a Dask graph of small tasks and lets Dask run
it -- on the local threads, or on a ``dask.distributed`` cluster when a
``Client`` is active (or passed as ``scheduler=``):

1. one task per chunk (a block of consecutive rows holding *all* channels)
   summarises it in an :class:`~wedgepath.signals.AreaAccumulator` state:
   first and last sample, the chord-closed areas of its pieces, the ends of
   its leading and trailing pieces -- a few vectors and one ``n x n``
   matrix, whatever the chunk's length;
2. the states are merged in order by Chen's identity in a tree (``split_every``
   states per merge task), which adds the segment joining the last sample of
   one chunk to the first sample of the next.  The client never touches the
   data; it only receives the final ``n x n`` matrix.

The result equals :func:`wedgepath.area_matrix` of the whole array (closure
``"chord"``, NaN rows are gaps that split the data into pieces) up to
rounding -- about 1e-15 relative to the largest entry.

Functions
---------
:func:`area_matrix`
    One big (T, n) array, chunked along time.
:func:`area_matrices`
    Many recordings (a list of arrays, lazy ``dask.delayed`` loaders, or one
    (R, T, n) array): one matrix per recording, or the pooled matrix.
:func:`file_area_matrices`
    Many CSV/TSV/Parquet files, each streamed in chunks on a worker.

Memory: a worker holds one chunk (``rows x n x 8`` bytes, plus the scan's
buffers of at most 2**20 numbers each) and a few ``n x n`` states; the client
holds the result only.

Examples
--------
>>> import numpy as np
>>> import dask.array as da
>>> import wedgepath as wp
>>> import wedgepath.dask as wdask
>>> X = np.random.default_rng(1).standard_normal((10_000, 4)).cumsum(axis=0)
>>> Xd = da.from_array(X, chunks=(1_000, 4))          # 10 chunks along time
>>> A = wdask.area_matrix(Xd, scheduler="sync")
>>> bool(np.allclose(A, wp.area_matrix(X), rtol=0, atol=1e-10 * abs(A.values).max()))
True
"""

from __future__ import annotations

import numbers
import os
import re

import numpy as np

from wedgepath.signals import AreaAccumulator, AreaMatrix

__all__ = ["area_matrix", "area_matrices", "file_area_matrices", "ChunkError"]

_PACK_KEYS = ("count", "first", "last", "area", "head_end", "tail_start", "gapped")


class ChunkError(ValueError):
    """A chunk (or a recording) could not be used; the message names it and the problem."""


# --------------------------------------------------------------------------- dask import
def _dask():
    try:
        import dask
        import dask.array  # noqa: F401
    except ImportError:
        raise ImportError("wedgepath.dask needs Dask: pip install 'wedgepath[dask]' "
                          "(or pip install 'dask[array,distributed]')") from None
    return dask


def _is_dask_array(obj) -> bool:
    if type(obj).__module__.split(".")[0] != "dask":
        return False
    import dask.array as da
    return isinstance(obj, da.Array)


def _is_delayed(obj) -> bool:
    if type(obj).__module__.split(".")[0] != "dask":
        return False
    from dask.delayed import Delayed
    return isinstance(obj, Delayed)


# --------------------------------------------------------------------------- states
# A task's result is a list of "packed" states, one per recording in the block
# (a single entry for a 2-D array).  A packed state is a plain dict of numpy
# arrays and scalars: cheap to pickle between workers, rebuilt on arrival with
# AreaAccumulator.from_state, which checks it.  ``valid`` records whether any
# complete row (no NaN) was seen, so that all-gap input is refused as the
# in-memory function refuses it.

def _pack(acc, valid):
    st = {k: getattr(acc, k) for k in _PACK_KEYS}
    st["n"] = acc.n
    st["valid"] = bool(valid)
    return st


def _unpack(st):
    return AreaAccumulator.from_state({**st, "names": None})


def _where(k, row0, rows, recording):
    parts = []
    if recording is not None:
        parts.append(f"recording {recording}")
    text = f"chunk {k}"
    if row0 is not None and rows is not None:
        text += f" (rows {row0}..{row0 + rows - 1})" if rows > 0 else f" (at row {row0})"
    parts.append(text)
    return ", ".join(parts)


_ROW_RE = re.compile(r"at row (\d+)")


def _state_of(block, n, k, row0, recording, skip_empty):
    """Packed state of one recording's rows in one chunk (runs on a worker)."""
    if hasattr(block, "to_numpy") and hasattr(block, "columns"):   # a DataFrame from a loader
        kinds = [getattr(dt, "kind", "O") for dt in block.dtypes]
        bad = [str(c) for c, kd in zip(block.columns, kinds) if kd not in "iuf"]
        if bad:
            raise ChunkError(f"{_where(k, row0, None, recording)}: column {bad[0]!r} is not numeric")
        block = block.to_numpy(dtype=np.float64, na_value=np.nan)
    if not isinstance(block, np.ndarray):
        try:
            block = np.asarray(block)
        except Exception as exc:  # noqa: BLE001 -- reported in one line
            raise ChunkError(f"{_where(k, row0, None, recording)}: not an array ({exc})") from None
    if block.ndim != 2:
        raise ChunkError(f"{_where(k, row0, None, recording)}: expected a 2-D (samples, channels) "
                         f"block, got shape {block.shape}")
    rows = int(block.shape[0])
    where = _where(k, row0, rows, recording)
    if n is not None and block.shape[1] != n:
        raise ChunkError(f"{where}: {block.shape[1]} channels, expected {n} "
                         "(chunks of inconsistent width)")
    if rows == 0:
        if skip_empty:
            return None          # the neutral element of the merge
        raise ChunkError(f"{where}: the chunk is empty (0 rows); pass skip_empty=True to "
                         "ignore empty chunks")
    if block.shape[1] < 2:
        raise ChunkError(f"{where}: {block.shape[1]} channel(s); lead-lag needs at least 2")
    acc = AreaAccumulator(block.shape[1])
    try:
        # the scan detects non-finite values itself (and names the row); numpy's
        # "invalid value in matmul" warning on the way there is only noise
        with np.errstate(invalid="ignore"):
            acc.update(block)
    except (ValueError, TypeError) as exc:
        msg = str(exc)
        m = _ROW_RE.search(msg)
        if m and row0 is not None:
            msg += f" (row {row0 + int(m.group(1))} of the array)"
        raise ChunkError(f"{where}: {msg}") from None
    valid = not np.isnan(acc.head_end).any()
    return _pack(acc, valid)


def _block_states(block, n, k, row0, recordings, skip_empty, two_d=False):
    """States of one block: a list with one packed state per recording it holds.

    ``recordings`` lists the recording numbers of a 3-D block, or names the
    single recording of a 2-D block (``two_d=True``); ``None`` for the one
    array of :func:`area_matrix`.
    """
    if recordings is None:
        return [_state_of(block, n, k, row0, None, skip_empty)]
    if two_d:
        return [_state_of(block, n, k, row0, recordings[0], skip_empty)]
    if getattr(block, "ndim", None) != 3 or block.shape[0] != len(recordings):
        raise ChunkError(f"chunk {k} of recordings {recordings[0]}..{recordings[-1]}: expected "
                         f"a ({len(recordings)}, rows, {n}) block, got shape "
                         f"{getattr(block, 'shape', None)}")
    return [_state_of(block[i], n, k, row0, r, skip_empty) for i, r in enumerate(recordings)]


def _merge_two(a, b):
    if a is None:
        return b
    if b is None:
        return a
    if a["n"] != b["n"]:
        raise ChunkError(f"chunks of inconsistent width: {a['n']} and {b['n']} channels")
    acc = _unpack(a)
    acc.merge(_unpack(b))
    return _pack(acc, a["valid"] or b["valid"])


def _merge_lists(*lists):
    """Merge block-state lists in order (recording by recording)."""
    out = list(lists[0])
    for lst in lists[1:]:
        out = [_merge_two(x, y) for x, y in zip(out, lst)]
    return out


def _final_area(st, recording):
    what = "X" if recording is None else f"recording {recording}"
    if st is None or st["count"] == 0:
        raise ChunkError(f"{what} has no samples")
    if st["count"] < 2:
        raise ChunkError(f"{what} has {st['count']} sample; at least 2 are needed")
    if not st["valid"]:
        raise ChunkError(f"{what} has no complete sample: every row contains NaN")
    return np.array(st["area"], dtype=np.float64)


def _assemble(labels_r, *lists, pooled=False, names=None):
    """One AreaMatrix per recording (a list), or the pooled one, from the final states."""
    states = [s for lst in lists for s in lst]
    mats = [_final_area(s, r) for s, r in zip(states, labels_r)]
    widths = {m.shape[0] for m in mats}
    if len(widths) > 1:
        first = mats[0].shape[0]
        r = next(r for m, r in zip(mats, labels_r) if m.shape[0] != first)
        raise ChunkError(f"recording {r} has {dict(zip(labels_r, mats))[r].shape[0]} channels, "
                         f"recording {labels_r[0]} has {first}")
    nm = _names_for(names, mats[0].shape[0])
    counts = [int(st["count"]) for st in states]
    if pooled:
        A = np.sum(mats, axis=0) if len(mats) > 1 else mats[0]
        return AreaMatrix(values=A, names=nm, closure="chord", samples=sum(counts))
    return [AreaMatrix(values=m, names=nm, closure="chord", samples=c)
            for m, c in zip(mats, counts)]


def _final_single(lst, names):
    st = lst[0]
    A = _final_area(st, None)
    return AreaMatrix(values=A, names=_names_for(names, A.shape[0]), closure="chord",
                      samples=int(st["count"]))


# --------------------------------------------------------------------------- checks
def _check_split_every(split_every):
    if isinstance(split_every, bool) or not isinstance(split_every, numbers.Integral):
        raise TypeError(f"split_every must be an integer >= 2, got {split_every!r}")
    if split_every < 2:
        raise ValueError(f"split_every must be >= 2, got {split_every}")
    return int(split_every)


def _check_closure(closure):
    if closure != "chord":
        raise ValueError(f"closure={closure!r} is not available for chunked arrays; only "
                         "'chord' is (it is the one Chen's identity merges exactly)")


def _check_bool(value, name):
    if not isinstance(value, bool):
        raise TypeError(f"{name} must be True or False, got {value!r}")


def _check_dtype(dtype, what):
    kind = np.dtype(dtype).kind
    if kind == "c":
        raise TypeError(f"{what} has complex values (dtype {dtype}); pass real coordinates")
    if kind not in "iuf":
        raise TypeError(f"{what} has dtype {dtype}; coordinates must be real numbers")


def _as_dask_array(X, what, chunk_rows, ndim):
    """X as a dask array (numpy input is wrapped, not copied) with metadata checks."""
    import dask.array as da

    if not _is_dask_array(X):
        if isinstance(X, np.ndarray):
            arr = X
        else:
            try:
                arr = np.asarray(X)
            except Exception as exc:  # noqa: BLE001
                raise TypeError(f"{what} could not be read as an array ({exc})") from None
        _check_dtype(arr.dtype, what)
        if arr.ndim != ndim:
            raise ValueError(f"{what} must be {ndim}-dimensional, got shape {arr.shape}")
        if chunk_rows is None:
            chunks = ("auto",) * (ndim - 1) + (-1,)
        else:
            if isinstance(chunk_rows, bool) or not isinstance(chunk_rows, numbers.Integral) \
                    or chunk_rows < 1:
                raise ValueError(f"chunk_rows must be a positive integer, got {chunk_rows!r}")
            chunks = (1,) * (ndim - 2) + (int(chunk_rows), -1)
        X = da.from_array(arr, chunks=chunks)
    _check_dtype(X.dtype, what)
    if X.ndim != ndim:
        raise ValueError(f"{what} must be {ndim}-dimensional "
                         f"({'recordings, ' if ndim == 3 else ''}samples, channels), "
                         f"got shape {X.shape}")
    n = X.shape[-1]
    if n != n:  # NaN: unknown
        raise ValueError(f"{what} has an unknown number of channels; call "
                         f"{what}.compute_chunk_sizes() first")
    if len(X.chunks[-1]) > 1:
        raise ValueError(f"{what} is chunked along channels (column chunks {X.chunks[-1]}); "
                         f"every chunk must hold all {n} channels: use "
                         f"{what}.rechunk({{{ndim - 1}: -1}})")
    if n < 2:
        raise ValueError(f"{what} has {n} channel(s); lead-lag needs at least 2")
    return X


def _row_offsets(sizes):
    out, acc = [], 0
    for s in sizes:
        if acc is None or s != s:   # unknown chunk sizes (NaN)
            out.append(None)
            acc = None
            continue
        out.append(acc)
        acc += int(s)
    return out


# --------------------------------------------------------------------------- graph
def _tree(items, split_every):
    """Reduce delayed lists of states in order, ``split_every`` at a time."""
    from dask import delayed

    merge = delayed(_merge_lists, pure=True)
    while len(items) > 1:
        groups = [items[a:a + split_every] for a in range(0, len(items), split_every)]
        items = [merge(*g) if len(g) > 1 else g[0] for g in groups]
    return items[0]


def _array_states(X, split_every, skip_empty, recording_offset=None):
    """Delayed final state list(s) of a 2-D or 3-D dask array, one tree per row of blocks."""
    from dask import delayed

    blocks = X.to_delayed(optimize_graph=True)
    n = int(X.shape[-1])
    offsets = _row_offsets(X.chunks[-2])
    state = delayed(_block_states, pure=True)
    if X.ndim == 2:
        col = [state(blocks[k, 0], n, k, offsets[k], None, skip_empty)
               for k in range(blocks.shape[0])]
        return [_tree(col, split_every)]
    out = []
    r0 = 0
    for b, size in enumerate(X.chunks[0]):
        recs = list(range(r0 + (recording_offset or 0), r0 + (recording_offset or 0) + size))
        col = [state(blocks[b, k, 0], n, k, offsets[k], recs, skip_empty)
               for k in range(blocks.shape[1])]
        out.append(_tree(col, split_every))
        r0 += size
    return out


def _compute(obj, scheduler):
    dask = _dask()
    try:
        (result,) = dask.compute(obj, scheduler=scheduler)
    except ChunkError as exc:
        raise ChunkError(str(exc)) from None
    return result


def _names_for(names, n):
    if names is None:
        return tuple(str(k) for k in range(n))
    from wedgepath.signals._kernel import check_names
    return check_names(names, n)


# --------------------------------------------------------------------------- public
def area_matrix(X, *, closure="chord", names=None, split_every=8, skip_empty=False,
                chunk_rows=None, scheduler=None, compute=True):
    """Area matrix of a (T, n) Dask array chunked along time, by a tree of chunk merges.

    ``A[i, j] = (1/2)∮(x_i dx_j - x_j dx_i)``, chord closure: the same
    quantity, with the same gap rule (NaN rows split the data into pieces,
    each closed on its own), as :func:`wedgepath.area_matrix`, to which it is
    equal up to rounding (about 1e-15 of the largest entry).

    Parameters
    ----------
    X : dask.array.Array (T, n), or array_like
        Samples in rows, channels in columns, chunked along rows only (every
        chunk holds all n channels; ``X.rechunk({1: -1})`` makes it so).  A
        numpy array is wrapped with ``dask.array.from_array`` (no copy) in
        chunks of ``chunk_rows`` rows.
    closure : {"chord"}
        Only the chord closure is available (the others need the whole
        piece at once).
    names : sequence of str, optional
        Channel names (default ``"0", "1", ...``).
    split_every : int
        Chunk states merged per task of the reduction tree (>= 2).
    skip_empty : bool
        Treat empty chunks (0 rows) as nothing instead of refusing them.
    chunk_rows : int, optional
        Rows per chunk when ``X`` is not already a Dask array (default:
        Dask's automatic size).
    scheduler : str or distributed.Client, optional
        Passed to ``dask.compute`` (``"threads"``, ``"sync"``, a Client...).
        Default: the active distributed Client if there is one, else threads.
    compute : bool
        With ``False``, return a ``dask.delayed`` object instead (compute it
        yourself, e.g. together with other results).

    Returns
    -------
    AreaMatrix, or Delayed
        The :class:`~wedgepath.AreaMatrix` (``.values`` the (n, n) array,
        ``.samples`` the rows), or a delayed object that computes it.

    Raises
    ------
    ChunkError (a ValueError)
        A chunk with the wrong number of channels, an empty chunk, an
        infinite value: the message names the chunk and its rows.
    ValueError, TypeError
        An array chunked along channels, not 2-D, non-numeric, fewer than 2
        channels or samples, no complete row.

    Examples
    --------
    >>> import numpy as np
    >>> import dask.array as da
    >>> import wedgepath.dask as wdask
    >>> t = np.linspace(0, 2 * np.pi, 1001)
    >>> X = da.from_array(np.column_stack([np.cos(t), np.sin(t)]), chunks=(100, 2))
    >>> A = wdask.area_matrix(X, scheduler="sync")    # the unit disc, counter-clockwise
    >>> round(float(A[0, 1]), 4)
    3.1416

    A dask array chunked along channels is refused:

    >>> wdask.area_matrix(X.rechunk((100, 1)), scheduler="sync")
    Traceback (most recent call last):
    ...
    ValueError: X is chunked along channels (column chunks (1, 1)); every chunk must hold all 2 channels: use X.rechunk({1: -1})
    """
    _dask()
    _check_closure(closure)
    _check_bool(skip_empty, "skip_empty")
    _check_bool(compute, "compute")
    split_every = _check_split_every(split_every)
    X = _as_dask_array(X, "X", chunk_rows, 2)
    n = int(X.shape[1])
    nm = _names_for(names, n)
    from dask import delayed

    (states,) = _array_states(X, split_every, skip_empty)
    A = delayed(_final_single, pure=True)(states, nm)
    if not compute:
        return A
    return _compute(A, scheduler)


def area_matrices(recordings, *, pooled=False, names=None, split_every=8, skip_empty=False,
                  chunk_rows=None, scheduler=None, compute=True):
    """Area matrices of many recordings at once: one per recording, or pooled.

    Each recording is closed on its own (chord closure; NaN rows inside a
    recording are gaps, as in :func:`wedgepath.area_matrix`).  The pooled
    matrix is the sum over recordings -- what ``area_matrix`` gives for the
    recordings stacked with a NaN row between consecutive ones.

    Parameters
    ----------
    recordings : sequence, or a 3-D array (R, T, n)
        Each entry a (T_r, n) Dask array chunked along time (any length), a
        numpy array, or a ``dask.delayed`` object that produces an array or
        a numeric DataFrame (a lazy loader: it is computed on a worker and
        summarised there).  A 3-D Dask or numpy array holds R recordings of
        equal length; it may be chunked along recordings and time, not
        along channels.
    pooled : bool
        Return the single pooled matrix instead of one per recording.
    names, split_every, skip_empty, chunk_rows, scheduler, compute
        As in :func:`area_matrix`.

    Returns
    -------
    list of AreaMatrix, AreaMatrix (pooled), or Delayed
        One :class:`~wedgepath.AreaMatrix` per recording, in order
        (``np.stack(result)`` is the (R, n, n) array), or the pooled one.

    Raises
    ------
    ChunkError (a ValueError)
        Naming the recording and chunk: inconsistent widths, empty chunks,
        infinite values, too few samples.

    Examples
    --------
    >>> import numpy as np
    >>> import dask
    >>> import wedgepath as wp
    >>> import wedgepath.dask as wdask
    >>> rng = np.random.default_rng(2)
    >>> recs = [rng.standard_normal((T, 3)).cumsum(axis=0) for T in (500, 800, 300)]
    >>> lazy = [dask.delayed(r.copy)() for r in recs]        # stands in for file loaders
    >>> A = wdask.area_matrices(lazy, scheduler="sync")
    >>> len(A), A[1].samples
    (3, 800)
    >>> bool(np.allclose(A[1], wp.area_matrix(recs[1]), rtol=1e-12, atol=1e-12))
    True
    >>> P = wdask.area_matrices(lazy, pooled=True, scheduler="sync")
    >>> bool(np.allclose(P, np.sum(A, axis=0), rtol=1e-12, atol=1e-12))
    True
    """
    _dask()
    from dask import delayed

    _check_bool(pooled, "pooled")
    _check_bool(skip_empty, "skip_empty")
    _check_bool(compute, "compute")
    split_every = _check_split_every(split_every)

    lists = []            # delayed state lists, in recording order
    rec_ids = []          # recording index of each state, flattened
    n_known = None
    if _is_dask_array(recordings) or (isinstance(recordings, np.ndarray) and recordings.ndim == 3):
        X = _as_dask_array(recordings, "recordings", chunk_rows, 3)
        n_known = int(X.shape[2])
        R = int(X.shape[0])
        if R == 0:
            raise ValueError("recordings is empty (0 recordings)")
        lists = _array_states(X, split_every, skip_empty)
        rec_ids = list(range(R))
    else:
        if isinstance(recordings, (str, bytes)) or not hasattr(recordings, "__iter__"):
            raise TypeError("recordings must be a sequence of arrays / dask arrays / delayed "
                            f"loaders, or a 3-D array; got {type(recordings).__name__}")
        recordings = list(recordings)
        if not recordings:
            raise ValueError("recordings is empty (0 recordings)")
        for r, rec in enumerate(recordings):
            if _is_delayed(rec):
                lists.append(delayed(_delayed_recording, pure=True)(rec, r, skip_empty))
            else:
                try:
                    Xr = _as_dask_array(rec, f"recordings[{r}]", chunk_rows, 2)
                except (ValueError, TypeError) as exc:
                    raise type(exc)(str(exc)) from None
                nr = int(Xr.shape[1])
                if n_known is not None and nr != n_known:
                    raise ValueError(f"recordings[{r}] has {nr} channels, the earlier recordings "
                                     f"have {n_known}")
                n_known = nr
                lists.append(_array_states_recording(Xr, r, split_every, skip_empty))
            rec_ids.append(r)

    if names is not None and n_known is not None:
        _names_for(names, n_known)                  # refused at once, before any work
    result = delayed(_assemble, pure=True)(rec_ids, *lists, pooled=pooled, names=names)
    if not compute:
        return result
    return _compute(result, scheduler)


def _delayed_recording(data, r, skip_empty):
    """State list of a recording produced by a delayed loader (one task)."""
    return [_state_of(data, None, 0, 0, r, skip_empty)]


def _array_states_recording(X, r, split_every, skip_empty):
    from dask import delayed

    blocks = X.to_delayed(optimize_graph=True)
    n = int(X.shape[1])
    offsets = _row_offsets(X.chunks[0])
    state = delayed(_block_states, pure=True)
    col = [state(blocks[k, 0], n, k, offsets[k], [r], skip_empty, two_d=True)
           for k in range(blocks.shape[0])]
    return _tree(col, split_every)


def file_area_matrices(paths, *, pooled=False, columns=None, time_column=None, delimiter=None,
                       chunk_rows=100_000, scheduler=None, compute=True):
    """Area matrices of many table files, each streamed in chunks by one task.

    Every file is read by :func:`wedgepath.io.stream_area_matrix` on a
    worker (memory per task: ``chunk_rows`` rows plus the ``n x n`` state),
    so a study of hundreds of CSV/Parquet recordings runs on all the
    workers of a cluster.  The files must be readable from the workers.

    Parameters
    ----------
    paths : sequence of str or path-like
        CSV, TSV or Parquet files with a header row (see :mod:`wedgepath.io`).
    pooled : bool
        Return the pooled matrix (the sum; each file closed on its own)
        instead of one per file.  The files must name the same channels.
    columns, time_column, delimiter, chunk_rows
        As in :func:`wedgepath.io.stream_area_matrix`.
    scheduler, compute
        As in :func:`area_matrix`.

    Returns
    -------
    list of AreaMatrix, AreaMatrix (pooled), or Delayed
        Labelled with the channel names read from the files.

    Raises
    ------
    wedgepath.io.TableError (a ValueError)
        A file could not be read (the message names file and line), or the
        files name different channels.

    Examples
    --------
    >>> import os, tempfile
    >>> import wedgepath.dask as wdask
    >>> folder = tempfile.mkdtemp()
    >>> for k in range(3):
    ...     with open(os.path.join(folder, f"rec{k}.csv"), "w") as fh:
    ...         _ = fh.write("a,b\\n0,0\\n1,0\\n1,1\\n0,1\\n")
    >>> files = sorted(os.path.join(folder, f) for f in os.listdir(folder))
    >>> wdask.file_area_matrices(files, pooled=True, scheduler="sync").values
    array([[ 0.,  3.],
           [-3.,  0.]])
    """
    _dask()
    from dask import delayed

    _check_bool(pooled, "pooled")
    _check_bool(compute, "compute")
    if isinstance(paths, (str, bytes, os.PathLike)) or not hasattr(paths, "__iter__"):
        raise TypeError("paths must be a sequence of file paths")
    paths = list(paths)
    if not paths:
        raise ValueError("paths is empty (0 files)")
    for k, p in enumerate(paths):
        if not isinstance(p, (str, os.PathLike)):
            raise TypeError(f"paths[{k}] must be a str or path-like, got {type(p).__name__}")
        if isinstance(p, str) and p == "-":
            raise ValueError(f"paths[{k}] is '-': workers cannot read the client's standard "
                             "input; pass files (or use wedgepath.io.stream_area_matrix('-'))")
    task = delayed(_file_matrix, pure=True)
    parts = [task(os.fspath(p), columns, time_column, delimiter, chunk_rows) for p in paths]
    result = delayed(_assemble_files, pure=True)([os.fspath(p) for p in paths], parts, pooled)
    if not compute:
        return result
    from wedgepath.io import TableError
    try:
        return _compute(result, scheduler)
    except TableError as exc:
        raise TableError(str(exc)) from None


def _file_matrix(path, columns, time_column, delimiter, chunk_rows):
    from wedgepath.io import stream_area_matrix

    return stream_area_matrix(path, columns=columns, time_column=time_column,
                              delimiter=delimiter, chunk_rows=chunk_rows, progress=False)


def _assemble_files(paths, parts, pooled):
    from wedgepath.io import TableError

    names0 = parts[0].names
    for p, m in zip(paths, parts):
        if m.names != names0:
            raise TableError(f"{p}: channels {list(m.names)} differ from {list(names0)} in "
                             f"{paths[0]}")
    if pooled:
        A = np.sum([m.values for m in parts], axis=0)
        return AreaMatrix(values=A, names=names0, closure="chord",
                          samples=sum(m.samples for m in parts))
    return list(parts)
