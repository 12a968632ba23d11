"""Bad-input rows for Path, chains, forms, integrate, simplicial chains and complexes."""

from __future__ import annotations

from ._table import *  # noqa: F403 - the shared inputs, row() and returns()


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
    ValueError, "times[0] is missing (NaN)")
row("wp.Path(points, times)", "inf", "an infinite time",
    lambda: wp.Path(loop(2), times=np.r_[T8[:-1], inf]), ValueError, "times contains an infinite")
row("wp.Path(points, times)", "ndim", "times of shape (8, 2)",
    lambda: wp.Path(loop(2), times=np.c_[T8, T8]), ValueError, "times must be 1-dimensional")
row("wp.Path(points, times)", "text", "times as text that is not a date",
    lambda: wp.Path(loop(2), times=["a"] * 8), ValueError,
    "times[0] = 'a' is not an ISO-8601 date/time")
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
