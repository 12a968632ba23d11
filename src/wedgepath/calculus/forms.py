"""Differential forms on R^n with constant, callable or sympy coefficients.

A k-form is stored as ``{I: coefficient}`` over strictly increasing index
tuples ``I = (i_1 < ... < i_k)``, meaning ``sum_I f_I dx_{i_1} ^ ... ^ dx_{i_k}``.
Coefficients come in three kinds, which decide how exactly a form can be
integrated:

``constant``
    A real number.  Integrals of constant forms are exact.
``sympy``
    An expression in the form's coordinate symbols ``x_0 .. x_{n-1}``.  It is
    evaluated numerically through :func:`sympy.lambdify`; a polynomial
    expression is integrated exactly by Gauss-Legendre quadrature of
    sufficient order, and ``.d()`` is exact.
``callable``
    ``f(coords) -> values`` with ``coords`` of shape ``(m, n)`` and values of
    shape ``(m,)`` (vectorised over points).  Integrated adaptively with an
    error estimate, unless declared polynomial with ``poly_degree=``.

Examples
--------
>>> import wedgepath as wp
>>> w = wp.dx(0) ^ wp.dx(1)
>>> w.degree, w.terms_as_dict()
(2, {(0, 1): 1.0})
>>> (wp.dx(1) ^ wp.dx(0)).terms_as_dict()
{(0, 1): -1.0}
>>> (wp.dx(0) ^ wp.dx(0)) == 0
True
"""

from __future__ import annotations

import numbers
from collections.abc import Mapping
from itertools import combinations

import numpy as np

from .._exterior import sort_with_sign, wedge_terms
from .._lazy import is_sympy
from .._validation import as_int, check_values

__all__ = ["Form", "ZeroForm", "OneForm", "TwoForm", "dx", "Coefficient", "checked_values"]


