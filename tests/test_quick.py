"""The quick way through a plain check (``quick.py``) against the full way, pydantic's models.

The reference is the full way itself, run as its own process with ``PACKWARDEN_QUICK=0``: the
same command must print the same report, byte for byte, on stdout and stderr, with the same exit
code. Which way a run went is read from the interpreter's own record of its imports
(``python -X importtime``): a run that makes pydantic's model classes imports pydantic's
``_model_construction`` module; the quick way never does. The stand-ins' behaviour (equality,
hashing, ``repr``, ``model_construct``, ``model_copy``) is compared with pydantic's own
``BaseModel`` on the same class bodies, and, on the objects of every example design, by their
``repr`` and hash in a process of each way.
"""

# No ``from __future__ import annotations``: the model bodies below are pydantic's and the
# quick way's alike, whose annotations are evaluated as the class is made, as in schema.py.
import json
import os
import subprocess
import sys
from pathlib import Path
from typing import Annotated, Any, ClassVar, Optional

import pytest

REPO = Path(__file__).resolve().parent.parent
SCRIPT = Path(sys.executable).with_name("packwarden")
EXAMPLES = sorted(str(p.relative_to(REPO)) for p in (REPO / "example_designs").glob("*.yaml"))
FLAWED = sorted(str(p.relative_to(REPO))
                for p in (REPO / "example_designs" / "flawed").glob("*.yaml"))
HOSTILE = sorted(str(p.relative_to(REPO)) for p in (REPO / "tests" / "hostile").glob("*.yaml"))
EXAMPLES_BY_NAME = {Path(p).stem: p for p in EXAMPLES}
#: pydantic's module that makes model classes: imported by the full way, never by the quick way
MAKES_MODELS = "pydantic._internal._model_construction"


def run(args: list[str], cache: Path, quick: bool = True, cwd: Path = REPO,
        extra_env: Optional[dict] = None) -> tuple[str, str, int, bool, bool]:
    """(stdout, stderr without the import record, exit code, whether pydantic's models were
    made, whether the command ran again the full way) of ``packwarden ARGS``."""
    env = {**os.environ, "PACKWARDEN_CACHE_DIR": str(cache), "NO_COLOR": "1"}
    env.pop("PYDANTIC_DISABLE_PLUGINS", None)
    env.pop("PACKWARDEN_QUICK", None)
    if not quick:
        env["PACKWARDEN_QUICK"] = "0"
    env.update(extra_env or {})
    p = subprocess.run([sys.executable, "-X", "importtime", str(SCRIPT), *args],
                       capture_output=True, text=True, cwd=cwd, env=env)
    lines = p.stderr.splitlines()
    imported = [ln.split("|")[-1].strip() for ln in lines if ln.startswith("import time:")]
    err = "\n".join(ln for ln in lines if not ln.startswith("import time:"))
    # a second process's record follows the first's when the command ran again
    again = imported.count("packwarden.launch") > 1
    return p.stdout, err, p.returncode, MAKES_MODELS in imported, again


@pytest.fixture(scope="module")
def cache(tmp_path_factory: pytest.TempPathFactory) -> Path:
    """A cache folder with the kept core schemas written (by a first, full, run)."""
    folder = tmp_path_factory.mktemp("cache")
    out, err, code, made, _ = run(["check", EXAMPLES[0]], folder)
    assert code == 0, err
    assert made  # nothing kept yet: the full way, which keeps the schemas
    return folder


def same(args: list[str], cache: Path, **kw: Any) -> tuple[bool, bool]:
    """Run ``args`` both ways; assert the same output; (whether the quick run made pydantic's
    models, whether it ran again the full way)."""
    quick = run(args, cache, **kw)
    full = run(args, cache, quick=False, **kw)
    assert full[3], "PACKWARDEN_QUICK=0 still went the quick way"
    assert quick[:3] == full[:3], (args, quick[1][-1500:], full[1][-1500:])
    return quick[3], quick[4]


@pytest.mark.parametrize("design", EXAMPLES + FLAWED)
def test_every_example_reads_the_same_the_quick_way(cache: Path, design: str) -> None:
    for fmt in ("text", "json"):
        made, again = same(["check", "--format", fmt, design], cache)
        assert not again, design
        # a hint's search may try a value the schema refuses: that error is worded (and
        # discarded) by pydantic's models; an example without findings makes none
        assert not made or design in FLAWED, design


