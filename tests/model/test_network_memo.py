"""Solves remembered by their values (issue 19): a network solved again with the same values gives
the remembered solution, and any change of a value, a name, a switch state or the ground gives a
solve of its own, still agreeing with ngspice (an independent simulator) and Ohm's law.
"""

from __future__ import annotations

import pytest

from packwarden.model import network
from packwarden.model.network import Network
from tests.model import spice


def chain(load: float = 2.2, *, load_name: str = "LOAD", switch_on: bool = True,
          emf: float = 4.1) -> Network:
    """A cell, a fuse, a switch with its body diode and a load, in one loop."""
    net = Network()
    net.add_source("CELL", "B+", "B-", emf, 0.018)
    net.add_resistor("F1", "B+", "N1", 0.004)
    net.add_switch("Q1", "N1", "P+", 0.0025, switch_on, ("P+", "N1"), v_forward=0.7, r_on=0.01)
    net.add_resistor(load_name, "P+", "B-", load)
    return net


@pytest.fixture(autouse=True)
def forgotten():
    network._SOLVED.clear()
    yield
    network._SOLVED.clear()


def test_the_same_values_give_the_remembered_solution_bit_for_bit():
    first = chain().solve("B-")
    again = chain().solve("B-")
    assert again is first
    network._SOLVED.clear()
    fresh = chain().solve("B-")
    assert fresh is not first
    assert repr(fresh) == repr(first)  # every float to the last bit
    # Ohm's law around the loop [published: Kirchhoff's voltage law]
    assert first.current("LOAD") == pytest.approx(4.1 / (0.018 + 0.004 + 0.0025 + 2.2), rel=1e-12)


@pytest.mark.parametrize("other", [
    dict(load=2.3), dict(load_name="RLOAD"), dict(switch_on=False), dict(emf=3.9)])
def test_any_other_value_is_solved_afresh_and_agrees_with_ngspice(other):
    chain().solve("B-")
    net = chain(**other)
    ours = net.solve("B-")
    theirs = spice.simulate(net, "B-", diode="pwl")
    for br in net.branches:
        assert ours.current(br.name) == pytest.approx(theirs.currents[br.name], rel=1e-7, abs=1e-9)
    for n in net.nets:
        assert ours.voltage(n) == pytest.approx(theirs.voltages[n], rel=1e-7, abs=1e-9)


def test_another_ground_is_another_solve():
    net = chain()
    at_minus, at_plus = net.solve("B-"), net.solve("B+")
    assert at_minus.ground == "B-" and at_plus.ground == "B+"
    assert at_plus.voltage("B-") == pytest.approx(-at_minus.voltage("B+"), rel=1e-12)


def test_a_negative_zero_emf_is_never_taken_for_a_positive_one():
    positive = chain(emf=0.0).solve("B-")
    negative = chain(emf=-0.0).solve("B-")
    assert negative is not positive
    network._SOLVED.clear()
    assert repr(chain(emf=-0.0).solve("B-")) == repr(negative)


def test_the_memory_is_bounded():
    for k in range(network.SOLVED_MAX + 20):
        chain(load=1.0 + k / 1000).solve("B-")
    assert len(network._SOLVED) == network.SOLVED_MAX


def test_a_network_above_the_size_bound_is_solved_afresh(monkeypatch):
    monkeypatch.setattr(network, "SOLVED_MAX_BRANCHES", 3)
    monkeypatch.setattr(network, "SOLVED_LARGE_BRANCHES", 3)
    first = chain().solve("B-")
    again = chain().solve("B-")
    assert again is not first and repr(again) == repr(first)
    assert not network._SOLVED
