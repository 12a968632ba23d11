"""The import graph of src/wedgepath: no cycles, no upward imports between layers.

The graph is built from the source with ``ast`` -- every ``import`` and ``from ... import``
anywhere in a module (at module level and inside functions), relative imports resolved --
so it sees the lazy imports inside functions that an import-time check would miss.
(Imports made from a string, ``importlib.import_module(name)``, are not seen.)

The layers are the ones named in DEVELOPERS.md (section "Architecture", the block between
the ``layers:`` markers), lowest first; a module may import from its own layer and the
layers below it, never from a layer above.  Every module must belong to a layer.
"""

from __future__ import annotations

import ast
import re
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
SRC = ROOT / "src" / "wedgepath"
PACKAGE = "wedgepath"

#: Cycles known and scheduled for removal by a change outside this test's area.  Each
#: entry is the exact set of modules of one strongly connected component that is
#: tolerated for now; any other cycle -- including a larger one through these modules --
#: fails the test.
ALLOWED_CYCLES = []


# --------------------------------------------------------------------------- graph
def module_name(path: Path, src: Path = SRC, package: str = PACKAGE) -> str:
    rel = path.relative_to(src).with_suffix("")
    parts = [package, *rel.parts]
    if parts[-1] == "__init__":
        parts = parts[:-1]
    return ".".join(parts)


def _resolve(node: ast.ImportFrom, current: str, is_package: bool) -> str:
    if node.level == 0:
        return node.module or ""
    base = current.split(".")
    # the package a relative import starts from: the module's own package (or itself
    # when it is a package's __init__), then one level up per extra dot
    base = base if is_package else base[:-1]
    if node.level > 1:
        base = base[: len(base) - (node.level - 1)]
    return ".".join(base + ([node.module] if node.module else []))


def import_graph(src: Path = SRC, package: str = PACKAGE) -> dict:
    """``{module: set of wedgepath modules it imports}`` for every module under ``src``."""
    files = sorted(src.rglob("*.py"))
    modules = {module_name(f, src, package): f for f in files}
    graph = {m: set() for m in modules}
    for mod, path in modules.items():
        tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
        is_package = path.name == "__init__.py"
        for node in ast.walk(tree):
            targets = []
            if isinstance(node, ast.Import):
                targets = [a.name for a in node.names]
            elif isinstance(node, ast.ImportFrom):
                base = _resolve(node, mod, is_package)
                for a in node.names:
                    sub = f"{base}.{a.name}"
                    # "from package import submodule" imports the submodule; any other
                    # name is an attribute of the module or package itself
                    targets.append(sub if sub in modules else base)
            for t in targets:
                # "import a.b.c" depends on the deepest module of the name that exists
                while t and t not in modules:
                    t = t.rpartition(".")[0]
                if t.startswith(package) and t != mod:
                    graph[mod].add(t)
    return graph


def strongly_connected(graph: dict) -> list:
    """Strongly connected components (Tarjan's algorithm), as frozensets."""
    index, low, on_stack, stack, out = {}, {}, set(), [], []
    counter = [0]

    def visit(v):
        index[v] = low[v] = counter[0]
        counter[0] += 1
        stack.append(v)
        on_stack.add(v)
        for w in graph.get(v, ()):
            if w not in index:
                visit(w)
                low[v] = min(low[v], low[w])
            elif w in on_stack:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            comp = set()
            while True:
                w = stack.pop()
                on_stack.discard(w)
                comp.add(w)
                if w == v:
                    break
            out.append(frozenset(comp))

    for v in sorted(graph):
        if v not in index:
            visit(v)
    return out


def cycles(graph: dict, allowed=()) -> list:
    """Components with more than one module (or a module importing itself), minus ``allowed``."""
    bad = []
    for comp in strongly_connected(graph):
        if len(comp) > 1 or any(v in graph.get(v, ()) for v in comp):
            if comp not in set(allowed):
                bad.append(sorted(comp))
    return bad


# --------------------------------------------------------------------------- layers
def layers_from_developers_md(text: str) -> list:
    """``[(layer, [module prefixes])]`` lowest first, from the block between the markers."""
    m = re.search(r"<!-- layers: begin -->(.*?)<!-- layers: end -->", text, re.S)
    if not m:
        raise AssertionError("DEVELOPERS.md has no <!-- layers: begin --> ... end block")
    out = []
    for line in m.group(1).splitlines():
        mm = re.match(r"\s*(\d+)\.\s+(\w+):\s+(.+?)\s*(?:#.*)?$", line)
        if mm:
            names = [n.strip(" `") for n in mm.group(3).split(",") if n.strip(" `")]
            out.append((mm.group(2), names))
    return out


