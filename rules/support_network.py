from packwarden import Example, Figure, RuleOptions, Severity, format_quantity as fq, rule
from packwarden.model.support import DEFAULT_SENSE_R, DEFAULT_SUPPLY_C, DEFAULT_SUPPLY_R
from packwarden import Q
from packwarden import Field


class Options(RuleOptions):
    max_threshold_shift: Q("V") = Field(0.010, description=(
        "largest shift of the detection thresholds the supply filter may cause "
        "[practice: a tenth of a 100 mV hysteresis]"))
    supply_r_min: Q("Ω") = Field(DEFAULT_SUPPLY_R[0], description=(
        "supply filter resistance, lowest, when the protector gives no supply_filter [practice]"))
    supply_r_max: Q("Ω") = Field(DEFAULT_SUPPLY_R[1], description="likewise, highest [practice]")
    supply_c_min: Q("F") = Field(DEFAULT_SUPPLY_C[0], description=(
        "supply filter capacitance, lowest, when the protector gives no supply_filter [practice]"))
    supply_c_max: Q("F") = Field(DEFAULT_SUPPLY_C[1], description="likewise, highest [practice]")
    sense_r_min: Q("Ω") = Field(DEFAULT_SENSE_R[0], description="sense-pin resistor, lowest [practice]")
    sense_r_max: Q("Ω") = Field(DEFAULT_SENSE_R[1], description="sense-pin resistor, highest [practice]")
    resistor_derating: float = Field(0.5, gt=0, le=1, description=(
        "fraction of a resistor's power rating it may dissipate [practice: 50 %]"))
    capacitor_derating: float = Field(0.8, gt=0, le=1, description=(
        "fraction of a capacitor's voltage rating it may see [practice: commercial derating 80 %]"))


def _at(c, field):
    """Where a part's value lives: inline on the component, or the library part it names."""
    return c.path + ((field,) if c.part_name is None else ("part",))


@rule(id="support-network",
      summary="the protector's supply filter, sense-pin resistor, capacitors and resistors fit "
              "their job and their ratings",
      severity=Severity.error, options=Options, example=Example(
          bad="R1: {kind: resistor, value: 10 kΩ, pins: [B+, VDD]}   # 6 µA × 10 kΩ = 60 mV shift\n"
              "R2: {kind: resistor, value: 100 Ω, power: 0.1 W, pins: [VM, P-]}   # ~1 W reversed",
          good="R1: {kind: resistor, value: 470 Ω, pins: [B+, VDD]}\n"
               "R2: {kind: resistor, value: 2 kΩ, power: 0.1 W, pins: [VM, P-]}"))
def check(ctx, options):
    """A single-cell protector measures the cell at its supply pin, through the supply filter
    resistor, so the supply current times that resistance moves every voltage threshold; the
    filter's resistor and capacitor belong in the maker's recommended range (or the usual
    300 Ω-1 kΩ and 22 nF-1 µF). The sense-pin resistor limits the current into the sense pin when a
    charger is connected reversed, with the charger's open-circuit voltage plus the stack across
    it, and must dissipate that; it belongs in 300 Ω-4 kΩ. Every capacitor must be rated for the
    highest voltage across it (stack at overcharge detection, charger open-circuit voltage,
    reversed charger), and every resistor for its worst dissipation (those cases, balancing, and
    the power path just below the over-current trip), each with derating."""
    m = ctx.model
    p = m.protector
    if p is None or m.stack is None:
        return
    yield from _supply_filter(ctx, m, p, options)
    yield from _sense_resistor(ctx, m, p, options)
    # Capacitors against their voltage rating, resistors against their power rating: one check.
    for stresses, derating, unit, verb, field, what in (
            (m.capacitor_stress, options.capacitor_derating, "V", "sees", "voltage", "capacitor"),
            (m.resistor_stress, options.resistor_derating, "W", "dissipates", "power", "resistor")):
        for s in stresses:
            c = s.component
            if s.rating is None:
                continue
            limit = s.rating * derating
            if s.value > limit:
                yield ctx.finding(
                    f"{c.refdes} {verb} {fq(s.value, unit)} ({s.case}) but "
                    f"{fq(derating * 100, '%', 2)} of its {fq(s.rating, unit)} rating "
                    f"is {fq(limit, unit)}",
                    path=_at(c, field), element=c.refdes, key=f"{what}-{field}",
                    headline=field,
                    figures=[Figure(field, s.value, unit), Figure(f"rated {field}", s.rating, unit)],
                    hint=f"use a {what} rated ≥ {fq(s.value / derating, unit)}")


