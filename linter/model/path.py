"""The power-path solver: the network of a design built at a stated corner, solved, cached.

Every current, sense resistance and steady state of the model comes from here: the network is
built from the topology (cells, switch channels, series parts, an optional load) with each part at
a corner of its spread (``min``, ``typ``, ``max``: the part's own minimum, typical and maximum
value) and a temperature, and solved by :mod:`network`. Built branches and solutions of pure
functions are memoized, so the corners and thermal fixed points that ask for the same network pay
for it once.
"""

from __future__ import annotations

import math
from dataclasses import field, fields
from functools import cached_property
from typing import Any, Callable

from ..kinds import KINDS
from ..netlist import Component
from ..records import record
from . import gate, thermal
from .network import Network, NetworkError, Switch
from .rdson import DEFAULT_HOT_RATIO, rds_on, threshold_at
from .topology import SwitchChannel, Topology
from .values import (IDEAL, PROBE_LOAD, SIGNAL_OHMS, Corner, ModelProblem, corner_value,
                     memo_key)

__all__ = ["OperatingPoint", "PowerPath"]



@record(frozen=True)
class OperatingPoint:
    """The path carrying ``current`` with every switch on, at a thermal steady state.

    ``corner`` is the corner of every part's spread the point was solved at (``max``: the
    highest on-resistances, resistor and cell resistances).
    """

    current: float
    ambient: float
    vgs: float
    corner: str
    rds: dict  # channel name -> ohms at its junction temperature
    channel_current: dict  # channel name -> amperes (magnitude)
    share: dict  # channel name -> amperes per ampere of pack current (how current divides)
    tj: dict  # package -> °C
    power: dict  # package -> W
    sense_resistance: float
    path_resistance: float  # between the stack and the terminals, all series parts
    converged: bool
    runaway: bool
    assumptions: tuple[str, ...]
    #: The network solution the point's currents come from (probe load): the events read the
    #: current of every other part of the path from it instead of solving again.
    solution: Any = field(default=None, compare=False, repr=False)
    #: Each channel's own gate-source voltage (gate.py): ``vgs`` is the protector's drive.
    channel_vgs: dict = field(default_factory=dict, compare=False)


