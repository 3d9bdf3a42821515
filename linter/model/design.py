"""The design's model: a thin facade over the model's layers, for rules and team rules.

The layers point only down: ``values`` (spans, corners, problems) → ``topology`` (what the netlist
means for protection) → ``path`` (the power-path solver at a stated corner) → the physics
(``stress``, ``support``, ``storage``, ``thermal``, ``rdson``, ``copper``, ``fuse``, ``cells``)
→ this facade, whose cached properties delegate. A figure is computed once per design; rules,
the yield run, the charts and policies all read it from here.
"""

from __future__ import annotations

import math
from functools import cached_property
from typing import Any

from ..figures import KeyFigure, typed
from ..netlist import Component, Netlist
from ..records import record
from ..schema import Design, Toleranced
from . import backup, chargefault, events, sensing, short, storage, stress, support, survival
from .balance import cell_balance
from .limits import Limits
from .network import Network
from .path import OperatingPoint, PowerPath
from .topology import CellLimits, CellStack, SwitchChannel, Topology
from .values import DesignMistake, ModelProblem, Span, spread_low

__all__ = ["DesignModel", "TripWindow", "Span", "ModelProblem", "OperatingPoint", "CellLimits",
           "CellStack", "SwitchChannel", "spread_low"]


@record(frozen=True)
class TripWindow:
    """Currents at which a detection trips, over every tolerance and corner.

    ``min``, ``typ`` and ``max`` are the trip current's own minimum, typical and maximum; the
    operating point each comes from is beside it (``at_min`` is the point of the highest sense
    resistance: the highest ambient, the lowest gate drive, every part at its ``max`` corner,
    the switches heated by the continuous load).
    """

    detect: Span
    at_min: OperatingPoint
    at_max: OperatingPoint
    at_typ: OperatingPoint

    @property
    def min(self) -> float:
        return self.detect.min / self.at_min.sense_resistance

    @property
    def max(self) -> float:
        return self.detect.max / self.at_max.sense_resistance

    @property
    def typ(self) -> float:
        return self.detect.typ / self.at_typ.sense_resistance

    @property
    def sense_resistance(self) -> Span:
        """The sense resistance's own minimum, typical and maximum over the same corners."""
        return Span(self.at_max.sense_resistance, self.at_typ.sense_resistance,
                    self.at_min.sense_resistance)


