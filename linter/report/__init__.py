"""Formatters behind one interface: ``render(run, options) -> str``, registered by name.

Formats register in the ``packwarden.formats`` entry-point group, the built-in ones in
packwarden's own ``pyproject.toml`` exactly as a team's package would, so adding a format is its
module and one line there. Nothing is imported until a format is asked for, and the default text
format is found without reading the entry points at all: a plain ``check`` pays nothing for the
registry.
"""

from __future__ import annotations

from typing import Any, Callable

from ..records import record
# Shared by every format; they import it from .common, never from this package (no cycle).
from .common import (RenderOptions, absolute, figure_text, relative_path, report_root,
                     source_root)

__all__ = ["FORMAT_GROUP", "DEFAULT_FORMAT", "FormatUnavailable", "FormatRegistry", "load_formats",
           "formatter", "RenderOptions", "absolute", "figure_text", "relative_path",
           "report_root", "source_root"]

FORMAT_GROUP = "packwarden.formats"
DEFAULT_FORMAT = "text"


class FormatUnavailable(LookupError):
    """The format asked for is not registered, or its module could not be loaded (one line)."""


@record
class FormatRegistry:
    """The formats installed, by name: each an entry point, loaded only when asked for."""

    #: name -> (origin ``distribution:name``, entry point); packwarden's own formats first
    entries: dict[str, tuple[str, Any]]
    #: (origin, message) of each registration of a name already taken: reported like a broken
    #: rule plugin (exit code 2); the first registration stays in use
    broken: list[tuple[str, str]]

    def names(self) -> list[str]:
        return sorted(self.entries)

    def load(self, name: str) -> Callable:
        """The ``render`` function of format ``name``; :class:`FormatUnavailable` if there is none."""
        if name not in self.entries:
            import difflib  # only for a mistake (start-up time)
            close = difflib.get_close_matches(name, self.names(), n=1)
            raise FormatUnavailable(f"unknown output format '{name}'" + (
                f" (did you mean '{close[0]}'?)" if close else "")
                + f"; registered formats: {', '.join(self.names())}")
        origin, ep = self.entries[name]
        try:
            render = ep.load()
        except (Exception, SystemExit) as exc:  # a broken plugin is one line, not a traceback
            raise FormatUnavailable(f"output format '{name}' ({origin}) failed to load: "
                                    f"{type(exc).__name__}: {exc}") from None
        if not callable(render):
            raise FormatUnavailable(f"output format '{name}' ({origin}) is not a render function "
                                    f"(got {type(render).__name__})")
        return render


def load_formats() -> FormatRegistry:
    """Every format of the ``packwarden.formats`` entry points, none of them imported yet."""
    from ..entrycache import installed_entry_points

    found = [(dist if dist is not None else ep.module, ep)
             for dist, ep in installed_entry_points(FORMAT_GROUP)]
    # packwarden's own formats first, then plugins by distribution: a plugin that reuses a name
    # is the one reported, and the outcome never depends on the order of the installation
    found.sort(key=lambda item: (item[0] != "packwarden", item[0], item[1].name))
    reg = FormatRegistry({}, [])
    for dist, ep in found:
        origin = f"{dist}:{ep.name}"
        if ep.name in reg.entries:
            reg.broken.append((origin, f"duplicate output format '{ep.name}': registered by "
                                       f"{reg.entries[ep.name][0]} and by {origin}"))
            continue
        reg.entries[ep.name] = (origin, ep)
    return reg


def formatter(name: str) -> Callable:
    """The ``render`` function of format ``name``, imported only when asked for (start-up time)."""
    if name == DEFAULT_FORMAT:
        from .text import render
        return render
    return load_formats().load(name)
