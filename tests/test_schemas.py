"""The shipped JSON Schemas are generated from the pydantic models and must not go stale."""

import json
from pathlib import Path

import jsonschema
import pytest

from packwarden.loader import load_file
from packwarden.docs import shipped_schema as json_schema

ROOT = Path(__file__).resolve().parents[1]


@pytest.mark.parametrize("which", ["design", "parts", "policy", "report"])
def test_shipped_schema_is_current(which):
    shipped = json.loads((ROOT / "schemas" / f"{which}.schema.json").read_text(encoding="utf-8"))
    assert shipped == json_schema(which), (
        f"schemas/{which}.schema.json is stale: run `packwarden schema {which} > "
        f"schemas/{which}.schema.json`")


@pytest.mark.parametrize("which", ["design", "parts", "policy", "report"])
def test_schema_is_valid_draft07(which):
    # Draft-07 keywords so YAML language servers can complete and check designs as people type.
    jsonschema.Draft7Validator.check_schema(json_schema(which))


def test_examples_validate_against_shipped_schemas():
    # The editor-side check (JSON Schema) and the linter's own check (pydantic) agree on examples.
    design_schema = json.loads((ROOT / "schemas" / "design.schema.json").read_text("utf-8"))
    parts_schema = json.loads((ROOT / "schemas" / "parts.schema.json").read_text("utf-8"))
    designs = [p for p in (ROOT / "example_designs").rglob("*.yaml")]
    assert designs
    for path in designs:
        doc = load_file(path)
        schema = parts_schema if doc.data.get("format") == "packwarden-parts/1" else design_schema
        jsonschema.Draft7Validator(schema).validate(doc.data)


def test_schema_rejects_a_wrong_unit():
    design_schema = json_schema("design")
    doc = load_file(ROOT / "example_designs" / "orchard-probe.yaml")
    data = dict(doc.data)
    data["load"] = {"continuous": "1.2 V"}
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.Draft7Validator(design_schema).validate(data)


def _patterns(node):
    if isinstance(node, dict):
        for k, v in node.items():
            if k == "pattern" and isinstance(v, str):
                yield v
            else:
                yield from _patterns(v)
    elif isinstance(node, list):
        for v in node:
            yield from _patterns(v)


@pytest.mark.parametrize("which", ["design", "parts", "policy"])
def test_patterns_are_valid_ecmascript_unicode_regexes(which):
    # JSON Schema patterns are ECMA-262 regexes, and editors compile them in unicode mode, where an
    # escape of a character that is not syntax (`\ `, `\-`) is an error [published: ECMA-262,
    # IdentityEscape with the u flag: SyntaxCharacter or "/" only].
    import re
    shipped = json.loads((ROOT / "schemas" / f"{which}.schema.json").read_text(encoding="utf-8"))
    allowed = set("dDwWsSbBfnrtv0") | set("^$\\.*+?()[]{}|/")
    found = list(_patterns(shipped))
    assert found, "no patterns to check"
    for pattern in found:
        for m in re.finditer(r"\\(.)", pattern):
            assert m.group(1) in allowed, (pattern, m.group(0))


def test_the_json_report_of_every_example_validates_against_its_schema():
    # schemas/report.schema.json describes `packwarden check -f json` field by field for findings
    # (headline included); every example and flawed example's report must fit it.
    from packwarden.engine import lint
    from packwarden.report import RenderOptions, formatter
    schema = json.loads((ROOT / "schemas" / "report.schema.json").read_text("utf-8"))
    designs = sorted(str(p.relative_to(ROOT)) for p in (ROOT / "example_designs").rglob("*.yaml")
                     if load_file(p).data.get("format") != "packwarden-parts/1")
    report = json.loads(formatter("json")(lint(designs), RenderOptions()))
    assert report["designs"] and any(f["headline"] for d in report["designs"] for f in d["findings"])
    jsonschema.Draft7Validator(schema).validate(report)
