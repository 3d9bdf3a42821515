from packwarden import Example, Figure, RuleOptions, Severity, format_quantity as fq, rule
from packwarden.model import inrush
from packwarden.model.events import precharge_paths
from pydantic import Field


class Options(RuleOptions):
    pulse_margin: float = Field(1.0, gt=0, le=1, description=(
        "fraction of a pre-charge resistor's pulse_energy and pulse_power its pulse may use (1.0: "
        "the rating itself; a data sheet's pulse rating is already a limit)"))


@rule(id="switch-on-inrush",
      summary="closing the switches onto the load's capacitance does not trip the protection",
      severity=Severity.error, options=Options, example=Example(
          bad="load: {input_capacitance: 2200 uF}   # no pre-charge: ~700 A, 300 µs above a 121 A trip",
          good="PR1: {part: TD-PRECHARGE-47R, pins: [SH, MID]}   # 1.2 A, main switches 500 ms later"))
def check(ctx, options):
    """When the switches close, the load's input capacitance (a motor controller's bank, and any
    capacitor across the pack terminals) charges through the whole loop: cells, switches, shunt,
    fuse, copper and the bank's ESR. Taken empty, at the highest stack voltage over the lowest
    loop resistance (the hard short's corner), the current starts at I_pk = V/R and falls with
    τ = R·C; it stays above a trip threshold for τ·ln(I_pk/I_th). Longer above the short-circuit
    trip maximum than the shortest short-circuit delay, every unit trips at every switch-on (a
    nuisance trip, and a switch that sees the pulse again at each retry); above the trip minimum
    only, the most sensitive units do (warning). The over-current detection is judged the same
    way. A pre-charge path (a resistor with its switch around the discharge switches) charges the
    bank first; the main switches then close onto what is left after the shortest delay, and the
    resistor must take the ½CV² pulse and its peak power V²/R within its pulse ratings."""
    m = ctx.model
    for c, ok in precharge_paths(m):
        if not ok:
            yield ctx.finding(
                f"{c.refdes} (pre-charge path) does not bridge the discharge switches, so it "
                f"charges nothing around them; it is left out of the switch-on inrush",
                path=c.path + ("pins",), element=c.refdes, key="not-bridging",
                severity="warning",
                hint="connect it across the discharge switches (one pin on each side of the "
                     "discharge channels, or across the whole switch pair)")
    ev = m.event("switch-on-inrush")
    if ev is None:
        return
    pre = ev.precharge
    where, element = _location(m, ev)
    for t in ev.trips:
        if not t.may_trip:
            continue
        every = t.trips
        at = t.longest if every else t.longest_above_min
        limit, above = (at.trip_max, at.time_above_max) if every else (at.trip_min, at.time_above_min)
        start = (f"closing the main switches {fq(pre.delay, 's')} after pre-charge through "
                 f"{pre.refdes}" if pre is not None else "switching on")
        outcome = ("the protection trips at every switch-on" if every else
                   "the most sensitive units trip at switch-on")
        yield ctx.finding(
            f"{start} into {fq(ev.capacitance, 'F')} draws {fq(at.peak, 'A')} through a "
            f"{fq(at.loop_resistance, 'Ω')} loop (τ {fq(at.time_constant, 's')}, {at.corner}), "
            f"above the {t.detection} trip's {'maximum' if every else 'minimum'} at that corner "
            f"{fq(limit, 'A')} "
            f"for {fq(above, 's')}, longer than the shortest {t.detection} delay "
            f"{fq(t.delay_min, 's')}: {outcome}",
            path=where, element=element, key=f"trip-{t.detection}",
            severity=None if every else "warning",
            headline="peak current",
            figures=[Figure("capacitance", ev.capacitance, "F"),
                     Figure("loop resistance", at.loop_resistance, "Ω"),
                     Figure("peak current", at.peak, "A"),
                     Figure("time constant", at.time_constant, "s"),
                     Figure(f"{t.detection} trip", limit, "A"),
                     Figure("time above trip", above, "s"),
                     Figure("delay minimum", t.delay_min, "s")],
            hint=_trip_hint(ev, t, at))
    if pre is None:
        return
    c = m.netlist.components[pre.refdes]
    part_path = ctx.part_path(pre.refdes)
    ratings = (
        ("pulse_energy", pre.resistor_energy, "J", "pulse energy",
         f"absorbs ½CV² = {fq(pre.resistor_energy, 'J')} charging {fq(ev.capacitance, 'F')} to "
         f"{fq(ev.voltage, 'V')}", "in one pulse (wire-wound or ceramic bulk parts take joules)"),
        ("pulse_power", pre.resistor_power, "W", "peak power",
         f"takes {fq(pre.resistor_power, 'W')} at switch-on ({fq(pre.peak, 'A')} through "
         f"{fq(pre.resistance_min, 'Ω')})",
         f"for a {fq(pre.time_constant, 's')} pulse, or a higher resistance (with a longer "
         f"delay before the main switches close)"))
    for field, value, unit, label, what, advice in ratings:
        rating = getattr(c.part, field)
        if rating is None or value <= rating * options.pulse_margin:
            continue
        yield ctx.finding(
            f"{pre.refdes}'s resistor {what}, above its {field} {fq(rating, unit)}",
            path=part_path, element=pre.refdes, key=field.replace("_", "-"),
            headline=label,
            figures=[Figure(label, value, unit), Figure(field, rating, unit)],
            hint=f"use a pre-charge resistor rated for ≥ {fq(value / options.pulse_margin, unit)} "
                 f"{advice}")


def _location(m, ev):
    """Where the finding points: the pre-charge path when there is one, else the largest
    capacitance (the load's input, or a capacitor across the terminals)."""
    if ev.precharge is not None:
        c = m.netlist.components[ev.precharge.refdes]
        return c.path, c.refdes
    where, _, _ = max(ev.sources, key=lambda s: s[1])
    if where == "load":
        return ("load", "input_capacitance"), "load"
    return m.netlist.components[where].path, where


def _trip_hint(ev, t, at):
    pre = ev.precharge
    if pre is not None:
        # The main switches may close once the step they make stays below the trip minimum:
        # what is left across the loop at most R_loop·I_th.
        d = inrush.time_to_fall(ev.voltage, pre.time_constant, at.loop_resistance * at.trip_min)
        return (f"close the main switches ≥ {fq(d, 's')} after the pre-charge switch (its "
                f"shortest delay), or use a lower pre-charge resistance")
    oc = next((x for x in ev.trips if x.detection == "over-current"), None)
    floor = min(c.trip_min for c in (oc or t).corners)
    return (f"add a pre-charge path around the discharge switches (kind: precharge): a resistor "
            f"≥ {fq(ev.voltage / floor, 'Ω')} keeps its current below the over-current trip "
            f"minimum (tens of ohms are usual [practice]), rated for a ½CV² = "
            f"{fq(ev.energy, 'J')} pulse, with the main switches closing some 5·R·C later")
