"""Stress on the parts of the power path: heat in the switches, short-circuit pulses, copper
currents, cell rebound at cut-off, and the heat of automatic retries.

Every function takes a :class:`~packwarden.model.design.DesignModel` and returns frozen figures;
the parameter-free ones are cached on the model (``DesignModel.switch_heat`` and friends). What
each figure assumes travels with it, so a finding can say what the tool had to guess.

Units are SI: amperes, ohms, volts, watts, joules, seconds, °C.
"""

from __future__ import annotations

import math
from dataclasses import field
from typing import TYPE_CHECKING, Any

from . import thermal
from .events import (DEFAULT_TURN_OFF_TIME, ShortCircuitPulse, TurnOffSpike, permitted_point,
                     pulse_i2t, short_circuit_pulse, turn_off_spike)
from .network import NetworkError
from .values import IDEAL, corner_value
from ..records import record

if TYPE_CHECKING:  # pragma: no cover
    from .design import DesignModel
    from .path import OperatingPoint

__all__ = [
    "HeatCase", "switch_heat", "permitted_current_heat",
    "ShortCircuitPulse", "short_circuit_pulse", "pulse_i2t",
    "DEFAULT_TURN_OFF_TIME", "TurnOffSpike", "turn_off_spike",
    "ConductorLoad", "conductor_loads",
    "cold_resistance_factor", "Rebound", "release_rebounds",
    "DEFAULT_RETRY_PERIOD", "RetryHeat", "retry_heat",
    "DEFAULT_CHARGE_TEMPERATURE", "charge_temperature",
]


#: Auto-retry period assumed when a protector with ``release_on: [auto_retry]`` gives no
#: ``retry_period``, seconds. Auto-recovering protectors retry every 0.1 s to a few seconds
#: [memory]; the shortest is assumed because it heats most.
DEFAULT_RETRY_PERIOD = 0.1

#: Charge temperature window when a cell gives none, °C: charging below 0 °C plates lithium and
#: cell makers forbid it [practice]; 45 °C is the usual upper end (IEC 62133-2 summaries give
#: 10-45 °C for LiCoO2 cells [published, secondary summary]).
DEFAULT_CHARGE_TEMPERATURE = (0.0, 45.0)


# --- switch junction temperature -------------------------------------------------------------

def _cell_r(m: "DesignModel", corner: str) -> float:
    """Cell internal resistance at the same corner as the rest of the path."""
    return corner_value(m.stack.part.internal_resistance, corner)

@record(frozen=True)
class HeatCase:
    """Junction temperature of one switch package in one case.

    ``case`` is ``continuous`` (the design's continuous load), ``peak`` (the peak load, as a
    steady-state bound) or ``permitted`` (the highest current the over-current protection lets
    flow indefinitely, just below its trip, found self-consistently with R_DS(on)(T_J)).
    ``runaway`` means no steady state at or below ``tj_max`` was found; ``tj`` and ``power`` are
    then the last estimate, a lower bound.
    """

    case: str
    package: str
    part: Any
    current: float  # pack current, A
    channel_current: dict  # channel name -> A
    rds: dict  # channel name -> Ω at the junction temperature
    power: float  # W in this package
    tj: float
    ambient: float
    vgs: float
    corner: str  # on-resistance corner: max | min | typ
    runaway: bool
    duration: float | None = None  # of the peak, s
    assumptions: tuple[str, ...] = ()
    channel_vgs: dict = field(default_factory=dict)  # channel name -> V_GS where it is not vgs

    def vgs_of(self, channel: str) -> float:
        """The gate-source voltage of one channel in this case (gate.py)."""
        return self.channel_vgs.get(channel, self.vgs)


