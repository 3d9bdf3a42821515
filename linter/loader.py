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

import gc
import re
from dataclasses import field
from pathlib import Path

import yaml

from .files import Refused, read_limited
from .records import record

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



@record(frozen=True)
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
        return printable(f"{self.file}:{self.line}:{self.column}: {self.message}")

    def __reduce__(self):
        # Exceptions pickle their ``args`` (the message alone); batch workers send errors back.
        return (type(self), (self.file, self.line, self.column, self.message))


def printable(text: str, keep: str = "") -> str:
    """``text`` on one line and harmless on a terminal: line breaks, control characters
    (terminal escape sequences) and invisible format characters shown escaped, as ``\\x1b``;
    the characters in ``keep`` (a line break in free text) stay as they are."""
    return "".join(c if c.isprintable() or c in keep else repr(c)[1:-1] for c in text)


@record
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
    """Read a file as UTF-8 with precise errors for what is not a readable text file: only a
    regular file is read, and no more of it than the size limit (see files.py)."""
    try:
        raw = read_limited(path, MAX_BYTES)
    except Refused as exc:
        message = exc.message + (", not a YAML file" if exc.message == "is a directory" else "")
        raise InputError(shown, 1, 1, message) from None
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


def load_file(path: Path, shown: str | None = None, text: str | None = None) -> Document:
    """Load ``path``; with ``text``, that is its content (an editor's unsaved buffer) in place of
    what is on disk, held to the same checks (size, NUL bytes) as the file would be."""
    shown = shown if shown is not None else str(path)
    if text is not None:
        return load_text(decode(text.encode("utf-8", "replace"), shown), shown)
    return load_text(read_text(path, shown), shown)


def load_text(text: str, shown: str) -> Document:
    if not text.strip():
        raise InputError(shown, 1, 1, "empty file")
    try:
        read = _read(text, shown)
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
    if read is None:
        raise InputError(shown, 1, 1, "empty file")  # nothing, or only `---`
    data, positions, key_positions = read
    return Document(shown, data, positions, key_positions)


def _read(text: str, shown: str) -> tuple[object, dict, dict] | None:
    """The first document's data and positions, in one pass over the parser's events.

    Three kinds of check, each reported as if it ran over the whole file before the next one:

    1. on the events: aliases, merge keys, node count and depth, core tags other than ``!!str``
       (refused where they are written, before anything is built, so a flood costs nothing);
    2. on the document: one document only, no anchor defined twice (as libyaml's composer says);
    3. on the values: plain-text keys, allowed tags, no duplicate keys, numbers that fit.

    A check of a later kind that fails is held until the whole stream has passed the earlier
    ones; None means the file holds no value at all.
    """
    parser = _Loader(text)
    # The data built here holds no reference cycles, so the cycle collector has nothing to find
    # in it; left on, it walks the growing tree over and over, which shows in a large design.
    collecting = gc.isenabled()
    gc.disable()
    try:
        return _events(parser, shown)
    finally:
        if collecting:
            gc.enable()
        parser.dispose()


