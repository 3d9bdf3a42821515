"""Time–current coordination: what acts first, on log current against log time.

Everything a review's coordination chart draws, collected from the model in one place so the
chart has no physics of its own: the design's events (a current for a duration; a current for
ever), the protector's detections (trip current window × delay window), the fuse's melting
limit (the part's pre-arcing points, its melting I²t for short pulses, the standard's gates for
its speed), a PTC's hold current at the highest ambient and its I_max, the switch FETs'
ratings and steady thermal limit (θJA), and each trace's adiabatic withstand.

All currents are pack currents (at the terminals), so every curve meets the events on one axis:
a part that carries a share of the pack current (a FET channel in parallel) has its limit
scaled by that share in the event that loads it most. Units are SI: amperes, seconds.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from ..records import record
from . import copper, fuse

if TYPE_CHECKING:  # pragma: no cover
    from .design import DesignModel

__all__ = ["Mark", "Limit", "GateBar", "Window", "TimeCurrent", "time_current", "DURATIONS",
           "fet_limit", "ADIABATIC_SPAN"]

#: The durations the limit curves are evaluated at, seconds: 1-2-5 steps from 10 µs to 2.8 h
#: (an hour is as long as a fuse standard's longest gate).
DURATIONS = tuple(m * 10.0 ** e for e in range(-5, 4) for m in (1.0, 2.0, 5.0)) + (1e4,)


#: Longest duration the adiabatic withstand is drawn for, seconds: beyond a few seconds copper
#: sheds heat into the board and the steady rating (conductor-capacity) governs [practice: IEC
#: 60949 treats the adiabatic method as valid up to about 5 s; memory].
ADIABATIC_SPAN = 5.0


@record(frozen=True)
class Mark:
    """An event: ``current`` for ``duration`` seconds (``None``: for ever); ``load`` when no
    detection of the protector ends it (a load of the design, or what the protection permits)."""

    name: str
    current: float
    duration: float | None
    load: bool


@record(frozen=True)
class Limit:
    """A part's limit, ``points`` ((current, time), time rising): left of it a FET or a
    conductor survives and a fuse has not yet melted; a PTC's hold current and I_max hold for
    every time (two points, one current)."""

    element: str
    kind: str  # "fuse" | "ptc" | "fet" | "conductor"
    label: str
    points: tuple[tuple[float, float], ...]
    basis: str


@record(frozen=True)
class GateBar:
    """A fuse standard's gate: at ``current`` the fuse melts between ``t_min`` and ``t_max``
    (0 and ``inf`` where the standard gives no bound)."""

    element: str
    current: float
    t_min: float
    t_max: float


@record(frozen=True)
class Window:
    """A detection of the protector: it acts on currents from ``current_min`` (surely above
    ``current_max``) after a delay between ``delay_min`` and ``delay_max``."""

    detection: str
    current_min: float
    current_max: float
    delay_min: float
    delay_max: float


@record(frozen=True)
class TimeCurrent:
    marks: tuple[Mark, ...]
    windows: tuple[Window, ...]
    limits: tuple[Limit, ...]
    gates: tuple[GateBar, ...]
    notes: tuple[str, ...]


#: Events the chart leaves out: storage's microamperes over months say nothing of which part acts
#: first in a fault (the storage-drain rule judges them).
OFF_CHART = ("storage",)


def time_current(m: "DesignModel") -> TimeCurrent:
    """The coordination of a design; empty parts where the design lacks them."""
    notes: list[str] = []
    marks = tuple(Mark(e.name, e.current, e.duration, e.detection is None) for e in m.events
                  if e.current > 0 and e.name not in OFF_CHART)
    limits: list[Limit] = []
    gates: list[GateBar] = []
    for f in m.netlist.of_kind("fuse", "heater_fuse", "ptc"):
        if f.kind != "ptc":  # a heater fuse melts on over-current like any fuse
            limits += _fuse_limits(f, gates)
        else:
            limits += _ptc_limits(m, f)
    for ch in m.channels:
        limit = fet_limit(m, ch)
        if limit is not None:
            limits.append(limit)
    limits += _steady_fet_limits(m)
    limits += _conductor_limits(m)
    if not marks:
        notes.append("no events: the design lacks a protector driving switches in a cell stack")
    return TimeCurrent(marks, _windows(m), tuple(limits), tuple(gates), tuple(notes))


def _windows(m: "DesignModel") -> tuple[Window, ...]:
    p = m.protector
    out = []
    if p is None:
        return ()
    for name, trip, threshold in (("over-current", m.overcurrent_trip, p.part.overcurrent),
                                  ("short-circuit", m.short_circuit_trip, p.part.short_circuit)):
        if trip is None or threshold is None or not (math.isfinite(trip.min) and trip.min > 0):
            continue
        out.append(Window(name, trip.min, trip.max, threshold.delay.low, threshold.delay.high))
    return tuple(out)


def _fuse_limits(f, gates: list[GateBar]) -> list[Limit]:
    part, out = f.part, []
    if part.pre_arcing:
        pts = sorted(((p.current, p.time) for p in part.pre_arcing), key=lambda p: p[1])
        out.append(Limit(f.refdes, "fuse", f"{f.refdes} pre-arcing", tuple(pts),
                         "the part's pre-arcing points"))
    if part.melting_i2t is not None:
        # A short pulse melts the fuse at its melting I²t, I = √(I²t / t), up to the time the
        # constant I²t holds for (fuse.ADIABATIC_TIME).
        pts = tuple((math.sqrt(part.melting_i2t / t), t) for t in DURATIONS
                    if t <= fuse.ADIABATIC_TIME)
        out.append(Limit(f.refdes, "fuse", f"{f.refdes} melting I²t", pts,
                         f"melting I²t {part.melting_i2t:g} A²s, for pulses up to "
                         f"{fuse.ADIABATIC_TIME * 1e3:g} ms"))
    if not part.pre_arcing:
        standard = fuse.gates_for(part.speed.value, part.rated_current)
        if standard is not None:
            gates += [GateBar(f.refdes, g.multiple * part.rated_current, g.t_min, g.t_max)
                      for g in standard.gates]
    return out


def _ptc_limits(m: "DesignModel", f) -> list[Limit]:
    part, hot = f.part, m.ambient.max
    points = [(p.ambient, p.current) for p in part.hold_derating or ()]
    hold = fuse.ptc_hold_current(part.hold_current, hot, points)
    ends = (DURATIONS[0], DURATIONS[-1])
    return [Limit(f.refdes, "ptc", f"{f.refdes} holds at {hot:g} °C",
                  tuple((hold.current, t) for t in ends), hold.basis),
            Limit(f.refdes, "ptc", f"{f.refdes} I_max", tuple((part.max_current, t) for t in ends),
                  "the part's I_max")]


def fet_limit(m: "DesignModel", ch) -> Limit | None:
    """A switch channel's limit in pack current: its pulsed rating ``id_pulse_max`` up to the
    longest event it is judged against in short-circuit-stress (the hard short), its continuous
    rating ``id_max`` beyond; scaled by the channel's share of the pack current.

    Hook: when the part gives a transient thermal impedance, the current that brings the
    junction to tj_max in each of :data:`DURATIONS` belongs here, in place of the two ratings.
    """
    part = ch.part
    share = _share(m, ch.name)
    if share is None:
        return None
    short = m.event("hard-short")
    pts = []
    if part.id_pulse_max is not None and short is not None and short.duration:
        pts += [(part.id_pulse_max / share, DURATIONS[0]), (part.id_pulse_max / share, short.duration),
                (part.id_max / share, short.duration)]
        basis = (f"id_pulse_max {part.id_pulse_max:g} A up to the hard short's "
                 f"{short.duration * 1e6:.4g} µs, id_max {part.id_max:g} A beyond")
    else:
        pts.append((part.id_max / share, DURATIONS[0]))
        basis = f"id_max {part.id_max:g} A (no id_pulse_max)"
    pts.append((part.id_max / share, DURATIONS[-1]))
    if abs(share - 1.0) > 1e-9:
        basis += f", per channel; the channel carries {share * 100:.3g} % of the pack current"
    return Limit(ch.name, "fet", f"{ch.name} ratings", tuple(pts), basis)


def _steady_fet_limits(m: "DesignModel") -> list[Limit]:
    """Per switch package, the pack current that holds its junction at tj_max in a steady state
    at the highest ambient: P = (tj_max − T_A)/θJA = I²·Σ s²·R_DS(on)(tj_max), each channel at
    its share s of the pack current, lowest gate drive, highest on-resistance. A steady state
    bounds any shorter pulse from the same ambient from above, so below this current the
    package survives every duration."""
    gd = m.gate_drive
    if gd is None:
        return []
    hot, out = m.ambient.max, []
    for package in sorted({ch.package for ch in m.channels}):
        chans = [ch for ch in m.channels if ch.package == package]
        part = chans[0].part
        shares = {ch.name: _share(m, ch.name) for ch in chans}
        if any(v is None for v in shares.values()) or part.tj_max <= hot:
            continue
        r = sum(shares[ch.name] ** 2 * m.channel_rds(ch, gd.min, part.tj_max, "max")[0]
                for ch in chans)
        current = _at_tj_max(m, package, part.tj_max,
                             math.sqrt((part.tj_max - hot) / part.theta_ja / r))
        out.append(Limit(package, "fet", f"{package} θJA steady at {hot:g} °C",
                         ((current, DURATIONS[0]), (current, DURATIONS[-1])),
                         f"tj_max {part.tj_max:g} °C at {hot:g} °C ambient through θJA "
                         f"{part.theta_ja:g} K/W, steady: safe for any duration below it"))
    return out


def _at_tj_max(m: "DesignModel", package: str, tj_max: float, guess: float) -> float:
    """The pack current whose self-heated steady state (the model's own operating point: each
    channel at its own V_GS, at the highest ambient and resistance) holds ``package`` at tj_max,
    found by bisection from ``guess`` (the balance with every channel at the lowest drive, which
    the channels' own lower drives can only lower) [published: bisection]."""
    gd, hot = m.gate_drive, m.ambient.max
    lo, hi = 0.0, guess
    for _ in range(60):  # the guess was low: widen until the junction passes tj_max
        if m.operating_point(hi, hot, gd.min, "max").tj[package] >= tj_max - TJ_MATCH:
            break
        lo, hi = hi, hi * 2.0
    while hi - lo > 1e-4 * hi:
        mid = 0.5 * (lo + hi)
        op = m.operating_point(mid, hot, gd.min, "max")
        if op.tj[package] < tj_max - TJ_MATCH or (not op.runaway and op.tj[package] < tj_max):
            lo = mid
        else:
            hi = mid
    return lo


#: How close to tj_max a steady state counts as reaching it, K.
TJ_MATCH = 0.01


def _share(m: "DesignModel", element: str) -> float | None:
    """The element's share of the pack current in the event that loads it most."""
    best = None
    for e in m.events:
        if e.current > 0 and element in e.element_current:
            s = e.element_current[element] / e.current
            best = s if best is None else max(best, s)
    return best if best is not None and best > 0 else None


def _conductor_limits(m: "DesignModel") -> list[Limit]:
    out = []
    for c in m.netlist.of_kind("trace", "wire"):
        share = _share(m, c.refdes)
        if share is None or c.kind == "wire" and c.part.awg is None:
            continue
        area = (copper.awg_area(c.part.awg) if c.kind == "wire"
                else c.part.width * copper.trace_thickness(c.part))
        pts = tuple((m.limits.conductor_withstand(area, t, m.ambient.max) / share, t)
                    for t in DURATIONS if t <= ADIABATIC_SPAN)
        out.append(Limit(c.refdes, "conductor", f"{c.refdes} withstand", pts,
                         f"IEC 60949 adiabatic, from {m.limits.conductor_start(m.ambient.max):g} °C "
                         f"to {m.limits.conductor_final:g} °C"))
    return out
