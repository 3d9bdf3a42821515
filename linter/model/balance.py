"""Cell balance in use: how far the levels of a series stack drift apart each charge cycle, against
what the balancer bleeds off the high ones.

Every level of a series stack carries the same load current, so the load itself never unbalances
it. What does is a drain that reaches only some levels:

* tap loads: any resistor, divider, LED or fuel-gauge input the netlist connects between taps
  (a divider from the second tap to the bottom drains only the two bottom levels), found with
  the storage model's solve of the stack (:func:`storage.level_drains`);
* the protector's cell inputs: the input of cell K draws its current (``cell_input_current``)
  from tap K and returns it through the ground pin, so it drains levels 1..K and the bottom
  level carries every input's current; its supply current, taken where the supply pin or its
  filter resistor meets the stack (the top, as a rule), drains every level below that point;
* self-discharge, which differs from cell to cell: a share (``self_discharge_spread``) of the
  cell's own rate, near full.

Over one cycle (``cycle_time``, charge to charge) a level falls behind the most drained one by the
difference of their drains times that time, plus the self-discharge spread. A passive balancer
bleeds a high cell through its resistor and the protector's switch at the cell voltage near full
for the balancing time of each charge (``balancing_time``) [derived: docs/references.md
"Balancing"]. It holds the stack where what it can bleed from each level is at least what that
level gains per cycle; otherwise the imbalance grows by the difference every cycle.

The imbalance shows when the charger holds the stack at its voltage: the charger fixes only the
sum of the cell voltages, so with one level high by an imbalance of charge the high cell sits above
the charger's voltage per cell by (N-1)/N of the open-circuit voltage that charge spans near full,
and the others below it by 1/N [derived]. One high level with every other at the lowest is the
worst pattern for the high cell, which is the one that meets the overcharge detection.

Amperes, ampere-hours, seconds, volts; a state of charge is a fraction 0..1.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from .events import SWITCH_ON_R
from .network import NetworkError
from .ocv import HOURS_PER_MONTH, OcvTable, ocv_table, soc_at_voltage, voltage_at_soc
from ..records import record
from .storage import DEFAULT_SELF_DISCHARGE, Drain, level_drains
from .support import balance_switches, supply_filter
from .values import ModelProblem, memo_key

if TYPE_CHECKING:  # pragma: no cover
    from .design import DesignModel

__all__ = ["LevelDrift", "CellBalance", "cell_balance", "bleed_currents", "charger_cells",
           "tap_loads"]

# Drains below this are solver rounding [derived: storage.py's own floor, a nanoampere].
_NOISE = 1e-9
_SECONDS_PER_HOUR = 3600.0


@record(frozen=True)
class LevelDrift:
    """One level of the stack (its cells in parallel) over one charge cycle."""

    level: int  # 1 = the bottom level
    cells: tuple[str, ...]
    drains: tuple[Drain, ...]  # what draws from this level alone or from it and others, highest
    drain: float  # amperes, every part at its highest
    bleed: float  # amperes through its bleed switch near full; 0 without one
    bleed_path: tuple[str, ...]  # the bleed resistor(s) on its balance pin
    need: float  # ampere-hours per cycle it gains on the most drained level
    removal: float  # ampere-hours per cycle the balancer bleeds from it

    @property
    def margin(self) -> float:
        return self.removal - self.need


@record(frozen=True)
class CellBalance:
    levels: tuple[LevelDrift, ...]
    capacity_ah: float  # of one level
    cycle_time: float  # seconds
    balancing_time: float  # seconds
    service_cycles: int
    self_discharge_pct: float  # %/month of the cell
    spread_current: float  # amperes of self-discharge one cell may lose more than another
    bleed_voltage: float  # the cell voltage the bleed currents are taken at
    worst: LevelDrift  # the level with the least margin
    #: ampere-hours the imbalance grows by each cycle (need - removal of the worst level); at or
    #: below zero the balancer holds the stack
    net_drift: float
    #: ampere-hours between the high level and the rest at the start of the balancing: one cycle's
    #: drift where the balancer holds, else the drift after ``service_cycles`` (at most full)
    imbalance: float
    table: OcvTable
    charger_per_cell: float | None  # the charger's highest voltage / N
    #: the high cell while the charger holds the stack there with the imbalance (at most the
    #: detection, where the protector ends the charge)
    high_cell_voltage: float | None
    low_cell_voltage: float | None
    detection_min: float  # the overcharge detection's lowest
    #: imbalance (Ah) at which the high cell reaches ``detection_min`` with the charger at its
    #: highest; None where no imbalance the OCV curve spans gets it there
    imbalance_to_detection: float | None
    #: cycles until the high cell reaches the detection; None when it never does
    cycles_to_detection: float | None
    #: amperes of drain difference the netlist and the parts make (without the spread assumption)
    design_drift: float
    #: the netlist's loads between taps (:func:`tap_loads`)
    tap_loads: tuple[tuple[tuple[str, ...], int, int], ...]
    assumptions: tuple[str, ...]

    @property
    def holds(self) -> bool:
        return self.net_drift <= 0.0

    @property
    def has_balancer(self) -> bool:
        return any(lv.bleed > 0.0 for lv in self.levels)

    @property
    def reaches_detection(self) -> bool:
        """The high cell meets the overcharge detection's minimum within the service life while
        the charger is within its range."""
        n = self.cycles_to_detection
        return n is not None and n <= self.service_cycles


def charger_cells(table: OcvTable, per_cell: float, series: int,
                  imbalance_soc: float) -> tuple[float, float]:
    """(high, low) cell voltage while a charger holds ``series`` cells at ``per_cell`` each on
    average, one cell ``imbalance_soc`` (a fraction of full) above the others near full.

    The open-circuit voltage the imbalance spans below full, dV = V(1) - V(1 - d), is shared so
    the sum stays the charger's: the high cell sits (N-1)/N·dV above the average, the others
    dV/N below it [derived].
    """
    d = min(max(imbalance_soc, 0.0), 1.0)
    dv = voltage_at_soc(table, 1.0) - voltage_at_soc(table, 1.0 - d)
    return per_cell + dv * (series - 1) / series, per_cell - dv / series


def _imbalance_to(table: OcvTable, per_cell: float, series: int, detect: float) -> float | None:
    """Imbalance (fraction of full) at which the high cell of :func:`charger_cells` reaches
    ``detect``; None when the whole curve is too little."""
    if per_cell >= detect:
        return 0.0
    dv = (detect - per_cell) * series / (series - 1)
    full = voltage_at_soc(table, 1.0)
    if dv > full - voltage_at_soc(table, 0.0):
        return None
    return 1.0 - soc_at_voltage(table, full - dv)


def bleed_currents(m: "DesignModel", volts: float) -> dict[int, tuple[float, tuple[str, ...]]]:
    """Level -> (current through its bleed switch, the resistors on its balance pin), every cell
    at ``volts`` and every bleed switch closed, the resistors at their highest (the lowest bleed)
    and the switches at the part's highest on-resistance.

    A function of the netlist and ``volts``, kept with the path's memo
    (``PowerPath.remembered``), so a re-lint that left the netlist alone does not solve it again.
    """
    key = ("bleed currents", memo_key(volts))
    return dict(m.path.remembered(key, lambda: solve_bleed_currents(m, volts)))


def solve_bleed_currents(m: "DesignModel",
                         volts: float) -> dict[int, tuple[float, tuple[str, ...]]]:
    """:func:`bleed_currents`, solved."""
    switches = balance_switches(m)
    if not switches:
        return {}
    given = m.protector.part.balance_switch_resistance
    # A switch the part gives no figure for is taken as ideal; the solver needs a positive value.
    ohms = max(given.high if given is not None else 0.0, SWITCH_ON_R)
    net = m.network({ch.name: SWITCH_ON_R for ch in m.channels}, cell_emf=volts,
                    cell_r=m.stack.part.internal_resistance.nominal, temp=25.0, corner="max",
                    load=None)
    for name, a, b in switches:
        net.add_resistor(name, a, b, ohms)
    try:
        sol = net.solve(ground=m.stack.bottom)
    except NetworkError as exc:
        m.problems.append(ModelProblem("balance", f"the bleed currents: {exc}"))
        return {}
    on_net: dict[str, list[str]] = {}
    for r in m.netlist.of_kind("resistor"):
        for net_name in {r.pins.get("1"), r.pins.get("2")} - {None}:
            on_net.setdefault(net_name, []).append(r.refdes)
    out = {}
    for name, a, _b in switches:
        # "(U1.balanceK)": switch K bleeds cell K, and a pin left unconnected leaves a gap
        k = int(name[name.rindex("balance") + len("balance"):-1])
        out[k] = (abs(sol.current(name)), tuple(on_net.get(a, ())))
    return out


def tap_loads(m: "DesignModel") -> tuple[tuple[tuple[str, ...], int, int], ...]:
    """The netlist's resistors and diodes that reach some levels of the stack and not others:
    (elements, lowest tap, highest tap), each group joined through nets off the stack.

    A group that spans the whole stack (a divider from top to bottom) drains every level alike,
    and one that touches a single tap (a bleed resistor to its open switch) drains none.
    """
    levels, top = m.stack_levels, m.stack.series
    parent: dict[str, str] = {}

    def root(net: str) -> str:
        while parent.setdefault(net, net) != net:
            net = parent[net] = parent[parent[net]]
        return net

    parts = []
    for kind, pins in (("diode", ("anode", "cathode")), ("resistor", ("1", "2"))):
        for c in m.netlist.of_kind(kind):
            nets = [c.pins.get(p) for p in pins]
            if None in nets or nets[0] == nets[1]:
                continue
            parts.append((c.refdes, nets))
            off = [n for n in nets if n not in levels]
            if len(off) == 2:
                parent[root(off[0])] = root(off[1])
    groups: dict[str, tuple[list[str], set[int]]] = {}
    for refdes, nets in parts:
        off = [n for n in nets if n not in levels]
        key = root(off[0]) if off else refdes
        elements, reached = groups.setdefault(key, ([], set()))
        elements.append(refdes)
        reached.update(levels[n] for n in nets if n in levels)
    return tuple((tuple(elements), min(reached), max(reached))
                 for elements, reached in groups.values()
                 if len(reached) >= 2 and (min(reached), max(reached)) != (0, top))


def _table(m: "DesignModel") -> OcvTable | None:
    cell = m.stack.part
    try:
        if cell.ocv:
            return ocv_table([(pt.soc / 100.0, pt.voltage) for pt in cell.ocv])
        return ocv_table(cell.chemistry.value)
    except ValueError as exc:
        if m.design.storage is not None:
            return None  # the storage budget reads the same table and reports it (storage.py)
        m.problems.append(ModelProblem(
            "balance", f"the ocv table of {m.stack.cells[0].refdes} cannot be used: "
                       f"{str(exc).replace('cell: ', '')} (SoC as a fraction of full)",
            m.stack.cells[0].path + ("part",)))
        return None


def _input_drains(m: "DesignModel") -> dict[int, list[tuple[str, float, str]]]:
    """Level -> (what, highest amperes, element) of the protector's own currents."""
    p = m.protector
    out: dict[int, list[tuple[str, float, str]]] = {}
    given = p.part.cell_input_current
    if given is not None and given.high > 0.0:
        for pin, _net, reached, _want in m.cell_taps:
            for level in range(1, (reached or 0) + 1):
                out.setdefault(level, []).append((f"{pin} input", given.high,
                                                  f"{p.refdes}.{pin}"))
    sf = supply_filter(m)
    supply = p.pins.get("supply")
    top = m.stack_levels.get(supply) if supply is not None else None
    if top is None and sf is not None and sf.resistor is not None:
        top = max((m.stack_levels.get(n, -1) for n in sf.resistor.pins.values()), default=-1)
    current = p.part.supply_current.operating
    for level in range(1, (top or 0) + 1):
        out.setdefault(level, []).append(("protector supply", current.high, p.refdes))
    return out


