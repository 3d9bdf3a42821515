"""``check --yield``: the Monte Carlo share against closed forms, and its batch solver against the
nodal one."""

import json
import math
import subprocess
import sys
from pathlib import Path

import pytest

np = pytest.importorskip("numpy")

from packwarden import montecarlo  # noqa: E402
from packwarden.engine import lint  # noqa: E402
from tests.model.linted import linted_model  # noqa: E402
from packwarden.model.values import Span  # noqa: E402
from packwarden.model.yield_ import DEFAULT_SEED, draw, run_yield, wilson_interval  # noqa: E402
from packwarden.testing import lint_variant  # noqa: E402

REPO = Path(__file__).resolve().parents[1]

LIB = """\
format: packwarden-parts/1
parts:
  Y-CELL:
    kind: cell
    chemistry: nmc
    capacity: 3 Ah
    voltage: {charge: 4.2 V, upper_limit: 4.25 V, overcharge_limit: 4.35 V, nominal: 3.6 V,
              cutoff: 2.5 V, lower_limit: 2.0 V}
    internal_resistance: {typ: 30 mΩ}
    max_current: {discharge: 16 A, charge: 2 A}
  Y-GUARD:
    kind: protector
    overcharge: {detect: {typ: 4.30 V, tol: 25 mV}, release: {typ: 4.10 V, tol: 50 mV}, delay: 1.2 s}
    overdischarge: {detect: {typ: 2.50 V, tol: 50 mV}, release: {typ: 3.0 V, tol: 100 mV}, delay: 150 ms}
    overcurrent: {detect: DETECT, delay: {min: 5 ms, max: 15 ms}}
    supply_current: {operating: {max: 6 uA}}
    gate_drive: 4.5 V
    gate_drive_boosted: BOOSTED
  Y-PAIR:
    kind: fet_pair_common_drain
    channel: n
    vds_max: 20 V
    vgs_max: 12 V
    vgs_th: {max: 1.0 V}
    rds_on: [{vgs: 2.5 V, typ: RDS25}, {vgs: 4.5 V, typ: RDS45}]
    rds_on_hot_ratio: {at: 125 °C, ratio: 1.5}
    id_max: 30 A
    theta_ja: THETA
"""

DESIGN = """\
format: packwarden/1
design: {name: yield test}
libraries: [lib.yaml]
pack: {ambient: {min: 0 °C, max: 40 °C}}
load: {continuous: LOAD}
components:
  BT1: {part: Y-CELL, pins: {pos: B+, neg: B-}}
  U1: {part: Y-GUARD, pins: {supply: B+, ground: B-, sense: SNS, discharge_gate: DG, charge_gate: CG}}
  RS: {kind: resistor, value: 10 mΩ, tol: 0 %, power: 5 W, pins: [B-, SNS]}
  Q1: {part: Y-PAIR, pins: {s1: SNS, g1: DG, s2: P-, g2: CG}}
  F1: {kind: fuse, rated_current: 30 A, rated_voltage: 32 V, breaking_capacity: 1000 A, pins: [B+, P+]}
"""


def _design(tmp_path, *, load="14.25 A", detect="{typ: 150 mV, tol: 15 mV}", rds25="12 mΩ",
            rds45="10 mΩ", theta="5 K/W", boosted: bool = True) -> Path:
    # A boosted driver holds its 4.5 V whatever the cell does: the drive is exactly 4.5 V, and
    # only the tolerances a test names spread the builds. Not boosted, the cell caps the drive.
    (tmp_path / "packwarden.toml").write_text("")
    lib = LIB.replace("DETECT", detect).replace("RDS25", rds25).replace("RDS45", rds45) \
             .replace("THETA", theta).replace("BOOSTED", "true" if boosted else "false")
    (tmp_path / "lib.yaml").write_text(lib, encoding="utf-8")
    path = tmp_path / "d.yaml"
    path.write_text(DESIGN.replace("LOAD", load), encoding="utf-8")
    return path


def _model(path: Path):
    return linted_model(path)


def _check(result, rule, words):
    [c] = [c for c in result.checks if c.rule == rule and words in c.check]
    return c


def _agrees(check, p):
    """The estimate's interval brackets the true share, and it sits within 4σ of it."""
    lo, hi = check.interval
    assert lo <= p <= hi, (check.failures, check.samples, lo, hi, p)
    sigma = math.sqrt(p * (1 - p) / check.samples)
    assert abs(check.share - p) < 4 * sigma