# --------------------------------------------------------------------------- coefficients
class Coefficient:
    """One coefficient function of a form (internal value object).

    Attributes
    ----------
    kind : {"constant", "sympy", "callable"}
    poly_degree : int or None
        Total polynomial degree when known (0 for constants), else None.
    """

    __slots__ = ("kind", "value", "expr", "symbols", "func", "poly_degree")

    def __init__(self, kind, *, value=None, expr=None, symbols=None, func=None, poly_degree=None):
        self.kind = kind
        self.value = value
        self.expr = expr
        self.symbols = symbols
        self.func = func
        self.poly_degree = poly_degree

    # -- constructors
    @classmethod
    def constant(cls, c):
        return cls("constant", value=float(c), poly_degree=0)

    @classmethod
    def from_sympy(cls, expr, symbols):
        """A coefficient from a sympy expression, a number or a formula string.

        A string is parsed by :func:`wedgepath.formula.parse_formula` with the
        names of ``symbols`` as its only variables; it is never evaluated.
        The polynomial degree is bounded without expanding
        (:func:`wedgepath.formula.degree_bound`): an upper bound, exact unless
        terms cancel, which is all that exact quadrature needs.
        """
        import sympy
        expr = _as_expression(expr, symbols)
        if expr.has(sympy.I) or expr.has(sympy.zoo) or expr.has(sympy.nan) or expr.has(sympy.oo):
            raise ValueError(f"form coefficient {expr} is not a finite real expression")
        free = expr.free_symbols - set(symbols)
        if free:
            names = ", ".join(sorted(str(s) for s in free))
            raise ValueError(f"form coefficient {expr} uses symbols {names} that are not "
                             f"coordinates {tuple(str(s) for s in symbols)}; substitute "
                             "numbers for parameters first")
        from ..formula import degree_bound, float_value, numpy_function
        if not expr.free_symbols:
            # float64 in bounded time: sympy's own float() of exp(exp(10**60)) never returns
            v = float_value(expr)
            if isinstance(v, complex):
                raise ValueError(f"form coefficient {expr} is not a real number")
            if not np.isfinite(v):
                raise ValueError(f"form coefficient {expr} is not a finite float64 number (it "
                                 f"evaluates to {v})")
            return cls.constant(v)
        deg = None
        if expr.is_polynomial(*symbols):
            deg = degree_bound(expr, symbols)
        func = numpy_function(expr, symbols)
        return cls("sympy", expr=expr, symbols=tuple(symbols), func=func, poly_degree=deg)

    @classmethod
    def from_callable(cls, f, poly_degree=None):
        """A callable coefficient; ``poly_degree`` declares it a polynomial of that degree."""
        if poly_degree is not None:
            poly_degree = as_int(poly_degree, "poly_degree")
            if poly_degree < 0:
                raise ValueError(f"poly_degree must be >= 0, got {poly_degree}")
        return cls("callable", func=f, poly_degree=poly_degree)

    @classmethod
    def make(cls, spec, symbols=None, poly_degree=None):
        """Build from a number, a sympy expression or a callable."""
        if isinstance(spec, Coefficient):
            return spec
        if isinstance(spec, (bool, np.bool_)):
            raise TypeError("a form coefficient cannot be a boolean")
        if isinstance(spec, numbers.Real) or (isinstance(spec, np.ndarray) and spec.ndim == 0
                                              and spec.dtype.kind in "iuf"):
            try:
                v = float(spec)
            except OverflowError:
                raise ValueError("form coefficient is too large for float64") from None
            if not np.isfinite(v):
                raise ValueError(f"form coefficient must be finite, got {v}")
            return cls.constant(v)
        if is_sympy(spec):
            if not spec.free_symbols:
                return cls.from_sympy(spec, ())
            if symbols is None:
                raise ValueError("sympy coefficients need coordinate symbols: pass symbols=")
            return cls.from_sympy(spec, symbols)
        if callable(spec):
            return cls.from_callable(spec, poly_degree)
        raise TypeError(f"a form coefficient must be a real number, a callable or a sympy "
                        f"expression, got {type(spec).__name__}")

    # -- queries
    @property
    def is_zero(self):
        if self.kind == "constant":
            return self.value == 0.0
        if self.kind == "sympy":
            import sympy
            return sympy.expand(self.expr) == 0
        return False

    def as_sympy(self):
        import sympy
        if self.kind == "constant":
            return sympy.Float(self.value) if self.value != int(self.value) else sympy.Integer(int(self.value))
        if self.kind == "sympy":
            return self.expr
        return None

    def evaluate(self, coords: np.ndarray, label: str = "coefficient", *,
                 strict: bool = True) -> np.ndarray:
        """Values at ``coords`` (m, n), shape (m,).

        Floating-point warnings inside the coefficient are silenced.  With
        ``strict`` (the default) a non-finite result is reported as a
        ValueError naming the first bad point; otherwise non-finite values
        come back as NaN (adaptive refinement uses this to stop at a
        singularity instead of failing).
        """
        m = coords.shape[0]
        if self.kind == "constant":
            return np.full(m, self.value)
        with np.errstate(all="ignore"):
            if self.kind == "sympy":
                vals = self.func(*coords.T)
            else:
                vals = self.func(coords)
        return checked_values(vals, m, label, lambda k: f"the point {coords[k].tolist()}",
                              strict)

    # -- algebra
    def _combine(self, other, op):
        a, b = self, other
        if a.kind == "constant" and b.kind == "constant":
            return Coefficient.constant(op(a.value, b.value))
        if a.kind != "callable" and b.kind != "callable":
            syms = a.symbols or b.symbols
            if a.symbols and b.symbols and a.symbols != b.symbols:
                raise ValueError("cannot combine sympy forms over different coordinate symbols "
                                 f"{a.symbols} and {b.symbols}")
            return Coefficient.from_sympy(op(a.as_sympy(), b.as_sympy()), syms)
        fa, fb = a, b
        if op is _mul:
            deg = None if (a.poly_degree is None or b.poly_degree is None) else a.poly_degree + b.poly_degree
        else:
            deg = None if (a.poly_degree is None or b.poly_degree is None) else max(a.poly_degree, b.poly_degree)

        def f(coords):
            # non-finite parts come back as NaN; the caller's evaluate() reports them
            with np.errstate(all="ignore"):
                return op(fa.evaluate(coords, strict=False), fb.evaluate(coords, strict=False))
        return Coefficient("callable", func=f, poly_degree=deg)

    def __mul__(self, other):
        return self._combine(other, _mul)

    def __add__(self, other):
        return self._combine(other, _add)

    def scaled(self, c: float):
        return self._combine(Coefficient.constant(c), _mul)

    def equals(self, other) -> bool:
        import sympy
        if self.kind == "callable" or other.kind == "callable":
            return self.func is other.func and self.kind == other.kind
        return sympy.simplify(self.as_sympy() - other.as_sympy()) == 0

    def __repr__(self):
        if self.kind == "constant":
            return repr(self.value)
        if self.kind == "sympy":
            return str(self.expr)
        name = getattr(self.func, "__name__", "f")
        return f"<callable {name}>"


