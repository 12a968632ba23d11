"""The type stubs of the lazy facades (``__init__.pyi``) match the export table.

The package ``__init__`` files load their names on first use (PEP 562), which static
type checkers and editors cannot follow; each facade therefore has a stub that imports
every public name from the module that defines it.  The stubs are generated from the one
table in ``wedgepath/__init__.py``: run ``python tests/test_stubs.py`` after changing it.
"""

from __future__ import annotations

import sys
from pathlib import Path

SRC = Path(__file__).resolve().parents[1] / "src" / "wedgepath"
HEADER = ("# Generated from the export table of wedgepath/__init__.py by tests/test_stubs.py;\n"
          "# do not edit.  Type checkers and editors read this; Python loads the names\n"
          "# lazily (see the module docstring of wedgepath/__init__.py).\n")


def _imports(table, prefix="."):
    lines = []
    for mod, names in table.items():
        if names is None:
            lines.append(f"from {prefix} import {mod} as {mod}")
        else:
            lines.append(f"from {prefix}{mod} import " + ", ".join(f"{n} as {n}" for n in names))
    return lines


def expected() -> dict:
    """``{path: text}`` of every stub, from the export table."""
    import wedgepath as wp

    out = {}
    for pkg in wp._EXPORTS:
        names = wp._names(wp._EXPORTS[pkg])
        text = HEADER + "\n" + "\n".join(_imports(wp._EXPORTS[pkg])) + \
            f"\n\n__all__ = {names!r}\n"
        out[SRC / pkg / "__init__.pyi"] = text
    lines = [f"from . import {m} as {m}" for m in wp._MODULES]
    where = {}
    for pkg, table in wp._EXPORTS.items():
        for mod, names in table.items():
            for n in ((mod,) if names is None else names):
                where.setdefault(n, (pkg, mod, names is None))
    for name in wp.__all__:
        if name == "__version__":
            continue
        pkg, mod, is_module = where[name]
        lines.append(f"from .{pkg} import {mod} as {mod}" if is_module else
                     f"from .{pkg}.{mod} import {name} as {name}")
    out[SRC / "__init__.pyi"] = HEADER + "\n" + "\n".join(lines) + \
        f"\n\n__version__: str\n__all__ = {list(wp.__all__)!r}\n"
    return out


def test_stubs_match_the_export_table():
    for path, text in expected().items():
        assert path.exists() and path.read_text() == text, \
            f"{path.relative_to(SRC.parent)} is stale: run python tests/test_stubs.py"


def test_every_stub_import_resolves():
    # each line names a real module and a real attribute of it
    import ast
    import importlib
    import importlib.util

    for path in expected():
        pkg = "wedgepath" + ("" if path.parent == SRC else "." + path.parent.name)
        for node in ast.parse(path.read_text()).body:
            if isinstance(node, ast.ImportFrom):
                base = importlib.import_module(("." * node.level) + (node.module or ""), pkg)
                for a in node.names:
                    assert hasattr(base, a.name) or importlib.util.find_spec(
                        f"{base.__name__}.{a.name}"), f"{path.name}: {a.name}"


if __name__ == "__main__":
    sys.path.insert(0, str(SRC.parent))
    for p, t in expected().items():
        p.write_text(t)
        print("wrote", p)
