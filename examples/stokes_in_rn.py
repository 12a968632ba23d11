"""
Stokes's theorem for a gait loop in five dimensions
===================================================

Invented scenario: a made-up walking robot's five joint angles trace a closed
loop per stride.  A state-dependent 2-form (a "curvature" weighting that
grows with two of the joints) is integrated over a surface spanning the loop
(the cone from the loop's centroid), and Stokes's theorem is checked in one
line: the integral of :math:`d\\omega` over the surface equals the integral of
:math:`\\omega` around the loop, both against the exact symbolic value.  The
same surface gives the oriented areas of every pair of joints.

Run it as a script: ``python examples/stokes_in_rn.py``.
"""

import numpy as np
import sympy as sp

import wedgepath as wp
from wedgepath import symbolic

from _common import figure_path, have_matplotlib


def stride(n_samples=240):
    s = np.linspace(0, 2 * np.pi, n_samples, endpoint=False)
    phases = np.array([0.0, 0.7, 1.5, 2.6, 3.9])
    amps = np.array([0.5, 0.4, 0.35, 0.3, 0.2])
    return amps * np.sin(s[:, None] - phases) + 0.05 * np.sin(2 * s[:, None])


# %%
# A surface spanning the loop
# ---------------------------
# ``wp.cone`` joins every segment of the closed loop to the centroid; the
# boundary of that 2-chain is exactly the closed loop.

q = stride()
path = wp.Path(q, names=[f"joint_{k}" for k in range(5)])
surface = wp.cone(path)
print(f"loop of {path.n_samples} samples in R^5; cone of {len(surface.simplices)} triangles")
assert surface.boundary() == path.close("chord")

# %%
# Stokes in one line
# ------------------
# A polynomial 1-form :math:`\omega`: both sides are computed by exact
# quadrature rules and compared with the exact rational value.

x = sp.symbols("x0:5", real=True)
w = wp.Form.from_sympy([x[1] * x[2], x[0] ** 2, sp.Integer(0), x[3] * x[0], x[4]], x)
lhs = wp.integrate(w.d(), surface)
rhs = wp.integrate(w, path, closure="chord")
exact = symbolic.polyline_integral([x[1] * x[2], x[0] ** 2, 0, x[3] * x[0], x[4]], x,
                                   q, closed=True)
print(f"integral of dw over the surface: {float(lhs): .15f} (exact method: {lhs.exact})")
print(f"integral of w around the loop:   {float(rhs): .15f} (exact method: {rhs.exact})")
print(f"exact rational value:            {float(exact): .15f}")
assert abs(float(lhs) - float(exact)) < 1e-12 and abs(float(rhs) - float(exact)) < 1e-12

# %%
# Oriented areas of every pair of joints
# --------------------------------------
# For the constant 2-form :math:`dx_i \wedge dx_j` every spanning surface
# gives the same value: the area matrix computed from the samples alone.

A = wp.area_matrix(q)
cone_A = np.array([[float(wp.integrate(wp.dx(i) ^ wp.dx(j), surface)) if i != j else 0.0
                    for j in range(5)] for i in range(5)])
print(f"area matrix from the samples vs integrals of dx_i^dx_j over the cone: max difference "
      f"{np.max(np.abs(A - cone_A)):.1e}")
assert np.allclose(A, cone_A, rtol=1e-12, atol=1e-14)
order = wp.cyclic_order(A)
print("joints in cyclic order:", " -> ".join(path.names[k] for k in order.order),
      f"(fit {order.fit:.3f})")

# %%
# A non-polynomial weighting
# --------------------------
# Adaptive quadrature on the surface, with an error estimate.

g = wp.TwoForm({(0, 1): lambda c: np.exp(-np.sum(c ** 2, axis=1))})
r = wp.integrate(g, surface)
print(f"integral of exp(-|q|^2) dx0^dx1 over the cone: {float(r):.10f} +- {r.error:.1e}")

# %%
# The stride and its lead matrix
# ------------------------------
# Left: the loop projected on the plane of the first two joints, with its
# direction.  Right: each joint's position in the stride's cycle (radians, one
# row per joint in cyclic order).

if have_matplotlib():
    import matplotlib.pyplot as plt
    from wedgepath import plotting
    fig, axes = plt.subplots(1, 2, figsize=(11, 4.5), dpi=100)
    plotting.loop_path(q[:, :2], names=("joint_0", "joint_1"), ax=axes[0],
                       title="one stride, joints 0 and 1")
    plotting.cycle_positions(order, names=path.names, ax=axes[1],
                             title="position of each joint in the cycle")
    fig.tight_layout()
    fig.savefig(figure_path("stokes_in_rn.png"))
    print(f"figure: {figure_path('stokes_in_rn.png').name}")
