"""``packwarden lsp`` end to end: the server in a subprocess, driven over stdio by pytest-lsp's
client as an editor would drive it.

The references are outside the server: the command line's ``file:line:column`` for the same
design (the diagnostic must sit where ``packwarden check`` says), and the Language Server
Protocol 3.17 specification [published] for what the client sees: positions are zero-based
lines and UTF-16 columns, ``textDocument/publishDiagnostics`` replaces a file's diagnostics
(an empty list clears them), severities 1 error … 4 hint.

The waits below are liveness bounds, not speed targets (those are in bench/run.py, which
times a warm re-lint after an edit): a lint after an edit arrives 0.3 s after the change plus
the lint's milliseconds, so a bound several times that only fails when the server is stuck.
"""

from __future__ import annotations

import asyncio
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

pytest.importorskip("pygls", reason="packwarden lsp needs the 'lsp' extra (pygls)")
pytest_lsp = pytest.importorskip("pytest_lsp")
from lsprotocol import types  # noqa: E402
from pytest_lsp import ClientServerConfig, LanguageClient  # noqa: E402

REPO = Path(__file__).resolve().parent.parent
EXAMPLES = REPO / "example_designs"
FLAWED = "flawed/fet-voltage-too-low.yaml"
WAIT = 10.0  # seconds; see the module's docstring


@pytest_lsp.fixture(config=ClientServerConfig(
    server_command=[sys.executable, "-m", "packwarden.cli", "lsp"]))
async def client(lsp_client: LanguageClient):
    await lsp_client.initialize_session(types.InitializeParams(
        capabilities=types.ClientCapabilities()))
    yield
    await lsp_client.shutdown_session()


@pytest.fixture
def project(tmp_path: Path) -> Path:
    """The example designs and their libraries in a project of their own (a config marks its
    root, inside which libraries must lie)."""
    shutil.copytree(EXAMPLES, tmp_path / "designs")
    (tmp_path / "packwarden.toml").write_text("", encoding="utf-8")
    return tmp_path / "designs"


def uri(path: Path) -> str:
    return path.resolve().as_uri()


def open_doc(client: LanguageClient, path: Path, text: str | None = None) -> None:
    client.text_document_did_open(types.DidOpenTextDocumentParams(
        text_document=types.TextDocumentItem(
            uri=uri(path), language_id="yaml", version=1,
            text=path.read_text(encoding="utf-8") if text is None else text)))


def change(client: LanguageClient, path: Path, text: str, version: int = 2) -> None:
    client.text_document_did_change(types.DidChangeTextDocumentParams(
        text_document=types.VersionedTextDocumentIdentifier(uri=uri(path), version=version),
        content_changes=[types.TextDocumentContentChangeWholeDocument(text=text)]))


async def until(client: LanguageClient, path: Path, check, what: str) -> list[types.Diagnostic]:
    """The file's diagnostics once ``check`` holds for them, waiting for publications."""
    loop = asyncio.get_running_loop()
    deadline = loop.time() + WAIT
    while True:
        diagnostics = client.diagnostics.get(uri(path))
        if diagnostics is not None and check(diagnostics):
            return diagnostics
        left = deadline - loop.time()
        if left <= 0:
            pytest.fail(f"no diagnostics where {what} within {WAIT} s; last: {diagnostics}")
        try:
            await asyncio.wait_for(
                client.wait_for_notification(types.TEXT_DOCUMENT_PUBLISH_DIAGNOSTICS), left)
        except asyncio.TimeoutError:
            pass


def of_rule(rule: str):
    return lambda ds: [d for d in ds if d.code == rule]


def cli_output(design: Path) -> str:
    return subprocess.run([sys.executable, "-m", "packwarden.cli", "check", str(design)],
                          capture_output=True, text=True, encoding="utf-8",
                          cwd=design.parent).stdout


def cli_lines(design: Path, rule: str) -> set[tuple[int, int]]:
    """(line, column) of each finding of ``rule`` as ``packwarden check`` prints it."""
    found = set()
    for line in cli_output(design).splitlines():
        head, _, rest = line.partition(f": error {rule}:")
        if rest:
            _, row, col = head.rsplit(":", 2)
            found.add((int(row), int(col)))
    return found


