"""What a run hands the formatters: per design its findings, figures and errors; per run the
designs, the errors outside any design and the rules that ran.
"""

from __future__ import annotations

from dataclasses import field
from typing import Any

from .api import Finding, Rule, Severity
from .loader import InputError
from .records import record

@record
class InternalError:
    rule: str
    file: str
    message: str


@record
class DesignResult:
    file: str
    name: str | None = None
    findings: list[Finding] = field(default_factory=list)
    #: The model's key figures by name (:class:`packwarden.figures.KeyFigure`).
    figures: dict[str, Any] = field(default_factory=dict)
    #: The model's events in time (``Event.as_dict()`` of each, docs/output-formats.md "Events").
    events: list[dict[str, Any]] = field(default_factory=list)
    #: The thermistor inputs' cut-off temperatures with their tolerance stack
    #: (``DesignModel.cutoffs_report``, docs/output-formats.md).
    temperature_cutoffs: list[dict[str, Any]] = field(default_factory=list)
    errors: list[InputError] = field(default_factory=list)
    internal: list[InternalError] = field(default_factory=list)
    #: True once the design's rules ran (False when its file, config or libraries stopped it).
    linted: bool = False
    #: Electrical rules held back because the netlist has integrity errors.
    skipped: list[str] = field(default_factory=list)
    #: Rules that ran on this design (enabled by its config and not held back), for reports
    #: that list passing checks (JUnit).
    checked: list[str] = field(default_factory=list)
    model: Any = None
    #: The design assistant's answer (``packwarden assist``), a plain dict; None unless asked.
    assistant: dict[str, Any] | None = None


@record
class RunResult:
    designs: list[DesignResult] = field(default_factory=list)
    errors: list[InputError] = field(default_factory=list)  # errors outside any design (config)
    broken_plugins: list[tuple[str, str]] = field(default_factory=list)
    rules: dict[str, Rule] = field(default_factory=dict)
    fail_on: Severity = Severity.error

    def all_findings(self) -> list[Finding]:
        return [f for d in self.designs for f in d.findings]

    def input_errors(self) -> list[InputError]:
        return self.errors + [e for d in self.designs for e in d.errors]

    def exit_code(self) -> int:
        if self.input_errors() or self.broken_plugins or any(d.internal for d in self.designs):
            return 2
        level = self.fail_on.rank
        if any(f.severity.rank >= level and not f.waived for f in self.all_findings()):
            return 1
        return 0