def layer_of(module: str, layers: list, package: str = PACKAGE):
    """Index of the layer a module belongs to (the most specific prefix wins), or None."""
    best, best_len = None, -1
    for i, (_, names) in enumerate(layers):
        for n in names:
            if n == "__init__" or n.endswith("/__init__"):
                # a package's own __init__ (a facade) only, not the modules under it;
                # it wins over a prefix of the same length ("calculus" vs "calculus/__init__")
                full = ".".join([package, *n.split("/")[:-1]])
                hit = module == full
                if hit:
                    best, best_len = i, len(full) + 1
                continue
            else:
                full = f"{package}.{n}"
                hit = module == full or module.startswith(full + ".")
            if hit:
                if len(full) > best_len:
                    best, best_len = i, len(full)
    return best


def upward_imports(graph: dict, layers: list, package: str = PACKAGE) -> list:
    bad = []
    for mod, deps in graph.items():
        a = layer_of(mod, layers, package)
        for d in deps:
            b = layer_of(d, layers, package)
            if a is not None and b is not None and b > a:
                bad.append(f"{mod} ({layers[a][0]}) imports {d} ({layers[b][0]})")
    return sorted(bad)


LAYERS = layers_from_developers_md((ROOT / "DEVELOPERS.md").read_text(encoding="utf-8"))
GRAPH = import_graph()


# --------------------------------------------------------------------------- the tree
def test_no_import_cycles():
    assert cycles(GRAPH, ALLOWED_CYCLES) == []


def test_the_allowed_cycle_is_still_needed():
    # an allow-list entry that no longer matches a cycle must be removed
    found = {c for c in strongly_connected(GRAPH) if len(c) > 1}
    for comp in ALLOWED_CYCLES:
        assert comp in found, f"{sorted(comp)} is no longer a cycle: drop it from ALLOWED_CYCLES"


def test_no_upward_imports_between_layers():
    assert upward_imports(GRAPH, LAYERS) == []


def test_every_module_belongs_to_a_layer():
    assert [m for m in GRAPH if layer_of(m, LAYERS) is None] == []


def test_symbolic_is_a_leaf():
    # the exact oracle depends on no other wedgepath module but the index algebra leaf
    assert GRAPH["wedgepath.symbolic"] <= {"wedgepath._exterior"}
    assert GRAPH["wedgepath._exterior"] == set()


def test_calculus_never_needs_the_planar_layer():
    for mod, deps in GRAPH.items():
        if mod.startswith("wedgepath.calculus"):
            assert not {d for d in deps if d.startswith("wedgepath.planar")}, mod


# --------------------------------------------------------------------------- the test itself
def _write(tmp_path, files: dict) -> Path:
    root = tmp_path / "pkg"
    for name, text in files.items():
        p = root / name
        p.parent.mkdir(parents=True, exist_ok=True)
        p.write_text(text, encoding="utf-8")
    return root


def test_graph_sees_relative_function_level_and_submodule_imports(tmp_path):
    root = _write(tmp_path, {
        "__init__.py": "from .low import a\n",
        "low/__init__.py": "",
        "low/a.py": "def f():\n    from ..high import b\n",
        "high/__init__.py": "from . import b\n",
        "high/b.py": "import pkg.low.a\nfrom pkg.low import a as alias\n",
    })
    g = import_graph(root, "pkg")
    assert g["pkg"] == {"pkg.low.a"}
    assert g["pkg.low.a"] == {"pkg.high.b"}              # function-level, relative
    assert g["pkg.high"] == {"pkg.high.b"}               # "from . import b" in a package
    assert g["pkg.high.b"] == {"pkg.low.a"}


def test_cycle_detection_on_a_synthetic_graph():
    g = {"w.cli": {"w.demo"}, "w.demo": {"w.cli", "w.io"}, "w.io": set(),
         "w.a": {"w.b"}, "w.b": {"w.c"}, "w.c": {"w.a"}, "w.self": {"w.self"}}
    allowed = [frozenset({"w.cli", "w.demo"})]
    assert cycles(g, allowed) == [["w.a", "w.b", "w.c"], ["w.self"]]
    # the allowed pair is allowed only as itself: a third module in the cycle fails
    g["w.io"] = {"w.cli"}
    assert ["w.cli", "w.demo", "w.io"] in cycles(g, allowed)
    # and without the allowance the pair itself fails
    assert ["w.cli", "w.demo"] in cycles({"w.cli": {"w.demo"}, "w.demo": {"w.cli"}})


