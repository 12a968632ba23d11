"""Draw the figures of the user guide and of docs/cli.md into docs/figures/.

Run: ``python docs/make_figures.py`` (needs matplotlib).  The convention figures
are drawn here; the report figures (``leadlag_*.png``, ``loop_*.png``) are the
ones ``wedgepath demo --out DIR`` writes, made by the same calls
(:mod:`wedgepath.report` on the bundled demo data), plus the loop report of a
figure-eight, where the faces tell something.  The figures are committed;
tests/test_docs.py draws them again and checks what they show (panels, titles, the
areas stated against the curves drawn, the demo's cyclic order) and that the committed
files match.
"""

import sys
from pathlib import Path

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402

import wedgepath as wp  # noqa: E402

OUT = Path(__file__).resolve().parent / "figures"
TEAL, ORANGE, INK, GREY = "#0b5563", "#c4581b", "#22262a", "#9a9488"


def arrow_along(ax, xy, k, color):
    a, b = xy[k], xy[k + 1]
    ax.annotate("", xy=b, xytext=a, arrowprops=dict(arrowstyle="-|>", color=color, lw=1.5))


def orientation(path):
    t = np.linspace(0, 2 * np.pi, 200)
    fig, axes = plt.subplots(1, 2, figsize=(8.5, 3.8), dpi=110)
    for ax, phi, title in ((axes[0], 1.0, "x leads y: counter-clockwise, A[x, y] > 0"),
                           (axes[1], -1.0, "y leads x: clockwise, A[x, y] < 0")):
        xy = np.c_[np.sin(t), np.sin(t - phi)]
        ax.fill(xy[:, 0], xy[:, 1], color=ORANGE if phi > 0 else TEAL, alpha=0.25)
        ax.plot(xy[:, 0], xy[:, 1], color=INK, lw=1.2)
        for k in (10, 60, 110, 160):
            arrow_along(ax, xy, k, INK)
        A = wp.area_matrix(xy)[0, 1]
        ax.set_title(f"{title}\nA = {A:.3f} = π sin φ ≈ {np.pi * np.sin(phi):.3f}", fontsize=9)
        ax.set_xlabel("x = sin t")
        ax.set_ylabel("y = sin(t − φ)")
        ax.set_aspect("equal")
    fig.tight_layout()
    fig.savefig(path)
    plt.close(fig)
    return fig


def closure(path):
    rng = np.random.default_rng(4)
    t = np.linspace(0, 1.7 * np.pi, 120)
    xy = np.c_[np.cos(t), np.sin(t)] + 0.02 * rng.normal(size=(120, 2)) + np.c_[0.25 * t / t[-1], 0 * t]
    p = wp.Path(xy)
    fig, axes = plt.subplots(1, 3, figsize=(11, 3.8), dpi=110)
    for ax, how in zip(axes, ("chord", "detrend", "require")):
        ax.plot(xy[:, 0], xy[:, 1], color=GREY, lw=1, label="recorded (open)")
        if how == "require":
            try:
                p.close("require")
                msg = "closed"
            except ValueError as exc:
                import textwrap
                msg = "refused:\n" + textwrap.fill(str(exc).split(";")[0], 34)
            ax.text(0.5, 0.5, msg, transform=ax.transAxes, ha="center", va="center", fontsize=8,
                    color=ORANGE, wrap=True)
            ax.set_title('closure="require"', fontsize=9)
        else:
            c = p.close(how).points
            ax.fill(c[:, 0], c[:, 1], color=ORANGE, alpha=0.2)
            ax.plot(c[:, 0], c[:, 1], color=INK, lw=1.2, label=f"closed ({how})")
            area = wp.signed_area(p, closure=how)
            ax.set_title(f'closure="{how}": area {area:.3f}', fontsize=9)
        ax.set_aspect("equal")
        ax.legend(fontsize=7, loc="lower left", frameon=False)
    fig.tight_layout()
    fig.savefig(path)
    plt.close(fig)
    return fig


