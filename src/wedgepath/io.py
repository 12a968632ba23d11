"""Reading tables of signals from CSV, TSV and Parquet files, whole or in chunks.

A table has a header row naming its columns and one row per sample.  Empty
cells and ``nan``/``NA`` are gaps (NaN).  Lines starting with ``#`` are
comments.  One column may hold the sample times; the others are channels.

pandas' C parser is used when pandas is installed (it is fast and reads
Parquet through pyarrow); otherwise the standard library's :mod:`csv` module
reads CSV and TSV.  Both give the same values and the same errors: a
:class:`TableError` (a ``ValueError``) whose message names the file, the line
and the column.

Examples
--------
>>> import io, wedgepath.io as wio
>>> text = "t,a,b\\n0,1.0,2.0\\n0.5,,3.0\\n1.25,4.0,5.0\\n"
>>> tab = wio.read_table(io.StringIO(text), time_column="t")
>>> tab.names, tab.times.tolist()
(['a', 'b'], [0.0, 0.5, 1.25])
>>> tab.values[1]
array([nan,  3.])
"""

from __future__ import annotations

import contextlib
import csv
import io as _io
import math
import os
from dataclasses import dataclass

import numpy as np

__all__ = ["TableError", "Table", "read_table", "iter_table_chunks", "table_columns",
           "stream_area_matrix"]

_NA = {"", "nan", "NaN", "NAN", "NA", "N/A", "na", "null", "NULL", "None"}


class TableError(ValueError):
    """A table could not be read; the message names file, line and column."""


@dataclass(frozen=True)
class Table:
    """Channels of a table: ``values`` (T, n) float64, ``times`` (T,) or None, ``names``."""

    values: np.ndarray
    times: object
    names: list
    source: str = ""


def _name_of(source) -> str:
    if isinstance(source, (str, os.PathLike)):
        return os.fspath(source)
    return getattr(source, "name", "<stream>")


def _format_of(source, delimiter):
    name = _name_of(source).lower()
    if name.endswith((".parquet", ".pq")):
        return "parquet", None
    if delimiter is not None:
        if not isinstance(delimiter, str) or len(delimiter) != 1:
            raise TableError(f"delimiter must be one character, got {delimiter!r}")
        return "text", delimiter
    if name.endswith((".tsv", ".tab")):
        return "text", "\t"
    return "text", None  # sniffed from the header line


def _open_text(source):
    """A text stream of the source, strict UTF-8 (with or without BOM)."""
    if isinstance(source, (str, os.PathLike)):
        path = os.fspath(source)
        if not os.path.exists(path):
            raise TableError(f"{path}: no such file")
        if os.path.isdir(path):
            raise TableError(f"{path}: is a directory, not a table")
        try:
            return open(path, "r", encoding="utf-8-sig", newline="", errors="strict")
        except OSError as exc:
            raise TableError(f"{path}: cannot open ({exc.strerror})") from None
    if isinstance(source, _io.TextIOBase) or hasattr(source, "read"):
        return source
    raise TypeError(f"a table source must be a path or a text stream, got {type(source).__name__}")


def _header(stream, name, delimiter):
    """Skip comments and blank lines; return (header cells, delimiter, lines read)."""
    lineno = 0
    for raw in stream:
        lineno += 1
        line = raw.rstrip("\r\n")
        if not line.strip() or line.lstrip().startswith("#"):
            continue
        if delimiter is None:
            counts = {d: line.count(d) for d in (",", "\t", ";", "|")}
            delimiter = max(counts, key=counts.get)
            if counts[delimiter] == 0:
                delimiter = ","
        cells = next(csv.reader([line], delimiter=delimiter))
        cells = [c.strip() for c in cells]
        if any(not c for c in cells):
            raise TableError(f"{name}: line {lineno}: header has an empty column name")
        dup = sorted({c for c in cells if cells.count(c) > 1})
        if dup:
            raise TableError(f"{name}: line {lineno}: repeated column names {dup}")
        if all(_is_number(c) for c in cells):
            raise TableError(f"{name}: line {lineno}: the first row is numeric; a header row "
                             "naming the columns is required")
        return cells, delimiter, lineno
    raise TableError(f"{name}: the table is empty (no header row)")


def _is_number(cell: str) -> bool:
    try:
        float(cell)
        return True
    except ValueError:
        return False


