"""Hostile input end to end: no input ends a run with a traceback, or stops the other files.

Every design file of tests/hostile/ is the Orchard example with one hostile change (or a library
change, under tests/hostile/parts/); tests/hostile/expected.yaml holds the one line
`packwarden check <file>` must print for it. Each is linted together with a good design, which
must still be linted. Cases that need the file system arranged at test time (symlinks, folders,
a repository of their own) are built under tmp_path.
"""

from __future__ import annotations

import json
import os
import re
import shutil
import socket
import subprocess
import sys
from pathlib import Path

import pytest
import yaml
from hypothesis import HealthCheck, given, settings, strategies as st
from typer.testing import CliRunner

from packwarden.cli import app
from packwarden.engine import load_registry, lint
from packwarden.loader import InputError, load_file
from packwarden.report import RenderOptions, formatter
from packwarden.schema import Design
from packwarden.validate import validate

REPO = Path(__file__).resolve().parents[1]
HOSTILE = REPO / "tests" / "hostile"
GOOD = REPO / "example_designs" / "orchard-probe.yaml"
GOOD_NAME = "Orchard soil probe"

_EXPECTED = yaml.safe_load((HOSTILE / "expected.yaml").read_text(encoding="utf-8"))
CASES: dict[str, str] = _EXPECTED["cases"]
KNOWN_BUGS: dict[str, str] = _EXPECTED.get("known_bugs") or {}


#: How the refusal of a library outside the repository says to allow one (issue 16).
ALLOW_ROOT = ("; a team library kept elsewhere is allowed by naming its folder in the project's "
              "config: library_roots = [\"../team-parts\"] under [tool.packwarden]")

def expected(name: str) -> str:
    # run from tests/hostile/, the repository root is above the working folder: shown absolute
    return CASES[name].replace("{root}", str(REPO))


def cases(names=None) -> list:
    out = []
    for name in names or CASES:
        marks = [pytest.mark.xfail(strict=True, reason=KNOWN_BUGS[name])] if name in KNOWN_BUGS else []
        out.append(pytest.param(name, marks=marks, id=name))
    return out


@pytest.fixture(scope="module")
def registry():
    return load_registry()


@pytest.fixture
def in_corpus(monkeypatch):
    monkeypatch.chdir(HOSTILE)


def text_of(run) -> str:
    return formatter("text")(run, RenderOptions(color=False, quiet=False))


def assert_good_linted(run, good_file: str) -> None:
    good = [d for d in run.designs if d.file == good_file]
    assert len(good) == 1, f"the good design {good_file} has no result"
    assert good[0].errors == [] and good[0].internal == []
    assert good[0].name == GOOD_NAME and good[0].model is not None


# --- the corpus ---------------------------------------------------------------------------------

def test_corpus_and_expectations_match():
    files = {p.name for p in HOSTILE.glob("*.yaml")} - {"expected.yaml"}
    assert files == set(CASES), "every corpus file needs an expected line, and every line a file"
    assert len(CASES) >= 30
    assert set(KNOWN_BUGS) <= set(CASES)
    for name, line in CASES.items():
        assert "\n" not in line and line.split(":", 3)[3].startswith(" "), name


@pytest.mark.parametrize("name", cases())
def test_hostile_file_through_the_engine(name, in_corpus, registry, capsys):
    run = lint([name, str(GOOD)], registry=registry)
    assert run.exit_code() == 2
    bad = run.designs[0]
    assert bad.file == name
    assert bad.internal == [], f"the input crashed the engine: {bad.internal}"
    assert [str(e) for e in bad.errors] == [expected(name)]
    assert_good_linted(run, str(GOOD))
    out = text_of(run)
    assert expected(name) in out.splitlines()
    captured = capsys.readouterr()
    assert "Traceback" not in out + captured.out + captured.err


def test_the_whole_corpus_in_one_run(in_corpus, registry):
    # A shared library cache, one bad file after another: none may disturb the rest.
    names = list(CASES)
    run = lint([str(GOOD), *names], registry=registry)
    assert run.exit_code() == 2
    assert_good_linted(run, str(GOOD))
    by_file = {d.file: d for d in run.designs}
    for name in names:
        assert by_file[name].internal == []
        if name not in KNOWN_BUGS:
            assert [str(e) for e in by_file[name].errors] == [expected(name)], name


