"""Paths, chains, forms and their integrals: the base layer of wedgepath."""

# Names load on first use from the table in wedgepath/__init__.py (this __init__ imports
# no module of its own package: see the note there on imports from several threads).
from .. import _attach

__getattr__, __dir__, __all__ = _attach("calculus")
