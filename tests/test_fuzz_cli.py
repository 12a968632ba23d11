"""Hostile-input fuzzing of the command line (issue 13).

``wedgepath leadlag`` and ``wedgepath loop`` are run (in-process, and a few times in a
subprocess) on random hostile tables (names with commas, quotes, formula starts, ``$``,
control characters; gaps, constant, proportional, tangled, huge and tiny data), random
options (closures, tolerances, windows, surrogates, streaming, weights from a grammar of
nasty formulas, crossing limits, units, figures) and random output folders (missing,
fresh, holding the user's files, files named like the outputs, dangling and outside
symbolic links, the input table itself, a hard link to it).  Every case of issue 13 is a
seed.  Properties of every run:

* the exit code is 0 or 2; with 2, standard error is exactly one line
  ``wedgepath: error: ...`` (``wedgepath COMMAND: error: ...`` for a bad option);
  never a traceback, never exit code 1;
* nothing outside the run's own outputs is created, changed or removed: with exit code
  2 nothing at all; with 0 only the files listed in the new ``manifest.json`` (and the
  output folder itself), each matching its size and SHA-256; never the input; no
  ``.wedgepath-tmp-*`` left behind; the signal handlers restored.

CI runs a fixed, derandomised budget (a few seconds).  ``WEDGEPATH_FUZZ=long`` draws fresh
examples (``WEDGEPATH_FUZZ_EXAMPLES`` per test, default 3000); ``docs/reliability.md``
records the long runs.
"""

from __future__ import annotations

import contextlib
import csv
import hashlib
import io
import json
import os
import signal
import subprocess
import sys
import tempfile

import numpy as np
import pytest
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st

from wedgepath import cli

_LONG = os.environ.get("WEDGEPATH_FUZZ", "") == "long"
_HEALTH = [HealthCheck.too_slow, HealthCheck.filter_too_much, HealthCheck.data_too_large]
if _LONG:
    from hypothesis.database import DirectoryBasedExampleDatabase
    _DB = os.environ.get("WEDGEPATH_FUZZ_DB")   # keep failures between long runs
    FUZZ = settings(max_examples=int(os.environ.get("WEDGEPATH_FUZZ_EXAMPLES", "3000")),
                    deadline=None, derandomize=False,
                    database=DirectoryBasedExampleDatabase(_DB) if _DB else None,
                    suppress_health_check=_HEALTH)
else:
    FUZZ = settings(max_examples=int(os.environ.get("WEDGEPATH_FUZZ_CLI_EXAMPLES", "25")),
                    deadline=None, derandomize=True, database=None,
                    suppress_health_check=_HEALTH)

try:
    import matplotlib  # noqa: F401
    HAVE_MPL = True
except ImportError:       # figures are then never planned
    HAVE_MPL = False

# --------------------------------------------------------------------------- ingredients
PLAIN = ["a", "b", "c", "u", "v", "w"]
HOSTILE = ["t", "x", "p,q", '=HYPERLINK("http://example.invalid","x")', "+1", "-a", "@x", "'q",
           'a"b', "cost_$_total", "$x$", "é", "a b", "\x1b[31mred", "name\twith tab", "1",
           "0.5", "nan", "x" * 300, "=1+1", "#c", "", " ", "a\nb", "time"]
KINDS = ["sine", "sine", "noise", "constant", "proportional", "gaps", "allgap", "star",
         "huge", "tiny", "text", "inf", "short", "integers", "circle"]
FORMULA_ATOMS = ["x", "y", "1", "2", "0.5", "pi", "e", "10**64", "1e300", "1e-300", "1e999",
                 "(x+y+1)", "(x-y+2)"]
FORMULA_FUNCS = ["sin", "cos", "tan", "exp", "log", "sqrt", "abs", "asin", "atan", "__import__",
                 "open"]


@st.composite
def formulas(draw, depth=0):
    kind = draw(st.sampled_from(["atom", "atom", "pow", "op", "call"] if depth < 3
                                else ["atom"]))
    if kind == "atom":
        return draw(st.sampled_from(FORMULA_ATOMS))
    if kind == "pow":
        return f"({draw(formulas(depth + 1))})**{draw(st.sampled_from(['2', '64', '-1', '0.5']))}"
    if kind == "op":
        op = draw(st.sampled_from(["+", "-", "*", "/", "^"]))
        return f"({draw(formulas(depth + 1))}){op}({draw(formulas(depth + 1))})"
    return f"{draw(st.sampled_from(FORMULA_FUNCS))}({draw(formulas(depth + 1))})"


