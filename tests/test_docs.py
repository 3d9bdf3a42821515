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
