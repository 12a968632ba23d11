"""Faces, winding numbers and lobes of a loop's arrangement (wedgepath.decompose).

Face winding numbers come from walking the face adjacency; they are checked
against an independent angle-sum winding number at a point inside each face
(common practice, no source), and face areas against shapely/GEOS.
"""

from __future__ import annotations

import warnings

import numpy as np
import pytest
import shapely
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import wedgepath as wp

PROPS = settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])


def angle_sum(poly, q):
    P = np.asarray(poly, dtype=float)
    P = np.vstack([P, P[:1]])
    q = np.atleast_2d(np.asarray(q, dtype=float))
    d1 = P[None, :-1, :] - q[:, None, :]
    d2 = P[None, 1:, :] - q[:, None, :]
    cross = d1[..., 0] * d2[..., 1] - d1[..., 1] * d2[..., 0]
    dot = (d1 * d2).sum(-1)
    return np.rint(np.arctan2(cross, dot).sum(axis=1) / (2 * np.pi)).astype(int)


@st.composite
def int_polygons(draw, max_size=10, span=5):
    n = draw(st.integers(3, max_size))
    c = st.integers(-span, span)
    return np.array(draw(st.lists(st.tuples(c, c), min_size=n, max_size=n)), dtype=float)


@st.composite
def float_polygons(draw, max_size=12):
    # Coordinates on a 1e-6 grid in [-10, 10]: arbitrary doubles, but no
    # values like 1e-157 next to 1, where floating-point noding (GEOS) is
    # not reliable (decompose then warns; see docs/planar.md).
    n = draw(st.integers(3, max_size))
    c = st.floats(-10, 10, allow_nan=False, allow_infinity=False).map(lambda v: round(v, 6))
    return np.array(draw(st.lists(st.tuples(c, c), min_size=n, max_size=n)))


def check_against_angle_sum(poly, d, min_area=1e-9):
    """Windings of faces (of non-negligible area) against the angle sum at an inner point."""
    keep = d.areas > min_area
    if not keep.any():
        return
    inside = shapely.get_coordinates(shapely.point_on_surface(d.faces[keep]))
    assert np.array_equal(d.winding[keep], angle_sum(poly, inside))


def quiet(fn, *args, **kw):
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        return fn(*args, **kw)


# --------------------------------------------------------------------------- properties
@PROPS
@given(int_polygons())
def test_integer_polygons(poly):
    # small integer polygons: many collinear overlaps, crossings on vertices,
    # repeated points and back-tracking
    d = quiet(wp.decompose, poly)
    assert d.signed_area == pytest.approx(wp.signed_area(poly), abs=1e-9)
    check_against_angle_sum(poly, d)
    assert d.diagnostics["inconsistent_adjacencies"] == 0


@PROPS
@given(float_polygons())
def test_float_polygons(poly):
    d = quiet(wp.decompose, poly)
    assert d.signed_area == pytest.approx(wp.signed_area(poly), abs=1e-9)
    assert d.absolute_area >= abs(d.signed_area) - 1e-12
    check_against_angle_sum(poly, d)


@PROPS
@given(float_polygons())
def test_reversal_negates_everything(poly):
    d, r = wp.decompose(poly), wp.decompose(poly[::-1])
    assert r.signed_area == pytest.approx(-d.signed_area, abs=1e-9)
    assert r.absolute_area == pytest.approx(d.absolute_area, abs=1e-9)
    assert {-k: v for k, v in d.area_by_winding.items()} == pytest.approx(r.area_by_winding,
                                                                          abs=1e-9)


@PROPS
@given(int_polygons(), st.integers(-1000, 1000), st.integers(-1000, 1000))
def test_translation_invariance(poly, tx, ty):
    d, m = wp.decompose(poly), wp.decompose(poly + [tx, ty])
    assert m.area_by_winding == pytest.approx(d.area_by_winding, abs=1e-9)
    assert sorted(m.winding.tolist()) == sorted(d.winding.tolist())


