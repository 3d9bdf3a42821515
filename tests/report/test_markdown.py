"""The pull-request comment, rendered by a CommonMark parser as a code host would show it.

The consumer is markdown-it-py, a general-purpose CommonMark parser, with its GFM table extension
and raw HTML allowed (as code hosts allow ``<br>`` and then sanitise) [published: CommonMark spec
0.31 and the GitHub Flavored Markdown spec, section "Tables (extension)": a cell's ``|`` must be
escaped as ``\\|``]. Figures are compared with format_quantity of the model's own numbers.
"""

from __future__ import annotations

import html as htmllib
import re
from pathlib import Path

import pytest

from packwarden.api import Finding, Location, Severity
from packwarden.baseline import compare, entries_of
from packwarden.engine import DesignResult, RunResult, lint
from packwarden.quantities import format_quantity
from packwarden.report import RenderOptions, formatter
from packwarden.report.text import CAUTION

from report_data import CLEAN, FLAWED, REPO

markdown_it = pytest.importorskip("markdown_it", reason="markdown-it-py (test extra) renders it")


def render_md(run, **opts) -> str:
    return formatter("markdown")(run, RenderOptions(**opts))


def to_html(md: str) -> str:
    return markdown_it.MarkdownIt("commonmark").enable("table").render(md)


def tables(page: str) -> list[list[list[str]]]:
    """Every table as rows of cell HTML (header row first)."""
    out = []
    for table in re.findall(r"<table>(.*?)</table>", page, re.S):
        rows = []
        for row in re.findall(r"<tr>(.*?)</tr>", table, re.S):
            rows.append([c.strip() for c in re.findall(r"<t[hd][^>]*>(.*?)</t[hd]>", row, re.S)])
        out.append(rows)
    return out


def text(cell: str) -> str:
    return htmllib.unescape(re.sub(r"<[^>]+>", "", cell))


def test_counts_findings_and_caution(example_run) -> None:
    md = render_md(example_run)
    page = to_html(md)
    counts, findings, figures = tables(page)
    assert counts[0] == ["errors", "warnings", "info", "waived", "input errors", "internal errors"]
    all_f = example_run.all_findings()
    expect = [sum(1 for f in all_f if f.severity is s and not f.waived) for s in Severity]
    assert [int(c) for c in counts[1][:3]] == expect
    assert int(counts[1][3]) == sum(1 for f in all_f if f.waived) == 2
    assert counts[1][4:] == ["0", "0"]
    assert md.startswith("## packwarden design review\n\n**failed: findings**")

    assert findings[0] == ["file:line", "severity", "rule", "element", "message"]
    rows = findings[1:]
    assert len(rows) == len(all_f)
    for f in all_f:
        where = f"{Path(f.location.file).resolve().relative_to(REPO).as_posix()}:{f.location.line}"
        matching = [r for r in rows if text(r[0]) == where and text(r[2]) == f.rule
                    and text(r[4]).startswith(f.message)]
        assert matching, f"no row for {where} {f.rule}"
        row = matching[0]
        assert text(row[1]) == f.severity.value + (" (waived)" if f.waived else "")
        assert text(row[3]) == (f.subject or "—")
        if f.hint:
            assert f"hint: {f.hint}" in text(row[4])
    [quote] = re.findall(r"<blockquote>(.*?)</blockquote>", page, re.S)
    assert text(quote).strip() == CAUTION and "<strong>" in quote


def test_key_figures_per_design(example_run) -> None:
    figures = tables(to_html(render_md(example_run)))[2]
    assert figures[0][:3] == ["design", "cells", "over-current trip min / typ / max"]
    # the design cell is the design's name, then its path
    by_file = {re.findall(r"<code>(.*?)</code>", r[0])[-1]: r for r in figures[1:]}
    assert len(by_file) == len(example_run.designs)
    for d in example_run.designs:
        fig = {name: f.value for name, f in d.figures.items()}
        row = by_file[Path(d.file).resolve().relative_to(REPO).as_posix()]
        assert text(row[1]) == f"{fig['series']}S{fig['parallel']}P"
        assert text(row[2]) == " / ".join(format_quantity(fig[k], "A") for k in (
            "trip_current_min", "trip_current_typ", "trip_current_max"))
        assert text(row[4]) == format_quantity(fig["prospective_short_circuit"], "A")
    # the clean example holds one cell, BT1: 1S1P
    clean = by_file["example_designs/orchard-probe.yaml"]
    assert text(clean[1]) == "1S1P"


def test_text_from_designs_cannot_become_markup() -> None:
    hostile = "a | b <script>x</script> @team #12 [link](https://example.invalid) **bold**"
    f = Finding("unknown-part", Severity.error, hostile, Location(str(CLEAN), ("components",), 5, 3),
                hint="line one\nline two", element="Q|1").with_fingerprint("d.yaml")
    run = RunResult(designs=[DesignResult(file=str(CLEAN), findings=[f])])
    page = to_html(render_md(run))
    [_, findings] = tables(page)
    [row] = findings[1:]
    assert len(row) == 5  # the | in the message and element did not split the cell
    assert "<script>" not in page and "<a " not in page and "<strong>bold" not in page
    assert text(row[4]).startswith(hostile)
    assert text(row[3]) == "Q|1"
    assert "line one<br>line two" in row[4]


def test_quiet_lists_only_what_fails_the_run(example_run) -> None:
    rows = tables(to_html(render_md(example_run, quiet=True)))[1][1:]
    counted = [f for f in example_run.all_findings()
               if not f.waived and f.severity.rank >= example_run.fail_on.rank]
    assert len(rows) == len(counted)


def test_baseline_summary_and_fixed_list(example_run) -> None:
    trip = next(p for p in FLAWED if p.name == "trip-below-load.yaml")
    earlier = entries_of(lint([str(trip)]))
    filtered, comparison = compare(example_run, earlier, "packwarden-baseline.json")
    md = render_md(filtered, baseline=comparison)
    assert (f"Compared with packwarden-baseline.json: **{len(comparison.new)} new**, "
            f"{len(earlier)} unchanged (not listed), 0 fixed.") in md
    rows = tables(to_html(md))[1][1:]
    assert len(rows) == len(example_run.all_findings()) - len(earlier)
    assert not any("trip-below-load" in r[0] for r in rows)
    # against a baseline holding an extra finding, that one is listed as fixed
    from dataclasses import replace
    gone = replace(earlier[0], fingerprint="f" * 20, message="an old finding")
    filtered, comparison = compare(example_run, [*earlier, gone], "b.json")
    assert "an old finding" in render_md(filtered, baseline=comparison)
    assert "1 fixed" in render_md(filtered, baseline=comparison)
