"""Reading tables of signals from CSV, TSV and Parquet files, whole or in chunks.

One parser reads every text table: pyarrow's CSV reader (multi-threaded and
typed), fed by this module in blocks of whole lines so that the input is read
**once** (files, pipes, FIFOs and standard input alike), memory stays bounded
and every error names the file, the line and the column.  Parquet files are
read in record batches.  pyarrow is a core dependency, imported on the first
read (``import wedgepath.io`` stays light).

Text tables
-----------
* **Encoding**: UTF-8 (a leading byte-order mark is ignored).  Lines end with
  ``\\n`` or ``\\r\\n``; a bare ``\\r`` (classic Mac line end) is refused.
* **Preamble and header**: before the header, empty lines, lines of spaces and
  **comment lines** (first non-space character ``#``) are skipped.  The first
  other line is the header: one non-empty, distinct name per column
  (surrounding spaces removed; quoted names may contain the delimiter).
  The delimiter is sniffed from the header (the most frequent of ``,``, tab,
  ``;``, ``|``; ``,`` when none occurs) unless given; ``.tsv``/``.tab`` files
  use tab.
* **Data**: after the header every non-empty line is a data row with as many
  fields as the header.  Empty lines are skipped (a line of spaces is not
  empty).  There are no comment lines inside the data: a line starting with
  ``#`` there is refused (a cell ``#N/A`` is a gap token, see below).  A
  quoted value may not span lines.
* **Numbers**: plain ASCII decimal or scientific notation, optionally signed
  and surrounded by spaces or tabs, optionally in double quotes:
  ``[ \\t]*[+-]?(ddd[.ddd] | .ddd)([eE][+-]?ddd)?[ \\t]*`` (``1``, ``-2.5``,
  ``.5``, ``5.``, ``1e-3``, ``+4E+02``).  The value is the nearest float64
  (large integers round like any decimal).  Everything else is refused:
  ``1_000``, ``1,5``, ``0x10``, non-ASCII digits, ``True``/``False``, and
  infinite values (``inf``, or a number beyond the float64 range).
* **Gaps**: an empty cell, or a cell that is exactly one of :data:`GAP_TOKENS`
  (``nan NaN NAN NA N/A n/a na null NULL None #N/A``), without surrounding
  spaces.  A gap is NaN: NaN rows split a recording into pieces.
* **Lines** longer than :data:`MAX_LINE_BYTES` (16 MiB) are refused: reading
  stops there, so a file without line ends (``/dev/zero``) fails at once in
  bounded memory.

Time column
-----------
``time_column=`` names the column of sample times.  It may hold numbers (kept
as given) or ISO-8601 date/times (``1959-01-01``, ``2021-03-01T10:00:00.25``,
``2021-03-01 10:00+01:00``; see :mod:`wedgepath._time`), decided by its first
value; Parquet timestamp (with or without timezone), date and duration columns
are read too.  Date/times become seconds elapsed since the first sample
(``Table.times``) and ``Table.time_axis`` keeps the origin and the zone.
Every row needs a time, and times must increase strictly: a gap, a repeat or a
step back is refused naming the first offending row and the values (nothing
is sorted silently).

Parquet column types
--------------------
Floats are read as float64; integers exactly (an integer beyond 2**53 in
magnitude cannot be held by float64 and is **refused**, naming the row);
nullable integers with nulls give gaps; decimals are rounded to the nearest
float64 (round-half-even of the exact decimal value); boolean columns are
refused (true/false is not a measured quantity: convert it to 0/1 yourself if
that is meant), and so are text, categorical and date/time columns used as
channels.  Duplicate column names are refused.

Examples
--------
>>> import io, wedgepath.io as wio
>>> text = "# bench test 3\\nt,a,b\\n0,1.0,2.0\\n0.5,,3.0\\n1.25,4.0,NA\\n"
>>> tab = wio.read_table(io.StringIO(text), time_column="t")
>>> tab.names, tab.times.tolist()
(('a', 'b'), [0.0, 0.5, 1.25])
>>> tab.values[1:]
array([[nan,  3.],
       [ 4., nan]])
>>> wio.read_table(io.StringIO("a,b\\n1,2\\n3,1_000\\n"))
Traceback (most recent call last):
...
wedgepath.io.TableError: <stream>: line 3: column 'b' has a non-numeric value '1_000' (neither a number nor a gap token)
"""

from __future__ import annotations

import codecs
import contextlib
import csv
import os
import re
import stat
import sys
from collections import Counter
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from ._bars import check_progress, progress_bar
from ._results import Result, fmt_names

__all__ = ["TableError", "Table", "read_table", "iter_table_chunks", "table_columns",
           "stream_area_matrix", "GAP_TOKENS", "MAX_LINE_BYTES"]

#: cells read as gaps (NaN), exactly as written here (no surrounding spaces); "" is an empty cell
GAP_TOKENS = ("", "nan", "NaN", "NAN", "NA", "N/A", "n/a", "na", "null", "NULL", "None", "#N/A")

#: the longest line accepted, in bytes (a longer one is refused with its line number)
MAX_LINE_BYTES = 16 * 2 ** 20

#: bytes read from the input at a time (one parser call per block of whole lines).  4 MiB keeps
#: the streamed command line near 190 MB at 16 channels (8 MiB: ~225 MB) at the same speed
#: (benchmarks/bench_streaming.py, benchmarks/bench_io.py)
_READ_BYTES = 4 * 2 ** 20

_NUMBER = re.compile(r"[ \t]*[+-]?(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[eE][+-]?[0-9]+)?[ \t]*")
_INF = re.compile(r"[ \t]*[+-]?inf(inity)?[ \t]*", re.IGNORECASE)
_NAN = re.compile(r"[ \t]*[+-]?nan.*", re.IGNORECASE)
_BOOL = {"true", "false"}
_GAPS = frozenset(GAP_TOKENS)
_NL = b"\n"


class TableError(ValueError):
    """A table could not be read; the message names file, line and column."""