def _as_expression(value, symbols, what="form coefficient"):
    """A sympy expression from a sympy object, a real number or a formula string.

    Text is never handed to ``sympy.sympify`` (which evaluates it as Python):
    a string is parsed by :func:`wedgepath.formula.parse_formula`, whose only
    names are those of ``symbols``.  Anything else is refused.
    """
    if is_sympy(value):
        return value
    if isinstance(value, str):
        from ..formula import parse_formula

        return parse_formula(value, {s.name: s for s in symbols})
    if isinstance(value, numbers.Real) and not isinstance(value, (bool, np.bool_)):
        import sympy
        return sympy.sympify(value, strict=True)   # a number: strict never parses text
    raise TypeError(f"{what} must be a sympy expression, a real number or a formula string, "
                    f"got {type(value).__name__}; pass sympy expressions")


def _mul(a, b):
    return a * b


def _add(a, b):
    return a + b


def checked_values(vals, m, label, where, strict=True):
    """What a user's function returned for ``m`` points, checked (see ``check_values``).

    With ``strict`` non-finite values raise a ValueError naming the point
    ``where(k)``; otherwise they come back as NaN (shape and type are
    checked either way).
    """
    if strict:
        return check_values(vals, m, label, where)
    arr = np.asarray(vals)
    if arr.dtype == np.float64 and arr.shape == (m,):     # the usual case: one pass
        finite = np.isfinite(arr)
        if finite.all():
            return arr
        return np.where(finite, arr, np.nan)
    if arr.dtype.kind == "f":
        bad = ~np.isfinite(arr)
        if bad.any():
            out = check_values(np.where(bad, 0.0, arr), m, label, where).copy()
            out[np.broadcast_to(bad, out.shape)] = np.nan
            return out
    return check_values(arr, m, label, where)


def _signed_product(a, b, sign):
    c = a * b
    return c if sign > 0 else c.scaled(-1.0)


def _add_coefficients(a, b):
    return a + b


def _sympy_product(a, b, sign):
    return sign * a * b