@PROPS
@given(float_polygons(), st.floats(0, 2 * np.pi), st.floats(-1e3, 1e3), st.floats(-1e3, 1e3))
def test_rotation_and_translation_invariance(poly, angle, tx, ty):
    # area by winding number, lobes and signed area are unchanged by a rigid motion
    # (common practice, no source); rotated coordinates are rounded, so slivers of area
    # below 1e-9 may appear or vanish: compared with an absolute tolerance
    R = np.array([[np.cos(angle), -np.sin(angle)], [np.sin(angle), np.cos(angle)]])
    d = wp.decompose(poly)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", wp.DecompositionWarning)
        m = wp.decompose(poly @ R.T + [tx, ty])
    assert m.signed_area == pytest.approx(d.signed_area, abs=1e-8)
    assert m.absolute_area == pytest.approx(d.absolute_area, abs=1e-8)
    # (w = 0: bounded faces of winding 0, e.g. inside a retraced triangle, may merge with
    # the outside once rounding parts the retraced edges; they carry no area anyway)
    big = {k: v for k, v in d.area_by_winding.items() if v > 1e-7 and k != 0}
    assert {k: m.area_by_winding.get(k, 0.0) for k in big} == pytest.approx(big, abs=1e-8)
    # (lobes are not compared: faces that touch at one point may be joined or parted by a
    # rounded sliver; the quarter-turn test below compares them where nothing is rounded)


@PROPS
@given(int_polygons(), st.integers(0, 3))
def test_quarter_turns_are_exact(poly, turns):
    # a quarter turn is exact in floating point: the same faces with the same windings
    R = np.linalg.matrix_power(np.array([[0.0, -1.0], [1.0, 0.0]]), turns)
    d, m = wp.decompose(poly), wp.decompose(poly @ R.T)
    assert m.area_by_winding == pytest.approx(d.area_by_winding, abs=1e-12)
    assert sorted(zip(m.winding.tolist(), np.round(m.areas, 12).tolist())) == \
        sorted(zip(d.winding.tolist(), np.round(d.areas, 12).tolist()))
    assert sorted((lb.sign, round(lb.area, 12), lb.n_faces) for lb in m.lobes) == \
        sorted((lb.sign, round(lb.area, 12), lb.n_faces) for lb in d.lobes)


def test_noisy_loop_many_faces():
    # a loop circling 5 times with noise: thousands of faces
    rng = np.random.default_rng(3)
    t = np.linspace(0, 10 * np.pi, 600, endpoint=False)
    poly = np.column_stack([np.cos(t), np.sin(t)]) + 0.08 * rng.standard_normal((600, 2))
    d = quiet(wp.decompose, poly)
    assert d.n_faces > 1000
    assert d.signed_area == pytest.approx(wp.signed_area(poly), abs=1e-10)
    check_against_angle_sum(poly, d)
    # faces tile the region: their union has the area of the region covered
    assert d.areas.sum() == pytest.approx(
        shapely.area(shapely.union_all(d.faces)), rel=1e-9)
    # lobe bookkeeping
    assert sum(lb.signed_area for lb in d.lobes) == pytest.approx(d.signed_area, abs=1e-10)
    for lb in d.lobes:
        assert np.all(np.sign(lb.winding) == lb.sign)


# --------------------------------------------------------------------------- examples
def test_simple_polygon_is_one_face_with_shapely_area():
    # Reference area: GEOS via shapely.area.
    rng = np.random.default_rng(1)
    ang = np.sort(rng.uniform(0, 2 * np.pi, 25))
    poly = np.column_stack([np.cos(ang), np.sin(ang)]) * rng.uniform(0.5, 1, (25, 1))
    d = wp.decompose(poly)
    assert d.n_faces == 1 and d.winding.tolist() == [1]
    assert d.areas[0] == pytest.approx(shapely.area(shapely.Polygon(poly)), rel=1e-13)
    assert not d.mixed_signs and d.cancellation == pytest.approx(0.0, abs=1e-15)
    assert wp.decompose(poly[::-1]).winding.tolist() == [-1]


def test_summary_says_how_much_cancels():
    # a unit square with a small clockwise lobe at a corner (a noise loop of area 0.005):
    # 1.005 swept, signed 0.995, so 1 - 0.995 / 1.005 = 1.0 % of the absolute area cancels
    # out.  The old text said "lobes of opposite sign cancel: the net signed area is 99.0% of
    # the absolute area" (and "100.0%" when almost nothing cancelled).
    sq = [[0, 0], [1, 0], [1, 1], [0, 1], [0, 0], [0, -0.1], [-0.1, -0.1], [0, 0]]
    d = wp.decompose(sq)
    assert d.mixed_signs and d.absolute_area == pytest.approx(1.005)
    assert d.cancellation == pytest.approx(1 - 0.995 / 1.005)
    assert d.summary().splitlines()[-1] == ("NOTE: lobes of opposite sign: 1.0% of the absolute "
                                            "area cancels out in the net signed area")
    tiny = [[0, 0], [1, 0], [1, 1], [0, 1], [0, 0], [0, -1e-3], [-1e-3, -1e-3], [0, 0]]
    assert "less than 0.05%" in wp.decompose(tiny).summary()


