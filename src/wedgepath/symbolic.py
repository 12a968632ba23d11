"""Exact (sympy) oracles for forms, line integrals and region integrals.

This module is the exact layer of wedgepath.  It is a *leaf*: it depends only
on sympy, numpy, the standard library and wedgepath's index algebra
(``wedgepath._exterior``: the sign of a permutation and the wedge of term
tables, which imports nothing), never on the numeric layers, so the rest of
the package (and its tests) can use it as an independent referee, and users
can use it to check their floating-point numbers.

Conventions
-----------
* A k-form on R^n with coordinate symbols ``x_0, ..., x_{n-1}`` is a dict
  ``{I: f_I}`` mapping a tuple of coordinate indices ``I = (i_1 < ... < i_k)``
  to a sympy expression ``f_I``; it stands for ``sum_I f_I dx_{i_1} ^ ... ^
  dx_{i_k}``.  A 0-form is ``{(): f}``; the zero form is ``{}``.  Unsorted
  index tuples are accepted on input and sorted with the sign of the sorting
  permutation; a tuple with a repeated index is zero.  Outputs always have
  ascending index tuples and no zero entries.
* Numbers are converted exactly: a Python or numpy float becomes the rational
  number equal to its binary value (``0.1`` becomes
  ``3602879701896397/36028797018963968``), never a rounded decimal.  Float
  constants inside sympy expressions are replaced the same way.
* Orientation: the oriented area of a closed planar curve is
  ``(1/2) * closed integral of (x dy - y dx)``, positive for counter-clockwise
  travel; region integrals are weighted by the winding number.
* An oriented k-simplex is given by its vertices ``v_0, ..., v_k``; the order
  of the vertices is its orientation, and it is parametrised over the standard
  simplex ``{u_j >= 0, sum u_j <= 1}`` by ``phi(u) = v_0 + sum_j u_j (v_j - v_0)``.

Results are exact sympy numbers or expressions (rationals where the data are
rational and the integrand is a polynomial with rational coefficients).
"""

from __future__ import annotations

import decimal
import math
import numbers
from fractions import Fraction

import numpy as np
import sympy
from sympy.polys.rings import ring as _ring

from ._exterior import sort_with_sign, wedge_terms

__all__ = [
    "to_rational",
    "exterior_derivative",
    "wedge",
    "line_integral",
    "polyline_integral",
    "zero_chain_value",
    "polygon_region_integral",
    "polygon_moments",
    "simplex_integral",
    "form_on_simplex",
]


# ---------------------------------------------------------------------------
# exact numbers
# ---------------------------------------------------------------------------


def to_rational(x):
    """Convert a real number exactly to a sympy Rational.

    Parameters
    ----------
    x : int, float, Fraction, Decimal, numpy scalar or sympy number
        The value.  Floats (Python, numpy or sympy ``Float``) are converted to
        the rational number equal to their binary value, not to a nearby
        short decimal.

    Returns
    -------
    sympy.Rational
        The exact value (a ``sympy.Integer`` for integers).

    Raises
    ------
    ValueError
        If `x` is nan, infinite, complex (non-zero imaginary part, or any
        Python/numpy complex), or an irrational sympy number such as
        ``sqrt(2)`` (no rational equals it).
    TypeError
        If `x` is not a number at all (strings, arrays, symbols, ...).

    Examples
    --------
    >>> to_rational(0.5)
    1/2
    >>> to_rational(0.1)
    3602879701896397/36028797018963968
    >>> from fractions import Fraction
    >>> to_rational(Fraction(2, 6))
    1/3
    >>> to_rational(float("nan"))
    Traceback (most recent call last):
    ...
    ValueError: to_rational: cannot convert nan to a rational number
    """
    if isinstance(x, sympy.Basic):
        if isinstance(x, sympy.Rational):
            return x
        if x is sympy.nan:
            raise ValueError("to_rational: cannot convert nan to a rational number")
        if x.has(sympy.oo, -sympy.oo, sympy.zoo):
            raise ValueError(
                f"to_rational: cannot convert infinite value {x} to a rational number"
            )
        if isinstance(x, sympy.Float):
            return sympy.Rational(x)
        if not (isinstance(x, sympy.Expr) and x.is_number):
            raise TypeError(f"to_rational: {x!r} is not a number")
        if x.is_real is False:
            raise ValueError(f"to_rational: cannot convert complex value {x} to a rational")
        if x.is_rational is not True:
            raise ValueError(
                f"to_rational: {x} is not a rational number (use it directly "
                "where exact sympy values are accepted)"
            )
        value = sympy.nsimplify(x, rational=True)
        if not isinstance(value, sympy.Rational):  # pragma: no cover - defensive
            raise ValueError(f"to_rational: could not reduce {x} to a rational number")
        return value
    if isinstance(x, (bool, np.bool_)):
        return sympy.Integer(int(x))
    if isinstance(x, (complex, np.complexfloating)):
        raise ValueError(f"to_rational: cannot convert complex value {x!r} to a rational")
    if isinstance(x, numbers.Integral):
        return sympy.Integer(int(x))
    if isinstance(x, Fraction):
        return sympy.Rational(x.numerator, x.denominator)
    if isinstance(x, decimal.Decimal):
        if x.is_nan():
            raise ValueError("to_rational: cannot convert nan to a rational number")
        if x.is_infinite():
            raise ValueError(f"to_rational: cannot convert infinite value {x} to a rational")
        fr = Fraction(x)
        return sympy.Rational(fr.numerator, fr.denominator)
    if isinstance(x, (float, np.floating)):
        xf = float(x)
        if math.isnan(xf):
            raise ValueError("to_rational: cannot convert nan to a rational number")
        if math.isinf(xf):
            raise ValueError(
                f"to_rational: cannot convert infinite value {xf} to a rational number"
            )
        num, den = xf.as_integer_ratio()
        return sympy.Rational(num, den)
    if isinstance(x, numbers.Rational):
        return sympy.Rational(int(x.numerator), int(x.denominator))
    raise TypeError(f"to_rational: {x!r} (type {type(x).__name__}) is not a real number")


