"""A design as a base file plus a few changes, each named by its YAML path.

Rule cases use it to say what they test (``set components.Q1.part: OR-FET-D2O``) instead of
copying a whole design to change one line. The result is an ordinary :class:`Document`, linted as
if it were the base file: library paths resolve from the base file's folder, and every finding is
located in the base file.

Where a changed value is located (its line and column in findings and input errors):

* a path the base file has keeps the base file's position of that value (``set`` of
  ``components.Q1.part`` points at ``OR-FET-D20`` in the base, the text the change replaced);
* a path the base file lacks (added by ``add``, or inside a new value given by ``set``) takes the
  position of its nearest ancestor the base file has, at that ancestor's key: a component added
  under ``components`` points at the ``components:`` line.

Every path names a place in the base file as written, whatever the other changes do: two deletions
from one list name the items by their indices in the base. Nothing here writes a file, so the
line numbers are those of a file that exists and reads the same in every run.
"""

from __future__ import annotations

import copy
import difflib
from typing import Any, Iterable

from .loader import Document, Position, YamlPath
from .records import record

__all__ = ["Override", "OverrideError", "ACTIONS", "parse_path", "apply_overrides"]

#: ``set`` replaces a value the base has, ``add`` puts a value where the base has none (a new key,
#: or one item appended to a list), ``delete`` removes a key or list item the base has.
ACTIONS = ("set", "add", "delete")


@record(frozen=True)
class Override:
    """One change to a base design: ``action`` at ``path`` (dotted, as findings write it)."""

    action: str
    path: str
    value: Any = None
    source: str = ""  # where the change is written, "file:line", for messages

    def describe(self) -> str:
        if self.action == "delete":
            return f"delete {self.path}"
        return f"{self.action} {self.path} = {self.value!r}"


class OverrideError(Exception):
    """A change that cannot be applied to its base: the path is not there, or already is."""

    def __init__(self, override: Override, message: str):
        super().__init__(f"{override.source + ': ' if override.source else ''}"
                         f"{override.action} {override.path}: {message}")
        self.override = override


def parse_path(dotted: str) -> tuple[str, ...]:
    """``"components.Q1.pins.0"`` → ``("components", "Q1", "pins", "0")``; raises ValueError.

    Segments stay text: whether ``0`` is a list index or a mapping key depends on what the base
    holds there, and is decided when the change is applied. A key with a dot in it cannot be named;
    change its parent instead.
    """
    parts = tuple(dotted.split("."))
    if not dotted or any(not p.strip() for p in parts):
        raise ValueError(f"'{dotted}' is not a dotted YAML path (e.g. components.Q1.part)")
    return parts


class _Node:
    """A value of the design under change, with the base path it came from (None: new)."""

    __slots__ = ("value", "origin")

    def __init__(self, value: Any, origin: YamlPath | None):
        self.value = value  # dict[str, _Node] | list[_Node] | plain scalar
        self.origin = origin


def _tree(value: Any, origin: YamlPath | None, known: dict) -> _Node:
    """Wrap plain data; a part keeps an origin only where the base file has that path."""
    def child(key: Any) -> YamlPath | None:
        if origin is None:
            return None
        path = origin + (key,)
        return path if path in known else None

    if isinstance(value, dict):
        return _Node({k: _tree(v, child(k), known) for k, v in value.items()}, origin)
    if isinstance(value, list):
        return _Node([_tree(v, child(i), known) for i, v in enumerate(value)], origin)
    return _Node(value, origin)


def _plain(node: _Node) -> Any:
    if isinstance(node.value, dict):
        return {k: _plain(v) for k, v in node.value.items()}
    if isinstance(node.value, list):
        return [_plain(v) for v in node.value]
    return node.value


def _step(container: _Node, segment: str, ov: Override, at: tuple) -> tuple[Any, bool]:
    """The key or index ``segment`` names in ``container``, and whether it is there."""
    where = ".".join(at) or "the design"
    if isinstance(container.value, dict):
        return segment, segment in container.value
    if isinstance(container.value, list):
        if not segment.isdigit():
            raise OverrideError(ov, f"{where} is a list; name an item by its index (0, 1, ...)")
        index = int(segment)
        return index, index < len(container.value)
    raise OverrideError(ov, f"{where} is a single value, not a mapping or list")


