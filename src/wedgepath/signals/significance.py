"""Is a lead more than chance?  Surrogate tests, FDR adjustment, block bootstrap."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from .._bars import check_progress, progress_bar
from .._results import Result, fmt_names, fmt_number, pair_index
from .._scaling import pow2_exponents, pow2_scale
from .._validation import as_float_array, as_int, as_real, as_rng, check_bool, check_choice
from ._kernel import signal_input, skew_half, unscale_pairs

__all__ = ["surrogate_test", "SurrogateResult", "bootstrap_area", "BootstrapResult",
           "benjamini_hochberg", "decorrelation_lag", "politis_white_block", "SURROGATE_METHODS",
           "SurrogateWarning"]

#: Accepted values of ``method=`` in :func:`surrogate_test`.
SURROGATE_METHODS = ("shift", "phase")


def _gap_free(X, times, names, what="X", min_channels=2, needs="the decorrelation lag needs"):
    data = signal_input(X, times, names, what=what, min_channels=min_channels)
    Y = np.array(data.values, dtype=np.float64)
    bad = ~np.isfinite(Y)
    if bad.any():
        r, c = (int(v) for v in np.argwhere(bad)[0])
        kind = "NaN (a gap)" if np.isnan(Y[r, c]) else "an infinite value"
        raise ValueError(f"{what} contains {kind} at row {r}, channel {c}; {needs} gap-free "
                         "data (split the recording at its gaps)")
    # each channel scaled by a power of two (exact): no sum, product or square of
    # areas overflows or underflows; areas are scaled back by unscale_pairs.  Scaled
    # before centring, so that the mean of values near the float64 limit cannot
    # overflow, and again after it, so that small deviations from a large mean keep
    # their full range
    ex = pow2_exponents(Y, axis=0)
    Y = pow2_scale(Y, -ex)
    Y -= Y.mean(axis=0)
    ex2 = pow2_exponents(Y, axis=0)
    return pow2_scale(Y, -ex2), data, ex + ex2


def _trial_pieces(X, times, names, trials, what="X", min_len=3):
    """Gap-free pieces of the trials of ``X``, centred and scaled as in :func:`_gap_free`.

    Returns ``(pieces, data, ex, tr)``: a list of (L_p, n) arrays (each
    centred on its own mean; pieces shorter than ``min_len`` rows, whose
    chord-closed area is zero, are left out), the checked input, the
    per-channel power-of-two exponents (common to all pieces, so that their
    areas add) and the :class:`~wedgepath.signals.trials.Trials`.
    """
    from .trials import resolve_trials, split_trial_column

    X, trials = split_trial_column(X, trials)
    data = signal_input(X, times, names, what=what)
    Y = np.array(data.values, dtype=np.float64)
    if np.isinf(Y).any():
        r, c = (int(v) for v in np.argwhere(np.isinf(Y))[0])
        raise ValueError(f"{what} contains an infinite value at row {r}, channel {c}")
    tr = resolve_trials(trials, data, default_gaps=True)
    ex = pow2_exponents(Y, axis=0)
    Y = pow2_scale(Y, -ex)
    keep = (tr.piece_stop - tr.piece_start) >= min_len
    pieces, owner = [], []
    for a, b, t in zip(tr.piece_start[keep].tolist(), tr.piece_stop[keep].tolist(),
                       tr.piece_trial[keep].tolist()):
        P = Y[a:b].copy()
        P -= P.mean(axis=0)
        pieces.append(P)
        owner.append(t)
    if not pieces:
        raise ValueError(f"{what} has no trial piece of at least {min_len} gap-free samples")
    ex2 = pow2_exponents(np.concatenate(pieces, axis=0), axis=0)
    pieces = [pow2_scale(P, -ex2) for P in pieces]
    return pieces, np.asarray(owner, dtype=np.int64), data, ex + ex2, tr


def _is_single(tr, T):
    """True when the trials are one gap-free piece covering every row (the classic case)."""
    return len(tr) == 1 and tr.piece_start.size == 1 and tr.piece_start[0] == 0 \
        and tr.piece_stop[0] == T


def _cyclic_area(Y):
    """Chord-closed area matrix of centred gap-free data (cyclic lag-one product).

    ``y_k (x) y_{k+1}`` and ``y_k (x) (y_{k+1} - y_k)`` have the same
    antisymmetric part; the second has much smaller entries for smooth data,
    and so a much smaller rounding error.  ``Y`` is (T, n) or a batch
    (..., T, n).
    """
    G = np.swapaxes(Y[..., :-1, :], -1, -2) @ np.diff(Y, axis=-2)
    last = Y[..., -1, :]
    G += last[..., :, None] * (Y[..., 0, :] - last)[..., None, :]
    return skew_half(G)


def benjamini_hochberg(pvalues):
    """Benjamini-Hochberg adjusted p-values (q-values) controlling the false discovery rate.

    ``q_(k) = min_{j >= k} min(1, m p_(j) / j)`` for the p-values sorted
    increasingly (Benjamini & Hochberg, J. R. Statist. Soc. B 57, 1995),
    computed by :func:`scipy.stats.false_discovery_control` (``method="bh"``).
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
    out = np.full(flat.shape, np.nan)
    if vals.size:
        from scipy.stats import false_discovery_control  # scipy.stats is slow to import
        out[ok] = false_discovery_control(vals, method="bh")
    return out.reshape(p.shape)


class SurrogateWarning(UserWarning):
    """Shift surrogates cannot honour the data's decorrelation time (recording too short)."""


#: unit roundoff of float64
_U = np.finfo(np.float64).eps / 2


def _autocovariances(Z, maxlag):
    """Sample autocovariances ``gamma(0..maxlag)`` of each column of ``Z`` (divisor T).

    ``gamma(h) = (1/T) sum_{k=0}^{T-1-h} z_k z_{k+h}`` of the centred columns,
    by FFT (zero padded, so not circular), one column at a time so that the
    work memory stays a few columns whatever the number of columns.
    Returns shape (maxlag + 1, columns).
    """
    T, m = Z.shape
    L = min(int(maxlag), T - 1)
    nfft = 1 << int(np.ceil(np.log2(T + L + 1)))
    out = np.empty((L + 1, m))
    for c in range(m):
        z = Z[:, c] - Z[:, c].mean()
        f = np.fft.rfft(z, nfft)
        out[:, c] = np.fft.irfft(f.real ** 2 + f.imag ** 2, nfft)[:L + 1] / T
    return out