def _float_atoms_exact(expr):
    """Replace every sympy Float in `expr` by its exact rational value."""
    floats = expr.atoms(sympy.Float)
    if not floats:
        return expr
    return expr.xreplace({f: to_rational(f) for f in floats})


def _as_expr(value, what):
    """Exact sympy expression from a number or sympy expression.

    Raises TypeError for things sympy cannot read (callables, strings, arrays)
    and ValueError for nan / infinite values.
    """
    if isinstance(value, sympy.Basic):
        if not isinstance(value, sympy.Expr):
            raise TypeError(f"{what}: {value!r} is not a sympy expression")
        if value.has(sympy.nan):
            raise ValueError(f"{what}: expression {value} contains nan")
        if value.has(sympy.oo, -sympy.oo, sympy.zoo):
            raise ValueError(f"{what}: expression {value} contains an infinite value")
        return _float_atoms_exact(value)
    if isinstance(value, (numbers.Number, np.number, np.bool_, decimal.Decimal)):
        return to_rational(value)
    if isinstance(value, str):
        raise TypeError(f"{what}: strings are not accepted ({value!r}); pass a sympy expression")
    try:
        expr = sympy.sympify(value, strict=True)
    except (sympy.SympifyError, TypeError, ValueError, AttributeError):
        raise TypeError(
            f"{what}: {value!r} (type {type(value).__name__}) cannot be read as a sympy expression"
        ) from None
    return _as_expr(expr, what)


def _exact_entry(value, what):
    """Exact real scalar: numbers via to_rational, sympy expressions kept.

    Exact irrational sympy numbers (sqrt(3), pi) and symbolic entries are
    accepted and kept as they are (Floats inside them made exact).
    """
    if isinstance(value, sympy.Basic):
        expr = _as_expr(value, what)
        if expr.is_number and expr.is_real is False:
            raise ValueError(f"{what}: complex value {expr} is not allowed")
        return expr
    return to_rational(value)


def _check_symbols(symbols, what="symbols"):
    try:
        syms = tuple(symbols)
    except TypeError:
        raise TypeError(f"{what} must be a sequence of sympy Symbols") from None
    for s in syms:
        if not isinstance(s, sympy.Symbol):
            raise TypeError(f"{what} must be sympy Symbols; got {s!r}")
    if len(set(syms)) != len(syms):
        raise ValueError(f"{what} contains a repeated symbol: {syms}")
    return syms


def _exact_array(vertices, n, what="vertices"):
    """(T, n) list of lists of exact entries; an empty input gives []."""
    if isinstance(vertices, np.ndarray):
        arr = vertices.astype(object) if vertices.dtype != object else vertices
    else:
        rows = list(vertices)
        if len(rows) == 0:
            return []
        try:
            width = {len(r) for r in rows}
        except TypeError:
            raise ValueError(f"{what} must be a 2-d array of shape (T, {n})") from None
        if len(width) != 1:
            raise ValueError(f"{what}: rows have different lengths {sorted(width)}")
        arr = np.empty((len(rows), width.pop()), dtype=object)
        for i, r in enumerate(rows):
            for j, v in enumerate(r):
                arr[i, j] = v
    if arr.size == 0 and arr.ndim <= 2:
        return []
    if arr.ndim != 2:
        raise ValueError(f"{what} must be a 2-d array of shape (T, {n}); got shape {arr.shape}")
    if arr.shape[1] != n:
        raise ValueError(
            f"{what} have {arr.shape[1]} coordinates per point but there are {n} symbols"
        )
    return [[_exact_entry(v, what) for v in row] for row in arr]


