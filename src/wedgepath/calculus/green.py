"""Region integrals ``∬ w(x, y) f(x, y) dx∧dy`` of closed planar curves by Green's theorem.

This is the engine behind :func:`wedgepath.region_integral` and behind
``integrate(f dx0^dx1, planar_path)``.  For a closed curve C with winding
number ``w`` and any ``F`` with ``∂F/∂x = f``, Green's theorem gives
``∬ w f dx dy = ∮_C F dy``.  Here ``F(x, y) = ∫_ξ^x f(t, y) dt`` with ``ξ`` the
x-coordinate of a reference point near the curve (the mean vertex of each
piece).  On a straight segment ``(x(s), y(s))``, ``s`` in [0, 1], the boundary
integral becomes an integral over the unit square (a *Green cell*)::

    ∫_0^1 ∫_0^1 f(ξ + u (x(s) - ξ), y(s)) (x(s) - ξ) y'(s) du ds

* polynomial ``f`` of known degree ``d``: ``ceil((d+2)/2)`` Gauss-Legendre
  points in ``s`` and ``ceil((d+1)/2)`` in ``u`` integrate it exactly;
* any other ``f``: the adaptive driver (:mod:`~wedgepath.calculus.adaptive`)
  on Green cells ``[s0, s1] x [u0, u1]``.  Each cell gets the tensor
  Gauss-Kronrod value ``K x K`` and the error estimates of each direction,
  ``|K x K - G x K|`` (in ``s``) and ``|K x K - K x G|`` (in ``u``), all from
  the same ``(2n+1)^2`` values; their sum goes through the QUADPACK formula
  ``resasc * min(1, (200 e / resasc)**1.5)`` (Piessens et al., QUADPACK,
  Springer 1983, routine QK15) and a cell is cut in the direction of the
  larger one.  Before the first evaluation every cell is made no larger than
  ``diameter / resolution`` in both directions (``diameter``: the diagonal of
  the curve's bounding box).

Working relative to a reference point keeps full precision for loops far
from the origin.  ``f`` is evaluated on the horizontal segments between the
reference abscissa and the curve, which may leave the region for non-convex
loops: ``f`` must be finite there (for example on the bounding box of the
curve).
"""

from __future__ import annotations

import numbers

import numpy as np

from .._lazy import is_sympy
from .._validation import as_float_array, as_int, check_choice
from .adaptive import NOISE_FLOOR, Estimate, adapt_batched
from .forms import Coefficient, Form, checked_values
from .integral import EPS, Accumulator
from .paths import CLOSURES, Path
from .quadrature import gauss_kronrod, gauss_legendre, points_needed

__all__ = ["Integrand", "integrand", "planar_path", "closed_pieces", "finite_result",
           "region_accumulator", "DEFAULT_ORDER"]

#: Gauss points of the default Gauss-Kronrod pair in each direction (G7/K15)
DEFAULT_ORDER = 7
#: along segments much shorter than the minimum cell (below a quarter of it), the
#: integrand hardly varies along the cell: the pair G2/K5 is used there (counted with its
#: raw difference in the estimate), which saves two thirds of the evaluations on long,
#: finely sampled loops
SHORT_ORDER = 2
_CHUNK_POINTS = 1 << 18


# --------------------------------------------------------------------------- planar input
def _not_planar(fname: str, n: int) -> ValueError:
    return ValueError(
        f"{fname} needs a planar path with 2 channels, got {n}; select a coordinate "
        f"plane first, e.g. path.plane(0, 1)")


def planar_path(obj, fname: str):
    """Return ``obj`` as a 2-channel :class:`Path`, or None when it has < 2 samples.

    A ``(0, 2)`` or ``(1, 2)`` array has no segment: callers treat it as an
    empty curve (area 0) rather than an error.
    """
    if isinstance(obj, Path):
        if obj.dim != 2:
            raise _not_planar(fname, obj.dim)
        return obj
    names = None
    if hasattr(obj, "columns") and not isinstance(obj, np.ndarray):
        names = [str(c) for c in obj.columns]
    arr = as_float_array(obj, "path", ndim=(1, 2), allow_nan=True, copy=False)
    if arr.ndim == 1:
        raise ValueError(f"{fname} needs points of shape (T, 2), got shape {arr.shape}; "
                         "a single channel has no area")
    if arr.shape[1] != 2:
        raise _not_planar(fname, arr.shape[1])
    if arr.shape[0] < 2:
        return None
    if np.isnan(arr).all():
        return None
    # Path copies the data, so the caller's array is never touched.
    return Path(arr, names=names)


