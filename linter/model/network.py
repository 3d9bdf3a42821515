"""DC model of a pack's main current path: nets are nodes, parts in the path are branches.

Rules need three answers from the same picture of the power path, and getting them from one
solver keeps them consistent with each other:

* the resistance a protector's sense input sees (``Network.equivalent_resistance``), because an
  over-current threshold set in millivolts only means amperes through that resistance;
* where current goes and how it splits (``Network.solve``), because paralleled parts share current
  only as well as their resistances match;
* whether current can get from one net to another at all with some switches off
  (``Network.reachable``), because a protection switch oriented the wrong way is not a switch.

Sign convention, used everywhere: every branch has terminals ``a`` and ``b``, and its current is
positive when it flows from ``a`` to ``b`` *through the branch*. For a source ``a`` is the positive
terminal, so a discharging cell (current leaving by its positive terminal) shows a negative current.
One convention for every kind keeps the current law (KCL) a plain sum over branches.

Units are SI: ohms, volts, amperes.
"""

from __future__ import annotations

import heapq
import math
from collections import deque
from dataclasses import replace
from itertools import islice, repeat
from types import MappingProxyType
from typing import Iterable, Literal, Mapping, Union

from ..records import record

__all__ = [
    "NetworkError", "ConvergenceError",
    "Resistor", "Source", "Diode", "BodyDiode", "Switch", "Branch",
    "Hop", "ConductionPath", "Solution", "Network",
    "DEFAULT_DIODE_R_ON", "DEFAULT_BODY_DIODE_V_FORWARD",
]

#: Default on-resistance of an ideal-ish diode, in ohms. The piecewise-linear model needs a
#: non-zero slope; 0.1 mΩ is a tenth of the smallest parts of a pack path, its 1 mΩ-class shunts
#: [practice], so it barely moves results [derived]. Give the part's own figure where it matters.
DEFAULT_DIODE_R_ON = 1e-4
#: Default knee of a switch's body diode, in volts: a silicon junction conducts from about 0.6 to
#: 0.8 V [practice]. Unlike a free diode it cannot default to 0 V, since a zero knee would let the
#: diode shunt the very channel it sits across and hide the channel's resistance.
DEFAULT_BODY_DIODE_V_FORWARD = 0.7

# An off diode is open in the reported solution, but while states are being settled it keeps this
# fraction of the smallest conductance in the network, so an island reached only through off
# diodes still has a definite voltage to test the diodes against [derived: 1e-12 moves any other
# node by about that fraction, far under the state tolerance below]. The elimination below never
# subtracts conductances, so the extreme ratio costs no accuracy.
_LEAK_FRACTION = 1e-12
# Diode state tolerance, as a fraction of the bound on voltages in the network: a diode within this
# of its knee counts as consistent either way, so rounding cannot make it flip forever [derived:
# about 1e7 times double-precision rounding of a nodal solve].
_STATE_TOLERANCE = 1e-9
# How close to its knee an on diode counts as carrying nothing, as a fraction of the same bound
# [derived: a few hundred times double-precision rounding, far below any current worth reporting].
_KNEE_TOLERANCE = 1e-13
# State sets tried before giving up; each try is one sparse solve. Pack paths hold a handful of
# diodes and settle in two or three [derived: one try per flip plus slack].
_DEFAULT_MAX_ITERATIONS = 200


class NetworkError(ValueError):
    """A network that cannot be built or solved as asked.

    A ``ValueError`` so a caller turning design data into a network can catch bad values and bad
    topology the same way.
    """


class ConvergenceError(NetworkError):
    """Diode states did not settle within the iteration bound."""

    def __init__(self, message: str, unsettled: tuple[str, ...]) -> None:
        super().__init__(message)
        #: Names of the branches whose diode was still changing state, for the message to a user.
        self.unsettled = unsettled


def _check_name(kind: str, value: object) -> str:
    if not isinstance(value, str) or not value:
        raise NetworkError(f"{kind} must be a non-empty string, got {value!r}")
    return value


def _check_positive(what: str, value: float) -> float:
    # Zero or infinite resistance would be a short or an open; both have their own spelling (merge
    # the nets, or leave the branch out / turn the switch off), and allowing them here would make
    # the conductance matrix singular or infinite.
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise NetworkError(f"{what} must be a number, got {value!r}")
    value = float(value)
    if not (value > 0.0 and math.isfinite(value) and math.isfinite(1.0 / value)):
        raise NetworkError(f"{what} must be finite and > 0, got {value!r}")
    return value


def _check_finite(what: str, value: float, *, minimum: float | None = None) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise NetworkError(f"{what} must be a number, got {value!r}")
    value = float(value)
    if not math.isfinite(value) or (minimum is not None and value < minimum):
        bound = "" if minimum is None else f" and >= {minimum}"
        raise NetworkError(f"{what} must be finite{bound}, got {value!r}")
    return value


@record(frozen=True)
class Resistor:
    """A linear part of the path: trace, wire, shunt, fuse, connector, an on channel."""

    name: str
    a: str
    b: str
    ohms: float


@record(frozen=True)
class Source:
    """A cell or a charger: an EMF in series with its internal resistance.

    The internal resistance is required because a real cell always has one, and because it keeps
    every branch a finite conductance, which is what makes the solver's matrix well behaved.
    """

    name: str
    pos: str
    neg: str
    volts: float
    r_internal: float

    @property
    def a(self) -> str:
        return self.pos

    @property
    def b(self) -> str:
        return self.neg


