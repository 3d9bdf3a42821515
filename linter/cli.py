"""The ``packwarden`` command. Thin: parse options, call the engine, pick a formatter."""

from __future__ import annotations

import sys
from enum import Enum
from pathlib import Path
from typing import List, Optional

import typer

# Plain help, not typer's boxed one, which prints "<bool>" after every flag as if it took a value.
app = typer.Typer(add_completion=False, no_args_is_help=True, pretty_exceptions_enable=False,
                  rich_markup_mode=None,
                  help="Design-review linter for lithium-ion battery protection circuits.")


class Level(str, Enum):
    error = "error"
    warning = "warning"
    info = "info"


class Distribution(str, Enum):
    uniform = "uniform"
    normal = "normal"


class SchemaKind(str, Enum):
    design = "design"
    parts = "parts"
    policy = "policy"
    report = "report"


@app.command()
def check(
    paths: List[str] = typer.Argument(..., metavar="PATH",
                                      help="design files, or folders to search for designs"),
    format: str = typer.Option(
        "text", "--format", "-f", metavar="FORMAT",  # packwarden.report.DEFAULT_FORMAT
        help="output format: text, or any registered one (`packwarden formats` lists them)"),
    output: Optional[Path] = typer.Option(None, "--output", "-o", help="write the report here"),
    fail_on: Optional[Level] = typer.Option(
        None, "--fail-on", help="lowest severity that fails the run (default: config, else error)"),
    config: Optional[Path] = typer.Option(None, "--config", help="use this config file"),
    quiet: bool = typer.Option(False, "--quiet", "-q", help="only findings that fail the run"),
    baseline: Optional[Path] = typer.Option(
        None, "--baseline", metavar="FILE",
        help="report only findings not recorded in FILE; only they count for the exit code"),
    write_baseline: Optional[Path] = typer.Option(
        None, "--write-baseline", metavar="FILE",
        help="record the current findings in FILE (exit 0 unless an input could not be used)"),
    since: Optional[str] = typer.Option(
        None, "--since", metavar="REV",
        help="compare with the designs and libraries at git revision REV; report new findings"),
    designs_only: bool = typer.Option(
        False, "--designs-only",
        help="skip named files that are not designs (e.g. part libraries passed by pre-commit)"),
    require_plugins: Optional[str] = typer.Option(
        None, "--require-plugins", metavar="NAME[,NAME]",
        help="fail at once (exit 2) unless these rule distributions are installed"),
    yield_samples: Optional[int] = typer.Option(
        None, "--yield", metavar="N", min=1, max=10_000_000,
        help="also run N Monte Carlo builds over the declared tolerances: share failing, in ppm"),
    seed: int = typer.Option(20240601, "--seed",  # packwarden.montecarlo.DEFAULT_SEED
                             help="seed of the --yield run (fixed by default)"),
    distribution: Distribution = typer.Option(
        Distribution.uniform, "--distribution",
        help="--yield draws: uniform within the limits, or normal with the tolerance as 3σ"),
    jobs: Optional[int] = typer.Option(
        None, "--jobs", "-j", metavar="N", min=1,
        help="worker processes (default: one per processor for a batch of 48 designs or more, "
             "else 1; formats that draw on the models, such as html, and --yield lint in one "
             "process)"),
) -> None:
    """Lint designs; exit 0 clean, 1 findings at or above --fail-on, 2 input could not be used."""
    from .checking import run_check
    raise typer.Exit(run_check(
        paths, format=format, output=output, fail_on=fail_on.value if fail_on else None,
        config=config, quiet=quiet, baseline=baseline, write_baseline=write_baseline,
        since=since, designs_only=designs_only, require_plugins=require_plugins,
        yield_samples=yield_samples, seed=seed, distribution=distribution.value, jobs=jobs))


def _emit(text: str, output: Optional[Path]) -> None:
    """Write a command's report to ``output``, else to stdout; a file that cannot be written is
    one located line and exit code 2."""
    from .checking import emit
    if emit(text, output):
        raise typer.Exit(2)


class DocsKind(str, Enum):
    rules = "rules"
    format_ = "format"  # named so as not to shadow str.format


