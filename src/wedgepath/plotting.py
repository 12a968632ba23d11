"""Figures of lead-lag structure and loops (needs the optional matplotlib extra).

Every function takes the library's result objects (an
:class:`~wedgepath.AreaMatrix`, a :class:`~wedgepath.CyclicOrder`, a
:class:`~wedgepath.RollingAreas`, a :class:`~wedgepath.CycleAreas`, a
:class:`~wedgepath.Path` or :class:`~wedgepath.Decomposition`), draws onto a
matplotlib Axes you pass (or a new figure) and returns the Axes, so the
figures compose into your own layouts.  :func:`rolling_pairs` and
:func:`loop_overview` draw whole figures and return the Figure.

What each figure answers:

:func:`cycle_positions`
    Where is each channel in the cycle?  One row per channel, in cyclic order,
    its position on a line from 0 to 2π rad, with its bootstrap interval and
    the positions found in rolling windows when given.
:func:`pair_chart`
    Who leads whom, how strongly, and is it significant?  One row per pair,
    named leader → lagger, the bar's length the lead, its fill the verdict.
:func:`rolling_pairs`
    Does the lead hold over time?  Small multiples of the strongest pairs.
:func:`band_leads`
    Which frequency band carries the lead?  One panel per strong pair, a signed
    bar per band, the all-frequency total beside them.
:func:`loop_path`, :func:`loop_faces`, :func:`cycle_values`, :func:`loop_overview`
    The loop as recorded with its direction (one shade per cycle), its faces
    by winding number, and the per-cycle integral with mean ± std (ddof=1).

Text from data (channel names, units) is drawn literally: a ``$`` never
starts math text.
"""

from __future__ import annotations

import contextlib
import io
import math

import numpy as np

from ._validation import as_float_array

__all__ = ["cycle_positions", "pair_chart", "rolling_pairs", "band_leads", "loop_path",
           "loop_faces", "cycle_values", "loop_overview", "png_bytes", "literal_text",
           "with_unit"]

# our palette: ink, a slate blue (counter-clockwise, significant), an ochre (clockwise),
# greys for what is secondary
INK, SLATE, OCHRE = "#1f2933", "#33658a", "#c08a2b"
GREY, LIGHT, RULE = "#7b8794", "#d9e2ec", "#bcccdc"


def _index_pairs(pairs, n):
    """``pairs`` as a list of (i, j) channel index tuples, checked against ``n`` channels."""
    pairs = [tuple(int(v) for v in pq) for pq in pairs]
    if any(len(pq) != 2 or not all(0 <= v < n for v in pq) for pq in pairs):
        raise ValueError(f"pairs must be (i, j) channel index pairs below {n}")
    return pairs


def _grid(count):
    """``(panels, rows, columns)`` of small multiples: one column up to three panels."""
    m = max(1, count)
    ncol = 1 if m <= 3 else 2
    return m, int(math.ceil(m / ncol)), ncol


def _mpl():
    import matplotlib
    matplotlib.use("Agg", force=False)
    import matplotlib.pyplot as plt
    return matplotlib, plt


def _literal(text) -> str:
    """``text`` drawn as it is: a ``$`` is escaped so that matplotlib never reads math text.

    Channel names and units come from data files; ``cost_$_total`` beside
    ``price_$`` would otherwise open a math span (garbled labels, or a parse
    error that stops the figure).
    """
    return str(text).replace("$", "\\$")


def _unit_label(name, units=None) -> str:
    unit = (units or {}).get(name)
    return f"{name} [{unit}]" if unit else str(name)


def with_unit(name, units=None) -> str:
    """``name [unit]``, escaped to be drawn literally."""
    return _literal(_unit_label(name, units))


@contextlib.contextmanager
def literal_text():
    """rc settings under which labels are plain text (a user's usetex would read LaTeX)."""
    matplotlib, _ = _mpl()
    with matplotlib.rc_context({"text.usetex": False}):
        yield


def _names(obj, names, n, what="names"):
    if names is None:
        names = getattr(obj, "names", None)
    if names is None:
        names = [str(k) for k in range(n)]
    if isinstance(names, str) or not hasattr(names, "__len__"):
        raise TypeError(f"{what} must be a sequence of {n} channel names")
    names = list(names)
    if len(names) != n:
        raise ValueError(f"{what} has {len(names)} entries for {n} channels")
    return [_literal(nm) for nm in names]


def _axes(ax, size):
    _, plt = _mpl()
    if ax is None:
        _, ax = plt.subplots(figsize=size, dpi=110)
    return ax


def _square(A, what):
    M = as_float_array(np.asarray(A), what, ndim=2, allow_nan=True)
    if M.shape[0] != M.shape[1] or M.shape[0] < 2:
        raise ValueError(f"{what} must be a square matrix of at least 2 channels, got shape "
                         f"{M.shape}")
    return M


def _style(ax):
    for side in ("top", "right"):
        ax.spines[side].set_visible(False)
    ax.spines["left"].set_color(RULE)
    ax.spines["bottom"].set_color(RULE)
    ax.tick_params(colors=INK, labelsize=8)


def png_bytes(fig) -> bytes:
    """The figure as PNG bytes (white background); the figure is closed."""
    _, plt = _mpl()
    buf = io.BytesIO()
    fig.savefig(buf, format="png", facecolor="white", bbox_inches="tight")
    plt.close(fig)
    return buf.getvalue()


# =========================================================================== positions
_PI_TICKS = ["0", "π/4", "π/2", "3π/4", "π", "5π/4", "3π/2", "7π/4", "2π"]


