from packwarden import Example, Figure, Severity, format_quantity as fq, rule
from packwarden.model.events import CHARGE_EVENTS, SHORT_EVENTS


@rule(id="cell-pulse-rating",
      summary="the cells' pulse ratings cover every event above their continuous rating",
      severity=Severity.error, example=Example(
          bad="pulse_discharge: [{current: 20 A, duration: 100 ms}]   # the gap overload draws "
              "28.3 A for 15 ms",
          good="pulse_discharge: [{current: 30 A, duration: 100 ms}]"))
def check(ctx, options):
    """A cell's continuous discharge rating covers any current below it for as long as it lasts;
    above it, only a pulse rating (a current the maker allows for up to a duration) says the
    cell delivers it without harm. Every event with a duration whose current per cell exceeds the
    continuous rating (a peak load, the gap overload the over-current delay lets run) must fit
    under one of the cell's ``pulse_discharge`` points: at least that current for at least that
    long. Cells in parallel are taken to share equally. A short circuit at the prospective
    short-circuit current is not a rated pulse: the cell meets it in the external short-circuit
    test of its safety standard (for example IEC 62133-2), which the maker's approval covers.
    Where the cell gives no pulse rating, an info finding states the rating the data sheet must
    show."""
    m = ctx.model
    stack = m.stack
    if stack is None or not stack.cells:
        return
    cell, first = stack.part, stack.cells[0]
    name = first.part_name or f"{first.refdes}'s cell"
    path = first.path + (("part",) if first.part_name else ())
    rating = cell.max_current.discharge
    points = [(pt.current, pt.duration) for pt in cell.pulse_discharge or ()]
    for e in m.events:
        if e.duration is None or e.name in SHORT_EVENTS or e.name in CHARGE_EVENTS:
            continue
        i = e.element_current.get(first.refdes, e.current / stack.parallel)
        if i <= rating:
            continue
        what = (f"the {e.name} event draws {fq(i, 'A')} per cell for {fq(e.duration, 's')}"
                + (f" ({fq(e.current, 'A')} over {stack.parallel} cells in parallel)"
                   if stack.parallel > 1 else "")
                + f", above the continuous rating {fq(rating, 'A')}")
        figures = [Figure("current per cell", i, "A"), Figure("duration", e.duration, "s"),
                   Figure("continuous rating", rating, "A")]
        if not points:
            yield ctx.finding(
                f"{name} gives no pulse rating: {what}; its data sheet must allow at least "
                f"{fq(i, 'A')} for {fq(e.duration, 's')}",
                path=path, element=first.refdes, key=f"pulse-data-{e.name}", severity="info",
                headline="current per cell",
                figures=figures, assumptions=e.assumptions,
                hint=f"add pulse_discharge: [{{current: {fq(i, 'A', toward='up')}, duration: "
                     f"{fq(e.duration, 's', toward='up')}}}] or higher from the cell data sheet, "
                     f"or ask the "
                     f"cell maker")
            continue
        if any(pi >= i and pt >= e.duration for pi, pt in points):
            continue
        listed = ", ".join(f"{fq(pi, 'A')} for {fq(pt, 's')}" for pi, pt in sorted(points))
        yield ctx.finding(
            f"{what}, and no pulse rating of {name} covers it ({listed})",
            path=path, element=first.refdes, key=f"pulse-{e.name}", figures=figures,
            headline="current per cell",
            assumptions=e.assumptions,
            hint=_fix(e.name, f"cells rated for ≥ {fq(i, 'A', toward='up')} for "
                              f"{fq(e.duration, 's', toward='up')}"))


def _fix(event: str, cells: str) -> str:
    """What ends the pulse, by the event that makes it: the protector's detection and delay
    end an overload, the load sets its own peak, and a pre-charge path keeps the switch-on
    inrush off the cells."""
    if event == "switch-on-inrush":
        return (f"add a pre-charge path around the discharge switches, which keeps the inrush "
                f"off the cells, or use {cells} or more cells in parallel")
    if event == "peak-load":
        return f"use {cells}, more cells in parallel, or a lower or shorter load.peak"
    return (f"use {cells}, more cells in parallel, or a protector with a lower detection voltage "
            f"or shorter delay")
