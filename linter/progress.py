"""A progress bar for batches, drawn on a terminal only.

It writes to stderr, so reports on stdout or in ``--output`` files never contain it, and only when
stderr is a terminal: CI logs and pipes get no carriage-return noise. It uses no colour and no
escape sequences (``NO_COLOR`` has nothing to switch off), and a run of one design draws nothing.
"""

from __future__ import annotations

from typing import TextIO


class Progress:
    """``progress(done, total, file)`` callback for ``engine.lint``; ``close()`` wipes the line."""

    def __init__(self, stream: TextIO, width: int | None = None):
        self.stream = stream
        self.width = width
        self.drawn = 0  # characters on the line now

    def __call__(self, done: int, total: int, file: str) -> None:
        if total < 2:
            return
        columns = self.width or _terminal_columns()
        bar_len = 20
        filled = bar_len * done // total
        head = f"[{'#' * filled}{'.' * (bar_len - filled)}] {done}/{total} "
        room = max(columns - len(head) - 1, 0)
        name = file if len(file) <= room else "…" + file[len(file) - room + 1:] if room > 1 else ""
        line = head + name
        self.stream.write("\r" + line + " " * max(self.drawn - len(line), 0))
        self.stream.flush()
        self.drawn = len(line)

    def close(self) -> None:
        if self.drawn:
            self.stream.write("\r" + " " * self.drawn + "\r")
            self.stream.flush()
            self.drawn = 0


def _terminal_columns() -> int:
    # imported when a bar is drawn: shutil brings in the compression modules (lzma, bz2), about
    # 6 ms of every start, and a check of one design draws no bar
    import shutil
    return shutil.get_terminal_size((80, 24)).columns


def progress_for(stream: TextIO, quiet: bool = False) -> Progress | None:
    """A bar on ``stream`` when it is a terminal and the run is not ``--quiet``, else None."""
    if quiet:
        return None
    try:
        tty = stream.isatty()
    except (AttributeError, ValueError):
        return None
    return Progress(stream) if tty else None
