"""Fuse arithmetic: pulse I²t, pre-arcing time gates, and continuous-current derating.

A fuse standard does not give a curve; it gives gates: at k × I_n the pre-arcing time must lie
between a minimum and a maximum. From gates alone a current for a duration can be called surely
below melting, surely melting, or undecided, because pre-arcing time falls as current rises
[practice: every fuse's time-current curve is monotone]. That monotonicity is the only thing used
by default, so "surely" means surely for any fuse that meets the standard.

Currents in amperes, times in seconds, I²t in A²s.
"""

from __future__ import annotations

import math
from enum import Enum
from typing import Optional

from ..records import record

__all__ = [
    "Gate", "GateSet", "Melt", "MeltVerdict",
    "IEC60127_2_SHEET3", "IEC60127_2_SHEET5", "IEC60127_2_QUICK", "UL248_14", "GATE_SETS",
    "pulse_i2t", "melt_verdict", "pulse_i2t_fraction",
    "CONTINUOUS_DERATING", "max_continuous_current", "linear_ambient_factor",
    "ADIABATIC_TIME", "gates_for", "pre_arcing_time", "MeltLimit", "melt_limit",
    "PTC_HOLD_REFERENCE", "PTC_HOLD_PER_KELVIN", "HoldCurrent", "ptc_hold_current",
]

INF = math.inf
_MIN = 60.0
_HOUR = 3600.0


@record(frozen=True)
class Gate:
    """At ``multiple`` × I_n the pre-arcing time lies in [t_min, t_max] seconds.

    ``t_min = 0`` means no lower bound is given; ``t_max = inf`` means none is given above;
    ``t_min = inf`` means the fuse carries the current indefinitely.
    """

    multiple: float
    t_min: float = 0.0
    t_max: float = INF


@record(frozen=True)
class GateSet:
    """The gates of one fuse standard sheet, with the rated currents it covers and its source."""

    name: str
    gates: tuple[Gate, ...]
    rating_min: float
    rating_max: float
    source: str


# IEC 60127-2 standard sheet 3: time-lag, low breaking capacity, 125 mA-6.3 A [published, as
# reproduced in fuse data sheets; docs/references.md "Fuses"].
IEC60127_2_SHEET3 = GateSet(
    "IEC 60127-2 sheet 3 (time-lag, low breaking capacity)",
    (Gate(1.5, t_min=60 * _MIN), Gate(2.1, t_max=2 * _MIN), Gate(2.75, 0.6, 10.0),
     Gate(4.0, 0.15, 3.0), Gate(10.0, 0.02, 0.3)),
    0.125, 6.3, "[published] IEC 60127-2 sheet 3, as reproduced in fuse data sheets")

# IEC 60127-2 standard sheet 5: time-lag, high breaking capacity, 4-6.3 A [published, as above].
IEC60127_2_SHEET5 = GateSet(
    "IEC 60127-2 sheet 5 (time-lag, high breaking capacity)",
    (Gate(1.5, t_min=60 * _MIN), Gate(2.1, t_max=30 * _MIN), Gate(2.75, 0.75, 80.0),
     Gate(4.0, 0.15, 5.0), Gate(10.0, 0.02, 0.15)),
    4.0, 6.3, "[published] IEC 60127-2 sheet 5, as reproduced in fuse data sheets")

# IEC 60127-2 sheets 1/2, quick-acting [memory]: docs/references.md gives the 2.1-10 In gates; the
# 1.5 In ≥ 60 min gate is recalled as common to the sheets and is [memory] as well. No rating span
# is recorded, so no rating is flagged. Check the sheet before trusting a verdict from this set.
IEC60127_2_QUICK = GateSet(
    "IEC 60127-2 sheets 1/2 (quick-acting)",
    (Gate(1.5, t_min=60 * _MIN), Gate(2.1, t_max=30 * _MIN), Gate(2.75, 0.01, 2.0),
     Gate(4.0, 0.003, 0.3), Gate(10.0, t_max=0.02)),
    0.0, INF, "[memory] IEC 60127-2 sheets 1/2 quick-acting gates")

