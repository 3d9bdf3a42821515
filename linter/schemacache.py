"""The design's and the part library's validators, compiled from a core schema kept per installed
version rather than worked out from the models at every start.

pydantic makes a model's validator in two steps. It works out a *core schema* from the model's
annotations, in Python (the design's and the part library's together: about 45 ms, a sixth of a
cold ``packwarden check``), and pydantic-core compiles that schema, in Rust (about 2 ms). The
first step gives the same schema for as long as packwarden's modules, pydantic, pydantic-core and
Python stay the same, so it is done once and its result kept in a per-user cache file beside the
entry points' (``entrycache.cache_dir``; ``PACKWARDEN_CACHE_DIR=""`` turns both off). A check
hands the kept schema to pydantic-core itself: the validator pydantic would build, with the same
model classes, the same functions called and the same errors, without pydantic's Python layer.

The core schema names Python objects: the model classes and enums it builds, and the functions it
calls (the quantity parsers, the models' own checks, the discriminators, pydantic's length
checks). The file keeps each as a *recipe*: the path from a module to the object (attributes,
items, the arguments of an annotation), found once by walking ``schema.py``; loading follows each
path to the very object of this process. Left out are the parts of the schema that only pydantic's
JSON Schema and serializer read (``metadata``, ``serialization``); pydantic-core's validator does
not read them.

The file is used only when all of it matches: its layout, Python, pydantic and pydantic-core, the
times and sizes of the modules of packwarden's own folder (``schema.py`` and what it is made
from), and pydantic's plugins off (``plugins_off``: with a plugin on, pydantic wraps the
validator, so the model's own is used). Otherwise, or when a recipe no longer leads to an object,
the model's own validator is used and the file written again; a file that cannot be written is
skipped silently. ``tests/test_schemacache.py`` holds the kept schema equal to the one pydantic
builds, and the two validators alike on the examples and on bad input.
"""

from __future__ import annotations

import functools
import hashlib
import os
import sys
from enum import Enum
from pathlib import Path
from typing import Any, Optional, get_args

from . import quick
from .entrycache import cache_dir, write_cache_file
from .plugins_off import plugins_off

#: The models of ``schema.py`` whose validators are kept: those a check validates files against.
KEPT = ("Design", "PartLibrary")
#: The cache file's first line: its layout. A pickle follows (the fingerprint and the recipes,
#: plain data), then a second one (the schemas, each object in them a recipe's number).
LAYOUT = b"packwarden core schemas 2\n"
#: Keys of a core schema that only the JSON Schema and the serializer read.
SKIPPED = frozenset({"metadata", "serialization"})
SCHEMA_MODULE = "packwarden.schema"

_PLAIN = (str, int, float, bool, type(None))
_validators: dict[str, Any] = {}
#: The schemas read from the file this run (None: not read yet; empty: none kept).
_kept: Optional[dict[str, tuple[dict, dict]]] = None


def validator(model: type) -> Any:
    """The validator of ``model``: for a model named in :data:`KEPT`, compiled from the kept core
    schema when there is one; otherwise the model's own, which pydantic builds."""
    name = model.__name__
    if model.__module__ != SCHEMA_MODULE or name not in KEPT or not plugins_off():
        return model.__pydantic_validator__
    found = _validators.get(name)
    if found is None:
        found = _validators[name] = _compiled(model)
    return found


def _compiled(model: type) -> Any:
    global _kept
    if _kept is None:
        path = cache_file()
        _kept = read(path) or {}
        if not _kept and quick.ON:
            quick.fall_back("the kept core schemas could not be read")
        if not _kept and path is not None:
            # pydantic builds every kept model's validator: this run pays, the next read the file
            write(path, model_schemas())
    found = _kept.get(model.__name__)
    if found is None:
        return model.__pydantic_validator__
    from pydantic_core import SchemaValidator
    schema, config = found
    return SchemaValidator(schema, config)