def _window_positions(rolling, ref, max_windows=400):
    """Positions (K', n) of the windows' cyclic orders from channel ``ref`` (zero windows
    skipped; at most ``max_windows`` windows, evenly spread)."""
    from .signals import cyclic_order
    R = np.asarray(rolling, dtype=float)
    keep = np.unique(np.linspace(0, R.shape[0] - 1, min(R.shape[0], max_windows)).astype(int))
    out = []
    for k in keep:
        W = np.nan_to_num(R[k], nan=0.0)
        if np.any(W):
            out.append(np.asarray(cyclic_order(W, start=ref).positions, dtype=float))
    return np.asarray(out).reshape(-1, R.shape[1])


def cycle_positions(order, *, names=None, low=None, high=None, rolling=None,
                    fit_baseline=None, confidence=None, ax=None, title=None):
    """Each channel's position in the cycle on a line from 0 to 2π rad, one row per channel.

    Parameters
    ----------
    order : CyclicOrder or None
        From :func:`~wedgepath.cyclic_order`; None draws an empty chart that says
        there is no cyclic order.
    names : sequence of str, optional
        Channel names (default: the order's).
    low, high : array_like (n,), optional
        An interval of each position (radians; ``low > high`` wraps past 2π),
        e.g. from a block bootstrap (:func:`wedgepath.report.leadlag` with ``n_boot``).
    rolling : RollingAreas, optional
        Windows whose own cyclic orders are drawn as faint ticks on each row:
        how stable the position is over time.
    fit_baseline, confidence : float, optional
        For the title and the legend.

    Rows run top to bottom in cyclic order (each channel leads the next), so
    names sit one per row and never overlap.  A hollow marker is a channel that
    takes little part in the cycle (share below 0.3): its position means little.
    """
    if order is None:
        ax = _axes(ax, (7.5, 2.6))
        ax.axis("off")
        ax.text(0.5, 0.5, "No cyclic order: the area matrix is zero\n(no channel leads "
                "another)", ha="center", va="center", color=INK, transform=ax.transAxes)
        return ax
    if not (hasattr(order, "positions") and hasattr(order, "order")):
        raise TypeError(f"cycle_positions needs a CyclicOrder (from wp.cyclic_order), got "
                        f"{type(order).__name__}")
    pos = as_float_array(order.positions, "positions", ndim=1)
    n = pos.shape[0]
    seq = [int(k) for k in np.asarray(order.order)]
    if sorted(seq) != list(range(n)):
        raise ValueError(f"order must be a permutation of the {n} channel indices")
    labels = _names(order, names, n)
    mod = as_float_array(getattr(order, "moduli", np.ones(n)), "moduli", ndim=1)
    if (low is None) != (high is None):
        raise ValueError("low and high go together")
    if low is not None:
        low = as_float_array(low, "low", ndim=1)
        high = as_float_array(high, "high", ndim=1)
        if low.shape != (n,) or high.shape != (n,):
            raise ValueError(f"low and high need {n} entries (one per channel)")
    ax = _axes(ax, (7.5, 1.3 + 0.42 * n))
    two_pi = 2 * np.pi
    row = {ch: r for r, ch in enumerate(seq)}
    for r in range(n):
        if r % 2 == 0:
            ax.axhspan(r - 0.5, r + 0.5, color="#f0f4f8", lw=0, zorder=0)
    handles = {}
    if rolling is not None:
        W = _window_positions(rolling, seq[0])
        for ch in range(n):
            if W.size:
                h = ax.scatter(W[:, ch], np.full(W.shape[0], row[ch]), marker="|", s=90,
                               color=INK, alpha=0.3, lw=1, zorder=3.5)
                handles["windows"] = h
    if low is not None:
        for ch in range(n):
            a, b, y = low[ch], high[ch], row[ch]
            spans = [(a, b)] if a <= b else [(a, two_pi), (0.0, b)]
            for s0, s1 in spans:
                h, = ax.plot([s0, s1], [y, y], color=SLATE, lw=3, alpha=0.45,
                             solid_capstyle="butt", zorder=3)
            handles["interval"] = h
    strong = mod >= 0.3
    ys = np.array([row[ch] for ch in range(n)])
    h1 = ax.scatter(pos[strong], ys[strong], s=60, color=SLATE, edgecolor=INK, lw=0.8,
                    zorder=4)
    if (~strong).any():
        handles["weak"] = ax.scatter(pos[~strong], ys[~strong], s=60, facecolor="white",
                                     edgecolor=SLATE, lw=1.2, zorder=4)
    for ch in range(n):
        ax.annotate(f"{mod[ch]:.2f}", (1.0, row[ch]), xycoords=("axes fraction", "data"),
                    xytext=(6, 0), textcoords="offset points", va="center", fontsize=7,
                    color=GREY)
    ax.annotate("share", (1.0, -0.5), xycoords=("axes fraction", "data"), xytext=(6, 2),
                textcoords="offset points", va="bottom", fontsize=7, color=GREY)
    ax.set_yticks(range(n), [labels[ch] for ch in seq])
    ax.set_ylim(n - 0.5, -0.5)
    ax.set_xlim(-0.08, two_pi + 0.08)
    ax.set_xticks(np.arange(9) * np.pi / 4, _PI_TICKS)
    for k in range(9):
        ax.axvline(k * np.pi / 4, color=RULE, lw=0.6 if k % 2 else 0.9, zorder=1)
    ax.set_xlabel(f"position in the cycle after {labels[seq[0]]} [rad]  (keeps the order, "
                  "not the delays)", color=INK, fontsize=8)
    _style(ax)
    ax.spines["left"].set_visible(False)
    ax.tick_params(axis="y", length=0)
    if title is None:
        title = f"Position of each channel in the cycle (fit {order.fit:.3f}"
        pv = getattr(order, "fit_pvalue", None)
        if pv is not None:           # the calibrated verdict (wedgepath.fit_test)
            title += f"; {'above' if pv <= 0.05 else 'not above'} noise, p = {pv:.3g})"
        elif n <= 3:
            title += f": always 1 for {n} channels)"
        elif fit_baseline is not None:
            title += f"; independent noise gives {fit_baseline:.2f})"
        else:
            title += ")"
    ax.set_title(title, color=INK, fontsize=10, loc="left")
    leg = [(h1, "position (filled: share ≥ 0.3)")]
    if "weak" in handles:
        leg.append((handles["weak"], "share < 0.3: position unreliable"))
    if "interval" in handles:
        leg.append((handles["interval"], "bootstrap interval" + (
            f" ({100 * confidence:.0f}%)" if confidence is not None else "")))
    if "windows" in handles:
        leg.append((handles["windows"], "in rolling windows"))
    from matplotlib.transforms import offset_copy
    # under the axis label, at a fixed distance whatever the number of rows
    ax.legend(*zip(*leg), frameon=False, fontsize=7, loc="upper left", ncol=len(leg),
              bbox_to_anchor=(0.0, 0.0),
              bbox_transform=offset_copy(ax.transAxes, ax.figure, y=-30, units="points"))
    return ax