def _select(header, columns, time_column, name):
    if time_column is not None and time_column not in header:
        raise TableError(f"{name}: unknown time column {time_column!r}; columns are {header}")
    if columns is None:
        chosen = [c for c in header if c != time_column]
    else:
        if isinstance(columns, str):
            columns = [c.strip() for c in columns.split(",") if c.strip()]
        elif not isinstance(columns, (list, tuple)):
            raise TypeError(f"columns must be a list of column names or a comma-separated "
                            f"string, got {type(columns).__name__}")
        chosen = list(columns)
        for c in chosen:
            if c not in header:
                raise TableError(f"{name}: unknown column {c!r}; columns are {header}")
        if time_column in chosen:
            raise TableError(f"{name}: column {time_column!r} is both the time column and a channel")
        if len(set(chosen)) != len(chosen):
            raise TableError(f"{name}: a column is selected twice: {chosen}")
    if not chosen:
        raise TableError(f"{name}: no channel columns to read")
    return chosen


def table_columns(source, delimiter=None):
    """The column names of a table (its header), without reading the rows."""
    name = _name_of(source)
    fmt, delimiter = _format_of(source, delimiter)
    if fmt == "parquet":
        return _parquet_header(_parquet_file(source, name).schema_arrow)
    stream = _open_text(source)
    try:
        return _header(stream, name, delimiter)[0]
    except UnicodeDecodeError as exc:
        raise TableError(f"{name}: not UTF-8 text ({exc.reason} at byte {exc.start})") from None
    finally:
        if stream is not source:
            stream.close()


def _pandas(name, what):
    try:
        import pandas as pd
    except ImportError:
        raise TableError(f"{name}: reading {what} needs pandas (pip install pandas pyarrow)") from None
    return pd


def iter_table_chunks(source, *, columns=None, time_column=None, delimiter=None,
                      chunk_rows=100_000, engine="auto"):
    """Yield the table in chunks of at most ``chunk_rows`` rows.

    Yields
    ------
    Table
        ``values`` (m, n) and ``times`` (m,) or None for each chunk, with the
        channel ``names``; ``source`` is ``"<file>:<first line>"``.

    Memory stays at about ``chunk_rows`` times the number of columns, whatever
    the file's length.  ``engine`` picks the parser for CSV/TSV files:
    ``"pandas"`` (fast C parser), ``"python"`` (standard library) or
    ``"auto"`` (pandas when installed).  Both give the same values and the
    same errors.
    """
    if isinstance(chunk_rows, bool) or not isinstance(chunk_rows, int) or chunk_rows < 1:
        raise ValueError(f"chunk_rows must be a positive integer, got {chunk_rows!r}")
    name = _name_of(source)
    fmt, delimiter = _format_of(source, delimiter)
    if fmt == "parquet":
        yield from _parquet_chunks(source, name, columns, time_column, chunk_rows)
        return
    if engine not in ("auto", "python", "pandas"):
        raise ValueError(f"unknown engine {engine!r}; choose 'auto', 'python' or 'pandas'")
    use_pandas = engine == "pandas" or (engine == "auto" and _has_pandas()
                                        and isinstance(source, (str, os.PathLike)))
    if use_pandas:
        yield from _pandas_text_chunks(source, name, columns, time_column, delimiter, chunk_rows)
        return
    yield from _python_text_chunks(source, name, columns, time_column, delimiter, chunk_rows)


def _python_text_chunks(source, name, columns, time_column, delimiter, chunk_rows):
    stream = _open_text(source)
    try:
        header, delimiter, lineno = _header(stream, name, delimiter)
        chosen = _select(header, columns, time_column, name)
        want = [header.index(c) for c in chosen]
        t_idx = header.index(time_column) if time_column is not None else None
        yield from _text_chunks(stream, name, header, delimiter, lineno, chosen, want,
                                t_idx, time_column, chunk_rows)
    except UnicodeDecodeError as exc:
        raise TableError(f"{name}: not UTF-8 text ({exc.reason} at byte {exc.start})") from None
    except csv.Error as exc:
        raise TableError(f"{name}: malformed CSV ({exc})") from None
    finally:
        if stream is not source:
            stream.close()


def _has_pandas() -> bool:
    try:
        import pandas  # noqa: F401
        return True
    except ImportError:
        return False


