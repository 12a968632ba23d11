"""Engineering quantities of hysteresis loops, cycle by cycle: :func:`loop_cycles`.

For a loop traced by two recorded channels -- x on the horizontal axis, y
on the vertical one -- each cycle gets

* its energy ``E_D``: the loop integral the family asks for (see
  :data:`LOOP_KINDS`); for force--displacement, stress--strain and p--V it
  is ``∮ y dx``, **positive when the loop runs clockwise** in the (x, y)
  plane, which is how a dissipating specimen (or an engine's indicator
  diagram) runs; for B--H it is ``∮ H dB = ∮ x dy``, positive for the
  counter-clockwise loop of a magnetic material;
* the peaks and valleys of both channels;
* the effective (secant) stiffness ``k_eff = (F(u_max) - F(u_min)) /
  (u_max - u_min)``, the line through the loop's two tips (F(u_max) is the
  force at the sample where the displacement peaks);
* the strain energy at peak ``E_S0 = k_eff u_0^2 / 2`` with ``u_0 = (u_max -
  u_min) / 2``;
* the equivalent viscous damping ratio ``zeta_eq = E_D / (4 pi E_S0)`` and
  the loss factor ``eta = E_D / (2 pi E_S0)``.

The last three follow A. K. Chopra, *Dynamics of Structures* (section on
equivalent viscous damping: ``zeta_eq = E_D / (4 pi E_So)`` with
``E_So = k u_o^2 / 2``), and the loss factor is the usual ``eta = E_D / (2 pi
E_S0)`` (the same text; ``eta = 2 zeta_eq``).  Where the peak force comes at
the peak displacement (elastic--plastic loops) ``k_eff`` is also
``(F_max - F_min) / (u_max - u_min)``; for a viscous loop it is not, and the
tips give Chopra's ``zeta_eq = c omega / (2 k)`` exactly.

These numbers describe measured loops.  Whether a damper, bearing or joint is
acceptable, or how long a part will last, is decided under the applicable
codes by qualified engineers; wedgepath does not make that decision.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from types import MappingProxyType
from typing import ClassVar

import numpy as np

from .._results import ArrayResult, fmt_number
from .._validation import as_float_array, check_choice
from . import _units
from ._kernel import signal_input
from .cycles import _channel, interval_areas
from .segment import CUTS, segment

__all__ = ["loop_cycles", "LoopCycles", "LOOP_KINDS", "CAUTION"]

CAUTION = ("These loop quantities describe the measurement only; acceptance of dampers, "
           "bearings or joints and fatigue life are governed by the applicable codes and "
           "decided by qualified (licensed) engineers.")


@dataclass(frozen=True)
class LoopKind:
    """A family of loops: what x and y are, which integral is the energy, which units."""

    x: str                      # what the horizontal channel is
    y: str                      # what the vertical channel is
    energy: str                 # "y_dx" or "x_dy"
    label: str                  # name of the per-cycle energy
    energy_dimension: str       # unit text whose dimension the energy must have
    energy_units: tuple         # output units to choose from (the largest giving >= 1)
    mechanics: bool             # k_eff, E_S0, zeta_eq, eta make sense


#: The loop families (``kind=``): channels, integral and its sign, output units.
LOOP_KINDS = {
    "force-displacement": LoopKind(
        "displacement", "force", "y_dx", "energy dissipated per cycle E_D = ∮ F du", "J",
        ("J",), True),
    "stress-strain": LoopKind(
        "strain", "stress", "y_dx", "energy dissipated per cycle per unit volume ∮ σ dε",
        "J/m^3", ("J/m^3", "kJ/m^3", "MJ/m^3"), True),
    "B-H": LoopKind(
        "field strength H", "flux density B", "x_dy",
        "core loss per cycle per unit volume ∮ H dB", "J/m^3", ("J/m^3", "kJ/m^3"), False),
    "p-V": LoopKind(
        "volume V", "pressure p", "y_dx", "indicator work per cycle ∮ p dV", "J",
        ("J", "kJ"), False),
}

_SIGN = {"y_dx": "positive for a clockwise loop in the (x, y) plane (x horizontal)",
         "x_dy": "positive for a counter-clockwise loop in the (x, y) plane (x horizontal)"}

_MECH = ("stiffness", "strain_energy", "damping_ratio", "loss_factor")


@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class LoopCycles(ArrayResult):
    """Per-cycle engineering quantities of a loop: :func:`loop_cycles`.

    Array-like: ``np.asarray(r)`` (or ``r.energy``) is the energy per cycle.
    Every per-cycle array has one entry per row of ``status``; partial
    cycles (cut by the ends of the record or by a gap) hold NaN.

    Attributes
    ----------
    energy : ndarray (C,)
        The loop integral per cycle (``quantity``; sign: ``sign``), in
        ``column_units["energy"]`` when units were given.
    x_min, x_max, y_min, y_max : ndarray (C,)
        Valleys and peaks of the two channels within each cycle.
    y_at_x_min, y_at_x_max : ndarray (C,)
        y at the samples where x is smallest and largest (the loop's tips).
    stiffness : ndarray (C,)
        ``k_eff = (y_at_x_max - y_at_x_min) / (x_max - x_min)`` (secant).
    strain_energy : ndarray (C,)
        ``E_S0 = k_eff u_0^2 / 2``, ``u_0 = (x_max - x_min) / 2``.
    damping_ratio, loss_factor : ndarray (C,)
        ``zeta_eq = E_D / (4 pi E_S0)`` and ``eta = E_D / (2 pi E_S0)``.
    start, stop, start_time, stop_time : ndarray (C,)
        Cycle boundaries (fractional sample positions, and in time).
    status : ndarray of str (C,)
        ``complete``, ``partial-start``, ``partial-end`` or ``partial-gap``.
    complete : ndarray of bool (C,)
    count : int
        Number of complete cycles.
    names : tuple of str
        ``(x, y)`` channel names.
    kind : str or None
        The loop family (a key of :data:`LOOP_KINDS`).
    quantity, sign : str
        Which integral ``energy`` holds and when it is positive.
    cut, hysteresis, noise, level, gaps, curve
        How the cycles were found and measured (see
        the module ``wedgepath.signals.segment``).
    units : mapping or None
        Units of the two channels (as given).
    column_units : mapping
        Unit of each column of ``to_frame()`` that has one.
    """

    _array_field: ClassVar[str] = "energy"

    energy: np.ndarray
    x_min: np.ndarray
    x_max: np.ndarray
    y_min: np.ndarray
    y_max: np.ndarray
    y_at_x_min: np.ndarray
    y_at_x_max: np.ndarray
    stiffness: np.ndarray
    strain_energy: np.ndarray
    damping_ratio: np.ndarray
    loss_factor: np.ndarray
    start: np.ndarray
    stop: np.ndarray
    start_time: np.ndarray
    stop_time: np.ndarray
    status: np.ndarray
    complete: np.ndarray
    count: int
    names: tuple
    kind: str | None
    quantity: str
    sign: str
    cut: str | None
    hysteresis: float | None
    noise: float | None
    level: float | None
    gaps: int
    curve: str
    units: Mapping | None = None
    column_units: Mapping | None = None

    @property
    def columns(self) -> list:
        """The per-cycle quantities this loop family reports (``to_frame()`` columns)."""
        cols = ["energy", "x_min", "x_max", "y_min", "y_max", "y_at_x_min", "y_at_x_max"]
        if self.kind is None or LOOP_KINDS[self.kind].mechanics:
            cols += list(_MECH)
        return cols

    def to_frame(self):
        """One row per cycle: ``cycle, start, stop, start_time, stop_time, status, complete``
        and the quantities of :attr:`columns` (``energy, x_min, ..., loss_factor``)."""
        import pandas as pd

        data = {"cycle": np.arange(self.energy.shape[0]), "start": self.start, "stop": self.stop,
                "start_time": self.start_time, "stop_time": self.stop_time,
                "status": self.status, "complete": self.complete}
        for c in self.columns:
            data[c] = getattr(self, c)
        return pd.DataFrame(data)

    def describe(self):
        """Mean, sample standard deviation (ddof=1), min and max of each quantity over the
        complete cycles: one row per quantity, with its unit."""
        import pandas as pd

        ok = self.complete
        rows = []
        for c in self.columns:
            v = np.asarray(getattr(self, c))[ok]
            rows.append({"quantity": c, "unit": (self.column_units or {}).get(c, ""),
                         "mean": float(v.mean()) if v.size else math.nan,
                         "std": float(v.std(ddof=1)) if v.size > 1 else math.nan,
                         "min": float(v.min()) if v.size else math.nan,
                         "max": float(v.max()) if v.size else math.nan, "cycles": int(v.size)})
        return pd.DataFrame(rows)

    @property
    def mean(self) -> float:
        """Mean energy over the complete cycles (NaN when there are none)."""
        v = self.energy[self.complete]
        return float(v.mean()) if v.size else math.nan

    @property
    def std(self) -> float:
        """Sample standard deviation (ddof=1) of the energy over the complete cycles."""
        v = self.energy[self.complete]
        return float(v.std(ddof=1)) if v.size > 1 else math.nan

    def _summary_items(self):
        u = (self.column_units or {}).get("energy")
        items = [("kind", repr(self.kind)), ("complete", str(self.count)),
                 ("partial", str(len(self) - self.count)),
                 ("mean_energy", fmt_number(self.mean) + (f" {u}" if u else ""))]
        if self.kind is None or LOOP_KINDS[self.kind].mechanics:
            z = self.damping_ratio[self.complete]
            items.append(("mean_damping_ratio", fmt_number(z.mean() if z.size else math.nan, 4)))
        return items


def _channel_units(units, data_units, xname, yname):
    """The unit texts of x and y from ``units`` (channel names, or the roles "x"/"y")."""
    got = dict(data_units or {})
    if units is not None:
        if not isinstance(units, Mapping):
            raise TypeError(f"units must be a mapping channel -> unit text, got "
                            f"{type(units).__name__}")
        for k, v in units.items():
            if k in (xname, yname):
                got[k] = v
            elif k == "x":
                got[xname] = v
            elif k == "y":
                got[yname] = v
            else:
                raise ValueError(f"units names {k!r}, which is neither the x channel "
                                 f"{xname!r}, the y channel {yname!r}, nor 'x' or 'y'")
    ux, uy = got.get(xname), got.get(yname)
    if (ux is None) != (uy is None):
        missing = xname if ux is None else yname
        raise ValueError(f"units: give the unit of both channels (missing: {missing!r})")
    return ux, uy


def _output_units(kind, ux_text, uy_text, energy_values, xname, yname):
    """(energy factor, column units) for the loop's channel units."""
    if ux_text is None:
        return 1.0, {}
    ux = _units.parse_unit(ux_text, f"x ({xname})")
    uy = _units.parse_unit(uy_text, f"y ({yname})")
    prod = ux * uy
    spec = LOOP_KINDS[kind] if kind is not None else None
    if spec is not None:
        if not _units.has_dimension(prod, spec.energy_dimension):
            raise ValueError(
                f"units {ux_text!r} (x: {spec.x}) times {uy_text!r} (y: {spec.y}) do not give "
                f"{spec.energy_dimension} as a {kind} loop needs; check the units or the kind")
        choices = spec.energy_units
    elif _units.has_dimension(prod, "J"):
        choices = ("J",)
    elif _units.has_dimension(prod, "J/m^3"):
        choices = ("J/m^3", "kJ/m^3", "MJ/m^3")
    else:
        choices = None
    if choices is None:
        target = prod
        etext = _units.text(prod)
    else:
        mags = np.abs(np.asarray(energy_values, dtype=np.float64))
        mags = mags[np.isfinite(mags)]
        med = float(np.median(mags)) if mags.size else 0.0
        etext = choices[0]
        for c in choices:
            if med * _units.factor(prod, _units.parse_unit(c, "output")) >= 1.0:
                etext = c
        target = _units.parse_unit(etext, "output")
    f = _units.factor(prod, target)
    xs, ys = _units.text(ux), _units.text(uy)
    cu = {"energy": etext, "x_min": xs, "x_max": xs, "y_min": ys, "y_max": ys,
          "y_at_x_min": ys, "y_at_x_max": ys}
    if spec is None or spec.mechanics:
        stiff = ys if _units.is_dimensionless(ux) else f"{ys}/{xs}"
        cu.update({"stiffness": stiff, "strain_energy": etext, "damping_ratio": "1",
                   "loss_factor": "1"})
    return f, cu


def energy_factor(x_unit, y_unit, target) -> float:
    """The factor that turns values in ``x_unit * y_unit`` into ``target`` (unit texts)."""
    ux = _units.parse_unit(x_unit, "x")
    uy = _units.parse_unit(y_unit, "y")
    return _units.factor(ux * uy, _units.parse_unit(target, "output"))


def _spline_energy(P, t, s, e, energy):
    """∮ of the cycle's samples ``s..e`` under the cubic spline model (chord-closed)."""
    from ..calculus.forms import OneForm
    from ..calculus.integration import integrate
    from ..calculus.paths import Path

    pts = P[s:e + 1]
    path = Path(pts, times=t[s:e + 1])
    if energy == "y_dx":
        form = OneForm([lambda q: q[:, 1], 0.0])
    else:
        form = OneForm([0.0, lambda q: q[:, 0]])
    return float(integrate(form, path, closure="chord", curve="spline"))


def loop_cycles(X, x=0, y=1, *, kind=None, units=None, cut="reversal", reference=None,
                level=None, hysteresis="auto", gap="auto", boundaries=None, curve="linear",
                times=None, names=None) -> LoopCycles:
    """Energy, peaks, stiffness and damping of each cycle of a hysteresis loop.

    The loop is drawn with channel ``x`` horizontal and ``y`` vertical
    (displacement and force, strain and stress, H and B, V and p).  The
    record is cut into cycles at the valleys of the reference channel (``x``
    by default) confirmed by a hysteresis band chosen from the data's noise
    (``cut="reversal"``, ``hysteresis="auto"``), never across a gap; pieces
    before the first and after the last valley, or next to a gap, are
    flagged partial.  See the module ``wedgepath.signals.segment``.

    Sign convention (stated once, here): the energy of a cycle is ``∮ y dx``
    over the cycle's loop closed by its chord -- positive when the loop runs
    clockwise, as a dissipating specimen's force--displacement or
    stress--strain loop does -- except for ``kind="B-H"``, where it is the
    core loss ``∮ H dB = ∮ x dy``, positive for the counter-clockwise loop of
    a magnetic material.  ``∮ y dx`` is ``cycle_areas(X, y, x)`` of the same
    cycles, and ``-`` the signed (counter-clockwise positive) area.

    Parameters
    ----------
    X : array_like (T, n), DataFrame or Path
        The recording (NaN rows are gaps).
    x, y : int or str
        The horizontal and vertical channels.
    kind : {"force-displacement", "stress-strain", "B-H", "p-V"}, optional
        The loop family (:data:`LOOP_KINDS`): fixes the integral, its sign,
        the output units and whether stiffness and damping are reported.
    units : mapping, optional
        Units of the channels: ``{"x": "mm", "y": "kN"}`` or by channel
        name (a DataFrame's ``attrs["units"]`` is used too).  The energy
        is then converted with pint: J for force--displacement and p--V,
        J/m^3 (kJ/m^3, MJ/m^3 when those read better) for stress--strain
        and B--H; stiffness is in y-unit/x-unit (kN/mm).  Unknown units, or
        units that do not fit the kind, raise ValueError.
    cut : {"reversal", "crossing"}
        Cycles from valley to valley of the reference (default; drift-proof)
        or between upward crossings of ``level``.
    reference : int or str, optional
        Channel that cuts the cycles; default ``x``.
    level : float, optional
        Crossing level for ``cut="crossing"`` (default: the mean).
    hysteresis : float or "auto"
        Band against noise (reversal: full band; crossing: half-width).
        ``"auto"``: 8 (reversal) or 4 (crossing) noise standard deviations
        of the reference, estimated from its second differences.
    gap : "auto", None or float
        Longest time step that is not a gap (``"auto"``: 1.5 times the
        median step for regular sampling, 5 times the 99% quantile of the
        steps for irregular logging).  Used only with times.
    boundaries : array_like of int, optional
        Cycle boundaries as sample indices (replaces the detection).
    curve : {"linear", "spline"}
        Curve model between samples for the energy (``"spline"``: a cubic
        spline in time through each cycle's samples; needs whole-sample
        boundaries, as the reversal cut gives).
    times, names
        Sample times and channel names for an array input.

    Returns
    -------
    LoopCycles
        Per-cycle arrays, ``to_frame()``, ``describe()``, ``count``.

    Examples
    --------
    A Kelvin--Voigt damper ``F = k u + c du/dt`` driven at ``u = u0 sin(w t)``
    dissipates ``pi c w u0^2`` per cycle and has ``zeta_eq = c w / (2 k)``
    (Chopra, Dynamics of Structures, equivalent viscous damping):

    >>> import numpy as np
    >>> import wedgepath as wp
    >>> k, c, w, u0 = 50.0, 2.0, 3.0, 4.0                 # kN/mm, kN s/mm, rad/s, mm
    >>> t = np.linspace(0, 6 * 2 * np.pi / w, 6 * 2000 + 1)
    >>> u = u0 * np.sin(w * t); F = k * u + c * w * u0 * np.cos(w * t)
    >>> r = wp.loop_cycles(np.column_stack([u, F]), kind="force-displacement",
    ...                    units={"x": "mm", "y": "kN"}, times=t)
    >>> r.count, r.column_units["energy"], r.column_units["stiffness"]
    (5, 'J', 'kN/mm')
    >>> bool(np.allclose(r.energy[r.complete], np.pi * c * w * u0 ** 2, rtol=1e-5))
    True
    >>> bool(np.allclose(r.damping_ratio[r.complete], c * w / (2 * k), rtol=1e-5))
    True
    """
    data = signal_input(X, times, names)
    T, n = data.shape
    nm = data.names
    a = _channel(x, nm, n, "x")
    b = _channel(y, nm, n, "y")
    if a == b:
        raise ValueError(f"x and y must be different channels, got {x!r} twice")
    if kind is not None:
        check_choice(kind, "kind", tuple(LOOP_KINDS))
    check_choice(cut, "cut", CUTS)
    check_choice(curve, "curve", ("linear", "spline"))
    P = np.asarray(data.values[:, [a, b]], dtype=np.float64)
    if np.isinf(P).any():
        r = int(np.argwhere(np.isinf(P))[0][0])
        raise ValueError(f"X contains an infinite value at row {r}")
    xname, yname = data.labels[a], data.labels[b]
    ux, uy = _channel_units(units, data.units_of((xname, yname)), xname, yname)
    valid = ~np.isnan(P).any(axis=1)
    if boundaries is not None:
        if reference is not None or level is not None:
            raise ValueError("give either boundaries or reference/level, not both")
        pos = as_float_array(boundaries, "boundaries", ndim=1)
        if pos.size and (pos[0] < 0 or pos[-1] > T - 1):
            raise ValueError(f"boundaries must lie within [0, {T - 1}] (sample positions)")
        if pos.size > 1 and not np.all(np.diff(pos) > 0):
            raise ValueError("boundaries must be strictly increasing")
        st, sp = pos[:-1], pos[1:]
        status = np.array(["complete"] * st.size, dtype=object)
        for c in range(st.size):
            if not valid[int(np.floor(st[c])):int(np.ceil(sp[c])) + 1].all():
                status[c] = "partial-gap"
        used_cut, band, noise, lev, n_gaps = None, None, None, None, 0
    else:
        ref = a if reference is None else _channel(reference, nm, n, "reference")
        rr = np.asarray(data.values[:, ref], dtype=np.float64)
        fin = rr[np.isfinite(rr)]
        if fin.size == 0:
            raise ValueError("the reference channel has no samples (all NaN)")
        if fin.max() == fin.min():
            raise ValueError("the reference channel is constant, so it has no cycles; "
                             "choose another reference or give boundaries")
        seg = segment(rr, valid, data.times, cut=cut, level=level, hysteresis=hysteresis,
                      gap=gap)
        st, sp, status = seg.start, seg.stop, seg.status
        used_cut, band, noise, lev, n_gaps = cut, seg.band, seg.noise, seg.level, seg.n_gaps
    ok = status == "complete"
    spec = LOOP_KINDS[kind] if kind is not None else None
    energy_form = spec.energy if spec is not None else "y_dx"
    C = st.size
    # per-cycle energy: ∮ y dx is interval_areas of the columns (y, x); ∮ x dy of (x, y)
    cols = [1, 0] if energy_form == "y_dx" else [0, 1]
    if curve == "spline":
        if not (np.all(st[ok] == np.round(st[ok])) and np.all(sp[ok] == np.round(sp[ok]))):
            raise ValueError("curve='spline' needs whole-sample cycle boundaries "
                             "(cut='reversal', or integer boundaries)")
        tt = data.times if data.times is not None else np.arange(T, dtype=np.float64)
        E = np.full(C, np.nan)
        for c in np.flatnonzero(ok):
            E[c] = _spline_energy(P, tt, int(st[c]), int(sp[c]), energy_form)
    else:
        # scaled by powers of two (exact) so that no product overflows on the way
        from .._scaling import pow2_exponents, pow2_scale

        Pc = P[:, cols]
        exl = pow2_exponents(Pc, axis=0)
        E = (pow2_scale(interval_areas(pow2_scale(Pc, -exl), st, sp), int(exl.sum()))
             if C else np.empty(0))
    E[~ok] = np.nan
    if np.isinf(E).any():
        raise ValueError("loop_cycles: the energies overflow float64 for data this large; "
                         "rescale the data (e.g. divide each channel by its largest value)")
    ext = np.full((C, 6), np.nan)
    for c in np.flatnonzero(ok):
        lo, hi = int(np.ceil(st[c])), int(np.floor(sp[c]))
        seg_pts = P[lo:hi + 1]
        ends = []
        for pos_ in (st[c], sp[c]):
            k = min(int(np.floor(pos_)), T - 2)
            f = pos_ - k
            if 0 < f < 1:
                ends.append(P[k] + f * (P[k + 1] - P[k]))
        if ends:
            seg_pts = np.vstack([seg_pts] + [e_[None, :] for e_ in ends])
        ia, ib = int(np.argmin(seg_pts[:, 0])), int(np.argmax(seg_pts[:, 0]))
        ext[c] = [seg_pts[ia, 0], seg_pts[ib, 0], seg_pts[:, 1].min(), seg_pts[:, 1].max(),
                  seg_pts[ia, 1], seg_pts[ib, 1]]
    xmin, xmax, ymin, ymax, yxmin, yxmax = ext.T
    factor, cu = _output_units(kind, ux, uy, E[ok], xname, yname)
    E = E * factor
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        k_eff = (yxmax - yxmin) / (xmax - xmin)
        u0 = 0.5 * (xmax - xmin)
        es0 = 0.5 * k_eff * u0 ** 2 * factor
        zeta = E / (4.0 * np.pi * es0)
        eta = E / (2.0 * np.pi * es0)
    # a cycle without displacement range (or beyond float64) has no stiffness, stored
    # energy or damping ratio: NaN (undefined), never +-inf
    for arr in (k_eff, es0, zeta, eta):
        arr[~np.isfinite(arr)] = np.nan
    idx = np.arange(T, dtype=np.float64)
    tt = data.times if data.times is not None else idx
    quantity = spec.label if spec is not None else f"∮ {yname} d({xname})"
    if spec is not None:
        quantity += (f" = ∮ {yname} d({xname})" if energy_form == "y_dx"
                     else f" = ∮ {xname} d({yname})")
    u_in = {k: v for k, v in ((xname, ux), (yname, uy)) if v is not None} or None
    return LoopCycles(
        energy=E, x_min=xmin, x_max=xmax, y_min=ymin, y_max=ymax, y_at_x_min=yxmin,
        y_at_x_max=yxmax, stiffness=k_eff, strain_energy=es0, damping_ratio=zeta,
        loss_factor=eta, start=st, stop=sp, start_time=np.interp(st, idx, tt),
        stop_time=np.interp(sp, idx, tt), status=status, complete=ok, count=int(ok.sum()),
        names=(xname, yname), kind=kind, quantity=quantity, sign=_SIGN[energy_form],
        cut=used_cut, hysteresis=band, noise=noise, level=lev, gaps=n_gaps, curve=curve,
        units=u_in, column_units=MappingProxyType(cu) if cu else None)
