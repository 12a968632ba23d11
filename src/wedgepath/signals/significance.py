"""Is a lead more than chance?  Surrogate tests, FDR adjustment, block bootstrap."""

from __future__ import annotations

import numpy as np

from .._progress import Progress
from .._validation import as_float_array, as_int, as_real, as_rng, check_bool, check_choice
from ._kernel import signal_input, skew_half, unscale_pairs

__all__ = ["surrogate_test", "SurrogateResult", "bootstrap_area", "BootstrapResult",
           "benjamini_hochberg", "SURROGATE_METHODS"]

#: Accepted values of ``method=`` in :func:`surrogate_test`.
SURROGATE_METHODS = ("shift", "phase")


def _gap_free(X, times, names, what="X"):
    data = signal_input(X, times, names, what=what)
    Y = np.array(data.values, dtype=np.float64)
    bad = ~np.isfinite(Y)
    if bad.any():
        r, c = (int(v) for v in np.argwhere(bad)[0])
        kind = "NaN (a gap)" if np.isnan(Y[r, c]) else "an infinite value"
        raise ValueError(f"{what} contains {kind} at row {r}, channel {c}; surrogates and the "
                         "bootstrap need gap-free data (split the recording at its gaps)")
    # each channel scaled by a power of two (exact): no sum, product or square of
    # areas overflows or underflows; areas are scaled back by unscale_pairs.  Scaled
    # before centring, so that the mean of values near the float64 limit cannot
    # overflow, and again after it, so that small deviations from a large mean keep
    # their full range
    ex = _pow2_exponents(Y)
    Y = np.ldexp(Y, -ex)
    Y -= Y.mean(axis=0)
    ex2 = _pow2_exponents(Y)
    return np.ldexp(Y, -ex2), data.names, ex + ex2


def _pow2_exponents(Y):
    big = np.max(np.abs(Y), axis=0) if Y.shape[0] else np.zeros(Y.shape[1])
    return np.where(big > 0, np.frexp(big)[1], 0).astype(np.int64)


def _cyclic_area(Y):
    """Chord-closed area matrix of centred gap-free data (cyclic lag-one product).

    ``y_k (x) y_{k+1}`` and ``y_k (x) (y_{k+1} - y_k)`` have the same
    antisymmetric part; the second has much smaller entries for smooth data,
    and so a much smaller rounding error.
    """
    G = Y[:-1].T @ np.diff(Y, axis=0) + np.outer(Y[-1], Y[0] - Y[-1])
    return skew_half(G)


def benjamini_hochberg(pvalues):
    """Benjamini-Hochberg adjusted p-values (q-values) controlling the false discovery rate.

    ``q_(k) = min_{j >= k} min(1, m p_(j) / j)`` for the p-values sorted
    increasingly (Benjamini & Hochberg, J. R. Statist. Soc. B 57, 1995).
    Rejecting every hypothesis with ``q <= alpha`` keeps the expected share
    of false rejections at most ``alpha`` for independent (or positively
    dependent) tests.  NaN entries are ignored and stay NaN.

    Parameters
    ----------
    pvalues : array_like
        P-values in [0, 1], any shape.

    Returns
    -------
    ndarray
        Adjusted values, same shape.

    Examples
    --------
    >>> from wedgepath.signals import benjamini_hochberg
    >>> benjamini_hochberg([0.01, 0.03, 0.02, 0.5]).round(12).tolist()
    [0.04, 0.04, 0.04, 0.5]
    """
    p = as_float_array(pvalues, "pvalues", allow_nan=True)
    flat = p.ravel()
    ok = ~np.isnan(flat)
    vals = flat[ok]
    if vals.size and (vals.min() < 0 or vals.max() > 1):
        raise ValueError("p-values must lie in [0, 1]")
    m = vals.size
    out = np.full(flat.shape, np.nan)
    if m:
        order = np.argsort(vals, kind="stable")
        ranked = vals[order] * m / np.arange(1, m + 1)
        q = np.minimum.accumulate(ranked[::-1])[::-1]
        res = np.empty(m)
        res[order] = np.minimum(q, 1.0)
        out[ok] = res
    return out.reshape(p.shape)


