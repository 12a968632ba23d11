"""Real recordings: time axes of every kind, shape and dtype sanity, trials (issue 16)."""

from __future__ import annotations

import warnings

import numpy as np
import pandas as pd
import pytest

import wedgepath as wp
from wedgepath.signals._kernel import ShapeWarning


def _pair(T=400, lag=3):
    x = np.sin(np.arange(T) / 10.0)
    return np.column_stack([x, np.roll(x, lag)])


# --------------------------------------------------------------------------- time axes
class TestTimeAxes:
    def test_dataframe_datetime_index_reports_iso_in_its_zone(self):
        t = pd.date_range("2021-03-01", periods=400, freq="h", tz="Europe/Berlin")
        df = pd.DataFrame(_pair(), columns=["a", "b"], index=t)
        r = wp.rolling_area_matrix(df, 100, 50)
        assert r.time_unit == "ISO-8601"
        assert r.start_time[0] == "2021-03-01T00:00:00+01:00"
        # window 1 starts at sample 50 and stops at sample 149
        assert r.start_time[1] == "2021-03-03T02:00:00+01:00"
        assert r.stop_time[1] == "2021-03-07T05:00:00+01:00"
        frame = r.to_frame()
        assert frame["start_time"].iloc[0] == "2021-03-01T00:00:00+01:00"
        # the areas do not depend on the time axis
        np.testing.assert_array_equal(r.areas, wp.rolling_area_matrix(_pair(), 100, 50).areas)

    def test_every_datetime_form_gives_the_same_windows(self):
        X = _pair(60)
        naive = pd.date_range("2020-01-01", periods=60, freq="D")
        stamps = [naive, naive.to_numpy(), list(naive), list(naive.to_pydatetime())]
        got = [wp.rolling_area_matrix(X, 20, 20, times=f).start_time.tolist() for f in stamps]
        assert got[0] == ["2020-01-01T00:00:00", "2020-01-21T00:00:00", "2020-02-10T00:00:00"]
        assert all(g == got[0] for g in got)
        # calendar dates (text or datetime64[D]) come back as dates
        dates = [[str(d.date()) for d in naive], naive.to_numpy().astype("datetime64[D]")]
        got = [wp.rolling_area_matrix(X, 20, 20, times=f).start_time.tolist() for f in dates]
        assert got[0] == got[1] == ["2020-01-01", "2020-01-21", "2020-02-10"]

    def test_timedelta_index_is_seconds(self):
        df = pd.DataFrame(_pair(50), columns=["a", "b"],
                          index=pd.to_timedelta(np.arange(50) * 250, unit="ms"))
        r = wp.rolling_area_matrix(df, 10, 10)
        assert r.time_unit == "s"
        assert r.start_time.tolist() == [0.0, 2.5, 5.0, 7.5, 10.0]

    def test_numeric_index_is_time_but_range_index_is_not(self):
        X = _pair(50)
        r = wp.rolling_area_matrix(pd.DataFrame(X, index=np.arange(50) * 0.5 + 100), 10, 10)
        assert r.start_time.tolist() == [100.0, 105.0, 110.0, 115.0, 120.0]
        assert r.time_unit is None
        for idx in (pd.RangeIndex(50), pd.RangeIndex(7, 57), pd.Index(np.arange(50))):
            r = wp.rolling_area_matrix(pd.DataFrame(X, index=idx), 10, 10)
            assert r.time_unit == "sample"
            assert r.start_time.tolist() == [0.0, 10.0, 20.0, 30.0, 40.0]

    def test_cycle_boundaries_in_datetimes(self):
        T = 200
        t = np.arange(T) * 2 * np.pi / 20
        X = np.column_stack([np.sin(t + 0.5), np.sin(t)])
        times = np.datetime64("2022-06-01T00:00:00") + np.arange(T) * np.timedelta64(60, "s")
        c = wp.cycle_areas(X, 0, 1, reference=1, times=times)
        plain = wp.cycle_areas(X, 0, 1, reference=1)
        assert c.time_unit == "ISO-8601" and plain.time_unit == "sample"
        # a boundary at fractional sample s lies s minutes after the start
        want = wp._time.TimeAxis.from_datetime64(times).format(plain.start * 60.0)
        assert c.start_time.tolist() == want.tolist()
        np.testing.assert_array_equal(c.values, plain.values)

    def test_path_keeps_datetimes_and_windows_by_them(self):
        t = pd.date_range("2021-01-01", periods=48, freq="h", tz="UTC")
        p = wp.Path(_pair(48), times=t)
        assert p.times[1] == 3600.0
        assert p.time_axis.format()[0] == "2021-01-01T00:00:00Z"
        w = p.window("2021-01-01T06:00Z", "2021-01-02T00:00Z")
        assert w.n_samples == 18
        assert w.time_axis.format()[0] == "2021-01-01T06:00:00Z"
        r = wp.rolling_area_matrix(p, 24, 24)
        assert r.start_time.tolist() == ["2021-01-01T00:00:00Z", "2021-01-02T00:00:00Z"]

    def test_align_datetime_series(self):
        a = pd.Series([1.0, 2.0, 3.0], index=pd.to_datetime(["2020-01-01", "2020-01-02",
                                                              "2020-01-03"]))
        b = pd.Series([1.0, 2.0, 3.0], index=pd.to_datetime(["2020-01-01T12:00",
                                                              "2020-01-02T12:00",
                                                              "2020-01-03T12:00"]))
        p = wp.align({"a": a, "b": b})
        assert p.time_axis.format().tolist() == ["2020-01-01T12:00:00", "2020-01-02T00:00:00",
                                                 "2020-01-02T12:00:00", "2020-01-03T00:00:00"]
        np.testing.assert_allclose(p.points[:, 0], [1.5, 2.0, 2.5, 3.0])
        with pytest.raises(ValueError, match="naive"):
            wp.align({"a": a, "b": b.tz_localize("UTC")})
        with pytest.raises(ValueError, match="same kind of time"):
            wp.align([[1.0, 2.0], [1.0, 2.0]], times=[["2020-01-01", "2020-01-02"], [0, 1]])

    @pytest.mark.parametrize("times, match", [
        ([0, 1, 1, 2, 3], r"times\[2\]=1.0 repeats times\[1\]=1.0"),
        ([0, 2, 1, 3, 4], r"times\[2\]=1.0 comes before times\[1\]=2.0"),
        ([0, 1, np.nan, 3, 4], r"times\[2\] is missing"),
        (["2020-01-01", "2020-01-02", "2020-01-02", "2020-01-03", "2020-01-04"],
         r"times\[2\]='2020-01-02' repeats"),
        (pd.to_datetime(["2020-01-01", "2020-01-02", None, "2020-01-03", "2020-01-04"]),
         r"times\[2\] is missing"),
    ])
    def test_bad_times_name_the_first_offending_row(self, times, match):
        with pytest.raises(ValueError, match=match):
            wp.area_matrix(_pair(5), times=times)

    def test_unsorted_index_names_the_row(self):
        t = pd.date_range("2021-03-01", periods=5, freq="h")
        df = pd.DataFrame(_pair(5), index=t[[0, 2, 1, 3, 4]])
        with pytest.raises(ValueError, match=r"X.index\[2\]='2021-03-01T01:00:00' comes before"):
            wp.area_matrix(df)

    def test_caller_times_untouched(self):
        t = np.arange(10, dtype=float)
        keep = t.copy()
        wp.rolling_area_matrix(_pair(10), 5, 5, times=t)
        np.testing.assert_array_equal(t, keep)


