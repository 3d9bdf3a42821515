"""Series stacks, parallel groups, shunt sensing and high-side switches in the design model."""

from pathlib import Path

import pytest

from packwarden.testing import lint_variant
from tests.model.spice import run_op

REPO = Path(__file__).resolve().parents[2]
RIDGE = ("ridgeline-tool-4s2p.yaml", "ridgeline-parts.yaml")
ORCHARD = ("orchard-probe.yaml", "orchard-parts.yaml")


def _run(tmp_path, name, library, replace=(), lib_replace=(), extra=""):
    run = lint_variant(tmp_path, REPO / "example_designs" / name,
                       REPO / "example_designs/parts" / library,
                       replace=replace, lib_replace=lib_replace, extra=extra)
    assert not run.input_errors(), [str(e) for e in run.input_errors()]
    (result,) = run.designs
    assert not result.internal, result.internal
    return result


def _model(tmp_path, *args, **kwargs):
    return _run(tmp_path, *args, **kwargs).model


def test_the_4s2p_stack(tmp_path):
    m = _model(tmp_path, *RIDGE)
    s = m.stack
    assert (s.series, s.parallel, s.bottom, s.top) == (4, 2, "B-", "B+")
    assert not s.problems
    assert m.stack_levels == {"B-": 0, "B1": 1, "B2": 2, "B3": 3, "B+": 4}
    # per-cell protector window times the series count [derived]
    assert m.stack_voltage.max == pytest.approx(4 * 4.300)
    assert m.stack_voltage.min == pytest.approx(4 * 2.650)


def test_shunt_sensing_is_the_shunts_transresistance(tmp_path):
    # The protector's ground and sense pins sit across RSH (through R2, which carries no
    # current): the sense resistance the solver finds is the shunt alone, 1.5 mΩ ±1 %, however
    # the FETs heat [derived: Ohm's law; the transresistance of a series element is its value].
    m = _model(tmp_path, *RIDGE)
    t = m.overcurrent_trip
    assert t.at_typ.sense_resistance == pytest.approx(1.5e-3, rel=1e-6)
    assert t.at_max.sense_resistance == pytest.approx(1.485e-3, rel=1e-6)
    assert t.at_min.sense_resistance == pytest.approx(1.515e-3, rel=1e-6)
    assert m.sense_elements == ("RSH",) and m.sense_by_shunt
    # trip window: 45 mV / 1.515 mΩ to 55 mV / 1.485 mΩ [derived]
    assert (t.min, t.max) == pytest.approx((0.045 / 1.515e-3, 0.055 / 1.485e-3), rel=1e-6)


def test_fet_sensing_sees_the_switches(tmp_path):
    # The single-cell probe senses across its FET pair: the worked example of docs/references.md
    # [practice], trip = detection / (2 × R_DS(on) per FET).
    m = _model(tmp_path, *ORCHARD)
    assert m.sense_elements == ("Q1",) and not m.sense_by_shunt
    op = m.overcurrent_trip.at_typ
    assert op.sense_resistance == pytest.approx(sum(op.rds.values()), rel=1e-6)


def test_parallel_switches_share_the_current(tmp_path):
    # Two identical FETs in parallel carry half the current each [derived: equal conductances].
    op = _model(tmp_path, *RIDGE).overcurrent_trip.at_typ
    for name in ("Q1", "Q2", "Q3", "Q4"):
        assert op.share[name] == pytest.approx(0.5, rel=1e-6)


def test_p_channel_tables_with_negative_vgs_are_read_as_magnitudes(tmp_path):
    # RL-PFET-30 prints V_GS as -4.5 V and -10 V, as p-channel data sheets do; a 12 V drive is
    # above the -10 V row and held there (typ 2.5 mΩ), a 4.5 V drive reads the -4.5 V row.
    m = _model(tmp_path, *RIDGE)
    q1 = next(ch for ch in m.channels if ch.name == "Q1")
    assert m.channel_rds(q1, 12.0, 25.0, "typ")[0] == pytest.approx(2.5e-3)
    assert m.channel_rds(q1, 4.5, 25.0, "typ")[0] == pytest.approx(4.0e-3)
    assert m.channel_rds(q1, 4.5, 25.0, "max")[0] == pytest.approx(5.2e-3)
    assert q1.vgs_th_max == pytest.approx(2.5)  # |-2.5 V|