def _cases_of(op: "OperatingPoint", m: "DesignModel", case: str, duration: float | None,
              extra: tuple[str, ...] = ()) -> list[HeatCase]:
    out = []
    for package, tj in op.tj.items():
        chans = [ch for ch in m.channels if ch.package == package]
        part = chans[0].part
        ich = {ch.name: op.channel_current.get(ch.name, 0.0) for ch in chans}
        rds = {ch.name: op.rds.get(ch.name, math.nan) for ch in chans}
        power, runaway = op.power.get(package, 0.0), op.runaway
        if runaway and tj > part.tj_max:
            # The operating point stops at tj_max. Whether a balance exists above it tells a
            # reviewer "runs too hot" from "runs away"; the currents divide as they did, since
            # the shares barely move with temperature.
            def p_at(t: float, chans=chans, ich=ich) -> float:
                return sum(ich[ch.name] ** 2 * m.channel_rds(
                    ch, op.channel_vgs.get(ch.name, op.vgs), t, op.corner)[0] for ch in chans)
            res = thermal.junction_temperature(op.ambient, p_at, part.theta_ja,
                                               part.tj_max + thermal.RUNAWAY_MARGIN)
            if res.converged:
                tj, power, runaway = res.tj, res.power, False
                rds = {ch.name: m.channel_rds(ch, op.channel_vgs.get(ch.name, op.vgs), tj,
                                              op.corner)[0] for ch in chans}
        out.append(HeatCase(
            case, package, part, op.current, ich, rds, power, tj, op.ambient, op.vgs, op.corner,
            runaway, duration, tuple(op.assumptions) + extra,
            {ch.name: op.channel_vgs[ch.name] for ch in chans if ch.name in op.channel_vgs}))
    return out


def switch_heat(m: "DesignModel") -> tuple[HeatCase, ...]:
    """Junction temperature of every switch package at the highest ambient, in every case.

    Fixed loads (continuous, peak) are taken at the highest on-resistance (lowest gate drive, max
    corner), where I²·R is largest. The peak is a steady state: the part data carries no thermal
    capacitance or transient thermal impedance, and a steady state is the upper bound of any
    transient that starts from the same ambient. The permitted current is taken at both ends of
    the on-resistance spread, because which end heats more depends on whether the switches are
    the sense resistance (then P = V²/R, highest at the lowest R) or not (a shunt fixes I, and
    P = I²·R is highest at the highest R); the hotter is kept per package.
    """
    gd = m.gate_drive
    if gd is None or not m.channels or m.stack is None:
        return ()
    hot = m.ambient.max
    out: list[HeatCase] = []
    load = m.design.load
    op = m.operating_point(load.continuous, hot, gd.min, "max", self_heating=True)
    out += _cases_of(op, m, "continuous", None)
    if load.peak is not None:
        op = m.operating_point(load.peak.current, hot, gd.min, "max", self_heating=True)
        out += _cases_of(op, m, "peak", load.peak.duration, (
            "peak taken as a steady state: the part gives no transient thermal impedance, and "
            "a steady state bounds any shorter pulse from above",))
    out += permitted_current_heat(m)
    return tuple(out)


def permitted_current_heat(m: "DesignModel") -> list[HeatCase]:
    """Per package, the hotter of the two corners of :func:`_permitted_at`; empty without a trip."""
    p, gd = m.protector, m.gate_drive
    if p is None or gd is None or not m.channels:
        return []
    vdet = p.part.overcurrent.detect.high
    hot = m.ambient.max
    best: dict[str, HeatCase] = {}
    for corner, vgs in (("min", gd.max), ("max", gd.min)):
        for case in _permitted_at(m, vdet, hot, vgs, corner):
            old = best.get(case.package)
            if old is None or (case.runaway, case.tj) > (old.runaway, old.tj):
                best[case.package] = case
    return list(best.values())


def _permitted_at(m: "DesignModel", vdet: float, ambient: float, vgs: float,
                  corner: str) -> list[HeatCase]:
    """The current just below the trip at one corner (events.permitted_point), per package."""
    pt = permitted_point(m, vdet, ambient, vgs, corner)
    if pt is None:
        return []
    packages = {ch.package: ch.part for ch in m.channels}
    what = "lowest" if corner == "min" else "highest"
    extra = (f"sustained current just below the over-current trip: detection max "
             f"{vdet * 1e3:.4g} mV over the sense resistance at the junction temperature it "
             f"causes, at the {what} on-resistance",)
    out = []
    for pk in packages:
        chans = [ch for ch in m.channels if ch.package == pk]
        out.append(HeatCase(
            "permitted", pk, packages[pk], pt.current,
            {ch.name: pt.channel_current[ch.name] for ch in chans},
            {ch.name: pt.rds[ch.name] for ch in chans}, pt.power[pk], pt.tj[pk], ambient, vgs,
            corner, pt.runaway, None, pt.assumptions + extra,
            {ch.name: pt.channel_vgs[ch.name] for ch in chans if ch.name in pt.channel_vgs}))
    return out