@app.command()
def docs(
    kind: DocsKind = typer.Argument(DocsKind.rules, help="which reference: rules or format"),
    output: Optional[Path] = typer.Option(None, "--output", "-o", help="write it here"),
) -> None:
    """Print the reference generated from metadata: `docs rules` is docs/rules.md, `docs format`
    docs/format.md."""
    from .docs import DocsError, builtin_rules, render_format, render_rules
    if kind is DocsKind.format_:
        try:
            text = render_format()
        except DocsError as exc:
            sys.stderr.write(f"{exc}\n")
            raise typer.Exit(2)
    else:
        from .engine import load_registry
        text = render_rules(builtin_rules(load_registry().rules))
    if output is not None:
        output.write_text(text, encoding="utf-8")
    else:
        sys.stdout.write(text)


@app.command()
def schema(kind: Optional[SchemaKind] = typer.Argument(None, help="design (the default), parts, policy or report (the JSON report)"),
           write: Optional[Path] = typer.Option(
               None, "--write", metavar="DIR",
               help="write the schema (without a kind: every schema) into DIR as KIND.schema.json, "
                    "for your repository's $schema lines")) -> None:
    """Print the JSON Schema of design files, part libraries, team policy files or the JSON report."""
    import json

    from .docs import shipped_schema

    def text(which: SchemaKind) -> str:
        return json.dumps(shipped_schema(which.value), indent=2, ensure_ascii=False) + "\n"

    if write is None:
        sys.stdout.write(text(kind or SchemaKind.design))
        return
    try:
        write.mkdir(parents=True, exist_ok=True)
        for which in [kind] if kind else list(SchemaKind):
            target = write / f"{which.value}.schema.json"
            target.write_text(text(which), encoding="utf-8")
            sys.stdout.write(f"wrote {target}\n")
    except OSError as exc:
        sys.stderr.write(f"{write}:1:1: cannot write the schemas: {exc.strerror or exc}\n")
        raise typer.Exit(2)
    first = (kind or SchemaKind.design).value
    sys.stdout.write(f"point a file at it with its first line: # yaml-language-server: "
                     f"$schema=<path from the file to {write}>/{first}.schema.json\n")


@app.command("new-rule")
def new_rule(
    name: str = typer.Argument(..., help="the rule id, e.g. fuse-derating"),
    directory: Path = typer.Option(Path("."), "--dir", help="make the package folder in here"),
) -> None:
    """Make a rule package: entry point, rule module with an option and example, and tests."""
    from .scaffold import ScaffoldError
    from .scaffold import new_rule as make
    try:
        files = make(name, directory)
    except (ScaffoldError, OSError) as exc:
        sys.stderr.write(f"packwarden new-rule: {exc}\n")
        raise typer.Exit(2)
    sys.stdout.write(f"made {files[0].parent}/ ({len(files)} files); next: "
                     f"pip install -e '{files[0].parent}[test]' && "
                     f"python -m pytest -q {files[0].parent}\n")


@app.command("rules")
def list_rules(
    config: Optional[Path] = typer.Option(
        None, "--config", help="take rule folders from this config (default: the one found here)"),
) -> None:
    """List the rules from the registry: id, default severity, summary.

    Installed rules, and the rules of the folders the config names (``rule_paths``), as
    ``packwarden check`` run from here would load them.
    """
    from .config import find_config, load_config
    from .engine import load_registry
    from .library import shown_path
    from .loader import InputError
    path = config or find_config(Path.cwd())
    try:
        folders = load_config(path, shown_path(path) if path else None).rule_paths
    except InputError as exc:
        sys.stdout.write(f"{exc}\n")
        raise typer.Exit(2)
    reg = load_registry(folders)
    width = max((len(r) for r in reg.rules), default=10)
    for rid in sorted(reg.rules):
        r = reg.rules[rid]
        sys.stdout.write(f"{rid:<{width}}  {r.severity.value:<7}  {r.summary}\n")
    for origin, message in reg.broken:
        sys.stdout.write(f"{origin}:1:1: {message}\n")
    raise typer.Exit(2 if reg.broken else 0)