def model_schemas() -> dict[str, tuple[dict, dict]]:
    """Each kept model's core schema and core config as pydantic hands them to pydantic-core,
    without the keys only the JSON Schema and the serializer read."""
    from . import schema
    out = {}
    for name in KEPT:
        model = getattr(schema, name)
        model.model_rebuild()
        core, config = model.__pydantic_validator__.__reduce__()[1][:2]
        out[name] = (_without(core, SKIPPED), dict(config or {}))
    return out


def _without(node: Any, keys: frozenset) -> Any:
    if isinstance(node, dict):
        return {k: _without(v, keys) for k, v in node.items() if k not in keys}
    if isinstance(node, list):
        return [_without(v, keys) for v in node]
    return node


# --- where the file is, and what it must match ------------------------------------------------

def cache_file() -> Optional[Path]:
    folder = cache_dir()
    if folder is None:
        return None
    # one file per installed copy of packwarden (its folder); what else it depends on is checked
    # by the fingerprint inside
    here = os.path.dirname(os.path.abspath(__file__))
    key = hashlib.sha256(here.encode()).hexdigest()[:16]
    return folder / f"core-schemas-{key}.pickle"


def fingerprint() -> list:
    """Everything the kept schemas are made from (see the module's docstring)."""
    import pydantic
    import pydantic_core
    here = os.path.dirname(os.path.abspath(__file__))
    modules = []
    with os.scandir(here) as found:
        for entry in found:
            if entry.name.endswith(".py"):
                stat = entry.stat()
                modules.append((entry.name, stat.st_mtime_ns, stat.st_size))
    return [sys.version, pydantic.VERSION, pydantic_core.__version__, here, sorted(modules)]


# --- reading and writing ----------------------------------------------------------------------

#: The kept file :func:`current` found: its path, and its head and stream as :func:`_open` gives.
_opened: Optional[tuple[Path, tuple[dict, Any]]] = None


def _plain_data(stream: Any) -> Any:
    """An unpickler of plain data and recipes' numbers only: no class or function of any module
    is looked up by the unpickler itself."""
    import pickle

    class PlainData(pickle.Unpickler):
        def find_class(self, module: str, name: str) -> Any:
            raise pickle.UnpicklingError(f"{module}.{name} in a file of plain data")

    return PlainData(stream)


def _open(path: Path) -> Optional[tuple[dict, Any]]:
    """The head of the kept file at ``path`` (plain data: the fingerprint and the recipes) and the
    file's stream at its body, when the file is of this layout and fingerprint; else None. A file
    :func:`current` found is not read again by :func:`read`."""
    global _opened
    if _opened is not None and _opened[0] == path:
        found, _opened = _opened[1], None
        return found
    import io
    try:
        blob = path.read_bytes()
    except OSError:
        return None
    if not blob.startswith(LAYOUT):
        return None
    stream = io.BytesIO(blob)
    stream.seek(len(LAYOUT))
    try:
        head = _plain_data(stream).load()
    except Exception:  # noqa: BLE001 - a damaged file is only a missed cache
        return None
    if not isinstance(head, dict) or head.get("fingerprint") != fingerprint():
        return None
    return head, stream


def current() -> bool:
    """Whether the kept file is there, of this layout and of this fingerprint (its recipes are
    followed later, by :func:`read`, which takes the file as read here)."""
    global _opened
    path = cache_file()
    found = _open(path) if path is not None else None
    if found is not None:
        _opened = (path, found)
    return found is not None


def go_quick() -> bool:
    """Turn the quick way on (``quick.py``) when the kept schemas are current; whether it is."""
    # the models are made once per process: by pydantic already, or by nothing yet; with
    # pydantic's plugins on, pydantic wraps every validator, so its own models are used
    made = ("pydantic.main", "packwarden.schema", "packwarden.api")
    quick.ON = not any(name in sys.modules for name in made) and plugins_off() and current()
    return quick.ON


