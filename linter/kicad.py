"""KiCad's netlist export, read from its S-expression form: ``(export (version "E") ...)``.

KiCad 6, 7, 8 and 9 write the same skeleton (``design``, ``components``, ``libparts``,
``libraries``, ``nets``) and add elements over the versions; only what a review needs is read
(components with their fields, nets with their nodes) and every element not known here is passed
over, so a newer KiCad's additions do not break the import. Every token keeps its line and column:
a broken file is reported as one ``file:line:column: message``.
"""

from __future__ import annotations

import gc
import re
from dataclasses import field
from pathlib import Path

from .loader import InputError, read_text
from .records import record

#: The export versions KiCad writes: "D" (5.x, same skeleton) and "E" (6.0 onwards).
VERSIONS = ("D", "E")

#: Deepest nesting read: KiCad's export nests about 6 levels; the bound keeps a hostile file from
#: exhausting the recursion of the checks that walk the tree.
MAX_DEPTH = 64
#: As many components as a design file may hold (schema.Design.components).
MAX_COMPONENTS = 20_000

#: Characters KiCad writes as ``{name}`` inside a net name, since the bare character means
#: something else there (``/`` separates sheets). [memory] of KiCad's escaped net names.
_NET_ESCAPES = {
    "slash": "/", "backslash": "\\", "lt": "<", "gt": ">", "colon": ":", "dblquote": '"',
    "quote": "'", "space": " ", "tab": "\t", "return": "\n", "comma": ",", "brace": "{",
    "bar": "|", "ast": "*", "question": "?",
}
_NET_ESCAPE = re.compile(r"\{(" + "|".join(_NET_ESCAPES) + r")\}")
#: Backslash escapes inside a quoted string; any other escaped character stands for itself.
_STRING_ESCAPES = {"n": "\n", "r": "\r", "t": "\t"}


class Atom:
    """A string or bare word, kept as text (pin "01" stays "01")."""

    # Plain slotted classes, not records: a netlist of a big pack has some 200 000 tokens, and
    # their creation is most of the reading.
    __slots__ = ("text", "line", "column")

    def __init__(self, text: str, line: int, column: int) -> None:
        self.text, self.line, self.column = text, line, column

    def __repr__(self) -> str:
        return f"Atom({self.text!r}, {self.line}, {self.column})"


class Group:
    """A parenthesised list; ``head`` is its first word (``comp``, ``net``...), or ""."""

    __slots__ = ("items", "line", "column", "head")

    def __init__(self, items: list, line: int, column: int) -> None:
        self.items, self.line, self.column = items, line, column
        self.head = items[0].text if items and type(items[0]) is Atom else ""

    def __repr__(self) -> str:
        return f"Group({self.head!r} at {self.line}:{self.column}, {len(self.items)} items)"

    def children(self, head: str) -> list["Group"]:
        return [g for g in self.items if type(g) is Group and g.head == head]

    def child(self, head: str) -> "Group | None":
        return next((g for g in self.items if type(g) is Group and g.head == head), None)

    def value(self, head: str) -> str | None:
        """The text of ``(head "text")``, or None when the element is absent or empty."""
        g = self.child(head)
        if g is None or len(g.items) < 2 or type(g.items[1]) is not Atom:
            return None
        return g.items[1].text


#: One token: a parenthesis, a quoted string (backslash escapes, newlines allowed), a bare word,
#: a newline, or a lone '"' that opens a string never closed. Blanks between them are skipped.
_TOKEN = re.compile(r'[^\S\n]*(?:(\()|(\))|("(?:[^"\\\n]|\\.)*")|([^\s()"]+)|(\n)|("(?:[^"\\]|\\.)*")|(")|\Z)',
                    re.S)
_ESCAPED = re.compile(r"\\(.)", re.S)


def _unescape(m: re.Match) -> str:
    return _STRING_ESCAPES.get(m.group(1), m.group(1))