def test_upward_import_detection_on_a_synthetic_graph():
    layers = layers_from_developers_md(
        "<!-- layers: begin -->\n 1. base: _util\n 2. calculus: calculus\n"
        " 3. planar: planar   # comment\n 4. edges: cli, io\n<!-- layers: end -->")
    assert [name for name, _ in layers] == ["base", "calculus", "planar", "edges"]
    g = {"w.calculus.x": {"w.planar.y", "w._util"}, "w.planar.y": {"w.calculus.x"},
         "w.cli": {"w.planar.y"}, "w._util": {"w.io"}}
    assert upward_imports(g, layers, "w") == [
        "w._util (base) imports w.io (edges)",
        "w.calculus.x (calculus) imports w.planar.y (planar)"]


def test_the_real_graph_is_not_empty():
    # guards the guards: the scan found the package and its layered imports
    assert len(GRAPH) > 30
    assert "wedgepath.calculus.forms" in GRAPH["wedgepath.calculus.integration"]
    assert any(d.startswith("wedgepath.calculus") for d in GRAPH["wedgepath.planar.green"])
    assert len(LAYERS) >= 6


@pytest.mark.parametrize("name", ["edges", "signals", "planar", "calculus"])
def test_developers_md_names_the_layers(name):
    assert name in [n for n, _ in LAYERS]


# --------------------------------------------------------------------------- threads
# Python imports a module by first taking that module's lock and only then importing its
# parent packages.  A package whose ``__init__`` imports its own submodules therefore
# deadlocks (``_DeadlockError``) when two threads of a fresh process import two of its
# submodules by their full names at the same time -- what unpickling does in the worker
# threads of a Dask cluster, and what a pytest-xdist run met.  The rule that prevents it:
# a package ``__init__`` imports no wedgepath module; its public names load on first
# attribute access (PEP 562 module ``__getattr__``).  Common practice, no source.

def _package_inits(src: Path = SRC):
    return sorted(src.rglob("__init__.py"))


def test_package_inits_import_no_module_of_their_own_package():
    graph = import_graph()
    for path in _package_inits():
        mod = module_name(path)
        own = sorted(d for d in graph[mod] if d.startswith(mod + "."))
        assert not own, (f"{mod} imports {own} in its __init__; list the names in the "
                         "export table of wedgepath/__init__.py instead")
    # the subpackages take their export table from the facade, which imports nothing
    assert graph["wedgepath"] == set()


# every module whose import needs no optional extra (no sympy, matplotlib, pandas, dask)
_LIGHT_SKIP = {"wedgepath.symbolic", "wedgepath.formula", "wedgepath.plotting",
               "wedgepath.report", "wedgepath.dask", "wedgepath.cli", "wedgepath.demo",
               "wedgepath.__main__", "wedgepath.io"}

_RACE = """
import sys, threading
mods = sys.argv[1:]
barrier = threading.Barrier(len(mods))
errors = []
def first_import(name):
    barrier.wait()
    try:
        __import__(name)
    except BaseException as exc:
        errors.append(f"{name}: {type(exc).__name__}: {exc}")
threads = [threading.Thread(target=first_import, args=(m,)) for m in mods]
for t in threads: t.start()
for t in threads: t.join(60)
assert not any(t.is_alive() for t in threads), "an import hangs"
print("\\n".join(errors) if errors else "ok")
"""


@pytest.mark.parametrize("mods", [
    # each set deadlocked or met a partially initialised package before the lazy inits
    ("wedgepath.signals.streaming", "wedgepath.signals._kernel"),
    ("wedgepath.calculus.forms", "wedgepath.calculus.paths"),
    ("wedgepath.planar.green", "wedgepath.planar.area"),
    ("wedgepath.signals.rolling", "wedgepath.calculus.chains"),
    "all",
], ids=["signals", "calculus", "planar", "across", "all"])
def test_concurrent_first_imports_in_a_fresh_process(mods):
    import subprocess
    import sys

    if mods == "all":           # every light module at once, one thread each
        mods = sorted(m for m in (module_name(p) for p in SRC.rglob("*.py"))
                      if m not in _LIGHT_SKIP)
    out = subprocess.run([sys.executable, "-c", _RACE, *mods], capture_output=True,
                         text=True, timeout=120)
    assert out.returncode == 0, out.stderr[-2000:]
    assert out.stdout.strip() == "ok", out.stdout
    # and the public names are all there afterwards
    probe = ("import threading, wedgepath as wp\n"
             "ts = [threading.Thread(target=getattr, args=(wp, n)) for n in wp.__all__]\n"
             "[t.start() for t in ts]; [t.join() for t in ts]\n"
             "missing = [n for n in wp.__all__ if not hasattr(wp, n)]\n"
             "print(missing or 'ok')")
    out = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True,
                         timeout=120)
    assert out.stdout.strip() == "ok", out.stdout + out.stderr[-2000:]