def read(path: Optional[Path]) -> Optional[dict[str, tuple[dict, dict]]]:
    """The kept schemas of a file of this layout and fingerprint whose every recipe leads to an
    object, else None."""
    if path is None:
        return None
    found = _open(path)
    if found is None:
        return None
    head, stream = found
    try:
        objects = [follow(r) for r in head["recipes"]]
        body = _plain_data(stream)
        body.persistent_load = objects.__getitem__
        kept = body.load()
    except Exception:  # noqa: BLE001 - a damaged or foreign file is only a missed cache
        return None
    if not isinstance(kept, dict) or set(kept) != set(KEPT):
        return None
    return kept


def write(path: Optional[Path], kept: dict[str, tuple[dict, dict]]) -> None:
    """Keep the schemas in ``path``; nothing when an object in them has no recipe or the file
    cannot be written."""
    if path is None:
        return
    import io
    import pickle
    recipes: list = []
    numbers: dict[int, int] = {}
    finder = _Finder()

    class Keeper(pickle.Pickler):
        def persistent_id(self, obj: Any) -> Optional[int]:
            if isinstance(obj, (dict, list, tuple) + _PLAIN):
                return None
            if id(obj) not in numbers:
                numbers[id(obj)] = len(recipes)
                recipes.append(finder.recipe(obj))
            return numbers[id(obj)]

    body = io.BytesIO()
    try:
        Keeper(body, protocol=pickle.HIGHEST_PROTOCOL).dump(kept)
    except Exception:  # noqa: BLE001 - an object without a recipe: this run keeps nothing
        return
    head = pickle.dumps({"fingerprint": fingerprint(), "recipes": recipes},
                        protocol=pickle.HIGHEST_PROTOCOL)
    write_cache_file(path, LAYOUT + head + body.getvalue())


# --- recipes: how to find an object of the schema again ---------------------------------------

class _NoRecipe(Exception):
    pass


#: The modules a recipe may start from, and the one name of the form ``__x__`` it may pass:
#: a recipe leads only to packwarden's and pydantic's own objects.
HOMES = ("packwarden", "pydantic")
OPEN_DUNDER = "__annotations__"
#: Built-in types a recipe may name (a field's default factory).
BUILTINS = {t.__name__: t for t in (list, dict, set, frozenset, tuple)}


def follow(recipe: tuple) -> Any:
    """The object a recipe leads to: ``("path", module, steps)``, each step an attribute
    (``"a"``), an item (``"i"``) or an argument of a typing construct (``"g"``);
    ``("partial", recipe, args, keywords)``; or ``("builtin", name)`` of :data:`BUILTINS`."""
    if recipe[0] == "builtin":
        return BUILTINS[recipe[1]]
    if recipe[0] == "partial":
        _, func, args, keywords = recipe
        return functools.partial(follow(func), *args, **keywords)
    _, module, steps = recipe
    if module.split(".")[0] not in HOMES or any(
            how == "a" and key.startswith("__") and key != OPEN_DUNDER for how, key in steps):
        raise LookupError(f"a recipe out of packwarden's and pydantic's objects: {recipe!r}")
    obj: Any = sys.modules.get(module)
    if obj is None:
        from importlib import import_module
        obj = import_module(module)
    for how, key in steps:
        if how == "a":
            obj = getattr(obj, key)
        elif how == "i":
            obj = obj[key]
        else:
            obj = get_args(obj)[key]
    return obj


