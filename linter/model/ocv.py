"""Open-circuit voltage against state of charge, and shelf-life arithmetic.

State of charge (SoC) is a fraction 0..1 everywhere in this module, never a percentage; passing
44 for 44 % is refused rather than read as 4400 %. Capacity is in ampere-hours (Ah), currents in
amperes, voltages in volts per cell, time in months of 730 hours (8760 h / 12, the month the
docs/references.md shelf-life vector uses). Tables are at 25 °C, at rest: a cell under load or freshly
unloaded reads lower, and OCV depends on temperature and history (LiFePO4 shows hysteresis).
"""

from __future__ import annotations

import math
from bisect import bisect_left
from types import MappingProxyType
from typing import Iterable, Literal, Mapping, Sequence, Union

from .cells import DEFAULT_WINDOWS
from ..records import record

__all__ = [
    "OcvTable", "OCV_TABLES", "HOURS_PER_MONTH", "ocv_table", "soc_at_voltage", "voltage_at_soc",
    "ShelfLife", "shelf_life", "self_discharge_at",
]

#: Hours in an average month, 8760 h / 12 [derived]; the docs/references.md vector (3 µA -> 2.19 mAh
#: per month) reproduces only with this value.
HOURS_PER_MONTH = 730.0


def _check_points(points: tuple[tuple[float, float], ...], name: str) -> None:
    if len(points) < 2:
        raise ValueError(f"{name}: an OCV table needs at least two points")
    for s, v in points:
        if not (math.isfinite(s) and math.isfinite(v)):
            raise ValueError(f"{name}: non-finite point ({s}, {v})")
        if not 0.0 <= s <= 1.0:
            raise ValueError(f"{name}: SoC {s:g} is not a fraction 0..1 (percent given?)")
    for (s0, v0), (s1, v1) in zip(points, points[1:]):
        # Both columns strictly increasing, so the table can be read either way round.
        if not s1 > s0:
            raise ValueError(f"{name}: SoC must be strictly increasing, got {s0:g} then {s1:g}")
        if not v1 > v0:
            raise ValueError(
                f"{name}: voltage must rise strictly with SoC, got {v0:g} V at {s0:g} and "
                f"{v1:g} V at {s1:g}; a flat stretch cannot be inverted to a SoC")


def _check_soc(soc: float, name: str) -> None:
    if not 0.0 <= soc <= 1.0:
        raise ValueError(f"{name} must be a fraction 0..1, got {soc!r} (percent given?)")


@record(frozen=True)
class OcvTable:
    """(SoC fraction, volts) points, both strictly increasing, with where they come from."""

    name: str
    points: tuple[tuple[float, float], ...]
    source: str

    def __post_init__(self) -> None:
        _check_points(self.points, self.name)


# NMC cylindrical cell, 25 °C [published: open dataset, docs/references.md "Storage and self-discharge",
# file LUT.h; SoC given there in percent]. The eleven docs/references.md points, plus six more read from
# the same file where the curve bends (below 10 %, near 84 % and 98 %), since linear interpolation
# across those bends would be tens of millivolts off.
_NMC = tuple((pct / 100.0, v) for pct, v in (
    (0.2, 2.535), (1.0, 2.760), (2.2, 2.943), (2.9, 3.013), (5.3, 3.146), (10.0, 3.268),
    (20.2, 3.416), (30.3, 3.562), (40.1, 3.662), (50.3, 3.756), (60.1, 3.840), (70.3, 3.926),
    (80.0, 4.037), (84.0, 4.069), (90.2, 4.091), (98.0, 4.138), (100.0, 4.175)))

# LiFePO4 cylindrical cell, pseudo-OCV at C/32, room temperature [published: open dataset,
# docs/references.md "Storage and self-discharge", README table]. All ten breakpoints of the dataset's
# table at its four-decimal precision; docs/references.md quotes six of them rounded.
_LFP = (
    (0.0, 2.0102), (0.0033, 2.4177), (0.0117, 2.7405), (0.0267, 2.9299), (0.0534, 3.0872),
    (0.0885, 3.1942), (0.2972, 3.2772), (0.9833, 3.3511), (0.9950, 3.4180), (1.0, 3.5981))


