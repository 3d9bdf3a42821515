from packwarden import Example, Figure, Severity, format_quantity as fq, rule


@rule(id="thermal-fuse-window",
      summary="a thermal fuse opens above the pack's normal temperatures and its resettable "
              "cut-offs, carries the current the protection permits, and interrupts the path",
      severity=Severity.error, example=Example(
          bad="TF1: {kind: thermal_fuse, opening_temperature: {typ: 55 °C, tol: 3}, "
              "rated_current: 40 A, rated_voltage: 32 V, pins: [BTF, BF]}   # U1 stops "
              "discharge only at 54-57 °C",
          good="TF1: {kind: thermal_fuse, opening_temperature: {typ: 90 °C, tol: 5}, "
               "rated_current: 40 A, rated_voltage: 32 V, pins: [BTF, BF]}"))
def check(ctx, options):
    """A thermal fuse (thermal cut-off) in series with the power path opens for good when its
    body reaches its opening temperature: the backup for a pack whose resettable temperature
    cut-off (the protector's or the charger's thermistor input) has failed. It must not open in
    normal use: its lowest opening temperature must lie above the pack's highest ambient and
    above the highest temperature at which the resettable cut-offs of the netlist act, at their
    worst tolerance corner, so they act first (error). It must carry the current the
    electronic protection permits for ever (the ``permitted`` event) within its rated current,
    and be rated for the highest pack or charger voltage (error); one that does not interrupt
    the path between the cells and the terminals protects nothing (warning). It does not open on
    a short circuit, so it is not counted as the over-current backup (secondary-protection)."""
    m = ctx.model
    if m.stack is None:
        return
    ts = m.temperature_sensing
    cutoffs = [c for c in (ts.effective(n) for n in ("charge_hot", "discharge_hot")) if c]
    amb = m.design.pack.ambient
    permitted = m.event("permitted")
    sv, ch = m.stack_voltage, m.design.charger
    vmax = max([sv.max if sv else 0.0] + ([ch.open_circuit_max] if ch else []))
    for f in m.netlist.of_kind("thermal_fuse"):
        part = f.part
        if part is None:
            continue
        path = ctx.part_path(f.refdes)
        if not m.in_series_with_path(f.refdes):
            yield ctx.finding(
                f"{f.refdes} (thermal fuse) is not in series with the path between the cells and "
                f"the pack terminals: when it opens, the pack current goes on",
                path=f.path + ("pins",), element=f.refdes, key="placement", severity="warning",
                hint="put it in series with the cells' lead, between the stack and the fuse or "
                     "the switches")
            continue
        opens = part.opening_temperature
        normal = [(f"the pack's highest ambient {amb.max:.0f} °C", amb.max)] + [
            (f"{c.owner}'s {c.name.replace('_', ' ')} cut-off (up to {c.temperature.max:.1f} °C "
             f"at its worst corner)", c.temperature.max) for c in cutoffs]
        what, hottest = max(normal, key=lambda n: n[1])
        if opens.low <= hottest:
            yield ctx.finding(
                f"{f.refdes} opens from {opens.low:.1f} °C (typical {opens.nominal:.1f} °C), not "
                f"above {what}: it may open for good before the resettable protection acts, or in "
                f"normal use",
                path=path + ("opening_temperature",), element=f.refdes, key="opening",
                headline="opening temperature min", lower_is_worse=True,
                figures=[Figure("opening temperature min", opens.low, "°C"),
                         Figure("highest normal temperature", hottest, "°C")],
                hint=f"choose a thermal fuse whose lowest opening temperature lies above "
                     f"{hottest:.0f} °C")
        i_ever = permitted.current_through(f.refdes) if permitted is not None else None
        ratings = (("current", part.rated_current, i_ever, "A",
                    "the electronics permit {need} through it for ever (the permitted event)"),
                   ("voltage", part.rated_voltage, vmax, "V",
                    "the highest pack or charger voltage is {need}: it may not interrupt it"))
        for key, rated, need, unit, why in ratings:
            if need is not None and need > rated:
                yield ctx.finding(
                    f"{f.refdes} is rated {fq(rated, unit)} but " + why.format(need=fq(need, unit)),
                    path=path + (f"rated_{key}",), element=f.refdes, key=key,
                    headline=f"needed {key}",
                    figures=[Figure(f"rated {key}", rated, unit),
                             Figure(f"needed {key}", need, unit)],
                    hint=f"use a thermal fuse rated ≥ {fq(need, unit)}")