@record(frozen=True)
class Diode:
    """Ideal-ish diode: open below ``v_forward``, ``v_forward`` plus ``r_on`` above it.

    Piecewise linear on purpose: a review needs which way current can go and roughly how much, not
    the junction's exponential, and two straight pieces settle in a few linear solves.
    """

    name: str
    anode: str
    cathode: str
    v_forward: float = 0.0
    r_on: float = DEFAULT_DIODE_R_ON

    @property
    def a(self) -> str:
        return self.anode

    @property
    def b(self) -> str:
        return self.cathode


@record(frozen=True)
class BodyDiode:
    """The diode a switch carries across its channel whether it is on or off."""

    anode: str
    cathode: str
    v_forward: float = DEFAULT_BODY_DIODE_V_FORWARD
    r_on: float = DEFAULT_DIODE_R_ON


@record(frozen=True)
class Switch:
    """A switch channel (one FET, one relay contact), optionally with a body diode across it.

    Off, the channel is open and only the body diode (if any) conducts; on, the channel is
    ``ohms_on`` and the body diode still conducts if the channel drop exceeds its knee.
    """

    name: str
    a: str
    b: str
    ohms_on: float
    on: bool
    body_diode: BodyDiode | None = None


Branch = Union[Resistor, Source, Diode, Switch]

Via = Literal["resistor", "source", "diode", "channel", "body diode"]


@record(frozen=True)
class Hop:
    """One step of a conduction path: through ``branch`` from ``from_net`` to ``to_net``.

    ``via`` says which part of the branch conducts, so a message can say "through the body diode
    of Q2" rather than just "through Q2".
    """

    branch: str
    from_net: str
    to_net: str
    via: Via


@record(frozen=True)
class ConductionPath:
    """A way current can get from ``src`` to ``dst``; empty ``hops`` when they are the same net."""

    src: str
    dst: str
    hops: tuple[Hop, ...]

    @property
    def branches(self) -> tuple[str, ...]:
        """Branch names in path order, for naming the part at fault."""
        return tuple(h.branch for h in self.hops)

    @property
    def nets(self) -> tuple[str, ...]:
        """Nets visited in order, ``src`` first and ``dst`` last."""
        return (self.src,) + tuple(h.to_net for h in self.hops)


@record(frozen=True)
class Solution:
    """Operating point of a network.

    ``voltages`` maps every net to its voltage against ``ground``, or to ``None`` for a net with no
    conducting path to ground (its potential is not set by the network, so any number would be
    invented). ``currents`` maps every branch to its current, ``a`` to ``b`` through the branch;
    currents are given even inside floating islands, where they are still fully determined.
    ``conducting_diodes`` names the diodes, and the switches whose body diode, that conduct.
    """

    ground: str
    voltages: Mapping[str, float | None]
    currents: Mapping[str, float]
    conducting_diodes: frozenset[str]
    iterations: int

    @property
    def floating(self) -> frozenset[str]:
        """Nets with no conducting path to ground."""
        return frozenset(n for n, v in self.voltages.items() if v is None)

    def voltage(self, net: str) -> float | None:
        """Voltage of ``net`` against ground, ``None`` when floating."""
        try:
            return self.voltages[net]
        except KeyError:
            raise NetworkError(f"unknown net {net!r}") from None

    def voltage_between(self, a: str, b: str) -> float | None:
        """``V(a) - V(b)``, or ``None`` when either is floating."""
        va, vb = self.voltage(a), self.voltage(b)
        if va is None or vb is None:
            return None
        return va - vb

    def current(self, branch: str) -> float:
        """Current through ``branch`` from its terminal ``a`` to ``b``."""
        try:
            return self.currents[branch]
        except KeyError:
            raise NetworkError(f"unknown branch {branch!r}") from None


# A linear piece handed to the nodal solver: terminal indices p, q, conductance g and EMF e, with
# current from p to q equal to g * (V(p) - V(q) - e).
_Element = tuple[int, int, float, float]


