from packwarden import Example, Figure, Severity, format_quantity as fq, rule


@rule(id="charger-fault-overshoot",
      summary="a charger that fails high leaves each cell below its overcharge limit until the "
              "overcharge detection acts",
      severity=Severity.error, example=Example(
          bad="charger: {current: 3.0 A}   # 45 mΩ cell resting at 4.22 V: 4.355 V at once, limit 4.35 V",
          good="charger: {current: 0.8 A}   # peak 4.325 V: the detection's highest, plus 0.2 mV"))
def check(ctx, options):
    """A charger whose regulation fails (IEC 62133-2 tests a cell's overcharge with a supply of
    1.4 × its upper limit, current-limited [memory]) pushes its current limit into the cells
    until the overcharge detection has waited out its delay. The protector watches each cell's
    terminal voltage, which is the open-circuit voltage plus I·R of the cell's internal
    resistance: a full cell resting at the charger's regulated voltage jumps by I·R as soon as
    the current flows, and the terminal rises on by the open-circuit voltage of the charge the
    current adds during the longest delay. The highest of these must stay at or below the cell's
    overcharge limit (its 'never exceed'); where it cannot, a smaller charge current, a cell of
    lower resistance or a protector detecting lower or sooner is needed. What blocks the fault
    voltage is judged elsewhere: the charge switch against the charger's open_circuit_max
    (switch-voltage-margin), the regulated voltage against the detection (threshold-ladder)."""
    m = ctx.model
    f, stack = m.charger_fault, m.stack
    # A fault voltage below the detection never trips it; the detection above the overcharge
    # limit is threshold-ladder's finding.
    if f is None or stack is None or not f.detected or f.peak <= f.limit:
        return
    ref = stack.cells[0].refdes
    figures = [Figure("cell peak", f.peak, "V"), Figure("overcharge limit", f.limit, "V"),
               Figure("detection max", f.detect, "V"), Figure("charge current per cell", f.current, "A"),
               Figure("cell resistance max", f.resistance, "Ω"), Figure("delay max", f.delay, "s")]
    jump = f.start > f.detect
    how = (f"a cell resting at the charger's {fq(f.rest, 'V')} jumps by I·R = {fq(f.current, 'A')} "
           f"× {fq(f.resistance, 'Ω')} = {fq(f.ir, 'V')} to {fq(f.start, 'V')} at once"
           if jump else f"the cell reaches the overcharge detection maximum {fq(f.detect, 'V')}")
    if jump and f.limit > f.rest + f.rise:
        most = (f.limit - f.rest - f.rise) / f.resistance * stack.parallel
        hint = (f"keep the charger's current limit at or below {fq(most, 'A')}, or use cells of "
                f"lower internal resistance")
    else:
        hint = "choose a protector whose overcharge detection sits lower or acts sooner"
    yield ctx.finding(
        f"with a charger failed high, {how}, and rises {fq(f.rise, 'V')} more over the longest "
        f"overcharge delay {fq(f.delay, 's')}: {fq(f.peak, 'V')}, {fq(f.overshoot, 'V')} above "
        f"the cell's overcharge limit {fq(f.limit, 'V')}",
        path=("charger", "current"), element=ref, key="overshoot", figures=figures,
        assumptions=[n for n in f.assumptions if "[memory]" in n or "extrapolated" in n],
        headline="cell peak",
        hint=hint)