# =========================================================================== pairs
def pair_chart(areas, *, raw=None, significance=None, bootstrap=None, names=None, top=20,
               alpha=0.05, ax=None, title=None):
    """Every pair's lead with its direction and significance, strongest first.

    Parameters
    ----------
    areas : AreaMatrix or array_like (n, n)
        The matrix to chart (raw areas, or normalised: its ``normalize`` says which).
    raw : AreaMatrix, optional
        The raw areas, when ``areas`` is normalised (for the bootstrap intervals).
    significance : SurrogateResult, optional
        Its q-values decide each bar's fill: solid where q <= ``alpha``, hollow
        where not; grey when no test was made.
    bootstrap : BootstrapResult, optional
        Intervals of the raw areas, drawn as whiskers when the chart shows raw areas.
    top : int
        Pairs shown (the strongest).

    Each row is one pair written leader → lagger, so the direction is read in
    the name; the bar's length is the size of the lead.
    """
    M = _square(areas, "areas")
    n = M.shape[0]
    labels = _names(areas, names, n)
    normalize = getattr(areas, "normalize", None)
    q = None
    if significance is not None:
        q = _square(significance.qvalues, "qvalues")
        if q.shape != M.shape:
            raise ValueError(f"significance is for {q.shape[0]} channels, areas for {n}")
    pairs = [(i, j) for i in range(n) for j in range(i + 1, n) if np.isfinite(M[i, j])]
    pairs.sort(key=lambda ij: -abs(M[ij]))
    shown = pairs[:int(top)]
    ax = _axes(ax, (7.5, 1.4 + 0.3 * max(len(shown), 2)))
    ys = np.arange(len(shown))
    rows = []
    for y, (i, j) in zip(ys, shown):
        a, b = (i, j) if M[i, j] >= 0 else (j, i)
        rows.append(f"{labels[a]} → {labels[b]}")
        v = abs(M[i, j])
        if q is None:
            style = dict(color=LIGHT, edgecolor=GREY)
        elif np.isfinite(q[i, j]) and q[i, j] <= alpha:
            style = dict(color=SLATE, edgecolor=INK)
        else:
            style = dict(color="white", edgecolor=SLATE)
        ax.barh(y, v, height=0.62, lw=0.9, zorder=3, **style)
        if bootstrap is None or normalize is not None:     # no whisker there: the value
            ax.annotate(f"{v:.3g}", (v, y), xytext=(3, 0), textcoords="offset points",
                        va="center", fontsize=7, color=GREY)
        if q is not None:
            # q-values in a column of their own at the right, clear of bars and whiskers
            ax.annotate(f"{q[i, j]:.3g}" if np.isfinite(q[i, j]) else "-", (1.0, y),
                        xycoords=("axes fraction", "data"), xytext=(6, 0),
                        textcoords="offset points", va="center", fontsize=7, color=INK)
    if q is not None:
        ax.annotate("q", (1.0, -0.6), xycoords=("axes fraction", "data"), xytext=(6, 2),
                    textcoords="offset points", va="bottom", fontsize=7, color=GREY)
    if bootstrap is not None and normalize is None:
        lo, hi = np.asarray(bootstrap.low, dtype=float), np.asarray(bootstrap.high, dtype=float)
        for y, (i, j) in zip(ys, shown):
            s = 1.0 if M[i, j] >= 0 else -1.0
            a, b = sorted((s * lo[i, j], s * hi[i, j]))
            ax.plot([max(a, 0.0), b], [y, y], color=INK, lw=0.9, zorder=4)
            ax.plot([v for v in (a, b) if v >= 0], [y] * sum(v >= 0 for v in (a, b)), "|",
                    color=INK, ms=6, zorder=4)
    ax.set_yticks(ys, rows)
    ax.set_ylim(len(shown) - 0.5, -0.6)
    ax.axvline(0, color=INK, lw=0.8)
    what = (f"lead strength, normalised ({normalize})" if normalize else
            "oriented area |A[i, j]| (raw)")
    ax.set_xlabel(what, color=INK, fontsize=8)
    ax.grid(axis="x", color=RULE, lw=0.5, zorder=0)
    _style(ax)
    ax.tick_params(axis="y", length=0)
    if title is None:
        title = "Who leads whom" + (f": the {len(shown)} strongest of {len(pairs)} pairs"
                                    if len(shown) < len(pairs) else f": {len(pairs)} pairs")
    ax.set_title(title, color=INK, fontsize=10, loc="left")
    from matplotlib.patches import Patch
    if q is not None:
        leg = [Patch(facecolor=SLATE, edgecolor=INK, label=f"significant (q ≤ {alpha:g})"),
               Patch(facecolor="white", edgecolor=SLATE, label="not significant")]
    else:
        leg = [Patch(facecolor=LIGHT, edgecolor=GREY, label="not tested (no surrogates)")]
    if bootstrap is not None and normalize is None:
        from matplotlib.lines import Line2D
        leg.append(Line2D([], [], color=INK, lw=1, label="bootstrap interval"))
    from matplotlib.transforms import offset_copy
    ax.legend(handles=leg, frameon=False, fontsize=7, loc="upper left", ncol=len(leg),
              bbox_to_anchor=(0.0, 0.0),
              bbox_transform=offset_copy(ax.transAxes, ax.figure, y=-30, units="points"))
    xmax = max((abs(M[ij]) for ij in shown), default=1.0) or 1.0
    if bootstrap is not None and normalize is None:
        ends = [max(abs(lo[ij]), abs(hi[ij])) for ij in shown]
        xmax = max([xmax] + [e for e in ends if np.isfinite(e)])
        ax.set_xlim(0, 1.04 * xmax)
    else:
        ax.set_xlim(0, 1.12 * xmax)              # room for the values at the bars' ends
    return ax


