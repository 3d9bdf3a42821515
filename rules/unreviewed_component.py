from packwarden import Example, Severity, rule


@rule(id="unreviewed-component", scope="netlist",
      summary="every component of the schematic has a part id, or is left out knowingly",
      severity=Severity.warning, example=Example(
          bad="# the netlist's D5 (an LED across B+ and B-) has no packwarden-part field",
          good="# D5 has packwarden-part = LED-GRN-2MA, or a waiver for unreviewed-component at D5"))
def check(ctx, options):
    """A symbol without a part id has no data, so the review cannot count it. Most such parts
    (a connector, a test point) do not bear on protection, but some do: an indicator LED and its
    resistor across the pack terminals drain a stored pack. Each is listed with its nets, so the
    reviewer decides: give it a part id, or waive the finding with the reason."""
    for p in ctx.netlist.outside:
        yield ctx.finding(p.message, path=p.path, hint=p.hint, element=p.component)
