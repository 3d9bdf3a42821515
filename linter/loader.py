"""Strict YAML loading with positions and limits.

Designs are reviewed, often in pull requests from anyone, so the loader is deliberately narrow:

* YAML 1.1 surprises are gone: only ``true``/``false`` are booleans, only plain decimal numbers are
  numbers. ``no``, ``on``, ``1:30`` and ``012`` stay text, and the schema then says what it wanted.
* Duplicate keys are errors naming both lines; aliases, anchors' reuse and merge keys are refused
  (they make a reviewed file say something its text does not show, and invite expansion bombs).
* Tags are refused: no Python objects, no custom constructors, nothing executes. ``!!str`` alone
  is honoured, as the quoting it stands for would be.
* Size, nesting depth and node count are bounded.

Every value keeps its line and column in a side table keyed by its YAML path, so any later stage can
point at it without carrying marks through the data.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from pathlib import Path

import yaml

try:  # libyaml's composer is several times faster; pyyaml >= 6.0.4 ships it in wheels
    from yaml import CSafeLoader as _Loader
except ImportError:  # pragma: no cover - pure-python fallback
    from yaml import SafeLoader as _Loader  # type: ignore[assignment]

YamlPath = tuple  # tuple[str | int, ...]

MAX_BYTES = 4 * 1024 * 1024
MAX_DEPTH = 48
MAX_NODES = 500_000

_INT = re.compile(r"^[-+]?(0|[1-9][0-9]*)$")
_FLOAT = re.compile(r"^[-+]?(0|[1-9][0-9]*)\.[0-9]+([eE][-+]?[0-9]+)?$|^[-+]?(0|[1-9][0-9]*)[eE][-+]?[0-9]+$")
_NONFINITE = re.compile(r"^[-+]?\.(inf|Inf|INF)$|^\.(nan|NaN|NAN)$")



@dataclass(frozen=True)
class Position:
    line: int  # 1-based
    column: int  # 1-based


class InputError(Exception):
    """Input that could not be used; carries where, to print ``file:line:column: message``."""

    def __init__(self, file: str, line: int, column: int, message: str):
        super().__init__(message)
        self.file = file
        self.line = line
        self.column = column
        self.message = message

    def __str__(self) -> str:
        # always one line: a newline or control character from the input is shown escaped
        return _one_line(f"{self.file}:{self.line}:{self.column}: {self.message}")


def _one_line(text: str) -> str:
    return "".join(c if c.isprintable() else repr(c)[1:-1] for c in text)


@dataclass
class Document:
    """A loaded YAML file: plain data plus where each value sits."""

    file: str
    data: object
    positions: dict = field(default_factory=dict)  # YamlPath -> Position (of the value)
    key_positions: dict = field(default_factory=dict)  # YamlPath -> Position (of the key)

    def where(self, path: YamlPath, key: bool = False) -> Position:
        """Position of ``path``, or of its nearest ancestor that has one."""
        table = self.key_positions if key else self.positions
        path = tuple(path)
        while path:
            pos = table.get(path) or self.positions.get(path)
            if pos is not None:
                return pos
            path = path[:-1]
        return self.positions.get((), Position(1, 1))

    def error(self, path: YamlPath, message: str, key: bool = False) -> InputError:
        pos = self.where(path, key)
        return InputError(self.file, pos.line, pos.column, message)


def read_text(path: Path, shown: str) -> str:
    """Read a file as UTF-8 with precise errors for what is not a readable text file."""
    if not path.exists():
        raise InputError(shown, 1, 1, "no such file")
    if path.is_dir():
        raise InputError(shown, 1, 1, "is a directory, not a YAML file")
    try:
        size = path.stat().st_size
        if size > MAX_BYTES:
            raise InputError(shown, 1, 1, f"file is {size} bytes; the limit is {MAX_BYTES} bytes")
        raw = path.read_bytes()
    except OSError as exc:
        raise InputError(shown, 1, 1, f"cannot read file: {exc.strerror or exc}") from None
    return decode(raw, shown)


def decode(raw: bytes, shown: str) -> str:
    if len(raw) > MAX_BYTES:
        raise InputError(shown, 1, 1, f"file is {len(raw)} bytes; the limit is {MAX_BYTES} bytes")
    if raw.startswith(b"\xef\xbb\xbf"):
        raw = raw[3:]  # a UTF-8 byte-order mark is harmless; some editors write it
    elif raw[:4] in (b"\xff\xfe\x00\x00", b"\x00\x00\xfe\xff"):
        raise InputError(shown, 1, 1, "file is UTF-32; save it as UTF-8")
    elif raw[:2] in (b"\xff\xfe", b"\xfe\xff"):
        raise InputError(shown, 1, 1, "file is UTF-16; save it as UTF-8")
    if b"\x00" in raw and len(raw) >= 4 and min(raw[0::2].count(0), raw[1::2].count(0)) == 0 \
            and max(raw[0::2].count(0), raw[1::2].count(0)) * 4 >= len(raw):
        # NUL in every other byte, and mostly: text saved as UTF-16 without its byte-order mark
        raise InputError(shown, 1, 1, "file looks like UTF-16 (no byte-order mark); "
                                      "save it as UTF-8")
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = raw.count(b"\n", 0, exc.start) + 1
        # a column in characters, as editors and the YAML marks count; the bytes before the
        # first bad one are valid UTF-8
        col = len(raw[raw.rfind(b"\n", 0, exc.start) + 1:exc.start].decode("utf-8")) + 1
        raise InputError(shown, line, col, f"invalid UTF-8 byte 0x{raw[exc.start]:02x}") from None
    nul = text.find("\x00")
    if nul >= 0:
        line = text.count("\n", 0, nul) + 1
        col = nul - (text.rfind("\n", 0, nul) + 1) + 1
        raise InputError(shown, line, col, "binary data (NUL byte) in a YAML file")
    return text


def load_file(path: Path, shown: str | None = None) -> Document:
    shown = shown if shown is not None else str(path)
    return load_text(read_text(path, shown), shown)


def load_text(text: str, shown: str) -> Document:
    if not text.strip():
        raise InputError(shown, 1, 1, "empty file")
    try:
        # The event pass refuses aliases, merge keys, deep nesting and node floods before any
        # node is built: composing a flood is what takes the time, and an alias is only exactly
        # placed in the event stream (compose hands back the anchored node instead).
        explicit_str = _prescan(text, shown)
        node = yaml.compose(text, Loader=_Loader)
    except yaml.reader.ReaderError as exc:
        line, col = _line_col(text, _reader_index(text, exc.position))
        char = exc.character
        char = char if isinstance(char, int) else ord(str(char)[:1] or "?")
        raise InputError(shown, line, col, f"character U+{char:04X} cannot appear in a YAML file "
                                           f"(control or non-printing character)") from None
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        line, col = (mark.line + 1, mark.column + 1) if mark else (1, 1)
        problem = " ".join(str(exc.problem or exc.context or "invalid YAML").split())
        if mark is not None and text[mark.index:mark.index + 1] == "\t":
            problem = "a tab character cannot indent YAML; use spaces"
        elif "another document" in problem:
            raise InputError(shown, line, col, "a second YAML document ('---') in the file; "
                                               "one file holds one design or library") from None
        elif "maximum nesting depth" in problem:
            raise InputError(shown, line, col, f"nesting deeper than {MAX_DEPTH} levels") from None
        context = str(exc.context or "")
        if exc.problem and exc.context_mark is not None and "flow" in context:
            # the unclosed bracket is what a person looks for, often lines above the mark
            bracket = "{...}" if "mapping" in context else "[...]"
            problem += f" in the {bracket} that starts on line {exc.context_mark.line + 1}"
        raise InputError(shown, line, col, f"YAML syntax error: {problem}") from None
    except yaml.YAMLError as exc:
        first = (str(exc).strip().splitlines() or ["invalid YAML"])[0]
        raise InputError(shown, 1, 1, f"YAML error: {first}") from None
    except RecursionError:
        raise InputError(shown, 1, 1, f"nesting deeper than {MAX_DEPTH} levels") from None
    if node is None or (isinstance(node, yaml.ScalarNode) and node.value == "" and not node.style):
        raise InputError(shown, 1, 1, "empty file")  # nothing, or only `---`
    builder = _Builder(shown, explicit_str)
    data = builder.build(node, (), 0)
    return Document(shown, data, builder.positions, builder.key_positions)


def _prescan(text: str, shown: str) -> set:
    """Check the parser's events; return the positions of scalars explicitly tagged as text."""
    explicit_str: set = set()
    stack: list[list[bool]] = []  # per open collection: [is a mapping, next node is a key]
    count = 0
    for event in yaml.parse(text, Loader=_Loader):
        if isinstance(event, (yaml.MappingEndEvent, yaml.SequenceEndEvent)):
            stack.pop()
            continue
        if not isinstance(event, yaml.NodeEvent):
            continue  # stream and document boundaries
        is_key = bool(stack) and stack[-1][0] and stack[-1][1]
        if stack and stack[-1][0]:
            stack[-1][1] = not stack[-1][1]
        mark = event.start_mark
        line, col = mark.line + 1, mark.column + 1
        if isinstance(event, yaml.AliasEvent):
            raise InputError(shown, line, col, f"alias '*{event.anchor}' is not allowed; write "
                                               f"the value out")
        count += 1
        if count > MAX_NODES:
            raise InputError(shown, line, col, f"more than {MAX_NODES} YAML nodes (keys and "
                                               f"values); the file is too large to check")
        if len(stack) > MAX_DEPTH:
            raise InputError(shown, line, col, f"nesting deeper than {MAX_DEPTH} levels")
        if isinstance(event, yaml.ScalarEvent):
            if is_key and (event.tag == _MERGE_TAG or
                           (event.value == "<<" and event.tag is None and event.implicit[0])):
                raise InputError(shown, line, col, "merge keys (<<) are not allowed; write the "
                                                   "keys out")
            if event.tag in ("!", _CORE + "str"):
                explicit_str.add((line, col))  # `!!str 12` is the text '12'
            elif event.tag is not None and event.tag in _CORE_TAGS:
                # `!!int '12'` or `!!bool yes` would ask YAML 1.1 to decide what the text means
                raise InputError(shown, line, col, f"YAML tag '{_short_tag(event.tag)}' is not "
                                                   f"allowed; write the value plainly")
        else:
            stack.append([isinstance(event, yaml.MappingStartEvent), True])
    return explicit_str


