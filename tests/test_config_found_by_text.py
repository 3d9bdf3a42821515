"""The project config is found by what its file says (issue 19): the language server looks for it
at every re-lint, and the answer for a pyproject.toml is kept by the file's text, so a file that
changes within the file system's time resolution is still read as written. The table spellings
are those the TOML specification makes equal [published: TOML v1.0.0, "Table" and "Keys"].
"""

from __future__ import annotations

import os

import pytest
from hypothesis import given, settings, strategies as st

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


# A config of only comments and blank lines (a packwarden.toml that marks a repository's root) is
# read without importing the TOML reader; what it reads must be what tomllib reads, errors
# included: control characters in a comment, a lone carriage return, a byte-order mark
# [published: TOML v1.0.0, "Comment": control characters other than tab are not permitted].
_COMMENT_CHARS = st.sampled_from(["a", " ", "\t", "#", "é", "\x00", "\x01", "\x1f", "\x7f", "\r",
                                  "=", "[", "\ufeff", "x = 1"])
_LINES = st.lists(st.tuples(st.sampled_from(["", " ", "\t", "  \t", "\ufeff"]),
                            st.sampled_from(["", "#", "# ", "x", "[t]"]),
                            st.lists(_COMMENT_CHARS, max_size=4).map("".join),
                            st.sampled_from(["\n", "\r\n"])),
                  max_size=5)


@settings(max_examples=400, deadline=None)
@given(_LINES)
def test_a_comment_only_config_reads_as_tomllib_reads_it(lines):
    tomllib = config._toml()
    text = "".join(a + b + c + end for a, b, c, end in lines)

    def outcome(read):
        try:
            return "ok", read(text)
        except tomllib.TOMLDecodeError:
            return "error", None
    assert outcome(config._loads) == outcome(tomllib.loads), repr(text)
