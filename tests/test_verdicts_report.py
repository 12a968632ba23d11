"""Issue 17 in the report and the command line: verdict, drift, anti-phase, chain/ring, lags."""

from __future__ import annotations

import json

import numpy as np
import pytest

import wedgepath as wp
from wedgepath import report
from wedgepath.cli import main


def _csv(path, names, t, X):
    with open(path, "w") as fh:
        fh.write(",".join(["t", *names]) + "\n")
        for k in range(len(t)):
            fh.write(",".join(repr(float(v)) for v in (t[k], *X[k])) + "\n")
    return path


def _chain(rng, T=3000, h=0.05):
    """A wandering 3-second rhythm seen by a, b (0.3 s later), c (0.6 s later) and an
    anti-phase channel d (0.45 s later, negated)."""
    t = np.arange(T) * h
    phase = 2 * np.pi * t / 3.0 + np.cumsum(rng.standard_normal(T)) * 0.05
    ph = [np.interp(t - d, t, phase) for d in (0.0, 0.3, 0.6, 0.45)]
    X = np.column_stack([np.sin(p) for p in ph])
    X[:, 3] = -X[:, 3]
    return t, X + 0.2 * rng.standard_normal(X.shape)


def run(argv, capsys):
    code = main([str(a) for a in argv])
    cap = capsys.readouterr()
    return code, cap.out, cap.err


def test_report_chain_with_invert_and_reference_lags():
    t, X = _chain(np.random.default_rng(0))
    names = ["a", "b", "c", "d"]
    raw = report.leadlag(X, times=t, names=names)
    assert [nm for nm, _ in raw.antiphase] == ["d"]
    text = "\n".join(raw.summary())
    assert "may move in anti-phase" in text and "--invert d" in text
    rep = report.leadlag(X, times=t, names=names, invert=["d"], reference="a")
    assert rep.antiphase == () and rep.structure == "chain"
    assert rep.order.fit_pvalue == rep.verdict.pvalue <= 0.05
    assert rep.leaders()[0] == "a" and rep.laggers()[0] == "c"
    assert np.allclose(rep.lags.lags, [0.0, 0.3, 0.6, 0.45], atol=0.05)
    d = rep.to_dict()
    assert d["cyclic_order"]["fit_pvalue"] == rep.verdict.pvalue
    assert d["verdict"]["above_noise"] is True
    assert d["lags"]["b"] == pytest.approx(0.3, abs=0.05)
    assert d["preprocessing"] == {"invert": "d"}
    assert "lags behind a" in "\n".join(rep.summary())
    before = X.copy()
    report.leadlag(X, times=t, names=names, invert=["d"], bandpass=(1.0, 10.0))
    assert np.array_equal(X, before)


def test_report_ring_lists_no_leaders_and_broadband_gives_no_lag():
    rng = np.random.default_rng(1)
    t = 2 * np.pi * np.arange(2000) / 100
    ring = np.column_stack([np.sin(t - d) for d in np.arange(6) * np.pi / 3])
    rep = report.leadlag(ring + 0.1 * rng.standard_normal(ring.shape))
    assert rep.structure == "ring" and rep.leaders() == [] and rep.laggers() == []
    text = "\n".join(rep.summary())
    assert "ring:" in text and "strongest leaders" not in text
    x = rng.standard_normal(3000)
    broad = report.leadlag(np.column_stack([x[3:], x[:-3], rng.standard_normal(2997)]),
                           reference="0")
    assert broad.lags is not None and not broad.lags.narrowband
    assert broad.to_dict()["lags"] is None
    assert "broad-band" in "\n".join(broad.summary())


def test_report_null_says_not_above_noise():
    X = np.random.default_rng(2).standard_normal((800, 6))
    rep = report.leadlag(X)
    assert not rep.verdict.above
    assert "not above noise at 5%" in "\n".join(rep.summary())


