"""Junction temperature and power budget against docs/references.md MOSFET vectors."""

import pytest
from hypothesis import given, strategies as st

from packwarden.model.rdson import rds_on
from packwarden.model.thermal import (accelerated_step, conduction_power, junction_temperature,
                                      max_power, steady_junction_temperature)

MOHM = 1e-3


@pytest.mark.parametrize("tj_max, ambient, theta, expected, half_digit", [
    # P_D,max = (T_J,max - T_A)/R_θJA [published: data sheet definition]; vectors [derived],
    # each checked to half a unit of its last quoted digit.
    (150.0, 25.0, 83.0, 1.506, 0.0005),
    (150.0, 70.0, 83.0, 0.964, 0.0005),
    (150.0, 25.0, 120.0, 1.04, 0.005),
    (150.0, 75.0, 120.0, 0.625, 0.0005),
])
def test_max_power_vectors(tj_max, ambient, theta, expected, half_digit):
    assert max_power(tj_max, ambient, theta) == pytest.approx(expected, abs=half_digit)


def test_max_power_can_go_negative():
    assert max_power(150.0, 160.0, 100.0) == pytest.approx(-0.1)


def test_two_channel_conduction_vector():
    # docs/references.md MOSFETs, vector [derived]: 2 A through two 22 mΩ channels → 0.176 W;
    # at 120 K/W and 60 °C ambient T_J = 81.1 °C.
    p = conduction_power(2.0, 22 * MOHM, 22 * MOHM)
    assert p == pytest.approx(0.176, abs=1e-6)
    assert steady_junction_temperature(60.0, p, 120.0) == pytest.approx(81.1, abs=0.05)


def test_fixed_point_with_constant_power_matches_the_vector():
    # Same vector [derived] through the iterating solver: a constant P must settle at once.
    r = junction_temperature(60.0, lambda tj: 0.176, 120.0, 150.0)
    assert r.converged and not r.runaway
    assert r.tj == pytest.approx(81.12, abs=0.01)
    assert r.power == pytest.approx(0.176)


def test_hot_rdson_raises_the_steady_state_above_the_cold_estimate():
    # The vector's 22 mΩ is a 25 °C value; with a 1.5 × rise to 125 °C [practice: docs/references.md
    # 1.4-1.6 ×] the self-consistent T_J must exceed 81.1 °C and satisfy T = T_A + P(T)·θ.
    table = [(4.5, 22 * MOHM, None)]

    def power(tj):
        return conduction_power(2.0, *(rds_on(table, 4.5, tj, 1.5).value,) * 2)

    r = junction_temperature(60.0, power, 120.0, 150.0)
    assert r.converged and not r.runaway
    assert r.tj > 81.2
    assert r.tj == pytest.approx(60.0 + power(r.tj) * 120.0, abs=1e-5)
    # Closed form for P linear in T, [derived]: P(T) = a + b·T, T* = (T_A + θa)/(1 - θb).
    b = 0.176 * 0.5 / 100.0
    a = 0.176 - b * 25.0
    assert r.tj == pytest.approx((60.0 + 120.0 * a) / (1 - 120.0 * b), abs=1e-4)


@given(ambient=st.floats(-40.0, 100.0), theta=st.floats(10.0, 300.0),
       a=st.floats(0.0, 0.5), gain=st.floats(0.0, 0.95))
def test_linear_power_matches_closed_form(ambient, theta, a, gain):
    # P(T) = a + b·(T - T_A) with loop gain θb < 1 has T* = T_A + θa/(1 - θb) [derived].
    b = gain / theta
    expected = ambient + theta * a / (1 - gain)
    r = junction_temperature(ambient, lambda t: a + b * (t - ambient), theta, 1e6)
    assert r.converged and not r.runaway
    assert r.tj == pytest.approx(expected, abs=1e-3)


def test_runaway_when_loop_gain_exceeds_one():
    # θ·dP/dT = 120 × 0.01 = 1.2 > 1: no fixed point at all.
    r = junction_temperature(60.0, lambda t: 0.01 * (t - 20.0), 120.0, 150.0)
    assert r.runaway and not r.converged
    assert r.tj > 150.0


