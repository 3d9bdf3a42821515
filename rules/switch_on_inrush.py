import math

from packwarden import Example, Figure, RuleOptions, Severity, format_quantity as fq, rule
from packwarden.model import inrush
from packwarden.model.events import precharge_paths
from packwarden.quantities import rounded_toward
from packwarden import Field

from ._fit import Fit


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
            hint=_trip_hint(ctx, ev, t, at))
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


def _trip_hint(ctx, ev, t, at):
    pre = ev.precharge
    if pre is not None:
        # The main switches may close once the step they make stays below the trip minimum:
        # what is left across the loop at most R_loop·I_th.
        d = inrush.time_to_fall(ev.voltage, pre.time_constant, at.loop_resistance * at.trip_min)
        return (f"close the main switches ≥ {fq(d, 's')} after the pre-charge switch (its "
                f"shortest delay), or use a lower pre-charge resistance")
    return _precharge_hint(ctx, ev, t)


#: The pre-charge resistor's tolerance the hint proposes, % (wire-wound and ceramic pulse
#: resistors are commonly ± 5 % [practice]).
PRECHARGE_TOL = 5.0
#: The hint keeps the pre-charge peak at this share of the over-current trip minimum: a choice,
#: not a limit (any resistance whose peak stays below the minimum passes the trip); an order of
#: magnitude below keeps the pulse clear of the window and the resistor's peak power in the
#: hundreds of watts rather than kilowatts [practice].
PRECHARGE_PEAK_SHARE = 0.1


def _e12_above(value: float) -> float:
    """The smallest E12 resistance (IEC 60063) at or above ``value``."""
    decade = 10.0 ** math.floor(math.log10(value))
    for m in (1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2, 10.0):
        if m * decade >= value * (1 - 1e-12):
            return m * decade
    return 10.0 * decade


def precharge_proposal(m, ev, floor: float, factor: float = 1.0) -> tuple[dict, float]:
    """The pre-charge path the hint proposes, as the design format writes it: a resistance
    whose peak stays at :data:`PRECHARGE_PEAK_SHARE` of the over-current trip minimum ``floor``
    (times ``factor``, the search's), the shortest delay after which closing the main switches
    stays below the trip minimum at the highest loop resistance, and the resistor's pulse
    ratings for ½CV² and the peak power V²/R at its lowest resistance; and that lowest
    resistance."""
    ohms = _e12_above(ev.voltage / (floor * PRECHARGE_PEAK_SHARE)) * factor
    r_min, r_max = ohms * (1 - PRECHARGE_TOL / 100.0), ohms * (1 + PRECHARGE_TOL / 100.0)
    hot = max((c for x in ev.trips for c in x.corners), key=lambda c: c.loop_resistance)
    tau = inrush.RcPulse(ev.voltage, r_max + hot.loop_resistance, ev.capacitance).time_constant
    # rounded up, as the ratings below: a delay or rating that must be at least a figure still
    # is as written
    fall = inrush.time_to_fall(ev.voltage, tau, hot.loop_resistance * min(
        c.trip_min for x in ev.trips for c in x.corners))
    delay = rounded_toward(max(fall, tau), 2, "up")
    return {"kind": "precharge",
            "resistance": {"typ": f"{ohms:.4g} Ω", "tol": f"{PRECHARGE_TOL:g} %"},
            "delay": f"{delay * 1e3:.4g} ms",
            "pulse_energy": f"{rounded_toward(ev.energy, 2, 'up'):.4g} J",
            "pulse_power": f"{rounded_toward(ev.voltage ** 2 / r_min, 2, 'up'):.4g} W",
            "pins": _bridge(m)}, r_min


def _bridge(m) -> list[str] | None:
    """Two nets of the design a pre-charge path bridges the discharge switches between: the
    discharge channel's end away from the charge switches, and its other end, or, where that is
    inside a package (a common-drain pair's drain), the far end of the charge channel; None
    where the design has no such nets."""
    discharge = m.channels_of("discharge")
    if not discharge:
        return None
    d, charge = discharge[0], m.channels_of("charge")
    charge_ends = {n for ch in charge for n in (ch.drain, ch.source)}
    outer, inner = (d.drain, d.source) if d.source in charge_ends else (d.source, d.drain)
    if inner not in m.netlist.nets:
        inner = next((n for ch in charge for n in (ch.source, ch.drain)
                      if n not in (d.drain, d.source) and n in m.netlist.nets), None)
    if outer not in m.netlist.nets or inner is None:
        return None
    return [outer, inner]


def _free_refdes(m) -> str:
    n = 1
    while f"PR{n}" in m.netlist.components:
        n += 1
    return f"PR{n}"


def _precharge_hint(ctx, ev, t):
    """A pre-charge path, in the format's words, whose values every rule allows: proposed from
    the trip window and the bank, then linted again with the path added (where a re-lint can
    run); a search over its resistance when the first proposal does not pass."""
    m = ctx.model
    oc = next((x for x in ev.trips if x.detection == "over-current"), None)
    floor = min(c.trip_min for c in (oc or t).corners)
    refdes = _free_refdes(m)
    if not (floor > 0 and math.isfinite(floor) and ev.energy > 0):
        return (f"add a pre-charge path around the discharge switches (kind: precharge), rated "
                f"for a ½CV² = {fq(ev.energy, 'J')} pulse")
    if _bridge(m) is None:
        return (f"add a pre-charge path around the discharge switches (kind: precharge): a "
                f"resistor ≥ {fq(ev.voltage / floor, 'Ω')} keeps its current below the "
                f"over-current trip minimum (tens of ohms are usual [practice]), rated for a "
                f"½CV² = {fq(ev.energy, 'J')} pulse")
    factor, tail = 1.0, "; every rule passes with it added"
    if ctx.relint is not None:
        fit = Fit(ctx.relint, lambda k: [(f"+components.{refdes}", precharge_proposal(m, ev, floor, k)[0])],
                  lambda i: i[0] == "switch-on-inrush" and i[2].startswith("trip-"))
        if fit.before is None:
            tail = ""
        elif not fit.passes(1.0):
            found = fit.interval(1.0)
            if fit.spent:
                tail = ""
            elif found is None:
                return (f"no pre-charge path around the discharge switches lets every rule "
                        f"pass{fit.structural(1.0)}")
            else:
                factor = math.sqrt(found.low * found.high)
    else:
        tail = ""
    p, r_min = precharge_proposal(m, ev, floor, factor)
    return (f"add a pre-charge path around the discharge switches: {refdes}: {{kind: precharge, "
            f"resistance: {{typ: {p['resistance']['typ']}, tol: {p['resistance']['tol']}}}, "
            f"delay: {p['delay']}, pulse_energy: {p['pulse_energy']}, pulse_power: "
            f"{p['pulse_power']}, pins: [{', '.join(p['pins'])}]}} (any resistor ≥ "
            f"{fq(ev.voltage / floor, 'Ω')} keeps its current below the over-current trip "
            f"minimum {fq(floor, 'A')}; this one keeps it to {fq(ev.voltage / r_min, 'A')}"
            f"; its ratings cover a ½CV² = "
            f"{fq(ev.energy, 'J')} pulse and V²/R at its lowest resistance; the delay is the "
            f"shortest after which the main switches close below the "
            f"trip minimum){tail}")
