"""SARIF 2.1.0 (OASIS) for code-scanning services and editors.

One run. ``tool.driver`` lists every rule of the registry with its summary, rationale, help (the
rationale, the failing and passing example, and where the fix hints are) and default level. Each
finding is a result located in the design file by line and column, its path relative to the
checkout root through ``uriBaseId: SRCROOT`` (CI services resolve it against their checkout), with
the finding's stable fingerprint under the namespaced key ``packwarden/v1``.

Decisions, so consumers know what to expect:

- Levels: error -> ``error``, warning -> ``warning``, info -> ``note``.
- The fix hint closes the message text (``"...\\nHint: ..."``): most viewers show only the message.
  Element, YAML path, hint and figures are also in the result's ``properties``.
- One cause reported once (``packwarden.grouping``) is one result: the members of a group of
  parallel packages after the first are ``relatedLocations``, and ``properties`` name them
  (``members``, ``group``), the other rules that found the cause (``alsoFoundBy``) and the
  fingerprints the members had alone (``mergedFingerprints``).
- Each result's ``properties.headline`` names the figure whose change makes the finding worse
  (``figure``, ``value``, ``unit``) and which way (``worse``: ``higher`` or ``lower``), the figure
  a waiver's ``up_to`` or ``down_to`` bounds; null for a finding without figures.
- Each result's ``properties.assumptions`` lists what its figures rest on that the design does not
  give.
- A waived finding is a result with a ``suppressions`` entry (kind ``inSource``: the waiver lives
  in the design file; its reason is the justification).
- Input errors (a design that cannot be read or validated, a bad config, a library outside the
  repository) are **results** of the pseudo-rule ``input-error``, level ``error``: they sit at a
  line of a file the author must fix, and code-scanning services show results, not notifications.
- Internal errors (a rule or the model raised) and plugins that failed to load are the tool's
  fault, not the design's: they are ``toolExecutionNotifications`` of the invocation, which is
  then marked ``executionSuccessful: false``.
- With ``--baseline`` or ``--since`` every result carries ``baselineState``: ``new`` for what is
  reported, ``unchanged`` for findings the comparison hides from the other formats, ``absent`` for
  findings of the earlier set that are gone.
- Columns count Unicode code points (``columnKind``), as the YAML loader does.

``informationUri`` is omitted: the tool has no public home page to point at.
"""

from __future__ import annotations

import json
import math
from pathlib import Path
from typing import Any

from .. import __version__
from ..api import Finding, Rule, Severity
from ..results import RunResult
from .common import RenderOptions, absolute, relative_path, report_root
from .text import CAUTION

SCHEMA_URI = "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json"
FINGERPRINT_KEY = "packwarden/v1"
INPUT_ERROR = "input-error"
SRCROOT = "SRCROOT"

LEVELS = {Severity.error: "error", Severity.warning: "warning", Severity.info: "note"}

INPUT_ERROR_RULE = {
    "id": INPUT_ERROR,
    "name": "InputError",
    "shortDescription": {"text": "a design, part library or configuration file cannot be used"},
    "fullDescription": {"text": (
        "Not a design-review rule: packwarden reports here every file it could not read, parse "
        "or validate (YAML syntax, unknown or missing fields, values without units, libraries "
        "outside the repository, a bad configuration). A design with input errors is not "
        "reviewed at all, so its other rules report nothing until these are fixed.")},
    "help": {"text": "Fix the file at the reported line and column; the message names the field "
                     "and what it expected. docs/format.md describes every field.",
             "markdown": "Fix the file at the reported line and column; the message names the "
                         "field and what it expected. `docs/format.md` describes every field."},
    "defaultConfiguration": {"level": "error"},
}


def render(run: RunResult, opts: RenderOptions) -> str:
    return json.dumps(sarif_log(run, opts), indent=2, ensure_ascii=False, allow_nan=False) + "\n"