def test_report_warns_on_drift():
    rng = np.random.default_rng(3)
    walks = np.cumsum(rng.standard_normal((1000, 4)) + [0.1, 0.2, -0.1, 0.15], axis=0)
    with pytest.warns(wp.DriftWarning):
        rep = report.leadlag(walks)
    assert rep.drift.dominated and any("drift" in n for n in rep.notes)
    calm = report.leadlag(walks, difference=True)
    assert not calm.drift.dominated and calm.samples == 999


def test_cli_options(tmp_path, capsys):
    t, X = _chain(np.random.default_rng(4))
    f = _csv(tmp_path / "s.csv", ["a", "b", "c", "d"], t, X)
    out = tmp_path / "o"
    code, stdout, err = run(["leadlag", f, "--time", "t", "--units", "t=s", "--invert", "d",
                             "--reference", "a", "--bandpass", "1,10", "--out", out,
                             "--no-figures", "--quiet"], capsys)
    assert code == 0, err
    d = json.loads((out / "result.json").read_text())
    assert d["lags"]["c"] == pytest.approx(0.6, abs=0.05)
    assert d["structure"] == "chain" and d["cyclic_order"]["fit_pvalue"] <= 0.05
    assert "lags behind a (period 3" in stdout and " s [" in stdout
    assert "preprocessing: invert d, bandpass 1 to 10 s (zero-phase filters)" in stdout
    assert d["preprocessing"]["bandpass"] == "1 to 10"        # the JSON keeps its form
    for argv, msg in ((["--bandpass", "5"], "LOW,HIGH"), (["--bandpass", "5,1"], "LOW < HIGH"),
                      (["--invert", "zz"], "unknown channel 'zz'"),
                      (["--reference", "zz"], "unknown channel 'zz'"),
                      (["--highpass", "-1"], "positive"),
                      (["--bandpass", "0.01,1"], "two samples")):
        code, stdout, err = run(["leadlag", f, "--time", "t", *argv], capsys)
        assert code == 2 and err.startswith("wedgepath") and "error:" in err and msg in err, \
            (argv, err)
        assert err.count("\n") == 1
        assert "Traceback" not in err
    code, _, err = run(["leadlag", f, "--stream", "--detrend"], capsys)
    assert code == 2 and "--detrend" in err


def test_cli_says_the_drift_once(tmp_path, capsys):
    # the drift note is in the summary; the command line does not repeat it as a warning
    rng = np.random.default_rng(3)
    walks = np.cumsum(rng.standard_normal((1000, 4)) + [0.1, 0.2, -0.1, 0.15], axis=0)
    f = _csv(tmp_path / "w.csv", ["a", "b", "c", "d"], np.arange(1000.0), walks)
    code, stdout, err = run(["leadlag", f, "--time", "t"], capsys)
    assert code == 0
    assert "note: the drift from first to last sample makes" in stdout
    assert (stdout + err).count("the drift from first to last sample makes") == 1, (stdout, err)


def test_datetimes_survive_preprocessing_and_lags_read_in_days(tmp_path, capsys):
    # daily dates, b and c 0.8 and 1.6 rad behind a on a 30-day cycle: lags 3.82 and 7.64 days
    # (phase / (2 pi) * period: common practice, no source).  Before, --difference turned
    # the dates into "time units" and the lags printed as 3.3e+05 s.
    import pandas as pd

    rng = np.random.default_rng(1)
    ph = np.arange(400) * 2 * np.pi / 30
    df = pd.DataFrame({"date": pd.date_range("2020-01-01", periods=400, freq="D"),
                       **{c: np.sin(ph - d) + 0.1 * rng.standard_normal(400)
                          for c, d in (("a", 0.0), ("b", 0.8), ("c", 1.6))}})
    f = tmp_path / "daily.csv"
    df.to_csv(f, index=False)
    out = tmp_path / "o"
    code, stdout, _ = run(["leadlag", f, "--time", "date", "--difference", "--reference", "a",
                           "--window", "60", "--step", "30", "--out", out], capsys)
    assert code == 0
    line = next(s for s in stdout.splitlines() if s.startswith("  b: "))
    assert abs(float(line.split()[1]) - 3.82) < 0.3
    assert line.split()[2] == "d"
    assert "period 30." in stdout and "time units" not in stdout
    rolling = pd.read_csv(out / "rolling.csv")
    assert rolling["start_time"].iloc[0] == "2020-01-02"     # the first difference's date
    payload = json.loads((out / "result.json").read_text())
    assert payload["time_unit"] == "ISO-8601"