# ---------------------------------------------------------------------------
# zero detection and tidying
# ---------------------------------------------------------------------------


def _rational_poly(expr, gens):
    """Poly over QQ in `gens` if `expr` is one, else None."""
    if not gens:
        return None
    try:
        p = sympy.Poly(expr, *gens)
    except (sympy.PolynomialError, sympy.GeneratorsNeeded):
        return None
    if p.domain.is_ZZ or p.domain.is_QQ:
        return p
    return None


def _tidy(expr):
    """Canonical exact form: expanded polynomial if rational-coefficient
    polynomial, otherwise sympy.simplify."""
    expr = sympy.sympify(expr, strict=True)   # strict: never parses text
    ex = sympy.expand(expr)
    if ex.is_Rational:
        return ex
    syms = sorted(ex.free_symbols, key=sympy.default_sort_key)
    if syms and _rational_poly(ex, syms) is not None:
        return ex
    return sympy.simplify(ex)


# ---------------------------------------------------------------------------
# forms as dicts
# ---------------------------------------------------------------------------


def _canonical_form(components, n=None, what="components"):
    """Validate a form dict; sort keys with sign, merge, drop zeros.

    Returns (dict, degree) with degree None for the zero form.
    """
    if not isinstance(components, dict):
        raise TypeError(f"{what} must be a dict {{index tuple: expression}}")
    out = {}
    degree = None
    for key, value in components.items():
        if isinstance(key, (int, np.integer)):
            key = (int(key),)
        try:
            key = tuple(key)
        except TypeError:
            raise TypeError(f"{what}: key {key!r} is not a tuple of indices") from None
        for i in key:
            if not isinstance(i, (int, np.integer)) or isinstance(i, bool):
                raise TypeError(f"{what}: index {i!r} in key {key!r} is not an integer")
            if i < 0 or (n is not None and i >= n):
                bound = f"range(0, {n})" if n is not None else "non-negative"
                raise ValueError(f"{what}: index {i} in key {key!r} is outside {bound}")
        key = tuple(int(i) for i in key)
        if degree is None:
            degree = len(key)
        elif len(key) != degree:
            raise ValueError(
                f"{what}: mixed degrees {degree} and {len(key)}; a form must be homogeneous"
            )
        expr = _as_expr(value, f"{what}[{key}]")
        skey, sign = sort_with_sign(key)
        if sign == 0:
            continue
        out[skey] = out.get(skey, sympy.Integer(0)) + sign * expr
    return _drop_zeros(out), degree


def _drop_zeros(form):
    result = {}
    for key in sorted(form):
        value = _tidy(form[key])
        if value != 0:
            result[key] = value
    return result


def exterior_derivative(components, symbols):
    """Exterior derivative of a k-form, exactly.

    ``d(sum_I f_I dx_I) = sum_I sum_j (df_I/dx_j) dx_j ^ dx_I``.

    Parameters
    ----------
    components : dict
        The k-form ``{I: f_I}``, I a tuple of indices into `symbols` (k = 0
        is ``{(): f}``).  Values are sympy expressions or numbers.
    symbols : sequence of sympy.Symbol
        The n coordinate symbols ``x_0, ..., x_{n-1}``.

    Returns
    -------
    dict
        The (k+1)-form ``{J: g_J}`` with ascending index tuples and zero
        terms dropped (``{}`` is the zero form).

    Raises
    ------
    ValueError
        If an index is outside ``range(n)`` or the degrees are mixed.
    TypeError
        If a component cannot be read as a sympy expression.

    Examples
    --------
    >>> import sympy
    >>> x, y = sympy.symbols("x y")
    >>> exterior_derivative({(): x**2 * y}, [x, y])
    {(0,): 2*x*y, (1,): x**2}
    >>> exterior_derivative({(0,): -y, (1,): x}, [x, y])
    {(0, 1): 2}
    >>> exterior_derivative({(0, 1): x}, [x, y])   # top degree: d gives zero
    {}
    """
    syms = _check_symbols(symbols)
    form, _ = _canonical_form(components, len(syms))
    out = {}
    for key, f in form.items():
        for j, xj in enumerate(syms):
            if j in key:
                continue
            df = sympy.diff(f, xj)
            if df == 0:
                continue
            # dx_j ^ dx_key: the sign of the permutation that sorts (j,) + key
            new, sign = sort_with_sign((j,) + key)
            out[new] = out.get(new, sympy.Integer(0)) + sign * df
    return _drop_zeros(out)


