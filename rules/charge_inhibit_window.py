from packwarden import Example, Figure, Severity, rule
from packwarden.model import stress


@rule(id="charge-inhibit-window",
      summary="the thermistor inputs in the netlist stop charging inside the cells' charge "
              "temperatures and the declared charger window, at every tolerance",
      severity=Severity.error, example=Example(
          bad="charger:\n  temperature_window: {min: 0 °C, max: 45 °C}   # and no thermistor "
              "anywhere in the netlist",
          good="charger:\n  temperature_window: {min: 0 °C, max: 45 °C}\n"
               "  thermistor: {ntc: RT1, bias: {typ: 10 kΩ, tol: 1 %}, cold: {typ: 72 %, "
               "tol: 0.5}, hot: {typ: 34 %, tol: 0.5}}\n"
               "RT1: {part: OR-NTC-10K, pins: [TH, B-]}"))
def check(ctx, options):
    """Charging a lithium cell below its minimum charge temperature plates lithium on the anode,
    and above its maximum ages it fast and shrinks its margin to thermal runaway; the cell maker
    sets both ends. A window written in the design protects nothing: a thermistor on the cells and
    an input that reads it do. This rule computes the temperatures at which the protector's and
    the charger's temperature inputs really stop charging, from the beta equation of the
    thermistor and the divider it forms with its bias resistor, with the tolerances of R25, B, the
    bias resistor and the comparator threshold stacked (they add up to several kelvin at 0 °C).
    The cold cut-off must lie at or above the cell's minimum at every corner and the hot one at or
    below its maximum (error); likewise within the declared ``charger.temperature_window``
    (warning), and a declared window that nothing in the netlist enforces is a warning."""
    m = ctx.model
    stack, charger = m.stack, m.design.charger
    if stack is None:
        return
    ts = m.temperature_sensing
    cold, hot = ts.effective("charge_cold"), ts.effective("charge_hot")
    window = charger.temperature_window if charger is not None else None
    ref = stack.cells[0].refdes
    unread = "; ".join(f"{u.owner}: {u.why}" for u in ts.unread
                       if {"charge_cold", "charge_hot"} & set(u.names))
    if window is not None:
        missing = [f"{end} end ({t:.0f} °C)" for end, t, c in
                   (("cold", window.min, cold), ("hot", window.max, hot)) if c is None]
        if missing:
            yield ctx.finding(
                f"charger.temperature_window declares that charging stops outside "
                f"{window.min:.0f}–{window.max:.0f} °C, but no thermistor input of the netlist "
                f"stops it at the {' or the '.join(missing)}"
                + (f" ({unread})" if unread else ""),
                path=("charger", "temperature_window"), element=ref, key="unenforced",
                severity="warning",
                hint="put an NTC on the cells and wire it to the protector's temperature pin "
                     "(its part's temperature_input) or to the charger (charger.thermistor)")
    lo, hi, assumed = stress.charge_temperature(stack.part)
    cell_text = f"{lo:.0f}–{hi:.0f} °C" + (" assumed [practice]: the cell gives no "
                                           "charge_temperature" if assumed else "")
    for c, limit, own in ((cold, lo, window.min if window else None),
                          (hot, hi, window.max if window else None)):
        if c is None:
            continue
        t = c.temperature
        worst = t.min if c.cold else t.max
        beyond = (lambda x, lim: x < lim) if c.cold else (lambda x, lim: x > lim)
        figures = [Figure(f"{c.name} cut-off min", t.min, "°C"),
                   Figure(f"{c.name} cut-off typ", t.typ, "°C"),
                   Figure(f"{c.name} cut-off max", t.max, "°C")]
        side = "below" if c.cold else "above"
        reads = f"{c.owner} reads {c.ntc} (on the {c.placement})"
        fix = (f"move the {c.name.replace('_', ' ')} threshold, or tighten the thermistor's R25 "
               f"and B or the bias resistor's tolerance, so the worst corner stays "
               f"{'at or above' if c.cold else 'at or below'}")
        if beyond(worst, limit):
            yield ctx.finding(
                f"{reads}: charging goes on {'down' if c.cold else 'up'} to {worst:.1f} °C at "
                f"the worst tolerance corner (typical {t.typ:.1f} °C), {side} the cell's charge "
                f"temperature window {cell_text}", path=c.path, element=c.ntc, key=c.name,
                headline=f"{c.name} cut-off min" if c.cold else f"{c.name} cut-off max",
                lower_is_worse=c.cold,
                figures=figures + [Figure("cell limit", limit, "°C")],
                hint=f"{fix} {limit:.0f} °C")
        elif own is not None and beyond(worst, own):
            yield ctx.finding(
                f"{reads}: charging goes on {'down' if c.cold else 'up'} to {worst:.1f} °C at "
                f"the worst tolerance corner (typical {t.typ:.1f} °C), {side} the "
                f"{own:.0f} °C that charger.temperature_window declares",
                path=c.path, element=c.ntc, key=c.name, severity="warning",
                headline=f"{c.name} cut-off min" if c.cold else f"{c.name} cut-off max",
                lower_is_worse=c.cold,
                figures=figures + [Figure("declared window end", own, "°C")],
                hint=f"{fix} {own:.0f} °C, or declare the window the netlist really holds")
