"""Integration over simplicial chains and Stokes's theorem on cones in R^n."""

import math
import warnings

import numpy as np
import pytest
import sympy as sp
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra.numpy import arrays
from scipy import integrate as si

import wedgepath as wp
from wedgepath import symbolic


def random_poly_1form(draw, syms, max_deg=3):
    """A random polynomial 1-form with small integer coefficients."""
    monos = [sp.Integer(1)] + list(syms)
    comps = []
    for _ in syms:
        expr = sp.Integer(0)
        for _k in range(draw(st.integers(1, 3))):
            mono = sp.Integer(draw(st.integers(-3, 3)))
            for _d in range(draw(st.integers(0, max_deg))):
                mono *= draw(st.sampled_from(monos))
            expr += mono
        comps.append(sp.expand(expr))
    return comps


@st.composite
def form_and_loop(draw):
    n = draw(st.integers(3, 6))
    syms = sp.symbols(f"x0:{n}")
    comps = random_poly_1form(draw, syms)
    T = draw(st.integers(3, 7))
    ints = draw(arrays(np.int64, (T, n), elements=st.integers(-12, 12)))
    return comps, syms, ints.astype(float) / 4.0  # dyadic: exact in binary


# ------------------------------------------------------------------ Stokes
class TestStokes:
    @settings(max_examples=25, deadline=None)
    @given(form_and_loop())
    def test_surface_integral_of_dw_equals_loop_integral_R3_to_R6(self, case):
        comps, syms, X = case
        w = wp.Form.from_sympy(comps, syms)
        S = wp.cone(X)
        lhs = wp.integrate(w.d(), S)
        rhs = wp.integrate(w, S.boundary())
        # independent exact referee: the symbolic layer's rational line integral
        exact = float(symbolic.polyline_integral(comps, syms, X, closed=True))
        scale = 1.0 + abs(exact) + lhs.rounding + rhs.rounding
        assert lhs.exact and rhs.exact
        assert abs(float(lhs) - exact) <= 1e-11 * scale
        assert abs(float(rhs) - exact) <= 1e-11 * scale

    def test_surface_integral_against_symbolic_surface_integral(self):
        # the symbolic layer integrates the 2-form over each triangle exactly (pull-back)
        x, y, z = syms = sp.symbols("x y z")
        X = np.array([[0, 0, 0], [2, 1, 0], [1, 3, 1], [-1, 1, 2]], dtype=float) / 2
        eta = {(0, 1): x * y * z + 1, (0, 2): x ** 3, (1, 2): y ** 2 * z}
        S = wp.cone(X, apex=[0.25, 0.5, 0.75])
        exact = sum(symbolic.form_on_simplex(eta, syms, S.vertices[s]) for s in S.simplices)
        got = wp.integrate(wp.Form(eta, 2, 3, syms), S)
        assert got.exact
        assert float(got) == pytest.approx(float(exact), rel=1e-13)

    def test_user_surface_with_the_same_boundary(self):
        # a bumpy surface: every cone triangle split in three around a lifted point
        x, y, z = syms = sp.symbols("x y z")
        t = np.linspace(0, 2 * np.pi, 13)[:-1]
        X = np.column_stack([np.cos(t), np.sin(t), 0.5 * np.cos(3 * t)])
        C = wp.cone(X)
        V = C.vertices
        tri = C.simplices
        bumps = V[tri].mean(axis=1) + np.array([0.1, -0.2, 0.7])
        m = V.shape[0]
        idx = np.arange(len(tri)) + m
        user = np.concatenate([np.column_stack([tri[:, 0], tri[:, 1], idx]),
                               np.column_stack([tri[:, 1], tri[:, 2], idx]),
                               np.column_stack([tri[:, 2], tri[:, 0], idx])])
        U = wp.SimplicialChain(np.vstack([V, bumps]), user)
        assert U.boundary() == wp.Path(X).close("chord")
        comps = [y ** 2 * z, x * z ** 2 - y, x * y]
        w = wp.Form.from_sympy(comps, syms)
        exact = float(symbolic.polyline_integral(comps, syms, X, closed=True))
        assert float(wp.integrate(w.d(), U)) == pytest.approx(exact, rel=1e-12)
        # a constant 2-form does not see the surface; a non-closed 2-form does
        c2 = (wp.dx(0) ^ wp.dx(1)) - 2 * (wp.dx(1) ^ wp.dx(2))
        assert float(wp.integrate(c2, U)) == pytest.approx(float(wp.integrate(c2, C)), rel=1e-12)
        # for eta = z dx^dy (d eta = dx^dy^dz) the surfaces differ by the boundary of the
        # tetrahedra [a, b, c, bump]: ∂[a,b,c,p] = [b,c,p] + [c,a,p] + [a,b,p] - [a,b,c];
        # their signed volumes by determinants (common practice, no source)
        eta = wp.Form({(0, 1): z}, 2, 3, syms)
        P = np.vstack([V, bumps])
        tets = np.column_stack([tri, idx])
        vols = sum(np.linalg.det(P[t[1:]] - P[t[0]]) / 6 for t in tets)
        diff = float(wp.integrate(eta, U)) - float(wp.integrate(eta, C))
        assert abs(vols) > 0.1
        assert diff == pytest.approx(vols, rel=1e-12)
        T3 = wp.SimplicialChain(P, tets)
        assert T3.boundary() == U - C

    def test_stokes_for_0_forms_on_1_chains(self):
        xs = sp.symbols("x0:4")
        f = wp.ZeroForm(xs[0] * xs[1] ** 2 - xs[3] ** 3, symbols=xs)
        c = wp.SimplicialChain.from_chain(wp.Path(np.arange(20.0).reshape(5, 4) ** 0.5))
        assert float(wp.integrate(f.d(), c)) == pytest.approx(float(wp.integrate(f, c.boundary())),
                                                              rel=1e-13)

    def test_one_liner_from_the_docs(self):
        x, y, z = syms = sp.symbols("x y z")
        w = wp.Form.from_sympy([y * z, x ** 2, sp.Integer(0)], syms)
        t = np.linspace(0, 2 * np.pi, 50, endpoint=False)
        S = wp.cone(np.column_stack([np.cos(t), np.sin(t), 0.3 * np.sin(2 * t)]))
        assert float(wp.integrate(w.d(), S)) == pytest.approx(float(wp.integrate(w, S.boundary())),
                                                              rel=1e-12)


