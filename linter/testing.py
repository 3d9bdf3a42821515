"""Rule test cases as data: the harness packwarden's own rules use, public for team rule packages.

A case file, ``tests/rules/cases/<rule-id>.yaml``, names one rule and lists designs with the findings
that rule must produce on each. A case's design is a file, or a base file with a few values changed
by YAML path (``set``, ``add``, ``delete``; see :mod:`packwarden.overrides`), so the case shows what
it tests::

    rule: unknown-part
    cases:
      - name: the clean example passes
        design: example_designs/orchard-probe.yaml     # relative to the repository root
        expect: []
      - name: misspelt part name
        design: example_designs/orchard-probe.yaml
        set: {components.Q1.part: OR-FET-D2O}
        expect:
          - {element: Q1, severity: error, message_contains: "OR-FET-D2O"}

The repository root is the nearest folder at or above the case file that holds ``pyproject.toml``.
A changed design is linted as if it were the base file, so findings point into the base file: at
the value a change replaced, or at the nearest key the base has above a value it lacks.
An expected finding may give ``element``, ``severity``, ``message_contains``, ``hint_contains``,
``assumption_contains`` (one of the finding's assumptions contains it) and ``path`` (the dotted YAML path, e.g. ``components.Q1.part``); only what it gives is compared. Line
numbers are deliberately not comparable: a case should survive an edit elsewhere in the design.
A case may give ``options`` for its rule, as they would be written in the project's config.

A case passes when every expected finding matches its own actual finding of the rule and the rule
produced nothing else. The project's config is not read: every rule runs at its default severity, so
a case means the same in every checkout. One parametrized test runs them all::

    from pathlib import Path
    import pytest
    from packwarden.testing import cases_in, check_case

    @pytest.mark.parametrize("case", cases_in(Path(__file__).parent / "cases"))
    def test_rule_case(case):
        check_case(case)
"""

from __future__ import annotations

import difflib
from dataclasses import field
from functools import lru_cache
from pathlib import Path
from typing import Any, Iterable

from pydantic import ValidationError

from .api import Finding, Severity
from .config import Config, check_against_rules
from .engine import Registry, RunResult, Session, lint, lint_file, load_registry
from .library import shown_path
from .loader import Document, InputError, load_file
from .overrides import Override, OverrideError, apply_overrides, parse_path
from .records import record

__all__ = ["Case", "Expected", "CaseError", "Override", "load_cases", "run_case", "check_case",
           "cases_in"]

_FILE_KEYS = ("rule", "cases")
_CASE_KEYS = ("name", "design", "set", "add", "delete", "expect", "options")
_EXPECT_KEYS = ("element", "severity", "message_contains", "hint_contains", "path",
                "assumption_contains")


class CaseError(Exception):
    """A case that cannot be run: the rule is not registered, or its design cannot be used.

    Distinct from a failing case (``AssertionError``): a design that does not load yields no
    findings, and ``expect: []`` must not pass because of it.
    """


@record(frozen=True)
class Expected:
    """One finding a case expects; a field left as ``None`` is not compared."""

    element: str | None = None
    severity: Severity | None = None
    message_contains: str | None = None
    hint_contains: str | None = None
    path: str | None = None
    #: Text one of the finding's assumptions contains (an assumption is not repeated in the
    #: message).
    assumption_contains: str | None = None

    def matches(self, f: Finding) -> bool:
        return ((self.element is None or f.element == self.element)
                and (self.severity is None or f.severity == self.severity)
                and (self.message_contains is None or self.message_contains in f.message)
                and (self.hint_contains is None or self.hint_contains in (f.hint or ""))
                and (self.path is None or f.location.dotted == self.path)
                and (self.assumption_contains is None
                     or any(self.assumption_contains in a for a in f.assumptions)))

    def describe(self) -> str:
        parts = []
        if self.element is not None:
            parts.append(f"element {self.element}")
        if self.severity is not None:
            parts.append(f"severity {self.severity.value}")
        if self.message_contains is not None:
            parts.append(f"message containing {self.message_contains!r}")
        if self.hint_contains is not None:
            parts.append(f"hint containing {self.hint_contains!r}")
        if self.path is not None:
            parts.append(f"at {self.path}")
        if self.assumption_contains is not None:
            parts.append(f"an assumption containing {self.assumption_contains!r}")
        return ", ".join(parts) or "any finding"


