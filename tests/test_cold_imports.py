"""What a plain ``packwarden check`` of one design imports, once the entry points are cached.

DEVELOPERS.md "Speed": a cold check pays for every module it imports. These are modules a check
of one design to text does not use: ``importlib.metadata`` (and ``email``, ``zipfile``, ``csv``
behind it; the entry points come from the cache and pydantic's plugin look-up is off) and
``shutil`` (and ``lzma``, ``bz2`` behind it; only the progress bar of a batch on a terminal
asks for the terminal's width). The reference is the interpreter's own record of the imports,
``python -X importtime``.
"""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

REPO = Path(__file__).resolve().parent.parent
DESIGN = "example_designs/orchard-probe.yaml"
UNUSED = {"importlib.metadata", "email", "zipfile", "csv", "shutil", "lzma", "bz2"}


def imported_by_a_check(cache: Path) -> set[str]:
    script = Path(sys.executable).with_name("packwarden")
    env = {**os.environ, "PACKWARDEN_CACHE_DIR": str(cache), "NO_COLOR": "1"}
    env.pop("PYDANTIC_DISABLE_PLUGINS", None)
    p = subprocess.run([sys.executable, "-X", "importtime", str(script), "check", DESIGN],
                       capture_output=True, text=True, cwd=REPO, env=env)
    assert p.returncode == 0, p.stderr[-2000:]
    return {line.split("|")[-1].strip() for line in p.stderr.splitlines()
            if line.startswith("import time:")}


def test_a_check_from_the_cache_imports_none_of_what_it_does_not_use(tmp_path: Path) -> None:
    first = imported_by_a_check(tmp_path)   # writes the entry-point cache
    assert "importlib.metadata" in first    # read from the installed distributions
    second = imported_by_a_check(tmp_path)
    assert "packwarden.checking" in second
    assert not {m for m in second if m in UNUSED or m.split(".")[0] in UNUSED}
