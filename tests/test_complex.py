"""SimplicialComplex: boundary/coboundary, de Rham, Whitney forms, Hodge star on curves."""

import numpy as np
import pytest
import scipy.sparse as sps
import sympy as sp
from hypothesis import assume, given, settings
from hypothesis import strategies as st
from hypothesis.extra.numpy import arrays

import wedgepath as wp
from wedgepath import symbolic


def ro(a):
    a = np.array(a)
    a.flags.writeable = False
    return a


@st.composite
def cone_complexes(draw):
    n = draw(st.integers(2, 5))
    T = draw(st.integers(3, 9))
    ints = draw(arrays(np.int64, (T, n), elements=st.integers(-30, 30)))
    X = ints.astype(float) / 8.0
    S = wp.cone(X, apex=np.full(n, 0.0625) + np.arange(n) / 64.0)  # apex off the curve
    # a loop through two distinct samples cones to one triangle twice: not a complex
    assume(len(S.reduced()) == len(S))
    return S, wp.SimplicialComplex.from_chain(S)


def random_mesh(seed, nv=12, n=3):
    """A small 2-complex: triangles of a random point set (a fan-free, non-manifold mix)."""
    rng = np.random.default_rng(seed)
    V = rng.normal(size=(nv, n))
    tris = set()
    while len(tris) < 2 * nv:
        t = tuple(rng.choice(nv, 3, replace=False))
        if tuple(sorted(t)) not in {tuple(sorted(s)) for s in tris}:
            tris.add(t)
    return V, np.array(sorted(tris))


# ------------------------------------------------------------------ matrices
class TestMatrices:
    @settings(max_examples=30, deadline=None)
    @given(cone_complexes())
    def test_dd_is_zero_and_boundary_boundary_is_zero(self, case):
        _, cx = case
        assert isinstance(cx.boundary_matrix(1), sps.spmatrix) or sps.issparse(cx.boundary_matrix(1))
        assert (cx.boundary_matrix(1) @ cx.boundary_matrix(2)).count_nonzero() == 0
        assert (cx.coboundary(1) @ cx.coboundary(0)).count_nonzero() == 0

    @settings(max_examples=30, deadline=None)
    @given(cone_complexes(), st.integers(0, 2 ** 32 - 1))
    def test_discrete_stokes_exact(self, case, seed):
        # <d c, σ> = <c, ∂σ>, with ∂σ computed by the chain code (face enumeration),
        # independently of the matrices; integer cochains make it exact
        S, cx = case
        rng = np.random.default_rng(seed)
        for k in (0, 1):
            sigma = cx.chain(rng.integers(-5, 6, cx.shape[k + 1]), k + 1)
            c = rng.integers(-9, 10, cx.shape[k]).astype(float)
            lhs = (cx.coboundary(k) @ c) @ cx.chain_vector(sigma)
            rhs = c @ cx.chain_vector(sigma.boundary())
            assert lhs == rhs
            np.testing.assert_array_equal(cx.boundary_matrix(k + 1) @ cx.chain_vector(sigma),
                                          cx.chain_vector(sigma.boundary()))
        # the cone's own chain vector is all ones, its boundary the closed loop
        assert (cx.chain_vector(S) == 1).all()

    def test_small_complex_by_hand(self):
        cx = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        # ∂[0,1,2] = [1,2] - [0,2] + [0,1]; edges stored sorted: 01, 02, 12
        assert cx.simplices(1).tolist() == [[0, 1], [0, 2], [1, 2]]
        assert cx.boundary_matrix(2).toarray().ravel().tolist() == [1, -1, 1]
        assert cx.boundary_matrix(1).toarray().tolist() == [[-1, -1, 0], [1, 0, -1], [0, 1, 1]]

    def test_top_orientation_kept(self):
        cx = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1]], [[0, 2, 1]])  # clockwise
        assert cx.boundary_matrix(2).toarray().ravel().tolist() == [-1, 1, -1]
        assert cx.de_rham(wp.dx(0) ^ wp.dx(1)).tolist() == [-0.5]

    def test_general_mesh(self):
        V, tris = random_mesh(0)
        cx = wp.SimplicialComplex(V, tris)
        assert (cx.boundary_matrix(1) @ cx.boundary_matrix(2)).count_nonzero() == 0
        # Euler characteristic bookkeeping: every edge of a triangle is in the complex
        assert cx.shape[2] == len(tris)
        assert cx.shape[1] == len({tuple(sorted(e)) for t in tris for e in
                                   [(t[0], t[1]), (t[0], t[2]), (t[1], t[2])]})

    def test_tetrahedral_complex(self):
        # k = 3 works the same way; volumes are det / 6 (common practice, no source)
        rng = np.random.default_rng(4)
        V = rng.normal(size=(7, 3))
        tets = np.array([[0, 1, 2, 3], [1, 2, 3, 4], [2, 3, 4, 5], [6, 2, 0, 1]])
        cx = wp.SimplicialComplex(V, tets)
        for k in (1, 2):
            assert (cx.boundary_matrix(k) @ cx.boundary_matrix(k + 1)).count_nonzero() == 0
        ch = cx.chain([1, -2, 3, 1], 3)
        np.testing.assert_array_equal(cx.boundary_matrix(3) @ cx.chain_vector(ch),
                                      cx.chain_vector(ch.boundary()))
        vols = [np.linalg.det(V[t[1:]] - V[t[0]]) / 6 for t in tets]
        np.testing.assert_allclose(cx.de_rham(wp.dx(0) ^ wp.dx(1) ^ wp.dx(2)), vols, rtol=1e-13)
        for k in range(4):
            c = rng.normal(size=cx.shape[k])
            np.testing.assert_allclose(cx.de_rham(cx.whitney(c, k)), c, atol=1e-12)

    def test_path_complex(self):
        p = wp.Path([[0, 0], [1, 0], [np.nan, np.nan], [5, 5], [6, 5], [6, 6], [7, 7],
                     [np.nan, np.nan], [9, 9]])
        cx = wp.SimplicialComplex.from_path(p)
        assert cx.vertex_rows.tolist() == [0, 1, 3, 4, 5, 6]
        assert cx.simplices(1).tolist() == [[0, 1], [2, 3], [3, 4], [4, 5]]
        closed = wp.SimplicialComplex.from_path(p, closure="chord")
        assert closed.simplices(1).tolist() == [[0, 1], [2, 3], [3, 4], [4, 5], [5, 2]]
        # the chain of the closed path is a cycle in the complex
        z = closed.chain_vector(wp.SimplicialChain.from_chain(p, closure="chord"))
        assert (closed.boundary_matrix(1) @ z == 0).all()


