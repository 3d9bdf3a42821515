"""Temperature protection end to end: the drill pack with and without its thermistor, the cut-off
temperatures in the JSON figures and the review report, and bad temperature inputs as located
input errors (issue 14 item 1, "Done when")."""

from __future__ import annotations

import json
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from packwarden.engine import lint
from packwarden.report import formatter
from packwarden.report.common import RenderOptions

REPO = Path(__file__).resolve().parent.parent
EXAMPLES = REPO / "example_designs"
DRILL = EXAMPLES / "bramblewood-drill-4s1p-lfp.yaml"
DRILL_NO_NTC = EXAMPLES / "flawed" / "bramblewood-no-thermistor.yaml"
ORCHARD = EXAMPLES / "orchard-probe.yaml"
CUTOFFS = [f"{side}_{end}_cutoff_{x}" for side in ("charge", "discharge")
           for end in ("cold", "hot") for x in ("min", "typ", "max")]


def test_the_lfp_tool_pack_with_its_thermistor_is_clean_and_without_it_is_not() -> None:
    run = lint([str(DRILL), str(DRILL_NO_NTC)])
    assert not run.input_errors()
    clean, flawed = run.designs
    assert clean.findings == []
    rules = sorted(f.rule for f in flawed.findings)
    assert rules == ["charge-inhibit-window", "discharge-overtemperature"]
    (f,) = [f for f in flawed.findings if f.rule == "discharge-overtemperature"]
    assert f.severity.value == "error" and f.element == "BT1"
    # the cells' self-heating, worked by hand [derived]: 15 A in one cell of at most 12 mΩ is
    # 2.7 W; through the default 24 K/W that is 64.8 K above the 40 °C ambient
    assert "105 °C" in f.message and "64.8 K" in f.message


def test_the_cut_offs_are_in_the_json_figures_with_their_tolerance_stack() -> None:
    out = json.loads(formatter("json")(lint([str(DRILL)]), RenderOptions()))
    (design,) = out["designs"]
    figures = design["figures"]
    for name in CUTOFFS:
        assert name in figures, name
    for side in ("charge_cold", "charge_hot", "discharge_cold", "discharge_hot"):
        lo, typ, hi = (figures[f"{side}_cutoff_{x}"] for x in ("min", "typ", "max"))
        assert lo < typ < hi, side


def test_the_review_report_states_the_cut_offs() -> None:
    run = lint([str(DRILL)])
    html = formatter("html")(run, RenderOptions())
    for label in ("charge-inhibit cold", "charge-inhibit hot", "discharge cut-off hot",
                  "discharge cut-off cold"):
        assert label in html, label


def test_a_design_without_thermistors_reports_no_cut_offs() -> None:
    text = ORCHARD.read_text(encoding="utf-8")
    start = text.index("  thermistor:")
    end = text.index("storage:")
    stripped = text[:start] + text[end:]
    stripped = stripped.replace("  RT1: {part: OR-NTC-10K, pins: [TH, B-]}", "  # no RT1")
    path = ORCHARD.parent / "_no_thermistor_probe.yaml"
    try:
        path.write_text(stripped, encoding="utf-8")
        (result,) = lint([str(path)]).designs
    finally:
        path.unlink()
    assert not any(name in result.model.figures() for name in CUTOFFS)
    # the declared window is then enforced by nothing: the one new finding
    assert [f.rule for f in result.findings] == ["charge-inhibit-window"]


@pytest.fixture
def repo(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    (tmp_path / ".git").mkdir()
    (tmp_path / "designs" / "parts").mkdir(parents=True)
    for lib in ("orchard-parts.yaml", "ridgeline-parts.yaml", "bramblewood-parts.yaml"):
        shutil.copy(EXAMPLES / "parts" / lib, tmp_path / "designs" / "parts" / lib)
    monkeypatch.chdir(tmp_path)
    return tmp_path


def _check(repo: Path, base: Path, old: str, new: str) -> subprocess.CompletedProcess:
    text = base.read_text(encoding="utf-8")
    assert text.count(old) == 1, old
    path = repo / "designs" / "probe.yaml"
    path.write_text(text.replace(old, new), encoding="utf-8")
    script = Path(sys.executable).parent / "packwarden"
    return subprocess.run([str(script), "check", str(path)], capture_output=True, text=True,
                          encoding="utf-8", cwd=repo)


@pytest.mark.parametrize("old, new, where, says", [
    ("    ntc: RT1\n", "    ntc: RT9\n", ":19:10:", "'RT9' is no component"),
    ("    ntc: RT1\n", "    ntc: R1\n", ":19:10:", "'R1' is a resistor"),
    ("    hot: {min: 35 %, typ: 35.5 %, max: 36 %}", "    hot: {min: 75 %, typ: 75.5 %, max: 76 %}",
     ":22:10:", "is not below cold"),
    ("    bias: {typ: 10 kΩ, tol: 1 %}", "    bias: {typ: -10 kΩ, tol: 1 %}", ":20:17:",
     "out of physics"),
])
def test_a_bad_charger_thermistor_is_one_located_input_error(repo, old, new, where, says) -> None:
    proc = _check(repo, ORCHARD, old, new)
    assert proc.returncode == 2, proc.stdout + proc.stderr
    # the one input error; a thermistor the charger no longer reads leaves its contact net
    # single (single-connection-net's warning, a finding, not an input error)
    lines = [line for line in (proc.stdout + proc.stderr).splitlines()
             if "probe.yaml:" in line and "single-connection-net" not in line]
    assert len(lines) == 1 and where in lines[0] and says in lines[0], lines
    assert "Traceback" not in proc.stderr and "internal error in" not in proc.stdout


def test_a_protector_input_without_thresholds_is_a_located_input_error(repo) -> None:
    lib = repo / "designs" / "parts" / "bramblewood-parts.yaml"
    text = lib.read_text(encoding="utf-8")
    start = text.index("      charge_cold:")
    end = text.index("\n\n  BW-NTC-10K:")
    lib.write_text(text[:start] + text[end + 1:], encoding="utf-8")
    proc = _check(repo, DRILL, "libraries: [parts/bramblewood-parts.yaml]",
                  "libraries: [parts/bramblewood-parts.yaml]")
    assert proc.returncode == 2, proc.stdout
    out = proc.stdout + proc.stderr
    assert "bramblewood-parts.yaml:" in out and "give at least one threshold" in out, out
    assert "Traceback" not in out


def test_a_thermistor_that_puts_a_cut_off_beyond_any_pack_is_a_located_input_error(repo) -> None:
    # 10 Ω at 25 °C where 10 kΩ was meant: the 71.5 % threshold needs 25 kΩ, which such a
    # thermistor reaches only far below -100 °C [derived from the beta form]
    proc = _check(repo, DRILL, "RT1: {part: BW-NTC-10K, pins: [TS, B-]}",
                  "RT1: {kind: ntc, r25: 10 Ω, beta: 3435 K, pins: [TS, B-]}")
    assert proc.returncode == 2, proc.stdout
    lines = [line for line in proc.stdout.splitlines() if "probe.yaml:" in line]
    assert len(lines) == 1 and "outside -100 to 200 °C" in lines[0], lines
    assert "Traceback" not in proc.stderr and "internal error in" not in proc.stdout
