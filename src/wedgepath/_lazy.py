"""Type tests for heavy modules that must not be imported to answer them.

sympy (about 50 MB and half a second to import) is needed only for symbolic
coefficients and oracles; a streamed lead-lag table from the command line never
touches it.  Modules that use sympy import it inside the functions that need it
(plain function-level imports; ``wedgepath.symbolic`` and ``wedgepath.formula``
load on first use through the package's module ``__getattr__``).

:func:`is_sympy` answers ``isinstance(obj, sympy.<cls>)`` without importing
anything, since no object can be a sympy object unless sympy is already loaded.
"""

from __future__ import annotations

import sys

__all__ = ["is_sympy"]


def is_sympy(obj, cls="Basic"):
    """``isinstance(obj, sympy.<cls>)``, False without importing sympy when it is not loaded."""
    mod = sys.modules.get("sympy")
    return mod is not None and isinstance(obj, getattr(mod, cls))
