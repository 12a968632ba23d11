"""Engineering loops (issue 18): per-cycle energy, stiffness and damping, units, segmentation
that survives gaps, noise and drift, rainflow counting, loop families.

Each check against an outside fact names its source beside it.
"""

import warnings

import numpy as np
import pandas as pd
import pytest

import wedgepath as wp
from wedgepath.signals.segment import CycleLengthWarning


# --------------------------------------------------------------------------- helpers
def kelvin_voigt(k, c, w, u0, cycles, per_cycle, phase=0.0):
    """F = k u + c du/dt under u = u0 sin(w t + phase)."""
    t = np.arange(cycles * per_cycle + 1) * (2 * np.pi / w) / per_cycle
    u = u0 * np.sin(w * t + phase)
    F = k * u + c * w * u0 * np.cos(w * t + phase)
    return t, u, F


def triangle_wave(u0, h, cycles):
    """Displacement history 0 -> u0 -> -u0 -> u0 ... -> -u0 in steps of h (exactly on the corners)."""
    n = int(round(u0 / h))
    up = np.arange(0, n + 1) * h                           # 0 .. u0
    down = u0 - np.arange(1, 2 * n + 1) * h               # u0 .. -u0
    rise = -u0 + np.arange(1, 2 * n + 1) * h              # -u0 .. u0
    parts = [up] + [down, rise] * cycles + [down]
    return np.concatenate(parts)


def elastoplastic(u, k, fy):
    """Elastic-perfectly-plastic spring (return mapping); exact for a piecewise-linear drive
    whose yield points fall on samples."""
    f = np.empty_like(u)
    f[0] = k * u[0]
    for i in range(1, u.size):
        f[i] = np.clip(f[i - 1] + k * (u[i] - u[i - 1]), -fy, fy)
    return f


