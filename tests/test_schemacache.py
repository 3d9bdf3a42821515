"""The design's and the part library's validators compiled from a kept core schema
(``packwarden.schemacache``).

The reference is pydantic itself: the core schema its schema builder makes from ``schema.py``
now, and the validator it compiles from that (``Model.__pydantic_validator__``). A kept schema,
written by one process and read by another, must equal pydantic's (without the keys only the JSON
Schema and the serializer read), and the validator compiled from it must give the same model
objects and the same errors on every example, every library and every hostile input of
``tests/hostile/``; so the kept schema cannot drift from the models.
"""

from __future__ import annotations

import functools
import os
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest
from pydantic import ValidationError
from pydantic_core import SchemaValidator

from packwarden import schema, schemacache
from packwarden.loader import InputError, load_file

REPO = Path(__file__).resolve().parents[1]


def _loaded() -> list[Path]:
    """The examples, their libraries and the hostile inputs that load as YAML (the others never
    reach validation)."""
    out = []
    for path in sorted([*REPO.glob("example_designs/*.yaml"),
                        *REPO.glob("example_designs/flawed/*.yaml"),
                        *REPO.glob("example_designs/parts/*.yaml"),
                        *REPO.glob("tests/hostile/*.yaml"), *REPO.glob("tests/hostile/parts/*.yaml")]):
        try:
            load_file(path, str(path))
        except InputError:
            continue
        out.append(path)
    return out


FILES = _loaded()


def comparable(node, refs=None):
    """A core schema with what differs between two equal builds made alike: the numbers in
    ``ref`` names (pydantic appends the class's ``id``), and each ``functools.partial`` (made
    anew by every build) as its function and arguments."""
    refs = {} if refs is None else refs
    if isinstance(node, dict):
        out = {}
        for k, v in node.items():
            if k in ("ref", "schema_ref") and isinstance(v, str):
                v = refs.setdefault(v, f"ref{len(refs)}")
            out[k] = comparable(v, refs)
        return out
    if isinstance(node, list):
        return [comparable(v, refs) for v in node]
    if isinstance(node, functools.partial):
        return ("partial", node.func, node.args, node.keywords)
    return node


@pytest.fixture
def cache(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    folder = tmp_path / "cache"
    monkeypatch.setenv("PACKWARDEN_CACHE_DIR", str(folder))
    return folder


def test_the_kept_schema_is_pydantics(cache: Path) -> None:
    built = schemacache.model_schemas()
    path = schemacache.cache_file()
    schemacache.write(path, built)
    assert path is not None and path.is_file()
    kept = schemacache.read(path)
    assert kept is not None and set(kept) == set(schemacache.KEPT)
    for name in schemacache.KEPT:
        model = getattr(schema, name)
        own, config = model.__pydantic_validator__.__reduce__()[1][:2]
        assert kept[name][1] == config
        # every object of the schema is the very object pydantic's schema names
        assert comparable(kept[name][0]) == comparable(schemacache._without(own, schemacache.SKIPPED))


def test_a_schema_kept_by_one_process_is_read_alike_by_the_next(cache: Path) -> None:
    # The first process writes the file; the second reads it and compares with the schema its
    # own pydantic builds: the recipes lead to that process's objects.
    code = textwrap.dedent("""
        import functools, sys
        sys.path.insert(0, %r)
        from test_schemacache import comparable
        from packwarden import schemacache
        kept = schemacache.read(schemacache.cache_file())
        built = schemacache.model_schemas()
        print("read" if kept is not None else "missing",
              all(comparable(kept[n][0]) == comparable(built[n][0]) and kept[n][1] == built[n][1]
                  for n in schemacache.KEPT) if kept else False)
    """) % str(Path(__file__).parent)
    env = {**os.environ, "PACKWARDEN_CACHE_DIR": str(cache)}
    first = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, env=env)
    assert first.stdout.split() == ["missing", "False"], first.stderr[-2000:]
    lint = subprocess.run([sys.executable, "-m", "packwarden.launch", "check",
                           "example_designs/orchard-probe.yaml"], capture_output=True, text=True,
                          cwd=REPO, env=env)
    assert lint.returncode == 0, lint.stderr[-2000:]
    assert list(cache.glob("core-schemas-*.pickle"))
    second = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, env=env)
    assert second.stdout.split() == ["read", "True"], second.stderr[-2000:]


def outcome(validator, data) -> tuple:
    """What a validation gives: the model (compared by value and by its repr, which shows every
    nested model's class) or pydantic's errors (with the exceptions in them as their text)."""
    try:
        result = validator.validate_python(data)
    except ValidationError as exc:
        return "errors", [{k: (repr(v) if k == "ctx" else v) for k, v in e.items()}
                          for e in exc.errors(include_url=False)]
    except TypeError as exc:  # a list or a mapping as a component's kind (validate.py)
        return "TypeError", str(exc)
    return "model", result, repr(result)


@pytest.mark.parametrize("path", FILES, ids=lambda p: str(p.relative_to(REPO)))
def test_the_kept_validator_validates_as_pydantics(path: Path) -> None:
    data = load_file(path, str(path)).data
    model = schema.PartLibrary if isinstance(data, dict) and str(data.get("format", "")).startswith(
        "packwarden-parts") else schema.Design
    kept = _kept_in_memory()[model.__name__]
    own = outcome(model.__pydantic_validator__, data)
    assert outcome(SchemaValidator(*kept), data) == own