# ------------------------------------------------------------------ de Rham
class TestDeRham:
    @settings(max_examples=15, deadline=None)
    @given(cone_complexes(), st.integers(0, 2 ** 32 - 1))
    def test_de_rham_commutes_with_d(self, case, seed):
        # Stokes on every simplex: R(dω) = d R(ω)
        _, cx = case
        n = cx.dim
        xs = sp.symbols(f"x0:{n}")
        rng = np.random.default_rng(seed)
        c = [int(v) for v in rng.integers(-3, 4, size=3)]
        f = c[0] * xs[0] * xs[1] ** 2 + c[1] * xs[-1] ** 3 + c[2]
        phi = wp.ZeroForm(f, symbols=xs)
        w = wp.Form.from_sympy([xs[(i + 1) % n] ** 2 * xs[i] + c[i % 3] for i in range(n)], xs)
        for form, k in ((phi, 0), (w, 1)):
            lhs = cx.de_rham(form.d())
            rhs = cx.coboundary(k) @ cx.de_rham(form)
            scale = 1.0 + np.abs(lhs).max()
            np.testing.assert_allclose(lhs, rhs, rtol=0, atol=1e-12 * scale)

    def test_de_rham_against_symbolic(self):
        x, y, z = xs = sp.symbols("x y z")
        V, tris = random_mesh(1, nv=6, n=3)
        cx = wp.SimplicialComplex(V, tris)
        eta = {(0, 1): x * y + z ** 2, (1, 2): x ** 3}
        got = cx.de_rham(wp.Form(eta, 2, 3, xs))
        exact = [float(symbolic.form_on_simplex(eta, xs, V[t])) for t in cx.simplices(2)]
        np.testing.assert_allclose(got, exact, rtol=1e-12, atol=1e-14)

    def test_de_rham_callable_with_errors(self):
        cx = wp.SimplicialComplex.from_chain(wp.cone([[0, 0], [1, 0], [1, 1], [0, 1]]))
        w = wp.OneForm([lambda c: np.cos(c[:, 1]), lambda c: 0 * c[:, 0]])
        vals, errs = cx.de_rham(w, return_error=True)
        # edge [a, b] with constant y: integral of cos(y) dx = cos(y) (x_b - x_a)
        E = cx.simplices(1)
        V = cx.vertices
        flat = V[E[:, 0], 1] == V[E[:, 1], 1]
        np.testing.assert_allclose(vals[flat], np.cos(V[E[flat, 0], 1]) *
                                   (V[E[flat, 1], 0] - V[E[flat, 0], 0]), rtol=1e-12, atol=1e-14)
        assert errs.shape == vals.shape and (errs >= 0).all()

    def test_bad_degree(self):
        cx = wp.SimplicialComplex.from_path([[0.0, 0.0], [1.0, 1.0]])
        with pytest.raises(ValueError, match="out of range"):
            cx.de_rham(wp.dx(0) ^ wp.dx(1))
        with pytest.raises(ValueError, match="degrees must match|cannot be integrated"):
            cx.de_rham(wp.dx(0), k=0)
        with pytest.raises(TypeError, match="Form"):
            cx.de_rham("dx0")


