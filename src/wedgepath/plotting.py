"""Figures for lead-lag reports and loops (needs the optional matplotlib extra).

Each function draws onto a matplotlib Axes you pass (or a new figure) and
returns the Axes, so the figures compose into your own layouts.  The two
``*_figures`` helpers render complete PNG files for the command line.

Palette: a diverging ramp from deep teal (lagging, negative) through paper
white to burnt orange (leading, positive), and a sequential ramp of the same
hues for winding numbers.
"""

from __future__ import annotations

import io
import math

import numpy as np

from ._validation import as_float_array

__all__ = ["lead_heatmap", "phase_circle", "loop_faces", "rolling_lead", "cycle_bars",
           "leadlag_figures", "loop_figures", "DIVERGING"]


def _mpl():
    import matplotlib
    matplotlib.use("Agg", force=False)
    import matplotlib.pyplot as plt
    from matplotlib.colors import LinearSegmentedColormap
    return matplotlib, plt, LinearSegmentedColormap


_TEAL, _PAPER, _ORANGE = "#0b5563", "#f7f4ee", "#c4581b"
_INK = "#22262a"


def _diverging():
    _, _, LSC = _mpl()
    return LSC.from_list("wedgepath_div", ["#06323b", _TEAL, "#7fb3b5", _PAPER,
                                            "#e9b48a", _ORANGE, "#6e2a07"])


DIVERGING = "wedgepath_div"


def _labels(names, n, what="names"):
    """``names`` as a list of n strings (checked before any figure is made)."""
    if isinstance(names, str) or not hasattr(names, "__len__"):
        raise TypeError(f"{what} must be a sequence of {n} channel names")
    names = list(names)
    if len(names) != n:
        raise ValueError(f"{what} has {len(names)} entries for {n} channels")
    return [str(nm) for nm in names]


def _order(order, n):
    if order is None:
        return np.arange(n)
    o = np.asarray(order)
    if o.ndim != 1 or o.dtype.kind not in "iu" or sorted(o.tolist()) != list(range(n)):
        raise ValueError(f"order must be a permutation of the {n} channel indices, got {order!r}")
    return o


def _axes(ax, size=(6, 5)):
    _, plt, _ = _mpl()
    if ax is None:
        fig, ax = plt.subplots(figsize=size, dpi=110)
    return ax


def lead_heatmap(A, names, order=None, ax=None, title="Lead matrix", label="A[i, j]"):
    """Heat map of a skew-symmetric lead matrix, rows and columns in ``order``.

    Row i, column j is coloured by ``A[i, j]``: orange where row i leads
    column j, teal where it lags.
    """
    A = as_float_array(A, "A", ndim=2, allow_nan=True)
    if A.shape[0] != A.shape[1] or A.shape[0] == 0:
        raise ValueError(f"A must be a non-empty square matrix, got shape {A.shape}")
    names = _labels(names, A.shape[0])
    order = _order(order, A.shape[0])
    M = A[np.ix_(order, order)]
    ax = _axes(ax)
    lim = np.nanmax(np.abs(M)) or 1.0
    im = ax.imshow(M, cmap=_diverging(), vmin=-lim, vmax=lim, interpolation="nearest")
    labels = [names[k] for k in order]
    ax.set_xticks(range(len(labels)), labels, rotation=45, ha="right")
    ax.set_yticks(range(len(labels)), labels)
    ax.set_xlabel("lagging channel j")
    ax.set_ylabel("leading channel i")
    ax.set_title(title, color=_INK)
    cb = ax.figure.colorbar(im, ax=ax, fraction=0.046, pad=0.04)
    cb.set_label(label + "  (> 0: row leads column)")
    return ax


