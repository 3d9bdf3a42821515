"""The hard short as it happens: the short solved with the gate drive it leaves the switches.

A bolted short across the pack terminals pulls the cells' terminal voltage down to
EMF − I·R_cell. Where the protector drives the gates from the cells (``gate_drive: cell``) its
supply and its gate outputs follow that collapsed voltage, so the drive each switch sees depends
on the current it carries [practice, docs/references.md "Events in time"]:

* a channel whose source sits on the stack's bottom (the low-side discharge FET) sees the
  collapsed supply as its V_GS: the more current, the less drive, the more resistance;
* a channel whose source sits on a node the short pulls towards the other rail (the low-side
  charge FET, source on P−, which the short joins to P+) sees only the drop between its source
  and that rail: it is starved, and its current runs through its body diode;
* a p-channel switch on the positive rail, its gate pulled to the protector's ground, sees the
  voltage of its source above that ground, which falls with the current the same way.

A fixed drive (``gate_drive: 12 V``, a driver that holds the gate a fixed voltage from the
source) keeps its drive. Each channel's V_GS is read off the solved node voltages, its
on-resistance follows from it, and the path is solved again until the drives settle: one
temperature and one corner of every part's spread throughout, said in :attr:`HardShort.corner`.

The body diode at the currents of a short is a knee of :data:`BODY_DIODE_V_FORWARD` plus the
network's small on-resistance (the part format gives no V_SD curve).

Units are SI: amperes, ohms, volts, watts, °C.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, Any

from ..records import record
from . import rdson
from .network import DEFAULT_DIODE_R_ON, NetworkError
from .values import IDEAL, ModelProblem, corner_value, memo_key

if TYPE_CHECKING:  # pragma: no cover
    from .design import DesignModel
    from .topology import SwitchChannel

__all__ = ["BODY_DIODE_V_FORWARD", "ChannelInShort", "HardShort", "hard_short"]

#: Forward voltage of a power MOSFET's body diode at the tens to hundreds of amperes of a short:
#: 0.9-1.0 V [practice: docs/references.md "Events in time" gives 0.8-1.2 V at high current; the
#: data sheet's V_SD curve rules]. The middle of the common range, used where a part gives none.
BODY_DIODE_V_FORWARD = 0.95
#: The drives have settled when every channel's V_GS is within this of the one its solution gives
#: it, V [derived: a microvolt moves an on-resistance by parts per million].
VGS_TOLERANCE = 1e-6
#: Solves allowed before the short is reported unsettled; Orchard settles in six, the hardest
#: near-threshold cases tried in under fifty.
SHORT_ITERATIONS = 100
# A damped step x + w·(f(x) − x) settles any fixed point whose map has a slope between
# −(2/w − 1) and 1 [derived: |1 − w + w·f'| < 1]; the secant step below is tried first, where
# the residual falls at least this fast (so no secant step is more than five plain ones).
_DAMPING = 0.5
_SECANT_MIN_FALL = 0.2


@record(frozen=True)
class ChannelInShort:
    """One switch channel in the short.

    ``vgs`` is the gate drive it sees (magnitude), ``rds`` its channel resistance (``None`` when
    the drive does not reach its threshold: starved, the channel is off), ``current`` the whole
    current of the switch (channel and body diode), ``diode_current`` the body diode's share,
    ``drop`` the voltage across it and ``power`` what it dissipates: I·V across it, that is
    I²·R in the channel plus V_F·I in the body diode.
    """

    name: str
    package: str
    vgs: float
    rds: float | None
    current: float
    diode_current: float
    drop: float
    power: float

    @property
    def conducts(self) -> str:
        """What carries the current: "channel", "body diode" or "channel and body diode"."""
        if self.diode_current <= 1e-9 * max(self.current, 1e-30):
            return "channel"
        if self.rds is None or self.current - self.diode_current <= 1e-9 * self.current:
            return "body diode"
        return "channel and body diode"


@record(frozen=True)
class HardShort:
    """A hard short across the pack terminals, solved at one temperature and one corner.

    ``drive`` says how the gates are driven: ``"fixed"`` (a driver holds each V_GS, e.g.
    ``gate_drive: 12 V``), ``"held"`` (cell-driven gates held at the supply the protector had
    before the short, as at the instant it begins) or ``"collapsed"`` (cell-driven gates
    following the collapsed cell voltage, the short as it goes on). ``sense_voltage``
    is what the protector's sense input sees against its ground (``None`` where the network does
    not reach those pins).
    """

    current: float
    ambient: float
    corner: str  # the spread corner of every part: "min" for the lowest resistances
    emf: float  # cell EMF, V
    drive: str  # "fixed" | "held" | "collapsed"
    channels: dict  # channel name -> ChannelInShort
    sense_voltage: float | None
    solution: Any
    iterations: int
    converged: bool
    assumptions: tuple[str, ...] = ()

    @property
    def rds(self) -> dict:
        """Channel name -> on-resistance in the short (0 for a starved channel, off)."""
        return {n: (c.rds if c.rds is not None else 0.0) for n, c in self.channels.items()}

    @property
    def channel_current(self) -> dict:
        return {n: c.current for n, c in self.channels.items()}

    @property
    def package_power(self) -> dict:
        """Package -> W, channels and body diodes together."""
        out: dict[str, float] = {}
        for c in self.channels.values():
            out[c.package] = out.get(c.package, 0.0) + c.power
        return out

    def describe_drive(self) -> str:
        """The gate drive of each channel in words, for an event's corner."""
        parts = []
        for c in self.channels.values():
            if c.rds is None:
                parts.append(f"{c.name} starved (V_GS {c.vgs:.3g} V), its body diode at "
                             f"{BODY_DIODE_V_FORWARD:g} V carries it")
            else:
                parts.append(f"{c.name} V_GS {c.vgs:.3g} V")
        return "; ".join(parts)


