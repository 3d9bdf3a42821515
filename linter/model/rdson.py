"""MOSFET on-resistance as a function of gate drive, junction temperature and corner.

A data sheet gives R_DS(on) at a few gate voltages at 25 °C, as typical and/or maximum, and a
normalised curve of R_DS(on) against junction temperature. The rules need one number for a given
gate drive, temperature and corner, plus the list of assumptions that number rests on, so a finding
can tell the reviewer what the tool had to guess.

Resistances in ohms, voltages in volts, temperatures in °C.
"""

from __future__ import annotations

import math
from typing import Iterable, Literal, Optional, Sequence

from ..records import record

__all__ = ["RdsOnResult", "Corner", "Point", "rds_on", "temperature_factor", "DEFAULT_HOT_RATIO",
           "OFF_RATIO", "threshold_at", "below_table"]

Corner = Literal["typ", "max", "min"]
#: One data sheet row: (V_GS, typ, max), typ or max None where the sheet leaves it blank.
Point = tuple[float, Optional[float], Optional[float]]

#: Data-sheet R_DS(on) tables are specified at this junction temperature [practice].
TABLE_TEMP = 25.0
#: R_DS(on) at 125 °C over its 25 °C value where a part gives no ratio, and that temperature
#: [practice: 1.4-1.6 for 20 V parts, docs/references.md "MOSFETs"].
DEFAULT_HOT_RATIO = (1.5, 125.0)
#: A channel at or just above its threshold is off: its resistance is taken as this many times the
#: lowest row's, large and finite, so a solver that drives the gate down (a collapsing short) sees
#: a switch that stops conducting rather than a division by zero [derived: the triode form below
#: reaches this ratio 1/1000 of the row's overdrive above the threshold].
OFF_RATIO = 1000.0


@record(frozen=True)
class RdsOnResult:
    """On-resistance in ohms, what had to be assumed to get it, and whether data was stretched.

    ``extrapolated`` is true when the gate voltage lies below the lowest tabulated one or the
    junction temperature lies outside 25 °C..``hot_at``: the number then rests on a model beyond
    the data sheet's own points. ``below_table`` is true for the first of these (the gate drive
    the table does not reach), ``below_threshold`` when the drive does not lift the channel
    clear of its threshold: the value is then :data:`OFF_RATIO` times the lowest row's, an off
    switch.
    """

    value: float
    assumptions: tuple[str, ...]
    extrapolated: bool
    below_table: bool = False
    below_threshold: bool = False


@record(frozen=True)
class _Filled:
    vgs: float
    typ: float
    max: float
    min: Optional[float]
    notes: tuple[str, ...]

    def corner(self, corner: str) -> float:
        value = {"typ": self.typ, "max": self.max, "min": self.min}[corner]
        if value is None:
            raise ValueError(
                f"no minimum R_DS(on) at V_GS {self.vgs:g} V: max is more than twice typ, so "
                f"typ - (max - typ) is not positive; give the data sheet minimum")
        return value


