from packwarden import Q, Example, Figure, RuleOptions, Severity, format_quantity as fq, rule
from packwarden import Field
from packwarden.model import CHARGE_MARGIN

from ._taps import wrong_taps


class Options(RuleOptions):
    charge_margin: Q("V") = Field(
        CHARGE_MARGIN, description="overcharge detection must sit this far above the charger's maximum "
                           "per-cell voltage, else end-of-charge nuisance trips")


@rule(id="threshold-ladder",
      summary="protector thresholds sit in the right order against the cell and the charger",
      severity=Severity.error, options=Options, example=Example(
          bad="charger: {voltage: {typ: 4.35 V, tol: 1 %}}   # above a 4.25 V upper limit\n"
              "overcharge: {detect: {typ: 4.30 V, tol: 25 mV}}",
          good="charger: {voltage: {typ: 4.20 V, tol: 0.5 %}}\n"
               "overcharge: {detect: {typ: 4.30 V, tol: 25 mV}, release: {typ: 4.10 V, tol: 50 mV}}"))
def check(ctx, options):
    """Per cell, with every tolerance at its worst: the charger's maximum must not exceed the
    cell's upper charge limit; overcharge detection must sit above the charger's maximum (with
    margin, else the protector cuts off at the end of every charge) and below the cell's overcharge
    limit; each release must lie on the safe side of its detection; over-discharge detection must
    stay above the cell's lower limit. The protector must be made for the pack's cell count and
    chemistry, and in a series stack each cell input (cell1 at the bottom ... cellN at the top)
    must sense its own tap, since every threshold is per cell. Where a data sheet gives no limit,
    a documented per-chemistry default is used and named in the finding."""
    m = ctx.model
    p, limits, stack = m.protector, m.cell_limits, m.stack
    if p is None or limits is None or stack is None:
        return
    part = p.part
    ppath = ("components", p.refdes, "part")
    if part.cells != stack.series:
        yield ctx.finding(
            f"{p.refdes} protects {part.cells} cell(s) in series but the pack has {stack.series}",
            path=ppath, element=p.refdes, key="cell-count",
            headline="series cells", lower_is_worse=stack.series < part.cells,
            figures=[Figure("protector cells", part.cells, ""), Figure("series cells", stack.series, "")],
            hint=f"use a protector for {stack.series} series cell(s)")
    # A pin on the wrong tap measures two cells, or none, as one: every per-cell threshold of that
    # pin and its neighbour is then off by a whole cell voltage.
    yield from wrong_taps(ctx, p.refdes, m.cell_taps, ("components", p.refdes),
                          "the per-cell thresholds of that cell and its neighbour compare the "
                          "wrong voltages")
    if part.chemistry and limits.chemistry not in {c.value for c in part.chemistry}:
        made = ", ".join(c.value for c in part.chemistry)
        yield ctx.finding(
            f"{p.refdes} is made for {made} cells but {stack.cells[0].refdes} is {limits.chemistry}: "
            f"overcharge detect {fq(part.overcharge.detect.low, 'V')}–{fq(part.overcharge.detect.high, 'V')} "
            f"against a cell charge voltage of {fq(limits.charge, 'V')} and overcharge limit "
            f"{fq(limits.overcharge_limit, 'V')}; over-discharge detect "
            f"{fq(part.overdischarge.detect.low, 'V')}–{fq(part.overdischarge.detect.high, 'V')} "
            f"against a cut-off of {fq(limits.cutoff, 'V')} and lower limit {fq(limits.lower_limit, 'V')}",
            path=ppath, element=p.refdes, key="chemistry",
            hint=f"use a protector whose thresholds are made for {limits.chemistry} cells")
    ch = m.charger_per_cell
    oc, od = part.overcharge, part.overdischarge
    if ch is not None:
        if ch.max > limits.upper_limit + 1e-9:
            yield ctx.finding(
                (f"charger maximum {fq(ch.max, 'V')} per cell exceeds the cell's upper charge "
                     f"limit {fq(limits.upper_limit, 'V')}"),
                path=("charger", "voltage"), element=stack.cells[0].refdes, key="charger-vs-upper",
                assumptions=limits.assumptions,
                headline="charger max per cell",
                figures=[Figure("charger max per cell", ch.max, "V"),
                         Figure("cell upper limit", limits.upper_limit, "V")],
                hint=f"tighten the charger to at most {fq(limits.upper_limit, 'V')} per cell with "
                     f"tolerance{_charger_typ(m, ch, limits.upper_limit, oc.detect.low)}")
        need = ch.max + m.limits.charge_margin
        if oc.detect.low < need - 1e-9:
            yield ctx.finding(
                f"overcharge detection min {fq(oc.detect.low, 'V')} is below the charger maximum "
                f"{fq(ch.max, 'V')} per cell + {fq(m.limits.charge_margin, 'V')} margin: the "
                f"protector may cut off at the end of a normal charge",
                path=ppath, element=p.refdes, key="overcharge-vs-charger",
                headline="overcharge detect min", lower_is_worse=True,
                figures=[Figure("overcharge detect min", oc.detect.low, "V"),
                         Figure("charger max per cell", ch.max, "V"),
                         Figure("margin", m.limits.charge_margin, "V")],
                hint=f"a protector with overcharge detection ≥ {fq(need, 'V')} at its lowest, or a "
                     f"charger with a tighter tolerance"
                     f"{_charger_typ(m, ch, limits.upper_limit, oc.detect.low)}")
    if oc.detect.high > limits.overcharge_limit + 1e-9:
        yield ctx.finding(
            (f"overcharge detection max {fq(oc.detect.high, 'V')} exceeds the cell's overcharge "
                 f"limit {fq(limits.overcharge_limit, 'V')}"),
            path=ppath, element=p.refdes, key="overcharge-vs-limit",
            assumptions=limits.assumptions,
            headline="overcharge detect max",
            figures=[Figure("overcharge detect max", oc.detect.high, "V"),
                     Figure("cell overcharge limit", limits.overcharge_limit, "V")],
            hint="use a protector variant with a lower overcharge detection voltage")
    if oc.release is not None and oc.release.high >= oc.detect.low:
        yield ctx.finding(
            f"overcharge release max {fq(oc.release.high, 'V')} is not below detection min "
            f"{fq(oc.detect.low, 'V')}: the protector may never release, or release into overcharge",
            path=ppath, element=p.refdes, key="overcharge-release",
            headline="overcharge release max",
            figures=[Figure("overcharge release max", oc.release.high, "V"),
                     Figure("overcharge detect min", oc.detect.low, "V")],
            hint="check the data sheet: release must sit below detection at every tolerance")
    if od.detect.low < limits.lower_limit - 1e-9:
        yield ctx.finding(
            (f"over-discharge detection min {fq(od.detect.low, 'V')} is below the cell's lower "
                 f"limit {fq(limits.lower_limit, 'V')}"),
            path=ppath, element=p.refdes, key="overdischarge-vs-limit",
            assumptions=limits.assumptions,
            headline="over-discharge detect min", lower_is_worse=True,
            figures=[Figure("over-discharge detect min", od.detect.low, "V"),
                     Figure("cell lower limit", limits.lower_limit, "V")],
            hint="use a protector variant with a higher over-discharge detection voltage")
    if od.release is not None and od.release.low <= od.detect.high:
        yield ctx.finding(
            f"over-discharge release min {fq(od.release.low, 'V')} is not above detection max "
            f"{fq(od.detect.high, 'V')}: the output can switch on and off at the threshold",
            path=ppath, element=p.refdes, key="overdischarge-release",
            headline="over-discharge release min", lower_is_worse=True,
            figures=[Figure("over-discharge release min", od.release.low, "V"),
                     Figure("over-discharge detect max", od.detect.high, "V")],
            hint="check the data sheet: release must sit above detection at every tolerance")


def _charger_typ(m, ch, upper_limit, detect_low):
    """The highest typical charger voltage (its tolerance kept) whose maximum per cell is within
    the cell's upper limit and below the overcharge detection by the margin, as a hint's tail."""
    typ = m.design.charger.voltage.typ if m.design.charger is not None else None
    if typ is None or not ch.max > 0:
        return ""
    ceiling = min(upper_limit, detect_low - m.limits.charge_margin)
    # the charger's window per cell scales with its typical voltage
    highest = typ * ceiling / ch.max
    return (f" (both hold with charger.voltage typ ≤ {fq(highest, 'V', 4, toward='down')} at its "
            f"tolerance; now {fq(typ, 'V', 4)})")
