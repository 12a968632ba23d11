"""End-to-end tests of the command line on generated files."""

import json
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

import wedgepath as wp
from wedgepath.cli import main

ROOT = Path(__file__).resolve().parents[1]


def write_csv(path, header, rows):
    with open(path, "w") as fh:
        fh.write(",".join(header) + "\n")
        for r in rows:
            fh.write(",".join("" if (isinstance(v, float) and np.isnan(v)) else repr(float(v))
                              for v in r) + "\n")
    return path


@pytest.fixture
def three_signals(tmp_path):
    rng = np.random.default_rng(0)
    t = np.cumsum(rng.uniform(0.5, 1.5, 400)) * 0.01
    X = np.c_[np.sin(2 * np.pi * t), np.sin(2 * np.pi * t - 1.0), np.sin(2 * np.pi * t - 2.0)]
    X += 0.05 * rng.normal(size=X.shape)
    f = write_csv(tmp_path / "sig.csv", ["t", "a", "b", "c"], np.c_[t, X])
    return f, t, X


def run(argv, capsys):
    code = main([str(a) for a in argv])
    cap = capsys.readouterr()
    return code, cap.out, cap.err


class TestLeadlag:
    def test_json_matches_library(self, three_signals, tmp_path, capsys):
        f, t, X = three_signals
        out = tmp_path / "out"
        code, stdout, err = run(["leadlag", f, "--time", "t", "--out", out, "--quiet",
                                 "--no-figures"], capsys)
        assert code == 0, err
        rep = json.loads((out / "result.json").read_text())
        assert rep["schema"] == "wedgepath.leadlag/3"
        A = wp.area_matrix(X, times=t)
        np.testing.assert_allclose(rep["area_matrix"], A, rtol=1e-12, atol=1e-12)
        co = wp.cyclic_order(A)
        assert rep["cyclic_order"]["order"] == [["a", "b", "c"][k] for k in co.order]
        assert rep["cyclic_order"]["fit"] == pytest.approx(co.fit)
        csv = np.genfromtxt(out / "area_matrix.csv", delimiter=",", skip_header=1)[:, 1:]
        np.testing.assert_allclose(csv, A, rtol=1e-15)
        assert "a -> b -> c -> a" in stdout

    def test_rolling_and_significance(self, three_signals, tmp_path, capsys):
        f, t, X = three_signals
        code, stdout, err = run(["leadlag", f, "--time", "t", "--window", 100, "--step", 50,
                                 "--surrogates", 19, "--seed", 3, "--json", "--quiet"], capsys)
        assert code == 0, err
        rep = json.loads(stdout)
        R = wp.rolling_area_matrix(X, 100, 50, times=t)
        np.testing.assert_allclose(rep["rolling"]["areas"], np.asarray(R), rtol=1e-10, atol=1e-12)
        S = wp.surrogate_test(X, n_surrogates=19, seed=3, times=t)
        got = np.array(rep["significance"]["pvalues"], dtype=float)  # JSON null -> NaN
        np.testing.assert_allclose(np.nan_to_num(got, nan=-1.0), np.nan_to_num(S.pvalues, nan=-1.0))

    def test_stream_equals_in_memory(self, three_signals, capsys):
        f, t, X = three_signals
        code, stdout, err = run(["leadlag", f, "--time", "t", "--stream", "--chunk-rows", 37,
                                 "--json", "--quiet"], capsys)
        assert code == 0, err
        rep = json.loads(stdout)
        np.testing.assert_allclose(rep["area_matrix"], wp.area_matrix(X), rtol=1e-10, atol=1e-12)
        assert rep["streamed"] is True
        code, _, err = run(["leadlag", f, "--stream", "--surrogates", 9], capsys)
        assert code == 2 and "--stream computes the area matrix only" in err

    def test_columns_and_normalize(self, three_signals, capsys):
        f, t, X = three_signals
        code, stdout, _ = run(["leadlag", f, "--time", "t", "--columns", "c,a",
                               "--normalize", "zscore", "--json"], capsys)
        rep = json.loads(stdout)
        assert rep["channels"] == ["c", "a"]
        np.testing.assert_allclose(rep["area_matrix"],
                                   wp.area_matrix(X[:, [2, 0]], times=t, normalize="zscore"),
                                   rtol=1e-12)

    def test_figures_are_pngs(self, three_signals, tmp_path, capsys):
        pytest.importorskip("matplotlib")
        f, _, _ = three_signals
        out = tmp_path / "figs"
        code, _, err = run(["leadlag", f, "--time", "t", "--window", 100, "--out", out], capsys)
        assert code == 0, err
        for name in ("positions.png", "pairs.png", "rolling.png"):
            assert (out / name).read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"


