"""Every example script runs to completion (they assert their own checks)."""

import os
import subprocess
import sys
from pathlib import Path

import pytest

EXAMPLES = Path(__file__).resolve().parents[1] / "examples"
SCRIPTS = sorted(p for p in EXAMPLES.glob("*.py")
                 if not p.name.startswith("_") and p.name != "generate_demo_data.py")


@pytest.mark.parametrize("script", SCRIPTS, ids=lambda p: p.name)
def test_example_runs(script, tmp_path):
    env = dict(os.environ, MPLBACKEND="Agg", WEDGEPATH_EXAMPLE_OUT=str(tmp_path),
               WEDGEPATH_PROGRESS="0")
    proc = subprocess.run([sys.executable, script.name], cwd=EXAMPLES, env=env,
                          capture_output=True, text=True, timeout=600)
    assert proc.returncode == 0, proc.stdout[-2000:] + proc.stderr[-2000:]
    assert proc.stdout.strip(), "an example should print what it found"
