from packwarden import Example, Figure, RuleOptions, Severity, format_quantity as fq, rule
from packwarden import Field
from packwarden.model import FUSE_DERATING
from packwarden.model.fuse import ADIABATIC_TIME, melt_limit, ptc_hold_current, pulse_i2t_fraction


class Options(RuleOptions):
    derating: float = Field(FUSE_DERATING, gt=0, le=1, description=(
        "fraction of the fuse rating it may carry continuously [practice: 75 % at 25 °C]"))
    i2t_margin: float = Field(pulse_i2t_fraction(100), gt=0, le=1, description=(
        "fraction of the melting I²t a protected event may let through [practice: 48 % for 100 pulses]"))


@rule(id="secondary-protection",
      summary="a fuse or PTC backs up the electronics, in series with the whole path",
      severity=Severity.error, options=Options, example=Example(
          bad="F1: {part: OR-FUSE-5A, pins: [B+, P+]}   # derated 3.75 A, below a 5.5 A permitted",
          good="F1: {part: OR-FUSE-12A, pins: [B+, P+]}"))
def check(ctx, options):
    """The protector and its FETs can fail short; an independent fuse (or PTC) in series with the
    whole power path, in both directions and not bypassable, is the backup. It must carry, derated
    (and at the highest ambient by the maker's derating curve where the part gives
    ``ambient_derating``), the highest current the electronic protection permits for ever (the
    ``permitted`` event), be
    rated for the highest pack or charger voltage, break the prospective short-circuit current,
    and let the electronics act first: in the gap overload (the largest current only the
    over-current detection clears, for its longest delay) and the hard short, the I²t it lets
    through must stay well below the I²t that melts it in that time — the melting I²t for a short
    pulse, its time-current behaviour (the part's pre-arcing points, else the standard's gates
    for its speed) for a longer event. A PTC must hold the continuous load at the highest
    ambient (its hold current from the part's hold_derating table, else 70 % at 60 °C
    [practice]) and withstand the highest short-circuit current through it (I_max)."""
    m = ctx.model
    if m.stack is None:
        return
    fuses = m.netlist.of_kind("fuse", "ptc", "heater_fuse")  # a heater fuse is a fuse too
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
    psc, p = m.prospective_short_circuit, m.protector
    permitted = m.event("permitted")
    sv = m.stack_voltage
    ch = m.design.charger
    for f in series:
        part, path = f.part, f.path + ("part",)
        if f.kind != "ptc":
            hot = m.ambient.max
            derated = m.limits.fuse_current(part, hot)
            curve = (f", and by its derating curve at the highest ambient {fq(hot, '°C')}"
                     if part.ambient_derating and derated < m.limits.fuse_current(part) else "")
            i_ever = permitted.current_through(f.refdes) if permitted is not None else None
            if i_ever is not None and i_ever > derated:
                yield ctx.finding(
                    f"{f.refdes} carries {fq(derated, 'A')} derated ({fq(m.limits.fuse_derating * 100, '%', 2)} of "
                    f"{fq(part.rated_current, 'A')}{curve}) but the electronics permit {fq(i_ever, 'A')} "
                    f"through it for ever (the permitted event, at {fq(permitted.ambient, '°C')} ambient): the fuse, not "
                    f"the protector, would act",
                    path=path, element=f.refdes, key="rating",
                    headline="permitted current",
                    figures=[Figure("derated rating", derated, "A"),
                             Figure("permitted current", i_ever, "A")],
                    hint=f"use a fuse rated ≥ {fq(i_ever * part.rated_current / derated, 'A')}")
        vmax = max([sv.max if sv else 0.0] + ([ch.open_circuit_max] if ch else []))
        if part.rated_voltage < vmax:
            yield ctx.finding(
                f"{f.refdes} is rated {fq(part.rated_voltage, 'V')}, below the highest pack or charger "
                f"voltage {fq(vmax, 'V')}: it may not clear an arc",
                path=path, element=f.refdes, key="voltage",
                headline="highest voltage",
                figures=[Figure("rated voltage", part.rated_voltage, "V"), Figure("highest voltage", vmax, "V")],
                hint=f"use a part rated ≥ {fq(vmax, 'V')}")
        if f.kind != "ptc" and psc is not None and part.breaking_capacity < psc:
            yield ctx.finding(
                f"{f.refdes} breaks {fq(part.breaking_capacity, 'A')} but the prospective short-circuit "
                f"current is {fq(psc, 'A')}",
                path=path, element=f.refdes, key="breaking",
                headline="prospective short circuit",
                figures=[Figure("breaking capacity", part.breaking_capacity, "A"),
                         Figure("prospective short circuit", psc, "A")],
                hint=f"use a fuse with breaking capacity ≥ {fq(psc, 'A')}")
        if f.kind == "ptc":
            yield from _ptc(ctx, m, f, path)
        if f.kind == "ptc" or p is None:
            continue
        if part.melting_i2t is None:
            yield ctx.finding(
                f"{f.refdes} gives no melting_i2t, so its coordination with the protector cannot be checked",
                path=path, element=f.refdes, key="no-i2t", severity="info",
                hint="add melting_i2t from the fuse data sheet")
            continue
        yield from _coordination(ctx, options, m, f, path)


