"""One finding per root cause (packwarden.grouping), in every format, with baselines and waivers.

The design: the Ridgeline tool pack with four parallel FETs per switch
(tests/rules/designs/grouping/four-parallel.yaml), each rated for a quarter of the current but
not for the share of one at the low end of its on-resistance spread.
"""

from __future__ import annotations

import json
from dataclasses import replace
from pathlib import Path

import pytest

from packwarden.baseline import compare, entries_of
from packwarden.engine import PHASES, RunResult, Session, group_phase, lint, lint_file, load_registry
from packwarden.loader import load_file
from packwarden.overrides import Override, apply_overrides
from packwarden.report import RenderOptions, formatter

from report_data import FLAWED, REPO
from test_sarif import errors_of, sarif, validator  # noqa: F401 - the schema fixture

FOUR = REPO / "tests/rules/designs/grouping/four-parallel.yaml"
SPIKE = REPO / "example_designs/flawed/wiring-spike.yaml"
SHARING = "switch-current-sharing"


@pytest.fixture(scope="module")
def four_run() -> RunResult:
    return lint([str(FOUR)])


def _sharing(run: RunResult) -> list:
    return [f for f in run.all_findings() if f.rule == SHARING]


def lint_changed(design: Path, *changes: Override):
    """``design`` with ``changes`` applied in memory, linted with the installed rules."""
    shown = design.relative_to(REPO).as_posix()
    doc = apply_overrides(load_file(design, shown), changes)
    return lint_file(Session(load_registry()), design, shown, document=doc)


def test_four_parallel_packages_give_one_finding_per_cause(four_run) -> None:
    found = _sharing(four_run)
    # Two causes (id_max in the permitted event, id_pulse_max in the hard short) on each of two
    # switches: four findings, not sixteen.
    assert len(found) == 4
    groups = sorted((f.group, f.key.split("-")[-1]) for f in found)
    assert groups == [("Q1–Q4, discharge switch, 4 in parallel", "id_max"),
                      ("Q1–Q4, discharge switch, 4 in parallel", "id_pulse_max"),
                      ("Q5–Q8, charge switch, 4 in parallel", "id_max"),
                      ("Q5–Q8, charge switch, 4 in parallel", "id_pulse_max")]
    for f in found:
        assert len(f.members) == 4 and len(f.locations) == 3 and len(f.merged) == 4
        assert f.fingerprint == f.merged[0]
        assert f.group in f.message


def test_the_grouped_share_is_the_current_divider_of_four(four_run) -> None:
    # [derived: current divider, docs/references.md "What parts survive over time"] one part at
    # the low end of the spread, R_min = typ − (max − typ) = 2.5 − 0.7 = 1.8 mΩ (the part's table
    # at 10 V; the rule's stated assumption), beside three at 3.2 mΩ: it carries
    # G_low / (G_low + 3·G_high) of the switch's current, where an equal share is 1/4.
    g_low, g_high = 1 / 1.8e-3, 1 / 3.2e-3
    factor = (g_low / (g_low + 3 * g_high)) / 0.25
    for f in _sharing(four_run):
        figs = {g.name: g.value for g in f.figures}
        assert figs["worst share"] / figs["equal share"] == pytest.approx(factor, rel=0.01)


def test_sarif_has_one_result_with_every_member(four_run, validator) -> None:  # noqa: F811
    log = sarif(four_run)
    assert errors_of(validator, log) == []
    results = [r for r in log["runs"][0]["results"] if r["ruleId"] == SHARING]
    assert len(results) == 4
    for r in results:
        assert len(r["properties"]["members"]) == 4
        related = r["relatedLocations"]
        assert [x["id"] for x in related] == [1, 2, 3]
        assert {x["physicalLocation"]["region"]["startLine"] for x in related} | {
            r["locations"][0]["physicalLocation"]["region"]["startLine"]} == {
            line for line in _component_lines(r["properties"]["members"])}


def _component_lines(refs) -> set[int]:
    lines = FOUR.read_text(encoding="utf-8").splitlines()
    return {n for n, text in enumerate(lines, 1) for ref in refs if text.startswith(f"  {ref}: ")}


@pytest.mark.parametrize("fmt", ["text", "json", "junit", "markdown", "html"])
def test_every_format_names_the_group(four_run, fmt) -> None:
    out = formatter(fmt)(four_run, RenderOptions())
    assert "Q1–Q4, discharge switch, 4 in parallel" in out
    assert "Q5–Q8, charge switch, 4 in parallel" in out


def test_json_lists_members_and_their_places(four_run) -> None:
    doc = json.loads(formatter("json")(four_run, RenderOptions()))
    found = [f for f in doc["designs"][0]["findings"] if f["rule"] == SHARING]
    assert {tuple(f["members"]) for f in found} == {("Q1", "Q2", "Q3", "Q4"),
                                                     ("Q5", "Q6", "Q7", "Q8")}
    assert all(len(f["member_locations"]) == 3 and len(f["merged_fingerprints"]) == 4
               for f in found)


def test_a_baseline_written_before_grouping_still_matches(monkeypatch) -> None:
    import packwarden.pipeline as pipeline
    monkeypatch.setattr(pipeline, "PHASES", tuple(p for p in PHASES if p is not group_phase))
    before = lint([str(FOUR)])
    assert len(_sharing(before)) == 16  # each of eight packages, two causes: the old wall
    monkeypatch.undo()
    now = lint([str(FOUR)])
    _, cmp = compare(now, entries_of(before), "baseline.json")
    assert cmp.new == [] and cmp.absent == []
    assert len(cmp.unchanged) == len(now.all_findings())


def test_a_baseline_written_after_grouping_matches_again(four_run) -> None:
    _, cmp = compare(four_run, entries_of(four_run), "baseline.json")
    assert cmp.new == [] and cmp.absent == []


