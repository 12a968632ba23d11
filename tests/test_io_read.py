"""Reading tables: one parser, its accepted tokens, bounded reading, pipes, times and types.

Issue 13 (items 8, 13, 14, 16) and issue 16 (file input, time columns, column types).
Every case is read through a path, a text stream and a binary stream: one parser, the
same values and the same errors whatever the source.
"""

import datetime as dt
import decimal
import io
import os
import subprocess
import sys
import threading

import numpy as np
import pytest

import wedgepath as wp
import wedgepath.io as wio


def sources(tmp_path, text, name="t.csv"):
    """The same table as a file path, a text stream and a binary stream."""
    data = text.encode("utf-8") if isinstance(text, str) else text
    f = tmp_path / name
    f.write_bytes(data)
    out = [("path", f), ("bytes", io.BytesIO(data))]
    try:
        out.append(("text", io.StringIO(data.decode("utf-8"))))
    except UnicodeDecodeError:
        pass
    return out


def read_all_ways(tmp_path, text, **kw):
    results = []
    for how, src in sources(tmp_path, text):
        results.append((how, wio.read_table(src, **kw)))
    return results


def refuse_all_ways(tmp_path, text, words, **kw):
    for how, src in sources(tmp_path, text):
        with pytest.raises(wio.TableError, match=words):
            wio.read_table(src, **kw)


