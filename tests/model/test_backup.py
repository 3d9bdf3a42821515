"""Second-level (backup) overvoltage protection: the window against the primary and the cell, the
heater's drive, who watches for an open tap wire, and the located errors of bad input.

Expected values are worked by hand from the part data (docs/references.md, "Over-current levels
and second-level protection": the ordering [practice], the vectors [derived]).
"""

from __future__ import annotations

from pathlib import Path

import pytest

from packwarden.testing import lint_variant

REPO = Path(__file__).resolve().parents[2]
FLAWED = REPO / "example_designs/flawed/ridgeline-backup-below-primary.yaml"
LIBRARY = REPO / "example_designs/parts/ridgeline-parts.yaml"
LIBRARIES = ("libraries: [../parts/ridgeline-parts.yaml]", "libraries: [parts/ridgeline-parts.yaml]")
FLAW = "detect: {typ: 4.300 V, tol: 25 mV}"


def _run(tmp_path, replace=(), lib_replace=()):
    return lint_variant(tmp_path, FLAWED, LIBRARY, replace=(LIBRARIES, *replace),
                        lib_replace=lib_replace)


def _model(tmp_path, replace=(), lib_replace=()):
    run = _run(tmp_path, replace, lib_replace)
    assert not run.input_errors(), [str(e) for e in run.input_errors()]
    (result,) = run.designs
    assert not result.internal, result.internal
    return result.model


def test_the_window_against_the_primary_and_the_cell_by_hand(tmp_path):
    # Vector [derived]: primary overcharge 4.275 V ±25 mV -> max 4.300 V; backup 4.350 V ±20 mV
    # -> 4.330-4.370 V: 30 mV clear of the primary, 20 mV above the cell's 4.35 V limit.
    m = _model(tmp_path, [(FLAW, "detect: {typ: 4.350 V, tol: 20 mV}")])
    (b,) = m.backup_protection
    assert (b.detect.min, b.detect.max) == pytest.approx((4.330, 4.370), abs=1e-12)
    assert b.primary_max == pytest.approx(4.300, abs=1e-12)
    assert b.above_primary == pytest.approx(0.030, abs=1e-9)
    assert b.below_limit == pytest.approx(-0.020, abs=1e-9)
    assert b.taps == (("cell1", "B1", 1, 1), ("cell2", "B2", 2, 2), ("cell3", "B3", 3, 3),
                      ("cell4", "B+", 4, 4))
    (d,) = b.drives
    assert (d.fuse, d.via, d.in_path) == ("F1", "Q5", True)


def test_the_heater_drive_by_hand(tmp_path):
    # Vector [derived]: one cell at the backup's lowest detection 4.305 V, three at U1's
    # over-discharge detection minimum 2.650 V -> 12.255 V; over the heater's highest resistance
    # 1.0 Ω × 1.2: 12.255² / 1.2 = 125.15 W.
    m = _model(tmp_path, [(FLAW, "detect: {typ: 4.325 V, tol: 20 mV}")])
    (b,) = m.backup_protection
    assert b.drive_voltage == pytest.approx(12.255, abs=1e-9)
    assert b.drives[0].power == pytest.approx(12.255 ** 2 / 1.2, rel=1e-12)
    assert 125.1 < b.drives[0].power < 125.2


def test_a_primary_that_detects_an_open_tap_is_enough(tmp_path):
    # The backup without open-tap detection, the primary with it: U1 watches, no warning.
    run = _run(tmp_path, [(FLAW, "detect: {typ: 4.325 V, tol: 20 mV}"),
                          ("    open_tap_detection: true\n    open_tap_delay: {min: 2 s, typ: 4 s, "
                           "max: 6 s}\n", "")],
               lib_replace=[("    gate_drive: 12 V                   # clamped gate driver",
                             "    open_tap_detection: true\n    gate_drive: 12 V  #")])
    (result,) = run.designs
    assert result.model.open_tap_watchers == ("U1",)
    assert not [f for f in result.findings if f.rule == "backup-overvoltage"]


@pytest.mark.parametrize("old, new, where, says", [
    ("    open_tap_detection: true\n", "",
     "open_tap_delay", "an open-tap delay needs open_tap_detection: true"),
    ("    cells: 4\n    overvoltage:", "    cells: 1\n    overvoltage:",
     "cells", "must be at least 2"),
    ("detect: {typ: 4.300 V, tol: 25 mV}", "detect: {typ: 4.300 V, tol: 25 mA}",
     "detect", ""),
])
def test_bad_input_is_one_located_line(tmp_path, old, new, where, says):
    run = _run(tmp_path, [(old, new)])
    errors = [str(e) for e in run.input_errors()]
    assert len(errors) == 1, errors
    (text,) = errors
    line = int(text.split(":")[1])
    written = (tmp_path / FLAWED.name).read_text(encoding="utf-8").splitlines()[line - 1]
    assert where in written and says in text
    assert "Traceback" not in text and "internal" not in text.lower()
