"""The charger-reversed and turn-off-spike events (linter/model/events.py) against outside sources.

The reversed charger is worked by hand around its loop with Kirchhoff's voltage law, and its
dissipation with Tellegen's theorem (docs/references.md "Events in time", the reversed charger);
the turn-off spike against the inductor law V = L·di/dt (same section, the turn-off spike).
"""

from __future__ import annotations

from pathlib import Path

import pytest

from packwarden.engine import lint
from packwarden.model import events
from tests.model.test_stress import _model

REPO = Path(__file__).resolve().parents[2]

# tests/model/test_stress.py's vector design, written out here: T-GUARD's overcharge detection is
# 4.20 V with no tolerance, so the stack (one cell) is at most 4.20 V.
V_STACK_MAX = 4.20
CHARGER = ("charger: {voltage: {typ: 5 V}, current: 1 A, open_circuit_max: 5.5 V, "
           "reverse_polarity: %s}\n")


def test_nothing_conducts_and_the_off_discharge_switch_holds_charger_plus_stack(tmp_path):
    # [derived: Kirchhoff's voltage law] around charger, cell, fuse, the on charge channel and the
    # off discharge channel: nothing conducts (the discharge channel's body diode is reverse
    # biased), so no resistance drops a volt and the discharge channel holds
    # V_oc + V_stack = 5.5 + 4.20 = 9.70 V.
    m = _model(tmp_path, extra=CHARGER % "possible")
    ev = m.event("charger-reversed")
    assert ev.current == 0.0 and ev.element_current == {} and ev.dissipation == {}
    assert ev.voltage == pytest.approx(5.5 + V_STACK_MAX, rel=1e-9)
    assert ev.duration is None  # until someone unplugs it
    # the discharge switch's reversed-charger case is this event's voltage
    (volts,) = [v for what, v in m.blocking_voltage("discharge") if "reversed" in what]
    assert volts == ev.voltage


def test_a_keyed_connector_has_no_reversed_charger(tmp_path):
    m = _model(tmp_path, extra=CHARGER % "prevented")
    assert m.event("charger-reversed") is None
    assert not [c for c in m.blocking_voltage("discharge") if "reversed" in c[0]]


def test_a_turned_round_pair_conducts_and_the_loop_balances():
    # example_designs/flawed/gates-swapped.yaml: the discharge gate drives the channel whose body
    # diode points the way a reversed charger pushes, so the loop conducts through it. Written
    # out from example_designs/parts/orchard-parts.yaml: overcharge detection 4.300 V ± 25 mV
    # (stack max 4.325 V), cell 30 mΩ typical, OR-FUSE-12A 5 mΩ; the charger 5.5 V.
    (result,) = lint([str(REPO / "example_designs" / "flawed" / "gates-swapped.yaml")]).designs
    ev = result.model.event("charger-reversed")
    i, v_off = ev.current, ev.voltage
    assert i > 100.0  # a stiff charger through a body diode: a fault current
    loop_r = events.CHARGER_SOURCE_R + 0.030 + 0.005 + events.SWITCH_ON_R
    # Kirchhoff's voltage law [derived]: the EMFs equal the drops round the loop.
    assert 5.5 + 4.325 == pytest.approx(i * loop_r + v_off, rel=1e-6)
    # Tellegen's theorem [published: circuit theory]: the parts absorb what the sources give,
    # EMF·I less the sources' own I²·R.
    given = (5.5 + 4.325) * i - i * i * (events.CHARGER_SOURCE_R + 0.030)
    assert sum(ev.dissipation.values()) == pytest.approx(given, rel=1e-6)
    assert ev.element_current["F1"] == pytest.approx(i, rel=1e-9)


def test_turn_off_spike_vector(tmp_path):
    # docs/references.md "Events in time", the turn-off spike: V = L·di/dt [published: Faraday's
    # law, the inductor law]; vector [derived]: 200 nH, 100 A in 1 µs -> 20 V. A 4.2 V cell over
    # 42 mΩ (the switches 1 µΩ) shorts at 100 A; on the 4.20 V stack the switch sees 24.2 V.
    m = _model(tmp_path, cell_r="42 mΩ", rds="1 uΩ", pack_extra=", wiring_inductance: 200 nH",
               fet_extra="    turn_off_time: 1 us\n")
    ev = m.event("turn-off-spike")
    assert ev.current == pytest.approx(100.0, rel=1e-4)
    # the highest current the switch may interrupt: the short's onset at the lowest ambient
    assert ev.current == m.prospective_short_circuit
    assert ev.duration == pytest.approx(1e-6)
    assert ev.voltage == pytest.approx(V_STACK_MAX + 20.0, rel=1e-4)
    assert ev.detection == m.event("hard-short").detection
    # a current falling linearly at a constant voltage dissipates ½·V·I on average [derived]
    assert ev.dissipation["Q1"] == pytest.approx(0.5 * 24.2 * 100.0, rel=1e-3)
    (discharge,) = m.channels_of("discharge")
    assert m.turn_off_spike(discharge).total == ev.voltage


def test_no_wiring_inductance_no_spike(tmp_path):
    assert _model(tmp_path).event("turn-off-spike") is None
