"""Temperature-input thresholds given as voltages (against a toleranced reference, or as the
voltage a sourced current makes across the thermistor) and their releases (hysteresis), end to
end through the command's JSON figures, and the located input errors of their misuse.

Outside sources:
- The beta form's vectors, docs/references.md "Temperature sensing and balancing" (10 kΩ,
  B 3435 K → 28.70 kΩ at 0 °C, 4.847 kΩ at 45 °C, 2.981 kΩ at 60 °C, 46.29 kΩ at −10 °C
  [published form, derived vectors]): a threshold placed where the divider (or the sourced
  current) reads that resistance must trip at that temperature. The voltages are worked by hand
  here from the vectors with Ohm's law and the divider rule, not by the model.
- R25 is by definition the resistance at 25 °C [published: the makers' standard form]: a release
  at 50 % of a divider with a bias equal to R25 releases at 25 °C.
"""

from __future__ import annotations

import json
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parent.parent
EXAMPLES = REPO / "example_designs"

# (°C, ohms), docs/references.md
R_0C, R_45C, R_60C, R_M10C = 28.70e3, 4.847e3, 2.981e3, 46.29e3
REF = 3.3  # V, a reference chosen for the test
EXACT_NTC = "{kind: ntc, r25: 10 kΩ, beta: 3435 K, pins: [TH, B-]}"


def _divider(r: float) -> float:
    """The pin voltage of a 10 kΩ bias from REF over a thermistor of ``r`` (hand-worked)."""
    return REF * r / (r + 10e3)


@pytest.fixture
def repo(tmp_path: Path) -> Path:
    (tmp_path / ".git").mkdir()
    shutil.copytree(EXAMPLES / "parts", tmp_path / "parts")
    return tmp_path


def _check(repo: Path, base: str, subs: list[tuple[str, str]], lib: tuple[str, str, str] | None
           = None, fmt: str = "json") -> subprocess.CompletedProcess:
    text = (EXAMPLES / base).read_text(encoding="utf-8")
    for old, new in subs:
        assert text.count(old) == 1, old
        text = text.replace(old, new)
    if lib is not None:
        name, old, new = lib
        path = repo / "parts" / name
        lib_text = path.read_text(encoding="utf-8")
        assert lib_text.count(old) == 1, old
        path.write_text(lib_text.replace(old, new), encoding="utf-8")
    (repo / "probe.yaml").write_text(text, encoding="utf-8")
    script = Path(sys.executable).parent / "packwarden"
    proc = subprocess.run([str(script), "check", "-f", fmt, "probe.yaml"], capture_output=True,
                          text=True, encoding="utf-8", cwd=repo)
    assert "Traceback" not in proc.stderr and "internal error in" not in proc.stdout
    return proc


def _figures(proc: subprocess.CompletedProcess) -> dict:
    assert proc.returncode in (0, 1), proc.stdout + proc.stderr
    (design,) = json.loads(proc.stdout)["designs"]
    return design["figures"]


ORCHARD_THERMISTOR = ("    cold: {min: 71 %, typ: 71.5 %, max: 72 %}    # stops charging below about 3 °C\n"
                      "    hot: {min: 35 %, typ: 35.5 %, max: 36 %}     # and above about 41 °C\n")


def _orchard(repo: Path, thresholds: str, fmt: str = "json") -> subprocess.CompletedProcess:
    return _check(repo, "orchard-probe.yaml", [
        (ORCHARD_THERMISTOR, thresholds),
        ("    bias: {typ: 10 kΩ, tol: 1 %}\n", "    bias: 10 kΩ\n"),
        ("RT1: {part: OR-NTC-10K, pins: [TH, B-]}", f"RT1: {EXACT_NTC}")], fmt=fmt)


