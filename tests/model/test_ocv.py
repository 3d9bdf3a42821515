"""OCV-SoC tables and shelf-life arithmetic against docs/references.md "Storage and self-discharge"."""

import math

import pytest
from hypothesis import given, strategies as st

from packwarden.model import ocv
from packwarden.model.cells import DEFAULT_WINDOWS

# Open NMC cylindrical-cell dataset, 25 °C [published], as quoted in docs/references.md (SoC %, V).
NMC_POINTS = [(0.2, 2.535), (10, 3.268), (20.2, 3.416), (30.3, 3.562), (40.1, 3.662),
              (50.3, 3.756), (60.1, 3.840), (70.3, 3.926), (80, 4.037), (90.2, 4.091),
              (100, 4.175)]
# Open LiFePO4 cylindrical-cell dataset [published], as quoted (rounded) in docs/references.md.
LFP_POINTS = [(0, 2.010), (5.34, 3.087), (8.85, 3.194), (29.72, 3.277), (98.33, 3.351),
              (100, 3.598)]


@pytest.mark.parametrize("pct, volts", NMC_POINTS)
def test_nmc_dataset_points_round_trip(pct, volts):
    assert ocv.voltage_at_soc("nmc", pct / 100) == pytest.approx(volts, abs=1e-9)
    assert ocv.soc_at_voltage("nmc", volts) == pytest.approx(pct / 100, abs=1e-9)


@pytest.mark.parametrize("pct, volts", LFP_POINTS)
def test_lfp_dataset_points_round_trip(pct, volts):
    # docs/references.md rounds the dataset to 1 mV and 0.01 %; the module keeps its 0.1 mV.
    v = ocv.voltage_at_soc("lfp", pct / 100)
    assert v == pytest.approx(volts, abs=0.0006)
    assert ocv.soc_at_voltage("lfp", v) == pytest.approx(pct / 100, abs=1e-9)


def test_lco_and_nca_borrow_the_nmc_curve():
    # [practice] approximation stated in the module; the test pins it so a change is deliberate.
    for chem in ("lco", "nca"):
        assert ocv.voltage_at_soc(chem, 0.5) == ocv.voltage_at_soc("nmc", 0.5)
        assert "approximation" in ocv.OCV_TABLES[chem].source


@pytest.mark.parametrize("chem", ["lmo", "lto"])
def test_window_approximations_follow_the_cell_defaults(chem):
    # [practice] cut-off at empty, nominal at half, charge at full.
    w = DEFAULT_WINDOWS[chem]
    assert ocv.voltage_at_soc(chem, 0.0) == w.cutoff
    assert ocv.voltage_at_soc(chem, 0.5) == w.nominal
    assert ocv.voltage_at_soc(chem, 1.0) == w.charge


def test_interpolation_is_linear_between_points():
    # [derived] halfway between 40.1 % (3.662 V) and 50.3 % (3.756 V).
    assert ocv.voltage_at_soc("nmc", 0.452) == pytest.approx((3.662 + 3.756) / 2, abs=1e-9)


def test_outside_the_table_clamps_or_raises():
    assert ocv.soc_at_voltage("nmc", 4.3) == 1.0
    assert ocv.soc_at_voltage("nmc", 2.0) == pytest.approx(0.002)
    assert ocv.voltage_at_soc("nmc", 0.0) == pytest.approx(2.535)
    with pytest.raises(ValueError):
        ocv.soc_at_voltage("nmc", 4.3, strict=True)
    with pytest.raises(ValueError):
        ocv.voltage_at_soc("nmc", 0.001, strict=True)


def test_a_cells_own_table_is_accepted_in_any_order():
    own = [(1.0, 4.2), (0.0, 3.0), (0.5, 3.7)]
    assert ocv.voltage_at_soc(own, 0.25) == pytest.approx(3.35)
    assert ocv.soc_at_voltage(own, 3.95) == pytest.approx(0.75)


@pytest.mark.parametrize("bad", [
    [(0, 3.0), (50, 3.7), (100, 4.2)],          # percent instead of fraction
    [(0.0, 3.0), (0.5, 3.0), (1.0, 4.2)],       # flat: cannot be inverted
    [(0.0, 3.0), (0.5, 3.9), (1.0, 3.8)],       # falls
    [(0.5, 3.7)],                                # one point
])
def test_bad_own_tables_raise(bad):
    with pytest.raises(ValueError):
        ocv.soc_at_voltage(bad, 3.5)