def _supply_filter(ctx, m, p, options):
    f = m.supply_filter
    if f is None:
        return
    pins = ("components", p.refdes, "pins", "supply")
    rec = p.part.supply_filter
    r_lo, r_hi, r_src = options.supply_r_min, options.supply_r_max, "usual"
    c_lo, c_hi, c_src = options.supply_c_min, options.supply_c_max, "usual"
    if rec is not None and rec.r is not None:
        r_lo = rec.r.min if rec.r.min is not None else r_lo
        r_hi = rec.r.max if rec.r.max is not None else r_hi
        r_src = f"{p.refdes}'s recommended"
    if rec is not None and rec.c is not None:
        c_lo = rec.c.min if rec.c.min is not None else c_lo
        c_hi = rec.c.max if rec.c.max is not None else c_hi
        c_src = f"{p.refdes}'s recommended"
    if f.resistor is None:
        yield ctx.finding(
            f"{p.refdes}.supply has no series filter resistor from the cells: supply transients "
            f"reach the protector unfiltered and can trip or latch it",
            path=pins, element=p.refdes, key="no-supply-resistor", severity=Severity.warning,
            hint=f"add a {fq(r_lo, 'Ω')}–{fq(r_hi, 'Ω')} resistor between the cells' + and "
                 f"{p.refdes}.supply")
    else:
        r = f.resistor
        value = r.part.value
        if not r_lo <= value <= r_hi:
            yield ctx.finding(
                f"supply filter resistor {r.refdes} is {fq(value, 'Ω')}, outside the {r_src} range "
                f"{fq(r_lo, 'Ω')}–{fq(r_hi, 'Ω')}",
                path=_at(r, "value"), element=r.refdes, key="supply-resistor-range",
                severity=Severity.warning,
                headline="resistance", lower_is_worse=value < r_lo,
                figures=[Figure("resistance", value, "Ω"), Figure("range min", r_lo, "Ω"),
                         Figure("range max", r_hi, "Ω")],
                hint=f"use {fq(r_lo, 'Ω')}–{fq(r_hi, 'Ω')}")
        if f.shift is not None and f.shift > options.max_threshold_shift:
            yield ctx.finding(
                f"{p.refdes}'s supply current {fq(f.supply_current, 'A')} (max) through supply "
                f"filter resistor {r.refdes} ({fq(f.resistance, 'Ω')} at tolerance) drops "
                f"{fq(f.shift, 'V')}: every detection threshold sits that much higher at the cell, "
                f"more than {fq(options.max_threshold_shift, 'V')}",
                path=_at(r, "value"), element=r.refdes, key="threshold-shift",
                headline="threshold shift",
                figures=[Figure("threshold shift", f.shift, "V"),
                         Figure("supply current max", f.supply_current, "A"),
                         Figure("resistance", f.resistance, "Ω")],
                hint=f"use ≤ {fq(options.max_threshold_shift / f.supply_current, 'Ω')} for "
                     f"{r.refdes}")
    if f.capacitor is None:
        yield ctx.finding(
            f"{p.refdes}.supply has no filter capacitor to ground",
            path=pins, element=p.refdes, key="no-supply-capacitor", severity=Severity.warning,
            hint=f"add {fq(c_lo, 'F')}–{fq(c_hi, 'F')} from {p.refdes}.supply to its ground")
    elif not c_lo <= f.capacitance <= c_hi:
        c = f.capacitor
        yield ctx.finding(
            f"supply filter capacitor {c.refdes} is {fq(f.capacitance, 'F')}, outside the {c_src} "
            f"range {fq(c_lo, 'F')}–{fq(c_hi, 'F')}",
            path=_at(c, "value"), element=c.refdes, key="supply-capacitor-range",
            severity=Severity.warning,
            headline="capacitance", lower_is_worse=f.capacitance < c_lo,
            figures=[Figure("capacitance", f.capacitance, "F")],
            hint=f"use {fq(c_lo, 'F')}–{fq(c_hi, 'F')}")


