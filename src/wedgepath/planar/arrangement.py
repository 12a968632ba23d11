"""Faces of a closed planar curve's arrangement, with their winding numbers.

Method
------
1. The closed pieces are noded (``shapely.node``: split at every crossing)
   and the noded linework is polygonized (``shapely.polygonize``); the
   resulting polygons are the bounded faces.  Should floating-point noding
   fail (laps that nearly coincide can defeat it) or give inconsistent
   faces, the linework is noded by snap-rounding (``shapely.unary_union``
   with a ``grid_size`` of 2**-40, then 2**-32, 2**-24 times the extent).
2. Every noded segment knows how often, and in which direction, the curve
   runs along it (its *multiplicity*).  Normally the noder returns the
   curve's segments in their own direction, each once, which is checked
   (total length) and then used directly.  When the curve runs over itself
   (back-tracking, a loop traced twice), the noder merges the overlapping
   segments; their multiplicities are then recovered by matching each noded
   segment with the original segments that contain it.
3. Faces are adjacent across the segments of their rings.  Crossing a
   segment whose multiplicity is ``m`` from its right to its left raises the
   winding number by ``m`` (by exactly one for a segment traced once).  A
   breadth-first walk from the unbounded face (winding 0) over this
   adjacency assigns every face its winding number; every other adjacency is
   then checked against it.
4. Lobes are the connected groups (sharing a segment, not only a point) of
   faces with winding numbers of one sign.

All steps after noding and polygonizing are vectorised array operations
(sorting, binary search, a sparse-graph breadth-first order and pointer
jumping), so they cost a fraction of the two geometry steps.

Size
----
The arrangement has about one face and a few kilobytes of memory per
crossing, and the noding takes tens of microseconds per crossing: a curve
of uniform noise crosses itself about V**2 / 10 times (3,000 samples: about
a million crossings).  Before building anything, :func:`count_crossings`
counts the pairs of segments that meet (candidates from a shapely STRtree,
decided by the exact orientation predicate), in batches, stopping as soon as
the count passes ``max_crossings``; beyond it ``decompose`` refuses with the
estimate and what it would cost.  Running out of memory while building is
reported as such (:class:`ArrangementTooLarge`, a ``ValueError``).
"""

from __future__ import annotations

import warnings
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np
import shapely
from scipy.sparse import coo_matrix
from scipy.sparse.csgraph import breadth_first_order, connected_components

from .._bars import Stages, check_progress
from .._results import Result, fmt_number
from .._scaling import pow2_exponent, pow2_scale
from ._input import closed_pieces, drop_repeats, finite_result, planar_path, plane_names
from ._predicates import orient_sign
from .area import _piece_area, _too_few_points

__all__ = ["decompose", "Decomposition", "Lobe", "DecompositionWarning"]

#: default limit on the crossings (pairs of segments that meet) of a curve whose
#: arrangement decompose builds: about 1.7 GB and half a minute on the development machine
MAX_CROSSINGS = 500_000
#: measured cost of the arrangement per crossing (development machine, 2 cores): peak
#: memory 1.2 GB for 360,000 crossings, 19 s for 366,000 faces (docs/performance.md)
BYTES_PER_CROSSING = 3500
SECONDS_PER_CROSSING = 55e-6
#: the progress indicator is shown (progress=None) for arrangements at least this large
_SLOW_CROSSINGS = 20_000
_SLOW_SEGMENTS = 200_000
#: segment pairs examined per batch of the crossing count (bounds its memory)
_PAIRS_PER_BATCH = 1 << 21
#: chain pairs with at most this many segment pairs are examined pair by pair
_SMALL_PRODUCT = 256

_EPS = np.finfo(np.float64).eps
#: snap-rounding grids tried when floating-point noding fails: extent * 2**-k
_SNAP_GRIDS = (40, 32, 24)
#: curves whose largest coordinate lies outside [2**-_SAFE_EXP, 2**_SAFE_EXP] are rescaled for GEOS
_SAFE_EXP = 64


class ArrangementTooLarge(ValueError):
    """The curve's arrangement is larger than allowed (``max_crossings``) or than memory.

    Attributes: ``segments`` (of the closed curve), ``crossings`` (counted, or the
    estimate when counting stopped early), ``limit`` (``max_crossings``) and ``cause``
    (``"limit"``, ``"candidates"`` or ``"memory"``).
    """

    def __init__(self, message, *, segments, crossings, limit, cause):
        super().__init__(message)
        self.segments, self.crossings, self.limit, self.cause = segments, crossings, limit, cause


class CrossingCount:
    """Result of :func:`count_crossings`.

    Attributes
    ----------
    crossings : int
        Pairs of non-adjacent segments that meet, among the segments examined.
    done, segments : int
        Segments examined (as the first of a pair) and in all.
    candidates : int
        Pairs of segments whose bounding boxes overlap, among those examined.
    complete : bool
        Every segment was examined (the count is exact).
    estimate : float
        ``crossings`` when complete, else an extrapolation assuming crossings
        spread evenly along the curve.
    """

    __slots__ = ("crossings", "done", "segments", "candidates", "complete", "estimate")

    def __init__(self, crossings, done, segments, candidates):
        self.crossings, self.done, self.segments = int(crossings), int(done), int(segments)
        self.candidates = int(candidates)
        self.complete = self.done >= self.segments
        if self.complete or self.done == 0:
            self.estimate = float(self.crossings)
        else:
            # segment i is paired with the later segments only: the first fraction f of
            # the segments holds 1 - (1 - f)**2 of all pairs
            f = self.done / self.segments
            self.estimate = self.crossings / (1.0 - (1.0 - f) ** 2)

    def __repr__(self):
        return (f"CrossingCount(crossings={self.crossings}, done={self.done}/{self.segments}, "
                f"complete={self.complete})")