# ------------------------------------------------------------------ Whitney
def well_shaped(cx):
    """Whitney forms need non-degenerate triangles: True for well-shaped ones only."""
    T = cx.vertices[cx.simplices(2)]
    e1, e2 = T[:, 1] - T[:, 0], T[:, 2] - T[:, 0]
    gram = (e1 * e1).sum(1) * (e2 * e2).sum(1) - (e1 * e2).sum(1) ** 2
    return bool((gram > 1e-4 * (e1 * e1).sum(1) * (e2 * e2).sum(1)).all())


class TestWhitney:
    @settings(max_examples=20, deadline=None)
    @given(cone_complexes(), st.integers(0, 2 ** 32 - 1))
    def test_whitney_then_de_rham_is_identity(self, case, seed):
        # Whitney 1957 (ch. IV §27) / Dodziuk 1976: ∫_τ W(c) = c_τ on every simplex
        _, cx = case
        assume(well_shaped(cx))
        rng = np.random.default_rng(seed)
        for k in range(3):
            c = rng.normal(size=cx.shape[k])
            back = cx.de_rham(cx.whitney(c, k))
            np.testing.assert_allclose(back, c, rtol=0, atol=1e-9 * (1 + np.abs(c).max()))

    def test_whitney_forms_are_dual_to_simplices_symbolically(self):
        # ∫_σ W_τ = δ_στ, integrated by the symbolic layer (independent of the numeric
        # de Rham map) over every edge of a triangle in R^3
        cx = wp.SimplicialComplex([[0, 0, 0], [2, 0, 1], [0, 3, 1], [1, 1, 2]],
                                  [[0, 1, 2], [0, 3, 1]])
        for e in range(cx.shape[1]):
            W = cx.whitney(np.eye(cx.shape[1])[e], 1)
            for t in range(cx.shape[2]):
                f = W.form_on(t)
                tri = cx.simplices(2)[t]
                for a, b in ((0, 1), (0, 2), (1, 2)):
                    edge = sorted((int(tri[a]), int(tri[b])))
                    j = cx.simplices(1).tolist().index(edge)
                    val = (float(symbolic.form_on_simplex(f.to_sympy(), f.symbols,
                                                          cx.vertices[edge]))
                           if f.to_sympy() else 0.0)
                    assert val == pytest.approx(1.0 if j == e else 0.0, abs=1e-12)

    def test_whitney_commutes_with_d(self):
        # d W(c) = W(d c) (Whitney 1957; Dodziuk 1976, Lemma on Whitney forms)
        V, tris = random_mesh(2, nv=8, n=3)
        cx = wp.SimplicialComplex(V, tris)
        rng = np.random.default_rng(3)
        pts = rng.normal(size=(6, 3))
        for k in (0, 1):
            c = rng.normal(size=cx.shape[k])
            Wd = cx.whitney(cx.coboundary(k) @ c, k + 1)
            # WhitneyForm.d() is the cochain-level route to the same form
            np.testing.assert_allclose(cx.whitney(c, k).d().cochain, Wd.cochain)
            for t in (0, 3, 7):
                dW = cx.whitney(c, k).form_on(t).d()
                vals = dW.component_values(pts)
                ref = Wd.evaluate(pts, np.full(6, t))
                for col, I in enumerate(Wd.indices):
                    np.testing.assert_allclose(vals.get(I, np.zeros(6)), ref[:, col],
                                               rtol=1e-9, atol=1e-9)

    @settings(max_examples=40, deadline=None)
    @given(cone_complexes(), st.integers(0, 2**32 - 1))
    def test_integrate_whitney_forms_stokes_in_one_line(self, case, seed):
        # integrate() takes Whitney forms over chains of their complex: the discrete Stokes
        # theorem <d c, S> = <c, dS> in one line each side, and the same value from
        # integrating the sympy form of W.d() on every triangle (form_on: an independent
        # route through the simplicial quadrature)
        S, cx = case
        assume(well_shaped(cx))
        c = np.random.default_rng(seed).normal(size=cx.shape[1])
        W = cx.whitney(c, 1)
        lhs, rhs = wp.integrate(W.d(), S), wp.integrate(W, S.boundary())
        assert lhs.exact and rhs.exact
        scale = np.abs(c).sum() + 1.0
        assert float(lhs) == pytest.approx(float(rhs), abs=1e-12 * scale)
        coef = cx.chain_vector(S)
        dW = W.d()
        unit = np.eye(len(coef), dtype=int)
        # per triangle (one per example, to keep the test fast): the Whitney value equals
        # the sympy form of W.d() on that triangle integrated by the simplicial quadrature
        for j in np.flatnonzero(coef)[:1]:
            tri = cx.chain(unit[j], 2)
            assert float(wp.integrate(dW, tri)) == pytest.approx(
                float(wp.integrate(dW.form_on(j), tri)), abs=1e-9 * scale)

    def test_integrate_whitney_bad_chains(self):
        cx = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1], [1, 1]], [[0, 1, 2], [1, 3, 2]])
        W = cx.whitney(np.arange(5.0), 1)
        with pytest.raises(ValueError, match="got a 2-chain"):
            wp.integrate(W, cx.chain([1, 1], 2))
        with pytest.raises(ValueError, match="not a vertex of the complex"):
            wp.integrate(W, wp.Path([[0, 0], [5, 5]]))
        with pytest.raises(ValueError, match="closure= and curve= apply to paths"):
            wp.integrate(W, cx.chain([1, 0, 0, 0, 0], 1), closure="chord")
        # a path along the complex's edges is a chain of its 1-simplices
        r = wp.integrate(W, wp.Path([[0, 0], [1, 0], [1, 1]]))
        assert r.exact and float(r) == pytest.approx(float(cx.de_rham(W)[[0, 3]].sum()))

    def test_whitney_0_form_is_linear_interpolation(self):
        # hat functions: the interpolant of a linear function's values is that function
        # (common practice, no source)
        cx = wp.SimplicialComplex([[0, 0], [2, 0], [0, 2], [2, 2]], [[0, 1, 2], [1, 3, 2]])
        f = lambda p: 3 * p[:, 0] - p[:, 1] + 1  # noqa: E731
        W = cx.whitney(f(cx.vertices), 0)
        pts = np.array([[0.5, 0.5], [1.5, 1.5]])
        np.testing.assert_allclose(W.evaluate(pts, [0, 1]).ravel(), f(pts), rtol=1e-14)

    def test_whitney_bad_input(self):
        cx = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1], [1, 1]], [[0, 1, 2], [1, 3, 2]])
        tri = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])  # 3 vertices, 3 edges
        with pytest.raises(ValueError, match="pass k="):
            tri.whitney(np.zeros(3))
        with pytest.raises(ValueError, match="cochain has 7 values"):
            cx.whitney(np.zeros(7))
        with pytest.raises(ValueError, match="needs 5 values"):
            cx.whitney(np.zeros(4), 1)
        with pytest.raises(ValueError, match="NaN"):
            cx.whitney(np.array([np.nan, 0, 0, 0]), 0)
        flat = wp.SimplicialComplex([[0, 0], [1, 1], [2, 2]], [[0, 1, 2]])
        with pytest.raises(ValueError, match="degenerate"):
            flat.whitney(np.ones(3), 0).evaluate([[0.0, 0.0]], [0])
        other = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        with pytest.raises(ValueError, match="another complex"):
            other.de_rham(cx.whitney(np.zeros(4), 0))

    def test_cochain_not_modified(self):
        cx = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        c = ro([1.0, 2.0, 3.0])
        W = cx.whitney(c, 1)
        cx.de_rham(W)
        np.testing.assert_array_equal(c, [1.0, 2.0, 3.0])


