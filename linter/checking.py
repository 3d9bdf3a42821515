"""The body of ``packwarden check``, without the command-line library.

``cli.check`` (the typer command, with its help and its option errors) and ``launch.main`` (the
installed command's quick way in for a plain check, which never imports typer) both call
:func:`run_check` with the options already parsed, and exit with the code it returns; both
begin with :func:`start` and end with :func:`finish`.
"""

from __future__ import annotations

import os
import sys
from pathlib import Path
from typing import List, Optional

#: True when the command runs as its own process (``cli.main``, ``launch.main``), not called
#: from other code.
OWN_PROCESS = False


def start() -> None:
    """What both ways in do before anything else is imported."""
    global OWN_PROCESS
    OWN_PROCESS = True
    # Start-up imports pydantic and the rules, and builds the schema's models: many objects
    # made, next to none freed, so the cycle collector's passes over them are wasted (about
    # 15 ms of a single-file check). ``check`` turns it back on before linting; the other
    # commands are short and end the process.
    import gc
    gc.disable()
    # pydantic's own plugins (a package registering the 'pydantic' entry-point group, e.g. to
    # observe every validation) have no part in a review: the findings must not depend on them,
    # and looking for them scans every installed package when the first schema is built (about
    # 8 ms). A value the user set, even an empty one, is kept.
    os.environ.setdefault("PYDANTIC_DISABLE_PLUGINS", "__all__")
    # ... and then pydantic's plugin loader need not import importlib.metadata (plugins_off.py)
    from .plugins_off import install
    install()


def finish(exc: SystemExit) -> None:
    """Leave with the command's exit code, without the interpreter's teardown, which frees every
    module and object one by one and is a twentieth of a short run."""
    code = 0 if exc.code is None else exc.code
    if not isinstance(code, int):
        raise exc
    try:
        sys.stdout.flush()
        sys.stderr.flush()
    except (OSError, ValueError):
        raise exc from None  # a closed pipe: let Python report it as it always does
    os._exit(code)


def run_check(paths: List[str], format: str = "text", output: Optional[Path] = None,
              fail_on: Optional[str] = None, config: Optional[Path] = None, quiet: bool = False,
              baseline: Optional[Path] = None, write_baseline: Optional[Path] = None,
              since: Optional[str] = None, designs_only: bool = False,
              require_plugins: Optional[str] = None, yield_samples: Optional[int] = None,
              seed: int = 20240601, distribution: str = "uniform",
              jobs: Optional[int] = None) -> int:
    """Lint designs; the exit code: 0 clean, 1 findings at or above ``fail_on``, 2 an input
    could not be used."""
    from .api import Severity
    from .engine import Registry, RequiredPluginError, lint
    from .loader import InputError
    from .progress import progress_for
    from .report import DEFAULT_FORMAT, FormatUnavailable, RenderOptions, formatter, load_formats

    format_problems: list[tuple[str, str]] = []
    try:
        if format == DEFAULT_FORMAT:  # found without reading the entry points (start-up time)
            render = formatter(format)
        else:
            formats = load_formats()
            render = formats.load(format)
            format_problems = formats.broken
    except FormatUnavailable as exc:
        sys.stderr.write(f"packwarden check: {exc}\n")
        return 2
    if baseline is not None and since is not None:
        sys.stderr.write("packwarden check: --baseline and --since cannot be combined\n")
        return 2
    if designs_only:
        paths = designs_only_paths(paths)
    level = Severity(fail_on) if fail_on else None
    bar = progress_for(sys.stderr, quiet=quiet)
    # The HTML report and the yield run read each design's model, which stays in the process
    # that built it: they lint in this one.
    needs_models = getattr(render, "needs_models", False) or bool(yield_samples)
    if OWN_PROCESS:
        # What is loaded by now lives as long as the process: keep the cycle collector from
        # walking it again and again while the designs are linted, and turn it back on (main
        # turned it off for start-up) so a batch of thousands of designs frees its cycles.
        import gc
        gc.freeze()
        gc.enable()
    try:
        run = lint(paths, config=config, fail_on=level, progress=bar,
                   require=[n.strip() for n in (require_plugins or "").split(",") if n.strip()],
                   jobs=1 if needs_models else jobs, keep_models=needs_models,
                   keep_events=getattr(render, "needs_events", False),
                   figures_up_to=None if needs_models else getattr(render, "figures_up_to", None))
    except RequiredPluginError as exc:
        sys.stderr.write(f"{exc}\n")
        return 2
    finally:
        if bar is not None:
            bar.close()

    def note(message: str) -> None:
        if not quiet:
            sys.stderr.write(message + "\n")

    comparison = None
    try:
        if write_baseline is not None:
            from .baseline import write_baseline as record_baseline
            try:
                n = record_baseline(run, write_baseline)
            except OSError as exc:
                raise InputError(str(write_baseline), 1, 1,
                                 f"cannot write the baseline: {exc.strerror or exc}") from None
            note(f"{n} finding(s) recorded in baseline {write_baseline}")
        if baseline is not None:
            from .baseline import compare, read_baseline
            run, comparison = compare(run, read_baseline(baseline, str(baseline)), str(baseline))
        elif since is not None:
            from .baseline import compare, lint_since
            entries, earlier_errors = lint_since(since, paths, Registry(rules=dict(run.rules)),
                                                 config=config, fail_on=level)
            run, comparison = compare(run, entries, f"git revision {since}")
            comparison.earlier_errors = earlier_errors
    except InputError as exc:  # one line, exit 2; the report of the run is still written
        run.errors.append(exc)
    # a format plugin that reuses a name: reported in the report like a broken rule plugin
    run.broken_plugins.extend(format_problems)
    text = render(run, RenderOptions(color=use_color(output, format), quiet=quiet,
                                     baseline=comparison))
    if yield_samples:
        from .montecarlo import add_yield
        text = add_yield(text, format, run, yield_samples, seed, distribution)
    if emit(text, output):
        return 2
    if comparison is not None:
        note(comparison.summary())
    code = run.exit_code()
    if write_baseline is not None and comparison is None and code == 1:
        code = 0  # every finding is now in the baseline just written
    return code


def use_color(output: Optional[Path], fmt: str) -> bool:
    if fmt != "text" or output is not None or os.environ.get("NO_COLOR"):
        return False
    return sys.stdout.isatty()


def emit(text: str, output: Optional[Path]) -> int:
    """Write a command's report to ``output``, else to stdout; 0, or 2 with one located line
    when the file cannot be written."""
    if output is None:
        sys.stdout.write(text)
        return 0
    try:
        output.write_text(text, encoding="utf-8")
    except OSError as exc:
        sys.stderr.write(f"{output}:1:1: cannot write the report: {exc.strerror or exc}\n")
        return 2
    return 0


def designs_only_paths(paths: List[str]) -> List[str]:
    """Folders, and files that declare ``format: packwarden/1``; a file that is not read (a pipe,
    a device, a link out of its repository) stays in, so the lint says why."""
    from .engine import is_design_text
    from .files import head
    from .library import named_root
    kept = []
    for raw in paths:
        p = Path(raw)
        if not p.is_dir():
            text = head(p, named_root(p.parent)) if "\x00" not in raw else None
            if text is not None and not is_design_text(text):
                continue
        kept.append(raw)
    return kept
