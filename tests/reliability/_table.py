"""The table's machinery: classes of bad input, the ``Row`` record, ``row()`` / ``returns()``
(which append to ``ROWS``) and the small inputs the rows share."""

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