@pytest.mark.parametrize("fmt", ["sarif", "junit", "markdown"])
def test_the_other_formats_read_the_same(cache: Path, fmt: str) -> None:
    for design in EXAMPLES[:2] + FLAWED[:4]:
        assert not same(["check", "--format", fmt, design], cache)[1]


def test_a_few_files_at_once_read_the_same(cache: Path) -> None:
    assert not same(["check", *FLAWED[:3], EXAMPLES[0]], cache)[1]
    # as the pre-commit hook passes them: a part library among the designs is skipped
    hook = ["check", "--designs-only", *EXAMPLES, "example_designs/parts/orchard-parts.yaml"]
    assert not same(hook, cache)[1]


@pytest.mark.parametrize("design", HOSTILE[::6])
def test_bad_input_reads_the_same(cache: Path, design: str) -> None:
    made, again = same(["check", design], cache)
    assert not again


def test_a_validation_error_is_worded_by_pydantics_models_without_running_again(
        cache: Path) -> None:
    # the wording reads pydantic's models (quick.full_schema); nothing is validated twice
    assert same(["check", "tests/hostile/unknown-key-typo.yaml"], cache) == (True, False)
    assert same(["check", "tests/hostile/lib-key-typo.yaml"], cache) == (True, False)


@pytest.mark.parametrize("options", [
    "[rules.conductor-capacity]\nsense_share = 0.1\n",
    "[rules.conductor-capacity]\nsense_share = 3\n",          # out of its range
    "[rules.conductor-capacity]\nsense_shar = 0.1\n",         # a typo
    '[rules.conductor-capacity]\ndelta_t = "20 K"\n',          # a quantity
    '[rules.conductor-capacity]\ndelta_t = "20 V"\n',          # in the wrong unit
    '[rules.secondary-protection]\nderating = "x"\n',
    '[rules.threshold-ladder]\ncharge_margin = "40 mV"\n',
    "[rules.switch-on-inrush]\n" + "x = 1\n",
])
def test_a_projects_rule_options_are_validated_by_pydantic_alike(
        cache: Path, tmp_path: Path, options: str) -> None:
    config = tmp_path / "packwarden.toml"
    config.write_text(options, encoding="utf-8")
    # the options' model, made by pydantic from the same fields (quick.pydantic_model)
    assert same(["check", "--config", str(config), EXAMPLES[0]], cache) == (True, False)


def test_a_project_that_sets_no_options_stays_quick(cache: Path, tmp_path: Path) -> None:
    config = tmp_path / "packwarden.toml"
    config.write_text("# marks the root\n", encoding="utf-8")
    assert same(["check", "--config", str(config), EXAMPLES[0]], cache) == (False, False)


TEAM_RULE = """
from packwarden import Field, RuleOptions, rule


class Options(RuleOptions):
    max_components: int = Field(3, ge=1)


@rule(id="component-budget", summary="the design stays within a component budget",
      severity="warning", options=Options)
def check(ctx, options):
    \"\"\"A team rule with an option.\"\"\"
    n = len(ctx.netlist.components)
    if n > options.max_components:
        yield ctx.finding(f"{n} components, budget {options.max_components}",
                          path=("components",), key="budget")
"""


def project(tmp_path: Path, table: str) -> Path:
    """A repository with the single-cell example and its library, and ``table`` as its
    config."""
    import shutil
    root = tmp_path / "repo"
    (root / ".git").mkdir(parents=True)
    shutil.copy(REPO / EXAMPLES_BY_NAME["orchard-probe"], root / "probe.yaml")
    shutil.copytree(REPO / "example_designs" / "parts", root / "parts")
    (root / "team_rules").mkdir()
    (root / "team_rules" / "budget.py").write_text(TEAM_RULE, encoding="utf-8")
    shutil.copy(REPO / "examples" / "team-rules" / "team-policy.yaml", root / "policy.yaml")
    (root / "packwarden.toml").write_text(table, encoding="utf-8")
    return root


