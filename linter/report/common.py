"""What every output format shares: the render options, a key figure as text, report paths."""

from __future__ import annotations

from pathlib import Path
from typing import Any

from ..records import record

__all__ = ["RenderOptions", "figure_text", "source_root", "report_root", "relative_path",
           "absolute"]


@record(frozen=True)
class RenderOptions:
    color: bool = False
    quiet: bool = False
    repo_root: str | None = None
    #: Set by ``--baseline`` / ``--since``: the findings hidden as unchanged and those fixed
    #: (a :class:`packwarden.baseline.Comparison`). The run handed to ``render`` then holds only
    #: the new findings, so a formatter that ignores this field still reports the right ones.
    baseline: Any = None


def figure_text(fig: Any) -> str:
    """A key figure (:class:`packwarden.figures.KeyFigure`) as every report shows it: in its
    declared unit with an engineering prefix, a count as a plain number; "—" when the design has
    no such figure, "n/a" when the model could not compute it (never a zero it did not find)."""
    if fig is None:
        return "—"
    if not fig.known:
        return "n/a"
    if fig.unit:
        from ..quantities import format_quantity
        return format_quantity(float(fig.value), fig.unit)
    return f"{fig.value:g}"


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
