"""The on-resistance that fits a FET-sensed trip window (issue 18 item 2).

A protector that senses across its switch FETs trips at the detection voltage over their
on-resistance, so one part sets both ends of the window: less R_DS(on) lifts the trip minimum
above the loads, and with it the current the protection permits for ever, the FETs' own heat at
that current (V_det²/R), the cells' pulse, the fuse and the copper. The range is searched as a
factor on the switch FETs' R_DS(on) tables, every row scaled alike (what a FET of the same family
in another die size does), each try judged by linting the design again (:mod:`._fit`): the rules
are the judges, nothing here computes a figure.

One search serves every rule whose finding the on-resistance sets (trip-current-window,
switch-temperature, short-circuit-reach), so their hints name the same range.
"""

from __future__ import annotations

from typing import Any

from packwarden import format_quantity as fq
from packwarden.model.fit import REACH, Interval, scaled_rds_on

from ._fit import Fit

#: How far beyond an edge the rule that closes that side is looked for: past the search's own
#: resolution (``fit.EDGE_RATIO``, 1 %), so the rule named surely fails there.
BEYOND = 1.02

#: The changes the format can describe when no on-resistance fits.
#: A second pair in parallel is not among them: it halves the on-resistance, a factor the
#: search has already tried.
STRUCTURAL = ("instead a shunt-sensed protector (a window as narrow as the detection voltage's "
              "tolerance) or another cell (higher ratings, or more in parallel)")


class RdsFit:
    """What the search found: the factor ``interval`` (None: empty) on the tables of
    ``packages``, the rules failing just below and just above it (when empty: ``below`` fail at
    ``start``, where the trip minimum reaches ``load``, and above it the trip minimum is under
    the load)."""

    def __init__(self, packages: tuple[str, ...], start: float, load: tuple[str, float],
                 interval: Interval | None, below: list[str], above: list[str]):
        self.packages, self.start, self.load = packages, start, load
        self.interval, self.below, self.above = interval, below, above


def loads_to_clear(m: Any, oc: Any) -> list[tuple[str, str, float, tuple]]:
    """The loads the over-current trip minimum must clear: (what, why, current, path)."""
    loads = [("continuous load", "", m.design.load.continuous, ("load", "continuous"))]
    peak = m.design.load.peak
    if peak is not None and peak.duration > oc.delay.low:
        loads.append(("peak load", f", lasting {fq(peak.duration, 's')}, longer than the shortest "
                      f"over-current delay {fq(oc.delay.low, 's')}", peak.current,
                      ("load", "peak", "current")))
    return loads


def fet_sensed(m: Any) -> bool:
    """True when the protector's sense input sees switch channels (no shunt)."""
    return bool(m.sense_elements) and not m.sense_by_shunt


def switch_packages(m: Any) -> tuple[str, ...]:
    return tuple(sorted({ch.package for ch in m.channels if ch.role is not None}))


def _set_by_on_resistance(identity: tuple, packages: tuple[str, ...]) -> bool:
    """A finding the switches' on-resistance sets, which the fitted factor must clear."""
    rule, element, key = identity
    if rule == "trip-current-window":
        return key.startswith(("min-vs-", "max-vs-"))
    if rule == "switch-temperature":
        return element in packages
    return rule == "short-circuit-reach" and key == "weakest-short-uncleared"


def on_resistance_fit(ctx: Any) -> RdsFit | None:
    """The search for the design of ``ctx``; None where none can run (shunt sensing, no
    over-current window, no re-lint here, or a design that does not lint again as it is).
    The rules of one lint share it: it is kept with the lint's re-linter."""
    kept = getattr(ctx.relint, "kept", None)
    if kept is None:
        return _search(ctx, ctx.model)
    if "on-resistance" not in kept:
        kept["on-resistance"] = _search(ctx, ctx.model)
    return kept["on-resistance"]


def _search(ctx: Any, m: Any) -> RdsFit | None:
    p, t = m.protector, m.overcurrent_trip
    if ctx.relint is None or p is None or t is None or not fet_sensed(m) or t.min <= 0:
        return None
    packages = switch_packages(m)
    fit = Fit(ctx.relint, lambda k: scaled_rds_on(m.netlist, packages, k),
              lambda i: _set_by_on_resistance(i, packages))
    if fit.before is None or fit.blockers(1.0) is None:
        return None  # the switches written inline do not lint as they are: no search can run
    what, _, load, _ = max(loads_to_clear(m, p.part.overcurrent), key=lambda w: w[2])
    # the trip minimum goes as 1/R: no factor above the one that brings it to the highest load
    # passes (self-heating moves it a little), so the search starts there and steps down
    start = t.min / load if load > 0 else 1.0
    interval = fit.interval(start)
    if interval is None:
        return RdsFit(packages, start, (what, load), None, _rules(fit.blockers(start)), [])
    return RdsFit(packages, start, (what, load), interval,
                  _rules(fit.blockers(interval.low / BEYOND)),
                  _rules(fit.blockers(interval.high * BEYOND)))


def _rules(blockers: set | None) -> list[str]:
    return sorted({i[0] for i in blockers or ()})


def on_resistance_text(ctx: Any, found: RdsFit) -> str:
    """The fitted range in the form one buys a FET from: the per-channel value at the trip
    minimum's corner (the highest on-resistance) and the factor on the table; or, when empty,
    what closes it from each side and the structural changes."""
    t = ctx.model.overcurrent_trip
    names = ", ".join(found.packages)
    if found.interval is None:
        what, load = found.load
        failing = ", ".join(found.below) or "some rule"
        return (f"no on-resistance of {names} lets every rule pass: at a factor "
                f"{found.start:.3g} on its R_DS(on) table, where the over-current trip min "
                f"reaches the {what} {fq(load, 'A')}, {failing} fail at the current the trip "
                f"max then permits, which only rises as the on-resistance falls (tried down to "
                f"a factor {found.start / REACH:.3g}); more on-resistance leaves the trip min "
                f"below the load; {STRUCTURAL}")
    sides = []
    if found.below:
        sides.append(f"below it {', '.join(found.below)} fails")
    if found.above:
        sides.append(f"above it {', '.join(found.above)} fails")
    side_text = f" ({'; '.join(sides)})" if sides else ""
    op = t.at_min
    now = max(op.rds.values()) if op.rds else 0.0
    k = found.interval
    low, high = fq(now * k.low, "Ω", toward="up"), fq(now * k.high, "Ω", toward="down")
    if low.split(" ")[-1] == high.split(" ")[-1]:
        low = low.split(" ")[0]  # "44.3-44.4 mΩ", as a range is printed on a data sheet
    at = (f"switches ({names}) with R_DS(on) of {low}-{high} per channel at "
          f"{fq(op.vgs, 'V')} gate drive and {op.ambient:.0f} °C (now {fq(now, 'Ω')}), "
          if now > 0 else "")
    return (f"{at}a factor {k.low:.3g}-{k.high:.3g} on {names}'s R_DS(on) table, every row "
            f"alike: every rule passes over that range{side_text}")


def parallel_fits(found: RdsFit) -> bool:
    """Whether a second pair in parallel (half the sense resistance, as a factor 0.5 on the
    table) lands inside the range, so proposing it does not break another rule's window."""
    k = found.interval
    return k is not None and k.low <= 0.5 <= k.high