def _fields_consistent(path, n_delims, delimiter, skip_lines, block=1 << 20) -> bool:
    """True when every data line holds exactly ``n_delims`` delimiters (blank lines aside).

    A vectorised byte scan (numpy), so that the fast parser never pads short
    lines with NaN or drops extra fields: a truncated or malformed line sends
    the file to the exact parser, which names the line.
    """
    d, nl = ord(delimiter), ord("\n")
    with open(path, "rb") as fh:
        for _ in range(skip_lines):
            fh.readline()
        carry = b""
        while True:
            chunk = fh.read(block)
            if not chunk:
                break
            buf = carry + chunk
            cut = buf.rfind(b"\n")
            if cut < 0:
                carry = buf
                continue
            body, carry = buf[:cut + 1], buf[cut + 1:]
            a = np.frombuffer(body, dtype=np.uint8)
            ends = np.flatnonzero(a == nl)
            counts = np.diff(np.concatenate(([0], np.cumsum(a == d, dtype=np.int64)[ends])))
            lengths = np.diff(np.concatenate(([-1], ends))) - 1
            blank = (lengths == 0) | ((lengths == 1) & (a[np.maximum(ends - 1, 0)] == 13))
            if np.any((counts != n_delims) & ~blank):
                return False
        tail = carry.strip()
        if tail and tail.count(delimiter.encode()) != n_delims:
            return False
    return True


def _pandas_text_chunks(source, name, columns, time_column, delimiter, chunk_rows):
    """pandas' C parser, chunk by chunk; any anomaly is located by the exact parser.

    The fast path accepts only clean numeric chunks.  When pandas fails or a
    chunk holds something the exact parser would report (infinite values,
    empty times), the file is read again by the standard-library parser up to
    the problem, which raises the precise error (file, line, column).
    """
    pd = _pandas(name, "CSV quickly")
    stream = _open_text(source)
    try:
        header, delimiter, lineno = _header(stream, name, delimiter)
    except UnicodeDecodeError as exc:
        raise TableError(f"{name}: not UTF-8 text ({exc.reason} at byte {exc.start})") from None
    finally:
        if stream is not source:
            stream.close()
    chosen = _select(header, columns, time_column, name)
    usecols = chosen + ([time_column] if time_column else [])
    if not _fields_consistent(source, len(header) - 1, delimiter, lineno):
        # short, long or quoted lines: the exact parser reports or handles them
        yield from _python_text_chunks(source, name, columns, time_column, delimiter, chunk_rows)
        return

    def locate():
        for _ in _python_text_chunks(source, name, columns, time_column, delimiter, chunk_rows):
            pass
        raise TableError(f"{name}: could not be parsed as a numeric table")

    reader = None
    try:
        reader = pd.read_csv(source, sep=delimiter, header=None, names=header, skiprows=lineno,
                             usecols=usecols, dtype={c: np.float64 for c in usecols},
                             chunksize=chunk_rows, engine="c", encoding="utf-8-sig",
                             na_values=sorted(_NA - {""}), keep_default_na=True,
                             skip_blank_lines=True)
        first_row = 1
        for part in reader:
            vals = part[chosen].to_numpy(dtype=np.float64)
            tt = part[time_column].to_numpy(dtype=np.float64) if time_column else None
            if np.isinf(vals).any() or (tt is not None and not np.isfinite(tt).all()):
                locate()
            yield Table(vals, tt, list(chosen), f"{name}:row {first_row}")
            first_row += len(part)
    except TableError:
        raise
    except (ValueError, UnicodeDecodeError, pd.errors.ParserError, pd.errors.EmptyDataError):
        locate()
    finally:
        if reader is not None:
            reader.close()   # the file is shut as soon as reading stops, even on an error


def _text_chunks(stream, name, header, delimiter, lineno, chosen, want, t_idx, time_column,
                 chunk_rows):
    ncol = len(header)
    reader = csv.reader(stream, delimiter=delimiter)
    csv.field_size_limit(1 << 20)
    rows, times, first = [], [], None
    for cells in reader:
        lineno += 1
        if not cells or (len(cells) == 1 and not cells[0].strip()):
            continue
        if cells[0].lstrip().startswith("#"):
            continue
        if len(cells) != ncol:
            raise TableError(f"{name}: line {lineno}: {len(cells)} fields, the header has {ncol}"
                             + (" (wrong delimiter?)" if len(cells) == 1 else ""))
        if first is None:
            first = lineno
        row = []
        for col, k in zip(chosen, want):
            row.append(_cell(cells[k], name, lineno, col, cells, header))
        rows.append(row)
        if t_idx is not None:
            t = _cell(cells[t_idx], name, lineno, time_column, cells, header)
            if math.isnan(t):
                raise TableError(f"{name}: line {lineno}: time column {time_column!r} is empty")
            times.append(t)
        if len(rows) >= chunk_rows:
            yield _chunk(rows, times, t_idx, chosen, name, first)
            rows, times, first = [], [], None
    if rows:
        yield _chunk(rows, times, t_idx, chosen, name, first)


