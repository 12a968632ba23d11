"""Exact winding numbers (wedgepath.winding_number).

The reference is an independent angle-sum computation: the winding number
of a closed polygon around q is (1/2 pi) times the sum of the signed angles
its edges subtend at q (common practice, no source).  It is valid for points
off the curve; points on the curve are checked against the documented rule
by perturbing them, and near-degenerate points against exact rational
arithmetic.
"""

from __future__ import annotations

from fractions import Fraction

import numpy as np
import pytest
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st

import wedgepath as wp

PROPS = settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])


def angle_sum(poly, q):
    """Winding numbers of the closed polygon around each row of q by summed angles."""
    P = np.asarray(poly, dtype=float)
    P = np.vstack([P, P[:1]])
    q = np.atleast_2d(np.asarray(q, dtype=float))
    d1 = P[None, :-1, :] - q[:, None, :]
    d2 = P[None, 1:, :] - q[:, None, :]
    cross = d1[..., 0] * d2[..., 1] - d1[..., 1] * d2[..., 0]
    dot = (d1 * d2).sum(-1)
    return np.rint(np.arctan2(cross, dot).sum(axis=1) / (2 * np.pi)).astype(int)


def distance_to_polygon(poly, q):
    P = np.asarray(poly, dtype=float)
    P = np.vstack([P, P[:1]])
    a, b = P[None, :-1, :], P[None, 1:, :]
    q = q[:, None, :]
    ab = b - a
    t = np.clip(((q - a) * ab).sum(-1) / np.maximum((ab * ab).sum(-1), 1e-300), 0, 1)
    near = a + t[..., None] * ab
    return np.sqrt(((q - near) ** 2).sum(-1)).min(axis=1)


@st.composite
def int_polygons(draw, max_size=10, span=6):
    n = draw(st.integers(3, max_size))
    c = st.integers(-span, span)
    return np.array(draw(st.lists(st.tuples(c, c), min_size=n, max_size=n)), dtype=float)


# --------------------------------------------------------------------------- agreement
def test_random_polygons_agree_with_angle_sum():
    rng = np.random.default_rng(11)
    for trial in range(25):
        n = int(rng.integers(3, 60))
        poly = rng.normal(size=(n, 2)) * rng.uniform(0.1, 100)
        q = rng.normal(size=(3000, 2)) * np.abs(poly).max()
        q = q[distance_to_polygon(poly, q) > 1e-9 * np.abs(poly).max()]
        assert np.array_equal(wp.winding_number(poly, q), angle_sum(poly, q)), trial


def test_many_turn_loop_agrees_with_angle_sum():
    # A loop circling 12 times with a wobble: winding numbers up to 12.
    t = np.linspace(0, 24 * np.pi, 3000, endpoint=False)
    r = 1 + 0.3 * np.sin(0.7 * t)
    poly = np.column_stack([r * np.cos(t), r * np.sin(t)])
    # 800 query points (the two dense oracles cost points x vertices): every winding
    # number from 0 to 12 is still hit
    q = np.random.default_rng(2).uniform(-1.4, 1.4, size=(800, 2))
    q = q[distance_to_polygon(poly, q) > 1e-9]
    got = wp.winding_number(poly, q)
    assert np.array_equal(got, angle_sum(poly, q))
    assert set(got.tolist()) == set(range(13))


@PROPS
@given(int_polygons(), st.lists(st.tuples(st.integers(-7, 7), st.integers(-7, 7)),
                                min_size=1, max_size=40))
def test_half_integer_queries_agree_with_angle_sum(poly, pts):
    # Query points at half-integer offsets (x + 1/2, y + 1/4) never lie on an
    # integer polygon's edges unless the edge passes through them; filter those.
    q = np.array(pts, dtype=float) + [0.5, 0.25]
    q = q[distance_to_polygon(poly, q) > 1e-9]
    if q.size:
        assert np.array_equal(wp.winding_number(poly, q), angle_sum(poly, q))


@PROPS
@given(int_polygons(), st.lists(st.tuples(st.integers(-7, 7), st.integers(-7, 7)),
                                min_size=1, max_size=40))
def test_points_on_the_curve_follow_the_documented_rule(poly, pts):
    # Documented rule: w(q) = w(q + (e, e^2)) for small e > 0.  For integer
    # polygons within [-6, 6] and e = 1e-4, q + (e, e^2) is off the curve.
    q = np.array(pts, dtype=float)
    e = 1e-4
    assert np.array_equal(wp.winding_number(poly, q), angle_sum(poly, q + [e, e * e]))


