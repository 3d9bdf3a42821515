"""The resolved design: components with their part data, pins and nets.

Resolution never fails on a netlist mistake: an unknown part or a stray pin is recorded as a
:class:`Problem` for the integrity rules to report, and the rest of the design still resolves, so one
typo does not hide every other finding.
"""

from __future__ import annotations

from dataclasses import field
from typing import Any

from .kinds import KINDS
from .schema import INLINE_KINDS, PART_KINDS, Design, PartRef
from .records import record

#: Pins every part kind has: (required, optional), from its declaration in kinds.py. Lists of
#: nets fill these in order.
PIN_NAMES: dict[str, tuple[tuple[str, ...], tuple[str, ...]]] = {
    name: (k.required_pins, k.optional_pins) for name, k in KINDS.items()}

#: How a kind reads in a message: "a common-drain FET pair has no pin 'gate1'".
KIND_TEXT = {name: k.text for name, k in KINDS.items()}

#: Kinds whose pins may be written as a list, in this order.
LIST_PINS = {k: req for k, (req, opt) in PIN_NAMES.items() if len(req) == 2 and not opt}


def pin_names(kind: str, part: Any) -> tuple[tuple[str, ...], tuple[str, ...]]:
    required, optional = PIN_NAMES[kind]
    if kind == "protector" and getattr(part, "cells", 1) > 1:
        # A multi-cell protector senses each cell's top: cell1 (bottom cell) ... cellN.
        required = required + tuple(f"cell{i}" for i in range(1, part.cells + 1))
        optional = optional + tuple(f"balance{i}" for i in range(1, part.cells + 1))
    if kind == "overvoltage_backup" and getattr(part, "cells", 1) > 1:
        # A backup protector senses each cell's top like a multi-cell protector (cells >= 2).
        required = required + tuple(f"cell{i}" for i in range(1, part.cells + 1))
    return required, optional


@record(frozen=True)
class PinRef:
    component: str
    pin: str


@record(frozen=True)
class Problem:
    """A netlist mistake found while resolving; the integrity rules turn these into findings."""

    kind: str  # unknown-part | unknown-pin | unconnected-pin | pin-form | split-pin | unreviewed-component
    component: str
    path: tuple
    message: str
    hint: str | None = None


@record(frozen=True)
class Component:
    refdes: str
    kind: str | None  # None when the part could not be found
    part_name: str | None  # library part name, None for inline parts
    part: Any  # the validated part model (schema.Cell, schema.Fet, ...), None if unknown
    pins: dict  # pin name -> net name, only pins the part has
    path: tuple  # YAML path of the component in the design

    def net(self, pin: str) -> str | None:
        return self.pins.get(pin)


@record
class Netlist:
    components: dict[str, Component]
    nets: dict[str, list[PinRef]]
    problems: list[Problem] = field(default_factory=list)
    terminals: tuple[str, str] = ("P+", "P-")
    #: Components of the schematic left out of the review (no part id): listed for the reviewer
    #: (unreviewed-component), never holding back the electrical rules as problems do.
    outside: list[Problem] = field(default_factory=list)

    def of_kind(self, *kinds: str) -> list[Component]:
        return [c for c in self.components.values() if c.kind in kinds]


