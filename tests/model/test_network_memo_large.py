"""Large networks' solves remembered apart (issue 19): a network above ``SOLVED_MAX_BRANCHES``
goes to a store bounded by the branches it holds, never pushes a small network's solve out, and
its remembered solution is the one a fresh solve gives, bit for bit; the figures agree with
Thevenin's equivalent of identical sources in parallel, computed here independently.
"""

from __future__ import annotations

import pytest

from packwarden.model import network
from packwarden.model.network import Network


def bank(cells: int, load: float = 0.5, emf: float = 3.6, r_cell: float = 0.03) -> Network:
    """``cells`` identical cells, each behind its own fuse, in parallel into one load."""
    net = Network()
    for k in range(cells):
        net.add_source(f"CELL{k}", f"C{k}", "B-", emf, r_cell)
        net.add_resistor(f"F{k}", f"C{k}", "P+", 0.002)
    net.add_resistor("LOAD", "P+", "B-", load)
    return net


@pytest.fixture(autouse=True)
def forgotten():
    def clear():
        network._SOLVED.clear()
        network._SOLVED_LARGE.clear()
        network._SOLVED_LARGE_HELD[0] = 0
    clear()
    yield
    clear()


def test_a_large_network_is_remembered_bit_for_bit_and_agrees_with_thevenin():
    cells = 100  # 201 branches, above SOLVED_MAX_BRANCHES
    assert 2 * cells + 1 > network.SOLVED_MAX_BRANCHES
    first = bank(cells).solve("B-")
    assert bank(cells).solve("B-") is first
    assert not network._SOLVED and len(network._SOLVED_LARGE) == 1
    network._SOLVED_LARGE.clear()
    network._SOLVED_LARGE_HELD[0] = 0
    assert repr(bank(cells).solve("B-")) == repr(first)  # every float to the last bit
    # N equal sources E behind r in parallel are one source E behind r/N [published: Thevenin's
    # theorem, any circuits textbook]; each branch here is the cell's 0.03 ohm plus its 0.002 fuse.
    r_branch = 0.03 + 0.002
    i_load = 3.6 / (0.5 + r_branch / cells)
    assert first.current("LOAD") == pytest.approx(i_load, rel=1e-12)
    assert first.current("F7") == pytest.approx(i_load / cells, rel=1e-12)


def test_another_value_in_a_large_network_is_solved_afresh():
    first = bank(100).solve("B-")
    other = bank(100, load=0.6).solve("B-")
    assert other is not first
    assert other.current("LOAD") == pytest.approx(3.6 / (0.6 + 0.032 / 100), rel=1e-12)


def test_the_large_store_is_bounded_by_branches_and_spares_the_small_one(monkeypatch):
    monkeypatch.setattr(network, "SOLVED_LARGE_BRANCHES", 1000)
    small = Network()
    small.add_source("CELL", "B+", "B-", 4.0, 0.02)
    small.add_resistor("LOAD", "B+", "B-", 1.0)
    kept = small.solve("B-")
    for k in range(12):  # 201 branches each: at most four fit in 1000
        bank(100, load=0.5 + k / 100).solve("B-")
    assert len(network._SOLVED_LARGE) == 4
    assert network._SOLVED_LARGE_HELD[0] == 4 * 201
    assert sum(len(key[3]) for key in network._SOLVED_LARGE) == 4 * 201
    assert small.solve("B-") is kept


def test_a_network_above_the_whole_bound_is_solved_afresh(monkeypatch):
    monkeypatch.setattr(network, "SOLVED_LARGE_BRANCHES", 150)
    first = bank(100).solve("B-")
    again = bank(100).solve("B-")
    assert again is not first and repr(again) == repr(first)
    assert not network._SOLVED_LARGE
