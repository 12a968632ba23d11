"""Integration of k-forms over simplicial chains (``wp.integrate(form, chain)``, de Rham maps).

==========================  ===============================================  =========
form                        method                                           error
==========================  ===============================================  =========
constant k-form             sum of determinants ``c_I det(J[I, :]) / k!``    exact
polynomial coefficients     Grundmann-Möller rule of degree >= the           exact
                            polynomial degree, a conical product rule for
                            high degrees (Gauss-Legendre for k = 1)
other coefficients          adaptive (:mod:`~wedgepath.calculus.adaptive`):  estimate
                            k = 1: Gauss-Kronrod with the QUADPACK estimate;
                            k = 2: tensor Gauss-Kronrod on the collapsed
                            square (:class:`TriangleCells`); k >= 3: three
                            Grundmann-Möller rules with a consistency test,
                            longest-edge bisection
0-form on a 0-chain         point evaluation                                 exact
==========================  ===============================================  =========

Triangles are integrated in collapsed (Duffy) coordinates, ``(t, s) -> A + t (p - A +
s (q - p))`` with ``A`` opposite the shortest edge: a long thin triangle -- the cone of a
curve has nothing else -- is then cut along its length only, where longest-edge bisection
would multiply cells near the apex.  The cells get the estimate of the planar Green cells.
Before the first evaluation, cells are made no longer than ``diameter / resolution`` in
both directions (``diameter``: the bounding-box diagonal of the chain's vertices).

The three-rule estimate on a k-simplex (k >= 3) uses the Grundmann-Möller
rules of indices ``s - 1, s, s + 1`` (degrees ``2s - 1, 2s + 1, 2s + 3``; ``s``
is ``order``, default 3): with ``d1 = |Q_{s+1} - Q_s|`` and
``d2 = |Q_s - Q_{s-1}|``, the rules are taken to converge when
``d1 <= d2 / 2``, and the estimate of the error of ``Q_{s+1}`` is then ``d1``
(the error of the middle rule, a conservative bound in that regime);
otherwise it is ``max(d1, d2)``.  A cell the rules do not resolve (``max(d1,
d2)`` not small against ``resasc``, the rule applied to ``|integrand -
mean|``) gets at least ``resasc * min(1, (50 max(d1, d2) / resasc)**2)``: about
``resasc`` itself for a discontinuous integrand, as in QUADPACK's estimate on
intervals.  Never less than ``50 eps`` times the rule applied to ``|integrand|``
with absolute weights (rounding).  Before the first evaluation every simplex is
bisected until its longest edge is at most ``diameter / r`` with
``r = max(2, round(resolution ** (2 / k)))``, so that the first pass costs about as
many cells as for triangles.
"""

from __future__ import annotations

from itertools import combinations
from math import factorial

import numpy as np

from .adaptive import NOISE_FLOOR, Estimate, adapt_batched, kronrod_estimate
from .forms import Form
from .integral import EPS, Accumulator
from .quadrature import gauss_kronrod
from .simplex_quadrature import grundmann_moller, rule_name, simplex_rule

__all__ = ["minors", "volumes", "integrate_simplices", "check_form_on", "DEFAULT_ORDER"]

#: the middle Grundmann-Möller index of the three rules (degrees 5, 7, 9)
DEFAULT_ORDER = 3
#: Gauss points of the Gauss-Kronrod pair on 1-simplices (G7/K15)
DEFAULT_ORDER_1D = 7
#: quadrature points evaluated per chunk (bounds the temporaries' memory)
_CHUNK_POINTS = 1 << 18


def minors(E, terms):
    """det(J[I, :]) for each index tuple I; E has shape (k, S, n) (rows v_j - v_0)."""
    k = E.shape[0]
    out = []
    for idx in terms:
        if k == 0:
            out.append(np.ones(E.shape[1] if E.ndim > 1 else 0))
        elif k == 1:
            out.append(E[0, :, idx[0]])
        elif k == 2:
            i, j = idx
            out.append(E[0, :, i] * E[1, :, j] - E[0, :, j] * E[1, :, i])
        else:
            M = np.stack([E[:, :, i] for i in idx], axis=-1)  # (k, S, k): M[a, s, b] = E[a, s, I_b]
            out.append(np.linalg.det(np.transpose(M, (1, 2, 0))))
    return out