class _Finder:
    """Recipes for the objects of a core schema: by module and qualified name where that leads to
    the object, else by the shortest path from ``schema.py``'s names through the models' fields
    and annotations (a quantity's parser, a lambda); each checked by following it."""

    def __init__(self) -> None:
        self._paths: Optional[dict[int, tuple]] = None

    def recipe(self, obj: Any) -> tuple:
        if isinstance(obj, functools.partial):
            if not all(isinstance(v, _PLAIN) for v in (*obj.args, *obj.keywords.values())):
                raise _NoRecipe(repr(obj))
            return ("partial", self.recipe(obj.func), obj.args, dict(obj.keywords))
        if isinstance(obj, type) and BUILTINS.get(obj.__name__) is obj:
            return ("builtin", obj.__name__)
        if isinstance(obj, Enum):
            _, module, steps = self.recipe(type(obj))
            return self._checked(("path", module, steps + (("a", obj.name),)), obj)
        module, qualname = getattr(obj, "__module__", None), getattr(obj, "__qualname__", None)
        if isinstance(module, str) and isinstance(qualname, str) and "<" not in qualname:
            named = ("path", module, tuple(("a", part) for part in qualname.split(".")))
            try:
                if follow(named) is obj:
                    return named
            except (ImportError, AttributeError, LookupError):
                pass
        steps = self._search().get(id(obj))
        if steps is None:
            raise _NoRecipe(repr(obj))
        return self._checked(("path", SCHEMA_MODULE, steps), obj)

    @staticmethod
    def _checked(recipe: tuple, obj: Any) -> tuple:
        try:
            if follow(recipe) is obj:
                return recipe
        except Exception:  # noqa: BLE001 - any failure is a path that does not lead there
            pass
        raise _NoRecipe(repr(obj))

    def _search(self) -> dict[int, tuple]:
        """Breadth first from the schema module's names: the shortest path to each object."""
        if self._paths is not None:
            return self._paths
        root = sys.modules[SCHEMA_MODULE]
        paths: dict[int, tuple] = {}
        held = []  # keeps every object visited alive, so that no id is reused meanwhile
        queue = [(root, ())]
        for obj, steps in queue:
            if id(obj) in paths:
                continue
            paths[id(obj)] = steps
            held.append(obj)
            if len(steps) < 10:
                queue.extend((child, steps + (step,)) for step, child in _children(obj, root))
        self._paths = paths
        return paths


def _children(obj: Any, root: Any) -> list[tuple[tuple, Any]]:
    """The steps out of ``obj`` the search takes: the root module's names; a dict's items and a
    list's or tuple's; the arguments of a typing construct; the fields and own names of a class
    of the schema module; the attributes of pydantic's and packwarden's own objects. Never into
    another module or a model's built (or stand-in) schema, validator and serializer."""
    if obj is root:
        return [(("a", k), v) for k, v in vars(obj).items() if not k.startswith("__")]
    if isinstance(obj, dict):
        return [(("i", k), v) for k, v in obj.items() if isinstance(k, (str, int))]
    if isinstance(obj, (list, tuple)):
        return [(("i", i), v) for i, v in enumerate(obj)]
    if isinstance(obj, type):
        if obj.__module__ != SCHEMA_MODULE:
            return []
        own = [(("a", k), v) for k, v in vars(obj).items() if not k.startswith("__")]
        # the class body's own annotations, not pydantic's fields: a recipe must lead to the
        # same object whether the class is pydantic's or the quick way's (quick.py)
        annotations = vars(obj).get("__annotations__")
        return own + ([(("a", OPEN_DUNDER), annotations)] if annotations else [])
    args = get_args(obj)
    if args:
        return [(("g", i), v) for i, v in enumerate(args)]
    if callable(obj) and not hasattr(obj, "__get_pydantic_core_schema__"):
        return []
    home = type(obj).__module__
    if not (home.startswith(("packwarden.", "pydantic.")) or home == "annotated_types"):
        return []
    names = list(getattr(obj, "__dict__", {}))
    for klass in type(obj).__mro__:
        names.extend(s for s in getattr(klass, "__slots__", ()) if isinstance(s, str))
    out = []
    for name in dict.fromkeys(names):
        if name.startswith("__"):
            continue
        try:
            out.append((("a", name), getattr(obj, name)))
        except AttributeError:
            pass
    return out
