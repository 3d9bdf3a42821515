"""JUnit XML for CI test dashboards: one test suite per design, one test case per rule and design.

Valid against the ``junit-10.xsd`` that pytest's source distribution carries (the Surefire-style
schema most CI systems read). Mapping:

- A rule that ran and found nothing is a passing test case.
- A rule with findings that fail the run (at or above ``--fail-on``, not waived) is a test case with
  one ``<failure>``: its ``message`` is the first finding (and how many there are), its text lists
  every finding as ``file:line:column: severity rule: message`` with element, hint and figures.
- Findings below the fail-on level do not fail the case; they are listed in its ``<system-out>``.
- A rule whose findings are all waived is ``<skipped>`` with the waiver's reason; a rule held back
  because the netlist has integrity errors is ``<skipped>`` too, saying so.
- A design that cannot be read gives a test case ``input-error`` with an ``<error>`` listing each
  ``file:line:column: message``; a rule (or the model) that raised gives an ``<error>`` of type
  ``internal-error`` in that rule's test case.
- Problems outside any design (a bad config, a plugin that failed to load) form a suite named
  ``packwarden``.

Test case ``classname`` is the design path without its extension, dotted
(``example_designs.flawed.no-fuse``), since dashboards split class names at dots into package and
class; the suite's ``file`` attribute keeps the exact path. No times or timestamps are written: the
output depends only on the input. Each suite carries the safety caution as a property.
"""

from __future__ import annotations

import re
import xml.etree.ElementTree as ET
from pathlib import PurePosixPath
from typing import Any

from ..api import Finding
from ..results import DesignResult, RunResult
from .common import RenderOptions, relative_path, report_root
from .text import CAUTION

INPUT_ERROR = "input-error"

# XML 1.0 cannot carry most control characters, even escaped; text from a file under review might.
_NOT_XML = re.compile("[^\t\n\r\u0020-\ud7ff\ue000-\ufffd\U00010000-\U0010ffff]")


def clean(text: str) -> str:
    return _NOT_XML.sub("\ufffd", text)


def render(run: RunResult, opts: RenderOptions) -> str:
    root = report_root(run, opts)
    suites = ET.Element("testsuites", name="packwarden")
    totals = {"tests": 0, "failures": 0, "errors": 0}
    for d in run.designs:
        shown = relative_path(d.file, root) or d.file
        suites.append(_design_suite(d, shown, run, opts, totals))
    outside = _outside_suite(run, opts, totals)
    if outside is not None:
        suites.append(outside)
    for k, v in totals.items():
        suites.set(k, str(v))
    ET.indent(suites, space="  ")
    return '<?xml version="1.0" encoding="UTF-8"?>\n' + ET.tostring(suites, encoding="unicode") + "\n"


def classname(path: str) -> str:
    p = PurePosixPath(path)
    stem = p.with_suffix("") if p.suffix in (".yaml", ".yml") else p
    return ".".join(part for part in stem.parts if part not in ("/", ".", ".."))


def finding_text(f: Finding) -> str:
    lines = [f"{f.location.file}:{f.location.line}:{f.location.column}: {f.severity.value} "
             f"{f.rule}: {f.message}"]
    if f.subject:
        lines.append(f"    element: {f.subject}")
    if f.hint:
        lines.append(f"    hint: {f.hint}")
    if f.figures:
        lines.append("    figures: " + "; ".join(g.text() for g in f.figures))
    for note in f.assumptions:
        lines.append(f"    assumes: {note}")
    if f.waived:
        lines.append(f"    waived: {f.waived}")
    return "\n".join(lines)


def _suite(name: str, file: str | None, opts: RenderOptions) -> ET.Element:
    suite = ET.Element("testsuite", name=clean(name))
    if file:
        suite.set("file", clean(file))
    props = ET.SubElement(suite, "properties")
    ET.SubElement(props, "property", name="caution", value=CAUTION)
    if opts.baseline is not None:
        ET.SubElement(props, "property", name="compared-with", value=clean(opts.baseline.reference))
        ET.SubElement(props, "property", name="baseline-unchanged-hidden",
                      value=str(len(opts.baseline.unchanged)))
    return suite


