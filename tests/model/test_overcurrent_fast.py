"""A second (fast) over-current level: its trip window, and the gap overloads below each level.

Expected values come from outside the model: the trip current as detection voltage over sense
resistance written out by hand from the part data (docs/references.md, "Over-current levels"
[published: Ohm's law; the protector's detection is a voltage across the sense resistance]), and,
where the switches are the sense resistance, the sense resistance read off an ngspice operating
point of the same path.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from packwarden.testing import lint_variant

REPO = Path(__file__).resolve().parents[2]
RIDGE = ("ridgeline-tool-4s2p.yaml", "ridgeline-parts.yaml")
ORCHARD = ("orchard-probe.yaml", "orchard-parts.yaml")


def _model(tmp_path, names, lib_replace=()):
    design, library = names
    run = lint_variant(tmp_path, REPO / "example_designs" / design,
                       REPO / "example_designs/parts" / library, lib_replace=lib_replace)
    assert not run.input_errors(), [str(e) for e in run.input_errors()]
    (result,) = run.designs
    assert not result.internal, result.internal
    return result.model


def _with_fast(slow: str, detect: str, delay: str) -> str:
    """The library's over-current block followed by a fast level."""
    return (f"{slow}    overcurrent_fast:\n      detect: {detect}\n      delay: {delay}\n"
            f"      release_on: [load_removal]\n")


RIDGE_SLOW = """    overcurrent:                       # across an external shunt, between ground and sense
      detect: {typ: 50 mV, tol: 5 mV}
      delay: {min: 80 ms, typ: 100 ms, max: 120 ms}
      release_on: [load_removal]
"""
RIDGE_FAST = _with_fast(RIDGE_SLOW, "{typ: 80 mV, tol: 8 mV}", "{min: 8 ms, typ: 10 ms, max: 12 ms}")


def test_fast_window_over_a_shunt_by_hand(tmp_path):
    # Hand-worked vector [derived, docs/references.md "Over-current levels"]: the 1.5 mΩ ±1 %
    # shunt is the whole sense resistance, so the fast level trips between
    #   72 mV / (1.5 mΩ × 1.01) = 47.5248 A  and  88 mV / (1.5 mΩ × 0.99) = 59.2593 A.
    m = _model(tmp_path, RIDGE, [(RIDGE_SLOW, RIDGE_FAST)])
    fast = m.overcurrent_fast_trip
    assert fast.min == pytest.approx(0.072 / (0.0015 * 1.01), rel=1e-9)
    assert fast.max == pytest.approx(0.088 / (0.0015 * 0.99), rel=1e-9)
    assert 47.52 < fast.min < 47.53 and 59.25 < fast.max < 59.27
    figures = m.figures()
    assert figures["fast_trip_min"].value == fast.min
    assert figures["fast_trip_max"].value == fast.max


def test_gap_overloads_below_each_level(tmp_path):
    # With a middle level, the current just below each faster level is cleared only by the one
    # beneath it [practice, docs/references.md "Over-current levels"]: just below the fast
    # maximum (59.26 A) the slow level, after its longest delay 120 ms; just below the
    # short-circuit maximum (175 mV / 1.485 mΩ = 117.845 A, above the fast maximum) the fast
    # level, after its longest delay 12 ms.
    m = _model(tmp_path, RIDGE, [(RIDGE_SLOW, RIDGE_FAST)])
    fast_gap, gap = m.event("fast-gap-overload"), m.event("gap-overload")
    assert fast_gap.current == pytest.approx(0.088 / 0.001485, rel=1e-9)
    assert fast_gap.duration == 0.120 and fast_gap.detection == "over-current"
    assert fast_gap.i2t == pytest.approx((0.088 / 0.001485) ** 2 * 0.120, rel=1e-9)
    assert gap.current == pytest.approx(0.175 / 0.001485, rel=1e-9)
    assert gap.duration == 0.012 and gap.detection == "fast over-current"
    assert "fast over-current delay" in gap.corner


def test_without_a_fast_level_the_events_are_as_before(tmp_path):
    # The shipped example has one over-current level: the gap overload keeps the slow delay and
    # there is no fast-gap-overload event (a design without the field lints exactly as before).
    m = _model(tmp_path, RIDGE)
    assert m.overcurrent_fast_trip is None
    assert m.event("fast-gap-overload") is None
    gap = m.event("gap-overload")
    assert gap.duration == 0.120 and gap.detection == "over-current"
    assert "fast_trip_min" not in m.figures()


ORCHARD_SLOW = """    overcurrent:
      detect: {typ: 150 mV, tol: 15 mV}
      delay: {min: 5 ms, typ: 9 ms, max: 15 ms}
      release_on: [load_removal]
"""
ORCHARD_FAST = _with_fast(ORCHARD_SLOW, "{typ: 300 mV, tol: 30 mV}",
                          "{min: 1 ms, typ: 2 ms, max: 3 ms}")


@pytest.mark.parametrize("end", ["min", "max"])
def test_fast_window_over_the_fet_pair_against_ngspice(tmp_path, end):
    # Where the FET pair is the sense resistance, the window's end is its detection voltage
    # (270 mV at the minimum, 330 mV at the maximum, from the part data) over the resistance
    # between the protector's sense and ground pins; that resistance is read here off an
    # ngspice operating point of the same path with each channel at the corner's on-resistance
    # (V(sense) - V(ground)) / I(load), not from the model's own solve.
    from tests.model import spice
    m = _model(tmp_path, ORCHARD, [(ORCHARD_SLOW, ORCHARD_FAST)])
    fast = m.overcurrent_fast_trip
    at = fast.at_min if end == "min" else fast.at_max
    detect = {"min": 0.270, "max": 0.330}[end]
    stack = m.stack
    net = m.path.network(at.rds, cell_emf=m.cell_limits.nominal,
                         cell_r=stack.part.internal_resistance.nominal, temp=at.ambient,
                         corner=at.corner)
    theirs = spice.simulate(net, stack.bottom)
    p = m.protector
    v = theirs.voltages[p.pins["sense"]] - theirs.voltages[p.pins["ground"]]
    r_sense = abs(v) / abs(theirs.currents["(load)"])
    expected = detect / r_sense
    assert getattr(fast, end) == pytest.approx(expected, rel=1e-6)
    # and it sits between the slow level's and the short-circuit level's at the same corner
    slow, sc = m.overcurrent_trip, m.short_circuit_trip
    assert getattr(slow, end) < getattr(fast, end) < getattr(sc, end)


def test_a_fast_level_below_the_slow_one_is_one_located_line(tmp_path):
    # Bad input: a "fast" level that trips below the slow one is refused where it is written,
    # with exit code 2 and no traceback (the rest of the run goes on).
    run = lint_variant(tmp_path, REPO / "example_designs" / RIDGE[0],
                       REPO / "example_designs/parts" / RIDGE[1],
                       lib_replace=[(RIDGE_SLOW, _with_fast(RIDGE_SLOW, "{typ: 40 mV, tol: 4 mV}",
                                                            "{min: 8 ms, max: 12 ms}"))])
    (text,) = [str(e) for e in run.input_errors()]
    assert "overcurrent_fast.detect" in text and "is not above the over-current detection" in text
    path, line = text.split(":")[0], int(text.split(":")[1])
    assert "detect: {typ: 40 mV" in Path(path).read_text(encoding="utf-8").splitlines()[line - 1]
    assert "Traceback" not in text
