"""docs/rules.md is generated from the rule registry and must match it; every rule has examples.

The check follows the practice of rule-based linters that generate their rule reference from rule
metadata and fail the build when the checked-in page is stale or a rule lacks an anti-pattern and
a best-practice example [practice].
"""

from __future__ import annotations

import shutil
import subprocess
import sys
from importlib.metadata import entry_points
from pathlib import Path

import pytest

from packwarden.api import Example, Rule, Severity
from packwarden.docs import builtin_rules, missing_examples, option_default, render_rules
from packwarden.engine import ENTRY_POINT_GROUP, load_registry

REPO = Path(__file__).resolve().parent.parent
RULES_MD = REPO / "docs" / "rules.md"
REGENERATE = "regenerate it with `packwarden docs rules > docs/rules.md`"


@pytest.fixture(scope="module")
def builtins() -> list[Rule]:
    reg = load_registry()
    assert not [m for o, m in reg.broken if o.startswith("packwarden:")], reg.broken
    return builtin_rules(reg.rules)


def test_every_builtin_rule_is_documented(builtins: list[Rule]) -> None:
    registered = {ep.name for ep in entry_points(group=ENTRY_POINT_GROUP)
                  if ep.dist is not None and ep.dist.name == "packwarden"}
    assert {r.id for r in builtins} == registered
    assert "waiver-hygiene" in registered


def test_docs_rules_md_is_not_stale(builtins: list[Rule]) -> None:
    assert RULES_MD.is_file(), f"docs/rules.md is missing: {REGENERATE}"
    assert RULES_MD.read_text(encoding="utf-8") == render_rules(builtins), \
        f"docs/rules.md is stale: {REGENERATE}"


def test_every_rationale_wraps_within_100_columns(builtins: list[Rule]) -> None:
    # `packwarden explain` prints the rationale as written: a long line reads badly in a terminal.
    long = [(r.id, line) for r in builtins for line in r.rationale.splitlines() if len(line) > 100]
    assert not long, long


def test_every_builtin_rule_has_a_failing_and_a_passing_example(builtins: list[Rule]) -> None:
    assert missing_examples(builtins) == []


def test_the_example_check_can_fail() -> None:
    bare = Rule(id="bare", summary="s", rationale="r", severity=Severity.error, check=lambda c, o: ())
    half = Rule(id="half", summary="s", rationale="r", severity=Severity.error,
                check=lambda c, o: (), example=Example(bad="x: 1", good="  "))
    assert missing_examples([bare, half]) == [
        "bare: no example (give @rule(..., example=Example(bad=..., good=...)))",
        "half: the example's 'good' fragment is empty"]


def test_each_section_carries_the_metadata(builtins: list[Rule]) -> None:
    text = RULES_MD.read_text(encoding="utf-8")
    for r in builtins:
        section = text.split(f"\n## {r.id}\n", 1)[1].split("\n## ", 1)[0]
        assert f"**Default severity:** {r.severity.value}" in section
        assert r.rationale.strip() in section
        assert r.example.bad.strip() in section.split("**Passes:**")[0]
        assert r.example.good.strip() in section.split("**Passes:**")[1]
        for name, field in r.options.model_fields.items():
            assert f"| `{name}` | `{option_default(field)}` |" in section
        assert f"| [`{r.id}`](#{r.id}) | {r.severity.value} |" in text
    assert "\n## input-error\n" in text


def test_quantity_options_show_their_unit() -> None:
    from pydantic import Field

    from packwarden.api import RuleOptions
    from packwarden.schema import Q

    class Opts(RuleOptions):
        rise: Q("K") = Field(10.0)
        share: float = Field(0.05)
        margin: Q("V") = Field(0.025)

    f = Opts.model_fields
    assert option_default(f["rise"]) == '"10 K"'
    assert option_default(f["share"]) == "0.05"
    assert option_default(f["margin"]) == '"25 mV"'


