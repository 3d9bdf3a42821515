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
"""

from __future__ import annotations

import dataclasses
import reprlib
from typing import Any, TypeVar

__all__ = ["record"]

T = TypeVar("T", bound=type)


def record(cls: T | None = None, /, *, frozen: bool = False) -> Any:
    """``@record`` or ``@record(frozen=True)``: as ``@dataclass`` with the same arguments."""

    def wrap(c: T) -> T:
        own = c.__dict__
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