CLI_CASES = ["alias-bomb.yaml", "tag-python.yaml", "invalid-utf8.yaml", "utf16.yaml",
             "rkm-resistor.yaml", "unknown-key-typo.yaml", "library-cycle.yaml", "lib-zero-capacity.yaml"]


@pytest.mark.parametrize("name", cases(CLI_CASES))
def test_hostile_file_through_the_cli(name, in_corpus):
    result = CliRunner().invoke(app, ["check", name, str(GOOD)])
    assert result.exception is None or isinstance(result.exception, SystemExit), result.exception
    assert result.exit_code == 2
    assert expected(name) in result.output.splitlines()
    assert "Traceback" not in result.output
    assert "1 design(s) linted, 1 could not be read" in result.output


def test_the_corpus_through_a_real_process():
    names = [n for n in CASES if n not in KNOWN_BUGS]
    proc = subprocess.run([sys.executable, "-m", "packwarden.cli", "check", *names, str(GOOD)],
                          cwd=HOSTILE, capture_output=True, text=True, encoding="utf-8")
    assert proc.returncode == 2
    assert "Traceback" not in proc.stdout + proc.stderr
    lines = proc.stdout.splitlines()
    for name in names:
        assert expected(name) in lines, name
    assert f"1 design(s) linted, {len(names)} could not be read" in proc.stdout


def test_json_report_carries_the_same_errors(in_corpus):
    names = ["yaml-nan.yaml", "negative-resistance.yaml", "library-duplicate-part.yaml"]
    result = CliRunner().invoke(app, ["check", "--format", "json", *names, str(GOOD)])
    assert result.exit_code == 2
    report = json.loads(result.output)
    assert report["exit_code"] == 2
    printed = [f"{e['file']}:{e['line']}:{e['column']}: {e['message']}" for e in report["errors"]]
    assert printed == [expected(n) for n in names]
    assert [d["file"] for d in report["designs"]] == [*names, str(GOOD)]
    assert report["designs"][-1]["name"] == GOOD_NAME


# --- arranged at test time ----------------------------------------------------------------------

def make_repo(root: Path) -> Path:
    """A repository of its own: a packwarden.toml marks its root for library confinement."""
    root.mkdir(parents=True, exist_ok=True)
    (root / "packwarden.toml").write_text("", encoding="utf-8")
    return root


def example_with_libraries(libraries: str) -> str:
    text = GOOD.read_text(encoding="utf-8")
    old = "libraries: [parts/orchard-parts.yaml]"
    assert old in text
    return text.replace(old, f"libraries: {libraries}")


def line_col(text: str, needle: str) -> tuple[int, int]:
    for i, line in enumerate(text.splitlines(), 1):
        if needle in line:
            return i, line.index(needle) + 1
    raise AssertionError(needle)


def test_symlinked_library_pointing_outside_the_repository(tmp_path, monkeypatch, registry):
    repo = make_repo(tmp_path / "repo")
    outside = tmp_path / "outside"
    outside.mkdir()
    shutil.copy(HOSTILE / "parts" / "orchard-parts.yaml", outside / "orchard-parts.yaml")
    (repo / "parts").mkdir()
    try:
        os.symlink(outside / "orchard-parts.yaml", repo / "parts" / "orchard-parts.yaml")
    except (OSError, NotImplementedError):
        pytest.skip("this file system cannot make symlinks")
    design = example_with_libraries("[parts/orchard-parts.yaml]")
    (repo / "design.yaml").write_text(design, encoding="utf-8")
    shutil.copy(GOOD, repo / "good.yaml")  # same library line, resolved through the same link
    (repo / "clean").mkdir()
    shutil.copy(GOOD, repo / "clean" / "good.yaml")
    shutil.copytree(HOSTILE / "parts", repo / "clean" / "parts")
    monkeypatch.chdir(repo)

    run = lint(["design.yaml", "clean/good.yaml"], registry=registry)
    line, col = line_col(design, "[parts/orchard-parts.yaml]")
    assert [str(e) for e in run.designs[0].errors] == [
        f"design.yaml:{line}:{col + 1}: library path 'parts/orchard-parts.yaml' links outside the "
        f"repository (.); libraries must live inside it{ALLOW_ROOT}"]
    assert run.exit_code() == 2
    assert_good_linted(run, "clean/good.yaml")