class PowerPath:
    """Builds and solves one design's power path; owns the memo of its pure functions."""

    def __init__(self, topology: Topology, problems: list[ModelProblem]):
        self.topology = topology
        self.problems = problems
        # Memos of pure functions of their arguments: the thermal fixed points and the corners
        # ask for the same on-resistances, part resistances, branches and operating points many
        # times over, and a large pack's path is rebuilt for every solve. Shared with earlier
        # models of the same netlist (:func:`kept_memo`).
        self._memo: dict = kept_memo(getattr(topology, "netlist", None))

    def part_resistance(self, c: Component, temp: float, corner: str) -> float:
        """Resistance of a non-switch part in the path at ``temp`` for a corner (low/typ/high)."""
        key = ("part", c.refdes, memo_key(temp), corner)
        value = self._memo.get(key)
        if value is None:
            value = self._memo[key] = self._part_resistance(c, temp, corner)
        return value

    def _part_resistance(self, c: Component, temp: float, corner: str) -> float:
        kind = KINDS[c.kind]
        if kind.resistance is None:
            raise ValueError(f"{c.refdes}: a {kind.text} does not carry the pack's current")
        return kind.resistance(c.part, temp, corner)

    def network(self, rds: dict[str, float], *, cell_emf: float, cell_r: float, temp: float,
                corner: str = "typ", switches_on: dict[str, bool] | None = None,
                load: float | None = PROBE_LOAD, cells: bool = True,
                exclude: frozenset[str] = frozenset(), max_ohms: float = math.inf) -> Network:
        """The power path of :meth:`built_network`, as a copy of the one built with the same
        values before (a small network: at most ``NETWORK_KEPT_BRANCHES``). The events, the
        short and the heat cases of a design ask for the same networks, and the designs of an
        equal netlist share the memo: the copy shares its original's prepared solver terms, so
        a solve remembered by value (``network._SOLVED``) is found without building anything."""
        channels = self.topology.channels
        on = (True,) * len(channels) if switches_on is None else tuple(
            [switches_on.get(ch.name, True) for ch in channels])
        key = ("network", tuple([memo_key(rds.get(ch.name, 1.0)) for ch in channels]), on,
               memo_key(cell_emf), memo_key(cell_r), memo_key(temp), corner,
               None if load is None else memo_key(load), cells, exclude, memo_key(max_ohms))
        built = self._memo.get(key)
        if built is None:
            built = self.built_network(rds, cell_emf=cell_emf, cell_r=cell_r, temp=temp,
                                       corner=corner, switches_on=switches_on, load=load,
                                       cells=cells, exclude=exclude, max_ohms=max_ohms)
            if len(built.branches) > NETWORK_KEPT_BRANCHES:
                return built
            self._memo[key] = built
        return built.copy()

    def built_network(self, rds: dict[str, float], *, cell_emf: float, cell_r: float,
                      temp: float, corner: str = "typ", switches_on: dict[str, bool] | None = None,
                      load: float | None = PROBE_LOAD, cells: bool = True,
                      exclude: frozenset[str] = frozenset(), max_ohms: float = math.inf
                      ) -> Network:
        """The power path: cells, switch channels, series parts, and an optional load.

        ``exclude`` leaves parts out (to ask what happens without a fuse); ``max_ohms`` leaves out
        resistors above it, which carry signals, not the pack's current.

        Branches are immutable, so each one is built and checked once per value and reused: the
        cells of a large pack are the same in nearly every solve, and only the switch channels
        change from one thermal iteration to the next. The network is the one the ``add_*``
        calls in this order would build.
        """
        memo = self._memo
        if self.topology.stack is not None and cells:
            key = ("cells", memo_key(cell_emf), memo_key(cell_r))
            base = memo.get(key)
            if base is None:
                base = memo[key] = cell_stack(self.topology.stack.cells, cell_emf, cell_r)
            net = base.copy()
        else:
            net = Network()
        for ch in self.topology.channels:
            on = True if switches_on is None else switches_on.get(ch.name, True)
            net.add(self._switch(ch, rds.get(ch.name, 1.0), on))
        for branch in self._after_switches(temp, corner, load, exclude, max_ohms):
            net.add(branch)
        return net

    def _after_switches(self, temp: float, corner: str, load: float | None,
                        exclude: frozenset[str], max_ohms: float) -> tuple:
        """The branches :meth:`network` adds after the switch channels, in order: the series
        parts, then the load. The thermal iterations change only the channels, so these are
        gathered once per model for each temperature and corner, instead of looking up every
        part's resistance and branch again in each of a lint's sixty-odd networks."""
        key = ("after switches", memo_key(temp), corner,
               None if load is None else memo_key(load), exclude, memo_key(max_ohms))
        branches = self._memo.get(key)
        if branches is None:
            found = []
            for c in self.topology.path_parts:
                a, b = c.pins.get("1"), c.pins.get("2")
                if a and b and a != b and c.refdes not in exclude:
                    r = self.part_resistance(c, temp, corner)
                    if r <= max_ohms:
                        found.append(self._resistor(c.refdes, a, b, r))
            if load is not None:
                pos, neg = self.topology.terminals
                if pos != neg:
                    found.append(self._resistor("(load)", pos, neg, load))
            branches = self._memo[key] = tuple(found)
        return branches

    def _resistor(self, name: str, a: str, b: str, ohms: float):
        key = ("resistor", name, a, b, memo_key(ohms))
        branch = self._memo.get(key)
        if branch is None:
            branch = self._memo[key] = Network().add_resistor(name, a, b, ohms)
        return branch

    def _switch(self, ch: SwitchChannel, ohms: float, on: bool):
        # The channel's resistance changes with every thermal iteration, so only the checked
        # first one is kept; the others copy its nets and body diode and take the new value,
        # after the same check add_switch makes.
        template = self._memo.get(("switch", ch.name))
        if template is None:
            template = self._memo[("switch", ch.name)] = Network().add_mosfet(
                ch.name, drain=ch.drain, source=ch.source, channel=ch.channel, ohms_on=ohms, on=on)
            return template
        if (type(ohms) is float and type(on) is bool and ohms > 0.0 and math.isfinite(ohms)
                and math.isfinite(1.0 / ohms)):
            return Switch(template.name, template.a, template.b, ohms, on, template.body_diode)
        return Network().add_mosfet(ch.name, drain=ch.drain, source=ch.source,
                                    channel=ch.channel, ohms_on=ohms, on=on)

    def channel_rds(self, ch: SwitchChannel, vgs: float, tj: float, corner: str) -> tuple[float, tuple[str, ...]]:
        """(ohms, assumptions) of a channel at a gate drive; below the table the triode form
        through the lowest row, and near or below the threshold a large finite resistance
        (rdson.OFF_RATIO times that row: an off switch), never negative or infinite."""
        part = ch.part
        hot = part.rds_on_hot_ratio
        key = ("rds", id(part), memo_key(vgs), memo_key(tj), corner)
        hit = self._memo.get(key)
        # The part is held with its value: a memo shared between models (kept_memo) outlives
        # their parts, and an id is unique only among live objects.
        if hit is None or hit[2] is not part:
            ratio, at = (hot.ratio, hot.at) if hot else DEFAULT_HOT_RATIO
            # p-channel data sheets print V_GS negative; the drive is a magnitude either way.
            points = tuple([(abs(p.vgs), p.typ, p.max) for p in part.rds_on])
            t = part.vgs_th
            hit = self._memo[key] = (*kept_rds_on(points, vgs, tj, ratio, at, corner,
                                                  threshold_at((t.min, t.typ, t.max), corner)),
                                     part)
        value, notes, _ = hit
        if hot is None:
            notes = notes + (f"{ch.package}: no rds_on_hot_ratio given; assumed 1.5 at 125 °C "
                             f"[practice: 1.4-1.6 for 20 V parts]",)
        return value, notes

    def operating_point(self, current: float, ambient: float, vgs: float, corner: str,
                        self_heating: bool = True, detect: float | None = None) -> OperatingPoint:
        """Steady state of the path carrying ``current``, switches on, at ``corner`` (typ|max|min).

        Each channel's gate sees the drive ``vgs`` less its source's lift (gate.py) at
        ``current``, or, with ``detect`` (volts across the sense pins), at the current that
        sets up that voltage: the trip current, where the sense resistance is judged.
        The trip windows and the switch heat ask for the same points (the continuous load at
        the highest ambient and lowest drive, for one); each is computed once.
        """
        key = ("op", memo_key(current), memo_key(ambient), memo_key(vgs), corner, self_heating,
               detect)
        hit = self._memo.get(key)
        if hit is None:
            before = len(self.problems)
            op = self._operating_point(current, ambient, vgs, corner, self_heating, detect)
            hit = self._memo[key] = (op, self.problems[before:])
        else:
            self.problems.extend(hit[1])  # as a fresh computation would have recorded them
        return hit[0]

    def remembered(self, key: tuple, compute: Callable[[], Any]) -> Any:
        """``compute()``, kept in the memo under ``key`` with the problems it recorded (said
        again on each recall, as a fresh computation would). For a function of the topology
        and of what ``key`` holds only: the memo is shared by the models of an equal netlist
        (:func:`kept_memo`)."""
        hit = self._memo.get(key)
        if hit is None:
            before = len(self.problems)
            value = compute()
            hit = self._memo[key] = (value, self.problems[before:])
        else:
            self.problems.extend(hit[1])
        return hit[0]

    def _operating_point(self, current: float, ambient: float, vgs: float, corner: str,
                         self_heating: bool, detect: float | None = None) -> OperatingPoint:
        packages = {ch.package: ch.part for ch in self.topology.channels}
        tj = {p: ambient for p in packages}
        cell = self.topology.stack.part if self.topology.stack else None
        cell_r = corner_value(cell.internal_resistance, corner) if cell else IDEAL
        converged, runaway = True, False
        held_at: list[str] = []
        if detect is not None and self_heating:
            # The switches sit where the load heats them; the current then rises to the trip too
            # briefly to heat them further, and only each channel's drive follows it.
            heat = self.operating_point(current, ambient, vgs, corner, True)
            tj, converged, runaway, self_heating = dict(heat.tj), heat.converged, heat.runaway, False
            if runaway:
                # No steady state below tj_max: the last iterate (thousands of degrees, say) is
                # no temperature a part reaches intact. The window is taken at tj_max, the
                # hottest the switches can be and still switch; switch-temperature reports why.
                capped = {p: min(t, packages[p].tj_max) for p, t in tj.items()}
                held_at = [p for p in packages if capped[p] < tj[p]]
                tj = capped
        notes: list[str] = []
        previous: dict[str, tuple[float, float]] = {}
        names = [ch.name for ch in self.topology.channels]
        vg = gate.channel_vgs(vgs, {}, names, 0.0)
        for _ in range(thermal.LOAD_ITERATIONS):
            rds, notes, seen = {}, [], set()
            for ch in self.topology.channels:
                rds[ch.name], n = self.channel_rds(ch, vg[ch.name], tj[ch.package], corner)
                for x in n:
                    if x not in seen:
                        seen.add(x)
                        notes.append(x)
            sol, sense, path_r = self.solve(rds, ambient, corner, cell_r)
            i_load = abs(sol.current("(load)")) if sol is not None else 0.0
            share = {ch.name: abs(sol.current(ch.name)) / i_load if sol and i_load else 0.0
                     for ch in self.topology.channels}
            ich = {name: f * current for name, f in share.items()}
            power = {p: 0.0 for p in packages}
            for ch in self.topology.channels:
                power[ch.package] += ich[ch.name] ** 2 * rds[ch.name]
            at = current if detect is None else (detect / sense if 0.0 < sense < math.inf else 0.0)
            lift = gate.lift_per_ampere(self.topology, self.high_side, sol) if at else {}
            held, vg = vg, gate.channel_vgs(vgs, lift, names, at)
            if not self_heating:
                if gate.settled(held, vg):
                    break
                continue
            new = {p: ambient + power[p] * packages[p].theta_ja for p in packages}
            if any(new[p] > packages[p].tj_max for p in packages):
                # Less drive only adds heat: runaway stands, with the drives this solve gives.
                tj, converged, runaway, held = new, False, True, vg
                break
            delta = max((abs(new[p] - tj[p]) for p in packages), default=0.0)
            if delta < thermal.TJ_TOLERANCE and gate.settled(held, vg):
                tj = new
                break
            # P = I²·R rises with T_J, so iterates from the ambient climb towards the lowest
            # steady state and the first one past tj_max proves there is none below it. The
            # secant (thermal.accelerated_step) gets there in fewer solves; it is kept at or
            # below tj_max, where the image of any point still tells the two cases apart.
            step = {p: min(thermal.accelerated_step(tj[p], new[p], previous.get(p)),
                           packages[p].tj_max) for p in packages}
            previous = {p: (tj[p], new[p] - tj[p]) for p in packages}
            tj = step
        else:
            converged = False
        said = gate.describe(vgs, held)
        if said is not None:
            notes.append(said)
        if detect is not None and runaway and held_at:
            notes.append("T_J held at tj_max (" + ", ".join(
                f"{p} {packages[p].tj_max:g} °C" for p in held_at) + "): the load alone heats "
                "the switches past it, with no steady state below")
        return OperatingPoint(current, ambient, vgs, corner, rds, ich, share, tj, power, sense, path_r,
                              converged, runaway, tuple(notes), sol, held)

    def solve(self, rds: dict[str, float], temp: float, corner: Corner,
              cell_r: float) -> tuple[Any, float, float]:
        """One nodal solve of the path with the probe load, every switch on, the other parts at
        ``corner`` and ``temp``: (solution, sense resistance, stack-to-terminal path resistance)."""
        if self.topology.stack is None:
            return None, math.inf, math.inf
        emf = self.topology.cell_limits.nominal if self.topology.cell_limits else 3.6
        net = self.network(rds, cell_emf=emf, cell_r=cell_r, temp=temp, corner=corner)
        try:
            sol = net.solve(ground=self.topology.stack.bottom)
        except NetworkError as exc:
            self.problems.append(ModelProblem("network", str(exc)))
            return None, math.inf, math.inf
        i_load = abs(sol.current("(load)"))
        sense = math.inf
        p = self.topology.protector
        if p is not None and i_load > 0:
            g, s = p.pins.get("ground"), p.pins.get("sense")
            if g and s and g in sol.voltages and s in sol.voltages:
                v = sol.voltage_between(s, g)
                if v is not None:
                    sense = abs(v) / i_load
        pos, neg = self.topology.terminals
        path = math.inf
        if i_load > 0:
            vt = sol.voltage_between(pos, neg)
            vs = sol.voltage_between(self.topology.stack.top, self.topology.stack.bottom)
            if vt is not None and vs is not None:
                path = abs(vs - vt) / i_load
        return sol, sense, path


    @cached_property
    def high_side(self) -> dict[str, bool]:
        """Channel name -> True when the channel switches the positive rail.

        Read off a solve of the path under load: a channel whose source sits above half the stack
        voltage is on the positive side [derived], whatever the drawing calls it.
        """
        if self.topology.stack is None or not self.topology.channels:
            return {}
        emf = self.topology.cell_limits.nominal if self.topology.cell_limits else 3.6
        net = self.network({ch.name: 1e-3 for ch in self.topology.channels}, cell_emf=emf, cell_r=0.01,
                           temp=25.0, max_ohms=SIGNAL_OHMS)
        try:
            sol = net.solve(ground=self.topology.stack.bottom)
        except NetworkError:
            return {}
        top = sol.voltages.get(self.topology.stack.top)
        out = {}
        for ch in self.topology.channels:
            v = sol.voltages.get(ch.source)
            if v is not None and top:
                out[ch.name] = v > top / 2
        return out


    def sense_elements(self, vgs: float) -> tuple[str, ...]:
        """Parts of the power path whose resistance the protector's sense input sees.

        Asked of the solver, not read off the drawing: each element's resistance is doubled in
        turn, and it counts when the transresistance from load current to sense voltage moves
        [derived: in a linear network only an element carrying the load current between the
        sense pins changes that transresistance]. FET channels are named by package.
        """
        p = self.topology.protector
        if p is None or self.topology.stack is None or not self.topology.channels:
            return ()
        g, s = p.pins.get("ground"), p.pins.get("sense")
        if not g or not s:
            return ()
        rds = {ch.name: self.channel_rds(ch, vgs, 25.0, "typ")[0] for ch in self.topology.channels}
        cell_r = self.topology.stack.part.internal_resistance.nominal
        emf = self.topology.cell_limits.nominal if self.topology.cell_limits else 3.6

        def sense(net: Network) -> float | None:
            try:
                sol = net.solve(ground=self.topology.stack.bottom)
            except NetworkError:
                return None
            i = abs(sol.current("(load)"))
            v = sol.voltage_between(s, g) if s in sol.voltages and g in sol.voltages else None
            return abs(v) / i if v is not None and i > 0 else None

        base = sense(self.network(rds, cell_emf=emf, cell_r=cell_r, temp=25.0))
        if not base:
            return ()
        found: list[str] = []
        for ch in self.topology.channels:
            doubled = dict(rds, **{ch.name: 2 * rds[ch.name]})
            r = sense(self.network(doubled, cell_emf=emf, cell_r=cell_r, temp=25.0))
            if r is not None and abs(r - base) > 1e-6 * base and ch.package not in found:
                found.append(ch.package)
        for c in self.topology.path_parts:
            a, b = c.pins.get("1"), c.pins.get("2")
            if not a or not b or a == b:
                continue
            value = self.part_resistance(c, 25.0, "typ")
            if value > SIGNAL_OHMS:
                continue
            net = self.network(rds, cell_emf=emf, cell_r=cell_r, temp=25.0,
                               exclude=frozenset({c.refdes}))
            net.add_resistor(c.refdes, a, b, 2 * value)
            r = sense(net)
            if r is not None and abs(r - base) > 1e-6 * base:
                found.append(c.refdes)
        return tuple(found)


    def direction_network(self, off: str, external: str) -> Network:
        """The path without cells, ``off``-role switches off, and a one-way external element.

        ``external`` is "load" (current leaves the pack at the positive terminal and returns at
        the negative one) or "charger" (current enters at the positive terminal).
        """
        rds = {ch.name: 1e-3 for ch in self.topology.channels}
        states = {ch.name: ch.role != off for ch in self.topology.channels}
        net = self.network(rds, cell_emf=0.0, cell_r=1.0, temp=25.0, switches_on=states,
                           load=None, cells=False, max_ohms=SIGNAL_OHMS)
        pos, neg = self.topology.terminals
        if external == "load":
            net.add_diode("(load)", pos, neg)
        else:
            net.add_diode("(charger)", neg, pos)
        return net

    def conducts(self, off: str, direction: str):
        """With ``off`` switches off, a path for ``direction`` current ("discharge"/"charge"),
        found once per netlist (:meth:`remembered`)."""
        return self.remembered(("conducts", off, direction),
                               lambda: self.find_conduction(off, direction))

    def find_conduction(self, off: str, direction: str):
        """The search behind :meth:`conducts`."""
        if self.topology.stack is None:
            return None
        top, bottom = self.topology.stack.top, self.topology.stack.bottom
        if direction == "discharge":
            net = self.direction_network(off, "load")
            src, dst = top, bottom
        else:
            net = self.direction_network(off, "charger")
            src, dst = bottom, top
        if src not in net.nets or dst not in net.nets:
            return None
        return net.reachable(src, dst)

    def in_series_with_path(self, refdes: str) -> bool:
        """True when removing ``refdes`` separates the cells from the pack terminals."""
        if self.topology.stack is None:
            return False
        rds = {ch.name: 1e-3 for ch in self.topology.channels}
        net = self.network(rds, cell_emf=0.0, cell_r=1.0, temp=25.0, load=None, cells=False,
                           exclude=frozenset({refdes}), max_ohms=SIGNAL_OHMS)
        pos, neg = self.topology.terminals
        for a, b in ((self.topology.stack.top, pos), (self.topology.stack.bottom, neg)):
            if a == b:
                continue
            if a not in net.nets or b not in net.nets or net.reachable(a, b) is None:
                return True
        return False


