"""The rows of the bad-input table (issue 8): what every public call does with bad input.

Every row names a public call, the class of bad input, what was passed, and the documented
outcome -- the exception type and a fragment its one-line message must contain, or a
documented result checked against a value stated here (never one computed by the library).

Used by ``tests/test_reliability_table.py`` (one test per row, and the check that every
public callable has rows) and by ``docs/reliability_table.py``, which renders the table of
docs/reliability.md from ``ROWS`` and ``CLASSES`` (``make reliability-table``).
"""

from __future__ import annotations

import contextlib
import io
import os
import tempfile
from dataclasses import dataclass, field
from typing import Callable

import numpy as np
import sympy as sp

import wedgepath as wp
from wedgepath import cli, formula, plotting, symbolic
from wedgepath import io as wio
from wedgepath.calculus import as_path, grundmann_moller

nan, inf = np.nan, np.inf
x_, y_, z_, s_ = sp.symbols("x y z s", real=True)

# classes of bad input (the columns of the coverage matrix)
CLASSES = {
    "ndim": "wrong ndim or shape",
    "empty": "empty input",
    "single": "single sample",
    "nan": "all-NaN",
    "inf": "inf",
    "text": "non-numeric",
    "object": "object array",
    "complex": "complex",
    "length": "mismatched lengths (times, names, coefficients)",
    "times": "non-monotone or duplicate times",
    "option": "unknown option or bad option value",
    "overflow": "integer overflow / beyond float64",
    "dim": "forms and chains of mismatched dimension",
    "file": "malformed file",
}


@dataclass(frozen=True)
class Row:
    api: str                       # the public call, as a user writes it
    cls: str                       # a key of CLASSES
    given: str                     # what was passed, in words
    call: Callable = field(compare=False, repr=False)
    raises: type | str | None = ValueError   # exception type, "exit 2", or None (a result)
    match: str = ""                # message fragment, or the documented result in words
    check: Callable | None = field(default=None, compare=False, repr=False)


ROWS: list[Row] = []


def row(api, cls, given, call, raises=ValueError, match="", check=None):
    assert cls in CLASSES, cls
    ROWS.append(Row(api, cls, given, call, raises, match, check))


def returns(api, cls, given, call, what, check):
    """A documented, non-error outcome; ``check`` compares with a value stated here."""
    row(api, cls, given, call, None, what, check)


# --------------------------------------------------------------------------- inputs
def loop(n=2, T=8, offset=0.0):
    """A sampled loop with n channels: channel k is cos(t - k), T samples per cycle."""
    t = 2 * np.pi * np.arange(T) / T
    return np.column_stack([np.cos(t - k) for k in range(n)]) + offset


def with_inf(n=2):
    X = loop(n)
    X[2, n - 1] = inf
    return X


def text(n=2, T=4):
    return [["a"] * n] * T


def objects(n=2, T=4):
    X = np.empty((T, n), dtype=object)
    X[:] = 1.0
    X[1, 0] = None
    return X


def huge_int(n=2, T=4):
    """Python ints, one beyond the float64 range (numpy makes an object array)."""
    rows = [[k + j for j in range(n)] for k in range(T)]
    rows[1][0] = 10 ** 400
    return rows


def int64_triangle():
    """int64 corners (0,0), (2^62,0), (0,2^62): area 2^123 exactly."""
    return np.array([[0, 0], [2 ** 62, 0], [0, 2 ** 62]], dtype=np.int64)


SQUARE = [[0.0, 0.0], [1.0, 0.0], [1.0, 1.0], [0.0, 1.0]]
T8 = np.arange(8.0)


# --------------------------------------------------------------------------- common array rows
def array_rows(api, call, n, *, ndim=None, empty=None, single=None, allnan=None,
               inf_match="infinite", overflow=True):
    """Rows shared by every function taking a (T, n) array: ``call(X)``.

    ``ndim``, ``empty``, ``single`` and ``allnan`` are (raises, match[, check])
    tuples written for each function; the rest go through the shared input
    check and are the same everywhere.
    """
    for cls, given, X, spec in (("ndim", "a 3-D array of shape (4, n, 2)", np.zeros((4, n, 2)), ndim),
                                ("empty", f"shape (0, {n})", np.zeros((0, n)), empty),
                                ("single", f"shape (1, {n})", np.ones((1, n)), single),
                                ("nan", f"shape (5, {n}), every value NaN", np.full((5, n), nan),
                                 allnan)):
        if spec is None:
            continue
        if spec[0] is None:
            returns(api, cls, given, (lambda X=X: call(X)), spec[1], spec[2])
        else:
            row(api, cls, given, (lambda X=X: call(X)), spec[0], spec[1])
    row(api, "inf", "one value +inf", lambda: call(with_inf(n)), ValueError, inf_match)
    row(api, "text", "a list of strings", lambda: call(text(n)), TypeError, "text")
    row(api, "object", "object array holding None", lambda: call(objects(n)), TypeError,
        "non-real entry None")
    row(api, "complex", "complex128 array", lambda: call(loop(n) + 1j), TypeError, "complex")
    row(api, "text", "boolean array", lambda: call(loop(n) > 0), TypeError, "boolean")
    if overflow:
        row(api, "overflow", "a Python int 10**400 (beyond float64)", lambda: call(huge_int(n)),
            ValueError, "too large for float64")


# =========================================================================== calculus
# ---- Path
array_rows("wp.Path(points)", wp.Path, 2,
           ndim=(ValueError, "-dimensional, got shape (4, 2, 2)"),
           empty=(ValueError, "at least 2 samples"),
           single=(ValueError, "at least 2 samples"),
           allnan=(ValueError, "no complete sample"))
row("wp.Path(points)", "ndim", "1-D array of 5 values", lambda: wp.Path(np.arange(5.0)),
    ValueError, "reshape(-1, 1)")
row("wp.Path(points)", "ndim", "shape (5, 0)", lambda: wp.Path(np.zeros((5, 0))), ValueError,
    "no channels")
returns("wp.Path(points)", "overflow", "int64 corners +-2**62 (converted to float64 exactly)",
        lambda: wp.Path(int64_triangle()).points[1, 0], "points == 2.0**62",
        lambda r: r == 2.0 ** 62)
returns("wp.Path(points)", "overflow", "uint64 max 2**64-1 (rounded once to float64)",
        lambda: wp.Path(np.array([[2 ** 64 - 1, 0], [0, 1]], dtype=np.uint64)).points[0, 0],
        "points == 2.0**64", lambda r: r == 2.0 ** 64)
row("wp.Path(points, times)", "length", "7 times for 8 samples",
    lambda: wp.Path(loop(2), times=T8[:-1]), ValueError, "times has 7 entries")
row("wp.Path(points, times)", "times", "decreasing times",
    lambda: wp.Path(loop(2), times=T8[::-1]), ValueError, "strictly increasing")
row("wp.Path(points, times)", "times", "a repeated time stamp",
    lambda: wp.Path(loop(2), times=np.r_[0.0, T8[:-1]]), ValueError, "strictly increasing")
row("wp.Path(points, times)", "nan", "a NaN time", lambda: wp.Path(loop(2), times=np.r_[nan, T8[1:]]),
    ValueError, "times contains NaN")
row("wp.Path(points, times)", "inf", "an infinite time",
    lambda: wp.Path(loop(2), times=np.r_[T8[:-1], inf]), ValueError, "times contains an infinite")
row("wp.Path(points, times)", "ndim", "times of shape (8, 2)",
    lambda: wp.Path(loop(2), times=np.c_[T8, T8]), ValueError, "times must be 1-dimensional")
row("wp.Path(points, times)", "text", "times as strings",
    lambda: wp.Path(loop(2), times=["a"] * 8), TypeError, "times holds text")
row("wp.Path(points, times)", "complex", "complex times",
    lambda: wp.Path(loop(2), times=T8 + 1j), TypeError, "times has complex")
row("wp.Path(points, names)", "length", "1 name for 2 channels",
    lambda: wp.Path(loop(2), names=["a"]), ValueError, "names has 1 entries")
row("wp.Path(points, names)", "length", "repeated names", lambda: wp.Path(loop(2), names=["a", "a"]),
    ValueError, "must be distinct")
row("wp.Path(points, names)", "text", "names that are not strings",
    lambda: wp.Path(loop(2), names=[1, 2]), TypeError, "must be strings")
row("wp.Path(points, names)", "text", "one string instead of a sequence",
    lambda: wp.Path(loop(2), names="ab"), TypeError, "sequence of strings")
row("Path.close(how)", "option", "how='circle'", lambda: wp.Path(loop(2)).close("circle"),
    ValueError, "unknown closure 'circle'")
row("Path.close(how)", "option", "tol=-1", lambda: wp.Path(loop(2)).close("require", tol=-1),
    ValueError, "tol must be >= 0")
row("Path.close(how)", "option", "tol='a'", lambda: wp.Path(loop(2)).close("require", tol="a"),
    TypeError, "tol must be a real number")
row("Path.close(how)", "option", "'require' on an open path",
    lambda: wp.Path([[0, 0], [1, 0], [1, 1]]).close("require"), ValueError, "not closed")
row("Path.window(start, stop)", "option", "float index on a path without times",
    lambda: wp.Path(loop(2)).window(1.5, 3), TypeError, "sample index")
row("Path.window(start, stop)", "single", "a window holding 1 sample",
    lambda: wp.Path(loop(2)).window(3, 4), ValueError, "holds 1 samples")
row("Path.window(start, stop)", "option", "start='a' on a path with times",
    lambda: wp.Path(loop(2), times=T8).window("a"), TypeError, "start must be a real number")
row("Path.plane(i, j)", "option", "the same channel twice", lambda: wp.Path(loop(2)).plane(0, 0),
    ValueError, "two different channels")
row("Path.plane(i, j)", "option", "channel 5 of 2", lambda: wp.Path(loop(2)).plane(0, 5),
    ValueError, "out of range")
row("Path.plane(i, j)", "option", "a name on a path without names",
    lambda: wp.Path(loop(2)).plane("a", "b"), ValueError, "has no names")
row("Path.plane(i, j)", "option", "a float channel index", lambda: wp.Path(loop(2)).plane(0.0, 1),
    TypeError, "int or a name")
row("Path.channels(keys)", "empty", "no channel", lambda: wp.Path(loop(2)).channels([]),
    ValueError, "at least one channel")
row("Path.then(other)", "dim", "2 channels joined to 3", lambda: wp.Path(loop(2)).then(wp.Path(loop(3))),
    ValueError, "2 channels to one with 3")
row("Path.then(other)", "text", "an array instead of a Path", lambda: wp.Path(loop(2)).then(loop(2)),
    TypeError, "needs a Path")
row("wp.calculus.as_path(obj)", "ndim", "a 3-D array", lambda: as_path(np.zeros((2, 2, 2))),
    ValueError, "path: points must be 1 or 2-dimensional, got shape (2, 2, 2)")

# ---- Chain, ZeroChain
row("wp.Chain(terms)", "dim", "paths with 2 and 3 channels",
    lambda: wp.Chain([(loop(2), 1), (loop(3), 1)]), ValueError, "same number of channels")
row("wp.Chain(terms)", "option", "coefficient 1.5", lambda: wp.Chain([(loop(2), 1.5)]), TypeError,
    "must be an integer")