def test_figure_eight_reports_cancelling_lobes():
    eight = [[0, 0], [2, 2], [2, 0], [0, 2]]
    d = wp.decompose(eight)
    assert sorted(d.winding.tolist()) == [-1, 1]
    assert d.signed_area == 0.0 and d.absolute_area == 2.0
    assert len(d.lobes) == 2
    assert sorted(lb.signed_area for lb in d.lobes) == [-1.0, 1.0]
    assert d.mixed_signs and d.cancellation == 1.0
    assert str(d).splitlines()[-1] == ("NOTE: lobes of opposite sign: 100.0% of the absolute "
                                       "area cancels out in the net signed area")
    assert "mixed_signs=True" in repr(d)
    # a smooth figure-eight (lemniscate) nets about zero too
    t = np.linspace(0, 2 * np.pi, 400, endpoint=False)
    lem = np.column_stack([np.sin(t), np.sin(t) * np.cos(t)])
    d = wp.decompose(lem)
    assert abs(d.signed_area) < 1e-12 and d.absolute_area > 1
    assert {lb.sign for lb in d.lobes} == {-1, 1}


def test_nested_loops_and_area_by_winding():
    # A spiral loop around the origin twice, closed by its chord.
    t = np.linspace(0, 4 * np.pi, 800, endpoint=False)
    r = 1 + t / (4 * np.pi)
    poly = np.column_stack([r * np.cos(t), r * np.sin(t)])
    d = wp.decompose(poly)
    assert set(d.area_by_winding) == {1, 2}
    assert d.area_by_winding[2] == pytest.approx(shapely.area(shapely.Polygon(poly[:400])),
                                                 rel=0.05)
    check_against_angle_sum(poly, d)


def test_degenerate_curves():
    sq = [[0, 0], [1, 0], [1, 1], [0, 1]]
    # repeated points and zero-length segments
    d = quiet(wp.decompose, [[0, 0], [0, 0], [1, 0], [1, 0], [1, 1], [0, 1], [0, 1]])
    assert d.winding.tolist() == [1] and d.areas[0] == 1.0
    # back-tracking along the same line
    d = quiet(wp.decompose, [[0, 0], [2, 0], [1, 0], [1, 1], [0, 1]])
    assert d.winding.tolist() == [1] and d.signed_area == 1.0
    # collinear loop: no faces, zero area
    d = quiet(wp.decompose, [[0, 0], [1, 1], [3, 3], [2, 2]])
    assert d.n_faces == 0 and d.signed_area == 0.0 and d.lobes == ()
    # a path that only touches itself (at (1, 1))
    d = quiet(wp.decompose, [[0, 0], [2, 0], [1, 1], [2, 2], [0, 2], [1, 1]])
    assert sorted(d.winding.tolist()) == [1, 1] and len(d.lobes) == 2
    # crossings exactly on vertices
    d = quiet(wp.decompose, [[0, 0], [2, 0], [2, 2], [1, 1], [0, 2], [1, 1]])
    assert d.signed_area == pytest.approx(wp.signed_area([[0, 0], [2, 0], [2, 2], [1, 1],
                                                          [0, 2], [1, 1]]))
    # traced twice and three times
    assert quiet(wp.decompose, sq + sq).area_by_winding == {2: 1.0}
    assert quiet(wp.decompose, (sq + sq + sq)[::-1]).area_by_winding == {-3: 1.0}
    # fewer than 3 distinct points
    assert quiet(wp.decompose, [[0, 0], [1, 1]]).n_faces == 0
    assert quiet(wp.decompose, np.zeros((0, 2))).signed_area == 0.0


def test_nearly_coincident_laps():
    # An ellipse traced five times, its time stamps accumulating rounding so
    # that the laps differ in the last bits: floating-point noding fails on
    # such input and decompose must fall back to snap-rounding.
    t = np.arange(501) * (np.pi / 100)
    xy = np.c_[0.01 * np.sin(2 * t), 0.03 * np.sin(2 * t) + 0.004 * np.cos(2 * t)]
    d = quiet(wp.decompose, xy)
    assert list(d.area_by_winding) == [-5]
    assert d.signed_area == pytest.approx(wp.signed_area(xy), rel=1e-9)