def test_the_command_prints_the_same() -> None:
    beside = Path(sys.executable).parent / "packwarden"
    found = shutil.which("packwarden", path=str(beside.parent))
    if found is None:
        pytest.skip("no packwarden script next to the interpreter")
    proc = subprocess.run([found, "docs", "rules"], capture_output=True, text=True,
                          encoding="utf-8", cwd=REPO)
    assert proc.returncode == 0, proc.stderr
    assert proc.stdout == RULES_MD.read_text(encoding="utf-8")
    proc = subprocess.run([sys.executable, "-m", "packwarden.docs"], capture_output=True,
                          text=True, encoding="utf-8", cwd=REPO)
    assert proc.returncode == 0 and proc.stdout == RULES_MD.read_text(encoding="utf-8")


# --- docs/format.md: the design-format reference ------------------------------------------------
# Generated from the pydantic models like the rule reference [practice: the "sync" test of linters
# that generate code or docs and fail the build when the checked-in copy differs]. The tables are
# checked with markdown-it-py, a CommonMark parser with the GFM table extension [published:
# CommonMark spec, GFM tables], and the examples against the linter's own validator.

import json  # noqa: E402 - grouped with the tests that need them
import re  # noqa: E402

from packwarden.docs import (QUANTITY_REFUSED, DocsError, render_format,  # noqa: E402
                             schema_models, undescribed_fields, undescribed_properties,
                             undocumented_pins)

FORMAT_MD = REPO / "docs" / "format.md"
REGENERATE_FORMAT = "regenerate it with `packwarden docs format -o docs/format.md`"


@pytest.fixture(scope="module")
def format_md() -> str:
    assert FORMAT_MD.is_file(), f"docs/format.md is missing: {REGENERATE_FORMAT}"
    return FORMAT_MD.read_text(encoding="utf-8")


def test_docs_format_md_is_not_stale(format_md: str) -> None:
    assert format_md == render_format(), f"docs/format.md is stale: {REGENERATE_FORMAT}"


def test_the_format_command_prints_the_same(format_md: str) -> None:
    found = shutil.which("packwarden", path=str(Path(sys.executable).parent))
    if found is None:
        pytest.skip("no packwarden script next to the interpreter")
    proc = subprocess.run([found, "docs", "format"], capture_output=True, text=True,
                          encoding="utf-8", cwd=REPO)
    assert proc.returncode == 0, proc.stderr
    assert proc.stdout == format_md
    proc = subprocess.run([sys.executable, "-m", "packwarden.docs", "format"], capture_output=True,
                          text=True, encoding="utf-8", cwd=REPO)
    assert proc.returncode == 0 and proc.stdout == format_md


def test_every_schema_field_has_a_description() -> None:
    models = schema_models()
    names = {m.__name__ for m in models}
    # The walk reaches the models behind annotations too: inline components, toleranced forms.
    assert {"Design", "PartLibrary", "Cell", "FetPair", "InlineResistor",
            "Toleranced_volts", "Toleranced_ohms"} <= names
    assert undescribed_fields(models) == []


@pytest.mark.parametrize("which", ["design", "parts", "report"])
def test_every_shipped_schema_key_has_a_description(which: str) -> None:
    # What an editor shows on hover: every property of the shipped schema, nested ones included.
    shipped = json.loads((REPO / "schemas" / f"{which}.schema.json").read_text(encoding="utf-8"))
    assert undescribed_properties(shipped) == []


def test_the_description_checks_can_fail() -> None:
    from pydantic import BaseModel, Field

    class Bare(BaseModel):
        x: int = 1
        y: int = Field(2, description="why y")
        z: int = Field(3, description="  ")

    assert undescribed_fields([Bare]) == ["Bare.x", "Bare.z"]
    schema = {"properties": {"a": {"type": "string"}, "b": {"description": "b"}},
              "definitions": {"M": {"anyOf": [{"properties": {"c": {"type": "number"}}}]}}}
    assert undescribed_properties(schema) == ["#/properties/a",
                                              "#/definitions/M/anyOf/0/properties/c"]


