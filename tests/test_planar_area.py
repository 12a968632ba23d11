"""Signed area and region moments of planar loops (wedgepath.planar).

Reference values come from named outside sources (noted beside each check)
or from an independent route (shapely/GEOS areas, the exact sympy layer).
"""

from __future__ import annotations

import math
import warnings

import numpy as np
import pytest
import shapely
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import wedgepath as wp
from wedgepath import symbolic as sy

PROPS = settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])


@st.composite
def polygons(draw, min_size=3, max_size=12, lo=-1e3, hi=1e3):
    n = draw(st.integers(min_size, max_size))
    coord = st.floats(lo, hi, allow_nan=False, allow_infinity=False, width=64)
    return np.array(draw(st.lists(st.tuples(coord, coord), min_size=n, max_size=n)))


def star_polygon(rng, n, center=(0.0, 0.0), r0=1.0):
    """A simple (star-shaped) polygon: increasing angles, positive radii."""
    ang = np.sort(rng.uniform(0, 2 * np.pi, n))
    rad = r0 * rng.uniform(0.3, 1.0, n)
    return np.column_stack([center[0] + rad * np.cos(ang), center[1] + rad * np.sin(ang)])


# --------------------------------------------------------------------------- signed area
def test_regular_ngon_area_matches_closed_form():
    # Area of a regular N-gon inscribed in a circle of radius r is
    # (N/2) r^2 sin(2*pi/N) (common practice, no source).
    for n, r in [(3, 1.0), (4, 2.5), (7, 0.3), (100, 10.0), (1000, 1.0)]:
        k = np.arange(n)
        pts = r * np.column_stack([np.cos(2 * np.pi * k / n), np.sin(2 * np.pi * k / n)])
        expected = 0.5 * n * r * r * math.sin(2 * math.pi / n)
        assert wp.signed_area(pts) == pytest.approx(expected, rel=1e-13)
        assert wp.signed_area(pts[::-1]) == pytest.approx(-expected, rel=1e-13)


def test_simple_polygon_areas_match_shapely():
    # Independent implementation: GEOS polygon area through shapely.area.
    rng = np.random.default_rng(7)
    for _ in range(40):
        pts = star_polygon(rng, int(rng.integers(3, 40)), center=rng.normal(size=2) * 5)
        expected = shapely.area(shapely.Polygon(pts))
        assert wp.signed_area(pts) == pytest.approx(expected, rel=1e-12)
        assert wp.signed_area(pts[::-1]) == pytest.approx(-expected, rel=1e-12)


def test_far_from_origin_keeps_precision():
    # The unit square's area is 1 exactly; with coordinates near 1e12 a
    # shoelace sum about the origin would lose every digit.
    sq = np.array([[0.0, 0.0], [1.0, 0.0], [1.0, 1.0], [0.0, 1.0]])
    for off in (1e6, 1e9, 1e12):
        assert wp.signed_area(sq + off) == 1.0
        assert wp.signed_area(sq + [off, -off]) == 1.0


def test_chord_closure_is_levy_area_of_open_path():
    # Triangle (0,0),(1,0),(1,1) closed by its chord: area 1/2.
    assert wp.signed_area([[0, 0], [1, 0], [1, 1]]) == 0.5
    closed = [[0, 0], [1, 0], [1, 1], [0, 0]]
    assert wp.signed_area(closed, closure="none") == 0.5


def test_detrend_closure():
    # Detrending (0,0),(1,0),(2,1) by s*(2,1), s = 0, 1/2, 1 gives
    # (0,0),(0,-1/2),(0,0): a degenerate loop with zero area.
    assert wp.signed_area([[0, 0], [1, 0], [2, 1]], closure="detrend") == 0.0
    # Detrending (0,0),(1,-1),(1,1),(0,1) by s*(0,1), s = 0..1 in thirds:
    # (0,0),(1,-4/3),(1,1/3),(0,0); shoelace: (1/2)(1/3 + 4/3) = 5/6.
    got = wp.signed_area([[0, 0], [1, -1], [1, 1], [0, 1]], closure="detrend")
    assert got == pytest.approx(5 / 6, rel=1e-15)


def test_gaps_split_into_pieces_that_add():
    a = np.array([[0, 0], [2, 0], [2, 2], [0, 2]], dtype=float)
    b = np.array([[5, 5], [5, 6], [6, 6], [6, 5]], dtype=float)   # clockwise, area -1
    joined = np.vstack([a, [[np.nan, np.nan]], b])
    assert wp.signed_area(joined) == 4.0 - 1.0
    assert wp.signed_area(wp.Path(joined)) == 3.0


def test_fewer_than_three_distinct_points_is_zero_without_warning():
    cases = [[[0, 0], [1, 1]], [[0, 0], [0, 0], [0, 0]], [[0, 0], [1, 1], [0, 0], [1, 1]],
             [[1.5, 2.5]], np.zeros((0, 2)),
             [[0.1, 0.7], [0.3, 0.9], [0.1, 0.7], [0.3, 0.9], [0.1, 0.7]]]
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        for pts in cases:
            assert wp.signed_area(pts) == 0.0
            assert wp.region_moments(pts).area == 0.0