# ============================================================ accepted tokens (issue 13.8)
class TestTokens:
    @pytest.mark.parametrize("cell, value", [
        ("1", 1.0), ("-1.5", -1.5), ("+2.5", 2.5), (".5", 0.5), ("5.", 5.0), ("1e3", 1000.0),
        ("1E+03", 1000.0), ("-2.5e-3", -0.0025), ("0001", 1.0), ("-0", -0.0),
        (" 7 ", 7.0), ("\t8", 8.0), ('"9.5"', 9.5),
    ])
    def test_numbers(self, tmp_path, cell, value):
        for how, tab in read_all_ways(tmp_path, f"a,b\n{cell},1\n2,3\n"):
            assert tab.values[0, 0] == value, how
            assert np.signbit(tab.values[0, 0]) == np.signbit(value), how

    @pytest.mark.parametrize("cell", list(wio.GAP_TOKENS))
    def test_every_documented_gap_token_is_a_gap(self, tmp_path, cell):
        for how, tab in read_all_ways(tmp_path, f"a,b\n{cell},1\n2,3\n"):
            assert np.isnan(tab.values[0, 0]), how
            np.testing.assert_array_equal(tab.values[1], [2, 3])

    def test_na_and_hash_na_are_gaps(self, tmp_path):
        # the standard-library parser refused these; the fast one read them as gaps
        for how, tab in read_all_ways(tmp_path, "a,b\n1,n/a\n#N/A,2\n3,4\n"):
            assert tab.values.shape == (3, 2), how      # the #N/A row is data, not a comment
            np.testing.assert_array_equal(np.isnan(tab.values), [[0, 1], [1, 0], [0, 0]])

    @pytest.mark.parametrize("cell, words", [
        ("True", r"line 3: column 'a' has a non-numeric value 'True'.*true/false"),
        ("False", r"line 3: column 'a' has a non-numeric value 'False'.*true/false"),
        ("1_000", r"line 3: column 'a' has a non-numeric value '1_000' \(neither a number nor a gap"),
        ("\u0661\u0662", r"line 3: column 'a' has a non-numeric value '\u0661\u0662'"),   # Arabic-Indic digits
        ("\uff11", r"line 3: column 'a' has a non-numeric value '\uff11'"),               # full-width 1
        ("0x10", r"line 3: column 'a' has a non-numeric value '0x10'"),
        ("1,5", r"line 3: 3 fields, the header has 2"),
        ("-nan", r"line 3: column 'a' has a non-numeric value '-nan'.*gap tokens"),
        ("nAn", r"line 3: column 'a' has a non-numeric value 'nAn'"),
        (" NA", r"line 3: column 'a' has a non-numeric value ' NA'.*without spaces"),
        (" ", r"line 3: column 'a' has a non-numeric value ' '"),
        ("inf", r"line 3: column 'a' is infinite"),
        ("-Infinity", r"line 3: column 'a' is infinite"),
        ("1e999", r"line 3: column 'a' is infinite"),
        ("9" * 400, r"line 3: column 'a' is infinite"),
        ("1\x002", r"line 3: column 'a' has a non-numeric value '1\\x002'"),
    ])
    def test_refused_tokens_name_line_and_column(self, tmp_path, cell, words):
        refuse_all_ways(tmp_path, f"a,b\n1,2\n{cell},3\n4,5\n", words)

    def test_comment_lines_before_the_header_only(self, tmp_path):
        text = "# rig 4, run 2\n  # units: V, V\n\na,b\n1,2\n3,4\n"
        for how, tab in read_all_ways(tmp_path, text):
            assert tab.names == ("a", "b"), how
            np.testing.assert_array_equal(tab.values, [[1, 2], [3, 4]])

    @pytest.mark.parametrize("comment", ["# paused, resumed", "# note", "#,"])
    def test_comment_inside_the_data_names_its_line(self, tmp_path, comment):
        refuse_all_ways(tmp_path, f"a,b\n1,2\n3,4\n{comment}\n5,6\n",
                        r"line 4: .*comment lines \(#\) are allowed only before the header")

    def test_blank_lines_are_skipped_and_lines_still_counted(self, tmp_path):
        text = "a,b\n1,2\n\n\r\n3,4\n\n5,x\n"
        refuse_all_ways(tmp_path, text, r"line 7: column 'b' has a non-numeric value 'x'")
        for how, tab in read_all_ways(tmp_path, text[:-4]):
            np.testing.assert_array_equal(tab.values, [[1, 2], [3, 4]])

    def test_errors_deep_in_a_file_name_the_line(self, tmp_path, monkeypatch):
        # small read blocks: the bad line falls in a later block
        monkeypatch.setattr(wio, "_READ_BYTES", 1024)
        lines = ["a,b"] + [f"{k},{k * 0.5}" for k in range(5000)]
        lines[4321] = "4320,oops"
        refuse_all_ways(tmp_path, "\n".join(lines) + "\n", r"line 4322: column 'b' has a non-numeric value 'oops'")

    def test_second_header_row(self, tmp_path):
        refuse_all_ways(tmp_path, "a,b\nV,mA\n1,2\n", r"line 2: a second header row")
        refuse_all_ways(tmp_path, "a,b\n1,2\na,b\n3,4\n", r"line 3: the header row repeats here")

    def test_bare_carriage_returns_refused(self, tmp_path):
        refuse_all_ways(tmp_path, "a,b\n1,2\r3,4\n", r"line 2: .*carriage return")

    def test_quoted_value_spanning_lines_refused(self, tmp_path):
        refuse_all_ways(tmp_path, 'a,b\n1,2\n"3,4\n5,6\n', r"line 3: .*quote")

    @pytest.mark.parametrize("text, names, values", [
        ("\ufeffa,b\n1,2\n3,4\n", ["a", "b"], [[1, 2], [3, 4]]),            # byte-order mark
        ('"p,q",b\n1,2\n3,4\n', ["p,q", "b"], [[1, 2], [3, 4]]),              # quoted name
        ("a;b\n1;2\n3;4\n", ["a", "b"], [[1, 2], [3, 4]]),                    # sniffed ;
        ("a|b|c\n1|2|3\n4|5|6\n", ["a", "b", "c"], [[1, 2, 3], [4, 5, 6]]),  # sniffed |
        ("a\tb\n1\t2\n3\t4\n", ["a", "b"], [[1, 2], [3, 4]]),              # sniffed tab
        (" a , b \n1,2\n3,4\n", ["a", "b"], [[1, 2], [3, 4]]),                # names stripped
    ])
    def test_headers_and_delimiters(self, tmp_path, text, names, values):
        for how, tab in read_all_ways(tmp_path, text):
            assert tab.names == tuple(names), how
            np.testing.assert_array_equal(tab.values, values)

    def test_decimal_comma_and_space_lines_refused(self, tmp_path):
        refuse_all_ways(tmp_path, "a;b\n1,5;2\n3;4\n", r"line 2: column 'a' has a non-numeric "
                                                        r"value '1,5'")
        refuse_all_ways(tmp_path, "a,b\n1,2\n   \n3,4\n", r"line 3: 1 fields, the header has 2")

    def test_not_utf8_names_the_line(self, tmp_path):
        data = b"a,b\n1,2\n3,4\n\xff\xfe,4\n"
        for how, src in sources(tmp_path, data):
            with pytest.raises(wio.TableError, match=r"line 4: not UTF-8"):
                wio.read_table(src)

    def test_one_parser_whatever_the_source(self, tmp_path):
        rng = np.random.default_rng(0)
        X = rng.normal(size=(2000, 3)) * 10.0 ** rng.integers(-200, 200, size=(2000, 3))
        X[::97, 1] = np.nan
        text = "# invented numbers\nt,a,b,c\n" + "".join(
            f"{k * 0.5!r}," + ",".join("" if np.isnan(v) else repr(float(v)) for v in row) + "\n"
            for k, row in enumerate(X))
        for how, tab in read_all_ways(tmp_path, text, time_column="t"):
            np.testing.assert_array_equal(tab.values, X)     # repr round-trips exactly
            np.testing.assert_array_equal(tab.times, np.arange(2000) * 0.5)

    def test_engine_option_is_gone(self, tmp_path):
        f = tmp_path / "a.csv"
        f.write_text("a,b\n1,2\n3,4\n")
        with pytest.raises(TypeError):
            wio.read_table(f, engine="python")


