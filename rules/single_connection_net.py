from packwarden import Example, Severity, rule


@rule(id="single-connection-net", scope="netlist", summary="every net connects at least two pins",
      severity=Severity.warning, example=Example(
          bad="R1: {kind: resistor, value: 470 Ω, pins: [B+, VDD]}\nC1: {part: CAP-100N, pins: [VD, B-]}   # VDD misspelt",
          good="R1: {kind: resistor, value: 470 Ω, pins: [B+, VDD]}\nC1: {part: CAP-100N, pins: [VDD, B-]}"))
def check(ctx, options):
    """A net that touches one pin is almost always a misspelt net name, which silently breaks a
    connection. The pack terminals (where charger and load connect off-board) and the internal
    common drain of a FET pair are exempt."""
    terminals = set(ctx.netlist.terminals)
    for net, refs in sorted(ctx.netlist.nets.items()):
        if len(refs) != 1 or net in terminals:
            continue
        ref = refs[0]
        comp = ctx.netlist.components[ref.component]
        if comp.kind == "fet_pair_common_drain" and ref.pin == "d":
            continue
        if comp.kind is None:
            continue  # an unknown part may well have an internal node there; unknown-part says so
        others = sorted(n for n in ctx.netlist.nets if n != net and _close(n, net))
        hint = (f"did you mean '{others[0]}'?" if others else
                f"connect net '{net}' to its other end, or remove it")
        yield ctx.finding(f"net '{net}' connects only {ref.component}.{ref.pin}",
                          path=("components", ref.component, "pins", ref.pin)
                          if isinstance(_pins(ctx, ref.component), dict) else
                          ("components", ref.component, "pins"),
                          hint=hint, element=ref.component, key=net)


def _pins(ctx, refdes):
    return ctx.design.components[refdes].pins


def _close(a: str, b: str) -> bool:
    import difflib
    return difflib.SequenceMatcher(None, a.lower(), b.lower()).ratio() >= 0.75