def test_collinear_loop_has_zero_area():
    assert wp.signed_area([[0, 0], [1, 1], [2, 2], [3, 3], [1, 1]]) == 0.0


def test_works_on_any_plane_of_an_nd_path():
    t = np.linspace(0, 2 * np.pi, 401)[:-1]
    X = np.column_stack([np.cos(t), np.zeros_like(t), np.sin(t), 3 * np.cos(t)])
    p = wp.Path(X)
    # inscribed 400-gon of the unit circle: (N/2) sin(2 pi / N) (common practice, no source)
    expected = 200 * math.sin(2 * math.pi / 400)
    assert wp.signed_area(p.plane(0, 2)) == pytest.approx(expected, rel=1e-13)
    assert wp.signed_area(p.plane(2, 0)) == pytest.approx(-expected, rel=1e-13)
    assert wp.signed_area(p.plane(0, 3)) == pytest.approx(0.0, abs=1e-12)   # a segment


# --------------------------------------------------------------------------- bad input
def test_open_path_with_closure_none_names_the_options():
    with pytest.raises(ValueError, match="closure='none'.*'chord'.*'detrend'.*'require'"):
        wp.signed_area([[0, 0], [1, 0], [1, 1]], closure="none")
    with pytest.raises(ValueError, match="piece 1"):
        wp.region_moments([[0, 0], [1, 0], [0, 0], [np.nan, np.nan], [0, 0], [1, 1]],
                          closure="none")


def test_unknown_closure_is_refused():
    with pytest.raises(ValueError, match="unknown closure 'open'"):
        wp.signed_area([[0, 0], [1, 0], [1, 1]], closure="open")


@pytest.mark.parametrize("fn", [wp.signed_area, wp.region_moments])
def test_non_planar_input_suggests_plane(fn):
    with pytest.raises(ValueError, match=r"2 channels, got 3.*plane\(0, 1\)"):
        fn(np.zeros((5, 3)))
    with pytest.raises(ValueError, match=r"plane\("):
        fn(wp.Path(np.random.default_rng(0).normal(size=(6, 4))))
    with pytest.raises(ValueError, match="shape"):
        fn(np.zeros(6))


def test_bad_values_are_refused_clearly():
    with pytest.raises(ValueError, match="infinite"):
        wp.signed_area([[0, 0], [1, np.inf], [1, 1]])
    with pytest.raises(TypeError, match="complex"):
        wp.signed_area(np.array([[0, 0], [1, 0], [1, 1j]]))
    with pytest.raises(TypeError, match="text"):
        wp.signed_area([["a", "b"], ["c", "d"], ["e", "f"]])


def test_overflowing_coordinates_are_refused_not_nan():
    huge = [[0, 0], [1e200, 0], [1e200, 1e200]]
    with pytest.raises(ValueError, match="overflows float64"):
        wp.signed_area(huge)
    with pytest.raises(ValueError, match="overflows float64"):
        wp.region_moments([[0, 0], [1e100, 0], [1e100, 1e100]])
    with pytest.raises(ValueError, match="overflows float64"):
        wp.region_integral(lambda x, y: x, huge)
    with pytest.raises(ValueError, match="overflows float64"):
        wp.decompose(huge)
    with pytest.raises(ValueError, match="up to 1e\\+150"):
        wp.winding_number(huge, [[1.0, 1.0]])


def test_inputs_are_not_modified_and_read_only_is_fine():
    pts = np.array([[0.0, 0.0], [3.0, 0.0], [3.0, 1.0], [np.nan, np.nan], [5, 5], [6, 5], [6, 6]])
    keep = pts.copy()
    pts.flags.writeable = False
    wp.signed_area(pts)
    wp.region_moments(pts, closure="detrend")
    assert np.array_equal(pts, keep, equal_nan=True)


# --------------------------------------------------------------------------- moments
def test_rectangle_handbook_values():
    # Rectangle of width b and height h: centroid at (b/2, h/2),
    # I_x = b h^3 / 12, I_y = h b^3 / 12, I_xy = 0 about centroidal axes
    # (Young & Budynas, Roark's Formulas for Stress and Strain, 7th ed.,
    # Table A.1, rectangle; from memory).
    b, h, x0, y0 = 4.0, 1.5, 10.0, -3.0
    pts = [[x0, y0], [x0 + b, y0], [x0 + b, y0 + h], [x0, y0 + h]]
    m = wp.region_moments(pts)
    assert m.area == pytest.approx(b * h, rel=1e-15)
    assert m.centroid == pytest.approx((x0 + b / 2, y0 + h / 2), rel=1e-15)
    assert m.I_x == pytest.approx(b * h ** 3 / 12, rel=1e-13)
    assert m.I_y == pytest.approx(h * b ** 3 / 12, rel=1e-13)
    assert m.I_xy == pytest.approx(0.0, abs=1e-12)


