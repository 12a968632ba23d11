"""Integration of forms over chains: ``integrate(form, chain)``.

Methods, chosen from the form and the curve model:

==========================  ===============================================  =========
form                        method                                           error
==========================  ===============================================  =========
constant 1-form             sum of increments (telescoping)                  exact
polynomial coefficients     Gauss-Legendre with enough points per segment    exact
other coefficients          two Gauss-Legendre orders per segment, bisect    estimate
                            segments until the estimate meets the tolerance
constant 2-form             primitive (1/2)(x_i dx_j - x_j dx_i) on the      exact
                            closed boundary (Stokes)
0-form on a 0-chain         point evaluation                                 exact
2-form f dx0^dx1, planar    Green's theorem (``planar.region_integral``,     exact for
path                        registered when ``wedgepath.planar`` loads)      polynomials
k-form on a simplicial      determinants / simplex rules (Grundmann-Möller,   exact or
chain (surfaces, cones)     conical product) / adaptive                      estimate
                            (``calculus.simplicial``)
==========================  ===============================================  =========

"Exact" means exact in exact arithmetic; the result's ``rounding`` attribute
estimates the floating-point summation error that remains.  The ``error`` of
an approximate result is the sum over final sub-segments of
``|G_{m+1} - G_m|``, a conservative estimate of the error of the returned
(higher-order) value.

All work is vectorised over segments and done in chunks, so memory stays
bounded for paths with millions of samples.
"""

from __future__ import annotations

import warnings

import numpy as np

from .._validation import check_choice
from .chains import Chain, ZeroChain
from .forms import Coefficient, Form
from .paths import CLOSURES, Path, as_path
from .quadrature import LinearGeometry, SplineGeometry, gauss_legendre, points_needed

__all__ = ["integrate", "Integral", "IntegrationWarning", "register_domain"]

CURVES = ("linear", "spline")
_EPS = np.finfo(np.float64).eps
#: estimates below this multiple of eps * (integral of |integrand|) are rounding noise
_NOISE = 64 * _EPS
#: quadrature points evaluated per chunk (bounds memory to about
#: ``_CHUNK_POINTS * n * 8`` bytes per temporary array)
_CHUNK_POINTS = 1 << 18
#: at most this many sub-segments (or 4 per segment) are refined at once: bounds memory and time
_MAX_ACTIVE = 1 << 20


class IntegrationWarning(UserWarning):
    """The requested tolerance was not reached; the result's ``error`` says by how much."""


class Integral(float):
    """A float with an error estimate and a description of how it was obtained.

    Behaves as a float in arithmetic (results of arithmetic are plain floats).

    Attributes
    ----------
    error : float
        Estimated absolute truncation error; 0.0 when the method is exact.
    exact : bool
        True when the method is exact in exact arithmetic.
    method : str
        Human-readable name of the method(s).
    rounding : float
        Estimated floating-point summation error (a scale, not a bound).
    evaluations : int
        Points at which callable or sympy coefficients were evaluated.
    """

    def __new__(cls, value, *, error=0.0, exact=False, method="", rounding=0.0, evaluations=0):
        self = super().__new__(cls, value)
        self.error = float(error)
        self.exact = bool(exact)
        self.method = str(method)
        self.rounding = float(rounding)
        self.evaluations = int(evaluations)
        return self

    def __repr__(self):
        return (f"Integral({float(self)!r}, error={self.error:.3g}, exact={self.exact}, "
                f"method={self.method!r})")

    def __reduce__(self):
        return (_rebuild_integral, (float(self), self.error, self.exact, self.method,
                                    self.rounding, self.evaluations))


def _rebuild_integral(value, error, exact, method, rounding, evaluations):
    return Integral(value, error=error, exact=exact, method=method, rounding=rounding,
                    evaluations=evaluations)


