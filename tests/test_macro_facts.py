"""Checks against outside facts: business-cycle stylized facts on US quarterly data.

Data: the quarterly US macroeconomic table bundled with statsmodels
(``statsmodels.datasets.macrodata``, 1959Q1-2009Q3).  Cycles: log levels (levels for
the unemployment and T-bill rates) filtered by the Hodrick-Prescott filter with
lambda = 1600 (R. J. Hodrick and E. C. Prescott, "Postwar U.S. business cycles",
J. Money, Credit and Banking 29, 1997), or the Baxter-King band-pass of 6 to 32
quarters with K = 12 (M. Baxter and R. G. King, "Measuring business cycles", Review
of Economics and Statistics 81, 1999), both as implemented in statsmodels.

The facts checked (sources beside each check; "from memory" where the value or
wording is typed from memory, not looked up):
* J. H. Stock and M. W. Watson, "Business cycle fluctuations in US macroeconomic
  time series", Handbook of Macroeconomics vol. 1A, 1999 (cited as S&W 1999);
* R. G. King and S. T. Rebelo, "Resuscitating real business cycles", Handbook of
  Macroeconomics vol. 1B, 1999, Table 1 (cited as K&R 1999);
* F. E. Kydland and E. C. Prescott, "Business cycles: real facts and a monetary
  myth", Federal Reserve Bank of Minneapolis Quarterly Review 14, 1990 (K&P 1990).
"""

from __future__ import annotations

import warnings

import numpy as np
import pytest

import wedgepath as wp
from wedgepath.signals.verdicts import antiphase_channels

pd = pytest.importorskip("pandas")
sm_data = pytest.importorskip("statsmodels.datasets")

COLS = ["realgdp", "realcons", "realinv", "unemp", "cpi", "tbilrate"]


def _levels():
    df = sm_data.macrodata.load_pandas().data
    return pd.DataFrame({c: (df[c] if c in ("unemp", "tbilrate") else np.log(df[c]))
                         for c in COLS})


def _cycles(kind):
    from statsmodels.tsa.filters.bk_filter import bkfilter
    from statsmodels.tsa.filters.hp_filter import hpfilter

    L = _levels()
    if kind == "hp":
        return pd.DataFrame({c: np.asarray(hpfilter(L[c], 1600)[0]) for c in COLS})
    return pd.DataFrame({c: bkfilter(L[c].to_numpy(), 6, 32, 12) for c in COLS})


def _xcorr(x, y, k):
    """corr(x_t, y_{t+k}): a peak at k > 0 means y lags x by k quarters."""
    n = len(x)
    return float(np.corrcoef(x[max(0, -k):n - max(0, k)], y[max(0, k):n - max(0, -k)])[0, 1])


@pytest.mark.parametrize("kind", ["hp", "bk"])
def test_countercyclical_series_are_flagged_as_antiphase(kind):
    C = _cycles(kind)
    flagged = {nm for nm, _ in antiphase_channels(C)}
    # S&W 1999: the unemployment rate is countercyclical (from memory)
    assert "unemp" in flagged
    # S&W 1999 and K&P 1990: the price level is countercyclical in postwar US data
    # (from memory)
    assert "cpi" in flagged
    # S&W 1999: consumption, investment and short-term interest rates are procyclical
    # (from memory)
    assert not flagged & {"realcons", "realinv", "tbilrate"}


@pytest.mark.parametrize("kind", ["hp", "bk"])
def test_unemployment_lags_output_once_inverted(kind):
    C = _cycles(kind)
    gdp, un = C["realgdp"].to_numpy(), C["unemp"].to_numpy()
    A_raw = wp.area_matrix(C, normalize="hilbert")
    # the trap of issue 17: read as it is, unemployment "leads" output
    assert A_raw["realgdp", "unemp"] < 0
    A = wp.area_matrix(wp.filters.invert(C, ["unemp", "cpi"]), normalize="hilbert")
    # S&W 1999: unemployment is countercyclical and lags output, its largest (negative)
    # cross-correlation with output at about one quarter's lag (from memory)
    assert A["realgdp", "unemp"] > 0.1
    peak = max(range(-4, 5), key=lambda k: -_xcorr(gdp, un, k))
    assert peak == 1                            # the textbook cross-correlation agrees


@pytest.mark.parametrize("kind", ["hp", "bk"])
def test_tbill_rate_is_procyclical_and_lags(kind):
    C = _cycles(kind)
    gdp, r = C["realgdp"].to_numpy(), C["tbilrate"].to_numpy()
    A = wp.area_matrix(C, normalize="hilbert")
    # S&W 1999: short-term interest rates are procyclical and lag the cycle (from memory)
    assert _xcorr(gdp, r, 0) > 0.3
    assert A["realgdp", "tbilrate"] > 0.1
    assert max(range(-4, 5), key=lambda k: _xcorr(gdp, r, k)) >= 1


def test_relative_volatility_and_coincident_investment():
    C = _cycles("hp")
    sd = C.std()
    # K&R 1999, Table 1 (HP-filtered US data; from memory): investment about 3 times
    # as volatile as output, consumption less volatile than output
    assert sd["realinv"] / sd["realgdp"] > 2.5
    assert sd["realcons"] / sd["realgdp"] < 1.0
    # S&W 1999: investment is procyclical and roughly coincident (from memory)
    A = wp.area_matrix(C, normalize="hilbert")
    assert _xcorr(C["realgdp"].to_numpy(), C["realinv"].to_numpy(), 0) > 0.85
    assert abs(A["realgdp", "realinv"]) < 0.1


def test_trends_in_levels_are_flagged_and_the_cycles_are_above_noise():
    # log levels trend: the drift makes most of their areas (the warning of issue 17)
    with pytest.warns(wp.DriftWarning):
        assert wp.drift_check(_levels()).dominated
    C = wp.filters.invert(_cycles("hp"), ["unemp", "cpi"])
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        assert not wp.drift_check(C).dominated
    assert wp.fit_test(C, seed=0).pvalue <= 0.01
