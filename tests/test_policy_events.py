"""A team policy bounds the figures of a design's events in time (``<event>.<what>``).

The events are the model's (docs/rules-api.md, "Events"); the values the limits are set against
are worked here from the Orchard example's part data, written out: the hard short's I²t is the
rectangular pulse I²·t [published: definition of I²t, docs/references.md "Fuses"], the gap
overload 0.6 V over about 21.2 mΩ for 15 ms, about 12 A²s (docs/references.md "Events in time"),
the reversed charger 5.5 V + 4.325 V by Kirchhoff's voltage law (same section).
"""

from __future__ import annotations

from pathlib import Path

import pytest

from packwarden.engine import lint
from packwarden.model.events import EVENT_NAMES
from packwarden.policy import EVENT_FIGURES, load_policy, policy_json_schema
from tests.test_policy import policy_findings, repo, with_policy  # noqa: F401 (a fixture)


def test_every_event_figure_is_named_in_the_schema() -> None:
    enum = policy_json_schema()["definitions"]["LimitSpec"]["properties"]["figure"]
    names = next(v for v in (enum.get("enum"), *[o.get("enum") for o in enum.get("anyOf", [])])
                 if v)
    for event in EVENT_NAMES:
        for what in ("current", "duration", "i2t", "voltage"):
            assert f"{event}.{what}" in names


def test_event_limits_read_in_their_units(repo: Path) -> None:
    policy = load_policy(with_policy(repo, """\
        format: packwarden-policy/1
        limits:
          - {id: gap-i2t, figure: gap-overload.i2t, max: 10 A²s}
          - {id: short-time, figure: hard-short.duration, max: 300 us}
        """))
    gap, short = policy.limits
    assert (gap.unit, gap.high) == ("A²s", 10.0)
    assert short.unit == "s" and short.high == pytest.approx(300e-6)
    assert EVENT_FIGURES["charger-reversed.voltage"] == "V"


def test_a_unit_that_does_not_fit_the_event_figure_is_a_located_error(repo: Path) -> None:
    with_policy(repo, """\
        format: packwarden-policy/1
        limits:
          - {id: gap-i2t, figure: gap-overload.i2t, max: 10 A}
        """)
    run = lint(["designs/probe.yaml"])
    (err,) = run.input_errors()
    assert "team-policy.yaml:3:" in str(err) and run.exit_code() == 2


def test_a_misspelt_event_figure_says_what_it_meant(repo: Path) -> None:
    with_policy(repo, """\
        format: packwarden-policy/1
        limits:
          - {id: gap-i2t, figure: gap-overload.i2, max: 10 A²s}
        """)
    (err,) = lint(["designs/probe.yaml"]).input_errors()
    assert "did you mean 'gap-overload.i2t'" in str(err)


def test_event_limits_fire_on_the_example(repo: Path) -> None:
    with_policy(repo, """\
        format: packwarden-policy/1
        limits:
          - {id: gap-i2t, figure: gap-overload.i2t, max: 10 A²s}
          - {id: gap-i2t-loose, figure: gap-overload.i2t, max: 13 A²s}
          - {id: reversed-15v, figure: charger-reversed.voltage, max: 9.8 V}
          - {id: spike, figure: turn-off-spike.voltage, max: 1 V}
          - {id: ever, figure: permitted.duration, max: 1 s}
        """)
    found = {f.rule: f for f in policy_findings(lint(["designs/probe.yaml"]))}
    # the gap overload is about 11.4 A²s: above 10, below 13
    assert "policy/gap-i2t" in found and "policy/gap-i2t-loose" not in found
    gap = found["policy/gap-i2t"]
    assert gap.figures[0].name == "gap-overload.i2t"
    # 600 mV over the pair at -20 °C, Q1.1 at 4.325 V and Q1.2 at 4.325 - 0.6 = 3.725 V (worked
    # by hand in tests/model/test_gate.py): (14 - 0.625/0.8 + 14 - 0.025/0.8) mΩ × (1 - 0.44 × 0.45)
    # = 21.80 mΩ, 27.52 A for 15 ms
    sense = (14 - 0.625 / 0.8 + 14 - 0.025 / 0.8) * (1 - 0.44 * 0.45) * 1e-3
    assert gap.figures[0].value == pytest.approx((0.6 / sense) ** 2 * 0.015, rel=0.01)
    assert gap.element == "U1" and gap.severity.value == "error"
    # 5.5 V + 4.325 V = 9.825 V across the off discharge switch, above 9.8 V
    assert found["policy/reversed-15v"].figures[0].value == pytest.approx(9.825, rel=1e-6)
    # no wiring inductance: no spike to bound; the permitted current lasts for ever: no duration
    assert "policy/spike" not in found and "policy/ever" not in found
