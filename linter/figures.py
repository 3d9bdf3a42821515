"""The design's key figures, declared once.

Every key figure the model reports (``DesignModel.figures``) is declared here: its name, its unit,
what a reader calls it, the kind of component a finding about it points at, and where it sits in a
min/typ/max range. The model returns :class:`KeyFigure` values (the declaration with the unrounded
SI value), and every reader iterates over :data:`DECLARED`: the JSON, text, Markdown and HTML
reports and the team policy's figure limits. No report keeps a table of units or labels of its own,
so adding a figure is a line here and a line in the model.

A figure's min/typ/max are its own minimum, typical and maximum, whatever corner produced each
(the highest trip current comes from the lowest sense resistance).
"""

from __future__ import annotations

import math
from typing import Any, Iterable, Mapping

from .records import record

#: The switch packages, where the junction figures point.
SWITCHES = ("fet", "fet_pair_common_drain")

#: A range's ends, in the order tables show them.
ENDS = ("min", "typ", "max")


@record(frozen=True)
class Declared:
    """One key figure: its name (the JSON key), unit and label, and what it belongs to."""

    name: str
    #: the SI unit the value is in, as :func:`packwarden.quantities.format_quantity` takes it;
    #: "" for a count
    unit: str
    #: what a reader calls it; the figures of one range share it ("over-current trip")
    label: str
    #: the kinds of component a finding about the figure points at (the design's first such
    #: component by reference designator); () for the design as a whole
    element: tuple[str, ...] = ()
    #: "min", "typ" or "max" when the figure is one end of a range; "" for a single value
    end: str = ""
    #: shown where a report keeps to a few figures: the summary line of a one-design text run,
    #: and the pull-request comment's table
    headline: bool = False

    @property
    def range(self) -> str:
        """The range's name (``trip_current`` for ``trip_current_min``); a single figure's own."""
        return self.name[:-len(self.end) - 1] if self.end else self.name


def _range(stem: str, unit: str, label: str, element: tuple[str, ...], ends: Iterable[str] = ENDS,
           headline: bool = False) -> list[Declared]:
    return [Declared(f"{stem}_{end}", unit, label, element, end, headline) for end in ends]


#: Every key figure, in the order the model reports them and JSON lists them.
DECLARED: dict[str, Declared] = {d.name: d for d in [
    Declared("component_count", "", "components"),
    Declared("cells", "", "cells", ("cell",)),
    Declared("series", "", "cells in series", ("cell",)),
    Declared("parallel", "", "cells in parallel", ("cell",)),
    # The protector sets the trip and sense figures through its detection voltages and its gate
    # drive; the switches' on-resistance is the sense resistance unless a shunt is fitted.
    *_range("trip_current", "A", "over-current trip", ("protector",), headline=True),
    *_range("sense_resistance", "Ω", "sense resistance", ("protector",)),
    *_range("short_circuit_trip", "A", "short-circuit trip", ("protector",), ("min", "max"),
            headline=True),
    *_range("fast_trip", "A", "fast over-current trip", ("protector",), ("min", "max")),
    Declared("prospective_short_circuit", "A", "prospective short circuit", ("cell",),
             headline=True),
    *_range("gate_drive", "V", "gate drive", ("protector",), ("min", "max"), headline=True),
    # hottest switch junction under the continuous load at the highest ambient (a team policy
    # bounds it, e.g. 100 °C for a product line); a lower bound when the switch runs away
    Declared("switch_tj_continuous", "°C", "hottest switch junction, continuous load", SWITCHES),
    # shelf life of a stored pack: the protector's supply current and the cells' self-discharge
    Declared("storage_months_to_cutoff", "months", "storage to cut-off", ("cell",)),
    Declared("storage_months_cutoff_to_lower_limit", "months",
             "storage from cut-off to the cells' lower limit", ("cell",)),
    # a series stack over one charge cycle: what its least-held level drifts by, what the
    # balancer bleeds from it, the imbalance that leaves at the start of the balancing, and the
    # cells' voltages while the charger holds the stack at its highest with that imbalance
    Declared("balance_drift_per_cycle", "Ah", "cell drift per charge cycle", ("cell",)),
    Declared("balance_removal_per_cycle", "Ah", "balancer bleed per charge cycle", ("resistor",)),
    Declared("balance_imbalance", "Ah", "cell imbalance before balancing (after the service life "
             "where it grows)", ("cell",)),
    *_range("balance_cell_voltage", "V", "cell voltage on the charger with the imbalance",
            ("cell",), ("min", "max")),
    # the temperatures the thermistor inputs stop charging and discharging at, over the stacked
    # tolerances of the thermistor, its bias resistor and the threshold (sensing.py)
    *_range("charge_cold_cutoff", "°C", "charge-inhibit cold", ("ntc",)),
    *_range("charge_hot_cutoff", "°C", "charge-inhibit hot", ("ntc",)),
    *_range("discharge_cold_cutoff", "°C", "discharge cut-off cold", ("ntc",)),
    *_range("discharge_hot_cutoff", "°C", "discharge cut-off hot", ("ntc",)),
    # where the input that acts first releases again, where it gives its release (hysteresis)
    *_range("charge_cold_release", "°C", "charge-inhibit cold release", ("ntc",)),
    *_range("charge_hot_release", "°C", "charge-inhibit hot release", ("ntc",)),
    *_range("discharge_cold_release", "°C", "discharge cut-off cold release", ("ntc",)),
    *_range("discharge_hot_release", "°C", "discharge cut-off hot release", ("ntc",)),
]}


