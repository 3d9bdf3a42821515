"""A large pack's cells stamped once for all its solves (issue 19, scaling with component count):
a copy of a large network starts its solve from the original's stamped graph, and every voltage
and current comes out as a solve that stamps every branch again gives, bit for bit; the load
current agrees with Thevenin's equivalent of the stack, computed here independently.
"""

from __future__ import annotations

import pytest

from packwarden.model import network
from packwarden.model.network import Network
from tests.model.test_network_memo_large import forgotten  # noqa: F401  (no solve remembered)

SERIES, PARALLEL, FETS = 4, 30, 6
EMF, R_CELL, R_FET, R_LOAD = 3.6, 0.03, 0.004, 1.5


def stack() -> Network:
    """SERIES levels of PARALLEL identical cells: the original every solve is copied from."""
    levels = ["B-"] + [f"B{k}" for k in range(1, SERIES)] + ["B+"]
    net = Network()
    for level in range(SERIES):
        for k in range(PARALLEL):
            net.add_source(f"BT{level}_{k}", levels[level + 1], levels[level], EMF, R_CELL)
    return net


def pack(base: Network, ohms: list[float], charge_on: bool = True) -> Network:
    """The stack with FETS discharge and FETS charge channels in parallel on the positive rail
    (each with its body diode) and a load across the terminals."""
    net = base.copy()
    for k, r in enumerate(ohms):
        net.add_mosfet(f"QD{k}", drain="MID", source="B+", channel="p", ohms_on=r, on=True)
        net.add_mosfet(f"QC{k}", drain="MID", source="P+", channel="p", ohms_on=r, on=charge_on)
    net.add_resistor("LOAD", "P+", "B-", R_LOAD)
    return net


def fresh(net: Network, monkeypatch) -> network.Solution:
    """``net`` solved stamping every branch (the start from the original turned off)."""
    network._SOLVED.clear()
    network._SOLVED_LARGE.clear()
    network._SOLVED_LARGE_HELD[0] = 0
    with monkeypatch.context() as m:
        m.setattr(network, "STAMP_PREFIX_MIN", 10**9)
        return net.solve("B-")


@pytest.mark.parametrize("ohms, charge_on", [
    ([R_FET] * FETS, True),
    ([R_FET] * (FETS - 1) + [R_FET / 3], True),  # one channel at the low end of its spread
    ([R_FET * (1 + k / 7) for k in range(FETS)], True),
    ([R_FET] * FETS, False),  # charge channels off: the load runs through their body diodes
])
def test_a_copy_solved_from_the_stamped_cells_is_the_full_solve_bit_for_bit(ohms, charge_on,
                                                                            monkeypatch):
    assert SERIES * PARALLEL >= network.STAMP_PREFIX_MIN
    base = stack()
    stamped = pack(base, ohms, charge_on).solve("B-")
    assert base._stamped  # the cells were stamped on the original, once
    assert base._elements is not None  # and their elements and node pairs made once
    again = fresh(pack(stack(), ohms, charge_on), monkeypatch)
    assert repr(stamped) == repr(again)  # every voltage and current to the last bit


def test_the_stamped_cells_serve_every_copy_and_each_agrees_with_thevenin(monkeypatch):
    base = stack()
    for spread in (1.0, 0.5, 2.0):
        r = R_FET * spread
        sol = pack(base, [r] * FETS).solve("B-")
        assert repr(sol) == repr(fresh(pack(stack(), [r] * FETS), monkeypatch))
        # SERIES levels of PARALLEL equal sources E behind r are one source SERIES*E behind
        # SERIES*r/PARALLEL; FETS equal channels in parallel are R/FETS, two switches in series
        # [published: Thevenin's theorem and series/parallel resistance, any circuits textbook].
        i_load = SERIES * EMF / (R_LOAD + SERIES * R_CELL / PARALLEL + 2 * r / FETS)
        assert sol.current("LOAD") == pytest.approx(i_load, rel=1e-12)
        assert sol.current("BT2_7") == pytest.approx(-i_load / PARALLEL, rel=1e-12)
    assert len(base._stamped) == 1  # one set of reference nodes: stamped once for all three


def test_a_small_original_is_stamped_with_its_copy_as_before():
    small = Network()
    small.add_source("BT1", "B+", "B-", EMF, R_CELL)
    net = small.copy()
    net.add_resistor("LOAD", "B+", "B-", R_LOAD)
    sol = net.solve("B-")
    assert not small._stamped
    assert sol.current("LOAD") == pytest.approx(EMF / (R_LOAD + R_CELL), rel=1e-12)
