"""A pack on the shelf: the charge above the protector's cut-off against everything that drains it.

Two phases. Until the protector's over-discharge detection cuts off, the cells feed the protector's
supply current, the product's standby current (``storage.standby_current``, through the switches,
which are on), every resistive path the netlist puts across a cell (dividers, pull-ups, bleeders,
LEDs that the cells can light) and their own self-discharge. After the cut-off the protector sits
at its power-down current, the discharge switches are off and pass only their leakage (no more
than the product's standby current, where it is given), and whatever paths do not run through
them keep draining, on towards the cell's ``lower_limit``, below which the cell maker no longer
vouches for it (copper dissolves, docs/references.md "Storage and self-discharge").

Self-discharge is a share of the charge left per month, so an almost empty cell loses almost
nothing to it: with a constant drain I beside it the charge decays as dQ/dt = -r·Q - I
(:func:`ocv.shelf_life`'s ``remaining`` basis).

The resistive paths come from the same nodal solver as the power path: the cells as sources at
their open-circuit voltage, every resistor, diode and switch of the netlist, the pack terminals
open. In a series stack each level (a parallel group of cells) is drained on its own, since a
divider tapped halfway drains only the cells below the tap, so the figures are those of the
level that reaches the limit first.

State of charge is a fraction 0..1 here, capacity in ampere-hours, currents in amperes, time in
months of 730 hours (:data:`packwarden.model.ocv.HOURS_PER_MONTH`).
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from .network import Network, NetworkError
from .ocv import HOURS_PER_MONTH, OcvTable, ocv_table, self_discharge_at, shelf_life, \
    soc_at_voltage, voltage_at_soc
from ..records import record
from .values import ModelProblem, memo_key

if TYPE_CHECKING:  # pragma: no cover
    from .design import DesignModel

__all__ = ["DEFAULT_SELF_DISCHARGE", "Drain", "StoragePhase", "StorageBudget", "storage_budget",
           "level_drains"]

#: Self-discharge when the cell data sheet gives none, %/month at 25 °C [practice: docs/references.md
#: gives about 1-2 %/month after the first day, sources ranging 0.35-8 %; the upper end of the
#: usual range, so a shelf life built on it errs short].
DEFAULT_SELF_DISCHARGE = 2.0
#: The temperature a data-sheet self-discharge figure is taken to be given at [practice].
SELF_DISCHARGE_REFERENCE = 25.0
# Branch currents below this are solver rounding, not a drain worth naming [derived: a nanoampere
# is under 1 µAh a month, a millionth of a small cell].
_NOISE = 1e-9
# An on channel in the storage solve: far below any resistor that makes a drain, so it neither
# adds nor removes one [derived].
_CHANNEL_ON = 1e-3


@record(frozen=True)
class Drain:
    """One thing that draws charge from the worst level of the stack, in amperes."""

    what: str  # "protector supply", "FET leakage", "resistive path", "LED"
    current: float
    elements: tuple[str, ...] = ()

    def text(self) -> str:
        from ..quantities import format_quantity
        names = f" ({', '.join(self.elements)})" if self.elements else ""
        return f"{self.what}{names} {format_quantity(self.current, 'A')}"


@record(frozen=True)
class StoragePhase:
    """From ``start_soc`` to ``end_soc`` at a constant loss: the level that gets there first."""

    start_soc: float
    end_soc: float
    start_voltage: float
    end_voltage: float
    level: int  # 1 = the bottom parallel group
    capacity_ah: float  # of that level (cells in parallel)
    drains: tuple[Drain, ...]
    self_discharge_ah_per_month: float  # at the start of the phase
    months: float
    self_discharge_rate: float = 0.0  # share of the charge left per month, 0..1

    @property
    def drain_current(self) -> float:
        return math.fsum(d.current for d in self.drains)

    @property
    def loss_ah_per_month(self) -> float:
        return self.drain_current * HOURS_PER_MONTH + self.self_discharge_ah_per_month

    def soc_to_last(self, months: float) -> float:
        """Starting state of charge that reaches ``end_soc`` after ``months`` at these drains:
        Q0 = (Qe + I/r)·e^(r·t) - I/r, or Qe + I·t without self-discharge."""
        r, drain = self.self_discharge_rate, self.drain_current * HOURS_PER_MONTH
        end = self.end_soc * self.capacity_ah
        if r <= 0.0:
            return (end + drain * months) / self.capacity_ah
        return ((end + drain / r) * math.exp(r * months) - drain / r) / self.capacity_ah


@record(frozen=True)
class StorageBudget:
    soc: float
    duration: float  # months
    temperature: float
    table: OcvTable
    self_discharge_pct: float  # %/month at the storage temperature
    to_cutoff: StoragePhase
    to_lower_limit: StoragePhase | None  # None when the table gives no charge below the cut-off
    cutoff_voltage: float
    lower_limit: float
    assumptions: tuple[str, ...]


def storage_budget(m: "DesignModel") -> StorageBudget | None:
    """Months from the stored state of charge to the cut-off, and on to ``lower_limit``."""
    st, stack, p, limits = m.design.storage, m.stack, m.protector, m.cell_limits
    if st is None or stack is None or p is None or limits is None:
        return None
    cell = stack.part
    notes: list[str] = list(limits.assumptions)
    if cell.ocv:
        try:
            table = ocv_table([(pt.soc / 100.0, pt.voltage) for pt in cell.ocv])
        except ValueError as exc:
            # A table that cannot be inverted is the design's mistake: say where, not crash.
            m.problems.append(ModelProblem(
                "storage", f"the ocv table of {stack.cells[0].refdes} cannot be used: "
                           f"{str(exc).replace('cell: ', '')} (SoC as a fraction of full)",
                stack.cells[0].path + ("part",)))
            return None
    else:
        table = ocv_table(cell.chemistry.value)
        notes.append(f"no cell ocv table: the {table.name} table is used ({table.source})")
    start = min(max(st.soc / 100.0, 0.0), 1.0)
    v_cut = p.part.overdischarge.detect.high  # the highest detection cuts off first
    soc_cut = soc_at_voltage(table, v_cut)
    lowest_tabulated = table.points[0][1]
    soc_low = soc_at_voltage(table, limits.lower_limit)
    if limits.lower_limit < lowest_tabulated:
        notes.append(f"the OCV table ends at {lowest_tabulated:.3f} V, above the lower limit "
                     f"{limits.lower_limit:.2f} V: charge below the table is not counted")
    if cell.self_discharge is not None:
        base = cell.self_discharge
    else:
        base = DEFAULT_SELF_DISCHARGE
        notes.append(f"no cell self_discharge: {base:g} %/month at 25 °C assumed [practice: "
                     f"1-2 %/month, sources disagree]")
    rate = self_discharge_at(base, st.temperature, SELF_DISCHARGE_REFERENCE)
    if st.temperature != SELF_DISCHARGE_REFERENCE:
        notes.append(f"self-discharge doubled per 10 °C: {base:g} %/month at 25 °C is "
                     f"{rate:.3g} %/month at {st.temperature:g} °C [practice]")
    supply = p.part.supply_current
    power_down = supply.power_down.high if supply.power_down is not None else None
    if power_down is None:
        power_down = supply.operating.high
        notes.append("no power-down current given: the operating supply current is assumed "
                     "after the cut-off")

    standby = st.standby_current
    if standby is None and any(ch.part.idss for ch in m.channels_of("discharge")):
        notes.append("no storage standby_current: the product draws nothing on the shelf but "
                     "the off switches' leakage")
    v_start = voltage_at_soc(table, start)
    before = _phase(m, table, start, max(soc_cut, 0.0), v_start, v_cut, rate,
                    supply.operating.high, off=frozenset(), standby=standby)
    after = None
    if soc_low < soc_cut:
        after = _phase(m, table, soc_cut, soc_low, v_cut, limits.lower_limit, rate, power_down,
                       off=frozenset({"discharge"}), standby=standby)
    return StorageBudget(start, st.duration, st.temperature, table, rate, before, after, v_cut,
                         limits.lower_limit, tuple(dict.fromkeys(notes)))


def _terminal_drain(m: "DesignModel", off: frozenset[str], standby: float | None) -> list[Drain]:
    """What the product across the terminals draws from every level: its standby current while
    the discharge switches are on; once they are off, their leakage, capped by the standby
    current where it is given (the two are in series)."""
    if "discharge" not in off:
        return [Drain("product standby", standby)] if standby else []
    leakage = [ch for ch in m.channels_of("discharge") if ch.part.idss]
    if not leakage:
        return []
    # Stored in its product, the product's own standby circuit can bridge the terminals; an off
    # switch then passes at most its leakage, given at vds_max [practice: at cell voltage it is
    # lower, so this errs long on drain].
    amps = math.fsum(ch.part.idss for ch in leakage)
    if standby is not None:
        amps = min(amps, standby)
    if amps <= 0.0:
        return []
    return [Drain("FET leakage", amps, tuple(dict.fromkeys(ch.package for ch in leakage)))]


def _phase(m: "DesignModel", table: OcvTable, start: float, end: float, v_start: float,
           v_end: float, rate: float, supply: float, off: frozenset[str],
           standby: float | None = None) -> StoragePhase:
    stack = m.stack
    capacity = stack.part.capacity * stack.parallel
    terminal = _terminal_drain(m, off, standby)
    per_level = level_drains(m, v_start, off)
    worst: StoragePhase | None = None
    for level in range(1, stack.series + 1):
        drains = [Drain("protector supply", supply, (m.protector.refdes,))] + terminal
        drains.extend(per_level.get(level, ()))
        life = shelf_life(capacity, start, rate, [d.current for d in drains], end,
                          basis="remaining")
        phase = StoragePhase(start, end, v_start, v_end, level, capacity, tuple(drains),
                             life.self_discharge_ah_per_month, life.months, rate / 100.0)
        # Levels drained alike differ only by rounding; the lowest of them is named.
        if worst is None or phase.months < worst.months * (1 - 1e-9):
            worst = phase
    assert worst is not None
    return worst


def level_drains(m: "DesignModel", cell_voltage: float,
                 off: frozenset[str] = frozenset()) -> dict[int, list[Drain]]:
    """Current each level of the stack feeds into the netlist's resistive paths and LEDs.

    The cells at ``cell_voltage`` each, the pack terminals open, switches of the roles in ``off``
    off and the rest on. An LED the cells can light counts at its declared ``current`` where
    it gives one (the design's own figure for it), else at what the solve gives.

    A function of the netlist and its arguments, kept with the path's memo
    (``PowerPath.remembered``): the storage phases and the balance ask for it, and so does every
    re-lint of a large pack whose edit left the netlist alone (its solve and the sum over the
    cells were about a tenth of the 400-component pack's re-lint).
    """
    key = ("level drains", memo_key(cell_voltage), off)
    kept = m.path.remembered(key, lambda: solve_level_drains(m, cell_voltage, off))
    return {level: list(drains) for level, drains in kept.items()}


def solve_level_drains(m: "DesignModel", cell_voltage: float,
                       off: frozenset[str]) -> dict[int, list[Drain]]:
    """:func:`level_drains`, solved."""
    stack = m.stack
    leds = [c for c in m.netlist.of_kind("diode")
            if c.part.led and "anode" in c.pins and "cathode" in c.pins]

    def solve(without: frozenset[str] = frozenset()):
        net = _storage_network(m, cell_voltage, off, without)
        try:
            return net.solve(ground=stack.bottom)
        except NetworkError as exc:
            m.problems.append(ModelProblem("storage", str(exc)))
            return None

    sol = solve()
    if sol is None:
        return {}
    levels = {c.refdes: m.stack_levels.get(c.pins["pos"], 0) for c in stack.cells}

    def by_level(s) -> dict[int, float]:
        out: dict[int, float] = {}
        for c in stack.cells:
            # A source's current is positive from its + terminal through it to its - terminal,
            # so a discharging cell reads negative (network.py's convention).
            out[levels[c.refdes]] = out.get(levels[c.refdes], 0.0) - s.current(c.refdes)
        return out

    total = by_level(sol)
    plain = dict(total)
    led: dict[int, float] = {}
    lit: list[str] = []
    for d in leds:
        i = sol.current(d.refdes)
        if i <= _NOISE:
            continue
        rest = solve(frozenset({d.refdes}))
        if rest is None:
            continue
        scale = d.part.current / i if d.part.current else 1.0
        for level, amps in by_level(rest).items():
            # What this level feeds the LED's path: the drop in its current without the LED.
            share = total.get(level, 0.0) - amps
            plain[level] = plain.get(level, 0.0) - share
            led[level] = led.get(level, 0.0) + share * scale
        lit.append(d.refdes)
    # Name the resistors of the plain paths from a solve with the lit LEDs taken out, so an LED's
    # series resistor is not counted twice.
    dark = solve(frozenset(lit)) if lit else sol
    names = []
    if dark is not None:
        carrying = [(c.refdes, abs(dark.current(c.refdes))) for c in m.netlist.of_kind("resistor")
                    if c.refdes in dark.currents and abs(dark.current(c.refdes)) > _NOISE]
        names = [n for n, _ in sorted(carrying, key=lambda x: -x[1])]
    out: dict[int, list[Drain]] = {}
    for level in range(1, stack.series + 1):
        drains: list[Drain] = []
        if led.get(level, 0.0) > _NOISE:
            drains.append(Drain("LED", led[level], tuple(lit)))
        if plain.get(level, 0.0) > _NOISE:
            drains.append(Drain("resistive paths", plain[level], tuple(names)))
        out[level] = drains
    return out


def _storage_network(m: "DesignModel", cell_voltage: float, off: frozenset[str],
                     without: frozenset[str]) -> Network:
    stack = m.stack
    states = {ch.name: ch.role not in off for ch in m.channels}
    net = m.network({ch.name: _CHANNEL_ON for ch in m.channels}, cell_emf=cell_voltage,
                    cell_r=stack.part.internal_resistance.nominal, temp=25.0, switches_on=states,
                    load=None)
    for d in m.netlist.of_kind("diode"):
        a, k = d.pins.get("anode"), d.pins.get("cathode")
        if a and k and a != k and d.refdes not in without:
            net.add_diode(d.refdes, a, k, v_forward=d.part.forward_voltage)
    return net
