"""Shelf life in storage: the charge above the cut-off against the drains the netlist implies."""

from pathlib import Path

import pytest

from packwarden.engine import lint
from tests.model.linted import linted_model
from packwarden.model import ocv
from packwarden.model.storage import DEFAULT_SELF_DISCHARGE
from packwarden.testing import lint_variant

REPO = Path(__file__).resolve().parents[2]

LIB = """\
format: packwarden-parts/1
parts:
  S-CELL:
    kind: cell
    chemistry: nmc
    capacity: 1000 mAh
    voltage: {charge: 4.2 V, upper_limit: 4.25 V, overcharge_limit: 4.35 V, nominal: 3.6 V,
              cutoff: 2.5 V, lower_limit: 2.0 V}
    internal_resistance: {typ: 50 mΩ, max: 70 mΩ}
    max_current: {discharge: 5 A, charge: 1 A}
{sd}    ocv:
      - {soc: 0 %, voltage: {empty}}
      - {soc: 10 %, voltage: 3.30 V}
      - {soc: 44 %, voltage: 3.70 V}
      - {soc: 100 %, voltage: 4.20 V}
  S-GUARD:
    kind: protector
    overcharge: {detect: {typ: 4.30 V, tol: 25 mV}, release: {typ: 4.10 V, tol: 50 mV}, delay: 1.2 s}
    overdischarge: {detect: {typ: 2.45 V, tol: 50 mV}, release: {typ: 3.0 V, tol: 100 mV}, delay: 150 ms}
    overcurrent: {detect: {typ: 150 mV, tol: 15 mV}, delay: {min: 5 ms, max: 15 ms}}
    supply_current: {operating: {typ: 2 uA, max: 3 uA}, power_down: {max: 0.1 uA}}
  S-PAIR:
    kind: fet_pair_common_drain
    channel: n
    vds_max: 20 V
    vgs_max: 12 V
    vgs_th: {max: 1.0 V}
    rds_on: [{vgs: 2.5 V, typ: 25 mΩ, max: 30 mΩ}, {vgs: 4.5 V, typ: 20 mΩ, max: 25 mΩ}]
    rds_on_hot_ratio: {at: 125 °C, ratio: 1.5}
    id_max: 10 A
    theta_ja: 83 K/W
{idss}"""

DESIGN = """\
format: packwarden/1
design: {name: storage test}
libraries: [lib.yaml]
pack: {ambient: {min: 0 °C, max: 40 °C}}
load: {continuous: 0.5 A}
storage: {soc: {soc}, duration: 12 months, temperature: {temp}}
components:
  BT1: {part: S-CELL, pins: {pos: B+, neg: B-}}
  U1: {part: S-GUARD, pins: {supply: VDD, ground: B-, sense: VM, discharge_gate: DG, charge_gate: CG}}
  R1: {kind: resistor, value: 470 Ω, pins: [B+, VDD]}
  R2: {kind: resistor, value: 2 kΩ, pins: [VM, P-]}
  Q1: {part: S-PAIR, pins: {s1: B-, g1: DG, d: MID, s2: P-, g2: CG}}
  F1: {kind: fuse, rated_current: 5 A, rated_voltage: 32 V, breaking_capacity: 1000 A, pins: [B+, P+]}
{extra}"""


def _fill(template: str, **values: str) -> str:
    for key, value in values.items():
        template = template.replace("{" + key + "}", value)
    return template


def model(tmp_path, *, extra="", sd="2 %/month", soc="44 %", temp="25 °C", idss="",
          empty="2.50 V", storage=""):
    (tmp_path / "packwarden.toml").write_text("")
    sd_line = f"    self_discharge: {sd}\n" if sd else ""
    (tmp_path / "lib.yaml").write_text(_fill(LIB, sd=sd_line, idss=idss, empty=empty),
                                       encoding="utf-8")
    path = tmp_path / "d.yaml"
    path.write_text(_fill(DESIGN, extra=extra, soc=soc, temp=temp + storage), encoding="utf-8")
    return linted_model(path)


# Self-discharge is a share of the charge left, r per month, beside constant drains I: dQ/dt =
# -r·Q - I, so Q(t) + I/r = (Q0 + I/r)·e^(-r·t), and a cell falls from Q0 to Qe in
# t = ln((Q0 + I/r) / (Qe + I/r)) / r months [derived: first-order linear ODE, docs/references.md
# "Storage and self-discharge", which gives 1-2 %/month [practice] and the vector below].


