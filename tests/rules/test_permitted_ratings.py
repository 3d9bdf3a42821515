"""The cells' discharge rating is judged against the current the protection permits for ever.

The permitted event (docs/references.md "Events in time": with the switches as the sense
resistance, I = V_detect / R_sense(T_J) with the switches at the junction temperature that current
causes) lies below the unheated trip maximum; an outside review measured about 5.49 A
against 7.78 A on the Orchard probe with its own calculator (docs/references.md, outside
review). A cell rated between the two must pass, one rated
below the permitted current must fail (the rating is a library value, so it is changed here).
"""

from __future__ import annotations

from pathlib import Path

import pytest

from packwarden.testing import lint_variant

REPO = Path(__file__).resolve().parents[2]
ORCHARD = REPO / "example_designs" / "orchard-probe.yaml"
LIBRARY = REPO / "example_designs" / "parts" / "orchard-parts.yaml"


def _cell_findings(tmp_path, rating: str):
    run = lint_variant(tmp_path, ORCHARD, LIBRARY, lib_replace=[
        ("max_current: {discharge: 10 A", f"max_current: {{discharge: {rating}")])
    (design,) = run.designs
    return [f for f in design.findings if f.rule == "trip-current-window" and f.key == "max-vs-cell"]


def test_a_cell_rated_between_the_permitted_current_and_the_unheated_trip_passes(tmp_path):
    assert _cell_findings(tmp_path, "6 A") == []


def test_a_cell_rated_below_the_permitted_current_fails(tmp_path):
    (f,) = _cell_findings(tmp_path, "5 A")
    assert "the protection permits 5.47 A for ever, above the cells' discharge rating 5 A" in f.message
    permitted = next(x.value for x in f.figures if x.name == "permitted current")
    assert permitted == pytest.approx(5.49, rel=0.01)  # docs/references.md, outside review
