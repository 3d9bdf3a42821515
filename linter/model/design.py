"""The design's model: every figure computed once per design and cached; rules read them.

Built from the netlist only: which FET is the charge and which the discharge switch follows from the
protector pin that drives its gate, the cell stack from the cells' pins, the sense resistance from a
nodal solve of the power path. Corners are explicit, so a finding can say at which one it was found.
"""

from __future__ import annotations

import heapq
import math
from functools import cached_property
from typing import Any

from ..netlist import Component, Netlist
from ..guards import DesignMistake
from ..schema import Design, Toleranced
from . import copper, thermal
from .cells import cell_window
from .network import Network, NetworkError, Switch
from .rdson import rds_on
from ..records import record

# A load placed across the pack terminals to excite the path in a solve; the network is linear
# with every switch on, so any value gives the same ratios [derived].
_PROBE_LOAD = 1.0
# Parts in the path with no resistance given are modelled this small: they neither add to the
# sense resistance nor limit a short circuit, which errs on the side of higher currents.
_IDEAL = 1e-6
# Upper-limit charging voltage when a data sheet gives none: the charge voltage plus 50 mV
# [practice: cell data sheets give 4.20 V +0.03..0.05 V; IEC 62133-2 summaries 4.25 V for 4.2 V
# cells].
_UPPER_LIMIT_MARGIN = 0.05
# Resistors above this carry signals (supply filters, sense-pin resistors, dividers), not the
# pack's current: they are no bypass of a fuse and no path for a load [practice].
_SIGNAL_OHMS = 1.0
_THERMAL_ITERATIONS = 200
_THERMAL_TOLERANCE = 0.01  # kelvin


@record(frozen=True)
class Span:
    """A worst-case range: lowest, typical and highest value of one quantity."""

    low: float
    typ: float
    high: float

    @classmethod
    def of(cls, t: Toleranced) -> "Span":
        return cls(t.low, t.nominal, t.high)

    def scaled(self, k: float) -> "Span":
        return Span(self.low * k, self.typ * k, self.high * k)


@record(frozen=True)
class CellLimits:
    """Per-cell voltage window, data sheet first, chemistry defaults where it is silent."""

    chemistry: str
    charge: float
    upper_limit: float
    overcharge_limit: float
    nominal: float
    cutoff: float
    lower_limit: float
    assumptions: tuple[str, ...] = ()


@record(frozen=True)
class CellStack:
    cells: tuple[Component, ...]
    series: int
    parallel: int
    bottom: str  # net of the stack's negative end (B-)
    top: str  # net of the stack's positive end (B+)
    problems: tuple[str, ...] = ()

    @property
    def part(self) -> Any:
        return self.cells[0].part


@record(frozen=True)
class SwitchChannel:
    """One FET channel in the power path."""

    name: str  # branch name: "Q1" for a discrete FET, "Q1.1"/"Q1.2" for a pair's channels
    package: str  # refdes of the package (the thermal unit)
    role: str | None  # "discharge", "charge", or None when no protector output drives the gate
    drain: str
    source: str
    gate: str | None
    channel: str  # "n" | "p"
    part: Any
    gate_pin: str  # the pin name of the gate, for messages ("g1", "g")
    path: tuple  # YAML path of the component

    @property
    def vgs_th_max(self) -> float:
        """Largest gate threshold magnitude: p-channel sheets print V_GS(th) negative."""
        t = self.part.vgs_th
        return max(abs(v) for v in (t.min, t.typ, t.max) if v is not None)


@record(frozen=True)
class OperatingPoint:
    """The path carrying ``current`` with every switch on, at a thermal steady state."""

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


@record(frozen=True)
class TripWindow:
    """Currents at which a detection trips, over every tolerance and corner."""

    detect: Span
    low: OperatingPoint  # the corner with the highest sense resistance
    high: OperatingPoint  # the corner with the lowest sense resistance
    typ: OperatingPoint

    @property
    def min(self) -> float:
        return self.detect.low / self.low.sense_resistance

    @property
    def max(self) -> float:
        return self.detect.high / self.high.sense_resistance

    @property
    def typical(self) -> float:
        return self.detect.typ / self.typ.sense_resistance


@record
class ModelProblem:
    """Why a figure could not be computed; rules report it rather than guessing."""

    what: str
    message: str
    path: tuple = ()


