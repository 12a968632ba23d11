"""Table reading and safe formula parsing (the command line's inputs)."""

import io

import numpy as np
import pytest
import sympy as sp

import wedgepath as wp
import wedgepath.io as wio
from wedgepath.formula import parse_formula

X, Y = sp.symbols("x y", real=True)
VARS = {"x": X, "y": Y}


class TestReadTable:
    def test_values_times_gaps_comments(self, tmp_path):
        f = tmp_path / "s.csv"
        f.write_text("# comment\nt,a,b\n0,1,2\n0.5,,3\n\n1.5,4,NA\n")
        tab = wio.read_table(f, time_column="t")
        assert tab.names == ("a", "b")
        np.testing.assert_array_equal(tab.times, [0, 0.5, 1.5])
        np.testing.assert_array_equal(tab.values, [[1, 2], [np.nan, 3], [4, np.nan]])

    def test_tsv_and_column_selection(self, tmp_path):
        f = tmp_path / "s.tsv"
        f.write_text("a\tb\tc\n1\t2\t3\n4\t5\t6\n")
        tab = wio.read_table(f, columns="c,a")
        assert tab.names == ("c", "a")
        np.testing.assert_array_equal(tab.values, [[3, 1], [6, 4]])

    def test_chunks_cover_the_table(self, tmp_path):
        f = tmp_path / "s.csv"
        rows = "\n".join(f"{k},{k * k}" for k in range(25))
        f.write_text("a,b\n" + rows + "\n")
        chunks = list(wio.iter_table_chunks(f, chunk_rows=7))
        assert [c.values.shape[0] for c in chunks] == [7, 7, 7, 4]
        np.testing.assert_array_equal(np.concatenate([c.values for c in chunks])[:, 1],
                                      np.arange(25.0) ** 2)

    def test_parquet_roundtrip(self, tmp_path):
        pd = pytest.importorskip("pandas")
        pytest.importorskip("pyarrow")
        df = pd.DataFrame({"t": [0.0, 1.0, 2.0], "a": [1.0, 2.0, 3.0], "b": [0, 1, 0]})
        f = tmp_path / "s.parquet"
        df.to_parquet(f)
        tab = wio.read_table(f, time_column="t")
        np.testing.assert_array_equal(tab.values, [[1, 0], [2, 1], [3, 0]])

    def test_parquet_streams_in_record_batches(self, tmp_path):
        # several row groups, nulls (gaps), an integer column, a named index; read in
        # batches of 7 rows: the chunks cover the file once, in order, and the streamed
        # area matrix equals the in-memory one (which treats NaN rows as gaps)
        pd = pytest.importorskip("pandas")
        pq = pytest.importorskip("pyarrow.parquet")
        pa = pytest.importorskip("pyarrow")
        n = 60
        t = np.cumsum(np.linspace(0.5, 1.5, n))
        a = np.sin(t)
        a[17] = np.nan
        df = pd.DataFrame({"t": t, "a": a, "b": np.cos(t), "k": np.arange(n) % 5},
                          index=pd.Index(np.arange(n) * 3, name="id"))
        f = tmp_path / "s.parquet"
        pq.write_table(pa.Table.from_pandas(df), f, row_group_size=16)
        assert pq.ParquetFile(f).num_row_groups == 4
        assert wio.table_columns(f) == ["t", "a", "b", "k", "id"]
        chunks = list(wio.iter_table_chunks(f, columns=["a", "b", "k"], time_column="t",
                                            chunk_rows=7))
        assert max(c.values.shape[0] for c in chunks) <= 7
        got = np.concatenate([c.values for c in chunks])
        np.testing.assert_array_equal(got, np.c_[a, np.cos(t), np.arange(n) % 5])
        np.testing.assert_array_equal(np.concatenate([c.times for c in chunks]), t)
        A = wio.stream_area_matrix(f, columns=["a", "b"], time_column="t", chunk_rows=7)
        np.testing.assert_allclose(A.values, wp.area_matrix(np.c_[a, np.cos(t)]), rtol=1e-12)

    def test_parquet_bad_columns(self, tmp_path):
        pd = pytest.importorskip("pandas")
        pytest.importorskip("pyarrow")
        f = tmp_path / "s.parquet"
        pd.DataFrame({"a": [1.0, 2.0, 3.0], "s": ["x", "y", "z"],
                      "flag": [True, False, True]}).to_parquet(f)
        with pytest.raises(wio.TableError, match="column 's' holds text, not numbers"):
            wio.read_table(f)
        with pytest.raises(wio.TableError, match="column 'flag' is boolean"):
            wio.read_table(f, columns=["a", "flag"])
        with pytest.raises(wio.TableError, match="infinite"):
            pd.DataFrame({"a": [1.0, np.inf], "b": [0.0, 1.0]}).to_parquet(f)
            wio.read_table(f)

    def test_streamed_time_error_names_the_row(self):
        # rows are counted from 1 after the header; row 3 (line 4) goes back in time
        text = "t,a,b\n0,0,0\n1,1,0\n0.5,1,1\n3,0,1\n"
        for chunk_rows in (1, 2, 10):
            with pytest.raises(wio.TableError, match=r"line 4 \(data row 3\): times are not "
                                                     r"strictly increasing"):
                wio.stream_area_matrix(io.StringIO(text), time_column="t", chunk_rows=chunk_rows)

    @pytest.mark.parametrize("text, words", [
        ("", "empty"),
        ("a,b\n", "no data rows"),
        ("a,b\n1,2\n", "at least 2"),
        ("1,2\n3,4\n", "header row naming"),
        ("a,a\n1,2\n3,4\n", "repeated column names"),
        ("a,b\n1,2\n3,x\n", "line 3: column 'b' has a non-numeric value 'x'"),
        ("a,b\n1,2\n3\n", "1 fields, the header has 2"),
        ("a,b\n1,2\nc,d\n", "header changes"),
        ("a,b\n1,2\n3,-inf\n", "infinite"),
    ])
    def test_bad_tables(self, text, words):
        with pytest.raises(wio.TableError, match=words):
            wio.read_table(io.StringIO(text))

    def test_bad_files(self, tmp_path):
        with pytest.raises(wio.TableError, match="no such file"):
            wio.read_table(tmp_path / "missing.csv")
        with pytest.raises(wio.TableError, match="directory"):
            wio.read_table(tmp_path)
        f = tmp_path / "latin.csv"
        f.write_bytes(b"a,b\n1,2\n\xe9,3\n")
        with pytest.raises(wio.TableError, match="not UTF-8"):
            wio.read_table(f)
        g = tmp_path / "g.csv"
        g.write_text("a,b\n1,2\n3,4\n")
        with pytest.raises(wio.TableError, match="unknown column 'z'"):
            wio.read_table(g, columns=["z"])
        with pytest.raises(wio.TableError, match="unknown time column"):
            wio.read_table(g, time_column="t")


