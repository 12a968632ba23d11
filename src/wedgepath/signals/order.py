"""Cyclic order of channels from the leading eigenvector of the area matrix."""

from __future__ import annotations

import numpy as np

from .._validation import as_float_array
from .areas import AreaMatrix

__all__ = ["cyclic_order", "CyclicOrder"]

_TWO_PI = 2.0 * np.pi


class CyclicOrder:
    """Result of :func:`cyclic_order`.

    Attributes
    ----------
    order : ndarray of int
        Channel indices listed so that each leads the next, cyclically (the
        last leads the first).  Starts at the reference channel.
    phases : ndarray of float, shape (n,)
        Each channel's phase delay in radians behind the reference channel,
        in [0, 2 pi), indexed by channel (``phases[order]`` is increasing).
    fit : float
        Share of ``||A||_F^2`` explained by the leading eigenvalue pair, in
        (0, 1].  Near 1: one cycle explains the lead-lag pattern; small: the
        order is not meaningful.
    moduli : ndarray of float, shape (n,)
        ``|v_k|`` of the leading eigenvector, scaled so the largest is 1:
        how strongly each channel takes part in the cycle.  Phases of
        channels with small moduli are unreliable.
    eigenvalues : ndarray of float
        The ``lambda_k >= 0`` of the eigenvalue pairs ``+- i lambda_k`` of A,
        in decreasing order (``floor(n/2)`` of them).
    names : tuple of str or None
        Channel names when A carried them.
    """

    __slots__ = ("order", "phases", "fit", "moduli", "eigenvalues", "names")

    def __init__(self, order, phases, fit, moduli, eigenvalues, names):
        self.order = order
        self.phases = phases
        self.fit = fit
        self.moduli = moduli
        self.eigenvalues = eigenvalues
        self.names = names

    @property
    def ordered_names(self):
        """Channel names in cyclic order (None without names)."""
        return None if self.names is None else [self.names[k] for k in self.order]

    def __repr__(self):
        who = self.ordered_names if self.names is not None else self.order.tolist()
        return f"CyclicOrder(order={who}, fit={self.fit:.3f})"


def cyclic_order(A, *, start=None) -> CyclicOrder:
    """Order channels around the cycle that best explains a skew-symmetric lead matrix.

    The chain-of-offsets model (Baryshnikov & Schlafly, "Cyclicity in
    multivariate time series and applications to functional MRI data",
    IEEE CDC 2016) takes every channel to follow one periodic motion with its
    own delay, ``x_k(t) = a_k f(t - alpha_k)``.  Its area matrix is then close
    to ``A[i, j] = c a_i a_j sin(alpha_j - alpha_i)``, of rank 2, whose
    eigenvector for the eigenvalue ``+i lambda`` (lambda > 0, the largest)
    is ``v_k ~ a_k exp(i alpha_k)``.  The arguments of ``v`` recover the
    delays; sorting them gives the order in which the channels move.

    Parameters
    ----------
    A : array_like (n, n) or AreaMatrix
        Skew-symmetric lead matrix, e.g. from :func:`area_matrix` (any
        normalisation: the order does not depend on it, the fit hardly).
    start : int or str, optional
        Channel to start the order at (phase 0).  Default: the channel taking
        part most strongly (largest modulus).

    Returns
    -------
    CyclicOrder
        ``.order``, ``.phases``, ``.fit``, ``.moduli``, ``.eigenvalues``.

    Notes
    -----
    ``fit`` is the squared-Frobenius share of the leading pair,
    ``lambda_1^2 / sum_k lambda_k^2``.  With two channels it is always 1 and
    the phases are 0 and pi/2 whatever the true lag (the sign of ``A[0, 1]``
    is all the information there is).  Near-equal leading eigenvalues mean
    two cycles compete and the order is not stable.

    Examples
    --------
    Three sinusoids, each a third of a cycle behind the previous one,
    given in scrambled column order:

    >>> import numpy as np
    >>> import wedgepath as wp
    >>> t = 2 * np.pi * np.arange(300) / 100
    >>> X = np.column_stack([np.sin(t - 2 * np.pi / 3), np.sin(t), np.sin(t - 4 * np.pi / 3)])
    >>> res = wp.cyclic_order(wp.area_matrix(X), start=1)
    >>> res.order.tolist()
    [1, 0, 2]
    >>> np.round(np.degrees(res.phases), 6).tolist()
    [120.0, 0.0, 240.0]
    >>> round(res.fit, 12)
    1.0
    """
    names = None
    if isinstance(A, AreaMatrix):
        names = A.names
        M = np.array(A.values, dtype=np.float64)
    else:
        M = as_float_array(A, "A", ndim=2, allow_nan=True)
    n = M.shape[0]
    if M.shape != (n, n):
        raise ValueError(f"A must be a square matrix, got shape {M.shape}")
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
    # iA is Hermitian; A v = i lambda v  <=>  (iA) v = -lambda v
    w, V = np.linalg.eigh(1j * M)
    with np.errstate(over="ignore"):
        lam = np.sort(np.abs(w))[::-1][::2][: n // 2] * scale
    if not np.isfinite(lam).all():
        raise ValueError("cyclic_order: the eigenvalues of A overflow float64; rescale A")
    v = V[:, 0]
    total = float(np.sum(M * M))
    fit = float(2.0 * w[0] ** 2 / total)
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
    phases = np.mod(ang - ang[ref], _TWO_PI)
    phases[ref] = 0.0
    # sort by phase, starting at the reference channel
    order = np.argsort(phases, kind="stable")
    if order[0] != ref:  # ties at phase 0: put the reference first
        order = np.concatenate(([ref], order[order != ref]))
    return CyclicOrder(order.astype(np.intp), phases, min(fit, 1.0), mod, lam, names)