# ============================================================ bounded reading (issue 13.13)
class TestBounded:
    def test_duplicate_header_check_is_linear(self, tmp_path):
        # 80,000 columns, the repeat at the end: the quadratic check took 85 s; the linear one
        # takes a fraction of a second.  A 30 s guard (a thread, so a regression fails instead
        # of stalling the suite) tells the two apart with a wide margin; it is no speed target
        f = tmp_path / "wide.csv"
        names = [f"c{k}" for k in range(80_000)] + ["c5"]
        f.write_text(",".join(names) + "\n" + ",".join("1" for _ in names) + "\n")
        result = {}

        def read():
            try:
                wio.read_table(f)
            except wio.TableError as exc:
                result["message"] = str(exc)

        th = threading.Thread(target=read, daemon=True)
        th.start()
        th.join(30)
        assert not th.is_alive(), "the header check is not linear"
        assert "line 1: repeated column names ['c5']" in result["message"]

    def test_wide_table_reads(self, tmp_path):
        n = 3000
        f = tmp_path / "wide.csv"
        f.write_text(",".join(f"c{k}" for k in range(n)) + "\n"
                     + "\n".join(",".join(str(r * n + k) for k in range(n)) for r in range(3)) + "\n")
        tab = wio.read_table(f)
        np.testing.assert_array_equal(tab.values, np.arange(3 * n, dtype=float).reshape(3, n))

    def test_line_longer_than_the_limit(self, tmp_path, monkeypatch):
        monkeypatch.setattr(wio, "MAX_LINE_BYTES", 4096)
        body = "a,b\n1,2\n3," + "4" * 10_000 + "\n5,6\n"
        refuse_all_ways(tmp_path, body, r"line 3 is longer than 4096 bytes")
        # a tail without any newline: refused after reading about the limit, not the tail
        refuse_all_ways(tmp_path, "a,b\n1,2\n" + "7" * 100_000, r"line 3 is longer than 4096")

    def test_header_longer_than_the_limit(self, tmp_path, monkeypatch):
        monkeypatch.setattr(wio, "MAX_LINE_BYTES", 4096)
        refuse_all_ways(tmp_path, "a" * 5000 + ",b\n1,2\n", r"line 1 is longer than 4096")

    def test_default_limit_is_documented(self):
        assert wio.MAX_LINE_BYTES == 16 * 2 ** 20
        assert "16 MiB" in wio.__doc__

    @pytest.mark.skipif(not os.path.exists("/dev/zero"), reason="needs /dev/zero")
    def test_dev_zero_is_refused_quickly_in_bounded_memory(self):
        # zeros without a newline: the first line exceeds the limit and reading stops there.
        # tracemalloc sees the reader's buffers (bytes objects); the old reader took gigabytes
        import tracemalloc
        tracemalloc.start()
        try:
            with pytest.raises(wio.TableError,
                               match=r"/dev/zero: line 1 is longer than 16777216 bytes"):
                wio.read_table("/dev/zero")
            _, peak = tracemalloc.get_traced_memory()
        finally:
            tracemalloc.stop()
        assert peak < 100 * 2 ** 20


