"""A rule's options when the project sets none (``api.default_options``, issue 19): made without
building the model's validator where validating could not change them, and then the very values
``options()`` gives; validated as before wherever the model could act on its defaults; and a
plugin's or a team folder's options model is still built, and its mistakes reported, when it
loads. The reference is pydantic's own validation of each model (``options()``)."""

from __future__ import annotations

import textwrap
from pathlib import Path

import pytest
from pydantic import Field, model_validator

from packwarden.api import RuleOptions, default_options
from packwarden.engine import Registry, load_folder, load_registry


def _same(a: RuleOptions, b: RuleOptions) -> None:
    assert type(a) is type(b) and a == b
    assert a.model_fields_set == b.model_fields_set
    for name in type(a).model_fields:
        x, y = getattr(a, name), getattr(b, name)
        assert type(x) is type(y) and repr(x) == repr(y), name


def test_every_rule_gets_the_options_validation_would_give() -> None:
    reg = load_registry()
    assert len(reg.rules) > 30
    for rid, r in reg.rules.items():
        _same(default_options(r.options), r.options())


def test_a_model_that_acts_on_its_defaults_is_validated() -> None:
    # a model validator, a default that is validated, a required field: options() as before
    class Checked(RuleOptions):
        low: float = 1.0
        high: float = 0.5

        @model_validator(mode="after")
        def _ordered(self) -> "Checked":
            if self.low > self.high:
                raise ValueError("low above high")
            return self

    class Coerced(RuleOptions):
        margin: float = Field(default=2, validate_default=True)

    class Required(RuleOptions):
        limit: float

    with pytest.raises(ValueError, match="low above high"):
        default_options(Checked)
    assert type(default_options(Coerced).margin) is float  # 2 validated to 2.0
    with pytest.raises(ValueError, match="Field required"):
        default_options(Required)


def test_a_team_rule_whose_options_cannot_be_built_is_reported_when_it_loads(
        tmp_path: Path) -> None:
    folder = tmp_path / "team"
    folder.mkdir()
    (folder / "odd.py").write_text(textwrap.dedent('''
        from packwarden import RuleOptions, rule

        class Unknown:
            pass

        class Options(RuleOptions):
            thing: Unknown = None

        @rule(id="team-odd", summary="options of a type pydantic cannot validate", options=Options)
        def check(ctx, options):
            """Odd."""
            yield from ()
    '''), encoding="utf-8")
    reg = Registry()
    load_folder(reg, folder)
    assert "team-odd" not in reg.rules
    [(origin, message)] = reg.broken
    assert origin.endswith("odd.py")
    assert "failed to load: PydanticSchemaGenerationError" in message
