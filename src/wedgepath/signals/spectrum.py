"""Lead and lag by frequency: an exact split of the area matrix over DFT frequencies.

For a closed loop of ``N`` samples ``x_0 .. x_{N-1}`` (the chord from
``x_{N-1}`` back to ``x_0`` closes it) with discrete Fourier coefficients
``X_m = sum_k x_k exp(-2 pi i k m / N)``, the chord-closed area of channels
i and j is exactly::

    A[i, j] = (2/N) sum_{0 < m < N/2} sin(2 pi m / N) Im(X_i[m] conj(X_j[m]))

(derivation, sign, gaps, closures and the continuous analogue in
``docs/theory.md``, "Lead and lag by frequency").  Each term belongs to the
frequency ``m / (N h)``, ``h`` the sampling step, so grouping the terms by
band splits the area matrix into band matrices that add up to it.

:func:`lead_spectrum` computes the band matrices, :func:`band_surrogate_test`
tests them against surrogates (with a false discovery rate adjustment over
pairs and bands) and :func:`rolling_lead_spectrum` follows them over sliding
windows.
"""

from __future__ import annotations

import math
import numbers
import warnings
from collections.abc import Mapping
from dataclasses import dataclass
from typing import ClassVar

import numpy as np

from .._bars import check_progress, progress_bar
from .._results import ArrayResult, Result, fmt_names, fmt_number, pair_index
from .._scaling import pow2_scale
from .._validation import as_int, as_rng, check_choice
from ._kernel import (channel_exponents, check_closure, closed_area, piece_extent, piece_rows,
                      scaled_data, signal_input)

__all__ = ["lead_spectrum", "LeadSpectrum", "band_surrogate_test", "BandSignificance",
           "rolling_lead_spectrum", "RollingSpectrum", "ResamplingWarning", "IRREGULAR_METHODS"]

#: Accepted values of ``irregular=`` in :func:`lead_spectrum`.
IRREGULAR_METHODS = ("resample", "index")

# largest per-bin output (doubles) made when bands=None
_MAX_BIN_OUTPUT = 1 << 25
# channels transformed at once: the float64 working copy of one block of channels.  At
# least 8 channels (a 64-byte cache line of a row) per block: narrower blocks make every
# block re-read whole rows of the input, and the copies, not the FFTs, dominate
_FFT_BLOCK_ELEMENTS = 1 << 23
_FFT_MIN_CHANNELS = 8
# rows per block of the transposing copy
_TRANSPOSE_ROWS = 4096
# sampling steps that differ by less than this (relative) count as regular
_REGULAR_RTOL = 1e-6
# band areas below this may come from underflowing products: recheck the magnitudes
_TINY = 2.0 ** -800
# relative resampling error above which a warning is issued
_RESAMPLE_WARN = 1e-2


class _NotFinite(Exception):
    """Internal: the fast path met a NaN or infinite sample."""


class ResamplingWarning(UserWarning):
    """The regular resampling of irregular times changed the areas noticeably."""


# --------------------------------------------------------------------------- result
@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class LeadSpectrum(ArrayResult):
    """Area matrices by frequency band: :func:`lead_spectrum`.

    Array-like: ``np.asarray(s)`` (or ``s.areas``) is the (B, n, n) array of
    band areas, ``s[b]`` the matrix of band ``b``.

    Attributes
    ----------
    areas : ndarray, shape (B, n, n)
        Skew-symmetric area matrix of each band (raw areas, units of
        ``x_i`` times ``x_j``).  ``areas.sum(axis=0) + rest`` is the area
        matrix of :func:`area_matrix` with the same closure (to rounding;
        for irregular times resampled, plus ``resampling_error``).
    bands : ndarray, shape (B, 2)
        Lower and upper edge of each band, in cycles per unit of the time
        axis (cycles per sample without times).  A band holds the
        frequencies ``low <= f < high`` (the last band of a contiguous set
        also its upper edge).
    band_names : tuple of str
    normalized : ndarray, shape (B, n, n)
        ``areas[b, i, j] / sqrt(E[b, i] E[b, j])``, ``E = energy``: in
        [-1, 1], equal to ``sin(phi)`` for two sinusoids of one frequency in
        the band with phase lead ``phi``; NaN where a channel has no energy
        in the band.  Comparable across bands.
    energy : ndarray, shape (B, n)
        Each channel's Hilbert energy in the band (its area against its own
        discrete Hilbert transform restricted to the band; see
        :func:`hilbert_energy`).
    rest : ndarray, shape (n, n)
        Area at frequencies outside every band (zero when the bands cover
        0 to the Nyquist frequency).
    resampling_error : ndarray (n, n) or None
        For irregular times resampled (``irregular="resample"``): the area
        matrix of the original samples minus that of the resampled loop (the
        bands add up to the latter).  None when no resampling was done.
    frequency_unit : str
        ``"cycles per sample"``, or ``"cycles per time unit"``.
    irregular : str or None
        How irregular times were handled (None: regular or no times).
    names : tuple of str
    closure : str
    samples : int
    units : mapping or None

    ``to_frame()`` has one row per band and pair ``i < j``: ``band,
    band_name, low, high, i, j, channel_i, channel_j, area, normalized``.
    """

    _array_field: ClassVar[str] = "areas"

    areas: np.ndarray
    bands: np.ndarray
    band_names: tuple
    normalized: np.ndarray
    energy: np.ndarray
    rest: np.ndarray
    names: tuple
    closure: str = "chord"
    frequency_unit: str = "cycles per sample"
    irregular: str | None = None
    resampling_error: np.ndarray | None = None
    samples: int | None = None
    units: Mapping | None = None

    def total(self) -> np.ndarray:
        """``areas.sum(axis=0) + rest``: the area matrix the bands split."""
        return self.areas.sum(axis=0) + self.rest

    def pair(self, i, j) -> np.ndarray:
        """The band areas ``areas[:, i, j]`` of one pair, channels by index or name."""
        return self.areas[:, self._channel(i), self._channel(j)]

    def to_frame(self):
        """One row per band and pair: ``band, band_name, low, high, i, j, ... area, normalized``."""
        import pandas as pd

        B, n = self.areas.shape[0], len(self.names)
        iu, ju = pair_index(n)
        P = iu.size
        b = np.repeat(np.arange(B), P)
        nm = np.array(self.names, dtype=object)
        bn = np.array(self.band_names, dtype=object)
        return pd.DataFrame({
            "band": b, "band_name": bn[b] if B else np.array([], dtype=object),
            "low": self.bands[b, 0], "high": self.bands[b, 1],
            "i": np.tile(iu, B), "j": np.tile(ju, B),
            "channel_i": np.tile(nm[iu], B), "channel_j": np.tile(nm[ju], B),
            "area": self.areas[:, iu, ju].reshape(-1),
            "normalized": self.normalized[:, iu, ju].reshape(-1)})

    def _summary_items(self):
        items = [("bands", str(self.areas.shape[0])), ("names", fmt_names(self.names)),
                 ("closure", repr(self.closure))]
        if self.areas.size:
            v = np.abs(self.areas)
            b, i, j = np.unravel_index(int(np.argmax(v)), v.shape)
            a = self.areas[b, i, j]
            if a != 0:
                i, j = (i, j) if a > 0 else (j, i)
                items.append(("max", f"{fmt_number(abs(a), 4)} ({self.names[i]} leads "
                                     f"{self.names[j]} in {self.band_names[b]})"))
        items.append(("frequency", repr(self.frequency_unit)))
        if self.irregular:
            items.append(("irregular", repr(self.irregular)))
        return items


