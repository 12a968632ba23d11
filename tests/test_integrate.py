"""Line integrals: exactness, properties, external checks, error estimates."""

import math
import sys
import warnings
from fractions import Fraction

import numpy as np
import pytest
import sympy as sp
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra.numpy import arrays
from scipy import integrate as si

import wedgepath as wp
from wedgepath import symbolic

X, Y, Z = sp.symbols("x y z", real=True)

finite = st.floats(-100, 100, allow_nan=False, allow_infinity=False, width=64)


def point_arrays(n, min_T=2, max_T=25):
    return st.integers(min_T, max_T).flatmap(
        lambda T: arrays(np.float64, (T, n), elements=finite))


def random_poly_1form(draw, syms, max_deg=3):
    """A random polynomial 1-form with small integer coefficients."""
    comps = []
    monos = [sp.Integer(1)] + list(syms)
    for _ in syms:
        expr = 0
        for _k in range(draw(st.integers(1, 3))):
            mono = sp.Integer(draw(st.integers(-3, 3)))
            for _d in range(draw(st.integers(0, max_deg))):
                mono *= draw(st.sampled_from(monos))
            expr += mono
        comps.append(sp.expand(expr))
    return comps


@st.composite
def poly_form_and_path(draw, n=2):
    syms = (X, Y, Z)[:n]
    comps = random_poly_1form(draw, syms)
    T = draw(st.integers(2, 12))
    ints = draw(arrays(np.int64, (T, n), elements=st.integers(-20, 20)))
    return comps, syms, ints.astype(float) / 4.0  # dyadic rationals: exact in binary


# ------------------------------------------------------------------ exactness
class TestExactness:
    @settings(max_examples=60, deadline=None)
    @given(poly_form_and_path(n=2))
    def test_polynomial_forms_match_symbolic_layer(self, case):
        comps, syms, pts = case
        form = wp.Form.from_sympy(comps, syms)
        got = wp.integrate(form, pts)
        exact = symbolic.polyline_integral(comps, syms, pts)
        assert got.exact and got.error == 0.0
        scale = 1.0 + abs(float(exact)) + got.rounding
        assert abs(float(got) - float(exact)) <= 1e-12 * scale

    @settings(max_examples=30, deadline=None)
    @given(poly_form_and_path(n=3))
    def test_polynomial_forms_match_symbolic_layer_3d(self, case):
        comps, syms, pts = case
        got = wp.integrate(wp.Form.from_sympy(comps, syms), pts)
        exact = float(symbolic.polyline_integral(comps, syms, pts))
        assert abs(float(got) - exact) <= 1e-12 * (1.0 + abs(exact))

    def test_declared_degree_callable_is_exact(self):
        pts = np.array([[0.0, 0.0], [1.0, 2.0], [3.0, -1.0]])
        w = wp.OneForm([lambda c: c[:, 0] ** 3 * c[:, 1], lambda c: c[:, 1] ** 2], poly_degree=4)
        r = wp.integrate(w, pts)
        exact = symbolic.polyline_integral([X**3 * Y, Y**2], (X, Y), pts)
        assert r.exact
        assert float(r) == pytest.approx(float(exact), rel=1e-14, abs=1e-14)

    def test_constant_form_telescopes(self):
        rng = np.random.default_rng(1)
        pts = rng.normal(size=(1000, 4)).cumsum(axis=0)
        w = 2 * wp.dx(0) - wp.dx(3)
        r = wp.integrate(w, pts)
        d = pts[-1] - pts[0]
        assert r.exact and float(r) == pytest.approx(2 * d[0] - d[3], rel=1e-13)