row("wp.Chain(terms)", "ndim", "a bare array instead of (path, coefficient) pairs",
    lambda: wp.Chain([loop(2)]), TypeError, "(path, integer coefficient) pairs")
row("wp.Chain(terms)", "overflow", "coefficient 10**30", lambda: wp.Chain([(loop(2), 10 ** 30)]),
    ValueError, "+-2**62")
row("Chain * k", "option", "k = 1.5", lambda: wp.Chain([(loop(2), 1)]) * 1.5, TypeError,
    "multiplier must be an integer")
row("Chain + other", "dim", "a Chain plus a ZeroChain",
    lambda: wp.Chain([(loop(2), 1)]) + wp.ZeroChain([[0, 0]], [1]), TypeError, "unsupported operand")
array_rows("wp.ZeroChain(points, coefficients)", lambda P: wp.ZeroChain(P, [1] * len(P)), 2,
           ndim=(ValueError, "-dimensional, got shape (4, 2, 2)"),
           empty=(None, "the zero 0-chain", lambda r: len(r) == 0),
           single=(None, "one point, coefficient 1", lambda r: r.coefficients.tolist() == [1]),
           allnan=(ValueError, "contains NaN"))
row("wp.ZeroChain(points, coefficients)", "length", "2 coefficients for 1 point",
    lambda: wp.ZeroChain([[0, 0]], [1, 2]), ValueError, "2 coefficients for 1 points")
row("wp.ZeroChain(points, coefficients)", "overflow", "coefficient 10**30",
    lambda: wp.ZeroChain([[0, 0]], [10 ** 30]), ValueError, "+-2**62")
row("wp.ZeroChain(points, coefficients)", "overflow", "2**62 + 2**62 at the same point",
    lambda: wp.ZeroChain([[0, 0], [0, 0]], [2 ** 62, 2 ** 62]), ValueError, "+-2**62")
row("ZeroChain * k", "overflow", "(2**62 point) * 4", lambda: wp.ZeroChain([[0, 0]], [2 ** 62]) * 4,
    ValueError, "+-2**62")
row("ZeroChain + other", "dim", "0-chains in R^2 and R^3",
    lambda: wp.ZeroChain([[0, 0]], [1]) + wp.ZeroChain([[0, 0, 0]], [1]), ValueError,
    "in R^2 and R^3")

# ---- forms
row("wp.dx(i)", "option", "i = -1", lambda: wp.dx(-1), ValueError, "must be >= 0")
row("wp.dx(i)", "option", "i = 1.0", lambda: wp.dx(1.0), TypeError, "must be an integer")
row("wp.OneForm(components)", "empty", "no component", lambda: wp.OneForm([]), ValueError,
    "at least one component")
row("wp.OneForm(components)", "text", "a string", lambda: wp.OneForm("ab"), TypeError,
    "sequence of n components")
row("wp.OneForm(components)", "nan", "a NaN coefficient", lambda: wp.OneForm([nan, 1.0]), ValueError,
    "must be finite")
row("wp.OneForm(components)", "complex", "a complex coefficient", lambda: wp.OneForm([1j, 1.0]),
    TypeError, "got complex")
row("wp.OneForm(components)", "complex", "a sympy coefficient with I",
    lambda: wp.OneForm([x_ * sp.I, 0], symbols=(x_, y_)), ValueError, "not a finite real")
row("wp.OneForm(components)", "overflow", "coefficient 10**400", lambda: wp.OneForm([10 ** 400, 0]),
    ValueError, "too large for float64")
row("wp.OneForm(components)", "length", "1 symbol for 2 components",
    lambda: wp.OneForm([x_, y_], symbols=(x_,)), ValueError, "1 symbols for 2 components")
row("wp.OneForm(components)", "option", "sympy components without symbols=",
    lambda: wp.OneForm([x_, y_]), ValueError, "pass symbols=")
row("wp.OneForm(components)", "option", "a free parameter z", lambda: wp.OneForm([x_ * z_, y_],
                                                                              symbols=(x_, y_)),
    ValueError, "substitute numbers for parameters")
row("wp.TwoForm(components)", "ndim", "a non-square matrix", lambda: wp.TwoForm(np.zeros((2, 3))),
    ValueError, "must be square")
row("wp.TwoForm(components)", "option", "a matrix that is not skew-symmetric",
    lambda: wp.TwoForm(np.ones((2, 2))), ValueError, "skew-symmetric")
row("wp.TwoForm(components)", "nan", "a NaN matrix", lambda: wp.TwoForm(np.full((2, 2), nan)),
    ValueError, "contains NaN")
row("wp.TwoForm(components)", "option", "key (0, 0)", lambda: wp.TwoForm({(0, 0): 1}), ValueError,
    "repeats an index")
row("wp.TwoForm(components)", "ndim", "key 0 instead of a pair", lambda: wp.TwoForm({0: 1}),
    ValueError, "index pairs (i, j)")
row("wp.TwoForm(components)", "dim", "dx3 on R^2", lambda: wp.TwoForm({(0, 3): 1}, dim=2),
    ValueError, "out of range for R^2")
row("wp.ZeroForm(f)", "text", "a string", lambda: wp.ZeroForm("x"), TypeError,
    "a real number, a callable or a sympy expression")
row("wp.Form(terms, degree)", "ndim", "key 0 instead of an index tuple", lambda: wp.Form({0: 1}, 1),
    TypeError, "tuples of indices")
row("wp.Form(terms, degree)", "option", "degree -1", lambda: wp.Form({}, -1), ValueError,
    "degree must be >= 0")
row("wp.Form(terms, degree)", "length", "term (0,) in a 2-form", lambda: wp.Form({(0,): 1}, 2),
    ValueError, "does not have 2 indices")
row("wp.Form.from_sympy(components, symbols)", "length", "2 components, 1 symbol",
    lambda: wp.Form.from_sympy([x_, y_], (x_,)), ValueError, "2 components for 1 symbols")
row("wp.Form.from_sympy(components, symbols)", "option", "terms of mixed degree",
    lambda: wp.Form.from_sympy({(0,): x_, (0, 1): y_}, (x_, y_)), ValueError, "mixed degree")
row("wp.Form.from_sympy(components, symbols)", "text", "a string of Python code (parsed, never run)",
    lambda: wp.Form.from_sympy(["__import__('os').getcwd()", x_], (x_, y_)), ValueError,
    "only plain function names may be called")
row("wp.Form.from_sympy(components, symbols)", "text", "a formula string naming an unknown symbol",
    lambda: wp.Form.from_sympy("z * x", (x_, y_)), ValueError, "unknown name 'z'")
row("wp.Form.from_sympy(components, symbols)", "object", "bytes as a component",
    lambda: wp.Form.from_sympy([b"x", 0], (x_, y_)), TypeError, "pass sympy expressions")
row("wp.TwoForm.from_sympy(components, symbols)", "text", "a string of Python code (parsed, never run)",
    lambda: wp.TwoForm.from_sympy({(0, 1): "exec('1')"}, (x_, y_)), ValueError,
    "unknown function 'exec'")
row("wp.OneForm.from_sympy(exprs, symbols)", "text", "a string of Python code (parsed, never run)",
    lambda: wp.OneForm.from_sympy(["x.__class__", x_], (x_, y_)), ValueError,
    "Attribute is not allowed")
row("Form + Form", "dim", "a 1-form plus a 2-form", lambda: wp.dx(0) + (wp.dx(0) ^ wp.dx(1)),
    ValueError, "a 1-form and a 2-form")
row("Form + Form", "dim", "forms on R^2 and R^3", lambda: wp.OneForm([1, 2]) + wp.OneForm([1, 2, 3]),
    ValueError, "R^2 and R^3")
row("Form ^ Form", "dim", "forms on R^2 and R^3", lambda: wp.OneForm([1, 2]) ^ wp.OneForm([1, 2, 3]),
    ValueError, "cannot wedge forms on R^2 and R^3")
row("Form * c", "nan", "c = NaN", lambda: wp.dx(0) * nan, ValueError, "must be finite")
row("Form * c", "complex", "c = 1j", lambda: wp.dx(0) * 1j, TypeError, "unsupported operand")
row("Form.d()", "option", "a callable coefficient", lambda: wp.OneForm([lambda c: c[:, 0], 0]).d(),
    TypeError, "needs sympy or constant")

# ---- integrate
array_rows("wp.integrate(form, path)", lambda X: wp.integrate(wp.dx(0), X), 2,
           ndim=(ValueError, "chain: points must be 1 or 2-dimensional"),
           empty=(ValueError, "at least 2 samples"),
           single=(ValueError, "at least 2 samples"),
           allnan=(ValueError, "no complete sample"))
returns("wp.integrate(form, path)", "overflow", "int64 triangle, dx0^dx1",
        lambda: float(wp.integrate(wp.dx(0) ^ wp.dx(1), int64_triangle())), "2.0**123 (exact)",
        lambda r: r == 2.0 ** 123)
row("wp.integrate(form, path)", "dim", "dx2 on a 2-channel path",
    lambda: wp.integrate(wp.dx(2), loop(2)), ValueError, "uses dx2 but the path has only 2")
row("wp.integrate(form, path)", "dim", "a 1-form on R^3 over a path in R^2",
    lambda: wp.integrate(wp.OneForm([1, 2, 3]), loop(2)), ValueError, "lives on R^3")
row("wp.integrate(form, path)", "dim", "a 0-form over a path",
    lambda: wp.integrate(wp.ZeroForm(1.0), loop(2)), ValueError, "over a 0-chain")
row("wp.integrate(form, path)", "dim", "a 3-form over a path",
    lambda: wp.integrate(wp.dx(0) ^ wp.dx(1) ^ wp.dx(2), loop(3)), ValueError,
    "cannot be integrated over a path")
row("wp.integrate(form, path)", "dim", "a 1-form over a 0-chain",
    lambda: wp.integrate(wp.dx(0), wp.ZeroChain([[0, 0]], [1])), ValueError, "over a 0-chain")
row("wp.integrate(form, path)", "dim", "a 1-form over a 2-chain (cone)",
    lambda: wp.integrate(wp.dx(0), wp.cone(loop(2))), ValueError, "degrees must match")
row("wp.integrate(form, path)", "dim", "a 2-form using dx2 over a 2-chain in R^2",
    lambda: wp.integrate(wp.dx(0) ^ wp.dx(2), wp.cone(loop(2))), ValueError, "uses dx2")
row("wp.integrate(form, path)", "dim", "a 0-form on R^2 over a 0-chain in R^3",
    lambda: wp.integrate(wp.ZeroForm(x_ * y_, symbols=(x_, y_)), wp.ZeroChain([[0, 0, 0]], [1])),
    ValueError, "R^2 but the 0-chain is in R^3")
row("wp.integrate(form, path)", "text", "a number instead of a form",
    lambda: wp.integrate(3, loop(2)), TypeError, "needs a Form")
row("wp.integrate(form, path)", "option", "closure='x'", lambda: wp.integrate(wp.dx(0), loop(2),
                                                                            closure="x"),
    ValueError, "unknown closure 'x'")
row("wp.integrate(form, path)", "option", "curve='cubic'",
    lambda: wp.integrate(wp.dx(0), loop(2), curve="cubic"), ValueError, "unknown curve model")