# ============================================================ pipes and stdin (issue 13.14)
CSV_TEXT = "t,a,b\n" + "".join(f"{k},{np.sin(k / 5):.6f},{np.cos(k / 5):.6f}\n" for k in range(200))


def expected_matrix():
    tab = wio.read_table(io.StringIO(CSV_TEXT), time_column="t")
    return wp.area_matrix(tab.values)


class TestPipes:
    def test_read_table_dash_is_stdin(self, monkeypatch):
        fake = io.TextIOWrapper(io.BytesIO(CSV_TEXT.encode()), encoding="utf-8")
        monkeypatch.setattr(sys, "stdin", fake)
        tab = wio.read_table("-", time_column="t")
        assert tab.values.shape == (200, 2) and tab.source == "<stdin>"

    @pytest.mark.parametrize("stream", [False, True])
    def test_cli_dash_reads_standard_input(self, stream, monkeypatch, capsys):
        import json
        from wedgepath.cli import main
        fake = io.TextIOWrapper(io.BytesIO(CSV_TEXT.encode()), encoding="utf-8")
        monkeypatch.setattr(sys, "stdin", fake)
        code = main(["leadlag", "-", "--time", "t", "--json", "--quiet"]
                    + (["--stream"] if stream else []))
        out = capsys.readouterr()
        assert code == 0, out.err
        rep = json.loads(out.out)
        assert rep["samples"] == 200
        np.testing.assert_allclose(rep["raw_area_matrix"], expected_matrix(), rtol=1e-12)

    @pytest.mark.skipif(not os.path.exists("/dev/stdin"), reason="no /dev/stdin")
    def test_cli_reads_dev_stdin_from_a_pipe(self):
        # a real pipe on the process's standard input, named by path (with --stream, which
        # also estimates the size for its progress bar: that must not consume the pipe)
        cmd = [sys.executable, "-m", "wedgepath", "leadlag", "/dev/stdin", "--time", "t",
               "--json", "--quiet", "--stream"]
        out = subprocess.run(cmd, input=CSV_TEXT.encode(), capture_output=True, timeout=120)
        assert out.returncode == 0, out.stderr.decode()
        import json
        rep = json.loads(out.stdout)
        assert rep["samples"] == 200
        np.testing.assert_allclose(rep["raw_area_matrix"], expected_matrix(), rtol=1e-12)

    @pytest.mark.skipif(not hasattr(os, "mkfifo"), reason="needs FIFOs")
    def test_fifo_is_read_once(self, tmp_path):
        # a FIFO can be opened for reading once per writer: a reader that opens it twice
        # waits forever.  The read runs in a thread so that such a regression fails the
        # test after 60 s instead of hanging the suite.
        fifo = tmp_path / "in.csv"
        os.mkfifo(fifo)

        def writer():
            with open(fifo, "w") as fh:
                fh.write(CSV_TEXT)

        result = {}

        def reader():
            try:
                result["table"] = wio.read_table(fifo, time_column="t")
            except Exception as exc:  # noqa: BLE001 -- reported below
                result["error"] = exc

        threads = [threading.Thread(target=writer, daemon=True),
                   threading.Thread(target=reader, daemon=True)]
        for th in threads:
            th.start()
        threads[1].join(60)
        assert not threads[1].is_alive(), "reading the FIFO hangs"
        assert "error" not in result, result.get("error")
        assert result["table"].values.shape == (200, 2)

    def test_parquet_on_stdin_is_refused_clearly(self, tmp_path):
        pd = pytest.importorskip("pandas")
        f = tmp_path / "s.parquet"
        pd.DataFrame({"a": [1.0, 2.0], "b": [3.0, 4.0]}).to_parquet(f)
        with pytest.raises(wio.TableError, match="Parquet .* needs a file path"):
            wio.read_table(io.BytesIO(f.read_bytes()))