class TestLoop:
    def test_loop_matches_library(self, tmp_path, capsys):
        # a figure-eight traced twice: two lobes of opposite sign
        s = np.linspace(0, 4 * np.pi, 801)
        xy = np.c_[np.sin(s), np.sin(s) * np.cos(s)]
        f = write_csv(tmp_path / "eight.csv", ["x", "y"], xy)
        code, stdout, err = run(["loop", f, "--x", "x", "--y", "y", "--weight", "x**2",
                                 "--json"], capsys)
        assert code == 0, err
        rep = json.loads(stdout)
        assert rep["signed_area"] == pytest.approx(wp.signed_area(xy), abs=1e-12)
        dec = wp.decompose(xy)
        assert rep["absolute_area"] == pytest.approx(dec.absolute_area, rel=1e-12)
        assert rep["mixed_signs"] is True and len(rep["lobes"]) == 2
        import sympy as sp
        x, y = sp.symbols("x y", real=True)
        ref = wp.region_integral(x**2, xy, symbols=(x, y))
        assert rep["weighted_integral"]["value"] == pytest.approx(float(ref), rel=1e-12)
        assert rep["weighted_integral"]["exact"] is True

    def test_energy_per_cycle(self, tmp_path, capsys):
        # stress = E e + eta de/dt: the energy per cycle is pi eta omega e0^2 for the
        # continuous loop (Kelvin-Voigt solid; common practice, no source).  Sampled at N
        # points per cycle the polygon holds (N / (2 pi)) sin(2 pi / N) of that (inscribed
        # polygon of an ellipse).
        N, cycles, e0, E, eta, omega = 100, 5, 0.01, 3.0, 0.2, 2.0
        t = np.arange(N * cycles + 1) * (2 * np.pi / omega) / N
        e = e0 * np.sin(omega * t)
        sig = E * e + eta * e0 * omega * np.cos(omega * t)
        f = write_csv(tmp_path / "load.csv", ["t", "strain", "stress"], np.c_[t, e, sig])
        code, stdout, err = run(["loop", f, "--time", "t", "--x", "strain", "--y", "stress",
                                 "--cycles-by", "stress", "--json"], capsys)
        assert code == 0, err
        rep = json.loads(stdout)
        expect = np.pi * eta * omega * e0**2 * (N / (2 * np.pi)) * np.sin(2 * np.pi / N)
        assert rep["cycles"]["count"] >= cycles - 1
        assert rep["cycles"]["mean"] == pytest.approx(expect, rel=1e-3)


