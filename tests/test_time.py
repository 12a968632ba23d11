"""TimeAxis (src/wedgepath/_time.py): numbers and datetimes as float64 elapsed values."""

import datetime as dt
import json
import subprocess
import sys

import numpy as np
import pytest

from wedgepath._time import TimeAxis, as_time_axis, first_non_increasing, format_iso


class TestConstructors:
    def test_numbers_are_kept_as_given(self):
        ax = as_time_axis([0, 0.25, 3])
        assert ax.kind == "number" and ax.unit is None and ax.origin is None and ax.tz is None
        assert ax.values.tolist() == [0.0, 0.25, 3.0]
        assert ax.format().tolist() == [0.0, 0.25, 3.0]

    def test_datetime64(self):
        t = np.array(["2024-02-28T12:00", "2024-03-01T12:00"], dtype="datetime64[m]")
        ax = as_time_axis(t)
        # 2024 is a leap year: 28 Feb 12:00 to 1 Mar 12:00 is two days
        assert ax.values.tolist() == [0.0, 2 * 86400.0]
        assert (ax.kind, ax.unit, ax.tz) == ("datetime", "s", None)
        assert ax.format().tolist() == ["2024-02-28T12:00:00", "2024-03-01T12:00:00"]

    def test_iso_strings_naive_and_zoned(self):
        ax = as_time_axis(["2020-01-01T00:00:00Z", "2020-01-01T00:00:02.5Z"])
        assert ax.tz == "UTC" and ax.values.tolist() == [0.0, 2.5]
        assert ax.format().tolist() == ["2020-01-01T00:00:00.000Z", "2020-01-01T00:00:02.500Z"]
        ax = as_time_axis(["2020-01-01T10:00-0530", "2020-01-01T10:01-05:30"])
        assert ax.tz == "-05:30" and ax.origin == np.datetime64("2020-01-01T15:30")
        assert ax.format([30.0]).tolist() == ["2020-01-01T10:00:30-05:30"]

    def test_pandas_tz_aware(self):
        pd = pytest.importorskip("pandas")
        idx = pd.date_range("2021-03-28 00:00", periods=4, freq="h", tz="Europe/Berlin")
        ax = as_time_axis(idx)
        assert ax.tz == "Europe/Berlin" and ax.values.tolist() == [0, 3600, 7200, 10800]
        # compare with pandas' own rendering of the same instants
        want = [s[:-2] + ":" + s[-2:] for s in idx.strftime("%Y-%m-%dT%H:%M:%S%z")]
        assert ax.format().tolist() == want
        ax1 = as_time_axis(pd.Timestamp("2020-06-01 12:00", tz="America/New_York"))
        assert ax1.format().tolist() == ["2020-06-01T12:00:00-04:00"]
        ax2 = as_time_axis(pd.Series(idx))
        assert ax2 == ax

    def test_pandas_naive_and_timedelta(self):
        pd = pytest.importorskip("pandas")
        ax = as_time_axis(pd.DatetimeIndex(["2020-01-01", "2020-01-01 00:00:00.000000001"]))
        assert ax.format().tolist() == ["2020-01-01T00:00:00.000000000",
                                        "2020-01-01T00:00:00.000000001"]
        ax = as_time_axis(pd.TimedeltaIndex(["0s", "1.5s", "3s"]))
        assert (ax.kind, ax.unit, ax.values.tolist()) == ("number", "s", [0.0, 1.5, 3.0])

    def test_python_datetimes_and_dates(self):
        tz = dt.timezone(dt.timedelta(hours=9))
        ax = as_time_axis([dt.datetime(2020, 1, 1, 9, tzinfo=tz),
                           dt.datetime(2020, 1, 1, 10, tzinfo=tz)])
        assert ax.tz == "+09:00" and ax.origin == np.datetime64("2020-01-01T00:00")
        ax = as_time_axis([dt.date(1999, 12, 31), dt.date(2000, 3, 1)])
        assert ax.dates and ax.format().tolist() == ["1999-12-31", "2000-03-01"]

    def test_dates_outside_the_nanosecond_range(self):
        ax = as_time_axis(["1500-01-01", "1600-01-01", "2500-01-01"])
        assert ax.format().tolist() == ["1500-01-01", "1600-01-01", "2500-01-01"]

    @pytest.mark.parametrize("bad, err, words", [
        (["2020-01-01", "2020/01/02"], ValueError, r"times\[1\] = '2020/01/02' is not an ISO-8601"),
        (["2020-01-01T00:00Z", "2020-01-01T01:00"], ValueError, r"times\[1\] .*no zone"),
        (["2020-02-30"], ValueError, r"times\[0\] = '2020-02-30' is not a valid date"),
        ([1.0, "2020-01-01"], TypeError, r"numbers or datetimes"),
        ([True, False], TypeError, r"numbers or datetimes"),
        (np.array(["2020-01-01", "NaT"], dtype="M8[D]"), ValueError, r"times\[1\] is missing"),
        ([], ValueError, "empty"),
    ])
    def test_refusals(self, bad, err, words):
        with pytest.raises(err, match=words):
            as_time_axis(bad)


