"""The design's components, put together: its own entries, its cell stacks, and the components of
the schematic's netlist it names.

A design that names a netlist (``schematic: {netlist: board/power.net}``) takes its components from
there; an entry under ``components`` with the same reference adds to or overrides the netlist's,
and an entry the netlist lacks adds a component. Package pins are matched to the part's pins by
the part's ``pinout``, else by the symbol's pin names, else (two-terminal parts) by pin order.
Nothing is dropped without a word: a symbol without a part id is listed for the reviewer, a pin
that matches nothing is an unknown pin, and package pins of one part pin on different nets are a
split pin, each a :class:`~packwarden.netlist.Problem` at the component.
"""

from __future__ import annotations

import os
from dataclasses import field
from pathlib import Path
from typing import Any

from typing import TYPE_CHECKING

from .api import Location
from .kinds import KINDS
from .library import confine, shown_path
from .loader import Document, InputError
from .netlist import KIND_TEXT, LIST_PINS, Problem, pin_names
from .records import record
from .schema import Design, PartRef

if TYPE_CHECKING:  # pragma: no cover - the reader is imported only for designs that name a netlist
    from .kicad import KicadNetlist, Node, Symbol


@record
class Components:
    """The design with every component in place, and where each one came from."""

    design: Design
    problems: list[Problem] = field(default_factory=list)
    #: Symbols without a part id: left out of the review, listed for the reviewer.
    outside: list[Problem] = field(default_factory=list)
    errors: list[InputError] = field(default_factory=list)
    netlist: KicadNetlist | None = None
    #: Components read from the netlist, and the cells of each stack (reference -> stack index).
    from_netlist: set[str] = field(default_factory=set)
    from_stack: dict[str, int] = field(default_factory=dict)

    def locate(self, doc: Document, path: tuple) -> Location | None:
        """Where a finding at ``path`` belongs when the design file alone cannot say: at the
        netlist's line of a component read from it (the design as the related place), or at
        the stack a cell was expanded from. None for everything written in the design."""
        if len(path) < 2 or path[0] != "components":
            return None
        ref = path[1]
        if ref in self.from_stack:
            pos = doc.where(("stacks", self.from_stack[ref]))
            return Location(doc.file, path, pos.line, pos.column)
        if ref not in self.from_netlist or self.netlist is None or tuple(path) in doc.positions:
            return None
        sym = self.netlist.components.get(ref)
        if sym is None:
            return None
        pos = doc.where(path if ("components", ref) in doc.positions else ("schematic", "netlist"))
        return Location(self.netlist.file, path, sym.line, sym.column,
                        related=Location(doc.file, path, pos.line, pos.column))


def assemble(design: Design, doc: Document, path: Path, root: Path, parts: dict[str, Any],
             netlist_cache: dict | None = None) -> Components:
    """The design's components from its entries, stacks and netlist (``parts``: the library)."""
    out = Components(design)
    components: dict[str, Any] = {}
    netlist = None
    if design.schematic is not None:
        netlist = _read(design.schematic.netlist, doc, path, root, out.errors, netlist_cache)
        if netlist is None:
            return out
        out.netlist = netlist
        components.update(_from_netlist(netlist, design, parts, out))
    elif "components" not in (doc.data or {}) and not design.stacks:
        out.errors.append(doc.error((), "missing required key 'components' in the top level "
                                        "(or a 'schematic' whose netlist gives them)"))
    for ref, comp in design.components.items():
        if ref in components:
            continue
        if comp.pins is None:
            out.errors.append(doc.error(("components", ref), (
                f"missing required key 'pins' in components.{ref}" +
                (f" ({ref} is not in the netlist {netlist.file})" if netlist else "")), key=True))
            continue
        components[ref] = comp
    for i, stack in enumerate(design.stacks):
        for ref, cell in _cells(stack):
            if ref in components:
                where = "a component of the netlist" if ref in out.from_netlist else \
                    "also under 'components'"
                out.errors.append(doc.error(("stacks", i), f"cell {ref} of this stack is {where}; "
                                                           f"give the stack another prefix or first number"))
                continue
            components[ref] = cell
            out.from_stack[ref] = i
    if not out.errors:
        out.design = design.model_copy(update={"components": components})
    return out


def _read(entry: str, doc: Document, path: Path, root: Path, errors: list[InputError],
          cache: dict | None) -> KicadNetlist | None:
    real, refusal = confine(entry, path.parent, (root.resolve(),), "netlist")
    if real is None:
        errors.append(doc.error(("schematic", "netlist"), refusal or ""))
        return None
    if cache is not None and real in cache:
        got = cache[real]
    else:
        from .kicad import read_netlist
        try:
            got = read_netlist(real, shown_path(Path(os.path.normpath(path.parent / entry))))
        except InputError as exc:
            got = exc
        if cache is not None:
            cache[real] = got
    if isinstance(got, InputError):
        errors.append(got)
        return None
    return got


