"""Formatters behind one interface: ``render(run, options) -> str``, looked up by name.

Adding a format touches one module here and the table below.
"""

from __future__ import annotations

import importlib
from dataclasses import dataclass
from typing import Callable

FORMATS = {
    "text": "text",
    "json": "json_format",
}


@dataclass(frozen=True)
class RenderOptions:
    color: bool = False
    quiet: bool = False
    repo_root: str | None = None


def formatter(name: str) -> Callable:
    """The ``render`` function of format ``name``; imported only when asked for (start-up time)."""
    module = importlib.import_module(f"{__name__}.{FORMATS[name]}")
    return module.render
