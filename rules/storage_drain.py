from packwarden import Example, Figure, NoOptions, Severity, format_quantity as fq, rule
from packwarden.quantities import rounded_toward


@rule(id="storage-drain",
      summary="a stored pack stays above the over-discharge cut-off, and the cells above their "
              "lower limit, for the whole storage time",
      severity=Severity.error, options=NoOptions, example=Example(
          bad="storage: {soc: 30 %, duration: 6 months}\n"
              "D1: {part: LED-GREEN, pins: {anode: B+, cathode: LEDK}}   # always lit, 2 mA\n"
              "R31: {kind: resistor, value: 6.2 kΩ, pins: [LEDK, B-]}",
          good="storage: {soc: 30 %, duration: 6 months}\n"
               "D1: {part: LED-GREEN, pins: {anode: B+, cathode: LED_EN}}   # lit by the product's "
               "switch only"))
def check(ctx, options):
    """A pack on the shelf loses charge to the protector's supply current, the product's standby
    current (sleep or ship mode, ``storage.standby_current``: usually the largest drain), every
    resistive path the netlist puts across a cell (dividers, pull-ups, LEDs the cells can light)
    and the cells' self-discharge, a share of the charge left each month that roughly doubles per
    10 °C. When the charge above the over-discharge detection runs out, the protector cuts off and
    drops to its power-down current, and the off discharge switches pass only their leakage; the
    cells go on falling, through that, self-discharge (small now: little charge is left) and any
    path that does not run through the discharge switches, towards the cell's lower limit, below
    which copper dissolution makes them unsafe to recharge. Storage longer than the time to the
    cut-off ships a dead pack (warning); longer than the time to the lower limit ships a damaged
    one (error). In a series stack the level that empties first decides. The figures are a budget
    on data-sheet maxima, the cell maker's storage instructions rule."""
    b = ctx.model.storage_budget
    for problem in ctx.model.problems:
        if problem.what == "storage":
            yield ctx.finding(problem.message, path=problem.path, key="ocv-table",
                              element=ctx.model.stack.cells[0].refdes,
                              hint="give the cell's ocv points with SoC and voltage both rising")
    if b is None:
        return
    stack = ctx.model.stack
    first, after = b.to_cutoff, b.to_lower_limit
    level_cells = [c.refdes for c in stack.cells
                   if ctx.model.stack_levels.get(c.pins["pos"]) == first.level]
    element = level_cells[0] if level_cells else stack.cells[0].refdes
    where = "" if stack.series == 1 else f" level {first.level} of the stack ({', '.join(level_cells)})"
    drains = ", ".join(d.text() for d in first.drains)
    sd = (f"self-discharge {b.self_discharge_pct:.3g} % of the charge left per month at "
          f"{b.temperature:g} °C, {fq(first.self_discharge_ah_per_month, 'Ah')}/month at the start")
    figures = [Figure("storage duration", b.duration, "months"),
               Figure("months to cut-off", first.months, "months"),
               Figure("charge above cut-off", (first.start_soc - first.end_soc) * first.capacity_ah, "Ah"),
               Figure("drain current", first.drain_current, "A"),
               Figure("self-discharge", first.self_discharge_ah_per_month, "Ah/month")]
    if after is not None:
        figures += [Figure("months from cut-off to lower limit", after.months, "months"),
                    Figure("drain current after cut-off", after.drain_current, "A")]
    if first.start_soc <= first.end_soc:
        yield ctx.finding(
            f"stored at {b.soc * 100:.3g} % state of charge ({fq(first.start_voltage, 'V')} per "
            f"cell), at or below the over-discharge detection maximum "
            f"{fq(b.cutoff_voltage, 'V')}: the pack is cut off from the day it ships",
            path=("storage", "soc"), element=element, key="below-cutoff", figures=figures,
            headline="months to cut-off", lower_is_worse=True,
            assumptions=b.assumptions,
            hint=f"store at a state of charge well above {first.end_soc * 100:.2g} % "
                 f"(docs/references.md: about 40 % is the usual shelf charge)")
        return
    if b.duration <= first.months:
        return
    to_limit = first.months + (after.months if after is not None else 0.0)
    needed = first.soc_to_last(b.duration)
    soc_hint = (f"ship at ≥ {needed * 100:.3g} % state of charge" if needed <= 1.0 else
                "no state of charge lasts that long at this drain")
    largest = max(first.drains, key=lambda d: d.current)
    hint = (f"{soc_hint}; or cut the largest drain ({largest.text()}); or recharge every "
            f"{fq(first.months, 'months')} in storage (storage.duration ≤ "
            f"{rounded_toward(first.months, 3, 'down'):.3g} months)")
    if b.duration > to_limit:
        tail = (f"{fq(after.months, 'months')} later it falls below the cell's lower limit "
                f"{fq(b.lower_limit, 'V')} (drains after the cut-off: "
                f"{', '.join(d.text() for d in after.drains)})" if after is not None else
                f"no charge is left between the cut-off and the cell's lower limit "
                f"{fq(b.lower_limit, 'V')}")
        yield ctx.finding(
            f"stored {b.duration:.3g} months at {b.soc * 100:.3g} % and {b.temperature:g} °C,"
            f"{where} reaches the over-discharge cut-off ({fq(b.cutoff_voltage, 'V')}) after "
            f"{fq(first.months, 'months')} ({drains}, {sd}); {tail}: the cells may be damaged "
            f"before the pack is used",
            path=("storage", "duration"), element=element, key="lower-limit", figures=figures,
            headline="months to cut-off", lower_is_worse=True,
            assumptions=b.assumptions,
            hint=hint)
        return
    yield ctx.finding(
        f"stored {b.duration:.3g} months at {b.soc * 100:.3g} % and {b.temperature:g} °C,{where} "
        f"reaches the over-discharge cut-off ({fq(b.cutoff_voltage, 'V')}) after "
        f"{fq(first.months, 'months')} ({drains}, {sd}): the pack ships cut off and needs a charger "
        f"to wake",
        path=("storage", "duration"), element=element, key="cutoff", figures=figures,
        headline="months to cut-off", lower_is_worse=True,
        assumptions=b.assumptions,
        severity=Severity.warning, hint=hint)
