"""The ``packwarden.rules`` and ``packwarden.formats`` entry points, read once per environment.

Finding them asks ``importlib.metadata`` to list every installed distribution and to parse the
metadata file of each one that registers an entry point, for its name: a few tens of
milliseconds of every start of ``packwarden check``, for an answer that changes only when a
package is installed or removed. The answer is kept in a per-user cache file, one per Python
environment, beside a fingerprint of everything the answer is read from:

* the interpreter (``sys.prefix``, ``sys.executable``), ``sys.path`` in order, and the finders on
  ``sys.meta_path`` (a finder may list distributions of its own);
* for each folder on ``sys.path``, the names of the ``*.dist-info`` / ``*.egg-info`` in it
  (installing or removing a package adds or removes one) and the modification times and sizes
  of each and of its ``entry_points.txt`` (a file rewritten in place); for a file on
  ``sys.path`` (a zip), its own. Not a folder's own modification time: it changes with any file
  written there, and ``python -m packwarden`` puts the working folder, where designs are edited,
  on ``sys.path``.

When the fingerprint differs, or the file is missing, unreadable, corrupt or of another layout,
the entry points are read from ``importlib.metadata`` as before and the file is written again;
a cache that cannot be written is skipped silently. ``PACKWARDEN_CACHE_DIR`` moves the cache,
and ``PACKWARDEN_CACHE_DIR=""`` (empty) turns it off. ``tests/test_entrycache.py`` holds it.
"""

from __future__ import annotations

import hashlib
import os
import sys
from pathlib import Path
from typing import Any, Optional

#: The groups kept, read together on a miss.
GROUPS = ("packwarden.rules", "packwarden.formats")
#: The cache file's first line: its layout, then the fingerprint. A plain text file, one entry
#: point a line (group, name, value, distribution; tab-separated), read without importing json.
HEADER = "packwarden entry points 1"
_META_SUFFIXES = (".dist-info", ".egg-info")


def cache_dir() -> Optional[Path]:
    """Where the cache files live (None: no cache): ``PACKWARDEN_CACHE_DIR``, else the user's
    cache folder (``XDG_CACHE_HOME``, else ``~/.cache``) / packwarden."""
    chosen = os.environ.get("PACKWARDEN_CACHE_DIR")
    if chosen is not None:
        return Path(chosen) if chosen else None
    base = os.environ.get("XDG_CACHE_HOME") or os.path.join(os.path.expanduser("~"), ".cache")
    return Path(base) / "packwarden"


def environment_state() -> list:
    """Everything the entry points are read from (see the module's docstring)."""
    state: list = [sys.prefix, sys.executable,
                   [f"{type(f).__module__}.{type(f).__qualname__}" for f in sys.meta_path]]
    for entry in sys.path:
        folder = entry or "."
        try:
            stat = os.stat(folder)
        except OSError:
            state.append([entry, None])
            continue
        metas: list = []
        if os.path.isdir(folder):
            try:
                with os.scandir(folder) as found:
                    names = sorted(e.name for e in found if e.name.endswith(_META_SUFFIXES))
            except OSError:
                names = ["(unreadable)"]
            for name in names:
                metas.append([name, _stamp(os.path.join(folder, name)),
                              _stamp(os.path.join(folder, name, "entry_points.txt"))])
            # the names and stamps are all that importlib.metadata reads of a folder
            state.append([entry, "folder", metas])
            continue
        state.append([entry, stat.st_mtime_ns, stat.st_size])
    return state


def _stamp(path: str) -> Optional[list[int]]:
    try:
        stat = os.stat(path)
    except OSError:
        return None
    return [stat.st_mtime_ns, stat.st_size]


def read_installed() -> dict[str, list[list]]:
    """The groups from ``importlib.metadata``: ``[name, value, distribution name or None]``."""
    from importlib.metadata import entry_points

    # a distribution's name is parsed from its metadata at each access: once per distribution
    # object, kept here with the object itself, so that no id is reused by another distribution
    # while this runs (the entry points of one group are freed before the next group's are read)
    names: dict[int, tuple[Any, str]] = {}
    out: dict[str, list[list]] = {}
    for group in GROUPS:
        rows = []
        for ep in entry_points(group=group):
            dist = None
            if ep.dist is not None:
                if id(ep.dist) not in names:
                    names[id(ep.dist)] = (ep.dist, ep.dist.name)
                dist = names[id(ep.dist)][1]
            rows.append([ep.name, ep.value, dist])
        out[group] = rows
    return out


def installed_entry_points(group: str) -> list[tuple[Optional[str], Any]]:
    """``(distribution name or None, entry point)`` for each entry point of ``group``, in the
    order ``importlib.metadata`` lists them; a plain ``module:attr`` value as a
    :class:`KeptEntryPoint`, any other as ``importlib.metadata.EntryPoint``."""
    rows = _cached_groups()[group]
    return [(dist, entry_point(name, value, group)) for name, value, dist in rows]


def entry_point(name: str, value: str, group: str) -> Any:
    if KeptEntryPoint.plain(value):
        return KeptEntryPoint(name, value, group)
    from importlib.metadata import EntryPoint
    return EntryPoint(name, value, group)