def test_library_path_climbing_out_of_the_repository(tmp_path, monkeypatch, registry):
    repo = make_repo(tmp_path / "repo")
    (repo / "designs").mkdir()
    design = example_with_libraries("[../../etc/passwd]")
    (repo / "designs" / "probe.yaml").write_text(design, encoding="utf-8")
    monkeypatch.chdir(repo)
    run = lint(["designs/probe.yaml"], registry=registry)
    line, col = line_col(design, "[../../etc/passwd]")
    assert [str(e) for e in run.designs[0].errors] == [
        f"designs/probe.yaml:{line}:{col + 1}: library path '../../etc/passwd' escapes the "
        f"repository (.); libraries must live inside it{ALLOW_ROOT}"]


def test_a_directory_given_as_a_path(tmp_path, monkeypatch, registry):
    repo = make_repo(tmp_path / "repo")
    folder = repo / "designs"
    folder.mkdir()
    for name in ("rkm-resistor.yaml", "invalid-utf8.yaml", "tag-python.yaml"):
        shutil.copy(HOSTILE / name, folder / name)
    # a part library in the same folder is not a design, so it is not linted as one
    shutil.copy(HOSTILE / "parts" / "orchard-parts.yaml", folder / "orchard-parts.yaml")
    monkeypatch.chdir(repo)
    run = lint(["designs", str(GOOD)], registry=registry)
    assert run.exit_code() == 2
    files = [d.file for d in run.designs]
    assert files == ["designs/invalid-utf8.yaml", "designs/rkm-resistor.yaml",
                     "designs/tag-python.yaml", str(GOOD)]
    out = text_of(run).splitlines()
    for name in ("rkm-resistor.yaml", "invalid-utf8.yaml", "tag-python.yaml"):
        assert f"designs/{expected(name)}" in out
    assert_good_linted(run, str(GOOD))


def test_a_missing_file(tmp_path, monkeypatch, registry):
    monkeypatch.chdir(make_repo(tmp_path / "repo"))
    run = lint(["no-such-design.yaml", str(GOOD)], registry=registry)
    assert run.exit_code() == 2
    assert [str(e) for e in run.designs[0].errors] == ["no-such-design.yaml:1:1: no such file"]
    assert_good_linted(run, str(GOOD))


def test_a_file_over_the_size_limit(tmp_path, monkeypatch, registry):
    import packwarden.loader as loader
    repo = make_repo(tmp_path / "repo")
    big = repo / "big.yaml"
    # padded past the good design's own library, so the limit leaves that library readable
    library = GOOD.parent / "parts" / "orchard-parts.yaml"
    padding = library.stat().st_size + 2000
    big.write_text(GOOD.read_text(encoding="utf-8") + "#" * padding + "\n", encoding="utf-8")
    size = big.stat().st_size
    monkeypatch.setattr(loader, "MAX_BYTES", size - 1)  # the good design stays below it
    monkeypatch.chdir(repo)
    run = lint(["big.yaml", str(GOOD)], registry=registry)
    assert [str(e) for e in run.designs[0].errors] == [
        f"big.yaml:1:1: file is {size} bytes; the limit is {size - 1} bytes"]
    assert_good_linted(run, str(GOOD))


# --- anything at all in a valid file's place ----------------------------------------------------

VALUES = st.recursive(
    st.none() | st.booleans() | st.integers() | st.floats() |
    st.text(max_size=12) | st.sampled_from(["4k7", "5V5", "1,5 V", "NaN", "-1 Ω", "0 mAh", "-300 °C",
                                            "1 meg", "resistr", "part", "kind", "pins"]),
    lambda inner: st.lists(inner, max_size=3) | st.dictionaries(st.text(max_size=8), inner, max_size=3),
    max_leaves=6)


def _paths(node, path=()):
    yield path
    if isinstance(node, dict):
        for k, v in node.items():
            yield from _paths(v, path + (k,))
    elif isinstance(node, list):
        for i, v in enumerate(node):
            yield from _paths(v, path + (i,))


