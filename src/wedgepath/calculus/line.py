"""Line integrals: 1-forms along paths, and constant 2-forms through their boundary.

==========================  ===============================================  =========
form                        method                                           error
==========================  ===============================================  =========
constant 1-form             sum of increments (telescoping)                  exact
polynomial coefficients     Gauss-Legendre with enough points per segment    exact
other coefficients          adaptive Gauss-Kronrod on intervals of the       estimate
                            segments (:mod:`~wedgepath.calculus.adaptive`)
constant 2-form             primitive (1/2)(x_i dx_j - x_j dx_i) on the      exact
                            closed boundary (Stokes)
==========================  ===============================================  =========

The adaptive rule works on *intervals* ``[lo, hi]`` of the local parameter
``s`` in [0, 1] of each segment.  Each interval gets the (2n+1)-point
Gauss-Kronrod value and the QUADPACK error estimate
``resasc * min(1, (200 |K - G| / resasc)**1.5)``, at least ``50 eps`` times
the integral of ``|integrand|`` (Piessens et al., QUADPACK, Springer 1983,
routine QK15), with ``resasc`` the Kronrod rule applied to
``|integrand - mean|``.  Before the first evaluation every segment is cut into
intervals no longer than ``diameter / resolution`` (the diagonal of the path's
bounding box).
"""

from __future__ import annotations

import numpy as np

from .adaptive import Estimate, adapt_batched, kronrod_estimate
from .forms import Coefficient, Form
from .integral import EPS, Accumulator
from .paths import Path
from .quadrature import (LinearGeometry, SplineGeometry, gauss_kronrod, gauss_legendre,
                         points_needed)

__all__ = ["integrate_1form", "integrate_constant_2form", "DEFAULT_ORDER"]

#: Gauss points of the default Gauss-Kronrod pair (G7/K15)
DEFAULT_ORDER = 7
#: quadrature points evaluated per chunk (bounds memory to about
#: ``_CHUNK_POINTS * n * 8`` bytes per temporary array)
_CHUNK_POINTS = 1 << 18


# --------------------------------------------------------------------------- geometry
def _geometries(piece: Path, closure: str, curve: str):
    """Segment geometries of one gap-free piece under a closure and curve model."""
    if piece.n_samples < 2:
        return []
    if curve == "linear":
        return [LinearGeometry(piece.close(closure).points)]
    # spline: fit through the (detrended / snapped) samples; a chord stays straight
    closed = piece.close(closure) if closure in ("detrend", "require") else piece
    pts = closed.points
    t = closed.times if closed.times is not None else np.arange(closed.n_samples, dtype=np.float64)
    periodic = bool(np.array_equal(pts[0], pts[-1]))
    geoms = [SplineGeometry(pts, t, periodic)]
    if closure == "chord" and not periodic:
        geoms.append(LinearGeometry(np.vstack([pts[-1], pts[0]])))
    return geoms


def linear_segments(path: Path, closure: str, centre: bool = False):
    """All straight segments of a path under closure "none" or "chord", vectorised over pieces.

    With ``centre`` every segment is expressed relative to the first sample of
    its piece (for precision of translation-invariant quantities).
    """
    pts = path.points
    starts, stops = path.piece_bounds()
    delta = np.diff(pts, axis=0)
    if path.has_gaps:
        valid = ~np.isnan(delta).any(axis=1)
        seg_start, delta = pts[:-1][valid], delta[valid]
    else:
        seg_start = pts[:-1]
    if centre:
        lengths = stops - starts
        ref = np.repeat(pts[starts], np.maximum(lengths - 1, 0), axis=0)
        seg_start = seg_start - ref
    if closure == "chord":
        long_enough = (stops - starts) >= 2
        a, b = pts[stops[long_enough] - 1], pts[starts[long_enough]]
        chord_start = a - b if centre else a
        seg_start = np.concatenate([seg_start, chord_start])
        delta = np.concatenate([delta, b - a])
    return LinearGeometry.from_segments(seg_start, delta)


def _path_geometries(path, closure, curve):
    if curve == "linear" and closure in ("none", "chord"):
        return [linear_segments(path, closure)]
    return [g for pc in path.pieces for g in _geometries(pc, closure, curve)]


# --------------------------------------------------------------------------- integrands
def _integrand_cells(geom, varying, seg, s, strict=True):
    """Pulled-back integrand (B, m) at parameters ``s`` (B, m) of segments ``seg`` (B,).

    Also returns the cells where a coefficient was not finite (None when ``strict``).
    """
    x, v = geom.evaluate_cells(seg, s)
    B, m, n = x.shape
    pts = x.reshape(B * m, n)
    out = np.zeros((B, m))
    bad = None if strict else np.zeros(B, dtype=bool)
    for i, coef in varying:
        f = coef.evaluate(pts, f"coefficient of dx{i}", strict=strict).reshape(B, m)
        if not strict:
            nan = np.isnan(f)
            if nan.any():
                bad |= nan.any(axis=1)
        out += f * v[:, :, i]
    return out, bad