row("wp.integrate(form, path)", "option", "rtol='x'", lambda: wp.integrate(wp.dx(0), loop(2),
                                                                         rtol="x"),
    TypeError, "rtol must be a number")
row("wp.integrate(form, path)", "option", "rtol=0 and atol=0",
    lambda: wp.integrate(wp.dx(0), loop(2), rtol=0), ValueError, "cannot both be 0")
row("wp.integrate(form, path)", "option", "order=2.0", lambda: wp.integrate(wp.dx(0), loop(2),
                                                                          order=2.0),
    ValueError, "order must be an integer")
row("wp.integrate(form, path)", "option", "a SimplicialComplex as domain",
    lambda: wp.integrate(wp.dx(0) ^ wp.dx(1), wp.SimplicialComplex(loop(2), [[0, 1, 2]])),
    TypeError, "not a SimplicialComplex")
row("wp.integrate(form, path)", "ndim", "a callable returning 3 values for m points",
    lambda: wp.integrate(wp.OneForm([lambda c: np.ones(3), 0]), loop(2)), ValueError,
    "one value per point")
row("wp.integrate(form, path)", "nan", "a callable returning NaN",
    lambda: wp.integrate(wp.OneForm([lambda c: c[:, 0] / 0.0, 0]), loop(2)), ValueError,
    "is not finite at the point")
row("wp.integrate(form, path)", "overflow", "coordinates near 1e200 (areas beyond float64)",
    lambda: wp.integrate(wp.dx(0) ^ wp.dx(1), loop(2) * 1e200), ValueError, "overflows float64")
returns("wp.integrate(form, path)", "dim", "chain with coefficients 2 and -1 of the same loop",
        lambda: float(wp.integrate(wp.dx(0) ^ wp.dx(1),
                                   wp.Chain([(SQUARE, 2), (SQUARE, -1)]))),
        "1.0 (the unit square once)", lambda r: r == 1.0)

# ---- simplicial
array_rows("wp.cone(path, apex)", wp.cone, 2,
           ndim=(ValueError, "path: points must be 1 or 2-dimensional"),
           empty=(ValueError, "at least 2 samples"),
           single=(ValueError, "at least 2 samples"),
           allnan=(ValueError, "no complete sample"))
row("wp.cone(path, apex)", "dim", "apex with 3 coordinates for a planar path",
    lambda: wp.cone(loop(2), apex=[0, 0, 0]), ValueError, "apex has 3 coordinates")
row("wp.cone(path, apex)", "nan", "a NaN apex", lambda: wp.cone(loop(2), apex=[nan, 0]),
    ValueError, "apex contains NaN")
row("wp.cone(path, apex)", "option", "closure='x'", lambda: wp.cone(loop(2), closure="x"),
    ValueError, "unknown closure")
row("wp.cone(path, apex)", "option", "closure='none' on an open path",
    lambda: wp.cone([[0, 0], [1, 0], [1, 1]], closure="none"), ValueError, "is open")
array_rows("wp.SimplicialChain(vertices, simplices)",
           lambda V: wp.SimplicialChain(V, [[0, 1]]), 2,
           ndim=(ValueError, "vertices must be 2-dimensional"),
           empty=(ValueError, "refers to vertex 1 but there are 0 vertices"),
           single=(ValueError, "refers to vertex 1 but there are 1 vertices"),
           allnan=(ValueError, "vertices contains NaN"))
row("wp.SimplicialChain(vertices, simplices)", "ndim", "simplices of shape (2,)",
    lambda: wp.SimplicialChain(loop(2), [0, 1]), ValueError, "simplices must be 2-dimensional")
row("wp.SimplicialChain(vertices, simplices)", "ndim", "a 3-simplex in R^2",
    lambda: wp.SimplicialChain(loop(2), [[0, 1, 2, 3]]), ValueError, "does not fit in R^2")
row("wp.SimplicialChain(vertices, simplices)", "option", "vertex index 100 of 8",
    lambda: wp.SimplicialChain(loop(2), [[0, 100]]), ValueError, "refers to vertex 100")
row("wp.SimplicialChain(vertices, simplices)", "text", "float vertex indices",
    lambda: wp.SimplicialChain(loop(2), [[0.0, 1.0]]), TypeError, "integer vertex indices")
row("wp.SimplicialChain(vertices, simplices)", "overflow", "vertex index 10**30",
    lambda: wp.SimplicialChain(loop(2), np.array([[0, 10 ** 30]], dtype=object)), ValueError,
    "beyond int64")
row("wp.SimplicialChain(vertices, simplices, coefficients)", "length", "2 coefficients, 1 simplex",
    lambda: wp.SimplicialChain(loop(2), [[0, 1]], [1, 2]), ValueError, "2 coefficients for 1")
row("wp.SimplicialChain(vertices, simplices, coefficients)", "option", "coefficient 1.5",
    lambda: wp.SimplicialChain(loop(2), [[0, 1]], [1.5]), TypeError, "must be integers")
row("wp.SimplicialChain(vertices, simplices, coefficients)", "overflow", "uint64 coefficient 2**64-1",
    lambda: wp.SimplicialChain(loop(2), [[0, 1]], np.array([2 ** 64 - 1], dtype=np.uint64)),
    ValueError, "+-2**62")
row("SimplicialChain.reduced()", "overflow", "the same simplex twice with 2**62",
    lambda: wp.SimplicialChain(loop(2), [[0, 1], [0, 1]], [2 ** 62, 2 ** 62]).reduced(),
    ValueError, "+-2**62")
row("SimplicialChain * k", "overflow", "(coefficient 2**62) * 4",
    lambda: wp.SimplicialChain(loop(2), [[0, 1]], [2 ** 62]) * 4, ValueError, "+-2**62")
row("SimplicialChain + other", "dim", "a 1-chain plus a 2-chain",
    lambda: wp.SimplicialChain(loop(2), [[0, 1]]) + wp.SimplicialChain(loop(2), [[0, 1, 2]]),
    ValueError, "a 1-chain and a 2-chain")
row("SimplicialChain + other", "dim", "chains in R^2 and R^3",
    lambda: wp.SimplicialChain(loop(2), [[0, 1]]) + wp.SimplicialChain(loop(3), [[0, 1]]),
    ValueError, "R^2 and R^3")
row("SimplicialChain.from_chain(chain)", "text", "an array", lambda: wp.SimplicialChain.from_chain(
    loop(2)), TypeError, "needs a Path, Chain")
row("SimplicialChain.to_chain()", "dim", "a 2-chain", lambda: wp.SimplicialChain(
    loop(2), [[0, 1, 2]]).to_chain(), ValueError, "only 0- and 1-chains")
array_rows("wp.SimplicialComplex(vertices, simplices)",
           lambda V: wp.SimplicialComplex(V, [[0, 1]]), 2,
           ndim=(ValueError, "vertices must be 2-dimensional"),
           empty=(ValueError, "refers to vertex 1 but there are 0 vertices"),
           single=(ValueError, "refers to vertex 1 but there are 1 vertices"),
           allnan=(ValueError, "vertices contains NaN"))


def _cx():
    return wp.SimplicialComplex(loop(2), [[0, 1, 2], [0, 2, 3]])


row("wp.SimplicialComplex(vertices, simplices)", "option", "a simplex repeating a vertex",
    lambda: wp.SimplicialComplex(loop(2), [[0, 0, 1]]), ValueError, "repeats a vertex")
row("wp.SimplicialComplex(vertices, simplices)", "option", "the same simplex twice",
    lambda: wp.SimplicialComplex(loop(2), [[0, 1, 2], [2, 1, 0]]), ValueError, "same vertices")
row("SimplicialComplex.from_path(path)", "single", "a path whose pieces have 1 sample",
    lambda: wp.SimplicialComplex.from_path([[0, 0], [nan, nan], [1, 1]]), ValueError,
    "no piece with two or more samples")
row("SimplicialComplex.simplices(k)", "option", "k = 5", lambda: _cx().simplices(5), ValueError,
    "out of range")
row("SimplicialComplex.simplices(k)", "option", "k = 'a'", lambda: _cx().simplices("a"), TypeError,
    "k must be an integer")
row("SimplicialComplex.boundary_matrix(k)", "option", "k = 0", lambda: _cx().boundary_matrix(0),
    ValueError, "k must be in 1..2")
row("SimplicialComplex.coboundary(k)", "option", "k = -1", lambda: _cx().coboundary(-1), ValueError,
    "k must be in 0..1")
row("SimplicialComplex.chain(coefficients, k)", "length", "2 coefficients for 2 triangles + 1",
    lambda: _cx().chain([1, 2, 3], 2), ValueError, "3 coefficients for 2")
row("SimplicialComplex.chain(coefficients, k)", "option", "float coefficients",
    lambda: _cx().chain([1.5, 1], 2), TypeError, "must be integers")
row("SimplicialComplex.chain_vector(chain)", "dim", "a path in R^3",
    lambda: _cx().chain_vector(wp.Path(loop(3))), ValueError, "chain is in R^3")
row("SimplicialComplex.chain_vector(chain)", "overflow", "coefficients 2**62 + 2**62 on one edge",
    lambda: _cx().chain_vector(wp.SimplicialChain(loop(2), [[0, 1], [0, 1]], [2 ** 62, 2 ** 62])),
    ValueError, "+-2**62")
row("SimplicialComplex.de_rham(form)", "dim", "dx2 on a complex in R^2", lambda: _cx().de_rham(
    wp.dx(2)), ValueError, "uses dx2")
row("SimplicialComplex.de_rham(form, k)", "dim", "a 1-form on 2-simplices",
    lambda: _cx().de_rham(wp.dx(0), k=2), ValueError, "degrees must match")
row("SimplicialComplex.whitney(cochain, k)", "length", "2 values for 5 edges",
    lambda: _cx().whitney([1, 2], 1), ValueError, "needs 5 values")
row("SimplicialComplex.whitney(cochain, k)", "nan", "a NaN value",
    lambda: _cx().whitney([nan, 1, 2, 3, 4], 1), ValueError, "cochain contains NaN")
row("SimplicialComplex.hodge_star(k, metric)", "option", "metric='x'",
    lambda: wp.SimplicialComplex.from_path(loop(2)).hodge_star(0, metric="x"), ValueError,
    "unknown metric 'x'")
row("SimplicialComplex.hodge_star(k, metric)", "dim", "a 2-dimensional complex",
    lambda: _cx().hodge_star(0), ValueError, "for 1-dimensional complexes")
row("SimplicialComplex.derivative(values)", "length", "3 values for 8 vertices",
    lambda: wp.SimplicialComplex.from_path(wp.Path(loop(2), times=T8)).derivative(np.ones(3)),
    ValueError, "values has 3 rows")
row("SimplicialComplex.derivative(values)", "nan", "NaN values",
    lambda: wp.SimplicialComplex.from_path(loop(2)).derivative(np.full(8, nan)), ValueError,
    "values contains NaN")
row("SimplicialComplex.laplacian(metric)", "option", "metric='x'",
    lambda: wp.SimplicialComplex.from_path(loop(2)).laplacian(metric="x"), ValueError,
    "unknown metric")