# --------------------------------------------------------------------------- checks against texts
class TestOutsideFacts:
    def test_kelvin_voigt_energy_and_damping(self):
        # Kelvin-Voigt element f = k u + c du/dt under u = u0 sin(w t):
        # E_D = pi c w u0^2 and zeta_eq = c w / (2 k)
        # (A. K. Chopra, Dynamics of Structures, section "Equivalent viscous damping").
        k, c, w, u0 = 40.0, 1.5, 2.0, 3.0
        t, u, F = kelvin_voigt(k, c, w, u0, cycles=6, per_cycle=4000)
        r = wp.loop_cycles(np.column_stack([u, F]), kind="force-displacement", times=t)
        # the record starts at u = 0 rising: valleys at 3/4, 7/4, ... 23/4 periods
        assert r.count == 5 and r.status[0] == "partial-start" and r.status[-1] == "partial-end"
        ok = r.complete
        assert np.allclose(r.energy[ok], np.pi * c * w * u0 ** 2, rtol=1e-6)
        assert np.allclose(r.damping_ratio[ok], c * w / (2 * k), rtol=1e-6)
        assert np.allclose(r.loss_factor[ok], 2 * r.damping_ratio[ok], rtol=1e-12)
        # the secant through the loop's tips is the spring (du/dt = 0 there) ...
        assert np.allclose(r.stiffness[ok], k, rtol=1e-6)
        # ... while the peak force is larger: sqrt(k^2 + (c w)^2) u0
        assert np.allclose(r.y_max[ok], np.hypot(k, c * w) * u0, rtol=1e-6)
        assert np.allclose(r.x_max[ok], u0) and np.allclose(r.x_min[ok], -u0)

    def test_elastic_perfectly_plastic_energy_and_damping(self):
        # Elastic-perfectly-plastic system, yield displacement u_y, ductility mu = u0 / u_y:
        # E_D = 4 f_y (u0 - u_y), zeta_eq = 2 (mu - 1) / (pi mu)
        # (A. K. Chopra, Dynamics of Structures, equivalent viscous damping of
        # elastoplastic systems).  The drive is piecewise linear with yield points on
        # samples, so the sampled loop is the exact parallelogram.
        k, fy, u0 = 20.0, 30.0, 4.5                       # u_y = 1.5, mu = 3
        uy, mu = fy / k, u0 / (fy / k)
        u = triangle_wave(u0, 0.05, cycles=4)
        F = elastoplastic(u, k, fy)
        r = wp.loop_cycles({"u": u, "F": F}, "u", "F", kind="force-displacement")
        assert r.count == 3
        ok = r.complete
        assert np.allclose(r.energy[ok], 4 * fy * (u0 - uy), rtol=1e-12)
        assert np.allclose(r.damping_ratio[ok], 2 * (mu - 1) / (np.pi * mu), rtol=1e-12)
        assert np.allclose(r.stiffness[ok], fy / u0, rtol=1e-12)
        assert np.allclose(r.strain_energy[ok], fy * u0 / 2, rtol=1e-12)

    def test_rayleigh_loop_core_loss(self):
        # Rayleigh loop of a magnetic material at low field, peak field H_m:
        # B = mu0 [(mu_i + eta H_m) H -+ (eta / 2)(H_m^2 - H^2)] (lower branch rising);
        # loss per cycle per unit volume ∮ H dB = (4/3) mu0 eta H_m^3
        # (D. Jiles, Introduction to Magnetism and Magnetic Materials, Rayleigh law;
        # from memory).
        mu0, mui, eta, Hm = 4e-7 * np.pi, 250.0, 30.0, 40.0           # SI: H in A/m
        s = np.linspace(-1, 1, 4001)[:-1]
        H_up, H_dn = Hm * s, -Hm * s
        B_up = mu0 * ((mui + eta * Hm) * H_up - eta / 2 * (Hm ** 2 - H_up ** 2))
        B_dn = mu0 * ((mui + eta * Hm) * H_dn + eta / 2 * (Hm ** 2 - H_dn ** 2))
        # five loops, read from H = 0 rising (sample 2000) to the fifth loop's start
        H = np.tile(np.concatenate([H_up, H_dn]), 5)[2000:34001]
        B = np.tile(np.concatenate([B_up, B_dn]), 5)[2000:34001]
        r = wp.loop_cycles({"H": H, "B": B}, "H", "B", kind="B-H", units={"H": "A/m", "B": "T"})
        assert r.count == 3 and r.column_units["energy"] == "J/m^3"
        assert np.allclose(r.energy[r.complete], 4 / 3 * mu0 * eta * Hm ** 3, rtol=1e-6)
        assert r.energy[r.complete].min() > 0                    # counter-clockwise: loss > 0
        assert "stiffness" not in r.to_frame().columns           # not a B-H quantity

    def test_second_order_convergence_and_faster_spline(self):
        # Sampled Kelvin-Voigt loop, N samples per cycle: the chord polygon's E_D has
        # relative error 1 - (N / 2pi) sin(2pi / N) ~ (2 pi^2 / 3) / N^2 (second order in
        # the spacing; trapezoid rule on a periodic integrand, common practice, no source);
        # the periodic cubic spline converges faster (fourth order for smooth data).
        k, c, w, u0 = 10.0, 0.8, 1.0, 2.0
        exact = np.pi * c * w * u0 ** 2
        errs = {"linear": [], "spline": []}
        Ns = [16, 32, 64, 128]
        for N in Ns:
            t, u, F = kelvin_voigt(k, c, w, u0, cycles=1, per_cycle=N, phase=-np.pi / 2)
            X = np.column_stack([u, F])
            for curve in errs:
                r = wp.loop_cycles(X, boundaries=[0, N], curve=curve, times=t)
                errs[curve].append(abs(r.energy[0] - exact) / exact)
        lin, spl = np.array(errs["linear"]), np.array(errs["spline"])
        order_lin = np.log2(lin[:-1] / lin[1:])
        order_spl = np.log2(spl[:-1] / spl[1:])
        assert np.allclose(order_lin, 2.0, atol=0.05), order_lin
        assert np.allclose(lin, 1 - np.array(Ns) / (2 * np.pi) * np.sin(2 * np.pi / np.array(Ns)),
                           rtol=1e-9)
        assert (order_spl > 3.5).all(), order_spl
        assert (spl < lin / 50).all()


