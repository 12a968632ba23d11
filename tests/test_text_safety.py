"""User text never runs as code (issue 13, item 1).

Strings given where sympy expressions are expected go through the safe formula
parser (``wedgepath.formula.parse_formula``) or are refused; the source audit
below fails when a new call that could evaluate text appears anywhere in ``src/``.
"""

from __future__ import annotations

import ast
import os
from pathlib import Path

import pytest
import sympy as sp

import wedgepath as wp

SRC = Path(__file__).resolve().parents[1] / "src" / "wedgepath"

PAYLOAD = "__import__('pathlib').Path({p!r}).write_text('x') and 0"


@pytest.fixture
def target(tmp_path):
    return tmp_path / "pwned.txt"


x, y = sp.symbols("x y", real=True)


@pytest.mark.parametrize("build", [
    lambda s: wp.Form.from_sympy(s, [x, y]),
    lambda s: wp.Form.from_sympy([s, 0], [x, y]),
    lambda s: wp.Form.from_sympy({(0, 1): s}, [x, y]),
    lambda s: wp.OneForm.from_sympy([s, x], [x, y]),
    lambda s: wp.TwoForm.from_sympy({(0, 1): s}, [x, y]),
    lambda s: wp.calculus.forms.Coefficient.from_sympy(s, (x, y)),
], ids=["Form-0", "Form-1", "Form-dict", "OneForm", "TwoForm", "Coefficient"])
def test_code_in_a_string_is_not_run(build, target):
    with pytest.raises((ValueError, TypeError)) as info:
        build(PAYLOAD.format(p=str(target)))
    assert not target.exists(), "a string was evaluated as Python code"
    assert "\n" not in str(info.value).strip()


@pytest.mark.parametrize("build, expect", [
    (lambda: wp.Form.from_sympy("x*y", [x, y]), {(): x * y}),
    (lambda: wp.Form.from_sympy(["-y", "x"], [x, y]), {(0,): -y, (1,): x}),
    (lambda: wp.OneForm.from_sympy(["-y", x], [x, y]), {(0,): -y, (1,): x}),
    (lambda: wp.TwoForm.from_sympy({(0, 1): "x**2 + sin(y)"}, [x, y]),
     {(0, 1): x**2 + sp.sin(y)}),
])
def test_formula_strings_are_parsed_over_the_given_symbols(build, expect):
    # the parser maps the names to the caller's own symbols (with their assumptions)
    form = build()
    got = form.to_sympy()
    assert set(got) == set(expect)
    for k in expect:
        assert sp.simplify(got[k] - expect[k]) == 0


def test_string_with_unknown_name_says_which_names_are_allowed():
    with pytest.raises(ValueError, match=r"unknown name 'z'.*allowed: .*x, y"):
        wp.Form.from_sympy("z*x", [x, y])


@pytest.mark.parametrize("bad", [b"x*y", bytearray(b"x"), object()])
def test_other_objects_are_refused_not_sympified(bad):
    with pytest.raises(TypeError, match="sympy expression"):
        wp.Form.from_sympy([bad, 0], [x, y])


# --------------------------------------------------------------------------- source audit
#: calls that can turn text into code or sympy objects.  ``lambdify`` on a string writes
#: the string into generated source; ``sympify``/``S``/``parse_expr`` parse strings with
#: Python's eval; ``eval``/``exec``/``compile`` run code; ``symbols``/``Symbol``/``Function``
#: turn text into sympy names; ``load(s)``/``read_pickle`` may unpickle; ``query`` (pandas)
#: evaluates text; ``evalf``/``N`` of arbitrary expressions can take unbounded time.
DANGEROUS = {"sympify", "S", "parse_expr", "eval", "exec", "compile", "lambdify",
             "__import__", "literal_eval", "parse_formula", "symbols", "Symbol", "Function",
             "load", "loads", "read_pickle", "query", "evalf", "N"}