# --------------------------------------------------------------------------- forms
class Form:
    """A differential k-form on R^n (see the module docstring).

    Build forms with :func:`dx`, :class:`ZeroForm`, :class:`OneForm`,
    :class:`TwoForm` or :meth:`Form.from_sympy`, and combine them with ``+``,
    ``-``, scalar ``*`` and the wedge product ``^``.

    Attributes
    ----------
    degree : int
        k.
    dim : int or None
        n when known (set by components or symbols); ``None`` for forms built
        from constants only, which fit any R^n with n > max index.
    symbols : tuple of sympy.Symbol or None
        Coordinate symbols of sympy coefficients.
    """

    __slots__ = ("_terms", "degree", "dim", "symbols")

    def __init__(self, terms, degree, dim=None, symbols=None):
        degree = as_int(degree, "degree")
        if degree < 0:
            raise ValueError(f"form degree must be >= 0, got {degree}")
        if dim is not None:
            dim = as_int(dim, "dim")
            if dim < 1:
                raise ValueError(f"dimension must be >= 1, got {dim}")
        if symbols is not None:
            symbols = tuple(symbols)
            if dim is None:
                dim = len(symbols)
            elif len(symbols) != dim:
                raise ValueError(f"{len(symbols)} symbols for a form on R^{dim}")
        clean = {}
        if not isinstance(terms, Mapping):
            raise TypeError(f"terms must be a dict {{index tuple: coefficient}}, "
                            f"got {type(terms).__name__}")
        for idx, coef in terms.items():
            if not isinstance(idx, tuple):
                raise TypeError(f"form term keys must be tuples of indices, e.g. (0, 1), got {idx!r}")
            idx = tuple(as_int(i, "form index") for i in idx)
            if len(idx) != degree:
                raise ValueError(f"term {idx} does not have {degree} indices")
            if any(i < 0 for i in idx):
                raise ValueError(f"form indices must be >= 0, got {idx}")
            if dim is not None and any(i >= dim for i in idx):
                raise ValueError(f"form index {max(idx)} out of range for R^{dim}")
            sidx, sign = sort_with_sign(idx)
            if sign == 0:
                continue
            coef = Coefficient.make(coef, symbols)
            if sign < 0:
                coef = coef.scaled(-1.0)
            if sidx in clean:
                coef = clean[sidx] + coef
            clean[sidx] = coef
        self._terms = {k: v for k, v in sorted(clean.items()) if not v.is_zero}
        self.degree = degree
        self.dim = dim
        self.symbols = symbols

    # ------------------------------------------------------------ constructors
    @classmethod
    def from_sympy(cls, components, symbols):
        """A form from sympy expressions over coordinate ``symbols`` (x_0..x_{n-1}).

        ``components`` is a scalar expression (0-form), a sequence of n
        expressions (1-form ``sum f_i dx_i``) or a dict ``{index tuple: expr}``
        (any degree).  An expression may be a sympy expression, a real number
        or a formula string such as ``"x*y + sin(x)"``: strings are parsed by
        :func:`wedgepath.formula.parse_formula` with the names of ``symbols``
        as the only variables, never evaluated as Python.

        Examples
        --------
        >>> import sympy as sp, wedgepath as wp
        >>> x, y = sp.symbols("x y")
        >>> wp.Form.from_sympy(["-y", "x"], [x, y]).terms_as_dict()
        {(0,): -y, (1,): x}
        >>> wp.Form.from_sympy("__import__('os')", [x, y])
        Traceback (most recent call last):
        ...
        ValueError: formula: unknown function '__import__'; allowed: Abs, abs, acos, asin, atan, cos, cosh, exp, log, sin, sinh, sqrt, tan, tanh
        """
        symbols = _check_symbols(symbols)
        n = len(symbols)
        if isinstance(components, dict):
            if not components:
                raise ValueError("empty dict: give at least one term (or use a zero coefficient)")
            degrees = {len(k) for k in components}
            if len(degrees) != 1:
                raise ValueError(f"terms of mixed degree {sorted(degrees)}")
            return Form({k: _as_expression(v, symbols) for k, v in components.items()},
                        degrees.pop(), n, symbols)
        if is_sympy(components) or isinstance(components, (numbers.Real, str)):
            return Form({(): _as_expression(components, symbols)}, 0, n, symbols)
        if isinstance(components, (bytes, bytearray)) or not hasattr(components, "__iter__"):
            raise TypeError(f"components must be an expression, a sequence of {n} expressions "
                            f"or a dict {{index tuple: expression}}, got "
                            f"{type(components).__name__}")
        comps = list(components)
        if len(comps) != n:
            raise ValueError(f"{len(comps)} components for {n} symbols")
        return Form({(i,): _as_expression(c, symbols) for i, c in enumerate(comps)}, 1, n,
                    symbols)

    # ------------------------------------------------------------------ views
    @property
    def terms(self):
        """``{index tuple: Coefficient}``, indices increasing, zero terms dropped."""
        return dict(self._terms)

    def terms_as_dict(self):
        """Terms with coefficients shown as numbers, sympy expressions or callables."""
        out = {}
        for k, c in self._terms.items():
            out[k] = c.value if c.kind == "constant" else (c.expr if c.kind == "sympy" else c.func)
        return out

    @property
    def is_constant(self) -> bool:
        return all(c.kind == "constant" for c in self._terms.values())

    @property
    def is_symbolic(self) -> bool:
        """True when every coefficient is a constant or a sympy expression."""
        return all(c.kind != "callable" for c in self._terms.values())

    @property
    def poly_degree(self):
        """Largest polynomial degree of the coefficients, or None if unknown/not polynomial."""
        degs = [c.poly_degree for c in self._terms.values()]
        if any(d is None for d in degs):
            return None
        return max(degs, default=0)

    @property
    def min_dim(self) -> int:
        """Smallest ambient dimension the form fits."""
        if self.dim is not None:
            return self.dim
        top = max((max(k) for k in self._terms if k), default=-1)
        return max(top + 1, self.degree, 1)

    def is_zero(self) -> bool:
        return not self._terms

    def to_sympy(self):
        """``{index tuple: sympy expr}``; TypeError for callable coefficients."""
        if not self.is_symbolic:
            raise TypeError("this form has callable coefficients; it has no sympy expression")
        return {k: c.as_sympy() for k, c in self._terms.items()}

    def __repr__(self):
        if not self._terms:
            return f"Form(0, degree={self.degree})"
        parts = []
        for k, c in self._terms.items():
            basis = "^".join(f"dx{i}" for i in k)
            parts.append(f"({c!r})" + ("*" + basis if basis else ""))
        return " + ".join(parts)

    # ---------------------------------------------------------------- algebra
    def _meet(self, other, what):
        if self.dim is not None and other.dim is not None and self.dim != other.dim:
            raise ValueError(f"cannot {what} forms on R^{self.dim} and R^{other.dim}")
        if self.symbols is not None and other.symbols is not None and self.symbols != other.symbols:
            raise ValueError(f"cannot {what} forms over different coordinate symbols")
        dim = self.dim if self.dim is not None else other.dim
        syms = self.symbols if self.symbols is not None else other.symbols
        return dim, syms

    def __add__(self, other):
        if isinstance(other, numbers.Number) and other == 0:
            return self
        if not isinstance(other, Form):
            return NotImplemented
        if other.degree != self.degree:
            raise ValueError(f"cannot add a {self.degree}-form and a {other.degree}-form")
        dim, syms = self._meet(other, "add")
        terms = dict(self._terms)
        for k, c in other._terms.items():
            terms[k] = terms[k] + c if k in terms else c
        return Form(terms, self.degree, dim, syms)

    __radd__ = __add__

    def __neg__(self):
        return self * -1.0

    def __sub__(self, other):
        if not isinstance(other, Form):
            return NotImplemented
        return self + (-other)

    def __mul__(self, c):
        if isinstance(c, Form):
            if c.degree == 0 or self.degree == 0:
                return self ^ c
            raise TypeError("use ^ for the wedge product of forms")
        if isinstance(c, (bool, np.bool_)):
            raise TypeError("cannot scale a form by a boolean")
        if isinstance(c, numbers.Real):
            if not np.isfinite(float(c)):
                raise ValueError(f"scale factor must be finite, got {c}")
            return Form({k: v.scaled(float(c)) for k, v in self._terms.items()},
                        self.degree, self.dim, self.symbols)
        if is_sympy(c):
            if self.symbols is None:
                raise ValueError("multiply by a sympy expression only forms that have symbols")
            f = Coefficient.from_sympy(c, self.symbols)
            return Form({k: v * f for k, v in self._terms.items()}, self.degree, self.dim, self.symbols)
        return NotImplemented

    __rmul__ = __mul__

    def __xor__(self, other):
        """Wedge product."""
        if not isinstance(other, Form):
            return NotImplemented
        dim, syms = self._meet(other, "wedge")
        terms = wedge_terms(self._terms, other._terms, _signed_product, _add_coefficients)
        return Form(terms, self.degree + other.degree, dim, syms)

    def __eq__(self, other):
        if isinstance(other, numbers.Number) and not isinstance(other, bool) and other == 0:
            return self.is_zero()
        if not isinstance(other, Form):
            return NotImplemented
        if self.degree != other.degree or set(self._terms) != set(other._terms):
            return False
        return all(self._terms[k].equals(other._terms[k]) for k in self._terms)

    __hash__ = None

    # ---------------------------------------------------------------- calculus
    def d(self) -> "Form":
        """Exterior derivative, exact for constant and sympy coefficients.

        ``d(f dx_I) = sum_j (∂f/∂x_j) dx_j ^ dx_I``: the partial derivatives come from
        sympy (deliberately: a sympy coefficient is differentiated by sympy), the
        signs from the same wedge as ``^``.  :func:`wedgepath.symbolic.exterior_derivative`
        is an independent implementation that the tests compare against.

        Raises
        ------
        TypeError
            For callable coefficients, which carry no derivative.  Build the
            form with sympy (``from_sympy``) to differentiate it.
        """
        if not self.is_symbolic:
            raise TypeError("d() needs sympy or constant coefficients; this form has callable "
                            "coefficients (build it with Form.from_sympy to differentiate)")
        if self.symbols is None:  # constant form: d = 0
            return Form({}, self.degree + 1, self.dim)
        import sympy

        out = {}
        for idx, coef in self._terms.items():
            expr = coef.as_sympy()
            grad = {}
            for j, xj in enumerate(self.symbols):
                dj = sympy.diff(expr, xj)
                if dj != 0:
                    grad[(j,)] = dj
            part = wedge_terms(grad, {idx: sympy.Integer(1)}, _sympy_product, _add)
            for k, v in part.items():
                out[k] = out[k] + v if k in out else v
        return Form(out, self.degree + 1, self.dim, self.symbols)

    def component_values(self, coords: np.ndarray):
        """``{index tuple: values (m,)}`` of every term at ``coords`` (m, n)."""
        return {k: c.evaluate(coords, f"coefficient of {_basis_name(k)}")
                for k, c in self._terms.items()}


