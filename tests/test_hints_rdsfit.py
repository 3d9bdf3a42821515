"""The fitted on-resistance of a FET-sensed trip window (issue 18 item 2): the factor on the switch
FETs' R_DS(on) table over which every rule passes, applied as an engineer would (the FET written
inline with every row of its table scaled) and judged by linting the design again.

Outside sources: the trip current is the detection voltage over the sense resistance and a
junction sits at T_A + P·R_θJA (docs/references.md, "Trip current of a detection" and
"MOSFETs"); the upper end is computed here by hand from the data sheet values in the example's
library, not by the model.
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from packwarden.engine import Session, lint_file, load_registry
from packwarden.loader import load_file
from packwarden.model.fit import written_part
from packwarden.overrides import Override, apply_overrides
from packwarden.quantities import parse_quantity
from packwarden.schema import PartLibrary

REPO = Path(__file__).resolve().parent.parent
FLAWED = "example_designs/flawed"
# The Orchard probe's flawed variant with a 1.5 A motor and the clean probe's 1.6 A start: its
# window (1.59-7.72 A) is just under the peak, and a little less on-resistance fits.
FITTING = ("trip-below-load.yaml", [Override("set", "load.continuous", "1.5 A"),
                                    Override("set", "load.peak.current", "1.6 A")])
# ... and with a 1 A load, a 1.2 A start and a -30 °C winter: the weakest short (7.9 A, the cells
# cold) falls inside the window, which has room to move down below it and stay above the start.
SHORT = ("trip-below-load.yaml", [Override("set", "load.continuous", "1.0 A"),
                                  Override("set", "load.peak.current", "1.2 A"),
                                  Override("set", "pack.ambient.min", "-30 °C")])
CASES = [(*FITTING, "trip-current-window"), (*SHORT, "short-circuit-reach")]
#: The search finds an edge to 1 % (packwarden.model.fit.EDGE_RATIO); the hint prints 3 figures.
RESOLUTION = 1.01


@pytest.fixture(scope="module")
def session() -> Session:
    return Session(registry=load_registry(), grouping=False)


def _lint(session, design: str, changes: list):
    shown = f"{FLAWED}/{design}"
    doc = apply_overrides(load_file(REPO / shown, shown), changes)
    return lint_file(session, REPO / shown, shown, document=doc), doc


def _scaled_rds_on(doc, component: str, factor: float) -> Override:
    """The component's FET (from its library, or as written) inline, every row of its R_DS(on)
    table (typ and max) times ``factor``: a part of the same family in another die size."""
    written = doc.data["components"][component]
    part = {k: v for k, v in written.items() if k != "pins"}
    for lib in doc.data["libraries"] if "part" in written else ():
        parts = load_file(REPO / FLAWED / lib).data["parts"]
        if written["part"] in parts:
            part = dict(parts[written["part"]])
            break
    else:
        assert "part" not in written, f"{written['part']} is in none of the design's libraries"
    part["rds_on"] = [{k: (v if k == "vgs" else f"{parse_quantity(v, 'Ω') * factor * 1e3:.9g} mΩ")
                       for k, v in row.items()} for row in part["rds_on"]]
    return Override("set", f"components.{component}", {**part, "pins": written["pins"]})


def _identity(f) -> tuple:
    return (f.rule, f.element, f.key)


def _fitted(result, rule: str = "trip-current-window") -> tuple[float, float, str, str, object]:
    """The factor range, the rules named below and above it, and the finding it came from."""
    for f in result.findings:
        m = re.search(r"a factor ([0-9.]+)-([0-9.]+) on Q1's R_DS\(on\) table", f.hint or "")
        if f.rule == rule and m:
            sides = re.search(r"below it ([a-z, -]+) fails; above it ([a-z, -]+) fails", f.hint)
            assert sides, f.hint
            return float(m.group(1)), float(m.group(2)), sides.group(1), sides.group(2), f
    raise AssertionError([f.hint for f in result.findings])


@pytest.mark.parametrize("design, changes, rule", CASES, ids=[c[2] for c in CASES])
def test_the_middle_of_the_range_clears_the_finding_and_raises_nothing(session, design, changes,
                                                                       rule) -> None:
    base, doc = _lint(session, design, changes)
    low, high, _, _, finding = _fitted(base, rule)
    after, _ = _lint(session, design, changes + [_scaled_rds_on(doc, "Q1", (low * high) ** 0.5)])
    assert not after.errors, after.errors
    before = {_identity(f) for f in base.findings}
    assert _identity(finding) not in {_identity(f) for f in after.findings}
    assert not [f.message for f in after.findings if _identity(f) not in before]


@pytest.mark.parametrize("side", ["below", "above"])
@pytest.mark.parametrize("design, changes, rule", CASES, ids=[c[2] for c in CASES])
def test_two_percent_beyond_each_end_the_rule_named_for_that_side_fails(session, design, changes,
                                                                        rule, side) -> None:
    base, doc = _lint(session, design, changes)
    low, high, below, above, _ = _fitted(base, rule)
    factor, named = (low / 1.02, below) if side == "below" else (high * 1.02, above)
    after, _ = _lint(session, design, changes + [_scaled_rds_on(doc, "Q1", factor)])
    failing = {f.rule for f in after.findings}
    assert named and all(r in failing for r in named.split(", ")), (named, failing)


def test_the_upper_end_is_where_the_trip_min_meets_the_peak_by_hand(session) -> None:
    # Data sheet values of OR-FET-D20 and OR-GUARD-1S in example_designs/parts/orchard-parts.yaml
    # (docs/references.md, "Trip current of a detection", the on-resistance vector):
    v_det_min = 0.150 - 0.015              # over-current detection 150 mV ± 15 mV
    drive = 2.45                           # over-discharge detection min 2.5 V - 50 mV: the drive
    peak, continuous, ambient, theta = 1.6, 1.5, 55.0, 83.0

    def table_max(vgs: float) -> float:   # straight line between the 1.8 V and 2.5 V rows
        return 0.032 + (0.052 - 0.032) * (2.5 - vgs) / (2.5 - 1.8)

    # the charge FET's source rides the detection voltage above the protector's ground at a trip
    at_25c = table_max(drive) + table_max(drive - v_det_min)
    bound = v_det_min / peak               # I_trip = V_det / R_sense [derived: Ohm's law]
    tj = ambient + theta * continuous ** 2 * bound      # T_J = T_A + P·R_θJA, heated by the load
    hot = 1 + (1.44 - 1) * (tj - 25) / (125 - 25)       # the data sheet's 1.44 at 125 °C, a line
    by_hand = bound / (at_25c * hot)
    assert by_hand == pytest.approx(0.9932, abs=5e-4)   # the vector in docs/references.md
    _, high, _, _, _ = _fitted(_lint(session, *FITTING)[0])
    assert by_hand / RESOLUTION <= high <= by_hand * 1.001, (high, by_hand)


EMPTY = ["trip-below-load.yaml", "fet-cooks-below-trip.yaml", "high-threshold-fet.yaml"]


@pytest.mark.parametrize("design", EMPTY)
def test_an_empty_range_fails_where_it_says(session, design) -> None:
    base, doc = _lint(session, design, [])
    hint = next(f.hint for f in base.findings if f.rule == "trip-current-window")
    m = re.search(r"at a factor ([0-9.]+) on its R_DS\(on\) table, where .*?, ([a-z, -]+) fail "
                  r"at ", hint)
    assert m, hint
    after, _ = _lint(session, design, [_scaled_rds_on(doc, "Q1", float(m.group(1)))])
    failing = {f.rule for f in after.findings}
    assert all(r in failing for r in m.group(2).split(", ")), (m.group(2), failing)


@pytest.mark.parametrize("design", EMPTY)
def test_switch_temperature_proposes_no_on_resistance_the_window_forbids(session, design) -> None:
    # The one-sided "R_DS(on) at least 19 % lower" lifted the trip max and the heat it permits;
    # the rule now names the same range (here: none) as trip-current-window, beside θJA.
    base, _ = _lint(session, design, [])
    window = next(f.hint for f in base.findings if f.rule == "trip-current-window")
    fitted = window[window.index("no on-resistance"):]
    hints = [f.hint for f in base.findings if f.rule == "switch-temperature"]
    assert hints and all(fitted in h and "θJA ≤" in h and "lower R_DS(on)" not in h
                         and "% lower" not in h for h in hints), hints


def test_every_example_part_written_back_reads_as_itself() -> None:
    # A try writes the switches inline from their validated parts; a field lost or mis-scaled
    # there would move every figure of every try, whatever the factor.
    checked = 0
    for path in sorted((REPO / "example_designs" / "parts").glob("*.yaml")):
        library = PartLibrary.model_validate(load_file(path).data)
        for name, part in library.parts.items():
            again = PartLibrary.model_validate({"format": "packwarden-parts/1",
                                                "parts": {name: written_part(part)}})
            assert again.parts[name] == part, name
            checked += 1
    assert checked > 40