def _section(text: str, anchor: str) -> str:
    return text.split(f'<a id="{anchor}"></a>', 1)[1].split("<a id=", 1)[0]


def test_every_key_and_pin_has_its_row(format_md: str) -> None:
    from packwarden.netlist import LIST_PINS, PIN_NAMES
    from packwarden.schema import PART_KINDS, Design, PartLibrary

    design = format_md.split("\n## Design files\n", 1)[1].split("\n## Part libraries\n", 1)[0]
    for name, field in Design.model_fields.items():
        assert f"| `{field.alias or name}` |" in design
    library = format_md.split("\n## Part libraries\n", 1)[1].split('<a id="part-kinds">', 1)[0]
    for name in PartLibrary.model_fields:
        assert f"| `{name}` |" in library
    assert undocumented_pins() == []
    for kind, model in PART_KINDS.items():
        section = _section(format_md, f"part-{kind}")
        for name in model.model_fields:
            assert f"| `{name}` |" in section, f"{kind}.{name}"
        required, optional = PIN_NAMES[kind]
        pins = section.split("**Pins**", 1)[1]
        for pin in required:
            assert f"| `{pin}` | yes |" in pins, f"{kind} pin {pin}"
        for pin in optional:
            assert f"| `{pin}` | no |" in pins, f"{kind} pin {pin}"
        if kind in LIST_PINS:
            assert f"as a list of nets, in the order [{', '.join(LIST_PINS[kind])}]" in pins
        else:
            assert "Pins are given as a mapping of pin names to nets." in pins
    protector = _section(format_md, "part-protector")
    assert "| `cell1` … `cellN` | yes, with `cells` ≥ 2 |" in protector
    assert "| `balance1` … `balanceN` | no (with `cells` ≥ 2) |" in protector


def test_units_and_defaults_come_from_the_annotations(format_md: str) -> None:
    fet = _section(format_md, "part-fet")
    # each unit with the range the field declares (schema.Q / schema.Tol bounds)
    assert "| `vds_max` | V, above 0 V and at most 10 kV | required |" in fet
    assert ("| `vgs_th` | [toleranced](#toleranced-values) V, at least -1 kV and at most 1 kV | "
            "required |") in fet
    assert "| `theta_ja` | K/W, above 0 K/W and at most 10000 K/W | required |" in fet
    assert "| `tj_max` | °C, above 25 °C and at most 300 °C | `150 °C` |" in fet
    # the kind leads the table, as in a library, though FetCommon declares the rest first
    assert fet.split("|---|---|---|---|\n", 1)[1].startswith("| `kind` | `fet` | required |")
    assert "| `tol` | %, at least 0 % and below 100 % | `1 %` |" in \
        _section(format_md, "part-resistor")
    assert "| `terminals` | [mapping](#pack.terminals) | `{pos: P+, neg: P-}` |" in \
        _section(format_md, "pack")
    assert "| `temperature` | °C, at least -100 °C and at most 200 °C | `25 °C` |" in \
        _section(format_md, "storage")
    assert "| `gate_drive` | `cell` or V, above 0 V and at most 10 kV | `cell` |" in \
        _section(format_md, "part-protector")


def test_the_refused_quantities_show_the_parsers_own_message(format_md: str) -> None:
    from packwarden.quantities import QuantityError, parse_quantity
    forms = {text for text, _, _ in QUANTITY_REFUSED}
    # Issue 2 lists these as refused, never guessed: RKM codes, decimal commas, meg, NaN, infinity.
    assert {"4k7", "5V5", "1,5 V", "1 meg", "NaN", "inf"} <= forms
    for text, unit, _ in QUANTITY_REFUSED:
        with pytest.raises(QuantityError) as exc:
            parse_quantity(text, unit)
        assert f"| {exc.value} |" in format_md.replace("\\|", "|"), text


