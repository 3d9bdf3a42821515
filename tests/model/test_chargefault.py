"""The charge side (linter/model/chargefault.py, the charge over-current window of design.py)
against outside sources.

The OCV rise is checked against points of the published NMC dataset copied into
docs/references.md ("Storage and self-discharge"); the failed-high charger against a vector worked
by hand around the cell's Thevenin model (docs/references.md "Charge-side faults and deep
discharge"); the charge trip window against the detection voltage over the sense resistance
written out from the part data, and against an ngspice operating point of the FET pair carrying
charge current.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from packwarden.model import chargefault
from packwarden.model.ocv import OCV_TABLES
from tests.model import spice
from tests.model.test_stress import FIXED_DRIVE, _findings, _model

REPO = Path(__file__).resolve().parents[2]

# docs/references.md "Storage and self-discharge", the NMC dataset (SoC % -> V) [published]
NMC_50_3, NMC_60_1, NMC_70_3 = 3.756, 3.840, 3.926
NMC_90_2, NMC_98, NMC_100 = 4.091, 4.138, 4.175

# The charge detection of the vector protector: 100 mV ± 10 mV, a flat 25 mΩ per channel (the
# stress vector's T-PAIR with ratio 1.0: no rise with temperature), two channels between the
# ground (B-) and sense (P-) pins, a fixed 12 V drive that no source lift changes.
CHARGE_DETECTION = (FIXED_DRIVE + "\n    gate_drive_boosted: true\n"
                    "    charge_overcurrent: {detect: {typ: 100 mV, tol: 10 mV}, "
                    "delay: {min: 4 ms, max: 16 ms}}")
FLAT = dict(rds="25 mΩ", ratio="1.0", hot="25 °C", guard_extra=CHARGE_DETECTION)
CHARGER = "charger: {{voltage: {{typ: {v}}}, current: {i}, open_circuit_max: 6 V}}\n"


def test_ocv_rise_inside_the_dataset():
    # From 50.3 % (3.756 V) adding 10 % of the capacity: 60.3 %, on the 60.1 -> 70.3 % segment,
    # 3.840 + (0.2 / 10.2) × (3.926 − 3.840) = 3.84169 V [derived: linear between the points].
    expected = NMC_60_1 + 0.2 / 10.2 * (NMC_70_3 - NMC_60_1) - NMC_50_3
    rise, extrapolated = chargefault.ocv_rise(OCV_TABLES["nmc"], NMC_50_3, 0.34, 3.4)
    assert rise == pytest.approx(expected, rel=1e-9)
    assert not extrapolated


def test_ocv_rise_beyond_the_full_point_follows_the_last_segment():
    # docs/references.md "Charge-side faults and deep discharge" vector: 0.8 A for 2 s into
    # 3.4 Ah from 4.221 V, above the dataset's 4.175 V full point: the 98 -> 100 % slope,
    # (4.175 − 4.138) / 2 % = 18.5 mV per 1 %, times 0.0131 % = 0.242 mV.
    added = 0.8 * 2.0 / 3600.0
    rise, extrapolated = chargefault.ocv_rise(OCV_TABLES["nmc"], 4.221, added, 3.4)
    slope = (NMC_100 - NMC_98) / 0.02
    assert rise == pytest.approx(added / 3.4 * slope, rel=1e-9)
    assert rise == pytest.approx(0.242e-3, abs=0.001e-3)
    assert extrapolated


def test_the_iec_62133_2_supply_factor_is_marked_as_recalled():
    # IEC 62133-2's overcharge test supply, 1.4 × the upper limit per cell [memory]: the
    # constant, the reference text and the message all say it is recalled.
    assert chargefault.FAULT_SUPPLY_FACTOR == 1.4
    text = (REPO / "docs" / "references.md").read_text(encoding="utf-8")
    assert "1.4 × its upper limit charging\n  voltage (at most 6.0 V) per cell, current-limited [memory" in text


def test_a_failed_charger_inside_the_table(tmp_path):
    # [derived: Thevenin cell] T-CELL 3 Ah, 30 mΩ; a charger of 4.10 V at 3 A: resting at 4.10 V
    # plus 90 mV is 4.19 V, below the 4.20 V detection, so the detection is crossed at 4.20 V with
    # the OCV at 4.11 V (93.35 %, between 90.2 % 4.091 V and 98 % 4.138 V). Over the 1.2 s delay
    # 3 A adds 1 mAh, 0.0333 %: × (4.138 − 4.091) / 7.8 % = 0.201 mV. The fault supply is
    # 1.4 × 4.25 = 5.95 V per cell (below the 6 V open_circuit_max) [memory].
    m = _model(tmp_path, extra=CHARGER.format(v="4.10 V", i="3 A"))
    f = m.charger_fault
    slope = (NMC_98 - NMC_90_2) / 0.078
    assert f.start == pytest.approx(4.20, abs=1e-12)
    assert f.rise == pytest.approx(3.0 * 1.2 / 3600.0 / 3.0 * slope, rel=1e-9)
    assert f.peak == pytest.approx(4.20 + 0.201e-3, abs=0.001e-3)
    assert f.fault_voltage == pytest.approx(5.95, rel=1e-12) and f.fault_assumed
    assert not f.extrapolated
    ev = m.event("charger-fault")
    assert ev.duration == 1.2 and ev.current == 3.0 and ev.detection == "overcharge"
    assert ev.figures["cell peak"] == f.peak


def test_a_failed_charger_jumps_past_the_limit(tmp_path):
    # [derived] 80 mΩ, a charger of 4.15 V at 3 A: 4.15 + 0.24 = 4.39 V at once (above the
    # detection); OCV 4.15 V is 98.65 % on the 98 -> 100 % segment, + 0.0333 % × 18.5 mV/% =
    # 0.617 mV: 4.3906 V, 40.6 mV above the 4.35 V limit.
    findings = _findings(tmp_path, "charger-fault-overshoot", cell_r="80 mΩ",
                         extra=CHARGER.format(v="4.15 V", i="3 A"))
    (f,) = findings
    assert "jumps by I·R = 3 A × 80 mΩ = 240 mV to 4.39 V at once" in f.message
    assert "rises 617 µV more" in f.message and "40.6 mV above" in f.message
    # the largest current that stays within: (4.35 − 4.15 − 0.000617) / 0.08 = 2.49 A
    assert "at or below 2.49 A" in f.hint


def test_a_given_fault_voltage_caps_the_cell(tmp_path):
    # A charger whose fault output is 4.36 V holds the jumping cell there: 10 mV over the limit.
    extra = ("charger: {voltage: {typ: 4.15 V}, current: 3 A, open_circuit_max: 6 V, "
             "fault_voltage: 4.36 V}\n")
    f = _model(tmp_path, cell_r="80 mΩ", extra=extra).charger_fault
    assert f.peak == pytest.approx(4.36) and not f.fault_assumed


def test_charge_trip_window_is_the_detection_over_the_sense_resistance(tmp_path):
    # [derived: Ohm's law, written out from the part data] two 25 mΩ channels between U1's
    # ground and sense pins: 50 mΩ. Detection 90 / 100 / 110 mV -> 1.8 / 2.0 / 2.2 A.
    m = _model(tmp_path, **FLAT, extra=CHARGER.format(v="4.10 V", i="1 A"))
    t = m.charge_overcurrent_trip
    assert (t.min, t.typ, t.max) == pytest.approx((0.090 / 0.050, 0.100 / 0.050, 0.110 / 0.050),
                                                  rel=1e-9)


def test_charge_trip_window_against_ngspice(tmp_path):
    # An independent simulator: ngspice's level-1 NMOS pair, common drain, each gate 12 V above
    # its source, kp set so one channel is 25 mΩ at that drive (1 / (kp·(12 − 1 V))), carrying
    # the model's trip minimum the charge way (P- to B- outside, B- to P- through the pair) and
    # the discharge way. The voltage across the sense pins must be the detection minimum either
    # way, to the simulator's triode curvature (V_DS²/2, 0.2 %).
    m = _model(tmp_path, **FLAT, extra=CHARGER.format(v="4.10 V", i="1 A"))
    t = m.charge_overcurrent_trip
    kp = 1.0 / (0.025 * (12.0 - 1.0))
    for way, (a, b) in (("charge", ("pm", "0")), ("discharge", ("0", "pm"))):
        lines = [f"* {way} trip", f".model nch nmos level=1 vto=1.0 kp={kp:.12g} lambda=0",
                 "M1 mid g1 0 0 nch w=1 l=1", "VG1 g1 0 12",
                 "M2 mid g2 pm pm nch w=1 l=1", "VG2 g2 pm 12",
                 f"I1 {a} {b} {t.min:.12g}", "RLEAK mid 0 1e12",
                 ".control", "set numdgt=15", "op", "print all", "quit 0", ".endc", ".end", ""]
        values = spice.run_op("\n".join(lines))
        assert abs(values["pm"]) == pytest.approx(t.detect.min, rel=5e-3), way


def test_regen_and_charge_events(tmp_path):
    # The charger's 1 A for ever and a 3 A regenerative peak for 2 s, each through both channels
    # in series: each channel carries it all and dissipates I²·R = 9 A² × 25 mΩ = 0.225 W in the
    # regen [derived: Joule heating, flat 25 mΩ].
    m = _model(tmp_path, **FLAT, extra=CHARGER.format(v="4.10 V", i="1 A"),
               load="0.5 A, regen: {current: 3 A, duration: 2 s}")
    charge, regen = m.event("charge"), m.event("regen")
    assert charge.current == 1.0 and charge.duration is None
    assert regen.current == 3.0 and regen.duration == 2.0
    assert regen.dissipation["Q1"] == pytest.approx(2 * 9 * 0.025, rel=1e-9)


def test_no_charger_no_charge_events(tmp_path):
    m = _model(tmp_path)
    assert m.event("charge") is None and m.event("charger-fault") is None
    assert m.charge_overcurrent_trip is None and m.low_voltage_charging is None


def test_deep_discharge_default_is_a_tenth_of_the_capacity(tmp_path):
    # 0.1 C [practice] of T-CELL's 3 Ah: 0.3 A per cell; the protector charges any cell.
    guard = "    low_voltage_charge: {allowed: true}"
    lv = _model(tmp_path, guard_extra=guard, extra=CHARGER.format(v="4.10 V", i="1 A")
                ).low_voltage_charging
    assert lv.precharge_limit == pytest.approx(0.3) and lv.precharge_assumed
    assert lv.current == 1.0 and lv.below == 0.0 and lv.charges_below_limit