row("WhitneyForm.evaluate(points, simplex)", "dim", "points in R^3 for a complex in R^2",
    lambda: _cx().whitney([1, 2, 3, 4, 5], 1).evaluate([[0, 0, 0]], 0), ValueError,
    "3 coordinates but the complex is in R^2")
row("WhitneyForm.evaluate(points, simplex)", "option", "simplex 5 of 2",
    lambda: _cx().whitney([1, 2, 3, 4, 5], 1).evaluate([[0, 0]], 5), ValueError,
    "simplex index out of range")
row("WhitneyForm.form_on(simplex)", "option", "simplex 'a'",
    lambda: _cx().whitney([1, 2, 3, 4, 5], 1).form_on("a"), TypeError, "must be an integer")
row("wp.calculus.grundmann_moller(k, s)", "option", "k = -1", lambda: grundmann_moller(-1, 2),
    ValueError, "k must be >= 0")
row("wp.calculus.grundmann_moller(k, s)", "option", "s = 2.0", lambda: grundmann_moller(2, 2.0),
    TypeError, "s must be an integer")
row("wp.Integral(value)", "text", "value 'a'", lambda: wp.Integral("a"), ValueError, "could not convert")

# =========================================================================== planar
for name, fn in (("wp.signed_area(path2d)", wp.signed_area),
                 ("wp.region_moments(path2d)", wp.region_moments),
                 ("wp.region_integral(f, path2d)", lambda P: wp.region_integral(lambda x, y: x * y,
                                                                                P, poly_degree=2)),
                 ("wp.decompose(path2d)", wp.decompose),
                 ("wp.winding_number(path2d, points)", lambda P: wp.winding_number(P, [[0.2, 0.1]]))):
    zero = {"wp.signed_area(path2d)": lambda r: r == 0.0,
            "wp.region_moments(path2d)": lambda r: r.area == 0.0 and r.centroid is None,
            "wp.region_integral(f, path2d)": lambda r: float(r) == 0.0,
            "wp.decompose(path2d)": lambda r: len(r.faces) == 0 and r.signed_area == 0.0,
            "wp.winding_number(path2d, points)": lambda r: r.tolist() == [0]}[name]
    what = {"wp.signed_area(path2d)": "0.0 (no area)",
            "wp.region_moments(path2d)": "area 0.0, centroid None",
            "wp.region_integral(f, path2d)": "0.0",
            "wp.decompose(path2d)": "no faces, signed area 0.0",
            "wp.winding_number(path2d, points)": "winding 0"}[name]
    array_rows(name, fn, 2,
               ndim=(ValueError, "path must be 1 or 2-dimensional, got shape (4, 2, 2)"),
               empty=(None, what, zero), single=(None, what, zero), allnan=(None, what, zero))
    row(name, "ndim", "3 channels", lambda fn=fn: fn(loop(3)), ValueError,
        "needs a planar path with 2 channels, got 3")
    row(name, "ndim", "1-D array", lambda fn=fn: fn(np.arange(4.0)), ValueError,
        "got shape (4,)")
    row(name, "option", "closure='x'", lambda name=name: _with_closure(name, "x"), ValueError,
        "unknown closure 'x'")
    row(name, "option", "closure='none' on an open path",
        lambda name=name: _with_closure(name, "none", [[0, 0], [1, 0], [1, 1]]), ValueError,
        "needs a closed curve")


def _with_closure(name, closure, path=None):
    P = loop(2) if path is None else path
    if name.startswith("wp.signed_area"):
        return wp.signed_area(P, closure=closure)
    if name.startswith("wp.region_moments"):
        return wp.region_moments(P, closure=closure)
    if name.startswith("wp.region_integral"):
        return wp.region_integral(1.0, P, closure=closure)
    if name.startswith("wp.decompose"):
        return wp.decompose(P, closure=closure)
    return wp.winding_number(P, [[0.2, 0.1]], closure=closure)


returns("wp.signed_area(path2d)", "overflow", "int64 corners +-2**62",
        lambda: wp.signed_area(int64_triangle()), "2.0**123 (exact)", lambda r: r == 2.0 ** 123)
row("wp.signed_area(path2d)", "overflow", "coordinates near 1e200 (area beyond float64)",
    lambda: wp.signed_area(loop(2) * 1e200), ValueError, "overflows float64")
row("wp.region_moments(path2d)", "overflow", "coordinates near 1e100 (x^2 moments beyond float64)",
    lambda: wp.region_moments(loop(2) * 1e100), ValueError, "overflows float64")
row("wp.winding_number(path2d, points)", "ndim", "query points of shape (3, 3)",
    lambda: wp.winding_number(SQUARE, np.zeros((3, 3))), ValueError, "shape (m, 2) or (2,)")
row("wp.winding_number(path2d, points)", "nan", "a NaN query point",
    lambda: wp.winding_number(SQUARE, [[nan, 0]]), ValueError, "points contains NaN")
row("wp.winding_number(path2d, points)", "inf", "an infinite query point",
    lambda: wp.winding_number(SQUARE, [[inf, 0]]), ValueError, "points contains an infinite")
row("wp.winding_number(path2d, points)", "text", "query points as text",
    lambda: wp.winding_number(SQUARE, "ab"), TypeError, "points holds text")
returns("wp.winding_number(path2d, points)", "empty", "no query point (shape (0, 2))",
        lambda: wp.winding_number(SQUARE, np.zeros((0, 2))), "an empty int64 array",
        lambda r: r.shape == (0,) and r.dtype == np.int64)
row("wp.winding_number(path2d, points)", "overflow", "coordinates above 1e150",
    lambda: wp.winding_number(loop(2) * 1e200, [[0, 0]]), ValueError, "up to 1e+150")
returns("wp.region_integral(f, path2d)", "text", "f = 'x*y' (a formula as text)",
        lambda: float(wp.region_integral("x*y", SQUARE)), "0.25, exact (parsed, never evaluated)",
        lambda r: r == 0.25)
row("wp.region_integral(f, path2d)", "text", "f = \"__import__('os').remove('x')\"",
    lambda: wp.region_integral("__import__('os').remove('x')", SQUARE), ValueError,
    "formula: only plain function names")
row("wp.region_integral(f, path2d)", "text", "f = b'x*y' (bytes)",
    lambda: wp.region_integral(b"x*y", SQUARE), TypeError, "must be text")
row("wp.region_integral(f, path2d)", "text", "f = object()",
    lambda: wp.region_integral(object(), SQUARE), TypeError, "the integrand must be")
row("wp.region_integral(f, path2d)", "dim", "f a 1-form", lambda: wp.region_integral(wp.dx(0),
                                                                                  SQUARE),
    ValueError, "integrates 2-forms")
row("wp.region_integral(f, path2d)", "dim", "f a 2-form using dx2",
    lambda: wp.region_integral(wp.dx(0) ^ wp.dx(2), SQUARE), ValueError, "uses dx2")
row("wp.region_integral(f, path2d)", "nan", "f = NaN", lambda: wp.region_integral(nan, SQUARE),
    ValueError, "must be finite")
row("wp.region_integral(f, path2d)", "nan", "a callable returning inf",
    lambda: wp.region_integral(lambda x, y: x / 0.0 + 1.0, SQUARE), ValueError, "is not finite at")
row("wp.region_integral(f, path2d)", "ndim", "a callable returning 3 values",
    lambda: wp.region_integral(lambda x, y: np.ones(3), SQUARE), ValueError, "one value per point")
row("wp.region_integral(f, path2d)", "text", "a callable returning strings",
    lambda: wp.region_integral(lambda x, y: np.array(["s"] * x.size), SQUARE), TypeError,
    "must return real numbers")
row("wp.region_integral(f, path2d)", "option", "a sympy f without symbols=",
    lambda: wp.region_integral(x_ * y_, SQUARE), ValueError, "pass symbols=(x, y)")
row("wp.region_integral(f, path2d)", "option", "poly_degree=-1",
    lambda: wp.region_integral(lambda x, y: x, SQUARE, poly_degree=-1), ValueError,
    "poly_degree must be >= 0")
row("wp.region_integral(f, path2d)", "option", "order=0",
    lambda: wp.region_integral(lambda x, y: x, SQUARE, order=0), ValueError, "order must be >= 1")
row("wp.region_integral(f, path2d)", "option", "rtol=-1",
    lambda: wp.region_integral(lambda x, y: x, SQUARE, rtol=-1), ValueError, "rtol must be finite")
row("wp.decompose(path2d)", "option", "a star polygon of 2,001 points (2 million crossings)",
    lambda: wp.decompose(_star(2001)), ValueError, "crosses itself more than 500,000 times")
row("wp.decompose(path2d)", "option", "uniform noise, 300 points, max_crossings=1000",
    lambda: wp.decompose(np.random.default_rng(0).uniform(0, 1, (300, 2)), max_crossings=1000),
    ValueError, "pass max_crossings= a larger number (or None)")
row("wp.decompose(path2d)", "option", "max_crossings=-1",
    lambda: wp.decompose(SQUARE, max_crossings=-1), ValueError, "max_crossings must be")
row("wp.decompose(path2d)", "option", "progress='yes'",
    lambda: wp.decompose(SQUARE, progress="yes"), TypeError, "progress must be True, False or None")
row("Decomposition.significant_lobes(fraction)", "option", "fraction=2",
    lambda: wp.decompose(SQUARE).significant_lobes(2), ValueError, "fraction")