def test_pieces_share_one_arrangement():
    outer = np.array([[0, 0], [4, 0], [4, 4], [0, 4]], dtype=float)
    inner_cw = np.array([[1, 1], [1, 2], [2, 2], [2, 1]], dtype=float)
    d = wp.decompose(np.vstack([outer, [[np.nan, np.nan]], inner_cw]))
    assert d.area_by_winding == {0: 1.0, 1: 15.0}
    # pieces sharing an edge
    right = np.array([[1, 0], [2, 0], [2, 1], [1, 1]], dtype=float)
    left = np.array([[0, 0], [1, 0], [1, 1], [0, 1]], dtype=float)
    d = quiet(wp.decompose, np.vstack([left, [[np.nan, np.nan]], right]))
    assert d.area_by_winding == {1: 2.0} and len(d.lobes) == 1


def test_significant_lobes_and_summary():
    d = wp.decompose([[0, 0], [4, 4], [4, 0], [0, 4.2]])
    big = d.significant_lobes(0.3)
    assert len(big) == 2
    text = d.summary()
    assert "faces" in text and "lobe" in text
    with pytest.raises(ValueError, match="fraction"):
        d.significant_lobes(2.0)


def test_lobe_geometry_is_union_of_faces():
    d = wp.decompose([[0, 0], [2, 2], [2, 0], [0, 2]])
    for lb in d.lobes:
        assert shapely.area(lb.geometry) == pytest.approx(lb.area)


# --------------------------------------------------------------------------- bad input
def test_bad_inputs():
    with pytest.raises(ValueError, match=r"plane\("):
        wp.decompose(np.zeros((5, 3)))
    with pytest.raises(ValueError, match="'chord'.*'detrend'.*'require'"):
        wp.decompose([[0, 0], [1, 0], [1, 1]], closure="none")
    with pytest.raises(ValueError, match="NaN|infinite"):
        wp.decompose([[0, 0], [1, np.inf], [1, 1]])


def test_inputs_are_not_modified():
    pts = np.array([[0.0, 0.0], [2.0, 2.0], [2.0, 0.0], [0.0, 2.0]])
    keep = pts.copy()
    pts.flags.writeable = False
    wp.decompose(pts)
    assert np.array_equal(pts, keep)


# =========================================================================== size bound
# (issue 13, item 12): the arrangement's size is estimated before it is built, refused
# beyond a documented limit (max_crossings=), and a lack of memory is named as such.
from wedgepath.planar import arrangement as _arr  # noqa: E402


