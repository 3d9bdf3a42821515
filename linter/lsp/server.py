"""The protocol side of ``packwarden lsp``: pygls over stdio, full document sync.

- A design (``format: packwarden/1``) is linted when opened, and again 300 ms after the last
  change (typing does not queue a lint per key); its findings, input errors and the errors of
  the files it reads (libraries, config, policy) are published, each in its own file.
- A part library (``format: packwarden-parts/1``) shows its own mistakes from the editor's text;
  saving it, or a config or policy, re-lints the open designs that read it.
- Hover on a component reference or a part id (see :mod:`.live`).

Each file's diagnostics are the union of what every open document says about it (a library's
own check, and each design that reads it), so closing one design takes back only its share.
Every handler catches what it raises: a fault becomes a diagnostic or a log line, never the end
of the server.
"""

from __future__ import annotations

import asyncio
import logging
import re
import sys
from pathlib import Path

from lsprotocol import types as lsp
from pygls.lsp.server import LanguageServer
from pygls.uris import from_fs_path, to_fs_path

from .. import __version__
from .live import LiveLinter, Note, absolute, is_config, is_design, is_library

#: Seconds of quiet after the last change before a design is linted again.
DEBOUNCE = 0.3

SEVERITIES = {"error": lsp.DiagnosticSeverity.Error, "warning": lsp.DiagnosticSeverity.Warning,
              "info": lsp.DiagnosticSeverity.Information, "hint": lsp.DiagnosticSeverity.Hint}

# The token a diagnostic underlines: from its column to the next space, comma or bracket, or to
# the colon that ends a key.
_TOKEN = re.compile(r"[^\s,{}\[\]]+?(?=:\s|:$|[\s,{}\[\]]|$)")

log = logging.getLogger(__name__)


class PackwardenServer(LanguageServer):
    def __init__(self) -> None:
        super().__init__("packwarden", __version__,
                         text_document_sync_kind=lsp.TextDocumentSyncKind.Full)
        self.live = LiveLinter()
        #: source document URI -> target file URI -> diagnostics the source puts there
        self.shares: dict[str, dict[str, list[lsp.Diagnostic]]] = {}
        self.pending: dict[str, asyncio.TimerHandle] = {}
        #: open designs' URIs as the client spells them, by the path the linter knows them by
        self.uris: dict[Path, str] = {}

    # --- linting -------------------------------------------------------------------------------

    def lint(self, uri: str) -> None:
        """Lint an open document by what it is, and publish what it says about every file."""
        self.pending.pop(uri, None)
        try:
            doc = self.workspace.text_documents.get(uri)
            path = _path(uri)
            if doc is None or path is None:
                return
            text = doc.source
            if is_design(text):
                self.uris[absolute(path)] = uri
                notes = self.live.lint_design(path, text)
            else:  # not, or no longer, a design
                self.live.close(path)
                self.uris.pop(absolute(path), None)
                if is_library(text):
                    notes = self.live.lint_library(path, text)
                elif is_config(path):
                    notes = self.live.lint_config(path)
                else:
                    notes = []
        except Exception as exc:  # last resort: the editor shows it, the server goes on
            log.exception("lint of %s failed", uri)
            notes = [Note(Path(to_fs_path(uri) or "."), 1, 1, "error",
                          f"packwarden could not lint this file: {type(exc).__name__}: {exc}")]
            path = None
        self.share(uri, notes, design=path)

    def share(self, source: str, notes: list[Note], design: Path | None = None) -> None:
        before = set(self.shares.get(source, {}))
        now: dict[str, list[lsp.Diagnostic]] = {}
        own = _path(source)
        lines: dict[str, list[str]] = {}
        for note in notes:
            # the source's own notes under the URI the client gave it, however it spells paths
            target = source if own is not None and note.file == absolute(own) else \
                from_fs_path(str(note.file)) or source
            if target not in lines:
                lines[target] = self.lines_of(target, note.file)
            now.setdefault(target, []).append(self.diagnostic(note, lines[target], design))
        self.shares[source] = now
        for target in before | set(now) | {source}:  # the source's own, even when now clean
            self.publish(target)

    def publish(self, target: str) -> None:
        seen, out = set(), []
        for share in self.shares.values():
            for d in share.get(target, ()):
                key = (d.range.start.line, d.range.start.character, d.severity, d.message)
                if key not in seen:
                    seen.add(key)
                    out.append(d)
        self.text_document_publish_diagnostics(
            lsp.PublishDiagnosticsParams(uri=target, diagnostics=out))

    def diagnostic(self, note: Note, lines: list[str], design: Path | None) -> lsp.Diagnostic:
        href = self.live.rule_docs(design, note.code) if design and note.code else None
        related = []
        for r in note.related:
            where = from_fs_path(str(r.file)) or ""
            related.append(lsp.DiagnosticRelatedInformation(
                location=lsp.Location(uri=where, range=self.span(
                    self.lines_of(where, r.file), r.line, r.column)), message=r.message))
        return lsp.Diagnostic(
            range=self.span(lines, note.line, note.column),
            message=note.message, severity=SEVERITIES[note.severity], source="packwarden",
            code=note.code,
            code_description=lsp.CodeDescription(href=href) if href else None,
            related_information=related or None)

    def span(self, lines: list[str], line: int, column: int) -> lsp.Range:
        """The token at a 1-based line and code-point column, in the client's units."""
        row = max(line - 1, 0)
        start = max(column - 1, 0)
        end = start
        if row < len(lines):
            m = _TOKEN.match(lines[row], start)
            end = m.end() if m else min(start + 1, len(lines[row]))
        codec = self.workspace.position_codec
        return lsp.Range(start=codec.position_to_client_units(lines, lsp.Position(row, start)),
                         end=codec.position_to_client_units(lines, lsp.Position(row, end)))

    def lines_of(self, uri: str, file: Path) -> list[str]:
        """The file's lines: the editor's text if it is open, else as saved."""
        doc = self.workspace.text_documents.get(uri)
        if doc is not None:
            return list(doc.lines)
        try:
            return file.read_text(encoding="utf-8", errors="replace").splitlines(True)
        except OSError:
            return []

    def soon(self, uri: str) -> None:
        """Lint ``uri`` once the changes have paused for :data:`DEBOUNCE` seconds."""
        waiting = self.pending.pop(uri, None)
        if waiting is not None:
            waiting.cancel()
        self.pending[uri] = asyncio.get_running_loop().call_later(DEBOUNCE, self.lint, uri)

    def saved(self, uri: str) -> None:
        """A file other than an open design was written: re-lint the open designs that read it
        (and a config or library itself, whose own check reads the saved file)."""
        path = _path(uri)
        if path is None:
            return
        self.live.forget(path)
        for design in self.live.dependents(path):
            if design in self.uris:
                self.lint(self.uris[design])
        if uri in self.workspace.text_documents and not is_design(
                self.workspace.text_documents[uri].source):
            self.lint(uri)

    def closed(self, uri: str) -> None:
        waiting = self.pending.pop(uri, None)
        if waiting is not None:
            waiting.cancel()
        path = _path(uri)
        if path is not None:
            self.live.close(path)
            self.uris.pop(absolute(path), None)
        self.share(uri, [])
        self.shares.pop(uri, None)


