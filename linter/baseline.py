"""Baselines: which findings are new, by fingerprint, against an earlier set of findings.

The earlier set comes from a baseline file (``--write-baseline FILE`` records it, ``--baseline FILE``
reads it) or from the designs and libraries as they were at a git revision (``--since REV``). Either
way the run is split three ways:

- **new**: a finding whose fingerprint the earlier set lacks. Only these are reported and only these
  count for the exit code, so a team can adopt packwarden on a repository that already has findings
  and still gate every new mistake.
- **unchanged**: in both; hidden from the report (SARIF lists them with ``baselineState``).
- **absent** (fixed): in the earlier set only.

Fingerprints never depend on line numbers or on the folder the command ran in (see
``Finding.with_fingerprint`` and ``engine.design_identity``), so a baseline written at the
repository root by CI still matches a run from a subfolder, and the same design extracted from git
into a temporary tree gets the same fingerprints.

Findings are matched as a multiset: when a fingerprint occurs twice now and once before, one of the
two is new. Waived findings are never written to a baseline: a waiver is the accountable way to
accept a finding, and a baseline entry must not keep a finding quiet once its waiver expires.
"""

from __future__ import annotations

import json
import re
import os
import subprocess
import tempfile
from collections import Counter
from dataclasses import field, replace
from pathlib import Path
from typing import Any, Iterable

from . import __version__
from .api import Finding, Severity
from .files import Refused, read_limited
from .loader import InputError
from .records import record

BASELINE_FORMAT = "packwarden-baseline/1"

#: Files taken from a revision for ``--since``: designs, part libraries, configuration and the
#: schematic netlists designs name (KiCad writes ``.net``). Nothing else is read by a lint, and
#: hardware repositories often hold large binary CAD files.
REVISION_SUFFIXES = (".yaml", ".yml", ".toml", ".json", ".net")


@record(frozen=True)
class Entry:
    """A finding as a baseline records it: enough to match it and to report it once it is fixed."""

    fingerprint: str
    rule: str
    severity: str
    file: str  # relative to the checkout root, POSIX form
    line: int = 1
    column: int = 1
    path: str = ""  # dotted YAML path
    element: str | None = None
    message: str = ""

    def as_dict(self) -> dict[str, Any]:
        return {"fingerprint": self.fingerprint, "rule": self.rule, "severity": self.severity,
                "file": self.file, "line": self.line, "column": self.column, "path": self.path,
                "element": self.element, "message": self.message}


@record
class Comparison:
    """The outcome of comparing a run with an earlier set of findings."""

    #: What the run was compared with, for people: "baseline.json" or "git revision main".
    reference: str
    new: list[Finding] = field(default_factory=list)
    unchanged: list[Finding] = field(default_factory=list)
    absent: list[Entry] = field(default_factory=list)
    #: Input errors of the earlier tree (``--since``): its designs that could not be linted then.
    earlier_errors: list[InputError] = field(default_factory=list)

    def summary(self) -> str:
        text = (f"compared with {self.reference}: {len(self.new)} new, {len(self.unchanged)} "
                f"unchanged (not shown), {len(self.absent)} fixed")
        if self.earlier_errors:
            text += f"; {len(self.earlier_errors)} input error(s) in the earlier tree"
        return text


# --- entries ------------------------------------------------------------------------------------

def checkout_path(file: str) -> str:
    """``file`` relative to its checkout root (POSIX), as baselines and reports name files."""
    from .report import relative_path, source_root
    resolved = Path(file).resolve()
    return relative_path(file, source_root(resolved.parent)) or resolved.as_posix()


def entry_of(f: Finding) -> Entry:
    return Entry(fingerprint=f.fingerprint, rule=f.rule, severity=f.severity.value,
                 file=checkout_path(f.location.file), line=f.location.line,
                 column=f.location.column, path=f.location.dotted, element=f.element,
                 message=f.message)


def entries_of(run: Any) -> list[Entry]:
    """The run's findings as baseline entries; waived ones are left out (see the module notes)."""
    # One entry per member of a grouped finding: the baseline still holds if the group splits.
    out = [replace(entry_of(f), fingerprint=p) for f in run.all_findings() if not f.waived
           for p in _prints(f)]
    out.sort(key=lambda e: (e.file, e.rule, e.path, e.element or "", e.fingerprint))
    return out


# --- baseline files -----------------------------------------------------------------------------

def write_baseline(run: Any, path: Path) -> int:
    """Record the run's findings in ``path``; returns how many. Stable output, fit for review."""
    entries = entries_of(run)
    doc = {"format": BASELINE_FORMAT, "tool": {"name": "packwarden", "version": __version__},
           "findings": [e.as_dict() for e in entries]}
    text = json.dumps(doc, indent=2, ensure_ascii=False) + "\n"
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text(text, encoding="utf-8")
    return len(entries)