def parse(text: str, file: str) -> Group:
    """The one top-level list of ``text``; raises :class:`InputError` at the first mistake."""
    stack: list[tuple[list, int, int]] = []
    top: Group | None = None
    closed = (0, 0)
    line, line_start, pos, n = 1, 0, 0, len(text)
    match = _TOKEN.match

    def error(at: int, message: str) -> InputError:
        return InputError(file, line, at - line_start + 1, message)

    while True:
        m = match(text, pos)
        pos = m.end()
        kind = m.lastindex
        if kind is None:  # the end of the text
            break
        at = m.start(kind)
        if kind == 1:  # (
            if top is not None:
                raise error(at, f"text after the end of the netlist's outer list, closed at "
                                f"{closed[0]}:{closed[1]}: a ')' too many before there?")
            if len(stack) == MAX_DEPTH:
                raise error(at, f"lists nested deeper than {MAX_DEPTH} levels: not a netlist "
                                f"KiCad writes (its deepest is about 6)")
            stack.append(([], line, at - line_start + 1))
        elif kind == 2:  # )
            if not stack:
                raise error(at, "')' closes a list that was never opened")
            items, gl, gc = stack.pop()
            group = Group(items, gl, gc)
            if stack:
                stack[-1][0].append(group)
            else:
                top, closed = group, (line, at - line_start + 1)
        elif kind == 5:  # a line break
            line, line_start = line + 1, pos
        elif kind in (3, 4, 6):  # a string on one line, a bare word, a string across lines
            raw = m.group(kind)
            if top is not None:
                raise error(at, f"text after the end of the netlist's outer list, closed at "
                                f"{closed[0]}:{closed[1]}: a ')' too many before there?")
            if not stack:
                raise error(at, f"'{raw}' outside the netlist's outer list" if kind == 4 else
                            "a string outside the netlist's outer list")
            if kind != 4:
                raw = _ESCAPED.sub(_unescape, raw[1:-1]) if "\\" in raw else raw[1:-1]
            stack[-1][0].append(Atom(raw, line, at - line_start + 1))
            if kind == 6:  # raw line breaks inside the string: later tokens are on later lines
                text_so_far = m.group(6)
                line += text_so_far.count("\n")
                line_start = at + text_so_far.rfind("\n") + 1
        else:  # a '"' whose string never ends
            raise error(at, "string opened here is never closed")
    if stack:
        items, gl, gc = stack[-1]
        head = items[0].text if items and isinstance(items[0], Atom) else "..."
        raise InputError(file, line, n - line_start + 1,
                         f"the file ends inside ({head} ...) opened at {gl}:{gc} "
                         f"({len(stack)} ')' missing): truncated, or a ')' left out")
    if top is None:
        raise InputError(file, 1, 1, "empty file: expected a KiCad netlist, (export (version \"E\") ...)")
    return top


@record(frozen=True)
class Node:
    """One pin on a net: ``(node (ref "Q1") (pin "3") (pinfunction "D") (pintype "passive"))``."""

    ref: str
    pin: str
    function: str
    type: str
    line: int
    column: int

    @property
    def no_connect(self) -> bool:
        # KiCad 7+ writes "no_connect" or "passive+no_connect" for pins marked not to connect.
        return "no_connect" in self.type


@record(frozen=True)
class Net:
    name: str  # as the schematic shows it (see net_name)
    nodes: tuple[Node, ...]
    line: int
    column: int


@record(frozen=True)
class Symbol:
    """A component of the netlist: reference, value, footprint and fields by name."""

    ref: str
    value: str
    footprint: str
    fields: dict
    line: int
    column: int

    def field_value(self, name: str) -> str | None:
        """A field by name (exact, else ignoring case); None when absent or empty."""
        got = self.fields.get(name)
        if got is None:
            folded = name.casefold()
            got = next((v for k, v in self.fields.items() if k.casefold() == folded), None)
        return got.strip() or None if got is not None else None


@record
class KicadNetlist:
    file: str
    components: dict[str, Symbol] = field(default_factory=dict)
    nets: list[Net] = field(default_factory=list)
    #: Each component's pins with their net names, in the order of the file; made on first use,
    #: so a pack of thousands of parts is not searched once per part.
    _pins: dict[str, list[tuple[Node, str]]] | None = field(default=None, repr=False)

    def pins_of(self, ref: str) -> list[tuple[Node, str]]:
        """Each pin of ``ref`` with its net name, in the order of the file."""
        if self._pins is None:
            self._pins = {}
            for net in self.nets:
                for node in net.nodes:
                    self._pins.setdefault(node.ref, []).append((node, net.name))
        return self._pins.get(ref, [])


