from packwarden import Example, Severity, rule


@rule(id="tallgrass-fuse-at-cell-positive",
      summary="a fuse in the power path sits right at the cell stack's positive terminal",
      severity=Severity.error, example=Example(
          bad="BT1: {part: TG-CELL-2600, pins: {pos: P+, neg: BN}}\n"
              "F1: {part: TG-FUSE-12A, pins: [BN, B-]}     # fuse in the negative lead",
          good="BT1: {part: TG-CELL-2600, pins: {pos: B+, neg: B-}}\n"
               "F1: {part: TG-FUSE-12A, pins: [B+, P+]}     # fuse at the stack's positive end"))
def check(ctx, options):
    """Tallgrass robots bolt the pack into a metal chassis that is tied to the pack's negative
    terminal. A wire or board trace from the positive side that chafes against the chassis is a
    short that bypasses every part in the negative lead, so a fuse there, or anywhere past the
    first metre of positive wiring, does not interrupt it. House rule HR-7 [practice]: the pack's
    fuse connects directly to the cell stack's positive net, and carries the whole pack current."""
    m = ctx.model
    stack = m.stack
    if stack is None:
        return
    fuses = sorted(ctx.netlist.of_kind("fuse"), key=lambda c: c.refdes)
    in_path = [f for f in fuses if m.in_series_with_path(f.refdes)]
    if any(stack.top in f.pins.values() for f in in_path):
        return
    if in_path:
        for f in in_path:
            yield ctx.finding(
                f"{f.refdes} is in series with the power path but not at the stack's positive "
                f"net {stack.top}: a short from the positive wiring to the chassis bypasses it",
                path=f.path + ("pins",), element=f.refdes, key="placement",
                hint=f"connect {f.refdes} between {stack.top} and the rest of the positive lead "
                     f"(house rule HR-7)")
    else:
        cell = stack.cells[0]
        yield ctx.finding(
            f"no fuse is in series with the power path at the stack's positive net {stack.top}",
            path=cell.path + ("pins",), element=cell.refdes, key="missing",
            hint=f"add a fuse from {stack.top} into the positive lead (house rule HR-7)")