def count_crossings(pieces, limit=None, max_candidates=None) -> CrossingCount:
    """Count pairs of non-adjacent segments of closed pieces that meet (cross or touch).

    ``pieces`` are closed polylines (last row equal to the first), as
    :func:`decompose` nodes them.  Segments that follow each other on a piece
    share an end and are not counted.

    Method: consecutive segments that move in the same quadrant direction
    (signs of dx and dy) form a monotone chain, inside which no two
    non-adjacent segments can meet.  The chains' bounding boxes go into a
    shapely STRtree; for every pair of chains whose boxes overlap, the pairs of
    their segments whose boxes overlap are found by binary search along x (the
    segments of a monotone chain are sorted in x), and each such candidate is
    decided by the exact orientation predicate (two segments meet when the
    ends of each are not strictly on one side of the other's line).  A smooth
    loop of 300,000 samples has a handful of chains; the work is about
    (V + K) log V for V segments and K meetings, plus the candidates that do
    not meet, and memory is bounded by taking the chains in batches.
    Counting stops once more than ``limit`` meetings, or more than
    ``max_candidates`` candidates, were found (``complete`` is then False and
    ``estimate`` extrapolates).

    Examples
    --------
    >>> import numpy as np
    >>> from wedgepath.planar.arrangement import count_crossings
    >>> eight = np.array([[0, 0], [2, 2], [2, 0], [0, 2], [0, 0]], float)
    >>> count_crossings([eight]).crossings
    1
    """
    pieces = [np.asarray(p, dtype=np.float64) for p in pieces if len(p) >= 2]
    if not pieces:
        return CrossingCount(0, 0, 0, 0)
    seg = _SegmentChains(pieces)
    V, C = seg.V, seg.cs.size
    tree = shapely.STRtree(shapely.box(seg.clo[:, 0], seg.clo[:, 1], seg.chi[:, 0],
                                       seg.chi[:, 1]))
    boxes = tree.geometries
    count = candidates = 0
    done_chains = 0
    batch = 16                  # chains per batch, then sized to about _PAIRS_PER_BATCH pairs
    while done_chains < C:
        idx = np.arange(done_chains, min(C, done_chains + batch))
        qa, qb = tree.query(boxes[idx])
        qa = idx[qa]
        keep = qb > qa          # within one chain no two non-adjacent segments meet
        qa, qb = qa[keep], qb[keep]
        work = 0
        for i, j in seg.candidate_pairs(qa, qb):
            candidates += i.size
            work += i.size
            if i.size:
                count += int(_segments_meet(seg.a[i], seg.b[i], seg.a[j], seg.b[j]).sum())
        done_chains = int(idx[-1]) + 1
        if (limit is not None and count > limit) or \
                (max_candidates is not None and candidates > max_candidates):
            break
        # at most twice the last batch (an early stop wastes little), at most about
        # _PAIRS_PER_BATCH pairs (bounded memory)
        per_chain = max((work + qa.size) / idx.size, 1.0)
        batch = int(min(max(_PAIRS_PER_BATCH / per_chain, 1), 2 * batch, 1 << 16))
    done = V if done_chains >= C else int(seg.cs[done_chains])
    return CrossingCount(count, done, V, candidates)


class _SegmentChains:
    """Segments of closed pieces grouped into monotone chains (see count_crossings)."""

    def __init__(self, pieces):
        self.a = a = np.concatenate([p[:-1] for p in pieces])
        self.b = b = np.concatenate([p[1:] for p in pieces])
        self.lo, self.hi = np.minimum(a, b), np.maximum(a, b)
        self.xlo, self.ylo = self.lo[:, 0].copy(), self.lo[:, 1].copy()
        self.xhi, self.yhi = self.hi[:, 0].copy(), self.hi[:, 1].copy()
        sizes = np.array([len(p) - 1 for p in pieces])
        self.piece = np.repeat(np.arange(len(pieces)), sizes)
        self.first = np.concatenate(([0], np.cumsum(sizes)[:-1]))
        self.last = self.first + sizes - 1
        self.V = V = a.shape[0]
        d = np.sign(b - a).astype(np.int8)
        cls = 3 * d[:, 0] + d[:, 1]
        brk = np.ones(V, dtype=bool)
        brk[1:] = (cls[1:] != cls[:-1]) | (self.piece[1:] != self.piece[:-1])
        brk |= cls == 0                       # a zero-length segment is a chain of its own
        self.cs = np.flatnonzero(brk)         # chain c holds segments [cs[c], ce[c])
        self.ce = np.append(self.cs[1:], V)
        self.clo = np.minimum.reduceat(self.lo, self.cs, axis=0)
        self.chi = np.maximum.reduceat(self.hi, self.cs, axis=0)
        self.xdir = d[self.cs, 0]             # +1 / -1 / 0: how x runs along the chain

    def _allowed(self, i, j, x_checked=False):
        """Pairs i < j whose boxes overlap and that are not neighbours on a piece."""
        ok = (self.ylo[i] <= self.yhi[j]) & (self.ylo[j] <= self.yhi[i])
        if not x_checked:
            ok &= (self.xlo[i] <= self.xhi[j]) & (self.xlo[j] <= self.xhi[i])
        i, j = i[ok], j[ok]
        p = self.piece
        pi = p[i]
        ok = ~((pi == p[j]) & ((j == i + 1) | ((i == self.first[pi]) & (j == self.last[pi]))))
        return i[ok], j[ok]

    def candidate_pairs(self, qa, qb):
        """Yield arrays (i, j) of candidate segment pairs for the chain pairs (qa, qb)."""
        na, nb = self.ce[qa] - self.cs[qa], self.ce[qb] - self.cs[qb]
        small = na * nb <= _SMALL_PRODUCT
        # short chains (noisy data): every segment pair of the two chains
        sa, sb = qa[small], qb[small]
        per = (na * nb)[small]
        total = int(per.sum())
        if total:
            pair = np.repeat(np.arange(sa.size), per)
            k = np.arange(total) - np.repeat(np.cumsum(per) - per, per)
            nbs = nb[small][pair]
            i = self.cs[sa][pair] + k // nbs
            j = self.cs[sb][pair] + k % nbs
            yield self._allowed(i, j)
        # long chains (smooth data): binary search along x in the longer chain
        for A, B in zip(qa[~small].tolist(), qb[~small].tolist()):
            yield self._long_pair(A, B)

    def _long_pair(self, A, B):
        if self.ce[A] - self.cs[A] > self.ce[B] - self.cs[B]:
            A, B = B, A                       # search the longer chain B
        si = np.arange(self.cs[A], self.ce[A])
        tj = np.arange(self.cs[B], self.ce[B])
        if self.xdir[B] < 0:
            tj = tj[::-1]                     # x increasing along tj
        xlo, xhi = self.xlo[tj], self.xhi[tj]
        if self.xdir[B] == 0:                 # a vertical chain: every segment spans one x
            left = np.where(self.xlo[si] <= xhi[0], 0, tj.size)
            right = np.where(self.xhi[si] >= xlo[0], tj.size, 0)
        else:
            left = np.searchsorted(xhi, self.xlo[si], side="left")
            right = np.searchsorted(xlo, self.xhi[si], side="right")
        per = np.maximum(right - left, 0)
        total = int(per.sum())
        if not total:
            return si[:0], si[:0]
        rep = np.repeat(np.arange(si.size), per)
        k = np.arange(total) - np.repeat(np.cumsum(per) - per, per)
        i = si[rep]
        j = tj[left[rep] + k]
        i, j = np.minimum(i, j), np.maximum(i, j)
        return self._allowed(i, j, x_checked=True)


