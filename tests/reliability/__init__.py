"""The rows of the bad-input table (issue 8): what every public call does with bad input.

Every row names a public call, the class of bad input, what was passed, and the documented
outcome -- the exception type and a fragment its one-line message must contain, or a
documented result checked against a value stated here (never one computed by the library).
The rows live by feature, one module each (``calculus``, ``planar``, ``signals``,
``symbolic``, ``tables``, ``plotting``, ``command_line``, ``dask``); importing this package
collects them, in that order, into ``ROWS``.

Used by ``tests/test_reliability_table.py`` (one test per row, and the check that every
public callable has rows) and by ``docs/reliability_table.py``, which renders the table of
docs/reliability.md from ``ROWS`` and ``CLASSES`` (``make reliability-table``).
"""

from . import calculus, planar, signals, symbolic, tables, plotting, command_line  # noqa: F401
from . import dask as _dask
from ._table import CLASSES, ROWS, Row

wdask = _dask.wdask

__all__ = ["CLASSES", "ROWS", "Row", "wdask"]
