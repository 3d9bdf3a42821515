"""Reading the files of a run: regular files only, inside their repository, and bounded.

Designs, libraries, policies, configs and baselines come from checkouts anyone can push to. A
named pipe never ends (or never starts), ``/dev/zero`` never ends, a socket is no file at all, and
a link can point anywhere on the machine. So a path is resolved and judged before anything is
opened: it must be a regular file (links followed), and where confinement applies its target must
lie inside the repository. The file is then opened without blocking and read up to a limit; what a
refused file holds is never read, so no message can show any of it.
"""

from __future__ import annotations

import os
import re
import stat
from pathlib import Path


class Refused(Exception):
    """A path that is not read; ``message`` says why, fit to follow ``file:line:column:``."""

    def __init__(self, message: str) -> None:
        super().__init__(message)
        self.message = message


_KINDS = ((stat.S_ISFIFO, "a FIFO (named pipe)"), (stat.S_ISCHR, "a character device"),
          (stat.S_ISBLK, "a block device"), (stat.S_ISSOCK, "a socket"))


def _not_regular(mode: int) -> str:
    if stat.S_ISDIR(mode):
        return "is a directory"
    kind = next((name for test, name in _KINDS if test(mode)), "not a regular file")
    return f"is {kind}, not a regular file; only regular files are read"


#: A control byte below U+0020, or DEL, anywhere in a path.
_CONTROL = re.compile("[\x00-\x1f\x7f]")

#: Longest file name, and longest path, the common file systems and Linux hold (NAME_MAX, PATH_MAX).
NAME_MAX, PATH_MAX = 255, 4096


def check_path(path: Path) -> None:
    """Raise :class:`Refused` for a path no file system can hold (a NUL or other control byte
    below U+0020 is not something a person names a file with, and the OS refuses NUL; a name
    longer than NAME_MAX bytes makes the OS refuse the path)."""
    text = str(path)
    bad = _CONTROL.search(text)
    if bad is not None:
        raise Refused(f"the path holds the control character U+{ord(bad.group()):04X}; name the "
                      f"file with printable characters")
    size = len(text.encode("utf-8", errors="surrogateescape"))
    # no name is longer than the whole path: its names are measured only when that is long
    longest = size if size <= NAME_MAX else max(
        (len(p.encode("utf-8", errors="surrogateescape")) for p in path.parts), default=0)
    if size > PATH_MAX or longest > NAME_MAX:
        raise Refused(f"the path is longer than a file system holds ({longest} bytes in one name, "
                      f"{size} in all; at most {NAME_MAX} and {PATH_MAX})")


def regular(path: Path) -> os.stat_result:
    """The status of the regular file at ``path`` (links followed), or :class:`Refused`."""
    check_path(path)
    try:
        st = os.stat(path)
    except FileNotFoundError:
        raise Refused("no such file") from None
    except OSError as exc:
        raise Refused(f"cannot read file: {exc.strerror or exc}") from None
    if not stat.S_ISREG(st.st_mode):
        raise Refused(_not_regular(st.st_mode))
    return st


def read_limited(path: Path, limit: int) -> bytes:
    """The bytes of the regular file at ``path``, refused when larger than ``limit``.

    Opened without blocking (a file swapped for a pipe after the check cannot hang the run) and
    checked again on the open descriptor; at most ``limit`` + 1 bytes are ever read.
    """
    st = regular(path)
    if st.st_size > limit:
        raise Refused(f"file is {st.st_size} bytes; the limit is {limit} bytes")
    data = _read(path, limit + 1)
    if len(data) > limit:  # grew since it was measured
        raise Refused(f"file is more than {limit} bytes; the limit is {limit} bytes")
    return data


def _read(path: Path, most: int) -> bytes:
    flags = os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_NOCTTY", 0) \
        | getattr(os, "O_CLOEXEC", 0)
    try:
        fd = os.open(path, flags)
    except OSError as exc:
        raise Refused(f"cannot read file: {exc.strerror or exc}") from None
    try:
        mode = os.fstat(fd).st_mode
        if not stat.S_ISREG(mode):
            raise Refused(_not_regular(mode))
        chunks, size = [], 0
        while size < most:
            chunk = os.read(fd, min(1 << 20, most - size))
            if not chunk:
                break
            chunks.append(chunk)
            size += len(chunk)
    except OSError as exc:
        raise Refused(f"cannot read file: {exc.strerror or exc}") from None
    finally:
        os.close(fd)
    return b"".join(chunks)


def outside(path: Path, root: Path, resolved_root: Path | None = None) -> bool:
    """Whether ``path``, links resolved, lies outside ``root`` (a link loop counts as outside:
    there is nothing to read there). ``resolved_root``: ``root`` already resolved."""
    return resolved_inside(path, root, resolved_root) is None


def resolved_inside(path: Path, root: Path, resolved_root: Path | None = None) -> Path | None:
    """``path`` with its links resolved when that lies inside ``root``, else None (outside, or a
    link loop). ``resolved_root``: ``root`` already resolved."""
    try:
        resolved = path.resolve()
        resolved.relative_to(resolved_root or root.resolve())
    except (ValueError, OSError, RuntimeError):
        return None
    return resolved


def head(path: Path, root: Path, size: int = 4096, resolved_root: Path | None = None) -> str | None:
    """The first ``size`` bytes of a regular file inside ``root``, as text, for telling designs
    from other YAML; None when it is not read (not a regular file, or a link out of ``root``):
    the caller passes it on to the lint, which reports why. ``resolved_root``: ``root``
    already resolved (discovery resolves each root once, not once per file)."""
    try:
        check_path(path)
        if outside(path, root, resolved_root):
            return None
        regular(path)
        return _read(path, size).decode("utf-8", errors="replace")
    except Refused:
        return None
