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


# --------------------------------------------------------------------------- trials
def _trials(seed, lead=2, N=10, L=100, noise=1.2, nan_rows=True):
    """N short trials of a smoothed noise drive: channel 0 leads channel 1 by ``lead`` samples,
    channel 2 is unrelated.  Invented data (a test model)."""
    rng = np.random.default_rng(seed)
    parts, labels = [], []
    for k in range(N):
        d = np.convolve(rng.standard_normal(L + 20), np.ones(8) / 8, mode="same")
        other = np.convolve(rng.standard_normal(L + 20), np.ones(8) / 8, mode="same")
        X = np.column_stack([d[10:10 + L], d[10 - lead:10 - lead + L], other[10:10 + L]])
        X += noise * 0.3 * rng.standard_normal(X.shape)
        parts.append(X)
        labels += [f"run{k}"] * L
        if nan_rows and k < N - 1:
            parts.append(np.full((1, 3), np.nan))
            labels.append(f"run{k}")
    return np.vstack(parts), np.array(labels)


class TestTrials:
    def test_area_matrix_per_trial_and_pooled(self):
        X, lab = _trials(0, nan_rows=False)
        m = wp.area_matrix(X, trials=lab)
        per = [wp.area_matrix(X[k * 100:(k + 1) * 100]).values for k in range(10)]
        np.testing.assert_allclose(m.trial_values, np.array(per), rtol=1e-12, atol=1e-12)
        np.testing.assert_allclose(m.values, np.sum(per, axis=0), rtol=1e-12, atol=1e-12)
        assert m.trials == tuple(f"run{k}" for k in range(10))
        assert m.trial_start.tolist() == list(range(0, 1000, 100))
        f = m.to_frame()
        assert f["trial"].tolist()[:3] == ["pooled"] * 3 and len(f) == 33
        assert f.loc[f.trial == "run3", "area"].tolist() == per[3][np.triu_indices(3, 1)].tolist()

    def test_trial_column_and_gaps_agree(self):
        X, lab = _trials(1, nan_rows=True)
        df = pd.DataFrame(X, columns=["a", "b", "c"])
        df["run"] = lab
        by_col = wp.area_matrix(df, trials="run", normalize="hilbert")
        by_gaps = wp.area_matrix(X, trials="gaps", normalize="hilbert")
        plain = wp.area_matrix(X, normalize="hilbert")       # NaN rows: the same pieces
        assert by_col.names == ("a", "b", "c")
        np.testing.assert_allclose(by_col.values, plain.values, rtol=1e-12)
        np.testing.assert_allclose(by_gaps.values, plain.values, rtol=1e-12)
        np.testing.assert_allclose(by_col.trial_values, by_gaps.trial_values, rtol=1e-12)

    def test_trial_errors(self):
        X = np.random.default_rng(0).standard_normal((30, 2))
        with pytest.raises(ValueError, match="trial 'a' comes back at row 21"):
            wp.area_matrix(X, trials=["a"] * 10 + ["b"] * 10 + ["a"] * 10)
        with pytest.raises(ValueError, match="no label at row 4"):
            wp.area_matrix(X, trials=["a"] * 3 + [None] + ["b"] * 26)
        with pytest.raises(ValueError, match="29 labels but the data have 30 rows"):
            wp.area_matrix(X, trials=["a"] * 29)
        with pytest.raises(ValueError, match="not a column"):
            wp.area_matrix(pd.DataFrame(X, columns=["x", "y"]), trials="run")

    def test_ten_short_trials_find_the_lead_the_longest_piece_misses(self):
        # the case: 10 trials of 100 samples separated by NaN rows.  The old
        # command line tested only the longest gap-free stretch (rows 1-100)
        X, _ = _trials(3)
        pooled = wp.surrogate_test(X, n_surrogates=199, seed=1)
        longest = wp.surrogate_test(X[:100], n_surrogates=199, seed=1)
        assert pooled.trials == 10 and "within each piece" in pooled.design
        assert pooled.pvalues[0, 1] == 1 / 200           # no surrogate reaches the data
        assert longest.pvalues[0, 1] > 0.05
        assert pooled.pvalues[0, 2] > 0.05                # the unrelated channel
        np.testing.assert_allclose(pooled.observed, wp.area_matrix(X).values, rtol=1e-10)

    @pytest.mark.slow
    def test_pooled_surrogates_power_and_size(self):
        hits_pooled = hits_longest = 0
        for seed in range(20):
            X, _ = _trials(seed)
            hits_pooled += wp.surrogate_test(X, n_surrogates=99, seed=1).qvalues[0, 1] <= 0.05
            hits_longest += wp.surrogate_test(X[:100], n_surrogates=99,
                                              seed=1).qvalues[0, 1] <= 0.05
        assert hits_pooled >= 15 and hits_longest <= 5      # measured: 17 and 2
        # size: unrelated channels, nominal 5 %; P(Binomial(100, 0.05) > 12) < 0.002
        false = sum(wp.surrogate_test(_trials(100 + s)[0][:, [0, 2]], n_surrogates=99,
                                      seed=s).pvalues[0, 1] <= 0.05 for s in range(100))
        assert false <= 12                                   # measured: 3

    @pytest.mark.slow
    def test_pooled_bootstrap_coverage(self):
        # the unrelated pair has expected area 0: nominal 95 % intervals should cover it
        cover = {"trials": 0, "blocks": 0}
        for seed in range(100):
            X, _ = _trials(200 + seed)
            for how in cover:
                r = wp.bootstrap_area(X, n_boot=299, seed=seed, resample=how)
                cover[how] += r.low[0, 2] <= 0 <= r.high[0, 2]
        # measured: 94 and 91 (blocks of ~24 samples in trials of 100 run a little short)
        assert cover["trials"] >= 88 and cover["blocks"] >= 85

    def test_surrogates_of_a_trial_column_stay_within_trials(self):
        X, lab = _trials(4, nan_rows=False)
        df = pd.DataFrame(X, columns=["a", "b", "c"])
        df["run"] = lab
        res = wp.surrogate_test(df, trials="run", n_surrogates=99, seed=0, method="phase")
        assert res.trials == 10 and res.pvalues[0, 1] <= 0.05
        # the same trials marked by NaN rows instead of a column: the same pieces, the same test
        gapped = np.vstack([np.vstack([X[k * 100:(k + 1) * 100], np.full((1, 3), np.nan)])
                            for k in range(10)])
        again = wp.surrogate_test(gapped, n_surrogates=99, seed=0, method="phase")
        np.testing.assert_array_equal(again.pvalues, res.pvalues)
        shift = wp.surrogate_test(df, trials="run", n_surrogates=99, seed=0)
        assert shift.pvalues[0, 1] == 0.01
        # one series without gaps and without trials: the classic test, unchanged
        one = wp.surrogate_test(X, n_surrogates=99, seed=0, method="phase")
        assert one.trials == 1 and one.design == "Fourier phase randomisation of each channel"

    def test_bootstrap_resamples_trials_or_blocks_and_says_so(self):
        X, _ = _trials(5)
        t = wp.bootstrap_area(X, n_boot=499, seed=0)
        assert t.resample == "trials" and t.trials == 10 and t.block is None
        assert "resample='trials'" in repr(t)
        b = wp.bootstrap_area(X, n_boot=499, seed=0, resample="blocks")
        assert b.resample == "blocks" and b.trials == 10 and b.block >= 2
        for r in (t, b):
            np.testing.assert_allclose(r.estimate, wp.area_matrix(X).values, rtol=1e-10)
            assert r.low[0, 1] > 0                          # the lead is found
        few = wp.bootstrap_area(np.vstack([X[:303], X[-100:]]), n_boot=99, seed=0)
        assert few.resample == "blocks"                     # 4 trials: too few to resample
        with pytest.raises(ValueError, match="needs several trials"):
            wp.bootstrap_area(X[:100], resample="trials")

    def test_trial_bootstrap_matches_a_direct_resampling(self):
        # the replicates are sums of trials drawn with replacement: redo them by hand
        X, _ = _trials(6)
        r = wp.bootstrap_area(X, n_boot=50, seed=7, resample="trials", keep=True)
        At = np.array([wp.area_matrix(X[k * 101:k * 101 + 100]).values for k in range(10)])
        draws = np.random.default_rng(7).integers(0, 10, size=(50, 10))
        np.testing.assert_allclose(r.replicates, At[draws].sum(axis=1), rtol=1e-10, atol=1e-10)