def test_charger_thresholds_in_volts_trip_at_the_vectors_temperatures(repo) -> None:
    proc = _orchard(repo, f"    reference: {REF} V\n"
                          f"    cold_voltage: {_divider(R_0C):.5f} V\n"
                          f"    hot_voltage: {_divider(R_45C):.5f} V\n")
    f = _figures(proc)
    # four printed digits of the vectors: some 0.01 K; five of the voltage: less
    assert f["charge_cold_cutoff_typ"] == pytest.approx(0.0, abs=0.03)
    assert f["charge_hot_cutoff_typ"] == pytest.approx(45.0, abs=0.03)
    assert f["charge_cold_cutoff_min"] == pytest.approx(f["charge_cold_cutoff_max"], abs=1e-9)


def test_a_reference_tolerance_widens_the_cut_off_both_ways(repo) -> None:
    proc = _orchard(repo, f"    reference: {{typ: {REF} V, tol: 2 %}}\n"
                          f"    cold_voltage: {_divider(R_0C):.5f} V\n"
                          f"    hot_voltage: {_divider(R_45C):.5f} V\n")
    f = _figures(proc)
    # a higher reference puts the same threshold at a lower share: a colder thermistor
    # (a higher resistance) is needed to reach it, so the cold cut-off moves down
    assert f["charge_cold_cutoff_min"] < -0.5 < 0.5 < f["charge_cold_cutoff_max"]
    assert f["charge_hot_cutoff_min"] < 44.5 < 45.5 < f["charge_hot_cutoff_max"]


def test_releases_are_reported_where_given(repo) -> None:
    # a 10 kΩ bias over a 10 kΩ-at-25 °C thermistor reads 50 % at 25 °C, by R25's definition
    proc = _orchard(repo, "    cold: 74.16 %\n    hot: 32.65 %\n"
                          "    cold_release: 50 %\n    hot_release: 50 %\n")
    f = _figures(proc)
    assert f["charge_cold_release_typ"] == pytest.approx(25.0, abs=1e-6)
    assert f["charge_hot_release_typ"] == pytest.approx(25.0, abs=1e-6)
    # 74.16 % and 32.65 % are 28.70 kΩ and 4.847 kΩ against 10 kΩ, to four digits
    assert f["charge_cold_cutoff_typ"] == pytest.approx(0.0, abs=0.03)
    assert f["charge_hot_cutoff_typ"] == pytest.approx(45.0, abs=0.03)


def test_no_release_no_release_figure(repo) -> None:
    f = _figures(_check(repo, "orchard-probe.yaml", []))
    assert not any("release" in name for name in f)


# The drill pack's protector, turned into an input that sources 20 µA into the thermistor and
# compares the pin voltage with levels in volts: V = I·R (Ohm's law) at each vector.
CURRENT = 20e-6
DRILL_INPUT = """      pull_up: {typ: 10 kΩ, tol: 1 %}
      charge_cold: {min: 71 %, typ: 71.5 %, max: 72 %}       # about 3 °C
      charge_hot: {min: 35 %, typ: 35.5 %, max: 36 %}        # about 41 °C
      discharge_cold: {min: 85.5 %, typ: 86 %, max: 86.5 %}  # about -16 °C
      discharge_hot: {min: 25 %, typ: 25.5 %, max: 26 %}     # about 56 °C
      release:                                               # each threshold's hysteresis
        charge_cold: {min: 66.5 %, typ: 67 %, max: 67.5 %}   # charging resumes about 8 °C
        charge_hot: {min: 39.5 %, typ: 40 %, max: 40.5 %}    # about 36 °C
        discharge_cold: {min: 82.5 %, typ: 83 %, max: 83.5 %} # about -11 °C
        discharge_hot: {min: 28 %, typ: 28.5 %, max: 29 %}   # about 51 °C
"""