# =========================================================================== rolling
def rolling_pairs(rolling, *, names=None, pairs=None, top=6, xlabel="window centre",
                  rows=False, title=None):
    """Small multiples: the raw area of each of the strongest pairs over the windows.

    Parameters
    ----------
    rolling : RollingAreas
        From :func:`~wedgepath.rolling_area_matrix` (windows with their times).
    pairs : sequence of (i, j), optional
        The pairs to draw (default: the ``top`` of largest mean ``|A[i, j]|``,
        each named the way round in which it leads on average).
    rows : bool
        Place windows by data row (from 1) instead of by time.

    Returns
    -------
    matplotlib.figure.Figure
        One panel per pair, sharing both axes so that magnitudes compare.
    """
    if not hasattr(rolling, "start_time"):
        raise TypeError(f"rolling_pairs needs a RollingAreas (from wp.rolling_area_matrix), "
                        f"got {type(rolling).__name__}")
    R = as_float_array(np.asarray(rolling), "rolling areas", ndim=3, allow_nan=True)
    K, n = R.shape[0], R.shape[1]
    if R.shape[2] != n:
        raise ValueError(f"rolling areas must have shape (windows, n, n), got {R.shape}")
    labels = _names(rolling, names, n)
    if rows:
        a = np.asarray(rolling.start, dtype=float) + 1
        b = np.asarray(rolling.stop, dtype=float)
    elif getattr(rolling, "time_unit", None) == "ISO-8601":
        # datetimes: ISO text back to instants (UTC for zoned times); a datetime axis
        from ._time import parse_iso
        a = parse_iso(list(rolling.start_time), name="start_time")[0].astype("datetime64[us]")
        b = parse_iso(list(rolling.stop_time), name="stop_time")[0].astype("datetime64[us]")
    else:
        a = np.asarray(rolling.start_time, dtype=float)
        b = np.asarray(rolling.stop_time, dtype=float)
    t = a + (b - a) / 2
    if pairs is None:
        strength = np.nanmean(np.abs(R), axis=0) if K else np.zeros((n, n))
        cand = sorted(((strength[i, j], i, j) for i in range(n) for j in range(i + 1, n)),
                      reverse=True)[:int(top)]
        pairs = [(i, j) if np.nanmean(R[:, i, j]) >= 0 else (j, i) for _, i, j in cand]
    else:
        pairs = _index_pairs(pairs, n)
    _, plt = _mpl()
    m, nrow, ncol = _grid(len(pairs))
    # one scale so that magnitudes compare, unless it would flatten a pair to a line
    peaks = [np.nanmax(np.abs(R[:, i, j])) if K else 0.0 for i, j in pairs]
    peaks = [p for p in peaks if np.isfinite(p) and p > 0]
    shared = not peaks or max(peaks) <= 10 * min(peaks)
    fig, axes = plt.subplots(nrow, ncol, figsize=(8.5 if ncol == 2 else 7, 0.6 + 1.7 * nrow),
                             dpi=110, sharex=True, sharey=shared, squeeze=False,
                             layout="constrained")
    for k, axk in enumerate(axes.flat):
        if k >= len(pairs):
            axk.axis("off")
            continue
        i, j = pairs[k]
        v = R[:, i, j]
        axk.fill_between(t, 0, v, where=v >= 0, color=SLATE, alpha=0.25, lw=0,
                         interpolate=True)
        axk.fill_between(t, 0, v, where=v < 0, color=OCHRE, alpha=0.3, lw=0, interpolate=True)
        axk.plot(t, v, color=INK, lw=1.0)
        axk.axhline(0, color=GREY, lw=0.7)
        axk.set_title(f"{labels[i]} → {labels[j]}", fontsize=8, color=INK, loc="left")
        _style(axk)
    for axk in axes[-1]:
        axk.set_xlabel(xlabel, fontsize=8, color=INK)
    for axk in axes[:, 0]:
        axk.set_ylabel("raw A[i, j]", fontsize=8, color=INK)
    fig.suptitle(title or "Rolling lead (raw areas per window)", fontsize=10, color=INK,
                 x=0.02, ha="left")
    # laid out when drawn (cheaper than laying out now and again when saved)
    fig.supxlabel("above 0 (blue): the first channel leads in that window; below 0 "
                  "(ochre): the second" + ("" if shared else
                                           ". Each panel has its own scale (sizes differ by "
                                           "more than 10 times)"), fontsize=7, color=GREY,
                  x=0.02, ha="left")
    return fig


