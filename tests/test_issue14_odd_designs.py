"""Odd but valid designs, and bad ones, for everything issue 14 added (thermistors, temperature
inputs, balancing, the charge side, backup protection): each gives findings or one located input
error with exit code 2, never a traceback or an internal error.

Each case is an example design with one change made to its YAML data, linted by the command in a
repository of its own (the example part libraries copied beside it)."""

from __future__ import annotations

import json
import shutil
import subprocess
import sys
from pathlib import Path

import pytest
import yaml

REPO = Path(__file__).resolve().parent.parent
EXAMPLES = REPO / "example_designs"


def _ntc_far_end_on_a_tap(d):
    d["components"]["RT1"]["pins"] = ["TS", "B1"]


def _temperature_pin_unconnected(d):
    del d["components"]["U1"]["pins"]["temperature"]


def _thermistor_on_the_charger_only(d):
    del d["components"]["U1"]["pins"]["temperature"]
    d["components"]["RT1"]["pins"] = ["TH", "B-"]
    d["charger"]["thermistor"] = {"ntc": "RT1", "bias": "10 kΩ", "cold": "71.5 %",
                                  "hot": "35.5 %"}


def _no_charger(d):
    del d["charger"]


def _bleed_resistor_of_zero_ohms(d):
    d["components"]["R11"] = {"kind": "resistor", "value": "0 Ω", "power": "0.5 W",
                              "pins": ["B1", "BAL1"]}


def _backup_named_for_thirteen_cells_on_four(d):
    d["components"]["U2"]["cells"] = 13


def _heater_left_open(d):
    d["components"]["F1"]["pins"]["heater"] = "FLOAT"


def _backup_output_nowhere(d):
    d["components"]["U2"]["pins"]["output"] = "NOWHERE"


def _lto_cell(d):
    d["components"]["BT1"] = {
        "kind": "cell", "chemistry": "lto", "capacity": "2 Ah", "internal_resistance": "20 mΩ",
        "voltage": {"nominal": "2.3 V"}, "max_current": {"discharge": "10 A", "charge": "2 A"},
        "pins": {"pos": "B+", "neg": "B-"}}


#: (name, example design, change, the rule ids that must be among the findings)
VALID = [
    ("ntc far end on a tap", "bramblewood-drill-4s1p-lfp.yaml", _ntc_far_end_on_a_tap,
     {"discharge-overtemperature", "charge-inhibit-window"}),
    ("temperature pin unconnected", "bramblewood-drill-4s1p-lfp.yaml",
     _temperature_pin_unconnected, {"discharge-overtemperature"}),
    ("thermistor on the charger only", "bramblewood-drill-4s1p-lfp.yaml",
     _thermistor_on_the_charger_only, {"discharge-overtemperature"}),
    ("regen and no charger", "flawed/ebike-regen-trips-charge.yaml", _no_charger,
     {"charge-current-window"}),
    ("13S pack with no charger", "thistledown-ebike-13s4p.yaml", _no_charger, set()),
    ("a 0 Ω bleed resistor", "thistledown-ebike-13s4p.yaml", _bleed_resistor_of_zero_ohms,
     {"support-network"}),
    ("a 13-cell backup on a 4S stack", "flawed/ridgeline-backup-below-primary.yaml",
     _backup_named_for_thirteen_cells_on_four, {"unconnected-pin"}),
    ("a heater fuse whose heater is open", "flawed/ridgeline-backup-below-primary.yaml",
     _heater_left_open, {"single-connection-net"}),
    ("a backup whose output goes nowhere", "flawed/ridgeline-backup-below-primary.yaml",
     _backup_output_nowhere, {"backup-overvoltage"}),
]


@pytest.fixture
def repo(tmp_path: Path) -> Path:
    (tmp_path / ".git").mkdir()
    shutil.copytree(EXAMPLES / "parts", tmp_path / "parts")
    return tmp_path


def _run(repo: Path, base: str, change) -> tuple[subprocess.CompletedProcess, str]:
    data = yaml.safe_load((EXAMPLES / base).read_text(encoding="utf-8"))
    data["libraries"] = [f"parts/{Path(lib).name}" for lib in data["libraries"]]
    change(data)
    path = repo / "odd.yaml"
    path.write_text(yaml.safe_dump(data, allow_unicode=True, sort_keys=False), encoding="utf-8")
    script = Path(sys.executable).parent / "packwarden"
    proc = subprocess.run([str(script), "check", "-f", "json", str(path)], capture_output=True,
                          text=True, encoding="utf-8", cwd=repo)
    out = proc.stdout + proc.stderr
    assert "Traceback" not in out and "internal error in" not in out, out
    return proc, out


@pytest.mark.parametrize("name, base, change, rules", VALID, ids=[v[0] for v in VALID])
def test_an_odd_valid_design_gives_findings_not_a_crash(repo, name, base, change, rules) -> None:
    proc, out = _run(repo, base, change)
    assert proc.returncode in (0, 1), out
    (design,) = json.loads(proc.stdout)["designs"]
    found = {f["rule"] for f in design["findings"]}
    assert rules <= found, (rules, found)


def test_an_lto_cell_on_a_protector_made_for_other_chemistries_is_judged(repo) -> None:
    proc, out = _run(repo, "orchard-probe.yaml", _lto_cell)
    # an input error at the cell, or findings: never a crash (checked in _run)
    assert proc.returncode in (1, 2), out
