"""Part libraries: found relative to the design, confined to the repository, parsed once per run."""

from __future__ import annotations

import os
from dataclasses import field
from pathlib import Path
from typing import Any

from .files import Refused, regular
from .loader import Document, InputError, load_file
from .schema import PartLibrary
from .validate import validate
from .records import record

ROOT_MARKERS = (".git", "pyproject.toml", "packwarden.toml")


def repository_root(start: Path) -> Path:
    """The nearest folder at or above ``start`` that holds a repository or project marker."""
    start = start.resolve()
    for folder in (start, *start.parents):
        if any((folder / m).exists() for m in ROOT_MARKERS):
            return folder
    return start


def shown_path(path: Path) -> str:
    """A path as the user should see it: relative to the working folder when inside it."""
    try:
        relative = os.path.relpath(path)
    except ValueError:  # pragma: no cover - other drive on Windows
        return str(path)
    return relative if not relative.startswith("..") else str(path)


def named_root(start: Path) -> Path:
    """The repository holding ``start`` as the path names it: its folders are walked upward as
    written and a folder that is a link is not searched for markers, so a folder linking out of
    the repository (``designs -> /``) does not bring a root of its own. Designs are confined to
    it. (Relative paths start from the working folder, which the OS gives without links.)"""
    start = Path(os.path.abspath(start))
    for folder in (start, *start.parents):
        if not folder.is_symlink() and any((folder / m).exists() for m in ROOT_MARKERS):
            return folder
    return start


@record(frozen=True)
class PartSource:
    """Where a part was defined, for messages."""

    library: str
    line: int
    column: int


@record
class LibraryCache:
    """Parsed libraries of a run, keyed by resolved path: each file is read and validated once."""

    loaded: dict[Path, tuple[PartLibrary | None, Document | None, list[InputError]]] = field(
        default_factory=dict)
    #: Libraries resolved without error, per (design folder, library entries, root): the designs
    #: of one folder name the same libraries, and walking the paths and parts is done once.
    resolved: dict[tuple, "ResolvedParts"] = field(default_factory=dict)

    def load(self, path: Path) -> tuple[PartLibrary | None, Document | None, list[InputError]]:
        key = path.resolve()
        if key not in self.loaded:
            shown = shown_path(path)
            try:
                doc = load_file(path, shown)
            except InputError as exc:
                self.loaded[key] = (None, None, [exc])
            else:
                lib, errors = validate(doc, PartLibrary)
                self.loaded[key] = (lib, doc, errors)
        return self.loaded[key]


@record
class ResolvedParts:
    parts: dict[str, Any]
    sources: dict[str, PartSource]
    errors: list[InputError]


def confine(entry: str, base: Path, roots: tuple[Path, ...], what: str) -> tuple[Path | None, str | None]:
    """``base / entry`` resolved, or why it may not be used: it must lie inside one of ``roots``
    (the repository first, then the roots the project's config allows) and exist as a file."""
    try:
        real = (base / entry).resolve()
    except (OSError, RuntimeError, ValueError):
        return None, f"{what} '{entry}' cannot be resolved"
    if Path(entry).is_absolute() or not any(_inside(real, r) for r in roots):
        # Said apart because the fixes differ: a path written to climb out, or a link (inside
        # the repository as written) that points outside it.
        lexical = Path(os.path.normpath(base.resolve() / entry))
        how = "links outside" if not Path(entry).is_absolute() and _inside(lexical, roots[0]) \
            else "escapes"
        allowed = "" if len(roots) == 1 else \
            " or the library roots " + ", ".join(shown_path(r) for r in roots[1:])
        return None, (f"{what} path '{entry}' {how} the repository ({shown_path(roots[0]) or '.'})"
                      f"{allowed}; {'libraries' if what == 'library' else what + 's'} must live inside it" + (
                          "; a team library kept elsewhere is allowed by naming its folder in "
                          "the project's config: library_roots = [\"../team-parts\"] under "
                          "[tool.packwarden]" if what == "library" else ""))
    try:
        regular(real)  # a pipe or a device would hang the run or never end
    except Refused as exc:
        if exc.message == "no such file":
            looked = shown_path(real)
            return None, f"{what} '{entry}' not found" + (
                f" (looked for {looked})" if looked != entry else "")
        if exc.message == "is a directory":
            return None, (f"{what} '{entry}' is a directory, not a "
                          f"{'YAML ' if what == 'library' else ''}file")
        return None, f"{what} '{entry}' {exc.message}"
    return real, None


def resolve_libraries(design_doc: Document, libraries: list[str], design_path: Path,
                      cache: LibraryCache, root: Path,
                      library_roots: tuple[Path, ...] = ()) -> ResolvedParts:
    """Load the design's libraries and their includes; refuse paths outside ``root`` and the
    ``library_roots`` the project's config allows."""
    key = (design_path.parent, tuple(libraries), root, library_roots)
    hit = cache.resolved.get(key)
    if hit is not None:
        return ResolvedParts(dict(hit.parts), dict(hit.sources), [])
    parts: dict[str, Any] = {}
    sources: dict[str, PartSource] = {}
    errors: list[InputError] = []
    root = root.resolve()
    roots = (root, *(r.resolve() for r in library_roots))

    def visit(entry: str, base: Path, owner: Document, where: tuple, stack: tuple[Path, ...]):
        real, refusal = confine(entry, base, roots, "library")
        if real is None:
            errors.append(owner.error(where, refusal or ""))
            return
        candidate = base / entry
        if real in stack:
            chain = " -> ".join(shown_path(p) for p in (*stack, real))
            errors.append(owner.error(where, f"libraries include each other in a cycle: {chain}"))
            return
        lib, doc, lib_errors = cache.load(candidate)
        errors.extend(lib_errors)
        if lib is None or doc is None:
            return
        for i, inc in enumerate(lib.include):
            visit(inc, real.parent, doc, ("include", i), (*stack, real))
        for name, part in lib.parts.items():
            pos = doc.where(("parts", name), key=True)
            if name in parts and sources[name].library != doc.file:
                first = sources[name]
                errors.append(InputError(doc.file, pos.line, pos.column,
                                         f"part '{name}' is also defined in {first.library}:"
                                         f"{first.line}; part names must be unique"))
                continue
            parts[name] = part
            sources[name] = PartSource(doc.file, pos.line, pos.column)

    for i, entry in enumerate(libraries):
        visit(entry, design_path.parent, design_doc, ("libraries", i), ())
    if not errors:  # errors carry this design's positions: those are found afresh each time
        cache.resolved[key] = ResolvedParts(dict(parts), dict(sources), [])
    return ResolvedParts(parts, sources, errors)


def _inside(path: Path, root: Path) -> bool:
    try:
        path.relative_to(root)
        return True
    except ValueError:
        return False
