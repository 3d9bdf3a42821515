from packwarden import Field

from packwarden import Q, Example, Figure, RuleOptions, Severity, format_quantity as fq, rule

from ._taps import wrong_taps


class Options(RuleOptions):
    primary_margin: Q("V") = Field(0.0, ge=0, le=1.0, description=(
        "how far, per cell, the backup's lowest detection must sit above the primary "
        "protector's highest overcharge detection [practice: above it at every corner; a margin "
        "keeps the permanent fuse from racing the primary's own delay]"))


@rule(id="backup-overvoltage",
      summary="a second-level overvoltage protector acts only after the primary, before the "
              "cell's limit, on every tap, and can blow a fuse in the power path",
      severity=Severity.error, options=Options, example=Example(
          bad="overvoltage: {detect: {typ: 4.30 V, tol: 25 mV}}   # primary overcharge up to 4.30 V",
          good="overvoltage: {detect: {typ: 4.35 V, tol: 15 mV}}   # 4.335-4.365 V, cell limit 4.40 V"))
def check(ctx, options):
    """A multi-cell pack may carry a second-level (backup) overvoltage protector, independent of
    the primary: when a cell passes its detection it drives current through the heater of a fuse
    in the power path, which opens the pack for good [practice: docs/references.md, "Over-current
    levels and second-level protection"]. Per cell, with every tolerance at its worst, its lowest
    detection must lie above the primary protector's highest overcharge detection (plus
    ``primary_margin``), else it blows the fuse where the primary would have cut off reversibly;
    its highest detection must not exceed the cell's overcharge limit, else it acts too late. It
    must watch as many cells as the stack has, each cellN pin on the top of cell N. Its output
    must reach the heater of a heater fuse, directly or through a switch whose gate it drives,
    and that fuse must be in series with the whole power path; where the fuse gives its heater
    resistance and power, the heater must melt it at the lowest stack voltage it can be driven
    from (one cell at the backup's lowest detection, the others at the primary's over-discharge
    detection minimum). An open cell-tap wire leaves a cell unwatched: in a pack with a backup
    protector, a warning when neither the primary nor the backup detects one."""
    m = ctx.model
    stack = m.stack
    found = m.backup_protection
    if stack is None or not found:
        return
    assumed = m.cell_limits.assumptions if m.cell_limits is not None else ()
    for b in found:
        c = m.netlist.components[b.refdes]
        yield from _window(ctx, options, m, b, c, assumed)
        if b.cells != stack.series:
            yield ctx.finding(
                f"{b.refdes} watches {b.cells} cell(s) in series but the pack has {stack.series}: "
                f"a cell beyond its inputs is not watched",
                path=ctx.part_path(b.refdes), element=b.refdes, key="cell-count",
                hint=f"use a backup protector for {stack.series} series cells")
        yield from wrong_taps(ctx, b.refdes, b.taps, c.path,
                              "the backup compares the wrong voltages")
        yield from _output(ctx, b, c)
    watchers = m.open_tap_watchers
    if stack.series > 1 and not watchers:
        p = m.protector
        names = ", ".join(([p.refdes] if p is not None else []) + [b.refdes for b in found])
        yield ctx.finding(
            f"neither the primary protector nor the backup detects an open cell-tap wire "
            f"({names}): with a tap wire broken, the cell it fed is watched by neither, and its "
            f"overcharge goes unseen",
            path=ctx.part_path(found[0].refdes), element=found[0].refdes, key="open-tap",
            severity=Severity.warning,
            hint="a primary protector or a backup with open-tap detection "
                 "(open_tap_detection: true), or tap wires that cannot come loose")


