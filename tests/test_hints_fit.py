"""Hints that fit: a value a hint proposes, applied to the flawed example and linted again, clears
the finding it came from and raises no other (issue 18 item 2).

The re-lint is the independent check: the hint is computed by its rule, the design with the hint
applied is judged by every rule. A hint's value is read from its own text, as a reader would take
it (the rounded figure shown), and applied where the format holds it: a field of the design, or a
field of a library part, written inline in the component for the test.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from packwarden.engine import Session, lint_file, load_registry
from packwarden.loader import load_file
from packwarden.overrides import Override, apply_overrides
from packwarden.quantities import parse_quantity

REPO = Path(__file__).resolve().parent.parent
FLAWED = "example_designs/flawed"


def _library_part(doc, name: str) -> dict:
    for lib in doc.data["libraries"]:
        data = load_file(REPO / FLAWED / lib).data
        if name in data["parts"]:
            part = dict(data["parts"][name])
            part.pop("pinout", None)
            return part
    raise AssertionError(f"{name} is in none of the design's libraries")


def _inline(doc, component: str, **fields) -> Override:
    """The component's part written inline (from its library, or as it is), with ``fields``
    changed."""
    written = doc.data["components"][component]
    part = (_library_part(doc, written["part"]) if "part" in written else
            {k: v for k, v in written.items() if k != "pins"})
    part.update(fields)
    return Override("set", f"components.{component}", {**part, "pins": written["pins"]})


def _field(path: str):
    def apply(doc, value: str) -> list[Override]:
        return [Override("set", path, value)]
    return apply


def _part_field(component: str, name: str):
    def apply(doc, value: str) -> list[Override]:
        return [_inline(doc, component, **{name: value})]
    return apply


def _scaled_value(component: str):
    """The component's library resistor written inline, its value times the middle (geometric)
    of the hinted factor range "A-B"."""
    def apply(doc, value: str) -> list[Override]:
        low, high = (float(x) for x in value.split("-"))
        part = _library_part(doc, doc.data["components"][component]["part"])
        ohms = parse_quantity(part["value"], "Ω") * (low * high) ** 0.5
        return [_inline(doc, component, value=f"{ohms * 1e3:.6f} mΩ")]
    return apply


def _resistor(component: str, resistance: str):
    """An inline resistor of ``resistance`` with the hinted power rating."""
    def apply(doc, value: str) -> list[Override]:
        pins = doc.data["components"][component]["pins"]
        return [Override("set", f"components.{component}",
                         {"kind": "resistor", "value": resistance, "power": value, "pins": pins})]
    return apply


def _low_voltage_limit(component: str):
    """The protector's part written inline, charging a cell below its lower limit through a
    current limit of the hinted value (the form the hint names)."""
    def apply(doc, value: str) -> list[Override]:
        return [_inline(doc, component, low_voltage_charge={
            "allowed": True, "path": "current_limit", "current": value})]
    return apply


def _each_value(*components: str):
    """Each component's library part written inline with the hinted value."""
    def apply(doc, value: str) -> list[Override]:
        return [_inline(doc, c, value=value) for c in components]
    return apply


def _pulse_rating(duration: str, *cells: str):
    """Each cell's part written inline with a pulse rating of the hinted current for
    ``duration`` (the duration the hint names beside it) added to its own."""
    def apply(doc, value: str) -> list[Override]:
        out = []
        for c in cells:
            part = _library_part(doc, doc.data["components"][c]["part"])
            points = list(part.get("pulse_discharge") or [])
            out.append(_inline(doc, c, pulse_discharge=points + [
                {"current": value, "duration": duration}]))
        return out
    return apply


