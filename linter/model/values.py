"""The model's shared vocabulary: spans, corners, the model's stand-in resistances, problems.

The bottom layer of ``packwarden.model``: it imports nothing of the model, so every other module
of it (topology, the power path, the physics, the facade) can import it at the top.

One vocabulary for ranges: a :class:`Span` holds a quantity's ``min``, ``typ`` and ``max`` —
the quantity's own minimum, typical and maximum value, whatever corner produced each. The
corner that produced a figure is said beside it (an :class:`OperatingPoint`'s ``corner``), never
read off the span's field names.
"""

from __future__ import annotations

import math
from typing import Any, Literal

from ..records import record

__all__ = ["Span", "Corner", "CORNERS", "ModelProblem", "DesignMistake", "IDEAL", "SIGNAL_OHMS", "PROBE_LOAD",
           "UPPER_LIMIT_MARGIN", "spread_low", "memo_key", "corner_value"]

#: A corner of a part's spread: its minimum, typical or maximum value.
Corner = Literal["min", "typ", "max"]
CORNERS: tuple[Corner, ...] = ("min", "typ", "max")

# A load placed across the pack terminals to excite the path in a solve; the network is linear
# with every switch on, so any value gives the same ratios [derived].
PROBE_LOAD = 1.0
# Parts in the path with no resistance given are modelled this small: they neither add to the
# sense resistance nor limit a short circuit, which errs on the side of higher currents.
IDEAL = 1e-6
# Resistors above this carry signals (supply filters, sense-pin resistors, dividers), not the
# pack's current: they are no bypass of a fuse and no path for a load [practice].
SIGNAL_OHMS = 1.0
# Upper-limit charging voltage when a data sheet gives none: the charge voltage plus 50 mV
# [practice: cell data sheets give 4.20 V +0.03..0.05 V; IEC 62133-2 summaries 4.25 V for 4.2 V
# cells].
UPPER_LIMIT_MARGIN = 0.05


@record(frozen=True)
class Span:
    """A quantity's minimum, typical and maximum value."""

    min: float
    typ: float
    max: float

    @classmethod
    def of(cls, t: Any) -> "Span":
        """The span of a toleranced data-sheet value (``schema.Toleranced``)."""
        return cls(t.low, t.nominal, t.high)

    @classmethod
    def exactly(cls, value: float) -> "Span":
        return cls(value, value, value)

    def scaled(self, k: float) -> "Span":
        return Span(self.min * k, self.typ * k, self.max * k)

    def at(self, corner: Corner) -> float:
        return {"min": self.min, "typ": self.typ, "max": self.max}[corner]


class DesignMistake(ValueError):
    """Nonsense the model meets in a design, at ``path`` (a YAML path of the design file): the
    engine reports it as an input error on that line, never as an internal error."""

    def __init__(self, path: tuple, message: str) -> None:
        super().__init__(message)
        self.path, self.message = tuple(path), message


@record
class ModelProblem:
    """Why a figure could not be computed; rules report it rather than guessing."""

    what: str
    message: str
    path: tuple = ()


def spread_low(t: Any) -> float:
    """Lowest value of a part parameter (``schema.Toleranced``); with typ and max only,
    typ - (max - typ).

    Data sheets often give typ and max alone; a symmetric spread is the usual reading [practice].
    Floored at half of typ, where a wide max would make the mirror image meaningless.
    """
    if t.min is not None:
        return t.min
    if t.typ is not None and t.max is not None:
        return max(t.typ - (t.max - t.typ), t.typ / 2)
    return t.low


def corner_value(t: Any, corner: Corner) -> float:
    """A toleranced part value at a corner; the minimum read as :func:`spread_low` does."""
    if corner == "max":
        return t.high
    if corner == "min":
        return spread_low(t)
    return t.nominal


def memo_key(x: float) -> Any:
    """A number as a memo key: 0.0 and -0.0 are equal keys but print apart ("-0 °C")."""
    return (x, math.copysign(1.0, x)) if x == 0.0 else x
