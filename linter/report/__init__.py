"""Formatters behind one interface: ``render(run, options) -> str``, looked up by name.

Adding a format touches one module here and the table below.
"""

from __future__ import annotations

import importlib
import importlib.util
from pathlib import Path
from typing import Any, Callable

from ..records import record

FORMATS = {
    "text": "text",
    "json": "json_format",
    "sarif": "sarif",
    "junit": "junit",
    "markdown": "markdown",
    "html": "html",
}


class FormatUnavailable(LookupError):
    """A format named in :data:`FORMATS` whose module is not part of this installation."""


@record(frozen=True)
class RenderOptions:
    color: bool = False
    quiet: bool = False
    repo_root: str | None = None
    #: Set by ``--baseline`` / ``--since``: the findings hidden as unchanged and those fixed
    #: (a :class:`packwarden.baseline.Comparison`). The run handed to ``render`` then holds only
    #: the new findings, so a formatter that ignores this field still reports the right ones.
    baseline: Any = None


def formatter(name: str) -> Callable:
    """The ``render`` function of format ``name``; imported only when asked for (start-up time)."""
    target = f"{__name__}.{FORMATS[name]}"
    if importlib.util.find_spec(target) is None:
        raise FormatUnavailable(f"output format '{name}' is not available in this installation")
    module = importlib.import_module(target)
    return module.render


def source_root(start: Path) -> Path:
    """The folder report paths are relative to: the version-control checkout holding ``start``.

    CI systems resolve report paths against their checkout, so the nearest ``.git`` wins; outside
    a repository, the project root the engine uses (a ``pyproject.toml`` or ``packwarden.toml``).
    """
    from ..library import repository_root
    start = start.resolve()
    for folder in (start, *start.parents):
        if (folder / ".git").exists():
            return folder
    return repository_root(start)


def report_root(run: Any, opts: RenderOptions) -> Path:
    """The root for this run's report paths: ``opts.repo_root``, else the first design's checkout."""
    if opts.repo_root:
        return Path(opts.repo_root).resolve()
    files = [d.file for d in run.designs] + [e.file for e in run.input_errors()]
    return source_root(absolute(files[0]).parent if files else Path.cwd())


def absolute(file: str) -> Path:
    """``file`` as an absolute path, its folders resolved but not the file's own link: a design
    refused for linking out of its repository has its target named nowhere."""
    path = Path(file)
    return path.parent.resolve() / path.name


def relative_path(file: str, root: Path) -> str | None:
    """``file`` relative to ``root`` in POSIX form, or None when it lies outside."""
    try:
        return absolute(file).relative_to(root).as_posix()
    except ValueError:
        return None