def _events(parser, shown: str) -> tuple[object, dict, dict] | None:
    resolve = _resolve
    made = _POSITIONS
    stack: list[list] = []  # per open collection: [is a mapping, next node is a key, build frame]
    count = 0
    documents = 0
    anchors: dict[str, yaml.Mark] = {}
    root_mark = None
    late_document: Exception | None = None  # check 2, the first to fail
    late_value: InputError | None = None  # check 3, the first to fail
    composing = False  # inside the first document, no document check failed yet
    building = False  # and no value check failed yet
    root: list = []
    root_empty = False
    positions: dict = {}
    key_positions: dict = {}
    for event in iter(parser.get_event, None):
        kind = type(event)
        if kind is yaml.MappingEndEvent or kind is yaml.SequenceEndEvent:
            stack.pop()
            continue
        if kind is yaml.DocumentStartEvent:
            documents += 1
            if documents == 2 and late_document is None:
                late_document = yaml.composer.ComposerError(
                    "expected a single document in the stream", root_mark,
                    "but found another document", event.start_mark)
            composing = documents == 1 and late_document is None
            building = composing and late_value is None
            continue
        if kind is yaml.DocumentEndEvent:
            composing = building = False
            continue
        if kind is not yaml.ScalarEvent and kind is not yaml.MappingStartEvent \
                and kind is not yaml.SequenceStartEvent and kind is not yaml.AliasEvent:
            continue  # stream start and end
        # 1. the event checks
        top = stack[-1] if stack else None
        is_key = top is not None and top[0] and top[1]
        if top is not None and top[0]:
            top[1] = not top[1]
        mark = event.start_mark
        line, col = mark.line + 1, mark.column + 1
        if kind is yaml.AliasEvent:
            raise InputError(shown, line, col, f"alias '*{event.anchor}' is not allowed; write "
                                               f"the value out")
        count += 1
        if count > MAX_NODES:
            raise InputError(shown, line, col, f"more than {MAX_NODES} YAML nodes (keys and "
                                               f"values); the file is too large to check")
        if len(stack) > MAX_DEPTH:
            raise InputError(shown, line, col, f"nesting deeper than {MAX_DEPTH} levels")
        tag = event.tag
        explicit_str = False
        if kind is yaml.ScalarEvent:
            if is_key and (tag == _MERGE_TAG or
                           (event.value == "<<" and tag is None and event.implicit[0])):
                raise InputError(shown, line, col, "merge keys (<<) are not allowed; write the "
                                                   "keys out")
            if tag == "!" or tag == _STR_TAG:
                explicit_str = True  # `!!str 12` is the text '12'
            elif tag is not None and tag in _CORE_TAGS:
                # `!!int '12'` or `!!bool yes` would ask YAML 1.1 to decide what the text means
                raise InputError(shown, line, col, f"YAML tag '{_short_tag(tag)}' is not "
                                                   f"allowed; write the value plainly")
        if kind is not yaml.ScalarEvent:
            stack.append([kind is yaml.MappingStartEvent, True, None])
        if not composing:
            continue
        # 2. the document checks
        if event.anchor is not None:
            first = anchors.get(event.anchor)
            if first is not None:
                late_document = yaml.composer.ComposerError(
                    "found duplicate anchor; first occurrence", first, "second occurrence", mark)
                composing = building = False
                continue
            anchors[event.anchor] = mark
        if not building:
            continue
        # 3. the values, built as the events arrive
        try:
            if top is None:  # the document's root
                root_mark = mark
                root_empty = kind is yaml.ScalarEvent and event.value == "" and not event.style
                value = _value(event, kind, tag, explicit_str, resolve, shown)
                positions[()] = Position(line, col)
                root.append(value)
                if kind is not yaml.ScalarEvent:
                    stack[-1][2] = _frame(value, (), 0)
                continue
            frame = top[2]
            container, path, depth = frame[0], frame[1], frame[2]
            if type(container) is dict:
                if is_key:
                    if kind is not yaml.ScalarEvent:
                        raise InputError(shown, line, col, "mapping keys must be plain text")
                    key = event.value  # keys are always text: `1:`, `on:` and `no:` are names
                    resolved = tag if tag is not None and tag != "!" else resolve(
                        yaml.ScalarNode, key, event.implicit)
                    if resolved == _MERGE_TAG:
                        raise InputError(shown, line, col, "merge keys (<<) are not allowed; "
                                                           "write the keys out")
                    if resolved not in _CORE_TAGS:
                        raise InputError(shown, line, col,
                                         f"YAML tag '{_short_tag(resolved)}' is not allowed")
                    first_line = frame[3]
                    if key in first_line:
                        raise InputError(shown, line, col, f"duplicate key '{key}' (first on "
                                                           f"line {first_line[key]})")
                    first_line[key] = line
                    frame[4] = path + (key,)
                    pos = made.get((line, col))
                    if pos is None:
                        pos = _position(line, col)
                    key_positions[frame[4]] = pos
                    continue
                child = frame[4]
                value = _value(event, kind, tag, explicit_str, resolve, shown)
                container[child[-1]] = value
            else:
                child = path + (len(container),)
                value = _value(event, kind, tag, explicit_str, resolve, shown)
                container.append(value)
            pos = made.get((line, col))
            if pos is None:
                pos = _position(line, col)
            positions[child] = pos
            if kind is not yaml.ScalarEvent:
                stack[-1][2] = _frame(value, child, depth + 1)
        except InputError as exc:
            late_value = exc
            building = False
    if late_document is not None:
        raise late_document
    if root_mark is None or root_empty:
        return None
    if late_value is not None:
        raise late_value
    return root[0], positions, key_positions


#: Positions are immutable and every design repeats the same lines and columns (a re-lint of the
#: same file all of them): each is made once and shared, a tenth of a large design's load
#: [measured: bench/run.py's large pack, issue 19]. Bounded (a few megabytes at most), as a
#: batch's files differ; the benchmark's 2 000-component pack has about 20 000 places.
_POSITIONS: dict[tuple[int, int], Position] = {}
POSITIONS_MAX = 32_768


def _position(line: int, col: int) -> Position:
    if len(_POSITIONS) >= POSITIONS_MAX:
        _POSITIONS.clear()
    pos = _POSITIONS[(line, col)] = Position(line, col)
    return pos