def _basis_name(idx):
    return "^".join(f"dx{i}" for i in idx) if idx else "the 0-form"


def _check_symbols(symbols):
    if is_sympy(symbols, "Symbol"):
        symbols = (symbols,)
    symbols = tuple(symbols)
    if not symbols:
        raise ValueError("give at least one coordinate symbol")
    for s in symbols:
        if not is_sympy(s, "Symbol"):
            raise TypeError(f"coordinate symbols must be sympy Symbols, got {s!r}")
    if len(set(symbols)) != len(symbols):
        raise ValueError("coordinate symbols must be distinct")
    return symbols


def dx(i) -> Form:
    """The constant 1-form dx_i (i counts channels from 0).

    Returns
    -------
    Form
        A 1-form (``isinstance(dx(i), OneForm)`` is True).

    Examples
    --------
    >>> import wedgepath as wp
    >>> w = 2 * wp.dx(0) - wp.dx(2)
    >>> w.terms_as_dict()
    {(0,): 2.0, (2,): -1.0}
    """
    i = as_int(i, "dx index")
    if i < 0:
        raise ValueError(f"dx index must be >= 0, got {i}")
    return Form({(i,): 1.0}, 1)


def _infer_symbols(specs, symbols):
    if symbols is not None:
        return _check_symbols(symbols)
    free = set()
    for s in specs:
        if is_sympy(s):
            free |= s.free_symbols
    if not free:
        return None
    raise ValueError("sympy coefficients need their coordinate symbols: pass symbols=(x, y, ...)")


