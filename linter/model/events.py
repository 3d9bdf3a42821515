"""Events in time: what a pack lives through, each at its stated corner, computed once.

The protection acts over time, so a part is judged against an event (a current for a duration at
a corner), not against a steady corner alone. Each event here comes from the one solver
(:mod:`path`: operating points and the short-circuit solve), and carries its figures: the pack
current, each element's current where it differs, how long it lasts, the voltage where it
matters, and each element's dissipation (switch packages by package, other parts of the path by
reference). Rules, reports and team rules read them as ``DesignModel.events``.

The events of this layer (see docs/rules-api.md, "Events"):

* ``continuous-load`` — the design's continuous load, for ever;
* ``peak-load`` — the design's peak load for its duration;
* ``permitted`` — the highest current the over-current protection lets flow for ever;
* ``gap-overload`` — the largest current only the over-current path clears, for its longest delay;
* ``hard-short`` — a hard short across the pack terminals until the protection ends it;
* ``weakest-short`` — the weakest short the protection must still catch, until it ends it (or
  for ever, when no detection surely does);
* ``switch-on-inrush`` — the charging pulse of the load's capacitance when the switches close;
* ``charger-reversed`` — a charger connected the wrong way round, the discharge switches off;
* ``turn-off-spike`` — a discharge switch interrupting the hard short through the wiring's
  inductance;
* ``storage`` — the pack on the shelf: its drains before and after the over-discharge cut-off;
* ``fast-gap-overload`` — with a second (fast) over-current level: the largest current only the
  slow level clears, just below the fast level's trip maximum, for the slow level's longest delay;
* ``charge`` — the charger's current into the pack, for ever;
* ``regen`` — the load's regenerative peak into the pack for its duration;
* ``charger-fault`` — a charger that fails high, its current limit flowing until the overcharge
  detection's longest delay ends it.

Units are SI: amperes, ohms, volts, watts, seconds, °C.
"""

from __future__ import annotations

import math
from dataclasses import field, replace
from typing import TYPE_CHECKING, Any

from ..records import record
from . import gate, inrush, short, thermal
from .network import NetworkError, Source
from .ocv import HOURS_PER_MONTH
from .values import SIGNAL_OHMS, ModelProblem, corner_value, memo_key, spread_low

if TYPE_CHECKING:  # pragma: no cover
    from .design import DesignModel
    from .path import OperatingPoint
    from .topology import SwitchChannel

__all__ = ["Event", "EVENT_NAMES", "SHORT_EVENTS", "CHARGE_EVENTS", "design_events", "pulse_i2t", "PermittedPoint",
           "permitted_point", "ShortCircuitPulse", "short_circuit_pulse", "InrushEvent",
           "InrushTrip", "InrushCorner", "PrechargeFigures", "inrush_bank", "precharge_paths",
           "WeakestShort", "weakest_short", "SECONDS_PER_MONTH", "CHARGER_SOURCE_R",
           "SWITCH_ON_R", "terminal_network", "charger_reversed_solution",
           "DEFAULT_TURN_OFF_TIME", "TurnOffSpike", "turn_off_spike", "FAST_DETECTION"]

#: The events this layer computes, in the order a report lists them.
EVENT_NAMES = ("continuous-load", "peak-load", "permitted", "gap-overload", "hard-short",
               "weakest-short", "switch-on-inrush", "charger-reversed", "turn-off-spike",
               "storage", "fast-gap-overload",
               "charge", "regen", "charger-fault")
#: The events whose current flows into the cells (charge direction): a cell meets them against
#: its charge rating, not its discharge ratings.
CHARGE_EVENTS = ("charge", "regen", "charger-fault")
#: The events that are external short circuits across the pack terminals, and the end of one (the
#: turn-off spike): a cell meets them in its safety standard's external short-circuit test
#: (IEC 62133-2), not as a rated pulse.
SHORT_EVENTS = ("hard-short", "weakest-short", "turn-off-spike")


def pulse_i2t(current: float, duration: float) -> float:
    """I²t of a rectangular pulse, A²s [published: definition of I²t, docs/references.md]."""
    if current < 0 or duration < 0 or not (math.isfinite(current) and math.isfinite(duration)):
        raise ValueError(f"current and duration must be finite and >= 0, got {current}, {duration}")
    return current * current * duration


@record(frozen=True)
class Event:
    """One event at its stated corner.

    ``ambient`` is the ambient it is taken at; ``current`` the pack current (at the terminals); ``element_current`` the current of each
    switch channel (by channel name) and of each other part of the path that carries current (by
    reference), where they differ from it; ``duration`` how long the event lasts, ``None`` for
    ever; ``dissipation`` watts per switch package and per part; ``voltage`` the voltage the part
    that ends the event must interrupt, where it matters; ``detection`` which detection of the
    protector ends it (``None``: none does).
    """

    name: str
    corner: str  # the corner said in words
    ambient: float  # °C
    current: float
    duration: float | None
    element_current: dict
    dissipation: dict
    voltage: float | None = None
    detection: str | None = None
    assumptions: tuple[str, ...] = ()
    #: By switch channel, where the event solves them (the hard short): the gate drive it sees
    #: (V), what carries its current ("channel", "body diode", "channel and body diode") and
    #: what it dissipates (W: I²·R in the channel, V_F·I in the body diode).
    gate_voltage: dict = field(default_factory=dict)
    conduction: dict = field(default_factory=dict)
    channel_dissipation: dict = field(default_factory=dict)
    #: The event's own figures beyond its current, by name in SI units (the weakest short's
    #: resistances; storage's months and drain currents), for a message or a report to quote.
    figures: dict = field(default_factory=dict)

    @property
    def i2t(self) -> float | None:
        """The pack current's I²t over the event, A²s; ``None`` for an event that lasts for ever."""
        return None if self.duration is None else pulse_i2t(self.current, self.duration)

    def current_through(self, element: str) -> float:
        """The current of a channel or part during the event (the pack current when unknown)."""
        return self.element_current.get(element, self.current)

    def i2t_through(self, element: str) -> float | None:
        """I²t of a channel or part over the event, A²s; ``None`` for an event that lasts for ever."""
        if self.duration is None:
            return None
        return pulse_i2t(self.current_through(element), self.duration)

    def as_dict(self) -> dict[str, Any]:
        """The event as the JSON report writes it (unrounded)."""
        return {"name": self.name, "corner": self.corner, "ambient": self.ambient,
                "current": self.current,
                "duration": self.duration, "i2t": self.i2t, "voltage": self.voltage,
                "detection": self.detection, "element_current": dict(self.element_current),
                "dissipation": dict(self.dissipation), "gate_voltage": dict(self.gate_voltage),
                "conduction": dict(self.conduction),
                "channel_dissipation": dict(self.channel_dissipation),
                "figures": dict(self.figures)}