def phase_circle(phases, names, moduli=None, order=None, ax=None, title="Phase of each channel"):
    """Channels placed on a circle at their phase (clockwise = later), radius = participation."""
    phases = as_float_array(phases, "phases", ndim=1)
    r = np.ones_like(phases) if moduli is None else as_float_array(moduli, "moduli", ndim=1)
    if r.shape != phases.shape:
        raise ValueError(f"moduli has {r.shape[0]} entries for {phases.shape[0]} phases")
    names = _labels(names, phases.shape[0])
    if order is not None:
        order = _order(order, phases.shape[0]).tolist()
    _, plt, _ = _mpl()
    if ax is None:
        fig = plt.figure(figsize=(5.5, 5.5), dpi=110)
        ax = fig.add_subplot(projection="polar")
    ax.set_theta_zero_location("N")
    ax.set_theta_direction(-1)  # later phases further clockwise, like a clock
    ax.plot(np.linspace(0, 2 * np.pi, 200), np.ones(200), color="#c9c2b4", lw=1)
    if order is not None:
        o = list(order) + [order[0]]
        ax.plot(phases[o], r[o], color=_TEAL, lw=1.2, alpha=0.6)
    ax.scatter(phases, r, s=80, color=_ORANGE, edgecolor=_INK, zorder=3)
    for ph, rr, nm in zip(phases, r, names):
        ax.annotate(nm, (ph, rr), xytext=(6, 6), textcoords="offset points", fontsize=9,
                    color=_INK)
    ax.set_rmax(1.15)
    ax.set_yticklabels([])
    ax.set_title(title + "\n(degrees behind the first channel of the cycle)", color=_INK, fontsize=10)
    return ax


def loop_faces(decomposition, xy=None, names=("x", "y"), ax=None, title="Loop and its faces",
               max_faces=20000):
    """The curve in its plane with each face shaded by its winding number."""
    from .planar import Decomposition
    if not isinstance(decomposition, Decomposition):
        raise TypeError(f"loop_faces needs a Decomposition (from wp.decompose), got "
                        f"{type(decomposition).__name__}")
    if xy is not None:
        xy = as_float_array(xy, "xy", ndim=2, allow_nan=True)
        if xy.shape[1] != 2:
            raise ValueError(f"xy must have shape (T, 2), got {xy.shape}")
    names = _labels(names, 2)
    _, plt, _ = _mpl()
    import shapely
    from matplotlib.collections import PatchCollection
    from matplotlib.patches import Polygon as MplPolygon

    ax = _axes(ax, (6, 5.5))
    faces, wind = decomposition.faces, np.asarray(decomposition.winding)
    patches, values = [], []
    if len(faces) > max_faces:  # keep the largest faces; a figure cannot show more
        keep = np.argsort(-np.asarray(decomposition.areas))[:max_faces]
        faces, wind = faces[keep], wind[keep]
    for face, w in zip(faces, wind):
        for poly in shapely.get_parts(face):
            ext = np.asarray(poly.exterior.coords)
            patches.append(MplPolygon(ext, closed=True))
            values.append(w)
    if patches:
        lim = max(1, int(np.max(np.abs(values))))
        pc = PatchCollection(patches, cmap=_diverging(), edgecolor="none", alpha=0.85)
        pc.set_array(np.asarray(values, dtype=float))
        pc.set_clim(-lim - 0.5, lim + 0.5)
        ax.add_collection(pc)
        cb = ax.figure.colorbar(pc, ax=ax, fraction=0.046, pad=0.04)
        cb.set_label("winding number (counter-clockwise > 0)")
    if xy is not None:
        ax.plot(xy[:, 0], xy[:, 1], color=_INK, lw=0.35, alpha=0.55)
    from matplotlib.ticker import MaxNLocator
    ax.xaxis.set_major_locator(MaxNLocator(5))
    ax.yaxis.set_major_locator(MaxNLocator(6))
    ax.autoscale_view()
    ax.set_xlabel(names[0])
    ax.set_ylabel(names[1])
    ax.set_title(title, color=_INK)
    ax.set_aspect("auto")
    return ax


