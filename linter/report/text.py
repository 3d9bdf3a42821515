"""Plain text for terminals: findings grouped by file, one clickable line each, hint beneath."""

from __future__ import annotations

from ..api import Severity
from ..figures import rows, stack_shape
from ..results import RunResult
from .common import RenderOptions, figure_text

CAUTION = ("Caution: lithium cells can vent, burn or explode. This review is an aid, not a substitute "
           "for the cell maker's approval, safety testing (e.g. IEC 62133-2, UL 2054, UN 38.3) or "
           "licensed engineering practice; local codes and regulations prevail.")

_COLOURS = {Severity.error: "\033[31m", Severity.warning: "\033[33m", Severity.info: "\033[36m"}


# A run over one design ends with its key figures, so a clean result still shows the numbers a
# reviewer would check; batches and hooks keep to findings (the JSON format carries every figure).
_FIGURE_LINES_UP_TO = 1


def key_figures(figures: dict) -> str:
    """The headline figures on one line: the stack, then each range from its minimum to its
    maximum (typical in brackets), then single figures; what the design lacks is left out."""
    parts = []
    shape = stack_shape(figures)
    if shape:
        parts.append(shape)
    for row in rows(figures, headline=True):
        if not row.is_range:
            parts.append(f"{row.label} {figure_text(row.get())}")
            continue
        low, typ, high = row.get("min"), row.get("typ"), row.get("max")
        if low is None or high is None:
            continue
        if not low.known or not high.known:  # could not be computed: said, not left out
            parts.append(f"{row.label} n/a")
            continue
        span = figure_text(low)
        if figure_text(high) != span:  # a fixed gate drive is one value, not "12 V–12 V"
            span += f"–{figure_text(high)}"
        parts.append(f"{row.label} {span}"
                     + (f" (typ {figure_text(typ)})" if typ is not None and typ.known else ""))
    return "; ".join(parts)


def render(run: RunResult, opts: RenderOptions) -> str:
    lines: list[str] = []
    for origin, message in run.broken_plugins:
        lines.append(f"{origin}:1:1: {message}")
    for err in run.errors:
        lines.append(str(err))
    counts = {s: 0 for s in Severity}
    waived = 0
    for d in run.designs:
        block: list[str] = []
        for err in d.errors:
            block.append(str(err))
        for ie in d.internal:
            block.append(f"{d.file}:1:1: internal error in rule '{ie.rule}': {ie.message}")
        for f in d.findings:
            if f.waived:
                waived += 1
                if opts.quiet:
                    continue
            else:
                counts[f.severity] += 1
            if opts.quiet and f.severity.rank < run.fail_on.rank:
                continue
            sev = f.severity.value
            if opts.color:
                sev = f"{_COLOURS[f.severity]}{sev}\033[0m"
            tag = f" [waived: {f.waived}]" if f.waived else ""
            if f.location.related is not None:  # found in the schematic's netlist
                rel = f.location.related
                tag += f" (design {rel.file}:{rel.line}:{rel.column})"
            block.append(f"{f.location.file}:{f.location.line}:{f.location.column}: {sev} "
                         f"{f.rule}: {f.message}{tag}")
            if f.hint and not opts.quiet:
                block.append(f"    hint: {f.hint}")
            if not opts.quiet:
                block.extend(f"    assumes: {note}" for note in f.assumptions)
        if d.linted and not opts.quiet and len(run.designs) <= _FIGURE_LINES_UP_TO:
            figures = key_figures(d.figures)
            if figures:
                block.append(f"{d.file}: figures: {figures}")
        if d.skipped and not opts.quiet:
            block.append(f"{d.file}: note: {len(d.skipped)} electrical rule(s) held back until the "
                         f"netlist errors above are fixed")
        if block:
            lines.extend(block)
            lines.append("")
    if not opts.quiet:
        n_err = len(run.input_errors()) + sum(len(d.internal) for d in run.designs)
        linted = sum(1 for d in run.designs if d.linted)
        summary = (f"{linted} design(s) linted, {len(run.designs) - linted} could not be read; "
                   f"{counts[Severity.error]} error(s), {counts[Severity.warning]} warning(s), "
                   f"{counts[Severity.info]} info, {waived} waived")
        if n_err:
            summary += f"; {n_err} input or internal error(s)"
        lines.append(summary)
        lines.append(CAUTION)
    return "\n".join(lines) + "\n"


# A batch need not hold every design's figures for a report that will not show them (batch.lint).
render.figures_up_to = _FIGURE_LINES_UP_TO  # type: ignore[attr-defined]
