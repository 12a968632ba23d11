"""Cyclic order of channels from the leading eigenvector of the area matrix.

What the area matrix can say about the channels' timing is limited: it fixes
the plane of the leading cycle and its orientation, but only up to an
area-preserving linear map of that plane.  The *cyclic order* of the channels
survives every such map; their angles in the plane (``positions``) do not, so
they are positions in the cycle, not delays (see ``docs/theory.md``, section
"Cyclic order").
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from .._results import Result, default_names, fmt_names, fmt_number
from .._validation import as_float_array, as_int, check_names
from .areas import AreaMatrix

__all__ = ["cyclic_order", "CyclicOrder", "noise_fit_baseline"]

_TWO_PI = 2.0 * np.pi
#: up to this many channels every eigenvalue is computed (dense Hermitian
#: solver); beyond it only the leading one, by Lanczos iteration
DENSE_MAX = 256
#: number of leading eigenvalues computed beyond DENSE_MAX (each further one is
#: costly: it lies in the bulk of the spectrum, where Lanczos converges slowly)
N_LEADING = 1


@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class CyclicOrder(Result):
    """Result of :func:`cyclic_order`.

    Attributes
    ----------
    order : ndarray of int
        Channel indices listed so that each leads the next, cyclically (the
        last leads the first).  Starts at the reference channel.  This is
        what the area matrix identifies.
    positions : ndarray of float, shape (n,)
        Each channel's position in the cycle, in radians in [0, 2 pi),
        measured from the reference channel and indexed by channel
        (``positions[order]`` is increasing).  Positions are *not* delays:
        the area matrix fixes the plane of the cycle only up to an
        area-preserving linear map, which keeps the order of the positions
        but not their spacing (noise-free sines delayed by 0, 0.3 and 0.6 rad
        get positions 0, 0.894 and 1.788).  They equal the delays only in
        special cases (e.g. equal amplitudes, delays evenly spaced round the
        whole cycle).
    fit : float
        Share of ``||A||_F^2`` explained by the leading eigenvalue pair, in
        (0, 1].  Always 1 for two and for three channels (every skew-symmetric
        matrix of size 2 or 3 has rank 2); for more channels, near 1 means one
        cycle explains the lead-lag pattern.  Compare it with
        :func:`noise_fit_baseline`.
    fit_pvalue : float or None
        P-value of the leading cycle against channels that keep their own
        spectra and have no timing between them (:func:`fit_test`, phase
        surrogates): small means the cycle is above noise.  Computed when
        :func:`cyclic_order` is given the samples (``data=``); None
        otherwise.
    moduli : ndarray of float, shape (n,)
        ``|v_k|`` of the leading eigenvector, scaled so the largest is 1:
        how strongly each channel takes part in the cycle.  Positions of
        channels with small moduli are unreliable.
    eigenvalues : ndarray of float
        The ``lambda_k >= 0`` of the eigenvalue pairs ``+- i lambda_k`` of A,
        in decreasing order: all ``floor(n/2)`` of them for up to
        ``DENSE_MAX`` (256) channels; beyond, only the leading one
        (``N_LEADING``), which is all that ``.fit`` needs.
    names : tuple of str
        Channel names (those of the AreaMatrix, or ``"0", "1", ...``).
    closure, normalize : str or None
        Conventions of the area matrix the order was computed from (None
        when it was given as a plain array).
    units : None
        Positions are in radians, fit and moduli dimensionless.

    ``to_frame()`` has one row per channel in cycle order, columns ``rank``
    (0 for the reference channel), ``channel``, ``position_rad`` and
    ``modulus``.
    """

    order: np.ndarray
    positions: np.ndarray
    fit: float
    moduli: np.ndarray
    eigenvalues: np.ndarray
    names: tuple
    fit_pvalue: float | None = None
    closure: str | None = None
    normalize: str | None = None
    units: Mapping | None = None

    @property
    def ordered_names(self) -> tuple:
        """Channel names in cyclic order."""
        return tuple(self.names[k] for k in self.order)

    def to_frame(self):
        """One row per channel in cycle order: ``rank, channel, position_rad, modulus``."""
        import pandas as pd

        o = np.asarray(self.order)
        return pd.DataFrame({"rank": np.arange(o.size), "channel": list(self.ordered_names),
                             "position_rad": self.positions[o], "modulus": self.moduli[o]})

    def _summary_items(self):
        pv = [] if self.fit_pvalue is None else [("fit_pvalue", fmt_number(self.fit_pvalue, 3))]
        shown = ", ".join(f"{p:.3g}" for p in self.positions[np.asarray(self.order)][:8])
        more = ", ..." if len(self.order) > 8 else ""
        return [("order", fmt_names(self.ordered_names, 8)), ("fit", fmt_number(self.fit, 3)),
                *pv, ("positions_rad", f"[{shown}{more}]")]


def _leading_pair(M):
    """Leading eigenvector ``v`` (``M v = i lambda_1 v``), the leading lambdas, of skew M.

    Small matrices: the dense Hermitian solver on ``iM`` (all eigenvalues).
    Large ones: ``S = M^T M = -M^2`` is symmetric positive semi-definite with
    every ``lambda_k^2`` twice; Lanczos iteration (ARPACK, through
    :func:`scipy.sparse.linalg.eigsh`) on the operator ``x -> M^T (M x)``
    (two matrix-vector products, ``S`` is never formed) finds the leading
    ones.  A unit vector ``e1`` of the leading eigenspace of S and
    ``e2 = -M e1 / lambda_1`` give ``M (e1 + i e2) = i lambda_1 (e1 + i e2)``.
    """
    n = M.shape[0]
    if n <= DENSE_MAX:
        w, V = np.linalg.eigh(1j * M)        # iM v = -lambda v  <=>  M v = i lambda v
        lam = np.sort(np.abs(w))[::-1][::2][: n // 2]
        return V[:, 0], lam, float(w[0] ** 2)
    from scipy.sparse.linalg import ArpackNoConvergence, LinearOperator, eigsh

    k = 2 * min(N_LEADING, n // 2)
    op = LinearOperator((n, n), matvec=lambda x: M.T @ (M @ x), dtype=np.float64)
    v0 = np.random.default_rng(0).standard_normal(n)   # fixed start: reproducible
    try:
        w, E = eigsh(op, k=k, which="LA", v0=v0)
    except ArpackNoConvergence:                         # rare: fall back to a dense solver
        import scipy.linalg

        w, E = scipy.linalg.eigh(M.T @ M, subset_by_index=[n - k, n - 1])
    idx = np.argsort(w)[::-1]
    w, E = np.maximum(w[idx], 0.0), E[:, idx]
    lam1 = float(np.sqrt(w[0]))
    e1 = E[:, 0]
    e2 = -(M @ e1) / lam1
    return e1 + 1j * e2, np.sqrt(w[::2]), lam1 * lam1


def noise_fit_baseline(n, *, n_draws=200, seed=0) -> float:
    """Typical ``fit`` of :func:`cyclic_order` for n channels without a common cycle.

    The median fit of skew-symmetric matrices with independent standard
    normal entries above the diagonal, the area matrix of independent,
    identically distributed channels in the large-sample limit.  Bounded in
    time and memory at any n:

    * n <= 3: 1.0 exactly (every skew-symmetric matrix of size 2 or 3 has
      rank 2, so the fit is always 1: the fit says nothing for n <= 3);
    * 4 <= n <= 64: the median over ``n_draws`` seeded simulated matrices,
      computed in batches (at most ``n_draws * 64**2`` numbers at once);
    * n > 64: the large-n approximation ``2 lambda_1^2 / ||A||_F^2`` with
      ``||A||_F^2 = n (n - 1)`` and ``lambda_1 = 2 sqrt(n) - 1.80 n^(-1/6)``
      (the edge of the semicircle law plus the median of its Tracy-Widom
      (beta = 2) fluctuation, -1.80 from memory; checked against simulation
      within 2 % for n = 48 to 256 in ``tests/test_signals_stats.py``).

    A data set's fit well above this value suggests a common cycle.  The
    baseline assumes independent, identically distributed area entries; it
    is not calibrated for channels of very different scales or strong
    autocorrelation.

    Parameters
    ----------
    n : int
        Number of channels (>= 2).
    n_draws : int
        Simulated matrices (4 <= n <= 64).
    seed : int
        Seed of the simulation (the baseline is reproducible).

    Returns
    -------
    float

    Examples
    --------
    >>> from wedgepath.signals import noise_fit_baseline
    >>> noise_fit_baseline(3)
    1.0
    >>> round(noise_fit_baseline(16), 2), round(noise_fit_baseline(1000), 4)
    (0.37, 0.0079)
    """
    n = as_int(n, "n")
    draws = as_int(n_draws, "n_draws")
    if n < 2:
        raise ValueError(f"n must be at least 2 channels, got {n}")
    if draws < 1:
        raise ValueError(f"n_draws must be at least 1, got {draws}")
    if n <= 3:
        return 1.0
    if n > 64:
        lam1 = 2.0 * np.sqrt(n) - 1.80 * n ** (-1.0 / 6.0)
        return float(2.0 * lam1 * lam1 / (n * (n - 1.0)))
    rng = np.random.default_rng(seed)
    fits = np.empty(draws)
    batch = 50
    for b0 in range(0, draws, batch):
        b1 = min(draws, b0 + batch)
        G = rng.standard_normal((b1 - b0, n, n))
        M = np.triu(G, 1)
        M = M - np.swapaxes(M, 1, 2)
        lam = np.linalg.eigvalsh(1j * M)  # eigenvalues +-lambda_k of the Hermitian i*M
        fits[b0:b1] = 2 * lam[:, -1] ** 2 / (lam ** 2).sum(axis=1)
    return float(np.median(fits))


def cyclic_order(A, *, start=None, names=None, data=None, times=None, n_surrogates=199,
                 seed=0) -> CyclicOrder:
    """Order channels around the cycle that best explains a skew-symmetric lead matrix.

    The chain-of-offsets model (Baryshnikov & Schlafly, "Cyclicity in
    multivariate time series and applications to functional MRI data",
    IEEE CDC 2016) takes every channel to follow one periodic motion with its
    own delay, ``x_k(t) = a_k f(t - alpha_k)``.  Its area matrix is then close
    to ``A[i, j] = c a_i a_j sin(alpha_j - alpha_i)``, of rank 2, and the
    eigenvector ``v`` for the eigenvalue ``+i lambda`` (lambda > 0, the
    largest) spans the plane of the cycle.  Sorting the arguments of ``v``
    gives the order in which the channels move.

    What this can and cannot say: ``A`` determines that plane and its
    orientation, but only up to an area-preserving linear map of it (any
    two curves whose coordinates differ by such a map have the same area
    matrix).  Such a map keeps the cyclic order of the channels, so
    ``.order`` is identified; it changes the angles, so ``.positions`` are
    positions in the cycle, not delays (delays in time units need another
    method).

    Parameters
    ----------
    A : array_like (n, n) or AreaMatrix
        Skew-symmetric lead matrix, e.g. from :func:`area_matrix` (any
        normalisation: the order does not depend on it, the fit hardly).
    start : int or str, optional
        Channel to start the order at (position 0).  Default: the channel
        taking part most strongly (largest modulus).
    names : sequence of str, optional
        Channel names for a plain array ``A`` (an AreaMatrix brings its
        own); default ``"0", "1", ...``.
    data : array_like (T, n), DataFrame or Path, optional
        The samples ``A`` was computed from.  When given, ``fit_pvalue`` is
        computed by :func:`fit_test` (``n_surrogates`` phase surrogates,
        ``seed``, the drift removed; ``times`` as for :func:`area_matrix`).

    Returns
    -------
    CyclicOrder
        ``.order``, ``.positions`` (radians), ``.fit``, ``.moduli``,
        ``.eigenvalues``, ``.names``; ``.to_frame()`` lists the channels in
        cycle order.

    Notes
    -----
    ``fit`` is the squared-Frobenius share of the leading pair,
    ``lambda_1^2 / sum_k lambda_k^2``.  It is always 1 for n = 2 and n = 3
    (a skew-symmetric matrix of size 2 or 3 has rank 2), so it carries no
    information there.  With two channels the positions are 0 and pi/2
    whatever the true lag (the sign of ``A[0, 1]`` is all the information
    there is).  Near-equal leading eigenvalues mean two cycles compete and
    the order is not stable.

    Cost: up to ``DENSE_MAX`` (256) channels, a dense Hermitian eigensolver
    (all eigenvalues); beyond, only the leading eigenvalue pair, by Lanczos
    iteration on ``A^T A`` (matrix-vector products only: ``O(n^2)`` per
    iteration, no ``O(n^3)`` reduction), and ``||A||_F``.  Lanczos converges
    fast when one cycle stands out and slowly for patternless (noise-like)
    matrices, whose leading eigenvalues crowd together.
    ``benchmarks/bench_signals.py`` compares it with a full eigensolver.

    Examples
    --------
    Three sinusoids, each a third of a cycle behind the previous one,
    given in scrambled column order (evenly spaced, equal amplitudes: here
    the positions do equal the delays):

    >>> import numpy as np
    >>> import wedgepath as wp
    >>> t = 2 * np.pi * np.arange(300) / 100
    >>> X = np.column_stack([np.sin(t - 2 * np.pi / 3), np.sin(t), np.sin(t - 4 * np.pi / 3)])
    >>> res = wp.cyclic_order(wp.area_matrix(X), start=1)
    >>> res.order.tolist()
    [1, 0, 2]
    >>> np.round(np.degrees(res.positions), 6).tolist()
    [120.0, 0.0, 240.0]
    >>> round(res.fit, 12)
    1.0

    Delays of 0, 0.3 and 0.6 rad: the order is right, the spacing is not
    that of the delays:

    >>> X = np.column_stack([np.sin(t), np.sin(t - 0.3), np.sin(t - 0.6)])
    >>> res = wp.cyclic_order(wp.area_matrix(X), start=0)
    >>> res.order.tolist(), np.round(res.positions, 3).tolist()
    ([0, 1, 2], [0.0, 0.894, 1.788])

    With the samples, the order comes with a calibrated p-value
    (:func:`fit_test`); independent noise gives no cycle:

    >>> X = np.random.default_rng(3).standard_normal((500, 5))
    >>> res = wp.cyclic_order(wp.area_matrix(X), data=X)
    >>> res.fit_pvalue > 0.05
    True
    """
    closure = normalize = None
    if isinstance(A, AreaMatrix):
        if names is not None and tuple(names) != A.names:
            raise ValueError(f"names {list(names)} do not match the AreaMatrix's names "
                             f"{list(A.names)}")
        names, closure, normalize = A.names, A.closure, A.normalize
        M = np.array(A.values, dtype=np.float64)
    else:
        M = as_float_array(A, "A", ndim=2, allow_nan=True)
    n = M.shape[0]
    if M.shape != (n, n):
        raise ValueError(f"A must be a square matrix, got shape {M.shape}")
    if names is not None:
        names = check_names(names, n)
    if n < 2:
        raise ValueError(f"A has {n} channel(s); a cyclic order needs at least 2")
    if np.isnan(M).any():
        k = int(np.argwhere(np.isnan(M))[0][0])
        who = repr(names[k]) if names is not None else str(k)
        raise ValueError(f"A contains NaN (channel {who}; e.g. a constant channel after "
                         "normalisation); drop that channel first")
    scale = float(np.max(np.abs(M)))
    if scale == 0.0:
        raise ValueError("A is zero: no channel leads another, so there is no cyclic order")
    # Work with A / max|A| (the order, phases and fit do not depend on the
    # scale), so that squares of the entries neither overflow nor underflow.
    M = M / scale
    asym = float(np.max(np.abs(M + M.T)))
    if asym > 1e-8:
        raise ValueError(f"A is not skew-symmetric (max |A + A^T| = {asym * scale:.3g}, "
                         f"max |A| = {scale:.3g})")
    M = 0.5 * (M - M.T)
    v, lam, top = _leading_pair(M)
    with np.errstate(over="ignore"):
        lam = lam * scale
    if not np.isfinite(lam).all():
        raise ValueError("cyclic_order: the eigenvalues of A overflow float64; rescale A")
    total = float(np.sum(M * M))
    fit = float(2.0 * top / total)
    mod = np.abs(v)
    mod = mod / mod.max()
    if start is None:
        ref = int(np.argmax(mod))
    elif isinstance(start, str):
        if names is None:
            raise ValueError(f"start={start!r} given by name but A has no channel names")
        if start not in names:
            raise ValueError(f"unknown channel {start!r}; channels are {list(names)}")
        ref = names.index(start)
    else:
        if isinstance(start, (bool, np.bool_)) or not isinstance(start, (int, np.integer)):
            raise TypeError(f"start must be a channel index or name, got {start!r}")
        ref = int(start)
        if not -n <= ref < n:
            raise ValueError(f"start={ref} is out of range for {n} channels")
        ref %= n
    ang = np.angle(v)
    positions = np.mod(ang - ang[ref], _TWO_PI)
    positions[ref] = 0.0
    # sort by position, starting at the reference channel
    order = np.argsort(positions, kind="stable")
    if order[0] != ref:  # ties at position 0: put the reference first
        order = np.concatenate(([ref], order[order != ref]))
    pvalue = None
    if data is not None:
        from .verdicts import fit_test

        test = fit_test(data, times=times, n_surrogates=n_surrogates, seed=seed)
        if len(test.names) != n:
            raise ValueError(f"data has {len(test.names)} channels but A has {n}")
        pvalue = test.pvalue
    return CyclicOrder(order=order.astype(np.intp), positions=positions, fit=min(fit, 1.0),
                       moduli=mod, eigenvalues=lam, names=names or default_names(n),
                       closure=closure, normalize=normalize, fit_pvalue=pvalue)
