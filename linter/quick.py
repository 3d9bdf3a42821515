"""The quick way through a plain check: the schema's and the options' models without pydantic.

A plain ``packwarden check FILE`` spends most of its start-up in pydantic's Python layer: its
import (about 60 ms) and the work its model classes do as each is made (about 25 ms for the
schema's), against a single design that validates in under a millisecond. Validation itself is
pydantic-core's, compiled from the core schemas kept between runs (``schemacache.py``); what a
check needs of the model classes after that is what any Python object offers: attributes, the
models' own methods, equality, hashing and ``repr``.

So when ``launch.main`` sees a plain check of a few files (:func:`wanted`) and the kept schemas
are current, it turns this mode on (``schemacache.go_quick``) before anything imports
``schema.py``. ``schema.py`` and ``api.py`` then take their model base and markers from here (:class:`BaseModel`, :func:`Field`,
:class:`AfterValidator`, :class:`Discriminator`, :class:`Tag`, :func:`model_validator`): the
same class bodies make plain classes, pydantic-core builds their instances from the kept schemas
exactly as it builds pydantic's, and the instances behave as pydantic's do where a check looks
(equality, hashing and ``repr`` as ``pydantic.BaseModel`` makes them; ``model_fields``,
``model_construct`` and ``model_copy`` as far as a check uses them).

What reads pydantic's own models gets them, made when first needed: a validation error is
worded from ``schema.py`` made again by pydantic as a module of its own (:func:`full_schema`),
which also reads a toleranced mapping the quick reader does not take; a project's options for a
rule are validated by the options' model made by pydantic from the same fields
(:func:`pydantic_model`). A rule plugin, a team's rule folder or policy (their models are
pydantic's), or a use of a model the stand-ins do not offer, ends the quick way: :func:`fall_back`
runs the same command again, in the same interpreter with the same arguments, with the mode off,
before anything has been written, so the output is the full way's, byte for byte.
``tests/test_quick.py`` holds the two ways to the same reports on every example and flawed
example, in every format the quick way takes, and the stand-ins to pydantic's behaviour.

``PACKWARDEN_QUICK=0`` turns the mode off.
"""

from __future__ import annotations

import operator
import os
import sys
from typing import Any, Callable, NoReturn, Optional

#: True while this process runs the quick way (set by ``schemacache.go_quick`` before
#: ``schema.py`` loads).
ON = False
ENV = "PACKWARDEN_QUICK"
#: The formats the quick way renders (the others read a design's model or import more).
FORMATS = frozenset({"text", "json", "sarif", "junit", "markdown"})
#: The options of a plain check the quick way takes (launch.plain_check's names).
OPTIONS = frozenset({"paths", "format", "output", "fail_on", "quiet", "config", "designs_only"})
#: At most this many files: below ``batch.PARALLEL_MIN_DESIGNS``, so every design is linted in
#: this process (a worker must never run the command again).
MAX_FILES = 47


def wanted(opts: dict[str, Any]) -> bool:
    """Whether a plain check with these options may go the quick way (before any import)."""
    if os.environ.get(ENV, "") == "0" or set(opts) - OPTIONS:
        return False
    if opts.get("format", "text") not in FORMATS:
        return False
    paths = opts["paths"]
    return 0 < len(paths) <= MAX_FILES and all(os.path.isfile(p) for p in paths)


def fall_back(why: str) -> NoReturn:
    """Run this same command again the full way (nothing has been written yet)."""
    try:
        sys.stdout.flush()
        sys.stderr.flush()
    except (OSError, ValueError):  # pragma: no cover
        pass
    env = dict(os.environ)
    env[ENV] = "0"
    # sys.orig_argv: the interpreter's own command line, its options and the script included
    argv = list(getattr(sys, "orig_argv", [])) or [sys.executable, *sys.argv]
    command = [sys.executable, *argv[1:]]
    if os.name == "nt":  # no exec in place there: run it and leave with its exit code
        import subprocess
        os._exit(subprocess.call(command, env=env))
    os.execve(sys.executable, command, env)
    raise AssertionError(why)  # pragma: no cover - execve does not return


_twin: Any = None


