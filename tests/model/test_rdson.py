"""On-resistance against gate drive, temperature and corner."""

import pytest
from hypothesis import assume, given, strategies as st

from packwarden.model.rdson import rds_on, temperature_factor

MOHM = 1e-3
# An invented small protection FET: R_DS(on) rises 1.32 × from 4.5 V to 2.5 V gate drive, inside
# the 1.3-1.4 × docs/references.md gives for small protection FETs [practice].
TABLE = [(4.5, 22 * MOHM, 28 * MOHM), (2.5, 29 * MOHM, 37 * MOHM), (3.7, 24 * MOHM, 31 * MOHM)]


def test_tabulated_points_are_returned_exactly():
    for vgs, typ, mx in TABLE:
        assert rds_on(TABLE, vgs, 25.0, 1.5, corner="typ").value == pytest.approx(typ)
        assert rds_on(TABLE, vgs, 25.0, 1.5, corner="max").value == pytest.approx(mx)


def test_linear_between_points():
    # [derived] linear interpolation: halfway between 3.7 V (24 mΩ) and 4.5 V (22 mΩ) is 23 mΩ.
    r = rds_on(TABLE, 4.1, 25.0, 1.5)
    assert r.value == pytest.approx(23 * MOHM)
    assert not r.extrapolated
    assert r.assumptions == ()


def test_above_highest_point_is_held_and_said():
    r = rds_on(TABLE, 10.0, 25.0, 1.5, corner="max")
    assert r.value == pytest.approx(28 * MOHM)
    assert any("held" in a for a in r.assumptions)
    assert not r.extrapolated


def test_below_lowest_point_extrapolates_never_clamps():
    # [derived] line through (2.5 V, 29 mΩ) and (3.7 V, 24 mΩ) continued to 1.9 V: 31.5 mΩ.
    r = rds_on(TABLE, 1.9, 25.0, 1.5)
    assert r.value == pytest.approx(31.5 * MOHM)
    assert r.value > 29 * MOHM
    assert r.extrapolated
    assert any("extrapolated" in a for a in r.assumptions)


def test_single_point_below_its_gate_voltage_raises():
    with pytest.raises(ValueError, match="second row"):
        rds_on([(4.5, 22 * MOHM, None)], 2.5, 25.0, 1.5)
    # At or above its gate voltage the single point is usable.
    assert rds_on([(4.5, 22 * MOHM, None)], 4.5, 25.0, 1.5).value == pytest.approx(22 * MOHM)


def test_wrong_way_slope_is_not_continued_downward():
    # Rows that fall with falling V_GS must never make less drive look better.
    odd = [(2.5, 20 * MOHM, None), (4.5, 25 * MOHM, None)]
    r = rds_on(odd, 1.5, 25.0, 1.5)
    assert r.value >= 20 * MOHM


@pytest.mark.parametrize("tj, factor", [
    # Linear model through 1.0 at 25 °C and hot_ratio 1.5 at 125 °C; 1.5 is inside the 1.4-1.6 ×
    # docs/references.md gives for 20 V parts [practice]; the factors are [derived].
    (25.0, 1.0), (75.0, 1.25), (125.0, 1.5), (150.0, 1.625), (-25.0, 0.75),
])
def test_temperature_factor(tj, factor):
    assert temperature_factor(tj, 1.5, 125.0) == pytest.approx(factor)
    assert rds_on(TABLE, 4.5, tj, 1.5).value == pytest.approx(22 * MOHM * factor)


def test_temperature_outside_the_data_sheet_span_is_marked():
    assert rds_on(TABLE, 4.5, 150.0, 1.5).extrapolated
    assert rds_on(TABLE, 4.5, -20.0, 1.5).extrapolated
    assert not rds_on(TABLE, 4.5, 85.0, 1.5).extrapolated


def test_temperature_factor_rejects_nonsense():
    with pytest.raises(ValueError):
        temperature_factor(50.0, 1.5, 25.0)
    with pytest.raises(ValueError):
        temperature_factor(-500.0, 1.5, 125.0)


def test_min_corner_is_symmetric_spread_and_said():
    r = rds_on(TABLE, 4.5, 25.0, 1.5, corner="min")
    assert r.value == pytest.approx(16 * MOHM)   # 22 - (28 - 22)
    assert any("symmetric" in a for a in r.assumptions)
    # The typ corner needs no such assumption.
    assert rds_on(TABLE, 4.5, 25.0, 1.5, corner="typ").assumptions == ()


