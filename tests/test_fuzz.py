"""Property-based fuzzing: mutated designs and libraries never crash a run or lose a position.

Hypothesis mutates the Orchard example and its part library the way files get damaged in real
life — a key deleted, a value of the wrong type, stray characters, a changed unit, a duplicated
line, a file cut short, random bytes — and every run must end with exit code 0, 1 or 2, print no
traceback, report no internal error, and give every problem as ``file:line:column: message``.
Runs go through ``packwarden.engine.lint`` and the text formatter in-process for speed; a few go
through the installed command as a user runs it.
"""

from __future__ import annotations

import os
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings, strategies as st

from packwarden.engine import lint, load_registry
from packwarden.report import RenderOptions, formatter

REPO = Path(__file__).resolve().parent.parent
DESIGN = (REPO / "example_designs" / "orchard-probe.yaml").read_bytes()
LIBRARY = (REPO / "example_designs" / "parts" / "orchard-parts.yaml").read_bytes()
REGISTRY = load_registry()
RENDER = formatter("text")

POSITIONED = re.compile(r"^(?P<file>[^\s:][^:]*):(?P<line>[1-9]\d*):(?P<col>[1-9]\d*): \S")
JUNK = ":{}[],&*!|>'\"%@`#\t\x00\x1b\u00a0\u2028\ufeff\u2126\u00b5\u03bc-?~\\"
VALUES = ["12", "-3", "1e999", "[]", "{}", "[a, b]", "{a: 1}", "true", "no", "null", "~", "''",
          "'4.2 V'", "4,2 V", "4k7", ".nan", ".inf", "!!python/object:os.system", "*x", "&x 1",
          "<<: {}", "|", ">", "0x10 V", "1:30", "2024-01-01", "\"\\u0000\"", "- a"]
UNITS = ["V", "mV", "A", "mA", "uA", "Ω", "mΩ", "kΩ", "°C", "K", "K/W", "s", "ms", "us", "Ah",
         "mAh", "A2s", "nF", "W", "%", "meg", "Ohm", "v", "MV", ""]
UNIT_RE = re.compile(r"(?<=\d )(mΩ|kΩ|Ω|mV|V|uA|mA|A2s|A|°C|K/W|ms|us|s|mAh|nF|W|%)\b")


@st.composite
def mutated(draw, original: bytes) -> bytes:
    """``original`` with one to three mutations applied in turn."""
    data = original
    for _ in range(draw(st.integers(1, 3))):
        text = data.decode("utf-8", errors="surrogateescape")
        lines = text.split("\n")
        kind = draw(st.sampled_from(["delete", "duplicate", "retype", "junk", "unit", "truncate",
                                     "bytes", "indent"]))
        i = draw(st.integers(0, max(len(lines) - 1, 0)))
        if kind == "delete":
            del lines[i]
        elif kind == "duplicate":  # a duplicated key at that line's level
            lines.insert(i, lines[i])
        elif kind == "retype":
            line = lines[i]
            if ": " in line:
                key, _ = line.split(": ", 1)
                lines[i] = f"{key}: {draw(st.sampled_from(VALUES))}"
        elif kind == "junk":
            pos = draw(st.integers(0, len(lines[i])))
            lines[i] = lines[i][:pos] + draw(st.text(JUNK, min_size=1, max_size=4)) + lines[i][pos:]
        elif kind == "unit":
            found = list(UNIT_RE.finditer(text))
            if found:
                m = found[draw(st.integers(0, len(found) - 1))]
                text = text[:m.start()] + draw(st.sampled_from(UNITS)) + text[m.end():]
                lines = text.split("\n")
        elif kind == "indent":
            lines[i] = (" " * draw(st.integers(1, 3)) + lines[i]) if draw(st.booleans()) \
                else lines[i].lstrip()
        data = "\n".join(lines).encode("utf-8", errors="surrogateescape")
        if kind == "truncate":
            data = data[:draw(st.integers(0, len(data)))]
        elif kind == "bytes":
            pos = draw(st.integers(0, len(data)))
            data = data[:pos] + draw(st.binary(min_size=1, max_size=8)) + data[pos + 1:]
    return data


def yaml_lines(data: bytes) -> int:
    """Line breaks as YAML counts them: LF, CRLF, lone CR, and NEL, LS, PS (YAML 1.1 5.4)."""
    text = data.decode("utf-8", errors="replace")
    return len(re.findall("\r\n|[\n\r\u0085\u2028\u2029]", text))


@pytest.fixture(scope="module")
def workspace(tmp_path_factory: pytest.TempPathFactory) -> Path:
    root = tmp_path_factory.mktemp("fuzz")
    (root / ".git").mkdir()
    (root / "parts").mkdir()
    return root


