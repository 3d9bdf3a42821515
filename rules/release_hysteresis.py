from packwarden import Example, Figure, RuleOptions, Severity, format_quantity as fq, rule
from packwarden.model import stress
from packwarden import Q
from packwarden import Field


class Options(RuleOptions):
    cold_factor: float = Field(2.0, ge=1, le=20, description=(
        "internal resistance at cold_at over its 25 °C value [memory: DC internal resistance of "
        "Li-ion cells roughly doubles from 25 °C to -20 °C; sources give 2-4x]"))
    cold_at: Q("°C") = Field(-20.0, lt=25, description="temperature the cold factor is given at")
    retry_limit: Q("°C") = Field(125.0, description=(
        "highest average junction temperature under repeated auto-retries [practice: "
        "T_J ≤ 125 °C]"))
    retry_period: Q("s") = Field(stress.DEFAULT_RETRY_PERIOD, gt=0, description=(
        "retry period assumed when an auto-retrying protector gives no retry_period [memory: "
        "0.1 s to a few seconds; the shortest heats most]"))


@rule(id="release-hysteresis",
      summary="releases by voltage outlast the cell's rebound, and auto-retries stay cool",
      severity=Severity.error, options=Options, example=Example(
          bad="overdischarge: {detect: {typ: 2.50 V, tol: 50 mV}, release: {typ: 2.60 V, tol: 30 mV},"
              " release_on: [voltage]}   # 20 mV against a 108 mV rebound",
          good="overdischarge: {detect: {typ: 2.50 V, tol: 50 mV}, release: {typ: 3.00 V, tol: 100 mV},"
               " release_on: [voltage, charger]}"))
def check(ctx, options):
    """When the protection cuts the current, the cell voltage jumps by the current times its
    internal resistance at once (and relaxes further over minutes). If an over-discharge release
    by voltage sits closer above the detection than that rebound, the switch turns back on, the
    load pulls the cell under the detection again, and the output chatters — worst at the lowest
    ambient, where the internal resistance is highest. The same holds for an overcharge release
    against the charger: stopping the charge drops the cell by I·R, and a release closer than
    that lets the charge switch chatter at the overcharge detection; each cycle stops at the
    detection, so it cannot overcharge the cell, and that finding is a warning. Release by
    charger connection or load removal does not chatter. An over-current or short-circuit
    release that retries automatically repeats the fault current into the switches every retry
    period while the fault persists: the energy of each pulse over the period is an average
    dissipation the junction must stand."""
    m = ctx.model
    p = m.protector
    if p is None or m.stack is None:
        return
    ppath = ctx.part_path(p.refdes)
    for r in stress.release_rebounds(m, options.cold_factor, options.cold_at):
        if r.hysteresis > r.rebound:
            continue
        per_cell = f" per cell ({m.stack.parallel}P)" if m.stack.parallel > 1 else ""
        figures = [Figure("hysteresis", r.hysteresis, "V"), Figure("rebound", r.rebound, "V"),
                   Figure("current", r.current, "A"), Figure("internal resistance", r.resistance, "Ω"),
                   Figure("temperature", r.temperature, "°C")]
        cold = f"internal resistance {fq(r.resistance_25, 'Ω')} max"
        if r.factor > 1.0:
            cold += (f" at 25 °C × {r.factor:.2f} at {r.temperature:.0f} °C = "
                     f"{fq(r.resistance, 'Ω')}, with the assumed cold factor "
                     f"×{options.cold_factor:g} at {options.cold_at:.0f} °C")
        if r.threshold == "overdischarge":
            yield ctx.finding(
                f"over-discharge release hysteresis {fq(r.hysteresis, 'V')} (release min "
                f"{fq(r.release, 'V')} − detect max {fq(r.detect, 'V')}) does not exceed the cell's "
                f"rebound {fq(r.rebound, 'V')} when the {r.basis} {fq(r.current, 'A')}{per_cell} "
                f"is cut ({cold}): the output can switch on and off at the end of discharge",
                path=ppath, element=p.refdes, key="overdischarge",
                headline="hysteresis", lower_is_worse=True,
                figures=figures,
                hint=f"a protector with release ≥ {fq(r.detect + r.rebound, 'V')} at its lowest, or one "
                     f"that releases only on charger connection (release_on: [charger])")
        else:
            yield ctx.finding(
                f"overcharge release hysteresis {fq(r.hysteresis, 'V')} (detect min "
                f"{fq(r.detect, 'V')} − release max {fq(r.release, 'V')}) does not exceed the drop "
                f"{fq(r.rebound, 'V')} of the cell when the charger current "
                f"{fq(r.current, 'A')}{per_cell} stops ({cold}): the charge switch chatters at the "
                f"overcharge detection (each cycle stops there, so the cell is not overcharged)",
                path=ppath, element=p.refdes, key="overcharge", severity="warning",
                headline="hysteresis", lower_is_worse=True,
                figures=figures,
                hint=f"a protector with overcharge release ≤ {fq(r.detect - r.rebound, 'V')} at its "
                     f"highest, or a lower charge current")
    for heat in stress.retry_heat(m, options.retry_period):
        assumed = ([f"retry period not given: {fq(heat.period, 's')} assumed [memory] — add "
                    f"{heat.threshold}.retry_period"] if heat.period_assumed else [])
        for pk, part in heat.parts.items():
            ceiling = min(options.retry_limit, part.tj_max)
            if not heat.runaway[pk] and heat.tj[pk] <= ceiling:
                continue
            chans = {n: i for n, i in heat.channel_current.items()
                     if any(ch.name == n and ch.package == pk for ch in m.channels)}
            i2t = max((heat.i2t(n) for n in chans), default=0.0)
            state = (f"runs away thermally (no steady state at or below tj_max {fq(part.tj_max, '°C')})"
                     if heat.runaway[pk] else
                     f"averages {fq(heat.tj[pk], '°C')} at {m.ambient.max:.0f} °C ambient, above "
                     f"{fq(ceiling, '°C')}")
            yield ctx.finding(
                f"the {heat.threshold.replace('_', '-').replace('overcurrent', 'over-current')} "
                f"release retries automatically into {heat.event}: {pk} takes "
                f"{fq(heat.energy[pk], 'J')} per retry ({fq(max(chans.values(), default=0.0), 'A')} "
                f"for {fq(heat.duration, 's')}, I²t {fq(i2t, 'A²s')} per channel) every "
                f"{fq(heat.period, 's')}, {fq(heat.power[pk], 'W')} on average, and {state}",
                path=ppath, element=pk, key=f"retry-{heat.threshold}-{pk}", assumptions=assumed,
                headline="junction temperature",
                figures=[Figure("energy per retry", heat.energy[pk], "J"),
                         Figure("average power", heat.power[pk], "W"),
                         Figure("junction temperature", heat.tj[pk], "°C"),
                         Figure("retry period", heat.period, "s"), Figure("I²t", i2t, "A²s")],
                hint=_retry_hint(heat, pk, part, ceiling, m.ambient.max))


def _retry_hint(heat, pk, part, ceiling, ambient):
    budget = (ceiling - ambient) / part.theta_ja
    if budget > 0 and heat.energy[pk] > 0:
        period = heat.energy[pk] / budget
        return (f"a retry period ≥ {fq(period, 's')} (at this pulse energy), a latching release "
                f"(release_on: [load_removal]), or a shorter detection delay")
    return "a latching release (release_on: [load_removal]) instead of automatic retries"