class TestValue:
    def test_immutable(self):
        ax = as_time_axis([0.0, 1.0])
        with pytest.raises(AttributeError):
            ax.kind = "datetime"
        with pytest.raises(ValueError):
            ax.values[0] = 5.0

    def test_caller_array_not_changed_or_shared(self):
        t = np.array([0.0, 1.0, 2.0])
        ax = as_time_axis(t)
        t[0] = 99.0
        assert ax.values[0] == 0.0

    def test_with_values_keeps_origin_and_zone(self):
        ax = as_time_axis(["2020-01-01T00:00+01:00", "2020-01-01T00:10+01:00"])
        sub = ax.with_values([300.0])
        assert sub.origin == ax.origin and sub.tz == "+01:00"
        assert sub.format().tolist() == ["2020-01-01T00:05:00+01:00"]

    def test_format_precision_follows_the_values(self):
        o = np.datetime64("2000-01-01T00:00:00", "ns")
        assert format_iso([0.0, 1.0], o).tolist() == ["2000-01-01T00:00:00", "2000-01-01T00:00:01"]
        assert format_iso([0.001], o).tolist() == ["2000-01-01T00:00:00.001"]
        # float64 noise in a large elapsed value does not show as spurious nanoseconds
        # (2000-01-01 + 7305 days = 2020-01-01: five leap days in 2000-2019)
        e = 20 * 365.25 * 86400 + 0.1 + 0.2 - 0.3
        assert format_iso([e], o).tolist() == ["2020-01-01T00:00:00"]

    def test_first_non_increasing(self):
        assert first_non_increasing([0, 1, 2]) is None
        assert first_non_increasing([0, 1, 1]) == 2
        assert first_non_increasing([0, np.nan, 2]) == 1
        assert first_non_increasing([3.0]) is None

    def test_to_datetime64(self):
        ax = as_time_axis(["2020-01-01T00:00:00", "2020-01-01T00:00:10"])
        assert ax.to_datetime64([5.0])[0] == np.datetime64("2020-01-01T00:00:05")
        with pytest.raises(ValueError, match="numeric time axis"):
            as_time_axis([1.0, 2.0]).to_datetime64()


def test_no_pandas_or_pyarrow_import_for_numbers_and_datetime64():
    code = ("import numpy as np, sys\nfrom wedgepath._time import as_time_axis\n"
            "as_time_axis([0.0, 1.0]); as_time_axis(np.array(['2020-01-01'], 'M8[D]')).format()\n"
            "print([m for m in ('pandas', 'pyarrow') if m in sys.modules])")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert json.loads(out.stdout.strip().replace("'", '"')) == []
