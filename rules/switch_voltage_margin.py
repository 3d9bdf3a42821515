from packwarden import Example, Figure, RuleOptions, Severity, format_quantity as fq, rule
from packwarden.model.limits import VDS_DERATING
from ._spike import spike_within
from packwarden import Field


class Options(RuleOptions):
    vds_derating: float = Field(VDS_DERATING, gt=0, le=1, description=(
        "fraction of vds_max a switch may block [practice: commercial derating 80 %]"))
    vgs_derating: float = Field(0.7, gt=0, le=1, description=(
        "fraction of vgs_max the gate may see [published: MIL-DTL-917 table XIX, 70 %]"))


@rule(id="switch-voltage-margin",
      summary="switch FETs block the worst voltages with derating, and gate drive fits the FET",
      severity=Severity.error, options=Options, example=Example(
          bad="charger: {open_circuit_max: 24 V, reverse_polarity: possible}\nQ1: vds_max: 20 V",
          good="charger: {open_circuit_max: 5.5 V, reverse_polarity: possible}\nQ1: vds_max: 20 V"))
def check(ctx, options):
    """An off switch holds the whole difference between the cell stack and whatever sits on the
    pack terminals: the stack itself under load, a charger's open-circuit voltage against a
    depleted stack, a reversed charger in series with the stack, and — when the design gives
    ``pack.wiring_inductance`` — the stack plus the L·di/dt spike of turning off a short. Each must
    stay within the FET's drain-source rating with derating. The gate sees the protector's drive,
    which must stay within the gate rating with derating, and must exceed the gate threshold at
    the lowest cell voltage the protector allows, or the FET is not fully on near the end of
    discharge."""
    m = ctx.model
    gd = m.gate_drive
    seen = set()
    for ch, why in m.gate_drive_problems:
        yield ctx.finding(
            f"{ch.name} ({ch.role} switch, {ch.channel}-channel) cannot be turned on by "
            f"{m.protector.refdes}: {why}",
            path=ch.path + ("pins",), element=ch.package, key=f"drive-{ch.name}",
            hint="use a p-channel FET on the positive rail or an n-channel FET on the negative "
                 "rail, or a protector with a gate driver (give its drive as gate_drive: 12 V, and "
                 "gate_drive_boosted: true when a charge pump or bootstrap holds it above the stack)")
    for ch in m.channels:
        if ch.role is None:
            continue
        part, path = ch.part, ("components", ch.package, "part")
        cases = m.blocking_voltage(ch.role)
        spike = m.turn_off_spike(ch)
        av = m.avalanche(ch)
        if av is not None and part.e_as is not None and av.energy <= part.e_as:
            spike = None  # it clamps in avalanche within its rated energy (short-circuit-stress)
        if spike is not None:
            # The turn-off spike of a short rides on the stack voltage; derated here like any
            # other peak, and against the bare rating (avalanche) in short-circuit-stress.
            cases = sorted(cases + [(spike.describe(), spike.total)], key=lambda c: -c[1])
        if cases:
            what, v = cases[0]
            limit = part.vds_max * options.vds_derating
            total = v
            if total > limit:
                yield ctx.finding(
                    f"{ch.name} ({ch.role} switch) must block {fq(total, 'V')} ({what}) but "
                    f"{fq(options.vds_derating * 100, '%', 2)} of its vds_max {fq(part.vds_max, 'V')} "
                    f"is {fq(limit, 'V')}",
                    path=path, element=ch.package, key=f"vds-{ch.name}",
                    # the turn-off spike is also short-circuit-stress's cause: said once
                    cause=("turn-off-spike" if spike is not None and what == spike.describe()
                           else f"vds-{ch.role}") + ch.name[len(ch.package):],
                    headline="blocking voltage",
                    figures=[Figure("blocking voltage", total, "V"), Figure("vds_max", part.vds_max, "V"),
                             Figure("derated limit", limit, "V")],
                    hint=f"use a FET with vds_max ≥ {fq(total / options.vds_derating, 'V', toward='up')}"
                         + (", or prevent reverse charger connection" if "reversed" in what else "")
                         + (f", or {spike_within(spike, limit, m.turn_off_window(spike, limit))}"
                            if "wiring spike" in what and spike_within(spike, limit) else ""))
        if gd is None or ch.package in seen:
            continue
        seen.add(ch.package)
        glimit = part.vgs_max * options.vgs_derating
        if gd.max > glimit:
            yield ctx.finding(
                f"{ch.package} gate drive reaches {fq(gd.max, 'V')} but {fq(options.vgs_derating * 100, '%', 2)} "
                f"of its vgs_max {fq(part.vgs_max, 'V')} is {fq(glimit, 'V')}",
                path=path, element=ch.package, key="vgs",
                headline="gate drive max",
                figures=[Figure("gate drive max", gd.max, "V"), Figure("vgs_max", part.vgs_max, "V")],
                hint=f"use a FET with vgs_max ≥ {fq(gd.max / options.vgs_derating, 'V', toward='up')}, "
                     f"or a protector whose gate drive stays at or below {fq(glimit, 'V', toward='down')}")
        if ch.vgs_th_max >= gd.min:
            yield ctx.finding(
                f"{ch.package} gate threshold max {fq(ch.vgs_th_max, 'V')} is not below the lowest "
                f"gate drive {fq(gd.min, 'V')} (over-discharge detection): the FET is not fully on "
                f"near the end of discharge",
                path=path, element=ch.package, key="vgs-th",
                headline="vgs_th max",
                figures=[Figure("vgs_th max", ch.vgs_th_max, "V"), Figure("gate drive min", gd.min, "V")],
                hint="use a logic-level FET whose threshold max sits well below the over-discharge detection")

