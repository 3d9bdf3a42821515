"""The feasible range of one design value: the interval of a factor on it over which a judgement
holds (issue 18 item 2, hints that fit).

The judgement is passed in: the design with the factor applied, judged by every rule (the rules'
own functions, so no figure here is a second copy of theirs). The search assumes the judgement
holds on one interval of the factor, as it does where raising the value only moves a window one
way (more sense resistance lowers every trip current: the loads bound the factor from above, the
ratings the window must stay within bound it from below).
"""

from __future__ import annotations

import math
import typing
from enum import Enum
from typing import Any, Callable, Iterable

from ..records import record
from ..schema import Strict, Toleranced, quantity_of

__all__ = ["Interval", "factor_interval", "value_inside", "scaled_resistors", "scaled_rds_on",
           "STEP", "SearchSpent", "FULL_SEARCH_LINTS"]

#: How finely an edge is found, as a ratio between the last failing and passing factor.
EDGE_RATIO = 1.01
#: How far below the starting factor the search looks for a first passing one, as a ratio, and
#: how far an edge is looked for either side of it.
REACH = 20.0
#: The geometric step of that first look: fine enough not to step over a range as narrow as a
#: part's tolerance band plus its neighbours' (a feasible range may span only ~ 1.2 ×).
STEP = 1.05


@record(frozen=True)
class Interval:
    """Factors from ``low`` to ``high`` (both pass)."""

    low: float
    high: float
    #: The ratio within which each edge is known: :data:`EDGE_RATIO` for a full search, more
    #: where a budget of judgements cut the bisection short (the edges shown are still factors
    #: that passed, so the range is narrower than the true one, never wider).
    resolution: float = EDGE_RATIO


class SearchSpent(Exception):
    """The budget of judgements ran out before any factor passed: nothing is known, which is
    not the same as no factor passing."""


#: The most judgements a search takes: the first look's steps from ``start`` down to
#: ``start / REACH`` (log 20 / log 1.05, 62) and each edge's bisection to :data:`EDGE_RATIO`
#: (log2(log 20 / log 1.01), 9 each, and one look at the far end).
FULL_SEARCH_LINTS = 82


def factor_interval(passes: Callable[[float], bool], start: float,
                    lints: int | None = None) -> Interval | None:
    """The interval of factors around the first passing one at or below ``start`` (looked for
    in steps of :data:`STEP` down to ``start / REACH``), its edges found by bisection to
    :data:`EDGE_RATIO`; None when no factor in that reach passes.

    ``lints`` bounds the judgements (None: no bound; a bound of :data:`FULL_SEARCH_LINTS` or
    more is the full search). Below that the first look takes longer steps (below) and what it
    needs of the bound (raising :class:`SearchSpent` when it runs out, or finds nothing, before
    a factor passes); the rest are shared by the two edges, whose bisection stops when its
    share is spent, at the resolution the interval states."""
    if not (start > 0 and math.isfinite(start)):
        return None
    left = [math.inf if lints is None else lints]

    def judged(factor: float) -> bool:
        if left[0] < 1:
            raise SearchSpent
        left[0] -= 1
        return passes(factor)

    if lints is None or lints >= FULL_SEARCH_LINTS:
        inside = start
        while not judged(inside):
            inside /= STEP
            if inside < start / REACH:
                return None
        low, low_ratio = _edge(judged, inside, 1.0 / REACH)
        high, high_ratio = _edge(judged, inside, REACH)
        return Interval(low, high, max(low_ratio, high_ratio, EDGE_RATIO))
    # A budget too small for the full search: the first look steps away from ``start`` in
    # steps that double (× STEP, STEP², STEP⁴, ...), fine where a range usually begins (the
    # rules start at the edge the model computes) and reaching ``start / REACH`` in six; a look
    # that finds none may have stepped over a narrow range, so it says nothing (SearchSpent).
    # The upper edge is then bisected from the last failing factor of the look.
    inside, above, jump = start, None, STEP
    while not judged(inside):
        if inside / jump < start / REACH:
            raise SearchSpent
        above, inside, jump = inside, inside / jump, jump * jump
    low, low_ratio = _edge(judged, inside, 1.0 / REACH, math.ceil(left[0] / 2))
    if above is None:
        high, high_ratio = _edge(judged, inside, REACH, left[0])
    else:
        high, high_ratio = _bisect(judged, inside, above, left[0])
    return Interval(low, high, max(low_ratio, high_ratio, EDGE_RATIO))


def _edge(passes: Callable[[float], bool], inside: float, span: float,
          steps: float = math.inf) -> tuple[float, float]:
    """The last passing factor from ``inside`` towards ``inside × span``, in at most ``steps``
    judgements, and the ratio within which it is known (infinite where none was spent)."""
    if steps < 1:
        return inside, math.inf
    outside = inside * span
    if passes(outside):
        return outside, EDGE_RATIO
    return _bisect(passes, inside, outside, steps - 1)


