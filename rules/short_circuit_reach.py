from packwarden import Example, Figure, Q, RuleOptions, Severity, format_quantity as fq, rule
from packwarden.model.limits import CELL_AGEING, FAULT_RESISTANCE
from packwarden import Field

from ._rdsfit import loads_to_clear, on_resistance_fit, on_resistance_text


class Options(RuleOptions):
    ageing: float = Field(CELL_AGEING, ge=1, le=5, description=(
        "factor on the cells' maximum internal resistance at the end of their life [practice: "
        "1.5-2 x the new resistance]"))
    fault_resistance: Q("Ω", gt=0, le=10) = Field(FAULT_RESISTANCE, description=(
        "resistance of the weakest short the protection must still catch [published: IEC "
        "62133-2's external short-circuit test, 80 ± 20 mΩ; value from memory]"))
    note_slow_clearing: bool = Field(False, description=(
        "also say, as info, when only the over-current detection clears the weakest short (the "
        "stress checks judge the parts against it either way)"))


@rule(id="short-circuit-reach",
      summary="the weakest short the protection must catch still trips a detection",
      severity=Severity.error, options=Options, example=Example(
          bad="BT1: {part: RL-CELL-2500-SL, ...}   # 50-70 mΩ cells: 35.9 A in an 80 mΩ short, "
              "inside the 29.7-37 A over-current trip window",
          good="BT1: {part: RL-CELL-2500, ...}      # 15-22 mΩ cells: 70.1 A, cleared by the "
               "over-current detection in 120 ms"))
def check(ctx, options):
    """Whether a short reaches the short-circuit detection is judged at the weakest short that
    must still be caught, not at the strongest: the external short of IEC 62133-2 (80 mΩ by
    default), with the stack at the lowest voltage the protector allows (its over-discharge
    detection minimum per cell), at the lowest ambient, the cells at their maximum internal
    resistance times an ageing factor (end of life is commonly 1.5-2 × the new resistance), and
    every part of the path at its highest resistance; with the gate drive taken from the cells,
    at the voltage the short leaves them. The path's solver gives its current (the
    ``weakest-short`` event, which every check that judges parts against events reads).
    Below the short-circuit trip maximum the fast detection may not act, and the over-current
    detection ends the short after its longest delay, hundreds of times later: the event says so,
    and the stress checks judge the parts against it (an info finding with
    ``note_slow_clearing``; off by default, since a small pack's weakest short rarely reaches a
    short-circuit detection and that is not a flaw by itself). At or below the
    over-current trip maximum no detection surely trips, and the short lasts until a fuse melts or
    the cells give out: an error. The finding points at the protector, whose detections decide
    which shorts are caught; the message gives the loop's resistances (cells, path, fault), so
    the part that makes the short weak shows."""
    m = ctx.model
    event, p = m.event("weakest-short"), m.protector
    sc, oc = m.short_circuit_trip, m.overcurrent_trip
    if event is None or p is None or oc is None:
        return
    f = event.figures
    i = event.current
    loop = (f"cells {fq(f['stack resistance'], 'Ω')}, path {fq(f['path resistance'], 'Ω')}, "
            f"fault {fq(f['fault resistance'], 'Ω')} at {fq(f['stack voltage'], 'V')}")
    figures = [Figure("weakest short", i, "A"),
               Figure("over-current trip min", oc.min, "A"),
               Figure("over-current trip max", oc.max, "A"),
               Figure("fault resistance", f["fault resistance"], "Ω"),
               Figure("aged cell resistance", f["cell resistance"], "Ω"),
               Figure("path resistance", f["path resistance"], "Ω")]
    if sc is not None:
        figures.insert(3, Figure("short-circuit trip max", sc.max, "A"))
    path = ("components", p.refdes, "part")
    if event.detection is None:
        below = (f"below the over-current trip min {fq(oc.min, 'A')}: no detection trips"
                 if i < oc.min else
                 f"within the over-current trip window {fq(oc.min, 'A')}-{fq(oc.max, 'A')}: "
                 f"the over-current detection may not trip")
        yield ctx.finding(
            f"the weakest short to catch draws only {fq(i, 'A')} ({loop}), {below}, so it may "
            f"never be cleared ({event.corner})",
            path=path, element=p.refdes, key="weakest-short-uncleared", figures=figures,
            headline="weakest short", lower_is_worse=True,
            hint=_fitted_hint(ctx, p, oc, i) or _uncleared_hint(m, p, oc, i))
    elif event.detection == "over-current" and sc is not None and options.note_slow_clearing:
        yield ctx.finding(
            f"the weakest short to catch draws {fq(i, 'A')} ({loop}), not above the "
            f"short-circuit trip max {fq(sc.max, 'A')}: the over-current detection clears it "
            f"after up to {fq(event.duration, 's')} instead of the short-circuit detection's "
            f"{fq(p.part.short_circuit.delay.high, 's')}; the parts are judged against that "
            f"event (weakest-short)",
            path=path, element=p.refdes, key="weakest-short-over-current", figures=figures,
            headline="weakest short", lower_is_worse=True,
            severity=Severity.info,
            hint=f"a protector with a short-circuit trip max below {fq(i, 'A')} would catch it "
                 f"fast")


def _fitted_hint(ctx, p, oc, i):
    """Where the window's spread fits between the load and the weakest short and the protector
    senses across its switches, the on-resistance every rule allows (:mod:`._rdsfit`): the
    short itself weakens as the path's resistance rises, which the re-lint sees. None otherwise
    (then :func:`_uncleared_hint` says why no such change fits)."""
    load = max(w[2] for w in loads_to_clear(ctx.model, p.part.overcurrent))
    if not (i > 0 and oc.max * load < i * oc.min):
        return None
    found = on_resistance_fit(ctx)
    return on_resistance_text(ctx, found) if found is not None else None


def _uncleared_hint(m, p, oc, i):
    """Move the trip window below the weakest short only where it can stay above the loads.

    A lower detection voltage or more sense resistance moves both ends of the over-current trip
    window by one factor, so the window fits between the highest load its minimum must clear
    (as trip-current-window holds it) and the weakest short only when its max/min ratio is below
    their ratio. More sense resistance also weakens the short a little, so where the ratio fits
    the hint is a start, re-checked by the lint; where it does not, no such change can fix it.
    """
    loads = [m.design.load.continuous]
    peak = m.design.load.peak
    if peak is not None and peak.duration > p.part.overcurrent.delay.low:
        loads.append(peak.current)
    load = max(loads)
    stronger = ("or cut the loop's resistance (cells of lower internal resistance, more in "
                "parallel, heavier conductors) so the weakest short draws more")
    # compared as products: a mutated design may give a zero trip minimum or a zero short
    if i > 0 and oc.max * load < i * oc.min:
        return (f"bring the over-current trip max below {fq(i, 'A', toward='down')} while its "
                f"min stays at or above the load {fq(load, 'A', toward='up')} (a factor "
                f"{oc.max / i:.3g}-{oc.min / load:.3g} on the sense resistance, or a protector "
                f"with a detection voltage lower by that factor); {stronger}")
    spans = f" × {oc.max / oc.min:.3g}" if oc.min > 0 else ""
    return (f"no sense resistance or detection voltage fits: the over-current trip window "
            f"{fq(oc.min, 'A')}-{fq(oc.max, 'A')} spans{spans} from min to max, wider than the room "
            f"between the load {fq(load, 'A')} its min must clear and the weakest short "
            f"{fq(i, 'A')}; a shunt-sensed protector (a narrower window), a protector with "
            f"a short-circuit detection the weakest short reaches, {stronger}")