# (design, rule, element, the hint's words before the value, the value's unit, how to apply it)
HINTS = [
    ("charger-current-too-high.yaml", "charge-conditions", "BT1", "charge current to ≤", "A",
     _field("charger.current")),
    ("narrow-trace.yaml", "conductor-capacity", "T1", "widen T1 to ≥", "m",
     _field("components.T1.width")),
    ("narrow-trace.yaml", "conductor-withstand", "T1", "widen T1 to ≥", "m",
     _field("components.T1.width")),
    ("fuse-too-small.yaml", "secondary-protection", "F1", "use a fuse rated ≥", "A",
     _field("components.F1.rated_current")),
    # no resistance in the sense pin's range keeps the power within the rating: the rating moves
    ("fet-voltage-too-low.yaml", "support-network", "R2", "use 4 kΩ ± 1 % rated ≥", "W",
     _resistor("R2", "4 kΩ")),
    ("fet-voltage-too-low.yaml", "switch-voltage-margin", "Q1", "use a FET with vds_max ≥", "V",
     _part_field("Q1", "vds_max")),
    # the weakest short inside the over-current window: a factor on the shunt that moves the
    # window below the short while its minimum stays above the 25 A peak
    ("ridgeline-weak-short.yaml", "short-circuit-reach", "U1", "a factor", "",
     _scaled_value("RSH")),
    # the turn-off spike: both rules propose values meeting the derated limit, so either clears
    # both findings
    ("wiring-spike.yaml", "short-circuit-stress", "Q1", "keep pack.wiring_inductance ≤", "H",
     _field("pack.wiring_inductance")),
    ("wiring-spike.yaml", "short-circuit-stress", "Q1", "turn_off_time ≥", "s",
     _part_field("Q1", "turn_off_time")),
    ("wiring-spike.yaml", "short-circuit-stress", "Q1", "FETs with vds_max ≥", "V",
     _part_field("Q1", "vds_max")),
    ("wiring-spike.yaml", "switch-voltage-margin", "Q1", "use a FET with vds_max ≥", "V",
     _part_field("Q1", "vds_max")),
    ("wiring-spike.yaml", "switch-voltage-margin", "Q1", "keep pack.wiring_inductance ≤", "H",
     _field("pack.wiring_inductance")),
    ("wiring-spike.yaml", "switch-voltage-margin", "Q1", "turn_off_time ≥", "s",
     _part_field("Q1", "turn_off_time")),
    # the charger's current limit that keeps a failed-high charger's overshoot within the cell
    ("charger-too-high.yaml", "charger-fault-overshoot", "BT1", "at or below", "A",
     _field("charger.current")),
    ("probe-charger-fault-overshoot.yaml", "charger-fault-overshoot", "BT1", "at or below", "A",
     _field("charger.current")),
    # the thermal resistance that keeps the switch below its junction limit at the permitted current
    ("trip-below-load.yaml", "switch-temperature", "Q1", "θJA ≤", "K/W",
     _part_field("Q1", "theta_ja")),
    ("fet-cooks-below-trip.yaml", "switch-temperature", "Q1", "θJA ≤", "K/W",
     _part_field("Q1", "theta_ja")),
    # the turn-off time's upper end: slow enough for the spike, fast enough for the FET's heat
    ("wiring-spike.yaml", "short-circuit-stress", "Q1", "and ≤", "s",
     _part_field("Q1", "turn_off_time")),
    ("wiring-spike.yaml", "switch-voltage-margin", "Q1", "and ≤", "s",
     _part_field("Q1", "turn_off_time")),
    # the shunt value every rule allows: low enough for the trip min to clear the 25 A peak, high
    # enough that the current the trip max permits stays within the cells, fuse, FETs and shunt
    ("ridgeline-shunt-too-large.yaml", "trip-current-window", "U1", "use RSH of", "Ω",
     _part_field("RSH", "value")),
    # the regenerative current: below the charge trip minimum, within the cells' charge rating
    ("ebike-regen-trips-charge.yaml", "charge-current-window", "U1", "regenerative current to ≤",
     "A", _field("load.regen.current")),
    # the fast level's typical detection: above the slow window, below the short-circuit one, and
    # no harder on the parts than the currents just below it allow (the search re-lints)
    ("ridgeline-oc-levels-overlap.yaml", "overcurrent-levels", "U1", "fast detection typ of", "V",
     _field("components.U1.overcurrent_fast.detect.typ")),
    # the charger's typical voltage: its maximum per cell within the cell's upper limit and below
    # the overcharge detection by the margin
    ("charger-too-high.yaml", "threshold-ladder", "BT1", "charger.voltage typ ≤", "V",
     _field("charger.voltage.typ")),
    ("charger-too-high.yaml", "threshold-ladder", "U1", "charger.voltage typ ≤", "V",
     _field("charger.voltage.typ")),
    # the bleed resistors: low enough to bleed what the LED drains from its level each day, high
    # enough for their power rating and the protector's balance pins
    ("ridgeline-tap-load.yaml", "cell-balance", "D5", "R11, R12, R13, R14 of", "Ω",
     _each_value("R11", "R12", "R13", "R14")),
    # the cell's pulse rating: at least the gap overload's current per cell for its duration,
    # both rounded up
    ("high-threshold-fet.yaml", "cell-pulse-rating", "BT1", "cells rated for ≥", "A",
     _pulse_rating("15 ms", "BT1")),
    # the fuse's melting I²t: at least what each event lets through over the margin (no rule
    # bounds it from above), the figure rounded up so that the value shown still clears it
    # the low-voltage charge current: at most the cell's recovery current (0.1 C [practice])
    ("probe-zero-volt-charge.yaml", "deep-discharge-recovery", "U1", "current to ≤", "A",
     _low_voltage_limit("U1")),
    ("fuse-too-small.yaml", "secondary-protection", "F1", "a fuse that needs ≥", "A²s",
     _field("components.F1.melting_i2t")),
    ("quick-fuse-gap-overload.yaml", "secondary-protection", "F1", "a fuse that needs ≥", "A²s",
     _part_field("F1", "melting_i2t")),
]