def rds_on(points: Iterable[Point], vgs: float, tj: float, hot_ratio: float,
           hot_at: float = 125.0, corner: Corner = "typ",
           vth: Optional[float] = None) -> RdsOnResult:
    """R_DS(on) at gate drive ``vgs`` and junction temperature ``tj`` for a corner.

    ``points`` are ``(vgs, typ, max)`` rows at 25 °C with ``typ`` or ``max`` possibly None.
    ``hot_ratio`` is R_DS(on) at ``hot_at`` °C over R_DS(on) at 25 °C, read off the data sheet's
    normalised curve (docs/references.md gives 1.4-1.6 from 25 to 125 °C for 20 V parts [practice]).

    Gate voltage: linear between rows. Above the highest row the highest row's value is kept: more
    gate drive never raises R_DS(on) of an enhancement MOSFET [practice], so holding the last value
    errs high, never low. Below the lowest row the channel follows the triode form
    R ∝ 1/(V_GS − V_th) through the lowest row (:func:`below_table`), with ``vth`` the gate
    threshold at this corner (:func:`threshold_at`; the ``max`` corner takes V_th max); a line
    through two rows would understate the rise near the threshold.

    Missing corners: typ and max given -> min = typ - (max - typ), a symmetric spread; only max ->
    typ = max and min = max; only typ -> max = typ and min = typ. Each substitution used is listed
    in ``assumptions``.
    """
    if corner not in ("typ", "max", "min"):
        raise ValueError(f"corner must be 'typ', 'max' or 'min', got {corner!r}")
    _finite(vgs=vgs, tj=tj)
    rows = _filled(points)
    assumptions: list[str] = []
    extrapolated = False

    lowest, highest = rows[0], rows[-1]
    below = below_threshold = False
    exact = next((r for r in rows if r.vgs == vgs), None)
    if exact is not None:
        used = (exact,)
        base = exact.corner(corner)
    elif vgs > highest.vgs:
        used = (highest,)
        base = highest.corner(corner)
        assumptions.append(
            f"V_GS above the highest tabulated {highest.vgs:g} V: value held at "
            f"{highest.vgs:g} V (more gate drive never raises R_DS(on); this errs high)")
    elif vgs < lowest.vgs:
        used = (lowest,)
        base, note, below_threshold = below_table(lowest.vgs, lowest.corner(corner), vgs, vth)
        extrapolated = below = True
        assumptions.append(note)
    else:
        i = next(k for k in range(1, len(rows)) if rows[k].vgs > vgs)
        lo, hi = rows[i - 1], rows[i]
        used = (lo, hi)
        base = _line(lo.vgs, lo.corner(corner), hi.vgs, hi.corner(corner), vgs)

    for row in used:
        for note in row.notes:
            if _concerns(note, corner) and note not in assumptions:
                assumptions.append(note)

    factor = temperature_factor(tj, hot_ratio, hot_at)
    if tj > max(hot_at, TABLE_TEMP) or tj < min(hot_at, TABLE_TEMP):
        extrapolated = True
        assumptions.append(
            f"T_J {tj:g} °C outside {TABLE_TEMP:g}-{hot_at:g} °C: temperature factor "
            f"{factor:.3f} continues the straight line through the data sheet's ratio "
            f"{hot_ratio:g} at {hot_at:g} °C")
    value = base * factor
    if not value > 0.0:
        raise ValueError(f"R_DS(on) came out as {value!r} Ω; check the table and temperature")
    return RdsOnResult(value, tuple(assumptions), extrapolated, below, below_threshold)


def threshold_at(vgs_th: Sequence[Optional[float]], corner: str) -> Optional[float]:
    """The gate threshold magnitude at a corner from the data sheet's (min, typ, max), any of them
    None: ``max`` the highest given, ``min`` the lowest, ``typ`` the typical or else the middle of
    the two (p-channel sheets print V_GS(th) negative; a magnitude either way)."""
    given = sorted(abs(v) for v in vgs_th if v is not None)
    if not given:
        return None
    if corner == "max":
        return given[-1]
    if corner == "min":
        return given[0]
    typ = vgs_th[1] if len(vgs_th) > 1 else None
    return abs(typ) if typ is not None else (given[0] + given[-1]) / 2


def below_table(v_low: float, r_low: float, vgs: float,
                vth: Optional[float]) -> tuple[float, str, bool]:
    """R_DS(on) at ``vgs`` below the lowest tabulated gate voltage ``v_low`` (where it is
    ``r_low``): (ohms, the assumption in words, whether the channel is off).

    In the linear (triode) region at small V_DS the channel resistance is
    R_DS = 1/(k·(V_GS − V_th)) [published: Sedra & Smith, Microelectronic Circuits, MOSFET
    triode region; from memory]. Through the lowest row: R = r_low·(v_low − V_th)/(V_GS − V_th).
    Taking the whole of r_low as channel resistance is the highest value this form allows: the
    package and drift resistance, which do not rise, would only dilute the rise. At or within
    (v_low − V_th)/OFF_RATIO of the threshold the channel is off and the value is
    ``OFF_RATIO × r_low``: finite, never negative, and no lower than the curve just above it.
    Without a threshold the form is taken with V_th = 0 (R ∝ 1/V_GS), and said.
    """
    t = 0.0 if vth is None else vth
    unknown = " (no gate threshold given: taken as 0 V, which understates the rise)" if vth is None else ""
    if v_low <= t or (vgs - t) * OFF_RATIO <= v_low - t:
        return r_low * OFF_RATIO, (
            f"V_GS {vgs:.3g} V is not clear of the gate threshold {t:g} V{unknown}: the channel is "
            f"off; its resistance is taken as {OFF_RATIO:g} × the {v_low:g} V row"), True
    value = r_low * (v_low - t) / (vgs - t)
    return value, (
        f"V_GS {vgs:.3g} V below the lowest tabulated {v_low:g} V: R_DS(on) extrapolated as "
        f"1/(V_GS − V_th) with V_th {t:g} V{unknown} through the {v_low:g} V row, "
        f"{value / r_low:.3g} × that row"), False


