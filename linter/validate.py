"""Schema validation with messages that point at the file, line and column of the bad value.

pydantic reports each problem with a location that mixes the file's keys with its own union-branch
tags (``@ref``, ``resistor``, ``function-before[...]``); the location is walked against the loaded
data so that only the keys the file really has are shown and pointed at. Messages are reworded for
people who write data sheets, not Python: "expected a mapping", "got the number 12".
"""

from __future__ import annotations

import math
import re
import types
from typing import TYPE_CHECKING, Annotated, Any, Union, get_args, get_origin

from pydantic_core import ValidationError

from . import quick
from .loader import Document, InputError
from .records import record
from .schemacache import validator

if TYPE_CHECKING:  # pragma: no cover
    from pydantic import BaseModel


def _vocabulary() -> list[str]:
    words: set[str] = set()
    for obj in vars(_wording_models()).values():
        if _is_model(obj):
            words.update(obj.model_fields)
    return sorted(words)


_VOCAB: list[str] | None = None


def _wording_models() -> Any:
    """The module whose models word an error: ``schema.py``, or on the quick way (where its
    classes are not pydantic's) the same module made again by pydantic (``quick.full_schema``)."""
    if quick.ON:
        return quick.full_schema()
    from . import schema
    return schema


def _is_model(obj: Any) -> bool:
    """Whether ``obj`` is a pydantic model class (pydantic is imported only to word an error)."""
    from pydantic import BaseModel
    return isinstance(obj, type) and issubclass(obj, BaseModel)


@record
class _Problem:
    error: InputError
    kind: str
    loc: tuple
    suggestion: str | None = None


def validate(doc: Document, model: type[BaseModel]) -> tuple[Any, list[InputError]]:
    """Validate ``doc.data`` against ``model``; return the model or all errors, located."""
    try:
        # the model's validator, compiled from its kept core schema (schemacache.py)
        return validator(model).validate_python(doc.data), []
    except ValidationError as exc:
        raw = exc.errors(include_url=False)
        if quick.ON:  # the same model, pydantic's: the wording reads its fields and annotations
            model = getattr(_wording_models(), model.__name__)
    except TypeError:
        # The component discriminator in schema.py looks `kind` up in a table, so a list or a
        # mapping written as a component's kind raises instead of failing validation.
        located = _unhashable_kinds(doc)
        if not located:
            raise
        return None, located
    problems = _problems(doc, model, raw)
    # an unknown key that is a typo of a missing required one is one mistake, reported once
    typos = {(p.loc[:-1], p.suggestion) for p in problems if p.kind == "extra_forbidden"}
    problems = [p for p in problems
                if not (p.kind == "missing" and (p.loc[:-1], p.loc[-1]) in typos)]
    seen, unique = set(), []
    for p in problems:
        e = p.error
        if (e.line, e.column, e.message) not in seen:
            seen.add((e.line, e.column, e.message))
            unique.append(e)
    return None, sorted(unique, key=lambda e: (e.line, e.column))


def _unhashable_kinds(doc: Document) -> list[InputError]:
    PART_KINDS = _wording_models().PART_KINDS  # noqa: N806
    data = doc.data if isinstance(doc.data, dict) else {}
    components = data.get("components")
    out = []
    for ref, comp in (components.items() if isinstance(components, dict) else ()):
        kind = comp.get("kind") if isinstance(comp, dict) else None
        if isinstance(kind, (list, dict)):
            out.append(doc.error(("components", ref, "kind"),
                                 f"components.{ref}.kind: expected a part kind, one of: "
                                 f"{', '.join(PART_KINDS)}; got {_describe(kind)}"))
    return out


def _problems(doc: Document, model: type[BaseModel], raw: list[dict]) -> list[_Problem]:
    groups: dict[tuple, list[tuple[dict, tuple, bool]]] = {}
    for err in raw:
        loc, on_key = _clean_loc(doc.data, err["loc"], err["type"])
        groups.setdefault((loc, on_key), []).append((err, loc, on_key))
    out: list[_Problem] = []
    for (loc, on_key), items in groups.items():
        if len(items) > 1:
            combined = _combine(doc, items)
            if combined is not None:
                out.append(combined)
                continue
        out.extend(_locate(doc, model, err, loc, on_key) for err, loc, on_key in items)
    return out