def lint_and_check(root: Path, design: bytes, library: bytes) -> None:
    path = root / "probe.yaml"
    path.write_bytes(design)
    (root / "parts" / "orchard-parts.yaml").write_bytes(library)
    run = lint([str(path)], registry=REGISTRY)
    out = RENDER(run, RenderOptions())
    code = run.exit_code()
    assert code in (0, 1, 2)
    assert "Traceback" not in out
    internal = [(i.rule, i.message) for d in run.designs for i in d.internal]
    assert internal == [], f"a rule or the model crashed on a mutated input: {internal}"
    assert run.broken_plugins == []
    for err in run.input_errors():
        shown = str(err)
        assert "\n" not in shown, shown
        m = POSITIONED.match(shown)
        assert m, f"no file:line:column in {shown!r}"
        assert Path(m["file"]).resolve() in (path.resolve(),
                                            (root / "parts" / "orchard-parts.yaml").resolve())
        source = design if Path(m["file"]).resolve() == path.resolve() else library
        # libyaml marks the end of a file that stops mid-line one line further down (pure-Python
        # PyYAML does not); an editor opens that at the end of the file, so it is tolerated
        assert int(m["line"]) <= yaml_lines(source) + 1 + (not source.endswith(b"\n")), shown
    if code == 2:
        assert run.input_errors(), "exit 2 without a located error"
    summary, caution = out.rstrip("\n").split("\n")[-2:]
    assert summary.startswith("1 design(s) linted, 0 could not be read;") or \
        summary.startswith("0 design(s) linted, 1 could not be read;"), summary
    assert caution.startswith("Caution: lithium cells")
    for line in out.split("\n")[:-3]:
        # a finding's hint and the assumptions its figures rest on are its indented lines
        if not line or line.startswith(("    hint: ", "    assumes: ")) or ": note: " in line \
                or ": figures: " in line:
            continue
        assert POSITIONED.match(line), f"output line without file:line:column: {line!r}"


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(design=mutated(DESIGN))
def test_mutated_designs_are_reported_never_crash(workspace: Path, design: bytes) -> None:
    lint_and_check(workspace, design, LIBRARY)


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(library=mutated(LIBRARY))
def test_mutated_libraries_are_reported_never_crash(workspace: Path, library: bytes) -> None:
    lint_and_check(workspace, DESIGN, library)


def test_the_unmutated_example_is_clean(workspace: Path) -> None:
    # The baseline the mutations start from: without it every property above could pass on
    # designs that never reached the rules.
    (workspace / "probe.yaml").write_bytes(DESIGN)
    (workspace / "parts" / "orchard-parts.yaml").write_bytes(LIBRARY)
    [d] = lint([str(workspace / "probe.yaml")], registry=REGISTRY).designs
    assert d.errors == [] and d.figures["component_count"].value == 8


# --- the installed command on a few damaged files -------------------------------------------------

DAMAGED = {
    "cut-short.yaml": DESIGN[:DESIGN.index(b"components:") + 30],
    "binary.yaml": DESIGN[:200] + bytes(range(256)) + DESIGN[200:],
    "retyped.yaml": DESIGN.replace(b"continuous: 1.2 A", b"continuous: [1.2, A]"),
}


def test_the_command_reports_damaged_files_without_a_traceback(tmp_path: Path) -> None:
    found = shutil.which("packwarden", path=str(Path(sys.executable).parent))
    if found is None:
        pytest.skip(f"no packwarden script next to {sys.executable}; install the package first")
    (tmp_path / ".git").mkdir()
    (tmp_path / "parts").mkdir()
    (tmp_path / "parts" / "orchard-parts.yaml").write_bytes(LIBRARY)
    for name, data in DAMAGED.items():
        (tmp_path / name).write_bytes(data)
    (tmp_path / "good.yaml").write_bytes(DESIGN)
    env = {k: v for k, v in os.environ.items() if k != "PYTHONPATH"}
    proc = subprocess.run([found, "check", *DAMAGED, "good.yaml"], cwd=tmp_path,
                          capture_output=True, text=True, encoding="utf-8", env=env)
    assert proc.returncode == 2
    assert "Traceback" not in proc.stdout + proc.stderr
    errors = [ln for ln in proc.stdout.splitlines() if POSITIONED.match(ln)]
    assert sorted({ln.split(":", 1)[0] for ln in errors}) == sorted(DAMAGED), proc.stdout
    assert "1 design(s) linted, 3 could not be read" in proc.stdout