def band_leads(spectrum, *, significance=None, names=None, pairs=None, top=6, title=None,
               alpha=0.05, frequency_unit=None):
    """Small multiples: for each of the strongest pairs, its signed area in every band.

    Parameters
    ----------
    spectrum : LeadSpectrum
        From :func:`~wedgepath.lead_spectrum`.
    significance : BandSignificance, optional
        From :func:`~wedgepath.band_surrogate_test` with the same bands: bands
        whose q-value exceeds ``alpha`` are drawn hollow.
    pairs : sequence of (i, j), optional
        The pairs to draw (default: the ``top`` pairs with the largest band
        area in any band -- a pair whose bands cancel is still shown -- each
        named the way round in which it leads in its strongest band).
    top : int
    title : str, optional
    alpha : float
        False discovery rate at which a band counts as significant.
    frequency_unit : str, optional
        What the band edges are measured in, for the axis label (default: the
        spectrum's ``frequency_unit``).

    Returns
    -------
    matplotlib.figure.Figure
        One panel per pair: a bar per band in frequency order (above 0: the
        first-named channel leads in that band), the band's normalised value
        printed at the bar, and a dashed line at the area over all
        frequencies (bands plus what lies outside them).
    """
    if not hasattr(spectrum, "band_names") or not hasattr(spectrum, "rest"):
        raise TypeError(f"band_leads needs a LeadSpectrum (from wp.lead_spectrum), got "
                        f"{type(spectrum).__name__}")
    S = as_float_array(np.asarray(spectrum), "band areas", ndim=3, allow_nan=True)
    B, n = S.shape[0], S.shape[1]
    labels = _names(spectrum, names, n)
    total = S.sum(axis=0) + np.asarray(spectrum.rest, dtype=float)
    Nz = np.asarray(spectrum.normalized, dtype=float)
    edges = np.asarray(spectrum.bands, dtype=float)
    order = np.argsort(edges[:, 0], kind="stable")
    q = None
    if significance is not None:
        q = np.asarray(significance.qvalues, dtype=float)
        if q.shape != S.shape:
            raise ValueError(f"significance has shape {q.shape}, the spectrum {S.shape}: "
                             "test the same bands")
    if pairs is None:
        strength = np.nanmax(np.abs(S), axis=0) if B else np.zeros((n, n))
        cand = sorted(((strength[i, j], i, j) for i in range(n) for j in range(i + 1, n)),
                      reverse=True)[:int(top)]
        pairs = []
        for _, i, j in cand:
            b = int(np.nanargmax(np.abs(S[:, i, j]))) if B else 0
            pairs.append((i, j) if (not B or S[b, i, j] >= 0) else (j, i))
    else:
        pairs = _index_pairs(pairs, n)
    _, plt = _mpl()
    m, nrow, ncol = _grid(len(pairs))
    peaks = [max(np.nanmax(np.abs(S[:, i, j])) if B else 0.0, abs(total[i, j]))
             for i, j in pairs]
    peaks = [p for p in peaks if np.isfinite(p) and p > 0]
    shared = not peaks or max(peaks) <= 10 * min(peaks)
    width = max(7.0, min(12.0, 2.0 + 0.45 * B * ncol))
    fig, axes = plt.subplots(nrow, ncol, figsize=(width, 0.9 + 2.0 * nrow), dpi=110,
                             sharex=True, sharey=shared, squeeze=False, layout="constrained")
    x = np.arange(B)
    bars = B <= 60
    xall = B - 1 + (1.6 if bars else max(2.0, 0.04 * B))
    unit = frequency_unit or getattr(spectrum, "frequency_unit", "")
    for k, axk in enumerate(axes.flat):
        if k >= len(pairs):
            axk.axis("off")
            continue
        i, j = pairs[k]
        v = S[order, i, j]
        colours = [SLATE if a >= 0 else OCHRE for a in v]
        if bars:
            sig = np.ones(B, dtype=bool) if q is None else (
                np.nan_to_num(q[order, i, j], nan=1.0) <= alpha)
            for xb, a, c, sg in zip(x, v, colours, sig):
                axk.bar(xb, a, width=0.72, color=c if sg else "white", edgecolor=c, lw=1.2,
                        hatch=None if sg else "////")
            if B <= 24:
                nz = Nz[order, i, j]
                span = np.nanmax(np.abs(v)) if np.any(np.isfinite(v)) else 0.0
                for xb, a, z in zip(x, v, nz):
                    if np.isfinite(z) and span > 0:
                        axk.annotate(f"{z:+.2f}", (xb, a), xytext=(0, 3 if a >= 0 else -3),
                                     textcoords="offset points", ha="center",
                                     va="bottom" if a >= 0 else "top", fontsize=6.5,
                                     color=GREY)
        else:
            axk.fill_between(x, 0, v, where=v >= 0, color=SLATE, alpha=0.35, lw=0,
                             step="mid")
            axk.fill_between(x, 0, v, where=v < 0, color=OCHRE, alpha=0.4, lw=0, step="mid")
            axk.step(x, v, where="mid", color=INK, lw=0.8)
        axk.axhline(0, color=GREY, lw=0.7)
        # the all-frequency area: a separate outlined bar after a gap
        axk.bar(xall, total[i, j], width=0.72, color="white", edgecolor=INK, lw=1.2)
        axk.annotate(f"{total[i, j]:.3g}", (xall, total[i, j]),
                     xytext=(0, 3 if total[i, j] >= 0 else -3), textcoords="offset points",
                     ha="center", va="bottom" if total[i, j] >= 0 else "top", fontsize=6.5,
                     color=INK)
        axk.axvline(xall - 0.8, color=RULE, lw=0.8)
        axk.set_title(f"{labels[i]} → {labels[j]}", fontsize=8, color=INK, loc="left")
        axk.margins(y=0.18)
        _style(axk)
    def _edge(v):
        return f"{v:.3g}"

    if B <= 8:
        names_b = [f"{_literal(spectrum.band_names[b])}\n{_edge(edges[b, 0])}–{_edge(edges[b, 1])}"
                   for b in order]
    else:
        names_b = [_literal(spectrum.band_names[b]) for b in order]
    for axk in axes[-1]:
        if bars:
            axk.set_xticks(list(x) + [xall])
            axk.set_xticklabels(names_b + ["all\nfrequencies"], rotation=30 if B > 8 else 0,
                                ha="right" if B > 8 else "center", fontsize=7)
        else:
            # many bands: a few ticks at band lower edges, and the all-frequency bar
            at = np.unique(np.linspace(0, B - 1, 6).round().astype(int))
            axk.set_xticks(list(at) + [xall])
            axk.set_xticklabels([_edge(edges[order[k], 0]) for k in at] + ["all"], fontsize=7)
        axk.set_xlabel(f"band ({_literal(unit)}), low to high frequency" if bars else
                       f"lower edge of the band ({_literal(unit)})", fontsize=8, color=INK)
    for axk in axes[:, 0]:
        axk.set_ylabel("raw band area", fontsize=8, color=INK)
    fig.suptitle(title or "Lead by frequency band (signed raw areas)", fontsize=10, color=INK,
                 x=0.02, ha="left")
    note = ("above 0 (blue): the first-named channel leads in that band; below 0 (ochre): it "
            "lags.\n" + ("Grey numbers: band area / band energies, in [-1, 1], comparable across "
                          "bands. " if bars and B <= 24 else "")
            + "Outlined bar: all frequencies.")
    extra = []
    if q is not None:
        extra.append(f"hatched hollow bars: not significant (q > {alpha:g})")
    if not shared:
        extra.append("each panel has its own scale")
    if extra:
        note += "\n" + "; ".join(extra).capitalize() + "."
    fig.supxlabel(note, fontsize=7, color=GREY, x=0.02, ha="left")
    return fig


