"""The engine end to end: registry, rule isolation, config, fingerprints, waivers, exit codes, output.

Each test builds a small repository of its own under tmp_path (the example design and its library,
a config when the test needs one) and works from inside it, so nothing here depends on where the
suite runs or on config files of the surrounding checkout.
"""

from __future__ import annotations

import datetime as dt
import importlib.metadata
import json
import re
import shutil
import textwrap
from importlib.metadata import EntryPoint
from pathlib import Path

import pytest
from typer.testing import CliRunner

from packwarden import Severity
from packwarden.cli import app
from packwarden.engine import (ENTRY_POINT_GROUP, Registry, Session, lint, lint_file, load_folder,
                               load_registry)

REPO = Path(__file__).resolve().parent.parent
EXAMPLE = (REPO / "example_designs" / "orchard-probe.yaml").read_text(encoding="utf-8")
LIBRARY = REPO / "example_designs" / "parts" / "orchard-parts.yaml"
INTEGRITY = ("unknown-part", "unknown-pin", "unconnected-pin", "pin-form", "single-connection-net",
             "essential-parts")

# One-flaw variants of the example, as (old, new) text substitutions.
BAD_PART = ("part: OR-FET-D20", "part: OR-FET-D2O")  # Q1: letter O for zero
BAD_NET = ("pins: [VDD, B-]", "pins: [VD, B-]")  # C1: single-connection net VD (a warning)
NO_GATES = ("discharge_gate: DG, charge_gate: CG", "")  # U1: two open pins


def flawed(*subs: tuple[str, str]) -> str:
    text = EXAMPLE
    for old, new in subs:
        assert text.count(old) == 1, old
        text = text.replace(old, new)
    return text


