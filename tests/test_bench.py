"""The speed benchmark runs end to end on a tiny corpus and reports every section.

Speed targets live in the benchmark (``bench/run.py``), never here: these checks assert that each
measurement was taken and came out as a positive number of the right kind, not how fast it was.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parent.parent
KINDS = ("single", "pack4s2p", "large")


@pytest.fixture(scope="module")
def results(tmp_path_factory: pytest.TempPathFactory) -> dict:
    out = tmp_path_factory.mktemp("bench") / "results.json"
    proc = subprocess.run([sys.executable, str(REPO / "bench" / "run.py"), "--tiny", "--out", str(out)],
                          capture_output=True, text=True, timeout=900)
    assert proc.returncode == 0, proc.stdout[-3000:] + proc.stderr[-3000:]
    assert "PASS" in proc.stdout or "MISS" in proc.stdout  # the table of targets was printed
    return json.loads(out.read_text(encoding="utf-8"))


def _positive(x) -> bool:
    return isinstance(x, (int, float)) and not isinstance(x, bool) and x > 0


def test_the_corpus_holds_every_kind_of_design(results: dict) -> None:
    corpus = results["corpus"]
    assert all(corpus[k] >= 1 for k in KINDS) and corpus["scaling"] >= 2
    assert corpus["batch_designs"] == sum(corpus[k] for k in KINDS)
    assert "cached" in results["bytecode"]["measured"]


def test_cold_single_file_lint_with_and_without_bytecode(results: dict) -> None:
    for kind in KINDS:
        cold = results["cold"][kind]
        assert cold["components"] >= 7
        for variant in ("cached", "uncached"):
            assert _positive(cold[variant]["median_s"]) and cold[variant]["runs"] >= 1


def test_batch_throughput_and_memory(results: dict) -> None:
    b = results["batch"]
    assert b["designs"] == results["corpus"]["batch_designs"]
    for key in ("wall_s", "cpu_s", "designs_per_s", "cpu_per_design_s", "max_single_process_rss_mb"):
        assert _positive(b[key]), key
    if sys.platform.startswith("linux"):
        assert _positive(b["peak_tree_rss_mb"]) and _positive(b["peak_tree_pss_mb"])
        assert b["processes"] >= 1


def test_the_libyaml_floor(results: dict) -> None:
    floor = results["floor"]
    assert all(_positive(floor["single"][k]) for k in KINDS)
    assert floor["batch_compose"]["designs"] == results["batch"]["designs"]
    assert _positive(floor["batch_compose"]["per_design_s"])


def test_scaling_against_component_count(results: dict) -> None:
    points = results["scaling"]["points"]
    counts = [p["components"] for p in points]
    assert counts == sorted(counts) and counts[0] == 10 and len(counts) >= 2
    assert all(_positive(p["lint_s"]) and _positive(p["compose_s"]) for p in points)
    assert results["scaling"]["decade_ratios"]  # 10 -> 100 at least
    assert _positive(results["scaling"]["worst_decade_ratio"])


def test_monte_carlo(results: dict) -> None:
    for kind in KINDS:
        mc = results["monte_carlo"][kind]
        assert _positive(mc["median_s"]) and mc["samples"] >= 1000
    assert all(_positive(m["median_s"]) for m in results["monte_carlo_process"].values())


def test_every_target_has_a_verdict(results: dict) -> None:
    names = " ".join(name for name, _, _ in results["targets"])
    for target in ("parse floor", "faster than peer", "cold single-file", "10x components",
                   "peak memory", "Monte Carlo", "yamllint", "warm re-lint"):
        assert target in names
    assert {verdict for _, _, verdict in results["targets"]} <= {"PASS", "MISS", "n/a"}


def _installed(peer: dict, name: str) -> None:
    """Fail in CI, else skip, when the benchmark could not run the peer ``name``."""
    if not peer["available"]:
        if os.environ.get("CI"):
            pytest.fail(f"{name} is required in CI: {peer['reason']}")
        pytest.skip(f"{name} not available: {peer['reason']}")


def test_the_peer_check_jsonschema(results: dict) -> None:
    peer = results["peer"]
    _installed(peer, "check-jsonschema")
    assert all(_positive(peer["single"][k]["median_s"]) for k in KINDS)
    assert peer["batch"]["designs"] == results["batch"]["designs"]
    assert _positive(peer["batch"]["designs_per_s"])


def test_where_the_time_goes(results: dict) -> None:
    # Each stage of the lint was timed for every kind of design, and they add up to the lint.
    for kind in KINDS:
        k = results["stages"][kind]
        assert k["designs"] >= 1 and _positive(k["floor_s"])
        assert set(k["stages_s"]) == {"load", "validate", "libraries", "netlist", "model", "rules"}
        assert all(_positive(v) for v in k["stages_s"].values())
        assert abs(sum(k["stages_s"].values()) - k["lint_s"]) < 1e-9
        assert abs(k["ratio"] - k["lint_s"] / k["floor_s"]) < 1e-9


def test_the_start_up_floor(results: dict) -> None:
    # Each step of what every check process does before it reads a design was timed.
    floor = results["startup_floor"]
    assert list(floor) == ["interpreter", "libraries", "schema", "schema, full way"]
    assert all(_positive(step["median_s"]) and step["runs"] >= 1 for step in floor.values())


def test_the_editor_re_lint_and_round_trip(results: dict) -> None:
    # A warm re-lint after an edit was timed for every kind of design; over stdio, the edit that
    # fixes the flawed example and the one that brings the flaw back were each answered, never
    # before the 300 ms debounce had passed.
    for kind in KINDS:
        e = results["editor"]["relint"][kind]
        assert e["components"] >= 7 and e["runs"] >= 1 and _positive(e["median_s"])
    trip = results["editor"]["round_trip"]
    if not trip["available"]:
        pytest.skip(trip["reason"])
    for key in ("fix_cleared", "flaw_flagged"):
        assert trip[key]["runs"] >= 1 and trip[key]["min_s"] >= trip["debounce_s"]


def test_the_peer_yamllint(results: dict) -> None:
    # The plain YAML linter timed on the same files as the cold lint, taking turns with it.
    peer = results["yamllint"]
    _installed(peer, "yamllint")
    for kind in KINDS:
        assert _positive(peer["single"][kind]["median_s"])
        assert peer["single"][kind]["runs"] == results["cold"][kind]["cached"]["runs"]


def test_cold_lint_from_a_regular_install_when_this_one_is_editable(results: dict) -> None:
    regular = results["regular"]
    if not regular["editable_here"]:
        assert not regular["available"]
        return
    if regular["reason"].startswith("pip:"):  # pip could not build it here (an offline index)
        pytest.skip(regular["reason"])
    assert regular["available"], regular["reason"]
    for name in ("packwarden", "yamllint"):
        r = regular["single"][name]
        assert _positive(r["median_s"]) and _positive(r["cpu"]["median_s"]) and r["runs"] >= 1