def _clean_loc(data: Any, raw_loc: tuple, kind: str) -> tuple[tuple, bool]:
    """The part of pydantic's location that names keys and items the file has.

    Returns the path and whether the error is about a mapping key itself (pydantic's ``[key]``).
    """
    out: list = []
    node = data
    on_key = False
    for i, part in enumerate(raw_loc):
        if part == "[key]":
            on_key = True
            continue
        if isinstance(node, dict) and isinstance(part, str) and part in node:
            out.append(part)
            node = node[part]
        elif isinstance(node, list) and isinstance(part, int) and 0 <= part < len(node):
            out.append(part)
            node = node[part]
        elif i == len(raw_loc) - 1 and kind == "missing":
            out.append(part)
        # anything else is a union-branch tag, or a key a validator filled in (`typ` of a bare
        # toleranced value): not something the file shows
    return tuple(out), on_key


def _where(loc: tuple) -> str:
    text = ""
    for p in loc:
        text += f"[{p}]" if isinstance(p, int) else (f".{p}" if text else str(p))
    return text


# --- what the schema allows at a location -------------------------------------------------------

def _strip(ann: Any) -> Any:
    while get_origin(ann) is Annotated:
        ann = get_args(ann)[0]
    return ann


def _tag_of(ann: Any) -> str | None:
    if get_origin(ann) is Annotated:
        for meta in get_args(ann)[1:]:
            tag = getattr(meta, "tag", None)
            if isinstance(tag, str):
                return tag
    return None


def _is_union(ann: Any) -> bool:
    return get_origin(ann) in (Union, types.UnionType)


def _child(ann: Any, part: Any) -> Any:
    ann = _strip(ann)
    if _is_union(ann):
        members = get_args(ann)
        for m in members:
            if _tag_of(m) == part:
                return m
        for m in members:
            found = _child(m, part)
            if found is not None:
                return found
        return None
    if _is_model(ann):
        f = ann.model_fields.get(part) if isinstance(part, str) else None
        return f.annotation if f is not None else None
    origin = get_origin(ann)
    if origin is dict and isinstance(part, str):
        return get_args(ann)[1]
    if origin is list and isinstance(part, int):
        return get_args(ann)[0]
    return None


def _model_at(model: type[BaseModel], raw_loc: tuple) -> type[BaseModel] | None:
    """The model that validates the value at pydantic's ``raw_loc``, when that is unambiguous."""
    ann: Any = model
    for part in raw_loc:
        if part == "[key]":
            return None
        found = _child(ann, part)
        if found is not None:  # parts the schema does not know are branch tags: stay
            ann = found
    ann = _strip(ann)
    if _is_union(ann):
        members = [m for m in get_args(ann) if _strip(m) is not type(None)]
        if len(members) != 1:
            return None
        ann = _strip(members[0])
    return ann if _is_model(ann) else None


def _fields(model: type[BaseModel] | None) -> list[str] | None:
    if model is None:
        return None
    names = list(model.model_fields)
    if model is _wording_models().Toleranced:
        names.append("tol")  # given as {typ, tol}; resolved into min and max
    return names


def _key_list(model: type[BaseModel] | None) -> str:
    names = _fields(model)
    if not names:
        return ""
    if len(names) > 11 and model is not None:  # a design's top level and a protector: all
        names = [n for n, f in model.model_fields.items() if f.is_required()] + ["…"]
    return ", ".join(names)


# --- messages -----------------------------------------------------------------------------------

_WANTED = {
    "dict_type": "a mapping", "model_type": "a mapping", "model_attributes_type": "a mapping",
    "mapping_type": "a mapping", "list_type": "a list", "string_type": "text",
    "float_type": "a number", "float_parsing": "a number", "int_type": "a whole number",
    "int_parsing": "a whole number", "bool_type": "true or false", "bool_parsing": "true or false",
}


def _wanted(err: dict) -> str | None:
    kind = err["type"]
    if kind in _WANTED:
        return _WANTED[kind]
    if kind in ("literal_error", "enum"):
        return str(err.get("ctx", {}).get("expected"))
    if kind == "value_error":
        m = re.search(r"expected ([^;,]+?\))", err["msg"])
        return m.group(1) if m else None
    return None