class SurrogateResult:
    """Result of :func:`surrogate_test`.

    Attributes
    ----------
    observed : ndarray (n, n)
        Chord-closed area matrix of the data.
    pvalues : ndarray (n, n)
        Two-sided Monte Carlo p-value of each pair,
        ``(1 + #{|A*| >= |A|}) / (1 + n_surrogates)``; symmetric, NaN on
        the diagonal.
    qvalues : ndarray (n, n)
        Benjamini-Hochberg adjustment of the ``n (n - 1) / 2`` pair p-values.
    null_mean, null_std : ndarray (n, n)
        Mean and standard deviation of the surrogate areas.
    method : str
    n_surrogates : int
    seed
    names : tuple of str or None
    """

    __slots__ = ("observed", "pvalues", "qvalues", "null_mean", "null_std", "method",
                 "n_surrogates", "seed", "names")

    def __init__(self, **kw):
        for k in self.__slots__:
            setattr(self, k, kw[k])

    def significant(self, alpha=0.05) -> np.ndarray:
        """Boolean (n, n) matrix of pairs with ``qvalue <= alpha``."""
        return np.nan_to_num(self.qvalues, nan=np.inf) <= alpha

    def __repr__(self):
        return (f"SurrogateResult(method={self.method!r}, n_surrogates={self.n_surrogates}, "
                f"significant pairs at 5% FDR={int(self.significant().sum() // 2)})")


def surrogate_test(X, *, method="shift", n_surrogates=199, seed=None, times=None, names=None,
                   progress=None) -> SurrogateResult:
    """Test every pair's area against surrogates that break the lead-lag but keep each signal.

    ``method="shift"``
        Each channel is circularly shifted by its own uniformly random lag
        (0 to T-1), so every pair gets a random relative shift.  Keeps each
        signal exactly (up to where it wraps around); breaks their timing.
    ``method="phase"``
        Fourier phase randomisation (Theiler et al., Physica D 58, 1992):
        each channel gets independent random phases, so each spectrum (and
        autocorrelation) is kept while cross-channel phase relations -- the
        source of area -- are destroyed.  Valid for (approximately) Gaussian
        stationary signals.

    The statistic is the chord-closed area (the cyclic sum, which a common
    circular shift leaves unchanged).  Hilbert- and z-score-normalised areas
    give the same p-values, because both surrogates keep each channel's
    spectrum and variance.  P-values are two-sided,
    ``(1 + #{|A*| >= |A_obs|}) / (1 + n_surrogates)`` (valid, never 0), and
    are adjusted over the pairs by :func:`benjamini_hochberg`.

    Parameters
    ----------
    X : array_like (T, n), DataFrame or Path
        Gap-free samples (NaN raises; split at gaps first).
    method : {"shift", "phase"}
    n_surrogates : int
        Number of surrogate data sets (the smallest attainable p-value is
        ``1 / (n_surrogates + 1)``).
    seed : int, numpy Generator or None
        Random seed; the same seed gives the same result.
    times, names
        As for :func:`area_matrix` (times are not used by the statistic).
    progress : bool or None
        Progress indicator on stderr: None shows it only for runs longer
        than a few seconds, False never, True always.

    Returns
    -------
    SurrogateResult

    Notes
    -----
    Strongly trending or non-stationary data violate both nulls: detrend or
    difference first.  Circular shifts create a jump where the series wraps
    around; it matters when the ends differ much.

    Examples
    --------
    >>> import numpy as np
    >>> import wedgepath as wp

    A broadband signal, a copy of it 3 samples later, and an unrelated one:

    >>> rng = np.random.default_rng(0)
    >>> drive = np.convolve(rng.standard_normal(1200), np.ones(10) / 10, mode="same")
    >>> X = np.column_stack([drive[3:], drive[:-3], rng.standard_normal(1197)])
    >>> X[:, :2] += 0.05 * rng.standard_normal((1197, 2))
    >>> res = wp.surrogate_test(X, n_surrogates=99, seed=1)
    >>> float(res.pvalues[0, 1])
    0.01
    >>> bool(res.significant()[0, 1]), bool(res.significant()[0, 2])
    (True, False)
    """
    check_choice(method, "method", SURROGATE_METHODS)
    B = as_int(n_surrogates, "n_surrogates")
    if B < 1:
        raise ValueError(f"n_surrogates must be at least 1, got {B}")
    rng = as_rng(seed)
    Y, nm, ex = _gap_free(X, times, names)
    T, n = Y.shape
    obs = _cyclic_area(Y)
    abs_obs = np.abs(obs)
    exceed = np.zeros((n, n))
    s1 = np.zeros((n, n))
    s2 = np.zeros((n, n))
    if method == "phase":
        F = np.fft.rfft(Y, axis=0)
        M = F.shape[0]
        free = np.arange(M)
        free = (free > 0) & ~((T % 2 == 0) & (free == M - 1))   # DC and Nyquist keep their phase
        nfree = int(free.sum())
    cols = np.arange(n)
    with Progress(B, "surrogates", enabled=progress) as bar:
        for _ in range(B):
            if method == "shift":
                shifts = rng.integers(0, T, size=n)
                rows = (np.arange(T)[:, None] + shifts[None, :]) % T
                Ys = Y[rows, cols]
            else:
                Fs = F.copy()
                Fs[free] *= np.exp(1j * rng.uniform(0.0, 2.0 * np.pi, size=(nfree, n)))
                Ys = np.fft.irfft(Fs, n=T, axis=0)
            A = _cyclic_area(Ys)
            exceed += np.abs(A) >= abs_obs
            s1 += A
            s2 += A * A
            bar.update()
    p = (1.0 + exceed) / (B + 1.0)
    np.fill_diagonal(p, np.nan)
    iu = np.triu_indices(n, 1)
    q = np.full((n, n), np.nan)
    q[iu] = benjamini_hochberg(p[iu])
    q.T[iu] = q[iu]
    mean = s1 / B
    var = np.maximum(s2 / B - mean * mean, 0.0) * (B / max(B - 1, 1))
    what = "surrogate_test"
    return SurrogateResult(observed=unscale_pairs(obs, ex, what), pvalues=p, qvalues=q,
                           null_mean=unscale_pairs(mean, ex, what),
                           null_std=unscale_pairs(np.sqrt(var), ex, what), method=method,
                           n_surrogates=B,
                           seed=seed, names=nm)


