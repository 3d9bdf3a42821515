"""Identical bytes across runs and across hash seeds.

Python randomises string hashing per process, so anything that iterates a set of names (nets,
rule ids, part names) can reorder a report between two CI runs of the same commit. The installed
command is run over every example design with two fixed seeds and with the seed left random; the
outputs must match byte for byte.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from packwarden.report import load_formats

REPO = Path(__file__).resolve().parent.parent
SEEDS = ("0", "12345", "random")


def _command() -> str:
    found = shutil.which("packwarden", path=str(Path(sys.executable).parent))
    if found is None:
        pytest.skip(f"no packwarden script next to {sys.executable}; install the package first")
    return found


def _run(fmt: str, seed: str, *paths: str) -> subprocess.CompletedProcess:
    env = {k: v for k, v in os.environ.items() if k not in ("PYTHONPATH", "PYTHONHASHSEED")}
    env.update(NO_COLOR="1", PYTHONHASHSEED=seed)
    return subprocess.run([_command(), "check", "--format", fmt, *paths], cwd=REPO, env=env,
                          capture_output=True)


@pytest.mark.parametrize("fmt", load_formats().names())
def test_reports_are_identical_across_hash_seeds(fmt: str) -> None:
    # text and JSON, the formats scripts diff, also against a random seed; every format against two
    seeds = SEEDS if fmt in ("text", "json") else SEEDS[:2]
    runs = {seed: _run(fmt, seed, "example_designs") for seed in seeds}
    first = runs["0"]
    assert first.stdout, first.stderr
    # the examples hold flawed designs: the report must have findings to be ordered at all
    assert first.returncode == 1, first.stdout[-500:] + first.stderr[-500:]
    for seed, proc in runs.items():
        assert proc.returncode == first.returncode, seed
        assert proc.stdout == first.stdout, f"PYTHONHASHSEED={seed} changed the {fmt} report"


def test_reports_are_identical_across_runs_and_argument_order() -> None:
    # Designs named one by one, in two orders: the report follows the order given, and each
    # design's own block is the same bytes wherever it appears.
    flawed = sorted(str(p.relative_to(REPO)) for p in (REPO / "example_designs" / "flawed").glob("*.yaml"))
    assert len(flawed) >= 2
    one = _run("json", "random", *flawed).stdout
    again = _run("json", "random", *flawed).stdout
    assert one == again
    import json
    forward = {d["file"]: d for d in json.loads(one)["designs"]}
    backward = {d["file"]: d for d in json.loads(_run("json", "random", *reversed(flawed)).stdout)["designs"]}
    assert forward == backward