# --------------------------------------------------------------------------- files
class TestTrialColumnInFiles:
    def test_read_labels_csv_and_parquet(self, tmp_path):
        from wedgepath import io as wio

        df = pd.DataFrame({"t": np.arange(6.0), "a": np.arange(6.0) ** 2,
                           "trial": ["r1", "r1", "r1", "r 2", "r 2", "r 2"],
                           "b": [1, 2, 3, 4, 5, 6.0]})
        p = tmp_path / "x.csv"
        p.write_text("# a preamble line\n" + df.to_csv(index=False))
        assert wio.read_labels(p, "trial").tolist() == ["r1"] * 3 + ["r 2"] * 3
        assert wio.read_table(p, columns="a,b", time_column="t").values.shape == (6, 2)
        q = tmp_path / "x.parquet"
        df.assign(trial=[1, 1, 1, 2, 2, 2]).to_parquet(q)
        assert wio.read_labels(q, "trial").tolist() == ["1"] * 3 + ["2"] * 3
        with pytest.raises(wio.TableError, match="no column 'nope'"):
            wio.read_labels(p, "nope")
        df.loc[3, "trial"] = None
        df.to_csv(p, index=False)
        with pytest.raises(wio.TableError, match="empty at data row 4"):
            wio.read_labels(p, "trial")
        with pytest.raises(wio.TableError, match="standard input"):
            wio.read_labels("-", "trial")