class BootstrapResult:
    """Result of :func:`bootstrap_area`.

    Attributes
    ----------
    estimate : ndarray (n, n)
        The chord-closed area matrix of the data.
    low, high : ndarray (n, n)
        Percentile confidence limits at ``level``.
    std : ndarray (n, n)
        Bootstrap standard error.
    level : float
    block : int
        Block length (samples).
    n_boot : int
    names : tuple of str or None
    replicates : ndarray (n_boot, n, n) or None
        Kept when asked for (``keep=True``).
    """

    __slots__ = ("estimate", "low", "high", "std", "level", "block", "n_boot", "names",
                 "replicates")

    def __init__(self, **kw):
        for k in self.__slots__:
            setattr(self, k, kw[k])

    def __repr__(self):
        return f"BootstrapResult(level={self.level}, block={self.block}, n_boot={self.n_boot})"


def bootstrap_area(X, *, block=None, n_boot=999, level=0.95, seed=None, times=None, names=None,
                   keep=False, progress=None) -> BootstrapResult:
    """Block-bootstrap confidence intervals for every ``A[i, j]``.

    The chord-closed area of centred data is a sum of local terms,
    ``A = sum_k (1/2) y_k ^ y_{k+1}`` (cyclically, ``y = x - mean``).  The
    terms are cut into non-overlapping blocks of ``block`` samples (the
    non-overlapping block bootstrap of Carlstein, Ann. Statist. 14, 1986;
    blocks keep the short-range dependence); a replicate sums blocks drawn
    with replacement (multinomial counts, one matrix product for all
    replicates).  The fewer than ``block`` terms left over at the end are
    added unchanged to every replicate, so the bootstrap mean equals the
    estimate.

    Parameters
    ----------
    X : array_like (T, n), DataFrame or Path
        Gap-free samples.
    block : int, optional
        Block length in samples; default ``ceil(T ** (1/3))`` (a common rule
        of thumb).  Choose it longer than the dependence in the data -- for
        oscillations, a few cycles.
    n_boot : int
        Number of bootstrap replicates.
    level : float
        Confidence level of the percentile interval, in (0, 1).
    seed : int, Generator or None
        Random seed (reproducible).
    keep : bool
        Keep the replicates in the result.
    progress : bool or None
        Progress indicator on stderr (None: only for long runs).

    Returns
    -------
    BootstrapResult

    Examples
    --------
    >>> import numpy as np
    >>> import wedgepath as wp
    >>> t = np.arange(2000) * 2 * np.pi / 40
    >>> rng = np.random.default_rng(2)
    >>> X = np.column_stack([np.sin(t), np.sin(t - 0.5)]) + 0.3 * rng.standard_normal((2000, 2))
    >>> ci = wp.bootstrap_area(X, block=80, seed=0)
    >>> bool(ci.low[0, 1] < ci.estimate[0, 1] < ci.high[0, 1]), bool(ci.low[0, 1] > 0)
    (True, True)
    """
    Y, nm, ex = _gap_free(X, times, names)
    T, n = Y.shape
    ell = int(np.ceil(T ** (1.0 / 3.0))) if block is None else as_int(block, "block")
    if not 1 <= ell <= T:
        raise ValueError(f"block must be between 1 and the number of samples ({T}), got {ell}")
    R = as_int(n_boot, "n_boot")
    if R < 2:
        raise ValueError(f"n_boot must be at least 2, got {R}")
    level = as_real(level, "level")
    if not 0.0 < level < 1.0:
        raise ValueError(f"level must lie strictly between 0 and 1, got {level}")
    keep = check_bool(keep, "keep")
    rng = as_rng(seed)
    nb = T // ell
    # block sums of the cyclic terms y_k (x) y_{k+1}, k = 0..T-1
    Ynext = np.empty_like(Y)      # y_{k+1} - y_k (cyclically): same antisymmetric part as
    Ynext[:-1] = Y[1:] - Y[:-1]   # y_k (x) y_{k+1}, smaller rounding (see _cyclic_area)
    Ynext[-1] = Y[0] - Y[-1]
    head = Y[:nb * ell].reshape(nb, ell, n)
    headn = Ynext[:nb * ell].reshape(nb, ell, n)
    W = skew_half(np.matmul(np.swapaxes(head, 1, 2), headn))      # (nb, n, n)
    rest = skew_half(Y[nb * ell:].T @ Ynext[nb * ell:])
    estimate = W.sum(axis=0) + rest
    Wf = W.reshape(nb, n * n)
    reps = np.empty((R, n * n))
    per = max(1, min(R, (1 << 22) // max(nb, 1)))
    with Progress(R, "bootstrap", enabled=progress) as bar:
        for r0 in range(0, R, per):
            r1 = min(R, r0 + per)
            counts = rng.multinomial(nb, np.full(nb, 1.0 / nb), size=r1 - r0).astype(np.float64)
            reps[r0:r1] = counts @ Wf
            bar.update(r1 - r0)
    reps += rest.reshape(1, n * n)
    reps = reps.reshape(R, n, n)
    alpha = 1.0 - level
    low, high = np.quantile(reps, [alpha / 2, 1 - alpha / 2], axis=0)
    std = reps.std(axis=0, ddof=1)
    what = "bootstrap_area"
    return BootstrapResult(estimate=unscale_pairs(estimate, ex, what),
                           low=unscale_pairs(low, ex, what), high=unscale_pairs(high, ex, what),
                           std=unscale_pairs(std, ex, what), level=level, block=ell, n_boot=R,
                           names=nm, replicates=unscale_pairs(reps, ex, what) if keep else None)