def _combine(doc: Document, items: list[tuple[dict, tuple, bool]]) -> _Problem | None:
    """One message for a value that fits none of a union's branches."""
    wanted = [_wanted(err) for err, _, _ in items]
    if any(w is None for w in wanted):
        return None
    err, loc, on_key = items[0]
    if loc and loc[-1] == "pins" and set(wanted) == {"a mapping", "a list"}:
        expected = "a mapping of pins to nets, e.g. {pos: B+, neg: B-}, or a list of nets, " \
                   "e.g. [B+, P+]"
    else:
        expected = " or ".join(dict.fromkeys(wanted))
    message = f"{_where(loc) or 'the file'}: expected {expected}; got {_describe(err.get('input'))}"
    return _Problem(doc.error(loc, message, key=on_key), "union", loc)


def _locate(doc: Document, model: type[BaseModel], err: dict, loc: tuple,
            on_key: bool) -> _Problem:
    global _VOCAB
    kind = err["type"]
    ctx = err.get("ctx") or {}
    value = err.get("input")
    where = _where(loc) or "the file"
    got = _describe(value)

    if kind == "extra_forbidden":
        key = str(loc[-1]) if loc else "?"
        parent = _where(loc[:-1]) or "the top level"
        parent_model = _model_at(model, err["loc"][:-1])
        allowed = _fields(parent_model)
        if _VOCAB is None:
            _VOCAB = _vocabulary()
        import difflib  # only for a mistake (start-up time)
        candidates = allowed if allowed is not None else _VOCAB
        close = difflib.get_close_matches(key, [c for c in candidates if c != key], n=1,
                                          cutoff=0.75)
        msg = f"unknown key '{key}' in {parent}"
        if close:
            msg += f" (did you mean '{close[0]}'?)"
        elif allowed is not None:
            if parent_model is _wording_models().PartRef and key in _VOCAB:
                msg += ("; a component that names a library 'part' takes its data from the "
                        "library")
            msg += f"; allowed here: {_key_list(parent_model)}"
        return _Problem(doc.error(loc, msg, key=True), kind, loc, close[0] if close else None)

    if kind == "missing":
        parent = _where(loc[:-1]) or "the top level"
        return _Problem(doc.error(loc[:-1], f"missing required key '{loc[-1]}' in {parent}",
                                  key=True), kind, loc)

    if kind == "inconsistent":  # a cross-field check of schema.py names the field it is about
        loc = loc + tuple(ctx["at"])
        return _Problem(doc.error(loc, f"{_where(loc)}: {ctx['message']}"), kind, loc)
    if kind == "unknown_kind":
        return _part_kind(doc, loc, value, ctx, component=False)
    if kind == "component_form":
        return _part_kind(doc, loc, value, ctx, component=True)

    msg = err["msg"]
    for prefix in ("Value error, ", "Assertion failed, "):
        if msg.startswith(prefix):
            msg = msg[len(prefix):]
    if _nonfinite(value) and kind in ("float_parsing", "float_type", "less_than",
                                      "less_than_equal", "greater_than", "greater_than_equal"):
        msg = f"{got} is not a finite number"
    elif kind == "literal_error" and loc and loc[-1] == "format":
        msg = f"unknown format {value!r}; expected {ctx['expected']}"
    elif kind in ("literal_error", "enum"):
        options = re.findall(r"'([^']*)'", str(ctx.get("expected", "")))
        msg = f"expected {ctx.get('expected')}; got {got}"
        close = _closest(value, options)
        if close:
            msg += f" (did you mean '{close}'?)"
    elif kind in ("dict_type", "model_type", "model_attributes_type", "mapping_type"):
        keys = _key_list(_model_at(model, err["loc"]))
        msg = f"expected a mapping{f' with keys {keys}' if keys else ''}; got {got}"
    elif kind == "list_type":
        msg = f"expected a list; got {got}"
        if isinstance(value, str):
            msg += f" (a list of one is written [{value}])"
    elif kind == "string_type":
        msg = f"expected text; got {got}"
        if isinstance(value, (int, float)) and not isinstance(value, bool):
            msg += f" (quote it, '{value}', if it is text)"
    elif kind in _WANTED:
        msg = f"expected {_WANTED[kind]}; got {got}"
    elif kind in _BOUNDS:
        word, key = _BOUNDS[kind]
        msg = f"must be {word} {ctx.get(key)}; got {got}"
    elif kind == "string_too_short":
        n = ctx.get("min_length", 1)
        msg = "must not be empty" if n == 1 else f"must be at least {n} characters; got {got}"
    elif kind == "string_too_long":
        msg = f"must be at most {ctx.get('max_length')} characters; got {len(str(value))}"
    elif kind in ("too_short", "too_long"):
        word = "at least" if kind == "too_short" else "at most"
        limit = ctx.get("min_length" if kind == "too_short" else "max_length")
        msg = f"must have {word} {limit} entries; got {ctx.get('actual_length')}"
    elif kind == "string_pattern_mismatch":
        pattern = str(ctx.get("pattern", ""))
        if pattern == r"^\d{4}-\d{2}-\d{2}$":
            msg = f"expected a date written YYYY-MM-DD; got {got}"
        elif on_key and loc[:1] == ("components",):
            where = "components"
            msg = (f"{got} is not a reference designator: it starts with a letter, then up to 39 "
                   f"letters, digits, '_', '.' or '-'")
        else:
            msg = f"{got} does not have the expected form {pattern}"
    elif on_key:
        where = _where(loc[:-1]) or "the top level"
        msg = f"key {got}: {msg}"
    return _Problem(doc.error(loc, f"{where}: {msg}", key=on_key), kind, loc)


