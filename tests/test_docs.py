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


def test_convention_figures_draw(tmp_path):
    pytest.importorskip("matplotlib")
    proc = subprocess.run([sys.executable, str(DOCS / "make_figures.py"), str(tmp_path)],
                          capture_output=True, text=True, timeout=300)
    assert proc.returncode == 0, proc.stderr
    for name in ("orientation", "closure", "curve_model", "gaps"):
        assert (tmp_path / f"{name}.png").stat().st_size > 10_000


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
