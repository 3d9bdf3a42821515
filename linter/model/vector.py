"""Vector forms of the model's functions, for many builds of one design at once (the yield run).

Each function here is the array twin of a scalar function the lint uses, evaluated for a batch of
builds in one numpy call: the scalar one stays the definition, and tests/model/test_vector.py holds
each twin equal to it on random inputs. Nothing here is physics of its own:

* :func:`rds_on` — :func:`packwarden.model.rdson.rds_on`, at a place in the part's spread;
* :func:`temperature_factor` — :func:`packwarden.model.rdson.temperature_factor`;
* :func:`accelerated_step` — :func:`packwarden.model.thermal.accelerated_step`;
* :class:`LinearPath` — :meth:`packwarden.model.network.Network.solve` of a network whose diodes
  all stay off (the power path with its switches on), compiled once from the very network the
  model builds, and solved for a batch of branch values.

numpy is imported by this module and the yield run only; the linter itself never needs it.
"""

from __future__ import annotations

from typing import Callable, Mapping, Sequence

import numpy as np

from .network import Network, NetworkError
from .rdson import OFF_RATIO, TABLE_TEMP, Point
from .thermal import SECANT_MIN_FALL

__all__ = ["rds_on", "temperature_factor", "accelerated_step", "LinearPath"]


def rds_on(points: Sequence[Point], vgs: np.ndarray, spread: np.ndarray,
           vth: tuple = (None, None, None)) -> np.ndarray:
    """R_DS(on) at 25 °C for a batch of builds, each at its own gate drive and place in the spread.

    ``spread`` is -1 at the part's minimum, 0 at typ, +1 at max (and beyond ±1 in normal tails),
    linear between; at -1, 0 and +1 it is the scalar ``rds_on`` at the ``min``, ``typ`` and
    ``max`` corner: linear in V_GS between rows, held above the highest row, the triode form
    1/(V_GS - V_th) through the lowest row below it (``vth``: the threshold at the min, typ and
    max corner, rdson.threshold_at), an off switch at the threshold, a missing typ or max filled
    as the scalar fills it. Where typ - (max - typ) is not positive the scalar has no minimum;
    here the minimum is then typ / 2, as ``values.spread_low`` floors it.
    """
    rows = []
    for v, typ, mx in points:
        if typ is not None and mx is not None:
            low = typ - (mx - typ)
            low = low if low > 0 else typ / 2
        elif mx is not None:
            typ = low = mx
        else:
            mx = low = typ
        rows.append((abs(v), typ, mx, low))
    rows.sort()
    xs = np.array([r[0] for r in rows])

    def column(i: int, t: float | None) -> np.ndarray:
        ys = np.array([r[i] for r in rows])
        out = np.interp(vgs, xs, ys)
        t = 0.0 if t is None else t
        head = xs[0] - t  # the lowest row's overdrive, as rdson.below_table
        over = vgs - t
        if head <= 0:
            below = np.full_like(out, ys[0] * OFF_RATIO)
        else:
            below = np.where(over * OFF_RATIO <= head, ys[0] * OFF_RATIO,
                             ys[0] * head / np.maximum(over, head / OFF_RATIO))
        return np.where(vgs < xs[0], below, out)

    typ, mx, low = column(1, vth[1]), column(2, vth[2]), column(3, vth[0])
    base = np.where(spread >= 0, typ + spread * (mx - typ), typ + spread * (typ - low))
    return np.maximum(base, 1e-9)


def temperature_factor(tj: np.ndarray, hot_ratio: float, hot_at: float) -> np.ndarray:
    """R_DS(on)(tj) / R_DS(on)(25 °C): the scalar's straight line, floored where it would reach
    zero (the scalar raises there; a build that far out has run away long before)."""
    return np.maximum(1.0 + (hot_ratio - 1.0) * (tj - TABLE_TEMP) / (hot_at - TABLE_TEMP), 1e-3)


def accelerated_step(t: np.ndarray, target: np.ndarray, previous: tuple | None,
                     damping: float = 1.0) -> np.ndarray:
    """The next iterate of each build towards its thermal fixed point: the secant step where it
    is reliable, the plain step elsewhere, decided per build as the scalar decides it."""
    residual = target - t
    plain = t + damping * residual
    if previous is None:
        return plain
    t0, r0 = previous
    dt = t - t0
    moved = dt != 0
    with np.errstate(divide="ignore", invalid="ignore"):
        slope = np.where(moved, (residual - r0) / np.where(moved, dt, 1.0), 0.0)
        secant = t - residual / np.where(slope != 0, slope, -1.0)
    good = moved & (slope <= -SECANT_MIN_FALL) & np.isfinite(slope)
    return np.where(good, secant, plain)


