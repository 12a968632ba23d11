"""Calibrated verdicts: is the leading cycle of an area matrix above noise?

The null hypothesis is "each channel keeps its own spectrum (its own
autocorrelation and scale) and there is no timing between channels".  Its
surrogates are Fourier phase randomisations (Theiler, Eubank, Longtin,
Galdrikian & Farmer, "Testing for nonlinearity in time series: the method of
surrogate data", Physica D 58, 1992), one independent set of phases per
channel, as in :func:`wedgepath.surrogate_test` with ``method="phase"``.

The chord-closed area of centred samples is a sum over Fourier frequencies.
With ``F_i(k)`` the discrete Fourier transform of channel i, ``T`` samples and
``w_k = 2 pi k / T``,

    A[i, j] = -sum_{0 < k < T/2} a_i(k) a_j(k) sin(phi_j(k) - phi_i(k)),
    a_i(k) = sqrt(2 sin(w_k) / T) |F_i(k)|,  phi_i(k) = arg F_i(k)

(the cyclic lag-one product written in the frequency domain; checked against
the time-domain sum in ``tests/test_verdicts.py``).  A phase surrogate keeps
every ``a_i(k)`` and draws the phases uniformly and independently, so its
area matrix needs no inverse transform: the ``K`` frequencies that carry most
of some channel's power are simulated exactly, and the remaining ones -- each
a small share -- by their sum's normal limit (mean 0, variance
``sum_k a_i(k)^2 a_j(k)^2 / 2`` per pair, uncorrelated between pairs).  A
surrogate then costs ``O(K n^2)`` operations whatever the recording length.

The statistic is the strength of the leading cycle: the largest ``lambda``
of the eigenvalue pairs ``+- i lambda`` of the *standardised* matrix
``Z[i, j] = A[i, j] / s[i, j]``, ``s[i, j]`` the null's standard deviation of
``A[i, j]``.  It is unchanged by any rescaling of the channels, so the same
test applies to every normalisation of the area matrix, and it is defined for
any ``n >= 2`` (the share ``fit`` is identically 1 for ``n <= 3``).
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from .._results import Result, fmt_names, fmt_number
from .._validation import as_int, as_rng, check_choice

__all__ = ["fit_test", "FitTest", "FIT_TEST_MAX_CHANNELS", "drift_check", "DriftCheck",
           "DriftWarning", "antiphase_channels", "structure_kind"]

#: beyond this many channels the test is not computed (a surrogate costs an
#: n x n eigenvalue problem)
FIT_TEST_MAX_CHANNELS = 256
#: frequencies simulated exactly (at most); the rest by their normal limit
_EXACT_FREQUENCIES = 512
#: complex numbers held at once by a batch of surrogates
_BATCH_ELEMENTS = 1 << 21


@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class FitTest(Result):
    """Result of :func:`fit_test`: is the leading cycle stronger than noise?

    Attributes
    ----------
    pvalue : float
        Monte Carlo p-value ``(1 + #{L* >= L}) / (1 + n_surrogates)`` of the
        leading-cycle strength ``L`` against phase surrogates.
    strength : float
        ``L``: the leading eigenvalue of the standardised area matrix
        ``Z = A / s`` (``s`` the null standard deviation of each entry).
    null_median, null_q95 : float
        Median and 95th percentile of ``L`` over the surrogates.
    fit : float
        Share of ``||Z||_F^2`` in the leading eigenvalue pair of ``Z``.
    above : bool
        ``pvalue <= 0.05``: the verdict "above noise" at the 5 % level.
    n_surrogates : int
    seed
        The seed given.
    exact_frequencies : int
        Frequencies simulated exactly (the rest by their normal limit).
    method : str
        ``"phase"``.
    names : tuple of str
    closure : str
        How the data were closed before the test (``"detrend"`` or ``"chord"``).
    units : mapping or None

    ``to_frame()`` has one row: ``strength, null_median, null_q95, pvalue,
    fit, n_surrogates``.
    """

    pvalue: float
    strength: float
    null_median: float
    null_q95: float
    fit: float
    n_surrogates: int
    exact_frequencies: int
    names: tuple
    seed: object = None
    method: str = "phase"
    closure: str = "detrend"
    units: Mapping | None = None

    @property
    def above(self) -> bool:
        """The verdict "above noise" at the 5 % level (``pvalue <= 0.05``)."""
        return bool(self.pvalue <= 0.05)

    def to_frame(self):
        """One row: ``strength, null_median, null_q95, pvalue, fit, n_surrogates``."""
        import pandas as pd

        return pd.DataFrame({"strength": [self.strength], "null_median": [self.null_median],
                             "null_q95": [self.null_q95], "pvalue": [self.pvalue],
                             "fit": [self.fit], "n_surrogates": [self.n_surrogates]})

    def _summary_items(self):
        return [("pvalue", fmt_number(self.pvalue, 3)), ("strength", fmt_number(self.strength, 4)),
                ("null_median", fmt_number(self.null_median, 4)),
                ("n_surrogates", str(self.n_surrogates)), ("names", fmt_names(self.names))]


def _spectral_amplitudes(Y):
    """``a_i(k)`` for ``0 < k < T/2`` of centred data ``Y`` (T, n)."""
    T = Y.shape[0]
    F = np.fft.rfft(Y, axis=0)
    k = np.arange(F.shape[0])
    keep = (k > 0) & (2 * k < T)
    w = np.sqrt(2.0 * np.sin(2.0 * np.pi * k[keep] / T) / T)
    return w[:, None] * np.abs(F[keep])


def _spectral_weights(Y):
    """``a_i(k)`` and ``phi_i(k)`` (the formula of the module docstring; for the tests)."""
    T = Y.shape[0]
    F = np.fft.rfft(Y, axis=0)
    k = np.arange(F.shape[0])
    keep = (k > 0) & (2 * k < T)
    a = np.sqrt(2.0 * np.sin(2.0 * np.pi * k[keep] / T) / T)[:, None] * np.abs(F[keep])
    return a, np.angle(F[keep])


def _frequency_area(a, phi):
    """Area matrix from the spectral weights (the formula of the module docstring)."""
    U = a * np.exp(1j * phi)
    return -(U.conj().T @ U).imag


def _leading(Z):
    """Largest ``lambda`` of skew-symmetric matrices Z (..., n, n)."""
    w = np.linalg.eigvalsh(1j * Z)
    return np.abs(w).max(axis=-1), w


def _base(X, times, names, what="X"):
    """Centred gap-free samples (an owned copy, channels scaled by powers of two), the
    input's description and the drift ramp ``s`` (0 to 1 in time, or in sample index)."""
    from .significance import _gap_free

    Y, data, _ = _gap_free(X, times, names, what=what,
                             needs="the verdict, drift and anti-phase checks need")
    T = Y.shape[0]
    if data.times is not None:
        t = np.asarray(data.times, dtype=np.float64)
        s = (t - t[0]) / (t[-1] - t[0])
    else:
        s = np.arange(T) / (T - 1.0)
    return Y, data, s


def _trial_base(X, times, names, trials, *, detrend, what="X"):
    """Centred gap-free pieces of the trials (each detrended on its own if asked), and the
    checked input: the pieces' areas add, and the verdict pools them."""
    from .significance import _trial_pieces

    pieces, _, data, _, tr = _trial_pieces(X, times, names, trials, what=what, min_len=8)
    if detrend:
        keep = (tr.piece_stop - tr.piece_start) >= 8
        t = None if data.times is None else np.asarray(data.times, dtype=np.float64)
        out = []
        for P, a, b in zip(pieces, tr.piece_start[keep].tolist(), tr.piece_stop[keep].tolist()):
            if t is None:
                s = np.arange(b - a) / (b - a - 1.0)
            else:
                s = (t[a:b] - t[a]) / (t[b - 1] - t[a])
            out.append(_detrended(P, s))
        pieces = out
    return pieces, data


def _detrended(Y, s):
    """``Y`` minus its drift from first to last sample, centred again (a new array)."""
    Yd = Y - np.multiply.outer(s, Y[-1] - Y[0])
    Yd -= Yd.mean(axis=0)
    return Yd


def _line_removed(Y, s):
    """``Y`` minus each channel's least-squares straight line in ``s`` (a new array).

    Unlike :func:`_detrended`, the end samples have no special weight, so stationary
    cycles (whose first and last samples are arbitrary) are left almost as they are.
    """
    sc = s - s.mean()
    denom = float(sc @ sc)
    Yd = Y - Y.mean(axis=0)
    if denom > 0:
        Yd -= np.multiply.outer(sc, (sc @ Yd) / denom)
    return Yd


def _check_counts(n_surrogates, exact_frequencies):
    B = as_int(n_surrogates, "n_surrogates")
    if B < 1:
        raise ValueError(f"n_surrogates must be at least 1, got {B}")
    K = as_int(exact_frequencies, "exact_frequencies")
    if K < 0:
        raise ValueError(f"exact_frequencies must be at least 0, got {K}")
    return B, K


def _fit_core(Y, B, K, rng):
    """The test on prepared (centred) samples: a dict of FitTest's numbers."""
    from .significance import _cyclic_area

    # Y is one centred array, or a list of centred gap-free pieces (trials): the area is
    # the sum of the pieces' areas and each piece's frequencies get their own independent
    # phases under the null, so the pieces' spectral rows simply stack
    pieces = list(Y) if isinstance(Y, (list, tuple)) else [Y]
    T, n = sum(P.shape[0] for P in pieces), pieces[0].shape[1]
    if T < 8:
        raise ValueError(f"fit_test needs at least 8 samples, got {T}")
    if n > FIT_TEST_MAX_CHANNELS:
        raise ValueError(f"fit_test handles at most {FIT_TEST_MAX_CHANNELS} channels, got {n}")
    a = np.concatenate([_spectral_amplitudes(P) for P in pieces], axis=0)
    A = sum(_cyclic_area(P) for P in pieces)   # = the frequency-domain formula (tested)
    a2 = a * a
    var = 0.5 * (a2.T @ a2)                                  # null variance of each entry
    off = ~np.eye(n, dtype=bool)
    ok = off & (var > 0)
    sd = np.sqrt(np.where(ok, var, 1.0))
    obs_Z = np.where(ok, A / sd, 0.0)
    L_obs, w = _leading(obs_Z)
    tot = float(np.sum(w * w))
    fit = float(2 * L_obs ** 2 / tot) if tot > 0 else 1.0
    # exact frequencies: the largest shares of some channel's power
    power = a2.sum(axis=0)
    share = (a2 / np.where(power > 0, power, 1.0)).max(axis=1)
    K = min(K, share.size)
    exact = (np.argpartition(share, share.size - K)[share.size - K:] if K else
             np.empty(0, dtype=np.intp))
    rest = np.ones(share.size, bool)
    rest[exact] = False
    ar = a2[rest]
    rest_sd = np.sqrt(np.maximum(0.5 * (ar.T @ ar), 0.0))
    ae = a[exact]
    iu = np.triu_indices(n, 1)
    L = np.empty(B)
    per = max(1, _BATCH_ELEMENTS // max(K * n, n * n, 1))
    for b0 in range(0, B, per):
        b = min(per, B - b0)
        As = np.zeros((b, n, n))
        if K:
            # -Im(U^H U) with U = ae exp(i psi), in real arithmetic (numpy's stacked
            # complex matmul of a conjugated, swapped view is ~20x slower)
            psi = rng.uniform(0.0, 2.0 * np.pi, size=(b, K, n))
            M = np.einsum("bki,bkj->bij", ae * np.cos(psi), ae * np.sin(psi), optimize=True)
            As -= M - np.swapaxes(M, 1, 2)
        G = np.zeros((b, n, n))
        G[:, iu[0], iu[1]] = rng.standard_normal((b, iu[0].size))
        As += (G - np.swapaxes(G, 1, 2)) * rest_sd
        Zs = np.where(ok, As / sd, 0.0)
        L[b0:b0 + b] = _leading(Zs)[0]
    # a surrogate equal to the statistic up to rounding counts as at least as extreme
    tol = 64 * np.finfo(float).eps * max(L_obs, 1.0) * n
    p = (1.0 + np.sum(L >= L_obs - tol)) / (B + 1.0)
    return dict(pvalue=float(p), strength=float(L_obs), null_median=float(np.median(L)),
                null_q95=float(np.quantile(L, 0.95)), fit=min(fit, 1.0), n_surrogates=B,
                exact_frequencies=int(K))


def fit_test(X, *, closure="detrend", n_surrogates=199, seed=0, times=None, names=None,
             exact_frequencies=_EXACT_FREQUENCIES, trials=None) -> FitTest:
    """Test whether the leading lead-lag cycle of the data is stronger than noise.

    Builds the null "each channel keeps its own spectrum, no timing between
    channels" from the data itself with phase surrogates (see the module
    docstring for the method and its cost) and compares the strength of the
    leading cycle of the standardised area matrix with its null
    distribution.  Valid at any channel scales and for any number of
    channels from 2 to ``FIT_TEST_MAX_CHANNELS`` (256).

    Parameters
    ----------
    X : array_like (T, n), DataFrame or Path
        Gap-free samples (at least 8).
    closure : {"detrend", "chord"}
        ``"detrend"`` (default) first removes each channel's drift from the
        first to the last sample (as :func:`area_matrix` does with
        ``closure="detrend"``); ``"chord"`` tests the chord-closed data as
        they are.  The phase null is calibrated with ``"detrend"`` for white
        noise, AR(1) and random walks; with ``"chord"`` it is not for
        random walks (their end-to-start jump ties the phases of each
        channel together): 10 % and 22 % of null data sets of 8 and 16
        random walks were called "above noise" at 5 % in our runs.
    n_surrogates : int
        Number of surrogates (the smallest attainable p-value is
        ``1 / (n_surrogates + 1)``).
    seed : int, Generator or None
        Random seed (reproducible).
    times, names
        As for :func:`area_matrix`.
    exact_frequencies : int
        At most this many frequencies are simulated exactly, chosen by their
        share of some channel's power; the rest by their normal limit.
    trials : str, array_like or None
        Trials to pool (a trial label per row, a DataFrame column's name, or
        ``"gaps"`` for the gap-free pieces): the area is summed over the
        pieces and each piece's frequencies get their own random phases
        under the null (pieces of fewer than 8 rows are left out; with
        ``closure="detrend"`` each piece loses its own drift).  Default:
        one gap-free recording.

    Returns
    -------
    FitTest

    Notes
    -----
    Phase surrogates assume each channel is (close to) a stationary
    Gaussian process.  Strong trends and random walks violate that; the test
    stays on the safe side for random walks (measured in
    ``tests/test_verdicts.py``), but the areas of trending data say little:
    detrend, difference or band-pass first (:mod:`wedgepath.filters`).

    Examples
    --------
    >>> import numpy as np
    >>> import wedgepath as wp

    A random rhythm (smoothed noise) seen by four sensors, each 2 samples
    later than the previous one, plus sensor noise:

    >>> rng = np.random.default_rng(1)
    >>> drive = np.convolve(rng.standard_normal(620), np.hanning(9), mode="same")
    >>> X = np.column_stack([drive[10 - 2 * k: 610 - 2 * k] for k in range(4)])
    >>> X += 0.5 * rng.standard_normal(X.shape)
    >>> res = wp.fit_test(X, seed=0)
    >>> res.above, res.pvalue
    (True, 0.005)
    >>> noise = rng.standard_normal((600, 4))
    >>> wp.fit_test(noise, seed=0).above
    False

    A pure sinusoid per channel cannot be told from independent channels:
    one frequency carries one phase difference, which chance makes as
    easily as timing.  The test finds timing through phase differences that
    hold across many frequencies (or a band of them).
    """
    check_choice(closure, "closure", ("chord", "detrend"))
    B, K = _check_counts(n_surrogates, exact_frequencies)
    rng = as_rng(seed)
    if trials is not None:
        Y, data = _trial_base(X, times, names, trials, detrend=closure == "detrend")
    else:
        Y, data, s = _base(X, times, names)
        if closure == "detrend":
            Y = _detrended(Y, s)
    return FitTest(**_fit_core(Y, B, K, rng), seed=seed, names=data.labels, closure=closure,
                   units=data.units)


# --------------------------------------------------------------------------- drift
class DriftWarning(UserWarning):
    """The drift between the first and last samples dominates the areas."""


#: ``DriftCheck.dominated`` when the drift's share of the areas exceeds this
DRIFT_SHARE_LIMIT = 0.5

DRIFT_REMEDIES = ("closure='detrend', differencing (difference=True) or a zero-phase "
                  "band-pass / high-pass filter (bandpass=(LOW, HIGH) / highpass=P)")


@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class DriftCheck(Result):
    """Result of :func:`drift_check`: how much of each area the drift makes.

    Attributes
    ----------
    share : ndarray (n, n)
        For each pair, ``|D| / (|D| + |A_d|)``: ``D`` the part of the
        chord-closed area that the straight drift from the first to the last
        sample makes (``A_chord - A_detrend``), ``A_d`` the area left once
        that drift is removed.  0 on the diagonal.
    overall : float
        ``||D||_F / (||D||_F + ||A_d||_F)``: the same share for the whole
        matrix, with every channel scaled to unit standard deviation (so no
        channel weighs more for its units).
    dominated : bool
        ``overall > DRIFT_SHARE_LIMIT`` (0.5): the drift makes most of the
        lead-lag pattern.
    worst : tuple of str
        The pair with the largest ``|D|`` (names).
    names : tuple of str
    units : mapping or None

    ``to_frame()`` has one row per pair ``i < j``: ``i, j, channel_i,
    channel_j, drift_share``.
    """

    share: np.ndarray
    overall: float
    worst: tuple
    names: tuple
    units: Mapping | None = None

    @property
    def dominated(self) -> bool:
        """``overall > DRIFT_SHARE_LIMIT``."""
        return bool(self.overall > DRIFT_SHARE_LIMIT)

    def message(self) -> str:
        """The warning text, naming the remedies."""
        return (f"the drift from first to last sample makes {100 * self.overall:.0f}% of the "
                f"lead-lag areas (most in {self.worst[0]} / {self.worst[1]}): trends, not "
                f"timing, drive this matrix; remove them first with {DRIFT_REMEDIES}")

    def to_frame(self):
        """One row per pair: ``i, j, channel_i, channel_j, drift_share``."""
        from .significance import _pair_frame

        return _pair_frame(self.names, self.share, drift_share=self.share).drop(columns="area")

    def _summary_items(self):
        return [("overall", fmt_number(self.overall, 3)), ("dominated", str(self.dominated)),
                ("worst", repr(self.worst)), ("names", fmt_names(self.names))]


def drift_check(X, *, times=None, names=None, warn=True) -> DriftCheck:
    """Measure how much of the chord-closed areas comes from drift; warn when it dominates.

    The closing chord of a trending path spans the whole trend, and every
    wiggle is then measured against it: the areas grow with the trend, not
    with the timing.  Removing the straight drift ``s_k (x_last - x_first)``
    (``s_k`` from 0 to 1 in time) splits each area into a drift part ``D``
    and the rest; :class:`DriftCheck` gives the drift's share.

    Parameters
    ----------
    X : array_like (T, n), DataFrame or Path
        Gap-free samples.
    times, names
        As for :func:`area_matrix`.
    warn : bool
        Emit a :class:`DriftWarning` naming the remedies when the drift's
        share exceeds ``DRIFT_SHARE_LIMIT`` (0.5).

    Returns
    -------
    DriftCheck

    Examples
    --------
    >>> import numpy as np
    >>> import wedgepath as wp
    >>> t = np.arange(400.0)
    >>> X = np.column_stack([np.sin(t / 10), np.cos(t / 10)])
    >>> wp.drift_check(X).overall < 0.05
    True
    >>> import warnings
    >>> with warnings.catch_warnings(record=True) as w:
    ...     warnings.simplefilter("always")
    ...     chk = wp.drift_check(X + np.column_stack([t, 2 * t]) / 10)
    >>> chk.dominated, "detrend" in str(w[0].message)
    (True, True)
    """
    Y, data, s = _base(X, times, names)
    res = _drift_core(Y, s, data.labels, data.units)
    if check_bool_arg(warn) and res.dominated:
        import warnings
        warnings.warn(res.message(), DriftWarning, stacklevel=2)
    return res


def _drift_core(Y, s, labels, units=None):
    """DriftCheck of centred samples ``Y`` and the ramp ``s``.

    Removing the drift ``s (y_last - y_first)`` changes the cyclic area by
    ``D[i, j] = b_i d_j - d_i b_j`` (``d = y_last - y_first``, ``b_i`` the cyclic
    area of channel i against the ramp ``s``): the area form is bilinear and the
    ramps of all channels are proportional, so their own area is zero.
    """
    from .significance import _cyclic_area

    A = _cyclic_area(Y)
    d = Y[-1] - Y[0]
    b = 0.5 * (Y.T @ (np.roll(s, -1) - np.roll(s, 1)))
    D = np.multiply.outer(b, d) - np.multiply.outer(d, b)
    Ad = A - D
    with np.errstate(invalid="ignore", divide="ignore"):
        share = np.where(np.abs(D) + np.abs(Ad) > 0, np.abs(D) / (np.abs(D) + np.abs(Ad)), 0.0)
        sd = Y.std(axis=0)
        sd = np.where(sd > 0, sd, 1.0)
        S = np.outer(sd, sd)
    nd, na = float(np.linalg.norm(D / S)), float(np.linalg.norm(Ad / S))
    overall = nd / (nd + na) if nd + na > 0 else 0.0
    i, j = np.unravel_index(int(np.argmax(np.abs(np.triu(D / S, 1)))), D.shape)
    return DriftCheck(share=share, overall=overall, worst=(labels[i], labels[j]), names=labels,
                      units=units)


def check_bool_arg(v):
    from .._validation import check_bool

    return check_bool(v, "warn")


# --------------------------------------------------------------------------- anti-phase
def antiphase_channels(X, *, times=None, names=None, min_share=0.4):
    """Channels that load negatively on a dominant leading principal component.

    The leading principal component of the correlation matrix is oriented so
    that most channels load positively; when it explains at least
    ``min_share`` of the total variance and at least twice the second one (a
    dominant common factor; a ring of channels spread round a cycle has two
    components of equal weight and is left alone), channels
    with a negative loading move against it and may be anti-phase
    (countercyclical).  Their areas then have the sign of the opposite lead:
    flip them with ``invert=`` before reading leaders and laggers.  Each
    channel's least-squares straight line (in time) is removed first, so
    that opposite trends are not read as opposite phases.

    Returns
    -------
    list of (str, float)
        ``(name, loading)`` of each such channel (loadings of the unit
        eigenvector times sqrt(n), so 1 means an average share), sorted by
        loading.  Empty when there is none or no dominant component.

    Examples
    --------
    >>> import numpy as np
    >>> from wedgepath.signals.verdicts import antiphase_channels
    >>> t = np.arange(500) / 20
    >>> X = np.column_stack([np.sin(t), np.sin(t - 0.2), -np.sin(t - 0.4)])
    >>> [nm for nm, _ in antiphase_channels(X)]
    ['2']
    """
    Y, data, ramp = _base(X, times, names)
    return _antiphase_core(_line_removed(Y, ramp), data.labels, min_share)


def _antiphase_core(Y, labels, min_share=0.4):
    sd = Y.std(axis=0)
    keep = np.flatnonzero(sd > 0)
    if keep.size < 2:
        return []
    C = ((Y.T @ Y) / Y.shape[0])[np.ix_(keep, keep)] / np.outer(sd[keep], sd[keep])
    w, V = np.linalg.eigh(C)
    v = V[:, -1]
    if w[-1] / w.sum() < min_share or w[-1] < 2 * w[-2]:
        # no dominant common factor; or two of equal weight -- channels spread round a
        # cycle (a ring), where opposite signs are positions, not anti-phase
        return []
    if np.sum(np.sign(v)) < 0 or (np.sum(np.sign(v)) == 0 and v.sum() < 0):
        v = -v
    load = v * np.sqrt(v.size)
    out = [(labels[keep[k]], float(load[k])) for k in range(v.size) if load[k] < -0.2]
    return sorted(out, key=lambda p: p[1])


# --------------------------------------------------------------------------- chain or ring
def structure_kind(order, *, min_modulus=0.2) -> str:
    """``"chain"`` or ``"ring"``: do the channels fill the cycle or sit on an arc?

    Channels (with modulus at least ``min_modulus``) whose points in the
    plane of the leading cycle all lie in an open half-plane -- a gap of
    more than pi between consecutive positions -- form a chain: there is a
    first channel (the leader) and a last one.  Otherwise they go round the
    whole cycle (a ring) and "leader" means nothing.  Lying in a half-plane
    is kept by every invertible linear map of the plane, so the answer does
    not depend on what the area matrix cannot identify (the positions'
    spacing).

    Parameters
    ----------
    order : CyclicOrder

    Returns
    -------
    str

    Examples
    --------
    >>> import numpy as np
    >>> import wedgepath as wp
    >>> t = 2 * np.pi * np.arange(400) / 100
    >>> chain = np.column_stack([np.sin(t - d) for d in (0, 0.5, 1.0, 1.5)])
    >>> ring = np.column_stack([np.sin(t - d) for d in np.arange(6) * np.pi / 3])
    >>> [structure_kind(wp.cyclic_order(wp.area_matrix(X))) for X in (chain, ring)]
    ['chain', 'ring']
    """
    pos = np.asarray(order.positions)[np.asarray(order.moduli) >= min_modulus]
    if pos.size < 3:
        return "chain"
    p = np.sort(np.mod(pos, 2 * np.pi))
    gaps = np.diff(np.concatenate((p, [p[0] + 2 * np.pi])))
    return "chain" if gaps.max() > np.pi else "ring"