# ------------------------------------------------------------------ properties
class TestProperties:
    @settings(max_examples=60, deadline=None)
    @given(poly_form_and_path(n=2), st.data())
    def test_times_do_not_change_linear_model(self, case, data):
        comps, syms, pts = case
        steps = data.draw(arrays(np.float64, (pts.shape[0],), elements=st.floats(0.01, 10)))
        times = np.cumsum(steps)
        form = wp.Form.from_sympy(comps, syms)
        a = wp.integrate(form, wp.Path(pts))
        b = wp.integrate(form, wp.Path(pts, times=times))
        assert float(a) == float(b)

    @settings(max_examples=60, deadline=None)
    @given(poly_form_and_path(n=2), st.data())
    def test_collinear_midpoints_do_not_change_value(self, case, data):
        comps, syms, pts = case
        k = data.draw(st.integers(0, pts.shape[0] - 2))
        frac = data.draw(st.sampled_from([0.25, 0.5, 0.75]))
        mid = pts[k] + frac * (pts[k + 1] - pts[k])
        refined = np.insert(pts, k + 1, mid, axis=0)
        form = wp.Form.from_sympy(comps, syms)
        a, b = float(wp.integrate(form, pts)), float(wp.integrate(form, refined))
        assert a == pytest.approx(b, rel=1e-11, abs=1e-9)

    @settings(max_examples=60, deadline=None)
    @given(poly_form_and_path(n=2))
    def test_reversal_negates(self, case):
        comps, syms, pts = case
        form = wp.Form.from_sympy(comps, syms)
        p = wp.Path(pts)
        a, b = float(wp.integrate(form, p)), float(wp.integrate(form, p.reversed()))
        assert a == pytest.approx(-b, rel=1e-12, abs=1e-9)

    @settings(max_examples=60, deadline=None)
    @given(poly_form_and_path(n=2), point_arrays(2))
    def test_concatenation_adds(self, case, other):
        comps, syms, pts = case
        form = wp.Form.from_sympy(comps, syms)
        p, q = wp.Path(pts), wp.Path(other)
        link = wp.Path(np.vstack([pts[-1], other[0]]))
        whole = float(wp.integrate(form, p.then(q)))
        parts = sum(float(wp.integrate(form, c)) for c in (p, link, q))
        assert whole == pytest.approx(parts, rel=1e-9, abs=1e-6)

    @settings(max_examples=40, deadline=None)
    @given(point_arrays(2), point_arrays(2), st.integers(-3, 3), st.integers(-3, 3))
    def test_chain_linearity(self, a, b, ka, kb):
        form = wp.OneForm([lambda c: np.sin(c[:, 1] / 10), lambda c: c[:, 0] * 0.1])
        pa, pb = wp.Path(a), wp.Path(b)
        chain = wp.Chain([(pa, ka), (pb, kb)])
        got = wp.integrate(form, chain)
        want = ka * float(wp.integrate(form, pa)) + kb * float(wp.integrate(form, pb))
        assert float(got) == pytest.approx(want, rel=1e-9, abs=1e-8)

    @settings(max_examples=40, deadline=None)
    @given(st.data())
    def test_d_of_d_is_zero(self, data):
        syms = (X, Y, Z)
        f = data.draw(st.sampled_from([X**2 * Y * Z, sp.sin(X) * sp.exp(Y * Z), X * Y + Z**3]))
        g = wp.ZeroForm(f, symbols=syms)
        assert g.d().d() == 0
        comps = random_poly_1form(data.draw, syms)
        w = wp.Form.from_sympy(comps, syms)
        assert w.d().d() == 0

    def test_gaps_add_piecewise(self):
        pts = np.array([[0, 0], [1, 0], [1, 1], [np.nan, np.nan], [2, 2], [3, 5]], float)
        w = wp.Form.from_sympy([X * Y, X + Y**2], (X, Y))
        whole = float(wp.integrate(w, pts))
        parts = float(wp.integrate(w, pts[:3])) + float(wp.integrate(w, pts[4:]))
        assert whole == pytest.approx(parts, rel=1e-14)