# ------------------------------------------------------------------ Hodge star
def irregular_times(N, seed, lo=0.0, hi=1.0):
    """N + 1 strictly increasing times with spacings varying by a factor up to 3."""
    rng = np.random.default_rng(seed)
    h = rng.uniform(1.0, 3.0, N)
    return lo + (hi - lo) * np.concatenate([[0.0], np.cumsum(h) / h.sum()])


class TestHodge:
    def test_star_values_by_hand(self):
        # primal/dual volume ratios (Hirani 2003, §4.1): ⋆0 = half-edges, ⋆1 = 1/h
        p = wp.Path([[0.0], [1.0], [5.0], [6.0]], times=[0.0, 1.0, 3.0, 7.0])
        cx = wp.SimplicialComplex.from_path(p)
        assert cx.hodge_star(0).diagonal().tolist() == [0.5, 1.5, 3.0, 2.0]
        assert cx.hodge_star(1).diagonal().tolist() == [1.0, 0.5, 0.25]
        assert cx.hodge_star(1, metric="arclength").diagonal().tolist() == [1.0, 0.25, 1.0]
        assert cx.hodge_star(1, inverse=True).diagonal().tolist() == [1.0, 2.0, 4.0]
        closed = wp.SimplicialComplex.from_path(p, closure="chord")
        # chord step = median time step = 2; vertex 0 gets half of edge 0 and of the chord
        assert closed.hodge_star(0).diagonal().tolist() == [1.5, 1.5, 3.0, 3.0]

    def test_derivative_exact_for_linear_functions_on_irregular_times(self):
        # exactness of the difference quotient for linear functions (common practice)
        t = irregular_times(40, 0, 0.0, 5.0)
        cx = wp.SimplicialComplex.from_path(wp.Path(np.column_stack([t, t ** 2]), times=t))
        f = 2.5 * t - 7.0
        np.testing.assert_allclose(cx.derivative(f), 2.5, rtol=1e-12)
        # default values: the velocity of the path; channel 0 is t itself
        np.testing.assert_allclose(cx.derivative()[:, 0], 1.0, rtol=1e-12)

    def test_derivative_second_order_at_midpoints_on_irregular_times(self):
        # Taylor: (f(b) - f(a))/(b - a) = f'((a+b)/2) + f'''(ξ) h^2 / 24 (common practice,
        # no source): the error ratio on halving h tends to 4
        errs = []
        for N in (40, 80, 160, 320):
            t = irregular_times(N, N, 0.0, 2.0)
            cx = wp.SimplicialComplex.from_path(wp.Path(t[:, None], times=t))
            f = np.sin(3 * t)
            mid = 0.5 * (t[1:] + t[:-1])
            errs.append(np.abs(cx.derivative(f) - 3 * np.cos(3 * mid)).max())
        rates = np.log2(np.array(errs[:-1]) / np.array(errs[1:]))
        assert (rates > 1.8).all(), rates

    def test_laplacian_exact_for_quadratics_and_first_order_on_irregular_times(self):
        t = irregular_times(30, 5, 0.0, 1.0)
        cx = wp.SimplicialComplex.from_path(wp.Path(t[:, None], times=t))
        L = cx.laplacian()
        # divided differences: the 3-point second difference is exact for quadratics
        # (common practice, no source)
        np.testing.assert_allclose((L @ (4 * t ** 2 - t + 1))[1:-1], 8.0, rtol=1e-9)
        # symmetric with respect to ⋆0 and annihilates constants
        np.testing.assert_allclose(L @ np.ones_like(t), 0.0, atol=1e-9)
        M = (cx.hodge_star(0) @ L).toarray()
        np.testing.assert_allclose(M, M.T, atol=1e-9)
        # on a smoothly graded grid the error of f'' decays (at least first order)
        errs = []
        for N in (50, 100, 200):
            s = np.linspace(0, 1, N + 1)
            tt = s + 0.2 * s * (1 - s)
            cxx = wp.SimplicialComplex.from_path(wp.Path(tt[:, None], times=tt))
            errs.append(np.abs((cxx.laplacian() @ np.sin(tt))[1:-1] + np.sin(tt[1:-1])).max())
        assert errs[1] < 0.6 * errs[0] and errs[2] < 0.6 * errs[1]

    def test_closed_curve_periodic_laplacian(self):
        # on a closed curve sampled irregularly in arc length, L applied to cos of the
        # arc-length angle approximates -cos (a periodic second derivative)
        N = 400
        s = irregular_times(N, 9, 0.0, 2 * np.pi)[:-1]
        X = np.column_stack([np.cos(s), np.sin(s)])
        cx = wp.SimplicialComplex.from_path(X, closure="chord")
        L = cx.laplacian(metric="arclength")
        np.testing.assert_allclose(L @ np.ones(N), 0.0, atol=1e-8)
        err = np.abs(L @ np.cos(s) + np.cos(s)).max()
        assert err < 0.02

    def test_hodge_bad_input(self):
        cx2 = wp.SimplicialComplex.from_chain(wp.cone([[0, 0], [1, 0], [0, 1]]))
        with pytest.raises(ValueError, match="1-dimensional"):
            cx2.hodge_star(0)
        cx = wp.SimplicialComplex.from_path([[0.0, 0.0], [0.0, 0.0], [1.0, 0.0]])
        with pytest.raises(ValueError, match="positive edge lengths"):
            cx.hodge_star(1, metric="arclength")
        with pytest.raises(ValueError, match="metric"):
            cx.hodge_star(1, metric="geodesic")
        with pytest.raises(ValueError, match="for 2 edges"):
            cx.hodge_star(1, metric=[1.0])
        with pytest.raises(ValueError, match="rows"):
            cx.derivative(np.zeros(5))
        g = wp.SimplicialComplex([[0.0], [1.0], [2.0]], [[0, 1], [1, 2]])
        with pytest.raises(ValueError, match="from_path"):
            g.hodge_star(1)
        assert g.hodge_star(1, metric="arclength").diagonal().tolist() == [1.0, 1.0]


