"""Baselines and --since: fingerprints survive edits, moves of the working folder and a trip through
git; only new findings are reported and counted.

The designs are the example designs; their findings are the ones the rule cases and the examples'
FLAW comments describe (e.g. trip-below-load: a 2.5 A continuous load above the 1.58 A minimum
trip) [derived: the worked trip-current example of docs/references.md, detection voltage over twice the
per-FET on-resistance, at the hot, low-gate-drive corner]. Git is used only through its ordinary
command line, in temporary repositories.
"""

from __future__ import annotations

import json
import os
import shutil
import subprocess
import sys
from collections import Counter
from pathlib import Path

import pytest

from packwarden.baseline import (BASELINE_FORMAT, Entry, compare, entries_of, lint_since,
                                 read_baseline, write_baseline)
from packwarden.engine import Registry, lint
from packwarden.loader import InputError

REPO = Path(__file__).resolve().parent.parent
EXAMPLES = REPO / "example_designs"
CLEAN = EXAMPLES / "orchard-probe.yaml"
TRIP = EXAMPLES / "flawed" / "trip-below-load.yaml"
NO_FUSE = EXAMPLES / "flawed" / "no-fuse.yaml"

GIT_ENV = {"GIT_AUTHOR_NAME": "packwarden tests", "GIT_AUTHOR_EMAIL": "tests@example.invalid",
           "GIT_COMMITTER_NAME": "packwarden tests", "GIT_COMMITTER_EMAIL": "tests@example.invalid",
           "GIT_CONFIG_NOSYSTEM": "1", "GIT_CONFIG_GLOBAL": os.devnull}


def command() -> list[str]:
    # The command's own module, run by this interpreter: the same code path as the installed
    # script (which tests/test_precommit.py runs through pre-commit).
    return [sys.executable, "-m", "packwarden.cli"]


def cli(*args: str, cwd: Path) -> subprocess.CompletedProcess:
    return subprocess.run([*command(), *args], capture_output=True, text=True, encoding="utf-8",
                          cwd=cwd, env={**os.environ, "NO_COLOR": "1"})


def git(*args: str, cwd: Path) -> str:
    if shutil.which("git") is None:
        pytest.skip("git is not installed")
    proc = subprocess.run(["git", *args], cwd=cwd, capture_output=True, text=True,
                          env={**os.environ, **GIT_ENV})
    assert proc.returncode == 0, proc.stderr
    return proc.stdout


@pytest.fixture()
def project(tmp_path: Path) -> Path:
    """A hardware repository: the clean example and two flawed ones with the part library."""
    root = tmp_path / "hw"
    (root / "designs" / "parts").mkdir(parents=True)
    (root / "pyproject.toml").write_text("")  # the project root marker, no packwarden config
    shutil.copy(EXAMPLES / "parts" / "orchard-parts.yaml", root / "designs" / "parts")
    for src in (CLEAN, TRIP, NO_FUSE):
        text = src.read_text(encoding="utf-8").replace("../parts/", "parts/")
        (root / "designs" / src.name).write_text(text, encoding="utf-8")
    return root


@pytest.fixture()
def repo(project: Path) -> Path:
    git("init", "-q", "-b", "main", cwd=project)
    git("add", "-A", cwd=project)
    git("commit", "-q", "-m", "designs rev C", cwd=project)
    return project


def add_flaw(design: Path) -> None:
    """The no-fuse flaw's sibling: a 2.5 A continuous load on the clean example (a new finding),
    with its peak raised to stay above it."""
    text = design.read_text(encoding="utf-8")
    assert "  continuous: 1.2 A\n  peak: {current: 1.6 A" in text
    design.write_text(text.replace("  continuous: 1.2 A\n  peak: {current: 1.6 A",
                                   "  continuous: 2.5 A\n  peak: {current: 3 A"), encoding="utf-8")


# --- files and comparison -----------------------------------------------------------------------