# ------------------------------------------------------------------ area matrix
class TestAreaMatrix:
    @settings(max_examples=20, deadline=None)
    @given(st.integers(3, 5).flatmap(
        lambda n: arrays(np.int64, (9, n), elements=st.integers(-20, 20))))
    def test_area_matrix_entries_are_cone_integrals(self, ints):
        X = ints.astype(float) / 8.0
        n = X.shape[1]
        S = wp.cone(X)
        A = wp.area_matrix(X)  # wedgepath.signals, closure "chord" by default
        for i in range(n):
            for j in range(n):
                if i == j:
                    continue
                on_cone = wp.integrate(wp.dx(i) ^ wp.dx(j), S)
                on_path = wp.integrate(wp.dx(i) ^ wp.dx(j), X)
                # exact: A[i, j] = (1/2) closed integral of (x_i dx_j - x_j dx_i)
                xs = sp.symbols(f"x0:{n}")
                comps = [sp.Integer(0)] * n
                comps[i], comps[j] = -xs[j] / 2, xs[i] / 2
                exact = float(symbolic.polyline_integral(comps, xs, X, closed=True))
                assert on_cone.exact
                assert float(on_cone) == pytest.approx(exact, rel=1e-13, abs=1e-13)
                assert float(on_cone) == pytest.approx(float(on_path), rel=1e-13, abs=1e-13)
                assert float(on_cone) == pytest.approx(A[i, j], rel=1e-12, abs=1e-12)

    def test_sinusoid_convention(self):
        # A[i, j] = pi sin(phi) per cycle for x_i = sin t, x_j = sin(t - phi) (DESIGN.md);
        # with N samples the polygon area is (N/2) sin(2 pi/N) sin(phi) (regular polygon
        # inscribed in the ellipse; common practice, no source)
        N, phi = 400, 0.7
        t = np.arange(N) * 2 * np.pi / N
        X = np.column_stack([np.sin(t), np.sin(t - phi), np.cos(3 * t)])
        got = float(wp.integrate(wp.dx(0) ^ wp.dx(1), wp.cone(X)))
        assert got == pytest.approx(N / 2 * np.sin(2 * np.pi / N) * np.sin(phi), rel=1e-12)


