"""Copper resistance (IEC 60028) and conductor capacity (IPC-2221) against docs/references.md values."""

import math

import pytest
from hypothesis import given, strategies as st

from packwarden.model import copper

MIL = 25.4e-6   # exact by the definition of the inch [published]
UM = 1e-6
MM = 1e-3


def test_resistivity_is_the_annealed_copper_standard():
    # IEC 60028 [published]: 1/58 Ω·mm²/m = 0.017241 Ω·mm²/m at 20 °C.
    assert copper.copper_resistivity(20.0) / 1e-6 == pytest.approx(0.017241, abs=1e-6)


def test_trace_resistance_vector():
    # IEC 60028 [published], vector [derived]: 35 µm × 2 mm × 50 mm at 20 °C → 12.3 mΩ.
    r = copper.trace_resistance(2 * MM, 35 * UM, 50 * MM, 20.0)
    assert r == pytest.approx(12.3e-3, abs=0.05e-3)


def test_trace_resistance_temperature_coefficient():
    # IEC 60028 [published]: α = 0.00393 /K at 20 °C, so +50 K raises R by 19.65 % [derived].
    cold = copper.trace_resistance(2 * MM, 35 * UM, 50 * MM, 20.0)
    hot = copper.trace_resistance(2 * MM, 35 * UM, 50 * MM, 70.0)
    assert hot / cold == pytest.approx(1.1965, abs=1e-4)


def test_trace_resistance_scales_with_geometry():
    # R = ρL/(wt) [published: definition of resistivity]: twice the length doubles R, twice the
    # width halves it.
    base = copper.trace_resistance(1 * MM, 35 * UM, 10 * MM)
    assert copper.trace_resistance(1 * MM, 35 * UM, 20 * MM) == pytest.approx(2 * base)
    assert copper.trace_resistance(2 * MM, 35 * UM, 10 * MM) == pytest.approx(base / 2)


def test_one_ounce_is_35_um_and_1_378_mil():
    # docs/references.md IPC-2221 section [practice]: 1 oz/ft² ≈ 35 µm ≈ 1.378 mil.
    t = copper.oz_to_thickness(1.0)
    assert t == pytest.approx(35 * UM)
    assert t / MIL == pytest.approx(1.378, abs=0.001)
    assert copper.thickness_to_oz(70 * UM) == pytest.approx(2.0)


# IPC-2221 [published], vectors [derived] from docs/references.md.
def test_ipc_1a_outer_1oz_dt10():
    r = copper.ipc2221_min_width(1.0, 35 * UM, 10.0, "outer")
    assert r.area_mil2 == pytest.approx(16.30, abs=0.01)
    assert r.width / MIL == pytest.approx(11.83, abs=0.01)
    assert r.width / MM == pytest.approx(0.300, abs=0.001)
    assert r.in_range


def test_ipc_1a_inner_1oz_dt10():
    r = copper.ipc2221_min_width(1.0, 35 * UM, 10.0, "inner")
    assert r.area_mil2 == pytest.approx(42.39, abs=0.01)
    assert r.width / MIL == pytest.approx(30.76, abs=0.01)


def test_ipc_5a_outer_1oz_dt10():
    r = copper.ipc2221_min_width(5.0, 35 * UM, 10.0, "outer")
    assert r.area_mil2 == pytest.approx(150.0, abs=0.1)
    assert r.width / MIL == pytest.approx(108.9, abs=0.1)
    assert r.width / MM == pytest.approx(2.77, abs=0.01)


def test_ipc_10a_outer_2oz_dt20():
    r = copper.ipc2221_min_width(10.0, copper.oz_to_thickness(2.0), 20.0, "outer")
    assert r.area_mil2 == pytest.approx(256.3, abs=0.1)
    assert r.width / MIL == pytest.approx(93.0, abs=0.1)


def test_ipc_100mil_1oz_dt10_outer_and_inner():
    outer = copper.ipc2221_current(100 * MIL, 35 * UM, 10.0, "outer")
    inner = copper.ipc2221_current(100 * MIL, 35 * UM, 10.0, "inner")
    assert outer.current == pytest.approx(4.70, abs=0.005)
    assert inner.current == pytest.approx(2.35, abs=0.005)


areas = st.floats(min_value=1.0, max_value=5000.0)
rises = st.floats(min_value=1.0, max_value=150.0)


@given(width_mil=areas, oz=st.floats(min_value=0.25, max_value=4.0), dt=rises)
def test_inner_is_exactly_half_of_outer(width_mil, oz, dt):
    # IPC-2221 [published]: k_inner = 0.024 = k_outer / 2, so for the same area inner carries half.
    t = copper.oz_to_thickness(oz)
    outer = copper.ipc2221_current(width_mil * MIL, t, dt, "outer").current
    inner = copper.ipc2221_current(width_mil * MIL, t, dt, "inner").current
    assert inner == pytest.approx(outer / 2, rel=1e-12)


@given(current=st.floats(min_value=0.01, max_value=100.0), oz=st.floats(0.25, 4.0), dt=rises,
       layer=st.sampled_from(["outer", "inner"]))
def test_min_width_inverts_current(current, oz, dt, layer):
    # [derived] the inverse of the IPC-2221 formula must give back the current it was asked for.
    t = copper.oz_to_thickness(oz)
    w = copper.ipc2221_min_width(current, t, dt, layer).width
    assert copper.ipc2221_current(w, t, dt, layer).current == pytest.approx(current, rel=1e-9)


@given(current=st.floats(min_value=0.1, max_value=30.0), dt=rises)
def test_more_rise_allowed_means_narrower_trace(current, dt):
    # IPC-2221 [published]: I grows with ΔT^0.44, so a larger allowed rise never needs more width.
    a = copper.ipc2221_min_width(current, 35 * UM, dt).width
    b = copper.ipc2221_min_width(current, 35 * UM, dt * 1.5).width
    assert b < a


def test_out_of_range_is_flagged_not_raised():
    # Usual IPC-2221 validity [memory]: ≤ 35 A outer / 17.5 A inner, ΔT 10-100 °C, ≤ 400 mil,
    # 0.5-3 oz.
    assert copper.ipc2221_min_width(40.0, 35 * UM, 10.0, "outer").out_of_range
    assert not copper.ipc2221_min_width(20.0, copper.oz_to_thickness(3.0), 60.0,
                                        "outer").out_of_range
    assert copper.ipc2221_min_width(20.0, copper.oz_to_thickness(3.0), 60.0,
                                    "inner").out_of_range
    flags = copper.ipc2221_current(10 * MIL, 35 * UM, 5.0).out_of_range
    assert any("rise" in f for f in flags)
    flags = copper.ipc2221_current(500 * MIL, 35 * UM, 10.0).out_of_range
    assert any("width" in f for f in flags)
    flags = copper.ipc2221_current(10 * MIL, copper.oz_to_thickness(4.0), 10.0).out_of_range
    assert any("oz" in f for f in flags)
    assert copper.ipc2221_current(10 * MIL, copper.oz_to_thickness(0.5), 10.0).in_range


@pytest.mark.parametrize("call", [
    lambda: copper.ipc2221_current(1 * MM, 35 * UM, 10.0, "middle"),
    lambda: copper.ipc2221_current(0.0, 35 * UM, 10.0),
    lambda: copper.ipc2221_min_width(1.0, 35 * UM, 0.0),
    lambda: copper.trace_resistance(1 * MM, -35 * UM, 1.0),
    lambda: copper.trace_resistance(1 * MM, 35 * UM, math.nan),
])
def test_bad_inputs_raise(call):
    with pytest.raises(ValueError):
        call()