@app.command("formats")
def list_formats() -> None:
    """List the output formats from the registry (the packwarden.formats entry points): name and
    the distribution that registers it. Each is loaded, so a broken one is reported here."""
    from .report import FormatUnavailable, load_formats
    reg = load_formats()
    problems = list(reg.broken)
    width = max((len(n) for n in reg.names()), default=10)
    for name in reg.names():
        origin = reg.entries[name][0]
        try:
            reg.load(name)
        except FormatUnavailable as exc:
            problems.append((origin, str(exc)))
            continue
        sys.stdout.write(f"{name:<{width}}  {origin}\n")
    for origin, message in problems:
        sys.stdout.write(f"{origin}:1:1: {message}\n")
    raise typer.Exit(2 if problems else 0)


@app.command()
def lsp() -> None:
    """Run the language server on stdin/stdout, for editors: findings as you type, hover figures."""
    try:
        from .lsp.server import serve  # pygls: a third of a second to import, so only here
    except ModuleNotFoundError as exc:
        if (exc.name or "").split(".")[0] not in ("pygls", "lsprotocol"):
            raise
        sys.stderr.write(f"packwarden lsp: the language server needs {exc.name.split('.')[0]}, "
                         f"which is not installed: pip install 'packwarden[lsp]'\n")
        raise typer.Exit(2)
    import gc
    gc.enable()  # main turned it off for start-up; a server runs for hours
    serve()


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
        from .docs import option_default  # as the project's TOML takes it: "10 K", not 10.0
        for name, f in fields.items():
            lines.append(f"  {name} = {option_default(f)}  {f.description or ''}".rstrip())
        lines.append("")
    if r.example:
        lines += ["Fails:", _indent(r.example.bad), "Passes:", _indent(r.example.good)]
    return "\n".join(lines) + "\n"


def _indent(text: str) -> str:
    return "\n".join("    " + ln for ln in text.strip("\n").splitlines()) + "\n"


class AssistFormat(str, Enum):
    text = "text"
    json = "json"
    html = "html"


@app.command("assist")
def assist_command(
    paths: List[str] = typer.Argument(..., metavar="PATH",
                                      help="design files, or folders to search for designs"),
    format: AssistFormat = typer.Option(
        AssistFormat.text, "--format", "-f",
        help="text, json, or html (the review report with an assistant section per design)"),
    output: Optional[Path] = typer.Option(None, "--output", "-o", help="write the answer here"),
    config: Optional[Path] = typer.Option(None, "--config", help="use this config file"),
    peak_duration: Optional[str] = typer.Option(
        None, "--peak-duration", metavar="TIME",
        help="duration of the peak whose highest current is sought, e.g. '100 ms' "
             "(default: the design's own peak duration)"),
) -> None:
    """The design assistant: the loads and ambient range each design passes at (its capability
    envelope, each limit with the finding that sets it), and the library parts that would fix
    its findings, each re-linted in place. Exit codes as for `check`."""
    from .assist import assist_run, render_json, render_text
    seconds = None
    if peak_duration is not None:
        from .quantities import QuantityError, parse_quantity
        try:
            seconds = parse_quantity(peak_duration, "s")
        except QuantityError as exc:
            sys.stderr.write(f"packwarden assist: --peak-duration: {exc}\n")
            raise typer.Exit(2)
        if seconds <= 0:
            sys.stderr.write("packwarden assist: --peak-duration: a peak lasts longer than 0 s\n")
            raise typer.Exit(2)
    import gc
    gc.enable()  # main turned it off for start-up; the searches lint the design many times
    run, helped = assist_run(paths, config=config, peak_duration=seconds)
    if format is AssistFormat.json:
        text = render_json(run, helped)
    elif format is AssistFormat.html:
        from .report import RenderOptions, formatter
        text = formatter("html")(run, RenderOptions())
    else:
        text = render_text(run, helped)
    _emit(text, output)
    raise typer.Exit(run.exit_code())


def main() -> None:
    """The command with every subcommand, its help and its option errors (typer)."""
    from .checking import finish, start
    start()
    try:
        app()
    except KeyboardInterrupt:  # pragma: no cover
        sys.exit(130)
    except SystemExit as exc:
        finish(exc)


if __name__ == "__main__":  # pragma: no cover
    main()