_DOC = load_file(GOOD, "orchard-probe.yaml")
_PATHS = [p for p in _paths(_DOC.data) if p]


def _replaced(data, path, value):
    if not path:
        return value
    head, rest = path[0], path[1:]
    if isinstance(data, dict):
        out = dict(data)
    else:
        out = list(data)
    out[head] = _replaced(data[head], rest, value)
    return out


@given(st.sampled_from(_PATHS), VALUES)
@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
def test_any_value_anywhere_validates_or_gives_located_errors(path, value):
    doc = type(_DOC)(_DOC.file, _replaced(_DOC.data, path, value), _DOC.positions, _DOC.key_positions)
    model, errors = validate(doc, Design)
    assert (model is None) == bool(errors)
    for e in errors:
        assert isinstance(e, InputError) and e.line >= 1 and e.column >= 1
        assert "\n" not in str(e)


# --- round two: what cannot live in the corpus folder ---------------------------------------------
# FIFOs, sockets, links out of the repository, configs and baselines are arranged at test time;
# each case keeps a good design in the same run, which must still be linted.

def _repo_with_good(tmp_path: Path) -> Path:
    """A repository holding the clean example (which lints without findings) and its library."""
    repo = make_repo(tmp_path / "repo")
    shutil.copy(GOOD, repo / "good.yaml")
    shutil.copytree(GOOD.parent / "parts", repo / "parts")
    return repo


def _special(make) -> None:
    try:
        make()
    except (OSError, AttributeError, NotImplementedError) as exc:  # no FIFOs or links here
        pytest.skip(f"this file system cannot make it: {exc}")


def _fifo(path: Path) -> None:
    _special(lambda: os.mkfifo(path))


def _link(path: Path, target: Path | str) -> None:
    _special(lambda: os.symlink(target, path))


def test_special_files_named_as_designs_are_refused_unread(tmp_path, monkeypatch, registry):
    repo = _repo_with_good(tmp_path)
    _fifo(repo / "pipe.yaml")
    _link(repo / "zeros.yaml", "/dev/zero")
    _link(repo / "null.yml", os.devnull)
    sock = socket.socket(socket.AF_UNIX)
    try:
        _special(lambda: sock.bind(str(repo / "sock.yaml")))
        monkeypatch.chdir(repo)
        run = lint(["pipe.yaml", "zeros.yaml", "null.yml", "sock.yaml", "good.yaml"],
                   registry=registry)
    finally:
        sock.close()
    errors = {d.file: [str(e) for e in d.errors] for d in run.designs}
    assert errors["pipe.yaml"] == ["pipe.yaml:1:1: is a FIFO (named pipe), not a regular file; "
                                   "only regular files are read"]
    assert errors["sock.yaml"] == ["sock.yaml:1:1: is a socket, not a regular file; only regular "
                                   "files are read"]
    for name in ("zeros.yaml", "null.yml"):  # devices live outside any repository
        assert errors[name] == [f"{name}:1:1: the design links outside its repository (.); it "
                                f"is not read"]
    assert run.exit_code() == 2
    assert_good_linted(run, "good.yaml")


def test_a_scanned_folder_with_a_pipe_and_a_device_link_still_lints_its_designs(
        tmp_path, monkeypatch, registry):
    repo = _repo_with_good(tmp_path)
    designs = repo / "designs"
    designs.mkdir()
    text = GOOD.read_text(encoding="utf-8").replace("libraries: [parts/", "libraries: [../parts/")
    (designs / "a-good.yaml").write_text(text, encoding="utf-8")
    _fifo(designs / "b-pipe.yaml")
    _link(designs / "c-zeros.yaml", "/dev/zero")
    (designs / "d-folder.yaml").mkdir()  # a folder with a YAML name is no file to lint
    (designs / "e-good.yml").write_text(text, encoding="utf-8")
    monkeypatch.chdir(repo)
    run = lint(["designs"], registry=registry)
    by_file = {d.file: d for d in run.designs}
    assert list(by_file) == ["designs/a-good.yaml", "designs/b-pipe.yaml", "designs/c-zeros.yaml",
                             "designs/e-good.yml"]
    for good in ("designs/a-good.yaml", "designs/e-good.yml"):
        assert by_file[good].linted and by_file[good].errors == []
    assert "FIFO" in str(by_file["designs/b-pipe.yaml"].errors[0])
    assert "links outside its repository" in str(by_file["designs/c-zeros.yaml"].errors[0])
    assert run.exit_code() == 2


