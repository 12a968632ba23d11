"""The adaptive driver: one engine for every kind of cell.

Line integrals (intervals of segments), region integrals (Green cells) and
integrals over simplices all run through :func:`adapt`.  A *cell type* says
how to evaluate a batch of cells with an embedded pair (or triple) of rules
and how to split a cell in two; the driver does the rest, the same way for
all of them:

1. *Minimum subdivision.*  Before anything is evaluated, the cell type cuts
   the domain into cells no larger than ``diameter / resolution`` (the
   diameter of the domain's bounding box), so that no part of a segment or
   cell is accepted on the strength of rule nodes that are far away from it.
2. *Local error estimates.*  Every cell gets a value and an error estimate
   from rules that share their nodes (Gauss-Kronrod pairs, or three
   Grundmann-Möller rules with a consistency test), never from a comparison
   with a coarser pass.
3. *Global acceptance, rescaled every pass.*  With ``S`` the current estimate
   of the integral of ``|integrand|`` over the whole domain (recomputed from
   the current cells at every pass), the target is
   ``tol = max(atol, rtol * S)``.  While the sum of the estimates exceeds
   ``tol``, every cell whose estimate exceeds its share of ``tol`` (by size)
   is bisected.  A cell at the rounding floor of its own values, at
   ``max_levels`` bisections, or whose children meet non-finite values is not
   refined further.
4. *Honest ending.*  When the loop stops with the estimate above ``tol``
   (levels, evaluation budget, rounding, non-finite values), the outcome
   carries the reasons; the entry point turns them into one
   :class:`~wedgepath.calculus.integral.IntegrationWarning` at the caller's line.

Cells are stored as a dict of arrays (one row per cell), so that every step
is vectorised over all the cells of a pass.
"""

from __future__ import annotations

import numbers
from dataclasses import dataclass, field

import numpy as np

from .integral import EPS

__all__ = ["Options", "options", "Estimate", "Outcome", "CellType", "adapt", "adapt_batched",
           "kronrod_estimate", "NOISE_FLOOR"]

#: relative rounding floor of a cell's estimate, times the integral of |integrand| over the
#: cell (QUADPACK's 50 * epsilon: Piessens et al., QUADPACK, Springer 1983, routine QK15)
NOISE_FLOOR = 50 * EPS
#: refinement stops (with a warning when the tolerance is unmet) after this many evaluations
#: of the integrand, or 16 times those of the first pass if that is more: bounded time
MAX_EVALUATIONS = 1 << 24
#: and at this many cells (or 4 times the first pass): bounded memory
MAX_CELLS = 1 << 21


@dataclass(frozen=True)
class Options:
    """Validated tolerances of the adaptive methods (see :func:`options`)."""

    rtol: float = 1e-10
    atol: float = 0.0
    order: int | None = None
    max_levels: int = 30
    resolution: int = 32
    max_evaluations: int | None = None


def _number(name, v):
    if isinstance(v, (bool, np.bool_)) or not isinstance(v, (numbers.Real, np.floating,
                                                              np.integer)):
        raise TypeError(f"{name} must be a number, got {v!r}")
    v = float(v)
    if not np.isfinite(v) or v < 0:
        raise ValueError(f"{name} must be finite and >= 0, got {v}")
    return v


def _integer(name, v, lo, allow_none=False):
    if v is None and allow_none:
        return None
    if isinstance(v, (bool, np.bool_)) or not isinstance(v, (int, np.integer)):
        raise ValueError(f"{name} must be an integer, got {v!r}")
    if v < lo:
        raise ValueError(f"{name} must be >= {lo}, got {v!r}")
    return int(v)


def options(rtol=1e-10, atol=0.0, order=None, max_levels=30, resolution=32,
            max_evaluations=None) -> Options:
    """Check the tolerance arguments shared by ``integrate``, ``region_integral`` and ``de_rham``.

    ``max_evaluations`` (optional) bounds the evaluations of the integrand: a minimum
    subdivision that alone needs more is refused before anything is evaluated, and
    refinement stops (with a warning when the tolerance is unmet) at the bound.

    Examples
    --------
    >>> from wedgepath.calculus.adaptive import options
    >>> options(rtol=1e-8).rtol
    1e-08
    >>> options(rtol=0, atol=0)
    Traceback (most recent call last):
    ...
    ValueError: rtol and atol cannot both be 0
    """
    rtol, atol = _number("rtol", rtol), _number("atol", atol)
    if rtol == 0 and atol == 0:
        raise ValueError("rtol and atol cannot both be 0")
    return Options(rtol, atol, _integer("order", order, 1, allow_none=True),
                   _integer("max_levels", max_levels, 0), _integer("resolution", resolution, 1),
                   _integer("max_evaluations", max_evaluations, 1, allow_none=True))


