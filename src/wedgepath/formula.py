"""Safe parsing of user formulas such as ``"x**2 + 3*sin(y)"`` into sympy.

The command line accepts weights and fields as text.  Text is never handed to
Python's ``eval`` (nor to ``sympy.sympify``, which evaluates): it is parsed
with :mod:`ast` and every node is checked against a fixed list — numbers, the
variables the caller allows, ``+ - * / **``, parentheses and a fixed set of
functions.  Anything else (attributes, subscripts, names not listed,
keywords, comprehensions, strings) is refused with a ``ValueError`` naming it.

The work a formula can cause is bounded without expanding or evaluating it
symbolically: numbers are read exactly from their text and limited in size,
exponents and polynomial degrees are limited (:func:`degree_bound` walks the
tree once), constants are evaluated in float64 by numpy (:func:`float_value`;
sympy's own ``float(exp(exp(10**60)))`` never returns), and
:func:`evaluation_cost` gives the per-point cost the command line uses to
bound a region integral before it starts.

Examples
--------
>>> import sympy as sp
>>> from wedgepath.formula import parse_formula
>>> x, y = sp.symbols("x y", real=True)
>>> parse_formula("x**2 + 3*sin(y)", {"x": x, "y": y})
x**2 + 3*sin(y)
>>> parse_formula("__import__('os')", {"x": x})
Traceback (most recent call last):
...
ValueError: formula: unknown function '__import__'; allowed: Abs, abs, acos, asin, atan, cos, cosh, exp, log, sin, sinh, sqrt, tan, tanh
"""

from __future__ import annotations

import ast
import math
import warnings

import numpy as np
import sympy

__all__ = ["parse_formula", "degree_bound", "evaluation_cost", "float_value", "numpy_function",
           "FUNCTIONS", "CONSTANTS"]

#: functions a formula may call
FUNCTIONS = {
    "sin": sympy.sin, "cos": sympy.cos, "tan": sympy.tan,
    "asin": sympy.asin, "acos": sympy.acos, "atan": sympy.atan,
    "sinh": sympy.sinh, "cosh": sympy.cosh, "tanh": sympy.tanh,
    "exp": sympy.exp, "log": sympy.log, "sqrt": sympy.sqrt,
    "abs": sympy.Abs, "Abs": sympy.Abs,
}
#: named constants a formula may use
CONSTANTS = {"pi": sympy.pi, "e": sympy.E}

_BINOPS = {
    ast.Add: lambda a, b: a + b,
    ast.Sub: lambda a, b: a - b,
    ast.Mult: lambda a, b: a * b,
    ast.Div: lambda a, b: a / b,
    ast.Pow: lambda a, b: a ** b,
}
_MAX_LENGTH = 2000
_MAX_EXPONENT = 64
#: largest number a formula may build, in decimal digits (9**64 has 62; beyond this the
#: arithmetic itself, not the integration, would take the time)
_MAX_DIGITS = 400
#: largest polynomial degree a formula may build (exact integration needs about degree / 2
#: quadrature points per segment)
_MAX_DEGREE = 256


def parse_formula(text: str, variables: dict):
    """Parse ``text`` into a sympy expression over ``variables``.

    Parameters
    ----------
    text : str
        The formula, in Python-like syntax (``^`` is accepted for powers).
    variables : dict
        Allowed variable names mapped to sympy symbols.

    Returns
    -------
    sympy.Expr

    Raises
    ------
    ValueError
        For syntax errors, unknown names or functions, and any construct
        outside the fixed list.  The message starts with ``formula:``.
    """
    if not isinstance(text, str):
        raise TypeError(f"formula must be a string, got {type(text).__name__}")
    if len(text) > _MAX_LENGTH:
        raise ValueError(f"formula: longer than {_MAX_LENGTH} characters")
    src = text.strip().replace("^", "**")
    if not src:
        raise ValueError("formula: empty")
    try:
        tree = ast.parse(src, mode="eval")
    except SyntaxError as exc:
        raise ValueError(f"formula: syntax error in {text!r} at column {exc.offset}") from None
    try:
        expr = _build(tree.body, variables, src, {})
    except RecursionError:
        raise ValueError("formula: too deeply nested") from None
    expr = sympy.sympify(expr)  # a number literal becomes a sympy number; no parsing of text here
    if expr.has(sympy.zoo, sympy.nan, sympy.oo, -sympy.oo):
        raise ValueError(f"formula: {text!r} is not finite (e.g. division by zero)")
    if not expr.free_symbols:
        v = float_value(expr)
        if isinstance(v, complex):
            raise ValueError(f"formula: {text!r} is not a real number ({v})")
        if not math.isfinite(v):
            raise ValueError(f"formula: {text!r} is a constant beyond float64 (it evaluates to "
                             f"{v})")
    return expr