# ------------------------------------------------------------------ external checks
class TestExternal:
    def test_gradient_theorem(self):
        # Line integral of a gradient field equals the potential difference
        # (fundamental theorem for line integrals; e.g. Stewart, Calculus, §16.3).
        phi = sp.exp(X) * sp.cos(Y) + X * Y**2
        grad = wp.ZeroForm(phi, symbols=(X, Y)).d()
        rng = np.random.default_rng(3)
        pts = rng.normal(size=(200, 2)).cumsum(axis=0) * 0.05
        r = wp.integrate(grad, pts)
        exact = float(phi.subs({X: pts[-1, 0], Y: pts[-1, 1]}) - phi.subs({X: pts[0, 0], Y: pts[0, 1]}))
        assert abs(float(r) - exact) <= max(r.error, 1e-12) * 10
        assert abs(float(r) - exact) < 1e-9
        # and through the chain boundary, which is the same theorem in chain form
        f = wp.ZeroForm(phi, symbols=(X, Y))
        b = wp.integrate(f, wp.Chain(wp.Path(pts)).boundary())
        assert float(b) == pytest.approx(exact, rel=1e-13)

    def test_ellipse_area_spline_converges_to_pi_a_b(self):
        # Area of an ellipse is pi*a*b (common practice, no source).
        a, b = 3.0, 1.5
        w = wp.dx(0) ^ wp.dx(1)
        errs_lin, errs_spl = [], []
        rng = np.random.default_rng(7)
        Ns = [40, 80, 160, 320]
        for N in Ns:
            u = np.sort(rng.uniform(0, 1, N - 2))
            # irregular but quasi-uniform time stamps on [0, 2 pi], both ends included
            t = 2 * np.pi * (np.arange(1, N - 1) + 0.4 * (u - 0.5)) / (N - 1)
            t = np.concatenate([[0.0], np.sort(t), [2 * np.pi]])
            pts = np.c_[a * np.cos(t), b * np.sin(t)]
            pts[-1] = pts[0]
            p = wp.Path(pts, times=t)
            errs_lin.append(abs(float(wp.integrate(w, p)) - np.pi * a * b))
            errs_spl.append(abs(float(wp.integrate(w, p, curve="spline")) - np.pi * a * b))
        order_lin = np.polyfit(np.log(Ns), np.log(errs_lin), 1)[0]
        order_spl = np.polyfit(np.log(Ns), np.log(errs_spl), 1)[0]
        assert -2.3 < order_lin < -1.7          # second order for the polygon
        assert order_spl < -3.6                  # fourth order for the cubic spline
        assert errs_spl[-1] < 1e-6

    def test_spline_line_integral_converges_fourth_order_open_curve(self):
        # Work of the field (-y, x) along an open arc of the unit circle from 0 to
        # theta is theta (common practice, no source): x dy - y dx = d(theta).
        theta = 2.0
        w = wp.Form.from_sympy([-Y, X], (X, Y))
        rng = np.random.default_rng(11)
        errs, Ns = [], [20, 40, 80, 160]
        for N in Ns:
            t = np.linspace(0, theta, N)
            t[1:-1] += rng.uniform(-0.3, 0.3, N - 2) * theta / N
            pts = np.c_[np.cos(t), np.sin(t)]
            r = wp.integrate(w, wp.Path(pts, times=t), curve="spline")
            errs.append(abs(float(r) - theta))
        order = np.polyfit(np.log(Ns), np.log(errs), 1)[0]
        assert order < -3.5

    def test_regular_polygon_area_is_exact(self):
        # Area of a regular N-gon inscribed in a circle of radius r is
        # (N/2) r^2 sin(2 pi / N) (common practice, no source).
        r, N = 2.5, 17
        t = 2 * np.pi * np.arange(N) / N
        pts = np.c_[r * np.cos(t), r * np.sin(t)] + [1e6, -3e6]
        got = wp.integrate(wp.dx(0) ^ wp.dx(1), pts)
        assert float(got) == pytest.approx(N / 2 * r**2 * np.sin(2 * np.pi / N), rel=1e-10)

    def test_simple_polygon_areas_match_shapely(self):
        shapely = pytest.importorskip("shapely")
        rng = np.random.default_rng(5)
        for _ in range(20):
            k = rng.integers(3, 30)
            ang = np.sort(rng.uniform(0, 2 * np.pi, k))
            rad = rng.uniform(0.5, 2.0, k)
            pts = np.c_[rad * np.cos(ang), rad * np.sin(ang)]  # star-shaped, simple, CCW
            ours = float(wp.integrate(wp.dx(0) ^ wp.dx(1), pts))
            theirs = shapely.Polygon(pts).area  # shapely's planar area of the polygon
            assert ours == pytest.approx(theirs, rel=1e-12)
            assert float(wp.integrate(wp.dx(1) ^ wp.dx(0), pts)) == pytest.approx(-theirs, rel=1e-12)

    @pytest.mark.parametrize("seed", range(5))
    def test_callable_against_scipy_quad(self, seed):
        # Reference: scipy.integrate.quad (QUADPACK) on the pulled-back integrand
        # of a straight segment.
        rng = np.random.default_rng(seed)
        a, b = rng.normal(size=2), rng.normal(size=2)
        f0 = lambda x, y: np.exp(np.sin(3 * x)) * np.cos(y)  # noqa: E731
        f1 = lambda x, y: 1.0 / (1.0 + x * x + y * y)        # noqa: E731
        w = wp.OneForm([lambda c: f0(c[:, 0], c[:, 1]), lambda c: f1(c[:, 0], c[:, 1])])
        d = b - a

        def pulled(s):
            x, y = a + s * d
            return f0(x, y) * d[0] + f1(x, y) * d[1]
        ref, ref_err = si.quad(pulled, 0.0, 1.0, epsabs=1e-13, epsrel=1e-13)
        r = wp.integrate(w, np.vstack([a, b]), rtol=1e-12)
        assert abs(float(r) - ref) < 1e-11
        assert abs(float(r) - ref) <= r.error + 1e-13  # the estimate is honest here
        assert not r.exact

    def test_error_estimate_is_honest_and_refines(self):
        # A sharply peaked coefficient on one long segment forces bisection.
        # Reference value from scipy.integrate.quad with the peak as a break point.
        f = lambda x: 1.0 / (1e-4 + (x - 0.3) ** 2)  # noqa: E731
        w = wp.OneForm([lambda c: f(c[:, 0]), 0.0])
        ref = si.quad(f, 0, 1, points=[0.3], epsabs=1e-13, epsrel=1e-13, limit=200)[0]
        for rtol in (1e-4, 1e-8, 1e-11):
            r = wp.integrate(w, [[0.0, 0.0], [1.0, 0.0]], rtol=rtol)
            true_err = abs(float(r) - ref)
            assert true_err <= r.error + 1e-12 * ref
            assert r.error <= rtol * abs(ref) * 1.01

    def test_tolerance_not_met_warns(self):
        w = wp.OneForm([lambda c: np.sign(c[:, 0] - 1 / 3) * 1.0, 0.0])
        with pytest.warns(wp.IntegrationWarning, match="not reached"):
            r = wp.integrate(w, [[0.0, 0.0], [1.0, 0.0]], rtol=1e-14, max_levels=3)
        assert r.error > 0


