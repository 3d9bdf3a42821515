"""The ``packwarden`` command. Thin: parse options, call the engine, pick a formatter."""

from __future__ import annotations

import json
import os
import sys
from enum import Enum
from pathlib import Path
from typing import List, Optional

import typer

app = typer.Typer(add_completion=False, no_args_is_help=True, pretty_exceptions_enable=False,
                  help="Design-review linter for lithium-ion battery protection circuits.")


class Format(str, Enum):
    text = "text"
    json = "json"


class Level(str, Enum):
    error = "error"
    warning = "warning"
    info = "info"


class SchemaKind(str, Enum):
    design = "design"
    parts = "parts"


def _use_color(output: Optional[Path], fmt: str) -> bool:
    if fmt != "text" or output is not None or os.environ.get("NO_COLOR"):
        return False
    return sys.stdout.isatty()


@app.command()
def check(
    paths: List[str] = typer.Argument(..., help="design files, or folders to search for designs"),
    format: Format = typer.Option(Format.text, "--format", "-f", help="output format"),
    output: Optional[Path] = typer.Option(None, "--output", "-o", help="write the report here"),
    fail_on: Optional[Level] = typer.Option(
        None, "--fail-on", help="lowest severity that fails the run (default: config, else error)"),
    config: Optional[Path] = typer.Option(None, "--config", help="use this config file"),
    quiet: bool = typer.Option(False, "--quiet", "-q", help="only findings that fail the run"),
) -> None:
    """Lint designs; exit 0 clean, 1 findings at or above --fail-on, 2 input could not be used."""
    from .api import Severity
    from .engine import lint
    from .report import RenderOptions, formatter

    run = lint(paths, config=config, fail_on=Severity(fail_on.value) if fail_on else None)
    text = formatter(format.value)(run, RenderOptions(color=_use_color(output, format.value),
                                                      quiet=quiet))
    if output is not None:
        output.write_text(text, encoding="utf-8")
    else:
        sys.stdout.write(text)
    raise typer.Exit(run.exit_code())


@app.command()
def schema(kind: SchemaKind = typer.Argument(SchemaKind.design, help="design or parts")) -> None:
    """Print the JSON Schema of design files or part libraries."""
    from .schema import json_schema
    sys.stdout.write(json.dumps(json_schema(kind.value), indent=2, ensure_ascii=False) + "\n")


@app.command("rules")
def list_rules() -> None:
    """List the rules from the registry: id, default severity, summary."""
    from .engine import load_registry
    reg = load_registry()
    width = max((len(r) for r in reg.rules), default=10)
    for rid in sorted(reg.rules):
        r = reg.rules[rid]
        sys.stdout.write(f"{rid:<{width}}  {r.severity.value:<7}  {r.summary}\n")
    for origin, message in reg.broken:
        sys.stdout.write(f"{origin}:1:1: {message}\n")
    raise typer.Exit(2 if reg.broken else 0)


@app.command()
def explain(rule_id: str = typer.Argument(..., help="a rule id, e.g. threshold-ladder")) -> None:
    """Print a rule's rationale, options and example."""
    import difflib

    from .engine import load_registry
    reg = load_registry()
    r = reg.rules.get(rule_id)
    if r is None:
        close = difflib.get_close_matches(rule_id, list(reg.rules), n=1)
        sys.stderr.write(f"unknown rule '{rule_id}'" +
                         (f" (did you mean '{close[0]}'?)" if close else "") + "\n")
        raise typer.Exit(2)
    sys.stdout.write(explain_text(r))


def explain_text(r) -> str:
    lines = [f"{r.id} ({r.severity.value}): {r.summary}", "", r.rationale, ""]
    fields = r.options.model_fields
    if fields:
        lines.append("Options ([tool.packwarden.rules." + r.id + "]):")
        for name, f in fields.items():
            lines.append(f"  {name} = {f.default!r}  {f.description or ''}".rstrip())
        lines.append("")
    if r.example:
        lines += ["Fails:", _indent(r.example.bad), "Passes:", _indent(r.example.good)]
    return "\n".join(lines) + "\n"


def _indent(text: str) -> str:
    return "\n".join("    " + ln for ln in text.strip("\n").splitlines()) + "\n"


def main() -> None:
    try:
        app()
    except KeyboardInterrupt:  # pragma: no cover
        sys.exit(130)


if __name__ == "__main__":  # pragma: no cover
    main()
