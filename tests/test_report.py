"""The report layer (wedgepath.report) and its figures (issue 15, items 2 and 5).

Reports hold the library's own results; the JSON, tables, text and figures are views of
them, and the files they give are known before computing.  The figure tests check what a
reader sees: the numbers drawn are the numbers printed, names never overlap, the recorded
curve is never replaced by a detrended one, labels say raw or normalised.
"""

from __future__ import annotations

import dataclasses
import json
import subprocess
import sys
from types import SimpleNamespace

import numpy as np
import pytest

import wedgepath as wp
from wedgepath import report


def ring(n=4, T=400, seed=0, phase=0.7):
    rng = np.random.default_rng(seed)
    t = np.linspace(0, 8 * np.pi, T)
    X = np.column_stack([np.sin(t - phase * k) for k in range(n)])
    return X + 0.01 * rng.normal(size=X.shape), [f"ch{k}" for k in range(n)]


# =========================================================================== the reports
class TestLeadLagReport:
    def test_holds_the_library_results(self):
        X, names = ring()
        r = report.leadlag(X, names=names, window=200, n_surrogates=19, n_boot=19, seed=2,
                           progress=False)
        A = wp.area_matrix(X, names=names)
        assert isinstance(r.areas, wp.AreaMatrix) and r.areas.names == tuple(names)
        np.testing.assert_array_equal(np.asarray(r.areas), np.asarray(A))
        co = wp.cyclic_order(np.asarray(A))
        assert isinstance(r.order, wp.CyclicOrder)
        assert r.order.order.tolist() == co.order.tolist()
        assert isinstance(r.rolling, wp.RollingAreas)
        assert isinstance(r.significance, wp.SurrogateResult)
        assert isinstance(r.bootstrap, wp.BootstrapResult)
        d = r.to_dict()
        assert d["schema"] == f"wedgepath.leadlag/{report.SCHEMA_VERSION}" == "wedgepath.leadlag/3"
        json.dumps(d, allow_nan=False)              # plain JSON, no NaN
        assert d["cyclic_order"]["order"] == [names[k] for k in co.order]

    @pytest.mark.parametrize("opts", [{}, {"window": 200}, {"n_surrogates": 9},
                                      {"window": 100, "n_surrogates": 9, "n_boot": 9}])
    def test_files_are_the_planned_ones(self, opts):
        pytest.importorskip("matplotlib")
        import matplotlib.pyplot as plt
        X, names = ring()
        planned = report.leadlag_files(True, window="window" in opts,
                                       significance="n_surrogates" in opts)
        r = report.leadlag(X, names=names, progress=False, **opts)
        files = r.files(figures=True)
        assert list(files) == planned == r.planned_files(True)
        assert r.planned_files(False) == report.leadlag_files(
            False, window="window" in opts, significance="n_surrogates" in opts)
        plt.close("all")

    def test_tables_are_frames_of_the_results(self):
        X, names = ring()
        r = report.leadlag(X, names=names, n_surrogates=19, seed=1, progress=False)
        t = r.tables()
        np.testing.assert_array_equal(t["area_matrix.csv"].to_numpy(), r.matrix)
        pairs = t["pairs.csv"]
        assert len(pairs) == 6 and list(pairs.columns[2:]) == [
            "channel_i", "channel_j", "area", "normalized", "direction", "p", "q", "low", "high"]
        # strongest first, and each row's direction follows the sign of its area
        assert np.all(np.diff(pairs["area"].abs().to_numpy()) <= 0)
        for _, row in pairs.iterrows():
            assert row["direction"] == ("i leads j" if row["area"] > 0 else "j leads i")
            assert row["q"] == r.significance.qvalues[row["i"], row["j"]]

    def test_repr_is_one_short_line(self):
        X, names = ring()
        text = repr(report.leadlag(X, names=names))
        assert text.startswith("LeadLagReport(channels=4") and "\n" not in text
        assert len(text) <= 120
        pytest.importorskip("pandas")
        X, names = ring()
        html = report.leadlag(X, names=names)._repr_html_()
        assert "<table" in html and "channel_i" in html and "ch0" in html

    def test_input_forms_agree(self):
        pd = pytest.importorskip("pandas")
        X, names = ring()
        a = report.leadlag(X, names=names).matrix
        b = report.leadlag(pd.DataFrame(X, columns=names)).matrix
        c = report.leadlag(wp.Path(X, names=names)).matrix
        np.testing.assert_array_equal(a, b)
        np.testing.assert_array_equal(a, c)
        with pytest.raises(ValueError, match="names must name the 4 channels"):
            report.leadlag(X, names=["a"])
        with pytest.raises(ValueError, match="window=5000 is longer than the 400 samples"):
            report.leadlag(X, window=5000)

    def test_caller_arrays_unchanged(self):
        X, names = ring()
        X[5, 1] = np.nan
        before = X.copy()
        report.leadlag(X, names=names, n_surrogates=9, n_boot=9, window=100, progress=False)
        np.testing.assert_array_equal(X, before)