# --------------------------------------------------------------------------- sign and families
class TestSignAndFamilies:
    def test_energy_is_integral_of_y_dx_and_minus_the_area(self):
        t, u, F = kelvin_voigt(5.0, 0.5, 1.0, 1.0, cycles=3, per_cycle=200)
        df = pd.DataFrame({"disp": u, "force": F})
        r = wp.loop_cycles(df, "disp", "force")
        assert r.quantity == "∮ force d(disp)" and "clockwise" in r.sign
        # the dissipating loop runs clockwise: signed (counter-clockwise) area < 0
        assert r.mean > 0 and wp.signed_area(df.to_numpy()) < 0
        # the same cycles through cycle_areas: ∮ force d(disp) is cycle_areas(X, y, x)
        ca = wp.cycle_areas(df, "force", "disp", reference="disp", cut="reversal",
                            hysteresis="auto")
        assert np.array_equal(ca.start, r.start) and np.array_equal(ca.stop, r.stop)
        assert np.allclose(ca.values[ca.complete], r.energy[r.complete], rtol=1e-13)

    @pytest.mark.parametrize("kind", ["force-displacement", "stress-strain", "p-V"])
    def test_clockwise_families_positive(self, kind):
        t, u, F = kelvin_voigt(5.0, 0.5, 1.0, 1.0, cycles=3, per_cycle=200)
        r = wp.loop_cycles(np.column_stack([u, F]), kind=kind)
        assert (r.energy[r.complete] > 0).all()
        # reversed traversal (an engine run backwards, a loop read the wrong way) is negative
        rr = wp.loop_cycles(np.column_stack([u[::-1], F[::-1]]), kind=kind)
        assert (rr.energy[rr.complete] < 0).all()

    def test_kind_b_h_uses_h_db(self):
        # a counter-clockwise loop (B lags H): ∮ H dB > 0, while ∮ B dH < 0
        th = np.linspace(0, 6 * np.pi, 601)
        H, B = np.cos(th), np.cos(th - 0.4)          # rises after H: counter-clockwise
        X = np.column_stack([H, B])
        bh = wp.loop_cycles(X, kind="B-H")
        gen = wp.loop_cycles(X)
        assert (bh.energy[bh.complete] > 0).all() and "∮ H dB" in bh.quantity
        assert np.allclose(bh.energy[bh.complete], -gen.energy[gen.complete], rtol=1e-12)

    def test_frame_and_describe(self):
        t, u, F = kelvin_voigt(5.0, 0.5, 1.0, 1.0, cycles=4, per_cycle=100)
        r = wp.loop_cycles(np.column_stack([u, F]), times=t, units={"x": "mm", "y": "kN"})
        fr = r.to_frame()
        assert list(fr.columns) == ["cycle", "start", "stop", "start_time", "stop_time",
                                    "status", "complete", "energy", "x_min", "x_max", "y_min",
                                    "y_max", "y_at_x_min", "y_at_x_max", "stiffness",
                                    "strain_energy", "damping_ratio", "loss_factor"]
        d = r.describe()
        row = d.set_index("quantity").loc["energy"]
        assert row["unit"] == "J" and row["cycles"] == r.count
        assert row["mean"] == pytest.approx(r.mean) and row["std"] == pytest.approx(r.std)
        assert "LoopCycles(" in repr(r) and "\n" not in repr(r)
        assert np.asarray(r).shape == (len(r),)
        with pytest.raises(ValueError):
            np.asarray(r)[0] = 1.0                     # read-only


# --------------------------------------------------------------------------- units
class TestUnits:
    def _loop(self):
        t, u, F = kelvin_voigt(5.0, 0.5, 1.0, 2.0, cycles=3, per_cycle=400)
        return np.column_stack([u, F])

    def test_force_displacement_conversions(self):
        X = self._loop()
        raw = wp.loop_cycles(X)
        ok = raw.complete
        # kN x mm = N x m = J exactly
        r = wp.loop_cycles(X, kind="force-displacement", units={"x": "mm", "y": "kN"})
        assert r.column_units["energy"] == "J" and r.column_units["stiffness"] == "kN/mm"
        assert np.allclose(r.energy[ok], raw.energy[ok], rtol=1e-14)
        assert np.allclose(r.stiffness[ok], raw.stiffness[ok], rtol=1e-14)   # kept in kN/mm
        # lbf x in = 4.4482216152605 N x 0.0254 m = 0.112984829027617 J (exact by the
        # definitions of the pound-force and the inch; NIST SP 811, appendix B, from memory)
        r2 = wp.loop_cycles(X, kind="force-displacement", units={"x": "in", "y": "lbf"})
        assert np.allclose(r2.energy[ok], raw.energy[ok] * 0.112984829027617, rtol=1e-12)
        # the dimensionless ratios do not depend on the units
        assert np.allclose(r2.damping_ratio[ok], raw.damping_ratio[ok], rtol=1e-12)

    def test_density_and_indicator_units(self):
        X = self._loop() * [1e-3, 1.0]               # strain (mm/mm) and stress (MPa)
        raw = wp.loop_cycles(X)
        ok = raw.complete
        # MPa x 1 = 1e6 J/m^3: values of about 1e-2 MPa read better as kJ/m^3 (x 1e3)
        r = wp.loop_cycles(X, kind="stress-strain", units={"x": "mm/mm", "y": "MPa"})
        assert r.column_units["energy"] == "kJ/m^3" and r.column_units["stiffness"] == "MPa"
        assert np.allclose(r.energy[ok], raw.energy[ok] * 1e3, rtol=1e-12)
        # p-V: bar x L = 1e5 Pa x 1e-3 m^3 = 100 J
        raw = wp.loop_cycles(self._loop())
        pv = wp.loop_cycles(self._loop(), kind="p-V", units={"x": "L", "y": "bar"})
        # about 6 bar L = 600 J per cycle: shown in J (kJ would read 0.6)
        assert pv.column_units["energy"] == "J"
        assert np.allclose(pv.energy[ok], raw.energy[ok] * 100.0, rtol=1e-12)
        big = wp.loop_cycles(self._loop(), kind="p-V", units={"x": "m^3", "y": "bar"})
        assert big.column_units["energy"] == "kJ"                 # 6e5 J reads as 628 kJ
        assert np.allclose(big.energy[ok], raw.energy[ok] * 100.0, rtol=1e-12)

    def test_units_from_dataframe_attrs_and_channel_names(self):
        X = self._loop()
        df = pd.DataFrame({"d": X[:, 0], "f": X[:, 1]})
        df.attrs["units"] = {"d": "m", "f": "N"}
        r = wp.loop_cycles(df, "d", "f", kind="force-displacement")
        assert r.column_units["energy"] == "J" and dict(r.units) == {"d": "m", "f": "N"}
        r2 = wp.loop_cycles(X, units={"0": "m", "1": "N"})
        assert r2.column_units["energy"] == "J"

    def test_unit_errors(self):
        X = self._loop()
        with pytest.raises(ValueError, match="unknown unit 'furlongz' for x"):
            wp.loop_cycles(X, units={"x": "furlongz", "y": "kN"})
        with pytest.raises(ValueError, match="unknown unit"):
            wp.loop_cycles(X, units={"x": "__import__('os')", "y": "kN"})
        with pytest.raises(ValueError, match="do not give J as a force-displacement loop needs"):
            wp.loop_cycles(X, kind="force-displacement", units={"x": "s", "y": "kN"})
        with pytest.raises(ValueError, match="missing: '1'"):
            wp.loop_cycles(X, units={"x": "mm"})
        with pytest.raises(ValueError, match="neither the x channel"):
            wp.loop_cycles(X, units={"z": "mm"})
        with pytest.raises(ValueError, match="unknown kind"):
            wp.loop_cycles(X, kind="torque-twist")


