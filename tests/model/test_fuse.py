"""Fuse I²t, pre-arcing gates and derating against docs/references.md "Fuses"."""

import math

import pytest
from hypothesis import given, strategies as st

from packwarden.model import fuse
from packwarden.model.fuse import Melt, melt_verdict

MIN, HOUR = 60.0, 3600.0


def test_rectangular_pulse_i2t_vector():
    # I²t of a rectangular pulse = I²·t [published: definition]; vector [derived]:
    # 40 A for 540 µs → 0.86 A²s.
    assert fuse.pulse_i2t(40.0, 540e-6) == pytest.approx(0.86, abs=0.005)


# Gates written out here from docs/references.md, independently of the module's data, so a typo in
# either shows up. (multiple, min pre-arcing time, max pre-arcing time); None = not given.
SHEET3 = [  # IEC 60127-2 sheet 3 [published, as reproduced in fuse data sheets]
    (1.5, 60 * MIN, None), (2.1, None, 2 * MIN), (2.75, 0.6, 10.0), (4.0, 0.15, 3.0),
    (10.0, 0.02, 0.3)]
SHEET5 = [  # IEC 60127-2 sheet 5 [published, as reproduced in fuse data sheets]
    (1.5, 60 * MIN, None), (2.1, None, 30 * MIN), (2.75, 0.75, 80.0), (4.0, 0.15, 5.0),
    (10.0, 0.02, 0.15)]
QUICK = [  # IEC 60127-2 sheets 1/2 quick-acting [memory]
    (2.1, None, 30 * MIN), (2.75, 0.01, 2.0), (4.0, 0.003, 0.3), (10.0, None, 0.02)]


@pytest.mark.parametrize("gates, table", [
    (fuse.IEC60127_2_SHEET3, SHEET3), (fuse.IEC60127_2_SHEET5, SHEET5),
    (fuse.IEC60127_2_QUICK, QUICK)])
def test_each_gate_is_honoured(gates, table):
    rating = 5.0   # inside every set's span
    for k, t_lo, t_hi in table:
        current = k * rating
        v = melt_verdict(current, 1.0, rating, gates)
        if t_lo is not None:
            assert v.t_min == pytest.approx(t_lo)
            assert melt_verdict(current, t_lo * 0.99, rating, gates).verdict is Melt.BELOW
        if t_hi is not None:
            assert v.t_max == pytest.approx(t_hi)
            assert melt_verdict(current, t_hi, rating, gates).verdict is Melt.MELTS
        inside = math.sqrt(max(v.t_min, 1e-9) * min(v.t_max, 1e9))
        assert melt_verdict(current, inside, rating, gates).verdict is Melt.MAY_MELT


def test_exactly_the_minimum_time_may_melt():
    # Sheet 3 at 4 In [published]: pre-arcing time 150 ms-3 s, so 150 ms itself is not "surely
    # below": a fuse at its minimum melts at exactly that moment.
    assert melt_verdict(20.0, 0.15, 5.0, fuse.IEC60127_2_SHEET3).verdict is Melt.MAY_MELT


def test_between_gates_uses_monotonicity_only():
    # Sheet 3 [published]: at 3 In the pre-arcing time is ≥ the 4 In minimum (150 ms) and ≤ the
    # 2.75 In maximum (10 s), because a larger current never takes longer to melt [practice].
    v = melt_verdict(3.0, 1.0, 1.0, fuse.IEC60127_2_SHEET3)
    assert (v.t_min, v.t_max) == (0.15, 10.0)
    assert v.verdict is Melt.MAY_MELT
    assert melt_verdict(3.0, 0.1, 1.0, fuse.IEC60127_2_SHEET3).verdict is Melt.BELOW
    assert melt_verdict(3.0, 11.0, 1.0, fuse.IEC60127_2_SHEET3).verdict is Melt.MELTS


def test_short_circuit_pulse_beyond_the_last_gate_is_undecided():
    # 40 A for 540 µs in a 1 A time-lag fuse: 40 In is past the 10 In gate, which bounds the time
    # only from above (≤ 300 ms); the gates cannot clear it, the melting I²t must.
    v = melt_verdict(40.0, 540e-6, 1.0, fuse.IEC60127_2_SHEET3)
    assert v.verdict is Melt.MAY_MELT
    assert v.t_min == 0.0 and v.t_max == pytest.approx(0.3)


