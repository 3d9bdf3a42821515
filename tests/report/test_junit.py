"""JUnit XML checked against the junit-10.xsd that pytest's source distribution carries.

tests/data/junit-10.xsd is a verbatim copy of ``testing/example_scripts/junit-10.xsd`` from the
pytest 9.2.0 source distribution on PyPI (``pip download --no-deps --no-binary :all:
pytest==9.2.0``; MIT licence, the notice is inside the file) [published: the Surefire-style
schema pytest validates its own ``--junitxml`` output against]. Its sha256 is checked so the copy
cannot drift. Validation uses xmlschema, a general-purpose XSD 1.0/1.1 validator.
"""

from __future__ import annotations

import hashlib
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest

from packwarden.api import Rule, Severity
from packwarden.engine import Registry, load_registry, lint
from packwarden.report import RenderOptions, formatter
from packwarden.report.junit import classname
from packwarden.report.text import CAUTION

from report_data import CLEAN, FLAWED, REPO, UNUSED_WAIVER, WAIVED

XSD = REPO / "tests" / "data" / "junit-10.xsd"
XSD_SHA256 = "a1a816f58d1bf95ebabf371994df0b9246dee66ea9572fbec4f9296f1b2c0ff6"

xmlschema = pytest.importorskip("xmlschema", reason="xmlschema (test extra) validates the XML")


@pytest.fixture(scope="module")
def schema():
    assert hashlib.sha256(XSD.read_bytes()).hexdigest() == XSD_SHA256, \
        "tests/data/junit-10.xsd differs from pytest 9.2.0's copy"
    return xmlschema.XMLSchema(str(XSD))


def junit(run, **opts) -> str:
    return formatter("junit")(run, RenderOptions(**opts))


def suites_of(xml: str) -> dict[str, ET.Element]:
    root = ET.fromstring(xml)
    assert root.tag == "testsuites"
    return {s.get("name"): s for s in root.findall("testsuite")}


def test_the_schema_check_can_fail(schema) -> None:
    bad = ('<testsuites><testsuite name="x" tests="1" failures="0" errors="0">'
           '<testcase classname="x"/></testsuite></testsuites>')  # a test case needs a name
    assert not schema.is_valid(bad)
    with pytest.raises(xmlschema.XMLSchemaValidationError):
        schema.validate(bad)


def test_example_run_is_valid(schema, example_run) -> None:
    xml = junit(example_run)
    schema.validate(xml)
    assert xml.startswith('<?xml version="1.0" encoding="UTF-8"?>\n<testsuites')


def test_one_test_case_per_rule_and_design(example_run) -> None:
    suites = suites_of(junit(example_run))
    assert len(suites) == len(example_run.designs)
    for d in example_run.designs:
        shown = Path(d.file).resolve().relative_to(REPO).as_posix()
        suite = suites[shown]
        assert suite.get("file") == shown
        cases = suite.findall("testcase")
        names = [c.get("name") for c in cases]
        assert len(names) == len(set(names)), "a rule appears twice in one design"
        assert set(names) == set(d.checked) | {f.rule for f in d.findings}
        assert {c.get("classname") for c in cases} == {classname(shown)}
        assert int(suite.get("tests")) == len(cases)
        props = {p.get("name"): p.get("value") for p in suite.iter("property")}
        assert props["caution"] == CAUTION and props["design"] == d.name
    clean = suites["example_designs/orchard-probe.yaml"]
    assert clean.get("failures") == clean.get("errors") == clean.get("skipped") == "0"
    assert classname("example_designs/flawed/no-fuse.yaml") == "example_designs.flawed.no-fuse"


