"""The installed command's quick way in (``packwarden.launch``) against the typer command.

The reference is typer itself, an independent reader of the same command line: for every plain
``check`` command line the quick reader must call ``checking.run_check`` with exactly the
arguments typer's ``check`` passes, and every other command line must go to typer unread.
"""

from __future__ import annotations

import inspect
import subprocess
import sys
from pathlib import Path

import pytest
import typer
from typer.testing import CliRunner

from packwarden import checking
from packwarden.cli import app
from packwarden.launch import FLAGS, VALUED, plain_check

REPO = Path(__file__).resolve().parent.parent
PROBE = "example_designs/orchard-probe.yaml"

PLAIN = [
    ["check", PROBE],
    ["check", PROBE, "example_designs/flawed/no-fuse.yaml"],
    ["check", "-f", "json", PROBE],
    ["check", "--format=sarif", PROBE, "-q"],
    ["check", PROBE, "--format", "junit", "--quiet", "--designs-only"],
    ["check", "-o", "out dir/report.txt", "--fail-on", "warning", PROBE],
    ["check", "--fail-on=info", "--config", "team.toml", PROBE],
    ["check", "--baseline", "base.json", PROBE],
    ["check", "--write-baseline=base.json", PROBE],
    ["check", "--since", "HEAD~1", PROBE],
    ["check", "--require-plugins", "acme-rules, other", PROBE],
    ["check", "--yield", "1000", "--seed", "7", "--distribution", "normal", PROBE],
    ["check", "--yield=10000000", "--seed=0", PROBE],
    ["check", "-j", "2", PROBE],
    ["check", "--jobs=1", PROBE, "--output", "r.md"],
    ["check", "a b.yaml", "ünïcode.yaml"],
]

NOT_PLAIN = [
    [], ["check"], ["rules"], ["--help"], ["check", "--help"], ["check", PROBE, "-h"],
    ["check", "-fjson", PROBE],                # attached short value
    ["check", "-f=json", PROBE],
    ["check", "-qf", "json", PROBE],           # grouped short options
    ["check", "--format", PROBE],              # the value is missing: typer's error
    ["check", PROBE, "--format"],
    ["check", "--format", "--quiet", PROBE],
    ["check", "--format=", PROBE],
    ["check", "--quiet=yes", PROBE],
    ["check", "--fail-on", "ERROR", PROBE],    # typer's choice error
    ["check", "--distribution", "gauss", PROBE],
    ["check", "--yield", "0", PROBE],          # below typer's minimum
    ["check", "--yield", "10000001", PROBE],
    ["check", "--jobs", "0", PROBE],
    ["check", "--seed", "-3", PROBE],
    ["check", "--seed", "+3", PROBE],
    ["check", "--seed", "07", PROBE],
    ["check", "--yield", "1e3", PROBE],
    ["check", "-f", "json", "-f", "text", PROBE],  # given twice
    ["check", "--", PROBE],
    ["check", "-", PROBE],
    ["check", "", PROBE],
    ["check", "--unknown", PROBE],
    ["check", "--form", "json", PROBE],        # typer's "did you mean"
]


def typer_call(argv: list[str], monkeypatch: pytest.MonkeyPatch) -> dict:
    seen: list[dict] = []

    def fake(*args, **kwargs) -> int:
        seen.append(bound(*args, **kwargs))
        return 0

    monkeypatch.setattr(checking, "run_check", fake)
    result = CliRunner().invoke(app, argv)
    assert result.exit_code == 0, result.output
    assert len(seen) == 1
    return seen[0]


RUN_CHECK = inspect.signature(checking.run_check)


def bound(*args, **kwargs) -> dict:
    call = RUN_CHECK.bind(*args, **kwargs)
    call.apply_defaults()
    return dict(call.arguments)


@pytest.mark.parametrize("argv", PLAIN, ids=" ".join)
def test_a_plain_check_is_read_as_typer_reads_it(argv, monkeypatch) -> None:
    quick = plain_check(argv)
    assert quick is not None
    assert bound(**quick) == typer_call(argv, monkeypatch)


@pytest.mark.parametrize("argv", NOT_PLAIN, ids=lambda a: " ".join(a) or "(none)")
def test_anything_else_goes_to_typer(argv) -> None:
    assert plain_check(argv) is None


def test_every_option_read_quickly_is_the_check_option_of_that_name() -> None:
    # An option added to `check` later is not read quickly (the run goes to typer, which is
    # right, only slower); one read quickly must be the same option with the same parameter.
    command = typer.main.get_command(app).commands["check"]
    by_flag = {opt: p.name for p in command.params for opt in p.opts}
    takes_value = {opt for p in command.params for opt in p.opts
                   if not getattr(p, "is_flag", False)}
    for flag, (name, _) in VALUED.items():
        assert by_flag.get(flag) == name and flag in takes_value, flag
    for flag, name in FLAGS.items():
        assert by_flag.get(flag) == name and flag not in takes_value, flag


def script() -> str:
    found = Path(sys.executable).with_name("packwarden")
    if not found.exists():
        pytest.skip("no packwarden script beside this Python; install the package first")
    return str(found)


@pytest.mark.parametrize("argv", [
    ["check", "-f", "json", PROBE, "example_designs/flawed/no-fuse.yaml"],
    ["check", "--fail-on", "info", "example_designs/flawed/missing.yaml"],  # exit 2, one line
    ["check", "--format", "nosuch", PROBE],
    ["check", "-fjson", PROBE],                                              # through typer
], ids=" ".join)
def test_the_installed_command_answers_as_the_typer_command(argv) -> None:
    def run(cmd: list[str]) -> tuple:
        p = subprocess.run(cmd + argv, capture_output=True, text=True, cwd=REPO)
        return p.returncode, p.stdout, p.stderr
    assert run([script()]) == run([sys.executable, "-m", "packwarden.cli"])


def test_a_plain_check_imports_only_what_it_uses() -> None:
    # typer: the quick way in; numpy (the yield run), jinja2 (the HTML report), quantiphy (read
    # by quantities.py itself): DEVELOPERS.md "Speed"
    p = subprocess.run([sys.executable, "-X", "importtime", script(), "check", PROBE],
                       capture_output=True, text=True, cwd=REPO)
    assert p.returncode == 0, p.stderr
    imported = {line.split("|")[-1].strip() for line in p.stderr.splitlines()
                if line.startswith("import time:")}
    assert "packwarden.checking" in imported
    heavy = {"typer", "click", "numpy", "jinja2", "quantiphy", "pygls", "markdown_it"}
    assert not {m for m in imported if m.split(".")[0] in heavy}
