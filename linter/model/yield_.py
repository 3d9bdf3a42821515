"""Production yield: a seeded Monte Carlo over every tolerance the design declares.

The worst-case rules ask whether any build *can* fail; a production engineer also asks how many
will. Each sample is one build: every toleranced part value drawn once (uniform within its limits,
or normal with the tolerance as 3σ), then the checks that decide the protection's fate evaluated
for that build:

* ``trip-current-window``, nuisance trip: the over-current trip current, at the highest ambient,
  the lowest gate drive and the junction temperature the continuous load heats the switches to,
  below the continuous load;
* ``trip-current-window``, trip above the cell rating: the trip current at the lowest ambient and
  the highest gate drive above the cells' discharge rating (a load just below it is never cut);
* ``switch-temperature``: a switch junction above its limit at the highest ambient, at the
  continuous load and at the highest current the protection lets through (just below the trip).

The sense resistance of every build comes from the same linear network as the nodal solver's
(cells as their internal resistance, FET channels, shunts, fuses, copper), solved for all builds at
once: a unit load current is injected at the pack terminals and the sense voltage read off, which is
the transresistance the deterministic model uses [derived: by superposition, the cells' equal EMFs
drive no current of their own, so the load current alone sets the sense voltage]. The nodal
equations are eliminated with numpy across the batch, one pivot at a time, which for the handful of
nodes of a pack path is far quicker than a LAPACK call per build.

numpy is imported by this module only; the linter itself never needs it.
"""

from __future__ import annotations

import math
from dataclasses import field
from typing import TYPE_CHECKING, Literal, Sequence

import numpy as np

from ..schema import Toleranced
from .design import spread_low
from ..records import record

if TYPE_CHECKING:  # pragma: no cover
    from .design import DesignModel

__all__ = ["Distribution", "Parameter", "draw", "wilson_interval", "LinearPath", "Tree",
           "rds_on_batch", "rds_base_batch", "temperature_factor_batch",
           "YieldCheck", "YieldResult", "YieldError", "run_yield", "DEFAULT_SEED", "Z_95"]

Distribution = Literal["uniform", "normal"]
#: Seed used when none is given, so two runs of the same design agree [derived: any fixed value].
DEFAULT_SEED = 20240601
#: Two-sided 95 % standard normal quantile, Φ⁻¹(0.975) [published: standard normal table].
Z_95 = 1.959963984540054
#: Junction limit the switch-temperature check uses, unless tj_max is lower [practice: commercial
#: derating T_J ≤ 125 °C, REFERENCES.md "MOSFETs"; the rule's own default].
TJ_LIMIT = 125.0
# Builds per numpy batch: keeps the (nodes × nodes × batch) elimination array near 160 MB for a
# 16-cell pack and lets a 1-cell design run in one batch [derived: 8 bytes × 40² × 12 500].
_BATCH_ELEMENTS = 20_000_000
_THERMAL_ITERATIONS = 60
_THERMAL_TOLERANCE = 0.01  # kelvin, as the deterministic model


class YieldError(ValueError):
    """The design lacks what the Monte Carlo needs (a protector, a sense path...)."""


# --- drawing ---------------------------------------------------------------------------------------

@record(frozen=True)
class Parameter:
    """One toleranced quantity: its name in the report and its low / typical / high values."""

    name: str
    low: float
    typ: float
    high: float

    @classmethod
    def of(cls, name: str, t: Toleranced, low: float | None = None) -> "Parameter":
        return cls(name, t.low if low is None else low, t.nominal, t.high)

    @property
    def varies(self) -> bool:
        return self.high > self.low


def draw(rng: np.random.Generator, p: Parameter, n: int, distribution: Distribution) -> np.ndarray:
    """``n`` values of ``p``.

    ``uniform``: uniform between low and high. ``normal``: centred on typ with each side's
    tolerance as 3σ (a split normal where typ is off centre), not truncated, so about 0.27 % of
    builds fall outside the data-sheet limits, as parts of a 3σ process do [published: normal
    distribution, P(|Z| > 3) = 0.0027].
    """
    if not p.varies:
        return np.full(n, p.typ)
    if distribution == "uniform":
        return rng.uniform(p.low, p.high, n)
    if distribution == "normal":
        z = rng.standard_normal(n)
        return p.typ + np.where(z >= 0, z * (p.high - p.typ), z * (p.typ - p.low)) / 3.0
    raise ValueError(f"distribution must be 'uniform' or 'normal', got {distribution!r}")