# --- the permitted current ---------------------------------------------------------------------

@record(frozen=True)
class PermittedPoint:
    """The current just below the over-current trip, found with the switches at the junction
    temperature it causes: I = V_detect / R_sense(T_J), T_J = T_A + P·θJA."""

    current: float
    rds: dict  # channel name -> Ω at the junction temperature
    channel_current: dict  # channel name -> A
    power: dict  # package -> W
    tj: dict  # package -> °C
    runaway: bool
    assumptions: tuple[str, ...]
    solution: Any = None
    unheated: float = math.nan  # the current with the switches at the ambient, A
    channel_vgs: dict = field(default_factory=dict)  # channel name -> V_GS (gate.py)


def permitted_point(m: "DesignModel", vdet: float, ambient: float, vgs: float,
                    corner: str) -> PermittedPoint | None:
    """:func:`solve_permitted_point`, once per netlist and values
    (``PowerPath.remembered``): the permitted-current event and the heat just below the trip
    ask for the same point, and so do the designs of an equal netlist."""
    key = ("permitted point", memo_key(vdet), memo_key(ambient), memo_key(vgs), corner)
    return m.path.remembered(key, lambda: solve_permitted_point(m, vdet, ambient, vgs, corner))


def solve_permitted_point(m: "DesignModel", vdet: float, ambient: float, vgs: float,
                          corner: str) -> PermittedPoint | None:
    """The self-heated permitted current at one corner, or None when the path has no sense
    resistance. With a shunt as the sense resistance the current does not depend on T_J and this
    is the trip maximum at that corner."""
    packages = {ch.package: ch.part for ch in m.channels}
    cell_r = corner_value(m.stack.part.internal_resistance, corner)
    tj = {pk: ambient for pk in packages}
    runaway = False
    notes: list[str] = []
    state = None
    unheated = math.nan
    previous: dict[str, tuple[float, float]] = {}
    vg = {ch.name: vgs for ch in m.channels}
    for _ in range(thermal.TRIP_ITERATIONS):
        rds, notes = {}, []
        for ch in m.channels:
            rds[ch.name], n = m.channel_rds(ch, vg[ch.name], tj[ch.package], corner)
            notes += [x for x in n if x not in notes]
        sol, sense, _path = m.solve_path(rds, ambient, corner, cell_r)
        if sol is None or not math.isfinite(sense) or sense <= 0:
            return None
        i_load = abs(sol.current("(load)"))
        current = vdet / sense
        if state is None:
            unheated = current
        share = {ch.name: abs(sol.current(ch.name)) / i_load for ch in m.channels}
        ich = {name: f * current for name, f in share.items()}
        power = {pk: 0.0 for pk in packages}
        for ch in m.channels:
            power[ch.package] += ich[ch.name] ** 2 * rds[ch.name]
        state = (current, rds, ich, power, sol, vg)
        # Each channel's drive at this current (gate.py), iterated with the temperatures.
        vg = gate.channel_vgs(vgs, gate.lift_per_ampere(m.topology, m.high_side, sol),
                              [ch.name for ch in m.channels], current)
        target = {pk: ambient + power[pk] * packages[pk].theta_ja for pk in packages}
        delta = max(abs(target[pk] - tj[pk]) for pk in packages)
        if delta < thermal.TJ_TOLERANCE and gate.settled(state[5], vg):
            tj = target
            break
        # With the FETs as the sense resistance, P = V²/R falls as T_J rises and the plain
        # iteration oscillates; damping settles it, and the secant (where it applies) in a few
        # solves instead of tens.
        step = {pk: thermal.accelerated_step(tj[pk], target[pk], previous.get(pk), thermal.TRIP_DAMPING)
                for pk in packages}
        previous = {pk: (tj[pk], target[pk] - tj[pk]) for pk in packages}
        tj = step
        if any(tj[pk] > packages[pk].tj_max + thermal.RUNAWAY_MARGIN for pk in packages):
            runaway = True
            break
    else:
        runaway = True
    current, rds, ich, power, sol, vg = state
    said = gate.describe(vgs, vg)
    return PermittedPoint(current, rds, ich, power, tj, runaway,
                          tuple(notes) + ((said,) if said else ()), sol, unheated, vg)


# --- the hard short ----------------------------------------------------------------------------

@record(frozen=True)
class ShortCircuitPulse:
    """A hard short across the pack terminals as it happens, until the protection turns it off.

    ``current`` is the short's current with the gate drive it leaves the switches
    (:attr:`DesignModel.hard_short`, :mod:`short`); ``channel_current`` how it divides across
    the switch channels (body diodes included); ``duration`` the longest delay of the detection
    that ends it: the short-circuit detection when the sense voltage of the short passes its
    detection maximum, otherwise the over-current detection.
    """

    current: float
    channel_current: dict
    duration: float
    detection: str  # "short-circuit" | "over-current" | "fast over-current"
    rds: dict  # channel name -> Ω in the short-circuit solve (0 for a starved channel)

    def i2t(self, channel: str) -> float:
        return pulse_i2t(self.channel_current.get(channel, 0.0), self.duration)


def short_circuit_pulse(m: "DesignModel") -> ShortCircuitPulse | None:
    hs, p = m.hard_short, m.protector
    if hs is None or p is None:
        return None
    sc = p.part.short_circuit
    if sc is not None and hs.sense_voltage is not None:
        caught = hs.sense_voltage > sc.detect.high
    else:
        trip = m.short_circuit_trip
        caught = sc is not None and trip is not None and hs.current > trip.max
    if caught:
        duration, detection = sc.delay.high, "short-circuit"
    else:
        duration, detection, _ = _gap_clearing(m, hs.current)
    return ShortCircuitPulse(hs.current, hs.channel_current, duration, detection, hs.rds)


# --- the events of a design --------------------------------------------------------------------