def test_percent_soc_is_refused():
    with pytest.raises(ValueError, match="fraction"):
        ocv.voltage_at_soc("nmc", 44)


def test_unknown_chemistry():
    with pytest.raises(KeyError):
        ocv.voltage_at_soc("nimh", 0.5)


@given(chem=st.sampled_from(sorted(ocv.OCV_TABLES)), soc=st.floats(0.0, 1.0))
def test_round_trip_and_monotone(chem, soc):
    lo = ocv.OCV_TABLES[chem].points[0][0]
    v = ocv.voltage_at_soc(chem, soc)
    back = ocv.soc_at_voltage(chem, v)
    assert back == pytest.approx(max(soc, lo), abs=1e-9)
    assert ocv.voltage_at_soc(chem, min(1.0, soc + 0.01)) >= v


def test_shelf_life_vector():
    # docs/references.md vector [derived]: 1000 mAh at ~44 % losing 2 %/month plus 3 µA
    # (2.19 mAh/month) → 22.2 mAh/month → empty in about 19.8 months. Reproduces with
    # 730 h/month and self-discharge as a share of rated capacity.
    r = ocv.shelf_life(1.000, 0.44, 2.0, [3e-6])
    assert r.drain_ah_per_month * 1e3 == pytest.approx(2.19, abs=0.005)
    assert r.loss_ah_per_month * 1e3 == pytest.approx(22.2, abs=0.05)
    assert r.months == pytest.approx(19.8, abs=0.05)
    assert any("730" in a for a in r.assumptions)


def test_shelf_life_drain_alone_vector():
    # Same vector [derived]: the 3 µA drain alone → about 201 months.
    assert ocv.shelf_life(1.000, 0.44, 0.0, [3e-6]).months == pytest.approx(201, abs=0.5)


def test_drains_add():
    one = ocv.shelf_life(1.0, 0.44, 0.0, [3e-6]).months
    two = ocv.shelf_life(1.0, 0.44, 0.0, [1e-6, 2e-6]).months
    assert one == pytest.approx(two)


def test_remaining_basis_matches_a_stepwise_simulation():
    # [derived] dQ/dt = -r·Q - D integrated in small steps must agree with the closed form.
    cap, s, drain = 1.0, 2.0, 3e-6 * ocv.HOURS_PER_MONTH
    r = ocv.shelf_life(cap, 0.44, s, [3e-6], 0.05, basis="remaining")
    q, t, dt = 0.44 * cap, 0.0, 1e-3
    while q > 0.05 * cap:
        q -= (s / 100 * q + drain) * dt
        t += dt
    assert r.months == pytest.approx(t, rel=1e-3)
    assert r.months > ocv.shelf_life(cap, 0.44, s, [3e-6], 0.05).months


def test_cut_off_voltage_via_the_ocv_table():
    # A 2.5 V LiFePO4 cut-off is at a small SoC, so life is a little less than to empty.
    end = ocv.soc_at_voltage("lfp", 2.5)
    assert 0.0 < end < 0.02
    to_cutoff = ocv.shelf_life(1.0, 0.44, 2.0, [3e-6], end).months
    assert to_cutoff < ocv.shelf_life(1.0, 0.44, 2.0, [3e-6]).months


def test_edge_cases():
    assert ocv.shelf_life(1.0, 0.1, 2.0, [], 0.2).months == 0.0
    assert math.isinf(ocv.shelf_life(1.0, 0.5, 0.0, []).months)
    assert math.isinf(ocv.shelf_life(1.0, 0.5, 0.0, [], basis="remaining").months)
    assert math.isinf(ocv.shelf_life(1.0, 0.5, 2.0, [], basis="remaining").months)
    with pytest.raises(ValueError):
        ocv.shelf_life(1.0, 44, 2.0)
    with pytest.raises(ValueError):
        ocv.shelf_life(1.0, 0.44, 2.0, [-1e-6])


def test_self_discharge_doubles_per_10_k():
    # Roughly doubling per 10 °C [practice; sources disagree].
    assert ocv.self_discharge_at(2.0, 35.0) == pytest.approx(4.0)
    assert ocv.self_discharge_at(2.0, 15.0) == pytest.approx(1.0)