def wilson_interval(failures: int, samples: int, z: float = Z_95) -> tuple[float, float]:
    """Two-sided Wilson score interval for a binomial proportion.

    [published: E. B. Wilson, "Probable inference, the law of succession, and statistical
    inference", J. Am. Stat. Assoc. 22 (1927) 209-212; recommended over the Wald interval for
    small and zero counts by R. G. Newcombe, Stat. Med. 17 (1998) 857-872.] Unlike the Wald
    interval it stays inside 0..1 and is not empty when no build fails.
    """
    if samples <= 0 or not 0 <= failures <= samples:
        raise ValueError(f"need 0 <= failures <= samples and samples > 0, got {failures}/{samples}")
    p = failures / samples
    z2 = z * z
    denom = 1.0 + z2 / samples
    centre = (p + z2 / (2 * samples)) / denom
    half = z / denom * math.sqrt(p * (1 - p) / samples + z2 / (4 * samples * samples))
    # At no failures (or all) the bound is 0 (or 1) exactly; rounding would leave 1e-19.
    low = 0.0 if failures == 0 else max(0.0, centre - half)
    high = 1.0 if failures == samples else min(1.0, centre + half)
    return low, high


# --- on-resistance for a batch -----------------------------------------------------------------------

def rds_base_batch(points: Sequence[tuple[float, float | None, float | None]], vgs: np.ndarray,
                   spread: np.ndarray) -> np.ndarray:
    """R_DS(on) at 25 °C of a batch of FETs, each at its own gate drive and place in the spread.

    The same table rules as :func:`packwarden.model.rdson.rds_on`: linear between rows, held above
    the highest row, continued through the two lowest rows below it (never below the lowest row's
    value); a missing typ or max filled the same way. ``spread`` is -1 at the minimum, 0 at typ,
    +1 at max (beyond ±1 in normal tails). Gate voltages are magnitudes, as for p-channel sheets.
    """
    rows = []
    for v, typ, mx in points:
        if typ is not None and mx is not None:
            low = typ - (mx - typ)
            low = low if low > 0 else typ / 2  # as DesignModel's spread_low floors a wide max
        elif mx is not None:
            typ = low = mx
        else:
            mx = low = typ
        rows.append((abs(v), typ, mx, low))
    rows.sort()
    xs = np.array([r[0] for r in rows])

    def column(i: int) -> np.ndarray:
        ys = np.array([r[i] for r in rows])
        out = np.interp(vgs, xs, ys)
        if len(rows) > 1:
            slope = (ys[1] - ys[0]) / (xs[1] - xs[0])
            out = np.where(vgs < xs[0], np.maximum(ys[0] + slope * (vgs - xs[0]), ys[0]), out)
        return out

    typ, mx, low = column(1), column(2), column(3)
    base = np.where(spread >= 0, typ + spread * (mx - typ), typ + spread * (typ - low))
    return np.maximum(base, 1e-9)


def temperature_factor_batch(tj: np.ndarray, hot_ratio: float, hot_at: float) -> np.ndarray:
    """The straight line of :func:`packwarden.model.rdson.temperature_factor`, for arrays."""
    return np.maximum(1.0 + (hot_ratio - 1.0) * (tj - 25.0) / (hot_at - 25.0), 1e-3)


def rds_on_batch(points: Sequence[tuple[float, float | None, float | None]], vgs: np.ndarray,
                 tj: np.ndarray, spread: np.ndarray, hot_ratio: float, hot_at: float) -> np.ndarray:
    """R_DS(on) of a batch of FETs at their gate drive, junction and place in the spread."""
    return rds_base_batch(points, vgs, spread) * temperature_factor_batch(tj, hot_ratio, hot_at)


# --- the linear path --------------------------------------------------------------------------------

