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

Nor is ``__init__`` compiled per class: a record's ``__init__`` is a copy of a template per shape
(number of fields, frozen, ``__post_init__``) with its parameter and attribute names replaced
(``CodeType.replace``), its defaults those of the fields, a default factory called when its field
is not given; a frozen record's ``__setattr__`` and ``__delattr__`` are shared functions. The
templates of up to :data:`KEPT_FIELDS` fields are the functions of ``record_inits.py`` (written by
:func:`kept_templates_source`), whose bytecode is cached like any module's; a larger shape's is
compiled when first needed. Nor does a record pass through ``dataclass`` itself: its field table,
parameters, class attributes, ``__match_args__`` and docstring are made as ``dataclass`` makes
them, without its inspection of each field (:func:`_plain_fields`, :func:`_make_fields`).
Together: 98 classes in about 6 ms, where ``dataclass`` took 38 ms. A class of an unusual kind
(a record base, ``__slots__``, fields that are not plain ``__init__`` parameters, its own
``__init__``, a mutable default) is made by ``dataclass`` as before. ``tests/test_records.py``
holds both against the standard library's dataclass.
"""

from __future__ import annotations

import builtins
import dataclasses
import reprlib
from types import CodeType, FunctionType
from typing import Any, TypeVar

MISSING = dataclasses.MISSING

__all__ = ["record"]

T = TypeVar("T", bound=type)


def record(cls: T | None = None, /, *, frozen: bool = False) -> Any:
    """``@record`` or ``@record(frozen=True)``: as ``@dataclass`` with the same arguments."""

    def wrap(c: T) -> T:
        own = c.__dict__
        fields = _plain_fields(c, frozen)
        if fields is not None:
            _make_fields(c, fields, frozen)
            _install_init(c, fields, frozen)
            if not c.__doc__:
                c.__doc__ = _doc(c, fields)
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


def _plain_fields(c: type, frozen: bool) -> list[dataclasses.Field] | None:
    """The fields of a class :func:`_make_fields` and :func:`_install_init` make exactly as
    ``dataclass`` would, in order (each a ``dataclasses.Field`` as ``dataclass`` makes it), else
    None, leaving the class untouched."""
    own = c.__dict__
    if "__slots__" in own or "__init__" in own or "__annotate__" in own:
        return None
    if frozen and ("__setattr__" in own or "__delattr__" in own):
        return None  # dataclass refuses these: let it say so
    if any(hasattr(b, "__dataclass_fields__") for b in c.__mro__[1:]):
        return None
    annotations = own.get("__annotations__", {})
    given = []
    seen_default = False
    for name, kind in annotations.items():
        value = own.get(name, MISSING)
        if isinstance(value, dataclasses.Field):
            if not value.init or value.kw_only is True or value.default is not MISSING \
                    and value.default_factory is not MISSING:
                return None
            has_default = value.default is not MISSING or value.default_factory is not MISSING
            if value.default.__class__.__hash__ is None:
                return None  # dataclass's "mutable default" error
        else:
            has_default = value is not MISSING
            if has_default and (value.__class__.__hash__ is None
                                or hasattr(type(value), "__get__")):
                return None  # the mutable default's error, or a descriptor dataclass reads
        text = kind if isinstance(kind, str) else getattr(kind, "__name__", "")
        if (name == "self" or name.startswith("_rec_") or "ClassVar" in text or "InitVar" in text
                or "KW_ONLY" in text or kind is dataclasses.KW_ONLY):
            return None
        if seen_default and not has_default:
            return None  # dataclass's own error
        seen_default = seen_default or has_default
        given.append((name, kind, value))
    if any(isinstance(v, dataclasses.Field) and k not in annotations for k, v in own.items()):
        return None  # dataclass's "a field but has no type annotation"
    fields = []
    for name, kind, value in given:
        f = value if isinstance(value, dataclasses.Field) else dataclasses.field(default=value)
        f.name = name
        f.type = kind
        f._field_type = dataclasses._FIELD  # type: ignore[attr-defined]
        if f.kw_only is MISSING:
            f.kw_only = False
        fields.append(f)
    return fields


#: ``__dataclass_params__`` of a record, frozen and not: the same for every record, so one object
#: each, made by ``dataclass`` (its fields differ between Python versions).
_PARAMS: dict[bool, Any] = {}


def _make_fields(c: Any, fields: list[dataclasses.Field], frozen: bool) -> None:
    """What ``dataclass(c, init=False, eq=False, repr=False)`` does to a plain class, without
    its per-field inspection: the field table, the parameters, the class attributes a ``field()``
    stood in, ``__match_args__``."""
    params = _PARAMS.get(frozen)
    if params is None:
        # made with nothing to generate, then set as the record is
        made = dataclasses.dataclass(type("_", (), {"__doc__": "-"}), init=False, eq=False,
                                     repr=False)
        params = _PARAMS[frozen] = made.__dataclass_params__
        params.init = True
        params.frozen = frozen
    c.__dataclass_params__ = params
    c.__dataclass_fields__ = {f.name: f for f in fields}
    own = c.__dict__
    for f in fields:
        if isinstance(own.get(f.name), dataclasses.Field):
            if f.default is MISSING:
                delattr(c, f.name)
            else:
                setattr(c, f.name, f.default)
    if "__match_args__" not in own:
        c.__match_args__ = tuple(f.name for f in fields)
    if getattr(c, "__abstractmethods__", None):
        import abc
        abc.update_abstractmethods(c)


def _template_source(n: int, frozen: bool, post_init: bool) -> str:
    """The source of the ``__init__`` template of a record of ``n`` fields."""
    lines = []
    for i in range(n):
        value = f"_rec_f{i}() if _rec_a{i} is _rec_factory else _rec_a{i}"
        lines.append(f"    _rec_set(self, '_rec_n{i}', {value})" if frozen
                     else f"    self._rec_n{i} = {value}")
    if post_init:
        lines.append("    self.__post_init__()")
    params = "".join(f", _rec_a{i}" for i in range(n))
    name = template_name(n, frozen, post_init)
    return f"def {name}(self{params}):\n" + ("\n".join(lines) or "    pass") + "\n"


def template_name(n: int, frozen: bool, post_init: bool) -> str:
    return f"init_{n}" + ("_frozen" if frozen else "") + ("_post" if post_init else "")


#: Shapes whose templates ``record_inits`` holds, compiled with the package (its bytecode is
#: cached as any module's); a larger record's template is compiled when first needed.
KEPT_FIELDS = 24


def kept_templates_source() -> str:
    """The text of ``record_inits.py``; ``tests/test_records.py`` holds the file to it."""
    head = ('"""Record ``__init__`` templates, one per shape (number of fields, frozen, '
            '``__post_init__``).\n\n'
            "Written by ``records.kept_templates_source()``: compiling them when a command starts "
            "was\nabout 3 ms of a cold check; kept as a module, their bytecode is cached. "
            "Do not edit.\n\"\"\"\n")
    body = "\n\n".join(_template_source(n, frozen, post)
                        for n in range(KEPT_FIELDS + 1)
                        for frozen in (False, True) for post in (False, True))
    return head + "\n\n" + body