def _figures(m: "DesignModel", current: float, channel_current: dict, rds: dict, sol: Any,
             temp: float, corner: str) -> tuple[dict, dict]:
    """(element currents, dissipation) of the path carrying ``current``: switch channels from
    their currents and on-resistances, the other parts from their share in the solution ``sol``
    (solved with any load: the network is linear, so the shares hold at every current) at their
    resistance at ``temp`` and ``corner``."""
    currents = {name: i for name, i in channel_current.items()}
    power: dict[str, float] = {}
    for ch in m.channels:
        power[ch.package] = power.get(ch.package, 0.0) + (
            channel_current.get(ch.name, 0.0) ** 2 * rds.get(ch.name, 0.0))
    i_load = abs(sol.current("(load)")) if sol is not None else 0.0
    if i_load > 0:
        for c in m.path_parts:
            a, b = c.pins.get("1"), c.pins.get("2")
            if not a or not b or a == b:
                continue
            branch = sol.currents.get(c.refdes)
            if branch is None:
                continue
            i = abs(branch) / i_load * current
            r = m.part_resistance(c, temp, corner)
            if i <= 1e-9 * current or r > SIGNAL_OHMS:
                continue  # a signal resistor on a path net, not in the pack's current
            currents[c.refdes] = i
            power[c.refdes] = i * i * r
    return currents, power


def _at_point(m: "DesignModel", name: str, op: "OperatingPoint", duration: float | None,
              corner: str, detection: str | None = None, voltage: float | None = None,
              current: float | None = None) -> Event:
    """An event read off an operating point; ``current`` scales an unheated point's shares."""
    if current is None:
        current, ich = op.current, dict(op.channel_current)
    else:
        ich = {n: f * current for n, f in op.share.items()}
    currents, power = _figures(m, current, ich, op.rds, op.solution, op.ambient, op.corner)
    return Event(name, corner, op.ambient, current, duration, currents, power, voltage, detection,
                 tuple(op.assumptions))


def _drive(vgs: float, corner: str) -> str:
    ends = {"max": "highest", "min": "lowest", "typ": "typical"}
    return f"gate drive {vgs:.3g} V, every part at its {ends[corner]} resistance"


def design_events(m: "DesignModel") -> tuple[Event, ...]:
    """The design's events (:data:`EVENT_NAMES`), each at its corner; empty without a protector
    driving switches in a cell stack."""
    gd, p = m.gate_drive, m.protector
    if gd is None or p is None or not m.channels or m.stack is None:
        return ()
    a, load = m.ambient, m.design.load
    out: list[Event] = []
    # The fixed loads heat the switches most at the highest ambient and on-resistance, as the
    # switch-temperature check takes them (the same operating points, solved once).
    op = m.operating_point(load.continuous, a.max, gd.min, "max", self_heating=True)
    hot = (f"highest ambient {a.max:g} °C, {_drive(gd.min, 'max')}, switches at their "
           f"self-heated steady state")
    out.append(_at_point(m, "continuous-load", op, None, hot))
    if load.peak is not None:
        op = m.operating_point(load.peak.current, a.max, gd.min, "max", self_heating=True)
        out.append(_at_point(m, "peak-load", op, load.peak.duration, hot))
    permitted = _permitted(m, gd.max, a.min)
    if permitted is not None:
        out.append(permitted)
    pulse = m.short_circuit_pulse
    sc = m.short_circuit_trip
    sv = m.stack_voltage
    vmax = sv.max if sv is not None else None
    if sc is not None and p.part.short_circuit is not None and (
            pulse is None or pulse.detection == "short-circuit"):
        # Just below the short-circuit trip maximum the short-circuit detection may not act, so
        # the over-current detection ends it, after its longest delay: the largest I²t the
        # over-current path lets through.
        at = sc.at_max
        words = (f"just below the short-circuit trip maximum: detection max "
                 f"{sc.detect.max * 1e3:.4g} mV over the lowest sense resistance "
                 f"{at.sense_resistance * 1e3:.4g} mΩ (lowest ambient {at.ambient:g} °C, "
                 f"{_drive(at.vgs, at.corner)}, switches unheated), for the longest "
                 f"over-current delay")
        delay, detection, said = _gap_clearing(m, sc.max)
        out.append(_at_point(m, "gap-overload", at, delay, words.replace(
            "the longest over-current delay", said), detection, vmax, current=sc.max))
    if pulse is not None:
        out.append(_hard_short(m, pulse, vmax))
    out.extend(_weakest_short(m))
    inrush_event = _switch_on_inrush(m)
    if inrush_event is not None:
        out.append(inrush_event)
    out += _charger_reversed(m)
    out += _turn_off_spike(m, out)
    out.extend(_storage(m))
    out += _fast_gap_overload(m, vmax)
    out.extend(_charge(m))
    out.extend(_regen(m))
    out.extend(_charger_fault(m))
    return tuple(out)


def _permitted(m: "DesignModel", vgs: float, ambient: float) -> Event | None:
    """The current the protection permits for ever, where it is highest: the lowest ambient and
    on-resistance. With switch sensing the switches heat and their resistance rises until
    I = V_detect / R_sense(T_J) balances (below the unheated trip maximum); with a shunt it is the
    trip maximum at that corner."""
    vdet = m.protector.part.overcurrent.detect.high
    pt = permitted_point(m, vdet, ambient, vgs, "min")
    if pt is None:
        return None
    currents, power = _figures(m, pt.current, pt.channel_current, pt.rds, pt.solution, ambient,
                               "min")
    # Whether the switches are the sense resistance shows in the balance itself: with a shunt
    # their heat does not move the current, which stays the trip maximum at this corner.
    if abs(pt.current - pt.unheated) <= 1e-9 * pt.unheated:
        heated = "the trip maximum: the switches' heat does not move it (a shunt senses)"
    else:
        heated = (f"self-heated: the switches at the junction temperature the current causes "
                  f"(unheated, {pt.unheated:.3g} A)")
    words = (f"just below the over-current trip for ever: detection max {vdet * 1e3:.4g} mV, "
             f"lowest ambient {ambient:g} °C, {_drive(vgs, 'min')}, {heated}")
    return Event("permitted", words, ambient, pt.current, None, currents, power, None, None,
                 pt.assumptions + (("no steady state below tj_max: a lower bound",)
                                   if pt.runaway else ()))


# --- switch-on inrush --------------------------------------------------------------------------

@record(frozen=True)
class InrushCorner:
    """The switch-on pulse at one corner against one detection's thresholds at that corner:
    above ``trip_max`` every unit detects it, above ``trip_min`` the most sensitive one."""

    corner: str  # "lowest loop resistance" | "highest loop resistance"
    peak: float  # A
    loop_resistance: float  # Ω
    time_constant: float  # s
    trip_min: float  # A, the detection minimum over the sense resistance at this corner
    trip_max: float  # A
    time_above_min: float  # s
    time_above_max: float  # s

    def as_dict(self) -> dict[str, Any]:
        return {"corner": self.corner, "peak": self.peak, "loop_resistance": self.loop_resistance,
                "time_constant": self.time_constant, "trip_min": self.trip_min,
                "trip_max": self.trip_max, "time_above_min": self.time_above_min,
                "time_above_max": self.time_above_max}