def volumes(E):
    """k-volumes (Gram determinant roots / k!) of simplices with edge rows E (k, S, n)."""
    k = E.shape[0]
    if k == 0:
        return np.ones(E.shape[1])
    if k == 1:
        return np.sqrt(np.einsum("sn,sn->s", E[0], E[0]))
    G = np.einsum("asn,bsn->sab", E, E)
    if k == 2:
        det = G[:, 0, 0] * G[:, 1, 1] - G[:, 0, 1] ** 2
    else:
        det = np.linalg.det(G)
    return np.sqrt(np.maximum(det, 0.0)) / factorial(k)


class _Terms:
    """The form's terms split into constant and varying parts."""

    def __init__(self, form):
        self.const = [(I, c.value) for I, c in form.terms.items() if c.kind == "constant"]
        self.vary = [(I, c) for I, c in form.terms.items() if c.kind != "constant"]
        degs = [c.poly_degree for _, c in self.vary]
        self.poly = None if any(d is None for d in degs) else max(degs, default=0)


def _const_part(V, terms: _Terms, k):
    """Per-simplex exact integrals of the constant terms; V (k+1, S, n)."""
    E = V[1:] - V[0]
    vals = np.zeros(V.shape[1])
    mag = np.zeros(V.shape[1])
    if k == 0:
        c = sum(v for _, v in terms.const)
        vals += c
        mag += abs(c)
        return vals, mag
    for (I, c), mnr in zip(terms.const, minors(E, [I for I, _ in terms.const])):
        t = c * mnr
        vals += t
        mag += np.abs(t)
    return vals / factorial(k), mag / factorial(k)


def _coef_label(I):
    return "coefficient of " + ("^".join(f"dx{i}" for i in I) if I else "the 0-form")


def _integrand_values(V, vary, bary, strict=True):
    """Pulled-back integrand at the rule's nodes on simplices V (k+1, S, n): shape (q, S).

    Not ``strict``: non-finite coefficient values come back as NaN.
    """
    k = V.shape[0] - 1
    S = V.shape[1]
    q = bary.shape[0]
    mnrs = minors(V[1:] - V[0], [I for I, _ in vary]) if k else [None] * len(vary)
    # nodes, q-major: (q, S, n) -> (q*S, n)
    X = np.einsum("qj,jsn->qsn", bary, V, optimize=False).reshape(q * S, -1)
    g = np.zeros((q, S))
    for (I, coef), mnr in zip(vary, mnrs):
        f = coef.evaluate(X, _coef_label(I), strict=strict).reshape(q, S)
        g += f if mnr is None else f * mnr
    return g