# --------------------------------------------------------------------------- report and CLI
class TestReportAndCommandLine:
    def test_report_pools_trials_instead_of_the_longest_stretch(self):
        from wedgepath import report

        X, _ = _trials(3)
        r = report.leadlag(X, n_surrogates=99, n_boot=99, names=["a", "b", "c"])
        assert r.significance.trials == 10 and r.bootstrap.resample == "trials"
        text = "\n".join(r.summary())
        # the surrogates, the bootstrap and the verdict pool the trials; only the drift and
        # lag checks (issue 17) still use the longest gap-free stretch, and say so
        assert not [ln for ln in text.splitlines()
                    if "longest gap-free" in ln and "the drift check and the lags" not in ln]
        assert "the calibrated verdict pools 10 gap-free pieces" in text
        assert "within each piece; area summed over 10 pieces" in text
        assert "resampling 10 whole trials" in text
        d = r.to_dict()
        assert d["significance"]["pieces"] == 10 and d["bootstrap"]["resample"] == "trials"
        assert d["bootstrap"]["block"] is None
        assert r.significant_pairs() == [(0, 1)]

    def test_report_datetimes_round_trip_to_json_and_csv(self):
        from wedgepath import report

        X, lab = _trials(3, nan_rows=False)
        t = pd.date_range("2024-05-01", periods=1000, freq="10ms", tz="UTC")
        r = report.leadlag(pd.DataFrame(X, columns=["a", "b", "c"], index=t), trials=lab,
                           window=100, step=100)
        d = r.to_dict()
        assert d["time_unit"] == "ISO-8601" and d["rolling"]["time_unit"] == "ISO-8601"
        # starts and ends at one precision (the ends need milliseconds)
        assert d["rolling"]["start_time"][:2] == ["2024-05-01T00:00:00.000Z",
                                                  "2024-05-01T00:00:01.000Z"]
        tables = r.tables()
        assert tables["rolling.csv"]["end_time"].iloc[0] == "2024-05-01T00:00:00.990Z"
        assert list(tables["trials.csv"]["trial"].unique()[:3]) == ["pooled", "run0", "run1"]
        assert d["trials"]["first_row"][:2] == [1, 101]
        assert "trials.csv" in r.planned_files()

    def test_report_takes_a_dataframe_trial_column(self):
        from wedgepath import report

        X, lab = _trials(3, nan_rows=False)
        df = pd.DataFrame(X, columns=["a", "b", "c"])
        df["run"] = lab
        r = report.leadlag(df, trials="run", n_surrogates=19, seed=0)
        assert r.names == ("a", "b", "c") and r.trials.trials[0] == "run0"
        assert r.significance.trials == 10

    def test_cli_trial_column_and_iso_times(self, tmp_path):
        from wedgepath.cli import main

        X, lab = _trials(3, nan_rows=False)
        df = pd.DataFrame(X, columns=["a", "b", "c"])
        df.insert(0, "time", pd.date_range("2024-05-01T08:00", periods=1000, freq="10ms")
                  .strftime("%Y-%m-%dT%H:%M:%S.%f"))
        df["run"] = lab
        path = tmp_path / "trials.csv"
        df.to_csv(path, index=False)
        out = tmp_path / "out"
        code = main([ "leadlag", str(path), "--time", "time", "--trial", "run",
                     "--surrogates", "99", "--window", "200", "--out", str(out),
                     "--no-figures", "--quiet"])
        assert code == 0
        res = json_load(out / "result.json")
        assert res["input"]["trial_column"] == "run"
        assert res["significance"]["pieces"] == 10
        assert res["channels"] == ["a", "b", "c"]
        assert res["rolling"]["start_time"][1] == "2024-05-01T08:00:00.500"
        trials = pd.read_csv(out / "trials.csv")
        assert len(trials) == 33 and trials["trial"].iloc[3] == "run0"

    def test_cli_trial_errors(self, tmp_path, capsys):
        from wedgepath.cli import main

        path = tmp_path / "t.csv"
        pd.DataFrame({"a": [1.0, 2, 3, 4], "b": [2.0, 1, 4, 3], "run": [1, 1, 2, 2]}).to_csv(
            path, index=False)
        assert main(["leadlag", str(path), "--trial", "nope", "--no-figures", "--quiet",
                     "--out", str(tmp_path / "o")]) == 2
        assert "no column 'nope' (--trial)" in capsys.readouterr().err
        assert main(["leadlag", str(path), "--trial", "run", "--columns", "a,run",
                     "--no-figures", "--quiet", "--out", str(tmp_path / "o")]) == 2
        assert "also listed in --columns" in capsys.readouterr().err
        assert main(["leadlag", str(path), "--trial", "run", "--stream", "--no-figures",
                     "--quiet", "--out", str(tmp_path / "o")]) == 2