def rolling_lead(start_time, end_time, areas, names, pairs=None, ax=None, top=4,
                 title="Rolling lead", xlabel="time at window centre"):
    """``A[i, j]`` over sliding windows for the strongest pairs."""
    areas = as_float_array(areas, "areas", ndim=3, allow_nan=True)
    K, n = areas.shape[0], areas.shape[1]
    if areas.shape[2] != n:
        raise ValueError(f"areas must have shape (windows, n, n), got {areas.shape}")
    t0 = as_float_array(start_time, "start_time", ndim=1)
    t1 = as_float_array(end_time, "end_time", ndim=1)
    if t0.shape != (K,) or t1.shape != (K,):
        raise ValueError(f"start_time and end_time need {K} entries (one per window), got "
                         f"{t0.shape[0]} and {t1.shape[0]}")
    names = _labels(names, n)
    if pairs is not None:
        pairs = [tuple(int(v) for v in pq) for pq in pairs]
        if any(len(pq) != 2 or not all(0 <= v < n for v in pq) for pq in pairs):
            raise ValueError(f"pairs must be (i, j) channel index pairs below {n}")
    t = 0.5 * (t0 + t1)
    if pairs is None:
        strength = np.nanmean(np.abs(areas), axis=0)
        cand = [(strength[i, j], i, j) for i in range(n) for j in range(i + 1, n)]
        pairs = [(i, j) for _, i, j in sorted(cand, reverse=True)[:top]]
    ax = _axes(ax, (7, 4))
    palette = [_ORANGE, _TEAL, "#8a6d3b", "#5b4a8a", "#2f7d3b", "#a33b5c"]
    for k, (i, j) in enumerate(pairs):
        ax.plot(t, areas[:, i, j], color=palette[k % len(palette)], lw=1.6,
                label=f"{names[i]} over {names[j]}")
    ax.axhline(0, color="#9a9488", lw=0.8)
    ax.set_xlabel(xlabel)
    ax.set_ylabel("A[i, j] per window  (> 0: i leads)")
    ax.set_title(title, color=_INK)
    ax.legend(frameon=False, fontsize=8)
    return ax


def cycle_bars(values, ax=None, title="Per-cycle loop integral", ylabel="value per cycle"):
    """Bar chart of per-cycle values with their mean."""
    vals = as_float_array(values, "values", ndim=1, allow_nan=True)
    ax = _axes(ax, (7, 3.6))
    k = np.arange(1, vals.size + 1)
    ax.bar(k, np.nan_to_num(vals), color=np.where(np.isnan(vals), "#c9c2b4", _TEAL))
    if np.isfinite(vals).any():
        m = float(np.nanmean(vals))
        ax.axhline(m, color=_ORANGE, lw=1.5)
        title = f"{title} (mean {m:.4g}, orange line)"
    ax.set_xlabel("cycle")
    ax.set_ylabel(ylabel)
    ax.set_title(title, color=_INK)
    return ax


def _png(fig):
    _, plt, _ = _mpl()
    buf = io.BytesIO()
    fig.tight_layout()
    fig.savefig(buf, format="png", facecolor="white")
    plt.close(fig)
    return buf.getvalue()


def leadlag_figures(report) -> dict:
    """PNG files (name -> bytes) for a lead-lag report made by the command line."""
    names = report["channels"]
    A = np.asarray(report["area_matrix"], dtype=float)
    idx = {nm: k for k, nm in enumerate(names)}
    order = [idx[nm] for nm in report["cyclic_order"]["order"]]
    label = "lead strength" if report.get("normalize") else "oriented area A[i, j]"
    out = {}
    ax = lead_heatmap(A, names, order, title="Lead matrix, channels in cyclic order", label=label)
    out["lead_matrix.png"] = _png(ax.figure)
    ph = np.array([report["cyclic_order"]["phases_rad"][nm] for nm in names])
    mod = np.array([report["cyclic_order"]["moduli"][nm] for nm in names])
    ax = phase_circle(ph, names, mod, order,
                      title=f"Phase of each channel (fit {report['cyclic_order']['fit']:.2f})")
    out["phases.png"] = _png(ax.figure)
    if "rolling" in report:
        r = report["rolling"]
        ax = rolling_lead(r["start_time"], r["end_time"], r["areas"], names,
                          title=f"Rolling lead, windows of {r['window']} samples")
        out["rolling_lead.png"] = _png(ax.figure)
    return out


def loop_figures(xy, names, report, closure="chord") -> dict:
    """PNG files (name -> bytes) for a loop report made by the command line."""
    from .planar import decompose
    out = {}
    dec = decompose(np.asarray(xy, dtype=float), closure=closure)
    ax = loop_faces(dec, xy, names,
                    title=f"{names[1]} against {names[0]}: faces by winding number")
    out["loop.png"] = _png(ax.figure)
    c = report["cycles"]
    if len(c["values"]):
        ax = cycle_bars(c["values"], title=c["quantity"], ylabel=f"per cycle ({names[1]} x {names[0]})")
        out["cycles.png"] = _png(ax.figure)
    return out


def _degrees(rad):
    return rad * 180.0 / math.pi
