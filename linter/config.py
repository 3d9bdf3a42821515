"""Project configuration: ``[tool.packwarden]`` in pyproject.toml, or packwarden.toml, found upward.

Example::

    [tool.packwarden]
    fail_on = "warning"
    ignore = ["storage-drain"]
    rule_paths = ["team_rules"]          # folders of team rule modules, relative to this file
    library_roots = ["../team-parts"]    # folders outside the repository libraries may come from

    [tool.packwarden.severity]
    switch-temperature = "error"

    [tool.packwarden.rules.threshold-ladder]
    charge_margin = "30 mV"
"""

from __future__ import annotations

import re
import sys
from dataclasses import field
from pathlib import Path
from typing import Any

from pydantic_core import ValidationError

from .api import Rule, RuleOptions, Severity, default_options
from .files import Refused, check_path, read_limited
from .loader import InputError
from .records import record


def _toml() -> Any:
    """The TOML reader, imported when a config is read: a check of designs with no
    pyproject.toml near them never needs it (about 3 ms of a cold check)."""
    if sys.version_info >= (3, 11):
        import tomllib
    else:  # pragma: no cover
        import tomli as tomllib
    return tomllib


def _loads(text: str) -> dict:
    """``tomllib.loads(text)``; a text of only blank lines and comments (a ``packwarden.toml`` that
    only marks a repository's root) is ``{}`` without importing the reader."""
    for line in text.split("\n"):
        line = line[:-1] if line.endswith("\r") else line
        rest = line.lstrip(" \t")
        if rest and (rest[0] != "#" or any(c < " " and c != "\t" or c == "\x7f" for c in rest)):
            return _toml().loads(text)
    return {}


#: No project config is anywhere near this; a larger file is refused unread.
MAX_CONFIG_BYTES = 1024 * 1024

KNOWN_KEYS = ("select", "ignore", "fail_on", "severity", "rules", "rule_paths", "policy",
              "require_plugins", "library_roots")


@record
class Config:
    file: str | None = None
    folder: Path | None = None
    select: list[str] | None = None  # None: every rule
    ignore: list[str] = field(default_factory=list)
    fail_on: Severity = Severity.error
    severity: dict[str, Severity] = field(default_factory=dict)
    rule_options: dict[str, dict[str, Any]] = field(default_factory=dict)
    rule_paths: list[Path] = field(default_factory=list)
    #: Folders outside the repository that part libraries may come from (a team's library kept
    #: in its own repository), relative to the config; confined like the repository.
    library_roots: tuple[Path, ...] = ()
    require_plugins: list[str] = field(default_factory=list)
    policy: Path | None = None
    text: str = ""
    #: Dotted name of the table holding the settings: "tool.packwarden" in pyproject.toml, "" in
    #: packwarden.toml. Used to point messages at the right table.
    prefix: str = ""

    def enabled(self, rule_id: str) -> bool:
        if rule_id in self.ignore:
            return False
        return self.select is None or rule_id in self.select or "all" in self.select


def find_config(start: Path) -> Path | None:
    """The nearest packwarden.toml, or pyproject.toml with a [tool.packwarden] table, upward."""
    folder = start.resolve()
    if folder.is_file():
        folder = folder.parent
    for d in (folder, *folder.parents):
        own = d / "packwarden.toml"
        if own.is_file():
            return own
        py = d / "pyproject.toml"
        if py.is_file() and _has_packwarden_table(py):
            return py
    return None


def _has_packwarden_table(path: Path) -> bool:
    """Whether the TOML file holds ``tool.packwarden``, however it is spelt
    (``[ tool.packwarden ]``, ``[tool."packwarden"]``, dotted keys under ``[tool]``): parsed, then
    looked up. A file that does
    not parse counts when it names packwarden at all, so its syntax error is reported rather than
    its settings silently dropped."""
    try:
        text = read_limited(path, MAX_CONFIG_BYTES).decode("utf-8")
    except (Refused, UnicodeDecodeError):
        return False
    known = _TABLE_IN_TEXT.get(text)
    if known is None:
        known = _TABLE_IN_TEXT[text] = _names_packwarden_table(text)
        if len(_TABLE_IN_TEXT) > 64:
            del _TABLE_IN_TEXT[next(iter(_TABLE_IN_TEXT))]
    return known