class DesignModel:
    """Everything the rules may ask of one design (see docs/rules-api.md, "The model")."""

    def __init__(self, design: Design, netlist: Netlist, limits: Limits = Limits()):
        self.design = design
        self.netlist = netlist
        #: The limits the design is judged by (rule options after the project's overrides).
        self.limits = limits
        self.problems: list[ModelProblem] = []
        self.topology = Topology(design, netlist)
        self.path = PowerPath(self.topology, self.problems)

    # --- what is in the design (topology.py) ---------------------------------------------------

    @property
    def terminals(self) -> tuple[str, str]:
        return self.topology.terminals

    @property
    def protector(self) -> Component | None:
        return self.topology.protector

    @property
    def stack(self) -> CellStack | None:
        return self.topology.stack

    @property
    def cell_limits(self) -> CellLimits | None:
        return self.topology.cell_limits

    @property
    def gate_nets(self) -> dict[str, str]:
        return self.topology.gate_nets

    @property
    def channels(self) -> tuple[SwitchChannel, ...]:
        return self.topology.channels

    def channels_of(self, role: str) -> list[SwitchChannel]:
        return self.topology.channels_of(role)

    @property
    def stack_levels(self) -> dict[str, int]:
        return self.topology.stack_levels

    @property
    def cell_taps(self) -> tuple[tuple[str, str | None, int | None, int], ...]:
        return self.topology.cell_taps

    @property
    def path_parts(self) -> tuple[Component, ...]:
        return self.topology.path_parts

    # --- operating conditions ------------------------------------------------------------------

    @cached_property
    def ambient(self) -> Span:
        a = self.design.pack.ambient
        return Span(a.min, 25.0 if a.min <= 25.0 <= a.max else (a.min + a.max) / 2, a.max)

    @cached_property
    def charger_per_cell(self) -> Span | None:
        if self.design.charger is None or self.stack is None:
            return None
        return Span.of(self.design.charger.voltage).scaled(1.0 / self.stack.series)

    @cached_property
    def cell_voltage(self) -> Span | None:
        """Cell voltage in service: protector over-discharge detection to overcharge detection."""
        p = self.protector
        if p is None or self.cell_limits is None:
            return None
        od, oc = p.part.overdischarge.detect, p.part.overcharge.detect
        return Span(od.low, self.cell_limits.nominal, oc.high)

    @cached_property
    def gate_drive(self) -> Span | None:
        """Gate-source drive of the switches when on: the cell (or stack) voltage with
        ``gate_drive: cell``; a fixed drive capped by the stack voltage unless the part says its
        driver is boosted (``gate_drive_boosted``)."""
        p = self.protector
        if p is None:
            return None
        drive = p.part.gate_drive
        if drive != "cell" and p.part.gate_drive_boosted:
            return Span.exactly(float(drive))
        cv = self.cell_voltage
        if cv is None or self.stack is None:
            return None if drive == "cell" else Span.exactly(float(drive))
        supply = cv.scaled(self.stack.series) if p.part.cells > 1 else cv
        # A driver fed from the stack cannot drive above its own supply [derived]: the fixed
        # drive is capped by the stack at each end.
        if drive == "cell":
            return supply
        return Span(*(min(float(drive), v) for v in (supply.min, supply.typ, supply.max)))


    @cached_property
    def stack_voltage(self) -> Span | None:
        """Whole-stack voltage in service (per-cell protector window times the series count)."""
        if self.cell_voltage is None or self.stack is None:
            return None
        return self.cell_voltage.scaled(self.stack.series)

    # --- the power path (path.py) --------------------------------------------------------------

    def part_resistance(self, c: Component, temp: float, corner: str) -> float:
        """Resistance of a non-switch part in the path at ``temp`` for a corner (min/typ/max)."""
        return self.path.part_resistance(c, temp, corner)

    def channel_rds(self, ch: SwitchChannel, vgs: float, tj: float,
                    corner: str) -> tuple[float, tuple[str, ...]]:
        """A channel's on-resistance at a gate drive, junction temperature and corner, with what
        it rests on."""
        return self.path.channel_rds(ch, vgs, tj, corner)

    def network(self, rds: dict[str, float], **kw: Any) -> Network:
        """The power path as a network (see :meth:`path.PowerPath.network`)."""
        return self.path.network(rds, **kw)

    def solve_path(self, rds: dict[str, float], temp: float, corner: str, cell_r: float):
        """(solution, sense resistance, path resistance) of the path with the probe load."""
        return self.path.solve(rds, temp, corner, cell_r)

    def operating_point(self, current: float, ambient: float, vgs: float, corner: str,
                        self_heating: bool = True) -> OperatingPoint:
        return self.path.operating_point(current, ambient, vgs, corner, self_heating)

    @property
    def high_side(self) -> dict[str, bool]:
        return self.path.high_side

    def direction_network(self, off: str, external: str) -> Network:
        return self.path.direction_network(off, external)

    def conducts(self, off: str, direction: str):
        return self.path.conducts(off, direction)

    def in_series_with_path(self, refdes: str) -> bool:
        return self.path.in_series_with_path(refdes)

    @cached_property
    def gate_drive_problems(self) -> tuple[tuple[SwitchChannel, str], ...]:
        """Switches the protector's drive cannot turn on, each with the reason.

        With ``gate_drive: cell`` the gate outputs swing between the protector's ground and its
        supply, so an n-channel switch must sit on the negative rail and a p-channel one on the
        positive rail; an n-channel switch on the positive rail needs a driver above the stack,
        declared as a fixed drive (``gate_drive: 12 V``) [practice].
        """
        p = self.protector
        if p is None or p.part.gate_drive != "cell":
            return ()
        out = []
        for ch in self.channels:
            high = self.high_side.get(ch.name)
            if ch.role is None or high is None:
                continue
            if ch.channel == "n" and high:
                out.append((ch, "an n-channel switch on the positive rail needs its gate driven "
                                "above the stack, and with gate_drive: cell the gate cannot rise "
                                "above its source"))
            elif ch.channel == "p" and not high:
                out.append((ch, "a p-channel switch on the negative rail needs its gate pulled "
                                "below the stack's bottom, and with gate_drive: cell the gate "
                                "cannot fall below its source"))
        return tuple(out)


    @cached_property
    def sense_elements(self) -> tuple[str, ...]:
        """Parts of the power path whose resistance the protector's sense input sees
        (:meth:`path.PowerPath.sense_elements`); FET channels are named by package."""
        gd = self.gate_drive
        return self.path.sense_elements(gd.typ) if gd is not None else ()

    @cached_property
    def sense_by_shunt(self) -> bool:
        """True when the sense input sees resistors only, no switch channel (shunt sensing)."""
        packages = {ch.package for ch in self.channels}
        found = self.sense_elements
        return bool(found) and not any(e in packages for e in found)

    # --- trip windows --------------------------------------------------------------------------

    def _window(self, detect: Toleranced, heating: float | None = None) -> TripWindow | None:
        gd = self.gate_drive
        cont = self.design.load.continuous if heating is None else heating
        if gd is None or not self.channels:
            return None
        a, d = self.ambient, Span.of(detect)
        # Each channel's drive at the trip current itself (gate.py): the detection voltage is
        # what lifts a low-side charge switch's source.
        at_min = self.path.operating_point(cont, a.max, gd.min, "max", True, d.min)
        at_max = self.path.operating_point(0.0, a.min, gd.max, "min", False, d.max)
        at_typ = self.path.operating_point(0.0, 25.0, gd.typ, "typ", False, d.typ)
        if not min(at_min.sense_resistance, at_max.sense_resistance,
                   at_typ.sense_resistance) > 0.0:
            p = self.protector
            raise DesignMistake(p.path + ("pins", "sense"), (
                f"{p.refdes}: the load current sets up no voltage between its sense and ground "
                f"pins, so no current trips its detection; put the switches or a shunt between "
                f"them, in the path of the load current"))
        return TripWindow(Span.of(detect), at_min, at_max, at_typ)

    @cached_property
    def overcurrent_trip(self) -> TripWindow | None:
        p = self.protector
        return self._window(p.part.overcurrent.detect) if p is not None else None

    @cached_property
    def short_circuit_trip(self) -> TripWindow | None:
        p = self.protector
        if p is None or p.part.short_circuit is None:
            return None
        return self._window(p.part.short_circuit.detect)

    @cached_property
    def overcurrent_fast_trip(self) -> TripWindow | None:
        """The second (fast) over-current level's window, where the protector has one."""
        p = self.protector
        if p is None or p.part.overcurrent_fast is None:
            return None
        return self._window(p.part.overcurrent_fast.detect)

    @cached_property
    def charge_overcurrent_trip(self) -> TripWindow | None:
        """The charge over-current detection's trip window, or None without one: the same
        corners as the discharge window, its minimum with the switches heated by the charger's
        current (the continuous load when there is no charger). The path's resistance is the
        same either way; the drive is the discharge direction's, where a low-side charge switch's
        source is lifted above the protector's ground, while charge current pulls it below: the
        charge switch then sees at least that drive, so the minimum is on the safe side."""
        p, ch = self.protector, self.design.charger
        if p is None or p.part.charge_overcurrent is None:
            return None
        return self._window(p.part.charge_overcurrent.detect,
                            ch.current if ch is not None else None)

    @cached_property
    def charger_fault(self):
        """A cell through a charger that fails high (chargefault.ChargerFault), or None."""
        return chargefault.charger_fault(self)

    @cached_property
    def low_voltage_charging(self):
        """How a cell below its lower limit is charged (chargefault.LowVoltageCharging), or
        None when the protector does not say."""
        return chargefault.low_voltage_charging(self)


    @cached_property
    def hard_short(self):
        """The hard short as it happens (short.HardShort), or None: everything at the ambient
        nearest 25 °C, where the cells' internal resistance is given and no part's value is a
        guess at another temperature, every part and the cells at their lowest resistance, the
        highest cell voltage, and each switch with the gate drive the short leaves it (a
        cell-driven gate follows the collapsed cell voltage)."""
        a = self.ambient
        return short.hard_short(self, min(max(25.0, a.min), a.max), "min")

    @cached_property
    def short_onset(self):
        """The hard short at its onset, at the highest current a physical corner gives
        (short.HardShort), or None: the breaking-capacity case.

        One temperature, the lowest ambient, for cells, switches and path: switches and copper
        are least resistive there. The cells' resistance is taken at its 25 °C minimum, the only
        value the data sheet gives; a cell's resistance only rises as it cools [practice], so at
        that one temperature this bounds the current from above (and a pack carried from indoors
        into the cold, its board already cold and its cells still warm, comes close to it). The
        protector's supply is held at its highest, the one it had before the short: when the
        short begins its supply filter still holds it, so each cell-driven gate stays where it was
        while the sources move with the short (the low-side charge switch's source on P− rises
        with P+ at once); a fixed drive holds throughout.
        """
        return short.hard_short(self, self.ambient.min, "min", held=True)

    @cached_property
    def short_circuit_solution(self) -> tuple[Any, dict]:
        """(solution, channel on-resistances) of the hard short at its onset (:attr:`short_onset`)."""
        onset = self.short_onset
        return (onset.solution, onset.rds) if onset is not None else (None, {})

    @cached_property
    def charger_reversed_solution(self) -> tuple[Any, Any] | None:
        """(network, solution) of a charger connected reversed, the discharge switches off
        (events.charger_reversed_solution); None where it cannot be reversed."""
        return events.charger_reversed_solution(self)

    @cached_property
    def prospective_short_circuit(self) -> float | None:
        """Highest current a hard short across the pack terminals can draw, amperes: the onset of
        the short at the lowest ambient (:attr:`short_onset`)."""
        onset = self.short_onset
        return onset.current if onset is not None else None

    # --- blocking ------------------------------------------------------------------------------

    def blocking_voltage(self, role: str) -> list[tuple[str, float]]:
        """Cases a switch of ``role`` must block when off: (what, volts), highest first."""
        sv, ch = self.stack_voltage, self.design.charger
        cases: list[tuple[str, float]] = []
        if sv is None:
            return cases
        if role == "discharge":
            cases.append(("discharge switch off under load: the stack voltage", sv.max))
            rev = self.event("charger-reversed")
            if rev is not None and rev.voltage is not None:
                cases.append(("charger connected reversed: its open-circuit voltage plus the "
                              "stack voltage", rev.voltage))
        elif role == "charge" and ch is not None:
            cases.append(("charge switch off with the charger connected: its open-circuit "
                          "voltage minus the lowest stack voltage", ch.open_circuit_max - sv.min))
        return sorted(cases, key=lambda c: -c[1])


    # --- stress, support network, storage (stress.py, support.py, storage.py) ------------------

    @cached_property
    def switch_heat(self) -> tuple:
        """Junction temperature of every switch package per case (stress.HeatCase)."""
        return stress.switch_heat(self)

    @cached_property
    def short_circuit_pulse(self):
        """The hard short as it happens (:attr:`hard_short`) until the protection ends it
        (events.ShortCircuitPulse), or None."""
        return events.short_circuit_pulse(self)

    @cached_property
    def events(self) -> tuple:
        """The design's events in time, each at its stated corner (events.Event; docs/rules-api.md,
        "Events"): continuous-load, peak-load, permitted, gap-overload, hard-short,
        charger-reversed, turn-off-spike."""
        return events.design_events(self)

    def events_report(self) -> list[dict[str, Any]]:
        """The events as the JSON report writes them: each event's own figures and, for every
        switch package it heats (an event with a duration), what the package must survive
        (``survival.PulseHeat``): ``power`` at the worst share, the junction it ``start``s from,
        ``zth_needed`` (the Z_th at the event's duration that just reaches tj_max), the part's
        own ``zth`` there (``None`` where the part gives none) and the junction at the end
        (``tj_end``)."""
        heat: dict[int, dict[str, dict[str, Any]]] = {}
        for h in self.pulse_heat:
            heat.setdefault(id(h.event), {})[h.package] = {
                "power": h.power, "start": h.start, "zth_needed": h.needed,
                "zth": h.zth.value if h.zth is not None else None, "tj_end": h.tj}
        out = []
        for e in self.events:
            d = e.as_dict()
            if id(e) in heat:
                d["switch_heat"] = heat[id(e)]
            out.append(d)
        return out

    def cutoffs_report(self) -> list[dict[str, Any]]:
        """Every temperature cut-off of the netlist's thermistor inputs as the JSON report writes
        it: min/typ/max over every tolerance and what each tolerance alone moves it by
        (sensing.Cutoff.as_dict)."""
        return [c.as_dict() for c in self.temperature_sensing.cutoffs]

    def event(self, name: str):
        """The event called ``name`` (events.EVENT_NAMES), or None when the design has none."""
        return next((e for e in self.events if e.name == name), None)

    def turn_off_spike(self, ch: SwitchChannel):
        """The voltage a discharge switch sees interrupting a short (stress.TurnOffSpike), or None
        when the design gives no ``pack.wiring_inductance``."""
        return stress.turn_off_spike(self, ch)

    @cached_property
    def conductor_loads(self) -> tuple:
        """Highest permitted current of every trace and wire (stress.ConductorLoad)."""
        return stress.conductor_loads(self)

    @cached_property
    def current_spread(self) -> dict:
        """Channel -> how much more than its share it carries at the on-resistance spread
        (survival.Spread), for channels with parallel peers."""
        return survival.current_spread(self)

    @cached_property
    def current_sharing(self) -> tuple:
        """Each event's channel currents at the worst spread (survival.ShareCase)."""
        return survival.current_sharing(self)

    @cached_property
    def pulse_heat(self) -> tuple:
        """Each switch package's junction at the end of each event (survival.PulseHeat)."""
        return survival.pulse_heat(self)

    def avalanche(self, ch: SwitchChannel):
        """The avalanche energy of turning off a short past vds_max (survival.Avalanche), or None."""
        return survival.avalanche(self, ch)

    def turn_off_window(self, spike, limit: float):
        """The turn-off times between the spike's voltage limit and the switch's heat limit
        (survival.TurnOffWindow), or None when the stack alone reaches the limit."""
        return survival.turn_off_window(self, spike, limit)

    @cached_property
    def storage_budget(self):
        """Months in storage to the cut-off and on to the cell's lower limit (storage.StorageBudget)."""
        return storage.storage_budget(self)

    @cached_property
    def cell_balance(self):
        """The series stack's drift per charge cycle against its balancer (balance.CellBalance),
        or None for a single level."""
        return cell_balance(self)

    @cached_property
    def supply_filter(self):
        return support.supply_filter(self)

    @cached_property
    def sense_resistor(self):
        return support.sense_resistor(self)

    @cached_property
    def support_scenarios(self) -> list:
        """(case, solution) of the stress cases capacitors and resistors are checked in."""
        return support.scenarios(self)

    @cached_property
    def capacitor_stress(self) -> tuple:
        return support.capacitor_stress(self)

    @cached_property
    def resistor_stress(self) -> tuple:
        return support.resistor_stress(self)

    @cached_property
    def backup_protection(self) -> tuple:
        """Every second-level (backup) overvoltage protector, with its detection window, taps and
        the heater fuses it reaches (backup.Backup)."""
        return backup.backups(self)

    @cached_property
    def open_tap_watchers(self) -> tuple[str, ...]:
        """The protectors that detect an open cell-tap wire (backup.open_tap_watchers)."""
        return backup.open_tap_watchers(self)

    @cached_property
    def temperature_sensing(self) -> sensing.TemperatureSensing:
        """The temperature inputs' cut-offs over every tolerance (sensing.py)."""
        return sensing.temperature_sensing(self)

    def cell_heating(self, theta: float,
                     steady_after: float = math.inf) -> sensing.CellHeating | None:
        """The cells' highest temperature at the continuous load (or a peak lasting
        ``steady_after`` or more), through ``theta`` K/W."""
        return sensing.cell_heating(self, theta, steady_after)

    @cached_property
    def pack_energy(self) -> float | None:
        return sensing.pack_energy(self)

    @cached_property
    def discharge_window(self) -> sensing.DischargeWindow | None:
        """The cells' discharge temperature window: the cell part's, else the common default."""
        return sensing.discharge_window(self)

    # --- reporting -----------------------------------------------------------------------------

    def figures(self) -> dict[str, KeyFigure]:
        """The design's key figures (:class:`packwarden.figures.KeyFigure`), by name, unrounded SI
        values, each declared in :mod:`packwarden.figures` (reported even when no rule fires)."""
        out: dict[str, Any] = {"component_count": len(self.netlist.components)}
        if self.stack is not None:
            out.update(cells=len(self.stack.cells), series=self.stack.series,
                       parallel=self.stack.parallel)
        t = self.overcurrent_trip
        if t is not None:
            out.update(trip_current_min=t.min, trip_current_typ=t.typ, trip_current_max=t.max,
                       sense_resistance_min=t.sense_resistance.min,
                       sense_resistance_typ=t.sense_resistance.typ,
                       sense_resistance_max=t.sense_resistance.max)
        s = self.short_circuit_trip
        if s is not None:
            out.update(short_circuit_trip_min=s.min, short_circuit_trip_max=s.max)
        f = self.overcurrent_fast_trip
        if f is not None:
            out.update(fast_trip_min=f.min, fast_trip_max=f.max)
        psc = self.prospective_short_circuit
        if psc is not None:
            out["prospective_short_circuit"] = psc
        if self.gate_drive is not None:
            out.update(gate_drive_min=self.gate_drive.min, gate_drive_max=self.gate_drive.max)
        # hottest switch junction under the continuous load at the highest ambient (a team policy
        # bounds it, e.g. 100 °C for a product line); a lower bound when the switch runs away
        continuous = [h.tj for h in self.switch_heat if h.case == "continuous"]
        if continuous:
            out["switch_tj_continuous"] = max(continuous)
        sb = self.storage_budget
        if sb is not None:
            out["storage_months_to_cutoff"] = sb.to_cutoff.months
            if sb.to_lower_limit is not None:
                out["storage_months_cutoff_to_lower_limit"] = sb.to_lower_limit.months
        out.update(self._balance_figures())
        out.update(self._cutoff_figures())
        return typed(_uncomputed(out).items())

    def _balance_figures(self) -> dict[str, float]:
        cb = self.cell_balance
        if cb is None:
            return {}
        out = {"balance_drift_per_cycle": cb.worst.need,
               "balance_removal_per_cycle": cb.worst.removal,
               "balance_imbalance": cb.imbalance}
        if cb.high_cell_voltage is not None:
            out.update(balance_cell_voltage_min=cb.low_cell_voltage,
                       balance_cell_voltage_max=cb.high_cell_voltage)
        return out

    def _cutoff_figures(self) -> dict[str, float]:
        """The temperatures each guarded end stops at (the input that acts first), min/typ/max."""
        out = {}
        for name in sensing.THRESHOLDS:
            c = self.temperature_sensing.effective(name)
            if c is not None:
                out.update({f"{name}_cutoff_{end}": c.temperature.at(end)
                            for end in ("min", "typ", "max")})
            if c is not None and c.release is not None:
                out.update({f"{name}_release_{end}": c.release.at(end)
                            for end in ("min", "typ", "max")})
        return out


def _uncomputed(out: dict[str, Any]) -> dict[str, Any]:
    """The figures with None (reported "n/a", JSON null) where the model could not compute them,
    rather than the zero an open path gives: no sense path, so no trip current; terminals that
    reach no cell, so no short and no heat under the load."""
    if "trip_current_min" in out and not all(
            math.isfinite(out[f"sense_resistance_{c}"]) for c in ("min", "typ", "max")):
        out.update(trip_current_min=None, trip_current_typ=None, trip_current_max=None)
    if out.get("prospective_short_circuit") == 0.0:
        out["prospective_short_circuit"] = None
        for name in ("short_circuit_trip_min", "short_circuit_trip_max", "switch_tj_continuous"):
            if name in out:
                out[name] = None
    return out
