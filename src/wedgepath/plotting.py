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

__all__ = ["lead_heatmap", "phase_circle", "loop_faces", "loop_path", "rolling_lead", "cycle_bars",
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


def _literal(text) -> str:
    """``text`` drawn as it is: a ``$`` is escaped so that matplotlib never reads math text.

    Channel names and units come from data files; ``cost_$_total`` beside
    ``price_$`` would otherwise open a math span (garbled labels, or a parse
    error that stops the figure).
    """
    return str(text).replace("$", "\\$")


def _labels(names, n, what="names"):
    """``names`` as a list of n strings, escaped to be drawn literally (checked first)."""
    if isinstance(names, str) or not hasattr(names, "__len__"):
        raise TypeError(f"{what} must be a sequence of {n} channel names")
    names = list(names)
    if len(names) != n:
        raise ValueError(f"{what} has {len(names)} entries for {n} channels")
    return [_literal(nm) for nm in names]


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
    ax.set_xlabel("column: channel j")
    ax.set_ylabel("row: channel i")
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
    ax.set_rticks([0.25, 0.5, 0.75, 1.0])
    ax.set_rlabel_position(200)
    ax.tick_params(axis="y", labelsize=7, labelcolor="#8a857b")
    ax.tick_params(axis="x", pad=6)
    radius = "" if moduli is None else \
        "\nradius: share in the cycle (largest = 1; near 0: phase unreliable)"
    ax.set_title(title + "\nangle: degrees behind the first channel of the cycle" + radius,
                 color=_INK, fontsize=9)
    return ax


def loop_faces(decomposition, xy=None, names=("x", "y"), ax=None, title="Loop and its faces",
               max_faces=20000, curve=None):
    """The curve in its plane with each face shaded by its winding number.

    One colour per winding number present (teal for clockwise, negative;
    orange for counter-clockwise, positive; deeper for larger ``|w|``).
    ``curve`` draws ``xy`` over the faces (default: only when it has at most
    2,000 samples, where it does not hide them).
    """
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
    from matplotlib.colors import BoundaryNorm, ListedColormap
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
        vals = np.asarray(values, dtype=int)
        lo, hi = min(int(vals.min()), 0), max(int(vals.max()), 0)
        lim = max(1, -lo, hi)
        levels = np.arange(lo, hi + 1)
        # 0 is paper white; |w| = lim the deepest shade of its sign
        colours = _diverging()(0.5 + 0.5 * levels / lim)
        norm = BoundaryNorm(np.arange(lo, hi + 2) - 0.5, len(levels))
        pc = PatchCollection(patches, cmap=ListedColormap(colours), norm=norm,
                             edgecolor="none", alpha=0.9)
        pc.set_array(vals.astype(float))
        ax.add_collection(pc)
        cb = ax.figure.colorbar(pc, ax=ax, fraction=0.046, pad=0.04)
        step = max(1, int(math.ceil(len(levels) / 12)))
        cb.set_ticks(levels[::step])
        cb.set_label("winding number (counter-clockwise > 0)")
    if xy is not None and (curve if curve is not None else xy.shape[0] <= 2000):
        ax.plot(xy[:, 0], xy[:, 1], color=_INK, lw=0.4, alpha=0.5)
    from matplotlib.ticker import MaxNLocator
    ax.xaxis.set_major_locator(MaxNLocator(5))
    ax.yaxis.set_major_locator(MaxNLocator(6))
    if xy is not None and np.isfinite(xy).any():
        _fit_limits(ax, xy)
    else:
        ax.autoscale_view()
    ax.set_xlabel(names[0])
    ax.set_ylabel(names[1])
    ax.set_title(title, color=_INK)
    ax.set_aspect("auto")
    return ax


def _fit_limits(ax, xy, margin=0.04):
    lo, hi = np.nanmin(xy, axis=0), np.nanmax(xy, axis=0)
    pad = margin * np.where(hi > lo, hi - lo, 1.0)
    ax.set_xlim(lo[0] - pad[0], hi[0] + pad[0])
    ax.set_ylim(lo[1] - pad[1], hi[1] + pad[1])


def loop_path(xy, names=("x", "y"), ax=None, title="The recorded curve", arrows=8):
    """The curve itself, coloured from the first sample (light) to the last (dark).

    Arrows show the direction of travel (clockwise travel of a stress-strain
    or p-V loop, with x = strain or volume, is energy dissipated); a ring
    marks the first sample.  Gaps (NaN rows) stay gaps.
    """
    xy = as_float_array(xy, "xy", ndim=2, allow_nan=True)
    if xy.shape[1] != 2:
        raise ValueError(f"xy must have shape (T, 2), got {xy.shape}")
    if xy.shape[0] < 2:
        raise ValueError(f"xy needs at least 2 samples, got {xy.shape[0]}")
    names = _labels(names, 2)
    arrows = int(arrows)
    _, plt, _ = _mpl()
    from matplotlib.collections import LineCollection
    from matplotlib.colors import LinearSegmentedColormap

    ax = _axes(ax, (6, 5.5))
    seg = np.stack([xy[:-1], xy[1:]], axis=1)
    ok = np.isfinite(seg).all(axis=(1, 2))
    ramp = LinearSegmentedColormap.from_list("wedgepath_time", ["#9fc5c6", _TEAL, "#06323b"])
    lc = LineCollection(seg[ok], cmap=ramp, linewidths=0.8)
    lc.set_array(np.flatnonzero(ok).astype(float))
    ax.add_collection(lc)
    cb = ax.figure.colorbar(lc, ax=ax, fraction=0.046, pad=0.04)
    cb.set_label("sample number")
    good = np.flatnonzero(ok)
    if arrows > 0 and good.size:
        for k in good[np.linspace(0, good.size - 1, arrows + 2).astype(int)[1:-1]]:
            ax.annotate("", xy=xy[k + 1], xytext=xy[k],
                        arrowprops=dict(arrowstyle="-|>", color=_ORANGE, lw=1.2,
                                        mutation_scale=14))
    first = np.flatnonzero(np.isfinite(xy).all(axis=1))
    if first.size:
        ax.plot(*xy[first[0]], "o", mfc="none", mec=_ORANGE, ms=9, mew=1.6, label="first sample")
        ax.legend(frameon=False, fontsize=8, loc="best")
    if np.isfinite(xy).any():
        _fit_limits(ax, xy)
    ax.set_xlabel(names[0])
    ax.set_ylabel(names[1])
    ax.set_title(title, color=_INK)
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
        # each pair named the way round in which it leads on average: lines above zero
        pairs = [(i, j) if np.nanmean(areas[:, i, j]) >= 0 else (j, i) for i, j in pairs]
    ax = _axes(ax, (7, 4))
    palette = [_ORANGE, _TEAL, "#8a6d3b", "#5b4a8a", "#2f7d3b", "#a33b5c"]
    for k, (i, j) in enumerate(pairs):
        ax.plot(t, areas[:, i, j], color=palette[k % len(palette)], lw=1.6,
                label=f"{names[i]} over {names[j]}")
    ax.axhline(0, color="#9a9488", lw=0.8)
    ax.set_xlabel(xlabel)
    ax.set_ylabel("A[i, j] per window  (> 0: i leads)")
    ax.set_title(title, color=_INK)
    ax.legend(frameon=False, fontsize=8, loc="best")
    return ax


def cycle_bars(values, ax=None, title="Per-cycle loop integral", ylabel="value per cycle",
               reference=None, reference_label="expected"):
    """Per-cycle values as points on a scale fitted to them, with the mean and +-1 std band.

    ``reference`` draws a known or expected value as a dashed line.  Cycles
    with no value (NaN) are marked on the axis.
    """
    vals = as_float_array(values, "values", ndim=1, allow_nan=True)
    if reference is not None:
        reference = float(as_float_array(reference, "reference", ndim=0))
    ax = _axes(ax, (8, 3.6))
    k = np.arange(1, vals.size + 1)
    ok = np.isfinite(vals)
    ax.plot(k[ok], vals[ok], "o-", color=_TEAL, ms=6, lw=0.8, label="cycle")
    if (~ok).any():
        ax.plot(k[~ok], np.full((~ok).sum(), np.nanmin(vals) if ok.any() else 0), "x",
                color="#8a857b", label="no value")
    if ok.any():
        m, sd = float(np.mean(vals[ok])), float(np.std(vals[ok]))
        ax.axhline(m, color=_ORANGE, lw=1.5, label=f"mean {m:.4g}")
        if sd > 0:
            ax.axhspan(m - sd, m + sd, color=_ORANGE, alpha=0.12, lw=0, label=f"+-1 std ({sd:.2g})")
    if reference is not None:
        ax.axhline(reference, color=_INK, lw=1.2, ls="--", label=f"{reference_label} {reference:.4g}")
    ax.set_xlabel("cycle")
    ax.set_ylabel(ylabel)
    ax.set_title(title, color=_INK)
    if vals.size:
        ax.set_xlim(0.4, vals.size + 0.6)
    from matplotlib.ticker import MaxNLocator
    ax.xaxis.set_major_locator(MaxNLocator(integer=True))
    ax.legend(frameon=False, fontsize=8, loc="upper left", bbox_to_anchor=(1.01, 1.0))
    return ax


def _png(fig):
    _, plt, _ = _mpl()
    buf = io.BytesIO()
    fig.tight_layout()
    fig.savefig(buf, format="png", facecolor="white")
    plt.close(fig)
    return buf.getvalue()


def _with_unit(name, units):
    """``name [unit]`` (text from the data: escaped by :func:`_labels` where it is drawn)."""
    unit = (units or {}).get(name)
    return f"{name} [{unit}]" if unit else str(name)


def _literal_text():
    """rc settings under which labels are plain text (a user's usetex would read LaTeX)."""
    matplotlib, _, _ = _mpl()
    return matplotlib.rc_context({"text.usetex": False})


def leadlag_figures(report, units=None) -> dict:
    """PNG files (name -> bytes) for a lead-lag report made by the command line.

    ``units`` maps column names (channels or the time column) to units for the axis labels.
    A report without a cyclic order (a zero area matrix) gets a ``phases.png`` that says so.
    Names and units are drawn literally (a ``$`` is not math).
    """
    with _literal_text():
        return _leadlag_figures(report, units)


def _leadlag_figures(report, units):
    names = report["channels"]
    A = np.asarray(report["area_matrix"], dtype=float)
    idx = {nm: k for k, nm in enumerate(names)}
    co = report["cyclic_order"]
    order = None if co is None else [idx[nm] for nm in co["order"]]
    label = "lead strength" if report.get("normalize") else "oriented area A[i, j]"
    out = {}
    ax = lead_heatmap(A, names, order, label=label,
                      title="Lead matrix" + ("" if co is None else ", channels in cyclic order"))
    out["lead_matrix.png"] = _png(ax.figure)
    if co is None:
        # always drawn (the set of files is known before the run): says why it is empty
        _, plt, _ = _mpl()
        fig, ax = plt.subplots(figsize=(5.5, 5.5), dpi=110)
        ax.axis("off")
        ax.text(0.5, 0.5, "No cyclic order:\nthe area matrix is zero\n(no channel leads "
                "another)", ha="center", va="center", color=_INK, transform=ax.transAxes)
        out["phases.png"] = _png(fig)
    else:
        ph = np.array([co["positions_rad"][nm] for nm in names])
        mod = np.array([co["moduli"][nm] for nm in names])
        ax = phase_circle(ph, names, mod, order,
                          title=f"Phase of each channel (fit {co['fit']:.2f})")
        out["phases.png"] = _png(ax.figure)
    if "rolling" in report:
        r = report["rolling"]
        tcol = (report.get("input") or {}).get("time_column")
        xlabel = ("window centre, " + _literal(_with_unit(tcol, units))) if tcol else \
            "window centre (sample number)"
        ax = rolling_lead(r["start_time"], r["end_time"], r["areas"], names,
                          title=f"Rolling lead, windows of {r['window']} samples "
                                "(raw areas)" if report.get("normalize") else
                                f"Rolling lead, windows of {r['window']} samples",
                          xlabel=xlabel)
        out["rolling_lead.png"] = _png(ax.figure)
    return out


def loop_figures(xy, names, report, closure="chord", units=None, reference=None,
                 reference_label="expected", decomposition=None) -> dict:
    """PNG files (name -> bytes) for a loop report made by the command line.

    ``loop.png``: the faces by winding number beside the curve itself with its
    direction; ``cycles.png``: the per-cycle values (``reference``: a known
    value to draw beside them; an empty chart when there is no complete
    cycle).  ``units`` maps the two names to units.  ``decomposition``: the
    curve's :func:`~wedgepath.decompose` when already computed.  Names and
    units are drawn literally (a ``$`` is not math).
    """
    with _literal_text():
        return _loop_figures(xy, names, report, closure, units, reference, reference_label,
                             decomposition)


def _loop_figures(xy, names, report, closure, units, reference, reference_label,
                  decomposition):
    from .planar import decompose
    _, plt, _ = _mpl()
    out = {}
    labels = [_with_unit(n, units) for n in names]
    dec = decomposition if decomposition is not None else \
        decompose(np.asarray(xy, dtype=float), closure=closure)
    fig, (a1, a2) = plt.subplots(1, 2, figsize=(11, 4.8), dpi=110)
    loop_faces(dec, xy, labels, ax=a1, title="Faces by winding number")
    loop_path(xy, labels, ax=a2, title="The curve and its direction")
    fig.suptitle(f"{_literal(names[1])} against {_literal(names[0])}", color=_INK)
    out["loop.png"] = _png(fig)
    c = report["cycles"]
    # always drawn, so that the set of files is known before the run (an empty chart says so)
    unit = " x ".join(f"[{(units or {}).get(n)}]" for n in names[::-1] if (units or {}).get(n))
    ax = cycle_bars(c["values"], title=f"{c['quantity']} ({len(c['values'])} cycles)",
                    ylabel="per cycle" + (f", {_literal(unit)}" if unit else ""),
                    reference=reference, reference_label=reference_label)
    if not len(c["values"]):
        ax.text(0.5, 0.5, "no complete cycle", transform=ax.transAxes, ha="center",
                va="center", color=_INK)
    out["cycles.png"] = _png(ax.figure)
    return out


def _degrees(rad):
    return rad * 180.0 / math.pi
