"""The documentation stays true: its code runs and states the right output, its figures
show what they should, its links resolve, and the API reference covers every public name.

Every fenced ``python`` block of docs/*.md is a doctest (``>>>`` prompts with the output
they state); the blocks of one page run in order in one namespace, like a notebook, in a
temporary folder.  Code that is not meant to run is fenced as ``text`` (or ``sh`` for
shell commands), so it is plainly not Python to run.  A page whose block is not a doctest
fails, as does a stated output that the code no longer prints.
"""

from __future__ import annotations

import doctest
import importlib
import re
import sys
from pathlib import Path

import numpy as np
import pytest

ROOT = Path(__file__).resolve().parents[1]
DOCS = ROOT / "docs"
PAGES = sorted(p.name for p in DOCS.glob("*.md"))

# a fenced block: opening fence of 3+ backticks with an info string, the body, the same fence
FENCE = re.compile(r"^(?P<fence>`{3,})(?P<info>[^`\n]*)\n(?P<body>.*?)^(?P=fence)[ \t]*$",
                   re.M | re.S)
PYTHON_INFOS = {"python", "py", "python3", "pycon", "{code-block} python", "{code} python"}
FLAGS = doctest.ELLIPSIS | doctest.NORMALIZE_WHITESPACE


def fenced_blocks(text):
    """``(info, body, line number of the body's first line)`` of every fenced block."""
    for m in FENCE.finditer(text):
        yield m.group("info").strip(), m.group("body"), text.count("\n", 0, m.start("body")) + 1


def python_blocks(page):
    text = (DOCS / page).read_text()
    return [(body, line) for info, body, line in fenced_blocks(text)
            if info.lower() in PYTHON_INFOS]


# ---------------------------------------------------------------------------------------
# the checker itself must be able to fail: a wrong stated output, and a block that is not
# a doctest, are both reported

