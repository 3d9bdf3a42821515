"""The review report: one self-contained HTML file to hold a design review over.

Per design: what was reviewed, the findings (waived ones marked), the key figures, and five charts
drawn as inline SVG (:mod:`.charts`). No script, no external font, stylesheet or image: the file
opens the same offline, attached to a ticket or archived with a release. Jinja2 autoescaping is on,
and the charts escape their own text, because names and messages come from the files under review.
The output depends only on the run: rendering twice gives identical bytes.
"""

from __future__ import annotations

from dataclasses import field
from typing import Any

from jinja2 import Environment, PackageLoader, StrictUndefined

from .. import __version__
from ..api import Severity
from ..figures import ENDS, rows
from ..loader import printable
from ..quantities import format_quantity
from ..results import DesignResult, RunResult
from .common import RenderOptions, figure_text
from .charts import Chart, charts_for, span_text
from .text import CAUTION
from ..records import record

#: The report's cautions: the text formatter's, then what a reader of a review report needs to hear.
CAUTIONS = (
    CAUTION,
    "A clean report means only that the checks packwarden knows found nothing — not that the design "
    "is safe. Figures rest on the part data in the design's libraries: check them against the "
    "current data sheets. The cell maker's data sheet and application notes rule over any default "
    "this tool assumes.",
    "Waived findings are still hazards someone accepted: each waiver's reason is shown beside the "
    "finding so the review can judge it.",
)

_EXIT_MEANING = {0: "passes: nothing at or above the fail-on level",
                 1: "fails: findings at or above the fail-on level",
                 2: "incomplete: some input could not be used"}


@record
class FindingView:
    severity: str
    rule: str
    summary: str
    element: str
    where: str
    path: str
    message: str
    hint: str
    figures: list[str]
    waived: str | None
    assumptions: list[str] = field(default_factory=list)


@record
class DesignView:
    anchor: str
    file: str
    name: str
    revision: str | None
    description: str | None
    counts: dict[str, int]
    waived: int
    findings: list[FindingView]
    errors: list[str]
    internal: list[str]
    figures: list[tuple[str, str, str, str]]
    conditions: list[tuple[str, str]]
    charts: list[Chart]
    assumptions: list[str] = field(default_factory=list)
    #: ``packwarden assist``'s answer for the design (``Assistance.as_dict()``), or None.
    assistant: dict[str, Any] | None = None
    #: the thermistor inputs' cut-offs: (what, min, typ, max, the tolerance stack in words)
    cutoffs: list[tuple[str, str, str, str, str]] = field(default_factory=list)


def render(run: RunResult, opts: RenderOptions) -> str:
    designs = [_design_view(k, d, run) for k, d in enumerate(run.designs, 1)]
    totals = {s.value: sum(v.counts[s.value] for v in designs) for s in Severity}
    code = run.exit_code()
    ctx = {
        "version": __version__,
        "title": _title(designs),
        "designs": designs,
        "totals": totals,
        "waived": sum(v.waived for v in designs),
        "exit_code": code,
        "exit_meaning": _EXIT_MEANING.get(code, ""),
        "fail_on": run.fail_on.value,
        "run_errors": [str(e) for e in run.errors],
        "broken_plugins": [m for _, m in run.broken_plugins],
        "cautions": CAUTIONS,
        # With --baseline/--since the run holds only the new findings; say what was left out.
        "baseline": opts.baseline.summary() if getattr(opts, "baseline", None) is not None else None,
    }
    return _environment().get_template("report.html.j2").render(**ctx)


# The charts draw from each design's model, which stays in the process that built it: the CLI
# lints in one process for a format that says so.
render.needs_models = True  # type: ignore[attr-defined]


def _environment() -> Environment:
    # autoescape=True for every template, not by file suffix: the template's name ends in .j2.
    return Environment(loader=PackageLoader("packwarden.report", "templates"), autoescape=True,
                       undefined=StrictUndefined, trim_blocks=True, lstrip_blocks=True,
                       keep_trailing_newline=True)


def _title(designs: list[DesignView]) -> str:
    if len(designs) == 1:
        return f"Design review: {designs[0].name}"
    return f"Design review: {len(designs)} designs"


