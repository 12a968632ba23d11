"""Paths and chains: construction, views, closure conventions, bad input."""

import numpy as np
import pytest

import wedgepath as wp


def square():
    return np.array([[0, 0], [1, 0], [1, 1], [0, 1]], dtype=float)


class TestConstruction:
    def test_copies_to_readonly_float64(self):
        raw = np.array([[1, 2], [3, 4], [5, 6]], dtype=np.int32)
        before = raw.copy()
        p = wp.Path(raw)
        assert p.points.dtype == np.float64
        assert not p.points.flags.writeable
        raw[0, 0] = 99
        assert p.points[0, 0] == 1.0
        np.testing.assert_array_equal(raw[1:], before[1:])

    def test_accepts_float32_bigendian_noncontiguous_readonly(self):
        base = np.arange(40, dtype=">f4").reshape(10, 4)
        view = base[::2, ::2]
        view.flags.writeable = False
        p = wp.Path(view)
        np.testing.assert_array_equal(p.points, view.astype(float))
        assert p.points.flags.c_contiguous

    def test_object_array_of_numbers(self):
        p = wp.Path(np.array([[1, 2.5], [3, 4]], dtype=object))
        assert p.points.tolist() == [[1.0, 2.5], [3.0, 4.0]]

    def test_dataframe_names(self):
        pd = pytest.importorskip("pandas")
        df = pd.DataFrame({"stress": [0.0, 1.0, 2.0], "strain": [1.0, 0.0, 1.0]})
        p = wp.Path(df)
        assert p.names == ("stress", "strain")

    def test_times_and_names(self):
        p = wp.Path(np.zeros((3, 2)), times=[0.0, 0.1, 0.35], names=["a", "b"])
        assert p.times.tolist() == [0.0, 0.1, 0.35]
        assert p.names == ("a", "b")
        assert not p.times.flags.writeable


class TestBadInput:
    @pytest.mark.parametrize("pts, exc, words", [
        (np.zeros(5), ValueError, "2-dimensional"),
        (np.zeros((2, 2, 2)), ValueError, "dimensional"),
        (np.zeros((1, 3)), ValueError, "at least 2 samples"),
        (np.zeros((0, 3)), ValueError, "at least 2 samples"),
        (np.zeros((4, 0)), ValueError, "no channels"),
        ([[0, 1], [np.inf, 2]], ValueError, "infinite"),
        ([[np.nan, 1], [np.nan, 2]], ValueError, "every row contains NaN"),
        ([["a", "b"], ["c", "d"]], TypeError, "text"),
        (np.ones((3, 2), dtype=complex), TypeError, "complex"),
        (np.ones((3, 2), dtype=bool), TypeError, "boolean"),
        (np.array([[1, None], [2, 3]], dtype=object), TypeError, "non-real"),
        ([[1, 2], [3]], TypeError, "could not be read"),
    ])
    def test_points(self, pts, exc, words):
        with pytest.raises(exc, match=words):
            wp.Path(pts)

    @pytest.mark.parametrize("times, words", [
        ([0.0, 1.0], "2 entries but the data have 3 samples"),
        ([0.0, 1.0, 1.0], "strictly increasing"),
        ([0.0, 2.0, 1.0], "strictly increasing"),
        ([0.0, np.nan, 2.0], "NaN"),
        ([[0.0, 1.0, 2.0]], "1-dimensional"),
    ])
    def test_times(self, times, words):
        with pytest.raises(ValueError, match=words):
            wp.Path(np.zeros((3, 2)), times=times)

    @pytest.mark.parametrize("names, exc, words", [
        (["a"], ValueError, "1 entries but the data have 2 channels"),
        (["a", "a"], ValueError, "distinct"),
        ("ab", TypeError, "sequence of strings"),
        (["a", 2], TypeError, "strings"),
    ])
    def test_names(self, names, exc, words):
        with pytest.raises(exc, match=words):
            wp.Path(np.zeros((3, 2)), names=names)

    def test_unknown_closure(self):
        with pytest.raises(ValueError, match="unknown closure 'loop'.*'chord'"):
            wp.Path(square()).close("loop")

    def test_channel_errors(self):
        p = wp.Path(np.zeros((3, 3)), names=["a", "b", "c"])
        with pytest.raises(ValueError, match="unknown channel 'z'"):
            p.plane("a", "z")
        with pytest.raises(ValueError, match="out of range"):
            p.plane(0, 3)
        with pytest.raises(ValueError, match="two different channels"):
            p.plane("b", 1)
        with pytest.raises(TypeError, match="int or a name"):
            p.plane(0.0, 1)


