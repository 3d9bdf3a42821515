"""Records: dataclasses that are cheaper to create.

Python 3.11 compiles each method a dataclass generates on its own: a frozen dataclass of six
fields takes about 1 ms to create (``__init__``, ``__repr__``, ``__eq__``, ``__hash__``,
``__setattr__``, ``__delattr__``), and the engine and the model define some eighty of them, all
made at every start of the command. A record is the same dataclass (fields, defaults,
``__init__``, frozenness, ``__match_args__``; ``dataclasses.fields``, ``replace`` and ``asdict``
work as before) whose ``__eq__``, ``__hash__`` and ``__repr__`` are shared functions reading the
class's field list, not compiled per class: half the cost. They behave as the generated ones do:
equal when of the same class with equal compared fields, hashed on those fields when frozen,
unhashable otherwise, shown as ``Name(field=value, ...)``.

Nor is ``__init__`` compiled per class: a record's ``__init__`` is a copy of a template compiled
once per shape (number of fields, frozen, ``__post_init__``) with its parameter and attribute
names replaced (``CodeType.replace``), its defaults those of the fields, a default factory called
when its field is not given; a frozen record's ``__setattr__`` and ``__delattr__`` are shared
functions. Together that spared about 40 ms of a single-file check (96 classes, 466 generated
functions, three in four of them no longer compiled). A class of an unusual kind (a record base,
``__slots__``, fields that are not plain ``__init__`` parameters, its own ``__init__``) is made by
``dataclass`` as before. ``tests/test_records.py`` holds both against the standard library's
dataclass.
"""

from __future__ import annotations

import builtins
import dataclasses
import reprlib
from types import CodeType, FunctionType
from typing import Any, TypeVar

__all__ = ["record"]

T = TypeVar("T", bound=type)


def record(cls: T | None = None, /, *, frozen: bool = False) -> Any:
    """``@record`` or ``@record(frozen=True)``: as ``@dataclass`` with the same arguments."""

    def wrap(c: T) -> T:
        own = c.__dict__
        if _plain(c, frozen):
            had_doc = bool(c.__doc__)
            if not had_doc:
                # dataclass would write the docstring from the signature of a class that has no
                # __init__ yet (an inspection of object's, about 0.5 ms): written below instead
                c.__doc__ = "(record)"
            c = dataclasses.dataclass(c, init=False, eq=False, repr=False)
            c.__dataclass_params__.init = True
            c.__dataclass_params__.frozen = frozen
            _install_init(c, frozen)
            if not had_doc:
                c.__doc__ = _doc(c)
        else:
            c = dataclasses.dataclass(c, frozen=frozen, eq=False, repr=False)
        fields = dataclasses.fields(c)
        c.__record_compare__ = tuple(f.name for f in fields if f.compare)
        c.__record_hash__ = tuple(f.name for f in fields
                                  if (f.compare if f.hash is None else f.hash))
        c.__record_repr__ = tuple(f.name for f in fields if f.repr)
        if "__eq__" not in own:
            c.__eq__ = _eq
        if "__repr__" not in own:
            c.__repr__ = _repr
        if "__hash__" not in own:
            c.__hash__ = _hash if frozen else None  # as dataclass: eq without frozen is unhashable
        return c

    return wrap if cls is None else wrap(cls)


def _values(obj: Any, names: tuple[str, ...]) -> tuple:
    return tuple([getattr(obj, n) for n in names])


def _eq(self: Any, other: Any) -> Any:
    if other.__class__ is self.__class__:
        names = self.__record_compare__
        return _values(self, names) == _values(other, names)
    return NotImplemented


def _hash(self: Any) -> int:
    return hash(_values(self, self.__record_hash__))


@reprlib.recursive_repr()
def _repr(self: Any) -> str:
    inner = ", ".join(f"{n}={getattr(self, n)!r}" for n in self.__record_repr__)
    return f"{self.__class__.__qualname__}({inner})"



# --- __init__ without compiling per class ---------------------------------------------------------

_TEMPLATES: dict[tuple[int, bool, bool], CodeType] = {}


