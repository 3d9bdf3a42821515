"""A cell stack's network kept between lints (issue 19): the kept network is the one the cells
would build, its solve agrees bit for bit with a fresh one and with Kirchhoff's voltage law
computed here independently, and other cells, EMFs or resistances get a stack of their own.
"""

from __future__ import annotations

from types import SimpleNamespace

import pytest

from packwarden.model import path
from packwarden.model.network import Network


def cells(series: int, parallel: int) -> list:
    """A stack of ``series`` groups of ``parallel`` cells, B0 (bottom) to B{series}."""
    return [SimpleNamespace(refdes=f"BT{s}_{p}", pins={"pos": f"B{s + 1}", "neg": f"B{s}"})
            for s in range(series) for p in range(parallel)]


@pytest.fixture(autouse=True)
def forgotten():
    path._STACKS.clear()
    yield
    path._STACKS.clear()


def solve_with_load(stack: Network, series: int, load: float):
    net = stack.copy()
    net.add_resistor("(load)", f"B{series}", "B0", load)
    return net.solve("B0")


def test_the_kept_stack_solves_bit_for_bit_and_agrees_with_kirchhoff():
    group = cells(4, 3)
    first = path.cell_stack(group, 3.6, 0.03)
    assert path.cell_stack(cells(4, 3), 3.6, 0.03) is first
    kept = solve_with_load(first, 4, 2.0)
    path._STACKS.clear()
    fresh = solve_with_load(path.cell_stack(group, 3.6, 0.03), 4, 2.0)
    assert repr(kept) == repr(fresh)  # every float to the last bit
    # four groups of three equal cells in series: EMF 4 x 3.6 V behind 4 x 0.03/3 ohm
    # [published: Kirchhoff's voltage law; parallel resistances]
    i = 4 * 3.6 / (2.0 + 4 * 0.03 / 3)
    assert kept.current("(load)") == pytest.approx(i, rel=1e-12)
    assert kept.voltage("B4") == pytest.approx(2.0 * i, rel=1e-12)


@pytest.mark.parametrize("base, other", [
    ((cells(4, 3), 3.6, 0.03), (cells(4, 2), 3.6, 0.03)),
    ((cells(4, 3), 3.6, 0.03), (cells(4, 3), 3.7, 0.03)),
    ((cells(4, 3), 3.6, 0.03), (cells(4, 3), 3.6, 0.04)),
    ((cells(4, 3), 0.0, 0.03), (cells(4, 3), -0.0, 0.03))])
def test_other_cells_or_values_build_their_own_stack(base, other):
    assert path.cell_stack(*other) is not path.cell_stack(*base)


def test_the_kept_stacks_are_bounded():
    for k in range(path.STACKS_MAX + 5):
        path.cell_stack(cells(2, 1), 3.0 + k / 100, 0.03)
    assert len(path._STACKS) == path.STACKS_MAX
