"""The language server's state without the protocol (``packwarden.lsp.live``): what it shows, what
it keeps, and that nothing goes stale. End-to-end checks over stdio are in test_lsp.py.

The reference for positions and findings is the command line's own report of the same design
(``packwarden check``); for the state, the issue's rule that the server holds no more than the
open documents.
"""

from __future__ import annotations

import json
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from packwarden.lsp import live
from packwarden.lsp.live import LiveLinter

REPO = Path(__file__).resolve().parent.parent
FLAWED = "flawed/fet-voltage-too-low.yaml"


@pytest.fixture
def project(tmp_path: Path) -> Path:
    shutil.copytree(REPO / "example_designs", tmp_path / "designs")
    (tmp_path / "packwarden.toml").write_text("", encoding="utf-8")
    return tmp_path / "designs"


def rules_of(notes) -> list[str | None]:
    return [n.code for n in notes]


def test_an_exception_in_a_lint_is_a_note_at_1_1_and_the_linter_goes_on(
        project: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    design = project / FLAWED
    text = design.read_text(encoding="utf-8")
    linter = LiveLinter()
    real = live.lint_file

    def broken(*args, **kwargs):
        raise ZeroDivisionError("float division by zero")

    monkeypatch.setattr(live, "lint_file", broken)
    (note,) = linter.lint_design(design, text)
    assert (note.file, note.line, note.column, note.severity) == (design, 1, 1, "error")
    assert "ZeroDivisionError: float division by zero" in note.message
    assert not linter.designs  # nothing half-made is kept
    monkeypatch.setattr(live, "lint_file", real)
    assert "switch-voltage-margin" in rules_of(linter.lint_design(design, text))


def test_a_library_changed_on_disk_is_read_again_without_a_save_event(project: Path) -> None:
    # A checkout or another tool writes the library; the editor says nothing. The next lint
    # must see the new text: the FET that blocks 40 V (80 % of it covers the 28.3 V the
    # command line asks for) clears the finding.
    design = project / FLAWED
    library = project / "parts" / "orchard-parts.yaml"
    text = design.read_text(encoding="utf-8")
    linter = LiveLinter()
    assert "switch-voltage-margin" in rules_of(linter.lint_design(design, text))
    assert linter.dependents(library) == [design]
    lib = library.read_text(encoding="utf-8")
    at = lib.index("vds_max: 20 V", lib.index("OR-FET-D20:"))
    library.write_text(lib[:at] + "vds_max: 40 V  " + lib[at + 13:], encoding="utf-8")
    assert "switch-voltage-margin" not in rules_of(linter.lint_design(design, text))


def test_a_broken_library_is_shown_in_the_library_and_summed_up_in_the_design(
        project: Path) -> None:
    design = project / FLAWED
    library = project / "parts" / "orchard-parts.yaml"
    lib = library.read_text(encoding="utf-8")
    library.write_text(lib.replace("vds_max: 20 V", "vds_max: 20", 1), encoding="utf-8")
    linter = LiveLinter()
    notes = linter.lint_design(design, design.read_text(encoding="utf-8"))
    in_library = [n for n in notes if n.file == library]
    in_design = [n for n in notes if n.file == design]
    row = lib.splitlines().index("    vds_max: 20 V") + 1
    assert [(n.line, n.code) for n in in_library] == [(row, "input-error")]
    (summary,) = in_design
    assert summary.message.startswith("not reviewed: ") and summary.related[0].line == row
    # The library opened in the editor checks its own text, unsaved
    assert [n.line for n in linter.lint_library(library, library.read_text())] == [row]
    assert linter.lint_library(library, lib) == []


def test_a_config_error_is_shown_in_the_config(project: Path) -> None:
    config = project.parent / "packwarden.toml"
    config.write_text('fail_on = "warning"\nignroe = ["storage-drain"]\n', encoding="utf-8")
    design = project / FLAWED
    linter = LiveLinter()
    notes = linter.lint_design(design, design.read_text(encoding="utf-8"))
    # as `packwarden check` reports it: config file, line 2, column 1
    in_config = [(n.line, n.column, n.message) for n in notes if n.file == config]
    assert in_config == [(2, 1, "unknown config key 'ignroe' (did you mean 'ignore'?)")]
    (summary,) = [n for n in notes if n.file == design]
    assert summary.message.startswith("not reviewed: ") and (summary.line, summary.column) == (1, 1)
    assert [(n.file, n.line) for n in linter.lint_config(config)] == [(config, 2)]
    config.write_text('ignore = ["storage-drain"]\n', encoding="utf-8")
    assert linter.lint_config(config) == []
    assert linter.dependents(config) == [design]


def test_waived_findings_are_hints_with_the_reason(project: Path) -> None:
    design = project / FLAWED
    text = design.read_text(encoding="utf-8") + (
        "waivers:\n"
        "  - {rule: switch-voltage-margin, element: Q1, reason: port keyed against the adapter}\n")
    notes = LiveLinter().lint_design(design, text)
    margin = [n for n in notes if n.code == "switch-voltage-margin"]
    assert margin and all(n.severity == "hint" for n in margin)
    assert all(n.message.startswith("waived (port keyed against the adapter): ") for n in margin)


def test_the_rule_reference_it_links_to_is_removed_when_it_is_done(project: Path) -> None:
    linter = LiveLinter()
    design = project / FLAWED
    linter.lint_design(design, design.read_text(encoding="utf-8"))
    link = linter.rule_docs(design, "switch-voltage-margin")
    assert link is not None and link.endswith("#switch-voltage-margin")
    reference = Path(link.split("#")[0].removeprefix("file://"))
    assert "\n## switch-voltage-margin\n" in reference.read_text(encoding="utf-8")
    assert linter.rule_docs(design, "no-such-rule") is None
    linter.dispose()
    assert not reference.parent.exists()


def test_it_holds_no_more_than_the_open_documents(project: Path) -> None:
    linter = LiveLinter()
    first, second = project / FLAWED, project / "orchard-probe.yaml"
    for design in (first, second):
        linter.lint_design(design, design.read_text(encoding="utf-8"))
    assert set(linter.designs) == {first, second} and len(linter.sessions) == 1
    session = next(iter(linter.sessions.values()))[0]
    assert set(session.libraries.loaded) == {(project / "parts" / "orchard-parts.yaml").resolve()}
    linter.close(first)
    assert set(linter.designs) == {second} and session.libraries.loaded
    linter.close(second)
    assert linter.designs == {} and linter.sessions == {}


def test_check_does_not_import_the_language_server() -> None:
    code = ("import sys; from packwarden.engine import lint; import packwarden.cli; "
            "lint(['example_designs/orchard-probe.yaml']); "
            "print(sorted(m for m in sys.modules if m.split('.')[0] in ('pygls', 'lsprotocol') "
            "or m.startswith('packwarden.lsp')))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, cwd=REPO)
    assert out.stdout.strip() == "[]", out.stderr


def test_without_pygls_the_command_says_which_extra_to_install() -> None:
    code = ("import sys; sys.modules['pygls'] = None; sys.argv = ['packwarden', 'lsp']; "
            "from packwarden.cli import main; main()")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, cwd=REPO)
    assert out.returncode == 2
    assert out.stderr.count("\n") == 1 and "pip install 'packwarden[lsp]'" in out.stderr
    assert "Traceback" not in out.stderr


def test_an_editor_note_carries_the_assumptions_and_a_waivers_ceiling(project: Path) -> None:
    # The trip-below-load example's trip window rests on a gate drive the path lowers (an
    # assumption the model states, shown under the finding); the finding's headline figure is
    # the trip minimum 1.4 A, worse as it falls, so a waiver down to 1.5 A leaves it counting
    # and says so.
    design = project / "flawed/trip-below-load.yaml"
    text = design.read_text(encoding="utf-8") + (
        "waivers:\n"
        "  - {rule: trip-current-window, element: U1, reason: bench-tested, down_to: 1.5 A}\n")
    notes = [n for n in LiveLinter().lint_design(design, text) if n.code == "trip-current-window"]
    assert notes and all(n.severity == "error" for n in notes)
    assert all("\nassumes: " in n.message for n in notes)
    assert all("down to 1.5 A does not cover trip min 1.4 A" in n.message for n in notes)


def test_a_grouped_finding_is_shown_on_every_members_line() -> None:
    # The command line's JSON report is the reference: it gives the grouped finding's first
    # place and its members' places; the editor must mark each of those lines with the finding.
    design = REPO / "tests/rules/designs/grouping/four-parallel.yaml"
    report = subprocess.run(
        [sys.executable, "-m", "packwarden.cli", "check", "-f", "json", str(design)],
        capture_output=True, text=True, cwd=REPO)
    found = [f for d in json.loads(report.stdout)["designs"] for f in d["findings"]
             if f["rule"] == "switch-current-sharing"]
    assert found and all(len(f["members"]) == 4 for f in found)
    notes = [n for n in LiveLinter().lint_design(design, design.read_text(encoding="utf-8"))
             if n.code == "switch-current-sharing"]
    for f in found:
        lines = {f["location"]["line"]} | {m["line"] for m in f["member_locations"]}
        assert len(lines) == 4  # Q1–Q4 (or Q5–Q8) are four components on four lines
        shown = {n.line for n in notes if n.message == f["message"] + f"\nhint: {f['hint']}"
                 + "".join(f"\nassumes: {a}" for a in f.get("assumptions", []))}
        assert shown == lines
        assert all(n.file == design for n in notes)