def _star(n):
    k = np.arange(n)
    ang = 2 * np.pi * (k * ((n - 1) // 2) % n) / n
    return np.c_[np.cos(ang), np.sin(ang)]


# =========================================================================== signals
SIG = "wp.area_matrix(X)"
array_rows(SIG, wp.area_matrix, 3,
           ndim=(ValueError, "must be 2-dimensional (samples, channels)"),
           empty=(ValueError, "0 samples; at least 2"),
           single=(ValueError, "1 sample; at least 2"),
           allnan=(ValueError, "no complete sample"))
row(SIG, "ndim", "one channel (shape (8, 1))", lambda: wp.area_matrix(loop(1)), ValueError,
    "at least 2")
returns(SIG, "overflow", "int64 corners +-2**62 as two channels",
        lambda: wp.area_matrix(int64_triangle())[0, 1], "A[0, 1] == 2.0**123 (exact)",
        lambda r: r == 2.0 ** 123)
row(SIG, "overflow", "channels near 1e200 (areas beyond float64)",
    lambda: wp.area_matrix(loop(3) * 1e200), ValueError, "overflow float64")
row(SIG, "length", "3 times for 8 samples", lambda: wp.area_matrix(loop(3), times=T8[:3]),
    ValueError, "times has 3 entries but the data have 8 samples")
row(SIG, "times", "decreasing times", lambda: wp.area_matrix(loop(3), times=T8[::-1]), ValueError,
    "strictly increasing")
row(SIG, "times", "duplicate times", lambda: wp.area_matrix(loop(3), times=np.zeros(8)), ValueError,
    "strictly increasing")
row(SIG, "length", "1 name for 3 channels", lambda: wp.area_matrix(loop(3), names=["a"]), ValueError,
    "names has 1 entries but the data have 3 channels")
row(SIG, "length", "dict channels of lengths 3 and 2",
    lambda: wp.area_matrix({"a": [1, 2, 3], "b": [1, 2]}), ValueError, "different lengths")
row(SIG, "length", "asynchronous channel with 5 samples and 4 times",
    lambda: wp.area_matrix([loop(2)[:, 0], loop(2)[:5, 1]], times=[T8, T8[:4]]), ValueError,
    "has 5 samples but 4 times")
row(SIG, "option", "closure='circle'", lambda: wp.area_matrix(loop(3), closure="circle"), ValueError,
    "unknown closure 'circle'")
row(SIG, "option", "normalize='l2'", lambda: wp.area_matrix(loop(3), normalize="l2"), ValueError,
    "unknown normalize 'l2'")
row(SIG, "option", "unknown keyword foo=1", lambda: wp.area_matrix(loop(3), foo=1), TypeError,
    "unexpected keyword argument 'foo'")
row(SIG, "option", "times given by position", lambda: wp.area_matrix(loop(3), T8), TypeError,
    "positional argument")
row(SIG, "option", "tol=-1", lambda: wp.area_matrix(loop(3), closure="require", tol=-1), ValueError,
    "tol must be a finite number >= 0")
row(SIG, "option", "closure='require' on an open recording",
    lambda: wp.area_matrix(loop(3)[:5], closure="require"), ValueError, "not closed")
row("AreaMatrix[i, j]", "option", "an unknown channel name",
    lambda: wp.area_matrix(loop(3))["zz", "0"], KeyError, "unknown channel 'zz'")

ROLL = "wp.rolling_area_matrix(X, window, step)"
array_rows(ROLL, lambda X: wp.rolling_area_matrix(X, 2, 1), 3,
           ndim=(ValueError, "must be 2-dimensional"),
           empty=(ValueError, "0 samples"), single=(ValueError, "1 sample"),
           allnan=(None, "zero matrices (every window is a gap)",
                   lambda r: r.shape == (4, 3, 3) and not np.asarray(r).any()))
row(ROLL, "option", "window longer than the data", lambda: wp.rolling_area_matrix(loop(3), 100, 1),
    ValueError, "longer than the data")
row(ROLL, "option", "window=1", lambda: wp.rolling_area_matrix(loop(3), 1, 1), ValueError,
    "at least 2 samples")
row(ROLL, "option", "step=0", lambda: wp.rolling_area_matrix(loop(3), 4, 0), ValueError,
    "step must be at least 1")
row(ROLL, "option", "window=4.0", lambda: wp.rolling_area_matrix(loop(3), 4.0, 1), TypeError,
    "window must be an integer")
row(ROLL, "times", "duplicate times", lambda: wp.rolling_area_matrix(loop(3), 4, 1, times=np.zeros(8)),
    ValueError, "strictly increasing")
row(ROLL, "overflow", "channels near 1e200",
    lambda: wp.rolling_area_matrix(loop(3) * 1e200, 4, 2), ValueError, "overflow float64")
row("RollingAreas.pair(i, j)", "option", "an unknown channel name",
    lambda: wp.rolling_area_matrix(loop(3), 4, 2).pair("zz", "0"), KeyError,
    "unknown channel 'zz'")

ACC = "AreaAccumulator.update(chunk)"
array_rows(ACC, lambda X: wp.AreaAccumulator(3).update(X), 3,
           ndim=(ValueError, "must be 2-dimensional"),
           empty=(ValueError, "chunk has 0 samples"),
           single=(None, "count 1 (a chunk may be one row)", lambda r: r.count == 1),
           allnan=(None, "count 5, all gap", lambda r: r.count == 5 and r.gapped))
row(ACC, "dim", "a chunk with 2 channels for n=3", lambda: wp.AreaAccumulator(3).update(loop(2)),
    ValueError, "chunk has 2 channels but the accumulator was made for 3")
row("wp.AreaAccumulator(n)", "option", "n = 1", lambda: wp.AreaAccumulator(1), ValueError,
    "at least 2 channels")
row("wp.AreaAccumulator(n)", "option", "n = 2.0", lambda: wp.AreaAccumulator(2.0), TypeError,
    "n must be an integer")
row("wp.AreaAccumulator(n)", "length", "1 name for 3 channels",
    lambda: wp.AreaAccumulator(3, names=["a"]), ValueError, "names has 1 entries")
row("AreaAccumulator.merge(other)", "dim", "accumulators of 3 and 2 channels",
    lambda: wp.AreaAccumulator(3).merge(wp.AreaAccumulator(2)), ValueError, "cannot merge")
row("AreaAccumulator.merge(other)", "text", "an array", lambda: wp.AreaAccumulator(3).merge(loop(3)),
    TypeError, "needs an AreaAccumulator")
row("AreaAccumulator.result()", "empty", "nothing fed", lambda: wp.AreaAccumulator(3).result(),
    ValueError, "has seen 0 sample(s)")
row("AreaAccumulator.result()", "overflow", "chunks near 1e200 (areas beyond float64)",
    lambda: wp.AreaAccumulator(2).update(loop(2) * 1e200).result(), ValueError, "overflow float64")


def _state(**change):
    st = wp.AreaAccumulator(2).update(loop(2)).state()
    st.update(change)
    return st


row("AreaAccumulator.from_state(state)", "text", "a list instead of a dict",
    lambda: wp.AreaAccumulator.from_state([1]), TypeError, "state must be a dict")
row("AreaAccumulator.from_state(state)", "empty", "an empty dict",
    lambda: wp.AreaAccumulator.from_state({}), ValueError, "state is missing")
row("AreaAccumulator.from_state(state)", "text", "area = 'x'",
    lambda: wp.AreaAccumulator.from_state(_state(area="x")), TypeError, "state['area'] holds text")
row("AreaAccumulator.from_state(state)", "inf", "an infinite area",
    lambda: wp.AreaAccumulator.from_state(_state(area=[[0, inf], [-inf, 0]])), ValueError,
    "state['area'] contains an infinite")
row("AreaAccumulator.from_state(state)", "ndim", "first of shape (1, 2)",
    lambda: wp.AreaAccumulator.from_state(_state(first=[[1, 2]])), ValueError,
    "state['first'] must have 2 entries")
row("AreaAccumulator.from_state(state)", "option", "gapped = 'no'",
    lambda: wp.AreaAccumulator.from_state(_state(gapped="no")), TypeError,
    "state['gapped'] must be True or False")
row("AreaAccumulator.from_state(state)", "option", "count = 2.5",
    lambda: wp.AreaAccumulator.from_state(_state(count=2.5)), TypeError, "count must be an integer")

CO = "wp.cyclic_order(A)"
row(CO, "ndim", "a 2x3 matrix", lambda: wp.cyclic_order(np.zeros((2, 3))), ValueError,
    "must be a square matrix")
row(CO, "ndim", "a 1-D array", lambda: wp.cyclic_order(np.zeros(3)), ValueError,
    "A must be 2-dimensional")
row(CO, "empty", "a 0x0 matrix", lambda: wp.cyclic_order(np.zeros((0, 0))), ValueError,
    "at least 2")
row(CO, "single", "a 1x1 matrix", lambda: wp.cyclic_order(np.zeros((1, 1))), ValueError,
    "at least 2")
row(CO, "nan", "a NaN entry (a constant channel after normalising)",
    lambda: wp.cyclic_order(np.array([[0, nan], [nan, 0]])), ValueError, "A contains NaN")
row(CO, "inf", "an infinite entry", lambda: wp.cyclic_order(np.array([[0, inf], [-inf, 0]])),
    ValueError, "infinite")
row(CO, "text", "text", lambda: wp.cyclic_order([["a", "b"], ["c", "d"]]), TypeError, "text")
row(CO, "complex", "complex entries", lambda: wp.cyclic_order(np.array([[0, 1j], [-1j, 0]])),
    TypeError, "complex")
row(CO, "option", "a matrix that is not skew-symmetric", lambda: wp.cyclic_order(np.ones((3, 3))),
    ValueError, "not skew-symmetric")
row(CO, "option", "the zero matrix", lambda: wp.cyclic_order(np.zeros((3, 3))), ValueError,
    "A is zero")
row(CO, "option", "start=7 of 3", lambda: wp.cyclic_order(wp.area_matrix(loop(3)), start=7),
    ValueError, "out of range")
row(CO, "option", "start=1.0", lambda: wp.cyclic_order(wp.area_matrix(loop(3)), start=1.0),
    TypeError, "channel index or name")
row(CO, "option", "start by name without names",
    lambda: wp.cyclic_order(wp.area_matrix(loop(3)).values, start="a"), ValueError,
    "has no channel names")
row(CO, "length", "names=['a'] for 3 channels",
    lambda: wp.cyclic_order(wp.area_matrix(loop(3)).values, names=["a"]), ValueError,
    "names has 1 entries")

PT = "wp.pair_table(A)"
row(PT, "ndim", "a (3, 2) matrix", lambda: wp.pair_table(np.zeros((3, 2))), ValueError,
    "must be a square matrix")
row(PT, "text", "significance=an area matrix",
    lambda: wp.pair_table(wp.area_matrix(loop(3)), significance=wp.area_matrix(loop(3))),
    TypeError, "significance must be a SurrogateResult")
row(PT, "length", "a bootstrap of 2 channels for 3",
    lambda: wp.pair_table(wp.area_matrix(loop(3)),
                          bootstrap=wp.bootstrap_area(loop(2), n_boot=5, seed=0)),
    ValueError, "bootstrap is for channels ['0', '1']")
row(PT, "option", "significance with a detrended matrix",
    lambda: wp.pair_table(wp.area_matrix(loop(3), closure="detrend"),
                          significance=wp.surrogate_test(loop(3), n_surrogates=5, seed=0)),
    ValueError, "closure='detrend'")

HE = "wp.hilbert_energy(x)"
row(HE, "ndim", "a scalar", lambda: wp.hilbert_energy(3.0), ValueError, "at least one dimension")
row(HE, "option", "axis=5 for a 2-D x", lambda: wp.hilbert_energy(loop(2), axis=5), ValueError,
    "axis 5 is out of range")
returns(HE, "empty", "no samples (shape (0, 2))", lambda: wp.hilbert_energy(np.zeros((0, 2))),
        "zeros (no oscillation)", lambda r: r.tolist() == [0.0, 0.0])
returns(HE, "single", "one sample", lambda: wp.hilbert_energy(np.ones((1, 2))), "zeros",
        lambda r: r.tolist() == [0.0, 0.0])
row(HE, "nan", "NaN samples", lambda: wp.hilbert_energy(np.full(5, nan)), ValueError, "x contains NaN")
row(HE, "inf", "an infinite sample", lambda: wp.hilbert_energy(with_inf(2)), ValueError, "infinite")
row(HE, "text", "text", lambda: wp.hilbert_energy(["a", "b"]), TypeError, "x holds text")
row(HE, "object", "object array holding None", lambda: wp.hilbert_energy(objects(2)), TypeError,
    "non-real entry None")
row(HE, "complex", "complex samples", lambda: wp.hilbert_energy(loop(2) + 1j), TypeError, "complex")
row(HE, "overflow", "a Python int 10**400", lambda: wp.hilbert_energy(huge_int(2)), ValueError,
    "too large for float64")

for name, fn in (("wp.surrogate_test(X)", lambda X, **k: wp.surrogate_test(X, n_surrogates=3,
                                                                             seed=0, **k)),
                 ("wp.bootstrap_area(X)", lambda X, **k: wp.bootstrap_area(X, n_boot=3, seed=0,
                                                                           **k))):
    array_rows(name, fn, 3, ndim=(ValueError, "must be 2-dimensional"),
               empty=(ValueError, "0 samples"), single=(ValueError, "1 sample"),
               allnan=(ValueError, "contains NaN (a gap)"))
    row(name, "nan", "one NaN row (a gap)", lambda fn=fn: fn(np.r_[loop(3), [[nan] * 3]]),
        ValueError, "need gap-free data")
    row(name, "option", "seed='abc'", lambda name=name: (
        wp.surrogate_test(loop(3), n_surrogates=3, seed="abc") if "surrogate" in name else
        wp.bootstrap_area(loop(3), n_boot=3, seed="abc")), TypeError,
        "seed must be None, an integer >= 0")
    row(name, "option", "seed=-1", lambda name=name: (
        wp.surrogate_test(loop(3), n_surrogates=3, seed=-1) if "surrogate" in name else
        wp.bootstrap_area(loop(3), n_boot=3, seed=-1)), ValueError, "seed must be >= 0")
    row(name, "times", "duplicate times", lambda fn=fn: fn(loop(3), times=np.zeros(8)), ValueError,
        "strictly increasing")
    row(name, "option", "progress='yes'", lambda fn=fn: fn(loop(3), progress="yes"), TypeError,
        "True, False or None")
row("wp.surrogate_test(X)", "option", "method='bogus'",
    lambda: wp.surrogate_test(loop(3), method="bogus"), ValueError, "unknown method 'bogus'")
row("wp.surrogate_test(X)", "option", "n_surrogates=0", lambda: wp.surrogate_test(loop(3),
                                                                                 n_surrogates=0),
    ValueError, "at least 1")
row("wp.surrogate_test(X)", "option", "n_surrogates=2.5",
    lambda: wp.surrogate_test(loop(3), n_surrogates=2.5), TypeError, "must be an integer")
row("wp.surrogate_test(X)", "overflow", "channels near 1e200 (areas beyond float64)",
    lambda: wp.surrogate_test(loop(3) * 1e200, n_surrogates=3, seed=0), ValueError,
    "overflow float64")
row("wp.bootstrap_area(X)", "option", "block=0", lambda: wp.bootstrap_area(loop(3), block=0),
    ValueError, "block must be between 2 and")
row("wp.bootstrap_area(X)", "option", "confidence=2",
    lambda: wp.bootstrap_area(loop(3), confidence=2), ValueError, "strictly between 0 and 1")
row("wp.bootstrap_area(X)", "option", "confidence='a'",
    lambda: wp.bootstrap_area(loop(3), confidence="a"), TypeError,
    "confidence must be a real number")
row("wp.bootstrap_area(X)", "option", "progress='yes'",
    lambda: wp.bootstrap_area(loop(3), progress="yes"), TypeError,
    "progress must be True, False or None")
row("wp.bootstrap_area(X)", "option", "keep='a'", lambda: wp.bootstrap_area(loop(3), keep="a"),
    TypeError, "keep must be True or False")
row("wp.bootstrap_area(X)", "option", "n_boot=1", lambda: wp.bootstrap_area(loop(3), n_boot=1),
    ValueError, "n_boot must be at least 2")

row("wp.bootstrap_area(X)", "option", "block='long'",
    lambda: wp.bootstrap_area(loop(3), block="long"), ValueError, "'auto' or a number of samples")
row("wp.bootstrap_area(X)", "single", "7 samples (fewer than 8)",
    lambda: wp.bootstrap_area(loop(3)[:7]), ValueError, "at least 8 samples")
row("wp.surrogate_test(X)", "option", "min_shift beyond a quarter of the samples",
    lambda: wp.surrogate_test(loop(3), min_shift=5), ValueError, "min_shift must be between 0")
row("wp.surrogate_test(X)", "option", "min_shift=1.5",
    lambda: wp.surrogate_test(loop(3), min_shift=1.5), TypeError, "min_shift must be an integer")
row("wp.surrogate_test(X)", "option", "min_shift with method='phase'",
    lambda: wp.surrogate_test(loop(3), method="phase", min_shift=1), ValueError,
    "applies to method='shift' only")

DL = "wp.decorrelation_lag(X)"
array_rows(DL, lambda X: wp.decorrelation_lag(X), 3, ndim=(ValueError, "must be 2-dimensional"),
           empty=(ValueError, "0 samples"), single=(ValueError, "1 sample"),
           allnan=(ValueError, "contains NaN (a gap)"))

NB = "wp.noise_fit_baseline(n)"
row(NB, "option", "n=1", lambda: wp.noise_fit_baseline(1), ValueError, "at least 2 channels")
row(NB, "option", "n=4.5", lambda: wp.noise_fit_baseline(4.5), TypeError, "n must be an integer")
row(NB, "option", "n_draws=0", lambda: wp.noise_fit_baseline(5, n_draws=0), ValueError,
    "n_draws must be at least 1")

BH = "wp.benjamini_hochberg(pvalues)"
row(BH, "option", "a p-value of 2", lambda: wp.benjamini_hochberg([0.5, 2]), ValueError,
    "must lie in [0, 1]")
row(BH, "text", "text", lambda: wp.benjamini_hochberg(["a"]), TypeError, "pvalues holds text")
row(BH, "complex", "a complex p-value", lambda: wp.benjamini_hochberg([0.5 + 1j]), TypeError,
    "complex")
row(BH, "object", "None", lambda: wp.benjamini_hochberg([None]), TypeError, "non-real entry None")
row(BH, "inf", "an infinite p-value", lambda: wp.benjamini_hochberg([0.1, inf]), ValueError,
    "infinite")
returns(BH, "nan", "all NaN", lambda: wp.benjamini_hochberg([nan, nan]),
        "all NaN (NaN entries are ignored and stay NaN)", lambda r: bool(np.isnan(r).all()))
returns(BH, "empty", "no p-values", lambda: wp.benjamini_hochberg([]), "an empty array",
        lambda r: r.shape == (0,))

CY = "wp.cycle_areas(X, i, j)"
array_rows(CY, wp.cycle_areas, 2, ndim=(ValueError, "must be 2-dimensional"),
           empty=(ValueError, "0 samples"), single=(ValueError, "1 sample"),
           allnan=(ValueError, "reference channel has no samples (all NaN)"))
row(CY, "option", "i == j", lambda: wp.cycle_areas(loop(3), 0, 0), ValueError,
    "must be different channels")
row(CY, "option", "j = 5 of 3", lambda: wp.cycle_areas(loop(3), 0, 5), ValueError, "out of range")
row(CY, "option", "i = 0.0", lambda: wp.cycle_areas(loop(3), 0.0, 1), TypeError,
    "channel index or name")
row(CY, "option", "hysteresis='a'", lambda: wp.cycle_areas(loop(3), hysteresis="a"), TypeError,
    "hysteresis must be a real number")
row(CY, "option", "hysteresis=-1", lambda: wp.cycle_areas(loop(3), hysteresis=-1), ValueError,
    "hysteresis must be a finite number >= 0")
row(CY, "option", "level='a'", lambda: wp.cycle_areas(loop(3), level="a"), TypeError,
    "level must be a real number")
row(CY, "inf", "level=inf", lambda: wp.cycle_areas(loop(3), level=inf), ValueError,
    "level must be finite")
row(CY, "times", "decreasing boundaries", lambda: wp.cycle_areas(loop(3), boundaries=[5, 3]),
    ValueError, "strictly increasing")
row(CY, "times", "repeated boundaries", lambda: wp.cycle_areas(loop(3), boundaries=[3, 3]),
    ValueError, "strictly increasing")
row(CY, "option", "a boundary beyond the last sample",
    lambda: wp.cycle_areas(loop(3), boundaries=[5, 300]), ValueError, "must lie within [0, 7]")
row(CY, "nan", "a NaN boundary", lambda: wp.cycle_areas(loop(3), boundaries=[nan, 3]), ValueError,
    "boundaries contains NaN")
row(CY, "option", "a constant reference channel",
    lambda: wp.cycle_areas(np.c_[np.ones(8), loop(2)]), ValueError, "reference channel is constant")
row(CY, "overflow", "channels near 1e200 (areas beyond float64)",
    lambda: wp.cycle_areas(np.tile(loop(2), (3, 1)) * 1e200), ValueError, "overflow float64")

AL = "wp.align(channels, times)"
row(AL, "length", "5 samples, 4 times", lambda: wp.align([T8[:5], T8], times=[T8[:4], T8]),
    ValueError, "has 5 samples but 4 times")
row(AL, "option", "no times and no Series", lambda: wp.align([T8, T8]), ValueError,
    "times are needed")
row(AL, "times", "duplicate times", lambda: wp.align([T8, T8], times=[T8, np.zeros(8)]), ValueError,
    "strictly increasing")
row(AL, "option", "channels that do not overlap in time",
    lambda: wp.align([T8, T8], times=[T8, T8 + 100]), ValueError, "do not overlap in time")
row(AL, "ndim", "times as one 2-D array", lambda: wp.align([T8, T8], times=np.c_[T8, T8]),
    ValueError, "one time array per channel")
row(AL, "single", "one channel", lambda: wp.align([T8], times=[T8]), ValueError,
    "at least 2 channels")
row(AL, "single", "a channel of 1 sample", lambda: wp.align([T8[:1], T8], times=[T8[:1], T8]),
    ValueError, "1 sample(s); at least 2")
row(AL, "text", "a string", lambda: wp.align("abc"), TypeError, "channels must be a list")
row(AL, "length", "1 name for 2 channels", lambda: wp.align([T8, T8], times=[T8, T8], names=["a"]),
    ValueError, "names has 1 entries")
row(AL, "complex", "complex samples", lambda: wp.align([T8 + 1j, T8], times=[T8, T8]), TypeError,
    "complex")
row(AL, "inf", "an infinite time", lambda: wp.align([T8, T8], times=[np.r_[T8[:-1], inf], T8]),
    ValueError, "infinite")

# =========================================================================== symbolic
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

# =========================================================================== io
_TMP = tempfile.mkdtemp(prefix="wedgepath-reliability-")


def tfile(name, content):
    """A file in a private temporary folder (bytes or text)."""
    path = os.path.join(_TMP, name)
    with open(path, "wb") as fh:
        fh.write(content if isinstance(content, bytes) else content.encode("utf-8"))
    return path


GOOD_CSV = "t,a,b\n0,1,0\n1,0,1\n2,-1,0\n3,0,-1\n"
MALFORMED = {
    # cls, given, file content, message fragment
    "truncated": ("file", "last line cut after its first field", "a,b\n1,2\n3,4\n5",
                  "line 4: 1 fields, the header has 2"),
    "delimiter": ("file", "';'-separated file read with --delimiter ','", "a;b\n1;2\n3;4\n",
                  "wrong delimiter?"),
    "mixed": ("file", "a text cell among numbers", "a,b\n1,2\nx,4\n",
              "column 'a' has a non-numeric value 'x'"),
    "huge field": ("file", "a 2 MB field (2 million digits)", "a,b\n1," + "9" * 2_000_000 + "\n3,4\n",
                   "column 'b' is infinite"),
    "huge number": ("file", "a number beyond float64 (400 digits)", "a,b\n1," + "9" * 400 + "\n3,4\n",
                    "column 'b' is infinite"),
    "non-utf8": ("file", "bytes 0xff 0xfe (not UTF-8)", b"a,b\n1,2\n\xff\xfe,4\n", "not UTF-8"),
    "empty": ("empty", "an empty file", "", "the table is empty"),
    "header only": ("single", "a header and no rows", "a,b\n", "header but no data rows"),
    "one row": ("single", "one data row", "a,b\n1,2\n", "1 data row(s)"),
    "numeric header": ("file", "no header row", "1,2\n3,4\n5,6\n", "a header row naming the columns"),
    "repeated names": ("file", "repeated column names", "a,a\n1,2\n3,4\n", "repeated column names"),
    "inf": ("inf", "a cell 'inf'", "a,b\n1,inf\n3,4\n", "column 'b' is infinite"),
    "nul": ("file", "a NUL byte in a cell", b"a,b\n1,2\n3\x00,4\n", "non-numeric value"),
}
for key, (cls, given, content, frag) in MALFORMED.items():
    path = tfile(key.replace(" ", "_") + ".csv", content)
    delim = "," if key == "delimiter" else None
    row("wp.io.read_table(source)", cls, given,
        lambda path=path, delim=delim: wio.read_table(path, delimiter=delim), wio.TableError, frag)
row("wp.io.read_table(source)", "file", "a missing file",
    lambda: wio.read_table(os.path.join(_TMP, "nope.csv")), wio.TableError, "no such file")
row("wp.io.read_table(source)", "file", "a folder", lambda: wio.read_table(_TMP), wio.TableError,
    "is a directory")
row("wp.io.read_table(source)", "text", "source = 123", lambda: wio.read_table(123), TypeError,
    "a table source must be a path, '-' (standard input) or an open file")
row("wp.io.read_table(source)", "file", "a file that is not Parquet",
    lambda: wio.read_table(tfile("bad.parquet", "not parquet")), wio.TableError,
    "cannot read Parquet")
row("wp.io.read_table(source)", "option", "columns=['zz']",
    lambda: wio.read_table(tfile("good.csv", GOOD_CSV), columns=["zz"]), wio.TableError,
    "unknown column 'zz'")
row("wp.io.read_table(source)", "option", "time_column='zz'",
    lambda: wio.read_table(tfile("good.csv", GOOD_CSV), time_column="zz"), wio.TableError,
    "unknown time column 'zz'")
row("wp.io.read_table(source)", "option", "columns=5",
    lambda: wio.read_table(tfile("good.csv", GOOD_CSV), columns=5), TypeError,
    "columns must be a list")
row("wp.io.read_table(source)", "option", "delimiter=',,'",
    lambda: wio.read_table(tfile("good.csv", GOOD_CSV), delimiter=",,"), wio.TableError,
    "delimiter must be one character")
row("wp.io.read_table(source)", "option", "engine='fast' (gone: there is one parser)",
    lambda: wio.read_table(tfile("good.csv", GOOD_CSV), engine="fast"), TypeError,
    "unexpected keyword argument 'engine'")
row("wp.io.read_table(source)", "option", "min_rows='a'",
    lambda: wio.read_table(tfile("good.csv", GOOD_CSV), min_rows="a"), TypeError,
    "min_rows must be an integer")
row("wp.io.read_table(source)", "nan", "an empty time cell",
    lambda: wio.read_table(tfile("tnan.csv", "t,a,b\n0,1,2\n,2,3\n"), time_column="t"),
    wio.TableError, "time column 't' is empty")
row("wp.io.iter_table_chunks(source)", "option", "chunk_rows=0",
    lambda: list(wio.iter_table_chunks(tfile("good.csv", GOOD_CSV), chunk_rows=0)), ValueError,
    "chunk_rows must be a positive integer")
row("wp.io.iter_table_chunks(source)", "file", "a truncated line",
    lambda: list(wio.iter_table_chunks(tfile("tr2.csv", "a,b\n1,2\n3\n"))), wio.TableError,
    "1 fields, the header has 2")
row("wp.io.table_columns(source)", "file", "a missing file",
    lambda: wio.table_columns(os.path.join(_TMP, "nope.csv")), wio.TableError, "no such file")
row("wp.io.table_columns(source)", "file", "a non-UTF-8 header",
    lambda: wio.table_columns(tfile("nuh.csv", b"\xffa,b\n1,2\n")), wio.TableError, "not UTF-8")
row("wp.io.stream_area_matrix(source)", "ndim", "one channel column",
    lambda: wio.stream_area_matrix(tfile("good.csv", GOOD_CSV), columns=["a"]), wio.TableError,
    "at least 2 channel columns")
row("wp.io.stream_area_matrix(source)", "times", "a repeated time",
    lambda: wio.stream_area_matrix(tfile("tdup.csv", "t,a,b\n0,1,2\n0,2,3\n"), time_column="t"),
    wio.TableError, "times are not strictly increasing")
row("wp.io.stream_area_matrix(source)", "single", "one data row",
    lambda: wio.stream_area_matrix(tfile("one.csv", "a,b\n1,2\n")), wio.TableError,
    "fewer than 2 data rows")
row("wp.io.stream_area_matrix(source)", "empty", "a header and no rows, with a time column",
    lambda: wio.stream_area_matrix(tfile("hdr.csv", "t,a,b\n"), time_column="t"), wio.TableError,
    "fewer than 2 data rows")
row("wp.io.stream_area_matrix(source)", "file", "a non-UTF-8 byte mid-file",
    lambda: wio.stream_area_matrix(tfile("nu2.csv", b"a,b\n1,2\n\xff,4\n")), wio.TableError,
    "not UTF-8")

# =========================================================================== plotting
# (the plotting helpers check their input before matplotlib is touched)
row("wp.plotting.cycle_positions(order)", "text", "an array instead of a CyclicOrder",
    lambda: plotting.cycle_positions(np.zeros(3)), TypeError, "needs a CyclicOrder")
row("wp.plotting.cycle_positions(order)", "length", "intervals of 1 entry for 3 channels",
    lambda: plotting.cycle_positions(wp.cyclic_order(np.array([[0, 1, -1], [-1, 0, 1],
                                                               [1, -1, 0.0]])),
                                     low=[0.0], high=[1.0]),
    ValueError, "low and high need 3 entries")
row("wp.plotting.pair_chart(areas)", "ndim", "a 2x3 matrix",
    lambda: plotting.pair_chart(np.zeros((2, 3))), ValueError, "must be a square matrix")
row("wp.plotting.pair_chart(areas)", "length", "1 name for 2 channels",
    lambda: plotting.pair_chart(np.zeros((2, 2)), names=["a"]), ValueError,
    "names has 1 entries")
row("wp.plotting.rolling_pairs(rolling)", "text", "an array instead of a RollingAreas",
    lambda: plotting.rolling_pairs(np.zeros((2, 2, 2))), TypeError, "needs a RollingAreas")
row("wp.plotting.loop_faces(decomposition)", "text", "an array instead of a Decomposition",
    lambda: plotting.loop_faces(np.zeros((3, 2))), TypeError, "needs a Decomposition")
row("wp.plotting.loop_path(curve)", "ndim", "xy of shape (4, 3)",
    lambda: plotting.loop_path(np.zeros((4, 3))), ValueError, "xy must have shape (T, 2)")
row("wp.plotting.loop_path(curve)", "single", "one sample",
    lambda: plotting.loop_path(np.zeros((1, 2))), ValueError, "at least 2 samples")
row("wp.plotting.loop_path(curve)", "text", "text", lambda: plotting.loop_path([["a", "b"]]),
    TypeError, "xy holds text")
row("wp.plotting.cycle_values(cycles)", "ndim", "a 2-D array",
    lambda: plotting.cycle_values(np.zeros((2, 2))), ValueError, "values must be 1-dimensional")
row("wp.plotting.cycle_values(cycles)", "text", "text", lambda: plotting.cycle_values(["a"]),
    TypeError, "values holds text")

# =========================================================================== command line
CLI_OUT = "out"


def run_cli(argv, files=None):
    """Run the command line in-process in a fresh folder; returns (code, stdout, stderr, written)."""
    with tempfile.TemporaryDirectory() as d:
        paths = {}
        for name, content in (files or {}).items():
            paths[name] = os.path.join(d, name)
            with open(paths[name], "wb") as fh:
                fh.write(content if isinstance(content, bytes) else content.encode("utf-8"))
        args = [paths.get(a, a) for a in argv] + ["--out", os.path.join(d, CLI_OUT), "--quiet",
                                                  "--no-figures"]
        if argv and argv[0] == "demo":
            args = [paths.get(a, a) for a in argv] + ["--out", os.path.join(d, CLI_OUT), "--quiet",
                                                      "--no-figures"]
        out, err = io.StringIO(), io.StringIO()
        with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
            code = cli.main(args)
        written = sorted(os.listdir(os.path.join(d, CLI_OUT))) \
            if os.path.isdir(os.path.join(d, CLI_OUT)) else []
        stray = [f for f in os.listdir(d) if f.startswith(".wedgepath-")]
        return code, out.getvalue(), err.getvalue(), written + stray


STAR_CSV = "x,y\n" + "".join(f"{float(np.cos(2 * np.pi * (k * 1000 % 2001) / 2001))!r},"
                             f"{float(np.sin(2 * np.pi * (k * 1000 % 2001) / 2001))!r}\n"
                             for k in range(2001))
LOOP_CSV = "t,x,y\n" + "".join(f"{k},{np.cos(k / 3):.6f},{np.sin(k / 3):.6f}\n" for k in range(40))
for key, (cls, given, content, frag) in MALFORMED.items():
    for sub in ("leadlag", "loop"):
        extra = ["--delimiter", ","] if key == "delimiter" else []
        argv = ([sub, "in.csv", *extra] if sub == "leadlag"
                else [sub, "in.csv", "--x", "a", "--y", "b", *extra])
        if sub == "loop" and key == "delimiter":
            frag = "unknown column 'a'; columns are ['a;b']"  # --x a is looked up first
        row(f"wedgepath {sub}", cls, given, (lambda argv=argv, content=content:
                                              run_cli(argv, {"in.csv": content})),
            "exit 2", frag)
row("wedgepath leadlag", "file", "a truncated file, streamed (--stream)",
    lambda: run_cli(["leadlag", "in.csv", "--stream"], {"in.csv": MALFORMED["truncated"][2]}),
    "exit 2", "1 fields, the header has 2")
row("wedgepath leadlag", "file", "a non-UTF-8 file, streamed (--stream)",
    lambda: run_cli(["leadlag", "in.csv", "--stream"], {"in.csv": MALFORMED["non-utf8"][2]}),
    "exit 2", "not UTF-8")
row("wedgepath leadlag", "file", "a missing file", lambda: run_cli(["leadlag", "nope.csv"]), "exit 2",
    "no such file")
row("wedgepath leadlag", "option", "--closure circle",
    lambda: run_cli(["leadlag", "in.csv", "--closure", "circle"], {"in.csv": GOOD_CSV}), "exit 2",
    "invalid choice: 'circle'")
row("wedgepath leadlag", "option", "--window 0",
    lambda: run_cli(["leadlag", "in.csv", "--window", "0"], {"in.csv": GOOD_CSV}), "exit 2",
    "expected a positive whole number")
row("wedgepath leadlag", "option", "--window 100 for 4 rows",
    lambda: run_cli(["leadlag", "in.csv", "--window", "100"], {"in.csv": GOOD_CSV}), "exit 2",
    "longer than the 4 samples")
row("wedgepath leadlag", "option", "--step without --window",
    lambda: run_cli(["leadlag", "in.csv", "--step", "2"], {"in.csv": GOOD_CSV}), "exit 2",
    "--step needs --window")
row("wedgepath leadlag", "option", "--stream with --normalize",
    lambda: run_cli(["leadlag", "in.csv", "--stream", "--normalize", "hilbert"],
                    {"in.csv": GOOD_CSV}), "exit 2", "--stream computes the area matrix only")
row("wedgepath leadlag", "option", "an unknown flag --frobnicate",
    lambda: run_cli(["leadlag", "in.csv", "--frobnicate"], {"in.csv": GOOD_CSV}), "exit 2",
    "unrecognized arguments: --frobnicate")
row("wedgepath leadlag", "option", "--columns naming an unknown column",
    lambda: run_cli(["leadlag", "in.csv", "--columns", "a,zz"], {"in.csv": GOOD_CSV}), "exit 2",
    "unknown column 'zz'")
row("wedgepath leadlag", "ndim", "one channel column",
    lambda: run_cli(["leadlag", "in.csv", "--columns", "a"], {"in.csv": GOOD_CSV}), "exit 2",
    "at least 2")
row("wedgepath leadlag", "times", "a repeated time stamp",
    lambda: run_cli(["leadlag", "in.csv", "--time", "t"],
                    {"in.csv": "t,a,b\n0,1,0\n1,0,1\n1,-1,0\n3,0,-1\n"}), "exit 2",
    "strictly increasing")
row("wedgepath leadlag", "times", "decreasing time stamps, streamed",
    lambda: run_cli(["leadlag", "in.csv", "--time", "t", "--stream"],
                    {"in.csv": "t,a,b\n3,1,0\n2,0,1\n1,-1,0\n0,0,-1\n"}), "exit 2",
    "times are not strictly increasing")
row("wedgepath leadlag", "nan", "every row a gap", lambda: run_cli(
    ["leadlag", "in.csv"], {"in.csv": "a,b\nnan,1\n2,\nNA,3\n"}), "exit 2",
    "no row has a value in every column used ('a', 'b')")
row("wedgepath leadlag", "option", "--closure require on an open recording",
    lambda: run_cli(["leadlag", "in.csv", "--closure", "require"], {"in.csv": GOOD_CSV[:-7]}),
    "exit 2", "not closed")
row("wedgepath leadlag", "option", "an existing result.json without --force",
    lambda: _cli_existing(), "exit 2", "exists; use --force")
row("wedgepath loop", "option", "--x and --y the same column",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "x"], {"in.csv": LOOP_CSV}), "exit 2",
    "name the same column")
