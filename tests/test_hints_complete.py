"""Every hint that proposes a number is accounted for (issue 18 item 2, hints that fit).

A hint on the examples that proposes a number is either applied by a row of the hint table
(``test_hints_fit.HINTS``, the rows here, ``MORE_HINTS``, or the pre-charge test below), or says
that no value fits and names a structural change (``EMPTY`` there and ``MORE_EMPTY`` here), or is
listed in ``EXEMPT`` with the reason it is not a value to apply to the design; a hint exempt
because it names a library part's rating is answered by ``packwarden assist``'s part
suggestion, which the test asks for. A numeric hint added later without a row fails here.

The re-lint is the independent judge, as in ``test_hints_fit``; the pre-charge path's ½CV² is
checked by hand against the design's capacitance and the cells' upper voltage limit.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from packwarden.assist import assist
from packwarden.engine import Session, lint_file, load_registry
from packwarden.loader import load_file
from packwarden.overrides import Override, apply_overrides
from packwarden.quantities import parse_quantity

from test_hints_fit import (EMPTY, FLAWED, HINTS, REPO, _identity, _inline, _field, _library_part,
                            _pulse_rating,
                            test_a_hinted_value_applied_clears_its_finding_and_raises_no_other
                            as applied_and_relinted,
                            test_an_empty_range_says_so_and_names_a_structural_change
                            as said_empty)


def _each_part_field(name: str, *components: str):
    """Each component's library part written inline with the hinted ``name`` (one line of the
    bill of materials: every package of the parallel group gets the better part)."""
    def apply(doc, value: str) -> list[Override]:
        return [_inline(doc, c, **{name: value}) for c in components]
    return apply


CELLS = [f"BT{k}" for k in range(1, 9)]
FETS = ("Q1", "Q2", "Q3", "Q4")

# (design, rule, element, the hint's words before the value, the value's unit, how to apply it),
# run by test_hints_fit's test.
MORE_HINTS = [
    # the FETs' continuous and pulse ratings against the worst share of the on-resistance spread:
    # the hinted rating given to all four packages of the parallel groups
    *[("ridgeline-fet-share.yaml", "switch-current-sharing", q, "id_max ≥", "A",
       _each_part_field("id_max", *FETS)) for q in FETS],
    *[("ridgeline-fet-share.yaml", "switch-current-sharing", q, "id_pulse_max ≥", "A",
       _each_part_field("id_pulse_max", *FETS)) for q in FETS],
    # the second-life cells' pulse rating for the gap overload, added to each cell's own
    ("ridgeline-weak-short.yaml", "cell-pulse-rating", "BT1", "{current:", "A",
     _pulse_rating("120 ms", *CELLS)),
    # storage: recharged within the hinted days, the lower limit is not reached
    ("ridgeline-led-always-on.yaml", "storage-drain", "BT1", "storage.duration ≤", "months",
     _field("storage.duration")),
    ("ridgeline-tap-load.yaml", "storage-drain", "BT1", "storage.duration ≤", "months",
     _field("storage.duration")),
]

MORE_EMPTY = [
    # the two cells' worth of heat at the continuous load and the peak needs a θJA below what a
    # power package reaches (rules/switch_temperature.py THETA_JA_FLOOR), and no on-resistance
    # fits the FET-sensed window (tests/test_hints_rdsfit.py)
    ("high-threshold-fet.yaml", "switch-temperature", "no package fixes it",
     "shunt-sensed protector"),
    # a three-cell protector on four cells: the fourth level has no bleed switch at all
    ("ridgeline-3s-protector.yaml", "cell-balance", "no bleed resistor value helps",
     "a bleed switch for every level"),
    # the over-current window spans × 4.75, the room between the 1.6 A load and the 3.7 A weakest
    # short only × 2.3
    ("probe-charger-fault-overshoot.yaml", "short-circuit-reach",
     "no sense resistance or detection voltage fits", "shunt-sensed protector"),
]

PART = "names a library part rating: the assistant's part suggestion answers it"
# (design, rule, element, the hint's words, why it is not applied, whether assist must answer)
EXEMPT = [
    # a protector's thresholds are its part's: another protector, not a value of the design
    ("charger-current-too-high.yaml", "release-hysteresis", "U1", "overcharge release ≤", PART,
     True),
    ("od-release-too-close.yaml", "release-hysteresis", "U1", "release ≥", PART, True),
    ("probe-charger-fault-overshoot.yaml", "release-hysteresis", "U1", "overcharge release ≤",
     PART, True),
    ("probe-charger-fault-overshoot.yaml", "release-hysteresis", "U1", "release ≥", PART, True),
    ("ridgeline-3s-protector.yaml", "threshold-ladder", "U1", "a protector for 4 series", PART,
     True),
    # the stack's cells are one library part; the hint's first fix, the pre-charge path, is
    # the inrush hint's, whose test below adds it and sees this finding go
    ("ebike-no-precharge.yaml", "cell-pulse-rating", "BT1", "cells rated for ≥", PART, True),
    # a figure to read from the FET's data sheet, not a value to choose
    ("high-threshold-fet.yaml", "on-resistance-in-table", "Q1", "give R_DS(on) at",
     "asks for the data sheet's figure at a gate drive, not a value of the design", False),
]

#: A number a hint proposes: a figure not part of a name (Q1.1, R11, T1).
NUMBER = re.compile(r"(?<![\w.])\d")


@pytest.fixture(scope="module")
def session() -> Session:
    return Session(registry=load_registry(), grouping=False)


@pytest.mark.parametrize("design, rule, element, words, unit, apply", MORE_HINTS,
                         ids=[f"{h[0]}-{h[1]}-{h[2]}-{h[3]}" for h in MORE_HINTS])
def test_a_hinted_value_applied_clears_its_finding(session, design, rule, element, words, unit,
                                                   apply) -> None:
    applied_and_relinted(session, design, rule, element, words, unit, apply)


@pytest.mark.parametrize("design, rule, opening, change", MORE_EMPTY,
                         ids=[f"{e[0]}-{e[1]}" for e in MORE_EMPTY])
def test_an_empty_range_names_a_structural_change(session, design, rule, opening, change) -> None:
    said_empty(session, design, rule, opening, change)


PRECHARGE_DESIGN = "ebike-no-precharge.yaml"


def test_the_precharge_hint_added_clears_the_inrush_and_raises_nothing(session) -> None:
    shown = f"{FLAWED}/{PRECHARGE_DESIGN}"
    base = lint_file(session, REPO / shown, shown)
    [finding] = [f for f in base.findings if f.rule == "switch-on-inrush"]
    hint = finding.hint
    m = re.search(r"(PR\d+): \{kind: precharge, resistance: \{typ: ([^,]+), tol: ([^}]+)\}, "
                  r"delay: ([^,]+), pulse_energy: ([^,]+), pulse_power: ([^,]+), "
                  r"pins: \[([^\]]+)\]\}", hint)
    assert m, hint
    ref, typ, tol, delay, energy, power, pins = m.groups()
    doc = load_file(REPO / shown, shown)
    # ½CV², the energy a capacitor stores [practice], by hand: the controller's 2200 µF charged
    # to the stack's highest voltage, 13 cells each at the highest the protector lets a cell
    # reach (its overcharge detection, typical plus tolerance)
    farads = parse_quantity(doc.data["load"]["input_capacitance"], "F")
    detect = _library_part(doc, doc.data["components"]["U1"]["part"])["overcharge"]["detect"]
    per_cell = parse_quantity(detect["typ"], "V") + parse_quantity(detect["tol"], "V")
    volts = doc.data["stacks"][0]["series"] * per_cell
    half_cv2 = 0.5 * farads * volts ** 2
    assert re.search(r"½CV² = ([0-9.]+) J", hint) and \
        float(re.search(r"½CV² = ([0-9.]+) J", hint).group(1)) == pytest.approx(half_cv2, rel=0.005)
    assert parse_quantity(energy, "J") >= half_cv2  # the resistor's rating covers it
    # its peak power V²/R at the lowest resistance [practice: Ohm's law and Joule heating]
    r_min = parse_quantity(typ, "Ω") * (1 - parse_quantity(tol, "%") / 100)
    assert parse_quantity(power, "W") >= volts ** 2 / r_min
    component = {"kind": "precharge", "resistance": {"typ": typ, "tol": tol}, "delay": delay,
                 "pulse_energy": energy, "pulse_power": power,
                 "pins": [p.strip() for p in pins.split(",")]}
    changed = lint_file(session, REPO / shown, shown,
                        document=apply_overrides(doc, [Override("add", f"components.{ref}",
                                                                component)]))
    assert not changed.errors, changed.errors
    after = {_identity(f) for f in changed.findings if not f.waived}
    assert _identity(finding) not in after
    before = {_identity(f) for f in base.findings}
    new = [f for f in changed.findings if _identity(f) not in before]
    assert not new, "; ".join(f"{f.rule}: {f.message}" for f in new)
    # the cells' pulse finding was the inrush's: its hint says so first, and it goes with it
    (pulse,) = [f for f in base.findings if f.rule == "cell-pulse-rating"]
    assert pulse.hint.startswith("add a pre-charge path")
    assert not [f for f in changed.findings if f.rule == "cell-pulse-rating"]


# Hints applied by a test of their own, by (design, rule, element).
APPLIED_ELSEWHERE = {(PRECHARGE_DESIGN, "switch-on-inrush", "load")}


def _designs() -> list[Path]:
    return (sorted((REPO / FLAWED).glob("*.yaml")) +
            sorted((REPO / "example_designs").glob("*.yaml")))


def _numeric_hints(session) -> list[tuple[str, object]]:
    out = []
    for path in _designs():
        shown = str(path.relative_to(REPO))
        for f in lint_file(session, path, shown).findings:
            if f.hint and NUMBER.search(f.hint):
                out.append((path.name, f))
    return out


def _row_applies(row, design: str, f) -> bool:
    name, rule, element, words, unit = row[:5]
    if (name, rule, element) != (design, f.rule, f.element):
        return False
    value = r" ([0-9.]+-[0-9.]+)" if not unit else r" ([0-9.]+ ?[^\s,;)]*)"
    return re.search(re.escape(words) + value, f.hint) is not None


def _accounted(design: str, f) -> str | None:
    """Which table accounts for the hint of finding ``f``: None when none does."""
    if any(_row_applies(r, design, f) for r in HINTS + MORE_HINTS):
        return "applied"
    if (design, f.rule, f.element) in APPLIED_ELSEWHERE:
        return "applied"
    if any((design, f.rule) == e[:2] and f.hint.startswith(e[2]) and e[3] in f.hint
           for e in EMPTY + MORE_EMPTY):
        return "empty"
    if any((design, f.rule, f.element) == e[:3] and e[3] in f.hint for e in EXEMPT):
        return "exempt"
    return None


def test_every_numeric_hint_is_applied_said_empty_or_exempt(session) -> None:
    found = _numeric_hints(session)
    assert len(found) > 40  # the flawed examples' numeric hints, not an empty walk
    missing = [f"{d} {f.rule} at {f.element}: {f.hint}" for d, f in found
               if _accounted(d, f) is None]
    assert not missing, "numeric hints with no row:\n" + "\n".join(missing)


def test_every_exempt_row_still_matches_a_hint(session) -> None:
    # a row left behind when its hint changes would exempt the next hint by accident
    found = _numeric_hints(session)
    for design, rule, element, words, _, _ in EXEMPT:
        assert any((d, f.rule, f.element) == (design, rule, element) and words in f.hint
                   for d, f in found), (design, rule, element, words)


@pytest.mark.parametrize("design, rule, element", sorted(
    {(e[0], e[1], e[2]) for e in EXEMPT if e[5]}))
def test_an_exempt_part_rating_is_answered_by_the_assistant(session, design, rule,
                                                           element) -> None:
    # packwarden assist tries every part of the same kind in the design's libraries; for the
    # finding it either lists those that pass or says why none can
    shown = f"{FLAWED}/{design}"
    out = assist(session, REPO / shown, shown)
    advice = [a for a in out.advice if any((b.rule, b.element) == (rule, element)
                                           for b in a.findings)]
    values = [v for v in out.values if (v.finding.rule, v.finding.element) == (rule, element)]
    assert advice or values, f"the assistant says nothing about {rule} at {element}"
    assert all(a.passing or a.note for a in advice)
    assert all(v.fits or v.note for v in values)
