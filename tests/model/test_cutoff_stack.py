"""The temperature cut-offs' tolerance stack: what each tolerance alone moves a trip by.

Checked against the NTC beta form of docs/references.md ("Temperature sensing and balancing"),
R(T) = R25·exp(B·(1/T − 1/T25)), solved here for T by hand, and the divider rule (Ohm's law):
the thermistor's resistance at a threshold share s of the reference with bias R_b above it is
R_b·s/(1 − s) [published: voltage divider].
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from packwarden.engine import lint

REPO = Path(__file__).resolve().parents[2]
DRILL = REPO / "example_designs" / "bramblewood-drill-4s1p-lfp.yaml"


def _trip(r25: float, beta: float, bias: float, share: float) -> float:
    r = bias * share / (1.0 - share)
    return 1.0 / (1.0 / 298.15 + math.log(r / r25) / beta) - 273.15


def test_the_drill_packs_charge_cold_stack_by_hand() -> None:
    run = lint([str(DRILL)])
    [d] = run.designs
    [cold] = [c for c in d.temperature_cutoffs if c["name"] == "charge_cold"]
    # docs/references.md: the example's 10 kΩ ±1 %, B 3435 K ±1 % thermistor on a 10 kΩ ±1 %
    # pull-up, charge_cold 71–72 % of the reference (typ 71.5 %)
    typ = _trip(10e3, 3435.0, 10e3, 0.715)
    assert cold["typ"] == pytest.approx(typ, abs=1e-6)
    by_hand = {
        "r25": sorted(_trip(r, 3435.0, 10e3, 0.715) - typ for r in (9.9e3, 10.1e3)),
        "beta": sorted(_trip(10e3, b, 10e3, 0.715) - typ for b in (3435 * 0.99, 3435 * 1.01)),
        "bias": sorted(_trip(10e3, 3435.0, b, 0.715) - typ for b in (9.9e3, 10.1e3)),
        "threshold": sorted(_trip(10e3, 3435.0, 10e3, s) - typ for s in (0.71, 0.72)),
    }
    for name, (lo, hi) in by_hand.items():
        got = cold["tolerance_stack"][name]
        assert got[0] == pytest.approx(lo, abs=1e-5), name
        assert got[1] == pytest.approx(hi, abs=1e-5), name
    # the one-at-a-time shares add up to about the corner spread [derived: small spreads]
    below = sum(-lo for lo, _ in by_hand.values())
    assert typ - cold["min"] == pytest.approx(below, rel=0.05)


def test_the_stack_is_in_the_json_and_the_review_report() -> None:
    import json
    import subprocess
    import sys
    out = subprocess.run([sys.executable, "-m", "packwarden.cli", "check", "-f", "json", str(DRILL)],
                         capture_output=True, text=True, cwd=REPO)
    [d] = json.loads(out.stdout)["designs"]
    names = {c["name"] for c in d["temperature_cutoffs"]}
    assert names == {"charge_cold", "charge_hot", "discharge_cold", "discharge_hot"}
    html = subprocess.run([sys.executable, "-m", "packwarden.cli", "check", "-f", "html", str(DRILL)],
                          capture_output=True, text=True, cwd=REPO).stdout
    assert "Temperature cut-offs and their tolerance stack" in html
    assert "R25 -0.22/+0.22 K" in html
