"""Integration of forms over chains: ``integrate(form, chain)``.

One entry point, one dispatch on the type of the chain
(:func:`functools.singledispatch`, all cases registered here, each case's
work done by the module that owns it):

==========================  ===============================================  ==========================
chain                       form                                             module
==========================  ===============================================  ==========================
:class:`ZeroChain`          0-form: point evaluation (exact)                 here
:class:`Path`, array,       1-form: line integral (exact for constant and    :mod:`.line`
:class:`Chain`              polynomial coefficients, else adaptive)
                            constant 2-form: boundary primitive (exact)      :mod:`.line`
                            2-form ``f dx0^dx1`` on a planar path: Green's   :mod:`.green`
                            theorem over the winding-weighted region
:class:`SimplicialChain`    k-form over k-simplices                          :mod:`.simplex_integration`
==========================  ===============================================  ==========================

A :class:`~wedgepath.calculus.complexes.WhitneyForm` is integrated exactly
over chains of its own complex (:mod:`.complexes`).

"Exact" means exact in exact arithmetic; the result's ``rounding`` attribute
estimates the floating-point summation error that remains.  Approximate
results come from the adaptive driver (:mod:`.adaptive`): ``error`` is the sum
of local error estimates, and an :class:`IntegrationWarning` at the caller's
line says when that estimate cannot be trusted.

All work is vectorised over segments and done in chunks, so memory stays
bounded for paths with millions of samples.
"""

from __future__ import annotations

from functools import singledispatch

import numpy as np

from .._validation import check_choice
from .adaptive import options
from .chains import Chain, ZeroChain
from .complexes import SimplicialComplex, WhitneyForm
from .forms import Form
from .green import closed_pieces, integrand, planar_path, region_accumulator
from .integral import EPS, Accumulator, Integral, IntegrationWarning
from .line import integrate_1form, integrate_constant_2form
from .paths import CLOSURES, Path, as_path
from .simplex_integration import check_form_on, integrate_simplices
from .simplicial import SimplicialChain

__all__ = ["integrate", "Integral", "IntegrationWarning"]

CURVES = ("linear", "spline")