def curve_model(path):
    rng = np.random.default_rng(2)
    t = np.sort(np.concatenate([[0, 2 * np.pi], rng.uniform(0, 2 * np.pi, 9)]))
    xy = np.c_[np.cos(t), 0.6 * np.sin(t)]
    xy[-1] = xy[0]
    from scipy.interpolate import CubicSpline
    cs = CubicSpline(t, xy, bc_type="periodic")
    tt = np.linspace(0, 2 * np.pi, 400)
    fig, ax = plt.subplots(figsize=(5.5, 4), dpi=110)
    ax.plot(np.cos(tt), 0.6 * np.sin(tt), color=GREY, lw=3, alpha=0.5, label="true curve")
    ax.plot(xy[:, 0], xy[:, 1], "-o", color=TEAL, lw=1.2, ms=4, label="linear model")
    ax.plot(*cs(tt).T, color=ORANGE, lw=1.2, label='curve="spline" (cubic in time)')
    lin = wp.signed_area(xy)
    spl = float(wp.integrate(wp.dx(0) ^ wp.dx(1), wp.Path(xy, times=t), curve="spline"))
    ax.set_title(f"11 irregular samples of an ellipse (area {0.6 * np.pi:.4f})\n"
                 f"linear {lin:.4f}, spline {spl:.4f}", fontsize=9)
    ax.set_aspect("equal")
    ax.legend(fontsize=7, frameon=False, loc="lower right")
    fig.tight_layout()
    fig.savefig(path)
    plt.close(fig)
    return fig


def gaps(path):
    t = np.linspace(0, 4 * np.pi, 240)
    xy = np.c_[np.cos(t), np.sin(t)] * (1 + 0.1 * t)[:, None]
    xy[70:95] = np.nan
    xy[170:180] = np.nan
    p = wp.Path(xy)
    fig, ax = plt.subplots(figsize=(5.5, 4.5), dpi=110)
    colors = [TEAL, ORANGE, INK]
    for k, piece in enumerate(p.pieces):
        c = piece.close("chord").points
        ax.fill(c[:, 0], c[:, 1], color=colors[k % 3], alpha=0.12)
        ax.plot(c[:, 0], c[:, 1], color=colors[k % 3], lw=1.2,
                label=f"piece {k + 1}: area {wp.signed_area(piece):.2f}")
    ax.set_title(f"NaN rows split a path into pieces, each closed on its own;\n"
                 f"their areas add: total {wp.signed_area(p):.2f}", fontsize=9)
    ax.set_aspect("equal")
    ax.legend(fontsize=7, frameon=False, loc="upper left")
    fig.tight_layout()
    fig.savefig(path)
    plt.close(fig)
    return fig


def report_figures(out):
    """The demo's report figures, and the loop report of a drifting figure-eight.

    Returns ``{name: Figure}`` (closed, for inspection).
    """
    import math

    from wedgepath import demo, plotting, report

    out = Path(out)
    figs = {}

    def save(name, fig):
        (out / f"{name}.png").write_bytes(plotting.png_bytes(fig))
        figs[name] = fig

    ring = demo.bundled("ring_sensors.csv")
    rep = report.leadlag(ring, **demo.LEADLAG_OPTIONS, progress=False, time_name="time_s",
                         units={"time_s": "s"})
    for name, fig in rep.figures().items():
        save("leadlag_" + name.removesuffix(".png"), fig)
    load = demo.bundled("load_test.csv")
    lrep = report.loop(load, progress=False, units={"strain": "mm/mm", "stress_MPa": "MPa"})
    truth = math.pi * demo.LOAD["eta"] * 2 * math.pi * demo.LOAD["f"] * demo.LOAD["e0"] ** 2
    loop_figs = lrep.figures(reference=truth, reference_label="known value")
    save("loop_load_test", loop_figs["loop.png"])
    save("loop_cycles", loop_figs["cycles.png"])
    # a figure-eight with a drift, closed by detrend: the faces are shown, on their own axes
    t = np.linspace(0, 2 * np.pi, 801)
    xy = np.c_[np.sin(t), 0.8 * np.sin(2 * t) + np.linspace(0, 0.6, 801)]
    erep = report.loop(xy, names=["u", "v"], closure="detrend", progress=False)
    save("loop_figure_eight", erep.figures()["loop.png"])
    return figs


def main(out=OUT, reports=True):
    """Draw every figure into ``out``; returns ``{name: Figure}`` (closed, for inspection).

    ``reports=False``: the convention figures only.
    """
    out = Path(out)
    out.mkdir(parents=True, exist_ok=True)
    figs = {}
    for fn in (orientation, closure, curve_model, gaps):
        figs[fn.__name__] = fn(out / f"{fn.__name__}.png")
        print("wrote", out / f"{fn.__name__}.png")
    if reports:
        for name, fig in report_figures(out).items():
            figs[name] = fig
            print("wrote", out / f"{name}.png")
    return figs


if __name__ == "__main__":
    main(sys.argv[1] if len(sys.argv) > 1 else OUT)