def _coordination(ctx, options, m, f, path):
    """The fuse against each event the protector ends: it must not melt before the protector acts."""
    part = f.part
    points = [(pt.current, pt.time) for pt in part.pre_arcing] if part.pre_arcing else None
    for event in (m.event("gap-overload"), m.event("fast-gap-overload"),
                  m.event("hard-short")):
        if event is None:
            continue
        current, i2t = event.current_through(f.refdes), event.i2t_through(f.refdes)
        if not current > 0:
            continue
        limit = melt_limit(current, event.duration, part.rated_current, part.speed.value,
                           part.melting_i2t, points)
        if limit.i2t is None or i2t <= options.i2t_margin * limit.i2t:
            continue
        yield ctx.finding(
            f"{f.refdes} lets through {fq(i2t, 'A²s')} in the {event.name} event ({fq(current, 'A')} "
            f"for {fq(event.duration, 's')}, until the {event.detection} detection acts), "
            f"{fq(i2t / limit.i2t * 100, '%', 2)} of the {fq(limit.i2t, 'A²s')} that melts it in that time "
            f"({limit.basis}), above {fq(options.i2t_margin * 100, '%', 2)}: the fuse may blow before "
            f"the protector acts", path=path, element=f.refdes, key=f"i2t-{event.name}",
            headline="let-through I²t",
            figures=[Figure("let-through I²t", i2t, "A²s"), Figure("fuse limit I²t", limit.i2t, "A²s"),
                     Figure("duration", event.duration, "s"), Figure("current", current, "A")],
            hint=_hint(part, event, i2t / options.i2t_margin, points is None and limit.i2t == part.melting_i2t))


def _hint(part, event, needed, melting_only):
    long = event.duration > ADIABATIC_TIME
    kind = " (a time-lag type)" if long and part.speed.value == "quick_acting" else ""
    curve = ("; a time-lag fuse's own pre_arcing points may show it needs more than its melting "
             "I²t" if long and melting_only and part.speed.value == "time_lag" else "")
    return (f"use a fuse that needs ≥ {fq(needed, 'A²s', toward='up')} to melt in {fq(event.duration, 's')}"
            f"{kind}, or a protector with a shorter {event.detection} delay{curve}")


def _ptc(ctx, m, f, path):
    """A PTC holds the continuous load at the highest ambient (its hold current derated there)
    and withstands the highest short-circuit current through it (I_max)."""
    part, hot, load = f.part, m.ambient.max, m.design.load.continuous
    points = [(pt.ambient, pt.current) for pt in part.hold_derating or ()]
    hold = ptc_hold_current(part.hold_current, hot, points)
    if m.overcurrent_trip is not None and hold.current < load:
        yield ctx.finding(
            f"{f.refdes} holds {fq(hold.current, 'A')} at the highest ambient {hot:g} °C "
            f"({fq(part.hold_current, 'A')} at 25 °C; {hold.basis}), below the continuous load "
            f"{fq(load, 'A')}: it trips in normal use",
            path=path, element=f.refdes, key="hold",
            headline="hold current at the highest ambient", lower_is_worse=True,
            figures=[Figure("hold current at the highest ambient", hold.current, "A"),
                     Figure("continuous load", load, "A")],
            hint=f"use a PTC with hold current ≥ {fq(load, 'A')} at {hot:g} °C")
    shorts = [(e.current_through(f.refdes), f"the {e.name} event") for e in m.events
              if e.duration is not None]
    if m.prospective_short_circuit is not None:
        shorts.append((m.prospective_short_circuit, "the prospective short circuit"))
    if not shorts:
        return
    worst, what = max(shorts)
    if part.max_current < worst:
        yield ctx.finding(
            f"{f.refdes} withstands {fq(part.max_current, 'A')} (I_max) but carries {fq(worst, 'A')} "
            f"({what}): it may fail before it trips, or fail to interrupt",
            path=path, element=f.refdes, key="interrupt",
            headline="highest current",
            figures=[Figure("I_max", part.max_current, "A"), Figure("highest current", worst, "A")],
            hint=f"use a PTC with I_max ≥ {fq(worst, 'A')}")
