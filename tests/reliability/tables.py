"""Bad-input rows for reading tables: read_table, iter_table_chunks, table_columns, stream_area_matrix."""

from __future__ import annotations

from ._table import *  # noqa: F403 - the shared inputs, row() and returns()


_TMP = tempfile.mkdtemp(prefix="wedgepath-reliability-")


def tfile(name, content):
    """A file in a private temporary folder (bytes or text)."""
    path = os.path.join(_TMP, name)
    with open(path, "wb") as fh:
        fh.write(content if isinstance(content, bytes) else content.encode("utf-8"))
    return path


GOOD_CSV = "t,a,b\n0,1,0\n1,0,1\n2,-1,0\n3,0,-1\n"
MALFORMED = {
    # cls, given, file content, message fragment
    "truncated": ("file", "last line cut after its first field", "a,b\n1,2\n3,4\n5",
                  "line 4: 1 fields, the header has 2"),
    "delimiter": ("file", "';'-separated file read with --delimiter ','", "a;b\n1;2\n3;4\n",
                  "wrong delimiter?"),
    "mixed": ("file", "a text cell among numbers", "a,b\n1,2\nx,4\n",
              "column 'a' has a non-numeric value 'x'"),
    "huge field": ("file", "a 2 MB field (2 million digits)", "a,b\n1," + "9" * 2_000_000 + "\n3,4\n",
                   "column 'b' is infinite"),
    "huge number": ("file", "a number beyond float64 (400 digits)", "a,b\n1," + "9" * 400 + "\n3,4\n",
                    "column 'b' is infinite"),
    "non-utf8": ("file", "bytes 0xff 0xfe (not UTF-8)", b"a,b\n1,2\n\xff\xfe,4\n", "not UTF-8"),
    "empty": ("empty", "an empty file", "", "the table is empty"),
    "header only": ("single", "a header and no rows", "a,b\n", "header but no data rows"),
    "one row": ("single", "one data row", "a,b\n1,2\n", "1 data row(s)"),
    "numeric header": ("file", "no header row", "1,2\n3,4\n5,6\n", "a header row naming the columns"),
    "repeated names": ("file", "repeated column names", "a,a\n1,2\n3,4\n", "repeated column names"),
    "inf": ("inf", "a cell 'inf'", "a,b\n1,inf\n3,4\n", "column 'b' is infinite"),
    "nul": ("file", "a NUL byte in a cell", b"a,b\n1,2\n3\x00,4\n", "non-numeric value"),
}
for key, (cls, given, content, frag) in MALFORMED.items():
    path = tfile(key.replace(" ", "_") + ".csv", content)
    delim = "," if key == "delimiter" else None
    row("wp.io.read_table(source)", cls, given,
        lambda path=path, delim=delim: wio.read_table(path, delimiter=delim), wio.TableError, frag)
row("wp.io.read_table(source)", "file", "a missing file",
    lambda: wio.read_table(os.path.join(_TMP, "nope.csv")), wio.TableError, "no such file")
row("wp.io.read_table(source)", "file", "a folder", lambda: wio.read_table(_TMP), wio.TableError,
    "is a directory")
row("wp.io.read_table(source)", "text", "source = 123", lambda: wio.read_table(123), TypeError,
    "a table source must be a path, '-' (standard input) or an open file")
row("wp.io.read_table(source)", "file", "a file that is not Parquet",
    lambda: wio.read_table(tfile("bad.parquet", "not parquet")), wio.TableError,
    "cannot read Parquet")
row("wp.io.read_table(source)", "option", "columns=['zz']",
    lambda: wio.read_table(tfile("good.csv", GOOD_CSV), columns=["zz"]), wio.TableError,
    "unknown column 'zz'")
row("wp.io.read_table(source)", "option", "time_column='zz'",
    lambda: wio.read_table(tfile("good.csv", GOOD_CSV), time_column="zz"), wio.TableError,
    "unknown time column 'zz'")
row("wp.io.read_table(source)", "option", "columns=5",
    lambda: wio.read_table(tfile("good.csv", GOOD_CSV), columns=5), TypeError,
    "columns must be a list")
row("wp.io.read_table(source)", "option", "delimiter=',,'",
    lambda: wio.read_table(tfile("good.csv", GOOD_CSV), delimiter=",,"), wio.TableError,
    "delimiter must be one character")
row("wp.io.read_table(source)", "option", "engine='fast' (gone: there is one parser)",
    lambda: wio.read_table(tfile("good.csv", GOOD_CSV), engine="fast"), TypeError,
    "unexpected keyword argument 'engine'")
row("wp.io.read_table(source)", "option", "min_rows='a'",
    lambda: wio.read_table(tfile("good.csv", GOOD_CSV), min_rows="a"), TypeError,
    "min_rows must be an integer")
row("wp.io.read_table(source)", "nan", "an empty time cell",
    lambda: wio.read_table(tfile("tnan.csv", "t,a,b\n0,1,2\n,2,3\n"), time_column="t"),
    wio.TableError, "time column 't' is empty")
row("wp.io.iter_table_chunks(source)", "option", "chunk_rows=0",
    lambda: list(wio.iter_table_chunks(tfile("good.csv", GOOD_CSV), chunk_rows=0)), ValueError,
    "chunk_rows must be a positive integer")
row("wp.io.iter_table_chunks(source)", "file", "a truncated line",
    lambda: list(wio.iter_table_chunks(tfile("tr2.csv", "a,b\n1,2\n3\n"))), wio.TableError,
    "1 fields, the header has 2")
row("wp.io.table_columns(source)", "file", "a missing file",
    lambda: wio.table_columns(os.path.join(_TMP, "nope.csv")), wio.TableError, "no such file")
row("wp.io.table_columns(source)", "file", "a non-UTF-8 header",
    lambda: wio.table_columns(tfile("nuh.csv", b"\xffa,b\n1,2\n")), wio.TableError, "not UTF-8")
row("wp.io.stream_area_matrix(source)", "ndim", "one channel column",
    lambda: wio.stream_area_matrix(tfile("good.csv", GOOD_CSV), columns=["a"]), wio.TableError,
    "at least 2 channel columns")
row("wp.io.stream_area_matrix(source)", "times", "a repeated time",
    lambda: wio.stream_area_matrix(tfile("tdup.csv", "t,a,b\n0,1,2\n0,2,3\n"), time_column="t"),
    wio.TableError, "times are not strictly increasing")
row("wp.io.stream_area_matrix(source)", "single", "one data row",
    lambda: wio.stream_area_matrix(tfile("one.csv", "a,b\n1,2\n")), wio.TableError,
    "fewer than 2 data rows")
row("wp.io.stream_area_matrix(source)", "empty", "a header and no rows, with a time column",
    lambda: wio.stream_area_matrix(tfile("hdr.csv", "t,a,b\n"), time_column="t"), wio.TableError,
    "fewer than 2 data rows")
row("wp.io.stream_area_matrix(source)", "file", "a non-UTF-8 byte mid-file",
    lambda: wio.stream_area_matrix(tfile("nu2.csv", b"a,b\n1,2\n\xff,4\n")), wio.TableError,
    "not UTF-8")
