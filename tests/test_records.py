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


# --- __init__ from a template (no per-class compile) against the standard library's dataclass ---

def twins(frozen: bool, annotations: dict, values: dict, methods: dict | None = None):
    """The same class body made by ``dataclass`` and by ``record``."""
    def body():
        made = {"__annotations__": dict(annotations), "__module__": __name__}
        for k, v in values.items():
            made[k] = v() if callable(v) and getattr(v, "fresh", False) else v
        made.update(methods or {})
        return made
    return (dataclass(frozen=frozen)(type("Part", (), body())),
            record(frozen=frozen)(type("Part", (), body())))


def fresh(make):
    make.fresh = True  # a dataclasses.field() may serve one class only: made anew for each
    return make


SHAPES = [
    ({}, {}),
    ({"a": "int"}, {}),
    ({"a": "int", "b": "str"}, {"b": "x"}),
    ({"a": "int", "b": "list", "c": "float"},
     {"b": fresh(lambda: field(default_factory=list)), "c": 2.5}),
    ({"name": "str", "tags": "dict", "note": "str"},
     {"tags": fresh(lambda: field(default_factory=dict)),
      "note": fresh(lambda: field(default="", compare=False))}),
]


def outcome(call):
    try:
        return "ok", call()
    except Exception as exc:  # the error's class and message are what must agree
        return type(exc).__name__, str(exc)


@pytest.mark.parametrize("frozen", [True, False])
@pytest.mark.parametrize("shape", range(len(SHAPES)))
def test_the_template_init_is_the_dataclass_init(frozen: bool, shape: int) -> None:
    import inspect
    annotations, values = SHAPES[shape]
    ref, mine = twins(frozen, annotations, values)
    assert "_rec_" not in repr(mine.__init__.__code__.co_varnames)
    assert str(inspect.signature(mine)) == str(inspect.signature(ref))
    assert mine.__doc__ == ref.__doc__ and mine.__match_args__ == ref.__match_args__
    assert mine.__init__.__qualname__ == ref.__init__.__qualname__
    assert mine.__init__.__annotations__ == ref.__init__.__annotations__
    assert mine.__dataclass_params__.frozen == frozen and mine.__dataclass_params__.init
    names = list(annotations)
    calls = [(), (1,), (1, "y"), (1, [2], 3.0), (1, [2], 3.0, "extra"), ("n", {"k": 1}, "note")]
    kwcalls = [{"a": 1}, {"b": "y"}, {"a": 1, "zz": 2}, {n: i for i, n in enumerate(names)}]
    for args in calls:
        got, want = outcome(lambda: mine(*args)), outcome(lambda: ref(*args))
        assert got[0] == want[0] and (got[0] != "ok" or repr(got[1]).replace("Part", "") ==
                                      repr(want[1]).replace("Part", "")), (args, got, want)
        if got[0] != "ok":
            assert got[1] == want[1]
    for kwargs in kwcalls:
        got, want = outcome(lambda: mine(**kwargs)), outcome(lambda: ref(**kwargs))
        assert got[0] == want[0] and (got[0] == "ok" or got[1] == want[1]), (kwargs, got, want)
    if names:
        args = tuple(range(len(names)))
        x, y = mine(*args), ref(*args)
        assert dataclasses.asdict(x) == dataclasses.asdict(y)
        # each default factory makes a new value for each instance
        assert all(getattr(mine(*args[:1]), n) is not getattr(mine(*args[:1]), n)
                   for n in names[1:] if isinstance(getattr(mine(*args[:1]), n), (list, dict)))
        for act in (lambda o: setattr(o, names[0], 9), lambda o: delattr(o, names[0]),
                    lambda o: setattr(o, "other", 1), lambda o: delattr(o, "missing")):
            got, want = outcome(lambda: act(mine(*args))), outcome(lambda: act(ref(*args)))
            assert got == want


def test_post_init_runs_after_the_fields_are_set() -> None:
    def post(self):
        object.__setattr__(self, "total", self.a + self.b)
    ref, mine = twins(True, {"a": "int", "b": "int"}, {"b": 2}, {"__post_init__": post})
    assert mine(1).total == ref(1).total == 3 and mine(1, 5).total == 6