row("wedgepath loop", "option", "--y naming an unknown column",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "zz"], {"in.csv": LOOP_CSV}), "exit 2",
    "unknown column 'zz'")
row("wedgepath loop", "option", "--weight with an unsafe formula",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--weight", "__import__('os')"],
                    {"in.csv": LOOP_CSV}), "exit 2", "unknown function '__import__'")
row("wedgepath loop", "option", "--energy bogus",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--energy", "bogus"],
                    {"in.csv": LOOP_CSV}), "exit 2", "invalid choice: 'bogus'")
row("wedgepath loop", "option", "--level inf",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--level", "inf"],
                    {"in.csv": LOOP_CSV}), "exit 2", "expected a finite number")
row("wedgepath loop", "option", "--closure none on an open loop",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--closure", "none"],
                    {"in.csv": LOOP_CSV}), "exit 2", "choose --closure chord (the default)")
row("wedgepath loop", "overflow", "coordinates near 1e200 (areas beyond float64)",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y"],
                    {"in.csv": "x,y\n0,0\n1e200,0\n1e200,1e200\n0,1e200\n"}), "exit 2",
    "overflows float64")
row("wedgepath loop", "option", "--units naming a column not used",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--units", "zz=m"],
                    {"in.csv": LOOP_CSV}), "exit 2", "--units names column 'zz'")