# ============================================================ Parquet (issue 13.16, issue 16)
pa = pytest.importorskip("pyarrow")
pq = pytest.importorskip("pyarrow.parquet")


def write_parquet(path, columns, names=None, **kw):
    table = pa.table(columns) if names is None else pa.Table.from_arrays(list(columns), names=names)
    pq.write_table(table, path, **kw)
    return path


class TestParquetTypes:
    def test_duplicate_column_names(self, tmp_path):
        f = write_parquet(tmp_path / "d.parquet", [pa.array([1.0, 2.0]), pa.array([3.0, 4.0])],
                          names=["a", "a"])
        with pytest.raises(wio.TableError, match=r"repeated column names \['a'\]"):
            wio.read_table(f)
        with pytest.raises(wio.TableError, match=r"repeated column names \['a'\]"):
            wio.table_columns(f)

    def test_integers_and_nullable_integers(self, tmp_path):
        pd = pytest.importorskip("pandas")
        df = pd.DataFrame({"i8": np.array([1, -2, 3], dtype=np.int8),
                           "u64": np.array([0, 2 ** 53, 5], dtype=np.uint64),
                           "n": pd.array([1, None, 3], dtype="Int64")})
        f = tmp_path / "i.parquet"
        df.to_parquet(f)
        tab = wio.read_table(f)
        np.testing.assert_array_equal(tab.values, [[1, 0, 1], [-2, 2.0 ** 53, np.nan], [3, 5, 3]])

    @pytest.mark.parametrize("value", [2 ** 53 + 1, -(2 ** 60)])
    def test_integers_beyond_2_53_are_refused(self, tmp_path, value):
        f = write_parquet(tmp_path / "big.parquet",
                          {"a": pa.array([1, 2, value, 4], pa.int64()), "b": [1.0, 2.0, 3.0, 4.0]})
        with pytest.raises(wio.TableError,
                           match=rf"row 3: column 'a' holds the integer {value}.*2\*\*53"):
            wio.read_table(f)

    def test_uint64_beyond_2_53_is_refused(self, tmp_path):
        f = write_parquet(tmp_path / "u.parquet", {"a": pa.array([1, 2 ** 64 - 1], pa.uint64()),
                                                    "b": [1.0, 2.0]})
        with pytest.raises(wio.TableError, match=r"row 2: column 'a' holds the integer "
                                                 r"18446744073709551615"):
            wio.read_table(f)

    def test_boolean_channel_refused_with_the_reason(self, tmp_path):
        f = write_parquet(tmp_path / "b.parquet", {"a": [1.0, 2.0], "flag": [True, False]})
        with pytest.raises(wio.TableError, match=r"column 'flag' is boolean.*must be a measured quantity"):
            wio.read_table(f)

    def test_decimal_is_correctly_rounded(self, tmp_path):
        texts = ["0.1", "1234567890.123456789", "-0.30000000000000004441", "2.5", "1e-20"]
        vals = [decimal.Decimal(t) for t in texts]
        f = write_parquet(tmp_path / "dec.parquet",
                          {"a": pa.array(vals, pa.decimal128(38, 20)),
                           "b": [1.0, 2.0, 3.0, 4.0, 5.0]})
        tab = wio.read_table(f)
        # Python's float(Decimal) is correctly rounded (round-half-even of the exact value):
        # the Python Language Reference, "decimal" module, Decimal.__float__
        assert tab.values[:, 0].tolist() == [float(v) for v in vals]

    def test_timestamp_as_channel_points_to_the_time_column(self, tmp_path):
        f = write_parquet(tmp_path / "ts.parquet", {
            "when": pa.array([0, 1], pa.timestamp("s")), "a": [1.0, 2.0], "b": [3.0, 4.0]})
        with pytest.raises(wio.TableError, match=r"column 'when' holds date/times.*time column"):
            wio.read_table(f)

    def test_text_channel_refused(self, tmp_path):
        f = write_parquet(tmp_path / "s.parquet", {"a": [1.0, 2.0], "s": ["x", "y"]})
        with pytest.raises(wio.TableError, match=r"column 's' holds text"):
            wio.read_table(f)


