from packwarden import Q, Example, Figure, RuleOptions, Severity, format_quantity as fq, rule
from packwarden.model.limits import BALANCE_CYCLE, BALANCE_TIME, SELF_DISCHARGE_SPREAD, \
    SERVICE_CYCLES
from packwarden import Field

from packwarden.model.fit import scaled_resistors, value_inside

from ._fit import Fit


class Options(RuleOptions):
    cycle_time: Q("s", gt=0, le=3.2e7) = Field(
        BALANCE_CYCLE, description="time from one charge to the next (use and rest), over which "
                                   "the unequal drains act, e.g. '86400 s' (a day)")
    balancing_time: Q("s", gt=0, le=86400.0) = Field(
        BALANCE_TIME, description="time per charge the balancer bleeds a high cell (the "
                                  "charger's constant-voltage phase), e.g. '3600 s' (an hour)")
    self_discharge_spread: Q("%", ge=0, le=100) = Field(
        SELF_DISCHARGE_SPREAD * 100.0,
        description="how much one cell's self-discharge may exceed another's, as a share of the "
                    "cell's own rate")
    service_cycles: int = Field(
        SERVICE_CYCLES, ge=1, le=100000,
        description="charge cycles the pack must serve: an imbalance that grows must not bring a "
                    "cell to its overcharge detection within them")


@rule(id="cell-balance",
      summary="the balancer of a series stack bleeds off what unequal drains put between the "
              "cells each charge cycle",
      severity=Severity.warning, options=Options,
      example=Example(bad="R45: {kind: resistor, value: 1 kΩ, pins: [B1, VTAP]}   # 1.8 mA from "
                          "the bottom cell alone\n"
                          "R46: {kind: resistor, value: 1 kΩ, pins: [VTAP, B-]}",
                      good="R45: {kind: resistor, value: 1 MΩ, pins: [B+, VMON]}   # the same "
                           "current from every cell\n"
                           "R46: {kind: resistor, value: 150 kΩ, pins: [VMON, B-]}"))
