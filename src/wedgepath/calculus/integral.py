"""The value of an integral: :class:`Integral`, its warning, and how parts add up.

An :class:`Integral` is a float that also says how it was obtained: its
estimated truncation ``error`` (0 when the method is exact), whether the
method is ``exact`` in exact arithmetic, the ``method``, a ``rounding`` scale
of the floating-point error that remains, and how many points the integrand
was evaluated at.

An error estimate is a promise.  Where it cannot be kept -- the tolerance was
not reached, the estimate is larger than the value, the integrand is not
finite somewhere the refinement looked -- an :class:`IntegrationWarning` says
so, reported at the caller's line.
"""

from __future__ import annotations

import numpy as np

from .._results import Result, fmt_number
from .._warn import warn

__all__ = ["Integral", "IntegrationWarning", "Accumulator", "EPS"]

EPS = float(np.finfo(np.float64).eps)


class IntegrationWarning(UserWarning):
    """The error estimate cannot be trusted: the tolerance was not reached, the
    estimate exceeds the value (the integral may not converge), or the integrand
    was not finite where refinement looked.  ``error`` says how far the result is."""


class Integral(Result, float):
    """A float with an error estimate and a description of how it was obtained.

    Behaves as a float in arithmetic (results of arithmetic are plain floats).
    ``to_frame()`` gives one row: ``value, error, exact, method, rounding,
    evaluations``.

    Attributes
    ----------
    error : float
        Estimated absolute truncation error; 0.0 when the method is exact.
    exact : bool
        True when the method is exact in exact arithmetic.
    method : str
        Human-readable name of the method(s).
    rounding : float
        Estimated floating-point summation error (a scale, not a bound).
    evaluations : int
        Points at which callable or sympy coefficients were evaluated.

    Examples
    --------
    >>> from wedgepath import Integral
    >>> r = Integral(1.5, error=1e-12, method="adaptive")
    >>> r + 1, r.error, r.exact
    (2.5, 1e-12, False)
    >>> r
    Integral(value=1.5, error=1e-12, exact=False, method='adaptive')
    """

    def __new__(cls, value, *, error=0.0, exact=False, method="", rounding=0.0, evaluations=0):
        self = super().__new__(cls, value)
        self.error = float(error)
        self.exact = bool(exact)
        self.method = str(method)
        self.rounding = float(rounding)
        self.evaluations = int(evaluations)
        return self

    def _summary_items(self):
        return [("value", repr(float(self))), ("error", fmt_number(self.error, 3)),
                ("exact", str(self.exact)), ("method", repr(self.method))]

    def to_frame(self):
        """One row: ``value, error, exact, method, rounding, evaluations``."""
        import pandas as pd

        return pd.DataFrame({"value": [float(self)], "error": [self.error],
                             "exact": [self.exact], "method": [self.method],
                             "rounding": [self.rounding], "evaluations": [self.evaluations]})

    def with_units(self, units):
        raise TypeError("an Integral is one number; it carries no channels to attach units to")

    def __reduce__(self):
        return (_rebuild_integral, (float(self), self.error, self.exact, self.method,
                                    self.rounding, self.evaluations))


def _rebuild_integral(value, error, exact, method, rounding, evaluations):
    return Integral(value, error=error, exact=exact, method=method, rounding=rounding,
                    evaluations=evaluations)


class Accumulator:
    """Adds partial integrals from pieces, terms and chain members; collects trouble.

    ``trouble`` holds the reasons (one line each) why an adaptive part did
    not keep its promise; :meth:`warn` issues them as one
    :class:`IntegrationWarning` at the caller's line.
    """

    def __init__(self):
        self.value = 0.0
        self.error = 0.0
        self.tolerance = 0.0
        self.exact = True
        self.methods = []
        self.rounding = 0.0
        self.evaluations = 0
        self.trouble = []

    def add(self, value, error=0.0, exact=True, method=None, rounding=0.0, evaluations=0,
            weight=1.0):
        self.value += weight * value
        self.error += abs(weight) * error
        self.exact = self.exact and exact
        if method and method not in self.methods:
            self.methods.append(method)
        self.rounding += abs(weight) * rounding
        self.evaluations += evaluations

    def add_outcome(self, outcome, method, weight=1.0):
        """Add an :class:`~wedgepath.calculus.adaptive.Outcome` of the adaptive driver."""
        self.add(outcome.value, outcome.error, False, method, outcome.rounding,
                 outcome.evaluations, weight)
        self.tolerance += abs(weight) * outcome.tolerance
        for t in outcome.trouble:
            if t not in self.trouble:
                self.trouble.append(t)

    def merge(self, other: "Accumulator", weight=1.0):
        self.add(other.value, other.error, other.exact, None, other.rounding,
                 other.evaluations, weight)
        self.tolerance += abs(weight) * other.tolerance
        for m in other.methods:
            if m not in self.methods:
                self.methods.append(m)
        for t in other.trouble:
            if t not in self.trouble:
                self.trouble.append(t)

    def warn(self, what="integration"):
        """Issue the collected trouble as one IntegrationWarning (nothing when there is none).

        ``what`` names the computation in the message ("integration", "region
        integral", "de Rham map").
        """
        if not self.trouble:
            return
        msg = (f"{what} tolerance {self.tolerance:.3g} not reached: estimated error "
               f"{self.error:.3g} for the value {self.value:.6g}; " + "; ".join(self.trouble))
        if not (self.error < abs(self.value)):
            msg += ("; the error estimate is not smaller than the value itself: the integral "
                    "may not converge (is the integrand singular or not integrable there?)")
        warn(msg, IntegrationWarning)

    def result(self) -> Integral:
        rounding = self.rounding + EPS * abs(self.value)
        return Integral(self.value, error=self.error, exact=self.exact,
                        method="; ".join(self.methods) or "empty chain",
                        rounding=rounding, evaluations=self.evaluations)
