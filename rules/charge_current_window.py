from packwarden import Example, Figure, Severity, format_quantity as fq, rule


@rule(id="charge-current-window",
      summary="the charge over-current trip clears the charger, and regenerative braking is "
              "either cleared or taken by the cells",
      severity=Severity.error, example=Example(
          bad="load: {regen: {current: 12 A, duration: 3 s}}   # charge trip min 7.9 A, delay 8 ms",
          good="load: {regen: {current: 6 A, duration: 3 s}}   # below the charge trip min 7.9 A"))
def check(ctx, options):
    """Current flowing into the pack (the charger's, or a motor braking) meets the protector's
    charge over-current detection, where the part has one: the detection voltage across the same
    sense resistance as the discharge detection, with charge current flowing. Its trip window is
    computed at the same corners as the discharge window, the minimum with the switches heated by
    the charger's current. The trip minimum must clear the charger's current, or the pack never
    charges. A regenerative peak above the trip minimum that lasts longer than the shortest delay
    may open the charge switch while the product brakes: the braking current then has nowhere to
    go and the load's bus voltage soars (an error above the trip maximum, where it always trips; a
    warning between the two). A regenerative peak above the cells' maximum charge current that no
    detection stops (none, or one whose trip minimum it stays below) reaches them unchecked: a
    warning."""
    m = ctx.model
    p, stack = m.protector, m.stack
    if p is None or stack is None:
        return
    charger, regen = m.design.charger, m.design.load.regen
    coc = p.part.charge_overcurrent
    t = m.charge_overcurrent_trip
    if coc is not None and t is None:
        return  # no gate drive or no switches: nothing to put a trip window on
    limit = stack.charge_rating
    # A peak no detection stops: there is none, or the peak stays below its trip minimum (one
    # inside the window is judged below).
    unstopped = regen is not None and (t is None or regen.current < t.min)
    if unstopped and regen.current > limit:
        why = (f"{p.refdes} has no charge over-current detection to stop it" if t is None else
               f"it stays below {p.refdes}'s charge over-current trip minimum {fq(t.min, 'A')}")
        yield ctx.finding(
            f"the regenerative peak {fq(regen.current, 'A')} for {fq(regen.duration, 's')} "
            f"is above the cells' maximum charge current {fq(limit, 'A')} "
            f"({stack.parallel}P × {fq(stack.part.max_current.charge, 'A')}), and {why}",
            path=("load", "regen", "current"), element=p.refdes, key="regen-unchecked",
            severity="warning",
            headline="regen current",
            figures=[Figure("regen current", regen.current, "A"),
                     Figure("cell charge limit", limit, "A")],
            hint=f"limit the controller's regenerative current to ≤ {fq(limit, 'A')}, or use "
                 f"a protector with a charge over-current detection below the cells' rating")
    if t is None:
        return
    window = [Figure("charge trip min", t.min, "A"), Figure("charge trip typ", t.typ, "A"),
              Figure("charge trip max", t.max, "A")]
    at = t.at_min
    corner = (f"detection min {fq(t.detect.min, 'V')} over the highest sense resistance "
              f"{fq(at.sense_resistance, 'Ω')} at {fq(at.ambient, '°C')} ambient")
    if charger is not None and charger.current >= t.min:
        yield ctx.finding(
            f"the charge over-current trip minimum {fq(t.min, 'A')} ({corner}) does not clear "
            f"the charger's current {fq(charger.current, 'A')}: charging is cut off in normal use",
            path=("charger", "current"), element=p.refdes, key="charger",
            headline="charge trip min", lower_is_worse=True,
            figures=window + [Figure("charger current", charger.current, "A")],
            hint=f"a charge detection of at least {fq(charger.current / t.min * t.detect.min, 'V')} "
                 f"minimum, or a lower charge current")
    if regen is None or regen.current < t.min:
        return
    delay = coc.delay.low
    if regen.duration <= delay:
        return  # over before the detection's shortest delay ends
    always = regen.current >= t.max
    yield ctx.finding(
        f"the regenerative peak {fq(regen.current, 'A')} for {fq(regen.duration, 's')} is above "
        f"the charge over-current trip {'maximum ' + fq(t.max, 'A') if always else 'minimum ' + fq(t.min, 'A')} "
        f"and outlasts its shortest delay {fq(delay, 's')}: {p.refdes} "
        f"{'opens' if always else 'may open'} the charge switch while the product brakes, and "
        f"the braking current then has nowhere to go",
        path=("load", "regen", "current"), element=p.refdes, key="regen",
        severity="error" if always else "warning",
        headline="regen current",
        figures=window + [Figure("regen current", regen.current, "A"),
                          Figure("regen duration", regen.duration, "s"),
                          Figure("charge delay min", delay, "s")],
        hint=_regen_hint(t, limit, regen))


def _regen_hint(t, limit, regen):
    """The regenerative current both checks allow: below the charge trip minimum (else it may
    trip) and within the cells' charge rating (else nothing stops it)."""
    # just under the trip minimum, the figure rounded down so the value shown is below it
    below_trip = fq(t.min * (1 - 1e-9), "A", toward="down")
    within = (f"≤ {below_trip}, below the charge over-current trip minimum {fq(t.min, 'A')}"
              if t.min <= limit else
              f"≤ {fq(limit, 'A', toward='down')}, the cells' charge rating (below the charge "
              f"over-current trip minimum {fq(t.min, 'A')})")
    return (f"limit the regenerative current to {within}, in the motor controller; or choose a "
            f"charge detection whose trip minimum clears {fq(regen.current, 'A')}")