class TestBadInput:
    @pytest.mark.parametrize("argv, words", [
        (["leadlag", "missing.csv"], "no such file"),
        (["leadlag", "{f}", "--columns", "a,zz"], "unknown column 'zz'"),
        (["leadlag", "{f}", "--time", "when"], "unknown time column"),
        (["leadlag", "{f}", "--step", "3"], "--step needs --window"),
        (["leadlag", "{f}", "--window", "0"], "positive whole number"),
        (["leadlag", "{f}", "--closure", "loop"], "invalid choice"),
        (["leadlag", "{f}", "--columns", "a"], "at least 2 channels"),
        (["loop", "{f}", "--x", "a", "--y", "a"], "same column"),
        (["loop", "{f}", "--x", "a", "--y", "b", "--weight", "__import__('os')"], "unknown function"),
        (["loop", "{f}", "--x", "a", "--y", "b", "--weight", "q*x"], "unknown name 'q'"),
        (["loop", "{f}", "--x", "a", "--y", "b", "--closure", "none"], "closure"),
        (["leadlag", "{bad}"], "non-numeric"),
        (["leadlag", "{empty}"], "empty"),
        (["leadlag", "{short}"], "at least 2"),
        (["frobnicate"], "invalid choice"),
    ])
    def test_one_line_exit_2(self, argv, words, tmp_path, capsys):
        f = write_csv(tmp_path / "ok.csv", ["a", "b", "c"], np.random.default_rng(1).normal(size=(20, 3)))
        (tmp_path / "bad.csv").write_text("a,b\n1,2\n3,oops\n")
        (tmp_path / "empty.csv").write_text("")
        (tmp_path / "short.csv").write_text("a,b\n1,2\n")
        argv = [a.format(f=f, bad=tmp_path / "bad.csv", empty=tmp_path / "empty.csv",
                         short=tmp_path / "short.csv") for a in argv]
        code, out, err = run(argv, capsys)
        assert code == 2
        assert len(err.strip().splitlines()) == 1, err
        assert err.startswith("wedgepath: error: "), err     # one prefix, usage errors too
        assert words in err
        assert "Traceback" not in err

    def test_help_and_version_exit_0(self, capsys):
        assert main(["--version"]) == 0
        assert "wedgepath" in capsys.readouterr().out
        assert main(["leadlag", "--help"]) == 0

    def test_no_overwrite_without_force(self, three_signals, tmp_path, capsys):
        f, _, _ = three_signals
        out = tmp_path / "o"
        out.mkdir()
        (out / "result.json").write_text("keep me")
        code, _, err = run(["leadlag", f, "--time", "t", "--out", out, "--no-figures"], capsys)
        assert code == 2 and "--force" in err
        assert (out / "result.json").read_text() == "keep me"
        assert sorted(p.name for p in out.iterdir()) == ["result.json"]
        code, _, _ = run(["leadlag", f, "--time", "t", "--out", out, "--no-figures", "--force"], capsys)
        assert code == 0 and (out / "result.json").read_text() != "keep me"


def test_python_dash_m_and_demo(tmp_path):
    out = tmp_path / "demo"
    out.mkdir()
    # a file of the user's that shares a name with a figure the demo can draw: --force
    # replaces only what this run writes (--no-figures: no loop.png), so it stays (issue 13)
    (out / "loop.png").write_bytes(b"the user's own picture")
    proc = subprocess.run([sys.executable, "-m", "wedgepath", "demo", "--out", str(out),
                           "--quiet", "--no-figures", "--force"], capture_output=True, text=True,
                          timeout=600)
    assert proc.returncode == 0, proc.stdout + proc.stderr
    assert (out / "loop.png").read_bytes() == b"the user's own picture"
    assert "cyclic order recovered" in proc.stdout
    assert "all checks passed" in proc.stdout
    rep = json.loads((out / "loop.json").read_text())
    assert rep["schema"] == "wedgepath.loop/3"


def test_bundled_demo_data_regenerates_identically(tmp_path):
    proc = subprocess.run([sys.executable, str(ROOT / "examples" / "generate_demo_data.py"),
                           "--out", str(tmp_path)], capture_output=True, text=True, timeout=300)
    assert proc.returncode == 0, proc.stderr
    for name in ("gantry_loop.csv", "ring_sensors.csv", "load_test.csv"):
        assert (tmp_path / name).read_bytes() == (ROOT / "src" / "wedgepath" / "data" / name).read_bytes()


