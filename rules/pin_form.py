from packwarden import Example, Severity, rule

from ._problems import report


@rule(id="pin-form", scope="netlist", summary="the way pins are written fits the part's kind",
      severity=Severity.error, example=Example(
          bad="Q1: {part: OR-FET-D20, pins: [B-, DG, MID]}   # a FET's pins have names",
          good="Q1: {part: OR-FET-D20, pins: {s1: B-, g1: DG, s2: P-, g2: CG}}"))
def check(ctx, options):
    """A list of nets is unambiguous only for two-terminal parts (resistor, fuse, trace); for a
    FET or a protector the order of a list says nothing about which pin is which."""
    yield from report(ctx, "pin-form")
