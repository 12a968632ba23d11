"""Physical units through pint (loaded on first use: ``import wedgepath`` stays light).

Unit text is parsed by pint's unit parser (``UnitRegistry.parse_units``),
never evaluated as Python; it is first checked against a short list of
characters so that only unit expressions reach the parser.
"""

from __future__ import annotations

import re

__all__ = ["registry", "parse_unit", "factor", "is_dimensionless", "has_dimension"]

_REGISTRY = None
_ALLOWED = re.compile(r"^[A-Za-zµμΩ°%0-9 .*/^()\-_]{1,64}$")


def registry():
    """The shared pint UnitRegistry (built on first use)."""
    global _REGISTRY
    if _REGISTRY is None:
        import pint

        _REGISTRY = pint.UnitRegistry()
    return _REGISTRY


def parse_unit(text, what):
    """``text`` as a pint Unit; ValueError naming ``what`` when it is not a known unit."""
    if not isinstance(text, str):
        raise TypeError(f"the unit of {what} must be text, got {type(text).__name__}")
    t = text.strip()
    if t in ("1", "-", ""):
        t = "dimensionless"
    if not _ALLOWED.match(t):
        raise ValueError(f"unknown unit {text!r} for {what}: use unit names and symbols with "
                         "*, / and ^ (e.g. 'kN', 'mm', 'kN/mm', 'J/m^3')")
    ureg = registry()
    try:
        return ureg.parse_units(t.replace("^", "**"))
    except Exception as exc:  # pint raises several kinds (UndefinedUnitError, DefinitionSyntaxError)
        raise ValueError(f"unknown unit {text!r} for {what} ({type(exc).__name__})") from None


def factor(unit_from, unit_to) -> float:
    """The number that converts a value in ``unit_from`` to ``unit_to`` (pint Units)."""
    ureg = registry()
    return float(ureg.Quantity(1.0, unit_from).to(unit_to).magnitude)


def is_dimensionless(unit) -> bool:
    return bool(registry().Quantity(1.0, unit).dimensionless)


def has_dimension(unit, target) -> bool:
    """True when ``unit`` has the same dimension as the unit text ``target``."""
    ureg = registry()
    return ureg.Quantity(1.0, unit).dimensionality == ureg.parse_units(target).dimensionality


def text(unit) -> str:
    """Short symbol text of a pint Unit (``kN / mm``)."""
    return f"{unit:~}".replace(" ** ", "^").replace("**", "^")