# =========================================================================== loops
def _xy_of(curve, names):
    from .calculus import Path
    if isinstance(curve, Path):
        xy = np.asarray(curve.points, dtype=float)
        nm = names if names is not None else curve.names
    else:
        xy = as_float_array(curve, "xy", ndim=2, allow_nan=True)
        nm = names
    if xy.ndim != 2 or xy.shape[1] != 2:
        raise ValueError(f"xy must have shape (T, 2), got {xy.shape}")
    if xy.shape[0] < 2:
        raise ValueError(f"xy needs at least 2 samples, got {xy.shape[0]}")
    return xy, _names(None, nm if nm is not None else ("x", "y"), 2)


def _fit_limits(ax, xy, margin=0.05):
    if not np.isfinite(xy).any():
        return
    lo, hi = np.nanmin(xy, axis=0), np.nanmax(xy, axis=0)
    pad = margin * np.where(hi > lo, hi - lo, 1.0)
    ax.set_xlim(lo[0] - pad[0], hi[0] + pad[0])
    ax.set_ylim(lo[1] - pad[1], hi[1] + pad[1])


def loop_path(curve, *, names=None, cycles=None, ax=None, title=None, arrows=6):
    """The recorded curve with its direction of travel, in the data's own units.

    Parameters
    ----------
    curve : Path or array_like (T, 2)
        The curve as recorded (a Path's names label the axes).
    cycles : CycleAreas, optional
        Cycles of the curve: each drawn in its own shade (light: first, dark:
        last), so a loop traced many times stays readable; samples outside
        every complete cycle (partial cycles at the ends or next to a gap)
        are grey.  Without cycles the shade follows the rows.
    arrows : int
        Arrows along the curve showing the direction of travel.

    The first sample is ringed.  Gaps (NaN rows) stay gaps.  For a
    stress-strain or p-V loop with strain or volume on x, clockwise travel is
    energy dissipated.
    """
    xy, labels = _xy_of(curve, names)
    from matplotlib.collections import LineCollection
    from matplotlib.colors import LinearSegmentedColormap

    ax = _axes(ax, (6, 5))
    T = xy.shape[0]
    seg = np.stack([xy[:-1], xy[1:]], axis=1)
    ok = np.isfinite(seg).all(axis=(1, 2))
    ramp = LinearSegmentedColormap.from_list("wedgepath_cycles", ["#9fb3c8", SLATE, "#102a43"])
    which = np.full(T - 1, -1.0)
    count = 0
    if cycles is not None:
        start = np.asarray(cycles.start,
                           dtype=float)
        stop = np.asarray(cycles.stop, dtype=float)
        whole = np.asarray(getattr(cycles, "complete", np.ones(start.size, dtype=bool)),
                           dtype=bool)
        count = start.size
        mid = np.arange(T - 1) + 0.5
        for k, (s0, s1) in enumerate(zip(start, stop)):
            if whole[k]:                 # partial cycles (ends, gaps) stay grey
                which[(mid >= s0) & (mid < s1)] = k
    if count and (which >= 0).any():     # else (no complete cycle): shade by data row
        inside = ok & (which >= 0)
        out = ok & (which < 0)
        if out.any():
            ax.add_collection(LineCollection(seg[out], colors=LIGHT, linewidths=0.8))
        lc = LineCollection(seg[inside], cmap=ramp, linewidths=0.9)
        lc.set_array(which[inside] + 1)
        lc.set_clim(0.5, count + 0.5)
        ax.add_collection(lc)
        cb = ax.figure.colorbar(lc, ax=ax, fraction=0.046, pad=0.03)
        cb.set_label("cycle", fontsize=8)
        from matplotlib.ticker import MaxNLocator
        cb.locator = MaxNLocator(integer=True, nbins=min(count, 6))
        cb.update_ticks()
    else:
        lc = LineCollection(seg[ok], cmap=ramp, linewidths=0.9)
        lc.set_array(np.flatnonzero(ok).astype(float) + 1)
        ax.add_collection(lc)
        cb = ax.figure.colorbar(lc, ax=ax, fraction=0.046, pad=0.03)
        cb.set_label("data row", fontsize=8)
    cb.ax.tick_params(labelsize=7)
    good = np.flatnonzero(ok)
    if arrows > 0 and good.size:
        for k in good[np.linspace(0, good.size - 1, int(arrows) + 2).astype(int)[1:-1]]:
            ax.annotate("", xy=xy[k + 1], xytext=xy[k],
                        arrowprops=dict(arrowstyle="-|>", color=OCHRE, lw=1.6,
                                        mutation_scale=22), zorder=5)
    first = np.flatnonzero(np.isfinite(xy).all(axis=1))
    if first.size:
        ax.plot(*xy[first[0]], "o", mfc="none", mec=OCHRE, ms=9, mew=1.6, label="first sample")
        ax.plot([], [], color=OCHRE, marker=">", ls="none", label="direction of travel")
        ax.legend(frameon=False, fontsize=7, loc="best")
    _fit_limits(ax, xy)
    ax.set_xlabel(labels[0], color=INK, fontsize=8)
    ax.set_ylabel(labels[1], color=INK, fontsize=8)
    _style(ax)
    ax.set_title(title or "The recorded curve", color=INK, fontsize=10, loc="left")
    return ax


