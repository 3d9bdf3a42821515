import math

from packwarden import Example, Figure, NoOptions, Severity, format_quantity as fq, rule


def _worse(s, old) -> bool:
    """Of two events that both exceed the rating, the one the part feels most: the larger I²t
    (an event for ever outweighs any pulse), so a short of hundreds of microseconds is named
    before a capacitor charged in nanoseconds through the same loop."""
    weight = [math.inf if x.event.duration is None else x.worst ** 2 * x.event.duration
              for x in (s, old)]
    return weight[0] > weight[1]


@rule(id="switch-current-sharing",
      summary="parallel switch packages stay within their current ratings at the worst share of "
              "their on-resistance spread",
      severity=Severity.error, options=NoOptions, example=Example(
          bad="Q1, Q2 in parallel, id_max: 20 A   # permitted 37 A: 18.5 A each if equal, "
              "23.7 A at 1.8 mΩ ∥ 3.2 mΩ",
          good="Q1, Q2 in parallel, id_max: 60 A"))
def check(ctx, options):
    """Packages in parallel share the current inversely to their on-resistances, and data sheets
    give those as a spread (typical and maximum, so a minimum below the typical): one part at its
    lowest on-resistance beside the others at their highest carries more than its equal share.
    In every event the model makes, each channel's current at that worst share must stay within
    its rating: id_max for an event that lasts for ever (the continuous load, the current the
    protection permits), id_pulse_max for one with a duration. Where even the equal share
    exceeds the rating, trip-current-window and short-circuit-stress already say so; this rule
    speaks where only the spread does. The worst share also heats the part in switch-pulse-heat."""
    m = ctx.model
    worst: dict[tuple[str, str], object] = {}
    for s in m.current_sharing:
        pulse = s.event.duration is not None
        limit = s.channel.part.id_pulse_max if pulse else s.channel.part.id_max
        if limit is None or not (s.equal <= limit < s.worst):
            continue
        key = (s.channel.name, "id_pulse_max" if pulse else "id_max")
        old = worst.get(key)
        if old is None or _worse(s, old):
            worst[key] = s
    for (name, rating), s in worst.items():
        ch, sp = s.channel, s.spread
        limit = getattr(ch.part, rating)
        lasts = (f"for {fq(s.event.duration, 's')}" if s.event.duration is not None
                 else "for ever")
        yield ctx.finding(
            f"{name} carries {fq(s.worst, 'A')} in the {s.event.name} event ({lasts}) when its "
            f"on-resistance is at the low end of the spread ({fq(sp.rds[0], 'Ω')} beside its "
            f"parallel peers at {fq(sp.rds[1], 'Ω')}, gate drive {fq(sp.vgs, 'V')}): above its "
            f"{rating} {fq(limit, 'A')}, though the equal share {fq(s.equal, 'A')} is within it",
            path=ctx.part_path(ch.package), element=ch.package, key=f"share-{name}-{rating}",
            cause=f"share{name[len(ch.package):]}-{rating}", assumptions=sp.assumptions,
            headline="worst share",
            figures=[Figure("worst share", s.worst, "A"), Figure("equal share", s.equal, "A"),
                     Figure(rating, limit, "A"), Figure("share factor", sp.factor, "")],
            hint=f"use FETs with {rating} ≥ {fq(s.worst, 'A', toward='up')}, or with a tighter on-resistance "
                 f"spread, or add a package in parallel")