def _chunks(S, q):
    step = max(1, _CHUNK_POINTS // max(q, 1))
    for a in range(0, S, step):
        yield a, min(S, a + step)


def _bisect(V):
    """Split each simplex (B, k+1, n) at the midpoint of its longest edge; orientation kept.

    Returns (2B, k+1, n): all first halves, then all second halves.
    """
    B, k1, _ = V.shape
    best = np.full(B, -1.0)
    ia = np.zeros(B, dtype=np.int64)
    ib = np.zeros(B, dtype=np.int64)
    for a, b in combinations(range(k1), 2):
        d = V[:, a] - V[:, b]
        L = np.einsum("sn,sn->s", d, d)
        better = L > best
        best = np.where(better, L, best)
        ia = np.where(better, a, ia)
        ib = np.where(better, b, ib)
    rows = np.arange(B)
    mid = 0.5 * (V[rows, ia] + V[rows, ib])
    A = V.copy()
    Bv = V.copy()
    A[rows, ib] = mid
    Bv[rows, ia] = mid
    return np.concatenate([A, Bv], axis=0)


def _longest_edge(V):
    best = np.zeros(V.shape[0])
    for a, b in combinations(range(V.shape[1]), 2):
        d = V[:, a] - V[:, b]
        best = np.maximum(best, np.einsum("sn,sn->s", d, d))
    return np.sqrt(best)


class SimplexCells:
    """Cell type of the adaptive driver: sub-simplices (B, k+1, n) of the chain's simplices."""

    def __init__(self, vary, k, order):
        self.vary = vary
        self.k = k
        if k == 1:
            order = order or DEFAULT_ORDER_1D
            x, self.wk, self.wg = gauss_kronrod(order)
            self.bary = np.column_stack([1.0 - x, x])
            q = x.size
            self.method = f"adaptive Gauss-Kronrod {order}/{2 * order + 1} points"
        else:
            s = order or DEFAULT_ORDER
            self.rules = [grundmann_moller(k, i) for i in (s - 1, s, s + 1)] if s >= 1 else None
            q = sum(r[0].shape[0] for r in self.rules)
            self.method = (f"adaptive Grundmann-Möller degrees {2 * s - 1}/{2 * s + 1}/"
                           f"{2 * s + 3} with a consistency test")
        self.evaluations_per_cell = q * len(vary)
        self.q = q

    def prepare(self, vertices, simplices, resolution):
        """Remember the simplices and the edge bound ``diameter / r`` of the minimum subdivision."""
        self.vertices, self.simplices = vertices, simplices
        used = vertices[np.unique(simplices)] if simplices.size else vertices[:0]
        diameter = float(np.linalg.norm(used.max(axis=0) - used.min(axis=0))) if used.size else 0.0
        r = resolution if self.k <= 2 else max(2, round(resolution ** (2.0 / self.k)))
        self.h = diameter / r
        return simplices.shape[0]

    def initial(self, lo, hi):
        """Bisect simplices lo..hi-1 until every longest edge is at most ``h`` (module notes)."""
        V = self.vertices[self.simplices[lo:hi]]
        owner = np.arange(lo, hi)
        done_V, done_own = [], []
        while V.shape[0]:
            long_ = _longest_edge(V) > self.h * (1 + 1e-12)
            done_V.append(V[~long_])
            done_own.append(owner[~long_])
            if not long_.any() or self.h <= 0:
                break
            V = _bisect(V[long_])
            owner = np.tile(owner[long_], 2)
        return {"V": np.concatenate(done_V), "owner": np.concatenate(done_own)}

    def measure(self, cells):
        V = cells["V"]
        return volumes(np.transpose(V[:, 1:] - V[:, :1], (1, 0, 2)))

    def split(self, cells):
        return {"V": _bisect(cells["V"]), "owner": np.tile(cells["owner"], 2)}

    def where(self, cells, i):
        return f"about the point {cells['V'][i].mean(axis=0).tolist()}"

    def evaluate(self, cells, strict):
        Vall = cells["V"]
        B = Vall.shape[0]
        val, err, mag, noise = (np.empty(B) for _ in range(4))
        bad = None if strict else np.zeros(B, dtype=bool)
        for a, b in _chunks(B, self.q):
            V = np.transpose(Vall[a:b], (1, 0, 2))
            if self.k == 1:
                g = _integrand_values(V, self.vary, self.bary, strict)      # (q, S)
                v, e, m, nz = kronrod_estimate(g.T, np.ones(b - a), self.wk, self.wg)
                if not strict:
                    bad[a:b] = np.isnan(g).any(axis=0)
            else:
                Q = []
                finite = np.ones(b - a, dtype=bool)
                for bary, w in self.rules:
                    g = _integrand_values(V, self.vary, bary, strict)
                    finite &= ~np.isnan(g).any(axis=0)
                    Q.append(np.einsum("q,qs->s", w, g))
                ag = np.abs(g)                 # the highest rule's values
                m = np.abs(np.einsum("q,qs->s", w, ag))
                nz = np.einsum("q,qs->s", np.abs(w), ag)
                v = Q[2]
                e = _three_rule_estimate(Q, np.einsum("q,qs->s", np.abs(w),
                                                      np.abs(g - v / w.sum())))
                e = np.maximum(e, NOISE_FLOOR * nz)
                if not strict:
                    bad[a:b] = ~finite
            val[a:b], err[a:b], mag[a:b], noise[a:b] = v, e, m, nz
        return Estimate(val, err, mag, noise, bad)


class TriangleCells:
    """Cell type for triangles: rectangles ``[t0, t1] x [s0, s1]`` of the collapsed square.

    A triangle ``(A, p, q)`` is the image of the unit square under
    ``(t, s) -> A + t (p - A + s (q - p))`` (collapsed, or Duffy, coordinates; the
    Jacobian is ``t`` times that of the triangle).  ``A`` is the vertex opposite the
    shortest edge (a cyclic relabelling: the orientation is kept), so a long thin triangle
    -- a cone's triangle from its apex to a short segment of the curve -- is cut along its
    length only.  Each cell gets the tensor Gauss-Kronrod rule and the estimate of the
    Green cells (:mod:`~wedgepath.calculus.green`): QUADPACK's transform of the
    differences in both directions, the pair G2/K5 across a short opposite edge.
    """

    def __init__(self, vary, order):
        self.vary = vary
        order = order or DEFAULT_ORDER_1D
        self.rule_t = gauss_kronrod(order)
        self.rule_long = self.rule_t
        self.rule_short = gauss_kronrod(min(order, 2))
        self.evaluations_per_cell = self.rule_t[0].size ** 2 * len(vary)
        self.method = (f"adaptive Gauss-Kronrod {order}/{2 * order + 1} points per direction "
                       "on collapsed triangles")

    def prepare(self, vertices, simplices, resolution):
        V = vertices[simplices]                                   # (S, 3, n)
        if V.shape[0]:
            pts = vertices[np.unique(simplices)]
            diameter = float(np.linalg.norm(pts.max(axis=0) - pts.min(axis=0)))
        else:
            diameter = 0.0
        # the edge opposite vertex j joins the other two; A = the vertex opposite the shortest
        opp = np.stack([np.linalg.norm(V[:, (j + 2) % 3] - V[:, (j + 1) % 3], axis=1)
                        for j in range(3)], axis=1)
        a = np.argmin(opp, axis=1)
        rows = np.arange(V.shape[0])
        self.A, self.p, self.q = (V[rows, (a + j) % 3] for j in range(3))   # cyclic: same orientation
        E = np.stack([self.p - self.A, self.q - self.A])               # (2, S, n)
        self.area = volumes(E)
        self.minors = np.stack(minors(E, [I for I, _ in self.vary]), axis=1) if len(self.vary) \
            else np.zeros((V.shape[0], 0))                             # (S, terms)
        h = diameter / resolution if diameter > 0 else np.inf
        reach = np.maximum(np.linalg.norm(self.p - self.A, axis=1),
                           np.linalg.norm(self.q - self.A, axis=1))
        across = np.linalg.norm(self.q - self.p, axis=1)
        with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
            nt, ns = np.ceil(reach / h), np.ceil(across / h)
        self.nt = np.clip(np.nan_to_num(nt, nan=1.0), 1, 1 << 16).astype(np.int64)
        self.ns = np.clip(np.nan_to_num(ns, nan=1.0), 1, 1 << 16).astype(np.int64)
        self.short = across <= 0.25 * h
        self.diameter = diameter
        return V.shape[0]

    def first_pass(self, n_owners):
        """Evaluations of the first pass, per triangle (owner)."""
        m_s = np.where(self.short, self.rule_short[0].size, self.rule_long[0].size)
        return self.nt * self.ns * self.rule_t[0].size * m_s * len(self.vary)

    def initial(self, lo, hi):
        nt, ns = self.nt[lo:hi], self.ns[lo:hi]
        per = nt * ns
        own = np.repeat(np.arange(lo, hi), per)
        first = np.repeat(np.cumsum(per) - per, per)
        j = np.arange(own.size) - first
        nt_, ns_ = nt[own - lo].astype(np.float64), ns[own - lo]
        i_t, i_s = np.divmod(j, ns_)
        ns_ = ns_.astype(np.float64)
        return {"owner": own, "short": self.short[own], "t0": i_t / nt_, "t1": (i_t + 1) / nt_,
                "s0": i_s / ns_, "s1": (i_s + 1) / ns_}

    def measure(self, cells):
        """Area of every cell: the triangle's times ∫∫ 2t dt ds over the rectangle."""
        return (self.area[cells["owner"]] * (cells["t1"] ** 2 - cells["t0"] ** 2)
                * (cells["s1"] - cells["s0"]))

    def split(self, cells):
        cut_t = cells["cut_t"]
        t0, t1, s0, s1 = cells["t0"], cells["t1"], cells["s0"], cells["s1"]
        tm, sm = 0.5 * (t0 + t1), 0.5 * (s0 + s1)
        return {"owner": np.tile(cells["owner"], 2), "short": np.tile(cells["short"], 2),
                "t0": np.concatenate([t0, np.where(cut_t, tm, t0)]),
                "t1": np.concatenate([np.where(cut_t, tm, t1), t1]),
                "s0": np.concatenate([s0, np.where(cut_t, s0, sm)]),
                "s1": np.concatenate([np.where(cut_t, s1, sm), s1])}

    def _points(self, o, T, S):
        """Points (B, mt, ms, n) at parameters T (B, mt), S (B, ms) of triangles ``o``."""
        A, p, q = self.A[o], self.p[o], self.q[o]
        P = p[:, None, :] + S[:, :, None] * (q - p)[:, None, :]            # (B, ms, n)
        return A[:, None, None, :] + T[:, :, None, None] * (P - A[:, None, :])[:, None, :, :]

    def where(self, cells, i):
        o = cells["owner"][i:i + 1]
        t = np.array([[0.5 * (cells["t0"][i] + cells["t1"][i])]])
        s = np.array([[0.5 * (cells["s0"][i] + cells["s1"][i])]])
        return f"about the point {self._points(o, t, s)[0, 0, 0].tolist()}"

    def evaluate(self, cells, strict):
        B = cells["owner"].size
        out = {k: np.empty(B) for k in ("val", "err", "mag")}
        out["cut"] = np.empty(B, dtype=bool)
        bad = None if strict else np.zeros(B, dtype=bool)
        evaluations = 0
        for is_short, rule_s in ((False, self.rule_long), (True, self.rule_short)):
            rows = np.flatnonzero(cells["short"] == is_short)
            if rows.size:
                evaluations += self._evaluate(cells, rows, rule_s, is_short, strict, out, bad)
        cells["cut_t"] = out["cut"]
        return Estimate(out["val"], out["err"], out["mag"], out["mag"], bad,
                        evaluations=evaluations)

    def _evaluate(self, cells, rows, rule_s, short, strict, out, bad):
        xt, wkt, wgt = self.rule_t
        xs, wks, wgs = rule_s
        kk = wkt[:, None] * wks[None, :]
        gk = wgt[:, None] * wks[None, :]        # Gauss along t, Kronrod across
        kg = wkt[:, None] * wgs[None, :]        # Kronrod along t, Gauss across
        m = xt.size * xs.size
        step = max(1, _CHUNK_POINTS // m)
        for a in range(0, rows.size, step):
            r = rows[a:a + step]
            o = cells["owner"][r]
            t0, s0 = cells["t0"][r], cells["s0"][r]
            ht, hs = cells["t1"][r] - t0, cells["s1"][r] - s0
            T = t0[:, None] + ht[:, None] * xt[None, :]
            S = s0[:, None] + hs[:, None] * xs[None, :]
            X = self._points(o, T, S)
            nb, mt, ms, n = X.shape
            flat = X.reshape(nb * mt * ms, n)
            g = np.zeros((nb, mt, ms))
            for c, (I, coef) in enumerate(self.vary):
                f = coef.evaluate(flat, _coef_label(I), strict=strict).reshape(nb, mt, ms)
                g += f * self.minors[o, c][:, None, None]
            if not strict:
                bad[r] = np.isnan(g).any(axis=(1, 2))
            q = g * (T * (ht * hs)[:, None])[:, :, None]                   # Jacobian t dt ds
            v_kk = np.einsum("kij,ij->k", q, kk)
            e_t = np.abs(v_kk - np.einsum("kij,ij->k", q, gk))
            e_s = np.abs(v_kk - np.einsum("kij,ij->k", q, kg))
            resabs = np.einsum("kij,ij->k", np.abs(q), kk)
            resasc = np.einsum("kij,ij->k", np.abs(q - v_kk[:, None, None]), kk)
            raw = e_t if short else e_t + e_s
            with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
                ratio = np.where(resasc > 0, 200.0 * raw / resasc, 0.0)
                e = np.where((resasc > 0) & (raw > 0),
                             resasc * np.minimum(1.0, ratio ** 1.5), raw)
            if short:
                e = e + e_s
            out["val"][r] = v_kk
            out["err"][r] = np.maximum(e, NOISE_FLOOR * resabs)
            out["mag"][r] = resabs
            out["cut"][r] = e_t >= e_s
        return rows.size * m * len(self.vary)


def _three_rule_estimate(Q, resasc):
    """Error estimate of ``Q[2]`` from three rules of increasing degree (module notes).

    ``d1 = |Q2 - Q1|``, ``d2 = |Q1 - Q0|``: when the rules converge (``d1 <= d2 / 2``) the
    estimate is ``d1``, otherwise ``max(d1, d2)``.  A cell that even the middle rule does
    not resolve -- ``max(d1, d2)`` not small against ``resasc``, the rule applied to
    ``|integrand - mean|`` -- gets at least ``resasc * min(1, (50 max(d1, d2) / resasc)**2)``,
    which is ``resasc`` itself for a discontinuous or unresolved integrand (the same idea
    as QUADPACK's estimate on intervals).
    """
    d1, d2 = np.abs(Q[2] - Q[1]), np.abs(Q[1] - Q[0])
    raw = np.maximum(d1, d2)
    e = np.where(d1 <= 0.5 * d2, d1, raw)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        guard = np.where(resasc > 0, resasc * np.minimum(1.0, (50.0 * raw / resasc) ** 2), 0.0)
    return np.maximum(e, guard)


def integrate_simplices(form, vertices, simplices, coefs, opts):
    """Integrals of ``form`` over simplices.

    Returns ``(acc, values, errors)``: the accumulated sum weighted by ``coefs``
    and the per-simplex values and error estimates (unweighted).
    """
    k = simplices.shape[1] - 1
    S = simplices.shape[0]
    terms = _Terms(form)
    acc = Accumulator()
    values = np.zeros(S)
    errors = np.zeros(S)
    cw = coefs.astype(np.float64)
    if S == 0:
        acc.add(0.0, method="empty chain")
        return acc, values, errors
    # constant terms: determinants, exact
    if terms.const:
        csum = 0.0
        cmag = 0.0
        for a, b in _chunks(S, 1):
            V = vertices[simplices[a:b].T]
            v, m = _const_part(V, terms, k)
            values[a:b] += v
            csum += float(cw[a:b] @ v)
            cmag += float(np.abs(cw[a:b]) @ m)
        acc.add(csum, method="determinants (exact)" if k else "point evaluation",
                rounding=EPS * cmag * 4)
    if not terms.vary:
        return acc, values, errors
    if k == 0 or terms.poly is not None:
        bary, w = (np.ones((1, 1)), np.ones(1)) if k == 0 else simplex_rule(k, terms.poly)
        q = bary.shape[0]
        tot, mag = 0.0, 0.0
        for a, b in _chunks(S, q):
            g = _integrand_values(vertices[simplices[a:b].T], terms.vary, bary)
            v = w @ g
            values[a:b] += v
            tot += float(cw[a:b] @ v)
            mag += float(np.abs(cw[a:b]) @ (np.abs(w) @ np.abs(g)))
        if k == 0:
            acc.add(tot, method="point evaluation", rounding=EPS * mag,
                    evaluations=S * len(terms.vary))
        else:
            name = rule_name(k, terms.poly)
            acc.add(tot, 0.0, True,
                    f"{name}, {q} points per simplex (exact for degree {terms.poly})",
                    EPS * mag * 8 * factorial(k), S * q * len(terms.vary))
        return acc, values, errors
    cells = (TriangleCells(terms.vary, opts.order) if k == 2
             else SimplexCells(terms.vary, k, opts.order))
    n = cells.prepare(vertices, simplices, opts.resolution)
    sizes = volumes(np.transpose(vertices[simplices[:, 1:]] - vertices[simplices[:, :1]],
                                 (1, 0, 2)))
    outcome = adapt_batched(cells, n, cells.initial, opts, sizes=sizes, coef=cw,
                            per_owner=True, batch=1 << 12)
    values += outcome.owner_values
    errors += outcome.owner_errors
    acc.add_outcome(outcome, cells.method)
    return acc, values, errors


def check_form_on(form, degree, dim, what="chain"):
    if not isinstance(form, Form):
        raise TypeError(f"expected a Form, got {type(form).__name__}")
    if form.degree != degree:
        raise ValueError(f"a {form.degree}-form cannot be integrated over a {degree}-{what}; "
                         f"the degrees must match")
    if form.dim is not None and form.dim != dim:
        raise ValueError(f"the form lives on R^{form.dim} but the {what} is in R^{dim}")
    if form.min_dim > dim:
        raise ValueError(f"the form uses dx{form.min_dim - 1} but the {what} is in R^{dim}")