class _Acc:
    """Accumulates partial integrals from pieces, terms and chain members."""

    def __init__(self):
        self.value = 0.0
        self.error = 0.0
        self.exact = True
        self.methods = []
        self.rounding = 0.0
        self.evaluations = 0

    def add(self, value, error=0.0, exact=True, method=None, rounding=0.0, evaluations=0,
            weight=1.0):
        self.value += weight * value
        self.error += abs(weight) * error
        self.exact = self.exact and exact
        if method and method not in self.methods:
            self.methods.append(method)
        self.rounding += abs(weight) * rounding
        self.evaluations += evaluations

    def merge(self, other: "_Acc", weight=1.0):
        self.add(other.value, other.error, other.exact, None, other.rounding,
                 other.evaluations, weight)
        for m in other.methods:
            if m not in self.methods:
                self.methods.append(m)

    def result(self) -> Integral:
        rounding = self.rounding + _EPS * abs(self.value)
        return Integral(self.value, error=self.error, exact=self.exact,
                        method="; ".join(self.methods) or "empty chain",
                        rounding=rounding, evaluations=self.evaluations)


# Extra domain types (surfaces, regions) register themselves here so that this
# module never imports the modules built on top of it.
_DOMAIN_HANDLERS = []


def register_domain(predicate, handler):
    """Let a higher layer integrate forms over its own domain type.

    ``predicate(form, domain) -> bool`` selects; ``handler(form, domain,
    closure=..., curve=..., **options) -> Integral`` integrates.
    """
    _DOMAIN_HANDLERS.append((predicate, handler))


# --------------------------------------------------------------------------- entry point
def integrate(form, chain, closure=None, curve="linear", *, rtol=1e-10, atol=0.0,
              order=4, max_levels=30):
    """Integrate a differential form over a chain.

    Parameters
    ----------
    form : Form or WhitneyForm
        A 0-form (over a :class:`ZeroChain`), a 1-form (along a path or chain)
        or a 2-form (over the surface a closed path bounds; constant
        coefficients here, planar regions and spanning surfaces in their
        modules); or a Whitney form of a :class:`SimplicialComplex`, over a
        chain of that complex's simplices (exact).
    chain : Path, Chain, ZeroChain or array_like (T, n)
        Where to integrate.  Arrays become :class:`Path`.
    closure : {"none", "chord", "detrend", "require"}, optional
        How each piece of an open path is closed.  Default ``"none"`` for
        1-forms (line integrals of open paths are well defined) and
        ``"chord"`` for 2-forms.
    curve : {"linear", "spline"}
        Curve model between samples.  ``"linear"``: straight segments,
        independent of time stamps.  ``"spline"``: a cubic spline through
        the samples parametrised by time (by sample index when the path has
        no times); periodic when a piece ends exactly where it starts.  A
        ``"chord"`` closure segment is always straight.
    rtol, atol : float
        Tolerance for approximate methods: the estimated error is driven
        below ``max(atol, rtol * S)``, where ``S`` is the sum of absolute
        per-segment contributions (robust when the integral cancels to ~0).
    order : int
        Points of the lower of the two Gauss-Legendre rules used for error
        estimation (the value comes from the ``order + 1`` rule).
    max_levels : int
        Maximum number of segment bisections.  If the tolerance is still not
        met an :class:`IntegrationWarning` is issued and ``error`` reports the
        estimate reached.

    Returns
    -------
    Integral
        A float with ``.error``, ``.exact``, ``.method``, ``.rounding`` and
        ``.evaluations``.

    Examples
    --------
    Constant forms integrate exactly along any polyline:

    >>> import numpy as np, wedgepath as wp
    >>> p = wp.Path([[0, 0], [3, 1], [4, 4]])
    >>> r = wp.integrate(2 * wp.dx(0) + wp.dx(1), p)
    >>> float(r), r.exact, r.error
    (12.0, True, 0.0)

    The oriented area of a closed loop is the integral of dx0 ^ dx1:

    >>> float(wp.integrate(wp.dx(0) ^ wp.dx(1), [[0, 0], [2, 0], [2, 1], [0, 1]]))
    2.0

    A callable coefficient gets an error estimate:

    >>> w = wp.OneForm([lambda c: np.cos(c[:, 1]), lambda c: np.zeros(len(c))])
    >>> r = wp.integrate(w, [[0.0, 0.0], [1.0, 1.0]])
    >>> round(float(r), 12), r.exact, r.error < 1e-10
    (0.841470984808, False, True)
    """
    if not isinstance(form, Form):
        from .complexes import WhitneyForm    # same layer; imported late (it imports us)
        if isinstance(form, WhitneyForm):
            return form._integrate(chain, closure=closure, curve=curve)
        raise TypeError(f"integrate needs a Form as its first argument, got {type(form).__name__}; "
                        "build one with wp.dx, wp.OneForm, wp.TwoForm or Form.from_sympy")
    check_choice(curve, "curve model", CURVES)
    if closure is not None:
        check_choice(closure, "closure", CLOSURES)
    opts = _options(rtol, atol, order, max_levels)
    # Overflow is reported once, as a ValueError on the result, not as
    # floating-point warnings from deep inside the quadrature.
    with np.errstate(over="ignore", invalid="ignore"):
        result = _dispatch(form, chain, closure, curve, opts)
    if not (np.isfinite(float(result)) and np.isfinite(result.error)):
        raise ValueError("integrate: the result overflows float64 for coordinates this large; "
                         "rescale the chain (e.g. divide it by its largest value)")
    return result


