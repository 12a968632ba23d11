# Generated from the export table of wedgepath/__init__.py by tests/test_stubs.py;
# do not edit.  Type checkers and editors read this; Python loads the names
# lazily (see the module docstring of wedgepath/__init__.py).

from .paths import Path as Path, as_path as as_path, CLOSURES as CLOSURES
from .chains import Chain as Chain, ZeroChain as ZeroChain
from .forms import Form as Form, ZeroForm as ZeroForm, OneForm as OneForm, TwoForm as TwoForm, dx as dx
from .integration import integrate as integrate
from .integral import Integral as Integral, IntegrationWarning as IntegrationWarning
from .simplicial import SimplicialChain as SimplicialChain, cone as cone
from .complexes import SimplicialComplex as SimplicialComplex, WhitneyForm as WhitneyForm
from .simplex_quadrature import grundmann_moller as grundmann_moller

__all__ = ['Path', 'as_path', 'CLOSURES', 'Chain', 'ZeroChain', 'Form', 'ZeroForm', 'OneForm', 'TwoForm', 'dx', 'integrate', 'Integral', 'IntegrationWarning', 'SimplicialChain', 'cone', 'SimplicialComplex', 'WhitneyForm', 'grundmann_moller']
