"""`packwarden new-rule`: the package it makes passes its own tests, and those tests can fail.

The generated rule module is loaded the way a config-named folder is (``load_folder``) and its
generated cases are run with the public case runner; tests/test_team_package.py installs a
generated package with pip and runs its own test-suite as its author would.
"""

from __future__ import annotations

import ast
import sys
from pathlib import Path

import pytest
from typer.testing import CliRunner

from packwarden import Rule
from packwarden.cli import app
from packwarden.config import check_against_rules, load_config
from packwarden.engine import Registry, load_folder, load_registry
from packwarden.scaffold import Names, ScaffoldError, new_rule
from packwarden.testing import cases_in, check_case, load_cases

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib


def scaffold(tmp_path: Path, name: str = "trip-limit") -> Path:
    result = CliRunner().invoke(app, ["new-rule", name, "--dir", str(tmp_path)])
    assert result.exit_code == 0, result.stdout + result.stderr
    return tmp_path / name


def registry_with(pkg: Path) -> Registry:
    full = load_registry()
    reg = Registry(rules=dict(full.rules))
    load_folder(reg, pkg / f"packwarden_{pkg.name.replace('-', '_')}")
    assert reg.broken == []
    return reg


def test_the_package_has_an_entry_point_a_rule_and_tests(tmp_path: Path) -> None:
    pkg = scaffold(tmp_path)
    meta = tomllib.loads((pkg / "pyproject.toml").read_text(encoding="utf-8"))
    assert meta["project"]["name"] == "packwarden-trip-limit"
    assert meta["project"]["entry-points"]["packwarden.rules"] == {
        "trip-limit": "packwarden_trip_limit.trip_limit:check"}
    assert meta["tool"]["setuptools"]["packages"] == ["packwarden_trip_limit"]
    rule = registry_with(pkg).rules["trip-limit"]
    assert isinstance(rule, Rule) and rule.example is not None and rule.rationale
    assert list(rule.options.model_fields) == ["max_trip"]
    test_source = (pkg / "tests" / "test_rule_cases.py").read_text(encoding="utf-8")
    ast.parse(test_source)
    assert "cases_in(CASES)" in test_source and "check_case(case)" in test_source
    for rel in ("tests/designs/passing.yaml", "tests/designs/parts/example-parts.yaml",
                "tests/cases/trip-limit.yaml", "README.md"):
        assert (pkg / rel).is_file(), rel


def test_the_generated_cases_pass_against_the_generated_rule(tmp_path: Path) -> None:
    pkg = scaffold(tmp_path)
    reg = registry_with(pkg)
    params = cases_in(pkg / "tests" / "cases")
    cases = [p.values[0] for p in params]
    assert [c.id for c in cases] == [
        "trip-limit::the passing design passes",
        "trip-limit::two FET pairs in parallel trip too high",
        "trip-limit::a lower max_trip fails the passing design"]
    fired = {c.name: check_case(c, reg) for c in cases}
    assert fired["the passing design passes"] == []
    [double] = fired["two FET pairs in parallel trip too high"]
    [single] = fired["a lower max_trip fails the passing design"]
    # Two identical pairs in parallel halve the sense resistance and double the trip current
    # [practice: protector application notes, docs/references.md "Worked example"].
    trip_one, trip_two = single.figures[0].value, double.figures[0].value
    assert trip_two == pytest.approx(2 * trip_one, rel=0.02)
    assert 5.0 < trip_one < 10.0 < trip_two


def test_the_generated_cases_can_fail(tmp_path: Path) -> None:
    pkg = scaffold(tmp_path)
    cases = pkg / "tests" / "cases" / "trip-limit.yaml"
    text = cases.read_text(encoding="utf-8")
    q2 = next(line for line in text.splitlines() if line.startswith("    add: {components.Q2:"))
    cases.write_text(text.replace(q2 + "\n", ""), encoding="utf-8")  # the flaw removed
    [case] = [c for c in load_cases(cases) if c.name == "two FET pairs in parallel trip too high"]
    assert case.overrides == ()
    with pytest.raises(AssertionError, match="expected, not found"):
        check_case(case, registry_with(pkg))


def test_the_option_reads_units_from_the_project_config(tmp_path: Path) -> None:
    pkg = scaffold(tmp_path)
    reg = registry_with(pkg)
    config = tmp_path / "packwarden.toml"
    config.write_text('[rules.trip-limit]\nmax_trip = "8 A"\n', encoding="utf-8")
    options = check_against_rules(load_config(config, "packwarden.toml"), reg.rules)
    assert options["trip-limit"].max_trip == 8.0
    config.write_text('[rules.trip-limit]\nmax_trip = "8 V"\n', encoding="utf-8")
    with pytest.raises(Exception, match="'8 V' is in volts; expected amperes"):
        check_against_rules(load_config(config, "packwarden.toml"), reg.rules)


def test_an_existing_folder_is_not_overwritten(tmp_path: Path) -> None:
    pkg = scaffold(tmp_path)
    (pkg / "README.md").write_text("my notes", encoding="utf-8")
    result = CliRunner().invoke(app, ["new-rule", "trip-limit", "--dir", str(tmp_path)])
    assert result.exit_code == 2
    assert result.stderr.strip() == (f"packwarden new-rule: {pkg} already exists; choose another "
                                     f"--dir or remove it")
    assert (pkg / "README.md").read_text(encoding="utf-8") == "my notes"


@pytest.mark.parametrize("name", ["Trip", "trip_limit", "-trip", "trip-", "trip--limit", "9v",
                                  "../escape", "a" * 61, ""])
def test_names_that_are_no_rule_id_are_refused(tmp_path: Path, name: str) -> None:
    with pytest.raises(ScaffoldError, match="must be lowercase words joined by '-'"):
        new_rule(name, tmp_path)
    assert list(tmp_path.iterdir()) == []


def test_names_map_onto_python_and_packaging_names() -> None:
    n = Names.of("fuse-derating2")
    assert (n.distribution, n.package, n.module) == (
        "packwarden-fuse-derating2", "packwarden_fuse_derating2", "fuse_derating2")
    assert n.package.isidentifier() and n.module.isidentifier()
