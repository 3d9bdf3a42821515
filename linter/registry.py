"""The rule registry: built-in and team rules, loaded through one entry-point group (and folders
a project's config names), each plugin on its own; plugins a run requires.
"""

from __future__ import annotations

import importlib.util
import sys
from dataclasses import field, replace
from pathlib import Path
from typing import Any, Iterable

from . import quick
from .api import Rule
from .config import Config, line_of
from .library import shown_path
from .records import record

ENTRY_POINT_GROUP = "packwarden.rules"


# --- registry -----------------------------------------------------------------------------------

@record
class Registry:
    rules: dict[str, Rule] = field(default_factory=dict)
    #: Plugins that failed to load: (name, message). Reported; the rest still run.
    broken: list[tuple[str, str]] = field(default_factory=list)
    plugins: set[str] = field(default_factory=set)
    #: Installed distributions that register rules, by normalized name (``--require-plugins``).
    distributions: set[str] = field(default_factory=set)

    def add(self, obj: Any, origin: str, plugin: str) -> None:
        for item in _items(obj):
            if not isinstance(item, Rule):
                self.broken.append((origin, f"{origin} is not a packwarden Rule "
                                            f"(got {type(item).__name__})"))
                continue
            if item.id in self.rules:
                other = self.rules[item.id].origin
                self.broken.append((origin, f"duplicate rule id '{item.id}': defined by {other} "
                                            f"and by {origin}"))
                continue
            self.rules[item.id] = replace(item, origin=origin)
        self.plugins.add(plugin)


def load_registry(rule_paths: Iterable[Path] = ()) -> Registry:
    """Every rule from installed entry points, then from the config's rule folders."""
    from .entrycache import installed_entry_points

    reg = Registry()

    def order(item) -> tuple:
        # packwarden's own rules first, then plugins by distribution: when a plugin reuses a
        # built-in id, the plugin is the one reported, and the outcome never depends on a name.
        dist, ep = item
        return (dist != "packwarden", dist or "", ep.name)

    for dist, ep in sorted(installed_entry_points(ENTRY_POINT_GROUP), key=order):
        plugin = dist if dist is not None else ep.module
        if dist is not None:
            reg.distributions.add(normalize_name(dist))
        origin = f"{plugin}:{ep.name}"
        if dist != "packwarden" and quick.ON:  # a plugin's options are pydantic's own models
            quick.fall_back("a rule plugin is installed")
        try:
            obj = ep.load()
            if dist != "packwarden":
                _build_options(obj)
        except (Exception, SystemExit) as exc:  # a broken plugin must not stop the others
            reg.broken.append((origin, f"plugin {origin} failed to load: "
                                       f"{type(exc).__name__}: {exc}"))
            reg.plugins.add(plugin)
            continue
        reg.add(obj, origin, plugin)
    for folder in rule_paths:
        if quick.ON:
            quick.fall_back("a team rule folder")
        load_folder(reg, folder)
    return reg


def _items(obj: Any) -> list | tuple:
    """What a plugin or a rule module registers: one rule, or a list or tuple of them."""
    return obj if isinstance(obj, (list, tuple)) else [obj]


def _build_options(found: Any) -> None:
    """Build the validators of a plugin's or a team folder's rule options now: the models are
    made with ``defer_build`` (``api.RuleOptions``), and a mistake in one must be reported as
    the plugin's, when it loads, not met later in a check."""
    for item in _items(found):
        options = getattr(item, "options", None) if isinstance(item, Rule) else None
        rebuild = getattr(options, "model_rebuild", None)
        if isinstance(options, type) and rebuild is not None:
            rebuild(force=True)


def load_folder(reg: Registry, folder: Path) -> None:
    """Load every ``*.py`` module in a folder the project's config names; take its ``RULES``."""
    if not folder.is_dir():
        reg.broken.append((str(folder), f"rule folder {shown_path(folder)} does not exist"))
        return
    for path in sorted(folder.glob("*.py")):
        if path.name.startswith("_"):
            continue
        name = f"packwarden_team_rules.{folder.name}.{path.stem}"
        origin = shown_path(path)
        try:
            spec = importlib.util.spec_from_file_location(name, path)
            assert spec and spec.loader
            module = importlib.util.module_from_spec(spec)
            sys.modules[name] = module
            spec.loader.exec_module(module)
            rules = getattr(module, "RULES", None)
            if rules is None:
                rules = [v for v in vars(module).values() if isinstance(v, Rule)]
            _build_options(rules)
        except (Exception, SystemExit) as exc:
            reg.broken.append((origin, f"rule module {origin} failed to load: "
                                       f"{type(exc).__name__}: {exc}"))
            continue
        reg.add(list(rules), origin, origin)


# --- required plugins ---------------------------------------------------------------------------

class RequiredPluginError(Exception):
    """A plugin the run must have (``--require-plugins``, config ``require_plugins``) is missing.

    Raised before any design is read: a review without the team's rules would pass designs the
    team's own checks fail, so the run stops at once with exit code 2.
    """


def normalize_name(name: str) -> str:
    """A distribution name as packaging compares them (PEP 503): case and -_. runs folded."""
    import re
    return re.sub(r"[-_.]+", "-", name).lower()


def missing_plugins(registry: Registry, names: Iterable[str]) -> list[str]:
    """One message per required distribution that registers no rules in this installation."""
    out = []
    for name in names:
        if normalize_name(name) in registry.distributions:
            continue
        # imported only for a plugin not found among the rules (a twentieth of a cold check)
        from importlib.metadata import PackageNotFoundError, distribution
        try:
            distribution(name)
        except PackageNotFoundError:
            have = ", ".join(sorted(registry.distributions)) or "none"
            out.append(f"required plugin '{name}' is not installed (distributions registering "
                       f"rules here: {have}); install it, or drop it from the required plugins")
        else:
            out.append(f"required plugin '{name}' is installed but registers no rules in the "
                       f"'{ENTRY_POINT_GROUP}' entry-point group")
    return out


def require_plugins(registry: Registry, names: Iterable[str] = (), cfg: Config | None = None) -> None:
    """Raise :class:`RequiredPluginError` unless every plugin named here or in ``cfg`` is installed.

    Names given directly (the command line) are reported as ``--require-plugins``; names from the
    config point at the config's line.
    """
    lines = [f"--require-plugins: {m}" for m in missing_plugins(registry, names)]
    for name in _config_required(cfg):
        for m in missing_plugins(registry, [name]):
            line, col = line_of(cfg.text, name, ("",), cfg.prefix) if cfg else (1, 1)
            lines.append(f"{cfg.file}:{line}:{col}: {m}")
    if lines:
        raise RequiredPluginError("\n".join(lines))


def _config_required(cfg: Config | None) -> list[str]:
    return list(cfg.require_plugins) if cfg is not None else []
