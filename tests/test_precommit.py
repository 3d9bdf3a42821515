"""The pre-commit hook, run by pre-commit itself (``pre-commit try-repo``) on a temporary repository.

pre-commit's ``try-repo`` clones the hook repository at HEAD; with uncommitted changes to tracked
files it commits them in a temporary "shadow" clone, but files git does not track yet are left out
[published: pre-commit's try_repo command, ``_repo_ref``: ``git add -u`` plus staged files]. So the
test hands try-repo a snapshot of this checkout as it is on disk: every tracked file and every
untracked file that .gitignore does not exclude, committed in a temporary repository. In a clean
clone (CI) that snapshot is exactly HEAD. The hook repository is found from this file's location.

pre-commit installs the hook into a fresh virtualenv from the package registry, as it would for
any user: the test needs the registry, and is slow (tens of seconds); it asserts no duration.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parent.parent
EXAMPLES = REPO / "example_designs"

GIT_ENV = {"GIT_AUTHOR_NAME": "packwarden tests", "GIT_AUTHOR_EMAIL": "tests@example.invalid",
           "GIT_COMMITTER_NAME": "packwarden tests", "GIT_COMMITTER_EMAIL": "tests@example.invalid",
           "GIT_CONFIG_NOSYSTEM": "1", "GIT_CONFIG_GLOBAL": os.devnull}

pre_commit = pytest.importorskip("pre_commit", reason="pre-commit (test extra) runs the hook")


def git(*args: str, cwd: Path) -> str:
    proc = subprocess.run(["git", *args], cwd=cwd, capture_output=True, text=True,
                          env={**os.environ, **GIT_ENV})
    assert proc.returncode == 0, f"git {' '.join(args)}: {proc.stderr}"
    return proc.stdout


def test_the_manifest_is_valid() -> None:
    from pre_commit.clientlib import load_manifest
    [hook] = load_manifest(str(REPO / ".pre-commit-hooks.yaml"))
    assert hook["id"] == "packwarden" and hook["language"] == "python"
    assert hook["pass_filenames"] is True
    assert hook["entry"].split()[:2] == ["packwarden", "check"]
    import re
    files = re.compile(hook["files"])
    assert files.search("designs/probe.yaml") and files.search("a/b.yml")
    assert not files.search("designs/probe.yaml.orig") and not files.search("README.md")


def snapshot(dest: Path) -> Path:
    """This checkout as it is on disk, committed in a new repository at ``dest``."""
    if shutil.which("git") is None:
        pytest.skip("git is not installed")
    if not (REPO / ".git").exists():
        pytest.skip(f"{REPO} is not a git checkout")
    listed = git("ls-files", "-z", "--cached", "--others", "--exclude-standard", cwd=REPO)
    dest.mkdir()
    for name in filter(None, listed.split("\0")):
        src = REPO / name
        if src.is_file():  # a file deleted but not yet staged is listed and absent
            (dest / name).parent.mkdir(parents=True, exist_ok=True)
            shutil.copy2(src, dest / name)
    assert (dest / ".pre-commit-hooks.yaml").is_file()
    git("init", "-q", "-b", "main", cwd=dest)
    git("add", "-A", cwd=dest)
    git("commit", "-q", "-m", "snapshot of the packwarden checkout", cwd=dest)
    return dest


@pytest.fixture()
def hardware_repo(tmp_path: Path) -> Path:
    """A team's repository: a clean design, a flawed one, the part library and a CI YAML file."""
    root = tmp_path / "hw"
    (root / "designs" / "parts").mkdir(parents=True)
    shutil.copy(EXAMPLES / "parts" / "orchard-parts.yaml", root / "designs" / "parts")
    shutil.copy(EXAMPLES / "orchard-probe.yaml", root / "designs")
    flawed = (EXAMPLES / "flawed" / "trip-below-load.yaml").read_text(encoding="utf-8")
    (root / "designs" / "trip-below-load.yaml").write_text(flawed.replace("../parts/", "parts/"),
                                                           encoding="utf-8")
    (root / "ci.yml").write_text("jobs: {lint: {runs-on: any}}\n", encoding="utf-8")
    git("init", "-q", "-b", "main", cwd=root)
    git("add", "-A", cwd=root)
    git("commit", "-q", "-m", "designs", cwd=root)
    return root


def test_try_repo_runs_the_hook(tmp_path: Path, hardware_repo: Path) -> None:
    hooks = snapshot(tmp_path / "packwarden-snapshot")
    env = {**os.environ, **GIT_ENV, "NO_COLOR": "1", "PRE_COMMIT_COLOR": "never",
           "PRE_COMMIT_HOME": str(tmp_path / "pre-commit-home")}
    env.pop("VIRTUAL_ENV", None)
    proc = subprocess.run(
        [sys.executable, "-m", "pre_commit", "try-repo", str(hooks), "packwarden", "--all-files",
         "--verbose"],
        cwd=hardware_repo, capture_output=True, text=True, env=env,
        timeout=1800)  # a guard against a hung install, not a speed check
    out = proc.stdout + proc.stderr
    assert "packwarden design review" in out, out
    # the flawed design fails the hook with its finding, at its line
    assert proc.returncode == 1, out
    assert "Failed" in out
    assert "designs/trip-below-load.yaml:10:15: error trip-current-window:" in out
    # the clean design passed; the library and the CI file were skipped, not read as designs
    assert "designs/orchard-probe.yaml:" not in out
    assert "orchard-parts.yaml:" not in out and "ci.yml:" not in out
    assert "2 design(s) linted, 0 could not be read" in out
    assert "Traceback" not in out