class TestOutputFolder:
    def test_force_replaces_only_what_the_new_run_writes(self, three_signals, tmp_path,
                                                         capsys):
        f, _, _ = three_signals
        out = tmp_path / "o"
        code, _, err = run(["leadlag", f, "--time", "t", "--window", 100, "--surrogates", 9,
                            "--out", out, "--no-figures", "--quiet"], capsys)
        assert code == 0, err
        assert {"rolling.csv", "pvalues.csv", "qvalues.csv"} <= {p.name for p in out.iterdir()}
        (out / "notes.txt").write_text("the user's own file")
        code, _, err = run(["leadlag", f, "--time", "t", "--out", out, "--no-figures",
                            "--force"], capsys)
        assert code == 0, err
        # nothing is removed: the earlier run's tables stay, and the manifest says which
        # files belong to this run (issue 13: --force once deleted files it did not write)
        assert sorted(p.name for p in out.iterdir()) == [
            "area_matrix.csv", "manifest.json", "notes.txt", "pairs.csv", "pvalues.csv",
            "qvalues.csv", "result.json", "rolling.csv"]
        listed = [e["name"] for e in json.loads((out / "manifest.json").read_text())["files"]]
        assert listed == ["result.json", "area_matrix.csv", "pairs.csv"]

    def test_files_get_the_mode_of_an_ordinary_new_file(self, three_signals, tmp_path, capsys):
        import os
        f, _, _ = three_signals
        out = tmp_path / "o"
        old = os.umask(0o022)
        try:
            code, _, err = run(["leadlag", f, "--time", "t", "--out", out, "--no-figures"],
                               capsys)
        finally:
            os.umask(old)
        assert code == 0, err
        assert {oct(p.stat().st_mode & 0o777) for p in out.iterdir()} == {oct(0o644)}

    def test_pvalues_and_qvalues_tables(self, three_signals, tmp_path, capsys):
        f, t, X = three_signals
        out = tmp_path / "o"
        code, _, err = run(["leadlag", f, "--time", "t", "--surrogates", 19, "--seed", 3,
                            "--out", out, "--no-figures", "--quiet"], capsys)
        assert code == 0, err
        S = wp.surrogate_test(X, n_surrogates=19, seed=3, times=t)
        p = np.genfromtxt(out / "pvalues.csv", delimiter=",", skip_header=1)[:, 1:]
        q = np.genfromtxt(out / "qvalues.csv", delimiter=",", skip_header=1)[:, 1:]
        np.testing.assert_array_equal(np.isnan(p), np.isnan(S.pvalues))
        np.testing.assert_allclose(p[~np.isnan(p)], S.pvalues[~np.isnan(S.pvalues)])
        np.testing.assert_allclose(q[~np.isnan(q)], S.qvalues[~np.isnan(S.qvalues)])


class TestMessages:
    def test_library_warnings_are_one_line_notes(self, tmp_path, capsys):
        # 1/x is unbounded on the line x = 0 through the octagon: the adaptive rule cannot
        # meet its tolerance and says so in the report's notes, not as a Python warning
        # (an octagon reaches the same note in a tenth of a second; a 40-gon took seconds)
        s = np.linspace(0, 2 * np.pi, 9)[:-1]
        f = write_csv(tmp_path / "c.csv", ["x", "y"], np.c_[np.cos(s), np.sin(s)])
        code, stdout, err = run(["loop", f, "--x", "x", "--y", "y", "--weight", "x**-1",
                                 "--quiet"], capsys)
        assert code == 0, err
        assert "note: region integral tolerance" in stdout and "not reached" in stdout
        assert "Warning" not in err and ".py:" not in err

    def test_stage_progress_for_long_loops_and_quiet(self, tmp_path, capsys):
        s = np.linspace(0, 2 * np.pi, 20_001)[:-1]
        f = write_csv(tmp_path / "c.csv", ["x", "y"], np.c_[np.cos(s), np.sin(s)])
        code, _, err = run(["loop", f, "--x", "x", "--y", "y"], capsys)
        assert code == 0
        stages = [part.split(" (")[0] for part in err.split("\r") if part.strip()]
        assert stages[:2] == ["loop: areas and faces", "loop: moments and cycles"]
        assert err.rstrip().split("\r")[-1].startswith("loop: done in")
        code, _, err = run(["loop", f, "--x", "x", "--y", "y", "--quiet"], capsys)
        assert code == 0 and err == ""

    def test_units_label_the_json_and_are_checked(self, three_signals, tmp_path, capsys):
        f, _, _ = three_signals
        code, stdout, err = run(["leadlag", f, "--time", "t", "--units", "t=s,a=mV", "--json",
                                 "--quiet"], capsys)
        assert code == 0, err
        assert json.loads(stdout)["units"] == {"t": "s", "a": "mV"}
        code, _, err = run(["leadlag", f, "--time", "t", "--units", "zz=s"], capsys)
        assert code == 2 and "--units names column 'zz'" in err
        code, _, err = run(["leadlag", f, "--units", "a"], capsys)
        assert code == 2 and "expected COL=UNIT" in err and len(err.strip().splitlines()) == 1


