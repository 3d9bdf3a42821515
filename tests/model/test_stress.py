"""Stress figures (linter/model/stress.py) against outside sources, through the design model.

Each test builds a small design whose parts make a reference vector appear exactly (flat on-
resistance tables, a 25 °C cold end so no temperature factor applies, fuses without resistance),
lints it through the whole engine, and reads the figure from the model or from a rule's finding.
The vectors are from docs/references.md; the tag beside each says how far to trust it.
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from packwarden.engine import lint
from tests.model.linted import linted_model
from packwarden.model import stress
from packwarden.testing import Case, run_case

REPO = Path(__file__).resolve().parents[2]

LIB = """\
format: packwarden-parts/1
parts:
  T-CELL:
    kind: cell
    chemistry: nmc
    capacity: 3 Ah
    voltage: {{charge: 4.2 V, upper_limit: 4.25 V, overcharge_limit: 4.35 V, nominal: 3.6 V,
              cutoff: 2.5 V, lower_limit: 2.0 V}}
    internal_resistance: {{typ: {cell_r}}}
    max_current: {{discharge: 200 A, charge: 3 A}}
  T-GUARD:
    kind: protector
    overcharge: {{detect: {{typ: 4.20 V}}, release: {{typ: 4.0 V}}, delay: 1.2 s}}
    overdischarge: {{detect: {{typ: 2.50 V, tol: 50 mV}}, release: {{typ: 3.0 V, tol: 100 mV}}, delay: 150 ms,
                    release_on: [voltage]}}
    overcurrent: {{detect: {{typ: 150 mV, tol: 15 mV}}, delay: {{min: 5 ms, max: 15 ms}}}}
    short_circuit: {{detect: {{typ: 500 mV, tol: 100 mV}}, delay: {{min: 150 us, max: 540 us}},
                    release_on: {sc_release}}}
    supply_current: {{operating: {{max: 6 uA}}}}
{guard_extra}
  T-PAIR:                 # a flat table: the same resistance at every gate drive and corner
    kind: fet_pair_common_drain
    channel: n
    vds_max: {vds_max}
    vgs_max: 12 V
    vgs_th: {{max: 1.0 V}}
    rds_on:
      - {{vgs: 2.0 V, typ: {rds}, max: {rds}}}
      - {{vgs: 4.5 V, typ: {rds}, max: {rds}}}
    rds_on_hot_ratio: {{at: 125 °C, ratio: {ratio}}}
    id_max: {id_max}
    id_pulse_max: {pulse}
    theta_ja: {theta}
{fet_extra}"""

DESIGN = """\
format: packwarden/1
design: {{name: stress vector}}
libraries: [lib.yaml]
pack: {{ambient: {{min: 25 °C, max: {hot}}}{pack_extra}}}
load: {{continuous: {load}}}
components:
  BT1: {{part: T-CELL, pins: {{pos: B+, neg: B-}}}}
  U1: {{part: T-GUARD, pins: {{supply: B+, ground: B-, sense: P-, discharge_gate: DG, charge_gate: CG}}}}
  Q1: {{part: T-PAIR, pins: {{s1: B-, g1: DG, s2: {s2}, g2: CG}}}}
  F1: {{kind: fuse, rated_current: 300 A, rated_voltage: 32 V, breaking_capacity: 10 kA, pins: [{fuse_a}, P+]}}
{extra}"""

DEFAULTS = dict(cell_r="30 mΩ", sc_release="[load_removal]", vds_max="20 V", rds="25 mΩ",
                ratio="1.5", pulse="500 A", id_max="100 A", theta="83 K/W", fet_extra="",
                hot="40 °C",
                pack_extra="", load="0.5 A", s2="P-", fuse_a="B+", extra="", guard_extra="")

# A driver that holds the gates 12 V above their sources, whatever the short does to the cell
# voltage: the hard short then keeps every switch fully on (linter/model/short.py), and the
# vectors below are plain Ohm's law.
FIXED_DRIVE = "    gate_drive: 12 V"


def _design(tmp_path: Path, **values: str) -> Path:
    v = {**DEFAULTS, **values}
    (tmp_path / "packwarden.toml").write_text("")
    (tmp_path / "lib.yaml").write_text(LIB.format(**v), encoding="utf-8")
    path = tmp_path / "d.yaml"
    path.write_text(DESIGN.format(**v), encoding="utf-8")
    return path


def _model(tmp_path: Path, **values: str):
    return linted_model(_design(tmp_path, **values))


def _findings(tmp_path: Path, rule: str, options: dict | None = None, **values: str):
    case = Case(rule=rule, name="vector", design=_design(tmp_path, **values), expect=(),
                source="test_stress.py", options=options or {})
    return run_case(case)


def _figure(finding, name: str) -> float:
    return next(f.value for f in finding.figures if f.name == name)


def _heat(model, case: str):
    (h,) = [h for h in model.switch_heat if h.case == case]
    return h


# --- junction temperature ---------------------------------------------------------------------

def test_junction_temperature_vector_through_the_model(tmp_path):
    # [derived] docs/references.md, "MOSFETs": 2 A through two 22 mΩ channels -> 0.176 W; at 120 K/W
    # and 60 °C ambient T_J = 60 + 0.176 × 120 = 81.1 °C (T_J = T_A + P·R_θJA [published: data
    # sheet definition]). A hot ratio of 1.0 keeps R_DS(on) flat, as the vector assumes.
    model = _model(tmp_path, rds="22 mΩ", ratio="1.0", theta="120 K/W", hot="60 °C", load="2 A")
    h = _heat(model, "continuous")
    assert h.power == pytest.approx(0.176, rel=1e-4)
    assert h.tj == pytest.approx(81.12, abs=0.02)
    assert not h.runaway


def test_junction_temperature_vector_through_the_rule(tmp_path):
    # The same vector as a finding: an 80 °C limit is crossed at 81.1 °C.
    findings = {f.key: f for f in _findings(
        tmp_path, "switch-temperature", {"limit": "80 °C"}, rds="22 mΩ", ratio="1.0",
        theta="120 K/W", hot="60 °C", load="2 A")}
    assert set(findings) == {"continuous", "permitted"}
    f = findings["continuous"]
    assert "81.1 °C at the continuous load 2 A" in f.message
    assert _figure(f, "dissipation") == pytest.approx(0.176, rel=1e-4)
    # θJA that just meets 80 °C at 0.176 W: (80 - 60) / 0.176 = 113.6 K/W [derived]
    assert "θJA ≤ 114 K/W" in f.hint
    # [derived] just below the trip, (150 + 15 mV)² / 44 mΩ = 0.619 W -> 60 + 74.3 = 134.3 °C
    f = findings["permitted"]
    assert _figure(f, "dissipation") == pytest.approx(0.165 ** 2 / 0.044, rel=1e-4)
    assert _figure(f, "junction temperature") == pytest.approx(60 + 120 * 0.165 ** 2 / 0.044, abs=0.02)


def test_fixed_load_balance_and_runaway_follow_the_loop_gain(tmp_path):
    # [derived] from T_J = T_A + I²·2R₀·(1 + a(T_J - 25))·R_θJA with the linear R_DS(on)(T) of a
    # ratio r at 125 °C (a = (r - 1)/100): a balance exists only while the loop gain
    # g = R_θJA·I²·2R₀·a is below 1, at T_J = (T_A + R_θJA·I²·2R₀·(1 - 25a)) / (1 - g).
    # 25 mΩ, r = 2 (a = 0.01/K), 400 K/W: 2 A gives g = 0.8, sqrt(6) A gives g = 1.2.
    common = dict(rds="25 mΩ", ratio="2.0", theta="400 K/W", hot="25 °C")
    h = _heat(_model(tmp_path, load="2 A", **common), "continuous")
    k = 400 * 4 * 0.050
    assert not h.runaway
    assert h.tj == pytest.approx((25 + k * (1 - 0.25)) / (1 - 0.8), abs=0.1)  # 425 °C, over tj_max
    sub = tmp_path / "runaway"
    sub.mkdir()
    h = _heat(_model(sub, load=f"{math.sqrt(6):.6f} A", **common), "continuous")
    assert h.runaway


def test_permitted_current_is_the_closed_form_fixed_point(tmp_path):
    # [derived] With the pair as the whole sense resistance 2R₀·f(T), f = 1 + a(T - 25), the
    # current just below the trip is V/(2R₀f) and its dissipation V²/(2R₀f); T_J - T_A = x solves
    # a·x² + c·x - K = 0 with c = f(T_A) and K = R_θJA·V²/(2R₀). V = 165 mV (150 mV + 15 mV),
    # R₀ = 25 mΩ, r = 1.5, 83 K/W, 40 °C.
    model = _model(tmp_path)
    h = _heat(model, "permitted")
    a, v, r0, theta, ta = 0.005, 0.165, 0.025, 83.0, 40.0
    c, k = 1 + a * (ta - 25), theta * v * v / (2 * r0)
    x = (-c + math.sqrt(c * c + 4 * a * k)) / (2 * a)
    assert h.tj == pytest.approx(ta + x, abs=0.05)
    assert h.current == pytest.approx(v / (2 * r0 * (1 + a * (ta + x - 25))), rel=1e-3)
    # and it is a balance: T_J = T_A + P·R_θJA [published: data sheet definition]
    assert h.tj == pytest.approx(ta + h.power * theta, abs=0.05)


# --- short circuit ----------------------------------------------------------------------------

def test_prospective_short_circuit_vector_cell_only(tmp_path):
    # [derived] docs/references.md, "Internal resistance and short circuit": 4.2 V / 18 mΩ -> 233 A
    # with the cell alone; the switches are 1 µΩ and the fuse gives no resistance. Through the
    # nodal solve of the netlist.
    model = _model(tmp_path, cell_r="18 mΩ", rds="1 uΩ", guard_extra=FIXED_DRIVE)
    assert model.prospective_short_circuit == pytest.approx(4.2 / 0.018, rel=1e-3)
    pulse = model.short_circuit_pulse
    assert pulse.current == pytest.approx(model.prospective_short_circuit, rel=1e-9)
    assert pulse.channel_current["Q1.1"] == pytest.approx(233.3, rel=1e-3)


def test_short_circuit_solution_agrees_with_prospective_short_circuit():
    # The per-channel solve is kept apart from prospective_short_circuit; they must not drift.
    run = lint([str(REPO / "example_designs" / "orchard-probe.yaml")])
    (result,) = run.designs
    m = result.model
    sol, _ = m.short_circuit_solution
    assert abs(sol.current("(load)")) == pytest.approx(m.prospective_short_circuit, rel=1e-12)


def test_i2t_vector_through_the_rule(tmp_path):
    # [derived] docs/references.md, "Fuses": I²t of a rectangular pulse = I²·t [published:
    # definition]; 40 A for 540 µs -> 0.86 A²s. 4.2 V over 75 mΩ + 2 × 15 mΩ = 40 A, ended by the
    # short-circuit detection (trip max 0.6 V / 30 mΩ = 20 A) after its longest delay, 540 µs.
    findings = _findings(tmp_path, "short-circuit-stress", cell_r="75 mΩ", rds="15 mΩ",
                         pulse="30 A", id_max="30 A",  # a pulse rating is at least I_D
                         guard_extra=FIXED_DRIVE)
    assert len(findings) == 2  # both channels carry the whole short
    for f in findings:
        assert _figure(f, "channel current") == pytest.approx(40.0, rel=1e-4)
        assert _figure(f, "I²t") == pytest.approx(0.864, rel=1e-3)
        assert "longest short-circuit delay" in f.message
    assert stress.pulse_i2t(40.0, 540e-6) == pytest.approx(0.864, rel=1e-9)


def test_retry_energy_and_average_heat(tmp_path):
    # [derived] energy per retry = Σ I²·R·t over the package's channels; average power = energy /
    # retry period; T_J = T_A + P·R_θJA [published: data sheet definition]. 40 A as above,
    # 15 mΩ flat (ratio 1.0), 540 µs, every 1 s: 2 × 40² × 0.015 × 540e-6 = 25.9 mJ, 25.9 mW.
    model = _model(tmp_path, cell_r="75 mΩ", rds="15 mΩ", ratio="1.0",
                   sc_release="[auto_retry], retry_period: 1 s", guard_extra=FIXED_DRIVE)
    (heat,) = stress.retry_heat(model)
    assert heat.event.startswith("a hard short")
    assert heat.energy["Q1"] == pytest.approx(2 * 40**2 * 0.015 * 540e-6, rel=1e-3)
    assert heat.power["Q1"] == pytest.approx(heat.energy["Q1"] / 1.0, rel=1e-9)
    assert heat.tj["Q1"] == pytest.approx(40 + heat.power["Q1"] * 83, abs=1e-3)
    assert heat.i2t("Q1.1") == pytest.approx(0.864, rel=1e-3)


def test_turn_off_spike_is_l_di_dt_and_is_derated_only_in_the_margin_rule(tmp_path):
    # [published: the inductor law V = L·di/dt] 50 nH × 233.3 A / 2 µs = 5.83 V on top of the
    # 4.2 V stack = 10.0 V: within a 12 V rating (no avalanche) but above 80 % of it (9.6 V).
    values = dict(cell_r="18 mΩ", rds="1 uΩ", vds_max="12 V", pack_extra=", wiring_inductance: 50 nH",
                  fet_extra="    turn_off_time: 2 us\n")
    model = _model(tmp_path, **values)
    (discharge,) = model.channels_of("discharge")
    spike = model.turn_off_spike(discharge)
    assert spike.spike == pytest.approx(50e-9 * 4.2 / 0.018 / 2e-6, rel=1e-3)
    assert spike.total == pytest.approx(4.2 + spike.spike, rel=1e-9)
    assert not spike.time_assumed
    assert [f for f in _findings(tmp_path, "short-circuit-stress", **values)
            if f.key.startswith("spike")] == []
    margin = [f for f in _findings(tmp_path, "switch-voltage-margin", **values) if f.element == "Q1"]
    assert any("must block 10 V (turning off a short circuit" in f.message for f in margin)


# --- conductors -------------------------------------------------------------------------------

def _trace_design(layer: str, width: str, weight: str) -> dict:
    # A trace between the cells and the fuse, outside the sense stretch, so it carries the whole
    # current the protection permits for ever: 165 mV / (2 × 3 mΩ) = 27.5 A at the 25 °C cold end
    # (a hot ratio of 1.0 keeps R_DS(on) flat, so the switches' heat does not lower it).
    return dict(rds="3 mΩ", fuse_a="T", ratio="1.0",
                extra=f"  T1: {{kind: trace, width: {width}, copper_weight: {weight}, "
                      f"length: 10 mm, layer: {layer}, pins: [B+, T]}}\n")


@pytest.mark.parametrize("layer, width, weight, delta_t, amperes", [
    # [derived] docs/references.md, "Conductor current capacity — IPC-2221": I = k·ΔT^0.44·A^0.725
    ("outer", "100 mil", "1 oz", "10 K", 4.70),   # 100 mil outer 1 oz ΔT 10 -> 4.70 A
    ("inner", "100 mil", "1 oz", "10 K", 2.35),   # ... inner -> 2.35 A
    ("outer", "11.83 mil", "1 oz", "10 K", 1.00),  # 1 A outer 1 oz ΔT 10 -> 11.83 mil
    ("outer", "108.9 mil", "1 oz", "10 K", 5.00),  # 5 A outer 1 oz ΔT 10 -> 108.9 mil
    ("outer", "93.0 mil", "2 oz", "20 K", 10.0),   # 10 A outer 2 oz ΔT 20 -> 93.0 mil
])
def test_ipc2221_vectors_through_the_rule(tmp_path, layer, width, weight, delta_t, amperes):
    width_m = float(width.split()[0]) * 25.4e-6
    (f,) = _findings(tmp_path, "conductor-capacity", {"delta_t": delta_t},
                     **_trace_design(layer, f"{width_m * 1e3:.6f} mm", weight))
    assert _figure(f, "IPC-2221 capacity") == pytest.approx(amperes, rel=3e-3)
    assert _figure(f, "current") == pytest.approx(27.5, rel=1e-3)


def test_ipc2221_inner_layer_carries_exactly_half(tmp_path):
    # [published] same area, inner k = 0.024 is half of outer k = 0.048.
    capacity = {}
    for layer in ("outer", "inner"):
        (tmp_path / layer).mkdir()
        (f,) = _findings(tmp_path / layer, "conductor-capacity", **_trace_design(layer, "1 mm", "1 oz"))
        capacity[layer] = _figure(f, "IPC-2221 capacity")
    assert capacity["inner"] == pytest.approx(capacity["outer"] / 2, rel=1e-12)


def test_trace_share_of_the_sense_resistance(tmp_path):
    # [published] IEC 60028: 1/58 Ω·mm²/m at 20 °C, +0.393 %/K; [derived] docs/references.md vector
    # 35 µm × 2 mm × 50 mm at 20 °C -> 12.3 mΩ, so 12.3 × (1 + 0.00393 × 5) = 12.55 mΩ at 25 °C.
    # Between the pair (2 × 25 mΩ) and the sense point it is 12.55 / 62.55 = 20.1 % of the sense
    # resistance, and well within its IPC-2221 capacity (about 4 A against a 2.6 A trip max).
    r = 1 / 58 * 50e-3 / (2 * 0.035) * (1 + 0.00393 * 5)  # Ω·mm²/m × m / mm²
    (f,) = _findings(tmp_path, "conductor-capacity", s2="QS",
                     extra="  T1: {kind: trace, width: 2 mm, thickness: 35 um, length: 50 mm, "
                           "pins: [QS, P-]}\n")
    assert f.severity.value == "info"
    assert r == pytest.approx(0.01255, rel=1e-3)
    assert _figure(f, "conductor resistance") == pytest.approx(r, rel=1e-3)
    assert _figure(f, "share of sense resistance") == pytest.approx(100 * r / (r + 0.050), rel=1e-3)


# --- cell rebound -----------------------------------------------------------------------------

def test_cold_factor_is_geometric_between_25_c_and_its_reference():
    # The model's own definition (a constant ratio per kelvin [practice]): the given factor at its
    # temperature, its square root half way, 1 at and above 25 °C.
    assert stress.cold_resistance_factor(-20.0, 2.0, -20.0) == pytest.approx(2.0)
    assert stress.cold_resistance_factor(2.5, 2.0, -20.0) == pytest.approx(math.sqrt(2.0))
    assert stress.cold_resistance_factor(40.0, 2.0, -20.0) == 1.0
    with pytest.raises(ValueError):
        stress.cold_resistance_factor(0.0, 0.5, -20.0)


def test_rebound_is_current_times_cold_resistance(tmp_path):
    # [practice] docs/references.md: after a load is removed the cell rebounds by about I × R_internal.
    # 30 mΩ cell, 0.5 A, ambient down to 25 °C (no cold factor): 15 mV; release 2.9 V min against
    # detect 2.55 V max: 350 mV of hysteresis.
    model = _model(tmp_path)
    (od,) = [r for r in stress.release_rebounds(model, 2.0, -20.0) if r.threshold == "overdischarge"]
    assert od.rebound == pytest.approx(0.5 * 0.030, rel=1e-9)
    assert od.hysteresis == pytest.approx(2.9 - 2.55, rel=1e-9)