# ------------------------------------------------------------------ 2-forms and chains
class TestTwoForms:
    def test_closure_conventions_for_area(self):
        # open "U" shape: chord closure adds the straight segment back to start
        pts = np.array([[0, 1], [0, 0], [1, 0], [1, 1]], float)
        w = wp.dx(0) ^ wp.dx(1)
        assert float(wp.integrate(w, pts)) == pytest.approx(1.0)
        with pytest.raises(ValueError, match="closed boundary"):
            wp.integrate(w, pts, closure="none")
        with pytest.raises(ValueError, match="not closed"):
            wp.integrate(w, pts, closure="require")

    def test_constant_two_form_in_R3(self):
        # a unit square in the (x0, x2) plane of R^3, counter-clockwise there
        pts = np.array([[0, 7, 0], [1, 7, 0], [1, 7, 1], [0, 7, 1]], float)
        w = 2 * (wp.dx(0) ^ wp.dx(2)) + (wp.dx(0) ^ wp.dx(1))
        assert float(wp.integrate(w, pts)) == pytest.approx(2.0)

    def test_non_constant_two_form_in_R3_needs_surface(self):
        w = wp.TwoForm({(0, 1): lambda c: c[:, 2]})
        with pytest.raises(ValueError, match="surface"):
            wp.integrate(w, np.eye(3))


