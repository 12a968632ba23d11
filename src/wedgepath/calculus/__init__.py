"""Paths, chains, forms and their integrals: the base layer of wedgepath."""

from .chains import Chain, ZeroChain
from .complexes import SimplicialComplex, WhitneyForm
from .forms import Form, OneForm, TwoForm, ZeroForm, dx
from .integral import Integral, IntegrationWarning
from .integrate import integrate
from .paths import CLOSURES, Path, as_path
from .simplex_quadrature import grundmann_moller
from .simplicial import SimplicialChain, cone

__all__ = ["Path", "as_path", "CLOSURES", "Chain", "ZeroChain", "Form", "ZeroForm", "OneForm",
           "TwoForm", "dx", "integrate", "Integral", "IntegrationWarning", "SimplicialChain", "cone",
           "SimplicialComplex", "WhitneyForm", "grundmann_moller"]