# --------------------------------------------------------------------------- segmentation
def weekly_series(seed=7):
    """An invented weekly record: a reservoir's stored volume and its inflow over 30 years,
    with a yearly cycle, slow drift and weather noise; 59 weekly rows are missing (rows are
    absent from the table, so only the time stamps show the gaps)."""
    rng = np.random.default_rng(seed)
    weeks = np.arange(30 * 52)
    t = weeks * 7.0                                          # days
    year = 365.25
    phase = 2 * np.pi * t / year
    inflow = 40 * np.sin(phase) + 4 * rng.standard_normal(t.size)
    volume = 300 + 0.004 * t - 60 * np.cos(phase) + 3 * rng.standard_normal(t.size)
    # outages of 14, 20 and 10 weeks, and 15 single weeks lost in four of the years
    singles = np.concatenate([5 * 52 + np.array([3, 9, 30, 31]), 12 * 52 + np.array([1, 40]),
                              21 * 52 + np.array([10, 11, 12, 25, 26]),
                              26 * 52 + np.array([7, 20, 33, 46])])
    missing = np.concatenate([np.arange(150, 164), np.arange(820, 840), np.arange(1200, 1210),
                              singles])
    missing = np.unique(missing)
    assert missing.size == 59
    keep = np.setdiff1d(weeks, missing)
    return t[keep], volume[keep], inflow[keep]


