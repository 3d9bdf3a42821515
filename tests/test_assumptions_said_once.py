"""An assumption is said once: in the finding's assumptions (text, JUnit and Markdown `assumes:`
lines, JSON and SARIF fields, the HTML list), never again inside its message.

Walks every example design and every flawed one; the assumptions are the model's own notes, so
the check is that the text a reader sees under the finding is not also woven into its sentence.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from packwarden.engine import Session, lint, lint_file, load_registry
from packwarden.report import RenderOptions, formatter

REPO = Path(__file__).resolve().parent.parent
DESIGNS = sorted((REPO / "example_designs").glob("*.yaml")) + sorted(
    (REPO / "example_designs" / "flawed").glob("*.yaml"))
SESSION = Session(load_registry())


@pytest.mark.parametrize("path", DESIGNS, ids=lambda p: p.stem)
def test_no_message_repeats_its_assumptions(path: Path) -> None:
    shown = path.relative_to(REPO).as_posix()
    for f in lint_file(SESSION, path, shown).findings:
        for note in f.assumptions:
            # a note may carry a corner's prefix ("min: ...") that a message would have dropped
            assert note.removeprefix("min: ") not in f.message, (f.rule, f.key, note)


def test_the_text_report_says_an_assumption_once() -> None:
    # the storage rule's standby assumption on the flawed pack that leaves its LED on: said once
    # in the assumes: line, no longer also in the message
    run = lint(["example_designs/flawed/ridgeline-led-always-on.yaml"])
    text = formatter("text")(run, RenderOptions())
    note = "no storage standby_current: the product draws nothing on the shelf"
    assert text.count(note) == 1
    assert f"    assumes: {note}" in text
