"""Run every benchmark script and collect their tables into docs/performance.md.

Each ``benchmarks/bench_*.py`` runs in its own subprocess (so one script's
memory or a crash cannot disturb the next), its output is shown as it comes
and kept, and the script is judged by its exit code and by any ``MISS`` row
in its tables.  At the end a summary says which scripts passed, which missed
a target (and which rows), and the collected tables are written to
``docs/performance.md`` with the date, the command and the machine.

Usage::

    .venv/bin/python benchmarks/run_all.py             # all scripts, writes docs/performance.md
    .venv/bin/python benchmarks/run_all.py --quick     # smaller sizes; prints only
    .venv/bin/python benchmarks/run_all.py --only dask --only scaling --no-write

Exit code 0 when every script passed, 1 otherwise.
"""

from __future__ import annotations

import argparse
import datetime as _dt
import os
import re
import subprocess
import sys
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent
sys.path.insert(0, str(HERE))
from _harness import machine_line  # noqa: E402

MISS_ROW = re.compile(r"^(?P<name>[^|\n]*?)\s*\|[^|\n]*\|[^|\n]*\|\s*MISS\s*(\||$)", re.M)


def discover(only=()):
    scripts = sorted(HERE.glob("bench_*.py"))
    if only:
        scripts = [s for s in scripts if any(o in s.stem for o in only)]
    return scripts


def run_script(path, extra, timeout):
    """Run one script, echo its output live; return (status, seconds, output, missed rows)."""
    cmd = [sys.executable, str(path), *extra]
    env = dict(os.environ, PYTHONUNBUFFERED="1")
    t0 = time.perf_counter()
    lines = []
    proc = subprocess.Popen(cmd, stdout=subprocess.PIPE, stderr=subprocess.STDOUT, text=True,
                            cwd=str(ROOT), env=env, bufsize=1)
    timed_out = False
    try:
        deadline = t0 + timeout
        for line in proc.stdout:
            sys.stdout.write(line)
            sys.stdout.flush()
            lines.append(line)
            if time.perf_counter() > deadline:
                timed_out = True
                break
    finally:
        if timed_out:
            proc.kill()
        proc.stdout.close()
        rc = proc.wait()
    elapsed = time.perf_counter() - t0
    output = "".join(lines)
    missed = [m.group("name").strip() for m in MISS_ROW.finditer(output)]
    if timed_out:
        status = f"timed out after {timeout:.0f} s"
    elif re.search(r"^SKIPPED\b", output, re.M):
        status = "skipped"
    elif missed:
        status = "MISS"
    elif rc != 0:
        status = f"failed (exit {rc})"
    else:
        status = "pass"
    return status, elapsed, output, missed


def clip(text, limit=4000):
    return text if len(text) <= limit else text[:limit] + "\n... (output cut)\n"


def write_report(path, results, command, started, total):
    lines = [
        "# Performance",
        "",
        "Every speed and memory target of the issues, measured by the scripts in",
        "`benchmarks/` against a baseline run in the same process and the same run",
        "(never by timed unit tests: the machines are shared and noisy; times are",
        "best of several runs). Regenerate this page with the command below.",
        "",
        f"- Date: {started:%Y-%m-%d %H:%M} UTC",
        f"- Command: `{command}`",
        f"- Machine: {machine_line()}",
        f"- Total time: {total / 60:.1f} min",
        "",
        "## Summary",
        "",
        "| script | result | time | rows that missed |",
        "| --- | --- | --- | --- |",
    ]
    for path_, status, elapsed, _, missed in results:
        lines.append(f"| `{path_.name}` | {status} | {elapsed:.0f} s | "
                     f"{'; '.join(missed) if missed else ''} |")
    lines.append("")
    for path_, status, elapsed, output, _ in results:
        lines += [f"## `{path_.name}` ({status}, {elapsed:.0f} s)", "", "```text",
                  clip(output.strip("\n"), 20000), "```", ""]
    Path(path).write_text("\n".join(lines), encoding="utf-8")


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--quick", action="store_true", help="pass --quick to every script "
                    "(smaller sizes; the report is not written unless --output is given)")
    ap.add_argument("--only", action="append", default=[], metavar="TEXT",
                    help="run only scripts whose name contains TEXT (repeatable)")
    ap.add_argument("--output", metavar="FILE", help="where to write the report "
                    "(default docs/performance.md for a full run)")
    ap.add_argument("--no-write", action="store_true", help="do not write the report")
    ap.add_argument("--timeout", type=float, default=1800.0, metavar="S",
                    help="stop a script after S seconds (default 1800)")
    args = ap.parse_args(argv)

    scripts = discover(args.only)
    if not scripts:
        print("no benchmark scripts matched", file=sys.stderr)
        return 2
    extra = ["--quick"] if args.quick else []
    started = _dt.datetime.now(_dt.timezone.utc)
    t0 = time.perf_counter()
    results = []
    for path in scripts:
        print(f"\n===== {path.name} =====", flush=True)
        status, elapsed, output, missed = run_script(path, extra, args.timeout)
        results.append((path, status, elapsed, output, missed))
        print(f"----- {path.name}: {status} in {elapsed:.0f} s", flush=True)
    total = time.perf_counter() - t0

    print(f"\n===== summary ({total / 60:.1f} min) =====\n{machine_line()}")
    width = max(len(p.name) for p, *_ in results)
    for path, status, elapsed, _, missed in results:
        print(f"{path.name.ljust(width)}  {status:<10} {elapsed:6.0f} s"
              + (f"  missed: {'; '.join(missed)}" if missed else ""))
    bad = [p.name for p, status, *_ in results if status not in ("pass", "skipped")]
    print("all targets met" if not bad else f"not met: {', '.join(bad)}")

    out = args.output or (None if (args.quick or args.only) else str(ROOT / "docs" / "performance.md"))
    if out and not args.no_write:
        cmd = "python benchmarks/run_all.py" + "".join(f" {a}" for a in (argv if argv is not None
                                                                          else sys.argv[1:]))
        write_report(out, results, cmd, started, total)
        print(f"report written to {os.path.relpath(out, ROOT)}")
    return 0 if not bad else 1


if __name__ == "__main__":
    sys.exit(main())
