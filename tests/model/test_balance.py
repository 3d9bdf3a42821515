"""Cell balance in use: the drift per charge cycle against the balancer, checked against a
hand-worked vector, against the sum of the cell voltages on the charger, and the tap-load
currents against an ngspice operating point of the tap network."""

from pathlib import Path

import pytest

from packwarden.engine import lint
from packwarden.model.balance import charger_cells
from packwarden.model.ocv import ocv_table, voltage_at_soc
from packwarden.testing import lint_variant
from tests.model import spice
from tests.model.linted import linted_model

REPO = Path(__file__).resolve().parents[2]
RIDGELINE = REPO / "example_designs" / "ridgeline-tool-4s2p.yaml"
RIDGELINE_PARTS = REPO / "example_designs" / "parts" / "ridgeline-parts.yaml"


def _model(tmp_path, *, replace=(), lib_replace=(), extra="", config=""):
    run = lint_variant(tmp_path, RIDGELINE, RIDGELINE_PARTS, replace=replace,
                       lib_replace=lib_replace, extra=extra)
    if config:
        (tmp_path / "packwarden.toml").write_text(config, encoding="utf-8")
        run = lint([str(tmp_path / RIDGELINE.name)])
    assert not run.input_errors(), [str(e) for e in run.input_errors()]
    (result,) = run.designs
    assert not result.internal, result.internal
    return result


def test_hand_worked_vector(tmp_path):
    # docs/references.md "Balancing" [derived], worked by hand: a 100 Ω bleed resistor at 4.1 V
    # takes 4.1 V / 100 Ω = 41 mA; in 1 h of balancing per charge that is 41 mAh per cycle. A
    # 1 mA tap load on the bottom level (3.6 kΩ at the cells' nominal 3.6 V) for a 10 h cycle puts
    # 1 mA × 10 h = 10 mAh per cycle between the bottom level and the others: the balancer holds
    # it, with 31 mAh to spare, and each charge starts from 10 mAh of imbalance.
    result = _model(
        tmp_path,
        # the charger's lowest per cell is the bleed voltage: 16.4 V / 4 = 4.1 V, no tolerance
        replace=[("voltage: {typ: 16.8 V, tol: 0.5 %}", "voltage: {typ: 16.4 V, tol: 0 %}")],
        lib_replace=[("value: 100 Ω\n    tol: 1 %", "value: 100 Ω\n    tol: 0 %")],
        extra="  R45: {kind: resistor, value: 3.6 kΩ, tol: 0 %, pins: [B1, B-]}\n",
        config='[rules.cell-balance]\ncycle_time = "36000 s"\nbalancing_time = "3600 s"\n'
               'self_discharge_spread = "0 %"\n')
    cb = result.model.cell_balance
    # the cells' own resistance (2 × 15 mΩ in parallel) and the switch stand-in take < 0.1 %
    assert cb.worst.removal == pytest.approx(0.041, rel=1e-3)
    assert cb.worst.need == pytest.approx(0.010, rel=1e-3)
    assert cb.worst.level in (2, 3, 4)
    assert cb.holds
    assert cb.imbalance == pytest.approx(0.010, rel=1e-3)
    assert not [f for f in result.findings if f.rule == "cell-balance"]
    figures = result.model.figures()
    assert figures["balance_drift_per_cycle"].value == pytest.approx(0.010, rel=1e-3)
    assert figures["balance_removal_per_cycle"].value == pytest.approx(0.041, rel=1e-3)


def test_cell_inputs_drain_the_bottom_cells(tmp_path):
    # The input of cell K draws from tap K and returns through ground, so it drains levels 1..K
    # [practice: a monitor's cell inputs each sink a current to its ground]: with 2 µA per input
    # at most, level 1 carries 4 × 2 µA and level 4 one, 6 µA more at the bottom.
    result = _model(tmp_path, lib_replace=[(
        "      power_down: {max: 0.5 uA}\n    gate_drive: 12 V                   # clamped",
        "      power_down: {max: 0.5 uA}\n    cell_input_current: {typ: 1 uA, max: 2 uA}\n"
        "    gate_drive: 12 V                   # clamped")])
    levels = result.model.cell_balance.levels
    assert levels[0].drain - levels[3].drain == pytest.approx(6e-6, rel=1e-6)
    assert levels[1].drain - levels[3].drain == pytest.approx(4e-6, rel=1e-6)
    assert any(d.what == "protector inputs" for d in levels[0].drains)