# UL 248-14, ratings 0-30 A [published, secondary summary]: carries 100 %, opens at 135 % within
# 1 h and at 200 % within 2 min.
UL248_14 = GateSet(
    "UL 248-14 (supplemental fuses)",
    (Gate(1.0, t_min=INF), Gate(1.35, t_max=_HOUR), Gate(2.0, t_max=2 * _MIN)),
    0.0, 30.0, "[published, secondary summary] UL 248-14")

GATE_SETS = {"iec60127-2-sheet3": IEC60127_2_SHEET3, "iec60127-2-sheet5": IEC60127_2_SHEET5,
             "iec60127-2-quick": IEC60127_2_QUICK, "ul248-14": UL248_14}


class Melt(str, Enum):
    """Verdict of a current held for a duration against a gate set."""

    BELOW = "below"          # surely below melting
    MAY_MELT = "may_melt"    # the gates allow either
    MELTS = "melts"          # surely melts


@record(frozen=True)
class MeltVerdict:
    """The verdict, the multiple of I_n, and the pre-arcing time bounds it was judged against."""

    verdict: Melt
    multiple: float
    t_min: float
    t_max: float
    notes: tuple[str, ...]


def pulse_i2t(current: float, duration: float) -> float:
    """I²t of a rectangular pulse, I²·t in A²s [published: definition of Joule integral]."""
    if duration < 0.0 or not math.isfinite(duration) or not math.isfinite(current):
        raise ValueError(f"need a finite current and a finite duration >= 0, got {current}, "
                         f"{duration}")
    return current * current * duration


def melt_verdict(current: float, duration: float, rating: float, gates: GateSet,
                 interpolate: bool = False) -> MeltVerdict:
    """Judge ``current`` held for ``duration`` through a fuse rated ``rating`` against ``gates``.

    Bounds by monotonicity alone: pre-arcing time at k × I_n is at least the t_min of every gate at
    or above k and at most the t_max of every gate at or below k. Below the first gate with a
    t_min, nothing bounds it from above; past the last gate with a t_max, nothing from below.

    ``interpolate=True`` narrows the bounds between neighbouring gates by straight lines in
    log(time) against log(current), the way time-current charts are drawn. That is an assumption
    about the fuse's curve, not something the standard promises, and the verdict says so.
    """
    if not (rating > 0.0 and math.isfinite(rating)):
        raise ValueError(f"rating must be a finite value > 0 A, got {rating}")
    if current < 0.0 or duration < 0.0 or math.isnan(current) or math.isnan(duration):
        raise ValueError("current and duration must be >= 0")
    notes: list[str] = []
    if not gates.rating_min <= rating <= gates.rating_max:
        notes.append(f"rating {rating:g} A outside the {gates.rating_min:g}-"
                     f"{gates.rating_max:g} A covered by {gates.name}")
    k = current / rating
    t_min = max((g.t_min for g in gates.gates if g.multiple >= k), default=0.0)
    t_max = min((g.t_max for g in gates.gates if g.multiple <= k), default=INF)
    if interpolate:
        lo_t, hi_t = _loglog_bounds(k, gates.gates)
        if lo_t is not None and lo_t > t_min:
            t_min = lo_t
        if hi_t is not None and hi_t < t_max:
            t_max = hi_t
        notes.append("bounds interpolated log-log between gates: an assumption about the curve "
                     "between the standard's points")
    if duration < t_min:
        verdict = Melt.BELOW
    elif duration >= t_max:
        verdict = Melt.MELTS
    else:
        verdict = Melt.MAY_MELT
    return MeltVerdict(verdict, k, t_min, t_max, tuple(notes))


