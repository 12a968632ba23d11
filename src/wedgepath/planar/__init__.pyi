# Generated from the export table of wedgepath/__init__.py by tests/test_stubs.py;
# do not edit.  Type checkers and editors read this; Python loads the names
# lazily (see the module docstring of wedgepath/__init__.py).

from .area import signed_area as signed_area, region_moments as region_moments, RegionMoments as RegionMoments
from .winding import winding_number as winding_number
from .green import region_integral as region_integral
from .arrangement import decompose as decompose, Decomposition as Decomposition, Lobe as Lobe, DecompositionWarning as DecompositionWarning, ArrangementTooLarge as ArrangementTooLarge

__all__ = ['signed_area', 'region_moments', 'RegionMoments', 'winding_number', 'region_integral', 'decompose', 'Decomposition', 'Lobe', 'DecompositionWarning', 'ArrangementTooLarge']