# --- the share against closed forms ------------------------------------------------------------

def test_uniform_detection_against_a_fixed_threshold(tmp_path):
    # Shunt sensing, 10 mΩ with no tolerance: the trip current is V_det / 10 mΩ for every build,
    # whatever the FETs do. V_det uniform on 135..165 mV [derived: uniform CDF]:
    # nuisance trips below the 14.25 A load: P(V < 142.5 mV) = 7.5 / 30 = 0.25 exactly;
    # trips above the 16 A cell rating: P(V > 160 mV) = 5 / 30 = 1/6 exactly.
    m = _model(_design(tmp_path))
    r = run_yield(m, 200_000, seed=7, distribution="uniform")
    _agrees(_check(r, "trip-current-window", "nuisance"), 0.25)
    _agrees(_check(r, "trip-current-window", "discharge rating"), 1 / 6)
    assert r.sampled[0] == "U1.overcurrent.detect"


def test_normal_detection_with_the_tolerance_as_three_sigma(tmp_path):
    # Normal with ±15 mV as 3σ: σ = 5 mV; a 14.5 A load puts the threshold at 145 mV = μ − σ, and
    # P(Z < −1) = Φ(−1) = 0.158655 [published: standard normal table]. Trips above 16 A need
    # V > 160 mV = μ + 2σ: 1 − Φ(2) = 0.0227501 [published: standard normal table].
    m = _model(_design(tmp_path, load="14.5 A"))
    r = run_yield(m, 200_000, seed=11, distribution="normal")
    _agrees(_check(r, "trip-current-window", "nuisance"), 0.158655)
    _agrees(_check(r, "trip-current-window", "discharge rating"), 0.0227501)


def test_the_normal_draw_matches_its_closed_form():
    # 3σ tolerance: P(|X − typ| > tol) = P(|Z| > 3) = 0.0026998 [published: standard normal table];
    # a split normal keeps each side's own σ.
    rng = np.random.default_rng(3)
    x = draw(rng, Span(0.9, 1.0, 1.3), 1_000_000, "normal")
    assert np.mean((x < 0.9) | (x > 1.3)) == pytest.approx(0.0026998, abs=2.5e-4)
    assert np.mean(x < 1.0) == pytest.approx(0.5, abs=2e-3)
    assert np.std(x[x > 1.0]) == pytest.approx(0.1 * math.sqrt(1 - 2 / math.pi), rel=0.02)
    u = draw(rng, Span(2.0, 2.5, 3.0), 1_000_000, "uniform")
    assert (u.min() >= 2.0, u.max() <= 3.0) == (True, True)
    assert np.mean(u < 2.25) == pytest.approx(0.25, abs=2e-3)


def test_a_fixed_seed_repeats_and_another_seed_differs(tmp_path):
    m = _model(_design(tmp_path))
    a = run_yield(m, 20_000, seed=5)
    b = run_yield(m, 20_000, seed=5)
    c = run_yield(m, 20_000, seed=6)
    assert [x.failures for x in a.checks] == [x.failures for x in b.checks]
    assert [x.failures for x in a.checks] != [x.failures for x in c.checks]


# --- the batch path against the nodal solver -----------------------------------------------------

def test_builds_without_spread_equal_the_deterministic_model(tmp_path):
    # With every tolerance closed, each build is the typical design: the Monte Carlo's self-heated
    # trip current and junction temperature must equal the scalar model's (nodal solver, its own
    # thermal iteration) [derived: the same equations solved two ways].
    m = _model(_design(tmp_path, detect="150 mV", load="5 A", theta="60 K/W"))
    r = run_yield(m, 100, seed=1)
    t = m.overcurrent_trip
    assert r.figures["trip_current_hot"]["min"] == pytest.approx(t.min, rel=1e-4)
    assert r.figures["trip_current_hot"]["max"] == pytest.approx(t.min, rel=1e-4)
    op = m.operating_point(5.0, 40.0, 4.5, "typ")
    assert r.figures["junction_temperature_continuous"]["p50"] == pytest.approx(
        max(op.tj.values()), abs=0.05)


