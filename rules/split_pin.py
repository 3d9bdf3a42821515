from packwarden import Example, Severity, rule

from ._problems import report


@rule(id="split-pin", scope="netlist",
      summary="package pins of one part pin lie on one net in the schematic",
      severity=Severity.error, example=Example(
          bad="# pinout {'7': d, '8': d}; the netlist puts pin 7 on MID and pin 8 on P-",
          good="# pinout {'7': d, '8': d}; the netlist puts pins 7 and 8 on MID"))
def check(ctx, options):
    """A package often brings one die terminal out on several pins (a FET pair's drain on pins 7
    and 8); the data sheet's current rating and on-resistance assume they are joined. In the
    schematic they must therefore share a net: a pin drawn to another net is a wiring slip, or a
    pinout that does not fit the package."""
    yield from report(ctx, "split-pin")