def _cell(text, name, lineno, col, cells, header):
    s = text.strip()
    if s in _NA:
        return math.nan
    try:
        v = float(s)
    except ValueError:
        if [c.strip() for c in cells] != header and all(not _is_number(c.strip()) for c in cells):
            raise TableError(f"{name}: line {lineno}: the header changes here "
                             f"({[c.strip() for c in cells]} instead of {header})") from None
        if [c.strip() for c in cells] == header:
            raise TableError(f"{name}: line {lineno}: the header row repeats here") from None
        shown = s if len(s) <= 40 else s[:37] + "..."
        raise TableError(f"{name}: line {lineno}: column {col!r} has a non-numeric value "
                         f"{shown!r}") from None
    if math.isinf(v):
        raise TableError(f"{name}: line {lineno}: column {col!r} is infinite")
    return v


def _chunk(rows, times, t_idx, chosen, name, first):
    vals = np.array(rows, dtype=np.float64).reshape(len(rows), len(chosen))
    tt = np.array(times, dtype=np.float64) if t_idx is not None else None
    return Table(vals, tt, list(chosen), f"{name}:{first}")


def _parquet_file(source, name):
    """An open ``pyarrow.parquet.ParquetFile`` (metadata only; rows are read in batches)."""
    try:
        import pyarrow.parquet as pq   # pandas is not needed (nor imported) for Parquet
    except ImportError:
        raise TableError(f"{name}: reading Parquet needs pyarrow "
                         "(pip install 'wedgepath[io]')") from None
    try:
        # no pre-buffering (it caches every column chunk read, the whole file by the end) and
        # a buffered stream (pages are decoded as they are read, not a column chunk at once):
        # memory stays about one batch, whatever the row-group size.  64 KiB reads measured
        # ~25 MB below 1 MiB ones at 16 columns, at no cost in time (benchmarks/bench_streaming.py)
        return pq.ParquetFile(source, pre_buffer=False, buffer_size=1 << 16)
    except Exception as exc:  # pyarrow raises many kinds
        raise TableError(f"{name}: cannot read Parquet ({type(exc).__name__}: {exc})") from None


def _parquet_chunks(source, name, columns, time_column, chunk_rows):
    """Parquet in record batches of at most ``chunk_rows`` rows: memory O(chunk x columns)."""
    import pyarrow as pa

    pf = _parquet_file(source, name)
    schema = pf.schema_arrow
    header = _parquet_header(schema)
    chosen = _select(header, columns, time_column, name)
    wanted = chosen + ([time_column] if time_column else [])
    for col in wanted:
        typ = schema.field(col).type
        if not (pa.types.is_integer(typ) or pa.types.is_floating(typ)):
            raise TableError(f"{name}: column {col!r} is not numeric ({typ})")
    a = 0
    pool = pa.default_memory_pool()
    try:
        batches = pf.iter_batches(batch_size=chunk_rows, columns=list(dict.fromkeys(wanted)))
        for batch in batches:
            pool.release_unused()   # hand freed decode buffers back to the OS between batches
            if batch.num_rows == 0:
                continue
            cols = {c: batch.column(batch.schema.get_field_index(c)) for c in wanted}
            vals = np.column_stack([_arrow_float(cols[c]) for c in chosen])
            if np.isinf(vals).any():
                r, c = np.argwhere(np.isinf(vals))[0]
                raise TableError(f"{name}: row {a + r + 1}: column {chosen[c]!r} is infinite")
            tt = None
            if time_column:
                tt = _arrow_float(cols[time_column])
                if not np.isfinite(tt).all():
                    r = int(np.flatnonzero(~np.isfinite(tt))[0])
                    raise TableError(f"{name}: row {a + r + 1}: time column {time_column!r} "
                                     "is not finite")
            yield Table(vals, tt, list(chosen), f"{name}:{a + 1}")
            a += batch.num_rows
    except TableError:
        raise
    except Exception as exc:  # a damaged row group surfaces only when it is read
        raise TableError(f"{name}: cannot read Parquet after row {a} "
                         f"({type(exc).__name__}: {exc})") from None


def _parquet_header(schema):
    # pandas stores a non-default index as a column "__index_level_0__": not a signal
    return [str(c) for c in schema.names if not str(c).startswith("__index_level_")]