def _reader_index(text: str, position: int) -> int:
    """Character index of a reader error; libyaml counts UTF-8 bytes, pure Python characters."""
    if _Loader.__name__.startswith("C"):
        return len(text.encode("utf-8")[:position].decode("utf-8", errors="ignore"))
    return position


def _line_col(text: str, index: int) -> tuple[int, int]:
    line = text.count("\n", 0, index) + 1
    return line, index - (text.rfind("\n", 0, index) + 1) + 1


class _Builder:
    def __init__(self, file: str, explicit_str: set | None = None):
        self.file = file
        self.explicit_str = explicit_str or set()
        self.positions: dict = {}
        self.key_positions: dict = {}
        self.seen: set[int] = set()
        self.count = 0

    def fail(self, node: yaml.Node, message: str) -> InputError:
        return InputError(self.file, node.start_mark.line + 1, node.start_mark.column + 1, message)

    def build(self, node: yaml.Node, path: tuple, depth: int) -> object:
        if depth > MAX_DEPTH:
            raise self.fail(node, f"nesting deeper than {MAX_DEPTH} levels")
        self.count += 1
        if self.count > MAX_NODES:
            raise self.fail(node, f"more than {MAX_NODES} YAML nodes")
        if id(node) in self.seen:
            # compose() hands back the anchored node again for every alias, with the anchor's
            # marks: point at the key that holds the alias instead.
            pos = self.key_positions.get(path) or Position(node.start_mark.line + 1,
                                                           node.start_mark.column + 1)
            raise InputError(self.file, pos.line, pos.column,
                             "aliases (*name) are not allowed; write the value out")
        self.seen.add(id(node))
        self.positions[path] = Position(node.start_mark.line + 1, node.start_mark.column + 1)
        if isinstance(node, yaml.ScalarNode):
            return self.scalar(node)
        if isinstance(node, yaml.SequenceNode):
            self.check_tag(node)
            return [self.build(item, path + (i,), depth + 1) for i, item in enumerate(node.value)]
        if isinstance(node, yaml.MappingNode):
            self.check_tag(node)
            return self.mapping(node, path, depth)
        raise self.fail(node, "unsupported YAML node")  # pragma: no cover

    def mapping(self, node: yaml.MappingNode, path: tuple, depth: int) -> dict:
        out: dict = {}
        first_line: dict = {}
        for key_node, value_node in node.value:
            if not isinstance(key_node, yaml.ScalarNode):
                raise self.fail(key_node, "mapping keys must be plain text")
            if key_node.tag == _MERGE_TAG or (key_node.value == "<<" and key_node.style is None):
                raise self.fail(key_node, "merge keys (<<) are not allowed; write the keys out")
            self.check_tag(key_node)
            key = key_node.value  # keys are always text: `1:`, `on:` and `no:` are names here
            line = key_node.start_mark.line + 1
            if key in out:
                raise self.fail(key_node, f"duplicate key '{key}' (first on line {first_line[key]})")
            first_line[key] = line
            kpath = path + (key,)
            self.key_positions[kpath] = Position(line, key_node.start_mark.column + 1)
            out[key] = self.build(value_node, kpath, depth + 1)
        return out

    def check_tag(self, node: yaml.Node) -> None:
        # Only the core tags that plain text resolves to implicitly; anything else (!!python/...,
        # !!binary, !!set, local !tags) would ask for a constructor, and none is ever run.
        if node.tag not in _CORE_TAGS:
            raise self.fail(node, f"YAML tag '{_short_tag(node.tag)}' is not allowed")

    def scalar(self, node: yaml.ScalarNode) -> object:
        self.check_tag(node)
        value = node.value
        if node.style:  # quoted or block scalar: always text (libyaml gives '' for plain)
            return value
        if (node.start_mark.line + 1, node.start_mark.column + 1) in self.explicit_str:
            return value
        if value in ("", "~", "null", "Null", "NULL"):
            return None
        if value in ("true", "True", "TRUE"):
            return True
        if value in ("false", "False", "FALSE"):
            return False
        if _INT.match(value):
            try:
                return int(value)
            except ValueError:  # Python refuses to convert thousands of digits
                raise self.fail(node, f"a number of {len(value)} digits is too long") from None
        if _FLOAT.match(value):
            number = float(value)
            if number in (float("inf"), float("-inf")):
                raise self.fail(node, f"'{value}' is too large to be a finite number")
            return number
        if _NONFINITE.match(value):
            raise self.fail(node, f"'{value}' is not a finite number")
        return value


def _short_tag(tag: str) -> str:
    return "!!" + tag[len(_CORE):] if tag.startswith(_CORE) else tag


_CORE = "tag:yaml.org,2002:"
_MERGE_TAG = _CORE + "merge"
_CORE_TAGS = frozenset(_CORE + name for name in
                       ("str", "int", "float", "bool", "null", "timestamp", "map", "seq"))
