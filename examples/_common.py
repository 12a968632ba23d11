"""Shared helpers for the example scripts: where to put figures."""

import os
from pathlib import Path


def figure_path(name: str):
    """Where an example saves its figure (``$WEDGEPATH_EXAMPLE_OUT`` or ./example-output)."""
    folder = Path(os.environ.get("WEDGEPATH_EXAMPLE_OUT", "example-output"))
    folder.mkdir(parents=True, exist_ok=True)
    return folder / name


def have_matplotlib() -> bool:
    try:
        import matplotlib
        matplotlib.use("Agg")
        return True
    except ImportError:
        return False
