"""Write the intersphinx inventories in this folder (the docs build reads no network).

The documentation links to numpy, scipy, pandas, sympy, shapely, matplotlib and the
Python standard library through Sphinx's intersphinx extension.  The build uses the
``*.inv`` files committed next to this script, so it needs no network.  They were made
by this script, in one of three ways per project (see README.md for which one each
committed file came from):

``--from-url``
    Download the project's own ``objects.inv`` (needs the network; the preferred way).
``--from-file PROJECT=PATH``
    Copy an ``objects.inv`` found on disk, e.g. in a Debian ``python-*-doc`` package
    (``apt-get download python-scipy-doc && dpkg-deb -x ...``), then add the public names
    of the *installed* package that the older inventory lacks, where the inventory itself
    shows the URL pattern for that submodule (scipy), and the top-level aliases of
    documented objects (sympy: ``sympy.lambdify`` -> ``sympy.utilities.lambdify.lambdify``).
``--generate PROJECT``
    No inventory available: list the public objects of the installed package and give
    each the URL its project's documentation uses for such objects.  The URL patterns are
    typed from memory of those sites, not checked against them (no network here);
    re-run with ``--from-url`` where the network allows.

Run from the repository root, for example::

    python docs/_intersphinx/build_inventories.py --generate shapely
    python docs/_intersphinx/build_inventories.py --from-file scipy=/tmp/scipy-objects.inv
"""

from __future__ import annotations

import argparse
import importlib
import inspect
import re
import sys
import urllib.request
import zlib
from pathlib import Path

HERE = Path(__file__).resolve().parent

# project -> (documentation root the links point to, project name in the inventory header)
PROJECTS = {
    "python": ("https://docs.python.org/3/", "Python"),
    "numpy": ("https://numpy.org/doc/stable/", "NumPy"),
    "scipy": ("https://docs.scipy.org/doc/scipy/", "SciPy"),
    "pandas": ("https://pandas.pydata.org/docs/", "pandas"),
    "sympy": ("https://docs.sympy.org/latest/", "SymPy"),
    "shapely": ("https://shapely.readthedocs.io/en/stable/", "Shapely"),
    "matplotlib": ("https://matplotlib.org/stable/", "Matplotlib"),
}

_LINE = re.compile(r"(.+?)\s+(\S+)\s+(-?\d+)\s+?(\S*)\s+(.*)")


def target(project: str) -> Path:
    return HERE / f"{project}-objects.inv"


# ---------------------------------------------------------------------------------------
# reading and writing the inventory format (version 2: four header lines, zlib body)

def read_inventory(data: bytes):
    """Header fields and entry lines ``(name, type, priority, uri, dispname)``."""
    lines = data.split(b"\n", 4)
    if not lines[0].startswith(b"# Sphinx inventory version 2"):
        raise ValueError("not a version 2 Sphinx inventory")
    project = lines[1].decode()[len("# Project: "):]
    version = lines[2].decode()[len("# Version: "):]
    body = zlib.decompress(lines[4]).decode()
    entries = []
    for line in body.splitlines():
        m = _LINE.match(line.rstrip())
        if m:
            entries.append(m.groups())
    return project, version, entries


def write_inventory(path: Path, project: str, version: str, entries) -> None:
    seen, body = set(), []
    for name, typ, prio, uri, disp in entries:
        if (name, typ) in seen:
            continue
        seen.add((name, typ))
        body.append(f"{name} {typ} {prio} {uri} {disp}")
    header = (f"# Sphinx inventory version 2\n# Project: {project}\n# Version: {version}\n"
              "# The remainder of this file is compressed using zlib.\n").encode()
    path.write_bytes(header + zlib.compress(("\n".join(body) + "\n").encode(), 9))
    print(f"wrote {path.relative_to(HERE.parent.parent)} ({len(body)} entries)")


# ---------------------------------------------------------------------------------------
# supplements for an older inventory

def _public(module):
    names = getattr(module, "__all__", None)
    if names is None:
        names = [n for n in dir(module) if not n.startswith("_")]
    return [n for n in names if not n.startswith("_")]