@pytest.mark.parametrize("table", [
    'rule_paths = ["team_rules"]\n',
    'rule_paths = ["team_rules"]\n[rules.component-budget]\nmax_components = 50\n',
    'policy = "policy.yaml"\n',
])
def test_team_rules_and_a_team_policy_run_again_the_full_way(
        cache: Path, tmp_path: Path, table: str) -> None:
    root = project(tmp_path, table)
    made, again = same(["check", "probe.yaml"], cache, cwd=root)
    assert again


def test_a_batch_an_option_or_a_format_it_does_not_take_goes_the_full_way(cache: Path) -> None:
    for args in (["check", "--jobs", "1", EXAMPLES[0]], ["check", "--format", "html", EXAMPLES[0]],
                 ["check", "example_designs/flawed"]):
        out, err, code, made, again = run(args, cache)
        assert made and not again, args


def test_without_kept_schemas_the_full_way_runs_and_keeps_them(tmp_path: Path) -> None:
    first = run(["check", EXAMPLES[0]], tmp_path)
    second = run(["check", EXAMPLES[0]], tmp_path)
    assert first[3] and not second[3]
    assert first[:3] == second[:3]
    # a damaged file is not used: the full way again, which writes it anew
    for kept in tmp_path.glob("core-schemas-*"):
        kept.write_bytes(kept.read_bytes()[:200])
    third = run(["check", EXAMPLES[0]], tmp_path)
    assert third[3] and third[:3] == first[:3]


def test_the_switch_turns_it_off(cache: Path) -> None:
    assert run(["check", EXAMPLES[0]], cache, quick=False)[3]
    assert not run(["check", EXAMPLES[0]], cache)[3]


# --- the objects: repr and hash of every model in the example designs, each way --------------

WALK = r"""
import json, sys
from packwarden.checking import start
from packwarden.schemacache import go_quick
start()
assert go_quick()
from packwarden import quick
from packwarden.schema import Design, Strict
from packwarden.loader import load_file
from packwarden.validate import validate
twin = quick.full_schema()
classes, todo = {}, [twin.Strict]
while todo:
    k = todo.pop()
    classes[k.__qualname__] = k
    todo.extend(k.__subclasses__())
def as_pydantic(v):
    # the same object made of pydantic's classes (model_construct takes the values as they are)
    if isinstance(v, Strict):
        cls = classes[type(v).__qualname__]
        made = cls.model_construct(**{k: as_pydantic(x) for k, x in v.__dict__.items()})
        object.__setattr__(made, "__pydantic_fields_set__", set(v.model_fields_set))
        return made
    if isinstance(v, list):
        return [as_pydantic(x) for x in v]
    if isinstance(v, tuple):
        return tuple(as_pydantic(x) for x in v)
    if isinstance(v, dict):
        return {k: as_pydantic(x) for k, x in v.items()}
    return v
def hashed(obj):
    try:
        return hash(obj)
    except TypeError:
        return "unhashable"
out, n = [], 0
def walk(obj, path):
    global n
    if isinstance(obj, Strict):
        p = as_pydantic(obj)
        n += 1
        same = [repr(obj) == repr(p), str(obj) == str(p), hashed(obj) == hashed(p),
                obj == obj.model_copy(), (p == p.model_copy()),
                sorted(obj.model_fields) == sorted(type(p).model_fields)]
        if not all(same):
            out.append([path, same])
        for name in type(obj).model_fields:
            walk(getattr(obj, name), path + "." + name)
    elif isinstance(obj, (list, tuple)):
        for i, v in enumerate(obj):
            walk(v, f"{path}[{i}]")
    elif isinstance(obj, dict):
        for k, v in obj.items():
            walk(v, f"{path}[{k}]")
for path in sys.argv[1:]:
    design, errors = validate(load_file(path), Design)
    assert not errors, errors
    walk(design, path)
print(json.dumps([n, out]))
"""


def test_every_model_object_has_pydantics_repr_hash_and_equality(cache: Path) -> None:
    # each object of the examples, as the quick way validates it, against the same values in
    # pydantic's classes (the module made again by pydantic, in the same process)
    env = {**os.environ, "PACKWARDEN_CACHE_DIR": str(cache)}
    env.pop("PACKWARDEN_QUICK", None)
    p = subprocess.run([sys.executable, "-c", WALK, *EXAMPLES, *FLAWED], capture_output=True,
                       text=True, cwd=REPO, env=env)
    assert p.returncode == 0, p.stderr[-2000:]
    seen, differing = json.loads(p.stdout)
    assert seen > 1000
    assert differing == []