SECRET = "format: packwarden/1\nsecret-token-7f3a: do not print me\n"


def test_a_design_linking_out_of_the_repository_echoes_nothing_of_its_target(tmp_path, monkeypatch):
    repo = _repo_with_good(tmp_path)
    outside = tmp_path / "elsewhere" / "credentials.yaml"
    outside.parent.mkdir()
    outside.write_text(SECRET, encoding="utf-8")
    _link(repo / "innocent.yaml", outside)
    (repo / "nested").mkdir()
    _link(repo / "nested" / "also.yaml", outside)  # found by a folder scan too
    monkeypatch.chdir(repo)
    for fmt in ("text", "json", "sarif", "junit", "markdown", "html"):
        result = CliRunner().invoke(app, ["check", "--format", fmt, "innocent.yaml", "nested",
                                          "good.yaml"])
        assert result.exit_code == 2, fmt
        assert "secret-token" not in result.output and "credentials" not in result.output, fmt
        assert "Traceback" not in result.output
    result = CliRunner().invoke(app, ["check", "innocent.yaml", "good.yaml"])
    assert "innocent.yaml:1:1: the design links outside its repository (.); it is not read" \
        in result.output.splitlines()
    assert "1 design(s) linted, 1 could not be read" in result.output


def test_the_hook_mode_does_not_read_a_link_to_an_endless_device(tmp_path, monkeypatch):
    # pre-commit passes every changed YAML file; --designs-only peeks into each to skip libraries
    repo = _repo_with_good(tmp_path)
    _link(repo / "endless.yaml", "/dev/zero")
    _fifo(repo / "pipe.yaml")
    monkeypatch.chdir(repo)
    proc = subprocess.run([sys.executable, "-m", "packwarden.cli", "check", "--designs-only",
                           "endless.yaml", "pipe.yaml", "parts/orchard-parts.yaml", "good.yaml"],
                          capture_output=True, text=True, encoding="utf-8", timeout=120)
    assert proc.returncode == 2
    assert "endless.yaml:1:1: the design links outside its repository (.); it is not read" \
        in proc.stdout.splitlines()
    assert "pipe.yaml:1:1: is a FIFO (named pipe), not a regular file; only regular files are " \
           "read" in proc.stdout.splitlines()
    assert "1 design(s) linted, 2 could not be read" in proc.stdout


def test_a_library_that_is_a_pipe_is_refused_at_the_design_line(tmp_path, monkeypatch, registry):
    repo = _repo_with_good(tmp_path)
    _fifo(repo / "parts" / "pipe.yaml")
    design = example_with_libraries("[parts/pipe.yaml]")
    (repo / "design.yaml").write_text(design, encoding="utf-8")
    monkeypatch.chdir(repo)
    run = lint(["design.yaml", "good.yaml"], registry=registry)
    line, col = line_col(design, "[parts/pipe.yaml]")
    assert [str(e) for e in run.designs[0].errors] == [
        f"design.yaml:{line}:{col + 1}: library 'parts/pipe.yaml' is a FIFO (named pipe), not a "
        f"regular file; only regular files are read"]
    assert_good_linted(run, "good.yaml")


