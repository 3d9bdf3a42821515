"""Markdown for a pull-request comment: counts by severity, the findings table, the key figures.

Written for the Markdown that code-hosting services render (tables, ``<br>`` inside cells). Every
piece of text from a file under review is escaped so that it cannot become markup, a link, a
mention or a broken table. Long runs are cut to :data:`MAX_ROWS` findings so the comment stays
under the size such services accept; the cut says how many were left out.
"""

from __future__ import annotations

import re
from typing import Any

from ..api import Finding, Severity
from ..figures import Row, stack_shape
from ..figures import rows as figure_lines
from ..results import RunResult
from .common import RenderOptions, figure_text, relative_path, report_root
from .text import CAUTION

MAX_ROWS = 200

# Characters that Markdown, the HTML it allows, or a hosting service's autolinks (#123, @name)
# would read as syntax inside a table cell; line-start syntax (-, +, 1.) cannot occur there.
_SPECIAL = re.compile(r"([\\`*_\[\]|~<>&@#])")


def esc(text: str) -> str:
    """Plain text for a table cell: syntax characters backslash-escaped, line breaks as <br>."""
    text = _SPECIAL.sub(r"\\\1", str(text))
    # Escaping < and > keeps raw HTML out; the entity form also keeps an '&' literal.
    text = text.replace("\\<", "&lt;").replace("\\>", "&gt;").replace("\\&", "&amp;")
    return "<br>".join(text.splitlines()) if "\n" in text else text


def code(text: str) -> str:
    """Inline code, safe for any content (backticks inside are outnumbered by the fence)."""
    text = str(text).replace("|", "\\|").replace("\n", " ")
    fence = "`" * (max((len(m) for m in re.findall(r"`+", text)), default=0) + 1)
    pad = " " if text.startswith("`") or text.endswith("`") else ""
    return f"{fence}{pad}{text}{pad}{fence}"


def render(run: RunResult, opts: RenderOptions) -> str:
    root = report_root(run, opts)

    def where(file: str) -> str:
        return relative_path(file, root) or file

    findings = run.all_findings()
    counts = {s: sum(1 for f in findings if f.severity is s and not f.waived) for s in Severity}
    waived = sum(1 for f in findings if f.waived)
    n_input = len(run.input_errors())
    n_internal = sum(len(d.internal) for d in run.designs) + len(run.broken_plugins)
    linted = sum(1 for d in run.designs if d.linted)
    code_ = run.exit_code()
    verdict = {0: "passed", 1: "failed: findings", 2: "failed: input could not be used"}[code_]

    out: list[str] = ["## packwarden design review", ""]
    out.append(f"**{verdict}** — {linted} design(s) linted"
               + (f", {len(run.designs) - linted} could not be read" if linted < len(run.designs)
                  else "")
               + f" (fail-on: {run.fail_on.value})")
    out.append("")
    out += ["| errors | warnings | info | waived | input errors | internal errors |",
            "|---:|---:|---:|---:|---:|---:|",
            f"| {counts[Severity.error]} | {counts[Severity.warning]} | {counts[Severity.info]} "
            f"| {waived} | {n_input} | {n_internal} |", ""]
    comparison = opts.baseline
    if comparison is not None:
        out += [f"Compared with {esc(comparison.reference)}: **{len(comparison.new)} new**, "
                f"{len(comparison.unchanged)} unchanged (not listed), "
                f"{len(comparison.absent)} fixed.", ""]

    rows = []
    for err in run.input_errors():
        rows.append((f"{where(err.file)}:{err.line}", "input error", "—", "—", esc(err.message)))
    for d in run.designs:
        for ie in d.internal:
            rows.append((f"{where(ie.file)}", "internal error", code(ie.rule), "—", esc(ie.message)))
    for origin, message in run.broken_plugins:
        rows.append((origin, "plugin error", "—", "—", esc(message)))
    for f in sorted(findings, key=_order):
        if opts.quiet and (f.waived or f.severity.rank < run.fail_on.rank):
            continue
        sev = f.severity.value + (" (waived)" if f.waived else "")
        msg = esc(f.message)
        if f.hint:
            msg += f"<br>*hint:* {esc(f.hint)}"
        for note in f.assumptions:
            msg += f"<br>*assumes:* {esc(note)}"
        if f.waived:
            msg += f"<br>*waived:* {esc(f.waived)}"
        rows.append((f"{where(f.location.file)}:{f.location.line}", sev, code(f.rule),
                     esc(f.subject) if f.subject else "—", msg))
    if rows:
        out += ["| file:line | severity | rule | element | message |", "|---|---|---|---|---|"]
        for loc, sev, rule, element, msg in rows[:MAX_ROWS]:
            out.append(f"| {code(loc)} | {sev} | {rule} | {element} | {msg} |")
        if len(rows) > MAX_ROWS:
            out.append(f"\n… and {len(rows) - MAX_ROWS} more; run `packwarden check` for the "
                       f"full list.")
        out.append("")
    else:
        out += ["No findings.", ""]

    if comparison is not None and comparison.absent:
        out += ["<details><summary>Fixed since the comparison</summary>", ""]
        out += ["| file:line | rule | element | message |", "|---|---|---|---|"]
        for e in comparison.absent[:MAX_ROWS]:
            out.append(f"| {code(f'{e.file}:{e.line}')} | {code(e.rule)} | "
                       f"{esc(e.element) if e.element else '—'} | {esc(e.message)} |")
        out += ["", "</details>", ""]

    figure_rows = [(d, _figure_cells(d.figures)) for d in run.designs if d.figures]
    if figure_rows:
        columns = ["design", "cells"] + [_heading(r) for r in figure_lines(headline=True)]
        out += ["### Key figures", "", "| " + " | ".join(columns) + " |",
                "|" + "---|" * len(columns)]
        for d, cells in figure_rows:
            name = esc(d.name) + f"<br>{code(where(d.file))}" if d.name else code(where(d.file))
            out.append(f"| {name} | " + " | ".join(cells) + " |")
        out.append("")
        out += ["Trip currents are worst cases over detection tolerance, part spread, gate drive "
                "and ambient, with self-heating from the load.", ""]

    out.append(f"> **{esc(CAUTION)}**")
    return "\n".join(out) + "\n"


def _order(f: Finding) -> tuple:
    return (f.location.file, f.location.line, f.location.column, f.rule)


def _heading(row: Row) -> str:
    return f"{row.label} {' / '.join(row.ends)}" if row.is_range else row.label


def _figure_cells(fig: dict[str, Any]) -> list[str]:
    """The stack, then each headline line: its figures in their order, "—" for a missing one."""
    cells = [stack_shape(fig) or "—"]
    present = {row.range: row for row in figure_lines(fig, headline=True)}
    for column in figure_lines(headline=True):
        row = present.get(column.range)
        found = [row.get(end) for end in column.ends] if row is not None else []
        cells.append(esc(" / ".join(figure_text(f) for f in found))
                     if any(f is not None and f.known for f in found) else "—")
    return cells
