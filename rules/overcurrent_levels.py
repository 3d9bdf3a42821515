from packwarden import Example, Figure, Severity, format_quantity as fq, rule
from packwarden.model.fit import value_inside

from ._fit import Fit


@rule(id="overcurrent-levels",
      summary="a protector's slow and fast over-current levels and its short-circuit level trip "
              "in order, each faster one later in current and sooner in time",
      severity=Severity.error, example=Example(
          bad="overcurrent: {detect: {typ: 50 mV, tol: 5 mV}, delay: {min: 80 ms, max: 120 ms}}\n"
              "overcurrent_fast: {detect: {typ: 60 mV, tol: 8 mV}, delay: {min: 8 ms, max: 12 ms}}"
              "   # windows overlap",
          good="overcurrent: {detect: {typ: 50 mV, tol: 5 mV}, delay: {min: 80 ms, max: 120 ms}}\n"
               "overcurrent_fast: {detect: {typ: 90 mV, tol: 10 mV}, delay: {min: 8 ms, max: 12 ms}}"))
def check(ctx, options):
    """Where a protector has a second, faster over-current level (``overcurrent_fast``), the three
    current levels form a ladder: the slow level rides out motor starts and clears moderate
    overloads after a long delay, the fast level clears heavy overloads sooner, the short-circuit
    level clears hard shorts in microseconds [practice: docs/references.md, "Over-current
    levels"]. Each trip window is the detection voltage over the sense resistance at every
    tolerance and corner, as for the single level (trip-current-window). The ladder holds only
    when every window lies wholly above the one below it (slow maximum below fast minimum, fast
    maximum below short-circuit minimum) and every delay wholly below the one of the level beneath
    it (slow delay minimum above fast delay maximum, fast delay minimum above short-circuit delay
    maximum); otherwise a current may be cleared by the wrong level, or a level never acts.
    A peak load that lasts longer than the fast level's shortest delay must stay below its trip
    minimum, or the product cuts out at every peak. The currents just below each faster level,
    cleared only by the slower one (the ``gap-overload`` and ``fast-gap-overload`` events), are
    judged by the stress rules (switch-pulse-heat, conductor-withstand, secondary-protection)."""
    m = ctx.model
    p, slow, fast = m.protector, m.overcurrent_trip, m.overcurrent_fast_trip
    if p is None or slow is None or fast is None:
        return
    part = p.part

    def window(name, t):
        return [Figure(f"{name} trip min", t.min, "A"), Figure(f"{name} trip max", t.max, "A")]

    if slow.max >= fast.min:
        yield ctx.finding(
            f"the over-current trip window {fq(slow.min, 'A')}-{fq(slow.max, 'A')} reaches the fast "
            f"level's {fq(fast.min, 'A')}-{fq(fast.max, 'A')}: a current between "
            f"{fq(fast.min, 'A')} and {fq(slow.max, 'A')} may be cleared by the fast level, after "
            f"its short delay, in one part and by the slow level in another",
            path=_field(ctx, p, "overcurrent_fast", "detect"), element=p.refdes, key="slow-vs-fast",
            headline="fast trip min", lower_is_worse=True,
            figures=window("over-current", slow) + window("fast", fast),
            hint=_fitted_fast_hint(ctx, p, fast, m.short_circuit_trip) or
                 f"a fast detection of at least "
                 f"{fq(fast.detect.min * slow.max / fast.min, 'V')} at its minimum, or a slow "
                 f"detection with a narrower tolerance, separates the windows")
    sc = m.short_circuit_trip
    if sc is not None and fast.max >= sc.min:
        yield ctx.finding(
            f"the fast over-current trip window {fq(fast.min, 'A')}-{fq(fast.max, 'A')} reaches "
            f"the short-circuit window {fq(sc.min, 'A')}-{fq(sc.max, 'A')}: a current between "
            f"{fq(sc.min, 'A')} and {fq(fast.max, 'A')} may be left to either level",
            path=_field(ctx, p, "overcurrent_fast", "detect"), element=p.refdes,
            key="fast-vs-short",
            headline="fast trip max",
            figures=window("fast", fast) + [Figure("short-circuit trip min", sc.min, "A")],
            hint="a fast detection maximum below the short-circuit detection minimum separates "
                 "the windows")
    levels = [("over-current", part.overcurrent, ("overcurrent", "delay")),
              ("fast over-current", part.overcurrent_fast, ("overcurrent_fast", "delay"))]
    if part.short_circuit is not None:
        levels.append(("short-circuit", part.short_circuit, ("short_circuit", "delay")))
    for (slower, s, _), (faster, f, fp) in zip(levels, levels[1:]):
        if s.delay.low <= f.delay.high:
            yield ctx.finding(
                f"the {slower} delay {fq(s.delay.low, 's')} at its shortest is not longer than the "
                f"{faster} delay {fq(f.delay.high, 's')} at its longest: the faster level must act "
                f"sooner, or it does not shorten the fault it is there for",
                path=_field(ctx, p, *fp), element=p.refdes,
                key=f"delay-{fp[0]}",
                headline=f"{faster} delay max",
                figures=[Figure(f"{slower} delay min", s.delay.low, "s"),
                         Figure(f"{faster} delay max", f.delay.high, "s")],
                hint=f"a {faster} delay below {fq(s.delay.low, 's')} at its longest")
    peak = m.design.load.peak
    if peak is not None and peak.duration > part.overcurrent_fast.delay.low \
            and peak.current > fast.min:
        yield ctx.finding(
            f"the peak load {fq(peak.current, 'A')} for {fq(peak.duration, 's')} lasts longer than "
            f"the shortest fast over-current delay {fq(part.overcurrent_fast.delay.low, 's')} and "
            f"exceeds the fast trip min {fq(fast.min, 'A')}: the pack may cut out at every peak "
            f"(at {fast.at_min.ambient:.0f} °C ambient, highest sense resistance)",
            path=("load", "peak", "current"), element=p.refdes, key="peak-vs-fast",
            headline="peak load",
            figures=window("fast", fast) + [Figure("peak load", peak.current, "A")],
            hint=f"a fast detection above {fq(fast.detect.min * peak.current / fast.min, 'V')} "
                 f"at its minimum, or a longer fast delay than the peak")


