"""The one runner over tests/rules/cases/*.yaml, and checks that the harness can fail."""

from __future__ import annotations

import shutil
from dataclasses import replace
from importlib.metadata import entry_points
from pathlib import Path

import pytest

from packwarden import Severity
from packwarden.engine import ENTRY_POINT_GROUP
from packwarden.loader import InputError
from packwarden.testing import (Case, CaseError, Expected, cases_in, check_case, load_cases,
                                run_case)

HERE = Path(__file__).parent
CASES = HERE / "cases"
REPO = HERE.parent.parent
EXAMPLE = REPO / "example_designs" / "orchard-probe.yaml"
LIBRARY = REPO / "example_designs" / "parts" / "orchard-parts.yaml"


@pytest.mark.parametrize("case", cases_in(CASES))
def test_rule_case(case: Case) -> None:
    check_case(case)


# --- every built-in rule has cases ----------------------------------------------------------------

def _builtin_ids() -> set[str]:
    return {ep.name for ep in entry_points(group=ENTRY_POINT_GROUP)
            if ep.dist is not None and ep.dist.name == "packwarden"}


@pytest.mark.parametrize("rule_id", sorted(_builtin_ids()))
def test_every_builtin_rule_has_a_passing_and_a_failing_case(rule_id: str) -> None:
    path = CASES / f"{rule_id}.yaml"
    assert path.is_file(), f"rule {rule_id} has no case file {path.relative_to(REPO)}"
    cases = load_cases(path)
    assert any(not c.expect for c in cases), f"{rule_id}: no case where the rule stays silent"
    assert any(c.expect for c in cases), f"{rule_id}: no case where the rule fires"
    assert any(c.design.resolve() == EXAMPLE.resolve() and not c.expect for c in cases), \
        f"{rule_id}: the clean example is not among its passing cases"


def test_the_ids_are_rule_and_case_name() -> None:
    ids = [p.id for p in cases_in(CASES)]
    assert "unknown-part::misspelt part name suggests the nearest part" in ids
    assert len(ids) == len(set(ids))


# --- the harness fails when it should ---------------------------------------------------------

def _case(name: str, design: Path, *expect: Expected, rule: str = "unknown-part") -> Case:
    return Case(rule=rule, name=name, design=design, expect=tuple(expect), source="test:1")


MISSPELT = REPO / "tests/rules/designs/unknown-part/misspelt.yaml"


def test_a_missing_finding_fails_with_a_readable_diff() -> None:
    case = _case("wrong element", MISSPELT, Expected(element="Q2", message_contains="OR-FET-D2O"))
    with pytest.raises(AssertionError) as info:
        check_case(case)
    text = str(info.value)
    assert "expected, not found (1):" in text
    assert "- element Q2, message containing 'OR-FET-D2O'" in text
    # the finding that was there is shown, with its location, so the fix is obvious
    assert "found, not expected (1):" in text
    assert "unknown-part: Q1: part 'OR-FET-D2O' is not in any library" in text
    assert "misspelt.yaml:22:14:" in text


def test_an_unexpected_finding_fails() -> None:
    with pytest.raises(AssertionError, match=r"found, not expected \(1\)"):
        check_case(_case("expects nothing", MISSPELT))


def test_an_expected_finding_on_a_clean_design_fails() -> None:
    with pytest.raises(AssertionError, match=r"expected, not found \(1\)"):
        check_case(_case("clean", EXAMPLE, Expected(element="Q1")))


def test_two_expectations_cannot_share_one_finding() -> None:
    once = Expected(element="Q1")
    with pytest.raises(AssertionError, match=r"expected, not found \(1\)"):
        check_case(_case("twice", MISSPELT, once, once))


def test_matching_is_one_to_one_not_greedy() -> None:
    # The loose expectation is listed first and matches both findings; a greedy pairing would give
    # it the only finding the strict one can take, and fail a case that is right.
    design = REPO / "tests/rules/designs/unconnected-pin/two-gates-open.yaml"
    case = _case("order", design, Expected(element="U1"),
                 Expected(message_contains="'charge_gate'"), rule="unconnected-pin")
    findings = check_case(case)
    assert len(findings) == 2


def test_severity_is_compared() -> None:
    with pytest.raises(AssertionError):
        check_case(_case("severity", MISSPELT, Expected(element="Q1", severity=Severity.warning)))


def test_only_the_case_rule_findings_are_kept() -> None:
    # misspelt.yaml also strands nets DG and CG (single-connection-net); they are not this rule's.
    findings = run_case(_case("own", MISSPELT))
    assert [f.rule for f in findings] == ["unknown-part"]