@record(frozen=True)
class Case:
    rule: str
    name: str
    design: Path  # absolute; the base file when there are overrides
    expect: tuple[Expected, ...]
    source: str  # "case-file:line", where the case is written
    options: dict[str, Any] = field(default_factory=dict)
    overrides: tuple[Override, ...] = ()  # changes to the design file (set, add, delete)

    @property
    def id(self) -> str:
        """``rule-id::case name``: the test id pytest shows."""
        return f"{self.rule}::{self.name}"


# --- reading case files -------------------------------------------------------------------------

def repo_root_of(path: Path) -> Path:
    """The nearest folder at or above ``path`` that holds ``pyproject.toml``."""
    start = path.resolve().parent
    for folder in (start, *start.parents):
        if (folder / "pyproject.toml").is_file():
            return folder
    raise InputError(shown_path(path), 1, 1,
                     "no pyproject.toml at or above this case file; case designs are named "
                     "relative to the folder that holds it")


def load_cases(path: str | Path) -> list[Case]:
    """Read one case file; raise :class:`InputError` (``file:line:column: message``) on a mistake."""
    path = Path(path)
    doc = load_file(path, shown_path(path))
    data = doc.data
    if not isinstance(data, dict):
        raise doc.error((), "a case file is a mapping with 'rule' and 'cases'")
    _only(doc, (), data, _FILE_KEYS)
    rule = _text(doc, ("rule",), data.get("rule"), "rule")
    if path.stem != rule:
        raise doc.error(("rule",), f"case file {path.name} tests rule '{rule}'; name it "
                                   f"{rule}{path.suffix} so each rule's cases are found in one place")
    cases = data.get("cases")
    if not isinstance(cases, list) or not cases:
        raise doc.error(("cases",), "'cases' must be a non-empty list")
    root = repo_root_of(path)
    out: list[Case] = []
    seen: dict[str, int] = {}
    for i, raw in enumerate(cases):
        where = ("cases", i)
        if not isinstance(raw, dict):
            raise doc.error(where, "a case is a mapping with 'name', 'design' and 'expect'")
        _only(doc, where, raw, _CASE_KEYS)
        name = _text(doc, where + ("name",), raw.get("name"), "name")
        line = doc.where(where).line
        if name in seen:
            raise doc.error(where + ("name",), f"case name '{name}' is also used on line {seen[name]}")
        seen[name] = line
        design = _text(doc, where + ("design",), raw.get("design"), "design")
        if "expect" not in raw or not isinstance(raw["expect"], list):
            raise doc.error(where + ("expect",) if "expect" in raw else where,
                            "'expect' must be a list of findings ([] for a design that passes)")
        expect = tuple(_expected(doc, where + ("expect", j), e) for j, e in enumerate(raw["expect"]))
        options = raw.get("options", {})
        if not isinstance(options, dict):
            raise doc.error(where + ("options",), "'options' must be a mapping of the rule's options")
        out.append(Case(rule=rule, name=name, design=root / design, expect=expect,
                        source=f"{doc.file}:{line}", options=options,
                        overrides=_overrides(doc, where, raw)))
    return out


def _overrides(doc: Document, where: tuple, raw: dict) -> tuple[Override, ...]:
    """The case's ``set``/``add`` (path: value) and ``delete`` (list of paths), as written."""
    out: list[Override] = []
    for action in ("set", "add", "delete"):
        if action not in raw:
            continue
        given = raw[action]
        at = where + (action,)
        if action == "delete":
            if not isinstance(given, list) or not given:
                raise doc.error(at, "'delete' is a list of YAML paths, e.g. "
                                    "[charger.temperature_window]")
            entries = [(at + (i,), path, None) for i, path in enumerate(given)]
        else:
            if not isinstance(given, dict) or not given:
                raise doc.error(at, f"'{action}' is a mapping of YAML path to value, e.g. "
                                    f"{{components.Q1.part: OR-FET-D2O}}")
            entries = [(at + (path,), path, value) for path, value in given.items()]
        for spot, path, value in entries:
            if not isinstance(path, str):
                raise doc.error(spot, f"a path in '{action}' is text, e.g. components.Q1.part")
            try:
                parse_path(path)
            except ValueError as exc:
                raise doc.error(spot, str(exc), key=action != "delete") from None
            if value is None and action != "delete":
                raise doc.error(spot, f"'{path}' has no value; to remove it from the design, "
                                      f"list it under 'delete'")
            out.append(Override(action, path, value, f"{doc.file}:{doc.where(spot).line}"))
    return tuple(out)