def fixed(text: str) -> str:
    """The flawed design with its flaw undone: the charger port no longer meets 24 V."""
    assert "open_circuit_max: 24 V" in text
    return text.replace("open_circuit_max: 24 V", "open_circuit_max: 5.5 V")


@pytest.mark.asyncio
async def test_a_finding_sits_on_the_line_the_command_line_names_and_the_fix_clears_it(
        client: LanguageClient, project: Path) -> None:
    design = project / FLAWED
    expected = cli_lines(design, "switch-voltage-margin")
    assert expected, "the command line reports the flaw"
    open_doc(client, design)
    found = await until(client, design, of_rule("switch-voltage-margin"),
                        "switch-voltage-margin is reported")
    ours = of_rule("switch-voltage-margin")(found)
    # LSP positions are zero-based, the command line's one-based
    assert {(d.range.start.line + 1, d.range.start.character + 1) for d in ours} == expected
    for d in ours:
        assert d.severity == types.DiagnosticSeverity.Error
        assert d.source == "packwarden"
        assert "must block" in d.message and "\nhint: " in d.message
        assert d.code_description is not None
        anchor = d.code_description.href
        assert anchor.startswith("file:") and anchor.endswith("#switch-voltage-margin")
        reference = Path(anchor.split("#")[0].removeprefix("file://")).read_text(encoding="utf-8")
        assert "\n## switch-voltage-margin\n" in reference
    # The design on disk keeps its flaw: what clears it is the editor's text.
    change(client, design, fixed(design.read_text(encoding="utf-8")))
    await until(client, design, lambda ds: not of_rule("switch-voltage-margin")(ds),
                "the fix cleared switch-voltage-margin")
    assert "24 V" in design.read_text(encoding="utf-8")


@pytest.mark.asyncio
async def test_broken_yaml_is_an_error_at_its_line(client: LanguageClient, project: Path) -> None:
    design = project / "orchard-probe.yaml"
    text = design.read_text(encoding="utf-8")
    open_doc(client, design)
    await until(client, design, lambda ds: True, "the clean design is linted")
    lines = text.splitlines(True)
    row = next(i for i, ln in enumerate(lines) if ln.startswith("load:"))
    lines[row + 1] = lines[row + 1].replace("continuous: 1.2 A", "continuous: [1.2 A")
    change(client, design, "".join(lines))
    found = await until(client, design, of_rule("input-error"), "an input error is reported")
    (error,) = of_rule("input-error")(found)
    assert error.severity == types.DiagnosticSeverity.Error
    assert "YAML syntax error" in error.message
    # the YAML parser finds an unclosed flow sequence where the next key begins, or on its line
    assert row + 1 <= error.range.start.line <= row + 2


@pytest.mark.asyncio
async def test_columns_are_counted_in_utf_16_as_the_protocol_says(
        client: LanguageClient, project: Path) -> None:
    # The command line counts columns in code points; LSP 3.17 (Position) in UTF-16 code units
    # unless the client agrees otherwise: a pear (U+1F350, outside the BMP) takes two.
    design = project / "orchard-probe.yaml"
    text = design.read_text(encoding="utf-8").replace(
        "design: {name: Orchard soil probe, revision: C}",
        'design: {name: "Orchard \U0001F350 probe", revision: C, colour: green}')
    design.write_text(text, encoding="utf-8")
    (expected,) = [ln for ln in cli_output(design).splitlines() if "unknown key 'colour'" in ln]
    row, column = (int(x) for x in expected.split(": ")[0].rsplit(":", 2)[1:])
    open_doc(client, design)
    found = await until(client, design, of_rule("input-error"), "the unknown key is reported")
    start = found[0].range.start
    assert (start.line + 1, start.character + 1) == (row, column + 1)
    assert found[0].range.end.character - start.character == len("colour")


