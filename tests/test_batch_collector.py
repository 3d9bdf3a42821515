"""A batch runs with the cycle collector paused (issue 19) and leaves it as it found it; the cycles
its designs make are still collected, after every COLLECT_EVERY designs."""

from __future__ import annotations

import gc
from pathlib import Path

import pytest

from packwarden import batch
from packwarden.engine import lint

REPO = Path(__file__).resolve().parent.parent
ORCHARD = REPO / "example_designs" / "orchard-probe.yaml"


@pytest.mark.parametrize("enabled", [True, False])
def test_a_batch_leaves_the_collector_as_it_found_it(enabled):
    was = gc.isenabled()
    try:
        (gc.enable if enabled else gc.disable)()
        run = lint([str(ORCHARD)] * 3, jobs=1)
        assert gc.isenabled() is enabled
        assert len(run.designs) == 3 and all(d.linted for d in run.designs)
    finally:
        (gc.enable if was else gc.disable)()


def test_the_young_generation_is_collected_during_a_batch(monkeypatch):
    collected = []
    real = gc.collect
    monkeypatch.setattr(batch, "COLLECT_EVERY", 2)
    monkeypatch.setattr(batch.gc, "collect", lambda generation=2: collected.append(generation)
                        or real(generation))
    lint([str(ORCHARD)] * 5, jobs=1)
    assert collected == [0, 0]
