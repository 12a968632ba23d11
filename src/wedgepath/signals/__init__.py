"""Lead and lag across many signals: area matrices, cyclic order, rolling and streaming.

Given n recorded signals, the area matrix ``A[i, j] = (1/2)∮(x_i dx_j - x_j dx_i)``
says which leads which (``A[i, j] > 0``: channel i leads channel j), how
strongly (its normalisations), in what cyclic order the channels move
(:func:`cyclic_order`), whether it is more than chance
(:func:`surrogate_test`, :func:`bootstrap_area`), how it changes over time
(:func:`rolling_area_matrix`, :class:`AreaAccumulator`) and what each cycle of
a loop contributes (:func:`cycle_areas`), and which frequency band carries
each lead (:func:`lead_spectrum`).  :func:`pair_table` puts a matrix,
its significance and its intervals into one table.  Every result is a
labelled value with ``to_frame()`` (see ``docs/conventions.md``).  See
``docs/signals.md``.
"""

from ._kernel import ConstantChannelWarning, ShapeWarning
from .align import align
from .areas import NORMALIZATIONS, AreaMatrix, area_matrix, hilbert_energy
from .cycles import CycleAreas, cycle_areas
from .loops import LOOP_KINDS, LoopCycles, loop_cycles
from .rainflow import RainflowCycles, rainflow
from .segment import CycleLengthWarning
from .order import CyclicOrder, cyclic_order, noise_fit_baseline
from .pairs import pair_table
from .rolling import RollingAreas, rolling_area_matrix
from .significance import (SURROGATE_METHODS, BootstrapResult, SurrogateResult,
                           SurrogateWarning, benjamini_hochberg, bootstrap_area, decorrelation_lag,
                           surrogate_test)
from .spectrum import (BandSignificance, LeadSpectrum, ResamplingWarning, RollingSpectrum,
                       band_surrogate_test, lead_spectrum, rolling_lead_spectrum)
from .streaming import AreaAccumulator
from . import filters
from .lags import ReferenceLags, reference_lags
from .verdicts import DriftCheck, DriftWarning, FitTest, drift_check, fit_test

__all__ = [
    # the area matrix
    "area_matrix", "AreaMatrix", "NORMALIZATIONS", "hilbert_energy", "ConstantChannelWarning",
    "ShapeWarning", "align",
    # structure
    "cyclic_order", "CyclicOrder", "noise_fit_baseline",
    # over time
    "rolling_area_matrix", "RollingAreas", "AreaAccumulator",
    # significance
    "surrogate_test", "SurrogateResult", "SURROGATE_METHODS", "bootstrap_area",
    "BootstrapResult", "benjamini_hochberg", "decorrelation_lag", "SurrogateWarning",
    # per-cycle loops
    "cycle_areas", "CycleAreas", "loop_cycles", "LoopCycles", "LOOP_KINDS", "CycleLengthWarning",
    "rainflow", "RainflowCycles",
    # the table of pairs
    "pair_table",
    # calibrated verdicts and honest reading (docs/signals.md, "reading lead-lag honestly")
    "fit_test", "FitTest", "drift_check", "DriftCheck", "DriftWarning", "reference_lags",
    "ReferenceLags", "filters",
    # by frequency
    "lead_spectrum", "LeadSpectrum", "band_surrogate_test", "BandSignificance",
    "rolling_lead_spectrum", "RollingSpectrum", "ResamplingWarning",
]