@pytest.mark.parametrize("pyproject", [
    '[ tool.packwarden ]\nselect = ["unknown-part"]\n',
    '[tool."packwarden"]\nselect = ["unknown-part"]\n',
    "[tool . 'packwarden']\nselect = ['unknown-part']\n",
    '[tool]\npackwarden.select = ["unknown-part"]\n',
    '[tool]\npackwarden = { select = ["unknown-part"] }\n',
    '[project]\nname = "x"\n\n[tool.black]\nline-length = 99\n\n[tool . packwarden]\n'
    'select = ["unknown-part"]\n',
], ids=["spaces", "quoted", "single-quoted", "dotted-key", "inline-table", "after-other-tools"])
def test_the_config_table_is_found_however_toml_spells_it(tmp_path, pyproject, registry):
    # [published: TOML 1.0, "Table" and "Keys": whitespace around dots and quoted keys name the
    # same table, and dotted keys define tables too]
    repo = tmp_path / "repo"
    shutil.copytree(REPO / "example_designs", repo)
    (repo / "pyproject.toml").write_text(pyproject, encoding="utf-8")
    run = lint([str(repo / "flawed" / "no-fuse.yaml")], registry=registry)
    (design,) = run.designs
    assert design.errors == []
    assert design.checked == ["unknown-part"]  # the table's select is applied
    assert run.exit_code() == 0


def test_a_config_policy_path_with_a_nul_is_a_located_error(tmp_path, monkeypatch):
    repo = _repo_with_good(tmp_path)
    (repo / "packwarden.toml").write_text('fail_on = "warning"\npolicy = "team\\u0000.yaml"\n',
                                          encoding="utf-8")
    monkeypatch.chdir(repo)
    result = CliRunner().invoke(app, ["check", "good.yaml"])
    assert result.exit_code == 2
    assert ("packwarden.toml:2:1: 'policy': the path holds the control character U+0000; name the "
            "file with printable characters") in result.output.splitlines()
    assert "internal error in" not in result.output and "Traceback" not in result.output


def test_a_deeply_nested_baseline_is_bad_input_not_a_crash(tmp_path, monkeypatch):
    repo = _repo_with_good(tmp_path)
    deep = '{"format": "packwarden-baseline/1", "findings": [' + "[" * 50_000 + "]" * 50_000 + "]}"
    (repo / "deep.json").write_text(deep, encoding="utf-8")
    # brackets inside strings are text, not nesting
    (repo / "brackets.json").write_text(json.dumps(
        {"format": "packwarden-baseline/1", "findings": [], "note": "[" * 100}), encoding="utf-8")
    _fifo(repo / "pipe.json")
    monkeypatch.chdir(repo)
    for name, line in (("deep.json", "deep.json:1:64: baseline nests deeper than 16 levels; a "
                                     "baseline is a list of flat findings"),
                       ("pipe.json", "pipe.json:1:1: baseline file cannot be read: is a FIFO "
                                     "(named pipe), not a regular file; only regular files are "
                                     "read")):
        proc = subprocess.run([sys.executable, "-m", "packwarden.cli", "check", "--baseline",
                               name, "good.yaml"], capture_output=True, text=True,
                              encoding="utf-8", timeout=120)
        assert proc.returncode == 2, name
        assert line in proc.stdout.splitlines()
        assert "Traceback" not in proc.stdout + proc.stderr
    proc = subprocess.run([sys.executable, "-m", "packwarden.cli", "check", "--baseline",
                           "brackets.json", "good.yaml"], capture_output=True, text=True,
                          encoding="utf-8", timeout=120)
    assert proc.returncode == 0, proc.stdout


def test_control_characters_from_a_design_reach_no_report_raw(tmp_path, monkeypatch):
    # A net, a design name, a revision and a waiver reason carrying terminal escapes (ESC, BEL,
    # the C1 CSI 0x9b) and a right-to-left override: findings quote nets, reports the rest.
    repo = _repo_with_good(tmp_path)
    text = GOOD.read_text(encoding="utf-8")
    text = text.replace("design: {name: Orchard soil probe, revision: C}",
                        'design: {name: "Orchard \\e]0;owned\\a probe", revision: "C\\x9b2J", '
                        'description: "rev \\u202e C"}')
    text = text.replace("  F1: {part: OR-FUSE-12A, pins: [B+, P+]}",
                        '  F1: {part: OR-FUSE-12A, pins: [B+, P+]}\n'
                        '  R9: {kind: resistor, value: 1 kΩ, pins: [B+, "\\e[31mLOOSE\\e[0m"]}')
    text += ('waivers:\n  - {rule: single-connection-net, element: R9, reason: "bench \\e[8m '
             'hidden", expires: 2999-01-01}\n')
    (repo / "escapes.yaml").write_text(text, encoding="utf-8")
    monkeypatch.chdir(repo)
    raw = re.compile("[\x00-\x08\x0b-\x1f\x7f-\x9f\u202a-\u202e\u2066-\u2069]")
    for fmt in ("text", "json", "sarif", "junit", "markdown", "html"):
        result = CliRunner().invoke(app, ["check", "--format", fmt, "escapes.yaml"])
        assert result.exit_code == 0, (fmt, result.output)
        assert raw.findall(result.output) == [], fmt
    result = CliRunner().invoke(app, ["check", "--format", "json", "escapes.yaml"])
    (design,) = json.loads(result.output)["designs"]
    assert design["name"] == "Orchard \\x1b]0;owned\\x07 probe"
    (finding,) = [f for f in design["findings"] if f["rule"] == "single-connection-net"]
    assert finding["message"] == "net '\\x1b[31mLOOSE\\x1b[0m' connects only R9.2"
    assert finding["waived"] == "bench \\x1b[8m hidden"


