"""Bad-input rows for the wedgepath command line."""

from __future__ import annotations

from ._table import *  # noqa: F403 - the shared inputs, row() and returns()
from .tables import GOOD_CSV, MALFORMED


CLI_OUT = "out"


def run_cli(argv, files=None):
    """Run the command line in-process in a fresh folder; returns (code, stdout, stderr, written)."""
    with tempfile.TemporaryDirectory() as d:
        paths = {}
        for name, content in (files or {}).items():
            paths[name] = os.path.join(d, name)
            with open(paths[name], "wb") as fh:
                fh.write(content if isinstance(content, bytes) else content.encode("utf-8"))
        args = [paths.get(a, a) for a in argv] + ["--out", os.path.join(d, CLI_OUT), "--quiet",
                                                  "--no-figures"]
        if argv and argv[0] == "demo":
            args = [paths.get(a, a) for a in argv] + ["--out", os.path.join(d, CLI_OUT), "--quiet",
                                                      "--no-figures"]
        out, err = io.StringIO(), io.StringIO()
        with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
            code = cli.main(args)
        written = sorted(os.listdir(os.path.join(d, CLI_OUT))) \
            if os.path.isdir(os.path.join(d, CLI_OUT)) else []
        stray = [f for f in os.listdir(d) if f.startswith(".wedgepath-")]
        return code, out.getvalue(), err.getvalue(), written + stray


STAR_CSV = "x,y\n" + "".join(f"{float(np.cos(2 * np.pi * (k * 1000 % 2001) / 2001))!r},"
                             f"{float(np.sin(2 * np.pi * (k * 1000 % 2001) / 2001))!r}\n"
                             for k in range(2001))
LOOP_CSV = "t,x,y\n" + "".join(f"{k},{np.cos(k / 3):.6f},{np.sin(k / 3):.6f}\n" for k in range(40))
for key, (cls, given, content, frag) in MALFORMED.items():
    for sub in ("leadlag", "loop"):
        extra = ["--delimiter", ","] if key == "delimiter" else []
        argv = ([sub, "in.csv", *extra] if sub == "leadlag"
                else [sub, "in.csv", "--x", "a", "--y", "b", *extra])
        if sub == "loop" and key == "delimiter":
            frag = "unknown column 'a'; columns are ['a;b']"  # --x a is looked up first
        row(f"wedgepath {sub}", cls, given, (lambda argv=argv, content=content:
                                              run_cli(argv, {"in.csv": content})),
            "exit 2", frag)
row("wedgepath leadlag", "file", "a truncated file, streamed (--stream)",
    lambda: run_cli(["leadlag", "in.csv", "--stream"], {"in.csv": MALFORMED["truncated"][2]}),
    "exit 2", "1 fields, the header has 2")
row("wedgepath leadlag", "file", "a non-UTF-8 file, streamed (--stream)",
    lambda: run_cli(["leadlag", "in.csv", "--stream"], {"in.csv": MALFORMED["non-utf8"][2]}),
    "exit 2", "not UTF-8")
row("wedgepath leadlag", "file", "a missing file", lambda: run_cli(["leadlag", "nope.csv"]), "exit 2",
    "no such file")
row("wedgepath leadlag", "option", "--closure circle",
    lambda: run_cli(["leadlag", "in.csv", "--closure", "circle"], {"in.csv": GOOD_CSV}), "exit 2",
    "invalid choice: 'circle'")
row("wedgepath leadlag", "option", "--window 0",
    lambda: run_cli(["leadlag", "in.csv", "--window", "0"], {"in.csv": GOOD_CSV}), "exit 2",
    "expected a positive whole number")
row("wedgepath leadlag", "option", "--window 100 for 4 rows",
    lambda: run_cli(["leadlag", "in.csv", "--window", "100"], {"in.csv": GOOD_CSV}), "exit 2",
    "longer than the 4 samples")
