"""Masked arrays: masked entries are gaps (NaN) where gaps are allowed, refused where they are
not; the caller's array is never changed (issue 13, item 7)."""

from __future__ import annotations

import numpy as np
import pytest

import wedgepath as wp
from wedgepath._validation import as_float_array

SQUARE = np.array([[0, 0], [1, 0], [1, 1], [0, 1], [0, 0]], dtype=float)


def masked_square(row=2, dtype=float):
    mask = np.zeros(SQUARE.shape, dtype=bool)
    mask[row, 0] = True              # one masked entry makes the whole row a gap
    return np.ma.array(SQUARE.astype(dtype), mask=mask)


def as_gaps(m):
    """The reference: masked entries replaced by NaN in a plain float array."""
    return np.ma.getdata(m).astype(float).copy() if not np.ma.getmaskarray(m).any() else \
        np.where(np.ma.getmaskarray(m), np.nan, np.ma.getdata(m).astype(float))


def snapshot(m):
    return (np.ma.getdata(m).copy(), np.ma.getmaskarray(m).copy())


def unchanged(m, snap):
    return (np.array_equal(np.ma.getdata(m), snap[0], equal_nan=True)
            and np.array_equal(np.ma.getmaskarray(m), snap[1]))


def test_the_reported_case():
    # the example: the masked corner, as a gap, leaves two chords and no area
    m = masked_square()
    A = wp.area_matrix(m)
    assert A[0, 1] == 0.0
    assert wp.area_matrix(SQUARE)[0, 1] == 1.0


CALLS = {
    "area_matrix": lambda X: np.asarray(wp.area_matrix(X)),
    "area_matrix detrend": lambda X: np.asarray(wp.area_matrix(X, closure="detrend")),
    "signed_area": lambda X: float(wp.signed_area(X)),
    "decompose": lambda X: wp.decompose(X).area_by_winding,
    "winding_number": lambda X: wp.winding_number(X, [[0.5, 0.5], [0.9, 0.1]]).tolist(),
    "region_integral": lambda X: float(wp.region_integral(lambda x, y: x + 1.0, X, poly_degree=1)),
    "region_moments": lambda X: wp.region_moments(X).area,
    "Path pieces": lambda X: [p.points.tolist() for p in wp.Path(X).pieces],
    "integrate": lambda X: float(wp.integrate(wp.dx(0) * 1.0, wp.Path(X))),
    "rolling_area_matrix": lambda X: np.asarray(wp.rolling_area_matrix(X, 3, 1)).tolist(),
    "AreaAccumulator": lambda X: np.asarray(wp.AreaAccumulator(2).update(X).result()).tolist(),
    "cycle_areas": lambda X: wp.cycle_areas(X, 0, 1).count,
    "cone": lambda X: wp.cone(X, apex=[0.5, 0.5]).simplices.tolist(),
}


@pytest.mark.parametrize("name", list(CALLS))
@pytest.mark.parametrize("row", [0, 2, 4])
def test_masked_entries_are_gaps(name, row):
    m = masked_square(row)
    snap = snapshot(m)
    call = CALLS[name]
    try:
        want = ("ok", call(as_gaps(m)))
    except (ValueError, TypeError) as exc:
        want = ("err", type(exc), str(exc))
    try:
        got = ("ok", call(m))
    except (ValueError, TypeError) as exc:
        got = ("err", type(exc), str(exc))
    assert repr(got) == repr(want)
    assert unchanged(m, snap), "the caller's masked array was changed"


def test_integer_masked_array_and_read_only_data():
    m = masked_square(2, dtype=np.int32)
    m.data.flags.writeable = False
    got = wp.area_matrix(m)
    assert got[0, 1] == 0.0 and m.dtype == np.int32


def test_no_mask_is_the_plain_array():
    m = np.ma.array(SQUARE)            # mask = nomask
    assert wp.area_matrix(m)[0, 1] == 1.0
    m2 = np.ma.array(SQUARE, mask=np.zeros(SQUARE.shape, dtype=bool))
    assert wp.signed_area(m2) == 1.0


def test_garbage_under_the_mask_is_ignored():
    data = SQUARE.copy()
    data[2] = [np.inf, np.nan]          # hidden values: not data
    m = np.ma.array(data, mask=[[0, 0], [0, 0], [1, 1], [0, 0], [0, 0]])
    assert wp.area_matrix(m)[0, 1] == 0.0


def test_refused_where_gaps_are_not_allowed():
    t = np.ma.array(np.arange(5.0), mask=[0, 0, 1, 0, 0])
    with pytest.raises(ValueError, match=r"times .*masked.*index \(2,\)"):
        wp.area_matrix(SQUARE, times=t)
    with pytest.raises(ValueError, match="masked"):
        as_float_array(np.ma.array([1.0, 2.0], mask=[0, 1]), "weights")


def test_as_float_array_makes_a_fresh_array():
    m = masked_square(2)
    snap = snapshot(m)
    for copy in (True, False):
        out = as_float_array(m, "X", allow_nan=True, copy=copy)
        assert type(out) is np.ndarray and np.isnan(out[2, 0]) and not np.isnan(out[2, 1])
        assert not np.shares_memory(out, np.ma.getdata(m))
    assert unchanged(m, snap)


def test_complex_and_text_masked_arrays_are_still_refused():
    with pytest.raises(TypeError, match="complex"):
        wp.area_matrix(np.ma.array(SQUARE + 1j, mask=np.zeros(SQUARE.shape)))
    with pytest.raises(TypeError, match="text"):
        wp.signed_area(np.ma.array([["a", "b"]] * 4, mask=[[1, 0]] * 4))