def full_schema() -> Any:
    """``schema.py`` made again, by pydantic, as a module of its own
    (``packwarden._schema_full``): what words a validation error reads (the models' fields,
    annotations and kinds), and what reads a toleranced mapping the quick reader does not take
    (``schema.given_model``). Made at most once per process, only when a file needs it; no
    design or library is validated against it."""
    global ON, _twin
    if _twin is None:
        import importlib.util
        source = os.path.join(os.path.dirname(os.path.abspath(__file__)), "schema.py")
        spec = importlib.util.spec_from_file_location("packwarden._schema_full", source)
        assert spec is not None and spec.loader is not None
        module = importlib.util.module_from_spec(spec)
        sys.modules[spec.name] = module  # pydantic resolves the models' names in their module
        ON = False  # the module's classes are pydantic's
        try:
            spec.loader.exec_module(module)
        finally:
            ON = True
        _twin = module
    return _twin


# --- pydantic's markers, as plain objects with the attributes the kept schemas' recipes read ---

def ConfigDict(**values: Any) -> dict:  # noqa: N802 - pydantic's name
    return dict(values)


class _Marker:
    __slots__ = ()

    def __repr__(self) -> str:
        args = ", ".join(f"{k}={getattr(self, k)!r}" for k in self.__slots__)
        return f"{type(self).__name__}({args})"


class AfterValidator(_Marker):
    __slots__ = ("func",)

    def __init__(self, func: Callable) -> None:
        self.func = func


class Tag(_Marker):
    __slots__ = ("tag",)

    def __init__(self, tag: str) -> None:
        self.tag = tag


class Discriminator(_Marker):
    __slots__ = ("discriminator", "custom_error_type", "custom_error_message",
                 "custom_error_context")

    def __init__(self, discriminator: Any, custom_error_type: Optional[str] = None,
                 custom_error_message: Optional[str] = None,
                 custom_error_context: Optional[dict] = None) -> None:
        self.discriminator = discriminator
        self.custom_error_type = custom_error_type
        self.custom_error_message = custom_error_message
        self.custom_error_context = custom_error_context


def model_validator(*, mode: str) -> Callable[[Callable], Callable]:
    """pydantic leaves the function itself on the class once the class is made; it is marked
    here so that a model made by calling its class (a field's default factory) runs it too."""
    def mark(func: Callable) -> Callable:
        func.__quick_mode__ = mode  # type: ignore[attr-defined]
        return func
    return mark


_MISSING: Any = type("PydanticUndefinedType", (), {"__repr__": lambda self: "PydanticUndefined"})()


class FieldInfo:
    """What a check reads of a field: its default, alias, annotation and description."""

    __slots__ = ("default", "default_factory", "alias", "description", "annotation", "metadata",
                 "repr", "_given")

    def __init__(self, default: Any = _MISSING, *, default_factory: Optional[Callable] = None,
                 alias: Optional[str] = None, description: Optional[str] = None,
                 repr: bool = True, **given: Any) -> None:  # noqa: A002 - pydantic's name
        if default is ...:
            default = _MISSING
        self.default = default
        self.default_factory = default_factory
        self.alias = alias
        self.description = description
        self.repr = repr
        self.annotation: Any = None
        self.metadata: list = []
        self._given = given

    def is_required(self) -> bool:
        return self.default is _MISSING and self.default_factory is None

    def value(self) -> Any:
        if self.default_factory is not None:
            return self.default_factory()
        return self.default

    def placed(self, annotation: Any) -> "FieldInfo":
        """This field's copy for a class with ``annotation`` (the class body's own)."""
        out = FieldInfo.__new__(FieldInfo)
        for name in FieldInfo.__slots__:
            setattr(out, name, getattr(self, name))
        out.annotation = annotation
        return out


Field = FieldInfo


def _class_var(annotation: Any) -> bool:
    import typing
    return annotation is typing.ClassVar or typing.get_origin(annotation) is typing.ClassVar


def _field(annotation: Any, value: Any) -> FieldInfo:
    import typing
    if isinstance(value, FieldInfo):
        found = value
    else:
        found = FieldInfo(value)
    # a Field(...) written inside Annotated[...] gives the field's default, alias and text
    if typing.get_origin(annotation) is typing.Annotated:
        for marker in annotation.__metadata__:
            if isinstance(marker, FieldInfo):
                merged = marker.placed(None)
                if found.default is not _MISSING or found.default_factory is not None:
                    merged.default, merged.default_factory = found.default, found.default_factory
                found = merged
    return found.placed(annotation)