@record(frozen=True)
class Tree:
    """A branch of the reduced path: one part, or parts in series or in parallel."""

    op: str  # "leaf" | "series" | "parallel"
    name: str = ""
    children: tuple["Tree", ...] = ()

    def leaves(self) -> list[str]:
        return [self.name] if self.op == "leaf" else [n for c in self.children for n in c.leaves()]


def _conductance(tree: Tree, r: dict, memo: dict, kept: dict | None = None,
                 marks: dict | None = None) -> np.ndarray:
    """Conductance of ``tree`` per build. ``kept`` holds those of the subtrees that ``marks``
    leaves unmarked, whose values stay the same from one call to the next (a thermal loop changes
    the switches only, and a large pack has hundreds of cells)."""
    if kept is not None and id(tree) in kept:
        g = kept[id(tree)]
    elif tree.op == "leaf":
        g = 1.0 / r[tree.name]
    elif tree.op == "series":
        g = 1.0 / sum(1.0 / _conductance(c, r, memo, kept, marks) for c in tree.children)
    else:
        g = sum(_conductance(c, r, memo, kept, marks) for c in tree.children)
    memo[id(tree)] = g
    if kept is not None and not marks[id(tree)]:
        kept[id(tree)] = g
    return g


def _mark(tree: Tree, names: frozenset, marks: dict) -> bool:
    """Mark every subtree holding one of ``names``; return the mark of ``tree``."""
    if tree.op == "leaf":
        found = tree.name in names
    else:
        found = False
        for c in tree.children:
            found = _mark(c, names, marks) or found
    marks[id(tree)] = found
    return found


def _distribute(tree: Tree, current: np.ndarray, memo: dict, out: dict,
                marks: dict | None = None) -> None:
    if tree.op == "leaf":
        out[tree.name] = current
    elif tree.op == "series":
        for c in tree.children:
            if marks is None or marks[id(c)]:
                _distribute(c, current, memo, out, marks)
    else:
        total = memo[id(tree)]
        for c in tree.children:
            if marks is None or marks[id(c)]:  # the parts asked for lie below here
                _distribute(c, current * memo[id(c)] / total, memo, out, marks)


