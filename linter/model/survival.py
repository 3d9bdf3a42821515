"""What the switches survive in each event: the worst share of parallel packages, the junction
at the end of each event from the part's transient thermal impedance, the safe operating area,
and the avalanche energy of a turn-off spike.

Every event of the model (``DesignModel.events``) with a duration is judged the same way, from
the figures the event carries (its duration, each channel's current and each package's
dissipation), so an event added later is judged with no change here.

Units are SI: amperes, ohms, volts, watts, joules, seconds, °C, K/W.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from ..records import record
from .pulse import ZthValue, avalanche_energy, curve_zth, foster_zth
from .values import corner_value, memo_key

if TYPE_CHECKING:  # pragma: no cover
    from .design import DesignModel
    from .events import Event
    from .topology import SwitchChannel

__all__ = ["Spread", "current_spread", "ShareCase", "current_sharing", "PulseHeat", "pulse_heat",
           "zth_at", "Avalanche", "avalanche", "TURN_OFF_SEARCH_MAX", "TURN_OFF_RESOLUTION",
           "TurnOffWindow", "turn_off_window"]

#: A channel carrying at least this share of the pack current has no parallel peer to share it.
_ALONE = 1.0 - 1e-9


@record(frozen=True)
class Spread:
    """How much more than its share a channel can carry when its on-resistance sits at the low end
    of the spread and its parallel peers' at the high end: ``factor`` = worst share / equal
    share, at the gate drive where it is largest; ``rds`` (low, high) there, ohms at 25 °C;
    ``assumptions`` how the low end was found where the data sheet gives none."""

    channel: str
    factor: float
    vgs: float
    rds: tuple[float, float]
    assumptions: tuple[str, ...]


def current_spread(m: "DesignModel") -> dict[str, Spread]:
    """Channel name -> its :class:`Spread`, for the channels that share the current with another.

    The division comes from the path's own solve [derived: in a linear network the current
    divides inversely to the branch resistances; for two parts the lower one carries
    I·R_other/(R_self + R_other)], once with every channel at its highest on-resistance, once with
    the channel at its lowest, both at 25 °C: at one junction temperature the ratio does not
    depend on it. The part that carries more heats more and its resistance rises, which evens
    the division out in a steady state; that is left out, so the worst share errs high.
    Interchangeable channels are solved once (:class:`ClassShares`), and the whole is a function
    of the netlist and the drive, kept with the path's memo (``PowerPath.remembered``): a re-lint
    whose edit left the netlist alone, and the designs of an equal netlist, solve it once.
    """
    gd = m.gate_drive
    if gd is None or not m.channels or m.stack is None:
        return {}
    drives = tuple(sorted({gd.min, gd.max}))
    key = ("current spread",) + tuple(memo_key(v) for v in drives)
    return dict(m.path.remembered(key, lambda: spread_at_drives(m, drives)))


def spread_at_drives(m: "DesignModel", drives: tuple[float, ...]) -> dict[str, Spread]:
    """:func:`current_spread` solved at each gate drive of ``drives``."""
    cell_r = corner_value(m.stack.part.internal_resistance, "min")
    out: dict[str, Spread] = {}
    for vgs in drives:
        high = {ch.name: m.channel_rds(ch, vgs, 25.0, "max")[0] for ch in m.channels}
        sol, _, _ = m.solve_path(high, 25.0, "min", cell_r)
        if sol is None:
            continue
        i_load = abs(sol.current("(load)"))
        worst_of = ClassShares(m, high, cell_r)
        for ch in m.channels:
            equal = abs(sol.current(ch.name)) / i_load if i_load else 0.0
            if equal <= 0.0 or equal >= _ALONE:
                continue
            low_r, notes = m.channel_rds(ch, vgs, 25.0, "min")
            worst = worst_of(ch, low_r)
            if worst is None:
                continue
            old = out.get(ch.name)
            if old is None or worst / equal > old.factor:
                out[ch.name] = Spread(ch.name, worst / equal, vgs, (low_r, high[ch.name]),
                                      tuple(n for n in notes if n.startswith("min:")))
    return out


def solved_worst_share(m: "DesignModel", high: dict[str, float], name: str, low_r: float,
                       cell_r: float) -> float | None:
    """The share of the pack current channel ``name`` carries at ``low_r`` beside the others at
    ``high``, from a solve of the whole path at 25 °C; None when it cannot be solved."""
    sol_low, _, _ = m.solve_path(dict(high, **{name: low_r}), 25.0, "min", cell_r)
    if sol_low is None:
        return None
    return abs(sol_low.current(name)) / abs(sol_low.current("(load)"))


class ClassShares:
    """:func:`solved_worst_share` of each channel, solved once per class of interchangeable
    channels: the same drain and source nets, the same channel type (so the same body diode)
    and the same on-resistances high and low. The path sees a channel only as a switch branch
    made of those (``PowerPath._switch``), so exchanging two channels of a class maps the
    network with one of them low onto the network with the other low, and each carries the
    same share [derived: relabelling two parallel branches leaves the nodal equations as they
    were]. Ten packages in parallel per switch then cost two solves, not twenty, and a pack's
    solves grow with its kinds of channel rather than its count of them."""

    def __init__(self, m: "DesignModel", high: dict[str, float], cell_r: float) -> None:
        self.m, self.high, self.cell_r = m, high, cell_r
        self._solved: dict[tuple, float | None] = {}

    def __call__(self, ch: "SwitchChannel", low_r: float) -> float | None:
        key = (ch.drain, ch.source, ch.channel, self.high[ch.name], low_r)
        if key not in self._solved:
            self._solved[key] = solved_worst_share(self.m, self.high, ch.name, low_r, self.cell_r)
        return self._solved[key]


@record(frozen=True)
class ShareCase:
    """One channel in one event: the current at the event's own division (``equal``: every part
    at the same corner) and at the worst spread (``worst``)."""

    event: "Event"
    channel: Any  # topology.SwitchChannel
    equal: float
    worst: float
    spread: Spread


def current_sharing(m: "DesignModel") -> tuple[ShareCase, ...]:
    """Every event's current of every channel that shares it with parallel peers, at the spread."""
    spread = m.current_spread
    out = []
    for ev in m.events:
        for ch in m.channels:
            s = spread.get(ch.name)
            if s is None or ch.name not in ev.element_current:
                continue
            equal = ev.current_through(ch.name)
            out.append(ShareCase(ev, ch, equal, equal * s.factor, s))
    return tuple(out)


