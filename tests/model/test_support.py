"""The protector's support network: supply filter, sense-pin resistor, capacitor and resistor stress."""

from pathlib import Path

import pytest

from packwarden.model.support import DEFAULT_SENSE_R, DEFAULT_SUPPLY_C, DEFAULT_SUPPLY_R
from packwarden.testing import lint_variant

REPO = Path(__file__).resolve().parents[2]


def _copy(tmp_path, name: str, library: str, replace: tuple[tuple[str, str], ...] = (),
          extra: str = "", lib_replace: tuple[tuple[str, str], ...] = ()):
    """Lint a copy of an example design (and its library) made in ``tmp_path``."""
    return lint_variant(tmp_path, REPO / "example_designs" / name,
                        REPO / "example_designs/parts" / library,
                        replace=replace, lib_replace=lib_replace, extra=extra)


def _model(tmp_path, *args, **kwargs):
    run = _copy(tmp_path, *args, **kwargs)
    assert not run.input_errors(), [str(e) for e in run.input_errors()]
    (result,) = run.designs
    assert not result.internal, result.internal
    return result.model


ORCHARD = ("orchard-probe.yaml", "orchard-parts.yaml")
RIDGE = ("ridgeline-tool-4s2p.yaml", "ridgeline-parts.yaml")


def test_documented_default_ranges():
    # [practice] docs/references.md "Single-cell protector": supply filter R 300 Ω–1 kΩ, C 0.022–1 µF;
    # sense-pin resistor 300 Ω–4 kΩ.
    assert DEFAULT_SUPPLY_R == (300.0, 1000.0)
    assert DEFAULT_SUPPLY_C == pytest.approx((22e-9, 1e-6))
    assert DEFAULT_SENSE_R == (300.0, 4000.0)


def test_supply_filter_shift_is_current_times_resistance(tmp_path):
    # Ohm's law [published: definition]: the orchard probe's 6 µA maximum supply current through
    # its 470 Ω ±1 % filter resistor at the top of its tolerance drops 6 µA × 474.7 Ω = 2.848 mV
    # (docs/references.md [practice]: "supply current × R shifts the detection point").
    f = _model(tmp_path, *ORCHARD).supply_filter
    assert (f.resistor.refdes, f.capacitor.refdes) == ("R1", "C1")
    assert f.resistance == pytest.approx(474.7)
    assert f.shift == pytest.approx(6e-6 * 474.7)
    assert f.capacitance == pytest.approx(100e-9)


def test_a_multi_cell_protector_measures_at_its_cell_pins_so_no_shift(tmp_path):
    f = _model(tmp_path, *RIDGE).supply_filter
    assert f.resistor.refdes == "R1" and f.capacitor.refdes == "C1"
    assert f.shift is None


def test_sense_resistor_with_a_reversed_charger(tmp_path):
    # docs/references.md [practice]: reversed, the charger's open-circuit voltage adds to the stack;
    # 5.5 V + 4.325 V (overcharge detection max) = 9.825 V across 2 kΩ −1 % = 1980 Ω gives
    # 4.96 mA and 48.8 mW [derived: Ohm's law, P = V²/R].
    s = _model(tmp_path, *ORCHARD).sense_resistor
    assert s.resistor.refdes == "R2" and s.terminal == "P-"
    assert s.voltage == pytest.approx(9.825)
    assert s.current == pytest.approx(9.825 / 1980)
    assert s.power == pytest.approx(9.825 ** 2 / 1980)


def test_no_reversed_charger_no_sense_resistor_load(tmp_path):
    # The 4S2P pack's keyed connector: reverse_polarity prevented.
    s = _model(tmp_path, *RIDGE).sense_resistor
    assert s.resistor.refdes == "R2"
    assert s.voltage is None and s.power is None


def test_capacitor_voltages_in_the_named_cases(tmp_path):
    # Derived from the stack and charger figures: the supply capacitor sees the stack at four
    # times the 4.30 V overcharge detection maximum; the terminal capacitor sees the charger's
    # 18.5 V open-circuit voltage while the charge switches block.
    stress = {s.component.refdes: s for s in _model(tmp_path, *RIDGE).capacitor_stress}
    assert stress["C1"].value == pytest.approx(4 * 4.30, rel=1e-6)
    assert "overcharge detection maximum" in stress["C1"].case
    assert stress["C2"].value == pytest.approx(18.5, rel=1e-6)
    assert "open-circuit" in stress["C2"].case