def _window_curve(chem: str) -> tuple[tuple[float, float], ...]:
    w = DEFAULT_WINDOWS[chem]
    return ((0.0, w.cutoff), (0.5, w.nominal), (1.0, w.charge))


_NMC_SRC = "[published] open NMC cylindrical-cell dataset (docs/references.md)"
_TABLES = (
    OcvTable("nmc", _NMC, _NMC_SRC),
    # No open LiCoO2 or NCA table was gathered; their curves are close to NMC over 3.4-4.2 V
    # [practice] but differ near empty, so a cell's own table should be preferred.
    OcvTable("lco", _NMC, "[practice] NMC dataset used as an approximation for LiCoO2"),
    OcvTable("nca", _NMC, "[practice] NMC dataset used as an approximation for NCA"),
    OcvTable("lfp", _LFP, "[published] open LiFePO4 cylindrical-cell dataset (docs/references.md)"),
    # Three-point stand-ins: cut-off at empty, nominal at half, charge voltage at full, from the
    # cell-window defaults in cells.py. Good for a rough SoC, not for a cut-off decision.
    OcvTable("lmo", _window_curve("lmo"),
             "[practice] approximation from the cell-window table: cut-off, nominal, charge"),
    OcvTable("lto", _window_curve("lto"),
             "[practice] approximation from the cell-window table: cut-off, nominal, charge"),
)

OCV_TABLES: Mapping[str, OcvTable] = MappingProxyType({t.name: t for t in _TABLES})

TableLike = Union[str, OcvTable, Sequence[Sequence[float]]]


def ocv_table(table: TableLike) -> OcvTable:
    """A chemistry code, an :class:`OcvTable`, or a cell's own (SoC fraction, volts) pairs."""
    if isinstance(table, OcvTable):
        return table
    if isinstance(table, str):
        key = table.strip().lower()
        try:
            return OCV_TABLES[key]
        except KeyError:
            raise KeyError(f"no OCV table for {table!r}; known: {', '.join(OCV_TABLES)}") \
                from None
    pairs = tuple(sorted((float(s), float(v)) for s, v in table))
    return OcvTable("cell", pairs, "cell's own table")


def voltage_at_soc(table: TableLike, soc: float, *, strict: bool = False) -> float:
    """Open-circuit voltage at ``soc`` (fraction), linear between table points.

    Outside the table's SoC span the end voltage is returned, or ValueError with ``strict``.
    """
    t = ocv_table(table)
    _check_soc(soc, "soc")
    xs = [p[0] for p in t.points]
    ys = [p[1] for p in t.points]
    return _interp(xs, ys, soc, strict, "SoC", t.name)


def soc_at_voltage(table: TableLike, voltage: float, *, strict: bool = False) -> float:
    """State of charge (fraction) at open-circuit ``voltage``, the inverse of voltage_at_soc.

    Outside the table's voltage span the end SoC is returned (so a voltage above the top point
    reads as full, one below the bottom point as the lowest tabulated SoC), or ValueError with
    ``strict``.
    """
    t = ocv_table(table)
    if not math.isfinite(voltage):
        raise ValueError(f"voltage must be finite, got {voltage}")
    xs = [p[1] for p in t.points]
    ys = [p[0] for p in t.points]
    return _interp(xs, ys, voltage, strict, "voltage", t.name)


def _interp(xs: list[float], ys: list[float], x: float, strict: bool, what: str,
            name: str) -> float:
    if x <= xs[0] or x >= xs[-1]:
        if strict and (x < xs[0] or x > xs[-1]):
            raise ValueError(f"{what} {x:g} outside the {name} table span {xs[0]:g}..{xs[-1]:g}")
        return ys[0] if x <= xs[0] else ys[-1]
    i = bisect_left(xs, x)
    x0, x1, y0, y1 = xs[i - 1], xs[i], ys[i - 1], ys[i]
    return y0 + (y1 - y0) * (x - x0) / (x1 - x0)