def dissipation_at(m: "DesignModel", h: HeatCase, temp: float) -> float:
    """The dissipation of ``h``'s package were its junction at ``temp``, in watts.

    For a fixed load the channel currents stay; for the permitted current they follow the sense
    resistance at that temperature (every package taken at ``temp``, which is exact for one
    package). ``(limit - T_A) / dissipation_at(limit)`` is then the θJA that just meets a limit.
    """
    chans = [ch for ch in m.channels if ch.package == h.package]
    if h.case != "permitted":
        return sum(h.channel_current[ch.name] ** 2 * m.channel_rds(ch, h.vgs_of(ch.name), temp,
                                                                   h.corner)[0] for ch in chans)
    # Other packages' channels keep the protector's drive: their V_GS is not in this case.
    rds = {ch.name: m.channel_rds(ch, h.vgs_of(ch.name), temp, h.corner)[0] for ch in m.channels}
    sol, sense, _ = m.solve_path(rds, h.ambient, h.corner, _cell_r(m, h.corner))
    if sol is None or not math.isfinite(sense) or sense <= 0:
        return h.power
    i_load = abs(sol.current("(load)"))
    current = m.protector.part.overcurrent.detect.high / sense
    return sum((abs(sol.current(ch.name)) / i_load * current) ** 2 * rds[ch.name] for ch in chans)


# The short-circuit pulse (ShortCircuitPulse, short_circuit_pulse, pulse_i2t) lives in events.py,
# the layer above: it is the hard-short event; the names stay importable from here.

# The turn-off spike (DEFAULT_TURN_OFF_TIME, TurnOffSpike, turn_off_spike) lives in events.py too:
# it is the turn-off-spike event; the names stay importable from here.

# --- conductors -------------------------------------------------------------------------------

@record(frozen=True)
class ConductorLoad:
    """The highest current a trace or wire carries while the protection permits it.

    ``share`` is its current per ampere at the pack terminals in the ``permitted`` event (the
    current the protection permits for ever); ``current`` is that share of ``basis_current``.
    ``sense_share`` is the fraction of the protector's sense resistance the conductor makes up
    (0 when it is not between the ground and sense pins), at 25 °C, typical values.
    """

    component: Any  # netlist Component
    share: float
    current: float
    basis: str
    basis_current: float
    resistance: float  # Ω at the highest ambient
    sense_share: float
    sense_resistance: float  # Ω, typical, with the conductor


def conductor_loads(m: "DesignModel") -> tuple[ConductorLoad, ...]:
    parts = m.netlist.of_kind("trace", "wire")
    t, permitted = m.overcurrent_trip, m.event("permitted")
    if (not parts or t is None or permitted is None or m.stack is None
            or not (math.isfinite(permitted.current) and permitted.current > 0)):
        return ()
    basis, basis_current = "permitted current", permitted.current
    ch = m.design.charger
    if ch is not None and ch.current > basis_current:
        basis, basis_current = "charger current", ch.current
    cell = m.stack.part
    typ_sense = t.at_typ.sense_resistance
    out = []
    for c in parts:
        a, b = c.pins.get("1"), c.pins.get("2")
        if not a or not b or a == b:
            continue
        # a conductor outside the pack's current is not among the event's elements
        share = permitted.element_current.get(c.refdes, 0.0) / permitted.current
        sense_share = 0.0
        if math.isfinite(typ_sense) and typ_sense > 0:
            without = _sense_with_ideal(m, t.at_typ.rds, c, IDEAL, cell.internal_resistance.nominal)
            if without is not None:
                sense_share = max(0.0, 1.0 - without / typ_sense)
        out.append(ConductorLoad(c, share, share * basis_current, basis, basis_current,
                                 m.part_resistance(c, m.ambient.max, "typ"), sense_share,
                                 typ_sense))
    return tuple(out)


