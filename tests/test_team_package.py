"""The example team package (examples/team-rules) and a `new-rule` package, installed with pip.

Both are built and installed by pip into a folder of their own (``pip install --target``), never
into the environment running the suite: the other tests must see the built-in rules only. The
installed ``packwarden`` command then runs with that folder on ``PYTHONPATH``, which is how
``importlib.metadata`` finds installed distributions and their entry points — the same lookup as
in a virtual environment that holds the packages.
"""

from __future__ import annotations

import importlib.util
import json
import os
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from packwarden.engine import Registry, load_folder, load_registry
from packwarden.scaffold import new_rule
from packwarden.testing import cases_in, check_case

REPO = Path(__file__).resolve().parent.parent
TEAM = REPO / "examples" / "team-rules"
TEAM_RULES = ["tallgrass-fet-current-derating", "tallgrass-fuse-at-cell-positive"]


def _command() -> str:
    found = shutil.which("packwarden", path=str(Path(sys.executable).parent))
    if found is None:
        pytest.skip(f"no packwarden script next to {sys.executable}; install the package first")
    return found


def _can_build_offline() -> bool:
    """Whether this environment's setuptools builds wheels by itself (>= 70.1, or with `wheel`)."""
    if importlib.util.find_spec("wheel") is not None:
        return True
    try:
        from importlib.metadata import version
        major, minor = (int(x) for x in version("setuptools").split(".")[:2])
    except Exception:
        return False
    return (major, minor) >= (70, 1)


@pytest.fixture(scope="module")
def installed(tmp_path_factory: pytest.TempPathFactory) -> dict:
    """Copies of both packages (pip writes build files beside the sources), installed in a target."""
    work = tmp_path_factory.mktemp("team-packages")
    team = work / "team-rules"
    shutil.copytree(TEAM, team, ignore=shutil.ignore_patterns("build", "*.egg-info",
                                                              "__pycache__", ".pytest_cache"))
    scaffolded = new_rule("trip-limit", work)[0].parent
    target = work / "site"
    cmd = [sys.executable, "-m", "pip", "install", "--quiet", "--no-deps", "--no-input",
           "--disable-pip-version-check", "--target", str(target), str(team), str(scaffolded)]
    if _can_build_offline():
        cmd.insert(4, "--no-build-isolation")
    proc = subprocess.run(cmd, capture_output=True, text=True)
    assert proc.returncode == 0, proc.stdout + proc.stderr
    env = {k: v for k, v in os.environ.items() if k != "PYTHONPATH"}
    env.update(PYTHONPATH=str(target), PYTHONDONTWRITEBYTECODE="1", NO_COLOR="1")
    return {"env": env, "team": team, "scaffolded": scaffolded, "target": target}


def run(installed: dict, *args: str, cwd: Path | None = None,
        env: dict | None = None) -> subprocess.CompletedProcess:
    return subprocess.run([_command(), *args], capture_output=True, text=True, encoding="utf-8",
                          cwd=cwd or installed["team"], env=env or installed["env"])


def test_pip_installed_the_distributions_with_their_entry_points(installed: dict) -> None:
    infos = sorted(p.name for p in installed["target"].glob("*.dist-info"))
    assert infos == ["packwarden_trip_limit-0.1.0.dist-info",
                     "tallgrass_packwarden_rules-1.2.0.dist-info"]
    eps = (installed["target"] / infos[1] / "entry_points.txt").read_text(encoding="utf-8")
    assert "[packwarden.rules]" in eps and "tallgrass-fuse-at-cell-positive =" in eps
    assert "[packwarden.formats]" in eps and "tallgrass-csv =" in eps


def test_packwarden_rules_lists_the_team_rules_beside_the_builtin_ones(installed: dict) -> None:
    proc = run(installed, "rules")
    rows = {line.split()[0]: line.split()[1] for line in proc.stdout.splitlines()
            if line.strip() and not line.startswith("packwarden:")}
    assert rows["tallgrass-fuse-at-cell-positive"] == "error"
    assert rows["tallgrass-fet-current-derating"] == "warning"
    assert rows["trip-limit"] == "error"
    assert "unknown-part" in rows
    assert "tallgrass" not in proc.stderr