def _dispatch(form, chain, closure, curve, opts):
    for predicate, handler in _DOMAIN_HANDLERS:
        if predicate(form, chain):
            return handler(form, chain, closure=closure, curve=curve, **opts)

    if isinstance(chain, ZeroChain):
        if form.degree != 0:
            raise ValueError(f"a {form.degree}-form cannot be integrated over a 0-chain; "
                             "0-chains take 0-forms (functions)")
        return _integrate_0form(form, chain).result()

    if form.degree == 0:
        raise ValueError("a 0-form is integrated over a 0-chain (points with integer "
                         "coefficients), e.g. chain.boundary(); got a path")

    if isinstance(chain, Chain):
        members = chain.terms
    else:
        members = [(as_path(chain, "chain"), 1)]

    acc = _Acc()
    for path, coef in members:
        _check_dims(form, path)
        if form.degree == 1:
            part = _integrate_1form(form, path, closure or "none", curve, opts)
        elif form.degree == 2:
            part = _integrate_2form(form, path, closure or "chord", curve, opts)
        else:
            raise ValueError(f"a {form.degree}-form cannot be integrated over a path "
                             "(1-dimensional); paths take 1-forms, or 2-forms over the "
                             "surface they bound")
        acc.merge(part, weight=coef)
    return acc.result()


def _options(rtol, atol, order, max_levels):
    for name, v in (("rtol", rtol), ("atol", atol)):
        if isinstance(v, bool) or not isinstance(v, (int, float, np.floating, np.integer)):
            raise TypeError(f"{name} must be a number, got {v!r}")
        if not np.isfinite(v) or v < 0:
            raise ValueError(f"{name} must be finite and >= 0, got {v}")
    if rtol == 0 and atol == 0:
        raise ValueError("rtol and atol cannot both be 0")
    for name, v, lo in (("order", order, 1), ("max_levels", max_levels, 0)):
        if isinstance(v, bool) or not isinstance(v, (int, np.integer)) or v < lo:
            raise ValueError(f"{name} must be an integer >= {lo}, got {v!r}")
    return {"rtol": float(rtol), "atol": float(atol), "order": int(order),
            "max_levels": int(max_levels)}


def _check_dims(form: Form, path: Path):
    if form.dim is not None and form.dim != path.dim:
        raise ValueError(f"the form lives on R^{form.dim} but the path has {path.dim} channels")
    if form.min_dim > path.dim:
        raise ValueError(f"the form uses dx{form.min_dim - 1} but the path has only "
                         f"{path.dim} channels")