def check(ctx, options):
    """The load current flows through every cell of a series stack alike, but some drains reach
    only some of its levels: an LED, divider or fuel-gauge supply between taps, the protector's
    cell inputs (the input of cell K draws from tap K to ground, so the bottom cell carries every
    input's current) and the cells' unequal self-discharge. Each charge cycle the levels that lose
    less end up higher, and a passive balancer bleeds them down through its resistor and switch,
    only near full and only for the balancing time of each charge. Where it bleeds less than a
    level gains, the imbalance grows every cycle: the pack loses capacity (the low cell reaches
    the over-discharge detection first) and, with the charger holding only the sum of the cell
    voltages, the high cell is pushed above the charger's voltage per cell (warning). When that
    takes the high cell to its overcharge detection minimum within the service life, or already in
    one cycle, with the charger inside its own range, the pack is cut off at the end of charge or
    a cell sits above its charge voltage on every charge (error). A stack with no balancer whose
    only drift is the assumed self-discharge spread is not judged, and on that spread alone a
    finding is at most a warning. The figures are a budget on data-sheet maxima; the cell maker's
    instructions and the pack's own balance tests rule."""
    m = ctx.model
    cb = m.cell_balance  # first: its solves add the problems below
    for problem in m.problems:
        if problem.what == "balance":
            yield ctx.finding(problem.message, path=problem.path, key="model",
                              element=m.stack.cells[0].refdes if m.stack else None,
                              hint="give the cell's ocv points with SoC and voltage both rising"
                              if "ocv" in problem.message else None)
    if cb is None or cb.holds and not cb.reaches_detection:
        return
    if not cb.has_balancer and cb.design_drift <= _NOISE:
        return
    worst = cb.worst
    top = max(lv.drain for lv in cb.levels)
    most = next(lv for lv in cb.levels if lv.drain >= top - _NOISE)
    # what drains the most drained level and not the high one: the loads between taps that
    # reach it (their elements), and the protector's cell inputs
    elements = [e for group, low, high in cb.tap_loads if low < most.level <= high
                and not low < worst.level <= high for e in group]
    unequal = [d for d in most.drains if d.what == "protector inputs" or set(d.elements) & set(elements)]
    cause = next((e for e in elements if e in ctx.netlist.components), None)
    p = m.protector
    if cause is not None:
        path, element = ctx.netlist.components[cause].path, cause
    else:
        element = worst.bleed_path[0] if worst.bleed_path else p.refdes
        path = ("components", element)
    per = f"{_hours(cb.cycle_time)} cycle"
    drains = ", ".join(d.text() for d in unequal) or "its drains"
    spread = (f"self-discharge spread {fq(cb.spread_current, 'A')} "
              f"({options.self_discharge_spread:g} % of {cb.self_discharge_pct:g} %/month)")
    bleed = (f"the balancer bleeds {fq(worst.removal, 'Ah')} from it "
             f"({', '.join(worst.bleed_path) or 'its switch'} at {fq(worst.bleed, 'A')} for "
             f"{_hours(cb.balancing_time)} near {fq(cb.bleed_voltage, 'V')})"
             if worst.bleed > 0.0 else "no bleed switch serves it")
    cells = ", ".join(worst.cells)
    figures = [Figure("drift per cycle", worst.need, "Ah"),
               Figure("balancer bleed per cycle", worst.removal, "Ah"),
               Figure("imbalance", cb.imbalance, "Ah")]
    if cb.high_cell_voltage is not None:
        figures += [Figure("high cell on the charger", cb.high_cell_voltage, "V"),
                    Figure("overcharge detection min", cb.detection_min, "V")]
    if cb.cycles_to_detection is not None:
        figures.append(Figure("cycles to overcharge detection", cb.cycles_to_detection, ""))
    if cb.design_drift > _NOISE and most.level != worst.level:
        head = (f"level {worst.level} ({cells}) ends each {per} {fq(worst.need, 'Ah')} fuller "
                f"than level {most.level}, which is drained more ({drains} on level "
                f"{most.level}; {spread}); {bleed}")
    else:
        head = (f"level {worst.level} ({cells}) may gain {fq(worst.need, 'Ah')} per {per} on the "
                f"others ({spread}); {bleed}")
    if cb.holds:
        grows = "the balancer holds the drift, but one cycle's drift is already too much"
    else:
        grows = f"the imbalance grows by {fq(cb.net_drift, 'Ah')} every cycle"
    on_charger = (f"the charger at its highest ({fq(cb.charger_per_cell, 'V')} per cell)"
                  if cb.charger_per_cell is not None else "")
    if cb.reaches_detection:
        n = cb.cycles_to_detection
        when = "from the first cycle" if n <= 1.0 else f"after about {n:.3g} cycles"
        tail = (f"; {when} the high cell reaches the overcharge detection minimum "
                f"{fq(cb.detection_min, 'V')} with {on_charger}, inside its range: the "
                f"protector ends every charge there, the other cells short of full")
        # On the assumed self-discharge spread alone it stays a warning: the design itself
        # makes no drift, and the spread is a pessimistic default, not the cells' data.
        severity = Severity.error if cb.design_drift > _NOISE else Severity.warning
    else:
        severity = Severity.warning
        tail = (f", {fq(cb.imbalance, 'Ah')} after {cb.service_cycles} cycles: the pack loses "
                f"that much of its capacity")
        if on_charger:
            tail += (f", and with {on_charger} the high cell sits at "
                     f"{fq(cb.high_cell_voltage, 'V')}, the others at "
                     f"{fq(cb.low_cell_voltage, 'V')}")
    need_bleed = worst.need / (cb.balancing_time / 3600.0)
    hint = (f"move {', '.join(elements)} across the whole stack or switch it off with the product"
            if elements else "")
    more = (f"bleed at least {fq(need_bleed, 'A')} (bleed resistor and switch at most "
            f"{fq(cb.bleed_voltage / need_bleed, 'Ω')} in all) or balance longer each charge"
            f"{_fitted_bleed(ctx, m, cb, need_bleed)}")
    if not worst.bleed > 0.0:  # no resistor value can bleed a level no switch serves
        more = (f"no bleed resistor value helps: no bleed switch serves level {worst.level}; a "
                f"protector or balancer with a bleed switch for every level, bleeding at least "
                f"{fq(need_bleed, 'A')} there (bleed resistor and switch at most "
                f"{fq(cb.bleed_voltage / need_bleed, 'Ω')} in all)")
    if cb.holds and cb.imbalance_to_detection is not None:
        more = (f"charge more often, so that one cycle's drift stays below "
                f"{fq(cb.imbalance_to_detection, 'Ah')}")
    yield ctx.finding(f"{head}: {grows}{tail}", path=path, element=element,
                      key="drift", figures=figures, severity=severity, assumptions=cb.assumptions,
                      headline="drift per cycle",
                      hint=f"{hint}; or {more}" if hint else more)


# A drain difference below a nanoampere is the solver's rounding [derived: storage.py's floor].
_NOISE = 1e-9


def _hours(seconds: float) -> str:
    hours = seconds / 3600.0
    return f"{hours:.3g} h" if hours < 48.0 else f"{hours / 24.0:.3g} days"



def _fitted_bleed(ctx, m, cb, need_bleed):
    """The bleed resistors' value every rule allows (all scaled alike, one value where they are
    alike), found by re-linting: low enough to bleed the drift, high enough for the resistors'
    power and the protector's balance pins. Empty where no search can run or none passes."""
    bleeders = sorted({r for level in cb.levels for r in level.bleed_path
                       if m.netlist.components[r].kind == "resistor"})
    if not bleeders or ctx.relint is None or not cb.worst.bleed > 0.0:
        return ""
    values = {m.netlist.components[r].part.value for r in bleeders}
    fit = Fit(ctx.relint, lambda k: scaled_resistors(m.netlist, bleeders, k),
              lambda i: i[0] == "cell-balance" and i[2] == "drift")
    if fit.before is None:
        return ""
    # the bleed current falls as the resistance rises: no factor above the one that bleeds
    # just enough passes, so the search starts there and steps down
    found = fit.interval(cb.worst.bleed / need_bleed)
    if fit.spent:
        return ""
    names = ", ".join(bleeders)
    if found is None:
        return f"; no value of {names} alone lets every rule pass"
    if len(values) > 1:
        return (f"; or scale {names} by a factor {found.low:.3g}-{found.high:.3g} (every rule "
                f"passes over that range{fit.resolution_note(found)})")
    now = values.pop()
    return (f"; or bleed resistors {names} of {fq(value_inside(now, found), 'Ω')} each (every "
            f"rule passes from {fq(now * found.low, 'Ω', toward='up')} to "
            f"{fq(now * found.high, 'Ω', toward='down')}; now {fq(now, 'Ω')}"
            f"{fit.resolution_note(found)})")