def _path(uri: str) -> Path | None:
    fs = to_fs_path(uri)
    return Path(fs) if fs and uri.startswith("file:") else None


server = PackwardenServer()


def _on_document(handle):
    """A handler of a notification about one open document: ``handle(server, its URI)``."""
    def notified(ls: PackwardenServer, params) -> None:
        handle(ls, params.text_document.uri)
    return notified


for _method, _handle in ((lsp.TEXT_DOCUMENT_DID_OPEN, PackwardenServer.lint),
                         (lsp.TEXT_DOCUMENT_DID_CHANGE, PackwardenServer.soon),
                         (lsp.TEXT_DOCUMENT_DID_SAVE, PackwardenServer.saved),
                         (lsp.TEXT_DOCUMENT_DID_CLOSE, PackwardenServer.closed)):
    server.feature(_method)(_on_document(_handle))


@server.feature(lsp.WORKSPACE_DID_CHANGE_WATCHED_FILES)
def did_change_watched(ls: PackwardenServer, params: lsp.DidChangeWatchedFilesParams) -> None:
    # Files changed outside the editor (a checkout, another tool): as if saved here.
    for change in params.changes:
        if change.uri not in ls.workspace.text_documents or not is_design(
                ls.workspace.text_documents[change.uri].source):
            ls.saved(change.uri)


@server.feature(lsp.TEXT_DOCUMENT_HOVER)
def hover(ls: PackwardenServer, params: lsp.HoverParams) -> lsp.Hover | None:
    try:
        doc = ls.workspace.text_documents.get(params.text_document.uri)
        path = _path(params.text_document.uri)
        if doc is None or path is None:
            return None
        lines = list(doc.lines)
        at = ls.workspace.position_codec.position_from_client_units(lines, params.position)
        text = ls.live.hover(path, at.line + 1, at.character, doc.source)
    except Exception:  # a hover that fails shows nothing; the server goes on
        log.exception("hover failed")
        return None
    if text is None:
        return None
    return lsp.Hover(contents=lsp.MarkupContent(kind=lsp.MarkupKind.Markdown, value=text))


@server.feature(lsp.INITIALIZED)
def initialized(ls: PackwardenServer, params: lsp.InitializedParams) -> None:
    # Ask to hear of libraries and configs changed outside the editor, where the client can
    # be asked; others are caught at the next lint by the files' stamps (see live.py).
    watched = ls.client_capabilities.workspace and \
        ls.client_capabilities.workspace.did_change_watched_files
    if watched and watched.dynamic_registration:
        ls.client_register_capability(lsp.RegistrationParams(registrations=[lsp.Registration(
            id="packwarden-watched-files", method=lsp.WORKSPACE_DID_CHANGE_WATCHED_FILES,
            register_options=lsp.DidChangeWatchedFilesRegistrationOptions(watchers=[
                lsp.FileSystemWatcher(glob_pattern=pattern)
                for pattern in ("**/*.yaml", "**/*.yml", "**/*.toml")]))]))


def serve() -> None:
    """Serve one editor over stdin and stdout until it says exit."""
    stdin, stdout = sys.stdin.buffer, sys.stdout.buffer
    # The protocol owns standard output: a rule's stray print() would corrupt its messages.
    sys.stdout = sys.stderr
    try:
        server.start_io(stdin, stdout)
    finally:
        server.live.dispose()
