"""The search budget of fitted hints (issue 18 item 2): a design of more components gets fewer
re-lints, counted and never timed, and still a fitted hint where the budget allows one, with
the resolution the search reached said in the hint.

The shunt on example_designs/flawed/ridgeline-shunt-too-large.yaml is the worked case: its range
ends where the over-current trip minimum meets the 25 A peak, 45 mV / (25 A × 1.01) = 1.782 mΩ
[derived: Ohm's law at the window's low corner, docs/references.md "Trip current of a
detection"]; the design padded with capacitors to more components than a full search is given
to must still name a shunt below that edge, and that shunt applied must clear the finding.
"""

from __future__ import annotations

import math
import re
from pathlib import Path

import pytest

from packwarden import pipeline
from packwarden.engine import Session, lint_file, load_registry
from packwarden.loader import load_file
from packwarden.model.fit import (EDGE_RATIO, FULL_SEARCH_LINTS, SearchSpent, factor_interval)
from packwarden.overrides import Override, apply_overrides
from packwarden.quantities import parse_quantity

REPO = Path(__file__).resolve().parent.parent
SHUNT = "example_designs/flawed/ridgeline-shunt-too-large.yaml"
EDGE = 0.045 / (25.0 * 1.01)  # Ω, by hand (above)


def _counted(judge):
    calls = []

    def passes(k: float) -> bool:
        calls.append(k)
        return judge(k)
    return passes, calls


@pytest.mark.parametrize("lints", [3, 5, 8, 13, 30])
def test_a_bounded_search_judges_no_more_than_its_budget(lints) -> None:
    passes, calls = _counted(lambda k: 0.3 <= k <= 0.5)
    found = factor_interval(passes, start=0.45, lints=lints)
    assert len(calls) <= lints
    assert found is not None
    # what it names passed, so it lies inside the true range, and it says how well it knows it
    assert 0.3 <= found.low <= found.high <= 0.5
    assert found.resolution >= EDGE_RATIO
    if found.resolution < math.inf:
        assert found.low / 0.3 <= found.resolution * (1 + 1e-9)
        assert 0.5 / found.high <= found.resolution * (1 + 1e-9)


def test_an_unbounded_search_is_the_full_one() -> None:
    passes, calls = _counted(lambda k: 0.3 <= k <= 0.5)
    full = factor_interval(passes, start=0.9)
    again = factor_interval(lambda k: 0.3 <= k <= 0.5, start=0.9, lints=10 ** 6)
    assert full == again and full.resolution == EDGE_RATIO
    assert len(calls) <= FULL_SEARCH_LINTS


def test_a_budget_spent_before_anything_passes_says_nothing_rather_than_none() -> None:
    # a narrow range far below the start: the coarse look of a small budget cannot claim "none"
    with pytest.raises(SearchSpent):
        factor_interval(lambda k: 0.100 <= k <= 0.104, start=1.0, lints=4)
    assert factor_interval(lambda k: False, start=1.0) is None


def test_the_budget_falls_with_the_design_and_small_designs_search_in_full() -> None:
    assert pipeline.fit_budget(pipeline.FIT_FULL_COMPONENTS) is None
    budgets = [pipeline.fit_budget(n) for n in (61, 100, 200, 370, 1000, 2000)]
    assert all(b is not None for b in budgets)
    assert budgets == sorted(budgets, reverse=True) and budgets[0] >= 8
    assert budgets[-1] == 0  # no re-lint at all: the hint of the window alone


def _padded(doc, count: int):
    """The design with ``count`` more supply capacitors beside C1 (same part, same nets): more
    components, the same circuit for every rule."""
    c1 = doc.data["components"]["C1"]
    return apply_overrides(doc, [Override("add", f"components.CP{k}", dict(c1))
                                 for k in range(1, count + 1)])


def test_a_large_design_still_gets_a_fitted_hint_that_passes_when_applied() -> None:
    session = Session(registry=load_registry(), grouping=False)
    doc = load_file(REPO / SHUNT, SHUNT)
    padded = _padded(doc, 60)
    size = len(padded.data["components"])
    budget = pipeline.fit_budget(size)
    assert budget is not None and 2 <= budget < FULL_SEARCH_LINTS
    lints = []
    relinter = pipeline._Relinter.__call__

    def counted(self, changes):
        lints.append(changes)
        return relinter(self, changes)
    pipeline._Relinter.__call__ = counted
    try:
        result = lint_file(session, REPO / SHUNT, SHUNT, document=padded)
    finally:
        pipeline._Relinter.__call__ = relinter
    # the design as it is, linted once for every search, and the searches within the budget
    assert sum(1 for c in lints if not c) <= 1
    assert sum(1 for c in lints if c) <= budget - 1
    hints = [f.hint for f in result.findings if f.rule == "trip-current-window"]
    assert hints
    for hint in hints:
        m = re.search(r"use RSH of ([0-9.]+ mΩ) \(every rule passes from ([0-9.]+ mΩ) to "
                      r"([0-9.]+ mΩ)", hint)
        assert m, hint
        value, low, high = (parse_quantity(x, "Ω") for x in m.groups())
        assert low <= value <= high <= EDGE
        assert f"a design of {size} components gets a search of {budget} lints" in hint
        # applied, it clears the finding and raises nothing else
        rsh = padded.data["components"]["RSH"]
        written = {"kind": "resistor", "value": m.group(1), "tol": "1 %",
                   "pins": rsh["pins"]}
        changed = lint_file(session, REPO / SHUNT, SHUNT,
                            document=apply_overrides(padded, [Override("set", "components.RSH",
                                                                       written)]))
        before = {(f.rule, f.element, f.key) for f in result.findings}
        after = {(f.rule, f.element, f.key) for f in changed.findings}
        assert not [i for i in after if i[0] == "trip-current-window"]
        assert after <= before, after - before