class TestLoopReport:
    def test_per_cycle_values_are_the_library_ones(self):
        t = np.linspace(0, 6 * np.pi, 301)
        xy = np.column_stack([np.cos(t), np.sin(t + 0.3)])
        r = report.loop(xy, names=["x", "y"], progress=False)
        c = wp.cycle_areas(xy, 1, 0, reference=0, cut="reversal", hysteresis="auto")              # ∮ y dx = A[1, 0]
        np.testing.assert_allclose(r.cycle_stats()[0], c.values)
        assert r.quantity == "∮ y d(x)"
        assert r.cycle_stats()[3] == pytest.approx(np.std(c.values[np.isfinite(c.values)],
                                                          ddof=1))
        d = r.to_dict()
        assert d["schema"] == "wedgepath.loop/3" and d["cycles"]["ddof"] == 1
        assert list(r.files()) == r.planned_files() == report.loop_files()

    def test_x_dy_is_the_opposite_sign(self):
        t = np.linspace(0, 6 * np.pi, 601)
        xy = np.column_stack([np.cos(t), np.sin(t)])
        a = report.loop(xy, energy="y_dx").cycle_stats()[2]
        b = report.loop(xy, energy="x_dy").cycle_stats()[2]
        assert a == pytest.approx(-b) and b == pytest.approx(np.pi, rel=1e-3)


# =========================================================================== row numbers
class TestRowNumbersCountFromOne:
    def test_gap_free_stretch_rows_in_json_and_text(self):
        X, names = ring(3, T=200)
        X[0:3, 0] = np.nan                          # data rows 1-3 (from 1) are gaps
        r = report.leadlag(X, names=names, n_surrogates=9, progress=False)
        assert r.to_dict()["significance"]["rows"] == [4, 200]
        # a gap inside: both pieces are used (pooled within pieces), rows 1 to 200
        X[0:3, 0] = X[3, 0]
        X[10:13, 0] = np.nan                        # data rows 11-13 (from 1) are gaps
        r = report.leadlag(X, names=names, n_surrogates=9, progress=False)
        assert r.to_dict()["significance"]["rows"] == [1, 200]
        assert r.to_dict()["significance"]["pieces"] == 2
        assert any("pool 2 gap-free pieces" in n for n in r.notes)

    def test_windows_and_cycles_without_times(self):
        X, names = ring(3, T=400)
        r = report.leadlag(X, names=names, window=100, step=50)
        roll = r.to_dict()["rolling"]
        assert roll["first_row"][:2] == [1, 51] and roll["last_row"][:2] == [100, 150]
        assert roll["start_time"][0] == 1.0        # without times, windows are placed by row
        t = np.linspace(0, 6 * np.pi, 301)
        xy = np.column_stack([np.cos(t), np.sin(t)])
        lr = report.loop(xy)
        c = wp.cycle_areas(xy, 1, 0, reference=0, cut="reversal", hysteresis="auto")
        np.testing.assert_allclose(lr.to_frame()["start"], c.start + 1)
        assert lr.to_dict()["cycles"]["bounds"] == "row"


# =========================================================================== text fixes
def fake_significance(n, q):
    Q = np.full((n, n), np.nan)
    iu = np.triu_indices(n, 1)
    Q[iu] = q
    Q.T[iu] = q
    return SimpleNamespace(pvalues=Q, qvalues=Q, method="shift", n_surrogates=99, seed=0)