# --------------------------------------------------------------------------- entry point
def integrate(form, chain, closure=None, curve="linear", *, rtol=1e-10, atol=0.0,
              order=None, max_levels=30, resolution=32, max_evaluations=None):
    """Integrate a differential form over a chain.

    Parameters
    ----------
    form : Form or WhitneyForm
        A 0-form (over a :class:`ZeroChain`), a 1-form (along a path or chain),
        a 2-form (over the surface a closed path bounds: constant coefficients
        in any R^n, ``f dx0^dx1`` over the winding-weighted region of a planar
        path), a k-form over a :class:`SimplicialChain` of k-simplices; or a
        Whitney form of a :class:`SimplicialComplex`, over a chain of that
        complex's simplices (exact).
    chain : Path, Chain, ZeroChain, SimplicialChain or array_like (T, n)
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
        Tolerance of the adaptive methods: the estimated error is driven
        below ``max(atol, rtol * S)``, where ``S`` is the integral of the
        absolute value of the integrand (robust when the integral cancels to
        about zero, as it often does around closed loops).
    order : int, optional
        The rule pair of the adaptive methods: the number of Gauss points
        ``n`` of the Gauss-Kronrod pair G_n/K_{2n+1} on intervals and
        planar Green cells (default 7), or the middle Grundmann-Möller index
        of the three rules on k-simplices, k >= 2 (default 3: degrees 5, 7, 9).
    max_levels : int
        Maximum number of bisections of a cell after the minimum subdivision.
    resolution : int
        Minimum subdivision: before any acceptance, cells are cut until none
        is larger than ``diameter / resolution`` (the diagonal of the
        bounding box of the path or chain).  Features of the integrand much
        narrower than about a tenth of that size can still go unseen: raise
        ``resolution`` (or insert samples) to look closer.
    max_evaluations : int, optional
        A bound on the evaluations of the integrand (the work).  A minimum
        subdivision that alone needs more is refused (ValueError) before
        anything is evaluated (for simplices of dimension 3 and more the first
        pass is not counted ahead); refinement stops at the bound, with an
        :class:`IntegrationWarning` if the tolerance is not met.

    Returns
    -------
    Integral
        A float with ``.error``, ``.exact``, ``.method``, ``.rounding`` and
        ``.evaluations``.

    Warns
    -----
    IntegrationWarning
        When the error estimate did not reach the tolerance (bisection limits,
        evaluation budget, rounding noise, non-finite values met during
        refinement); it also says when the estimate exceeds the value (the
        integral may not converge).

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
    opts = options(rtol, atol, order, max_levels, resolution, max_evaluations)
    if isinstance(form, WhitneyForm):
        return form.integrate_over(chain, closure=closure, curve=curve)
    if not isinstance(form, Form):
        raise TypeError(f"integrate needs a Form as its first argument, got {type(form).__name__}; "
                        "build one with wp.dx, wp.OneForm, wp.TwoForm or Form.from_sympy")
    check_choice(curve, "curve model", CURVES)
    if closure is not None:
        check_choice(closure, "closure", CLOSURES)
    # Overflow is reported once, as a ValueError on the result, not as
    # floating-point warnings from deep inside the quadrature.  The handler is
    # called directly (not through the singledispatch wrapper) so that no frame
    # outside wedgepath sits between the caller and a warning.
    with np.errstate(over="ignore", invalid="ignore"):
        acc = _over.dispatch(type(chain))(chain, form, closure, curve, opts)
    result = acc.result()
    if not (np.isfinite(float(result)) and np.isfinite(result.error)):
        raise ValueError("integrate: the result overflows float64 for coordinates this large; "
                         "rescale the chain (e.g. divide it by its largest value)")
    acc.warn("integration")
    return result


# --------------------------------------------------------------------------- dispatch on the chain
@singledispatch
def _over(chain, form, closure, curve, opts) -> Accumulator:
    """Anything else is read as the points of a path (array_like (T, n))."""
    return _over_path(as_path(chain, "chain"), form, closure, curve, opts)


@_over.register
def _over_zero_chain(chain: ZeroChain, form, closure, curve, opts) -> Accumulator:
    if form.degree != 0:
        raise ValueError(f"a {form.degree}-form cannot be integrated over a 0-chain; "
                         "0-chains take 0-forms (functions)")
    acc = Accumulator()
    if chain.is_zero():
        acc.add(0.0, method="point evaluation")
        return acc
    if form.dim is not None and form.dim != chain.dim:
        raise ValueError(f"the 0-form lives on R^{form.dim} but the 0-chain is in R^{chain.dim}")
    vals = form.component_values(chain.points).get((), np.zeros(len(chain)))
    terms = chain.coefficients * vals
    acc.add(float(terms.sum()), method="point evaluation",
            rounding=EPS * float(np.abs(terms).sum()), evaluations=len(chain))
    return acc


@_over.register
def _over_path(chain: Path, form, closure, curve, opts) -> Accumulator:
    return _over_paths([(chain, 1)], form, closure, curve, opts)


@_over.register
def _over_chain(chain: Chain, form, closure, curve, opts) -> Accumulator:
    return _over_paths(chain.terms, form, closure, curve, opts)


def _over_paths(members, form, closure, curve, opts) -> Accumulator:
    """Paths with integer coefficients: 1-forms along them, 2-forms over what they bound."""
    if form.degree == 0:
        raise ValueError("a 0-form is integrated over a 0-chain (points with integer "
                         "coefficients), e.g. chain.boundary(); got a path")
    acc = Accumulator()
    for path, coef in members:
        _check_dims(form, path)
        if form.degree == 1:
            part = integrate_1form(form, path, closure or "none", curve, opts)
        elif form.degree == 2 and form.is_constant:
            part = integrate_constant_2form(form, path, closure or "chord", curve)
        elif form.degree == 2:
            part = _planar_region(form, path, closure or "chord", curve, opts)
        else:
            raise ValueError(f"a {form.degree}-form cannot be integrated over a path "
                             "(1-dimensional); paths take 1-forms, or 2-forms over the "
                             "surface they bound")
        acc.merge(part, weight=coef)
    return acc


@_over.register
def _over_simplicial_chain(chain: SimplicialChain, form, closure, curve, opts) -> Accumulator:
    if closure is not None:
        raise ValueError(f"closure={closure!r} applies to paths; a simplicial chain is "
                         "integrated as it is (pass closure=None)")
    if curve != "linear":
        raise ValueError(f"curve={curve!r} applies to paths; simplices are affine "
                         "(use curve='linear')")
    check_form_on(form, chain.degree, chain.dim)
    acc, _, _ = integrate_simplices(form, chain.vertices, chain.simplices, chain.coefficients,
                                    opts)
    return acc


@_over.register
def _over_complex(chain: SimplicialComplex, form, closure, curve, opts) -> Accumulator:
    raise TypeError("integrate needs a chain, not a SimplicialComplex: use cx.de_rham(form) for "
                    "the integrals over every simplex, or integrate over cx.chain(coefficients, k)")


# --------------------------------------------------------------------------- helpers
def _check_dims(form: Form, path: Path):
    if form.dim is not None and form.dim != path.dim:
        raise ValueError(f"the form lives on R^{form.dim} but the path has {path.dim} channels")
    if form.min_dim > path.dim:
        raise ValueError(f"the form uses dx{form.min_dim - 1} but the path has only "
                         f"{path.dim} channels")


def _planar_region(form, path, closure, curve, opts) -> Accumulator:
    """A non-constant 2-form over a path: ``f dx0^dx1`` over the region of a planar loop."""
    if path.dim != 2 or set(form.terms) - {(0, 1)}:
        raise ValueError(
            "a non-constant 2-form over a path needs a surface: for a 2-channel path, "
            "f dx0^dx1 is integrated over its winding-weighted region; in R^n pass a spanning "
            "surface such as wp.cone(path)")
    if curve != "linear":
        raise ValueError(f"curve={curve!r} is not supported for a 2-form over the region of a "
                         "planar loop; region integrals use the linear (polygon) curve model")
    pieces = closed_pieces(planar_path(path, "integrate"), closure, "integrate")
    return region_accumulator(integrand(form), pieces, opts)
