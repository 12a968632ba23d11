"""The pair table: one row per pair of channels, with direction, significance and interval."""

from __future__ import annotations

import numpy as np

from .._results import default_names, pair_index
from .areas import AreaMatrix
from .significance import BootstrapResult, SurrogateResult

__all__ = ["pair_table", "PAIR_TABLE_COLUMNS"]

#: the columns of :func:`pair_table`, in order
PAIR_TABLE_COLUMNS = ("channel_i", "channel_j", "area", "normalized", "direction", "p", "q",
                      "low", "high")


def _check_partner(res, what, A):
    if res is None:
        return
    cls = SurrogateResult if what == "significance" else BootstrapResult
    if not isinstance(res, cls):
        raise TypeError(f"{what} must be a {cls.__name__} (from "
                        f"{'surrogate_test' if what == 'significance' else 'bootstrap_area'}), "
                        f"got {type(res).__name__}")
    unnamed = default_names(len(res.names))
    same = tuple(res.names) == tuple(A.names) or (
        len(res.names) == len(A.names) and unnamed in (tuple(res.names), tuple(A.names)))
    if not same:   # unnamed channels ("0", "1", ...) match any names of the same number
        raise ValueError(f"{what} is for channels {list(res.names)}, the area matrix for "
                         f"{list(A.names)}")
    if A.closure != res.closure:
        raise ValueError(f"{what} is for {res.closure}-closed areas but the area matrix was "
                         f"computed with closure={A.closure!r}; compute it with "
                         f"closure={res.closure!r}")


def pair_table(A, *, significance=None, bootstrap=None):
    """One row per pair of channels: area, normalised value, direction, p, q and interval.

    The table to paste into a paper.  Columns, in order:

    ``channel_i``, ``channel_j``
        The pair (``i < j`` in the matrix's channel order).
    ``area``
        The raw area ``A[i, j]`` (NaN where it is not known: a normalised
        matrix whose raw areas overflowed).
    ``normalized``
        The normalised value (NaN when ``A`` is not normalised).
    ``direction``
        ``"i leads j"`` when the value is positive, ``"j leads i"`` when it
        is negative, ``"none"`` when it is zero or NaN (the sign convention:
        ``A[i, j] > 0`` means channel i leads channel j).
    ``p``, ``q``
        Surrogate p-value and its Benjamini-Hochberg q-value, from
        ``significance`` (NaN without it).
    ``low``, ``high``
        Bootstrap confidence interval of the area, from ``bootstrap`` (NaN
        without it; its level is ``bootstrap.confidence``).

    Rows are ordered by ``|normalized|`` (by ``|area|`` when ``A`` is not
    normalised), largest first, NaN last.

    Parameters
    ----------
    A : AreaMatrix or array_like (n, n)
        From :func:`area_matrix` (a plain array gets the names ``"0", "1",
        ...``).
    significance : SurrogateResult, optional
        From :func:`surrogate_test` on the same channels.
    bootstrap : BootstrapResult, optional
        From :func:`bootstrap_area` on the same channels.

    Returns
    -------
    pandas.DataFrame

    Raises
    ------
    ValueError
        The results are for other channels (other names, or another number
        of channels; results without names, ``"0", "1", ...``, match any
        names), or ``A`` was computed with a closure other than ``"chord"``
        (the closure of the surrogate test and of the bootstrap).

    Examples
    --------
    >>> import numpy as np
    >>> import wedgepath as wp
    >>> t = 2 * np.pi * np.arange(400) / 100
    >>> X = {"early": np.sin(t), "mid": 2 * np.sin(t - 1.0), "late": np.sin(t - 2.5)}
    >>> wp.pair_table(wp.area_matrix(X, normalize="hilbert")).round(3)
      channel_i channel_j    area  normalized  direction   p   q  low  high
    0       mid      late  25.053       0.997  i leads j NaN NaN  NaN   NaN
    1     early       mid  21.135       0.841  i leads j NaN NaN  NaN   NaN
    2     early      late   7.516       0.598  i leads j NaN NaN  NaN   NaN

    (For sines of one frequency the Hilbert-normalised value is the sine of
    the phase lead: sin 1.5 = 0.997, sin 1 = 0.841, sin 2.5 = 0.598.)
    """
    import pandas as pd

    if not isinstance(A, AreaMatrix):
        from .._validation import as_float_array

        M = as_float_array(A, "A", ndim=2, allow_nan=True)
        if M.shape[0] != M.shape[1]:
            raise ValueError(f"A must be a square matrix, got shape {M.shape}")
        A = AreaMatrix(values=M, names=default_names(M.shape[0]))
    _check_partner(significance, "significance", A)
    _check_partner(bootstrap, "bootstrap", A)
    iu, ju = pair_index(len(A.names))
    m = iu.size
    nan = np.full(m, np.nan)
    if A.normalize is None:
        area, normalized = A.values[iu, ju], nan
        key = area
    else:
        area = A.raw[iu, ju] if A.raw is not None else nan
        normalized = A.values[iu, ju]
        key = normalized
    direction = np.where(key > 0, "i leads j", np.where(key < 0, "j leads i", "none"))
    p = significance.pvalues[iu, ju] if significance is not None else nan
    q = significance.qvalues[iu, ju] if significance is not None else nan
    low = bootstrap.low[iu, ju] if bootstrap is not None else nan
    high = bootstrap.high[iu, ju] if bootstrap is not None else nan
    names = np.array(A.names, dtype=object)
    frame = pd.DataFrame({"channel_i": names[iu], "channel_j": names[ju], "area": area,
                          "normalized": normalized, "direction": direction, "p": p, "q": q,
                          "low": low, "high": high}, columns=list(PAIR_TABLE_COLUMNS))
    mag = np.abs(key)
    order = np.lexsort((np.arange(m), -np.nan_to_num(mag, nan=-1.0)))
    return frame.iloc[order].reset_index(drop=True)
