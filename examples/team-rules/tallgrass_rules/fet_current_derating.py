from packwarden import Example, Figure, RuleOptions, Severity, format_quantity as fq, rule
from pydantic import Field


class Options(RuleOptions):
    derating: float = Field(0.6, gt=0, le=1, description=(
        "fraction of id_max a switch channel may carry continuously [published: MIL-DTL-917 "
        "table XIX, I_D <= 0.6 x nominal]"))


@rule(id="tallgrass-fet-current-derating",
      summary="switch FETs carry the continuous load within the house current derating",
      severity=Severity.warning, options=Options, example=Example(
          bad="load: {continuous: 1.2 A}\nQ1: {part: TG-FET-S12}   # id_max 1.8 A: 60 % is 1.08 A",
          good="load: {continuous: 1.2 A}\nQ1: {part: TG-FET-D20}   # id_max 10 A: 60 % is 6 A"))
def check(ctx, options):
    """Robots run their packs hot and for hours. Tallgrass derates each switch channel's
    continuous drain current to a fraction of its id_max, the figure MIL-DTL-917 table XIX uses
    for FETs [published]. The current each channel carries comes from the model's operating point:
    the continuous load at the highest ambient, the lowest gate drive and the highest
    on-resistance, with self-heating, so parallel packages that share current unevenly are
    judged by the one that takes more."""
    m = ctx.model
    gd = m.gate_drive
    if gd is None or not m.channels:
        return
    load = m.design.load.continuous
    op = m.operating_point(load, m.ambient.max, gd.min, "max")
    worst: dict[str, tuple[float, object]] = {}
    for ch in m.channels:
        if ch.role is None:
            continue
        current = op.channel_current.get(ch.name, 0.0)
        if ch.package not in worst or current > worst[ch.package][0]:
            worst[ch.package] = (current, ch)
    for package in sorted(worst):
        current, ch = worst[package]
        limit = options.derating * ch.part.id_max
        if current > limit:
            yield ctx.finding(
                f"{ch.name} carries {fq(current, 'A')} of the {fq(load, 'A')} continuous load, "
                f"above {fq(options.derating * 100, '%', 2)} of its id_max "
                f"{fq(ch.part.id_max, 'A')} ({fq(limit, 'A')})",
                path=("components", package, "part"), element=package, key="current",
                figures=[Figure("channel current", current, "A"),
                         Figure("id_max", ch.part.id_max, "A"), Figure("derated limit", limit, "A")],
                hint=f"use a FET with id_max ≥ {fq(current / options.derating, 'A')}, or add a "
                     f"package in parallel")
