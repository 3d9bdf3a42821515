import math

from packwarden import Example, Figure, RuleOptions, Severity, format_quantity as fq, rule
from packwarden import Field

from ._spike import spike_within


class Options(RuleOptions):
    pulse_margin: float = Field(1.0, gt=0, le=1, description=(
        "fraction of id_pulse_max a channel may carry during a short (1.0: the rating itself; "
        "id_pulse_max is already an absolute maximum)"))


@rule(id="short-circuit-stress",
      summary="the switches survive a hard short until the protection turns it off",
      severity=Severity.error, options=Options, example=Example(
          bad="pack: {wiring_inductance: 200 nH}   # 110 A cut in 1 µs: 22 V spike + 4.3 V > 20 V",
          good="pack: {wiring_inductance: 20 nH}    # 2.2 V spike + 4.3 V, within 20 V"))
def check(ctx, options):
    """A hard short across the pack terminals draws its current as it happens — the highest cell
    voltage over the lowest cell, switch and copper resistance, each switch with the gate drive
    the short leaves it (the hard-short event) — through every switch channel in the path, as
    the current divides between parallel packages, until the longest short-circuit delay has
    passed (the over-current delay when the short does not reach the short-circuit trip). Each
    channel must stay within its pulse drain current id_pulse_max; the pulse's I²t is reported
    beside it. Turning that current off through the pack wiring's inductance adds L·di/dt to the
    stack voltage across the discharge switch; past vds_max the FET avalanches (no derating
    here: avalanche is the physical limit — the derated margin is switch-voltage-margin's).
    Where the part gives its avalanche energy rating ``e_as``, the energy it absorbs clamping
    the spike, ½·L·I²·V_BR/(V_BR − V_DD) [published in FET makers' application notes; formula
    from memory], with V_BR taken as vds_max (the real breakdown lies above it, so this errs
    high), is judged against it instead; without it the error stands and states that energy. The
    fuse's side of the short is secondary-protection's."""
    m = ctx.model
    pulse = m.event("hard-short")
    if pulse is None:
        return
    seen = set()
    for ch in m.channels:
        ich = pulse.current_through(ch.name)
        path = ctx.part_path(ch.package)
        limit = ch.part.id_pulse_max
        i2t = pulse.i2t_through(ch.name)
        figures = [Figure("hard-short current", pulse.current, "A"),
                   Figure("channel current", ich, "A"), Figure("duration", pulse.duration, "s"),
                   Figure("I²t", i2t, "A²s")]
        if limit is None:
            if ch.package not in seen and ich > ch.part.id_max:
                seen.add(ch.package)
                yield ctx.finding(
                    f"{ch.package} gives no id_pulse_max, so the {fq(ich, 'A')} it carries in a "
                    f"hard short for {fq(pulse.duration, 's')} cannot be checked",
                    path=path, element=ch.package, key="no-pulse-rating", severity="info",
                    headline="channel current",
                    figures=figures, hint="add id_pulse_max from the FET data sheet")
        elif ich > limit * options.pulse_margin:
            of = (f"{ich / pulse.current * 100:.0f} % of the short's {fq(pulse.current, 'A')}"
                  if ich < 0.999 * pulse.current else f"all of the short's {fq(pulse.current, 'A')}")
            yield ctx.finding(
                f"{ch.name} carries {fq(ich, 'A')} in a hard short ({of}) for up to "
                f"{fq(pulse.duration, 's')}, the longest "
                f"{pulse.detection} delay — above its id_pulse_max {fq(limit, 'A')}; I²t "
                f"{fq(i2t, 'A²s')}",
                path=path, element=ch.package, key=f"pulse-{ch.name}",
                cause="pulse" + _channel_of(ch), assumptions=pulse.assumptions,
                headline="channel current",
                figures=figures + [Figure("id_pulse_max", limit, "A")],
                hint=f"use FETs with id_pulse_max ≥ {fq(ich / options.pulse_margin, 'A')}, share the "
                     f"current over a second pair in parallel, or limit the short with path "
                     f"resistance; a protector with a shorter short-circuit delay shortens the stress")
        spike = m.turn_off_spike(ch)
        if spike is not None and spike.total > ch.part.vds_max:
            av, e_as = m.avalanche(ch), ch.part.e_as
            if e_as is not None and av.energy <= e_as:
                continue  # it clamps the spike in avalanche, within its rated energy
            yield ctx.finding(
                f"{ch.name} (discharge switch) sees {fq(spike.total, 'V')} when it turns off a "
                f"short ({spike.describe()}), above its vds_max {fq(ch.part.vds_max, 'V')}: it "
                f"avalanches{_energy(av, e_as)}",
                path=("pack", "wiring_inductance"), element=ch.package, key=f"spike-{ch.name}",
                cause="turn-off-spike" + _channel_of(ch),
                headline="turn-off voltage",
                figures=[Figure("turn-off voltage", spike.total, "V"), Figure("spike", spike.spike, "V"),
                         Figure("wiring inductance", spike.inductance, "H"),
                         Figure("di/dt", spike.di_dt, "A/s"), Figure("vds_max", ch.part.vds_max, "V"),
                         Figure("avalanche energy", av.energy, "J")]
                + ([Figure("e_as", e_as, "J")] if e_as is not None else []),
                hint=_spike_hint(m, spike, ch.part.vds_max, m.limits.vds_derating) + (
                    "" if e_as is not None or not math.isfinite(av.energy) else
                    f"; or, if its data sheet rates E_AS ≥ {fq(av.energy, 'J')}, give it as e_as"))


def _channel_of(ch) -> str:
    """The channel within its package (".1" of a pair's "Q1.1", "" for a discrete FET): a cause
    said without the package, so parallel packages and switch-voltage-margin share it."""
    return ch.name[len(ch.package):]


def _energy(av, e_as):
    """What the avalanche puts into the FET, against its rating where it gives one."""
    if not math.isfinite(av.energy):
        return ": the stack voltage alone is at its vds_max, so it cannot clamp the current down"
    e = (f", absorbing {fq(av.energy, 'J')} (½·L·I²·V_BR/(V_BR − V_DD) with V_BR taken as "
         f"vds_max and V_DD {fq(av.v_dd, 'V')})")
    if e_as is None:
        return e + "; the part gives no e_as to judge it by"
    return e + f", above its e_as {fq(e_as, 'J')}"


def _spike_hint(m, spike, vds_max, derating):
    # The values proposed meet the derated limit switch-voltage-margin holds the same spike to
    # (Limits.vds_derating), not only the bare rating: a hint that fits one rule fits both.
    limit = vds_max * derating
    within = spike_within(spike, limit, m.turn_off_window(spike, limit))
    rated = f"FETs with vds_max ≥ {fq(spike.total / derating, 'V', toward='up')}"
    return f"{within}, or {rated}" if within else f"use {rated}"