def test_ul_248_14_points():
    # UL 248-14 [published, secondary summary]: carries 100 %; opens at 135 % within 1 h and at
    # 200 % within 2 min.
    ul = fuse.UL248_14
    assert melt_verdict(1.0, 1e9, 1.0, ul).verdict is Melt.BELOW
    assert melt_verdict(1.35, HOUR, 1.0, ul).verdict is Melt.MELTS
    assert melt_verdict(2.0, 2 * MIN, 1.0, ul).verdict is Melt.MELTS
    assert melt_verdict(1.2, 2 * HOUR, 1.0, ul).verdict is Melt.MAY_MELT
    assert melt_verdict(2.0, 1 * MIN, 1.0, ul).verdict is Melt.MAY_MELT


def test_rating_outside_a_sheet_is_noted():
    # Sheet 5 covers 4-6.3 A [published].
    assert melt_verdict(2.0, 1.0, 1.0, fuse.IEC60127_2_SHEET5).notes
    assert not melt_verdict(8.0, 1.0, 5.0, fuse.IEC60127_2_SHEET5).notes


def test_interpolation_is_flagged_and_narrows():
    plain = melt_verdict(3.0, 1.0, 1.0, fuse.IEC60127_2_SHEET3)
    inter = melt_verdict(3.0, 1.0, 1.0, fuse.IEC60127_2_SHEET3, interpolate=True)
    assert inter.t_min > plain.t_min and inter.t_max < plain.t_max
    assert any("interpolated" in n for n in inter.notes)


sets = st.sampled_from(list(fuse.GATE_SETS.values()))
order = {Melt.BELOW: 0, Melt.MAY_MELT: 1, Melt.MELTS: 2}


@given(gates=sets, k1=st.floats(0.1, 50.0), k2=st.floats(0.1, 50.0),
       t=st.floats(1e-4, 1e5), interpolate=st.booleans())
def test_more_current_never_gives_a_milder_verdict(gates, k1, k2, t, interpolate):
    lo, hi = sorted((k1, k2))
    a = melt_verdict(lo, t, 1.0, gates, interpolate).verdict
    b = melt_verdict(hi, t, 1.0, gates, interpolate).verdict
    assert order[a] <= order[b]


@given(gates=sets, k=st.floats(0.1, 50.0), t1=st.floats(1e-4, 1e5), t2=st.floats(1e-4, 1e5))
def test_longer_never_gives_a_milder_verdict(gates, k, t1, t2):
    lo, hi = sorted((t1, t2))
    assert (order[melt_verdict(k, lo, 1.0, gates).verdict]
            <= order[melt_verdict(k, hi, 1.0, gates).verdict])


@given(gates=sets, k=st.floats(0.1, 50.0))
def test_interpolated_bounds_lie_inside_the_monotone_ones(gates, k):
    plain = melt_verdict(k, 1.0, 1.0, gates)
    inter = melt_verdict(k, 1.0, 1.0, gates, interpolate=True)
    assert plain.t_min <= inter.t_min <= inter.t_max <= plain.t_max


def test_pulse_fraction_points():
    # Repetitive pulse practice [practice]: ~48 % of melting I²t for 100 pulses, ~22 % for 100 000.
    assert fuse.pulse_i2t_fraction(100) == pytest.approx(0.48)
    assert fuse.pulse_i2t_fraction(100_000) == pytest.approx(0.22)
    assert fuse.pulse_i2t_fraction(1) == pytest.approx(0.48)
    assert 0.22 < fuse.pulse_i2t_fraction(10_000) < 0.48
    assert fuse.pulse_i2t_fraction(1e4) > fuse.pulse_i2t_fraction(5e4)


def test_continuous_derating():
    # Run a fuse at ≤ 75 % of its rating at 25 °C [practice].
    assert fuse.max_continuous_current(2.0) == pytest.approx(1.5)
    assert fuse.max_continuous_current(2.0, ambient_factor=0.9) == pytest.approx(1.35)
    assert fuse.linear_ambient_factor(45.0, 0.005) == pytest.approx(0.9)
    assert fuse.linear_ambient_factor(10.0, 0.005) == 1.0
    assert fuse.linear_ambient_factor(500.0, 0.005) == 0.0
    with pytest.raises(ValueError):
        fuse.max_continuous_current(2.0, ambient_factor=1.2)


@pytest.mark.parametrize("call", [
    lambda: fuse.pulse_i2t(1.0, -1.0),
    lambda: melt_verdict(1.0, 1.0, 0.0, fuse.UL248_14),
    lambda: melt_verdict(-1.0, 1.0, 1.0, fuse.UL248_14),
    lambda: fuse.pulse_i2t_fraction(0),
])
def test_bad_inputs_raise(call):
    with pytest.raises(ValueError):
        call()


# --- the fuse's limit for an event (the rule's melting check) ---------------------------------

