from packwarden import Example, Severity, rule

from ._problems import report


@rule(id="unknown-part", scope="netlist", summary="every component's part exists in the design's libraries",
      severity=Severity.error, example=Example(
          bad="components:\n  Q1: {part: OR-FET-D2O, pins: {...}}   # letter O for zero",
          good="components:\n  Q1: {part: OR-FET-D20, pins: {...}}"))
def check(ctx, options):
    """A component whose part cannot be found has no data, so nothing about it can be checked:
    its thresholds, ratings and resistances silently drop out of every worst case. It is an error,
    with the nearest part name when one is close."""
    yield from report(ctx, "unknown-part")