def _waiver(element: str | None = None, up_to: str | None = None, rule: str = SHARING) -> dict:
    out = {"rule": rule, "reason": "bench-tested, report TR-7", "expires": "2099-01-01"}
    if element:
        out["element"] = element
    if up_to:
        out["up_to"] = up_to
    return out


def test_a_group_is_waived_only_when_every_member_is() -> None:
    one = lint_changed(FOUR, Override("add", "waivers", [_waiver("Q2")]))
    found = [f for f in one.findings if f.rule == SHARING]
    assert len(found) == 4 and not any(f.waived for f in found)
    q1_q4 = [f for f in found if "Q1–Q4" in f.group]
    assert all("waived for Q2 (bench-tested, report TR-7) only" in f.message for f in q1_q4)
    every = lint_changed(FOUR, Override("add", "waivers", [_waiver()]))
    found = [f for f in every.findings if f.rule == SHARING]
    assert len(found) == 4 and all(f.waived == "bench-tested, report TR-7" for f in found)
    assert not [f for f in every.findings if f.rule == "waiver-hygiene"]


# --- one cause seen by two rules ------------------------------------------------------------------

def test_a_turn_off_spike_two_rules_see_is_reported_once() -> None:
    run = lint([str(SPIKE)])
    found = run.all_findings()
    assert [f.rule for f in found] == ["short-circuit-stress"]
    f = found[0]
    assert f.also == ("switch-voltage-margin",) and "also found by switch-voltage-margin" in f.message
    assert len(f.merged) == 2
    # [derived: V = V_stack + L·di/dt, docs/references.md "Events in time"]: the design's 200 nH
    # turning off its 110 A prospective short in the assumed 1 µs, on a 4.33 V stack.
    assert f.headline.value == pytest.approx(4.33 + 200e-9 * 110 / 1e-6, rel=0.005)


def test_a_cause_merges_only_where_both_rules_find_it() -> None:
    # Without the wiring inductance there is no spike: the reversed charger is the voltage
    # margin's cause alone, and no finding names another rule.
    for design in FLAWED:
        for f in lint([str(design)]).all_findings():
            assert not f.also or f.rule == "short-circuit-stress", (design.name, f.message)


# --- waivers with a ceiling -------------------------------------------------------------------------

VOLTAGE = REPO / "example_designs/flawed/fet-voltage-too-low.yaml"


def test_a_ceiling_covers_what_is_below_it_and_not_what_is_above() -> None:
    # fet-voltage-too-low: Q1.1 must block 28.3 V (a reversed charger in series with the stack)
    # and Q1.2 21.6 V; a waiver up to 25 V covers the second only, one up to 30 V both.
    result = lint_changed(VOLTAGE, Override("add", "waivers", [
        _waiver("Q1", "25 V", rule="switch-voltage-margin")]))
    margin = {f.key: f for f in result.findings if f.rule == "switch-voltage-margin"}
    assert margin["vds-Q1.2"].waived == "bench-tested, report TR-7"
    assert margin["vds-Q1.1"].waived is None
    assert "up to 25 V does not cover blocking voltage 28.3 V" in margin["vds-Q1.1"].message
    assert not [f for f in result.findings if f.rule == "waiver-hygiene"]
    wide = lint_changed(VOLTAGE, Override("add", "waivers", [
        _waiver("Q1", "30 V", rule="switch-voltage-margin")]))
    assert all(f.waived for f in wide.findings if f.rule == "switch-voltage-margin")


def test_a_ceiling_in_another_unit_covers_nothing() -> None:
    result = lint_changed(VOLTAGE, Override("add", "waivers", [
        _waiver("Q1", "5 A", rule="switch-voltage-margin")]))
    margin = [f for f in result.findings if f.rule == "switch-voltage-margin"]
    assert margin and not any(f.waived for f in margin)
    assert all("bounds a figure in A" in f.message for f in margin)


@pytest.mark.parametrize("bad", ["1.5", "1.5 furlongs", "1,5 A"])
def test_a_ceiling_without_a_known_unit_is_a_located_input_error(bad) -> None:
    result = lint_changed(VOLTAGE, Override("add", "waivers", [
        _waiver("Q1", bad, rule="switch-voltage-margin")]))
    assert result.findings == [] and len(result.errors) == 1
    err = result.errors[0]
    assert err.file.endswith("fet-voltage-too-low.yaml") and err.line > 1
    assert "up_to" in str(err) and "Traceback" not in str(err)


# --- assumptions in every output ----------------------------------------------------------------

def test_each_format_carries_the_assumptions_a_figure_rests_on(four_run) -> None:
    # The worst share rests on a minimum on-resistance the part does not give: taken as
    # typ − (max − typ), a symmetric spread [practice, docs/references.md "One cause, one finding"].
    note = "min = typ - (max - typ), a symmetric spread"
    found = _sharing(four_run)
    assert all(any(note in a for a in f.assumptions) for f in found)
    text = formatter("text")(four_run, RenderOptions())
    assert any(line.startswith("    assumes: ") and note in line for line in text.splitlines())
    doc = json.loads(formatter("json")(four_run, RenderOptions()))
    assert all(any(note in a for a in f["assumptions"])
               for f in doc["designs"][0]["findings"] if f["rule"] == SHARING)
    log = sarif(four_run)
    assert all(any(note in a for a in r["properties"]["assumptions"])
               for r in log["runs"][0]["results"] if r["ruleId"] == SHARING)
    for fmt in ("junit", "markdown", "html"):
        assert "assumes: " in formatter(fmt)(four_run, RenderOptions()).replace("*assumes:* ",
                                                                               "assumes: ")
