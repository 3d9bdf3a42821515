"""On-resistances kept across models (issue 19): a kept value is the one ``rdson.rds_on`` gives,
bit for bit, and agrees with the triode form and the data sheet's hot ratio computed here
independently; other inputs get their own, a zero is never answered from the store, and the
store is bounded. A design linted with the store full and with it empty reports the same figures.
"""

from __future__ import annotations

import pytest

from packwarden.model import path, rdson
from tests.model.linted import linted_model

EXAMPLES = "example_designs"
TABLE = ((4.5, 0.018, None), (10.0, 0.013, None))


@pytest.fixture(autouse=True)
def forgotten():
    # The paths' memos too: a memo kept from an earlier test's lint of the same netlist would
    # answer every on-resistance before the store is asked.
    path._RDS_KEPT.clear()
    path._MEMOS.clear()
    yield
    path._RDS_KEPT.clear()
    path._MEMOS.clear()


def fresh(points, *args):
    res = rdson.rds_on(points, *args)
    return res.value, res.assumptions


def test_a_kept_value_is_the_computed_one_and_agrees_with_the_triode_form():
    args = (2.45, 25.0, 1.5, 125.0, "typ", 2.0)
    first = path.kept_rds_on(TABLE, *args)
    assert path.kept_rds_on(TABLE, *args) is first
    assert repr(first) == repr(fresh(TABLE, *args))  # every float to the last bit
    # Triode region: R_DS = 1/(k (V_GS - V_t)) through the 4.5 V row, 18 mΩ x 2.5 / 0.45 = 100 mΩ
    # [published: Sedra & Smith, the MOSFET's triode region, docs/references.md "MOSFETs"]
    assert first[0] == pytest.approx(0.100, rel=1e-9)


def test_the_hot_ratio_is_kept_with_its_temperature():
    cold = path.kept_rds_on(TABLE, 10.0, 25.0, 1.5, 125.0, "typ", 2.0)
    hot = path.kept_rds_on(TABLE, 10.0, 125.0, 1.5, 125.0, "typ", 2.0)
    # the data sheet's normalised curve: R(125 °C) = ratio x R(25 °C) [published: data sheet
    # definition of the normalised on-resistance]; 13 mΩ x 1.5
    assert cold[0] == pytest.approx(0.013, rel=1e-12)
    assert hot[0] == pytest.approx(0.0195, rel=1e-12)


@pytest.mark.parametrize("other", [
    (TABLE[:1], 4.0, 25.0, 1.5, 125.0, "typ", 2.0),
    (TABLE, 4.1, 25.0, 1.5, 125.0, "typ", 2.0),
    (TABLE, 4.0, 26.0, 1.5, 125.0, "typ", 2.0),
    (TABLE, 4.0, 25.0, 1.4, 125.0, "typ", 2.0),
    (TABLE, 4.0, 25.0, 1.5, 100.0, "typ", 2.0),
    (TABLE, 4.0, 25.0, 1.5, 125.0, "max", 2.0),
    (TABLE, 4.0, 25.0, 1.5, 125.0, "typ", 2.2)])
def test_any_other_input_is_computed_afresh(other):
    path.kept_rds_on(TABLE, 4.0, 25.0, 1.5, 125.0, "typ", 2.0)
    assert repr(path.kept_rds_on(*other)) == repr(fresh(*other))


def test_a_zero_is_never_answered_from_the_store():
    # -0.0 equals 0.0 as a key, yet "-0 °C" would print in an assumption
    for tj in (0.0, -0.0):
        assert repr(path.kept_rds_on(TABLE, 4.0, tj, 1.5, 125.0, "typ", 2.0)) == repr(
            fresh(TABLE, 4.0, tj, 1.5, 125.0, "typ", 2.0))
    assert not path._RDS_KEPT


def test_the_store_is_bounded():
    for k in range(path.RDS_KEPT_MAX + 5):
        path.kept_rds_on(TABLE, 4.0 + k / 1e4, 25.0, 1.5, 125.0, "typ", 2.0)
    assert len(path._RDS_KEPT) == path.RDS_KEPT_MAX


@pytest.mark.parametrize("design", ["orchard-probe.yaml", "ridgeline-tool-4s2p.yaml"])
def test_a_design_reads_the_same_figures_from_a_full_store_and_an_empty_one(design):
    linted_model(f"{EXAMPLES}/{design}")  # fills the store
    held = len(path._RDS_KEPT)
    first = linted_model(f"{EXAMPLES}/{design}").figures()
    assert held and len(path._RDS_KEPT) == held  # the second lint read every value from it
    path._RDS_KEPT.clear()
    again = linted_model(f"{EXAMPLES}/{design}").figures()
    assert repr(first) == repr(again)
