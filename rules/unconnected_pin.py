from packwarden import Example, Severity, rule

from ._problems import report


@rule(id="unconnected-pin", scope="netlist", summary="every required pin of a part is connected",
      severity=Severity.error, example=Example(
          bad="U1: {part: OR-GUARD-1S, pins: {supply: VDD, ground: B-, sense: VM, discharge_gate: DG}}",
          good="U1: {part: OR-GUARD-1S, pins: {supply: VDD, ground: B-, sense: VM, discharge_gate: DG, charge_gate: CG}}"))
def check(ctx, options):
    """A protector's gate output, a FET's gate or a cell terminal left open is either a drawing
    slip or a switch that never turns off. Optional pins (a pair's common drain) are exempt."""
    yield from report(ctx, "unconnected-pin")