@record(frozen=True)
class InrushTrip:
    """How long the switch-on pulse stays above one detection's trip window, against its shortest
    delay, at each end of the loop resistance. The lowest loop resistance gives the highest peak;
    the highest gives the longest pulse, and while the peak is over e times the threshold the
    time above it, τ·ln(V/(R·I_th)), grows with R [derived: its derivative in R is
    C·(ln(I_pk/I_th) - 1)]."""

    detection: str  # "short-circuit" | "over-current" | "fast over-current"
    delay_min: float  # s
    corners: tuple  # InrushCorner, one per end of the loop resistance

    @property
    def longest(self) -> "InrushCorner":
        """The corner longest above the trip maximum."""
        return max(self.corners, key=lambda c: c.time_above_max)

    @property
    def longest_above_min(self) -> "InrushCorner":
        return max(self.corners, key=lambda c: c.time_above_min)

    @property
    def trips(self) -> bool:
        """Every unit trips: above the trip maximum for longer than the shortest delay."""
        return self.longest.time_above_max > self.delay_min

    @property
    def may_trip(self) -> bool:
        """The most sensitive unit trips: above the trip minimum for longer than the shortest delay."""
        return self.longest_above_min.time_above_min > self.delay_min

    def as_dict(self) -> dict[str, Any]:
        return {"detection": self.detection, "delay_min": self.delay_min, "trips": self.trips,
                "may_trip": self.may_trip, "corners": [c.as_dict() for c in self.corners]}


@record(frozen=True)
class PrechargeFigures:
    """The pre-charge path's pulse and the step when the main switches close.

    ``peak`` is the current as the pre-charge switch closes (lowest resistance, the rest of the
    loop left out: a few milliohms against ohms); ``resistor_energy`` ½CV², all the capacitance
    stores, an upper bound of the resistor's share; ``time_constant`` the slowest charge (highest
    resistance, with the loop), which leaves ``voltage_left`` when the main switches close after
    the shortest ``delay``.
    """

    refdes: str
    resistance_min: float  # Ω
    resistance_max: float  # Ω
    switch_resistance: float  # Ω
    peak: float  # A
    resistor_power: float  # W at the peak
    resistor_energy: float  # J
    switch_power: float  # W at the peak
    switch_energy: float  # J
    time_constant: float  # s
    delay: float  # s, the shortest
    voltage_left: float  # V across the loop when the main switches close

    def as_dict(self) -> dict[str, Any]:
        return {"refdes": self.refdes, "resistance_min": self.resistance_min,
                "resistance_max": self.resistance_max, "switch_resistance": self.switch_resistance,
                "peak": self.peak, "resistor_power": self.resistor_power,
                "resistor_energy": self.resistor_energy, "switch_power": self.switch_power,
                "switch_energy": self.switch_energy, "time_constant": self.time_constant,
                "delay": self.delay, "voltage_left": self.voltage_left}


@record(frozen=True)
class InrushEvent(Event):
    """The switch-on pulse through the main switches (after pre-charge, when there is one).

    ``current`` is its peak and ``duration`` its time constant τ; ``i2t`` is the exponential
    pulse's I_pk²·τ/2. ``capacitance`` and ``esr`` are the bank's (the load's input and every
    capacitor across the terminals, ``sources``: (where, F, Ω)); ``loop_resistance`` the whole
    loop's, ESR included; ``energy`` what the loop dissipates; ``trips`` each detection's window
    against the pulse; ``precharge`` the pre-charge path's figures, or None.
    """

    capacitance: float = 0.0
    esr: float = 0.0
    loop_resistance: float = math.inf
    energy: float = 0.0
    sources: tuple = ()
    trips: tuple = ()
    precharge: PrechargeFigures | None = None

    @property
    def time_constant(self) -> float:
        return self.duration or 0.0

    @property
    def i2t(self) -> float | None:
        return self.current * self.current * self.time_constant / 2.0

    def i2t_through(self, element: str) -> float | None:
        i = self.current_through(element)
        return i * i * self.time_constant / 2.0

    def as_dict(self) -> dict[str, Any]:
        out = super().as_dict()
        out.update(capacitance=self.capacitance, esr=self.esr,
                   loop_resistance=self.loop_resistance, time_constant=self.time_constant,
                   energy=self.energy,
                   sources=[{"where": w, "capacitance": c, "esr": r} for w, c, r in self.sources],
                   trips=[t.as_dict() for t in self.trips],
                   precharge=self.precharge.as_dict() if self.precharge else None)
        return out


def inrush_bank(m: "DesignModel") -> tuple[tuple[str, float, float], ...]:
    """The capacitance the switches close onto: (where, F, ESR Ω) for the load's input
    (``"load"``) and each capacitor the netlist places across the pack terminals (by reference)."""
    out = []
    load = m.design.load
    if load.input_capacitance is not None:
        out.append(("load", load.input_capacitance, load.input_esr or 0.0))
    terminals = set(m.terminals)
    for c in m.netlist.of_kind("capacitor"):
        if c.part is not None and {c.pins.get("1"), c.pins.get("2")} == terminals:
            out.append((c.refdes, c.part.value, c.part.esr or 0.0))
    return tuple(out)


def precharge_paths(m: "DesignModel") -> tuple[tuple[Any, bool], ...]:
    """Each pre-charge component with whether it bridges the discharge switches: one pin on a
    discharge channel's end, the other on the far end of the discharge channels or of the whole
    switch chain (discharge and charge channels), so it carries the charge around them."""
    discharge = {n for ch in m.channels_of("discharge") for n in (ch.drain, ch.source)}
    chain = {n for ch in m.channels for n in (ch.drain, ch.source)}
    out = []
    for c in m.netlist.of_kind("precharge"):
        if c.part is None:
            continue  # an unknown part: unknown-part's finding
        a, b = c.pins.get("1"), c.pins.get("2")
        out.append((c, a != b and a in chain and b in chain and bool({a, b} & discharge)))
    return tuple(out)


#: A bank charged faster than this through the loop's resistance is no switch-on event, seconds: the
#: loop's inductance (tens of nanohenries in any pack's wiring [practice]) holds the current well
#: below V/R over so short a time (L/R of 50 nH over 10 mΩ is 5 µs) [derived: RL rise time], and
#: the charge is microjoules. A terminal capacitor of 100 nF through 20 mΩ charges in 2 ns.
INRUSH_MIN_TIME_CONSTANT = 1e-6


