"""The command line's output files: quoting, the files --force may replace, the check before
computing, symbolic links, the commit with a manifest (issue 13, items 2-6 and 15)."""

from __future__ import annotations

import csv
import hashlib
import io
import json
import os
import signal
import subprocess
import sys
import textwrap
from pathlib import Path

import numpy as np
import pytest

from wedgepath import cli
from wedgepath.cli import main

HOSTILE = ["p,q", '=HYPERLINK("http://example.invalid","click")', "+1", "-a", "@x", "a\"b",
           "plain", "'q", "\rr", "cost_$_total"]


def write_table(path, names, X):
    with open(path, "w", newline="") as fh:
        w = csv.writer(fh)
        w.writerow(names)
        for r in X:
            w.writerow([repr(float(v)) for v in r])
    return path


def signals_table(tmp_path, names=("a", "b", "c"), T=200, name="in.csv"):
    s = np.linspace(0, 8 * np.pi, T)
    X = np.column_stack([np.sin(s - k) for k in range(len(names))])
    return write_table(tmp_path / name, list(names), X), X


def run(argv):
    out, err = io.StringIO(), io.StringIO()
    import contextlib
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = main([str(a) for a in argv])
    return code, out.getvalue(), err.getvalue()


def snapshot(folder):
    """{relative path: (kind, content or link target)} of everything under folder."""
    out = {}
    for root, dirs, files in os.walk(folder):
        for name in dirs + files:
            p = os.path.join(root, name)
            rel = os.path.relpath(p, folder)
            if os.path.islink(p):
                out[rel] = ("link", os.readlink(p))
            elif os.path.isdir(p):
                out[rel] = ("dir", None)
            else:
                out[rel] = ("file", Path(p).read_bytes())
    return out


def unquote(cell):
    """Undo the spreadsheet-safe prefix (docs/cli.md): a text cell starting with ' loses it."""
    return cell[1:] if cell.startswith("'") else cell


