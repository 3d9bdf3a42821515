"""packwarden: a design-review linter for lithium-ion battery protection circuits.

This package is the public API that built-in and team rules are written against; see
``docs/rules-api.md``.
"""

from .api import (Example, Figure, Finding, Location, NoOptions, Rule, RuleContext, RuleOptions,
                  Severity, rule)
from .quantities import QuantityError, format_quantity, parse_quantity

__version__ = "0.1.0"

__all__ = ["Example", "Figure", "Finding", "Location", "NoOptions", "Rule", "RuleContext",
           "RuleOptions", "Severity", "rule", "format_quantity", "parse_quantity", "QuantityError",
           "Q", "Tol", "__version__"]


def __getattr__(name: str):
    # Q("V") and Tol("V") declare rule options in units (``max_trip: Q("A") = 5.0``). They live with
    # the design schema, whose import costs more than every other start-up step together: load it
    # only when a rule asks.
    if name in ("Q", "Tol"):
        from . import schema
        return getattr(schema, name)
    raise AttributeError(f"module 'packwarden' has no attribute {name!r}")
