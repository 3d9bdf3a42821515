"""What the language server knows, without the protocol: lint an editor's text, say what to show.

A design is linted from the editor's text (``lint_file(..., text=...)``), its part libraries,
config and policy from disk as saved: that is what CI will see, and saving one of them re-lints
the open designs that read it (:meth:`LiveLinter.dependents`). Nothing goes stale: a library is
re-read when its file changes (size, time or inode differ from when it was read), a config or
policy on every change of its file, and the date waivers expire by is today's, however long the
editor stays open. Nothing outlives the open documents: a library no open design reads is
dropped, as are the sessions of configs no open design uses.

Waived findings are shown as *hints* with the waiver's reason: greyed out in most editors and kept
out of their problem counts, but where the accepted risk sits, so an edit that moves out of the
waiver's reach is seen at once (an expired or unused waiver is a ``waiver-hygiene`` finding).
"""

from __future__ import annotations

import atexit
import datetime as _dt
import hashlib
import os
import shutil
import re
import tempfile
from dataclasses import field, replace
from pathlib import Path
from typing import Annotated, Any, get_args, get_origin

from ..api import Finding
from ..config import find_config, load_config, check_against_rules
from ..engine import DesignResult, Session, describe, format_of, lint_file, load_registry
from ..kinds import SWITCH_KINDS
from ..library import LibraryCache, shown_path
from ..loader import InputError, load_file
from ..quantities import format_quantity
from ..records import record
from ..schema import PartLibrary, quantity_of
from ..validate import validate

DESIGN_FORMAT = "packwarden/1"
LIBRARY_FORMAT = "packwarden-parts/1"
CONFIG_NAMES = ("packwarden.toml", "pyproject.toml")
#: The pseudo-rule input errors are filed under in SARIF and JUnit, and in docs/rules.md.
INPUT_ERROR = "input-error"


@record(frozen=True)
class Related:
    file: Path
    line: int
    column: int
    message: str


@record(frozen=True)
class Note:
    """One diagnostic, before the protocol: where (1-based line, column in code points), how
    severe (error, warning, info or hint), what, and the rule id."""

    file: Path
    line: int
    column: int
    severity: str
    message: str
    code: str | None = None
    related: tuple[Related, ...] = ()


def absolute(file: str | Path) -> Path:
    """A file as messages name it (relative to this process's folder) as an absolute path."""
    return Path(os.path.abspath(file))


def _stamp(path: Path | None) -> tuple | None:
    """What tells a changed file: size, modification time and inode (None: no such file)."""
    if path is None:
        return None
    try:
        st = path.stat()
    except OSError:
        return None
    return (st.st_size, st.st_mtime_ns, st.st_ino)


@record
class FreshLibraries(LibraryCache):
    """The engine's library cache, made fit to outlive one run: a library whose file changed
    since it was read is read again, and every library a lint reads is recorded (``touched``)
    so that saving it re-lints the designs that read it."""

    stamps: dict[Path, Any] = field(default_factory=dict)
    touched: set[Path] = field(default_factory=set)

    def load(self, path: Path):
        key = path.resolve()
        stamp = _stamp(key)
        if self.stamps.get(key) != stamp:
            self.loaded.pop(key, None)
            self.stamps[key] = stamp
        self.touched.add(key)
        return super().load(path)

    def start(self) -> None:
        """Before a lint: forget which libraries were read, and the resolved sets of libraries,
        which would skip reading (and so checking) the files they came from."""
        self.touched = set()
        self.resolved.clear()

    def keep(self, paths: set[Path]) -> None:
        for key in [k for k in self.loaded if k not in paths]:
            del self.loaded[key]
            self.stamps.pop(key, None)


@record
class OpenDesign:
    result: DesignResult
    config: Path | None
    #: Files this design's lint read besides itself: its config, policy and libraries (resolved).
    depends: frozenset


