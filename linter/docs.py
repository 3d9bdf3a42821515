"""The rule reference, ``docs/rules.md``, generated from the rule registry's metadata.

Run ``packwarden docs rules`` (or ``python -m packwarden.docs``) to print it, ``--output FILE`` to
write it. Only packwarden's own rules are documented, so the file does not depend on which team
plugins happen to be installed where it is generated; ``tests/test_docs.py`` fails when the
checked-in file differs from what this module renders, or when a built-in rule lacks an example.
"""

from __future__ import annotations

import json
import sys
from typing import Any, Iterable

from .api import Rule

HEADER = ("<!-- Generated from the rule registry by `packwarden docs rules > docs/rules.md`; "
          "do not edit by hand. -->")

PSEUDO_RULES = [
    ("input-error", "error",
     "a design, part library or configuration file cannot be used",
     "Not a rule of the registry: SARIF and JUnit reports file every input error (YAML syntax, "
     "unknown or missing fields, values without units, a library outside the repository, a bad "
     "configuration) under this id, at the file, line and column to fix. A design with input "
     "errors is not reviewed, and the command exits with code 2."),
]


def builtin_rules(rules: dict[str, Rule]) -> list[Rule]:
    """packwarden's own rules: those registered by the packwarden distribution's entry points."""
    return [rules[rid] for rid in sorted(rules) if rules[rid].origin.startswith("packwarden:")]


def missing_examples(rules: Iterable[Rule]) -> list[str]:
    """Why each rule lacking a failing or a passing example fails the docs check (empty: none)."""
    out = []
    for r in rules:
        if r.example is None:
            out.append(f"{r.id}: no example (give @rule(..., example=Example(bad=..., good=...)))")
        else:
            for which in ("bad", "good"):
                if not getattr(r.example, which).strip():
                    out.append(f"{r.id}: the example's '{which}' fragment is empty")
    return out


def render_rules(rules: Iterable[Rule]) -> str:
    rules = list(rules)
    out = [HEADER, "", "# Rule reference", "",
           "Every built-in rule: its id, default severity, what it checks and why, its options and "
           "a failing and a passing example. Change a rule's severity per project under "
           "`[tool.packwarden.severity]`, its options under `[tool.packwarden.rules.<id>]`; turn "
           "rules off with `ignore = [...]`. `packwarden explain <id>` prints the same text.", "",
           "A rule whose scope is *netlist* checks the netlist itself and always runs; the other "
           "(*electrical*) rules are held back while a design's netlist has integrity errors.", "",
           "| rule | default severity | checks that |", "|---|---|---|"]
    for r in rules:
        out.append(f"| [`{r.id}`](#{r.id}) | {r.severity.value} | {_cell(r.summary)} |")
    for rid, sev, summary, _ in PSEUDO_RULES:
        out.append(f"| [`{rid}`](#{rid}) | {sev} | {_cell(summary)} (reports only) |")
    out.append("")
    for r in rules:
        out += _rule_section(r)
    for rid, sev, summary, text in PSEUDO_RULES:
        out += [f"## {rid}", "", f"**Default severity:** {sev} · **Reports only**", "",
                f"*{_sentence(summary)}*", "", text, ""]
    return "\n".join(out).rstrip("\n") + "\n"


def _rule_section(r: Rule) -> list[str]:
    out = [f"## {r.id}", "",
           f"**Default severity:** {r.severity.value} · **Scope:** {r.scope}", "",
           f"*{_sentence(r.summary)}*", "", r.rationale.strip(), ""]
    fields = r.options.model_fields
    if fields:
        out += [f"**Options** (`[tool.packwarden.rules.{r.id}]`):", "",
                "| option | default | description |", "|---|---|---|"]
        for name, f in fields.items():
            out.append(f"| `{name}` | `{option_default(f)}` | {_cell(f.description or '')} |")
        out.append("")
    else:
        out += ["No options.", ""]
    if r.example is not None:
        out += ["**Fails:**", "", "```yaml", r.example.bad.strip("\n"), "```", "",
                "**Passes:**", "", "```yaml", r.example.good.strip("\n"), "```", ""]
    return out


def option_default(field: Any) -> str:
    """The default as it is written in the project's TOML: quantities with their unit."""
    value = field.default
    unit = quantity_unit(field)
    if unit is not None and isinstance(value, (int, float)) and not isinstance(value, bool):
        from .quantities import format_quantity
        return f'"{format_quantity(value, unit)}"'
    if isinstance(value, bool):
        return "true" if value else "false"
    if hasattr(value, "value") and isinstance(getattr(value, "value"), str):  # an Enum
        value = value.value
    return json.dumps(value, ensure_ascii=False) if isinstance(value, (str, list, dict)) else str(value)


def quantity_unit(field: Any) -> str | None:
    """The unit of a field declared as ``Q(unit)`` (schema.Q is cached: same parser, same unit)."""
    from .schema import Q
    from .quantities import UNITS
    parsers = {}
    for unit in UNITS:
        try:
            annotated = Q(unit)
        except Exception:  # pragma: no cover - a unit Q cannot express
            continue
        for meta in getattr(annotated, "__metadata__", ()):
            func = getattr(meta, "func", None)
            if func is not None:
                parsers[id(func)] = unit
    for meta in field.metadata:
        func = getattr(meta, "func", None)
        if func is not None and id(func) in parsers:
            return parsers[id(func)]
    return None


def _sentence(text: str) -> str:
    text = text.strip()
    return (text[:1].upper() + text[1:]).rstrip(".") + "."


def _cell(text: str) -> str:
    return " ".join(text.replace("|", "\\|").split())


def main(argv: list[str] | None = None) -> int:
    from .engine import load_registry
    args = list(sys.argv[1:] if argv is None else argv)
    if args[:1] not in ([], ["rules"]):
        sys.stderr.write("usage: python -m packwarden.docs [rules]\n")
        return 2
    reg = load_registry()
    sys.stdout.write(render_rules(builtin_rules(reg.rules)))
    return 0


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
