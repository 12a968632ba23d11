"""Render the bad-input table of docs/reliability.md from the rows of the test suite.

The rows (``ROWS``, ``CLASSES``) live by feature in ``tests/reliability/``, where each is also a
test (``tests/test_reliability_table.py::test_row``); this script writes the generated part
of the page, between the BEGIN/END markers, and leaves the rest of the page alone::

    make reliability-table          # or: .venv/bin/python docs/reliability_table.py

``tests/test_reliability_table.py::test_doc_table_is_current`` fails when the committed page
differs from what ``render()`` gives.
"""

from __future__ import annotations

import re
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
DOC = ROOT / "docs" / "reliability.md"
BEGIN = "<!-- BEGIN GENERATED TABLE (docs/reliability_table.py) -->"
END = "<!-- END GENERATED TABLE -->"

if str(ROOT / "tests") not in sys.path:
    sys.path.insert(0, str(ROOT / "tests"))
from reliability import CLASSES, ROWS, Row  # noqa: E402 - the rows live with the tests


def _cell(text):
    return str(text).replace("|", "\\|").replace("\n", " ")


def _outcome_text(r: Row):
    if r.raises == "exit 2":
        return "exit code 2, one line on stderr, no files"
    if r.raises is None:
        return "returns (documented)"
    return r.raises.__name__


def render() -> str:
    """The generated part of docs/reliability.md."""
    apis = []
    for r in ROWS:
        if r.api not in apis:
            apis.append(r.api)
    out = [BEGIN, "", f"{len(ROWS)} rows, {len(apis)} calls; each row is one test in "
           "`tests/test_reliability_table.py::test_row`.", "",
           "### Coverage by class of bad input", "",
           "| call | " + " | ".join(CLASSES) + " |",
           "|---|" + "---|" * len(CLASSES)]
    for api in apis:
        have = {r.cls for r in ROWS if r.api == api}
        out.append(f"| `{_cell(api)}` | " + " | ".join("x" if c in have else "" for c in CLASSES)
                   + " |")
    out += ["", "Classes: " + "; ".join(f"**{k}** = {v}" for k, v in CLASSES.items()) + ".", "",
            "### Every row", "",
            "| call | class | bad input | outcome | message contains / documented result |",
            "|---|---|---|---|---|"]
    for r in ROWS:
        out.append(f"| `{_cell(r.api)}` | {r.cls} | {_cell(r.given)} | {_outcome_text(r)} | "
                   f"{_cell(r.match)} |")
    out += ["", END]
    return "\n".join(out) + "\n"


def current_doc_table() -> str | None:
    """The generated part of docs/reliability.md as committed (None without markers)."""
    text_ = DOC.read_text(encoding="utf-8") if DOC.exists() else ""
    m = re.search(re.escape(BEGIN) + ".*?" + re.escape(END) + "\n", text_, flags=re.S)
    return m.group(0) if m else None


def write_doc():
    """Replace the generated part of docs/reliability.md by ``render()``."""
    text_ = DOC.read_text(encoding="utf-8")
    m = re.search(re.escape(BEGIN) + ".*?" + re.escape(END) + "\n", text_, flags=re.S)
    if m is None:
        raise SystemExit(f"{DOC} has no generated-table markers ({BEGIN} ... {END})")
    DOC.write_text(text_[:m.start()] + render() + text_[m.end():], encoding="utf-8")


def main():
    write_doc()
    print(f"wrote {len(ROWS)} rows to {DOC}", file=sys.stderr)


if __name__ == "__main__":
    main()