# =========================================================================== item 2
class TestCSVQuoting:
    def test_hostile_channel_names_keep_their_columns(self, tmp_path):
        names = [n for n in HOSTILE if n != "\rr"]
        f, X = signals_table(tmp_path, names)
        out = tmp_path / "o"
        code, _, err = run(["leadlag", f, "--out", out, "--no-figures", "--quiet",
                            "--window", "50"])
        assert code == 0, err
        rep = json.loads((out / "result.json").read_text())
        assert rep["channels"] == names
        with open(out / "area_matrix.csv", newline="") as fh:
            rows = list(csv.reader(fh))
        assert [len(r) for r in rows] == [len(names) + 1] * (len(names) + 1)
        assert [unquote(c) for c in rows[0][1:]] == names
        assert [unquote(r[0]) for r in rows[1:]] == names
        got = np.array([[float(v) for v in r[1:]] for r in rows[1:]])
        np.testing.assert_array_equal(got, np.array(rep["area_matrix"]))
        # pandas reads the same table (the reading most users do)
        import pandas as pd
        df = pd.read_csv(out / "area_matrix.csv", index_col=0)
        assert df.shape == (len(names), len(names))
        np.testing.assert_array_equal(df.to_numpy(), np.array(rep["area_matrix"]))
        assert [unquote(c) for c in df.columns] == names
        # rolling.csv: the pair headers keep their columns as well
        with open(out / "rolling.csv", newline="") as fh:
            rrows = list(csv.reader(fh))
        n = len(names)
        assert {len(r) for r in rrows} == {2 + n * (n - 1) // 2}
        assert unquote(rrows[0][2]) == f"{names[0]}|{names[1]}"

    def test_formula_cells_are_neutralised_and_numbers_are_not(self, tmp_path):
        names = ['=HYPERLINK("http://example.invalid","click")', "+1", "-a", "@x", "plain"]
        f, _ = signals_table(tmp_path, names)
        out = tmp_path / "o"
        code, _, err = run(["leadlag", f, "--out", out, "--no-figures", "--quiet"])
        assert code == 0, err
        with open(out / "area_matrix.csv", newline="") as fh:
            rows = list(csv.reader(fh))
        header = rows[0]
        # OWASP, "CSV Injection": cells starting with = + - @ (tab, CR) are prefixed with '
        for cell in header[1:] + [r[0] for r in rows[1:]]:
            assert cell[0] not in "=+-@\t\r", cell
        assert header[1] == "'" + names[0] and header[5] == "plain"
        # negative numbers stay plain numbers
        values = [v for r in rows[1:] for v in r[1:]]
        assert any(v.startswith("-") for v in values)
        assert all(float(v) == float(v) for v in values)

    def test_csv_writer_round_trip(self):
        from wedgepath import _outputs
        text = _outputs.csv_text([["channel", "a,b", "=1+1", "'x"], ["=cmd", 1.5, -2.0, np.nan]])
        rows = list(csv.reader(io.StringIO(text)))
        assert rows == [["channel", "a,b", "'=1+1", "''x"], ["'=cmd", "1.5", "-2.0", "nan"]]
        assert [unquote(c) for c in rows[0]] == ["channel", "a,b", "=1+1", "'x"]


# =========================================================================== item 3
class TestForceReplacesOnlyThisRunsFiles:
    def test_input_named_like_an_output_is_kept(self, tmp_path, monkeypatch):
        f, _ = signals_table(tmp_path, name="pvalues.csv")
        before = f.read_bytes()
        monkeypatch.chdir(tmp_path)
        code, _, err = run(["leadlag", "pvalues.csv", "--out", ".", "--force", "--no-figures",
                            "--quiet"])
        assert code == 0, err
        assert f.read_bytes() == before
        assert (tmp_path / "area_matrix.csv").exists()

    def test_output_that_would_overwrite_the_input_is_refused(self, tmp_path, monkeypatch):
        f, _ = signals_table(tmp_path, name="pvalues.csv")
        before = snapshot(tmp_path)
        monkeypatch.chdir(tmp_path)
        code, _, err = run(["leadlag", "pvalues.csv", "--out", ".", "--force", "--no-figures",
                            "--quiet", "--surrogates", "5"])
        assert code == 2
        assert len(err.strip().splitlines()) == 1 and "input" in err and "pvalues.csv" in err
        assert snapshot(tmp_path) == before

    def test_hard_link_to_the_input_is_refused_too(self, tmp_path):
        f, _ = signals_table(tmp_path)
        out = tmp_path / "o"
        out.mkdir()
        os.link(f, out / "area_matrix.csv")
        code, _, err = run(["leadlag", f, "--out", out, "--force", "--no-figures", "--quiet"])
        assert code == 2 and "input" in err
        assert (out / "area_matrix.csv").read_bytes() == f.read_bytes()

    def test_force_never_removes_files_of_other_runs_or_the_user(self, tmp_path):
        f, _ = signals_table(tmp_path)
        out = tmp_path / "o"
        code, _, err = run(["leadlag", f, "--out", out, "--window", "50", "--no-figures",
                            "--quiet"])
        assert code == 0, err
        (out / "loop.png").write_bytes(b"the user's own picture")
        code, _, err = run(["leadlag", f, "--out", out, "--force", "--no-figures", "--quiet"])
        assert code == 0, err
        names = {p.name for p in out.iterdir()}
        # rolling.csv of the earlier run stays (not listed in the new manifest); loop.png too
        assert {"rolling.csv", "loop.png", "area_matrix.csv", "pairs.csv", "result.json",
                "manifest.json"} == names
        assert (out / "loop.png").read_bytes() == b"the user's own picture"
        listed = {e["name"] for e in json.loads((out / "manifest.json").read_text())["files"]}
        assert listed == {"area_matrix.csv", "pairs.csv", "result.json"}

    def test_demo_plan_leaves_unplanned_files_alone(self):
        from wedgepath import demo
        assert "loop.png" not in demo.planned_files(figures=False)
        assert "loop.png" in demo.planned_files(figures=True)


# =========================================================================== item 4
class TestCheckBeforeComputing:
    @pytest.mark.parametrize("argv, taken", [
        (["leadlag", "{f}", "--window", "50"], "rolling.png"),
        (["leadlag", "{f}", "--surrogates", "5"], "qvalues.csv"),
        (["leadlag", "{f}"], "manifest.json"),
        (["loop", "{f}", "--x", "a", "--y", "b"], "cycles.png"),
        (["leadlag", "{f}", "--stream"], "positions.png"),
    ])
    def test_taken_name_fails_before_any_work(self, argv, taken, tmp_path, monkeypatch):
        pytest.importorskip("matplotlib")
        f, _ = signals_table(tmp_path)
        out = tmp_path / "o"
        out.mkdir()
        (out / taken).write_text("not ours")

        def no_work(*a, **k):
            raise AssertionError("computed before checking the output folder")
        monkeypatch.setattr("wedgepath.io.read_table", no_work)
        monkeypatch.setattr("wedgepath.io.stream_area_matrix", no_work)
        monkeypatch.setattr(cli, "read_table", no_work)
        code, _, err = run([a.format(f=f) for a in argv] + ["--out", out, "--quiet"])
        assert code == 2, err
        assert taken in err and "--force" in err and len(err.strip().splitlines()) == 1
        assert (out / taken).read_text() == "not ours"

    def test_planned_set_is_exactly_what_is_written(self, tmp_path):
        pytest.importorskip("matplotlib")
        # a loop without a single complete cycle still writes every planned file
        f = write_table(tmp_path / "in.csv", ["a", "b"], [[0, 0], [1, 0], [1, 1]])
        out = tmp_path / "o"
        code, _, err = run(["loop", f, "--x", "a", "--y", "b", "--out", out, "--quiet"])
        assert code == 0, err
        assert {p.name for p in out.iterdir()} == {"result.json", "cycles.csv", "loop.png",
                                                   "cycles.png", "manifest.json"}


# =========================================================================== item 5
class TestSymlinks:
    def test_dangling_link_is_not_replaced_without_force(self, tmp_path):
        f, _ = signals_table(tmp_path)
        out = tmp_path / "o"
        out.mkdir()
        os.symlink(tmp_path / "elsewhere" / "target.json", out / "result.json")
        code, _, err = run(["leadlag", f, "--out", out, "--no-figures", "--quiet"])
        assert code == 2 and "result.json" in err and "--force" in err
        assert os.path.islink(out / "result.json")
        assert not (tmp_path / "elsewhere").exists()

    def test_force_replaces_the_link_never_its_target(self, tmp_path):
        f, _ = signals_table(tmp_path)
        out = tmp_path / "o"
        out.mkdir()
        outside = tmp_path / "outside.json"
        outside.write_text("precious")
        os.symlink(outside, out / "result.json")
        os.symlink(tmp_path / "nowhere.csv", out / "area_matrix.csv")
        code, _, err = run(["leadlag", f, "--out", out, "--force", "--no-figures", "--quiet"])
        assert code == 0, err
        assert outside.read_text() == "precious"
        assert not (tmp_path / "nowhere.csv").exists()
        assert not os.path.islink(out / "result.json")
        assert json.loads((out / "result.json").read_text())["channels"] == ["a", "b", "c"]

    def test_out_folder_that_is_a_dangling_link_is_refused(self, tmp_path):
        f, _ = signals_table(tmp_path)
        os.symlink(tmp_path / "missing", tmp_path / "o")
        code, _, err = run(["leadlag", f, "--out", tmp_path / "o", "--no-figures", "--quiet"])
        assert code == 2 and "link" in err
        assert not (tmp_path / "missing").exists()


# =========================================================================== item 6
def _manifest_ok(folder):
    man = json.loads((Path(folder) / "manifest.json").read_text())
    for e in man["files"]:
        data = (Path(folder) / e["name"]).read_bytes()
        if len(data) != e["bytes"] or hashlib.sha256(data).hexdigest() != e["sha256"]:
            return False
    return True


class TestCommit:
    def test_manifest_lists_every_file_with_size_and_hash(self, tmp_path):
        f, _ = signals_table(tmp_path)
        out = tmp_path / "o"
        code, _, err = run(["leadlag", f, "--out", out, "--no-figures", "--quiet"])
        assert code == 0, err
        man = json.loads((out / "manifest.json").read_text())
        assert man["schema"] == "wedgepath.manifest/1" and man["command"] == "leadlag"
        assert {e["name"] for e in man["files"]} == {"result.json", "area_matrix.csv",
                                                     "pairs.csv"}
        assert _manifest_ok(out)

    def test_failed_write_leaves_no_temporaries(self, tmp_path, monkeypatch):
        f, _ = signals_table(tmp_path)
        out = tmp_path / "o"
        from wedgepath import _outputs
        real = _outputs.os.replace
        calls = []

        def flaky(a, b):
            calls.append(b)
            if len(calls) == 2:
                raise OSError(28, "No space left on device")
            return real(a, b)
        monkeypatch.setattr(_outputs.os, "replace", flaky)
        code, _, err = run(["leadlag", f, "--out", out, "--no-figures", "--quiet"])
        assert code == 2 and "No space left" in err, err
        left = os.listdir(out) if out.exists() else []
        assert not [n for n in left if n.startswith(".wedgepath")]
        assert "manifest.json" not in left          # the reader can tell the set is incomplete

    def test_signal_handlers_are_restored(self, tmp_path):
        f, _ = signals_table(tmp_path)
        before = (signal.getsignal(signal.SIGINT), signal.getsignal(signal.SIGTERM))
        code, _, err = run(["leadlag", f, "--out", tmp_path / "o", "--no-figures", "--quiet"])
        assert code == 0, err
        assert (signal.getsignal(signal.SIGINT), signal.getsignal(signal.SIGTERM)) == before

    @pytest.mark.parametrize("sig", ["SIGTERM", "SIGINT"])
    def test_killed_mid_commit(self, tmp_path, sig):
        f, _ = signals_table(tmp_path)
        out = tmp_path / "o"
        code, _, err = run(["leadlag", f, "--out", out, "--window", "50", "--no-figures",
                            "--quiet"])
        assert code == 0, err
        old = snapshot(out)
        # a second run, different options, killed by a signal after its second file moved in
        script = textwrap.dedent(f"""
            import os, signal, sys
            from wedgepath import _outputs, cli
            real = os.replace
            n = [0]
            def replace(a, b):
                real(a, b)
                n[0] += 1
                if n[0] == 2:
                    os.kill(os.getpid(), signal.{sig})
            _outputs.os.replace = replace
            sys.exit(cli.main(["leadlag", {str(f)!r}, "--out", {str(out)!r}, "--force",
                               "--no-figures", "--quiet", "--normalize", "zscore"]))
        """)
        proc = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True,
                              timeout=120)
        assert proc.returncode == 128 + getattr(signal, sig), (proc.returncode, proc.stderr)
        lines = proc.stderr.strip().splitlines()
        assert len(lines) == 1 and "interrupted" in lines[0] and "Traceback" not in proc.stderr
        left = snapshot(out)
        assert not [n for n in left if n.startswith(".wedgepath")], left
        # the old manifest is gone before the first file is replaced: no manifest, so a
        # reader knows the folder does not hold one complete run
        assert "manifest.json" not in left
        assert set(left) == set(old) - {"manifest.json"}
        # rerunning completes the set
        code, _, err = run(["leadlag", f, "--out", out, "--force", "--no-figures", "--quiet"])
        assert code == 0 and _manifest_ok(out)


