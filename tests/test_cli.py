"""The installed ``packwarden`` command, run as a user runs it: a subprocess of the venv's script."""

from __future__ import annotations

import json
import shutil
import subprocess
import sys
from importlib.metadata import entry_points
from pathlib import Path

import pytest

from packwarden.engine import ENTRY_POINT_GROUP, load_registry

REPO = Path(__file__).resolve().parent.parent
SCHEMAS = REPO / "schemas"


def _command() -> str:
    beside = Path(sys.executable).parent / "packwarden"
    found = shutil.which("packwarden", path=str(beside.parent))
    if found is None:
        pytest.skip(f"no packwarden script next to {sys.executable}; install the package first")
    return found


def run(*args: str) -> subprocess.CompletedProcess:
    return subprocess.run([_command(), *args], capture_output=True, text=True, encoding="utf-8",
                          cwd=REPO)


def builtin_ids() -> set[str]:
    return {ep.name for ep in entry_points(group=ENTRY_POINT_GROUP)
            if ep.dist is not None and ep.dist.name == "packwarden"}


@pytest.mark.parametrize("kind", ["design", "parts"])
def test_schema_prints_the_shipped_schema(kind: str) -> None:
    shipped = SCHEMAS / f"{kind}.schema.json"
    if not shipped.is_file():
        pytest.skip(f"{shipped.relative_to(REPO)} is not checked in yet (the lead generates it)")
    proc = run("schema", kind)
    assert proc.returncode == 0, proc.stderr
    assert json.loads(proc.stdout) == json.loads(shipped.read_text(encoding="utf-8")), (
        f"{shipped.relative_to(REPO)} is stale: regenerate it with "
        f"`packwarden schema {kind} > {shipped.relative_to(REPO)}`")


def test_rules_lists_every_builtin_rule() -> None:
    proc = run("rules")
    assert proc.returncode == 0, proc.stdout + proc.stderr
    listed = {line.split()[0] for line in proc.stdout.splitlines() if line.strip()}
    assert builtin_ids() <= listed
    # each module in rules/ is registered: a rule file without an entry point would never run
    modules = {p.stem.replace("_", "-") for p in (REPO / "rules").glob("*.py")
               if not p.name.startswith("_")}
    assert modules == builtin_ids()
    line = next(ln for ln in proc.stdout.splitlines() if ln.startswith("unknown-part "))
    assert line.split()[1] == "error"
    assert line.endswith("every component's part exists in the design's libraries")


def test_explain_prints_rationale_and_example() -> None:
    proc = run("explain", "unknown-part")
    assert proc.returncode == 0, proc.stderr
    rule = load_registry().rules["unknown-part"]
    out = proc.stdout
    assert out.startswith(f"unknown-part (error): {rule.summary}\n")
    assert rule.rationale in out
    assert rule.example is not None
    assert "Fails:\n    components:\n      Q1: {part: OR-FET-D2O" in out
    assert "Passes:\n    components:\n      Q1: {part: OR-FET-D20" in out
    assert out.index("Fails:") < out.index("Passes:")


def test_explain_of_an_unknown_rule_exits_2_with_a_suggestion() -> None:
    proc = run("explain", "unknown-prat")
    assert proc.returncode == 2
    assert proc.stdout == ""
    assert proc.stderr.strip() == "unknown rule 'unknown-prat' (did you mean 'unknown-part'?)"


def test_check_of_the_clean_example_exits_0() -> None:
    proc = run("check", "example_designs/orchard-probe.yaml")
    assert proc.returncode == 0, proc.stdout
    assert "1 design(s) linted, 0 could not be read; 0 error(s), 0 warning(s)" in proc.stdout


def test_pydantic_plugins_in_the_environment_take_no_part(tmp_path: Path) -> None:
    # A package registering a pydantic plugin would run inside the validation of every design.
    # The command switches the hook off unless the user set PYDANTIC_DISABLE_PLUGINS themselves.
    import os
    site = tmp_path / "site"
    (site / "spy_plugin-1.0.dist-info").mkdir(parents=True)
    (site / "spy_plugin-1.0.dist-info" / "METADATA").write_text(
        "Metadata-Version: 2.1\nName: spy-plugin\nVersion: 1.0\n", encoding="utf-8")
    (site / "spy_plugin-1.0.dist-info" / "entry_points.txt").write_text(
        "[pydantic]\nspy = spy_plugin:plugin\n", encoding="utf-8")
    marker = tmp_path / "loaded"
    (site / "spy_plugin.py").write_text(
        f"from pathlib import Path\nPath({str(marker)!r}).write_text('yes')\n"
        "class _Plugin:\n    def new_schema_validator(self, *args, **kwargs):\n"
        "        return None, None, None\nplugin = _Plugin()\n", encoding="utf-8")
    env = {k: v for k, v in os.environ.items() if k != "PYDANTIC_DISABLE_PLUGINS"}
    env["PYTHONPATH"] = str(site)
    design = str(REPO / "example_designs" / "orchard-probe.yaml")
    proc = subprocess.run([_command(), "check", design], capture_output=True, text=True, env=env)
    assert proc.returncode == 0, proc.stderr
    assert not marker.exists()
    # The user's own setting wins: an empty value enables every plugin, and the spy is loaded.
    proc = subprocess.run([_command(), "check", design], capture_output=True, text=True,
                          env={**env, "PYDANTIC_DISABLE_PLUGINS": ""})
    assert proc.returncode == 0, proc.stderr
    assert marker.read_text() == "yes"


def test_explain_shows_option_defaults_as_the_config_takes_them() -> None:
    # A quantity option is written with its unit in the project's TOML ("25 mV"); a bare 0.025
    # would be refused there for lack of one, so explain must not print it so.
    proc = run("explain", "threshold-ladder")
    assert proc.returncode == 0, proc.stderr
    assert '  charge_margin = "25 mV"  ' in proc.stdout
    proc = run("explain", "secondary-protection")
    assert "  derating = 0.75  " in proc.stdout  # a plain fraction stays a plain number


def test_check_help_shows_flags_without_a_value() -> None:
    # A flag such as --quiet takes no value; the help must not suggest one ("<bool>").
    proc = run("check", "--help")
    assert proc.returncode == 0, proc.stderr
    usage = next(line for line in proc.stdout.splitlines() if line.startswith("Usage:"))
    assert usage.startswith("Usage: packwarden check [OPTIONS]") and "PATH" in usage
    quiet = next(line for line in proc.stdout.splitlines() if "--quiet" in line)
    assert "-q" in quiet and "<bool>" not in quiet and "only findings that fail the run" in quiet