row("wedgepath leadlag", "option", "--units without '='",
    lambda: run_cli(["leadlag", "in.csv", "--units", "a"], {"in.csv": GOOD_CSV}), "exit 2",
    "expected COL=UNIT")
row("wedgepath loop", "option", "--weight whose nested powers have thousands of digits",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--weight",
                     "(((9**64)**64)**64)**64"], {"in.csv": LOOP_CSV}), "exit 2",
    "more than 400 digits")
row("wedgepath leadlag", "option", "--closure require with a gap beyond the default tolerance",
    lambda: run_cli(["leadlag", "in.csv", "--closure", "require"], {"in.csv": GOOD_CSV[:-7]}),
    "exit 2", "pass a larger --tol")
row("wedgepath leadlag", "option", "--tol without --closure require",
    lambda: run_cli(["leadlag", "in.csv", "--tol", "1"], {"in.csv": GOOD_CSV}), "exit 2",
    "--tol applies to --closure require only")
row("wedgepath leadlag", "nan", "a column without a value",
    lambda: run_cli(["leadlag", "in.csv"], {"in.csv": "a,b,c\n1,,2\n3,,4\n5,,1\n"}), "exit 2",
    "column 'b' has no values")
row("wedgepath leadlag", "times", "decreasing time stamps",
    lambda: run_cli(["leadlag", "in.csv", "--time", "t"],
                    {"in.csv": "t,a,b\n0,1,0\n1,0,1\n0.5,-1,0\n3,0,-1\n"}), "exit 2",
    "line 4 (data row 3): times are not strictly increasing: 't' = 0.5 is before 1")