def zth_at(part: Any, duration: float) -> ZthValue | None:
    """The part's single-pulse Z_th at ``duration``, or None when the part gives none."""
    z = getattr(part, "zth", None)
    if z is None:
        return None
    if z.foster is not None:
        return ZthValue(foster_zth([(s.r, s.tau) for s in z.foster], duration),
                        "from the Foster network", True)
    return curve_zth([(p.time, p.zth) for p in z.points], duration, part.theta_ja)


@record(frozen=True)
class PulseHeat:
    """One switch package in one event with a duration.

    ``power`` is the package's dissipation in the event at the worst share (the event's own
    figure times ``factor``², the on-resistance the event took kept: a bound, since the part at
    the low end of the spread has the lower resistance); ``start`` the junction when the event
    begins: the steady state under the continuous load at the highest ambient, at the same
    share; ``needed`` the Z_th at the event's duration that just reaches tj_max; ``tj`` the
    junction at the end, where the part gives a Z_th. ``soa`` is ``"within"``, ``"beyond"`` or
    ``None`` (no points, or none that decide), for the channel current ``current`` at
    ``vds`` (P/I: an upper bound for a pair, whose dissipation is by package).
    """

    event: "Event"
    package: str
    part: Any
    power: float
    factor: float
    start: float
    start_words: str
    needed: float
    zth: ZthValue | None
    tj: float | None
    current: float
    vds: float
    soa: str | None
    soa_point: Any = None


def pulse_heat(m: "DesignModel") -> tuple[PulseHeat, ...]:
    """:class:`PulseHeat` of every package dissipating in every event that has a duration."""
    spread = m.current_spread
    chans: dict[str, list] = {}
    for ch in m.channels:
        chans.setdefault(ch.package, []).append(ch)
    factor = {pk: max((spread[c.name].factor for c in cs if c.name in spread), default=1.0)
              for pk, cs in chans.items()}
    before = m.event("continuous-load")
    hot = m.ambient.max
    out = []
    for ev in m.events:
        if ev.duration is None or ev.duration <= 0:
            continue
        for pk, cs in chans.items():
            part, k = cs[0].part, factor[pk]
            power = ev.dissipation.get(pk, 0.0) * k * k
            if power <= 0.0:
                continue
            if before is not None:
                start = hot + before.dissipation.get(pk, 0.0) * k * k * part.theta_ja
                words = (f"the junction under the continuous load at the highest ambient "
                         f"{hot:g} °C")
            else:
                start, words = hot, f"the highest ambient {hot:g} °C"
            z = zth_at(part, ev.duration)
            tj = None if z is None else start + power * z.value
            currents = [ev.current_through(c.name) * k for c in cs]
            current = max(currents)
            vds = power / current if current > 0 else 0.0
            # The package's dissipation is shared by its channels: with one current through
            # all, the channel with the most voltage has at least P/(n·I).
            same = max(currents) - min(currents) <= 1e-6 * current
            soa, point = _soa(part, ev.duration, current, vds, vds / len(cs) if same else 0.0)
            out.append(PulseHeat(ev, pk, part, power, k, start, words,
                                 (part.tj_max - start) / power, z, tj, current, vds, soa, point))
    return tuple(out)