# ------------------------------------------------------------------ bad input
class TestComplexBadInput:
    def test_repeated_vertex_and_repeated_simplex(self):
        with pytest.raises(ValueError, match="repeats a vertex"):
            wp.SimplicialComplex([[0, 0], [1, 0], [0, 1]], [[0, 1, 1]])
        with pytest.raises(ValueError, match="same vertices"):
            wp.SimplicialComplex([[0, 0], [1, 0], [0, 1]], [[0, 1, 2], [2, 1, 0]])

    def test_k_out_of_range(self):
        cx = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        with pytest.raises(ValueError, match="out of range"):
            cx.boundary_matrix(0)
        with pytest.raises(ValueError, match="out of range"):
            cx.coboundary(2)
        with pytest.raises(TypeError):
            cx.simplices(1.0)

    def test_chain_not_in_complex(self):
        cx = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        with pytest.raises(ValueError, match="not a vertex"):
            cx.chain_vector(wp.SimplicialChain([[5.0, 5.0], [0.0, 0.0]], [[0, 1]]))
        with pytest.raises(ValueError, match="coefficients"):
            cx.chain([1, 2], 2)

    def test_inputs_not_modified(self):
        V, s = ro([[0.0, 0.0], [1.0, 0.0], [0.0, 1.0]]), ro([[0, 1, 2]])
        cx = wp.SimplicialComplex(V, s)
        cx.boundary_matrix(2)
        B = cx.boundary_matrix(2)
        B.data[:] = 7  # a copy: the complex is not affected
        assert cx.boundary_matrix(2).toarray().ravel().tolist() == [1, -1, 1]
        assert not cx.vertices.flags.writeable


