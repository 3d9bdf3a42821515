"""The command's output options as a person meets them: --format, --output, --quiet, NO_COLOR, the
progress bar (on a terminal only) and --designs-only, run on the example designs.

NO_COLOR follows the convention published at no-color.org [published: "Command-line software which
adds ANSI color to its output by default should check for a NO_COLOR environment variable that,
when present and not an empty string, prevents the addition of ANSI color"]. Terminals are real
pseudo-terminals (the standard library's pty), not mocks.
"""

from __future__ import annotations

import io
import json
import os
import pty
import select
import subprocess
import sys
from pathlib import Path

import pytest

from packwarden.progress import Progress, progress_for
from importlib.metadata import EntryPoint

from packwarden.report import (FORMAT_GROUP, FormatRegistry, FormatUnavailable, formatter,
                               load_formats)

from report_data import CLEAN, EXAMPLES, FLAWED, REPO

ESC = "\x1b["


def command() -> list[str]:
    # The command's own module, run by this interpreter: the same code path as the installed
    # script (which tests/test_precommit.py runs through pre-commit).
    return [sys.executable, "-m", "packwarden.cli"]


def run(*args: str, env: dict | None = None, cwd: Path = REPO) -> subprocess.CompletedProcess:
    return subprocess.run([*command(), *args], capture_output=True, text=True, encoding="utf-8",
                          cwd=cwd, env={**os.environ, **(env or {})})


def run_on_terminal(*args: str, env: dict) -> tuple[str, str, int]:
    """Run with stdout and stderr each on its own pseudo-terminal; returns what each showed."""
    out_m, out_s = pty.openpty()
    err_m, err_s = pty.openpty()
    proc = subprocess.Popen([*command(), *args], stdout=out_s, stderr=err_s, stdin=subprocess.DEVNULL,
                            cwd=REPO, env={**os.environ, **env})
    os.close(out_s)
    os.close(err_s)
    got = {out_m: b"", err_m: b""}
    open_fds = [out_m, err_m]
    while open_fds:
        ready, _, _ = select.select(open_fds, [], [], 60)
        if not ready:
            proc.kill()
            raise AssertionError("the command wrote nothing for 60 s")
        for fd in ready:
            try:
                chunk = os.read(fd, 65536)
            except OSError:  # the other side closed: Linux reports EIO
                chunk = b""
            if chunk:
                got[fd] += chunk
            else:
                open_fds.remove(fd)
                os.close(fd)
    code = proc.wait()
    return got[out_m].decode(), got[err_m].decode(), code


def test_every_builtin_format_is_registered_and_resolves_to_its_module() -> None:
    formats = load_formats()
    assert formats.broken == []
    assert {name for name, (origin, _) in formats.entries.items()
            if origin.startswith("packwarden:")} == {"text", "json", "sarif", "junit", "markdown",
                                                     "html"}
    modules = {"json": "json_format"}
    for name in ("text", "json", "sarif", "junit", "markdown", "html"):
        render = formatter(name)
        assert render is formats.load(name)
        assert render.__module__ == f"packwarden.report.{modules.get(name, name)}"
    # the HTML report's charts read the models, so the command lints in one process for it
    assert formatter("html").needs_models and not hasattr(formatter("json"), "needs_models")


def test_an_unavailable_or_unknown_format_is_one_line() -> None:
    missing = EntryPoint("html", "packwarden.report.no_such_module:render", FORMAT_GROUP)
    formats = FormatRegistry({"html": ("packwarden:html", missing)}, [])
    with pytest.raises(FormatUnavailable) as err:
        formats.load("html")
    assert str(err.value) == ("output format 'html' (packwarden:html) failed to load: "
                              "ModuleNotFoundError: No module named 'packwarden.report.no_such_module'")
    with pytest.raises(FormatUnavailable) as err:
        load_formats().load("jsn")
    assert str(err.value).startswith("unknown output format 'jsn' (did you mean 'json'?); "
                                     "registered formats: html, json, ")
    code = run("check", "--format", "jsn", str(CLEAN))
    assert code.returncode == 2 and code.stdout == ""
    assert code.stderr.splitlines() == [f"packwarden check: {err.value}"]