row("wedgepath leadlag", "option", "--step without --window",
    lambda: run_cli(["leadlag", "in.csv", "--step", "2"], {"in.csv": GOOD_CSV}), "exit 2",
    "--step needs --window")
row("wedgepath leadlag", "option", "--stream with --normalize",
    lambda: run_cli(["leadlag", "in.csv", "--stream", "--normalize", "hilbert"],
                    {"in.csv": GOOD_CSV}), "exit 2", "--stream computes the area matrix only")
row("wedgepath leadlag", "option", "an unknown flag --frobnicate",
    lambda: run_cli(["leadlag", "in.csv", "--frobnicate"], {"in.csv": GOOD_CSV}), "exit 2",
    "unrecognized arguments: --frobnicate")
row("wedgepath leadlag", "option", "--columns naming an unknown column",
    lambda: run_cli(["leadlag", "in.csv", "--columns", "a,zz"], {"in.csv": GOOD_CSV}), "exit 2",
    "unknown column 'zz'")
row("wedgepath leadlag", "ndim", "one channel column",
    lambda: run_cli(["leadlag", "in.csv", "--columns", "a"], {"in.csv": GOOD_CSV}), "exit 2",
    "at least 2")
row("wedgepath leadlag", "times", "a repeated time stamp",
    lambda: run_cli(["leadlag", "in.csv", "--time", "t"],
                    {"in.csv": "t,a,b\n0,1,0\n1,0,1\n1,-1,0\n3,0,-1\n"}), "exit 2",
    "strictly increasing")
row("wedgepath leadlag", "times", "decreasing time stamps, streamed",
    lambda: run_cli(["leadlag", "in.csv", "--time", "t", "--stream"],
                    {"in.csv": "t,a,b\n3,1,0\n2,0,1\n1,-1,0\n0,0,-1\n"}), "exit 2",
    "times are not strictly increasing")
row("wedgepath leadlag", "nan", "every row a gap", lambda: run_cli(
    ["leadlag", "in.csv"], {"in.csv": "a,b\nnan,1\n2,\nNA,3\n"}), "exit 2",
    "no row has a value in every column used ('a', 'b')")
row("wedgepath leadlag", "option", "--closure require on an open recording",
    lambda: run_cli(["leadlag", "in.csv", "--closure", "require"], {"in.csv": GOOD_CSV[:-7]}),
    "exit 2", "not closed")
row("wedgepath leadlag", "option", "an existing result.json without --force",
    lambda: _cli_existing(), "exit 2", "exists; use --force")
row("wedgepath loop", "option", "--x and --y the same column",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "x"], {"in.csv": LOOP_CSV}), "exit 2",
    "name the same column")
row("wedgepath loop", "option", "--y naming an unknown column",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "zz"], {"in.csv": LOOP_CSV}), "exit 2",
    "unknown column 'zz'")
row("wedgepath loop", "option", "--weight with an unsafe formula",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--weight", "__import__('os')"],
                    {"in.csv": LOOP_CSV}), "exit 2", "unknown function '__import__'")
row("wedgepath loop", "option", "--energy bogus",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--energy", "bogus"],
                    {"in.csv": LOOP_CSV}), "exit 2", "invalid choice: 'bogus'")
row("wedgepath loop", "option", "--level inf",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--level", "inf"],
                    {"in.csv": LOOP_CSV}), "exit 2", "expected a finite number")
row("wedgepath loop", "option", "--closure none on an open loop",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--closure", "none"],
                    {"in.csv": LOOP_CSV}), "exit 2", "choose --closure chord (the default)")
row("wedgepath loop", "overflow", "coordinates near 1e200 (areas beyond float64)",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y"],
                    {"in.csv": "x,y\n0,0\n1e200,0\n1e200,1e200\n0,1e200\n"}), "exit 2",
    "overflows float64")
row("wedgepath loop", "option", "--units naming a column not used",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--units", "zz=m"],
                    {"in.csv": LOOP_CSV}), "exit 2", "--units names column 'zz'")
