from packwarden import Example, Figure, RuleOptions, Severity, format_quantity as fq, rule
from pydantic import Field
from packwarden.model import FUSE_DERATING


class Options(RuleOptions):
    derating: float = Field(FUSE_DERATING, gt=0, le=1, description=(
        "fraction of the fuse rating it may carry continuously [practice: 75 % at 25 °C]"))
    i2t_margin: float = Field(0.48, gt=0, le=1, description=(
        "fraction of the melting I²t a protected event may let through [practice: 48 % for 100 pulses]"))


@rule(id="secondary-protection",
      summary="a fuse or PTC backs up the electronics, in series with the whole path",
      severity=Severity.error, options=Options, example=Example(
          bad="F1: {part: OR-FUSE-5A, pins: [B+, P+]}   # derated 3.75 A, below a 7.8 A trip max",
          good="F1: {part: OR-FUSE-12A, pins: [B+, P+]}"))
def check(ctx, options):
    """The protector and its FETs can fail short; an independent fuse (or PTC) in series with the
    whole power path, in both directions and not bypassable, is the backup. It must carry, derated,
    the highest current the electronic protection permits, be rated for the highest pack or
    charger voltage, break the prospective short-circuit current, and let the electronics act
    first: the I²t let through during the longest over-current and short-circuit delays must stay
    well below its melting I²t."""
    m = ctx.model
    if m.stack is None:
        return
    fuses = m.netlist.of_kind("fuse", "ptc")
    series = [f for f in fuses if m.in_series_with_path(f.refdes)]
    for f in fuses:
        if f not in series:
            yield ctx.finding(
                f"{f.refdes} is not in series with the whole power path: current can bypass it",
                path=f.path + ("pins",), element=f.refdes, key="bypassed",
                hint="place the fuse between the cell stack and a pack terminal, with no parallel path")
    if not series:
        yield ctx.finding(
            "no fuse or PTC in series with the power path: a shorted FET leaves the cells unprotected",
            path=("components",), key="missing",
            hint="add a fuse between the cell stack and a pack terminal")
        return
    t, sc, psc, p = m.overcurrent_trip, m.short_circuit_trip, m.prospective_short_circuit, m.protector
    sv = m.stack_voltage
    ch = m.design.charger
    for f in series:
        part, path = f.part, f.path + ("part",)
        if f.kind == "fuse":
            derated = m.limits.fuse_current(part)
            if t is not None and t.max > derated:
                yield ctx.finding(
                    f"{f.refdes} carries {fq(derated, 'A')} derated ({fq(m.limits.fuse_derating * 100, '%', 2)} of "
                    f"{fq(part.rated_current, 'A')}) but the electronics permit up to {fq(t.max, 'A')} "
                    f"(over-current trip max): the fuse, not the protector, would act",
                    path=path, element=f.refdes, key="rating",
                    figures=[Figure("derated rating", derated, "A"), Figure("trip max", t.max, "A")],
                    hint=f"use a fuse rated ≥ {fq(t.max / m.limits.fuse_derating, 'A')}")
        vmax = max([sv.max if sv else 0.0] + ([ch.open_circuit_max] if ch else []))
        if part.rated_voltage < vmax:
            yield ctx.finding(
                f"{f.refdes} is rated {fq(part.rated_voltage, 'V')}, below the highest pack or charger "
                f"voltage {fq(vmax, 'V')}: it may not clear an arc",
                path=path, element=f.refdes, key="voltage",
                figures=[Figure("rated voltage", part.rated_voltage, "V"), Figure("highest voltage", vmax, "V")],
                hint=f"use a part rated ≥ {fq(vmax, 'V')}")
        if f.kind == "fuse" and psc is not None and part.breaking_capacity < psc:
            yield ctx.finding(
                f"{f.refdes} breaks {fq(part.breaking_capacity, 'A')} but the prospective short-circuit "
                f"current is {fq(psc, 'A')}",
                path=path, element=f.refdes, key="breaking",
                figures=[Figure("breaking capacity", part.breaking_capacity, "A"),
                         Figure("prospective short circuit", psc, "A")],
                hint=f"use a fuse with breaking capacity ≥ {fq(psc, 'A')}")
        if f.kind == "ptc" and t is not None and part.hold_current < m.design.load.continuous:
            yield ctx.finding(
                f"{f.refdes} holds {fq(part.hold_current, 'A')}, below the continuous load "
                f"{fq(m.design.load.continuous, 'A')}: it trips in normal use",
                path=path, element=f.refdes, key="hold",
                hint=f"use a PTC with hold current ≥ {fq(m.design.load.continuous, 'A')} at the highest ambient")
        if f.kind != "fuse" or p is None:
            continue
        if part.melting_i2t is None:
            yield ctx.finding(
                f"{f.refdes} gives no melting_i2t, so its coordination with the protector cannot be checked",
                path=path, element=f.refdes, key="no-i2t", severity="info",
                hint="add melting_i2t from the fuse data sheet")
            continue
        allowed = part.melting_i2t * options.i2t_margin
        events = []
        if t is not None:
            events.append(("over-current", t.max, p.part.overcurrent.delay.high))
        if sc is not None and psc is not None and p.part.short_circuit is not None:
            events.append(("short-circuit", psc, p.part.short_circuit.delay.high))
        for what, current, delay in events:
            i2t = current * current * delay  # rectangular pulse, I²·t [published: definition]
            if i2t > allowed:
                yield ctx.finding(
                    f"{f.refdes} lets through {fq(i2t, 'A²s')} during the longest {what} delay "
                    f"({fq(current, 'A')} for {fq(delay, 's')}), above {fq(options.i2t_margin * 100, '%', 2)} of "
                    f"its melting I²t {fq(part.melting_i2t, 'A²s')}: the fuse may blow before the "
                    f"protector acts", path=path, element=f.refdes, key=f"i2t-{what}",
                    figures=[Figure("let-through I²t", i2t, "A²s"), Figure("melting I²t", part.melting_i2t, "A²s")],
                    hint=f"use a fuse with melting I²t ≥ {fq(i2t / options.i2t_margin, 'A²s')}, or a "
                         f"protector with a shorter {what} delay")