def _loglog_bounds(k: float, gates: tuple[Gate, ...]) -> tuple[Optional[float], Optional[float]]:
    ordered = sorted(gates, key=lambda g: g.multiple)
    below = [g for g in ordered if g.multiple <= k]
    above = [g for g in ordered if g.multiple > k]
    if not below or not above or k <= 0.0:
        return None, None
    a, b = below[-1], above[0]
    if a.multiple == k:
        return None, None

    def interp(ya: float, yb: float) -> Optional[float]:
        # Only between two finite, positive bounds; an open end cannot be drawn through.
        if not (0.0 < ya < INF and 0.0 < yb < INF):
            return None
        s = (math.log(k) - math.log(a.multiple)) / (math.log(b.multiple) - math.log(a.multiple))
        return math.exp(math.log(ya) + s * (math.log(yb) - math.log(ya)))

    return interp(a.t_min, b.t_min), interp(a.t_max, b.t_max)


# Repetitive-pulse practice [practice; docs/references.md "Fuses"]: keep each pulse's I²t below about
# 48 % of the melting I²t for 100 pulses and 22 % for 100 000 pulses.
_PULSE_POINTS = ((100.0, 0.48), (100_000.0, 0.22))


def pulse_i2t_fraction(pulses: float) -> float:
    """Largest pulse I²t, as a fraction of the fuse's melting I²t, for ``pulses`` repetitions.

    Straight line in log10(pulses) between the two practice points, held at 0.48 below 100 pulses
    (no data says more is safe) and at 0.22 above 100 000 (fuse makers' curves flatten there; this
    is an assumption and may be generous for many millions of pulses).
    """
    if not pulses >= 1:
        raise ValueError(f"pulses must be >= 1, got {pulses}")
    (n0, f0), (n1, f1) = _PULSE_POINTS
    if pulses <= n0:
        return f0
    if pulses >= n1:
        return f1
    s = (math.log10(pulses) - math.log10(n0)) / (math.log10(n1) - math.log10(n0))
    return f0 + s * (f1 - f0)


#: Continuous current at 25 °C as a fraction of the rating [practice; docs/references.md "Fuses"].
CONTINUOUS_DERATING = 0.75


def max_continuous_current(rating: float, ambient_factor: float = 1.0,
                           base_factor: float = CONTINUOUS_DERATING) -> float:
    """Highest current to run a fuse at continuously: rating × base_factor × ambient_factor.

    ``ambient_factor`` comes from the fuse maker's temperature derating curve; the default 1.0
    applies no ambient derating, because no general slope can be cited (curves differ by type).
    """
    if not (rating > 0.0 and math.isfinite(rating)):
        raise ValueError(f"rating must be a finite value > 0 A, got {rating}")
    for name, f in (("ambient_factor", ambient_factor), ("base_factor", base_factor)):
        if not 0.0 <= f <= 1.0:
            raise ValueError(f"{name} must be within 0..1, got {f}")
    return rating * base_factor * ambient_factor


def linear_ambient_factor(ambient: float, per_kelvin: float, reference: float = 25.0) -> float:
    """1 - per_kelvin·(ambient - reference) above ``reference``, 1 at or below it, floored at 0.

    A straight-line stand-in for a maker's derating curve; ``per_kelvin`` (e.g. 0.005 for
    0.5 %/K) must come from that curve, so it has no default.
    """
    if per_kelvin < 0.0 or not math.isfinite(per_kelvin):
        raise ValueError(f"per_kelvin must be finite and >= 0, got {per_kelvin}")
    return max(0.0, 1.0 - per_kelvin * max(0.0, ambient - reference))


def curve_ambient_factor(ambient: float, points: list[tuple[float, float]]) -> float:
    """A fuse's ambient factor at ``ambient`` °C from its maker's derating curve, given as
    (ambient, factor) points: straight lines between them, 1.0 at 25 °C unless a point gives that
    ambient, flat beyond the coldest and the hottest point."""
    pts, factor = _table_at(points, ambient, 25.0, 1.0)
    return pts[-1][1] if factor is None else factor