#: The answer of :func:`_names_packwarden_table` by the file's text: the language server looks for
#: the config at every re-lint, and parsing a project's pyproject.toml was a quarter of a small
#: design's warm re-lint [measured: cProfile, issue 19]. Keyed by the text itself, not the file's
#: time, so a save the time cannot tell apart is still read as written.
_TABLE_IN_TEXT: dict[str, bool] = {}


def _names_packwarden_table(text: str) -> bool:
    try:
        tool = _loads(text).get("tool")
    except _toml().TOMLDecodeError:
        return "packwarden" in text
    return isinstance(tool, dict) and "packwarden" in tool


def line_of(text: str, key: str, tables: tuple[str, ...] = ("",), prefix: str = "") -> tuple[int, int]:
    """Where ``key`` is written: searched in ``tables`` (most specific first) under ``prefix``.

    tomllib keeps no positions, so this reads the text: within a table, the first line naming the key
    as a whole word is where a person would look. A rule id named both in ``select`` and under
    ``[tool.packwarden.severity]`` is found in the table the error is about, and ``rules`` is not
    found inside ``rule_paths``.
    """
    lines = text.splitlines()
    word = re.compile(r"(?<![\w-])" + re.escape(key) + r"(?![\w-])")
    headers = [(i, _header_name(ln)) for i, ln in enumerate(lines)]
    headers = [(i, h) for i, h in headers if h is not None]
    for table in tables:
        name = ".".join(p for p in (prefix, table) if p)
        if name:
            starts = [i for i, h in headers if h == name]
            if not starts:
                continue
            start = starts[0]
        else:
            start = 0  # the top of a packwarden.toml, before any [table]
        ends = [i for i, _ in headers if i > start]
        end = ends[0] if ends else len(lines)
        for i in range(start, end):
            m = word.search(_strip_comment(lines[i]))
            if m:
                return i + 1, m.start() + 1
    for i, line in enumerate(lines, 1):  # last resort: anywhere in the file
        m = word.search(_strip_comment(line))
        if m:
            return i, m.start() + 1
    return 1, 1


def _strip_comment(line: str) -> str:
    """The line without a trailing ``# comment``; a ``#`` inside a quoted string stays."""
    quote = None
    for i, ch in enumerate(line):
        if quote:
            if ch == quote:
                quote = None
        elif ch in "\"'":
            quote = ch
        elif ch == "#":
            return line[:i]
    return line


def _header_name(line: str) -> str | None:
    """``tool.packwarden.rules.unknown-part`` for ``[tool.packwarden.rules."unknown-part"]``."""
    stripped = _strip_comment(line).strip()
    if not (stripped.startswith("[") and stripped.endswith("]")) or stripped.startswith("[["):
        return None
    return "".join(stripped[1:-1].split()).replace('"', "").replace("'", "")