def _flat_top_lags(Z):
    """Politis's empirical rule for the lag beyond which the autocorrelation is negligible.

    For each column: ``m_hat`` is the smallest ``m >= 0`` such that
    ``|rho(m + k)| < c sqrt(log10(T) / T)`` for ``k = 1..K_T``, with
    ``c = 2`` and ``K_T = max(5, sqrt(log10 T))`` (D. N. Politis, "Adaptive
    bandwidth choice", J. Nonparametric Statistics 15, 2003; the same rule
    and constants as D. N. Politis and H. White, "Automatic block-length
    selection for the dependent bootstrap", Econometric Reviews 23, 2004).
    Lags are searched up to ``ceil(sqrt(T)) + K_T``; a column whose
    autocorrelation is still significant there gets that largest value and
    ``False`` in the second result.

    Returns
    -------
    mhat : ndarray of int, one per column
    found : ndarray of bool, one per column
    gamma : ndarray (L + 1, columns), the autocovariances used
    """
    T = Z.shape[0]
    logT = np.log10(max(T, 2))
    K = max(5, int(np.sqrt(logT)))
    mmax = int(np.ceil(np.sqrt(T)))
    gamma = _autocovariances(Z, mmax + K)
    L = gamma.shape[0] - 1
    g0 = gamma[0]
    with np.errstate(invalid="ignore", divide="ignore"):
        rho = np.where(g0 > 0, gamma / np.where(g0 > 0, g0, 1.0), 0.0)
    small = np.abs(rho[1:]) < 2.0 * np.sqrt(logT / T)          # lags 1..L
    # windows of K consecutive lags m+1..m+K, m = 0..L-K, all negligible
    bad = np.concatenate((np.zeros((1, Z.shape[1])), np.cumsum(~small, axis=0)))
    nwin = L - K + 1
    if nwin <= 0:
        return np.zeros(Z.shape[1], dtype=np.int64), np.ones(Z.shape[1], bool), gamma
    clean = (bad[K:K + nwin] - bad[:nwin]) == 0                  # (nwin, columns)
    found = clean.any(axis=0)
    mhat = np.where(found, np.argmax(clean, axis=0), nwin - 1).astype(np.int64)
    return mhat, found, gamma


def decorrelation_lag(X, *, times=None, names=None):
    """Number of samples after which each channel's autocorrelation is negligible.

    ``2 * max(m_hat, 1)``, where ``m_hat`` is the smallest lag beyond which
    ``K_T = max(5, sqrt(log10 T))`` consecutive sample autocorrelations all
    lie within ``+-2 sqrt(log10(T) / T)`` (the empirical rule of D. N.
    Politis, J. Nonparametric Statistics 15, 2003, also used by Politis &
    White, Econometric Reviews 23, 2004, to choose block lengths; ``2 m_hat``
    is the bandwidth of their flat-top lag window).  This is the default
    minimum shift of :func:`surrogate_test`.

    Parameters
    ----------
    X : array_like (T, n), DataFrame or Path
        Gap-free samples.
    times, names
        As for :func:`area_matrix` (times are not used).

    Returns
    -------
    ndarray of int, shape (n,)
        One lag per channel, in samples.  A channel whose autocorrelation is
        still significant at lag ``ceil(sqrt(T)) + K_T`` (a trend, a pure
        rhythm) gets ``2 * ceil(sqrt(T))``.

    Examples
    --------
    >>> import numpy as np
    >>> import wedgepath as wp
    >>> rng = np.random.default_rng(0)
    >>> white = rng.standard_normal(5000)
    >>> smooth = np.convolve(rng.standard_normal(5009), np.ones(10) / 10, mode="valid")
    >>> wp.decorrelation_lag(np.column_stack([white, smooth])).tolist()
    [2, 22]

    (A 10-sample moving average has no autocorrelation beyond lag 9; the
    sample autocorrelation is negligible from lag 12 on here.)
    """
    Y, _, _ = _gap_free(X, times, names, min_channels=1)
    mhat, _, _ = _flat_top_lags(Y)
    return 2 * np.maximum(mhat, 1)


def _rounding_tolerance(Y, method):
    """Bound on the rounding error of ``|A*| - |A|`` for a surrogate equal to the data.

    Each entry of ``_cyclic_area`` is (half) a difference of two sums of T
    products ``y_ik (y_j,k+1 - y_jk)``; whatever the order of summation the
    error of such a sum is at most ``gamma_{T+2} sum_k |y_ik| |y_j,k+1 - y_jk|``
    (N. J. Higham, "Accuracy and Stability of Numerical Algorithms", 2nd
    ed., SIAM 2002, eq. (3.5) for inner products, plus one rounding of the
    difference).  A circular shift only reorders the same terms, so a
    surrogate equal to the data in exact arithmetic differs from it by at
    most twice that bound.  Phase surrogates also carry the rounding of the
    FFT round trip, at most ``10 log2(T) u ||y||`` per channel (Higham, ch.
    24, Cooley-Tukey error bound, with margin); its effect on the bilinear
    area is at most ``4 eps_fft ||y_i|| ||y_j||``.
    """
    T = Y.shape[0]
    D = np.roll(Y, -1, axis=0) - Y
    H = np.abs(Y).T @ np.abs(D)
    g = (T + 4) * _U / (1.0 - (T + 4) * _U)
    tol = 2.0 * g * 0.5 * (H + H.T) * (1.0 + 4 * _U)
    if method == "phase":
        norms = np.sqrt(np.sum(Y * Y, axis=0))
        eps_fft = 10.0 * max(np.log2(max(T, 2)), 1.0) * _U
        tol = tol + 2.0 * 4.0 * eps_fft * np.outer(norms, norms)
    return tol


def _pair_frame(names, area, **extra):
    """The tidy per-pair table shared by the significance results."""
    import pandas as pd

    iu, ju = pair_index(len(names))
    nm = np.array(names, dtype=object)
    cols = {"i": iu, "j": ju, "channel_i": nm[iu], "channel_j": nm[ju], "area": area[iu, ju]}
    cols.update({k: v[iu, ju] for k, v in extra.items()})
    return pd.DataFrame(cols)