def test_write_and_read_round_trip(project: Path, tmp_path: Path) -> None:
    run = lint([str(project / "designs")])
    path = tmp_path / "baseline.json"
    n = write_baseline(run, path)
    doc = json.loads(path.read_text(encoding="utf-8"))
    assert doc["format"] == BASELINE_FORMAT and n == len(doc["findings"]) == len(run.all_findings())
    assert n >= 3  # trip-below-load has two, no-fuse one
    entries = read_baseline(path)
    assert Counter(e.fingerprint for e in entries) == Counter(f.fingerprint for f in run.all_findings())
    # paths in the file are relative to the checkout, never absolute or to the working folder
    assert {e.file for e in entries} == {"designs/trip-below-load.yaml", "designs/no-fuse.yaml"}
    first = path.read_text(encoding="utf-8")
    assert write_baseline(lint([str(project / "designs")]), path) == n
    assert path.read_text(encoding="utf-8") == first  # stable: a re-run changes no line


def test_waived_findings_are_not_baselined() -> None:
    waived = REPO / "tests/rules/designs/waiver-hygiene/in-use.yaml"
    run = lint([str(waived)])
    assert run.all_findings() and all(f.waived for f in run.all_findings())
    assert entries_of(run) == []


def test_compare_is_a_multiset_split(project: Path) -> None:
    run = lint([str(project / "designs")])
    findings = run.all_findings()
    earlier = entries_of(run)
    # drop one finding from the earlier set, and add one that is gone now
    gone = Entry(fingerprint="0" * 20, rule="threshold-ladder", severity="error",
                 file="designs/x.yaml", message="fixed meanwhile")
    filtered, cmp = compare(run, [*earlier[1:], gone], "b.json")
    assert [f.fingerprint for f in cmp.new] == [earlier[0].fingerprint]
    assert len(cmp.unchanged) == len(findings) - 1
    assert cmp.absent == [gone]
    assert [f.fingerprint for f in filtered.all_findings()] == [earlier[0].fingerprint]
    assert run.all_findings() == findings  # the original run is left alone
    assert filtered.exit_code() == 1
    # the same fingerprint twice now and once before: one of the two is new
    twice = [*earlier, earlier[0]]
    _, cmp = compare(run, twice, "b.json")
    assert len(cmp.new) == 0 and len(cmp.absent) == 1


def test_bad_baseline_files_are_one_line_input_errors(tmp_path: Path) -> None:
    bad = tmp_path / "b.json"
    bad.write_text('{\n  "format": "packwarden-baseline/1",\n  "findings": [\n    {,}\n  ]\n}\n')
    with pytest.raises(InputError) as exc:
        read_baseline(bad, "b.json")
    assert str(exc.value).startswith("b.json:4:6: baseline is not valid JSON")
    bad.write_text('{"format": "other/9", "findings": []}')
    with pytest.raises(InputError, match="not a packwarden baseline"):
        read_baseline(bad, "b.json")
    bad.write_text('{"format": "packwarden-baseline/1", "findings": [\n'
                   '  {"fingerprint": "ab", "rule": "x", "file": "a.yaml"},\n'
                   '  {"fingerprint": 3, "rule": "x", "file": "a.yaml"}\n]}')
    with pytest.raises(InputError) as exc:
        read_baseline(bad, "b.json")
    assert str(exc.value).startswith("b.json:3:1: findings[1] needs")
    with pytest.raises(InputError, match="does not exist"):
        read_baseline(tmp_path / "none.json")


# --- the command --------------------------------------------------------------------------------

