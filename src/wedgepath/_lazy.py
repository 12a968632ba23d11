"""Heavy modules loaded on first use, so that ``import wedgepath`` stays light.

sympy (about 50 MB and half a second to import) is needed only for symbolic
coefficients and oracles; a streamed lead-lag table from the command line never
touches it.  ``sympy`` here is a stand-in whose attributes import the real
module; :func:`is_sympy` answers ``isinstance(obj, sympy.<cls>)`` without
importing anything, since no object can be a sympy object unless sympy is
already loaded.
"""

from __future__ import annotations

import importlib
import sys


class LazyModule:
    """A module imported when one of its attributes is first read."""

    __slots__ = ("_name",)

    def __init__(self, name):
        object.__setattr__(self, "_name", name)

    def __getattr__(self, attr):
        return getattr(importlib.import_module(self._name), attr)

    def __repr__(self):
        return f"<module {self._name!r}, imported on first use>"


sympy = LazyModule("sympy")


def is_sympy(obj, cls="Basic"):
    """``isinstance(obj, sympy.<cls>)``, False without importing sympy when it is not loaded."""
    mod = sys.modules.get("sympy")
    return mod is not None and isinstance(obj, getattr(mod, cls))
