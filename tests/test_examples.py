"""Every example script runs to completion as a plain script (they assert their own checks),
prints what it found, and the figures it says it saved show something."""

import os
import re
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
    for name in re.findall(r"^figure: (\S+)$", proc.stdout, flags=re.M):
        _check_figure(tmp_path / Path(name).name)


def _check_figure(png):
    mpimg = pytest.importorskip("matplotlib.image")
    assert png.exists(), f"the example says it saved {png.name}"
    img = mpimg.imread(png)[..., :3]
    h, w = img.shape[:2]
    assert h >= 300 and w >= 400, f"{png.name}: {w} x {h} pixels"
    assert img.std() > 0.05, f"{png.name}: nearly uniform"
    ink = (img.mean(axis=2) < 0.5).mean()
    assert 0.002 < ink < 0.6, f"{png.name}: dark share {ink:.3f}"


def test_every_example_is_a_gallery_example():
    """Each script opens with an RST title (sphinx-gallery shows it as the page title)."""
    for script in SCRIPTS:
        doc = script.read_text().split('"""')[1].strip().splitlines()
        assert len(doc) >= 2 and set(doc[1]) == {"="} and len(doc[1]) >= len(doc[0]), script.name