@functools.cache
def _kept_in_memory() -> dict:
    """The schemas as a file keeps them: written and read back (in a folder of its own)."""
    import tempfile
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "core-schemas.pickle"
        schemacache.write(path, schemacache.model_schemas())
        kept = schemacache.read(path)
    assert kept is not None
    return kept


def test_a_stale_damaged_or_missing_file_is_not_used(cache: Path,
                                                     monkeypatch: pytest.MonkeyPatch) -> None:
    path = schemacache.cache_file()
    schemacache.write(path, schemacache.model_schemas())
    assert schemacache.read(path) is not None
    blob = path.read_bytes()
    # another Python, pydantic or packwarden module: the fingerprint differs
    monkeypatch.setattr(schemacache, "fingerprint", lambda: ["another environment"])
    assert schemacache.read(path) is None
    monkeypatch.undo()
    monkeypatch.setenv("PACKWARDEN_CACHE_DIR", str(cache))
    for damaged in (blob[: len(blob) // 2], b"", b"something else\n" + blob[30:],
                    blob.replace(b"packwarden.schema", b"packwarden.scheme")):
        path.write_bytes(damaged)
        assert schemacache.read(path) is None
    path.unlink()
    assert schemacache.read(path) is None


class _Calls:
    def __reduce__(self):
        return (print, ("called",))


def test_a_file_that_would_run_code_or_reach_out_of_packwarden_is_refused(
        cache: Path, capsys: pytest.CaptureFixture) -> None:
    import pickle
    path = schemacache.cache_file()
    path.parent.mkdir(parents=True)
    head = {"fingerprint": schemacache.fingerprint(), "recipes": []}
    # a pickle that names a function to call: the reader looks up no global at all
    path.write_bytes(schemacache.LAYOUT + pickle.dumps(head) + pickle.dumps(_Calls()))
    assert schemacache.read(path) is None
    assert "called" not in capsys.readouterr().out
    # a recipe out of packwarden's and pydantic's objects, or through a dunder name
    for recipe in (("path", "os", (("a", "system"),)),
                   ("path", "packwarden.schema", (("a", "__builtins__"),))):
        head["recipes"] = [recipe]
        path.write_bytes(schemacache.LAYOUT + pickle.dumps(head) + pickle.dumps({}))
        assert schemacache.read(path) is None


def test_a_module_of_the_package_changed_is_another_fingerprint(tmp_path: Path,
                                                                monkeypatch: pytest.MonkeyPatch
                                                                ) -> None:
    # the fingerprint reads the folder of schemacache.py: a copy of it stands in for the package
    here = Path(schemacache.__file__).parent
    copy = tmp_path / "packwarden"
    copy.mkdir()
    for f in here.glob("*.py"):
        (copy / f.name).write_bytes(f.read_bytes())
    monkeypatch.setattr(schemacache, "__file__", str(copy / "schemacache.py"))
    before = schemacache.fingerprint()
    assert schemacache.fingerprint() == before
    (copy / "schema.py").write_text((copy / "schema.py").read_text(encoding="utf-8") + "\n# x\n",
                                    encoding="utf-8")
    assert schemacache.fingerprint() != before


def test_no_cache_folder_or_pydantic_plugins_on_use_the_models_own(
        monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(schemacache, "_validators", {})
    monkeypatch.setattr(schemacache, "_kept", None)
    monkeypatch.setenv("PACKWARDEN_CACHE_DIR", "")
    assert schemacache.cache_file() is None
    assert schemacache.validator(schema.Design) is schema.Design.__pydantic_validator__
    monkeypatch.setattr(schemacache, "_validators", {})
    monkeypatch.setattr(schemacache, "_kept", None)
    monkeypatch.setenv("PYDANTIC_DISABLE_PLUGINS", "")  # a user's plugins on: pydantic wraps
    assert schemacache.validator(schema.PartLibrary) is schema.PartLibrary.__pydantic_validator__
    assert schemacache.validator(schema.Stack) is schema.Stack.__pydantic_validator__


def test_an_unwritable_cache_is_skipped(tmp_path: Path) -> None:
    blocked = tmp_path / "a-file"
    blocked.write_text("", encoding="utf-8")
    schemacache.write(blocked / "core-schemas.pickle", schemacache.model_schemas())  # no error
    assert blocked.is_file()


def test_a_check_with_a_kept_schema_builds_neither_schema(cache: Path) -> None:
    # pydantic completes a model (works out its core schema) in _model_construction's
    # complete_model_class: counted in a process that lints the example twice over, the second
    # time with the file the first wrote
    code = textwrap.dedent("""
        from pydantic._internal import _model_construction as construction
        built = []
        complete = construction.complete_model_class
        def counted(cls, *args, **kwargs):
            built.append(cls.__name__)
            return complete(cls, *args, **kwargs)
        construction.complete_model_class = counted
        from packwarden.engine import lint
        run = lint(["example_designs/orchard-probe.yaml"])
        assert not run.errors, run.errors
        print(" ".join(sorted({"Design", "PartLibrary"} & set(built))) or "none")
    """)
    env = {**os.environ, "PACKWARDEN_CACHE_DIR": str(cache), "PYDANTIC_DISABLE_PLUGINS": "__all__"}
    runs = [subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                           cwd=REPO, env=env) for _ in range(2)]
    assert [r.stdout.strip() for r in runs] == ["Design PartLibrary", "none"], \
        [r.stderr[-2000:] for r in runs]

