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
from packwarden.testing import (Case, CaseError, Expected, Override, cases_in, check_case,
                                load_cases, run_case)

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
    assert any(c.design.resolve() == EXAMPLE.resolve() and not c.overrides and not c.expect
               for c in cases), \
        f"{rule_id}: the clean example is not among its passing cases"


def test_the_ids_are_rule_and_case_name() -> None:
    ids = [p.id for p in cases_in(CASES)]
    assert "unknown-part::misspelt part name suggests the nearest part" in ids
    assert len(ids) == len(set(ids))


# --- the harness fails when it should ---------------------------------------------------------

def _case(name: str, design: Path, *expect: Expected, rule: str = "unknown-part",
          overrides: tuple[Override, ...] = ()) -> Case:
    return Case(rule=rule, name=name, design=design, expect=tuple(expect), source="test:1",
                overrides=overrides)


MISSPELT = (Override("set", "components.Q1.part", "OR-FET-D2O", "test:2"),)


def _position_of(path: Path, line_start: str, text: str) -> str:
    """``file:line:column`` of ``text`` on the line of ``path`` that starts with ``line_start``."""
    for number, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
        if line.startswith(line_start):
            return f"{path.relative_to(REPO).as_posix()}:{number}:{line.index(text) + 1}:"
    raise AssertionError(f"no line starting {line_start!r} in {path}")


def test_a_missing_finding_fails_with_a_readable_diff() -> None:
    case = _case("wrong element", EXAMPLE, Expected(element="Q2", message_contains="OR-FET-D2O"),
                 overrides=MISSPELT)
    with pytest.raises(AssertionError) as info:
        check_case(case)
    text = str(info.value)
    assert "expected, not found (1):" in text
    assert "- element Q2, message containing 'OR-FET-D2O'" in text
    # the finding that was there is shown, with its location, so the fix is obvious; the design
    # is the example with one change, and the finding points at the example's text it replaced
    assert "found, not expected (1):" in text
    assert "unknown-part: Q1: part 'OR-FET-D2O' is not in any library" in text
    assert "design: example_designs/orchard-probe.yaml\n  set components.Q1.part = 'OR-FET-D2O'" \
        in text
    assert _position_of(EXAMPLE, "  Q1: {part: OR-FET-D20", "OR-FET-D20") in text


def test_an_unexpected_finding_fails() -> None:
    with pytest.raises(AssertionError, match=r"found, not expected \(1\)"):
        check_case(_case("expects nothing", EXAMPLE, overrides=MISSPELT))


def test_an_expected_finding_on_a_clean_design_fails() -> None:
    with pytest.raises(AssertionError, match=r"expected, not found \(1\)"):
        check_case(_case("clean", EXAMPLE, Expected(element="Q1")))


def test_two_expectations_cannot_share_one_finding() -> None:
    once = Expected(element="Q1")
    with pytest.raises(AssertionError, match=r"expected, not found \(1\)"):
        check_case(_case("twice", EXAMPLE, once, once, overrides=MISSPELT))


def test_matching_is_one_to_one_not_greedy() -> None:
    # The loose expectation is listed first and matches both findings; a greedy pairing would give
    # it the only finding the strict one can take, and fail a case that is right.
    gates_open = (Override("delete", "components.U1.pins.charge_gate"),
                  Override("delete", "components.U1.pins.discharge_gate"))
    case = _case("order", EXAMPLE, Expected(element="U1"),
                 Expected(message_contains="'charge_gate'"), rule="unconnected-pin",
                 overrides=gates_open)
    findings = check_case(case)
    assert len(findings) == 2


def test_severity_is_compared() -> None:
    with pytest.raises(AssertionError):
        check_case(_case("severity", EXAMPLE, Expected(element="Q1", severity=Severity.warning),
                         overrides=MISSPELT))


def test_only_the_case_rule_findings_are_kept() -> None:
    # an unknown part Q1 also strands nets DG and CG (single-connection-net); not this rule's.
    findings = run_case(_case("own", EXAMPLE, overrides=MISSPELT))
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


# --- a case as a base design plus changes -----------------------------------------------------