class TestViews:
    def test_plane_by_name_and_index(self):
        X = np.arange(12.0).reshape(4, 3)
        p = wp.Path(X, names=["u", "v", "w"])
        q = p.plane("w", 0)
        np.testing.assert_array_equal(q.points, X[:, [2, 0]])
        assert q.names == ("w", "u")

    def test_window_by_time_half_open_tiles(self):
        t = np.array([0.0, 0.5, 1.3, 2.0, 2.1, 3.7])
        X = np.arange(12.0).reshape(6, 2)
        p = wp.Path(X, times=t)
        a, b = p.window(0.0, 2.0), p.window(2.0, None)
        assert a.n_samples == 3 and b.n_samples == 3
        assert a.then(b) == p

    def test_window_by_index(self):
        p = wp.Path(np.arange(20.0).reshape(10, 2))
        np.testing.assert_array_equal(p.window(2, 5).points, p.points[2:5])
        with pytest.raises(ValueError, match="holds 1 samples"):
            p.window(3, 4)
        with pytest.raises(TypeError, match="sample index"):
            p.window(0.5, 4)

    def test_pieces_split_at_nan_rows(self):
        X = np.array([[0, 0], [1, 0], [np.nan, 0], [2, 2], [3, 3], [4, 4], [np.nan, np.nan], [5, 5]])
        p = wp.Path(X, times=np.arange(8.0))
        sizes = [pc.n_samples for pc in p.pieces]
        assert sizes == [2, 3, 1]
        assert p.pieces[1].times.tolist() == [3.0, 4.0, 5.0]

    def test_reversed_keeps_times_increasing(self):
        p = wp.Path([[0, 0], [1, 0], [1, 1]], times=[0.0, 1.0, 3.0])
        r = p.reversed()
        assert r.points.tolist() == [[1, 1], [1, 0], [0, 0]]
        assert r.times.tolist() == [0.0, 2.0, 3.0]
        assert r.reversed() == p

    def test_then_shifts_overlapping_times(self):
        p = wp.Path([[0, 0], [1, 0]], times=[0.0, 1.0])
        q = wp.Path([[2, 0], [3, 0], [4, 0]], times=[0.0, 0.5, 1.0])
        joined = p.then(q)
        assert joined.times.tolist() == [0.0, 1.0, 1.5, 2.0, 2.5]
        with pytest.raises(ValueError, match="channels"):
            p.then(wp.Path(np.zeros((2, 3))))


class TestClosure:
    def test_chord_appends_start(self):
        p = wp.Path(square())
        c = p.close("chord")
        assert c.n_samples == 5 and c.is_closed
        assert c.close("chord") == c  # idempotent

    def test_detrend_ends_at_start_and_keeps_shape(self):
        X = np.array([[0.0, 0.0], [1.0, 1.0], [2.0, 0.0], [3.0, 1.0]])
        d = wp.Path(X, times=[0.0, 1.0, 2.0, 3.0]).close("detrend")
        assert d.is_closed
        # drift (3, 1) removed linearly in time: sample at t=1 loses one third of it
        np.testing.assert_allclose(d.points[1], [1.0 - 1.0, 1.0 - 1.0 / 3.0])

    def test_require(self):
        X = np.array([[0.0, 0.0], [1.0, 0.0], [1.0, 1.0], [1e-13, 0.0]])
        c = wp.Path(X).close("require")
        assert c.is_closed and c.n_samples == 4
        with pytest.raises(ValueError, match="not closed.*chord"):
            wp.Path(square()).close("require")
        assert wp.Path(square()).close("require", tol=1.5).is_closed

    def test_close_per_piece(self):
        X = np.array([[0, 0], [1, 0], [1, 1], [np.nan, np.nan], [5, 5], [6, 5], [6, 6]])
        c = wp.Path(X).close("chord")
        assert [pc.n_samples for pc in c.pieces] == [4, 4]
        assert c.is_closed


class TestChains:
    def test_boundary_of_open_and_closed(self):
        p = wp.Path([[0, 0], [1, 0], [1, 1]])
        b = wp.Chain([(p, 2)]).boundary()
        assert b == wp.ZeroChain([[1, 1], [0, 0]], [2, -2])
        closed = p.close("chord")
        assert wp.Chain(closed).boundary() == 0

    def test_boundary_across_gaps(self):
        X = np.array([[0, 0], [1, 0], [np.nan, np.nan], [2, 2], [3, 3]])
        b = wp.Chain(wp.Path(X)).boundary()
        assert b == wp.ZeroChain([[1, 0], [0, 0], [3, 3], [2, 2]], [1, -1, 1, -1])

    def test_algebra(self):
        p = wp.Path([[0, 0], [1, 0]])
        q = wp.Path([[1, 0], [1, 1]])
        c = 3 * wp.Chain(p) - q
        assert c.coefficients == (3, -1)
        assert (c + c).coefficients == (6, -2)
        assert (c - c).coefficients == ()

    @pytest.mark.parametrize("coef", [1.5, True, "2", None])
    def test_non_integer_coefficients(self, coef):
        with pytest.raises(TypeError, match="integer"):
            wp.Chain([(wp.Path([[0, 0], [1, 0]]), coef)])

    def test_mismatched_dims(self):
        with pytest.raises(ValueError, match="same number of channels"):
            wp.Chain([(wp.Path(np.zeros((2, 2))), 1), (wp.Path(np.zeros((2, 3))), 1)])
