"""Paths of the designs the report tests lint (imported by conftest.py and the tests)."""

from __future__ import annotations

from pathlib import Path

REPO = Path(__file__).resolve().parents[2]
EXAMPLES = REPO / "example_designs"
CLEAN = EXAMPLES / "orchard-probe.yaml"
FLAWED = sorted((EXAMPLES / "flawed").glob("*.yaml"))
WAIVED = REPO / "tests/rules/designs/waiver-hygiene/in-use.yaml"     # two waived findings
UNUSED_WAIVER = REPO / "tests/rules/designs/waiver-hygiene/unused.yaml"  # a warning