class KeptEntryPoint:
    """An entry point whose value is a plain ``module`` or ``module:attr.attr``, loaded as
    ``importlib.metadata.EntryPoint`` loads it (import the module, then each attribute in turn).

    Importing ``importlib.metadata`` (with ``email``, ``zipfile``, ``csv`` behind it) is about a
    twentieth of a cold check, and a check whose entry points come from the cache needs nothing
    else from it. Any other value (whitespace, extras, a malformed one) is given to
    ``importlib.metadata``'s own class, so its errors stay as they are
    (``tests/test_entrycache.py`` holds the two alike)."""

    __slots__ = ("name", "value", "group")

    def __init__(self, name: str, value: str, group: str) -> None:
        self.name, self.value, self.group = name, value, group

    @staticmethod
    def plain(value: str) -> bool:
        module, colon, attr = value.partition(":")
        return _dotted(module) and (not colon or _dotted(attr))

    @property
    def module(self) -> str:
        return self.value.partition(":")[0]

    @property
    def attr(self) -> Optional[str]:
        return self.value.partition(":")[2] or None

    def load(self) -> Any:
        from importlib import import_module
        module = import_module(self.module)
        obj: Any = module
        for name in (self.attr or "").split("."):
            if name:
                obj = getattr(obj, name)
        return obj

    def __repr__(self) -> str:
        return f"KeptEntryPoint(name={self.name!r}, value={self.value!r}, group={self.group!r})"


#: ASCII within importlib.metadata's pattern for a module or an attribute, ``[\w.]+``.
_DOTTED = frozenset("abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789_.")


def _dotted(text: str) -> bool:
    return bool(text) and _DOTTED.issuperset(text)



def _cached_groups() -> dict[str, list[list]]:
    folder = cache_dir()
    if folder is None:
        return read_installed()
    state = hashlib.sha256(repr(environment_state()).encode()).hexdigest()
    env = hashlib.sha256(f"{sys.prefix}\0{sys.executable}".encode()).hexdigest()[:16]
    path = folder / f"entry-points-{env}.txt"
    try:
        kept = _parse(path.read_text(encoding="utf-8"), state)
    except (OSError, UnicodeError):
        kept = None
    if kept is not None:
        return kept
    groups = read_installed()
    _write(path, _dump(groups, state))
    return groups


def _dump(groups: dict[str, list[list]], state: str) -> Optional[str]:
    lines = [f"{HEADER} {state}"]
    for group in GROUPS:
        for name, value, dist in groups[group]:
            fields = [group, name, value, dist or ""]
            if any("\t" in f or "\n" in f or "\r" in f for f in fields):
                return None  # not kept: read from importlib.metadata every time
            lines.append("\t".join(fields))
    return "\n".join(lines) + "\n"


def _parse(text: str, state: str) -> Optional[dict[str, list[list]]]:
    """The groups of a cache file of this layout and fingerprint, else None."""
    lines = text.split("\n")
    if lines[0] != f"{HEADER} {state}" or lines[-1] != "":
        return None
    groups: dict[str, list[list]] = {g: [] for g in GROUPS}
    for line in lines[1:-1]:
        fields = line.split("\t")
        if len(fields) != 4 or fields[0] not in groups or not fields[1] or not fields[2]:
            return None
        groups[fields[0]].append([fields[1], fields[2], fields[3] or None])
    return groups


def _write(path: Path, text: Optional[str]) -> None:
    if text is not None:
        write_cache_file(path, text.encode("utf-8"))


#: Cache files of one kind (``entry-points-*``, ``core-schemas-*``) kept in the folder: one per
#: environment or installed copy, and every virtual environment, upgrade or benchmark install
#: made one more. When a write makes more, the least recently written go (an environment whose
#: file went pays one cache miss and writes it again).
KEPT_PER_KIND = 16


def write_cache_file(path: Path, data: bytes) -> None:
    """Write a cache file beside ``path`` and rename it over, so a reader never sees half a file;
    a file that cannot be written is skipped silently. Then the oldest files of its kind beyond
    :data:`KEPT_PER_KIND` are removed."""
    tmp = path.with_name(f"{path.name}.{os.getpid()}.tmp")
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        tmp.write_bytes(data)
        os.replace(tmp, path)
    except OSError:
        try:
            tmp.unlink()
        except OSError:
            pass
        return
    _prune(path)


def _prune(path: Path) -> None:
    kind, _, _ = path.name.rpartition("-")
    if not kind:
        return
    found = []
    try:
        with os.scandir(path.parent) as entries:
            for entry in entries:
                name = entry.name
                if name.rpartition("-")[0] == kind and not name.endswith(".tmp") \
                        and name != path.name:
                    found.append((entry.stat().st_mtime_ns, name))
    except OSError:
        return
    found.sort()
    for _, name in found[:max(0, len(found) - (KEPT_PER_KIND - 1))]:
        try:
            os.unlink(path.parent / name)
        except OSError:
            pass