def test_square_boundary_rule_examples():
    sq = [[0, 0], [2, 0], [2, 2], [0, 2]]
    pts = [[0, 1], [2, 1], [1, 0], [1, 2], [0, 0], [2, 0], [2, 2], [0, 2], [1, 1], [3, 3]]
    # left/bottom edges and the bottom-left corner count as inside, right/top
    # edges and the other corners as outside
    assert wp.winding_number(sq, pts).tolist() == [1, 0, 1, 0, 1, 0, 0, 0, 1, 0]
    assert wp.winding_number(sq[::-1], pts).tolist() == [-1, 0, -1, 0, -1, 0, 0, 0, -1, 0]


def exact_crossings(poly, q):
    """The documented half-open crossing rule in exact rational arithmetic."""
    P = [tuple(map(Fraction, p)) for p in np.asarray(poly, dtype=float)]
    P.append(P[0])
    out = []
    for qx, qy in np.asarray(q, dtype=float):
        qx, qy = Fraction(qx), Fraction(qy)
        w = 0
        for (ax, ay), (bx, by) in zip(P[:-1], P[1:]):
            if ay == by:
                continue
            (lx, ly), (hx, hy), s = ((ax, ay), (bx, by), 1) if ay < by else ((bx, by), (ax, ay), -1)
            if ly <= qy < hy and (lx - qx) * (hy - qy) - (ly - qy) * (hx - qx) > 0:
                w += s
        out.append(w)
    return np.array(out)


def test_near_degenerate_points_are_exact():
    # Grid of points within 64 units in the last place of (0.5, 0.5), tested
    # against a long edge through it on the line y = x: the setting of
    # Kettner, Mehlhorn, Pion, Schirra & Yap, "Classroom examples of
    # robustness problems in geometric computations", Comput. Geom. 40 (2008),
    # Fig. 1 (from memory), where plain floating-point orientation tests give
    # wrong signs for many points.  Reference: the crossing rule in exact
    # rational arithmetic.
    u = 2.0 ** -53
    i, j = np.meshgrid(np.arange(40), np.arange(40))
    q = np.column_stack([0.5 + i.ravel() * u, 0.5 + j.ravel() * u])
    poly = np.array([[-12.0, -12.0], [24.0, 24.0], [-30.0, 30.0]])
    expected = exact_crossings(poly, q)
    assert set(expected.tolist()) == {0, 1}          # both sides of the edge occur
    assert np.array_equal(wp.winding_number(poly, q), expected)


@pytest.mark.parametrize("poly", [
    [[0, 0], [2, 1], [-2, 1.11253693e-308]],             # a nearly horizontal edge
    [[0, 0], [2, 1], [-2, 5e-324]],                       # ... one subnormal unit high
    [[0, 0], [2, 5e-324], [-2, 1e-323], [1, 2e-323]],    # a curve a few subnormals thin
    [[1e100, 0], [-1e100, 5e-324], [0, 1]],               # wide and thin at once
])
def test_curves_thin_to_the_last_bits_are_exact(poly):
    # y-extents in the subnormal range next to x of order one: the products of the
    # orientation test underflow, so the exact stage must not rely on them.  Reference:
    # the crossing rule in exact rational arithmetic (exact_crossings, above).
    poly = np.array(poly, dtype=float)
    rng = np.random.default_rng(11)
    ys = np.unique(poly[:, 1])
    span = float(np.abs(poly[:, 0]).max())
    q = np.column_stack([rng.uniform(-1.5 * span, 1.5 * span, 400),
                         rng.choice(np.concatenate([ys, ys / 2, ys * 1.5, [0.5]]), 400)])
    q = np.vstack([q, poly])                               # the vertices themselves
    expected = exact_crossings(poly, q)
    assert set(expected.tolist()) - {0}                     # some points are inside
    assert np.array_equal(wp.winding_number(poly, q), expected)
    assert np.array_equal(wp.winding_number(poly[::-1], q), -expected)


_COORD = st.one_of(st.floats(-1e-300, 1e-300), st.floats(-4, 4),
                   st.floats(allow_nan=False, allow_infinity=False), st.sampled_from([0.0, 5e-324]))