def _team_findings(proc: subprocess.CompletedProcess) -> set[tuple[str, str, str]]:
    data = json.loads(proc.stdout)
    return {(d["file"], f["rule"], f["element"]) for d in data["designs"] for f in d["findings"]
            if f["rule"].startswith("tallgrass-")}


def test_the_team_rules_fire_in_a_check(installed: dict, tmp_path: Path) -> None:
    proc = run(installed, "check", "--format", "json", "tests/designs")
    assert _team_findings(proc) == {
        ("tests/designs/low-side-fuse.yaml", "tallgrass-fuse-at-cell-positive", "F1")}
    assert proc.returncode == 1
    # the derating rule stays silent at its default 60 % (its failing case changes the beacon's
    # part, which is no file of its own), and fires on both designs with the project's 10 %
    strict = tmp_path / "packwarden.toml"
    strict.write_text("[rules.tallgrass-fet-current-derating]\nderating = 0.1\n")
    proc = run(installed, "check", "--format", "json", "--config", str(strict), "tests/designs")
    assert _team_findings(proc) == {
        ("tests/designs/low-side-fuse.yaml", "tallgrass-fuse-at-cell-positive", "F1"),
        ("tests/designs/beacon.yaml", "tallgrass-fet-current-derating", "Q1"),
        ("tests/designs/low-side-fuse.yaml", "tallgrass-fet-current-derating", "Q1")}, \
        proc.stdout + proc.stderr


def test_the_team_format_is_registered_and_writes_its_csv(installed: dict) -> None:
    # the package's own output format, found through the packwarden.formats entry points; read
    # back with Python's csv reader [published: RFC 4180]
    import csv
    import io
    listed = run(installed, "formats")
    assert "tallgrass-csv  tallgrass-packwarden-rules:tallgrass-csv" in listed.stdout
    assert listed.returncode == 0, listed.stdout + listed.stderr
    proc = run(installed, "check", "--format", "tallgrass-csv", "tests/designs")
    header, *rows = list(csv.reader(io.StringIO(proc.stdout)))
    assert header[:5] == ["file", "line", "column", "severity", "rule"]
    fired = {(r[0], r[4], r[5]) for r in rows if r[4].startswith("tallgrass-")}
    assert fired == {
        ("tests/designs/low-side-fuse.yaml", "tallgrass-fuse-at-cell-positive", "F1"),
    }
    assert proc.returncode == 1 and proc.stderr == ""


def test_require_plugins_passes_with_the_package_and_fails_fast_without(installed: dict) -> None:
    ok = run(installed, "check", "--require-plugins", "tallgrass-packwarden-rules",
             "tests/designs/beacon.yaml")
    assert "1 design(s) linted, 0 could not be read" in ok.stdout, ok.stdout + ok.stderr
    bare = {k: v for k, v in installed["env"].items() if k != "PYTHONPATH"}
    missing = run(installed, "check", "--require-plugins", "tallgrass-packwarden-rules",
                  "tests/designs/beacon.yaml", env=bare)
    assert missing.returncode == 2 and missing.stdout == ""
    assert missing.stderr.startswith("--require-plugins: required plugin "
                                     "'tallgrass-packwarden-rules' is not installed")


@pytest.mark.parametrize("package", ["team", "scaffolded"])
def test_each_package_passes_its_own_test_suite(installed: dict, package: str) -> None:
    proc = subprocess.run([sys.executable, "-m", "pytest", "-q", "-p", "no:cacheprovider"],
                          cwd=installed[package], env=installed["env"], capture_output=True,
                          text=True)
    assert proc.returncode == 0, proc.stdout + proc.stderr
    last = proc.stdout.strip().splitlines()[-1]
    assert " passed" in last and "failed" not in last and "error" not in last, last


def test_the_team_rules_also_work_from_a_rule_folder() -> None:
    # No install needed: the same modules named by a config's rule_paths.
    reg = Registry(rules=dict(load_registry().rules))
    load_folder(reg, TEAM / "tallgrass_rules")
    assert reg.broken == [] and set(TEAM_RULES) <= set(reg.rules)
    ran = [check_case(p.values[0], reg) for p in cases_in(TEAM / "tests" / "cases")]
    assert sum(1 for found in ran if found) == 3 and sum(1 for found in ran if not found) == 2
