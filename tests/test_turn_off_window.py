"""The turn-off times a discharge switch may have (packwarden.model.survival.turn_off_window):
slow enough that the wiring spike stays within the derated vds limit, fast enough that the FET
does not overheat turning off the short (issue 18: a hint proposing a 104 µs turn-off at 1.3 kA
must not happen).

The design: the Orchard probe with 200 nH of wiring to a remote sensor head
(example_designs/flawed/wiring-spike.yaml), interrupting its 110 A prospective short. The ends of
the window are worked by hand, independently of the model's code:

* the lower end from V = V_stack + L·I/t [derived: docs/references.md "Events in time"] set equal
  to the derated limit 16 V (20 V × 0.8, docs/references.md "MOSFETs" [practice]);
* the upper end from the junction at the end of the fall, T_start + P·Z_th(t), with
  P = ½·V·I (a current falling linearly at a constant voltage [derived]) and Z_th(t) =
  Σ r_i·(1 − exp(−t/τ_i)) of the part's Foster network (the single-pulse response of a Foster
  ladder [published: FET makers' thermal application notes, docs/references.md "What parts
  survive over time"]), equal to tj_max 150 °C.

The re-lint is the second check: the ends applied clear the spike and raise no heat finding; a
time 10 % past the upper end raises switch-pulse-heat.
"""

from __future__ import annotations

import math
import re
from pathlib import Path

import pytest

from packwarden.engine import Session, lint_file, load_registry
from packwarden.loader import load_file
from packwarden.overrides import Override, apply_overrides
from packwarden.quantities import parse_quantity

REPO = Path(__file__).resolve().parent.parent
SHOWN = "example_designs/flawed/wiring-spike.yaml"
# The part's Foster network (example_designs/parts/orchard-parts.yaml, OR-FET-D20): (K/W, s)
FOSTER = [(0.03, 30e-6), (0.1, 1e-3), (2.0, 20e-3), (12.0, 1.0), (68.87, 40.0)]
L, STACK, LIMIT, TJ_MAX = 200e-9, 4.325, 20.0 * 0.8, 150.0


@pytest.fixture(scope="module")
def session() -> Session:
    return Session(registry=load_registry(), grouping=False)


@pytest.fixture(scope="module")
def base(session):
    return lint_file(session, REPO / SHOWN, SHOWN)


def _zth(t: float) -> float:
    return sum(r * (1.0 - math.exp(-t / tau)) for r, tau in FOSTER)


def _window(result):
    m = result.model
    ch = next(c for c in m.channels if c.role == "discharge")
    spike = m.turn_off_spike(ch)
    return spike, m.turn_off_window(spike, LIMIT)


def test_the_window_matches_the_hand_worked_ends(base) -> None:
    spike, window = _window(base)
    current = spike.current  # the prospective short, checked in tests/report/test_grouping.py
    assert window.low == pytest.approx(L * current / (LIMIT - STACK), rel=1e-9)
    start = next(h.start for h in base.model.pulse_heat if h.event.name == "turn-off-spike")
    # The junction at the hinted upper end, by hand: at tj_max, to the search's resolution.
    t = window.high
    tj = start + 0.5 * (STACK + L * current / t) * current * _zth(t)
    assert tj == pytest.approx(TJ_MAX, abs=0.2)
    assert window.low < 1e-5 < 1e-3 < window.high  # microseconds to milliseconds: room to choose


def _hinted(finding, words: str) -> str:
    m = re.search(re.escape(words) + r" ([0-9.]+ ?[^\s,;)]*)", finding.hint or "")
    assert m, finding.hint
    return m.group(1)


def _with_q1(session, change):
    """The design linted with Q1's library part written inline, ``change``d."""
    doc = load_file(REPO / SHOWN, SHOWN)
    written = doc.data["components"]["Q1"]
    lib = load_file(REPO / "example_designs/parts/orchard-parts.yaml").data["parts"]
    part = {k: v for k, v in lib[written["part"]].items() if k != "pinout"}
    change(part)
    inline = Override("set", "components.Q1", {**part, "pins": written["pins"]})
    return lint_file(session, REPO / SHOWN, SHOWN, document=apply_overrides(doc, [inline]))


@pytest.mark.parametrize("rule", ["short-circuit-stress", "switch-voltage-margin"])
def test_both_spike_rules_propose_the_window_and_past_its_top_the_fet_overheats(
        session, base, rule) -> None:
    (finding,) = [f for f in base.findings if f.rule == rule and "turn_off_time" in (f.hint or "")]
    high = _hinted(finding, "and ≤")
    assert parse_quantity(high, "s") <= _window(base)[1].high
    past = _with_q1(session, lambda part: part.update(
        turn_off_time=f"{parse_quantity(high, 's') * 1.1 * 1e3:.6f} ms"))
    assert [f.key for f in past.findings if f.rule == "switch-pulse-heat"] == \
        ["pulse-heat-turn-off-spike"]


def test_an_empty_window_says_so_and_names_the_structural_change(session) -> None:
    # The same FET with a stiff first Foster stage (200 K/W in 30 µs): at the 1.89 µs the spike
    # needs, the fall is at the 16 V limit and the junction passes tj_max by hand
    # (64.8 °C + ½ × 16 V × 110 A × 200 K/W × (1 − e^(−1.89/30)) ≈ 10.8 kK), so no turn-off
    # time fits.
    def stiff(part: dict) -> None:
        part["zth"] = {"foster": [{"r": "200 K/W", "tau": "30 us"}, *part["zth"]["foster"][1:]]}

    result = _with_q1(session, stiff)
    hints = [f.hint for f in result.findings
             if f.rule in ("short-circuit-stress", "switch-voltage-margin") and f.key.startswith(
                 ("spike", "vds-Q1.1"))]
    assert hints and all("no turn_off_time fits" in h and "higher vds_max" in h
                         and "wiring_inductance ≤" in h and "and ≤" not in h for h in hints), hints