class Network:
    """Builder and solver for one power path.

    Building is mutable (the loader adds parts one by one); every answer is a fresh frozen value.
    ``with_switch_states`` gives a copy in another switch scenario, so one design can be asked
    about "discharge switch off" without being changed.
    """

    def __init__(self) -> None:
        self._branches: dict[str, Branch] = {}
        # Insertion order of nets, so results and searches are deterministic.
        self._nets: dict[str, None] = {}
        self._index_cache: dict[str, int] = {}
        # A copy remembers its original and how many branches it took: branches are only ever
        # appended, so the solver's per-branch terms of those are the original's (a design's
        # cells, the same in most of its solves, are then prepared once).
        self._origin: tuple[Network, int] | None = None
        self._prepared: tuple[int, list, list, float] | None = None
        # The graph after stamping the prepared terms, by the reference nodes it was stamped with
        # (see _stamped_start): a large pack's cells, stamped once for all its solves.
        self._stamped: dict[tuple, tuple] = {}
        self._elements: tuple[list, set, int, int] | None = None

    # ----------------------------------------------------------------- building

    def _add(self, branch: Branch) -> Branch:
        if branch.name in self._branches:
            raise NetworkError(f"duplicate branch name {branch.name!r}")
        self._branches[branch.name] = branch
        self._nets.setdefault(branch.a, None)
        self._nets.setdefault(branch.b, None)
        return branch

    def add_resistor(self, name: str, a: str, b: str, ohms: float) -> Resistor:
        """Add a linear resistance between nets ``a`` and ``b``."""
        return self._add(Resistor(_check_name("branch name", name), _check_name("net", a),
                                  _check_name("net", b), _check_positive(f"{name}: ohms", ohms)))

    def add_source(self, name: str, pos: str, neg: str, volts: float,
                   r_internal: float) -> Source:
        """Add a cell or charger: ``V(pos) - V(neg) = volts`` at zero current."""
        return self._add(Source(_check_name("branch name", name), _check_name("net", pos),
                                _check_name("net", neg), _check_finite(f"{name}: volts", volts),
                                _check_positive(f"{name}: r_internal", r_internal)))

    def add_diode(self, name: str, anode: str, cathode: str, v_forward: float = 0.0,
                  r_on: float = DEFAULT_DIODE_R_ON) -> Diode:
        """Add a diode conducting from ``anode`` to ``cathode`` only."""
        return self._add(Diode(_check_name("branch name", name), _check_name("net", anode),
                               _check_name("net", cathode),
                               _check_finite(f"{name}: v_forward", v_forward, minimum=0.0),
                               _check_positive(f"{name}: r_on", r_on)))

    def add_switch(self, name: str, a: str, b: str, ohms_on: float, on: bool,
                   body_diode: tuple[str, str] | None = None, *,
                   v_forward: float = DEFAULT_BODY_DIODE_V_FORWARD,
                   r_on: float = DEFAULT_DIODE_R_ON) -> Switch:
        """Add a switch channel; ``body_diode`` is ``(anode, cathode)``, which must be ``a``/``b``.

        ``v_forward`` and ``r_on`` describe the body diode and are ignored without one.
        """
        _check_name("branch name", name)
        _check_name("net", a)
        _check_name("net", b)
        if not isinstance(on, bool):
            raise NetworkError(f"{name}: on must be True or False, got {on!r}")
        diode = None
        if body_diode is not None:
            if (not isinstance(body_diode, tuple) or len(body_diode) != 2
                    or set(body_diode) != {a, b} or a == b):
                raise NetworkError(
                    f"{name}: body_diode must be ({a!r}, {b!r}) or ({b!r}, {a!r}), "
                    f"got {body_diode!r}")
            diode = BodyDiode(body_diode[0], body_diode[1],
                              _check_finite(f"{name}: v_forward", v_forward, minimum=0.0),
                              _check_positive(f"{name}: r_on", r_on))
        return self._add(Switch(name, a, b, _check_positive(f"{name}: ohms_on", ohms_on), on,
                                diode))

    def add_mosfet(self, name: str, *, drain: str, source: str, channel: Literal["n", "p"],
                   ohms_on: float, on: bool, v_forward: float = DEFAULT_BODY_DIODE_V_FORWARD,
                   r_on: float = DEFAULT_DIODE_R_ON) -> Switch:
        """Add a MOSFET as a switch whose body diode is oriented by its channel type.

        The body diode is the junction between the body, tied to the source, and the drain: anode
        at the source for n-channel, at the drain for p-channel [practice]. Deriving it here keeps
        that fact in one place instead of in every caller.
        """
        if channel == "n":
            diode = (source, drain)
        elif channel == "p":
            diode = (drain, source)
        else:
            raise NetworkError(f"{name}: channel must be 'n' or 'p', got {channel!r}")
        return self.add_switch(name, drain, source, ohms_on, on, diode, v_forward=v_forward,
                               r_on=r_on)

    def add(self, branch: Branch) -> Branch:
        """Add a branch that an ``add_*`` method of some network built earlier.

        Branches are immutable, so one built (and checked) once can sit in any number of
        networks: the design model builds its many variants of one power path this way.
        """
        if not isinstance(branch, (Resistor, Source, Diode, Switch)):
            raise NetworkError(f"not a branch: {branch!r}")
        return self._add(branch)

    def copy(self) -> Network:
        """An independent copy, to be extended without changing this network."""
        copy = Network()
        copy._branches = dict(self._branches)
        copy._nets = dict(self._nets)
        copy._origin = (self, len(self._branches))
        return copy

    def with_switch_states(self, states: Mapping[str, bool]) -> Network:
        """A copy with the named switches set on (``True``) or off (``False``)."""
        copy = Network()
        copy._branches = dict(self._branches)
        copy._nets = dict(self._nets)
        for name, on in states.items():
            branch = self._branches.get(name)
            if not isinstance(branch, Switch):
                raise NetworkError(f"{name!r} is not a switch in this network")
            if not isinstance(on, bool):
                raise NetworkError(f"{name}: on must be True or False, got {on!r}")
            copy._branches[name] = replace(branch, on=on)
        return copy

    def with_body_diodes(self, knees: Mapping[str, tuple[float, float]]) -> Network:
        """A copy whose named switches' body diodes take a knee and on-resistance
        ``(v_forward, r_on)``: a diode's knee at the amperes of a short is not its knee at a
        few amperes."""
        copy = Network()
        copy._branches = dict(self._branches)
        copy._nets = dict(self._nets)
        for name, (v_forward, r_on) in knees.items():
            branch = self._branches.get(name)
            if not isinstance(branch, Switch) or branch.body_diode is None:
                raise NetworkError(f"{name!r} is not a switch with a body diode in this network")
            diode = replace(branch.body_diode,
                            v_forward=_check_finite(f"{name}: v_forward", v_forward, minimum=0.0),
                            r_on=_check_positive(f"{name}: r_on", r_on))
            copy._branches[name] = replace(branch, body_diode=diode)
        return copy

    @property
    def nets(self) -> tuple[str, ...]:
        return tuple(self._nets)

    @property
    def branches(self) -> tuple[Branch, ...]:
        return tuple(self._branches.values())

    def branch(self, name: str) -> Branch:
        try:
            return self._branches[name]
        except KeyError:
            raise NetworkError(f"unknown branch {name!r}") from None

    def _index(self, net: str) -> int:
        try:
            return self._net_index()[net]
        except KeyError:
            raise NetworkError(f"unknown net {net!r}") from None

    def _net_index(self) -> dict[str, int]:
        # Keyed on the net count: nets are only ever added, so the count identifies the mapping
        # and building needs no cache invalidation.
        cache = self._index_cache
        if len(cache) != len(self._nets):
            cache = {n: i for i, n in enumerate(self._nets)}
            self._index_cache = cache
        return cache

    # ----------------------------------------------------------------- reachability

    def reachable(self, src: str, dst: str) -> ConductionPath | None:
        """A path current can take from ``src`` to ``dst`` with switches as set, or ``None``.

        Resistors, sources and on channels conduct both ways; diodes, and the body diodes of off
        switches, only anode to cathode; an off switch without a body diode not at all. Forward
        voltages are ignored: the question is whether a way exists, and any voltage a fault can
        bring will overcome a knee. Breadth-first, so the path found has the fewest branches,
        which keeps messages short.
        """
        for net in (src, dst):
            if net not in self._nets:
                raise NetworkError(f"unknown net {net!r}")
        out: dict[str, list[Hop]] = {n: [] for n in self._nets}

        def edge(branch: str, x: str, y: str, via: Via) -> None:
            out[x].append(Hop(branch, x, y, via))

        for br in self._branches.values():
            if isinstance(br, Resistor):
                edge(br.name, br.a, br.b, "resistor")
                edge(br.name, br.b, br.a, "resistor")
            elif isinstance(br, Source):
                edge(br.name, br.a, br.b, "source")
                edge(br.name, br.b, br.a, "source")
            elif isinstance(br, Diode):
                edge(br.name, br.anode, br.cathode, "diode")
            elif br.on:
                edge(br.name, br.a, br.b, "channel")
                edge(br.name, br.b, br.a, "channel")
            elif br.body_diode is not None:
                edge(br.name, br.body_diode.anode, br.body_diode.cathode, "body diode")

        came_by: dict[str, Hop | None] = {src: None}
        queue = deque([src])
        while queue:
            net = queue.popleft()
            if net == dst:
                break
            for hop in out[net]:
                if hop.to_net not in came_by:
                    came_by[hop.to_net] = hop
                    queue.append(hop.to_net)
        if dst not in came_by:
            return None
        hops: list[Hop] = []
        net = dst
        while (hop := came_by[net]) is not None:
            hops.append(hop)
            net = hop.from_net
        return ConductionPath(src, dst, tuple(reversed(hops)))

    # ----------------------------------------------------------------- resistance

    def equivalent_resistance(self, a: str, b: str) -> float:
        """Resistance between nets ``a`` and ``b`` of the linear part, switches as set.

        Injects 1 A at ``a``, holds ``b`` at 0 V and reads ``V(a)``, so any series, parallel or
        bridge arrangement is handled the same way. Sources count as their internal resistance
        (EMF zeroed, as for any source resistance seen from the terminals); diodes are left out,
        since a piecewise diode has no one resistance. ``math.inf`` when no linear path joins
        the nets.
        """
        ia, ib = self._index(a), self._index(b)
        if ia == ib:
            return 0.0
        index = self._net_index()
        elements: list[_Element] = []
        for br in self._branches.values():
            if isinstance(br, Resistor):
                g = 1.0 / br.ohms
            elif isinstance(br, Source):
                g = 1.0 / br.r_internal
            elif isinstance(br, Switch) and br.on:
                g = 1.0 / br.ohms_on
            else:
                continue
            elements.append((index[br.a], index[br.b], g, 0.0))
        component = _components(len(self._nets), elements)
        if component[ia] < 0 or component[ia] != component[ib]:
            return math.inf
        keep = component[ia]
        elements = [e for e in elements if component[e[0]] == keep]
        unknowns = [i for i in range(len(self._nets)) if component[i] == keep and i != ib]
        reference = [False] * len(self._nets)
        reference[ib] = True
        v = _solve_nodal(len(self._nets), elements, reference, unknowns, {ia: 1.0})
        return v[ia]

    # ----------------------------------------------------------------- operating point

    def linear_terms(self) -> tuple[list, list, dict[str, int]]:
        """What the solver stamps: the linear terms ``(name, sign, p, q, g, e)`` of resistors,
        sources and on channels, the diode terms ``(name, sign, p, q, v_forward, g_on)``, and
        the net index ``p``/``q`` refer to (for the batch form of the solve, model/vector.py)."""
        index = self._net_index()
        linear, diodes, _ = self._terms(index)
        return list(linear), list(diodes), dict(index)

    def _terms(self, index: dict[str, int]) -> tuple[list, list, float]:
        """The solver's linear and diode terms of every branch, in order, and the voltage bound
        of the sources (1 V plus every EMF)."""
        linear: list = []
        diodes: list = []
        volt_scale = 1.0
        branches = self._branches.values()
        skip = 0
        if self._origin is not None:
            origin, count = self._origin
            prepared = origin._prepared
            if prepared is None or prepared[0] != len(origin._branches):
                prepared = origin._prepared = (len(origin._branches),
                                               *origin._terms(origin._net_index()))
            if prepared[0] == count:
                linear, diodes, volt_scale = list(prepared[1]), list(prepared[2]), prepared[3]
                skip = count
        for br in islice(branches, skip, None):
            ia, ib = index[br.a], index[br.b]
            if isinstance(br, Resistor):
                linear.append((br.name, 1, ia, ib, 1.0 / br.ohms, 0.0))
            elif isinstance(br, Source):
                linear.append((br.name, 1, ia, ib, 1.0 / br.r_internal, br.volts))
                volt_scale += abs(br.volts)
            elif isinstance(br, Diode):
                diodes.append((br.name, 1, ia, ib, br.v_forward, 1.0 / br.r_on))
            else:
                if br.on:
                    linear.append((br.name, 1, ia, ib, 1.0 / br.ohms_on, 0.0))
                bd = br.body_diode
                if bd is not None:
                    sign = 1 if bd.anode == br.a else -1
                    diodes.append((br.name, sign, index[bd.anode], index[bd.cathode],
                                   bd.v_forward, 1.0 / bd.r_on))
        return linear, diodes, volt_scale

    def _stamped_start(self, n: int, reference: list[bool]) -> tuple | None:
        """The solver's graph after stamping the original's terms (this copy's first terms), for
        :func:`_solve_nodal` to stamp the rest onto; None for a network without a large original.

        A large pack's solves differ in their switch channels and share thousands of cells: the
        cells are stamped once per set of reference nodes instead of once per solve. The same
        terms are stamped in the same order, so the graph is the same to the last bit.
        """
        if self._origin is None:
            return None
        origin, count = self._origin
        prepared = origin._prepared
        if prepared is None or prepared[0] != count or len(prepared[1]) < STAMP_PREFIX_MIN:
            return None
        m = len(origin._nets)
        elements = self._prefix_elements()[0]
        key = (count, bytes(reference[:m]))
        state = origin._stamped.get(key)
        if state is None:
            if len(origin._stamped) >= STAMPED_MAX:
                origin._stamped.pop(next(iter(origin._stamped)))
            G: list[dict[int, float]] = [{} for _ in range(m)]
            E: list[dict[int, float]] = [{} for _ in range(m)]
            leak_g, leak_e = [0.0] * m, [0.0] * m
            _stamp(elements, reference, G, E, leak_g, leak_e)
            state = origin._stamped[key] = (G, E, leak_g, leak_e)
        G, E, leak_g, leak_e = state
        extra = n - m
        return ([dict(d) for d in G] + [{} for _ in range(extra)],
                [dict(d) for d in E] + [{} for _ in range(extra)],
                leak_g + [0.0] * extra, leak_e + [0.0] * extra, len(prepared[1]))

    def _prefix_elements(self) -> tuple[list[_Element], set[tuple[int, int]], int]:
        """The solver's elements of the original's terms (this copy's first terms), the node
        pairs they join and their count, made once per original; no elements for a network
        without a large original (see :meth:`_stamped_start`)."""
        if self._origin is not None:
            origin, count = self._origin
            prepared = origin._prepared
            if (prepared is not None and prepared[0] == count
                    and len(prepared[1]) >= STAMP_PREFIX_MIN):
                made = origin._elements
                if made is None or made[3] != count:
                    elements = [(p, q, g, e) for _, _, p, q, g, e in prepared[1]]
                    made = origin._elements = (elements, {(p, q) for p, q, _, _ in elements},
                                               len(elements), count)
                return made[:3]
        return [], set(), 0

    def solve(self, ground: str, *, max_iterations: int = _DEFAULT_MAX_ITERATIONS) -> Solution:
        """DC operating point with ``ground`` at 0 V.

        Diodes start off; each round solves the linear network for the current states and flips
        every diode whose state contradicts its own voltage (an off diode forward of its knee, an
        on diode carrying reverse current). If a set of states comes back, which whole-set
        flipping can do, it switches to flipping only the first inconsistent diode, a rule that
        terminates for a fixed network of resistors, sources and monotone diodes [published: the
        least-index principal pivoting rule for linear complementarity problems with a P-matrix].
        The small leaks described below make each round's network differ very slightly, so the
        bound stays as a guard: past ``max_iterations`` rounds ``ConvergenceError`` names the
        diodes still changing.
        """
        index = self._net_index()
        if ground not in index:
            raise NetworkError(f"unknown ground net {ground!r}")
        if max_iterations < 1:
            raise NetworkError(f"max_iterations must be >= 1, got {max_iterations!r}")
        n = len(index)
        ig = index[ground]

        # owner, sign, p, q, g, e / owner, sign, p, q, vf, g_on; and the bound on voltages
        linear, diodes, volt_scale = self._terms(index)
        key = (_solve_key(self, ground, max_iterations, linear, diodes)
               if len(self._branches) <= SOLVED_LARGE_BRANCHES else None)
        known = _recall(key) if key is not None else None
        if known is not None:
            return known
        g_min = min([item[4] for item in linear], default=math.inf)
        if diodes:
            g_min = min(g_min, min([item[5] for item in diodes]))
            for item in diodes:
                volt_scale += item[4]
        g_leak = g_min * _LEAK_FRACTION
        v_tol = volt_scale * _STATE_TOLERANCE
        prefix, prefix_pairs, done = self._prefix_elements()
        linear_elements: list[_Element] = prefix + [(p, q, g, e) for _, _, p, q, g, e
                                                    in islice(linear, done, None)]

        # Each round solves with the current diode states: linear parts and on diodes as they
        # are, and off diodes open, except that an off diode joining two otherwise separate parts
        # leaks a little so the part it hangs on has a definite voltage to test it against.
        # Where no off diode joins separate parts (the usual case) the round's solve is already
        # the exact answer and is reported as it is.
        on = [False] * len(diodes)
        seen: set[tuple[bool, ...]] = set()
        single_flip = False
        iterations = 0
        while True:
            iterations += 1
            exact = linear_elements + [(p, q, g_on, vf) for (_, _, p, q, vf, g_on), s
                                       in zip(diodes, on) if s] if diodes else linear_elements
            component = _components(n, exact, prefix_pairs, done)
            leaks = [(p, q, g_leak, vf) for (_, _, p, q, vf, _), s in zip(diodes, on)
                     if not s and p != q
                     and (component[p] < 0 or component[p] != component[q])] if diodes else []
            if leaks:
                elements = exact + leaks
                reference, unknowns = _references(n, _components(n, elements), ig)
            else:
                elements = exact
                reference, unknowns = _references(n, component, ig)
            v = _solve_nodal(n, elements, reference, unknowns,
                             start=self._stamped_start(n, reference))
            wrong = [k for k, (_, _, p, q, vf, _) in enumerate(diodes)
                     if ((v[p] - v[q] - vf < -v_tol) if on[k] else (v[p] - v[q] - vf > v_tol))]
            if not wrong:
                break
            if iterations >= max_iterations:
                names = tuple(dict.fromkeys(diodes[k][0] for k in wrong))
                raise ConvergenceError(
                    f"diode states did not settle in {max_iterations} rounds; still "
                    f"changing: {', '.join(names)}", names)
            seen.add(tuple(on))
            if not single_flip:
                trial = list(on)
                for k in wrong:
                    trial[k] = not trial[k]
                if tuple(trial) in seen:
                    single_flip = True
            if single_flip:
                on[wrong[0]] = not on[wrong[0]]
            else:
                on = trial

        # A diode left on at its knee carries no current, and the potential it pins is then not
        # fixed by the circuit: any value up to the knee fits equally. Turning it off changes no
        # current and lets whatever it alone held report as floating instead of a made-up voltage.
        knee_tol = volt_scale * _KNEE_TOLERANCE
        at_knee = [k for k, (_, _, p, q, vf, _) in enumerate(diodes)
                   if on[k] and v[p] - v[q] - vf <= knee_tol]
        for k in at_knee:
            on[k] = False

        def exact() -> tuple[list[int], list[float]]:
            # The exact model: off diodes open, so floating islands show as such.
            elements = linear_elements + [(p, q, g_on, vf) for (_, _, p, q, vf, g_on), s
                                          in zip(diodes, on) if s]
            component = _components(n, elements)
            reference, unknowns = _references(n, component, ig)
            return component, _solve_nodal(n, elements, reference, unknowns,
                                           start=self._stamped_start(n, reference))

        if leaks or at_knee:
            component, v = exact()
            # A diode with an on-resistance far below the rest of its loop drops almost nothing
            # while it carries current (a sub-microvolt EMF behind ohms): opening it leaves it
            # forward of its knee, so it stays on after all.
            back = [k for k in at_knee if v[diodes[k][2]] - v[diodes[k][3]] - diodes[k][4] > v_tol]
            if back:
                for k in back:
                    on[k] = True
                component, v = exact()

        currents = {name: 0.0 for name in self._branches}
        for name, sign, p, q, g, e in linear:
            currents[name] += sign * g * (v[p] - v[q] - e)
        conducting = []
        for (name, sign, p, q, vf, g_on), s in zip(diodes, on):
            if s:
                currents[name] += sign * g_on * (v[p] - v[q] - vf)
                conducting.append(name)
        ground_component = component[ig]
        voltages: dict[str, float | None] = {}
        for net, i in index.items():
            grounded = i == ig or (component[i] == ground_component and component[i] >= 0)
            voltages[net] = v[i] if grounded else None
        solution = Solution(ground, MappingProxyType(voltages), MappingProxyType(currents),
                            frozenset(conducting), iterations)
        if key is not None:
            _remember(key, solution)
        return solution