class _FormOfDegree(type):
    """Metaclass of :class:`ZeroForm`, :class:`OneForm`, :class:`TwoForm`.

    ``isinstance(w, OneForm)`` is True exactly when ``w`` is a :class:`Form`
    of degree 1, however it was built (``dx(0)``, a sum, a wedge, ``d`` of a
    0-form, ``Form.from_sympy``...); likewise for degrees 0 and 2.
    """

    def __instancecheck__(cls, obj):
        return isinstance(obj, Form) and obj.degree == cls.DEGREE


class ZeroForm(Form, metaclass=_FormOfDegree):
    """A 0-form (a function on R^n): a number, a callable on (m, n) coordinates, or sympy.

    ``isinstance(w, ZeroForm)`` is True for every :class:`Form` of degree 0.

    Parameters
    ----------
    f : number, callable or sympy expression
        A callable takes coordinates of shape (m, n) and returns shape (m,).
    dim : int, optional
        n (default: the number of symbols).
    symbols : sequence of sympy.Symbol, optional
        Coordinate symbols (needed when ``f`` is a sympy expression).
    poly_degree : int, optional
        Declares that a callable ``f`` is a polynomial of total degree at
        most ``poly_degree`` (only declare it when it is true).

    Examples
    --------
    >>> import sympy as sp, wedgepath as wp
    >>> x, y = sp.symbols("x y")
    >>> phi = wp.ZeroForm(x**2 * y, symbols=(x, y))
    >>> phi.d().terms_as_dict()
    {(0,): 2*x*y, (1,): x**2}
    >>> isinstance(phi, wp.ZeroForm), isinstance(phi.d(), wp.OneForm)
    (True, True)
    """

    __slots__ = ()
    DEGREE = 0

    def __init__(self, f, *, dim=None, symbols=None, poly_degree=None):
        syms = _infer_symbols([f], symbols)
        if syms is not None:
            dim = len(syms) if dim is None else dim
        Form.__init__(self, {(): Coefficient.make(f, syms, poly_degree)}, 0, dim, syms)

    @classmethod
    def from_sympy(cls, expr, symbols) -> Form:
        """The 0-form of one sympy expression (or formula text) over coordinate ``symbols``."""
        if isinstance(expr, (dict, list, tuple)):
            raise TypeError("ZeroForm.from_sympy needs one expression")
        return Form.from_sympy(expr, symbols)