# =========================================================================== issue 13, 12 and 16
def _table(path, text):
    path.write_text(text)
    return path


class TestMessagesSpeakTheCommandLine:
    """Every message names flags the command line has, and valid answers are answers."""

    def test_zero_matrix_is_a_result_with_a_note(self, tmp_path, capsys):
        t = np.arange(60.0)
        f = write_csv(tmp_path / "p.csv", ["t", "a", "b"], np.c_[t, np.ones(60), 2 * np.ones(60)])
        out = tmp_path / "o"
        code, stdout, err = run(["leadlag", f, "--out", out, "--quiet"], capsys)
        assert code == 0, err
        rep = json.loads((out / "result.json").read_text())
        assert rep["cyclic_order"] is None and rep["leaders"] == []
        assert any("the area matrix is zero" in n for n in rep["notes"])
        assert "no channel leads another" in stdout
        expect = {"result.json", "area_matrix.csv", "pairs.csv", "manifest.json"}
        try:
            import matplotlib  # noqa: F401
            expect |= {"positions.png", "pairs.png"}
        except ImportError:
            pass
        assert {p.name for p in out.iterdir()} == expect
        code, stdout, err = run(["leadlag", f, "--stream", "--json", "--quiet"], capsys)
        assert code == 0 and json.loads(stdout)["cyclic_order"] is None

    def test_closure_none_names_the_flag(self, tmp_path, capsys):
        s = np.linspace(0, 5, 50)
        f = write_csv(tmp_path / "o.csv", ["x", "y"], np.c_[s, np.sin(s)])
        code, _, err = run(["loop", f, "--x", "x", "--y", "y", "--closure", "none"], capsys)
        assert code == 2 and "--closure chord" in err and "closure='" not in err

    def test_closure_require_names_tol_and_tol_works(self, tmp_path, capsys):
        s = np.linspace(0, 2 * np.pi, 81)
        xy = np.c_[np.cos(s), np.sin(s)]
        xy[-1] += 1e-3                                  # ends 1e-3 from its start
        f = write_csv(tmp_path / "c.csv", ["x", "y"], xy)
        for cmd in (["loop", f, "--x", "x", "--y", "y"], ["leadlag", f]):
            code, _, err = run(cmd + ["--closure", "require"], capsys)
            assert code == 2 and "--tol" in err and "closure='" not in err
            assert "pass a larger tol" not in err
            code, _, err = run(cmd + ["--closure", "require", "--tol", "0.01", "--json"], capsys)
            assert code == 0, err
        code, _, err = run(["leadlag", f, "--tol", "0.01"], capsys)
        assert code == 2 and "--tol applies to --closure require only" in err

    @pytest.mark.parametrize("text, words", [
        ("a,b\nnan,1\n,2\nNA,3\n", "column 'a' has no values"),
        ("a,b\n1,\n,2\n3,\n,4\n", "no row has a value in every column used ('a', 'b')"),
    ])
    def test_all_gap_table_names_file_and_columns(self, text, words, tmp_path, capsys):
        f = _table(tmp_path / "g.csv", text)
        for cmd in (["leadlag", f], ["loop", f, "--x", "a", "--y", "b"]):
            code, _, err = run(cmd, capsys)
            assert code == 2 and words in err and "g.csv" in err
            assert "X has" not in err and "points has" not in err

    def test_decreasing_times_name_the_flag_and_rows(self, tmp_path, capsys):
        f = _table(tmp_path / "t.csv", "t,a,b\n0,1,0\n1,0,1\n0.5,-1,0\n3,0,-1\n")
        code, _, err = run(["leadlag", f, "--time", "t"], capsys)
        # the reader names the time column, the line and the data row, in the table's words
        assert code == 2 and "'t'" in err and "data row 3" in err and "times[" not in err

    def test_constant_reference_gives_no_cycles_and_a_note(self, tmp_path, capsys):
        s = np.linspace(0, 6 * np.pi, 90)
        f = write_csv(tmp_path / "k.csv", ["x", "y", "z"],
                      np.c_[np.cos(s), np.sin(s), np.ones(90)])
        code, stdout, err = run(["loop", f, "--x", "x", "--y", "y", "--cycles-by", "z", "--json",
                                 "--quiet"], capsys)
        assert code == 0, err
        rep = json.loads(stdout)
        assert rep["cycles"]["count"] == 0 and rep["cycles"]["mean"] is None
        assert any("'z' is constant" in n and "--cycles-by" in n for n in rep["notes"])

    def test_tangled_loop_is_refused_with_the_flag(self, tmp_path, capsys):
        n = 2001
        k = np.arange(n)
        ang = 2 * np.pi * (k * 1000 % n) / n
        f = write_csv(tmp_path / "star.csv", ["x", "y"], np.c_[np.cos(ang), np.sin(ang)])
        code, _, err = run(["loop", f, "--x", "x", "--y", "y", "--quiet"], capsys)
        assert code == 2 and len(err.strip().splitlines()) == 1
        assert "crosses itself more than 500,000 times" in err and "--max-crossings" in err
        assert "max_crossings=" not in err and "extreme coordinates" not in err
        code, _, err = run(["loop", f, "--x", "x", "--y", "y", "--max-crossings", "50",
                            "--quiet"], capsys)
        assert code == 2 and "more than 50 times" in err

    def test_max_crossings_reaches_the_figures(self, tmp_path, capsys):
        pytest.importorskip("matplotlib")
        pts = np.random.default_rng(0).uniform(0, 1, (120, 2))   # about 1,400 crossings
        f = write_csv(tmp_path / "n.csv", ["x", "y"], pts)
        code, _, err = run(["loop", f, "--x", "x", "--y", "y", "--max-crossings", "1000",
                            "--quiet"], capsys)
        assert code == 2
        code, _, err = run(["loop", f, "--x", "x", "--y", "y", "--max-crossings", "5000",
                            "--out", tmp_path / "o", "--quiet"], capsys)
        assert code == 0, err and (tmp_path / "o" / "loop.png").exists()

    def test_no_library_wording_leaks(self, tmp_path, capsys):
        # a sweep of bad inputs: no message names an argument of the Python API
        s = np.linspace(0, 5, 50)
        opened = write_csv(tmp_path / "o.csv", ["x", "y"], np.c_[s, np.sin(s)])
        good = write_csv(tmp_path / "g.csv", ["t", "x", "y"],
                         np.c_[np.arange(40.0), np.cos(np.arange(40) / 3), np.sin(np.arange(40) / 3)])
        gaps = _table(tmp_path / "gap.csv", "a,b\n1,\n,2\n")
        cases = [
            ["loop", opened, "--x", "x", "--y", "y", "--closure", "none"],
            ["loop", opened, "--x", "x", "--y", "y", "--closure", "require"],
            ["leadlag", opened, "--closure", "require"],
            ["leadlag", gaps], ["loop", gaps, "--x", "a", "--y", "b"],
            ["leadlag", good, "--time", "x"],
            ["leadlag", good, "--window", "1"],
            ["leadlag", good, "--window", "500"],
            ["loop", good, "--x", "x", "--y", "y", "--weight", "1e999"],
            ["loop", good, "--x", "x", "--y", "y", "--weight", "exp(10**60)"],
            ["loop", good, "--x", "x", "--y", "y", "--weight", "x**(1/0)"],
            ["loop", good, "--x", "x", "--y", "y", "--weight", "log(x)"],
            ["loop", good, "--x", "x", "--y", "y", "--level", "5"],
        ]
        api = ["closure='", "max_crossings", "n_surrogates", "tol=", "times[", "symbols=",
               "degree=", "path.plane", "X has", "X contains", "points has", "invalid input",
               "form coefficient"]
        for argv in cases:
            code, _, err = run(argv + ["--quiet"], capsys)
            assert code in (0, 2), (argv, err)
            for word in api:
                assert word not in err, (argv, err)