@record
class LinearPath:
    """The pack path as a conductance network, solved for many builds at once.

    Built from (part, net a, net b) edges and reduced first: nets hanging off the path by one
    part carry no current and read at their neighbour's voltage (a sense pin behind its
    resistor); parts in series or in parallel fold into one branch, whose current divides back
    among its parts by their conductances. What is left (bridges, if any) is solved nodally. A
    plain pack path folds down to a loop of two or three branches, so most of the work is
    the arithmetic on the parts' own values.
    """

    nodes: list[str]
    branches: list[tuple[Tree, int, int]]
    ground: int
    inject: tuple[int, int]  # (node the load current returns to, node it leaves from)
    alias: dict[str, str] = field(default_factory=dict)

    @classmethod
    def build(cls, edges: Sequence[tuple[str, str, str]], ground: str, pos: str, neg: str,
              keep: Sequence[str] = ()) -> "LinearPath":
        work = [(Tree("leaf", name), a, b) for name, a, b in edges if a != b]
        alias: dict[str, str] = {}
        fixed = {ground, pos, neg}
        no_fold = fixed | set(keep)
        changed = True
        while changed:
            changed = False
            incident: dict[str, list[int]] = {}
            for k, (_, a, b) in enumerate(work):
                incident.setdefault(a, []).append(k)
                incident.setdefault(b, []).append(k)
            groups: dict[frozenset, list[int]] = {}
            for k, (_, a, b) in enumerate(work):
                groups.setdefault(frozenset((a, b)), []).append(k)
            parallel = next((ks for ks in groups.values() if len(ks) > 1), None)
            if parallel is not None:
                _, a, b = work[parallel[0]]
                merged = (Tree("parallel", children=tuple(work[k][0] for k in parallel)), a, b)
                work = [e for k, e in enumerate(work) if k not in parallel] + [merged]
                changed = True
                continue
            for net, ks in incident.items():
                if len(ks) == 1 and net not in fixed:
                    # Hangs off the path: no current, its neighbour's voltage.
                    _, a, b = work[ks[0]]
                    alias[net] = b if a == net else a
                    work = [e for k, e in enumerate(work) if k != ks[0]]
                    changed = True
                    break
                if len(ks) == 2 and net not in no_fold:
                    (t1, a1, b1), (t2, a2, b2) = work[ks[0]], work[ks[1]]
                    far1 = b1 if a1 == net else a1
                    far2 = b2 if a2 == net else a2
                    rest = [e for k, e in enumerate(work) if k not in ks]
                    if far1 != far2:
                        rest.append((Tree("series", children=(t1, t2)), far1, far2))
                    work = rest
                    changed = True
                    break
        reach = {pos}
        grew = True
        while grew:
            grew = False
            for _, a, b in work:
                if (a in reach) != (b in reach):
                    reach |= {a, b}
                    grew = True
        if neg not in reach or ground not in reach:
            raise YieldError("the pack terminals and the stack are not joined by a linear path")
        work = [e for e in work if e[1] in reach]
        nodes = sorted(reach, key=lambda n: (n != ground, n))
        index = {n: i for i, n in enumerate(nodes)}
        branches = [(t, index[a], index[b]) for t, a, b in work]
        return cls(nodes, branches, index[ground], (index[neg], index[pos]), alias)

    def node(self, net: str) -> int:
        seen = set()
        while net in self.alias and net not in seen:
            seen.add(net)
            net = self.alias[net]
        try:
            return self.nodes.index(net)
        except ValueError:
            raise YieldError(f"net {net} is not on the power path") from None

    def leaves(self) -> list[str]:
        return [n for t, _, _ in self.branches for n in t.leaves()]

    def solve(self, r: dict, builds: int, wanted: Sequence[str] | None = None,
              kept: dict | None = None, varies: Sequence[str] = ()) -> tuple[np.ndarray, dict]:
        """(node voltages (nodes, builds), leaf currents) for a unit load current, ground 0 V.

        ``wanted`` limits the currents to those parts. With ``kept`` (a dict the caller keeps
        between calls) the conductances of subtrees holding none of the ``wanted`` or
        ``varies`` parts are reused, so the other parts' values must not change between calls.

        ``r`` maps each part to its resistances, one per build (or one for all). The remaining nodal equations are
        eliminated without pivoting, vectorised across builds: the grounded Laplacian is
        symmetric and diagonally dominant, so no pivoting is needed [published: the textbook
        result the scalar solver in network.py also relies on].
        """
        memo: dict = {}
        marks: dict | None = None
        changing: dict | None = None
        if wanted is not None:
            marks = {}
            names = frozenset(wanted)
            for t, _, _ in self.branches:
                _mark(t, names, marks)
        if kept is not None:
            changing = {}
            names = frozenset(wanted or ()) | frozenset(varies)
            for t, _, _ in self.branches:
                _mark(t, names, changing)
        g = [np.broadcast_to(_conductance(t, r, memo, kept, changing), (builds,))
             for t, _, _ in self.branches]
        n = len(self.nodes)
        unknown = [i for i in range(n) if i != self.ground]
        pos = {node: k for k, node in enumerate(unknown)}
        m = len(unknown)
        a = np.zeros((m, m, builds))
        for gk, (_, i, j) in zip(g, self.branches):
            pi, pj = pos.get(i), pos.get(j)
            if pi is not None:
                a[pi, pi] += gk
            if pj is not None:
                a[pj, pj] += gk
            if pi is not None and pj is not None:
                a[pi, pj] -= gk
                a[pj, pi] -= gk
        rhs = np.zeros((m, builds))
        back, out = self.inject
        if back in pos:
            rhs[pos[back]] += 1.0
        if out in pos:
            rhs[pos[out]] -= 1.0
        for k in range(m):
            if k + 1 < m:
                f = a[k + 1:, k] / a[k, k]
                a[k + 1:, k + 1:] -= f[:, None, :] * a[k, None, k + 1:]
                rhs[k + 1:] -= f * rhs[k]
        x = np.zeros((m, builds))
        for k in range(m - 1, -1, -1):
            acc = rhs[k] - np.einsum("jb,jb->b", a[k, k + 1:], x[k + 1:]) if k + 1 < m else rhs[k]
            x[k] = acc / a[k, k]
        v = np.zeros((n, builds))
        for node, k in pos.items():
            v[node] = x[k]
        currents: dict = {}
        for gk, (t, i, j) in zip(g, self.branches):
            if marks is None or marks[id(t)]:
                _distribute(t, gk * (v[i] - v[j]), memo, currents, marks)
        return v, currents