def _daily(tmp_path, trend=False):
    """Daily dates, a 30-day cycle; b and c 0.8 and 1.6 rad behind a: lags 3.82 and 7.64 d
    (delay = phase / (2 pi) * period for a sinusoid; common practice, no source)."""
    import pandas as pd

    rng = np.random.default_rng(1)
    ph = np.arange(400) * 2 * np.pi / 30
    df = pd.DataFrame({"date": pd.date_range("2020-01-01", periods=400, freq="D"),
                       **{c: np.sin(ph - d) + 0.1 * rng.standard_normal(400)
                          for c, d in (("a", 0.0), ("b", 0.8), ("c", 1.6))}})
    f = tmp_path / "daily.csv"
    df.to_csv(f, index=False)
    return f


def test_a_unit_for_a_date_column_converts_lags_bands_and_filters(tmp_path, capsys):
    # Before, --units date=day relabelled seconds as days (lags of "2.6e+05 day") and band
    # edges given per day were applied per second.
    f = _daily(tmp_path)
    out = tmp_path / "o"
    code, stdout, _ = run(["leadlag", f, "--time", "date", "--units", "date=day",
                           "--reference", "a", "--bands", "0,0.02,0.05,0.5",
                           "--bandpass", "10,60", "--out", out], capsys)
    assert code == 0, stdout
    lag = {ln.split(":")[0].strip(): float(ln.split()[1]) for ln in stdout.splitlines()
           if ln.startswith(("  b: ", "  c: "))}
    assert abs(lag["b"] - 3.82) < 0.3 and abs(lag["c"] - 7.64) < 0.3, stdout
    assert "period 30" in stdout and "bandpass 10 to 60 day" in stdout
    payload = json.loads((out / "result.json").read_text())
    assert payload["lags_info"]["time_unit"] == "day"
    assert abs(payload["lags"]["b"] - 3.82) < 0.3
    bands = payload["bands"]
    assert bands["frequency_unit"] == "cycles per day"
    assert bands["names"] == ["0-0.02", "0.02-0.05", "0.05-0.5"]
    assert np.allclose(bands["low"], [0, 0.02, 0.05]) and np.allclose(bands["high"][-1], 0.5)
    # the 30-day cycle (0.033 cycles per day) carries the lead: the middle band
    A = np.asarray(bands["areas"])
    i, j = payload["channels"].index("a"), payload["channels"].index("b")
    assert abs(A[1, i, j]) > 0.9 * abs(A[:, i, j].sum())


def test_a_date_column_without_a_unit_says_seconds(tmp_path, capsys):
    f = _daily(tmp_path)
    code, stdout, _ = run(["leadlag", f, "--time", "date", "--reference", "a", "--bands",
                           "0,0.02,0.5", "--json"], capsys)
    assert code == 0
    payload = json.loads(stdout)
    assert payload["lags_info"]["time_unit"] == "s"
    assert abs(payload["lags"]["b"] / 86400 - 3.82) < 0.3
    assert payload["bands"]["frequency_unit"] == "cycles per s"
    # edges meant per day but read per second lie far above the Nyquist frequency: said
    assert any("above the Nyquist frequency" in n and "0.02-0.5" in n and "--units date=day" in n
               for n in payload["notes"])


def test_a_date_column_refuses_a_unit_that_is_not_time(tmp_path, capsys):
    f = _daily(tmp_path)
    code, _, err = run(["leadlag", f, "--time", "date", "--units", "date=EUR"], capsys)
    assert code == 2 and "must be a unit of time" in err and len(err.splitlines()) == 1