def closed_pieces(path, closure: str, fname: str) -> list:
    """Closed gap-free pieces of a planar path as float64 arrays (K+1, 2).

    Each returned array ends with its first row.  Pieces with a single sample
    are dropped (they bound nothing).  ``closure="none"`` refuses a piece that
    does not end where it starts, naming the other options.
    """
    check_choice(closure, "closure", CLOSURES)
    if path is None:
        return []
    out = []
    for k, pc in enumerate(path.pieces):
        if pc.n_samples < 2:
            continue
        pts = pc.points
        if closure == "none":
            if not np.array_equal(pts[0], pts[-1]):
                gap = float(np.hypot(*(pts[-1] - pts[0])))
                where = f"piece {k} of the path" if len(path.pieces) > 1 else "the path"
                raise ValueError(
                    f"{fname} needs a closed curve, but {where} ends {gap:.6g} away from its "
                    "start and closure='none'; choose closure='chord' (the default), "
                    "'detrend' or 'require' (options: 'none', 'chord', 'detrend', 'require')")
        else:
            pts = pc.close(closure).points
        out.append(pts)
    return out


def finite_result(value, fname: str):
    """Return ``value`` if finite, else refuse: the coordinates overflowed float64."""
    if not np.all(np.isfinite(value)):
        raise ValueError(f"{fname}: the result overflows float64 for coordinates this large; "
                         "rescale the path (e.g. divide it by its largest value)")
    return value


# --------------------------------------------------------------------------- integrands
class Integrand:
    """A scalar integrand f(x, y): constant, or vectorised with an optional degree.

    ``func(x, y, strict=True)`` returns checked float64 values (NaN for
    non-finite values when not ``strict``).
    """

    def __init__(self, kind, value=0.0, func=None, poly_degree=None, label="f"):
        self.kind = kind            # "constant" or "function"
        self.value = value
        self.func = func
        self.poly_degree = poly_degree
        self.label = label


def _from_coefficient(coef: Coefficient, label: str) -> Integrand:
    if coef.kind == "constant":
        return Integrand("constant", value=float(coef.value))

    def func(x, y, strict=True):
        return coef.evaluate(np.column_stack([x, y]), label, strict=strict)
    return Integrand("function", func=func, poly_degree=coef.poly_degree, label=label)


def integrand(f, symbols=None, poly_degree=None) -> Integrand:
    """The integrand of a region integral from a number, callable, sympy expression or 2-form.

    Text is not accepted here (the public wrapper parses it safely first).
    """
    if poly_degree is not None:
        poly_degree = as_int(poly_degree, "poly_degree")
        if poly_degree < 0:
            raise ValueError(f"poly_degree must be >= 0, got {poly_degree}")
    if isinstance(f, Form):
        if f.degree != 2:
            raise ValueError(f"region_integral integrates 2-forms (f dx0^dx1), got a "
                             f"{f.degree}-form")
        if f.dim not in (None, 2):
            raise ValueError(f"the 2-form lives on R^{f.dim}; a planar region needs a form "
                             "on R^2 (integrate over path.plane(i, j) with f dx0^dx1)")
        extra = [k for k in f.terms if k != (0, 1)]
        if extra:
            raise ValueError(f"the 2-form uses dx{max(max(k) for k in extra)} but a planar path "
                             "has 2 channels; write it as f dx0^dx1")
        if not f.terms:
            return Integrand("constant", value=0.0)
        return _from_coefficient(f.terms[(0, 1)], "coefficient of dx0^dx1")
    if isinstance(f, (bool, np.bool_)):
        raise TypeError("the integrand cannot be a boolean")
    if isinstance(f, numbers.Real) or (isinstance(f, np.ndarray) and f.ndim == 0
                                       and f.dtype.kind in "iuf"):
        v = float(f)
        if not np.isfinite(v):
            raise ValueError(f"the integrand must be finite, got {v}")
        return Integrand("constant", value=v)
    if is_sympy(f):
        if not f.free_symbols:
            return _from_coefficient(Coefficient.make(f), "f")
        if symbols is None:
            names = ", ".join(sorted(str(s) for s in f.free_symbols))
            raise ValueError(f"a sympy integrand needs its coordinate symbols: pass "
                             f"symbols=(x, y) (the expression uses {names})")
        syms = tuple(symbols)
        if len(syms) != 2 or not all(is_sympy(s, "Symbol") for s in syms):
            raise ValueError("symbols must be a pair of sympy Symbols (x, y)")
        return _from_coefficient(Coefficient.make(f, syms), "f")
    if callable(f):
        def func(x, y, strict=True):
            # floating-point warnings of the user's function are silenced: a
            # non-finite value is reported as a ValueError naming the point
            with np.errstate(all="ignore"):
                vals = f(x, y)
            return checked_values(vals, x.size, "f",
                                  lambda k: f"({float(x[k])!r}, {float(y[k])!r})", strict)
        return Integrand("function", func=func, poly_degree=poly_degree, label="f")
    raise TypeError(f"the integrand must be a number, a callable f(x, y), a sympy expression "
                    f"or a 2-form, got {type(f).__name__}")