def temperature_factor(tj: float, hot_ratio: float, hot_at: float = 125.0) -> float:
    """R_DS(on)(tj) / R_DS(on)(25 °C) = 1 + (hot_ratio - 1)·(tj - 25)/(hot_at - 25).

    A straight line through the 25 °C point and the data sheet's ratio at ``hot_at``, continued on
    both sides; below 25 °C it lowers the value, which is what the normalised curves show
    [practice]. Raises ValueError where the line would reach zero or below.
    """
    _finite(tj=tj, hot_ratio=hot_ratio, hot_at=hot_at)
    if hot_ratio <= 0.0:
        raise ValueError(f"hot_ratio must be > 0, got {hot_ratio}")
    if hot_at == TABLE_TEMP:
        raise ValueError(f"hot_at must differ from {TABLE_TEMP:g} °C, the table temperature")
    factor = 1.0 + (hot_ratio - 1.0) * (tj - TABLE_TEMP) / (hot_at - TABLE_TEMP)
    if factor <= 0.0:
        raise ValueError(
            f"the linear temperature model gives a factor of {factor:.3g} at {tj:g} °C; "
            f"the temperature is far outside where it means anything")
    return factor


# The rows of a table as _fill makes them, by table: a thermal balance asks for one part's
# R_DS(on) at many temperatures, and the table is the same every time.
_FILLED: dict[tuple, list[_Filled]] = {}


def _filled(points: Iterable[Sequence[Optional[float]]]) -> list[_Filled]:
    key = tuple(points) if isinstance(points, (list, tuple)) else None
    if key is None or not all(type(row) is tuple and len(row) == 3 and all(
            v is None or (type(v) is float and v != 0.0) for v in row) for row in key):
        return _fill(points)  # what cannot be a key, or a zero whose sign would print
    rows = _FILLED.get(key)
    if rows is None:
        if len(_FILLED) > 256:
            _FILLED.clear()
        rows = _FILLED[key] = _fill(key)
    return rows


def _fill(points: Iterable[Sequence[Optional[float]]]) -> list[_Filled]:
    rows: list[_Filled] = []
    for raw in points:
        if len(raw) != 3:
            raise ValueError(f"each point must be (vgs, typ, max), got {raw!r}")
        vgs, typ, mx = raw
        if vgs is None or not math.isfinite(vgs):
            raise ValueError(f"gate voltage must be a finite number, got {vgs!r}")
        for name, v in (("typ", typ), ("max", mx)):
            if v is not None and not (v > 0.0 and math.isfinite(v)):
                raise ValueError(f"{name} R_DS(on) at {vgs:g} V must be > 0, got {v!r}")
        at = f"at V_GS {vgs:g} V"
        if typ is not None and mx is not None:
            if mx < typ:
                raise ValueError(f"max {mx} Ω below typ {typ} Ω {at}")
            low: Optional[float] = typ - (mx - typ)
            notes = [f"min: {at} no minimum given; min = typ - (max - typ), a symmetric spread"]
            if low <= 0.0:
                # A spread wider than the typical value has no sensible symmetric minimum, and
                # any floor would be invented; only a request for the min corner fails.
                low = None
            rows.append(_Filled(vgs, typ, mx, low, tuple(notes)))
        elif mx is not None:
            rows.append(_Filled(vgs, mx, mx, mx, (
                f"typ: {at} only a maximum given; typ = max",
                f"min: {at} only a maximum given; min = max, which overstates the minimum and so "
                f"understates any current that scales as 1/R_DS(on)")))
        elif typ is not None:
            rows.append(_Filled(vgs, typ, typ, typ, (
                f"max: {at} only a typical value given; max = typ, which understates the "
                f"worst case",
                f"min: {at} only a typical value given; min = typ")))
        else:
            raise ValueError(f"point {at} gives neither typ nor max")
    if not rows:
        raise ValueError("the R_DS(on) table is empty")
    rows.sort(key=lambda r: r.vgs)
    for a, b in zip(rows, rows[1:]):
        if a.vgs == b.vgs:
            raise ValueError(f"gate voltage {a.vgs:g} V appears twice in the table")
    return rows


def _concerns(note: str, corner: str) -> bool:
    return note.startswith(corner + ":")


def _line(x0: float, y0: float, x1: float, y1: float, x: float) -> float:
    return y0 + (y1 - y0) * (x - x0) / (x1 - x0)


def _finite(**values: float) -> None:
    for name, value in values.items():
        if value is None or not math.isfinite(value):
            raise ValueError(f"{name} must be a finite number, got {value!r}")