@pytest.mark.parametrize("width, big", [(3, 1_700_000), (4, 50_000)])
def test_wide_index_keys_give_the_same_complex(width, big):
    # with many vertices the packed simplex keys no longer fit in int64 and the complex
    # switches to rank-compressed keys; shifting every index by a constant keeps the
    # lexicographic order, so both complexes must have identical matrices
    rng = np.random.default_rng(width)
    small_V = rng.normal(size=(9, width))
    top = np.array([rng.choice(9, width, replace=False) for _ in range(10)])
    top = top[np.unique(np.sort(top, axis=1), axis=0, return_index=True)[1]]
    V_big = np.zeros((big + 9, width))
    V_big[big:] = small_V
    a = wp.SimplicialComplex(small_V, top)
    b = wp.SimplicialComplex(V_big, top + big)
    K = width - 1
    assert a.shape[1:] == b.shape[1:]
    for k in range(2, K + 1):
        np.testing.assert_array_equal(a.boundary_matrix(k).toarray(), b.boundary_matrix(k).toarray())
    for k in range(1, K + 1):
        np.testing.assert_array_equal(a.simplices(k) + big, b.simplices(k))
    ch = b.chain(rng.integers(-3, 4, b.shape[K]), K)
    np.testing.assert_array_equal(b.boundary_matrix(K) @ b.chain_vector(ch),
                                  b.chain_vector(ch.boundary()))
    c = rng.normal(size=b.shape[K - 1])
    np.testing.assert_allclose(a.de_rham(a.whitney(c, K - 1)), c, atol=1e-9)
    np.testing.assert_allclose(b.de_rham(b.whitney(c, K - 1)), c, atol=1e-9)


