"""Region integrals ``∬ w(x, y) f(x, y) dx∧dy`` of closed planar curves (public wrapper).

The engine -- Green's theorem on the boundary, exact for polynomials and
adaptive otherwise -- is calculus (``wedgepath.calculus.green``), where
``integrate(f dx0^dx1, planar_path)`` uses it too.  This module adds what the
public planar function needs on top: the planar input conventions, constant
integrands by the shoelace area, and formulas given as text (parsed by
:func:`wedgepath.formula.parse_formula`, never evaluated).
"""

from __future__ import annotations

import numpy as np

from ..calculus.adaptive import options
from ..calculus.green import closed_pieces, finite_result, integrand, planar_path, region_accumulator
from ..calculus.integral import EPS, Integral
from .area import _piece_area

__all__ = ["region_integral"]


def _from_text(text, symbols):
    """A sympy expression and its symbols from a formula string (safe parser, no eval)."""
    import sympy

    from ..formula import parse_formula

    if symbols is None:
        syms = sympy.symbols("x y", real=True)
    else:
        syms = tuple(symbols)
        if len(syms) != 2 or not all(isinstance(s, sympy.Symbol) for s in syms):
            raise ValueError("symbols must be a pair of sympy Symbols (x, y)")
    names = [str(s) for s in syms]
    if names[0] == names[1]:
        raise ValueError(f"symbols must have two different names, got {names}")
    return parse_formula(text, dict(zip(names, syms))), syms


def region_integral(f, path2d, closure="chord", *, symbols=None, poly_degree=None, rtol=1e-10,
                    atol=0.0, order=None, max_levels=30, resolution=32,
                    max_evaluations=None) -> Integral:
    """Integral of ``f`` over the winding-weighted region of a closed planar curve.

    Computes ``∬ w(x, y) f(x, y) dx∧dy`` where ``w`` is the winding number
    of the curve, as a boundary integral by Green's theorem (see
    ``wedgepath.calculus.green``).  Inside a simple counter-clockwise loop
    this is the ordinary area integral; a clockwise loop gives its negative;
    lobes of a self-crossing loop count with their winding numbers.

    Parameters
    ----------
    f : number, str, callable, sympy expression or Form
        The integrand: a number; a formula as text in ``x`` and ``y`` (or
        the names of ``symbols``), such as ``"x**2*y"`` or
        ``"exp(-(x**2 + y**2))"`` (parsed safely, never evaluated as code;
        see :func:`wedgepath.formula.parse_formula` for what it accepts); a
        vectorised callable ``f(x, y)`` taking two float arrays of shape (m,)
        and returning shape (m,); a sympy expression in ``symbols``; or a
        2-form ``g dx0^dx1`` (its coefficient is used).
    path2d : Path or array_like, shape (T, 2)
        A planar curve; for an n-channel path pass ``path.plane(i, j)``
        (then ``x, y`` are channels ``i, j``).  NaN rows split it into
        pieces, each closed on its own; the integrals add up.
    closure : {"chord", "detrend", "require", "none"}
        How open pieces are closed (default ``"chord"``).
    symbols : pair of sympy.Symbol, optional
        The coordinate symbols ``(x, y)`` of a sympy integrand (or the
        variable names of a formula).
    poly_degree : int, optional
        Declares that a callable ``f`` is a polynomial of total degree at
        most ``poly_degree``; it is then integrated exactly.  Only declare
        it when it is true.
    rtol, atol : float
        Tolerance of the adaptive rule (non-polynomial ``f``): the
        estimated error is driven below ``max(atol, rtol * S)`` with ``S``
        the integral of ``|integrand|`` over the Green cells.
    order : int, optional
        Gauss points of the Gauss-Kronrod pair in each direction of a cell
        (default 7: G7/K15).
    max_levels : int
        Maximum bisections of a cell after the minimum subdivision.
    resolution : int
        Minimum subdivision: no cell is accepted before it is at most
        ``diameter / resolution`` in each direction (``diameter``: the
        diagonal of the curve's bounding box).  Raise it to look for
        features of ``f`` narrower than about a tenth of that.
    max_evaluations : int, optional
        A bound on the evaluations of ``f``: a minimum subdivision that alone
        needs more is refused (ValueError) before ``f`` is evaluated;
        refinement stops at the bound (with a warning if the tolerance is not
        met).  Exact (polynomial) integration is not bounded by it.

    Returns
    -------
    Integral
        A float with ``.error`` (0 when exact), ``.exact``, ``.method``,
        ``.rounding`` and ``.evaluations``.

    Warns
    -----
    IntegrationWarning
        When the error estimate did not reach the tolerance; it says so when
        the estimate exceeds the value (the integral may not converge, e.g.
        an integrand singular inside the region).

    Examples
    --------
    >>> import numpy as np, sympy as sp, wedgepath as wp
    >>> square = [[0, 0], [1, 0], [1, 1], [0, 1]]
    >>> x, y = sp.symbols("x y")
    >>> r = wp.region_integral(x**2 * y, square, symbols=(x, y))
    >>> round(float(r), 15), r.exact                 # exact value 1/6
    (0.166666666666667, True)
    >>> float(wp.region_integral(2.5, square[::-1]))   # clockwise: negative
    -2.5

    A formula as text (the same language as the command line's ``--weight``):

    >>> round(float(wp.region_integral("x**2*y", square)), 15)
    0.166666666666667

    A callable gets an error estimate:

    >>> r = wp.region_integral(lambda x, y: np.exp(x + y), square)
    >>> abs(float(r) - (np.e - 1) ** 2) < 1e-12, r.exact, r.error < 1e-9
    (True, False, True)

    The same integral through ``integrate`` with a 2-form:

    >>> w = wp.TwoForm({(0, 1): x**2 * y}, symbols=(x, y))
    >>> round(float(wp.integrate(w, square)), 15)
    0.166666666666667
    """
    if isinstance(f, (str, bytes)):
        if isinstance(f, bytes):
            raise TypeError("the integrand formula must be text (str), got bytes")
        f, symbols = _from_text(f, symbols)
    fn = integrand(f, symbols, poly_degree)
    path = planar_path(path2d, "region_integral")
    pieces = closed_pieces(path, closure, "region_integral")
    opts = options(rtol, atol, order, max_levels, resolution, max_evaluations)

    if fn.kind == "constant":
        with np.errstate(over="ignore", invalid="ignore"):
            area = sum(_piece_area(p) for p in pieces)
            value = finite_result(fn.value * area, "region_integral")
        return Integral(value, error=0.0, exact=True,
                        method="constant integrand times shoelace area (exact)",
                        rounding=4 * EPS * abs(value))
    acc = region_accumulator(fn, pieces, opts)
    result = acc.result()
    acc.warn("region integral")
    return result