def _table_at(points: list[tuple[float, float]], x: float, reference: float,
              at_reference: float) -> tuple[list[tuple[float, float]], float | None]:
    """A derating table read at ``x``: (its points sorted, with (``reference``,
    ``at_reference``) unless a point gives that abscissa; the value by straight lines between
    points, flat below the first, None beyond the last)."""
    table = dict(points)
    table.setdefault(reference, at_reference)
    pts = sorted(table.items())
    if x <= pts[0][0]:
        return pts, pts[0][1]
    for (t0, v0), (t1, v1) in zip(pts, pts[1:]):
        if t0 < x <= t1:
            return pts, v0 + (v1 - v0) * (x - t0) / (t1 - t0)
    return pts, None


# --- the fuse's limit for an event ----------------------------------------------------------------

#: Longest event judged by the constant melting I²t, seconds. Constant melting I²t holds only for
#: short pulses, roughly under 5-10 ms [practice; docs/references.md "Fuses"]; the lower end is
#: taken, so an event of 5 ms or less is a short pulse.
ADIABATIC_TIME = 5e-3


def gates_for(speed: str, rating: float) -> GateSet | None:
    """The standard's gates for a fuse of ``speed`` ('quick_acting' | 'time_lag') and ``rating``.

    Quick-acting: IEC 60127-2 sheets 1/2 [memory]. Time-lag: sheet 3 where its span covers the
    rating (its lower time bounds are at or below sheet 5's, so it is the cautious choice for a
    fuse of unknown breaking capacity), else UL 248-14 up to 30 A, else none.
    """
    if speed == "quick_acting":
        return IEC60127_2_QUICK
    for gates in (IEC60127_2_SHEET3, UL248_14):
        if gates.rating_min <= rating <= gates.rating_max:
            return gates
    return None


def pre_arcing_time(current: float, points: list[tuple[float, float]]) -> float:
    """Pre-arcing time at ``current`` from a part's (current, time) points, seconds.

    Straight lines in log(time) against log(current) between neighbours, as makers draw the
    curves; at or below the lowest current, that point's time (a smaller current never melts
    sooner [practice: every fuse's time-current curve is monotone]); above the highest current,
    0: the points say nothing there.
    """
    pts = sorted(points)
    if not pts or current <= 0.0:
        raise ValueError("need points and a current > 0")
    if current <= pts[0][0]:
        return pts[0][1]
    for (i0, t0), (i1, t1) in zip(pts, pts[1:]):
        if i0 < current <= i1:
            s = (math.log(current) - math.log(i0)) / (math.log(i1) - math.log(i0))
            return math.exp(math.log(t0) + s * (math.log(t1) - math.log(t0)))
    return 0.0


@record(frozen=True)
class MeltLimit:
    """The least I²t that melts a fuse in an event, A²s, and what it rests on, in words.

    ``i2t`` is None when nothing bounds it (no melting I²t and no time-current data)."""

    i2t: float | None
    basis: str
    notes: tuple[str, ...] = ()


