"""The temperature inputs the netlist really has, and the temperatures at which they cut off.

Two inputs can read a thermistor of the pack: the protector's ``temperature`` pin (its part's
``temperature_input`` gives the bias and the thresholds) and the charger's (``charger.thermistor``
names the thermistor, the charger's bias and its two thresholds). Each threshold given becomes a
:class:`Cutoff`: the temperature at which that input stops charging or discharging, over every
tolerance of the thermistor, the bias resistor and the threshold (:mod:`.thermistor`).

A threshold with no thermistor to read is no protection at all: it is kept as an
:class:`Unread` input, so the rules can say why a declared window is not enforced.

Assumed: the thermistor's far end sits on the reference's ground, and the bias resistor from the
pin to the reference is the input's own (``pull_up``) or else the netlist's one resistor at the
pin whose far end is not that ground.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, Any

from ..records import record
from ..schema import HIGHEST_C, LOWEST_C, THRESHOLDS
from .thermistor import (resistance_span, temperature_at, tolerance_stack, trip_span,
                         trip_temperature)
from .values import DesignMistake, Span

if TYPE_CHECKING:  # pragma: no cover
    from ..netlist import Component
    from .design import DesignModel

__all__ = ["Cutoff", "Unread", "TemperatureSensing", "temperature_sensing", "CHARGE", "DISCHARGE",
           "THRESHOLDS", "CellHeating", "cell_heating", "pack_energy", "DischargeWindow",
           "discharge_window", "DEFAULT_DISCHARGE_WINDOW"]

#: The thresholds that stop charging, and those that stop discharging, as (cold, hot).
CHARGE = ("charge_cold", "charge_hot")
DISCHARGE = ("discharge_cold", "discharge_hot")


@record(frozen=True)
class Cutoff:
    """One threshold of one input, as a temperature over every tolerance."""

    #: which threshold: one of ``schema.THRESHOLDS``
    name: str
    #: the input's owner: the protector's reference designator, or "charger"
    owner: str
    #: the thermistor the input reads
    ntc: str
    #: where the thermistor sits ("cells" or "board")
    placement: str
    temperature: Span
    #: the YAML path of the threshold (the protector's part, or the charger's block)
    path: tuple
    #: where the tripped threshold releases, as a temperature over every tolerance, where the
    #: input gives its release (hysteresis)
    release: Span | None = None
    #: what each tolerance alone moves the trip by, K: ((quantity, most negative, most
    #: positive), ...) for the thermistor's R25 and B, the bias and the threshold
    stack: tuple = ()

    def as_dict(self) -> dict:
        """As the JSON report writes it."""
        t = self.temperature
        out = {"name": self.name, "owner": self.owner, "ntc": self.ntc,
               "placement": self.placement, "min": t.min, "typ": t.typ, "max": t.max,
               "tolerance_stack": {n: [lo, hi] for n, lo, hi in self.stack}}
        if self.release is not None:
            r = self.release
            out["release"] = {"min": r.min, "typ": r.typ, "max": r.max}
        return out

    @property
    def cold(self) -> bool:
        return self.name.endswith("cold")


@record(frozen=True)
class Unread:
    """An input with thresholds and no thermistor on it (or no bias to read it with)."""

    owner: str
    why: str
    path: tuple
    names: tuple[str, ...]


@record(frozen=True)
class TemperatureSensing:
    cutoffs: tuple[Cutoff, ...]
    unread: tuple[Unread, ...]

    def of(self, name: str) -> list[Cutoff]:
        return [c for c in self.cutoffs if c.name == name]

    def effective(self, name: str) -> Cutoff | None:
        """The cut-off that acts first where several inputs guard the same end: charging (or
        discharging) stops when any of them says so, so the highest cold threshold and the
        lowest hot one, each judged at its own worst corner."""
        found = self.of(name)
        if not found:
            return None
        if name.endswith("cold"):
            return max(found, key=lambda c: c.temperature.min)
        return min(found, key=lambda c: c.temperature.max)


def _level(share: Any, volts: Any, reference: Any, current: Any) -> Span | None:
    """A threshold as the share of the reference its comparator trips at, over its tolerances;
    given in volts, that voltage over the reference at their opposite corners. With a current
    sourced into the thermistor (``current``), the thermistor resistance the voltage means."""
    if share is not None:
        return Span.of(share).scaled(0.01)
    if volts is None:
        return None
    by = current if current is not None else reference
    return Span(volts.low / by.high, volts.nominal / by.nominal, volts.high / by.low)


def _temperature(ntc: Component, owner: str, name: str, bias: Span | None, level: Span) -> Span:
    r25, beta = Span.of(ntc.part.r25), Span.of(ntc.part.beta)
    span = (trip_span(r25, beta, bias, level) if bias is not None
            else resistance_span(r25, beta, level))
    if not (LOWEST_C <= span.min and span.max <= HIGHEST_C):
        # far outside any pack's temperatures the beta form means nothing: a unit slip in
        # R25, B, the bias or the threshold, not a cut-off to judge
        raise DesignMistake(ntc.path, (
            f"with {ntc.refdes} the {name.replace('_', ' ')} threshold of {owner} trips "
            f"between {span.min:.4g} and {span.max:.4g} °C, outside {LOWEST_C:g} to "
            f"{HIGHEST_C:g} °C: check the thermistor's r25 and beta, the bias resistor "
            f"and the threshold"))
    return span


def _stack(ntc: Component, bias: Span | None, level: Span) -> tuple:
    """Each tolerance's own share of a trip temperature's spread (thermistor.tolerance_stack)."""
    spans = {"r25": Span.of(ntc.part.r25), "beta": Span.of(ntc.part.beta)}
    if bias is not None:
        spans.update(bias=bias, threshold=level)
        parts = tolerance_stack(trip_temperature, spans)
    else:  # a sourced current: the threshold is the thermistor's resistance itself
        spans.update(threshold=level)
        parts = tolerance_stack(temperature_at, spans)
    return tuple((n, lo, hi) for n, (lo, hi) in parts.items())


def _cutoffs(owner: str, ntc: Component, bias: Span | None,
             thresholds: dict[str, tuple[Span, tuple, Span | None]]) -> list[Cutoff]:
    """Each threshold (name -> its level, its YAML path and its release level, see
    :func:`_level`) as a temperature; ``bias`` None for an input that sources a current."""
    out = []
    for name, (level, at, release) in thresholds.items():
        span = _temperature(ntc, owner, name, bias, level)
        back = (_temperature(ntc, owner, f"{name} release", bias, release)
                if release is not None else None)
        out.append(Cutoff(name, owner, ntc.refdes, ntc.part.placement.value, span, at, back,
                          _stack(ntc, bias, level)))
    return out


def _protector_input(m: DesignModel) -> tuple[list[Cutoff], list[Unread]]:
    p = m.protector
    ti = getattr(p.part, "temperature_input", None) if p is not None else None
    if ti is None:
        return [], []
    path = p.path + (("part",) if p.part_name else ()) + ("temperature_input",)
    levels = {}
    for n in THRESHOLDS:
        trip = _level(getattr(ti, n), _of(ti.volts, n), ti.reference, ti.bias_current)
        if trip is not None:
            at = path + ((n,) if getattr(ti, n) is not None else ("volts", n))
            levels[n] = (trip, at, _level(_of(ti.release, n), _of(ti.release_volts, n),
                                          ti.reference, ti.bias_current))
    given = levels
    net, ground = p.pins.get("temperature"), p.pins.get("ground")
    ntcs = [c for c in m.netlist.of_kind("ntc")
            if net is not None and net in c.pins.values() and c.part is not None]
    if not ntcs:
        why = ("its temperature pin is not connected" if net is None else
               f"no thermistor is on its temperature pin's net '{net}'")
        return [], [Unread(p.refdes, why, p.path + ("pins",), tuple(given))]
    ntc = ntcs[0]
    far = [n for n in ntc.pins.values() if n != net]
    if ground is not None and far and ground not in far:
        # the divider is read against the protector's ground: with the thermistor's far end on
        # another net its shares, and so its cut-off temperatures, are not the ones computed
        return [], [Unread(p.refdes, f"the far end of {ntc.refdes} on its temperature pin is on "
                                     f"net '{far[0]}', not on its ground '{ground}'",
                           ntc.path, tuple(given))]
    if ti.bias_current is not None:
        bias = None  # the input sources a current: the levels are resistances
    elif ti.pull_up is not None:
        bias = Span.of(ti.pull_up)
    else:
        found = [r for r in m.topology.resistors_at.get(net, [])
                 if ground not in (r.pins.get("1"), r.pins.get("2"))]
        if not found:
            return [], [Unread(p.refdes, f"its temperature input has no pull_up and no resistor "
                                         f"biases net '{net}'", path, tuple(given))]
        bias = Span(*(m.part_resistance(found[0], 25.0, c) for c in ("min", "typ", "max")))
    return _cutoffs(p.refdes, ntc, bias, levels), []


def _charger_input(m: DesignModel) -> list[Cutoff]:
    ch = m.design.charger
    th = ch.thermistor if ch is not None else None
    if th is None:
        return []
    ntc = m.netlist.components.get(th.ntc)
    if ntc is not None and ntc.kind is None:
        return []  # its part is unknown: unknown-part says so, and there is nothing to read
    if ntc is None or ntc.kind != "ntc":
        what = "no component" if ntc is None else f"a {ntc.kind or 'part of unknown kind'}"
        raise DesignMistake(("charger", "thermistor", "ntc"), (
            f"'{th.ntc}' is {what}: the charger reads a component of kind 'ntc'"))
    at = ("charger", "thermistor")
    levels = {}
    for end in ("cold", "hot"):
        trip = _level(getattr(th, end), getattr(th, f"{end}_voltage"), th.reference, None)
        release = _level(getattr(th, f"{end}_release"), getattr(th, f"{end}_release_voltage"),
                         th.reference, None)
        field = end if getattr(th, end) is not None else f"{end}_voltage"
        levels[f"charge_{end}"] = (trip, at + (field,), release)
    return _cutoffs("charger", ntc, Span.of(th.bias), levels)


def _of(block: Any, name: str) -> Any:
    return getattr(block, name) if block is not None else None


def temperature_sensing(m: DesignModel) -> TemperatureSensing:
    cutoffs, unread = _protector_input(m)
    return TemperatureSensing(tuple(cutoffs + _charger_input(m)), tuple(unread))


@record(frozen=True)
class CellHeating:
    """The hottest a cell gets at the continuous load: the highest ambient plus its own I²R.

    Kept simple, and said so: each cell's share of the continuous-load event's current, squared,
    times its highest internal resistance, into a thermal resistance from cell to ambient (a
    rule option); no heat from the switches or the neighbouring cells, no time constant (the
    steady state, which a continuous load reaches)."""

    ambient: float  # °C, the pack's highest
    current: float  # A per cell
    power: float  # W per cell
    rise: float  # K
    theta: float  # K/W
    #: the load that heats them: "continuous load", or "peak load" where the peak lasts long
    #: enough to count as steady (``cell_heating``'s ``steady_after``)
    load: str = "continuous load"

    @property
    def temperature(self) -> float:
        return self.ambient + self.rise


def cell_heating(m: DesignModel, theta: float,
                 steady_after: float = math.inf) -> CellHeating | None:
    """The cells' steady temperature under the continuous load, or under the peak load where
    the peak lasts ``steady_after`` seconds or more (long against the cell's thermal time
    constant, it is as good as continuous)."""
    stack = m.stack
    if stack is None:
        return None
    event = m.event("continuous-load")
    pack_current = event.current if event is not None else m.design.load.continuous
    load = "continuous load"
    peak = m.design.load.peak
    if peak is not None and peak.duration >= steady_after:
        event = m.event("peak-load")
        peak_current = event.current if event is not None else peak.current
        if peak_current > pack_current:
            pack_current, load = peak_current, "peak load"
    current = pack_current / stack.parallel
    power = current ** 2 * stack.part.internal_resistance.high
    return CellHeating(m.ambient.max, current, power, power * theta, theta, load)


def pack_energy(m: DesignModel) -> float | None:
    """The stack's rated energy, in watt-hours: cells × capacity × nominal voltage."""
    if m.stack is None or m.cell_limits is None:
        return None
    return len(m.stack.cells) * m.stack.part.capacity * m.cell_limits.nominal


#: The discharge temperature window taken for a cell that gives none, (min, max) in °C: what
#: lithium-ion cell data sheets commonly give [practice: docs/references.md "Temperature
#: protection"]. A pack must not go unjudged because its cell part leaves the field out.
DEFAULT_DISCHARGE_WINDOW = (-20.0, 60.0)


@record(frozen=True)
class DischargeWindow:
    """The temperatures the cells may be discharged at; ``given`` is false where the cell part
    leaves ``discharge_temperature`` out and the common default stands in."""

    min: float  # °C
    max: float  # °C
    given: bool

    @property
    def assumption(self) -> str | None:
        if self.given:
            return None
        return (f"the cell gives no discharge_temperature: taken as {self.min:g} to {self.max:g} "
                f"°C, common on lithium-ion cell data sheets [practice]")


def discharge_window(m: DesignModel) -> DischargeWindow | None:
    stack = m.stack
    if stack is None:
        return None
    w = getattr(stack.part, "discharge_temperature", None)
    if w is not None:
        return DischargeWindow(w.min, w.max, True)
    return DischargeWindow(*DEFAULT_DISCHARGE_WINDOW, False)
