"""packwarden: a design-review linter for lithium-ion battery protection circuits.

This package is the public API that built-in and team rules are written against; see
``docs/rules-api.md``.
"""

from .api import (Example, Figure, Finding, Location, NoOptions, Rule, RuleContext, RuleOptions,
                  Severity, rule)
from .quantities import format_quantity, parse_quantity

__version__ = "0.1.0"

__all__ = ["Example", "Figure", "Finding", "Location", "NoOptions", "Rule", "RuleContext",
           "RuleOptions", "Severity", "rule", "format_quantity", "parse_quantity", "__version__"]