_BOUNDS = {"greater_than": ("above", "gt"), "greater_than_equal": ("at least", "ge"),
           "less_than": ("below", "lt"), "less_than_equal": ("at most", "le")}


def _part_kind(doc: Document, loc: tuple, value: Any, ctx: dict, component: bool) -> _Problem:
    PART_KINDS = _wording_models().PART_KINDS  # noqa: N806
    kinds = list(PART_KINDS)
    where = _where(loc) or "the file"
    what = "a component" if component else "a part"
    if not isinstance(value, dict):
        need = "'part' (a library part) or 'kind' (a part given inline)" if component else "'kind'"
        msg = f"{where}: expected a mapping with {need}; got {_describe(value)}"
        return _Problem(doc.error(loc, msg), "kind", loc)
    if "kind" in value and not isinstance(value["kind"], str):
        msg = (f"{where}.kind: expected a part kind, one of: {', '.join(kinds)}; "
               f"got {_describe(value['kind'])}")
        return _Problem(doc.error(loc + ("kind",), msg), "kind", loc)
    if "kind" in value:
        close = _closest(value["kind"], kinds)
        msg = f"{where}.kind: unknown part kind {_describe(value['kind'])}"
        if close:
            msg += f" (did you mean '{close}'?)"
        msg += f"; known kinds: {', '.join(kinds)}"
        return _Problem(doc.error(loc + ("kind",), msg), "kind", loc)
    if component:
        msg = (f"{where}: {what} needs 'part' (the name of a library part) or 'kind' (a part "
               f"given inline, one of: {', '.join(kinds)})")
    else:
        msg = f"{where}: {what} needs a 'kind', one of: {', '.join(kinds)}"
    return _Problem(doc.error(loc, msg, key=True), "kind", loc)


def _closest(value: Any, options: list[str]) -> str | None:
    if not isinstance(value, str) or not options:
        return None
    for o in options:
        if value.strip().lower() == o.lower():
            return o
    starts = [o for o in options if o.startswith(value) and len(value) >= 3]
    if len(starts) == 1:  # `fet_pair` for `fet_pair_common_drain`
        return starts[0]
    import difflib
    close = difflib.get_close_matches(value, options, n=1, cutoff=0.6)
    return close[0] if close else None


def _nonfinite(value: Any) -> bool:
    if isinstance(value, float):
        return not math.isfinite(value)
    return isinstance(value, str) and re.fullmatch(r"(?i)\s*[+-]?(nan|inf|infinity)\s*",
                                                   value) is not None


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
        text = repr(value)
        return f"the number {text[:20]}…" if len(text) > 24 else f"the number {text}"
    text = str(value)
    return f"'{text[:40]}…'" if len(text) > 40 else f"'{text}'"