class TestFormula:
    @pytest.mark.parametrize("text, expected", [
        ("x**2 + 3*y", X**2 + 3 * Y),
        ("x^2*y", X**2 * Y),
        ("2.5*x", sp.Rational(5, 2) * X),
        ("-sin(x) + exp(y)/2", -sp.sin(X) + sp.exp(Y) / 2),
        ("pi*x", sp.pi * X),
        ("abs(x - y)", sp.Abs(X - Y)),
    ])
    def test_parses(self, text, expected):
        assert sp.simplify(parse_formula(text, VARS) - expected) == 0

    @pytest.mark.parametrize("text, words", [
        ("__import__('os').system('true')", "only plain function names"),
        ("__import__('os')", "unknown function"),
        ("x.__class__", "Attribute is not allowed"),
        ("open('f')", "unknown function"),
        ("z + 1", "unknown name 'z'"),
        ("[x, y]", "List"),
        ("lambda: 0", "Lambda"),
        ("'text'", "only numbers"),
        ("x +", "syntax error"),
        ("1/0", "not finite"),
        ("x**100000", "exponent"),
        # each exponent is small, the results are not: refused before the arithmetic
        ("(((9**64)**64)**64)**64", "more than 400 digits"),
        ("((2**64)**64)**64", "more than 400 digits"),
        ("(((x + 1)**64)**64)**64", "degree above 256"),
        ("(x**64*y**64)**3", "degree above 256"),
        ("sin(x, y)", "exactly one argument"),
        ("", "empty"),
        ("True", "only numbers"),
    ])
    def test_refuses(self, text, words):
        with pytest.raises(ValueError, match=words):
            parse_formula(text, VARS)