def _switch_on_inrush(m: "DesignModel") -> InrushEvent | None:
    """The charging pulse of the bank at switch-on, the bank empty, where it is highest: the
    highest stack voltage over the lowest loop resistance, the corner of the hard short (whose
    solve gives the loop's resistance: the pack's current into its terminals, no second solve).
    Each detection judges it there and at the highest loop resistance, where it lasts longer."""
    sources = inrush_bank(m)
    c_bank, esr = inrush.equivalent_bank((c, r) for _, c, r in sources)
    sv, gd, a = m.stack_voltage, m.gate_drive, m.ambient
    sol, rds = m.short_circuit_solution
    if c_bank <= 0 or sol is None or sv is None or gd is None:
        return None
    pos, neg = m.terminals
    i_short = abs(sol.current("(load)"))
    v_terminals = sol.voltage_between(pos, neg)
    if not i_short > 0 or v_terminals is None:
        return None
    emf = sv.max
    source_r = (emf - abs(v_terminals)) / i_short  # cells, switches, shunt, fuse, copper
    loop_r = source_r + esr
    if not (loop_r > 0 and math.isfinite(loop_r)):
        return None  # nothing limits the pulse: the hard short's findings say why
    if loop_r * c_bank < INRUSH_MIN_TIME_CONSTANT:
        return None  # a decoupling capacitor, not a bank: the wiring's inductance rules
    full = inrush.RcPulse(emf, loop_r, c_bank)
    paths = [c for c, ok in precharge_paths(m) if ok]
    pre = _precharge(paths[0], emf, loop_r, c_bank, full.energy) if paths else None

    def pulse_at(ohms: float) -> inrush.RcPulse:
        # The main switches close onto the bank, or onto what the pre-charge left of it.
        if pre is None:
            return inrush.RcPulse(emf, ohms, c_bank)
        tau = (pre.resistance_max + pre.switch_resistance + ohms) * c_bank
        return inrush.RcPulse(inrush.voltage_left(emf, tau, pre.delay), ohms, c_bank)

    main = pulse_at(loop_r)
    ends = [("lowest loop resistance", main, False)]
    # The other end of the loop resistance: every part at its highest, the highest ambient, the
    # switches warm from the continuous load (switched on again after running): the trip
    # windows' own point, already solved.
    window = m.short_circuit_trip or m.overcurrent_trip
    if window is not None:
        cells_r = (corner_value(m.stack.part.internal_resistance, "max") * m.stack.series
                   / m.stack.parallel)
        hot_r = cells_r + window.at_min.path_resistance + esr
        if math.isfinite(hot_r) and hot_r > loop_r:
            ends.append(("highest loop resistance", pulse_at(hot_r), True))
    p = m.protector
    trips = []
    for detection, window, threshold in (("short-circuit", m.short_circuit_trip,
                                          p.part.short_circuit),
                                         ("over-current", m.overcurrent_trip, p.part.overcurrent)):
        if window is None or threshold is None:
            continue
        corners = []
        for words, pulse, highest in ends:
            op = window.at_min if highest else window.at_max
            lo = threshold.detect.low / op.sense_resistance
            hi = threshold.detect.high / op.sense_resistance
            corners.append(InrushCorner(words, pulse.peak, pulse.ohms, pulse.time_constant, lo, hi,
                                        pulse.time_above(lo), pulse.time_above(hi)))
        trips.append(InrushTrip(detection, spread_low(threshold.delay), tuple(corners)))
    scale = main.peak / i_short
    ich = {ch.name: abs(sol.current(ch.name)) * scale for ch in m.channels}
    currents, power = _figures(m, main.peak, ich, rds, sol, a.min, "min")
    if pre is not None:
        currents[pre.refdes] = pre.peak
        power[pre.refdes] = pre.resistor_power + pre.switch_power
    tripping = next((t.detection for t in trips if t.trips), None)
    state = "bank empty"
    if pre is not None:
        state = (f"after pre-charge through {pre.refdes} for its shortest delay "
                f"{pre.delay * 1e3:.4g} ms (highest resistance, the slowest charge)")
    words = (f"switch-on into {c_bank * 1e6:.4g} µF: highest stack voltage {emf:.4g} V, lowest "
             f"ambient {a.min:g} °C, {_drive(gd.max, 'min')}, cells at their lowest internal "
             f"resistance, {state}")
    notes = ()
    if len(paths) > 1:
        notes = (f"{len(paths)} pre-charge paths: {paths[0].refdes} is taken",)
    return InrushEvent("switch-on-inrush", words, a.min, main.peak, main.time_constant, currents,
                       power, emf, tripping, notes, capacitance=c_bank, esr=esr,
                       loop_resistance=loop_r, energy=main.energy, sources=sources,
                       trips=tuple(trips), precharge=pre)


def _precharge(c: Any, emf: float, loop_r: float, farads: float, energy: float) -> PrechargeFigures:
    """The pre-charge pulse of component ``c``: its peak at the lowest resistance (the rest of the
    loop, milliohms against ohms, left out: a higher peak), the resistor's energy as all the bank
    takes (½CV², an upper bound of its share), the slowest charge at its highest resistance with
    the loop, and the voltage left when the main switches close after the shortest delay."""
    part = c.part
    r_min, r_max = spread_low(part.resistance), part.resistance.high
    r_sw = part.switch_resistance
    delay = spread_low(part.delay)
    i_pre = emf / (r_min + r_sw)
    tau = (r_max + r_sw + loop_r) * farads
    return PrechargeFigures(c.refdes, r_min, r_max, r_sw, i_pre, i_pre * i_pre * r_min, energy,
                            i_pre * i_pre * r_sw, energy * r_sw / (r_min + r_sw), tau, delay,
                            inrush.voltage_left(emf, tau, delay))


def _hard_short(m: "DesignModel", pulse: ShortCircuitPulse, vmax: float | None) -> Event:
    """The hard short as it happens (:mod:`short`), until the detection that ends it."""
    hs = m.hard_short
    currents, power = _figures(m, hs.current, hs.channel_current, {}, hs.solution, hs.ambient,
                               hs.corner)
    for package, watts in hs.package_power.items():
        power[package] = watts
    if hs.drive == "fixed":
        drive = f"the fixed gate drive {m.gate_drive.max:.3g} V held by its driver"
    else:
        drive = ("the protector's supply and its gate outputs following the collapsed cell "
                 f"voltage ({hs.describe_drive()})")
    where = ("the temperature the cells' internal resistance is given at" if hs.ambient == 25.0
             else "the ambient nearest the 25 °C the cells' internal resistance is given at")
    words = (f"hard short across the pack terminals as it happens: everything at {hs.ambient:g} °C "
             f"({where}), highest cell voltage {hs.emf:.4g} V, every part and the cells at their "
             f"lowest resistance, {drive}, for the longest {pulse.detection} delay")
    return Event("hard-short", words, hs.ambient, hs.current, pulse.duration, currents, power,
                 vmax, pulse.detection, hs.assumptions,
                 {n: c.vgs for n, c in hs.channels.items()},
                 {n: c.conducts for n, c in hs.channels.items()},
                 {n: c.power for n, c in hs.channels.items()})


