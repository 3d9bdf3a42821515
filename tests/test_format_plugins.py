"""Output formats from plugins: a team's format works beside the built-in ones, and a broken or
duplicate one is one line and exit code 2 while the rest of the run goes on.

The plugins are a distribution written into a folder of its own (``*.dist-info`` with
``entry_points.txt``) and put on ``PYTHONPATH``, which is how ``importlib.metadata`` finds
installed distributions and their entry points [published: Python Packaging User Guide, "Entry
points specification" and "Recording installed projects"]. The environment running the suite
never sees them.
"""

from __future__ import annotations

import json
import os
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parent.parent
CLEAN = REPO / "example_designs" / "orchard-probe.yaml"

PLUGIN = '''
def render(run, options):
    return f"{len(run.designs)} design(s), exit {run.exit_code()}\\n"

NOT_A_FUNCTION = 42
'''

ENTRY_POINTS = """\
[packwarden.formats]
count = lotus_formats:render
json = lotus_formats:render
text = lotus_formats:render
broken = lotus_missing_module:render
number = lotus_formats:NOT_A_FUNCTION
"""


def _command() -> str:
    found = shutil.which("packwarden", path=str(Path(sys.executable).parent))
    if found is None:
        pytest.skip(f"no packwarden script next to {sys.executable}; install the package first")
    return found


@pytest.fixture(scope="module")
def site(tmp_path_factory: pytest.TempPathFactory) -> Path:
    site = tmp_path_factory.mktemp("format-plugins")
    (site / "lotus_formats.py").write_text(PLUGIN, encoding="utf-8")
    info = site / "lotus_formats-1.0.dist-info"
    info.mkdir()
    (info / "METADATA").write_text("Metadata-Version: 2.1\nName: lotus-formats\nVersion: 1.0\n")
    (info / "entry_points.txt").write_text(ENTRY_POINTS, encoding="utf-8")
    return site


def run(site: Path | None, *args: str) -> subprocess.CompletedProcess:
    env = {k: v for k, v in os.environ.items() if k not in ("PYTHONPATH", "PYTHONSTARTUP")}
    env["NO_COLOR"] = "1"
    if site is not None:
        env["PYTHONPATH"] = str(site)
    return subprocess.run([_command(), *args], capture_output=True, text=True, encoding="utf-8",
                          cwd=REPO, env=env)


def test_a_plugin_format_is_used_and_its_duplicates_are_reported(site: Path) -> None:
    proc = run(site, "check", "--format", "count", str(CLEAN))
    # the format itself works; the two names it takes from packwarden make the run exit 2
    assert proc.stdout == "1 design(s), exit 2\n" and proc.stderr == ""
    assert proc.returncode == 2


def test_a_builtin_format_stays_in_use_and_the_duplicate_is_one_line_in_the_report(
        site: Path) -> None:
    proc = run(site, "check", "--format", "json", str(CLEAN))
    data = json.loads(proc.stdout)  # packwarden's JSON, not the plugin's
    assert data["broken_plugins"] == [
        {"plugin": "lotus-formats:json", "message": "duplicate output format 'json': registered "
                                                    "by packwarden:json and by lotus-formats:json"},
        {"plugin": "lotus-formats:text", "message": "duplicate output format 'text': registered "
                                                    "by packwarden:text and by lotus-formats:text"}]
    assert [d["name"] for d in data["designs"]] == ["Orchard soil probe"]
    assert data["exit_code"] == proc.returncode == 2


@pytest.mark.parametrize("name, reason", [
    ("broken", "failed to load: ModuleNotFoundError: No module named 'lotus_missing_module'"),
    ("number", "is not a render function (got int)"),
])
def test_a_broken_format_asked_for_is_one_line_and_exit_2(site: Path, name: str,
                                                          reason: str) -> None:
    proc = run(site, "check", "--format", name, str(CLEAN))
    assert proc.returncode == 2 and proc.stdout == ""
    assert proc.stderr.splitlines() == [
        f"packwarden check: output format '{name}' (lotus-formats:{name}) {reason}"]


def test_the_default_text_check_does_not_read_the_format_registry(site: Path) -> None:
    # text is found without the entry points: a plain check neither pays for them nor is
    # disturbed by a broken format it does not use
    plain = run(site, "check", str(CLEAN))
    assert plain.returncode == 0 and "lotus" not in plain.stdout + plain.stderr
    assert plain.stdout == run(None, "check", str(CLEAN)).stdout


def test_formats_lists_the_registry_and_reports_each_problem_on_one_line(site: Path) -> None:
    proc = run(site, "formats")
    lines = proc.stdout.splitlines()
    listed = {line.split()[0]: line.split()[1] for line in lines if ":1:1: " not in line}
    assert listed == {"count": "lotus-formats:count", "html": "packwarden:html",
                      "json": "packwarden:json", "junit": "packwarden:junit",
                      "markdown": "packwarden:markdown", "sarif": "packwarden:sarif",
                      "text": "packwarden:text"}
    problems = [line for line in lines if ":1:1: " in line]
    assert [p.split(":1:1: ")[0] for p in problems] == [
        "lotus-formats:json", "lotus-formats:text", "lotus-formats:broken", "lotus-formats:number"]
    assert proc.returncode == 2
    clean = run(None, "formats")
    assert clean.returncode == 0 and "lotus" not in clean.stdout
