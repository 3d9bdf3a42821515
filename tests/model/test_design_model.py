"""The design model end to end: figures computed from a netlist through the network solver."""

from pathlib import Path

import pytest

from packwarden.engine import lint

LIB = """\
format: packwarden-parts/1
parts:
  T-CELL:
    kind: cell
    chemistry: nmc
    capacity: 2 Ah
    voltage: {charge: 4.2 V, upper_limit: 4.25 V, overcharge_limit: 4.35 V, nominal: 3.6 V,
              cutoff: 2.5 V, lower_limit: 2.0 V}
    internal_resistance: {typ: 30 mΩ, max: 40 mΩ}
    max_current: {discharge: 20 A, charge: 2 A}
  T-GUARD:
    kind: protector
    overcharge: {detect: {typ: 4.30 V, tol: 25 mV}, release: {typ: 4.10 V, tol: 50 mV}, delay: 1.2 s}
    overdischarge: {detect: {typ: 2.50 V, tol: 50 mV}, release: {typ: 3.0 V, tol: 100 mV}, delay: 150 ms}
    overcurrent: {detect: {typ: 150 mV, tol: 15 mV}, delay: {min: 5 ms, max: 15 ms}}
    supply_current: {operating: {max: 6 uA}}
  T-PAIR:                 # a flat 25 mΩ table: the worked example's per-channel resistance
    kind: fet_pair_common_drain
    channel: n
    vds_max: 20 V
    vgs_max: 12 V
    vgs_th: {max: 1.0 V}
    rds_on:
      - {vgs: 2.0 V, typ: 25 mΩ, max: 30 mΩ}
      - {vgs: 4.5 V, typ: 25 mΩ, max: 30 mΩ}
    rds_on_hot_ratio: {at: 125 °C, ratio: 1.5}
    id_max: 10 A
    theta_ja: 83 K/W
"""

DESIGN = """\
format: packwarden/1
design: {{name: worked example}}
libraries: [lib.yaml]
pack: {{ambient: {{min: 0 °C, max: 40 °C}}}}
load: {{continuous: 0.5 A}}
components:
  BT1: {{part: T-CELL, pins: {{pos: B+, neg: B-}}}}
  U1: {{part: T-GUARD, pins: {{supply: B+, ground: B-, sense: P-, discharge_gate: DG, charge_gate: CG}}}}
  Q1: {{part: T-PAIR, pins: {{s1: B-, g1: DG, s2: P-, g2: CG}}}}
{extra}  F1: {{kind: fuse, rated_current: 20 A, rated_voltage: 32 V, breaking_capacity: 1000 A, pins: [B+, P+]}}
"""


def _figures(tmp_path: Path, extra: str = "") -> dict:
    (tmp_path / "packwarden.toml").write_text("")
    (tmp_path / "lib.yaml").write_text(LIB, encoding="utf-8")
    design = tmp_path / "d.yaml"
    design.write_text(DESIGN.format(extra=extra), encoding="utf-8")
    run = lint([str(design)])
    assert not run.input_errors(), [str(e) for e in run.input_errors()]
    (result,) = run.designs
    assert not result.internal, result.internal
    return {name: fig.value for name, fig in result.figures.items()}


def test_worked_example_single_pair_trips_at_3_amperes(tmp_path):
    # [practice] worked example (docs/references.md, "Single-cell protector"): trip current =
    # detection voltage / (2 × R_DS(on) per FET) = 150 mV / (2 × 25 mΩ) = 3 A. Typical corner:
    # 25 °C, typical values; computed through the nodal solve of the netlist.
    fig = _figures(tmp_path)
    assert fig["sense_resistance_typ"] == pytest.approx(0.050, rel=1e-4)
    assert fig["trip_current_typ"] == pytest.approx(3.0, rel=1e-4)


def test_worked_example_second_pair_in_parallel_doubles_to_6_amperes(tmp_path):
    # [practice] same worked example: a second identical dual-FET package in parallel halves the
    # resistance and doubles the trip current to 6 A — no special case, the solver finds it.
    fig = _figures(tmp_path, "  Q2: {part: T-PAIR, pins: {s1: B-, g1: DG, s2: P-, g2: CG}}\n")
    assert fig["sense_resistance_typ"] == pytest.approx(0.025, rel=1e-4)
    assert fig["trip_current_typ"] == pytest.approx(6.0, rel=1e-4)


def test_trip_window_brackets_typical_and_widens_with_tolerance(tmp_path):
    fig = _figures(tmp_path)
    # min: 135 mV over 2 × 30 mΩ at 40 °C (factor 1 + 0.5 × 15/100 = 1.075), a little lower still
    # from self-heating at the 0.5 A load (about 1 K); max: 165 mV over 2 × 20 mΩ
    # (min = typ − (max − typ)) cooled to 0 °C (factor 1 + 0.5 × (0 − 25)/100 = 0.875) [derived].
    cold_min = 0.135 / (2 * 0.030 * 1.075)
    assert 0.98 * cold_min < fig["trip_current_min"] < cold_min
    assert fig["trip_current_max"] == pytest.approx(0.165 / (2 * 0.020 * 0.875), rel=1e-3)
    assert fig["trip_current_min"] < fig["trip_current_typ"] < fig["trip_current_max"]
