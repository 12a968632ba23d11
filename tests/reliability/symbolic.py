"""Bad-input rows for the exact (sympy) layer and the formula parser."""

from __future__ import annotations

from ._table import *  # noqa: F403 - the shared inputs, row() and returns()


SYM = "wp.symbolic."
row(SYM + "to_rational(x)", "nan", "NaN", lambda: symbolic.to_rational(nan), ValueError,
    "cannot convert nan")
row(SYM + "to_rational(x)", "inf", "inf", lambda: symbolic.to_rational(inf), ValueError,
    "cannot convert infinite")
row(SYM + "to_rational(x)", "text", "'a'", lambda: symbolic.to_rational("a"), TypeError,
    "is not a real number")
row(SYM + "to_rational(x)", "complex", "1j", lambda: symbolic.to_rational(1j), ValueError,
    "complex value")
row(SYM + "exterior_derivative(components, symbols)", "text", "a string",
    lambda: symbolic.exterior_derivative("q", (x_,)), TypeError, "must be a dict")
row(SYM + "wedge(a, b)", "text", "a string", lambda: symbolic.wedge("a", {(0,): 1}), TypeError,
    "must be a dict")
row(SYM + "line_integral(components, symbols, curve, param, bounds)", "text", "bounds (0, 'a')",
    lambda: symbolic.line_integral([x_, y_], (x_, y_), [s_, s_], s_, (0, "a")), TypeError,
    "not a real number")
row(SYM + "line_integral(components, symbols, curve, param, bounds)", "length",
    "a curve with 1 coordinate for 2 symbols",
    lambda: symbolic.line_integral([x_, y_], (x_, y_), [s_], s_, (0, 1)), ValueError,
    "curve has 1 coordinates but there are 2 symbols")
row(SYM + "polyline_integral(components, symbols, vertices)", "nan", "a NaN vertex",
    lambda: symbolic.polyline_integral([x_, y_], (x_, y_), [[0, nan], [1, 1]]), ValueError,
    "cannot convert nan")
row(SYM + "polyline_integral(components, symbols, vertices)", "dim", "vertices in R^3, 2 symbols",
    lambda: symbolic.polyline_integral([x_, y_], (x_, y_), [[0, 0, 0], [1, 1, 1]]), ValueError,
    "3 coordinates per point but there are 2 symbols")
returns(SYM + "polyline_integral(components, symbols, vertices)", "empty", "no vertex",
        lambda: symbolic.polyline_integral([x_, y_], (x_, y_), np.zeros((0, 2))), "0",
        lambda r: r == 0)
row(SYM + "zero_chain_value(expr, symbols, points, coefficients)", "length",
    "2 coefficients for 1 point",
    lambda: symbolic.zero_chain_value(x_, (x_, y_), [[0, 0]], [1, 2]), ValueError,
    "coefficients has 2 entries but there are 1 points")
row(SYM + "polygon_region_integral(expr, symbols2, vertices)", "dim", "3 symbols",
    lambda: symbolic.polygon_region_integral(x_, (x_, y_, z_), SQUARE), ValueError,
    "exactly 2 symbols")
row(SYM + "polygon_region_integral(expr, symbols2, vertices)", "inf", "an infinite vertex",
    lambda: symbolic.polygon_region_integral(x_, (x_, y_), [[0, 0], [inf, 0], [0, 1]]), ValueError,
    "cannot convert infinite")
row(SYM + "polygon_moments(vertices)", "dim", "vertices in R^3",
    lambda: symbolic.polygon_moments([[0, 0, 0], [1, 0, 0], [0, 1, 0]]), ValueError,
    "3 coordinates per point")
row(SYM + "polygon_moments(vertices)", "complex", "a complex vertex",
    lambda: symbolic.polygon_moments([[0, 0], [1j, 0], [0, 1]]), ValueError, "complex value")
returns(SYM + "polygon_moments(vertices)", "overflow", "int64 corners +-2**62 (exact arithmetic)",
        lambda: symbolic.polygon_moments(int64_triangle())["area"], "2**123", lambda r: r == 2 ** 123)
row(SYM + "simplex_integral(expr, symbols, vertices)", "dim", "a 3-simplex in R^2",
    lambda: symbolic.simplex_integral(x_, (x_, y_), [[0, 0], [1, 0], [0, 1], [1, 1]]), ValueError,
    "does not fit in R^2")
row(SYM + "form_on_simplex(components, symbols, vertices)", "dim", "a 1-form on a 2-simplex",
    lambda: symbolic.form_on_simplex({(0,): x_}, (x_, y_), [[0, 0], [1, 0], [0, 1]]), ValueError,
    "cannot be integrated over a 2-simplex")

# =========================================================================== formula
PF = "wp.formula.parse_formula(text, variables)"
row(PF, "empty", "''", lambda: formula.parse_formula("", {"x": x_}), ValueError, "formula: empty")
row(PF, "text", "'x +' (syntax error)", lambda: formula.parse_formula("x +", {"x": x_}), ValueError,
    "syntax error")
row(PF, "text", "'x.real' (attribute)", lambda: formula.parse_formula("x.real", {"x": x_}),
    ValueError, "Attribute is not allowed")
row(PF, "text", "\"__import__('os')\"", lambda: formula.parse_formula("__import__('os')",
                                                                      {"x": x_}),
    ValueError, "unknown function '__import__'")
row(PF, "overflow", "'9**9**9**9'", lambda: formula.parse_formula("9**9**9**9", {"x": x_}),
    ValueError, "too large")
row(PF, "overflow", "5000 digits", lambda: formula.parse_formula("1" * 5000, {"x": x_}), ValueError,
    "longer than 2000 characters")
row(PF, "complex", "'1j*x'", lambda: formula.parse_formula("1j*x", {"x": x_}), ValueError,
    "only numbers are allowed as literals")
row(PF, "inf", "'1/0'", lambda: formula.parse_formula("1/0", {"x": x_}), ValueError, "is not finite")
row(PF, "text", "a number instead of text", lambda: formula.parse_formula(3, {"x": x_}), TypeError,
    "formula must be a string")
row(PF, "option", "an unknown variable 'q'", lambda: formula.parse_formula("q", {"x": x_}),
    ValueError, "unknown name 'q'")