def test_triangle_handbook_values():
    # Triangle with base b on the x-axis and apex at (a, h): centroid
    # ((a + b)/3, h/3), I_x = b h^3 / 36 about the centroidal axis parallel
    # to the base, I_y = b h (b^2 - a b + a^2) / 36 (Young & Budynas, Roark's
    # Formulas for Stress and Strain, 7th ed., Table A.1, triangle; from memory).
    for b, h, a in [(5.0, 3.0, 1.0), (2.0, 7.0, 2.0), (3.0, 1.0, -0.5)]:
        m = wp.region_moments([[0, 0], [b, 0], [a, h]])
        assert m.area == pytest.approx(b * h / 2, rel=1e-14)
        assert m.centroid == pytest.approx(((a + b) / 3, h / 3), rel=1e-14)
        assert m.I_x == pytest.approx(b * h ** 3 / 36, rel=1e-13)
        assert m.I_y == pytest.approx(b * h * (b * b - a * b + a * a) / 36, rel=1e-13)


def test_moments_match_symbolic_layer_exactly_for_rational_vertices():
    # Exact reference: wedgepath.symbolic.polygon_moments (sympy rationals).
    rng = np.random.default_rng(3)
    for _ in range(15):
        n = int(rng.integers(3, 9))
        pts = rng.integers(-20, 21, size=(n, 2)) / 4.0     # exact in binary
        exact = sy.polygon_moments(pts.tolist())
        m = wp.region_moments(pts)
        scale = 1.0 + float(np.abs(pts).max()) ** 4
        for key in ("area", "int_x", "int_y", "int_xx", "int_xy", "int_yy"):
            assert getattr(m, key) == pytest.approx(float(exact[key]), abs=1e-13 * scale)
        if exact["centroid"] is None:
            # the vertices are exact in binary, so the float area is exactly 0 as well
            assert m.centroid is None and m.area == 0.0
        elif abs(float(exact["area"])) > 1e-3:
            assert m.centroid == pytest.approx(tuple(float(c) for c in exact["centroid"]),
                                               rel=1e-10, abs=1e-10)
    # zero net area (collinear; a balanced figure-eight): no centroid, as in the exact layer
    for pts in ([[0.0, 0.0], [1.0, 1.0], [2.0, 2.0]],
                [[0.0, 0.0], [1.0, 0.0], [1.0, 1.0], [0.0, 0.0], [-1.0, -1.0], [-1.0, 0.0]]):
        assert sy.polygon_moments(pts)["centroid"] is None
        m = wp.region_moments(np.array(pts))
        assert m.area == 0.0 and m.centroid is None


def test_figure_eight_has_no_centroid():
    m = wp.region_moments([[0, 0], [1, 1], [1, 0], [0, 1]])
    assert m.area == 0.0
    assert m.centroid is None and m.central is None and m.I_x is None


def test_moments_far_from_origin_keep_precision():
    # Centroidal moments do not depend on where the rectangle sits (parallel
    # axis theorem, common practice, no source).
    base = np.array([[0.0, 0.0], [2.0, 0.0], [2.0, 1.0], [0.0, 1.0]])
    m = wp.region_moments(base + 1e8)
    assert m.I_x == pytest.approx(2.0 / 12, rel=1e-9)
    assert m.I_y == pytest.approx(8.0 / 12, rel=1e-9)
    assert m.centroid == pytest.approx((1e8 + 1, 1e8 + 0.5), rel=1e-15)


# --------------------------------------------------------------------------- properties
@PROPS
@given(polygons(), st.floats(-1e4, 1e4), st.floats(-1e4, 1e4), st.floats(0, 2 * np.pi))
def test_area_invariant_under_rigid_motion(pts, tx, ty, theta):
    a = wp.signed_area(pts)
    c, s = math.cos(theta), math.sin(theta)
    moved = pts @ np.array([[c, s], [-s, c]]) + [tx, ty]
    scale = float(np.abs(pts).max()) ** 2 * len(pts) + 1.0
    assert wp.signed_area(moved) == pytest.approx(a, abs=1e-11 * scale)


@PROPS
@given(polygons())
def test_reversal_negates_area_and_moments(pts):
    m, r = wp.region_moments(pts), wp.region_moments(pts[::-1])
    scale = (float(np.abs(pts).max()) + 1.0) ** 4 * len(pts)
    for key in ("area", "int_x", "int_y", "int_xx", "int_xy", "int_yy"):
        assert getattr(r, key) == pytest.approx(-getattr(m, key), abs=1e-12 * scale)
    assert wp.signed_area(pts[::-1]) == pytest.approx(-wp.signed_area(pts),
                                                      abs=1e-12 * scale)


@PROPS
@given(polygons(lo=-100, hi=100))
def test_region_moments_area_matches_signed_area(pts):
    scale = float(np.abs(pts).max()) ** 2 * len(pts) + 1.0
    assert wp.region_moments(pts).area == pytest.approx(wp.signed_area(pts), abs=1e-12 * scale)