# =========================================================================== item 15
class TestFigureLabels:
    def test_dollar_signs_in_names_and_units(self, tmp_path):
        pytest.importorskip("matplotlib")
        s = np.linspace(0, 12 * np.pi, 300)
        f = write_table(tmp_path / "d.csv", ["cost_$_total", "price_$", "a_b"],
                        np.c_[np.cos(s), np.sin(s), np.sin(s - 1)])
        out = tmp_path / "o"
        code, _, err = run(["loop", f, "--x", "cost_$_total", "--y", "price_$", "--units",
                            "cost_$_total=$,price_$=$/kg", "--out", out, "--quiet"])
        assert code == 0, err
        assert (out / "loop.png").read_bytes()[:4] == b"\x89PNG"
        out2 = tmp_path / "o2"
        code, _, err = run(["leadlag", f, "--window", "100", "--out", out2, "--quiet"])
        assert code == 0, err
        for name in ("rolling.png", "positions.png", "pairs.png"):
            assert (out2 / name).read_bytes()[:4] == b"\x89PNG"

    def test_labels_are_drawn_literally(self):
        pytest.importorskip("matplotlib")
        from wedgepath import plotting
        ax = plotting.loop_path(np.array([[0, 0], [1, 0], [1, 1.0]]),
                                names=["cost_$_total [$]", "$x$"])
        assert ax.get_xlabel().replace("\\$", "$") == "cost_$_total [$]"
        # the drawn text is not math text: matplotlib shows an escaped \$ as a plain $
        from matplotlib import cbook
        assert not cbook.is_math_text(ax.get_xlabel())
        assert not cbook.is_math_text(ax.get_ylabel())


# =========================================================================== terminal
def test_summary_escapes_control_characters(tmp_path):
    names = ["\x1b[31mred", "b\u202ec", "plain"]
    f, _ = signals_table(tmp_path, names)
    code, out, err = run(["leadlag", f, "--quiet"])
    assert code == 0, err
    assert "\x1b" not in out and "\u202e" not in out
    assert "\\x1b[31mred" in out and "b\\u202ec" in out
    code, out, err = run(["leadlag", f, "--quiet", "--json"])
    assert json.loads(out)["channels"] == names          # the JSON keeps them exactly
