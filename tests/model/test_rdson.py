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


# A FET tabulated only at 4.5 V and 10 V, threshold 1.2-2.0 V (an invented 30 V pair), and the
# drive of one NMC cell at its over-discharge cut-off, 2.5 V - 50 mV [practice, docs/references.md
# "Single-cell protector"].
HIGH_VTH = [(4.5, 14 * MOHM, 18 * MOHM), (10.0, 10 * MOHM, 13 * MOHM)]
CUTOFF = 2.45


def _triode_current(vgs, vt, vds, k=1.0):
    """Drain current in the triode region, I_D = k·((V_GS − V_t)·V_DS − V_DS²/2)
    [published: Sedra & Smith, Microelectronic Circuits, MOSFET triode region; from memory]."""
    return k * ((vgs - vt) * vds - vds * vds / 2)


@pytest.mark.parametrize("vgs", [CUTOFF, 2.8, 3.5, 4.2])
def test_below_the_table_follows_the_triode_region(vgs):
    # R_DS = V_DS / I_D at a small V_DS, taken from the textbook equation itself, relative to the
    # lowest row: the channel resistance at V_GS over that at 4.5 V with V_t = V_th max, 2.0 V.
    vds = 1e-6
    ratio = _triode_current(4.5, 2.0, vds) / _triode_current(vgs, 2.0, vds)
    r = rds_on(HIGH_VTH, vgs, 25.0, 1.5, corner="max", vth=2.0)
    assert r.value == pytest.approx(18 * MOHM * ratio, rel=1e-5)
    assert r.extrapolated and r.below_table and not r.below_threshold
    assert any("1/(V_GS − V_th)" in a for a in r.assumptions)


def test_the_old_straight_line_was_optimistic_at_the_cut_off():
    # The line through the two rows continued to 2.45 V gives 18 + (18 − 13)/(10 − 4.5)·2.05
    # = 19.9 mΩ [derived]; the triode region gives 18 mΩ × (4.5 − 2.0)/(2.45 − 2.0) = 100 mΩ
    # [derived from Sedra & Smith's triode equation, from memory], five times more.
    r = rds_on(HIGH_VTH, CUTOFF, 25.0, 1.5, corner="max", vth=2.0).value
    assert r == pytest.approx(0.1, rel=1e-9)
    assert r > 5 * (18 + 5 / 5.5 * 2.05) * MOHM


def test_the_triode_form_against_ngspice():
    # An independent simulator: ngspice's level-1 (Shichman-Hodges) NMOS, V_TO 2.0 V, at
    # V_DS = 0.1 mV; the ratio of its drain currents is the ratio of the channel resistances.
    from tests.model import spice
    drives = [4.5, CUTOFF, 3.0, 4.0]
    lines = ["* triode", ".model nch nmos level=1 vto=2.0 kp=2.0 lambda=0"]
    for i, v in enumerate(drives):
        lines += [f"M{i} d{i} g{i} 0 0 nch w=1 l=1", f"VG{i} g{i} 0 {v}", f"VD{i} d{i} 0 1e-4"]
    lines += [".control", "set numdgt=15", "op", "print all", "quit 0", ".endc", ".end", ""]
    values = spice.run_op("\n".join(lines))
    current = {v: abs(values[f"vd{i}#branch"]) for i, v in enumerate(drives)}
    for v in drives[1:]:
        r = rds_on(HIGH_VTH, v, 25.0, 1.5, corner="max", vth=2.0).value
        assert r == pytest.approx(18 * MOHM * current[4.5] / current[v], rel=1e-3)


@pytest.mark.parametrize("corner, vth", [("max", 2.0), ("typ", 1.6), ("min", 1.2)])
def test_each_corner_takes_its_own_threshold(corner, vth):
    # rdson.threshold_at reads V_th at the corner: min 1.2 V, typ the middle 1.6 V, max 2.0 V.
    from packwarden.model.rdson import threshold_at
    assert threshold_at((1.2, None, 2.0), corner) == pytest.approx(vth)
    row = {"max": 18, "typ": 14, "min": 10}[corner] * MOHM
    got = rds_on(HIGH_VTH, 3.0, 25.0, 1.5, corner=corner, vth=vth).value
    assert got == pytest.approx(row * _triode_current(4.5, vth, 1e-6) / _triode_current(3.0, vth, 1e-6),
                                rel=1e-5)


@pytest.mark.parametrize("vgs", [2.0025, 2.0, 1.9, 1.0, 0.0, -3.0])
def test_at_and_below_the_threshold_the_channel_is_off_large_and_finite(vgs):
    # A solver that pulls a gate down (a collapsing short) must get an off switch, never a
    # division by zero or a negative resistance: OFF_RATIO × the lowest row.
    from packwarden.model.rdson import OFF_RATIO
    r = rds_on(HIGH_VTH, vgs, 25.0, 1.5, corner="max", vth=2.0)
    assert r.below_threshold and r.value == pytest.approx(18 * MOHM * OFF_RATIO)
    assert any("off" in a for a in r.assumptions)


def test_across_the_threshold_less_drive_never_lowers_resistance():
    values = [rds_on(HIGH_VTH, 1.5 + 0.0005 * i, 25.0, 1.5, corner="max", vth=2.0).value
              for i in range(6000)]
    assert all(a >= b for a, b in zip(values, values[1:]))
    assert all(0 < v < 1e3 for v in values)


def test_a_single_row_extrapolates_by_the_same_form():
    # One row is enough for the triode form: 22 mΩ at 4.5 V, V_th 1.0 V, at 2.5 V:
    # 22 mΩ × 3.5 / 1.5 = 51.3 mΩ [derived from the triode equation above].
    r = rds_on([(4.5, 22 * MOHM, None)], 2.5, 25.0, 1.5, vth=1.0)
    assert r.value == pytest.approx(22 * MOHM * 3.5 / 1.5)
    assert rds_on([(4.5, 22 * MOHM, None)], 4.5, 25.0, 1.5).value == pytest.approx(22 * MOHM)


def test_without_a_threshold_the_form_is_said_to_understate():
    r = rds_on(TABLE, 1.9, 25.0, 1.5)
    assert r.value == pytest.approx(29 * MOHM * 2.5 / 1.9)   # V_th taken as 0 V
    assert any("understates" in a for a in r.assumptions)


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


@given(points=physical_tables(), vgs=st.floats(0.5, 12.0), tj=st.floats(-40.0, 175.0),
       th=st.lists(st.floats(0.2, 2.0), min_size=3, max_size=3))
def test_corners_are_ordered(points, vgs, tj, th):
    # With each corner's own threshold (min <= typ <= max) as well as without one.
    from packwarden.model.rdson import threshold_at
    th = tuple(sorted(th))
    for vt in ((None, None, None), th):
        mn, ty, mx = (rds_on(points, vgs, tj, 1.5, corner=c,
                             vth=None if vt[0] is None else threshold_at(vt, c)).value
                      for c in ("min", "typ", "max"))
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