class DesignModel:
    def __init__(self, design: Design, netlist: Netlist):
        self.design = design
        self.netlist = netlist
        self.problems: list[ModelProblem] = []
        # Memos of pure functions of their arguments: the thermal fixed points and the corners
        # ask for the same on-resistances, part resistances, branches and operating points many
        # times over, and a large pack's path is rebuilt for every solve.
        self._memo: dict = {}

    # --- what is in the design -----------------------------------------------------------------

    @cached_property
    def terminals(self) -> tuple[str, str]:
        return self.netlist.terminals

    @cached_property
    def ambient(self) -> Span:
        a = self.design.pack.ambient
        return Span(a.min, 25.0 if a.min <= 25.0 <= a.max else (a.min + a.max) / 2, a.max)

    @cached_property
    def protector(self) -> Component | None:
        found = self.netlist.of_kind("protector")
        return found[0] if found else None

    @cached_property
    def stack(self) -> CellStack | None:
        cells = tuple(c for c in self.netlist.of_kind("cell") if "pos" in c.pins and "neg" in c.pins)
        if not cells:
            return None
        pos_nets = {c.pins["pos"] for c in cells}
        neg_nets = {c.pins["neg"] for c in cells}
        bottoms = sorted(neg_nets - pos_nets)
        problems: list[str] = []
        if len(bottoms) != 1:
            problems.append(f"the cells do not form one stack (bottom nets: {', '.join(bottoms) or 'none'})")
            bottom = bottoms[0] if bottoms else cells[0].pins["neg"]
        else:
            bottom = bottoms[0]
        level, loop = _stack_levels(cells, bottom, stop_at_loop=True)
        if loop is not None:
            problems.append(f"{loop.refdes} closes a loop in the cell stack")
        series = max(level.values()) if level else 1
        top = max(level, key=lambda n: (level[n], n))
        per_level: dict[int, int] = {}
        for c in cells:
            per_level[level.get(c.pins["pos"], 0)] = per_level.get(level.get(c.pins["pos"], 0), 0) + 1
        counts = set(per_level.values())
        if len(counts) > 1:
            problems.append("the parallel groups of the stack hold different numbers of cells")
        parallel = min(counts) if counts else 1
        parts = {c.part_name or c.refdes for c in cells}
        if len({id(c.part) for c in cells}) > 1 and len(parts) > 1:
            problems.append("the stack mixes different cell parts; the first one is used")
        return CellStack(cells, max(series, 1), parallel, bottom, top, tuple(problems))

    @cached_property
    def cell_limits(self) -> CellLimits | None:
        if self.stack is None:
            return None
        cell = self.stack.part
        v = cell.voltage
        chem = cell.chemistry.value
        window = cell_window(chem)
        notes = []
        upper = v.upper_limit
        if upper is None:
            upper = v.charge + _UPPER_LIMIT_MARGIN
            notes.append(f"cell upper_limit not given: assumed charge + 50 mV = {upper:.3f} V "
                         f"[practice]")
        over = v.overcharge_limit
        if over is None:
            over = window.overcharge_limit
            notes.append(f"cell overcharge_limit not given: {chem} default {over:.2f} V "
                         f"({window.source('overcharge_limit')})")
        lower = v.lower_limit
        if lower is None:
            lower = window.lower_limit
            notes.append(f"cell lower_limit not given: {chem} default {lower:.2f} V "
                         f"({window.source('lower_limit')})")
        return CellLimits(chem, v.charge, upper, over, v.nominal, v.cutoff, lower, tuple(notes))

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
        """Gate-source drive of the switches when on."""
        p = self.protector
        if p is None:
            return None
        drive = p.part.gate_drive
        if drive != "cell":
            return Span(float(drive), float(drive), float(drive))
        cv = self.cell_voltage
        if cv is None or self.stack is None:
            return None
        return cv.scaled(self.stack.series) if p.part.cells > 1 else cv

    # --- switches ------------------------------------------------------------------------------

    @cached_property
    def gate_nets(self) -> dict[str, str]:
        """Net -> role for nets driven by the protector's gate outputs (directly or via a resistor)."""
        p = self.protector
        if p is None:
            return {}
        out: dict[str, str] = {}
        for pin, role in (("discharge_gate", "discharge"), ("charge_gate", "charge")):
            net = p.pins.get(pin)
            if net is None:
                continue
            out[net] = role
            # a series gate resistor: its far end, when that net holds only gates
            for r in self._resistors_at.get(net, ()):
                a, b = r.pins.get("1"), r.pins.get("2")
                far = b if a == net else a if b == net else None
                if far and far not in out and all(
                        self.netlist.components[ref.component].kind in ("fet", "fet_pair_common_drain")
                        and ref.pin.startswith("g") or ref.component == r.refdes
                        for ref in self.netlist.nets.get(far, [])):
                    out[far] = role
        return out

    @cached_property
    def _resistors_at(self) -> dict[str, list[Component]]:
        """Net -> the resistors with a pin on it, in design order: a protector pin's filter or
        gate resistor is looked up here, not in a pass over every resistor per pin."""
        out: dict[str, list[Component]] = {}
        for r in self.netlist.of_kind("resistor"):
            for net in dict.fromkeys((r.pins.get("1"), r.pins.get("2"))):
                if net is not None:
                    out.setdefault(net, []).append(r)
        return out

    @cached_property
    def channels(self) -> tuple[SwitchChannel, ...]:
        out = []
        roles = self.gate_nets
        for c in self.netlist.of_kind("fet", "fet_pair_common_drain"):
            part = c.part
            if c.kind == "fet":
                if not {"d", "s"} <= set(c.pins):
                    continue
                g = c.pins.get("g")
                out.append(SwitchChannel(c.refdes, c.refdes, roles.get(g), c.pins["d"], c.pins["s"],
                                         g, part.channel.value, part, "g", c.path))
            else:
                drain = c.pins.get("d") or f"{c.refdes}.d"
                for i in ("1", "2"):
                    s, g = c.pins.get(f"s{i}"), c.pins.get(f"g{i}")
                    if s is None:
                        continue
                    out.append(SwitchChannel(f"{c.refdes}.{i}", c.refdes, roles.get(g), drain, s,
                                             g, part.channel.value, part, f"g{i}", c.path))
        return tuple(out)

    def channels_of(self, role: str) -> list[SwitchChannel]:
        return [ch for ch in self.channels if ch.role == role]

    # --- series stacks: levels, rail side, gate-drive reach, cell taps, what the sense sees ---

    @cached_property
    def stack_levels(self) -> dict[str, int]:
        """Net -> level in the stack: 0 at its bottom, ``series`` at its top."""
        if self.stack is None:
            return {}
        return _stack_levels(self.stack.cells, self.stack.bottom, stop_at_loop=False)[0]

    @cached_property
    def high_side(self) -> dict[str, bool]:
        """Channel name -> True when the channel switches the positive rail.

        Read off a solve of the path under load: a channel whose source sits above half the stack
        voltage is on the positive side [derived], whatever the drawing calls it.
        """
        if self.stack is None or not self.channels:
            return {}
        emf = self.cell_limits.nominal if self.cell_limits else 3.6
        net = self.network({ch.name: 1e-3 for ch in self.channels}, cell_emf=emf, cell_r=0.01,
                           temp=25.0, max_ohms=_SIGNAL_OHMS)
        try:
            sol = net.solve(ground=self.stack.bottom)
        except NetworkError:
            return {}
        top = sol.voltages.get(self.stack.top)
        out = {}
        for ch in self.channels:
            v = sol.voltages.get(ch.source)
            if v is not None and top:
                out[ch.name] = v > top / 2
        return out

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
    def cell_taps(self) -> tuple[tuple[str, str | None, int | None, int], ...]:
        """Each cell pin of a multi-cell protector: (pin, net, level it reaches, level it should).

        ``cellK`` senses the top of the K-th cell from the bottom (level K). A pin reaches its tap
        directly or through one series resistor (an input filter); level None when it reaches no
        net of the stack.
        """
        p, levels = self.protector, self.stack_levels
        if p is None or p.part.cells < 2 or not levels:
            return ()
        out = []
        for k in range(1, p.part.cells + 1):
            pin = f"cell{k}"
            net = p.pins.get(pin)
            if net is None:
                continue
            reached = levels.get(net)
            if reached is None:
                for r in self._resistors_at.get(net, ()):
                    a, b = r.pins.get("1"), r.pins.get("2")
                    far = b if a == net else a if b == net else None
                    if far in levels:
                        reached = levels[far]
                        break
            out.append((pin, net, reached, k))
        return tuple(out)

    @cached_property
    def sense_elements(self) -> tuple[str, ...]:
        """Parts of the power path whose resistance the protector's sense input sees.

        Asked of the solver, not read off the drawing: each element's resistance is doubled in
        turn, and it counts when the transresistance from load current to sense voltage moves
        [derived: in a linear network only an element carrying the load current between the
        sense pins changes that transresistance]. FET channels are named by package.
        """
        p, gd = self.protector, self.gate_drive
        if p is None or self.stack is None or gd is None or not self.channels:
            return ()
        g, s = p.pins.get("ground"), p.pins.get("sense")
        if not g or not s:
            return ()
        rds = {ch.name: self.channel_rds(ch, gd.typ, 25.0, "typ")[0] for ch in self.channels}
        cell_r = self.stack.part.internal_resistance.nominal
        emf = self.cell_limits.nominal if self.cell_limits else 3.6

        def sense(net: Network) -> float | None:
            try:
                sol = net.solve(ground=self.stack.bottom)
            except NetworkError:
                return None
            i = abs(sol.current("(load)"))
            v = sol.voltage_between(s, g) if s in sol.voltages and g in sol.voltages else None
            return abs(v) / i if v is not None and i > 0 else None

        base = sense(self.network(rds, cell_emf=emf, cell_r=cell_r, temp=25.0))
        if not base:
            return ()
        found: list[str] = []
        for ch in self.channels:
            doubled = dict(rds, **{ch.name: 2 * rds[ch.name]})
            r = sense(self.network(doubled, cell_emf=emf, cell_r=cell_r, temp=25.0))
            if r is not None and abs(r - base) > 1e-6 * base and ch.package not in found:
                found.append(ch.package)
        for c in self._series_parts():
            a, b = c.pins.get("1"), c.pins.get("2")
            if not a or not b or a == b:
                continue
            value = self.part_resistance(c, 25.0, "typ")
            if value > _SIGNAL_OHMS:
                continue
            net = self.network(rds, cell_emf=emf, cell_r=cell_r, temp=25.0,
                               exclude=frozenset({c.refdes}))
            net.add_resistor(c.refdes, a, b, 2 * value)
            r = sense(net)
            if r is not None and abs(r - base) > 1e-6 * base:
                found.append(c.refdes)
        return tuple(found)

    @cached_property
    def sense_by_shunt(self) -> bool:
        """True when the sense input sees resistors only, no switch channel (shunt sensing)."""
        packages = {ch.package for ch in self.channels}
        found = self.sense_elements
        return bool(found) and not any(e in packages for e in found)

    # --- shelf life and support network (computed in storage.py and support.py) --------------

    @cached_property
    def storage_budget(self):
        """Months in storage to the cut-off and on to the cell's lower limit (storage.StorageBudget)."""
        from .storage import storage_budget
        return storage_budget(self)

    @cached_property
    def supply_filter(self):
        from .support import supply_filter
        return supply_filter(self)

    @cached_property
    def sense_resistor(self):
        from .support import sense_resistor
        return sense_resistor(self)

    @cached_property
    def support_scenarios(self) -> list:
        """(case, solution) of the stress cases capacitors and resistors are checked in."""
        from .support import scenarios
        return scenarios(self)

    @cached_property
    def capacitor_stress(self) -> tuple:
        from .support import capacitor_stress
        return capacitor_stress(self)

    @cached_property
    def resistor_stress(self) -> tuple:
        from .support import resistor_stress
        return resistor_stress(self)

    # --- the power path ------------------------------------------------------------------------

    @cached_property
    def _path_parts(self) -> tuple[Component, ...]:
        return tuple(self.netlist.of_kind("fuse", "ptc", "resistor", "trace", "wire"))

    def _series_parts(self) -> list[Component]:
        return list(self._path_parts)

    def part_resistance(self, c: Component, temp: float, corner: str) -> float:
        """Resistance of a non-switch part in the path at ``temp`` for a corner (low/typ/high)."""
        key = ("part", c.refdes, _key(temp), corner)
        value = self._memo.get(key)
        if value is None:
            value = self._memo[key] = self._part_resistance(c, temp, corner)
        return value

    def _part_resistance(self, c: Component, temp: float, corner: str) -> float:
        part = c.part
        if c.kind == "resistor":
            k = {"low": 1 - part.tol / 100, "typ": 1.0, "high": 1 + part.tol / 100}[corner]
            return max(part.value * k, _IDEAL)
        if c.kind == "fuse":
            return part.resistance if part.resistance else _IDEAL
        if c.kind == "ptc":
            return {"low": part.resistance.low, "typ": part.resistance.nominal,
                    "high": part.resistance.high}[corner]
        if c.kind == "trace":
            thick = part.thickness if part.thickness is not None else copper.oz_to_thickness(part.copper_weight)
            return copper.trace_resistance(part.width, thick, part.length, temp)
        if c.kind == "wire":
            return part.resistance if part.resistance else _IDEAL
        raise ValueError(c.kind)  # pragma: no cover

    def network(self, rds: dict[str, float], *, cell_emf: float, cell_r: float, temp: float,
                corner: str = "typ", switches_on: dict[str, bool] | None = None,
                load: float | None = _PROBE_LOAD, cells: bool = True,
                exclude: frozenset[str] = frozenset(), max_ohms: float = math.inf) -> Network:
        """The power path: cells, switch channels, series parts, and an optional load.

        ``exclude`` leaves parts out (to ask what happens without a fuse); ``max_ohms`` leaves out
        resistors above it, which carry signals, not the pack's current.

        Branches are immutable, so each one is built and checked once per value and reused: the
        cells of a large pack are the same in nearly every solve, and only the switch channels
        change from one thermal iteration to the next. The network is the one the ``add_*``
        calls in this order would build.
        """
        memo = self._memo
        if self.stack is not None and cells:
            key = ("cells", _key(cell_emf), _key(cell_r))
            base = memo.get(key)
            if base is None:
                base = Network()
                for c in self.stack.cells:
                    base.add_source(c.refdes, c.pins["pos"], c.pins["neg"], cell_emf, cell_r)
                memo[key] = base
            net = base.copy()
        else:
            net = Network()
        for ch in self.channels:
            on = True if switches_on is None else switches_on.get(ch.name, True)
            net.add(self._switch(ch, rds.get(ch.name, 1.0), on))
        for c in self._path_parts:
            a, b = c.pins.get("1"), c.pins.get("2")
            if a and b and a != b and c.refdes not in exclude:
                r = self.part_resistance(c, temp, corner)
                if r <= max_ohms:
                    net.add(self._resistor(c.refdes, a, b, r))
        if load is not None:
            pos, neg = self.terminals
            if pos != neg:
                net.add(self._resistor("(load)", pos, neg, load))
        return net

    def _resistor(self, name: str, a: str, b: str, ohms: float):
        key = ("resistor", name, a, b, _key(ohms))
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
        part = ch.part
        hot = part.rds_on_hot_ratio
        key = ("rds", id(part), _key(vgs), _key(tj), corner)
        hit = self._memo.get(key)
        if hit is None:
            ratio, at = (hot.ratio, hot.at) if hot else (1.5, 125.0)
            # p-channel data sheets print V_GS negative; the drive is a magnitude either way.
            points = [(abs(p.vgs), p.typ, p.max) for p in part.rds_on]
            try:
                res = rds_on(points, vgs, tj, ratio, at, corner)
                hit = (res.value, res.assumptions, None)
            except ValueError as exc:
                # One table row and a gate drive below it: no slope to extrapolate. Use the row,
                # and say loudly that this understates the resistance, rather than stop the review.
                row = min(points)
                res = rds_on([row], row[0], tj, ratio, at, corner)
                hit = (res.value, res.assumptions, (exc, row))
            self._memo[key] = hit
        value, notes, failed = hit
        if failed is not None:
            exc, row = failed
            return value, notes + (
                f"{ch.package}: {exc}; the {row[0]:g} V row is used and understates R_DS(on) — "
                f"add a second rds_on row",)
        if hot is None:
            notes = notes + (f"{ch.package}: no rds_on_hot_ratio given; assumed 1.5 at 125 °C "
                             f"[practice: 1.4-1.6 for 20 V parts]",)
        return value, notes

    def operating_point(self, current: float, ambient: float, vgs: float, corner: str,
                        self_heating: bool = True) -> OperatingPoint:
        """Steady state of the path carrying ``current``, switches on, at ``corner`` (typ|max|min).

        The trip windows and the switch heat ask for the same points (the continuous load at
        the highest ambient and lowest drive, for one); each is computed once.
        """
        key = ("op", _key(current), _key(ambient), _key(vgs), corner, self_heating)
        hit = self._memo.get(key)
        if hit is None:
            before = len(self.problems)
            op = self._operating_point(current, ambient, vgs, corner, self_heating)
            hit = self._memo[key] = (op, self.problems[before:])
        else:
            self.problems.extend(hit[1])  # as a fresh computation would have recorded them
        return hit[0]

    def _operating_point(self, current: float, ambient: float, vgs: float, corner: str,
                         self_heating: bool) -> OperatingPoint:
        packages = {ch.package: ch.part for ch in self.channels}
        tj = {p: ambient for p in packages}
        rcorner = {"max": "high", "min": "low", "typ": "typ"}[corner]
        cell = self.stack.part if self.stack else None
        cell_r = {"max": cell.internal_resistance.high, "min": spread_low(cell.internal_resistance),
                  "typ": cell.internal_resistance.nominal}[corner] if cell else _IDEAL
        converged, runaway = True, False
        notes: list[str] = []
        previous: dict[str, tuple[float, float]] = {}
        for _ in range(_THERMAL_ITERATIONS):
            rds, notes, seen = {}, [], set()
            for ch in self.channels:
                rds[ch.name], n = self.channel_rds(ch, vgs, tj[ch.package], corner)
                for x in n:
                    if x not in seen:
                        seen.add(x)
                        notes.append(x)
            sol, sense, path_r = self._solve(rds, ambient, rcorner, cell_r)
            i_load = abs(sol.current("(load)")) if sol is not None else 0.0
            share = {ch.name: abs(sol.current(ch.name)) / i_load if sol and i_load else 0.0
                     for ch in self.channels}
            ich = {name: f * current for name, f in share.items()}
            power = {p: 0.0 for p in packages}
            for ch in self.channels:
                power[ch.package] += ich[ch.name] ** 2 * rds[ch.name]
            if not self_heating:
                break
            new = {p: ambient + power[p] * packages[p].theta_ja for p in packages}
            if any(new[p] > packages[p].tj_max for p in packages):
                tj, converged, runaway = new, False, True
                break
            delta = max((abs(new[p] - tj[p]) for p in packages), default=0.0)
            if delta < _THERMAL_TOLERANCE:
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
        return OperatingPoint(current, ambient, vgs, corner, rds, ich, share, tj, power, sense, path_r,
                              converged, runaway, tuple(notes))

    def _solve(self, rds, temp, rcorner, cell_r):
        """One nodal solve: (solution, sense resistance, stack-to-terminal path resistance)."""
        if self.stack is None:
            return None, math.inf, math.inf
        emf = self.cell_limits.nominal if self.cell_limits else 3.6
        net = self.network(rds, cell_emf=emf, cell_r=cell_r, temp=temp, corner=rcorner)
        try:
            sol = net.solve(ground=self.stack.bottom)
        except NetworkError as exc:
            self.problems.append(ModelProblem("network", str(exc)))
            return None, math.inf, math.inf
        i_load = abs(sol.current("(load)"))
        sense = math.inf
        p = self.protector
        if p is not None and i_load > 0:
            g, s = p.pins.get("ground"), p.pins.get("sense")
            if g and s and g in sol.voltages and s in sol.voltages:
                v = sol.voltage_between(s, g)
                if v is not None:
                    sense = abs(v) / i_load
        pos, neg = self.terminals
        path = math.inf
        if i_load > 0:
            vt = sol.voltage_between(pos, neg)
            vs = sol.voltage_between(self.stack.top, self.stack.bottom)
            if vt is not None and vs is not None:
                path = abs(vs - vt) / i_load
        return sol, sense, path

    # --- trip windows --------------------------------------------------------------------------

    def _window(self, detect: Toleranced) -> TripWindow | None:
        gd, cont = self.gate_drive, self.design.load.continuous
        if gd is None or not self.channels:
            return None
        a = self.ambient
        low = self.operating_point(cont, a.high, gd.low, "max", self_heating=True)
        high = self.operating_point(0.0, a.low, gd.high, "min", self_heating=False)
        typ = self.operating_point(0.0, 25.0, gd.typ, "typ", self_heating=False)
        if not min(low.sense_resistance, high.sense_resistance, typ.sense_resistance) > 0.0:
            p = self.protector
            raise DesignMistake(p.path + ("pins", "sense"), (
                f"{p.refdes}: the load current sets up no voltage between its sense and ground "
                f"pins, so no current trips its detection; put the switches or a shunt between "
                f"them, in the path of the load current"))
        return TripWindow(Span.of(detect), low, high, typ)

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
    def prospective_short_circuit(self) -> float | None:
        """Highest current a hard short across the pack terminals can draw, amperes.

        Highest cell voltage over the lowest cell and path resistance, switches fully on.
        """
        if self.stack is None or self.cell_voltage is None or self.gate_drive is None:
            return None
        cell = self.stack.part
        rds = {ch.name: self.channel_rds(ch, self.gate_drive.high, self.ambient.low, "min")[0]
               for ch in self.channels}
        net = self.network(rds, cell_emf=self.cell_voltage.high, cell_r=spread_low(cell.internal_resistance),
                           temp=self.ambient.low, corner="low", load=_IDEAL)
        try:
            sol = net.solve(ground=self.stack.bottom)
        except NetworkError as exc:
            self.problems.append(ModelProblem("network", str(exc)))
            return None
        return abs(sol.current("(load)"))

    # --- blocking and direction ---------------------------------------------------------------

    @cached_property
    def stack_voltage(self) -> Span | None:
        """Whole-stack voltage in service (per-cell protector window times the series count)."""
        if self.cell_voltage is None or self.stack is None:
            return None
        return self.cell_voltage.scaled(self.stack.series)

    def blocking_voltage(self, role: str) -> list[tuple[str, float]]:
        """Cases a switch of ``role`` must block when off: (what, volts), highest first."""
        sv, ch = self.stack_voltage, self.design.charger
        cases: list[tuple[str, float]] = []
        if sv is None:
            return cases
        if role == "discharge":
            cases.append(("discharge switch off under load: the stack voltage", sv.high))
            if ch is not None and ch.reverse_polarity.value == "possible":
                cases.append(("charger connected reversed: its open-circuit voltage plus the "
                              "stack voltage", ch.open_circuit_max + sv.high))
        elif role == "charge" and ch is not None:
            cases.append(("charge switch off with the charger connected: its open-circuit "
                          "voltage minus the lowest stack voltage", ch.open_circuit_max - sv.low))
        return sorted(cases, key=lambda c: -c[1])

    def direction_network(self, off: str, external: str) -> Network:
        """The path without cells, ``off``-role switches off, and a one-way external element.

        ``external`` is "load" (current leaves the pack at the positive terminal and returns at
        the negative one) or "charger" (current enters at the positive terminal).
        """
        rds = {ch.name: 1e-3 for ch in self.channels}
        states = {ch.name: ch.role != off for ch in self.channels}
        net = self.network(rds, cell_emf=0.0, cell_r=1.0, temp=25.0, switches_on=states,
                           load=None, cells=False, max_ohms=_SIGNAL_OHMS)
        pos, neg = self.terminals
        if external == "load":
            net.add_diode("(load)", pos, neg)
        else:
            net.add_diode("(charger)", neg, pos)
        return net

    def conducts(self, off: str, direction: str):
        """With ``off`` switches off, a path for ``direction`` current ("discharge"/"charge")."""
        if self.stack is None:
            return None
        top, bottom = self.stack.top, self.stack.bottom
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
        if self.stack is None:
            return False
        rds = {ch.name: 1e-3 for ch in self.channels}
        net = self.network(rds, cell_emf=0.0, cell_r=1.0, temp=25.0, load=None, cells=False,
                           exclude=frozenset({refdes}), max_ohms=_SIGNAL_OHMS)
        pos, neg = self.terminals
        for a, b in ((self.stack.top, pos), (self.stack.bottom, neg)):
            if a == b:
                continue
            if a not in net.nets or b not in net.nets or net.reachable(a, b) is None:
                return True
        return False

    # --- stress: heat, short-circuit pulses, copper (computed in stress.py) --------------------

    @cached_property
    def short_circuit_solution(self) -> tuple[Any, dict]:
        """(solution, channel on-resistances) of the hard short of :attr:`prospective_short_circuit`.

        The same corner, built the same way, so both give one current (a test holds them
        together); kept apart so the per-channel currents are there for stress figures.
        """
        if self.stack is None or self.cell_voltage is None or self.gate_drive is None:
            return None, {}
        rds = {ch.name: self.channel_rds(ch, self.gate_drive.high, self.ambient.low, "min")[0]
               for ch in self.channels}
        net = self.network(rds, cell_emf=self.cell_voltage.high,
                           cell_r=spread_low(self.stack.part.internal_resistance),
                           temp=self.ambient.low, corner="low", load=_IDEAL)
        try:
            return net.solve(ground=self.stack.bottom), rds
        except NetworkError:
            return None, rds  # prospective_short_circuit records the problem

    @cached_property
    def switch_heat(self) -> tuple:
        """Junction temperature of every switch package per case (stress.HeatCase)."""
        from .stress import switch_heat
        return switch_heat(self)

    @cached_property
    def short_circuit_pulse(self):
        """The hard short until the protection ends it (stress.ShortCircuitPulse), or None."""
        from .stress import short_circuit_pulse
        return short_circuit_pulse(self)

    def turn_off_spike(self, ch: SwitchChannel):
        """The voltage a discharge switch sees interrupting a short (stress.TurnOffSpike), or None
        when the design gives no ``pack.wiring_inductance``."""
        from .stress import turn_off_spike
        return turn_off_spike(self, ch)

    @cached_property
    def conductor_loads(self) -> tuple:
        """Highest permitted current of every trace and wire (stress.ConductorLoad)."""
        from .stress import conductor_loads
        return conductor_loads(self)

    # --- reporting -----------------------------------------------------------------------------

    def figures(self) -> dict[str, Any]:
        """The design's key figures, by name, in SI units (reported even when no rule fires)."""
        out: dict[str, Any] = {"component_count": len(self.netlist.components)}
        if self.stack is not None:
            out.update(cells=len(self.stack.cells), series=self.stack.series,
                       parallel=self.stack.parallel)
        t = self.overcurrent_trip
        if t is not None:
            out.update(trip_current_min=_num(t.min), trip_current_typ=_num(t.typical),
                       trip_current_max=_num(t.max),
                       sense_resistance_min=_num(t.high.sense_resistance),
                       sense_resistance_typ=_num(t.typ.sense_resistance),
                       sense_resistance_max=_num(t.low.sense_resistance))
        s = self.short_circuit_trip
        if s is not None:
            out.update(short_circuit_trip_min=_num(s.min), short_circuit_trip_max=_num(s.max))
        psc = self.prospective_short_circuit
        if psc is not None:
            out["prospective_short_circuit"] = _num(psc)
        if self.gate_drive is not None:
            out.update(gate_drive_min=self.gate_drive.low, gate_drive_max=self.gate_drive.high)
        # hottest switch junction under the continuous load at the highest ambient (a team policy
        # bounds it, e.g. 100 °C for a product line); a lower bound when the switch runs away
        continuous = [h.tj for h in self.switch_heat if h.case == "continuous"]
        if continuous:
            out["switch_tj_continuous"] = _num(max(continuous))
        sb = self.storage_budget
        if sb is not None:
            out["storage_months_to_cutoff"] = _num(sb.to_cutoff.months)
            if sb.to_lower_limit is not None:
                out["storage_months_cutoff_to_lower_limit"] = _num(sb.to_lower_limit.months)
        return out