class LiveLinter:
    """The open designs' latest results and the sessions (rules, configs, libraries) they need."""

    def __init__(self) -> None:
        #: By config file (None: no config): the session, and the config file's stamp.
        self.sessions: dict[Path | None, tuple[Session, Any]] = {}
        self.designs: dict[Path, OpenDesign] = {}
        #: By config file: the rule reference written for its session's rules, and its URI.
        self._docs: dict[Path | None, tuple[Any, str]] = {}
        self._docs_folder: Path | None = None

    # --- sessions ------------------------------------------------------------------------------

    def session_for(self, config: Path | None) -> Session:
        """The session of a config file: its rules (with its rule folders) are loaded once and
        again only when the file changes; its policy and the configs are re-read each lint."""
        stamp = _stamp(config)
        held = self.sessions.get(config)
        if held is None or held[1] != stamp:
            folders: list[Path] = []
            try:
                folders = load_config(config, shown_path(config) if config else None).rule_paths
            except InputError:
                pass  # the lint reports it, at its line in the config
            session = Session(registry=load_registry(folders), libraries=FreshLibraries())
            self.sessions[config] = (session, stamp)
        session = self.sessions[config][0]
        session.configs.clear()
        session.config_paths.clear()
        session.policies.clear()
        session.today = _dt.date.today()
        return session

    # --- designs -------------------------------------------------------------------------------

    def lint_design(self, path: Path, text: str) -> list[Note]:
        """Lint an open design from its text; notes for it and for any other file at fault."""
        path = absolute(path)
        try:
            return self._lint_design(path, text)
        except Exception as exc:  # the server must outlive any fault of ours: say it and go on
            self.designs.pop(path, None)
            return [Note(path, 1, 1, "error", f"packwarden could not lint this file (a fault in "
                                               f"packwarden, not in the design): {describe(exc)}")]

    def _lint_design(self, path: Path, text: str) -> list[Note]:
        config = find_config(path.parent)
        session = self.session_for(config)
        libraries = session.libraries
        assert isinstance(libraries, FreshLibraries)
        libraries.start()
        shown = shown_path(path)
        result = lint_file(session, path, shown, text=text)
        depends = set(libraries.touched)
        if config is not None:
            depends.add(config.resolve())
        for cfg, _, _ in session.configs.values():
            if cfg is not None and cfg.policy is not None:
                depends.add(cfg.policy.resolve())
        self.designs[path] = OpenDesign(result, config, frozenset(depends))
        self._drop_unused()
        notes = [note for f in result.findings for note in _finding_notes(path, f)]
        for ie in result.internal:
            notes.append(Note(path, 1, 1, "error", f"rule '{ie.rule}' failed, so this design is "
                              f"only partly reviewed (a fault in the rule or in packwarden, not "
                              f"in the design): {ie.message}"))
        for origin, message in session.registry.broken:
            notes.append(Note(path, 1, 1, "error", message))
        errors = result.errors + session.policy_errors()
        for e in errors:
            notes.append(_error_note(e))
        notes += _summaries(path, shown, text, errors, libraries.touched)
        return notes

    def close(self, path: Path) -> None:
        self.designs.pop(absolute(path), None)
        self._drop_unused()

    def _drop_unused(self) -> None:
        used: set[Path] = set()
        for design in self.designs.values():
            used |= design.depends
        configs = {design.config for design in self.designs.values()}
        for config in [c for c in self.sessions if c not in configs]:
            del self.sessions[config]
            self._docs.pop(config, None)
        for session, _ in self.sessions.values():
            assert isinstance(session.libraries, FreshLibraries)
            session.libraries.keep(used)

    def forget(self, path: Path) -> None:
        """``path`` was written: read it afresh next time, even if its size and time look the
        same (a save within the file system's time resolution)."""
        path = absolute(path)
        key = path.resolve()
        self.sessions.pop(key, None)  # a config: its rules and rule folders are loaded again
        for session, _ in self.sessions.values():
            session.libraries.loaded.pop(key, None)

    def dependents(self, path: Path) -> list[Path]:
        """The open designs whose last lint read ``path`` (a library, config or policy)."""
        key = absolute(path).resolve()
        return [p for p, d in self.designs.items() if key in d.depends]

    # --- libraries and configs -----------------------------------------------------------------

    def lint_library(self, path: Path, text: str) -> list[Note]:
        """A part library's own mistakes, from the editor's text."""
        path = absolute(path)
        try:
            doc = load_file(path, shown_path(path), text)
            _, errors = validate(doc, PartLibrary)
        except InputError as exc:
            errors = [exc]
        except Exception as exc:
            return [Note(path, 1, 1, "error", f"packwarden could not check this library (a fault "
                                               f"in packwarden): {describe(exc)}")]
        return [_error_note(e) for e in errors]

    def lint_config(self, path: Path) -> list[Note]:
        """A project config's mistakes, as saved (TOML is read from disk, as ``check`` reads it)."""
        path = absolute(path)
        if find_config(path.parent) != path.resolve():
            return []  # a pyproject.toml without [tool.packwarden], or one a closer config hides
        try:
            cfg = load_config(path, shown_path(path))
            check_against_rules(cfg, self.session_for(path.resolve()).registry.rules)
        except InputError as exc:
            return [_error_note(exc)]
        except Exception as exc:
            return [Note(path, 1, 1, "error", f"packwarden could not check this config (a fault "
                                               f"in packwarden): {describe(exc)}")]
        finally:
            self._drop_unused()
        return []

    def dispose(self) -> None:
        """Remove the rule references written for the diagnostics' links."""
        if self._docs_folder is not None:
            shutil.rmtree(self._docs_folder, ignore_errors=True)
            self._docs_folder = None
            self._docs.clear()

    # --- documentation links -------------------------------------------------------------------

    def rule_docs(self, path: Path, rule_id: str) -> str | None:
        """A link to the rule's section of the rule reference, written for the rules this
        design is linted with (team rules included) into a temporary file once per session."""
        design = self.designs.get(absolute(path))
        if design is None or design.config not in self.sessions:
            return None
        registry = self.sessions[design.config][0].registry
        if rule_id not in registry.rules and rule_id != INPUT_ERROR:
            return None
        held = self._docs.get(design.config)
        if held is None or held[0] is not registry:
            from ..docs import render_rules
            if self._docs_folder is None:
                self._docs_folder = Path(tempfile.mkdtemp(prefix="packwarden-lsp-"))
                atexit.register(self.dispose)  # for use in a process that ends normally
            # one file per config, rewritten when its rules are loaded again
            reference = self._docs_folder / f"rules-{_digest(str(design.config))}.md"
            reference.write_text(render_rules(registry.rules[r] for r in sorted(registry.rules)),
                                 encoding="utf-8")
            held = self._docs[design.config] = (registry, reference.as_uri())
        return f"{held[1]}#{rule_id}"

    # --- hover ---------------------------------------------------------------------------------

    def hover(self, path: Path, line: int, column: int, text: str) -> str | None:
        """Markdown for what is under the cursor (1-based ``line``, 0-based ``column`` in code
        points): a component's key figures and findings, or a part's main ratings."""
        open_design = self.designs.get(absolute(path))
        if open_design is None or open_design.result.model is None:
            return None
        lines = text.splitlines()
        if not 1 <= line <= len(lines):
            return None
        word = _word_at(lines[line - 1], column)
        if not word:
            return None
        result = open_design.result
        components = result.model.netlist.components
        refdes = word if word in components else word.split(".", 1)[0]
        if refdes in components:
            return component_hover(components[refdes], result)
        for c in components.values():
            if c.part_name == word and c.part is not None:
                return part_hover(word, c.part)
        return None