def _components(n: int, elements: Iterable[_Element], known: set[tuple[int, int]] = frozenset(),
                skip: int = 0) -> list[int]:
    """Connected-component label per node; ``-1`` for a node no element touches. ``known`` are
    the node pairs of the first ``skip`` elements (only the partition into components is read,
    never the labels' values, so the order the pairs are joined in does not matter)."""
    parent = list(range(n))
    touched = [False] * n
    # Parallel parts (the cells of a parallel group) join the same two nodes: once is enough.
    for p, q in known | {(p, q) for p, q, _, _ in islice(elements, skip, None)}:
        touched[p] = touched[q] = True
        while parent[p] != p:
            parent[p] = parent[parent[p]]
            p = parent[p]
        while parent[q] != q:
            parent[q] = parent[parent[q]]
            q = parent[q]
        if p != q:
            parent[p] = q
    out = []
    for i in range(n):
        if touched[i]:
            while parent[i] != i:
                parent[i] = parent[parent[i]]
                i = parent[i]
            out.append(i)
        else:
            out.append(-1)
    return out


def _references(n: int, component: list[int], ground: int) -> tuple[list[bool], list[int]]:
    """One 0 V reference per component (``ground`` for its own), and the nodes left to solve.

    A component without ground still has definite branch currents; giving it a local reference
    lets one solve find them, and its voltages are then reported as floating.
    """
    reference = [False] * n
    reference[ground] = True
    has_ref = {component[ground]} if component[ground] >= 0 else set()
    unknowns = []
    for i in range(n):
        c = component[i]
        if c < 0 or i == ground:
            continue
        if c not in has_ref:
            has_ref.add(c)
            reference[i] = True
        else:
            unknowns.append(i)
    return reference, unknowns