@pytest.fixture
def repo(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    """A repository holding designs/ (with the example's library) and nothing else; cwd inside."""
    (tmp_path / ".git").mkdir()
    (tmp_path / "designs" / "parts").mkdir(parents=True)
    shutil.copy(LIBRARY, tmp_path / "designs" / "parts" / "orchard-parts.yaml")
    monkeypatch.chdir(tmp_path)
    return tmp_path


def design(root: Path, text: str = EXAMPLE, name: str = "probe.yaml") -> Path:
    path = root / "designs" / name
    path.write_text(text, encoding="utf-8")
    return path


def integrity_registry() -> Registry:
    """The built-in integrity rules only, so a test's outcome is not moved by rules added later."""
    full = load_registry()
    return Registry(rules={rid: full.rules[rid] for rid in INTEGRITY})


def rules_of(run) -> list[str]:
    return sorted(f.rule for f in run.all_findings())


def write_module(folder: Path, name: str, source: str) -> Path:
    folder.mkdir(parents=True, exist_ok=True)
    path = folder / name
    path.write_text(textwrap.dedent(source), encoding="utf-8")
    return path


BUDGET_RULE = '''
    from packwarden import RuleOptions, rule


    class Options(RuleOptions):
        max_components: int = 100


    @rule(id="component-budget", summary="the design stays within a component budget",
          severity="warning", options=Options)
    def check(ctx, options):
        """A team rule with an option, to show options reach the rule."""
        n = len(ctx.netlist.components)
        if n > options.max_components:
            yield ctx.finding(f"{n} components, budget {options.max_components}",
                              path=("components",), key="budget")
'''


# --- registry -----------------------------------------------------------------------------------

def test_builtin_rules_come_from_entry_points() -> None:
    reg = load_registry()
    assert reg.broken == []
    for rid in INTEGRITY:
        assert reg.rules[rid].origin == f"packwarden:{rid}"
    declared = {ep.name for ep in importlib.metadata.entry_points(group=ENTRY_POINT_GROUP)
                if ep.dist is not None and ep.dist.name == "packwarden"}
    assert declared <= set(reg.rules)
    # the entry-point name is the rule id: a mismatch would make `select` lie about what runs
    assert all(reg.rules[name].id == name for name in declared)


def _with_entry_points(monkeypatch: pytest.MonkeyPatch, *extra: EntryPoint) -> None:
    real = importlib.metadata.entry_points

    def fake(**kwargs):
        found = list(real(**kwargs))
        return found + [ep for ep in extra if ep.group == kwargs.get("group")]
    monkeypatch.setattr(importlib.metadata, "entry_points", fake)
    # the per-environment cache cannot see a patched library function: read it every time
    monkeypatch.setenv("PACKWARDEN_CACHE_DIR", "")


def test_a_plugin_reusing_a_builtin_id_is_reported_and_the_builtin_kept(
        tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    write_module(tmp_path, "team_dup_rules.py", '''
        from packwarden import rule

        @rule(id="unknown-part", summary="a team's own idea of unknown parts")
        def dup(ctx, options):
            """Never runs."""
            yield from ()
    ''')
    monkeypatch.syspath_prepend(str(tmp_path))
    _with_entry_points(monkeypatch, EntryPoint("unknown-part", "team_dup_rules:dup", ENTRY_POINT_GROUP))
    reg = load_registry()
    assert reg.rules["unknown-part"].origin == "packwarden:unknown-part"
    [(origin, message)] = reg.broken
    assert origin == "team_dup_rules:unknown-part"
    assert message == ("duplicate rule id 'unknown-part': defined by packwarden:unknown-part "
                       "and by team_dup_rules:unknown-part")


def test_a_duplicate_id_between_rule_modules_is_reported(tmp_path: Path) -> None:
    for name in ("a_first.py", "b_second.py"):
        write_module(tmp_path / "team", name, '''
            from packwarden import rule

            @rule(id="team-dup", summary="defined twice")
            def check(ctx, options):
                """Twice."""
                yield from ()
        ''')
    reg = Registry()
    load_folder(reg, tmp_path / "team")
    assert reg.rules["team-dup"].origin.endswith("a_first.py")
    [(origin, message)] = reg.broken
    assert origin.endswith("b_second.py")
    assert "duplicate rule id 'team-dup'" in message and "a_first.py" in message


def test_a_plugin_that_fails_to_import_is_named_and_the_rest_run(
        repo: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    _with_entry_points(monkeypatch, EntryPoint("ghost-rule", "packwarden_no_such_plugin:check",
                                               ENTRY_POINT_GROUP))
    reg = load_registry()
    [(origin, message)] = reg.broken
    assert origin == "packwarden_no_such_plugin:ghost-rule"
    assert "plugin packwarden_no_such_plugin:ghost-rule failed to load: ModuleNotFoundError" in message
    assert set(INTEGRITY) <= set(reg.rules)

    run = lint([str(design(repo, flawed(BAD_PART)))], registry=reg)
    assert "unknown-part" in rules_of(run)
    assert run.exit_code() == 2  # a missing plugin means the review is incomplete
    result = CliRunner().invoke(app, ["check", "designs/probe.yaml"])
    assert result.exit_code == 2
    assert "packwarden_no_such_plugin:ghost-rule" in result.stdout
    assert "unknown-part: Q1: part 'OR-FET-D2O'" in result.stdout


def test_a_rule_module_that_fails_to_import_is_named_and_the_rest_load(tmp_path: Path) -> None:
    write_module(tmp_path / "team", "broken.py", "from packwarden import no_such_name\n")
    write_module(tmp_path / "team", "budget.py", BUDGET_RULE)
    reg = Registry()
    load_folder(reg, tmp_path / "team")
    assert "component-budget" in reg.rules
    [(origin, message)] = reg.broken
    assert origin.endswith("broken.py")
    assert "failed to load: ImportError" in message


def test_an_entry_point_that_is_not_a_rule_is_reported(monkeypatch: pytest.MonkeyPatch) -> None:
    _with_entry_points(monkeypatch, EntryPoint("not-a-rule", "os:sep", ENTRY_POINT_GROUP))
    reg = load_registry()
    assert [m for _, m in reg.broken] == ["os:not-a-rule is not a packwarden Rule (got str)"]


# --- rule isolation -----------------------------------------------------------------------------

def test_a_rule_that_raises_is_an_internal_error_and_the_others_still_report(repo: Path) -> None:
    write_module(repo / "team", "exploding.py", '''
        from packwarden import rule

        @rule(id="exploding-rule", summary="divides by zero", scope="netlist")
        def check(ctx, options):
            """Always fails."""
            yield ctx.finding("about to fail", path=("components",))
            1 / 0
    ''')
    reg = integrity_registry()
    load_folder(reg, repo / "team")
    run = lint([str(design(repo, flawed(BAD_PART)))], registry=reg)
    [result] = run.designs
    [internal] = result.internal
    assert internal.rule == "exploding-rule"
    assert internal.message.startswith("ZeroDivisionError: division by zero (at exploding.py:")
    assert "unknown-part" in rules_of(run)
    assert run.exit_code() == 2


# --- config -------------------------------------------------------------------------------------

def test_tool_packwarden_in_pyproject_is_found_upward(repo: Path) -> None:
    path = design(repo, flawed(BAD_NET))
    reg = integrity_registry()
    assert rules_of(lint([str(path)], registry=reg)) == ["single-connection-net"]
    (repo / "pyproject.toml").write_text('[project]\nname = "probe"\n\n[tool.packwarden]\n'
                                         'ignore = ["single-connection-net"]\n')
    assert rules_of(lint([str(path)], registry=reg)) == []


def test_the_nearest_config_wins_and_pyproject_without_the_table_is_passed_over(repo: Path) -> None:
    path = design(repo, flawed(BAD_PART, BAD_NET))
    (repo / "packwarden.toml").write_text('ignore = ["unknown-part"]\n')
    (repo / "designs" / "pyproject.toml").write_text('[project]\nname = "not-packwarden"\n')
    reg = integrity_registry()
    assert "unknown-part" not in rules_of(lint([str(path)], registry=reg))
    (repo / "designs" / "packwarden.toml").write_text('select = ["unknown-part"]\n')
    assert rules_of(lint([str(path)], registry=reg)) == ["unknown-part"]


def test_select_and_ignore(repo: Path) -> None:
    path = design(repo, flawed(BAD_PART, BAD_NET))
    config = repo / "packwarden.toml"
    config.write_text('select = ["unknown-part", "single-connection-net"]\n')
    found = set(rules_of(lint([str(path)])))
    assert found == {"unknown-part", "single-connection-net"}
    config.write_text('select = ["unknown-part", "single-connection-net"]\n'
                      'ignore = ["single-connection-net"]\n')
    assert set(rules_of(lint([str(path)]))) == {"unknown-part"}


def test_a_severity_override_changes_the_finding_and_the_exit_code(repo: Path) -> None:
    path = design(repo, flawed(BAD_NET))
    config = repo / "packwarden.toml"
    config.write_text('select = ["single-connection-net"]\n')
    run = lint([str(path)])
    assert [f.severity for f in run.all_findings()] == [Severity.warning]
    assert run.exit_code() == 0
    config.write_text('select = ["single-connection-net"]\n[severity]\nsingle-connection-net = "error"\n')
    run = lint([str(path)])
    assert [f.severity for f in run.all_findings()] == [Severity.error]
    assert run.exit_code() == 1


def test_rule_options_reach_the_rule(repo: Path) -> None:
    write_module(repo / "team_rules", "budget.py", BUDGET_RULE)
    path = design(repo)
    config = repo / "pyproject.toml"
    base = '[tool.packwarden]\nrule_paths = ["team_rules"]\nselect = ["component-budget"]\n'
    config.write_text(base)
    assert lint([str(path)]).all_findings() == []
    config.write_text(base + "\n[tool.packwarden.rules.component-budget]\nmax_components = 5\n")
    [finding] = lint([str(path)]).all_findings()
    assert finding.message == "8 components, budget 5"
    assert finding.severity is Severity.warning


CONFIG_MISTAKES = [
    pytest.param("pyproject.toml", '''
        [project]
        name = "probe"

        [tool.packwarden]
        selct = ["unknown-part"]
        ''', 5, 1, "unknown config key 'selct' (did you mean 'select'?)", id="unknown-key"),
    pytest.param("pyproject.toml", '''
        [tool.packwarden]
        fail_on = "warning"
        select = ["unknown-prat"]
        ''', 3, 12, "unknown rule 'unknown-prat' in select (did you mean 'unknown-part'?)",
        id="unknown-rule-in-select"),
    pytest.param("pyproject.toml", '''
        [tool.packwarden]
        ignore = ["pin-form"]   # pin-frm was the old name

        [tool.packwarden.severity]
        pin-frm = "warning"
        ''', 5, 1, "unknown rule 'pin-frm' in severity (did you mean 'pin-form'?)",
        id="unknown-rule-in-severity"),
    pytest.param("pyproject.toml", '''
        [tool.packwarden]
        select = ["unknown-pin", "pin-form"]

        [tool.packwarden.severity]
        unknown-pin = "fatal"
        ''', 5, 1, "severity of 'unknown-pin': unknown severity 'fatal'; use error, warning or info",
        id="bad-severity"),
    pytest.param("pyproject.toml", '''
        [tool.packwarden]
        fail_on = "critical"
        ''', 2, 1, "unknown severity 'critical'; use error, warning or info", id="bad-fail-on"),
    pytest.param("pyproject.toml", '''
        [tool.packwarden.rules.unknown-part]
        cutoff = 0.6
        ''', 2, 1, "unknown option 'cutoff' for rule 'unknown-part'; its options are: none",
        id="option-of-a-rule-without-options"),
    pytest.param("pyproject.toml", '''
        [project]
        description = "max_component budget"

        [tool.packwarden]
        rule_paths = ["team_rules"]

        [tool.packwarden.rules.component-budget]
        max_component = 5
        ''', 8, 1, "unknown option 'max_component' for rule 'component-budget' "
                   "(did you mean 'max_components'?)", id="unknown-option"),
    pytest.param("pyproject.toml", '''
        [tool.packwarden]
        rule_paths = ["team_rules"]

        [tool.packwarden.rules.component-budget]
        max_components = "many"
        ''', 5, 1, "option 'max_components' of rule 'component-budget': Input should be a valid "
                   "integer", id="bad-option-value"),
    pytest.param("pyproject.toml", '''
        [tool.packwarden]
        select = ["unknown-part"]

        [tool.packwarden.rules.unknown-prt]
        ''', 4, 24, "unknown rule 'unknown-prt' in [tool.packwarden.rules] "
                    "(did you mean 'unknown-part'?)", id="unknown-rule-table"),
    pytest.param("packwarden.toml", '''
        select = ["unknown-pin"]
        [severity]
        unknown-pin = "fatal"
        ''', 3, 1, "severity of 'unknown-pin': unknown severity 'fatal'", id="packwarden-toml"),
]


@pytest.mark.parametrize("name, text, line, column, message", CONFIG_MISTAKES)
def test_config_mistakes_are_input_errors_with_file_and_line(
        repo: Path, name: str, text: str, line: int, column: int, message: str) -> None:
    write_module(repo / "team_rules", "budget.py", BUDGET_RULE)
    (repo / name).write_text(textwrap.dedent(text).lstrip("\n"))
    run = lint([str(design(repo)), str(design(repo, name="second.yaml"))])
    [err] = run.input_errors()  # reported once, not once per design
    assert (err.file, err.line, err.column) == (name, line, column), str(err)
    assert message in err.message, err.message
    assert run.exit_code() == 2


def test_a_config_mistake_prints_file_line_and_exits_2(repo: Path) -> None:
    design(repo)
    (repo / "packwarden.toml").write_text('ignore = ["essential-part"]\n')
    result = CliRunner().invoke(app, ["check", "designs/probe.yaml"])
    assert result.exit_code == 2
    assert ("packwarden.toml:1:12: unknown rule 'essential-part' in ignore "
            "(did you mean 'essential-parts'?)") in result.stdout.splitlines()


# --- fingerprints -------------------------------------------------------------------------------

COMPONENTS = {
    "BT1": "  BT1: {part: OR-CELL-3400, pins: {pos: B+, neg: B-}}",
    "U1": "  U1:\n    part: OR-GUARD-1S\n    pins: {supply: VDD, ground: B-, sense: VM}",
    "Q1": "  Q1: {part: OR-FET-D20, pins: {s1: B-, g1: DG, d: MID, s2: P-, g2: CG}}",
    "R1": "  R1: {kind: resistor, value: 470 Ω, power: 0.1 W, pins: [B+, VDD]}",
    "C1": "  C1: {part: CAP-100N, pins: [VD, B-]}",
    "R2": "  R2: {part: RES-2K0, pins: [VM, P-]}",
    "F1": "  F1: {part: OR-FUSE-12A, pins: [B+, P+]}",
}


def _with_components(order: list[str], spacer: str = "") -> str:
    head = EXAMPLE.split("components:\n", 1)[0]
    return head + "components:\n" + "\n".join(spacer + COMPONENTS[r] for r in order) + "\n"


def _prints(run) -> dict[tuple, tuple[str, int]]:
    return {(f.rule, f.element, f.key): (f.fingerprint, f.location.line) for f in run.all_findings()}


def test_fingerprints_survive_reordering_and_inserted_lines(repo: Path) -> None:
    reg = integrity_registry()
    path = repo / "designs" / "probe.yaml"
    path.write_text(_with_components(list(COMPONENTS)))
    before = _prints(lint([str(path)], registry=reg))
    # gates of Q1 open (unconnected-pin x2 on U1), VD stranded (single-connection-net), DG, CG too
    assert len(before) >= 4
    path.write_text(_with_components(list(reversed(COMPONENTS)),
                                     spacer="\n  # reviewed 2024: see the layout notes\n"))
    after = _prints(lint([str(path)], registry=reg))
    assert after.keys() == before.keys()
    assert {k: fp for k, (fp, _) in after.items()} == {k: fp for k, (fp, _) in before.items()}
    assert {k: ln for k, (_, ln) in after.items()} != {k: ln for k, (_, ln) in before.items()}


def test_fingerprints_do_not_depend_on_the_working_folder(repo: Path, monkeypatch) -> None:
    design(repo, flawed(BAD_PART))
    reg = integrity_registry()
    from_root = {f.fingerprint for f in lint(["designs/probe.yaml"], registry=reg).all_findings()}
    monkeypatch.chdir(repo / "designs")
    from_inside = {f.fingerprint for f in lint(["probe.yaml"], registry=reg).all_findings()}
    assert from_root and from_root == from_inside


def test_fingerprints_tell_findings_and_designs_apart(repo: Path) -> None:
    reg = integrity_registry()
    one = lint([str(design(repo, flawed(NO_GATES)))], registry=reg).all_findings()
    prints = [f.fingerprint for f in one]
    assert len(prints) == len(set(prints))  # two open pins on U1 are two findings, two prints
    assert sum(f.rule == "unconnected-pin" for f in one) == 2
    other = lint([str(design(repo, flawed(NO_GATES), name="copy.yaml"))], registry=reg)
    assert {f.fingerprint for f in other.all_findings()}.isdisjoint(prints)


# --- waivers ------------------------------------------------------------------------------------

def _waived(expires: str | None = None, rule: str = "unknown-part", element: str = "Q1") -> str:
    waiver = f"  - rule: {rule}\n    element: {element}\n    reason: footprint shared with the rev B FET\n"
    if expires:
        waiver += f"    expires: {expires}\n"
    return flawed(BAD_PART) + "waivers:\n" + waiver


def test_a_waived_finding_does_not_fail_the_run(repo: Path) -> None:
    reg = integrity_registry()
    assert lint([str(design(repo, flawed(BAD_PART)))], registry=reg).exit_code() == 1
    run = lint([str(design(repo, _waived()))], registry=reg)
    [finding] = [f for f in run.all_findings() if f.rule == "unknown-part"]
    assert finding.waived == "footprint shared with the rev B FET"
    assert run.exit_code() == 0
    assert "waiver-hygiene" not in rules_of(run)


def test_an_expired_waiver_is_a_finding_and_waives_nothing(repo: Path) -> None:
    run = lint([str(design(repo, _waived(expires="2001-06-30")))], registry=integrity_registry())
    [part] = [f for f in run.all_findings() if f.rule == "unknown-part"]
    assert part.waived is None
    [expired] = [f for f in run.all_findings() if f.rule == "waiver-hygiene"]
    assert expired.severity is Severity.error
    assert expired.message == ("waiver for 'unknown-part' on Q1 expired on 2001-06-30; "
                               "its findings count again")
    assert expired.location.path == ("waivers", 0)
    assert run.exit_code() == 1


@pytest.mark.parametrize("today, expired", [(dt.date(2030, 3, 31), False), (dt.date(2030, 4, 1), True)])
def test_a_waiver_holds_through_its_expiry_day(repo: Path, today: dt.date, expired: bool) -> None:
    path = design(repo, _waived(expires="2030-03-31"))
    result = lint_file(Session(registry=integrity_registry(), today=today), path, "probe.yaml")
    [part] = [f for f in result.findings if f.rule == "unknown-part"]
    assert (part.waived is None) is expired
    assert any(f.rule == "waiver-hygiene" for f in result.findings) is expired


def test_a_waiver_that_matches_nothing_is_a_warning(repo: Path) -> None:
    path = design(repo, EXAMPLE + "waivers:\n  - {rule: unknown-pin, element: Q9, reason: left over}\n")
    run = lint([str(path)], registry=integrity_registry())
    [unused] = run.all_findings()
    assert (unused.rule, unused.severity) == ("waiver-hygiene", Severity.warning)
    assert unused.message == "waiver for 'unknown-pin' on Q9 matches no finding"
    assert run.exit_code() == 0
    assert lint([str(path)], registry=integrity_registry(), fail_on=Severity.warning).exit_code() == 1


# --- exit codes, text and JSON ------------------------------------------------------------------

def check(*args: str) -> tuple[int, str]:
    result = CliRunner().invoke(app, ["check", *args])
    return result.exit_code, result.stdout


def test_exit_codes_and_fail_on(repo: Path) -> None:
    design(repo)
    design(repo, flawed(BAD_NET), name="stray-net.yaml")
    design(repo, flawed(BAD_PART), name="bad-part.yaml")
    design(repo, EXAMPLE.replace("load:\n", "load:\n continuous: 1 A\n"), name="bad-yaml.yaml")
    (repo / "packwarden.toml").write_text('select = ["unknown-part", "single-connection-net"]\n')
    assert check("designs/probe.yaml")[0] == 0
    assert check("designs/stray-net.yaml")[0] == 0  # a warning does not fail by default
    assert check("--fail-on", "warning", "designs/stray-net.yaml")[0] == 1
    assert check("--fail-on", "info", "designs/stray-net.yaml")[0] == 1
    assert check("designs/bad-part.yaml")[0] == 1
    assert check("designs/bad-yaml.yaml")[0] == 2
    assert check("designs/no-such-design.yaml")[0] == 2
    assert check("designs/probe.yaml", "designs/bad-yaml.yaml")[0] == 2  # 2 outranks a clean design
    (repo / "packwarden.toml").write_text('select = ["single-connection-net"]\nfail_on = "warning"\n')
    assert check("designs/stray-net.yaml")[0] == 1
    assert check("--fail-on", "error", "designs/stray-net.yaml")[0] == 0  # the flag wins


FINDING_LINE = re.compile(r"^(?P<file>[^:\s]+):(?P<line>\d+):(?P<col>\d+): "
                          r"(?P<sev>error|warning|info) (?P<rule>[a-z0-9-]+): (?P<msg>.+)$")


def test_text_output_is_one_clickable_line_per_finding_with_the_hint_beneath(repo: Path) -> None:
    text = flawed(BAD_PART)
    design(repo, text)
    (repo / "packwarden.toml").write_text('select = ["unknown-part"]\n')
    code, out = check("designs/probe.yaml")
    lines = out.splitlines()
    [i] = [n for n, ln in enumerate(lines) if FINDING_LINE.match(ln)]
    m = FINDING_LINE.match(lines[i])
    # the position is that of the misspelt part name in the file
    row = next(n for n, ln in enumerate(text.splitlines(), 1) if "OR-FET-D2O" in ln)
    col = text.splitlines()[row - 1].index("OR-FET-D2O") + 1
    assert m.group("file", "line", "col", "sev", "rule") == (
        "designs/probe.yaml", str(row), str(col), "error", "unknown-part")
    assert m.group("msg") == "Q1: part 'OR-FET-D2O' is not in any library of this design"
    assert lines[i + 1] == "    hint: did you mean 'OR-FET-D20'?"
    assert "1 design(s) linted, 0 could not be read; 1 error(s), 0 warning(s)" in out
    assert code == 1


def test_json_output_holds_each_designs_figures_and_findings(repo: Path) -> None:
    design(repo)
    design(repo, flawed(BAD_PART), name="bad-part.yaml")
    (repo / "packwarden.toml").write_text('select = ["unknown-part"]\n')
    code, out = check("--format", "json", "designs/probe.yaml", "designs/bad-part.yaml")
    data = json.loads(out)
    assert data["exit_code"] == code == 1
    by_file = {d["file"]: d for d in data["designs"]}
    assert set(by_file) == {"designs/probe.yaml", "designs/bad-part.yaml"}
    for d in by_file.values():
        assert d["figures"]["component_count"] == 8
    assert by_file["designs/probe.yaml"]["findings"] == []
    [f] = by_file["designs/bad-part.yaml"]["findings"]
    assert (f["rule"], f["element"], f["location"]["path"]) == ("unknown-part", "Q1", "components.Q1.part")
    assert re.fullmatch(r"[0-9a-f]{20}", f["fingerprint"])


def test_electrical_rules_wait_for_a_clean_netlist(repo: Path) -> None:
    # A misspelt part must be reported once, as what it is, not also as "no discharge switch" and
    # every other consequence of the component having no data.
    run = lint([str(design(repo, flawed(BAD_PART)))])
    [result] = run.designs
    rules_fired = {f.rule for f in result.findings}
    assert rules_fired == {"unknown-part"}
    assert "switch-orientation" in result.skipped and "unknown-part" not in result.skipped


def test_severity_override_applies_to_every_finding_of_the_rule(repo: Path) -> None:
    (repo / "packwarden.toml").write_text('[severity]\nunknown-part = "info"\n', encoding="utf-8")
    run = lint([str(design(repo, flawed(BAD_PART)))])
    [result] = run.designs
    assert [f.severity.value for f in result.findings if f.rule == "unknown-part"] == ["info"]
    assert run.exit_code() == 0


def test_config_ignore_and_severity_reach_the_waiver_findings(repo: Path) -> None:
    text = EXAMPLE + ("waivers:\n  - rule: unknown-part\n    element: Q9\n"
                      "    reason: kept for a later board revision\n")
    path = design(repo, text)
    [before] = [f for f in lint([str(path)]).all_findings() if f.rule == "waiver-hygiene"]
    assert before.severity.value == "warning"
    (repo / "packwarden.toml").write_text('[severity]\nwaiver-hygiene = "error"\n', encoding="utf-8")
    [after] = [f for f in lint([str(path)]).all_findings() if f.rule == "waiver-hygiene"]
    assert after.severity.value == "error"
    (repo / "packwarden.toml").write_text('ignore = ["waiver-hygiene"]\n', encoding="utf-8")
    assert not [f for f in lint([str(path)]).all_findings() if f.rule == "waiver-hygiene"]


def test_lint_file_reports_the_time_of_each_stage() -> None:
    # The benchmark's per-stage table comes from here; the findings do not depend on timing.
    path = REPO / "example_designs" / "ridgeline-tool-4s2p.yaml"
    session = Session(registry=load_registry())
    plain = lint_file(session, path, "pack.yaml")
    timings: dict[str, float] = {"model": 1.0}  # added to, so one dict can sum a batch
    timed = lint_file(session, path, "pack.yaml", timings)
    assert list(timings) == ["model", "load", "validate", "libraries", "netlist", "rules"]
    assert all(v > 0 for v in timings.values()) and timings["model"] > 1.0
    assert [f.fingerprint for f in timed.findings] == [f.fingerprint for f in plain.findings]
    assert timed.figures == plain.figures


def test_a_design_that_fails_validation_times_only_the_stages_it_reached(tmp_path: Path) -> None:
    path = tmp_path / "broken.yaml"
    path.write_text("format: packwarden/1\ndesign: {name: x}\n", encoding="utf-8")
    timings: dict[str, float] = {}
    result = lint_file(Session(registry=load_registry()), path, "broken.yaml", timings)
    assert result.errors and set(timings) == {"load", "validate"}


def test_designs_of_one_folder_share_their_resolved_libraries(tmp_path: Path) -> None:
    # A batch resolves a folder's libraries once; each design still gets its own dict of parts,
    # and a design whose library is missing reports it at its own line, not from the cache.
    from packwarden.library import LibraryCache, resolve_libraries
    from packwarden.loader import load_file
    (tmp_path / "packwarden.toml").write_text("", encoding="utf-8")
    shutil.copytree(REPO / "example_designs" / "parts", tmp_path / "parts")
    good = tmp_path / "a.yaml"
    good.write_text(EXAMPLE, encoding="utf-8")
    missing = tmp_path / "b.yaml"
    missing.write_text(EXAMPLE.replace("libraries: [parts/orchard-parts.yaml]",
                                       "\nlibraries: [parts/nowhere.yaml]"), encoding="utf-8")
    cache = LibraryCache()
    first = resolve_libraries(load_file(good), ["parts/orchard-parts.yaml"], good, cache, tmp_path)
    first.parts.clear()  # the caller may do what it likes with its copy
    again = resolve_libraries(load_file(good), ["parts/orchard-parts.yaml"], good, cache, tmp_path)
    assert not again.errors and "OR-FET-D20" in again.parts and len(cache.resolved) == 1
    doc = load_file(missing, "b.yaml")
    for _ in range(2):
        res = resolve_libraries(doc, ["parts/nowhere.yaml"], missing, cache, tmp_path)
        assert [str(e).split(": ", 1)[0] for e in res.errors] == ["b.yaml:7:13"]  # one line lower than in a.yaml
    assert len(cache.resolved) == 1