def _values(kind, n, rows, rng):
    s = np.linspace(0, 6 * np.pi, max(rows, 1))
    if kind in ("sine", "gaps", "allgap", "text", "inf", "short"):
        X = np.column_stack([np.sin(s - k) for k in range(n)])
    elif kind == "noise":
        X = rng.uniform(0, 1, (rows, n))
    elif kind == "constant":
        X = np.ones((rows, n))
    elif kind == "proportional":
        X = np.sin(s)[:, None] * (np.arange(n) + 1.0)[None, :]
    elif kind == "star":
        k = np.arange(rows)
        ang = 2 * np.pi * (k * max(1, (rows - 1) // 2) % max(rows, 1)) / max(rows, 1)
        X = np.column_stack([np.cos(ang), np.sin(ang)] + [np.sin(ang + j) for j in range(n - 2)])
    elif kind == "huge":
        X = 1e300 * np.column_stack([np.sin(s - k) for k in range(n)])
    elif kind == "tiny":
        X = 1e-300 * np.column_stack([np.sin(s - k) for k in range(n)])
    elif kind == "integers":
        X = rng.integers(-3, 4, (rows, n)).astype(float)
    else:   # circle
        X = np.column_stack([np.cos(s), np.sin(s)] + [np.sin(s + j) for j in range(n - 2)])
    cells = [[repr(float(v)) for v in row] for row in X[:rows]]
    if kind == "gaps":
        for r in range(0, rows, 5):
            cells[r][r % n] = ""
    elif kind == "allgap":
        for r in range(rows):
            cells[r][r % n] = ""
    elif kind == "text" and rows:
        cells[rows // 2][0] = "oops"
    elif kind == "inf" and rows:
        cells[rows // 2][-1] = "inf"
    return cells


@st.composite
def scenarios(draw):
    command = draw(st.sampled_from(["leadlag", "leadlag", "loop", "loop", "leadlag-stream"]))
    n = draw(st.integers(2, 4))
    pool = st.one_of(st.sampled_from(PLAIN), st.sampled_from(PLAIN), st.sampled_from(HOSTILE))
    names = draw(st.lists(pool, min_size=n, max_size=n, unique=draw(st.integers(0, 5)) < 5))
    kind = draw(st.sampled_from(KINDS))
    rows = draw(st.integers(0, 3)) if kind == "short" else draw(st.integers(4, 200))
    seed = draw(st.integers(0, 2 ** 16))
    has_time = draw(st.booleans())
    opts = []
    cols = list(names)
    if has_time:
        opts += ["--time", "time"]
    stream = command.endswith("stream")
    closure = draw(st.sampled_from([None, None, None, "chord", "none", "detrend", "require"]))
    if stream and draw(st.integers(0, 9)) < 9:
        closure = None
    if closure:
        opts += ["--closure", closure]
    if (closure == "require" and draw(st.booleans())) or draw(st.integers(0, 19)) == 19:
        opts += ["--tol=" + draw(st.sampled_from(["0", "1e-3", "10", "-1", "nan"]))]
    if command.startswith("leadlag"):
        if draw(st.integers(0, 3)) == 3:
            pick = draw(st.lists(st.sampled_from(cols + ["zz"]), min_size=1, max_size=3))
            opts += ["--columns=" + ",".join(pick)]
        extras = not stream or draw(st.integers(0, 9)) == 9
        if extras and draw(st.integers(0, 3)) == 3:
            opts += ["--normalize", draw(st.sampled_from(["hilbert", "zscore", "frobenius"]))]
        if extras and draw(st.integers(0, 3)) == 3:
            opts += ["--window", str(draw(st.integers(1, 40)))]
            if draw(st.booleans()):
                opts += ["--step", str(draw(st.integers(1, 10)))]
        if extras and draw(st.integers(0, 4)) == 4:
            opts += ["--surrogates", str(draw(st.integers(1, 9))), "--seed",
                     str(draw(st.integers(0, 5)))]
        if stream:
            opts += ["--stream", "--chunk-rows", str(draw(st.integers(1, 50)))]
    else:
        if draw(st.integers(0, 9)) == 9:
            x, y = draw(st.sampled_from(cols + ["zz"])), draw(st.sampled_from(cols + ["zz"]))
        else:
            x, y = cols[0], cols[1]
        opts += [f"--x={x}", f"--y={y}"]        # = : a name may start with '-'
        if draw(st.integers(0, 3)) == 3:
            opts += ["--cycles-by=" + draw(st.sampled_from(cols))]
        if draw(st.integers(0, 4)) == 4:
            opts += ["--level=" + draw(st.sampled_from(["0", "5", "-1e300"]))]
        if draw(st.integers(0, 4)) == 4:
            opts += ["--hysteresis", draw(st.sampled_from(["0", "0.1", "100"]))]
        if draw(st.booleans()):
            opts += ["--weight=" + draw(formulas())]
        if draw(st.integers(0, 3)) == 3:
            opts += ["--max-crossings", str(draw(st.sampled_from([1, 10, 1000])))]
        if draw(st.integers(0, 4)) == 4:
            opts += ["--energy", "x_dy"]
    if draw(st.integers(0, 5)) == 5:
        u = draw(st.sampled_from(cols + ["time", "zz"]))
        opts += ["--units=" + f"{u}={draw(st.sampled_from(['m', '$', '$/kg', 'MPa']))}"]
    figures = HAVE_MPL and draw(st.integers(0, 9)) == 9
    out = draw(st.sampled_from(["none", "none", "fresh", "fresh", "fresh", "fresh", "user_file",
                                "user_file", "taken_output", "dangling_link", "outside_link",
                                "input_inside", "input_hardlink", "file_as_out"]))
    force = draw(st.booleans())
    json_out = draw(st.integers(0, 3)) == 3
    return dict(command=command, names=names, kind=kind, rows=rows, seed=seed,
                has_time=has_time, opts=opts, figures=figures, out=out, force=force,
                json=json_out, input_name=draw(st.sampled_from(["in.csv", "pvalues.csv",
                                                                "result.json"])))


def case(command, names, kind, opts, out="fresh", force=False, rows=60, figures=False,
         input_name="in.csv", has_time=False):
    """A seed scenario written out by hand."""
    return dict(command=command, names=names, kind=kind, rows=rows, seed=0, has_time=has_time,
                opts=opts, figures=figures, out=out, force=force, json=False,
                input_name=input_name)


#: every case of issue 13 that reaches the command line
SEEDS = [
    # 1: text as code
    case("loop", ["x", "y"], "circle",
         ["--x", "x", "--y", "y", "--weight", "__import__('os').system('touch pwned') and 0"]),
    # 2: hostile names
    case("leadlag", ["p,q", '=HYPERLINK("http://example.invalid","x")', "+1"], "sine",
         ["--window", "20"]),
    # 3: the input named like an output, in the output folder, --force (with and without
    # the output of that name)
    case("leadlag", ["a", "b"], "sine", [], out="input_inside", force=True,
         input_name="pvalues.csv"),
    case("leadlag", ["a", "b"], "sine", ["--surrogates", "5"], out="input_inside", force=True,
         input_name="pvalues.csv"),
    case("leadlag", ["a", "b"], "sine", [], out="input_hardlink", force=True),
    # 4: a taken output name without --force
    case("leadlag", ["a", "b", "c"], "sine", [], out="taken_output", figures=HAVE_MPL),
    # 5: a dangling result.json link
    case("leadlag", ["a", "b"], "sine", [], out="dangling_link"),
    case("leadlag", ["a", "b"], "sine", [], out="outside_link", force=True),
    # 10: nasty weights
    case("loop", ["x", "y"], "circle", ["--x", "x", "--y", "y", "--weight", "((x+y+1)**64)**4"]),
    case("loop", ["x", "y"], "circle",
         ["--x", "x", "--y", "y", "--weight",
          "(x+y+1)**64*(x-y+2)**64*(x+2*y+3)**64*(2*x+y+1)**64"]),
    # 12: tangled loops
    case("loop", ["x", "y"], "star", ["--x", "x", "--y", "y"], rows=90),
    case("loop", ["x", "y"], "noise", ["--x", "x", "--y", "y", "--max-crossings", "10"]),
    # 15: dollar signs in names and units, with figures
    case("loop", ["cost_$_total", "price_$"], "circle",
         ["--x", "cost_$_total", "--y", "price_$", "--units", "cost_$_total=$"],
         figures=HAVE_MPL),
    # 16: messages
    case("loop", ["x", "y"], "circle", ["--x", "x", "--y", "y", "--weight", "1e999"]),
    case("loop", ["x", "y"], "circle", ["--x", "x", "--y", "y", "--weight", "exp(10**60)"]),
    case("leadlag", ["a", "b", "c"], "proportional", [], figures=HAVE_MPL),
    case("leadlag", ["a", "b", "c"], "constant", ["--stream"]),
    case("loop", ["x", "y"], "sine", ["--x", "x", "--y", "y", "--closure", "none"]),
    case("loop", ["x", "y"], "sine", ["--x", "x", "--y", "y", "--closure", "require"]),
    case("leadlag", ["a", "b"], "allgap", []),
]


# --------------------------------------------------------------------------- the sandbox
def snapshot(root):
    """Everything under root: {relative path: (kind, content hash or link target)}."""
    out = {}
    for dirpath, dirs, files in os.walk(root):
        for name in dirs + files:
            p = os.path.join(dirpath, name)
            rel = os.path.relpath(p, root)
            st_ = os.lstat(p)
            if os.path.islink(p):
                out[rel] = ("link", os.readlink(p))
            elif os.path.isdir(p):
                out[rel] = ("dir", None)
            else:
                with open(p, "rb") as fh:
                    out[rel] = ("file", hashlib.sha256(fh.read()).hexdigest(),
                                st_.st_ino)
    return out


def build(sc, root):
    """Write the scenario's files under root; return (argv, out folder or None, cwd)."""
    rng = np.random.default_rng(sc["seed"])
    names = list(sc["names"])
    cells = _values(sc["kind"], len(names), sc["rows"], rng)
    header = (["time"] if sc["has_time"] else []) + names
    if sc["has_time"]:
        cells = [[repr(float(k))] + r for k, r in enumerate(cells)]
    out_dir = os.path.join(root, "out")
    where = sc["out"]
    table_dir = out_dir if where == "input_inside" else root
    os.makedirs(table_dir, exist_ok=True)
    table = os.path.join(table_dir, sc["input_name"])
    with open(table, "w", newline="") as fh:
        w = csv.writer(fh)
        w.writerow(header)
        w.writerows(cells)
    with open(os.path.join(root, "outside.txt"), "w") as fh:
        fh.write("a file outside the output folder")
    if where != "none":
        os.makedirs(out_dir, exist_ok=True)
    if where == "user_file":
        with open(os.path.join(out_dir, "notes.txt"), "w") as fh:
            fh.write("the user's own notes")
        with open(os.path.join(out_dir, "loop.png"), "wb") as fh:
            fh.write(b"the user's own picture")
    elif where == "taken_output":
        for name in ("result.json", "positions.png", "cycles.csv", "manifest.json"):
            with open(os.path.join(out_dir, name), "w") as fh:
                fh.write("not written by wedgepath")
    elif where == "dangling_link":
        os.symlink(os.path.join(root, "nowhere", "target.json"),
                   os.path.join(out_dir, "result.json"))
    elif where == "outside_link":
        os.symlink(os.path.join(root, "outside.txt"), os.path.join(out_dir, "result.json"))
    elif where == "input_hardlink":
        os.link(table, os.path.join(out_dir, "area_matrix.csv"))
    elif where == "file_as_out":
        os.rmdir(out_dir)
        with open(out_dir, "w") as fh:
            fh.write("a file where the folder should be")
    command = sc["command"].replace("-stream", "")
    argv = [command, os.path.relpath(table, out_dir) if where == "input_inside" else table]
    argv += list(sc["opts"])
    if "--stream" in argv and sc["command"] != "leadlag-stream" and command != "leadlag":
        argv.remove("--stream")
    cwd = out_dir if where == "input_inside" else root
    if where != "none":
        argv += ["--out", "." if where == "input_inside" else out_dir]
    if sc["force"]:
        argv.append("--force")
    if not sc["figures"]:
        argv.append("--no-figures")
    if sc["json"]:
        argv.append("--json")
    argv.append("--quiet")
    return argv, (None if where in ("none",) else out_dir), cwd


def run_in_process(argv, cwd):
    old = os.getcwd()
    handlers = (signal.getsignal(signal.SIGINT), signal.getsignal(signal.SIGTERM))
    out, err = io.StringIO(), io.StringIO()
    os.chdir(cwd)
    try:
        with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
            code = cli.main(argv)
    finally:
        os.chdir(old)
    assert (signal.getsignal(signal.SIGINT), signal.getsignal(signal.SIGTERM)) == handlers, \
        "signal handlers not restored"
    return code, out.getvalue(), err.getvalue()


def check_outcome(root, out_dir, before, code, stderr):
    assert code in (0, 2), f"exit code {code}: {stderr}"
    assert "Traceback" not in stderr, stderr
    after = snapshot(root)
    assert not [p for p in after if os.path.basename(p).startswith(".wedgepath")], after
    changed = {p for p in set(before) | set(after) if before.get(p) != after.get(p)}
    if code == 2:
        lines = stderr.strip().splitlines()
        # "wedgepath: error: ..." (argparse's usage errors too)
        assert len(lines) == 1 and lines[0].startswith("wedgepath: error: "), stderr
        assert not changed, f"an exit-2 run changed {sorted(changed)}"
        return
    if out_dir is None or not os.path.isdir(out_dir):
        assert not changed, f"a run without --out changed {sorted(changed)}"
        return
    rel_out = os.path.relpath(out_dir, root)
    with open(os.path.join(out_dir, "manifest.json")) as fh:
        man = json.load(fh)
    listed = {e["name"] for e in man["files"]} | {"manifest.json"}
    for e in man["files"]:
        with open(os.path.join(out_dir, e["name"]), "rb") as fh:
            data = fh.read()
        assert len(data) == e["bytes"] and hashlib.sha256(data).hexdigest() == e["sha256"]
    allowed = {rel_out} | {os.path.join(rel_out, n) for n in listed}
    assert changed <= allowed, f"changed outside the run's outputs: {sorted(changed - allowed)}"


def fuzz_one(sc, full=False):
    with tempfile.TemporaryDirectory() as root:
        argv, out_dir, cwd = build(sc, root)
        before = snapshot(root)
        code, _, stderr = run_in_process(argv, cwd)
        check_outcome(root, out_dir, before, code, stderr)
        assert not os.path.exists(os.path.join(cwd, "pwned"))
        return (code, stderr) if full else code


# found by the long run of 2026-12-03: integer data whose cycle has no displacement range
# gave -inf damping ratios and "invalid value" warnings (exit code 1, "internal error")
FOUND = [{"command": "loop", "names": ["a", "b"], "kind": "integers", "rows": 9, "seed": 1,
          "has_time": False, "opts": ["--x=a", "--y=b", "--hysteresis", "0"],
          "figures": False, "out": "none", "force": False, "json": False,
          "input_name": "in.csv"}]


def with_seeds(test):
    for sc in SEEDS + FOUND:
        test = example(sc)(test)
    return test


def _outcome(sc, code, stderr):
    """A short label of the outcome, for hypothesis' statistics (--hypothesis-show-statistics)."""
    if code == 0:
        return f"exit 0 ({sc['command']})"
    msg = stderr.strip().split(": error: ", 1)[-1]
    import re
    msg = re.sub(r"'[^']*'|\S*/\S*|[-+0-9.e,]{2,}", "_", msg)
    return f"exit 2: {msg[:48]}"


@FUZZ
@given(scenarios())
@with_seeds
def test_cli_hostile_runs(sc):
    from hypothesis import event
    code, stderr = fuzz_one(sc, full=True)
    event(_outcome(sc, code, stderr))


def test_seeds_reach_the_outcomes_of_the_issue():
    # the seeds are not vacuous: they hit refusals and successes as issue 13 describes
    codes = [fuzz_one(sc) for sc in SEEDS[:6]]
    assert codes[0] == 2                   # __import__ refused
    assert codes[1] == 0                   # hostile names written correctly
    assert codes[2] == 0 and codes[3] == 2 and codes[4] == 2 and codes[5] == 2


@pytest.mark.parametrize("sc", [SEEDS[1]] + ([SEEDS[3], SEEDS[10]] if _LONG else []))
def test_cli_in_a_subprocess(sc):
    # the real process: exit code and standard error as a shell sees them
    with tempfile.TemporaryDirectory() as root:
        argv, out_dir, cwd = build(sc, root)
        before = snapshot(root)
        proc = subprocess.run([sys.executable, "-m", "wedgepath", *argv], cwd=cwd,
                              capture_output=True, text=True, timeout=300)
        check_outcome(root, out_dir, before, proc.returncode, proc.stderr)


@pytest.mark.skipif(not _LONG, reason="budget reminder for the long run only")
def test_long_profile_is_active():
    assert FUZZ.max_examples >= 100