# ============================================================ time columns (issue 16)
class TestTimeColumns:
    def test_iso_dates_in_csv(self, tmp_path):
        # quarterly series with ISO dates (invented numbers)
        text = "date,gdp,cons\n1959-01-01,1.0,2.0\n1959-04-01,1.5,2.5\n1959-07-01,1.2,2.9\n"
        for how, tab in read_all_ways(tmp_path, text, time_column="date"):
            day = 86400.0
            # days between the dates counted on the calendar: Jan-Mar 1959 = 31+28+31 = 90
            np.testing.assert_array_equal(tab.times, [0.0, 90 * day, 181 * day])
            ax = tab.time_axis
            assert (ax.kind, ax.unit, ax.tz, ax.dates) == ("datetime", "s", None, True)
            assert ax.origin == np.datetime64("1959-01-01")
            assert ax.format(tab.times).tolist() == ["1959-01-01", "1959-04-01", "1959-07-01"]

    def test_iso_datetimes_with_offset(self, tmp_path):
        text = ("when,a,b\n2021-03-28T01:59:00+01:00,1,2\n2021-03-28T03:00:00+02:00,3,4\n"
                "2021-03-28T03:00:30.5+02:00,5,6\n")
        for how, tab in read_all_ways(tmp_path, text, time_column="when"):
            np.testing.assert_array_equal(tab.times, [0.0, 60.0, 90.5])
            assert tab.time_axis.tz == "+01:00"           # the zone of the first stamp
            assert tab.time_axis.origin == np.datetime64("2021-03-28T00:59:00")   # UTC
            assert tab.time_axis.format([60.0]).tolist() == ["2021-03-28T02:00:00+01:00"]

    def test_numeric_time_column(self, tmp_path):
        for how, tab in read_all_ways(tmp_path, "t,a,b\n0.5,1,2\n1.5,3,4\n", time_column="t"):
            assert tab.time_axis.kind == "number" and tab.time_axis.unit is None
            np.testing.assert_array_equal(tab.times, [0.5, 1.5])

    @pytest.mark.parametrize("text, words", [
        ("t,a,b\n0,1,2\n1,2,3\n1,3,4\n",
         r"line 4 \(data row 3\): times are not strictly increasing: 't' = 1 repeats the time "
         r"on line 3"),
        ("t,a,b\n0,1,2\n2,2,3\n1.5,3,4\n",
         r"line 4 \(data row 3\): times are not strictly increasing: 't' = 1.5 is before 2 "
         r"on line 3"),
        ("t,a,b\n0,1,2\n\n2,2,3\nNA,3,4\n", r"line 5: time column 't' is empty"),
        ("d,a,b\n2020-01-02,1,2\n2020-01-01,3,4\n",
         r"line 3 \(data row 2\): .* 'd' = 2020-01-01 is before 2020-01-02 on line 2"),
        ("d,a,b\n2020-01-01,1,2\n2020-01-0x,3,4\n",
         r"line 3: time column 'd' has a value '2020-01-0x' that is not an ISO-8601 date/time"),
        ("d,a,b\n2020-01-01T00:00Z,1,2\n2020-01-01T01:00,3,4\n",
         r"line 3: time column 'd' has a value '2020-01-01T01:00' .*zone"),
        ("d,a,b\n2020-02-30,1,2\n2020-03-01,3,4\n", r"line 2: time column 'd' has a value"),
        ("d,a,b\nsoon,1,2\n", r"line 2: time column 'd' has a value 'soon' that is neither"),
    ])
    def test_bad_times_name_the_first_offending_row(self, tmp_path, text, words):
        refuse_all_ways(tmp_path, text, words, time_column=text.split(",")[0])

    def test_bad_times_across_read_blocks(self, tmp_path, monkeypatch):
        monkeypatch.setattr(wio, "_READ_BYTES", 256)
        rows = [f"{k},{k % 7},{k % 5}" for k in range(400)]
        rows[300] = "250,1,1"
        refuse_all_ways(tmp_path, "t,a,b\n" + "\n".join(rows) + "\n",
                        r"line 302 \(data row 301\): times are not strictly increasing: "
                        r"'t' = 250 is before 299 on line 301", time_column="t")

    def test_no_silent_sorting(self, tmp_path):
        f = tmp_path / "s.csv"
        f.write_text("t,a,b\n2,1,2\n1,3,4\n")
        with pytest.raises(wio.TableError, match="not strictly increasing"):
            wio.read_table(f, time_column="t")

    def test_stream_with_datetimes(self, tmp_path):
        start = np.datetime64("2022-06-01T00:00:00")
        t = start + np.arange(300) * np.timedelta64(90, "s")
        X = np.c_[np.sin(np.arange(300) / 9), np.cos(np.arange(300) / 9)]
        text = "stamp,a,b\n" + "".join(f"{s},{float(x)!r},{float(y)!r}\n" for s, (x, y) in
                                       zip(np.datetime_as_string(t), X))
        f = tmp_path / "dt.csv"
        f.write_text(text)
        chunks = list(wio.iter_table_chunks(f, time_column="stamp", chunk_rows=64))
        assert [len(c.values) for c in chunks] == [64, 64, 64, 64, 44]
        np.testing.assert_array_equal(np.concatenate([c.times for c in chunks]),
                                      np.arange(300) * 90.0)
        assert all(c.time_axis.origin == start for c in chunks)
        A = wio.stream_area_matrix(f, time_column="stamp", chunk_rows=64)
        np.testing.assert_allclose(A.values, wp.area_matrix(X), rtol=1e-12)

    def test_parquet_time_types(self, tmp_path):
        pd = pytest.importorskip("pandas")
        idx = pd.date_range("2021-10-31 00:30", periods=4, freq="30min", tz="Europe/Berlin")
        df = pd.DataFrame({"ts": idx, "a": [1.0, 2.0, 3.0, 4.0], "b": [4.0, 3.0, 1.0, 2.0],
                           "day": pd.to_datetime(["2020-01-01", "2020-01-02", "2020-01-04",
                                                  "2020-01-08"]).date,
                           "iso": ["2020-01-01T00:00:00Z", "2020-01-01T00:00:01Z",
                                   "2020-01-01T00:00:03Z", "2020-01-01T00:00:07Z"],
                           "naive": idx.tz_localize(None)})
        f = tmp_path / "t.parquet"
        df.to_parquet(f)
        tab = wio.read_table(f, columns=["a", "b"], time_column="ts")
        np.testing.assert_array_equal(tab.times, [0, 1800, 3600, 5400])
        assert tab.time_axis.tz == "Europe/Berlin"
        # the night the clocks went back: 02:30 +02:00 is followed by 02:00 +01:00
        assert tab.time_axis.format().tolist() == [
            "2021-10-31T00:30:00+02:00", "2021-10-31T01:00:00+02:00",
            "2021-10-31T01:30:00+02:00", "2021-10-31T02:00:00+02:00"]
        tab = wio.read_table(f, columns=["a", "b"], time_column="day")
        np.testing.assert_array_equal(tab.times, np.array([0, 1, 3, 7]) * 86400.0)
        assert tab.time_axis.format().tolist()[-1] == "2020-01-08"
        tab = wio.read_table(f, columns=["a", "b"], time_column="iso")
        np.testing.assert_array_equal(tab.times, [0, 1, 3, 7])
        assert tab.time_axis.tz == "UTC"
        tab = wio.read_table(f, columns=["a", "b"], time_column="naive")
        assert tab.time_axis.tz is None and tab.time_axis.kind == "datetime"

    def test_parquet_missing_and_repeated_times(self, tmp_path):
        f = write_parquet(tmp_path / "m.parquet", {"t": [0.0, 1.0, None, 3.0], "a": [1.0] * 4,
                                                    "b": [2.0] * 4})
        with pytest.raises(wio.TableError, match=r"row 3: time column 't' is empty"):
            wio.read_table(f, time_column="t")
        f = write_parquet(tmp_path / "r.parquet", {"t": [0.0, 1.0, 1.0, 3.0], "a": [1.0] * 4,
                                                    "b": [2.0] * 4})
        with pytest.raises(wio.TableError, match=r"row 3: times are not strictly increasing: "
                                                 r"'t' = 1 repeats the time on row 2"):
            wio.read_table(f, time_column="t")

    def test_time_axis_of_python_datetimes_matches(self, tmp_path):
        # elapsed seconds computed independently with the standard library's datetime
        stamps = [dt.datetime(2020, 2, 28, 23, 0), dt.datetime(2020, 2, 29, 1, 30),
                  dt.datetime(2020, 3, 1, 0, 0, 0, 250_000)]
        text = "t,a,b\n" + "".join(f"{s.isoformat()},{k},{k * k}\n" for k, s in enumerate(stamps))
        for how, tab in read_all_ways(tmp_path, text, time_column="t"):
            want = [(s - stamps[0]).total_seconds() for s in stamps]
            np.testing.assert_array_equal(tab.times, want)