def test_changes_are_read_with_the_line_each_is_written_on(tmp_path: Path) -> None:
    root = _project(tmp_path)
    (root / "cases/unknown-part.yaml").write_text(
        "rule: unknown-part\ncases:\n  - name: misspelt\n    design: designs/probe.yaml\n"
        "    set: {components.Q1.part: OR-FET-D2O}\n"
        "    add:\n      components.R9: {kind: resistor, value: 1 MΩ, pins: [DG, B-]}\n"
        "    delete: [charger.temperature_window]\n"
        "    expect:\n      - {element: Q1, hint_contains: \"did you mean 'OR-FET-D20'?\"}\n")
    [case] = load_cases(root / "cases/unknown-part.yaml")
    assert case.design == root / "designs/probe.yaml"
    assert [(o.action, o.path, o.value, o.source.rsplit(":", 1)[1]) for o in case.overrides] == [
        ("set", "components.Q1.part", "OR-FET-D2O", "5"),
        ("add", "components.R9", {"kind": "resistor", "value": "1 MΩ", "pins": ["DG", "B-"]}, "7"),
        ("delete", "charger.temperature_window", None, "8")]
    # the base's library path is relative to the base file, which the changed design shares
    [finding] = check_case(case)
    assert finding.location.file.endswith("designs/probe.yaml")


@pytest.mark.parametrize("change, line, message", [
    ("    set: {components.Q1.part: null}\n", 5, "'components.Q1.part' has no value; to remove it"),
    ("    set: [components.Q1.part]\n", 5, "'set' is a mapping of YAML path to value"),
    ("    delete: components.Q1.part\n", 5, "'delete' is a list of YAML paths"),
    ("    delete: [components..Q1]\n", 5, "'components..Q1' is not a dotted YAML path"),
    ("    add: {}\n", 5, "'add' is a mapping of YAML path to value"),
    ("    sett: {components.Q1.part: X}\n", 5, "unknown key 'sett' (did you mean 'set'?)"),
])
def test_change_mistakes_name_file_and_line(tmp_path: Path, change: str, line: int,
                                            message: str) -> None:
    root = _project(tmp_path)
    path = root / "cases/unknown-part.yaml"
    path.write_text("rule: unknown-part\ncases:\n  - name: a\n    design: designs/probe.yaml\n"
                    + change + "    expect: []\n")
    with pytest.raises(InputError) as info:
        load_cases(path)
    assert info.value.line == line, str(info.value)
    assert message in info.value.message


def test_a_change_the_base_cannot_take_is_an_error_naming_its_line() -> None:
    case = _case("typo", EXAMPLE, overrides=(Override("set", "components.Q9.part", "X",
                                                       "cases/unknown-part.yaml:12"),))
    with pytest.raises(CaseError, match=r"^cases/unknown-part\.yaml:12: set components\.Q9\.part: "
                                        r"the base design has no 'Q9' in components .*"
                                        r"\(base design example_designs/orchard-probe\.yaml\)$"):
        run_case(case)


def test_a_changed_design_that_does_not_validate_is_located_in_the_base() -> None:
    case = _case("broken", EXAMPLE, overrides=(Override("set", "load.continuous", "lots"),))
    with pytest.raises(CaseError, match="cannot be used, so it proves nothing") as info:
        run_case(case)
    assert _position_of(EXAMPLE, "  continuous: 1.2 A", "1.2 A") in str(info.value)


def test_a_finding_on_an_added_component_points_at_the_base_components_key() -> None:
    base = REPO / "example_designs/flawed/narrow-trace.yaml"
    wire = {"kind": "wire", "rated_current": "5 A", "resistance": "4 mΩ", "pins": ["FUSED", "P+"]}
    case = _case("wire", base, Expected(element="W1"), rule="conductor-capacity",
                 overrides=(Override("delete", "components.T1"),
                            Override("add", "components.W1", wire)))
    [finding] = check_case(case)
    assert finding.location.path == ("components", "W1")
    shown = f"{finding.location.file}:{finding.location.line}:{finding.location.column}:"
    assert shown == _position_of(base, "components:", "components")
