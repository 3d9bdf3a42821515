from packwarden import Example, Figure, Severity, format_quantity as fq, rule


@rule(id="deep-discharge-recovery",
      summary="a cell below its lower limit is charged only as its maker allows: at the "
              "pre-charge current, or not at all",
      severity=Severity.error, example=Example(
          bad="low_voltage_charge: {allowed: true}   # the 0.8 A charger into a 3.4 Ah cell at 0 V",
          good="low_voltage_charge: {allowed: false, inhibit_below: 2.2 V}"))
def check(ctx, options):
    """A lithium cell that sat below its lower limit may have dissolved copper from its anode
    current collector, which plates back as it is charged and can grow into an internal short.
    Cell makers either forbid charging such a cell or allow it only with a small pre-charge
    current (about 0.1 C [practice]) until it passes a recovery voltage. A protector says what
    it does with such a cell (``low_voltage_charge``): it inhibits charging below a voltage, or
    it charges a cell at any voltage, through the charge switch, its body diode (both pass the
    charger's full current) or a limited current. Where it charges a cell below the cell's lower
    limit, the current per cell must stay within the maker's pre-charge limit, and the maker
    must allow recovery at all."""
    m = ctx.model
    lv, p, stack = m.low_voltage_charging, m.protector, m.stack
    if lv is None or not lv.charges_below_limit:
        return
    ref = stack.cells[0].refdes
    where = ("at any voltage, down to 0 V" if lv.below == 0.0
             else f"down to {fq(lv.below, 'V')}")
    figures = [Figure("charged down to", lv.below, "V"), Figure("lower limit", lv.lower_limit, "V")]
    path = ctx.part_path(p.refdes)
    if not lv.recovery_allowed:
        yield ctx.finding(
            f"{p.refdes} charges a cell {where}, below its lower limit {fq(lv.lower_limit, 'V')}, "
            f"and the cell maker forbids charging a cell that fell below it",
            path=path, element=p.refdes, key="forbidden", figures=figures,
            headline="charged down to", lower_is_worse=True,
            hint=f"inhibit charging below the cell's lower limit (a part or setting with "
                 f"low_voltage_charge: {{allowed: false, inhibit_below: ≥ "
                 f"{fq(lv.lower_limit, 'V')}}})")
        return
    if lv.current is None or lv.current <= lv.precharge_limit:
        return
    source = ("0.1 C of its rated capacity [practice]; the cell gives no recovery."
              "precharge_current" if lv.precharge_assumed else "the cell maker's pre-charge limit")
    through = {"charge_switch": "through the charge switch",
               "body_diode": "through the charge switch's body diode",
               "current_limit": "at its limited current"}[lv.path]
    yield ctx.finding(
        f"{p.refdes} charges a cell {where}, below its lower limit {fq(lv.lower_limit, 'V')}, "
        f"{through} at {fq(lv.current, 'A')} per cell: above {fq(lv.precharge_limit, 'A')} "
        f"({source}) until it passes {fq(lv.recovery_voltage, 'V')}",
        path=path, element=p.refdes, key="current",
        headline="charge current per cell",
        figures=figures + [Figure("charge current per cell", lv.current, "A"),
                           Figure("pre-charge limit", lv.precharge_limit, "A")],
        hint=f"inhibit charging below the lower limit, or limit the low-voltage charge current to "
             f"≤ {fq(lv.precharge_limit * stack.parallel, 'A')} at the pack "
             f"(low_voltage_charge: {{path: current_limit, current: ...}})")