# --------------------------------------------------------------------------- geometry
class _Segments:
    """Non-horizontal boundary segments relative to each piece's reference point."""

    def __init__(self, pieces):
        xs, ys, dxs, dys, rxs, rys = [], [], [], [], [], []
        lo, hi = None, None
        for pts in pieces:
            ref = pts[:-1].mean(axis=0)
            c = pts - ref
            d = np.diff(c, axis=0)
            keep = d[:, 1] != 0.0
            xs.append(c[:-1, 0][keep])
            ys.append(c[:-1, 1][keep])
            dxs.append(d[keep, 0])
            dys.append(d[keep, 1])
            rxs.append(np.full(int(keep.sum()), ref[0]))
            rys.append(np.full(int(keep.sum()), ref[1]))
            a, b = pts.min(axis=0), pts.max(axis=0)
            lo = a if lo is None else np.minimum(lo, a)
            hi = b if hi is None else np.maximum(hi, b)
        cat = (lambda a: np.concatenate(a) if a else np.zeros(0))
        self.x0, self.y0, self.dx, self.dy = cat(xs), cat(ys), cat(dxs), cat(dys)
        self.rx, self.ry = cat(rxs), cat(rys)
        self.length = np.hypot(self.dx, self.dy)
        self.diameter = float(np.hypot(*(hi - lo))) if lo is not None else 0.0

    @property
    def n(self):
        return self.x0.size


