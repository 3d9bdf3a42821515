"""What parts survive over time (docs/references.md): the short-time withstand of copper (IEC
60949's adiabatic form), cross-checked with Onderdonk's fusing equation worked here on its own
terms (circular mils, log10, 234 and 1083 °C); a PTC's hold current at the highest ambient."""

import math

import pytest

from packwarden.model import copper, fuse
from packwarden.model.limits import Limits

UM = 1e-6
MM = 1e-3
#: One circular mil is the area of a circle one mil across: π/4 mil² [published: definition].
CMIL = math.pi / 4 * (25.4e-6) ** 2
AREA = 0.3 * MM * 35 * UM  # the references' trace: 0.0105 mm²


def onderdonk(area_m2: float, seconds: float, ambient: float, melt: float = 1083.0) -> float:
    """Onderdonk's fusing current, I = A·√(log10((Tm − Ta)/(234 + Ta) + 1)/(33·t)), A in
    circular mils [published; from memory; docs/references.md]."""
    a = area_m2 / CMIL
    return a * math.sqrt(math.log10((melt - ambient) / (234.0 + ambient) + 1.0) / (33.0 * seconds))


def test_the_reference_trace_in_circular_mils():
    # docs/references.md [derived]: 0.3 mm × 35 µm is 0.0105 mm², 20.7 cmil.
    assert AREA * 1e6 == pytest.approx(0.0105)
    assert AREA / CMIL == pytest.approx(20.7, abs=0.05)


def test_melting_in_15_ms_iec60949_against_onderdonk():
    # docs/references.md [derived]: from 25 °C to melting in 15 ms, IEC 60949 form 24.7 A,
    # Onderdonk 24.8 A. The two equations are independent workings of the same adiabatic
    # heating; they must agree with the vector and with each other within 1 %.
    iec = copper.adiabatic_current(AREA, 15e-3, 25.0, copper.COPPER_MELTING)
    ond = onderdonk(AREA, 15e-3, 25.0)
    assert iec == pytest.approx(24.7, abs=0.05)
    assert ond == pytest.approx(24.8, abs=0.05)
    assert iec == pytest.approx(ond, rel=0.01)


def test_melting_in_540_us_onderdonk_130_a():
    # docs/references.md [derived]: in 540 µs, Onderdonk 130 A.
    assert onderdonk(AREA, 540e-6, 25.0) == pytest.approx(130.0, abs=0.5)
    assert copper.adiabatic_current(AREA, 540e-6, 25.0, copper.COPPER_MELTING) == pytest.approx(
        130.0, rel=0.01)


@pytest.mark.parametrize("seconds", [1e-4, 1e-3, 15e-3, 0.1, 1.0])
@pytest.mark.parametrize("ambient", [-20.0, 25.0, 85.0])
def test_agrees_with_onderdonk_over_durations_and_ambients(seconds, ambient):
    # Both are adiabatic: the agreement holds at any duration and starting temperature (the
    # constants differ in their third figure: 234 against 234.5, 226 against Onderdonk's 1/33).
    iec = copper.adiabatic_current(AREA, seconds, ambient, copper.COPPER_MELTING)
    assert iec == pytest.approx(onderdonk(AREA, seconds, ambient), rel=0.015)


def test_i2t_is_independent_of_duration_and_min_area_inverts_current():
    # I²t = K²S²ln(...) [published form]: the current scales as 1/√t.
    a = copper.adiabatic_current(AREA, 1e-3, 65.0, 160.0)
    b = copper.adiabatic_current(AREA, 4e-3, 65.0, 160.0)
    assert a == pytest.approx(2 * b)
    assert copper.adiabatic_min_area(a, 1e-3, 65.0, 160.0) == pytest.approx(AREA)


def test_limits_start_from_the_hottest_ambient_plus_the_allowed_rise():
    # From 55 °C + 10 K to 160 °C: ln(394.5/299.5) = 0.2755; 226 × 0.0105 × √(0.2755/0.015)
    # = 10.17 A [derived by hand from the IEC 60949 form above].
    lim = Limits()
    assert lim.conductor_start(55.0) == 65.0
    assert lim.conductor_withstand(AREA, 15e-3, 55.0) == pytest.approx(10.17, abs=0.01)


@pytest.mark.parametrize("call", [
    lambda: copper.adiabatic_i2t(0.0, 25.0, 160.0),
    lambda: copper.adiabatic_i2t(AREA, 160.0, 160.0),
    lambda: copper.adiabatic_i2t(AREA, -300.0, 160.0),
    lambda: copper.adiabatic_current(AREA, 0.0, 25.0, 160.0),
    lambda: copper.adiabatic_min_area(1.0, 1e-3, math.nan, 160.0),
])
def test_bad_inputs_raise(call):
    with pytest.raises(ValueError):
        call()


# --- a PTC's hold current at the highest ambient ------------------------------------------------

@pytest.mark.parametrize("ambient", [50.0, 60.0])
def test_ptc_default_derating_lies_in_the_practice_band(ambient):
    # docs/references.md [practice]: hold current falls to 70-80 % at 50-60 °C.
    share = fuse.ptc_hold_current(1.0, ambient).current
    assert 0.70 - 1e-9 <= share <= 0.80


def test_ptc_default_derating_is_none_at_or_below_25_c():
    assert fuse.ptc_hold_current(2.0, 25.0).current == 2.0
    assert fuse.ptc_hold_current(2.0, -20.0).current == 2.0


def test_ptc_table_is_read_in_straight_lines_between_points():
    # An invented maker's table (hold current against ambient): 25 °C 1.5 A (the rating),
    # 50 °C 1.2 A, 70 °C 0.9 A. By hand [derived]: at 60 °C halfway from 1.2 to 0.9 → 1.05 A;
    # at 85 °C the last segment's -15 mA/K continued → 0.675 A; at -40 °C the coldest point.
    table = [(50.0, 1.2), (70.0, 0.9), (-20.0, 1.9)]
    assert fuse.ptc_hold_current(1.5, 60.0, table).current == pytest.approx(1.05)
    hot = fuse.ptc_hold_current(1.5, 85.0, table)
    assert hot.current == pytest.approx(0.675)
    assert "extrapolated" in hot.basis
    assert fuse.ptc_hold_current(1.5, -40.0, table).current == 1.9
    assert fuse.ptc_hold_current(1.5, 0.0, table).current == pytest.approx(1.9 - 0.4 * 20 / 45)


@pytest.mark.parametrize("gauge, mm2", [(10, 5.26), (14, 2.08), (18, 0.823), (24, 0.205),
                                        (34, 0.0201), (-3, 107.2)])
def test_awg_area_against_the_gauge_table(gauge, mm2):
    # ASTM B258 gauge table, cross-sections in mm² [published; from memory].
    assert copper.awg_area(gauge) * 1e6 == pytest.approx(mm2, rel=0.003)


def test_awg_for_area_picks_the_thinnest_gauge_that_suffices():
    assert copper.awg_for_area(0.8e-6) == 18  # 0.823 mm² ≥ 0.8, AWG 19 is 0.653 mm²
    assert copper.awg_for_area(200e-6) is None  # above 4/0
