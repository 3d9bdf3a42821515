"""What the netlist means for protection, read once per design: no solve, no physics.

The cell stack from the cells' pins (series and parallel counts, bottom and top nets, the level of
every net), the cell's voltage window, the protector, the switch channels and the role of each
(from the protector pin that drives its gate, directly or through a gate resistor), the cell taps
of a multi-cell protector, and the parts that may lie in the power path. Everything the power-path
solver and the physics modules build on; imports only the bottom layer.
"""

from __future__ import annotations

import heapq
from functools import cached_property
from typing import Any

from ..kinds import SERIES_KINDS, SWITCH_KINDS
from ..netlist import Component, Netlist
from ..records import record
from ..schema import Design
from .cells import cell_window
from .values import UPPER_LIMIT_MARGIN

__all__ = ["CellLimits", "CellStack", "SwitchChannel", "Topology"]


@record(frozen=True)
class CellLimits:
    """Per-cell voltage window, data sheet first, chemistry defaults where it is silent."""

    chemistry: str
    charge: float
    upper_limit: float
    overcharge_limit: float
    nominal: float
    cutoff: float
    lower_limit: float
    assumptions: tuple[str, ...] = ()


@record(frozen=True)
class CellStack:
    cells: tuple[Component, ...]
    series: int
    parallel: int
    bottom: str  # net of the stack's negative end (B-)
    top: str  # net of the stack's positive end (B+)
    problems: tuple[str, ...] = ()

    @property
    def part(self) -> Any:
        return self.cells[0].part

    @property
    def discharge_rating(self) -> float:
        """The stack's continuous discharge rating: a cell's times the cells in parallel."""
        return self.part.max_current.discharge * self.parallel

    @property
    def charge_rating(self) -> float:
        """The stack's continuous charge rating: a cell's times the cells in parallel."""
        return self.part.max_current.charge * self.parallel


@record(frozen=True)
class SwitchChannel:
    """One FET channel in the power path."""

    name: str  # branch name: "Q1" for a discrete FET, "Q1.1"/"Q1.2" for a pair's channels
    package: str  # refdes of the package (the thermal unit)
    role: str | None  # "discharge", "charge", or None when no protector output drives the gate
    drain: str
    source: str
    gate: str | None
    channel: str  # "n" | "p"
    part: Any
    gate_pin: str  # the pin name of the gate, for messages ("g1", "g")
    path: tuple  # YAML path of the component

    @property
    def vgs_th_max(self) -> float:
        """Largest gate threshold magnitude: p-channel sheets print V_GS(th) negative."""
        t = self.part.vgs_th
        return max(abs(v) for v in (t.min, t.typ, t.max) if v is not None)