def _soa(part: Any, duration: float, current: float, vds_high: float,
         vds_low: float) -> tuple[str | None, Any]:
    """Judge (V_DS, I, t) by the chart's points, which bound the area: a point at a higher or equal
    voltage and a longer or equal pulse that allows the current proves it within; one at a lower
    or equal voltage and a shorter or equal pulse that does not allow it proves it beyond (the
    allowed current never rises with V_DS or pulse width [published: data-sheet SOA charts])."""
    points = getattr(part, "soa", None) or []
    for p in points:
        if p.pulse >= duration and p.vds >= vds_high and p.current >= current:
            return "within", p
    for p in points:
        if p.pulse <= duration and p.vds <= vds_low and p.current < current:
            return "beyond", p
    return None, None


@record(frozen=True)
class Avalanche:
    """The energy a discharge switch absorbs clamping the turn-off spike of a short."""

    channel: str
    energy: float  # J
    current: float
    inductance: float
    v_br: float
    v_dd: float


def avalanche(m: "DesignModel", ch: "SwitchChannel") -> Avalanche | None:
    """Avalanche energy of ``ch`` turning off a short whose spike exceeds its vds_max, or None.

    V_BR is taken as vds_max: the real breakdown lies above the rating, and a lower V_BR gives
    more energy, so this errs high. The whole interrupted current is taken through this one
    package: of parallel packages the one with the lowest breakdown clamps first and takes the
    energy [practice].
    """
    spike = m.turn_off_spike(ch)
    if spike is None or spike.total <= ch.part.vds_max:
        return None
    e = avalanche_energy(spike.inductance, spike.current, ch.part.vds_max, spike.stack)
    return Avalanche(ch.name, e, spike.current, spike.inductance, ch.part.vds_max, spike.stack)


# --- the turn-off times a discharge switch may have -------------------------------------------

#: The longest turn-off time the window searches up to: a switch that takes longer to turn off
#: is no longer turning off a short but conducting it (the protector's delays are shorter).
TURN_OFF_SEARCH_MAX = 1.0  # s
#: The upper end is found to within this share of itself.
TURN_OFF_RESOLUTION = 1e-3


@record(frozen=True)
class TurnOffWindow:
    """The turn-off times that keep a discharge switch within its limits on interrupting a
    short: at least ``low``, which keeps the spike V_stack + L·I/t within the voltage limit, and
    at most ``high``, which keeps the hottest discharge package below tj_max at the end of the
    turn-off (``high`` None: no Z_th to judge by, or none reached up to
    :data:`TURN_OFF_SEARCH_MAX`). A slower fall lowers the spike but dissipates ½·V·I for longer
    [derived, docs/references.md "Events in time"]. Empty when ``high`` < ``low``."""

    low: float
    high: float | None
    package: str = ""

    @property
    def empty(self) -> bool:
        return self.high is not None and self.high < self.low


def turn_off_window(m: "DesignModel", spike: Any, limit: float) -> TurnOffWindow | None:
    """The :class:`TurnOffWindow` of the turn-off spike ``spike`` (events.TurnOffSpike) against
    ``limit`` (volts), or None when the stack alone reaches the limit. Each package's dissipation
    in the turn-off-spike event scales with the voltage over the fall, V_stack + L·I/t (the
    current and its share stay), and its junction at the end is start + P(t)·Z_th(t), the same
    sum switch-pulse-heat judges; the first t at which one package passes tj_max is bisected."""
    room = limit - spike.stack
    if room <= 0:
        return None
    low = spike.inductance * spike.current / room
    heats = [h for h in m.pulse_heat if h.event.name == "turn-off-spike" and h.zth is not None
             and h.zth.exact and h.start < h.part.tj_max]
    if not heats:
        return TurnOffWindow(low, None)

    def over(t: float) -> tuple[float, str]:
        scale = (spike.stack + spike.inductance * spike.current / t) / spike.total
        return max((h.start + h.power * scale * zth_at(h.part, t).value - h.part.tj_max,
                    h.package) for h in heats)

    # P(t)·Z_th(t) grows with t over the range searched (Z_th grows; the energy ½·I·(V_stack·t +
    # L·I) grows), so the first failure on a rising grid, bisected, is the upper end.
    passing, t = None, min(low, TURN_OFF_SEARCH_MAX) / 1e3
    while t <= TURN_OFF_SEARCH_MAX:
        excess, package = over(t)
        if excess > 0:
            break
        passing, t = t, t * 1.25
    else:
        return TurnOffWindow(low, None)
    if passing is None:
        return TurnOffWindow(low, 0.0, package)
    failing = t
    while failing - passing > TURN_OFF_RESOLUTION * passing:
        mid = (passing + failing) / 2
        if over(mid)[0] > 0:
            failing = mid
        else:
            passing = mid
    return TurnOffWindow(low, passing, package)
