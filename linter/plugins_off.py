"""pydantic's plugin look-up, without ``importlib.metadata``, while pydantic's plugins are off.

``checking.start`` turns pydantic's plugins off (``PYDANTIC_DISABLE_PLUGINS=__all__`` unless the
user set the variable; see SECURITY.md): packwarden's models use none, and a review's findings
must not depend on one. With that value pydantic's ``get_plugins()`` returns no plugins without
looking, yet the module it lives in (``pydantic.plugin._loader``) imports ``importlib.metadata``
at its top, and with it ``email``, ``zipfile`` and ``csv``: about 15 ms of a 240 ms cold check,
for nothing. :func:`install` puts a stand-in under that module's name before pydantic first
asks for it. The stand-in answers ``get_plugins()`` exactly as pydantic's does while the
variable says "off" (``()``), and hands everything else, and any call once the variable says
otherwise, to pydantic's own module, imported then. pydantic reads the module in one place
(``create_schema_validator``: ``from ._loader import get_plugins``);
``tests/test_plugins_off.py`` holds the stand-in to the real module's answers.
"""

from __future__ import annotations

import os
import sys
import types
from typing import Any

LOADER = "pydantic.plugin._loader"
#: The values of PYDANTIC_DISABLE_PLUGINS for which pydantic's get_plugins() looks for nothing.
OFF = ("__all__", "1", "true")


def plugins_off() -> bool:
    return os.environ.get("PYDANTIC_DISABLE_PLUGINS") in OFF


def install() -> bool:
    """Put the stand-in in place if pydantic's plugins are off and its loader is not imported
    yet; whether it was."""
    if not plugins_off() or LOADER in sys.modules:
        return False
    sys.modules[LOADER] = _stand_in()
    return True


def _stand_in() -> types.ModuleType:
    module = types.ModuleType(LOADER, "packwarden's stand-in for pydantic's plugin loader "
                                      "while plugins are off (packwarden.plugins_off)")

    def get_plugins() -> Any:
        if plugins_off():
            return ()
        return _real(module).get_plugins()

    def __getattr__(name: str) -> Any:
        if name.startswith("__"):  # the import system asks for __path__ and the like
            raise AttributeError(name)
        return getattr(_real(module), name)

    module.get_plugins = get_plugins  # type: ignore[attr-defined]
    module.__getattr__ = __getattr__  # type: ignore[attr-defined]
    return module


def _real(stand_in: types.ModuleType) -> types.ModuleType:
    """pydantic's own loader, imported in place of the stand-in."""
    if sys.modules.get(LOADER) is stand_in:
        del sys.modules[LOADER]
    from importlib import import_module
    return import_module(LOADER)