def _sense_with_ideal(m: "DesignModel", rds: dict, c: Any, ideal: float,
                      cell_r: float) -> float | None:
    """Sense resistance at 25 °C, typical, with conductor ``c`` replaced by a near-zero one."""
    emf = m.cell_limits.nominal if m.cell_limits else 3.6
    net = m.network(rds, cell_emf=emf, cell_r=cell_r, temp=25.0, corner="typ",
                    exclude=frozenset({c.refdes}))
    net.add_resistor(c.refdes, c.pins["1"], c.pins["2"], ideal)
    try:
        sol = net.solve(ground=m.stack.bottom)
    except NetworkError:
        return None
    p = m.protector
    g, s = p.pins.get("ground"), p.pins.get("sense")
    i_load = abs(sol.current("(load)"))
    if not g or not s or g not in sol.voltages or s not in sol.voltages or not i_load:
        return None
    v = sol.voltage_between(s, g)
    return abs(v) / i_load if v is not None else None


# --- cell rebound at cut-off --------------------------------------------------------------------

def cold_resistance_factor(temp: float, factor: float, at: float) -> float:
    """Internal resistance at ``temp`` over its 25 °C value, given ``factor`` at ``at`` °C.

    Geometric between 25 °C (1.0) and ``at`` (``factor``), continued below it, and 1.0 above
    25 °C (the data sheet value is kept there, which errs high): electrolyte conductivity and
    charge-transfer kinetics fall roughly exponentially as a cell cools, so a constant ratio per
    kelvin follows the usual curves better than a straight line [practice].
    """
    if not (factor >= 1.0 and math.isfinite(factor)):
        raise ValueError(f"cold factor must be >= 1, got {factor}")
    if not at < 25.0:
        raise ValueError(f"the cold factor's temperature must be below 25 °C, got {at}")
    if temp >= 25.0:
        return 1.0
    return factor ** ((25.0 - temp) / (25.0 - at))


@record(frozen=True)
class Rebound:
    """The jump of the cell voltage when a protection cuts the current, against the release
    hysteresis of that protection.

    ``hysteresis`` is the worst-case distance between detection and release: release min minus
    detection max for over-discharge, detection min minus release max for overcharge.
    """

    threshold: str  # "overdischarge" | "overcharge"
    basis: str  # what current is cut
    current: float  # per cell, A
    resistance: float  # per cell, Ω, at ``temperature``
    resistance_25: float
    factor: float
    temperature: float
    hysteresis: float
    detect: float  # the detection end used, V
    release: float  # the release end used, V

    @property
    def rebound(self) -> float:
        return self.current * self.resistance


def release_rebounds(m: "DesignModel", cold_factor: float, cold_at: float) -> list[Rebound]:
    """Rebounds for each protection that releases by voltage; see :class:`Rebound`."""
    p, stack = m.protector, m.stack
    if p is None or stack is None:
        return []
    r25 = stack.part.internal_resistance.high
    out = []
    od = p.part.overdischarge
    if "voltage" in {r.value for r in od.release_on} and od.release is not None:
        load = m.design.load
        current, basis = load.continuous, "continuous load"
        if load.peak is not None and load.peak.duration > od.delay.low and load.peak.current > current:
            current, basis = load.peak.current, "peak load (it outlasts the over-discharge delay)"
        temp = m.ambient.min
        k = cold_resistance_factor(temp, cold_factor, cold_at)
        out.append(Rebound("overdischarge", basis, current / stack.parallel, r25 * k, r25, k, temp,
                           od.release.low - od.detect.high, od.detect.high, od.release.low))
    oc, ch = p.part.overcharge, m.design.charger
    if ch is not None and "voltage" in {r.value for r in oc.release_on} and oc.release is not None:
        # Charging happens down to the charger's own cut-off, where it declares one; else to the
        # lowest ambient.
        temp = m.ambient.min
        if ch.temperature_window is not None:
            temp = max(temp, ch.temperature_window.min)
        k = cold_resistance_factor(temp, cold_factor, cold_at)
        out.append(Rebound("overcharge", "charger current", ch.current / stack.parallel, r25 * k,
                           r25, k, temp, oc.detect.low - oc.release.high, oc.detect.low,
                           oc.release.high))
    return out


# --- heat of automatic retries ------------------------------------------------------------------