# ------------------------------------------------------------------ every dimension
def _two_simplices(K, seed):
    """Two K-simplices in R^K sharing a facet (K + 2 vertices), one with a reversed order."""
    rng = np.random.default_rng(seed)
    V = rng.normal(size=(K + 2, K))
    first = list(range(K + 1))
    second = list(range(1, K + 2))
    second[0], second[1] = second[1], second[0]      # an odd permutation of its vertices
    return wp.SimplicialComplex(V, [first, second])


def _poly_form(k, xs, rng):
    """A k-form on R^n with a few terms whose coefficients are small integer polynomials."""
    n = len(xs)
    from itertools import combinations
    idx = list(combinations(range(n), k))
    terms = {}
    for I in [idx[j] for j in rng.choice(len(idx), size=min(3, len(idx)), replace=False)]:
        a, b, c = (int(v) for v in rng.integers(-3, 4, size=3))
        i, j = (int(v) for v in rng.integers(0, n, size=2))
        terms[I] = a * xs[i] * xs[j] + b * xs[j] + c + 1
    return wp.Form(terms, k, n, xs)


class TestEveryDimension:
    @pytest.mark.parametrize("K", [4, 5, 6])
    def test_boundary_of_boundary_and_by_hand(self, K):
        cx = _two_simplices(K, K)
        for k in range(1, K):
            assert (cx.boundary_matrix(k) @ cx.boundary_matrix(k + 1)).count_nonzero() == 0
            assert (cx.coboundary(k) @ cx.coboundary(k - 1)).count_nonzero() == 0
        # ∂[v_0..v_K] = Σ_i (-1)^i [.. v_i omitted ..] (the definition), looked up row by row
        faces = cx.simplices(K - 1).tolist()
        col = cx.boundary_matrix(K).toarray()[:, 0]
        expect = np.zeros(len(faces), dtype=int)
        for i in range(K + 1):
            expect[faces.index([v for v in range(K + 1) if v != i])] = (-1) ** i
        np.testing.assert_array_equal(col, expect)

    @pytest.mark.parametrize("K", [4, 5, 6])
    def test_matrices_agree_with_chain_boundaries(self, K):
        # the matrices against SimplicialChain.boundary() (face enumeration, independent code)
        cx = _two_simplices(K, 10 + K)
        rng = np.random.default_rng(K)
        for k in range(1, K + 1):
            sigma = cx.chain(rng.integers(-4, 5, cx.shape[k]), k)
            np.testing.assert_array_equal(cx.boundary_matrix(k) @ cx.chain_vector(sigma),
                                          cx.chain_vector(sigma.boundary()))

    @pytest.mark.parametrize("K", [4, 5, 6])
    def test_discrete_stokes_with_polynomial_forms(self, K):
        # R(dω) = d R(ω) on every simplex (Stokes); polynomial forms are integrated exactly
        cx = _two_simplices(K, 20 + K)
        xs = sp.symbols(f"x0:{K}")
        rng = np.random.default_rng(100 + K)
        for k in range(K):
            w = _poly_form(k, xs, rng)
            lhs = cx.de_rham(w.d())
            rhs = cx.coboundary(k) @ cx.de_rham(w)
            scale = 1.0 + np.abs(lhs).max() + np.abs(cx.de_rham(w)).max()
            np.testing.assert_allclose(lhs, rhs, rtol=0, atol=1e-11 * scale)

    @pytest.mark.parametrize("K", [4, 5, 6])
    def test_whitney_identities(self, K):
        # ∫_τ W(c) = c_τ and d W(c) = W(d c) (Whitney 1957, ch. IV §27)
        cx = _two_simplices(K, 30 + K)
        rng = np.random.default_rng(K)
        for k in range(K + 1):
            c = rng.normal(size=cx.shape[k])
            np.testing.assert_allclose(cx.de_rham(cx.whitney(c, k)), c, rtol=0, atol=1e-9)
            if k < K:
                np.testing.assert_allclose(cx.de_rham(cx.whitney(c, k).d()),
                                           cx.coboundary(k) @ c, rtol=0, atol=1e-9)