#: A copy whose original has at least this many solver terms has them stamped once
#: (Network._stamped_start); below it, copying the stamped graph would cost about what stamping
#: the terms again does [measured: bench/run.py's scaling series, issue 19].
STAMP_PREFIX_MIN = 64
#: Stamped graphs kept per original network, one per set of reference nodes (a solve has one,
#: two where an off diode leaves part of the network floating).
STAMPED_MAX = 4


def _stamp(elements: Iterable[_Element], reference: list[bool], G: list[dict[int, float]],
           E: list[dict[int, float]], leak_g: list[float], leak_e: list[float]) -> None:
    """Stamp ``elements`` onto the graph of :func:`_solve_nodal`, in order.

    Stamping merges parallel branches as it goes: conductances add, and the EMF becomes their
    conductance-weighted mean. Written out in the loop (it runs once per branch per solve).
    """
    for p, q, g, e in elements:
        if p == q:
            continue
        rp, rq = reference[p], reference[q]
        if rp and rq:
            continue
        if rp or rq:
            if rq:
                i = p
            else:
                i, e = q, -e
            g0 = leak_g[i]
            if g0:
                total = g0 + g
                leak_e[i] = (g0 * leak_e[i] + g * e) / total
                leak_g[i] = total
            else:
                leak_g[i] = g
                leak_e[i] = e
            continue
        gi, ei = G[p], E[p]
        g0 = gi.get(q)
        if g0 is None:
            gi[q] = g
            ei[q] = e
        else:
            total = g0 + g
            ei[q] = (g0 * ei[q] + g * e) / total
            gi[q] = total
        gi, ei, e = G[q], E[q], -e
        g0 = gi.get(p)
        if g0 is None:
            gi[p] = g
            ei[p] = e
        else:
            total = g0 + g
            ei[p] = (g0 * ei[p] + g * e) / total
            gi[p] = total