row("wedgepath leadlag", "option", "--units without '='",
    lambda: run_cli(["leadlag", "in.csv", "--units", "a"], {"in.csv": GOOD_CSV}), "exit 2",
    "expected COL=UNIT")
row("wedgepath loop", "option", "--weight whose nested powers have thousands of digits",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--weight",
                     "(((9**64)**64)**64)**64"], {"in.csv": LOOP_CSV}), "exit 2",
    "more than 400 digits")
row("wedgepath leadlag", "option", "--closure require with a gap beyond the default tolerance",
    lambda: run_cli(["leadlag", "in.csv", "--closure", "require"], {"in.csv": GOOD_CSV[:-7]}),
    "exit 2", "pass a larger --tol")
row("wedgepath leadlag", "option", "--tol without --closure require",
    lambda: run_cli(["leadlag", "in.csv", "--tol", "1"], {"in.csv": GOOD_CSV}), "exit 2",
    "--tol applies to --closure require only")
row("wedgepath leadlag", "nan", "a column without a value",
    lambda: run_cli(["leadlag", "in.csv"], {"in.csv": "a,b,c\n1,,2\n3,,4\n5,,1\n"}), "exit 2",
    "column 'b' has no values")
row("wedgepath leadlag", "times", "decreasing time stamps",
    lambda: run_cli(["leadlag", "in.csv", "--time", "t"],
                    {"in.csv": "t,a,b\n0,1,0\n1,0,1\n0.5,-1,0\n3,0,-1\n"}), "exit 2",
    "line 4 (data row 3): times are not strictly increasing: 't' = 0.5 is before 1")
row("wedgepath loop", "option", "--weight 1e999",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--weight", "1e999"],
                    {"in.csv": LOOP_CSV}), "exit 2", "the number ('1e999') has more than 400 digits")
row("wedgepath loop", "overflow", "--weight exp(10**60) (a constant beyond float64)",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--weight", "exp(10**60)"],
                    {"in.csv": LOOP_CSV}), "exit 2", "is a constant beyond float64")
row("wedgepath loop", "overflow", "--weight not finite on the loop (log(x) where x < 0)",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--weight", "log(x)"],
                    {"in.csv": LOOP_CSV}), "exit 2", "--weight 'log(x)' is not finite at (x, y)")
row("wedgepath loop", "option", "a star polygon of 2,001 points (2 million crossings)",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y"], {"in.csv": STAR_CSV}), "exit 2",
    "crosses itself more than 500,000 times")
row("wedgepath loop", "option", "--max-crossings 0",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--max-crossings", "0"],
                    {"in.csv": LOOP_CSV}), "exit 2", "expected a positive whole number")
row("wedgepath demo", "option", "an unknown flag --frobnicate",
    lambda: run_cli(["demo", "--frobnicate"]), "exit 2", "unrecognized arguments: --frobnicate")
row("wedgepath", "option", "an unknown subcommand", lambda: run_cli(["fly"]), "exit 2",
    "invalid choice: 'fly'")


def _cli_existing():
    with tempfile.TemporaryDirectory() as d:
        src = os.path.join(d, "in.csv")
        with open(src, "w") as fh:
            fh.write(GOOD_CSV)
        out = os.path.join(d, CLI_OUT)
        os.makedirs(out)
        with open(os.path.join(out, "result.json"), "w") as fh:
            fh.write("{}")
        o, e = io.StringIO(), io.StringIO()
        with contextlib.redirect_stdout(o), contextlib.redirect_stderr(e):
            code = cli.main(["leadlag", src, "--out", out, "--quiet", "--no-figures"])
        kept = open(os.path.join(out, "result.json")).read() == "{}"
        written = [] if kept and sorted(os.listdir(out)) == ["result.json"] else ["changed"]
        return code, o.getvalue(), e.getvalue(), written