def cell_balance(m: "DesignModel") -> CellBalance | None:
    """The stack's drift per cycle against its balancer (None for a single level, or without a
    protector or cell limits)."""
    stack, p, limits = m.stack, m.protector, m.cell_limits
    if stack is None or stack.series < 2 or p is None or limits is None:
        return None
    table = _table(m)
    if table is None:
        return None
    lim = m.limits
    notes: list[str] = []
    cell = stack.part
    capacity = cell.capacity * stack.parallel
    if cell.self_discharge is not None:
        rate = cell.self_discharge
    else:
        rate = DEFAULT_SELF_DISCHARGE
        notes.append(f"no cell self_discharge: {rate:g} %/month assumed [practice]")
    # Near full the charge held is the capacity, so the spread is a share of the rate times it.
    spread = capacity * rate / 100.0 * lim.self_discharge_spread / HOURS_PER_MONTH
    taps = level_drains(m, limits.nominal)
    own = _input_drains(m)
    ch = m.design.charger
    bleed_v = ch.voltage.low / stack.series if ch is not None else limits.charge
    bleeds = bleed_currents(m, bleed_v)
    if not bleeds and p.part.cells >= 2:
        notes.append(f"{p.refdes} has no bleed switch with a net on its balance pins")
    cells_at: dict[int, list[str]] = {}
    for c in stack.cells:
        cells_at.setdefault(m.stack_levels.get(c.pins["pos"], 0), []).append(c.refdes)
    rows = []
    for level in range(1, stack.series + 1):
        drains = list(taps.get(level, ()))
        high = math.fsum([d.current for d in drains] + [hi for _w, hi, _e in own.get(level, ())])
        by_what: dict[str, list] = {}
        for what, hi, element in own.get(level, ()):
            entry = by_what.setdefault("protector inputs" if what != "protector supply" else what,
                                       [0.0, []])
            entry[0] += hi
            entry[1].append(element)
        drains += [Drain(what, amps, tuple(dict.fromkeys(elems)))
                   for what, (amps, elems) in by_what.items() if amps > _NOISE]
        rows.append((level, tuple(sorted(drains, key=lambda d: -d.current)), high))
    # Every part at its highest: a current common to several levels (the supply, a divider)
    # is the same current in each, so the levels are compared at one corner, the one where the
    # unequal currents are largest.
    most = max(r[2] for r in rows)
    design_drift = most - min(r[2] for r in rows)
    cycle_h, balance_h = lim.balance_cycle / _SECONDS_PER_HOUR, lim.balance_time / _SECONDS_PER_HOUR
    levels = []
    for level, drains, high in rows:
        bleed, path = bleeds.get(level, (0.0, ()))
        need = (most - high + spread) * cycle_h
        levels.append(LevelDrift(level, tuple(cells_at.get(level, ())), drains, high, bleed,
                                 path, need, bleed * balance_h))
    worst = min(levels, key=lambda lv: (lv.margin, lv.level))
    net = worst.need - worst.removal
    if net <= 0.0:
        imbalance = max(lv.need for lv in levels)  # each charge starts from one cycle's drift
    else:
        imbalance = min(worst.need + (lim.service_cycles - 1) * net, capacity)
    detect = p.part.overcharge.detect.low
    per_cell = ch.voltage.high / stack.series if ch is not None else None
    high_v = low_v = to_detect = cycles = None
    if per_cell is not None:
        share = _imbalance_to(table, per_cell, stack.series, detect)
        held = imbalance
        if share is not None:
            to_detect = share * capacity
            if max(lv.need for lv in levels) >= to_detect:
                cycles = 1.0
            elif net > 0.0:
                cycles = 1.0 + (to_detect - worst.need) / net
            # At the detection the protector ends the charge: the high cell goes no higher.
            held = min(imbalance, to_detect)
        high_v, low_v = charger_cells(table, per_cell, stack.series, held / capacity)
    return CellBalance(tuple(levels), capacity, lim.balance_cycle, lim.balance_time,
                       lim.service_cycles, rate, spread, bleed_v, worst, net, imbalance, table,
                       per_cell, high_v, low_v, detect, to_detect, cycles, design_drift,
                       tap_loads(m), tuple(notes))