def wedge(a, b):
    """Wedge product of a k-form and an l-form, exactly.

    Parameters
    ----------
    a, b : dict
        Forms ``{I: f_I}`` and ``{J: g_J}`` (index tuples of lengths k and l).

    Returns
    -------
    dict
        The (k+l)-form ``a ^ b``: for every pair (I, J) with no common index,
        ``f_I g_J`` goes to ``sorted(I + J)`` with the sign of the sorting
        permutation.  Zero terms are dropped.

    Examples
    --------
    >>> import sympy
    >>> x, y = sympy.symbols("x y")
    >>> wedge({(0,): 1}, {(1,): 1})
    {(0, 1): 1}
    >>> wedge({(1,): 1}, {(0,): 1})
    {(0, 1): -1}
    >>> wedge({(0,): x}, {(0,): y})    # dx ^ dx = 0
    {}
    >>> wedge({(): 3}, {(1,): y})
    {(1,): 3*y}
    """
    fa, _ = _canonical_form(a, None, "a")
    fb, _ = _canonical_form(b, None, "b")
    out = wedge_terms(fa, fb, lambda x, y, sign: sign * x * y, lambda x, y: x + y)
    return _drop_zeros(out)


def _one_form_components(components, n, what="components"):
    """List of n exact expressions from a sequence or a {(i,): expr} dict."""
    if isinstance(components, dict):
        form, degree = _canonical_form(components, n, what)
        if degree not in (None, 1):
            raise ValueError(f"{what}: expected a 1-form, got a {degree}-form")
        comps = [sympy.Integer(0)] * n
        for (i,), v in form.items():
            comps[i] = v
        return comps
    if isinstance(components, (str, bytes)) or isinstance(components, sympy.Basic):
        raise TypeError(f"{what} must be a sequence of n expressions or a dict {{(i,): expr}}")
    try:
        comps = list(components)
    except TypeError:
        raise TypeError(
            f"{what} must be a sequence of n expressions or a dict {{(i,): expr}}"
        ) from None
    if len(comps) != n:
        raise ValueError(f"{what} has {len(comps)} entries but there are {n} symbols")
    return [_as_expr(c, f"{what}[{i}]") for i, c in enumerate(comps)]


# ---------------------------------------------------------------------------
# line integrals
# ---------------------------------------------------------------------------


def line_integral(components, symbols, curve, param, bounds):
    """Exact integral of a 1-form along a parametric curve.

    Computes ``integral_{a}^{b} sum_i f_i(c(t)) c_i'(t) dt``.

    Parameters
    ----------
    components : sequence of n expressions, or dict ``{(i,): f_i}``
        The 1-form ``sum_i f_i dx_i``.
    symbols : sequence of sympy.Symbol
        The n coordinate symbols.
    curve : sequence of n sympy expressions (in `param`) or callables
        ``x_i = curve[i]``; a callable is called with `param`.
    param : sympy.Symbol
        The curve parameter.
    bounds : pair
        ``(a, b)``, exact numbers or sympy expressions; ``a > b`` reverses
        the direction.

    Returns
    -------
    sympy.Expr
        The simplified exact value (may contain an unevaluated ``Integral``
        if sympy finds no antiderivative).

    Examples
    --------
    >>> import sympy
    >>> x, y, t = sympy.symbols("x y t")
    >>> circle = [sympy.cos(t), sympy.sin(t)]
    >>> line_integral([-y / 2, x / 2], [x, y], circle, t, (0, 2 * sympy.pi))
    pi
    >>> line_integral({(0,): 2 * x}, [x, y], [t, t**2], t, (0, 3))
    9
    """
    syms = _check_symbols(symbols)
    n = len(syms)
    comps = _one_form_components(components, n)
    if not isinstance(param, sympy.Symbol):
        raise TypeError(f"param must be a sympy Symbol; got {param!r}")
    try:
        path = list(curve)
    except TypeError:
        raise TypeError("curve must be a sequence of n expressions or callables") from None
    if len(path) != n:
        raise ValueError(f"curve has {len(path)} coordinates but there are {n} symbols")
    path = [
        _as_expr(c(param) if (callable(c) and not isinstance(c, sympy.Basic)) else c, f"curve[{i}]")
        for i, c in enumerate(path)
    ]
    try:
        lo, hi = bounds
    except (TypeError, ValueError):
        raise ValueError("bounds must be a pair (a, b)") from None
    lo = _exact_entry(lo, "bounds")
    hi = _exact_entry(hi, "bounds")
    sub = dict(zip(syms, path))
    integrand = sum(
        (f.xreplace(sub) * sympy.diff(c, param) for f, c in zip(comps, path)),
        sympy.Integer(0),
    )
    integrand = sympy.expand(integrand) if _rational_poly(integrand, [param]) else integrand
    return _tidy(sympy.integrate(integrand, (param, lo, hi)))