def _frame(container: object, path: tuple, depth: int) -> list:
    # [container, its path, its depth, first line of each key (mappings), path of the pending key]
    return [container, path, depth, {}, None]


def _value(event: yaml.NodeEvent, kind: type, tag: str | None, explicit_str: bool, resolve,
           shown: str) -> object:
    """The value of a node event: a new, empty list or dict for a collection."""
    if tag is None and kind is yaml.ScalarEvent and not event.style:
        # A plain scalar's value is a function of its text alone (its tag is resolved from it).
        known = _PLAIN.get(event.value, _PLAIN)
        if known is not _PLAIN:
            return known
        value = _plain_value(event, kind, resolve, shown)
        if len(_PLAIN) >= PLAIN_MAX:
            _PLAIN.clear()
        _PLAIN[event.value] = value
        return value
    return _plain_value(event, kind, resolve, shown, tag, explicit_str)


#: The values of plain scalars by their text: a design repeats its part names, nets, pins and
#: numbers, and a re-lint all of them; each is an immutable str, int, float, bool or None
#: [measured: a fifth of the load of bench/run.py's large pack, issue 19]. Bounded, as
#: _RESOLVED is; a text that is refused raises before it is kept.
_PLAIN: dict = {}
PLAIN_MAX = 50_000


def _plain_value(event: yaml.NodeEvent, kind: type, resolve, shown: str, tag: str | None = None,
                 explicit_str: bool = False) -> object:
    mark = event.start_mark
    if tag is None or tag == "!":
        node_kind = yaml.ScalarNode if kind is yaml.ScalarEvent else \
            yaml.MappingNode if kind is yaml.MappingStartEvent else yaml.SequenceNode
        tag = resolve(node_kind, event.value if kind is yaml.ScalarEvent else None,
                      event.implicit)
    # Only the core tags that plain text resolves to implicitly; anything else (!!python/...,
    # !!binary, !!set, local !tags) would ask for a constructor, and none is ever run.
    if tag not in _CORE_TAGS:
        raise InputError(shown, mark.line + 1, mark.column + 1,
                         f"YAML tag '{_short_tag(tag)}' is not allowed")
    if kind is yaml.MappingStartEvent:
        return {}
    if kind is yaml.SequenceStartEvent:
        return []
    value = event.value
    if event.style or explicit_str:  # quoted or block scalar, or `!!str`: always text
        return value  # (libyaml gives '' for plain)
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
            raise InputError(shown, mark.line + 1, mark.column + 1,
                             f"a number of {len(value)} digits is too long") from None
    if _FLOAT.match(value):
        number = float(value)
        if number in (float("inf"), float("-inf")):
            raise InputError(shown, mark.line + 1, mark.column + 1,
                             f"'{value}' is too large to be a finite number")
        return number
    if _NONFINITE.match(value):
        raise InputError(shown, mark.line + 1, mark.column + 1, f"'{value}' is not a finite number")
    return value


def _reader_index(text: str, position: int) -> int:
    """Character index of a reader error; libyaml counts UTF-8 bytes, pure Python characters."""
    if _Loader.__name__.startswith("C"):
        return len(text.encode("utf-8")[:position].decode("utf-8", errors="ignore"))
    return position


def _line_col(text: str, index: int) -> tuple[int, int]:
    line = text.count("\n", 0, index) + 1
    return line, index - (text.rfind("\n", 0, index) + 1) + 1


def _short_tag(tag: str) -> str:
    return "!!" + tag[len(_CORE):] if tag.startswith(_CORE) else tag


_CORE = "tag:yaml.org,2002:"
_MERGE_TAG = _CORE + "merge"
_STR_TAG = _CORE + "str"
_CORE_TAGS = frozenset(_CORE + name for name in
                       ("str", "int", "float", "bool", "null", "timestamp", "map", "seq"))
# What libyaml's composer asks of the loader's resolver for a node without a tag: the same rules,
# remembered per text (a design repeats its part names, nets and pin names many times).
_RESOLVER = yaml.resolver.Resolver()
_RESOLVED: dict = {}


def _resolve(kind: type, value: str | None, implicit) -> str:
    if kind is not yaml.ScalarNode or len(value) > 100:
        return _RESOLVER.resolve(kind, value, implicit)
    key = (value, implicit)
    tag = _RESOLVED.get(key)
    if tag is None:
        if len(_RESOLVED) > 50_000:
            _RESOLVED.clear()
        tag = _RESOLVED[key] = _RESOLVER.resolve(kind, value, implicit)
    return tag