def _segments_meet(p1, p2, q1, q2):
    """Exactly whether segments p1-p2 and q1-q2 share a point (bounding boxes overlap)."""
    o1 = orient_sign(p1[:, 0], p1[:, 1], p2[:, 0], p2[:, 1], q1[:, 0], q1[:, 1])
    o2 = orient_sign(p1[:, 0], p1[:, 1], p2[:, 0], p2[:, 1], q2[:, 0], q2[:, 1])
    o3 = orient_sign(q1[:, 0], q1[:, 1], q2[:, 0], q2[:, 1], p1[:, 0], p1[:, 1])
    o4 = orient_sign(q1[:, 0], q1[:, 1], q2[:, 0], q2[:, 1], p2[:, 0], p2[:, 1])
    # with overlapping bounding boxes, collinear segments (all four signs 0) overlap too
    return (o1 * o2 <= 0) & (o3 * o4 <= 0)


def _gigabytes(crossings):
    return crossings * BYTES_PER_CROSSING / 1e9


def _duration(crossings):
    s = crossings * SECONDS_PER_CROSSING
    return f"{s:.0f} s" if s < 120 else f"{s / 60:.0f} min"


def _too_large(count: CrossingCount, limit):
    if count.crossings > limit:
        est = max(count.estimate, count.crossings)
        how = "" if count.complete else \
            f", about {est:,.0f} in all (estimated from its first {count.done:,} of " \
            f"{count.segments:,} segments)"
        msg = (f"decompose: the curve crosses itself more than {limit:,} times{how}; its "
               f"arrangement would need about {_gigabytes(est):.1f} GB of memory and "
               f"{_duration(est)}: pass max_crossings= a larger number (or None) to build it")
        return ArrangementTooLarge(msg, segments=count.segments, crossings=int(est),
                                   limit=limit, cause="limit")
    msg = (f"decompose: the {count.segments:,} segments of the curve overlap in more than "
           f"{count.candidates:,} pairs of bounding boxes (long segments lying across each "
           f"other), too many to examine within max_crossings={limit:,}: pass "
           "max_crossings= a larger number (or None) to build it")
    return ArrangementTooLarge(msg, segments=count.segments, crossings=count.crossings,
                               limit=limit, cause="candidates")


def _out_of_memory(count: CrossingCount, limit):
    return ArrangementTooLarge(
        f"decompose: out of memory building the arrangement of this curve ({count.segments:,} "
        f"segments, {count.crossings:,} crossings; about {_gigabytes(count.crossings):.1f} GB "
        "needed): free memory, or decompose a shorter or smoother stretch",
        segments=count.segments, crossings=count.crossings, limit=limit, cause="memory")


class DecompositionWarning(UserWarning):
    """Some face adjacencies disagree with the assigned winding numbers, or the faces do not
    account for the curve's signed area (see ``diagnostics`` and ``residual``)."""


# --------------------------------------------------------------------------- results
@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class Lobe(Result):
    """A connected group of faces whose winding numbers share one sign.

    Attributes
    ----------
    sign : int
        +1 (counter-clockwise lobe) or -1 (clockwise lobe).
    face_indices : numpy.ndarray of int
        Indices of its faces in the parent :class:`Decomposition`.
    faces : numpy.ndarray of shapely.Polygon
        Its faces.
    winding : numpy.ndarray of int
        Their winding numbers.
    signed_area : float
        ``sum w * area`` over its faces (has the lobe's sign).
    area : float
        Geometric area covered (``sum area``).
    absolute_area : float
        ``sum |w| * area``.
    names : tuple of str
        The two channels of the plane (horizontal, vertical).
    units : mapping or None

    ``to_frame()`` is one row: ``sign, signed_area, area, absolute_area, faces``.
    """

    sign: int
    face_indices: np.ndarray
    faces: np.ndarray
    winding: np.ndarray
    signed_area: float
    area: float
    absolute_area: float
    names: tuple = ("0", "1")
    units: Mapping | None = None

    @classmethod
    def _build(cls, sign, face_indices, faces, winding, areas, names=("0", "1")):
        return cls(sign=int(sign), face_indices=face_indices, faces=faces, winding=winding,
                   area=float(areas.sum()), signed_area=float((winding * areas).sum()),
                   absolute_area=float((np.abs(winding) * areas).sum()), names=names)

    @property
    def n_faces(self) -> int:
        return int(self.face_indices.size)

    @property
    def geometry(self):
        """The lobe as one shapely geometry (union of its faces; computed on demand)."""
        return shapely.union_all(self.faces)

    def to_frame(self):
        """One row: ``sign, signed_area, area, absolute_area, faces``."""
        import pandas as pd

        return pd.DataFrame({"sign": [self.sign], "signed_area": [self.signed_area],
                             "area": [self.area], "absolute_area": [self.absolute_area],
                             "faces": [self.n_faces]})

    def _summary_items(self):
        return [("sign", f"{self.sign:+d}"), ("signed_area", fmt_number(self.signed_area)),
                ("faces", str(self.n_faces))]