# --------------------------------------------------------------------------- shapes, dtypes
class TestShapeAndDtypes:
    def test_transposed_input_warns(self):
        with pytest.warns(ShapeWarning, match="3 samples .* and 5 channels .* looks transposed"):
            wp.area_matrix(np.random.default_rng(0).standard_normal((3, 5)))

    def test_clock_column_warns_only_without_times(self):
        T = 300
        X = np.column_stack([np.arange(T) * 0.01, np.sin(np.arange(T) / 7), np.cos(np.arange(T) / 7)])
        with pytest.warns(ShapeWarning, match="column '0' increases in near-constant steps"):
            wp.area_matrix(X)
        df = pd.DataFrame({"t": X[:, 0], "a": X[:, 1], "b": X[:, 2]})
        with pytest.warns(ShapeWarning, match="column 't'"):
            wp.area_matrix(df)
        with warnings.catch_warnings():
            warnings.simplefilter("error")
            wp.area_matrix(X[:, 1:], times=X[:, 0])          # given as times: no warning
            wp.area_matrix(np.random.default_rng(1).standard_normal((T, 3)).cumsum(axis=0))

    def test_nullable_dtypes_na_is_a_gap(self):
        df = pd.DataFrame({"a": pd.array([0, 1, 1, None, 0, 2], dtype="Int64"),
                           "b": pd.array([0.0, 0.0, 1.0, 5.0, 0.0, 0.0], dtype="Float64")})
        # the NA row splits the data: the same areas as a NaN gap row
        ref = np.array([[0, 0], [1, 0], [1, 1], [np.nan, np.nan], [0, 0], [2, 0]], float)
        assert float(wp.area_matrix(df)["a", "b"]) == float(wp.area_matrix(ref)[0, 1]) == 0.5

    def test_booleans_are_refused_not_guessed(self):
        with pytest.raises(TypeError, match="boolean"):
            wp.area_matrix(pd.DataFrame({"a": [True, False, True], "b": [1.0, 2.0, 3.0]}))
        with pytest.raises(TypeError, match="boolean"):
            wp.area_matrix(pd.DataFrame({"a": pd.array([True, None, True], dtype="boolean"),
                                         "b": [1.0, 2.0, 3.0]}))
        with pytest.raises(TypeError, match="boolean"):
            wp.area_matrix(np.array([[True, False], [False, True], [True, True]]))

    def test_integer_columns_are_read_exactly(self):
        X = np.array([[0, 0], [1, 0], [1, 1], [0, 1]], dtype=np.int16)
        df = pd.DataFrame(X, columns=["a", "b"])
        assert float(wp.area_matrix(df)["a", "b"]) == 1.0