def test_cell_voltages_on_the_charger_add_up():
    # Kirchhoff's voltage law [published]: the charger fixes the sum of the series cells' voltages,
    # so whatever the imbalance does, high + 3 × low = 4 × 4.2 V; and the high cell stands above
    # the others by the open-circuit voltage the imbalance spans below full. On a straight-line
    # table of 3.0-4.2 V a 10 % imbalance spans 0.12 V, so high = 4.2 + 0.09, low = 4.2 - 0.03.
    table = ocv_table([(0.0, 3.0), (1.0, 4.2)])
    high, low = charger_cells(table, 4.2, 4, 0.10)
    assert high + 3 * low == pytest.approx(4 * 4.2, abs=1e-12)
    assert high - low == pytest.approx(voltage_at_soc(table, 1.0) - voltage_at_soc(table, 0.9))
    assert (high, low) == (pytest.approx(4.29), pytest.approx(4.17))


def test_tap_load_currents_match_ngspice(tmp_path):
    # An independent solve: the tap network written out by hand for ngspice, each level as its two
    # cells in parallel (3.60 V nominal, 15 mΩ each, so 7.5 mΩ), the fuel-gauge divider R21/R22
    # (1 MΩ + 150 kΩ) across the stack and a 10 kΩ + 10 kΩ divider from B2 to the bottom; every
    # other resistor of the Ridgeline ends at a protector pin or a capacitor and carries no
    # current. The levels' drain differences must agree with the model's.
    result = _model(tmp_path, extra=(
        "  R45: {kind: resistor, value: 10 kΩ, pins: [B2, TAPV]}\n"
        "  R46: {kind: resistor, value: 10 kΩ, pins: [TAPV, B-]}\n"))
    netlist = "\n".join([
        "* Ridgeline stack with a tap divider",
        "V1 n1a 0 3.6", "R1i n1a b1 7.5m",
        "V2 n2a b1 3.6", "R2i n2a b2 7.5m",
        "V3 n3a b2 3.6", "R3i n3a b3 7.5m",
        "V4 n4a b3 3.6", "R4i n4a bp 7.5m",
        "R21 bp vmon 1meg", "R22 vmon 0 150k",
        "R45 b2 tapv 10k", "R46 tapv 0 10k",
        ".control", "set numdgt=15", "op", "print all", "quit 0", ".endc", ".end", ""])
    values = spice.run_op(netlist)
    # the current through each cell source, from + to - inside the source: ngspice's i(Vn)
    # reads the current into the + node, so a discharging cell reads negative
    drains = {k: -values[f"v{k}#branch"] for k in range(1, 5)}
    levels = result.model.cell_balance.levels
    for k in (1, 2, 3):
        assert levels[k - 1].drain - levels[3].drain == pytest.approx(drains[k] - drains[4],
                                                                      rel=1e-6)
    # by hand: 3.6 V × 2 / 20 kΩ = 360 µA from the bottom two levels alone
    assert drains[1] - drains[4] == pytest.approx(360e-6, rel=1e-3)


def test_unusable_ocv_table_is_a_finding_not_a_traceback(tmp_path):
    # A table whose voltage falls near full cannot be read backwards; without storage (whose rule
    # reports the same table) the balance rule says so at the cell, and the run goes on.
    result = _model(tmp_path, replace=[("storage: {soc: 30 %", "# storage: {soc: 30 %")],
                    lib_replace=[("{soc: 90 %, voltage: 4.10 V}", "{soc: 90 %, voltage: 4.20 V}")])
    found = [f for f in result.findings if f.rule == "cell-balance"]
    assert len(found) == 1 and "cannot be used" in found[0].message
    assert result.model.cell_balance is None


def test_tap_loads_of_the_flawed_example():
    # The flawed Ridgeline: the LED and its resistor run from tap B1 to the bottom (taps 0..1);
    # the fuel-gauge divider spans the whole stack and the bleed resistors end at open switches,
    # so neither is a tap load [practice: a load unbalances only the levels it spans].
    m = linted_model(REPO / "example_designs" / "flawed" / "ridgeline-tap-load.yaml")
    assert m.cell_balance.tap_loads == ((("D5", "R41"), 0, 1),)


def test_an_unconnected_balance_pin_leaves_its_own_cell_unbled(tmp_path):
    # With balance2 not connected, cell 2 has no bleed and cells 1, 3 and 4 keep theirs: each
    # switch bleeds the cell below its own pin [practice: a bleed switch sits across its cell's
    # pair of inputs], here 4.179 V / 101 Ω = 41.4 mA (docs/references.md "Balancing").
    result = _model(tmp_path, replace=[("      balance2: BAL2\n", "")])
    bleeds = [lv.bleed for lv in result.model.cell_balance.levels]
    assert bleeds[1] == 0.0
    for k in (0, 2, 3):
        assert bleeds[k] == pytest.approx(16.8 * 0.995 / 4 / 101, rel=1e-3)