def float_value(expr):
    """A constant sympy expression evaluated in float64, in bounded time.

    Exact numbers (integers, rationals, floats) are rounded once; anything
    else is evaluated by numpy in float64, so that no arbitrary-precision
    evaluation can run away (``float(exp(exp(10**60)))`` does not finish in
    sympy).  Returns a float (``inf`` or ``nan`` when the value leaves float64)
    or a complex for a complex value.

    Examples
    --------
    >>> import sympy as sp
    >>> from wedgepath.formula import float_value
    >>> float_value(sp.Rational(1, 3)), float_value(sp.exp(sp.exp(10**60)))
    (0.3333333333333333, inf)
    """
    expr = sympy.sympify(expr, strict=True)
    if expr.has(sympy.zoo, sympy.nan):
        return math.nan
    if expr.is_Number:
        try:
            return float(expr)
        except OverflowError:
            return math.copysign(math.inf, 1 if expr > 0 else -1)
    f = numpy_function(expr, ())
    with np.errstate(all="ignore"), warnings.catch_warnings():
        warnings.simplefilter("ignore")
        try:
            v = f()
        except (OverflowError, TypeError, ValueError, ZeroDivisionError):
            return math.nan
    v = complex(v)
    return v.real if v.imag == 0 else v


def numpy_function(expr, symbols):
    """``sympy.lambdify(symbols, expr, "numpy")`` that also takes huge integer constants.

    Integers beyond 2**53 (``x * 10**400``) are passed to the generated
    function as float arguments (``inf`` beyond float64), because numpy's
    ufuncs refuse huge Python ints; they are replaced by dummy symbols, not by
    sympy Floats, so that sympy evaluates nothing itself.
    """
    expr = sympy.sympify(expr, strict=True)
    big = sorted((n for n in expr.atoms(sympy.Integer) if abs(n) > 2 ** 53), key=int)
    if not big:
        return sympy.lambdify(tuple(symbols), expr, modules="numpy")
    dummies = [sympy.Dummy() for _ in big]
    f = sympy.lambdify(tuple(symbols) + tuple(dummies), expr.xreplace(dict(zip(big, dummies))),
                       modules="numpy")
    extra = tuple(_to_float(n) for n in big)

    def func(*args):
        return f(*args, *extra)
    return func


def _to_float(n):
    try:
        return float(n)
    except OverflowError:
        return math.inf if n > 0 else -math.inf


#: work units per evaluation point (about nanoseconds of numpy on one core of the development
#: machine; benchmarks/bench_formulas.py prints measured against predicted)
POINT_OVERHEAD = 30
_COSTS = {"Pow": 40, "sin": 20, "cos": 20, "tan": 30, "asin": 30, "acos": 30, "atan": 20,
          "sinh": 30, "cosh": 30, "tanh": 30, "exp": 15, "log": 20, "sqrt": 6, "Abs": 2}
_OTHER = 30
#: a trigonometric function of an argument holding a number this large costs _HUGE_TRIG:
#: numpy's argument reduction of huge values is about ten times slower
_HUGE_ARGUMENT = 1e6
_HUGE_TRIG = 150