def _window(ctx, options, m, b, c, assumed):
    path = ctx.part_path(b.refdes) + (() if c.part_name else ("overvoltage", "detect"))
    window = [Figure("backup detection min", b.detect.min, "V"),
              Figure("backup detection max", b.detect.max, "V")]
    p = m.protector
    if b.above_primary is not None and b.above_primary <= options.primary_margin:
        margin = (f" by more than {fq(options.primary_margin, 'V')}"
                  if options.primary_margin > 0 else "")
        yield ctx.finding(
            f"{b.refdes}'s lowest detection {fq(b.detect.min, 'V', 4)} per cell is not above "
            f"{p.refdes}'s highest overcharge detection {fq(b.primary_max, 'V', 4)}{margin}: the "
            f"backup may blow its fuse, for good, where the primary would have cut off",
            path=path, element=b.refdes, key="below-primary",
            headline="backup detection min", lower_is_worse=True,
            figures=window + [Figure("primary overcharge max", b.primary_max, "V")],
            hint=_typical_hint(b, options.primary_margin) or
                 f"a backup detection of at least "
                 f"{fq(b.primary_max + options.primary_margin, 'V', 4)} at its minimum")
    if b.below_limit is not None and b.below_limit < 0:
        yield ctx.finding(
            f"{b.refdes}'s highest detection {fq(b.detect.max, 'V', 4)} per cell is above the "
            f"cell's overcharge limit {fq(b.cell_limit, 'V', 4)}: the cell may pass its "
            f"never-exceed voltage before the backup acts",
            path=path, element=b.refdes, key="above-cell-limit", assumptions=assumed,
            headline="backup detection max",
            figures=window + [Figure("cell overcharge limit", b.cell_limit, "V")],
            hint=_typical_hint(b, options.primary_margin) or
                 f"a backup detection of at most {fq(b.cell_limit, 'V', 4)} at its maximum")


def _typical_hint(b, margin):
    """The typical detection both window checks allow (the model's range, the tolerance kept),
    or, where none does, what must change instead; None where a bound is unknown."""
    room = b.typical_range(margin)
    if room is None:
        return None
    low, high = room
    tol = b.detect.typ - b.detect.min
    if low < high:
        # mV steps inside the range, nearest its middle (the lowest is excluded)
        value = round((low + high) / 2, 3)
        if not low < value <= high:
            value = (low + high) / 2
        return (f"a backup detection typ of {fq(value, 'V', 4)} (typ above {fq(low, 'V', 4)} and "
                f"at most {fq(high, 'V', 4)} keeps its ± {fq(tol, 'V')} window above the primary's "
                f"and within the cell's limit; now {fq(b.detect.typ, 'V', 4)})")
    return (f"no typical detection fits: its ± {fq(tol, 'V')} window is wider than the room "
            f"between the primary's highest overcharge detection {fq(b.primary_max, 'V', 4)} and "
            f"the cell's limit {fq(b.cell_limit, 'V', 4)}; a backup with a narrower detection "
            f"tolerance, or a primary protector with a lower overcharge detection")


def _output(ctx, b, c):
    if not b.drives:
        yield ctx.finding(
            f"{b.refdes}'s output reaches no heater fuse, directly or through a switch it drives: "
            f"when it detects, nothing interrupts the pack",
            path=c.path + ("pins", "output"), element=b.refdes, key="output-unconnected",
            hint="connect the output to a heater fuse's heater pin, or to the gate of the switch "
                 "that passes the heater current")
        return
    for d in b.drives:
        f = ctx.netlist.components[d.fuse]
        if not d.in_path:
            yield ctx.finding(
                f"{b.refdes} blows {d.fuse}, but {d.fuse} is not in series with the whole power "
                f"path: the pack's current flows on when it opens",
                path=f.path + ("pins",), element=d.fuse, key=f"fuse-bypassed-{d.fuse}",
                hint="place the heater fuse between the cell stack and a pack terminal")
        if d.power is not None and d.needed is not None and d.power < d.needed:
            yield ctx.finding(
                f"{d.fuse}'s heater gets {fq(d.power, 'W')} at the lowest stack voltage it is "
                f"driven from ({fq(b.drive_voltage, 'V')}: one cell at {b.refdes}'s lowest "
                f"detection, the others at the over-discharge detection), below the "
                f"{fq(d.needed, 'W')} that melts it",
                path=ctx.part_path(d.fuse), element=d.fuse, key=f"heater-power-{d.fuse}",
                headline="heater power", lower_is_worse=True,
                figures=[Figure("heater power", d.power, "W"),
                         Figure("heater power needed", d.needed, "W")],
                hint="a heater fuse rated for a lower stack voltage (lower heater resistance)")