# --------------------------------------------------------------------------- bands
def _fmt_edge(v):
    return f"{v:.3g}"


def _resolve_bands(bands):
    """``bands`` -> (edges (B, 2) in the caller's order, names, contiguous flag) or None."""
    if bands is None:
        return None
    if isinstance(bands, Mapping):
        if not bands:
            raise ValueError("bands must name at least one band")
        names, edges = [], []
        for k, v in bands.items():
            if not isinstance(k, str):
                raise TypeError(f"band names must be text, got {k!r}")
            try:
                lo, hi = v
                lo, hi = float(lo), float(hi)
            except (TypeError, ValueError):
                raise TypeError(f"band {k!r} must be a pair (low, high) of numbers, got {v!r}") from None
            names.append(k)
            edges.append((lo, hi))
        edges = np.array(edges, dtype=np.float64)
        contiguous = False
    else:
        if isinstance(bands, (str, bytes)):
            raise TypeError("bands must be None, a sequence of edges or a mapping "
                            "name -> (low, high)")
        try:
            e = np.asarray(bands, dtype=np.float64)
        except (TypeError, ValueError):
            raise TypeError("bands must be None, a sequence of edges or a mapping "
                            "name -> (low, high)") from None
        if e.ndim != 1 or e.size < 2:
            raise ValueError(f"bands as edges must be a 1-D sequence of at least 2 frequencies, "
                             f"got shape {e.shape}")
        if not np.all(np.isfinite(e)):
            raise ValueError("band edges must be finite")
        if not np.all(np.diff(e) > 0):
            raise ValueError("band edges must be strictly increasing")
        edges = np.column_stack([e[:-1], e[1:]])
        names = [f"{_fmt_edge(lo)}-{_fmt_edge(hi)}" for lo, hi in edges]
        contiguous = True
    if not np.all(np.isfinite(edges)):
        raise ValueError("band edges must be finite")
    if np.any(edges[:, 0] < 0):
        raise ValueError("band edges must be >= 0 (frequencies of a real signal are not negative)")
    if np.any(edges[:, 1] <= edges[:, 0]):
        k = int(np.flatnonzero(edges[:, 1] <= edges[:, 0])[0])
        raise ValueError(f"band {names[k]!r}: its upper edge must exceed its lower edge")
    order = np.argsort(edges[:, 0], kind="stable")
    se = edges[order]
    if np.any(se[1:, 0] < se[:-1, 1]):
        k = int(np.flatnonzero(se[1:, 0] < se[:-1, 1])[0])
        raise ValueError(f"bands {names[order[k]]!r} and {names[order[k + 1]]!r} overlap; the "
                         "bands of a decomposition must not overlap")
    return edges, tuple(names), contiguous


def _assign(freqs, edges, contiguous):
    """Band index of each frequency (-1: in no band); bands do not overlap.

    A binary search over the sorted lower edges: ``O(M log B)`` for ``M``
    frequencies and ``B`` bands.
    """
    idx = np.full(freqs.shape, -1, dtype=np.int64)
    if not edges.shape[0]:
        return idx
    order = np.argsort(edges[:, 0], kind="stable")
    lo, hi = edges[order, 0], edges[order, 1]
    k = np.searchsorted(lo, freqs, side="right") - 1
    kk = np.maximum(k, 0)
    inside = (k >= 0) & (freqs < hi[kk])
    idx[inside] = order[kk[inside]]
    if contiguous:
        top = float(edges[-1, 1])
        idx[(freqs == top) & (idx < 0)] = edges.shape[0] - 1
    return idx


# --------------------------------------------------------------------------- loops
class _Loop:
    """One closed loop: ``rows(cols)`` gives its samples, ``step`` the time per sample."""

    __slots__ = ("rows", "N", "step")

    def __init__(self, rows, N, step):
        self.rows = rows
        self.N = N
        self.step = step


