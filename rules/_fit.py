"""Hints that fit: the range of a factor on design values over which every rule passes, found by
linting the design again with the factor applied (issue 18 item 2).

The rules themselves are the judgement, so a proposed value cannot contradict any of them; the
search over the factor is the model's (:mod:`packwarden.model.fit`). A factor passes when the
design with it applied clears the findings it is meant to clear and raises no finding the design
did not already have.
"""

from __future__ import annotations

from typing import Any, Callable

from packwarden.model.fit import EDGE_RATIO, Interval, SearchSpent, factor_interval

#: What a blocking rule asks of the structure, when no value of the searched part lets every
#: rule pass: changes the design format can describe.
STRUCTURAL = {
    "cell-pulse-rating": "more cells in parallel or cells with a higher pulse rating",
    "trip-current-window": "more cells in parallel, FET packages in parallel, or a protector "
                           "with a narrower over-current detection window",
    "secondary-protection": "a fuse of another rating",
    "switch-temperature": "FET packages in parallel",
    "switch-pulse-heat": "FET packages in parallel",
    "support-network": "a resistor of a higher power rating",
    "conductor-capacity": "heavier conductors",
    "conductor-withstand": "heavier conductors",
    "short-circuit-reach": "a protector with a narrower over-current detection window",
}


def _identity(f: Any) -> tuple:
    return (f.rule, f.element, f.key)


def _standing(result: Any) -> set[tuple] | None:
    """The findings of a re-lint that count, or None where it did not lint."""
    if result is None or result.errors or result.internal:
        return None
    return {_identity(f) for f in result.findings if not f.waived}


class Fit:
    """A search for the factor on some design values that clears ``clears`` (a test on a
    finding's identity) and raises nothing new; None from :meth:`interval` when no search can run
    (no re-lint here, or the design does not lint as it is).

    A check's re-lints are budgeted (``relint.left``, :func:`packwarden.pipeline.fit_budget`):
    a search takes at most what is left, and states a coarser resolution when that cut it
    short (:meth:`resolution_note`); ``spent`` is set when the budget ran out before any
    factor passed, and then nothing is known."""

    def __init__(self, relint: Callable[[list], Any] | None,
                 changes: Callable[[float], list], clears: Callable[[tuple], bool]):
        self.relint, self.changes, self.clears = relint, changes, clears
        self.spent = False
        self.before = _standing(relint([])) if relint is not None else None

    def blockers(self, factor: float) -> set[tuple] | None:
        """The findings that keep ``factor`` from passing (empty when it passes), or None where
        the changed design does not lint."""
        assert self.relint is not None and self.before is not None
        after = _standing(self.relint(self.changes(factor)))
        if after is None:
            return None
        return {i for i in after if self.clears(i) or i not in self.before}

    def passes(self, factor: float) -> bool:
        return self.blockers(factor) == set()

    def interval(self, start: float) -> Interval | None:
        if self.before is None:
            return None
        try:
            return factor_interval(self.passes, start, getattr(self.relint, "left", None))
        except SearchSpent:
            self.spent = True
            return None

    def resolution_note(self, found: Interval) -> str:
        """What a budget-cut search leaves unsaid, for the hint ("" after a full search)."""
        if found.resolution <= EDGE_RATIO * (1 + 1e-9):
            return ""
        size = getattr(self.relint, "components", 0)
        edges = ("its edges not searched" if found.resolution == float("inf") else
                 f"its edges known to within × {found.resolution:.3g}")
        return (f"; the range is a passing part of the whole, {edges}: a design of {size} "
                f"components gets a search of {getattr(self.relint, 'budget', 0)} lints")

    def structural(self, factor: float) -> str:
        """The structural changes that answer what blocks ``factor``, named by their rules."""
        rules = sorted({i[0] for i in self.blockers(factor) or ()})
        changes = list(dict.fromkeys(STRUCTURAL[r] for r in rules if r in STRUCTURAL))
        named = f" ({', '.join(rules)} fail there)" if rules else ""
        return f"{named}; {'; or '.join(changes) if changes else 'a protector with a narrower over-current detection window'}"