class TestSummaryText:
    def test_q_values_to_three_significant_digits(self):
        X, names = ring(3)
        r = report.leadlag(X, names=names)
        r = dataclasses.replace(r, significance=fake_significance(3, 0.028000000000000004))
        text = "\n".join(r.summary())
        assert "q = 0.028" in text and "0.0280000" not in text

    def test_the_list_says_how_many_it_shows(self):
        X, names = ring(6)
        r = report.leadlag(X, names=names)
        r = dataclasses.replace(r, significance=fake_significance(6, 0.01))
        lines = r.summary()
        head = [k for k, line in enumerate(lines) if "false discovery rate" in line][0]
        assert lines[head].endswith("15 pairs at 5% false discovery rate; the 10 strongest:")
        listed = [line for line in lines[head + 1:] if " leads " in line and "q = " in line]
        assert len(listed) == 10
        # few pairs: all of them, no "strongest"
        r = dataclasses.replace(r, significance=fake_significance(6, [0.01] + [0.5] * 14))
        head = [line for line in r.summary() if "false discovery rate" in line][0]
        assert head.endswith("1 pair at 5% false discovery rate:")

    def test_matrix_columns_never_run_together(self):
        X, names = ring(4)
        X[:, 3] *= 1e-4
        r = report.leadlag(X, names=names, normalize="hilbert")
        lines = r.summary()
        k = [i for i, line in enumerate(lines) if "lead strength (hilbert)" in line][0]
        for line in lines[k + 2:k + 6]:
            cells = line.split()
            assert len(cells) == 5, line          # a name and four numbers
            [float(c) for c in cells[1:]]
            assert "  " in line.strip()

    def test_positions_in_radians(self):
        X, names = ring(4)
        line = [x for x in report.leadlag(X, names=names).summary() if "positions" in x][0]
        assert "(rad, 0 to 2π" in line and "deg" not in line

    def test_decomposition_wording(self):
        d = wp.decompose([[0, 0], [2, 2], [2, 0], [0, 2]])
        assert d.summary().splitlines()[-1] == \
            "NOTE: lobes of opposite sign: 100.0% of the absolute area cancels out in the net signed area"
        # a big loop with a tiny opposite lobe: nothing worth calling cancellation
        big = [[0, 0], [10, 0], [10, 10], [0, 10], [0.02, -0.02], [-0.02, -0.02]]
        d = wp.decompose(big)
        assert d.mixed_signs and d.cancellation < 1e-4
        last = d.summary().splitlines()[-1]
        assert "too small to matter" in last and "100.0%" not in last


# =========================================================================== figures
mpl = pytest.importorskip("matplotlib")


@pytest.fixture(autouse=True)
def _close_figures():
    yield
    import matplotlib.pyplot as plt
    plt.close("all")


def _no_overlap(labels):
    boxes = [t.get_window_extent() for t in labels if t.get_text()]
    for a in range(len(boxes)):
        for b in range(a + 1, len(boxes)):
            assert not boxes[a].overlaps(boxes[b]), (labels[a].get_text(), labels[b].get_text())
    return len(boxes)


