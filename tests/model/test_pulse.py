"""What a switch survives in a pulse (linter/model/pulse.py, survival.py) against outside sources.

Sources (docs/references.md, "What parts survive over time"): the Foster network's closed form
and its vector [published: data-sheet convention; vector derived]; an ngspice transient of the
Foster RC ladder driven by the event's power [independent tool]; the current divider
[derived]; the avalanche energy ½·L·I²·V_BR/(V_BR − V_DD) [published in FET makers'
application notes; formula from memory].
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from packwarden.engine import lint
from packwarden.model import pulse
from packwarden.model.events import Event
from tests.model.spice import run_op

REPO = Path(__file__).resolve().parents[2]
ORCHARD = REPO / "example_designs" / "orchard-probe.yaml"
RIDGELINE = REPO / "example_designs" / "ridgeline-tool-4s2p.yaml"


def _model(path: Path):
    (result,) = lint([str(path)]).designs
    return result.model


@pytest.fixture(scope="module")
def orchard():
    return _model(ORCHARD)


@pytest.fixture(scope="module")
def ridgeline():
    return _model(RIDGELINE)


# --- transient thermal impedance --------------------------------------------------------------

def test_foster_network_matches_the_reference_vector():
    # docs/references.md: R = (0.5, 2, 10) K/W, τ = (1 ms, 10 ms, 1 s) at 15 ms → 0.500 + 1.554
    # + 0.149 = 2.20 K/W [derived from the published closed form]
    z = pulse.foster_zth([(0.5, 1e-3), (2.0, 10e-3), (10.0, 1.0)], 15e-3)
    assert z == pytest.approx(2.20, abs=0.005)


def test_foster_network_reaches_its_sum_and_starts_at_zero():
    stages = [(0.5, 1e-3), (2.0, 10e-3), (10.0, 1.0)]
    assert pulse.foster_zth(stages, 0.0) == 0.0
    assert pulse.foster_zth(stages, 100.0) == pytest.approx(12.5, rel=1e-12)  # t ≫ every τ


def test_curve_points_are_read_as_straight_lines_on_log_log_axes():
    # (1 ms, 0.5 K/W) to (1 s, 60 K/W), read at 15 ms by hand: slope ln 120 / ln 1000 = 0.69306,
    # 0.5 × 15^0.69306 = 0.5 × 6.533 = 3.267 K/W [derived]
    z = pulse.curve_zth([(1e-3, 0.5), (1.0, 60.0)], 15e-3, steady=83.0)
    assert z.exact and z.value == pytest.approx(3.267, rel=1e-3)
    # a power law Z = 2·√t is a straight line there, so any point between reproduces it [derived]
    pts = [(t, 2.0 * math.sqrt(t)) for t in (1e-4, 1e-2, 1.0)]
    for t in (3e-4, 5e-3, 0.2):
        assert pulse.curve_zth(pts, t, 83.0).value == pytest.approx(2.0 * math.sqrt(t), rel=1e-12)


def test_curve_ends_are_upper_bounds_never_estimates():
    pts = [(1e-3, 0.5), (1.0, 60.0)]
    before = pulse.curve_zth(pts, 1e-4, steady=83.0)
    after = pulse.curve_zth(pts, 10.0, steady=83.0)
    assert (before.value, before.exact) == (0.5, False)  # Z_th never falls with t
    assert (after.value, after.exact) == (83.0, False)  # the steady state bounds any pulse


def _foster_ladder_tj(stages, power: float, duration: float) -> float:
    """The junction's rise at the end of a pulse, from ngspice: the Foster ladder's stages
    (R_i ∥ C_i = τ_i/R_i, in series to the ambient) driven by a current of ``power`` amperes,
    one volt per kelvin [published: the electrical analogue of a Foster network]."""
    lines = ["* Foster network driven by a power pulse",
             f"I1 0 n0 PWL(0 0 1n {power!r} {duration!r} {power!r})"]
    for i, (r, tau) in enumerate(stages):
        a, b = f"n{i}", (f"n{i + 1}" if i + 1 < len(stages) else "0")
        lines += [f"R{i} {a} {b} {r!r}", f"C{i} {a} {b} {tau / r!r}"]
    lines += [".control", f"tran {duration / 5000!r} {duration!r} 0 {duration / 5000!r}",
              f"meas tran tj find v(n0) at={duration!r}", "quit 0", ".endc", ".end", ""]
    return run_op("\n".join(lines))["tj"]


def test_the_junction_at_the_end_of_each_event_matches_an_ngspice_transient(orchard):
    # Orchard's Q1 gives a Foster network: each event's end temperature from the model against
    # the ladder simulated by ngspice with the event's power and duration, within 1 %.
    heats = [h for h in orchard.pulse_heat if h.package == "Q1"]
    assert {h.event.name for h in heats} >= {"gap-overload", "hard-short"}
    stages = [(s.r, s.tau) for s in heats[0].part.zth.foster]
    for h in heats:
        rise = _foster_ladder_tj(stages, h.power, h.event.duration)
        assert h.tj == pytest.approx(h.start + rise, rel=0.01), h.event.name
        assert h.tj - h.start == pytest.approx(rise, rel=0.01), h.event.name


def test_the_start_is_the_steady_state_under_the_continuous_load(orchard):
    cont = orchard.event("continuous-load")
    theta = 83.0  # OR-FET-D20, example_designs/parts/orchard-parts.yaml
    for h in orchard.pulse_heat:
        assert h.start == pytest.approx(55.0 + cont.dissipation["Q1"] * theta, rel=1e-12)
        assert h.needed == pytest.approx((150.0 - h.start) / h.power, rel=1e-12)


def test_every_event_with_a_duration_is_judged_from_its_own_dissipation(orchard):
    # An event the model may add later (here a made-up one) is judged with no change: the
    # package's dissipation is read from the event, as a body diode's would be.
    extra = Event("made-up-pulse", "a test event", 25.0, 50.0, 2e-3, {"Q1.1": 50.0, "Q1.2": 50.0},
                  {"Q1": 7.5})
    m = _model(ORCHARD)
    m.__dict__["events"] = orchard.events + (extra,)
    m.__dict__.pop("pulse_heat", None)  # the lint already judged the events it had
    (h,) = [h for h in m.pulse_heat if h.event.name == "made-up-pulse"]
    assert h.power == 7.5 and h.factor == 1.0
    z = pulse.foster_zth([(s.r, s.tau) for s in h.part.zth.foster], 2e-3)
    assert h.tj == pytest.approx(h.start + 7.5 * z, rel=1e-12)


# --- parallel packages -------------------------------------------------------------------------

def test_parallel_packages_share_by_the_current_divider_at_the_spread(ridgeline):
    # RL-PFET-30 at 12 V drive: 2.5 mΩ typ, 3.2 mΩ max, so the minimum is 2.5 − (3.2 − 2.5) =
    # 1.8 mΩ (the library's symmetric spread). Two in parallel, one at 1.8 mΩ and one at 3.2 mΩ:
    # the low one carries I·3.2/(1.8 + 3.2) = 0.64·I against 0.5·I equal [derived: current
    # divider, docs/references.md].
    share = 3.2 / (1.8 + 3.2)
    for name in ("Q1", "Q2", "Q3", "Q4"):
        s = ridgeline.current_spread[name]
        assert s.rds == pytest.approx((1.8e-3, 3.2e-3), rel=1e-9)
        assert s.factor == pytest.approx(share / 0.5, rel=1e-6)
    short = ridgeline.event("hard-short")
    (case,) = [c for c in ridgeline.current_sharing
               if c.event.name == "hard-short" and c.channel.name == "Q1"]
    assert case.equal == pytest.approx(short.current / 2, rel=1e-6)
    assert case.worst == pytest.approx(short.current * share, rel=1e-6)
    # the hard short as it happens, 848 A at 25 °C: 424 A equal, 543 A at the spread, as an
    # outside review found (docs/references.md, outside review)
    assert (round(case.equal), round(case.worst)) == (424, 543)


def test_a_channel_alone_in_its_branch_has_no_spread(orchard):
    assert orchard.current_spread == {} and orchard.current_sharing == ()


def test_the_worst_share_heats_the_package_by_its_square(ridgeline):
    k = ridgeline.current_spread["Q1"].factor
    for h in ridgeline.pulse_heat:
        if h.package == "Q1":
            assert h.power == pytest.approx(h.event.dissipation["Q1"] * k * k, rel=1e-12)


# --- avalanche ---------------------------------------------------------------------------------

def test_avalanche_energy_worked_by_hand():
    # ½ × 200 nH × (118.3 A)² = 1.39949 mJ; × 20 V / (20 V − 4.325 V) = × 1.27592 → 1.78564 mJ
    # [formula from FET makers' application notes, from memory; arithmetic by hand]
    assert pulse.avalanche_energy(200e-9, 118.3, 20.0, 4.325) == pytest.approx(1.78564e-3, rel=1e-5)
    assert pulse.avalanche_energy(200e-9, 118.3, 4.0, 4.325) == math.inf  # cannot clamp


def test_the_json_report_states_what_each_event_asks_of_the_switches():
    # The Orchard probe's gap overload heats Q1 from its continuous-load junction for 15 ms; the
    # Z_th that brings it just to tj_max 150 °C is (150 - T_start) / P [derived: T_end = T_start +
    # P·Z_th, docs/references.md "What parts survive over time"], and its own Foster network
    # (example_designs/parts/orchard-parts.yaml) at 15 ms, worked here from the closed form:
    # Σ R_i (1 - e^(-t/τ_i)).
    import json
    from packwarden.report import formatter
    from packwarden.report.common import RenderOptions
    run = lint([str(ORCHARD)])
    (design,) = json.loads(formatter("json")(run, RenderOptions()))["designs"]
    gap = next(e for e in design["events"] if e["name"] == "gap-overload")
    q1 = gap["switch_heat"]["Q1"]
    assert q1["zth_needed"] == pytest.approx((150.0 - q1["start"]) / q1["power"], rel=1e-5)
    stages = [(0.03, 30e-6), (0.1, 1e-3), (2.0, 20e-3), (12.0, 1.0), (68.87, 40.0)]
    z = sum(r * (1 - math.exp(-0.015 / tau)) for r, tau in stages)
    assert q1["zth"] == pytest.approx(z, rel=1e-5)
    assert q1["tj_end"] == pytest.approx(q1["start"] + q1["power"] * z, rel=1e-5)
    assert "switch_heat" not in next(e for e in design["events"] if e["name"] == "permitted")
