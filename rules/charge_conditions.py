from packwarden import Example, Figure, Severity, format_quantity as fq, rule
from packwarden.model import stress


@rule(id="charge-conditions",
      summary="the charger stays within the cells' charge current and charge temperatures",
      severity=Severity.error, example=Example(
          bad="charger: {current: 2.5 A}   # one cell rated 1.7 A charge\n"
              "pack: {ambient: {min: -20 °C, max: 55 °C}}   # and no charger.temperature_window",
          good="charger: {current: 0.8 A, temperature_window: {min: 0 °C, max: 45 °C}}"))
def check(ctx, options):
    """The cell maker sets the highest charge current and the temperatures charging is allowed at
    (IEC 62133-2 leaves both to them). The charger's current, shared by the cells in parallel,
    must not exceed the cells' maximum charge current. Where the pack's ambient range reaches
    outside the cell's charge temperature window, something must stop charging there: below
    0 °C lithium plates on the anode, which costs capacity and can grow into an internal short;
    above the window the cell ages fast and the margin to thermal runaway shrinks. The design says
    how with ``charger.temperature_window`` (an NTC input, a charger's own sensing), which must
    lie inside the cell's window, or the netlist shows it: a thermistor read by the protector's
    temperature input or by ``charger.thermistor`` with a threshold at that end (whose real
    cut-off temperature charge-inhibit-window judges). With neither, a warning."""
    m = ctx.model
    ch, stack = m.design.charger, m.stack
    if ch is None or stack is None:
        return
    cell, ref = stack.part, stack.cells[0].refdes
    limit = stack.charge_rating
    if ch.current > limit:
        yield ctx.finding(
            f"charger current {fq(ch.current, 'A')} exceeds the cells' maximum charge current "
            f"{fq(limit, 'A')} ({stack.parallel}P × {fq(cell.max_current.charge, 'A')})",
            path=("charger", "current"), element=ref, key="current",
            headline="charger current",
            figures=[Figure("charger current", ch.current, "A"), Figure("cell limit", limit, "A")],
            hint=f"set the charge current to ≤ {fq(limit, 'A')}, or add cells in parallel")
    lo, hi, assumed = stress.charge_temperature(cell)
    source = (f"{lo:.0f}–{hi:.0f} °C assumed: the cell gives no charge_temperature [practice]"
              if assumed else f"{lo:.0f}–{hi:.0f} °C")
    amb = m.design.pack.ambient
    if amb.min >= lo and amb.max <= hi:
        return
    window = ch.temperature_window
    cold = (f"down to {amb.min:.0f} °C, where charging below {lo:.0f} °C "
            + ("plates lithium on the anode" if lo <= 0 else "is forbidden by the cell maker"))
    hot = (f"up to {amb.max:.0f} °C, where charging above {hi:.0f} °C ages the cell fast and "
           f"shrinks its margin to thermal runaway")
    figures = [Figure("ambient min", amb.min, "°C"), Figure("ambient max", amb.max, "°C"),
               Figure("charge temperature min", lo, "°C"), Figure("charge temperature max", hi, "°C")]
    if window is None:
        # a thermistor input of the netlist that stops charging at an end answers for that end;
        # charge-inhibit-window judges the temperature it really stops at
        ts = m.temperature_sensing
        outside = [t for t, out, end in ((cold, amb.min < lo, "charge_cold"),
                                         (hot, amb.max > hi, "charge_hot"))
                   if out and ts.effective(end) is None]
        if not outside:
            return
        yield ctx.finding(
            f"the pack operates {', and '.join(outside)}: outside the cell's charge temperature "
            f"window ({source}), and the design does not say how charging stops there",
            path=("charger",), element=ref, key="temperature", severity="warning", figures=figures,
            headline="ambient min" if amb.min < lo else "ambient max", lower_is_worse=amb.min < lo,
            hint=f"declare charger.temperature_window (e.g. {{min: {max(lo, 0):.0f} °C, max: {hi:.0f} °C}}) "
                 f"and provide it: an NTC on the cells wired to the charger's temperature input")
        return
    wide = []
    if window.min < lo and amb.min < lo:
        wide.append(f"starts at {window.min:.0f} °C, below the cell's {lo:.0f} °C, and the pack "
                    f"operates {cold}")
    if window.max > hi and amb.max > hi:
        wide.append(f"ends at {window.max:.0f} °C, above the cell's {hi:.0f} °C, and the pack "
                    f"operates {hot}")
    if wide:
        yield ctx.finding(
            f"charger.temperature_window {'; it '.join(wide)} (cell window {source})",
            path=("charger", "temperature_window"), element=ref, key="temperature",
            severity="warning",
            headline="window min" if window.min < lo else "window max",
            lower_is_worse=window.min < lo,
            figures=figures + [Figure("window min", window.min, "°C"), Figure("window max", window.max, "°C")],
            hint=f"narrow the charger's window to within {lo:.0f}–{hi:.0f} °C")