def evaluation_cost(expr) -> int:
    """Work units to evaluate ``expr`` at one point (numpy, float64), without evaluating it.

    Each sum or product costs 2 per term, a power 40 (4 for a small integer
    exponent, which numpy multiplies out), ``sin``/``cos``/``atan`` 20 (150
    when the argument holds a number of magnitude 10**6 or more, whose
    argument reduction is slow), the other trigonometric and hyperbolic
    functions 30, ``exp`` 15, ``log`` 20, ``sqrt`` 6, ``abs`` 2: about the
    nanoseconds numpy takes per value (measured by benchmarks/bench_formulas.py).
    The command line adds ``POINT_OVERHEAD`` per point for the quadrature
    and bounds points x cost (docs/cli.md).  The count is the time model of a
    work limit, not a promise of time: values of huge magnitude in the data
    slow trigonometric functions down the same way.

    Examples
    --------
    >>> import sympy as sp
    >>> from wedgepath.formula import evaluation_cost
    >>> x, y = sp.symbols("x y")
    >>> evaluation_cost(x * y), evaluation_cost(sp.sin(x) + y**2), evaluation_cost(x**64)
    (4, 28, 40)
    >>> evaluation_cost(sp.sin(10**9 * x))
    154
    """
    total = 0
    for node in sympy.preorder_traversal(sympy.sympify(expr, strict=True)):
        if node.is_Add or node.is_Mul:
            total += 2 * len(node.args)
        elif node.is_Pow:
            ex = node.args[1]
            total += 4 if (ex.is_Integer and abs(int(ex)) <= 4) else _COSTS["Pow"]
        elif isinstance(node, sympy.Function):
            name = type(node).__name__
            cost = _COSTS.get(name, _OTHER)
            if name in ("sin", "cos", "tan") and _holds_huge_number(node.args[0]):
                cost = _HUGE_TRIG
            total += cost
    return total


def _holds_huge_number(arg) -> bool:
    for n in arg.atoms(sympy.Number):
        v = float_value(n)
        if isinstance(v, complex) or not math.isfinite(v) or abs(v) >= _HUGE_ARGUMENT:
            return True
    return False


def _digits(num) -> float:
    """Decimal digits of the numerator and denominator of a sympy number (cheap, no evaluation)."""
    num = sympy.sympify(num)
    if num.is_Rational:
        return 0.30103 * max(abs(int(num.p)).bit_length(), int(num.q).bit_length())
    if num.is_Float:
        return 20.0
    return 0.0


def degree_bound(expr, symbols=None, _memo=None) -> int:
    """An upper bound of the total degree of ``expr`` in ``symbols``, found without expanding.

    Sums and products are bounded by the largest and the sum of their parts'
    bounds, a power with a positive integer exponent ``k`` by ``k`` times its
    base's; other symbols (``symbols`` given) count as constants.  The bound is
    the degree itself unless terms cancel on expansion (``(x + 1)**2 - x**2``
    gives 2 for a true degree 1).  The cost is one pass over the expression
    tree, however large the expanded polynomial would be: ``(x + y + 1)**256``
    (33,153 terms expanded) takes microseconds.  For a non-polynomial part
    (``sin(x)``, ``x**0.5``) the bound of its arguments is used, a measure of
    size only.

    Examples
    --------
    >>> import sympy as sp
    >>> from wedgepath.formula import degree_bound
    >>> x, y = sp.symbols("x y")
    >>> degree_bound(((x + y + 1)**64)**4), degree_bound(x**3 * y + y, [x, y])
    (256, 4)
    >>> degree_bound(x**2 * y, [y])
    1
    """
    import sympy as sp

    expr = sp.sympify(expr, strict=True)
    wanted = None if symbols is None else set(symbols)
    memo = {} if _memo is None else _memo       # the parser shares one across its steps
    stack = [(expr, False)]
    while stack:                 # post-order walk with an explicit stack: no recursion limit
        node, ready = stack.pop()
        if node in memo:
            continue
        if not ready:
            stack.append((node, True))
            stack.extend((a, False) for a in node.args if a not in memo)
            continue
        memo[node] = _node_degree(node, memo, wanted)
    return memo[expr]


def _node_degree(node, memo, wanted) -> int:
    if node.is_Symbol:
        return 1 if (wanted is None or node in wanted) else 0
    if node.is_number or not node.args:
        return 0
    if node.is_Add:
        return max(memo[a] for a in node.args)
    if node.is_Mul:
        return sum(memo[a] for a in node.args)
    if node.is_Pow:
        base, ex = node.args
        if ex.is_Integer and ex > 0:
            return int(ex) * memo[base]
        return memo[base]
    return max(memo[a] for a in node.args)