def _exact_poly(geo, fn, acc):
    d = fn.poly_degree
    ms, mu = points_needed(d + 1), points_needed(d)
    xs_, ws_ = gauss_legendre(ms)
    xu_, wu_ = gauss_legendre(mu)
    K = geo.n
    total, scale = 0.0, 0.0
    step = max(1, _CHUNK_POINTS // (ms * mu))
    for a in range(0, K, step):
        g = np.arange(a, min(K, a + step))
        Xs = geo.x0[g, None] + xs_[None, :] * geo.dx[g, None]
        Ys = geo.y0[g, None] + xs_[None, :] * geo.dy[g, None]
        X = Xs[:, :, None] * xu_[None, None, :] + geo.rx[g, None, None]
        Y = np.broadcast_to((Ys + geo.ry[g, None])[:, :, None], X.shape)
        f = fn.func(X.ravel(), np.ascontiguousarray(Y).ravel()).reshape(X.shape)
        w = (ws_[:, None] * wu_[None, :])[None] * (Xs * geo.dy[g, None])[:, :, None]
        vals = np.einsum("kij,kij->k", f, w)
        total += float(vals.sum())
        scale += float(np.abs(vals).sum())
    acc.add(total, 0.0, True,
            f"Green's theorem, Gauss-Legendre primitive ({ms}x{mu} points per segment, exact "
            f"for degree {d})", 4 * EPS * scale, K * ms * mu)


class GreenCells:
    """Cell type of the adaptive driver: ``[s0, s1] x [u0, u1]`` of a segment's Green cell."""

    def __init__(self, geo: _Segments, fn: Integrand, order: int):
        self.geo = geo
        self.fn = fn
        self.x, self.wk, self.wg = gauss_kronrod(order)
        self.rule_long = (self.x, self.wk, self.wg)
        self.rule_short = gauss_kronrod(min(order, SHORT_ORDER))
        self.evaluations_per_cell = self.x.size ** 2

    def prepare(self, resolution):
        """Cells per segment (owner) of the minimum subdivision: ``n_s`` along, ``n_u`` across."""
        geo = self.geo
        h = geo.diameter / resolution if geo.diameter > 0 else np.inf
        with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
            ns = np.ceil(geo.length / h)
            reach = np.maximum(np.abs(geo.x0), np.abs(geo.x0 + geo.dx))
            nu = np.ceil(reach / h)
        self.ns = np.clip(np.nan_to_num(ns, nan=1.0), 1, 1 << 16).astype(np.int64)
        self.short = geo.length <= 0.25 * h
        self.nu = np.clip(np.nan_to_num(nu, nan=1.0), 1, 1 << 16).astype(np.int64)
        # the (unsigned) area each segment's Green cell sweeps: its share of atol
        self.sizes = 0.5 * (np.abs(geo.x0) + np.abs(geo.x0 + geo.dx)) * np.abs(geo.dy)
        return geo.n

    def first_pass(self, n_owners):
        """Evaluations of the first pass, per segment (owner)."""
        m_u = self.x.size
        m_s = np.where(self.short, self.rule_short[0].size, self.rule_long[0].size)
        return self.ns * self.nu * m_s * m_u

    def initial(self, lo, hi):
        ns, nu = self.ns[lo:hi], self.nu[lo:hi]
        per = ns * nu
        seg = np.repeat(np.arange(lo, hi), per)
        first = np.repeat(np.cumsum(per) - per, per)
        j = np.arange(seg.size) - first
        ns_, nu_ = ns[seg - lo].astype(np.float64), nu[seg - lo]
        i_s, i_u = np.divmod(j, nu_)
        nu_ = nu_.astype(np.float64)
        return {"owner": seg, "seg": seg, "short": self.short[seg],
                "s0": i_s / ns_, "s1": (i_s + 1) / ns_, "u0": i_u / nu_, "u1": (i_u + 1) / nu_}

    def measure(self, cells):
        """The (unsigned) area of every cell in the plane."""
        geo = self.geo
        g = cells["seg"]
        xa = np.abs(geo.x0[g] + cells["s0"] * geo.dx[g])
        xb = np.abs(geo.x0[g] + cells["s1"] * geo.dx[g])
        return (0.5 * (xa + xb) * np.abs(geo.dy[g]) * (cells["s1"] - cells["s0"])
                * (cells["u1"] - cells["u0"]))

    def split(self, cells):
        cut_s = cells["cut_s"]
        s0, s1, u0, u1 = cells["s0"], cells["s1"], cells["u0"], cells["u1"]
        sm, um = 0.5 * (s0 + s1), 0.5 * (u0 + u1)
        return {"seg": np.tile(cells["seg"], 2), "owner": np.tile(cells["owner"], 2),
                "short": np.tile(cells["short"], 2),
                "s0": np.concatenate([s0, np.where(cut_s, sm, s0)]),
                "s1": np.concatenate([np.where(cut_s, sm, s1), s1]),
                "u0": np.concatenate([u0, np.where(cut_s, u0, um)]),
                "u1": np.concatenate([np.where(cut_s, u1, um), u1])}

    def where(self, cells, i):
        geo = self.geo
        g = int(cells["seg"][i])
        s = 0.5 * (cells["s0"][i] + cells["s1"][i])
        u = 0.5 * (cells["u0"][i] + cells["u1"][i])
        x = geo.rx[g] + u * (geo.x0[g] + s * geo.dx[g])
        y = geo.ry[g] + geo.y0[g] + s * geo.dy[g]
        return f"about ({float(x)!r}, {float(y)!r})"

    def evaluate(self, cells, strict):
        B = cells["seg"].size
        out = {k: np.empty(B) for k in ("val", "err", "mag", "rnd")}
        out["cut"] = np.empty(B, dtype=bool)
        bad = None if strict else np.zeros(B, dtype=bool)
        evaluations = 0
        short = cells["short"]
        for is_short, rule_s in ((False, self.rule_long), (True, self.rule_short)):
            rows = np.flatnonzero(short == is_short)
            if rows.size:
                evaluations += self._evaluate(cells, rows, rule_s, is_short, strict, out, bad)
        cells["cut_s"] = out["cut"]
        return Estimate(out["val"], out["err"], out["mag"], out["mag"], bad, out["rnd"],
                        evaluations)

    def _evaluate(self, cells, rows, rule_s, short, strict, out, bad):
        """Tensor Gauss-Kronrod on the cells ``rows`` (rule_s along the segment)."""
        geo = self.geo
        xs, wks, wgs = rule_s
        xu, wku, wgu = self.x, self.wk, self.wg
        kk = wks[:, None] * wku[None, :]
        gk = wgs[:, None] * wku[None, :]        # Gauss in s, Kronrod in u
        kg = wks[:, None] * wgu[None, :]        # Kronrod in s, Gauss in u
        m = xs.size * xu.size
        step = max(1, _CHUNK_POINTS // m)
        for a in range(0, rows.size, step):
            r = rows[a:a + step]
            g = cells["seg"][r]
            s0, u0 = cells["s0"][r], cells["u0"][r]
            hs, hu = cells["s1"][r] - s0, cells["u1"][r] - u0
            S = s0[:, None] + hs[:, None] * xs[None, :]
            U = u0[:, None] + hu[:, None] * xu[None, :]
            Xs = geo.x0[g, None] + S * geo.dx[g, None]           # centred x on the segment
            Ys = geo.y0[g, None] + S * geo.dy[g, None]
            X = Xs[:, :, None] * U[:, None, :] + geo.rx[g, None, None]
            Y = np.broadcast_to((Ys + geo.ry[g, None])[:, :, None], X.shape)
            f = self.fn.func(X.ravel(), np.ascontiguousarray(Y).ravel(),
                             strict=strict).reshape(X.shape)
            if not strict:
                bad[r] = np.isnan(f).any(axis=(1, 2))
            jac = (Xs * (geo.dy[g] * hs * hu)[:, None])[:, :, None]   # (cells, s, 1)
            q = f * jac                                               # integrand times weight
            v_kk = np.einsum("kij,ij->k", q, kk)
            e_s = np.abs(v_kk - np.einsum("kij,ij->k", q, gk))
            e_u = np.abs(v_kk - np.einsum("kij,ij->k", q, kg))
            resabs = np.einsum("kij,ij->k", np.abs(q), kk)
            resasc = np.einsum("kij,ij->k", np.abs(q - v_kk[:, None, None]), kk)
            # QUADPACK's transform for the Gauss-Kronrod pairs of the full order; a short
            # segment's low-order pair along it counts with its raw difference
            raw = e_u if short else e_s + e_u
            with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
                ratio = np.where(resasc > 0, 200.0 * raw / resasc, 0.0)
                e = np.where((resasc > 0) & (raw > 0),
                             resasc * np.minimum(1.0, ratio ** 1.5), raw)
            if short:
                e = e + e_s
            out["val"][r] = v_kk
            out["err"][r] = np.maximum(e, NOISE_FLOOR * resabs)
            out["mag"][r] = resabs
            out["cut"][r] = e_s >= e_u
            # rounding of the centred vertices (up to eps/2 of coordinates within the
            # diameter) moves the boundary: about eps * diameter * ∮ |f| dl, estimated from
            # the cells that reach the curve (u1 = 1) with their last u-nodes
            edge = cells["u1"][r] == 1.0
            along = np.einsum("ki,i->k", np.abs(f[:, :, -1]), wks) * (geo.length[g] * hs)
            out["rnd"][r] = np.where(edge, 2.0 * EPS * geo.diameter * along, 0.0)
        return rows.size * m


# --------------------------------------------------------------------------- entry point
def region_accumulator(fn: Integrand, pieces, opts) -> Accumulator:
    """∬ w f over the closed ``pieces`` (arrays ending with their first row), not yet warned."""
    acc = Accumulator()
    with np.errstate(over="ignore", invalid="ignore"):
        geo = _Segments([p for p in pieces if not bounds_nothing(p)])
    if not geo.n:
        acc.add(0.0, method="empty region")
        return acc
    if fn.kind == "constant":
        fn = Integrand("function", func=lambda x, y, strict=True: np.full(x.size, fn.value),
                       poly_degree=0)
    with np.errstate(over="ignore", invalid="ignore"):
        if fn.poly_degree is not None:
            _exact_poly(geo, fn, acc)
        else:
            order = opts.order or DEFAULT_ORDER
            cells = GreenCells(geo, fn, order)
            n = cells.prepare(opts.resolution)
            outcome = adapt_batched(cells, n, cells.initial, opts, sizes=cells.sizes,
                                    batch=1 << 12)
            acc.add_outcome(outcome, f"Green's theorem, adaptive Gauss-Kronrod primitive "
                                     f"({order}/{2 * order + 1} points per direction)")
    finite_result([acc.value, acc.error], "region_integral")
    return acc


def bounds_nothing(pts: np.ndarray) -> bool:
    """True when a closed piece has fewer than 3 distinct vertices (it bounds nothing)."""
    if pts.shape[0] < 4:  # closed: 3 distinct vertices need 4 rows
        return True
    other = np.flatnonzero(np.any(pts != pts[0], axis=1))
    if other.size == 0:
        return True
    second = pts[other[0]]
    return bool(np.all(np.all(pts == pts[0], axis=1) | np.all(pts == second, axis=1)))