def json_load(path):
    import json

    with open(path) as fh:
        return json.load(fh)


class TestCommandLineTimesAndColumns:
    def test_loop_cycles_in_dates(self, tmp_path):
        from wedgepath.cli import main

        T = 300
        x = np.arange(T) * 0.2
        path = tmp_path / "loop.csv"
        pd.DataFrame({"date": pd.date_range("2020-01-01", periods=T, freq="D")
                      .strftime("%Y-%m-%d"), "strain": np.sin(x), "stress": np.sin(x + 0.5)}
                     ).to_csv(path, index=False)
        assert main(["loop", str(path), "--x", "strain", "--y", "stress", "--time", "date",
                     "--out", str(tmp_path / "o"), "--no-figures", "--quiet"]) == 0
        res = json_load(tmp_path / "o" / "result.json")
        assert res["cycles"]["time_unit"] == "ISO-8601"
        assert all(s.startswith("2020-") for s in res["cycles"]["start"][:3])
        cyc = pd.read_csv(tmp_path / "o" / "cycles.csv")
        assert cyc["start"].iloc[0] == res["cycles"]["start"][0]

    def test_clock_column_is_named_in_the_summary(self, tmp_path, capsys):
        from wedgepath.cli import main

        T = 300
        t = np.arange(T) * 0.01
        path = tmp_path / "clock.csv"
        pd.DataFrame({"t": t, "a": np.sin(7 * t), "b": np.cos(7 * t)}).to_csv(path, index=False)
        assert main(["leadlag", str(path), "--out", str(tmp_path / "o"), "--no-figures",
                     "--quiet"]) == 0
        out = capsys.readouterr().out
        assert "column 't' increases in near-constant steps, like a clock" in out
        assert main(["leadlag", str(path), "--time", "t", "--out", str(tmp_path / "o2"),
                     "--no-figures", "--quiet"]) == 0
        assert "like a clock" not in capsys.readouterr().out