row("wedgepath loop", "option", "--weight 1e999",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--weight", "1e999"],
                    {"in.csv": LOOP_CSV}), "exit 2", "the number ('1e999') has more than 400 digits")
row("wedgepath loop", "overflow", "--weight exp(10**60) (a constant beyond float64)",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--weight", "exp(10**60)"],
                    {"in.csv": LOOP_CSV}), "exit 2", "is a constant beyond float64")
row("wedgepath loop", "overflow", "--weight not finite on the loop (log(x) where x < 0)",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--weight", "log(x)"],
                    {"in.csv": LOOP_CSV}), "exit 2", "--weight 'log(x)' is not finite at (x, y)")
row("wedgepath loop", "option", "a star polygon of 2,001 points (2 million crossings)",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y"], {"in.csv": STAR_CSV}), "exit 2",
    "crosses itself more than 500,000 times")
row("wedgepath loop", "option", "--max-crossings 0",
    lambda: run_cli(["loop", "in.csv", "--x", "x", "--y", "y", "--max-crossings", "0"],
                    {"in.csv": LOOP_CSV}), "exit 2", "expected a positive whole number")
row("wedgepath demo", "option", "an unknown flag --frobnicate",
    lambda: run_cli(["demo", "--frobnicate"]), "exit 2", "unrecognized arguments: --frobnicate")
row("wedgepath", "option", "an unknown subcommand", lambda: run_cli(["fly"]), "exit 2",
    "invalid choice: 'fly'")


def _cli_existing():
    with tempfile.TemporaryDirectory() as d:
        src = os.path.join(d, "in.csv")
        with open(src, "w") as fh:
            fh.write(GOOD_CSV)
        out = os.path.join(d, CLI_OUT)
        os.makedirs(out)
        with open(os.path.join(out, "result.json"), "w") as fh:
            fh.write("{}")
        o, e = io.StringIO(), io.StringIO()
        with contextlib.redirect_stdout(o), contextlib.redirect_stderr(e):
            code = cli.main(["leadlag", src, "--out", out, "--quiet", "--no-figures"])
        kept = open(os.path.join(out, "result.json")).read() == "{}"
        written = [] if kept and sorted(os.listdir(out)) == ["result.json"] else ["changed"]
        return code, o.getvalue(), e.getvalue(), written


# =========================================================================== dask
try:
    import wedgepath.dask as wdask
    import dask.array as da
except ImportError:  # the optional extra is not installed: no rows
    wdask = None

if wdask is not None:
    DA = "wp.dask.area_matrix(X)"
    row(DA, "ndim", "a 1-D array", lambda: wdask.area_matrix(np.arange(5.0), scheduler="sync"),
        ValueError, "must be 2-dimensional")
    row(DA, "ndim", "a dask array chunked along channels",
        lambda: wdask.area_matrix(da.from_array(loop(2), chunks=(4, 1)), scheduler="sync"),
        ValueError, "chunked along channels")
    row(DA, "ndim", "one channel", lambda: wdask.area_matrix(loop(1), scheduler="sync"), ValueError,
        "at least 2")
    row(DA, "complex", "complex values", lambda: wdask.area_matrix(loop(2) + 1j, scheduler="sync"),
        TypeError, "complex")
    row(DA, "text", "text", lambda: wdask.area_matrix(np.array(text(2)), scheduler="sync"),
        TypeError, "coordinates must be real numbers")
    row(DA, "object", "an object array", lambda: wdask.area_matrix(objects(2), scheduler="sync"),
        TypeError, "coordinates must be real numbers")
    row(DA, "inf", "an infinite value", lambda: wdask.area_matrix(with_inf(2), scheduler="sync"),
        ValueError, "infinite")
    row(DA, "nan", "every row NaN", lambda: wdask.area_matrix(np.full((5, 2), nan),
                                                              scheduler="sync"),
        ValueError, "no complete")
    row(DA, "option", "closure='detrend'",
        lambda: wdask.area_matrix(loop(2), closure="detrend", scheduler="sync"), ValueError,
        "only 'chord'")
    row(DA, "option", "split_every=1",
        lambda: wdask.area_matrix(loop(2), split_every=1, scheduler="sync"), ValueError,
        "split_every must be >= 2")
    row(DA, "text", "names='ab' (one string)",
        lambda: wdask.area_matrix(loop(2), names="ab"), TypeError,
        "names must be a sequence of strings")
    row(DA, "length", "1 name for 2 channels",
        lambda: wdask.area_matrix(loop(2), names=["a"], scheduler="sync"), ValueError,
        "names has 1 entries")
    row("wp.dask.area_matrices(recordings)", "dim", "recordings with 2 and 3 channels",
        lambda: wdask.area_matrices([loop(2), loop(3)], scheduler="sync"), ValueError, "channels")
    row("wp.dask.area_matrices(recordings)", "empty", "no recording",
        lambda: wdask.area_matrices([], scheduler="sync"), ValueError, "recordings is empty")
    row("wp.dask.file_area_matrices(paths)", "file", "a missing file",
        lambda: wdask.file_area_matrices([os.path.join(_TMP, "nope.csv")], scheduler="sync"),
        wio.TableError, "no such file")
    row("wp.dask.file_area_matrices(paths)", "file", "a malformed file",
        lambda: wdask.file_area_matrices([tfile("trd.csv", MALFORMED["truncated"][2])],
                                         scheduler="sync"), wio.TableError,
        "1 fields, the header has 2")
