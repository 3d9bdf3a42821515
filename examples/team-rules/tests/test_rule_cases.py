"""Tallgrass rules against their case files, with packwarden's own case runner.

Run after installing the package (``pip install -e '.[test]'``): the runner takes the rules from
the installed entry points, exactly as ``packwarden check`` does.
"""

from importlib.metadata import entry_points
from pathlib import Path

import pytest

from packwarden.testing import cases_in, check_case, load_cases

CASES = Path(__file__).parent / "cases"


@pytest.mark.parametrize("case", cases_in(CASES))
def test_rule_case(case):
    check_case(case)


def _our_rules():
    return sorted(ep.name for ep in entry_points(group="packwarden.rules")
                  if ep.dist is not None and ep.dist.name == "tallgrass-packwarden-rules")


def test_the_package_registers_its_rules():
    assert _our_rules() == ["tallgrass-fet-current-derating", "tallgrass-fuse-at-cell-positive"]


@pytest.mark.parametrize("rule_id", _our_rules())
def test_every_rule_has_a_passing_and_a_failing_case(rule_id):
    cases = load_cases(CASES / f"{rule_id}.yaml")
    assert any(not c.expect for c in cases) and any(c.expect for c in cases)