def _arrow_float(arr):
    """An arrow column as float64 with nulls as NaN (integers beyond 2**53 round)."""
    import pyarrow as pa
    import pyarrow.compute as pc
    if not pa.types.is_float64(arr.type):
        arr = pc.cast(arr, pa.float64(), safe=False)
    return arr.to_numpy(zero_copy_only=False).astype(np.float64, copy=False) \
        if arr.null_count == 0 else \
        np.asarray(pc.fill_null(arr, float("nan")).to_numpy(zero_copy_only=False), dtype=np.float64)


def read_table(source, *, columns=None, time_column=None, delimiter=None, min_rows=2,
               engine="auto"):
    """Read a whole table of signals.

    Parameters
    ----------
    source : str, path-like or text stream
        ``.csv`` (delimiter sniffed from the header), ``.tsv``/``.tab``,
        ``.parquet``/``.pq`` (needs pandas and pyarrow), or an open text stream.
    columns : sequence of str or comma-separated str, optional
        Channel columns, in this order.  Default: every column except the
        time column.
    time_column : str, optional
        The column of sample times.
    delimiter : str, optional
        Force a one-character delimiter.
    min_rows : int
        Refuse tables with fewer data rows.

    Returns
    -------
    Table
    """
    if isinstance(min_rows, bool) or not isinstance(min_rows, int):
        raise TypeError(f"min_rows must be an integer, got {min_rows!r}")
    chunks = list(iter_table_chunks(source, columns=columns, time_column=time_column,
                                    delimiter=delimiter, chunk_rows=1 << 16, engine=engine))
    name = _name_of(source)
    if not chunks:
        raise TableError(f"{name}: the table has a header but no data rows")
    values = np.concatenate([c.values for c in chunks])
    times = None if time_column is None else np.concatenate([c.times for c in chunks])
    if values.shape[0] < min_rows:
        raise TableError(f"{name}: {values.shape[0]} data row(s); at least {min_rows} are needed")
    return Table(values, times, chunks[0].names, name)


def stream_area_matrix(source, *, columns=None, time_column=None, delimiter=None,
                       chunk_rows=100_000, engine="auto", progress=None):
    """The chord-closed area matrix of a table read in chunks.

    Peak memory is about ``chunk_rows`` rows plus the ``n x n`` state of an
    :class:`~wedgepath.signals.AreaAccumulator`, whatever the file's length;
    the result equals ``area_matrix`` of the whole table (gaps included:
    NaN rows split it into pieces whose areas add).

    Returns
    -------
    AreaMatrix
        Labelled with the channel names; ``.values`` is the (n, n) array.

    Examples
    --------
    >>> import io
    >>> from wedgepath.io import stream_area_matrix
    >>> text = "a,b\\n0,0\\n1,0\\n1,1\\n0,1\\n"
    >>> stream_area_matrix(io.StringIO(text), chunk_rows=2).values
    array([[ 0.,  1.],
           [-1.,  0.]])
    """
    chunks = iter_table_chunks(source, columns=columns, time_column=time_column,
                               delimiter=delimiter, chunk_rows=chunk_rows, engine=engine)
    # closing() shuts the file at once when a chunk is refused below
    with contextlib.closing(chunks):
        acc, rows = _stream_chunks(chunks, source, progress)
    if acc is None or rows < 2:
        raise TableError(f"{_name_of(source)}: fewer than 2 data rows")
    return acc.result(labels=True)


def _stream_chunks(chunks, source, progress):
    from .signals import AreaAccumulator

    acc = None
    rows = 0
    last_time = None
    for chunk in chunks:
        if chunk.values.shape[0] == 0:   # a header without rows reads as one empty chunk
            continue
        if acc is None:
            if len(chunk.names) < 2:
                raise TableError(f"{_name_of(source)}: lead-lag needs at least 2 channel columns")
            acc = AreaAccumulator(len(chunk.names), names=chunk.names)
        if chunk.times is not None:
            t = chunk.times
            steps = np.diff(t if last_time is None else np.concatenate([[last_time], t]))
            if np.any(steps <= 0):
                # steps[k] ends at chunk row k + 1 in the first chunk, at row k afterwards
                k = int(np.flatnonzero(steps <= 0)[0]) + (1 if last_time is None else 0)
                raise TableError(f"{_name_of(source)}: times are not strictly increasing "
                                 f"(data row {rows + k + 1})")
            last_time = t[-1]
        acc.update(chunk.values)
        rows += chunk.values.shape[0]
        if progress is not None:
            progress(rows)
    return acc, rows