class TestLeadLagFigures:
    def test_clustered_positions_never_overlap_names(self):
        from wedgepath import plotting
        n = 9
        order = SimpleNamespace(order=np.arange(n), positions=np.linspace(0, 0.05, n),
                                moduli=np.ones(n), fit=0.9,
                                names=tuple(f"a long channel name {k}" for k in range(n)))
        ax = plotting.cycle_positions(order)
        ax.figure.canvas.draw()
        assert _no_overlap(ax.get_yticklabels()) == n

    def test_positions_with_intervals_and_windows(self):
        X, names = ring(5)
        r = report.leadlag(X, names=names, window=200, n_boot=29, seed=1, progress=False)
        ax = r.figures()["positions.png"].axes[0]
        assert "[rad]" in ax.get_xlabel()
        assert [t.get_text() for t in ax.get_xticklabels()][::4] == ["0", "π", "2π"]
        assert [t.get_text() for t in ax.get_yticklabels()] == [names[k] for k in r.order.order]
        legend = [t.get_text() for t in ax.get_legend().get_texts()]
        assert "bootstrap interval (95%)" in legend and "in rolling windows" in legend
        # every channel's drawn point is its position
        pts = np.vstack([c.get_offsets() for c in ax.collections if len(c.get_offsets()) == 5
                         and c.get_sizes()[0] == 60])
        got = dict(zip(pts[:, 1].astype(int), pts[:, 0]))
        for row, ch in enumerate(r.order.order):
            assert got[row] == pytest.approx(r.order.positions[ch])

    def test_no_polar_axes_and_no_matrix_image(self):
        X, names = ring(4)
        figs = report.leadlag(X, names=names, window=200).figures()
        for fig in figs.values():
            for ax in fig.axes:
                assert ax.name != "polar" and not ax.images

    def test_pair_chart_says_raw_or_normalised(self):
        X, names = ring(4)
        raw = report.leadlag(X, names=names).figures()["pairs.png"].axes[0]
        assert "(raw)" in raw.get_xlabel()
        norm = report.leadlag(X, names=names, normalize="hilbert", window=200).figures()
        assert "normalised (hilbert)" in norm["pairs.png"].axes[0].get_xlabel()
        assert "raw areas" in norm["rolling.png"].texts[0].get_text() or \
            "raw areas" in norm["rolling.png"]._suptitle.get_text()

    def test_pair_chart_direction_and_significance(self):
        from wedgepath import plotting
        A = np.array([[0, 2.0, -1.0], [-2.0, 0, 0.5], [1.0, -0.5, 0]])
        sig = fake_significance(3, [0.01, 0.2, 0.03])       # pairs (0,1), (0,2), (1,2)
        ax = plotting.pair_chart(A, names=["a", "b", "c"], significance=sig)
        ax.figure.canvas.draw()
        rows = [t.get_text() for t in ax.get_yticklabels()]
        assert rows == ["a → b", "c → a", "b → c"]          # leader first, strongest first
        fills = [p.get_facecolor()[:3] for p in ax.patches]
        white = (1.0, 1.0, 1.0)
        assert [f == white for f in fills] == [False, True, False]   # q 0.01, 0.2, 0.03
        assert _no_overlap(ax.get_yticklabels()) == 3

    def test_rolling_small_multiples(self):
        X, names = ring(4)
        r = report.leadlag(X, names=names, window=100, step=50)
        fig = r.figures()["rolling.png"]
        panels = [ax for ax in fig.axes if ax.lines]
        assert len(panels) == 6                      # the 6 pairs of 4 channels
        ylims = {ax.get_ylim() for ax in panels}
        assert len(ylims) == 1                       # one scale: magnitudes compare
        # a pair 1000 times weaker is not flattened to a line: own scales, and it says so
        X[:, 3] *= 1e-3
        from wedgepath import plotting
        fig = plotting.rolling_pairs(report.leadlag(X, names=names, window=100, step=50).rolling)
        panels = [ax for ax in fig.axes if ax.lines]
        assert len({ax.get_ylim() for ax in panels}) > 1
        assert "own scale" in fig.get_supxlabel()