def _sense_resistor(ctx, m, p, options):
    s = m.sense_resistor
    if s is None:
        return
    if s.resistor is None:
        if s.voltage is not None:
            yield ctx.finding(
                f"{p.refdes}.sense is wired straight to pack terminal {s.terminal}: a charger "
                f"connected reversed ({fq(s.voltage, 'V')} with the stack) drives its current "
                f"into the pin unlimited",
                path=("components", p.refdes, "pins", "sense"), element=p.refdes,
                key="no-sense-resistor",
                hint=f"put a {fq(options.sense_r_min, 'Ω')}–{fq(options.sense_r_max, 'Ω')} "
                     f"resistor between {p.refdes}.sense and {s.terminal}")
        return
    r = s.resistor
    value = r.part.value
    if not options.sense_r_min <= value <= options.sense_r_max:
        yield ctx.finding(
            f"sense-pin resistor {r.refdes} is {fq(value, 'Ω')}, outside "
            f"{fq(options.sense_r_min, 'Ω')}–{fq(options.sense_r_max, 'Ω')}: too low lets a reversed "
            f"charger overload the pin, too high shifts the pin's charger and load detection",
            path=_at(r, "value"), element=r.refdes, key="sense-resistor-range",
            severity=Severity.warning, figures=[Figure("resistance", value, "Ω")],
            headline="resistance", lower_is_worse=value < options.sense_r_min,
            hint=f"use {fq(options.sense_r_min, 'Ω')}–{fq(options.sense_r_max, 'Ω')} (2 kΩ is usual)")
    if s.power is None or r.part.power is None:
        return
    limit = r.part.power * options.resistor_derating
    if s.power > limit:
        yield ctx.finding(
            f"with a charger connected reversed, sense-pin resistor {r.refdes} has "
            f"{fq(s.voltage, 'V')} across it (charger open-circuit + stack) and dissipates "
            f"{fq(s.power, 'W')} at {fq(s.current, 'A')}, above "
            f"{fq(options.resistor_derating * 100, '%', 2)} of its {fq(r.part.power, 'W')} rating",
            path=_at(r, "power"), element=r.refdes, key="sense-resistor-power",
            headline="power",
            figures=[Figure("voltage", s.voltage, "V"), Figure("current", s.current, "A"),
                     Figure("power", s.power, "W"), Figure("rated power", r.part.power, "W")],
            hint=_sense_power_hint(s, r, limit, options))


def _sense_power_hint(s, r, limit, options):
    """A resistance only where the range this rule holds the sense resistor to allows it; else
    the rating the resistor needs at the range's top, or no reversed charger at all (values at
    the resistor's tolerance as it is)."""
    low = 1 - r.part.tol / 100  # the model takes each resistor at the low end of its tolerance
    r_min = s.voltage ** 2 / limit / low
    rated = s.voltage ** 2 / (options.sense_r_max * low) / options.resistor_derating
    if r_min <= options.sense_r_max:
        return (f"use {fq(r_min, 'Ω', toward='up')}–{fq(options.sense_r_max, 'Ω')} at "
                f"{fq(r.part.power, 'W')}, or a resistor rated ≥ "
                f"{fq(s.power / options.resistor_derating, 'W', toward='up')}, or prevent reverse "
                f"connection")
    return (f"no resistance up to the sense pin's {fq(options.sense_r_max, 'Ω')} keeps it within "
            f"{fq(r.part.power, 'W')}: use {fq(options.sense_r_max, 'Ω')} ± {r.part.tol:g} % rated ≥ "
            f"{fq(rated, 'W', toward='up')}, or prevent reverse connection "
            f"(charger.reverse_polarity: prevented)")