def _solve_nodal(n: int, elements: Iterable[_Element], reference: list[bool],
                 unknowns: list[int], injections: Mapping[int, float] | None = None,
                 start: tuple | None = None) -> list[float]:
    """Node voltages of a network of conductances with EMFs; reference nodes are at 0 V.

    Gaussian elimination on the graph itself, one node at a time in minimum-degree order, which
    keeps fill small on the grid-like graphs of packs. Eliminating a node is the star-mesh
    transform: its branches become branches between its neighbours, each with conductance
    ``g_ki * g_kj / d`` and EMF ``e_kj - e_ki``. The matrix is a grounded Laplacian, symmetric and
    diagonally dominant, so no pivoting by value is needed for stability [published: textbook
    result for such matrices]. Two choices keep rounding at the level of the voltages themselves:

    * conductances are only ever added, never subtracted, so a 1e-12 leak beside a 1e4 S channel
      is not lost to cancellation, as it would be in a pivot formed as diagonal minus products
      [published: the subtraction-free elimination of diagonally dominant M-matrices];
    * EMFs stay on the branches as volts instead of becoming injected currents ``g * e``, so a
      1 V cell behind 0.1 mΩ is not carried as 1e4 A and cancelled back to a few volts.

    ``start`` is the graph after stamping the first of ``elements`` and their count (see
    ``Network._stamped_start``); the graph is changed in place.
    """
    # Per node: neighbour -> conductance, and neighbour -> EMF oriented from this node, so that
    # the current from i to j is G[i][j] * (V_i - V_j - E[i][j]). The references are merged into
    # one 0 V node R, kept per node as (leak_g, leak_e); R is never eliminated, so merging them
    # couples nothing.
    if start is None:
        G: list[dict[int, float]] = [{} for _ in range(n)]
        E: list[dict[int, float]] = [{} for _ in range(n)]
        leak_g = [0.0] * n
        leak_e = [0.0] * n
        _stamp(elements, reference, G, E, leak_g, leak_e)
    else:
        G, E, leak_g, leak_e, done_before = start
        _stamp(islice(elements, done_before, None), reference, G, E, leak_g, leak_e)
    rhs = [0.0] * n
    if injections:
        for i, amps in injections.items():
            rhs[i] += amps

    heap = [(len(G[i]), i) for i in unknowns]
    heapq.heapify(heap)
    done = [False] * n
    steps: list[tuple[int, float, float, list[tuple[int, float, float]]]] = []
    while heap:
        degree, k = heapq.heappop(heap)
        if done[k] or degree != len(G[k]):
            continue
        done[k] = True
        ek = E[k]
        star = [(j, g, ek[j]) for j, g in G[k].items()]
        gR, eR = leak_g[k], leak_e[k]
        d = gR
        for _, g, _ in star:
            d += g
        if not (d > 0.0 and math.isfinite(d)):
            raise NetworkError("singular network: a node has no conductance to a reference "
                               f"(pivot {d!r})")
        sk = rhs[k]
        for i, gki, eki in star:
            gi, ei = G[i], E[i]
            del gi[k]
            del ei[k]
            f = gki / d
            if gR:
                g, e = f * gR, eR - eki
                g0 = leak_g[i]
                if g0:
                    total = g0 + g
                    leak_e[i] = (g0 * leak_e[i] + g * e) / total
                    leak_g[i] = total
                else:
                    leak_g[i] = g
                    leak_e[i] = e
            if sk:
                rhs[i] += f * sk
            for j, gkj, ekj in star:
                if j != i:
                    # add_edge inlined: this loop is where the solve spends its time.
                    g = f * gkj
                    g0 = gi.get(j)
                    if g0 is None:
                        gi[j] = g
                        ei[j] = ekj - eki
                    else:
                        total = g0 + g
                        ei[j] = (g0 * ei[j] + g * (ekj - eki)) / total
                        gi[j] = total
            heapq.heappush(heap, (len(gi), i))
        steps.append((k, d, sk + gR * eR, star))
    x = [0.0] * n
    for k, d, base, star in reversed(steps):
        acc = base
        for j, g, e in star:
            acc += g * (x[j] + e)
        x[k] = acc / d
    for k in unknowns:
        if not math.isfinite(x[k]):
            raise NetworkError("singular network: solution is not finite")
    return x