class OneForm(Form, metaclass=_FormOfDegree):
    """The 1-form ``sum_i f_i dx_i`` on R^n, n = len(components).

    ``isinstance(w, OneForm)`` is True for every :class:`Form` of degree 1
    (``wp.dx(0)`` too).

    Parameters
    ----------
    components : sequence of length n
        Each a number, a vectorised callable ``f(coords (m, n)) -> (m,)``, or a
        sympy expression in ``symbols``.
    symbols : sequence of sympy.Symbol, optional
        Coordinate symbols (needed when components are sympy expressions).
    poly_degree : int, optional
        Declares that the callable components are polynomials of total degree
        at most ``poly_degree``: their integrals along linear segments are
        then computed exactly by Gauss-Legendre quadrature.  Only declare it
        when it is true.

    Examples
    --------
    >>> import numpy as np, wedgepath as wp
    >>> w = wp.OneForm([lambda c: -c[:, 1], lambda c: c[:, 0]], poly_degree=1)
    >>> square = wp.Path([[0, 0], [1, 0], [1, 1], [0, 1], [0, 0]])
    >>> float(wp.integrate(w, square))      # twice the area
    2.0
    >>> isinstance(w, wp.OneForm), isinstance(wp.dx(0) ^ wp.dx(1), wp.OneForm)
    (True, False)
    """

    __slots__ = ()
    DEGREE = 1

    def __init__(self, components, *, symbols=None, poly_degree=None):
        if isinstance(components, (str, bytes)) or not hasattr(components, "__len__"):
            raise TypeError("OneForm needs a sequence of n components")
        comps = list(components)
        if not comps:
            raise ValueError("OneForm needs at least one component")
        syms = _infer_symbols(comps, symbols)
        if syms is not None and len(syms) != len(comps):
            raise ValueError(f"{len(syms)} symbols for {len(comps)} components")
        terms = {(i,): Coefficient.make(c, syms, poly_degree) for i, c in enumerate(comps)}
        Form.__init__(self, terms, 1, len(comps), syms)

    @classmethod
    def from_sympy(cls, exprs, symbols) -> Form:
        """The 1-form ``sum_i exprs[i] dx_i`` from n sympy expressions over n coordinate symbols.

        The same as ``wp.Form.from_sympy(list(exprs), symbols)``, refusing
        anything but a sequence of n expressions.  ``.d()`` of the result is
        exact.

        Examples
        --------
        >>> import sympy as sp, wedgepath as wp
        >>> x, y = sp.symbols("x y")
        >>> w = wp.OneForm.from_sympy([-y, x], [x, y])
        >>> w.d().terms_as_dict()
        {(0, 1): 2.0}
        """
        if isinstance(exprs, (dict, str)) or not hasattr(exprs, "__len__"):
            raise TypeError("OneForm.from_sympy needs a sequence of n expressions, one per "
                            "coordinate")
        return Form.from_sympy(list(exprs), symbols)


