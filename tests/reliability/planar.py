"""Bad-input rows for signed areas, winding numbers, region integrals and moments, decompose."""

from __future__ import annotations

from ._table import *  # noqa: F403 - the shared inputs, row() and returns()


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