#: Cell stacks' networks by their cells' names and nets and the cells' EMF and resistance, kept
#: between lints: building and checking a large pack's 320 cells was about a sixth of its warm
#: re-lint's model [measured: cProfile, bench/run.py's large pack, issue 19]. A network is only
#: ever copied from, never changed, so a kept one is the very network the loop would build.
_STACKS: dict[tuple, Network] = {}
STACKS_MAX = 16


def cell_stack(cells, cell_emf: float, cell_r: float) -> Network:
    """Every cell of ``cells`` as a source of ``cell_emf`` behind ``cell_r``, in order."""
    key = (tuple((c.refdes, c.pins["pos"], c.pins["neg"]) for c in cells),
           memo_key(cell_emf), memo_key(cell_r))
    base = _STACKS.get(key)
    if base is None:
        base = Network()
        for c in cells:
            base.add_source(c.refdes, c.pins["pos"], c.pins["neg"], cell_emf, cell_r)
        if len(_STACKS) >= STACKS_MAX:
            del _STACKS[next(iter(_STACKS))]
        _STACKS[key] = base
    return base


#: On-resistances by everything :func:`rdson.rds_on` reads, (ohms, assumptions), oldest first.
#: ``PowerPath._memo`` lives as long as one design's model, yet a batch's designs and an
#: editor's re-lints of one design ask for the same parts at the same drives and temperatures
#: again: nine misses of the model's memo in ten are answered here [measured: bench/run.py's
#: corpus, issue 19]. ``rds_on`` is a pure function of its arguments and its result is
#: immutable, so a kept one is the very value a new computation would give.
_RDS_KEPT: dict[tuple, tuple[float, tuple[str, ...]]] = {}
#: Bound on the on-resistances kept (the oldest goes first): a few hundred bytes each.
RDS_KEPT_MAX = 4096