def test_a_reversed_charger_puts_charger_plus_stack_across_the_discharge_side(tmp_path):
    # A capacitor across the discharge pair's drain-source (BF to MID) with a charger reversed,
    # the discharge switches off and the charge switches on holds the charger's 18.5 V plus the
    # stack's 4 × 4.30 V (docs/references.md [practice]: reversed, the two add) [derived].
    m = _model(tmp_path, *RIDGE,
               replace=(("reverse_polarity: prevented", "reverse_polarity: possible"),),
               extra="  C9: {kind: capacitor, value: 10 nF, voltage: 50 V, pins: [BF, MID]}\n")
    stress = {s.component.refdes: s for s in m.capacitor_stress}
    assert stress["C9"].value == pytest.approx(18.5 + 17.2, abs=1e-3)
    assert "reversed" in stress["C9"].case


def test_bleed_resistor_power_when_balancing(tmp_path):
    # P = V²/R [published: definition]: each 100 Ω bleeder across one cell at the 4.30 V
    # overcharge detection maximum dissipates 4.30² / 100 = 185 mW, less the few millivolts the
    # bleed current drops in the cells.
    stress = {s.component.refdes: s for s in _model(tmp_path, *RIDGE).resistor_stress}
    for ref in ("R11", "R12", "R13", "R14"):
        assert stress[ref].value == pytest.approx(4.30 ** 2 / 100, rel=2e-3)
        assert "balancing" in stress[ref].case


def test_shunt_power_just_below_the_trip(tmp_path):
    # The shunt carries the whole pack current and sets it: just below the trip (55 mV over the
    # shunt) the current is V/R and the shunt dissipates V²/R at the one resistance it has
    # [published: Joule heating, P = V²/R], highest at its lowest, −1 %: 0.055² / 1.485 mΩ =
    # 2.04 W at 37.04 A. (Not 37.04 A at −1 % heating a shunt at +1 %: one part cannot be at both
    # ends of its tolerance.)
    m = _model(tmp_path, *RIDGE)
    stress = {s.component.refdes: s for s in m.resistor_stress}
    r_low = 0.0015 * 0.99
    assert m.event("permitted").current == pytest.approx(0.055 / r_low, rel=1e-6)
    assert stress["RSH"].value == pytest.approx(0.055 ** 2 / r_low, rel=1e-6)
    assert "permitted" in stress["RSH"].case
    # the divider is voltage-driven: its worst is the stack at overcharge detection, V²/R
    assert stress["R21"].value == pytest.approx((17.2 * 1e6 / 1.15e6) ** 2 / 1e6, rel=1e-4)


def test_supply_filter_is_a_typed_model(tmp_path):
    from packwarden.schema import Protector
    lib = (REPO / "example_designs/parts/ridgeline-parts.yaml").read_text()
    assert "supply_filter:" in lib
    f = _model(tmp_path, *RIDGE).protector.part.supply_filter
    assert (f.r.min, f.r.max) == (100.0, 1000.0)
    assert (f.c.min, f.c.max) == pytest.approx((0.1e-6, 4.7e-6))
    assert Protector.model_fields["supply_filter"].annotation is not dict


def test_a_supply_filter_range_out_of_order_is_an_input_error(tmp_path):
    # Bad input never produces a traceback: one file:line:column message, exit code 2.
    run = _copy(tmp_path, *RIDGE, lib_replace=(("r: {min: 100 Ω, max: 1 kΩ}",
                                                "r: {min: 1 kΩ, max: 100 Ω}"),))
    errors = [str(e) for e in run.input_errors()]
    assert errors and all("ridgeline-parts.yaml:" in e for e in errors)
    assert any("min is above max" in e for e in errors)
    assert run.exit_code() == 2


def test_a_supply_filter_with_a_unit_slip_is_an_input_error(tmp_path):
    run = _copy(tmp_path, *RIDGE, lib_replace=(("c: {min: 0.1 uF, max: 4.7 uF}",
                                                "c: {min: 0.1 uF, max: 4.7 uH}"),))
    errors = run.input_errors()
    assert errors and all(e.file.endswith("ridgeline-parts.yaml") and e.line > 1 for e in errors)
    assert any("supply_filter.c.max: '4.7 uH' is in henries; expected farads" in e.message
               for e in errors)
    assert run.exit_code() == 2