def test_high_side_is_read_off_the_solve(tmp_path):
    assert all(_model(tmp_path, *RIDGE).high_side.values())
    (tmp_path / "o").mkdir()
    assert not any(_model(tmp_path / "o", *ORCHARD).high_side.values())


def test_high_side_switches_orient_by_flow(tmp_path):
    # Common-drain p-channel pairs on the positive rail: with the discharge pair off, discharge
    # current finds no path, charge current still reaches the cells through its body diodes.
    m = _model(tmp_path, *RIDGE)
    assert m.conducts(off="discharge", direction="discharge") is None
    assert m.conducts(off="discharge", direction="charge") is not None
    assert m.conducts(off="charge", direction="charge") is None
    assert m.conducts(off="charge", direction="discharge") is not None


def test_blocking_voltages_of_the_stack(tmp_path):
    m = _model(tmp_path, *RIDGE)
    # discharge switch off under load: the stack at 4 × 4.30 V; charge switch off with the charger
    # connected: 18.5 V − 4 × 2.65 V (no reversed charger: the connector is keyed) [derived]
    assert m.blocking_voltage("discharge") == [
        ("discharge switch off under load: the stack voltage", pytest.approx(17.2))]
    [(_, v)] = m.blocking_voltage("charge")
    assert v == pytest.approx(18.5 - 10.6)


def _stack_short_by_ngspice(temp: float) -> float:
    """The 4S2P pack's hard short at one temperature, from ngspice (an independent simulator) on
    a netlist written here from the library's figures (example_designs/parts/ridgeline-parts.yaml),
    every part at its lowest resistance:

    * eight cells at 4.30 V (the protector's overcharge detection max, 4.275 V + 25 mV), each at
      its 25 °C minimum 15 − (22 − 15) = 8 mΩ [practice: typ and max read as a symmetric spread];
      a cell's resistance only rises as it cools [practice, docs/references.md "Events in time"],
      so at or below 25 °C this is its lowest;
    * the fuse 1 mΩ; the shunt 1.5 mΩ − 1 %;
    * four p-channel FETs with the fixed 12 V drive, above the 10 V row, so at its figure (more
      drive never raises R_DS(on) [practice]): min 2.5 − (3.2 − 2.5) = 1.8 mΩ at 25 °C, rising
      linearly to 1.5 × at 125 °C (the part's hot ratio) [practice: docs/references.md "MOSFETs"].
    """
    fet = 1.8e-3 * (1 + 0.5 * (temp - 25.0) / 100.0)
    lines = ["* 4S2P hard short"]
    for level, (neg, pos) in enumerate((("0", "b1"), ("b1", "b2"), ("b2", "b3"), ("b3", "bp"))):
        for k in (1, 2):
            lines += [f"V{level}{k} {pos} x{level}{k} DC 4.30", f"R{level}{k} x{level}{k} {neg} 8m"]
    lines += ["RF bp bf 1m", "RQ1 bf mid " + repr(fet), "RQ2 bf mid " + repr(fet),
              "RQ3 mid pp " + repr(fet), "RQ4 mid pp " + repr(fet),
              "VSHORT pp pm DC 0", "RSH pm 0 1.485m",
              ".control", "set numdgt=12", "op", "print i(vshort)", "quit 0", ".endc", ".end", ""]
    return abs(run_op("\n".join(lines))["i(vshort)"])


def test_prospective_short_circuit_is_the_highest_one_temperature_short(tmp_path):
    # What a fuse must break: the highest current a hard short draws with cells, switches and path
    # at one temperature. At or below 25 °C the cells' 25 °C minimum is their floor, so ngspice's
    # current at each such temperature bounds the real one, and the model's figure must be the
    # highest of them: the lowest ambient, -10 °C, where the switches are least resistive.
    m = _model(tmp_path, *RIDGE)
    by_temperature = {t: _stack_short_by_ngspice(t) for t in (-10.0, 0.0, 10.0, 25.0)}
    assert max(by_temperature, key=by_temperature.get) == -10.0
    assert m.prospective_short_circuit == pytest.approx(by_temperature[-10.0], rel=1e-4)
    # the charge switches' body diodes stay below their knee (860 A × 0.74 mΩ ≈ 0.64 V)
    assert not m.short_onset.solution.conducting_diodes


