"""A path no file system can hold is refused before it is opened (``files.check_path``): a
control byte below U+0020 or DEL in it (POSIX leaves only NUL and '/' out of a file name [from
memory]; packwarden refuses every C0 control and DEL as no name a person gives), or a name longer
than NAME_MAX bytes, or a path longer than PATH_MAX (255 and 4096 in Linux's limits.h [from
memory])."""

from __future__ import annotations

from pathlib import Path

import pytest
from hypothesis import given, settings, strategies as st

from packwarden.files import NAME_MAX, PATH_MAX, Refused, check_path

_PIECES = st.sampled_from(["a", "é", "/", "x" * 100, "€" * 50, "\x00", "\x01", "\t", "\n", "\x1f",
                           "\x7f", " ", ".", "\u200b"])


@settings(max_examples=400, deadline=None)
@given(st.lists(_PIECES, min_size=1, max_size=12).map("".join))
def test_refused_exactly_when_a_file_system_cannot_hold_it(text: str) -> None:
    path = Path(text)
    shown = str(path)
    control = [c for c in shown if ord(c) < 0x20 or ord(c) == 0x7F]
    names = [len(p.encode("utf-8", errors="surrogateescape")) for p in path.parts]
    too_long = (len(shown.encode("utf-8", errors="surrogateescape")) > PATH_MAX
                or max(names, default=0) > NAME_MAX)
    if control:
        with pytest.raises(Refused, match=f"control character U\\+{ord(control[0]):04X}"):
            check_path(path)
    elif too_long:
        with pytest.raises(Refused, match=f"{max(names)} bytes in one name"):
            check_path(path)
    else:
        check_path(path)
