"""The documentation stays true: API reference current, figures drawable, links valid."""

import re
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
DOCS = ROOT / "docs"


def test_api_reference_is_current():
    sys.path.insert(0, str(DOCS))
    try:
        import make_api
    finally:
        sys.path.pop(0)
    assert (DOCS / "api.md").read_text() == make_api.render(), \
        "docs/api.md is out of date: run python docs/make_api.py"


REPORT_FIGURES = ["leadlag_positions.png", "leadlag_pairs.png", "leadlag_rolling.png",
                  "loop_load_test.png", "loop_cycles.png", "loop_figure_eight.png"]


@pytest.mark.slow   # about 15 s: the script draws every figure of the docs, as a user would
def test_figures_draw(tmp_path):
    pytest.importorskip("matplotlib")
    from matplotlib.image import imread
    proc = subprocess.run([sys.executable, str(DOCS / "make_figures.py"), str(tmp_path),
                           "--quick"], capture_output=True, text=True, timeout=300)
    assert proc.returncode == 0, proc.stderr
    names = ["orientation.png", "closure.png", "curve_model.png", "gaps.png", *REPORT_FIGURES]
    assert sorted(p.name for p in tmp_path.iterdir()) == sorted(names)
    for name in names:
        img = imread(tmp_path / name)
        # a real picture: a sensible size, and ink on it (not one flat colour)
        assert 300 <= img.shape[0] <= 2000 and 400 <= img.shape[1] <= 2000, (name, img.shape)
        assert img[..., :3].std() > 0.05, name
        # the committed copy is the same drawing (same size in pixels)
        assert imread(DOCS / "figures" / name).shape == img.shape, name


@pytest.mark.parametrize("page, figures", [
    ("cli.md", REPORT_FIGURES),
    ("guide.md", ["leadlag_positions.png", "leadlag_pairs.png", "loop_load_test.png"]),
])
def test_pages_show_the_report_figures(page, figures):
    text = (DOCS / page).read_text()
    for name in figures:
        assert f"(figures/{name})" in text, (page, name)


@pytest.mark.parametrize("page", sorted(p.name for p in DOCS.glob("*.md")))
def test_links_and_images_exist(page):
    text = (DOCS / page).read_text()
    for target in re.findall(r"\]\(([^)#]+)\)", text):
        if "://" in target:
            continue
        assert (DOCS / target).exists(), f"{page} links to missing {target}"


def test_guide_python_blocks_run():
    text = (DOCS / "guide.md").read_text()
    for code in re.findall(r"```python\n(.*?)```", text, flags=re.S):
        exec(compile(code, "guide.md", "exec"), {})  # noqa: S102 - our own docs
