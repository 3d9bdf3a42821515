"""The thermistor model against outside sources.

- The beta form's vectors: docs/references.md, "Temperature sensing and balancing" (10 kΩ,
  B 3435 K → 28.70 kΩ at 0 °C, 4.847 kΩ at 45 °C, 2.981 kΩ at 60 °C, 46.29 kΩ at −10 °C
  [published form, derived vectors]).
- The divider at every tolerance corner: an ngspice operating point, the thermistor written as
  ngspice's own expression of the beta form, biased from a 1 V reference.
- The inverse (a threshold to a temperature): bisection on the forward form written here, not
  the model's closed-form inverse.
"""

from __future__ import annotations

import itertools
import math
from pathlib import Path

import pytest

from packwarden.model import thermistor
from packwarden.model.values import Span

from tests.model.linted import linted_model
from tests.model.spice import run_op

REPO = Path(__file__).resolve().parents[2]
ORCHARD = REPO / "example_designs" / "orchard-probe.yaml"
DRILL = REPO / "example_designs" / "bramblewood-drill-4s1p-lfp.yaml"

# docs/references.md, "Temperature sensing and balancing": (°C, ohms), printed to 4 digits
VECTORS = [(0.0, 28.70e3), (45.0, 4.847e3), (60.0, 2.981e3), (-10.0, 46.29e3)]


def _beta(r25: float, b: float, celsius: float) -> float:
    """The makers' beta form, written out here as the reference gives it."""
    return r25 * math.exp(b * (1 / (celsius + 273.15) - 1 / 298.15))


def _bisect_temperature(r25: float, b: float, r_bias: float, share: float) -> float:
    """The temperature at which the divider reads ``share``, by bisection on the forward form:
    the share falls as the thermistor warms, so one crossing lies in -100..200 °C."""
    lo, hi = -100.0, 200.0
    for _ in range(200):
        mid = (lo + hi) / 2
        r = _beta(r25, b, mid)
        if r / (r + r_bias) > share:
            lo = mid
        else:
            hi = mid
    return (lo + hi) / 2


@pytest.mark.parametrize("celsius, ohms", VECTORS)
def test_resistance_matches_the_reference_vectors(celsius: float, ohms: float) -> None:
    # four printed digits: within half a unit of the last one
    assert thermistor.resistance(10e3, 3435.0, celsius) == pytest.approx(ohms, rel=2e-4)


@pytest.mark.parametrize("celsius, ohms", VECTORS)
def test_temperature_of_a_vector_resistance_is_its_temperature(celsius, ohms) -> None:
    # the printed resistance carries a rounding of up to 1e-4, some 0.01 K at these slopes
    assert thermistor.temperature_at(10e3, 3435.0, ohms) == pytest.approx(celsius, abs=0.02)


@pytest.mark.parametrize("share", [0.86, 0.715, 0.355, 0.255, 0.10])
def test_trip_temperature_agrees_with_bisection_on_the_forward_form(share: float) -> None:
    for r25, b, bias in itertools.product((9.9e3, 10.1e3), (3400.0, 3470.0), (9.9e3, 10.1e3)):
        assert thermistor.trip_temperature(r25, b, bias, share) == pytest.approx(
            _bisect_temperature(r25, b, bias, share), abs=1e-6)


def _corners(r25: Span, b: Span, bias: Span, share: Span):
    return list(itertools.product((r25.min, r25.max), (b.min, b.max), (bias.min, bias.max),
                                  (share.min, share.max)))


def test_the_divider_at_every_corner_agrees_with_ngspice() -> None:
    # The example libraries' input: 10 kΩ ±1 %, B 3435 K ±1 %, bias 10 kΩ ±1 %, the charge-
    # inhibit cold threshold 71-72 % of the reference. At each corner the model's trip
    # temperature, put into ngspice's beta-form resistor, must bring the pin to the threshold.
    r25, b, bias = Span(9.9e3, 10e3, 10.1e3), Span(3400.65, 3435.0, 3469.35), Span(9.9e3, 10e3, 10.1e3)
    share = Span(0.71, 0.715, 0.72)
    corners = _corners(r25, b, bias, share)
    lines = ["* NTC dividers, one per tolerance corner", "V1 ref 0 1"]
    for i, (r, beta, rb, _s) in enumerate(corners):
        t = thermistor.trip_temperature(r, beta, rb, _s)
        lines += [f"RB{i} ref p{i} {rb!r}",
                  f"RT{i} p{i} 0 r={{{r!r}*exp({beta!r}*(1/({t!r}+273.15)-1/298.15))}}"]
    lines += [".control", "set numdgt=12", "op", *(f"print v(p{i})" for i in range(len(corners))),
              "quit 0", ".endc", ".end", ""]
    values = run_op("\n".join(lines))
    for i, (*_, s) in enumerate(corners):
        assert values[f"p{i}"] == pytest.approx(s, abs=1e-9), corners[i]