# --- the weakest short -------------------------------------------------------------------------

@record(frozen=True)
class WeakestShort:
    """The weakest short the protection must still catch, solved at its corner.

    ``current`` is the pack current through ``fault`` ohms across the terminals, with the stack
    at the lowest voltage the protector allows (``cell_emf`` per cell: its over-discharge detection
    minimum), each cell at its maximum internal resistance times ``ageing`` (``cell_r``), the
    lowest ambient, and every part of the path at its highest resistance. With ``gate_drive:
    cell`` the gate drive ``vgs`` is the stack voltage the short leaves at the cells' terminals.
    """

    current: float
    cell_emf: float
    cell_r: float
    ageing: float
    fault: float
    ambient: float
    vgs: float
    rds: dict  # channel name -> Ω at the corner
    channel_current: dict  # channel name -> A
    stack_resistance: float  # all the cells, Ω
    path_resistance: float  # stack to terminals, Ω
    solution: Any
    assumptions: tuple[str, ...]
    short: Any = None  # the short.HardShort solve: each channel's drive, conduction and watts


def weakest_short(m: "DesignModel") -> WeakestShort | None:
    """The weakest short at its corner (see :class:`WeakestShort`), from the hard short's own
    solve (:func:`short.hard_short`: each switch with the drive the short leaves it, a starved
    one through its body diode) at that corner; None without a protector, a stack or switches."""
    p, stack, gd = m.protector, m.stack, m.gate_drive
    if p is None or stack is None or gd is None or not m.channels:
        return None
    limits = m.limits
    emf = p.part.overdischarge.detect.low
    cell_r = corner_value(stack.part.internal_resistance, "max") * limits.cell_ageing
    ambient = m.ambient.min
    hs = short.hard_short(m, ambient, "max", emf=emf, cell_r=cell_r,
                          load=limits.fault_resistance, drive_before=gd.min)
    if hs is None:
        return None
    sol = hs.solution
    current = hs.current
    pos, neg = m.terminals
    vs = sol.voltage_between(stack.top, stack.bottom)
    vt = sol.voltage_between(pos, neg)
    path_r = abs(abs(vs) - abs(vt)) / current if current > 0 and None not in (vs, vt) else math.nan
    stack_r = stack.series * cell_r / stack.parallel
    vgs = min(c.vgs for c in hs.channels.values())
    return WeakestShort(current, emf, cell_r, limits.cell_ageing, limits.fault_resistance,
                        ambient, vgs, hs.rds, hs.channel_current, stack_r, path_r, sol,
                        hs.assumptions, hs)


def _weakest_short(m: "DesignModel") -> list[Event]:
    """The ``weakest-short`` event: cleared by the short-circuit detection when its current
    exceeds that trip's maximum, else by the over-current detection when it exceeds that trip's
    maximum (after its longest delay), else by neither: it lasts for ever."""
    ws = weakest_short(m)
    if ws is None:
        return []
    p, sc, oc = m.protector, m.short_circuit_trip, m.overcurrent_trip
    if sc is not None and p.part.short_circuit is not None and ws.current > sc.max:
        detection, duration = "short-circuit", p.part.short_circuit.delay.high
    elif oc is not None and ws.current > oc.max:
        duration, detection, _ = _gap_clearing(m, ws.current)
    else:
        detection, duration = None, None
    currents, power = _figures(m, ws.current, ws.channel_current, {}, ws.solution,
                               ws.ambient, "max")
    power.update(ws.short.package_power)  # channels and body diodes as the solve has them
    series = m.stack.series
    ends = (f"for the longest {detection} delay" if detection else
            "for ever: no detection surely trips")
    drive = (f"the fixed gate drive {ws.vgs:.3g} V" if ws.short.drive == "fixed" else
             f"the gates following the sagging cells ({ws.short.describe_drive()})")
    words = (f"weakest short to catch: {ws.fault * 1e3:.3g} mΩ across the pack terminals, the "
             f"stack at the over-discharge detection minimum ({ws.cell_emf:.4g} V per cell), "
             f"lowest ambient {ws.ambient:g} °C, cells at {ws.ageing:g} × their maximum internal "
             f"resistance ({ws.cell_r * 1e3:.3g} mΩ each), {drive}, every part "
             f"at its highest resistance, {ends}")
    figures = {"fault resistance": ws.fault, "cell resistance": ws.cell_r,
               "stack resistance": ws.stack_resistance, "path resistance": ws.path_resistance,
               "stack voltage": ws.cell_emf * series, "gate drive": ws.vgs}
    chans = ws.short.channels
    return [Event("weakest-short", words, ws.ambient, ws.current, duration, currents, power,
                  ws.cell_emf * series, detection, ws.assumptions,
                  {n: c.vgs for n, c in chans.items()}, {n: c.conducts for n, c in chans.items()},
                  {n: c.power for n, c in chans.items()}, figures=figures)]


# --- storage -----------------------------------------------------------------------------------

#: A month in seconds: the storage budget's month of 730 hours [derived: 8760 h / 12].
SECONDS_PER_MONTH = HOURS_PER_MONTH * 3600.0


def _storage(m: "DesignModel") -> list[Event]:
    """The ``storage`` event: the stored pack's drain on its first level to empty, before the
    over-discharge cut-off (``current``), for the storage time; its figures give the months to
    the cut-off and on to the cell's lower limit, and the drain after the cut-off."""
    b = m.storage_budget
    if b is None:
        return []
    first, after = b.to_cutoff, b.to_lower_limit
    currents: dict[str, float] = {}
    for d in first.drains:
        if len(d.elements) == 1:  # a drain of one part (the protector's supply, an LED)
            currents[d.elements[0]] = currents.get(d.elements[0], 0.0) + d.current
    figures = {"storage months": b.duration, "months to cut-off": first.months,
               "drain before cut-off": first.drain_current,
               "self-discharge per month": b.self_discharge_pct / 100.0}
    if after is not None:
        figures.update({"months from cut-off to lower limit": after.months,
                        "drain after cut-off": after.drain_current})
    level = "" if m.stack.series == 1 else f", level {first.level} of the stack first"
    words = (f"stored at {b.soc * 100:.3g} % state of charge and {b.temperature:g} °C for "
             f"{b.duration:.3g} months{level}: self-discharge {b.self_discharge_pct:.3g} % of the "
             f"charge left per month, the drains at their data-sheet maxima")
    return [Event("storage", words, b.temperature, first.drain_current,
                  b.duration * SECONDS_PER_MONTH, currents, {}, None, None, b.assumptions,
                  figures=figures)]

