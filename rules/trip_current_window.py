import math
from functools import cache

from packwarden import Example, Figure, Severity, format_quantity as fq, rule
from packwarden.model.fit import STEP, scaled_resistors, value_inside

from ._fit import Fit
from ._rdsfit import loads_to_clear, on_resistance_fit, on_resistance_text, parallel_fits


@rule(id="trip-current-window",
      summary="the over-current trip clears the load yet stays within what the path carries",
      severity=Severity.error, example=Example(
          bad="load: {continuous: 2.5 A}   # one pair, 150 mV detection: trip min 1.8 A",
          good="load: {continuous: 1.2 A}   # trip window 1.8-7.8 A"))
def check(ctx, options):
    """Trip current is the detection voltage over the sense resistance, which is usually the
    switch FETs' own on-resistance, or a shunt resistor between the protector's ground and sense
    pins (the resistance is the path's transresistance, from a nodal solve, either way). Over
    detection tolerance, part spread, gate drive (cell voltage) and ambient, with self-heating
    from the load, it spans a window. A load just below
    the trip is never cut off, so the current the protection permits for ever (the ``permitted``
    event: the trip maximum's corner, with the switches heated by that current where they are the
    sense resistance) must stay within what every element carries continuously: the cells'
    discharge rating and each FET channel's id_max as the current divides.
    Its minimum must clear every load that lasts longer than the shortest over-current delay, else
    the product cuts out in normal use. A hard short must exceed the short-circuit trip maximum,
    or it is caught only by the slower over-current path.

    The hint for a window the sense resistance sets is the range every rule allows, found by
    linting the design again at each try. With a shunt, a factor on the shunt. Sensed across the
    switch FETs, a factor on their R_DS(on) tables, every row alike (a part of the same family in
    another die size), shown as the per-channel value at the trip minimum's corner and as the
    factor, with the rule that fails just beyond each end; less on-resistance lifts the minimum
    over the loads but also the current the trip maximum permits, and the FETs' heat, the cells'
    pulse, the fuse and the copper at it. Where no factor lets every rule pass the hint says so,
    names the rules that fail where the minimum reaches the load, and the structural changes the
    format can describe (a shunt-sensed protector, another cell; a second pair in parallel is
    a factor the search has tried)."""
    m = ctx.model
    p, t, stack = m.protector, m.overcurrent_trip, m.stack
    if p is None or t is None or stack is None:
        return
    ppath = ("components", p.refdes, "part")
    window = [Figure("trip min", t.min, "A"), Figure("trip typ", t.typ, "A"),
              Figure("trip max", t.max, "A")]
    if not math.isfinite(t.at_min.sense_resistance) or t.at_max.sense_resistance <= 0:
        yield ctx.finding(
            f"{p.refdes} sees no power-path resistance between its ground and sense pins, so its "
            f"over-current detection cannot trip", path=("components", p.refdes, "pins"),
            element=p.refdes, key="no-sense",
            hint="connect ground and sense across the switch FETs (or a shunt) in the power path")
        return
    cell = stack.part
    cell_limit = stack.discharge_rating
    fitted = cache(lambda: (_fitted_shunt_hint(ctx, m, t, loads_to_clear(m, p.part.overcurrent))
                            or _fitted_rds_hint(ctx)))
    permitted = m.event("permitted")
    ever = permitted.current if permitted is not None else None
    held = (f" (the permitted event, at {fq(permitted.ambient, '°C')} ambient)"
            if permitted is not None else "")
    if ever is not None and ever > cell_limit:
        yield ctx.finding(
            f"the protection permits {fq(ever, 'A')} for ever, above the cells' discharge rating "
            f"{fq(cell_limit, 'A')} ({stack.parallel}P × {fq(cell.max_current.discharge, 'A')}): a load "
            f"just below the trip is never cut off{held}",
            path=("components", stack.cells[0].refdes, "part"), element=stack.cells[0].refdes,
            key="max-vs-cell", assumptions=permitted.assumptions, headline="permitted current",
            figures=window + [Figure("permitted current", ever, "A"),
                                                 Figure("cell limit", cell_limit, "A")],
            hint=fitted() or _resistance_hint(t, ever / cell_limit, "raise", "maximum",
                                              cell_limit, _shunts(m)))
    # FET channels: current divides across parallel packages as their resistances do
    for ch in m.channels:
        if ch.role is None or permitted is None:
            continue
        ich = permitted.current_through(ch.name)
        if ich > ch.part.id_max:
            yield ctx.finding(
                f"{ch.name} carries {fq(ich, 'A')} for ever at the permitted current "
                f"{fq(ever, 'A')}, above its id_max {fq(ch.part.id_max, 'A')}{held}",
                path=("components", ch.package, "part"), element=ch.package, key=f"max-vs-fet-{ch.name}",
                cause=f"max-vs-fet{ch.name[len(ch.package):]}", assumptions=permitted.assumptions,
                figures=window + [Figure("channel current", ich, "A"), Figure("id_max", ch.part.id_max, "A")],
                headline="channel current",
                hint=f"use FETs with id_max ≥ {fq(ich, 'A')}, add a pair in parallel, or a protector "
                     f"with a lower over-current detection voltage")
    for what, why, current, path in loads_to_clear(m, p.part.overcurrent):
        if t.min < current:
            yield ctx.finding(
                f"over-current trip min {fq(t.min, 'A')} is below the {what} {fq(current, 'A')}{why}: "
                f"the pack may cut out in normal use (at {t.at_min.ambient:.0f} °C ambient, "
                f"{fq(t.at_min.vgs, 'V')} gate drive, highest "
                f"{'shunt resistance' if m.sense_by_shunt else 'on-resistance'})",
                path=path, element=p.refdes, key=f"min-vs-{path[-1]}",
                assumptions=t.at_min.assumptions, headline="trip min", lower_is_worse=True,
                figures=window + [Figure(what, current, "A")],
                hint=fitted() or _resistance_hint(t, current / t.min, "lower", "minimum",
                                                  current, _shunts(m)))
    sc, psc = m.short_circuit_trip, m.prospective_short_circuit
    if sc is not None and psc is not None and psc <= sc.max:
        yield ctx.finding(
            f"prospective short-circuit current {fq(psc, 'A')} does not exceed the short-circuit trip "
            f"max {fq(sc.max, 'A')}: a hard short may be caught only by the slower over-current path",
            path=ppath, element=p.refdes, key="short-circuit", lower_is_worse=True,
            headline="prospective short circuit",
            figures=[Figure("prospective short circuit", psc, "A"), Figure("short-circuit trip max", sc.max, "A")],
            hint="lower the path resistance, or choose a protector with a lower short-circuit detection")


