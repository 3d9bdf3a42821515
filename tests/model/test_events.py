"""Events in time (linter/model/events.py) against outside sources, through the design model.

Each check computes the event's figures independently (from the library's published figures,
docs/references.md "Events in time" and "Fuses") and compares with the event the model made.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from packwarden.engine import lint
from packwarden.model import events
from packwarden.report import formatter
from packwarden.report.common import RenderOptions
from tests.model.test_stress import FIXED_DRIVE, _model

REPO = Path(__file__).resolve().parents[2]
ORCHARD = REPO / "example_designs" / "orchard-probe.yaml"

# OR-GUARD-1S (example_designs/parts/orchard-parts.yaml), written out here: short-circuit
# detection 500 mV ± 100 mV, over-current detection 150 mV ± 15 mV, over-current delay max 15 ms.
SC_DETECT_MAX = 0.500 + 0.100
OC_DETECT_MAX = 0.150 + 0.015
OC_DELAY_MAX = 15e-3
THETA_JA = 83.0  # OR-FET-D20, K/W


@pytest.fixture(scope="module")
def orchard():
    (result,) = lint([str(ORCHARD)]).designs
    return result.model


def test_the_events_in_order_and_cached(orchard):
    # in the declared order; no switch-on inrush (no capacitance across the terminals), no turn-off
    # spike (the probe gives no wiring inductance), no regen (its load brakes nothing)
    assert [e.name for e in orchard.events] == [
        n for n in events.EVENT_NAMES
        if n not in ("switch-on-inrush", "turn-off-spike", "fast-gap-overload", "regen")]
    assert orchard.events is orchard.events
    assert orchard.event("no-such-event") is None


def test_rectangular_pulse_vector_through_the_hard_short(tmp_path):
    # docs/references.md "Fuses": I²t of a rectangular pulse = I²·t [published: definition];
    # vector [derived]: 40 A for 540 µs -> 0.864 A²s. 4.2 V over 75 mΩ + 2 × 15 mΩ = 40 A, ended
    # by the short-circuit detection (trip max 0.6 V / 30 mΩ = 20 A) after its longest delay.
    # A fixed 12 V drive keeps both switches fully on through the short (tests/model/test_stress.py).
    hard = _model(tmp_path, cell_r="75 mΩ", rds="15 mΩ", pulse="30 A", id_max="30 A",
                  guard_extra=FIXED_DRIVE).event("hard-short")
    assert hard.current == pytest.approx(40.0, rel=1e-4)
    assert hard.duration == pytest.approx(540e-6)
    assert hard.i2t == pytest.approx(0.864, rel=1e-3)
    assert hard.i2t_through("F1") == pytest.approx(0.864, rel=1e-3)  # the fuse carries it all
    assert hard.detection == "short-circuit"
    # each channel of the pair dissipates I²·R [published: Joule heating]: 40² × 15 mΩ twice
    assert hard.dissipation["Q1"] == pytest.approx(2 * 40.0**2 * 0.015, rel=1e-3)


def test_gap_overload_of_orchard_from_the_detection_voltage(orchard):
    # docs/references.md "Events in time" [derived]: the gap overload is the short-circuit
    # detection maximum over the lowest sense resistance, for the longest over-current delay.
    # The sense resistance is the model's at the corner the event states (the lowest ambient,
    # the highest gate drive, every part at its minimum, switches unheated); the rest is the
    # library's data sheet figures, written out above.
    gap = orchard.event("gap-overload")
    r_sense = orchard.short_circuit_trip.at_max.sense_resistance
    assert "lowest ambient -20 °C" in gap.corner and "unheated" in gap.corner
    current = SC_DETECT_MAX / r_sense
    assert gap.current == pytest.approx(current, rel=1e-9)
    assert gap.duration == OC_DELAY_MAX
    assert gap.i2t == pytest.approx(current**2 * OC_DELAY_MAX, rel=1e-9)
    # an outside review's "about 11-12 A²s" (docs/references.md, outside review)
    assert 11.0 < gap.i2t < 12.5
    # the switches are the sense resistance, so all of the detection voltage falls across them:
    # P = I·V [published: P = V·I]
    assert gap.dissipation["Q1"] == pytest.approx(current * SC_DETECT_MAX, rel=1e-6)
    assert gap.detection == "over-current"


def test_permitted_current_of_orchard_is_a_thermal_balance(orchard):
    # docs/references.md "Events in time" [derived]: I = V_detect / R_sense(T_J) with
    # T_J = T_A + P·R_θJA [published] and P = I·V_detect (the switches are the sense resistance).
    ev = orchard.event("permitted")
    assert ev.duration is None and ev.i2t is None and ev.ambient == -20.0
    assert ev.dissipation["Q1"] == pytest.approx(ev.current * OC_DETECT_MAX, rel=1e-6)
    tj = ev.ambient + ev.current * OC_DETECT_MAX * THETA_JA
    # [derived: Kirchhoff's voltage law] the charge FET's source (P−) sits the sense voltage,
    # V_detect, above the protector's ground, so its gate sees the drive less V_detect.
    q1 = {ch.name: ch for ch in orchard.channels}
    r_at_tj = (orchard.channel_rds(q1["Q1.1"], 4.325, tj, "min")[0]
               + orchard.channel_rds(q1["Q1.2"], 4.325 - OC_DETECT_MAX, tj, "min")[0])
    assert ev.current == pytest.approx(OC_DETECT_MAX / r_at_tj, rel=2e-3)  # 0.01 K tolerance
    # about 5.49 A by an outside review's calculator (full drive on both gates;
    # docs/references.md, outside review); the charge
    # FET's lower drive takes about 0.6 % off, below the unheated trip maximum 7.72 A
    assert ev.current == pytest.approx(5.49, rel=0.01)
    assert ev.current < orchard.overcurrent_trip.max


def test_permitted_current_with_a_shunt_is_the_trip_maximum():
    # With a shunt as the sense resistance the switches' heat does not move the trip, so the
    # current permitted for ever is the trip maximum itself.
    (result,) = lint([str(REPO / "example_designs" / "ridgeline-tool-4s2p.yaml")]).designs
    m = result.model
    assert m.sense_by_shunt
    assert m.event("permitted").current == pytest.approx(m.overcurrent_trip.max, rel=1e-9)


def test_fixed_loads_are_the_switch_temperature_points(orchard):
    # The continuous and peak loads are the operating points switch-temperature judges: the same
    # solve, read once.
    cont = orchard.event("continuous-load")
    (heat,) = [h for h in orchard.switch_heat if h.case == "continuous"]
    assert cont.current == 1.2 and cont.dissipation["Q1"] == heat.power
    peak = orchard.event("peak-load")
    assert peak.i2t == pytest.approx(1.6**2 * 0.040)  # I²·t [published: definition]
    # the fuse dissipates I²·R: 1.2² × 5 mΩ [published: Joule heating]
    assert cont.dissipation["F1"] == pytest.approx(1.2**2 * 0.005, rel=1e-6)


def test_the_json_report_lists_the_events():
    # the probe with its wiring's inductance given, so it has every event
    run = lint([str(REPO / "example_designs" / "flawed" / "wiring-spike.yaml")])
    out = json.loads(formatter("json")(run, RenderOptions()))
    (design,) = out["designs"]
    names = [e["name"] for e in design["events"]]
    # every event but the switch-on inrush (no capacitance across the terminals), storage (no
    # storage section) and regen (no regenerative braking)
    assert names == [n for n in events.EVENT_NAMES
                     if n not in ("switch-on-inrush", "storage", "regen", "fast-gap-overload")]
    gap = design["events"][names.index("gap-overload")]
    assert set(gap) >= {"name", "corner", "current", "duration", "i2t", "dissipation"}
    assert gap["dissipation"]["Q1"] > 0 and gap["duration"] == 0.015
    assert design["events"][names.index("permitted")]["duration"] is None