def build_netlist(design: Design, parts: dict[str, Any]) -> Netlist:
    """Resolve components against ``parts`` (name -> validated part) into a netlist."""
    components: dict[str, Component] = {}
    nets: dict[str, list[PinRef]] = {}
    problems: list[Problem] = []
    for refdes, comp in design.components.items():
        path = ("components", refdes)
        if isinstance(comp, PartRef):
            part = parts.get(comp.part)
            if part is None:
                import difflib  # only for a mistake (start-up time)
                close = difflib.get_close_matches(comp.part, list(parts), n=1, cutoff=0.6)
                problems.append(Problem(
                    "unknown-part", refdes, path + ("part",),
                    f"{refdes}: part '{comp.part}' is not in any library of this design",
                    f"did you mean '{close[0]}'?" if close else
                    "add the part to a library listed under 'libraries', or give it inline with 'kind'"))
                components[refdes] = Component(refdes, None, comp.part, None, {}, path)
                # its nets still count as connected, or each would look like a dangling net too
                for pin, net in _given_pins(comp.pins):
                    nets.setdefault(net, []).append(PinRef(refdes, pin))
                continue
            kind, part_name, given = part.kind, comp.part, comp.pins
        else:
            kind, part_name, given, part = comp.kind, None, comp.pins, comp
        required, optional = pin_names(kind, part)
        before = len(problems)
        pins = _map_pins(refdes, kind, given, required, optional, path, problems)
        # When the pins are written in the wrong form, the pins it leaves out are a consequence of
        # that one slip, not open pins on the board: report the form, not each pin again.
        form_wrong = any(p.kind == "pin-form" for p in problems[before:])
        for name in required:
            if name not in pins and not form_wrong:
                # One path (and so one fingerprint and waiver key) per missing pin.
                problems.append(Problem(
                    "unconnected-pin", refdes, path + ("pins", name),
                    f"{refdes}: required pin '{name}' of the {KIND_TEXT.get(kind, kind)} is not connected",
                    f"connect '{name}' to a net under {refdes}.pins"))
        # With pins in the wrong form or misnamed, the nets named still count as connected
        # (under the names given), or each would be reported as a dangling net as well.
        listed = pins if not form_wrong else dict(_given_pins(given))
        stray = [] if form_wrong or not isinstance(given, dict) else \
            [(p, n) for p, n in given.items() if p not in pins]
        for pin, net in [*listed.items(), *stray]:
            nets.setdefault(net, []).append(PinRef(refdes, pin))
        components[refdes] = Component(refdes, kind, part_name, part, pins, path)
    terminals = (design.pack.terminals.pos, design.pack.terminals.neg)
    return Netlist(components, nets, problems, terminals)


def _given_pins(given: Any) -> list[tuple[str, str]]:
    if isinstance(given, list):
        return [(str(i), net) for i, net in enumerate(given, 1)]
    return list(given.items())


def _map_pins(refdes: str, kind: str, given: Any, required: tuple, optional: tuple, path: tuple,
              problems: list[Problem]) -> dict:
    ppath = path + ("pins",)
    if isinstance(given, list):
        order = LIST_PINS.get(kind)
        if order is None:
            problems.append(Problem(
                "pin-form", refdes, ppath,
                f"{refdes}: a {KIND_TEXT.get(kind, kind)} has named pins ({', '.join(required + optional)}); "
                f"a list of nets fits only two-terminal parts",
                f"write pins as a mapping, e.g. {{{required[0]}: NET, ...}}"))
            return {}
        if len(given) != len(order):
            problems.append(Problem(
                "pin-form", refdes, ppath,
                f"{refdes}: a {KIND_TEXT.get(kind, kind)} has {len(order)} pins, "
                f"{len(given)} {'net is' if len(given) == 1 else 'nets are'} given",
                f"list exactly {len(order)} nets: [{', '.join(order)}]"))
            return dict(zip(order, given))
        return dict(zip(order, given))
    pins = {}
    known = required + optional
    for pin, net in given.items():
        if pin in known:
            pins[pin] = net
            continue
        import difflib
        close = difflib.get_close_matches(pin, known, n=1, cutoff=0.5)
        problems.append(Problem(
            "unknown-pin", refdes, ppath + (pin,),
            f"{refdes}: a {KIND_TEXT.get(kind, kind)} has no pin '{pin}' (pins: {', '.join(known)})",
            f"did you mean '{close[0]}'?" if close else None))
    return pins


__all__ = ["Netlist", "Component", "PinRef", "Problem", "build_netlist", "pin_names",
           "PIN_NAMES", "KIND_TEXT", "PART_KINDS", "INLINE_KINDS"]