class Topology:
    """The protection-relevant structure of one design's netlist."""

    def __init__(self, design: Design, netlist: Netlist):
        self.design = design
        self.netlist = netlist

    @cached_property
    def terminals(self) -> tuple[str, str]:
        return self.netlist.terminals


    @cached_property
    def protector(self) -> Component | None:
        found = self.netlist.of_kind("protector")
        return found[0] if found else None

    @cached_property
    def stack(self) -> CellStack | None:
        cells = tuple(c for c in self.netlist.of_kind("cell") if "pos" in c.pins and "neg" in c.pins)
        if not cells:
            return None
        pos_nets = {c.pins["pos"] for c in cells}
        neg_nets = {c.pins["neg"] for c in cells}
        bottoms = sorted(neg_nets - pos_nets)
        problems: list[str] = []
        if len(bottoms) != 1:
            problems.append(f"the cells do not form one stack (bottom nets: {', '.join(bottoms) or 'none'})")
            bottom = bottoms[0] if bottoms else cells[0].pins["neg"]
        else:
            bottom = bottoms[0]
        level, loop = _stack_levels(cells, bottom, stop_at_loop=True)
        if loop is not None:
            problems.append(f"{loop.refdes} closes a loop in the cell stack")
        series = max(level.values()) if level else 1
        top = max(level, key=lambda n: (level[n], n))
        per_level: dict[int, int] = {}
        for c in cells:
            per_level[level.get(c.pins["pos"], 0)] = per_level.get(level.get(c.pins["pos"], 0), 0) + 1
        counts = set(per_level.values())
        if len(counts) > 1:
            problems.append("the parallel groups of the stack hold different numbers of cells")
        parallel = min(counts) if counts else 1
        parts = {c.part_name or c.refdes for c in cells}
        if len({id(c.part) for c in cells}) > 1 and len(parts) > 1:
            problems.append("the stack mixes different cell parts; the first one is used")
        return CellStack(cells, max(series, 1), parallel, bottom, top, tuple(problems))

    @cached_property
    def cell_limits(self) -> CellLimits | None:
        if self.stack is None:
            return None
        cell = self.stack.part
        v = cell.voltage
        chem = cell.chemistry.value
        window = cell_window(chem)
        notes = []
        upper = v.upper_limit
        if upper is None:
            upper = v.charge + UPPER_LIMIT_MARGIN
            notes.append(f"cell upper_limit not given: assumed charge + 50 mV = {upper:.3f} V "
                         f"[practice]")
        over = v.overcharge_limit
        if over is None:
            over = window.overcharge_limit
            notes.append(f"cell overcharge_limit not given: {chem} default {over:.2f} V "
                         f"({window.source('overcharge_limit')})")
        lower = v.lower_limit
        if lower is None:
            lower = window.lower_limit
            notes.append(f"cell lower_limit not given: {chem} default {lower:.2f} V "
                         f"({window.source('lower_limit')})")
        return CellLimits(chem, v.charge, upper, over, v.nominal, v.cutoff, lower, tuple(notes))


    @cached_property
    def gate_nets(self) -> dict[str, str]:
        """Net -> role for nets driven by the protector's gate outputs (directly or via a resistor)."""
        p = self.protector
        if p is None:
            return {}
        out: dict[str, str] = {}
        for pin, role in (("discharge_gate", "discharge"), ("charge_gate", "charge")):
            net = p.pins.get(pin)
            if net is None:
                continue
            out[net] = role
            # a series gate resistor: its far end, when that net holds only gates
            for r in self.resistors_at.get(net, ()):
                a, b = r.pins.get("1"), r.pins.get("2")
                far = b if a == net else a if b == net else None
                if far and far not in out and all(
                        self.netlist.components[ref.component].kind in ("fet", "fet_pair_common_drain")
                        and ref.pin.startswith("g") or ref.component == r.refdes
                        for ref in self.netlist.nets.get(far, [])):
                    out[far] = role
        return out

    @cached_property
    def resistors_at(self) -> dict[str, list[Component]]:
        """Net -> the resistors with a pin on it, in design order: a protector pin's filter or
        gate resistor is looked up here, not in a pass over every resistor per pin."""
        out: dict[str, list[Component]] = {}
        for r in self.netlist.of_kind("resistor"):
            for net in dict.fromkeys((r.pins.get("1"), r.pins.get("2"))):
                if net is not None:
                    out.setdefault(net, []).append(r)
        return out

    @cached_property
    def channels(self) -> tuple[SwitchChannel, ...]:
        out = []
        roles = self.gate_nets
        for c in self.netlist.of_kind(*SWITCH_KINDS):
            part = c.part
            if c.kind == "fet":
                if not {"d", "s"} <= set(c.pins):
                    continue
                g = c.pins.get("g")
                out.append(SwitchChannel(c.refdes, c.refdes, roles.get(g), c.pins["d"], c.pins["s"],
                                         g, part.channel.value, part, "g", c.path))
            else:
                drain = c.pins.get("d") or f"{c.refdes}.d"
                for i in ("1", "2"):
                    s, g = c.pins.get(f"s{i}"), c.pins.get(f"g{i}")
                    if s is None:
                        continue
                    out.append(SwitchChannel(f"{c.refdes}.{i}", c.refdes, roles.get(g), drain, s,
                                             g, part.channel.value, part, f"g{i}", c.path))
        return tuple(out)

    def channels_of(self, role: str) -> list[SwitchChannel]:
        return [ch for ch in self.channels if ch.role == role]

    # --- series stacks: levels, rail side, gate-drive reach, cell taps, what the sense sees ---

    @cached_property
    def stack_levels(self) -> dict[str, int]:
        """Net -> level in the stack: 0 at its bottom, ``series`` at its top."""
        if self.stack is None:
            return {}
        return _stack_levels(self.stack.cells, self.stack.bottom, stop_at_loop=False)[0]


    @cached_property
    def cell_taps(self) -> tuple[tuple[str, str | None, int | None, int], ...]:
        """Each cell pin of a multi-cell protector: (pin, net, level it reaches, level it should).

        ``cellK`` senses the top of the K-th cell from the bottom (level K). A pin reaches its tap
        directly or through one series resistor (an input filter); level None when it reaches no
        net of the stack.
        """
        p, levels = self.protector, self.stack_levels
        if p is None or p.part.cells < 2 or not levels:
            return ()
        out = []
        for k in range(1, p.part.cells + 1):
            pin = f"cell{k}"
            net = p.pins.get(pin)
            if net is None:
                continue
            out.append((pin, net, self.tap_level(net), k))
        return tuple(out)

    def tap_level(self, net: str) -> int | None:
        """The stack level a sense pin on ``net`` reaches: the net's own, or that of the net one
        series resistor away (an input filter); None when it reaches no net of the stack."""
        levels = self.stack_levels
        reached = levels.get(net)
        if reached is None:
            for r in self.resistors_at.get(net, ()):
                a, b = r.pins.get("1"), r.pins.get("2")
                far = b if a == net else a if b == net else None
                if far in levels:
                    return levels[far]
        return reached


    @cached_property
    def path_parts(self) -> tuple[Component, ...]:
        """Parts that may carry the pack's current besides cells and switches."""
        return tuple(self.netlist.of_kind(*SERIES_KINDS))

    @cached_property
    def parallel_packages(self) -> tuple[tuple[str, ...], ...]:
        """Switch packages in parallel, each set in netlist order (sets of two or more): packages
        whose channels join the same nets with the same roles, so each carries a share of one
        current and meets one cause alike. A pair's drain left inside the package counts as the
        same net in each."""
        by_nets: dict[tuple, list[str]] = {}
        for c in self.netlist.of_kind(*SWITCH_KINDS):
            ends = sorted((ch.role or "", ch.source, ch.gate or "",
                           "" if ch.drain == f"{c.refdes}.d" else ch.drain)
                          for ch in self.channels if ch.package == c.refdes)
            if ends:
                by_nets.setdefault(tuple(ends), []).append(c.refdes)
        return tuple(tuple(p) for p in by_nets.values() if len(p) > 1)