class UndeclaredFigure(KeyError):
    """The model reported a figure that is not in :data:`DECLARED` (a programming error)."""


@record(frozen=True)
class KeyFigure:
    """One figure of one design: its declaration and its value, unrounded."""

    # A batch keeps every design's figures: slots keep each one small, and a worker sends the
    # figure's name, not its declaration, back to the parent process.
    __slots__ = ("declared", "value")

    declared: Declared
    #: an int for a count, else a float in the declared SI unit; None, or not finite, when the
    #: design gives no way to compute it (an open sense path, a switch that runs away)
    value: Any

    @property
    def name(self) -> str:
        return self.declared.name

    @property
    def unit(self) -> str:
        return self.declared.unit

    def __reduce__(self):
        return _key_figure, (self.declared.name, self.value)

    @property
    def known(self) -> bool:
        v = self.value
        return v is not None and not isinstance(v, bool) and math.isfinite(v)


def _key_figure(name: str, value: Any) -> KeyFigure:
    """A pickled key figure, back with the one declaration of its name."""
    return KeyFigure(DECLARED[name], value)


def typed(values: Iterable[tuple[str, Any]]) -> dict[str, KeyFigure]:
    """The model's (name, value) pairs as key figures, by name, in declaration order."""
    found = {}
    for name, value in values:
        declared = DECLARED.get(name)
        if declared is None:
            raise UndeclaredFigure(f"figure '{name}' is not declared in packwarden.figures")
        found[name] = KeyFigure(declared, value)
    return {name: found[name] for name in DECLARED if name in found}


@record
class Row:
    """A line of a figures table: a range's figures by end, or one single figure."""

    #: the range's name, or the single figure's
    range: str
    label: str
    unit: str
    #: the declared ends of the range; ("",) for a single figure
    ends: tuple[str, ...]
    #: the design's figures of this line, by end ("" for a single figure)
    figures: dict[str, KeyFigure]

    @property
    def is_range(self) -> bool:
        return self.ends != ("",)

    def get(self, end: str = "") -> KeyFigure | None:
        return self.figures.get(end)


def rows(figures: Mapping[str, KeyFigure] | None = None, headline: bool = False) -> list[Row]:
    """The declared lines in declaration order, each range once.

    With ``figures``, only the lines the design has, holding its figures; without, every declared
    line with none (the columns of a table over many designs). ``headline`` keeps the few figures
    a short report shows.
    """
    out: dict[str, Row] = {}
    for d in DECLARED.values():
        if headline and not d.headline:
            continue
        row = out.get(d.range)
        if row is None:
            row = out[d.range] = Row(d.range, d.label, d.unit, (), {})
        row.ends += (d.end,)
        if figures is not None and d.name in figures:
            row.figures[d.end] = figures[d.name]
    return [r for r in out.values() if figures is None or r.figures]


def stack_shape(figures: Mapping[str, KeyFigure]) -> str | None:
    """The cell stack as the trade writes it, series then parallel ("4S2P"); None without cells."""
    s, p = figures.get("series"), figures.get("parallel")
    if s is None or p is None or not s.value or not p.value:
        return None
    return f"{s.value}S{p.value}P"
