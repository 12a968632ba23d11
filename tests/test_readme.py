"""The README's Python examples run as written."""

import re
from pathlib import Path

README = Path(__file__).resolve().parents[1] / "README.md"


def test_readme_python_blocks_run():
    text = README.read_text()
    blocks = re.findall(r"```python\n(.*?)```", text, flags=re.S)
    assert blocks, "README has no python example"
    for code in blocks:
        namespace = {}
        exec(compile(code, str(README), "exec"), namespace)  # noqa: S102 - our own README


def test_readme_links_exist():
    text = README.read_text()
    links = [t for t in re.findall(r"\]\(([^)#]+)\)", text) if "://" not in t]
    assert "docs/guide.md" in links and "docs/index.md" in links
    for target in links:
        assert (README.parent / target).exists(), f"README links to missing {target}"


def test_readme_commands_match_makefile_and_ci():
    text = README.read_text()
    makefile = (README.parent / "Makefile").read_text()
    ci = (README.parent / ".ci" / "run").read_text()
    assert "make demo\nmake test\n" in text
    assert re.search(r"^demo:", makefile, flags=re.M) and re.search(r"^test:", makefile, flags=re.M)
    assert "make test" in ci
    # the documentation site: README says how, the Makefile builds it, CI runs it
    assert "make docs\n" in text
    assert re.search(r"^docs:", makefile, flags=re.M) and "-W" in makefile
    assert "make docs" in ci