class TestBadInput:
    def test_dimension_mismatch(self):
        with pytest.raises(ValueError, match="R\\^3 but the path has 2 channels"):
            wp.integrate(wp.OneForm([1.0, 2.0, 3.0]), np.zeros((3, 2)))
        with pytest.raises(ValueError, match="uses dx4"):
            wp.integrate(wp.dx(4), np.zeros((3, 2)))

    def test_wrong_types_and_options(self):
        with pytest.raises(TypeError, match="needs a Form"):
            wp.integrate(lambda c: c, np.zeros((3, 2)))
        with pytest.raises(ValueError, match="unknown closure"):
            wp.integrate(wp.dx(0), np.zeros((3, 2)), closure="circle")
        with pytest.raises(ValueError, match="unknown curve model"):
            wp.integrate(wp.dx(0), np.zeros((3, 2)), curve="bezier")
        with pytest.raises(ValueError, match="rtol"):
            wp.integrate(wp.dx(0), np.zeros((3, 2)), rtol=-1)
        with pytest.raises(ValueError, match="0-chain"):
            wp.integrate(wp.ZeroForm(1.0), np.zeros((3, 2)))

    def test_callable_returning_nan_or_bad_shape(self):
        pts = np.array([[0.0, 0.0], [1.0, 1.0]])
        with pytest.raises(ValueError, match="not finite"):
            wp.integrate(wp.OneForm([lambda c: np.log(c[:, 0] - 0.5), 0.0]), pts)
        with pytest.raises(ValueError, match="returned shape"):
            wp.integrate(wp.OneForm([lambda c: c, 0.0]), pts)

    def test_inputs_never_modified(self):
        pts = np.random.default_rng(0).normal(size=(50, 2))
        pts.flags.writeable = False
        copy = pts.copy()
        seen = []

        def f(c):
            seen.append(np.shares_memory(c, pts))
            return c[:, 0] ** 2
        wp.integrate(wp.OneForm([f, 1.0]), pts)
        wp.integrate(wp.dx(0) ^ wp.dx(1), pts, curve="spline")
        np.testing.assert_array_equal(pts, copy)
        # the user's callable was called, and never on (a view of) the caller's array
        assert seen and not any(seen)

    def test_sympy_parameters_refused(self):
        a = sp.Symbol("a")
        with pytest.raises(ValueError, match="not coordinates"):
            wp.Form.from_sympy([a * X, Y], (X, Y))

    def test_d_of_callable_form_refused(self):
        with pytest.raises(TypeError, match="callable coefficients"):
            wp.OneForm([np.sin, np.cos]).d()


def test_no_runtime_warnings_on_degenerate_paths():
    # repeated points and zero-length segments contribute exactly nothing
    pts = np.array([[0, 0], [0, 0], [1, 0], [1, 0], [1, 1], [0, 0]], float)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        r = wp.integrate(wp.OneForm([lambda c: np.exp(c[:, 1]), lambda c: c[:, 0]]), pts)
        s = wp.integrate(wp.dx(0) ^ wp.dx(1), pts)
    # by hand: (0,0)->(1,0) gives int e^0 dx = 1; (1,0)->(1,1) gives int x dy = 1;
    # (1,1)->(0,0) along x = y = u, u from 1 to 0, gives (1 - e) - 1/2; total 5/2 - e
    assert float(r) == pytest.approx(2.5 - math.e, rel=1e-12)
    assert float(s) == pytest.approx(0.5)


