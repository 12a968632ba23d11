"""``import wedgepath`` (and its command line) leaves the heavy modules unloaded.

sympy, scipy.interpolate, pandas and tqdm are imported only by the calls that need
them; that keeps the streamed command line within its memory budget (see
benchmarks/bench_streaming.py).  Checked in a fresh interpreter, since this
test session has long since imported everything.
"""

import json
import subprocess
import sys

import pytest

HEAVY = ["sympy", "scipy.interpolate", "scipy.stats", "pandas", "matplotlib", "pyarrow", "dask",
         "tqdm"]


def loaded_after(code):
    probe = (f"{code}\nimport json, sys\n"
             f"print(json.dumps([m for m in {HEAVY!r} if m in sys.modules]))")
    out = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True, check=True)
    return json.loads(out.stdout.strip().splitlines()[-1])


@pytest.mark.parametrize("code", ["import wedgepath", "import wedgepath.cli",
                                  "import wedgepath.io", "import wedgepath.dask"])
def test_import_leaves_heavy_modules_unloaded(code):
    assert loaded_after(code) == []


def test_symbolic_layer_loads_on_first_use():
    code = ("import wedgepath as wp\n"
            "assert wp.symbolic.__name__ == 'wedgepath.symbolic'\n"
            "assert callable(wp.formula.parse_formula)")
    assert loaded_after(code) == ["sympy"]


def test_sympy_coefficients_still_work_after_lazy_import():
    code = ("import wedgepath as wp, sympy as sp\n"
            "x, y = sp.symbols('x y')\n"
            "w = wp.OneForm([-y / 2, x / 2], symbols=(x, y))\n"
            "I = wp.integrate(w, wp.Path([[0, 0], [1, 0], [1, 1], [0, 1]]), closure='chord')\n"
            "assert abs(float(I) - 1.0) < 1e-14, float(I)\n"
            "assert w.d().terms_as_dict() == {(0, 1): 1}, w.d().terms_as_dict()")
    assert "sympy" in loaded_after(code)