def _design_view(k: int, d: DesignResult, run: RunResult) -> DesignView:
    counts = {s.value: 0 for s in Severity}
    waived = 0
    findings = []
    for f in d.findings:
        if f.waived:
            waived += 1
        else:
            counts[f.severity.value] += 1
        rule = run.rules.get(f.rule)
        findings.append(FindingView(
            severity=f.severity.value, rule=f.rule, summary=rule.summary if rule else "",
            element=f.subject or "", where=_where(f.location, d.file),
            path=f.location.dotted, message=f.message, hint=f.hint or "",
            figures=[fig.text() for fig in f.figures], waived=f.waived,
            assumptions=list(f.assumptions)))
    model = d.model
    design = model.design if model is not None else None
    info = design.design if design is not None else None
    view = DesignView(
        anchor=f"design-{k}", file=d.file, name=d.name or d.file,
        # free text of the design: shown, never acted on (a terminal escape stays visible text)
        revision=printable(info.revision) if info and info.revision else None,
        description=printable(info.description, keep="\n") if info and info.description else None,
        counts=counts, waived=waived, findings=findings,
        errors=[str(e) for e in d.errors],
        internal=[f"internal error in '{i.rule}': {i.message}" for i in d.internal],
        figures=_figures(d.figures),
        conditions=_safely(_conditions, model) if model is not None else [],
        charts=charts_for(model) if model is not None and not d.errors else [])
    if model is not None:
        view.assumptions = _safely(_assumptions, model)
    view.assistant = d.assistant
    cutoffs = d.temperature_cutoffs
    if not cutoffs and model is not None:
        cutoffs = _safely(lambda m: m.cutoffs_report(), model)
    view.cutoffs = [_cutoff_row(c) for c in cutoffs]
    return view


_STACK_WORDS = {"r25": "R25", "beta": "B", "bias": "bias", "threshold": "threshold"}


def _cutoff_row(c: dict[str, Any]) -> tuple[str, str, str, str, str]:
    """One cut-off of the JSON form (sensing.Cutoff.as_dict) as a row of the report's table."""
    what = f"{c['name'].replace('_', ' ')} ({c['owner']} reading {c['ntc']} on the {c['placement']})"
    stack = ", ".join(f"{_STACK_WORDS.get(n, n)} {lo:+.2f}/{hi:+.2f} K"
                      for n, (lo, hi) in c["tolerance_stack"].items())
    return (what, f"{c['min']:.1f} °C", f"{c['typ']:.1f} °C", f"{c['max']:.1f} °C", stack)


def _safely(build: Any, model: Any) -> list:
    """``build(model)``, or nothing when a model figure fails: the engine has already reported
    that failure as an internal error, and the rest of the report must still be written."""
    try:
        return build(model)
    except Exception:
        return []


def _where(loc: Any, design_file: str) -> str:
    """Line and column; the file too when it is not the design's own (a part library)."""
    at = f"{loc.line}:{loc.column}"
    return at if loc.file == design_file else f"{loc.file}:{at}"


def _figures(figures: dict[str, Any]) -> list[tuple[str, str, str, str]]:
    """Rows of (figure, min, typ, max): the ranges, then the single figures in the typ column,
    each as :mod:`packwarden.figures` declares it."""
    lines = rows(figures)
    return ([(r.label, *(figure_text(r.get(end)) if r.get(end) is not None else "" for end in ENDS))
             for r in lines if r.is_range]
            + [(r.label, "", figure_text(r.get()), "") for r in lines if not r.is_range])


def _conditions(model: Any) -> list[tuple[str, str]]:
    """What the design says it is for: the conditions every figure is computed at."""
    design = model.design
    out = []
    a = design.pack.ambient
    out.append(("ambient", f"{a.min:g} to {a.max:g} °C"))
    load = design.load
    out.append(("continuous load", format_quantity(load.continuous, "A")))
    if load.peak is not None:
        out.append(("peak load", f"{format_quantity(load.peak.current, 'A')} for "
                                 f"{format_quantity(load.peak.duration, 's')}"))
    ch = design.charger
    if ch is not None:
        v = ch.voltage
        out.append(("charger voltage", span_text(v.low, v.high, "V", 4)))
        per = model.charger_per_cell
        if per is not None and model.stack is not None and model.stack.series != 1:
            out.append(("charger voltage per cell", span_text(per.min, per.max, "V", 4)))
        out.append(("charger current", format_quantity(ch.current, "A")))
        out.append(("charger open-circuit max", format_quantity(ch.open_circuit_max, "V")))
    stack = model.stack
    if stack is not None:
        out.append(("cell stack", f"{stack.series}S{stack.parallel}P of "
                                  f"{stack.cells[0].part_name or stack.cells[0].refdes}"))
    return out


def _assumptions(model: Any) -> list[str]:
    """What the figures rest on that the design did not say, each once, in first-seen order."""
    seen: list[str] = []

    def add(notes) -> None:
        for n in notes:
            if n not in seen:
                seen.append(n)

    if model.cell_limits is not None:
        add(model.cell_limits.assumptions)
    for window in (model.overcurrent_trip, model.short_circuit_trip):
        if window is not None:
            for op in (window.at_min, window.at_typ, window.at_max):
                add(op.assumptions)
    add(f"{p.what}: {p.message}" for p in model.problems)
    return seen