def threshold(ch: "SwitchChannel", corner: str) -> float:
    """The channel's gate threshold magnitude at a corner (:func:`rdson.threshold_at`): the
    lowest for ``min`` (the corner of the lowest resistances, where it conducts soonest), the
    highest for ``max``; 0 V where the part gives none."""
    t = ch.part.vgs_th
    vth = rdson.threshold_at((t.min, t.typ, t.max), corner)
    return 0.0 if vth is None else vth


def channel_resistance(m: "DesignModel", ch: "SwitchChannel", vgs: float, temp: float,
                       corner: str) -> tuple[float | None, tuple[str, ...]]:
    """The channel's on-resistance at a drive, or ``None`` when the drive does not pass its
    threshold (the channel is off).

    Between the threshold and the lowest tabulated V_GS the channel conductance of a MOSFET in
    its linear region grows with the overdrive, G ≈ k·(V_GS − V_th) [published: the square-law
    model's linear region, any device text], so R = R_low·(V_low − V_th)/(V_GS − V_th) through
    the lowest row; the resistance taken is never less than what ``channel_rds`` gives, so a
    straight-line continuation of the table cannot make a starved channel look strong. (The form
    is :func:`rdson.below_table`'s, taken here without its flat off-switch value just above the
    threshold: the short's drives are solved to a fixed point, which needs the resistance to
    rise without a step until the channel is off.)
    """
    vth = threshold(ch, corner)
    if not vgs > vth:
        return None, ()
    # the lowest tabulated drive above the threshold: the curve runs through it to the threshold
    low = min((abs(p.vgs) for p in ch.part.rds_on if abs(p.vgs) > vth), default=None)
    notes: tuple[str, ...] = ()
    try:
        r, notes = m.channel_rds(ch, vgs, temp, corner)
    except ValueError:
        r = None
    if low is not None and vgs < low:
        r_low, low_notes = m.channel_rds(ch, low, temp, corner)
        bound = r_low * (low - vth) / (vgs - vth)
        if r is None or not (r >= bound):
            r, notes = bound, low_notes + (
                f"{ch.name}: V_GS {vgs:.3g} V below the lowest tabulated {low:g} V in the short; "
                f"R_DS(on) taken as R({low:g} V)·({low:g} − {vth:g})/(V_GS − {vth:g}) V, the "
                f"linear-region form [published]",)
    if r is None or not (math.isfinite(r) and r > 0):
        return None, notes
    return r, notes