def _case(suite: ET.Element, cls: str, name: str) -> ET.Element:
    return ET.SubElement(suite, "testcase", classname=clean(cls), name=clean(name))


def _design_suite(d: DesignResult, shown: str, run: RunResult, opts: RenderOptions,
                  totals: dict[str, int]) -> ET.Element:
    suite = _suite(shown, shown, opts)
    if d.name:
        ET.SubElement(suite.find("properties"), "property", name="design", value=clean(d.name))
    cls = classname(shown)
    counts = {"tests": 0, "failures": 0, "errors": 0, "skipped": 0}

    if d.errors:
        case = _case(suite, cls, INPUT_ERROR)
        first = d.errors[0]
        err = ET.SubElement(case, "error", type=INPUT_ERROR, message=clean(
            first.message + (f" (and {len(d.errors) - 1} more)" if len(d.errors) > 1 else "")))
        err.text = clean("\n".join(str(e) for e in d.errors))
        counts["tests"] += 1
        counts["errors"] += 1

    by_rule: dict[str, list[Finding]] = {}
    for f in d.findings:
        by_rule.setdefault(f.rule, []).append(f)
    internal = {}
    for ie in d.internal:
        internal.setdefault(ie.rule, []).append(ie)
    names = sorted(set(d.checked) | set(by_rule) | set(internal) | set(d.skipped))
    for rid in names:
        case = _case(suite, cls, rid)
        counts["tests"] += 1
        findings = by_rule.get(rid, [])
        failing = [f for f in findings if not f.waived and f.severity.rank >= run.fail_on.rank]
        below = [f for f in findings if not f.waived and f.severity.rank < run.fail_on.rank]
        waived = [f for f in findings if f.waived]
        if rid in internal:
            ie = internal[rid]
            err = ET.SubElement(case, "error", type="internal-error",
                                message=clean(f"internal error in '{rid}': {ie[0].message}"))
            err.text = clean("\n".join(f"{i.file}: {i.message}" for i in ie))
            counts["errors"] += 1
        if failing:
            more = f" (and {len(failing) - 1} more)" if len(failing) > 1 else ""
            fail = ET.SubElement(case, "failure", type=rid,
                                 message=clean(f"{failing[0].message}{more}"))
            fail.text = clean("\n\n".join(finding_text(f) for f in failing))
            counts["failures"] += 1
        elif waived and rid not in internal and not below:
            skip = ET.SubElement(case, "skipped", type="waived",
                                 message=clean(f"waived: {waived[0].waived}"))
            skip.text = clean("\n\n".join(finding_text(f) for f in waived))
            counts["skipped"] += 1
            waived = []
        elif rid in d.skipped and rid not in internal:
            ET.SubElement(case, "skipped", type="held-back",
                          message="held back until the netlist errors of this design are fixed")
            counts["skipped"] += 1
        rest = below + waived
        if rest:
            out = ET.SubElement(case, "system-out")
            out.text = clean("\n\n".join(finding_text(f) for f in rest))

    for k, v in counts.items():
        suite.set(k, str(v))
        if k in totals:
            totals[k] += v
    return suite


def _outside_suite(run: RunResult, opts: RenderOptions, totals: dict[str, int]) -> Any:
    if not run.errors and not run.broken_plugins:
        return None
    suite = _suite("packwarden", None, opts)
    n = 0
    for err in run.errors:
        case = _case(suite, "packwarden", f"{INPUT_ERROR} {err.file}")
        e = ET.SubElement(case, "error", type=INPUT_ERROR, message=clean(err.message))
        e.text = clean(str(err))
        n += 1
    for origin, message in run.broken_plugins:
        case = _case(suite, "packwarden", f"plugin {origin}")
        e = ET.SubElement(case, "error", type="plugin-error", message=clean(message))
        e.text = clean(message)
        n += 1
    suite.set("tests", str(n))
    suite.set("failures", "0")
    suite.set("errors", str(n))
    suite.set("skipped", "0")
    totals["tests"] += n
    totals["errors"] += n
    return suite


# This format writes a finding's own figures, never a design's key figures: a batch need not hold
# them (batch.lint).
render.figures_up_to = 0  # type: ignore[attr-defined]
