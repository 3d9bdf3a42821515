"""Faults on the charge side: a charger that fails high, and a cell charged from below its lower
limit.

A charger that fails high (its voltage regulation lost, its current limit still acting) pushes
its current limit into the cells until the protector's overcharge detection has waited out its
delay. The protector watches each cell's terminal voltage, the open-circuit voltage (OCV) plus
I·R of the cell's internal resistance, so:

* a cell resting at the highest voltage the charger leaves it at in service (the charger's
  regulated maximum per cell) jumps by I·R the moment the current flows; where that is above the
  overcharge detection, the detection is crossed at once, from that voltage;
* otherwise the current flows until the terminal reaches the detection (at its highest, the
  latest it acts);
* in either case the terminal then rises by the OCV rise of the charge the current adds during
  the detection's longest delay (I·t over the capacity, through the cell's OCV curve)
  [derived: Kirchhoff's voltage law around the cell's Thevenin model].

The terminal never rises above the charger's fault voltage per cell, which by default is IEC
62133-2's overcharge test supply, 1.4 × the cell's upper limit [memory: docs/references.md
"Charge-side faults and deep discharge"], at most the charger's declared open_circuit_max. Beyond the table's full point the OCV curve is extrapolated along its last
segment; a real cell's curve steepens there, so over a long delay the rise is a lower bound.

Units are SI: volts per cell, amperes per cell, ohms, seconds, ampere-hours.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from ..records import record
from .ocv import OcvTable, ocv_table, soc_at_voltage, voltage_at_soc

if TYPE_CHECKING:  # pragma: no cover
    from .design import DesignModel

__all__ = ["FAULT_SUPPLY_FACTOR", "PRECHARGE_C_RATE", "ocv_rise", "cell_table", "ChargerFault",
           "charger_fault", "LowVoltageCharging", "low_voltage_charging"]

#: IEC 62133-2's overcharge test supply per cell, as a factor on the upper limit charging voltage
#: [memory: docs/references.md "Charge-side faults and deep discharge"; check the standard].
FAULT_SUPPLY_FACTOR = 1.4
#: Pre-charge current for a cell below its lower limit when its maker gives none, as a share of
#: its rated capacity per hour [practice: about 0.1 C or less, docs/references.md "Charge-side
#: faults and deep discharge"].
PRECHARGE_C_RATE = 0.1
SECONDS_PER_HOUR = 3600.0


def ocv_rise(table: OcvTable, start: float, charge_ah: float,
             capacity_ah: float) -> tuple[float, bool]:
    """(volts, extrapolated): how far the OCV rises from ``start`` volts when ``charge_ah`` is
    added to a cell of ``capacity_ah``. Read along the table's segments; above its full point
    (or from a start above the table's top voltage) along its last segment, and then
    ``extrapolated`` is True."""
    (s0, v0), (top_soc, top_v) = table.points[-2:]
    slope = (top_v - v0) / (top_soc - s0)  # volts per unit of SoC along the last segment

    def soc_of(v: float) -> float:
        return top_soc + (v - top_v) / slope if v >= top_v else soc_at_voltage(table, v)

    def volts_at(soc: float) -> float:
        return top_v + (soc - top_soc) * slope if soc >= top_soc else voltage_at_soc(table, soc)

    soc = soc_of(start)
    end = soc + charge_ah / capacity_ah
    return volts_at(end) - volts_at(soc), end > top_soc


def cell_table(cell: Any) -> tuple[OcvTable, str | None]:
    """The OCV table of a cell part (its own, else its chemistry's), and a note when it is the
    chemistry's."""
    why = "no cell ocv table"
    if cell.ocv:
        try:
            return ocv_table([(pt.soc / 100.0, pt.voltage) for pt in cell.ocv]), None
        except ValueError as exc:
            # storage-drain reports the table's mistake where it is; here the chemistry's serves
            why = f"the cell's ocv table cannot be used ({str(exc).replace('cell: ', '')})"
    table = ocv_table(cell.chemistry.value)
    return table, f"{why}: the {table.name} table is used ({table.source})"


@record(frozen=True)
class ChargerFault:
    """One cell through a charger's high fault, per cell (volts, amperes, ohms, seconds)."""

    fault_voltage: float  # the charger's fault output per cell
    fault_assumed: bool  # True: 1.4 × upper limit [memory], the design gives none
    detect: float  # the overcharge detection's highest
    delay: float  # its longest delay
    rest: float  # the highest voltage the cell rests at in service (charger maximum per cell)
    current: float  # the charger's current limit per cell
    resistance: float  # the cell's highest internal resistance
    start: float  # terminal voltage when the detection is crossed
    rise: float  # OCV rise over the delay
    extrapolated: bool  # the rise was read beyond the OCV table's full point
    peak: float  # highest terminal voltage before the charge switch opens
    limit: float  # the cell's overcharge limit
    detected: bool  # False: the fault voltage stays below the detection, which never acts
    assumptions: tuple[str, ...] = ()

    @property
    def ir(self) -> float:
        return self.current * self.resistance

    @property
    def overshoot(self) -> float:
        """How far the peak passes the cell's overcharge limit (negative: the margin left)."""
        return self.peak - self.limit


def charger_fault(m: "DesignModel") -> ChargerFault | None:
    """The cell's highest voltage through a charger that fails high (see the module's text), or
    None without a charger, a protector or a cell stack."""
    ch, p, stack, limits = m.design.charger, m.protector, m.stack, m.cell_limits
    per_cell = m.charger_per_cell
    if ch is None or p is None or stack is None or limits is None or per_cell is None:
        return None
    cell = stack.part
    notes: list[str] = list(limits.assumptions)
    assumed = ch.fault_voltage is None
    if assumed:
        # open_circuit_max is declared as the worst case over the charger's faults: no fault
        # puts out more.
        fault = min(FAULT_SUPPLY_FACTOR * limits.upper_limit, ch.open_circuit_max / stack.series)
        notes.append(f"charger fault voltage {FAULT_SUPPLY_FACTOR:g} × the upper limit "
                     f"{limits.upper_limit:.4g} V per cell, IEC 62133-2's overcharge test supply "
                     f"[memory], at most open_circuit_max per cell: {fault:.4g} V")
    else:
        fault = ch.fault_voltage / stack.series
    oc = p.part.overcharge
    detect, delay = oc.detect.high, oc.delay.high
    current = ch.current / stack.parallel
    r = cell.internal_resistance.high
    # A cell rests at most where the charger regulates, and no higher than the detection that
    # stops it.
    rest = min(per_cell.max, detect, fault)
    if fault < detect:
        # The detection never acts: the cell is pushed to the fault voltage and held there.
        return ChargerFault(fault, assumed, detect, delay, rest, current, r, fault, 0.0, False,
                            fault, limits.overcharge_limit, False, tuple(notes))
    start = max(detect, rest + current * r)
    table, note = cell_table(cell)
    if note:
        notes.append(note)
    added = current * delay / SECONDS_PER_HOUR
    rise, extrapolated = ocv_rise(table, start - current * r, added, cell.capacity)
    if extrapolated:
        (s0, v0), (s1, v1) = table.points[-2:]
        notes.append(f"OCV above the {table.name} table's full point extrapolated along its last "
                     f"segment ({(v1 - v0) / (s1 - s0) / 100.0 * 1e3:.3g} mV per 1 % of "
                     f"capacity); a real cell's curve steepens there")
    peak = min(start + rise, fault)
    return ChargerFault(fault, assumed, detect, delay, rest, current, r, start, rise, extrapolated,
                        peak, limits.overcharge_limit, True, tuple(notes))


@record(frozen=True)
class LowVoltageCharging:
    """How a cell below its lower limit is charged: up to which voltage, at what current per
    cell, against what its maker allows."""

    below: float  # charging goes on for cells down to this voltage (0: any voltage)
    lower_limit: float
    current: float | None  # per cell; None: no charger and no limit given
    path: str
    precharge_limit: float  # per cell
    precharge_assumed: bool
    recovery_voltage: float
    recovery_allowed: bool

    @property
    def charges_below_limit(self) -> bool:
        return self.below < self.lower_limit


def low_voltage_charging(m: "DesignModel") -> LowVoltageCharging | None:
    """The protector's low-voltage charging against the cell's recovery, or None when the
    protector does not say (``low_voltage_charge``) or there is no cell stack."""
    p, stack, limits = m.protector, m.stack, m.cell_limits
    if p is None or stack is None or limits is None or p.part.low_voltage_charge is None:
        return None
    lv, cell = p.part.low_voltage_charge, stack.part
    below = 0.0 if lv.allowed else lv.inhibit_below
    charger = m.design.charger
    if lv.current is not None:
        current = lv.current / stack.parallel
    else:
        current = charger.current / stack.parallel if charger is not None else None
    rec = cell.recovery
    given = rec.precharge_current if rec is not None else None
    limit = given if given is not None else PRECHARGE_C_RATE * cell.capacity
    voltage = rec.recovery_voltage if rec is not None and rec.recovery_voltage else limits.cutoff
    return LowVoltageCharging(below, limits.lower_limit, current, lv.path.value, limit,
                              given is None, voltage, rec.allowed if rec is not None else True)