# --- the run ------------------------------------------------------------------------------------------

@record(frozen=True)
class YieldCheck:
    rule: str
    check: str
    condition: str
    failures: int
    samples: int

    @property
    def share(self) -> float:
        return self.failures / self.samples

    @property
    def interval(self) -> tuple[float, float]:
        return wilson_interval(self.failures, self.samples)


@record(frozen=True)
class YieldResult:
    samples: int
    seed: int
    distribution: str
    checks: tuple[YieldCheck, ...]
    sampled: tuple[str, ...]
    held: tuple[str, ...]  # declared tolerances that do not enter these checks
    figures: dict  # name -> {min, p50, max} over the builds, SI units
    notes: tuple[str, ...] = ()


def declared_tolerances(m: "DesignModel") -> list[str]:
    """Every toleranced value the design declares (limits that differ), by a readable name."""
    out = []

    def walk(prefix: str, obj) -> None:
        if isinstance(obj, Toleranced):
            if obj.high > obj.low:
                out.append(prefix)
            return
        fields = getattr(type(obj), "model_fields", None)
        if fields is None:
            return
        for name in fields:
            walk(f"{prefix}.{name}", getattr(obj, name))

    if m.design.charger is not None:
        walk("charger", m.design.charger)
    for c in m.netlist.components.values():
        if c.part is None:
            continue
        if c.kind == "resistor" and c.part.tol > 0:
            out.append(f"{c.refdes}.value")
        if c.kind in ("fet", "fet_pair_common_drain") and any(
                r.typ is not None and r.max is not None and r.max > r.typ for r in c.part.rds_on):
            out.append(f"{c.refdes}.rds_on")
        walk(c.refdes, c.part)
    return out


def run_yield(m: "DesignModel", samples: int, seed: int = DEFAULT_SEED,
              distribution: Distribution = "uniform") -> YieldResult:
    """``samples`` builds of the design, and the share of them failing each check."""
    if samples < 1:
        raise ValueError("samples must be at least 1")
    # A sense path of zero resistance gives an infinite trip current: that build never trips,
    # which the checks count as it should, without numpy's warnings on the way.
    with np.errstate(divide="ignore", invalid="ignore"):
        return _run(m, samples, seed, distribution)


