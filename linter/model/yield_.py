"""Production yield: a seeded Monte Carlo over every tolerance the design declares.

The worst-case rules ask whether any build *can* fail; a production engineer also asks how many
will. Each sample is one build: every toleranced part value drawn once (uniform within its limits,
or normal with the tolerance as 3σ), then the checks whose inputs carry tolerances evaluated for
that build, each against the limit its rule judges by (``DesignModel.limits``, the project's
options included):

* ``trip-current-window``, nuisance trip: the over-current trip current, at the highest ambient,
  the build's lowest gate drive and the junction temperature the continuous load heats the
  switches to, below the continuous load;
* ``trip-current-window``, trip above the cell rating: the trip current at the lowest ambient and
  the build's highest gate drive above the stack's discharge rating;
* ``switch-temperature``: a switch junction above its limit at the highest ambient, at the
  continuous load and at the highest current the protection lets through (just below the trip,
  at the build's lowest and highest gate drive, the hotter kept);
* ``threshold-ladder``: the charger's per-cell voltage above the cell's upper limit, the overcharge
  detection within the charge margin of the charger, the overcharge detection above the cell's
  overcharge limit, and the over-discharge detection below the cell's lower limit.

No physics here: the network is the one the model builds (``DesignModel.network``, every part of
the path at its typical value), compiled once and solved for all builds at once, and the
on-resistance, temperature factor and thermal fixed points are the model's functions in their
vector form (:mod:`packwarden.model.vector`, each held equal to its scalar twin by a test).

numpy is imported by this module and the vector forms only; the linter itself never needs it.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, Callable, Literal

import numpy as np

from ..records import record
from ..schema import Toleranced
from . import gate, thermal, vector
from .network import NetworkError
from .rdson import DEFAULT_HOT_RATIO, threshold_at
from .values import SIGNAL_OHMS, Span, corner_value

if TYPE_CHECKING:  # pragma: no cover
    from .design import DesignModel

__all__ = ["Distribution", "draw", "wilson_interval", "YieldCheck", "YieldResult", "YieldError",
           "run_yield", "declared_tolerances", "DEFAULT_SEED", "Z_95"]

Distribution = Literal["uniform", "normal"]
#: Seed used when none is given, so two runs of the same design agree [derived: any fixed value].
DEFAULT_SEED = 20240601
#: Two-sided 95 % standard normal quantile, Φ⁻¹(0.975) [published: standard normal table].
Z_95 = 1.959963984540054
# Builds per numpy batch: keeps the (kept nodes × kept nodes × batch) array of the switches'
# solves near 160 MB and lets a small pack run in one batch [derived: 8 bytes × 40² × 12 500].
_BATCH_ELEMENTS = 20_000_000
# The comparisons of threshold-ladder, with its rounding allowance [derived: as the rule].
_EPS = 1e-9


class YieldError(ValueError):
    """The design lacks what the Monte Carlo needs (a protector, a sense path...)."""


# --- drawing ---------------------------------------------------------------------------------------

def draw(rng: np.random.Generator, span: Span, n: int, distribution: Distribution) -> np.ndarray:
    """``n`` values of a quantity whose spread is ``span``.

    ``uniform``: uniform between min and max. ``normal``: centred on typ with each side's
    tolerance as 3σ (a split normal where typ is off centre), not truncated, so about 0.27 % of
    builds fall outside the data-sheet limits, as parts of a 3σ process do [published: normal
    distribution, P(|Z| > 3) = 0.0027].
    """
    if not span.max > span.min:
        return np.full(n, span.typ)
    if distribution == "uniform":
        return rng.uniform(span.min, span.max, n)
    if distribution == "normal":
        z = rng.standard_normal(n)
        return span.typ + np.where(z >= 0, z * (span.max - span.typ),
                                   z * (span.typ - span.min)) / 3.0
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
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        return _Run(m, samples, seed, distribution).result()


class _Run:
    """One Monte Carlo run: the draws, the compiled path and the checks of one design."""

    def __init__(self, m: "DesignModel", samples: int, seed: int, distribution: Distribution):
        p, stack, gd = m.protector, m.stack, m.gate_drive
        if p is None or stack is None or gd is None or not m.channels:
            raise YieldError("the Monte Carlo needs a cell stack, a protector and its switches")
        self.g_net, self.s_net = p.pins.get("ground"), p.pins.get("sense")
        if not self.g_net or not self.s_net:
            raise YieldError(f"{p.refdes} has no ground or sense pin connected")
        self.m, self.samples, self.seed, self.distribution = m, samples, seed, distribution
        self.rng = np.random.default_rng(seed)
        self.sampled: list[str] = []

        # The path as the model builds it, every part typical; compiled once.
        typ_rds = {ch.name: m.channel_rds(ch, gd.typ, 25.0, "typ")[0] for ch in m.channels}
        emf = m.cell_limits.nominal if m.cell_limits else 3.6
        net = m.network(typ_rds, cell_emf=emf, cell_r=stack.part.internal_resistance.nominal,
                        temp=25.0, corner="typ")
        pos, neg = m.terminals
        keep = {self.s_net, self.g_net, pos, neg}
        keep.update(n for ch in m.channels for n in (ch.drain, ch.source))
        # Each channel's source lift off its drive's rail (gate.py), read from the same solves.
        self.lifts = gate.lift_nets(m.topology, m.high_side)
        keep.update(n for pair in self.lifts.values() for n in pair)
        try:
            self.path = vector.LinearPath.from_network(net, stack.bottom, sorted(keep))
        except NetworkError as exc:
            raise YieldError(f"the power path cannot be solved for many builds: {exc}") from None
        for pin, net_name in (("sense", self.s_net), ("ground", self.g_net)):
            index = self.path.nets.get(net_name)
            if index is None or (index not in self.path.kept and index != self.path.ground):
                raise YieldError(f"{p.refdes}'s {pin} pin (net {net_name}) is not joined to the "
                                 f"power path")

        # The draws, in a fixed order so a seed repeats.
        part = p.part
        self.v_det = self.draw(f"{p.refdes}.overcurrent.detect", part.overcurrent.detect)
        self.od = self.draw(f"{p.refdes}.overdischarge.detect", part.overdischarge.detect)
        self.oc = self.draw(f"{p.refdes}.overcharge.detect", part.overcharge.detect)
        self.cell_drive = part.gate_drive == "cell"
        # The gate swings with the cell voltage: from the over-discharge detection to the
        # overcharge detection of this build, as DesignModel.gate_drive; a fixed drive is capped
        # by that stack voltage unless its driver is boosted.
        k = stack.series if part.cells > 1 else 1
        self.vgs_low, self.vgs_high = self.od * k, self.oc * k
        if not self.cell_drive:
            fixed = np.full(samples, float(part.gate_drive))
            if part.gate_drive_boosted:
                self.vgs_low = self.vgs_high = fixed
            else:
                self.vgs_low = np.minimum(fixed, self.vgs_low)
                self.vgs_high = np.minimum(fixed, self.vgs_high)
        self.fixed: dict[str, np.ndarray] = {}
        for c in stack.cells:
            t = c.part.internal_resistance
            self.fixed[c.refdes] = self.draw(f"{c.refdes}.internal_resistance",
                                             Span(corner_value(t, "min"), t.nominal, t.high))
        # Resistors above SIGNAL_OHMS (supply filters, sense-pin resistors) carry no load current
        # in the probe solve, so their spread moves no figure: they stay at typ, and are listed
        # as declared but not entering the checks.
        self.by_ambient: list = []
        for c in m.path_parts:
            if c.refdes not in self.path.g:
                continue  # not in the network the model builds (a signal part off the path)
            if c.kind == "resistor" and c.part.tol > 0 and c.part.value <= SIGNAL_OHMS:
                span = Span(m.part_resistance(c, 25.0, "min"), m.part_resistance(c, 25.0, "typ"),
                            m.part_resistance(c, 25.0, "max"))
                self.fixed[c.refdes] = np.maximum(self.draw(f"{c.refdes}.value", span), 1e-9)
            elif c.kind == "ptc":
                self.fixed[c.refdes] = np.maximum(
                    self.draw(f"{c.refdes}.resistance", Span.of(c.part.resistance)), 1e-9)
            else:
                # Fuses, wires, copper, exact resistors: no tolerance given; copper follows the
                # ambient of each case.
                self.by_ambient.append(c)
        self.spread: dict[str, np.ndarray] = {}
        self.tables: dict[str, tuple] = {}
        self.thresholds: dict[str, tuple] = {}
        for ch in m.channels:
            # One draw per channel places it in its part's spread at every gate drive and
            # temperature: -1 at the minimum, 0 at typ, +1 at max.
            self.spread[ch.name] = self.draw(f"{ch.name}.rds_on", Span(-1.0, 0.0, 1.0))
            hot = ch.part.rds_on_hot_ratio
            self.tables[ch.name] = ([(r.vgs, r.typ, r.max) for r in ch.part.rds_on],
                                    (hot.ratio, hot.at) if hot else DEFAULT_HOT_RATIO)
            t = ch.part.vgs_th
            self.thresholds[ch.name] = tuple(threshold_at((t.min, t.typ, t.max), c)
                                             for c in ("min", "typ", "max"))
        ch = m.design.charger
        self.charger = (self.draw("charger.voltage", ch.voltage) / stack.series
                        if ch is not None else None)

    def draw(self, name: str, t: Toleranced | Span) -> np.ndarray:
        span = t if isinstance(t, Span) else Span.of(t)
        if span.max > span.min:
            self.sampled.append(name)
        return draw(self.rng, span, self.samples, self.distribution)

    # --- one batch of builds --------------------------------------------------------------------

    def parts(self, sl: slice, temp: float) -> dict:
        """Every part of the path that is not a switch, for the builds of ``sl`` at ``temp``."""
        out = {name: v[sl] for name, v in self.fixed.items()}
        for c in self.by_ambient:
            out[c.refdes] = self.m.part_resistance(c, temp, "typ")
        return out

    def rds_base(self, sl: slice, vgs: dict) -> dict:
        """Each channel's 25 °C on-resistance for the builds of ``sl``, at its own drive (channel
        name -> the batch's V_GS) and place in the spread (vector.rds_on, as path.channel_rds
        reads the table)."""
        return {name: vector.rds_on(points, vgs[name], self.spread[name][sl], self.thresholds[name])
                for name, (points, _) in self.tables.items()}

    def channel_vgs(self, drive: np.ndarray, lift: dict, amps: np.ndarray) -> dict:
        """Each channel's V_GS at ``amps`` pack current: the drive less its source's lift, as
        gate.channel_vgs."""
        return {name: drive - lift[name] * amps if name in lift else drive for name in self.tables}

    def rds(self, base: dict, tj: dict) -> dict:
        """The channels' on-resistance at their junction temperatures (× the temperature factor
        of vector.temperature_factor, as path.channel_rds)."""
        package = {ch.name: ch.package for ch in self.m.channels}
        return {name: b * vector.temperature_factor(tj[package[name]], *self.tables[name][1])
                for name, b in base.items()}

    def solve(self, fixed: tuple, rds: dict, nb: int) -> tuple[np.ndarray, dict, np.ndarray, dict]:
        """(sense resistance, channel current shares, load current, each channel's source lift
        per ampere) of the path with the probe load, as PowerPath.solve and
        gate.lift_per_ampere read them."""
        v, current = self.path.solve(rds, nb, fixed)
        i_load = np.abs(current("(load)"))
        sense = np.abs(self.path.voltage(v, self.s_net) - self.path.voltage(v, self.g_net)) / i_load
        sense = np.where(np.isfinite(sense), sense, np.inf)
        share = {name: np.abs(current(name)) / i_load for name in rds}
        lift = {}
        for name, (a, b) in self.lifts.items():
            dv = self.path.voltage(v, a) - self.path.voltage(v, b)
            lift[name] = np.where((dv > 0) & (i_load > 0), dv / np.where(i_load > 0, i_load, 1.0), 0.0)
        return sense, share, i_load, lift

    def settled(self, old: dict, new: dict) -> np.ndarray:
        """Builds whose channel drives all moved by less than gate.VGS_TOLERANCE."""
        return np.all([np.abs(new[k] - old[k]) < gate.VGS_TOLERANCE for k in new], axis=0)

    def heated(self, sl: slice, nb: int, fixed: tuple, vgs: np.ndarray, ambient: float,
               current_of: Callable[[np.ndarray], np.ndarray], permitted: bool):
        """The self-heated steady state of each build: (sense resistance, hottest junction,
        junction over its limit or runaway, each package's junction temperature).

        ``permitted`` False: a fixed current, as PowerPath.operating_point (plain and secant
        steps held at tj_max; past tj_max is runaway). True: the current just below the trip,
        as stress.permitted_current_heat (damped steps; runaway past tj_max + a margin or
        without convergence). Each channel's V_GS is taken at that current (gate.py).
        """
        m = self.m
        packages = sorted({ch.package for ch in m.channels})
        parts = {ch.package: ch.part for ch in m.channels}
        tj = {pk: np.full(nb, ambient) for pk in packages}
        done = np.zeros(nb, bool)
        runaway = np.zeros(nb, bool)
        previous: dict | None = None
        iterations = thermal.TRIP_ITERATIONS if permitted else thermal.LOAD_ITERATIONS
        sense = np.full(nb, np.inf)
        drive = vgs[sl]
        vg = self.channel_vgs(drive, {}, 0.0)
        for _ in range(iterations):
            rds = self.rds(self.rds_base(sl, vg), tj)
            rs, share, _, lift = self.solve(fixed, rds, nb)
            sense = np.where(done, sense, rs)
            amps = current_of(rs)
            new_vg = self.channel_vgs(drive, lift, amps)
            vg_settled = self.settled(vg, new_vg)
            power = {pk: np.zeros(nb) for pk in packages}
            for ch in m.channels:
                power[ch.package] += (share[ch.name] * amps) ** 2 * rds[ch.name]
            target = {pk: ambient + power[pk] * parts[pk].theta_ja for pk in packages}
            if permitted:
                delta = np.max([np.abs(target[pk] - tj[pk]) for pk in packages], axis=0)
                settled = ~done & (delta < thermal.TJ_TOLERANCE) & vg_settled
                over = np.zeros(nb, bool)
            else:
                over = ~done & np.any([target[pk] > parts[pk].tj_max for pk in packages], axis=0)
                delta = np.max([np.abs(target[pk] - tj[pk]) for pk in packages], axis=0)
                settled = ~done & ~over & (delta < thermal.TJ_TOLERANCE) & vg_settled
            # A build that settles or runs away keeps the last target, as the scalar loop does.
            ending = settled | over
            for pk in packages:
                tj[pk] = np.where(ending, target[pk], tj[pk])
            runaway |= over
            done |= ending
            vg = {k: np.where(done, vg[k], new_vg[k]) for k in vg}
            if done.all():
                break
            damping = thermal.TRIP_DAMPING if permitted else 1.0
            step = {}
            for pk in packages:
                prev = None if previous is None else previous[pk]
                s = vector.accelerated_step(tj[pk], target[pk], prev, damping)
                step[pk] = s if permitted else np.minimum(s, parts[pk].tj_max)
            previous = {pk: (tj[pk], target[pk] - tj[pk]) for pk in packages}
            for pk in packages:
                tj[pk] = np.where(done, tj[pk], step[pk])
            if permitted:
                far = ~done & np.any([tj[pk] > parts[pk].tj_max + thermal.RUNAWAY_MARGIN
                                      for pk in packages], axis=0)
                runaway |= far
                done |= far
        runaway |= ~done  # no steady state within the iterations
        hottest = np.max([tj[pk] for pk in packages], axis=0)
        limits = m.limits
        fails = runaway | np.any([tj[pk] > limits.junction_ceiling(parts[pk])
                                  for pk in packages], axis=0)
        return sense, hottest, fails, tj

    def unheated(self, sl: slice, nb: int, fixed: tuple, vgs: np.ndarray, tj: dict,
                 v_det: np.ndarray) -> np.ndarray:
        """The sense resistance of each build with the switches held at ``tj`` (package -> °C),
        each channel's drive at the trip current, as PowerPath.operating_point with ``detect``."""
        drive = vgs[sl]
        vg = self.channel_vgs(drive, {}, 0.0)
        sense, done = np.full(nb, np.inf), np.zeros(nb, bool)
        for _ in range(thermal.LOAD_ITERATIONS):
            rs, _, _, lift = self.solve(fixed, self.rds(self.rds_base(sl, vg), tj), nb)
            sense = np.where(done, sense, rs)
            new_vg = self.channel_vgs(drive, lift, v_det / rs)
            done |= self.settled(vg, new_vg)
            vg = {k: np.where(done, vg[k], new_vg[k]) for k in vg}
            if done.all():
                break
        return sense

    def result(self) -> YieldResult:
        m, samples, stack = self.m, self.samples, self.m.stack
        a = m.ambient
        cont = m.design.load.continuous
        switches = {ch.name for ch in m.channels}
        batch = max(1000, _BATCH_ELEMENTS // max(1, len(self.path.kept)) ** 2)
        hot_trip, cold_trip, permitted = np.empty(samples), np.empty(samples), np.empty(samples)
        tj_cont, tj_trip = np.empty(samples), np.empty(samples)
        fail_cont, fail_trip = np.zeros(samples, bool), np.zeros(samples, bool)
        for lo in range(0, samples, batch):
            sl = slice(lo, min(samples, lo + batch))
            nb = sl.stop - sl.start
            hot = self.path.stamp(self.parts(sl, a.max), nb, skip=switches)
            v_det = self.v_det[sl]
            # The continuous load's heat at the highest ambient and lowest drive.
            _, tj_cont[sl], fail_cont[sl], tj_load = self.heated(
                sl, nb, hot, self.vgs_low, a.max, lambda rs: np.full(nb, cont), permitted=False)
            # The trip minimum's point: the switches as the load heats them, each channel's
            # drive at the trip current.
            hot_trip[sl] = v_det / self.unheated(sl, nb, hot, self.vgs_low, tj_load, v_det)
            # Just below the trip, at both ends of the build's drive; the hotter kept.
            _, t_lo, f_lo, _ = self.heated(sl, nb, hot, self.vgs_low, a.max, lambda rs: v_det / rs,
                                        permitted=True)
            _, t_hi, f_hi, _ = self.heated(sl, nb, hot, self.vgs_high, a.max, lambda rs: v_det / rs,
                                        permitted=True)
            tj_trip[sl], fail_trip[sl] = np.maximum(t_lo, t_hi), f_lo | f_hi
            # The trip maximum's point: the lowest ambient, the highest drive, no heating.
            cold = self.path.stamp(self.parts(sl, a.min), nb, skip=switches)
            cold_trip[sl] = v_det / self.unheated(
                sl, nb, cold, self.vgs_high, {ch.package: np.full(nb, a.min) for ch in m.channels}, v_det)
            # The permitted event's point (events.permitted_point): there, with the switches at
            # the junction temperature the current just below the trip causes.
            rs_ever, _, _, _ = self.heated(sl, nb, cold, self.vgs_high, a.min,
                                           lambda rs: v_det / rs, permitted=True)
            permitted[sl] = v_det / rs_ever

        limits = m.limits
        rating = stack.discharge_rating
        hot_cond = f"{a.max:g} °C ambient, lowest gate drive, switches heated by the load"
        tj_cond = f"{a.max:g} °C ambient; limit {limits.junction:g} °C or tj_max"
        def check(rule: str, what: str, condition: str, failing: np.ndarray) -> YieldCheck:
            return YieldCheck(rule, what, condition, int(np.count_nonzero(failing)), samples)

        checks = [
            check("trip-current-window", f"nuisance over-current trip at the continuous load "
                  f"({cont:g} A)", hot_cond, hot_trip < cont),
            check("trip-current-window", f"current permitted for ever above the cells' "
                  f"discharge rating ({rating:g} A)", f"{a.min:g} °C ambient, highest gate drive, "
                  f"switches heated by that current", permitted > rating),
            check("switch-temperature", f"switch junction above its limit at the continuous load "
                  f"({cont:g} A)", tj_cond, fail_cont),
            check("switch-temperature", "switch junction above its limit just below the "
                  "over-current trip", tj_cond, fail_trip),
        ]
        cl, ladder = m.cell_limits, "threshold-ladder"
        if cl is not None:
            if self.charger is not None:
                checks += [
                    check(ladder, f"charger above the cell's upper limit ({cl.upper_limit:g} V "
                          f"per cell)", "per cell", self.charger > cl.upper_limit + _EPS),
                    check(ladder, f"overcharge detection within {limits.charge_margin * 1e3:g} mV "
                          f"of the charger", "per cell",
                          self.oc < self.charger + limits.charge_margin - _EPS),
                ]
            checks += [
                check(ladder, f"overcharge detection above the cell's overcharge limit "
                      f"({cl.overcharge_limit:g} V)", "per cell",
                      self.oc > cl.overcharge_limit + _EPS),
                check(ladder, f"over-discharge detection below the cell's lower limit "
                      f"({cl.lower_limit:g} V)", "per cell", self.od < cl.lower_limit - _EPS),
            ]

        def spread_of(x: np.ndarray) -> dict:
            return {"min": float(np.min(x)), "p50": float(np.median(x)), "max": float(np.max(x))}

        sampled = tuple(self.sampled)
        # A package's rds_on is sampled channel by channel; every cell of the stack is sampled.
        covered = set(sampled) | {f"{ch.package}.rds_on" for ch in m.channels} | {
            f"{c.refdes}.internal_resistance" for c in stack.cells}
        held = tuple(t for t in declared_tolerances(m) if t not in covered)
        figures = {"trip_current_hot": spread_of(hot_trip), "trip_current_cold": spread_of(cold_trip),
                   "permitted_current": spread_of(permitted),
                   "junction_temperature_continuous": spread_of(tj_cont),
                   "junction_temperature_below_trip": spread_of(tj_trip)}
        if self.charger is not None:
            figures["charger_voltage_per_cell"] = spread_of(self.charger)
        notes = () if self.cell_drive else (
            f"gate drive fixed at {float(m.protector.part.gate_drive):g} V"
            + ("" if m.protector.part.gate_drive_boosted else ", at most the stack voltage"),)
        return YieldResult(samples, self.seed, self.distribution, tuple(checks), sampled, held,
                           figures, notes)