def test_shelf_life_worked_vector_through_the_design(tmp_path):
    # docs/references.md "Storage and self-discharge" vector [derived]: a 1000 mAh cell at 44 %
    # losing 2 % of the charge left per month plus a 3 µA drain (2.19 mAh/month): I/r = 109.5 mAh,
    # ln(549.5 / 109.5) / 0.02 = ln(5.0183) / 0.02 = 80.7 months to empty. Here the 3 µA is the
    # protector's maximum supply current, the cell's table puts 44 % at 3.70 V and empty (0 %) at
    # the 2.50 V over-discharge detection maximum, and nothing else drains.
    b = model(tmp_path).storage_budget
    first = b.to_cutoff
    assert (first.start_soc, first.end_soc) == pytest.approx((0.44, 0.0))
    assert first.drain_current == pytest.approx(3e-6)
    assert first.drain_current * ocv.HOURS_PER_MONTH == pytest.approx(2.19e-3, rel=1e-3)
    assert first.months == pytest.approx(80.65, abs=0.01)
    # At the start the cell loses 2 % of 440 mAh, 8.8 mAh, a month to self-discharge.
    assert first.self_discharge_ah_per_month == pytest.approx(8.8e-3)


def test_the_vector_by_stepping_a_day_at_a_time(tmp_path):
    # The same cell stepped a day at a time, losing 2 %/month of what it holds and 3 µA × 24 h
    # [derived: explicit Euler, independent of the closed form]: empty after about 80.7 months.
    q, days = 0.440, 0
    per_day = 0.02 / (730 / 24)
    while q > 0:
        q -= q * per_day + 3e-6 * 24
        days += 1
    b = model(tmp_path).storage_budget
    assert b.to_cutoff.months == pytest.approx(days * 24 / 730, abs=0.05)


def test_shelf_life_vector_drain_alone(tmp_path):
    # Same vector [derived]: the 3 µA drain alone empties the cell in about 201 months.
    b = model(tmp_path, sd="0 %/month").storage_budget
    assert b.to_cutoff.months == pytest.approx(201, abs=0.5)


def test_self_discharge_doubles_per_10_degrees(tmp_path):
    # [practice] docs/references.md: self-discharge roughly doubles per 10 °C; 2 %/month at 25 °C is
    # 4 %/month at 35 °C: I/r = 2.19 / 0.04 = 54.75 mAh, ln(494.75 / 54.75) / 0.04 = 55.0 months.
    b = model(tmp_path, temp="35 °C").storage_budget
    assert b.self_discharge_pct == pytest.approx(4.0)
    assert b.to_cutoff.months == pytest.approx(55.03, abs=0.01)


def test_default_self_discharge_is_named_as_an_assumption(tmp_path):
    # Without a data-sheet figure the default, 2 %/month (the upper end of docs/references.md's
    # 1-2 %/month [practice]), is used and said; the vector's 80.7 months follow again.
    b = model(tmp_path, sd="").storage_budget
    assert DEFAULT_SELF_DISCHARGE == 2.0
    assert b.self_discharge_pct == pytest.approx(2.0)
    assert any("no cell self_discharge" in a for a in b.assumptions)
    assert b.to_cutoff.months == pytest.approx(80.65, abs=0.01)


def test_an_almost_empty_cell_loses_almost_nothing_to_self_discharge(tmp_path):
    # With empty (0 %) at 2.00 V on the cell's table, the 2.50 V cut-off sits on the line to the
    # 10 % row at 3.30 V: 10 % × 0.50 / 1.30 = 3.846 %, 38.46 mAh. After the cut-off only the
    # 0.1 µA power-down current drains beside self-discharge: I/r = 0.073 mAh / 0.02 = 3.65 mAh,
    # ln((38.46 + 3.65) / 3.65) / 0.02 = 122 months to the 2.0 V lower limit. Self-discharge as a
    # share of rated capacity (20 mAh a month) would have emptied it in under 2 months.
    b = model(tmp_path, empty="2.00 V").storage_budget
    after = b.to_lower_limit
    assert after.start_soc == pytest.approx(0.03846, abs=1e-5)
    assert after.months == pytest.approx(122.3, abs=0.1)