@dataclass(frozen=True, slots=True, repr=False, eq=False, kw_only=True)
class Decomposition(Result):
    """The faces of a closed planar curve with their winding numbers: :func:`decompose`.

    Attributes
    ----------
    faces : numpy.ndarray of shapely.Polygon
        Bounded faces of the arrangement of the curve (the curve split at
        its crossings).  Faces with winding number 0 that are enclosed by
        the curve are included.
    winding : numpy.ndarray of int64
        Winding number of each face (counter-clockwise positive).
    areas : numpy.ndarray of float
        Geometric (positive) area of each face.
    lobes : tuple of Lobe
        Connected groups of faces of one sign, largest ``|signed_area|``
        first.
    signed_area : float
        ``sum(winding * areas)``; equals :func:`signed_area` of the curve up
        to rounding (the difference is ``residual``).
    absolute_area : float
        ``sum(|winding| * areas)``: the area swept, counted with
        multiplicity and without cancellation.
    area_by_winding : mapping
        ``{k: total area of faces with winding number k}``.
    mixed_signs : bool
        True when lobes of both signs exist: the net ``signed_area`` then
        hides cancelling parts (a figure-eight nets about zero).
    cancellation : float
        ``1 - |signed_area| / absolute_area`` (0: no cancellation, 1: the
        lobes cancel completely); 0.0 for an empty decomposition.
    residual : float
        ``signed_area`` minus the shoelace area of the curve.
    diagnostics : mapping
        How the faces and windings were obtained: ``"noding"`` (GEOS
        ``"floating point"`` noding, or ``"snap-rounded, grid g"`` when that
        failed, as it can for laps that nearly coincide; faces are then
        exact to within the grid), ``"multiplicities"`` (``"ordered"`` or
        ``"matched"``), ``"inconsistent_adjacencies"`` and
        ``"unreached_faces"`` (both 0 unless the noding misbehaved).
    names : tuple of str
        The two channels of the plane (horizontal, vertical): the path's
        names, or ``("0", "1")``.
    closure : str
        How open pieces were closed.
    units : mapping or None

    ``to_frame()`` has one row per face, columns ``face, winding, area,
    lobe`` (``lobe``: index into ``lobes``, -1 for a face of winding 0);
    :meth:`lobes_frame` one row per lobe.
    """

    faces: np.ndarray
    winding: np.ndarray
    areas: np.ndarray
    lobes: tuple
    signed_area: float
    absolute_area: float
    area_by_winding: Mapping
    mixed_signs: bool
    cancellation: float
    residual: float
    diagnostics: Mapping
    names: tuple = ("0", "1")
    closure: str = "chord"
    units: Mapping | None = None

    @classmethod
    def _build(cls, faces, winding, areas, lobes, shoelace, diagnostics, names=("0", "1"),
               closure="chord"):
        lobes = tuple(lobes)
        signed = float((winding * areas).sum()) if areas.size else 0.0
        absolute = float((np.abs(winding) * areas).sum()) if areas.size else 0.0
        keys, inv = np.unique(winding, return_inverse=True)
        sums = np.bincount(inv.ravel(), weights=areas, minlength=keys.size) if keys.size else []
        by_winding = {int(k): float(v) for k, v in zip(keys, sums)}
        return cls(faces=faces, winding=winding, areas=areas, lobes=lobes, signed_area=signed,
                   absolute_area=absolute, area_by_winding=by_winding,
                   mixed_signs=len({lobe.sign for lobe in lobes}) > 1,
                   cancellation=(1.0 - abs(signed) / absolute if absolute > 0 else 0.0),
                   residual=signed - shoelace, diagnostics=dict(diagnostics), names=names,
                   closure=closure)

    @property
    def n_faces(self) -> int:
        return int(self.areas.size)

    def significant_lobes(self, fraction=0.01):
        """Lobes whose ``absolute_area`` is at least ``fraction`` of the total.

        Noise in a sampled loop makes many tiny faces and lobes; this keeps
        the ones that matter for the loop's shape.

        Examples
        --------
        >>> import wedgepath as wp
        >>> d = wp.decompose([[0, 0], [4, 4], [4, 0], [0, 4], [0, 0], [0.1, 0.1], [0.1, 0]])
        >>> len(d.lobes), len(d.significant_lobes(0.01))
        (3, 2)
        """
        fraction = float(fraction)
        if not 0.0 <= fraction <= 1.0:
            raise ValueError(f"fraction must be in [0, 1], got {fraction}")
        cut = fraction * self.absolute_area
        return tuple(lobe for lobe in self.lobes if lobe.absolute_area >= cut)

    def to_frame(self):
        """One row per face: ``face, winding, area, lobe`` (-1: in no lobe, winding 0)."""
        import pandas as pd

        lobe_of = np.full(self.n_faces, -1, dtype=np.int64)
        for k, lobe in enumerate(self.lobes):
            lobe_of[lobe.face_indices] = k
        return pd.DataFrame({"face": np.arange(self.n_faces), "winding": self.winding,
                             "area": self.areas, "lobe": lobe_of})

    def lobes_frame(self):
        """One row per lobe: ``lobe, sign, signed_area, area, absolute_area, faces``."""
        import pandas as pd

        return pd.DataFrame({"lobe": np.arange(len(self.lobes), dtype=np.int64),
                             "sign": [lb.sign for lb in self.lobes],
                             "signed_area": [lb.signed_area for lb in self.lobes],
                             "area": [lb.area for lb in self.lobes],
                             "absolute_area": [lb.absolute_area for lb in self.lobes],
                             "faces": [lb.n_faces for lb in self.lobes]})

    def summary(self, max_lobes=5) -> str:
        """A short text report; says so when lobes of opposite sign cancel.

        Examples
        --------
        >>> import wedgepath as wp
        >>> print(wp.decompose([[0, 0], [1, 0], [1, 1], [0, 1]]).summary())
        1 face, 1 lobe
        signed area   1  (sum of winding x area)
        absolute area 1  (sum of |winding| x area)
        area by winding number: +1: 1
        lobe +1: signed area 1 (1 face)
        """
        lines = [f"{_plural(self.n_faces, 'face')}, {_plural(len(self.lobes), 'lobe')}",
                 f"signed area   {self.signed_area:.6g}  (sum of winding x area)",
                 f"absolute area {self.absolute_area:.6g}  (sum of |winding| x area)"]
        if self.area_by_winding:
            shown = ", ".join(f"{k:+d}: {v:.4g}" for k, v in self.area_by_winding.items())
            lines.append(f"area by winding number: {shown}")
        for lobe in self.lobes[:max_lobes]:
            lines.append(f"lobe {lobe.sign:+d}: signed area {lobe.signed_area:.6g} "
                         f"({_plural(lobe.n_faces, 'face')})")
        rest = self.lobes[max_lobes:]
        if rest:
            a = sum(lb.absolute_area for lb in rest)
            share = a / self.absolute_area if self.absolute_area else 0.0
            lines.append(f"... and {_plural(len(rest), 'smaller lobe')} "
                         f"({share:.2%} of the absolute area)")
        if self.mixed_signs:
            lines.append(_cancellation_note(self.cancellation))
        bad = self.diagnostics.get("inconsistent_adjacencies", 0)
        if bad:
            lines.append(f"WARNING: {bad} face adjacencies disagree with the windings")
        return "\n".join(lines)

    def __str__(self):
        return self.summary()

    def _summary_items(self):
        items = [("faces", str(self.n_faces)), ("lobes", str(len(self.lobes))),
                 ("signed_area", fmt_number(self.signed_area)),
                 ("absolute_area", fmt_number(self.absolute_area))]
        if self.mixed_signs:
            items += [("mixed_signs", "True"), ("cancellation", f"{self.cancellation:.3g}")]
        return items


def _cancellation_note(cancellation):
    """The summary's line on lobes of opposite sign (what share of the area cancels)."""
    pct = 100.0 * cancellation
    if pct >= 0.05:
        return (f"NOTE: lobes of opposite sign: {pct:.1f}% of the absolute area cancels out "
                "in the net signed area")
    return ("NOTE: lobes of opposite sign, too small to matter: less than 0.05% of the absolute "
            "area cancels out in the net signed area")


def _plural(n, word):
    return f"{n} {word}" if n == 1 else f"{n} {word}s"