def _supply(m: "DesignModel", sol: Any) -> float:
    """The protector's supply in the short: the collapsed stack voltage (one cell's share for a
    single-cell protector), as its supply filter passes it on within tens of microseconds."""
    stack = m.stack
    v = sol.voltage_between(stack.top, stack.bottom) or 0.0
    return v if m.protector.part.cells > 1 else v / stack.series


def _gate_sources(m: "DesignModel", sol: Any, supply: float | None) -> dict[str, float]:
    """Each cell-driven channel's V_GS (magnitude) in the solution ``sol``, read off its node
    voltages (see the module's text), the protector's supply ``supply`` (``None``: the collapsed
    one of ``sol``) above its ground."""
    p = m.protector
    if supply is None:
        supply = _supply(m, sol)
    ground = sol.voltages.get(p.pins.get("ground") or "")
    if ground is None:
        ground = sol.voltage(m.stack.bottom)
    out = {}
    for ch in m.channels:
        source = sol.voltages.get(ch.source)
        if source is None:
            out[ch.name] = 0.0
        elif ch.channel == "n":  # gate driven up to the supply above the protector's ground
            out[ch.name] = ground + supply - source
        else:  # p-channel: gate pulled down to the protector's ground
            out[ch.name] = source - ground
    return out


def hard_short(m: "DesignModel", ambient: float, corner: str = "min",
               held: bool = False, *, emf: float | None = None, cell_r: float | None = None,
               load: float = IDEAL, drive_before: float | None = None) -> HardShort | None:
    """:func:`solve_hard_short`, once per netlist and values (``PowerPath.remembered``): the
    heat, the pulse and the breaking capacity ask for the same short, and so do the designs of
    an equal netlist."""
    key = ("hard short", memo_key(ambient), corner, held, memo_key(emf), memo_key(cell_r),
           memo_key(load), memo_key(drive_before))
    return m.path.remembered(key, lambda: solve_hard_short(
        m, ambient, corner, held, emf=emf, cell_r=cell_r, load=load, drive_before=drive_before))