def test_a_divider_across_the_cell_drains_v_over_r(tmp_path):
    # Ohm's law [published: definition]: a 1 MΩ + 100 kΩ divider across the cell at the 3.70 V of
    # 44 % draws 3.70 V / 1.1 MΩ = 3.36 µA, found by the nodal solve of the netlist.
    m = model(tmp_path, extra="  R5: {kind: resistor, value: 1 MΩ, pins: [B+, MON]}\n"
                               "  R6: {kind: resistor, value: 100 kΩ, pins: [MON, B-]}\n")
    first = m.storage_budget.to_cutoff
    [path] = [d for d in first.drains if d.what == "resistive paths"]
    assert path.current == pytest.approx(3.70 / 1.1e6, rel=1e-6)
    assert set(path.elements) == {"R5", "R6"}
    # 3 µA + 3.36 µA is 4.645 mAh/month, I/r = 232.3 mAh: ln(672.3 / 232.3) / 0.02 = 53.1 months
    # [derived: the closed form above]
    assert first.months == pytest.approx(53.14, abs=0.01)


def test_a_load_behind_the_discharge_switch_stops_at_the_cut_off(tmp_path):
    # A 100 kΩ bleeder across the pack terminals drains through the switches while they are on
    # (3.70 V / 100 kΩ = 37 µA, the on channels' milliohms are nothing beside it), and not at all
    # once the discharge switch is off after the cut-off [derived: no path].
    m = model(tmp_path, empty="2.00 V",
              extra="  R7: {kind: resistor, value: 100 kΩ, pins: [P+, P-]}\n")
    b = m.storage_budget
    [before] = [d for d in b.to_cutoff.drains if d.what == "resistive paths"]
    assert before.current == pytest.approx(3.70 / 100e3, rel=1e-4)
    assert b.to_lower_limit is not None
    assert not [d for d in b.to_lower_limit.drains if d.what == "resistive paths"]
    # after the cut-off: power-down current 0.1 µA [the part's own figure]
    assert b.to_lower_limit.drain_current == pytest.approx(0.1e-6)


def test_a_lit_led_counts_at_its_declared_current(tmp_path):
    # An LED the cell can light (anode at B+, through a resistor to B-) counts at the 1 mA the
    # design declares for it, not at what a piecewise-linear diode gives.
    m = model(tmp_path, extra="  D1: {kind: diode, led: true, forward_voltage: 2.0 V, current: 1 mA, "
                               "pins: {anode: B+, cathode: K}}\n"
                               "  R8: {kind: resistor, value: 2.2 kΩ, pins: [K, B-]}\n")
    first = m.storage_budget.to_cutoff
    [led] = [d for d in first.drains if d.what == "LED"]
    assert led.current == pytest.approx(1e-3, rel=1e-6)
    assert not [d for d in first.drains if d.what == "resistive paths"]


def test_an_led_behind_an_open_switch_is_not_lit(tmp_path):
    # The cathode goes to a net the netlist drives from nowhere (a product's switch): no path.
    m = model(tmp_path, extra="  D1: {kind: diode, led: true, current: 1 mA, "
                               "pins: {anode: B+, cathode: LED_EN}}\n")
    assert not [d for d in m.storage_budget.to_cutoff.drains if d.what == "LED"]


def test_fet_leakage_counts_only_once_the_discharge_switch_is_off(tmp_path):
    # Before the cut-off the switch is on and leaks nothing; after it the off channel (Q1.1)
    # passes its 1 µA leakage, beside the 0.1 µA power-down current.
    m = model(tmp_path, idss="    idss: 1 uA\n", empty="2.00 V")
    b = m.storage_budget
    assert not [d for d in b.to_cutoff.drains if d.what == "FET leakage"]
    [leak] = [d for d in b.to_lower_limit.drains if d.what == "FET leakage"]
    assert leak.current == pytest.approx(1e-6)
    assert b.to_lower_limit.drain_current == pytest.approx(1.1e-6)


def test_the_products_standby_current_drains_until_the_cut_off(tmp_path):
    # A 50 µA standby current beside the protector's 3 µA: 38.69 mAh/month, I/r = 1.9345 Ah
    # [derived: the closed form above]. After the cut-off the product draws through the off
    # switch, no more than its 1 µA leakage.
    m = model(tmp_path, idss="    idss: 1 uA\n", empty="2.00 V",
              storage=", standby_current: 50 uA")
    b = m.storage_budget
    [standby] = [d for d in b.to_cutoff.drains if d.what == "product standby"]
    assert standby.current == pytest.approx(50e-6)
    # From 440 mAh to the 2.50 V cut-off at 38.46 mAh (see above):
    # ln((0.440 + 1.9345) / (0.03846 + 1.9345)) / 0.02 = ln(1.2035) / 0.02 = 9.26 months.
    assert b.to_cutoff.months == pytest.approx(9.26, abs=0.01)
    assert b.to_lower_limit.drain_current == pytest.approx(1.1e-6)
    # A ship mode that disconnects: 0 A standby stops the leakage path too.
    m = model(tmp_path, idss="    idss: 1 uA\n", empty="2.00 V", storage=", standby_current: 0 A")
    assert m.storage_budget.to_lower_limit.drain_current == pytest.approx(0.1e-6)


