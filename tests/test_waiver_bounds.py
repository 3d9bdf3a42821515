"""A waiver's bound on the finding's headline figure: ``up_to`` where the finding worsens as the
figure grows, ``down_to`` where it worsens as the figure falls (packwarden.waivers).

The design: the Ridgeline pack whose 4 mΩ shunt puts the over-current trip below the load
(example_designs/flawed/ridgeline-shunt-too-large.yaml). Its trip minimum is worked by hand,
independently of the model: the protector's lowest detection voltage over the shunt's highest
resistance, I = V / R (Ohm's law [derived]; the detection voltage 50 mV ± 5 mV and the shunt's
4.0 mΩ ± 1 % are the design's own values), 45 mV / 4.04 mΩ = 11.14 A, below the 12 A continuous
load. A trip minimum below the load is worse the lower it is: the pack cuts out sooner in normal
use [practice: docs/references.md "Single-cell protector, typical values"].
"""

from __future__ import annotations

from pathlib import Path

import pytest

from packwarden.api import Figure, Finding, Location, Severity
from packwarden.engine import Session, lint_file, load_registry
from packwarden.loader import load_file
from packwarden.overrides import Override, apply_overrides

REPO = Path(__file__).resolve().parent.parent
SHUNT = REPO / "example_designs/flawed/ridgeline-shunt-too-large.yaml"
TRIP_MIN = 45e-3 / (4.0e-3 * 1.01)  # [derived] I = V_detect,min / R_shunt,max


def lint_changed(*changes: Override):
    shown = SHUNT.relative_to(REPO).as_posix()
    doc = apply_overrides(load_file(SHUNT, shown), changes)
    return lint_file(Session(load_registry()), SHUNT, shown, document=doc)


def waiver(**bound: str) -> Override:
    return Override("add", "waivers", [{"rule": "trip-current-window", "element": "U1",
                                        "reason": "bench-tested, report TR-9", **bound}])


def trip_findings(result) -> list[Finding]:
    found = [f for f in result.findings if f.rule == "trip-current-window"]
    assert {f.key for f in found} == {"min-vs-continuous", "min-vs-current"}
    return found


def test_the_headline_is_the_trip_minimum_as_worked_by_hand() -> None:
    for f in trip_findings(lint_changed()):
        assert f.headline.name == "trip min" and f.lower_is_worse
        assert f.headline.value == pytest.approx(TRIP_MIN, rel=1e-3)


def test_a_floor_covers_a_trip_minimum_above_it_and_not_below() -> None:
    assert all(f.waived for f in trip_findings(lint_changed(waiver(down_to="11 A"))))
    found = trip_findings(lint_changed(waiver(down_to="11.5 A")))
    assert not any(f.waived for f in found)
    assert all("down to 11.5 A does not cover trip min 11.1 A" in f.message for f in found)


def test_a_ceiling_does_not_waive_a_finding_that_worsens_as_its_figure_falls() -> None:
    # With a ceiling the finding would stay waived however low the trip fell: the issue's
    # "a waiver for up to 1.5 A keeps hiding the finding when it grows", turned upside down.
    result = lint_changed(waiver(up_to="20 A"))
    found = trip_findings(result)
    assert not any(f.waived for f in found)
    assert all("has no down_to, and this finding worsens as trip min falls" in f.message
               for f in found)
    assert not [f for f in result.findings if f.rule == "waiver-hygiene"]  # it still matched


def test_a_floor_stops_covering_when_the_trip_falls_further() -> None:
    # A 5 mΩ shunt in place of the 4 mΩ one: 45 mV / 5.05 mΩ = 8.91 A [derived], below the
    # floor accepted for the 4 mΩ shunt, so the finding counts again.
    inline = {"kind": "resistor", "value": "5.0 mΩ", "tol": "1 %", "power": "5 W",
              "pins": ["B-", "P-"]}
    found = trip_findings(lint_changed(Override("set", "components.RSH", inline),
                                       waiver(down_to="11 A")))
    assert not any(f.waived for f in found)
    assert all(f.headline.value == pytest.approx(45e-3 / 5.05e-3, rel=1e-3) for f in found)
    assert all("down to 11 A does not cover trip min 8.91 A" in f.message for f in found)


def test_a_headline_the_rule_names_is_the_figure_a_bound_reads() -> None:
    figures = (Figure("trip min", 11.0, "A"), Figure("permitted current", 30.0, "A"))
    f = Finding("r", Severity.error, "m", Location("d.yaml"), figures=figures,
                headline_figure="permitted current")
    assert f.headline == figures[1]
    assert Finding("r", Severity.error, "m", Location("d.yaml"), figures=figures).headline == figures[0]


@pytest.mark.parametrize("bad", ["11", "11 furlongs"])
def test_a_floor_without_a_known_unit_is_a_located_input_error(bad: str) -> None:
    result = lint_changed(waiver(down_to=bad))
    assert result.findings == [] and len(result.errors) == 1
    err = result.errors[0]
    assert err.file.endswith("ridgeline-shunt-too-large.yaml") and err.line > 1
    assert "down_to" in str(err) and "Traceback" not in str(err)
