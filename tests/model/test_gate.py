"""Each switch's own gate-source voltage, and the drive a driver can give from its supply."""

import math
from pathlib import Path

import pytest

from packwarden.engine import lint
from packwarden.testing import lint_variant

REPO = Path(__file__).resolve().parents[2]
LFP = REPO / "tests" / "rules" / "designs" / "lfp-3s-fixed-drive.yaml"


def _model(path: Path):
    run = lint([str(path)])
    assert not run.input_errors(), [str(e) for e in run.input_errors()]
    (result,) = run.designs
    return result.model


@pytest.fixture(scope="module")
def orchard():
    return _model(REPO / "example_designs" / "orchard-probe.yaml")


def _by_name(m):
    return {ch.name: ch for ch in m.channels}


def test_hand_worked_trip_maximum_with_the_charge_fets_own_drive(orchard):
    # Hand-worked vector, V_GS = V_cell − I·R of the sense path [derived: Kirchhoff's voltage law
    # around the charge gate output, the gate, P− and B−; docs/references.md "MOSFETs"]. The
    # Orchard pair at its trip maximum: the lowest ambient −20 °C, the highest drive 4.325 V (the
    # overcharge detection maximum), every part at its minimum. The charge FET's source (P−) sits
    # I·(R_Q1.1 + R_Q1.2) above B−, and at the trip that is the detection maximum, 165 mV, so its
    # gate sees 4.325 − 0.165 = 4.160 V while the discharge FET sees all 4.325 V.
    # Minimum R_DS(on) from the data sheet rows (min = typ − (max − typ), a symmetric spread
    # [practice]): 14 mΩ at 3.7 V, 13 mΩ at 4.5 V; between them linearly:
    r_dis = 14 - (4.325 - 3.7) / 0.8 * 1.0      # 13.21875 mΩ
    r_chg = 14 - (4.160 - 3.7) / 0.8 * 1.0      # 13.425 mΩ
    cold = 1 + 0.44 * (-20 - 25) / 100          # the data sheet's 1.44 at 125 °C, a straight line
    sense = (r_dis + r_chg) * cold * 1e-3       # 21.368 mΩ
    trip = 0.165 / sense                        # 7.722 A
    t = orchard.overcurrent_trip
    assert trip == pytest.approx(7.7217, abs=1e-4)
    assert t.max == pytest.approx(trip, rel=1e-5)
    vgs = t.at_max.channel_vgs
    assert vgs["Q1.1"] == pytest.approx(4.325)
    assert vgs["Q1.2"] == pytest.approx(4.325 - trip * sense, abs=1e-4)
    assert vgs["Q1.2"] == pytest.approx(4.160, abs=1e-4)


def test_hand_worked_gap_overload_with_the_charge_fets_own_drive(orchard):
    # The same corner at the short-circuit detection maximum, 600 mV: the charge FET's gate sees
    # 4.325 − 0.6 = 3.725 V, 14 − 0.025/0.8 = 13.969 mΩ at 25 °C [derived, as above].
    cold = 1 + 0.44 * (-45) / 100
    sense = (14 - 0.625 / 0.8 + 14 - 0.025 / 0.8) * cold * 1e-3
    gap = orchard.event("gap-overload")
    assert gap.current == pytest.approx(0.6 / sense, rel=1e-5)     # 27.52 A
    assert orchard.short_circuit_trip.at_max.channel_vgs["Q1.2"] == pytest.approx(3.725, abs=1e-4)


def test_at_the_trip_minimum_the_charge_fet_sees_the_drive_less_the_detection(orchard):
    # Whatever the heat, the voltage across the pair at the trip is the detection voltage itself.
    for window, detect in ((orchard.overcurrent_trip, 0.135), (orchard.short_circuit_trip, 0.4)):
        vgs = window.at_min.channel_vgs
        assert vgs["Q1.1"] == pytest.approx(2.45)
        assert vgs["Q1.2"] == pytest.approx(2.45 - detect, abs=1e-4)
        assert any("V_GS below the 2.45 V drive" in a for a in window.at_min.assumptions)


def test_a_load_lifts_the_charge_fet_by_its_own_current(orchard):
    op = orchard.operating_point(1.2, 55.0, 2.45, "max")
    lift = 1.2 * (op.rds["Q1.1"] + op.rds["Q1.2"])          # I·R of the pair [derived]
    assert op.channel_vgs["Q1.2"] == pytest.approx(2.45 - lift, abs=1e-4)
    assert op.channel_vgs["Q1.1"] == 2.45


def test_with_no_current_every_channel_sees_the_drive(orchard):
    op = orchard.operating_point(0.0, 25.0, 3.6, "typ", self_heating=False)
    assert set(op.channel_vgs.values()) == {3.6}


def test_high_side_p_channel_sources_below_the_stack_top_see_less():
    # Ridgeline's p-channel switches on the positive rail: the gate is pulled towards ground, so
    # a source I·R below the stack top (after the fuse and the discharge pair) sees that much less.
    m = _model(REPO / "example_designs" / "ridgeline-tool-4s2p.yaml")
    vgs = m.overcurrent_trip.at_min.channel_vgs
    drive = m.gate_drive.min
    assert drive > vgs["Q1"] == vgs["Q2"] > vgs["Q3"] == vgs["Q4"]
    assert drive - vgs["Q3"] < 0.2          # a few tens of millivolts at 11 A through milliohms


def test_a_driver_fed_from_a_3s_lifepo4_stack_gives_at_most_6_75_v():
    # 3 × 2.25 V, the over-discharge detection minimum per cell [derived]; LiFePO4 lower limits
    # are 2.0-2.5 V per cell [practice, docs/references.md "Cell voltage windows"].
    m = _model(LFP)
    assert m.gate_drive.min == pytest.approx(6.75)
    assert m.gate_drive.max == pytest.approx(3 * 3.775)       # the stack at its highest, < 12 V
    figures = m.figures()
    assert figures["gate_drive_min"].value == pytest.approx(6.75)


def test_a_boosted_driver_holds_its_drive(tmp_path):
    run = lint_variant(tmp_path, LFP, REPO / "example_designs" / "parts" / "ridgeline-parts.yaml",
                       replace=[("../../../example_designs/parts/", "parts/"),
                                ("    gate_drive: 12 V\n",
                                 "    gate_drive: 12 V\n    gate_drive_boosted: true\n")])
    assert not run.input_errors(), [str(e) for e in run.input_errors()]
    m = run.designs[0].model
    assert (m.gate_drive.min, m.gate_drive.max) == (12.0, 12.0)
    # A boosted driver floats on each switch's source: no channel sees less than its drive.
    assert set(m.overcurrent_trip.at_min.channel_vgs.values()) == {12.0}


@pytest.mark.parametrize("corner", ["min", "typ", "max"])
def test_channel_rds_is_finite_and_never_falls_as_the_gate_collapses(orchard, corner):
    # A hard short pulls the gates down: the model must return an off switch, not an error, a
    # negative value or a division by zero, at and below the threshold.
    ch = _by_name(orchard)["Q1.2"]
    values = [orchard.channel_rds(ch, 4.5 - 0.01 * i, 25.0, corner)[0] for i in range(600)]
    assert all(math.isfinite(v) and v > 0 for v in values)
    assert all(a <= b for a, b in zip(values, values[1:]))