def _expected(doc: Document, where: tuple, raw: Any) -> Expected:
    if not isinstance(raw, dict):
        raise doc.error(where, "an expected finding is a mapping, e.g. "
                               "{element: Q1, message_contains: '...'}")
    _only(doc, where, raw, _EXPECT_KEYS)
    for key, value in raw.items():
        if value is None:  # "element: null" could mean "no element" or "any": say which is meant
            raise doc.error(where + (key,), f"'{key}' has no value; leave the key out to match "
                                            f"any {key}")
    values = {k: str(v) for k, v in raw.items()}
    sev = values.pop("severity", None)
    if sev is not None:
        try:
            values["severity"] = Severity(sev)
        except ValueError:
            raise doc.error(where + ("severity",),
                            f"unknown severity '{sev}'; use error, warning or info") from None
    return Expected(**values)


def _only(doc: Document, where: tuple, raw: dict, allowed: tuple[str, ...]) -> None:
    for key in raw:
        if key not in allowed:
            close = difflib.get_close_matches(str(key), allowed, n=1)
            raise doc.error(where + (key,), f"unknown key '{key}'" +
                            (f" (did you mean '{close[0]}'?)" if close else
                             f"; expected one of: {', '.join(allowed)}"), key=True)


def _text(doc: Document, where: tuple, value: Any, what: str) -> str:
    if not isinstance(value, str) or not value.strip():
        raise doc.error(where if value is not None else where[:-1], f"'{what}' must be given as text")
    return value


def cases_in(folder: str | Path) -> list:
    """Every case of every ``*.yaml`` file in ``folder``, as ``pytest.param`` with id ``rule::name``.

    An empty folder is an error, not an empty parametrization that pytest would quietly skip.
    """
    import pytest  # only needed by the test run, not by packwarden itself

    folder = Path(folder)
    files = sorted(list(folder.glob("*.yaml")) + list(folder.glob("*.yml")))
    if not files:
        raise InputError(shown_path(folder), 1, 1, "no case files (*.yaml) in this folder")
    return [pytest.param(case, id=case.id) for f in files for case in load_cases(f)]


# --- running ------------------------------------------------------------------------------------

@lru_cache(maxsize=1)
def _installed_registry() -> Registry:
    return load_registry()


class _CaseSession(Session):
    """A session whose every design uses one fixed config, instead of the project's."""

    def __init__(self, registry: Registry, config: tuple[Config, dict, None]):
        super().__init__(registry=registry, grouping=False)
        self._fixed = config

    def config_for(self, design: Path):
        return self._fixed


def run_case(case: Case, registry: Registry | None = None) -> list[Finding]:
    """Lint the case's design with every rule of ``registry``; return the case rule's findings.

    ``registry`` defaults to the installed rules (entry points). A team testing rules from a folder
    passes ``load_registry([folder])``. Raises :class:`CaseError` when the case cannot be run.
    """
    reg = registry if registry is not None else _installed_registry()
    rule = reg.rules.get(case.rule)
    if rule is None:
        close = difflib.get_close_matches(case.rule, list(reg.rules), n=1)
        broken = "".join(f"\n  {msg}" for _, msg in reg.broken)
        raise CaseError(f"{case.source}: rule '{case.rule}' is not registered" +
                        (f" (did you mean '{close[0]}'?)" if close else "") +
                        (f"; plugins that failed to load:{broken}" if broken else ""))
    try:
        own_options = rule.options.model_validate(case.options)
    except ValidationError as exc:
        raise CaseError(f"{case.source}: options of rule '{case.rule}': "
                        f"{exc.errors(include_url=False)[0]['msg']}") from None
    options = check_against_rules(Config(), reg.rules)  # the defaults, as a check makes them
    options[case.rule] = own_options
    if not case.design.is_file():
        raise CaseError(f"{case.source}: design file {shown_path(case.design)} does not exist")
    session = _CaseSession(reg, (Config(), options, None))
    shown = shown_path(case.design)
    document = None
    if case.overrides:
        try:
            document = apply_overrides(load_file(case.design, shown), case.overrides)
        except InputError as exc:
            raise CaseError(f"{case.source}: the base design of case '{case.name}' cannot be "
                            f"read:\n  {exc}") from None
        except OverrideError as exc:
            raise CaseError(f"{exc} (base design {shown})") from None
    result = lint_file(session, case.design, shown, document=document)
    if result.errors:
        raise CaseError(f"{case.source}: the design of case '{case.name}' cannot be used, so it "
                        f"proves nothing:\n" + "\n".join(f"  {e}" for e in result.errors))
    crashed = [i for i in result.internal if i.rule in (case.rule, "model", "engine")]
    if crashed:
        raise CaseError(f"{case.source}: " + "; ".join(
            f"internal error in '{i.rule}': {i.message}" for i in crashed))
    return [f for f in result.findings if f.rule == case.rule]


