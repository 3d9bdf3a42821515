"""The project config is found by what its file says (issue 19): the language server looks for it
at every re-lint, and the answer for a pyproject.toml is kept by the file's text, so a file that
changes within the file system's time resolution is still read as written. The table spellings
are those the TOML specification makes equal [published: TOML v1.0.0, "Table" and "Keys"].
"""

from __future__ import annotations

import os

import pytest

from packwarden import config
from packwarden.config import find_config

SPELLINGS = [
    "[tool.packwarden]\nfail_on = \"warning\"\n",
    "[ tool.packwarden ]\nfail_on = \"warning\"\n",
    "[tool.\"packwarden\"]\nfail_on = \"warning\"\n",
    "[tool]\npackwarden.fail_on = \"warning\"\n",
]


@pytest.mark.parametrize("spelling", SPELLINGS)
def test_every_spelling_of_the_table_is_found_again_and_again(tmp_path, spelling):
    py = tmp_path / "pyproject.toml"
    py.write_text("[project]\nname = \"pack\"\n" + spelling, encoding="utf-8")
    assert find_config(tmp_path) == py.resolve()
    assert find_config(tmp_path) == py.resolve()


def test_a_change_the_file_time_cannot_tell_apart_is_read_as_written(tmp_path):
    py = tmp_path / "pyproject.toml"
    without = "[project]\nname = \"pack\"\n\n[tool.other]\nx = 1\n"
    py.write_text(without, encoding="utf-8")
    stamp = py.stat().st_mtime_ns
    assert find_config(tmp_path) is None
    py.write_text(without.replace("other", "packwarden"), encoding="utf-8")  # same size
    os.utime(py, ns=(stamp, stamp))  # and the same time
    assert find_config(tmp_path) == py.resolve()
    py.write_text(without, encoding="utf-8")
    os.utime(py, ns=(stamp, stamp))
    assert find_config(tmp_path) is None


def test_a_broken_file_naming_packwarden_still_counts_so_its_error_is_shown(tmp_path):
    py = tmp_path / "pyproject.toml"
    py.write_text("[tool.packwarden\nfail_on = 1\n", encoding="utf-8")
    assert find_config(tmp_path) == py.resolve()


def test_the_answers_kept_are_bounded(tmp_path):
    for k in range(100):
        folder = tmp_path / f"p{k}"
        folder.mkdir()
        (folder / "pyproject.toml").write_text(f"[project]\nname = \"p{k}\"\n", encoding="utf-8")
        find_config(folder)
    assert len(config._TABLE_IN_TEXT) <= 64
