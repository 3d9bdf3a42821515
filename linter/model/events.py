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
* ``hard-short`` — a hard short across the pack terminals until the protection ends it.

Units are SI: amperes, ohms, volts, watts, seconds, °C.
"""

from __future__ import annotations

import math
from dataclasses import field
from typing import TYPE_CHECKING, Any

from ..records import record
from . import gate, thermal
from .values import SIGNAL_OHMS, corner_value

if TYPE_CHECKING:  # pragma: no cover
    from .design import DesignModel
    from .path import OperatingPoint

__all__ = ["Event", "EVENT_NAMES", "design_events", "pulse_i2t", "PermittedPoint",
           "permitted_point", "ShortCircuitPulse", "short_circuit_pulse"]

#: The events this layer computes, in the order a report lists them.
EVENT_NAMES = ("continuous-load", "peak-load", "permitted", "gap-overload", "hard-short")


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
                "dissipation": dict(self.dissipation)}


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
    """A hard short across the pack terminals, until the protection turns it off.

    ``current`` is the prospective short-circuit current (highest cell voltage over the lowest
    cell, path and copper resistance); ``channel_current`` how it divides across the switch
    channels (body diodes included); ``duration`` the longest delay of the detection that ends
    it: the short-circuit detection when the current exceeds its trip maximum, otherwise the
    over-current detection.
    """

    current: float
    channel_current: dict
    duration: float
    detection: str  # "short-circuit" | "over-current"
    rds: dict  # channel name -> Ω in the short-circuit solve

    def i2t(self, channel: str) -> float:
        return pulse_i2t(self.channel_current.get(channel, 0.0), self.duration)


def short_circuit_pulse(m: "DesignModel") -> ShortCircuitPulse | None:
    sol, rds = m.short_circuit_solution
    p = m.protector
    if sol is None or p is None:
        return None
    psc = abs(sol.current("(load)"))
    sc = m.short_circuit_trip
    if sc is not None and p.part.short_circuit is not None and psc > sc.max:
        duration, detection = p.part.short_circuit.delay.high, "short-circuit"
    else:
        duration, detection = p.part.overcurrent.delay.high, "over-current"
    ich = {ch.name: abs(sol.current(ch.name)) for ch in m.channels}
    return ShortCircuitPulse(psc, ich, duration, detection, rds)


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
        out.append(_at_point(m, "gap-overload", at, p.part.overcurrent.delay.high, words,
                             "over-current", vmax, current=sc.max))
    if pulse is not None:
        sol, _ = m.short_circuit_solution
        currents, power = _figures(m, pulse.current, pulse.channel_current, pulse.rds, sol,
                                   a.min, "min")
        words = (f"hard short across the pack terminals: highest cell voltage, lowest ambient "
                 f"{a.min:g} °C, {_drive(gd.max, 'min')}, cells at their lowest internal "
                 f"resistance, for the longest {pulse.detection} delay")
        out.append(Event("hard-short", words, a.min, pulse.current, pulse.duration, currents, power,
                         vmax, pulse.detection))
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