def load_config(path: Path | None, shown: str | None = None) -> Config:
    """Read and check a config file; raise :class:`InputError` with file and line on any mistake."""
    if path is None:
        return Config()
    shown = shown or str(path)
    try:
        text = read_limited(path, MAX_CONFIG_BYTES).decode("utf-8")
        data = _loads(text)
    except _toml().TOMLDecodeError as exc:
        line = getattr(exc, "lineno", None) or 1
        col = getattr(exc, "colno", None) or 1
        raise InputError(shown, line, col, f"TOML syntax error: {exc.args[0].split(' (at')[0]}") from None
    except Refused as exc:
        raise InputError(shown, 1, 1, f"cannot read config: {exc.message}") from None
    except UnicodeDecodeError as exc:
        raise InputError(shown, 1, 1, f"cannot read config: {exc}") from None
    prefix = "tool.packwarden" if path.name == "pyproject.toml" else ""
    tool = data.get("tool", {}) if prefix else {}
    if not isinstance(tool, dict):
        line, col = line_of(text, "tool")
        raise InputError(shown, line, col, "'tool' must be a table")
    table = tool.get("packwarden", {}) if prefix else data

    def fail(key: str, message: str, tables: tuple[str, ...] = ("",)) -> InputError:
        line, col = line_of(text, key, tables, prefix)
        return InputError(shown, line, col, message)

    if not isinstance(table, dict):
        raise fail("packwarden", "[tool.packwarden] must be a table")
    for key in table:
        if key not in KNOWN_KEYS:
            import difflib  # only for a mistake (start-up time)
            close = difflib.get_close_matches(key, KNOWN_KEYS, n=1)
            raise fail(key, f"unknown config key '{key}'" +
                       (f" (did you mean '{close[0]}'?)" if close else ""))
    cfg = Config(file=shown, folder=path.parent, text=text, prefix=prefix)
    for key in ("select", "ignore", "rule_paths", "require_plugins", "library_roots"):
        if key in table and not (isinstance(table[key], list) and
                                 all(isinstance(v, str) for v in table[key])):
            raise fail(key, f"'{key}' must be a list of strings")
    cfg.select = table.get("select")
    cfg.ignore = table.get("ignore", [])
    cfg.require_plugins = list(table.get("require_plugins", []))
    if "policy" in table and not isinstance(table["policy"], str):
        raise fail("policy", "'policy' must be a path (string)")
    for key in ("rule_paths", "policy", "library_roots"):  # TOML strings may hold "\u0000"
        given = table.get(key, [])
        for value in given if isinstance(given, list) else [given]:
            try:
                check_path(Path(value))
            except Refused as exc:
                raise fail(key, f"'{key}': {exc.message}") from None
    cfg.rule_paths = [path.parent / p for p in table.get("rule_paths", [])]
    cfg.library_roots = tuple(path.parent / p for p in table.get("library_roots", []))
    if "policy" in table:
        cfg.policy = path.parent / table["policy"]
    if "fail_on" in table:
        cfg.fail_on = _severity(table["fail_on"], lambda m: fail("fail_on", m))
    sev = table.get("severity", {})
    if not isinstance(sev, dict):
        raise fail("severity", "'severity' must be a table of rule-id = level")
    cfg.severity = {k: _severity(v, lambda m, k=k: fail(k, f"severity of '{k}': {m}",
                                                        ("severity", "")))
                    for k, v in sev.items()}
    rules = table.get("rules", {})
    if not isinstance(rules, dict) or not all(isinstance(v, dict) for v in rules.values()):
        raise fail("rules", "'rules' must hold one table per rule: [tool.packwarden.rules.<id>]")
    cfg.rule_options = rules
    return cfg


def _severity(value: Any, fail) -> Severity:
    try:
        return Severity(value)
    except ValueError:
        raise fail(f"unknown severity {value!r}; use error, warning or info") from None


def check_against_rules(cfg: Config, rules: dict[str, Rule]) -> dict[str, RuleOptions]:
    """Check rule ids and options named in ``cfg``; return each rule's validated options."""
    if cfg.file is None:
        return {rid: default_options(r.options) for rid, r in rules.items()}

    def fail(key: str, message: str, tables: tuple[str, ...] = ("",)) -> InputError:
        line, col = line_of(cfg.text, key, tables, cfg.prefix)
        return InputError(cfg.file or "", line, col, message)

    def known(rid: str, where: str, tables: tuple[str, ...] = ("",)) -> None:
        if rid != "all" and rid not in rules:
            import difflib
            close = difflib.get_close_matches(rid, list(rules), n=1)
            raise fail(rid, f"unknown rule '{rid}' in {where}" +
                       (f" (did you mean '{close[0]}'?)" if close else ""), tables)

    rules_table = "[" + ".".join(p for p in (cfg.prefix, "rules") if p) + "]"
    for rid in cfg.select or []:
        known(rid, "select")
    for rid in cfg.ignore:
        known(rid, "ignore")
    for rid in cfg.severity:
        known(rid, "severity", ("severity", ""))
    out: dict[str, RuleOptions] = {}
    for rid, r in rules.items():
        given = cfg.rule_options.get(rid)
        if not given:
            out[rid] = default_options(r.options)
            continue
        try:
            out[rid] = r.options.model_validate(given)
        except ValidationError as exc:
            err = exc.errors(include_url=False)[0]
            name = ".".join(str(p) for p in err["loc"])
            if err["type"] == "extra_forbidden":
                fields = list(r.options.model_fields)
                import difflib
                close = difflib.get_close_matches(name, fields, n=1)
                raise fail(name, f"unknown option '{name}' for rule '{rid}'" +
                           (f" (did you mean '{close[0]}'?)" if close else
                            f"; its options are: {', '.join(fields) or 'none'}"),
                           (f"rules.{rid}", "rules", "")) from None
            msg = err["msg"].removeprefix("Value error, ")
            raise fail(name, f"option '{name}' of rule '{rid}': {msg}",
                       (f"rules.{rid}", "rules", "")) from None
    for rid in cfg.rule_options:
        known(rid, rules_table, (f"rules.{rid}", "rules", ""))
    return out
