"""Planar regions of loops: signed area, winding numbers, Green region integrals, decomposition.

Every function here takes a planar curve: a 2-channel :class:`~wedgepath.Path`
or a ``(T, 2)`` array (for an n-channel path, select a coordinate plane with
``path.plane(i, j)``).  Conventions shared by all of them:

* Orientation: counter-clockwise travel is positive; region quantities are
  integrals weighted by the winding number ``w(x, y)``.
* Closure: region quantities close each open piece with ``closure="chord"``
  by default; ``closure="none"`` refuses open pieces with a clear error.
* Gaps: NaN rows split a path into pieces, each closed on its own; results
  add up.

Region integrals share their engine with :func:`wedgepath.integrate` (a 2-form
``f dx0^dx1`` over a planar path): Green's theorem lives in the calculus layer
(:mod:`wedgepath.calculus.green`), and :func:`region_integral` is its public
planar wrapper.
"""

# Names load on first use from the table in wedgepath/__init__.py (this __init__ imports
# no module of its own package: see the note there on imports from several threads).
from .. import _attach

__getattr__, __dir__, __all__ = _attach("planar")