@PROPS
@given(st.lists(st.tuples(*[_COORD] * 6), min_size=1, max_size=40))
def test_orientation_sign_is_exact_for_every_finite_input(triples):
    # any finite doubles, subnormal and near-overflow ones included; reference: the
    # determinant in exact rational arithmetic (common practice, no source)
    from wedgepath.planar._predicates import orient_sign
    cols = [np.array(c, dtype=float) for c in zip(*triples)]
    expected = []
    for ax, ay, bx, by, cx, cy in (map(Fraction, t) for t in triples):
        d = (ax - cx) * (by - cy) - (ay - cy) * (bx - cx)
        expected.append((d > 0) - (d < 0))
    assert orient_sign(*cols).tolist() == expected


def test_thin_noisy_loop_is_exact():
    # many rows and sub-edges on a loop whose y-extent is subnormal (same reference)
    rng = np.random.default_rng(12)
    t = np.linspace(0, 2 * np.pi, 60, endpoint=False)
    poly = np.column_stack([np.cos(t), np.sin(t) * 1e-310]) + rng.normal(0, 0.05, (60, 2)) * [1, 1e-310]
    q = np.column_stack([rng.uniform(-1.2, 1.2, 500), rng.uniform(-1.2e-310, 1.2e-310, 500)])
    assert np.array_equal(wp.winding_number(poly, q), exact_crossings(poly, q))


def test_points_an_ulp_off_edges_far_from_origin_are_exact():
    rng = np.random.default_rng(5)
    poly = 1e8 + rng.uniform(0, 5, (5, 2))
    P = np.vstack([poly, poly[:1]])
    k = rng.integers(0, 5, 300)
    t = rng.uniform(0, 1, 300)
    q = P[k] + t[:, None] * (P[k + 1] - P[k])
    q = q + rng.integers(-2, 3, size=q.shape) * np.spacing(q)
    assert np.array_equal(wp.winding_number(poly, q), exact_crossings(poly, q))


# --------------------------------------------------------------------------- structure
def test_loop_traced_twice_and_gaps_add():
    sq = np.array([[0, 0], [2, 0], [2, 2], [0, 2]], dtype=float)
    assert wp.winding_number(np.vstack([sq, sq]), [1, 1]) == 2
    inner = np.array([[0.5, 0.5], [0.5, 1.5], [1.5, 1.5], [1.5, 0.5]])   # clockwise
    path = np.vstack([sq, [[np.nan, np.nan]], inner])
    assert wp.winding_number(path, [[1, 1], [0.2, 0.2], [5, 5]]).tolist() == [0, 1, 0]


def test_shapes_of_results():
    sq = [[0, 0], [2, 0], [2, 2], [0, 2]]
    r = wp.winding_number(sq, [1, 1])
    assert r.shape == () and r.dtype == np.int64 and int(r) == 1
    grid = np.stack(np.meshgrid(np.linspace(-1, 3, 5), np.linspace(-1, 3, 4)), axis=-1)
    out = wp.winding_number(sq, grid)
    assert out.shape == (4, 5)
    assert wp.winding_number(sq, np.zeros((0, 2))).shape == (0,)


@st.composite
def float_polygons(draw, max_size=12):
    n = draw(st.integers(3, max_size))
    c = st.floats(-10, 10, allow_nan=False, allow_infinity=False)
    return np.array(draw(st.lists(st.tuples(c, c), min_size=n, max_size=n)))


@PROPS
@given(float_polygons(), st.floats(0, 2 * np.pi), st.floats(-1e3, 1e3), st.floats(-1e3, 1e3),
       st.lists(st.tuples(st.floats(-12, 12), st.floats(-12, 12)), min_size=1, max_size=30))
# found by hypothesis: an edge 4 wide and 1.1e-308 high overflowed its slope
@example(poly=np.array([[0.0, 0.0], [2.0, 1.0], [-2.0, 1.11253693e-308]]), angle=0.0, tx=0.0,
         ty=0.0, pts=[(1.0, 0.0)])
def test_rigid_motions_and_reversal(poly, angle, tx, ty, pts):
    # a rotation and translation of curve and points together leaves every winding
    # number unchanged; reversing the curve negates them (common practice, no source).
    # Rotating in floating point moves points by ~1e-13: points closer than 1e-6 (relative)
    # to the curve, where the answer may legitimately flip, are left out.
    q = np.array(pts, dtype=float)
    scale = max(1.0, float(np.abs(poly).max()))
    far = distance_to_polygon(poly, q) > 1e-6 * scale
    q = q[far]
    w = wp.winding_number(poly, q)
    assert np.array_equal(w, angle_sum(poly, q))
    R = np.array([[np.cos(angle), -np.sin(angle)], [np.sin(angle), np.cos(angle)]])
    move = (lambda a: a @ R.T + [tx, ty])
    assert np.array_equal(wp.winding_number(move(poly), move(q)), w)
    assert np.array_equal(wp.winding_number(poly[::-1], q), -w)