def loop_faces(decomposition, *, names=("x", "y"), ax=None, title=None, max_faces=20000):
    """The faces of a closed curve, shaded by winding number, on axes of their own.

    Blue for counter-clockwise (w > 0), ochre for clockwise (w < 0), deeper
    for larger ``|w|``.  The faces are those of the closed curve that was
    measured (for ``closure="detrend"`` the detrended curve), so they are never
    drawn over the recorded data.
    """
    from .planar import Decomposition
    if not isinstance(decomposition, Decomposition):
        raise TypeError(f"loop_faces needs a Decomposition (from wp.decompose), got "
                        f"{type(decomposition).__name__}")
    labels = _names(None, names, 2)
    _, plt = _mpl()
    import shapely
    from matplotlib.collections import PatchCollection
    from matplotlib.colors import to_rgb
    from matplotlib.patches import Polygon as MplPolygon

    ax = _axes(ax, (6, 5))
    faces, wind = decomposition.faces, np.asarray(decomposition.winding)
    if len(faces) > max_faces:  # keep the largest faces; a figure cannot show more
        keep = np.argsort(-np.asarray(decomposition.areas))[:max_faces]
        faces, wind = faces[keep], wind[keep]
    lim = max(1, int(np.abs(wind).max())) if wind.size else 1
    patches, colours = [], []
    for face, w in zip(faces, wind):
        base = np.array(to_rgb(SLATE if w > 0 else OCHRE))
        t = 0.0 if w == 0 else 0.35 + 0.65 * abs(int(w)) / lim
        colour = (1 - t) * np.ones(3) + t * base
        for poly in shapely.get_parts(face):
            patches.append(MplPolygon(np.asarray(poly.exterior.coords), closed=True))
            colours.append(colour)
    if patches:
        ax.add_collection(PatchCollection(patches, facecolors=colours, edgecolors=INK,
                                          linewidths=0.3))
        bounds = np.array([f.bounds for f in faces])
        lo, hi = bounds[:, :2].min(axis=0), bounds[:, 2:].max(axis=0)
        pad = 0.05 * np.where(hi > lo, hi - lo, 1.0)
        ax.set_xlim(lo[0] - pad[0], hi[0] + pad[0])
        ax.set_ylim(lo[1] - pad[1], hi[1] + pad[1])
    from matplotlib.patches import Patch
    present = sorted({int(w) for w in wind}, key=lambda w: (-abs(w), -w))[:6]
    leg = []
    for w in sorted(present):
        base = np.array(to_rgb(SLATE if w > 0 else OCHRE))
        t = 0.0 if w == 0 else 0.35 + 0.65 * abs(w) / lim
        leg.append(Patch(facecolor=(1 - t) * np.ones(3) + t * base, edgecolor=INK, lw=0.3,
                         label=f"w = {w:+d}" if w else "w = 0"))
    if leg:
        ax.legend(handles=leg, frameon=False, fontsize=7, loc="upper left",
                  bbox_to_anchor=(1.0, 1.0), title="winding number", title_fontsize=7)
    ax.set_xlabel(labels[0], color=INK, fontsize=8)
    ax.set_ylabel(labels[1], color=INK, fontsize=8)
    _style(ax)
    ax.set_title(title or "Faces by winding number", color=INK, fontsize=10, loc="left")
    return ax