def _run(m: "DesignModel", samples: int, seed: int, distribution: Distribution) -> YieldResult:
    p, stack, gd = m.protector, m.stack, m.gate_drive
    if p is None or stack is None or gd is None or not m.channels:
        raise YieldError("the Monte Carlo needs a cell stack, a protector and its switches")
    g_net, s_net = p.pins.get("ground"), p.pins.get("sense")
    if not g_net or not s_net:
        raise YieldError(f"{p.refdes} has no ground or sense pin connected")
    pos, neg = m.terminals
    rng = np.random.default_rng(seed)
    a = m.ambient

    # The path's branches, and the parameters behind them.
    params: list[Parameter] = []
    edges: list[tuple[str, str, str]] = []
    for c in stack.cells:
        edges.append((c.refdes, c.pins["pos"], c.pins["neg"]))
    for ch in m.channels:
        edges.append((ch.name, ch.drain, ch.source))
    for c in m._series_parts():
        a1, b1 = c.pins.get("1"), c.pins.get("2")
        if a1 and b1 and a1 != b1:
            edges.append((c.refdes, a1, b1))
    path = LinearPath.build(edges, stack.bottom, pos, neg, keep=(s_net, g_net))
    on_path = set(path.leaves())
    s_node, g_node = path.node(s_net), path.node(g_net)

    oc = Parameter.of(f"{p.refdes}.overcurrent.detect", p.part.overcurrent.detect)
    params.append(oc)
    v_det = draw(rng, oc, samples, distribution)
    cell_drive = p.part.gate_drive == "cell"
    if cell_drive:
        k = stack.series if p.part.cells > 1 else 1
        od = Parameter.of(f"{p.refdes}.overdischarge.detect", p.part.overdischarge.detect)
        ocv = Parameter.of(f"{p.refdes}.overcharge.detect", p.part.overcharge.detect)
        params += [od, ocv]
        vgs_low = draw(rng, od, samples, distribution) * k
        vgs_high = draw(rng, ocv, samples, distribution) * k
    else:
        vgs_low = vgs_high = np.full(samples, float(p.part.gate_drive))

    fixed: dict[str, np.ndarray | float] = {}
    for c in stack.cells:
        if c.refdes not in on_path:
            continue
        t = c.part.internal_resistance
        prm = Parameter.of(f"{c.refdes}.internal_resistance", t, spread_low(t))
        params.append(prm)
        fixed[c.refdes] = draw(rng, prm, samples, distribution)
    for c in m._series_parts():
        if c.refdes not in on_path:
            continue
        if c.kind == "resistor" and c.part.tol > 0:
            prm = Parameter(f"{c.refdes}.value", c.part.value * (1 - c.part.tol / 100),
                            c.part.value, c.part.value * (1 + c.part.tol / 100))
            params.append(prm)
            fixed[c.refdes] = np.maximum(draw(rng, prm, samples, distribution), 1e-9)
        elif c.kind == "ptc":
            prm = Parameter.of(f"{c.refdes}.resistance", c.part.resistance)
            params.append(prm)
            fixed[c.refdes] = np.maximum(draw(rng, prm, samples, distribution), 1e-9)
        else:
            # Fuses, wires, copper: no tolerance given; copper at each case's ambient.
            fixed[c.refdes] = lambda temp, c=c: m.part_resistance(c, temp, "typ")
    spreads: dict[str, np.ndarray] = {}
    tables = {}
    for ch in m.channels:
        # One draw per channel places it in its part's spread at every gate drive and
        # temperature: -1 at the minimum, 0 at typ, +1 at max.
        spread = Parameter(f"{ch.name}.rds_on", -1.0, 0.0, 1.0)
        params.append(spread)
        spreads[ch.name] = draw(rng, spread, samples, distribution)
        hot = ch.part.rds_on_hot_ratio
        tables[ch.name] = ([(r.vgs, r.typ, r.max) for r in ch.part.rds_on],
                           (hot.ratio, hot.at) if hot else (1.5, 125.0))
    package_of = {ch.name: ch.package for ch in m.channels}
    packages = sorted(set(package_of.values()))
    theta = {pk: next(ch.part.theta_ja for ch in m.channels if ch.package == pk) for pk in packages}
    tj_max = {pk: next(ch.part.tj_max for ch in m.channels if ch.package == pk) for pk in packages}

    batch = max(1000, _BATCH_ELEMENTS // max(1, len(path.nodes)) ** 2)
    hot_trip = np.empty(samples)
    cold_trip = np.empty(samples)
    tj_cont = np.empty(samples)
    tj_trip = np.empty(samples)
    fail_cont = np.zeros(samples, bool)
    fail_trip = np.zeros(samples, bool)
    limit = {pk: min(TJ_LIMIT, tj_max[pk]) for pk in packages}
    cont = m.design.load.continuous

    for lo in range(0, samples, batch):
        sl = slice(lo, min(samples, lo + batch))
        nb = sl.stop - sl.start

        def parts(temp: float) -> dict:
            """Every part that is not a switch, at this ambient."""
            return {name: v[sl] if isinstance(v, np.ndarray) else v(temp)
                    for name, v in fixed.items()}

        def bases(vgs: np.ndarray) -> dict:
            return {name: rds_base_batch(tables[name][0], vgs[sl], spreads[name][sl])
                    for name in tables if name in on_path}

        def at(base: dict, tj: dict) -> dict:
            return {name: b * temperature_factor_batch(tj[package_of[name]], *tables[name][1])
                    for name, b in base.items()}

        switches = [ch.name for ch in m.channels if ch.name in on_path]

        # Only the switches change from one solve to the next, and the parts whose resistance
        # follows the ambient (copper, fuses) between the hot and the cold cases: the cells and
        # resistors of a large pack keep their conductances in ``kept`` for all of this batch.
        kept: dict = {}
        by_ambient = [name for name, v in fixed.items() if not isinstance(v, np.ndarray)]

        def sense(r: dict) -> tuple[np.ndarray, dict]:
            v, cur = path.solve(r, nb, wanted=switches, kept=kept, varies=by_ambient)
            return np.abs(v[s_node] - v[g_node]), cur

        hot_parts = parts(a.high)

        def heated(base: dict, current_of) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
            """Self-heated steady state at the highest ambient: (sense R, hottest Tj, failing)."""
            tj = {pk: np.full(nb, a.high) for pk in packages}
            over = np.zeros(nb, bool)
            others = hot_parts
            for _ in range(_THERMAL_ITERATIONS):
                rds = at(base, tj)
                rs, cur = sense({**others, **rds})
                amps = current_of(rs)
                power = {pk: np.zeros(nb) for pk in packages}
                for name, r in rds.items():
                    power[package_of[name]] += (cur[name] * amps) ** 2 * r
                delta = 0.0
                for pk in packages:
                    new = a.high + power[pk] * theta[pk]
                    # Past tj_max there is no steady state to find: runaway, held there.
                    over |= new > tj_max[pk]
                    new = np.minimum(new, tj_max[pk])
                    delta = max(delta, float(np.max(np.abs(new - tj[pk]))))
                    tj[pk] = new
                if delta < _THERMAL_TOLERANCE:
                    break
            hottest = np.max([tj[pk] for pk in packages], axis=0)
            fails = over | np.any([tj[pk] > limit[pk] for pk in packages], axis=0)
            return rs, hottest, fails

        low_drive = bases(vgs_low)
        rs_hot, tj_cont[sl], fail_cont[sl] = heated(low_drive, lambda rs: cont)
        hot_trip[sl] = v_det[sl] / rs_hot
        _, tj_trip[sl], fail_trip[sl] = heated(low_drive, lambda rs: v_det[sl] / rs)
        cold = {pk: np.full(nb, a.low) for pk in packages}
        rs_cold, _ = sense({**parts(a.low), **at(bases(vgs_high), cold)})
        cold_trip[sl] = v_det[sl] / rs_cold

    cell_limit = stack.part.max_current.discharge * stack.parallel
    hot_cond = f"{a.high:g} °C ambient, lowest gate drive, switches heated by the load"
    checks = (
        YieldCheck("trip-current-window", f"nuisance over-current trip at the continuous load "
                   f"({cont:g} A)", hot_cond, int(np.count_nonzero(hot_trip < cont)), samples),
        YieldCheck("trip-current-window", f"over-current trip above the cells' discharge rating "
                   f"({cell_limit:g} A)", f"{a.low:g} °C ambient, highest gate drive",
                   int(np.count_nonzero(cold_trip > cell_limit)), samples),
        YieldCheck("switch-temperature", f"switch junction above its limit at the continuous "
                   f"load ({cont:g} A)", f"{a.high:g} °C ambient; limit {TJ_LIMIT:g} °C or tj_max",
                   int(np.count_nonzero(fail_cont)), samples),
        YieldCheck("switch-temperature", "switch junction above its limit just below the "
                   "over-current trip", f"{a.high:g} °C ambient; limit {TJ_LIMIT:g} °C or tj_max",
                   int(np.count_nonzero(fail_trip)), samples),
    )

    def spread_of(x: np.ndarray) -> dict:
        return {"min": float(np.min(x)), "p50": float(np.median(x)), "max": float(np.max(x))}

    sampled = tuple(prm.name for prm in params if prm.varies)
    # A package's rds_on is sampled channel by channel; every cell of the stack is sampled.
    covered = set(sampled) | {f"{pk}.rds_on" for pk in packages} | {
        f"{c.refdes}.internal_resistance" for c in stack.cells}
    held = tuple(t for t in declared_tolerances(m) if t not in covered)
    figures = {"trip_current_hot": spread_of(hot_trip), "trip_current_cold": spread_of(cold_trip),
               "junction_temperature_continuous": spread_of(tj_cont),
               "junction_temperature_below_trip": spread_of(tj_trip)}
    notes = () if cell_drive else (f"gate drive fixed at {float(p.part.gate_drive):g} V",)
    return YieldResult(samples, seed, distribution, checks, sampled, held, figures, notes)
