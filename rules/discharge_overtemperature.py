from packwarden import Example, Figure, Q, RuleOptions, Severity, format_quantity as fq, rule
from packwarden import Field


class Options(RuleOptions):
    cell_thermal_resistance: Q("K/W") = Field(24.0, gt=0, le=1000, description=(
        "thermal resistance from a cell to the ambient, in K/W: the cell's I²R at the "
        "continuous load heats it this much per watt [derived: 1/(h·A) with natural convection "
        "h ≈ 10 W/(m²·K) [practice] over an 18 mm × 65 mm cylinder's 42 cm²; cells packed "
        "together run hotter, a pack with airflow cooler]"))
    peak_steady_after: Q("s") = Field(600.0, gt=0, le=86400, description=(
        "a load peak lasting this long or longer heats the cells as a continuous load would, "
        "and is judged in its place where it is the larger, in seconds [memory: a cylindrical "
        "cell's thermal time constant is of the order of ten minutes to an hour; a peak much "
        "shorter heats it less than its steady rise]"))
    error_energy: float = Field(100.0, gt=0, description=(
        "pack energy, in watt-hours, at or above which an unguarded pack is an error rather than a warning "
        "[memory: 100 Wh is the transport regulations' line for a lithium-ion battery carried "
        "without special approval]"))
    error_current: Q("A") = Field(10.0, gt=0, description=(
        "continuous load at or above which an unguarded pack is an error rather than a warning "
        "[practice: power-tool, garden-tool and e-bike packs draw 10 A and more]"))


@rule(id="discharge-overtemperature",
      summary="a pack whose cells can pass their discharge temperature limit has a discharge "
              "over-temperature cut-off, and it acts inside the limit at every tolerance",
      severity=Severity.error, options=Options, example=Example(
          bad="BT1: {part: BW-CELL-LFP-2500, ...}   # discharge_temperature max 60 °C; 20 A "
              "load at 45 °C ambient\nU1: {part: BW-GUARD-4S, pins: {..., temperature: TS}}\n"
              "# and no thermistor on TS",
          good="RT1: {part: BW-NTC-10K, pins: [TS, B-]}   # U1 stops discharge at 55-59 °C"))
def check(ctx, options):
    """A cell discharged above its maximum discharge temperature (commonly 60 °C for NMC and
    LiFePO4 cells [practice]) ages fast, and beyond it comes nearer to the temperatures where its
    separator and electrolyte start to break down. The cells reach the pack's highest ambient
    plus their own heating: each cell's share of the continuous load squared, times its highest
    internal resistance, through a thermal resistance to the ambient (an option; no heat from the
    switches or neighbouring cells is counted). A load peak that lasts as long as the cells take
    to warm through (``peak_steady_after``) counts as continuous where it is the larger; shorter
    peaks heat the cells less than their steady rise and are left to the cells' pulse rating.
    Charging is not counted here: the charge current is judged against the charge window, where
    the charge-hot cut-off of a thermistor on the cells sees the cells' own charge heating
    (charge-inhibit-window), and charging never adds to a discharge. Where that can pass the
    cell's
    ``discharge_temperature`` maximum, something must stop the discharge: the protector's
    discharge over-temperature cut-off reading a thermistor on the cells. Without one it is a
    finding, an error for a large pack (its energy or continuous current at or above the
    options' thresholds) and a warning for a small one. A cut-off that exists must act at or
    below the cell's maximum (and a cold one at or above its minimum) at every tolerance corner
    of the thermistor, its bias resistor and the threshold (error). The ambient's lowest end
    below the cell's minimum with no cold cut-off is a warning."""
    m = ctx.model
    stack = m.stack
    limits = m.discharge_window
    if stack is None or limits is None:
        return
    ts = m.temperature_sensing
    ref = stack.cells[0].refdes
    cell_path = ctx.part_path(ref) + (("discharge_temperature",) if limits.given else ())
    assumed = [limits.assumption] if limits.assumption else []
    unread = "; ".join(f"{u.owner}: {u.why}" for u in ts.unread
                       if {"discharge_cold", "discharge_hot"} & set(u.names))
    because = f" ({unread})" if unread else ""
    hot, cold = ts.effective("discharge_hot"), ts.effective("discharge_cold")
    heat = m.cell_heating(options.cell_thermal_resistance, options.peak_steady_after)
    if hot is None and heat is not None and heat.temperature > limits.max:
        energy = m.pack_energy or 0.0
        load = m.design.load.continuous
        large = energy >= options.error_energy or load >= options.error_current
        yield ctx.finding(
            f"the cells can reach {heat.temperature:.0f} °C (ambient {heat.ambient:.0f} °C plus "
            f"{heat.rise:.1f} K from {fq(heat.power, 'W')} each at {fq(heat.current, 'A')} of the "
            f"{heat.load}), "
            f"above their discharge limit {limits.max:.0f} °C, and nothing in the netlist stops "
            f"the discharge there{because}; a {energy:.0f} Wh pack at {fq(load, 'A')}",
            path=cell_path, element=ref, key="unguarded", assumptions=assumed,
            severity=None if large else "warning",
            headline="cell temperature",
            figures=[Figure("cell temperature", heat.temperature, "°C"),
                     Figure("self-heating", heat.rise, "K"),
                     Figure("discharge limit", limits.max, "°C"),
                     Figure("pack energy", energy, "Wh")],
            hint="put an NTC on the cells into the protector's temperature pin and give its "
                 "part a temperature_input with discharge_hot")
    for c, limit in ((hot, limits.max), (cold, limits.min)):
        if c is None:
            continue
        t = c.temperature
        worst = t.min if c.cold else t.max
        if (worst < limit) if c.cold else (worst > limit):
            yield ctx.finding(
                f"{c.owner} reads {c.ntc} (on the {c.placement}): discharge goes on "
                f"{'down' if c.cold else 'up'} to {worst:.1f} °C at the worst tolerance corner "
                f"(typical {t.typ:.1f} °C), {'below' if c.cold else 'above'} the cell's "
                f"discharge {'minimum' if c.cold else 'maximum'} {limit:.0f} °C",
                path=c.path, element=c.ntc, key=c.name, assumptions=assumed,
                headline=f"{c.name} cut-off min" if c.cold else f"{c.name} cut-off max",
                lower_is_worse=c.cold,
                figures=[Figure(f"{c.name} cut-off min", t.min, "°C"),
                         Figure(f"{c.name} cut-off max", t.max, "°C"),
                         Figure("cell limit", limit, "°C")],
                hint=f"move the {c.name.replace('_', ' ')} threshold, or tighten the "
                     f"thermistor's or the bias resistor's tolerance")
    amb = m.design.pack.ambient
    if cold is None and amb.min < limits.min:
        yield ctx.finding(
            f"the pack operates down to {amb.min:.0f} °C, below the cells' discharge minimum "
            f"{limits.min:.0f} °C, and nothing in the netlist stops the discharge there",
            path=("pack", "ambient", "min"), element=ref, key="cold", assumptions=assumed, severity="warning",
            headline="ambient min", lower_is_worse=True,
            figures=[Figure("ambient min", amb.min, "°C"),
                     Figure("discharge minimum", limits.min, "°C")],
            hint="give the protector's temperature_input a discharge_cold threshold, or narrow "
                 "the ambient range the product is sold for")
