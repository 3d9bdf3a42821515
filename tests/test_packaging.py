"""What an install of packwarden ships besides code: the PEP 561 marker that makes it typed.

PEP 561 (Distributing and Packaging Type Information): a package that ships inline annotations
says so with a ``py.typed`` file in the package; without it, type checkers treat the installed
package as untyped and a team's rule package gets no checking against ``packwarden``'s API.
"""

from __future__ import annotations

import shutil
import subprocess
import sys
import zipfile
from importlib import resources
from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parent.parent
TYPED = ("packwarden", "packwarden_rules")


@pytest.mark.parametrize("package", TYPED)
def test_the_installed_package_has_its_py_typed_marker(package: str) -> None:
    # what a type checker looks up in the environment running the suite (an editable install)
    assert resources.files(package).joinpath("py.typed").is_file()


def test_a_built_wheel_ships_the_py_typed_markers(tmp_path: Path) -> None:
    # An editable install reads the source folders; only a built wheel shows that the build takes
    # the markers along (pyproject.toml lists them as package-data; setuptools 69 and later also
    # add py.typed files by themselves [memory]).
    source = tmp_path / "src"
    source.mkdir()
    for name in ("pyproject.toml", "README.md"):
        shutil.copy(REPO / name, source / name)
    for folder in ("linter", "rules"):
        shutil.copytree(REPO / folder, source / folder,
                        ignore=shutil.ignore_patterns("__pycache__", "*.pyc"))
    out = tmp_path / "wheel"
    proc = subprocess.run([sys.executable, "-m", "pip", "wheel", "--quiet", "--no-deps",
                           "--no-input", "--disable-pip-version-check", "-w", str(out),
                           str(source)], capture_output=True, text=True)
    assert proc.returncode == 0, proc.stdout + proc.stderr
    [wheel] = out.glob("packwarden-*.whl")
    names = set(zipfile.ZipFile(wheel).namelist())
    assert {f"{package}/py.typed" for package in TYPED} <= names