# --------------------------------------------------------------------------- entry point
def decompose(path2d, closure="chord", *, max_crossings=MAX_CROSSINGS,
              progress=None) -> Decomposition:
    """Split the region of a closed planar curve into faces with winding numbers.

    Parameters
    ----------
    path2d : Path or array_like, shape (T, 2)
        A planar curve; for an n-channel path pass ``path.plane(i, j)``.
        NaN rows split it into pieces, each closed on its own; the pieces
        share one arrangement and their winding numbers add up.
    closure : {"chord", "detrend", "require", "none"}
        How open pieces are closed (default ``"chord"``).
    max_crossings : int or None
        Refuse (:class:`ArrangementTooLarge`, a ``ValueError``) a curve that
        crosses itself more often than this, before building anything
        (default 500,000: about 1.7 GB and half a minute on the development
        machine; the arrangement costs about 3.5 kB and 55 microseconds per
        crossing).  ``None``: no limit.
    progress : bool or None
        Name the stages on standard error: ``None`` (default) only for large
        arrangements (20,000 crossings or 200,000 segments and more) and
        only on a terminal, ``False`` never, ``True`` always.

    Returns
    -------
    Decomposition
        ``.faces`` (shapely polygons), ``.winding``, ``.areas``,
        ``.signed_area`` (equals :func:`signed_area`), ``.absolute_area``,
        ``.area_by_winding``, ``.lobes``, ``.mixed_signs``, ``summary()``,
        ``to_frame()`` (one row per face) and ``lobes_frame()``.

    Notes
    -----
    Winding numbers are assigned by walking the face adjacency from the
    unbounded face, not by testing a point of each face (see the module
    notes).  Degenerate curves are fine: repeated points and zero-length
    segments are dropped, back-tracking and repeated laps get their net
    multiplicity, and a collinear loop has no faces.

    Examples
    --------
    A figure-eight has two lobes of opposite sign and no net area:

    >>> import wedgepath as wp
    >>> d = wp.decompose([[0, 0], [2, 2], [2, 0], [0, 2]])
    >>> sorted(d.winding.tolist()), d.signed_area, d.absolute_area
    ([-1, 1], 0.0, 2.0)
    >>> d.mixed_signs, [lobe.sign for lobe in d.lobes]
    (True, [1, -1])
    >>> print(d.summary().splitlines()[-1])
    NOTE: lobes of opposite sign: 100.0% of the absolute area cancels out in the net signed area

    A square traced twice, counter-clockwise:

    >>> sq = [[0, 0], [1, 0], [1, 1], [0, 1]]
    >>> wp.decompose(sq + sq).area_by_winding
    {2: 1.0}
    """
    if max_crossings is not None:
        if isinstance(max_crossings, bool) or not isinstance(max_crossings, (int, np.integer)) \
                or max_crossings < 0:
            raise ValueError(f"max_crossings must be a whole number >= 0 or None, got "
                             f"{max_crossings!r}")
        max_crossings = int(max_crossings)
    check_progress(progress)
    path = planar_path(path2d, "decompose")
    meta = {"names": plane_names(path), "closure": closure}
    # "+ 0.0" turns -0.0 into 0.0: GEOS keeps one of two coordinates that compare
    # equal, and which one it keeps can change from call to call
    pieces = [drop_repeats(p) + 0.0 for p in closed_pieces(path, closure, "decompose")]
    pieces = [p for p in pieces if not _too_few_points(p)]
    # GEOS works in absolute terms: a curve of extreme magnitude is scaled by a
    # power of two (exact, so the arrangement is the same) and scaled back.
    e = -pow2_exponent(pieces, safe=_SAFE_EXP)
    if e:
        pieces = [pow2_scale(p, e) for p in pieces]
    # GEOS nodes in absolute coordinates: a curve far from the origin (relative to
    # its size) is moved next to it first, so that crossings a hair from a vertex
    # stay resolvable; faces are moved back at the end.
    shift = _local_origin(pieces)
    if shift is not None:
        pieces = [p - shift for p in pieces]
    with np.errstate(over="ignore", invalid="ignore", under="ignore"):
        shoelace = float(pow2_scale(sum(_piece_area(p) for p in pieces), -2 * e))
    shoelace = float(finite_result(shoelace, "decompose"))
    diagnostics = {"noding": "none", "multiplicities": "none", "inconsistent_adjacencies": 0,
                   "unreached_faces": 0}
    if not pieces:
        return _empty(shoelace, diagnostics, meta)

    # automatic (None): named only for large arrangements, decided once the crossings are counted
    with Stages("decompose", ["counting crossings", "noding", "faces and windings"],
                enabled=False if progress is None else progress) as stages:
        stages.start("counting crossings")
        cap = None if max_crossings is None else max(10 ** 7, 50 * max_crossings)
        count = count_crossings(pieces, limit=max_crossings, max_candidates=cap)
        if not count.complete or (max_crossings is not None and count.crossings > max_crossings):
            raise _too_large(count, max_crossings)
        if progress is None and (count.crossings >= _SLOW_CROSSINGS
                                 or count.segments >= _SLOW_SEGMENTS):
            stages.enabled = None           # automatic: on a terminal, unless switched off
        try:
            return _arrangement(path, closure, pieces, e, shift, shoelace, diagnostics, count,
                                stages, meta)
        except MemoryError:
            raise _out_of_memory(count, max_crossings) from None