class TestReportText:
    """The command line prints and writes the report (issue 15, items 2 and 5)."""

    @pytest.mark.parametrize("command, files", [
        ("leadlag", ["result.json", "area_matrix.csv", "pairs.csv", "rolling.csv",
                     "pvalues.csv", "qvalues.csv", "positions.png", "pairs.png", "rolling.png",
                     "manifest.json"]),
        ("loop", ["result.json", "cycles.csv", "loop.png", "cycles.png", "manifest.json"]),
        ("demo", None),
    ])
    def test_help_names_the_files_really_written(self, command, files, capsys):
        from wedgepath import demo
        assert main([command, "--help"]) == 0
        text = " ".join(capsys.readouterr().out.split())
        files = files or demo.planned_files(True) + ["manifest.json"]
        for name in files:
            assert name in text, name
        if command == "demo":
            assert "result.json" not in text and "leadlag.json" in text

    def test_help_files_match_what_a_run_writes(self, three_signals, tmp_path, capsys):
        pytest.importorskip("matplotlib")
        f, _, _ = three_signals
        out = tmp_path / "o"
        code, _, err = run(["leadlag", f, "--time", "t", "--window", 100, "--surrogates", 9,
                            "--out", out, "--quiet"], capsys)
        assert code == 0, err
        main(["leadlag", "--help"])
        text = capsys.readouterr().out
        for p in out.iterdir():
            assert p.name in text, p.name

    def test_hilbert_matrix_columns_are_separated(self, tmp_path, capsys):
        s = np.linspace(0, 20 * np.pi, 2000)
        X = np.c_[np.sin(s), np.sin(s - 0.5), 1e-4 * np.sin(s - 1.0) + 0.3 * np.cos(3 * s)]
        f = write_csv(tmp_path / "h.csv", ["a", "b", "c"], X)
        code, out, err = run(["leadlag", f, "--normalize", "hilbert", "--quiet"], capsys)
        assert code == 0, err
        lines = out.splitlines()
        k = [i for i, line in enumerate(lines) if "lead strength (hilbert)" in line][0]
        rows = lines[k + 2:k + 5]
        assert [r.split()[0] for r in rows] == ["a", "b", "c"]
        for r in rows:
            assert len(r.split()) == 4 and all(float(v) == float(v) for v in r.split()[1:])

    def test_bootstrap_intervals_of_positions(self, three_signals, capsys):
        f, _, _ = three_signals
        code, out, err = run(["leadlag", f, "--time", "t", "--bootstrap", 49, "--json",
                              "--quiet"], capsys)
        assert code == 0, err
        co = json.loads(out)["cyclic_order"]
        assert co["confidence"] == 0.95 and set(co["positions_low_rad"]) == {"a", "b", "c"}
        code, out, err = run(["leadlag", f, "--bootstrap", 49, "--stream"], capsys)
        assert code == 2 and "drop --bootstrap" in err
        code, out, err = run(["leadlag", f, "--bootstrap", 49, "--confidence", "1.5"], capsys)
        assert code == 2 and "between 0 and 1" in err

    def test_notes_and_messages_name_flags(self, tmp_path, capsys):
        t = np.linspace(0, 8 * np.pi, 400)
        f = write_csv(tmp_path / "c.csv", ["x", "y", "z"], np.c_[np.cos(t), np.sin(t),
                                                                   np.ones(400)])
        code, out, err = run(["loop", f, "--x", "x", "--y", "y", "--cycles-by", "z", "--json",
                              "--quiet"], capsys)
        assert code == 0, err
        notes = json.loads(out)["notes"]
        assert any("--cycles-by" in n for n in notes) and not any("cycles_by" in n for n in notes)
        code, out, err = run(["loop", f, "--x", "x", "--y", "y", "--cycles-by", "z",
                              "--quiet"], capsys)
        assert "--cycles-by" in out and "cycles_by" not in out