def sarif_log(run: RunResult, opts: RenderOptions) -> dict[str, Any]:
    root = report_root(run, opts)
    comparison = opts.baseline
    rules, index = _rule_descriptors(run, comparison)
    results: list[dict[str, Any]] = []
    state = "new" if comparison is not None else None
    for d in run.designs:
        for f in d.findings:
            results.append(_result(f, index, root, state))
    if comparison is not None:
        for f in comparison.unchanged:
            results.append(_result(f, index, root, "unchanged"))
        for e in comparison.absent:
            results.append(_absent_result(e, index))
    for err in run.input_errors():
        results.append(_input_error_result(err, index, root, state))

    notifications = []
    for d in run.designs:
        for ie in d.internal:
            note: dict[str, Any] = {
                "level": "error",
                "message": {"text": f"internal error in '{ie.rule}': {ie.message}"},
                "locations": [_location(ie.file, 1, 1, root)],
            }
            if ie.rule in index:
                note["associatedRule"] = {"id": ie.rule, "index": index[ie.rule]}
            notifications.append(note)
    for origin, message in run.broken_plugins:
        notifications.append({"level": "error", "message": {"text": message},
                              "properties": {"plugin": origin}})

    invocation: dict[str, Any] = {
        "executionSuccessful": not notifications,
        "exitCode": run.exit_code(),
    }
    if notifications:
        invocation["toolExecutionNotifications"] = notifications

    driver = {
        "name": "packwarden",
        "version": __version__,
        "semanticVersion": __version__,
        "shortDescription": {"text": "Design-review linter for lithium-ion battery protection "
                                     "circuits"},
        "fullDescription": {"text": CAUTION},
        "rules": rules,
    }
    sarif_run: dict[str, Any] = {
        "tool": {"driver": driver},
        "invocations": [invocation],
        "originalUriBaseIds": {SRCROOT: {
            "uri": root.as_uri().rstrip("/") + "/",
            "description": {"text": "the root of the checkout holding the designs"}}},
        "columnKind": "unicodeCodePoints",
        "results": results,
        "properties": {"caution": CAUTION},
    }
    if comparison is not None:
        sarif_run["properties"]["comparedWith"] = comparison.reference
    return {"$schema": SCHEMA_URI, "version": "2.1.0", "runs": [sarif_run]}


# --- rules --------------------------------------------------------------------------------------

def rule_name(rule_id: str) -> str:
    """SARIF's ``name`` is an identifier in words run together: ``trip-current-window`` -> TripCurrentWindow."""
    return "".join(part[:1].upper() + part[1:] for part in rule_id.replace("_", "-").split("-"))


def rule_descriptor(r: Rule) -> dict[str, Any]:
    text = [r.rationale or r.summary]
    md = [r.rationale or r.summary]
    if r.example is not None:
        text += ["", "Fails:", r.example.bad.rstrip(), "", "Passes:", r.example.good.rstrip()]
        md += ["", "Fails:", "", "```yaml", r.example.bad.rstrip(), "```", "",
               "Passes:", "", "```yaml", r.example.good.rstrip(), "```"]
    how = (f"How to fix: each finding's message ends with a hint for that design. "
           f"`packwarden explain {r.id}` prints this text with the rule's options.")
    text += ["", how]
    md += ["", how]
    descriptor: dict[str, Any] = {
        "id": r.id,
        "name": rule_name(r.id),
        "shortDescription": {"text": r.summary},
        "fullDescription": {"text": r.rationale or r.summary},
        "help": {"text": "\n".join(text), "markdown": "\n".join(md)},
        "defaultConfiguration": {"level": LEVELS[r.severity]},
    }
    if r.origin:
        descriptor["properties"] = {"origin": r.origin}
    return descriptor


def _rule_descriptors(run: RunResult, comparison: Any) -> tuple[list[dict], dict[str, int]]:
    rules = [rule_descriptor(run.rules[rid]) for rid in sorted(run.rules)]
    known = {r["id"] for r in rules}
    # Findings of rules outside the registry (a baseline entry of a rule since removed) still
    # need a descriptor for ruleIndex to point at.
    seen = [f.rule for f in run.all_findings()]
    if comparison is not None:
        seen += [f.rule for f in comparison.unchanged] + [e.rule for e in comparison.absent]
    for rid in sorted(set(seen) - known - {INPUT_ERROR}):
        rules.append({"id": rid, "name": rule_name(rid),
                      "shortDescription": {"text": f"rule '{rid}' (not in the registry of this run)"},
                      "defaultConfiguration": {"level": "warning"}})
    if INPUT_ERROR not in known:
        rules.append(INPUT_ERROR_RULE)
    return rules, {r["id"]: i for i, r in enumerate(rules)}


# --- results ------------------------------------------------------------------------------------

