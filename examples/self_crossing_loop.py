"""
Region integrals of loops that cross themselves
===============================================

A made-up pick-and-place arm traces a figure-eight while settling, and then
a loop that winds twice around a fixture.  For each, the example splits the
plane into faces with their winding numbers, lists the lobes, and integrates
a polynomial weight over the winding-weighted region exactly, checking it
against the symbolic layer (exact rational arithmetic).

Run it as a script: ``python examples/self_crossing_loop.py``.
"""

import numpy as np
import sympy as sp

import wedgepath as wp
from wedgepath import symbolic

from _common import figure_path, have_matplotlib


def report(name, xy):
    dec = wp.decompose(xy)
    print(f"\n{name}: {len(xy)} samples, {len(dec.faces)} faces, {len(dec.lobes)} lobes")
    print(f"  signed area   {dec.signed_area: .6f}   (shoelace: {wp.signed_area(xy): .6f})")
    print(f"  absolute area {dec.absolute_area: .6f}")
    print("  area by winding number: "
          + ", ".join(f"{k}: {v:.4f}" for k, v in sorted(dec.area_by_winding.items())))
    for lobe in dec.lobes:
        print(f"    lobe {lobe.sign:+d}: signed area {lobe.signed_area: .6f}")
    if dec.mixed_signs:
        print(f"  lobes of opposite sign cancel: {100 * dec.cancellation:.0f}% of the absolute area")
    x, y = sp.symbols("x y", real=True)
    weight = x**2 + y
    num = wp.region_integral(weight, xy, symbols=(x, y))
    exact = symbolic.polygon_region_integral(weight, (x, y), xy)
    print(f"  region integral of x^2 + y: {float(num): .12f} (exact rational value "
          f"{float(exact): .12f}; method exact: {num.exact})")
    assert abs(float(num) - float(exact)) <= 1e-12 * max(1.0, abs(float(exact)))
    return dec


# %%
# A figure-eight
# --------------
# Two lobes of opposite sign: the net signed area is about zero although the
# loop encloses a lot.  The decomposition says so.

s = np.linspace(0, 2 * np.pi, 400, endpoint=False)
eight = np.c_[np.sin(s), 0.6 * np.sin(s) * np.cos(s)]
d1 = report("figure-eight", eight)
assert d1.mixed_signs and len(d1.lobes) == 2

# %%
# A loop with an inner loop
# -------------------------
# A limaçon :math:`r = 1/2 + \cos s` winds twice around the points of its
# inner loop.

r = 0.5 + np.cos(s)
limacon = np.c_[r * np.cos(s), r * np.sin(s)]
d2 = report("loop with an inner loop (limaçon)", limacon)
assert max(d2.area_by_winding) == 2

q = np.array([[-0.3, 0.0], [0.3, 0.0], [1.2, 0.3]])  # outside, inner loop, outer loop
w = wp.winding_number(limacon, q)
print(f"\nwinding numbers of the limaçon at {q.tolist()}: {w.tolist()}")
assert w.tolist() == [0, 2, 1]

# %%
# The faces, coloured by winding number
# -------------------------------------

if have_matplotlib():
    import matplotlib.pyplot as plt
    from wedgepath import plotting
    fig, axes = plt.subplots(1, 2, figsize=(10, 4.5), dpi=100)
    plotting.loop_faces(d1, ax=axes[0], title="figure-eight")
    plotting.loop_faces(d2, ax=axes[1], title="limaçon")
    fig.tight_layout()
    fig.savefig(figure_path("self_crossing_loop.png"))
    print(f"figure: {figure_path('self_crossing_loop.png').name}")