# ============================================================ the command line's reading
class TestCommandLine:
    def test_time_column_of_iso_dates(self, tmp_path, capsys):
        # a quarterly series with ISO dates (invented numbers): --time date failed before with
        # "non-numeric value '1959-01-01'"
        from wedgepath.cli import main
        import json
        q = np.arange(40)
        dates = np.datetime64("1959-01", "M") + 3 * q
        X = np.c_[np.sin(q / 3.0), np.sin(q / 3.0 - 0.7)]
        f = tmp_path / "macro.csv"
        f.write_text("date,output,prices\n" + "".join(
            f"{np.datetime_as_string(d.astype('M8[D]'))},{a!r},{b!r}\n"
            for d, (a, b) in zip(dates, X.tolist())))
        code = main(["leadlag", str(f), "--time", "date", "--json", "--quiet"])
        out = capsys.readouterr()
        assert code == 0, out.err
        rep = json.loads(out.out)
        assert rep["samples"] == 40
        np.testing.assert_allclose(rep["raw_area_matrix"], wp.area_matrix(X), rtol=1e-12)

    @pytest.mark.skipif(not os.path.exists("/bin/bash") or not os.path.exists("/dev/fd"),
                        reason="needs bash process substitution")
    def test_process_substitution(self, tmp_path):
        f = tmp_path / "s.csv"
        f.write_text(CSV_TEXT)
        cmd = (f"'{sys.executable}' -m wedgepath leadlag <(cat '{f}') --time t --json --quiet")
        out = subprocess.run(["/bin/bash", "-c", cmd], capture_output=True, timeout=120)
        assert out.returncode == 0, out.stderr.decode()
        import json
        assert json.loads(out.stdout)["samples"] == 200