def _plain(c: type, frozen: bool) -> bool:
    """True when the class is one :func:`_install_init` makes exactly as ``dataclass`` would."""
    own = c.__dict__
    if "__slots__" in own or "__init__" in own:
        return False
    if frozen and ("__setattr__" in own or "__delattr__" in own):
        return False  # dataclass refuses these: let it say so
    if any(hasattr(b, "__dataclass_fields__") for b in c.__mro__[1:]):
        return False
    seen_default = False
    for name, kind in own.get("__annotations__", {}).items():
        value = own.get(name, dataclasses.MISSING)
        if isinstance(value, dataclasses.Field):
            if not value.init or value.kw_only is True or value.default is not dataclasses.MISSING \
                    and value.default_factory is not dataclasses.MISSING:
                return False
            has_default = (value.default is not dataclasses.MISSING
                           or value.default_factory is not dataclasses.MISSING)
        else:
            has_default = value is not dataclasses.MISSING
        text = kind if isinstance(kind, str) else getattr(kind, "__name__", "")
        if (name == "self" or name.startswith("_rec_") or "ClassVar" in text or "InitVar" in text
                or "KW_ONLY" in text or kind is dataclasses.KW_ONLY):
            return False
        if seen_default and not has_default:
            return False  # dataclass's own error
        seen_default = seen_default or has_default
    return True


def _template(n: int, frozen: bool, post_init: bool) -> CodeType:
    key = (n, frozen, post_init)
    code = _TEMPLATES.get(key)
    if code is None:
        lines = []
        for i in range(n):
            value = f"_rec_f{i}() if _rec_a{i} is _rec_factory else _rec_a{i}"
            lines.append(f"    _rec_set(self, '_rec_n{i}', {value})" if frozen
                         else f"    self._rec_n{i} = {value}")
        if post_init:
            lines.append("    self.__post_init__()")
        params = "".join(f", _rec_a{i}" for i in range(n))
        source = f"def __init__(self{params}):\n" + ("\n".join(lines) or "    pass") + "\n"
        space: dict = {}
        exec(compile(source, "<record __init__>", "exec"), {}, space)
        code = _TEMPLATES[key] = space["__init__"].__code__
    return code


def _install_init(c: Any, frozen: bool) -> None:
    fields = [f for f in dataclasses.fields(c)]
    names = [f.name for f in fields]
    rename = {}
    for i, name in enumerate(names):
        rename[f"_rec_a{i}"] = rename[f"_rec_n{i}"] = name
    code = _template(len(fields), frozen, hasattr(c, "__post_init__"))
    changes: dict[str, Any] = {
        "co_varnames": tuple(rename.get(v, v) for v in code.co_varnames),
        "co_names": tuple(rename.get(v, v) for v in code.co_names),
        "co_consts": tuple(rename.get(v, v) if isinstance(v, str) else v
                           for v in code.co_consts)}
    if hasattr(code, "co_qualname"):
        changes["co_qualname"] = f"{c.__qualname__}.__init__"
    space: dict[str, Any] = {"__builtins__": builtins, "_rec_set": object.__setattr__,
                             "_rec_factory": dataclasses._HAS_DEFAULT_FACTORY}
    defaults = []
    for i, f in enumerate(fields):
        if f.default_factory is not dataclasses.MISSING:
            space[f"_rec_f{i}"] = f.default_factory
            defaults.append(dataclasses._HAS_DEFAULT_FACTORY)
        elif f.default is not dataclasses.MISSING:
            defaults.append(f.default)
    init = FunctionType(code.replace(**changes), space, "__init__", tuple(defaults) or None)
    init.__qualname__ = f"{c.__qualname__}.__init__"
    init.__module__ = c.__module__
    init.__annotations__ = {**{f.name: f.type for f in fields}, "return": None}
    c.__init__ = init
    if frozen:
        c.__record_frozen__ = (c, frozenset(names))
        c.__setattr__ = _frozen_setattr
        c.__delattr__ = _frozen_delattr


def _frozen_setattr(self: Any, name: str, value: Any) -> None:
    cls, names = self.__record_frozen__
    if type(self) is cls or name in names:
        raise dataclasses.FrozenInstanceError(f"cannot assign to field {name!r}")
    super(cls, self).__setattr__(name, value)


def _frozen_delattr(self: Any, name: str) -> None:
    cls, names = self.__record_frozen__
    if type(self) is cls or name in names:
        raise dataclasses.FrozenInstanceError(f"cannot delete field {name!r}")
    super(cls, self).__delattr__(name)


def _doc(c: type) -> str:
    # as dataclass writes a missing docstring: the class's name and its signature
    import inspect
    try:
        text = str(inspect.signature(c)).replace(" -> None", "")
    except (TypeError, ValueError):
        text = ""
    return c.__name__ + text
