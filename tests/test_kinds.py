"""Each component kind is declared once (linter/kinds.py) beside its part model (schema.py)."""

import pytest

from packwarden.kinds import KINDS, SERIES_KINDS
from packwarden.schema import PART_KINDS


def test_every_part_model_has_its_kind_and_every_kind_its_model():
    assert set(KINDS) == set(PART_KINDS)


def test_every_pin_is_described():
    for kind in KINDS.values():
        assert kind.required_pins, kind.name
        assert all(text.strip() for text in kind.pins.values()), kind.name


def test_a_trace_enters_the_path_with_its_copper_resistance():
    # IEC 60028 annealed copper, 1/58 Ω·mm²/m at 20 °C [published]: 35 µm × 2 mm × 50 mm
    # → 0.05 / (58 × 0.07) = 12.3 mΩ [derived, docs/references.md "Copper resistance"].
    trace = PART_KINDS["trace"].model_validate(
        {"kind": "trace", "width": "2 mm", "thickness": "35 um", "length": "50 mm",
         "layer": "outer"})
    assert KINDS["trace"].resistance(trace, 20.0, "typ") == pytest.approx(0.0123, rel=2e-3)


def test_a_resistor_enters_the_path_at_the_corners_of_its_tolerance():
    shunt = PART_KINDS["resistor"].model_validate(
        {"kind": "resistor", "value": "1.5 mΩ", "tol": "1 %", "power": "5 W"})
    r = KINDS["resistor"].resistance
    assert (r(shunt, 25.0, "min"), r(shunt, 25.0, "typ"), r(shunt, 25.0, "max")) == pytest.approx(
        (1.485e-3, 1.5e-3, 1.515e-3), rel=1e-12)


def test_the_series_kinds_are_those_with_a_resistance():
    assert SERIES_KINDS == ("fuse", "ptc", "resistor", "trace", "wire", "heater_fuse", "thermal_fuse")
