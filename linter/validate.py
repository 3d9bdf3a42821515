"""Schema validation with messages that point at the file, line and column of the bad value."""

from __future__ import annotations

import difflib
from typing import Any

from pydantic import BaseModel, ValidationError

from .loader import Document, InputError


def _vocabulary() -> list[str]:
    from . import schema
    words: set[str] = set()
    for obj in vars(schema).values():
        if isinstance(obj, type) and issubclass(obj, BaseModel):
            words.update(obj.model_fields)
    return sorted(words)


_VOCAB: list[str] | None = None


def validate(doc: Document, model: type[BaseModel]) -> tuple[Any, list[InputError]]:
    """Validate ``doc.data`` against ``model``; return the model or all errors, located."""
    try:
        return model.model_validate(doc.data), []
    except ValidationError as exc:
        errors = [_locate(doc, err) for err in exc.errors(include_url=False)]
        # pydantic reports one problem once per union branch it tried; keep each place once
        seen, unique = set(), []
        for e in errors:
            if (e.line, e.column, e.message) not in seen:
                seen.add((e.line, e.column, e.message))
                unique.append(e)
        return None, sorted(unique, key=lambda e: (e.line, e.column))


def _locate(doc: Document, err: dict) -> InputError:
    global _VOCAB
    loc = tuple(p for p in err["loc"] if not (isinstance(p, str) and (p.startswith("@") or
                                                                      p in _TAGS)))
    kind = err["type"]
    where = ".".join(str(p) for p in loc) or "(top level)"
    if kind == "extra_forbidden":
        key = loc[-1] if loc else "?"
        if _VOCAB is None:
            _VOCAB = _vocabulary()
        close = difflib.get_close_matches(str(key), _VOCAB, n=1, cutoff=0.75)
        parent = ".".join(str(p) for p in loc[:-1]) or "the top level"
        msg = f"unknown key '{key}' in {parent}"
        if close:
            msg += f" (did you mean '{close[0]}'?)"
        return doc.error(loc, msg, key=True)
    if kind == "missing":
        parent = ".".join(str(p) for p in loc[:-1]) or "the top level"
        return doc.error(loc[:-1], f"missing required key '{loc[-1]}' in {parent}", key=True)
    msg = err["msg"]
    for prefix in ("Value error, ", "Assertion failed, "):
        if msg.startswith(prefix):
            msg = msg[len(prefix):]
    if kind == "literal_error" and loc and loc[-1] == "format":
        msg = f"unknown format {err.get('input')!r}; expected {err['ctx']['expected']}"
    elif kind in ("string_type", "dict_type", "list_type", "float_type", "int_type", "model_type",
                  "bool_type", "model_attributes_type"):
        msg = f"{msg}, got {_describe(err.get('input'))}"
    elif kind == "unknown_kind":
        msg = f"unknown or missing part kind {_describe(err.get('input', {}).get('kind') if isinstance(err.get('input'), dict) else None)}; expected one of {err['ctx']['kinds']}"
    return doc.error(loc, f"{where}: {msg}")


def _describe(value: Any) -> str:
    if value is None:
        return "nothing"
    if isinstance(value, bool):
        return f"the boolean {value!r}".lower()
    if isinstance(value, dict):
        return "a mapping"
    if isinstance(value, list):
        return "a list"
    if isinstance(value, (int, float)):
        return f"the number {value!r}"
    text = str(value)
    return f"'{text[:40]}…'" if len(text) > 40 else f"'{text}'"


def _tags() -> set[str]:
    from .schema import INLINE_KINDS, PART_KINDS
    # union branch tags pydantic puts in error locations: the kinds, and dict/list for pins
    return set(PART_KINDS) | set(INLINE_KINDS) | {"dict[str,constrained-str]", "list[constrained-str]",
                                                  "function-before[<lambda>(), constrained-str]"}


_TAGS: set[str] = set()


def _init_tags() -> None:
    _TAGS.update(_tags())


_init_tags()


def raise_first(errors: list[InputError]) -> None:
    if errors:
        raise errors[0]