def check_case(case: Case, registry: Registry | None = None) -> list[Finding]:
    """Run the case; raise ``AssertionError`` showing expected and actual findings unless they match.

    Every expected finding must match a distinct actual finding of the rule, and every actual
    finding of the rule must be expected. Returns the findings, for further checks.
    """
    actual = run_case(case, registry)
    pairs = _match(case.expect, actual)
    missing = [e for i, e in enumerate(case.expect) if i not in pairs]
    used = set(pairs.values())
    extra = [f for j, f in enumerate(actual) if j not in used]
    if missing or extra:
        raise AssertionError(_diff(case, missing, extra, actual))
    return actual


def _match(expect: Iterable[Expected], actual: list[Finding]) -> dict[int, int]:
    """Pair expectations with findings one to one, as many as possible (augmenting paths).

    Greedy pairing would fail a case whose loose expectation grabbed the finding a stricter one
    needed; cases are small, so the simple bipartite matching costs nothing.
    """
    options = [[j for j, f in enumerate(actual) if e.matches(f)] for e in expect]
    owner: dict[int, int] = {}  # finding index -> expectation index

    def place(i: int, seen: set[int]) -> bool:
        for j in options[i]:
            if j in seen:
                continue
            seen.add(j)
            if j not in owner or place(owner[j], seen):
                owner[j] = i
                return True
        return False

    for i in range(len(options)):
        place(i, set())
    return {i: j for j, i in owner.items()}


def _show(f: Finding) -> str:
    loc = f.location
    text = (f"{loc.file}:{loc.line}:{loc.column}: {f.severity.value} {f.rule}: {f.message}"
            f"  [element {f.element or '-'}, at {loc.dotted or '-'}]")
    if f.hint:
        text += f"\n      hint: {f.hint}"
    return text


def _diff(case: Case, missing: list[Expected], extra: list[Finding], actual: list[Finding]) -> str:
    lines = [f"rule case {case.id} ({case.source}) failed", f"design: {shown_path(case.design)}"]
    lines += [f"  {ov.describe()}" for ov in case.overrides]
    if missing:
        lines.append(f"expected, not found ({len(missing)}):")
        lines += [f"  - {e.describe()}" for e in missing]
    if extra:
        lines.append(f"found, not expected ({len(extra)}):")
        lines += [f"  + {_show(f)}" for f in extra]
    lines.append(f"all findings of {case.rule} ({len(actual)}):")
    lines += [f"    {_show(f)}" for f in actual] or ["    (none)"]
    return "\n".join(lines)


def lint_variant(folder: str | Path, design: str | Path, library: str | Path, *,
                 replace: Iterable[tuple[str, str]] = (), lib_replace: Iterable[tuple[str, str]] = (),
                 extra: str = "", prefix: str = "") -> RunResult:
    """Lint a variant of ``design`` (a design that names ``parts/<library file>``) in ``folder``.

    The design and its library are copied into ``folder`` (which becomes a repository root), each
    ``(old, new)`` in ``replace``/``lib_replace`` is applied — every ``old`` must occur, so a test
    cannot silently stop testing what it meant to — and ``prefix``/``extra`` text is put before and
    after the design. Useful for "the example, with one thing changed" tests of a rule.
    """
    folder, design, library = Path(folder), Path(design), Path(library)
    (folder / "packwarden.toml").write_text("", encoding="utf-8")
    (folder / "parts").mkdir(exist_ok=True)
    (folder / "parts" / library.name).write_text(
        _replaced(library.read_text(encoding="utf-8"), lib_replace), encoding="utf-8")
    path = folder / design.name
    path.write_text(prefix + _replaced(design.read_text(encoding="utf-8"), replace) + extra,
                    encoding="utf-8")
    return lint([str(path)])


def _replaced(text: str, subs: Iterable[tuple[str, str]]) -> str:
    for old, new in subs:
        if old not in text:
            raise CaseError(f"text to replace not found: {old!r}")
        text = text.replace(old, new)
    return text
