"""The README's first command installs only what the main job needs; its test command installs the
test extras; .ci/run does what the README says, in that order."""

import re
from pathlib import Path

REPO = Path(__file__).resolve().parents[1]


def _blocks(text: str) -> list[str]:
    return re.findall(r"```sh\n(.*?)```", text, re.S)


def test_the_first_command_installs_the_main_job_only_and_the_test_command_the_extras():
    first, tests = _blocks((REPO / "README.md").read_text(encoding="utf-8"))[:2]
    assert ".venv/bin/pip install -e . " in first and "[test]" not in first
    assert "packwarden check example_designs/orchard-probe.yaml" in first
    assert tests.strip() == ".venv/bin/pip install -e '.[test]' && .venv/bin/python -m pytest -q"


def test_ci_runs_the_readme_commands_in_order():
    ci = (REPO / ".ci" / "run").read_text(encoding="utf-8")
    steps = [".venv/bin/pip install -q -e .\n",
             ".venv/bin/packwarden check example_designs/orchard-probe.yaml",
             ".venv/bin/pip install -q -e '.[test]' && .venv/bin/python -m pytest -q"]
    where = [ci.find(step) for step in steps]
    assert -1 not in where and where == sorted(where), where