def cycle_values(cycles, *, ax=None, title="Per-cycle integral", ylabel="value per cycle",
                 reference=None, reference_label="expected"):
    """Per-cycle values with their mean and a ±1 standard deviation band (ddof=1).

    ``cycles``: a :class:`~wedgepath.CycleAreas` (its mean and std are drawn:
    the numbers the text reports) or an array of values (None: no cycle).
    ``reference`` draws a known or expected value as a dashed line.  Cycles
    with no value (NaN: a gap) are marked on the axis.
    """
    if cycles is None:
        vals = np.zeros(0)
        mean = sd = math.nan
    elif hasattr(cycles, "count") and hasattr(cycles, "mean") and not isinstance(cycles,
                                                                              np.ndarray):
        vals = as_float_array(cycles.values,
                              "values", ndim=1, allow_nan=True)
        mean, sd = float(cycles.mean), float(cycles.std)
    else:
        vals = as_float_array(cycles, "values", ndim=1, allow_nan=True)
        ok = np.isfinite(vals)
        mean = float(np.mean(vals[ok])) if ok.any() else math.nan
        sd = float(np.std(vals[ok], ddof=1)) if ok.sum() > 1 else math.nan
    if reference is not None:
        reference = float(as_float_array(reference, "reference", ndim=0))
    ax = _axes(ax, (8, 3.6))
    k = np.arange(1, vals.size + 1)
    ok = np.isfinite(vals)
    if np.isfinite(mean):
        if np.isfinite(sd) and sd > 0:
            ax.axhspan(mean - sd, mean + sd, color=SLATE, alpha=0.13, lw=0,
                       label=f"±1 std {sd:.3g} (ddof=1)")
        ax.axhline(mean, color=SLATE, lw=1.4, label=f"mean {mean:.6g}")
    ax.plot(k[ok], vals[ok], "o-", color=INK, ms=5, lw=0.7, label="cycle", zorder=3)
    if (~ok).any():
        ax.plot(k[~ok], np.full((~ok).sum(), np.nanmin(vals) if ok.any() else 0), "x",
                color=GREY, label="partial cycle (no value)")
    if reference is not None:
        ax.axhline(reference, color=OCHRE, lw=1.3, ls="--",
                   label=f"{_literal(reference_label)} {reference:.6g}")
    if not vals.size:
        ax.text(0.5, 0.5, "no complete cycle", transform=ax.transAxes, ha="center",
                va="center", color=INK)
    ax.set_xlabel("cycle", color=INK, fontsize=8)
    ax.set_ylabel(_literal(ylabel), color=INK, fontsize=8)
    ax.set_title(_literal(title), color=INK, fontsize=10, loc="left")
    if vals.size:
        ax.set_xlim(0.4, vals.size + 0.6)
    from matplotlib.ticker import MaxNLocator
    ax.xaxis.set_major_locator(MaxNLocator(integer=True))
    _style(ax)
    if ax.get_legend_handles_labels()[0]:
        ax.legend(frameon=False, fontsize=7, loc="upper left", bbox_to_anchor=(1.01, 1.0))
    return ax


def loop_overview(report, *, reference=None, reference_label="expected"):
    """The figure of a :class:`~wedgepath.report.LoopReport`: the loop and what it measures.

    Left: the recorded curve with its direction, one shade per cycle
    (:func:`loop_path`).  Right: the faces by winding number when they tell
    something (lobes of opposite sign on a curve traced about once, see
    ``LoopReport.faces_informative``), drawn on their own axes (the closed
    curve that was measured, e.g. detrended), else the per-cycle values
    (:func:`cycle_values`).  Returns the Figure.
    """
    _, plt = _mpl()
    x, y = report.names
    labels = (_unit_label(x, report.units), _unit_label(y, report.units))   # escaped there
    fig, (a1, a2) = plt.subplots(1, 2, figsize=(12, 4.8), dpi=110,
                                 gridspec_kw={"width_ratios": [1.1, 1]}, layout="constrained")
    sa = report.signed_area
    dec = report.decomposition
    if dec.mixed_signs and dec.cancellation >= 0.01:
        turn = "lobes turning both ways"
    else:
        turn = "counter-clockwise" if sa > 0 else "clockwise" if sa < 0 else "no net turn"
    loop_path(report.path, names=labels, cycles=report.cycles, ax=a1,
              title=f"The recorded curve: {turn}, signed area {sa:.4g}")
    if report.faces_informative():
        how = "" if report.closure in ("chord", "none", "require") else \
            f" (of the curve after closure={report.closure})"
        loop_faces(report.decomposition, names=labels, ax=a2,
                   title="Faces by winding number" + how)
    else:
        cycle_values(report.cycles, ax=a2, title=f"{report.quantity} per cycle",
                     ylabel=report._value_label(), reference=reference,
                     reference_label=reference_label)
    fig.suptitle(f"{_literal(y)} against {_literal(x)}", color=INK, fontsize=11, x=0.02,
                 ha="left")
    return fig