# --- solves remembered by their values -------------------------------------------------------

#: Solutions by everything a solve reads (see :func:`_solve_key`), oldest first. A design's model
#: asks for the same network with the same values again (an event's point that another already
#: solved), and a batch's designs share most of their networks (the same cells, protector and
#: switches with another load): about nine solves in ten of the benchmark's batch are repeats
#: [measured: bench/run.py's corpus, issue 19]. A solve is a pure function of its key and a
#: ``Solution`` is immutable, so a remembered one is the very value a new solve would give.
_SOLVED: dict[tuple, Solution] = {}
#: Bound on the solutions kept (the oldest goes first), and on the branches of a network whose
#: solution is kept: a large pack's solves repeat less (one in five), and each would hold its
#: key and solution for hundreds of branches, so the memory stays at a megabyte or two.
SOLVED_MAX = 512
SOLVED_MAX_BRANCHES = 128


def _solve_key(network: Network, ground: str, max_iterations: int, linear: list,
               diodes: list) -> tuple:
    """What the solve of ``network`` reads: nets and branches in order (the currents are keyed by
    branch, the index by net), the stamped terms, the ground and the round limit, and the sign of
    each EMF and knee: -0.0 equals 0.0, yet a solve with it can give a zero of the other sign."""
    emfs = [t[5] for t in linear] + [t[4] for t in diodes]
    signs = tuple(map(math.copysign, repeat(1.0, len(emfs)), emfs))
    return (ground, max_iterations, tuple(network._nets), tuple(network._branches),
            tuple(linear), tuple(diodes), signs)