class TestSegmentation:
    def test_weekly_series_with_missing_rows(self):
        t, vol, inflow = weekly_series()
        df = pd.DataFrame({"volume": vol, "inflow": inflow})
        r = wp.loop_cycles(df, "volume", "inflow", times=t)
        assert r.gaps == 14                     # every run of missing rows (3 outages, 11 runs)
        steps = np.diff(t)
        for s, e, st in zip(r.start, r.stop, r.status):
            inside = steps[int(s):int(e)]
            if st == "complete":
                # a complete cycle never spans a gap ...
                assert inside.max() == 7.0
            else:
                assert st in ("partial-start", "partial-end", "partial-gap")
        done = r.complete
        length = r.stop_time[done] - r.start_time[done]
        # ... and is one year long (valley to valley of the volume), within weather jitter
        assert np.all(np.abs(length - 365.25) < 60), length
        assert not np.isnan(r.energy[done]).any() and np.isnan(r.energy[~done]).all()
        # the partial pieces are listed separately, each with the reason
        assert {"partial-start", "partial-end", "partial-gap"} >= set(r.status[~done])
        assert (r.status == "partial-gap").sum() >= 2

    def test_a_gap_shorter_than_every_step_is_refused(self):
        # gap=0.001 on 0.005 s steps made every step a gap: 0 cycles and no word why (trial)
        t = np.arange(2000) * 0.005
        X = np.column_stack([np.sin(2 * np.pi * t), np.sin(2 * np.pi * t - 0.5)])
        with pytest.raises(ValueError, match="shorter than every time step"):
            wp.loop_cycles(X, 0, 1, times=t, gap=0.001)
        with pytest.raises(ValueError, match="shorter than every time step"):
            wp.cycle_areas(X, 0, 1, times=t, gap=0.001)
        assert wp.loop_cycles(X, 0, 1, times=t, gap=0.006).count == 9

    def test_old_crossing_default_spans_gaps_new_does_not(self):
        # the crossing cut without gap detection (gap=None: only NaN rows are gaps) joins
        # weeks across missing rows -- the behaviour the default now avoids
        t, vol, inflow = weekly_series()
        X = np.column_stack([vol, inflow])
        # no band: the weather noise also makes 'cycles' of a few weeks (and says so)
        with pytest.warns(CycleLengthWarning):
            old = wp.cycle_areas(X, 0, 1, times=t, gap=None)
        steps = np.diff(t)
        spans = [steps[int(np.floor(s)):int(np.ceil(e))].max() > 7
                 for s, e, ok in zip(old.start, old.stop, old.complete) if ok]
        assert any(spans)
        with pytest.warns(CycleLengthWarning):
            new = wp.cycle_areas(X, 0, 1, times=t)
        spans = [steps[int(np.floor(s)):int(np.ceil(e))].max() > 7
                 for s, e, ok in zip(new.start, new.stop, new.complete) if ok]
        assert not any(spans)

    def test_drifting_noisy_index_keeps_every_cycle(self):
        # an invented yearly index with drift and cycles of varying strength: the mean
        # level is crossed by only a few of them, while reversals find every one
        rng = np.random.default_rng(3)
        t = np.arange(0, 220.0)                                # years
        amp = 1.0 + 0.6 * np.sin(2 * np.pi * t / 97)
        clean = 0.05 * t + amp * np.sin(2 * np.pi * t / 11.0)
        y = amp * np.cos(2 * np.pi * t / 11.0)
        noise = rng.standard_normal(t.size)
        X = np.column_stack([clean + 0.05 * noise, y])
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", CycleLengthWarning)
            crossing = wp.cycle_areas(X, 0, 1, times=t)
        with warnings.catch_warnings():
            warnings.simplefilter("error", CycleLengthWarning)
            r = wp.loop_cycles(X, times=t)
        assert crossing.count < 10
        # 20 periods from t = 0 (rising): valleys at 8.25 + 11 m, m = 0..19: 19 whole cycles
        assert r.count == 19
        L = r.stop_time[r.complete] - r.start_time[r.complete]
        assert np.all(np.abs(L - 11.0) < 2.5)
        assert r.hysteresis == pytest.approx(8 * r.noise) and 0.04 < r.noise < 0.065
        # with more noise the weakest cycle (a fall of about 6 noise deviations against the
        # drift) is merged into its neighbour by the default band -- and a warning says so
        with pytest.warns(CycleLengthWarning, match="merged"):
            merged = wp.loop_cycles(np.column_stack([clean + 0.08 * noise, y]), times=t)
        assert merged.count < 19

    def test_noise_band_from_the_data(self):
        rng = np.random.default_rng(11)
        t = np.arange(6000) * 2 * np.pi / 300
        x = np.sin(t) + 0.05 * rng.standard_normal(t.size)
        y = np.cos(t)
        r = wp.loop_cycles(np.column_stack([x, y]))
        # 20 periods, record starts at a mean crossing: 20 valleys, 19 whole cycles
        assert r.count == 19
        assert r.noise == pytest.approx(0.05, rel=0.1)
        # no band: noise reversals cut dozens of tiny 'cycles', and a warning says so
        with pytest.warns(CycleLengthWarning):
            raw = wp.loop_cycles(np.column_stack([x, y]), hysteresis=0.0)
        assert raw.count > 100

    def test_irregular_logging(self):
        # random logging instants: uneven steps are not gaps and not noise; a real outage
        # (a missing stretch of one and a half periods) is a gap
        rng = np.random.default_rng(8)
        t = np.sort(rng.uniform(0, 8 * 2 * np.pi, 3200))
        t = t[(t < 20.0) | (t > 29.5)]
        u, F = np.sin(t), np.sin(t) + 0.3 * np.cos(t)
        r = wp.loop_cycles(np.column_stack([u, F]), times=t)
        assert r.gaps == 1 and r.noise < 1e-3
        assert (r.status == "partial-gap").sum() == 2 and r.count == 5
        assert np.allclose(r.energy[r.complete], 0.3 * np.pi, rtol=1e-3)

    def test_nan_rows_are_gaps(self):
        t, u, F = kelvin_voigt(5.0, 0.5, 1.0, 1.0, cycles=6, per_cycle=100)
        X = np.column_stack([u, F])
        X[250] = np.nan
        r = wp.loop_cycles(X)
        assert r.count == 4 and r.gaps == 1
        gap_rows = np.flatnonzero(r.status == "partial-gap")
        assert r.stop[gap_rows[0]] == 249 and r.start[gap_rows[1]] == 251

    def test_argument_errors(self):
        t, u, F = kelvin_voigt(5.0, 0.5, 1.0, 1.0, cycles=2, per_cycle=50)
        X = np.column_stack([u, F])
        with pytest.raises(ValueError, match="unknown cut"):
            wp.loop_cycles(X, cut="zero")
        with pytest.raises(ValueError, match="level applies to cut='crossing'"):
            wp.loop_cycles(X, level=0.0)
        with pytest.raises(TypeError, match="hysteresis must be a real number"):
            wp.loop_cycles(X, hysteresis="big")
        with pytest.raises(TypeError, match="gap must be"):
            wp.loop_cycles(X, times=t, gap="week")
        with pytest.raises(ValueError, match="gap must be a positive"):
            wp.loop_cycles(X, times=t, gap=-1.0)
        with pytest.raises(ValueError, match="different channels"):
            wp.loop_cycles(X, 0, 0)
        with pytest.raises(ValueError, match="whole-sample"):
            wp.loop_cycles(X, boundaries=[0.5, 50.5], curve="spline")
        before = X.copy()
        wp.loop_cycles(X, times=t)
        assert np.array_equal(X, before)                       # input untouched