@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class Table(Result):
    """Channels of a table: what :func:`read_table` and :func:`iter_table_chunks` return.

    Attributes
    ----------
    values : numpy.ndarray (T, n) float64
        The channels, NaN for gaps (read-only).
    times : numpy.ndarray (T,) float64 or None
        Sample times as numbers: the numbers as given, or seconds since the
        first sample for date/times (what the library's ``times=`` takes).
    names : tuple of str
        Channel names.
    source : str
        The file (and, for a chunk, its first data row).
    time_axis : wedgepath._time.TimeAxis or None
        What the times were: ``kind`` ("number"/"datetime"), ``origin``,
        ``tz``; ``time_axis.format(t)`` gives ISO strings back.
    units : mapping or None
        Channel name -> unit text (the ``with_units`` method attaches them).

    ``to_frame()`` is the table itself: one column per channel, indexed by
    time (a ``DatetimeIndex`` for date/times, numbers otherwise, the row
    number 0, 1, ... without a time column).
    """

    values: np.ndarray
    times: np.ndarray | None
    names: tuple
    source: str = ""
    time_axis: object = None
    units: Mapping | None = None

    def to_frame(self):
        """The table as a DataFrame: channels as columns, time as index."""
        import pandas as pd

        if self.times is None:
            index = pd.RangeIndex(self.values.shape[0], name="row")
        elif self.time_axis is not None and self.time_axis.kind == "datetime":
            index = pd.DatetimeIndex(self.time_axis.to_datetime64(), name="time")
            if self.time_axis.tz:
                index = index.tz_localize("UTC").tz_convert(self.time_axis.tz)
        else:
            index = pd.Index(np.asarray(self.times), name="time")
        return pd.DataFrame(np.array(self.values), index=index, columns=list(self.names))

    def _summary_items(self):
        items = [("rows", str(self.values.shape[0])), ("names", fmt_names(self.names))]
        if self.time_axis is not None:
            items.append(("times", self.time_axis.kind))
        if self.source:
            items.append(("source", repr(self.source)))
        return items


# =========================================================================== sources
def _name_of(source) -> str:
    if isinstance(source, str) and source == "-":
        return "<stdin>"
    if isinstance(source, (str, os.PathLike)):
        return os.fspath(source)
    name = getattr(source, "name", None)
    return name if isinstance(name, str) else "<stream>"


def _is_parquet_name(source) -> bool:
    return _name_of(source).lower().endswith((".parquet", ".pq"))


def _delimiter_for(source, delimiter):
    if delimiter is not None:
        if not isinstance(delimiter, str) or len(delimiter) != 1 or delimiter in "\r\n\"":
            raise TableError(f"delimiter must be one character (not a quote or line end), "
                             f"got {delimiter!r}")
        return delimiter
    if _name_of(source).lower().endswith((".tsv", ".tab")):
        return "\t"
    return None  # sniffed from the header line


class _Input:
    """The source, opened once, read as bytes."""

    def __init__(self, source):
        self.name = _name_of(source)
        self.owned = False
        if isinstance(source, str) and source == "-":
            stdin = sys.stdin
            if stdin is None:
                raise TableError("<stdin>: there is no standard input")
            self.stream = getattr(stdin, "buffer", stdin)
        elif isinstance(source, (str, os.PathLike)):
            path = os.fspath(source)
            try:
                st = os.stat(path)
            except FileNotFoundError:
                raise TableError(f"{path}: no such file") from None
            except OSError as exc:
                raise TableError(f"{path}: cannot open ({exc.strerror})") from None
            if stat.S_ISDIR(st.st_mode):
                raise TableError(f"{path}: is a directory, not a table")
            try:
                # unbuffered: the blocks are large, and a FIFO or pipe is read once, in order
                self.stream = open(path, "rb", buffering=0)
            except OSError as exc:
                raise TableError(f"{path}: cannot open ({exc.strerror})") from None
            self.owned = True
        elif hasattr(source, "read"):           # binary or text stream
            self.stream = source
        else:
            raise TypeError("a table source must be a path, '-' (standard input) or an open "
                            f"file (text or binary), got {type(source).__name__}")

    def read(self, n):
        """Up to ``n`` bytes, fewer only at the end of the input.

        Pipes return at most their buffer (64 KiB) per call: the pieces are
        collected and joined once, never appended one by one.
        """
        pieces, got = [], 0
        while got < n:
            data = self.stream.read(n - got)
            if not data:              # the end (or None: a non-blocking stream with nothing)
                break
            if isinstance(data, str):
                data = data.encode("utf-8", "surrogatepass")   # lone surrogates fail the check
            pieces.append(data)
            got += len(data)
        return pieces[0] if len(pieces) == 1 and isinstance(pieces[0], bytes) else \
            b"".join(pieces)

    def close(self):
        if self.owned:
            self.stream.close()