def _remember(key: tuple, solution: Solution) -> None:
    if len(key[3]) > SOLVED_MAX_BRANCHES:
        _remember_large(key, solution)
        return
    if len(_SOLVED) >= SOLVED_MAX:
        _SOLVED.pop(next(iter(_SOLVED)), None)
    _SOLVED[key] = solution


#: A large pack's solves, kept apart so they never push the small networks out: bounded by the
#: branches they hold in all (the oldest go first), about 50 solves of a 400-component pack, which
#: is what its lint asks for; a warm re-lint then solves again only what an edit changed, and
#: a quarter of a lint's own solves are repeats [measured: bench/run.py's large pack, issue 19].
#: A network of more branches than the whole bound is solved afresh every time.
_SOLVED_LARGE: dict[tuple, Solution] = {}
_SOLVED_LARGE_HELD = [0]
SOLVED_LARGE_BRANCHES = 24_000


def _recall(key: tuple) -> Solution | None:
    known = _SOLVED.get(key)
    return known if known is not None else _SOLVED_LARGE.get(key)


def _remember_large(key: tuple, solution: Solution) -> None:
    size = len(key[3])
    while _SOLVED_LARGE and _SOLVED_LARGE_HELD[0] + size > SOLVED_LARGE_BRANCHES:
        oldest = next(iter(_SOLVED_LARGE))
        del _SOLVED_LARGE[oldest]
        _SOLVED_LARGE_HELD[0] -= len(oldest[3])
    _SOLVED_LARGE[key] = solution
    _SOLVED_LARGE_HELD[0] += size