# --------------------------------------------------------------------------- rainflow
class TestRainflow:
    def test_astm_e1049_worked_example(self):
        # ASTM E1049-85 (Reapproved 2017), section 5.4.4 "Rainflow Counting", its worked
        # example: the load history of peaks and valleys A..I = -2, 1, -3, 5, -1, 3, -4, 4, -2
        # and its table of results (range: counts) 10: 0, 9: 0.5, 8: 1.0, 7: 0, 6: 0.5,
        # 5: 0, 4: 1.5, 3: 0.5 -- typed from memory of the standard's example, not from a
        # copy at hand; the table also follows from applying the rules of 5.4.4 by hand.
        history = [-2, 1, -3, 5, -1, 3, -4, 4, -2]
        table = {10: 0.0, 9: 0.5, 8: 1.0, 7: 0.0, 6: 0.5, 5: 0.0, 4: 1.5, 3: 0.5}
        fr = wp.rainflow(history).to_frame()
        got = fr.groupby("range")["count"].sum()
        for rng, cnt in table.items():
            assert got.get(float(rng), 0.0) == cnt, rng
        assert fr["count"].sum() == sum(table.values())
        assert list(fr.columns[:5]) == ["range", "mean", "count", "start", "end"]
        # the events the standard names: A-B (3, half), E-F (4, full), D-G (9, half)
        rows = {(int(s), int(e)): c for s, e, c in zip(fr["start"], fr["end"], fr["count"])}
        assert rows[(0, 1)] == 0.5 and rows[(4, 5)] == 1.0 and rows[(3, 6)] == 0.5

    def test_friction_sub_loops_and_accounting(self):
        # spring k with a friction element h (F = k u + h sign(du/dt)): a closed cycle of
        # range R dissipates 2 h R (rectangle of height 2h and width R; elementary).
        # An irregular history of displacement reversals, linear between them.
        rng = np.random.default_rng(5)
        rev = np.cumsum(rng.uniform(0.5, 3.0, 40) * np.where(np.arange(40) % 2, -1, 1))
        k, h = 2.0, 0.7
        u_list, F_list = [], []
        for a, b in zip(rev[:-1], rev[1:]):
            s = np.linspace(a, b, 9)
            u_list.append(s)
            F_list.append(k * s + h * np.sign(b - a))           # force jumps at reversals
        u, F = np.concatenate(u_list), np.concatenate(F_list)
        r = wp.rainflow(np.column_stack([u, F]), x=0, y=1)
        closed = r.count == 1.0
        assert closed.sum() >= 5
        assert np.allclose(r.energy[closed], 2 * h * r.range[closed], rtol=1e-12, atol=1e-12)
        # total = closed cycles + residue, and the total is ∫ F du along the record
        total = float(wp.integrate(wp.OneForm([lambda p: p[:, 1], 0.0]), wp.Path(u_F := np.column_stack([u, F]))))
        assert r.total_energy == pytest.approx(total, rel=1e-12)
        assert r.energy[closed].sum() + r.residue_energy == pytest.approx(total, rel=1e-12)
        assert u_F.shape == (u.size, 2)
        # counting the displacement alone gives the same cycles
        r1 = wp.rainflow(u)
        assert np.array_equal(r1.range, r.range) and np.array_equal(r1.count, r.count)

    def test_band_gaps_and_errors(self):
        x = np.array([0.0, 5.0, 4.9, 5.2, -5.0, 0.0])
        assert wp.rainflow(x).cycles > wp.rainflow(x, hysteresis=0.5).cycles
        xg = np.concatenate([x, [np.nan], x])
        r = wp.rainflow(xg)
        # each piece is counted on its own: no cycle spans the NaN row
        assert not ((r.start < 6) & (r.end > 6)).any()
        assert r.cycles == 2 * wp.rainflow(x).cycles
        with pytest.raises(ValueError, match="1-D"):
            wp.rainflow(x, x=0)
        with pytest.raises(ValueError, match="hysteresis"):
            wp.rainflow(x, hysteresis=-1)
        with pytest.raises(ValueError, match="different channels"):
            wp.rainflow(np.column_stack([x, x]), x=0, y=0)


