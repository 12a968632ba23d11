"""wedgepath: discrete exterior calculus on sampled curves.

Sampled curves are 1-chains (:class:`Path`, :class:`Chain`); differential
forms (:func:`dx`, :class:`OneForm`, :class:`TwoForm`, ``^``, ``.d()``) are
integrated over them with :func:`integrate`, exactly where possible and with
an error estimate where not.  See the user guide in ``docs/`` for the
conventions (orientation, closure, curve model, gaps).
"""

from .calculus import (CLOSURES, Chain, Form, Integral, IntegrationWarning, OneForm, Path,
                       SimplicialChain, SimplicialComplex, TwoForm, WhitneyForm, ZeroChain,
                       ZeroForm, cone, dx, integrate)

from . import planar, signals
from .planar import *  # noqa: F401,F403  (names listed in planar.__all__)
from .signals import *  # noqa: F401,F403  (names listed in signals.__all__)

__version__ = "0.1.0.dev0"

__all__ = ["Path", "Chain", "ZeroChain", "Form", "ZeroForm", "OneForm", "TwoForm", "dx",
           "integrate", "Integral", "IntegrationWarning", "CLOSURES", "__version__",
           "SimplicialChain", "SimplicialComplex", "WhitneyForm", "cone",
           *planar.__all__, *signals.__all__]


def __getattr__(name):
    # modules loaded on first use, so that ``import wedgepath`` imports neither sympy
    # (``wp.symbolic``, ``wp.formula``) nor matplotlib and pandas (``wp.plotting``,
    # ``wp.report``)
    if name in ("symbolic", "formula", "plotting", "report", "io"):
        import importlib

        return importlib.import_module(f"{__name__}.{name}")
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")