def melt_limit(current: float, duration: float, rating: float, speed: str,
               melting_i2t: float | None,
               pre_arcing: list[tuple[float, float]] | None = None) -> MeltLimit:
    """The fuse's limit for ``current`` held for ``duration``: the I²t that melts it then.

    A short pulse (up to :data:`ADIABATIC_TIME`) melts at the melting I²t. A longer event follows
    the time-current behaviour: I² times the pre-arcing time at that current (the part's own
    points where given, else the lower bound of the standard's gates for its speed), never below
    the melting I²t, the least I²t that melts the fuse at any duration (a longer event loses heat
    to the leads and needs more) [practice; docs/references.md "Fuses"].
    """
    if duration <= ADIABATIC_TIME:
        if melting_i2t is None:
            return MeltLimit(None, "a short pulse: the fuse gives no melting I²t")
        return MeltLimit(melting_i2t, "melting I²t (a short pulse)")
    notes: tuple[str, ...] = ()
    k = current / rating
    if pre_arcing:
        t = pre_arcing_time(current, pre_arcing)
        source = "the part's pre-arcing curve"
    else:
        gates = gates_for(speed, rating)
        if gates is None:
            t = 0.0
            source = f"no standard's gates cover a {rating:g} A {speed.replace('_', '-')} fuse"
        else:
            v = melt_verdict(current, duration, rating, gates)
            t, source, notes = v.t_min, f"the {gates.name} gates", v.notes
    curve = current * current * t
    if melting_i2t is not None and melting_i2t >= curve:
        verb = "give" if source.endswith("gates") else "gives"
        return MeltLimit(melting_i2t, f"melting I²t: {source} {verb} no more at {k:.3g} × I_n"
                         if t > 0.0 or source.startswith("the ") else f"melting I²t: {source}",
                         notes)
    if curve <= 0.0:
        return MeltLimit(None, f"{source}, and the fuse gives no melting I²t", notes)
    bound = "" if pre_arcing else "at least "  # the gates bound the time, the part's curve gives it
    return MeltLimit(curve, f"{source}: pre-arcing {bound}{t * 1e3:.4g} ms at {k:.3g} × I_n",
                     notes)


# --- a PTC's hold current at an ambient ----------------------------------------------------------

#: Temperature the data sheet's hold current is given at, °C [practice: PTC tables head their
#: I_hold column at 23 or 25 °C; 25 °C is taken].
PTC_HOLD_REFERENCE = 25.0
#: A PTC's hold current falls with ambient, commonly to 70-80 % at 50-60 °C [practice;
#: docs/references.md "What parts survive over time"]. Without the part's table the cautious end
#: is taken: 70 % at 60 °C, in a straight line from 100 % at 25 °C (0.857 %/K).
PTC_HOLD_PER_KELVIN = 0.30 / (60.0 - PTC_HOLD_REFERENCE)


@record(frozen=True)
class HoldCurrent:
    """A PTC's hold current at an ambient, A, and what it rests on, in words."""

    current: float
    basis: str


def ptc_hold_current(hold: float, ambient: float,
                     points: list[tuple[float, float]] | None = None) -> HoldCurrent:
    """The hold current at ``ambient`` °C of a PTC holding ``hold`` A at 25 °C.

    With the part's (ambient, current) points: straight lines between them and the rated point,
    flat beyond the coldest, and the last two points' line beyond the hottest (floored at 0; the
    words say it is extrapolated). Without points: :func:`linear_ambient_factor` at
    :data:`PTC_HOLD_PER_KELVIN`.
    """
    if not (hold > 0.0 and math.isfinite(hold)):
        raise ValueError(f"hold current must be a finite value > 0 A, got {hold}")
    if not points:
        factor = linear_ambient_factor(ambient, PTC_HOLD_PER_KELVIN, PTC_HOLD_REFERENCE)
        return HoldCurrent(hold * factor, "no hold_derating given: 70 % at 60 °C in a straight "
                                          "line from 25 °C [practice]")
    pts, current = _table_at(points, ambient, PTC_HOLD_REFERENCE, hold)
    if current is not None:
        return HoldCurrent(current, "the part's hold_derating table")
    if len(pts) < 2:  # a table of the rated point alone says nothing about heat
        return HoldCurrent(pts[-1][1], "the part's hold_derating table, one point")
    (t0, i0), (t1, i1) = pts[-2], pts[-1]
    current = max(0.0, i1 + (i1 - i0) * (ambient - t1) / (t1 - t0))
    return HoldCurrent(current, f"the part's hold_derating table, extrapolated beyond its "
                                f"hottest point {t1:g} °C")