@record(frozen=True)
class ShelfLife:
    """Months from ``start_soc`` to ``end_soc``, and the initial loss rate in Ah per month."""

    months: float
    loss_ah_per_month: float
    self_discharge_ah_per_month: float
    drain_ah_per_month: float
    assumptions: tuple[str, ...]


def shelf_life(capacity_ah: float, start_soc: float, self_discharge_pct_per_month: float,
               drain_currents: Iterable[float] = (), end_soc: float = 0.0, *,
               basis: Literal["capacity", "remaining"] = "capacity",
               hours_per_month: float = HOURS_PER_MONTH) -> ShelfLife:
    """Months a stored cell takes to fall from ``start_soc`` to ``end_soc``.

    Losses: self-discharge at ``self_discharge_pct_per_month`` plus constant drain currents
    (protector supply, leakage), in amperes. With ``basis='capacity'`` (the default, which is how
    the docs/references.md vector is worked) self-discharge is that percentage of the rated capacity
    every month, a constant rate. With ``basis='remaining'`` it is that percentage of the charge
    left, which falls as the cell empties and so gives a longer life.

    For a cut-off voltage rather than a SoC, pass ``end_soc=soc_at_voltage(chem, volts)``.
    Temperature is not modelled here; see :func:`self_discharge_at`.
    """
    if not (capacity_ah > 0.0 and math.isfinite(capacity_ah)):
        raise ValueError(f"capacity_ah must be a finite value > 0, got {capacity_ah}")
    _check_soc(start_soc, "start_soc")
    _check_soc(end_soc, "end_soc")
    if self_discharge_pct_per_month < 0.0 or not math.isfinite(self_discharge_pct_per_month):
        raise ValueError("self_discharge_pct_per_month must be finite and >= 0")
    if not hours_per_month > 0.0:
        raise ValueError("hours_per_month must be > 0")
    drains = tuple(drain_currents)
    if any(i < 0.0 or not math.isfinite(i) for i in drains):
        raise ValueError(f"drain currents must be finite and >= 0 A, got {drains}")
    if basis not in ("capacity", "remaining"):
        raise ValueError(f"basis must be 'capacity' or 'remaining', got {basis!r}")

    rate = self_discharge_pct_per_month / 100.0
    drain = math.fsum(drains) * hours_per_month
    q0 = start_soc * capacity_ah
    qe = end_soc * capacity_ah
    assumptions = [f"{hours_per_month:g} h per month", "drain currents constant over the period"]
    if basis == "capacity":
        sd = rate * capacity_ah
        assumptions.append("self-discharge a constant share of rated capacity per month")
    else:
        sd = rate * q0
        assumptions.append("self-discharge a share of the charge remaining, compounding")
    loss = sd + drain

    if q0 <= qe:
        months = 0.0
    elif basis == "capacity" or rate == 0.0:
        months = (q0 - qe) / loss if loss > 0.0 else math.inf
    else:
        # dQ/dt = -rate·Q - drain  =>  Q(t) + drain/rate = (Q0 + drain/rate)·e^(-rate·t).
        c = drain / rate
        months = math.inf if qe + c == 0.0 else math.log((q0 + c) / (qe + c)) / rate
    return ShelfLife(months, loss, sd, drain, tuple(assumptions))


def self_discharge_at(rate_pct_per_month: float, temp: float, reference: float = 25.0) -> float:
    """Self-discharge rate at ``temp`` °C from one at ``reference`` °C, doubling every 10 K.

    The doubling is a rule of thumb [practice; docs/references.md notes sources disagree widely].
    """
    if rate_pct_per_month < 0.0 or not math.isfinite(rate_pct_per_month):
        raise ValueError("rate_pct_per_month must be finite and >= 0")
    return rate_pct_per_month * 2.0 ** ((temp - reference) / 10.0)
