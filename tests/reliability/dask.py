"""Bad-input rows for the dask edge (no rows without the optional extra)."""

from __future__ import annotations

from ._table import *  # noqa: F403 - the shared inputs, row() and returns()
from .tables import _TMP, MALFORMED, tfile


try:
    import wedgepath.dask as wdask
    import dask.array as da
except ImportError:  # the optional extra is not installed: no rows
    wdask = None

if wdask is not None:
    DA = "wp.dask.area_matrix(X)"
    row(DA, "ndim", "a 1-D array", lambda: wdask.area_matrix(np.arange(5.0), scheduler="sync"),
        ValueError, "must be 2-dimensional")
    row(DA, "ndim", "a dask array chunked along channels",
        lambda: wdask.area_matrix(da.from_array(loop(2), chunks=(4, 1)), scheduler="sync"),
        ValueError, "chunked along channels")
    row(DA, "ndim", "one channel", lambda: wdask.area_matrix(loop(1), scheduler="sync"), ValueError,
        "at least 2")
    row(DA, "complex", "complex values", lambda: wdask.area_matrix(loop(2) + 1j, scheduler="sync"),
        TypeError, "complex")
    row(DA, "text", "text", lambda: wdask.area_matrix(np.array(text(2)), scheduler="sync"),
        TypeError, "coordinates must be real numbers")
    row(DA, "object", "an object array", lambda: wdask.area_matrix(objects(2), scheduler="sync"),
        TypeError, "coordinates must be real numbers")
    row(DA, "inf", "an infinite value", lambda: wdask.area_matrix(with_inf(2), scheduler="sync"),
        ValueError, "infinite")
    row(DA, "nan", "every row NaN", lambda: wdask.area_matrix(np.full((5, 2), nan),
                                                              scheduler="sync"),
        ValueError, "no complete")
    row(DA, "option", "closure='detrend'",
        lambda: wdask.area_matrix(loop(2), closure="detrend", scheduler="sync"), ValueError,
        "only 'chord'")
    row(DA, "option", "split_every=1",
        lambda: wdask.area_matrix(loop(2), split_every=1, scheduler="sync"), ValueError,
        "split_every must be >= 2")
    row(DA, "text", "names='ab' (one string)",
        lambda: wdask.area_matrix(loop(2), names="ab"), TypeError,
        "names must be a sequence of strings")
    row(DA, "length", "1 name for 2 channels",
        lambda: wdask.area_matrix(loop(2), names=["a"], scheduler="sync"), ValueError,
        "names has 1 entries")
    row("wp.dask.area_matrices(recordings)", "dim", "recordings with 2 and 3 channels",
        lambda: wdask.area_matrices([loop(2), loop(3)], scheduler="sync"), ValueError, "channels")
    row("wp.dask.area_matrices(recordings)", "empty", "no recording",
        lambda: wdask.area_matrices([], scheduler="sync"), ValueError, "recordings is empty")
    row("wp.dask.file_area_matrices(paths)", "file", "a missing file",
        lambda: wdask.file_area_matrices([os.path.join(_TMP, "nope.csv")], scheduler="sync"),
        wio.TableError, "no such file")
    row("wp.dask.file_area_matrices(paths)", "file", "a malformed file",
        lambda: wdask.file_area_matrices([tfile("trd.csv", MALFORMED["truncated"][2])],
                                         scheduler="sync"), wio.TableError,
        "1 fields, the header has 2")
