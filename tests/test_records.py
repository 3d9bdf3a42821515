"""Records behave as the dataclasses they stand for: the standard library's dataclass is the
reference each check compares with."""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass, field

import pytest
from hypothesis import given, strategies as st

from packwarden.records import record


def pair(frozen: bool):
    """The same class declared as a dataclass and as a record."""
    def body():
        return {"__annotations__": {"a": "int", "b": "float", "c": "tuple", "note": "str"},
                "b": 1.5, "c": field(default_factory=tuple),
                "note": field(default="", compare=False, repr=False)}
    ref = dataclass(frozen=frozen)(type("Point", (), body()))
    mine = record(frozen=frozen)(type("Point", (), body()))
    return ref, mine


values = st.tuples(st.integers(-3, 3), st.sampled_from([0.0, 1.5, -2.0]),
                   st.sampled_from([(), (1,), ("x", 2)]), st.sampled_from(["", "n"]))


@pytest.mark.parametrize("frozen", [True, False])
@given(x=values, y=values)
def test_equality_and_repr_as_a_dataclass(frozen: bool, x: tuple, y: tuple) -> None:
    ref, mine = pair(frozen)
    assert (ref(*x) == ref(*y)) == (mine(*x) == mine(*y))
    assert repr(ref(*x)) == repr(mine(*x))
    assert (mine(*x) == ref(*x)) is False  # another class is never equal, as with dataclasses
    assert mine(*x).__eq__(object()) is NotImplemented


@given(x=values, y=values)
def test_frozen_records_hash_on_their_compared_fields(x: tuple, y: tuple) -> None:
    ref, mine = pair(True)
    assert hash(mine(*x)) == hash(ref(*x))  # both hash the tuple of compared fields
    if mine(*x) == mine(*y):
        assert hash(mine(*x)) == hash(mine(*y))
    with pytest.raises(dataclasses.FrozenInstanceError):
        mine(*x).a = 5


def test_plain_records_are_mutable_and_unhashable_like_dataclasses() -> None:
    ref, mine = pair(False)
    r = mine(1)
    r.a = 2
    assert r.a == 2
    for cls in (ref, mine):
        with pytest.raises(TypeError):
            hash(cls(1))


def test_the_dataclass_tools_work_on_records() -> None:
    _, mine = pair(True)
    p = mine(1, 2.0, (3,), "n")
    assert [f.name for f in dataclasses.fields(p)] == ["a", "b", "c", "note"]
    assert dataclasses.replace(p, a=7) == mine(7, 2.0, (3,), "n")
    assert dataclasses.asdict(p) == {"a": 1, "b": 2.0, "c": (3,), "note": "n"}
    assert mine.__match_args__ == ("a", "b", "c", "note")
    assert mine(1).c == () and mine(1).c is not None


def test_a_method_the_class_defines_is_kept() -> None:
    @record(frozen=True)
    class Named:
        name: str

        def __repr__(self) -> str:
            return f"<{self.name}>"

    assert repr(Named("x")) == "<x>" and Named("x") == Named("x")


def test_subclass_records_compare_all_their_fields() -> None:
    @record(frozen=True)
    class Base:
        a: int

    @record(frozen=True)
    class Child(Base):
        b: int = 0

    assert Child(1, 2) != Child(1, 3) and Child(1, 2) == Child(1, 2)
    assert repr(Child(1, 2)) == "test_subclass_records_compare_all_their_fields.<locals>.Child(a=1, b=2)"
    assert Base(1) != Child(1)  # a subclass instance is another class