# ------------------------------------------------------------------ methods
class TestMethods:
    def test_constant_form_is_exact_by_determinants(self):
        S = wp.SimplicialChain([[0, 0, 0], [1, 0, 0], [0, 2, 0], [0, 0, 3]],
                               [[0, 1, 2], [0, 1, 3], [0, 2, 3]], [1, 2, -1])
        w = 2 * (wp.dx(0) ^ wp.dx(1)) + (wp.dx(0) ^ wp.dx(2)) - 5 * (wp.dx(1) ^ wp.dx(2))
        r = wp.integrate(w, S)
        # by hand: triangle 012 -> 2 * (1*2/2); 013 -> 2 * 1 * (1*3/2); 023 -> -(-5 * 2*3/2)
        assert r.exact and r.error == 0.0 and "determinants" in r.method
        assert float(r) == pytest.approx(2.0 + 3.0 + 15.0, rel=1e-15)

    def test_callable_2form_error_estimate_against_scipy(self):
        # triangle (0,0), (1,0), (0,1) and f = exp(x) cos(3 y): scipy's dblquad is the referee
        f = wp.TwoForm({(0, 1): lambda c: np.exp(c[:, 0]) * np.cos(3 * c[:, 1])})
        S = wp.SimplicialChain([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        r = wp.integrate(f, S, rtol=1e-12)
        ref, ref_err = si.dblquad(lambda y, x: math.exp(x) * math.cos(3 * y), 0, 1, 0,
                                  lambda x: 1 - x, epsabs=1e-14, epsrel=1e-14)
        assert not r.exact and r.evaluations > 0
        assert abs(float(r) - ref) <= max(r.error, 1e-13) + ref_err
        assert r.error < 1e-9

    def test_callable_over_cone_in_R4_against_scipy(self):
        # two triangles in R^4, each checked with dblquad on its own parametrisation
        V = np.array([[0.1, 0.2, 0.3, 0.4], [1.0, 0.0, 0.5, -0.2], [0.0, 1.2, -0.3, 0.9],
                      [0.7, 0.8, 0.1, 0.0]])
        simp = np.array([[0, 1, 2], [0, 2, 3]])
        g = lambda c: np.sin(c[:, 0] + c[:, 3]) * np.exp(c[:, 1])  # noqa: E731
        f = wp.TwoForm({(1, 3): g}, dim=4)
        r = wp.integrate(f, wp.SimplicialChain(V, simp, [1, -2]))
        ref = 0.0
        for (a, b, c), coef in zip(simp, (1, -2)):
            e1, e2 = V[b] - V[a], V[c] - V[a]
            det = e1[1] * e2[3] - e1[3] * e2[1]
            val, _ = si.dblquad(lambda v, u: g((V[a] + u * e1 + v * e2)[None])[0], 0, 1, 0,
                                lambda u: 1 - u, epsabs=1e-13, epsrel=1e-13)
            ref += coef * det * val
        assert float(r) == pytest.approx(ref, rel=1e-10, abs=1e-12)

    def test_adaptive_refines_a_sharp_feature(self):
        # narrow Gaussian at the origin: integral over the unit triangle at the corner
        # (quarter plane, exact enough): pi * s^2 / 4 (common practice, no source)
        s = 0.02
        f = wp.TwoForm({(0, 1): lambda c: np.exp(-(c[:, 0] ** 2 + c[:, 1] ** 2) / s ** 2)})
        S = wp.SimplicialChain([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        r = wp.integrate(f, S, rtol=1e-10)
        assert float(r) == pytest.approx(math.pi * s ** 2 / 4, rel=1e-8)
        assert r.error < 1e-9

    @pytest.mark.parametrize("k", [3, 4])
    def test_callable_over_a_standard_simplex_against_its_closed_form(self, k):
        # ∫ over the standard k-simplex of exp(x_1 + ... + x_k) = ∫_0^1 e^s s^(k-1)/(k-1)! ds
        # (the slices sum x = s have volume s^(k-1)/(k-1)!); ∫_0^1 s^2 e^s = e - 2 and
        # ∫_0^1 s^3 e^s = 6 - 2e by parts (by hand)
        S = wp.SimplicialChain(np.vstack([np.zeros(k), np.eye(k)]), [list(range(k + 1))])
        w = wp.Form({tuple(range(k)): lambda c: np.exp(c.sum(axis=1))}, k, k)
        r = wp.integrate(w, S)
        exact = (math.e - 2) / 2 if k == 3 else (6 - 2 * math.e) / 6
        assert abs(float(r) - exact) <= r.error + r.rounding
        assert r.error <= 1e-10 * exact

    def test_tolerance_not_reached_warns(self):
        f = wp.TwoForm({(0, 1): lambda c: np.abs(c[:, 0] - 0.3) ** 0.5})
        S = wp.SimplicialChain([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        with pytest.warns(wp.IntegrationWarning):
            r = wp.integrate(f, S, rtol=1e-15, max_levels=2)
        assert r.error > 0

    def test_degenerate_simplices_give_zero_without_warning(self):
        V = [[0, 0, 0], [1, 1, 1], [2, 2, 2], [1, 0, 0]]
        S = wp.SimplicialChain(V, [[0, 1, 2], [0, 0, 3]])  # collinear; repeated vertex
        f = wp.TwoForm({(0, 1): lambda c: np.cos(c[:, 0]), (1, 2): 3.0})
        with warnings.catch_warnings():
            warnings.simplefilter("error")
            assert float(wp.integrate(f, S)) == 0.0
            assert float(wp.integrate(wp.dx(0) ^ wp.dx(2), S)) == 0.0

    def test_0_forms_on_0_chains(self):
        c = wp.SimplicialChain([[0, 0], [1, 2], [3, 1]], [[0], [1], [2]], [1, -2, 3])
        f = wp.ZeroForm(lambda p: p[:, 0] + p[:, 1] ** 2)
        assert float(wp.integrate(f, c)) == pytest.approx(0 - 2 * 5 + 3 * 4)
        assert float(wp.integrate(wp.ZeroForm(2.0), c)) == pytest.approx(4.0)

    def test_3_chains_volume_and_boundary(self):
        # k = 3 works the same way: volume of a tetrahedron = det / 6 (common practice)
        V = np.array([[0, 0, 0], [2, 0, 0], [0, 3, 0], [0, 0, 5], [1, 1, 1]], dtype=float)
        T = wp.SimplicialChain(V, [[0, 1, 2, 3], [4, 1, 2, 3]], [1, 1])
        vol = wp.integrate(wp.dx(0) ^ wp.dx(1) ^ wp.dx(2), T)
        det2 = np.linalg.det(V[[1, 2, 3]] - V[4])
        assert float(vol) == pytest.approx(30 / 6 + det2 / 6, rel=1e-14)
        assert T.boundary().boundary() == 0
        x, y, z = xs = sp.symbols("x y z")
        w = wp.Form({(0, 1): x * z ** 2, (1, 2): y ** 3}, 2, 3, xs)
        assert float(wp.integrate(w.d(), T)) == pytest.approx(float(wp.integrate(w, T.boundary())),
                                                              rel=1e-12)

    def test_complex_is_not_a_domain(self):
        cx = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        with pytest.raises(TypeError, match="de_rham"):
            wp.integrate(wp.dx(0) ^ wp.dx(1), cx)

    def test_empty_chain(self):
        e = wp.SimplicialChain([[0.0, 0.0]], np.zeros((0, 3), dtype=int))
        assert float(wp.integrate(wp.dx(0) ^ wp.dx(1), e)) == 0.0


# ------------------------------------------------------------------ bad input
class TestBadInput:
    S = wp.cone([[0.0, 0.0, 0.0], [1.0, 0.0, 1.0], [0.0, 1.0, 2.0]])

    def test_degree_mismatch(self):
        with pytest.raises(ValueError, match="1-form cannot be integrated over a 2-chain"):
            wp.integrate(wp.dx(0), self.S)
        with pytest.raises(ValueError, match="2-form cannot be integrated over a 1-chain"):
            wp.integrate(wp.dx(0) ^ wp.dx(1), self.S.boundary())

    def test_dimension_mismatch(self):
        x = sp.symbols("x0:4")
        with pytest.raises(ValueError, match="R\\^4.*R\\^3"):
            wp.integrate(wp.Form({(0, 1): x[3]}, 2, 4, x), self.S)
        with pytest.raises(ValueError, match="dx5"):
            wp.integrate(wp.dx(0) ^ wp.dx(5), self.S)

    def test_path_options_refused(self):
        with pytest.raises(ValueError, match="closure"):
            wp.integrate(wp.dx(0) ^ wp.dx(1), self.S, closure="chord")
        with pytest.raises(ValueError, match="curve"):
            wp.integrate(wp.dx(0) ^ wp.dx(1), self.S, curve="spline")

    def test_non_finite_callable(self):
        f = wp.TwoForm({(0, 1): lambda c: np.log(c[:, 0] - 10)})
        with pytest.raises(ValueError, match="not finite"):
            wp.integrate(f, self.S)

    def test_non_constant_2_form_over_a_path_in_R3_points_to_cone(self):
        f = wp.TwoForm({(0, 1): lambda c: c[:, 2]})
        with pytest.raises(ValueError, match="cone"):
            wp.integrate(f, [[0.0, 0.0, 0.0], [1.0, 0.0, 1.0], [0.0, 1.0, 2.0]])