def test_cautions_are_stated():
    from wedgepath.signals import loops

    assert "codes" in loops.CAUTION and "engineers" in loops.CAUTION
    assert "codes" in loops.__doc__


# --------------------------------------------------------------------------- command line
class TestCommandLine:
    def _damper_csv(self, tmp_path):
        t, u, F = kelvin_voigt(50.0, 2.0, np.pi, 4.0, cycles=5, per_cycle=400)
        f = tmp_path / "damper.csv"
        pd.DataFrame({"t_s": t, "disp": u, "force": F}).to_csv(f, index=False)
        return f, t, u, F

    def test_loop_reports_the_api_numbers_with_units(self, tmp_path, capsys):
        import json

        from wedgepath import cli

        f, t, u, F = self._damper_csv(tmp_path)
        code = cli.main(["loop", str(f), "--x", "disp", "--y", "force", "--time", "t_s",
                         "--kind", "force-displacement", "--units", "x=mm,y=kN", "--quiet",
                         "--json"])
        out = json.loads(capsys.readouterr().out)
        assert code == 0
        api = wp.loop_cycles(pd.DataFrame({"disp": u, "force": F}), "disp", "force",
                             kind="force-displacement", units={"x": "mm", "y": "kN"}, times=t)
        eng = out["engineering"]
        assert eng["column_units"]["energy"] == "J" and eng["column_units"]["stiffness"] == "kN/mm"
        got = np.array(eng["per_cycle"]["energy"], dtype=float)
        assert np.array_equal(np.isnan(got), np.isnan(api.energy))
        assert np.allclose(got[api.complete], api.energy[api.complete], rtol=1e-13)
        # Chopra's closed forms (see TestOutsideFacts): pi c w u0^2 and c w / (2k)
        assert eng["complete_cycles"]["energy"]["mean"] == pytest.approx(
            np.pi * 2.0 * np.pi * 16.0, rel=1e-4)
        assert eng["complete_cycles"]["damping_ratio"]["mean"] == pytest.approx(
            2.0 * np.pi / 100.0, rel=1e-4)
        assert "codes" in eng["caution"]

    def test_summary_states_cycles_partials_and_caution(self, tmp_path, capsys):
        from wedgepath import cli

        f, *_ = self._damper_csv(tmp_path)
        out_dir = tmp_path / "out"
        code = cli.main(["loop", str(f), "--x", "disp", "--y", "force", "--time", "t_s",
                         "--kind", "force-displacement", "--units", "disp=mm,force=kN",
                         "--out", str(out_dir), "--no-figures"])
        text = capsys.readouterr().out
        assert code == 0
        assert "cycles (valleys of disp, band" in text and "4 complete" in text
        assert "1 at the start, 1 at the end" in text
        assert "equivalent viscous damping ratio zeta_eq" in text and " J (std" in text
        assert "caution:" in text and "licensed" in text
        frame = pd.read_csv(out_dir / "cycles.csv")
        assert frame["status"].tolist() == ["partial-start"] + ["complete"] * 4 + ["partial-end"]
        assert frame.loc[frame["complete"], "energy"].notna().all()
        assert frame.loc[~frame["complete"], "energy"].isna().all()

    def test_units_pint_does_not_know_label_only_without_a_kind(self, tmp_path, capsys):
        from wedgepath import cli

        f, *_ = self._damper_csv(tmp_path)
        code = cli.main(["loop", str(f), "--x", "disp", "--y", "force", "--units",
                         "x=furlongz,y=kN", "--quiet"])
        text = capsys.readouterr().out
        assert code == 0
        assert "note: unknown unit 'furlongz' for x (disp)" in text
        assert "the engineering quantities are in the data's own units" in text

    def test_weekly_series_with_gaps_through_the_command_line(self, tmp_path, capsys):
        from wedgepath import cli

        t, vol, inflow = weekly_series()
        f = tmp_path / "reservoir.csv"
        pd.DataFrame({"day": t, "volume": vol, "inflow": inflow}).to_csv(f, index=False)
        out_dir = tmp_path / "out"
        code = cli.main(["loop", str(f), "--x", "volume", "--y", "inflow", "--time", "day",
                         "--out", str(out_dir), "--no-figures"])
        text = capsys.readouterr().out
        assert code == 0
        frame = pd.read_csv(out_dir / "cycles.csv")
        done = frame[frame["complete"]]
        # only whole cycles are complete: none spans a missing week, all about a year long
        steps = np.diff(t)
        for s, e in zip(np.searchsorted(t, done["start"]), np.searchsorted(t, done["stop"])):
            assert steps[s:e].max() == 7.0
        assert ((done["stop"] - done["start"]) - 365.25).abs().max() < 60
        # the rest is flagged, with its reason, and said in the summary
        assert set(frame.loc[~frame["complete"], "status"]) <= {"partial-start", "partial-end",
                                                                "partial-gap"}
        assert f"{len(done)} complete" in text and "next to a gap" in text
        assert "14 gaps in the record" in text

    @pytest.mark.parametrize("opts, message", [
        (["--kind", "force-displacement", "--units", "x=furlongz,y=kN"],
         "unknown unit 'furlongz' for x (disp)"),
        (["--kind", "force-displacement", "--units", "x=s,y=kN"], "do not give J"),
        (["--kind", "B-H", "--energy", "y_dx"], "--energy y_dx contradicts it"),
        (["--level", "0", "--cut", "reversal"], "--level applies to --cut crossing only"),
        (["--hysteresis", "big"], "argument --hysteresis"),
        (["--gap", "0"], "argument --gap"),
    ])
    def test_errors_are_one_line(self, tmp_path, capsys, opts, message):
        from wedgepath import cli

        f, *_ = self._damper_csv(tmp_path)
        code = cli.main(["loop", str(f), "--x", "disp", "--y", "force", "--time", "t_s",
                         "--quiet", *opts])
        assert code == 2
        err = capsys.readouterr().err
        assert message in err and err.count("\n") == 1