def _template(n: int, frozen: bool, post_init: bool) -> CodeType:
    key = (n, frozen, post_init)
    code = _TEMPLATES.get(key)
    if code is None:
        if n <= KEPT_FIELDS:
            from . import record_inits
            space = vars(record_inits)
        else:
            space = {}
            exec(compile(_template_source(n, frozen, post_init), "<record __init__>", "exec"),
                 space)
        made = space[template_name(n, frozen, post_init)].__code__
        code = _TEMPLATES[key] = made.replace(co_filename="<record __init__>", co_name="__init__")
    return code


def _install_init(c: Any, fields: list[dataclasses.Field], frozen: bool) -> None:
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
        if f.default_factory is not MISSING:
            space[f"_rec_f{i}"] = f.default_factory
            defaults.append(dataclasses._HAS_DEFAULT_FACTORY)
        elif f.default is not MISSING:
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


def _doc(c: type, fields: list[dataclasses.Field]) -> str:
    """As dataclass writes a missing docstring: the class's name and its signature (the
    parameters as ``inspect.signature`` shows them, written from the fields without it)."""
    from inspect import formatannotation
    params = []
    for f in fields:
        text = f"{f.name}: {formatannotation(f.type)}"
        if f.default_factory is not MISSING:
            text += f" = {dataclasses._HAS_DEFAULT_FACTORY!r}"
        elif f.default is not MISSING:
            text += f" = {f.default!r}"
        params.append(text)
    return f"{c.__name__}({', '.join(params)})"
