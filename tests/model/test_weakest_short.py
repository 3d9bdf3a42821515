"""The weakest short the protection must still catch, against Ohm's law worked by hand.

Its corner (docs/references.md "Events in time"): an external short of 80 mΩ, IEC 62133-2's
external short-circuit test [published; value from memory], the cells at their maximum internal
resistance times 1.5 [practice: end of life at 1.5-2 × the new resistance], the stack at the
protector's over-discharge detection minimum, the lowest ambient, every part of the path at its
highest resistance.
"""

import math

import pytest

from tests.model.linted import linted_model
from packwarden.model.limits import CELL_AGEING, FAULT_RESISTANCE

LIB = """\
format: packwarden-parts/1
parts:
  W-CELL:
    kind: cell
    chemistry: nmc
    capacity: 3000 mAh
    voltage: {charge: 4.2 V, upper_limit: 4.25 V, overcharge_limit: 4.35 V, nominal: 3.6 V,
              cutoff: 2.5 V, lower_limit: 2.0 V}
    internal_resistance: {typ: 14 mΩ, max: 20 mΩ}
    max_current: {discharge: 30 A, charge: 3 A}
  W-GUARD:
    kind: protector
    gate_drive: {drive}
    overcharge: {detect: {typ: 4.30 V, tol: 25 mV}, release: {typ: 4.10 V, tol: 50 mV}, delay: 1.2 s}
    overdischarge: {detect: {typ: 2.45 V, tol: 50 mV}, release: {typ: 3.0 V, tol: 100 mV}, delay: 150 ms}
    overcurrent: {detect: {typ: 150 mV, tol: 15 mV}, delay: {min: 5 ms, max: 15 ms}}
    short_circuit: {detect: {typ: 600 mV, tol: 100 mV}, delay: {min: 200 us, max: 500 us}}
    supply_current: {operating: {typ: 2 uA, max: 3 uA}, power_down: {max: 0.1 uA}}
  W-PAIR:
    kind: fet_pair_common_drain
    channel: n
    vds_max: 20 V
    vgs_max: 12 V
    vgs_th: {max: 1.0 V}
    rds_on: [{vgs: 1.8 V, typ: 30 mΩ, max: 35 mΩ}, {vgs: 2.5 V, typ: 25 mΩ, max: 30 mΩ},
             {vgs: 4.5 V, typ: 20 mΩ, max: 25 mΩ}]
    rds_on_hot_ratio: {at: 125 °C, ratio: 1.5}
    id_max: 40 A
    id_pulse_max: 150 A
    theta_ja: 83 K/W
"""

DESIGN = """\
format: packwarden/1
design: {name: weakest short}
libraries: [lib.yaml]
pack: {ambient: {min: 25 °C, max: 40 °C}}
load: {continuous: 1 A}
components:
  BT1: {part: W-CELL, pins: {pos: B+, neg: B-}}
  U1: {part: W-GUARD, pins: {supply: VDD, ground: B-, sense: VM, discharge_gate: DG, charge_gate: CG}}
  R1: {kind: resistor, value: 470 Ω, pins: [B+, VDD]}
  R2: {kind: resistor, value: 2 kΩ, pins: [VM, P-]}
  Q1: {part: W-PAIR, pins: {s1: B-, g1: DG, d: MID, s2: P-, g2: CG}}
  F1: {kind: fuse, rated_current: 10 A, rated_voltage: 32 V, breaking_capacity: 1000 A, pins: [B+, P+]}
"""


def model(tmp_path, drive="10 V", config=""):
    (tmp_path / "packwarden.toml").write_text(config)
    # a fixed drive from a driver that holds it above the cells (a charge pump), so the
    # channels sit on their tabulated row whatever the stack does
    boosted = "" if drive == "cell" else "\n    gate_drive_boosted: true"
    (tmp_path / "lib.yaml").write_text(LIB.replace("{drive}", drive + boosted), encoding="utf-8")
    path = tmp_path / "d.yaml"
    path.write_text(DESIGN, encoding="utf-8")
    return linted_model(path, config=tmp_path / "packwarden.toml")


def test_the_defaults_are_the_standard_and_the_practice():
    # IEC 62133-2's external short: 80 ± 20 mΩ [published; from memory]; end of life at
    # 1.5-2 × the new resistance [practice] (docs/references.md "Events in time").
    assert FAULT_RESISTANCE == pytest.approx(0.080)
    assert CELL_AGEING == 1.5


