"""The assistant's values to change: for a finding no library part fixes (a trace, the wiring, the
charger, the load), the value its own hint proposes, put where the design holds it and linted
again; or, plainly, why nothing can be suggested.

The re-lint is the check that the value fits (the assistant only places the hint's value; every
rule judges the changed design); this test applies each fitting value itself and lints again.
The trace's width is held against IPC-2221 worked by hand.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from packwarden.assist import assist
from packwarden.engine import Session, lint_file, load_registry
from packwarden.loader import load_file
from packwarden.overrides import Override, apply_overrides
from packwarden.quantities import parse_quantity

REPO = Path(__file__).resolve().parent.parent
FLAWED = sorted((REPO / "example_designs" / "flawed").glob("*.yaml"))
COUNTED = ("error", "warning")


@pytest.fixture(scope="module")
def session() -> Session:
    return Session(registry=load_registry())


@pytest.fixture(scope="module")
def answers(session) -> dict:
    out = {}
    for path in FLAWED:
        shown = path.relative_to(REPO).as_posix()
        out[path.stem] = (shown, assist(session, path, shown))
    return out


def _value(answers, design: str, rule: str):
    return next(v for v in answers[design][1].values if v.finding.rule == rule)


def _identity(f) -> tuple:
    return (f.rule, f.element or "", f.key)


def test_every_fitting_value_applied_clears_its_finding_and_raises_nothing_new(
        session, answers) -> None:
    fitting = [(shown, v) for shown, help_ in answers.values() for v in help_.values if v.fits]
    assert len(fitting) >= 3, "the walk must meet values that fit"
    for shown, v in fitting:
        base = lint_file(session, REPO / shown, shown)
        counted = lambda r: [f for f in r.findings  # noqa: E731
                             if f.severity.value in COUNTED and not f.waived]
        before = {_identity(f) for f in counted(base)}
        target = [f for f in counted(base) if f.rule == v.finding.rule
                  and (f.element or "") == v.finding.element and f.message == v.finding.message]
        assert len(target) == 1
        doc = apply_overrides(load_file(REPO / shown, shown),
                              [Override("set", p, v.value) for p in v.paths])
        after = counted(lint_file(session, REPO / shown, shown, document=doc))
        assert _identity(target[0]) not in {_identity(f) for f in after}, (shown, v.text())
        assert not [f for f in after if _identity(f) not in before], (shown, v.text())


def test_the_trace_width_comes_from_its_hint_and_meets_ipc_2221(answers) -> None:
    # IPC-2221 [published, docs/references.md "Conductor current capacity"]: I = k ΔT^0.44
    # A^0.725, A in mil², k = 0.048 for an outer layer; 1 oz copper is 1.378 mil thick. The
    # permitted current 5.47 A (the finding's figure) at the 10 K rise the rule allows needs
    # A = (5.47 / (0.048 × 10^0.44))^(1/0.725) = 170 mil², a width of 170 / 1.378 mil = 3.13 mm.
    v = _value(answers, "narrow-trace", "conductor-capacity")
    assert v.fits and v.paths == ["components.T1.width"]
    area = (5.47 / (0.048 * 10 ** 0.44)) ** (1 / 0.725)
    by_hand = area / 1.378 * 25.4e-6
    assert parse_quantity(v.value, "m") == pytest.approx(by_hand, rel=0.01)
    assert parse_quantity(v.value, "m") >= by_hand * 0.999  # the hint rounds toward the safe side


def test_a_value_at_the_charger_fits(answers) -> None:
    v = _value(answers, "charger-current-too-high", "charge-conditions")
    assert v.fits and v.paths == ["charger.current"]


def test_the_wiring_inductance_fits(answers) -> None:
    v = _value(answers, "wiring-spike", "short-circuit-stress")
    assert v.fits and v.paths == ["pack.wiring_inductance"]


def test_nothing_to_suggest_says_why(answers) -> None:
    # a missing fuse is a part to add, not a value
    v = _value(answers, "no-fuse", "secondary-protection")
    assert not v.value and "proposes no value" in v.note and "a part to add" in v.note
    # a toleranced detection {typ, tol}: the hint's 4.3 V could be either, and it says neither
    v = _value(answers, "ridgeline-backup-below-primary", "backup-overvoltage")
    assert not v.value and "typ or tol" in v.note
    # the switch-on inrush's hint is a pre-charge path (ohms, joules); the load holds farads
    v = _value(answers, "ebike-no-precharge", "switch-on-inrush")
    assert not v.value and "the design holds none there" in v.note


def test_a_hint_that_restates_the_design_proposes_nothing(answers) -> None:
    # trip-current-window's hint names the 1.6 A peak the trip must clear: the design's own value
    v = _value(answers, "fet-cooks-below-trip", "trip-current-window")
    assert not v.value and "restates the design's own load.peak.current" in v.note


def test_every_finding_no_part_fixes_gets_an_answer(answers) -> None:
    for design, (_, help_) in answers.items():
        for v in help_.values:
            assert v.value or v.note, (design, v.finding)
            assert ("nothing to suggest" in v.text()) == (not v.value)
