from packwarden import Example, Severity, rule

from ._problems import report


@rule(id="unknown-pin", scope="netlist", summary="pins named on a component exist on its part",
      severity=Severity.error, example=Example(
          bad="Q1: {part: OR-FET-D20, pins: {s1: B-, gate1: DG, s2: P-, g2: CG}}",
          good="Q1: {part: OR-FET-D20, pins: {s1: B-, g1: DG, s2: P-, g2: CG}}"))
def check(ctx, options):
    """A misspelt pin name leaves the real pin unconnected and puts a net on nothing; the power
    path the linter reasons about would then differ from the board."""
    yield from report(ctx, "unknown-pin")
