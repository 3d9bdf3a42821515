from packwarden import Example, Figure, RuleOptions, Severity, format_quantity as fq, rule
from packwarden.model import copper
from packwarden.model import TRACE_RISE
from packwarden import Q
from packwarden import Field


class Options(RuleOptions):
    delta_t: Q("K") = Field(TRACE_RISE, gt=0, description=(
        "temperature rise a trace may take at the highest permitted current, kelvin "
        "[practice: 10 °C continuous is the usual design rise for IPC-2221 sizing]"))
    sense_share: float = Field(0.05, ge=0, le=1, description=(
        "a conductor making up at least this fraction of the protector's sense resistance is "
        "reported (info): the over-current trip then depends on its etched width and plating"))


@rule(id="conductor-capacity",
      summary="traces and wires carry the highest current the protection permits",
      severity=Severity.error, options=Options, example=Example(
          bad="T1: {kind: trace, width: 0.3 mm, copper_weight: 1 oz, length: 20 mm, pins: [FUSED, P+]}"
              "   # 1.0 A for 10 K against the 5.51 A the protection permits",
          good="T1: {kind: trace, width: 5 mm, copper_weight: 2 oz, length: 20 mm, pins: [FUSED, P+]}"))
def check(ctx, options):
    """Traces and wires are components of the power path: the protection lets any current just
    below its over-current trip flow for as long as it likes (the ``permitted`` event: with the
    switches as the sense resistance, the self-heated current, below the unheated trip maximum),
    so every conductor must carry that current, as it divides through the path, within a
    temperature rise. Traces are rated by the
    IPC-2221 conductor formula I = k·ΔT^0.44·A^0.725 (k 0.048 outer, 0.024 inner, A in mil²);
    wires by their rated current. A trace between the protector's ground and sense pins also adds
    its copper resistance (IEC 60028 resistivity with its temperature coefficient) to the sense
    resistance, and the finding says how much of it the trace is."""
    m = ctx.model
    for load in m.conductor_loads:
        c = load.component
        path = ctx.part_path(c.refdes)
        sense = ""
        if load.sense_share > 1e-6:
            sense = (f"; it is {load.sense_share * 100:.1f} % of the sense resistance "
                     f"({fq(load.sense_share * load.sense_resistance, 'Ω')} of "
                     f"{fq(load.sense_resistance, 'Ω')} at 25 °C), so it moves the over-current trip")
        carried = (f"carries up to {fq(load.current, 'A')} ({load.basis} {fq(load.basis_current, 'A')}"
                   + (f", {load.share * 100:.0f} % of it" if load.share < 0.999 else "") + ")")
        base = [Figure("current", load.current, "A"), Figure(load.basis, load.basis_current, "A")]
        if c.kind == "trace":
            part = c.part
            thick = copper.trace_thickness(part)
            rating = m.limits.trace_capacity(part)
            desc = (f"{fq(part.width, 'm')} wide, {copper.thickness_to_oz(thick):.3g} oz, "
                    f"{part.layer.value} layer")
            stretched = (f" (IPC-2221 used outside its usual range: {'; '.join(rating.out_of_range)})"
                         if rating.out_of_range else "")
            if load.current > rating.current:
                need = copper.ipc2221_min_width(load.current, thick, m.limits.trace_rise, part.layer.value)
                yield ctx.finding(
                    f"{c.refdes} ({desc}) {carried}, but IPC-2221 rates it {fq(rating.current, 'A')} "
                    f"for a {m.limits.trace_rise:g} K rise ({rating.area_mil2:.4g} mil²){stretched}{sense}",
                    path=path, element=c.refdes, key="capacity",
                    headline="current",
                    figures=base + [Figure("IPC-2221 capacity", rating.current, "A"),
                                    Figure("cross-section", rating.area_mil2, "mil²"),
                                    Figure("width needed", need.width, "m")],
                    hint=f"widen {c.refdes} to ≥ {fq(need.width, 'm', toward='up')} at this copper weight"
                         + (", move it to an outer layer" if part.layer.value == "inner" else "")
                         + ", use heavier copper, or add a parallel trace on another layer")
                continue
        elif c.kind == "wire":
            if load.current > c.part.rated_current:
                yield ctx.finding(
                    f"{c.refdes} (wire rated {fq(c.part.rated_current, 'A')}) {carried}{sense}",
                    path=path, element=c.refdes, key="capacity",
                    headline="current",
                    figures=base + [Figure("rated current", c.part.rated_current, "A")],
                    hint=f"use a wire rated ≥ {fq(load.current, 'A')} (a larger cross-section), or a "
                         f"protector with a lower over-current detection voltage")
                continue
        if load.sense_share >= options.sense_share and load.sense_share > 1e-6:
            yield ctx.finding(
                f"{c.refdes} is {load.sense_share * 100:.1f} % of the protector's sense resistance "
                f"({fq(load.sense_share * load.sense_resistance, 'Ω')} of "
                f"{fq(load.sense_resistance, 'Ω')} at 25 °C): the over-current trip depends on its "
                f"etched width and copper thickness, taken at nominal, and on its temperature "
                f"(copper +0.393 %/K)",
                path=path, element=c.refdes, key="sense-share", severity="info",
                headline="share of sense resistance",
                figures=[Figure("share of sense resistance", load.sense_share * 100, "%"),
                         Figure("conductor resistance", load.sense_share * load.sense_resistance, "Ω")],
                hint=f"route {c.refdes} outside the stretch between the protector's ground and sense "
                     f"pins (connect the pins at the FET terminals), or keep it and widen the trip "
                     f"window for its tolerance")