def _literal(node, src):
    """An exact sympy number for a numeric literal, from its source text where possible."""
    value = node.value
    if isinstance(value, int):
        return sympy.Integer(value)
    text = ast.get_source_segment(src, node) or repr(value)
    try:
        # "1e999" is 10**999 exactly (refused below by its size), never float('inf')
        return sympy.Rational(text.replace("_", ""))
    except (TypeError, ValueError, SyntaxError):
        return sympy.Rational(repr(value))


def _shown(src, node):
    seg = ast.get_source_segment(src, node)
    return f" ({seg!r})" if seg and len(seg) <= 60 else ""


def _exponent_ok(right, src, node):
    if right.is_Rational:
        mag = abs(right)
    else:   # a constant expression: its float64 value, in bounded time
        v = float_value(right)
        if isinstance(v, complex) or not math.isfinite(v):
            raise ValueError(f"formula: the exponent{_shown(src, node)} is not a finite real "
                             "number")
        mag = abs(v)
    if mag > _MAX_EXPONENT:
        raise ValueError(f"formula: exponent {right} too large (at most {_MAX_EXPONENT})")
    return mag


def _build(node, variables, src, memo):
    if isinstance(node, ast.Constant):
        if isinstance(node.value, bool) or not isinstance(node.value, (int, float)):
            raise ValueError(f"formula: only numbers are allowed as literals, got {node.value!r}")
        num = _literal(node, src)
        if _digits(num) > _MAX_DIGITS:
            raise ValueError(f"formula: the number{_shown(src, node)} has more than "
                             f"{_MAX_DIGITS} digits")
        return num
    if isinstance(node, ast.Name):
        if node.id in variables:
            return variables[node.id]
        if node.id in CONSTANTS:
            return CONSTANTS[node.id]
        allowed = ", ".join(sorted(list(variables) + list(CONSTANTS)))
        raise ValueError(f"formula: unknown name {node.id!r}; allowed: {allowed}")
    if isinstance(node, ast.BinOp) and type(node.op) in _BINOPS:
        left = _build(node.left, variables, src, memo)
        right = _build(node.right, variables, src, memo)
        for part, sub in ((left, node.left), (right, node.right)):
            if part.has(sympy.zoo, sympy.nan, sympy.oo, -sympy.oo):
                raise ValueError(f"formula: {ast.get_source_segment(src, sub)!r} is not finite "
                                 "(e.g. division by zero)")
        if isinstance(node.op, ast.Pow) and right.is_number:
            mag = _exponent_ok(right, src, node.right)
            if left.is_number and _digits(left) * mag > _MAX_DIGITS:
                raise ValueError(f"formula: a power with more than {_MAX_DIGITS} digits")
        out = sympy.sympify(_BINOPS[type(node.op)](left, right))
        if out.is_Rational and _digits(out) > _MAX_DIGITS:
            raise ValueError(f"formula: a number with more than {_MAX_DIGITS} digits")
        if degree_bound(out, None, memo) > _MAX_DEGREE:
            raise ValueError(f"formula: polynomial degree above {_MAX_DEGREE}")
        return out
    if isinstance(node, ast.UnaryOp) and isinstance(node.op, (ast.UAdd, ast.USub)):
        val = _build(node.operand, variables, src, memo)
        return -val if isinstance(node.op, ast.USub) else val
    if isinstance(node, ast.Call):
        if not isinstance(node.func, ast.Name):
            raise ValueError(f"formula: only plain function names may be called"
                             f"{_shown(src, node.func)}")
        name = node.func.id
        if name not in FUNCTIONS:
            raise ValueError(f"formula: unknown function {name!r}; allowed: "
                             + ", ".join(sorted(FUNCTIONS)))
        if node.keywords or len(node.args) != 1:
            raise ValueError(f"formula: {name}() takes exactly one argument")
        return FUNCTIONS[name](_build(node.args[0], variables, src, memo))
    raise ValueError(f"formula: {type(node).__name__} is not allowed{_shown(src, node)} "
                     "(use numbers, variables, + - * / **, parentheses and functions)")