@pytest.mark.parametrize("width", range(1, 9))
def test_sorting_network_sorts_every_width(width):
    # 0-1 principle (Knuth, TAOCP vol. 3, 5.3.4, from memory): a network that sorts every
    # 0/1 input sorts every input; checked exhaustively, plus random permutations
    from itertools import product
    from wedgepath.calculus._indexing import sort_columns as _sort_columns
    rows = np.array(list(product([0, 1], repeat=width)), dtype=np.int64)
    rng = np.random.default_rng(width)
    rows = np.vstack([rows, np.argsort(rng.random((50, width)), axis=1)])
    tags = np.arange(rows.size).reshape(rows.shape)
    cols, moved = _sort_columns([rows[:, j] for j in range(width)],
                                [tags[:, j] for j in range(width)])
    out, tag_out = np.column_stack(cols), np.column_stack(moved)
    np.testing.assert_array_equal(out, np.sort(rows, axis=1))
    # the companions moved with their entries: position tags pick the sorted values back
    np.testing.assert_array_equal(np.take_along_axis(rows, tag_out - tags[:, :1], axis=1), out)


def test_de_rham_warning_points_at_the_callers_line():
    # before: reported at sys:1 (a hard-coded stack level)
    import sys
    import warnings
    cx = wp.SimplicialComplex([[0, 0], [1, 0], [0, 1], [1, 1]], [[0, 1, 2], [1, 3, 2]])
    w = wp.TwoForm({(0, 1): lambda c: np.sign(c[:, 0] - 1 / 3)})
    with warnings.catch_warnings(record=True) as seen:
        warnings.simplefilter("always")
        line = sys._getframe().f_lineno + 1
        vals, errs = cx.de_rham(w, max_levels=1, return_error=True)
    hits = [x for x in seen if issubclass(x.category, wp.IntegrationWarning)]
    assert len(hits) == 1
    assert (hits[0].filename, hits[0].lineno) == (__file__, line)
    assert "de Rham map tolerance" in str(hits[0].message)
    # the per-simplex values still add up to the exact area-weighted sign integral:
    # sign(x - 1/3) over the two triangles of the unit square, by hand: 1/3
    assert abs(vals.sum() - 1 / 3) <= errs.sum() + 1e-12