def _stack_levels(cells: tuple[Component, ...], bottom: str,
                  stop_at_loop: bool) -> tuple[dict[str, int], Component | None]:
    """Net -> level, climbing the cells from ``bottom``: a cell's positive net is one level above
    its negative net, the first cell to reach a net setting its level.

    The result is that of sweeping the cells in design order, again and again, until a sweep
    changes nothing; with ``stop_at_loop`` the sweeps stop at the first cell whose two nets
    already hold levels that are not one apart (that cell is returned). Each cell is looked at
    once, when its negative net gets its level, so a long chain listed top-down costs no more
    than one listed bottom-up [derived: a cell can change something only at its first look
    after its negative net is known; later sweeps see the same levels].
    """
    by_neg: dict[str, list[int]] = {}
    for i, c in enumerate(cells):
        by_neg.setdefault(c.pins["neg"], []).append(i)
    level = {bottom: 0}
    now = list(by_neg.get(bottom, ()))  # cells to look at in the current sweep, by position
    sweeps = 0
    while now and (stop_at_loop or sweeps < len(cells)):
        sweeps += 1
        heapq.heapify(now)
        later: list[int] = []
        while now:
            i = heapq.heappop(now)
            c = cells[i]
            n, p = c.pins["neg"], c.pins["pos"]
            if p in level:
                if stop_at_loop and level[p] != level[n] + 1:
                    return level, c
                continue
            level[p] = level[n] + 1
            for j in by_neg.get(p, ()):
                # a cell after this one sees the new level in this sweep, one before it in the next
                if j > i:
                    heapq.heappush(now, j)
                else:
                    later.append(j)
        now = later
    return level, None


def _key(x: float) -> Any:
    """A number as a memo key: 0.0 and -0.0 are equal keys but print apart ("-0 °C")."""
    return (x, math.copysign(1.0, x)) if x == 0.0 else x


def spread_low(t: Toleranced) -> float:
    """Lowest value of a part parameter; with typ and max only, typ - (max - typ).

    Data sheets often give typ and max alone; a symmetric spread is the usual reading [practice].
    Floored at half of typ, where a wide max would make the mirror image meaningless.
    """
    if t.min is not None:
        return t.min
    if t.typ is not None and t.max is not None:
        return max(t.typ - (t.max - t.typ), t.typ / 2)
    return t.low


def _num(x: float) -> float | None:
    """A figure fit for JSON: rounded to 6 significant digits, None when not finite."""
    if x is None or not math.isfinite(x):
        return None
    return float(f"{x:.6g}")
