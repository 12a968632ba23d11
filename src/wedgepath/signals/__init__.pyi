# Generated from the export table of wedgepath/__init__.py by tests/test_stubs.py;
# do not edit.  Type checkers and editors read this; Python loads the names
# lazily (see the module docstring of wedgepath/__init__.py).

from .areas import area_matrix as area_matrix, AreaMatrix as AreaMatrix, NORMALIZATIONS as NORMALIZATIONS, hilbert_energy as hilbert_energy
from ._kernel import ConstantChannelWarning as ConstantChannelWarning, ShapeWarning as ShapeWarning
from .alignment import align as align
from .order import cyclic_order as cyclic_order, CyclicOrder as CyclicOrder, noise_fit_baseline as noise_fit_baseline
from .rolling import rolling_area_matrix as rolling_area_matrix, RollingAreas as RollingAreas
from .streaming import AreaAccumulator as AreaAccumulator
from .significance import surrogate_test as surrogate_test, SurrogateResult as SurrogateResult, SURROGATE_METHODS as SURROGATE_METHODS, bootstrap_area as bootstrap_area, BootstrapResult as BootstrapResult, benjamini_hochberg as benjamini_hochberg, decorrelation_lag as decorrelation_lag, SurrogateWarning as SurrogateWarning
from .cycles import cycle_areas as cycle_areas, CycleAreas as CycleAreas
from .loops import loop_cycles as loop_cycles, LoopCycles as LoopCycles, LOOP_KINDS as LOOP_KINDS
from .segment import CycleLengthWarning as CycleLengthWarning
from .rainflow_count import rainflow as rainflow, RainflowCycles as RainflowCycles
from .pairs import pair_table as pair_table
from .verdicts import fit_test as fit_test, FitTest as FitTest, drift_check as drift_check, DriftCheck as DriftCheck, DriftWarning as DriftWarning
from .lags import reference_lags as reference_lags, ReferenceLags as ReferenceLags
from . import filters as filters
from .spectrum import lead_spectrum as lead_spectrum, LeadSpectrum as LeadSpectrum, band_surrogate_test as band_surrogate_test, BandSignificance as BandSignificance, rolling_lead_spectrum as rolling_lead_spectrum, RollingSpectrum as RollingSpectrum, ResamplingWarning as ResamplingWarning

__all__ = ['area_matrix', 'AreaMatrix', 'NORMALIZATIONS', 'hilbert_energy', 'ConstantChannelWarning', 'ShapeWarning', 'align', 'cyclic_order', 'CyclicOrder', 'noise_fit_baseline', 'rolling_area_matrix', 'RollingAreas', 'AreaAccumulator', 'surrogate_test', 'SurrogateResult', 'SURROGATE_METHODS', 'bootstrap_area', 'BootstrapResult', 'benjamini_hochberg', 'decorrelation_lag', 'SurrogateWarning', 'cycle_areas', 'CycleAreas', 'loop_cycles', 'LoopCycles', 'LOOP_KINDS', 'CycleLengthWarning', 'rainflow', 'RainflowCycles', 'pair_table', 'fit_test', 'FitTest', 'drift_check', 'DriftCheck', 'DriftWarning', 'reference_lags', 'ReferenceLags', 'filters', 'lead_spectrum', 'LeadSpectrum', 'band_surrogate_test', 'BandSignificance', 'rolling_lead_spectrum', 'RollingSpectrum', 'ResamplingWarning']