def _fixed_rule(geom, varying, m):
    """m-point Gauss-Legendre on whole segments: (sum, sum of |segment values|, evaluations)."""
    xq, wq = gauss_legendre(m)
    K = geom.n_segments
    total, scale = 0.0, 0.0
    step = max(1, _CHUNK_POINTS // m)
    for a in range(0, K, step):
        b = min(K, a + step)
        s = np.broadcast_to(xq, (b - a, m))
        f, _ = _integrand_cells(geom, varying, np.arange(a, b), s)
        vals = np.einsum("ij,j->i", f, wq)
        total += float(vals.sum())
        scale += float(np.abs(vals).sum())
    return total, scale, K * m * len(varying)


class Intervals:
    """Cell type of the adaptive driver: intervals ``[lo, hi]`` of segments of geometries."""

    def __init__(self, geoms, varying, order):
        self.geoms = geoms
        self.varying = varying
        self.x, self.wk, self.wg = gauss_kronrod(order)
        self.evaluations_per_cell = self.x.size * len(varying)
        self.lengths = [g.lengths() for g in geoms]

    def prepare(self, resolution):
        """Number of intervals of the minimum subdivision of every segment (owner)."""
        lo_corner, hi_corner = None, None
        for g in self.geoms:
            a, b = g.bounds()
            lo_corner = a if lo_corner is None else np.minimum(lo_corner, a)
            hi_corner = b if hi_corner is None else np.maximum(hi_corner, b)
        diameter = float(np.linalg.norm(hi_corner - lo_corner))
        L = np.concatenate(self.lengths)
        if diameter > 0:
            with np.errstate(over="ignore", invalid="ignore"):
                n = np.ceil(L * (resolution / diameter))
            n = np.clip(np.nan_to_num(n, nan=1.0), 1, 1 << 20).astype(np.int64)
        else:
            n = np.ones(L.size, dtype=np.int64)
        self.counts = n
        self.sizes = L
        # owner (global segment number) -> geometry and segment within it
        self.geom_of = np.repeat(np.arange(len(self.geoms)),
                                 [g.n_segments for g in self.geoms])
        self.seg_of = np.concatenate([np.arange(g.n_segments) for g in self.geoms])
        return L.size

    def first_pass(self, n_owners):
        """Evaluations of the first pass, per segment (owner)."""
        return self.counts * self.evaluations_per_cell

    def initial(self, lo, hi):
        """Cells of the minimum subdivision of segments (owners) lo..hi-1."""
        n = self.counts[lo:hi]
        owner = np.repeat(np.arange(lo, hi), n)
        first = np.repeat(np.cumsum(n) - n, n)
        j = np.arange(owner.size) - first
        nn = n[owner - lo].astype(np.float64)
        return {"owner": owner, "geom": self.geom_of[owner], "seg": self.seg_of[owner],
                "lo": j / nn, "hi": (j + 1) / nn}

    def measure(self, cells):
        return self.sizes[cells["owner"]] * (cells["hi"] - cells["lo"])

    def split(self, cells):
        mid = 0.5 * (cells["lo"] + cells["hi"])
        return {"geom": np.tile(cells["geom"], 2), "seg": np.tile(cells["seg"], 2),
                "owner": np.tile(cells["owner"], 2),
                "lo": np.concatenate([cells["lo"], mid]),
                "hi": np.concatenate([mid, cells["hi"]])}

    def where(self, cells, i):
        g = self.geoms[int(cells["geom"][i])]
        s = 0.5 * (cells["lo"][i] + cells["hi"][i])
        x, _ = g.evaluate(np.array([cells["seg"][i]]), np.array([s]))
        return f"about the point {x[0].tolist()}"

    def evaluate(self, cells, strict):
        B = cells["seg"].size
        m = self.x.size
        out = [np.empty(B) for _ in range(4)]
        bad = None if strict else np.zeros(B, dtype=bool)
        geom_ids = cells["geom"]
        for gi, g in enumerate(self.geoms):
            rows = np.flatnonzero(geom_ids == gi)
            step = max(1, _CHUNK_POINTS // m)
            for a in range(0, rows.size, step):
                r = rows[a:a + step]
                lo, hi, seg = cells["lo"][r], cells["hi"][r], cells["seg"][r]
                h = hi - lo
                s = lo[:, None] + h[:, None] * self.x[None, :]
                f, nonfinite = _integrand_cells(g, self.varying, seg, s, strict)
                if not strict:
                    bad[r] = nonfinite
                res = kronrod_estimate(f, h, self.wk, self.wg)
                for o, v in zip(out, res):
                    o[r] = v
        return Estimate(*out, bad=bad)


# --------------------------------------------------------------------------- 1-forms
def integrate_1form(form: Form, path: Path, closure: str, curve: str, opts) -> Accumulator:
    acc = Accumulator()
    const = {k[0]: c.value for k, c in form.terms.items() if c.kind == "constant"}
    varying = [(k[0], c) for k, c in form.terms.items() if c.kind != "constant"]
    if closure == "require":
        path.close("require")  # refuses when a piece is not closed within tolerance

    # Constant part: telescoping sum of increments; a closed piece contributes zero.
    if const and closure == "none":
        idx = np.fromiter(const.keys(), dtype=np.intp)
        cvec = np.fromiter(const.values(), dtype=np.float64)
        starts, stops = path.piece_bounds()
        first, last = path.points[starts][:, idx], path.points[stops - 1][:, idx]
        total = float(cvec @ (last - first).sum(axis=0))
        scale = float(np.abs(cvec) @ (np.abs(last) + np.abs(first)).sum(axis=0))
        acc.add(total, method="sum of increments (exact)", rounding=EPS * scale)
    elif const:
        acc.add(0.0, method="sum of increments (exact)")

    if not varying:
        return acc
    geoms = [g for g in _path_geometries(path, closure, curve) if g.n_segments]
    if not geoms:
        return acc
    degs = [c.poly_degree for _, c in varying]
    if all(d is not None for d in degs):
        deg = max(degs)
        for g in geoms:
            m = points_needed(g.degree_factor * deg + g.degree_offset)
            val, scale, nev = _fixed_rule(g, varying, m)
            acc.add(val, 0.0, True,
                    f"Gauss-Legendre, {m} points per segment (exact for degree {deg})",
                    EPS * scale * 4, nev)
        return acc
    order = opts.order or DEFAULT_ORDER
    cells = Intervals(geoms, varying, order)
    n = cells.prepare(opts.resolution)
    outcome = adapt_batched(cells, n, cells.initial, opts, sizes=cells.sizes, batch=1 << 16)
    acc.add_outcome(outcome, f"adaptive Gauss-Kronrod {order}/{2 * order + 1} points")
    return acc


# --------------------------------------------------------------------------- 2-forms
def integrate_constant_2form(form: Form, path: Path, closure: str, curve: str) -> Accumulator:
    """A constant 2-form over the surface a closed path bounds: the boundary primitive."""
    acc = Accumulator()
    if closure == "none":
        for pc in path.pieces:
            if pc.n_samples >= 2 and not np.array_equal(pc.points[0], pc.points[-1]):
                raise ValueError("a 2-form needs a closed boundary but the path is open and "
                                 "closure='none'; choose closure='chord', 'detrend' or 'require'")
    terms = [(i, j, c.value) for (i, j), c in form.terms.items()]
    if not terms:
        acc.add(0.0, method="constant 2-form via boundary primitive (exact)")
        return acc
    coefs = {}
    for i, j, c in terms:
        # primitive (c/2)(x_i dx_j - x_j dx_i)
        coefs.setdefault(j, []).append((0.5 * c, i))
        coefs.setdefault(i, []).append((-0.5 * c, j))
    varying = [(k, Coefficient.from_callable(_linear_combination(lst), poly_degree=1))
               for k, lst in sorted(coefs.items())]
    # A constant 2-form's integral over a surface spanning a closed curve is
    # translation invariant: each piece is taken relative to a point of its own.
    if curve == "linear" and closure in ("none", "chord"):
        geom_lists = [[linear_segments(path, closure, centre=True)]]
    else:
        geom_lists = []
        for pc in path.pieces:
            if pc.n_samples < 2:
                continue
            ref = np.mean(pc.points, axis=0)
            centred = Path._trusted(pc.points - ref, pc.times, None, gap_rows=None)
            geom_lists.append(_geometries(centred, closure, curve))
    for geoms in geom_lists:
        for g in geoms:
            m = points_needed(g.degree_factor * 1 + g.degree_offset)
            val, scale, _ = _fixed_rule(g, varying, m)
            acc.add(val, 0.0, True, "constant 2-form via boundary primitive (exact)",
                    EPS * scale * 4)
    return acc


def _linear_combination(lst):
    ws = np.array([w for w, _ in lst])
    idx = np.array([i for _, i in lst])

    def f(coords):
        return coords[:, idx] @ ws
    return f
