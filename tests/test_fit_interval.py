"""The feasible range a fitted hint names, against a hand-worked edge (issue 18 item 2).

The shunt's upper edge on example_designs/flawed/ridgeline-shunt-too-large.yaml is where the
over-current trip minimum meets the 25 A peak load: the lowest detection voltage over the
highest shunt resistance, I = V_detect,min / (R · (1 + tol)) [derived: Ohm's law,
docs/references.md "Trip current of a detection"]. RL-GUARD-4S detects 50 ± 5 mV; RL-SHUNT
parts are ± 1 %: R_high = 45 mV / (25 A × 1.01) = 1.782 mΩ. The search finds it by re-linting to
1 %, from below (the figure shown is the last value that passed).
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from packwarden.engine import Session, lint_file, load_registry
from packwarden.model.fit import factor_interval, value_inside, Interval
from packwarden.quantities import parse_quantity

REPO = Path(__file__).resolve().parent.parent
SHUNT = "example_designs/flawed/ridgeline-shunt-too-large.yaml"


@pytest.fixture(scope="module")
def hints() -> list[str]:
    session = Session(registry=load_registry(), grouping=False)
    result = lint_file(session, REPO / SHUNT, SHUNT)
    return [f.hint for f in result.findings if f.rule == "trip-current-window"]


def test_the_shunt_range_ends_where_the_trip_minimum_meets_the_peak_load(hints) -> None:
    by_hand = 0.045 / (25.0 * 1.01)  # Ω, Ohm's law at the window's low corner
    for hint in hints:
        m = re.search(r"from ([0-9.]+ mΩ) to ([0-9.]+ mΩ)", hint)
        assert m, hint
        high = parse_quantity(m.group(2), "Ω")
        assert 0.985 * by_hand <= high <= by_hand, (high, by_hand)
        assert parse_quantity(m.group(1), "Ω") < high


def test_the_search_finds_a_known_interval_and_says_when_there_is_none() -> None:
    # a judgement that holds on [0.3, 0.5]: the edges to 1 %, from the inside
    found = factor_interval(lambda k: 0.3 <= k <= 0.5, start=0.9)
    assert found is not None
    assert 0.3 <= found.low <= 0.3 * 1.01 and 0.5 / 1.01 <= found.high <= 0.5
    assert factor_interval(lambda k: False, start=1.0) is None
    # the value shown has three figures and lies inside
    value = value_inside(4e-3, Interval(0.37, 0.44))
    assert 4e-3 * 0.37 <= value <= 4e-3 * 0.44 and f"{value * 1e3:.3g}" == f"{value * 1e3:g}"


def test_the_fast_level_range_starts_where_its_window_clears_the_slow_one() -> None:
    # ridgeline-oc-levels-overlap: slow detection 50 ± 5 mV, fast ± 8 mV, both over the same
    # shunt. I = V / R [derived: Ohm's law, docs/references.md "Trip current of a detection"]:
    # the slow window's ends give the shunt's corners, R_high = 45 mV / slow min and
    # R_low = 55 mV / slow max; the fast minimum (typ - 8 mV) / R_high clears the slow maximum
    # when typ > 8 mV + 45 mV × slow max / slow min.
    shown = "example_designs/flawed/ridgeline-oc-levels-overlap.yaml"
    session = Session(registry=load_registry(), grouping=False)
    [finding] = [f for f in lint_file(session, REPO / shown, shown).findings
                 if f.rule == "overcurrent-levels" and f.key == "slow-vs-fast"]
    fig = {g.name: g.value for g in finding.figures}
    by_hand = 0.008 + 0.045 * fig["over-current trip max"] / fig["over-current trip min"]
    m = re.search(r"from ([0-9.]+ mV) to", finding.hint or "")
    assert m, finding.hint
    low = parse_quantity(m.group(1), "V")
    assert by_hand <= low <= by_hand * 1.015, (low, by_hand)
