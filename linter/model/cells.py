"""Default per-chemistry cell voltage windows, used only where a cell data sheet gives none.

The cell maker's data sheet always rules; these defaults let a review proceed, and every value
carries a tag saying how far it can be trusted, so a finding built on one can say so:

* ``[practice]`` a common fact of the trade with no single source;
* ``[memory]`` recalled, not checked against a document;
* ``[published]`` a standard, handbook or open dataset.

The ranges these values were picked from are in docs/references.md, "Cell voltage windows". Where the
table gives a range, the value picked and the reason are beside it. Voltages are per cell, in volts.
"""

from __future__ import annotations

from types import MappingProxyType
from typing import Mapping

from ..records import record

__all__ = ["CellWindow", "DEFAULT_WINDOWS", "CHEMISTRIES", "cell_window"]

_VOLTAGE_FIELDS = ("charge", "nominal", "cutoff", "overcharge_limit", "lower_limit")


@record(frozen=True)
class CellWindow:
    """Voltage window of one chemistry, per cell, in volts.

    ``charge``: constant-voltage charge set point. ``nominal``: the rated mean voltage.
    ``cutoff``: the discharge end voltage the rated capacity is measured to. ``overcharge_limit``:
    the voltage the cell must never reach even when the charger fails, so a protector's overcharge
    detection (with its tolerance) belongs between ``charge`` and this. ``lower_limit``: the voltage
    the cell must never be discharged below, so the over-discharge detection belongs between this
    and ``cutoff`` or above.
    """

    chemistry: str
    charge: float
    nominal: float
    cutoff: float
    overcharge_limit: float
    lower_limit: float
    #: (field, tag and reason) pairs; a tuple rather than a dict keeps the dataclass hashable.
    sources: tuple[tuple[str, str], ...] = ()

    def __post_init__(self) -> None:
        # Ordering is what every rule built on a window relies on; a typo here would silently invert
        # a check, so it is refused at import time.
        if not (self.lower_limit <= self.cutoff < self.nominal < self.charge
                < self.overcharge_limit):
            raise ValueError(
                f"{self.chemistry}: expected lower_limit <= cutoff < nominal < charge < "
                f"overcharge_limit, got {self.lower_limit}, {self.cutoff}, {self.nominal}, "
                f"{self.charge}, {self.overcharge_limit}")
        named = {name for name, _ in self.sources}
        missing = [f for f in _VOLTAGE_FIELDS if f not in named]
        if missing:
            raise ValueError(f"{self.chemistry}: no source given for {', '.join(missing)}")

    def source(self, field: str) -> str:
        """The tag and reason given for one voltage field."""
        for name, text in self.sources:
            if name == field:
                return text
        raise KeyError(f"no voltage field {field!r}; fields are {', '.join(_VOLTAGE_FIELDS)}")


# The LiCoO2 / NMC / NCA row of docs/references.md shares one charge voltage and the same "typical cell
# data sheet" limits: 4.5 V a charger must never exceed and 2.0 V never to discharge below.
_CHARGE_42 = ("charge", "[practice] 4.20 V, docs/references.md cell-window table")
_OVER_45 = ("overcharge_limit",
            "[practice] 4.5 V: a typical cell data sheet says a charger must never exceed 4.5 V "
            "per cell even when faulty (docs/references.md). Not the 4.25 V upper-limit charging "
            "voltage of IEC 62133-2 summaries, which protector overcharge detection (4.25-4.35 V) "
            "sits above")
_LOWER_20 = ("lower_limit",
             "[practice] 2.0 V: a typical cell data sheet says never discharge below 2.0 V")