def supplement_scipy(entries):
    """Add public functions and classes of the installed scipy that the inventory lacks.

    Only for submodules whose existing entries all follow one URL pattern
    (``reference/generated/<full name>.html#<full name>``): the pattern is taken from the
    inventory itself, not assumed.
    """
    have = {e[0] for e in entries}
    by_module = {}
    for name, typ, _, uri, _ in entries:
        if typ in ("py:function", "py:class") and name.count(".") == 2:
            mod = name.rsplit(".", 1)[0]
            ok = uri == f"reference/generated/{name}.html#{name}" or uri.endswith("#$")
            by_module.setdefault(mod, []).append(ok)
    added = []
    for mod, oks in sorted(by_module.items()):
        if len(oks) < 5 or not all(oks):
            continue
        try:
            module = importlib.import_module(mod)
        except ImportError:
            continue
        for n in _public(module):
            obj = getattr(module, n, None)
            typ = ("py:class" if inspect.isclass(obj) else
                   "py:function" if callable(obj) else None)
            full = f"{mod}.{n}"
            if typ and full not in have:
                added.append((full, typ, "1", f"reference/generated/{full}.html#$", "-"))
    return entries + added, len(added)


def supplement_sympy(entries):
    """Add ``sympy.<name>`` aliases for top-level names documented under their full path."""
    import sympy
    index = {}
    for e in entries:
        index.setdefault(e[0], e)
    added = []
    for n in _public(sympy):
        obj = getattr(sympy, n, None)
        mod = getattr(obj, "__module__", None)
        if not mod or not (inspect.isclass(obj) or inspect.isfunction(obj)):
            continue
        full = f"{mod}.{getattr(obj, '__name__', n)}"
        alias = f"sympy.{n}"
        if full in index and alias not in index:
            _, typ, prio, uri, _ = index[full]
            uri = uri.replace("#$", "#" + full)
            added.append((alias, typ, prio, uri, "-"))
    return entries + added, len(added)


SUPPLEMENTS = {"scipy": supplement_scipy, "sympy": supplement_sympy}


# ---------------------------------------------------------------------------------------
# generated inventories (no inventory to be had)

def _kind(obj):
    if isinstance(obj, type):
        return "py:class"
    if callable(obj):
        return "py:function"
    return None


def generate_shapely():
    import shapely
    entries = [("shapely", "py:module", "0", "index.html#module-shapely", "-")]
    for n in _public(shapely):
        obj = getattr(shapely, n, None)
        if _kind(obj) and not inspect.ismodule(obj):
            full = f"shapely.{n}"
            entries.append((full, _kind(obj), "1", f"reference/{full}.html#$", "-"))
    return shapely.__version__, entries


GENERATORS = {"shapely": generate_shapely}


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--from-url", nargs="*", default=[], metavar="PROJECT")
    ap.add_argument("--from-file", nargs="*", default=[], metavar="PROJECT=PATH")
    ap.add_argument("--generate", nargs="*", default=[], metavar="PROJECT")
    args = ap.parse_args(argv)
    for project in args.from_url:
        url = PROJECTS[project][0] + "objects.inv"
        with urllib.request.urlopen(url, timeout=30) as resp:  # noqa: S310 - fixed https URLs
            data = resp.read()
        read_inventory(data)  # refuse anything that is not an inventory
        target(project).write_bytes(data)
        print(f"downloaded {url}")
    for item in args.from_file:
        project, _, path = item.partition("=")
        name, version, entries = read_inventory(Path(path).read_bytes())
        if project in SUPPLEMENTS:
            entries, n_added = SUPPLEMENTS[project](entries)
            version = f"{version} (+{n_added} names of the installed package)"
        write_inventory(target(project), name, version, entries)
    for project in args.generate:
        version, entries = GENERATORS[project]()
        write_inventory(target(project), PROJECTS[project][1],
                        f"{version} (generated from the installed package)", entries)


if __name__ == "__main__":
    sys.exit(main())