def _pieces(data):
    """Start and stop rows of the runs of complete rows (NaN rows are gaps)."""
    values = data.values
    T, n = values.shape
    valid = np.empty(T, dtype=bool)
    step = max(1, (1 << 20) // max(n, 1))
    for a in range(0, T, step):
        blk = np.asarray(values[a:a + step], dtype=np.float64)
        if np.isinf(blk).any():
            r, c = (int(v) for v in np.argwhere(np.isinf(blk))[0])
            raise ValueError(f"X contains an infinite value at row {a + r}, channel {c}")
        valid[a:a + step] = ~np.isnan(blk).any(axis=1)
    edges = np.diff(np.concatenate(([0], valid.view(np.int8), [0])))
    starts = np.flatnonzero(edges == 1)
    stops = np.flatnonzero(edges == -1)
    if starts.size == 0:
        raise ValueError("X has no complete sample: every row contains NaN")
    return starts.astype(np.int64), stops.astype(np.int64)


def _regular_step(times):
    """The sampling step when ``times`` are regular (to ``_REGULAR_RTOL``), else None."""
    d = np.diff(times)
    h = float(np.median(d))
    if np.max(np.abs(d - h)) <= _REGULAR_RTOL * h:
        return float((times[-1] - times[0]) / (times.shape[0] - 1))
    return None


def _require_check(data, starts, stops, tol):
    F = piece_rows(data, starts)
    L = piece_rows(data, stops - 1)
    from ._kernel import robust_norm

    gap = robust_norm(L - F)           # no underflow for data of size 1e-200
    tol_eff = (1e-9 * piece_extent(data, starts, stops) if tol is None
               else np.full(gap.shape, float(tol)))
    bad = np.flatnonzero(gap > tol_eff)
    if bad.size:
        p = int(bad[0])
        where = f" (piece starting at row {int(starts[p])})" if starts.size > 1 else ""
        raise ValueError(f"path is not closed{where}: its end is {gap[p]:.6g} from its start "
                         f"(tolerance {tol_eff[p]:.3g}); use closure='chord' or 'detrend', or "
                         "pass a larger tol")


def _make_loops(data, closure, irregular, starts, stops):
    """The closed loops of every piece, and whether they were resampled."""
    values = data.values
    times = data.times
    h = 1.0
    resample = False
    if times is not None:
        reg = _regular_step(times)
        if reg is not None:
            h = reg
        elif irregular == "index":
            h = float((times[-1] - times[0]) / (times.shape[0] - 1))
        else:
            h = float(np.median(np.diff(times)))
            resample = True
    loops = []
    for s, e in zip(starts.tolist(), stops.tolist()):
        cnt = e - s
        if cnt < 2 or (closure in ("detrend", "require") and cnt < 3):
            continue
        drop_last = closure in ("detrend", "require")
        if closure == "detrend":
            tau = times[s:e] if times is not None else np.arange(cnt, dtype=np.float64)
            frac = (tau - tau[0]) / (tau[-1] - tau[0])
        else:
            frac = None

        def rows(cols, s=s, e=e, frac=frac, drop_last=drop_last):
            """The loop's samples of channels ``cols``, channel-major (channels, N).

            Referred to the piece's first sample (the area is translation invariant, and
            offsets never enter the transform), transposed block by block of rows
            (one cache-friendly pass over the input).
            """
            N_out = e - s - 1 if drop_last else e - s
            ref = np.asarray(values[s, cols], dtype=np.float64)
            out = np.empty((ref.shape[0], N_out))
            for a in range(0, N_out, _TRANSPOSE_ROWS):
                b = min(N_out, a + _TRANSPOSE_ROWS)
                np.subtract(values[s + a:s + b, cols].T, ref[:, None], out=out[:, a:b])
            if frac is not None:
                d = np.asarray(values[e - 1, cols], dtype=np.float64) - ref
                out -= d[:, None] * frac[None, :N_out]
            return out

        if not resample:
            loops.append(_Loop(rows, cnt - 1 if drop_last else cnt, h))
            continue
        # irregular times: linear interpolation of the closed polyline onto a regular grid
        t = times[s:e]
        if drop_last:
            span = float(t[-1] - t[0])          # the loop ends where it began
            tv = t
        else:
            span = float(t[-1] - t[0]) + h      # the chord takes one (median) step
            tv = np.concatenate([t, [t[0] + span]])
        K = max(2, int(round(span / h)))
        step = span / K
        grid = t[0] + step * np.arange(K)

        def rows_r(cols, rows=rows, tv=tv, grid=grid):
            x = rows(cols)
            x = np.concatenate([x, x[:, :1]], axis=1)   # the closed polyline's vertices at tv
            out = np.empty((x.shape[0], grid.shape[0]))
            for c in range(x.shape[0]):
                out[c] = np.interp(grid, tv, x[c])
            return out

        loops.append(_Loop(rows_r, K, step))
    return loops, resample, h


# --------------------------------------------------------------------------- kernel
def _loop_spectrum(loop, n):
    """Weighted DFT of the loop as two real arrays ``(R, I)``, each (n, N//2 + 1).

    ``R + iI = s_m X[m]`` with ``s_m = sqrt((2/N) sin(2 pi m/N))``: the area
    terms of a band of bins ``a:c`` are then ``G - G^T``,
    ``G = I[:, a:c] @ R[:, a:c]^T``, one GEMM.  Channel-major, so that each
    channel's transform is one contiguous row; transformed one block of
    channels at a time (the working copy of a block is bounded).
    """
    N = loop.N
    M = N // 2 + 1
    R = np.empty((n, M))
    Im = np.empty((n, M))
    sw = _sqrt_weights(N)
    per = max(_FFT_MIN_CHANNELS, _FFT_BLOCK_ELEMENTS // max(N, 1))
    from scipy import fft as sfft

    for a in range(0, n, per):
        cols = slice(a, min(n, a + per))
        y = loop.rows(cols)                       # (channels, N), referred to its first row
        F = sfft.rfft(y, axis=1, overwrite_x=True, workers=-1)
        del y
        if not np.isfinite(F[:, 0]).all():        # the DC bin is the sum of the samples
            raise _NotFinite                      # a gap (NaN) or an infinite value
        np.multiply(F.real, sw, out=R[cols])
        np.multiply(F.imag, sw, out=Im[cols])
        del F
    return R, Im


def _sqrt_weights(N):
    """``sqrt((2/N) sin(2 pi m / N))`` for the bins ``0 <= m <= N//2`` (0 at DC and Nyquist)."""
    m = np.arange(N // 2 + 1)
    w = np.sin(2.0 * np.pi * m / N)
    w[0] = 0.0
    if N % 2 == 0:
        w[-1] = 0.0
    return np.sqrt(np.maximum(w, 0.0) * (2.0 / N))


def _band_sums(R, Im, idx, out_area, out_energy, rest):
    """Add each bin's area term to its band (idx -1: to ``rest``)."""
    n, M = R.shape
    # bins of one band are contiguous runs (frequencies increase with m)
    change = np.flatnonzero(np.diff(idx)) + 1
    run_starts = np.concatenate(([0], change))
    run_stops = np.concatenate((change, [M]))
    for a, c in zip(run_starts.tolist(), run_stops.tolist()):
        b = int(idx[a])
        Rb, Ib = R[:, a:c], Im[:, a:c]
        G = Ib @ Rb.T
        if b >= 0:
            out_area[b] += G - G.T
            out_energy[b] += np.einsum("ij,ij->i", Rb, Rb) + np.einsum("ij,ij->i", Ib, Ib)
        else:
            rest += G - G.T


def _per_bin(R, Im, idx, out_area, out_energy):
    """Per-bin output (bands=None): bins scattered to their (nearest-frequency) bands."""
    n, M = R.shape
    for a in range(0, M, 512):
        c = min(M, a + 512)
        Rb, Ib = R[:, a:c].T, Im[:, a:c].T
        G = Ib[:, :, None] * Rb[:, None, :]
        np.add.at(out_area, idx[a:c], G - np.swapaxes(G, 1, 2))
        np.add.at(out_energy, idx[a:c], Rb ** 2 + Ib ** 2)


def _spectrum(data, closure, bands, irregular, tol):
    """Band areas of ``data``; see :func:`lead_spectrum`.

    First tried as one piece (no pass over the data to find gaps); a NaN or
    infinite sample makes the transform's channel means non-finite, and the
    work is redone piece by piece.
    """
    T = data.shape[0]
    try:
        return _spectrum_pieces(data, closure, bands, irregular, tol,
                                np.array([0], dtype=np.int64), np.array([T], dtype=np.int64))
    except _NotFinite:
        starts, stops = _pieces(data)
        return _spectrum_pieces(data, closure, bands, irregular, tol, starts, stops)


def _spectrum_pieces(data, closure, bands, irregular, tol, starts, stops):
    T, n = data.shape
    if closure == "require":
        _require_check(data, starts, stops, tol)
    loops, resampled, h = _make_loops(data, closure, irregular, starts, stops)
    spec = _resolve_bands(bands)
    if spec is None:
        Nref = max([lp.N for lp in loops], default=2)
        href = max(loops, key=lambda lp: lp.N).step if loops else h
        df = 1.0 / (Nref * href)
        Mref = Nref // 2 + 1
        if Mref * n * n > _MAX_BIN_OUTPUT:
            raise ValueError(f"bands=None asks for {Mref} frequency bins of {n} x {n} matrices "
                             f"({Mref * n * n * 8 / 2**20:.0f} MiB); pass bands (edges or named "
                             "ranges) to sum the bins by band")
        centres = df * np.arange(Mref)
        edges = np.column_stack([np.maximum(centres - df / 2, 0.0), centres + df / 2])
        names = tuple(_fmt_edge(c) for c in centres)
        per_bin = True
    else:
        edges, names, contiguous = spec
        per_bin = False
    B = edges.shape[0]
    areas = np.zeros((B, n, n))
    energy = np.zeros((B, n))
    rest = np.zeros((n, n))
    for lp in loops:
        R, Im = _loop_spectrum(lp, n)
        freqs = np.arange(R.shape[1]) / (lp.N * lp.step)
        if per_bin:
            idx = np.minimum(np.rint(freqs / df).astype(np.int64), B - 1)
            _per_bin(R, Im, idx, areas, energy)
        else:
            _band_sums(R, Im, _assign(freqs, edges, contiguous), areas, energy, rest)
        del R, Im
    if closure == "none":
        # the open path's area differs from the chord-closed one by the origin-dependent
        # term -(1/2) x_last ^ x_first of each piece: it has no frequency and is booked at 0
        long = (stops - starts) >= 2
        Fr = piece_rows(data, starts[long])
        Lr = piece_rows(data, stops[long] - 1)
        term = -0.5 * (Lr.T @ Fr - Fr.T @ Lr)
        b0 = (np.array([0]) if per_bin else _assign(np.zeros(1), edges, contiguous))[0]
        if b0 >= 0:
            areas[b0] += term
        else:
            rest += term
    return areas, energy, rest, edges, names, resampled


def _normalised(areas, energy):
    with np.errstate(invalid="ignore", divide="ignore"):
        d = np.sqrt(energy[:, :, None] * energy[:, None, :])
        out = np.where(d > 0, areas / np.where(d > 0, d, 1.0), np.nan)
    return out


def lead_spectrum(X, *, times=None, bands=None, closure="chord", names=None, tol=None,
                  irregular="resample") -> LeadSpectrum:
    """Split the area matrix over frequency: which band carries each lead.

    For every piece of the data (a run of complete rows), closed by
    ``closure``, the oriented area of each pair of channels is a sum over
    the discrete Fourier frequencies of the loop::

        A[i, j] = (2/N) sum_{0 < m < N/2} sin(2 pi m / N) Im(X_i[m] conj(X_j[m]))

    (``N`` samples in the loop, ``X`` their DFT; ``docs/theory.md`` derives
    it).  The terms are grouped by band; the band matrices add up to
    :func:`area_matrix` with the same closure, to rounding.  A positive
    ``areas[b, i, j]`` means channel i leads channel j at the frequencies of
    band ``b``.

    Parameters
    ----------
    X : array_like (T, n), DataFrame, Path or mapping
        As for :func:`area_matrix` (NaN rows are gaps: each piece is closed
        and decomposed on its own, over its own frequencies).
    times : array_like (T,), optional
        Sample times.  Frequencies are in cycles per unit of ``times``
        (cycles per sample without them).
    bands : None, sequence of edges, or mapping name -> (low, high)
        ``None``: one band per DFT bin of the longest piece (frequencies
        ``m / (N h)``; other pieces' bins go to the nearest one).  A
        sequence of increasing edges ``[f0, f1, ..., fB]``: the bands
        ``[f0, f1), [f1, f2), ..., [f_{B-1}, fB]``.  A mapping: named bands
        ``{"slow": (0, 0.1), "fast": (0.1, 0.5)}``; they must not overlap.
        Frequencies in no band are summed in ``.rest``.
    closure : {"chord", "none", "detrend", "require"}
        As for :func:`area_matrix`.  ``"detrend"`` and ``"require"``
        decompose the loop of the drift-free samples (the last sample,
        equal to the first, dropped).  ``"none"``: the open path's extra
        term ``-(1/2) x_last ^ x_first`` per piece has no frequency; it is
        counted at frequency 0 (in the band that holds 0, else in ``.rest``).
    names : sequence of str, optional
        Channel names for an array input.
    tol : float, optional
        Tolerance of ``closure="require"``.
    irregular : {"resample", "index"}
        What to do when ``times`` are not regular (steps differing by more
        than 1e-6 relative).  ``"resample"`` (default): each closed loop is
        linearly interpolated onto a regular grid with the median step (the
        chord taking one step); the bands split the area of that loop, and
        ``.resampling_error`` holds the area of the original samples minus
        it (a :class:`ResamplingWarning` when it exceeds 1% of the largest
        area).  ``"index"``: the exact identity on the samples as they are,
        frequencies assigned as if the samples were evenly spaced over the
        recording (exact areas, approximate frequencies).

    Returns
    -------
    LeadSpectrum
        ``.areas`` (B, n, n), ``.bands`` (B, 2) edges, ``.normalized``,
        ``.energy``, ``.rest``; ``.to_frame()`` one row per band and pair.

    Examples
    --------
    Channel ``a`` leads ``b`` by 60 degrees at 2 cycles per 100 samples and
    lags it by 90 degrees at 10 cycles.  For sampled sinusoids over whole
    periods each band area is ``(N/2) a b sin(2 pi m/N) sin(delta)``
    (amplitudes a, b, phase lead delta, m cycles in N samples); the
    amplitudes make the broadband area nearly cancel:

    >>> import numpy as np
    >>> import wedgepath as wp
    >>> k = np.arange(100)
    >>> slow, fast = 2 * np.pi * 2 * k / 100, 2 * np.pi * 10 * k / 100
    >>> X = {"a": np.cos(slow) + np.cos(fast), "b": np.cos(slow - np.pi / 3) + 0.185 * np.cos(fast + np.pi / 2)}
    >>> s = wp.lead_spectrum(X, bands={"slow": (0, 0.05), "fast": (0.05, 0.5)})
    >>> s.pair("a", "b").round(3).tolist()
    [5.427, -5.437]
    >>> round(float(wp.area_matrix(X)["a", "b"]), 3), round(float(s.total()[0, 1]), 3)
    (-0.01, -0.01)
    >>> s.normalized[:, 0, 1].round(4).tolist()
    [0.866, -1.0]
    """
    check_closure(closure)
    check_choice(irregular, "irregular", IRREGULAR_METHODS)
    if tol is not None:
        if isinstance(tol, (bool, np.bool_)) or not isinstance(tol, numbers.Real):
            raise TypeError(f"tol must be a number, got {tol!r}")
        if not (np.isfinite(tol) and tol >= 0):
            raise ValueError(f"tol must be a finite number >= 0, got {tol!r}")
    data = signal_input(X, times, names)
    _resolve_bands(bands)  # check before any work
    needed = False
    with np.errstate(over="ignore", invalid="ignore", under="ignore"):
        out = _spectrum(data, closure, bands, irregular, tol)
    areas, energy, rest, edges, bnames, resampled = out
    big = max(float(np.max(np.abs(areas), initial=0.0)), float(np.max(np.abs(rest))))
    if not (np.isfinite(areas).all() and np.isfinite(energy).all() and np.isfinite(rest).all()
            and (big == 0.0 or big >= _TINY)):
        # overflow, or products that may have underflowed: each channel is rescaled by a
        # power of two (exact) and the areas scaled back
        e, needed = channel_exponents(data)
        if needed:
            if closure == "require":
                raise ValueError("closure='require' with data of extreme magnitude: rescale "
                                 "the data")
            with np.errstate(over="ignore", invalid="ignore", under="ignore"):
                areas, energy, rest, edges, bnames, resampled = _spectrum(
                    scaled_data(data, e), closure, bands, irregular, tol)
    if needed:
        pe = e[:, None] + e[None, :]
        areas = pow2_scale(areas, pe[None])
        rest = pow2_scale(rest, pe)
        energy = pow2_scale(energy, 2 * e[None, :])
    if not (np.isfinite(areas).all() and np.isfinite(rest).all()):
        raise ValueError("lead_spectrum: the areas overflow float64 for data this large; "
                         "rescale the data")
    err = None
    if resampled:
        with np.errstate(over="ignore", invalid="ignore", under="ignore"):
            A0, _ = closed_area(data, closure, tol)
        err = A0 - (areas.sum(axis=0) + rest)
        big = float(np.max(np.abs(A0)))
        if big > 0 and float(np.max(np.abs(err))) > _RESAMPLE_WARN * big:
            warnings.warn(f"lead_spectrum: resampling the irregular times onto a regular grid "
                          f"changed the areas by up to {float(np.max(np.abs(err))) / big:.2%} of "
                          "the largest area (see .resampling_error); irregular='index' keeps "
                          "the areas exact", ResamplingWarning, stacklevel=2)
    unit = "cycles per sample" if data.times is None else "cycles per time unit"
    how = None
    if data.times is not None and _regular_step(data.times) is None:
        how = irregular
    return LeadSpectrum(areas=areas, bands=edges, band_names=bnames,
                        normalized=_normalised(areas, energy), energy=energy, rest=rest,
                        names=data.labels, closure=closure, frequency_unit=unit, irregular=how,
                        resampling_error=err, samples=int(data.shape[0]), units=data.units)



# --------------------------------------------------------------------------- gap-free loop
def _gap_free_loop(X, times, names, closure, what):
    """Centred, scaled loop (N, n) of gap-free data, its sampling step and the input."""
    from .significance import _gap_free

    if closure not in ("chord", "detrend"):
        raise ValueError(f"{what} supports closure='chord' or 'detrend' (surrogates and windows "
                         f"are closed loops), got {closure!r}")
    Y, data, ex = _gap_free(X, times, names,
                            needs="band significance and rolling band areas need")
    T = Y.shape[0]
    t = data.times
    if closure == "detrend":
        tau = t if t is not None else np.arange(T, dtype=np.float64)
        frac = (tau - tau[0]) / (tau[-1] - tau[0])
        Y = Y - frac[:, None] * (Y[-1] - Y[0])
        Y = Y[:-1]
        Y -= Y.mean(axis=0)
    h = 1.0 if t is None else float((t[-1] - t[0]) / (T - 1))
    return Y, h, data, ex


def _band_matrix_batch(Zr, Zi, idx, B):
    """Band areas of a batch of weighted spectra (k, M, n) -> (k, B, n, n)."""
    k, M, n = Zr.shape
    out = np.zeros((k, B, n, n))
    for b in range(B):
        sel = np.flatnonzero(idx == b)
        if sel.size == 0:
            continue
        lo, hi = int(sel[0]), int(sel[-1]) + 1      # a band's bins are contiguous
        G = np.swapaxes(Zi[:, lo:hi], 1, 2) @ Zr[:, lo:hi]
        out[:, b] = G - np.swapaxes(G, 1, 2)
    return out


@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class BandSignificance(Result):
    """Surrogate test of every band area of every pair: :func:`band_surrogate_test`.

    Attributes
    ----------
    observed : ndarray (B, n, n)
        Band areas of the data (as :func:`lead_spectrum`).
    pvalues : ndarray (B, n, n)
        Two-sided Monte Carlo p-value of each band and pair,
        ``(1 + #{|a*| >= |a|}) / (1 + n_surrogates)``; NaN on the diagonals.
    qvalues : ndarray (B, n, n)
        Benjamini-Hochberg adjustment over all ``B n (n - 1) / 2`` band-pair
        p-values together (pairs and bands).
    null_mean, null_std : ndarray (B, n, n)
        Mean and standard deviation of the surrogate band areas.
    bands : ndarray (B, 2)
    band_names : tuple of str
    method : str
    n_surrogates : int
    seed
    min_shift : int or None
    names : tuple of str
    closure : str
    units : mapping or None

    ``to_frame()`` has one row per band and pair ``i < j``: ``band,
    band_name, low, high, i, j, channel_i, channel_j, area, p, q, null_mean,
    null_std``.
    """

    observed: np.ndarray
    pvalues: np.ndarray
    qvalues: np.ndarray
    null_mean: np.ndarray
    null_std: np.ndarray
    bands: np.ndarray
    band_names: tuple
    method: str
    n_surrogates: int
    seed: object
    names: tuple
    min_shift: int | None = None
    closure: str = "chord"
    units: Mapping | None = None

    def significant(self, alpha=0.05) -> np.ndarray:
        """Boolean (B, n, n) array of band-pairs with ``qvalue <= alpha``."""
        return np.nan_to_num(self.qvalues, nan=np.inf) <= alpha

    def to_frame(self):
        """One row per band and pair: ``band, band_name, low, high, i, j, ..., area, p, q, ...``."""
        import pandas as pd

        B, n = self.observed.shape[0], len(self.names)
        iu, ju = pair_index(n)
        P = iu.size
        b = np.repeat(np.arange(B), P)
        nm = np.array(self.names, dtype=object)
        bn = np.array(self.band_names, dtype=object)

        def flat(a):
            return a[:, iu, ju].reshape(-1)

        return pd.DataFrame({
            "band": b, "band_name": bn[b], "low": self.bands[b, 0], "high": self.bands[b, 1],
            "i": np.tile(iu, B), "j": np.tile(ju, B),
            "channel_i": np.tile(nm[iu], B), "channel_j": np.tile(nm[ju], B),
            "area": flat(self.observed), "p": flat(self.pvalues), "q": flat(self.qvalues),
            "null_mean": flat(self.null_mean), "null_std": flat(self.null_std)})

    def _summary_items(self):
        B, n = self.observed.shape[0], len(self.names)
        m = B * n * (n - 1) // 2
        sig = int(np.sum(np.triu(self.significant()[:, :, :], 1) if B else 0))
        return [("method", repr(self.method)), ("n_surrogates", str(self.n_surrogates)),
                ("bands", str(B)),
                ("significant", f"{sig} of {m} band-pairs at q<=0.05"),
                ("names", fmt_names(self.names))]


def band_surrogate_test(X, *, bands, method="shift", n_surrogates=199, min_shift="auto",
                        seed=None, times=None, names=None, closure="chord",
                        progress=None, trials=None) -> BandSignificance:
    """Test each band area of each pair against surrogates; FDR over pairs and bands.

    The surrogates are those of :func:`surrogate_test`, applied to the
    loop's spectrum: a circular shift of channel i by ``s`` samples
    multiplies its DFT by ``exp(-2 pi i m s / N)`` (``method="shift"``,
    with the same ``min_shift`` rule), phase randomisation multiplies each
    bin by an independent random phase (``method="phase"``).  Both keep
    each channel's spectrum, so the band energies and the normalised band
    values have the same null as the raw band areas.  P-values are two-sided
    Monte Carlo p-values per band and pair; the q-values adjust all
    ``B n (n - 1) / 2`` of them together by :func:`benjamini_hochberg`
    (false discovery rate over pairs and bands).

    Parameters
    ----------
    X : array_like (T, n), DataFrame or Path
        Samples; NaN rows are gaps between trials (see ``trials``).
    bands : sequence of edges or mapping name -> (low, high)
        As for :func:`lead_spectrum` (``None`` is not accepted: test bands,
        not bins).
    method : {"shift", "phase"}
    n_surrogates : int
    min_shift : "auto" or int
        As for :func:`surrogate_test`.
    seed : int, Generator or None
    times : array_like (T,), optional
        Sample times: frequencies in cycles per time unit, from the mean step.
    names : sequence of str, optional
    closure : {"chord", "detrend"}
    progress : bool or None
    trials : str, array_like or None
        As for :func:`surrogate_test`: a DataFrame column or one label per
        row; None (default): the pieces between NaN rows.  With several
        pieces the statistic is the sum of the pieces' band areas (each
        piece's own frequencies assigned to the bands), and each surrogate
        shifts or phase-randomises every channel within each piece
        (``min_shift`` within each piece, at most a quarter of the
        shortest); pieces of fewer than 4 samples are left out.

    Returns
    -------
    BandSignificance

    Examples
    --------
    Slow random motion (a 20-sample moving average of noise) shared by two
    channels, the second 5 samples later, plus a little independent noise:
    the lead is significant in the slow band only:

    >>> import numpy as np
    >>> import wedgepath as wp
    >>> rng = np.random.default_rng(3)
    >>> drive = np.convolve(rng.standard_normal(2100), np.ones(20) / 20, mode="same")
    >>> X = np.column_stack([drive[5:2005], drive[:2000]]) + 0.1 * rng.standard_normal((2000, 2))
    >>> res = wp.band_surrogate_test(X, bands={"slow": (0, 0.05), "fast": (0.05, 0.5)},
    ...                              n_surrogates=99, seed=0)
    >>> res.to_frame()[["band_name", "p", "q"]].round(3).values.tolist()
    [['slow', 0.01, 0.02], ['fast', 0.48, 0.48]]
    """
    from .significance import _merge_moments, _resolve_min_shift

    check_choice(method, "method", ("shift", "phase"))
    check_progress(progress)
    nsur = as_int(n_surrogates, "n_surrogates")
    if nsur < 1:
        raise ValueError(f"n_surrogates must be at least 1, got {nsur}")
    if bands is None:
        raise ValueError("band_surrogate_test needs bands (edges or named ranges), not None")
    edges, bnames, contiguous = _resolve_bands(bands)
    rng = as_rng(seed)
    if trials is not None or _has_gap(X):
        return _pooled_band_surrogates(X, times, names, trials, closure, edges, bnames,
                                       contiguous, method, nsur, min_shift, seed, rng,
                                       progress)
    Y, h, data, ex = _gap_free_loop(X, times, names, closure, "band_surrogate_test")
    N, n = Y.shape
    m_shift = _resolve_min_shift(min_shift, method, Y)
    from scipy import fft as sfft

    F = sfft.rfft(Y, axis=0)
    M = F.shape[0]
    sw = _sqrt_weights(N)
    idx = _assign(np.arange(M) / (N * h), edges, contiguous)
    B = edges.shape[0]
    R0 = (F.real * sw[:, None])[None]
    I0 = (F.imag * sw[:, None])[None]
    obs = _band_matrix_batch(R0, I0, idx, B)[0]
    energy = np.zeros((B, n))
    for b in range(B):
        sel = idx == b
        energy[b] = np.sum(R0[0, sel] ** 2 + I0[0, sel] ** 2, axis=0)
    # ties: a surrogate equal to the data up to rounding counts as at least as extreme.
    # Each band area is a sum of at most M products bounded by sqrt(E_i E_j) in total
    # (Cauchy-Schwarz), so its rounding error is at most about gamma_{M+4} times that
    # (N. J. Higham, "Accuracy and Stability of Numerical Algorithms", 2nd ed., eq. 3.5),
    # doubled for the phase factors and the FFT (margin, from memory)
    u = np.finfo(np.float64).eps / 2
    g = (M + 4 + 10 * max(math.log2(N), 1.0)) * u
    tie = 4.0 * g * np.sqrt(energy[:, :, None] * energy[:, None, :])
    threshold = np.abs(obs) - 2.0 * tie
    exceed = np.zeros((B, n, n))
    count = np.zeros((B, n, n))
    mean = np.zeros((B, n, n))
    m2 = np.zeros((B, n, n))
    keep = (N - 2 * m_shift + 1) / N if (method == "shift" and m_shift) else 1.0
    offdiag = np.broadcast_to(~np.eye(n, dtype=bool), (B, n, n))
    per_batch = max(1, min(256, (1 << 21) // max(M * n, 1)))
    mm = np.arange(M)
    with progress_bar(nsur, "surrogates", progress) as bar:
        done = 0
        while done < nsur:
            k = int(min(per_batch, np.ceil((nsur - done) / keep) + (2 if method == "shift" else 0)))
            if method == "shift":
                shifts = rng.integers(0, N, size=(k, n))
                phase = -2.0 * np.pi * (mm[None, :, None] * shifts[:, None, :] % N) / N
                d = np.abs(shifts[:, :, None] - shifts[:, None, :])
                valid = np.minimum(d, N - d) >= m_shift
            else:
                phase = rng.uniform(0.0, 2.0 * np.pi, size=(k, M, n))
                valid = np.ones((k, n, n), dtype=bool)
            c, s = np.cos(phase), np.sin(phase)
            Zr = R0 * c - I0 * s
            Zi = R0 * s + I0 * c
            A = _band_matrix_batch(Zr, Zi, idx, B)            # (k, B, n, n)
            v = np.broadcast_to((valid & offdiag[0])[:, None], A.shape)
            use = v & (count + np.cumsum(v, axis=0) <= nsur)
            exceed += np.sum(use & (np.abs(A) >= threshold), axis=0)
            count, mean, m2 = _merge_moments(count, mean, m2, A, use)
            now = int(count[offdiag].min()) if n > 1 else nsur
            bar.update(now - done)
            done = now
    sd = np.sqrt(m2 / max(nsur - 1, 1))
    return _band_significance(obs, exceed, mean, sd, ex, nsur, edges, bnames, method=method,
                              seed=seed, min_shift=m_shift, data=data, closure=closure)


def _band_significance(obs, exceed, mean, sd, ex, nsur, edges, bnames, **fields):
    """The :class:`BandSignificance` of observed band areas and their surrogate counts.

    ``exceed``: surrogates at least as large as the observed area (B, n, n); ``obs``,
    ``mean``, ``sd`` are on the channels scaled by powers of two ``ex`` and are scaled
    back here.  p-values ``(1 + exceed) / (nsur + 1)``, q-values by Benjamini-Hochberg
    over every pair i < j of every band.
    """
    from .significance import benjamini_hochberg

    B, n = obs.shape[0], obs.shape[1]
    p = (1.0 + exceed) / (nsur + 1.0)
    p[:, np.eye(n, dtype=bool)] = np.nan
    iu, ju = pair_index(n)
    q = np.full((B, n, n), np.nan)
    qv = benjamini_hochberg(p[:, iu, ju].reshape(-1)).reshape(B, -1)
    q[:, iu, ju] = qv
    q[:, ju, iu] = qv
    pe = ex[:, None] + ex[None, :]

    def back(a):
        out = pow2_scale(a, pe[None])
        if not np.isfinite(out[np.isfinite(a)]).all():
            raise ValueError("band_surrogate_test: the areas overflow float64; rescale the data")
        return out

    data = fields.pop("data")
    return BandSignificance(observed=back(obs), pvalues=p, qvalues=q, null_mean=back(mean),
                            null_std=back(sd), bands=edges, band_names=bnames,
                            n_surrogates=nsur, names=data.labels, units=data.units, **fields)


def _has_gap(X):
    """True when X is an array-like with a NaN (the pieces between NaN rows are trials)."""
    try:
        a = np.asarray(getattr(X, "values", X))
    except Exception:       # odd input: the single-piece path gives the error message
        return False
    return a.dtype.kind == "f" and a.ndim == 2 and bool(np.isnan(a).any())


def _pooled_band_surrogates(X, times, names, trials, closure, edges, bnames, contiguous,
                            method, nsur, min_shift, seed, rng, progress):
    """band_surrogate_test over several gap-free pieces (trials), shuffled within each."""
    from .significance import _pooled_min_shift, _trial_pieces

    if closure not in ("chord", "detrend"):
        raise ValueError(f"band_surrogate_test supports closure='chord' or 'detrend' "
                         f"(surrogates are closed loops), got {closure!r}")
    pieces, _, data, ex, tr = _trial_pieces(X, times, names, trials, min_len=4)
    keep = (tr.piece_stop - tr.piece_start) >= 4
    starts, stops = tr.piece_start[keep].tolist(), tr.piece_stop[keep].tolist()
    t = None if data.times is None else np.asarray(data.times, dtype=np.float64)
    loops, steps = [], []
    for P, a, b in zip(pieces, starts, stops):
        L = b - a
        if closure == "detrend":
            tau = t[a:b] if t is not None else np.arange(L, dtype=np.float64)
            frac = (tau - tau[0]) / (tau[-1] - tau[0])
            P = (P - frac[:, None] * (P[-1] - P[0]))[:-1]
            P = P - P.mean(axis=0)
        loops.append(P)
        steps.append(1.0 if t is None else float((t[b - 1] - t[a]) / (L - 1)))
    n = loops[0].shape[1]
    lengths = np.array([P.shape[0] for P in loops])
    m_shift = _pooled_min_shift(min_shift, method, loops, "band_surrogate_test")
    from scipy import fft as sfft

    B = edges.shape[0]
    spec = []
    obs = np.zeros((B, n, n))
    energy = np.zeros((B, n))
    Mtot = 0
    for P, h in zip(loops, steps):
        N = P.shape[0]
        F = sfft.rfft(P, axis=0)
        M = F.shape[0]
        Mtot += M
        sw = _sqrt_weights(N)
        idx = _assign(np.arange(M) / (N * h), edges, contiguous)
        R0 = (F.real * sw[:, None])[None]
        I0 = (F.imag * sw[:, None])[None]
        obs += _band_matrix_batch(R0, I0, idx, B)[0]
        for b in range(B):
            sel = idx == b
            energy[b] += np.sum(R0[0, sel] ** 2 + I0[0, sel] ** 2, axis=0)
        spec.append((N, M, idx, R0, I0))
    # ties, as in the single-piece test (Higham, eq. 3.5; margin from memory)
    u = np.finfo(np.float64).eps / 2
    g = (Mtot + 4 + 10 * max(math.log2(int(lengths.max())), 1.0)) * u
    tie = 4.0 * g * np.sqrt(energy[:, :, None] * energy[:, None, :])
    threshold = np.abs(obs) - 2.0 * tie
    offdiag = ~np.eye(n, dtype=bool)
    S = np.zeros((nsur, B, n, n))           # surrogate s of every band and pair, summed
    with progress_bar(nsur * len(spec), "surrogates", progress) as bar:
        for N, M, idx, R0, I0 in spec:
            count = np.zeros((n, n), dtype=np.int64)
            per_batch = max(1, min(256, (1 << 21) // max(M * n, 1)))
            mm = np.arange(M)
            while True:
                need = int(nsur - count[offdiag].min())
                if need <= 0:
                    break
                if method == "shift":
                    frac = (N - 2 * m_shift + 1) / N if m_shift else 1.0
                    k = int(min(per_batch, np.ceil(need / max(frac, 1e-3)) + 2))
                    shifts = rng.integers(0, N, size=(k, n))
                    phase = -2.0 * np.pi * (mm[None, :, None] * shifts[:, None, :] % N) / N
                    d = np.abs(shifts[:, :, None] - shifts[:, None, :])
                    valid = np.minimum(d, N - d) >= m_shift
                else:
                    k = int(min(per_batch, need))
                    phase = rng.uniform(0.0, 2.0 * np.pi, size=(k, M, n))
                    valid = np.ones((k, n, n), dtype=bool)
                c, sn = np.cos(phase), np.sin(phase)
                A = _band_matrix_batch(R0 * c - I0 * sn, R0 * sn + I0 * c, idx, B)
                valid &= offdiag
                rank = count + np.cumsum(valid, axis=0) - 1      # slot of each valid draw
                use = valid & (rank < nsur)
                kk, ii, jj = np.nonzero(use)
                S[rank[kk, ii, jj], :, ii, jj] += A[kk, :, ii, jj]
                before = int(count[offdiag].min())
                count += use.sum(axis=0)
                bar.update(int(count[offdiag].min()) - before)
    exceed = np.sum(np.abs(S) >= threshold[None], axis=0).astype(np.float64)
    mean = S.mean(axis=0)
    sd = S.std(axis=0, ddof=1) if nsur > 1 else np.zeros((B, n, n))
    return _band_significance(obs, exceed, mean, sd, ex, nsur, edges, bnames, method=method,
                              seed=seed, min_shift=m_shift, data=data, closure=closure)


# --------------------------------------------------------------------------- rolling
@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class RollingSpectrum(ArrayResult):
    """Band areas of sliding windows (time-frequency): :func:`rolling_lead_spectrum`.

    Array-like: ``np.asarray(r)`` (or ``r.areas``) is the (K, B, n, n) array.

    Attributes
    ----------
    areas : ndarray, shape (K, B, n, n)
        Band area matrices of each window (each window closed by its chord);
        summed over bands (plus ``rest``) they are
        :func:`rolling_area_matrix`'s areas.
    rest : ndarray, shape (K, n, n)
        Area of each window at frequencies outside the bands.
    start, stop : ndarray of int (K,)
    start_time, stop_time : ndarray of float (K,)
    window, step : int
    bands : ndarray (B, 2)
    band_names : tuple of str
    names : tuple of str
    closure : str
    units : mapping or None

    ``to_frame()`` has one row per window, band and pair: ``window, start,
    stop, start_time, stop_time, band, band_name, low, high, i, j,
    channel_i, channel_j, area``.
    """

    _array_field: ClassVar[str] = "areas"

    areas: np.ndarray
    rest: np.ndarray
    start: np.ndarray
    stop: np.ndarray
    start_time: np.ndarray
    stop_time: np.ndarray
    window: int
    step: int
    bands: np.ndarray
    band_names: tuple
    names: tuple
    closure: str = "chord"
    units: Mapping | None = None

    def pair(self, i, j) -> np.ndarray:
        """The (K, B) band areas of one pair over windows, channels by index or name."""
        return self.areas[:, :, self._channel(i), self._channel(j)]

    def to_frame(self):
        """One row per window, band and pair (see the class docstring)."""
        import pandas as pd

        K, B, n = self.areas.shape[0], self.areas.shape[1], len(self.names)
        iu, ju = pair_index(n)
        P = iu.size
        w = np.repeat(np.arange(K), B * P)
        b = np.tile(np.repeat(np.arange(B), P), K)
        nm = np.array(self.names, dtype=object)
        bn = np.array(self.band_names, dtype=object)
        return pd.DataFrame({
            "window": w, "start": self.start[w], "stop": self.stop[w],
            "start_time": self.start_time[w], "stop_time": self.stop_time[w],
            "band": b, "band_name": bn[b], "low": self.bands[b, 0], "high": self.bands[b, 1],
            "i": np.tile(iu, K * B), "j": np.tile(ju, K * B),
            "channel_i": np.tile(nm[iu], K * B), "channel_j": np.tile(nm[ju], K * B),
            "area": self.areas[:, :, iu, ju].reshape(-1)})

    def _summary_items(self):
        return [("windows", str(self.areas.shape[0])), ("bands", str(self.areas.shape[1])),
                ("window", str(self.window)), ("step", str(self.step)),
                ("names", fmt_names(self.names))]


def rolling_lead_spectrum(X, window, step, *, bands, times=None, names=None,
                          progress=None) -> RollingSpectrum:
    """Band area matrices of sliding windows: how each band's lead changes over time.

    Window ``k`` holds samples ``k*step : k*step + window``, closed by its
    chord, as in :func:`rolling_area_matrix`; its area matrix is split over
    the window's DFT frequencies ``m / (window h)`` exactly as
    :func:`lead_spectrum` splits a whole recording, so the band matrices of
    a window add up (with ``rest``) to its rolling area matrix.  The
    frequency resolution of a window is ``1 / (window h)``: a band narrower
    than that holds at most one bin.

    Parameters
    ----------
    X : array_like (T, n), DataFrame or Path
        Gap-free samples (NaN raises).
    window, step : int
        Samples per window (at least 4) and between window starts.
    bands : sequence of edges or mapping name -> (low, high)
        As for :func:`lead_spectrum`.
    times : array_like (T,), optional
        Sample times: frequencies in cycles per time unit (from the mean
        step), window times reported.
    names : sequence of str, optional
    progress : bool or None

    Returns
    -------
    RollingSpectrum

    Examples
    --------
    >>> import numpy as np
    >>> import wedgepath as wp
    >>> X = np.random.default_rng(2).standard_normal((1000, 3)).cumsum(axis=0)
    >>> r = wp.rolling_lead_spectrum(X, 200, 100, bands=[0, 0.05, 0.5])
    >>> r.shape
    (9, 2, 3, 3)
    >>> bool(np.allclose(r.areas.sum(axis=1) + r.rest, wp.rolling_area_matrix(X, 200, 100).areas,
    ...                  rtol=0, atol=1e-9))
    True
    """
    check_progress(progress)
    if bands is None:
        raise ValueError("rolling_lead_spectrum needs bands (edges or named ranges), not None")
    edges, bnames, contiguous = _resolve_bands(bands)
    from .significance import _gap_free

    Y, data, ex = _gap_free(X, times, names,
                            needs="band significance and rolling band areas need")
    T, n = Y.shape
    w = as_int(window, "window")
    s = as_int(step, "step")
    if w < 4:
        raise ValueError(f"window must hold at least 4 samples, got {w}")
    if w > T:
        raise ValueError(f"window={w} is longer than the data ({T} samples)")
    if s < 1:
        raise ValueError(f"step must be at least 1, got {s}")
    t = data.times
    h = 1.0 if t is None else float((t[-1] - t[0]) / (T - 1))
    K = (T - w) // s + 1
    B = edges.shape[0]
    from scipy import fft as sfft

    M = w // 2 + 1
    sw = _sqrt_weights(w)
    idx = _assign(np.arange(M) / (w * h), edges, contiguous)
    areas = np.zeros((K, B, n, n))
    rest = np.zeros((K, n, n))
    view = np.lib.stride_tricks.sliding_window_view(Y, w, axis=0)    # (T-w+1, n, w)
    per = max(1, (1 << 22) // (w * n))
    with progress_bar(K, "windows", progress) as bar:
        for a in range(0, K, per):
            ks = np.arange(a, min(K, a + per)) * s
            Wb = np.swapaxes(view[ks], 1, 2)                              # (k, w, n)
            Wb = Wb - Wb.mean(axis=1, keepdims=True)
            F = sfft.rfft(Wb, axis=1)
            Zr = F.real * sw[None, :, None]
            Zi = F.imag * sw[None, :, None]
            areas[a:a + ks.size] = _band_matrix_batch(Zr, Zi, idx, B)
            out = idx < 0
            if out.any():
                G = np.swapaxes(Zi[:, out], 1, 2) @ Zr[:, out]
                rest[a:a + ks.size] = G - np.swapaxes(G, 1, 2)
            bar.update(ks.size)
    pe = ex[:, None] + ex[None, :]
    areas = pow2_scale(areas, pe)
    rest = pow2_scale(rest, pe)
    u = np.arange(K, dtype=np.int64) * s
    tt = t if t is not None else np.arange(T, dtype=np.float64)
    return RollingSpectrum(areas=areas, rest=rest, start=u, stop=u + w, start_time=tt[u],
                           stop_time=tt[u + w - 1], window=w, step=s, bands=edges,
                           band_names=bnames, names=data.labels, units=data.units)
