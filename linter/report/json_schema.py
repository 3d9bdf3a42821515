"""The JSON Schema of ``packwarden check -f json`` (shipped as ``schemas/report.schema.json``).

Written out here, beside the formatter it describes (``json_format.py``); ``tests/test_schemas.py``
validates the JSON report of every example design against it, so the two cannot part. A finding
is described field by field; a design's events and temperature cut-offs are open objects (their
fields are the model's, docs/output-formats.md "Events").
"""

from __future__ import annotations

from typing import Any


def _d(text: str, **schema: Any) -> dict[str, Any]:
    return {"description": text, **schema}


_NUMBER = {"type": ["number", "null"]}
_TEXT_OR_NULL = {"type": ["string", "null"]}


def _place(what: str) -> dict[str, Any]:
    return _d(what, type="object", required=["file", "line", "column"], properties={
        "file": _d("the file, as given on the command line or relative to the run", type="string"),
        "path": _d("the YAML path, dotted (components.Q1.part)", type="string"),
        "line": _d("line, from 1", type="integer", minimum=1),
        "column": _d("column in Unicode code points, from 1", type="integer", minimum=1),
        "design": _d("for a component of the schematic's netlist: the design that reads the "
                     "netlist (file, line, column)", type="object"),
    })


_FIGURE = _d("a number the rule computed or compared", type="object",
             required=["name", "value", "unit"], additionalProperties=False, properties={
                 "name": _d("what the number is", type="string"),
                 "value": _d("its value in SI units (null where it is not finite)", **_NUMBER),
                 "unit": _d("its unit symbol; empty for a count", type="string"),
             })

_HEADLINE = _d(
    "the figure whose change makes the finding worse, the one a waiver's up_to or down_to "
    "bounds; null for a finding without figures", type=["object", "null"],
    required=["figure", "value", "unit", "worse"], additionalProperties=False, properties={
        "figure": _d("the name of one of the finding's figures", type="string"),
        "value": _d("its value in SI units", **_NUMBER),
        "unit": _d("its unit symbol; empty for a count", type="string"),
        "worse": _d("which way the finding worsens: 'higher' (a waiver bounds it with up_to) or "
                    "'lower' (down_to)", enum=["higher", "lower"]),
    })

_FINDING = _d("one finding", type="object", additionalProperties=False, required=[
    "rule", "severity", "message", "hint", "element", "key", "location", "figures", "headline",
    "waived", "fingerprint", "assumptions"], properties={
    "rule": _d("the rule's id", type="string"),
    "severity": _d("error, warning or info", enum=["error", "warning", "info"]),
    "message": _d("what is wrong, with the figures that show it", type="string"),
    "hint": _d("how to fix it, or null", **_TEXT_OR_NULL),
    "element": _d("the design element it concerns (Q1), or null", **_TEXT_OR_NULL),
    "key": _d("tells apart several findings of one rule on one element", type="string"),
    "location": _place("where the finding is, by YAML path, line and column"),
    "figures": _d("the numbers the finding rests on", type="array", items=_FIGURE),
    "headline": _HEADLINE,
    "waived": _d("the waiver's reason when a waiver covers the finding, else null",
                 **_TEXT_OR_NULL),
    "fingerprint": _d("stable across edits elsewhere in the file (baselines key on it)",
                      type="string"),
    "assumptions": _d("what the figures rest on that the design does not give", type="array",
                      items={"type": "string"}),
    "group": _d("a grouped finding's members in words (Q1–Q4, discharge switch, 4 in parallel)",
                type="string"),
    "members": _d("a grouped finding's elements, every one", type="array",
                  items={"type": "string"}),
    "member_locations": _d("the places of the members after the first", type="array",
                           items=_place("a member's place")),
    "also_found_by": _d("other rules that found the same cause", type="array",
                        items={"type": "string"}),
    "merged_fingerprints": _d("the fingerprints the grouped findings had alone", type="array",
                              items={"type": "string"}),
})

_ERROR = _d("an input error: a file that cannot be used, at the line to fix", type="object",
            required=["file", "line", "column", "message"], properties={
                "file": _d("the file", type="string"),
                "line": _d("line, from 1", type="integer"),
                "column": _d("column, from 1", type="integer"),
                "message": _d("what is wrong", type="string"),
            })

_DESIGN = _d("one design of the run", type="object", required=[
    "file", "name", "figures", "events", "temperature_cutoffs", "findings", "internal_errors",
    "skipped_rules"], properties={
    "file": _d("the design file", type="string"),
    "name": _d("the design's name, or null when it could not be read", **_TEXT_OR_NULL),
    "figures": _d("the key figures by name (docs/output-formats.md, 'Key figures')",
                  type="object", additionalProperties=_NUMBER),
    "events": _d("what the pack lives through, each at its corner (docs/output-formats.md, "
                 "'Events')", type="array", items={"type": "object"}),
    "temperature_cutoffs": _d("each thermistor input's cut-off temperatures", type="array",
                              items={"type": "object"}),
    "findings": _d("the design's findings", type="array", items=_FINDING),
    "internal_errors": _d("rules that raised: the tool's fault, not the design's", type="array",
                          items=_d("a rule that raised", type="object", properties={
                              "rule": _d("the rule's id", type="string"),
                              "file": _d("the design", type="string"),
                              "message": _d("what it raised", type="string")})),
    "skipped_rules": _d("electrical rules held back until the netlist's errors are fixed",
                        type="array", items={"type": "string"}),
})


def report_schema() -> dict[str, Any]:
    """The JSON Schema (draft-07) of the JSON report."""
    return {
        "$schema": "http://json-schema.org/draft-07/schema#",
        "title": "packwarden JSON report",
        "description": "the output of packwarden check -f json",
        "type": "object",
        "required": ["tool", "exit_code", "errors", "broken_plugins", "designs"],
        "properties": {
            "tool": _d("the tool's name and version", type="object", properties={
                "name": _d("packwarden", type="string"),
                "version": _d("its version", type="string")}),
            "exit_code": _d("0 clean, 1 findings that fail the run, 2 the tool could not do its "
                            "job", type="integer", enum=[0, 1, 2]),
            "errors": _d("input errors", type="array", items=_ERROR),
            "broken_plugins": _d("plugins that failed to load", type="array", items=_d(
                "a plugin that failed to load", type="object", properties={
                    "plugin": _d("its entry point", type="string"),
                    "message": _d("why", type="string")})),
            "designs": _d("every design of the run", type="array", items=_DESIGN),
            "comparison": _d("with --baseline or --since: what 'designs' leaves out",
                             type="object", properties={
                                 "reference": _d("the baseline file or revision", type="string"),
                                 "new": _d("how many findings are new", type="integer"),
                                 "unchanged": _d("findings in the reference too", type="array",
                                                 items=_FINDING),
                                 "absent": _d("findings of the reference that are gone",
                                              type="array", items={"type": "object"})}),
        },
    }