@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class SurrogateResult(Result):
    """Result of :func:`surrogate_test`.

    Attributes
    ----------
    observed : ndarray (n, n)
        Chord-closed area matrix of the data.
    pvalues : ndarray (n, n)
        Two-sided Monte Carlo p-value of each pair,
        ``(1 + #{|A*| >= |A|}) / (1 + n_surrogates)``, where a surrogate
        equal to the data up to rounding counts as at least as extreme;
        symmetric, NaN on the diagonal.
    qvalues : ndarray (n, n)
        Benjamini-Hochberg adjustment of the ``n (n - 1) / 2`` pair p-values.
    null_mean, null_std : ndarray (n, n)
        Mean and standard deviation of the surrogate areas.
    method : str
    n_surrogates : int
        Surrogates per pair.
    seed
        The seed given.
    min_shift : int or None
        Smallest relative circular shift (samples) between two channels of a
        shift surrogate; None for phase surrogates.
    names : tuple of str
    closure : str
        ``"chord"`` (the statistic is the chord-closed area).
    units : mapping or None
    trials : int
        Number of gap-free pieces (trials, or the parts of a trial between
        its gaps) the statistic was pooled over; 1 for one gap-free series.
    design : str
        How the surrogates were made, in words (shown in the summary).

    ``to_frame()`` has one row per pair ``i < j``, columns ``i, j,
    channel_i, channel_j, area, p, q, null_mean, null_std``.
    """

    observed: np.ndarray
    pvalues: np.ndarray
    qvalues: np.ndarray
    null_mean: np.ndarray
    null_std: np.ndarray
    method: str
    n_surrogates: int
    seed: object
    names: tuple
    min_shift: int | None = None
    closure: str = "chord"
    units: Mapping | None = None
    trials: int = 1
    design: str = ""

    def significant(self, alpha=0.05) -> np.ndarray:
        """Boolean (n, n) matrix of pairs with ``qvalue <= alpha``."""
        return np.nan_to_num(self.qvalues, nan=np.inf) <= alpha

    def to_frame(self):
        """One row per pair: ``i, j, channel_i, channel_j, area, p, q, null_mean, null_std``."""
        return _pair_frame(self.names, self.observed, p=self.pvalues, q=self.qvalues,
                           null_mean=self.null_mean, null_std=self.null_std)

    def _summary_items(self):
        items = [("method", repr(self.method)), ("n_surrogates", str(self.n_surrogates))]
        if self.min_shift is not None:
            items.append(("min_shift", str(self.min_shift)))
        m = len(self.names) * (len(self.names) - 1) // 2
        items += [("significant", f"{int(self.significant().sum() // 2)} of {m} pairs at q<=0.05"),
                  ("names", fmt_names(self.names))]
        if self.trials > 1:
            items.append(("trials", str(self.trials)))
        return items


def _resolve_min_shift(min_shift, method, Y):
    T = Y.shape[0]
    cap = T // 4
    if method != "shift":
        if not (isinstance(min_shift, str) and min_shift == "auto"):
            raise ValueError("min_shift applies to method='shift' only; leave it at 'auto' for "
                             f"method={method!r}")
        return None
    if isinstance(min_shift, str):
        if min_shift != "auto":
            raise ValueError(f"min_shift must be 'auto' or a number of samples, got {min_shift!r}")
        if cap < 2:                 # too few samples for the rule: every shift but 0
            return cap
        mhat, _, _ = _flat_top_lags(Y)
        m = int(2 * max(int(mhat.max()), 1))
        if m > cap:
            import warnings
            warnings.warn(f"surrogate_test: the channels stay correlated over {m} samples, more "
                          f"than a quarter of the {T} samples; shift surrogates use shifts of at "
                          f"least {cap} samples and may keep part of a lead.  Use a longer "
                          "recording, or method='phase'", SurrogateWarning, stacklevel=3)
        return min(m, cap)
    m = as_int(min_shift, "min_shift")
    if not 0 <= m <= cap:
        raise ValueError(f"min_shift must be between 0 and a quarter of the samples ({cap}), "
                         f"got {m}")
    return m


def _merge_moments(count, mean, m2, values, use):
    """Merge a batch into running counts, means and sums of squared deviations.

    ``values`` (k, ...) holds a batch; ``use`` (same shape, bool) marks the
    entries that count.  Two passes within the batch, then the pairwise
    update of T. F. Chan, G. H. Golub and R. J. LeVeque, "Algorithms for
    computing the sample variance: analysis and recommendations", The
    American Statistician 37 (1983), eq. (2.1): no ``sum(x^2)/N - mean^2``,
    which loses every digit when the spread is small against the mean.
    Returns the new ``(count, mean, m2)``; the variance is ``m2 / (count - 1)``.
    """
    nb = use.sum(axis=0).astype(np.float64)
    safe = np.maximum(nb, 1.0)
    mb = np.where(use, values, 0.0).sum(axis=0) / safe
    m2b = np.where(use, (values - mb) ** 2, 0.0).sum(axis=0)
    tot = count + nb
    delta = mb - mean
    w = nb / np.maximum(tot, 1.0)
    return tot, mean + delta * w, m2 + m2b + delta * delta * count * w