def test_adopt_with_a_baseline_then_gate_new_findings(project: Path) -> None:
    baseline = project / "packwarden-baseline.json"
    proc = cli("check", "--write-baseline", str(baseline), "designs", cwd=project)
    assert proc.returncode == 0, proc.stdout + proc.stderr  # recorded, so nothing new fails
    assert "finding(s) recorded in baseline" in proc.stderr
    n = len(read_baseline(baseline))

    proc = cli("check", "--baseline", str(baseline), "designs", cwd=project)
    assert proc.returncode == 0, proc.stdout
    assert "error" not in proc.stdout.split("design(s) linted")[0]
    assert f"0 new, {n} unchanged (not shown), 0 fixed" in proc.stderr

    # from a subfolder, with the baseline given relative to it: the same fingerprints
    proc = cli("check", "--baseline", "../packwarden-baseline.json", ".", cwd=project / "designs")
    assert proc.returncode == 0 and f"0 new, {n} unchanged" in proc.stderr

    add_flaw(project / "designs" / "orchard-probe.yaml")
    proc = cli("check", "--baseline", str(baseline), "designs", cwd=project)
    assert proc.returncode == 1
    reported = [ln for ln in proc.stdout.splitlines() if ": error " in ln]
    assert reported and all(ln.startswith("designs/orchard-probe.yaml:") for ln in reported)
    assert all("trip-current-window" in ln for ln in reported)
    # the 3 A peak also heats the pair past the 125 °C limit, and the 2.5 A load the cells past
    # their 60 °C discharge limit with nothing to cut it off (two warnings): new as well
    shown = [ln for ln in proc.stdout.splitlines() if ": error " in ln or ": warning " in ln]
    warned = sorted(ln.split(": warning ")[1].split(":")[0] for ln in shown if ": warning " in ln)
    assert warned == ["discharge-overtemperature", "switch-temperature"]
    assert len(shown) == len(reported) + 2
    assert f"{len(shown)} new, {n} unchanged" in proc.stderr

    # the SARIF of the same run marks the states
    proc = cli("check", "--baseline", str(baseline), "--format", "sarif", "designs", cwd=project)
    states = Counter(r["baselineState"] for r in json.loads(proc.stdout)["runs"][0]["results"])
    assert states == {"new": len(shown), "unchanged": n}
    # --quiet drops the summary line
    proc = cli("check", "--quiet", "--baseline", str(baseline), "designs", cwd=project)
    assert proc.stderr == ""


def test_a_broken_baseline_is_exit_2_and_the_run_is_still_reported(project: Path) -> None:
    bad = project / "b.json"
    bad.write_text("{ nope", encoding="utf-8")
    proc = cli("check", "--baseline", "b.json", "designs", cwd=project)
    assert proc.returncode == 2
    assert "Traceback" not in proc.stdout + proc.stderr
    assert "b.json:1:3: baseline is not valid JSON" in proc.stdout
    assert "designs/no-fuse.yaml:" in proc.stdout  # the designs were linted all the same
    proc = cli("check", "--baseline", "b.json", "--since", "HEAD", "designs", cwd=project)
    assert proc.returncode == 2 and "cannot be combined" in proc.stderr


def test_since_a_revision_reports_new_and_fixed(repo: Path) -> None:
    status_before = git("status", "--porcelain", cwd=repo)
    add_flaw(repo / "designs" / "orchard-probe.yaml")
    # fix the fuse-less design: the fuse comes back from the clean example
    (repo / "designs" / "no-fuse.yaml").write_text(
        (repo / "designs" / "orchard-probe.yaml").read_text().replace("2.5 A", "1.2 A")
        .replace("{current: 3 A", "{current: 1.6 A"))
    proc = cli("check", "--since", "HEAD", "--format", "sarif", "designs", cwd=repo)
    results = json.loads(proc.stdout)["runs"][0]["results"]
    by_state: dict[str, list] = {}
    for r in results:
        by_state.setdefault(r["baselineState"], []).append(r)
    uris = {s: {r["locations"][0]["physicalLocation"]["artifactLocation"]["uri"] for r in rs}
            for s, rs in by_state.items()}
    assert uris["new"] == {"designs/orchard-probe.yaml"}
    assert uris["unchanged"] == {"designs/trip-below-load.yaml"}
    assert uris["absent"] == {"designs/no-fuse.yaml"}
    assert {r["ruleId"] for r in by_state["absent"]} == {"secondary-protection"}
    assert proc.returncode == 1
    # the repository itself is untouched: no worktree, index or file of it changed
    assert git("worktree", "list", cwd=repo).count("\n") == 1
    changed = {ln[3:] for ln in git("status", "--porcelain", cwd=repo).splitlines()}
    assert changed == {"designs/orchard-probe.yaml", "designs/no-fuse.yaml"} and status_before == ""

    proc = cli("check", "--since", "HEAD", "designs", cwd=repo)
    assert "compared with git revision HEAD:" in proc.stderr and "1 fixed" in proc.stderr
    proc = cli("check", "--since", "HEAD", "--format", "json", "designs", cwd=repo)
    doc = json.loads(proc.stdout)
    assert doc["comparison"]["reference"] == "git revision HEAD"
    assert doc["comparison"]["new"] == len(by_state["new"])
    assert [e["file"] for e in doc["comparison"]["absent"]] == ["designs/no-fuse.yaml"]
    assert doc["exit_code"] == 1


