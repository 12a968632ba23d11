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

# Names load on first use from the table in wedgepath/__init__.py (this __init__ imports
# no module of its own package: see the note there on imports from several threads).
from .. import _attach

__getattr__, __dir__, __all__ = _attach("signals")