def _resolve(root: _Node, ov: Override) -> tuple[_Node, Any]:
    """The container the change acts in and the key or index it acts on, checked on the base."""
    parts = parse_path(ov.path)
    node = root
    for depth, segment in enumerate(parts):
        key, present = _step(node, segment, ov, parts[:depth])
        last = depth == len(parts) - 1
        if last:
            if ov.action == "add" and present:
                raise OverrideError(ov, "the base design already has this; use set to change it")
            if ov.action == "add" and isinstance(node.value, list) and key != len(node.value):
                raise OverrideError(ov, f"add appends to a list: name index {len(node.value)}, one "
                                        f"past its last item (set the whole list to reorder it)")
            if ov.action != "add" and not present:
                raise OverrideError(ov, _missing(node, parts, depth))
            return node, key
        if not present:
            raise OverrideError(ov, _missing(node, parts, depth))
        node = node.value[key]
    raise AssertionError("unreachable: a parsed path has at least one segment")


def _missing(node: _Node, parts: tuple, depth: int) -> str:
    where = ".".join(parts[:depth]) or "the design"
    if isinstance(node.value, list):
        return f"{where} has {len(node.value)} item(s); there is no index {parts[depth]}"
    keys = [str(k) for k in node.value]
    close = difflib.get_close_matches(parts[depth], keys, n=1)
    return (f"the base design has no '{parts[depth]}' in {where}" +
            (f" (did you mean '{close[0]}'?)" if close else f" (it has: {', '.join(keys)})"))


def apply_overrides(base: Document, overrides: Iterable[Override]) -> Document:
    """``base`` with ``overrides`` applied, as a new document; ``base`` is left as it was.

    Every path is resolved against the base before any change is made, so paths always name
    places in the base file. Raises :class:`OverrideError` for a path that is not there (``set``,
    ``delete``) or already is (``add``), naming the change's ``source``.
    """
    overrides = list(overrides)
    for ov in overrides:
        if ov.action not in ACTIONS:
            raise OverrideError(ov, f"unknown action; use one of: {', '.join(ACTIONS)}")
    _no_overlap(overrides)
    known = base.positions
    root = _tree(base.data, (), known)
    planned = [(ov, *_resolve(root, ov)) for ov in overrides]
    doomed: list[tuple[_Node, Any]] = []
    for ov, container, key in planned:
        if ov.action == "delete":
            doomed.append((container, container.value[key]))
        elif ov.action == "set":  # what it replaces tells where the new value sits
            replaced = container.value[key]
            container.value[key] = _tree(copy.deepcopy(ov.value), replaced.origin, known)
        elif isinstance(container.value, list):
            container.value.append(_tree(copy.deepcopy(ov.value), None, known))
        else:
            container.value[key] = _tree(copy.deepcopy(ov.value), None, known)
    for container, node in doomed:  # after the rest, and by identity: a list's indices shift
        items = container.value.items() if isinstance(container.value, dict) else \
            enumerate(container.value)
        del container.value[next(k for k, v in items if v is node)]
    positions: dict[YamlPath, Position] = {}
    key_positions: dict[YamlPath, Position] = {}
    _place(root, (), None, base, positions, key_positions)
    return Document(base.file, _plain(root), positions, key_positions)


def _no_overlap(overrides: list[Override]) -> None:
    """Refuse two changes where one path lies in the other: the result would depend on order."""
    seen: dict[tuple[str, ...], Override] = {}
    for ov in overrides:
        parts = parse_path(ov.path)
        for other_parts, other in seen.items():
            short = min(len(parts), len(other_parts))
            if parts[:short] == other_parts[:short]:
                raise OverrideError(ov, f"overlaps '{other.describe()}'" +
                                    (f" ({other.source})" if other.source else "") +
                                    "; make one change of the two")
        seen[parts] = ov


def _place(node: _Node, path: YamlPath, fallback: Position | None, base: Document,
           positions: dict, key_positions: dict) -> None:
    """Give every path of the changed design its position (see the module's docstring)."""
    if node.origin is not None:
        positions[path] = base.positions[node.origin]
        if node.origin in base.key_positions:
            key_positions[path] = base.key_positions[node.origin]
        # what lies under this node and is new points at this node's key, else at its value
        fallback = base.key_positions.get(node.origin, positions[path])
    else:
        assert fallback is not None  # the root always comes from the base
        positions[path] = fallback
        if path and not isinstance(path[-1], int):
            key_positions[path] = fallback
    children = node.value.items() if isinstance(node.value, dict) else \
        enumerate(node.value) if isinstance(node.value, list) else ()
    for key, child in children:
        _place(child, path + (key,), fallback, base, positions, key_positions)