def _artifact(file: str, root: Path) -> dict[str, Any]:
    rel = relative_path(file, root)
    if rel is None:  # outside the checkout: an absolute URI, no base
        return {"uri": absolute(file).as_uri()}
    return {"uri": rel or ".", "uriBaseId": SRCROOT}


def _location(file: str, line: int, column: int, root: Path) -> dict[str, Any]:
    return {"physicalLocation": {"artifactLocation": _artifact(file, root),
                                 "region": {"startLine": max(line, 1),
                                            "startColumn": max(column, 1)}}}


def _headline(f: Finding) -> dict[str, Any] | None:
    head = f.headline_dict()
    return head if head is None else {**head, "value": _number(head["value"])}


def _result(f: Finding, index: dict[str, int], root: Path, state: str | None) -> dict[str, Any]:
    text = f.message + (f"\nHint: {f.hint}" if f.hint else "")
    loc = _location(f.location.file, f.location.line, f.location.column, root)
    if f.element:
        loc["logicalLocations"] = [{"name": f.element,
                                    "fullyQualifiedName": f.location.dotted or f.element}]
    result: dict[str, Any] = {
        "ruleId": f.rule,
        "ruleIndex": index[f.rule],
        "level": LEVELS[f.severity],
        "message": {"text": text},
        "locations": [loc],
        "partialFingerprints": {FINGERPRINT_KEY: f.fingerprint},
        "properties": {
            "element": f.element, "yamlPath": f.location.dotted, "hint": f.hint,
            "figures": [{"name": g.name, "value": _number(g.value), "unit": g.unit}
                        for g in f.figures],
            "headline": _headline(f),
            "assumptions": list(f.assumptions),
        },
    }
    related = []
    if f.location.related is not None:  # a netlist's component: the design that names it
        rel = f.location.related
        related.append({**_location(rel.file, rel.line, rel.column, root),
                        "message": {"text": "the design that reads this netlist"}})
    if f.members:  # one cause on parallel packages: every member's place, one result
        result["properties"].update(members=list(f.members), group=f.group)
        for ref, where in zip(f.members[1:], f.locations):
            related.append({**_location(where.file, where.line, where.column, root),
                            "message": {"text": f"{ref}, in the same group ({f.group})"}})
    if f.also:
        result["properties"]["alsoFoundBy"] = list(f.also)
    if f.merged:
        result["properties"]["mergedFingerprints"] = list(f.merged)
    if related:
        result["relatedLocations"] = [{"id": i, **r} for i, r in enumerate(related, 1)]
    if f.waived:
        result["suppressions"] = [{"kind": "inSource", "status": "accepted",
                                   "justification": f.waived}]
    if state is not None:
        result["baselineState"] = state
    return result


def _number(value: float) -> float | None:
    """JSON has no infinity: a figure that is not finite (no sense path, say) becomes null."""
    return value if isinstance(value, (int, float)) and math.isfinite(value) else None


def _absent_result(e: Any, index: dict[str, int]) -> dict[str, Any]:
    loc: dict[str, Any] = {"physicalLocation": {
        "artifactLocation": ({"uri": e.file, "uriBaseId": SRCROOT} if not e.file.startswith("/")
                             else {"uri": Path(e.file).as_uri()}),
        "region": {"startLine": e.line, "startColumn": e.column}}}
    return {
        "ruleId": e.rule,
        "ruleIndex": index[e.rule],
        "level": LEVELS[Severity(e.severity)],
        "message": {"text": e.message or f"{e.rule} finding no longer reported"},
        "locations": [loc],
        "partialFingerprints": {FINGERPRINT_KEY: e.fingerprint},
        "baselineState": "absent",
        "properties": {"element": e.element, "yamlPath": e.path},
    }


def _input_error_result(err: Any, index: dict[str, int], root: Path, state: str | None) -> dict:
    result: dict[str, Any] = {
        "ruleId": INPUT_ERROR,
        "ruleIndex": index[INPUT_ERROR],
        "level": "error",
        "message": {"text": err.message},
        "locations": [_location(err.file, err.line, err.column, root)],
    }
    if state is not None:
        # input errors are never matched against an earlier set: each run must fix them
        result["baselineState"] = "new"
    return result


# This format writes a finding's own figures, never a design's key figures: a batch need not hold
# them (batch.lint).
render.figures_up_to = 0  # type: ignore[attr-defined]