# --- the stand-ins against pydantic's BaseModel, on the same class bodies ----------------------

def models(kit: Any) -> dict[str, type]:
    class Base(kit.BaseModel):
        model_config = kit.ConfigDict(extra="forbid", frozen=True, defer_build=True)

    class Inner(Base):
        a: float
        b: Optional[float] = None

        @kit.model_validator(mode="after")
        def _check(self) -> "Inner":
            if self.b is not None and self.b < self.a:
                raise ValueError("b below a")
            return self

    class Outer(Base):
        name: str = kit.Field(min_length=1, description="a name")
        size: Annotated[int, kit.Field(ge=0)] = 3
        inner: Inner = kit.Field(default_factory=lambda: Inner.model_construct(a=1.0))
        items: list[Inner] = kit.Field(default_factory=list)
        alias_: str = kit.Field("x", alias="alias")

    class Empty(Base):
        kind: ClassVar[str] = "empty"  # a class variable, no field

    class Compared(Base):
        a: float = 0.0

        def __eq__(self, other: Any) -> bool:  # its own equality, pydantic's hash
            return isinstance(other, Compared) and other.a == self.a

    class Made(Base):
        tag: str = "t"

        @kit.model_validator(mode="after")
        def _seen(self) -> "Made":
            if self.tag != "t":
                raise ValueError("tag")
            return self

    return {"Inner": Inner, "Outer": Outer, "Empty": Empty, "Made": Made, "Compared": Compared}


def _kept() -> type:
    from packwarden import quick

    class Kept(quick.BaseModel):  # a class pickle finds by its module and name
        model_config = quick.ConfigDict(frozen=True)
        a: float
        b: Optional[float] = None

    Kept.__qualname__ = "Kept"
    return Kept


Kept = _kept()


def both() -> tuple[dict[str, type], dict[str, type]]:
    import pydantic

    from packwarden import quick
    return models(quick), models(pydantic)


def test_model_construct_repr_hash_and_equality_as_pydantic_makes_them() -> None:
    q, p = both()
    for values in ({"a": 1.0}, {"a": 1.0, "b": 2.5}, {"a": 2.0, "b": None}):
        qi, pi = q["Inner"].model_construct(**values), p["Inner"].model_construct(**values)
        assert repr(qi).replace("Inner", "X") == repr(pi).replace("Inner", "X")
        assert str(qi) == str(pi)
        assert list(qi) == list(pi)
        assert hash(qi) == hash(pi)
        assert qi.__dict__ == pi.__dict__ and qi.model_fields_set == pi.model_fields_set
        assert qi == q["Inner"].model_construct(**values)
        assert qi != q["Inner"].model_construct(a=7.0)
        assert qi != q["Outer"].model_construct()
    qo, po = q["Outer"].model_construct(name="n"), p["Outer"].model_construct(name="n")
    assert repr(qo) == repr(po)
    for obj in (qo, po):  # a list among the values: unhashable, as pydantic's
        with pytest.raises(TypeError):
            hash(obj)
    assert qo.__dict__.keys() == po.__dict__.keys()
    assert qo.model_fields_set == po.model_fields_set
    by_alias = q["Outer"].model_construct(name="n", alias="y")
    assert by_alias.alias_ == p["Outer"].model_construct(name="n", alias="y").alias_ == "y"
    assert hash(q["Empty"].model_construct()) == hash(p["Empty"].model_construct())
    assert q["Empty"].kind == p["Empty"].kind == "empty"
    assert hash(q["Compared"].model_construct(a=2.0)) == hash(p["Compared"].model_construct(a=2.0))
    assert repr(q["Empty"].model_construct()) == repr(p["Empty"].model_construct())


def test_fields_defaults_aliases_and_required_as_pydantic_reads_them() -> None:
    q, p = both()
    for name in q:
        qf, pf = q[name].model_fields, p[name].model_fields
        assert list(qf) == list(pf)
        for field in qf:
            assert qf[field].is_required() == pf[field].is_required(), (name, field)
            assert qf[field].alias == pf[field].alias
            assert qf[field].description == pf[field].description
            if not qf[field].is_required() and qf[field].default_factory is None:
                assert qf[field].default == pf[field].default
        # the default no longer sits on the class
        assert not any(field in vars(q[name]) for field in qf)


