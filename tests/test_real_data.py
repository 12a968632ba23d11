"""The main job on open data that statsmodels bundles, checked against published facts.

Each check names its source beside it; "from memory" says the figure was not
looked up again for this test.  The data sets ship inside statsmodels (no
download): yearly sunspot numbers 1700-2008 and weekly Mauna Loa CO2
1958-2001 (with missing weeks).
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

import wedgepath as wp

datasets = pytest.importorskip("statsmodels.datasets")


@pytest.fixture(scope="module")
def sunspots():
    d = datasets.sunspots.load_pandas().data
    return d.YEAR.astype(int).to_numpy(), d.SUNACTIVITY.to_numpy(dtype=float)


@pytest.fixture(scope="module")
def co2():
    return datasets.co2.load_pandas().data["co2"]


def test_sunspot_cycle_of_about_eleven_years_from_lagged_areas(sunspots):
    # A series against itself k years earlier turns counter-clockwise (x_t leads x_{t-k})
    # while k is less than half a period, clockwise between half a period and a period:
    # for x = sin(2 pi t / P) the normalised area is sin(2 pi k / P).
    # Fact: the solar (Schwabe) cycle averages about 11 years (D. H. Hathaway, "The solar
    # cycle", Living Reviews in Solar Physics 12, 4, 2015; from memory).
    _, x = sunspots
    s = np.array([float(wp.area_matrix(np.column_stack([x[k:], x[:-k]]),
                                       normalize="hilbert")[0, 1]) for k in range(1, 13)])
    assert (s[:5] > 0).all() and (s[5:10] < 0).all() and (s[10:] > 0).all()
    # the sign changes bracket P/2 in (5, 6) and P in (10, 11) years: P = 10 to 12 years
    assert int(np.argmax(s)) + 1 in (2, 3)     # the largest lead near a quarter period


def test_sunspot_cycles_cut_in_calendar_time(sunspots):
    # The same job through a DataFrame with a DatetimeIndex: cycle boundaries come back
    # as ISO dates.  Every cycle's loop turns counter-clockwise, and the typical cycle
    # lasts about 11 years (Hathaway 2015, as above: lengths from 9 to 14 years).
    yrs, x = sunspots
    k = 3
    idx = pd.to_datetime([f"{y:04d}-07-01" for y in yrs])[k:]
    X = pd.DataFrame({"now": x[k:], "before": x[:-k]}, index=idx)
    c = wp.cycle_areas(X, "now", "before", hysteresis=5.0)
    assert c.time_unit == "ISO-8601"
    assert all(isinstance(s, str) and s[4] == "-" for s in c.start_time)
    # the pieces before the first and after the last crossing are listed as partial
    assert list(c.status[[0, -1]]) == ["partial-start", "partial-end"] and c.complete[1:-1].all()
    assert (c.values[c.complete] > 0).all()
    lengths = (c.stop - c.start)[c.complete]                   # in samples = years
    assert 10.0 <= float(np.median(lengths)) <= 12.0          # measured: 10.49
    first = int(c.start_time[1][:4])
    assert 1700 + k <= first <= 1712                           # within the first cycle


def test_co2_seasonal_cycle_peaks_in_spring(co2):
    # Weekly Mauna Loa CO2 with missing weeks (NaN gaps) on a DatetimeIndex.  The
    # seasonal anomaly (the series minus its centred one-year mean) is compared with the
    # calendar's cosine and sine: A[cos, co2] = (1/2) sin(phase), A[sin, co2] = -(1/2)
    # cos(phase) times the same factor, phase = 2 pi d0 / 365.25 with d0 the day of year
    # at which the annual harmonic of the anomaly peaks.
    # Fact: the CO2 concentration at Mauna Loa is highest in May and lowest in
    # September/October (C. D. Keeling et al., "Atmospheric carbon dioxide variations at
    # Mauna Loa Observatory, Hawaii", Tellus 28, 1976; from memory).  The rise is slower
    # than the fall, so the annual harmonic peaks a little before the maximum: we accept
    # April or May (days 91 to 151; the tolerance is our choice).
    t = co2.index
    doy = (t.day_of_year.to_numpy() - 1) / 365.25
    anomaly = co2 - co2.rolling(53, center=True, min_periods=40).mean()
    df = pd.DataFrame({"co2": anomaly.to_numpy(), "cos": np.cos(2 * np.pi * doy),
                       "sin": np.sin(2 * np.pi * doy)}, index=t)
    assert np.isnan(df["co2"]).sum() > 50                     # real gaps in the record
    m = wp.area_matrix(df)
    ref = m["cos", "sin"]
    phase = np.arctan2(m["cos", "co2"] / ref, -m["sin", "co2"] / ref) % (2 * np.pi)
    peak_day = phase / (2 * np.pi) * 365.25
    assert 91 <= peak_day <= 151                               # measured: 112.6
    # calendar years as trials: nearly every year has the same phase
    per_year = wp.area_matrix(df, trials=t.year.to_numpy())
    assert len(per_year.trials) == 44 and per_year.trials[0] == "1958"
    lead = per_year.trial_values[:, 1, 0]                      # A[cos, co2] per year
    assert np.mean(lead > 0) >= 0.9                            # measured: 0.95
    # rolling windows of a year report their start as ISO text of the weekly index
    r = wp.rolling_area_matrix(df[["co2", "cos"]], 52, 52)
    assert r.start_time[0] == "1958-03-29T00:00:00" and r.time_unit == "ISO-8601"


def test_co2_lead_survives_the_pooled_surrogate_test(co2):
    # the seasonal lead of the calendar over the anomaly, tested with the gaps as trial
    # boundaries (the pieces between missing weeks)
    t = co2.index
    doy = (t.day_of_year.to_numpy() - 1) / 365.25
    anomaly = co2 - co2.rolling(53, center=True, min_periods=40).mean()
    X = np.column_stack([anomaly.to_numpy(), np.cos(2 * np.pi * doy)])
    res = wp.surrogate_test(X, n_surrogates=99, seed=0, method="phase")
    assert res.trials > 10
    assert res.pvalues[0, 1] == 0.01
