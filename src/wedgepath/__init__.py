"""wedgepath: discrete exterior calculus on sampled curves.

Sampled curves are 1-chains (:class:`Path`, :class:`Chain`); differential
forms (:func:`dx`, :class:`OneForm`, :class:`TwoForm`, ``^``, ``.d()``) are
integrated over them with :func:`integrate`, exactly where possible and with
an error estimate where not.  See the user guide in ``docs/`` for the
conventions (orientation, closure, curve model, gaps).

Every public name is loaded on first use (a PEP 562 module ``__getattr__``):
``import wedgepath`` itself imports nothing, and no package ``__init__`` of
wedgepath imports a module of its own package.  That keeps the import cheap
and makes first imports from several threads at once safe (Python takes a
module's import lock before its parents', so a package whose ``__init__``
imports its submodules can deadlock when two threads import two of them at
the same time, as the worker threads of a Dask cluster do when unpickling).
``tests/test_architecture.py`` checks both.
"""

import importlib as _importlib

__version__ = "0.1.0.dev0"

#: Where each public name lives: ``{package: {module: names}}``.  A name that is
#: ``None`` in place of a tuple is the module itself.  The ``__all__`` of each
#: package below is made from this table, in this order.
_EXPORTS = {
    "calculus": {
        "paths": ("Path", "as_path", "CLOSURES"),
        "chains": ("Chain", "ZeroChain"),
        "forms": ("Form", "ZeroForm", "OneForm", "TwoForm", "dx"),
        "integration": ("integrate",),
        "integral": ("Integral", "IntegrationWarning"),
        "simplicial": ("SimplicialChain", "cone"),
        "complexes": ("SimplicialComplex", "WhitneyForm"),
        "simplex_quadrature": ("grundmann_moller",),
    },
    "planar": {
        "area": ("signed_area", "region_moments", "RegionMoments"),
        "winding": ("winding_number",),
        "green": ("region_integral",),
        "arrangement": ("decompose", "Decomposition", "Lobe", "DecompositionWarning",
                        "ArrangementTooLarge"),
    },
    "signals": {
        "areas": ("area_matrix", "AreaMatrix", "NORMALIZATIONS", "hilbert_energy"),
        "_kernel": ("ConstantChannelWarning", "ShapeWarning"),
        "alignment": ("align",),
        "order": ("cyclic_order", "CyclicOrder", "noise_fit_baseline"),
        "rolling": ("rolling_area_matrix", "RollingAreas"),
        "streaming": ("AreaAccumulator",),
        "significance": ("surrogate_test", "SurrogateResult", "SURROGATE_METHODS",
                         "bootstrap_area", "BootstrapResult", "benjamini_hochberg",
                         "decorrelation_lag", "SurrogateWarning"),
        "cycles": ("cycle_areas", "CycleAreas"),
        "loops": ("loop_cycles", "LoopCycles", "LOOP_KINDS"),
        "segment": ("CycleLengthWarning",),
        "rainflow_count": ("rainflow", "RainflowCycles"),
        "pairs": ("pair_table",),
        "verdicts": ("fit_test", "FitTest", "drift_check", "DriftCheck", "DriftWarning"),
        "lags": ("reference_lags", "ReferenceLags"),
        "filters": None,
        "spectrum": ("lead_spectrum", "LeadSpectrum", "band_surrogate_test", "BandSignificance",
                     "rolling_lead_spectrum", "RollingSpectrum", "ResamplingWarning"),
    },
}

# the calculus names that are also top-level names (as_path and grundmann_moller are not)
_TOP_CALCULUS = ("Path", "Chain", "ZeroChain", "Form", "ZeroForm", "OneForm", "TwoForm", "dx",
                 "integrate", "Integral", "IntegrationWarning", "CLOSURES", "SimplicialChain",
                 "SimplicialComplex", "WhitneyForm", "cone")

# submodules loaded on first use as attributes (``wp.symbolic``, ``wp.plotting``, ...)
_MODULES = ("calculus", "planar", "signals", "symbolic", "formula", "plotting", "report", "io")


def _names(table):
    return [m if names is None else n for m, names in table.items() for n in (names or (None,))]


def _attach(package):
    """``(__getattr__, __dir__, __all__)`` of the lazy package ``wedgepath.<package>``."""
    table = _EXPORTS[package]
    where = {}
    for mod, names in table.items():
        for n in (mod,) if names is None else names:
            where[n] = mod
    full = f"{__name__}.{package}"
    exported = _names(table)

    def __getattr__(name):
        mod = where.get(name)
        if mod is None:
            raise AttributeError(f"module {full!r} has no attribute {name!r}")
        module = _importlib.import_module(f"{full}.{mod}")
        value = module if table[mod] is None else getattr(module, name)
        _globals_of(full)[name] = value      # later look-ups skip __getattr__
        return value

    def __dir__():
        return sorted(set(_globals_of(full)) | set(exported))

    return __getattr__, __dir__, exported


def _globals_of(name):
    """The namespace of an imported module (to cache a lazily loaded name in it)."""
    import sys

    return vars(sys.modules[name])


_TOP = {**{n: "calculus" for n in _TOP_CALCULUS},
        **{n: "planar" for n in _names(_EXPORTS["planar"])},
        **{n: "signals" for n in _names(_EXPORTS["signals"])}}

__all__ = [*_TOP_CALCULUS, "__version__",
           *_names(_EXPORTS["planar"]), *_names(_EXPORTS["signals"])]


def __getattr__(name):
    if name in _MODULES:
        return _importlib.import_module(f"{__name__}.{name}")
    pkg = _TOP.get(name)
    if pkg is None:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    value = getattr(_importlib.import_module(f"{__name__}.{pkg}"), name)
    globals()[name] = value
    return value


def __dir__():
    return sorted(set(globals()) | set(__all__) | set(_MODULES))