@dataclass
class Estimate:
    """What a cell type reports for a batch of cells (arrays of one row per cell).

    ``value``: the higher rule; ``error``: the estimate of its error (already
    at least the rounding floor); ``magnitude``: the rule applied to
    ``|integrand|`` (the scale of the tolerance); ``noise``: the rule with
    absolute weights applied to ``|integrand|`` (the scale of rounding);
    ``bad``: cells where the integrand was not finite (only in non-strict mode);
    ``rounding``: an absolute rounding term of its own, when the cell type has one
    beyond ``4 eps noise`` (for example the rounding of a polygon's vertices);
    ``evaluations``: the integrand evaluations made, when not ``evaluations_per_cell``
    for every cell.
    """

    value: np.ndarray
    error: np.ndarray
    magnitude: np.ndarray
    noise: np.ndarray
    bad: np.ndarray | None = None
    rounding: np.ndarray | None = None
    evaluations: int | None = None


class CellType:
    """Interface of a cell type (documentation; the driver only calls these)."""

    #: integrand evaluations per cell (for the budget and the ``evaluations`` count)
    evaluations_per_cell = 1

    def evaluate(self, cells: dict, strict: bool) -> Estimate:  # pragma: no cover - interface
        """Rules on every cell.  ``strict``: raise ValueError on non-finite values."""
        raise NotImplementedError

    def split(self, cells: dict) -> dict:  # pragma: no cover - interface
        """Two children per cell: all first children, then all second children."""
        raise NotImplementedError

    def measure(self, cells: dict) -> np.ndarray:  # pragma: no cover - interface
        """Size of every cell (its share of the tolerance is proportional to it)."""
        raise NotImplementedError

    def where(self, cells: dict, i: int) -> str:  # pragma: no cover - interface
        """A short description of cell ``i`` for messages."""
        return f"cell {i}"


@dataclass
class Outcome:
    """Result of :func:`adapt`: sums (weighted by the owners' coefficients) and diagnostics."""

    value: float
    error: float
    tolerance: float
    scale: float
    rounding: float
    evaluations: int
    trouble: list = field(default_factory=list)
    owner_values: np.ndarray | None = None
    owner_errors: np.ndarray | None = None


def _dot(a, b) -> float:
    """Sum of products, without BLAS (whose threads cost more than they save here)."""
    return float(np.einsum("i,i->", a, b))


def _rows(F, w):
    """``F @ w`` for a tall matrix and a short vector, without BLAS."""
    return np.einsum("ij,j->i", F, w)


def _take(cells, mask):
    return {k: v[mask] for k, v in cells.items()}


def _concat(a, b):
    return {k: np.concatenate([a[k], b[k]]) for k in a}