def star(n):
    """A star polygon {n/((n-1)/2)}: nearly every edge crosses every other."""
    k = np.arange(n)
    ang = 2 * np.pi * (k * ((n - 1) // 2) % n) / n
    return np.c_[np.cos(ang), np.sin(ang)]


def brute_force_meetings(pts):
    """Pairs of non-adjacent edges of the closed polygon that meet (shapely, all pairs)."""
    P = np.vstack([pts, pts[:1]])
    segs = [shapely.LineString(P[i:i + 2]) for i in range(len(pts))]
    n = len(segs)
    return sum(1 for i in range(n) for j in range(i + 2, n)
               if not (i == 0 and j == n - 1) and segs[i].intersects(segs[j]))


@pytest.mark.parametrize("make", [
    lambda: np.random.default_rng(0).uniform(0, 1, (60, 2)),
    lambda: star(31),
    lambda: np.array([[0, 0], [2, 2], [2, 0], [0, 2]], float),             # figure eight
    lambda: np.array([[0, 0], [1, 0], [1, 1], [0, 1]] * 2, float),         # traced twice
    lambda: np.random.default_rng(1).integers(0, 4, (40, 2)).astype(float),  # touching, collinear
])
def test_crossing_count_is_exact(make):
    pts = make()
    pieces = [_arr.drop_repeats(np.vstack([pts, pts[:1]]))]
    count = _arr.count_crossings(pieces, limit=None)
    assert count.crossings == brute_force_meetings(pieces[0][:-1])
    assert count.complete and count.segments == len(pieces[0]) - 1


def test_counting_stops_at_the_limit_and_extrapolates():
    pts = np.random.default_rng(2).uniform(0, 1, (400, 2))
    pieces = [np.vstack([pts, pts[:1]])]
    full = _arr.count_crossings(pieces, limit=None)
    part = _arr.count_crossings(pieces, limit=full.crossings // 10)
    assert not part.complete and part.crossings > full.crossings // 10
    assert part.done < part.segments
    assert 0.5 * full.crossings < part.estimate < 2 * full.crossings


@pytest.fixture
def no_geometry(monkeypatch):
    def refuse(*a, **k):
        raise AssertionError("the arrangement was built")
    monkeypatch.setattr(shapely, "node", refuse)
    monkeypatch.setattr(shapely, "polygonize", refuse)
    monkeypatch.setattr(shapely, "unary_union", refuse)


def test_star_is_refused_before_building(no_geometry):
    with pytest.raises(ValueError) as info:
        wp.decompose(star(2001))
    msg = str(info.value)
    assert "crosses itself more than 500,000 times" in msg and "max_crossings=" in msg
    assert "GB" in msg and "\n" not in msg
    assert _arr.MAX_CROSSINGS == 500_000


def test_uniform_noise_is_refused_with_a_low_limit(no_geometry):
    pts = np.random.default_rng(0).uniform(0, 1, (300, 2))
    with pytest.raises(ValueError, match="more than 1,000 times"):
        wp.decompose(pts, max_crossings=1000)


def test_the_limit_can_be_raised_or_lifted():
    pts = np.random.default_rng(0).uniform(0, 1, (60, 2))
    a = wp.decompose(pts, max_crossings=None)
    b = wp.decompose(pts, max_crossings=10 ** 6)
    assert a.n_faces == b.n_faces > 100
    with pytest.raises(ValueError, match="max_crossings must be"):
        wp.decompose(pts, max_crossings=-1)


def test_memory_error_is_named(monkeypatch):
    def oom(*a, **k):
        raise MemoryError()
    monkeypatch.setattr(shapely, "polygonize", oom)
    with pytest.raises(ValueError) as info:
        wp.decompose(star(31))
    msg = str(info.value)
    assert "memory" in msg and "31 segments" in msg and "crossings" in msg
    assert "extreme coordinates" not in msg


def test_geos_failure_reports_geos_and_no_false_cause(monkeypatch):
    def fail(*a, **k):
        raise shapely.errors.GEOSException("std::bad_alloc")
    monkeypatch.setattr(shapely, "node", fail)
    monkeypatch.setattr(shapely, "unary_union", fail)
    with pytest.raises(ValueError) as info:
        wp.decompose(np.random.default_rng(0).uniform(0, 1, (30, 2)))
    msg = str(info.value)
    assert "out of memory" in msg and "extreme coordinates" not in msg


def test_progress_only_when_asked_or_slow(capsys):
    wp.decompose(star(31))
    assert capsys.readouterr().err == ""
    wp.decompose(star(31), progress=True)
    err = capsys.readouterr().err
    assert "decompose: counting crossings" in err and "decompose: done" in err


@PROPS
@given(int_polygons(max_size=14, span=3))
def test_crossing_count_matches_brute_force_on_integer_polygons(poly):
    # small integer coordinates: many touching, collinear and overlapping segments
    pieces = [_arr.drop_repeats(np.vstack([poly, poly[:1]]))]
    if len(pieces[0]) < 3:
        return
    assert _arr.count_crossings(pieces).crossings == brute_force_meetings(pieces[0][:-1])


@pytest.mark.parametrize("n, k", [(400, 3), (333, 5), (500, 2)])
def test_crossing_count_on_long_monotone_chains(n, k):
    # rose curves and laps: long monotone chains that cross each other (binary search path)
    t = np.linspace(0, 2 * np.pi * k, n, endpoint=False)
    pts = np.c_[np.cos(t) * (1 + 0.3 * np.cos(k * t / 2.5)), np.sin(t) * (1 + 0.2 * np.sin(t))]
    pieces = [np.vstack([pts, pts[:1]])]
    seg = _arr._SegmentChains(pieces)
    assert (seg.ce - seg.cs).max() > 16            # the long-chain path is exercised
    assert _arr.count_crossings(pieces).crossings == brute_force_meetings(pts)


def test_crossing_count_of_several_pieces_and_vertical_runs():
    a = np.array([[0, 0], [0, 1], [0, 2], [0, 3], [1, 3], [1, 0], [0, 0]], float)
    b = np.array([[-1, 1.5], [2, 1.5], [2, 2.5], [-1, 2.5], [-1, 1.5]], float)
    got = _arr.count_crossings([a, b]).crossings
    segs_a = [shapely.LineString(a[i:i + 2]) for i in range(len(a) - 1)]
    segs_b = [shapely.LineString(b[i:i + 2]) for i in range(len(b) - 1)]
    across = sum(1 for s in segs_a for t in segs_b if s.intersects(t))
    assert got == across + brute_force_meetings(a[:-1]) + brute_force_meetings(b[:-1])
