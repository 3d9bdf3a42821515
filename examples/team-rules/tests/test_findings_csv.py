"""The tallgrass-csv output format, read back with Python's csv reader [published: RFC 4180,
"Common Format and MIME Type for Comma-Separated Values (CSV) Files"; the reader follows it].

Run after installing the package: the format is looked up in the installed entry points, exactly
as ``packwarden check --format tallgrass-csv`` looks it up.
"""

import csv
import io
from pathlib import Path

from packwarden.engine import lint
from packwarden.report import RenderOptions, load_formats

DESIGNS = Path(__file__).parent / "designs"


def test_the_package_registers_its_format():
    formats = load_formats()
    assert "tallgrass-csv" in formats.names() and formats.broken == []
    assert formats.entries["tallgrass-csv"][0] == "tallgrass-packwarden-rules:tallgrass-csv"


def test_one_row_per_finding_with_its_location():
    run = lint([str(DESIGNS)])
    text = load_formats().load("tallgrass-csv")(run, RenderOptions())
    header, *rows = list(csv.reader(io.StringIO(text)))
    assert header == ["file", "line", "column", "severity", "rule", "element", "message", "hint",
                      "waived"]
    findings = run.all_findings()
    assert len(rows) == len(findings) > 0
    for row, f in zip(rows, findings):
        assert row[:6] == [f.location.file, str(f.location.line), str(f.location.column),
                           f.severity.value, f.rule, f.element or ""]


def test_a_cell_a_spreadsheet_would_run_as_a_formula_is_text():
    from tallgrass_rules.findings_csv import _cell
    # [practice: OWASP, "CSV Injection"]: =, +, -, @ open a formula
    assert [_cell(v) for v in ("=HYPERLINK(1)", "+1", "-2", "@SUM(A1)", "Q1", 3)] == [
        "'=HYPERLINK(1)", "'+1", "'-2", "'@SUM(A1)", "Q1", 3]