def _fitted_fast_hint(ctx, p, fast, sc):
    """The fast level's typical detection every rule allows (its tolerance kept), found by
    linting the design with it changed: above the slow window, below the short-circuit window,
    and no harder on the parts than the currents just below it (the fast gap overload) allow.
    None where no search can run (a library part: its file is not the design's; no re-lint)."""
    detect = p.part.overcurrent_fast.detect
    low, high = detect.low, detect.high
    typ, tol = (low + high) / 2, (high - low) / 2
    if (p.part_name or ctx.relint is None or sc is None or not fast.max > 0 or
            detect.typ is None or abs(detect.typ - typ) > 1e-9):
        return None  # a window written lopsided is not moved by a typical value
    path = ".".join(map(str, _field(ctx, p, "overcurrent_fast", "detect")))
    fit = Fit(ctx.relint, lambda k: [(path, {"typ": f"{typ * k * 1e3:.9g} mV",
                                             "tol": f"{tol * 1e3:.9g} mV"})],
              lambda i: i[0] == "overcurrent-levels")
    if fit.before is None:
        return None
    # the trip currents scale with the detection: the fast maximum meets the short-circuit
    # minimum at this typical value, and no higher one passes
    highest = fast.detect.max * sc.min / fast.max - tol
    found = fit.interval(highest / typ)
    if fit.spent:
        return None
    if found is None:
        return (f"no fast detection with a ± {fq(tol, 'V')} tolerance lets every rule pass"
                f"{fit.structural(highest / typ / 1.05)}; or a fast level of a narrower tolerance")
    return (f"a fast detection typ of {fq(value_inside(typ, found), 'V')} (every rule passes from "
            f"{fq(typ * found.low, 'V', toward='up')} to {fq(typ * found.high, 'V', toward='down')}"
            f" at its ± {fq(tol, 'V')} tolerance; now {fq(typ, 'V')}{fit.resolution_note(found)}) "
            f"separates the windows")


def _field(ctx, p, *keys):
    """Where a field of the protector's part is written: the field itself for a part written
    inline, the part's name for a library part (its file is not the design's)."""
    base = ctx.part_path(p.refdes)
    return base if p.part_name else base + keys