def _arrangement(path, closure, pieces, e, shift, shoelace, diagnostics, count, stages, meta):
    """The faces, windings and lobes of the prepared pieces (see decompose)."""
    lines = shapely.linestrings(pieces[0]) if len(pieces) == 1 else \
        shapely.multilinestrings([shapely.linestrings(p) for p in pieces])
    allpts = np.concatenate(pieces)
    extent = float(np.ptp(allpts, axis=0).max())
    # rounding scale of the shoelace sum (eps times the sum of its terms' sizes), caller's units
    terms = 0.0
    for p in pieces:
        c = p - p[:-1].mean(axis=0)
        terms += float(np.sum(np.abs(c[:-1, 0] * c[1:, 1]) + np.abs(c[1:, 0] * c[:-1, 1])))
    noise = float(pow2_scale(64 * _EPS * terms, -2 * e))
    result = None
    geos_error = None
    stages.start("noding")
    # First GEOS's floating-point noder; if it fails (near-coincident laps
    # can defeat it) or its output is inconsistent, snap-rounding on
    # successively coarser grids, which always nodes.
    for grid in (None, *(extent * 2.0 ** -k for k in _SNAP_GRIDS)):
        try:
            # GEOS may raise floating-point flags on degenerate input (numpy turns
            # them into RuntimeWarnings); its output is checked for consistency below
            with np.errstate(all="ignore"):
                if grid is None:
                    noded = shapely.node(lines)
                else:
                    noded = shapely.unary_union(lines, grid_size=grid)
                faces = shapely.get_parts(shapely.polygonize([noded]))
        except shapely.errors.GEOSException as exc:
            geos_error = str(exc)
            if "bad_alloc" in geos_error or "memory" in geos_error.lower():
                raise MemoryError(geos_error) from None
            continue
        stages.start("faces and windings")
        diagnostics["noding"] = ("floating point" if grid is None
                                 else f"snap-rounded, grid {grid:.3g}")
        if faces.size == 0:
            diagnostics["multiplicities"] = "no faces"
            return _checked(_empty(shoelace, diagnostics, meta), noise)
        with np.errstate(over="ignore", invalid="ignore"):
            rings = _Rings(faces)
        finite_result(rings.face_area, "decompose")
        seg = _ordered_multiplicities(noded, pieces) if grid is None else None
        mode = "ordered"
        if seg is not None:
            result = _windings(rings, seg, faces.size)
        if seg is None or result["inconsistent"] or result["unmatched"]:
            seg = _matched_multiplicities(noded, pieces, 0.0 if grid is None else 2.0 * grid)
            mode = "matched"
            result = _windings(rings, seg, faces.size)
        if not (result["inconsistent"] or result["unmatched"] or result["unreached"].size):
            break
    if result is None:
        raise ValueError(f"decompose: GEOS could not node the curve at any snapping grid "
                         f"({count.segments:,} segments, {count.crossings:,} crossings; last "
                         f"GEOS error: {geos_error})")
    winding = result["winding"]
    unreached = result["unreached"]
    if unreached.size:
        # Safety net only (a face cut off from the unbounded face in the
        # adjacency graph): evaluate the winding number at a point inside it.
        from .winding import winding_number
        pts = shapely.get_coordinates(shapely.point_on_surface(faces[unreached]))
        if shift is not None:
            pts = pts + shift
        winding[unreached] = winding_number(path, pow2_scale(pts, -e), closure=closure)
    bad = int(result["inconsistent"] + result["unmatched"])
    diagnostics.update(multiplicities=mode, inconsistent_adjacencies=bad,
                       unreached_faces=int(unreached.size))
    if bad or unreached.size:
        warnings.warn(f"decompose: {bad} face adjacencies disagree with the assigned winding "
                      f"numbers and {unreached.size} faces were not reached from the outside; "
                      "the noding of this curve is not consistent (see .diagnostics)",
                      DecompositionWarning, stacklevel=3)
    face_area = rings.face_area
    if grid is not None:
        # snap-rounding can make -0.0 (see above): canonical zeros, identical calls alike
        faces = shapely.transform(faces, lambda c: c + 0.0)
    if shift is not None:
        faces = shapely.transform(faces, lambda c: c + shift)
    if e:
        face_area = finite_result(pow2_scale(face_area, -2 * e), "decompose")
        faces = shapely.transform(faces, lambda c: pow2_scale(c, -e))
    lobes = _lobes(faces, winding, face_area, result["pairs"], meta["names"])
    return _checked(Decomposition._build(faces, winding, face_area, lobes, shoelace, diagnostics,
                                         **meta), noise)


def _local_origin(pieces):
    """A point near the curve to work relative to, or None when the curve is near the origin.

    The centre of the bounding box, rounded to a multiple of a power of two about
    2**-20 of the extent, so that most coordinate differences are exact.
    """
    if not pieces:
        return None
    allpts = np.concatenate(pieces)
    lo, hi = allpts.min(axis=0), allpts.max(axis=0)
    extent = float((hi - lo).max())
    mid = 0.5 * lo + 0.5 * hi
    if extent == 0.0 or float(np.abs(mid).max()) <= extent:
        return None
    q = 2.0 ** (pow2_exponent(extent) - 20)
    return np.round(mid / q) * q


def _checked(dec, noise):
    """Warn when the faces do not account for the curve's shoelace area.

    Noding of extremely thin loops (aspect ratios near the float64 range)
    can lose faces when snap rounding is needed; the signed area is then
    still right in ``residual``'s other term but the faces are not.
    """
    shoelace = dec.signed_area - dec.residual
    if abs(dec.residual) > max(0.01 * max(abs(shoelace), dec.absolute_area), noise):
        warnings.warn(f"decompose: the faces account for {dec.signed_area:.6g} of the curve's "
                      f"signed area {shoelace:.6g} (residual {dec.residual:.3g}); the noding "
                      "of this curve lost faces (see .diagnostics)", DecompositionWarning,
                      stacklevel=4)
    return dec


def _empty(shoelace, diagnostics, meta):
    return Decomposition._build(np.empty(0, dtype=object), np.zeros(0, dtype=np.int64),
                                np.zeros(0), (), shoelace, diagnostics, **meta)


# --------------------------------------------------------------------------- rings of faces
class _Rings:
    """Directed ring segments of all faces, oriented to have their face on the left."""

    def __init__(self, faces):
        n = faces.size
        n_holes = shapely.get_num_interior_rings(faces)
        # A face without holes has one ring: read its coordinates directly.
        plain = np.flatnonzero(n_holes == 0)
        coords, ring = shapely.get_coordinates(faces[plain], return_index=True)
        ring_face, ring_hole = plain, np.zeros(plain.size, dtype=bool)
        holed = np.flatnonzero(n_holes > 0)
        if holed.size:
            owner = np.repeat(holed, n_holes[holed])
            k = np.arange(owner.size) - np.repeat(np.cumsum(n_holes[holed]) - n_holes[holed],
                                                  n_holes[holed])
            geoms = np.concatenate([shapely.get_exterior_ring(faces[holed]),
                                    shapely.get_interior_ring(faces[owner], k)])
            c2, r2 = shapely.get_coordinates(geoms, return_index=True)
            coords = np.concatenate([coords, c2])
            ring = np.concatenate([ring, r2 + plain.size])
            ring_face = np.concatenate([ring_face, holed, owner])
            ring_hole = np.concatenate([ring_hole, np.zeros(holed.size, dtype=bool),
                                        np.ones(owner.size, dtype=bool)])
        n_rings = ring_face.size
        first = np.searchsorted(ring, np.arange(n_rings))       # rings are closed: last == first
        last = np.r_[first[1:], ring.size] - 1
        same = ring[:-1] == ring[1:]
        a, b = coords[:-1][same], coords[1:][same]
        r = ring[:-1][same]
        # areas relative to each ring's first vertex: precise even for tiny faces
        origin = coords[first][r]
        ca, cb = a - origin, b - origin
        cross = ca[:, 0] * cb[:, 1] - cb[:, 0] * ca[:, 1]
        signed = 0.5 * np.bincount(r, weights=cross, minlength=n_rings)
        ring_area = np.abs(signed)
        turn = _lowest_turn(coords, ring, first, last)
        ccw = np.where(turn != 0, turn > 0, signed > 0)
        # the face is on the left of a ring segment when a shell runs
        # counter-clockwise or a hole clockwise
        left = np.where(ring_hole != ccw, 1, -1)
        self.face_area = np.bincount(ring_face, weights=np.where(ring_hole, -ring_area, ring_area),
                                     minlength=n)
        self.a, self.b = a, b
        self.face = ring_face[r]
        self.left = left[r]