def test_only_max_given():
    t = [(4.5, None, 30 * MOHM), (2.5, None, 40 * MOHM)]
    typ = rds_on(t, 4.5, 25.0, 1.5, corner="typ")
    assert typ.value == pytest.approx(30 * MOHM)
    assert any("typ = max" in a for a in typ.assumptions)
    low = rds_on(t, 4.5, 25.0, 1.5, corner="min")
    assert low.value == pytest.approx(30 * MOHM)
    assert any("min = max" in a for a in low.assumptions)
    assert rds_on(t, 4.5, 25.0, 1.5, corner="max").assumptions == ()


def test_only_typ_given_warns_on_max():
    t = [(4.5, 20 * MOHM, None), (2.5, 27 * MOHM, None)]
    r = rds_on(t, 4.5, 25.0, 1.5, corner="max")
    assert r.value == pytest.approx(20 * MOHM)
    assert any("max = typ" in a for a in r.assumptions)


def test_spread_too_wide_for_a_minimum():
    t = [(4.5, 10 * MOHM, 25 * MOHM)]
    assert rds_on(t, 4.5, 25.0, 1.5, corner="max").value == pytest.approx(25 * MOHM)
    with pytest.raises(ValueError, match="minimum"):
        rds_on(t, 4.5, 25.0, 1.5, corner="min")


@pytest.mark.parametrize("points", [
    [],
    [(4.5, None, None)],
    [(4.5, 20 * MOHM, 15 * MOHM)],
    [(4.5, 20 * MOHM, None), (4.5, 21 * MOHM, None)],
    [(4.5, -1.0, None)],
])
def test_bad_tables_raise(points):
    with pytest.raises(ValueError):
        rds_on(points, 4.5, 25.0, 1.5)


@st.composite
def physical_tables(draw):
    # Falling resistance with rising gate drive, max ≥ typ, as data sheets show [practice].
    n = draw(st.integers(min_value=2, max_value=5))
    vgs = sorted(draw(st.lists(st.floats(1.5, 10.0), min_size=n, max_size=n, unique=True)))
    assume(all(b - a > 0.05 for a, b in zip(vgs, vgs[1:])))
    typ = sorted(draw(st.lists(st.floats(5e-3, 100e-3), min_size=n, max_size=n)), reverse=True)
    spread = draw(st.floats(1.0, 1.9))
    return [(v, t, t * spread) for v, t in zip(vgs, typ)]


@given(points=physical_tables(), a=st.floats(0.5, 12.0), b=st.floats(0.5, 12.0),
       tj=st.floats(-40.0, 175.0))
def test_less_gate_drive_never_lowers_resistance(points, a, b, tj):
    lo, hi = sorted((a, b))
    for corner in ("typ", "max", "min"):
        assert (rds_on(points, lo, tj, 1.5, corner=corner).value
                >= rds_on(points, hi, tj, 1.5, corner=corner).value * (1 - 1e-12))


@given(points=physical_tables(), vgs=st.floats(0.5, 12.0), tj=st.floats(-40.0, 175.0))
def test_corners_are_ordered(points, vgs, tj):
    mn, ty, mx = (rds_on(points, vgs, tj, 1.5, corner=c).value for c in ("min", "typ", "max"))
    assert mn <= ty * (1 + 1e-12) and ty <= mx * (1 + 1e-12)


@given(points=physical_tables(), t1=st.floats(-40.0, 175.0), t2=st.floats(-40.0, 175.0),
       ratio=st.floats(1.05, 2.0))
def test_hotter_is_higher(points, t1, t2, ratio):
    lo, hi = sorted((t1, t2))
    assert rds_on(points, 4.5, lo, ratio).value <= rds_on(points, 4.5, hi, ratio).value


def test_trip_current_from_a_hot_table():
    # The trip point falls as the FETs warm: at 125 °C with a 1.5 × ratio, 3 A becomes 2 A.
    r = rds_on([(4.5, 25 * MOHM, None)], 4.5, 125.0, 1.5).value
    assert 0.150 / (2 * r) == pytest.approx(2.0)
