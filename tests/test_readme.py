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


def test_readme_commands_match_makefile_and_ci():
    text = README.read_text()
    makefile = (README.parent / "Makefile").read_text()
    ci = (README.parent / ".ci" / "run").read_text()
    assert "make demo\nmake test\n" in text
    assert re.search(r"^demo:", makefile, flags=re.M) and re.search(r"^test:", makefile, flags=re.M)
    assert "make test" in ci