def _lowest_turn(coords, ring, first, last):
    """Exact orientation (+1/-1, 0 if degenerate) of closed rings at their lowest vertex.

    At the lowest (then leftmost) vertex of a simple ring the turn is convex,
    so its exact orientation sign is the ring's orientation; this stays right
    for slivers whose computed area is lost in rounding.
    """
    n_rings = first.size
    x = coords[:, 0]
    y = coords[:, 1].copy()
    y[last] = np.inf                          # ignore the repeated closing vertex
    ymin = np.minimum.reduceat(y, first)
    cand = y == ymin[ring]
    xm = np.where(cand, x, np.inf)
    xmin = np.minimum.reduceat(xm, first)
    hit = np.flatnonzero(cand & (x == xmin[ring]))
    low = hit[np.searchsorted(ring[hit], np.arange(n_rings))]
    count = last - first                      # distinct vertices per ring
    pos = low - first
    prv = first + (pos - 1) % count
    nxt = first + (pos + 1) % count
    return orient_sign(coords[prv, 0], coords[prv, 1], coords[low, 0], coords[low, 1],
                       coords[nxt, 0], coords[nxt, 1])


# --------------------------------------------------------------------------- multiplicities
class _NodedSegments:
    """Noded segments ``a -> b`` with the net number of times the curve runs a -> b."""

    def __init__(self, a, b, mult):
        self.a, self.b, self.mult = a, b, mult


def _ordered_multiplicities(noded, pieces):
    """Each noded segment once, in the curve's direction, if the noder kept them all."""
    if len(pieces) == 1:
        c = shapely.get_coordinates(noded)
        a, b = c[:-1], c[1:]
        keep = np.any(a != b, axis=1)   # joints between consecutive parts
        a, b = a[keep], b[keep]
    else:
        parts = shapely.get_parts(noded)
        c, idx = shapely.get_coordinates(parts, return_index=True)
        same = idx[:-1] == idx[1:]
        a, b = c[:-1][same], c[1:][same]
        keep = np.any(a != b, axis=1)
        a, b = a[keep], b[keep]
    noded_len = float(np.hypot(*(b - a).T).sum())
    orig_len = float(sum(np.hypot(*np.diff(p, axis=0).T).sum() for p in pieces))
    if abs(noded_len - orig_len) > 1e-9 * orig_len:
        return None
    return _NodedSegments(a, b, np.ones(a.shape[0], dtype=np.int64))


def _matched_multiplicities(noded, pieces, tol=0.0):
    """Net multiplicities from the original segments that contain each noded part.

    ``tol`` is the distance within which a noded segment counts as lying on
    an original one (at least a few thousand rounding units of the
    coordinates; twice the grid after snap-rounding).
    """
    parts = shapely.get_parts(noded)
    c, idx = shapely.get_coordinates(parts, return_index=True)
    same = idx[:-1] == idx[1:]
    a, b = c[:-1][same], c[1:][same]
    part = idx[:-1][same]
    keep = np.any(a != b, axis=1)
    a, b, part = a[keep], b[keep], part[keep]
    if not a.size:
        return _NodedSegments(a, b, np.zeros(0, dtype=np.int64))
    # one representative segment per part: its first one
    first = np.flatnonzero(np.r_[True, part[1:] != part[:-1]])
    pa, pb, pid = a[first], b[first], part[first]
    oa = np.concatenate([p[:-1] for p in pieces])
    ob = np.concatenate([p[1:] for p in pieces])
    scale = float(np.abs(np.concatenate([oa, pa])).max()) or 1.0
    tol = max(tol, 1e4 * _EPS * scale)
    tree = shapely.STRtree(shapely.linestrings(np.stack([oa, ob], axis=1)))
    mid = 0.5 * (pa + pb)
    qi, oi = tree.query(shapely.points(mid), predicate="dwithin", distance=tol)
    d = ob[oi] - oa[oi]
    dd = np.einsum("ij,ij->i", d, d)
    # both ends of the noded segment must lie on the original segment's line
    ok = np.ones(qi.size, dtype=bool)
    for p in (pa[qi], pb[qi]):
        rel = p - oa[oi]
        cr = d[:, 0] * rel[:, 1] - d[:, 1] * rel[:, 0]
        ok &= np.abs(cr) <= tol * np.sqrt(dd)
    qi, oi = qi[ok], oi[ok]
    sgn = np.sign(np.einsum("ij,ij->i", ob[oi] - oa[oi], pb[qi] - pa[qi])).astype(np.int64)
    part_mult = np.zeros(int(part.max()) + 1, dtype=np.int64)
    np.add.at(part_mult, pid[qi], sgn)
    return _NodedSegments(a, b, part_mult[part])


# --------------------------------------------------------------------------- windings
def _complex(xy):
    z = np.empty(xy.shape[0], dtype=np.complex128)
    z.real = xy[:, 0]
    z.imag = xy[:, 1]
    return z


_M1 = np.uint64(0xBF58476D1CE4E5B9)
_M2 = np.uint64(0x94D049BB133111EB)
_C1 = np.uint64(0x9E3779B97F4A7C15)


def _fmix(z):
    """SplitMix64 finaliser (a bijective 64-bit mixer); wraps modulo 2**64."""
    z = (z ^ (z >> np.uint64(30))) * _M1
    z = (z ^ (z >> np.uint64(27))) * _M2
    return z ^ (z >> np.uint64(31))


def _vertex_hash(xy):
    bits = np.ascontiguousarray(xy + 0.0).view(np.uint64)   # + 0.0 folds -0.0 into 0.0
    return _fmix(bits[:, 0] ^ _fmix(bits[:, 1] + _C1))


def _hashed_keys(a, b):
    """Undirected 64-bit segment keys; ``fwd``: a -> b is the canonical direction."""
    ha, hb = _vertex_hash(a), _vertex_hash(b)
    key = _fmix(np.minimum(ha, hb) ^ _fmix(np.maximum(ha, hb) + _C1))
    return key, ha < hb, ha != hb


