"""Sphinx configuration of the wedgepath documentation site.

Build with ``make docs`` (warnings are errors; output in ``docs/_build/html``).  The build
reads no network: intersphinx uses the inventories committed in ``_intersphinx/``.
"""

from __future__ import annotations

import os
import sys
from pathlib import Path

import wedgepath

DOCS = Path(__file__).resolve().parent
sys.path.insert(0, str(DOCS / "_ext"))

# The gallery runs every example; they write their figure files into the build folder (not
# into the source tree) and show no progress indicators on stderr.
os.environ.setdefault("WEDGEPATH_EXAMPLE_OUT", str(DOCS / "_build" / "example-output"))
os.environ["WEDGEPATH_PROGRESS"] = "0"
os.environ.setdefault("MPLBACKEND", "Agg")

project = "wedgepath"
author = "wedgepath developers"
copyright = "wedgepath developers, BSD 3-Clause licence"  # noqa: A001 - Sphinx's name
release = wedgepath.__version__
version = release

extensions = [
    "sphinx.ext.autodoc",
    "sphinx.ext.autosummary",
    "sphinx.ext.intersphinx",
    "sphinx.ext.mathjax",
    "numpydoc",
    "myst_parser",
    "sphinx_gallery.gen_gallery",
    "sphinxarg.ext",
    "wedgepath_docs",  # _ext/: checks that every public name has a reference page
]

source_suffix = {".rst": "restructuredtext", ".md": "markdown"}
root_doc = "index"
exclude_patterns = ["_build", "_intersphinx", "_templates", "_ext", "figures",
                    "auto_examples/*.ipynb", "auto_examples/*.py", "auto_examples/*.zip",
                    "auto_examples/*.md5", "auto_examples/*.json"]
templates_path = ["_templates"]

# Every cross-reference must resolve (warnings are errors in `make docs`).
nitpicky = True
nitpick_ignore = [
    # roles in docstrings that point at names with no page of their own: a helper that is
    # not public (its docstring is not part of the reference), a private module, and an
    # attribute listed in a class's "Attributes" section (rendered as a list, not a target)
    ("py:func", "politis_white_block"),
    ("py:mod", "wedgepath._time"),
    ("py:attr", "indices"),
]

# -- Markdown pages (MyST) ----------------------------------------------------------------
myst_enable_extensions = ["dollarmath", "amsmath", "colon_fence", "deflist"]
# myst_heading_anchors = 3
myst_dmath_double_inline = True

# -- API reference ------------------------------------------------------------------------
autosummary_generate = True
autosummary_imported_members = False
autodoc_typehints = "none"          # numpydoc sections carry the types
autodoc_member_order = "groupwise"
autodoc_preserve_defaults = True
numpydoc_show_class_members = False  # the class template lists members with autodoc
numpydoc_class_members_toctree = False
numpydoc_xref_param_type = False     # parameter types are free text ("(T, n) array_like")
numpydoc_attributes_as_param_list = True

# -- links to other projects (offline) -----------------------------------------------------
_INV = DOCS / "_intersphinx"
intersphinx_mapping = {
    "python": ("https://docs.python.org/3/", str(_INV / "python-objects.inv")),
    "numpy": ("https://numpy.org/doc/stable/", str(_INV / "numpy-objects.inv")),
    "scipy": ("https://docs.scipy.org/doc/scipy/", str(_INV / "scipy-objects.inv")),
    "pandas": ("https://pandas.pydata.org/docs/", str(_INV / "pandas-objects.inv")),
    "sympy": ("https://docs.sympy.org/latest/", str(_INV / "sympy-objects.inv")),
    "shapely": ("https://shapely.readthedocs.io/en/stable/", str(_INV / "shapely-objects.inv")),
    "matplotlib": ("https://matplotlib.org/stable/", str(_INV / "matplotlib-objects.inv")),
}

# -- gallery ------------------------------------------------------------------------------
sphinx_gallery_conf = {
    "examples_dirs": str(DOCS.parent / "examples"),
    "gallery_dirs": "auto_examples",
    # every example runs during the build (not only plot_*.py); helpers and the data
    # generator are not examples
    "filename_pattern": r"\.py$",
    "ignore_pattern": r"(__init__|_common|generate_demo_data)\.py$",
    "within_subsection_order": "FileNameSortKey",
    "image_scrapers": ("matplotlib",),
    "remove_config_comments": True,
    "download_all_examples": False,
    "show_memory": False,
    "min_reported_time": 1,
    "first_notebook_cell": None,
    "copyfile_regex": r"_common\.py$",
    "matplotlib_animations": False,
}

# -- HTML ---------------------------------------------------------------------------------
html_theme = "pydata_sphinx_theme"
html_title = f"wedgepath {release}"
html_static_path = ["_static"]
html_css_files = ["wedgepath.css"]
html_show_sourcelink = True
html_theme_options = {
    "navigation_with_keys": False,
    "show_toc_level": 2,
    "navbar_align": "left",
    "header_links_before_dropdown": 4,
    "footer_start": ["copyright"],
    "footer_end": ["sphinx-version"],
}
# the top-level pages have no section navigation of their own: give the text the room
html_sidebars = {"*": [], "auto_examples/index": []}