# --- the reversed charger ----------------------------------------------------------------------

#: Source resistance of a charger in the networks that ask what voltage each part sees: small
#: against every signal path, so the charger holds its open-circuit voltage across them; its
#: current limit is not modelled, so a current through a part that conducts is an upper bound
#: [derived].
CHARGER_SOURCE_R = 0.01
#: An on switch in those networks: they ask which way current goes and what each part sees, not
#: how hot the switches run [derived].
SWITCH_ON_R = 1e-3
#: Below this a branch's current is the solver's rounding, not conduction, amperes [derived].
_CONDUCTS = 1e-9


def terminal_network(m: "DesignModel", volts: float, off: set[str]) -> Any:
    """The power path with every resistor and diode of the netlist, each cell a source of
    ``volts`` (nominal internal resistance), the switches of the roles in ``off`` off, nothing on
    the terminals: the network of the support-network stress cases and of the reversed charger."""
    states = {ch.name: ch.role not in off for ch in m.channels}
    net = m.network({ch.name: SWITCH_ON_R for ch in m.channels}, cell_emf=volts,
                    cell_r=m.stack.part.internal_resistance.nominal, temp=25.0,
                    switches_on=states, load=None)
    for d in m.netlist.of_kind("diode"):
        a, k = d.pins.get("anode"), d.pins.get("cathode")
        if a and k and a != k:
            net.add_diode(d.refdes, a, k, v_forward=d.part.forward_voltage)
    return net


def charger_reversed_solution(m: "DesignModel") -> tuple[Any, Any] | None:
    """(network, solution) of a charger connected reversed at its open-circuit maximum, the cells
    at the overcharge detection maximum, the discharge switches off; None where the design says
    the charger cannot be reversed (or gives none)."""
    ch, cv, p = m.design.charger, m.cell_voltage, m.protector
    pos, neg = m.terminals
    if (ch is None or ch.reverse_polarity.value != "possible" or cv is None or p is None
            or m.stack is None or pos == neg):
        return None
    net = terminal_network(m, cv.max, {"discharge"})
    net.add_source("(charger)", neg, pos, ch.open_circuit_max, CHARGER_SOURCE_R)
    try:
        return net, net.solve(ground=m.stack.bottom)
    except NetworkError as exc:
        m.problems.append(ModelProblem("network", f"reversed charger: {exc}"))
        return None


def _charger_reversed(m: "DesignModel") -> list[Event]:
    """The reversed charger: the voltage across the off discharge switches (open-circuit voltage
    plus the stack, less what drops across parts that conduct) and the current through whatever
    conducts (body diodes, diodes, resistors: the charger's current), each part's V·I."""
    solved = m.charger_reversed_solution
    off = m.channels_of("discharge")
    if solved is None or not off:
        return []
    net, sol = solved
    package = {ch.name: ch.package for ch in m.channels}
    volts = [abs(v) for c in off if (v := sol.voltage_between(c.drain, c.source)) is not None]
    currents: dict[str, float] = {}
    power: dict[str, float] = {}
    for br in net.branches:
        if isinstance(br, Source) or br.name not in sol.currents:
            continue  # the cells and the charger drive it
        i, v = sol.current(br.name), sol.voltage_between(br.a, br.b)
        if abs(i) <= _CONDUCTS or v is None:
            continue
        currents[br.name] = abs(i)
        key = package.get(br.name, br.name)
        power[key] = power.get(key, 0.0) + abs(v * i)
    ch, sv = m.design.charger, m.stack_voltage
    current = abs(sol.current("(charger)"))
    if current <= _CONDUCTS:
        current, conducts = 0.0, "nothing conducts: the off discharge switches hold it"
    else:
        conducts = "a stiff charger (its current limit not modelled) through what conducts"
    words = (f"a charger connected reversed at its open-circuit maximum "
             f"{ch.open_circuit_max:.4g} V in series with the stack at the overcharge detection "
             f"maximum {sv.max:.4g} V, the discharge switches off, 25 °C, nominal values; "
             f"{conducts}")
    return [Event("charger-reversed", words, 25.0, current, None, currents, power,
                  max(volts) if volts else None, None)]


# --- the turn-off spike ------------------------------------------------------------------------

#: Turn-off time of a protection FET when its part gives none, seconds. Protector gate outputs
#: pull down through some kilohms into a few nanofarads of gate charge, so the drain current
#: falls over roughly a microsecond [practice]; a faster edge gives a larger spike, so give the
#: part's own figure (or measure it) when the margin is small.
DEFAULT_TURN_OFF_TIME = 1e-6


@record(frozen=True)
class TurnOffSpike:
    """The voltage a discharge switch sees when it interrupts a short through wiring inductance.

    V = V_stack + L·di/dt, with di/dt the current interrupted over the switch's turn-off time (a
    linear fall [practice]: the real edge is not linear, but its average slope sets the energy
    the inductance must get rid of). The current is the short's highest at a physical corner,
    its onset at the lowest ambient (``DesignModel.prospective_short_circuit``): the short as it
    goes on at 25 °C draws less, a colder one more, and the onset bounds them all.
    """

    channel: str
    inductance: float
    current: float
    turn_off_time: float
    time_assumed: bool
    stack: float

    @property
    def di_dt(self) -> float:
        return self.current / self.turn_off_time

    @property
    def spike(self) -> float:
        return self.inductance * self.di_dt

    @property
    def total(self) -> float:
        return self.stack + self.spike

    def describe(self) -> str:
        assumed = (f", turn-off time assumed {self.turn_off_time * 1e6:.3g} µs [practice]"
                   if self.time_assumed else "")
        return (f"turning off a short circuit: the stack voltage {self.stack:.3g} V plus the "
                f"wiring spike L·di/dt = {self.inductance * 1e9:.3g} nH × {self.current:.3g} A / "
                f"{self.turn_off_time * 1e6:.3g} µs = {self.spike:.3g} V{assumed}")


