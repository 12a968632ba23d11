"""Lead and lag across many signals: area matrices, cyclic order, rolling and streaming."""

from ._kernel import ConstantChannelWarning
from .align import align
from .areas import NORMALIZATIONS, AreaMatrix, area_matrix, hilbert_energy
from .order import CyclicOrder, cyclic_order

__all__ = ["area_matrix", "AreaMatrix", "NORMALIZATIONS", "hilbert_energy", "align",
           "ConstantChannelWarning", "cyclic_order", "CyclicOrder"]