def test_the_span_is_bounded_by_its_corners_and_holds_every_interior_point() -> None:
    r25, b, bias = Span(9.5e3, 10e3, 10.5e3), Span(3332.0, 3435.0, 3538.0), Span(9.8e3, 10e3, 10.2e3)
    share = Span(0.25, 0.255, 0.26)
    span = thermistor.trip_span(r25, b, bias, share)
    by_bisection = [_bisect_temperature(*c) for c in _corners(r25, b, bias, share)]
    assert span.min == pytest.approx(min(by_bisection), abs=1e-6)
    assert span.max == pytest.approx(max(by_bisection), abs=1e-6)
    assert span.typ == pytest.approx(_bisect_temperature(10e3, 3435.0, 10e3, 0.255), abs=1e-6)
    # a grid through the spreads' interiors stays inside (each variable acts monotonically)
    grid = itertools.product(*[[s.min + (s.max - s.min) * k / 4 for k in range(5)]
                               for s in (r25, b, bias, share)])
    for point in grid:
        assert span.min - 1e-9 <= thermistor.trip_temperature(*point) <= span.max + 1e-9


def test_the_reference_tolerances_stack_to_several_kelvin_at_zero() -> None:
    # [practice] docs/references.md: R25 ±1-5 %, B ±1-3 %, the divider resistor and the
    # threshold stack to several kelvin at 0 °C; at the loose end of those tolerances:
    share0 = 28.70e3 / (28.70e3 + 10e3)
    span = thermistor.trip_span(Span(9.5e3, 10e3, 10.5e3), Span(3332.0, 3435.0, 3538.0),
                                Span(9.9e3, 10e3, 10.1e3), Span(share0 - 0.005, share0, share0 + 0.005))
    assert span.typ == pytest.approx(0.0, abs=0.02)
    assert 2.0 < span.max - span.typ < 6.0 and 2.0 < span.typ - span.min < 6.0


def test_the_examples_cut_off_temperatures_come_from_their_libraries() -> None:
    # Orchard probe: the charger's input (bias 10 kΩ ±1 %, cold 71-72 %, hot 35-36 %) on
    # OR-NTC-10K (10 kΩ ±1 %, B 3435 K ±1 %); checked by bisection at every corner.
    figures = linted_model(ORCHARD).figures()
    r25, b, bias = Span(9.9e3, 10e3, 10.1e3), Span(3400.65, 3435.0, 3469.35), Span(9.9e3, 10e3, 10.1e3)
    for name, share in (("charge_cold_cutoff", Span(0.71, 0.715, 0.72)),
                        ("charge_hot_cutoff", Span(0.35, 0.355, 0.36))):
        temps = [_bisect_temperature(*c) for c in _corners(r25, b, bias, share)]
        assert figures[f"{name}_min"].value == pytest.approx(min(temps), abs=1e-6)
        assert figures[f"{name}_max"].value == pytest.approx(max(temps), abs=1e-6)
    # inside the cell's 0-45 °C charge window at every corner, as the clean example must be
    assert figures["charge_cold_cutoff_min"].value >= 0.0
    assert figures["charge_hot_cutoff_max"].value <= 45.0
    assert "discharge_hot_cutoff_min" not in figures  # the charger guards charging only


def test_the_drill_packs_protector_input_gives_all_four_cut_offs() -> None:
    figures = linted_model(DRILL).figures()
    for name, share in (("discharge_hot_cutoff", Span(0.25, 0.255, 0.26)),
                        ("discharge_cold_cutoff", Span(0.855, 0.86, 0.865))):
        temps = [_bisect_temperature(*c) for c in _corners(
            Span(9.9e3, 10e3, 10.1e3), Span(3400.65, 3435.0, 3469.35), Span(9.9e3, 10e3, 10.1e3),
            share)]
        assert figures[f"{name}_min"].value == pytest.approx(min(temps), abs=1e-6)
        assert figures[f"{name}_max"].value == pytest.approx(max(temps), abs=1e-6)
    # within the LiFePO4 cell's -20..60 °C discharge window [practice] at every corner
    assert figures["discharge_cold_cutoff_min"].value >= -20.0
    assert figures["discharge_hot_cutoff_max"].value <= 60.0
