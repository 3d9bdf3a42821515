"""The installed ``packwarden`` command: a plain ``check`` without the command-line library.

Importing typer and building its command (one pydantic type adapter per option) is about a third
of a single-file check's start-up. Most runs are a plain ``packwarden check FILE...`` from a hook
or an editor, so :func:`main` reads such a command line itself and calls the check's body
(``checking.run_check``) with the values typer would have passed. Anything else (another command,
``--help``, an option this reader does not know or a value it would have to convert in a way of
its own, an option given twice) goes to the typer command (``cli.main``) unread, so help, option
errors and their exit codes come from one place and stay as they are. ``tests/test_launch.py``
holds the two ways to the same call.
"""

from __future__ import annotations

import errno
import os
import sys
from pathlib import Path
from typing import Any, Callable, Optional


def _text(value: str) -> str:
    return value


def _choice(*allowed: str) -> Callable[[str], Optional[str]]:
    return lambda value: value if value in allowed else None


def _count(low: int, high: Optional[int] = None) -> Callable[[str], Optional[int]]:
    # Plain digits only: typer accepts more spellings ("+3", " 3", "3_0"); those go to it.
    def convert(value: str) -> Optional[int]:
        if not value.isdigit() or not value.isascii() or (len(value) > 1 and value[0] == "0"):
            return None
        n = int(value)
        return n if n >= low and (high is None or n <= high) else None
    return convert


#: ``check``'s options that take a value: parameter name and conversion (None: not plain).
#: Keep in step with ``cli.check``; tests/test_launch.py compares the two on every option.
VALUED: dict[str, tuple[str, Callable[[str], Any]]] = {
    "--format": ("format", _text), "-f": ("format", _text),
    "--output": ("output", Path), "-o": ("output", Path),
    "--fail-on": ("fail_on", _choice("error", "warning", "info")),
    "--config": ("config", Path),
    "--baseline": ("baseline", Path),
    "--write-baseline": ("write_baseline", Path),
    "--since": ("since", _text),
    "--require-plugins": ("require_plugins", _text),
    "--yield": ("yield_samples", _count(1, 10_000_000)),
    "--seed": ("seed", _count(0)),
    "--distribution": ("distribution", _choice("uniform", "normal")),
    "--jobs": ("jobs", _count(1)), "-j": ("jobs", _count(1)),
}
#: ``check``'s flags.
FLAGS = {"--quiet": "quiet", "-q": "quiet", "--designs-only": "designs_only"}


def plain_check(argv: list[str]) -> Optional[dict[str, Any]]:
    """The keyword arguments of ``run_check`` for a plain ``check`` command line, else None."""
    if not argv or argv[0] != "check":
        return None
    opts: dict[str, Any] = {}
    paths: list[str] = []
    rest = iter(argv[1:])
    for token in rest:
        if not token.startswith("-"):
            if not token:
                return None
            paths.append(token)
            continue
        name, eq, value = token.partition("=")
        if name in FLAGS and not eq:
            key = FLAGS[name]
            value_of: Any = True
        elif name in VALUED:
            if not eq:
                value = next(rest, None)
                if value is None:
                    return None
            elif not name.startswith("--"):
                return None  # "-f=json" is the value "=json" to typer
            if not value or value.startswith("-"):
                return None
            key, convert = VALUED[name]
            value_of = convert(value)
            if value_of is None:
                return None
        else:
            return None
        if key in opts:
            return None
        opts[key] = value_of
    if not paths:
        return None
    return {"paths": paths, **opts}


def _completing() -> bool:
    # a shell asking for completions (click's "_<PROG>_COMPLETE"): typer's business
    return any(k.startswith("_") and k.endswith("_COMPLETE") for k in os.environ)


def main() -> None:
    opts = plain_check(sys.argv[1:]) if not _completing() else None
    if opts is None:
        from .cli import main as full
        full()
        return
    from .checking import run_check, start
    start()
    from . import quick
    if quick.wanted(opts):  # pydantic's models are not made for a plain check (quick.py)
        from .schemacache import go_quick
        go_quick()
    try:
        code = run_check(**opts)
    except KeyboardInterrupt:  # pragma: no cover
        code = 130
    except EOFError:  # pragma: no cover - as typer: a blank line and "Aborted!"
        sys.stderr.write("\nAborted!\n")
        code = 1
    except OSError as exc:  # as typer: a reader that went away ends the run with 1, silently
        if exc.errno != errno.EPIPE:
            raise
        try:
            sys.stderr.flush()
        except (OSError, ValueError):
            pass
        os._exit(1)
    from .checking import finish
    finish(SystemExit(code))


if __name__ == "__main__":  # pragma: no cover
    main()