def adapt(kind, cells: dict, opts: Options, *, coef=None, owner_range=None,
          budget=None) -> Outcome:
    """Integrate adaptively over ``cells`` (already subdivided to the minimum).

    Parameters
    ----------
    kind : CellType
    cells : dict of arrays
        One row per cell; may hold ``"owner"`` (int64), the item (segment,
        simplex) each cell belongs to.
    opts : Options
    coef : ndarray, optional
        A signed weight per owner (chain coefficients); the value is
        ``sum coef[owner] * value`` and the error ``sum |coef[owner]| * error``.
    owner_range : (int, int), optional
        Also return the (unweighted) values and errors of owners ``lo..hi-1``.
    budget : int, optional
        Evaluations this call may make in all (first pass included); default
        ``max(MAX_EVALUATIONS, 16 x first pass)``.
    """
    n0 = len(next(iter(cells.values())))
    epc = kind.evaluations_per_cell
    owner = cells.get("owner")
    if coef is None:
        cw = np.ones(n0)
    else:
        cw = np.asarray(coef, dtype=np.float64)[owner]
    cells = dict(cells)
    cells["_cw"] = cw
    cells["_depth"] = np.zeros(n0, dtype=np.int32)
    cells["_frozen"] = np.zeros(n0, dtype=bool)
    est = kind.evaluate(cells, strict=False)
    if est.bad is not None and est.bad.any():
        # the standard message names the first bad point; say what it means for the integral
        try:
            kind.evaluate(cells, strict=True)
        except ValueError as exc:
            raise ValueError(f"{exc}; where the integrand is singular the integral may not "
                             "converge") from None
        first = int(np.flatnonzero(est.bad)[0])
        raise ValueError(f"the integrand is not finite {kind.where(cells, first)}")
    evaluations = est.evaluations if est.evaluations is not None else n0 * epc
    if budget is None:
        budget = max(MAX_EVALUATIONS, 16 * evaluations)
    max_cells = max(MAX_CELLS, 4 * n0)
    reasons = set()
    nonfinite_at = None
    vals, errs, mags, noise = est.value, est.error, est.magnitude, est.noise
    rnds = est.rounding if est.rounding is not None else np.zeros(n0)
    passes = 0
    while True:
        w = np.abs(cells["_cw"])
        scale = _dot(w, mags)
        tol = max(opts.atol, opts.rtol * scale)
        total = _dot(w, errs)
        if not total > tol or passes > 4 * opts.max_levels + 8:
            break
        passes += 1
        size = kind.measure(cells) * w
        total_size = float(size.sum())
        share = size / total_size if total_size > 0 else np.full(size.shape, 1.0 / size.size)
        want = w * errs > tol * share
        refinable = want & (errs > 2.0 * NOISE_FLOOR * noise) & ~cells["_frozen"]
        refinable &= cells["_depth"] < opts.max_levels
        idx = np.flatnonzero(refinable)
        if idx.size == 0:
            break
        room = min((budget - evaluations) // (2 * epc), max_cells - errs.size)
        if room <= 0:
            reasons.add("budget")
            break
        if idx.size > room:
            reasons.add("budget")
            idx = idx[np.argsort(-(w[idx] * errs[idx]), kind="stable")[:room]]
        sel = np.zeros(errs.size, dtype=bool)
        sel[idx] = True
        parents = _take(cells, sel)
        children = kind.split(parents)
        P = idx.size
        for k in ("_cw", "_depth", "_frozen"):
            children[k] = np.tile(parents[k], 2)
        if "owner" in parents and "owner" not in children:
            children["owner"] = np.tile(parents["owner"], 2)
        children["_depth"] = children["_depth"] + 1
        cest = kind.evaluate(children, strict=False)
        evaluations += cest.evaluations if cest.evaluations is not None else 2 * P * epc
        ok = np.ones(P, dtype=bool)
        if cest.bad is not None and cest.bad.any():
            bad_parent = cest.bad.reshape(2, P).any(axis=0)
            if nonfinite_at is None:
                j = int(np.flatnonzero(cest.bad)[0])
                nonfinite_at = kind.where(children, j)
            ok = ~bad_parent
            cells["_frozen"][idx[bad_parent]] = True
            sel[idx[bad_parent]] = False
            keep_child = np.tile(ok, 2)
            children = _take(children, keep_child)
            cest = Estimate(*(getattr(cest, a)[keep_child]
                              for a in ("value", "error", "magnitude", "noise")),
                            rounding=None if cest.rounding is None else cest.rounding[keep_child])
        keep = ~sel
        cells = _concat(_take(cells, keep), children)
        vals = np.concatenate([vals[keep], cest.value])
        errs = np.concatenate([errs[keep], cest.error])
        mags = np.concatenate([mags[keep], cest.magnitude])
        noise = np.concatenate([noise[keep], cest.noise])
        rnds = np.concatenate([rnds[keep], cest.rounding if cest.rounding is not None
                               else np.zeros(cest.value.size)])
    w = np.abs(cells["_cw"])
    value = _dot(cells["_cw"], vals)
    error = _dot(w, errs)
    scale = _dot(w, mags)
    tol = max(opts.atol, opts.rtol * scale)
    trouble = []
    if error > tol:
        # name the causes that carry a noticeable part (a tenth or more) of the estimate
        werr = w * errs
        share = {
            "nonfinite": float(werr[cells["_frozen"]].sum()),
            "levels": float(werr[cells["_depth"] >= opts.max_levels].sum()),
            "rounding": float(werr[errs <= 2.0 * NOISE_FLOOR * noise].sum()),
        }
        big = {k for k, v in share.items() if v >= 0.1 * error}
        if "nonfinite" in big and nonfinite_at is not None:
            trouble.append(f"the integrand is not finite at {nonfinite_at} (found while "
                           "refining)")
        if "levels" in big:
            trouble.append(f"cells reached max_levels={opts.max_levels} bisections")
        if "budget" in reasons:
            trouble.append(f"refinement stopped at its limit of {budget:,} evaluations")
        if "rounding" in big:
            trouble.append("rounding noise in the integrand's values limits the accuracy")
        if not trouble:
            trouble.append("refinement ended early")
    out = Outcome(value, error, tol, scale, 4 * EPS * _dot(w, noise) + _dot(w, rnds),
                  evaluations, trouble)
    if owner_range is not None:
        lo, hi = owner_range
        own = cells["owner"] - lo
        out.owner_values = np.bincount(own, vals, minlength=hi - lo)
        out.owner_errors = np.bincount(own, errs, minlength=hi - lo)
    return out


def adapt_batched(kind, n_owners: int, initial, opts: Options, *, sizes=None, coef=None,
                  per_owner=False, batch=1 << 14) -> Outcome:
    """:func:`adapt` over the owners (segments, simplices) in batches, for bounded memory.

    ``initial(lo, hi)`` returns the minimum-subdivision cells of owners ``lo..hi-1`` (their
    ``"owner"`` field holds global owner indices).  Each batch meets ``rtol`` relative to
    its own integral of ``|integrand|`` and its share of ``atol`` by ``sizes`` (one per
    owner), so the sums meet ``max(atol, rtol * S)`` for the whole domain just the same.
    """
    sizes = np.ones(n_owners) if sizes is None else np.asarray(sizes, dtype=np.float64)
    w = np.ones(n_owners) if coef is None else np.abs(np.asarray(coef, dtype=np.float64))
    weighted = w * sizes
    total_size = float(weighted.sum())
    # the first pass of every batch, when the cell type can tell it before evaluating
    first = kind.first_pass(n_owners) if hasattr(kind, "first_pass") else None
    if opts.max_evaluations is not None and first is not None:
        need = int(first.sum())
        if need > opts.max_evaluations:
            raise ValueError(
                f"the minimum subdivision alone needs {need:,} evaluations of the integrand, "
                f"more than max_evaluations={opts.max_evaluations:,}; lower resolution= "
                f"(now {opts.resolution}) or raise max_evaluations")
    used = 0
    acc = Outcome(0.0, 0.0, 0.0, 0.0, 0.0, 0)
    if per_owner:
        acc.owner_values = np.zeros(n_owners)
        acc.owner_errors = np.zeros(n_owners)
    for lo in range(0, n_owners, batch):
        hi = min(n_owners, lo + batch)
        part = (float(weighted[lo:hi].sum()) / total_size if total_size > 0
                else (hi - lo) / n_owners)
        sub = Options(opts.rtol, opts.atol * part, opts.order, opts.max_levels,
                      opts.resolution)
        if sub.rtol == 0 and sub.atol == 0:       # an owner range of zero size and rtol = 0
            sub = Options(opts.rtol, opts.atol / max(1, n_owners), opts.order,
                          opts.max_levels, opts.resolution)
        budget = None
        if opts.max_evaluations is not None:
            # what is left, keeping the first passes of the batches still to come
            later = int(first[hi:].sum()) if first is not None else 0
            budget = max(0, opts.max_evaluations - used - later)
        out = adapt(kind, initial(lo, hi), sub, coef=coef,
                    owner_range=(lo, hi) if per_owner else None, budget=budget)
        used += out.evaluations
        acc.value += out.value
        acc.error += out.error
        acc.tolerance += out.tolerance
        acc.scale += out.scale
        acc.rounding += out.rounding
        acc.evaluations += out.evaluations
        acc.trouble += [t for t in out.trouble if t not in acc.trouble]
        if per_owner:
            acc.owner_values[lo:hi] = out.owner_values
            acc.owner_errors[lo:hi] = out.owner_errors
    return acc


def kronrod_estimate(f, h, wk, wg):
    """Value, QUADPACK error estimate, magnitude and noise scale of rows of values ``f``.

    ``f`` (cells, 2n+1): integrand values at the Gauss-Kronrod nodes of each
    cell (an interval of length ``h`` in its parameter); ``wk, wg``: the
    Kronrod and embedded Gauss weights on [0, 1].  The estimate is
    ``resasc * min(1, (200 |K - G| / resasc)**1.5)`` with ``resasc`` the
    Kronrod rule of ``|f - mean|``, and at least ``NOISE_FLOOR`` times the
    rule of ``|f|`` (Piessens et al., QUADPACK, Springer 1983, routine QK15).
    """
    k = _rows(f, wk)
    g = _rows(f, wg)
    af = np.abs(f)
    resabs = _rows(af, wk) * np.abs(h)
    resasc = _rows(np.abs(f - k[:, None]), wk) * np.abs(h)
    raw = np.abs(k - g) * np.abs(h)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        ratio = np.where(resasc > 0, 200.0 * raw / resasc, 0.0)
        err = np.where((resasc > 0) & (raw > 0), resasc * np.minimum(1.0, ratio ** 1.5), raw)
    err = np.maximum(err, NOISE_FLOOR * resabs)
    return k * h, err, resabs, resabs