def _digest(text: str) -> str:
    return hashlib.sha256(text.encode()).hexdigest()[:12]


def _finding_note(path: Path, f: Finding) -> Note:
    message = f.message + (f"\nhint: {f.hint}" if f.hint else "") + \
        "".join(f"\nassumes: {note}" for note in f.assumptions)
    if f.waived:
        return Note(path, f.location.line, f.location.column, "hint",
                    f"waived ({f.waived}): {message}", f.rule)
    return Note(path, f.location.line, f.location.column, f.severity.value, message, f.rule)


def _finding_notes(path: Path, f: Finding) -> list[Note]:
    """A finding's note on its first member's line and on every other member's: a grouped
    finding (four parallel packages) is seen wherever the editor shows one of them."""
    first = _finding_note(path, f)
    notes = [first]
    for place in f.locations:
        if place.file == f.location.file:
            where, line, column = path, place.line, place.column
        elif place.related is not None:  # a netlist member: its line in the design names it
            where, line, column = path, place.related.line, place.related.column
        else:
            where, line, column = absolute(place.file), place.line, place.column
        if (where, line, column) != (first.file, first.line, first.column):
            notes.append(replace(first, file=where, line=line, column=column))
    return notes


def _error_note(e: InputError) -> Note:
    return Note(absolute(e.file), e.line, e.column, "error", e.message, INPUT_ERROR)


def _summaries(path: Path, shown: str, text: str, errors: list[InputError],
               libraries: set[Path]) -> list[Note]:
    """On the design, one note per other file whose errors stop or skew its review, pointing
    there: the library's own notes may be in a file the editor does not show."""
    out = []
    seen: set[Path] = set()
    for e in errors:
        other = absolute(e.file)
        if other == path or other in seen:
            continue
        seen.add(other)
        line, column = 1, 1
        if other.resolve() in libraries:
            try:
                pos = load_file(path, shown, text).where(("libraries",), key=True)
                line, column = pos.line, pos.column
            except InputError:
                pass
        count = sum(1 for x in errors if absolute(x.file) == other)
        out.append(Note(path, line, column, "error",
                        f"not reviewed: {e.file} has {count} error(s); the first, at line "
                        f"{e.line}: {e.message}", INPUT_ERROR,
                        (Related(other, e.line, e.column, e.message),)))
    return out


_WORD = re.compile(r"[\w.+\-]+")


def _word_at(line: str, column: int) -> str | None:
    for m in _WORD.finditer(line):
        if m.start() <= column < m.end() or (column == m.end() and column == len(line)):
            return m.group().strip(".")
    return None


# --- hover text -----------------------------------------------------------------------------------