def _qq_poly_components(comps, syms):
    """Per component: list of (exponent tuple, QQ coefficient), or None."""
    out = []
    for f in comps:
        if f == 0:
            out.append([])
            continue
        p = _rational_poly(f, syms)
        if p is None:
            return None
        out.append([(m, sympy.QQ.from_sympy(c)) for m, c in p.terms()])
    return out


def _segment_integral_fast(terms, start, delta, ring_s):
    """Exact integral over s in [0, 1] of sum_i f_i(start + s*delta) delta_i."""
    qq = sympy.QQ
    n = len(start)
    lin = [qq.from_sympy(start[j]) + qq.from_sympy(delta[j]) * ring_s for j in range(n)]
    powers = [[ring_s.ring.one] for _ in range(n)]

    def power(j, e):
        pj = powers[j]
        while len(pj) <= e:
            pj.append(pj[-1] * lin[j])
        return pj[e]

    total = qq.zero
    for i, monos in enumerate(terms):
        di = qq.from_sympy(delta[i])
        if not monos or di == 0:
            continue
        acc = ring_s.ring.zero
        for exps, coeff in monos:
            term = ring_s.ring.one * coeff
            for j, e in enumerate(exps):
                if e:
                    term = term * power(j, e)
            acc += term
        integral = qq.zero
        for (deg,), c in acc.terms():
            integral += c / qq(deg + 1)
        total += di * integral
    return total


def _segment_integral_generic(comps, syms, start, delta, s):
    sub = {x: a + s * d for x, a, d in zip(syms, start, delta)}
    integrand = sum(
        (f.xreplace(sub) * d for f, d in zip(comps, delta) if d != 0 and f != 0),
        sympy.Integer(0),
    )
    if integrand == 0:
        return sympy.Integer(0)
    try:
        p = sympy.Poly(integrand, s)
    except sympy.PolynomialError:
        p = None
    if p is not None:
        anti = p.integrate()
        return anti.eval(1) - anti.eval(0)
    return sympy.integrate(integrand, (s, 0, 1))


def polyline_integral(components, symbols, vertices, closed=False):
    """Exact integral of a 1-form along a polyline.

    Each segment from ``p`` to ``q`` is parametrised as ``p + s (q - p)``,
    ``s`` in [0, 1] (the value does not depend on the parametrisation).

    Parameters
    ----------
    components : sequence of n expressions, or dict ``{(i,): f_i}``
        The 1-form ``sum_i f_i dx_i``.
    symbols : sequence of sympy.Symbol
        The n coordinate symbols.
    vertices : array-like, shape (T, n)
        Ints, floats, Fractions, Decimals or sympy numbers, each converted
        exactly (floats by their binary value; exact sympy values such as
        ``sqrt(3)``, and symbols, are kept).
    closed : bool, default False
        If True, add the segment from the last vertex back to the first.

    Returns
    -------
    sympy.Expr
        The exact value; a ``sympy.Rational`` when the components are
        polynomials with rational coefficients and the vertices are rational
        (this case uses a fast univariate polynomial path per segment).
        Fewer than two vertices give 0.

    Examples
    --------
    >>> import sympy
    >>> x, y = sympy.symbols("x y")
    >>> square = [(0, 0), (1, 0), (1, 1), (0, 1)]
    >>> polyline_integral([-y / 2, x / 2], [x, y], square, closed=True)
    1
    >>> polyline_integral([0, x], [x, y], [(0, 0), (0.5, 0.25)])
    1/16
    >>> polyline_integral([1, 1], [x, y], [])
    0
    """
    syms = _check_symbols(symbols)
    n = len(syms)
    comps = _one_form_components(components, n)
    pts = _exact_array(vertices, n)
    if len(pts) < 2:
        return sympy.Integer(0)
    if closed:
        pts = pts + [pts[0]]
    segments = [
        (pts[k], [b - a for a, b in zip(pts[k], pts[k + 1])]) for k in range(len(pts) - 1)
    ]
    all_rational = all(isinstance(v, sympy.Rational) for row in pts for v in row)
    terms = _qq_poly_components(comps, syms) if all_rational else None
    if terms is not None:
        _, s_gen = _ring("s", sympy.QQ)
        total = sympy.QQ.zero
        for start, delta in segments:
            total += _segment_integral_fast(terms, start, delta, s_gen)
        return sympy.QQ.to_sympy(total)
    s = sympy.Dummy("s")
    total = sympy.Integer(0)
    for start, delta in segments:
        total += _segment_integral_generic(comps, syms, start, delta, s)
    return _tidy(total)


