from packwarden import Example, Severity, rule

_OTHER = {"discharge": "charge", "charge": "discharge"}
_VERB = {"discharge": "discharges", "charge": "charges"}


@rule(id="switch-orientation",
      summary="with a switch off, current is blocked one way and still flows the other",
      severity=Severity.error, example=Example(
          bad="Q1: {part: OR-FET-D20, pins: {s1: B-, g1: CG, s2: P-, g2: DG}}   # gates swapped",
          good="Q1: {part: OR-FET-D20, pins: {s1: B-, g1: DG, s2: P-, g2: CG}}"))
def check(ctx, options):
    """Decided by where current can flow, not by pattern: with the discharge switches off, no
    current may leave the cells through a load across the pack terminals, while charge current
    must still reach the cells through the switches' body diodes so a charger can revive an
    over-discharged pack; and the converse with the charge switches off. Low-side and high-side
    switching and both channel types fall out of the same test, and parallel switches must agree.
    A body diode pointing the wrong way turns the switch into no switch at all."""
    m = ctx.model
    if m.stack is None or m.protector is None:
        return
    for role in ("discharge", "charge"):
        chans = m.channels_of(role)
        gate_pin = f"{role}_gate"
        if not chans:
            yield ctx.finding(
                f"no {role} switch: no FET gate is driven by {m.protector.refdes}.{gate_pin}",
                path=("components", m.protector.refdes, "pins"), element=m.protector.refdes,
                key=f"no-{role}-switch",
                hint=f"connect {m.protector.refdes}.{gate_pin} to the gate of the {role} FET")
            continue
        blocked_dir, open_dir = role, _OTHER[role]
        leak = m.conducts(off=role, direction=blocked_dir)
        blocks_both = m.conducts(off=role, direction=open_dir) is None
        revive = ("a charger cannot revive an over-discharged pack" if role == "discharge"
                  else "the pack cannot be discharged after an overcharge cut")
        if leak is not None:
            culprit = next((h for h in leak.hops if h.via == "body diode"), None)
            if culprit is not None:
                ch = next(c for c in m.channels if c.name == culprit.branch)
                # One fact, reported once: a body diode the wrong way round both lets the blocked
                # direction through and (when it is the only path) stops the other one.
                also = f", and {revive}" if blocks_both else ""
                yield ctx.finding(
                    f"{ch.name} ({role} switch) is turned round: its body diode conducts "
                    f"{culprit.from_net} → {culprit.to_net}, in the {blocked_dir} direction, so with "
                    f"the {role} switches off the pack still {_VERB[blocked_dir]}{also}",
                    path=ch.path + ("pins",), element=ch.package, key=f"{role}-leak-{ch.name}",
                    hint=f"turn {ch.name} round: swap its drain and source nets, or swap the gate nets "
                         f"so the other channel is the {role} switch")
                continue
            route = " → ".join(leak.nets)
            yield ctx.finding(
                f"with the {role} switches off, {blocked_dir} current bypasses them ({route})",
                path=("components",), element=m.protector.refdes, key=f"{role}-bypass",
                hint=f"put every {blocked_dir} path through a {role} switch")
        if blocks_both:
            names = ", ".join(c.name for c in chans)
            yield ctx.finding(
                f"with the {role} switches ({names}) off, {open_dir} current cannot flow either, "
                f"so {revive}",
                path=chans[0].path + ("pins",), element=chans[0].package, key=f"{role}-blocks-both",
                hint=f"check the drain/source nets of {names} and of the switches in series with "
                     f"them: with the {role} FETs off, their body diodes must conduct in the "
                     f"{open_dir} direction")