def test_a_cell_driven_multicell_gate_drive_is_the_stack(tmp_path):
    # gate_drive: cell on a 4-cell protector swings its outputs over the whole stack [derived].
    m = _model(tmp_path, *RIDGE, lib_replace=(
        ("    gate_drive: 12 V                   # clamped gate driver, 12 V below the source when on",
         "    gate_drive: cell"),))
    assert (m.gate_drive.min, m.gate_drive.max) == pytest.approx((4 * 2.65, 4 * 4.30))
    assert m.gate_drive_problems == ()  # p-channel on the positive rail: the drive reaches


HIGH_SIDE_N = (
    ("    channel: p\n", "    channel: n\n"),
    ("    vgs_th: {min: -2.5 V, max: -1.0 V}", "    vgs_th: {min: 1.0 V, max: 2.5 V}"),
)


def test_high_side_n_channel_needs_a_driver(tmp_path):
    # An n-channel FET on the positive rail needs its gate above the stack: with gate_drive: cell
    # the protector cannot turn it on, and switch-voltage-margin says so for every channel.
    result = _run(tmp_path, *RIDGE, lib_replace=HIGH_SIDE_N + (
        ("    gate_drive: 12 V                   # clamped gate driver, 12 V below the source when on",
         "    gate_drive: cell"),))
    problems = result.model.gate_drive_problems
    assert sorted(ch.name for ch, _ in problems) == ["Q1", "Q2", "Q3", "Q4"]
    drive = [f for f in result.findings if f.rule == "switch-voltage-margin" and f.key.startswith("drive-")]
    assert len(drive) == 4 and "positive rail" in drive[0].message


def test_high_side_n_channel_with_a_fixed_driver_is_fine(tmp_path):
    # n-channel body diodes point the other way: the pair's drains must then meet at the
    # sources' far side, so swap d and s to keep the switches back to back.
    result = _run(tmp_path, *RIDGE, lib_replace=HIGH_SIDE_N, replace=(
        ("Q1: {part: RL-PFET-30, pins: {s: BF, g: DG, d: MID}}", "Q1: {part: RL-PFET-30, pins: {d: BF, g: DG, s: MID}}"),
        ("Q2: {part: RL-PFET-30, pins: {s: BF, g: DG, d: MID}}", "Q2: {part: RL-PFET-30, pins: {d: BF, g: DG, s: MID}}"),
        ("Q3: {part: RL-PFET-30, pins: {s: P+, g: CG, d: MID}}", "Q3: {part: RL-PFET-30, pins: {d: P+, g: CG, s: MID}}"),
        ("Q4: {part: RL-PFET-30, pins: {s: P+, g: CG, d: MID}}", "Q4: {part: RL-PFET-30, pins: {d: P+, g: CG, s: MID}}"),
    ))
    m = result.model
    assert m.gate_drive_problems == ()
    assert m.conducts(off="discharge", direction="discharge") is None
    assert m.conducts(off="discharge", direction="charge") is not None
    assert not [f for f in result.findings
                if f.rule in ("switch-orientation", "switch-voltage-margin")]


def test_cell_inputs_through_filter_resistors_reach_their_taps(tmp_path):
    m = _model(tmp_path, *RIDGE, replace=(("      cell2: B2\n", "      cell2: VC2\n"),),
               extra="  R50: {kind: resistor, value: 1 kΩ, pins: [B2, VC2]}\n"
                     "  C50: {kind: capacitor, value: 100 nF, voltage: 25 V, pins: [VC2, B1]}\n")
    taps = {pin: (net, reached, want) for pin, net, reached, want in m.cell_taps}
    assert taps["cell2"] == ("VC2", 2, 2)
    assert all(reached == want for _, reached, want in taps.values())


def test_the_core_rules_are_clean_on_the_4s2p_example(tmp_path):
    result = _run(tmp_path, *RIDGE)
    assert [f"{f.rule}: {f.message}" for f in result.findings] == []