def test_a_design_that_does_not_load_is_an_error_not_a_pass(tmp_path: Path) -> None:
    broken = tmp_path / "broken.yaml"
    broken.write_text(EXAMPLE.read_text().replace("continuous: 1.2 A", "continuous: lots"))
    with pytest.raises(CaseError, match="cannot be used, so it proves nothing"):
        run_case(_case("broken", broken))


def test_a_missing_design_is_an_error() -> None:
    with pytest.raises(CaseError, match="does not exist"):
        run_case(_case("gone", REPO / "tests/rules/designs/nowhere.yaml"))


def test_an_unregistered_rule_is_an_error_with_a_suggestion() -> None:
    with pytest.raises(CaseError, match=r"rule 'unknown-prat' is not registered "
                                        r"\(did you mean 'unknown-part'\?\)"):
        run_case(_case("typo", EXAMPLE, rule="unknown-prat"))


# --- case files are read strictly -------------------------------------------------------------

def _project(tmp_path: Path) -> Path:
    (tmp_path / "pyproject.toml").write_text("[project]\nname = 'team-rules'\n")
    (tmp_path / "designs/parts").mkdir(parents=True)
    shutil.copy(LIBRARY, tmp_path / "designs/parts/orchard-parts.yaml")
    shutil.copy(EXAMPLE, tmp_path / "designs/probe.yaml")
    (tmp_path / "cases").mkdir()
    return tmp_path


def test_designs_are_relative_to_the_folder_holding_pyproject(tmp_path: Path) -> None:
    root = _project(tmp_path)
    (root / "cases/unknown-part.yaml").write_text(
        "rule: unknown-part\ncases:\n  - name: clean\n    design: designs/probe.yaml\n    expect: []\n")
    [case] = load_cases(root / "cases/unknown-part.yaml")
    assert case.design == root / "designs/probe.yaml"
    assert case.id == "unknown-part::clean"
    assert check_case(case) == []


@pytest.mark.parametrize("text, line, message", [
    ("rule: unknown-part\ncases:\n  - name: a\n    desgin: designs/probe.yaml\n    expect: []\n",
     4, "unknown key 'desgin' (did you mean 'design'?)"),
    ("rule: unknown-part\ncases:\n  - name: a\n    design: designs/probe.yaml\n",
     3, "'expect' must be a list"),
    ("rule: unknown-part\ncases:\n  - name: a\n    design: designs/probe.yaml\n    expect:\n"
     "      - {element: Q1, severity: fatal}\n", 6, "unknown severity 'fatal'"),
    ("rule: unknown-part\ncases:\n  - name: a\n    design: designs/probe.yaml\n    expect:\n"
     "      - {element: Q1, message: part}\n", 6, "unknown key 'message'"),
    ("rule: unknown-part\ncases:\n  - name: a\n    design: d.yaml\n    expect: []\n"
     "  - name: a\n    design: d.yaml\n    expect: []\n", 6, "case name 'a' is also used on line 3"),
    ("rule: unknown-pin\ncases:\n  - name: a\n    design: d.yaml\n    expect: []\n",
     1, "tests rule 'unknown-pin'; name it unknown-pin.yaml"),
    ("rule: unknown-part\ncases: []\n", 2, "'cases' must be a non-empty list"),
    ("rule: unknown-part\ncases:\n  - name: a\n    design: d.yaml\n    expect:\n"
     "      - {element: null, message_contains: no cell}\n", 6, "'element' has no value"),
])
def test_case_file_mistakes_name_file_and_line(tmp_path: Path, text: str, line: int,
                                               message: str) -> None:
    root = _project(tmp_path)
    path = root / "cases/unknown-part.yaml"
    path.write_text(text)
    with pytest.raises(InputError) as info:
        load_cases(path)
    assert info.value.line == line, str(info.value)
    assert message in info.value.message
    assert info.value.file.endswith("unknown-part.yaml")


def test_an_empty_case_folder_is_an_error_not_zero_tests(tmp_path: Path) -> None:
    with pytest.raises(InputError, match="no case files"):
        cases_in(tmp_path)


def test_a_case_file_outside_any_project_is_an_error(tmp_path: Path) -> None:
    lonely = tmp_path / "unknown-part.yaml"
    lonely.write_text("rule: unknown-part\ncases:\n  - {name: a, design: d.yaml, expect: []}\n")
    if any((p / "pyproject.toml").is_file() for p in tmp_path.parents):
        pytest.skip("a pyproject.toml sits above the temporary folder")
    with pytest.raises(InputError, match="no pyproject.toml"):
        load_cases(lonely)


def test_options_a_rule_does_not_have_are_an_error() -> None:
    case = replace(_case("opts", EXAMPLE), options={"threshold": 3})
    with pytest.raises(CaseError, match="options of rule 'unknown-part'"):
        run_case(case)