def test_terminals_that_bypass_the_sense_pins_are_a_located_error(tmp_path, monkeypatch, registry):
    # Pack terminals named at the cell: the load current never crosses the switches, so the
    # protector's sense and ground pins see 0 V and no current trips it; the model says where.
    repo = _repo_with_good(tmp_path)
    text = GOOD.read_text(encoding="utf-8").replace(
        "  ambient: {min: -20 °C, max: 55 °C}",
        "  ambient: {min: -20 °C, max: 55 °C}\n  terminals: {pos: B+, neg: B-}")
    (repo / "bypass.yaml").write_text(text, encoding="utf-8")
    monkeypatch.chdir(repo)
    run = lint(["bypass.yaml", "good.yaml"], registry=registry)
    bad = run.designs[0]
    line, col = line_col(text, "VM, discharge_gate")  # the value of pins.sense
    assert [str(e) for e in bad.errors] == [
        f"bypass.yaml:{line}:{col}: U1: the load current sets up no voltage between its sense "
        f"and ground pins, so no current trips its detection; put the switches or a shunt "
        f"between them, in the path of the load current"]
    assert bad.internal == []
    assert run.exit_code() == 2
    assert_good_linted(run, "good.yaml")


def test_a_broken_pyproject_naming_packwarden_is_reported_not_skipped(tmp_path, monkeypatch):
    # Unparsable TOML cannot say whether it holds the table; when it names packwarden at all, its
    # syntax error is the run's (exit 2) rather than the team's gates silently dropped.
    repo = tmp_path / "repo"
    shutil.copytree(REPO / "example_designs", repo)
    (repo / "pyproject.toml").write_text('[tool.packwarden\nselect = ["unknown-part"]\n',
                                         encoding="utf-8")
    monkeypatch.chdir(repo)
    result = CliRunner().invoke(app, ["check", "orchard-probe.yaml"])
    assert result.exit_code == 2
    assert any(line.startswith("pyproject.toml:1:") and ": TOML syntax error: " in line
               for line in result.output.splitlines()), result.output
    # a broken pyproject.toml that is no business of ours is passed over, as before
    (repo / "pyproject.toml").write_text("[tool.other\n", encoding="utf-8")
    result = CliRunner().invoke(app, ["check", "orchard-probe.yaml"])
    assert result.exit_code == 0, result.output


def test_a_designs_folder_linking_to_another_repository_is_not_read(tmp_path, monkeypatch,
                                                                    registry):
    # `designs -> ../other`: the other checkout has its own markers, but the path names a folder
    # of this repository; the files behind the link are refused, the named good design linted.
    repo = _repo_with_good(tmp_path)
    other = make_repo(tmp_path / "other")
    (other / "stolen.yaml").write_text(GOOD.read_text(encoding="utf-8").replace(
        "continuous: 1.2 A", "continuous: secret-token-7f3a"), encoding="utf-8")
    _link(repo / "designs", other)
    monkeypatch.chdir(repo)
    run = lint(["designs", "good.yaml"], registry=registry)
    assert [str(e) for d in run.designs for e in d.errors] == [
        "designs/stolen.yaml:1:1: the design links outside its repository (.); it is not read"]
    assert "secret-token" not in text_of(run)
    assert_good_linted(run, "good.yaml")