def test_rows_after_difference_are_data_rows(tmp_path, capsys):
    # after --difference the windows' rows are the table's data rows (a differenced row is
    # the change into a data row), as the dates already were: window 1 ends on data row 61
    import pandas as pd

    f = _daily(tmp_path)
    out = tmp_path / "o"
    code, stdout, _ = run(["leadlag", f, "--time", "date", "--difference", "--window", "60",
                           "--step", "30", "--out", out], capsys)
    assert code == 0
    r = pd.read_csv(out / "rolling.csv")
    assert (r["first_row"].iloc[0], r["last_row"].iloc[0]) == (2, 61)
    dates = pd.read_csv(f)["date"]
    assert r["start_time"].iloc[0] == dates.iloc[1] and r["end_time"].iloc[0] == dates.iloc[60]
    assert "preprocessing: difference (half a sample later" in stdout


def test_a_clean_oscillation_that_fails_the_verdict_is_explained():
    # two clean 60-minute sinusoids, b 1.05 rad behind a: the lag is tight, yet the phase
    # surrogates give p around 0.3 (one frequency, one phase difference); the summary says
    # why instead of leaving a bare "not above noise" beside a tight lag (trial finding 18)
    t = np.arange(0, 6 * 3600, 30.0)
    rng = np.random.default_rng(2)
    ph = 2 * np.pi * t / 3600
    X = np.column_stack([np.sin(ph), np.sin(ph - 1.05)]) + 0.05 * rng.standard_normal((t.size, 2))
    rep = report.leadlag(X, times=t, names=["a", "b"], reference="a")
    text = "\n".join(rep.summary())
    assert not rep.verdict.above and rep.lags.narrowband
    assert "the data are narrow-band" in text and "little power here" in text
    # delay = phase / (2 pi) * period = 601.6 s (common practice, no source)
    assert abs(rep.lags.lags[1] - 1.05 / (2 * np.pi) * 3600) < 60
    broad = report.leadlag(rng.standard_normal((2000, 2)), reference="0")     # white noise
    assert "narrow-band" not in "\n".join(broad.summary())


def test_a_duration_axis_converts_like_a_date_axis(tmp_path):
    # a timedelta time axis is held in seconds too: --units el=day relabelled seconds as
    # days there (trial 2, F1); band edges keep the caller's exact values (F8)
    import pandas as pd

    df = pd.read_csv(_daily(tmp_path), parse_dates=["date"])
    el = df.pop("date")
    el = el - el.iloc[0]
    rep = report.leadlag(df, times=el, time_name="el", units={"el": "day"}, reference="a",
                         bands=[0, 0.02, 0.06, 0.5])
    d = rep.to_dict()
    assert d["lags_info"]["time_unit"] == "day" and abs(d["lags"]["b"] - 3.82) < 0.3
    assert 25 < d["lags_info"]["period"] < 35
    assert list(d["bands"]["low"]) == [0.0, 0.02, 0.06]        # exact, not 0.0600...01
    assert d["bands"]["frequency_unit"] == "cycles per day"
    plain = report.leadlag(df, times=el, time_name="el", reference="a").to_dict()
    assert plain["lags_info"]["time_unit"] == "s"
    assert abs(plain["lags"]["b"] / 86400 - 3.82) < 0.3
    with pytest.raises(ValueError, match="must be a unit of time"):
        report.leadlag(df, times=el, time_name="el", units={"el": "EUR"})


def test_cli_says_each_warning_once_with_the_right_column(tmp_path, capsys):
    # a clock-like column used as a channel was warned about three times, the third time
    # as column '0' (an internal re-check inside the lag estimate; trial 2, F13)
    t = np.arange(400.0)
    f = _csv(tmp_path / "num.csv", ["a", "b"], t, np.column_stack(
        [np.sin(2 * np.pi * t / 30), np.sin(2 * np.pi * t / 30 - 0.6)]))
    code, _, err = run(["leadlag", f, "--reference", "a", "--surrogates", "19"], capsys)
    assert code == 0
    lines = [ln for ln in err.splitlines() if "like a clock" in ln]
    assert len(lines) == 1 and "column 't'" in lines[0], err