def _sense_finding(identity):
    """A finding the sense resistance sets: the trip minimum under a load, or the current the
    trip maximum permits above a rating."""
    rule, _, key = identity
    return rule == "trip-current-window" and key.startswith(("min-vs-", "max-vs-"))


def _fitted_shunt_hint(ctx, m, t, loads):
    """The shunt value every rule allows, found by linting the design with the shunt scaled
    (the trip window moves as one over it); None where no search can run (no shunt sensing, or
    a design that does not lint again as it is), then the hint is the window's alone."""
    shunts = _shunts(m)
    if not shunts or ctx.relint is None:
        return None
    fit = Fit(ctx.relint, lambda k: scaled_resistors(m.netlist, shunts, k), _sense_finding)
    if fit.before is None:
        return None
    what, _, load, _ = max(loads, key=lambda w: w[2])
    # more resistance lowers the whole window: no factor above the one that brings the minimum
    # to the highest load passes, so the search starts there and steps down
    start = t.min / load if load > 0 else 1.0
    interval = fit.interval(start)
    if fit.spent:
        return None
    parts = [m.netlist.components[r].part for r in shunts]
    names = ", ".join(shunts)
    if interval is None:
        at = (fq(parts[0].value * start, "Ω") if len(shunts) == 1
              else f"a factor {start:.3g} on their values")
        return (f"no value of {names} lets every rule pass: at {at}, where the over-current trip "
                f"min reaches the {what} {fq(load, 'A')}, the current the trip max permits is "
                f"too much for the path{fit.structural(start / STEP)}")
    if len(shunts) > 1:
        return (f"scale {names} by a factor {interval.low:.3g}-{interval.high:.3g} (every rule "
                f"passes over that range{fit.resolution_note(interval)})")
    now = parts[0].value
    return (f"use {shunts[0]} of {fq(value_inside(now, interval), 'Ω')} (every rule passes "
            f"from {fq(now * interval.low, 'Ω', toward='up')} to "
            f"{fq(now * interval.high, 'Ω', toward='down')} at its {parts[0].tol:g} % "
            f"tolerance; now {fq(now, 'Ω')}{fit.resolution_note(interval)}), or a protector with a "
            f"{'higher' if interval.high < 1 else 'lower'} over-current detection voltage")


def _fitted_rds_hint(ctx):
    """The switches' on-resistance every rule allows, where the protector senses across them
    (:mod:`._rdsfit`), with the alternatives that stay inside it; None where no search runs."""
    found = on_resistance_fit(ctx)
    if found is None:
        return None
    pair = "; or a second pair in parallel (as a factor 0.5)" if parallel_fits(found) else ""
    return on_resistance_text(ctx, found) + pair


def _shunts(m):
    """The shunt resistors the sense input sees, when it sees no switch channel."""
    return m.sense_elements if m.sense_by_shunt else ()


def _resistance_hint(t, factor, verb, end, target, shunts=()):
    """How far the sense resistance must move, said as the per-channel on-resistance to look for
    or, with shunt sensing, as the shunt resistance."""
    op = t.at_min if end == "minimum" else t.at_max
    if shunts:
        now = op.sense_resistance
        needed = now / factor if end == "minimum" else now * factor
        names = ", ".join(shunts)
        bound = "≤" if end == "minimum" else "≥"
        return (f"a shunt ({names}) of {bound} {fq(needed, 'Ω')} at its tolerance limit (now "
                f"{fq(now, 'Ω')}) would bring the {end} trip to {fq(target, 'A')}; or a protector "
                f"with a {'higher' if end == 'minimum' else 'lower'} over-current detection voltage")
    per = [v for v in op.rds.values()]
    if not per:
        return None
    worst = max(per) if end == "minimum" else min(per)
    needed = worst / factor if end == "minimum" else worst * factor
    vgs = op.vgs
    if end == "minimum":
        return (f"switches with ≤ {fq(needed, 'Ω')} per channel at {fq(vgs, 'V')} gate drive and "
                f"{op.ambient:.0f} °C (now {fq(worst, 'Ω')}) would bring the minimum trip to "
                f"{fq(target, 'A')}; or add a pair in parallel, or a protector with a higher "
                f"over-current detection voltage")
    return (f"switches with ≥ {fq(needed, 'Ω')} per channel at the low corner (now {fq(worst, 'Ω')}), "
            f"or a protector with a lower over-current detection voltage, would bring the maximum "
            f"trip to {fq(target, 'A')}")
