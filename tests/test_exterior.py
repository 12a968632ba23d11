"""The shared index algebra (wedgepath._exterior) against facts computed another way."""

from itertools import combinations, permutations

import numpy as np
import pytest

from wedgepath._exterior import row_signs, sort_with_sign, wedge_terms


def sign_by_cycles(perm):
    """(-1)^(n - number of cycles): the sign from the cycle decomposition (common practice)."""
    seen, cycles = set(), 0
    for i in range(len(perm)):
        if i not in seen:
            cycles += 1
            j = i
            while j not in seen:
                seen.add(j)
                j = perm[j]
    return (-1) ** (len(perm) - cycles)


@pytest.mark.parametrize("n", range(1, 7))
def test_sign_matches_cycle_count_and_determinant(n):
    for perm in permutations(range(n)):
        srt, sign = sort_with_sign(perm)
        assert srt == tuple(range(n))
        assert sign == sign_by_cycles(perm)
        # the determinant of the permutation matrix is the sign as well
        assert sign == round(np.linalg.det(np.eye(n)[list(perm)]))
    assert sort_with_sign((3, 1, 3)) == (None, 0)


def test_row_signs_vectorised():
    rng = np.random.default_rng(0)
    rows = np.array([rng.permutation(7) * 3 + 1 for _ in range(200)])
    expect = [sort_with_sign(r)[1] for r in rows]
    assert row_signs(rows).tolist() == expect


def _one_form(a):
    return {(i,): float(v) for i, v in enumerate(a) if v != 0}


def _wedge(a, b):
    return wedge_terms(a, b, lambda x, y, s: s * x * y, lambda x, y: x + y)


def test_wedge_of_one_forms_is_the_antisymmetric_product():
    rng = np.random.default_rng(1)
    a, b = rng.normal(size=4), rng.normal(size=4)
    w = _wedge(_one_form(a), _one_form(b))
    for i, j in combinations(range(4), 2):
        assert w[(i, j)] == pytest.approx(a[i] * b[j] - a[j] * b[i], abs=1e-14)


@pytest.mark.parametrize("k", [2, 3, 4])
def test_wedge_of_k_one_forms_gives_the_minors(k):
    # (a_1 . dx) ^ ... ^ (a_k . dx) = sum_I det(A[:, I]) dx_I (Cauchy-Binet, common practice)
    rng = np.random.default_rng(k)
    A = rng.normal(size=(k, 5))
    w = _one_form(A[0])
    for r in range(1, k):
        w = _wedge(w, _one_form(A[r]))
    for I in combinations(range(5), k):
        assert w.get(I, 0.0) == pytest.approx(np.linalg.det(A[:, I]), abs=1e-12)


def test_wedge_is_associative_and_graded_commutative():
    rng = np.random.default_rng(2)

    def form(k):
        return {I: float(rng.normal()) for I in combinations(range(5), k) if rng.uniform() < 0.7}
    a, b, c = form(1), form(2), form(1)
    left, right = _wedge(_wedge(a, b), c), _wedge(a, _wedge(b, c))
    assert set(left) == set(right)
    assert all(left[I] == pytest.approx(right[I], abs=1e-12) for I in left)
    for x, y, k, m in ((a, b, 1, 2), (a, c, 1, 1), (b, b, 2, 2)):
        xy, yx = _wedge(x, y), _wedge(y, x)
        for I in set(xy) | set(yx):
            assert xy.get(I, 0.0) == pytest.approx((-1) ** (k * m) * yx.get(I, 0.0), abs=1e-12)
    assert all(abs(v) < 1e-12 for v in _wedge(a, a).values())        # dx ^ dx = 0