def read_baseline(path: Path, shown: str | None = None) -> list[Entry]:
    """The entries of a baseline file; any mistake is one :class:`InputError` with its position."""
    shown = shown or str(path)
    try:
        text = read_limited(path, MAX_BASELINE_BYTES).decode("utf-8")
    except Refused as exc:
        if exc.message == "no such file":
            raise InputError(shown, 1, 1, "baseline file does not exist (write one with "
                                          "--write-baseline)") from None
        raise InputError(shown, 1, 1, f"baseline file cannot be read: {exc.message}") from None
    except UnicodeDecodeError as exc:
        raise InputError(shown, 1, 1, f"baseline file cannot be read: {exc}") from None
    deep = _too_deep(text)
    if deep is not None:
        raise InputError(shown, *deep, f"baseline nests deeper than {MAX_BASELINE_DEPTH} levels; "
                                       f"a baseline is a list of flat findings")
    try:
        doc = json.loads(text)
    except json.JSONDecodeError as exc:
        raise InputError(shown, exc.lineno, exc.colno, f"baseline is not valid JSON: {exc.msg}") \
            from None
    if not isinstance(doc, dict) or doc.get("format") != BASELINE_FORMAT:
        raise InputError(shown, 1, 1, f"not a packwarden baseline (expected \"format\": "
                                      f"\"{BASELINE_FORMAT}\")")
    items = doc.get("findings")
    if not isinstance(items, list):
        raise InputError(shown, 1, 1, "baseline has no \"findings\" list")
    entries = []
    for i, item in enumerate(items):
        if not isinstance(item, dict) or not all(
                isinstance(item.get(k), str) and item.get(k) for k in ("fingerprint", "rule", "file")):
            raise InputError(shown, _line_of_item(text, i), 1,
                             f"findings[{i}] needs the strings \"fingerprint\", \"rule\" and \"file\"")
        entries.append(Entry(
            fingerprint=item["fingerprint"], rule=item["rule"],
            severity=item.get("severity") if item.get("severity") in {s.value for s in Severity}
            else Severity.error.value,
            file=item["file"], line=_int(item.get("line")), column=_int(item.get("column")),
            path=str(item.get("path") or ""), element=item.get("element") if isinstance(
                item.get("element"), str) else None, message=str(item.get("message") or "")))
    return entries


#: A baseline holds a list of flat findings (depth 3); json would recurse on every level of a
#: deeper file until Python's recursion limit, and a baseline of 200 000 findings is ~80 MB.
MAX_BASELINE_DEPTH = 16
MAX_BASELINE_BYTES = 256 * 1024 * 1024
_JSON_NESTING = re.compile(r'"(?:[^"\\]|\\.)*"|[\[\]{}]')


def _too_deep(text: str) -> tuple[int, int] | None:
    """Line and column where ``text`` opens its (MAX_BASELINE_DEPTH + 1)-th level, or None.
    Strings are skipped whole, so a bracket inside one does not count."""
    depth = 0
    for m in _JSON_NESTING.finditer(text):
        token = m.group()
        if token in "[{":
            depth += 1
            if depth > MAX_BASELINE_DEPTH:
                line = text.count("\n", 0, m.start()) + 1
                return line, m.start() - (text.rfind("\n", 0, m.start()) + 1) + 1
        elif token in "]}":
            depth -= 1
    return None


def _int(value: Any) -> int:
    return value if isinstance(value, int) and not isinstance(value, bool) and value >= 1 else 1


def _line_of_item(text: str, index: int) -> int:
    """Line of the ``index``-th ``"fingerprint"`` key: where a person would look for the entry."""
    seen = -1
    for n, line in enumerate(text.splitlines(), 1):
        if '"fingerprint"' in line:
            seen += 1
            if seen == index:
                return n
    return 1


# --- comparing ----------------------------------------------------------------------------------

def compare(run: Any, earlier: Iterable[Entry], reference: str) -> tuple[Any, Comparison]:
    """Split ``run`` against ``earlier``: returns the run holding only new findings, and the split.

    The returned run is a copy; every formatter rendering it reports the new findings only, and
    its exit code counts only them (input errors still make it 2).
    """
    earlier = list(earlier)
    comparison = Comparison(reference=reference)
    remaining = Counter(e.fingerprint for e in earlier)
    designs = []
    for d in run.designs:
        kept = []
        for f in d.findings:
            prints = _prints(f)
            if any(remaining[p] > 0 for p in prints):
                for p in prints:  # a group takes every member it names out of the earlier set
                    if remaining[p] > 0:
                        remaining[p] -= 1
                comparison.unchanged.append(f)
            else:
                kept.append(f)
                comparison.new.append(f)
        designs.append(replace(d, findings=kept))
    now = Counter(p for f in run.all_findings() for p in _prints(f))
    for e in earlier:
        if now[e.fingerprint] > 0:
            now[e.fingerprint] -= 1
        else:
            comparison.absent.append(e)
    return replace(run, designs=designs), comparison


def _prints(f: Finding) -> tuple[str, ...]:
    """The fingerprints a finding answers to: its own and, for one cause reported once
    (``packwarden.grouping``), each member's as it was alone, so a baseline written before the
    grouping still matches the group (any member baselined counts it as unchanged)."""
    return tuple(dict.fromkeys((f.fingerprint, *f.merged)))