def _stack_levels(cells: tuple[Component, ...], bottom: str,
                  stop_at_loop: bool) -> tuple[dict[str, int], Component | None]:
    """Net -> level, climbing the cells from ``bottom``: a cell's positive net is one level above
    its negative net, the first cell to reach a net setting its level.

    The result is that of sweeping the cells in design order, again and again, until a sweep
    changes nothing; with ``stop_at_loop`` the sweeps stop at the first cell whose two nets
    already hold levels that are not one apart (that cell is returned). Each cell is looked at
    once, when its negative net gets its level, so a long chain listed top-down costs no more
    than one listed bottom-up [derived: a cell can change something only at its first look
    after its negative net is known; later sweeps see the same levels].
    """
    by_neg: dict[str, list[int]] = {}
    for i, c in enumerate(cells):
        by_neg.setdefault(c.pins["neg"], []).append(i)
    level = {bottom: 0}
    now = list(by_neg.get(bottom, ()))  # cells to look at in the current sweep, by position
    sweeps = 0
    while now and (stop_at_loop or sweeps < len(cells)):
        sweeps += 1
        heapq.heapify(now)
        later: list[int] = []
        while now:
            i = heapq.heappop(now)
            c = cells[i]
            n, p = c.pins["neg"], c.pins["pos"]
            if p in level:
                if stop_at_loop and level[p] != level[n] + 1:
                    return level, c
                continue
            level[p] = level[n] + 1
            for j in by_neg.get(p, ()):
                # a cell after this one sees the new level in this sweep, one before it in the next
                if j > i:
                    heapq.heappush(now, j)
                else:
                    later.append(j)
        now = later
    return level, None