def test_parquet_integer_and_duration_times(tmp_path):
    f = write_parquet(tmp_path / "it.parquet", {"t": pa.array([10, 20, 35], pa.int64()),
                                                 "a": [1.0, 2.0, 3.0], "b": [3.0, 1.0, 2.0]})
    tab = wio.read_table(f, time_column="t")
    assert tab.times.tolist() == [10.0, 20.0, 35.0] and tab.time_axis.kind == "number"
    f = write_parquet(tmp_path / "big.parquet", {"t": pa.array([0, 1, 2 ** 60], pa.int64()),
                                                  "a": [1.0, 2.0, 3.0], "b": [3.0, 1.0, 2.0]})
    with pytest.raises(wio.TableError, match=r"row 3: column 't' holds the integer"):
        list(wio.iter_table_chunks(f, time_column="t", chunk_rows=2))
    f = write_parquet(tmp_path / "dur.parquet", {"t": pa.array([0, 1500, 4000], pa.duration("ms")),
                                                  "a": [1.0, 2.0, 3.0], "b": [3.0, 1.0, 2.0]})
    tab = wio.read_table(f, time_column="t")
    assert tab.times.tolist() == [0.0, 1.5, 4.0]
    assert (tab.time_axis.kind, tab.time_axis.unit) == ("number", "s")
