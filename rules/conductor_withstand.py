from packwarden import Example, Figure, RuleOptions, Severity, format_quantity as fq, rule
from packwarden.model import copper
from packwarden.model.limits import CONDUCTOR_FINAL
from packwarden import Q
from packwarden import Field


class Options(RuleOptions):
    final_temperature: Q("°C") = Field(CONDUCTOR_FINAL, gt=0, le=copper.COPPER_MELTING, description=(
        "highest temperature a conductor may reach at the end of an event, °C [practice: 160 °C, "
        "the short-circuit limit of PVC-insulated copper and within the glass transition of "
        "common FR-4]; 1083 °C judges against melting"))


@rule(id="conductor-withstand",
      summary="traces and wires survive each event's current for its duration",
      severity=Severity.error, options=Options, example=Example(
          bad="T1: {kind: trace, width: 0.3 mm, copper_weight: 1 oz, length: 20 mm, pins: [FUSED, P+]}"
              "   # 28.3 A for 15 ms, against 10.2 A to 160 °C",
          good="T1: {kind: trace, width: 5 mm, copper_weight: 2 oz, length: 20 mm, pins: [FUSED, P+]}"))
def check(ctx, options):
    """An event the protection ends after a delay (the peak load, the gap overload, the hard
    short, and any other with a duration) drives its current through every trace and wire of the
    path until it ends. Over milliseconds copper sheds almost nothing into the board, so it heats
    adiabatically: IEC 60949's form I²t = K²·S²·ln((θf + β)/(θi + β)), K = 226 A·s½/mm²,
    β = 234.5 K, gives the current a cross-section S carries for the event's duration from the
    starting temperature θi to the final θf. The conductor starts at the highest ambient plus the
    steady rise conductor-capacity allows; the final temperature is this rule's option, not the
    melting point: a trace that reaches the laminate's glass transition may lift. A wire is judged
    by its gauge (``awg``, ASTM B258's cross-section); without one the finding states the copper
    area it needs (info)."""
    m = ctx.model
    events = [e for e in m.events if e.duration is not None and e.duration > 0]
    if not events:
        return
    hot = m.ambient.max
    limits = m.limits
    start = limits.conductor_start(hot)
    start_words = (f"from {start:g} °C (the highest ambient {hot:g} °C plus the "
                   f"{limits.trace_rise:g} K rise conductor-capacity allows)")
    final = limits.conductor_final
    for c in m.netlist.of_kind("trace", "wire"):
        carried = [(e, e.element_current[c.refdes]) for e in events
                   if e.element_current.get(c.refdes, 0.0) > 0]
        if not carried:
            continue
        path = ctx.part_path(c.refdes)
        if c.kind == "wire" and c.part.awg is None:
            yield from _wire_needs(ctx, c, path, carried, start, final, start_words)
            continue
        part = c.part
        if c.kind == "wire":
            area, thick = copper.awg_area(part.awg), None
            desc = f"AWG {part.awg}, {area * 1e6:.3g} mm²"
        else:
            thick = copper.trace_thickness(part)
            area = part.width * thick
            desc = f"{fq(part.width, 'm')} × {fq(thick, 'm')}, {area * 1e6:.3g} mm²"
        for e, i in carried:
            can = limits.conductor_withstand(area, e.duration, hot)
            if i <= can:
                continue
            melt = copper.adiabatic_current(area, e.duration, start, copper.COPPER_MELTING)
            need = copper.adiabatic_min_area(i, e.duration, start, final)
            melts = ("" if final >= copper.COPPER_MELTING else
                     f"; it melts at {fq(melt, 'A')}" if melt < i else
                     f"; it would melt at {fq(melt, 'A')}")
            delay = (f"the {e.detection} detection's delay" if e.detection
                     else f"the {e.name} event")
            yield ctx.finding(
                f"{c.refdes} ({desc}) carries "
                f"{fq(i, 'A')} for {fq(e.duration, 's')} in the {e.name} event, but {start_words} "
                f"it carries {fq(can, 'A')} for that time before passing {final:g} °C "
                f"(IEC 60949 adiabatic){melts}",
                path=path, element=c.refdes, key=f"withstand-{e.name}",
                headline="current",
                figures=[Figure("current", i, "A"), Figure("duration", e.duration, "s"),
                         Figure("withstand current", can, "A"),
                         Figure("melting current", melt, "A"),
                         Figure("cross-section", area * 1e6, "mm²"),
                         Figure("cross-section needed", need * 1e6, "mm²")],
                hint=_hint(c, need, thick, delay))


def _hint(c, need, thick, delay):
    if thick is not None:
        return (f"widen {c.refdes} to ≥ {fq(need / thick, 'm', toward='up')} at this copper weight, use "
                f"heavier copper, or shorten {delay}")
    return f"use {_size(need)} for {c.refdes}, or shorten {delay}"


def _size(need):
    """The wire that has ``need`` m² of copper, in words."""
    gauge = copper.awg_for_area(need)
    return (f"AWG {gauge} or heavier ({need * 1e6:.3g} mm²)" if gauge is not None
            else f"≥ {need * 1e6:.3g} mm² of copper")


def _wire_needs(ctx, c, path, carried, start, final, start_words):
    """A wire gives no cross-section: say the copper it needs for its most demanding event."""
    needs = [(copper.adiabatic_min_area(i, e.duration, start, final), e, i) for e, i in carried]
    need, e, i = max(needs, key=lambda n: n[0])
    yield ctx.finding(
        f"{c.refdes} is a wire with no gauge given (awg), so its short-time withstand is not "
        f"checked: to carry {fq(i, 'A')} for {fq(e.duration, 's')} (the {e.name} event) "
        f"{start_words} without passing {final:g} °C it needs ≥ {need * 1e6:.3g} mm² of "
        f"copper (IEC 60949 adiabatic)",
        path=path, element=c.refdes, key="withstand-data", severity="info",
        headline="current",
        figures=[Figure("current", i, "A"), Figure("duration", e.duration, "s"),
                 Figure("cross-section needed", need * 1e6, "mm²")],
        hint=f"give {c.refdes} its awg: it needs {_size(need)}")