def _checks(cls: type) -> dict[str, Callable]:
    """A model class's own checks (``model_validator``), by name: a subclass's replaces its
    base's of the same name, as pydantic does."""
    found: dict[str, Callable] = {}
    for klass in reversed(cls.__mro__):
        found.update((n, f) for n, f in vars(klass).items() if hasattr(f, "__quick_mode__"))
    return found


def _fill(obj: Any, data: dict, fields_set: set, extra: Any = None, private: Any = None) -> Any:
    """Set a model's state as pydantic-core does (past the frozen ``__setattr__``)."""
    object.__setattr__(obj, "__dict__", data)
    object.__setattr__(obj, "__pydantic_fields_set__", fields_set)
    object.__setattr__(obj, "__pydantic_extra__", extra)
    object.__setattr__(obj, "__pydantic_private__", private)
    return obj


class BaseModel:
    """The quick way's model base: what pydantic-core needs to build an instance (``__dict__``
    and pydantic's three instance slots) and what a check reads of one."""

    __slots__ = ("__dict__", "__pydantic_fields_set__", "__pydantic_extra__",
                 "__pydantic_private__")
    model_config: dict = {}
    model_fields: dict[str, FieldInfo] = {}
    _getter: Callable[[dict], Any] = staticmethod(lambda d: 0)

    def __init_subclass__(cls, **kwargs: Any) -> None:
        super().__init_subclass__(**kwargs)
        fields = dict(cls.model_fields)
        own = cls.__dict__
        config = dict(cls.model_config)
        config.update(own.get("model_config", {}))
        cls.model_config = config
        for name, annotation in own.get("__annotations__", {}).items():
            if isinstance(annotation, str):  # pydantic would evaluate it; schema.py has none
                raise TypeError(f"{cls.__qualname__}.{name}: an annotation in a string")
            if name.startswith("_") or name == "model_config" or _class_var(annotation):
                continue
            value = own.get(name, _MISSING)
            fields[name] = _field(annotation, value)
            if name in own:
                delattr(cls, name)  # as pydantic: the default lives in the field, not the class
        cls.model_fields = fields
        # pydantic's hash of a frozen model: its field values, in the fields' order
        cls._getter = operator.itemgetter(*fields) if fields else (lambda d: 0)
        if not config.get("frozen"):
            cls.__hash__ = None  # type: ignore[assignment]
        elif "__hash__" not in own or (own["__hash__"] is None and "__eq__" in own):
            # as pydantic: unless the class body says its own hash (an ``__eq__`` alone makes
            # Python set None, which the class body did not say)
            cls.__hash__ = BaseModel.__hash__  # type: ignore[method-assign]

    # -- what pydantic's BaseModel offers, as pydantic does it ------------------------------------

    def __init__(self, **data: Any) -> None:
        """A model made by calling its class with nothing (a field's default factory): its
        defaults and its own after-checks, as pydantic validates an empty mapping."""
        if data:
            fall_back("a model made from values")
        made = type(self).model_construct()
        _fill(self, made.__dict__, made.__pydantic_fields_set__)
        for func in _checks(type(self)).values():
            if func.__quick_mode__ != "after":  # pragma: no cover - the schema has none other
                fall_back("a before-check of a model")
            func(self)

    def __eq__(self, other: Any) -> bool:
        if not isinstance(other, BaseModel):
            return NotImplemented
        if not (type(self) is type(other)
                and getattr(self, "__pydantic_private__", None)
                == getattr(other, "__pydantic_private__", None)
                and self.__pydantic_extra__ == other.__pydantic_extra__):
            return False
        if self.__dict__ == other.__dict__:
            return True
        names = type(self).model_fields.keys()
        if self.__dict__.keys() <= names and other.__dict__.keys() <= names:
            return False
        getter = type(self)._getter  # only the fields count, as pydantic compares them
        try:
            return getter(self.__dict__) == getter(other.__dict__)
        except KeyError:
            return False

    def __hash__(self) -> int:
        return hash(type(self)._getter(self.__dict__))

    def __setattr__(self, name: str, value: Any) -> None:
        raise TypeError(f"{type(self).__name__} is frozen: {name} cannot be set")

    def __delattr__(self, name: str) -> None:
        raise TypeError(f"{type(self).__name__} is frozen: {name} cannot be deleted")

    def __repr_args__(self) -> list[tuple[str, Any]]:
        fields = type(self).model_fields
        return [(k, v) for k, v in self.__dict__.items()
                if k in fields and fields[k].repr]

    def __repr__(self) -> str:
        return f"{type(self).__name__}({self.__repr_str__(', ')})"

    def __str__(self) -> str:
        return self.__repr_str__(" ")

    def __repr_str__(self, join: str) -> str:
        return join.join(f"{k}={v!r}" for k, v in self.__repr_args__())

    def __getstate__(self) -> dict[str, Any]:
        return {"__dict__": self.__dict__, "__pydantic_extra__": self.__pydantic_extra__,
                "__pydantic_fields_set__": self.__pydantic_fields_set__,
                "__pydantic_private__": getattr(self, "__pydantic_private__", None)}

    def __setstate__(self, state: dict[str, Any]) -> None:
        _fill(self, state.get("__dict__", {}), state.get("__pydantic_fields_set__"),
              state.get("__pydantic_extra__"), state.get("__pydantic_private__"))

    def __iter__(self) -> Any:
        yield from ((k, v) for k, v in self.__dict__.items() if not k.startswith("_"))

    @property
    def model_fields_set(self) -> set[str]:
        return self.__pydantic_fields_set__

    @classmethod
    def model_construct(cls, _fields_set: Optional[set[str]] = None, **values: Any) -> Any:
        """pydantic's ``model_construct``: the values as given, the defaults for the rest."""
        out = cls.__new__(cls)
        data: dict[str, Any] = {}
        given: set[str] = set()
        for name, field in cls.model_fields.items():
            if field.alias is not None and field.alias in values:
                data[name] = values.pop(field.alias)
                given.add(name)
            elif name in values:
                data[name] = values.pop(name)
                given.add(name)
            elif not field.is_required():
                data[name] = field.value()
        data.update(values)  # as pydantic: keys that are no field are kept as given
        return _fill(out, data, given if _fields_set is None else _fields_set)

    def model_copy(self, *, update: Optional[dict[str, Any]] = None, deep: bool = False) -> Any:
        """pydantic's ``model_copy`` (a shallow copy, ``update`` set without validation)."""
        if deep:  # pragma: no cover - no check asks for it
            fall_back("a deep copy of a model")
        out = type(self).__new__(type(self))
        data = dict(self.__dict__)
        fields_set = set(self.__pydantic_fields_set__)
        if update:
            data.update(update)
            fields_set.update(update)
        return _fill(out, data, fields_set, self.__pydantic_extra__, self.__pydantic_private__)

    @classmethod
    def model_validate(cls, obj: Any, **kwargs: Any) -> Any:
        """Validated by the same model made by pydantic (:func:`pydantic_model`): a project's
        options for a rule. A model of the schema is never validated so (its kept schema is)."""
        return pydantic_model(cls).model_validate(obj, **kwargs)