class TestSplineModel:
    def test_polynomial_form_exact_on_the_spline_itself(self):
        # The spline model integrates along the cubic spline scipy builds through the
        # samples; a polynomial form pulled back to a cubic is a polynomial, so the
        # Gauss rule must reproduce the exact integral along that very spline, computed
        # below piece by piece from the spline's coefficients in exact rational
        # arithmetic (the same value as symbolic.line_integral gives, at a fraction of its cost).
        from scipy.interpolate import CubicSpline
        rng = np.random.default_rng(2)
        t = np.cumsum(rng.uniform(0.5, 1.5, 7))
        pts = rng.normal(size=(7, 2))
        comps = [X**2 * Y, X - Y**3]
        got = wp.integrate(wp.Form.from_sympy(comps, (X, Y)), wp.Path(pts, times=t), curve="spline")
        cs = CubicSpline(t, pts, axis=0, bc_type="not-a-knot")
        # exact rational arithmetic on the spline's own (float, hence rational) coefficients:
        # polynomials in s as coefficient lists, lowest degree first
        F = Fraction

        def mul(a, b):
            out = [F(0)] * (len(a) + len(b) - 1)
            for i, u in enumerate(a):
                for j, v in enumerate(b):
                    out[i + j] += u * v
            return out

        def add(a, b):
            n = max(len(a), len(b))
            return [(a[i] if i < len(a) else 0) + (b[i] if i < len(b) else 0) for i in range(n)]

        def deriv(a):
            return [m * a[m] for m in range(1, len(a))] or [F(0)]

        exact = F(0)
        for k in range(len(t) - 1):
            h = F(float(t[k + 1] - t[k]))
            x, y = ([F(float(cs.c[3 - m, k, d])) for m in range(4)] for d in range(2))
            # the 1-form x^2 y dx + (x - y^3) dy pulled back along (x(s), y(s))
            integrand = add(mul(mul(mul(x, x), y), deriv(x)),
                            mul(add(x, [-c for c in mul(mul(y, y), y)]), deriv(y)))
            exact += sum(c * h ** (m + 1) / (m + 1) for m, c in enumerate(integrand))
        assert got.exact
        assert float(got) == pytest.approx(float(exact), rel=1e-12)

    @pytest.mark.parametrize("closure", ["none", "chord", "detrend"])
    def test_short_pieces_and_closures(self, closure):
        pts = np.array([[0, 0], [1, 0], [np.nan, np.nan], [2, 0], [3, 1], [2, 2],
                        [np.nan, np.nan], [5, 5]], float)
        p = wp.Path(pts, times=np.arange(8.0))
        w = wp.Form.from_sympy([-Y, X], (X, Y))
        r = wp.integrate(w, p, closure=closure, curve="spline")
        # by hand, for -y dx + x dy.  Piece (0,0),(1,0): a straight segment on y = 0, 0.
        # Piece (2,0),(3,1),(2,2) at t = 3, 4, 5: the not-a-knot cubic through three
        # samples is the interpolating parabola, u = t - 4: x = 3 - u^2, y = u + 1, so
        # the integrand is u^2 + 2u + 3 and its integral over [-1, 1] is 20/3.
        # chord: the straight chord (2,2) -> (2,0) adds int 2 dy = -4 (the first
        # piece's chord lies on y = 0).  detrend: the drift (0, 2) is removed, the
        # piece becomes (2,0),(3,0),(2,0), on y = 0: 0.  The single sample adds nothing.
        want = {"none": 20 / 3, "chord": 20 / 3 - 4, "detrend": 0.0}[closure]
        assert r.exact
        assert float(r) == pytest.approx(want, rel=1e-12, abs=1e-12)

    def test_spline_equals_linear_for_constant_forms(self):
        rng = np.random.default_rng(4)
        pts = rng.normal(size=(30, 3))
        w = wp.dx(0) - 2 * wp.dx(2)
        a = wp.integrate(w, wp.Path(pts, times=np.cumsum(rng.uniform(0.1, 1, 30))), curve="spline")
        b = wp.integrate(w, pts)
        assert float(a) == pytest.approx(float(b), rel=1e-13)


@settings(max_examples=60, deadline=None)
@given(point_arrays(2, min_T=2, max_T=40), st.data())
def test_gappy_paths_equal_sum_over_pieces(pts, data):
    gaps = data.draw(arrays(np.bool_, (pts.shape[0],)))
    if gaps.all():
        gaps[0] = False
    pts = pts.copy()
    pts[gaps] = np.nan
    p = wp.Path(pts)
    closure = data.draw(st.sampled_from(["none", "chord"]))
    for form in (wp.dx(0) ^ wp.dx(1), wp.Form.from_sympy([X * Y, X - Y], (X, Y)), 3 * wp.dx(1)):
        if form.degree == 2 and closure == "none":
            continue
        whole = float(wp.integrate(form, p, closure=closure))
        parts = sum(float(wp.integrate(form, pc, closure=closure)) for pc in p.pieces
                    if pc.n_samples >= 2)
        assert whole == pytest.approx(parts, rel=1e-9, abs=1e-7)


