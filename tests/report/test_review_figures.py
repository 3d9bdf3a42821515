"""The review report's figures: a unit on every key figure, short durations in days or hours, and
"n/a" (JSON null) for a figure the model could not compute, never a zero it did not find."""

from __future__ import annotations

import json
import re

import pytest

from packwarden.engine import lint
from packwarden.overrides import Override
from packwarden.quantities import UNITS, format_quantity
from packwarden.report import RenderOptions, formatter
from packwarden.report.text import key_figures

from report_data import CLEAN, EXAMPLES, FLAWED
from test_grouping import lint_changed

# [published: BIPM, The International System of Units (SI Brochure), 9th ed., 5.4.3] a quantity
# is written as a number, a space and the unit symbol; [derived] the storage budget's month is
# 8760 h / 12 = 730 h (docs/references.md, "Storage and self-discharge"), a day 24 h.
HOURS_PER_MONTH = 8760 / 12


@pytest.mark.parametrize("months, shown", [
    (0.944, f"{0.944 * HOURS_PER_MONTH / 24:.3g} days"),   # 28.7 days
    (0.02, f"{0.02 * HOURS_PER_MONTH:.3g} hours"),         # 14.6 hours
    (1.89, "1.89 months"),
])
def test_durations_below_a_month_read_in_days_or_hours(months, shown) -> None:
    assert format_quantity(months, "months") == shown


def test_the_storage_finding_says_days() -> None:
    run = lint([str(EXAMPLES / "flawed/ridgeline-led-always-on.yaml")])
    (f,) = [f for f in run.all_findings() if f.rule == "storage-drain"]
    assert "after 28.7 days" in f.message and "0.944 months" not in f.message


_NUMBER = re.compile(r"(?<![\w.])(-?\d+(?:\.\d+)?)(?:\s([^\s–;)]+))?")
_PREFIXES = "kMmuµn"


def _has_unit(token: str | None) -> bool:
    if token is None:
        return False
    token = token.rstrip(");,")
    return any(token == u or (token[:1] in _PREFIXES and token[1:] == u) for u in UNITS) or \
        token in ("days", "hours")


@pytest.mark.parametrize("design", [CLEAN, *FLAWED], ids=lambda p: p.stem)
def test_every_headline_figure_has_its_unit(design) -> None:
    (d,) = lint([str(design)]).designs
    text = key_figures(d.figures)
    for part in text.split("; ")[1:]:  # after the stack's shape (1S1P)
        numbers = [m for m in _NUMBER.finditer(part) if not m.group(1).isdigit() or m.group(2)]
        assert numbers or part.endswith("n/a"), part
        for m in numbers:
            assert _has_unit(m.group(2)), f"{design.name}: bare number in {part!r}"


def test_an_open_path_gives_n_a_not_zero() -> None:
    # The pack fuse leads to a net nothing else joins (PX): no current reaches the terminals, so
    # the short, the trip currents and the switch heat cannot be computed. An open loop carries
    # no current [published: Kirchhoff's current law]; a zero here would read as a figure.
    result = lint_changed(CLEAN, Override("set", "components.F1.pins", ["B+", "PX"]))
    figs = result.figures
    for name in ("prospective_short_circuit", "trip_current_min", "trip_current_max",
                 "short_circuit_trip_max", "switch_tj_continuous"):
        assert name in figs and not figs[name].known, name
    text = key_figures(figs)
    assert "prospective short circuit n/a" in text and "over-current trip n/a" in text
    assert " 0 A" not in text
    from packwarden.engine import RunResult
    run = RunResult(designs=[result])
    doc = json.loads(formatter("json")(run, RenderOptions()))
    assert doc["designs"][0]["figures"]["prospective_short_circuit"] is None
    md = formatter("markdown")(run, RenderOptions())
    assert "0 A" not in md.split("prospective short circuit")[-1].split("\n")[2]