_made: dict[type, type] = {}


def pydantic_model(cls: type) -> Any:
    """The quick way's model ``cls`` made by pydantic, from the same fields (annotations, defaults
    and constraints as written) and configuration: a rule's options, validated when a project
    sets them. A model with checks of its own, or a base besides :class:`BaseModel`'s line,
    is not made so: the command runs again the full way."""
    found = _made.get(cls)
    if found is not None:
        return found
    import typing

    import pydantic
    if _checks(cls) or not all(issubclass(k, BaseModel) for k in cls.__mro__[:-1]):
        fall_back("a model with checks of its own, validated by itself")

    def pydantic_field(field: FieldInfo) -> Any:
        kwargs = dict(field._given)
        for name in ("alias", "description", "default_factory"):
            if getattr(field, name) is not None:
                kwargs[name] = getattr(field, name)
        if field.default is not _MISSING:
            kwargs["default"] = field.default
        if not field.repr:
            kwargs["repr"] = False
        return pydantic.Field(**kwargs)

    def annotation(ann: Any) -> Any:
        if typing.get_origin(ann) is typing.Annotated:
            return typing.Annotated[(ann.__origin__, *(
                pydantic_field(m) if isinstance(m, FieldInfo) else m for m in ann.__metadata__))]
        return ann

    fields = {name: (annotation(f.annotation), pydantic_field(f))
              for name, f in cls.model_fields.items()}
    found = pydantic.create_model(cls.__name__, __config__=pydantic.ConfigDict(**cls.model_config),
                                  __doc__=cls.__doc__, __module__=cls.__module__, **fields)
    _made[cls] = found
    return found