def _bisect(passes: Callable[[float], bool], inside: float, outside: float,
            steps: float) -> tuple[float, float]:
    """Bisection between a passing ``inside`` and a failing ``outside`` to :data:`EDGE_RATIO`
    or ``steps`` judgements: the last passing factor and the ratio it is known within."""
    while max(inside, outside) / min(inside, outside) > EDGE_RATIO and steps >= 1:
        middle = math.sqrt(inside * outside)
        steps -= 1
        if passes(middle):
            inside = middle
        else:
            outside = middle
    return inside, max(max(inside, outside) / min(inside, outside), EDGE_RATIO)


def value_inside(now: float, interval: Interval) -> float:
    """A value of three significant figures inside ``now`` × ``interval``, near its geometric
    middle (the rounded figure a hint shows must itself pass)."""
    low, high = now * interval.low, now * interval.high
    middle = math.sqrt(low * high)
    digits = 2 - math.floor(math.log10(middle))
    value = round(middle, digits)
    return value if low <= value <= high else middle


def scaled_resistors(netlist: Any, refdes: Iterable[str], factor: float) -> list[tuple[str, Any]]:
    """The changes (dotted path, value) that write each resistor of ``refdes`` inline with its
    value times ``factor``, its tolerance, rating and pins as they are."""
    changes = []
    for ref in refdes:
        c = netlist.components[ref]
        part = c.part
        written: dict[str, Any] = {"kind": "resistor",
                                   "value": f"{part.value * factor * 1e3:.9g} mΩ",
                                   "tol": f"{part.tol:.9g} %"}
        if part.power is not None:
            written["power"] = f"{part.power:.9g} W"
        if part.pinout:
            written["pinout"] = dict(part.pinout)
        written["pins"] = [c.pins[k] for k in sorted(c.pins)]
        changes.append((".".join(c.path), written))
    return changes


def scaled_rds_on(netlist: Any, refdes: Iterable[str], factor: float) -> list[tuple[str, Any]]:
    """The changes (dotted path, value) that write each FET of ``refdes`` inline with every row
    of its R_DS(on) table times ``factor`` (typ and max alike, the gate voltages as they are: a
    part of the same family in another die size), every other field and its pins as they are."""
    changes = []
    for ref in refdes:
        c = netlist.components[ref]
        written = written_part(c.part)
        written["rds_on"] = [{k: (_scaled_text(v, factor) if k != "vgs" else v)
                              for k, v in row.items()} for row in written["rds_on"]]
        written["pins"] = dict(c.pins)
        changes.append((".".join(c.path), written))
    return changes


def _scaled_text(text: str, factor: float) -> str:
    number, unit = text.split(" ", 1)
    return f"{float(number) * factor:.12g} {unit}"


def written_part(part: Strict) -> dict[str, Any]:
    """A validated part as the format writes it: each quantity as text in its field's unit, so
    it validates again to the same values."""
    return _written(part, type(part))


def _written(value: Any, annotation: Any) -> Any:
    if isinstance(value, Toleranced):
        _, unit = _unit(annotation) or ("", "")
        return {k: _quantity(v, unit) for k in ("min", "typ", "max")
                for v in [getattr(value, k)] if v is not None}
    if isinstance(value, Strict):
        fields = type(value).model_fields
        return {(f.alias or name): _written(getattr(value, name), _annotated(f))
                for name, f in fields.items() if getattr(value, name) is not None}
    if isinstance(value, Enum):
        return value.value
    if isinstance(value, (list, tuple)):
        item = next(iter(_arguments(annotation, list)), Any)
        return [_written(v, item) for v in value]
    if isinstance(value, dict):
        return {k: _written(v, Any) for k, v in value.items()}
    if isinstance(value, float):
        found = _unit(annotation)
        return _quantity(value, found[1]) if found else value
    return value


def _annotated(field: Any) -> Any:
    """A field's annotation with its markers (pydantic keeps them apart in ``metadata``)."""
    if field.metadata:
        return typing.Annotated[(field.annotation, *field.metadata)]
    return field.annotation


def _arguments(annotation: Any, origin: type) -> tuple:
    """The arguments of ``annotation`` where it is (or holds, in a union) ``origin[...]``."""
    if typing.get_origin(annotation) is origin:
        return typing.get_args(annotation)
    for arg in typing.get_args(annotation):
        found = _arguments(arg, origin)
        if found:
            return found
    return ()


def _unit(annotation: Any) -> tuple[str, str] | None:
    """The quantity marker of ``annotation``, looked for through Annotated and unions."""
    if typing.get_origin(annotation) is typing.Annotated:
        found = quantity_of(annotation.__metadata__)
        if found:
            return found
    for arg in typing.get_args(annotation):
        found = _unit(arg)
        if found:
            return found
    return None


def _quantity(value: float, unit: str) -> Any:
    return f"{value!r} {unit}" if unit else value