def test_failures_carry_the_findings(example_run) -> None:
    suites = suites_of(junit(example_run))
    total_failures = 0
    for d in example_run.designs:
        suite = suites[Path(d.file).resolve().relative_to(REPO).as_posix()]
        failing_rules = {f.rule for f in d.findings
                         if not f.waived and f.severity.rank >= example_run.fail_on.rank}
        failed = {c.get("name"): c.find("failure") for c in suite.findall("testcase")
                  if c.find("failure") is not None}
        assert set(failed) == failing_rules
        assert int(suite.get("failures")) == len(failed)
        total_failures += len(failed)
        for rid, failure in failed.items():
            # the rule's findings at or above the fail-on level (those below go to system-out)
            mine = [f for f in d.findings if f.rule == rid and not f.waived
                    and f.severity.rank >= example_run.fail_on.rank]
            assert failure.get("type") == rid
            assert failure.get("message").startswith(mine[0].message)
            for f in mine:
                assert f"{f.location.file}:{f.location.line}:{f.location.column}: " \
                       f"{f.severity.value} {rid}: {f.message}" in failure.text
                if f.hint:
                    assert f"hint: {f.hint}" in failure.text
    assert total_failures >= len(FLAWED)  # every one-flaw example fails at least one case
    root = ET.fromstring(junit(example_run))
    assert int(root.get("failures")) == total_failures


def test_waived_findings_are_skipped_and_warnings_do_not_fail(example_run) -> None:
    suites = suites_of(junit(example_run))
    waived = suites[WAIVED.relative_to(REPO).as_posix()]
    [case] = [c for c in waived.findall("testcase") if c.get("name") == "trip-current-window"]
    skipped = case.find("skipped")
    assert case.find("failure") is None and skipped is not None
    assert skipped.get("message") == "waived: bench-tested at 2.6 A for 10 min, test report TR-114"
    assert waived.get("skipped") == "1"
    # the unused waiver is a warning: below the default fail-on level, so listed, not failed
    unused = suites[UNUSED_WAIVER.relative_to(REPO).as_posix()]
    [hygiene] = [c for c in unused.findall("testcase") if c.get("name") == "waiver-hygiene"]
    assert hygiene.find("failure") is None
    assert "matches no finding" in hygiene.find("system-out").text
    # with --fail-on warning it fails
    strict = lint([str(UNUSED_WAIVER)], fail_on=Severity.warning)
    [suite] = suites_of(junit(strict)).values()
    [hygiene] = [c for c in suite.findall("testcase") if c.get("name") == "waiver-hygiene"]
    assert hygiene.find("failure") is not None


def test_input_errors_are_errors(schema, broken_design: Path) -> None:
    run = lint([str(broken_design)])
    xml = junit(run)
    schema.validate(xml)
    [suite] = suites_of(xml).values()
    [case] = suite.findall("testcase")
    assert case.get("name") == "input-error"
    err = case.find("error")
    assert err.get("type") == "input-error"
    assert f"{run.input_errors()[0]}" in err.text and ":10:15: " in err.text
    assert suite.get("errors") == "1" and suite.get("tests") == "1"


def _crashing(ctx, options):
    raise ZeroDivisionError("float division by zero")
    yield  # pragma: no cover


def test_internal_errors_are_errors_of_their_rule(schema) -> None:
    rules = dict(load_registry().rules)
    rules["crashes"] = Rule(id="crashes", summary="always raises", rationale="for a test",
                            severity=Severity.error, check=_crashing, origin="test")
    run = lint([str(CLEAN)], registry=Registry(rules=rules))
    xml = junit(run)
    schema.validate(xml)
    [suite] = suites_of(xml).values()
    [case] = [c for c in suite.findall("testcase") if c.get("name") == "crashes"]
    err = case.find("error")
    assert err.get("type") == "internal-error" and "ZeroDivisionError" in err.get("message")
    assert suite.get("errors") == "1"


def test_text_from_the_design_cannot_break_the_xml(schema) -> None:
    from packwarden.api import Finding, Location
    from packwarden.engine import DesignResult, RunResult
    # a part name with a control character and markup, as a hostile library could hold
    message = "part 'Q\x07<1>&\"x\"' is not in any library"
    f = Finding("unknown-part", Severity.error, message, Location(str(CLEAN), ("components",), 2, 3),
                element="Q\x07<1>").with_fingerprint("d.yaml")
    run = RunResult(designs=[DesignResult(file=str(CLEAN), name="bell\x07", findings=[f],
                                          checked=["unknown-part"])])
    xml = junit(run)
    schema.validate(xml)  # parses: no raw control character or unescaped markup got through
    assert "\x07" not in xml
    [failure] = ET.fromstring(xml).iter("failure")
    assert "part 'Q\ufffd<1>&\"x\"' is not in any library" in failure.text
