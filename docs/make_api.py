"""Write docs/api.md, the API reference, from the docstrings of the public names.

Run: ``python docs/make_api.py``.  tests/test_docs.py fails when api.md is out of
date, so the reference always matches the code; the Examples sections in the
docstrings run as doctests in the test suite.
"""

import inspect
import sys
from pathlib import Path

import wedgepath

OUT = Path(__file__).resolve().parent / "api.md"

SECTIONS = [
    ("Paths, chains and forms", "wedgepath.calculus", None),
    ("Planar regions", "wedgepath.planar", None),
    ("Signals: lead and lag", "wedgepath.signals", None),
    ("Exact oracles", "wedgepath.symbolic", None),
    ("Files", "wedgepath.io", None),
    ("Formulas", "wedgepath.formula", None),
    ("Reports", "wedgepath.report", None),
    ("Figures", "wedgepath.plotting", None),
    ("Scale-out", "wedgepath.dask", None),
]


def _signature(obj):
    try:
        return str(inspect.signature(obj))
    except (TypeError, ValueError):
        return ""


def render() -> str:
    import importlib
    lines = ["# API reference", "",
             "Generated from the docstrings by `python docs/make_api.py`; do not edit by hand.",
             f"wedgepath {wedgepath.__version__}.", ""]
    for title, modname, _ in SECTIONS:
        try:
            mod = importlib.import_module(modname)
        except ImportError as exc:  # an optional extra that is not installed
            lines += [f"## {title} (`{modname}`)", "", f"(not importable here: {exc})", ""]
            continue
        names = list(getattr(mod, "__all__", []))
        lines += [f"## {title} (`{modname}`)", ""]
        doc = inspect.getdoc(mod)
        if doc:
            lines += [doc.split("\n\n")[0], ""]
        for name in names:
            obj = getattr(mod, name)
            if not (inspect.isclass(obj) or inspect.isfunction(obj) or callable(obj)):
                shown = ("keys " + ", ".join(map(str, obj))) if isinstance(obj, dict) else repr(obj)
                lines += [f"### `{modname}.{name}`", "", f"Constant: `{shown}`", ""]
                continue
            kind = "class" if inspect.isclass(obj) else "function"
            lines += [f"### `{name}{_signature(obj)}`", "", f"*{kind}*", ""]
            body = inspect.getdoc(obj) or "(no docstring)"
            lines += ["```text", body, "```", ""]
    return "\n".join(lines).rstrip() + "\n"


def main():
    OUT.write_text(render())
    print("wrote", OUT)


if __name__ == "__main__":
    sys.exit(main())
