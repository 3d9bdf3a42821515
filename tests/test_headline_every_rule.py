"""Every finding with figures names its headline figure and which way it makes the finding worse,
and a waiver's bound on that figure covers the finding just beyond its value and not just inside.

Walks every rule on every flawed example design. Which figure a rule's finding is headed by is an
engineer's choice, stated in docs/references.md "A finding's headline figure" [practice]: the
stress a part sees (a current, a voltage, a junction or cell temperature) worsens as it grows; a
protective margin (a trip minimum below the load, a detection threshold below the cell's limit,
a hold current, a release hysteresis, the months to the cut-off) worsens as it falls.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from packwarden.api import Finding
from packwarden.engine import Session, lint, lint_file, load_registry
from packwarden.headlines import headlines
from packwarden.loader import load_file
from packwarden.overrides import Override, apply_overrides
from packwarden.report import RenderOptions, formatter

REPO = Path(__file__).resolve().parent.parent
FLAWED = sorted((REPO / "example_designs" / "flawed").glob("*.yaml"))
SESSION = Session(load_registry())

# (rule, key) -> (headline, worse) for the findings whose direction is the point of the rule, as
# an engineer reads it [practice: docs/references.md "A finding's headline figure"].
EXPECTED = {
    ("trip-current-window", "min-vs-continuous"): ("trip min", "lower"),
    ("switch-voltage-margin", "vds-Q1.1"): ("blocking voltage", "higher"),
    ("switch-temperature", "continuous"): ("junction temperature", "higher"),
    ("short-circuit-reach", "weakest-short-uncleared"): ("weakest short", "lower"),
    ("storage-drain", "lower-limit"): ("months to cut-off", "lower"),
    ("release-hysteresis", "overdischarge"): ("hysteresis", "lower"),
    ("secondary-protection", "rating"): ("permitted current", "higher"),
    ("threshold-ladder", "overcharge-vs-charger"): ("overcharge detect min", "lower"),
}


def lint_changed(path: Path, *changes: Override):
    shown = path.relative_to(REPO).as_posix()
    doc = apply_overrides(load_file(path, shown), changes) if changes else None
    return lint_file(SESSION, path, shown, document=doc)


def with_figures(path: Path) -> list[Finding]:
    return [f for f in lint_changed(path).findings if f.figures and not f.waived]


def test_the_walk_meets_findings_of_many_rules() -> None:
    # a walk over no findings would prove nothing
    rules = {f.rule for path in FLAWED for f in with_figures(path)}
    assert len(rules) >= 20, sorted(rules)


@pytest.mark.parametrize("path", FLAWED, ids=lambda p: p.stem)
def test_every_finding_names_a_headline_among_its_figures(path: Path) -> None:
    for f in with_figures(path):
        assert f.headline_figure, f"{f.rule} ({f.key}) names no headline figure"
        assert f.headline_figure in {g.name for g in f.figures}, (f.rule, f.key)
        expected = EXPECTED.get((f.rule, f.key))
        if expected is not None:
            assert (f.headline.name, f.worse) == expected


@pytest.mark.parametrize("path", FLAWED, ids=lambda p: p.stem)
def test_the_rule_reference_names_each_findings_headline_and_bound(path: Path) -> None:
    # docs/rules.md's "Waiver bounds" are read from the rules' code (packwarden.headlines): each
    # finding met on the flawed examples must be one of the calls it lists, with its direction.
    rules = SESSION.registry.rules
    for f in with_figures(path):
        listed = headlines(rules[f.rule])
        assert any(h.matches(f.key, f.headline.name, f.lower_is_worse) for h in listed), (
            f.rule, f.key, f.headline.name, f.worse, listed)


def _bound(f: Finding, beyond: bool) -> dict[str, str]:
    """A waiver bound of the finding's direction just beyond its headline value (it covers the
    finding) or just inside it (it does not): 1 % off, and an absolute step at zero."""
    value = f.headline.value
    step = abs(value) * 0.01 or 1e-6
    outward = 1.0 if beyond else -1.0
    if f.lower_is_worse:
        return {"down_to": f"{value - outward * step:.9g} {f.headline.unit}"}
    return {"up_to": f"{value + outward * step:.9g} {f.headline.unit}"}


def _elements(f: Finding) -> list[str | None]:
    """What a waiver names to cover ``f``: each member of a group (a group counts while any
    member is not waived), else its element."""
    return list(f.members) or [f.element]


def _rounds(findings: list[Finding]) -> list[list[Finding]]:
    """The findings in rounds where no waiver can match another round-mate's finding: a waiver
    matches a rule and an element (any element when it names none)."""
    rounds: list[list[Finding]] = []
    for f in findings:
        for r in rounds:
            if all(g.rule != f.rule or (None not in _elements(f) + _elements(g)
                                        and not set(_elements(f)) & set(_elements(g)))
                   for g in r):
                r.append(f)
                break
        else:
            rounds.append([f])
    return rounds


@pytest.mark.parametrize("path", FLAWED, ids=lambda p: p.stem)
def test_a_bound_just_beyond_the_headline_waives_and_just_inside_does_not(path: Path) -> None:
    for group in _rounds(with_figures(path)):
        bounded = [f for f in group if f.headline.unit]
        for beyond in (True, False):
            waivers = [{"rule": f.rule, "element": e, "reason": "bench report TR-7",
                        **_bound(f, beyond)} for f in bounded for e in _elements(f)]
            if not waivers:
                continue
            after = {g.fingerprint: g for g in lint_changed(path, Override("add", "waivers", waivers)).findings}
            for f in bounded:
                g = after[f.fingerprint]
                assert bool(g.waived) == beyond, (f.rule, f.key, f.headline, g.message)
                if not beyond:
                    assert "not waived" in g.message and f.headline.name in g.message
                    way = "falls" if f.lower_is_worse else "grows"
                    assert f", worse as it {way}" in g.message


def test_a_count_cannot_be_bounded_and_says_so() -> None:
    # A count (the protector's cells against the stack's) has no unit a bound could be written
    # in: a bound must name its unit (packwarden.quantities.parse_any_quantity), so a bounded
    # waiver leaves the finding standing and says why.
    path = REPO / "example_designs/flawed/ridgeline-3s-protector.yaml"
    f = next(f for f in with_figures(path) if f.key == "cell-count")
    assert f.headline.unit == ""
    waiver = {"rule": f.rule, "element": f.element, "reason": "bench report TR-7", "up_to": "9 V"}
    g = next(g for g in lint_changed(path, Override("add", "waivers", [waiver])).findings
             if g.fingerprint == f.fingerprint)
    assert not g.waived and "in a count" in g.message


def test_json_and_sarif_carry_the_headline_and_its_direction() -> None:
    run = lint(["example_designs/flawed/trip-below-load.yaml"])
    opts = RenderOptions()
    data = json.loads(formatter("json")(run, opts))
    heads = {f["key"]: f["headline"] for f in data["designs"][0]["findings"]}
    assert heads["min-vs-continuous"]["figure"] == "trip min"
    assert heads["min-vs-continuous"]["worse"] == "lower"
    assert heads["min-vs-continuous"]["unit"] == "A"
    sarif = json.loads(formatter("sarif")(run, opts))
    props = [r["properties"]["headline"] for r in sarif["runs"][0]["results"]
             if r["ruleId"] == "trip-current-window"]
    assert props and all(p["figure"] == "trip min" and p["worse"] == "lower" for p in props)