def test_a_plain_subclass_of_a_frozen_record_is_frozen_where_the_dataclass_is() -> None:
    ref, mine = twins(True, {"a": "int"}, {})
    for base in (ref, mine):
        sub = type("Sub", (base,), {})
        o = sub(1)
        o.extra = 2  # not a field, not the frozen class itself: allowed, as dataclass allows
        assert o.extra == 2
        with pytest.raises(dataclasses.FrozenInstanceError, match="cannot assign to field 'a'"):
            o.a = 3


def test_classes_of_unusual_kinds_are_made_by_dataclass_as_before() -> None:
    # own __init__ kept; kw_only and init=False fields; a default before a required field
    @record
    class Own:
        a: int

        def __init__(self, text: str) -> None:
            self.a = int(text)
    assert Own("4").a == 4

    @record(frozen=True)
    class Flags:
        a: int
        b: int = field(default=0, kw_only=True)
        c: int = field(default=5, init=False)
    assert Flags(1, b=2) == Flags(1, b=2) and Flags(1).c == 5
    with pytest.raises(TypeError, match="non-default argument 'b' follows default argument"):
        @record
        class Bad:
            a: int = 0
            b: int


def test_every_record_of_the_engine_is_made_from_a_template() -> None:
    import gc

    import packwarden.engine  # noqa: F401 - the engine, the model and the rules' records
    import packwarden.model.design  # noqa: F401
    from packwarden import records
    # The engine's records only: the classes the tests above make in their bodies (some with an
    # __init__ of their own, on purpose) live on until the cycle collector runs, whenever that is.
    gc.collect()
    made = [c for c in gc.get_objects() if isinstance(c, type) and "__record_compare__" in c.__dict__
            and c.__module__.startswith("packwarden")]
    templated = [c for c in made if c.__init__.__code__.co_filename == "<record __init__>"]
    assert len(made) > 50 and len(templated) >= len(made) - 5
    assert len(records._TEMPLATES) < len(templated) / 2


@pytest.mark.parametrize("frozen", [True, False])
@pytest.mark.parametrize("shape", range(len(SHAPES)))
def test_the_field_table_is_the_dataclass_table(frozen: bool, shape: int) -> None:
    # the field table, the parameters and the class attributes, made without dataclass's
    # processing, against the standard library's dataclass of the same body
    annotations, values = SHAPES[shape]
    ref, mine = twins(frozen, annotations, values)
    slots = ("name", "type", "default", "default_factory", "init", "repr", "hash", "compare",
             "metadata", "kw_only", "_field_type")
    assert list(mine.__dataclass_fields__) == list(ref.__dataclass_fields__)
    for name, f in ref.__dataclass_fields__.items():
        g = mine.__dataclass_fields__[name]
        assert [getattr(g, s) for s in slots] == [getattr(f, s) for s in slots], name
        assert (name in mine.__dict__) == (name in ref.__dict__)
        assert getattr(mine, name, "absent") == getattr(ref, name, "absent")
    params = ("init", "repr", "eq", "order", "unsafe_hash", "frozen")
    assert [getattr(mine.__dataclass_params__, p) for p in params] == \
        [True, False, False, False, False, frozen]
    assert dataclasses.is_dataclass(mine) and mine.__match_args__ == ref.__match_args__


def test_what_dataclass_refuses_it_still_refuses() -> None:
    # a mutable default, a field() without an annotation: dataclass's own errors
    with pytest.raises(ValueError, match="mutable default"):
        @record
        class Listed:
            a: list = []  # noqa: RUF012
    with pytest.raises(TypeError, match="is a field but has no type annotation"):
        @record
        class Loose:
            a: int
            b = field(default=1)


def test_the_kept_templates_are_the_generated_ones() -> None:
    # record_inits.py is written by records.kept_templates_source(): the two must not drift
    from pathlib import Path

    from packwarden import record_inits, records
    assert Path(record_inits.__file__).read_text(encoding="utf-8") == \
        records.kept_templates_source()
