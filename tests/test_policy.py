"""Team policy files: limits without code, read strictly, reported as ordinary findings.

Each test builds a small repository under tmp_path (the Orchard example and its library, a config
naming a policy) and works from inside it. Expected values come from the example's own part data
(the data sheet values in example_designs/parts/orchard-parts.yaml) and from SI prefixes
[published: BIPM SI Brochure, 9th ed., table 7: m = 1e-3, µ = 1e-6, k = 1e3].
"""

from __future__ import annotations

import json
import shutil
import textwrap
from pathlib import Path

import jsonschema
import pytest
from typer.testing import CliRunner

from packwarden import Severity
from packwarden.cli import app
from packwarden.engine import lint, load_registry
from packwarden.loader import InputError
from packwarden.figures import DECLARED
from packwarden.policy import EVENT_FIGURES, load_policy, parameter_unit, policy_json_schema
from packwarden.report import RenderOptions, formatter, load_formats

REPO = Path(__file__).resolve().parent.parent
EXAMPLE = (REPO / "example_designs" / "orchard-probe.yaml").read_text(encoding="utf-8")
LIBRARY = REPO / "example_designs" / "parts" / "orchard-parts.yaml"
TEAM_POLICY = REPO / "examples" / "team-rules" / "team-policy.yaml"

BRIEF_POLICY = """\
format: packwarden-policy/1
limits:
  - id: trip-max-product-line        # becomes the finding's rule id: policy/<id>
    figure: trip_current_max
    max: 5 A
    severity: error
    reason: our connector is rated 5 A
  - id: fet-vds-30
    part: {kind: [fet, fet_pair_common_drain]}   # applies to every part of these kinds
    parameter: vds_max
    min: 30 V
  - id: no-legacy-fuse
    part: {name: OR-FUSE-12A}
    banned: true
    reason: obsolete, see ECN-17
"""