# ------------------------------------------------------------------ error estimates that hold
class TestErrorEstimatesHold:
    """Issue 14 item 1: features between the first nodes are not accepted unseen."""

    @staticmethod
    def gaussian_form(cx, s=0.02):
        return wp.OneForm([lambda c: np.exp(-((c[:, 0] - cx) ** 2 + c[:, 1] ** 2) / s ** 2),
                           lambda c: np.cos(c[:, 1])])

    @staticmethod
    def gaussian_reference(cx, s=0.02):
        # ∫_0^4 exp(-(x - cx)^2 / s^2) dx + ∫_0^1 cos y dy = (s √π / 2)(erf((4 - cx)/s) +
        # erf(cx/s)) + sin 1 (the Gaussian integral in closed form; Abramowitz & Stegun,
        # Handbook of Mathematical Functions, 7.1.1 for erf)
        return (math.sin(1.0) + 0.5 * s * math.sqrt(math.pi)
                * (math.erf((4.0 - cx) / s) + math.erf(cx / s)))

    def test_narrow_bump_on_a_long_segment(self):
        # the case of the issue: 0.8414710 with error 1.9e-12 before (the bump was missed)
        r = wp.integrate(self.gaussian_form(1.6), [[0, 0], [4, 0], [4, 1]])
        ref = self.gaussian_reference(1.6)
        assert ref == pytest.approx(0.8769201, abs=5e-8)
        assert abs(float(r) - ref) <= r.error + r.rounding

    def test_sampling_of_the_same_curve_does_not_change_the_answer(self):
        w = self.gaussian_form(1.6)
        a = wp.integrate(w, [[0, 0], [4, 0], [4, 1]])
        b = wp.integrate(w, [[0, 0], [2, 0], [4, 0], [4, 1]])     # a collinear sample more
        assert abs(float(a) - float(b)) <= a.error + b.error + a.rounding + b.rounding

    @pytest.mark.parametrize("seed", range(12))
    def test_other_narrow_bumps_on_long_segments(self, seed):
        # the same kind of case elsewhere: a bump of width 0.01..0.03 anywhere on the
        # 4-long segment (node positions of any fixed rule are missed by some centre)
        rng = np.random.default_rng(seed)
        cx, s = rng.uniform(0.05, 3.95), rng.uniform(0.01, 0.03)
        r = wp.integrate(self.gaussian_form(cx, s), [[0, 0], [4, 0], [4, 1]], rtol=1e-8)
        assert abs(float(r) - self.gaussian_reference(cx, s)) <= r.error + r.rounding

    def test_estimate_larger_than_the_value_warns(self):
        # ∫_{-1}^{1} dx / |x| diverges: the estimate cannot be met and exceeds the value
        w = wp.OneForm([lambda c: 1.0 / np.abs(c[:, 0]) ** 1.5, 0.0])
        with pytest.warns(wp.IntegrationWarning, match="may not converge"):
            wp.integrate(w, [[-1.0, 0.3], [1.0, 0.3 + 1e-9]], rtol=1e-8)

    def test_warning_points_at_the_callers_line(self):
        w = wp.OneForm([lambda c: np.sign(c[:, 0] - 1 / 3) * 1.0, 0.0])
        with warnings.catch_warnings(record=True) as seen:
            warnings.simplefilter("always")
            line = sys._getframe().f_lineno + 1
            wp.integrate(w, [[0.0, 0.0], [1.0, 0.0]], rtol=1e-14, max_levels=2)
        hits = [x for x in seen if issubclass(x.category, wp.IntegrationWarning)]
        assert len(hits) == 1
        assert (hits[0].filename, hits[0].lineno) == (__file__, line)

    def test_overflow_met_while_refining_warns_with_its_point(self):
        # x^-64 overflows float64 near x = 0, which refinement approaches: a warning names
        # the point and says the integral may not converge (before: a huge value, no warning)
        w = wp.OneForm([lambda c: c[:, 0] ** -64.0, 0.0])
        with pytest.warns(wp.IntegrationWarning, match="not finite at .*may not converge"):
            r = wp.integrate(w, [[-1.0, 0.0], [1.0, 0.0]])
        assert r.error > abs(float(r))

    def test_resolution_option(self):
        # a bump of width 1e-4 of the diameter hides between the nodes of the default
        # minimum subdivision at some positions (it is below the documented limit); with
        # resolution=256 the estimate holds at every one of these positions
        D = math.sqrt(17.0)
        rng = np.random.default_rng(3)
        s = 1e-4 * D
        missed = {32: 0, 256: 0}
        for c in rng.uniform(0.2, 3.8, 20):
            ref = self.gaussian_reference(c, s)
            for res in missed:
                r = wp.integrate(self.gaussian_form(c, s), [[0, 0], [4, 0], [4, 1]],
                                 resolution=res)
                missed[res] += abs(float(r) - ref) > r.error + r.rounding
        assert missed[32] > 0 and missed[256] == 0, missed
        with pytest.raises(ValueError, match="resolution must be >= 1"):
            wp.integrate(self.gaussian_form(1.0), [[0, 0], [1, 0]], resolution=0)

    @pytest.mark.parametrize("seed", range(3))
    def test_bumps_down_to_the_documented_width_are_found(self, seed):
        # docs/integration.md: Gaussian bumps down to about 0.06% of the diameter are found
        # at the default resolution (measured over many random positions)
        D = math.sqrt(17.0)
        rng = np.random.default_rng(100 + seed)
        for c in rng.uniform(0.2, 3.8, 25):
            s = 6e-4 * D
            r = wp.integrate(self.gaussian_form(c, s), [[0, 0], [4, 0], [4, 1]], rtol=1e-8)
            assert abs(float(r) - self.gaussian_reference(c, s)) <= r.error + r.rounding