class _Lines:
    """Whole lines of the input, in blocks, with their line numbers (read once, bounded).

    The input is read ``step`` bytes at a time, ``step`` being at most half the
    line limit: a line that ends inside the data read for a block is then
    shorter than the limit, so only a block's first line (which may have
    begun in earlier reads) needs measuring -- an exact check at no cost.
    """

    def __init__(self, inp: _Input):
        self.inp = inp
        self.name = inp.name
        self.buf = b""
        self.pos = 0           # unread data is buf[pos:]
        self.line = 1          # line number of buf[pos]
        self.eof = False
        self.started = False
        self.limit = int(MAX_LINE_BYTES)
        self.step = max(1, min(int(_READ_BYTES), self.limit // 2))

    def _more(self):
        """Read one more piece into the buffer; False at the end of the input."""
        if self.eof:
            return False
        data = self.inp.read(self.step)
        if not data:
            self.eof = True
            return False
        if not self.started:
            self.started = True
            if data.startswith(b"\xef\xbb\xbf"):
                data = data[3:]
        self.buf = self.buf[self.pos:] + data if self.pos else self.buf + data
        self.pos = 0
        return True

    def _too_long(self, lineno):
        size = (f"{self.limit} bytes (the limit is {self.limit / 2 ** 20:g} MiB)"
                if self.limit >= 2 ** 20 else f"{self.limit} bytes")
        return TableError(f"{self.name}: line {lineno} is longer than {size}")

    def _line_end(self):
        """Index of the line end of the line at ``pos`` (reading more as needed); -1 at EOF."""
        start = self.pos
        while True:
            nl = self.buf.find(b"\n", start)
            if nl >= 0:
                if nl - self.pos > self.limit:
                    raise self._too_long(self.line)
                return nl
            if len(self.buf) - self.pos > self.limit:
                raise self._too_long(self.line)
            start = len(self.buf) - self.pos
            if not self._more():
                return -1
            start += self.pos

    def next_line(self):
        """The next line (bytes, without its line end) and its number; None at the end."""
        nl = self._line_end()
        lineno = self.line
        if nl < 0:
            if self.pos >= len(self.buf):
                return None
            raw, self.pos = self.buf[self.pos:], len(self.buf)
        else:
            raw, self.pos = self.buf[self.pos:nl], nl + 1
        self.line += 1
        return (raw[:-1] if raw.endswith(b"\r") else raw), lineno

    def blocks(self):
        """Yield ``(body, first_line)``: whole lines (the last may lack its line end)."""
        while True:
            while len(self.buf) - self.pos < self.step and self._more():
                pass
            if self.pos >= len(self.buf):
                return
            nl = self._line_end()          # the first line, measured exactly
            if nl < 0:                     # the last line, without a line end
                body = self.buf[self.pos:]
            else:
                cut = self.buf.rfind(b"\n")
                body = self.buf[self.pos:cut + 1]
            self.pos += len(body)
            first_line = self.line
            self.line += _count_newlines(body)
            yield body, first_line


def _count_newlines(body):
    # numpy counts about twice as fast as bytes.count on large blocks
    if len(body) < 1 << 16:
        return body.count(b"\n")
    return int(np.count_nonzero(np.frombuffer(body, dtype=np.uint8) == 10))


def _check_text(body, name, first_line, at_end):
    """Strict UTF-8 and no bare carriage returns, or a TableError naming the line."""
    if not body.isascii():
        dec = codecs.getincrementaldecoder("utf-8")("strict")
        pos = 0
        step = 1 << 20
        try:
            while pos < len(body):
                dec.decode(body[pos:pos + step], final=pos + step >= len(body))
                pos += step
        except UnicodeDecodeError as exc:
            at = pos + exc.start
            line = first_line + body.count(b"\n", 0, at)
            col = at - body.rfind(b"\n", 0, at)
            raise TableError(f"{name}: line {line}: not UTF-8 text ({exc.reason} at byte "
                             f"{col} of the line)") from None
    if b"\r" in body and body.count(b"\r") != body.count(b"\r\n"):
        m = re.search(rb"\r(?!\n)", body)
        if not (at_end and m.end() == len(body)):
            line = first_line + body.count(b"\n", 0, m.start())
            raise TableError(f"{name}: line {line}: a bare carriage return (\\r) ends a line; "
                             "lines must end with \\n or \\r\\n")


# =========================================================================== header
def _split(text, delimiter):
    """Fields of one line (quotes as in CSV: "a,b" is one field, "" inside quotes is ")."""
    if csv.field_size_limit() < MAX_LINE_BYTES:
        csv.field_size_limit(MAX_LINE_BYTES)      # a field may be as long as a line
    return next(csv.reader([text], delimiter=delimiter, quotechar='"', doublequote=True,
                           strict=True))


def _read_header(lines: _Lines, delimiter):
    """Skip the preamble; return (names, delimiter, header line number)."""
    name = lines.name
    while True:
        got = lines.next_line()
        if got is None:
            raise TableError(f"{name}: the table is empty (no header row)")
        raw, lineno = got
        if lineno == 1 and raw.startswith(b"PAR1"):
            raise TableError(f"{name}: this is a Parquet file; Parquet needs a file path "
                             "ending in .parquet or .pq (it cannot be read from a stream "
                             "or standard input)")
        try:
            text = raw.decode("utf-8")
        except UnicodeDecodeError as exc:
            raise TableError(f"{name}: line {lineno}: not UTF-8 text ({exc.reason} at byte "
                             f"{exc.start + 1} of the line)") from None
        if "\r" in text:
            raise TableError(f"{name}: line {lineno}: a bare carriage return (\\r) ends a line; "
                             "lines must end with \\n or \\r\\n")
        stripped = text.strip()
        if not stripped or stripped.startswith("#"):
            continue
        if delimiter is None:
            counts = {d: text.count(d) for d in (",", "\t", ";", "|")}
            delimiter = max(counts, key=counts.get)
            if counts[delimiter] == 0:
                delimiter = ","
        try:
            cells = [c.strip() for c in _split(text, delimiter)]
        except csv.Error as exc:
            raise TableError(f"{name}: line {lineno}: malformed header ({exc})") from None
        if any(not c for c in cells):
            k = cells.index("")
            raise TableError(f"{name}: line {lineno}: header has an empty column name "
                             f"(column {k + 1})")
        counts = Counter(cells)
        dup = [c for c, k in counts.items() if k > 1]
        if dup:
            raise TableError(f"{name}: line {lineno}: repeated column names {dup[:10]}"
                             + (f" and {len(dup) - 10} more" if len(dup) > 10 else ""))
        if all(_NUMBER.fullmatch(c) for c in cells):
            raise TableError(f"{name}: line {lineno}: the first row is numeric; a header row "
                             "naming the columns is required")
        return cells, delimiter, lineno


def _select(header, columns, time_column, name):
    known = set(header)
    if time_column is not None:
        if not isinstance(time_column, str):
            raise TypeError(f"time_column must be a column name (str), got "
                            f"{type(time_column).__name__}")
        if time_column not in known:
            raise TableError(f"{name}: unknown time column {time_column!r}; columns are "
                             f"{_few(header)}")
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
            if not isinstance(c, str):
                raise TypeError(f"columns must hold column names (str), got {c!r}")
            if c not in known:
                raise TableError(f"{name}: unknown column {c!r}; columns are {_few(header)}")
        if time_column in chosen:
            raise TableError(f"{name}: column {time_column!r} is both the time column and a "
                             "channel")
        if len(set(chosen)) != len(chosen):
            raise TableError(f"{name}: a column is selected twice: {chosen}")
    if not chosen:
        raise TableError(f"{name}: no channel columns to read")
    return chosen


def _few(names, k=20):
    return str(list(names)) if len(names) <= k else str(list(names[:k]))[:-1] + ", ...]"


def table_columns(source, delimiter=None):
    """The column names of a table (its header), without reading the rows.

    For a pipe or standard input, the header is consumed with the lines
    read along with it.

    Returns
    -------
    list of str
        The column names, in file order.
    """
    name = _name_of(source)
    if _is_parquet_name(source):
        pf = _parquet_file(source, name)
        header = _parquet_header(pf.schema_arrow)
        _check_parquet_names(header, name)
        return header
    delimiter = _delimiter_for(source, delimiter)
    inp = _Input(source)
    try:
        return _read_header(_Lines(inp), delimiter)[0]
    finally:
        inp.close()


# =========================================================================== text tables
class _TextSpec:
    """What is read from a text table, and how its cells are checked when something fails."""

    def __init__(self, name, header, delimiter, header_line, chosen, time_column):
        self.name = name
        self.header = header
        self.delimiter = delimiter
        self.header_line = header_line
        self.chosen = chosen
        self.time_column = time_column
        index = {c: k for k, c in enumerate(header)}
        self.want = [index[c] for c in chosen]
        self.t_idx = index[time_column] if time_column is not None else None
        self.time_kind = None        # "number" | "datetime", from the first time cell
        self.time_type = None        # the arrow type the time column is converted to
        self.time_zoned = False
        self.first_time_text = None


def _time_type_of(cell, spec, lineno):
    """Decide the time column's kind from its first value."""
    import pyarrow as pa

    from ._time import is_iso_datetime, _zone_of

    name, col = spec.name, spec.time_column
    if cell in _GAPS:
        raise TableError(f"{name}: line {lineno}: time column {col!r} is empty (a gap); every "
                         "row needs a time")
    spec.first_time_text = cell
    if _NUMBER.fullmatch(cell):
        spec.time_kind, spec.time_type = "number", pa.float64()
        return
    if is_iso_datetime(cell):
        year = int(cell[:4])
        unit = "ns" if 1678 <= year <= 2261 else "us"
        spec.time_zoned = _zone_of(cell) is not None
        spec.time_kind = "datetime"
        spec.time_type = pa.timestamp(unit, tz="UTC" if spec.time_zoned else None)
        return
    raise TableError(f"{name}: line {lineno}: time column {col!r} has a value {_show(cell)} "
                     "that is neither a number nor an ISO-8601 date/time")


def _show(text, limit=40):
    return repr(text if len(text) <= limit else text[:limit - 3] + "...")


def _data_lines(body, first_line):
    """(line number, text without line end) of the non-empty lines of a block, lazily."""
    lineno, pos, end = first_line, 0, len(body)
    while pos < end:
        nl = body.find(b"\n", pos)
        stop = end if nl < 0 else nl
        line = body[pos:stop]
        if line.endswith(b"\r"):
            line = line[:-1]
        if line:
            yield lineno, line
        lineno += 1
        pos = stop + 1


def _first_data_cells(body, first_line, spec):
    for lineno, raw in _data_lines(body, first_line):
        text = raw.decode("utf-8")
        try:
            cells = _split(text, spec.delimiter)
        except csv.Error:
            return None, lineno
        return cells, lineno
    return None, None


def _cell_problem(cell, col, spec, is_time):
    """Why a cell is refused (a message fragment), or None when it is fine."""
    if is_time:
        if cell in _GAPS:
            return f"time column {col!r} is empty (a gap); every row needs a time"
        if spec.time_kind == "number":
            if _NUMBER.fullmatch(cell):
                return (f"time column {col!r} is infinite" if np.isinf(float(cell))
                        else None)
            return (f"time column {col!r} has a value {_show(cell)} that is not a number like "
                    f"the first time ({spec.first_time_text!r})")
        return _datetime_problem(cell, col, spec)
    if cell in _GAPS:
        return None
    if _NUMBER.fullmatch(cell):
        return f"column {col!r} is infinite (beyond the float64 range)" \
            if np.isinf(float(cell)) else None
    if _INF.fullmatch(cell):
        return f"column {col!r} is infinite ({cell.strip()!r})"
    msg = (f"column {col!r} has a non-numeric value {_show(cell)} (neither a number nor a gap "
           "token)")
    if cell.strip() in _GAPS:
        return msg + ": gap tokens are written without spaces around them"
    if cell.strip().lower() in _BOOL:
        return msg + ": true/false values are not read as numbers; write 1/0 if that is meant"
    if _NAN.fullmatch(cell):
        return msg + ": the gap tokens are " + " ".join(t for t in GAP_TOKENS if t) + \
            " and the empty cell"
    from ._time import is_iso_datetime
    if is_iso_datetime(cell.strip()):
        return msg + ": a date/time; read this column as the time column"
    if len(spec.header) == 1 and any(d in cell for d in ",;\t|"):
        return msg + ": the header has one column; wrong delimiter?"
    return msg


def _datetime_problem(cell, col, spec):
    import pyarrow as pa

    from ._time import is_iso_datetime, _zone_of

    like = f"like the first one ({spec.first_time_text!r})"
    if not is_iso_datetime(cell):
        return (f"time column {col!r} has a value {_show(cell)} that is not an ISO-8601 "
                f"date/time {like}")
    if (_zone_of(cell) is not None) != spec.time_zoned:
        return (f"time column {col!r} has a value {_show(cell)} "
                + ("without a zone designator, but the first time has one"
                   if spec.time_zoned else
                   "with a zone designator, but the first time has none"))
    try:
        pa.array([cell], pa.string()).cast(spec.time_type)
    except (pa.ArrowInvalid, pa.ArrowNotImplementedError):
        return (f"time column {col!r} has a value {_show(cell)} that is not a valid date/time "
                "(not on the calendar, or out of range)")
    return None


def _locate(body, first_line, spec, arrow_message=None):
    """The first refused line of a block, as a TableError (the exact check behind the parser)."""
    name, header, ncol = spec.name, spec.header, len(spec.header)
    first_data = None
    for lineno, raw in _data_lines(body, first_line):
        if first_data is None:
            first_data = lineno
        try:
            text = raw.decode("utf-8")
        except UnicodeDecodeError as exc:
            return TableError(f"{name}: line {lineno}: not UTF-8 text ({exc.reason})")
        comment = text.lstrip().startswith("#") and not text.startswith("#N/A")
        try:
            cells = _split(text, spec.delimiter)
        except csv.Error as exc:
            return TableError(f"{name}: line {lineno}: malformed quoting ({exc}); a quoted value "
                              "must end on its line")
        if len(cells) != ncol:
            if comment:
                return TableError(f"{name}: line {lineno}: {_show(text)} looks like a comment; "
                                  "comment lines (#) are allowed only before the header")
            return TableError(f"{name}: line {lineno}: {len(cells)} fields, the header has "
                              f"{ncol}" + (" (wrong delimiter?)" if len(cells) == 1 else ""))
        todo = [(spec.t_idx, spec.time_column, True)] if spec.t_idx is not None else []
        todo += [(k, c, False) for k, c in zip(spec.want, spec.chosen)]
        for k, col, is_time in todo:
            problem = _cell_problem(cells[k], col, spec, is_time)
            if problem is None:
                continue
            stripped = [c.strip() for c in cells]
            if comment:
                return TableError(f"{name}: line {lineno}: {_show(text)} looks like a comment; "
                                  "comment lines (#) are allowed only before the header")
            if stripped == header:
                return TableError(f"{name}: line {lineno}: the header row repeats here")
            if len(cells) > 1 and all(not _NUMBER.fullmatch(c) and c not in _GAPS
                                      for c in stripped):
                if lineno == spec.header_line + 1:
                    return TableError(f"{name}: line {lineno}: a second header row "
                                      f"({_few(stripped, 8)}); only one header row is read "
                                      "(put units in a comment line before the header)")
                return TableError(f"{name}: line {lineno}: the header changes here "
                                  f"({_few(stripped, 8)} instead of {_few(header, 8)})")
            return TableError(f"{name}: line {lineno}: {problem}")
    if arrow_message:
        last = first_line + body.count(b"\n")
        return TableError(f"{name}: lines {first_data or first_line}-{last}: "
                          f"{arrow_message.strip().splitlines()[0]}")
    return None


def _line_of_row(body, first_line, k):
    """Line number of the k-th (0-based) data row of a block."""
    for j, (lineno, _) in enumerate(_data_lines(body, first_line)):
        if j == k:
            return lineno
    return first_line


def _arrow_options(spec):
    import pyarrow as pa
    import pyarrow.csv as pcsv

    types = {c: pa.float64() for c in spec.chosen}
    if spec.time_column is not None:
        types[spec.time_column] = spec.time_type
    include = list(spec.chosen) + ([spec.time_column] if spec.time_column is not None else [])
    parse = pcsv.ParseOptions(delimiter=spec.delimiter, quote_char='"', double_quote=True,
                              escape_char=False, newlines_in_values=False,
                              ignore_empty_lines=True)
    convert = pcsv.ConvertOptions(include_columns=include, column_types=types,
                                  null_values=list(GAP_TOKENS), strings_can_be_null=True,
                                  quoted_strings_can_be_null=True, check_utf8=False)
    return parse, convert


def _parse_block(body, first_line, spec, parse, convert):
    """One block of whole lines -> arrow table (or the located error).

    Why blocks and not pyarrow's own streaming reader with its invalid-row handler:
    on several threads the handler is told no row number (``InvalidRow.number`` is
    None) and a conversion error names no row at all (checked with pyarrow 26).  A
    block whose first line number is known, checked exactly when it is refused,
    names the line in every case, and the parser still runs on all cores inside it.
    """
    import pyarrow as pa
    import pyarrow.csv as pcsv

    # parser blocks of 1 MiB give both cores work on narrow tables; a wide table's blocks grow
    # with its width (the parser's cost per block and column dominates for thousands of columns)
    block = int(min(max(1 << 20, 4096 * len(spec.header)), len(body) + 1))
    while True:
        read = pcsv.ReadOptions(column_names=spec.header, use_threads=True, block_size=block)
        try:
            return pcsv.read_csv(pa.py_buffer(body), read_options=read, parse_options=parse,
                                 convert_options=convert)
        except pa.ArrowInvalid as exc:
            msg = str(exc)
            if "straddling" in msg and block < len(body) + 1:
                block = len(body) + 1           # a row longer than a parser block: one block
                continue
            err = _locate(body, first_line, spec, msg)
            raise err from None


def _column_values(table, count, out):
    """Fill ``out[:, j]`` with the float64 values of the table's first ``count`` columns.

    Columns are taken by position (the parser returns them in ``include_columns``
    order): a lookup by name scans the schema, quadratic over wide tables.
    """
    for j in range(count):
        r = 0
        for chunk in table.column(j).chunks:
            m = len(chunk)
            out[r:r + m, j] = chunk.to_numpy(zero_copy_only=False)
            r += m


def _text_blocks(inp, name, delimiter, columns, time_column):
    """Yield ``(values, raw times, body, first line, spec)`` per block of a text table."""
    import pyarrow as pa

    lines = _Lines(inp)
    header, delimiter, header_line = _read_header(lines, delimiter)
    chosen = _select(header, columns, time_column, name)
    spec = _TextSpec(name, header, delimiter, header_line, chosen, time_column)
    yield spec                                  # the header is known: names for the caller
    parse = convert = None
    for body, first_line in lines.blocks():
        _check_text(body, name, first_line, lines.eof and lines.pos >= len(lines.buf))
        if parse is None:
            if time_column is not None:
                cells, lineno = _first_data_cells(body, first_line, spec)
                if lineno is None:
                    continue                    # only empty lines so far
                if cells is None or len(cells) != len(header):
                    raise _locate(body, first_line, spec) or TableError(
                        f"{name}: line {lineno}: malformed line")
                _time_type_of(cells[spec.t_idx], spec, lineno)
            parse, convert = _arrow_options(spec)
        table = _parse_block(body, first_line, spec, parse, convert)
        m = table.num_rows
        if m == 0:
            continue
        vals = np.empty((m, len(chosen)), dtype=np.float64)
        _column_values(table, len(chosen), vals)
        if not np.isfinite(vals).all():
            nulls = sum(table.column(j).null_count for j in range(len(chosen)))
            if np.isinf(vals).any() or int(np.isnan(vals).sum()) != nulls:
                raise _locate(body, first_line, spec) or TableError(
                    f"{name}: lines {first_line}-{first_line + body.count(_NL)}: a value "
                    "that is not finite")
        tt = None
        if time_column is not None:
            col = table.column(len(chosen))          # the time column comes last
            if col.null_count:
                raise _locate(body, first_line, spec) or TableError(
                    f"{name}: time column {time_column!r} is empty")
            col = col.combine_chunks() if col.num_chunks != 1 else col.chunk(0)
            tt = col.to_numpy(zero_copy_only=False)
            if spec.time_kind == "number" and not np.isfinite(tt).all():
                raise _locate(body, first_line, spec) or TableError(
                    f"{name}: time column {time_column!r} is not finite")
            if pa.types.is_timestamp(col.type) and tt.dtype.kind != "M":
                tt = tt.astype(f"datetime64[{col.type.unit}]")
        del table
        yield vals, tt, body, first_line, spec


class _TimeTracker:
    """Turns raw times of successive blocks into elapsed float64 values; checks they increase."""

    def __init__(self, name, column, what="line"):
        self.name = name
        self.column = column
        self.what = what
        self.axis = None          # a TimeAxis of the first sample (kind, origin, zone)
        self.last = None          # the last raw time (number or datetime64) of the last block
        self.last_where = None    # () -> where that time is ("line 12", "row 7")
        self.rows = 0
        self.text_info = None     # Parquet text times: (arrow type, zone, dates)

    def start(self, raw, kind, tz=None, dates=False, unit=None):
        from ._time import TimeAxis

        if kind == "number":
            self.axis = TimeAxis(raw[:1], "number", unit)
        else:
            self.axis = TimeAxis.from_datetime64(raw[:1], tz=tz, dates=dates)

    def elapsed(self, raw):
        from ._time import elapsed_seconds

        if self.axis.kind == "number":
            return np.array(raw, dtype=np.float64)
        return elapsed_seconds(raw, self.axis.origin)

    def check(self, raw, where_of_row):
        """Raise naming the first row whose time does not increase (``where_of_row(k)`` -> text)."""
        from ._time import first_non_increasing

        seq = raw if self.last is None else np.concatenate([np.asarray([self.last],
                                                                       dtype=raw.dtype), raw])
        k = first_non_increasing(seq)
        if k is not None:
            j = k if self.last is None else k - 1           # row index in this block
            prev_where = where_of_row(j - 1) if j >= 1 else self.last_where()
            here = where_of_row(j)
            now, before = self._show(seq[k]), self._show(seq[k - 1])
            verdict = (f"repeats the time on {prev_where}" if seq[k] == seq[k - 1]
                       else f"is before {before} on {prev_where}")
            raise TableError(f"{self.name}: {here}"
                             + (f" (data row {self.rows + j + 1})" if self.what == "line" else "")
                             + f": times are not strictly increasing: {self.column!r} = {now} "
                             f"{verdict} (sort the table by time; remove repeated rows)")
        self.last = raw[-1]
        last_k = len(raw) - 1
        self.last_where = lambda: where_of_row(last_k)
        self.rows += len(raw)

    def _show(self, v):
        if self.axis.kind == "number":
            return f"{float(v):.15g}"
        from ._time import elapsed_seconds
        e = elapsed_seconds(np.asarray([v]), self.axis.origin)
        return str(self.axis.format(e)[0])


def _raw_blocks(source, columns, time_column, delimiter, batch_rows=1 << 16):
    """Yield the channel names, then ``(values, times, time_axis, first_row)`` per block.

    A block is one parse of whole text lines, or one Parquet record batch of at most
    ``batch_rows`` rows.
    """
    name = _name_of(source)
    if time_column is not None and not isinstance(time_column, str):
        raise TypeError(f"time_column must be a column name (str), got "
                        f"{type(time_column).__name__}")
    if _is_parquet_name(source):
        yield from _parquet_blocks(source, name, columns, time_column, batch_rows)
        return
    delimiter = _delimiter_for(source, delimiter)
    inp = _Input(source)
    try:
        tracker = _TimeTracker(name, time_column) if time_column is not None else None
        rows = 0
        blocks = _text_blocks(inp, name, delimiter, columns, time_column)
        spec = next(blocks)
        yield list(spec.chosen)
        for vals, tt, body, first_line, spec in blocks:
            times = None
            if tracker is not None:
                if tracker.axis is None:
                    from ._time import _zone_of
                    zone = _zone_of(spec.first_time_text) if spec.time_zoned else None
                    tracker.start(tt, spec.time_kind, tz=zone,
                                  dates=len(spec.first_time_text) == 10)
                tracker.check(tt, lambda k, b=body, f=first_line:
                              f"line {_line_of_row(b, f, k)}")
                times = tracker.elapsed(tt)
            yield vals, times, (tracker.axis if tracker else None), rows
            rows += vals.shape[0]
    finally:
        inp.close()


# =========================================================================== Parquet
def _parquet_file(source, name):
    """An open ``pyarrow.parquet.ParquetFile`` (metadata only; rows are read in batches)."""
    import pyarrow.parquet as pq

    if isinstance(source, str) and source == "-":
        raise TableError("<stdin>: Parquet needs a file path (it cannot be read from standard "
                         "input)")
    if isinstance(source, (str, os.PathLike)):
        path = os.fspath(source)
        if not os.path.exists(path):
            raise TableError(f"{path}: no such file")
        if os.path.isdir(path):
            raise TableError(f"{path}: is a directory, not a table")
        if not os.path.isfile(path):
            raise TableError(f"{path}: Parquet needs a regular file (not a pipe or device)")
    try:
        # no pre-buffering (it caches every column chunk read, the whole file by the end) and
        # a buffered stream (pages are decoded as they are read, not a column chunk at once):
        # memory stays about one batch, whatever the row-group size.  64 KiB reads measured
        # ~25 MB below 1 MiB ones at 16 columns, at no cost in time (benchmarks/bench_streaming.py)
        return pq.ParquetFile(source, pre_buffer=False, buffer_size=1 << 16)
    except Exception as exc:  # pyarrow raises many kinds
        raise TableError(f"{name}: cannot read Parquet ({type(exc).__name__}: {exc})") from None


def _parquet_header(schema):
    # pandas stores a non-default index as a column "__index_level_0__": not a signal
    return [str(c) for c in schema.names if not str(c).startswith("__index_level_")]


def _check_parquet_names(header, name):
    dup = [c for c, k in Counter(header).items() if k > 1]
    if dup:
        raise TableError(f"{name}: repeated column names {dup[:10]}; every column needs its "
                         "own name")


def _channel_converter(typ, col, name):
    """A function arrow array -> float64 numpy for a channel column, or a TableError."""
    import pyarrow as pa

    t = pa.types
    if t.is_floating(typ):
        return _float_of
    if t.is_integer(typ):
        return lambda arr, row0: _int_of(arr, row0, col, name)
    if t.is_decimal(typ):
        return _decimal_of
    if t.is_null(typ):
        return lambda arr, row0: np.full(len(arr), np.nan)
    if t.is_boolean(typ):
        raise TableError(f"{name}: column {col!r} is boolean (true/false): a channel must be "
                         "a measured quantity, not a flag; convert it to 0/1 yourself if that "
                         "is what it means")
    if t.is_timestamp(typ) or t.is_date(typ) or t.is_time(typ) or t.is_duration(typ):
        raise TableError(f"{name}: column {col!r} holds date/times ({typ}); read it as the time "
                         "column, not as a channel")
    if t.is_string(typ) or t.is_large_string(typ):
        raise TableError(f"{name}: column {col!r} holds text, not numbers ({typ})")
    if t.is_dictionary(typ):
        raise TableError(f"{name}: column {col!r} is categorical ({typ}), not numeric")
    raise TableError(f"{name}: column {col!r} is not numeric ({typ})")


def _float_of(arr, row0=0):
    return arr.to_numpy(zero_copy_only=False).astype(np.float64, copy=False)


def _int_of(arr, row0, col, name):
    import pyarrow.compute as pc

    if len(arr) - arr.null_count:
        mm = pc.min_max(arr)
        lo, hi = mm["min"].as_py(), mm["max"].as_py()
        if max(abs(lo), abs(hi)) > 2 ** 53:
            vals = arr.to_pylist()
            k = next(i for i, v in enumerate(vals) if v is not None and abs(v) > 2 ** 53)
            raise TableError(f"{name}: row {row0 + k + 1}: column {col!r} holds the integer "
                             f"{vals[k]}, beyond 2**53 in magnitude, which float64 cannot hold "
                             "exactly (refused rather than rounded; rescale it or store it as "
                             "float)")
    out = arr.to_numpy(zero_copy_only=False)
    return out.astype(np.float64)


def _decimal_of(arr, row0=0):
    import pyarrow as pa

    # via the decimal text: the string-to-double parser rounds correctly (nearest, ties to
    # even), where a direct cast may round twice
    text = arr.cast(pa.string())
    return text.cast(pa.float64()).to_numpy(zero_copy_only=False).astype(np.float64, copy=False)


def _parquet_time(typ, col, name):
    """(kind, converter arrow -> raw numpy, tz, dates, unit) for a Parquet time column."""
    import pyarrow as pa

    t = pa.types
    if t.is_timestamp(typ):
        from ._time import _arrow_tz_name
        tz = _arrow_tz_name(typ.tz) if typ.tz else None

        def conv(arr, row0):
            out = arr.to_numpy(zero_copy_only=False)
            return out.astype(f"datetime64[{typ.unit}]") if out.dtype.kind != "M" else out
        return "datetime", conv, tz, False, None
    if t.is_date(typ):
        return "datetime", (lambda arr, row0: arr.cast(pa.date32())
                            .to_numpy(zero_copy_only=False).astype("datetime64[D]")), \
            None, True, None
    if t.is_duration(typ):
        return "number", (lambda arr, row0: arr.to_numpy(zero_copy_only=False)
                          / np.timedelta64(1, "s")), None, False, "s"
    if t.is_floating(typ):
        return "number", _float_of, None, False, None
    if t.is_integer(typ):
        return "number", (lambda arr, row0: _int_of(arr, row0, col, name)), None, False, None
    if t.is_decimal(typ):
        return "number", _decimal_of, None, False, None
    if t.is_string(typ) or t.is_large_string(typ):
        return "text", None, None, False, None
    raise TableError(f"{name}: time column {col!r} is neither numbers nor date/times ({typ})")


def _parquet_blocks(source, name, columns, time_column, batch_rows):
    """Parquet in record batches: memory O(batch x columns)."""
    import pyarrow as pa

    pf = _parquet_file(source, name)
    schema = pf.schema_arrow
    header = _parquet_header(schema)
    _check_parquet_names(header, name)
    chosen = _select(header, columns, time_column, name)
    convs = [_channel_converter(schema.field(c).type, c, name) for c in chosen]
    tinfo = None
    if time_column is not None:
        tinfo = _parquet_time(schema.field(time_column).type, time_column, name)
    wanted = chosen + ([time_column] if time_column else [])
    tracker = _TimeTracker(name, time_column, what="row") if time_column else None
    yield list(chosen)
    a = 0
    pool = pa.default_memory_pool()
    try:
        batches = pf.iter_batches(batch_size=batch_rows, columns=list(dict.fromkeys(wanted)))
        for batch in batches:
            pool.release_unused()   # hand freed decode buffers back to the OS between batches
            m = batch.num_rows
            if m == 0:
                continue
            where = {c: k for k, c in enumerate(batch.schema.names)}   # one pass, any width
            cols = {c: batch.column(where[c]) for c in wanted}
            vals = np.empty((m, len(chosen)), dtype=np.float64)
            for j, (c, conv) in enumerate(zip(chosen, convs)):
                vals[:, j] = conv(cols[c], a)
            if not np.isfinite(vals).all():
                bad = np.isinf(vals)
                if bad.any():
                    r, c = np.argwhere(bad)[0]
                    raise TableError(f"{name}: row {a + r + 1}: column {chosen[c]!r} is infinite")
            times = None
            if tracker is not None:
                times = _parquet_times(cols[time_column], tinfo, tracker, a, name, time_column)
            yield vals, times, (tracker.axis if tracker else None), a
            a += m
    except TableError:
        raise
    except Exception as exc:  # a damaged row group surfaces only when it is read
        raise TableError(f"{name}: cannot read Parquet after row {a} "
                         f"({type(exc).__name__}: {exc})") from None


def _parquet_times(arr, tinfo, tracker, a, name, col):
    import pyarrow as pa

    if arr.null_count:
        k = int(np.flatnonzero(np.asarray(arr.is_null()))[0])
        raise TableError(f"{name}: row {a + k + 1}: time column {col!r} is empty (a gap); "
                         "every row needs a time")
    kind, conv, tz, dates, unit = tinfo
    if kind == "text":
        from ._time import is_iso_datetime, _zone_of
        if tracker.axis is None:
            first = arr[0].as_py()
            if _NUMBER.fullmatch(first):
                raise TableError(f"{name}: time column {col!r} holds numbers as text; store "
                                 "them as numbers")
            if not is_iso_datetime(first):
                raise TableError(f"{name}: row 1: time column {col!r} has a value "
                                 f"{_show(first)} that is not an ISO-8601 date/time")
            zone = _zone_of(first)
            year = int(first[:4])
            typ = pa.timestamp("ns" if 1678 <= year <= 2261 else "us",
                               tz="UTC" if zone else None)
            tinfo_text = (typ, zone, len(first) == 10)
            tracker.text_info = tinfo_text
        typ, zone, dates = tracker.text_info
        try:
            parsed = arr.cast(typ)
        except (pa.ArrowInvalid, pa.ArrowNotImplementedError):
            texts = arr.to_pylist()
            for k, s in enumerate(texts):
                try:
                    pa.array([s], pa.string()).cast(typ)
                except (pa.ArrowInvalid, pa.ArrowNotImplementedError):
                    raise TableError(f"{name}: row {a + k + 1}: time column {col!r} has a value "
                                     f"{_show(s)} that is not an ISO-8601 date/time like the "
                                     "first one" + (" (with a zone)" if zone else "")) from None
            raise
        raw = parsed.to_numpy(zero_copy_only=False).astype(f"datetime64[{typ.unit}]")
        kind, tz = "datetime", zone
    else:
        raw = conv(arr, a)
    if kind == "number" and not np.isfinite(raw).all():
        k = int(np.flatnonzero(~np.isfinite(raw))[0])
        raise TableError(f"{name}: row {a + k + 1}: time column {col!r} is not finite")
    if tracker.axis is None:
        tracker.start(raw, kind, tz=tz, dates=dates, unit=unit)
    tracker.check(raw, lambda k: f"row {a + k + 1}")
    return tracker.elapsed(raw)


# =========================================================================== public
def _check_chunk_rows(chunk_rows):
    if isinstance(chunk_rows, bool) or not isinstance(chunk_rows, (int, np.integer)) \
            or chunk_rows < 1:
        raise ValueError(f"chunk_rows must be a positive integer, got {chunk_rows!r}")
    return int(chunk_rows)


def iter_table_chunks(source, *, columns=None, time_column=None, delimiter=None,
                      chunk_rows=100_000):
    """Yield the table in chunks of ``chunk_rows`` rows (the last may be shorter).

    Parameters
    ----------
    source, columns, time_column, delimiter
        As in :func:`read_table`.
    chunk_rows : int
        Rows per chunk.

    Yields
    ------
    Table
        ``values`` (m, n), ``times`` (m,) or None, the channel ``names``,
        ``time_axis`` (the same origin and zone for every chunk); ``source`` is
        ``"<file>:row <first data row>"``.

    The input is read once, in order.  Memory stays at about one chunk plus
    one block of the file (about 4 MiB of text -- more only for a longer
    line; Parquet is read in record batches of ``chunk_rows`` rows) and its
    parsed values, whatever the file's length.  Times are checked
    across chunk borders too.

    Examples
    --------
    >>> import io, wedgepath.io as wio
    >>> text = "a,b\\n" + "".join(f"{k},{k * k}\\n" for k in range(5))
    >>> [c.values.shape for c in wio.iter_table_chunks(io.StringIO(text), chunk_rows=2)]
    [(2, 2), (2, 2), (1, 2)]
    """
    chunk_rows = _check_chunk_rows(chunk_rows)
    name = _name_of(source)
    blocks = _raw_blocks(source, columns, time_column, delimiter, batch_rows=chunk_rows)
    with contextlib.closing(blocks):
        names = next(blocks)
        pending, pend_t, pend_rows, first_row, axis = [], [], 0, 0, None
        for vals, times, axis, _ in blocks:
            pos, m = 0, vals.shape[0]
            while pos < m:
                take = min(chunk_rows - pend_rows, m - pos)
                pending.append(vals[pos:pos + take])
                if times is not None:
                    pend_t.append(times[pos:pos + take])
                pend_rows += take
                pos += take
                if pend_rows == chunk_rows:
                    yield _chunk(pending, pend_t, names, name, first_row, axis)
                    first_row += pend_rows
                    pending, pend_t, pend_rows = [], [], 0
        if pend_rows:
            yield _chunk(pending, pend_t, names, name, first_row, axis)


def _chunk(parts, tparts, names, name, first_row, axis):
    vals = parts[0] if len(parts) == 1 else np.concatenate(parts)
    if vals.base is not None:
        vals = vals.copy()          # a chunk owns its rows (the block can be freed)
    times = t_axis = None
    if tparts:
        times = np.concatenate(tparts) if len(tparts) > 1 else np.array(tparts[0])
        t_axis = axis.with_values(times)
    return Table(values=vals, times=times, names=tuple(names),
                 source=f"{name}:row {first_row + 1}", time_axis=t_axis)


def read_table(source, *, columns=None, time_column=None, delimiter=None, min_rows=2):
    """Read a whole table of signals.

    Parameters
    ----------
    source : str, path-like, ``"-"`` or open file
        A ``.csv`` file (delimiter sniffed from the header), ``.tsv``/``.tab``
        (tab), ``.parquet``/``.pq``; ``"-"`` for standard input; or an open
        text or binary stream (read once, in order: pipes and FIFOs work).
    columns : sequence of str or comma-separated str, optional
        Channel columns, in this order.  Default: every column except the
        time column.
    time_column : str, optional
        The column of sample times: numbers or ISO-8601 date/times (see the
        module docstring); they must increase strictly.
    delimiter : str, optional
        Force a one-character delimiter.
    min_rows : int
        Refuse tables with fewer data rows.

    Returns
    -------
    Table
        ``values`` (T, n), ``times`` (T,) float64 or None, ``names``,
        ``source`` and ``time_axis``.

    Raises
    ------
    TableError (a ValueError)
        The message names the file, the line (CSV) or row (Parquet) and the
        column: see the module docstring for what is accepted.

    Notes
    -----
    The ``engine=`` option of earlier versions is gone: there is one parser.
    """
    if isinstance(min_rows, bool) or not isinstance(min_rows, int):
        raise TypeError(f"min_rows must be an integer, got {min_rows!r}")
    name = _name_of(source)
    blocks = _raw_blocks(source, columns, time_column, delimiter)
    parts, tparts, axis = [], [], None
    with contextlib.closing(blocks):
        names = next(blocks)
        for vals, times, axis, _ in blocks:
            parts.append(vals)
            if times is not None:
                tparts.append(times)
    if not parts:
        raise TableError(f"{name}: the table has a header but no data rows")
    values = parts[0] if len(parts) == 1 else np.concatenate(parts)
    del parts
    times = t_axis = None
    if time_column is not None:
        times = tparts[0] if len(tparts) == 1 else np.concatenate(tparts)
        t_axis = axis.with_values(times)
    if values.shape[0] < min_rows:
        raise TableError(f"{name}: {values.shape[0]} data row(s); at least {min_rows} are needed")
    return Table(values=values, times=times, names=tuple(names), source=name, time_axis=t_axis)


def stream_area_matrix(source, *, columns=None, time_column=None, delimiter=None,
                       chunk_rows=100_000, progress=None):
    """The chord-closed area matrix of a table read in chunks.

    Peak memory is about ``chunk_rows`` rows plus one block of the file and
    the ``n x n`` state of an :class:`~wedgepath.signals.AreaAccumulator`,
    whatever the file's length; the result equals ``area_matrix`` of the
    whole table (gaps included: NaN rows split it into pieces whose areas
    add).  ``source`` may be a path, ``"-"`` (standard input) or an open
    stream; it is read once.

    Parameters
    ----------
    source, columns, time_column, delimiter
        As in :func:`read_table`.
    chunk_rows : int
        Rows per chunk.
    progress : bool or None
        A bar counting the rows read, on standard error: None (default) only
        on a terminal and for runs longer than a few seconds, False never,
        True always.

    Returns
    -------
    AreaMatrix
        Labelled with the channel names; ``.values`` is the (n, n) array,
        ``.samples`` the number of data rows read.

    Examples
    --------
    >>> import io
    >>> from wedgepath.io import stream_area_matrix
    >>> text = "a,b\\n0,0\\n1,0\\n1,1\\n0,1\\n"
    >>> stream_area_matrix(io.StringIO(text), chunk_rows=2).values
    array([[ 0.,  1.],
           [-1.,  0.]])
    """
    check_progress(progress)
    chunks = iter_table_chunks(source, columns=columns, time_column=time_column,
                               delimiter=delimiter, chunk_rows=chunk_rows)
    # closing() shuts the file at once when a chunk is refused below
    with contextlib.closing(chunks), progress_bar(None, "rows read", progress,
                                                  unit=" rows") as bar:
        acc, rows = _stream_chunks(chunks, source, bar)
    if acc is None or rows < 2:
        raise TableError(f"{_name_of(source)}: fewer than 2 data rows")
    return acc.result()


def _stream_chunks(chunks, source, bar):
    from .signals import AreaAccumulator

    acc = None
    rows = 0
    for chunk in chunks:            # times were checked by the reader (strictly increasing)
        if acc is None:
            if len(chunk.names) < 2:
                raise TableError(f"{_name_of(source)}: lead-lag needs at least 2 channel columns")
            acc = AreaAccumulator(len(chunk.names), names=chunk.names)
        acc.update(chunk.values)
        rows += chunk.values.shape[0]
        bar.update(chunk.values.shape[0])
    return acc, rows