def _minimum_degree(nodes: set[int], adj: Mapping[int, set[int]], ground: int) -> list[int]:
    """An elimination order of ``nodes``: each time the node with the fewest neighbours left (the
    ground and nodes already eliminated do not count; eliminating a node joins its neighbours),
    ties by index so the order is fixed."""
    graph = {i: {j for j in adj.get(i, ()) if j != i and j != ground} for i in adj}
    left, order = set(nodes), []
    while left:
        k = min(left, key=lambda i: (len(graph.get(i, ())), i))
        order.append(k)
        left.discard(k)
        near = graph.pop(k, set())
        for i in near:
            graph[i].discard(k)
            graph[i] |= near - {i}
    return order


class LinearPath:
    """A network compiled for batch solves: the nodes joined to ``ground`` by its linear branches
    (resistors, sources, on switches), each branch a conductance and an EMF that a batch may
    replace by name. Diodes (body diodes included) are open, so this is the model's network as
    its solver settles it when no diode conducts; :meth:`from_network` checks that on the scalar
    solution of the same network.

    ``keep`` names the nets whose voltages are read and those the varying branches (the
    switches) touch. :meth:`stamp` stamps every other branch and eliminates every other node
    once, leaving the Schur complement on the kept nets [published: Kron reduction, exact for a
    linear network]; each :meth:`solve` then adds the varying branches to that small matrix. A
    thermal loop that changes only the switches costs a few kept nodes per step, not the pack.
    """

    def __init__(self, net: Network, ground: str, keep: Sequence[str] | None = None):
        linear, _diodes, index = net.linear_terms()
        n = len(index)
        # The part of the network the ground is joined to; the rest floats and carries nothing
        # a sense pin could read (the scalar solver reports its voltages as None).
        adj: dict[int, set[int]] = {}
        for _, _, p, q, _, _ in linear:
            adj.setdefault(p, set()).add(q)
            adj.setdefault(q, set()).add(p)
        ig = index[ground]
        seen, todo = {ig}, [ig]
        while todo:
            for j in adj.get(todo.pop(), ()):
                if j not in seen:
                    seen.add(j)
                    todo.append(j)
        kept = set(seen) if keep is None else {index[k] for k in keep if k in index} & seen
        # Eliminated nodes first, kept nodes last: elimination of the first block leaves the
        # Schur complement in the last. The first block goes in minimum-degree order, worked out
        # once on the graph, which keeps fill small on the ladder-like graph of a big pack (as
        # the scalar solver orders its own elimination).
        order = _minimum_degree({i for i in seen if i != ig and i not in kept}, adj, ig) + sorted(
            i for i in seen if i != ig and i in kept)
        self.nets = dict(index)
        self.position = {i: k for k, i in enumerate(order)}
        self.eliminated = len(order) - len(kept - {ig})
        self.kept = order[self.eliminated:]
        self.ground = ig
        self.branches = [(name, sign, p, q) for name, sign, p, q, _, _ in linear]
        self.g = {name: g for name, _, _, _, g, _ in linear}
        self.e = {name: e for name, _, _, _, _, e in linear}
        self.size = n

    @classmethod
    def from_network(cls, net: Network, ground: str,
                     keep: Sequence[str] | None = None) -> "LinearPath":
        """Compile ``net``; refused when a diode conducts in its scalar solution (the batch
        solve would then not be the model's)."""
        sol = net.solve(ground=ground)
        if sol.conducting_diodes:
            raise NetworkError(f"a diode conducts in the path "
                               f"({', '.join(sorted(sol.conducting_diodes))}): its builds cannot "
                               f"be solved as a linear network")
        return cls(net, ground, keep)

    def stamp(self, ohms: Mapping[str, np.ndarray | float], builds: int,
              skip: frozenset | set = frozenset()) -> tuple:
        """Every branch not in ``skip`` stamped, with the resistances ``ohms`` gives by name (one
        per build, or one for all) and the network's own for the rest, and every node that is
        not kept eliminated: (matrix and right-hand side on the kept nodes, conductances used).

        The branches in ``skip`` must join kept nodes (or the ground) only.
        """
        e = self.eliminated
        # The matrix as rows of neighbour -> entry (a number, or one per build): a pack's graph
        # is sparse, and eliminating a node touches only its neighbours.
        rows: dict[int, dict[int, np.ndarray | float]] = {k: {} for k in range(len(self.position))}
        rhs: dict[int, np.ndarray | float] = {}
        used: dict[str, np.ndarray | float] = {}
        for name, _, p, q in self.branches:
            if name in skip:
                if any(i in self.position and self.position[i] < e for i in (p, q)):
                    raise NetworkError(f"{name} varies but joins a node that is eliminated")
                continue
            g = 1.0 / ohms[name] if name in ohms else self.g[name]
            used[name] = g
            em = self.e[name]
            pp, pq = self.position.get(p), self.position.get(q)
            for x, y, sign in ((pp, pq, 1.0), (pq, pp, -1.0)):
                if x is None:
                    continue
                row = rows[x]
                row[x] = row.get(x, 0.0) + g
                if y is not None:
                    row[y] = row.get(y, 0.0) - g
                if em:
                    rhs[x] = rhs.get(x, 0.0) + sign * g * em
        # Eliminate the first block, each node's row folded into its neighbours' (Gaussian
        # elimination without pivoting: the grounded Laplacian is symmetric and diagonally
        # dominant, so none is needed [published: the textbook result the scalar solver also
        # relies on]).
        for k in range(e):
            row = rows.pop(k)
            pivot = row.pop(k)
            rk = rhs.pop(k, 0.0)
            for i, aik in row.items():
                f = aik / pivot
                target = rows[i]
                del target[k]
                for j, akj in row.items():
                    target[j] = target.get(j, 0.0) - f * akj
                if not (isinstance(rk, float) and rk == 0.0):
                    rhs[i] = rhs.get(i, 0.0) - f * rk
        m = len(self.kept)
        a = np.zeros((m, m, builds))
        b = np.zeros((m, builds))
        for i, row in rows.items():
            for j, v in row.items():
                a[i - e, j - e] = v
            if i in rhs:
                b[i - e] = rhs[i]
        return a, b, used

    def solve(self, ohms: Mapping[str, np.ndarray | float], builds: int,
              fixed: tuple | None = None) -> tuple[np.ndarray, Callable[[str], np.ndarray]]:
        """Node voltages (one row per net of the compiled network; NaN for floating and
        eliminated nets) and the branch currents (a function of the branch name: current a -> b
        through the branch, as ``Solution.current`` gives it) of ``builds`` builds.

        ``ohms`` sets the resistances of branches by name over ``fixed`` (from :meth:`stamp`,
        which must have skipped them); without ``fixed`` every other branch has the network's
        value.
        """
        if fixed is None:
            fixed = self.stamp({}, builds, skip=set(ohms))
        a0, rhs0, used0 = fixed
        a, rhs = a0.copy(), rhs0.copy()
        used = dict(used0)
        e = self.eliminated
        for name, _, p, q in self.branches:
            if name in ohms:
                g = 1.0 / np.asarray(ohms[name], dtype=float)
                used[name] = g
                self._stamp_one(a, rhs, p, q, g, self.e[name], offset=e)
        m = len(self.kept)
        for k in range(m):
            if k + 1 < m:
                f = a[k + 1:, k] / a[k, k]
                a[k + 1:, k + 1:] -= f[:, None, :] * a[k, None, k + 1:]
                rhs[k + 1:] -= f * rhs[k]
        x = np.zeros((m, builds))
        for k in range(m - 1, -1, -1):
            acc = rhs[k] - np.einsum("jb,jb->b", a[k, k + 1:], x[k + 1:]) if k + 1 < m else rhs[k]
            x[k] = acc / a[k, k]
        # Nets the ground does not reach float: no voltage, as the scalar solution has None.
        v = np.full((self.size, builds), np.nan)
        v[self.ground] = 0.0
        for k, i in enumerate(self.kept):
            v[i] = x[k]
        where = {name: (sign, p, q) for name, sign, p, q in self.branches}

        def current(name: str) -> np.ndarray:
            if name not in where:
                raise NetworkError(f"unknown branch {name!r}")
            sign, p, q = where[name]
            return sign * used[name] * (v[p] - v[q] - self.e[name])

        return v, current

    def _stamp_one(self, a, rhs, p, q, g, e, offset: int = 0) -> None:
        # Current p -> q through the branch is g·(V_p - V_q - e): its Norton form.
        pp, pq = self.position.get(p), self.position.get(q)
        pp = None if pp is None else pp - offset
        pq = None if pq is None else pq - offset
        if pp is not None:
            a[pp, pp] += g
            if e:
                rhs[pp] += g * e
        if pq is not None:
            a[pq, pq] += g
            if e:
                rhs[pq] -= g * e
        if pp is not None and pq is not None:
            a[pp, pq] -= g
            a[pq, pp] -= g

    def voltage(self, v: np.ndarray, net: str) -> np.ndarray:
        return v[self.nets[net]]
