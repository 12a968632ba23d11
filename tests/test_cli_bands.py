"""``wedgepath leadlag --bands``: the report layer, the files, the figure and bad input."""

import json

import numpy as np
import pandas as pd
import pytest

import wedgepath as wp
from wedgepath import report
from wedgepath.cli import main

BANDS = {"slow": (0, 3), "mid": (3, 10), "fast": (10, 50)}


def _recording(T=2000, seed=0):
    """Invented data: 'flow' leads 'pressure' in fast motion and lags it in slow motion."""
    rng = np.random.default_rng(seed)
    F = np.fft.rfft(rng.standard_normal(T + 40))
    F[np.fft.rfftfreq(T + 40) >= 0.03] = 0
    slow = np.fft.irfft(F, n=T + 40)
    slow /= slow.std()
    F = np.fft.rfft(rng.standard_normal(T + 40))
    F[np.fft.rfftfreq(T + 40) < 0.1] = 0
    fast = np.fft.irfft(F, n=T + 40)
    fast /= fast.std()
    return pd.DataFrame({"t": np.arange(T) / 100.0,
                         "pressure": slow[6:T + 6] + 0.5 * fast[:T],
                         "flow": slow[:T] + 0.5 * fast[1:T + 1],
                         "volume": slow[3:T + 3] + 0.5 * rng.standard_normal(T)})


def test_report_holds_the_spectrum_and_its_significance():
    df = _recording(T=1200)
    X = df[["pressure", "flow", "volume"]]
    r = report.leadlag(X, times=df["t"].to_numpy(), bands=BANDS, n_surrogates=99, seed=0,
                       progress=False)
    sp = r.spectrum
    assert isinstance(sp, wp.LeadSpectrum) and sp.band_names == ("slow", "mid", "fast")
    A = wp.area_matrix(X).values
    assert np.max(np.abs(sp.total() - A)) < 1e-12 * np.max(np.abs(A))
    # flow leads pressure in the fast band and lags it in the slow band
    i, j = sp.names.index("flow"), sp.names.index("pressure")
    assert sp.areas[2, i, j] > 0 > sp.areas[0, i, j]
    assert isinstance(r.band_significance, wp.BandSignificance)
    assert r.band_significance.significant()[[0, 2], i, j].all()
    assert r.planned_files(True) == ["result.json", "area_matrix.csv", "pairs.csv",
                                     "pvalues.csv", "qvalues.csv", "bands.csv",
                                     "positions.png", "pairs.png", "bands.png"]
    t = r.tables()["bands.csv"]
    assert list(t.columns) == ["band", "band_name", "low", "high", "i", "j", "channel_i",
                               "channel_j", "area", "normalized", "p", "q"]
    d = json.loads(json.dumps(r.to_dict()))
    assert d["bands"]["names"] == ["slow", "mid", "fast"]
    assert np.allclose(d["bands"]["areas"], sp.areas)
    assert d["bands"]["significance"]["adjusted_over"] == "all pairs and bands"
    text = "\n".join(r.summary())
    assert "by frequency band" in text and "flow vs pressure" in text
    assert "opposite leads in different bands" not in text or "cancel" in text


def test_report_without_bands_is_unchanged():
    df = _recording(T=400)
    r = report.leadlag(df[["pressure", "flow"]])
    assert r.spectrum is None and "bands.csv" not in r.planned_files(True)
    assert "bands" not in r.to_dict()


def test_band_figure_draws_the_strongest_pairs(tmp_path):
    pytest.importorskip("matplotlib")
    from wedgepath import plotting

    df = _recording(T=1000)
    X = df[["pressure", "flow", "volume"]]
    sp = wp.lead_spectrum(X, times=df["t"].to_numpy(), bands=BANDS)
    fig = plotting.band_leads(sp, top=2)
    panels = [ax for ax in fig.axes if ax.axison]
    assert len(panels) == 2
    titles = [ax.get_title(loc="left") for ax in panels]
    # the pair whose band areas are largest comes first, named leader first in that band
    assert titles[0] == "flow → pressure"
    ticks = [t.get_text() for t in panels[-1].get_xticklabels()]
    assert ticks[0].startswith("slow") and ticks[-1] == "all\nfrequencies"
    # one bar per band plus the all-frequency bar, heights the signed areas
    heights = [p.get_height() for p in panels[0].patches]
    i, j = sp.names.index("flow"), sp.names.index("pressure")
    assert np.allclose(heights, list(sp.areas[:, i, j]) + [sp.total()[i, j]])
    with pytest.raises(TypeError, match="LeadSpectrum"):
        plotting.band_leads(wp.area_matrix(X))


def test_cli_bands_writes_table_json_and_figure(tmp_path, capsys):
    df = _recording(T=600)
    src = tmp_path / "rec.csv"
    df.to_csv(src, index=False)
    out = tmp_path / "out"
    pytest.importorskip("matplotlib")
    rc = main(["leadlag", str(src), "--time", "t", "--bands", "slow=0:3,mid=3:10,fast=10:50",
               "--out", str(out), "--quiet"])
    assert rc == 0
    text = capsys.readouterr().out
    assert "by frequency band (3 bands, cycles per unit of t" in text
    for name in ("bands.csv", "bands.png", "result.json"):
        assert (out / name).exists(), name
    d = json.loads((out / "result.json").read_text())
    assert d["bands"]["low"] == [0, 3, 10] and d["bands"]["high"] == [3, 10, 50]
    tab = pd.read_csv(out / "bands.csv")
    A = wp.area_matrix(df[["pressure", "flow", "volume"]]).values
    per_pair = tab.groupby(["i", "j"])["area"].sum()
    assert np.allclose([per_pair[(0, 1)], per_pair[(0, 2)], per_pair[(1, 2)]],
                       [A[0, 1], A[0, 2], A[1, 2]], rtol=1e-10)
    # edges instead of names
    rc = main(["leadlag", str(src), "--time", "t", "--bands", "0,5,50", "--json"])
    assert rc == 0
    d = json.loads(capsys.readouterr().out)
    assert d["bands"]["names"] == ["0-5", "5-50"]


@pytest.mark.parametrize("args, message", [
    (["--bands", "0,3,x"], "expected a frequency"),
    (["--bands", "slow=0-3"], "NAME=LOW:HIGH"),
    (["--bands", "a=0:3,b=2:5"], "overlap"),
    (["--bands", "3"], "at least 2"),
    (["--bands", "0,3", "--stream"], "drop --bands"),
    (["--bands", "a=0:3,a=3:5"], "named twice"),
])
def test_cli_bad_bands_are_one_line_errors(tmp_path, capsys, args, message):
    df = _recording(T=200)
    src = tmp_path / "rec.csv"
    df.to_csv(src, index=False)
    rc = main(["leadlag", str(src), "--time", "t", *args])
    assert rc == 2
    err = capsys.readouterr().err.strip()
    assert message in err and len(err.splitlines()) == 1 and "Traceback" not in err
