from packwarden import Example, Figure, Severity, format_quantity as fq, rule
from packwarden.model import gate
from packwarden.model.rdson import OFF_RATIO


@rule(id="on-resistance-in-table",
      summary="every figure takes a switch's on-resistance at a gate drive its data-sheet table covers",
      severity=Severity.warning, example=Example(
          bad="Q1: {vgs_th: {min: 1.2 V, max: 2.0 V}, rds_on: [{vgs: 4.5 V, ...}, {vgs: 10 V, ...}]}"
              "   # driven at 2.45 V",
          good="Q1: {vgs_th: {min: 0.5 V, max: 1.0 V}, rds_on: [{vgs: 1.8 V, ...}, {vgs: 2.5 V, "
               "...}, {vgs: 4.5 V, ...}]}"))
def check(ctx, options):
    """A data sheet tabulates R_DS(on) at a few gate voltages; below the lowest one the model has
    to extrapolate, and near the threshold channel resistance grows like 1/(V_GS − V_th), far
    faster than the table's slope suggests. The model takes that form through the lowest row with
    the threshold's maximum, the highest value it allows, but a trip window, a junction
    temperature or a dissipation resting on it is still a guess: the finding names the lowest
    gate voltage a figure uses (each channel's own: a low-side charge switch's source rides above
    the protector's ground by the sense voltage) and the figures that rest on it. A channel not
    clear of its threshold there is taken as off, an error: the figures around it do not hold."""
    m = ctx.model
    drives = gate.figure_drives(m)
    done = set()
    for ch in m.channels:
        if ch.role is None or ch.package in done:
            continue
        part = ch.part
        row = min(abs(r.vgs) for r in part.rds_on)
        mine = {c.name: c for c in m.channels if c.package == ch.package and c.role is not None}
        below = [(v, name, words) for name, v, words in drives if name in mine and v < row - 1e-9]
        if not below:
            continue
        done.add(ch.package)
        vgs, name, words = min(below, key=lambda b: b[0])
        low = mine[name]
        r_row = m.channel_rds(low, row, 25.0, "max")[0]
        r_at = m.channel_rds(low, vgs, 25.0, "max")[0]
        rest = []
        for _, _, w in below:
            if w != words and w not in rest:
                rest.append(w)
        also = f"; so do {', '.join(rest)}" if rest else ""
        off = r_at >= r_row * OFF_RATIO * (1 - 1e-9)
        if off:
            how = (f"not clear of its threshold (V_th max {fq(low.vgs_th_max, 'V')}): the channel "
                   f"may not turn on, and the model takes it as off")
        else:
            how = (f"{fq(r_at, 'Ω')} at 25 °C (max), {r_at / r_row:.3g} × the "
                   f"{fq(row, 'V')} row, extrapolated as 1/(V_GS − V_th) with V_th max "
                   f"{fq(low.vgs_th_max, 'V')}")
        yield ctx.finding(
            f"{name} ({low.role} switch) is driven at {fq(vgs, 'V')} in {words}, below the lowest "
            f"gate voltage of {ch.package}'s R_DS(on) table, {fq(row, 'V')}: its on-resistance "
            f"there rests on an extrapolation, {how}{also}",
            path=ctx.part_path(ch.package), element=ch.package, key=f"table-{ch.package}",
            severity="error" if off else None,
            headline="gate drive", lower_is_worse=True,
            figures=[Figure("gate drive", vgs, "V"), Figure("lowest tabulated gate drive", row, "V"),
                     Figure("extrapolated rds_on", r_at, "Ω")],
            hint=f"give R_DS(on) at {fq(vgs, 'V')} or below from the data sheet (a row of rds_on), "
                 f"or choose a logic-level FET whose table reaches {fq(vgs, 'V')}")