def zero_chain_value(expr, symbols, points, coefficients):
    """Exact value of a 0-form on a 0-chain: ``sum_k c_k f(p_k)``.

    Parameters
    ----------
    expr : sympy expression or number
        The 0-form f.
    symbols : sequence of sympy.Symbol
        The n coordinate symbols.
    points : array-like, shape (K, n)
        The points, converted exactly.
    coefficients : sequence of K numbers
        Chain coefficients (usually integers), converted exactly.

    Returns
    -------
    sympy.Expr
        The exact sum (0 for an empty chain).

    Examples
    --------
    >>> import sympy
    >>> x, y = sympy.symbols("x y")
    >>> zero_chain_value(x * y, [x, y], [(2, 3), (1, 1)], [1, -1])  # boundary of a segment
    5
    """
    syms = _check_symbols(symbols)
    f = _as_expr(expr, "expr")
    pts = _exact_array(points, len(syms), "points")
    try:
        coeffs = list(coefficients)
    except TypeError:
        raise TypeError("coefficients must be a sequence of numbers") from None
    if len(coeffs) != len(pts):
        raise ValueError(
            f"coefficients has {len(coeffs)} entries but there are {len(pts)} points"
        )
    total = sympy.Integer(0)
    for p, c in zip(pts, coeffs):
        total += _exact_entry(c, "coefficients") * f.xreplace(dict(zip(syms, p)))
    return _tidy(total)


# ---------------------------------------------------------------------------
# planar regions
# ---------------------------------------------------------------------------


def polygon_region_integral(expr, symbols2, vertices):
    """Exact winding-weighted integral of f over the plane for a polygon.

    Returns ``integral over R^2 of w(x, y) f(x, y) dx dy`` where ``w`` is the
    winding number of the closed polygon (closing segment implied).  A simple
    counter-clockwise polygon gives the ordinary integral over its inside, a
    clockwise one its negative, and self-crossing polygons are
    winding-weighted.

    Computed by Green's theorem: with ``F = integral f dx`` (an antiderivative
    in x), the result is the closed polyline integral of ``F dy``.  If sympy
    finds no x-antiderivative, ``G = integral f dy`` and ``-G dx`` are used.

    Parameters
    ----------
    expr : sympy expression or number
        The integrand f(x, y).  For non-polynomial f the antiderivative sympy
        returns must be continuous on the polygon and its inside.
    symbols2 : pair of sympy.Symbol
        ``(x, y)``.
    vertices : array-like, shape (T, 2)
        Polygon vertices, converted exactly (see `polyline_integral`).

    Returns
    -------
    sympy.Expr
        The exact value.

    Raises
    ------
    ValueError
        If `symbols2` does not have two symbols, the vertices are not (T, 2),
        or no antiderivative is found.

    Examples
    --------
    >>> import sympy
    >>> x, y = sympy.symbols("x y")
    >>> square = [(0, 0), (1, 0), (1, 1), (0, 1)]
    >>> polygon_region_integral(x**2 * y, [x, y], square)
    1/6
    >>> polygon_region_integral(1, [x, y], square[::-1])   # clockwise
    -1
    """
    syms = _check_symbols(symbols2, "symbols2")
    if len(syms) != 2:
        raise ValueError(f"symbols2 must hold exactly 2 symbols; got {len(syms)}")
    x, y = syms
    f = _as_expr(expr, "expr")
    pts = _exact_array(vertices, 2)
    if len(pts) < 3:
        return sympy.Integer(0)
    F = sympy.integrate(f, x)
    if not F.has(sympy.Integral):
        return polyline_integral([sympy.Integer(0), F], syms, pts, closed=True)
    G = sympy.integrate(f, y)
    if not G.has(sympy.Integral):
        return polyline_integral([-G, sympy.Integer(0)], syms, pts, closed=True)
    raise ValueError(f"polygon_region_integral: no closed-form antiderivative of {f}")