def test_uniform_builds_stay_inside_the_worst_case_window():
    # The worst-case corners bound every build [derived]: uniform draws never leave them.
    run = lint([str(REPO / "example_designs/orchard-probe.yaml")])
    m = run.designs[0].model
    r = run_yield(m, 50_000)
    t = m.overcurrent_trip
    assert t.min <= r.figures["trip_current_hot"]["min"]
    assert r.figures["trip_current_cold"]["max"] <= t.max


@pytest.mark.parametrize("name", ["orchard-probe.yaml", "ridgeline-tool-4s2p.yaml",
                                  "ridgeline-blower-4s2p-lowside.yaml"])
def test_uniform_builds_of_each_example_stay_inside_its_worst_case(name):
    # Uniform builds never leave the worst-case corners the lint judges [derived: the corners
    # bound every build], on every example layout, the shunt between B− and the FET sources
    # included (the layout an earlier second model of the yield run could not solve).
    run = lint([str(REPO / "example_designs" / name)])
    m = run.designs[0].model
    r = run_yield(m, 2000, seed=3)
    t = m.overcurrent_trip
    assert t.min <= r.figures["trip_current_hot"]["min"] * (1 + 1e-9)
    assert r.figures["trip_current_cold"]["max"] <= t.max * (1 + 1e-9)
    # the permitted event bounds every build's current permitted for ever, which the cell rating
    # is judged by in the rule and in the yield run alike
    assert r.figures["permitted_current"]["max"] <= m.event("permitted").current * (1 + 1e-6)
    [cont] = [h for h in m.switch_heat if h.case == "continuous"][:1]
    assert r.figures["junction_temperature_continuous"]["max"] <= cont.tj + 0.02


def test_a_project_limit_reaches_the_rule_the_yield_run_and_the_chart(tmp_path):
    # With [rules.switch-temperature] limit = "100 °C" the rule, --yield and the review report's
    # chart all judge with 100 °C: one limit, resolved once per design.
    import shutil
    shutil.copytree(REPO / "example_designs", tmp_path / "d")
    (tmp_path / "packwarden.toml").write_text('[rules.switch-temperature]\nlimit = "100 °C"\n',
                                              encoding="utf-8")
    design = tmp_path / "d" / "orchard-probe.yaml"
    run = lint([str(design)])
    (d,) = run.designs
    assert d.model.limits.junction == 100.0
    temp = [f for f in d.findings if f.rule == "switch-temperature"]
    assert temp and all(any(g.name == "limit" and g.value == 100.0 for g in f.figures)
                        for f in temp)
    r = run_yield(d.model, 5000)
    tj = [c for c in r.checks if c.rule == "switch-temperature"]
    assert all("limit 100 °C" in c.condition for c in tj)
    # Just below the trip the worst case is 116 °C: builds near it fail against 100 °C.
    assert any(c.failures > 0 for c in tj)
    out = subprocess.run([sys.executable, "-m", "packwarden.cli", "check", "--format", "html",
                          "--output", str(tmp_path / "r.html"), str(design)],
                         capture_output=True, text=True, cwd=tmp_path)
    assert out.returncode in (0, 1), out.stderr
    html = (tmp_path / "r.html").read_text(encoding="utf-8")
    assert "derating 100 °C" in html and "derating 125 °C" not in html


def test_a_path_with_a_conducting_diode_is_refused_not_guessed():
    # The batch solve is linear; where a body diode conducts in the model's own solution the run
    # says so instead of solving a different circuit.
    from packwarden.model.network import Network, NetworkError
    from packwarden.model.vector import LinearPath
    net = Network()
    net.add_source("B", "P", "N", 5.0, 0.01)
    net.add_mosfet("Q", drain="X", source="P", channel="n", ohms_on=1.0, on=False)
    net.add_resistor("L", "X", "N", 1.0)
    with pytest.raises(NetworkError, match="diode conducts"):
        LinearPath.from_network(net, "N")


# --- the interval ---------------------------------------------------------------------------------

@pytest.mark.parametrize("k,n,low,high", [
    # Newcombe (1998), Stat. Med. 17:857, worked examples for the Wilson score method [memory]
    (81, 263, 0.2553, 0.3662), (15, 148, 0.0624, 0.1605), (0, 20, 0.0, 0.1611),
    (1, 29, 0.0061, 0.1718),
])
def test_wilson_interval_worked_examples(k, n, low, high):
    lo, hi = wilson_interval(k, n)
    assert (lo, hi) == pytest.approx((low, high), abs=6e-5)