_WINDOWS = (
    CellWindow(
        "lco", charge=4.20, nominal=3.7, cutoff=3.0, overcharge_limit=4.5, lower_limit=2.0,
        sources=(
            _CHARGE_42,
            ("nominal", "[practice] table gives 3.6-3.7 V; 3.7 V is the usual LiCoO2 rating "
                        "[memory]"),
            ("cutoff", "[memory] table gives 2.5-3.0 V; LiCoO2 cells are usually rated to 3.0 V"),
            _OVER_45, _LOWER_20)),
    CellWindow(
        "nmc", charge=4.20, nominal=3.6, cutoff=2.5, overcharge_limit=4.5, lower_limit=2.0,
        sources=(
            _CHARGE_42,
            ("nominal", "[memory] table gives 3.6-3.7 V; NMC cells are usually rated 3.6 V"),
            ("cutoff", "[memory] table gives 2.5-3.0 V; NMC power cells are usually rated to "
                       "2.5 V"),
            _OVER_45, _LOWER_20)),
    CellWindow(
        "nca", charge=4.20, nominal=3.6, cutoff=2.5, overcharge_limit=4.5, lower_limit=2.0,
        sources=(
            _CHARGE_42,
            ("nominal", "[memory] table gives 3.6-3.7 V; NCA cells are usually rated 3.6 V"),
            ("cutoff", "[memory] table gives 2.5-3.0 V; NCA cells are usually rated to 2.5 V"),
            _OVER_45, _LOWER_20)),
    CellWindow(
        "lfp", charge=3.65, nominal=3.2, cutoff=2.5, overcharge_limit=3.9, lower_limit=2.0,
        sources=(
            ("charge", "[practice] table gives 3.60-3.65 V; the upper end, since a default that "
                       "is too low would flag a correct 3.65 V charger"),
            ("nominal", "[practice] table gives 3.2-3.3 V; 3.2 V is the common rating"),
            ("cutoff", "[practice] 2.5 V, docs/references.md cell-window table"),
            ("overcharge_limit", "[memory] 3.9 V: LiFePO4 protectors detect overcharge at about "
                                 "3.75-3.9 V; no docs/references.md value, get the cell data sheet"),
            ("lower_limit", "[practice] 2.0 V, the table's cold-discharge cut-off")),
    ),
    CellWindow(
        "lmo", charge=4.20, nominal=3.8, cutoff=3.0, overcharge_limit=4.5, lower_limit=2.0,
        sources=(
            _CHARGE_42,
            ("nominal", "[memory] table gives 3.7-3.8 V"),
            ("cutoff", "[practice] 3.0 V, docs/references.md cell-window table"),
            ("overcharge_limit", _OVER_45[1] + "; assumed to apply to 4.2 V LiMn2O4 cells too"),
            ("lower_limit", _LOWER_20[1] + "; assumed to apply to 4.2 V LiMn2O4 cells too")),
    ),
    CellWindow(
        "lto", charge=2.80, nominal=2.4, cutoff=1.8, overcharge_limit=3.0, lower_limit=1.5,
        sources=(
            ("charge", "[memory] table gives 2.7-2.85 V; 2.8 V is the common set point"),
            ("nominal", "[memory] table gives 2.3-2.4 V"),
            ("cutoff", "[practice] table gives 1.5-1.8 V; the upper end, keeping the lower end "
                       "as the never-below limit"),
            ("overcharge_limit", "[memory] 3.0 V; no docs/references.md value, get the cell data "
                                 "sheet"),
            ("lower_limit", "[practice] 1.5 V, the low end of the table's cut-off range")),
    ),
)

#: Default windows keyed by lower-case chemistry code; read-only so no rule can alter a default.
DEFAULT_WINDOWS: Mapping[str, CellWindow] = MappingProxyType({w.chemistry: w for w in _WINDOWS})
CHEMISTRIES: tuple[str, ...] = tuple(DEFAULT_WINDOWS)


def cell_window(chemistry: str) -> CellWindow:
    """The default window of a chemistry code (case and surrounding blanks ignored)."""
    key = chemistry.strip().lower()
    try:
        return DEFAULT_WINDOWS[key]
    except KeyError:
        raise KeyError(f"unknown chemistry {chemistry!r}; known: {', '.join(CHEMISTRIES)}") \
            from None