def test_a_sourced_current_input_trips_at_the_vectors_temperatures(repo) -> None:
    sourced = (f"      bias_current: 20 µA\n"
               f"      volts:\n"
               f"        charge_cold: {CURRENT * R_0C:.6f} V\n"
               f"        charge_hot: {CURRENT * R_45C:.6f} V\n"
               f"        discharge_cold: {CURRENT * R_M10C:.6f} V\n"
               f"        discharge_hot: {CURRENT * R_60C:.6f} V\n"
               f"      release_volts:\n"
               f"        discharge_hot: {CURRENT * 10e3:.6f} V\n")
    proc = _check(repo, "bramblewood-drill-4s1p-lfp.yaml",
                  [("RT1: {part: BW-NTC-10K, pins: [TS, B-]}",
                    "RT1: {kind: ntc, r25: 10 kΩ, beta: 3435 K, pins: [TS, B-]}")],
                  lib=("bramblewood-parts.yaml", DRILL_INPUT, sourced))
    f = _figures(proc)
    for name, celsius in (("charge_cold", 0.0), ("charge_hot", 45.0), ("discharge_cold", -10.0),
                          ("discharge_hot", 60.0)):
        assert f[f"{name}_cutoff_typ"] == pytest.approx(celsius, abs=0.03), name
    # 20 µA across 10 kΩ: R25, so 25 °C
    assert f["discharge_hot_release_typ"] == pytest.approx(25.0, abs=1e-6)


@pytest.mark.parametrize("thresholds, says", [
    ("    cold_voltage: 2.4 V\n    hot_voltage: 1.1 V\n",
     "a threshold in volts needs the input's reference voltage"),
    ("    reference: 3.3 V\n    cold_voltage: 3.5 V\n    hot_voltage: 1.1 V\n",
     "is not below the reference"),
    ("    cold: 74 %\n    hot: 33 %\n    cold_release: 80 %\n",
     "the release of cold is not below its threshold"),
    ("    cold: 74 %\n    hot: 33 %\n    hot_release: 20 %\n",
     "the release of hot is not above its threshold"),
    ("    cold: 74 %\n", "give the hot threshold"),
    ("    reference: 3.3 V\n    cold: 74 %\n    cold_voltage: 2.4 V\n    hot: 33 %\n",
     "cold is given both as a share and as a voltage"),
    ("    cold: 74 %\n    hot: 33 %\n    cold_voltage: 2.4 A\n", "is in amperes"),
])
def test_misused_threshold_forms_are_one_located_input_error(repo, thresholds, says) -> None:
    proc = _orchard(repo, thresholds, fmt="text")
    assert proc.returncode == 2, proc.stdout + proc.stderr
    lines = [line for line in (proc.stdout + proc.stderr).splitlines() if "probe.yaml:" in line]
    assert len(lines) == 1 and says in lines[0], lines


@pytest.mark.parametrize("block, where, says", [
    ("      pull_up: 10 kΩ\n      volts: {charge_cold: 2.3 V}\n",
     "temperature_input.volts.charge_cold:", "needs the input's reference voltage"),
    ("      pull_up: 10 kΩ\n      bias_current: 20 µA\n      volts: {charge_cold: 0.5 V}\n",
     "temperature_input.bias_current:", "an input that sources a current has no pull_up"),
    ("      pull_up: 10 kΩ\n      reference: 3.3 V\n      volts: {charge_cold: 2.3 V}\n"
     "      release_volts: {charge_cold: 2.5 V}\n",
     "temperature_input.release_volts.charge_cold:", "the release of charge_cold is not below"),
])
def test_a_misused_protector_input_is_one_located_input_error_in_its_library(
        repo, block, where, says) -> None:
    proc = _check(repo, "bramblewood-drill-4s1p-lfp.yaml", [], fmt="text",
                  lib=("bramblewood-parts.yaml", DRILL_INPUT, block))
    assert proc.returncode == 2, proc.stdout + proc.stderr
    lines = [line for line in (proc.stdout + proc.stderr).splitlines()
             if line.startswith("parts/bramblewood-parts.yaml:")]
    assert len(lines) == 1 and where in lines[0] and says in lines[0], lines