# --------------------------------------------------------------------------- 0-forms
def _integrate_0form(form: Form, chain: ZeroChain) -> _Acc:
    acc = _Acc()
    if chain.is_zero():
        acc.add(0.0, method="point evaluation")
        return acc
    if form.dim is not None and form.dim != chain.dim:
        raise ValueError(f"the 0-form lives on R^{form.dim} but the 0-chain is in R^{chain.dim}")
    vals = form.component_values(chain.points).get((), np.zeros(len(chain)))
    terms = chain.coefficients * vals
    acc.add(float(terms.sum()), method="point evaluation",
            rounding=_EPS * float(np.abs(terms).sum()), evaluations=len(chain))
    return acc


# --------------------------------------------------------------------------- 1-forms
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


def _linear_segments(path: Path, closure: str, centre: bool = False):
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


def _integrate_1form(form: Form, path: Path, closure: str, curve: str, opts) -> _Acc:
    acc = _Acc()
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
        acc.add(total, method="sum of increments (exact)", rounding=_EPS * scale)
    elif const:
        acc.add(0.0, method="sum of increments (exact)")

    if not varying:
        return acc

    if curve == "linear" and closure in ("none", "chord"):
        geoms = [_linear_segments(path, closure)]
    else:
        geoms = [g for pc in path.pieces for g in _geometries(pc, closure, curve)]
    if not geoms:
        return acc
    deg = _poly_degree(varying)
    if deg is not None:
        for g in geoms:
            m = points_needed(g.degree_factor * deg + g.degree_offset)
            val, scale, nev = _fixed_rule(g, varying, m)
            acc.add(val, 0.0, True, f"Gauss-Legendre, {m} points per segment (exact for degree {deg})",
                    _EPS * scale * 4, nev)
        return acc
    _adaptive(geoms, varying, opts, acc)
    return acc


def _poly_degree(varying):
    degs = [c.poly_degree for _, c in varying]
    if any(d is None for d in degs):
        return None
    return max(degs)


def _integrand(geom, varying, seg, s):
    """Pulled-back integrand sum_i f_i(gamma) * gamma_i' at (seg, s) pairs."""
    x, v = geom.evaluate(seg, s)
    out = np.zeros(seg.shape[0])
    for i, coef in varying:
        out += coef.evaluate(x, f"coefficient of dx{i}") * v[:, i]
    return out