class TestLoopFigures:
    def test_cycles_band_is_ddof_one_as_in_the_text(self):
        t = np.linspace(0, 12 * np.pi, 1201)
        rng = np.random.default_rng(3)
        xy = np.column_stack([np.cos(t), np.sin(t + 0.4)]) + 0.01 * rng.normal(size=(1201, 2))
        r = report.loop(xy, names=["strain", "stress"])
        values, count, mean, std = r.cycle_stats()
        assert std == pytest.approx(np.std(values[np.isfinite(values)], ddof=1))
        ax = r.figures()["cycles.png"].axes[0]
        band = [p for p in ax.patches if p.get_label().startswith("±1 std")][0]
        y = band.get_path().vertices[:, 1] if hasattr(band, "get_path") else None
        ys = band.get_transform().transform(band.get_path().vertices)[:, 1]
        lo, hi = ax.transData.inverted().transform([[0, ys.min()], [0, ys.max()]])[:, 1]
        assert (lo, hi) == pytest.approx((mean - std, mean + std), rel=1e-9)
        label = band.get_label()
        assert f"std {std:.3g} (ddof=1)" in label and f"std {std:.3g} (ddof=1)" in r.text()
        assert f"mean {mean:.6g}" in [t.get_text() for t in ax.get_legend().get_texts()][1]
        assert f"mean {mean:.6g}" in r.text()
        assert y is not None

    def test_loop_traced_twelve_times_is_readable(self):
        t = np.linspace(0, 24 * np.pi, 2401)
        rng = np.random.default_rng(0)
        xy = np.column_stack([np.sin(t), np.sin(t - 0.5)]) + 0.003 * rng.normal(size=(2401, 2))
        r = report.loop(xy, names=["x", "y"])
        assert r.cycles.count >= 11
        assert not r.faces_informative()            # nested windings repeat the outline
        fig = r.figures()["loop.png"]
        left, right = fig.axes[0], fig.axes[1]
        assert "clockwise" in left.get_title(loc="left")
        assert "per cycle" in right.get_title(loc="left")
        shades = np.unique(left.collections[-1].get_array())
        assert shades.size == r.cycles.count             # one shade per cycle
        cbar = [ax for ax in fig.axes if ax.get_ylabel() == "cycle"]
        assert cbar, "a colour bar says the shade is the cycle"
        arrows = [a for a in left.texts if getattr(a, "arrow_patch", None) is not None]
        assert len(arrows) >= 4                          # the direction of travel

    def test_detrended_curve_never_on_the_raw_axes(self):
        t = np.linspace(0, 2 * np.pi, 801)
        drift = np.linspace(0, 3.0, 801)
        xy = np.column_stack([np.sin(t), np.sin(2 * t) + drift])     # a figure-eight, drifting
        r = report.loop(xy, names=["x", "y"], closure="detrend")
        assert r.faces_informative()
        fig = r.figures()["loop.png"]
        left, right = fig.axes[0], [ax for ax in fig.axes[1:] if ax.get_title(loc="left")][0]
        raw_segments = {tuple(np.round(s.ravel(), 12)) for s in np.stack([xy[:-1], xy[1:]], 1)}
        for coll in left.collections:
            for seg in getattr(coll, "get_segments", lambda: [])():
                assert tuple(np.round(np.asarray(seg).ravel(), 12)) in raw_segments
        # the raw axes show all of the raw data (nothing clipped)
        assert left.get_ylim()[0] <= xy[:, 1].min() and left.get_ylim()[1] >= xy[:, 1].max()
        # the faces are those of the detrended curve, on axes of their own that say so
        assert "closure=detrend" in right.get_title(loc="left")
        assert not right.lines and all(not hasattr(c, "get_segments") or
                                       type(c).__name__ != "LineCollection"
                                       for c in right.collections)

    def test_faces_shown_for_a_figure_eight(self):
        t = np.linspace(0, 2 * np.pi, 401)
        r = report.loop(np.column_stack([np.sin(t), np.sin(2 * t)]), names=["x", "y"])
        right = r.figures()["loop.png"].axes[-1]
        titles = [ax.get_title(loc="left") for ax in r.figures()["loop.png"].axes]
        assert any("Faces by winding number" in s for s in titles), titles
        assert right is not None

    def test_names_are_drawn_literally(self):
        t = np.linspace(0, 6 * np.pi, 301)
        xy = np.column_stack([np.cos(t), np.sin(t)])
        r = report.loop(xy, names=["cost_$_total", "price_$"], units={"price_$": "$/kg"})
        from matplotlib import cbook
        for fig in r.figures().values():
            fig.canvas.draw()
            for ax in fig.axes:
                for text in (ax.get_xlabel(), ax.get_ylabel(), ax.get_title(loc="left")):
                    assert not cbook.is_math_text(text), text


# =========================================================================== lazy module
def test_plotting_and_report_load_lazily():
    code = ("import sys, wedgepath as wp\n"
            "assert 'matplotlib' not in sys.modules and 'pandas' not in sys.modules\n"
            "f = wp.plotting.cycle_positions\n"
            "r = wp.report.leadlag([[0, 1], [1, 0], [0, -1.0]])\n"
            "print('matplotlib' in sys.modules, 'pandas' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         check=True).stdout.split()
    assert out == ["False", "False"]
