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

import csv
import io as _io
import math
import os
from dataclasses import dataclass

import numpy as np

__all__ = ["TableError", "Table", "read_table", "iter_table_chunks", "table_columns"]

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
        pd = _pandas(name, "Parquet")
        return [str(c) for c in pd.read_parquet(source).columns]
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
                      chunk_rows=100_000):
    """Yield the table in chunks of at most ``chunk_rows`` rows.

    Yields
    ------
    Table
        ``values`` (m, n) and ``times`` (m,) or None for each chunk, with the
        channel ``names``; ``source`` is ``"<file>:<first line>"``.

    Memory stays at about ``chunk_rows`` times the number of columns, whatever
    the file's length.
    """
    if isinstance(chunk_rows, bool) or not isinstance(chunk_rows, int) or chunk_rows < 1:
        raise ValueError(f"chunk_rows must be a positive integer, got {chunk_rows!r}")
    name = _name_of(source)
    fmt, delimiter = _format_of(source, delimiter)
    if fmt == "parquet":
        yield from _parquet_chunks(source, name, columns, time_column, chunk_rows)
        return
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


def _parquet_chunks(source, name, columns, time_column, chunk_rows):
    pd = _pandas(name, "Parquet")
    try:
        df = pd.read_parquet(source)
    except Exception as exc:  # pyarrow raises many kinds
        raise TableError(f"{name}: cannot read Parquet ({type(exc).__name__}: {exc})") from None
    header = [str(c) for c in df.columns]
    df.columns = header
    chosen = _select(header, columns, time_column, name)
    for col in chosen + ([time_column] if time_column else []):
        if not (pd.api.types.is_numeric_dtype(df[col]) and not pd.api.types.is_bool_dtype(df[col])):
            raise TableError(f"{name}: column {col!r} is not numeric ({df[col].dtype})")
    for a in range(0, max(len(df), 1), chunk_rows):
        part = df.iloc[a:a + chunk_rows]
        if part.empty:
            break
        vals = part[chosen].to_numpy(dtype=np.float64, na_value=np.nan)
        if np.isinf(vals).any():
            r, c = np.argwhere(np.isinf(vals))[0]
            raise TableError(f"{name}: row {a + r + 1}: column {chosen[c]!r} is infinite")
        tt = None
        if time_column:
            tt = part[time_column].to_numpy(dtype=np.float64, na_value=np.nan)
            if not np.isfinite(tt).all():
                r = int(np.flatnonzero(~np.isfinite(tt))[0])
                raise TableError(f"{name}: row {a + r + 1}: time column {time_column!r} is not finite")
        yield Table(vals, tt, list(chosen), f"{name}:{a + 1}")


def read_table(source, *, columns=None, time_column=None, delimiter=None, min_rows=2):
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
    chunks = list(iter_table_chunks(source, columns=columns, time_column=time_column,
                                    delimiter=delimiter, chunk_rows=1 << 16))
    name = _name_of(source)
    if not chunks:
        raise TableError(f"{name}: the table has a header but no data rows")
    values = np.concatenate([c.values for c in chunks])
    times = None if time_column is None else np.concatenate([c.times for c in chunks])
    if values.shape[0] < min_rows:
        raise TableError(f"{name}: {values.shape[0]} data row(s); at least {min_rows} are needed")
    return Table(values, times, chunks[0].names, name)