class TwoForm(Form, metaclass=_FormOfDegree):
    """The 2-form ``sum f_ij dx_i ^ dx_j`` from ``{(i, j): f_ij}`` or a matrix.

    ``isinstance(w, TwoForm)`` is True for every :class:`Form` of degree 2
    (``wp.dx(0) ^ wp.dx(1)`` too).

    Parameters
    ----------
    components : dict or array_like (n, n)
        A dict ``{(i, j): coefficient}`` (i != j; ``(j, i)`` means the
        negative of ``(i, j)``), or a constant skew-symmetric matrix ``M``
        meaning ``sum_{i<j} M[i, j] dx_i ^ dx_j``.
    dim : int, optional
        n; defaults to the number of symbols or the matrix size.
    symbols : sequence of sympy.Symbol, optional
        Coordinate symbols (needed for sympy coefficients).
    poly_degree : int, optional
        Declares that callable coefficients are polynomials of total degree
        at most ``poly_degree`` (only declare it when it is true).

    Examples
    --------
    >>> import wedgepath as wp
    >>> wp.TwoForm({(1, 0): 3.0}).terms_as_dict()
    {(0, 1): -3.0}
    """

    __slots__ = ()
    DEGREE = 2

    def __init__(self, components, *, dim=None, symbols=None, poly_degree=None):
        if isinstance(components, dict):
            specs = list(components.values())
            syms = _infer_symbols(specs, symbols)
            terms = {}
            for key, c in components.items():
                if not isinstance(key, tuple) or len(key) != 2:
                    raise ValueError(f"TwoForm keys must be index pairs (i, j), got {key!r}")
                i, j = (as_int(v, "form index") for v in key)
                if i == j:
                    raise ValueError(f"term {(i, j)} repeats an index; dx_i ^ dx_i = 0")
                terms[(i, j)] = Coefficient.make(c, syms, poly_degree)
            Form.__init__(self, terms, 2, dim, syms)
            return
        from .._validation import as_float_array
        M = as_float_array(components, "components", ndim=2)
        if M.shape[0] != M.shape[1]:
            raise ValueError(f"a 2-form matrix must be square, got shape {M.shape}")
        if not np.array_equal(M, -M.T):
            raise ValueError("a 2-form matrix must be skew-symmetric (M == -M.T)")
        n = M.shape[0]
        terms = {(i, j): M[i, j] for i, j in combinations(range(n), 2) if M[i, j] != 0}
        Form.__init__(self, terms, 2, n if dim is None else dim)

    @classmethod
    def from_sympy(cls, components, symbols) -> Form:
        """The 2-form ``sum f_ij dx_i ^ dx_j`` from ``{(i, j): sympy expression}``.

        The same as ``wp.TwoForm(components, symbols=symbols)`` with every
        coefficient sympy.

        Examples
        --------
        >>> import sympy as sp, wedgepath as wp
        >>> x, y = sp.symbols("x y")
        >>> wp.TwoForm.from_sympy({(0, 1): x * y}, [x, y]).terms_as_dict()
        {(0, 1): x*y}
        """
        if not isinstance(components, dict):
            raise TypeError("TwoForm.from_sympy needs a dict {(i, j): expression}")
        syms = _check_symbols(symbols)
        return TwoForm({k: _as_expression(v, syms) for k, v in components.items()},
                       dim=len(syms), symbols=syms)
