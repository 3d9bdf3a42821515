"""packwarden: a design-review linter for lithium-ion battery protection circuits.

This package is the public API that built-in and team rules are written against; see
``docs/rules-api.md``.
"""

from typing import TYPE_CHECKING

__version__ = "0.1.0"

__all__ = ["Example", "Field", "Figure", "Finding", "Location", "NoOptions", "Rule",
           "RuleContext", "RuleOptions", "Severity", "rule", "format_quantity", "parse_quantity",
           "QuantityError", "Q", "Tol", "__version__"]

# Where each public name lives. They are imported on first use (PEP 562), so that importing the
# command (``packwarden.cli``) does not build the API's models and classes before ``cli.main``
# has switched off the cycle collector for start-up; ``from packwarden import rule`` works as it
# always did.
_HOMES = {**dict.fromkeys(["Example", "Field", "Figure", "Finding", "Location", "NoOptions",
                           "Rule", "RuleContext", "RuleOptions", "Severity", "rule"], "api"),
          **dict.fromkeys(["QuantityError", "format_quantity", "parse_quantity"], "quantities"),
          # Q("V") and Tol("V") declare rule options in units (``max_trip: Q("A") = 5.0``).
          **dict.fromkeys(["Q", "Tol"], "schema")}

if TYPE_CHECKING:  # what editors and type checkers see
    from .api import (Example, Field, Figure, Finding, Location, NoOptions, Rule, RuleContext,
                      RuleOptions, Severity, rule)
    from .quantities import QuantityError, format_quantity, parse_quantity
    from .schema import Q, Tol


def __getattr__(name: str):
    home = _HOMES.get(name)
    if home is None:
        raise AttributeError(f"module 'packwarden' has no attribute {name!r}")
    import importlib
    value = getattr(importlib.import_module(f".{home}", __name__), name)
    globals()[name] = value  # later lookups find it directly
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(__all__))