def _example_copy(tmp_path, name: str, library: str, extra: str = "", storage: str = ""):
    """The model of an example design copied into ``tmp_path`` with its library, plus lines."""
    run = lint_variant(tmp_path, REPO / "example_designs" / name,
                       REPO / "example_designs/parts" / library, prefix=storage, extra=extra)
    assert not run.input_errors(), [str(e) for e in run.input_errors()]
    (result,) = run.designs
    assert not result.internal, result.internal
    return result.model


def test_the_nmc_dataset_sets_the_cut_off_charge(tmp_path):
    # [published: open NMC dataset, docs/references.md] 0.2 % at 2.535 V and 1.0 % at 2.760 V; the
    # orchard probe's 2.55 V over-discharge detection maximum sits at
    # 0.2 + 0.8 × (2.55 − 2.535) / (2.760 − 2.535) = 0.2533 % [derived: linear interpolation].
    m = _example_copy(tmp_path, "orchard-probe.yaml", "orchard-parts.yaml")  # ships at 40 %
    b = m.storage_budget
    assert b.to_cutoff.end_soc * 100 == pytest.approx(0.2 + 0.8 * 0.015 / 0.225, rel=1e-6)
    assert "nmc table" in " ".join(b.assumptions)


def test_each_level_of_a_stack_is_drained_on_its_own(tmp_path):
    # The 4S2P example with a 100 kΩ bleeder from tap B1 to B-: only the bottom level feeds it,
    # 3.60 V (30 % on the cell's own table) / 100 kΩ = 36 µA [published: Ohm's law], and the
    # bottom level is the one that reaches the cut-off first.
    from packwarden.model.storage import level_drains
    m = _example_copy(tmp_path, "ridgeline-tool-4s2p.yaml", "ridgeline-parts.yaml",
                      extra="  R40: {kind: resistor, value: 100 kΩ, pins: [B1, B-]}\n")
    b = m.storage_budget
    per_level = level_drains(m, 3.60)
    assert b.to_cutoff.level == 1
    bottom = sum(d.current for d in per_level[1])
    top = sum(d.current for d in per_level[4])
    assert bottom - top == pytest.approx(3.60 / 100e3, rel=1e-4)
    # the divider R21/R22 across the whole stack drains every level alike: 14.4 V / 1.15 MΩ
    assert top == pytest.approx(4 * 3.60 / 1.15e6, rel=1e-4)


def test_an_ocv_table_that_cannot_be_inverted_is_a_finding_not_a_crash(tmp_path):
    # 0 % at 3.40 V above 10 % at 3.30 V: no state of charge can be read off such a table.
    (tmp_path / "packwarden.toml").write_text("")
    (tmp_path / "lib.yaml").write_text(_fill(LIB, sd="", idss="", empty="3.40 V"), encoding="utf-8")
    path = tmp_path / "d.yaml"
    path.write_text(_fill(DESIGN, extra="", soc="44 %", temp="25 °C"), encoding="utf-8")
    run = lint([str(path)])
    (result,) = run.designs
    assert not result.internal
    [f] = [f for f in result.findings if f.rule == "storage-drain"]
    assert "the ocv table of BT1 cannot be used: voltage must rise strictly" in f.message
    assert f.location.path == ("components", "BT1", "part")


def test_the_storage_event_carries_the_budget(tmp_path):
    # The storage event (docs/rules-api.md "Events"): its current is the drain before the cut-off,
    # its duration the storage time (12 months of 730 h), its figures the months of each phase.
    # Here 3 µA (the protector's supply) drain before the cut-off, and after it the 0.1 µA
    # power-down current and the 1 µA leakage of the off switch.
    m = model(tmp_path, idss="    idss: 1 uA\n", empty="2.00 V")
    event = m.event("storage")
    b = m.storage_budget
    assert event.current == pytest.approx(3e-6)
    assert event.duration == pytest.approx(12 * 730 * 3600)
    assert event.figures["months to cut-off"] == b.to_cutoff.months
    assert event.figures["months from cut-off to lower limit"] == b.to_lower_limit.months
    assert event.figures["drain after cut-off"] == pytest.approx(1.1e-6)
    assert event.element_current == {"U1": pytest.approx(3e-6)}