def kept_rds_on(points: tuple, vgs: float, tj: float, ratio: float, at: float, corner: str,
                vth: float | None) -> tuple[float, tuple[str, ...]]:
    """(ohms, assumptions) of :func:`rdson.rds_on`, remembered by value across models.

    A zero anywhere is computed afresh: -0.0 equals 0.0 as a key, yet may print apart."""
    key = (points, vgs, tj, ratio, at, corner, vth)
    if 0.0 in (vgs, tj, ratio, at, vth) or any(0.0 in row for row in points):
        res = rds_on(points, vgs, tj, ratio, at, corner, vth)
        return res.value, res.assumptions
    hit = _RDS_KEPT.get(key)
    if hit is None:
        res = rds_on(points, vgs, tj, ratio, at, corner, vth)
        if len(_RDS_KEPT) >= RDS_KEPT_MAX:
            _RDS_KEPT.pop(next(iter(_RDS_KEPT)), None)
        hit = _RDS_KEPT[key] = (res.value, res.assumptions)
    return hit


#: The largest network :meth:`PowerPath.network` keeps to copy: a large pack's networks are
#: hundreds of branches each, few repeat, and they would hold megabytes.
NETWORK_KEPT_BRANCHES = 128

#: The memos of :class:`PowerPath` by the netlist they were computed from, kept between models.
#: Everything a path computes is a function of its topology, and the topology one of the
#: netlist's components, nets and terminals; a model of an equal netlist reads the same memo:
#: a batch's designs that differ only in their loads, and an editor's re-lints of a design whose
#: edit left the netlist as it was (a load, a rule option, a comment), pay for each operating
#: point once. Keyed by a netlist's terminals and its components' names and kinds; held with
#: the components and nets to compare whole (:func:`_same_netlist`).
_MEMOS: dict[tuple, tuple[tuple, dict, dict]] = {}
#: Netlists whose memos are kept (the oldest goes first), and the entries a memo may gather
#: before a model starts a fresh one: a few hundred per lint, a large pack's operating points
#: hold a solution of its whole network each.
MEMOS_MAX = 8
MEMO_ENTRIES_MAX = 2048