@pytest.mark.asyncio
async def test_saving_a_library_relints_the_open_designs_that_use_it(
        client: LanguageClient, project: Path) -> None:
    design = project / FLAWED
    library = project / "parts" / "orchard-parts.yaml"
    open_doc(client, design)
    await until(client, design, of_rule("switch-voltage-margin"), "the flaw is reported")
    # A broken library: its error in the library's own file, and the design says why it is
    # not reviewed.
    original = library.read_text(encoding="utf-8")
    library.write_text(original.replace("parts:\n", "parts:\n  : [\n", 1), encoding="utf-8")
    client.text_document_did_save(types.DidSaveTextDocumentParams(
        text_document=types.TextDocumentIdentifier(uri=uri(library))))
    lib_errors = await until(client, library, of_rule("input-error"),
                             "the library's own error is in the library file")
    assert lib_errors[0].range.start.line >= original.splitlines().index("parts:")
    summary = await until(client, design, of_rule("input-error"), "the design is not reviewed")
    assert "not reviewed" in summary[0].message
    assert summary[0].range.start.line == design.read_text().splitlines().index(
        "libraries: [../parts/orchard-parts.yaml]")
    # A library whose FET blocks 40 V: 80 % of it, 32 V, covers the 28.3 V the command line
    # asked for (the switch-voltage-margin message's own figures). Written by another tool this
    # time: the editor reports it as a watched file that changed.
    row = original.index("vds_max: 20 V", original.index("OR-FET-D20:"))
    library.write_text(original[:row] + "vds_max: 40 V" + original[row + 13:], encoding="utf-8")
    client.workspace_did_change_watched_files(types.DidChangeWatchedFilesParams(changes=[
        types.FileEvent(uri=uri(library), type=types.FileChangeType.Changed)]))
    await until(client, design, lambda ds: not of_rule("switch-voltage-margin")(ds)
                and not of_rule("input-error")(ds), "the stronger FET cleared the finding")
    await until(client, library, lambda ds: not ds, "the library's error is gone")


@pytest.mark.asyncio
async def test_a_rule_that_raises_is_reported_and_the_server_goes_on(
        client: LanguageClient, project: Path) -> None:
    root = project.parent
    (root / "packwarden.toml").write_text('rule_paths = ["team_rules"]\n', encoding="utf-8")
    (root / "team_rules").mkdir()
    (root / "team_rules" / "boom.py").write_text(
        "from packwarden import rule\n\n\n"
        "@rule(id='always-raises', summary='raises, so the server must carry on')\n"
        "def check(ctx, options):\n"
        "    print('a rule that prints')\n"
        "    raise RuntimeError('deliberate failure')\n"
        "    yield\n", encoding="utf-8")
    design = project / FLAWED
    open_doc(client, design)
    found = await until(client, design, lambda ds: any("always-raises" in d.message for d in ds),
                        "the raising rule is reported")
    (failed,) = [d for d in found if "always-raises" in d.message]
    assert (failed.range.start.line, failed.range.start.character) == (0, 0)
    assert "deliberate failure" in failed.message
    assert of_rule("switch-voltage-margin")(found), "the other rules still ran"
    change(client, design, fixed(design.read_text(encoding="utf-8")))
    await until(client, design, lambda ds: not of_rule("switch-voltage-margin")(ds),
                "the server still lints after the failure")


@pytest.mark.asyncio
async def test_hover_shows_a_switch_s_figures_and_a_part_s_ratings(
        client: LanguageClient, project: Path) -> None:
    design = project / FLAWED
    text = design.read_text(encoding="utf-8")
    open_doc(client, design)
    await until(client, design, of_rule("switch-voltage-margin"), "the design is linted")
    row = next(i for i, ln in enumerate(text.splitlines()) if ln.startswith("  Q1:"))
    line = text.splitlines()[row]

    async def hover_at(column: int) -> str:
        result = await client.text_document_hover_async(types.HoverParams(
            text_document=types.TextDocumentIdentifier(uri=uri(design)),
            position=types.Position(line=row, character=column)))
        assert result is not None
        return result.contents.value

    on_refdes = await hover_at(line.index("Q1") + 1)
    # the trip window the command line prints for this design ("over-current trip 1.62 A–7.72 A
    # (typ 3.62 A)" in its figures line)
    figures = next(ln for ln in cli_output(design).splitlines() if ": figures: " in ln)
    trip = figures.split("over-current trip ")[1].split(";")[0]
    assert "over-current trip: " + trip.replace("–", " to ") in on_refdes
    assert "junction temperature, continuous load" in on_refdes
    assert "switch-voltage-margin" in on_refdes and "must block 28.3 V" in on_refdes
    on_part = await hover_at(line.index("OR-FET-D20") + 3)
    # the library entry's ratings, as the library writes them
    assert "vds_max: 20 V" in on_part and "tj_max: 150 °C" in on_part