def solve_hard_short(m: "DesignModel", ambient: float, corner: str = "min",
                     held: bool = False, *, emf: float | None = None,
                     cell_r: float | None = None, load: float = IDEAL,
                     drive_before: float | None = None) -> HardShort | None:
    """The hard short at one temperature (``ambient``: cells, switches and path alike) and one
    corner of every part's spread, the highest cell voltage driving it.

    A fixed ``gate_drive`` keeps every V_GS. A cell-driven gate sits at the protector's supply
    above its ground (n-channel) or at its ground (p-channel), and its V_GS is that against the
    channel's source as the short leaves it: with ``held`` the supply is the one before the short
    (the instant it begins: the supply filter and the gates' charge still hold it), otherwise the
    collapsed cell voltage. Solved to a fixed point of the drives. None without a cell stack,
    protector, gate drive or switches.

    The same solve takes a weaker short (the weakest-short event): ``emf`` per cell (default the
    highest), ``cell_r`` per cell (default the part's at ``corner``), ``load`` the fault's
    resistance across the terminals (default a bolted short) and ``drive_before`` the gate drive
    before the short (default the highest).
    """
    p, gd, stack = m.protector, m.gate_drive, m.stack
    if p is None or gd is None or stack is None or m.cell_voltage is None or not m.channels:
        return None
    fixed = p.part.gate_drive != "cell"
    drive = "fixed" if fixed else "held" if held else "collapsed"
    emf = m.cell_voltage.max if emf is None else emf
    cell_r = corner_value(stack.part.internal_resistance, corner) if cell_r is None else cell_r
    initial = gd.max if drive_before is None else drive_before
    knees = {ch.name: (BODY_DIODE_V_FORWARD, DEFAULT_DIODE_R_ON) for ch in m.channels}
    thresholds = {ch.name: threshold(ch, corner) for ch in m.channels}
    vgs = {ch.name: initial for ch in m.channels}  # the short begins with the drive it had
    # A channel's residual, target − V_GS, falls as its V_GS rises where the current takes drive
    # away (the discharge switch). Near the threshold that fall is steep, and plain or secant
    # steps swing between a starved and a conducting channel; once a residual changes sign the
    # two drives either side bracket the root, and a step leaving the bracket is replaced by its
    # midpoint [published: safeguarded secant, any numerical-analysis text]. A bracket kept
    # through eight midpoints without settling is dropped: the other channels moved its root. A
    # channel off at its drive and at its target is settled by its target alone.
    brackets: dict[str, list] = {}
    halvings = {k: 0 for k in vgs}
    previous: dict[str, tuple[float, float]] = {}
    notes: list[str] = []
    state = None
    converged = False
    for iteration in range(1, SHORT_ITERATIONS + 1):
        rds, on, notes = {}, {}, []
        for ch in m.channels:
            r, n = channel_resistance(m, ch, vgs[ch.name], ambient, corner)
            notes += [x for x in n if x not in notes]
            on[ch.name] = r is not None
            rds[ch.name] = r if r is not None else 1.0
        net = m.network(rds, cell_emf=emf, cell_r=cell_r, temp=ambient, corner=corner,
                        load=load).with_switch_states(on).with_body_diodes(knees)
        try:
            sol = net.solve(ground=stack.bottom)
        except NetworkError as exc:
            m.problems.append(ModelProblem("network", str(exc)))
            return None
        state = (sol, dict(vgs), rds, on)
        if fixed:
            converged = True
            break
        target = _gate_sources(m, sol, initial if held else None)
        residual = {k: target[k] - vgs[k] for k in vgs}
        if max(abs(r) for r in residual.values()) < VGS_TOLERANCE:
            converged = True
            break
        step = {}
        for k, x in vgs.items():
            ch_vth = thresholds[k]
            if x <= ch_vth and target[k] <= ch_vth:
                step[k] = target[k]
                continue
            before = previous.get(k)
            bracket = brackets.get(k)
            if bracket is not None:
                bracket[0 if residual[k] > 0 else 1] = x
            elif before is not None and (residual[k] > 0) != (before[1] > 0):
                bracket = brackets[k] = [x, before[0]] if residual[k] > 0 else [before[0], x]
            nxt = _next(x, residual[k], before)
            if bracket is not None and not min(bracket) < nxt < max(bracket):
                nxt = 0.5 * (bracket[0] + bracket[1])
                halvings[k] += 1
                if halvings[k] >= 8:
                    del brackets[k]
                    halvings[k] = 0
            step[k] = max(nxt, 0.0)
        previous = {k: (vgs[k], residual[k]) for k in vgs}
        vgs = step
    sol, vgs, rds, on = state
    if not converged:
        notes.append(f"the gate drives of the hard short did not settle in {SHORT_ITERATIONS} "
                     f"solves; the last is used")
    return _result(m, sol, vgs, rds, on, ambient, corner, emf, drive, iteration, converged, notes)


def _next(x: float, residual: float, previous: tuple[float, float] | None) -> float:
    """The next drive towards the fixed point: the secant through the last two residuals where
    it is sound (residual falling as the drive rises, as for any stable balance) [published: the
    secant method], else a damped plain step."""
    if previous is not None:
        x0, r0 = previous
        if x != x0:
            slope = (residual - r0) / (x - x0)
            if math.isfinite(slope) and slope <= -_SECANT_MIN_FALL:
                return x - residual / slope
    return x + _DAMPING * residual


def _result(m: "DesignModel", sol: Any, vgs: dict, rds: dict, on: dict, ambient: float,
            corner: str, emf: float, drive: str, iterations: int, converged: bool,
            notes: list[str]) -> HardShort:
    current = abs(sol.current("(load)"))
    channels = {}
    for ch in m.channels:
        i = abs(sol.current(ch.name))
        drop = abs(sol.voltage_between(ch.drain, ch.source) or 0.0)
        channel = drop / rds[ch.name] if on[ch.name] else 0.0
        diode = max(i - channel, 0.0) if ch.name in sol.conducting_diodes else 0.0
        channels[ch.name] = ChannelInShort(ch.name, ch.package, vgs[ch.name],
                                           rds[ch.name] if on[ch.name] else None, i, diode,
                                           drop, i * drop)
    sense = None
    g, s = m.protector.pins.get("ground"), m.protector.pins.get("sense")
    if g and s and sol.voltages.get(g) is not None and sol.voltages.get(s) is not None:
        sense = abs(sol.voltage_between(s, g))
    return HardShort(current, ambient, corner, emf, drive, channels, sense, sol, iterations,
                     converged, tuple(notes))