def polygon_moments(vertices):
    """Exact area, first and second moments and centroid of a polygon.

    All quantities are winding-weighted integrals over the plane (as in
    `polygon_region_integral`), so a clockwise polygon has negative area and
    moments, and the centroid is the same for either orientation.  They are
    computed from the vertex formulas obtained by applying Green's theorem
    edge by edge (common practice, no source); with
    ``c_k = x_k y_{k+1} - x_{k+1} y_k``:

    * area    = (1/2)  sum c_k
    * int_x   = (1/6)  sum (x_k + x_{k+1}) c_k
    * int_y   = (1/6)  sum (y_k + y_{k+1}) c_k
    * int_xx  = (1/12) sum (x_k^2 + x_k x_{k+1} + x_{k+1}^2) c_k
    * int_yy  = (1/12) sum (y_k^2 + y_k y_{k+1} + y_{k+1}^2) c_k
    * int_xy  = (1/24) sum (x_k y_{k+1} + 2 x_k y_k + 2 x_{k+1} y_{k+1} + x_{k+1} y_k) c_k

    Parameters
    ----------
    vertices : array-like, shape (T, 2)
        Polygon vertices (closing segment implied), converted exactly;
        symbolic entries are allowed.

    Returns
    -------
    dict
        Keys ``'area'`` (∬ w), ``'int_x'`` (∬ w x), ``'int_y'`` (∬ w y),
        ``'int_xx'`` (∬ w x^2), ``'int_xy'`` (∬ w x y), ``'int_yy'``
        (∬ w y^2), all exact, and ``'centroid'``: the pair
        ``(int_x / area, int_y / area)``, or None when the area is zero.

    Examples
    --------
    >>> m = polygon_moments([(0, 0), (2, 0), (2, 1), (0, 1)])
    >>> m["area"], m["int_yy"], m["centroid"]
    (2, 2/3, (1, 1/2))
    >>> polygon_moments([(0, 0), (1, 1), (1, 0), (0, 1)])["centroid"] is None
    True
    """
    pts = _exact_array(vertices, 2)
    zero = sympy.Integer(0)
    acc = dict.fromkeys(("area", "int_x", "int_y", "int_xx", "int_xy", "int_yy"), zero)
    T = len(pts)
    if T >= 3:
        for k in range(T):
            x0, y0 = pts[k]
            x1, y1 = pts[(k + 1) % T]
            c = x0 * y1 - x1 * y0
            acc["area"] += c
            acc["int_x"] += (x0 + x1) * c
            acc["int_y"] += (y0 + y1) * c
            acc["int_xx"] += (x0 * x0 + x0 * x1 + x1 * x1) * c
            acc["int_yy"] += (y0 * y0 + y0 * y1 + y1 * y1) * c
            acc["int_xy"] += (x0 * y1 + 2 * x0 * y0 + 2 * x1 * y1 + x1 * y0) * c
    scale = {"area": 2, "int_x": 6, "int_y": 6, "int_xx": 12, "int_yy": 12, "int_xy": 24}
    out = {key: _tidy(acc[key] / scale[key]) for key in acc}
    if out["area"] == 0:
        out["centroid"] = None
    else:
        out["centroid"] = (
            _tidy(out["int_x"] / out["area"]),
            _tidy(out["int_y"] / out["area"]),
        )
    return out


# ---------------------------------------------------------------------------
# simplices
# ---------------------------------------------------------------------------


def _simplex_setup(symbols, vertices):
    syms = _check_symbols(symbols)
    n = len(syms)
    pts = _exact_array(vertices, n)
    if len(pts) == 0:
        raise ValueError("vertices: a simplex needs at least one vertex")
    k = len(pts) - 1
    if k > n:
        raise ValueError(f"a {k}-simplex ({k + 1} vertices) does not fit in R^{n}")
    v0 = pts[0]
    J = sympy.Matrix(n, k, lambda i, j: pts[j + 1][i] - v0[i])
    u = sympy.symbols(f"u0:{k}", cls=sympy.Dummy)
    phi = [v0[i] + sum((J[i, j] * u[j] for j in range(k)), sympy.Integer(0)) for i in range(n)]
    return syms, pts, k, J, list(u), phi