#: every such call in src/ (file, enclosing function, the called expression), with why its
#: argument can never be user text.  A new call fails test_every_text_sink_is_audited until it
#: is checked and listed here.
AUDITED = {
    ("signals/_units.py", "<module>", "re.compile"):
        "a constant pattern of the source (the characters allowed in unit text), no user text",
    ("formula.py", "_build", "sympy.sympify"):
        "argument is a sympy object built from checked ast nodes (numbers, symbols, operators)",
    ("formula.py", "parse_formula", "sympy.sympify"):
        "argument is the sympy result of _build, never text",
    ("formula.py", "_digits", "sympy.sympify"):
        "argument is a sympy number made by _build",
    ("formula.py", "degree_bound", "sp.sympify"):
        "strict=True: never parses text (refuses it)",
    ("formula.py", "float_value", "sympy.sympify"):
        "strict=True: never parses text (refuses it)",
    ("formula.py", "numpy_function", "sympy.lambdify"):
        "argument is the strictly sympified expression (big integers replaced by dummies)",
    ("formula.py", "numpy_function", "sympy.sympify"):
        "strict=True: never parses text (refuses it)",
    ("formula.py", "evaluation_cost", "sympy.sympify"):
        "strict=True: never parses text (refuses it)",
    ("formula.py", "<doctest>", "parse_formula"):
        "docstring examples of the safe parser itself",
    ("calculus/forms.py", "_as_expression", "parse_formula"):
        "strings go through the safe parser, with the caller's symbols as the only names",
    ("calculus/forms.py", "_as_expression", "sympy.sympify"):
        "strict=True, only reached for real numbers (str is parsed safely before)",
    ("symbolic.py", "_as_expr", "sympy.sympify"):
        "strict=True after strings are refused; strict sympify never parses text",
    ("symbolic.py", "_tidy", "sympy.sympify"):
        "called on results of sympy arithmetic on checked expressions only",
    ("symbolic.py", "_segment_integral_generic", "anti.eval"):
        "sympy Poly.eval (evaluates a polynomial at a number), not Python's eval",
    ("dask.py", "<module>", "re.compile"):
        "a regular expression literal, not Python's compile",
    ("io.py", "<module>", "re.compile"):
        "regular expression literals (number and gap tokens), not Python's compile",
    ("_time.py", "<module>", "re.compile"):
        "regular expression literals (ISO-8601 forms), not Python's compile",
    ("planar/green.py", "_from_text", "parse_formula"):
        "region_integral's formula text goes through the safe parser only",
    ("planar/green.py", "_from_text", "sympy.symbols"):
        "a literal ('x y'), never user text",
    ("report.py", "parse_weight", "parse_formula"):
        "the weight text (the command line's --weight) goes through the safe parser",
    ("cli.py", "_cmd_loop", "sp.symbols"):
        "constant names 'x y'",
    ("planar/arrangement.py", "count_crossings", "tree.query"):
        "a shapely STRtree query (geometry in, indices out), not pandas' query",
    ("report.py", "loop", "sp.symbols"):
        "constant names 'x y'",
    ("symbolic.py", "_simplex_setup", "sympy.symbols"):
        "names made from an int (u0:k), dummies",
    ("calculus/complexes.py", "form_on", "sympy.symbols"):
        "names made from an int (x0:n)",
    ("planar/arrangement.py", "_matched_multiplicities", "tree.query"):
        "a shapely STRtree query (geometry in, indices out), not pandas' query",
    ("planar/winding.py", "_winding", "dom.query"):
        "a query of the package's own box tree with arrays, not pandas' query",
}

#: in docstring examples (doctests) only these count: examples build symbols from constant text
DOCTEST_DANGEROUS = {"sympify", "S", "parse_expr", "eval", "exec", "compile", "lambdify",
                     "__import__", "parse_formula", "load", "loads", "read_pickle", "query"}


def _scan(tree, rel, where, found, names=DANGEROUS):
    stack = []

    def visit(node):
        is_def = isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef, ast.ClassDef))
        if is_def:
            stack.append(node.name)
        if isinstance(node, ast.Call):
            f = node.func
            name = f.id if isinstance(f, ast.Name) else f.attr if isinstance(
                f, ast.Attribute) else None
            if name in names:
                found.add((rel, stack[-1] if stack else where, ast.unparse(f)))
        for child in ast.iter_child_nodes(node):
            visit(child)
        if is_def:
            stack.pop()
    visit(tree)


def _calls():
    found = set()
    for path in sorted(SRC.rglob("*.py")):
        rel = path.relative_to(SRC).as_posix()
        text = path.read_text(encoding="utf-8")
        _scan(ast.parse(text), rel, "<module>", found)
        # docstring examples run as doctests: their calls count as well
        for line in text.splitlines():
            s = line.strip()
            if s.startswith(">>> "):
                try:
                    tree = ast.parse(s[4:])
                except SyntaxError:
                    continue
                _scan(tree, rel, "<doctest>", found, DOCTEST_DANGEROUS)
    return found


def test_every_text_sink_is_audited():
    found = _calls()
    new = sorted(found - set(AUDITED))
    assert not new, ("calls that may evaluate text, not audited (check that no user text "
                     f"can reach them, then list them in AUDITED): {new}")


def test_audit_list_has_no_stale_entries():
    stale = sorted(set(AUDITED) - _calls())
    assert not stale, f"AUDITED lists calls that no longer exist: {stale}"


def test_the_audit_sees_a_planted_call(tmp_path, monkeypatch):
    # the scanner itself must be able to fail: plant a module with an eval call
    fake = tmp_path / "wedgepath"
    fake.mkdir()
    (fake / "bad.py").write_text("def f(s):\n    return eval(s)\n")
    monkeypatch.setattr(__import__(__name__), "SRC", fake)
    (fake / "doc.py").write_text('"""\n>>> import sympy\n>>> sympy.sympify("1")\n"""\n')
    assert {("bad.py", "f", "eval"), ("doc.py", "<doctest>", "sympy.sympify")} <= _calls()
