from packwarden import Example, Severity, rule


@rule(id="essential-parts", scope="netlist", summary="the design has at least one cell and one protector",
      severity=Severity.error, example=Example(
          bad="components:\n  BT1: {part: OR-CELL-3400, pins: {pos: B+, neg: B-}}\n  F1: {part: OR-FUSE-5A, pins: [B+, P+]}",
          good="components:\n  BT1: {part: OR-CELL-3400, pins: {pos: B+, neg: B-}}\n  U1: {part: OR-GUARD-1S, pins: {...}}\n  Q1: {part: OR-FET-D20, pins: {...}}"))
def check(ctx, options):
    """Without a cell there is nothing to protect and without a protector there is no primary
    protection: every other check would pass vacuously, so the absence itself is the finding."""
    kinds = {c.kind for c in ctx.netlist.components.values()}
    unknown = any(c.kind is None for c in ctx.netlist.components.values())
    if "cell" not in kinds and not unknown:
        yield ctx.finding("the design has no cell", path=("components",), key="cell",
                          hint="add the cell(s) with kind 'cell' and pins pos, neg")
    if "protector" not in kinds and not unknown:
        yield ctx.finding("the design has no protector", path=("components",), key="protector",
                          hint="add a protector IC (kind 'protector') that drives the switch FETs")