def test_runaway_when_the_steady_state_is_above_tj_max():
    # A fixed point exists at 60 + 1.5 × 120 = 240 °C, above the 150 °C limit.
    r = junction_temperature(60.0, lambda t: 1.5, 120.0, 150.0)
    assert r.runaway and not r.converged


def test_slow_settling_is_finished_by_bisection():
    # Loop gain 0.999: plain iteration creeps, the fallback must still find T* = 25 + 0.05/0.001.
    theta = 100.0
    b = 0.999 / theta
    r = junction_temperature(25.0, lambda t: 0.0005 + b * (t - 25.0), theta, 150.0,
                             max_iter=200)
    assert r.converged and not r.runaway
    assert r.tj == pytest.approx(75.0, abs=1e-4)


def test_slow_creep_toward_a_point_above_the_limit_is_runaway():
    theta = 100.0
    b = 0.999 / theta
    r = junction_temperature(25.0, lambda t: 0.002 + b * (t - 25.0), theta, 150.0,
                             max_iter=50)
    assert r.runaway and not r.converged


def test_oscillation_is_settled_by_bisection():
    # P falling steeply with T (gain -1.5) makes plain iteration swing; T* = T_A + θa/2.5.
    theta, a = 100.0, 0.5
    r = junction_temperature(25.0, lambda t: max(0.0, a - 1.5 / theta * (t - 25.0)), theta,
                             150.0)
    assert r.converged and not r.runaway
    assert r.tj == pytest.approx(25.0 + theta * a / 2.5, abs=1e-4)


def test_ambient_above_limit_is_runaway():
    assert junction_temperature(160.0, lambda t: 0.0, 100.0, 150.0).runaway


@pytest.mark.parametrize("fn", [lambda t: -0.1, lambda t: float("nan")])
def test_bad_power_raises(fn):
    with pytest.raises(ValueError):
        junction_temperature(25.0, fn, 100.0, 150.0)


def test_bad_theta_raises():
    with pytest.raises(ValueError):
        max_power(150.0, 25.0, 0.0)
    with pytest.raises(ValueError):
        steady_junction_temperature(25.0, 1.0, -5.0)


# --- the accelerated fixed-point step --------------------------------------------------------

@given(ambient=st.floats(0, 60), gain=st.floats(-3.0, 0.7), t0=st.floats(20, 120),
       t1=st.floats(20, 120))
def test_the_secant_lands_on_the_balance_of_a_linear_loss(ambient, gain, t0, t1) -> None:
    # T -> T_A + gain * (T - 25): a loss linear in T, as I²·R with R linear in T (gain < 0 when
    # the FETs sense the current, P = V²/R). Its fixed point solves T = T_A + gain (T - 25)
    # [derived: algebra]; through two points of a straight residual the secant is exact.
    def target(t: float) -> float:
        return ambient + gain * (t - 25.0)
    if abs(t1 - t0) < 1e-3:
        return
    root = (ambient - 25.0 * gain) / (1.0 - gain)
    step = accelerated_step(t1, target(t1), (t0, target(t0) - t0))
    assert step == pytest.approx(root, abs=1e-6)


def test_without_a_usable_slope_the_plain_step_is_taken() -> None:
    # First step, no change in T, a residual rising with T (gain above 1: no stable balance) or
    # falling too slowly (gain 0.9): the plain, damped step t + damping * (target - t).
    assert accelerated_step(50.0, 60.0, None) == 60.0
    assert accelerated_step(50.0, 60.0, None, damping=0.5) == 55.0
    assert accelerated_step(50.0, 60.0, (50.0, 3.0), damping=0.5) == 55.0
    rising = accelerated_step(50.0, 60.0, (40.0, 5.0))  # residual 5 -> 10 as T rises
    assert rising == 60.0
    flat = accelerated_step(50.0, 60.0, (40.0, 11.0))  # slope -0.1: loop gain 0.9
    assert flat == 60.0
    steep = accelerated_step(50.0, 60.0, (40.0, 20.0))  # slope -1: secant to the root at 60
    assert steep == pytest.approx(60.0)