class TestWorkBound:
    """max_evaluations bounds the work: refused before evaluating, or refinement capped."""

    def test_first_pass_above_the_bound_is_refused_before_evaluating(self):
        calls = []

        def f(c):
            calls.append(len(c))
            return np.sin(c[:, 0])
        with pytest.raises(ValueError, match="minimum subdivision alone needs"):
            wp.integrate(wp.OneForm([f, 0.0]), [[0, 0], [4, 0], [4, 1]], max_evaluations=100)
        assert calls == []

    @pytest.mark.parametrize("bound", [2_000, 5_000, 15_000])
    def test_refinement_stays_within_the_bound(self, bound):
        # sin(20 / (x + 0.01)) oscillates ever faster towards x = 0: at rtol 1e-12 it takes
        # about 19,000 evaluations, more than these bounds allow, so refinement stops at the
        # bound and says so
        w = wp.OneForm([lambda c: np.sin(20.0 / (c[:, 0] + 0.01)), 0.0])
        with warnings.catch_warnings(record=True) as seen:
            warnings.simplefilter("always")
            r = wp.integrate(w, [[0, 0], [4, 0], [4, 1]], rtol=1e-12, max_evaluations=bound)
        assert r.evaluations <= bound
        msgs = [str(x.message) for x in seen if issubclass(x.category, wp.IntegrationWarning)]
        assert len(msgs) == 1 and "limit of" in msgs[0], msgs

    def test_region_integral_within_the_bound(self):
        t = np.linspace(0, 2 * np.pi, 300, endpoint=False)
        loop = np.column_stack([np.cos(t), np.sin(t)])
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", wp.IntegrationWarning)
            for bound in (2 * 10**5, 10**6):
                r = wp.region_integral(lambda x, y: np.sqrt(np.abs(x * y)), loop,
                                       max_evaluations=bound)
                assert r.evaluations <= bound
        with pytest.raises(ValueError, match="lower resolution"):
            wp.region_integral(lambda x, y: x * np.exp(y), loop, max_evaluations=1000)
        with pytest.raises(ValueError, match="max_evaluations must be >= 1"):
            wp.region_integral(lambda x, y: x, loop, max_evaluations=0)