class TestOneParser:
    """Cases the two former parsers (standard library and pandas) had to agree on."""

    def test_values_round_trip(self, tmp_path):
        rng = np.random.default_rng(0)
        X = rng.normal(size=(3000, 3)) * 10.0 ** rng.integers(-200, 200, size=(3000, 3))
        X[::97, 1] = np.nan
        f = tmp_path / "r.csv"
        with open(f, "w") as fh:
            fh.write("# made-up numbers\nt,a,b,c\n")
            for k, row in enumerate(X):
                fh.write(f"{k * 0.5!r}," + ",".join("" if np.isnan(v) else repr(float(v)) for v in row) + "\n")
        tab = wio.read_table(f, time_column="t")
        np.testing.assert_array_equal(tab.values, X)
        np.testing.assert_array_equal(tab.times, np.arange(3000) * 0.5)

    @pytest.mark.parametrize("text, words", [
        ("a,b\n1,2\n3,x\n", "line 3: column 'b' has a non-numeric value 'x'"),
        ("a,b\n1,2\n3,4,5\n", "line 3: 3 fields, the header has 2"),
        ("a,b\n1,2\n3\n", "line 3: 1 fields, the header has 2"),
        ("a,b\r\n1,2\r\n\r\n3\r\n", "line 4: 1 fields, the header has 2"),
        ("a,b\n1,2\n3,4\n5", "line 4: 1 fields, the header has 2"),
        ("a,b\n1,2\na,b\n3,4\n", "line 3: the header row repeats"),
        ("a,b\n1,2\n3,inf\n", "line 3: column 'b' is infinite"),
        ("t,a,b\n0,1,2\n,3,4\n", "line 3: time column 't' is empty"),
    ])
    def test_errors_name_the_line(self, tmp_path, text, words):
        f = tmp_path / "bad.csv"
        f.write_text(text)
        with pytest.raises(wio.TableError, match=words):
            wio.read_table(f, time_column="t" if text.startswith("t,") else None)

    def test_stream_area_matrix_equals_in_memory(self, tmp_path):
        rng = np.random.default_rng(3)
        X = rng.normal(size=(5000, 4)).cumsum(axis=0) + 1e6
        X[1234] = np.nan  # a gap that falls inside a chunk
        X[2000] = np.nan  # and one on a chunk border
        f = tmp_path / "s.csv"
        with open(f, "w") as fh:
            fh.write("w,x,y,z\n")
            for row in X:
                fh.write(",".join("" if np.isnan(v) else repr(float(v)) for v in row) + "\n")
        A = wio.stream_area_matrix(f, chunk_rows=500)
        B = wp.area_matrix(X)
        np.testing.assert_allclose(A.values, B, rtol=1e-10, atol=1e-8)
        assert A.names == ("w", "x", "y", "z")

    def test_stream_refuses_decreasing_times_across_chunks(self, tmp_path):
        f = tmp_path / "t.csv"
        f.write_text("t,a,b\n0,1,2\n1,2,3\n2,3,4\n1.5,4,5\n")
        with pytest.raises(wio.TableError, match=r"line 5 \(data row 4\): times are not strictly "
                                                 r"increasing: 't' = 1.5 is before 2 on line 4"):
            wio.stream_area_matrix(f, time_column="t", chunk_rows=2)