def test_since_gives_the_same_fingerprints_as_the_working_tree(repo: Path) -> None:
    run = lint([str(repo / "designs")])
    entries, errors = lint_since("HEAD", [str(repo / "designs")], Registry(rules=dict(run.rules)))
    assert errors == []
    assert Counter(e.fingerprint for e in entries) == Counter(f.fingerprint for f in run.all_findings())
    assert {e.file for e in entries} == {"designs/trip-below-load.yaml", "designs/no-fuse.yaml"}


def test_since_reads_libraries_as_they_were(repo: Path) -> None:
    """A library change is judged too: dropping the fuse's part makes findings new."""
    lib = repo / "designs" / "parts" / "orchard-parts.yaml"
    text = lib.read_text(encoding="utf-8")
    lib.write_text(text.replace("OR-FUSE-12A:", "OR-FUSE-12A-OLD:"), encoding="utf-8")
    assert "OR-FUSE-12A-OLD:" in lib.read_text()
    proc = cli("check", "--since", "HEAD", "designs", cwd=repo)
    assert proc.returncode == 1
    reported = [ln for ln in proc.stdout.splitlines() if ": error " in ln]
    # F1 of the two fused designs lost its part; no-fuse has no F1, so its finding is unchanged,
    # and trip-below-load's trip findings, its peak's heat warning and its cells' discharge
    # overtemperature warning are held back behind the netlist error, so "fixed"
    assert [ln.split(":")[0] for ln in reported] == ["designs/orchard-probe.yaml",
                                                     "designs/trip-below-load.yaml"]
    assert all("unknown-part: F1: part 'OR-FUSE-12A'" in ln for ln in reported)
    assert "2 new, 1 unchanged (not shown), 4 fixed" in proc.stderr


def test_a_design_new_since_the_revision_is_all_new(repo: Path) -> None:
    shutil.copy(repo / "designs" / "no-fuse.yaml", repo / "designs" / "no-fuse-2.yaml")
    proc = cli("check", "--since", "HEAD", "designs/no-fuse-2.yaml", cwd=repo)
    assert proc.returncode == 1 and "1 new, 0 unchanged" in proc.stderr


def test_since_errors_are_one_line(repo: Path, tmp_path: Path) -> None:
    proc = cli("check", "--since", "no-such-rev", "designs", cwd=repo)
    assert proc.returncode == 2 and "Traceback" not in proc.stdout + proc.stderr
    [line] = [ln for ln in proc.stdout.splitlines() if "--since" in ln]
    assert line == (".:1:1: --since no-such-rev: not a revision of the repository (a shallow "
                    "clone may lack it: fetch it first)")
    outside = tmp_path / "plain"
    shutil.copytree(repo / "designs", outside)
    proc = cli("check", "--since", "HEAD", ".", cwd=outside)
    assert proc.returncode == 2 and "is not inside a git repository" in proc.stdout
