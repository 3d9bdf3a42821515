"""A toleranced value read without its ``Given`` model (``schema._plain_limits``) is what the model
makes of it.

The reference is the ``Given`` model itself (``schema.given_model``: pydantic's validation of
the ``{typ, min, max, tol}`` mapping, then ``_resolve``), forced by turning the shortcut off: for
any mapping or bare value, a field declared ``Tol(...)`` must give an equal ``Toleranced`` (its
values, its set fields, its class) or the same errors, whichever way it is read.
"""

from __future__ import annotations

import pytest
from hypothesis import given, settings, strategies as st
from pydantic import ValidationError

from packwarden import schema
from packwarden.schema import Strict, Tol


class Probe(Strict):
    volts: Tol("V", gt=0, le=schema.MAX_VOLTS) | None = None
    share: Tol("%", gt=0, lt=100) | None = None
    seconds: Tol("s") | None = None


TEXTS = ["4.2 V", " 4.2 V", "4.2 V ", "4.2V", "-1 V", "0 V", "20 kV", "nan V", "4,2 V", "",
         "0.5 %", "1 %", "100 %", "25 mV", " 25 mV ", "5\u00a0%", "x", " x ", "\t1 % ", "1.5 s", "15 ms", "12"]
VALUES = st.one_of(st.sampled_from(TEXTS), st.none(), st.booleans(), st.integers(-5, 5),
                   st.floats(allow_nan=True, allow_infinity=True), st.just([1]), st.just({}))
KEYS = st.sampled_from(["typ", "min", "max", "tol", "other"])
GIVEN = st.one_of(VALUES, st.dictionaries(KEYS, VALUES, max_size=4))


def outcome(data: dict) -> tuple:
    try:
        probe = Probe.model_validate(data)
    except ValidationError as exc:
        return "errors", [{k: (repr(v) if k == "ctx" else v) for k, v in e.items()}
                          for e in exc.errors(include_url=False)]
    out = []
    for name in Probe.model_fields:
        value = getattr(probe, name)
        out.append(None if value is None else (type(value), value.__dict__,
                                               value.model_fields_set, value.__pydantic_extra__,
                                               value.__pydantic_private__))
    return "model", out


@settings(max_examples=400, deadline=None)
@given(field=st.sampled_from(["volts", "share", "seconds"]), value=GIVEN)
def test_a_value_read_directly_is_what_the_given_model_makes_of_it(field: str, value) -> None:
    data = {field: value}
    direct = outcome(data)
    with pytest.MonkeyPatch.context() as patch:
        patch.setattr(schema, "_plain_limits", lambda value, parse: None)
        through_the_model = outcome(data)
    assert direct == through_the_model


@pytest.mark.parametrize("value", [{"typ": "4.20 V", "tol": "0.5 %"}, {"min": "0.5 V", "max": "1 V"},
                                   "4.2 V", {"typ": "4.3 V", "tol": "25 mV"}])
def test_the_examples_forms_are_read_directly(value, monkeypatch: pytest.MonkeyPatch) -> None:
    # the forms the examples use take the shortcut: no Given model is asked for
    def refused(*args, **kwargs):
        raise AssertionError("the Given model was asked for")
    monkeypatch.setattr(schema, "given_model", refused)
    assert Probe.model_validate({"volts": value}).volts is not None