def test_a_short_pulse_melts_at_the_melting_i2t():
    # docs/references.md "Fuses" [practice]: the constant melting I²t holds for short pulses
    # (roughly under 5-10 ms). The 40 A, 540 µs vector pulse against a 95 A²s fuse: the limit is
    # the melting I²t whatever the gates say.
    lim = fuse.melt_limit(40.0, 540e-6, 12.0, "time_lag", 95.0)
    assert lim.i2t == 95.0 and "short pulse" in lim.basis
    assert fuse.melt_limit(40.0, 540e-6, 12.0, "time_lag", None).i2t is None


def test_a_longer_event_follows_the_sheet_3_gates():
    # docs/references.md "Fuses": sheet 3 [published], a 5 A time-lag fuse. 28.3 A is 5.66 I_n,
    # between the 4 I_n and 10 I_n gates; a larger current never melts slower [practice], so the
    # pre-arcing time is at least the 10 I_n minimum, 20 ms: the fuse needs 28.3² × 0.020 =
    # 16.0 A²s to melt then, more than its 12 A²s melting I²t.
    lim = fuse.melt_limit(28.3, 0.015, 5.0, "time_lag", 12.0)
    assert lim.i2t == pytest.approx(28.3**2 * 0.020, rel=1e-12)
    assert "sheet 3" in lim.basis


def test_the_melting_i2t_is_a_floor_for_longer_events():
    # docs/references.md "Fuses" [memory]: quick-acting, 2.75 I_n from about 10 ms. A 12 A quick
    # fuse at 28.3 A (2.36 I_n, between the 2.1 and 2.75 I_n gates): at least 10 ms, 8.0 A²s;
    # its melting I²t of 20 A²s is the least that melts it at any duration [practice], so 20.
    lim = fuse.melt_limit(28.3, 0.015, 12.0, "quick_acting", 20.0)
    assert lim.i2t == 20.0 and lim.basis.startswith("melting I²t")
    # without a melting I²t the gates alone bound it
    assert fuse.melt_limit(28.3, 0.015, 12.0, "quick_acting", None).i2t == pytest.approx(
        28.3**2 * 0.010, rel=1e-12)


def test_a_time_lag_fuse_beyond_every_sheet_has_no_gates():
    # Sheet 3 covers 125 mA-6.3 A and UL 248-14 0-30 A [published]: a 60 A time-lag fuse has
    # neither, so only its melting I²t (or its own curve) bounds a long event.
    assert fuse.gates_for("time_lag", 60.0) is None
    assert fuse.gates_for("time_lag", 12.0) is fuse.UL248_14
    assert fuse.gates_for("time_lag", 5.0) is fuse.IEC60127_2_SHEET3
    assert fuse.melt_limit(118.0, 0.12, 60.0, "time_lag", 1200.0).i2t == 1200.0


def test_pre_arcing_points_reproduce_a_power_law():
    # docs/references.md "Fuses" [derived]: a straight line in log-log is a power law, so points
    # on t = 100/I² (a constant 100 A²s) give 100/20² = 0.25 s at 20 A, between 10 A and 40 A.
    points = [(10.0, 1.0), (40.0, 100.0 / 40.0**2)]
    assert fuse.pre_arcing_time(20.0, points) == pytest.approx(0.25, rel=1e-12)
    # below the lowest current, never sooner than there [practice: monotone]; above, unknown
    assert fuse.pre_arcing_time(5.0, points) == 1.0
    assert fuse.pre_arcing_time(80.0, points) == 0.0
    # the part's points rule over the gates: 20 A for 0.1 s needs 20² × 0.25 = 100 A²s
    assert fuse.melt_limit(20.0, 0.1, 5.0, "quick_acting", 10.0, points).i2t == pytest.approx(
        100.0, rel=1e-12)


def test_a_makers_derating_curve_read_in_straight_lines():
    # [derived: linear interpolation between the curve's points] (25 °C, 100 %) is implied;
    # (85 °C, 50 %) gives 100 % - 50 % × (55 - 25) / (85 - 25) = 75 % at 55 °C; flat beyond
    # the curve's ends; a point at 25 °C of its own replaces the implied one.
    from packwarden.model.fuse import curve_ambient_factor
    assert curve_ambient_factor(55.0, [(85.0, 0.5)]) == pytest.approx(0.75)
    assert curve_ambient_factor(100.0, [(85.0, 0.5)]) == pytest.approx(0.5)
    assert curve_ambient_factor(-20.0, [(-40.0, 1.1), (85.0, 0.5)]) == pytest.approx(
        1.1 + (1.0 - 1.1) * 20.0 / 65.0)
    assert curve_ambient_factor(25.0, [(25.0, 0.9), (85.0, 0.5)]) == pytest.approx(0.9)