@PROPS
@given(int_polygons(), st.integers(0, 3), st.booleans(),
       st.lists(st.tuples(st.integers(-7, 7), st.integers(-7, 7)), min_size=1, max_size=30))
def test_quarter_turns_and_mirrors_are_exact(poly, turns, mirror, pts):
    # quarter turns are exact in floating point: nothing is rounded, and points off the
    # curve keep their winding numbers exactly (the documented rule for points on the curve
    # is half-open, not rotation-invariant, and is tested elsewhere); a mirror image
    # negates the winding
    q = np.array(pts, dtype=float) + 0.5
    q = q[distance_to_polygon(poly, q) > 0]
    R = np.linalg.matrix_power(np.array([[0.0, -1.0], [1.0, 0.0]]), turns)
    w = wp.winding_number(poly, q)
    assert np.array_equal(wp.winding_number(poly @ R.T, q @ R.T), w)
    if mirror:
        M = np.array([[-1.0, 0.0], [0.0, 1.0]])
        assert np.array_equal(wp.winding_number(poly @ M.T, q @ M.T), -w)


def test_reversal_negates_and_translation_is_invariant():
    rng = np.random.default_rng(4)
    poly = rng.normal(size=(30, 2))
    q = rng.normal(size=(500, 2))
    w = wp.winding_number(poly, q)
    assert np.array_equal(wp.winding_number(poly[::-1], q), -w)
    shift = np.array([1024.0, -512.0])     # exact shift in binary
    assert np.array_equal(wp.winding_number(poly + shift, q + shift), w)


def test_degenerate_curves():
    # repeated points, zero-length segments, back-tracking, horizontal runs
    curve = [[0, 0], [0, 0], [2, 0], [3, 0], [2, 0], [2, 2], [2, 2], [0, 2]]
    assert wp.winding_number(curve, [[1, 1], [2.5, 0.5]]).tolist() == [1, 0]
    # collinear loop: nothing is enclosed
    assert wp.winding_number([[0, 0], [1, 1], [2, 2]], [[1, 1], [0.5, 0.2]]).tolist() == [0, 0]
    # fewer than 3 points
    assert wp.winding_number([[0, 0], [1, 1]], [[0.5, 0.5]]).tolist() == [0]
    assert wp.winding_number(np.zeros((1, 2)), [[0.5, 0.5]]).tolist() == [0]


def test_closure_options():
    open_path = [[0, 0], [2, 0], [2, 2], [0, 2]]
    with pytest.raises(ValueError, match="'chord'.*'detrend'.*'require'"):
        wp.winding_number(open_path, [1, 1], closure="none")
    assert wp.winding_number(open_path + [[0, 0]], [1, 1], closure="none") == 1


# --------------------------------------------------------------------------- bad input
def test_bad_inputs():
    sq = [[0, 0], [2, 0], [2, 2], [0, 2]]
    with pytest.raises(ValueError, match=r"plane\("):
        wp.winding_number(np.zeros((4, 3)), [1, 1])
    with pytest.raises(ValueError, match="NaN"):
        wp.winding_number(sq, [[1, np.nan]])
    with pytest.raises(ValueError, match=r"shape \(m, 2\)"):
        wp.winding_number(sq, [[1, 1, 1]])
    with pytest.raises(ValueError, match=r"shape \(m, 2\)"):
        wp.winding_number(sq, 3.0)
    with pytest.raises(TypeError, match="complex"):
        wp.winding_number(sq, np.array([[1 + 1j, 2]]))


def test_inputs_are_not_modified():
    poly = np.array([[0.0, 0.0], [2.0, 0.0], [2.0, 2.0], [0.0, 2.0]])
    q = np.array([[1.0, 1.0], [3.0, 3.0]])
    pc, qc = poly.copy(), q.copy()
    poly.flags.writeable = False
    q.flags.writeable = False
    assert wp.winding_number(poly, q).tolist() == [1, 0]
    assert np.array_equal(poly, pc) and np.array_equal(q, qc)