@pytest.fixture
def repo(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    (tmp_path / ".git").mkdir()
    (tmp_path / "designs" / "parts").mkdir(parents=True)
    shutil.copy(LIBRARY, tmp_path / "designs" / "parts" / "orchard-parts.yaml")
    (tmp_path / "designs" / "probe.yaml").write_text(EXAMPLE, encoding="utf-8")
    (tmp_path / "pyproject.toml").write_text('[tool.packwarden]\npolicy = "team-policy.yaml"\n')
    monkeypatch.chdir(tmp_path)
    return tmp_path


def with_policy(root: Path, text: str) -> Path:
    path = root / "team-policy.yaml"
    path.write_text(textwrap.dedent(text), encoding="utf-8")
    return path


def policy_findings(run) -> list:
    return [f for f in run.all_findings() if f.rule.startswith("policy/")]


def figures_of_example(root: Path) -> dict:
    (root / "pyproject.toml").unlink()
    [d] = lint(["designs/probe.yaml"]).designs
    (root / "pyproject.toml").write_text('[tool.packwarden]\npolicy = "team-policy.yaml"\n')
    return {name: fig.value for name, fig in d.figures.items()}


# --- reading ------------------------------------------------------------------------------------

def test_the_policy_of_the_brief_reads_into_si_limits(repo: Path) -> None:
    policy = load_policy(with_policy(repo, BRIEF_POLICY), "team-policy.yaml")
    trip, vds, fuse = policy.limits
    assert (trip.rule, trip.figure, trip.high, trip.low, trip.unit) == (
        "policy/trip-max-product-line", "trip_current_max", 5.0, None, "A")
    assert trip.reason == "our connector is rated 5 A" and trip.severity is Severity.error
    assert (vds.kinds, vds.parameter, vds.low, vds.unit) == (
        ("fet", "fet_pair_common_drain"), ("vds_max",), 30.0, "V")
    assert (fuse.names, fuse.banned, fuse.kinds) == (("OR-FUSE-12A",), True, ())
    assert trip.source == "team-policy.yaml:3"


@pytest.mark.parametrize("text, unit, expected", [
    ("60 mΩ", "Ω", 0.060),     # [published: SI prefix m = 1e-3]
    ("60 mohm", "Ω", 0.060),
    ("250 µA", "A", 250e-6),   # [published: SI prefix µ = 1e-6], micro sign U+00B5
    ("250 μA", "A", 250e-6),   # Greek mu U+03BC reads the same
    ("1.5 kV", "V", 1500.0),   # [published: SI prefix k = 1e3]
])
def test_bounds_read_with_si_prefixes(repo: Path, text: str, unit: str, expected: float) -> None:
    figure = {"Ω": "sense_resistance_max", "A": "trip_current_min", "V": "gate_drive_max"}[unit]
    policy = load_policy(with_policy(repo, f"""\
        format: packwarden-policy/1
        limits:
          - {{id: bound, figure: {figure}, max: {text}}}
        """))
    assert policy.limits[0].high == pytest.approx(expected, rel=1e-12)


POLICY_MISTAKES = [
    pytest.param("""\
        - id: a
          figure: trip_curent_max
          max: 5 A
        """, 4, 13, "unknown figure 'trip_curent_max' (did you mean 'trip_current_max'?)",
        id="figure-typo"),
    pytest.param("""\
        - id: a
          figure: trip_current_max
          max: 5 mV
        """, 5, 10, "max: '5 mV' is in volts; expected amperes (A) (figure trip_current_max is in "
                    "amperes (A))", id="wrong-unit"),
    pytest.param("""\
        - id: a
          figure: trip_current_max
          max: 5
        """, 5, 10, "max: missing unit: write '5 A' (amperes)", id="missing-unit"),
    pytest.param("""\
        - id: a
          figure: trip_current_max
          max: 4,5 A
        """, 5, 10, "uses a decimal comma", id="decimal-comma"),
    pytest.param("""\
        - id: a
          figure: cells
          max: 2 A
        """, 5, 10, "max: expected a plain number, got '2 A' (figure cells is a count)",
        id="count-with-unit"),
    pytest.param("""\
        - id: a
          part: {kind: fet}
          parameter: vds_mx
          min: 30 V
        """, 5, 16, "a fet has no parameter 'vds_mx' (did you mean 'vds_max'?)",
        id="parameter-typo"),
    pytest.param("""\
        - id: a
          part: {kind: cell}
          parameter: voltage
          max: 4.2 V
        """, 5, 16, "'voltage' of a cell is a group of values (charge, upper_limit, "
                    "overcharge_limit, nominal, cutoff, lower_limit); name one, e.g. "
                    "voltage.charge", id="parameter-group"),
    pytest.param("""\
        - id: a
          part: {kind: fet}
          parameter: rds_on
          max: 30 mΩ
        """, 5, 16, "'rds_on' of a fet is not a single number", id="parameter-table"),
    pytest.param("""\
        - id: a
          part: {name: OR-FET-D20}
          parameter: vds_max
          min: 30 V
        """, 4, 11, "a parameter limit needs 'kind'", id="parameter-without-kind"),
    pytest.param("""\
        - id: a
          figure: trip_current_max
          min: 6 A
          max: 5 A
        """, 6, 10, "max 5 A is below min 6 A", id="max-below-min"),
    pytest.param("""\
        - id: a
          figure: trip_current_max
        """, 3, 5, "the limit on figure trip_current_max gives neither 'min' nor 'max'",
        id="no-bound"),
    pytest.param("""\
        - id: a
          figure: trip_current_max
          maxx: 5 A
        """, 5, 5, "unknown key 'maxx' in limits[0] (did you mean 'max'?)", id="unknown-key"),
    pytest.param("""\
        - id: a
          figure: cells
          max: 1
        - id: a
          figure: series
          max: 1
        """, 6, 9, "limit id 'a' is also used on line 3; ids must be unique", id="duplicate-id"),
    pytest.param("""\
        - id: Trip_Max
          figure: cells
          max: 1
        """, 3, 9, "limit id 'Trip_Max': use lowercase letters, digits and '-'", id="bad-id"),
    pytest.param("""\
        - id: a
          figure: cells
          part: {kind: fet}
          max: 1
        """, 5, 5, "a limit bounds either a 'figure' or a 'part', not both", id="figure-and-part"),
    pytest.param("""\
        - id: a
          part: {kind: fuse}
        """, 3, 5, "a part limit gives 'parameter' with 'min' and/or 'max', or 'banned: true'",
        id="part-without-check"),
    pytest.param("""\
        - id: a
          part: {kind: fuse}
          banned: false
        """, 5, 13, "'banned: false' bans nothing", id="banned-false"),
    pytest.param("""\
        - id: a
          part: {name: OR-FUSE-12A}
          banned: true
          max: 5 A
        """, 6, 5, "a banned part is banned whatever its 'max'", id="banned-with-bound"),
    pytest.param("""\
        - id: a
          figure: trip_current_max
          max: !!python/object/apply:os.system ["echo owned"]
        """, 5, 10, "YAML tag '!!python/object/apply:os.system' is not allowed", id="python-tag"),
    pytest.param("""\
        - &lim {id: a, figure: cells, max: 1}
        - *lim
        """, 4, 5, "alias '*lim' is not allowed", id="alias"),
    pytest.param("""\
        - id: a
          figure: trip_current_max
          max: .inf
        """, 5, 10, "'.inf' is not a finite number", id="infinite"),
]


@pytest.mark.parametrize("limits, line, column, message", POLICY_MISTAKES)
def test_policy_mistakes_are_input_errors_with_file_line_and_column(
        repo: Path, limits: str, line: int, column: int, message: str) -> None:
    text = "format: packwarden-policy/1\nlimits:\n" + textwrap.indent(textwrap.dedent(limits), "  ")
    with_policy(repo, text)
    (repo / "designs" / "second.yaml").write_text(EXAMPLE, encoding="utf-8")
    run = lint(["designs/probe.yaml", "designs/second.yaml"])
    [err] = run.input_errors()  # once for the run, however many designs the policy covers
    assert (err.file, err.line, err.column) == ("team-policy.yaml", line, column), str(err)
    assert message in err.message, err.message
    assert run.exit_code() == 2
    # the designs themselves were still linted by the rules
    assert all(d.name == "Orchard soil probe" and d.figures for d in run.designs)


def test_a_policy_mistake_is_one_clickable_line_and_exit_2(repo: Path) -> None:
    with_policy(repo, "format: packwarden-policy/1\nlimits:\n  - {id: a, figure: cell, max: 1}\n")
    result = CliRunner().invoke(app, ["check", "designs/probe.yaml"])
    assert result.exit_code == 2
    assert ("team-policy.yaml:3:21: unknown figure 'cell' (did you mean 'cells'?)"
            in result.stdout.splitlines())


def test_a_missing_policy_file_points_at_the_config(repo: Path) -> None:
    run = lint(["designs/probe.yaml"])
    [err] = run.input_errors()
    assert str(err) == "pyproject.toml:2:1: policy file team-policy.yaml does not exist"
    assert run.exit_code() == 2


def test_a_policy_outside_the_repository_of_its_config_is_refused(repo: Path, tmp_path_factory) -> None:
    outside = tmp_path_factory.mktemp("elsewhere") / "policy.yaml"
    outside.write_text(BRIEF_POLICY, encoding="utf-8")
    (repo / "pyproject.toml").write_text(f'[tool.packwarden]\npolicy = "{outside.as_posix()}"\n')
    run = lint(["designs/probe.yaml"])
    [err] = run.input_errors()
    assert (err.file, err.line) == ("pyproject.toml", 2)
    assert "lies outside the repository of this config" in err.message
    assert policy_findings(run) == []


# --- checking designs ---------------------------------------------------------------------------

def test_the_brief_policy_fires_on_the_example(repo: Path) -> None:
    with_policy(repo, BRIEF_POLICY)
    run = lint(["designs/probe.yaml"])
    found = {f.rule: f for f in policy_findings(run)}
    assert set(found) == {"policy/trip-max-product-line", "policy/fet-vds-30",
                          "policy/no-legacy-fuse"}
    trip = found["policy/trip-max-product-line"]
    figures = run.designs[0].figures
    assert trip.severity is Severity.error and trip.element == "U1"
    assert trip.hint == "our connector is rated 5 A"
    assert trip.location.path == ("components", "U1", "part")
    assert [(g.name, g.unit) for g in trip.figures] == [("trip_current_max", "A"), ("policy max", "A")]
    assert trip.figures[0].value == figures["trip_current_max"].value and trip.figures[1].value == 5.0
    assert trip.message.startswith("trip_current_max ") and "above the policy maximum 5 A" in trip.message
    # Q1's vds_max is 20 V in the library [the example's data sheet value]
    vds = found["policy/fet-vds-30"]
    assert (vds.element, vds.location.path) == ("Q1", ("components", "Q1", "part"))
    assert vds.message == ("Q1: part 'OR-FET-D20' has vds_max 20 V, below the policy minimum 30 V")
    assert vds.hint.startswith("team policy limit 'fet-vds-30' (team-policy.yaml:")
    fuse = found["policy/no-legacy-fuse"]
    assert fuse.message == "F1 uses part 'OR-FUSE-12A', which the team policy bans"
    assert fuse.hint == "obsolete, see ECN-17"
    assert run.exit_code() == 1


def test_a_figure_exactly_at_its_bound_passes(repo: Path) -> None:
    value = figures_of_example(repo)["trip_current_max"]
    with_policy(repo, f"""\
        format: packwarden-policy/1
        limits:
          - {{id: at, figure: trip_current_max, max: {value!r} A, min: {value!r} A}}
          - {{id: above, figure: trip_current_max, max: {value * 0.999!r} A}}
          - {{id: below, figure: trip_current_max, min: {value * 1.001!r} A}}
        """)
    rules = sorted(f.rule for f in policy_findings(lint(["designs/probe.yaml"])))
    assert rules == ["policy/above", "policy/below"]


def test_counts_and_severity_come_from_the_policy(repo: Path) -> None:
    with_policy(repo, """\
        format: packwarden-policy/1
        limits:
          - {id: one-cell-only, figure: series, max: 1}
          - {id: parts-budget, figure: component_count, max: 6, severity: info}
        """)
    run = lint(["designs/probe.yaml"])
    [budget] = policy_findings(run)
    # seven components in the example: BT1 U1 Q1 R1 C1 R2 F1
    assert budget.message == "component_count 8 is above the policy maximum 6"
    assert budget.severity is Severity.info and budget.element is None
    assert run.exit_code() == 0  # info does not fail the run


def test_a_toleranced_parameter_is_checked_at_its_worst_case(repo: Path) -> None:
    # OR-FET-D20: vgs_th min 0.5 V, max 1.0 V [the example's data sheet values]
    with_policy(repo, """\
        format: packwarden-policy/1
        limits:
          - {id: th-high, part: {kind: fet_pair_common_drain}, parameter: vgs_th, max: 0.9 V}
          - {id: th-low, part: {kind: fet_pair_common_drain}, parameter: vgs_th, min: 0.6 V}
          - {id: th-ok, part: {kind: fet_pair_common_drain}, parameter: vgs_th, min: 0.5 V, max: 1 V}
        """)
    found = {f.rule: f.message for f in policy_findings(lint(["designs/probe.yaml"]))}
    assert found == {
        "policy/th-high": "Q1: part 'OR-FET-D20' has vgs_th (highest) 1 V, above the policy "
                          "maximum 900 mV",
        "policy/th-low": "Q1: part 'OR-FET-D20' has vgs_th (lowest) 500 mV, below the policy "
                         "minimum 600 mV",
    }


def test_nested_parameters_and_inline_parts(repo: Path) -> None:
    design = EXAMPLE.replace("  F1:", "  C2: {kind: capacitor, value: 1 uF, pins: [VDD, B-]}\n  F1:")
    (repo / "designs" / "probe.yaml").write_text(design, encoding="utf-8")
    with_policy(repo, """\
        format: packwarden-policy/1
        limits:
          - {id: charge-410, part: {kind: cell}, parameter: voltage.charge, max: 4.10 V}
          - {id: resistor-power, part: {kind: resistor}, parameter: power, min: 0.125 W}
          - {id: cap-voltage, part: {kind: capacitor}, parameter: voltage, min: 10 V}
        """)
    found = sorted((f.rule, f.element, f.location.dotted, f.message)
                   for f in policy_findings(lint(["designs/probe.yaml"])))
    assert found == [
        ("policy/cap-voltage", "C2", "components.C2",
         "C2: its inline capacitor does not give voltage, which the team policy bounds"),
        ("policy/charge-410", "BT1", "components.BT1.part",
         "BT1: part 'OR-CELL-3400' has voltage.charge 4.2 V, above the policy maximum 4.1 V"),
        # R1 is given inline in the design: the finding points at its own 'power' key
        ("policy/resistor-power", "R1", "components.R1.power",
         "R1: its inline resistor has power 100 mW, below the policy minimum 125 mW"),
        ("policy/resistor-power", "R2", "components.R2.part",
         "R2: part 'RES-2K0' has power 100 mW, below the policy minimum 125 mW"),
    ]


def test_figure_limits_wait_for_a_clean_netlist_but_banned_parts_do_not(repo: Path) -> None:
    bad = EXAMPLE.replace("part: OR-FET-D20", "part: OR-FET-D2O")
    (repo / "designs" / "probe.yaml").write_text(bad, encoding="utf-8")
    with_policy(repo, BRIEF_POLICY)
    run = lint(["designs/probe.yaml"])
    [design] = run.designs
    assert sorted(f.rule for f in policy_findings(run)) == ["policy/no-legacy-fuse"]
    assert "policy/trip-max-product-line" in design.skipped
    assert "unknown-part" in {f.rule for f in design.findings}


def test_a_policy_finding_can_be_waived(repo: Path) -> None:
    with_policy(repo, BRIEF_POLICY)
    waived = EXAMPLE + ("waivers:\n  - rule: policy/no-legacy-fuse\n    element: F1\n"
                        "    reason: stock of the old fuse is used up first\n")
    (repo / "designs" / "probe.yaml").write_text(waived, encoding="utf-8")
    run = lint(["designs/probe.yaml"])
    [fuse] = [f for f in run.all_findings() if f.rule == "policy/no-legacy-fuse"]
    assert fuse.waived == "stock of the old fuse is used up first"
    assert "waiver-hygiene" not in {f.rule for f in run.all_findings()}


def test_policy_findings_appear_in_every_format(repo: Path) -> None:
    with_policy(repo, BRIEF_POLICY)
    run = lint(["designs/probe.yaml"])
    for name in load_formats().names():
        out = formatter(name)(run, RenderOptions())
        for rid in ("policy/trip-max-product-line", "policy/fet-vds-30", "policy/no-legacy-fuse"):
            assert rid in out, f"{rid} missing from the {name} report"
    data = json.loads(formatter("json")(run, RenderOptions()))
    [fuse] = [f for f in data["designs"][0]["findings"] if f["rule"] == "policy/no-legacy-fuse"]
    assert (fuse["element"], fuse["hint"]) == ("F1", "obsolete, see ECN-17")


def test_a_design_cannot_name_a_policy(repo: Path) -> None:
    (repo / "pyproject.toml").unlink()
    with_policy(repo, BRIEF_POLICY)
    (repo / "designs" / "probe.yaml").write_text(
        EXAMPLE + "policy: ../team-policy.yaml\n", encoding="utf-8")
    run = lint(["designs/probe.yaml"])
    [err] = run.input_errors()
    assert (err.file, err.line, err.column) == ("designs/probe.yaml", EXAMPLE.count("\n") + 1, 1)
    assert err.message.startswith("unknown key 'policy' in the top level; allowed here: format, "
                                  "design, libraries"), err.message
    assert policy_findings(run) == []


# --- the figure table and the schema --------------------------------------------------------------

def test_every_figure_the_model_reports_has_a_unit_and_an_anchor() -> None:
    run = lint([str(REPO / "example_designs")], registry=load_registry())
    reported = {k for d in run.designs for k in d.figures}
    assert run.designs and "trip_current_max" in reported
    assert reported <= set(DECLARED), (
        f"figures not declared in packwarden.figures: {sorted(reported - set(DECLARED))}")
    assert DECLARED["trip_current_max"].unit == "A" and DECLARED["sense_resistance_min"].unit == "Ω"


@pytest.mark.parametrize("kind, parameter, unit", [
    ("fet", "vds_max", "V"), ("fet", "theta_ja", "K/W"), ("fet", "tj_max", "°C"),
    ("fet", "vgs_th", "V"), ("fet", "idss", "A"), ("fet_pair_common_drain", "id_max", "A"),
    ("cell", "capacity", "Ah"), ("cell", "voltage.charge", "V"),
    ("cell", "internal_resistance", "Ω"), ("cell", "max_current.discharge", "A"),
    ("protector", "overcurrent.detect", "V"), ("protector", "overcurrent.delay", "s"),
    ("protector", "cells", ""), ("resistor", "tol", "%"), ("fuse", "melting_i2t", "A²s"),
    ("trace", "width", "m"),
])
def test_parameter_units_follow_the_part_schema(kind: str, parameter: str, unit: str) -> None:
    # The units docs/format.md gives for each field, as the part schema declares them.
    assert parameter_unit(kind, tuple(parameter.split("."))) == unit


def test_the_example_team_policy_is_valid() -> None:
    schema = json.loads((REPO / "schemas" / "policy.schema.json").read_text(encoding="utf-8"))
    import yaml
    jsonschema.Draft7Validator(schema).validate(yaml.safe_load(TEAM_POLICY.read_text("utf-8")))
    jsonschema.Draft7Validator(schema).validate(yaml.safe_load(BRIEF_POLICY))
    policy = load_policy(TEAM_POLICY)
    assert [lim.id for lim in policy.limits] == ["beacon-trip-max", "junction-100", "fet-vds-20",
                                                 "cell-charge-window", "no-small-fet"]
    assert policy_json_schema()["definitions"]["LimitSpec"]["properties"]["figure"]["anyOf"][0][
        "enum"] == [*DECLARED, *EVENT_FIGURES]


def test_load_policy_raises_the_first_mistake(tmp_path: Path) -> None:
    path = tmp_path / "p.yaml"
    path.write_text("format: packwarden-policy/2\n", encoding="utf-8")
    with pytest.raises(InputError) as err:
        load_policy(path, "p.yaml")
    assert str(err.value).startswith("p.yaml:1:9: ")


def test_a_junction_temperature_limit(repo: Path) -> None:
    # The issue's own example: a product line keeps its switch junctions at or below 100 °C.
    with_policy(repo, """\
        format: packwarden-policy/1
        limits:
          - {id: tj-100, figure: switch_tj_continuous, max: 100 °C}
          - {id: tj-60, figure: switch_tj_continuous, max: 60 °C, reason: sealed enclosure}
        """)
    run = lint(["designs/probe.yaml"])
    [design] = run.designs
    [heat] = [h for h in design.model.switch_heat if h.case == "continuous"]
    # T_J = T_A + P · R_θJA [published: data sheet definition]: Q1 (83 K/W) at 55 °C ambient
    tj = design.figures["switch_tj_continuous"].value
    assert heat.ambient == 55.0
    assert tj == pytest.approx(55.0 + heat.power * 83.0, abs=0.01)
    # 1.2 A through two channels of 23-32 mΩ, hot: a few tenths of a watt at most [derived]
    assert 55.0 < tj < 55.0 + 0.3 * 83.0
    [finding] = policy_findings(run)
    assert (finding.rule, finding.element, finding.hint) == ("policy/tj-60", "Q1", "sealed enclosure")
    assert finding.message == f"switch_tj_continuous {tj:.3g} °C is above the policy maximum 60 °C"
