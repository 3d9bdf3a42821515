"""An output format of our own: the findings as CSV, one row each, for the review tracker.

Registered in ``pyproject.toml`` under ``[project.entry-points."packwarden.formats"]`` as
``tallgrass-csv``, so ``packwarden check --format tallgrass-csv --output review.csv designs/``
writes it. A format is one function, ``render(run, options) -> str``, over the run every built-in
format reads (``packwarden.engine.RunResult``); it never changes the findings or the exit code.
"""

from __future__ import annotations

import csv
import io

COLUMNS = ("file", "line", "column", "severity", "rule", "element", "message", "hint", "waived")

# A cell starting with one of these is read as a formula by spreadsheet programs; part names and
# messages come from the files under review, so such a cell is quoted as text with a leading
# apostrophe [practice: OWASP, "CSV Injection"].
_FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


def _cell(value: object) -> object:
    if isinstance(value, str) and value.startswith(_FORMULA_START):
        return "'" + value
    return value


def render(run, options) -> str:
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow(COLUMNS)

    def row(*values: object) -> None:
        writer.writerow([_cell(v) for v in values])

    for origin, message in run.broken_plugins:
        row(origin, 1, 1, "plugin-error", "", "", message, "", "")
    for err in run.input_errors():
        row(err.file, err.line, err.column, "input-error", "", "", err.message, "", "")
    for d in run.designs:
        for problem in d.internal:
            row(d.file, 1, 1, "internal-error", problem.rule, "", problem.message, "", "")
        for f in d.findings:
            if options.quiet and (f.waived or f.severity.rank < run.fail_on.rank):
                continue
            row(f.location.file, f.location.line, f.location.column, f.severity.value, f.rule,
                f.element or "", f.message, f.hint or "", f.waived or "")
    return out.getvalue()