def surrogate_test(X, *, method="shift", n_surrogates=199, min_shift="auto", seed=None,
                   times=None, names=None, progress=None, trials=None) -> SurrogateResult:
    """Test every pair's area against surrogates that break the lead-lag but keep each signal.

    ``method="shift"``
        Each channel is circularly shifted by its own uniformly random lag,
        so every pair gets a random relative shift.  Keeps each signal
        exactly (up to where it wraps around); breaks their timing.  A
        relative shift shorter than the data's decorrelation time keeps the
        lead (and would make the test lose its power), so every pair's
        relative circular shift is at least ``min_shift`` samples: a
        surrogate in which a pair's shift is shorter does not count for that
        pair, and surrogates are drawn until every pair has
        ``n_surrogates`` of them.
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
    ``(1 + #{|A*| >= |A_obs|}) / (1 + n_surrogates)`` (valid, never 0); a
    surrogate equal to the data up to rounding counts as at least as
    extreme (a bound on the rounding error decides, see Notes).  They are
    adjusted over the pairs by :func:`benjamini_hochberg`.

    Trials.  Repeated trials (a trial column, labels, or the pieces between
    NaN rows, which are trials by default) are tested together: the
    statistic is the pooled area (the sum of every gap-free piece's
    chord-closed area, as :func:`area_matrix` gives it), and each surrogate
    shifts (or phase-randomises) every channel *within each piece* on its
    own, so that no sample moves to another trial; the surrogate areas of
    the pieces are summed like the data's.  ``min_shift`` then applies
    within each piece (at most a quarter of the shortest piece).  Pieces of
    fewer than 3 samples have no area and are left out.

    Parameters
    ----------
    X : array_like (T, n), DataFrame or Path
        Samples; NaN rows are gaps between trials (see Trials above).
    method : {"shift", "phase"}
    n_surrogates : int
        Number of surrogates per pair (the smallest attainable p-value is
        ``1 / (n_surrogates + 1)``).
    min_shift : "auto" or int
        Shift surrogates only: the smallest relative circular shift, in
        samples, between two channels.  ``"auto"`` (default) takes
        :func:`decorrelation_lag` of the data (the largest over the
        channels, at most ``2 (ceil(sqrt(T)) + 5)``), and at most ``T // 4``
        (a warning says when that limit cuts it short).  An integer from 0 to ``T // 4`` sets
        it (0: every shift, the classic test).
    seed : int, numpy Generator or None
        Random seed; the same seed gives the same result.
    times, names
        As for :func:`area_matrix` (times are not used by the statistic).
    progress : bool or None
        Progress bar on standard error: None (default) only on a terminal
        and for runs longer than a few seconds, False never, True always.
    trials : str, array_like or None
        A DataFrame column holding each row's trial, or one label per row;
        None (default): the pieces between NaN rows are the trials.

    Returns
    -------
    SurrogateResult
        ``.trials`` and ``.design`` say what was pooled and how.

    Notes
    -----
    A lead longer than ``min_shift`` minus the channels' decorrelation time
    is partly re-created by some shifts; such leads are better tested with
    ``method="phase"`` or a larger ``min_shift``.  Strongly trending or
    non-stationary data violate both nulls: detrend or difference first.
    Circular shifts create a jump where the series wraps around; it matters
    when the ends differ much.

    Ties: a surrogate counts as at least as extreme when
    ``|A*| >= |A| - 2 e``, ``e`` a bound on the rounding error of the
    computed area (the inner-product bound of Higham, *Accuracy and
    Stability of Numerical Algorithms*, eq. 3.5, plus the FFT round trip for
    phase surrogates): relative to the area it is of order ``T u``, far
    below any sampling variation, but it makes a surrogate that reproduces
    the data (periodic data, ``min_shift=0``) count as it must.

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
    >>> float(res.pvalues[0, 1]), res.min_shift
    (0.01, 16)
    >>> bool(res.significant()[0, 1]), bool(res.significant()[0, 2])
    (True, False)
    """
    check_choice(method, "method", SURROGATE_METHODS)
    check_progress(progress)
    B = as_int(n_surrogates, "n_surrogates")
    if B < 1:
        raise ValueError(f"n_surrogates must be at least 1, got {B}")
    rng = as_rng(seed)
    pieces, _, data, ex, tr = _trial_pieces(X, times, names, trials)
    if not _is_single(tr, data.shape[0]):
        return _pooled_surrogates(pieces, data, ex, tr, method, B, min_shift, seed, rng,
                                  progress)
    Y = pieces[0]
    T, n = Y.shape
    m = _resolve_min_shift(min_shift, method, Y)
    obs = _cyclic_area(Y)
    # a surrogate within rounding of the data is a tie, and a tie counts
    threshold = np.abs(obs) - 2.0 * _rounding_tolerance(Y, method)
    exceed = np.zeros((n, n))
    count = np.zeros((n, n))      # surrogates counted so far, per pair
    mean = np.zeros((n, n))       # running mean and sum of squared deviations of the
    m2 = np.zeros((n, n))         # surrogate areas, merged batch by batch (no s2/B - mean^2)
    if method == "phase":
        F = np.fft.rfft(Y, axis=0)
        M = F.shape[0]
        free = np.arange(M)
        free = (free > 0) & ~((T % 2 == 0) & (free == M - 1))   # DC and Nyquist keep their phase
        nfree = int(free.sum())
        keep = 1.0
    else:
        keep = (T - 2 * m + 1) / T if m > 0 else 1.0   # share of relative shifts allowed
    offdiag = ~np.eye(n, dtype=bool)
    per_batch = max(1, min(256, (1 << 21) // (T * n)))   # surrogates per batch (memory bound)
    with progress_bar(B, "surrogates", progress) as bar:
        done = 0
        while done < B:
            k = int(min(per_batch, np.ceil((B - done) / keep) + (0 if method == "phase" else 2)))
            if method == "shift":
                shifts = rng.integers(0, T, size=(k, n))
                rows = (np.arange(T)[None, :, None] + shifts[:, None, :]) % T
                Ys = np.take_along_axis(np.broadcast_to(Y, (k, T, n)), rows, axis=1)
                d = np.abs(shifts[:, :, None] - shifts[:, None, :])
                valid = np.minimum(d, T - d) >= m
            else:
                Fs = np.broadcast_to(F, (k,) + F.shape).copy()
                Fs[:, free] *= np.exp(1j * rng.uniform(0.0, 2.0 * np.pi, size=(k, nfree, n)))
                Ys = np.fft.irfft(Fs, n=T, axis=1)
                valid = np.ones((k, n, n), dtype=bool)
            valid &= offdiag
            # each pair counts its first B valid surrogates, in the order drawn
            use = valid & (count + np.cumsum(valid, axis=0) <= B)
            A = _cyclic_area(Ys)
            exceed += np.sum(use & (np.abs(A) >= threshold), axis=0)
            count, mean, m2 = _merge_moments(count, mean, m2, A, use)
            now = int(count[offdiag].min())
            bar.update(now - done)
            done = now
    p = (1.0 + exceed) / (B + 1.0)
    np.fill_diagonal(p, np.nan)
    iu = np.triu_indices(n, 1)
    q = np.full((n, n), np.nan)
    q[iu] = benjamini_hochberg(p[iu])
    q.T[iu] = q[iu]
    var = m2 / max(B - 1, 1)
    what = "surrogate_test"
    return SurrogateResult(observed=unscale_pairs(obs, ex, what), pvalues=p, qvalues=q,
                           null_mean=unscale_pairs(mean, ex, what),
                           null_std=unscale_pairs(np.sqrt(var), ex, what), method=method,
                           n_surrogates=B, min_shift=m, seed=seed, names=data.labels,
                           units=data.units, trials=1,
                           design=("circular shifts of each channel" if method == "shift"
                                   else "Fourier phase randomisation of each channel"))


def _pooled_min_shift(min_shift, method, pieces, what):
    """``min_shift`` of a test pooled over pieces: within each piece, at most a quarter of
    the shortest; "auto" from the decorrelation lag of the longest (None for phase)."""
    lengths = np.array([Pc.shape[0] for Pc in pieces])
    cap = int(lengths.min()) // 4
    if method != "shift":
        if not (isinstance(min_shift, str) and min_shift == "auto"):
            raise ValueError("min_shift applies to method='shift' only; leave it at 'auto' for "
                             f"method={method!r}")
        return None
    if not isinstance(min_shift, str):
        m = as_int(min_shift, "min_shift")
        if not 0 <= m <= cap:
            raise ValueError(f"min_shift must be between 0 and a quarter of the shortest "
                             f"trial piece ({cap}), got {m}")
        return m
    if min_shift != "auto":
        raise ValueError(f"min_shift must be 'auto' or a number of samples, got {min_shift!r}")
    if cap < 2:
        return cap
    # the decorrelation lag of the longest piece (the best estimate available)
    mhat, _, _ = _flat_top_lags(pieces[int(np.argmax(lengths))])
    m = int(2 * max(int(mhat.max()), 1))
    if m > cap:
        import warnings
        warnings.warn(f"{what}: the channels stay correlated over {m} samples, more than a "
                      f"quarter of the shortest trial piece ({int(lengths.min())} samples); "
                      f"shifts of at least {cap} samples are used and may keep part of a lead",
                      SurrogateWarning, stacklevel=4)
        m = cap
    return m


def _pooled_surrogates(pieces, data, ex, tr, method, B, min_shift, seed, rng, progress):
    """Surrogate test of the pooled area of several pieces (trials), shuffled within each."""
    n = pieces[0].shape[1]
    P = len(pieces)
    m = _pooled_min_shift(min_shift, method, pieces, "surrogate_test")
    obs = np.zeros((n, n))
    tol = np.zeros((n, n))
    for Pc in pieces:
        obs += _cyclic_area(Pc)
        tol += _rounding_tolerance(Pc, method)
    threshold = np.abs(obs) - 2.0 * tol
    offdiag = ~np.eye(n, dtype=bool)
    S = np.zeros((B, n, n))            # surrogate b of every pair: sum over the pieces
    with progress_bar(B * P, "surrogates", progress) as bar:
        for Pc in pieces:
            L = Pc.shape[0]
            count = np.zeros((n, n), dtype=np.int64)
            per_batch = max(1, min(256, (1 << 21) // (L * n)))
            if method == "phase":
                F = np.fft.rfft(Pc, axis=0)
                M = F.shape[0]
                free = np.arange(M)
                free = (free > 0) & ~((L % 2 == 0) & (free == M - 1))
                nfree = int(free.sum())
            while True:
                need = int(B - count[offdiag].min())
                if need <= 0:
                    break
                if method == "shift":
                    keep = (L - 2 * m + 1) / L if m > 0 else 1.0
                    k = int(min(per_batch, np.ceil(need / max(keep, 1e-3)) + 2))
                    shifts = rng.integers(0, L, size=(k, n))
                    rows = (np.arange(L)[None, :, None] + shifts[:, None, :]) % L
                    Ys = np.take_along_axis(np.broadcast_to(Pc, (k, L, n)), rows, axis=1)
                    d = np.abs(shifts[:, :, None] - shifts[:, None, :])
                    valid = np.minimum(d, L - d) >= m
                else:
                    k = int(min(per_batch, need))
                    Fs = np.broadcast_to(F, (k,) + F.shape).copy()
                    Fs[:, free] *= np.exp(1j * rng.uniform(0.0, 2.0 * np.pi,
                                                           size=(k, nfree, n)))
                    Ys = np.fft.irfft(Fs, n=L, axis=1)
                    valid = np.ones((k, n, n), dtype=bool)
                valid &= offdiag
                rank = count + np.cumsum(valid, axis=0) - 1     # slot of each valid draw
                use = valid & (rank < B)
                A = _cyclic_area(Ys)
                kk, ii, jj = np.nonzero(use)
                S[rank[kk, ii, jj], ii, jj] += A[kk, ii, jj]
                before = int(count[offdiag].min())
                count += use.sum(axis=0)
                bar.update(int(count[offdiag].min()) - before)
    exceed = np.sum(np.abs(S) >= threshold, axis=0).astype(np.float64)
    p = (1.0 + exceed) / (B + 1.0)
    np.fill_diagonal(p, np.nan)
    iu = np.triu_indices(n, 1)
    q = np.full((n, n), np.nan)
    q[iu] = benjamini_hochberg(p[iu])
    q.T[iu] = q[iu]
    mean = S.mean(axis=0)
    std = S.std(axis=0, ddof=1) if B > 1 else np.zeros((n, n))
    what = "surrogate_test"
    how = ("circular shifts of each channel within each piece" if method == "shift"
           else "Fourier phase randomisation of each channel within each piece")
    design = f"{how}; area summed over {P} pieces of {tr.describe()}"
    return SurrogateResult(observed=unscale_pairs(obs, ex, what), pvalues=p, qvalues=q,
                           null_mean=unscale_pairs(mean, ex, what),
                           null_std=unscale_pairs(std, ex, what), method=method,
                           n_surrogates=B, min_shift=m, seed=seed, names=data.labels,
                           units=data.units, trials=P, design=design)


@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class BootstrapResult(Result):
    """Result of :func:`bootstrap_area`.

    Attributes
    ----------
    estimate : ndarray (n, n)
        The chord-closed area matrix of the data.
    low, high : ndarray (n, n)
        Studentized (bootstrap-t) confidence limits at level ``confidence``.
    std : ndarray (n, n)
        Bootstrap standard error (standard deviation of the replicates).
    confidence : float
        Confidence level of the interval, in (0, 1).
    block : int or None
        Block length (samples; the largest over the trial pieces when
        blocks are resampled within several pieces); None when whole trials
        are resampled.
    resample : str
        ``"blocks"`` (circular blocks within each gap-free piece) or
        ``"trials"`` (whole trials, drawn with replacement).
    trials : int
        Number of trials (``resample="trials"``) or of gap-free pieces
        (``"blocks"``) pooled.
    n_boot : int
    seed
        The seed given.
    replicates : ndarray (n_boot, n, n) or None
        Kept when asked for (``keep=True``).
    names : tuple of str
    closure : str
        ``"chord"``.
    units : mapping or None

    ``to_frame()`` has one row per pair ``i < j``, columns ``i, j,
    channel_i, channel_j, area, low, high, std``.
    """

    estimate: np.ndarray
    low: np.ndarray
    high: np.ndarray
    std: np.ndarray
    confidence: float
    block: int | None
    n_boot: int
    names: tuple
    seed: object = None
    replicates: np.ndarray | None = None
    closure: str = "chord"
    units: Mapping | None = None
    resample: str = "blocks"
    trials: int = 1

    def to_frame(self):
        """One row per pair: ``i, j, channel_i, channel_j, area, low, high, std``."""
        return _pair_frame(self.names, self.estimate, low=self.low, high=self.high, std=self.std)

    def _summary_items(self):
        items = [("confidence", fmt_number(self.confidence)), ("resample", repr(self.resample))]
        if self.block is not None:
            items.append(("block", str(self.block)))
        items += [("n_boot", str(self.n_boot)), ("names", fmt_names(self.names))]
        if self.trials > 1:
            items.append(("trials", str(self.trials)))
        return items


#: at most this many pairs feed the automatic block length (spread over the matrix)
_BLOCK_PAIRS = 32
#: work arrays of the bootstrap hold at most about this many doubles
_BOOT_ELEMENTS = 1 << 22


def _local_terms(Y):
    """``y_k (x) (y_{k+1} - y_k)`` pieces: Y and its cyclic forward difference."""
    D = np.empty_like(Y)          # y_{k+1} - y_k (cyclically): same antisymmetric part as
    D[:-1] = Y[1:] - Y[:-1]       # y_k (x) y_{k+1}, smaller rounding (see _cyclic_area)
    D[-1] = Y[0] - Y[-1]
    return D


def politis_white_block(u):
    """Block length of the circular block bootstrap for the mean of each column of ``u``.

    ``b = (2 G^2 / D)^(1/3) T^(1/3)`` with ``G = sum_k lambda(k/M) |k| gamma(k)``,
    ``D = (4/3) g^2``, ``g = sum_k lambda(k/M) gamma(k)``, the flat-top lag
    window ``lambda(t) = 1`` for ``|t| <= 1/2``, ``2 (1 - |t|)`` for
    ``1/2 < |t| <= 1``, and ``M = 2 m_hat`` from the rule of
    :func:`_flat_top_lags` (D. N. Politis and H. White, "Automatic
    block-length selection for the dependent bootstrap", Econometric Reviews
    23, 2004, with the constant of the circular bootstrap corrected in A.
    Patton, D. N. Politis and H. White, Econometric Reviews 28, 2009).  As a
    real number, one per column; NaN where ``g <= 0``.
    """
    u = np.asarray(u, dtype=np.float64)
    T = u.shape[0]
    mhat, _, gamma = _flat_top_lags(u)
    M = np.minimum(2 * np.maximum(mhat, 1), gamma.shape[0] - 1)
    out = np.full(u.shape[1], np.nan)
    for c in range(u.shape[1]):
        k = np.arange(1, M[c] + 1)
        lam = np.where(k / M[c] <= 0.5, 1.0, 2.0 * (1.0 - k / M[c]))
        G = 2.0 * np.sum(lam * k * gamma[1:M[c] + 1, c])
        g = gamma[0, c] + 2.0 * np.sum(lam * gamma[1:M[c] + 1, c])
        if g > 0:
            out[c] = (2.0 * G * G / ((4.0 / 3.0) * g * g)) ** (1.0 / 3.0) * T ** (1.0 / 3.0)
    return out


def _auto_block(Y, D):
    """Block length from the data: ``max(b_PW, 2 sqrt(T))``, at most ``T // 4``."""
    T, n = Y.shape
    iu, ju = np.triu_indices(n, 1)
    pick = np.unique(np.linspace(0, iu.size - 1, min(iu.size, _BLOCK_PAIRS)).round().astype(int))
    i, j = iu[pick], ju[pick]
    u = 0.5 * (Y[:, i] * D[:, j] - Y[:, j] * D[:, i])       # local area terms of those pairs
    b = politis_white_block(u)
    b_pw = float(np.nanmax(b)) if np.isfinite(b).any() else 1.0
    return int(min(max(np.ceil(b_pw), np.ceil(2.0 * np.sqrt(T)), 2), max(T // 4, 2)))


def _block_sums(Y, D, starts, length):
    """Sums of the local terms over ``length`` samples from each start (cyclically), (S, n*n)."""
    T, n = Y.shape
    out = np.empty((starts.size, n * n))
    per = max(1, _BOOT_ELEMENTS // max(length * n, 1))
    for s0 in range(0, starts.size, per):
        st = starts[s0:s0 + per]
        rows = (st[:, None] + np.arange(length)[None, :]) % T       # (s, length)
        G = np.matmul(np.swapaxes(Y[rows], 1, 2), D[rows])          # (s, n, n)
        out[s0:s0 + st.size] = skew_half(G).reshape(st.size, n * n)
    return out


def bootstrap_area(X, *, block="auto", n_boot=999, confidence=0.95, seed=None, times=None,
                   names=None, keep=False, progress=None, trials=None,
                   resample="auto") -> BootstrapResult:
    """Block-bootstrap confidence intervals for every ``A[i, j]``.

    The chord-closed area of centred data is a sum of local terms,
    ``A = sum_k (1/2) y_k ^ y_{k+1}`` (cyclically, ``y = x - mean``).  A
    replicate sums ``floor(T / b)`` blocks of ``b`` consecutive terms and one
    block of the remaining ``T mod b`` terms, each starting at a uniformly
    random place and wrapping around the end: the circular block bootstrap
    (D. N. Politis and J. P. Romano, "A circular block-resampling procedure
    for stationary data", in *Exploring the Limits of Bootstrap*, Wiley
    1992), whose replicates have mean exactly ``A``.  Long recordings use
    starts on a grid (every ``s``-th sample, ``s`` chosen so that the block
    sums fit in about 32 MB).

    The interval is studentized (bootstrap-t): each replicate's
    ``t* = (A* - A) / s*``, with ``s*`` the standard error computed from the
    spread of that replicate's own blocks, gives the quantiles ``q``, and
    ``[A - q_(1+confidence)/2 s, A - q_(1-confidence)/2 s]``, ``s`` the same standard
    error from all blocks of the data (the studentized block bootstrap of
    F. Götze and H. R. Künsch, "Second-order correctness of the blockwise
    bootstrap for stationary observations", Annals of Statistics 24, 1996).
    It accounts for the uncertainty of the standard error, which the
    percentile interval ignores.

    ``block="auto"`` takes ``max(b_PW, 2 sqrt(T))``, at most ``T // 4``:
    ``b_PW`` the largest over (up to 32) pairs of the Politis-White
    block length of the pair's local terms (:func:`politis_white_block`);
    the floor ``2 sqrt(T)`` is our own choice, from the coverage table in
    ``docs/signals.md``: the MSE-optimal ``b_PW`` alone is too short when the
    terms carry a weak but long correlation (coverage 0.89 there).

    Trials.  With repeated trials (a trial column, labels, or the pieces
    between NaN rows, which are trials by default) the estimate is the
    pooled area (the sum over trials) and ``resample`` chooses the design:
    ``"trials"`` draws whole trials with replacement (the standard design
    when trials are independent; studentized with the spread of the
    trials' areas), ``"blocks"`` resamples circular blocks within each
    gap-free piece and sums the pieces' replicates (for a few long
    trials).  ``"auto"`` takes trials when there are at least 10 of them,
    blocks otherwise (a common rule of thumb, no source: fewer than about
    10 trials give too coarse a trial bootstrap), unless pieces shorter
    than 8 samples hold more than a tenth of the samples (then trials).
    With blocks, a piece shorter than 8 samples enters every replicate
    unchanged.  The result says which (``.resample``).

    Parameters
    ----------
    X : array_like (T, n), DataFrame or Path
        Samples (at least 8 per piece for blocks); NaN rows are gaps
        between trials.
    block : "auto" or int
        Block length in samples (2 to ``T // 4``).
    n_boot : int
        Number of bootstrap replicates (at least 2).
    confidence : float
        Confidence level of the interval, in (0, 1).
    seed : int, Generator or None
        Random seed (reproducible).
    times, names
        As for :func:`area_matrix` (times are not used).
    keep : bool
        Keep the replicates in the result.
    progress : bool or None
        Progress bar on standard error: None (default) only on a terminal
        and for runs longer than a few seconds, False never, True always.
    trials : str, array_like or None
        A DataFrame column holding each row's trial, or one label per row;
        None (default): the pieces between NaN rows are the trials.
    resample : {"auto", "trials", "blocks"}
        What is resampled (see Trials above).

    Returns
    -------
    BootstrapResult

    Notes
    -----
    The interval is for the expected area of a recording like this one
    (same length, same process): for stationary data, ``T`` times the
    expected local term.  Measured coverage of nominal 95 % intervals on
    models with a known answer is in ``docs/signals.md`` (section 6); it
    falls short where the data are strongly persistent relative to their
    length, or trend.

    Examples
    --------
    >>> import numpy as np
    >>> import wedgepath as wp
    >>> t = np.arange(2000) * 2 * np.pi / 40
    >>> rng = np.random.default_rng(2)
    >>> X = np.column_stack([np.sin(t), np.sin(t - 0.5)]) + 0.3 * rng.standard_normal((2000, 2))
    >>> ci = wp.bootstrap_area(X, seed=0)
    >>> ci.block
    90
    >>> bool(ci.low[0, 1] < ci.estimate[0, 1] < ci.high[0, 1]), bool(ci.low[0, 1] > 0)
    (True, True)
    """
    check_progress(progress)
    check_choice(resample, "resample", ("auto", "trials", "blocks"))
    R = as_int(n_boot, "n_boot")
    if R < 2:
        raise ValueError(f"n_boot must be at least 2, got {R}")
    level = as_real(confidence, "confidence")
    if not 0.0 < level < 1.0:
        raise ValueError(f"confidence must lie strictly between 0 and 1, got {level}")
    keep = check_bool(keep, "keep")
    pieces, owner, data, ex, tr = _trial_pieces(X, times, names, trials)
    if not _is_single(tr, data.shape[0]):
        return _pooled_bootstrap(pieces, owner, data, ex, tr, block, R, level, seed, keep,
                                 progress, resample)
    if resample == "trials":
        raise ValueError("resample='trials' needs several trials; these data are one gap-free "
                         "series (give trials=, or use resample='blocks')")
    Y = pieces[0]
    T, n = Y.shape
    if T < 8:
        raise ValueError(f"the bootstrap needs at least 8 samples, got {T}")
    D = _local_terms(Y)
    if isinstance(block, str):
        if block != "auto":
            raise ValueError(f"block must be 'auto' or a number of samples, got {block!r}")
        ell = _auto_block(Y, D)
    else:
        ell = as_int(block, "block")
        if not 2 <= ell <= T // 4:
            raise ValueError(f"block must be between 2 and a quarter of the samples ({T // 4}), "
                             f"got {ell}")
    rng = as_rng(seed)
    k, r = divmod(T, ell)
    nn = n * n
    stride = max(1, int(np.ceil(T * nn / _BOOT_ELEMENTS)))
    starts = np.arange(0, T, stride)
    S = starts.size
    W = _block_sums(Y, D, starts, ell)                     # (S, n*n)
    Wr = _block_sums(Y, D, starts, r) if r else None
    estimate = skew_half(Y.T @ D)
    est = estimate.reshape(nn)
    # standard error of the data: spread of all (grid) block sums, scaled to T terms.
    # Spreads are computed on block sums shifted by their mean (the shifted-data
    # algorithm, Chan, Golub & LeVeque, The American Statistician 37, 1983), so that a
    # strong lead (large common block sum) costs no precision in sum(x^2) - k mean^2
    Wmean = W.mean(axis=0)
    Wc = W - Wmean
    Wc2 = Wc * Wc
    se = np.sqrt(np.mean(Wc2, axis=0) * (T / ell))
    reps = np.empty((R, nn))
    tstar = np.empty((R, nn))
    per = max(1, min(R, _BOOT_ELEMENTS // max(S + nn * 4, 1)))
    with progress_bar(R, "bootstrap", progress) as bar:
        for r0 in range(0, R, per):
            r1 = min(R, r0 + per)
            idx = rng.integers(0, S, size=(r1 - r0, k))
            counts = np.zeros((r1 - r0, S))
            np.add.at(counts, (np.arange(r1 - r0)[:, None], idx), 1.0)
            totc = counts @ Wc                                # k full blocks, shifted
            mb = totc / k
            var_b = np.maximum(counts @ Wc2 - k * mb * mb, 0.0) / (k - 1)   # their spread
            tot = totc + k * Wmean
            if Wr is not None:
                tot += Wr[rng.integers(0, S, size=r1 - r0)]
            reps[r0:r1] = tot
            sd = np.sqrt(var_b * (T / ell))
            dev = tot - est
            with np.errstate(divide="ignore", invalid="ignore"):
                tstar[r0:r1] = np.where(sd > 0, dev / np.where(sd > 0, sd, 1.0),
                                        np.where(dev == 0, 0.0, np.sign(dev) * np.inf))
            bar.update(r1 - r0)
    alpha = 1.0 - level
    q_lo, q_hi = np.quantile(tstar, [alpha / 2, 1 - alpha / 2], axis=0, method="inverted_cdf")
    low = np.triu((est - q_hi * se).reshape(n, n), 1)
    high = np.triu((est - q_lo * se).reshape(n, n), 1)
    low, high = low - high.T, high - low.T      # A[j, i] = -A[i, j]: mirrored intervals
    std = reps.std(axis=0, ddof=1).reshape(n, n)
    reps = reps.reshape(R, n, n)
    what = "bootstrap_area"
    return BootstrapResult(estimate=unscale_pairs(estimate, ex, what),
                           low=unscale_pairs(low, ex, what), high=unscale_pairs(high, ex, what),
                           std=unscale_pairs(std, ex, what), confidence=level, block=ell,
                           n_boot=R, seed=seed, names=data.labels, units=data.units,
                           replicates=unscale_pairs(reps, ex, what) if keep else None)


def _piece_block_replicates(Y, ell, R, rng):
    """Circular block bootstrap of one centred piece: (estimate, se^2, replicates, var*).

    The same computation as the single-series path of :func:`bootstrap_area`
    (see there), returning per replicate its total and its own variance
    estimate (scaled to the piece's length), for pooling over pieces.
    """
    T, n = Y.shape
    D = _local_terms(Y)
    k, r = divmod(T, ell)
    nn = n * n
    stride = max(1, int(np.ceil(T * nn / _BOOT_ELEMENTS)))
    starts = np.arange(0, T, stride)
    S = starts.size
    W = _block_sums(Y, D, starts, ell)
    Wr = _block_sums(Y, D, starts, r) if r else None
    est = skew_half(Y.T @ D).reshape(nn)
    Wmean = W.mean(axis=0)
    Wc = W - Wmean
    Wc2 = Wc * Wc
    se2 = np.mean(Wc2, axis=0) * (T / ell)
    idx = rng.integers(0, S, size=(R, k))
    counts = np.zeros((R, S))
    np.add.at(counts, (np.arange(R)[:, None], idx), 1.0)
    totc = counts @ Wc
    mb = totc / k
    var_b = np.maximum(counts @ Wc2 - k * mb * mb, 0.0) / max(k - 1, 1)
    tot = totc + k * Wmean
    if Wr is not None:
        tot += Wr[rng.integers(0, S, size=R)]
    return est, se2, tot, var_b * (T / ell)


def _studentized(est, se, reps, sd, level, n):
    """Bootstrap-t limits from replicates ``reps`` with their own standard errors ``sd``."""
    dev = reps - est
    with np.errstate(divide="ignore", invalid="ignore"):
        tstar = np.where(sd > 0, dev / np.where(sd > 0, sd, 1.0),
                         np.where(dev == 0, 0.0, np.sign(dev) * np.inf))
    alpha = 1.0 - level
    q_lo, q_hi = np.quantile(tstar, [alpha / 2, 1 - alpha / 2], axis=0, method="inverted_cdf")
    low = np.triu((est - q_hi * se).reshape(n, n), 1)
    high = np.triu((est - q_lo * se).reshape(n, n), 1)
    return low - high.T, high - low.T      # A[j, i] = -A[i, j]: mirrored intervals


def _pooled_bootstrap(pieces, owner, data, ex, tr, block, R, level, seed, keep, progress,
                      resample):
    """Bootstrap of the pooled area of several trials (see :func:`bootstrap_area`)."""
    n = pieces[0].shape[1]
    nn = n * n
    N = int(np.unique(owner).size)         # trials with a piece that has an area
    if resample == "auto":
        lengths = np.array([P.shape[0] for P in pieces])
        # blocks need pieces of 8 samples or more; shorter ones would enter unchanged
        blocks_ok = lengths[lengths >= 8].sum() >= 0.9 * lengths.sum()
        resample = "trials" if N >= 10 or (not blocks_ok and N >= 2) else "blocks"
    rng = as_rng(seed)
    if resample == "trials":
        if N < 2:
            raise ValueError("resample='trials' needs at least 2 trials with samples")
        At = np.zeros((N, nn))
        _, slot = np.unique(owner, return_inverse=True)
        for P, t in zip(pieces, slot.tolist()):
            At[t] += _cyclic_area(P).reshape(nn)
        est = At.sum(axis=0)
        se = np.sqrt(N * At.var(axis=0, ddof=1))
        reps = np.empty((R, nn))
        sd = np.empty((R, nn))
        per = max(1, _BOOT_ELEMENTS // max(N * nn, 1))
        with progress_bar(R, "bootstrap", progress) as bar:
            for r0 in range(0, R, per):
                r1 = min(R, r0 + per)
                draw = At[rng.integers(0, N, size=(r1 - r0, N))]      # (r, N, nn)
                reps[r0:r1] = draw.sum(axis=1)
                sd[r0:r1] = np.sqrt(N * draw.var(axis=1, ddof=1))
                bar.update(r1 - r0)
        ell = None
        count = N
    else:
        lengths = [P.shape[0] for P in pieces if P.shape[0] >= 8]
        if not lengths:
            raise ValueError("resampling blocks needs a trial piece of at least 8 samples "
                             "(use resample='trials')")
        est = np.zeros(nn)
        se2 = np.zeros(nn)
        reps = np.zeros((R, nn))
        var = np.zeros((R, nn))
        used = []
        with progress_bar(R * len(pieces), "bootstrap", progress) as bar:
            for P in pieces:
                L = P.shape[0]
                if L < 8:       # too short to cut into blocks: enters every replicate as is
                    a = _cyclic_area(P).reshape(nn)
                    est += a
                    reps += a
                    bar.update(R)
                    continue
                if isinstance(block, str):
                    if block != "auto":
                        raise ValueError(f"block must be 'auto' or a number of samples, got "
                                         f"{block!r}")
                    ell = _auto_block(P, _local_terms(P))
                else:
                    ell = as_int(block, "block")
                    if not 2 <= ell <= L // 4:
                        raise ValueError(f"block must be between 2 and a quarter of the "
                                         f"shortest trial piece ({min(lengths) // 4}), got {ell}")
                used.append(ell)
                e, s2, tot, v = _piece_block_replicates(P, ell, R, rng)
                est += e
                se2 += s2
                reps += tot
                var += v
                bar.update(R)
        se = np.sqrt(se2)
        sd = np.sqrt(var)
        ell = int(max(used))
        count = len(pieces)
    low, high = _studentized(est, se, reps, sd, level, n)
    estimate = skew_half(est.reshape(n, n))
    std = reps.std(axis=0, ddof=1).reshape(n, n)
    what = "bootstrap_area"
    return BootstrapResult(estimate=unscale_pairs(estimate, ex, what),
                           low=unscale_pairs(low, ex, what), high=unscale_pairs(high, ex, what),
                           std=unscale_pairs(std, ex, what), confidence=level, block=ell,
                           n_boot=R, seed=seed, names=data.labels, units=data.units,
                           replicates=unscale_pairs(reps.reshape(R, n, n), ex, what)
                           if keep else None, resample=resample, trials=count)
