"""Worker processes (``--jobs``) change how fast a batch is linted, never what it reports.

The same repository is linted in this process and by two workers, and everything a report can
show must agree: findings and their fingerprints, waivers, input errors, a bad config reported once
for the many designs under it, a missing policy reported once, figures, skipped and checked rules,
the fail-on level and the exit code. The reference is the one-process run, which the rest of the
suite checks against outside sources.
"""

from __future__ import annotations

import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from packwarden.engine import PARALLEL_MIN_DESIGNS, worker_count, lint, load_registry

REPO = Path(__file__).resolve().parent.parent
EXAMPLE = (REPO / "example_designs" / "orchard-probe.yaml").read_text(encoding="utf-8")
FLAWED = sorted((REPO / "example_designs" / "flawed").glob("*.yaml"))
LIBRARY = REPO / "example_designs" / "parts" / "orchard-parts.yaml"


@pytest.fixture(scope="module")
def repo(tmp_path_factory: pytest.TempPathFactory) -> Path:
    root = tmp_path_factory.mktemp("jobs")
    (root / ".git").mkdir()
    good = root / "designs"
    (good / "parts").mkdir(parents=True)
    shutil.copy(LIBRARY, good / "parts" / "orchard-parts.yaml")
    for i in range(24):
        load = 0.5 + (i % 9) / 10
        text = (EXAMPLE.replace("name: Orchard soil probe,", f"name: Probe {i:02d},")
                .replace("  continuous: 1.2 A", f"  continuous: {load:.1f} A"))
        if i % 6 == 5:  # an unknown part (a netlist finding), waived or not, now and then
            text = text.replace("  F1: {part: OR-FUSE-12A", "  F1: {part: OR-FUSE-12", 1)
            expires = "2001-06-30" if i % 12 == 11 else "2999-12-31"
            text += (f"waivers:\n  - rule: unknown-part\n    element: F1\n"
                     f"    reason: second source under test\n    expires: {expires}\n")
        if i % 8 == 7:
            text = text.replace("  continuous:", "  continuus:", 1)
        (good / f"probe-{i:02d}.yaml").write_text(text, encoding="utf-8")
    # every one-flaw example, with its library, in a project of its own with a team policy
    # that is missing: its error belongs to the run, once
    project = root / "project"
    (project / "parts").mkdir(parents=True)
    (project / "flawed").mkdir()
    shutil.copy(LIBRARY, project / "parts" / "orchard-parts.yaml")
    for f in FLAWED:
        shutil.copy(f, project / "flawed" / f.name)
    (project / "packwarden.toml").write_text('policy = "team-policy.yaml"\nfail_on = "warning"\n')
    # a config with a mistake, under which several designs sit: reported once
    broken = root / "broken"
    (broken / "parts").mkdir(parents=True)
    shutil.copy(LIBRARY, broken / "parts" / "orchard-parts.yaml")
    (broken / "packwarden.toml").write_text('ignore = ["essential-part"]\n')
    for i in range(5):
        (broken / f"probe-{i}.yaml").write_text(EXAMPLE, encoding="utf-8")
    return root


def _view(run) -> dict:
    return {
        "designs": [(d.file, d.name, d.linted, [str(e) for e in d.errors],
                     [(i.rule, i.message) for i in d.internal], d.figures, d.skipped, d.checked,
                     [(f.rule, f.severity, f.message, f.hint, f.location, f.element, f.figures,
                       f.key, f.waived, f.fingerprint) for f in d.findings])
                    for d in run.designs],
        "errors": [str(e) for e in run.errors],
        "broken": run.broken_plugins,
        "fail_on": run.fail_on,
        "exit": run.exit_code(),
    }