def test_weakest_short_by_ohms_law_with_a_fixed_gate_drive(tmp_path):
    # [derived: Ohm's law] The stack at the over-discharge detection minimum, 2.45 V - 50 mV =
    # 2.40 V; the cell at 1.5 × 20 mΩ = 30 mΩ; the pair's two channels at their 4.5 V row's
    # maximum (a 10 V drive holds the highest row) at 25 °C, 2 × 25 mΩ; the fuse gives no
    # resistance (the model's 1 µΩ stand-in); the fault 80 mΩ:
    # 2.40 V / (30 + 50 + 80 + 0.001) mΩ = 15.0 A.
    m = model(tmp_path)
    event = m.event("weakest-short")
    assert event.current == pytest.approx(2.40 / 0.160001, rel=1e-6)
    assert event.current == pytest.approx(15.0, abs=0.01)
    # Each channel of the pair dissipates I²·R_DS(on): 15² × 25 mΩ = 5.62 W, 11.2 W the package.
    assert event.dissipation["Q1"] == pytest.approx(2 * 15.0 ** 2 * 0.025, rel=1e-4)
    # The trip maxima are the detection maxima over the channels at their lowest, typ - (max -
    # typ) = 15 mΩ each [practice: a symmetric spread]: 165 mV / 30 mΩ = 5.5 A and 700 mV /
    # 30 mΩ = 23.3 A. 15 A lies between: the over-current detection ends it after 15 ms.
    assert m.overcurrent_trip.max == pytest.approx(0.165 / 0.030, rel=1e-6)
    assert m.short_circuit_trip.max == pytest.approx(0.700 / 0.030, rel=1e-6)
    assert event.detection == "over-current"
    assert event.duration == pytest.approx(15e-3)
    assert event.voltage == pytest.approx(2.40)


def test_the_options_move_the_corner(tmp_path):
    # Ageing 2 and a 50 mΩ fault [the options]: 2.40 V / (40 + 50 + 50 + 0.001) mΩ = 17.1 A.
    config = ("[rules.short-circuit-reach]\nageing = 2.0\n"
              'fault_resistance = "50 mΩ"\n')
    event = model(tmp_path, config=config).event("weakest-short")
    assert event.current == pytest.approx(2.40 / 0.140001, rel=1e-6)


def test_a_cell_driven_gate_follows_the_sagging_cell(tmp_path):
    # With gate_drive: cell the protector's supply is the cell's terminal voltage under the
    # short, V = 2.40 V - I × 30 mΩ. The discharge FET (source on B-) sees V; the charge FET
    # (source on P-, which the fault holds above B- by the pair's drop) sees V less that drop,
    # below its 1.0 V threshold: starved, its body diode carries the current at 0.95 V
    # [practice: docs/references.md "Events in time"]. The discharge channel's R_DS(on) (max) is
    # the data sheet's line between the 1.8 V row (35 mΩ) and the 2.5 V row (30 mΩ). Solved
    # here by bisection on I, on its own [derived: Kirchhoff's voltage law and linear
    # interpolation of the table]: I = (2.40 - 0.95) / (0.030 + R(V) + 0.080), about 10.1 A
    # at V about 2.10 V.
    def rds(v):
        return 0.035 + (v - 1.8) * (0.030 - 0.035) / (2.5 - 1.8)

    lo, hi = 0.0, 2.40 / 0.11
    for _ in range(200):
        i = (lo + hi) / 2
        if i - (2.40 - 0.95) / (0.030 + rds(2.40 - i * 0.030) + 0.080 + 1e-4 + 1e-6) > 0:
            hi = i
        else:
            lo = i
    v = 2.40 - lo * 0.030
    charge_vgs = v - lo * rds(v) - 0.95
    assert 1.8 < v < 2.5 and charge_vgs < 1.0  # inside the table; the charge FET starved
    event = model(tmp_path, drive="cell").event("weakest-short")
    assert event.current == pytest.approx(lo, rel=1e-3)
    assert event.conduction == {"Q1.1": "channel", "Q1.2": "body diode"}
    assert event.gate_voltage["Q1.1"] == pytest.approx(v, abs=2e-3)
    assert event.gate_voltage["Q1.2"] == pytest.approx(charge_vgs, abs=2e-3)


def test_it_is_in_the_events_every_check_reads(tmp_path):
    m = model(tmp_path)
    assert "weakest-short" in [e.name for e in m.events]
    event = m.event("weakest-short")
    assert math.isfinite(event.i2t) and event.as_dict()["figures"]["fault resistance"] == 0.080