def test_rainflow_through_the_command_line(tmp_path, capsys):
    import json

    from wedgepath import cli

    rng = np.random.default_rng(5)
    rev = np.cumsum(rng.uniform(0.5, 3.0, 30) * np.where(np.arange(30) % 2, -1, 1))
    u = np.concatenate([np.linspace(a, b, 9, endpoint=False) for a, b in zip(rev[:-1], rev[1:])]
                       + [[rev[-1]]])
    F = elastic_plastic_history(u)
    f = tmp_path / "rig.csv"
    pd.DataFrame({"disp": u, "force": F}).to_csv(f, index=False)
    out_dir = tmp_path / "out"
    code = cli.main(["loop", str(f), "--x", "disp", "--y", "force", "--rainflow",
                     "--units", "x=mm,y=kN", "--kind", "force-displacement",
                     "--out", str(out_dir), "--no-figures"])
    text = capsys.readouterr().out
    assert code == 0
    api = wp.rainflow(np.column_stack([u, F]), x=0, y=1)
    frame = pd.read_csv(out_dir / "rainflow.csv")
    assert list(frame.columns[:5]) == ["range", "mean", "count", "start", "end"]
    assert np.allclose(frame["range"], api.range) and np.array_equal(frame["start"], api.start + 1)
    assert np.allclose(frame["energy"], api.energy, atol=1e-12)      # kN x mm = J: factor 1
    res = json.loads((out_dir / "result.json").read_text())
    assert res["rainflow"]["energy_unit"] == "J"
    assert res["rainflow"]["total_energy"] == pytest.approx(api.total_energy, rel=1e-12)
    assert "rainflow cycles of disp (ASTM E1049-85 5.4.4)" in text
    assert "rainflow.csv" in text


def elastic_plastic_history(u, k=2.0, fy=3.0):
    return elastoplastic(u, k, fy)


def test_report_notes_the_cycle_length_warning():
    # no band on a noisy record: tiny 'cycles' next to whole ones, and the report says so
    from wedgepath import report

    rng = np.random.default_rng(4)
    t = np.arange(3000) * 2 * np.pi / 200
    X = np.column_stack([np.sin(t) + 0.05 * rng.standard_normal(t.size), np.cos(t)])
    rep = report.loop(X, names=["u", "f"], hysteresis=0.0, progress=False)
    assert any("median cycle length" in n for n in rep.notes)
    assert sum("median cycle length" in n for n in rep.notes) == 1      # said once
    assert not any("median cycle length" in n for n in report.loop(
        X, names=["u", "f"], progress=False).notes)                      # the default band


def test_cycle_start_and_stop_times_share_one_precision():
    # start '...T09:00:02' beside stop '...T09:00:02.000' could not be compared as text (trial)
    import pandas as pd

    # cycles cut on whole seconds; the record ends at 09:00:07.99, inside a cycle
    t = pd.date_range("2024-02-01 09:00:00", periods=800, freq="10ms")
    s = np.arange(800) * 0.01
    X = pd.DataFrame({"x": -np.cos(2 * np.pi * (s - 0.5) / 2.0),
                      "F": -np.cos(2 * np.pi * (s - 0.5) / 2.0 - 0.5)}, index=t)
    c = wp.cycle_areas(X, "x", "F")
    both = list(c.start_time) + list(c.stop_time)
    assert len({len(v) for v in both}) == 1, both
    assert list(c.stop_time[:-1]) == list(c.start_time[1:])     # cycles abut, as text too
    r = wp.rolling_area_matrix(X, 100, 50)
    assert len({len(v) for v in list(r.start_time) + list(r.stop_time)}) == 1