def net_name(raw: str) -> str:
    """A net's name as the schematic shows it: a local label's leading '/' (the root sheet)
    dropped, ``{slash}``-style escapes decoded; generated names (``Net-(Q1-Pad7)``) kept."""
    name = raw[1:] if raw.startswith("/") and len(raw) > 1 else raw
    return _NET_ESCAPE.sub(lambda m: _NET_ESCAPES[m.group(1)], name)


def read_netlist(path: Path, shown: str) -> KicadNetlist:
    """Read a KiCad netlist file; raise :class:`InputError` (file, line, column) when broken."""
    text = read_text(path, shown)
    # The token tree of a big pack is some 200 000 small objects without cycles: the cycle
    # collector would walk them again and again while they are made (two thirds of the time).
    collecting = gc.isenabled()
    gc.disable()
    try:
        return build(parse(text, shown), shown)
    finally:
        if collecting:
            gc.enable()


def build(top: Group, file: str) -> KicadNetlist:
    if top.head != "export":
        raise InputError(file, top.line, top.column,
                         "not a KiCad netlist: expected (export (version \"E\") ...); export the "
                         "netlist from the schematic editor in KiCad's own format")
    version = top.child("version")
    if version is None or top.value("version") not in VERSIONS:
        where = version or top
        raise InputError(file, where.line, where.column,
                         f"KiCad netlist version {top.value('version')!r} is not known here "
                         f"(known: {', '.join(VERSIONS)})")
    out = KicadNetlist(file)
    _misplaced(top, file)
    for block in top.children("components"):
        for comp in block.children("comp"):
            sym = _symbol(comp, file)
            first = out.components.get(sym.ref)
            if first is not None:
                raise InputError(file, comp.line, comp.column,
                                 f"component '{sym.ref}' is listed twice (first at line "
                                 f"{first.line}); annotate the schematic again")
            out.components[sym.ref] = sym
            if len(out.components) > MAX_COMPONENTS:
                raise InputError(file, comp.line, comp.column,
                                 f"more than {MAX_COMPONENTS} components; a design holds at most "
                                 f"{MAX_COMPONENTS}")
    for block in top.children("nets"):
        for net in block.children("net"):
            name = net.value("name")
            if name is None:
                raise InputError(file, net.line, net.column, "net without (name ...)")
            nodes = []
            for node in net.children("node"):
                ref, pin = node.value("ref"), node.value("pin")
                if not ref or pin is None:
                    raise InputError(file, node.line, node.column,
                                     "node without (ref ...) and (pin ...)")
                nodes.append(Node(ref, pin, node.value("pinfunction") or "",
                                  node.value("pintype") or "", node.line, node.column))
            out.nets.append(Net(net_name(name), tuple(nodes), net.line, net.column))
    return out


def _symbol(comp: Group, file: str) -> Symbol:
    ref = comp.value("ref")
    if not ref:
        raise InputError(file, comp.line, comp.column, "component without (ref ...)")
    fields: dict[str, str] = {}
    # KiCad 6+ writes user fields twice: (fields (field (name N) "text")) and
    # (property (name N) (value V)); either one is enough.
    for prop in comp.children("property"):
        name, value = prop.value("name"), prop.value("value")
        if name is not None:
            fields[name] = value or ""
    for block in comp.children("fields"):
        for f in block.children("field"):
            name = f.value("name")
            text = next((a.text for a in f.items[1:] if isinstance(a, Atom)), "")
            if name is not None:
                fields[name] = text
    return Symbol(ref, comp.value("value") or "", comp.value("footprint") or "", fields,
                  comp.line, comp.column)


#: Where the elements this reader takes must sit; found anywhere else, a ')' is missing before
#: them (the file still balances when one is added at the end), which is said there and then.
_PARENTS = {"comp": "components", "net": "nets", "node": "net", "components": "export",
            "nets": "export"}


def _misplaced(top: Group, file: str) -> None:
    def walk(group: Group) -> None:
        for item in group.items:
            if type(item) is not Group:
                continue
            want = _PARENTS.get(item.head)
            if want is not None and group.head != want:
                raise InputError(file, item.line, item.column,
                                 f"({item.head} ...) inside ({group.head or '...'} ...) opened at "
                                 f"{group.line}:{group.column}: a ')' is missing before here")
            walk(item)
    walk(top)