def turn_off_spike(m: "DesignModel", ch: "SwitchChannel",
                   hard: Event | None = None) -> TurnOffSpike | None:
    """The turn-off spike of discharge switch ``ch`` interrupting the hard-short event (``hard``,
    else the design's), or None without wiring inductance or a hard short."""
    inductance = m.design.pack.wiring_inductance
    if inductance is None or ch.role != "discharge" or m.stack_voltage is None:
        return None
    hard = hard if hard is not None else m.event("hard-short")
    if hard is None:
        return None
    t_off = getattr(ch.part, "turn_off_time", None)
    assumed = t_off is None
    current = m.prospective_short_circuit or hard.current
    return TurnOffSpike(ch.name, inductance, current,
                        DEFAULT_TURN_OFF_TIME if assumed else t_off, assumed, m.stack_voltage.max)


def _turn_off_spike(m: "DesignModel", done: list[Event]) -> list[Event]:
    """The worst discharge switch's turn-off spike (:class:`TurnOffSpike`: the onset's current,
    shared across the channels as in the hard short). Each discharge package dissipates the
    channel's current times the voltage across it averaged over the fall, ½·V·I (a current
    falling linearly at a constant voltage [derived]), for the turn-off time."""
    hard = next((e for e in done if e.name == "hard-short"), None)
    if hard is None:
        return []
    spikes = [(ch, s) for ch in m.channels_of("discharge")
              if (s := turn_off_spike(m, ch, hard)) is not None]
    if not spikes:
        return []
    currents: dict[str, float] = {}
    power: dict[str, float] = {}
    for ch, s in spikes:
        i = hard.current_through(ch.name) * s.current / hard.current  # the onset's share
        currents[ch.name] = i
        power[ch.package] = power.get(ch.package, 0.0) + 0.5 * s.total * i
    ch, worst = max(spikes, key=lambda cs: cs[1].total)
    words = (f"{ch.name} interrupting the hard short ({worst.current:.4g} A) through the wiring "
             f"inductance {worst.inductance * 1e9:.3g} nH in {worst.turn_off_time * 1e6:.3g} µs: "
             f"the stack at its highest {worst.stack:.4g} V plus L·di/dt")
    notes = ((f"turn-off time assumed {DEFAULT_TURN_OFF_TIME * 1e6:g} µs [practice]",)
             if any(s.time_assumed for _, s in spikes) else ())
    return [Event("turn-off-spike", words, hard.ambient, worst.current, worst.turn_off_time,
                  currents, power, worst.total, hard.detection, notes)]


# --- a second (fast) over-current level ---------------------------------------------------------

#: The detection that clears a current above the fast level's trip maximum.
FAST_DETECTION = "fast over-current"


def _gap_clearing(m: "DesignModel", current: float) -> tuple[float, str, str]:
    """(longest delay, detection, words) of what clears ``current`` when the short-circuit
    detection may not: the fast over-current level where the current surely trips it (above its
    trip maximum), else the over-current level. Without a fast level, always the latter."""
    p, fast = m.protector, m.overcurrent_fast_trip
    if fast is not None and current > fast.max:
        return (p.part.overcurrent_fast.delay.high, FAST_DETECTION,
                "the longest fast over-current delay")
    return p.part.overcurrent.delay.high, "over-current", "the longest over-current delay"


def _fast_gap_overload(m: "DesignModel", vmax: float | None) -> list[Event]:
    """The ``fast-gap-overload`` event: just below the fast level's trip maximum the fast level
    may not act, so the slow level ends it, after its longest delay (the gap overload of the
    middle level, as ``gap-overload`` is the short-circuit level's)."""
    p, fast = m.protector, m.overcurrent_fast_trip
    if fast is None:
        return []
    at = fast.at_max
    words = (f"just below the fast over-current trip maximum: detection max "
             f"{fast.detect.max * 1e3:.4g} mV over the lowest sense resistance "
             f"{at.sense_resistance * 1e3:.4g} mΩ (lowest ambient {at.ambient:g} °C, "
             f"{_drive(at.vgs, at.corner)}, switches unheated), for the longest over-current "
             f"delay")
    return [_at_point(m, "fast-gap-overload", at, p.part.overcurrent.delay.high, words,
                      "over-current", vmax, current=fast.max)]


# --- the charge side ---------------------------------------------------------------------------

_CHARGE_WAY = ("the path's resistances at that current either way; the drive is the discharge "
               "direction's, which a charge switch's source lifted below its rail only raises")


def _into_pack(m: "DesignModel", name: str, current: float, duration: float | None,
               what: str, detection: str | None = None, voltage: float | None = None,
               figures: dict | None = None, assumptions: tuple = ()) -> Event:
    """An event of ``current`` flowing into the pack, read off the operating point of the same
    current with the switches self-heated at the highest ambient, every part at its highest
    resistance (as the fixed loads are)."""
    a, gd = m.ambient, m.gate_drive
    op = m.operating_point(current, a.max, gd.min, "max", self_heating=True)
    words = (f"{what}, highest ambient {a.max:g} °C, {_drive(gd.min, 'max')}, switches at their "
             f"self-heated steady state")
    e = _at_point(m, name, op, duration, words, detection, voltage)
    return replace(e, assumptions=e.assumptions + (_CHARGE_WAY,) + tuple(assumptions),
                   figures=dict(figures or {}))


def _charge(m: "DesignModel") -> list[Event]:
    """The charger's current into the pack, for ever (charge switches on)."""
    ch = m.design.charger
    if ch is None:
        return []
    return [_into_pack(m, "charge", ch.current, None,
                       f"the charger's current {ch.current:.4g} A into the pack")]


def _regen(m: "DesignModel") -> list[Event]:
    """The load's regenerative peak into the pack for its duration."""
    regen = m.design.load.regen
    if regen is None:
        return []
    return [_into_pack(m, "regen", regen.current, regen.duration,
                       f"the load's regenerative peak {regen.current:.4g} A into the pack for "
                       f"{regen.duration:.4g} s")]


def _charger_fault(m: "DesignModel") -> list[Event]:
    """A charger failed high: its current limit into the pack for the overcharge detection's
    longest delay (chargefault.ChargerFault); the voltage is the charger's fault voltage at
    the terminals, which the charge switch opens against."""
    f, ch, stack = m.charger_fault, m.design.charger, m.stack
    if f is None or not f.detected:
        return []
    figures = {"fault voltage per cell": f.fault_voltage, "detection max": f.detect,
               "cell start": f.start, "OCV rise": f.rise, "cell peak": f.peak,
               "overcharge limit": f.limit, "cell current": f.current,
               "cell resistance": f.resistance}
    return [_into_pack(m, "charger-fault", ch.current, f.delay,
                       f"a charger failed high ({f.fault_voltage * stack.series:.4g} V) at its "
                       f"current limit {ch.current:.4g} A until the overcharge detection's longest "
                       f"delay {f.delay:.4g} s ends it", "overcharge", f.fault_voltage * stack.series,
                       figures, f.assumptions)]
