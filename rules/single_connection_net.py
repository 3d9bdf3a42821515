from packwarden import Example, Severity, rule


@rule(id="single-connection-net", scope="netlist", summary="every net connects at least two pins",
      severity=Severity.warning, example=Example(
          bad="R1: {kind: resistor, value: 470 Ω, pins: [B+, VDD]}\nC1: {part: CAP-100N, pins: [VD, B-]}   # VDD misspelt",
          good="R1: {kind: resistor, value: 470 Ω, pins: [B+, VDD]}\nC1: {part: CAP-100N, pins: [VDD, B-]}"))
def check(ctx, options):
    """A net that touches one pin is almost always a misspelt net name, which silently breaks a
    connection. The pack terminals (where charger and load connect off-board), the thermistor
    contact the charger reads (``charger.thermistor``) and the internal common drain of a FET
    pair are exempt."""
    terminals = set(ctx.netlist.terminals)
    similar = None  # made for the first dangling net: a clean netlist needs no difflib
    for net, refs in sorted(ctx.netlist.nets.items()):
        if len(refs) != 1 or net in terminals:
            continue
        ref = refs[0]
        comp = ctx.netlist.components[ref.component]
        if comp.kind == "fet_pair_common_drain" and ref.pin == "d":
            continue
        if comp.kind is None:
            continue  # an unknown part may well have an internal node there; unknown-part says so
        if comp.kind == "ntc" and comp.refdes == _charger_ntc(ctx):
            continue  # the pack's thermistor contact: the charger connects there off-board
        if similar is None:
            similar = _Similar(ctx.netlist.nets)
        others = similar.to(net)
        hint = (f"did you mean '{others[0]}'?" if others else
                f"connect net '{net}' to its other end, or remove it")
        yield ctx.finding(f"net '{net}' connects only {ref.component}.{ref.pin}",
                          path=("components", ref.component, "pins", ref.pin)
                          if isinstance(_pins(ctx, ref.component), dict) else
                          ("components", ref.component, "pins"),
                          hint=hint, element=ref.component, key=net)


def _charger_ntc(ctx):
    charger = ctx.design.charger
    return charger.thermistor.ntc if charger is not None and charger.thermistor else None


def _pins(ctx, refdes):
    return ctx.design.components[refdes].pins


class _Similar:
    """The nets whose names read like a given one: difflib's similarity ratio of at least 0.75.

    Asked for every dangling net of a netlist that may hold thousands, so only the names whose
    length allows that ratio are compared at all: the ratio is at most 2·min(a, b)/(a + b) for
    names of lengths a and b [published: difflib.SequenceMatcher.real_quick_ratio, an upper bound
    of ratio()].
    """

    def __init__(self, nets) -> None:
        import difflib
        self.matcher = difflib.SequenceMatcher(None)
        self.by_length: dict[int, list[tuple[str, str]]] = {}
        for n in nets:
            low = n.lower()
            self.by_length.setdefault(len(low), []).append((n, low))

    def to(self, net: str) -> list[str]:
        low = net.lower()
        lb = len(low)
        s = self.matcher
        s.set_seq2(low)
        out = []
        for la, names in self.by_length.items():
            if la + lb and 2.0 * min(la, lb) / (la + lb) < 0.75:
                continue  # not even names of these lengths that match best reach the ratio
            for n, a in names:
                if n == net:
                    continue
                s.set_seq1(a)
                if s.quick_ratio() >= 0.75 and s.ratio() >= 0.75:
                    out.append(n)
        return sorted(out)
