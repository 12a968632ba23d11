"""Safe parsing of user formulas such as ``"x**2 + 3*sin(y)"`` into sympy.

The command line accepts weights and fields as text.  Text is never handed to
Python's ``eval`` (nor to ``sympy.sympify``, which evaluates): it is parsed
with :mod:`ast` and every node is checked against a fixed list — numbers, the
variables the caller allows, ``+ - * / **``, parentheses and a fixed set of
functions.  Anything else (attributes, subscripts, names not listed,
keywords, comprehensions, strings) is refused with a ``ValueError`` naming it.

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

import sympy

__all__ = ["parse_formula", "degree_bound", "FUNCTIONS", "CONSTANTS"]

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
        expr = _build(tree.body, variables)
    except RecursionError:
        raise ValueError("formula: too deeply nested") from None
    expr = sympy.sympify(expr)  # a number literal becomes a sympy number; no parsing of text here
    if expr.has(sympy.zoo, sympy.nan, sympy.oo, -sympy.oo):
        raise ValueError(f"formula: {text!r} is not finite (e.g. division by zero)")
    return expr


def _digits(num) -> float:
    """Decimal digits of the numerator and denominator of a sympy number (cheap, no evaluation)."""
    num = sympy.sympify(num)
    if num.is_Rational:
        return 0.30103 * max(abs(int(num.p)).bit_length(), int(num.q).bit_length())
    if num.is_Float:
        return 20.0
    return 0.0


def degree_bound(expr, symbols=None) -> int:
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
    memo = {}
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


def _build(node, variables):
    if isinstance(node, ast.Constant):
        if isinstance(node.value, bool) or not isinstance(node.value, (int, float)):
            raise ValueError(f"formula: only numbers are allowed as literals, got {node.value!r}")
        return sympy.Rational(repr(node.value)) if isinstance(node.value, float) else sympy.Integer(node.value)
    if isinstance(node, ast.Name):
        if node.id in variables:
            return variables[node.id]
        if node.id in CONSTANTS:
            return CONSTANTS[node.id]
        allowed = ", ".join(sorted(list(variables) + list(CONSTANTS)))
        raise ValueError(f"formula: unknown name {node.id!r}; allowed: {allowed}")
    if isinstance(node, ast.BinOp) and type(node.op) in _BINOPS:
        left, right = _build(node.left, variables), _build(node.right, variables)
        if isinstance(node.op, ast.Pow) and right.is_number:
            if abs(right) > _MAX_EXPONENT:
                raise ValueError(f"formula: exponent {right} too large (at most {_MAX_EXPONENT})")
            if left.is_number and _digits(left) * float(abs(right)) > _MAX_DIGITS:
                raise ValueError(f"formula: a power with more than {_MAX_DIGITS} digits")
        out = sympy.sympify(_BINOPS[type(node.op)](left, right))
        if out.is_number and out.is_finite and out.is_Rational and _digits(out) > _MAX_DIGITS:
            raise ValueError(f"formula: a number with more than {_MAX_DIGITS} digits")
        if degree_bound(out) > _MAX_DEGREE:
            raise ValueError(f"formula: polynomial degree above {_MAX_DEGREE}")
        return out
    if isinstance(node, ast.UnaryOp) and isinstance(node.op, (ast.UAdd, ast.USub)):
        val = _build(node.operand, variables)
        return -val if isinstance(node.op, ast.USub) else val
    if isinstance(node, ast.Call):
        if not isinstance(node.func, ast.Name):
            raise ValueError("formula: only plain function names may be called")
        name = node.func.id
        if name not in FUNCTIONS:
            raise ValueError(f"formula: unknown function {name!r}; allowed: "
                             + ", ".join(sorted(FUNCTIONS)))
        if node.keywords or len(node.args) != 1:
            raise ValueError(f"formula: {name}() takes exactly one argument")
        return FUNCTIONS[name](_build(node.args[0], variables))
    raise ValueError(f"formula: {type(node).__name__} is not allowed "
                     "(use numbers, variables, + - * / **, parentheses and functions)")