@pytest.fixture(scope="module")
def session() -> Session:
    # Each rule's own hint is what is applied, so findings stay one per rule (a turn-off spike both
    # spike rules see is one finding in a report, naming the other rule).
    return Session(registry=load_registry(), grouping=False)


def _identity(f) -> tuple:
    return (f.rule, f.element, f.key)


@pytest.mark.parametrize("design, rule, element, words, unit, apply", HINTS,
                         ids=[f"{h[0]}-{h[1]}-{h[3]}" for h in HINTS])
def test_a_hinted_value_applied_clears_its_finding_and_raises_no_other(
        session, design, rule, element, words, unit, apply) -> None:
    shown = f"{FLAWED}/{design}"
    base = lint_file(session, REPO / shown, shown)
    pattern = re.compile(re.escape(words) + (r" ([0-9.]+-[0-9.]+)" if not unit else
                                             r" ([0-9.]+ ?[^\s,;)]*)"))
    hinted = [(f, m.group(1)) for f in base.findings if f.rule == rule and f.element == element
              for m in [pattern.search(f.hint or "")] if m]
    assert hinted, f"no {rule} hint at {element} proposes '{words} <value>'"
    for finding, value in hinted:
        if unit:
            parse_quantity(value, unit)  # the hint writes a value the format reads, in its unit
        doc = load_file(REPO / shown, shown)
        changed = lint_file(session, REPO / shown, shown,
                            document=apply_overrides(doc, apply(doc, value)))
        assert not changed.errors, changed.errors
        after = {_identity(f) for f in changed.findings if not f.waived}
        before = {_identity(f) for f in base.findings}
        assert _identity(finding) not in after, f"{value} leaves: {finding.message}"
        new = [f for f in changed.findings if _identity(f) not in before]
        assert not new, f"{value} raises: " + "; ".join(f"{f.rule}: {f.message}" for f in new)


EMPTY = [
    # narrow-trace: the trip window spans 1.62-7.72 A (× 4.75) and must sit above the 1.6 A peak
    # and below the 6.89 A weakest short (× 4.31): no factor on the sense resistance fits both.
    ("narrow-trace.yaml", "short-circuit-reach", "no sense resistance or detection voltage fits",
     "shunt-sensed protector"),
    ("high-threshold-fet.yaml", "short-circuit-reach",
     "no sense resistance or detection voltage fits", "shunt-sensed protector"),
    # the backup's ± 25 mV window must lie above the primary's 4.300 V and within the cell's
    # 4.35 V: a typical value above 4.325 V and at most 4.325 V, none
    ("ridgeline-backup-below-primary.yaml", "backup-overvoltage", "no typical detection fits",
     "narrower detection tolerance"),
    # FET-sensed windows spanning × 5 to × 30 from min to max: every factor on the FETs'
    # R_DS(on) table that lifts the trip min over the peak lets the trip max permit more than the
    # cells' pulse rating, the fuse or the FETs' own heat allow (tests/test_hints_rdsfit.py checks
    # the rules the hint names at the factor it names)
    ("trip-below-load.yaml", "trip-current-window", "no on-resistance of Q1 lets every rule pass",
     "shunt-sensed protector"),
    ("fet-cooks-below-trip.yaml", "trip-current-window",
     "no on-resistance of Q1 lets every rule pass", "shunt-sensed protector"),
    ("high-threshold-fet.yaml", "trip-current-window",
     "no on-resistance of Q1 lets every rule pass", "shunt-sensed protector"),
]


@pytest.mark.parametrize("design, rule, opening, change", EMPTY, ids=[f"{e[0]}-{e[1]}" for e in EMPTY])
def test_an_empty_range_says_so_and_names_a_structural_change(session, design, rule, opening,
                                                              change) -> None:
    shown = f"{FLAWED}/{design}"
    hints = [f.hint for f in lint_file(session, REPO / shown, shown).findings if f.rule == rule]
    assert hints and all(h.startswith(opening) and change in h for h in hints), hints


def test_no_hint_names_a_component_the_format_cannot_describe(session) -> None:
    # The format describes cells, protectors, FETs, fuses, PTCs, resistors, capacitors,
    # conductors and pre-charge paths (linter/kinds.py); a hint proposing a clamp diode, a
    # snubber or a gate zener would send the engineer to a part the review cannot check.
    for path in sorted((REPO / FLAWED).glob("*.yaml")) + sorted((REPO / "example_designs").glob("*.yaml")):
        shown = str(path.relative_to(REPO))
        for f in lint_file(session, path, shown).findings:
            for word in ("TVS", "snubber", "zener", "clamp the"):
                assert word.lower() not in (f.hint or "").lower(), f"{shown} {f.rule}: {f.hint}"
