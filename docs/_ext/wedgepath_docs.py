"""Sphinx extension of the wedgepath docs.

* Every public name must have a reference page.  After all pages are read, every name in
  ``wedgepath.__all__`` and in the ``__all__`` of the public submodules
  (:data:`PUBLIC_MODULES`) must be a documented Python object (an entry of an
  ``autosummary`` table in ``docs/reference/``, which generates its page).  A missing one
  is a warning, which ``make docs`` (``-W``) turns into an error: the reference cannot
  fall behind the code silently.
* A cross-reference to a public object by the path of the module that defines it
  (``wedgepath.signals.AreaAccumulator``, ``wedgepath.calculus.paths.Path``) resolves to
  its page under the public name (``wedgepath.AreaAccumulator``).
* A constant whose only docstring is that of its built-in type (a tuple, a str: Python's
  "Built-in immutable sequence...") gets a one-line description instead
  (:data:`CONSTANT_DOCS`, or a generic line for a constant not listed there).
* Reference pages left in ``docs/reference/generated/`` by an earlier build for a name that
  is no longer public are removed before the build reads its sources (otherwise a local
  build fails on a page that is in no table of contents until ``make clean``).  Only pages
  this extension's templates wrote (a name underlined by ``=``, then ``.. currentmodule::``)
  are touched.
* Module docstrings are not run through numpydoc, so their numpydoc section headings
  (``Examples`` underlined by dashes) would become document sections, whose names clash
  between modules; they are turned into rubrics, as numpydoc does for functions.

Importing this module needs no Sphinx (the test suite uses :func:`public_names`).
"""

from __future__ import annotations

import importlib
import inspect
import re

#: modules whose ``__all__`` the reference must cover
PUBLIC_MODULES = ("wedgepath", "wedgepath.io", "wedgepath.symbolic", "wedgepath.formula",
                  "wedgepath.report", "wedgepath.plotting", "wedgepath.dask")


#: one-line descriptions of public constants that cannot carry a docstring of their own
CONSTANT_DOCS = {
    "wedgepath.__version__": "The version of this wedgepath installation.",
    "wedgepath.CLOSURES": "The closure conventions accepted by ``closure=`` arguments "
                          "(see :doc:`/conventions`).",
    "wedgepath.NORMALIZATIONS": "The normalisations accepted by ``normalize=`` of "
                                ":func:`wedgepath.area_matrix`.",
    "wedgepath.SURROGATE_METHODS": "The surrogate methods accepted by ``method=`` of "
                                   ":func:`wedgepath.surrogate_test`.",
    "wedgepath.plotting.DIVERGING": "Name of the diverging colour map of the lead-matrix "
                                    "figures (teal: lagging, orange: leading).",
}


def public_names():
    """Fully qualified public names: ``wedgepath.Path``, ``wedgepath.io.read_table``, ..."""
    names = []
    for modname in PUBLIC_MODULES:
        module = importlib.import_module(modname)
        names += [f"{modname}.{n}" for n in module.__all__]
        for n in module.__all__:          # a public module's own names (wp.filters.bandpass)
            obj = getattr(module, n)
            if isinstance(obj, type(importlib)):
                names += [f"{obj.__name__}.{m}" for m in getattr(obj, "__all__", ())]
    return names


def check_public_names_documented(app, env):
    from sphinx.util import logging

    documented = set(env.get_domain("py").objects)
    missing = [n for n in public_names() if n not in documented]
    if missing:
        logging.getLogger(__name__).warning(
            "public names without a reference page (add them to an autosummary table in "
            "docs/reference/): %s", ", ".join(missing), type="wedgepath", subtype="api-coverage")


def _import(path):
    """The object named by a dotted path, or None."""
    parts = path.split(".")
    for cut in range(len(parts), 0, -1):
        try:
            obj = importlib.import_module(".".join(parts[:cut]))
        except ImportError:
            continue
        try:
            for attr in parts[cut:]:
                obj = getattr(obj, attr)
        except AttributeError:
            return None
        return obj
    return None


def _public_index():
    index = {}
    for name in public_names():
        obj = _import(name)
        if obj is not None and (callable(obj) or isinstance(obj, type)):
            index.setdefault(id(obj), name)
    return index


def resolve_defining_path(app, env, node, contnode):
    """``wedgepath.signals.X`` (or ``...X.attr``) -> the page of the public ``wedgepath.X``."""
    if node.get("refdomain") != "py":
        return None
    target = node.get("reftarget", "")
    if not target.startswith("wedgepath.") or target in env.get_domain("py").objects:
        return None
    if not hasattr(env, "_wedgepath_public_index"):
        env._wedgepath_public_index = _public_index()
    parts = target.split(".")
    for cut in range(len(parts), 1, -1):  # the longest prefix that is a public object
        obj = _import(".".join(parts[:cut]))
        public = env._wedgepath_public_index.get(id(obj)) if obj is not None else None
        if public is None:
            continue
        new_target = ".".join([public, *parts[cut:]])
        if new_target == target:
            return None
        domain = env.get_domain("py")
        return domain.resolve_xref(env, node.get("refdoc"), app.builder, node["reftype"],
                                   new_target, node, contnode)
    return None


def describe_constants(app, what, name, obj, options, lines):
    if what not in ("data", "attribute") or not lines:
        return
    own = " ".join(" ".join(lines).split())
    builtin = " ".join((type(obj).__doc__ or "").split())
    if own == builtin:
        lines[:] = [CONSTANT_DOCS.get(name, "A constant; its value is shown above."), ""]


def remove_stale_reference_pages(app):
    from pathlib import Path

    folder = Path(app.srcdir) / "reference" / "generated"
    if not folder.is_dir():
        return
    public = set(public_names())
    for page in folder.glob("*.rst"):
        lines = page.read_text(encoding="utf-8-sig").splitlines()  # autosummary may write a BOM
        is_stub = (len(lines) >= 4 and lines[0] == page.stem and set(lines[1]) == {"="}
                   and lines[3].startswith(".. currentmodule::"))
        if is_stub and page.stem not in public:
            page.unlink()


_SECTION = re.compile(r"^-{3,}$")


def module_sections_to_rubrics(app, what, name, obj, options, lines):
    if what != "module":
        return
    for k in range(len(lines) - 1):
        title, rule = lines[k], lines[k + 1]
        if title.strip() and _SECTION.match(rule.strip()) and len(rule.strip()) >= len(title.strip()) \
                and (k == 0 or not lines[k - 1].strip()):
            lines[k] = f".. rubric:: {title.strip()}"
            lines[k + 1] = ""


def setup(app):
    app.connect("builder-inited", remove_stale_reference_pages)
    app.connect("env-check-consistency", check_public_names_documented)
    app.connect("missing-reference", resolve_defining_path)
    app.connect("autodoc-process-docstring", module_sections_to_rubrics, priority=400)
    app.connect("autodoc-process-docstring", describe_constants, priority=400)  # before numpydoc
    return {"version": "1", "parallel_read_safe": True, "parallel_write_safe": True}