def test_model_copy_and_a_model_made_by_calling_its_class() -> None:
    q, p = both()
    qi, pi = q["Inner"].model_construct(a=1.0), p["Inner"].model_construct(a=1.0)
    qc, pc = qi.model_copy(update={"b": 4.0}), pi.model_copy(update={"b": 4.0})
    assert qc.__dict__ == pc.__dict__ and qc.model_fields_set == pc.model_fields_set
    assert qi.b is None  # the original is untouched
    assert q["Made"]().__dict__ == p["Made"]().__dict__
    assert q["Made"]().model_fields_set == p["Made"]().model_fields_set == set()


def test_copied_and_pickled_as_pydantics_are() -> None:
    import copy
    import pickle
    q, p = both()
    qi = q["Inner"].model_construct(a=1.0, b=2.0)
    for made in (copy.copy(qi), copy.deepcopy(qi)):
        assert made == qi and made is not qi and made.model_fields_set == qi.model_fields_set
    # the state as pydantic's own models keep it
    assert qi.__getstate__().keys() == p["Inner"].model_construct(a=1.0).__getstate__().keys()
    again = pickle.loads(pickle.dumps(Kept.model_construct(a=1.5)))
    assert again == Kept.model_construct(a=1.5)


def test_frozen_as_pydantic_is() -> None:
    q, _ = both()
    obj = q["Inner"].model_construct(a=1.0)
    with pytest.raises(TypeError):
        obj.a = 2.0


def test_which_commands_may_go_the_quick_way(tmp_path: Path,
                                             monkeypatch: pytest.MonkeyPatch) -> None:
    from packwarden import quick
    design = tmp_path / "d.yaml"
    design.write_text("format: packwarden/1\n", encoding="utf-8")
    monkeypatch.delenv(quick.ENV, raising=False)
    assert quick.wanted({"paths": [str(design)]})
    assert quick.wanted({"paths": [str(design)], "format": "sarif", "quiet": True})
    assert not quick.wanted({"paths": [str(design)], "format": "html"})
    assert not quick.wanted({"paths": [str(design)], "jobs": 2})
    assert not quick.wanted({"paths": [str(design)], "yield_samples": 10})
    assert not quick.wanted({"paths": [str(tmp_path)]})
    assert not quick.wanted({"paths": [str(design)] * (quick.MAX_FILES + 1)})
    assert quick.wanted({"paths": [str(design)], "designs_only": True})  # the pre-commit hook
    monkeypatch.setenv(quick.ENV, "0")
    assert not quick.wanted({"paths": [str(design)]})
    from packwarden.batch import PARALLEL_MIN_DESIGNS
    assert quick.MAX_FILES < PARALLEL_MIN_DESIGNS  # no worker process on the quick way


def test_running_again_keeps_the_interpreters_command_line(
        monkeypatch: pytest.MonkeyPatch) -> None:
    # where the process can be replaced (execve) and where it cannot (Windows: a child, whose
    # exit code is the command's)
    from packwarden import quick
    calls: list = []

    class Left(Exception):
        pass

    def leave(code: int) -> None:
        calls.append(("exit", code))
        raise Left

    def execve(path: str, argv: list, env: dict) -> None:
        calls.append(("exec", argv, env[quick.ENV]))
        raise Left

    monkeypatch.setattr(sys, "orig_argv", ["python3", "-X", "importtime", "bin/packwarden",
                                           "check", "d.yaml"])
    monkeypatch.setattr(os, "execve", execve)
    monkeypatch.setattr(os, "_exit", leave)
    with pytest.raises(Left):
        quick.fall_back("a test")
    assert calls == [("exec", [sys.executable, "-X", "importtime", "bin/packwarden", "check",
                               "d.yaml"], "0")]
    calls.clear()
    import subprocess
    monkeypatch.setattr(os, "name", "nt")
    monkeypatch.setattr(subprocess, "call", lambda argv, env: calls.append(("run", argv)) or 1)
    with pytest.raises(Left):
        quick.fall_back("a test")
    assert calls == [("run", [sys.executable, "-X", "importtime", "bin/packwarden", "check",
                              "d.yaml"]), ("exit", 1)]