@record(frozen=True)
class RetryHeat:
    """A fault that persists while the protector retries: one pulse per retry period.

    Each pulse carries ``current`` (pack) for ``duration`` (the detection's longest delay); the
    average dissipation of a package is its pulse energy over ``period``, and ``tj`` the steady
    state of that average at the highest ambient. The temperature swing of each pulse rides on
    top of it; without the part's transient thermal impedance it is not modelled.
    """

    threshold: str  # "overcurrent" | "short_circuit": whose release retries
    event: str
    current: float
    duration: float
    period: float
    period_assumed: bool
    channel_current: dict
    energy: dict  # package -> J per pulse at the final junction temperature
    power: dict  # package -> average W
    tj: dict  # package -> °C
    runaway: dict  # package -> bool
    parts: dict  # package -> part

    def i2t(self, channel: str) -> float:
        return pulse_i2t(self.channel_current.get(channel, 0.0), self.duration)


def _retries(threshold: Any) -> bool:
    return threshold is not None and "auto_retry" in {r.value for r in threshold.release_on}


def retry_heat(m: "DesignModel", default_period: float = DEFAULT_RETRY_PERIOD) -> list[RetryHeat]:
    """Retry pulses of every current protection that releases by ``auto_retry``.

    Two faults, the hard-short and gap-overload events (events.py): a hard short (the
    prospective short-circuit current, for the delay of the detection that ends it) and an
    overload just below the short-circuit trip maximum (for the longest over-current delay),
    which only the over-current detection catches. Currents come
    from the lowest-resistance solves; each channel dissipates at its highest on-resistance
    (lowest gate drive, max corner) at its junction temperature: a bound, since one circuit
    cannot be at both corners at once.
    """
    p, gd = m.protector, m.gate_drive
    if p is None or gd is None or not m.channels:
        return []
    oc = p.part.overcurrent
    pulse = m.short_circuit_pulse
    events = []
    if pulse is not None:
        name = {"over-current": "overcurrent",
                "fast over-current": "overcurrent_fast"}.get(pulse.detection, "short_circuit")
        owner = getattr(p.part, name)
        if _retries(owner):
            events.append((name, owner, "a hard short across the pack terminals", pulse.current,
                           dict(pulse.channel_current), pulse.duration))
    gap = m.event("gap-overload")
    if gap is not None and gap.detection == "fast over-current":
        name, oc = "overcurrent_fast", p.part.overcurrent_fast
    else:
        name = "overcurrent"
    if _retries(oc) and gap is not None:
        events.append((name, oc, "an overload just below the short-circuit trip maximum",
                       gap.current, {ch.name: gap.current_through(ch.name) for ch in m.channels},
                       gap.duration))
    out = []
    hot = m.ambient.max
    for name, thr, event, current, ich, duration in events:
        period = getattr(thr, "retry_period", None)
        assumed = period is None
        period = default_period if assumed else period
        parts = {ch.package: ch.part for ch in m.channels}
        energy, power, tj, runaway = {}, {}, {}, {}
        for pk, part in parts.items():
            chans = [ch for ch in m.channels if ch.package == pk]

            def pulse_energy(t: float, chans=chans) -> float:
                return sum(ich.get(ch.name, 0.0) ** 2 * m.channel_rds(ch, gd.min, t, "max")[0]
                           for ch in chans) * duration

            res = thermal.junction_temperature(hot, lambda t, f=pulse_energy: f(t) / period,
                                               part.theta_ja, part.tj_max)
            tj[pk], runaway[pk] = res.tj, res.runaway
            # At the balance; when there is none, at tj_max, the most the part is meant to see.
            energy[pk] = pulse_energy(min(res.tj, part.tj_max))
            power[pk] = energy[pk] / period
        out.append(RetryHeat(name, event, current, duration, period, assumed, ich, energy, power,
                             tj, runaway, parts))
    return out


# --- charging ---------------------------------------------------------------------------------

def charge_temperature(cell: Any) -> tuple[float, float, bool]:
    """The cell's charge temperature window (min, max, assumed): data sheet first."""
    w = getattr(cell, "charge_temperature", None)
    if w is not None:
        return w.min, w.max, False
    return DEFAULT_CHARGE_TEMPERATURE[0], DEFAULT_CHARGE_TEMPERATURE[1], True