def _run_page_blocks(blocks, name, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    monkeypatch.setenv("WEDGEPATH_PROGRESS", "0")
    parser = doctest.DocTestParser()
    runner = doctest.DocTestRunner(optionflags=FLAGS)
    globs = {"__name__": f"docs.{name}"}
    report = []
    not_doctests = []
    for body, line in blocks:
        if not body.lstrip().startswith(">>>"):
            not_doctests.append(line)
            continue
        test = parser.get_doctest(body, globs, f"{name}:{line}", str(DOCS / name), line - 1)
        test.globs = globs  # get_doctest copies; the page's blocks share one namespace
        runner.run(test, out=report.append, clear_globs=False)
    return runner.summarize(verbose=False), "".join(report), not_doctests


def test_doc_checker_catches_wrong_output_and_plain_code(tmp_path, monkeypatch):
    blocks = [(">>> y = 1 + 1\n>>> y\n3\n", 1), ("x = 1\n", 5), (">>> print(y)\n2\n", 9)]
    result, report, plain = _run_page_blocks(blocks, "fake.md", tmp_path, monkeypatch)
    assert result.attempted == 3 and result.failed == 1  # the third block sees y
    assert "Expected:\n    3\nGot:\n    2" in report
    assert plain == [5]


SLOW_PAGES = {"scale.md"}  # starts a dask LocalCluster of two worker processes (2-5 s)


@pytest.mark.parametrize("page", [pytest.param(p, marks=[pytest.mark.slow] if p in SLOW_PAGES else [])
                                  for p in PAGES if python_blocks(p)])
def test_page_python_blocks(page, tmp_path, monkeypatch):
    """Every ``python`` block of the page runs and prints what the page says it prints."""
    blocks = python_blocks(page)
    result, report, plain = _run_page_blocks(blocks, page, tmp_path, monkeypatch)
    assert not plain, (f"{page}: the python blocks at lines {plain} are not doctests; write "
                       "them as >>> examples with their output, or fence them as text")
    assert result.failed == 0, report
    assert result.attempted > 0


def test_pages_with_python_code_are_tested():
    """The pages that show Python code (the guide, the topic pages) are all collected above."""
    with_code = {p for p in PAGES if python_blocks(p)}
    assert {"guide.md", "integration.md", "planar.md", "signals.md", "stokes_and_dec.md",
            "scale.md"} <= with_code


# ---------------------------------------------------------------------------------------
# figures of the guide: drawn by docs/make_figures.py, checked by what they show

def _load_make_figures():
    sys.path.insert(0, str(DOCS))
    try:
        return importlib.import_module("make_figures")
    finally:
        sys.path.pop(0)


FIGURES = {  # name: number of panels
    "orientation": 2,
    "closure": 3,
    "curve_model": 1,
    "gaps": 1,
}


def _image_stats(png):
    import matplotlib.image as mpimg
    img = mpimg.imread(png)[..., :3]
    return img.shape[:2], float(img.std()), float((img.mean(axis=2) < 0.5).mean())


@pytest.fixture(scope="module")
def drawn(tmp_path_factory):
    """The guide's figures drawn afresh: ``({name: Figure}, folder of the PNG files)``."""
    pytest.importorskip("matplotlib")
    folder = tmp_path_factory.mktemp("figures")
    return _load_make_figures().main(folder, reports=False), folder


def test_convention_figures_draw_what_they_say(drawn):
    figs, tmp_path = drawn
    assert sorted(figs) == sorted(FIGURES)
    for name, n_axes in FIGURES.items():
        fig = figs[name]
        assert len(fig.axes) == n_axes, name
        for ax in fig.axes:
            assert ax.get_title(), f"{name}: every panel has a title"
            drawn = len(ax.lines) + len(ax.patches) + len(ax.collections) + len(ax.texts)
            assert drawn >= 1, f"{name}: an empty panel"
        (h, w), spread, dark = _image_stats(tmp_path / f"{name}.png")
        width_in, height_in = fig.get_size_inches()
        assert (h, w) == (round(height_in * fig.dpi), round(width_in * fig.dpi)), name
        assert spread > 0.05, f"{name}: the image is nearly uniform"
        assert 0.002 < dark < 0.5, f"{name}: dark pixels (ink) {dark:.3f} of the image"
    # the areas stated in the titles are those of the curves drawn
    left, right = figs["orientation"].axes
    assert "A[x, y] > 0" in left.get_title() and "A[x, y] < 0" in right.get_title()
    for ax, sign in ((left, 1), (right, -1)):
        stated = _stated(r"A = (-?\d+\.\d+)", ax.get_title())
        drawn = _shoelace(ax.lines[0].get_xydata())
        assert np.sign(drawn) == sign and abs(drawn - stated) < 6e-4
        # sin t against sin(t - phi), |phi| = 1, one cycle: pi sin 1 (the ellipse area of
        # two sinusoids; common practice, no source; derived in docs/theory.md, section 5)
        assert abs(abs(drawn) - np.pi * np.sin(1.0)) < 2e-3
    for ax in figs["closure"].axes[:2]:
        stated = _stated(r"area (-?\d+\.\d+)", ax.get_title())
        assert abs(_shoelace(ax.lines[1].get_xydata()) - stated) < 6e-4
    assert "refused" in figs["closure"].axes[2].texts[0].get_text()
    gaps = figs["gaps"].axes[0]
    pieces = [_stated(r"area (-?\d+\.\d+)", t.get_text()) for t in gaps.get_legend().get_texts()]
    assert len(pieces) == 3
    assert abs(sum(pieces) - _stated(r"total (-?\d+\.\d+)", gaps.get_title())) < 0.015
    ellipse = figs["curve_model"].axes[0]
    # an ellipse of semi-axes 1 and 0.6 has area 0.6 pi (closed form)
    assert abs(_stated(r"area (\d+\.\d+)", ellipse.get_title()) - 0.6 * np.pi) < 1e-4


def _stated(pattern, text):
    m = re.search(pattern, text)
    assert m, f"no {pattern!r} in {text!r}"
    return float(m.group(1))


def _shoelace(xy):
    xy = xy[~np.isnan(xy).any(axis=1)]
    x, y = xy[:, 0], xy[:, 1]
    return 0.5 * float(np.sum(x * np.roll(y, -1) - np.roll(x, -1) * y))


def test_committed_figures_match_the_script(drawn):
    """docs/figures/*.png are what make_figures.py draws now (same size, same picture)."""
    _, tmp_path = drawn
    for name in FIGURES:
        (h1, w1), s1, d1 = _image_stats(DOCS / "figures" / f"{name}.png")
        (h2, w2), s2, d2 = _image_stats(tmp_path / f"{name}.png")
        assert (h1, w1) == (h2, w2), name
        # fonts may render a pixel differently between machines; the picture may not change
        assert abs(s1 - s2) < 0.01 and abs(d1 - d2) < 0.01, name


REPORT_FIGURES = {  # name: panels with data (colour bars and empty grid cells aside)
    "leadlag_positions": 1,
    "leadlag_pairs": 1,
    "leadlag_rolling": 6,
    "loop_load_test": 2,
    "loop_cycles": 1,
    "loop_figure_eight": 2,
}


@pytest.fixture(scope="module")
def drawn_reports(tmp_path_factory):
    """The report figures of docs/cli.md and the guide drawn afresh (about 10 s)."""
    pytest.importorskip("matplotlib")
    folder = tmp_path_factory.mktemp("report_figures")
    return _load_make_figures().report_figures(folder), folder


@pytest.mark.slow
def test_report_figures_show_the_demo(drawn_reports):
    from wedgepath.demo import RING_ORDER
    figs, folder = drawn_reports
    assert sorted(figs) == sorted(REPORT_FIGURES)
    for name, n_axes in REPORT_FIGURES.items():
        panels = [ax for ax in figs[name].axes if ax.get_title(loc="left")]
        assert len(panels) == n_axes, name
        (h, w), spread, dark = _image_stats(folder / f"{name}.png")
        assert spread > 0.05 and 0.002 < dark < 0.5, name
    # the positions chart lists the taps in the recovered order: a rotation of the true one
    rows = [t.get_text() for t in figs["leadlag_positions"].axes[0].get_yticklabels()]
    k = RING_ORDER.index(rows[0])
    assert rows == RING_ORDER[k:] + RING_ORDER[:k]
    # the loop figure of the load test: clockwise, cycles shaded, the known value drawn
    left, right = figs["loop_load_test"].axes[:2]
    assert "clockwise" in left.get_title(loc="left")
    assert any("known value" in t.get_text() for t in right.get_legend().get_texts())
    # the figure-eight's faces are drawn on their own axes, which say they are detrended
    titles = [ax.get_title(loc="left") for ax in figs["loop_figure_eight"].axes]
    assert any("Faces by winding number" in t and "detrend" in t for t in titles)


@pytest.mark.slow
def test_committed_report_figures_match_the_script(drawn_reports):
    _, folder = drawn_reports
    for name in REPORT_FIGURES:
        (h1, w1), s1, d1 = _image_stats(DOCS / "figures" / f"{name}.png")
        (h2, w2), s2, d2 = _image_stats(folder / f"{name}.png")
        assert (h1, w1) == (h2, w2), name
        assert abs(s1 - s2) < 0.01 and abs(d1 - d2) < 0.01, name


@pytest.mark.parametrize("page, figures", [
    ("cli.md", list(REPORT_FIGURES)),
    ("guide.md", ["leadlag_positions", "leadlag_pairs", "loop_load_test"]),
])
def test_pages_show_the_report_figures(page, figures):
    text = (DOCS / page).read_text()
    for name in figures:
        assert f"(figures/{name}.png)" in text, (page, name)


# ---------------------------------------------------------------------------------------
# links and the API reference

@pytest.mark.parametrize("page", PAGES)
def test_links_and_images_exist(page):
    text = (DOCS / page).read_text()
    for target in re.findall(r"\]\(([^)#]+)\)", text):
        if "://" in target:
            continue
        assert (DOCS / target).exists() or (DOCS / (target.removesuffix(".rst") + ".py")).exists() \
            or target.startswith("auto_examples/"), f"{page} links to missing {target}"


def _reference_entries():
    """Names listed in the autosummary tables of docs/reference/, fully qualified."""
    entries = set()
    for page in (DOCS / "reference").glob("*.md"):
        module = None
        in_table = False
        for line in page.read_text().splitlines():
            m = re.match(r"\.\. currentmodule:: (\S+)", line.strip())
            if m:
                module = m.group(1)
            if line.strip().startswith(".. autosummary::"):
                in_table = True
                continue
            if in_table:
                if line.startswith("```") or (line.strip() and not line.startswith("   ")):
                    in_table = False
                elif line.strip() and not line.strip().startswith(":"):
                    entries.add(f"{module}.{line.strip()}")
    return entries


def test_every_public_name_is_in_the_api_reference():
    """Each name of wedgepath.__all__ and of the public submodules has an autosummary entry
    (which gives it a generated page); the docs build checks the same on the built site."""
    sys.path.insert(0, str(DOCS / "_ext"))
    try:
        from wedgepath_docs import public_names
    finally:
        sys.path.pop(0)
    listed = _reference_entries()
    missing = [n for n in public_names() if n not in listed]
    assert not missing, f"add to an autosummary table in docs/reference/: {missing}"
    extra = sorted(n for n in listed if n not in set(public_names()))
    assert not extra, f"listed in docs/reference/ but not public: {extra}"