def _cells(stack: Any) -> list[tuple[str, PartRef]]:
    """The stack's cells, level by level from its negative end: BT1..BTp on taps[0]..taps[1]."""
    out = []
    number = stack.first
    for level in range(stack.series):
        for _ in range(stack.parallel):
            pins = {"pos": stack.taps[level + 1], "neg": stack.taps[level]}
            out.append((f"{stack.prefix}{number}",
                        PartRef.model_construct(part=stack.part, pins=pins, note=None)))
            number += 1
    return out


def _from_netlist(netlist: KicadNetlist, design: Design, parts: dict[str, Any],
                  out: Components) -> dict[str, Any]:
    from .kicad import Symbol

    field_name = design.schematic.part_field
    symbols = dict(netlist.components)
    for net in netlist.nets:  # a node's component missing from (components ...) still counts
        for node in net.nodes:
            if node.ref not in symbols:
                symbols[node.ref] = Symbol(node.ref, "", "", {}, node.line, node.column)
    components: dict[str, Any] = {}
    for ref, sym in symbols.items():
        nodes = netlist.pins_of(ref)
        entry = design.components.get(ref)
        path = ("components", ref)
        out.from_netlist.add(ref)
        if entry is None:
            part_id = sym.field_value(field_name)
            if part_id is None:
                out.outside.append(_unreviewed(ref, sym, nodes, field_name))
                continue
            entry = PartRef.model_construct(part=part_id, pins=None, note=None)
        if isinstance(entry, PartRef):
            part = parts.get(entry.part)
            kind = getattr(part, "kind", None)
        else:  # given inline in the design
            part, kind = entry, entry.kind
        if kind is None:  # an unknown part: the nets still count as connected (unknown-part says why)
            pins: Any = {node.pin: net for node, net in nodes}
        else:
            pins = _pins_by_name(ref, kind, part, nodes, path, out.problems)
        if isinstance(entry.pins, list) or (entry.pins and kind is None):
            pins = entry.pins
        elif entry.pins:
            pins = {**pins, **entry.pins}
        components[ref] = entry.model_copy(update={"pins": pins})
    return components


def _unreviewed(ref: str, sym: Symbol, nodes: list[tuple[Node, str]], field_name: str) -> Problem:
    by_pin = sorted(nodes, key=lambda got: (len(got[0].pin), got[0].pin))  # 2 before 10
    on = ", ".join(f"{net} (pin {node.pin})" for node, net in by_pin) or "no nets"
    what = f" ({sym.value})" if sym.value else ""
    return Problem(
        "unreviewed-component", ref, ("components", ref),
        f"{ref}{what} has no part id in its '{field_name}' field, so the review leaves it out; "
        f"it connects to {on}",
        f"if it bears on protection or drain (an LED across the pack drains it in storage), give "
        f"the symbol a '{field_name}' field or add {ref} under 'components'; else waive this")


def _pins_by_name(ref: str, kind: str, part: Any, nodes: list[tuple[Node, str]], path: tuple,
                  problems: list[Problem]) -> dict[str, str]:
    """Package pins -> the part's pin names: by the part's pinout, else the symbol's pin names
    (ignoring case), else the pin order of a two-terminal part. No-connect pins may stay out."""
    required, optional = pin_names(kind, part)
    known = {name.casefold(): name for name in required + optional}
    known.update(KINDS[kind].symbol_pins if kind in KINDS else {})
    pinout = getattr(part, "pinout", None)
    order = LIST_PINS.get(kind)
    by_order = order is not None and sorted(node.pin for node, _ in nodes) == ["1", "2"]
    chosen: dict[str, list[tuple[Node, str]]] = {}
    for node, net in nodes:
        if pinout is not None:
            name = pinout.get(node.pin)
        else:
            name = known.get(node.function.strip().casefold())
            if name is None and by_order:
                name = order[int(node.pin) - 1]
        if name is None:
            if node.no_connect or net.startswith("unconnected-("):
                continue
            function = f" ({node.function})" if node.function else ""
            problems.append(Problem(
                "unknown-pin", ref, path + ("pins", node.pin),
                f"{ref}: package pin {node.pin}{function} on net {net} matches no pin of the "
                f"{KIND_TEXT.get(kind, kind)} ({', '.join(required + optional)})",
                "give the part a 'pinout' (package pin number -> pin name) in its library" if
                pinout is None else f"add pin {node.pin} to the part's pinout"))
            continue
        chosen.setdefault(name, []).append((node, net))
    pins = {}
    for name, got in chosen.items():
        nets = {net for _, net in got}
        if len(nets) > 1:
            problems.append(Problem(
                "split-pin", ref, path + ("pins", name),
                f"{ref}: package pins {', '.join(node.pin for node, _ in got)} are all '{name}' "
                f"but lie on different nets ({'; '.join(f'{node.pin} on {net}' for node, net in got)})",
                "join them in the schematic, or correct the part's pinout"))
        pins[name] = got[0][1]
    return pins