def test_the_generator_refuses_an_example_the_parser_disagrees_with(monkeypatch) -> None:
    import packwarden.docs as docs
    monkeypatch.setattr(docs, "QUANTITY_ACCEPTED", (("4k7", "Ω", ""),))
    with pytest.raises(ValueError, match="accepted example '4k7' is refused"):
        docs.render_format()
    monkeypatch.setattr(docs, "QUANTITY_ACCEPTED", ())
    monkeypatch.setattr(docs, "QUANTITY_REFUSED", (("4.7 kΩ", "Ω", ""),))
    with pytest.raises(ValueError, match="refused example '4.7 kΩ' is accepted"):
        docs.render_format()


def test_the_toleranced_examples_follow_the_arithmetic(format_md: str) -> None:
    # [derived] 4.20 V ± 0.5 % = 4.20 V ± 21 mV; 4.300 V ± 25 mV; 0.5-1.0 V centres on 0.75 V.
    assert "| `{typ: 4.20 V, tol: 0.5 %}` | 4.179 V | 4.2 V | 4.221 V |" in format_md
    assert "| `{typ: 4.300 V, tol: 25 mV}` | 4.275 V | 4.3 V | 4.325 V |" in format_md
    assert "| `{min: 0.5 V, max: 1.0 V}` | 500 mV | 750 mV | 1 V |" in format_md
    assert "| `{tol: 1 %}` | 'tol' needs 'typ' |" in format_md


def test_the_reference_is_well_formed_markdown(format_md: str) -> None:
    markdown_it = pytest.importorskip("markdown_it", reason="markdown-it-py (test extra) parses it")
    html = markdown_it.MarkdownIt("commonmark", {"html": True}).enable("table").render(format_md)
    ids = set(re.findall(r'<a id="([^"]+)"', html)) | {"toleranced-values"}
    links = set(re.findall(r'href="#([^"]+)"', html))
    assert links and links <= ids, sorted(links - ids)
    assert "toleranced-values" in {re.sub(r"[^a-z0-9 -]", "", h.lower()).replace(" ", "-")
                                   for h in re.findall(r"^## (.+)$", format_md, re.M)}
    # Every row of a table has the header's number of cells (a stray '|' would shift columns).
    in_code, table = False, []
    for line in format_md.splitlines() + [""]:
        if line.startswith("```"):
            in_code = not in_code
        if not in_code and line.startswith("|"):
            table.append(len(re.findall(r"(?<!\\)\|", line)))
        elif table:
            assert len(set(table)) == 1, (line, table)
            table = []
    assert html.count("<table>") > 20


def test_the_examples_in_the_reference_validate(format_md: str, tmp_path: Path) -> None:
    from packwarden.loader import load_file
    from packwarden.schema import Design, PartLibrary
    from packwarden.validate import validate
    example = format_md.split("\n## Complete example\n", 1)[1]
    blocks = re.findall(r"```yaml\n(.*?)\n```", example, re.S)
    assert len(blocks) == 2
    for text, model in zip(blocks, (Design, PartLibrary)):
        path = tmp_path / f"{model.__name__}.yaml"
        path.write_text(text + "\n", encoding="utf-8")
        value, errors = validate(load_file(path), model)
        assert errors == [] and value is not None
    assert blocks[0] + "\n" == (REPO / "example_designs" / "orchard-probe.yaml").read_text("utf-8")


def test_missing_examples_are_one_line_and_exit_code_2(tmp_path: Path) -> None:
    with pytest.raises(DocsError) as exc:
        render_format(tmp_path)
    assert str(exc.value).startswith("example_designs/orchard-probe.yaml:1:1: ")
    script = ("import sys, pathlib, packwarden.docs as d\n"
              f"d.EXAMPLES = pathlib.Path({str(tmp_path)!r})\n"
              "sys.argv = ['packwarden', 'docs', 'format']\n"
              "from packwarden.cli import main\nmain()\n")
    proc = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True,
                          encoding="utf-8", cwd=REPO)
    assert proc.returncode == 2
    assert proc.stdout == ""
    assert len(proc.stderr.splitlines()) == 1 and "Traceback" not in proc.stderr
    assert proc.stderr.startswith("example_designs/orchard-probe.yaml:1:1: ")
