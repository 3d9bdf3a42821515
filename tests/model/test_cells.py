"""Default cell windows against docs/references.md "Cell voltage windows" and protector practice."""

import dataclasses
import re

import pytest

from packwarden.model.cells import CHEMISTRIES, DEFAULT_WINDOWS, CellWindow, cell_window

# docs/references.md cell-window table [practice / memory]: (charge, nominal, cut-off) ranges in volts.
RANGES = {
    "lco": ((4.20, 4.20), (3.6, 3.7), (2.5, 3.0)),
    "nmc": ((4.20, 4.20), (3.6, 3.7), (2.5, 3.0)),
    "nca": ((4.20, 4.20), (3.6, 3.7), (2.5, 3.0)),
    "lfp": ((3.60, 3.65), (3.2, 3.3), (2.5, 2.5)),
    "lmo": ((4.20, 4.20), (3.7, 3.8), (3.0, 3.0)),
    "lto": ((2.7, 2.85), (2.3, 2.4), (1.5, 1.8)),
}


def test_the_six_chemistries_are_there():
    assert set(CHEMISTRIES) == set(RANGES)


@pytest.mark.parametrize("chem", sorted(RANGES))
def test_values_lie_in_the_reference_ranges(chem):
    w = cell_window(chem)
    (c_lo, c_hi), (n_lo, n_hi), (u_lo, u_hi) = RANGES[chem]
    assert c_lo <= w.charge <= c_hi
    assert n_lo <= w.nominal <= n_hi
    assert u_lo <= w.cutoff <= u_hi


@pytest.mark.parametrize("chem", ["lco", "nmc", "nca"])
def test_typical_data_sheet_limits_for_4v2_cells(chem):
    # A typical cell data sheet [practice]: a charger must never exceed 4.5 V per cell; never
    # discharge below 2.0 V.
    w = cell_window(chem)
    assert w.overcharge_limit == 4.5
    assert w.lower_limit == 2.0


@pytest.mark.parametrize("chem", ["lco", "nmc", "nca", "lmo"])
def test_typical_protector_fits_the_window(chem):
    # Single-cell protector [practice]: overcharge detection 4.25-4.35 V ± 25 mV for 4.2 V cells,
    # over-discharge detection 2.3-2.5 V ± 50 mV. A default that rejected a typical protector
    # would make every design fail.
    w = cell_window(chem)
    assert w.charge < 4.25 - 0.025 and 4.35 + 0.025 < w.overcharge_limit
    assert w.lower_limit <= 2.3 - 0.05


@pytest.mark.parametrize("chem", sorted(RANGES))
def test_ordering_and_sources(chem):
    w = cell_window(chem)
    assert w.lower_limit <= w.cutoff < w.nominal < w.charge < w.overcharge_limit
    for field in ("charge", "nominal", "cutoff", "overcharge_limit", "lower_limit"):
        assert re.search(r"\[(practice|memory|published|derived)\]", w.source(field)), field


def test_windows_are_frozen_and_read_only():
    w = cell_window("nmc")
    with pytest.raises(dataclasses.FrozenInstanceError):
        w.charge = 4.35
    with pytest.raises(TypeError):
        DEFAULT_WINDOWS["nmc"] = w


def test_lookup():
    assert cell_window(" LFP ") is DEFAULT_WINDOWS["lfp"]
    with pytest.raises(KeyError):
        cell_window("nimh")
    with pytest.raises(KeyError):
        cell_window("nmc").source("capacity")


def test_inconsistent_window_is_refused():
    with pytest.raises(ValueError):
        CellWindow("bad", charge=3.6, nominal=3.7, cutoff=2.5, overcharge_limit=4.5,
                   lower_limit=2.0, sources=tuple((f, "[memory]") for f in (
                       "charge", "nominal", "cutoff", "overcharge_limit", "lower_limit")))
    with pytest.raises(ValueError, match="source"):
        CellWindow("bare", charge=4.2, nominal=3.7, cutoff=2.5, overcharge_limit=4.5,
                   lower_limit=2.0)