@pytest.mark.parametrize("fmt", ["json", "sarif", "junit", "markdown"])
def test_machine_formats_are_never_coloured(fmt: str) -> None:
    out, err, code = run_on_terminal("check", "--format", fmt, str(CLEAN), *map(str, FLAWED),
                                     env={"NO_COLOR": ""})
    assert code == 1
    assert ESC not in out
    if fmt in ("json", "sarif"):
        json.loads(out.replace("\r\n", "\n"))


def test_text_is_coloured_on_a_terminal_unless_no_color() -> None:
    flawed = str(FLAWED[0])
    out, _, _ = run_on_terminal("check", flawed, env={"NO_COLOR": ""})  # empty: not set
    assert f"{ESC}31merror{ESC}0m" in out
    out, _, _ = run_on_terminal("check", flawed, env={"NO_COLOR": "1"})
    assert ESC not in out and " error " in out
    proc = run("check", flawed, env={"NO_COLOR": ""})  # a pipe is not a terminal
    assert ESC not in proc.stdout


def test_progress_bar_on_a_terminal_for_batches_only(tmp_path: Path) -> None:
    _, err, code = run_on_terminal("check", str(EXAMPLES), env={"NO_COLOR": "1"})
    assert code == 1
    n = len([p for p in EXAMPLES.rglob("*.yaml") if "format: packwarden/1" in p.read_text()])
    assert f"] {n}/{n} " in err and "\r" in err and "#" in err
    assert ESC not in err  # no escape sequences, only carriage returns
    _, err, _ = run_on_terminal("check", str(CLEAN), env={})  # one design: no bar
    assert "] 1/1" not in err
    _, err, _ = run_on_terminal("check", "--quiet", str(EXAMPLES), env={})
    assert f"/{n} " not in err
    proc = run("check", str(EXAMPLES))  # stderr a pipe: no bar
    assert f"/{n} " not in proc.stderr


def test_progress_unit() -> None:
    class Tty(io.StringIO):
        def isatty(self) -> bool:
            return True

    assert progress_for(io.StringIO()) is None
    assert progress_for(Tty(), quiet=True) is None
    stream = Tty()
    bar = progress_for(stream)
    assert isinstance(bar, Progress)
    bar.width = 40
    bar(1, 4, "designs/a-very-long-folder-name/probe.yaml")
    bar(4, 4, "b.yaml")
    bar.close()
    text = stream.getvalue()
    frames = text.split("\r")
    assert frames[1].startswith("[#####...............] 1/4 …") and len(frames[1]) <= 40
    assert frames[2].startswith("[####################] 4/4 b.yaml")
    assert frames[-1] == "" and frames[-2].strip() == ""  # the line is wiped at the end
    silent = Tty()
    one = Progress(silent)
    one(1, 1, "x.yaml")
    one.close()
    assert silent.getvalue() == ""


def test_output_file_and_quiet(tmp_path: Path) -> None:
    target = tmp_path / "report.sarif"
    proc = run("check", "--format", "sarif", "--output", str(target), str(CLEAN), str(FLAWED[0]))
    assert proc.returncode == 1 and proc.stdout == ""
    assert json.loads(target.read_text(encoding="utf-8"))["version"] == "2.1.0"
    proc = run("check", "--output", str(tmp_path / "missing" / "dir" / "r.txt"), str(CLEAN))
    assert proc.returncode == 2 and "Traceback" not in proc.stderr
    assert proc.stderr.endswith(": cannot write the report: No such file or directory\n")
    proc = run("check", "--quiet", str(CLEAN))
    assert proc.returncode == 0 and proc.stdout.strip() == ""


def test_designs_only_skips_libraries_and_other_yaml(tmp_path: Path) -> None:
    other = tmp_path / "ci.yml"
    other.write_text("jobs: {}\n", encoding="utf-8")
    lib = EXAMPLES / "parts" / "orchard-parts.yaml"
    proc = run("check", str(lib), str(other), str(CLEAN))
    assert proc.returncode == 2  # named directly, a library is read as a design and fails
    proc = run("check", "--designs-only", str(lib), str(other), str(CLEAN))
    assert proc.returncode == 0, proc.stdout
    assert "1 design(s) linted" in proc.stdout
    proc = run("check", "--designs-only", str(FLAWED[0]), str(tmp_path / "gone.yaml"))
    assert proc.returncode == 2  # a file that does not exist is still reported