def test_workers_report_what_one_process_reports(repo: Path) -> None:
    folders = [str(repo / "designs"), str(repo / "project" / "flawed"), str(repo / "broken")]
    one = lint(folders, jobs=1)
    two = lint(folders, jobs=2)
    assert len(one.designs) == 24 + len(FLAWED) + 5
    assert _view(two) == _view(one)
    # the run says what went wrong outside the designs, once each
    assert sum("team-policy.yaml does not exist" in e for e in _view(one)["errors"]) == 1
    config_errors = [e for d in one.designs for e in d.errors if "essential-part" in str(e)]
    assert len(config_errors) == 1
    assert any(d.findings for d in one.designs) and any(d.errors for d in one.designs)
    findings = [f for d in one.designs for f in d.findings]
    assert any(f.waived for f in findings) and any(f.rule == "waiver-hygiene" for f in findings)


def test_worker_results_carry_no_model_and_one_process_keeps_it(repo: Path) -> None:
    folder = [str(repo / "designs")]
    assert all(d.model is None for d in lint(folder, jobs=2).designs)
    kept = lint(folder, jobs=1)
    assert all(d.model is not None for d in kept.designs if not d.errors)
    assert all(d.model is None for d in lint(folder, jobs=1, keep_models=False).designs)


def test_a_caller_registry_is_used_by_the_workers(repo: Path) -> None:
    reg = load_registry()
    only = {rid: r for rid, r in reg.rules.items() if rid == "single-connection-net"}
    reg.rules = only
    folder = [str(repo / "project" / "flawed")]
    two = lint(folder, registry=reg, jobs=2)
    assert _view(two) == _view(lint(folder, registry=reg, jobs=1))
    assert {f.rule for d in two.designs for f in d.findings} <= {"single-connection-net"}


def test_how_many_workers() -> None:
    assert worker_count(1, 10_000, True) == 1
    assert worker_count(4, 3, True) == 3  # never more workers than designs
    assert worker_count(None, PARALLEL_MIN_DESIGNS - 1, True) == 1  # small batches stay here
    assert worker_count(None, PARALLEL_MIN_DESIGNS, True) >= 1


def test_the_command_line_report_is_the_same_with_workers(repo: Path) -> None:
    def report(*extra: str) -> subprocess.CompletedProcess:
        return subprocess.run([sys.executable, "-m", "packwarden.cli", "check", "--format", "json",
                               *extra, str(repo / "designs"), str(repo / "project" / "flawed")],
                              capture_output=True, text=True, cwd=repo)
    one, two = report("--jobs", "1"), report("--jobs", "2")
    assert one.returncode == two.returncode == 2  # the designs with errors
    assert one.stdout == two.stdout and '"designs"' in one.stdout


def test_a_worker_that_dies_loses_no_design(repo: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    # A worker killed mid-batch (out of memory, a signal): its chunks are linted in this process
    # and the run reports what one process reports.
    import os

    from packwarden import batch
    parent = os.getpid()
    real = batch._lint_one

    def dies_in_a_worker(session, path, shown):
        if os.getpid() != parent and path.name == "probe-03.yaml":
            os._exit(9)
        return real(session, path, shown)

    folder = [str(repo / "designs")]
    one = lint(folder, jobs=1)
    monkeypatch.setattr(batch, "_lint_one", dies_in_a_worker)
    assert _view(lint(folder, jobs=2)) == _view(one)


def test_a_chunk_that_cannot_be_read_back_is_linted_here(repo: Path,
                                                         monkeypatch: pytest.MonkeyPatch) -> None:
    # The workers' results are kept pickled until the pool is done; one that cannot be read
    # back then is linted again in this process.
    import pickle

    real = pickle.loads
    damaged = []

    def first_fails(data, *args, **kwargs):
        if not damaged:
            damaged.append(data)
            raise pickle.UnpicklingError("damaged")
        return real(data, *args, **kwargs)

    folder = [str(repo / "designs")]
    one = lint(folder, jobs=1)
    monkeypatch.setattr(pickle, "loads", first_fails)
    assert _view(lint(folder, jobs=2)) == _view(one)
    assert damaged and isinstance(damaged[0], bytes)