@pytest.mark.parametrize("k,n", [(3, 1000), (500, 1000), (1, 100_000), (99_990, 100_000)])
def test_wilson_bounds_invert_the_score_test(k, n):
    # [published: Wilson 1927] the bounds are the proportions p at which the observed share sits
    # exactly z standard errors sqrt(p(1 − p)/n) away.
    z = 1.959963984540054
    for p in wilson_interval(k, n):
        assert abs(k / n - p) == pytest.approx(z * math.sqrt(p * (1 - p) / n), rel=1e-9)


def test_no_failures_still_has_an_upper_bound():
    # 0 of 100 000: upper bound z²/(n + z²) = 38.4 ppm [derived from the Wilson formula at p = 0].
    lo, hi = wilson_interval(0, 100_000)
    z2 = 1.959963984540054 ** 2
    assert lo == 0.0 and hi == pytest.approx(z2 / (100_000 + z2), rel=1e-12)


# --- the command -----------------------------------------------------------------------------------

def _cli(*args):
    return subprocess.run([sys.executable, "-m", "packwarden.cli", *args], capture_output=True,
                          text=True, cwd=REPO)


def test_check_yield_json_section(tmp_path):
    path = _design(tmp_path)
    out = _cli("check", "--yield", "40000", "--seed", "9", "--format", "json", str(path))
    assert out.returncode in (0, 1), out.stderr
    [design] = json.loads(out.stdout)["designs"]
    y = design["yield"]
    assert (y["samples"], y["seed"], y["distribution"], y["interval"]) == (
        40000, 9, "uniform", "wilson-95")
    [nuisance] = [c for c in y["checks"] if "nuisance" in c["check"]]
    assert nuisance["rule"] == "trip-current-window"
    assert nuisance["ppm_low"] <= 250_000 <= nuisance["ppm_high"]
    assert nuisance["ppm"] == pytest.approx(nuisance["failures"] / 40000 * 1e6)


def test_check_yield_text_section_and_normal_draws(tmp_path):
    out = _cli("check", "--yield", "5000", "--distribution", "normal",
               str(_design(tmp_path)))
    assert "yield over 5,000 builds (normal draws, seed 20240601)" in out.stdout
    assert "95 % Wilson interval" in out.stdout
    assert "lithium cells can vent, burn or explode" in out.stdout


def test_a_bad_yield_count_is_a_one_line_error():
    out = _cli("check", "--yield", "0", "example_designs/orchard-probe.yaml")
    assert out.returncode == 2
    assert "Traceback" not in out.stderr


def test_the_seed_defaults_agree():
    import inspect

    from packwarden import cli
    default = inspect.signature(cli.check).parameters["seed"].default.default
    assert default == montecarlo.DEFAULT_SEED == DEFAULT_SEED


def test_numpy_is_imported_only_for_yield():
    code = ("import sys; from packwarden.engine import lint; import packwarden.cli; "
            "lint(['example_designs/orchard-probe.yaml']); print('numpy' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, cwd=REPO)
    assert out.stdout.strip() == "False", out.stderr


def test_the_cell_rating_is_judged_by_the_self_heated_permitted_current(tmp_path):
    # The Orchard probe's switches are its sense resistance: the current it permits for ever
    # settles below the unheated trip maximum as they heat (docs/references.md "Events in time";
    # an outside review's calculator: about 5.49 A against 7.78 A, docs/references.md, outside
    # review). With its cells rated 6 A, between
    # the two, no build fails the rating, as the rule passes it (tests/rules/
    # test_permitted_ratings.py), though many builds' unheated trip maximum lies above 6 A.
    run = lint_variant(tmp_path, REPO / "example_designs/orchard-probe.yaml",
                       REPO / "example_designs/parts/orchard-parts.yaml",
                       lib_replace=[("max_current: {discharge: 10 A", "max_current: {discharge: 6 A")])
    m = run.designs[0].model
    r = run_yield(m, 20_000, seed=5, distribution="uniform")
    assert r.figures["permitted_current"]["max"] <= m.event("permitted").current * (1 + 1e-6)
    assert r.figures["trip_current_cold"]["max"] > 6.0
    assert _check(r, "trip-current-window", "permitted for ever").failures == 0
