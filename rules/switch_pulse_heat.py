from packwarden import Example, Figure, NoOptions, Severity, format_quantity as fq, rule


@rule(id="switch-pulse-heat",
      summary="each switch's junction stays below tj_max at the end of every event, by its "
              "transient thermal impedance",
      severity=Severity.error, options=NoOptions, example=Example(
          bad="zth: {foster: [{r: 2 K/W, tau: 1 ms}, {r: 20 K/W, tau: 100 ms}]}    # 297 W for "
              "540 µs: +280 K from 64 °C",
          good="zth: {foster: [{r: 0.1 K/W, tau: 1 ms}, {r: 20 K/W, tau: 100 ms}]}  # +44 K"))
def check(ctx, options):
    """A switch that carries an event's current for its duration heats by P·Z_th(t), its
    dissipation times its single-pulse transient thermal impedance at that duration, from where
    the junction stood when the event began: here the steady state under the continuous load at
    the highest ambient. Every event of the model with a duration is judged (the peak load, the
    gap overload just below the short-circuit trip, the hard short, and any other the model
    makes), at the dissipation the event gives each package and, for parallel packages, at the
    worst share of the on-resistance spread. The junction at the end must stay below tj_max, or
    the FET may fail short and leave only the fuse. Z_th comes from the part (``zth``: curve
    points or a Foster network); without it, a steady state bounds any pulse (Z_th ≤ R_θJA), and
    where that bound does not settle it the finding states the Z_th the data sheet must meet, as
    info: the tool never invents a pass or a failure. Safe-operating-area points (``soa``), where
    given, are checked against each event's current, drain-source voltage and duration where the
    points decide."""
    m = ctx.model
    needs: dict[str, list] = {}
    for h in m.pulse_heat:
        if h.start >= h.part.tj_max:
            continue  # the steady state before the event is already too hot: switch-temperature's
        path = ctx.part_path(h.package)
        ev = h.event
        share = (f", at the worst share of the on-resistance spread (× {h.factor:.3g} of its "
                 f"equal share, the event's on-resistance kept: a bound)" if h.factor > 1.0
                 else "")
        figures = [Figure("dissipation", h.power, "W"), Figure("duration", ev.duration, "s"),
                   Figure("start temperature", h.start, "°C"),
                   Figure("Z_th needed", h.needed, "K/W"), Figure("tj_max", h.part.tj_max, "°C")]
        if h.soa == "beyond":
            p = h.soa_point
            yield ctx.finding(
                f"{h.package} carries {fq(h.current, 'A')} at {fq(h.vds, 'V')} for "
                f"{fq(ev.duration, 's')} in the {ev.name} event{share}, beyond its safe operating "
                f"area: the chart allows {fq(p.current, 'A')} at {fq(p.vds, 'V')} for a "
                f"{fq(p.pulse, 's')} pulse",
                path=path, element=h.package, key=f"soa-{ev.name}",
                headline="current",
                figures=[Figure("current", h.current, "A"), Figure("vds", h.vds, "V"),
                         Figure("duration", ev.duration, "s")],
                hint="use a FET with a larger safe operating area, or shorten the protector's "
                     "delay for this event")
        if h.zth is not None and h.zth.exact:
            if h.tj > h.part.tj_max:
                yield ctx.finding(
                    f"{h.package} reaches {fq(h.tj, '°C', 4)} at the end of the {ev.name} event "
                    f"({fq(h.power, 'W')} for {fq(ev.duration, 's')}{share}): Z_th "
                    f"{fq(h.zth.value, 'K/W')} ({h.zth.how}) from {fq(h.start, '°C')} "
                    f"({h.start_words}), above its tj_max {fq(h.part.tj_max, '°C')}",
                    path=path, element=h.package, key=f"pulse-heat-{ev.name}",
                    headline="junction at the end",
                    figures=figures + [Figure("Z_th", h.zth.value, "K/W"),
                                       Figure("junction at the end", h.tj, "°C")],
                    hint=f"use a FET with Z_th({fq(ev.duration, 's')}) ≤ {fq(h.needed, 'K/W')}, "
                         f"share the current over more packages, or shorten the protector's "
                         f"delay for this event")
            continue
        bound = h.zth.value if h.zth is not None else h.part.theta_ja
        if h.start + h.power * bound <= h.part.tj_max:
            continue  # Z_th(t) ≤ the bound: the junction stays below tj_max whatever the curve
        needs.setdefault(h.package, []).append(h)
    for package, hs in needs.items():
        h0 = hs[0]
        what = "; ".join(
            f"Z_th({fq(h.event.duration, 's')}) ≤ {fq(h.needed, 'K/W')} for the {h.event.name} "
            f"event ({fq(h.power, 'W')}"
            + (f", at the worst share × {h.factor:.3g}" if h.factor > 1.0 else "") + ")"
            + ("" if h.zth is None else f" (its curve gives only the bound {fq(h.zth.value, 'K/W')}, "
                                        f"{h.zth.how})")
            for h in hs)
        given = ("gives no zth" if all(h.zth is None for h in hs)
                 else "gives a zth curve that does not reach these durations")
        yield ctx.finding(
            f"{package} {given}, so its junction at the end of each event cannot be checked: it "
            f"stays below tj_max {fq(h0.part.tj_max, '°C')} from {fq(h0.start, '°C')} "
            f"({h0.start_words}) only if {what}",
            path=ctx.part_path(package), element=package, key="needs-zth", severity="info",
            headline=f"Z_th needed, {h0.event.name}", lower_is_worse=True,
            figures=[Figure(f"Z_th needed, {h.event.name}", h.needed, "K/W") for h in hs],
            hint="add zth from the FET data sheet's single-pulse transient thermal impedance "
                 "(curve points or its Foster network), on a board like this one")