def kept_memo(netlist: Any) -> dict:
    """The memo of earlier paths of a netlist equal to ``netlist``, or a new one kept for the
    next; a new unkept one without a netlist."""
    if netlist is None:
        return {}
    components = tuple(netlist.components.values())
    # Each pin as its (component, pin) pair: compared whole at every lint of a large pack,
    # plain tuples compare without a call per pin.
    nets = {net: tuple([(r.component, r.pin) for r in refs]) for net, refs in netlist.nets.items()}
    key = (netlist.terminals, tuple((c.refdes, c.kind) for c in components))
    kept = _MEMOS.get(key)
    if (kept is not None and len(kept[2]) < MEMO_ENTRIES_MAX
            and _same_netlist(kept[0], components) and kept[1] == nets):
        memo = kept[2]
    else:
        memo = {}
    # Held with this netlist's own components, so that the next lint in the same session
    # finds its parts the very same objects and need not compare them whole.
    _MEMOS.pop(key, None)
    if len(_MEMOS) >= MEMOS_MAX:
        _MEMOS.pop(next(iter(_MEMOS)), None)
    _MEMOS[key] = (components, nets, memo)
    return memo


def _same_netlist(kept: tuple, components: tuple) -> bool:
    """Whether two netlists' components are the same in every field, parts included. A part
    read from the same library is the same object; one given inline in the design is compared
    by value and by its text, since -0.0 equals 0.0 yet prints apart."""
    if len(kept) != len(components):
        return False
    names: dict[type, tuple[str, ...]] = {}
    for old, new in zip(kept, components):
        if old is new:
            continue
        held = names.get(type(new))
        if held is None:
            held = names[type(new)] = tuple([f.name for f in fields(new)])
        for name in held:
            a, b = getattr(old, name), getattr(new, name)
            if a is b or (type(a) is str and type(b) is str and a == b):
                continue  # equal texts print alike
            if not (a == b and repr(a) == repr(b)):
                return False
    return True