def _exact_keys(seg, rings):
    verts = np.unique(_complex(np.concatenate([seg.a, seg.b])))
    nv = np.int64(verts.size + 1)

    def vid(xy):
        z = _complex(xy)
        i = np.minimum(np.searchsorted(verts, z), verts.size - 1)
        return np.where(verts[i] == z, i, -1).astype(np.int64)

    out = []
    for a, b in ((seg.a, seg.b), (rings.a, rings.b)):
        va, vb = vid(a), vid(b)
        out.append((np.minimum(va, vb) * nv + np.maximum(va, vb), va < vb,
                    (va >= 0) & (vb >= 0)))
    return out


def _same_segment(a1, b1, a2, b2):
    return (np.all(a1 == a2, axis=1) & np.all(b1 == b2, axis=1)) | \
        (np.all(a1 == b2, axis=1) & np.all(b1 == a2, axis=1))


def _ring_differences(rings: _Rings, seg: _NodedSegments, exact: bool):
    """Per ring segment: key, found flag and w(face) - w(face across); None on a hash collision."""
    if exact:
        (nkey, nfwd, _), (rkey, rfwd, rok) = _exact_keys(seg, rings)
    else:
        nkey, nfwd, _ = _hashed_keys(seg.a, seg.b)
        rkey, rfwd, rok = _hashed_keys(rings.a, rings.b)
    # net multiplicity along the canonical direction, summed over equal keys
    mult = np.where(nfwd, seg.mult, -seg.mult)
    order = np.argsort(nkey, kind="stable")
    nk = nkey[order]
    starts = np.flatnonzero(np.r_[True, nk[1:] != nk[:-1]])
    nkeys = nk[starts]
    nmult = np.add.reduceat(mult[order], starts) if starts.size else mult[:0]
    rep = order[starts]
    if not exact:
        group = np.repeat(np.arange(starts.size), np.diff(np.r_[starts, nk.size]))
        if not _same_segment(seg.a[order], seg.b[order], seg.a[rep[group]],
                             seg.b[rep[group]]).all():
            return None
    pos = np.minimum(np.searchsorted(nkeys, rkey), max(nkeys.size - 1, 0))
    found = (nkeys[pos] == rkey) & rok if nkeys.size else np.zeros(rkey.size, dtype=bool)
    if not exact and found.any():
        f = np.flatnonzero(found)
        if not _same_segment(rings.a[f], rings.b[f], seg.a[rep[pos[f]]],
                             seg.b[rep[pos[f]]]).all():
            return None
    # w(face) - w(face on the other side) = m * (+1 if the face is left of the canonical direction)
    side = rings.left * np.where(rfwd, 1, -1)
    diff = np.where(found, nmult[pos] * side if nkeys.size else 0, 0)
    return rkey, found, diff


def _windings(rings: _Rings, seg: _NodedSegments, n_faces: int):
    got = _ring_differences(rings, seg, exact=False)
    if got is not None:
        rkey, found, diff = got
        # the two sides of a segment must be the same segment (no key collision)
        order = np.argsort(rkey, kind="stable")
        k_sorted = rkey[order]
        pair = np.flatnonzero(k_sorted[1:] == k_sorted[:-1])
        i, j = order[pair], order[pair + 1]
        if not _same_segment(rings.a[i], rings.b[i], rings.a[j], rings.b[j]).all():
            got = None
    if got is None:
        rkey, found, diff = _ring_differences(rings, seg, exact=True)
        order = np.argsort(rkey, kind="stable")
        k_sorted = rkey[order]
    unmatched = int((~found).sum())

    # pair the two sides of each segment; a lone side borders the unbounded face
    starts = np.flatnonzero(np.r_[True, k_sorted[1:] != k_sorted[:-1]])
    sizes = np.diff(np.r_[starts, k_sorted.size])
    ext = n_faces
    first = order[starts]
    second = np.where(sizes >= 2, order[np.minimum(starts + 1, k_sorted.size - 1)], -1)
    F = rings.face[first]
    G = np.where(second >= 0, rings.face[np.maximum(second, 0)], ext)
    D = diff[first]
    extra = int((sizes > 2).sum())
    # the second side must agree: w(G) - w(F) = -D
    disagree = int(((second >= 0) & (diff[np.maximum(second, 0)] != -D)).sum())

    # breadth-first walk from the unbounded face
    n = n_faces + 1
    off = F != G
    graph = coo_matrix((np.ones(int(off.sum())), (F[off], G[off])), shape=(n, n)).tocsr()
    order_bfs, pred = breadth_first_order(graph, ext, directed=False, return_predecessors=True)
    reached = np.zeros(n, dtype=bool)
    reached[order_bfs] = True
    # look-up of D for an ordered pair (u, v): w(u) - w(v)
    pk = np.concatenate([F * n + G, G * n + F])
    pv = np.concatenate([D, -D])
    srt = np.argsort(pk, kind="stable")
    pk, pv = pk[srt], pv[srt]
    anc = np.where(pred >= 0, pred, np.arange(n))
    node = np.arange(n)
    tree_key = node * n + anc
    j = np.minimum(np.searchsorted(pk, tree_key), pk.size - 1)
    acc = np.where(pred >= 0, pv[j], 0).astype(np.int64)
    # pointer jumping: acc[v] becomes w(v) - w(root)
    while True:
        nxt = anc[anc]
        if np.array_equal(nxt, anc):
            break
        acc = acc + np.where(anc != nxt, acc[anc], 0)
        anc = nxt
    winding = acc[:n_faces].copy()
    check = np.r_[winding, 0]
    inconsistent = int(((check[F] - check[G]) != D).sum()) + disagree + extra
    unreached = np.flatnonzero(~reached[:n_faces])
    return {"winding": winding, "inconsistent": inconsistent, "unmatched": unmatched,
            "unreached": unreached, "pairs": (F, G)}


# --------------------------------------------------------------------------- lobes
def _lobes(faces, winding, areas, pairs, names):
    F, G = pairs
    n = faces.size
    sign = np.sign(winding)
    inner = (F < n) & (G < n)
    F, G = F[inner], G[inner]
    same = (sign[F] == sign[G]) & (sign[F] != 0)
    graph = coo_matrix((np.ones(int(same.sum())), (F[same], G[same])), shape=(n, n)).tocsr()
    _, label = connected_components(graph, directed=False)
    nonzero = np.flatnonzero(sign != 0)
    if not nonzero.size:
        return ()
    lab = label[nonzero]
    order = np.argsort(lab, kind="stable")
    members = nonzero[order]
    cuts = np.flatnonzero(np.diff(lab[order])) + 1
    groups = np.split(members, cuts)
    lobes = [Lobe._build(sign[g[0]], g, faces[g], winding[g], areas[g], names) for g in groups]
    lobes.sort(key=lambda lb: -abs(lb.signed_area))
    return lobes