# --- --since REV --------------------------------------------------------------------------------

def _git(args: list[str], cwd: Path, **kw: Any) -> subprocess.CompletedProcess:
    return subprocess.run(["git", *args], cwd=cwd, capture_output=True, **kw)


def git_toplevel(start: Path) -> Path | None:
    try:
        proc = _git(["rev-parse", "--show-toplevel"], start, text=True)
    except OSError:
        return None
    if proc.returncode != 0:
        return None
    return Path(proc.stdout.strip()).resolve()


def lint_since(rev: str, paths: list[str], registry: Any, config: Path | None = None,
               fail_on: Severity | None = None) -> tuple[list[Entry], list[InputError]]:
    """Lint ``paths`` as they were at git revision ``rev``; returns their findings as entries.

    The designs, libraries and configuration come from ``rev``; the rules are ``registry``'s, the
    ones checking the current tree, so the two runs differ only in what was reviewed. Raises
    :class:`InputError` when ``rev`` or the repository cannot be used.
    """
    from .engine import lint
    start = _start_folder(paths)
    top = git_toplevel(start)
    shown_top = _shown(top) if top else _shown(start)
    if top is None:
        raise InputError(shown_top, 1, 1, f"--since {rev}: {shown_top} is not inside a git "
                                          f"repository")
    proc = _git(["rev-parse", "--verify", "--quiet", "--end-of-options", f"{rev}^{{commit}}"],
                top, text=True)
    if proc.returncode != 0:
        raise InputError(shown_top, 1, 1, f"--since {rev}: not a revision of the repository "
                                          f"(a shallow clone may lack it: fetch it first)")
    commit = proc.stdout.strip()
    with tempfile.TemporaryDirectory(prefix="packwarden-since-") as tmp:
        tree = Path(tmp)
        _extract(top, commit, tree)
        # The checkout marker the engine and reports look for, so repository-relative paths and
        # with them the fingerprints come out as they do in the working tree.
        (tree / ".git").mkdir(exist_ok=True)
        old_paths = []
        for p in paths:
            rel = _inside(Path(p), top)
            if rel is None:
                raise InputError(_shown(Path(p)), 1, 1, f"--since {rev}: {p} is outside the git "
                                                        f"repository {shown_top}")
            old = tree / rel
            if old.exists():  # a design added since has no earlier findings: all of its are new
                old_paths.append(str(old))
        cfg = None
        if config is not None:
            rel = _inside(config, top)
            cfg = tree / rel if rel is not None and (tree / rel).is_file() else config
        if not old_paths:
            return [], []
        earlier = lint(old_paths, config=cfg, registry=registry, fail_on=fail_on)
        return entries_of(earlier), earlier.input_errors()


def _start_folder(paths: list[str]) -> Path:
    for p in paths:
        path = Path(p)
        if path.exists():
            return path if path.is_dir() else path.parent
    return Path.cwd()


def _inside(path: Path, top: Path) -> Path | None:
    try:
        return path.resolve().relative_to(top)
    except ValueError:
        return None


def _shown(path: Path) -> str:
    from .library import shown_path
    return shown_path(path) or "."


def _extract(top: Path, commit: str, dest: Path) -> None:
    """Write the revision's designs, libraries and configs under ``dest``, touching no git state.

    Read with ``ls-tree`` and one ``cat-file --batch``: no index, work tree or worktree list of
    the repository changes, and a repository's binary files are never read.
    """
    listing = _git(["ls-tree", "-r", "-z", "--full-tree", commit], top)
    if listing.returncode != 0:
        raise InputError(_shown(top), 1, 1, f"git ls-tree failed: "
                                            f"{listing.stderr.decode(errors='replace').strip()}")
    wanted: list[tuple[str, str, str]] = []  # (mode, blob, path)
    for entry in listing.stdout.split(b"\0"):
        if not entry:
            continue
        meta, _, name = entry.partition(b"\t")
        mode, kind, blob = meta.decode().split()
        path = os.fsdecode(name)
        if kind != "blob" or not path.lower().endswith(REVISION_SUFFIXES):
            continue
        wanted.append((mode, blob, path))
    if not wanted:
        return
    batch = _git(["cat-file", "--batch"], top,
                 input="".join(f"{blob}\n" for _, blob, _ in wanted).encode())
    data, pos = batch.stdout, 0
    for mode, blob, path in wanted:
        header_end = data.index(b"\n", pos)
        size = int(data[pos:header_end].split()[2])
        body = data[header_end + 1:header_end + 1 + size]
        pos = header_end + 1 + size + 1  # the blob is followed by a newline
        target = dest / path
        if not _inside(target, dest.resolve()):
            continue  # a path that would leave the temporary tree is never written
        target.parent.mkdir(parents=True, exist_ok=True)
        if mode == "120000":  # a symbolic link: its blob is the link's target
            try:
                os.symlink(os.fsdecode(body), target)
            except OSError:
                pass
        else:
            target.write_bytes(body)