def component_hover(c: Any, result: DesignResult) -> str:
    """The component's part, the design's trip window (for its protector, switches and fuse), the
    switch's junction temperature in each load case, and the findings about it with their
    figures."""
    kind = c.kind or "unknown part"
    head = f"**{c.refdes}**: {kind}" + (f", part `{c.part_name}`" if c.part_name else "")
    out = [head, ""]
    fig = {name: f.value for name, f in result.figures.items()}  # KeyFigure values, SI
    if c.kind in ("protector", "fuse", *SWITCH_KINDS):
        trip = _window(fig, "trip_current")
        if trip:
            out.append(f"- over-current trip: {trip}")
        short = _window(fig, "short_circuit_trip")
        if short:
            out.append(f"- short-circuit trip: {short}")
        if fig.get("prospective_short_circuit") is not None:
            out.append(f"- prospective short circuit: "
                       f"{format_quantity(fig['prospective_short_circuit'], 'A')}")
    if c.kind in SWITCH_KINDS:
        for h in _heat_cases(result.model, c.refdes):
            bound = " (no steady state: a lower bound)" if h.runaway else ""
            out.append(f"- junction temperature, {h.case} load: "
                       f"{format_quantity(h.tj, '°C')}{bound} at "
                       f"{format_quantity(h.current, 'A')}, {format_quantity(h.power, 'W')} in "
                       f"the package, {format_quantity(h.ambient, '°C')} ambient")
    about = [f for f in result.findings
             if f.element and (f.element == c.refdes or f.element.startswith(c.refdes + "."))]
    if about:
        out += ["", "Findings:"]
        for f in about:
            state = f"waived: {f.waived}" if f.waived else f.severity.value
            out.append(f"- `{f.rule}` ({state}): {f.message}")
            for figure in f.figures:
                out.append(f"  - {figure.text()}")
    elif result.linted:
        out += ["", "No findings about it."]
    return "\n".join(out)


def _window(fig: dict, name: str) -> str | None:
    low, high = fig.get(f"{name}_min"), fig.get(f"{name}_max")
    if low is None or high is None:
        return None
    typ = fig.get(f"{name}_typ")
    return (f"{format_quantity(low, 'A')} to {format_quantity(high, 'A')}"
            + (f" (typ {format_quantity(typ, 'A')})" if typ is not None else ""))


def _heat_cases(model: Any, refdes: str) -> list:
    """The model's junction temperatures of this package; none if the model cannot give them."""
    try:
        return [h for h in model.switch_heat if h.package == refdes]
    except Exception:  # a design the model cannot solve: the hover shows the rest
        return []


def part_hover(name: str, part: Any) -> str:
    """A library part's ratings: its quantities, and those one level down (``overcharge.detect``)."""
    out = [f"**{name}**: {getattr(part, 'kind', 'part')}", ""]
    out += [f"- {label}: {text}" for label, text in _ratings(part, "")]
    return "\n".join(out)


def _ratings(model: Any, prefix: str) -> list[tuple[str, str]]:
    out = []
    for name, f in type(model).model_fields.items():
        value = getattr(model, name, None)
        if value is None or name == "kind":
            continue
        unit = _unit_of(f)
        if unit is not None and not isinstance(value, str):  # str: a choice such as "cell"
            out.append((prefix + name, _quantity_text(value, unit)))
        elif hasattr(type(value), "model_fields") and not prefix:
            out += _ratings(value, f"{name}.")
        elif isinstance(value, list) and value and hasattr(type(value[0]), "model_fields"):
            rows = (", ".join(f"{k} {v}" for k, v in _ratings(item, "")) for item in value)
            out.append((prefix + name, "; ".join(rows)))
        elif isinstance(value, (str, int, float)) and not isinstance(value, bool):
            out.append((prefix + name, str(getattr(value, "value", value))))
    return out


def _unit_of(f: Any) -> str | None:
    """The unit of a ``Q(unit)`` or ``Tol(unit)`` field, also when it is optional."""
    found = quantity_of(f.metadata)
    if found is None:
        for arg in get_args(f.annotation):
            if get_origin(arg) is Annotated:
                found = quantity_of(get_args(arg)[1:])
                if found is not None:
                    break
    return found[1] if found else None


def _quantity_text(value: Any, unit: str) -> str:
    # four figures: a library writes thresholds such as 4.275 V, which three would round
    if isinstance(value, (int, float)):
        return format_quantity(value, unit, digits=4)
    limits = [(k, getattr(value, k, None)) for k in ("min", "typ", "max")]
    return ", ".join(f"{k} {format_quantity(v, unit, digits=4)}" for k, v in limits
                     if v is not None)


def is_design(text: str) -> bool:
    return format_of(text[:4096]) == DESIGN_FORMAT


def is_library(text: str) -> bool:
    return format_of(text[:4096]) == LIBRARY_FORMAT


def is_config(path: Path) -> bool:
    return path.name in CONFIG_NAMES
