"""Runs shared by the report tests: the example designs, clean and flawed, plus waivers and bad input."""

from __future__ import annotations

import shutil
from pathlib import Path

import pytest

from packwarden.engine import lint

from report_data import CLEAN, EXAMPLES, FLAWED, UNUSED_WAIVER, WAIVED


@pytest.fixture(scope="session")
def example_run():
    """The clean example, every one-flaw example, a design with waived findings and one with an
    unused waiver (a warning), linted together as CI would lint a repository."""
    assert FLAWED, "no flawed example designs found"
    return lint([str(CLEAN), *map(str, FLAWED), str(WAIVED), str(UNUSED_WAIVER)])


@pytest.fixture()
def broken_design(tmp_path: Path) -> Path:
    """A copy of the clean example inside its own checkout, with a value missing its unit."""
    (tmp_path / ".git").mkdir()
    shutil.copytree(EXAMPLES / "parts", tmp_path / "parts")
    text = CLEAN.read_text(encoding="utf-8").replace("continuous: 1.2 A", "continuous: 1.2")
    assert "continuous: 1.2\n" in text
    path = tmp_path / "broken.yaml"
    path.write_text(text, encoding="utf-8")
    return path
