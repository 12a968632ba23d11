"""Simplicial chains and cones: boundary, interoperation with paths, bad input."""

import warnings

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import wedgepath as wp
from wedgepath import symbolic


def ro(a):
    a = np.array(a)
    a.flags.writeable = False
    return a


@st.composite
def random_chains(draw, k):
    V = draw(st.integers(k + 1, 9))
    S = draw(st.integers(0, 12))
    n = draw(st.integers(k if k else 1, 4))
    simp = draw(st.lists(st.lists(st.integers(0, V - 1), min_size=k + 1, max_size=k + 1),
                         min_size=S, max_size=S))
    coef = draw(st.lists(st.integers(-3, 3), min_size=S, max_size=S))
    verts = np.arange(V * n, dtype=float).reshape(V, n) ** 1.5 % 7.0
    simp = np.array(simp, dtype=np.int64).reshape(S, k + 1)
    return wp.SimplicialChain(verts, simp, coef)


# ------------------------------------------------------------------ boundary
class TestBoundary:
    @settings(max_examples=60, deadline=None)
    @given(random_chains(2))
    def test_boundary_of_boundary_is_zero_for_2_chains(self, c):
        bb = c.boundary().boundary()
        assert bb.is_zero() and bb == 0
        assert len(bb) == 0  # cancelled exactly in the index representation

    @settings(max_examples=60, deadline=None)
    @given(random_chains(1))
    def test_boundary_of_a_1_chain_has_coefficient_sum_zero(self, c):
        # augmentation: every edge contributes end - start
        assert int(c.boundary().coefficients.sum()) == 0
        assert c.boundary().boundary() == 0

    def test_triangle_boundary_by_hand(self):
        # ∂[a, b, c] = [b, c] - [a, c] + [a, b] (common practice, no source)
        tri = wp.SimplicialChain([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        b = tri.boundary()
        assert b.simplices.tolist() == [[1, 2], [0, 2], [0, 1]]
        assert b.coefficients.tolist() == [1, -1, 1]
        assert b.boundary() == 0

    def test_repeated_vertex_simplex_is_zero(self):
        c = wp.SimplicialChain([[0, 0], [1, 0]], [[0, 1, 1]], [3])
        assert c.is_zero() and c.boundary().is_zero()

    def test_opposite_orientations_cancel(self):
        c = wp.SimplicialChain([[0, 0], [1, 0], [0, 1]], [[0, 1, 2], [1, 0, 2], [2, 0, 1]], [2, 1, -1])
        r = c.reduced()
        assert len(r) == 0 and c == 0

    def test_reduced_keeps_first_orientation(self):
        c = wp.SimplicialChain([[0.0], [1.0], [2.0]], [[1, 0], [0, 1], [1, 2], [1, 0]], [2, 1, 1, 1])
        r = c.reduced()
        assert r.simplices.tolist() == [[1, 0], [1, 2]]
        assert r.coefficients.tolist() == [2, 1]


# ------------------------------------------------------------------ interop
class TestInterop:
    def test_cone_boundary_equals_closed_path_chain(self):
        X = np.array([[0.0, 0.0, 1.0], [2.0, 0.5, 0.0], [1.0, 3.0, -1.0], [-1.0, 1.0, 0.5]])
        S = wp.cone(X)
        p = wp.Path(X)
        assert S.boundary() == wp.Chain(p.close("chord"))
        assert S.boundary() == p.close("chord")
        assert S.boundary() != p  # the open path lacks its chord
        # the converted chain is one closed path with the same samples
        ch = S.boundary().to_chain()
        assert len(ch) == 1 and ch.coefficients == (1,)
        np.testing.assert_array_equal(ch.paths[0].points, p.close("chord").points)

    def test_boundary_of_1_chain_matches_zero_chain(self):
        p = wp.Path([[0, 0], [1, 0], [1, 1]])
        s = wp.SimplicialChain.from_chain(p)
        assert s.boundary() == wp.Chain(p).boundary()
        zc = s.boundary().to_chain()
        assert isinstance(zc, wp.ZeroChain) and zc == wp.Chain(p).boundary()

    def test_from_chain_with_coefficients_and_gaps(self):
        p = wp.Path([[0, 0], [1, 0], [np.nan, np.nan], [2, 2], [3, 2], [3, 3]])
        q = wp.Path([[5, 5], [6, 5]])
        s = wp.SimplicialChain.from_chain(wp.Chain([(p, 2), (q, -1)]))
        assert len(s) == 1 + 2 + 1
        assert s.coefficients.tolist() == [2, 2, 2, -1]
        w = wp.OneForm([lambda c: c[:, 1] ** 2, lambda c: c[:, 0] * c[:, 1]], poly_degree=2)
        a = wp.integrate(w, s)
        b = wp.integrate(w, wp.Chain([(p, 2), (q, -1)]))
        assert float(a) == pytest.approx(float(b), rel=1e-13)
        assert a.exact and b.exact

    def test_from_path_chord_closure(self):
        s = wp.SimplicialChain.from_chain(wp.Path([[0, 0], [1, 0], [1, 1]]), closure="chord")
        assert s.boundary() == 0

    def test_algebra(self):
        tri = wp.SimplicialChain([[0, 0], [1, 0], [0, 1]], [[0, 1, 2]])
        other = wp.SimplicialChain([[1, 0], [0, 1], [0, 0]], [[2, 0, 1]])  # same triangle
        assert tri == other
        assert (tri - other).is_zero()
        assert 2 * tri == tri + other
        assert (-tri).coefficients.tolist() == [-1]
        with pytest.raises(ValueError, match="degree|2-chain"):
            tri + tri.boundary()
        with pytest.raises(TypeError):
            tri * 1.5

    def test_integrate_works_on_each_representation(self):
        X = np.array([[0.0, 0.0], [3.0, 0.0], [3.0, 2.0], [1.0, 3.0]])
        w = 0.5 * (wp.OneForm([lambda c: -c[:, 1], lambda c: c[:, 0]], poly_degree=1))
        # shoelace formula (common practice, no source): 1/2 sum (x_k y_{k+1} - x_{k+1} y_k)
        x, y = X[:, 0], X[:, 1]
        exact = 0.5 * float(np.sum(x * np.roll(y, -1) - np.roll(x, -1) * y))
        assert exact == 6.5  # by hand: (0 + 6 + 7 + 0) / 2
        vals = [wp.integrate(w, wp.cone(X).boundary()),
                wp.integrate(w, wp.Chain(wp.Path(X).close("chord"))),
                wp.integrate(wp.dx(0) ^ wp.dx(1), wp.cone(X)),
                wp.integrate(wp.dx(0) ^ wp.dx(1), X)]
        for v in vals:
            assert float(v) == pytest.approx(exact, rel=1e-14)


# ------------------------------------------------------------------ cone
class TestCone:
    def test_structure(self):
        S = wp.cone([[0, 0], [2, 0], [2, 1], [0, 1]])
        assert S.degree == 2 and S.dim == 2
        np.testing.assert_array_equal(S.vertices[0], [1.0, 0.5])
        assert S.simplices.tolist() == [[0, 1, 2], [0, 2, 3], [0, 3, 4], [0, 4, 1]]

    def test_already_closed_path_identifies_end_with_start(self):
        S = wp.cone([[0, 0], [2, 0], [2, 1], [0, 0]])
        assert len(S) == 3 and S.vertices.shape[0] == 4
        assert S.boundary() == wp.Path([[0, 0], [2, 0], [2, 1], [0, 0]])

    def test_gaps_give_one_cone_per_piece(self):
        X = np.array([[0, 0], [1, 0], [0, 1], [np.nan, np.nan], [5, 5], [7, 5], [7, 8], [5, 6]])
        S = wp.cone(X)
        assert S.vertices.shape[0] == 2 + 7 and len(S) == 3 + 4
        np.testing.assert_allclose(S.vertices[:2], [[1 / 3, 1 / 3], [6.0, 6.0]])
        p = wp.Path(X)
        assert S.boundary() == p.close("chord")
        total = float(wp.integrate(wp.dx(0) ^ wp.dx(1), S))
        # shoelace by hand (common practice, no source): 0.5 for the unit triangle and
        # 0.5 * (-10 + 21 + 2 - 5) = 4 for the quadrilateral
        assert total == pytest.approx(4.5, rel=1e-14)
        pieces = sum(float(wp.integrate(wp.dx(0) ^ wp.dx(1), pc)) for pc in p.pieces)
        assert total == pytest.approx(pieces, rel=1e-14)

    def test_apex_per_piece_and_shared(self):
        X = np.array([[0, 0], [1, 0], [0, 1], [np.nan, np.nan], [5, 5], [7, 5], [7, 8]])
        w = wp.dx(0) ^ wp.dx(1)
        ref = float(wp.integrate(w, wp.cone(X)))
        assert float(wp.integrate(w, wp.cone(X, apex=[100.0, -3.0]))) == pytest.approx(ref, rel=1e-12)
        assert float(wp.integrate(w, wp.cone(X, apex=[[0, 0], [9, 9]]))) == pytest.approx(ref, rel=1e-12)
        with pytest.raises(ValueError, match="apex"):
            wp.cone(X, apex=[[0, 0]])
        with pytest.raises(ValueError, match="apex"):
            wp.cone(X, apex=[0, 0, 0])
        with pytest.raises(ValueError, match="NaN"):
            wp.cone(X, apex=[np.nan, 0])

    def test_apex_on_the_curve_is_a_documented_valid_surface(self):
        X = np.array([[0.0, 0.0, 0.0], [2.0, 0.0, 1.0], [2.0, 1.0, 0.0], [0.0, 2.0, 1.0]])
        import sympy as sp
        xs = sp.symbols("x0:3")
        w = wp.Form.from_sympy([xs[1] ** 2, xs[0] * xs[2], xs[0] ** 2 * xs[1]], xs)
        ref = float(symbolic.polyline_integral([xs[1] ** 2, xs[0] * xs[2], xs[0] ** 2 * xs[1]],
                                               xs, X, closed=True))
        for apex in (X[0], X[2], 0.5 * (X[1] + X[2])):  # at samples and inside a segment
            S = wp.cone(X, apex=apex)
            with warnings.catch_warnings():
                warnings.simplefilter("error")
                got = wp.integrate(w.d(), S)
            assert float(got) == pytest.approx(ref, rel=1e-12, abs=1e-12)
            assert S.boundary() == wp.Path(X).close("chord")

    def test_closure_choices(self):
        X = np.array([[0.0, 0.0], [2.0, 0.0], [2.0, 1.0], [0.1, 0.9]])
        with pytest.raises(ValueError, match="closure"):
            wp.cone(X, closure="none")
        with pytest.raises(ValueError, match="not closed"):
            wp.cone(X, closure="require")
        d = wp.cone(X, closure="detrend")
        assert d.boundary() == wp.Path(X).close("detrend")
        with pytest.raises(ValueError, match="closure"):
            wp.cone(X, closure="loop")

    def test_input_not_modified(self):
        X = ro([[0.0, 0.0], [1.0, 0.0], [0.0, 1.0]])
        apex = ro([0.2, 0.2])
        S = wp.cone(X, apex=apex)
        assert not S.vertices.flags.writeable
        np.testing.assert_array_equal(X, [[0, 0], [1, 0], [0, 1]])

    def test_nothing_to_cone(self):
        with pytest.raises(ValueError, match="two or more samples"):
            wp.cone([[0.0, 0.0], [np.nan, np.nan], [1.0, 1.0]])


# ------------------------------------------------------------------ bad input
class TestBadInput:
    V = [[0, 0], [1, 0], [0, 1]]

    def test_non_integer_coefficients(self):
        with pytest.raises(TypeError, match="integer"):
            wp.SimplicialChain(self.V, [[0, 1, 2]], [0.5])
        with pytest.raises(TypeError, match="integer"):
            wp.SimplicialChain(self.V, [[0, 1, 2]], np.array([1.0]))
        with pytest.raises(TypeError, match="boolean"):
            wp.SimplicialChain(self.V, [[0, 1, 2]], [True])
        with pytest.raises(ValueError, match="coefficients"):
            wp.SimplicialChain(self.V, [[0, 1, 2]], [1, 2])

    def test_bad_simplices(self):
        with pytest.raises(TypeError, match="integer"):
            wp.SimplicialChain(self.V, [[0.0, 1.0, 2.0]])
        with pytest.raises(ValueError, match="vertex 3"):
            wp.SimplicialChain(self.V, [[0, 1, 3]])
        with pytest.raises(ValueError, match="vertex -1"):
            wp.SimplicialChain(self.V, [[0, 1, -1]])
        with pytest.raises(ValueError, match="2-dimensional"):
            wp.SimplicialChain(self.V, [0, 1, 2])
        with pytest.raises(ValueError, match="does not fit"):
            wp.SimplicialChain([[0.0], [1.0], [2.0]], [[0, 1, 2]])
        with pytest.raises(TypeError, match="boolean"):
            wp.SimplicialChain(self.V, np.array([[True, False, True]]))

    def test_bad_vertices(self):
        with pytest.raises(ValueError, match="NaN"):
            wp.SimplicialChain([[0, 0], [np.nan, 0], [0, 1]], [[0, 1, 2]])
        with pytest.raises(TypeError, match="complex"):
            wp.SimplicialChain(np.array([[1j, 0]]), [[0]])

    def test_read_only_inputs_are_not_modified(self):
        V, s, c = ro(self.V), ro([[0, 1, 2], [2, 1, 0]]), ro([1, 2])
        ch = wp.SimplicialChain(V, s, c)
        _ = ch.boundary(), ch.reduced(merge_vertices=True), -ch, 2 * ch
        assert not ch.simplices.flags.writeable and not ch.coefficients.flags.writeable
        np.testing.assert_array_equal(c, [1, 2])


@pytest.mark.parametrize("w", [1, 2, 3, 4, 5])
def test_row_sorting_network_matches_numpy_sort(w):
    from wedgepath.calculus._indexing import sort_rows as _sort_rows
    rng = np.random.default_rng(w)
    a = rng.integers(0, 6, size=(500, w))
    tag = a * 10 + np.arange(w)  # carried along: must follow the same permutation
    s, t = _sort_rows(a, tag)
    np.testing.assert_array_equal(s, np.sort(a, axis=1))
    np.testing.assert_array_equal(t // 10, s)
    np.testing.assert_array_equal(np.sort(t % 10, axis=1), np.tile(np.arange(w), (500, 1)))