def _integrate_standard_simplex(integrand, u):
    """Iterated exact integral over {u_j >= 0, sum u_j <= 1}."""
    expr = integrand
    k = len(u)
    for j in reversed(range(k)):
        upper = 1 - sum(u[:j], sympy.Integer(0))
        var = u[j]
        try:
            p = sympy.Poly(expr, var)
        except sympy.PolynomialError:
            p = None
        if p is not None:
            anti = p.integrate().as_expr()
            expr = sympy.expand(anti.xreplace({var: upper}) - anti.xreplace({var: 0}))
        else:
            expr = sympy.integrate(expr, (var, 0, upper))
    return expr


def simplex_integral(expr, symbols, vertices):
    """Exact integral of a function over a k-simplex with k-volume measure.

    The simplex with vertices ``v_0, ..., v_k`` in R^n is the image of the
    standard simplex under ``phi(u) = v_0 + J u``, ``J = [v_1 - v_0, ...,
    v_k - v_0]`` (n x k); the measure factor is the Gram determinant root
    ``sqrt(det(J^T J))``.  The result does not depend on vertex order.

    Parameters
    ----------
    expr : sympy expression or number
        The integrand (a polynomial, or anything sympy can integrate).
    symbols : sequence of sympy.Symbol
        The n coordinate symbols.
    vertices : array-like, shape (k + 1, n)
        The vertices, converted exactly; ``1 <= k <= n`` (k = 1, 2, 3 are
        the tested cases).

    Returns
    -------
    sympy.Expr
        The exact value (0 for a degenerate simplex).

    Examples
    --------
    >>> import sympy
    >>> x, y, z = sympy.symbols("x y z")
    >>> simplex_integral(1, [x, y], [(0, 0), (3, 4)])          # length
    5
    >>> simplex_integral(x * y, [x, y], [(0, 0), (1, 0), (0, 1)])
    1/24
    >>> simplex_integral(1, [x, y, z], [(1, 0, 0), (0, 1, 0), (0, 0, 1)])
    sqrt(3)/2
    """
    syms, pts, k, J, u, phi = _simplex_setup(symbols, vertices)
    if k < 1:
        raise ValueError("simplex_integral needs a k-simplex with k >= 1 (at least 2 vertices)")
    f = _as_expr(expr, "expr")
    gram = _tidy((J.T * J).det())
    if gram == 0:
        return sympy.Integer(0)
    integrand = f.xreplace(dict(zip(syms, phi)))
    value = _integrate_standard_simplex(integrand, u)
    return _tidy(sympy.sqrt(gram) * value)


def form_on_simplex(components, symbols, vertices):
    """Exact integral of a k-form over an oriented k-simplex, by pullback.

    With ``phi(u) = v_0 + J u`` as in `simplex_integral`, the pullback of
    ``f_I dx_I`` is ``f_I(phi(u)) det(J[I, :]) du_1 ... du_k``; the result
    is its integral over the standard simplex.  Swapping two vertices flips
    the sign.

    Parameters
    ----------
    components : dict
        The k-form ``{I: f_I}`` (k = len(vertices) - 1).  k = 0 evaluates
        ``f`` at the single vertex.
    symbols : sequence of sympy.Symbol
        The n coordinate symbols.
    vertices : array-like, shape (k + 1, n)
        Oriented simplex, converted exactly; k = 1, 2 are the tested cases
        (any ``0 <= k <= n`` works).

    Returns
    -------
    sympy.Expr
        The exact value.

    Raises
    ------
    ValueError
        If the degree of the form does not match the simplex.

    Examples
    --------
    >>> import sympy
    >>> x, y = sympy.symbols("x y")
    >>> tri = [(0, 0), (1, 0), (0, 1)]
    >>> form_on_simplex({(0, 1): 1}, [x, y], tri)          # counter-clockwise area
    1/2
    >>> form_on_simplex({(0, 1): 1}, [x, y], tri[::-1])
    -1/2
    >>> form_on_simplex({(1,): x}, [x, y], [(1, 0), (1, 2)])  # x dy along x = 1
    2
    """
    syms, pts, k, J, u, phi = _simplex_setup(symbols, vertices)
    form, degree = _canonical_form(components, len(syms))
    if degree is not None and degree != k:
        raise ValueError(
            f"a {degree}-form cannot be integrated over a {k}-simplex ({k + 1} vertices)"
        )
    if not form:
        return sympy.Integer(0)
    sub = dict(zip(syms, phi))
    integrand = sympy.Integer(0)
    for key, f in form.items():
        minor = J.extract(list(key), list(range(k))).det() if k else sympy.Integer(1)
        if minor != 0:
            integrand += f.xreplace(sub) * minor
    if k == 0:
        return _tidy(integrand)
    return _tidy(_integrate_standard_simplex(integrand, u))