def _rule_on_intervals(geom, varying, seg, lo, hi, m, with_abs=False):
    """m-point Gauss-Legendre on sub-intervals [lo, hi] of segments ``seg``.

    With ``with_abs`` also returns the same rule applied to the absolute value
    of the integrand: the magnitude against which rounding noise is judged.
    """
    xq, wq = gauss_legendre(m)
    K = seg.shape[0]
    out = np.empty(K)
    mag = np.empty(K) if with_abs else None
    step = max(1, _CHUNK_POINTS // m)
    for a in range(0, K, step):
        b = min(K, a + step)
        width = hi[a:b] - lo[a:b]
        s = (lo[a:b, None] + width[:, None] * xq[None, :]).ravel()
        segs = np.repeat(seg[a:b], m)
        f = _integrand(geom, varying, segs, s).reshape(b - a, m)
        out[a:b] = (f @ wq) * width
        if with_abs:
            mag[a:b] = (np.abs(f) @ wq) * width
    return (out, mag) if with_abs else out


def _fixed_rule(geom, varying, m):
    K = geom.n_segments
    seg = np.arange(K)
    vals = _rule_on_intervals(geom, varying, seg, np.zeros(K), np.ones(K), m)
    return float(vals.sum()), float(np.abs(vals).sum()), K * m * len(varying)


def _adaptive(geoms, varying, opts, acc: _Acc):
    m = opts["order"]
    nvar = len(varying)
    # First pass on whole segments, for every geometry.
    first = []
    total_scale = 0.0
    total_len = 0.0
    for g in geoms:
        K = g.n_segments
        seg = np.arange(K)
        lo, hi = np.zeros(K), np.ones(K)
        lo_rule = _rule_on_intervals(g, varying, seg, lo, hi, m)
        hi_rule, mag = _rule_on_intervals(g, varying, seg, lo, hi, m + 1, with_abs=True)
        lengths = g.lengths()
        first.append((seg, lo, hi, lo_rule, hi_rule, mag, lengths))
        total_scale += float(mag.sum())
        total_len += float(lengths.sum())
    tol = max(opts["atol"], opts["rtol"] * total_scale)
    evaluations = sum(g.n_segments for g in geoms) * (2 * m + 1) * nvar

    value, error, levels_used = 0.0, 0.0, 0
    unmet = False
    for g, (seg, lo, hi, lo_rule, hi_rule, mag, seglen) in zip(geoms, first):
        for level in range(opts["max_levels"] + 1):
            est = np.abs(hi_rule - lo_rule)
            if total_len > 0:
                allow = tol * (hi - lo) * seglen[seg] / total_len
            else:
                allow = np.full(seg.shape, tol / max(1, seg.shape[0]))
            # differences at the level of rounding noise cannot be refined away
            allow = np.maximum(allow, _NOISE * mag)
            bad = est > allow
            good = ~bad
            value += float(hi_rule[good].sum())
            error += float(est[good].sum())
            if not bad.any():
                break
            if level == opts["max_levels"] or 2 * int(bad.sum()) > max(_MAX_ACTIVE,
                                                                        4 * g.n_segments):
                # out of levels, or an integrand that does not settle (e.g. wildly
                # oscillating): stop before the sub-segments outgrow memory; warn below
                value += float(hi_rule[bad].sum())
                error += float(est[bad].sum())
                unmet = True
                levels_used = max(levels_used, level)
                break
            levels_used = max(levels_used, level + 1)
            seg_b, lo_b, hi_b = seg[bad], lo[bad], hi[bad]
            mid = 0.5 * (lo_b + hi_b)
            seg = np.concatenate([seg_b, seg_b])
            lo = np.concatenate([lo_b, mid])
            hi = np.concatenate([mid, hi_b])
            lo_rule = _rule_on_intervals(g, varying, seg, lo, hi, m)
            hi_rule, mag = _rule_on_intervals(g, varying, seg, lo, hi, m + 1, with_abs=True)
            evaluations += seg.shape[0] * (2 * m + 1) * nvar
    if unmet and error > tol:
        warnings.warn(f"integration tolerance {tol:.3g} not reached after {levels_used} "
                      f"bisections; estimated error {error:.3g}", IntegrationWarning, stacklevel=5)
    method = f"adaptive Gauss-Legendre {m}/{m + 1} points"
    acc.add(value, error, False, method, _EPS * total_scale * 4, evaluations)


# --------------------------------------------------------------------------- 2-forms
def _integrate_2form(form: Form, path: Path, closure: str, curve: str, opts) -> _Acc:
    if not form.is_constant:
        raise ValueError(
            "a non-constant 2-form over a path needs a surface: for a 2-channel path its "
            "winding-weighted region is used once the planar module is loaded "
            "(import wedgepath); in R^n pass a spanning surface such as wp.cone(path)")
    acc = _Acc()
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
    varying = [(k, Coefficient.from_callable(_linear_combination(lst), degree=1))
               for k, lst in sorted(coefs.items())]
    # A constant 2-form's integral over a surface spanning a closed curve is
    # translation invariant: each piece is taken relative to a point of its own.
    if curve == "linear" and closure in ("none", "chord"):
        geom_lists = [[_linear_segments(path, closure, centre=True)]]
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
                    _EPS * scale * 4)
    return acc


def _linear_combination(lst):
    ws = np.array([w for w, _ in lst])
    idx = np.array([i for _, i in lst])

    def f(coords):
        return coords[:, idx] @ ws
    return f
